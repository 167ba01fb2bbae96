"""The calculation of one design: every recomputed quantity, from the raw record, once.

One module a domain, so that a newcomer finds each where it belongs:

| module | quantities |
| --- | --- |
| ``names`` | the sheet: every name, unit, method and machine kinds, in one list |
| ``core`` | ``Calculation``, ``@memo`` and ``@quantity`` |
| ``winding`` | layout, series turns, phase current and voltage, winding factor, MMF, slip |
| ``conductors`` | slots, fill, clearances, current density, loading, resistance, copper loss |
| ``magnetic`` | steels, Carter, the magnetic circuit, tooth and yoke flux densities, back-EMF |
| ``rotor`` | cage bars and rings, field coils, magnet working points and coercivity |
| ``losses`` | the loss budget, energy balance, efficiency and IEC 60034-30-1 class |
| ``thermal`` | the lumped thermal estimate fed by every loss, at a self-consistent temperature |
| ``inductance`` | the winding's family and MMF spectrum, magnetising, leakage, synchronous |
| ``worst_cases`` | short-circuit and worst credible currents, cold magnet, top speed |
| ``circuit`` | the machine on load: power factor, field current on load, torque |
| ``view`` | ``Sheet``, the read-only view of the sheet that rules get |

Each quantity calls the physics kernel (``emgate.physics``) with inputs taken from the
validated record. Rules share one computation of a quantity, not one another's verdicts.
"""

from __future__ import annotations

from emgate.calc import (
    circuit,
    conductors,
    inductance,
    losses,
    magnetic,
    rotor,
    thermal,
    winding,
    worst_cases,
)
from emgate.calc.conductors import conductor_strand_area, slot_winding_area
from emgate.calc.core import PROVIDERS, SHEET, Calculation
from emgate.calc.names import Entry
from emgate.calc.winding import layout_from_table

DOMAINS = (winding, conductors, magnetic, rotor, losses, thermal, inductance, worst_cases, circuit)

__all__ = [
    "DOMAINS",
    "PROVIDERS",
    "SHEET",
    "Calculation",
    "Entry",
    "conductor_strand_area",
    "layout_from_table",
    "slot_winding_area",
]
