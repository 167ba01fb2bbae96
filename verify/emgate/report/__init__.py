"""Reporters: each turns a RunResult into one output format.

Every output names the rules that ran and their versions, and carries the reminder that results
support, and do not replace, a qualified engineer's review.
"""

from __future__ import annotations

from collections.abc import Callable

from emgate.findings import RunResult

Reporter = Callable[[RunResult], str]


def reporter(name: str) -> Reporter:
    """The reporter function for a format name (imported on demand, to keep start-up lean)."""
    if name == "text":
        from emgate.report.text import render
    elif name == "json":
        from emgate.report.jsonfmt import render
    else:
        raise KeyError(name)
    return render


FORMATS = ("text", "json")
