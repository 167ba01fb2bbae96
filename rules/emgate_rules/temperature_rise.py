"""Estimated winding temperature rise against the insulation class."""

from __future__ import annotations

from collections.abc import Iterable
from typing import Annotated

from pydantic import Field

from emgate.api import (
    AnyDesign,
    Check,
    Context,
    Limit,
    NotComputed,
    Options,
    Problem,
    Rule,
    quantity,
    rise_limit_allowance,
    temperature_rise_limit,
)

Reserve = Annotated[float, quantity("temperature_difference", sign="non_negative")]
#: Coolant temperature the IEC 60034-1 rise limits are tabulated for [K] (40 degC).
TABLE_COOLANT = 313.15
#: Cooling methods for which the table (indirect air cooling) is applied only as a guide.
LIQUID = ("liquid_jacket", "direct_liquid")


class TemperatureRiseOptions(Options):
    reserve: Reserve = Field(default=0.0, description="K kept below the class limit")


class TemperatureRise(Rule[TemperatureRiseOptions]):
    """Lumped estimate of the winding temperature rise against the insulation class limit.

    An ESTIMATE, to be confirmed by a heat run or a thermal network model of the real frame.

    Method: every loss of the sheet where it arises, in a chain of thermal resistances from
    the winding to the coolant (emgate.physics.thermal): the stator copper (slot parts and
    end windings, all through the slot liner) through the winding bundle, the slot liner,
    teeth and yoke, the core-to-frame interface, the frame wall and the frame surface; the
    tooth iron loss, the stray-load loss and the rotor loss (crossing the gap) join at the
    bore side of the teeth; the yoke iron loss at the teeth-yoke boundary; friction and
    windage at the frame. In an open ventilated machine the through air carries the rotor
    loss and the friction away. The surface by cooling method: natural convection
    (Churchill-Chu) and radiation, fan air along the fins (flat plate), air through an open
    machine, or a liquid film. The losses are those of `emgate show` (losses.*), except
    that the copper loss is evaluated at the winding temperature it produces: the fixed
    point T = T_c + rise(P_cu(T)), R(T) = R20 (1 + 0.00393 (T - 20 degC)) for copper (IEC
    60028), iterated to 0.01 K (winding.operating_temperature). A thermal run-away (no
    fixed point: the loss grows faster with temperature than the cooling sheds it) is an
    error finding. The cooling surfaces come from the record: `cooling.fin_area_factor`
    (default 4: a finned cast frame wets 3 to 5 times its bare cylinder),
    `cooling.frame_length` (default 1.5 stack lengths, the frame with its end shields)
    and, for open machines, `cooling.core_area_factor` (default 3 times the core back)
    (common practice, no source). The message names the largest step of the path.

    Limits: IEC 60034-1 rise limits by resistance for indirect air cooling and a 40 degC
    coolant, machines up to 200 kW: class B 80 K, F 105 K, H 125 K; 5 K more for machines
    rated below 600 W and for totally enclosed fanless machines (IC410, or cooling method
    enclosed_natural) [from memory: IEC 60034-1, the rows of those machines in its table
    of winding rise limits]. A coolant warmer than 40 degC lowers the limit by its excess,
    limit = table - max(0, ambient - 40 K) [from memory: IEC 60034-1, adjustment of the
    limits for the coolant temperature, which the standard gives for coolants up to 60 degC
    and leaves to agreement above]; a cooler one does not raise it. Then less the team's
    `reserve`. For liquid-jacket and direct-liquid cooling the table, written for indirect
    air cooling, is applied as a guide and the check says so. Classes without a tabulated
    limit here (A, E, N) are reported, not passed.

    Magnets: a surface-magnet record whose declared magnet operating temperature lies below
    the estimated rotor temperature (rotor.temperature: bore temperature plus the rotor
    loss across the gap) gets a warning: the magnet checks were made too cold. A record that
    declares none is checked at the estimate.
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
        sheet = context.sheet
        try:
            rise = sheet["winding.temperature_rise"]
        except NotComputed:
            raise
        except ValueError as exc:  # a thermal run-away: no steady temperature exists
            yield Problem(("cooling", "method"), f"{exc} (estimate)", severity="error")
            return
        worst = max(sheet.thermal_steps, key=lambda s: s.rise)
        method = design.cooling.method
        excess = max(0.0, design.cooling.ambient - TABLE_COOLANT)
        fanless = method == "enclosed_natural" or design.cooling.code == "IC410"
        allowance = rise_limit_allowance(design.rating.power, totally_enclosed_fanless=fanless)
        basis = f"IEC 60034-1 class {letter}"
        if allowance:
            basis += f" + {allowance:g} K (small or totally enclosed fanless machine)"
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
            Limit(class_limit + allowance - excess - options.reserve, basis),
            "max",
            path=("cooling", "method"),
            label="estimated winding temperature rise, all losses, copper at"
            f" {rise + design.cooling.ambient - 273.15:.0f} degC (largest step: {worst.name},"
            f" {worst.rise:.0f} K; an estimate to be confirmed by test)",
        )
        if design.machine == "surface_pm" and "rotor.temperature" in sheet:
            rotor = sheet["rotor.temperature"]  # (not estimated for some cooling methods)
            declared = design.rotor.magnet.operating_temperature
            # an undeclared one is the estimate
            if declared is not None and declared < rotor:
                yield Problem(
                    ("rotor", "magnet", "operating_temperature"),
                    f"declared magnet temperature {declared - 273.15:.0f} degC is below the"
                    f" estimated rotor temperature {rotor - 273.15:.0f} degC"
                    " (rotor.temperature): the magnet checks were made too cold",
                    severity="warning",
                )
