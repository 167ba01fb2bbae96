"""Slot fill, the passage of the wire through the slot opening, and the fit of form-wound
strands across the slot."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.api import AnyDesign, Check, Context, Options, Problem, Ratio, Rule, limit, quantity

CP = "common practice, no source"
Clearance = quantity("length", sign="non_negative")


class SlotFillOptions(Options):
    random_wound: Ratio = limit(0.45, "1", CP, le=0.91)
    tooth_coil: Ratio = limit(0.65, "1", CP, le=0.91)
    form_wound: Ratio = limit(0.65, "1", CP, le=1.0)
    #: Free width a round strand fed through the opening needs beyond its own diameter.
    opening_clearance: Clearance = limit(0.2, "mm", CP)
    #: Free width a form-wound strand needs across the slot beyond itself and two liners:
    #: none, it must merely fit.
    width_clearance: Clearance = limit(0.0, "mm", CP)


def winding_type(design: AnyDesign) -> str:
    if design.winding.conductor.shape == "rectangular":
        return "form_wound"
    return "tooth_coil" if design.winding.coil_pitch == 1 else "random_wound"


class SlotFill(Rule[SlotFillOptions]):
    """Bare copper over slot area, by winding type; round wire through the opening; form-wound
    strands across the slot.

    Method: the winding zone of the slot (below the opening and wedge) net of a liner laid
    along its perimeter (the record's slot_liner, or 0.25 mm); copper = layers x turns per
    coil x strands x bare strand section; fill = copper / net area. For round wire in a
    semi-closed slot, the insulated strand must pass the opening with 0.2 mm clearance
    (`opening_clearance`, e.g. '0.2 mm'). For rectangular strands in an open slot, the
    insulated strand width plus the liner on both walls must fit the slot width, clearance
    b - (w_ins + 2 t) >= 0 (`width_clearance`); the strands are taken as stacked
    radially, one strand across the slot.

    Default upper limits (common practice, no source), as ratios (0.45 or '45 %'):
    random-wound round wire 0.45 (usual 0.35-0.45), tooth coils 0.65 (0.45-0.65), form-wound
    rectangular 0.65 (0.5-0.65). No round wire fill can exceed hexagonal packing, pi /
    sqrt(12) = 0.907 of the bare-to-insulated area ratio. Clearances 0.2 mm at the opening
    and none across the slot (common practice, no source).
    """

    id = "slot-fill"
    summary = "slot fill within the limit for the winding type; the wire fits the slot"
    tags = ("electrical", "manufacturing")

    def check(
        self, design: AnyDesign, options: SlotFillOptions, context: Context
    ) -> Iterable[Check | Problem]:
        kind = winding_type(design)
        yield context.check(
            "stator.slot_fill",
            options.limit_for(kind),
            "max",
            path=("winding", "turns_per_coil"),
            label=f"slot fill ({kind.replace('_', '-')})",
        )
        if "stator.opening_clearance" in context.sheet:  # round wire, semi-closed slot
            yield context.check(
                "stator.opening_clearance",
                options.limit_for("opening_clearance"),
                "min",
                path=("stator", "slot", "opening"),
                label="slot opening less insulated strand",
            )
        if "stator.slot_width_clearance" in context.sheet:  # rectangular strands, open slot
            yield context.check(
                "stator.slot_width_clearance",
                options.limit_for("width_clearance"),
                "min",
                path=("stator", "slot", "width"),
                label="slot width less insulated strand width and two liners",
            )
