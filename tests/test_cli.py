"""The command line: exit codes, outputs, the informational commands, a reference check of the
current-density computation, and in-record waivers."""

from __future__ import annotations

import json
import math
import re
from importlib.metadata import version
from pathlib import Path
from typing import Any, ClassVar

import pytest

from conftest import DEMO, PUMP, SERVO, CliResult, node_mark, run_cli, write_variant
from emgate.findings import DISCLAIMER
from emgate.rule import Rule

MM2 = 1e-6  # m^2 per mm^2


def outcome(result: CliResult, record_id: str, rule: str) -> dict[str, Any]:
    (record,) = [r for r in result.json()["records"] if r["record_id"] == record_id]
    (out,) = [o for o in record["outcomes"] if o["rule"] == rule]
    return out


def write_config(folder: Path, text: str) -> Path:
    path = folder / "emgate.yaml"
    path.write_text("schema: emgate/config@1\n" + text, encoding="utf-8")
    return path


# --- exit codes ------------------------------------------------------------------------------


def test_exit_0_for_a_passing_record(repo: Path) -> None:
    result = run_cli("check", write_variant(repo, {}))
    assert result.code == 0, result.out
    # No findings: the record's margins line comes first, then the verdict.
    margins, blank, verdict = result.out.splitlines()[:3]
    assert margins.startswith("pump-drive-4p36s: ") and blank == ""
    assert verdict.startswith("PASS")


def test_exit_1_for_the_demo_repository() -> None:
    result = run_cli("check", DEMO)
    assert result.code == 1, result.out + result.err
    assert "FAIL" in result.out


