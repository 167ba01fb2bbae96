"""Validation of design and materials records: each invalid variant of a valid demo record is
refused (exit 2) with one located error at the offending node.

Expected lines and columns come from PyYAML's composer on the written variant (see
conftest.py), independent of emgate's loader; feasibility of a winding is judged by the
published balance condition, not by emgate's code.
"""

from __future__ import annotations

import re
from pathlib import Path
from typing import Any

import pytest

from conftest import DELETE, GENSET, PUMP, SERVO, STEELS, node_mark, run_cli, write_variant

THREE_PHASE_LAYOUT = ["+A -C"] * 36  # 36 entries of two coil sides; balance is not the point


def input_errors(path: Path) -> tuple[int, list[dict[str, Any]]]:
    result = run_cli("check", "--format", "json", path)
    return result.code, result.input_findings()


# (id, overrides, node that should be named (dotted), name the key rather than the value,
#  record path, message pattern)
CASES: list[tuple[str, dict[str, Any], str, bool, str, str]] = [
    (
        "unknown-key",
        {"stator.bore_diamter": "136 mm"},
        "stator.bore_diamter",
        True,
        "$.stator.bore_diamter",
        r"unknown key 'bore_diamter'; did you mean 'bore_diameter'\?",
    ),
    (
        "unknown-top-key",
        {"airgap": "0.45 mm"},
        "airgap",
        True,
        "$.airgap",
        r"unknown key 'airgap'; did you mean 'air_gap'\?",
    ),
    # A missing key is located at the mapping that should hold it.
    (
        "missing-key",
        {"stator.bore_diameter": DELETE},
        "stator",
        False,
        "$.stator.bore_diameter",
        "required key 'bore_diameter' is missing",
    ),
    (
        "missing-top-key",
        {"air_gap": DELETE},
        "",
        False,
        "$.air_gap",
        "required key 'air_gap' is missing",
    ),
    (
        "length-in-amperes",
        {"air_gap": "3 A"},
        "air_gap",
        False,
        "$.air_gap",
        r"expected a length such as '0\.45 mm', found '3 A', which is a current",
    ),
    (
        "bare-number",
        {"air_gap": 0.45},
        "air_gap",
        False,
        "$.air_gap",
        r"expected a length with its unit.*bare number 0\.45",
    ),
    ("number-as-text", {"air_gap": "0.45"}, "air_gap", False, "$.air_gap", "expected a length"),
    (
        "zero-length",
        {"stator.stack_length": "0 mm"},
        "stator.stack_length",
        False,
        "$.stator.stack_length",
        "greater than zero",
    ),
    (
        "negative-length",
        {"stator.stack_length": "-140 mm"},
        "stator.stack_length",
        False,
        "$.stator.stack_length",
        "greater than zero",
    ),
    ("zero-air-gap", {"air_gap": "0 mm"}, "air_gap", False, "$.air_gap", "greater than zero"),
    (
        "negative-wedge",
        {"stator.slot.wedge_height": "-1 mm"},
        "stator.slot.wedge_height",
        False,
        "$.stator.slot.wedge_height",
        "must not be negative",
    ),
    (
        "bore-above-outer",
        {"stator.bore_diameter": "230 mm"},
        "stator.bore_diameter",
        False,
        "$.stator.bore_diameter",
        "bore diameter 230 mm must be smaller than the outer diameter",
    ),
    (
        "bore-equals-outer",
        {"stator.bore_diameter": "220 mm"},
        "stator.bore_diameter",
        False,
        "$.stator.bore_diameter",
        "must be smaller than the outer diameter 220 mm",
    ),
    # Section between bore and outer diameter: (220 - 136) / 2 = 42 mm [calc].
    (
        "slot-deeper-than-section",
        {"stator.slot.height": "45 mm"},
        "stator.slot.height",
        False,
        "$.stator.slot.height",
        "slot height 45 mm leaves no stator yoke.* 42 mm",
    ),
    (
        "slot-as-deep-as-section",
        {"stator.slot.height": "42 mm"},
        "stator.slot.height",
        False,
        "$.stator.slot.height",
        "leaves no stator yoke",
    ),
    (
        "opening-wider-than-slot",
        {"stator.slot.opening": "7 mm"},
        "stator.slot.opening",
        False,
        "$.stator.slot.opening",
        "opening 7 mm is wider than the slot's top width 6.4 mm",
    ),
    (
        "coil-pitch-0",
        {"winding.coil_pitch": 0},
        "winding.coil_pitch",
        False,
        "$.winding.coil_pitch",
        "greater than or equal to 1",
    ),
    (
        "coil-pitch-Q",
        {"winding.coil_pitch": 36},
        "winding.coil_pitch",
        False,
        "$.winding.coil_pitch",
        "between 1 and Q-1 = 35",
    ),
    # Q = 16, p = 2, m = 3: Q / (m gcd(Q, p)) = 16/6 is not whole, so no balanced winding
    # [mem: Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical Machines].
    (
        "infeasible-16-slots",
        {"stator.slots": 16},
        "stator.slots",
        False,
        "$.stator.slots",
        "no balanced winding",
    ),
    (
        "layout-too-short",
        {"winding.layout": THREE_PHASE_LAYOUT[:35]},
        "winding.layout",
        False,
        "$.winding.layout",
        r"one layout entry per slot \(36\), found 35",
    ),
    (
        "layout-unknown-phase",
        {"winding.layout": ["+A -D", *THREE_PHASE_LAYOUT[1:]]},
        "winding.layout.0",
        False,
        "$.winding.layout[0]",
        "phase 'D' is not one of the 3 phases",
    ),
    (
        "layout-one-side-in-two-layers",
        {"winding.layout": ["+A", *THREE_PHASE_LAYOUT[1:]]},
        "winding.layout.0",
        False,
        "$.winding.layout[0]",
        "expected 2 coil side",
    ),
    (
        "unknown-steel",
        {"stator.steel": "M400-50"},
        "stator.steel",
        False,
        "$.stator.steel",
        r"unknown steel grade 'M400-50'; did you mean 'M400-50A'\?",
    ),
    ("odd-poles", {"poles": 5}, "poles", False, "$.poles", "multiple of 2"),
    (
        "unknown-connection",
        {"rating.connection": "triangle"},
        "rating.connection",
        False,
        "$.rating.connection",
        "expected 'star' or 'delta', found 'triangle'",
    ),
    (
        "insulated-below-bare",
        {"winding.conductor.insulated_diameter": "0.80 mm"},
        "winding.conductor.insulated_diameter",
        False,
        "$.winding.conductor.insulated_diameter",
        "must not be smaller than the bare diameter",
    ),
    (
        "slots-as-text",
        {"stator.slots": "36"},
        "stator.slots",
        False,
        "$.stator.slots",
        "expected a whole number, found '36'",
    ),
    (
        "fractional-turns",
        {"winding.turns_per_coil": 2.5},
        "winding.turns_per_coil",
        False,
        "$.winding.turns_per_coil",
        "expected a whole number, found 2.5",
    ),
    (
        "overflowing-unit",
        {"air_gap": "1 ((MW^4*MVA^4)^4)^4"},
        "air_gap",
        False,
        "$.air_gap",
        "unit",
    ),
    (
        "unknown-cooling",
        {"cooling.method": "fan"},
        "cooling.method",
        False,
        "$.cooling.method",
        "expected .*'enclosed_fan'.*found 'fan'",
    ),
]


