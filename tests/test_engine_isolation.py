"""The engine fails closed around plugin code: crashes keep what was checked, anything a
plugin raises or yields is a crash of that plugin or rule, each record is isolated, and a
rule has a time budget (issue 9, items 2, 3, 7 and 9)."""

from __future__ import annotations

import json
import xml.etree.ElementTree as ET
from pathlib import Path
from typing import Any

import pytest

from conftest import PUMP, SERVO, run_cli, write_variant

RULE = """
    import math, os, signal, time
    from emgate.api import Check, Problem, Rule, Options, hookimpl

    class Bad(Rule[Options]):
        id = "acme/bad"
        summary = "misbehaves"

        def check(self, design, options, context):
            yield context.check(
                "stator.slot_fill", options_limit, "max", path=("winding",), label="fill"
            )
{body}

    from emgate.api import Limit
    options_limit = Limit(0.9, "test")

    @hookimpl
    def emgate_rules():
        return [Bad]
"""


def _pack(plugin_host: Any, body: str, name: str = "acme") -> None:
    lines = "\n".join("            " + line for line in body.strip().splitlines())
    plugin_host.add(name, f"{name}_{abs(hash(body))}_pack", RULE.format(body=lines))


def _check(repo: Path, *extra: str, base: Path = PUMP) -> tuple[int, dict[str, Any]]:
    result = run_cli("check", "--format", "json", *extra, write_variant(repo, {}, base=base))
    return result.code, result.json()


def _outcome(doc: dict[str, Any], rule: str) -> dict[str, Any]:
    (out,) = [o for o in doc["records"][0]["outcomes"] if o["rule"] == rule]
    return out


def test_a_crashing_rule_keeps_the_checks_it_yielded(plugin_host: Any, repo: Path) -> None:
    _pack(plugin_host, "raise RuntimeError('midway')")
    code, doc = _check(repo)
    assert code == 3
    bad = _outcome(doc, "acme/bad")
    assert bad["status"] == "crash" and "RuntimeError: midway" in bad["message"]
    assert [c["quantity"] for c in bad["checks"]] == ["stator.slot_fill"]
    assert _outcome(doc, "slot-fill")["status"] == "pass"  # the others still report


@pytest.mark.parametrize(
    ("body", "words"),
    [
        ("raise SystemExit(0)", "SystemExit: 0"),
        ("raise SystemExit", "SystemExit"),
        ("raise KeyboardInterrupt", "KeyboardInterrupt"),  # the rule's own, not the user's
        ("raise GeneratorExit", "GeneratorExit"),
    ],
)
def test_any_exception_of_a_rule_is_its_crash(
    plugin_host: Any, repo: Path, body: str, words: str
) -> None:
    # Issue 9, item 2: before, SystemExit ended emgate with exit 0 and no output.
    _pack(plugin_host, body)
    code, doc = _check(repo)
    assert code == 3
    assert words in _outcome(doc, "acme/bad")["message"]
    assert _outcome(doc, "current-density")["checks"]


def test_a_pack_raising_system_exit_on_import_is_a_crash(plugin_host: Any, repo: Path) -> None:
    plugin_host.add("acme", "acme_exit_pack", "raise SystemExit(0)\n")
    code, doc = _check(repo)
    assert code == 3
    (crash,) = [f for f in doc["findings"] if "plugin 'acme'" in f["message"]]
    assert crash["kind"] == "crash" and "SystemExit: 0" in crash["message"]
    assert _outcome(doc, "slot-fill")["status"] == "pass"


EXPLAINING = """
from emgate.api import Options, Rule, hookimpl

class Loud(Rule[Options]):
    id = "acme/loud"
    summary = "raises where the reports read its method"

    @classmethod
    def explain(cls):
        raise SystemExit(0)

    def check(self, design, options, context):
        return []

@hookimpl
def emgate_rules():
    return [Loud]
"""


def test_a_rule_whose_explanation_raises_system_exit_is_a_crash(
    plugin_host: Any, repo: Path
) -> None:
    # Every report reads each rule's explain(): before, its SystemExit ended emgate with
    # exit 0 and no output, past the runner's guard around check() and applies().
    plugin_host.add("acme", "acme_loud_pack", EXPLAINING)
    code, doc = _check(repo)
    assert code == 3
    (crash,) = [f for f in doc["findings"] if "acme/loud" in f["message"]]
    assert crash["kind"] == "crash" and "SystemExit: 0" in crash["message"]
    assert _outcome(doc, "slot-fill")["status"] == "pass"


def test_the_users_ctrl_c_still_stops_the_run(plugin_host: Any, repo: Path) -> None:
    # A real SIGINT during a rule is the user's: the run stops (exit 3, "interrupted").
    _pack(plugin_host, "os.kill(os.getpid(), signal.SIGINT); time.sleep(5)")
    result = run_cli("check", write_variant(repo, {}))
    assert result.code == 3
    assert "interrupted" in result.err


