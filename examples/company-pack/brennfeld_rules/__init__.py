"""Invented demo pack: one company rule, registered like any third-party plugin."""

from __future__ import annotations

from collections.abc import Iterable

from pydantic import Field

from emgate.hookspecs import hookimpl
from emgate.model import AnyDesign
from emgate.rule import Check, Context, Options, Problem, Rule


class StackAspectOptions(Options):
    minimum: float = Field(default=0.6, gt=0, description="smallest stack length / bore")
    maximum: float = Field(default=1.6, gt=0, description="largest stack length / bore")


class StackAspect(Rule):
    """Stack length over bore diameter within the range the shop's tooling handles.

    lambda = l / D. The defaults 0.6 to 1.6 are this (invented) company's tooling limits for
    its winding and stacking lines, not a physical law (common practice, no source).
    """

    id = "brennfeld/stack-aspect"
    summary = "stack length over bore diameter within the shop's tooling range"
    version = "1.2"
    tags = ("manufacturing",)
    severity = "warning"
    options = StackAspectOptions

    def check(
        self, design: AnyDesign, options: Options, context: Context
    ) -> Iterable[Check | Problem]:
        assert isinstance(options, StackAspectOptions)
        ratio = design.stator.stack_length / design.stator.bore_diameter
        for limit, bound in ((options.maximum, "max"), (options.minimum, "min")):
            yield Check(
                quantity="stator.aspect_ratio",
                label="stack length / bore",
                path=("stator", "stack_length"),
                value=ratio,
                limit=limit,
                bound=bound,  # type: ignore[arg-type]
                unit="",
                basis="Brennfeld tooling range",
            )


@hookimpl
def emgate_rules() -> list[type[Rule]]:
    return [StackAspect]
