"""Fixes from the usability test, each checked against an outside value.

One home for the thermal estimate's cooling surfaces (the record), SI units in the JSON
checks, no crash on an unbalanced explicit slot table, the back-EMF quantity and rule, the
tooth-coil mean turn length, the margins line of the text report, the sheet's method texts
and `explain` defaults of optional options. Variants of the demo records go through the CLI
in-process, as in the other rule tests.
"""

from __future__ import annotations

import math
import re
from pathlib import Path
from typing import Any

import pint
import pytest
import scipy.integrate
import yaml

from conftest import DEMO, GENSET, PUMP, SERVO, run_cli
from emgate.calc import SHEET
from emgate.physics import conductors as ck
from test_review_fixes import calculation, linear_steel
from test_rules_magnetic import assert_located
from test_sheet import (
    MM,
    MM2,
    carter,
    check_json,
    findings,
    outcome,
    sheet,
    the_check,
    variant,
)

UREG = pint.UnitRegistry()
SQRT3 = math.sqrt(3.0)
#: 12-slot 10-pole double-layer tooth-coil winding factor, sin^2(75 deg) = (2 + sqrt 3) / 4
#: = 0.9330 [calc; agrees with mem: El-Refaie, IEEE Trans. Ind. Electron. 57(1), 2010].
KW_12_10 = (2.0 + SQRT3) / 4.0
RHO20_COPPER = 1e-6 / 58.0  # ohm m [pub: IEC 60028, 1/58 ohm mm^2/m]


def thermal_check(path: Path) -> dict[str, Any]:
    return the_check(check_json(path), "temperature-rise", "winding.temperature_rise")


# --- 1. one value per name: cooling surfaces in the record -----------------------------------


@pytest.mark.parametrize(
    ("base", "explicit"),
    [
        # [calc] the record's documented defaults written out: 4 (fins), 3 (core area),
        # 1.5 stack lengths of frame (common practice, no source, per the record's schema).
        (SERVO, {"cooling.fin_area_factor": 4.0, "cooling.frame_length": "90 mm"}),  # 1.5 x 60
        (GENSET, {"cooling.core_area_factor": 3.0}),
    ],
)
def test_the_cooling_defaults_written_out_change_nothing(
    repo: Path, base: Path, explicit: dict[str, Any]
) -> None:
    implicit = sheet(variant(repo, {}, base=base))["winding.temperature_rise"]
    written = sheet(variant(repo, explicit, base=base))["winding.temperature_rise"]
    # 1.5 x 140 mm is exact in binary only to rounding; the estimate is smooth in it.
    assert written == pytest.approx(implicit, rel=1e-12)


def test_show_the_rule_and_declared_values_see_one_temperature_rise(repo: Path) -> None:
    # A smooth frame (fin factor 1) on a longer frame: no longer the defaults.
    cooling = {"cooling.fin_area_factor": 1.0, "cooling.frame_length": "300 mm"}
    shown = sheet(variant(repo, cooling))["winding.temperature_rise"]
    default = sheet(variant(repo, {}))["winding.temperature_rise"]
    # A smooth frame sheds less heat than a finned one [mem: Bergman et al., Introduction to
    # Heat Transfer, extended surfaces]: the estimate must rise, by more than rounding.
    assert shown > default * 1.01
    declared = {**cooling, "declared": {"winding.temperature_rise": f"{shown!r} K"}}
    result = check_json(variant(repo, declared))
    assert thermal_check(variant(repo, cooling))["value"] == pytest.approx(shown, rel=1e-12)
    dv = the_check(result, "declared-values", "winding.temperature_rise")
    assert dv["value"] == pytest.approx(0.0, abs=1e-12)  # the same number, repr round-trips


def test_open_machine_core_surface_scales_with_its_area_factor(repo: Path) -> None:
    from test_review_fixes import calculation

    def core_step(factor: float) -> float:
        calc = calculation(variant(repo, {"cooling.core_area_factor": factor}, base=GENSET))
        (step,) = [s for s in calc.thermal_estimate().steps if s.name == "core surface"]
        return step.resistance

    # Forced convection: h is set by the air velocity and flow length, not the area [mem:
    # Bergman et al., flat plate], so twice the area halves the surface resistance (the
    # heat differs a little: copper at its own temperature); 5 % allowed for the air
    # properties, taken at a film temperature that falls with the rise (all losses now, so
    # the two rises differ by some 50 K).
    assert core_step(3.0) / core_step(6.0) == pytest.approx(2.0, rel=0.05)


