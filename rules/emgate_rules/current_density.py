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

#: Upper ends of the ranges by cooling [mem: Hendershot and Miller, Design of Brushless
#: Permanent-Magnet Machines]: totally enclosed non-ventilated 1.5-5 A/mm^2, fan-cooled 5-10,
#: liquid-cooled 10-30. A water jacket cools the winding only through the iron, so its default
#: sits between the fan-cooled and liquid-cooled ends (common practice, no source).
DEFAULT_LIMITS = {
    "enclosed_natural": 5.0 * _MM2,
    "enclosed_fan": 10.0 * _MM2,
    "open_ventilated": 10.0 * _MM2,
    "liquid_jacket": 20.0 * _MM2,
    "direct_liquid": 30.0 * _MM2,
}
SOURCES = {
    "enclosed_natural": "Hendershot and Miller, totally enclosed non-ventilated, from memory",
    "enclosed_fan": "Hendershot and Miller, fan-cooled, from memory",
    "open_ventilated": "Hendershot and Miller, fan-cooled, from memory",
    "liquid_jacket": "common practice, no source",
    "direct_liquid": "Hendershot and Miller, liquid-cooled, from memory",
}


#: Cage bars and rings: aluminium 3-8 A/mm^2 [from memory: Pyrhonen, Design of Rotating
#: Electrical Machines, Table 6.2]; salient-pole field coils 2-5 A/mm^2 [same, from memory].
ROTOR_DEFAULTS = {"cage_bar": 8.0 * _MM2, "end_ring": 8.0 * _MM2, "field_coil": 5.0 * _MM2}
ROTOR_SOURCE = "Pyrhonen et al., Table 6.2 (from memory)"


class CurrentDensityOptions(Options):
    enclosed_natural: CurrentDensityLimit = Field(default=DEFAULT_LIMITS["enclosed_natural"])
    enclosed_fan: CurrentDensityLimit = Field(default=DEFAULT_LIMITS["enclosed_fan"])
    open_ventilated: CurrentDensityLimit = Field(default=DEFAULT_LIMITS["open_ventilated"])
    liquid_jacket: CurrentDensityLimit = Field(default=DEFAULT_LIMITS["liquid_jacket"])
    direct_liquid: CurrentDensityLimit = Field(default=DEFAULT_LIMITS["direct_liquid"])
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
    options = CurrentDensityOptions

    @unless_unbalanced
    def check(
        self, design: AnyDesign, options: Options, context: Context
    ) -> Iterable[Check | Problem]:
        assert isinstance(options, CurrentDensityOptions)
        calc: Calculation = context.calc
        method = design.cooling.method
        limit = getattr(options, method)
        source = basis(options, method, DEFAULT_LIMITS[method], SOURCES[method])
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
