"""Slot fill, the passage of the wire through the slot opening, and the fit of form-wound
strands across the slot."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.model import AnyDesign
from emgate.physics.conductors import OPENING_CLEARANCE
from emgate.quantity import quantity
from emgate.rule import Check, Context, Options, Problem, Rule
from emgate_rules._limits import Ratio, basis, limit

SOURCE = "common practice, no source"
#: Bare-copper fill ceilings by winding family: random-wound distributed round wire 0.45
#: (usual 0.35-0.45); needle-wound round-wire tooth coils reach less than the 0.65 of
#: coils wound on a bobbin or segmented core, a double layer (two coils a slot, the needle
#: between them) less than a single (common practice, no source); form-wound 0.65.
DEFAULTS = {
    "random_wound": 0.45,
    "tooth_coil_double_layer": 0.55,
    "tooth_coil_single_layer": 0.6,
    "form_wound": 0.65,
}
#: Radial room between the layers of a form-wound slot, per separator [m] (common practice,
#: no source).
SEPARATOR = 0.5e-3
#: Free width a form-wound strand needs across the slot beyond itself and two liners [m]:
#: none, it must merely fit (common practice, no source).
WIDTH_CLEARANCE = 0.0
Clearance = quantity("length", sign="non_negative")


class SlotFillOptions(Options):
    random_wound: Ratio = limit(DEFAULTS["random_wound"], SOURCE, le=0.91)
    tooth_coil_double_layer: Ratio = limit(DEFAULTS["tooth_coil_double_layer"], SOURCE, le=0.91)
    tooth_coil_single_layer: Ratio = limit(DEFAULTS["tooth_coil_single_layer"], SOURCE, le=0.91)
    form_wound: Ratio = limit(DEFAULTS["form_wound"], SOURCE, le=1.0)
    opening_clearance: Clearance = limit(OPENING_CLEARANCE, SOURCE)
    width_clearance: Clearance = limit(WIDTH_CLEARANCE, SOURCE)
    height_clearance: Clearance = limit(WIDTH_CLEARANCE, SOURCE)
    separator: Clearance = limit(SEPARATOR, SOURCE)


def winding_type(design: AnyDesign) -> str:
    if design.winding.conductor.shape == "rectangular":
        return "form_wound"
    if design.winding.coil_pitch > 1:
        return "random_wound"
    return "tooth_coil_double_layer" if design.winding.layers == 2 else "tooth_coil_single_layer"


def radial_stack(design: AnyDesign, liner: float, separator: float) -> tuple[float, int]:
    """Radial build of a form-wound slot [m] and the strands side by side across it.

    As many insulated strands side by side as the width net of two liners takes (at least
    one), the rest stacked: conductors x ceil(strands / across) x h_ins, a separator
    between layers, a liner at the bottom and under the wedge, and the wedge.
    """
    import math

    c, slot = design.winding.conductor, design.stator.slot
    w = design.winding
    across = max(1, int((slot.width - 2.0 * liner) // c.insulated_width))
    rows = math.ceil(c.strands / across) * w.layers * w.turns_per_coil
    stack = rows * c.insulated_height + (w.layers - 1) * separator + 2.0 * liner
    return stack + slot.wedge_height, across


class SlotFill(Rule):
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
    options = SlotFillOptions

    def check(
        self, design: AnyDesign, options: Options, context: Context
    ) -> Iterable[Check | Problem]:
        assert isinstance(options, SlotFillOptions)
        kind = winding_type(design)
        yield Check(
            "stator.slot_fill",
            f"slot fill ({kind.replace('_', '-')})",
            ("winding", "turns_per_coil"),
            context.calc.slot_fill,
            getattr(options, kind),
            "max",
            "",
            basis(options, kind, DEFAULTS[kind], SOURCE),
        )
        c, slot = design.winding.conductor, design.stator.slot
        if c.shape == "round" and slot.shape == "semi_closed":
            yield Check(
                "stator.opening_clearance",
                "slot opening less insulated strand",
                ("stator", "slot", "opening"),
                slot.opening - c.insulated_diameter,
                options.opening_clearance,
                "min",
                "mm",
                basis(options, "opening_clearance", OPENING_CLEARANCE, SOURCE),
            )
        if c.shape == "rectangular" and slot.shape == "open":
            yield Check(
                "stator.slot_width_clearance",
                "slot width less insulated strand width and two liners",
                ("stator", "slot", "width"),
                slot.width - (c.insulated_width + 2.0 * context.calc.liner),
                options.width_clearance,
                "min",
                "mm",
                basis(options, "width_clearance", WIDTH_CLEARANCE, SOURCE),
            )
            stack, across = radial_stack(design, context.calc.liner, options.separator)
            yield Check(
                "stator.slot_height_clearance",
                f"slot depth less the coil's radial stack ({across} strand(s) across)",
                ("stator", "slot", "height"),
                slot.height - stack,
                options.height_clearance,
                "min",
                "mm",
                basis(options, "height_clearance", WIDTH_CLEARANCE, SOURCE),
            )
