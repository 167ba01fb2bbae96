"""Running one rule on one record, isolated: what the engine does to plugin code.

Whatever a rule does, the run goes on: an exception of any kind (SystemExit included;
only the user's own Ctrl-C stops the run), anything yielded that is not a well-formed
:class:`~emgate.rule.Check` or :class:`~emgate.rule.Problem`, or a run past its time
budget is a crash of that rule, and the items it yielded before stand. A quantity the
kernel cannot compute for an unbalanced winding, or one that needs the operating temperature
of a design in thermal run-away, ends the rule with a located finding.
"""

from __future__ import annotations

import _signal  # type: ignore[import-not-found]  # (CPython's C module; no stub)
import copy
import dataclasses
import datetime
import functools
import math
import os
import signal
import threading
import time
import traceback
from collections.abc import Callable, Iterator
from contextlib import contextmanager
from dataclasses import dataclass, field
from pathlib import Path
from types import FrameType
from typing import TYPE_CHECKING, Any, TypeVar, cast

from pydantic import BaseModel
from pydantic_core import PydanticUndefined as _UNSET

from emgate.plugins import describe_exception, users_interrupt, watching_interrupts
from emgate.rule import Check, Context, Options, Problem, Rule, winding_path
from emgate.terms import SEVERITIES
from emgate.units import QuantityError, parse_unit

if TYPE_CHECKING:
    from emgate.calc.thermal import ThermalRunaway
    from emgate.calc.view import NotComputed
    from emgate.model import AnyDesign

T = TypeVar("T")


@dataclass
class RuleRun:
    """What one rule gave on one record: its valid items, and why it crashed ('' if not)."""

    items: list[Check | Problem] = field(default_factory=list)
    crash: str = ""


def run_rule(
    rule: type[Rule],
    design: AnyDesign,
    options: Callable[[], Options],
    context: Context,
    budget: float,
    builtin: bool = False,
) -> RuleRun | None:
    """Run ``rule`` on ``design`` within ``budget`` seconds (inside :func:`rule_guards`);
    None when the rule does not apply to the record."""
    ThermalRunaway, NotComputed, UNBALANCED = _calculation_errors()
    ran = RuleRun()
    items = ran.items
    crash = ""
    try:
        with _Clock(budget, builtin) as clock:
            # A pack's rule gets its own copy of the record: the calculation and the other
            # rules read the engine's, so writing past the frozen models changes nothing
            # they see. emgate's own rules share it.
            own = design if builtin else own_copy(design)
            if design.machine not in rule.machines or not rule.applies(own):
                return None
            if rule.needs_balanced_winding and context.sheet.winding_problems:
                items.append(Problem(winding_path(design), f"not computed: {UNBALANCED}", "info"))
            else:
                for item in rule().check(own, options(), context):
                    bad = _malformed(item)
                    if bad:
                        crash = f"it yielded {bad}"
                        break
                    items.append(_normal(item))
                    clock.check()
            clock.check()  # a rule that swallowed the alarm
    except NotComputed as exc:
        items.append(
            Problem(
                winding_path(design),
                f"the record is not verified by this rule: {exc.reason}; {UNBALANCED}",
            )
        )
    except ThermalRunaway as exc:
        # The design overheats (the temperature-rise rule's finding); what depends on the
        # operating temperature (a hot magnet, hot copper) has no value to check: fail the
        # rule at the cooling, where the cause is, rather than call it emgate's crash. An
        # error whatever the rule's severity: an unverified record must not pass.
        items.append(
            Problem(
                ("cooling", "method"),
                f"the record is not verified by this rule: it needs the operating"
                f" temperature, and there is none: {exc}",
                "error",
            )
        )
    except BaseException as exc:  # a rule's SystemExit must not end the run (fail closed)
        if users_interrupt(exc):
            raise
        crash = crash_text(exc)
    ran.crash = crash
    return ran


@functools.cache
def _calculation_errors() -> tuple[type[ThermalRunaway], type[NotComputed], str]:
    """The calculation's errors a rule may end with, and the words for an unbalanced
    winding: imported at the first rule, not at start-up, and once, not at every rule."""
    from emgate.calc.thermal import ThermalRunaway
    from emgate.calc.view import UNBALANCED, NotComputed

    return ThermalRunaway, NotComputed, UNBALANCED


#: Values a copy may share: nothing in them can be changed. (Not frozenset: it may hold an
#: object that can.)
_ATOMIC = frozenset({str, int, float, bool, type(None), bytes, datetime.date})


def own_copy(design: T) -> T:
    """A deep copy of a validated record, with nothing mutable shared: equal to pydantic's
    ``model_copy(deep=True)``, in a third of its time. Unlike it, no memo: an object the
    record holds twice is copied twice (a validated record's tree of models, dicts, lists
    and scalars shares nothing and has no cycles; a cycle would end the rule as a crash)."""
    return cast(T, _copied(design))


