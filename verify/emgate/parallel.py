"""``--jobs``: a function mapped over the records in worker processes, results in order.

The workers are forked from the run, so that they share what it has loaded (plugins,
policy, the materials catalogue: loaded once per run) and nothing is pickled on the way in;
only each record's result comes back. Results are yielded in the order of the inputs, one
at a time, so that a parallel run reports exactly what a serial run does and the caller
need not hold them all. Where the platform cannot fork (Windows, macOS by default), or the
work is too small to pay for the workers, the map runs in this process.
"""

from __future__ import annotations

import os
from collections.abc import Callable, Iterator, Sequence
from typing import Any, TypeVar

T = TypeVar("T")
R = TypeVar("R")

#: Below this many items a worker process costs more than it saves [common practice, no
#: source: a fork and a pickled result cost a few ms; one record costs a few ms].
MIN_ITEMS_PER_WORKER = 16

# The work of the current map, inherited by the forked workers (set only while it runs).
_WORK: tuple[Callable[[Any], Any], Sequence[Any]] | None = None


def available_cores() -> int:
    """The cores this process may run on (its affinity where the platform says)."""
    if hasattr(os, "sched_getaffinity"):
        return max(1, len(os.sched_getaffinity(0)))
    return max(1, os.cpu_count() or 1)


def workers_for(items: int, jobs: int) -> int:
    """How many worker processes ``jobs`` gives for ``items`` (0: run in this process)."""
    n = min(jobs, items // MIN_ITEMS_PER_WORKER)
    if n < 2:
        return 0
    import multiprocessing  # here: a check of a few records starts no worker

    return n if "fork" in multiprocessing.get_all_start_methods() else 0


def _call(index: int) -> Any:
    assert _WORK is not None
    fn, items = _WORK
    return fn(items[index])


def ordered_map(fn: Callable[[T], R], items: list[T], jobs: int) -> Iterator[R]:
    """``fn`` over ``items``, in order, in up to ``jobs`` forked processes.

    In this process the list is emptied as it goes: an item is dropped once it is done, so
    that a run of many records holds those not yet checked, not all of them. (With workers
    the parent keeps the list: a worker the pool starts anew forks from it.)
    """
    global _WORK
    workers = workers_for(len(items), jobs)
    if not workers:
        items.reverse()
        while items:
            yield fn(items.pop())
        return
    # chunks big enough to amortise the round trip, small enough to balance the workers
    chunk = max(1, min(32, len(items) // (workers * 8)))
    _WORK = (fn, items)
    try:
        import multiprocessing

        with multiprocessing.get_context("fork").Pool(workers) as pool:
            yield from pool.imap(_call, range(len(items)), chunksize=chunk)
    finally:
        _WORK = None