def test_the_rule_no_longer_takes_the_cooling_factors(repo: Path) -> None:
    path = variant(repo, {})
    (repo / "emgate.yaml").write_text(
        "schema: emgate/config@1\noptions:\n  temperature-rise: {fin_area_factor: 3}\n",
        encoding="utf-8",
    )
    result = run_cli("check", path)
    assert result.code == 2
    assert "no option 'fin_area_factor'" in result.out


def test_the_rise_message_names_the_largest_step(repo: Path) -> None:
    from test_review_fixes import calculation

    path = variant(repo, {}, base=SERVO)
    worst = max(calculation(path).thermal_estimate().steps, key=lambda s: s.rise)
    assert f"largest step: {worst.name}, {worst.rise:.0f} K" in thermal_check(path)["label"]


# --- 2. JSON checks: SI unit and a display text ---------------------------------------------

DISPLAY = re.compile(r"^(\S+)(?: (\S+))? (<=|>=) (\S+)(?: (\S+))?$")


def _display_si(number: str, unit: str | None) -> float:
    return float(number) if unit is None else UREG.Quantity(float(number), unit).to_base_units().m


def test_every_demo_check_gives_si_values_in_its_si_unit_and_a_display() -> None:
    result = run_cli("check", "--format", "json", DEMO)
    checks = [c for r in result.json()["records"] for o in r["outcomes"] for c in o["checks"]]
    assert len(checks) > 30
    for c in checks:
        match = DISPLAY.match(c["display"])
        assert match, c["display"]
        value, vunit, bound, limit, lunit = match.groups()
        assert bound == ("<=" if c["bound"] == "max" else ">=")
        assert vunit == lunit
        # pint, not emgate, converts the display unit; the SI unit has the same dimension
        # and factor 1 from base units. Four significant figures shown: 5e-4 relative.
        si = UREG.Quantity(1.0, c["unit"] if c["unit"] != "1" else "")
        assert si.to_base_units().m == pytest.approx(1.0, rel=1e-12), c["unit"]
        if vunit is not None:
            assert UREG.Quantity(1.0, vunit).dimensionality == si.dimensionality, c
        assert _display_si(value, vunit) == pytest.approx(c["value"], rel=5e-4, abs=1e-12)
        assert _display_si(limit, lunit) == pytest.approx(c["limit"], rel=5e-4, abs=1e-12)


def test_the_current_density_check_reads_as_the_brief_shows() -> None:
    c = the_check(check_json(PUMP), "current-density", "stator.current_density")
    assert c["unit"] == "A/m^2"
    # [calc] 14.6 A delta: I_ph = 14.6 / sqrt 3, two strands of 0.90 mm; limit 8 A/mm^2 from
    # the demo team's emgate.yaml (the demo's own data).
    j = 14.6 / SQRT3 / (2 * math.pi / 4 * 0.90**2)
    assert c["display"] == f"{j:.4g} A/mm^2 <= 8 A/mm^2"


def test_the_sheet_and_the_checks_share_one_si_unit_function() -> None:
    from emgate import sheet as sheet_module
    from emgate.report import common

    assert sheet_module._si_unit is common.si_unit
    for entry in SHEET.values():  # pint judges each SI unit against the display unit
        si, shown = common.si_unit(entry.unit), entry.unit
        if si == "1":
            assert shown == "1", entry.name
            continue
        factor = UREG.Quantity(1.0, si).to_base_units().m
        assert factor == pytest.approx(1.0, rel=1e-12), entry.name  # an SI unit: no prefix
        assert UREG.Quantity(1.0, si).dimensionality == UREG.Quantity(1.0, shown).dimensionality


# --- 3. an unbalanced explicit layout crashes no rule ---------------------------------------


