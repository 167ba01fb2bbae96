"""The cost of remedies: the bundled examples checked in-process with and without them.

Not a test: nothing here asserts a time. Run with `python bench/remedies.py [REPEAT]` in an
environment where emgate and the sample pack are installed. Prints the medians of both runs,
the difference per failing check (the budget: 200 ms a failing check on the reference
machine), and the number of trial evaluations (record validated, recomputed, rule re-run).
"""

from __future__ import annotations

import statistics
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
EXAMPLES = ROOT / "examples" / "design-repo"
BUDGET = 0.200  # s per failing check, the limit


def run(remedies: bool) -> tuple[float, int]:
    """One in-process run on the examples: wall time [s] and failing checks."""
    from emgate.config import find_config, load_policy
    from emgate.engine import Run, execute
    from emgate.plugins import load_plugins

    plugins = load_plugins()
    rules = {rid: lr.rule for rid, lr in plugins.rules.items()}
    installed = {p.distribution: p.version for p in plugins.packs}
    policy = load_policy(find_config(EXAMPLES), rules, EXAMPLES, installed)
    start = time.perf_counter()
    result = execute(Run(paths=[EXAMPLES], policy=policy, plugins=plugins, remedies=remedies))
    elapsed = time.perf_counter() - start
    failing = [f for f in result.findings if f.check is not None and not f.check.passed]
    return elapsed, len(failing)


def count_trials() -> int:
    """Trial evaluations of one run with remedies."""
    from emgate import remedies

    calls = 0
    original = remedies._Trial.checks

    def counted(self, data, only=None):  # type: ignore[no-untyped-def]
        nonlocal calls
        calls += 1
        return original(self, data, only)

    remedies._Trial.checks = counted  # type: ignore[method-assign]
    try:
        run(True)
    finally:
        remedies._Trial.checks = original  # type: ignore[method-assign]
    return calls


def main() -> None:
    repeat = int(sys.argv[1]) if len(sys.argv) > 1 else 7
    run(True)  # warm: imports, steel curves, caches
    off = statistics.median(run(False)[0] for _ in range(repeat))
    timed = [run(True) for _ in range(repeat)]
    on = statistics.median(t for t, _ in timed)
    failing = timed[0][1]
    trials = count_trials()
    per_check = (on - off) / failing if failing else 0.0
    print(f"examples, --remedies off     {off * 1e3:8.1f} ms")
    print(f"examples, remedies on        {on * 1e3:8.1f} ms")
    print(f"failing checks               {failing:8d}")
    print(f"trial evaluations            {trials:8d}  ({trials / max(failing, 1):.0f} a check)")
    verdict = "within" if per_check <= BUDGET else "OVER"
    print(
        f"remedies per failing check   {per_check * 1e3:8.1f} ms"
        f"  ({verdict} the {BUDGET * 1e3:.0f} ms budget)"
    )


if __name__ == "__main__":
    main()
