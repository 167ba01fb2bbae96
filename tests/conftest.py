"""Shared fixtures and the one home of the helpers test modules share.

The CLI run in-process; design-record variants written to tmp_path; the JSON of a run taken
apart (findings, outcomes, checks); hand calculations used as oracles by several modules;
calculations built directly with a chosen steel; and the headless browser of the pages'
tests. Test modules import helpers from here, never from one another.

Record variants start from the demo records, are edited as plain data and written back with
PyYAML's dumper; the expected line of a node is read back with PyYAML's composer, which is
independent of emgate's own loader, so a wrong mark in emgate cannot hide in the oracle.
"""

from __future__ import annotations

import copy
import io
import json
import math
import os
import shutil
import subprocess
import sys
import tempfile
import textwrap
from collections.abc import Callable, Iterator, Mapping
from contextlib import redirect_stderr, redirect_stdout
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING, Any

import numpy as np
import pytest
import scipy.constants
import yaml

from emgate.parallel import MIN_ITEMS_PER_WORKER
from emgate.physics.bh import BHCurve

if TYPE_CHECKING:
    from emgate.calc import Calculation

REPO = Path(__file__).resolve().parents[1]
DEMO = REPO / "examples" / "design-repo"
DESIGNS = DEMO / "designs"
PUMP = DESIGNS / "pump-drive-4p36s.yaml"  # passes every rule on the default limits
SERVO = DESIGNS / "servo-10p12s.yaml"  # breaks the current-density limit on purpose
GENSET = DESIGNS / "genset-4p48s.yaml"  # needs the demo materials file
STEELS = DEMO / "materials" / "steels.yaml"
SCHEMAS = REPO / "schemas"

DELETE = object()  # an override value that removes the key
MM = 1e-3  # m per mm
MM2 = 1e-6  # m^2 per mm^2
MU0 = scipy.constants.mu_0  # [pub: CODATA 2022, via scipy]


@dataclass
class CliResult:
    code: int
    out: str
    err: str

    def json(self) -> dict[str, Any]:
        return json.loads(self.out)

    def input_findings(self) -> list[dict[str, Any]]:
        return [f for f in self.json()["findings"] if f["kind"] == "input"]


def run_cli(*argv: str | Path) -> CliResult:
    """Run ``emgate ARGV`` in this process; sys.path is restored afterwards because the CLI
    drops the working directory from it."""
    from emgate.cli import main

    out, err = io.StringIO(), io.StringIO()
    saved = sys.path[:]
    try:
        with redirect_stdout(out), redirect_stderr(err):
            try:
                code = main([str(a) for a in argv])
            except SystemExit as exc:  # argparse: --version, usage errors
                code = exc.code if isinstance(exc.code, int) else 2
    finally:
        sys.path[:] = saved
    return CliResult(code, out.getvalue(), err.getvalue())


@pytest.fixture
def cli() -> Callable[..., CliResult]:
    return run_cli


def _split(dotted: str) -> list[str | int]:
    return [int(p) if p.isdigit() else p for p in dotted.split(".")]


def override(data: Any, dotted: str, value: Any) -> None:
    """Set (or with :data:`DELETE` remove) the node at a dotted path such as 'stator.slots'
    or 'waivers.0.rule'; missing mappings on the way are created."""
    *parents, last = _split(dotted)
    node = data
    for part in parents:
        if isinstance(part, str) and part not in node:
            node[part] = {}
        node = node[part]
    if value is DELETE:
        del node[last]
    else:
        node[last] = value


def write_variant(
    folder: Path,
    overrides: Mapping[str, Any] | None = None,
    *,
    base: Path = PUMP,
    name: str | None = None,
) -> Path:
    """Write ``base`` with ``overrides`` applied to ``folder`` and return the file's path."""
    data = copy.deepcopy(yaml.safe_load(base.read_text(encoding="utf-8")))
    for dotted, value in (overrides or {}).items():
        override(data, dotted, value)
    path = folder / (name or base.name)
    path.write_text(yaml.safe_dump(data, sort_keys=False, allow_unicode=True), encoding="utf-8")
    return path


def node_mark(path: Path, dotted: str, *, key: bool = False) -> tuple[int, int]:
    """1-based (line, column) where emgate should locate a node, read by PyYAML's composer:
    a scalar at its value, a mapping or list at the key naming it (its first item may be
    lines below), or with ``key`` always at the key."""
    node = yaml.compose(path.read_text(encoding="utf-8"), Loader=yaml.SafeLoader)
    key_node = None
    for part in _split(dotted) if dotted else []:
        if isinstance(node, yaml.MappingNode):
            key_node, node = next((k, v) for k, v in node.value if k.value == part)
        else:
            assert isinstance(part, int)
            key_node, node = None, node.value[part]
    collection = isinstance(node, yaml.MappingNode | yaml.SequenceNode)
    target = key_node if (key or collection) and key_node is not None else node
    return target.start_mark.line + 1, target.start_mark.column + 1


