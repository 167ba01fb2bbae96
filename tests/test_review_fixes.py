"""Fixes from the physics and rule review, each checked against an outside value.

Coolant temperature in the rise limit, m-phase connections, the salient pole body and its
shoe, the surface-magnet gap, demagnetisation, form-wound fit, declared-values and option
units, and single homes for shared pieces (perimeter, strand section, clearance).
Variants of the demo records go through the CLI in-process, as in the other rule tests; a
few checks build the calculation directly, with an ideal or linear steel, to reach a closed
form exactly.
"""

from __future__ import annotations

import math
from pathlib import Path
from typing import Any

import numpy as np
import pytest
import scipy.constants

from conftest import GENSET, PUMP, SERVO, node_mark
from emgate.calc import Calculation
from emgate.physics import conductors as ck
from emgate.physics.bh import BHCurve
from test_rules_magnetic import assert_located
from test_sheet import (
    MM,
    carter,
    check_json,
    findings,
    outcome,
    run_cli,
    sheet,
    the_check,
    variant,
    write_config,
)

MU0 = scipy.constants.mu_0  # [pub: CODATA 2022, via scipy]
CELSIUS = 273.15  # K at 0 degC [pub: SI definition of the degree Celsius]


# --- helpers ---------------------------------------------------------------------------------


def linear_steel(relative_permeability: float) -> BHCurve:
    """A linear steel up to 10 T: H = B / (mu0 mu_r) (no saturation in any demo record)."""
    return BHCurve(
        "linear", np.array([0.0, 10.0]), np.array([0.0, 10.0 / (MU0 * relative_permeability)]), ""
    )


class OneSteel:
    """A catalogue that answers every grade with the same curve."""

    def __init__(self, curve: BHCurve) -> None:
        self.curve = curve

    def get(self, name: str) -> BHCurve:
        return self.curve


def calculation(path: Path, steel: BHCurve | None = None) -> Calculation:
    """The Calculation of a record, as `emgate show` builds it; optionally with one steel."""
    from emgate.engine import discover_materials
    from emgate.loader import load
    from emgate.validate import validate_design

    doc = load(path)
    design = validate_design(doc)
    catalogue: Any = discover_materials(path)
    catalogue.resolve(doc, design)
    return Calculation(design, OneSteel(steel) if steel is not None else catalogue)


# --- 1. coolant temperature ------------------------------------------------------------------


@pytest.mark.parametrize(
    ("ambient", "limit"),
    [
        # [mem: IEC 60034-1, adjustment for the coolant temperature] class F 105 K [pub]
        # less the excess over 40 degC; a cooler coolant does not raise it.
        ("40 degC", 105.0),
        ("50 degC", 95.0),
        ("55 degC", 90.0),
        ("25 degC", 105.0),
    ],
)
def test_a_warm_coolant_lowers_the_rise_limit(repo: Path, ambient: str, limit: float) -> None:
    result = check_json(variant(repo, {"cooling.ambient": ambient}))
    check = the_check(result, "temperature-rise", "winding.temperature_rise")
    # The degC-to-K offset costs a few ulps of 313 K; 1e-9 K is far above that.
    assert check["limit"] == pytest.approx(limit, abs=1e-9)
    assert ("above 40 degC" in check["basis"]) == (limit < 105.0)


def test_a_warm_coolant_can_fail_a_passing_winding(repo: Path) -> None:
    # The pump's estimate sits 66.5 K over its coolant (test_rules_electrical); at a 80 degC
    # coolant the class F limit falls to 105 - 40 = 65 K [mem: IEC 60034-1 adjustment].
    path = variant(repo, {"cooling.ambient": "80 degC"})
    finding = assert_located(check_json(path), "temperature-rise", path, "cooling.method")
    assert finding["check"]["limit"] == pytest.approx(65.0, abs=1e-9)  # offset rounding only


@pytest.mark.parametrize("method", ["liquid_jacket", "direct_liquid"])
def test_liquid_cooling_is_told_the_table_is_for_indirect_air(repo: Path, method: str) -> None:
    result = check_json(variant(repo, {"cooling.method": method, "cooling.code": None}))
    check = the_check(result, "temperature-rise", "winding.temperature_rise")
    # IEC 60034-1's rise table is written for indirect air cooling [pub, via a manual].
    assert "indirect air cooling" in check["basis"]
    air = the_check(check_json(variant(repo, {})), "temperature-rise", "winding.temperature_rise")
    assert "indirect air cooling" not in air["basis"]


