"""Irreversible demagnetisation of surface magnets under the stator's MMF."""

from __future__ import annotations

import math
from collections.abc import Iterable

from emgate.api import (
    AnyDesign,
    Check,
    Context,
    Limit,
    Options,
    Problem,
    Ratio,
    RatioOrZero,
    Rule,
    limit,
    magnet_rotor,
)


class DemagnetisationOptions(Options):
    #: Stator current, in rated currents, whose MMF the magnet must withstand: the rated
    #: current itself unless the team sets its overload or short-circuit factor.
    current_factor: Ratio = limit(1.0, "1", "the rated current (set overload or fault)")
    #: Share of the hot intrinsic coercivity kept in reserve.
    margin: RatioOrZero = limit(0.1, "1", "common practice, no source", lt=1.0)


class Demagnetisation(Rule[DemagnetisationOptions]):
    """The magnets' working point stays clear of the knee at the operating temperature, with
    the stator's demagnetising MMF, and cold too for a magnet whose coercivity grows with
    temperature (ferrite).

    Method: the no-load working point H_0 on the recoil line, solved in the magnetic circuit
    with the iron (as for gap-flux), at the magnet's operating temperature. The stator's
    armature term is the peak F_max of the staircase MMF (winding.mmf_peak: conductors at
    the slot centres, ampere-turns across one gap), the largest |F| over the gap and over
    one period of balanced sinusoidal currents at `current_factor` times the rated phase
    current, computed exactly from the step levels. It is not the rotating fundamental
    F1 = (sqrt 2 m / pi) kw1 N_ph I / p: a tooth-coil winding's sub- and higher harmonics
    put a larger local MMF on a magnet (a 12-slot 10-pole winding peaks about 1.4 F1; a
    distributed winding a few % above F1). F_max is taken wholly on the d-axis against the
    magnet, across magnet and gap only: H_worst = H_0 - F_max / (h_m + mu_rec kc g), kc g
    the gap beside the magnet (Carter on the magnetic gap g' = g + sleeve + h_m / mu_rec, so
    the denominator is mu_rec kc g'). This is an approximation on the worst side: a real
    load angle puts only part of the MMF on the d-axis, and the iron's reluctance and magnet
    leakage are neglected in the armature term. The intrinsic coercivity at a temperature T
    follows the record's reversible coefficient beta, H_cJ(T) = H_cJ0 (1 + beta (T - T0)).
    The check: |H_worst| <= H_cJ(T) (1 - margin); a linear recoil line down to H_cJ is
    assumed (true of sintered NdFeB and SmCo near room temperature; the knee of a hot NdFeB
    or a ferrite lies above H_cJ, which the margin is there to cover).

    Cold: a magnet with beta > 0 (ferrite) is weakest cold. It is then checked also at the
    coolant temperature T_c (cooling.ambient, a cold start) when that is below the operating
    temperature: |H_worst(T_c)| <= H_cJ(T_c) (1 - margin), H_worst(T_c) with H_0 solved again
    for Br(T_c) (higher cold for a negative remanence coefficient) and the same armature
    term. With beta <= 0 (NdFeB, SmCo) the hot check is the stricter one: H_cJ falls faster
    with temperature than |H_0|, which follows Br.

    Defaults (options): `current_factor` 1.0, the rated current (set the team's overload or
    short-circuit factor, e.g. 3); `margin` 0.1 of H_cJ(T) (common practice, no source).
    """

    id = "demagnetisation"
    summary = "magnet working point under the stator MMF clear of the coercivity, hot and cold"
    machines = ("surface_pm",)
    tags = ("magnetic",)

    def check(
        self, design: AnyDesign, options: DemagnetisationOptions, context: Context
    ) -> Iterable[Check | Problem]:
        sheet = context.sheet
        magnet = magnet_rotor(design).magnet
        factor = options.current_factor
        at = "rated current" if math.isclose(factor, 1.0) else f"{factor:g} x rated current"
        hot, cold = sheet["rotor.magnet_temperature"], design.cooling.ambient
        cases = [("hot", hot, False)]
        if magnet.material.coercivity_temperature_coefficient > 0.0 and cold < hot:
            cases.append(("cold", cold, True))
        for name, temperature, at_coolant in cases:
            suffix = "_cold" if at_coolant else ""
            worst = sheet.magnet_field_with_current(factor, cold=at_coolant)
            coercivity = sheet[f"rotor.magnet_coercivity{suffix or '_hot'}"]
            celsius = temperature - 273.15
            where = "at the coolant temperature, " if at_coolant else ""
            yield context.check(
                f"rotor.magnet_field_strength_worst{suffix}",
                Limit(
                    coercivity * (1.0 - options.margin),
                    f"H_cJ at {celsius:.4g} degC less a {options.margin:.3g} margin: "
                    + options.basis("margin"),
                ),
                "max",
                path=("rotor", "magnet", "thickness"),
                label=f"magnet field strength at {at}, {where}stator MMF peak on the d-axis"
                f" ({name} H_cJ {coercivity / 1e3:.4g} kA/m)",
                value=abs(worst),  # demagnetising: its magnitude against H_cJ
            )
