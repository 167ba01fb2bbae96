"""What the built-in rules do when an explicit slot table leaves a quantity undefined."""

from __future__ import annotations

import functools
from collections.abc import Callable, Iterable, Iterator
from typing import TYPE_CHECKING, Any

from emgate.rule import Check, Context, Options, Problem, Rule

if TYPE_CHECKING:
    from emgate.model import AnyDesign
    from emgate.terms import RecordPath

CheckMethod = Callable[[Any, "AnyDesign", Options, Context], Iterable[Check | Problem]]
UNBALANCED = "the winding is unbalanced (winding-balance reports why)"


def winding_path(design: AnyDesign) -> RecordPath:
    """Where a winding finding points: the explicit slot table, or the winding."""
    return ("winding", "layout") if design.winding.layout else ("winding",)


def unless_unbalanced(check: CheckMethod) -> CheckMethod:
    """Wrap a rule's ``check``: a quantity the kernel refuses to compute (a ValueError or
    ArithmeticError, e.g. no winding factor for a phase without coil sides) on a winding
    that winding-balance finds unbalanced becomes a located finding at the rule's severity,
    not a crash: the record is not verified by the rule, and the run fails (exit 1). The
    checks yielded before it stand; on a balanced winding the error propagates (a crash,
    exit 3)."""

    @functools.wraps(check)
    def guarded(
        self: Rule, design: AnyDesign, options: Options, context: Context
    ) -> Iterator[Check | Problem]:
        try:
            yield from check(self, design, options, context)
        except (ValueError, ArithmeticError) as exc:
            if not context.calc.winding_problems:
                raise
            yield Problem(
                winding_path(design),
                f"the record is not verified by this rule: {exc}; {UNBALANCED}",
            )

    return guarded