# --- 2. m-phase connections ------------------------------------------------------------------


def adjacent_phasor_gap(m: int) -> float:
    """|exp(j 0) - exp(j 2 pi / m)|: a line quantity over the phase quantity between two
    adjacent phases of a symmetric m-phase system [calc: phasor geometry, numpy]."""
    return float(abs(1.0 - np.exp(2j * np.pi / m)))


@pytest.mark.parametrize("m", range(2, 13))
def test_polygon_current_and_star_voltage_from_the_phasor_difference(m: int) -> None:
    ratio = adjacent_phasor_gap(m)
    # Two independent float routes (sin against a complex difference): 1e-12 relative.
    assert ck.phase_current(10.0, "delta", m) == pytest.approx(10.0 / ratio, rel=1e-12)
    assert ck.phase_voltage(400.0, "star", m) == pytest.approx(400.0 / ratio, rel=1e-12)
    assert ck.phase_current(10.0, "star", m) == 10.0  # star: the line current, exactly
    assert ck.phase_voltage(400.0, "delta", m) == 400.0  # polygon: the line voltage, exactly


def test_three_phases_reduce_to_root_three() -> None:
    # [mem: Fitzgerald and Kingsley, Electric Machinery, three-phase connections]; 1e-15
    # relative is a couple of ulps of sin(pi/3).
    assert ck.phase_current(14.6, "delta", 3) == pytest.approx(14.6 / math.sqrt(3), rel=1e-15)
    assert ck.phase_voltage(400.0, "star", 3) == pytest.approx(400.0 / math.sqrt(3), rel=1e-15)


@pytest.mark.parametrize("connection", ["star", "delta"])
def test_one_phase_takes_the_line_values(connection: str) -> None:
    # One phase sits across the line: no star point, no polygon [calc].
    # Exact: the line values pass through untouched.
    assert ck.phase_current(3.9, connection, 1) == 3.9  # type: ignore[arg-type]
    assert ck.phase_voltage(400.0, connection, 1) == 400.0  # type: ignore[arg-type]


@pytest.mark.parametrize("phases", [0, -3, 2.5])
def test_a_phase_count_that_is_no_whole_positive_number_is_refused(phases: Any) -> None:
    with pytest.raises(ValueError, match="phases"):
        ck.phase_current(10.0, "delta", phases)


FIVE_PHASE_PUMP = {"winding.phases": 5, "stator.slots": 20, "winding.coil_pitch": 4}


def test_a_five_phase_polygon_divides_the_line_current_by_2_sin_36_degrees(repo: Path) -> None:
    s = sheet(variant(repo, FIVE_PHASE_PUMP))  # delta, as the pump
    # [calc: phasor geometry] I_ph = I_L / (2 sin(pi/5)) = 14.6 / 1.17557 = 12.420 A.
    # sin against a complex difference, through the JSON sheet: 1e-12 relative.
    assert s["winding.phase_current"] == pytest.approx(14.6 / adjacent_phasor_gap(5), rel=1e-12)
    assert s["winding.phase_voltage"] == pytest.approx(400.0, rel=1e-15)  # polygon: U_L, exact


def test_a_five_phase_star_induction_motor_takes_its_emf_from_the_phase_voltage(
    repo: Path,
) -> None:
    s = sheet(variant(repo, {**FIVE_PHASE_PUMP, "rating.connection": "star"}))
    u_ph = 400.0 / adjacent_phasor_gap(5)  # [calc: phasor geometry] 340.26 V
    assert s["winding.phase_voltage"] == pytest.approx(u_ph, rel=1e-12)  # two float routes
    # [mem: Pyrhonen] E = sqrt 2 pi f N_ph kw1 Phi with emgate's stated 3 % drop (common
    # practice, no source); N_ph = 20 coils / 5 phases x 21 turns = 84, kw1 = kp = sin(4/5
    # pi/2) for q = 1 [mem: Pyrhonen, pitch factor].
    kw1 = math.sin(0.8 * math.pi / 2)
    flux = 0.97 * u_ph / (math.sqrt(2) * math.pi * 50 * 84 * kw1)
    assert s["air_gap.flux_per_pole"] == pytest.approx(flux, rel=1e-9)  # closed form: rounding


