"""tolerances: in a record and the rule tolerance-corners: every other rule at the corners of
the tolerance box (or on a Monte Carlo sample), the finding naming the failing corner."""

from __future__ import annotations

from pathlib import Path

import pytest

from conftest import check_json, findings, outcome, run_cli, sheet, write_config, write_variant
from emgate.tolerances import ToleranceError, in_field_unit, parse_tolerance


def record(repo: Path, tolerances: dict[str, str], **extra: object) -> Path:
    return write_variant(repo, {"tolerances": tolerances, **extra})


def test_tolerance_texts_parse_to_bands_and_spreads() -> None:
    assert parse_tolerance("+-0.05 mm") == parse_tolerance("±0.05 mm")
    band = parse_tolerance("+0.02 mm -0.05 mm")
    assert (band.minus, band.plus, band.unit, band.normal) == (0.05, 0.02, "mm", False)
    assert parse_tolerance("normal 1 %").normal
    # 50 um on a field in mm is 0.05 mm; 3 % of 0.45 is 0.0135 ([calc])
    assert in_field_unit(parse_tolerance("+-50 um"), 0.45, "mm") == pytest.approx((0.05, 0.05))
    assert in_field_unit(parse_tolerance("+-3 %"), 0.45, "mm") == pytest.approx((0.0135,) * 2)
    with pytest.raises(ToleranceError):
        in_field_unit(parse_tolerance("+-1 T"), 0.45, "mm")
    with pytest.raises(ToleranceError):
        parse_tolerance("about 0.05 mm")


def test_the_model_refuses_a_tolerance_it_cannot_read(repo: Path) -> None:
    path = record(repo, {"air_gap": "roughly 0.05 mm"})
    result = run_cli("check", "--format", "json", path)
    assert result.code == 2
    (finding,) = result.input_findings()
    assert finding["record_path"] == "$.tolerances.air_gap"


def test_the_corner_that_breaks_the_slot_fill_is_named(repo: Path) -> None:
    """Bare copper grows with the square of the strand diameter, the slot area not at all:
    the pump's fill 0.4144 at 0.90 mm becomes 0.4144 (0.95 / 0.90)^2 = 0.4617 at 0.95 mm,
    past the 0.45 limit, and 0.4144 (0.91 / 0.90)^2 = 0.4237 at 0.91 mm, inside it ([calc])."""
    nominal = sheet(record(repo, {}))["stator.slot_fill"]
    assert nominal == pytest.approx(0.4144, abs=5e-5)  # as the demo reports it, 4 digits
    assert nominal * (0.91 / 0.90) ** 2 < 0.45 < nominal * (0.95 / 0.90) ** 2

    inside = check_json(record(repo, {"winding.conductor.bare_diameter": "+0.01 mm -0.02 mm"}))
    assert outcome(inside, "tolerance-corners")["status"] == "pass"

    path = record(repo, {"winding.conductor.bare_diameter": "+0.05 mm -0.02 mm"})
    result = check_json(path)
    assert result.code == 1
    (finding,) = findings(result, "tolerance-corners")
    lines = path.read_text().splitlines()
    # located at the tolerance's own line
    assert "bare_diameter: +0.05 mm -0.02 mm" in lines[finding["line"] - 1]
    assert (
        "slot-fill fails at the corner winding.conductor.bare_diameter = 0.95 mm"
        in (finding["message"])
    )
    assert "(1 of 2 corners fail)" in finding["message"]


def test_every_corner_of_several_fields_is_checked(repo: Path) -> None:
    path = record(
        repo,
        {
            "air_gap": "+-0.05 mm",
            "winding.conductor.bare_diameter": "+0.05 mm -0.02 mm",
            "stator.slot.height": "+-2 %",
        },
    )
    (finding,) = findings(check_json(path), "tolerance-corners")
    # the worst corner: the thick wire in the shallow slot; half of the 2^3 corners have
    # the thick wire
    assert "bare_diameter = 0.95 mm" in finding["message"]
    assert "stator.slot.height = 19.6 mm" in finding["message"]
    assert "(4 of 8 corners fail)" in finding["message"]


def test_a_field_the_record_lacks_is_located(repo: Path) -> None:
    path = record(repo, {"air_gaps": "+-0.05 mm"})
    (finding,) = findings(check_json(path), "tolerance-corners")
    assert finding["record_path"] == "$.tolerances.air_gaps"
    assert "no field 'air_gaps'" in finding["message"]


def test_a_monte_carlo_sample_names_the_share_that_passes(repo: Path) -> None:
    # a spread of 0.03 mm around 0.90 mm: the fill stays inside 0.45 below
    # 0.90 sqrt(0.45 / 0.41437) = 0.9379 mm ([calc], fill as the square of the diameter),
    # 1.26 standard deviations up, where the normal distribution holds 0.896 ([pub: standard
    # normal table, Phi(1.26) = 0.8962]): about 90 % of a sample passes, short of 99 %
    write_config(
        repo,
        "options:\n  tolerance-corners: {mode: monte_carlo, samples: 400, percentile: 99}\n",
    )
    path = record(repo, {"winding.conductor.bare_diameter": "normal 0.03 mm"})
    (finding,) = findings(check_json(path), "tolerance-corners")
    share = float(finding["message"].split(" %")[0])
    # 400 samples: the share's standard error is sqrt(0.896 * 0.104 / 400) = 1.5 %;
    # four of them either side
    assert 83.6 <= share <= 95.6
    assert "of 400 samples pass every rule, 99 % required; the worst sample" in finding["message"]


def test_a_corner_the_kernel_cannot_compute_fails_the_rule(
    repo: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    """A corner is held to the plausibility pass a record is held to: a sheet quantity that is
    non-finite at a corner (injected here for strands over 0.92 mm) is a finding naming the
    corner, not a corner the rules passed."""
    import math

    from emgate import calc

    real = calc.PROVIDERS["winding.temperature_rise"]
    monkeypatch.setitem(
        calc.PROVIDERS,
        "winding.temperature_rise",
        lambda c: math.nan if c.d.winding.conductor.bare_diameter > 0.92e-3 else real(c),
    )
    result = check_json(record(repo, {"winding.conductor.bare_diameter": "+0.03 mm -0.01 mm"}))
    (finding,) = findings(result, "tolerance-corners")
    assert (
        "corner winding.conductor.bare_diameter = 0.93 mm is not a valid record"
        in (finding["message"])
    )
    assert "winding.temperature_rise cannot be computed" in finding["message"]
