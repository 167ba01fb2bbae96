"""Irreversible demagnetisation of surface magnets at the worst credible current."""

from __future__ import annotations

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
)


class DemagnetisationFaultOptions(Options):
    #: Share of the intrinsic coercivity kept in reserve.
    margin: RatioOrZero = limit(0.1, "1", "common practice, no source", lt=1.0)
    #: The worst credible current over its steady value: 1, the steady short circuit (a
    #: sudden one from no load reaches up to twice its peak on the d-axis in the first
    #: half-period, which stator resistance and the drive's protection usually cut short).
    current_factor: Ratio = limit(1.0, "1", "the steady short circuit (2 for a sudden one)")


class DemagnetisationFault(Rule[DemagnetisationFaultOptions]):
    """The magnets stay clear of the knee at the worst credible stator current, with the
    magnet hot and at the lowest ambient; the finding names the governing case.

    Method. Worst credible current (winding.fault_current_peak): the record's
    rating.peak_current (the drive's current limit, peak) when it declares one; otherwise
    the steady three-phase short circuit, peak sqrt 2 I_k, I_k = psi / L_s = E / (omega
    L_s): the magnets' flux linkage over the synchronous inductance L_s = L_m (1 +
    sigma_delta) + L_u + L_ew (winding.synchronous_inductance: magnetising over the
    magnetic gap, harmonic leakage sigma_delta = THD^2, slot leakage from the slot's
    permeance, end leakage from the coil ends as loops in air; resistance neglected, so
    I_k is the highest steady value). The slot and end leakage err low (I_k high, the safe
    side); but rotor eddy currents (a conducting sleeve, segmented magnets less so) screen
    the harmonic fields and lower L_s below this, raising I_k: for such a rotor declare the
    drive's limit or raise `current_factor`. At a short circuit the current lies on the
    d-axis, against the magnets; a sudden short circuit from no load reaches up to twice
    the steady peak there in its first half-period (set `current_factor` 2 to check it).

    Field strength: H = H_0 - (i / (sqrt 2 I_ph)) F_max / (h_m + mu_rec kc g), H_0 the
    no-load working point from the magnetic circuit (iron included) at the case's magnet
    temperature, F_max the staircase MMF peak at rated current (winding.mmf_peak), scaled
    to the fault current and taken wholly on the d-axis across magnet and gap (iron and
    magnet leakage neglected: the worst side). The two cases: hot, the magnet's operating
    temperature (rotor.magnet_field_strength_fault_hot); cold, the lowest ambient
    (cooling.ambient_min; -15 degC when absent, the lower end of IEC 60034-1's ambient
    range, from memory), with H_0, and without a declared peak the short-circuit current,
    of the cold magnet (rotor.magnet_field_strength_fault_cold). The intrinsic coercivity
    follows H_cJ(T) = H_cJ0 (1 + beta (T - T0)): rare-earth magnets (beta < 0) are weakest
    hot, ferrite (beta > 0) cold. Check: |H| <= H_cJ(T) (1 - margin) in each case; the
    case with the smaller margin governs and its finding says so.

    Defaults: `margin` 0.1 of H_cJ(T) (common practice, no source); `current_factor` 1.
    """

    id = "demagnetisation-fault"
    summary = "magnets clear of the coercivity at the worst credible current, hot and cold"
    machines = ("surface_pm",)
    tags = ("magnetic", "fault")

    def check(
        self, design: AnyDesign, options: DemagnetisationFaultOptions, context: Context
    ) -> Iterable[Check | Problem]:
        sheet = context.sheet
        factor = options.current_factor
        declared = design.rating.peak_current is not None
        source = "declared peak current" if declared else "short-circuit current"
        hot_t = sheet["rotor.magnet_temperature"]  # declared, or the estimate
        cases = []
        for name, temperature, cold, coercivity in (
            ("hot", hot_t, False, "rotor.magnet_coercivity_hot"),
            ("cold", sheet.lowest_ambient, True, "rotor.magnet_coercivity_lowest_ambient"),
        ):
            field = sheet.magnet_field_at_fault(factor, cold=cold)
            current = factor * sheet.fault_current(cold=cold)
            limit_h = sheet[coercivity] * (1.0 - options.margin)
            cases.append((name, temperature, abs(field), limit_h, current))
        governing = min(cases, key=lambda k: (k[3] - k[2]) / k[3])[0]
        text = options.basis("margin")
        for name, temperature, value, limit_h, current in cases:
            tag = ", governs" if name == governing else ""
            celsius = temperature - 273.15
            yield context.check(
                f"rotor.magnet_field_strength_fault_{name}",
                Limit(
                    limit_h,
                    f"H_cJ at {celsius:.4g} degC less a {options.margin:.3g} margin: {text}",
                ),
                "max",
                path=("rotor", "magnet", "thickness"),
                label=f"magnet field strength, {name} case{tag}: {source} {current:.4g} A peak"
                f" on the d-axis, magnet at {celsius:.4g} degC",
                value=value,  # demagnetising: its magnitude against H_cJ
            )