def test_a_one_phase_record_takes_the_line_current(repo: Path) -> None:
    one = {
        "winding.phases": 1,
        "winding.layers": 1,
        "stator.slots": 10,
        "rating.connection": "delta",
        # 2.2 kW from one 400 V phase needs more than 3.9 A: 7 A gives eta cos(phi) 0.79 [calc]
        "rating.line_current": "7 A",
    }
    s = sheet(variant(repo, one, base=SERVO))
    # [calc] one phase across the line; exact, as no arithmetic touches the values.
    assert s["winding.phase_current"] == 7.0
    assert s["winding.phase_voltage"] == 400.0


# --- 3. salient pole body --------------------------------------------------------------------


def test_a_saturated_pole_body_fails_and_starves_the_gap(repo: Path) -> None:
    base = check_json(variant(repo, {}, base=GENSET))
    assert base.code == 0, base.out
    assert outcome(base, "yoke-flux")["status"] == "pass"
    path = variant(repo, {"rotor.pole.body_width": "40 mm"}, base=GENSET)
    result = check_json(path)
    assert result.code == 1
    (body,) = findings(result, "yoke-flux")
    assert body["record_path"] == "$.rotor.pole.body_width"
    assert (body["line"], body["column"]) == node_mark(path, "rotor.pole.body_width")
    # Pole core 1.8 T [mem: Pyrhonen et al., Design of Rotating Electrical Machines, T. 6.1].
    assert body["check"]["limit"] == pytest.approx(1.8, rel=1e-12)  # a default: exact
    # B = k_leak Phi / (k_Fe l b_p): the body carries the pole flux and its leakage, 1.15
    # (common practice, no source) [mem: Pyrhonen, flux over section].
    s = sheet(path)
    expected = 1.15 * s["air_gap.flux_per_pole"] / (0.97 * 0.160 * 0.040)
    assert body["check"]["value"] == pytest.approx(expected, rel=1e-9)  # rounding only
    (gap,) = findings(result, "gap-flux")
    assert gap["check"]["bound"] == "min"
    assert gap["check"]["limit"] == pytest.approx(0.6, rel=1e-12)  # common practice; exact
    assert gap["check"]["value"] < 0.6


def test_the_yoke_flux_summary_names_the_pole_body() -> None:
    rules = {r["id"]: r for r in run_cli("rules", "--format", "json").json()}
    assert rules["yoke-flux"]["summary"].startswith("yoke and pole-body flux densities")


def test_a_null_lower_gap_limit_switches_it_off(repo: Path) -> None:
    path = variant(repo, {"rotor.pole.body_width": "40 mm"}, base=GENSET)
    # Only gap-flux: the thin body also fails yoke-flux, as the test above shows.
    write_config(
        repo, "rules:\n  select: [gap-flux]\noptions:\n  gap-flux:\n    salient_field_min: null\n"
    )
    result = check_json(path)
    assert result.code == 0, result.out
    assert [c["bound"] for c in outcome(result, "gap-flux")["checks"]] == ["max"]


@pytest.mark.parametrize(("base", "minimum"), [(PUMP, 0.6), (SERVO, 0.3), (GENSET, 0.6)])
def test_lower_gap_limits_by_machine_kind(repo: Path, base: Path, minimum: float) -> None:
    result = check_json(variant(repo, {}, base=base))
    check = the_check(result, "gap-flux", "air_gap.flux_density_peak", bound="min")
    assert check["limit"] == pytest.approx(minimum, rel=1e-12)  # common practice; exact
    assert check["passed"] is True


# --- 4. pole shoe in the pole's path ---------------------------------------------------------


def test_the_pole_body_flux_density_is_carried_over_body_and_shoe() -> None:
    mu_r = 1000.0
    calc = calculation(GENSET, linear_steel(mu_r))
    iron = calc.magnetic.iron
    # [calc] Ampere on a linear section: F = B l / (mu0 mu_r), l = body 40 mm + shoe 12 mm.
    expected = iron.pole_body_b / (MU0 * mu_r) * (40 + 12) * MM
    # mu0 of the code may be 4 pi 1e-7 (1e-9 apart); the rest is rounding.
    assert iron.pole_body_mmf == pytest.approx(expected, rel=1e-8)