def test_the_base_record_is_valid(repo: Path) -> None:
    code, errors = input_errors(write_variant(repo, {}))
    assert (code, errors) == (0, [])


@pytest.mark.parametrize(
    ("overrides", "node", "key", "record_path", "pattern"),
    [c[1:] for c in CASES],
    ids=[c[0] for c in CASES],
)
def test_invalid_variant_is_one_located_error(
    repo: Path, overrides: dict[str, Any], node: str, key: bool, record_path: str, pattern: str
) -> None:
    path = write_variant(repo, overrides)
    code, errors = input_errors(path)
    assert code == 2
    assert len(errors) == 1, errors
    (error,) = errors
    assert error["record_path"] == record_path
    assert (error["line"], error["column"]) == node_mark(path, node, key=key)
    assert error["file"].endswith(path.name)
    assert re.search(pattern, error["message"]), error["message"]


KIND_CASES: list[tuple[str, dict[str, Any]]] = [
    ("valid", {}),
    *((c[0], c[1]) for c in CASES),
    ("another kind's rotor", {"machine": "surface_pm"}),
    ("no kind", {"machine": DELETE}),
    ("unknown kind", {"machine": "dc_brush"}),
    ("kind not text", {"machine": 3}),
]


@pytest.mark.parametrize("overrides", [c[1] for c in KIND_CASES], ids=[c[0] for c in KIND_CASES])
def test_the_kinds_own_model_gives_what_the_union_gives(
    repo: Path, overrides: dict[str, Any]
) -> None:
    """A record is validated by its machine kind's model alone (one validator built at
    start-up): the same design, or the same located errors, as pydantic's discriminated
    union of the three kinds."""
    from pydantic import ValidationError

    from emgate.loader import load
    from emgate.translate import model_errors
    from emgate.validate import _design, _design_adapter

    doc = load(write_variant(repo, overrides))

    def outcome(validate: Any) -> Any:
        try:
            return validate(doc.data)
        except ValidationError as exc:
            return [(e.message, e.location) for e in model_errors(exc, doc)]

    assert outcome(_design) == outcome(_design_adapter().validate_python)