MALFORMED = {
    "a string": "yield 'all good'",
    "None": "yield None",
    "a dict": "yield {'passed': True}",
    "an unknown severity": "yield Problem(('winding',), 'x', severity='fatal')",
    "a string value": "yield Check('q', 'l', ('winding',), '1', 1.0, 'max', '')",
    "a NaN limit": "yield Check('q', 'l', ('winding',), 1.0, math.nan, 'max', '')",
    "an infinite value": "yield Check('q', 'l', ('winding',), math.inf, 1.0, 'max', '')",
    "a dict in a path": "yield Problem(('winding', {'a': 1}), 'x')",
    "a bad bound": "yield Check('q', 'l', ('winding',), 1.0, 1.0, 'below', '')",
    "an unknown unit": "yield Check('q', 'l', ('winding',), 1.0, 1.0, 'max', 'furlong')",
}


@pytest.mark.parametrize("case", sorted(MALFORMED))
def test_malformed_rule_output_is_a_crash_every_reporter_survives(
    plugin_host: Any, repo: Path, case: str
) -> None:
    # Issue 9, item 3: before, these passed (exit 0) or raised KeyError in three formats.
    _pack(plugin_host, MALFORMED[case])
    path = write_variant(repo, {})
    formats = ["json", "sarif", "junit", "codequality", "markdown", "annotations", "text"]
    outputs = {f: repo / f"out.{f}" for f in formats}
    result = run_cli("check", *[f"--format={f}:{p}" for f, p in outputs.items()], path)
    assert result.code == 3, result.err
    doc = json.loads(outputs["json"].read_text(encoding="utf-8"))
    bad = _outcome(doc, "acme/bad")
    assert bad["status"] == "crash" and "it yielded" in bad["message"]
    assert len(bad["checks"]) == 1  # the valid check before it stands
    json.loads(outputs["sarif"].read_text(encoding="utf-8"))
    json.loads(outputs["codequality"].read_text(encoding="utf-8"))
    ET.fromstring(outputs["junit"].read_text(encoding="utf-8"))
    for name in ("markdown", "annotations", "text"):
        assert "acme/bad" in outputs[name].read_text(encoding="utf-8"), name


