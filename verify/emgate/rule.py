"""The rule API: what a rule declares, what it reads and what it yields.

A rule is a class with an id, a one-line summary, the machine kinds it applies to, a default
severity, a pydantic model of its options (the type parameter of :class:`Rule`), and
``check(design, options, context)``, which yields :class:`Check` (a sheet quantity compared
with a limit) and :class:`Problem` (a finding with no number). The engine turns failed checks
and problems into findings at the rule's severity, and keeps passed checks so that a report
shows what was verified, not only what failed.

Packs import all of this from :mod:`emgate.api`, not from here.
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any, ClassVar, Generic, Literal, TypeVar, get_args, get_origin

from pydantic import BaseModel, ConfigDict, Field

from emgate.model import MACHINE_KINDS
from emgate.terms import RecordPath, Severity

if TYPE_CHECKING:
    from emgate.calc.view import Sheet
    from emgate.model import AnyDesign

Bound = Literal["max", "min"]

#: The basis of a limit the team set in its configuration.
TEAM_LIMIT = "the team's limit (emgate.yaml)"
_SOURCE_KEY = "default_source"


def limit(value: float, unit: str, source: str, **constraints: float) -> Any:
    """Declare a default limit once: its value in ``unit``, and where it comes from.

    Use it as the default of an options field: ``stator: FluxDensity = limit(2.1, "T",
    "Pyrhonen et al., Table 6.1 (from memory)")``. The field's default is the SI value; its
    JSON Schema description and what ``emgate explain`` prints name the source; and
    :meth:`Options.limit_for` gives the limit with its basis for a finding: the source while
    the team keeps the default, "the team's limit (emgate.yaml)" once it sets its own.
    ``constraints`` are pydantic's (``le=0.91``). A unit that does not match the field's
    dimension is an error when the options class is defined.
    """
    from emgate.units import parse_quantity

    text = repr(float(value)) if unit in ("", "1") else f"{float(value)!r} {unit}"
    # 15 significant figures: the decimal SI value, not the unit factor's last-bit rounding
    si = float(value) if unit in ("", "1") else float(f"{parse_quantity(text).value:.15g}")
    extra: dict[str, Any] = {
        "description": f"default from {source}",
        "json_schema_extra": {_SOURCE_KEY: source, "default_text": text},
        **constraints,
    }
    return Field(si, **extra)


@dataclass(frozen=True, slots=True)
class Limit:
    """A limit [SI] and its basis, the words a finding gives for where it comes from."""

    value: float
    basis: str = ""


class Options(BaseModel):
    """Base of every rule's options model: unknown keys are errors, instances are frozen."""

    model_config = ConfigDict(extra="forbid", frozen=True)

    @classmethod
    def __pydantic_init_subclass__(cls, **kwargs: Any) -> None:
        super().__pydantic_init_subclass__(**kwargs)
        for name, info in cls.model_fields.items():
            extra = info.json_schema_extra
            if not isinstance(extra, dict) or _SOURCE_KEY not in extra:
                continue
            text = str(extra["default_text"])
            data: Any = float(text) if " " not in text else text
            try:  # the declared unit must be one the field itself accepts
                parsed = cls.model_validate({name: data})
            except Exception as exc:
                raise TypeError(f"{cls.__name__}.{name}: default {text!r}: {exc}") from None
            if not math.isclose(getattr(parsed, name), info.default, rel_tol=1e-12):
                raise TypeError(f"{cls.__name__}.{name}: default {text!r} does not round-trip")

    @classmethod
    def source_of(cls, field: str) -> str | None:
        """The declared source of a field's default limit, None for a plain option."""
        extra = cls.model_fields[field].json_schema_extra
        return str(extra[_SOURCE_KEY]) if isinstance(extra, dict) and _SOURCE_KEY in extra else None

    def basis(self, field: str) -> str:
        """Where the limit in ``field`` comes from: its declared source while it is the
        default, else the team's configuration. A limit the team writes in other units ('45
        %', '0.2 mm') may differ from the default in the last bit only; that is still the
        default."""
        source = self.source_of(field)
        value, default = getattr(self, field), type(self).model_fields[field].default
        if (
            source is not None
            and isinstance(value, float)
            and math.isclose(value, default, rel_tol=1e-12, abs_tol=0.0)
        ):
            return source
        return TEAM_LIMIT

    def limit_for(self, field: str) -> Limit:
        """The limit in ``field`` with its basis."""
        return Limit(float(getattr(self, field)), self.basis(field))


