"""Tooth and yoke flux densities with the magnets at their coldest."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.api import AnyDesign, Check, Context, FluxDensity, Options, Problem, Rule, limit
from emgate_rules.tooth_flux import STATOR_APPARENT
from emgate_rules.yoke_flux import STATOR_SYNCHRONOUS


class ColdMagnetFluxOptions(Options):
    # the rated point's limits of tooth-flux and yoke-flux
    stator_tooth_apparent: FluxDensity = limit(*STATOR_APPARENT)
    stator_yoke: FluxDensity = limit(*STATOR_SYNCHRONOUS)


class ColdMagnetFlux(Rule[ColdMagnetFluxOptions]):
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

    def check(
        self, design: AnyDesign, options: ColdMagnetFluxOptions, context: Context
    ) -> Iterable[Check | Problem]:
        cold = f"magnet at {context.sheet.lowest_ambient - 273.15:.4g} degC"
        yield context.check(
            "stator.tooth_flux_density_apparent_cold",
            options.limit_for("stator_tooth_apparent"),
            "max",
            path=("stator", "slot"),
            label=f"apparent stator tooth flux density, cold case ({cold})",
        )
        yield context.check(
            "stator.yoke_flux_density_cold",
            options.limit_for("stator_yoke"),
            "max",
            path=("stator", "outer_diameter"),
            label=f"stator yoke flux density, cold case ({cold})",
        )
