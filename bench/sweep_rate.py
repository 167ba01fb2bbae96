"""Sweep rates on this machine, for `nox -s sweep` (no timed assertions; prints only).

1. `emgate sweep` through the full path (validation and every rule), a random sample of the
   demo pump's air gap, turns and line current, on a Dask LocalCluster of the available cores:
   variants per second, wall and per core.
2. The vectorised magnetic and electrical path (emgate.vector) on a million variants of the
   same fields, in this process (one core).

Usage: python bench/sweep_rate.py [FULL_PATH_VARIANTS] [VECTOR_VARIANTS]
"""

from __future__ import annotations

import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
PUMP = ROOT / "examples" / "design-repo" / "designs" / "pump-drive-4p36s.yaml"


def main() -> None:
    full = int(sys.argv[1]) if len(sys.argv) > 1 else 20_000
    vector = int(sys.argv[2]) if len(sys.argv) > 2 else 1_000_000
    from emgate.parallel import available_cores

    cores = available_cores()
    with tempfile.TemporaryDirectory() as tmp:
        spec = Path(tmp) / "spec.yaml"
        spec.write_text(
            "sample: random\n"
            f"count: {full}\nseed: 1\nfields:\n"
            "  air_gap: {from: 0.35 mm, to: 0.65 mm}\n"
            "  winding.turns_per_coil: {from: 17, to: 25}\n"
            "  rating.line_current: {from: 12 A, to: 17 A}\n"
        )
        out = Path(tmp) / "sweep.parquet"
        start = time.perf_counter()
        done = subprocess.run(
            ["emgate", "sweep", str(PUMP), str(spec), "--out", str(out), "--chunk", "500"],
            capture_output=True,
            text=True,
            check=False,
        )
        wall = time.perf_counter() - start
        print(done.stdout)
        if done.returncode != 0:
            sys.exit(done.stderr)
    rate = full / wall
    print(
        f"full path on a LocalCluster of {cores} cores: {full} variants in {wall:.1f} s wall"
        f" (cluster start included): {rate:,.0f} variants/s, {rate / cores:,.0f} per core"
    )

    from emgate.calc import Calculation
    from emgate.discovery import discover_materials
    from emgate.loader import load
    from emgate.validate import validate_design
    from emgate.vector import Nominal, evaluate

    design = validate_design(load(PUMP))
    nominal = Nominal.of(Calculation(design, discover_materials(PUMP)))
    rng = np.random.default_rng(1)
    chunk = 10_000
    start = time.process_time()
    feasible = 0
    for lo in range(0, vector, chunk):
        n = min(chunk, vector - lo)
        gap = rng.choice(np.linspace(0.35e-3, 0.65e-3, 61), n)
        turns = rng.integers(17, 26, n).astype(float)
        current = rng.uniform(12.0, 17.0, n)
        sheet = evaluate(nominal, gap, turns, current)
        feasible += int(np.count_nonzero(sheet["stator.slot_fill"] <= 0.45))
    cpu = time.process_time() - start
    print(
        f"vectorised magnetic + electrical path: {vector:,} variants in {cpu:.1f} s CPU:"
        f" {vector / cpu:,.0f} variants/s per core ({feasible / vector:.1%} within the"
        " default slot-fill limit)"
    )


if __name__ == "__main__":
    main()
