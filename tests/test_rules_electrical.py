"""Conductor and thermal rules end to end: slot-fill, current-density, thermal-load,
temperature-rise, declared-values, and ``emgate explain`` of every built-in rule.

Variants of the demo records go to a temporary design repository and through the CLI
in-process; each failing variant must exit 1 with its finding at the record path and line the
rule names. Values are checked against hand calculations from the raw numbers.
"""

from __future__ import annotations

import math
import re
from pathlib import Path

import pytest
import yaml

from conftest import (
    DEMO,
    GENSET,
    MM,
    MM2,
    PUMP,
    CliResult,
    assert_located,
    check_json,
    findings,
    kd_kp,
    outcome,
    run_cli,
    sheet,
    the_check,
    variant,
    write_config,
)

I_PUMP = 14.6 / math.sqrt(3)  # delta: phase current of the pump [calc]

# --- slot fill ------------------------------------------------------------------------------


def test_more_turns_overfill_the_slot(repo: Path) -> None:
    base = sheet(variant(repo, {}))["stator.slot_fill"]
    path = variant(repo, {"winding.turns_per_coil": 25})
    result = check_json(path)
    finding = assert_located(result, "slot-fill", path, "winding.turns_per_coil")
    assert {f["rule"] for f in findings(result)} == {"slot-fill"}
    # Copper grows with the turns, the slot does not [calc]: 0.414 * 25/21 = 0.493.
    assert finding["check"]["value"] == pytest.approx(base * 25 / 21, rel=1e-12)
    assert finding["check"]["limit"] == pytest.approx(0.45, rel=1e-12)  # random-wound [cp]


def test_wire_wider_than_the_slot_opening_fails(repo: Path) -> None:
    path = variant(repo, {"stator.slot.opening": "0.9 mm"})  # the wire is 0.97 mm insulated
    result = check_json(path)
    finding = assert_located(result, "slot-fill", path, "stator.slot.opening")
    assert {f["rule"] for f in findings(result)} == {"slot-fill"}
    check = finding["check"]
    assert check["quantity"] == "stator.opening_clearance"
    assert check["value"] / MM == pytest.approx(0.9 - 0.97, rel=1e-9)  # [calc] opening - wire
    assert check["limit"] / MM == pytest.approx(0.2, rel=1e-9)  # clearance [cp, no source]
    assert check["bound"] == "min"


# --- current density ------------------------------------------------------------------------


def pump_bar_current() -> float:
    # [mem: Pyrhonen] equal fundamental MMF: I_bar = 2 m N_ph kw1 I / Q_r, 28 rotor bars.
    return 2 * 3 * 252 * kd_kp(3, 2 * 2 * math.pi / 36, 7 / 9) * I_PUMP / 28


def test_rotor_bar_and_ring_current_densities_of_the_pump() -> None:
    s = sheet(PUMP)
    # A cast bar fills its slot: 1.0 x 0.6 mm opening plus the 5.0 to 2.5 mm trapezoid
    # 18 - 0.6 mm deep [calc: plane geometry].
    bar = 1.0 * 0.6 + (5.0 + 2.5) / 2 * (18 - 0.6)
    assert s["rotor.bar_current"] == pytest.approx(pump_bar_current(), rel=1e-9)
    assert s["rotor.bar_current_density"] * MM2 == pytest.approx(
        pump_bar_current() / bar, rel=1e-9
    )  # closed forms on the same numbers: rounding only
    # [mem: Pyrhonen] I_ring = I_bar / (2 sin(pi p / Q_r)) over the 14 x 20 mm ring.
    ring = pump_bar_current() / (2 * math.sin(math.pi * 2 / 28))
    assert s["rotor.ring_current_density"] * MM2 == pytest.approx(ring / (14 * 20), rel=1e-9)


@pytest.mark.parametrize(
    ("base", "overrides", "dotted", "quantity", "expected"),
    [
        (
            PUMP,
            {"rotor.slot.top_width": "3.0 mm", "rotor.slot.bottom_width": "1.5 mm"},
            "rotor.slot",
            "rotor.bar_current_density",
            pump_bar_current() / (1.0 * 0.6 + (3.0 + 1.5) / 2 * 17.4),  # [calc] smaller bar
        ),
        (
            PUMP,
            {"rotor.cage.end_ring": {"axial_width": "8 mm", "radial_height": "10 mm"}},
            "rotor.cage.end_ring",
            "rotor.ring_current_density",
            pump_bar_current() / (2 * math.sin(math.pi * 2 / 28)) / 80,  # [calc] 8 x 10 mm ring
        ),
        (
            GENSET,
            {"rotor.field.current": "11 A"},
            "rotor.field.conductor",
            "rotor.field_current_density",
            11 / (math.pi / 4 * 1.6**2),  # [calc] 11 A in one 1.6 mm round strand
        ),
    ],
    ids=["cage-bar", "end-ring", "field-coil"],
)
def test_rotor_current_density_fails_with_less_copper_or_more_current(
    repo: Path, base: Path, overrides: dict, dotted: str, quantity: str, expected: float
) -> None:
    assert outcome(check_json(variant(repo, {}, base=base)), "current-density")["status"] == "pass"
    path = variant(repo, overrides, base=base)
    finding = assert_located(check_json(path), "current-density", path, dotted)
    check = finding["check"]
    assert check["quantity"] == quantity
    assert check["value"] * MM2 == pytest.approx(expected, rel=1e-9)  # rounding only
    # Aluminium bars and rings 8 A/mm^2, field coils 5 A/mm^2 [mem: Pyrhonen Table 6.2].
    limit = 5.0 if quantity == "rotor.field_current_density" else 8.0
    assert check["limit"] * MM2 == pytest.approx(limit, rel=1e-12)
    assert "Pyrhonen" in finding["message"]


