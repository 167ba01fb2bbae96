"""Slot fill and the passage of the wire through the slot opening."""

from __future__ import annotations

from collections.abc import Iterable

from pydantic import Field

from emgate.model import AnyDesign
from emgate.rule import Check, Context, Options, Problem, Rule
from emgate_rules._limits import basis

SOURCE = "common practice, no source"
DEFAULTS = {"random_wound": 0.45, "tooth_coil": 0.65, "form_wound": 0.65}
#: Insulated wire must clear the opening by this much to be fed in by hand or machine.
CLEARANCE = 0.2e-3


class SlotFillOptions(Options):
    random_wound: float = Field(default=0.45, gt=0, le=0.91, description=SOURCE)
    tooth_coil: float = Field(default=0.65, gt=0, le=0.91, description=SOURCE)
    form_wound: float = Field(default=0.65, gt=0, le=1.0, description=SOURCE)
    opening_clearance: float = Field(
        default=CLEARANCE,
        ge=0,
        description="metres of clearance between insulated wire and"
        " slot opening (common practice, no source)",
    )


def winding_type(design: AnyDesign) -> str:
    if design.winding.conductor.shape == "rectangular":
        return "form_wound"
    return "tooth_coil" if design.winding.coil_pitch == 1 else "random_wound"


class SlotFill(Rule):
    """Bare copper over slot area, by winding type, and round wire through the opening.

    Method: the winding zone of the slot (below the opening and wedge) net of a liner laid
    along its perimeter (the record's slot_liner, or 0.25 mm); copper = layers x turns per
    coil x strands x bare strand section; fill = copper / net area. For round wire in a
    semi-closed slot, the insulated strand must pass the opening with 0.2 mm clearance.

    Default upper limits (common practice, no source): random-wound round wire 0.45 (usual
    0.35-0.45), tooth coils 0.65 (0.45-0.65), form-wound rectangular 0.65 (0.5-0.65). No round
    wire fill can exceed hexagonal packing, pi / sqrt(12) = 0.907 of the bare-to-insulated
    area ratio.
    """

    id = "slot-fill"
    summary = "slot fill within the limit for the winding type; wire fits the opening"
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
                basis(options, "opening_clearance", CLEARANCE, SOURCE),
            )