@pytest.mark.parametrize("path", [PUMP, SERVO, GENSET], ids=lambda p: p.stem)
def test_each_example_kind_validates_as_the_union_does(path: Path) -> None:
    """Each machine kind's bundled record: its own model and the union give equal designs."""
    from emgate.loader import load
    from emgate.validate import _design, _design_adapter

    data = load(path).data
    assert _design(data) == _design_adapter().validate_python(data)


def test_several_errors_in_one_record_are_all_reported(repo: Path) -> None:
    path = write_variant(repo, {"air_gap": "3 A", "stator.slots": "36", "poles": 5})
    code, errors = input_errors(path)
    assert code == 2
    assert sorted(e["record_path"] for e in errors) == ["$.air_gap", "$.poles", "$.stator.slots"]


# --- discriminated unions: machine kind, slot shape ------------------------------------------


def test_wrong_machine_kind_is_refused_naming_the_kinds(repo: Path) -> None:
    code, errors = input_errors(write_variant(repo, {"machine": "dc_brush"}))
    assert code == 2
    assert len(errors) == 1
    for kind in ("induction", "surface_pm", "salient_field"):
        assert kind in errors[0]["message"]


@pytest.mark.parametrize(
    ("overrides", "node", "record_path", "found"),
    [
        ({"machine": "dc_brush"}, "machine", "$.machine", "'dc_brush'"),
        ({"stator.slot.shape": "round"}, "stator.slot.shape", "$.stator.slot.shape", "'round'"),
        (
            {"winding.conductor.shape": "hexagonal"},
            "winding.conductor.shape",
            "$.winding.conductor.shape",
            "'hexagonal'",
        ),
    ],
    ids=["machine", "slot-shape", "conductor-shape"],
)
def test_wrong_discriminator_is_located_at_its_key(
    repo: Path, overrides: dict[str, Any], node: str, record_path: str, found: str
) -> None:
    path = write_variant(repo, overrides)
    code, errors = input_errors(path)
    assert code == 2
    assert [(e["record_path"], e["line"], e["column"]) for e in errors] == [
        (record_path, *node_mark(path, node))
    ]
    assert found in errors[0]["message"]


