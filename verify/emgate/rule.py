"""The rule API: what a rule declares and what it yields.

A rule is a class with an id, a one-line summary, the machine kinds it applies to, a default
severity, a pydantic model of its options, and ``check(design, options, context)``, which yields
:class:`Check` (a recomputed quantity compared with a limit) and :class:`Problem` (a finding with
no number). The engine turns failed checks and problems into findings at the rule's severity,
and keeps passed checks so that a report shows what was verified, not only what failed.
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from dataclasses import dataclass
from typing import TYPE_CHECKING, ClassVar, Literal

from pydantic import BaseModel, ConfigDict

from emgate.model import MACHINE_KINDS
from emgate.terms import RecordPath, Severity

if TYPE_CHECKING:
    from emgate.calc import Calculation
    from emgate.model import AnyDesign


class Options(BaseModel):
    """Base of every rule's options model: unknown keys are errors."""

    model_config = ConfigDict(extra="forbid", frozen=True)


@dataclass(frozen=True)
class Check:
    """A recomputed quantity compared with a limit.

    ``value`` and ``limit`` are SI; ``unit`` is the unit in which a report shows them.
    ``path`` is the record path that drives the quantity (where a designer would change it).
    """

    quantity: str
    label: str
    path: RecordPath
    value: float
    limit: float
    bound: Literal["max", "min"]
    unit: str
    basis: str = ""

    @property
    def passed(self) -> bool:
        if not math.isfinite(self.value):
            return False
        return self.value <= self.limit if self.bound == "max" else self.value >= self.limit

    @property
    def margin(self) -> float:
        """Relative margin to the limit: positive inside, negative beyond."""
        if not math.isfinite(self.value) or self.limit == 0.0:
            return -math.inf if not self.passed else math.inf
        rel = (self.limit - self.value) / abs(self.limit)
        return rel if self.bound == "max" else -rel


@dataclass(frozen=True)
class Problem:
    """A finding with no quantity (an unbalanced winding, an unknown declared name)."""

    path: RecordPath
    message: str
    severity: Severity | None = None


@dataclass(frozen=True)
class Context:
    """What a rule may use besides the design: the shared calculation and the file."""

    calc: Calculation
    file: str


class Rule:
    """Base class of a rule. Subclass, set the class attributes, implement :meth:`check`.

    The class docstring is the rule's method statement, shown by ``emgate explain``: give the
    formulas and the published sources of the method and of each default limit.
    """

    id: ClassVar[str]
    summary: ClassVar[str]
    version: ClassVar[str] = "1"
    machines: ClassVar[tuple[str, ...]] = MACHINE_KINDS
    severity: ClassVar[Severity] = "error"
    tags: ClassVar[tuple[str, ...]] = ()
    options: ClassVar[type[Options]] = Options

    @classmethod
    def applies(cls, design: AnyDesign) -> bool:
        """Whether the rule applies to this record beyond its machine kinds (default: yes);
        a rule that does not apply is reported as not applicable, not as passed."""
        return True

    def check(
        self, design: AnyDesign, options: Options, context: Context
    ) -> Iterable[Check | Problem]:
        raise NotImplementedError

    @classmethod
    def explain(cls) -> str:
        import inspect

        return inspect.cleandoc(cls.__doc__ or cls.summary)
