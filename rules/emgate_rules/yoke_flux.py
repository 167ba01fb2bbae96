"""Yoke flux density."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.model import AnyDesign
from emgate.quantity import FluxDensity
from emgate.rule import Check, Context, Options, Problem, Rule
from emgate_rules._limits import basis, limit

INDUCTION = (
    "Pyrhonen et al., Design of Rotating Electrical Machines, Table 6.1, stator yoke"
    " of induction machines 1.4-1.7 T (from memory)"
)
SYNCHRONOUS = (
    "Pyrhonen et al., Table 6.1, stator yoke of synchronous machines 1.0-1.5 T (from memory)"
)
ROTOR = "common practice, no source"


class YokeFluxOptions(Options):
    stator_induction: FluxDensity = limit(1.7, INDUCTION)
    stator_synchronous: FluxDensity = limit(1.5, SYNCHRONOUS)
    rotor: FluxDensity = limit(1.7, ROTOR)


class YokeFlux(Rule):
    """Peak flux density in the stator and rotor yokes.

    Method: half the flux per pole passes each way through the yoke, B_y = Phi / (2 k_Fe l
    h_y), with h_y the yoke height left by the slots (stator), or by the cage slots, magnets or
    pole bodies (rotor); a salient pole's rim carries the pole leakage too.

    Default limits: stator yoke 1.7 T for induction machines and 1.5 T for synchronous ones
    (surface PM, salient field), the upper ends of the usual ranges [from memory: Pyrhonen,
    Jokinen, Hrabovcova, Design of Rotating Electrical Machines, Table 6.1]; rotor yoke 1.7 T
    (common practice, no source).
    """

    id = "yoke-flux"
    summary = "stator and rotor yoke flux densities within the limits"
    tags = ("magnetic",)
    options = YokeFluxOptions

    def check(
        self, design: AnyDesign, options: Options, context: Context
    ) -> Iterable[Check | Problem]:
        assert isinstance(options, YokeFluxOptions)
        calc = context.calc
        field = "stator_induction" if design.machine == "induction" else "stator_synchronous"
        default = 1.7 if field == "stator_induction" else 1.5
        source = INDUCTION if field == "stator_induction" else SYNCHRONOUS
        yield Check(
            "stator.yoke_flux_density",
            "stator yoke flux density",
            ("stator", "outer_diameter"),
            calc.stator_yoke_b,
            getattr(options, field),
            "max",
            "T",
            basis(options, field, default, source),
        )
        yield Check(
            "rotor.yoke_flux_density",
            "rotor yoke flux density",
            ("rotor", "inner_diameter"),
            calc.rotor_yoke_b,
            options.rotor,
            "max",
            "T",
            basis(options, "rotor", 1.7, ROTOR),
        )
