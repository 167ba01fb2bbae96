"""Estimated winding temperature rise against the insulation class."""

from __future__ import annotations

from collections.abc import Iterable

from pydantic import Field

from emgate.api import (
    AnyDesign,
    Check,
    Context,
    Limit,
    Options,
    Problem,
    Rule,
    quantity,
    temperature_rise_limit,
)

Reserve = quantity("temperature_difference", sign="non_negative")
#: Coolant temperature the IEC 60034-1 rise limits are tabulated for [K] (40 degC).
TABLE_COOLANT = 313.15
#: Cooling methods for which the table (indirect air cooling) is applied only as a guide.
LIQUID = ("liquid_jacket", "direct_liquid")


class TemperatureRiseOptions(Options):
    reserve: Reserve = Field(default=0.0, description="K kept below the class limit")


class TemperatureRise(Rule[TemperatureRiseOptions]):
    """Lumped estimate of the winding temperature rise against the insulation class limit.

    An ESTIMATE, to be confirmed by a heat run or a thermal network model of the real frame.

    Method: the stator copper loss m I^2 R at the class reference temperature (R from IEC
    60028 copper; the mean turn length 2 l + 2.4 W + 0.1 m for a distributed winding [from
    memory: Pyrhonen], 2 (l + b_t) + pi w_c around one tooth for tooth coils) flows in
    series through the winding bundle, the slot liner, teeth and yoke, the core-to-frame
    interface, the frame wall and the frame surface to the coolant; the surface by cooling
    method: natural convection (Churchill-Chu) and radiation, fan air along the fins (flat
    plate), air through an open machine, or a liquid film (emgate.physics.thermal). Iron and
    other losses are not included: the estimate is low by their share. The cooling surfaces
    come from the record, so `emgate show` and every rule see the same estimate:
    `cooling.fin_area_factor` (default 4: a finned cast frame wets 3 to 5 times its bare
    cylinder), `cooling.frame_length` (default 1.5 stack lengths, the frame with its end
    shields) and, for open machines, `cooling.core_area_factor` (default 3 times the core
    back) (common practice, no source). The message names the largest step of the path.

    Limits: IEC 60034-1 rise limits by resistance for indirect air cooling and a 40 degC
    coolant, machines up to 200 kW: class B 80 K, F 105 K, H 125 K. A coolant warmer than
    40 degC lowers the limit by its excess, limit = table - max(0, ambient - 40 K) [from
    memory: IEC 60034-1, adjustment of the limits for the coolant temperature, which the
    standard gives for coolants up to 60 degC and leaves to agreement above]; a cooler one
    does not raise it. Then less the team's `reserve`. For liquid-jacket and direct-liquid
    cooling the table, written for indirect air cooling, is applied as a guide and the
    check says so. Classes without a tabulated limit here (A, E, N) are reported, not
    passed.
    """

    id = "temperature-rise"
    summary = "estimated winding temperature rise within the insulation class limit"
    tags = ("thermal",)

    def check(
        self, design: AnyDesign, options: TemperatureRiseOptions, context: Context
    ) -> Iterable[Check | Problem]:
        letter = design.winding.insulation_class
        try:
            class_limit = temperature_rise_limit(letter)
        except ValueError:
            yield Problem(
                ("winding", "insulation_class"),
                f"no IEC 60034-1 rise limit is"
                f" tabulated in emgate for class {letter}; the winding temperature"
                " was not verified",
                severity="warning",
            )
            return
        worst = max(context.sheet.thermal_steps, key=lambda s: s.rise)
        method = design.cooling.method
        excess = max(0.0, design.cooling.ambient - TABLE_COOLANT)
        basis = f"IEC 60034-1 class {letter}"
        if method in LIQUID:
            basis += (
                f" (a table for indirect air cooling, applied to {method.replace('_', ' ')}"
                " cooling as a guide)"
            )
        if excess:
            basis += f", less the coolant's {excess:.3g} K above 40 degC"
        if options.reserve:
            basis += f", less a {options.reserve:g} K reserve"
        yield context.check(
            "winding.temperature_rise",
            Limit(class_limit - excess - options.reserve, basis),
            "max",
            path=("cooling", "method"),
            label=f"estimated winding temperature rise (largest step: {worst.name},"
            f" {worst.rise:.0f} K; an estimate to be confirmed by test)",
        )