# --- 5. surface-magnet gap -------------------------------------------------------------------


def test_the_servo_gap_is_carter_on_the_whole_magnetic_gap_with_ideal_iron() -> None:
    calc = calculation(SERVO, linear_steel(1e13))
    # Br(T) = Br20 (1 + alpha (T - 20)) [mem: Hendershot and Miller]: 1.25 T, -0.12 %/K,
    # 100 degC; B_g = Br (h_m / mu_rec) / (kc g'), g' = g + h_m / mu_rec, kc by Carter on g'
    # [mem: Carter 1901, as in Pyrhonen ch. 3; Hendershot and Miller, working point].
    br = 1.25 * (1 - 0.0012 * 80)
    g_mag = 0.8 + 3.5 / 1.05
    kc = carter(math.pi * 78 / 12, 2.0, g_mag)
    expected = br * (3.5 / 1.05) / (kc * g_mag)
    # Iron at mu_r 1e13 takes ~1e-11 of the loop, the root solve stops at 1e-12: 1e-9.
    assert calc.gap_flux_density_peak == pytest.approx(expected, rel=1e-9)


def test_the_kernel_docstrings_state_what_effective_gap_must_be() -> None:
    from emgate.physics.magnetic import PolePath, surface_pm_gap

    for doc in (PolePath.__doc__ or "", surface_pm_gap.__doc__ or ""):
        assert "kc g' - l_m / mu_rec" in doc
    assert "Br (l_m / mu_rec) / (kc g')" in (surface_pm_gap.__doc__ or "")


# --- 6. demagnetisation ----------------------------------------------------------------------


def servo_armature_field(current_factor: float = 1.0) -> float:
    """F_max / (mu_rec kc g') of the servo [A/m]. F_max is the peak staircase MMF: in a
    double-layer tooth-coil winding the MMF over a tooth is its own coil's N_c i, the mean
    being zero (each phase's four coils alternate in sign), so F_max = sqrt 2 N_c I, N_c 100,
    I 3.9 A (star) [calc; mem: Fitzgerald and Kingsley, gap MMF steps by the enclosed
    current]; h_m + mu_rec kc g = mu_rec kc g' with g' = g + h_m / mu_rec [calc]."""
    f_max = math.sqrt(2) * 100 * 3.9 * current_factor
    g_mag = (0.8 + 3.5 / 1.05) * MM
    return f_max / (1.05 * carter(math.pi * 78 / 12, 2.0, 0.8 + 3.5 / 1.05) * g_mag)


def test_the_servo_magnets_withstand_the_rated_current() -> None:
    s = sheet(SERVO)
    worst = s["rotor.magnet_field_strength"] - servo_armature_field()
    assert s["rotor.magnet_field_strength_worst"] == pytest.approx(worst, rel=1e-9)  # rounding
    # H_cJ(T) = H_cJ20 (1 + beta (T - 20)) [mem: Hendershot and Miller, temperature
    # coefficients]: 1500 kA/m, -0.6 %/K, 100 degC gives 780 kA/m.
    assert s["rotor.magnet_coercivity_hot"] == pytest.approx(780e3, rel=1e-12)  # rounding
    result = check_json(SERVO)
    check = the_check(result, "demagnetisation", "rotor.magnet_field_strength_worst")
    assert check["value"] == pytest.approx(abs(worst), rel=1e-9)  # rounding only
    assert check["limit"] == pytest.approx(0.9 * 780e3, rel=1e-12)  # 10 % margin [cp]
    assert check["passed"] is True  # 314 kA/m against 702 kA/m


