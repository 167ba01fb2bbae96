"""The winding temperature-rise estimate and its limit: the coolant temperature in the
IEC 60034-1 limit, and the record as the one home of the cooling surfaces.

Variants of the demo records go through the CLI in-process; a few checks build the
calculation directly.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any

import pytest

from conftest import (
    GENSET,
    SERVO,
    assert_located,
    calculation,
    check_json,
    run_cli,
    sheet,
    the_check,
    variant,
)
from emgate.calc import thermal

# --- the coolant temperature in the rise limit ----------------------------------------------------


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


# --- cooling surfaces: one value per name, in the record ------------------------------------------


def thermal_check(path: Path) -> dict[str, Any]:
    return the_check(check_json(path), "temperature-rise", "winding.temperature_rise")


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
    def core_step(factor: float) -> float:
        calc = calculation(variant(repo, {"cooling.core_area_factor": factor}, base=GENSET))
        (step,) = [s for s in thermal.thermal_estimate(calc).steps if s.name == "core surface"]
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
    path = variant(repo, {}, base=SERVO)
    worst = max(thermal.thermal_estimate(calculation(path)).steps, key=lambda s: s.rise)
    assert f"largest step: {worst.name}, {worst.rise:.0f} K" in thermal_check(path)["label"]