@pytest.fixture
def repo(tmp_path: Path) -> Path:
    """An empty design repository: the '.git' marker stops the upward search for a config."""
    (tmp_path / ".git").mkdir()
    return tmp_path


@dataclass
class PluginHost:
    """Extra entry points of the group ``emgate.plugins``, beside the installed ones, backed
    by modules written to a folder on sys.path for the length of one test."""

    folder: Path
    monkeypatch: pytest.MonkeyPatch
    extra: list[Any]
    modules: list[str]

    def add(self, name: str, module: str, source: str | None = None) -> Any:
        """Register entry point ``name`` -> ``module``; write the module if ``source`` given."""
        from importlib.metadata import EntryPoint

        if source is not None:
            (self.folder / f"{module}.py").write_text(textwrap.dedent(source), encoding="utf-8")
        self.modules.append(module)
        ep = EntryPoint(name=name, value=module, group="emgate.plugins")
        self.extra.append(ep)
        return ep


@pytest.fixture
def plugin_host(tmp_path: Path, monkeypatch: pytest.MonkeyPatch):  # type: ignore[no-untyped-def]
    import importlib
    from importlib.metadata import entry_points

    import emgate.plugins

    folder = tmp_path / "plugin_modules"
    folder.mkdir()
    monkeypatch.syspath_prepend(str(folder))
    host = PluginHost(folder, monkeypatch, [], [])

    def patched(**kwargs: Any) -> list[Any]:
        return [*entry_points(**kwargs), *host.extra]

    monkeypatch.setattr(emgate.plugins, "entry_points", patched)
    importlib.invalidate_caches()
    yield host
    for module in host.modules:
        sys.modules.pop(module, None)


# --- runs and their JSON --------------------------------------------------------------------------


def show_json(path: Path) -> dict[str, dict[str, Any]]:
    """The quantities of ``emgate show --format json PATH``."""
    result = run_cli("show", "--format", "json", path)
    assert result.code == 0, result.err
    return result.json()["quantities"]


def sheet(path: Path) -> dict[str, float]:
    """Name -> SI value of the calculation sheet of one record."""
    return {name: q["value"] for name, q in show_json(path).items()}


def variant(repo: Path, overrides: dict[str, Any], base: Path = PUMP) -> Path:
    """A demo record with overrides in ``repo``; the genset's steel file comes along."""
    if base == GENSET and not (repo / "materials").exists():
        (repo / "materials").mkdir()
        shutil.copy(STEELS, repo / "materials" / STEELS.name)
    return write_variant(repo, overrides, base=base)


def write_config(repo: Path, text: str) -> Path:
    path = repo / "emgate.yaml"
    path.write_text("schema: emgate/config@1\n" + text, encoding="utf-8")
    return path


def check_json(path: Path) -> CliResult:
    result = run_cli("check", "--format", "json", path)
    assert result.code in (0, 1), result.out + result.err
    return result


def findings(result: CliResult, rule: str | None = None) -> list[dict[str, Any]]:
    return [f for f in result.json()["findings"] if rule is None or f["rule"] == rule]


def outcome(result: CliResult, rule: str, record_id: str | None = None) -> dict[str, Any]:
    records = result.json()["records"]
    (record,) = [r for r in records if record_id is None or r["record_id"] == record_id]
    (out,) = [o for o in record["outcomes"] if o["rule"] == rule]
    return out


def the_check(
    result: CliResult,
    rule: str,
    quantity: str,
    record_id: str | None = None,
    bound: str | None = None,
) -> Any:
    """The one check of ``rule`` on ``quantity`` (of one bound, where a rule checks both)."""
    (c,) = [
        c
        for c in outcome(result, rule, record_id)["checks"]
        if c["quantity"] == quantity and bound in (None, c["bound"])
    ]
    return c


def assert_located(result: Any, rule: str, path: Path, dotted: str) -> dict[str, Any]:
    """The rule's one finding sits at the node ``dotted`` of ``path``; returns it."""
    assert result.code == 1, result.out
    (finding,) = findings(result, rule)
    assert finding["file"].endswith(path.name)
    assert (finding["line"], finding["column"]) == node_mark(path, dotted)
    assert finding["record_path"] == "$." + dotted
    assert finding["severity"] == "error"
    return finding


# --- hand calculations shared by several modules --------------------------------------------------