def _copied(node: Any) -> Any:
    kind = type(node)
    if kind in _ATOMIC:
        return node
    # (a scalar is taken as it is without a call: most of a record's values are scalars)
    if kind is dict:
        return {k: v if type(v) in _ATOMIC else _copied(v) for k, v in node.items()}
    if kind is list:
        return [v if type(v) in _ATOMIC else _copied(v) for v in node]
    if kind is tuple:
        return tuple(v if type(v) in _ATOMIC else _copied(v) for v in node)
    if isinstance(node, BaseModel) and kind.__deepcopy__ is BaseModel.__deepcopy__:
        cls: Any = kind
        out = cls.__new__(cls)  # as pydantic's own copy: a valid model is not validated again
        setattr_ = object.__setattr__
        fields = {k: v if type(v) in _ATOMIC else _copied(v) for k, v in node.__dict__.items()}
        setattr_(out, "__dict__", fields)
        setattr_(out, "__pydantic_extra__", _copied(node.__pydantic_extra__))
        setattr_(out, "__pydantic_fields_set__", set(node.__pydantic_fields_set__))
        private = getattr(node, "__pydantic_private__", None)
        if private is not None:  # pydantic's own copy drops what was never set
            private = copy.deepcopy({k: v for k, v in private.items() if v is not _UNSET})
        setattr_(out, "__pydantic_private__", private)
        return out
    return copy.deepcopy(node)  # anything else (a model with a copy of its own): Python's


def crash_text(exc: BaseException) -> str:
    if isinstance(exc, _OutOfTime):
        return str(exc)
    frames = traceback.extract_tb(exc.__traceback__)
    where = f" (at {Path(frames[-1].filename).name}:{frames[-1].lineno})" if frames else ""
    return f"{describe_exception(exc)}{where}"


#: Units a Check has been seen to carry that parse: a record's rules yield the same few.
_UNITS_SEEN: set[str] = {"", "1", "degC"}


def _malformed(item: object) -> str:
    """Why a rule's output cannot be reported ('' if it can): the reporters rely on it."""
    if (
        type(item) is Check
        and type(item.value) is float
        and type(item.limit) is float
        and math.isfinite(item.value)
        and math.isfinite(item.limit)
        and type(item.quantity) is str
        and type(item.label) is str
        and type(item.basis) is str
        and type(item.unit) is str
        and item.unit in _UNITS_SEEN
        and item.bound in ("max", "min")
        and type(item.path) is tuple
        and all(type(p) is str or type(p) is int for p in item.path)
    ):
        return ""  # the usual item, as Context.check builds it: the checks below all pass
    if isinstance(item, Check):
        for name in ("value", "limit"):
            v = getattr(item, name)
            if isinstance(v, bool) or not isinstance(v, int | float) or not math.isfinite(v):
                what = f"a Check of {_short(item.quantity)} whose {name} is {_short(v)}"
                return f"{what}, not a finite number"
        for name in ("quantity", "label", "unit", "basis"):
            if not isinstance(getattr(item, name), str):
                return f"a Check whose {name} is {_short(getattr(item, name))}, not text"
        if item.bound not in ("max", "min"):
            return f"a Check whose bound is {_short(item.bound)}, not 'max' or 'min'"
        if item.unit not in _UNITS_SEEN:
            try:
                parse_unit(item.unit)
            except QuantityError:
                return f"a Check whose unit {item.unit!r} emgate does not know"
            _UNITS_SEEN.add(item.unit)
        return _path_problem(item.path)
    if isinstance(item, Problem):
        message: object = item.message  # typed str, but a rule may yield anything
        if not isinstance(message, str):
            return f"a Problem whose message is {_short(message)}, not text"
        if item.severity is not None and item.severity not in SEVERITIES:
            known = ", ".join(SEVERITIES)
            return f"a Problem of unknown severity {_short(item.severity)} (not one of {known})"
        return _path_problem(item.path)
    return f"{_short(item)}, which is neither a Check nor a Problem"


def _path_problem(path: object) -> str:
    if isinstance(path, tuple | list):
        for p in path:
            if type(p) is not str and (not isinstance(p, str | int) or isinstance(p, bool)):
                break
        else:
            return ""
    return f"a record path {_short(path)} that is not a tuple of keys and indices"


def _short(value: object) -> str:
    text = repr(value)
    return text if len(text) <= 60 else text[:57] + "..."


def _normal(item: Check | Problem) -> Check | Problem:
    """A valid item with its path as a tuple and its numbers as floats."""
    if isinstance(item, Check):
        if type(item.path) is tuple and type(item.value) is type(item.limit) is float:
            return item
        return dataclasses.replace(
            item, path=tuple(item.path), value=float(item.value), limit=float(item.limit)
        )
    return item if type(item.path) is tuple else dataclasses.replace(item, path=tuple(item.path))


