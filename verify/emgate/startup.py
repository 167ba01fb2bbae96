"""What the command line sets for its own process before anything heavy is imported, and
undoes once start-up is over. Nothing here runs when a program imports emgate."""

from __future__ import annotations

import gc
import os

#: What numpy's BLAS reads for its thread count (OpenBLAS, in the wheels on PyPI), in its order.
BLAS_THREAD_SETTINGS = ("OPENBLAS_NUM_THREADS", "GOTO_NUM_THREADS", "OMP_NUM_THREADS")


def one_blas_thread(environ: dict[str, str] | os._Environ[str] = os.environ) -> None:
    """Ask numpy's BLAS for one thread, unless the user chose a count.

    OpenBLAS starts a thread per core when numpy is imported, and each waits for work by
    spinning for a while before it sleeps: about 90 ms of CPU on the other core of this
    2-core machine, on every run, more with more cores. emgate makes no call that a BLAS
    thread would speed up (its arrays are small, its sweeps elementwise) and ``--jobs``
    works by processes, which inherit this. Must run before numpy is first imported.
    """
    if not any(environ.get(name) for name in BLAS_THREAD_SETTINGS):
        environ["OPENBLAS_NUM_THREADS"] = "1"


_gc_held = False


def hold_gc() -> None:
    """No cyclic garbage collection while emgate starts up (the pattern of Python's
    ``gc.freeze`` documentation): start-up builds the long-lived objects of a run, modules,
    classes and models. In a one-record check here it ran about a hundred collections that
    freed some 700 objects in all, and holding them saves about 30 ms of 220 of CPU. What
    start-up leaves unreachable (about a thousand objects, the argument parser's cycles
    mostly) is frozen with the rest and never freed: a collection first would cost 15 ms."""
    global _gc_held
    if gc.isenabled():
        gc.disable()
        _gc_held = True


def started() -> None:
    """Start-up is over: what it built moves to the permanent generation (no later
    collection walks it), and collection resumes for the records. A no-op unless
    :func:`hold_gc` held it (a program that imports emgate keeps its own setting)."""
    global _gc_held
    if _gc_held:
        gc.freeze()
        gc.enable()
        _gc_held = False