def carter(slot_pitch: float, opening: float, gap: float) -> float:
    """kc = tau / (tau - gamma g), gamma = (4/pi)[u atan u - ln sqrt(1 + u^2)], u = b0/(2g).
    [mem: Carter 1901, as given in Pyrhonen, Design of Rotating Electrical Machines, ch. 3]"""
    u = opening / (2.0 * gap)
    gamma = 4.0 / math.pi * (u * math.atan(u) - math.log(math.sqrt(1.0 + u * u)))
    return slot_pitch / (slot_pitch - gamma * gap)


def kd_kp(q: int, slot_angle: float, pitch: float) -> float:
    """Integral-slot 60-degree-belt winding factor, kd kp [mem: Pyrhonen, Design of Rotating
    Electrical Machines]; slot_angle in electrical radians, pitch y / tau_p."""
    kd = math.sin(q * slot_angle / 2.0) / (q * math.sin(slot_angle / 2.0))
    return kd * math.sin(pitch * math.pi / 2.0)


#: 12-slot 10-pole double-layer tooth-coil table, derived by hand: the coil on tooth k links
#: the working order at 150 k degrees electrical; phase A takes +c0 -c1 -c6 +c7, B (120 deg on
#: in slot order) -c2 +c3 +c8 -c9, C +c4 -c5 -c10 +c11. Slot k holds coil k's go side (top)
#: and coil k-1's return side.
TOOTH_COIL_12_10 = [
    "+A -C", "-A -A", "-B +A", "+B +B", "+C -B", "-C -C",
    "-A +C", "+A +A", "+B -A", "-B -B", "-C +B", "+C +C",
]  # fmt: skip


def table_layout(table: list[str]) -> np.ndarray:
    lay = np.zeros((3, len(table)), dtype=int)
    for s, entry in enumerate(table):
        for side in entry.split():
            lay["ABC".index(side[1]), s] += 1 if side[0] == "+" else -1
    return lay


def phasors(lay: np.ndarray, order: int) -> np.ndarray:
    """Slot phasor sums sum_s c_s exp(j n 2 pi s / Q) [pub: Skaar, Kroevel, Nilssen, ICEM 2006]."""
    theta = 2.0 * np.pi * np.arange(lay.shape[1]) / lay.shape[1]
    return (lay * np.exp(1j * order * theta)).sum(axis=1)


# --- calculations built directly, with a chosen steel ---------------------------------------------


def m350_50a_curve(b_max: float = 2.2, points: int = 221) -> BHCurve:
    """M350-50A tabulated from a published relative-permeability fit.

    mu_r(B) = 1 + (mu_i - 1 + c_a B_N) / (1 + c_b B_N + B_N^n), B_N = B / B_muMax.
    """
    # [pub: Modelica Standard Library, FluxTubes soft-magnetic materials] M350-50A:
    # mu_i 1210, B_muMax 1.16 T, c_a 24630, c_b 2.44, n 14.
    mu_i, b_mu_max, c_a, c_b, n = 1210.0, 1.16, 24630.0, 2.44, 14.0
    b = np.linspace(0.0, b_max, points)
    b_n = b[1:] / b_mu_max
    mu_r = 1.0 + (mu_i - 1.0 + c_a * b_n) / (1.0 + c_b * b_n + b_n**n)
    h = np.concatenate(([0.0], b[1:] / (MU0 * mu_r)))
    return BHCurve("M350-50A", b, h, "Modelica FluxTubes fit")


def linear_curve(mu_r: float, b_max: float = 10.0) -> BHCurve:
    """A linear steel, H = B / (mu0 mu_r), tabulated far enough that no test reaches the table
    end (no saturation in any demo record)."""
    return BHCurve(
        f"linear mu_r={mu_r:g}",
        np.array([0.0, b_max]),
        np.array([0.0, b_max / (MU0 * mu_r)]),
        "linear",
    )


class OneSteel:
    """A catalogue that answers every grade with the same curve."""

    def __init__(self, curve: BHCurve) -> None:
        self.curve = curve

    def get(self, name: str) -> BHCurve:
        return self.curve


def calculation(path: Path, steel: BHCurve | None = None) -> Calculation:
    """The Calculation of a record, as `emgate show` builds it; optionally with one steel."""
    from emgate.calc import Calculation
    from emgate.discovery import discover_materials
    from emgate.loader import load
    from emgate.validate import validate_design

    doc = load(path)
    design = validate_design(doc)
    catalogue: Any = discover_materials(path)
    catalogue.resolve(doc, design)
    return Calculation(design, OneSteel(steel) if steel is not None else catalogue)


# ------------------------------------------------------------------ a real browser


