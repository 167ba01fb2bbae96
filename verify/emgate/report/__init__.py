"""Reporters: each turns a RunResult into one output format.

Every output names the rules that ran and their versions, and carries the reminder that results
support, and do not replace, a qualified engineer's review.
"""

from __future__ import annotations

from collections.abc import Callable
from typing import TYPE_CHECKING

if TYPE_CHECKING:  # the CLI imports FORMATS before it knows what it will run
    from emgate.findings import RunResult

Reporter = Callable[["RunResult"], str]


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


FORMATS = tuple(_MODULES)
