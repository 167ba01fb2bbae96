"""Invented demo pack: one company rule, registered like any third-party plugin.

A pack imports from ``emgate.api`` only: the rest of emgate is internal.
"""

from __future__ import annotations

from collections.abc import Iterable

from emgate.api import AnyDesign, Check, Context, Options, Problem, Ratio, Rule, hookimpl, limit

#: This (invented) company's tooling limits for its winding and stacking lines, not a
#: physical law.
TOOLING = "Brennfeld tooling range"


class StackAspectOptions(Options):
    minimum: Ratio = limit(0.6, "1", TOOLING)  # smallest stack length / bore
    maximum: Ratio = limit(1.6, "1", TOOLING)  # largest stack length / bore


class StackAspect(Rule[StackAspectOptions]):
    """Stack length over bore diameter within the range the shop's tooling handles.

    lambda = l / D (the calculation sheet's `stator.aspect_ratio`). The defaults 0.6 to 1.6
    are this (invented) company's tooling limits for its winding and stacking lines, not a
    physical law (common practice, no source).
    """

    id = "brennfeld/stack-aspect"
    summary = "stack length over bore diameter within the shop's tooling range"
    version = "1.2"
    tags = ("manufacturing",)
    severity = "warning"

    def check(
        self, design: AnyDesign, options: StackAspectOptions, context: Context
    ) -> Iterable[Check | Problem]:
        for field, bound in (("maximum", "max"), ("minimum", "min")):
            yield context.check(
                "stator.aspect_ratio",
                options.limit_for(field),
                bound,  # type: ignore[arg-type]
                path=("stator", "stack_length"),
                label="stack length / bore",
            )


@hookimpl
def emgate_rules() -> list[type[Rule[StackAspectOptions]]]:
    return [StackAspect]
