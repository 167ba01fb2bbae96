"""Records the kernel cannot build are located input errors (exit 2), never rule crashes;
records in any YAML style are found; policy files named one by one re-check what they affect.
"""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest
import yaml

from conftest import GENSET, PUMP, SERVO, STEELS, node_mark, run_cli, write_variant


def only_input_error(path: Path) -> dict:
    result = run_cli("check", "--format", "json", path)
    assert result.code == 2, result.out + result.err
    errors = result.input_findings()
    assert len(errors) == 1, errors
    return errors[0]


@pytest.mark.parametrize(
    ("overrides", "base", "at"),
    [
        # Double layer, 36 slots, 4 poles: a pitch of 18 puts both sides of one coil group in
        # one slot with opposite signs [calc: star of slots, y = Q/2].
        ({"winding.coil_pitch": 18}, PUMP, "winding.coil_pitch"),
        # 12 coils per phase cannot split into 5 equal parallel paths [calc].
        ({"winding.parallel_paths": 5}, PUMP, "winding.parallel_paths"),
        # A corner radius larger than half the 1.25 mm strand height is no rectangle [calc].
        ({"winding.conductor.corner_radius": "1 mm"}, GENSET, "winding.conductor.corner_radius"),
        # A 4 mm liner fills a 7 mm wide slot from both sides [calc].
        ({"winding.slot_liner": "4 mm"}, GENSET, "winding.slot_liner"),
        # At 900 degC and -0.12 %/K the remanence is below zero [calc: Br (1 + alpha dT)].
        (
            {"rotor.magnet.operating_temperature": "900 degC"},
            SERVO,
            "rotor.magnet.operating_temperature",
        ),
    ],
)
def test_a_winding_or_part_that_cannot_be_built_is_located(
    repo: Path, overrides: dict, base: Path, at: str
) -> None:
    if base is GENSET:
        (repo / "materials").mkdir()
        (repo / "materials" / "steels.yaml").write_text(STEELS.read_text())
    path = write_variant(repo, overrides, base=base)
    error = only_input_error(path)
    assert error["record_path"] == "$." + at
    assert (error["line"], error["column"]) == node_mark(path, at)


@pytest.mark.parametrize(
    ("overrides", "base", "words"),
    [
        # 4 poles at 50 Hz: synchronous speed 1500 rpm; 3000 rpm is a slip of -100 % [calc].
        ({"rating.speed": "3000 rpm"}, PUMP, "slip of -100.0%"),
        # Exactly synchronous: an induction machine carries no torque without slip
        # [mem: Fitzgerald and Kingsley, induction machine torque-slip characteristic].
        ({"rating.speed": "1500 rpm"}, PUMP, "slip of 0.0%"),
        # 10 poles at 125 Hz: a synchronous machine turns at 1500 rpm [calc: 60 f / p].
        ({"rating.speed": "1450 rpm"}, SERVO, "turns at 1500 rpm"),
        ({"cooling.ambient": "150 degC"}, PUMP, "outside -60 to 120 degC"),
    ],
)
def test_rating_and_coolant_must_be_plausible(
    repo: Path, overrides: dict, base: Path, words: str
) -> None:
    path = write_variant(repo, overrides, base=base)
    error = only_input_error(path)
    assert words in error["message"]
    key = next(iter(overrides))
    assert error["record_path"] == "$." + key


@pytest.mark.parametrize("name", ["200", "R"])
def test_insulation_classes_without_thermal_data_are_refused(repo: Path, name: str) -> None:
    # emgate holds IEC 60034-1 rise limits and reference temperatures for A, E, B, F and H
    # (A and E from memory); class N (200) has none yet.
    path = write_variant(repo, {"winding.insulation_class": name})
    error = only_input_error(path)
    assert error["record_path"] == "$.winding.insulation_class"
    assert "'F' or 'H'" in error["message"]


