"""emgate sweep: variants of a record over a grid or a random sample, each through
validation and every rule, written as a table; in this process or on a Dask LocalCluster."""

from __future__ import annotations

import csv
import io
import math
from pathlib import Path

import pytest

from conftest import DEMO, PUMP, REPO, run_cli, show_json, write_variant
from emgate.sweep import SweepRun, prepare, run_chunk

SPEC = """\
sample: grid
fields:
  air_gap: {from: 0.35 mm, to: 0.55 mm, steps: 3}
  winding.turns_per_coil: {from: 19, to: 23, step: 2}
"""


def write_spec(tmp_path: Path, text: str = SPEC) -> Path:
    path = tmp_path / "spec.yaml"
    path.write_text(text, encoding="utf-8")
    return path


def table(text: str) -> list[dict[str, str]]:
    return list(csv.DictReader(io.StringIO(text)))


def test_a_grid_covers_every_combination_and_reports_the_feasible_region(tmp_path: Path) -> None:
    out = tmp_path / "sweep.csv"
    result = run_cli("sweep", PUMP, write_spec(tmp_path), "--scheduler", "none", "--out", out)
    assert result.code == 0, result.err
    rows = table(out.read_text())
    assert len(rows) == 9
    pairs = {(float(r["air_gap"]), int(float(r["winding.turns_per_coil"]))) for r in rows}
    assert pairs == {(g * 1e-3, n) for g in (0.35, 0.45, 0.55) for n in (19, 21, 23)}
    assert "feasible" in result.out and "feasible region" in result.out
    assert "review by a qualified engineer" in result.out


def test_each_variant_equals_the_record_written_with_its_values(tmp_path: Path) -> None:
    """A sweep row holds what `emgate show` computes for a record file with those values
    (the engine's own path, an independent reading of the variant)."""
    out = tmp_path / "sweep.csv"
    assert (
        run_cli("sweep", PUMP, write_spec(tmp_path), "--scheduler", "none", "--out", out).code == 0
    )
    row = next(r for r in table(out.read_text()) if r["winding.turns_per_coil"] in ("23", "23.0"))
    gap_mm = float(row["air_gap"]) * 1e3
    folder = tmp_path / "one"
    folder.mkdir()
    (folder / ".git").mkdir()
    record = write_variant(folder, {"air_gap": f"{gap_mm!r} mm", "winding.turns_per_coil": 23})
    sheet = show_json(record)
    for name in ("stator.slot_fill", "air_gap.flux_density_peak", "winding.temperature_rise"):
        # the same code on the same numbers; 1e-12 relative allows only float round-off
        assert math.isclose(float(row[name]), sheet[name]["value"], rel_tol=1e-12), name
    checked = run_cli("check", "--format", "json", record)
    slot_fill = next(
        o for o in checked.json()["records"][0]["outcomes"] if o["rule"] == "slot-fill"
    )
    assert row["slot-fill:status"] == slot_fill["status"]


def test_a_random_sample_does_not_depend_on_how_it_is_chunked(tmp_path: Path) -> None:
    spec = write_spec(
        tmp_path,
        "sample: random\ncount: 12\nseed: 3\nfields:\n"
        "  air_gap: {from: 0.35 mm, to: 0.55 mm}\n  stator.steel: [M400-50A, M270-35A]\n",
    )
    evaluator, sp, cols = prepare(SweepRun(PUMP, spec, scheduler="none"))
    whole = run_chunk(evaluator, sp, cols, 0, 12)
    parts = run_chunk(evaluator, sp, cols, 0, 5) + run_chunk(evaluator, sp, cols, 5, 12)
    assert repr(whole) == repr(parts)
    gaps = [r[1] for r in whole]
    assert all(0.35e-3 <= g <= 0.55e-3 for g in gaps) and len(set(gaps)) == 12
    assert {r[2] for r in whole} <= {"M400-50A", "M270-35A"}


