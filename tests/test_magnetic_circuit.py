"""The magnetic circuit of each machine kind on the sheet: the salient pole body and its shoe,
the gap-flux limits by machine kind, and the surface-magnet gap, against closed forms with a
linear or ideal steel and Carter's coefficient by hand.
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from conftest import (
    GENSET,
    MM,
    MU0,
    PUMP,
    SERVO,
    calculation,
    carter,
    check_json,
    findings,
    linear_curve,
    node_mark,
    outcome,
    run_cli,
    sheet,
    the_check,
    variant,
    write_config,
)
from emgate.calc import magnetic

# --- salient pole body ----------------------------------------------------------------------------


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


# --- pole shoe in the pole's path -----------------------------------------------------------------


def test_the_pole_body_flux_density_is_carried_over_body_and_shoe() -> None:
    mu_r = 1000.0
    calc = calculation(GENSET, linear_curve(mu_r))
    iron = magnetic.magnetic(calc).iron
    # [calc] Ampere on a linear section: F = B l / (mu0 mu_r), l = body 40 mm + shoe 12 mm.
    expected = iron.pole_body_b / (MU0 * mu_r) * (40 + 12) * MM
    # mu0 of the code may be 4 pi 1e-7 (1e-9 apart); the rest is rounding.
    assert iron.pole_body_mmf == pytest.approx(expected, rel=1e-8)


# --- surface-magnet gap ---------------------------------------------------------------------------


def test_the_servo_gap_is_carter_on_the_whole_magnetic_gap_with_ideal_iron() -> None:
    calc = calculation(SERVO, linear_curve(1e13))
    # Br(T) = Br20 (1 + alpha (T - 20)) [mem: Hendershot and Miller]: 1.25 T, -0.12 %/K,
    # 100 degC; B_g = Br (h_m / mu_rec) / (kc g'), g' = g + h_m / mu_rec, kc by Carter on g'
    # [mem: Carter 1901, as in Pyrhonen ch. 3; Hendershot and Miller, working point].
    br = 1.25 * (1 - 0.0012 * 80)
    g_mag = 0.8 + 3.5 / 1.05
    kc = carter(math.pi * 78 / 12, 2.0, g_mag)
    expected = br * (3.5 / 1.05) / (kc * g_mag)
    # Iron at mu_r 1e13 takes ~1e-11 of the loop, the root solve stops at 1e-12: 1e-9.
    assert calc.value("air_gap.flux_density_peak") == pytest.approx(expected, rel=1e-9)


def test_the_kernel_docstrings_state_what_effective_gap_must_be() -> None:
    from emgate.physics.magnetic import PolePath
    from emgate.physics.magnetic_surface_pm import surface_pm_gap

    for doc in (PolePath.__doc__ or "", surface_pm_gap.__doc__ or ""):
        assert "kc g' - l_m / mu_rec" in doc
    assert "Br (l_m / mu_rec) / (kc g')" in (surface_pm_gap.__doc__ or "")
