"""Rule options in emgate.yaml: lengths and ratios take units, a unit is required where it
matters, and `emgate explain` shows optional defaults with their unit.
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest

from conftest import assert_located, check_json, run_cli, the_check, variant, write_config

# --- options with units ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("rule", "option", "text", "si", "quantity"),
    [
        ("slot-fill", "opening_clearance", "0.2 mm", 0.2e-3, "stator.opening_clearance"),
        ("slot-fill", "random_wound", "45 %", 0.45, "stator.slot_fill"),
        ("mmf-thd", "distributed", "20 %", 0.2, "winding.mmf_thd"),
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


# --- explain: optional options show their unit ----------------------------------------------------


def test_explain_prints_optional_defaults_with_their_unit() -> None:
    out = run_cli("explain", "gap-flux").out
    # The rule's lower limits: 0.6, 0.3 and 0.6 T (common practice, no source).
    for name, value in (("induction_min", "0.6"), ("surface_pm_min", "0.3")):
        assert re.search(rf"^  {name} = {value} T ", out, flags=re.MULTILINE), out
    assert re.search(r"^  induction = 0\.9 T ", out, flags=re.MULTILINE)  # unchanged