def test_a_hot_magnet_under_three_times_the_current_fails(repo: Path) -> None:
    write_config(
        repo,
        "rules:\n  select: [demagnetisation]\n"
        "options:\n  demagnetisation:\n    current_factor: 3\n",
    )
    path = variant(repo, {"rotor.magnet.operating_temperature": "150 degC"}, base=SERVO)
    finding = assert_located(check_json(path), "demagnetisation", path, "rotor.magnet.thickness")
    s = sheet(path)
    worst = s["rotor.magnet_field_strength"] - servo_armature_field(3.0)
    assert finding["check"]["value"] == pytest.approx(abs(worst), rel=1e-9)  # rounding only
    # [mem: Hendershot and Miller] 1500 kA/m (1 - 0.006 x 130) = 330 kA/m, less 10 % [cp].
    assert finding["check"]["limit"] == pytest.approx(0.9 * 330e3, rel=1e-12)  # rounding


def test_demagnetisation_applies_to_surface_magnets_only() -> None:
    rules = {r["id"]: r for r in run_cli("rules", "--format", "json").json()}
    assert rules["demagnetisation"]["machines"] == ["surface_pm"]
    explained = run_cli("explain", "demagnetisation").out
    assert "d-axis" in explained and "worst" in explained  # the approximation is stated


# --- 7. form-wound fit -----------------------------------------------------------------------


def test_a_form_wound_strand_wider_than_the_slot_less_liners_fails(repo: Path) -> None:
    result = check_json(variant(repo, {}, base=GENSET))
    fit = the_check(result, "slot-fill", "stator.slot_width_clearance")
    # [calc] 7.0 - (5.2 + 2 x 0.4) = 1.0 mm across the slot.
    assert fit["value"] / MM == pytest.approx(1.0, rel=1e-9)  # mm sums in metres: rounding
    path = variant(repo, {"winding.conductor.insulated_width": "6.5 mm"}, base=GENSET)
    finding = assert_located(check_json(path), "slot-fill", path, "stator.slot.width")
    assert finding["check"]["value"] / MM == pytest.approx(7.0 - 6.5 - 0.8, rel=1e-9)  # [calc]
    assert finding["check"]["limit"] == 0.0  # must fit (common practice, no source); exact


# --- 8. declared values ----------------------------------------------------------------------


def test_a_declared_rise_in_degc_is_an_error(repo: Path) -> None:
    path = variant(repo, {"declared": {"winding.temperature_rise": "66 degC"}})
    result = check_json(path)
    assert result.code == 1
    (finding,) = findings(result, "declared-values")
    assert finding["check"] is None  # refused, not compared as 339 K
    assert "temperature difference" in finding["message"] and "K" in finding["message"]
    # The same figure in K is compared (84 K against the pump's 84.3 K estimate).
    ok = check_json(variant(repo, {"declared": {"winding.temperature_rise": "84 K"}}))
    assert ok.code == 0, ok.out


def test_a_tolerance_for_an_unknown_name_is_a_located_config_error(repo: Path) -> None:
    path = variant(repo, {})
    config = write_config(
        repo, "options:\n  declared-values:\n    tolerances:\n      stator.curent_density: 0.1\n"
    )
    result = run_cli("check", path)
    assert result.code == 2
    line = config.read_text().splitlines().index("    tolerances:") + 1
    assert f"emgate.yaml:{line}:" in result.out
    assert "did you mean 'stator.current_density'?" in result.out


@pytest.mark.parametrize("value", ["0", "-0.1", "0 %"])
def test_a_tolerance_must_be_greater_than_zero(repo: Path, value: str) -> None:
    path = variant(repo, {})
    config = write_config(
        repo,
        f"options:\n  declared-values:\n    tolerances:\n      stator.current_density: {value}\n",
    )
    result = run_cli("check", path)
    assert result.code == 2
    assert f"emgate.yaml:{len(config.read_text().splitlines())}:" in result.out
    assert "greater than zero" in result.out


# --- 9. options with units -------------------------------------------------------------------


@pytest.mark.parametrize(
    ("rule", "option", "text", "si", "quantity"),
    [
        ("slot-fill", "opening_clearance", "0.2 mm", 0.2e-3, "stator.opening_clearance"),
        ("slot-fill", "random_wound", "45 %", 0.45, "stator.slot_fill"),
        ("mmf-thd", "induction", "20 %", 0.2, "winding.mmf_thd"),
        ("declared-values", "tolerance", "5 %", 0.05, "stator.current_density"),
    ],
)
def test_length_and_ratio_options_take_units(
    repo: Path, rule: str, option: str, text: str, si: float, quantity: str
) -> None:
    path = variant(repo, {})  # the pump declares a current density
    write_config(repo, f"options:\n  {rule}:\n    {option}: {text}\n")
    result = check_json(path)
    assert result.code == 0, result.out
    check = the_check(result, rule, quantity)
    assert check["limit"] == pytest.approx(si, rel=1e-12)  # the unit parser's SI value
    # Each of these is the rule's default written in other units: still the default's source.
    assert "team" not in check["basis"]