def _table(base: Path) -> list[str]:
    """The star-of-slots layout of a demo record, written as the record's slot table."""
    from emgate.physics.winding import star_of_slots

    d = yaml.safe_load(base.read_text(encoding="utf-8"))
    w = d["winding"]
    lay = star_of_slots(d["stator"]["slots"], d["poles"] // 2, 3, w["layers"], w["coil_pitch"])
    return [
        " ".join(
            ("+" if lay[ph, s] > 0 else "-") + "ABC"[ph]
            for ph in range(3)
            for _ in range(abs(lay[ph, s]))
        )
        for s in range(lay.shape[1])
    ]


UNBALANCED = {
    # [calc] slot 1's A side becomes B: A nets -1 side, B +1, so the phases do not close.
    "one side moved": lambda t: [t[0].replace("A", "B", 1), *t[1:]],
    # [calc] slot 1 reversed: its phases net -2 sides each, no closed phase left there.
    "one slot reversed": lambda t: [
        t[0].replace("+", "#").replace("-", "+").replace("#", "-"),
        *t[1:],
    ],
    # [calc] phase A given to B everywhere: A has no coil sides, so no winding factor.
    "phase A missing": lambda t: [e.replace("A", "B") for e in t],
}


@pytest.mark.parametrize("base", [PUMP, SERVO, GENSET], ids=lambda p: p.stem)
@pytest.mark.parametrize("case", sorted(UNBALANCED))
def test_no_rule_crashes_on_an_unbalanced_explicit_layout(
    repo: Path, base: Path, case: str
) -> None:
    overrides = {
        "winding.layout": UNBALANCED[case](_table(base)),
        # declared-values must not crash on a figure the winding leaves undefined either
        "declared": {"winding.mmf_thd": 0.5, "winding.winding_factor": 0.9},
    }
    result = run_cli("check", "--format", "json", variant(repo, overrides, base=base))
    assert result.code == 1, result.out  # winding-balance fails it; no crash (exit 3)
    doc = result.json()
    assert not [f for f in doc["findings"] if f["kind"] == "crash"]
    assert any(f["rule"] == "winding-balance" for f in doc["findings"])
    (thd,) = findings(result, "mmf-thd")  # one info finding, and no check
    assert thd["severity"] == "info"
    assert "not computed" in thd["message"] and "unbalanced" in thd["message"]
    assert thd["record_path"] == "$.winding.layout"
    assert outcome(result, "mmf-thd")["checks"] == []


def test_a_balanced_explicit_layout_is_still_checked(repo: Path) -> None:
    # The star-of-slots table written out is the generated winding itself [calc].
    result = check_json(variant(repo, {"winding.layout": _table(PUMP)}))
    assert result.code == 0, result.out
    assert outcome(result, "mmf-thd")["checks"], "the THD of a balanced table is checked"


# --- 4. back-EMF ------------------------------------------------------------------------------


def servo_ideal_iron_emf() -> float:
    """The servo's no-load phase EMF with ideal iron, by hand [V].

    Br(T) = Br20 (1 + alpha (T - 20)) [mem: Hendershot and Miller]: 1.25 T, -0.12 %/K at
    100 degC; B_g = Br (h_m / mu_rec) / (kc g'), g' = g + h_m / mu_rec, kc by Carter on g'
    [mem: Carter 1901, as in Pyrhonen ch. 3; Hendershot and Miller, working point]; the
    fundamental of a flat-topped wave of pole arc 0.8 is (4/pi) sin(0.4 pi) B_g [calc,
    Fourier]; Phi1 = (2/pi) B1 tau_p l, tau_p = pi 78 mm / 10 poles, l = 60 mm [calc];
    E = sqrt 2 pi f N_ph kw1 Phi1 [mem: Fitzgerald and Kingsley, Electric Machinery] at
    125 Hz with 4 coils of 100 turns per phase and kw1 of the 12/10 winding (closed form).
    """
    br = 1.25 * (1 - 0.0012 * 80)
    g_mag = 0.8 + 3.5 / 1.05
    b_gap = br * (3.5 / 1.05) / (carter(math.pi * 78 / 12, 2.0, g_mag) * g_mag)
    b1 = 4.0 / math.pi * math.sin(0.4 * math.pi) * b_gap
    phi1 = 2.0 / math.pi * b1 * (math.pi * 78 * MM / 10) * 60 * MM
    return math.sqrt(2.0) * math.pi * 125 * 400 * KW_12_10 * phi1


#: Phase voltage of the servo, star: U / sqrt 3 [calc].
SERVO_PHASE_VOLTAGE = 400 / SQRT3


def test_servo_back_emf_by_hand() -> None:
    ideal = calculation(SERVO, linear_steel(1e13))
    # Iron at mu_r 1e13 takes ~1e-11 of the loop, the root solve stops at 1e-12: 1e-9.
    assert ideal.back_emf == pytest.approx(servo_ideal_iron_emf(), rel=1e-9)
    s = sheet(SERVO)
    # [calc] Fourier fundamental of a flat-topped wave of pole arc 0.8: (4/pi) sin(0.4 pi).
    b1 = 4.0 / math.pi * math.sin(0.4 * math.pi) * s["air_gap.flux_density_peak"]
    assert s["air_gap.flux_density_fundamental"] == pytest.approx(b1, rel=1e-9)  # rounding
    emf = s["winding.back_emf"]
    # [calc] the steel's ampere-turns only take from the magnet's: E <= its ideal-iron value;
    # an unsaturated machine's iron takes a few % of the loop (common practice, no source),
    # so within 5 % below it.
    assert 0.95 * servo_ideal_iron_emf() <= emf <= servo_ideal_iron_emf()
    c = the_check(check_json(SERVO), "back-emf", "winding.back_emf")
    assert c["passed"] and c["unit"] == "V"
    assert c["value"] == pytest.approx(emf, rel=1e-12)  # the same number, JSON round trip
    assert c["limit"] == pytest.approx(SERVO_PHASE_VOLTAGE, rel=1e-12)  # 1.0 U_ph, rounding
    ratio = emf / SERVO_PHASE_VOLTAGE
    assert c["margin"] == pytest.approx(1.0 - ratio, rel=1e-9)  # same as the ratio's margin


def servo_emf_ratio() -> float:
    """E / U_ph of the servo record as the rule reports it, checked against the ideal-iron
    upper bound (hand value above) [calc]."""
    c = the_check(check_json(SERVO), "back-emf", "winding.back_emf")
    ratio = c["value"] / c["limit"]
    assert ratio <= servo_ideal_iron_emf() / SERVO_PHASE_VOLTAGE  # E <= its ideal-iron value
    return ratio


def test_genset_back_emf_is_the_4_44_form() -> None:
    s = sheet(GENSET)
    # [mem: Fitzgerald and Kingsley] E = 4.44 f N kw Phi1, 4.44 ~ sqrt 2 pi = 4.4429: the
    # rounded constant differs by 0.07 %, so 1e-3 relative.
    tau_p = math.pi * 230 * MM / 4  # 230 mm bore, 4 poles [calc]
    phi1 = 2.0 / math.pi * s["air_gap.flux_density_fundamental"] * tau_p * 160 * MM
    emf = 4.44 * 50 * s["winding.series_turns"] * s["winding.winding_factor"] * phi1
    data = yaml.safe_load(GENSET.read_text(encoding="utf-8"))
    assert data["rating"]["frequency"] == "50 Hz" and data["stator"]["stack_length"] == "160 mm"
    assert s["winding.back_emf"] == pytest.approx(emf, rel=1e-3)


def test_more_turns_raise_the_back_emf_past_the_supply(repo: Path) -> None:
    base = servo_emf_ratio()
    path = variant(repo, {"winding.turns_per_coil": 120}, base=SERVO)
    result = run_cli("check", "--format", "json", path)
    finding = assert_located(result, "back-emf", path, "winding.turns_per_coil")
    assert "back-EMF" in finding["message"]
    c = the_check(result, "back-emf", "winding.back_emf")
    # [calc] E grows as N_ph at a fixed magnet field (no load: the turns carry no current);
    # both ratios are computed the same way, so only rounding parts them.
    assert c["value"] / c["limit"] == pytest.approx(1.2 * base, rel=1e-9)
    assert not c["passed"]


def test_the_team_sets_its_back_emf_ratio(repo: Path) -> None:
    # The team's 0.85 lies below the record's ratio (itself at most the ideal-iron bound);
    # the record is unchanged, so its ratio is too.
    base = servo_emf_ratio()
    assert base > 0.85
    (repo / "emgate.yaml").write_text(
        "schema: emgate/config@1\noptions:\n  back-emf: {max_ratio: 0.85}\n", encoding="utf-8"
    )
    result = run_cli("check", "--format", "json", variant(repo, {}, base=SERVO))
    c = the_check(result, "back-emf", "winding.back_emf")
    assert c["limit"] == pytest.approx(0.85 * SERVO_PHASE_VOLTAGE, rel=1e-12)  # rounding
    assert c["value"] / SERVO_PHASE_VOLTAGE == pytest.approx(base, rel=1e-12)  # rounding
    assert not c["passed"]
    assert c["basis"].endswith("the team's limit (emgate.yaml)")


def test_back_emf_applies_to_surface_magnets_only() -> None:
    result = check_json(DEMO)
    assert outcome(result, "back-emf", "servo-10p12s")["status"] == "pass"
    for other in ("pump-drive-4p36s", "genset-4p48s"):
        assert outcome(result, "back-emf", other)["status"] == "not_applicable"


# --- 5. tooth-coil mean turn length -----------------------------------------------------------


@pytest.mark.parametrize(("length", "tooth", "side"), [(0.06, 0.013, 0.006), (0.2, 0.03, 0.0)])
def test_tooth_coil_turn_is_the_perimeter_of_the_offset_tooth(
    length: float, tooth: float, side: float
) -> None:
    if side == 0.0:
        with pytest.raises(ValueError, match="coil_side_width"):
            ck.tooth_coil_mean_turn_length(length, tooth, side)
        return
    r = side / 2.0

    # Cauchy's formula: a convex figure's perimeter is the integral of its support function
    # over all directions; that of the rectangle l x b_t offset by r is
    # (l/2)|cos t| + (b_t/2)|sin t| + r [pub: Cauchy's surface area formula, integral
    # geometry]. scipy integrates it numerically.
    def support(t: float) -> float:
        return length / 2 * abs(math.cos(t)) + tooth / 2 * abs(math.sin(t)) + r

    perimeter, _ = scipy.integrate.quad(support, 0.0, 2.0 * math.pi, points=[math.pi / 2, math.pi])
    got = ck.tooth_coil_mean_turn_length(length, tooth, side)
    assert got == pytest.approx(perimeter, rel=1e-9)  # quadrature error only


@pytest.mark.parametrize("layers", [2, 1])
def test_servo_mean_turn_length_and_resistance_by_hand(repo: Path, layers: int) -> None:
    s = sheet(variant(repo, {"winding.layers": layers}, base=SERVO))
    # [calc] winding zone 2.5 to 16 mm deep (opening 1 + wedge 1.5), 10 to 14 mm wide: the
    # mean slot width 12 mm; the tooth at mid-zone, radius 39 + 9.25 mm, 12 slots.
    tooth = 2 * math.pi * (39 + 9.25) / 12 - 12
    side = 12 / layers  # two coil sides side by side in a double-layer slot
    turn = 2 * (60 + tooth) + math.pi * side  # [calc] Steiner: 2 (l + b_t) + pi w_c
    assert s["winding.mean_turn_length"] == pytest.approx(turn * MM, rel=1e-12)  # rounding
    # [pub: IEC 60028] R20 = rho20 N_ph l_av / S; N_ph = coils per phase x 100 turns: 4 coils
    # (double layer) or 2 (single layer) of the 12 slots, 0.71 mm wire.
    n_ph = 12 * layers // 6 * 100
    r20 = RHO20_COPPER * n_ph * turn * MM / (math.pi / 4 * 0.71**2 * MM2)
    assert s["winding.phase_resistance_20c"] == pytest.approx(r20, rel=1e-9)  # rounding


def test_distributed_windings_keep_the_end_winding_estimate() -> None:
    s = sheet(PUMP)
    # [mem: Pyrhonen] 2 l + 2.4 W + 0.1 m, W = pi (D + h) / Q y: 136 mm bore, 20 mm slots,
    # 36 slots, pitch 7; 140 mm stack.
    data = yaml.safe_load(PUMP.read_text(encoding="utf-8"))
    assert data["stator"]["slot"]["height"] == "20 mm" and data["winding"]["coil_pitch"] == 7
    span = math.pi * (136 + 20) / 36 * 7
    turn = 2 * 140 + 2.4 * span + 100
    assert s["winding.mean_turn_length"] == pytest.approx(turn * MM, rel=1e-12)  # rounding


# --- 6. the margins line ----------------------------------------------------------------------


def test_a_passing_run_shows_each_records_closest_margin(repo: Path) -> None:
    path = variant(repo, {})
    text = run_cli("check", path)
    assert text.code == 0
    result = check_json(path)
    (record,) = result.json()["records"]
    checks = [(o["rule"], c) for o in record["outcomes"] for c in o["checks"]]

    # The smallest margin, recomputed here from value and limit: (limit - value) / limit for
    # an upper bound, (value - limit) / limit for a lower one [calc].
    def margin(c: dict[str, Any]) -> float:
        rel = (c["limit"] - c["value"]) / abs(c["limit"])
        return rel if c["bound"] == "max" else -rel

    rule, c = min(checks, key=lambda rc: margin(rc[1]))
    line = next(ln for ln in text.out.splitlines() if ln.startswith("pump-drive-4p36s: "))
    assert line.startswith(f"pump-drive-4p36s: {len(checks)} checks; closest to a limit: {rule}")
    assert c["label"] in line
    assert line.endswith(f"({margin(c) * 100:+.1f} %)")
    assert text.out.index(line) < text.out.index("PASS:")  # before the verdict


def test_the_margins_lines_follow_the_findings() -> None:
    out = run_cli("check", DEMO).out
    lines = out.splitlines()
    ids = ["genset-4p48s", "pump-drive-4p36s", "servo-10p12s"]
    at = [next(i for i, ln in enumerate(lines) if ln.startswith(f"{rid}: ")) for rid in ids]
    last_finding = max(i for i, ln in enumerate(lines) if ln.startswith("  "))
    assert at == sorted(at) and at[0] > last_finding  # one line per record, after findings
    # The failing servo's closest check is beyond its limit: a negative margin.
    assert re.search(r"\(-\d+\.\d %\)$", lines[at[2]])


# --- 7. method texts --------------------------------------------------------------------------


def test_the_fundamental_note_states_the_flat_top_factor() -> None:
    method = SHEET["air_gap.flux_density_fundamental"].method
    assert "(4/pi) sin(a pi/2)" in method
    # [calc] (4/pi) sin(a pi/2) = 1 at a = (2/pi) asin(pi/4) = 0.5751.
    assert f"a > {2 / math.pi * math.asin(math.pi / 4):.3f}" in method
    s = sheet(SERVO)  # pole arc 0.8: above the peak, as the note says
    assert s["air_gap.flux_density_fundamental"] > s["air_gap.flux_density_peak"]


def test_the_effective_gap_text_names_carter_and_both_gaps() -> None:
    method = SHEET["air_gap.effective_length"].method
    assert "is taken on" not in method  # the garbled phrase is gone
    assert "Carter's coefficient times" in method and "h_m / mu_rec" in method


# --- 8. explain: optional options show their unit ---------------------------------------------


def test_explain_prints_optional_defaults_with_their_unit() -> None:
    out = run_cli("explain", "gap-flux").out
    # The rule's lower limits: 0.6, 0.3 and 0.6 T (common practice, no source).
    for name, value in (("induction_min", "0.6"), ("surface_pm_min", "0.3")):
        assert re.search(rf"^  {name} = {value} T ", out, flags=re.MULTILINE), out
    assert re.search(r"^  induction = 0\.9 T ", out, flags=re.MULTILINE)  # unchanged
