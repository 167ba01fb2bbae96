"""Estimated winding temperature rise against the insulation class."""

from __future__ import annotations

from collections.abc import Iterable

from pydantic import Field

from emgate import calc as c
from emgate.model import AnyDesign
from emgate.quantity import quantity
from emgate.rule import Check, Context, Options, Problem, Rule

Reserve = quantity("temperature_difference", sign="non_negative")
CP = "common practice, no source"


class TemperatureRiseOptions(Options):
    reserve: Reserve = Field(default=0.0, description="K kept below the class limit")
    fin_area_factor: float = Field(default=c.FIN_AREA_FACTOR, gt=0, description=CP)
    frame_length_factor: float = Field(default=c.FRAME_LENGTH_FACTOR, gt=0, description=CP)
    core_area_factor: float = Field(default=c.CORE_AREA_FACTOR, gt=0, description=CP)


class TemperatureRise(Rule):
    """Lumped estimate of the winding temperature rise against the insulation class limit.

    An ESTIMATE, to be confirmed by a heat run or a thermal network model of the real frame.

    Method: the stator copper loss m I^2 R at the class reference temperature (R from IEC
    60028 copper, the mean turn length 2 l + 2.4 W + 0.1 m [from memory: Pyrhonen]) flows in
    series through the winding bundle, the slot liner, teeth and yoke, the core-to-frame
    interface, the frame wall and the frame surface to the coolant; the surface by cooling
    method: natural convection (Churchill-Chu) and radiation, fan air along the fins (flat
    plate), air through an open machine, or a liquid film (emgate.physics.thermal). Iron and
    other losses are not included: the estimate is low by their share.

    Limits: IEC 60034-1 rise limits by resistance for indirect air cooling and a 40 degC
    coolant, machines up to 200 kW: class B 80 K, F 105 K, H 125 K; less the team's
    `reserve`. Classes without a tabulated limit here (A, E, N) are reported, not passed.
    """

    id = "temperature-rise"
    summary = "estimated winding temperature rise within the insulation class limit"
    tags = ("thermal",)
    options = TemperatureRiseOptions

    def check(
        self, design: AnyDesign, options: Options, context: Context
    ) -> Iterable[Check | Problem]:
        from emgate.physics.conductors import temperature_rise_limit

        assert isinstance(options, TemperatureRiseOptions)
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
        estimate = context.calc.thermal_estimate(
            options.fin_area_factor, options.frame_length_factor, options.core_area_factor
        )
        worst = max(estimate.steps, key=lambda s: s.rise)
        reserve = f", less a {options.reserve:g} K reserve" if options.reserve else ""
        yield Check(
            "winding.temperature_rise",
            f"estimated winding temperature rise (largest step: {worst.name},"
            f" {worst.rise:.0f} K; an estimate to be confirmed by test)",
            ("cooling", "method"),
            estimate.winding_rise,
            class_limit - options.reserve,
            "max",
            "K",
            f"IEC 60034-1 class {letter}{reserve}",
        )