# --- thermal load and temperature rise ------------------------------------------------------


def test_thermal_load_fails_the_servo_and_passes_the_pump() -> None:
    result = run_cli("check", "--format", "json", DEMO)
    assert result.code == 1
    servo = the_check(result, "thermal-load", "stator.thermal_load", "servo-10p12s")
    # [mem: Pyrhonen] A J with A = 2 m N_ph I / (pi D): 400 turns, 3.9 A, 78 mm; J = 3.9 A
    # in one 0.71 mm strand [calc].
    a = 2 * 3 * 400 * 3.9 / (math.pi * 0.078)
    j = 3.9 / (math.pi / 4 * (0.71 * MM) ** 2)
    assert servo["value"] == pytest.approx(a * j, rel=1e-12)  # rounding only
    assert servo["limit"] == pytest.approx(150e9, rel=1e-12)  # enclosed natural [cp]
    assert servo["passed"] is False
    (finding,) = [f for f in findings(result, "thermal-load") if f["record_id"] == "servo-10p12s"]
    assert finding["record_path"] == "$.winding.conductor"
    assert outcome(result, "thermal-load", "pump-drive-4p36s")["status"] == "pass"
    pump = the_check(result, "thermal-load", "stator.thermal_load", "pump-drive-4p36s")
    assert pump["limit"] == pytest.approx(300e9, rel=1e-12)  # fan-cooled [cp]


def test_temperature_rise_fails_the_servo_and_passes_the_pump() -> None:
    result = run_cli("check", "--format", "json", DEMO)
    (finding,) = [
        f
        for f in findings(result, "temperature-rise")
        if f["record_id"] == "servo-10p12s" and f["severity"] == "error"
    ]
    assert finding["record_path"] == "$.cooling.method"
    assert "estimate" in finding["message"]  # the user is told it is an estimate
    # Class F, 105 K by resistance, indirect air cooling, 40 degC coolant [pub: IEC 60034-1],
    # plus 5 K for a totally enclosed fanless frame [from memory: IEC 60034-1].
    assert finding["check"]["limit"] == pytest.approx(110.0, rel=1e-12)
    assert "IEC 60034-1" in finding["message"]
    assert outcome(result, "temperature-rise", "pump-drive-4p36s")["status"] == "pass"


@pytest.mark.parametrize(("letter", "limit"), [("B", 80.0), ("F", 105.0), ("H", 125.0)])
def test_temperature_rise_limit_by_insulation_class(repo: Path, letter: str, limit: float) -> None:
    # [pub: IEC 60034-1, via a manufacturer's manual] rise limits by resistance, up to 200 kW.
    result = check_json(variant(repo, {"winding.insulation_class": letter}))
    check = the_check(result, "temperature-rise", "winding.temperature_rise")
    assert check["limit"] == pytest.approx(limit, rel=1e-12)


def test_temperature_rise_grows_with_the_copper_loss(repo: Path) -> None:
    # More current, more I^2 R loss through the same thermal path: a higher estimate.
    rises = [
        sheet(variant(repo, {"rating.line_current": f"{i} A"}))["winding.temperature_rise"]
        for i in (12, 14.6, 18)  # 10 A would be eta cos(phi) above 1 for 7.5 kW [calc]
    ]
    assert rises[0] < rises[1] < rises[2], rises


# --- declared values ------------------------------------------------------------------------

J_PUMP = I_PUMP / (2 * math.pi / 4 * 0.90**2)  # [calc] 6.625 A/mm^2, as in test_sheet


def declared_mark(path: Path, name: str) -> tuple[int, int]:
    """1-based (line, column) of a declared entry's value by PyYAML's composer (its key holds
    dots, which conftest's dotted paths cannot name)."""
    root = yaml.compose(path.read_text(encoding="utf-8"), Loader=yaml.SafeLoader)
    block = next(v for k, v in root.value if k.value == "declared")
    node = next(v for k, v in block.value if k.value == name)
    return node.start_mark.line + 1, node.start_mark.column + 1


def declared(repo: Path, entries: dict[str, object]) -> tuple[Path, CliResult]:
    path = variant(repo, {"declared": entries})
    return path, check_json(path)