BROWSER_FLAGS = (
    "--headless",
    "--no-sandbox",
    "--disable-gpu",
    "--disable-quic",
    "--no-first-run",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
)


def _browser_or_skip() -> tuple[str, str]:
    """Paths of the system chromium and its driver. Missing in CI is a failure; outside CI
    the browser tests are skipped and say why (`.ci/run` and `nox -s tests` install it)."""
    reasons = []
    try:
        import selenium  # noqa: F401
    except ImportError:
        reasons.append("the selenium package is not installed (pip install -e '.[test]')")
    browser = shutil.which("chromium") or shutil.which("chromium-browser")
    driver = shutil.which("chromedriver") or (
        "/usr/bin/chromedriver" if Path("/usr/bin/chromedriver").exists() else None
    )
    if not browser or not driver:
        reasons.append("Debian's chromium and chromium-driver are not installed")
    if reasons:
        why = "; ".join(reasons)
        if os.environ.get("CI") == "true":
            pytest.fail(f"browser tests cannot run in CI: {why}")
        print(f"skipping the browser tests: {why}")
        pytest.skip(why)
    return browser, driver  # type: ignore[return-value]


@pytest.fixture(scope="module")
def browser() -> Iterator[Any]:
    from selenium import webdriver
    from selenium.webdriver.chrome.options import Options
    from selenium.webdriver.chrome.service import Service

    binary, driver_path = _browser_or_skip()
    profile = tempfile.mkdtemp(prefix="emgate-chromium-")
    opts = Options()
    opts.binary_location = binary
    for flag in (*BROWSER_FLAGS, f"--user-data-dir={profile}", "--window-size=1280,900"):
        opts.add_argument(flag)
    opts.set_capability("goog:loggingPrefs", {"browser": "ALL", "performance": "ALL"})
    drv = webdriver.Chrome(options=opts, service=Service(driver_path))
    try:
        yield drv
    finally:
        drv.quit()
        shutil.rmtree(profile, ignore_errors=True)


def requests(drv: Any) -> list[str]:
    """The addresses the pages asked for since the browser's performance log was last read;
    not those of Chromium's own pages (``chrome://``), which it may open in the background."""
    urls = []
    for entry in drv.get_log("performance"):
        msg = json.loads(entry["message"])["message"]
        if msg.get("method") == "Network.requestWillBeSent":
            params = msg["params"]
            if not str(params.get("documentURL", "")).startswith("chrome:"):
                urls.append(params["request"]["url"])
    return urls


#: Records of :func:`many_records`: enough for two --jobs workers.
RECORDS = 3 * MIN_ITEMS_PER_WORKER
_STACK_MM = {PUMP: 140.0, SERVO: 60.0, GENSET: 160.0}  # as the bundled records give them


def many_records(repo: Path) -> None:
    """Passing and failing records of all three kinds, a broken one, a taken id, a waiver."""
    (repo / "designs").mkdir()
    (repo / "materials").mkdir()
    shutil.copy(STEELS, repo / "materials" / STEELS.name)
    bases = (PUMP, SERVO, GENSET)
    for i in range(RECORDS):
        base = bases[i % 3]
        # each record its own stack, a little longer than its base's (which passes its rules)
        stack = _STACK_MM[base] + 0.1 * i
        overrides = {"id": f"{base.stem}-{i:03d}", "stator.stack_length": f"{stack:.1f} mm"}
        if i == 7:
            overrides["rating.line_current"] = "40 A"  # a current density far past the limit
        write_variant(repo / "designs", overrides, base=base, name=f"r{i:03d}.yaml")
    write_variant(repo / "designs", {"id": "pump-drive-4p36s-003"}, name="taken-id.yaml")
    write_variant(repo / "designs", {"poles": "four"}, name="invalid.yaml")
    (repo / "designs" / "broken.yaml").write_text("schema: emgate/design@1\nid: [\n")
    write_config(repo, "files: ['designs/*.yaml']\n")


def git(repo: Path, *args: str) -> str:
    """Run git in ``repo`` as a throwaway identity, without the user's or the system's
    settings (no signing, no hooks): its output. A failing git fails the test."""
    env = {
        **os.environ,
        "GIT_AUTHOR_NAME": "t",
        "GIT_AUTHOR_EMAIL": "t@t",
        "GIT_COMMITTER_NAME": "t",
        "GIT_COMMITTER_EMAIL": "t@t",
        "GIT_CONFIG_GLOBAL": os.devnull,
        "GIT_CONFIG_NOSYSTEM": "1",
    }
    done = subprocess.run(
        ["git", *args], cwd=repo, env=env, check=True, capture_output=True, text=True
    )
    return done.stdout
