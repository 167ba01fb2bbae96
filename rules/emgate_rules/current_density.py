"""Conductor current density."""

from __future__ import annotations

from collections.abc import Iterable

from pydantic import Field

from emgate.calc import Calculation
from emgate.model import AnyDesign
from emgate.quantity import quantity
from emgate.rule import Check, Context, Options, Problem, Rule
from emgate_rules._limits import basis
from emgate_rules._winding import unless_unbalanced

CurrentDensityLimit = quantity("current_density")
_MM2 = 1e6  # A/mm^2 in A/m^2

HM = "Hendershot and Miller, {}, from memory"
PYR = "Pyrhonen et al., Table 6.2, {} (from memory)"
CP = "common practice, no source"
#: Upper ends of the usual ranges by machine kind and cooling method [A/m^2], each with its
#: source: totally enclosed non-ventilated 1.5-5 A/mm^2, fan-cooled 5-10, liquid-cooled
#: 10-30 [from memory: Hendershot and Miller, Design of Brushless Permanent-Magnet
#: Machines]; induction machines 3-8 and salient-pole synchronous machines 2-5 where air
#: cools the winding [from memory: Pyrhonen, Jokinen, Hrabovcova, Design of Rotating
#: Electrical Machines, Table 6.2]. A water jacket cools the winding only through the iron,
#: so its cells sit between the air-cooled and liquid-cooled ends (common practice).
TABLE: dict[str, dict[str, tuple[float, str]]] = {
    "induction": {
        "enclosed_natural": (5.0 * _MM2, HM.format("totally enclosed non-ventilated")),
        "enclosed_fan": (8.0 * _MM2, PYR.format("induction machines 3-8 A/mm^2")),
        "open_ventilated": (8.0 * _MM2, PYR.format("induction machines 3-8 A/mm^2")),
        "liquid_jacket": (12.0 * _MM2, CP),
        "direct_liquid": (30.0 * _MM2, HM.format("liquid-cooled")),
    },
    "surface_pm": {
        "enclosed_natural": (5.0 * _MM2, HM.format("totally enclosed non-ventilated")),
        "enclosed_fan": (10.0 * _MM2, HM.format("fan-cooled")),
        "open_ventilated": (10.0 * _MM2, HM.format("fan-cooled")),
        "liquid_jacket": (20.0 * _MM2, CP),
        "direct_liquid": (30.0 * _MM2, HM.format("liquid-cooled")),
    },
    "salient_field": {
        "enclosed_natural": (5.0 * _MM2, PYR.format("salient-pole machines 2-5 A/mm^2")),
        "enclosed_fan": (5.0 * _MM2, PYR.format("salient-pole machines 2-5 A/mm^2")),
        "open_ventilated": (5.0 * _MM2, PYR.format("salient-pole machines 2-5 A/mm^2")),
        "liquid_jacket": (12.0 * _MM2, CP),
        "direct_liquid": (30.0 * _MM2, HM.format("liquid-cooled")),
    },
}


#: Cage bars and rings: aluminium 3-8 A/mm^2 [from memory: Pyrhonen, Design of Rotating
#: Electrical Machines, Table 6.2]; salient-pole field coils 2-5 A/mm^2 [same, from memory].
ROTOR_DEFAULTS = {"cage_bar": 8.0 * _MM2, "end_ring": 8.0 * _MM2, "field_coil": 5.0 * _MM2}
ROTOR_SOURCE = "Pyrhonen et al., Table 6.2 (from memory)"


class CurrentDensityOptions(Options):
    """A cooling method's field, when set, is the team's limit for every machine kind."""

    enclosed_natural: CurrentDensityLimit | None = None
    enclosed_fan: CurrentDensityLimit | None = None
    open_ventilated: CurrentDensityLimit | None = None
    liquid_jacket: CurrentDensityLimit | None = None
    direct_liquid: CurrentDensityLimit | None = None
    cage_bar: CurrentDensityLimit = Field(default=ROTOR_DEFAULTS["cage_bar"])
    end_ring: CurrentDensityLimit = Field(default=ROTOR_DEFAULTS["end_ring"])
    field_coil: CurrentDensityLimit = Field(default=ROTOR_DEFAULTS["field_coil"])


class CurrentDensity(Rule):
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
    source: between the air-cooled and liquid-cooled ends). A cooling method's option, when
    the team sets it, applies to every machine kind.

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
    options = CurrentDensityOptions

    @unless_unbalanced
    def check(
        self, design: AnyDesign, options: Options, context: Context
    ) -> Iterable[Check | Problem]:
        assert isinstance(options, CurrentDensityOptions)
        calc: Calculation = context.calc
        method = design.cooling.method
        limit, source = TABLE[design.machine][method]
        if getattr(options, method) is not None:
            limit, source = getattr(options, method), "the team's limit (emgate.yaml)"
        yield Check(
            quantity="stator.current_density",
            label="stator current density",
            path=("winding", "conductor"),
            value=calc.stator_current_density,
            limit=limit,
            bound="max",
            unit="A/mm^2",
            basis=f"{method.replace('_', ' ')}: {source}",
        )
        rotor: list[tuple[str, str, str, tuple[str, ...], float]] = []
        if design.machine == "induction":
            rotor += [
                (
                    "cage_bar",
                    "rotor.bar_current_density",
                    "cage bar current density",
                    ("rotor", "slot"),
                    calc.bar_current_density,
                ),
                (
                    "end_ring",
                    "rotor.ring_current_density",
                    "end-ring current density",
                    ("rotor", "cage", "end_ring"),
                    calc.ring_current_density,
                ),
            ]
        elif design.machine == "salient_field":
            rotor.append(
                (
                    "field_coil",
                    "rotor.field_current_density",
                    "field coil current density",
                    ("rotor", "field", "conductor"),
                    calc.field_current_density,
                )
            )
        for field, name, label, path, value in rotor:
            src = basis(options, field, ROTOR_DEFAULTS[field], ROTOR_SOURCE)
            yield Check(name, label, path, value, getattr(options, field), "max", "A/mm^2", src)
