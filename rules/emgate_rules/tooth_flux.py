"""Tooth flux density."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.api import AnyDesign, Check, Context, FluxDensity, Options, Problem, Rule, limit

#: The apparent stator tooth limit (value, unit, source); cold-magnet-flux's too.
STATOR_APPARENT = (
    2.1,
    "T",
    "Pyrhonen et al., Design of Rotating Electrical Machines, Table 6.1, apparent"
    " stator tooth flux density 1.4-2.1 T (from memory)",
)


class ToothFluxOptions(Options):
    stator_apparent: FluxDensity = limit(*STATOR_APPARENT)
    rotor_apparent: FluxDensity = limit(
        2.2, "T", "Pyrhonen et al., Table 6.1, rotor tooth of induction machines (from memory)"
    )


class ToothFlux(Rule[ToothFluxOptions]):
    """Apparent tooth flux density at the narrowest tooth section, stator and cage rotor.

    Method: B_t,app = B_g tau_s l / (k_Fe l_Fe b_t), with B_g the peak gap flux density of the
    magnetic circuit and b_t the narrowest tooth width along the winding zone. The real flux
    density follows from slot-flux sharing, B_app = B_real + mu0 k_s H(B_real), k_s =
    (tau_s l - k_Fe l_Fe b_t) / (k_Fe l_Fe b_t), on the steel's B-H curve; it is reported
    with the check. The limits apply to the apparent value, as the published ranges do.

    Default limits: stator 2.1 T, the upper end of the usual apparent range; cage-rotor teeth
    2.2 T [from memory: Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical Machines,
    Table 6.1].
    """

    id = "tooth-flux"
    summary = "apparent tooth flux density within the limit"
    tags = ("magnetic",)

    def check(
        self, design: AnyDesign, options: ToothFluxOptions, context: Context
    ) -> Iterable[Check | Problem]:
        sheet = context.sheet
        real = sheet["stator.tooth_flux_density"]
        yield context.check(
            "stator.tooth_flux_density_apparent",
            options.limit_for("stator_apparent"),
            "max",
            path=("stator", "slot"),
            label=f"apparent stator tooth flux density (real {real:.3g} T)",
        )
        if design.machine == "induction":
            real = sheet["rotor.tooth_flux_density"]
            yield context.check(
                "rotor.tooth_flux_density_apparent",
                options.limit_for("rotor_apparent"),
                "max",
                path=("rotor", "slot"),
                label=f"apparent rotor tooth flux density (real {real:.3g} T)",
            )
