"""Conductor current density."""

from __future__ import annotations

from collections.abc import Iterable
from typing import Annotated

from emgate.api import (
    TEAM_LIMIT,
    AnyDesign,
    Check,
    Context,
    Limit,
    Options,
    Problem,
    Rule,
    limit,
    quantity,
)

CurrentDensityLimit = Annotated[float, quantity("current_density")]
A_MM2 = "A/mm^2"
CP = "common practice, no source"
# Upper ends of the usual ranges by machine kind and cooling method, each with its source:
# totally enclosed non-ventilated 1.5-5 A/mm^2, fan-cooled 5-10, liquid-cooled 10-30 [from
# memory: Hendershot and Miller, Design of Brushless Permanent-Magnet Machines]; induction
# machines 3-8 and salient-pole synchronous machines 2-5 where air cools the winding [from
# memory: Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical Machines, Table
# 6.2]. A water jacket cools the winding only through the iron, so its cells sit between
# the air-cooled and liquid-cooled ends (common practice).
HM_TENV = "Hendershot and Miller, totally enclosed non-ventilated, from memory"
HM_FAN = "Hendershot and Miller, fan-cooled, from memory"
HM_LIQUID = "Hendershot and Miller, liquid-cooled, from memory"
PYR_INDUCTION = "Pyrhonen et al., Table 6.2, induction machines 3-8 A/mm^2 (from memory)"
PYR_SALIENT = "Pyrhonen et al., Table 6.2, salient-pole machines 2-5 A/mm^2 (from memory)"
#: Rotor conductors: aluminium cage bars and rings 3-8 A/mm^2, salient-pole field coils
#: 2-5 A/mm^2, the upper ends.
ROTOR = "Pyrhonen et al., Table 6.2 (from memory)"


class CurrentDensityOptions(Options):
    """A cooling method's field (``enclosed_fan``), when the team sets it, is its limit for
    every machine kind; a cell (``induction_enclosed_fan``) that the team sets wins."""

    enclosed_natural: CurrentDensityLimit | None = None
    enclosed_fan: CurrentDensityLimit | None = None
    open_ventilated: CurrentDensityLimit | None = None
    liquid_jacket: CurrentDensityLimit | None = None
    direct_liquid: CurrentDensityLimit | None = None
    induction_enclosed_natural: CurrentDensityLimit = limit(5, A_MM2, HM_TENV)
    induction_enclosed_fan: CurrentDensityLimit = limit(8, A_MM2, PYR_INDUCTION)
    induction_open_ventilated: CurrentDensityLimit = limit(8, A_MM2, PYR_INDUCTION)
    induction_liquid_jacket: CurrentDensityLimit = limit(12, A_MM2, CP)
    induction_direct_liquid: CurrentDensityLimit = limit(30, A_MM2, HM_LIQUID)
    surface_pm_enclosed_natural: CurrentDensityLimit = limit(5, A_MM2, HM_TENV)
    surface_pm_enclosed_fan: CurrentDensityLimit = limit(10, A_MM2, HM_FAN)
    surface_pm_open_ventilated: CurrentDensityLimit = limit(10, A_MM2, HM_FAN)
    surface_pm_liquid_jacket: CurrentDensityLimit = limit(20, A_MM2, CP)
    surface_pm_direct_liquid: CurrentDensityLimit = limit(30, A_MM2, HM_LIQUID)
    salient_field_enclosed_natural: CurrentDensityLimit = limit(5, A_MM2, PYR_SALIENT)
    salient_field_enclosed_fan: CurrentDensityLimit = limit(5, A_MM2, PYR_SALIENT)
    salient_field_open_ventilated: CurrentDensityLimit = limit(5, A_MM2, PYR_SALIENT)
    salient_field_liquid_jacket: CurrentDensityLimit = limit(12, A_MM2, CP)
    salient_field_direct_liquid: CurrentDensityLimit = limit(30, A_MM2, HM_LIQUID)
    cage_bar: CurrentDensityLimit = limit(8, A_MM2, ROTOR)
    end_ring: CurrentDensityLimit = limit(8, A_MM2, ROTOR)
    field_coil: CurrentDensityLimit = limit(5, A_MM2, ROTOR)


