"""Slot fill, the passage of the wire through the slot opening, and the fit of form-wound
strands across and along the slot."""

from __future__ import annotations

from collections.abc import Iterable
from typing import Annotated

from emgate.api import AnyDesign, Check, Context, Options, Problem, Ratio, Rule, limit, quantity

CP = "common practice, no source"
Clearance = Annotated[float, quantity("length", sign="non_negative")]


class SlotFillOptions(Options):
    # Bare-copper fill ceilings by winding family: random-wound distributed round wire 0.45
    # (usual 0.35-0.45); needle-wound round-wire tooth coils reach less than the 0.65 of
    # coils wound on a bobbin or segmented core, a double layer (two coils a slot, the needle
    # between them) less than a single (common practice, no source); form-wound 0.65.
    random_wound: Ratio = limit(0.45, "1", CP, le=0.91)
    tooth_coil_double_layer: Ratio = limit(0.55, "1", CP, le=0.91)
    tooth_coil_single_layer: Ratio = limit(0.6, "1", CP, le=0.91)
    form_wound: Ratio = limit(0.65, "1", CP, le=1.0)
    #: Free width a round strand fed through the opening needs beyond its own diameter.
    opening_clearance: Clearance = limit(0.2, "mm", CP)
    #: Free width a form-wound strand needs across the slot beyond itself and two liners,
    #: and free depth beyond the coil's radial stack: none, it must merely fit.
    width_clearance: Clearance = limit(0.0, "mm", CP)
    height_clearance: Clearance = limit(0.0, "mm", CP)
    #: Radial room between the layers of a form-wound slot, per separator.
    separator: Clearance = limit(0.5, "mm", CP)


def winding_type(design: AnyDesign) -> str:
    if design.winding.conductor.shape == "rectangular":
        return "form_wound"
    if design.winding.coil_pitch > 1:
        return "random_wound"
    return "tooth_coil_double_layer" if design.winding.layers == 2 else "tooth_coil_single_layer"


class SlotFill(Rule[SlotFillOptions]):
    """Bare copper over slot area, by winding type; round wire through the opening; form-wound
    strands across the slot.

    Method: the winding zone of the slot (below the opening and wedge) net of a liner laid
    along its perimeter (the record's slot_liner, or 0.25 mm); copper = layers x turns per
    coil x strands x bare strand section; fill = copper / net area. For round wire in a
    semi-closed slot, the insulated strand must pass the opening with 0.2 mm clearance
    (`opening_clearance`, e.g. '0.2 mm'). For rectangular strands in an open slot, the
    insulated strand width plus the liner on both walls must fit the slot width, clearance
    b - (w_ins + 2 t) >= 0 (`width_clearance`); and the coil's radial stack must fit the
    slot depth, h - (n_r h_ins z + (layers - 1) s + 2 t + h_w) >= 0 (`height_clearance`):
    as many strands side by side as the width net of two liners takes (at least one), the
    other n_r rows stacked, z conductors a slot, a separator s between layers
    (`separator`, 0.5 mm), a liner t at the bottom and under the wedge, the wedge h_w.
    The fill over insulated wire (stator.slot_fill_insulated: d_ins^2 a round strand, w_ins
    h_ins a rectangular one) is on the sheet beside the bare-copper fill.

    Default upper limits by winding family (common practice, no source), as ratios (0.45
    or '45 %'): random-wound distributed round wire 0.45 (usual 0.35-0.45); needle-wound
    round-wire tooth coils in two layers 0.55 and in one layer 0.6 (they reach less than
    the 0.65 of bobbin-wound or segmented-core coils; the needle needs room between two
    coils of a slot); form-wound rectangular 0.65 (0.5-0.65). No round wire fill can
    exceed hexagonal packing, pi / sqrt(12) = 0.907 of the bare-to-insulated area ratio.
    Clearances 0.2 mm at the opening and none across the slot or in its depth (common
    practice, no source).
    """

    id = "slot-fill"
    summary = "slot fill within the limit for the winding type; the wire fits the slot"
    version = "2"
    tags = ("electrical", "manufacturing")

    def check(
        self, design: AnyDesign, options: SlotFillOptions, context: Context
    ) -> Iterable[Check | Problem]:
        sheet = context.sheet
        kind = winding_type(design)
        yield context.check(
            "stator.slot_fill",
            options.limit_for(kind),
            "max",
            path=("winding", "turns_per_coil"),
            label=f"slot fill ({kind.replace('_', '-')})",
        )
        if "stator.opening_clearance" in sheet:  # round wire, semi-closed slot
            yield context.check(
                "stator.opening_clearance",
                options.limit_for("opening_clearance"),
                "min",
                path=("stator", "slot", "opening"),
                label="slot opening less insulated strand",
            )
        if "stator.slot_width_clearance" in sheet:  # rectangular strands, open slot
            yield context.check(
                "stator.slot_width_clearance",
                options.limit_for("width_clearance"),
                "min",
                path=("stator", "slot", "width"),
                label="slot width less insulated strand width and two liners",
            )
            across = int(sheet["stator.strands_across"])
            yield context.check(
                "stator.slot_height_clearance",
                options.limit_for("height_clearance"),
                "min",
                path=("stator", "slot", "height"),
                label=f"slot depth less the coil's radial stack ({across} strand(s) across)",
                # the sheet's is at a 0.5 mm separator; the team may set its own
                value=sheet.slot_height_clearance(options.separator),
            )
