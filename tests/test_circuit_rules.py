"""The circuit on the sheet and the rules of the worst cases and of the limits that fit the
machine: mmf-thd by winding family, demagnetisation-fault, back-emf-top-speed, shear-stress,
current density by machine kind and cooling, slot fill by family and the radial stack.

Variants of the demo records go through the CLI in-process; sheet values are checked against
the textbook formulas evaluated by hand from other sheet values.
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from conftest import (
    GENSET,
    PUMP,
    SERVO,
    check_json,
    findings,
    outcome,
    sheet,
    the_check,
    variant,
    write_config,
)

MU0 = 1.25663706127e-6  # [pub: CODATA 2022, as scipy.constants.mu_0]
#: Sheet values are SI floats from the same run: rounding only.
EXACT = 1e-9

#: The servo's slot scaled for 24 slots on its 78 mm bore (a 10.2 mm slot pitch).
NARROW_SLOT = {
    "stator.slot.opening": "1.5 mm",
    "stator.slot.top_width": "4.5 mm",
    "stator.slot.bottom_width": "6.5 mm",
}


# --- mmf-thd by winding family --------------------------------------------------------------


@pytest.mark.parametrize(
    ("slots", "poles", "layers", "extra"),
    [
        (12, 10, 2, {}),
        (12, 10, 1, {}),
        (9, 8, 2, {"rating.frequency": "100 Hz"}),
        (24, 22, 2, {**NARROW_SLOT, "rating.frequency": "275 Hz"}),
        (24, 22, 1, {**NARROW_SLOT, "rating.frequency": "275 Hz"}),
    ],
)
def test_tooth_coil_windings_pass_mmf_thd_by_default(
    repo: Path, slots: int, poles: int, layers: int, extra: dict[str, str]
) -> None:
    # THD 0.984, 1.635, 1.087, 1.140, 1.877 [calc: tests/physics/test_inductance.py] under
    # the family ceilings 1.3 (two layers) and 2.0 (one layer); 9/8 has no balanced single
    # layer (Q / (2 m t) = 1.5 [mem: Pyrhonen, balance of a single layer])
    path = variant(
        repo,
        {"stator.slots": slots, "poles": poles, "winding.layers": layers, **extra},
        base=SERVO,
    )
    result = check_json(path)
    assert outcome(result, "mmf-thd")["status"] == "pass"
    family = "double layer" if layers == 2 else "single layer"
    check = the_check(result, "mmf-thd", "winding.mmf_thd")
    assert f"tooth coil {family}" in check["label"]


def test_full_pitch_q1_distributed_winding_fails_mmf_thd(repo: Path) -> None:
    # three-phase q = 1 full pitch: THD sqrt(pi^2 / 9 - 1) = 0.311 [calc, closed form] over
    # the distributed ceiling 0.2
    path = variant(repo, {"stator.slots": 12, "winding.coil_pitch": 3}, base=PUMP)
    result = check_json(path)
    check = the_check(result, "mmf-thd", "winding.mmf_thd")
    assert check["value"] == pytest.approx(math.sqrt(math.pi**2 / 9 - 1), abs=1e-12)
    assert not check["passed"]
    assert "distributed" in check["label"]


def test_subharmonic_and_slot_harmonic_options(repo: Path) -> None:
    # 12/10 double layer: largest sub-harmonic 0.359 (order 1), slot harmonic 5/7 = 0.714
    # (order 7) [calc]; limits just below each flip them, none are checked by default

    path = variant(repo, {}, base=SERVO)
    checks = outcome(check_json(path), "mmf-thd")["checks"]
    assert [c["quantity"] for c in checks] == ["winding.mmf_thd"]
    write_config(repo, "options:\n  mmf-thd:\n    subharmonic: 35 %\n    slot_harmonic: 0.7\n")
    result = check_json(path)
    sub = the_check(result, "mmf-thd", "winding.mmf_largest_subharmonic")
    slot = the_check(result, "mmf-thd", "winding.mmf_largest_slot_harmonic")
    assert sub["value"] == pytest.approx(0.35898, abs=5e-6)
    assert slot["value"] == pytest.approx(5 / 7, abs=1e-12)
    assert not sub["passed"] and not slot["passed"]


# --- the circuit on the sheet ---------------------------------------------------------------


def test_servo_inductances_and_short_circuit_by_hand() -> None:
    # [mem: Fitzgerald and Kingsley; Pyrhonen ch. 3] L_m = (m/pi) mu0 (kw N)^2 D l / (p^2 g_e)
    # from the sheet's own kw, N and g_e; L_s = L_m (1 + THD^2) + L_u + L_ew; I_k = E /
    # (omega L_s); k_T = m p E / omega. Rounding only.
    s = sheet(SERVO)
    kw, n, ge = (
        s["winding.winding_factor"],
        s["winding.series_turns"],
        s["air_gap.effective_length"],
    )
    lm = 3 / math.pi * MU0 * (kw * n) ** 2 * 0.078 * 0.060 / (5**2 * ge)
    assert s["winding.magnetising_inductance"] == pytest.approx(lm, rel=EXACT)
    sigma = s["winding.mmf_thd"] ** 2
    assert s["winding.harmonic_leakage_coefficient"] == pytest.approx(sigma, rel=EXACT)
    ls = lm * (1 + sigma) + s["winding.slot_leakage_inductance"]
    ls += s["winding.end_leakage_inductance"]
    assert s["winding.synchronous_inductance"] == pytest.approx(ls, rel=EXACT)
    omega = 2 * math.pi * 125.0
    i_k = s["winding.back_emf"] / (omega * ls)
    assert s["winding.short_circuit_current"] == pytest.approx(i_k, rel=EXACT)
    assert s["winding.fault_current_peak"] == pytest.approx(math.sqrt(2) * i_k, rel=EXACT)
    assert s["winding.torque_constant"] == pytest.approx(3 * 5 * s["winding.back_emf"] / omega)


def test_slot_leakage_of_the_servo_by_hand() -> None:
    # [mem: Pyrhonen sec. 4.3] lambda = k1 lambda_zone + k2 (2 h_w / (b0 + b1) + h0 / b0),
    # k1 = k2 = 7/8 for 12/10 tooth coils side by side [calc], zone 10 -> 14 mm over 13.5 mm;
    # L_u = 4 m mu0 l N^2 lambda / Q. Rounding only (the zone's closed form: 1e-10).
    from emgate.physics.slot_leakage import trapezoid_zone_permeance

    s = sheet(SERVO)
    lam = 0.875 * (trapezoid_zone_permeance(10.0, 14.0, 13.5) + 2 * 1.5 / 12.0 + 1.0 / 2.0)
    assert s["stator.slot_permeance"] == pytest.approx(lam, rel=1e-10)
    n = s["winding.series_turns"]
    assert s["winding.slot_leakage_inductance"] == pytest.approx(
        4 * 3 * MU0 * 0.060 * n**2 * lam / 12, rel=1e-10
    )


def test_the_cold_magnet_at_top_speed(repo: Path) -> None:
    # [calc] E is proportional to the speed: doubling the top speed doubles the cold EMF; the
    # lowest ambient defaults to -15 degC (IEC 60034-1's range, from memory): H_cJ =
    # 1500 kA/m (1 - 0.006 (-15 - 20)) = 1815 kA/m. Rounding only.
    rated = sheet(variant(repo, {}, base=SERVO))
    fast = sheet(variant(repo, {"rating.max_speed": "3000 rpm"}, base=SERVO))
    assert fast["winding.back_emf_cold_top_speed"] == pytest.approx(
        2 * rated["winding.back_emf_cold_top_speed"], rel=EXACT
    )
    assert rated["rotor.magnet_coercivity_lowest_ambient"] == pytest.approx(1815e3, rel=EXACT)
    # a cold magnet has more remanence: more EMF and flux than hot (Br falls 0.12 %/K)
    assert rated["winding.back_emf_cold_top_speed"] > rated["winding.back_emf"]
    assert rated["stator.tooth_flux_density_cold"] > rated["stator.tooth_flux_density"]
    assert rated["stator.yoke_flux_density_cold"] > rated["stator.yoke_flux_density"]


def test_pump_torque_shear_and_magnetising_current_by_hand() -> None:
    # [calc] T = 7500 W / (2 pi 1460/60) = 49.0546 N m; sigma = T / (2 pi D_r^2 l / 4),
    # D_r = 136 - 0.9 mm; I_m = pi p F / (sqrt 2 m kw N) [mem: Pyrhonen ch. 3]. Rounding only.
    s = sheet(PUMP)
    torque = 7500 / (2 * math.pi * 1460 / 60)
    assert s["rating.torque"] == pytest.approx(torque, rel=EXACT)
    volume = math.pi * 0.1351**2 * 0.140 / 4
    assert s["rotor.shear_stress"] == pytest.approx(torque / (2 * volume), rel=EXACT)
    i_m = (
        math.pi
        * 2
        * s["magnetic.total_mmf"]
        / (math.sqrt(2) * 3 * s["winding.winding_factor"] * s["winding.series_turns"])
    )
    assert s["winding.magnetising_current"] == pytest.approx(i_m, rel=EXACT)
    # a 7.5 kW four-pole motor draws a third to a half of its rated current to magnetise
    # (common practice, no source): the pump's 8.43 A phase current
    assert 0.25 < s["winding.magnetising_current"] / s["winding.phase_current"] < 0.6


def test_genset_field_current_on_load() -> None:
    # [mem: Pyrhonen ch. 7] a generator at rated load and 0.8 lagging needs 1.5 to 2.5 times
    # its no-load field current (common practice, no source for the band): the armature's
    # demagnetising MMF and the leakage drop add to the no-load excitation.
    s = sheet(GENSET)
    ratio = s["rotor.field_current_rated_load"] / 9.0
    assert 1.5 < ratio < 2.5
    section = 1.6e-3**2 * math.pi / 4  # one round strand [calc]
    assert s["rotor.field_current_density_rated_load"] == pytest.approx(
        s["rotor.field_current_rated_load"] / section, rel=EXACT
    )
    # its copper loss at rated load grows as the square of the current [calc]
    assert s["rotor.field_copper_loss_rated_load"] > 0


def test_unity_power_factor_needs_less_field(repo: Path) -> None:
    # [mem: Chapman, the generator's phasor diagram] at unity power factor the armature MMF
    # is in quadrature with the field: less field current than at 0.8 lagging
    lagging = sheet(variant(repo, {}, base=GENSET))["rotor.field_current_rated_load"]
    unity = sheet(variant(repo, {"rating.power_factor": 1.0}, base=GENSET))
    assert unity["rotor.field_current_rated_load"] < lagging


# --- the worst cases in the rules -----------------------------------------------------------


def test_demagnetisation_fault_names_the_governing_case(repo: Path) -> None:
    # NdFeB (beta -0.6 %/K) is weakest hot: the hot case governs by default; a drive limit
    # of 60 A peak (4.4 times the short circuit) breaks it, and the finding says which
    # current it took
    result = check_json(variant(repo, {}, base=SERVO))
    hot = the_check(result, "demagnetisation-fault", "rotor.magnet_field_strength_fault_hot")
    assert "hot case, governs: short-circuit current" in hot["label"]
    assert hot["passed"]
    result = check_json(variant(repo, {"rating.peak_current": "60 A"}, base=SERVO))
    (finding,) = findings(result, "demagnetisation-fault")
    assert "governs: declared peak current 60 A" in finding["message"]


def test_demagnetisation_fault_of_ferrite_is_cold(repo: Path) -> None:
    # ferrite: coercivity rises with temperature (+0.3 %/K), so the cold case governs
    ferrite = {
        "rotor.magnet.material.remanence": "0.42 T",
        "rotor.magnet.material.remanence_temperature_coefficient": "-0.2 %/K",
        "rotor.magnet.material.intrinsic_coercivity": "300 kA/m",
        "rotor.magnet.material.coercivity_temperature_coefficient": "0.3 %/K",
        "rotor.magnet.thickness": "6 mm",
    }
    result = check_json(variant(repo, ferrite, base=SERVO))
    cold = the_check(result, "demagnetisation-fault", "rotor.magnet_field_strength_fault_cold")
    assert "cold case, governs" in cold["label"]


def test_back_emf_top_speed_against_the_converter(repo: Path) -> None:
    # the cold magnet at 3000 rpm gives twice its 229 V [calc: sheet] against the rated
    # 230.9 V phase voltage: fails; a converter rated 600 V rms per phase holds it
    path = variant(repo, {"rating.max_speed": "3000 rpm"}, base=SERVO)
    (finding,) = findings(check_json(path), "back-emf-top-speed")
    assert "3000 rpm" in finding["message"] and "rated phase voltage" in finding["message"]
    path = variant(
        repo,
        {"rating.max_speed": "3000 rpm", "rating.converter_max_phase_voltage": "600 V"},
        base=SERVO,
    )
    check = the_check(check_json(path), "back-emf-top-speed", "winding.back_emf_cold_top_speed")
    assert check["passed"] and check["limit"] == pytest.approx(600.0, rel=EXACT)


def test_back_emf_top_speed_is_not_applicable_to_a_generator(repo: Path) -> None:
    path = variant(repo, {"rating.operation": "generator"}, base=SERVO)
    assert outcome(check_json(path), "back-emf-top-speed")["status"] == "not_applicable"


# --- limits that fit the machine -------------------------------------------------------------


def test_shear_stress_warns_on_the_fanless_servo(repo: Path) -> None:
    # 14.0 N m on a 76.4 mm x 60 mm rotor: 25.46 kPa [calc: sheet], above the 25 kPa of a
    # totally enclosed, unventilated frame; a warning, not an error
    result = check_json(variant(repo, {}, base=SERVO))
    (finding,) = findings(result, "shear-stress")
    assert finding["severity"] == "warning"
    result = check_json(variant(repo, {}, base=PUMP))
    assert outcome(result, "shear-stress")["status"] == "pass"


def test_current_density_defaults_by_machine_kind(repo: Path) -> None:
    # fan-cooled: 8 A/mm^2 for induction [mem: Pyrhonen Table 6.2, 3-8], 10 for surface
    # magnets [mem: Hendershot and Miller, 5-10]. The pump with 0.8 mm wire: 14.6 / sqrt 3 A
    # over 2 strands of 0.503 mm^2 = 8.39 A/mm^2 [calc]
    path = variant(repo, {"winding.conductor.bare_diameter": "0.80 mm"}, base=PUMP)
    check = the_check(check_json(path), "current-density", "stator.current_density")
    assert check["value"] / 1e6 == pytest.approx(
        14.6 / math.sqrt(3) / (2 * math.pi * 0.16), rel=1e-9
    )
    assert check["limit"] == pytest.approx(8e6, rel=EXACT) and not check["passed"]
    assert "Pyrhonen" in check["basis"]
    servo = variant(repo, {"cooling.method": "enclosed_fan", "cooling.code": "IC411"}, base=SERVO)
    check = the_check(check_json(servo), "current-density", "stator.current_density")
    assert check["limit"] == pytest.approx(10e6, rel=EXACT)


def test_current_density_team_limits_by_method_and_by_cell(repo: Path) -> None:
    # behaviour of the options, no source: a cooling method's option is the team's limit for
    # every machine kind; a cell the team sets wins over it
    path = variant(repo, {}, base=PUMP)
    write_config(repo, "options:\n  current-density:\n    enclosed_fan: 7 A/mm^2\n")
    check = the_check(check_json(path), "current-density", "stator.current_density")
    assert check["limit"] == pytest.approx(7e6, rel=EXACT)
    assert "the team's limit" in check["basis"]
    write_config(
        repo,
        "options:\n  current-density:\n    enclosed_fan: 7 A/mm^2\n"
        "    induction_enclosed_fan: 6 A/mm^2\n",
    )
    check = the_check(check_json(path), "current-density", "stator.current_density")
    assert check["limit"] == pytest.approx(6e6, rel=EXACT)


def test_slot_fill_by_family_and_the_radial_stack(repo: Path) -> None:
    # tooth coils in two layers 0.55 (common practice, no source); the genset's form-wound
    # slot: 1 strand across (7 - 2 x 0.4 mm over 5.2 mm), 2 x 2 layers x 4 turns = 16 rows of
    # 1.45 mm = 23.2 mm + 0.5 separator + 2 x 0.4 liner + 3 wedge = 27.5 mm of 30 mm [calc]
    servo = check_json(variant(repo, {}, base=SERVO))
    assert the_check(servo, "slot-fill", "stator.slot_fill")["limit"] == pytest.approx(0.55)
    genset = check_json(variant(repo, {}, base=GENSET))
    stack = the_check(genset, "slot-fill", "stator.slot_height_clearance")
    assert stack["value"] == pytest.approx(2.5e-3, abs=1e-12)
    deeper = check_json(variant(repo, {"winding.turns_per_coil": 5}, base=GENSET))
    assert not the_check(deeper, "slot-fill", "stator.slot_height_clearance")["passed"]
    # the team's 2 mm separator takes 1.5 mm more of the depth [calc]: 1.0 mm left
    write_config(repo, "options:\n  slot-fill:\n    separator: 2 mm\n")
    wider = the_check(
        check_json(variant(repo, {}, base=GENSET)), "slot-fill", "stator.slot_height_clearance"
    )
    assert wider["value"] == pytest.approx(1.0e-3, abs=1e-12)
    assert "1 strand(s) across" in wider["label"]


def test_insulated_fill_of_the_pump() -> None:
    # [calc] 2 x 21 conductors x 2 strands x 0.97^2 mm^2 over the net slot area
    s = sheet(PUMP)
    insulated = 2 * 21 * 2 * 0.97e-3**2
    assert s["stator.slot_fill_insulated"] == pytest.approx(
        insulated / s["stator.slot_area"], rel=EXACT
    )


@pytest.mark.parametrize(
    ("dotted", "value", "message"),
    [
        ("cooling.ambient_min", "50 degC", "lowest coolant temperature"),
        ("rating.max_speed", "1000 rpm", "below the rated"),
        ("rating.peak_current", "2 A", "drive limit"),
    ],
)
def test_inconsistent_worst_case_fields_are_located_input_errors(
    repo: Path, dotted: str, value: str, message: str
) -> None:
    # behaviour of the gate (bad input: exit 2 with the record path), no source
    from conftest import node_mark, run_cli

    path = variant(repo, {dotted: value}, base=SERVO)
    result = run_cli("check", "--format", "json", path)
    assert result.code == 2
    (error,) = result.input_findings()
    assert message in error["message"]
    assert (error["line"], error["column"]) == node_mark(path, dotted)


def test_cold_magnet_flux_checks_the_cold_case(repo: Path) -> None:
    # the servo's cold magnet (-15 degC: Br 1.25 T (1 + 0.0012 x 35) = 1.3025 T [calc])
    # loads the teeth more than the hot one; the rule checks the cold values against the
    # rated-point limits, and a team limit between hot and cold flips it

    path = variant(repo, {}, base=SERVO)
    s = sheet(path)
    result = check_json(path)
    tooth = the_check(result, "cold-magnet-flux", "stator.tooth_flux_density_apparent_cold")
    assert tooth["value"] == pytest.approx(s["stator.tooth_flux_density_apparent_cold"])
    assert "cold case" in tooth["label"] and tooth["passed"]
    hot, cold = s["stator.tooth_flux_density_apparent"], tooth["value"]
    assert cold > hot
    write_config(
        repo,
        f"options:\n  cold-magnet-flux:\n    stator_tooth_apparent: {(hot + cold) / 2:.4f} T\n",
    )
    (finding,) = findings(check_json(path), "cold-magnet-flux")
    assert "the team's limit" in finding["message"]


# ------------------------------------------------------------------ the induction motor's cos phi


def test_power_factor_estimate_of_the_pump_by_hand() -> None:
    """The estimate from the pump's own sheet values by the closed form [calc: the reactive
    power of the T circuit, U I_r = E I_m + X1 I1^2 + X2 I2^2 with X2 = X1, the quadratic's
    smaller root], E = 0.97 U_ph as the magnetic circuit takes it; beside it the rating's
    P2 / (m U I eta). A 7.5 kW four-pole 50 Hz enclosed motor has a rated power factor of
    about 0.80 to 0.87 [mem: manufacturers' catalogues of IE2/IE3 motors]."""
    q = sheet(PUMP)
    u = q["winding.phase_voltage"]
    e = 0.97 * u
    i_m = q["winding.magnetising_current"]
    leak = (
        q["winding.slot_leakage_inductance"]
        + q["winding.end_leakage_inductance"]
        + q["winding.harmonic_leakage_coefficient"] * q["winding.magnetising_inductance"]
    )
    x = 2.0 * math.pi * 50.0 * leak  # the pump runs at 50 Hz
    i_a = q["rating.input_power"] / (3.0 * u)
    i_q = e * i_m / u
    a, b, c = 2.0 * x, u + 2.0 * x * i_q, e * i_m + 2.0 * x * i_a**2 + x * i_q**2
    i_r = (b - math.sqrt(b * b - 4.0 * a * c)) / (2.0 * a)
    assert q["rating.power_factor_estimate"] == pytest.approx(i_a / math.hypot(i_a, i_r), rel=1e-9)
    # the rating: P_in / (sqrt 3 U_L I_L), 400 V and 14.6 A as the record states (any connection)
    plate = q["rating.input_power"] / (math.sqrt(3.0) * 400.0 * 14.6)
    assert q["rating.power_factor_nameplate"] == pytest.approx(plate, rel=EXACT)
    for pf in (q["rating.power_factor_estimate"], q["rating.power_factor_nameplate"]):
        assert 0.78 < pf < 0.9  # the catalogue range, 0.02 either side for an estimate


def test_a_rated_current_that_does_not_fit_the_design_is_a_nameplate_warning(
    tmp_path: Path,
) -> None:
    # Not checked unless the team sets a tolerance (the sheet shows both values).
    pf_checks = [
        c
        for c in outcome(check_json(PUMP), "nameplate")["checks"]
        if c["quantity"] == "rating.power_factor_nameplate"
    ]
    assert pf_checks == []
    write_config(tmp_path, "options:\n  nameplate: {power_factor_tolerance: 0.1}\n")
    # As bundled the two agree within 0.1 (0.844 and 0.846): both bounds pass.
    bundled = check_json(variant(tmp_path, {}))
    est = sheet(PUMP)["rating.power_factor_estimate"]
    for bound, sign in (("min", -1.0), ("max", 1.0)):
        c = the_check(bundled, "nameplate", "rating.power_factor_nameplate", bound=bound)
        assert c["passed"] and c["limit"] == pytest.approx(est + sign * 0.1, rel=EXACT)
    # 19 A for 14.6 A: the rating's cos phi falls by 14.6 / 19 (0.84 to about 0.65), the
    # design's barely moves (the same active current; only the copper loss grows): a warning
    # at the rated current, on the lower bound.
    (tmp_path / "high").mkdir()  # the policy above it applies; an id of its own in the repository
    path = variant(tmp_path / "high", {"id": "pump-high-current", "rating.line_current": "19 A"})
    result = check_json(path)
    low = the_check(result, "nameplate", "rating.power_factor_nameplate", bound="min")
    assert not low["passed"] and low["record_path"] == "$.rating.line_current"
    assert the_check(result, "nameplate", "rating.power_factor_nameplate", bound="max")["passed"]
    warned = [f for f in findings(result, "nameplate") if f["check"]]
    assert [f["severity"] for f in warned] == ["warning"]
    assert "power factor" in warned[0]["message"]


def test_a_design_without_an_operating_point_says_so(tmp_path: Path) -> None:
    # The pump with five phases on 20 slots at 400 V per phase: a 2.3 T gap wants a
    # magnetising current of hundreds of amperes, which no leakage drop lets through at
    # E = 0.97 U: NaN on the sheet (not a failed calculation), a warning of the rule.
    write_config(tmp_path, "options:\n  nameplate: {power_factor_tolerance: 0.1}\n")
    five = {"winding.phases": 5, "stator.slots": 20, "winding.coil_pitch": 4}
    path = variant(tmp_path, five)
    assert math.isnan(sheet(path)["rating.power_factor_estimate"] or math.nan)
    (f,) = [f for f in findings(check_json(path), "nameplate") if "estimate" in f["message"]]
    assert f["severity"] == "warning" and f["record_path"] == "$.rating.power"
