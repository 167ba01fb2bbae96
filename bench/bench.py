"""Start-up and rule timings, printed as ratios measured in this one run.

Not a test: this machine is noisy, so nothing here asserts a time. Run with `nox -s bench`.

1. Wall time of `emgate check` on one record and on the bundled examples, each as a ratio to
   a bare `python -c "import yaml"` measured in the same run (medians of repeated runs).
2. In-process: all built-in rules on one design, and on every bundled example, against merely
   loading the same YAML files with the guarded loader.
"""

from __future__ import annotations

import shutil
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
EXAMPLES = ROOT / "examples" / "design-repo"
ONE = EXAMPLES / "designs" / "pump-drive-4p36s.yaml"


def wall(cmd: list[str], repeat: int) -> float:
    times = []
    for _ in range(repeat):
        start = time.perf_counter()
        subprocess.run(cmd, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, check=False)
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def per_call(fn, repeat: int) -> float:  # type: ignore[no-untyped-def]
    fn()  # warm: imports, caches of the first call
    times = []
    for _ in range(repeat):
        start = time.perf_counter()
        fn()
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def main() -> None:
    repeat = int(sys.argv[1]) if len(sys.argv) > 1 else 15
    exe = shutil.which("emgate") or sys.exit("emgate is not installed in this environment")
    base = wall([sys.executable, "-c", "import yaml"], repeat)
    # The libraries the job requires, imported and nothing else: the floor under any CLI.
    floor = wall(
        [
            sys.executable,
            "-c",
            "import yaml, numpy, pluggy, importlib.metadata;"
            " from pydantic import BaseModel, TypeAdapter",
        ],
        repeat,
    )
    one = wall([exe, "check", str(ONE)], repeat)
    many = wall([exe, "check", str(EXAMPLES)], repeat)
    print(f"python -c 'import yaml'          {base * 1e3:8.1f} ms   1.00")
    print(f"import yaml+numpy+pluggy+pydantic {floor * 1e3:7.1f} ms   {floor / base:5.2f} x")
    print(f"emgate check one record          {one * 1e3:8.1f} ms   {one / base:5.2f} x")
    print(f"emgate check examples/ (3 + 1)   {many * 1e3:8.1f} ms   {many / base:5.2f} x")

    from emgate.config import Policy
    from emgate.engine import Run, execute
    from emgate.loader import load
    from emgate.plugins import load_plugins

    plugins = load_plugins()
    files = sorted(EXAMPLES.rglob("*.yaml"))
    load_one = per_call(lambda: load(ONE), repeat * 20)
    load_all = per_call(lambda: [load(f) for f in files], repeat * 10)
    rules_one = per_call(lambda: execute(Run([ONE], Policy(EXAMPLES), plugins)), repeat * 4)
    rules_all = per_call(lambda: execute(Run([EXAMPLES], Policy(EXAMPLES), plugins)), repeat * 2)
    n = len(plugins.rules)
    print(f"\nin process ({n} rules installed):")
    print(f"load one record                  {load_one * 1e3:8.3f} ms   1.00")
    print(
        f"validate + all rules, one record {rules_one * 1e3:8.3f} ms   "
        f"{rules_one / load_one:5.1f} x"
    )
    print(f"load all example files           {load_all * 1e3:8.3f} ms   1.00")
    print(
        f"validate + all rules, examples   {rules_all * 1e3:8.3f} ms   "
        f"{rules_all / load_all:5.1f} x"
    )


if __name__ == "__main__":
    main()
