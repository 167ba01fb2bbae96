"""The cost of remedies: design records checked in-process with and without them.

Not a test: nothing here asserts a time. Run with `python bench/remedies.py [REPEAT]` in an
environment where emgate and the sample pack are installed. For the bundled examples, and
for a copy in which the pump and the genset are rated for more current (more failing
checks, of other kinds), prints the medians of both runs in wall and CPU time, the
difference per failing check (the budget: 200 ms a failing check on the reference machine),
and the number of trial evaluations (record validated, recomputed, rule re-run). CPU time
is the steadier figure on a machine that other jobs share.
"""

from __future__ import annotations

import shutil
import statistics
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
EXAMPLES = ROOT / "examples" / "design-repo"
BUDGET = 0.200  # s per failing check, the limit


#: Rated for more current at the same voltage (as in tests/test_remedies.py).
OVERRATED = {
    "pump-drive-4p36s.yaml": {
        "power: 7.5 kW": "power: 15 kW",
        "line_current: 14.6 A": "line_current: 29.2 A",
    },
    "genset-4p48s.yaml": {
        "power: 30 kVA": "power: 45 kVA",
        "line_current: 43.3 A": "line_current: 65 A",
    },
}


def overrated() -> Path:
    """A copy of the examples with the pump and the genset rated for more current."""
    folder = Path(tempfile.mkdtemp()) / "design-repo"
    shutil.copytree(EXAMPLES, folder)
    for name, edits in OVERRATED.items():
        path = folder / "designs" / name
        text = path.read_text(encoding="utf-8")
        for old, new in edits.items():
            text = text.replace(old, new)
        path.write_text(text, encoding="utf-8")
    return folder


def run(remedies: bool, where: Path = EXAMPLES) -> tuple[float, float, int]:
    """One in-process run: wall and CPU time [s], and the failing checks."""
    from emgate.config import find_config, load_policy
    from emgate.engine import execute
    from emgate.pipeline import Run
    from emgate.plugins import load_plugins

    plugins = load_plugins()
    rules = {rid: lr.rule for rid, lr in plugins.rules.items()}
    installed = {p.distribution: p.version for p in plugins.packs}
    policy = load_policy(find_config(where), rules, where, installed)
    start, cpu = time.perf_counter(), time.process_time()
    result = execute(Run(paths=[where], policy=policy, plugins=plugins, remedies=remedies))
    elapsed, cpu = time.perf_counter() - start, time.process_time() - cpu
    failing = [f for f in result.findings if f.check is not None and not f.check.passed]
    return elapsed, cpu, len(failing)


def count_trials(where: Path) -> int:
    """Trial evaluations of one run with remedies."""
    from emgate import remedy_search

    calls = 0
    original = remedy_search.Trial.checks

    def counted(self, data, only=None):  # type: ignore[no-untyped-def]
        nonlocal calls
        calls += 1
        return original(self, data, only)

    remedy_search.Trial.checks = counted  # type: ignore[method-assign]
    try:
        run(True, where)
    finally:
        remedy_search.Trial.checks = original  # type: ignore[method-assign]
    return calls


def report(title: str, where: Path, repeat: int) -> None:
    run(True, where)  # warm: imports, steel curves, caches
    off = [run(False, where) for _ in range(repeat)]
    on = [run(True, where) for _ in range(repeat)]
    failing = on[0][2]
    trials = count_trials(where)
    print(title)
    for i, clock in ((0, "wall"), (1, "CPU ")):
        a = statistics.median(r[i] for r in off)
        b = statistics.median(r[i] for r in on)
        per = (b - a) / failing if failing else 0.0
        verdict = "within" if per <= BUDGET else "OVER"
        print(
            f"  {clock}: --remedies off {a * 1e3:7.1f} ms, on {b * 1e3:7.1f} ms;"
            f" {per * 1e3:6.1f} ms a failing check ({verdict} {BUDGET * 1e3:.0f} ms)"
        )
    print(f"  {failing} failing checks, {trials} trial evaluations")


def main() -> None:
    repeat = int(sys.argv[1]) if len(sys.argv) > 1 else 7
    report("bundled examples", EXAMPLES, repeat)
    report("pump and genset overrated", overrated(), repeat)


if __name__ == "__main__":
    main()
