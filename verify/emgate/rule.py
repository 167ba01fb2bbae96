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
from functools import cache
from typing import (
    TYPE_CHECKING,
    Annotated,
    Any,
    ClassVar,
    Generic,
    Literal,
    TypeVar,
    get_args,
    get_origin,
)

from pydantic import BaseModel, ConfigDict, Field

from emgate.model import MACHINE_KINDS
from emgate.pickling import by_fields
from emgate.terms import RecordPath, Severity

if TYPE_CHECKING:
    from pydantic.fields import FieldInfo

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


_UNHANDLED = object()
#: Each options class's defaults, built once: shared where no rule can change them (frozen,
#: immutable values), else the template of each use's copy.
_DEFAULTS: dict[type[Options], Options] = {}
#: The classes among them with a mutable default (a dict): they are copied for each use.
_MUTABLE_DEFAULTS: set[type[Options]] = set()


@cache
def _limits(cls: type[Options]) -> dict[str, tuple[str | None, Any]]:
    """Per field of an options class: the declared source of its default (None for a plain
    option) and the default, read once (a finding asks for them at every check)."""
    out: dict[str, tuple[str | None, Any]] = {}
    for name, info in cls.model_fields.items():
        extra = info.json_schema_extra
        source = extra.get(_SOURCE_KEY) if isinstance(extra, dict) else None
        out[name] = (None if source is None else str(source), info.default)
    return out


def _immutable(value: object) -> bool:
    if value is None or isinstance(value, bool | int | float | str | bytes):
        return True
    return isinstance(value, tuple | frozenset) and all(_immutable(v) for v in value)


def _float_metadata(info: FieldInfo) -> list[Any] | None:
    """The metadata of a float field, optional or not (``FluxDensity | None``: its type's
    and the field's own), flattened; None for a field of any other type."""
    from annotated_types import GroupedMetadata

    metadata = list(info.metadata)
    if info.annotation is not float:
        args = [a for a in get_args(info.annotation) if a is not type(None)]
        if len(args) != 1 or get_origin(args[0]) is not Annotated:
            return None
        inner, *extra = get_args(args[0])
        if inner is not float:
            return None
        metadata = extra + metadata
    return [g for m in metadata for g in (m if isinstance(m, GroupedMetadata) else (m,))]


def _through_field(metadata: list[Any], value: Any) -> Any:
    """``value`` through a float field's quantity converters and bounds, as validation
    takes it: the default check of :class:`Options` without building the model's validator.
    :data:`_UNHANDLED` for any other metadata (a pack's own validator, say), which only
    pydantic's own path can apply."""
    from annotated_types import Ge, Gt, Le, Lt
    from pydantic import AfterValidator, BeforeValidator, WithJsonSchema

    from emgate.quantity import DimensionPattern

    validators = [m for m in metadata if isinstance(m, BeforeValidator | AfterValidator)]
    if any(getattr(m.func, "__module__", None) != "emgate.quantity" for m in validators):
        return _UNHANDLED
    for m in reversed(validators):  # pydantic runs the last-declared before validator first
        if isinstance(m, BeforeValidator):
            value = m.func(value)  # type: ignore[call-arg]
    if isinstance(value, bool) or not isinstance(value, int | float) or not math.isfinite(value):
        return _UNHANDLED
    value = float(value)
    for m in metadata:
        if isinstance(m, AfterValidator):
            value = m.func(value)  # type: ignore[call-arg]
        elif isinstance(m, Ge | Gt | Le | Lt):
            if not (
                (isinstance(m, Ge) and value >= m.ge)
                or (isinstance(m, Gt) and value > m.gt)
                or (isinstance(m, Le) and value <= m.le)
                or (isinstance(m, Lt) and value < m.lt)
            ):
                raise ValueError(f"{value!r} is outside the field's bound {m!r}")
        elif not isinstance(m, BeforeValidator | WithJsonSchema | DimensionPattern):
            return _UNHANDLED
    return value