def test_a_clearance_without_its_unit_is_refused(repo: Path) -> None:
    path = variant(repo, {})
    write_config(repo, "options:\n  slot-fill:\n    opening_clearance: 0.0002\n")
    result = run_cli("check", path)
    assert result.code == 2
    assert "with its unit" in result.out


def test_a_fill_limit_in_percent_fails_the_pump(repo: Path) -> None:
    path = variant(repo, {})
    write_config(repo, "options:\n  slot-fill:\n    random_wound: 40 %\n")
    finding = assert_located(check_json(path), "slot-fill", path, "winding.turns_per_coil")
    assert finding["check"]["limit"] == pytest.approx(0.40, rel=1e-12)  # the team's 40 %


# --- 10. one home for shared pieces ----------------------------------------------------------


def spy(monkeypatch: pytest.MonkeyPatch, name: str) -> list[tuple[Any, ...]]:
    """Record the calls of a kernel function in emgate.physics.conductors, letting them run."""
    calls: list[tuple[Any, ...]] = []
    real = getattr(ck, name)

    def recording(*args: Any, **kwargs: Any) -> Any:
        calls.append(args)
        return real(*args, **kwargs)

    monkeypatch.setattr(ck, name, recording)
    return calls


@pytest.mark.parametrize(
    ("base", "kernel", "perimeter"),
    [
        # [calc: trapezoid] b1 + b2 + 2 sqrt(h2^2 + ((b2 - b1)/2)^2), h2 = 20 - 0.8 - 1.5 mm.
        (PUMP, "semi_closed_slot_perimeter", 6.4 + 9.6 + 2 * math.hypot(17.7, 1.6)),
        # [calc: rectangle] 2 (b + h - h_w) = 2 (7 + 30 - 3) mm.
        (GENSET, "open_slot_perimeter", 2 * (7.0 + 30.0 - 3.0)),
    ],
)
def test_the_thermal_path_takes_the_liner_perimeter_from_the_kernel(
    monkeypatch: pytest.MonkeyPatch, base: Path, kernel: str, perimeter: float
) -> None:
    calls = spy(monkeypatch, kernel)
    calc = calculation(base)
    calc.thermal_estimate()
    assert calls, f"the thermal estimate did not use conductors.{kernel}"
    assert calc.slot_perimeter / MM == pytest.approx(perimeter, rel=1e-12)  # rounding only


def test_the_field_coil_uses_the_shared_strand_section(
    repo: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    field = {
        "shape": "rectangular",
        "strands": 2,
        "width": "4 mm",
        "height": "1.5 mm",
        "corner_radius": "0.5 mm",
        "insulated_width": "4.2 mm",
        "insulated_height": "1.7 mm",
    }
    calls = spy(monkeypatch, "field_coil_current_density")
    calc = calculation(variant(repo, {"rotor.field.conductor": field}, base=GENSET))
    # [mem: IEC 60317-0-2] w h - (4 - pi) r^2 per strand, two in hand, 9 A.
    strand = (4.0 * 1.5 - (4 - math.pi) * 0.5**2) * MM**2
    assert calc.field_current_density == pytest.approx(9.0 / (2 * strand), rel=1e-12)  # rounding
    assert calls, "the field coil did not use conductors.field_coil_current_density"


def test_the_opening_clearance_default_is_the_kernels_constant() -> None:
    from emgate_rules.slot_fill import SlotFillOptions

    default = SlotFillOptions.model_fields["opening_clearance"].default
    # The same object, not an equal copy: one number to change (floats are not interned).
    assert default is ck.OPENING_CLEARANCE
    assert default == pytest.approx(0.2e-3, rel=1e-12)  # 0.2 mm, common practice, no source