@dataclass(frozen=True, slots=True)
class Check:
    """A recomputed quantity compared with a limit.

    ``quantity`` is a calculation-sheet name; ``value`` and ``limit`` are SI; ``unit`` is the
    unit in which a report shows them. ``path`` is the record path that drives the quantity
    (where a designer would change it). Build one with :meth:`Context.check`, which takes
    the value and unit from the sheet.
    """

    quantity: str
    label: str
    path: RecordPath
    value: float
    limit: float
    bound: Bound
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


@dataclass(frozen=True, slots=True)
class Problem:
    """A finding with no quantity (an unbalanced winding, an unknown declared name)."""

    path: RecordPath
    message: str
    severity: Severity | None = None


@dataclass(frozen=True)
class Context:
    """What a rule may use besides the design: the read-only calculation sheet and the file."""

    sheet: Sheet
    file: str
    #: Variants of this record through validation and the other rules
    #: (:class:`emgate.variants.Evaluator`), for a rule that judges the record across its
    #: tolerances; None outside a run.
    variants: Any = None

    def check(
        self,
        name: str,
        limit: Limit,
        bound: Bound,
        *,
        path: RecordPath,
        label: str | None = None,
        value: float | None = None,
    ) -> Check:
        """A :class:`Check` of the sheet quantity ``name`` against ``limit``.

        The value and the unit come from the sheet; the label defaults to the name. Give
        ``value`` only for a value derived from the named quantity that the sheet cannot
        hold (its magnitude, or the quantity at a current the team's options choose).
        """
        entry = self.sheet.entry(name)
        return Check(
            quantity=name,
            label=label or name,
            path=path,
            value=self.sheet[name] if value is None else value,
            limit=limit.value,
            bound=bound,
            unit="" if entry.unit == "1" else entry.unit,
            basis=limit.basis,
        )


def winding_path(design: AnyDesign) -> RecordPath:
    """Where a winding finding points: the explicit slot table, or the winding."""
    return ("winding", "layout") if design.winding.layout else ("winding",)


OptionsT = TypeVar("OptionsT", bound=Options)


class Rule(Generic[OptionsT]):
    """Base class of a rule: subclass ``Rule[MyOptions]``, set the class attributes and
    implement :meth:`check`, which then receives a ``MyOptions``.

    The class docstring is the rule's method statement, shown by ``emgate explain``: give the
    formulas and the published sources of the method and of each default limit.
    """

    id: ClassVar[str]
    summary: ClassVar[str]
    version: ClassVar[str] = "1"
    machines: ClassVar[tuple[str, ...]] = MACHINE_KINDS
    severity: ClassVar[Severity] = "error"
    tags: ClassVar[tuple[str, ...]] = ()
    #: The options model; set from the type parameter (``Rule[MyOptions]``).
    options: ClassVar[type[Options]] = Options
    #: A rule whose quantities mean nothing for an unbalanced winding (one that
    #: winding-balance reports) is not run on one; the engine reports it as not computed.
    #: Other rules run; a quantity the kernel cannot compute for an unbalanced winding
    #: ends the rule with a located finding at its severity (the checks before it stand).
    needs_balanced_winding: ClassVar[bool] = False

    def __init_subclass__(cls, **kwargs: Any) -> None:
        super().__init_subclass__(**kwargs)
        if "options" in cls.__dict__:
            return
        for base in getattr(cls, "__orig_bases__", ()):
            if get_origin(base) is Rule:
                (model,) = get_args(base)
                if isinstance(model, type) and issubclass(model, Options):
                    cls.options = model

    @classmethod
    def applies(cls, design: AnyDesign) -> bool:
        """Whether the rule applies to this record beyond its machine kinds (default: yes);
        a rule that does not apply is reported as not applicable, not as passed."""
        return True

    def check(
        self, design: AnyDesign, options: OptionsT, context: Context
    ) -> Iterable[Check | Problem]:
        raise NotImplementedError

    @classmethod
    def explain(cls) -> str:
        import inspect

        return inspect.cleandoc(cls.__doc__ or cls.summary)
