"""Irreversible demagnetisation of surface magnets under the stator's MMF."""

from __future__ import annotations

import math
from collections.abc import Iterable

from emgate.model import AnyDesign
from emgate.rule import Check, Context, Options, Problem, Rule
from emgate_rules._limits import Ratio, RatioOrZero, basis, limit
from emgate_rules._winding import unless_unbalanced

CP = "common practice, no source"
#: Stator current, in rated currents, whose MMF the magnet must withstand: the rated
#: current itself unless the team sets its overload or short-circuit factor.
CURRENT_FACTOR = 1.0
#: Share of the hot intrinsic coercivity kept in reserve (common practice, no source).
MARGIN = 0.1


class DemagnetisationOptions(Options):
    current_factor: Ratio = limit(CURRENT_FACTOR, "the rated current (set overload or fault)")
    margin: RatioOrZero = limit(MARGIN, CP, lt=1.0)


class Demagnetisation(Rule):
    """The magnets' working point stays clear of the knee at the operating temperature, with
    the stator's demagnetising MMF.

    Method: the no-load working point H_0 on the recoil line, solved in the magnetic circuit
    with the iron (as for gap-flux), at the magnet's operating temperature. The stator's
    peak fundamental ampere-turns per pole, F1 = (sqrt 2 m / pi) kw1 N_ph I / p at
    `current_factor` times the rated phase current I (kw1 from the slot layout), is then
    taken wholly on the d-axis against the magnet, across magnet and gap only:
    H_worst = H_0 - F1 / (h_m + mu_rec kc g), kc g the gap beside the magnet (Carter on the
    magnetic gap g' = g + sleeve + h_m / mu_rec, so the denominator is mu_rec kc g'). This is
    an approximation on the worst side: a real load angle puts only part of F1 on the
    d-axis, and the iron's reluctance and magnet leakage are neglected in the armature term.
    The intrinsic coercivity at the operating temperature T follows the record's reversible
    coefficient beta, H_cJ(T) = H_cJ0 (1 + beta (T - T0)). The check: |H_worst| <= H_cJ(T)
    (1 - margin); a linear recoil line down to H_cJ is assumed (true of sintered NdFeB and
    SmCo near room temperature; the knee of a hot NdFeB or a ferrite lies above H_cJ, which
    the margin is there to cover).

    Defaults (options): `current_factor` 1.0, the rated current (set the team's overload or
    short-circuit factor, e.g. 3); `margin` 0.1 of H_cJ(T) (common practice, no source).
    """

    id = "demagnetisation"
    summary = "magnet working point under the stator MMF clear of the hot coercivity"
    machines = ("surface_pm",)
    tags = ("magnetic",)
    options = DemagnetisationOptions

    @unless_unbalanced
    def check(
        self, design: AnyDesign, options: Options, context: Context
    ) -> Iterable[Check | Problem]:
        assert isinstance(options, DemagnetisationOptions)
        calc = context.calc
        worst = calc.magnet_h_with_current(options.current_factor)
        coercivity = calc.magnet_coercivity_hot
        factor = options.current_factor
        at = "rated current" if math.isclose(factor, 1.0) else f"{factor:g} x rated current"
        celsius = design.rotor.magnet.operating_temperature - 273.15
        yield Check(
            "rotor.magnet_field_strength_worst",
            f"magnet field strength at {at}, stator MMF on the d-axis (hot H_cJ"
            f" {coercivity / 1e3:.4g} kA/m)",
            ("rotor", "magnet", "thickness"),
            abs(worst),
            coercivity * (1.0 - options.margin),
            "max",
            "kA/m",
            f"H_cJ at {celsius:.4g} degC less a {options.margin:.3g} margin: "
            + basis(options, "margin", MARGIN, CP),
        )