def test_a_variant_the_model_refuses_is_reported_not_computed(tmp_path: Path) -> None:
    spec = write_spec(
        tmp_path,
        "fields:\n  winding.turns_per_coil: [21, 0]\n",
    )
    out = tmp_path / "s.csv"
    assert run_cli("sweep", PUMP, spec, "--scheduler", "none", "--out", out).code == 0
    good, bad = table(out.read_text())
    assert good["valid"] == "True" and bad["valid"] == "False"
    assert "winding.turns_per_coil" in bad["invalid_reason"] and bad["stator.slot_fill"] == ""


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        ("fields:\n  air_gaps: [1 mm]\n", "no field 'air_gaps'"),
        ("schema: emgate/sweep@1\nfields:\n  air_gap: [1 mm]\n", "unknown key 'schema'"),
        (
            "fields:\n  air_gap: {from: 1 mm, to: 0.5 mm, steps: 2}\n",
            "from <= to",
        ),
        ("fields:\n  air_gap: {from: 0.3 mm, to: 0.5 mm}\n", "steps"),
        ("sample: lattice\nfields:\n  air_gap: [1 mm]\n", "grid"),
    ],
)
def test_a_bad_spec_is_a_located_input_error(tmp_path: Path, text: str, expected: str) -> None:
    spec = write_spec(tmp_path, text)
    result = run_cli("sweep", PUMP, spec, "--scheduler", "none")
    assert result.code == 2
    assert expected in result.err and f"{spec.name}:" in result.err


def test_csv_and_parquet_hold_the_same_table(tmp_path: Path) -> None:
    pq = pytest.importorskip("pyarrow.parquet")
    spec = write_spec(tmp_path)
    run_cli("sweep", PUMP, spec, "--scheduler", "none", "--out", tmp_path / "s.csv")
    run_cli("sweep", PUMP, spec, "--scheduler", "none", "--out", tmp_path / "s.parquet")
    rows = table((tmp_path / "s.csv").read_text())
    frame = pq.read_table(tmp_path / "s.parquet").to_pylist()
    assert len(frame) == len(rows) == 9
    for a, b in zip(rows, frame, strict=True):
        assert math.isclose(float(a["stator.slot_fill"]), b["stator.slot_fill"], rel_tol=0.0)
        assert a["binding_rule"] == b["binding_rule"]


def test_a_local_dask_cluster_gives_the_same_table_in_the_same_order(tmp_path: Path) -> None:
    pytest.importorskip("distributed")
    spec = write_spec(tmp_path)
    serial, dask = tmp_path / "serial.csv", tmp_path / "dask.csv"
    assert run_cli("sweep", PUMP, spec, "--scheduler", "none", "--out", serial).code == 0
    done = run_cli("sweep", PUMP, spec, "--scheduler", "local", "--chunk", "2", "--out", dask)
    assert done.code == 0, done.err
    assert dask.read_text() == serial.read_text()
    assert (DEMO / "designs").is_dir()  # the demo stays untouched by a sweep


def test_a_variant_the_kernel_cannot_compute_is_invalid_input_not_a_feasible_row(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    """A variant is held to the plausibility pass a record file is held to: a sheet quantity
    that comes out non-finite makes the variant invalid (as the same record would be, exit 2),
    not a row the rules passed. The non-finite value is injected for small gaps only."""
    from emgate import calc

    real = calc.PROVIDERS["winding.temperature_rise"]
    monkeypatch.setitem(
        calc.PROVIDERS,
        "winding.temperature_rise",
        lambda c: math.nan if c.d.air_gap < 0.4e-3 else real(c),
    )
    spec = write_spec(tmp_path, "fields:\n  air_gap: [0.35 mm, 0.45 mm]\n")
    evaluator, sp, _ = prepare(SweepRun(PUMP, spec, scheduler="none"))
    small, nominal = (evaluator.evaluate(sp.variant(i)) for i in range(2))
    assert not small.feasible and not small.rules, small
    assert "winding.temperature_rise cannot be computed" in small.invalid
    assert small.invalid.startswith("$.cooling"), small.invalid  # its driving field
    assert nominal.feasible and not nominal.invalid


def test_the_readme_shows_the_demo_sweep_as_the_gate_prints_it(tmp_path: Path) -> None:
    # The README's sweep block is the gate's own summary (regenerate it with the command
    # above it when the physics moves): its lines from "81 variants" to the last row shown.
    readme = (REPO / "README.md").read_text(encoding="utf-8")
    lines = readme.split("    81 variants:", 1)[1].split("\n\n", 1)[0].splitlines()
    shown = ["81 variants:" + lines[0], *(line[4:] for line in lines[1:])]
    spec = REPO / "examples" / "sweeps" / "pump-gap-turns.yaml"
    out = tmp_path / "pump.csv"
    printed = run_cli("sweep", PUMP, spec, "--scheduler", "none", "--out", out).out
    assert len(shown) >= 7
    assert shown == printed.splitlines()[: len(shown)]
