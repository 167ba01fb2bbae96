"""The plugin host: the installed sample pack, broken packs, and the untrusted working tree."""

from __future__ import annotations

import json
import re
import subprocess
import sys
from importlib.metadata import EntryPoint, version
from pathlib import Path
from typing import Any

import pytest

from conftest import run_cli, write_variant

PACK_DIST = "brennfeld-emgate-pack"
PACK_RULE = "brennfeld/stack-aspect"

RULE_MODULE = """
    from emgate.hookspecs import hookimpl
    from emgate.rule import Check, Rule

    class Listed(Rule):
        id = "{rid}"
        summary = "a test rule"

        def check(self, design, options, context):
            return []

    @hookimpl
    def emgate_rules():
        return [Listed]
"""


# --- the installed sample pack ---------------------------------------------------------------


def test_sample_pack_rule_is_listed_with_its_distribution_and_version() -> None:
    pack_version = version(PACK_DIST)  # [calc] external check: importlib.metadata
    rules = {r["id"]: r for r in json.loads(run_cli("rules", "--format", "json").out)}
    assert rules[PACK_RULE]["origin"] == {"distribution": PACK_DIST, "version": pack_version}
    assert rules[PACK_RULE]["severity"] == "warning"
    text = run_cli("rules").out
    assert re.search(
        rf"^{re.escape(PACK_RULE)}\s.*{PACK_DIST} {re.escape(pack_version)}",
        text,
        flags=re.MULTILINE,
    )
    plugins = run_cli("plugins").out
    assert re.search(
        rf"^brennfeld\s+{PACK_DIST} {re.escape(pack_version)}", plugins, flags=re.MULTILINE
    )


def test_sample_pack_rule_runs_on_a_record(repo: Path) -> None:
    result = run_cli("check", "--format", "json", write_variant(repo, {}))
    (record,) = result.json()["records"]
    (out,) = [o for o in record["outcomes"] if o["rule"] == PACK_RULE]
    assert out["status"] == "pass"
    values = [c["value"] for c in out["checks"] if c["quantity"] == "stator.aspect_ratio"]
    # [calc] stack 140 mm / bore 136 mm; one float division of the same inputs: rounding only
    assert values == pytest.approx([140 / 136] * 2, rel=1e-12)
    assert {c["bound"] for c in out["checks"]} == {"max", "min"}


def test_sample_pack_rule_fails_a_long_stack(repo: Path) -> None:
    # 230 mm / 136 mm = 1.69 > 1.6, the pack's default upper limit [calc]; severity warning.
    result = run_cli(
        "check", "--format", "json", write_variant(repo, {"stator.stack_length": "230 mm"})
    )
    findings = [f for f in result.json()["findings"] if f["rule"] == PACK_RULE]
    assert [f["severity"] for f in findings] == ["warning"]
    assert findings[0]["record_path"] == "$.stator.stack_length"


# --- broken packs ----------------------------------------------------------------------------


def _assert_plugin_error(result: Any, name: str, pattern: str, code: int = 2) -> None:
    assert result.code == code, result.out + result.err
    lines = [line for line in result.err.splitlines() if f"plugin {name!r}" in line]
    assert lines, result.err
    assert re.search(pattern, lines[0]), lines[0]


def test_plugin_raising_on_import(plugin_host: Any, repo: Path) -> None:
    plugin_host.add("acme", "acme_raising_pack", "raise RuntimeError('broken on import')\n")
    result = run_cli("rules")
    _assert_plugin_error(result, "acme", "failed to load: RuntimeError: broken on import", code=3)
    assert "current-density" in result.out  # the other packs still load
    check = run_cli("check", "--format", "json", write_variant(repo, {}))  # fail closed
    assert check.code == 3  # the pack's code raised: a crash of that pack
    (crash,) = [f for f in check.json()["findings"] if "plugin 'acme'" in f["message"]]
    assert crash["kind"] == "crash"


def test_plugin_module_missing(plugin_host: Any) -> None:
    plugin_host.add("ghost", "no_such_module_for_emgate_tests")
    _assert_plugin_error(run_cli("plugins"), "ghost", "ModuleNotFoundError")


def test_pack_rule_without_prefix(plugin_host: Any) -> None:
    plugin_host.add("acme", "acme_unprefixed_pack", RULE_MODULE.format(rid="slot-thing"))
    result = run_cli("rules")
    _assert_plugin_error(result, "acme", r"'slot-thing' needs its pack's prefix.*'acme/slot-thing'")
    assert "slot-thing" not in result.out


def test_duplicate_rule_id(plugin_host: Any) -> None:
    plugin_host.add("acme", "acme_first_pack", RULE_MODULE.format(rid="acme/dup"))
    plugin_host.add("acme2", "acme_second_pack", RULE_MODULE.format(rid="acme/dup"))
    result = run_cli("rules")
    _assert_plugin_error(result, "acme2", "'acme/dup' is already registered")
    assert len(re.findall(r"^acme/dup\s", result.out, flags=re.MULTILINE)) == 1


def test_each_entry_point_is_isolated(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    from emgate.plugins import load_plugins

    (tmp_path / "good_pack_for_emgate_tests.py").write_text(
        RULE_MODULE.replace("\n    ", "\n").format(rid="good/one"), encoding="utf-8"
    )
    monkeypatch.syspath_prepend(str(tmp_path))
    monkeypatch.delitem(sys.modules, "good_pack_for_emgate_tests", raising=False)
    eps = [
        EntryPoint("bad", "no_such_module_for_emgate_tests", "emgate.plugins"),
        EntryPoint("good", "good_pack_for_emgate_tests", "emgate.plugins"),
    ]
    plugins = load_plugins(eps)
    assert list(plugins.rules) == ["good/one"]
    assert [p.name for p in plugins.packs] == ["good"]
    assert len(plugins.errors) == 1 and "plugin 'bad'" in str(plugins.errors[0])
    sys.modules.pop("good_pack_for_emgate_tests", None)


# --- the working tree is not trusted ---------------------------------------------------------


def _shadow_package(folder: Path) -> None:
    pkg = folder / "emgate_rules"
    pkg.mkdir()
    (pkg / "__init__.py").write_text("raise RuntimeError('shadowed from the working tree')\n")


def test_cli_ignores_a_module_in_the_working_directory(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    import importlib.util

    _shadow_package(tmp_path)
    monkeypatch.chdir(tmp_path)
    monkeypatch.syspath_prepend(str(tmp_path))
    monkeypatch.syspath_prepend("")
    monkeypatch.delitem(sys.modules, "emgate_rules", raising=False)
    # Premise: without the CLI's guard the working tree would win the import.
    spec = importlib.util.find_spec("emgate_rules")
    assert spec is not None and Path(spec.origin or "").parent == tmp_path / "emgate_rules"
    result = run_cli("rules")
    assert result.code == 0, result.err
    assert "current-density" in result.out
    assert Path(sys.modules["emgate_rules"].__file__ or "").parent != tmp_path / "emgate_rules"


def test_python_m_emgate_ignores_the_working_directory(tmp_path: Path) -> None:
    # 'python -m' puts the working directory first on sys.path: the real CI situation.
    _shadow_package(tmp_path)
    proc = subprocess.run(
        [sys.executable, "-m", "emgate", "rules"],
        cwd=tmp_path,
        capture_output=True,
        text=True,
        check=False,
    )
    assert proc.returncode == 0, proc.stderr
    assert "shadowed" not in proc.stderr
    assert re.search(r"^current-density\s", proc.stdout, flags=re.MULTILINE)