def test_rotor_of_another_machine_kind_is_refused(repo: Path) -> None:
    # An induction rotor under 'machine: surface_pm': the magnet is missing, cage keys unknown.
    code, errors = input_errors(write_variant(repo, {"machine": "surface_pm"}))
    assert code == 2
    paths = {e["record_path"] for e in errors}
    assert {"$.rotor.magnet", "$.rotor.cage"} <= paths


def test_hint_never_suggests_the_key_itself(repo: Path) -> None:
    _, errors = input_errors(write_variant(repo, {"machine": "surface_pm"}))
    for e in errors:
        key = e["record_path"].rsplit(".", 1)[-1]
        assert f"did you mean {key!r}" not in e["message"], e["message"]
    # A key valid elsewhere gets the keys this mapping takes (a magnet rotor's).
    (slots,) = [e for e in errors if e["record_path"] == "$.rotor.slots"]
    assert "magnet" in slots["message"] and "inner_diameter" in slots["message"]


# --- materials files -------------------------------------------------------------------------

LOT = "steels.M330-50A-lot2611"


@pytest.mark.parametrize(
    ("overrides", "node", "pattern"),
    [
        ({f"{LOT}.columns": ["T", "A"]}, f"{LOT}.columns", "flux density and field strength"),
        ({f"{LOT}.columns": ["A/m", "T"]}, f"{LOT}.columns", "flux density and field strength"),
        ({f"{LOT}.columns": ["T", "A/furlong"]}, f"{LOT}.columns", "unknown unit 'furlong'"),
        ({f"{LOT}.columns": ["T"]}, f"{LOT}.columns", "at least 2 items"),
        ({f"{LOT}.points": [[0, 0], [1, 5], [0.5, 10]]}, f"{LOT}.points", "increase"),
    ],
    ids=["wrong-dimension", "swapped", "unknown-unit", "one-column", "not-increasing"],
)
def test_materials_file_errors_are_located(
    repo: Path, overrides: dict[str, Any], node: str, pattern: str
) -> None:
    (repo / "designs").mkdir()
    (repo / "materials").mkdir()
    write_variant(repo / "designs", {}, base=GENSET)
    steels = write_variant(repo / "materials", overrides, base=STEELS)
    result = run_cli("check", "--format", "json", repo)
    assert result.code == 2
    mine = [f for f in result.input_findings() if f["file"].endswith("materials/steels.yaml")]
    assert len(mine) == 1, mine
    assert mine[0]["record_path"] == f"$.steels['M330-50A-lot2611'].{node.rsplit('.', 1)[1]}"
    assert (mine[0]["line"], mine[0]["column"]) == node_mark(steels, node)
    assert re.search(pattern, mine[0]["message"]), mine[0]["message"]


def test_materials_grade_may_not_shadow_a_builtin(repo: Path) -> None:
    import yaml

    data = yaml.safe_load(STEELS.read_text(encoding="utf-8"))
    data["steels"] = {"M400-50A": data["steels"]["M330-50A-lot2611"]}
    steels = repo / "steels.yaml"
    steels.write_text(yaml.safe_dump(data, sort_keys=False), encoding="utf-8")
    write_variant(repo, {})  # the pump record, which names the built-in M400-50A
    result = run_cli("check", "--format", "json", repo)
    assert result.code == 2
    (error,) = [f for f in result.input_findings() if f["file"].endswith("steels.yaml")]
    assert error["record_path"] == "$.steels['M400-50A']"
    assert (error["line"], error["column"]) == node_mark(steels, "steels.M400-50A", key=True)
    assert "already defined" in error["message"]


def test_the_demo_materials_file_serves_its_design(repo: Path) -> None:
    (repo / "materials").mkdir()
    write_variant(repo, {}, base=GENSET)
    write_variant(repo / "materials", {}, base=STEELS)
    result = run_cli("check", "--format", "json", repo)
    assert result.input_findings() == []
    assert [r["record_id"] for r in result.json()["records"]] == ["genset-4p48s"]
