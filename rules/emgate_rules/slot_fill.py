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
DEFAULTS = {"random_wound": 0.45, "tooth_coil": 0.65, "form_wound": 0.65}
#: Free width a form-wound strand needs across the slot beyond itself and two liners [m]:
#: none, it must merely fit (common practice, no source).
WIDTH_CLEARANCE = 0.0
Clearance = quantity("length", sign="non_negative")


class SlotFillOptions(Options):
    random_wound: Ratio = limit(DEFAULTS["random_wound"], SOURCE, le=0.91)
    tooth_coil: Ratio = limit(DEFAULTS["tooth_coil"], SOURCE, le=0.91)
    form_wound: Ratio = limit(DEFAULTS["form_wound"], SOURCE, le=1.0)
    opening_clearance: Clearance = limit(OPENING_CLEARANCE, SOURCE)
    width_clearance: Clearance = limit(WIDTH_CLEARANCE, SOURCE)


def winding_type(design: AnyDesign) -> str:
    if design.winding.conductor.shape == "rectangular":
        return "form_wound"
    return "tooth_coil" if design.winding.coil_pitch == 1 else "random_wound"


class SlotFill(Rule):
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
