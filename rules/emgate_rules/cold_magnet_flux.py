"""Tooth and yoke flux densities with the magnets at their coldest."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.model import AnyDesign
from emgate.quantity import FluxDensity
from emgate.rule import Check, Context, Options, Problem, Rule
from emgate_rules._limits import basis, limit
from emgate_rules._winding import unless_unbalanced
from emgate_rules.tooth_flux import STATOR_DEFAULT, STATOR_SOURCE
from emgate_rules.yoke_flux import DEFAULTS, SOURCES


class ColdMagnetFluxOptions(Options):
    stator_tooth_apparent: FluxDensity = limit(STATOR_DEFAULT, STATOR_SOURCE)
    stator_yoke: FluxDensity = limit(DEFAULTS["stator_synchronous"], SOURCES["stator_synchronous"])


class ColdMagnetFlux(Rule):
    """Stator tooth and yoke flux densities of a surface-magnet machine with the magnets at
    the lowest ambient, where a magnet with a negative remanence coefficient (NdFeB,
    ferrite) is strongest: a cold start saturates the iron more than the rated point.

    Method: the no-load magnetic circuit (iron included, as for gap-flux) solved again with
    Br(T) = Br0 (1 + alpha (T - T0)) at the lowest ambient, cooling.ambient_min (-15 degC
    when absent, the lower end of the ambient range of IEC 60034-1, from memory); the
    apparent tooth flux density B_g tau_s l / (k_Fe l_Fe b_t) at the narrowest tooth
    (stator.tooth_flux_density_apparent_cold) and the yoke's Phi / (2 k_Fe l h_y)
    (stator.yoke_flux_density_cold).

    Default limits, those of tooth-flux and yoke-flux for the rated point: apparent stator
    tooth 2.1 T, stator yoke of synchronous machines 1.5 T [from memory: Pyrhonen,
    Jokinen, Hrabovcova, Design of Rotating Electrical Machines, Table 6.1].
    """

    id = "cold-magnet-flux"
    summary = "tooth and yoke flux densities with the magnets at the lowest ambient"
    machines = ("surface_pm",)
    tags = ("magnetic",)
    options = ColdMagnetFluxOptions

    @unless_unbalanced
    def check(
        self, design: AnyDesign, options: Options, context: Context
    ) -> Iterable[Check | Problem]:
        from emgate.calc import circuit

        assert isinstance(options, ColdMagnetFluxOptions)
        calc = context.calc
        cold = f"magnet at {circuit.lowest_ambient(calc) - 273.15:.4g} degC"
        yield Check(
            "stator.tooth_flux_density_apparent_cold",
            f"apparent stator tooth flux density, cold case ({cold})",
            ("stator", "slot"),
            calc.value("stator.tooth_flux_density_apparent_cold"),
            options.stator_tooth_apparent,
            "max",
            "T",
            basis(options, "stator_tooth_apparent", STATOR_DEFAULT, STATOR_SOURCE),
        )
        yield Check(
            "stator.yoke_flux_density_cold",
            f"stator yoke flux density, cold case ({cold})",
            ("stator", "outer_diameter"),
            calc.value("stator.yoke_flux_density_cold"),
            options.stator_yoke,
            "max",
            "T",
            basis(
                options,
                "stator_yoke",
                DEFAULTS["stator_synchronous"],
                SOURCES["stator_synchronous"],
            ),
        )