def test_exit_1_from_the_config_when_given_no_paths(monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.chdir(DEMO)  # the CLI finds emgate.yaml and checks its files
    assert run_cli("check").code == 1


def test_exit_2_for_bad_input(repo: Path) -> None:
    result = run_cli("check", write_variant(repo, {"air_gap": "3 A"}))
    assert result.code == 2
    assert "INVALID INPUT" in result.out


def test_exit_2_for_a_missing_path(repo: Path) -> None:
    result = run_cli("check", repo / "no-such-record.yaml")
    assert result.code == 2
    assert "no such file" in result.out


def test_exit_2_for_a_usage_error() -> None:
    assert run_cli("check", "--format", "xml", PUMP).code == 2  # argparse's own exit code


def test_exit_2_for_an_unknown_rule_in_the_config(repo: Path) -> None:
    config = write_config(repo, "options:\n  current-densty:\n    enclosed_fan: 8 A/mm^2\n")
    write_variant(repo, {})
    result = run_cli("check", "--format", "json", repo)
    assert result.code == 2
    (error,) = result.input_findings()
    assert error["file"].endswith("emgate.yaml")
    assert (error["line"], error["column"]) == node_mark(config, "options.current-densty", key=True)
    assert "did you mean 'current-density'?" in error["message"]


def test_exit_2_for_an_option_with_the_wrong_dimension(repo: Path) -> None:
    config = write_config(repo, "options:\n  current-density:\n    enclosed_fan: 3 A\n")
    write_variant(repo, {})
    result = run_cli("check", "--format", "json", repo)
    assert result.code == 2
    (error,) = result.input_findings()
    node = "options.current-density.enclosed_fan"
    assert (error["line"], error["column"]) == node_mark(config, node)
    assert error["record_path"] == "$.options['current-density'].enclosed_fan"
    assert re.search(r"expected a current density.*'3 A'.*current", error["message"])


def test_exit_2_for_an_unknown_option(repo: Path) -> None:
    write_config(repo, "options:\n  current-density:\n    enclosed_fann: 8 A/mm^2\n")
    write_variant(repo, {})
    result = run_cli("check", "--format", "json", repo)
    assert result.code == 2
    (error,) = result.input_findings()
    assert "enclosed_fann" in error["message"]


class Raising(Rule):
    """Crashes on every record."""

    id = "acme/raises"
    summary = "always raises"
    calls: ClassVar[list[str]] = []

    def check(self, design: Any, options: Any, context: Any) -> Any:
        Raising.calls.append(design.id)
        raise ZeroDivisionError("deliberate")


def test_exit_3_when_a_rule_raises_and_the_others_still_run(repo: Path) -> None:
    from emgate.config import Policy
    from emgate.engine import execute
    from emgate.pipeline import Run
    from emgate.plugins import LoadedRule, Pack, PluginSet
    from emgate_rules.current_density import CurrentDensity

    raising = Raising
    raising.calls.clear()
    acme = Pack("acme", "acme-pack", "0.1", "acme_rules")
    builtin = Pack("builtin", "emgate", version("emgate"), "emgate_rules")
    plugins = PluginSet(
        packs=[acme, builtin],
        rules={
            "acme/raises": LoadedRule(raising, acme),
            "current-density": LoadedRule(CurrentDensity, builtin),
        },
    )
    record = write_variant(repo, {})
    result = execute(Run(paths=[record], policy=Policy(root=repo), plugins=plugins))
    assert result.exit_code == 3
    assert raising.calls == ["pump-drive-4p36s"]
    (rec,) = result.records
    status = {o.rule: o.status for o in rec.outcomes}
    assert status == {"acme/raises": "crash", "current-density": "pass"}
    (crash,) = [f for f in result.findings if f.kind == "crash"]
    assert crash.rule == "acme/raises"
    assert "ZeroDivisionError: deliberate" in crash.message


def test_exit_3_through_the_cli(repo: Path, plugin_host: Any) -> None:
    plugin_host.add(
        "acme",
        "acme_crashing_rules",
        """
        from emgate.hookspecs import hookimpl
        from emgate.rule import Rule

        class Raising(Rule):
            id = "acme/raises"
            summary = "always raises"

            def check(self, design, options, context):
                raise RuntimeError("deliberate")

        @hookimpl
        def emgate_rules():
            return [Raising]
    """,
    )
    result = run_cli("check", write_variant(repo, {}))
    assert result.code == 3, result.out + result.err
    assert "RULE CRASHED" in result.out
    assert "RuntimeError: deliberate" in result.out


# --- outputs ---------------------------------------------------------------------------------


def test_json_output(monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.chdir(DEMO)
    result = run_cli("check", "--format", "json")
    doc = result.json()
    assert doc["exit_code"] == result.code == 1
    assert doc["notice"] == DISCLAIMER
    violations = [f for f in doc["findings"] if f["kind"] == "violation"]
    assert violations
    for f in violations:
        assert f["file"] == "designs/servo-10p12s.yaml"
        assert f["record_id"] == "servo-10p12s"
        assert re.fullmatch(r"[0-9a-f]{32}", f["fingerprint"])
        line, column = node_mark(DEMO / f["file"], f["record_path"][2:])
        assert (f["line"], f["column"]) == (line, column)
    assert {r["id"] for r in doc["rules"]} >= {"current-density", "brennfeld/stack-aspect"}
    assert doc["summary"]["records"] == 3


def test_fingerprint_survives_moved_lines(repo: Path) -> None:
    path = write_variant(repo, {}, base=SERVO)
    first = run_cli("check", "--format", "json", path).json()["findings"]
    path.write_text("# a comment\n# and another\n" + path.read_text(encoding="utf-8"))
    second = run_cli("check", "--format", "json", path).json()["findings"]
    assert first and len(first) == len(second)
    for a, b in zip(first, second, strict=True):
        assert b["line"] == a["line"] + 2
        assert b["fingerprint"] == a["fingerprint"]


def test_text_output_grouped_by_file_with_summary_and_disclaimer(
    repo: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.chdir(repo)
    write_variant(repo, {}, base=SERVO, name="b-servo.yaml")
    write_variant(repo, {"stator.bore_diameter": "230 mm"}, name="a-pump.yaml")
    result = run_cli("check", ".")
    lines = result.out.splitlines()
    headings = [line for line in lines if line and not line.startswith(" ")][:2]
    assert headings == ["a-pump.yaml", "b-servo.yaml"]  # sorted, each file once
    block = result.out.split("b-servo.yaml\n", 1)[1].split("\n\n", 1)[0].splitlines()
    # one line per finding: file:line:col, severity, rule id, message (its remedies, if
    # any, on lines of their own indented below it)
    block = [entry for entry in block if not entry.startswith("      ")]
    assert block and all(
        re.match(r"  b-servo\.yaml:\d+:\d+: (error|warning) [a-z-]+: ", entry) for entry in block
    )
    summary = next(line for line in lines if line.startswith("INVALID INPUT:"))
    assert re.search(r"1 record\(s\) checked.*\d+ error\(s\)", summary)
    assert lines[-1] == DISCLAIMER
    assert "qualified engineer" in lines[-1]


def test_findings_sort_by_line_within_a_file(repo: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.chdir(repo)
    write_variant(repo, {"stator.slots": "36", "air_gap": "3 A", "poles": 5}, name="x.yaml")
    result = run_cli("check", "--format", "json", "x.yaml")
    lines = [f["line"] for f in result.json()["findings"]]
    assert lines == sorted(lines) and len(lines) == 3


# --- informational commands ------------------------------------------------------------------


def test_rules_lists_builtin_rules_with_origin() -> None:
    result = run_cli("rules", "--format", "json")
    assert result.code == 0, result.err
    rules = {r["id"]: r for r in json.loads(result.out)}
    # [calc] external check: importlib.metadata, the installed distribution's version
    assert rules["current-density"]["origin"] == {
        "distribution": "emgate",
        "version": version("emgate"),
    }
    text = run_cli("rules").out
    assert re.search(r"^current-density\s+error\s+emgate ", text, flags=re.MULTILINE)


def test_explain_prints_method_and_sources() -> None:
    result = run_cli("explain", "current-density")
    assert result.code == 0
    assert "J = I_ph / (a n S)" in result.out
    assert "Hendershot" in result.out  # the source of the default limits is named


def test_explain_unknown_rule_hints() -> None:
    result = run_cli("explain", "current-densiti")
    assert result.code == 2
    assert "did you mean 'current-density'?" in result.err


def test_plugins_lists_installed_packs() -> None:
    result = run_cli("plugins")
    assert result.code == 0, result.err
    assert re.search(
        rf"^builtin\s+emgate {re.escape(version('emgate'))}\b", result.out, flags=re.MULTILINE
    )


def test_version() -> None:
    result = run_cli("--version")
    assert result.code == 0
    assert (
        result.out.strip() == f"emgate {version('emgate')}"
    )  # [calc] external check: importlib.metadata


@pytest.mark.parametrize("kind", ["design", "materials", "config"])
def test_schema_prints_a_json_schema(kind: str) -> None:
    result = run_cli("schema", kind)
    assert result.code == 0
    schema = json.loads(result.out)
    assert schema["$schema"] == "https://json-schema.org/draft/2020-12/schema"
    assert kind in schema["$id"]


def test_schema_defaults_to_design() -> None:
    assert run_cli("schema").out == run_cli("schema", "design").out


# --- reference check: current density --------------------------------------------------------


def test_current_density_of_the_demo_pump_by_hand(monkeypatch: pytest.MonkeyPatch) -> None:
    # [calc] J = I / (a n S): delta connection, I_ph = 14.6 A / sqrt 3; a = 1 path; n = 2
    # strands of 0.90 mm bare, S = pi (0.45 mm)^2.
    expected = (14.6 / math.sqrt(3)) / (1 * 2 * math.pi * 0.45**2)  # 6.625 A/mm^2
    monkeypatch.chdir(DEMO)
    result = run_cli("check", "--format", "json")
    out = outcome(result, "pump-drive-4p36s", "current-density")
    (check,) = [c for c in out["checks"] if c["quantity"] == "stator.current_density"]
    # Both sides are a few float operations on the same inputs: rounding only.
    assert check["value"] * MM2 == pytest.approx(expected, rel=1e-12)
    assert check["limit"] * MM2 == pytest.approx(8.0, rel=1e-12)  # the demo emgate.yaml's limit
    assert check["passed"] is True
    assert out["status"] == "pass"


def test_current_density_of_the_demo_servo_by_hand() -> None:
    # [calc] star connection, I_ph = 3.9 A; one strand of 0.71 mm: J = 3.9 / (pi 0.355^2).
    expected = 3.9 / (math.pi * 0.355**2)  # 9.850 A/mm^2
    result = run_cli("check", "--format", "json", SERVO)
    out = outcome(result, "servo-10p12s", "current-density")
    (check,) = [c for c in out["checks"] if c["quantity"] == "stator.current_density"]
    assert check["value"] * MM2 == pytest.approx(expected, rel=1e-12)  # rounding only
    # Totally enclosed, no fan: 5 A/mm^2 [mem: Hendershot and Miller]
    assert check["limit"] * MM2 == pytest.approx(5.0, rel=1e-12)
    assert out["status"] == "fail"


# --- waivers in the record -------------------------------------------------------------------

WAIVER = {
    "rule": "current-density",
    "reason": "fanless frame accepted for the trial batch of ten",
    "owner": "J. Doe",
    "expires": "2027-03-31",
}


def waiver_repo(repo: Path, base: Path) -> Path:
    # Only this rule runs, so the waiver alone decides the exit code.
    write_config(repo, "rules:\n  select: [current-density]\n")
    return write_variant(repo, {"waivers": [WAIVER]}, base=base)


def test_waiver_suppresses_the_finding(repo: Path) -> None:
    path = waiver_repo(repo, SERVO)
    result = run_cli("check", "--format", "json", "--today", "2027-03-31", path)
    assert result.code == 0, result.out
    (finding,) = [f for f in result.json()["findings"] if f["rule"] == "current-density"]
    assert finding["waived"] is True
    assert "J. Doe" in finding["waiver"]
    assert outcome(result, "servo-10p12s", "current-density")["status"] == "waived"
    assert "waived" in run_cli("check", "--today", "2027-03-31", path).out


def test_expired_waiver_fails_again_and_is_reported(repo: Path) -> None:
    path = waiver_repo(repo, SERVO)
    result = run_cli("check", "--format", "json", "--today", "2027-04-01", path)
    assert result.code == 1
    by_rule = {f["rule"]: f for f in result.json()["findings"]}
    assert by_rule["current-density"]["waived"] is False
    assert "expired on 2027-03-31" in by_rule["waiver"]["message"]
    assert by_rule["waiver"]["line"] == node_mark(path, "waivers.0")[0]


def test_waiver_that_suppresses_nothing_is_a_warning(repo: Path) -> None:
    path = waiver_repo(repo, PUMP)  # the pump passes current-density
    result = run_cli("check", "--format", "json", "--today", "2027-01-01", path)
    assert result.code == 0
    (note,) = [f for f in result.json()["findings"] if f["rule"] == "waiver"]
    assert note["severity"] == "warning"
    assert "suppresses nothing" in note["message"]


def test_waiver_expiry_is_not_a_date_object_in_the_record(repo: Path) -> None:
    # The loader's contract: dates stay text, so the waiver model must parse them itself.
    from emgate.loader import load

    path = waiver_repo(repo, SERVO)
    assert load(path).data["waivers"][0]["expires"] == "2027-03-31"


# --- numpy's BLAS threads ----------------------------------------------------------------------

_THREADS = Path("/proc/self/task")  # one entry per thread of the process (Linux)
_PROBE = """
import os, sys
sys.argv = ["emgate", "--version"]
if {entry}:
    import emgate.cli
    try:
        emgate.cli.entry()
    except SystemExit:
        pass
import numpy
print(os.environ.get("OPENBLAS_NUM_THREADS"), len(os.listdir("/proc/self/task")))
"""


def _probe(entry: bool) -> list[str]:
    import os
    import subprocess
    import sys

    from emgate.startup import BLAS_THREAD_SETTINGS

    env = {k: v for k, v in os.environ.items() if k not in BLAS_THREAD_SETTINGS}
    done = subprocess.run(
        [sys.executable, "-c", _PROBE.format(entry=entry)],
        env=env,
        capture_output=True,
        text=True,
        check=True,
    )
    return done.stdout.split()[-2:]


@pytest.mark.skipif(not _THREADS.is_dir(), reason="counts threads in /proc (Linux only)")
def test_the_command_line_starts_numpy_with_one_blas_thread() -> None:
    import os

    assert _probe(entry=True) == ["1", "1"]
    # the control: left alone, the pool has a thread per CPU the process may use
    if len(os.sched_getaffinity(0)) > 1:
        setting, threads = _probe(entry=False)
        assert setting == "None"
        assert int(threads) > 1


def test_a_blas_thread_count_the_user_chose_is_kept() -> None:
    from emgate.startup import one_blas_thread

    for chosen in ({"OPENBLAS_NUM_THREADS": "3"}, {"OMP_NUM_THREADS": "4"}):
        environ = dict(chosen)
        one_blas_thread(environ)
        assert environ == chosen
    environ = {"OMP_NUM_THREADS": ""}  # set but empty is not a choice
    one_blas_thread(environ)
    assert environ["OPENBLAS_NUM_THREADS"] == "1"


# --- garbage collection at start-up --------------------------------------------------------

_GC_PROBE = """
import gc, sys
sys.argv = ["emgate", "check", {record!r}]
import emgate.cli
try:
    emgate.cli.entry()
except SystemExit as exc:
    code = exc.code
print(code, gc.isenabled(), gc.get_freeze_count() > 0)
"""


def test_the_command_line_collects_again_once_started() -> None:
    import subprocess
    import sys

    done = subprocess.run(
        [sys.executable, "-c", _GC_PROBE.format(record=str(PUMP))],
        capture_output=True,
        text=True,
        check=True,
    )
    # exit 0, collection on again for the records, start-up's objects frozen
    assert done.stdout.split()[-3:] == ["0", "True", "True"], done.stdout + done.stderr


def test_a_program_calling_emgate_keeps_its_collection_setting() -> None:
    import gc

    from emgate.cli import main

    frozen = gc.get_freeze_count()
    was = gc.isenabled()
    try:
        for enabled in (False, True):
            (gc.enable if enabled else gc.disable)()
            assert main(["check", str(PUMP)]) == 0
            assert gc.isenabled() is enabled
        assert gc.get_freeze_count() == frozen
    finally:
        (gc.enable if was else gc.disable)()
