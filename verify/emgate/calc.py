"""The calculation of one design: every recomputed quantity, from the raw record, once.

Each quantity is a lazily computed, cached attribute that calls the physics kernel with inputs
taken from the validated record (never from its ``declared`` block). Rules read what they need;
``emgate show`` prints the sheet of every quantity registered here, under a stable dotted name,
with its unit and method. Rules therefore share one computation of a quantity, not one
another's verdicts.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass
from functools import cached_property
from typing import TYPE_CHECKING, Any

from emgate import geometry as geo
from emgate.model import MACHINE_KINDS

if TYPE_CHECKING:
    import numpy as np

    from emgate.materials import Catalogue
    from emgate.model import AnyDesign
    from emgate.physics.bh import BHCurve


@dataclass(frozen=True)
class SheetEntry:
    """A named quantity of the calculation sheet."""

    name: str
    attribute: str
    unit: str
    method: str
    machines: tuple[str, ...]


SHEET: dict[str, SheetEntry] = {}


def sheet(name: str, unit: str, method: str, machines: tuple[str, ...] = MACHINE_KINDS
          ) -> Callable[[Callable[[Any], float]], cached_property[float]]:
    """Register a Calculation property as a named quantity of the sheet."""

    def register(fn: Callable[[Any], float]) -> cached_property[float]:
        SHEET[name] = SheetEntry(name, fn.__name__, unit, method, machines)
        return cached_property(fn)

    return register


class Calculation:
    """Recomputed quantities of one design (SI floats)."""

    def __init__(self, design: AnyDesign, catalogue: Catalogue) -> None:
        self.d = design
        self.catalogue = catalogue

    def value(self, name: str) -> float:
        return float(getattr(self, SHEET[name].attribute))

    def applies(self, name: str) -> bool:
        return self.d.machine in SHEET[name].machines

    # --- materials -----------------------------------------------------------------------

    @cached_property
    def stator_steel(self) -> BHCurve:
        curve = self.catalogue.get(self.d.stator.steel)
        assert curve is not None  # resolved at validation
        return curve

    @cached_property
    def rotor_steel(self) -> BHCurve:
        name = self.d.rotor.steel or self.d.stator.steel
        curve = self.catalogue.get(name)
        assert curve is not None
        return curve

    # --- winding -------------------------------------------------------------------------

    @cached_property
    def layout(self) -> np.ndarray:
        """Signed coil sides per phase and slot, shape (m, Q)."""
        from emgate.physics import winding as wk

        w = self.d.winding
        if w.layout is not None:
            return layout_from_table(w.layout, w.phases)
        return wk.star_of_slots(self.d.stator.slots, self.d.pole_pairs, w.phases, w.layers,
                                w.coil_pitch)

    @sheet("winding.series_turns", "1", "coils per phase times turns per coil over parallel"
           " paths")
    def series_turns(self) -> float:
        from emgate.physics.winding import series_turns_per_phase

        w = self.d.winding
        return series_turns_per_phase(self.d.stator.slots, w.layers, w.phases,
                                      w.turns_per_coil, w.parallel_paths)

    @sheet("winding.phase_current", "A", "rated line current through the connection (star:"
           " equal; delta: over sqrt 3)")
    def phase_current(self) -> float:
        from emgate.physics.conductors import phase_current

        return phase_current(self.d.rating.line_current, self.d.rating.connection)

    @cached_property
    def strand_area(self) -> float:
        from emgate.physics import conductors as ck

        c = self.d.winding.conductor
        if c.shape == "round":
            return ck.round_strand_area(c.bare_diameter)
        return ck.rectangular_strand_area(c.width, c.height, c.corner_radius)

    @sheet("stator.current_density", "A/mm^2", "phase current over parallel paths, strands in"
           " hand and bare strand section")
    def stator_current_density(self) -> float:
        from emgate.physics.conductors import winding_current_density

        w = self.d.winding
        return winding_current_density(self.phase_current, w.parallel_paths,
                                       w.conductor.strands, self.strand_area)

    # --- geometry (for the sheet) --------------------------------------------------------

    @sheet("stator.slot_pitch", "mm", "bore circumference over slots")
    def slot_pitch(self) -> float:
        return geo.stator_slot_pitch(self.d)

    @sheet("stator.tooth_width_min", "mm", "slot pitch minus slot width along the winding zone")
    def tooth_width_min(self) -> float:
        return geo.stator_tooth_width_min(self.d)

    @sheet("stator.yoke_height", "mm", "half the difference of the diameters less slot height")
    def stator_yoke_height(self) -> float:
        return geo.stator_yoke_height(self.d)

    @sheet("rotor.yoke_height", "mm", "rotor section below slots, magnets or pole bodies")
    def rotor_yoke_height(self) -> float:
        return geo.rotor_yoke_height(self.d)


def layout_from_table(table: list[str], phases: int) -> np.ndarray:
    """The (m, Q) layout of an explicit slot table such as ['+A -C', '-B +A', ...]."""
    import numpy as np

    letters = [chr(ord("A") + k) for k in range(phases)]
    out = np.zeros((phases, len(table)), dtype=int)
    for s, entry in enumerate(table):
        for side in entry.split():
            sign = -1 if side.startswith("-") else 1
            letter = side.lstrip("+-")
            if letter not in letters:
                raise ValueError(f"slot {s + 1}: phase {letter!r} is not one of {letters}")
            out[letters.index(letter), s] += sign
    return out


def finite(x: float) -> bool:
    return math.isfinite(x)