class CurrentDensity(Rule[CurrentDensityOptions]):
    """Current density in the stator winding against a limit set by the cooling method.

    Method: the winding phase current follows from the rated line current and the connection
    of the m phases (star: I_ph = I; delta, the polygon: I_ph = I / (2 sin(pi/m)), I / sqrt 3
    for three phases; one phase: I_ph = I); it divides over the parallel paths a and the
    strands in hand n, so the density in a strand of bare section S is J = I_ph / (a n S).
    The strand section is pi d^2 / 4 for round wire, and w h - (4 - pi) r^2 for a rectangular
    strand with corner radius r.

    Default limits by machine kind and cooling method (upper ends of the usual ranges),
    A/mm^2 (enclosed no fan / fan-cooled / open ventilated / water jacket / direct liquid):
    induction 5 / 8 / 8 / 12 / 30; surface magnets 5 / 10 / 10 / 20 / 30; salient poles
    5 / 5 / 5 / 12 / 30. Sources per cell: totally enclosed non-ventilated 5, fan-cooled 10
    (surface magnets), liquid-cooled 30 [from memory: Hendershot and Miller, Design of
    Brushless Permanent-Magnet Machines, 1.5-5, 5-10 and 10-30 A/mm^2]; induction machines
    with air on the winding 8 and salient-pole machines 5 [from memory: Pyrhonen, Jokinen,
    Hrabovcova, Design of Rotating Electrical Machines, Table 6.2: induction 3-8,
    salient-pole synchronous 2-5 A/mm^2]; water jacket 12 and 20 (common practice, no
    source: between the air-cooled and liquid-cooled ends). Each cell is an option of its
    own (`induction_enclosed_fan`); a cooling method's option (`enclosed_fan`), when the
    team sets it, applies to every machine kind whose cell the team has not set.

    Rotor conductors: a cage bar carries the stator current referred by equal fundamental
    MMF, I_bar = 2 m N_ph kw1 I_ph / Q_r (the magnetising share is not deducted, so this is an
    upper bound), over the bar section (a cast bar fills its slot); an end ring carries
    I_ring = I_bar / (2 sin(pi p / Q_r)) over its section; a field coil carries the field
    current over its conductor section. Defaults 8 A/mm^2 for bars and rings (aluminium) and
    5 A/mm^2 for field coils, the upper ends of the usual ranges [from memory: Pyrhonen,
    Jokinen, Hrabovcova, Design of Rotating Electrical Machines, Table 6.2].

    Set the team's own limits in emgate.yaml, e.g.
    ``options: {current-density: {enclosed_fan: 7 A/mm^2}}``.
    """

    id = "current-density"
    summary = "conductor current density within the limit for the cooling method"
    version = "2"
    tags = ("electrical", "thermal")

    def check(
        self, design: AnyDesign, options: CurrentDensityOptions, context: Context
    ) -> Iterable[Check | Problem]:
        method = design.cooling.method
        cell = f"{design.machine}_{method}"
        shared = getattr(options, method)
        if shared is not None and options.basis(cell) != TEAM_LIMIT:
            stator = Limit(shared, TEAM_LIMIT)
        else:
            stator = options.limit_for(cell)
        yield context.check(
            "stator.current_density",
            Limit(stator.value, f"{method.replace('_', ' ')}: {stator.basis}"),
            "max",
            path=("winding", "conductor"),
            label="stator current density",
        )
        rotor: list[tuple[str, str, str, tuple[str, ...]]] = []
        if design.machine == "induction":
            rotor += [
                (
                    "cage_bar",
                    "rotor.bar_current_density",
                    "cage bar current density",
                    ("rotor", "slot"),
                ),
                (
                    "end_ring",
                    "rotor.ring_current_density",
                    "end-ring current density",
                    ("rotor", "cage", "end_ring"),
                ),
            ]
        elif design.machine == "salient_field":
            rotor.append(
                (
                    "field_coil",
                    "rotor.field_current_density",
                    "field coil current density",
                    ("rotor", "field", "conductor"),
                )
            )
        for field, name, label, path in rotor:
            yield context.check(name, options.limit_for(field), "max", path=path, label=label)