def test_an_error_in_one_record_is_reported_there_and_the_others_are_checked(
    repo: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    # Issue 9, item 7: an error of emgate's own on one record (here planted in the
    # waiver step, outside any rule) is exit 3 on that record; the other is checked.
    import emgate.pipeline

    real = emgate.pipeline.apply_waivers

    def planted(waivers: Any, produced: Any, record: Any, today: Any) -> Any:
        if record.record_id.startswith("servo"):
            raise RuntimeError("planted")
        return real(waivers, produced, record, today)

    monkeypatch.setattr(emgate.pipeline, "apply_waivers", planted)
    write_variant(repo, {}, base=SERVO)
    write_variant(repo, {})
    result = run_cli("check", "--format", "json", repo)
    assert result.code == 3, result.err
    doc = result.json()
    (crash,) = [f for f in doc["findings"] if f["kind"] == "crash"]
    assert crash["record_id"].startswith("servo") and "planted" in crash["message"]
    assert {r["record_id"].split("-")[0] for r in doc["records"]} == {"pump", "servo"}
    pump = next(r for r in doc["records"] if r["record_id"].startswith("pump"))
    assert all(o["status"] in ("pass", "not_applicable") for o in pump["outcomes"])


def test_an_input_the_physics_cannot_take_is_an_input_error_on_that_record(
    repo: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    import emgate.validate

    real = emgate.validate.validate_design

    def absurd(doc: Any) -> Any:
        if "servo" in str(doc.path):
            raise OverflowError("math range error")
        return real(doc)

    monkeypatch.setattr(emgate.validate, "validate_design", absurd)
    write_variant(repo, {}, base=SERVO)
    write_variant(repo, {})
    result = run_cli("check", "--format", "json", repo)
    assert result.code == 2, result.err
    doc = result.json()
    (bad,) = [f for f in doc["findings"] if f["kind"] == "input"]
    assert bad["file"].endswith("servo-10p12s.yaml") and "OverflowError" in bad["message"]
    assert [r["record_id"].split("-")[0] for r in doc["records"]] == ["pump"]


def test_a_rule_over_its_time_budget_is_a_crash_of_that_rule(plugin_host: Any, repo: Path) -> None:
    # Issue 9, item 9: the budget from emgate.yaml; a rule that swallows the first alarm
    # is hit again (the timer repeats every second).
    body = """
try:
    time.sleep(30)
except BaseException:
    pass
time.sleep(30)
"""
    _pack(plugin_host, body)
    (repo / "emgate.yaml").write_text(
        "schema: emgate/config@1\nrule_time_budget: 0.2 s\n", encoding="utf-8"
    )
    code, doc = _check(repo)
    assert code == 3
    bad = _outcome(doc, "acme/bad")
    assert "longer than its time budget of 0.2 s" in bad["message"]
    assert len(bad["checks"]) == 1
    assert _outcome(doc, "slot-fill")["status"] == "pass"


def test_the_time_budget_holds_in_worker_processes(plugin_host: Any, repo: Path) -> None:
    # A forked worker has no interval timer of its parent's: it starts its own.
    import time

    _pack(plugin_host, "time.sleep(30)")
    (repo / "emgate.yaml").write_text(
        "schema: emgate/config@1\nrule_time_budget: 0.2 s\n", encoding="utf-8"
    )
    for i in range(32):  # two workers' worth (emgate.parallel.MIN_ITEMS_PER_WORKER)
        text = PUMP.read_text(encoding="utf-8").replace(
            "id: pump-drive-4p36s", f"id: pump-{i:02d}", 1
        )
        (repo / f"pump-{i:02d}.yaml").write_text(text, encoding="utf-8")
    started = time.monotonic()
    result = run_cli("check", "--format", "json", "--jobs", "2", "--remedies", "off", repo)
    # 16 records a worker at the budget each; a worker without its alarm would sleep 30 s
    assert time.monotonic() - started < 25.0
    assert result.code == 3, result.err
    doc = result.json()
    assert len(doc["records"]) == 32
    for record in doc["records"]:
        (bad,) = [o for o in record["outcomes"] if o["rule"] == "acme/bad"]
        assert "longer than its time budget of 0.2 s" in bad["message"]


def test_a_rule_that_runs_others_keeps_its_own_deadline() -> None:
    # A tolerance check runs the other rules on variants, each within its own budget; once
    # they return, the alarm watches the outer rule's deadline again.
    import time

    from emgate import runner

    with runner.rule_guards():
        with pytest.raises(runner._OutOfTime, match=r"budget of 0\.3 s"):
            with runner._Clock(0.3):
                with runner._Clock(5.0):
                    time.sleep(0.05)  # the inner rule, well within its budget
                time.sleep(10.0)  # the outer one overruns: stopped at its deadline
        assert runner._Clock.current is None
        with runner._Clock(0.3):
            time.sleep(0.1)  # a rule done in time
        time.sleep(0.4)  # is not stopped past its deadline, once it has returned


def test_the_time_budget_is_a_time_of_at_most_an_hour(repo: Path) -> None:
    (repo / "emgate.yaml").write_text(
        "schema: emgate/config@1\nrule_time_budget: 2 h\n", encoding="utf-8"
    )
    result = run_cli("check", write_variant(repo, {}))
    assert result.code == 2
    assert "rule_time_budget" in result.out + result.err


def test_a_rule_that_stops_the_timer_does_not_stop_it_for_the_next(
    monkeypatch: pytest.MonkeyPatch,
) -> None:
    import signal
    import time

    from emgate import runner

    with runner.rule_guards():
        with runner._Clock(5.0):
            signal.setitimer(signal.ITIMER_REAL, 0.0)  # a rule's own doing
            signal.signal(signal.SIGALRM, signal.SIG_IGN)
        with pytest.raises(runner._OutOfTime), runner._Clock(0.2):
            time.sleep(3.0)


def test_a_pack_rule_run_by_a_builtin_one_that_stops_the_timer_is_caught_too() -> None:
    # The tolerance check (emgate's own, trusted) runs the pack's rules on variants: the
    # timer is looked at again after any pack rule's clock, nested or not, and only then.
    import signal
    import time

    from emgate import runner

    with runner.rule_guards():
        with runner._Clock(5.0, trusted=True):
            with runner._Clock(5.0):  # a pack's rule
                signal.setitimer(signal.ITIMER_REAL, 0.0)
        assert runner._Clock.suspect
        with pytest.raises(runner._OutOfTime), runner._Clock(0.2, trusted=True):
            time.sleep(3.0)
        assert not runner._Clock.suspect


def test_the_alarm_never_leaves_a_rules_clock_behind(monkeypatch: pytest.MonkeyPatch) -> None:
    # A tick that comes as a rule's clock is left must not raise there: the clock would stay
    # current, and every later tick would raise into the engine outside any rule. A tick
    # every 20 us makes the window likely (at the run's 50 ms it is rare, not impossible).
    from emgate import runner

    monkeypatch.setattr(runner, "_TICK", 2e-5)
    with runner.rule_guards():
        for _ in range(3000):
            try:
                with runner._Clock(0.0):  # past its budget at once
                    sum(range(50))
            except runner._OutOfTime:
                pass
            assert runner._Clock.current is None
