"""Air-gap shear stress within the usual range of the cooling method."""

from __future__ import annotations

from collections.abc import Iterable
from typing import Annotated

from emgate.api import AnyDesign, Bound, Check, Context, Options, Problem, Rule, limit, quantity

Stress = Annotated[float, quantity("pressure")]
KPA = "kN/m^2"
# (lowest, highest) air-gap shear stress by cooling method: half the torque per rotor
# volume TRV = 2 sigma of T. J. E. Miller's table (from memory: Hendershot and Miller,
# Design of Brushless Permanent-Magnet Machines): small totally enclosed motors 7-14 kN m/m^3,
# integral-horsepower industrial motors 7-30, high-performance servos 15-50, aerospace
# 30-75, large liquid-cooled machines 100-250; grouped by cooling method here (common
# practice, no source for the grouping).
SOURCE = "half Miller's TRV ranges (from memory), grouped by cooling method (common practice)"


class ShearStressOptions(Options):
    enclosed_natural_max: Stress = limit(25.0, KPA, SOURCE)
    enclosed_fan_max: Stress = limit(30.0, KPA, SOURCE)
    open_ventilated_max: Stress = limit(40.0, KPA, SOURCE)
    liquid_jacket_max: Stress = limit(60.0, KPA, SOURCE)
    direct_liquid_max: Stress = limit(125.0, KPA, SOURCE)
    enclosed_natural_min: Stress = limit(3.5, KPA, SOURCE)
    enclosed_fan_min: Stress = limit(3.5, KPA, SOURCE)
    open_ventilated_min: Stress = limit(3.5, KPA, SOURCE)
    liquid_jacket_min: Stress = limit(7.5, KPA, SOURCE)
    direct_liquid_min: Stress = limit(15.0, KPA, SOURCE)


class ShearStress(Rule[ShearStressOptions]):
    """Air-gap shear stress (tangential force per rotor surface) within the usual range of
    the cooling method: above it the winding and magnets are driven harder than the
    cooling usually carries away; below it the machine is larger than it needs to be.

    Method: rated torque T = P / (2 pi n) (rating.torque: a motor's shaft power; a
    generator's active output P cos phi, cos phi rating.power_factor or 0.8, losses
    neglected), sigma = T / (2 V_r), V_r = pi D_r^2 l / 4 the rotor volume, D_r = D - 2 g
    the rotor's outer diameter (rotor.shear_stress) [from memory: Pyrhonen, Jokinen,
    Hrabovcova, Design of Rotating Electrical Machines, ch. 6, the tangential stress].

    Default ranges, kN/m^2 (half the torque per rotor volume TRV = 2 sigma of T. J. E.
    Miller's table, from memory: Hendershot and Miller, Design of Brushless Permanent-Magnet
    Machines: small totally enclosed motors 7-14 kN m/m^3, integral-horsepower industrial
    motors 7-30, high-performance servos 15-50, aerospace 30-75, large liquid-cooled
    machines 100-250; grouped by cooling method here, common practice, no source for the
    grouping): totally enclosed, no fan 3.5-25; fan-cooled 3.5-30; open ventilated 3.5-40;
    water jacket 7.5-60; direct liquid 15-125. A sizing indicator: warning by default.
    """

    id = "shear-stress"
    summary = "air-gap shear stress within the usual range of the cooling method"
    severity = "warning"
    tags = ("sizing", "thermal")

    def check(
        self, design: AnyDesign, options: ShearStressOptions, context: Context
    ) -> Iterable[Check | Problem]:
        method = design.cooling.method
        where = method.replace("_", " ")
        sides: tuple[tuple[Bound, str], ...] = (("max", "highest"), ("min", "lowest"))
        for bound, side in sides:
            yield context.check(
                "rotor.shear_stress",
                options.limit_for(f"{method}_{bound}"),
                bound,
                path=("stator", "stack_length"),
                label=f"air-gap shear stress ({side} usual for {where})",
            )
