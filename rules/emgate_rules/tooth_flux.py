"""Tooth flux density."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.model import AnyDesign
from emgate.quantity import FluxDensity
from emgate.rule import Check, Context, Options, Problem, Rule
from emgate_rules._limits import basis, limit
from emgate_rules._winding import unless_unbalanced

STATOR_SOURCE = (
    "Pyrhonen et al., Design of Rotating Electrical Machines, Table 6.1, apparent"
    " stator tooth flux density 1.4-2.1 T (from memory)"
)
ROTOR_SOURCE = "Pyrhonen et al., Table 6.1, rotor tooth of induction machines (from memory)"
STATOR_DEFAULT = 2.1
ROTOR_DEFAULT = 2.2


class ToothFluxOptions(Options):
    stator_apparent: FluxDensity = limit(STATOR_DEFAULT, STATOR_SOURCE)
    rotor_apparent: FluxDensity = limit(ROTOR_DEFAULT, ROTOR_SOURCE)


class ToothFlux(Rule):
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
    options = ToothFluxOptions

    @unless_unbalanced
    def check(
        self, design: AnyDesign, options: Options, context: Context
    ) -> Iterable[Check | Problem]:
        assert isinstance(options, ToothFluxOptions)
        calc = context.calc
        real = calc.stator_tooth_b
        yield Check(
            quantity="stator.tooth_flux_density_apparent",
            label=f"apparent stator tooth flux density (real {real:.3g} T)",
            path=("stator", "slot"),
            value=calc.stator_tooth_b_apparent,
            limit=options.stator_apparent,
            bound="max",
            unit="T",
            basis=basis(options, "stator_apparent", STATOR_DEFAULT, STATOR_SOURCE),
        )
        if design.machine == "induction":
            yield Check(
                quantity="rotor.tooth_flux_density_apparent",
                label=f"apparent rotor tooth flux density (real {calc.rotor_tooth_b:.3g} T)",
                path=("rotor", "slot"),
                value=calc.rotor_tooth_b_apparent,
                limit=options.rotor_apparent,
                bound="max",
                unit="T",
                basis=basis(options, "rotor_apparent", ROTOR_DEFAULT, ROTOR_SOURCE),
            )
