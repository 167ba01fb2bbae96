"""Electric loading and thermal load."""

from __future__ import annotations

from collections.abc import Iterable
from typing import Annotated

from emgate.api import AnyDesign, Check, Context, Options, Problem, Rule, limit, quantity

ThermalLoad = Annotated[float, quantity("thermal_load")]
LinearCurrent = Annotated[
    float, quantity("field_strength")
]  # A/m: the same dimension as electric loading
CP = "common practice, no source"


class ThermalLoadOptions(Options):
    enclosed_natural: ThermalLoad = limit(150, "A^2/mm^3", CP)
    enclosed_fan: ThermalLoad = limit(300, "A^2/mm^3", CP)
    open_ventilated: ThermalLoad = limit(300, "A^2/mm^3", CP)
    liquid_jacket: ThermalLoad = limit(500, "A^2/mm^3", CP)
    direct_liquid: ThermalLoad = limit(1000, "A^2/mm^3", CP)
    electric_loading: LinearCurrent = limit(
        65,
        "kA/m",
        "Pyrhonen et al., Design of Rotating Electrical Machines, Table 6.2 (from memory)",
    )


class ThermalLoadRule(Rule[ThermalLoadOptions]):
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

    def check(
        self, design: AnyDesign, options: ThermalLoadOptions, context: Context
    ) -> Iterable[Check | Problem]:
        method = design.cooling.method
        limit = options.limit_for(method)
        yield context.check(
            "stator.thermal_load",
            type(limit)(limit.value, f"{method.replace('_', ' ')}: {limit.basis}"),
            "max",
            path=("winding", "conductor"),
            label="thermal load A*J",
        )
        yield context.check(
            "stator.electric_loading",
            options.limit_for("electric_loading"),
            "max",
            path=("winding", "turns_per_coil"),
            label="electric loading",
        )
