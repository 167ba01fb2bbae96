"""Electric loading and thermal load."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.model import AnyDesign
from emgate.quantity import quantity
from emgate.rule import Check, Context, Options, Problem, Rule
from emgate_rules._limits import basis, limit

ThermalLoad = quantity("thermal_load")
LinearCurrent = quantity("field_strength")  # A/m: the same dimension as electric loading
_AJ = 1e9  # 1 A^2/mm^3 in A^2/m^3
CP = "common practice, no source"
PYRHONEN = "Pyrhonen et al., Design of Rotating Electrical Machines, Table 6.2 (from memory)"
AJ_DEFAULTS = {
    "enclosed_natural": 150 * _AJ,
    "enclosed_fan": 300 * _AJ,
    "open_ventilated": 300 * _AJ,
    "liquid_jacket": 500 * _AJ,
    "direct_liquid": 1000 * _AJ,
}
A_DEFAULT = 65e3


class ThermalLoadOptions(Options):
    enclosed_natural: ThermalLoad = limit(AJ_DEFAULTS["enclosed_natural"], CP)
    enclosed_fan: ThermalLoad = limit(AJ_DEFAULTS["enclosed_fan"], CP)
    open_ventilated: ThermalLoad = limit(AJ_DEFAULTS["open_ventilated"], CP)
    liquid_jacket: ThermalLoad = limit(AJ_DEFAULTS["liquid_jacket"], CP)
    direct_liquid: ThermalLoad = limit(AJ_DEFAULTS["direct_liquid"], CP)
    electric_loading: LinearCurrent = limit(A_DEFAULT, PYRHONEN)


class ThermalLoadRule(Rule):
    """Electric loading A and thermal load A J against limits by cooling method.

    Method: A = 2 m N_ph I / (pi D) (rms), N_ph the series turns per phase, I the phase
    current, D the bore; J the strand current density; rho A J is the copper loss per unit of
    bore surface, which the cooling must carry away.

    Default limits: A J, by cooling: totally enclosed natural 150, fan-cooled or open 300,
    water jacket 500, direct liquid 1000 A^2/mm^3 (upper ends of the usual ranges; common
    practice, no source); A at most 65 kA/m, the upper end for induction and salient-pole
    machines [from memory: Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical
    Machines, Table 6.2].
    """

    id = "thermal-load"
    summary = "electric loading and thermal load A*J within the limits for the cooling"
    tags = ("thermal",)
    options = ThermalLoadOptions

    def check(
        self, design: AnyDesign, options: Options, context: Context
    ) -> Iterable[Check | Problem]:
        assert isinstance(options, ThermalLoadOptions)
        method = design.cooling.method
        calc = context.calc
        yield Check(
            "stator.thermal_load",
            "thermal load A*J",
            ("winding", "conductor"),
            calc.thermal_load,
            getattr(options, method),
            "max",
            "A^2/mm^3",
            f"{method.replace('_', ' ')}: " + basis(options, method, AJ_DEFAULTS[method], CP),
        )
        yield Check(
            "stator.electric_loading",
            "electric loading",
            ("winding", "turns_per_coil"),
            calc.electric_loading,
            options.electric_loading,
            "max",
            "kA/m",
            basis(options, "electric_loading", A_DEFAULT, PYRHONEN),
        )
