"""Start-up, many-record, --changed-since, --jobs and sweep figures, measured in one run.

Not a test: this machine is noisy, so nothing here asserts a time. Run with `nox -s bench`
(`nox -s bench -- --rounds 9 --records 1000`).

How it measures: every command runs as a child process and its CPU time (user + system, the
child's own and its reaped children's: ``os.wait4``) is taken, with its wall time and peak
memory. The commands alternate in rounds (floor, one, many, ..., floor, one, many, ...), so
that a slow phase of the machine hits them alike; the figures are medians over the rounds and
the ratios are taken between medians of the same run.

emgate's sources (and its rules' and packs') are byte-compiled first, as installing a wheel
does; the figures are those of an installed emgate, not of an editable checkout's first run.

Sections:

1. Start-up: the library-import floor ``python -c "import yaml, numpy, pydantic, pluggy"``
   against ``emgate check`` of one bundled record.
2. Many records: a generated repository of N records (the bundled examples varied: id and stack
   length), checked at N/4 and N records; the CPU per record beyond start-up is the slope
   between the two; peak memory at both sizes says whether memory grows with the count, for
   the text report and for the formats the CI templates write.
3. ``--changed-since HEAD`` with one record of N changed (a temporary git repository),
   against a single check of that same record in a repository of its own (materials and
   config alike), and against the single check of section 1 (a record of another kind).
4. ``--jobs 1`` against ``--jobs`` the available cores, N records (wall and CPU).
5. Memory at several sizes (``--memory-sizes``, 1,000, 4,000, 16,000 and 32,000 records;
   ``--memory-only`` runs this section alone): the peak memory of ``emgate check`` of a
   generated repository, one run a size (memory is not noisy), and its growth per extra
   record between sizes. Beyond a few thousand records the run's index goes to disk
   (``emgate.spill``): from there on the figure should stay flat. It runs before section 6:
   Linux counts in a child's peak the resident memory of the parent it was forked from, and
   section 6 loads the kernel into this process.
6. In process: the sweep rate of the scalar path (validation + all rules, one variant at a
   time) against the vectorised magnetic and electrical path on arrays of variants.
"""

from __future__ import annotations

import argparse
import os
import re
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
EXAMPLES = ROOT / "examples" / "design-repo"
ONE = EXAMPLES / "designs" / "pump-drive-4p36s.yaml"
FLOOR = "import yaml, numpy, pydantic, pluggy"
#: The libraries as emgate uses them, printed beside the floor for what part of a check is
#: emgate's own: pydantic imports its model machinery lazily, on the first use of BaseModel
#: (the floor does not load it, a check must), and emgate's command line asks numpy's BLAS
#: for one thread (the same call here), which makes numpy's import cheaper.
FLOOR_AS_USED = (
    "from emgate.startup import one_blas_thread; one_blas_thread(); "
    "import yaml, numpy, pluggy; from pydantic import BaseModel"
)
#: The many-record sections check with remedies off: the bundled servo fails on purpose, and
#: the search for its remedies (bench/remedies.py measures it) would swamp the check itself.
NO_REMEDIES = ["--remedies", "off"]


@dataclass
class Sample:
    cpu: list[float] = field(default_factory=list)
    wall: list[float] = field(default_factory=list)
    rss: list[int] = field(default_factory=list)  # KiB, peak of the child

    def median_cpu(self) -> float:
        return statistics.median(self.cpu)

    def median_wall(self) -> float:
        return statistics.median(self.wall)

    def median_rss(self) -> float:
        return statistics.median(self.rss)


