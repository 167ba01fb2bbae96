"""Air-gap shear stress within the usual range of the cooling method."""

from __future__ import annotations

from collections.abc import Iterable

from pydantic import Field

from emgate.model import AnyDesign
from emgate.quantity import quantity
from emgate.rule import Check, Context, Options, Problem, Rule
from emgate_rules._limits import basis

Stress = quantity("pressure")
_KPA = 1e3

#: (lowest, highest) air-gap shear stress by cooling method [Pa]: half the torque per rotor
#: volume TRV = 2 sigma of T. J. E. Miller's table (from memory: Hendershot and Miller,
#: Design of Brushless Permanent-Magnet Machines): small totally enclosed motors 7-14 kN m/m^3,
#: integral-horsepower industrial motors 7-30, high-performance servos 15-50, aerospace
#: 30-75, large liquid-cooled machines 100-250; grouped by cooling method here (common
#: practice, no source for the grouping).
RANGES = {
    "enclosed_natural": (3.5 * _KPA, 25.0 * _KPA),
    "enclosed_fan": (3.5 * _KPA, 30.0 * _KPA),
    "open_ventilated": (3.5 * _KPA, 40.0 * _KPA),
    "liquid_jacket": (7.5 * _KPA, 60.0 * _KPA),
    "direct_liquid": (15.0 * _KPA, 125.0 * _KPA),
}
SOURCE = "half Miller's TRV ranges (from memory), grouped by cooling method (common practice)"


class ShearStressOptions(Options):
    enclosed_natural_max: Stress = Field(default=RANGES["enclosed_natural"][1])
    enclosed_fan_max: Stress = Field(default=RANGES["enclosed_fan"][1])
    open_ventilated_max: Stress = Field(default=RANGES["open_ventilated"][1])
    liquid_jacket_max: Stress = Field(default=RANGES["liquid_jacket"][1])
    direct_liquid_max: Stress = Field(default=RANGES["direct_liquid"][1])
    enclosed_natural_min: Stress = Field(default=RANGES["enclosed_natural"][0])
    enclosed_fan_min: Stress = Field(default=RANGES["enclosed_fan"][0])
    open_ventilated_min: Stress = Field(default=RANGES["open_ventilated"][0])
    liquid_jacket_min: Stress = Field(default=RANGES["liquid_jacket"][0])
    direct_liquid_min: Stress = Field(default=RANGES["direct_liquid"][0])


class ShearStress(Rule):
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
    options = ShearStressOptions

    def check(
        self, design: AnyDesign, options: Options, context: Context
    ) -> Iterable[Check | Problem]:
        assert isinstance(options, ShearStressOptions)
        method = design.cooling.method
        value = context.calc.value("rotor.shear_stress")
        low, high = RANGES[method]
        where = method.replace("_", " ")
        for bound, default, side in (("max", high, "highest"), ("min", low, "lowest")):
            field = f"{method}_{bound}"
            yield Check(
                "rotor.shear_stress",
                f"air-gap shear stress ({side} usual for {where})",
                ("stator", "stack_length"),
                value,
                getattr(options, field),
                bound,  # type: ignore[arg-type]
                "kN/m^2",
                basis(options, field, default, SOURCE),
            )
