"""``--jobs``: a function mapped over the records in worker processes, results in order.

The workers are forked from the run, so that they share what it has loaded (plugins,
policy, the materials catalogue: loaded once per run); only the items (a record's name) are
pickled on the way in, a few batches ahead of the results, and each record's result comes
back. Results are yielded in the order of the inputs, one at a time, so that a parallel run
reports exactly what a serial run does and neither side need hold them all. Where the
platform cannot fork (Windows, macOS by default), or the work is too small to pay for the
workers, the map runs in this process.
"""

from __future__ import annotations

import os
from collections.abc import Callable, Iterator
from itertools import islice
from typing import TYPE_CHECKING, Any, TypeVar

if TYPE_CHECKING:
    from emgate.spill import SpillQueue

T = TypeVar("T")
R = TypeVar("R")

#: Below this many items a worker process costs more than it saves [common practice, no
#: source: a fork and a pickled result cost a few ms; one record costs a few ms].
MIN_ITEMS_PER_WORKER = 16

# The function of the current map, inherited by the forked workers (set only while it runs).
_WORK: Callable[[Any], Any] | None = None


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


def _ignore_interrupt() -> None:
    """A worker leaves Ctrl-C to the run's process, which ends the pool (each worker would
    print the traceback of its own KeyboardInterrupt)."""
    import signal

    signal.signal(signal.SIGINT, signal.SIG_IGN)


def _call(item: Any) -> Any:
    assert _WORK is not None
    return _WORK(item)


def _drained(items: list[T] | SpillQueue[T]) -> Iterator[T]:
    """The items in order, each dropped as it is taken: a list is emptied as it goes (any
    other collection, a run's :class:`~emgate.spill.SpillQueue`, drains as it is read)."""
    if not isinstance(items, list):
        yield from items
        return
    items.reverse()
    while items:
        yield items.pop()


def ordered_map(fn: Callable[[T], R], items: list[T] | SpillQueue[T], jobs: int) -> Iterator[R]:
    """``fn`` over ``items``, in order, in up to ``jobs`` forked processes.

    The items are emptied as they go (:func:`_drained`): a run of many records holds those
    not yet checked, or with workers a few batches of them, not all of them.
    """
    global _WORK
    workers = workers_for(len(items), jobs)
    taken = _drained(items)
    if not workers:
        yield from map(fn, taken)
        return
    # chunks big enough to amortise the round trip, small enough to balance the workers;
    # two batches in flight, so that the workers never wait for the next
    chunk = max(1, min(32, len(items) // (workers * 8)))
    batch = chunk * workers * 8
    _WORK = fn
    try:
        import multiprocessing

        with multiprocessing.get_context("fork").Pool(workers, _ignore_interrupt) as pool:

            def submit() -> Iterator[R] | None:
                part = list(islice(taken, batch))
                return pool.imap(_call, part, chunksize=chunk) if part else None

            ahead = [submit()]
            while (current := ahead.pop(0)) is not None:
                ahead.append(submit())
                yield from current
    finally:
        _WORK = None