class _OutOfTime(BaseException):
    """Raised into a rule that overran its time budget (a BaseException, so that a rule's
    ``except Exception`` does not swallow it)."""


#: SIGALRM's number for _signal (0 where there is none: no timer is armed there)
_SIGALRM = int(getattr(signal, "SIGALRM", 0))

#: How often the run's timer looks at the running rule's deadline [s]: a rule that overruns
#: its budget is stopped at most this much later.
_TICK = 0.05


class _Clock:
    """Run rule code within its time budget (``with _Clock(budget) as clock:``, inside
    :func:`rule_guards`; a class, not a generator: it wraps every rule on every record).

    The budget is a deadline that a SIGALRM interval timer looks at every :data:`_TICK`
    seconds, on the main thread of a POSIX system: it interrupts pure-Python code and
    sleeps, but a long call inside a C extension only once it returns to the interpreter.
    The timer runs for the whole run (a timer armed and disarmed for each rule cost two
    system calls a rule), and in a forked worker from its first rule. A rule that runs
    others (a tolerance check) has its deadline back when they return. Elsewhere (another
    thread, Windows) the budget is only checked after each yielded item and at the end: a
    rule that never returns still holds the run there. After a pack's rule (``trusted``
    False: emgate's own rules touch neither), the next clock looks whether the timer still
    runs and the alarm is still the run's, and restores them: two system calls only where
    plugin code ran, not before every rule."""

    #: Whether the run's alarm is installed, the thread it watches, whether this process's
    #: timer runs, whether plugin code ran since the timer was last looked at, and the
    #: innermost rule running on that thread.
    timer = False
    thread = 0
    ticking = False
    suspect = True
    current: _Clock | None = None
    __slots__ = ("budget", "deadline", "outer", "trusted", "watched")

    def __init__(self, budget: float, trusted: bool = False) -> None:
        self.budget = budget
        self.deadline = time.monotonic() + budget
        self.outer: _Clock | None = None
        self.trusted = trusted
        self.watched = False

    def __enter__(self) -> _Clock:
        if _Clock.timer and threading.get_ident() == _Clock.thread:
            if _Clock.suspect or not _Clock.ticking:
                # (again where a rule before stopped the timer or took the signal for its
                # own; _signal's getsignal: the signal module's turns each answer into an
                # enum member or fails to, 2 us a call)
                if _signal.getsignal(_SIGALRM) is not _alarm:
                    signal.signal(signal.SIGALRM, _alarm)
                if not _Clock.ticking or signal.getitimer(signal.ITIMER_REAL)[1] != _TICK:
                    _Clock.ticking = True
                    signal.setitimer(signal.ITIMER_REAL, _TICK, _TICK)
                _Clock.suspect = False
            self.outer, self.watched = _Clock.current, True
            _Clock.current = self  # last: the alarm sees this clock once __exit__ will run
        return self

    def __exit__(self, *exc: object) -> None:
        if not self.trusted:
            _Clock.suspect = True  # plugin code ran: it may have stopped the timer
        if self.watched:
            _Clock.current = self.outer

    def check(self) -> None:
        if time.monotonic() > self.deadline:
            raise _OutOfTime(f"it ran longer than its time budget of {self.budget:g} s")


def _alarm(signum: int, frame: FrameType | None) -> None:
    clock = _Clock.current
    # Not in run_rule's own code or the clock's: raised there, the alarm would leave the
    # rule's guard (or the clock current after its rule); the next tick finds the rule.
    if clock is not None and (frame is None or frame.f_code not in _ENGINE_CODE):
        clock.check()  # and again every tick, for a rule that catches the first one


#: The engine's own code around a rule, where the alarm does not raise (the alarm's own, for
#: a tick that comes while the last one is handled).
_ENGINE_CODE = frozenset(
    f.__code__ for f in (run_rule, _Clock.__enter__, _Clock.__exit__, _Clock.check, _alarm)
)


def _forked() -> None:
    _Clock.ticking = False  # a child has no interval timer of its parent's
    _Clock.suspect = True


if hasattr(os, "register_at_fork"):
    os.register_at_fork(after_in_child=_forked)


@contextmanager
def rule_guards() -> Iterator[None]:
    """For the whole run: the user's Ctrl-C told from a rule's own KeyboardInterrupt, and
    the alarm that ends a rule past its time budget (installed once; each rule arms it)."""
    timer = hasattr(signal, "setitimer") and threading.current_thread() is threading.main_thread()
    previous = None
    if timer:
        previous = signal.signal(signal.SIGALRM, _alarm)
    _Clock.timer, _Clock.thread = timer, threading.get_ident()
    try:
        with watching_interrupts():
            yield
    finally:
        if timer:
            signal.setitimer(signal.ITIMER_REAL, 0.0)
            signal.signal(signal.SIGALRM, previous)
        _Clock.timer = _Clock.ticking = False
        _Clock.suspect = True
        _Clock.current = None
