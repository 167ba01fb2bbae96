"""Reporters: each turns a RunResult into one output format.

Every output names the rules that ran and their versions, and carries the reminder that results
support, and do not replace, a qualified engineer's review.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable
from typing import TYPE_CHECKING

if TYPE_CHECKING:  # the CLI imports FORMATS before it knows what it will run
    from emgate.findings import RunResult

Reporter = Callable[["RunResult"], str]
Writer = Callable[["RunResult"], Iterable[str]]


# format name -> module under emgate.report, imported on demand to keep start-up lean
_MODULES = {
    "text": "text",
    "json": "jsonfmt",
    "sarif": "sarif",
    "junit": "junit",
    "annotations": "annotations",
    "codequality": "codequality",
    "markdown": "markdown",
}


def reporter(name: str) -> Reporter:
    """The reporter function for a format name (imported on demand, to keep start-up lean)."""
    from importlib import import_module

    return import_module(f"emgate.report.{_MODULES[name]}").render


def writer(name: str) -> Writer:
    """The report of a format in pieces, in order: the reporter's ``chunks`` where it writes
    as it reads (a spooled run, :class:`~emgate.findings.Spool`), else its whole text."""
    from importlib import import_module

    module = import_module(f"emgate.report.{_MODULES[name]}")
    chunks = getattr(module, "chunks", None)
    if chunks is not None:
        return chunks
    return lambda result: [module.render(result)]


FORMATS = tuple(_MODULES)
