"""Rated efficiency against a minimum and an IEC 60034-30-1 class."""

from __future__ import annotations

from collections.abc import Iterable
from typing import Literal

from pydantic import Field

from emgate.api import (
    AnyDesign,
    Check,
    Context,
    Limit,
    Options,
    Problem,
    Ratio,
    Rule,
    efficiency_scope,
    loss_reference_temperature,
    nominal_efficiency,
)


class EfficiencyOptions(Options):
    minimum: Ratio | None = Field(
        default=None, description="lowest rated efficiency, e.g. '90 %' (none by default)"
    )
    minimum_class: Literal["IE1", "IE2", "IE3", "IE4"] | None = Field(
        default=None,
        description="lowest IEC 60034-30-1 class for the motors it covers (none by default)",
    )


class Efficiency(Rule[EfficiencyOptions]):
    """Rated efficiency from the recomputed loss budget, against the team's minimum and an
    IEC 60034-30-1 class.

    Method: efficiency = P2 / (P2 + losses), P2 the rated output (a generator's rating is
    its electrical output; its input is output plus losses). The losses, each on the sheet:

    - stator copper m I^2 R with R at the reference temperature of the insulation class
      (IEC 60034-2-1 basis; class F 115 degC, B 95 degC, H 135 degC, from memory);
    - stator iron of teeth and yoke: build factor (teeth 1.8 induction, 2.0 synchronous;
      yoke 1.5; from memory: Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical
      Machines) x specific loss x mass, the specific loss from the steel's measured table
      when the materials file gives one, else from the grade designation (IEC 60404-8-4:
      M400-50A is 4.00 W/kg at 1.5 T, 50 Hz, 0.50 mm) scaled to the working flux density
      and frequency by a Bertotti split: hysteresis f B^2, classical eddy
      pi^2 d^2 (B f)^2 / (6 rho_e rho_m), excess (f B)^1.5 taking 15 % of the
      non-classical part. The scaling holds for sinusoidal flux while the sheet is thinner
      than the skin depth; above (tooth-coil and high-pole-count machines at several
      hundred Hz) it overstates the eddy loss, on the safe side. Flux densities at no load
      for magnet and field machines;
    - rotor: cage loss |s| P_gap for induction machines; field I^2 R plus the brush drop
      (two brushes, carbon 1.0 V, metal-carbon 0.3 V; IEC 60034-2-1, from memory) for
      wound-field rotors; for surface magnets a declared `losses.magnet_eddy`, else an upper
      bound from the travelling waves of the staircase MMF (unsegmented magnets of
      unlimited length, resistance limited; slot-permeance and inverter harmonics left out);
    - stray load: a declared measured `losses.stray_load`, else the IEC 60034-2-1 assigned
      allowance P1 (0.025 - 0.005 log10(P2 / 1 kW)), 2.5 % of input to 1 kW, 0.5 % from
      10 MW (from memory);
    - friction and windage: a declared `losses.friction_windage`, else k D (l + 0.6 tau_p)
      v^2, k 15 W s^2/m^4 with a shaft fan, 10 without (common practice, after Pyrhonen;
      from memory).

    Class: IEC 60034-30-1 nominal efficiencies of IE1 to IE4 for 50 Hz and 60 Hz, 2 to 8
    poles, 0.12 kW to 1000 kW, linear in log10 P between the tabulated rated powers (the
    standard's own cubic interpolation at 50 Hz agrees to well below the table's 0.1
    point). The table is entered FROM MEMORY: verify against the standard. The standard's
    efficiency is the one determined by IEC 60034-2-1 with the losses at the reference
    temperature of the insulation class, which is how it is recomputed here; the findings
    say so. Only line-fed induction motors are classed: other machines are not held to the
    class option, and an induction motor outside the standard's scope (say 400 Hz) gets an
    info finding that the class was not checked.

    Defaults: no minimum and no class (the sheet still reports `rating.efficiency` and
    `rating.efficiency_class`); a team sets `minimum` ('90 %') and/or `minimum_class`
    ('IE3') in emgate.yaml.
    """

    id = "efficiency"
    summary = "rated efficiency at least the team's minimum and IEC 60034-30-1 class"
    tags = ("efficiency",)

    def check(
        self, design: AnyDesign, options: EfficiencyOptions, context: Context
    ) -> Iterable[Check | Problem]:
        t_ref = loss_reference_temperature(design.winding.insulation_class) - 273.15
        basis_t = (
            f"copper at {t_ref:.0f} degC, the reference temperature of class"
            f" {design.winding.insulation_class} (IEC 60034-2-1)"
        )
        if options.minimum is not None:
            yield context.check(
                "rating.efficiency",
                Limit(options.minimum, f"the team's minimum (emgate.yaml); {basis_t}"),
                "min",
                path=("rating", "power"),
                label="rated efficiency from the recomputed losses",
            )
        if options.minimum_class is None:
            return
        if design.machine != "induction" or design.rating.operation != "motor":
            return  # the classes are for motors of that kind (docstring)
        r = design.rating
        reason = efficiency_scope(r.power, design.poles, r.frequency)
        if reason is not None:
            yield Problem(
                ("rating", "power"),
                f"IEC 60034-30-1 does not cover this record ({reason}): the minimum class"
                f" {options.minimum_class} was not checked",
                severity="info",
            )
            return
        floor = nominal_efficiency(options.minimum_class, r.power, design.poles, r.frequency)
        yield context.check(
            "rating.efficiency",
            Limit(
                floor,
                f"IEC 60034-30-1 {options.minimum_class} at {r.power / 1e3:g} kW,"
                f" {design.poles} poles, {r.frequency:g} Hz (table from memory, verify against"
                " the standard); the standard's efficiency is at the reference temperature"
                f" of the insulation class: {basis_t}",
            ),
            "min",
            path=("rating", "power"),
            label=f"rated efficiency against {options.minimum_class}",
        )