#: Config keys of an options model that leave float validation and defaults as the base's.
_PLAIN_CONFIG = frozenset({"extra", "frozen", "defer_build", "title"})


@cache
def _plain(cls: type[Options]) -> bool:
    """Whether ``cls()`` validates nothing: no model validator, no validated default, no own
    ``__init__``, no private state, no config beyond the base's (pydantic validates neither
    defaults nor, for them, field validators). Then :meth:`Options.defaults` needs no
    validator, and the default check may take a limit through the field's converters."""
    return (
        not cls.__pydantic_decorators__.model_validators
        and set(cls.model_config) <= _PLAIN_CONFIG
        and not any(f.validate_default for f in cls.model_fields.values())
        and not any("__init__" in vars(c) for c in cls.__mro__[: cls.__mro__.index(BaseModel)])
        and not cls.__private_attributes__
    )


def _field_validated(cls: type[Options], name: str) -> bool:
    """Whether a field validator of the class applies to the field ``name``."""
    validators = cls.__pydantic_decorators__.field_validators.values()
    return any(name in v.info.fields or "*" in v.info.fields for v in validators)


class Options(BaseModel):
    """Base of every rule's options model: unknown keys are errors, instances are frozen.

    The validator is built when a team's options are first validated: a run that keeps a
    rule's defaults takes them from :meth:`defaults` and never builds it (about 1 ms a rule
    at start-up).
    """

    model_config = ConfigDict(extra="forbid", frozen=True, defer_build=True)

    @classmethod
    def __pydantic_init_subclass__(cls, **kwargs: Any) -> None:
        super().__pydantic_init_subclass__(**kwargs)
        for name, info in cls.model_fields.items():
            extra = info.json_schema_extra
            if not isinstance(extra, dict) or _SOURCE_KEY not in extra:
                continue
            text = str(extra["default_text"])
            data: Any = float(text) if " " not in text else text
            fast = _plain(cls) and not _field_validated(cls, name)
            metadata = _float_metadata(info) if fast else None
            try:  # the declared unit must be one the field itself accepts
                value: Any = _UNHANDLED if metadata is None else _through_field(metadata, data)
                if value is _UNHANDLED:  # anything else: pydantic's whole path
                    value = getattr(cls.model_validate({name: data}), name)
            except Exception as exc:
                raise TypeError(f"{cls.__name__}.{name}: default {text!r}: {exc}") from None
            if not math.isclose(value, info.default, rel_tol=1e-12):
                raise TypeError(f"{cls.__name__}.{name}: default {text!r} does not round-trip")

    @classmethod
    def defaults(cls) -> Options:
        """The options with every default, as ``cls()`` gives them: built without the
        model's validator where ``cls()`` validates nothing (:func:`_plain`), and once where
        every default is immutable too."""
        shared = _DEFAULTS.get(cls)
        if shared is not None:
            return shared if cls not in _MUTABLE_DEFAULTS else shared.model_copy(deep=True)
        if not _plain(cls) or any(f.is_required() for f in cls.model_fields.values()):
            return cls()  # its validators run; a missing required field is the error it was
        options = cls.model_construct()
        if not all(_immutable(v) for v in options.__dict__.values()):
            # (a dict option: each rule gets its own copy, built in half the time; marked
            # before it is stored, so that no caller is ever handed the template itself)
            _MUTABLE_DEFAULTS.add(cls)
            _DEFAULTS[cls] = options
            return options.model_copy(deep=True)
        _DEFAULTS[cls] = options
        return options

    @classmethod
    def source_of(cls, field: str) -> str | None:
        """The declared source of a field's default limit, None for a plain option."""
        return _limits(cls)[field][0]

    def basis(self, field: str) -> str:
        """Where the limit in ``field`` comes from: its declared source while it is the
        default, else the team's configuration. A limit the team writes in other units ('45
        %', '0.2 mm') may differ from the default in the last bit only; that is still the
        default."""
        source, default = _limits(type(self))[field]  # (what source_of gives, and the default)
        value = getattr(self, field)
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


@by_fields
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