@pytest.mark.parametrize("style", ["flow", "json", "cr"])
def test_a_record_in_any_yaml_style_is_checked(tmp_path: Path, style: str) -> None:
    text = PUMP.read_text()
    if style in ("flow", "json"):
        data = yaml.safe_load(text)
        text = (
            json.dumps(data) if style == "json" else yaml.safe_dump(data, default_flow_style=True)
        )
    else:
        text = text.replace("\n", "\r")
    (tmp_path / ".git").mkdir()  # a repository of its own
    path = tmp_path / "record.yaml"
    path.write_text(text, newline="")
    result = run_cli("check", "--format", "json", tmp_path)
    assert result.code == 0, result.out
    assert [r["record_id"] for r in result.json()["records"]] == ["pump-drive-4p36s"]


@pytest.mark.parametrize(
    ("points", "row"),
    [
        # 0.01 T at 50 kA/m: relative permeability 0.16, below vacuum's 1 [calc: B / (mu0 H)].
        ([[0, 0], [0.01, 50000], [0.05, 100000]], 1),
        # 1 T at 1 A/m is a relative permeability of 8e5, still below the cap; 2 T at 1.5 A/m
        # is 1.06e6, a unit slip (kA/m written as A/m) [calc].
        ([[0, 0], [1.0, 1.0], [2.0, 1.5]], 2),
    ],
)
def test_an_impossible_bh_table_is_a_located_error(tmp_path: Path, points: list, row: int) -> None:
    (tmp_path / ".git").mkdir()
    materials = {
        "schema": "emgate/materials@1",
        "steels": {"lab-1": {"source": "test table", "columns": ["T", "A/m"], "points": points}},
    }
    path = tmp_path / "steels.yaml"
    path.write_text(yaml.safe_dump(materials, sort_keys=False))
    result = run_cli("check", "--format", "json", path)
    assert result.code == 2, result.out
    errors = [f for f in result.input_findings() if f["file"].endswith("steels.yaml")]
    assert errors and "relative permeability" in errors[0]["message"]
    assert errors[0]["record_path"] == f"$.steels['lab-1'].points[{row}]"


def test_a_bad_density_is_located_at_the_density(tmp_path: Path) -> None:
    (tmp_path / ".git").mkdir()
    data = yaml.safe_load(STEELS.read_text())
    data["steels"]["M330-50A-lot2611"]["density"] = "7650 kg"
    path = tmp_path / "steels.yaml"
    path.write_text(yaml.safe_dump(data, sort_keys=False))
    result = run_cli("check", "--format", "json", path)
    errors = [f for f in result.input_findings() if f["file"].endswith("steels.yaml")]
    assert errors[0]["record_path"].endswith(".density")


def test_no_folder_is_searched_for_materials_outside_a_repository(tmp_path: Path) -> None:
    # A stray materials file elsewhere under the same folder tree must not be read.
    outside = tmp_path / "loose"
    outside.mkdir()
    (outside / "record.yaml").write_text(GENSET.read_text())
    (tmp_path / "other").mkdir()
    (tmp_path / "other" / "steels.yaml").write_text(STEELS.read_text())
    result = run_cli("check", "--format", "json", outside / "record.yaml")
    assert result.code == 2  # its lot grade is unknown: nothing was searched for it
    assert "unknown steel grade 'M330-50A-lot2611'" in result.out


def _repo_with_waiver(repo: Path) -> tuple[Path, Path]:
    (repo / "emgate.yaml").write_text("schema: emgate/config@1\n")
    (repo / "waivers.yaml").write_text(
        "schema: emgate/waivers@1\nwaivers:\n"
        "  - rule: current-density\n    record: servo-10p12s\n"
        "    reason: fan retrofit ordered for the prototype frame\n"
        "    owner: E. Example\n    expires: 2030-01-31\n"
    )
    servo = write_variant(repo, base=SERVO, name="servo.yaml")
    pump = write_variant(repo, name="pump.yaml")
    return servo, pump