def child(cmd: list[str], cwd: Path | None = None) -> tuple[float, float, int]:
    """CPU seconds (user + system, the child's and its reaped children's), wall seconds and
    peak resident KiB of one run of ``cmd``."""
    start = time.perf_counter()
    proc = subprocess.Popen(cmd, cwd=cwd, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    _, _, usage = os.wait4(proc.pid, 0)
    proc.returncode = 0  # reaped here, not by Popen
    wall = time.perf_counter() - start
    return usage.ru_utime + usage.ru_stime, wall, usage.ru_maxrss


def interleave(
    commands: dict[str, tuple[list[str], Path | None]], rounds: int
) -> dict[str, Sample]:
    """Run every command once per round, in turn; one warm-up round is discarded."""
    samples = {name: Sample() for name in commands}
    for r in range(rounds + 1):
        for name, (cmd, cwd) in commands.items():
            cpu, wall, rss = child(cmd, cwd)
            if r:
                samples[name].cpu.append(cpu)
                samples[name].wall.append(wall)
                samples[name].rss.append(rss)
    return samples


def make_repository(where: Path, n: int) -> list[Path]:
    """A design repository of ``n`` records: the bundled examples in turn, each with its own
    id and a stack length varied by up to +-2 %, plus the bundled materials and config."""
    shutil.copytree(EXAMPLES / "materials", where / "materials")
    shutil.copy(EXAMPLES / "emgate.yaml", where / "emgate.yaml")
    (where / "designs").mkdir()
    bases = [(p.stem, p.read_text()) for p in sorted((EXAMPLES / "designs").glob("*.yaml"))]
    out = []
    for i in range(n):
        stem, text = bases[i % len(bases)]
        rid = f"{stem}-v{i:05d}"
        text = re.sub(r"^id: .*$", f"id: {rid}", text, count=1, flags=re.MULTILINE)

        def vary(m: re.Match[str], i: int = i) -> str:
            return f"stack_length: {float(m.group(1)) * (1 + ((i % 41) - 20) / 1000):.3f} mm"

        text = re.sub(r"stack_length: ([0-9.]+) mm", vary, text, count=1)
        path = where / "designs" / f"{rid}.yaml"
        path.write_text(text)
        out.append(path)
    return out


def ci_formats(tmp: str, name: str) -> list[str]:
    """The formats of the CI templates' check, the file reports in a folder of their own
    (outside the repositories: --changed-since must not see them)."""
    where = Path(tmp) / f"reports-{name}"
    where.mkdir(exist_ok=True)
    return [
        *("--format", "text"),
        *("--format", f"sarif:{where / 'emgate.sarif'}"),
        *("--format", f"junit:{where / 'emgate-junit.xml'}"),
        *("--format", f"codequality:{where / 'emgate-codequality.json'}"),
    ]


def git(where: Path, *args: str) -> None:
    subprocess.run(
        ["git", "-c", "user.name=bench", "-c", "user.email=bench@localhost", *args],
        cwd=where,
        check=True,
        stdout=subprocess.DEVNULL,
        stderr=subprocess.DEVNULL,
    )


def has_option(exe: str, option: str) -> bool:
    out = subprocess.run([exe, "check", "--help"], capture_output=True, text=True, check=False)
    return option in out.stdout


def line(label: str, s: Sample, ref: Sample | None = None, ref_name: str = "") -> None:
    ratio = f"{s.median_cpu() / ref.median_cpu():6.2f} x {ref_name}" if ref else ""
    print(
        f"  {label:<44} cpu {s.median_cpu() * 1e3:8.1f} ms  wall {s.median_wall() * 1e3:8.1f} ms"
        f"  rss {s.median_rss() / 1024:6.1f} MiB  {ratio}"
    )


def rate(fn: Callable[[], int], seconds: float = 1.0) -> float:
    """Items per CPU second of ``fn`` (which returns how many items it did), run repeatedly
    for about ``seconds``; the median of the per-call rates."""
    fn()  # warm
    rates: list[float] = []
    end = time.process_time() + seconds
    while time.process_time() < end or len(rates) < 3:
        t0 = time.process_time()
        n = fn()
        rates.append(n / max(time.process_time() - t0, 1e-9))
    return statistics.median(rates)


def sweep_rates(n: int) -> None:
    try:
        from emgate.sweep import bench_rates
    except ImportError:
        print("  (emgate.sweep not installed in this environment)")
        return
    for label, (value, unit) in bench_rates(ONE, n, rate).items():
        print(f"  {label:<44} {value:12,.0f} {unit}")


def compile_bytecode() -> list[str]:
    """Byte-compile emgate, its rules and the installed packs, as pip does when it installs a
    wheel: an editable install (or PYTHONDONTWRITEBYTECODE) would otherwise leave every
    start-up compiling emgate's sources, which a user's installation never does."""
    import compileall
    import importlib.util
    from importlib.metadata import entry_points

    names = {"emgate", "emgate_rules"}
    names |= {ep.value.split(":")[0].split(".")[0] for ep in entry_points(group="emgate.plugins")}
    done = []
    for name in sorted(names):
        spec = importlib.util.find_spec(name)
        for folder in (spec.submodule_search_locations or []) if spec else []:
            compileall.compile_dir(folder, quiet=1)
            done.append(name)
    return done


def memory_by_size(exe: str, sizes: list[int], serial: list[str]) -> None:
    """Section 5: the peak memory of one check a size, and its growth per extra record."""
    peaks: list[tuple[int, int]] = []  # (records, peak resident KiB)
    for size in sizes:
        with tempfile.TemporaryDirectory() as tmp:
            make_repository(Path(tmp), size)
            _, wall, rss = child([exe, "check", *serial, *NO_REMEDIES, "designs"], Path(tmp))
        grow = ""
        if peaks:
            before, was = peaks[-1]
            grow = f"  {(rss - was) / (size - before):+7.3f} KiB per extra record from {before:,}"
        print(f"  {size:>7,} records   peak rss {rss / 1024:6.1f} MiB  wall {wall:6.1f} s{grow}")
        peaks.append((size, rss))
    if len(peaks) > 1:
        # the verdict from the two largest sizes: the caches of a run (parsed quantities, the
        # index's page cache) fill over the first few thousand records, once
        (first, low), (last, high) = peaks[-2], peaks[-1]
        per = (high - low) / (last - first)
        verdict = "grows" if per > 0.05 else "does not grow"  # 0.05 KiB: 1 MiB in 20,000
        print(f"  {first:,} -> {last:,} records: {per:+.3f} KiB per extra record: it {verdict}")


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--rounds", type=int, default=7)
    ap.add_argument("--records", type=int, default=1000)
    ap.add_argument("--variants", type=int, default=4000, help="array size of the sweep section")
    ap.add_argument(
        "--memory-sizes",
        type=lambda text: [int(n) for n in text.split(",")],
        default=[1000, 4000, 16000, 32000],
        help="record counts of the memory section, comma-separated",
    )
    ap.add_argument("--memory-only", action="store_true", help="run the memory section alone")
    args = ap.parse_args()
    exe = shutil.which("emgate") or sys.exit("emgate is not installed in this environment")
    cores = len(os.sched_getaffinity(0)) if hasattr(os, "sched_getaffinity") else os.cpu_count()
    jobs = has_option(exe, "--jobs")
    n, quarter = args.records, max(args.records // 4, 1)
    print(f"emgate bench: {args.rounds} rounds, medians; {cores} cores; CPU = user + system")
    print(f"bytecode compiled beforehand, as a wheel install does: {', '.join(compile_bytecode())}")
    serial = ["--jobs", "1"] if jobs else []
    if args.memory_only:
        print(f"\n5. peak memory by size ({'--jobs 1' if jobs else 'serial'}, --remedies off)")
        memory_by_size(exe, args.memory_sizes, serial)
        return
    with tempfile.TemporaryDirectory() as tmp:
        big, small = Path(tmp) / "big", Path(tmp) / "small"
        big.mkdir()
        small.mkdir()
        records = make_repository(big, n)
        make_repository(small, quarter)
        git(big, "init", "-q")
        git(big, "add", "-A")
        git(big, "commit", "-q", "-m", "records")
        changed = records[len(records) // 2]
        changed_kind = changed.stem.rsplit("-v", 1)[0]
        changed.write_text(changed.read_text().replace("title: ", "title: (changed) ", 1))
        alone = Path(tmp) / "alone"  # the changed record, checked on its own
        make_repository(alone, 0)
        shutil.copy(changed, alone / "designs" / changed.name)
        commands: dict[str, tuple[list[str], Path | None]] = {
            "floor": ([sys.executable, "-c", FLOOR], None),
            "floor_used": ([sys.executable, "-c", FLOOR_AS_USED], None),
            "one": ([exe, "check", str(ONE)], None),
            "small": ([exe, "check", *serial, *NO_REMEDIES, "designs"], small),
            "big": ([exe, "check", *serial, *NO_REMEDIES, "designs"], big),
            "changed": ([exe, "check", *NO_REMEDIES, "--changed-since", "HEAD"], big),
            "alone": ([exe, "check", *NO_REMEDIES, f"designs/{changed.name}"], alone),
            # the formats the CI templates write (emgate init), every report file kept
            "small_ci": (
                [exe, "check", *serial, *NO_REMEDIES, *ci_formats(tmp, "small"), "designs"],
                small,
            ),
            "big_ci": (
                [exe, "check", *serial, *NO_REMEDIES, *ci_formats(tmp, "big"), "designs"],
                big,
            ),
        }
        if jobs:
            commands["parallel"] = (
                [exe, "check", "--jobs", str(cores), *NO_REMEDIES, "designs"],
                big,
            )
        s = interleave(commands, args.rounds)
    floor, one = s["floor"], s["one"]
    print("\n1. start-up")
    line(f'floor: python -c "{FLOOR}"', floor)
    line("floor as used (BaseModel, one BLAS thread)", s["floor_used"], floor, "floor")
    line("emgate check, one record", one, floor, "floor (target <= 1.5)")
    line("emgate check, one record", one, s["floor_used"], "floor as used")
    print(f"\n2. many records ({'--jobs 1' if jobs else 'serial'}, --remedies off)")
    line(f"emgate check, {quarter} records", s["small"], one, "one")
    line(f"emgate check, {n} records", s["big"], one, "one")
    slope = (s["big"].median_cpu() - s["small"].median_cpu()) / (n - quarter)
    beyond = (s["big"].median_cpu() - one.median_cpu()) / n
    print(
        f"  CPU per record, slope {quarter} -> {n}:            {slope * 1e3:6.2f} ms (target <= 2)"
    )
    print(f"  CPU per record beyond one check, {n} records:  {beyond * 1e3:6.2f} ms")
    # This machine's speed varies from day to day by up to two times: the slope in units of
    # the floor compares runs of different days (a day's floor scales both alike).
    per_mille = slope / floor.median_cpu() * 1e3
    print(f"  the slope, per mille of the floor:             {per_mille:6.2f}")
    grow = (s["big"].median_rss() - s["small"].median_rss()) / (n - quarter)
    print(f"  peak memory per extra record:                  {grow:6.2f} KiB")
    grow = (s["big_ci"].median_rss() - s["small_ci"].median_rss()) / (n - quarter)
    print(f"  the same, text + SARIF + JUnit + code quality: {grow:6.2f} KiB")
    print(f"\n3. --changed-since HEAD, one of {n} records changed")
    line(f"the changed record alone ({changed_kind})", s["alone"], one, "one")
    line("emgate check --changed-since HEAD", s["changed"], s["alone"], "alone (target <= 1.2)")
    line("emgate check --changed-since HEAD", s["changed"], one, "one")
    if jobs:
        print(f"\n4. --jobs, {n} records")
        line("--jobs 1", s["big"])
        line(f"--jobs {cores}", s["parallel"], s["big"], "--jobs 1 (CPU)")
        speed = s["big"].median_wall() / s["parallel"].median_wall()
        print(f"  wall-time speed-up --jobs {cores} over --jobs 1:       {speed:6.2f} x")
    else:
        print("\n4. --jobs: not available in this emgate")
    print(f"\n5. peak memory by size ({'--jobs 1' if jobs else 'serial'}, --remedies off)")
    memory_by_size(exe, args.memory_sizes, serial)  # (before section 6: see the notes above)
    print(f"\n6. sweep rates in process ({args.variants} variants a call), per CPU second")
    sweep_rates(args.variants)


if __name__ == "__main__":
    main()