def test_declared_value_that_matches_passes(repo: Path) -> None:
    _, result = declared(repo, {"stator.current_density": "6.6 A/mm^2", "winding.mmf_thd": 0.1053})
    assert result.code == 0, result.out
    (check, *_) = outcome(result, "declared-values")["checks"]
    # |6.625 - 6.6| / 6.6 [calc]: the relative difference against the declared figure.
    assert check["value"] == pytest.approx(abs(J_PUMP - 6.6) / 6.6, rel=1e-9)
    assert check["limit"] == pytest.approx(0.05, rel=1e-12)  # default tolerance [cp]


@pytest.mark.parametrize("factor", [0.8, 1.2])
def test_declared_value_20_percent_off_fails(repo: Path, factor: float) -> None:
    path, result = declared(repo, {"stator.current_density": f"{J_PUMP * factor:.6g} A/mm^2"})
    assert result.code == 1
    (finding,) = findings(result, "declared-values")
    assert finding["record_path"] == "$.declared['stator.current_density']"
    assert (finding["line"], finding["column"]) == declared_mark(path, "stator.current_density")
    d = float(f"{J_PUMP * factor:.6g}")
    assert finding["check"]["value"] == pytest.approx(abs(J_PUMP - d) / d, rel=1e-9)


def test_declared_unknown_name_is_an_error_with_a_hint(repo: Path) -> None:
    _, result = declared(repo, {"stator.curent_density": "6.6 A/mm^2"})
    assert result.code == 1
    (finding,) = findings(result, "declared-values")
    assert finding["severity"] == "error"
    assert "did you mean 'stator.current_density'?" in finding["message"]


def test_declared_value_of_the_wrong_dimension_is_an_error(repo: Path) -> None:
    _, result = declared(repo, {"stator.current_density": "6.6 A"})
    assert result.code == 1
    (finding,) = findings(result, "declared-values")
    assert finding["severity"] == "error"
    assert "expected a current density" in finding["message"]
    assert not outcome(result, "declared-values")["checks"]  # nothing was compared


def test_declared_name_of_another_machine_kind_says_so(repo: Path) -> None:
    _, result = declared(repo, {"rotor.field_current_density": "4 A/mm^2"})
    assert result.code == 1
    (finding,) = findings(result, "declared-values")
    assert finding["severity"] == "error"
    # It names the kinds it is computed for, and does not suggest the very name given.
    assert "salient_field machines only" in finding["message"]
    assert "did you mean" not in finding["message"]


# --- explain ---------------------------------------------------------------------------------

BUILTIN = [
    "back-emf",
    "back-emf-top-speed",
    "cold-magnet-flux",
    "current-density",
    "declared-values",
    "demagnetisation",
    "demagnetisation-fault",
    "efficiency",
    "gap-flux",
    "mmf-thd",
    "nameplate",
    "shear-stress",
    "slot-fill",
    "temperature-rise",
    "thermal-load",
    "tolerance-corners",
    "tooth-flux",
    "winding-balance",
    "yoke-flux",
]
SOURCE = re.compile(r"Pyrhonen|Hendershot|IEC \d|common practice|from memory")


def test_the_builtin_rule_list_is_the_one_explained_here() -> None:
    rules = run_cli("rules", "--format", "json").json()
    ours = sorted(r["id"] for r in rules if r["origin"]["distribution"] == "emgate")
    assert ours == BUILTIN


@pytest.mark.parametrize("rule", BUILTIN)
def test_explain_states_the_method_and_a_source(rule: str) -> None:
    result = run_cli("explain", rule)
    assert result.code == 0, result.err
    assert re.search(r"^Method\b", result.out, flags=re.MULTILINE)  # a paragraph on the method
    assert SOURCE.search(result.out), result.out


def test_explain_names_each_default_limit_source() -> None:
    # Spot checks of the defaults' sources the rules cite.
    assert "Hendershot" in run_cli("explain", "current-density").out
    assert "IEC 60034-1" in run_cli("explain", "temperature-rise").out
    assert "ESTIMATE" in run_cli("explain", "temperature-rise").out
    assert "Table 6.1" in run_cli("explain", "gap-flux").out


# --- form-wound fit -------------------------------------------------------------------------------


def test_a_form_wound_strand_wider_than_the_slot_less_liners_fails(repo: Path) -> None:
    result = check_json(variant(repo, {}, base=GENSET))
    fit = the_check(result, "slot-fill", "stator.slot_width_clearance")
    # [calc] 7.0 - (5.2 + 2 x 0.4) = 1.0 mm across the slot.
    assert fit["value"] / MM == pytest.approx(1.0, rel=1e-9)  # mm sums in metres: rounding
    path = variant(repo, {"winding.conductor.insulated_width": "6.5 mm"}, base=GENSET)
    finding = assert_located(check_json(path), "slot-fill", path, "stator.slot.width")
    assert finding["check"]["value"] / MM == pytest.approx(7.0 - 6.5 - 0.8, rel=1e-9)  # [calc]
    assert finding["check"]["limit"] == 0.0  # must fit (common practice, no source); exact


# --- declared values: units and tolerances --------------------------------------------------------


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
