"""Conductor current density."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.api import AnyDesign, Check, Context, Limit, Options, Problem, Rule, limit, quantity

CurrentDensityLimit = quantity("current_density")
A_MM2 = "A/mm^2"
HM = "Hendershot and Miller"
#: Rotor conductors: aluminium cage bars and rings 3-8 A/mm^2, salient-pole field coils
#: 2-5 A/mm^2, the upper ends.
ROTOR = "Pyrhonen et al., Table 6.2 (from memory)"


class CurrentDensityOptions(Options):
    # Upper ends of the ranges by cooling [from memory: Hendershot and Miller, Design of
    # Brushless Permanent-Magnet Machines]: totally enclosed non-ventilated 1.5-5 A/mm^2,
    # fan-cooled 5-10, liquid-cooled 10-30. A water jacket cools the winding only through
    # the iron, so its default sits between the fan-cooled and liquid-cooled ends.
    enclosed_natural: CurrentDensityLimit = limit(
        5, A_MM2, f"{HM}, totally enclosed non-ventilated, from memory"
    )
    enclosed_fan: CurrentDensityLimit = limit(10, A_MM2, f"{HM}, fan-cooled, from memory")
    open_ventilated: CurrentDensityLimit = limit(10, A_MM2, f"{HM}, fan-cooled, from memory")
    liquid_jacket: CurrentDensityLimit = limit(20, A_MM2, "common practice, no source")
    direct_liquid: CurrentDensityLimit = limit(30, A_MM2, f"{HM}, liquid-cooled, from memory")
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

    Default limits (upper ends of the usual ranges): totally enclosed, no fan 5 A/mm^2;
    fan-cooled or open ventilated 10 A/mm^2; liquid-cooled 30 A/mm^2 [from memory: Hendershot
    and Miller, Design of Brushless Permanent-Magnet Machines]; water jacket 20 A/mm^2
    (common practice, no source).

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
    version = "1"
    tags = ("electrical", "thermal")

    def check(
        self, design: AnyDesign, options: CurrentDensityOptions, context: Context
    ) -> Iterable[Check | Problem]:
        method = design.cooling.method
        stator = options.limit_for(method)
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