def test_a_file_waiver_for_a_record_outside_the_run_is_no_error(repo: Path) -> None:
    # pre-commit passes only the staged record: the servo's waiver is not a typo.
    _, pump = _repo_with_waiver(repo)
    result = run_cli("check", "--format", "json", "--today", "2030-01-01", pump)
    assert result.code == 0, result.out
    assert not result.input_findings()


def test_a_named_policy_file_rechecks_every_record(repo: Path) -> None:
    # Committing only emgate.yaml (a tighter limit) must re-check the records it governs.
    _repo_with_waiver(repo)
    (repo / "emgate.yaml").write_text(
        "schema: emgate/config@1\noptions:\n  current-density:\n    enclosed_fan: 6 A/mm^2\n"
    )
    result = run_cli("check", "--format", "json", "--today", "2030-01-01", repo / "emgate.yaml")
    records = {r["record_id"] for r in result.json()["records"]}
    assert records == {"pump-drive-4p36s", "servo-10p12s"}
    assert result.code == 1  # the pump's 6.63 A/mm^2 [calc] now breaks the 6 A/mm^2 limit


def test_version_and_formats_do_not_import_the_models() -> None:
    code = "import sys, emgate.cli; emgate.cli.main(['--version'])"
    done = subprocess.run(
        [sys.executable, "-c", code + "\n"], capture_output=True, text=True, check=False
    )
    assert "emgate" in done.stdout
    probe = subprocess.run(
        [sys.executable, "-c", "import sys, emgate.cli; print('pydantic' in sys.modules)"],
        capture_output=True,
        text=True,
        check=True,
    )
    assert probe.stdout.strip() == "False"


def test_show_says_when_a_quantity_could_not_be_computed(repo: Path, monkeypatch) -> None:
    from emgate import calc

    def broken(c: calc.Calculation) -> float:
        raise ValueError("a stand-in kernel failure")

    monkeypatch.setitem(calc.PROVIDERS, "winding.copper_loss", broken)
    result = run_cli("show", "--format", "json", write_variant(repo))
    assert result.code == 2
    assert "a stand-in kernel failure" in result.out + result.err


@pytest.mark.parametrize(
    ("overrides", "base", "at", "words"),
    [
        # 4 poles at 50 Hz: 1500 rpm synchronous; 700 rpm is a slip of 53 %, beyond any
        # induction machine (poles miscounted) [calc].
        ({"rating.speed": "700 rpm"}, PUMP, "rating.speed", "slip of 53.3%"),
        # 7.5 kW from 400 V, 14.6 A delta is eta cos(phi) = 0.74 [calc]; at 1.46 A it is 7.4.
        ({"rating.line_current": "1.46 A"}, PUMP, "rating.line_current", "7.41"),
        # IC411 is a fan-cooled enclosed frame [from memory: IEC 60034-6].
        ({"cooling.code": "IC411"}, SERVO, "cooling.code", "IC411 is enclosed fan"),
        (
            {"rotor.magnet.material.remanence_temperature_coefficient": "0.12 %/K"},
            SERVO,
            "rotor.magnet.material.remanence_temperature_coefficient",
            "negative",
        ),
        # 36 slots, 2 pole pairs: t = gcd(36, 2) = 2, Q/t even, so 1, 2 or 4 paths
        # [from memory: Pyrhonen]; 3 paths would carry unequal EMFs.
        ({"winding.parallel_paths": 3}, PUMP, "winding.parallel_paths", "1, 2, 4 can"),
    ],
)
def test_nameplate_cooling_and_winding_plausibility(
    repo: Path, overrides: dict, base: Path, at: str, words: str
) -> None:
    path = write_variant(repo, overrides, base=base)
    error = only_input_error(path)
    assert words in error["message"], error["message"]
    assert error["record_path"] == "$." + at


