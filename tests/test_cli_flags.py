"""Command-line flags of ``emgate check``: quiet, colour, rule selection, help, the summary
on standard error."""

from __future__ import annotations

import argparse
from pathlib import Path

import pytest

from conftest import DEMO, PUMP, SERVO, run_cli, write_variant
from emgate.findings import DISCLAIMER
from emgate.terms import EXIT_CRASH, EXIT_FINDINGS, EXIT_INPUT, EXIT_OK

ESC = "\x1b["


def ran(result_json: dict) -> set[str]:
    return {
        o["rule"]
        for r in result_json["records"]
        for o in r["outcomes"]
        if o["status"] != "not_applicable"
    }


# --- quiet -------------------------------------------------------------------------------


def test_quiet_prints_the_findings_only() -> None:
    loud = run_cli("check", SERVO)
    quiet = run_cli("check", SERVO, "-q")
    assert quiet.code == loud.code == EXIT_FINDINGS
    lines = quiet.out.splitlines()
    assert lines[0].endswith("servo-10p12s.yaml")  # the file heading
    assert lines[-2:] == ["", DISCLAIMER]  # the caution closes every report, a quiet one too
    findings = lines[1:-2]  # one line per finding between
    assert all(": error " in line or ": warning " in line for line in findings)
    assert sum(": error " in line for line in findings) == loud.out.count(": error ")
    assert "FAIL" not in quiet.out
    assert quiet.err == ""


def test_quiet_on_a_clean_record_prints_nothing(repo: Path) -> None:
    result = run_cli("check", write_variant(repo, {}), "--quiet")
    assert (result.code, result.out, result.err) == (EXIT_OK, "", "")


# --- colour ------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("env", "coloured"),
    [
        ({}, False),  # standard output is not a terminal here
        ({"FORCE_COLOR": "1"}, True),
        ({"FORCE_COLOR": ""}, False),  # set but empty does not count [no-color.org]
        ({"NO_COLOR": "1", "FORCE_COLOR": "1"}, False),  # NO_COLOR is checked first
        ({"NO_COLOR": ""}, False),
    ],
)
def test_colour_follows_no_color_and_force_color(
    monkeypatch: pytest.MonkeyPatch, env: dict[str, str], coloured: bool
) -> None:
    monkeypatch.delenv("NO_COLOR", raising=False)
    monkeypatch.delenv("FORCE_COLOR", raising=False)
    for key, value in env.items():
        monkeypatch.setenv(key, value)
    out = run_cli("check", SERVO).out
    assert (ESC in out) is coloured
    if coloured:  # an error line in bold red, reset at its end
        line = next(x for x in out.splitlines() if "error current-density" in x)
        assert line.startswith(ESC + "1;31m") and line.endswith(ESC + "0m")


def test_colour_on_a_terminal_and_never_in_a_file(
    monkeypatch: pytest.MonkeyPatch, tmp_path: Path
) -> None:
    from emgate import commands

    class Stream:
        def __init__(self, tty: bool) -> None:
            self.tty = tty

        def isatty(self) -> bool:
            return self.tty

    monkeypatch.delenv("NO_COLOR", raising=False)
    monkeypatch.delenv("FORCE_COLOR", raising=False)
    monkeypatch.setenv("TERM", "xterm")
    assert commands._colour(Stream(tty=True)) and not commands._colour(Stream(tty=False))
    monkeypatch.setenv("TERM", "dumb")  # a terminal that cannot show colour
    assert not commands._colour(Stream(tty=True))
    monkeypatch.setenv("FORCE_COLOR", "1")
    report = tmp_path / "report.txt"
    run_cli("check", SERVO, "--format", f"text:{report}")
    assert ESC not in report.read_text(encoding="utf-8")


# --- --select / --ignore -----------------------------------------------------------------


def test_select_runs_only_the_rules_named() -> None:
    result = run_cli("check", PUMP, "--format", "json", "--select", "current-density,slot-fill")
    assert ran(result.json()) == {"current-density", "slot-fill"}


def test_ignore_by_tag_and_pack_on_top_of_the_selection() -> None:
    every = ran(run_cli("check", PUMP, "--format", "json").json())
    result = run_cli("check", PUMP, "--format", "json", "--ignore", "tag:thermal")
    from emgate.plugins import load_plugins

    thermal = {rid for rid, lr in load_plugins().rules.items() if "thermal" in lr.rule.tags}
    assert thermal and ran(result.json()) == every - thermal
    packed = run_cli("check", PUMP, "--format", "json", "--ignore", "brennfeld/")
    assert not any(r.startswith("brennfeld/") for r in ran(packed.json()))
    both = run_cli(
        "check", PUMP, "--format", "json", "--select", "tag:thermal", "--ignore", "thermal-load"
    )
    assert ran(both.json()) == thermal - {"thermal-load"}


def test_command_line_selection_narrows_the_policy(repo: Path) -> None:
    (repo / "emgate.yaml").write_text(
        "schema: emgate/config@1\nrules:\n  ignore: [slot-fill]\n", encoding="utf-8"
    )
    record = write_variant(repo, {})
    result = run_cli("check", record, "--format", "json", "--select", "slot-fill,current-density")
    assert ran(result.json()) == {"current-density"}  # the policy's ignore still holds


def test_a_selector_that_matches_nothing_is_a_usage_error() -> None:
    result = run_cli("check", PUMP, "--select", "curent-density")
    assert result.code == EXIT_INPUT
    assert "--select 'curent-density' matches no installed rule" in result.err
    assert "did you mean 'current-density'?" in result.err
    assert run_cli("check", PUMP, "--ignore", "tag:thermic").code == EXIT_INPUT


# --- help --------------------------------------------------------------------------------


def test_check_help_lists_the_exit_codes() -> None:
    out = run_cli("check", "--help").out
    for code, meaning in (
        (EXIT_OK, "clean"),
        (EXIT_FINDINGS, "a rule found an error"),
        (EXIT_INPUT, "could not be read or validated"),
        (EXIT_CRASH, "crashed"),
    ):
        (line,) = [x for x in out.splitlines() if x.strip().startswith(f"{code} ")]
        assert meaning in line


def test_every_argument_of_every_command_has_help() -> None:
    from emgate.cli import _parser

    parser = _parser()
    (sub,) = [a for a in parser._actions if isinstance(a, argparse._SubParsersAction)]
    commands = {"emgate": parser, **sub.choices}
    missing = [
        f"{name} {action.dest}"
        for name, command in commands.items()
        for action in command._actions
        if not action.help
    ]
    assert missing == []
    assert all(c.help for c in sub._choices_actions)  # each command in the list


# --- the summary on standard error -------------------------------------------------------


def test_one_summary_line_on_stderr_when_every_format_goes_to_a_file(tmp_path: Path) -> None:
    result = run_cli(
        "check",
        DEMO,
        "--format",
        f"json:{tmp_path / 'r.json'}",
        "--format",
        f"sarif:{tmp_path / 'r.sarif'}",
    )
    assert result.code == EXIT_FINDINGS
    assert result.out == ""
    (line,) = result.err.splitlines()
    assert line.startswith("emgate: FAIL: 3 record(s) checked")  # the demo's three records
    assert "json to " in line and "sarif to " in line


def test_no_summary_on_stderr_when_a_format_goes_to_the_terminal(tmp_path: Path) -> None:
    result = run_cli("check", DEMO, "--format", "text", "--format", f"json:{tmp_path / 'r.json'}")
    assert result.err == ""
    quiet = run_cli("check", DEMO, "-q", "--format", f"json:{tmp_path / 'r.json'}")
    assert quiet.err == ""