def test_a_class_may_be_named_by_its_temperature(repo: Path) -> None:
    # IEC 60085: 155 is class F.
    named = run_cli(
        "show",
        "--format",
        "json",
        write_variant(repo, {"winding.insulation_class": "155"}, name="a.yaml"),
    ).json()["quantities"]
    lettered = run_cli("show", "--format", "json", write_variant(repo, {}, name="b.yaml")).json()[
        "quantities"
    ]
    assert named["winding.phase_resistance_hot"] == lettered["winding.phase_resistance_hot"]


def test_zero_needs_no_unit_and_schema_defaults_carry_units(repo: Path) -> None:
    path = write_variant(repo, {"rotor.sleeve_thickness": 0}, base=SERVO)
    assert run_cli("check", path).code == 1  # the servo's own findings, no input error
    schema = json.loads((Path(__file__).parents[1] / "schemas" / "design.schema.json").read_text())
    magnet = schema["$defs"]["MagnetMaterial"]["properties"]
    assert magnet["reference_temperature"]["default"] == "20 degC"
    assert magnet["coercivity_temperature_coefficient"]["default"] == "-0.6 %/K"


def test_a_high_slip_is_a_nameplate_warning_not_an_error(repo: Path) -> None:
    # 4 poles at 60 Hz: 1800 rpm synchronous; 1460 rpm is a slip of 18.9 % [calc], likely a
    # 50/60 Hz mix-up but possible for a high-slip design: a warning the team may relax.
    path = write_variant(repo, {"rating.frequency": "60 Hz"})
    result = run_cli("check", "--format", "json", path)
    warned = [f for f in result.json()["findings"] if f["rule"] == "nameplate"]
    assert [f["severity"] for f in warned] == ["warning"]
    assert warned[0]["record_path"] == "$.rating.speed"


def test_an_induction_generator_runs_above_synchronous_speed(repo: Path) -> None:
    # Negative slip is a generator's [mem: Fitzgerald and Kingsley]; as a motor it is refused.
    gen = write_variant(
        repo, {"rating.speed": "1530 rpm", "rating.operation": "generator"}, name="gen.yaml"
    )
    assert not run_cli("check", "--format", "json", gen).input_findings()
    motor = write_variant(repo, {"rating.speed": "1530 rpm"}, name="motor.yaml")
    assert "turns a little below" in only_input_error(motor)["message"]


@pytest.mark.parametrize("code", ["IC4A1A1", "ic 411", "IC411"])
def test_cooling_codes_in_any_notation(repo: Path, code: str) -> None:
    # IEC 60034-6: IC4A1A1 is the full notation of IC411 (air coolant letters dropped)
    # [from memory]; the servo's method is enclosed natural, which IC411 contradicts.
    error = only_input_error(write_variant(repo, {"cooling.code": code}, base=SERVO))
    assert "IC411 is enclosed fan" in error["message"]


def test_single_layer_tooth_coils_take_two_paths(repo: Path) -> None:
    # 12 slots, 10 poles, single layer: phase A's two coils carry equal EMF phasors
    # [calc: star of slots], so 2 parallel paths are allowed and 3 are not.
    base = {"winding.layers": 1, "winding.turns_per_coil": 200}
    ok = write_variant(repo, {**base, "winding.parallel_paths": 2}, base=SERVO, name="a.yaml")
    assert not run_cli("check", "--format", "json", ok).input_findings()
    bad = write_variant(repo, {**base, "winding.parallel_paths": 4}, base=SERVO, name="b.yaml")
    assert "1, 2 can" in only_input_error(bad)["message"]


def test_a_broken_record_the_change_does_not_touch_blocks_nothing(repo: Path) -> None:
    # pre-commit passes only the staged record; a colleague's half-written record elsewhere
    # in the repository must not block this commit (a full check still reports it).
    (repo / "emgate.yaml").write_text("schema: emgate/config@1\n")
    staged = write_variant(repo, name="staged.yaml")
    (repo / "draft.yaml").write_text("schema: emgate/design@1\nid: draft\npoles: [4\n")
    assert run_cli("check", staged).code == 0
    assert run_cli("check", repo).code == 2
