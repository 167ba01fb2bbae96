"""What a rule reads: a read-only view of one design's calculation sheet.

Rules share one :class:`~emgate.calc.core.Calculation` per record, so that each quantity is
computed once; they see it only through :class:`Sheet`, a mapping from sheet name to SI value
that computes lazily and cannot be written. A rule therefore cannot change what another rule
reads. (A Python plugin runs in emgate's process and could still dig the calculation out of
the interpreter; the view guards against mistakes and casual tampering, not against code
that sets out to defeat it. Install only packs you trust.)
"""

from __future__ import annotations

from collections.abc import Callable, Iterator, Mapping
from types import MappingProxyType
from typing import TYPE_CHECKING, Any, NoReturn

from emgate.calc.core import SHEET
from emgate.calc.names import Entry

if TYPE_CHECKING:
    from emgate.calc.core import Calculation
    from emgate.physics.thermal import ThermalStep

UNBALANCED = "the winding is unbalanced (winding-balance reports why)"


class NotComputed(ValueError):
    """A sheet quantity that the kernel cannot compute because the winding is unbalanced.

    The engine turns it into a located finding at the rule's severity ("the record is not
    verified by this rule"); a rule may catch it to go on with its other quantities.
    """

    UNBALANCED = UNBALANCED

    def __init__(self, name: str, reason: str) -> None:
        super().__init__(f"{name}: {reason}")
        self.name = name
        self.reason = reason


class Sheet(Mapping[str, float]):
    """The calculation sheet of one record: ``sheet["stator.slot_fill"]`` [SI].

    Iterating gives the names computed for this record (its machine kind, slot and
    conductor shapes); :meth:`entry` gives any name's unit, method and machine kinds. A
    name the record has no value for raises KeyError; a quantity the kernel cannot compute
    for an unbalanced winding raises :class:`NotComputed`.
    """

    __slots__ = ("_read",)
    _read: Callable[..., Any]
    #: Every sheet entry by name, in the order of the one list, whatever the record.
    ENTRIES: Mapping[str, Entry] = MappingProxyType(SHEET)

    def __init__(self, calc: Calculation) -> None:
        def read(op: str, *args: Any) -> Any:  # the calculation stays in this closure
            return _OPS[op](calc, *args)

        object.__setattr__(self, "_read", read)

    def __setattr__(self, name: str, value: object) -> NoReturn:
        raise AttributeError("the calculation sheet is read-only")

    def __delattr__(self, name: str) -> NoReturn:
        raise AttributeError("the calculation sheet is read-only")

    def __getitem__(self, name: str) -> float:
        return float(self._read("value", name))

    def __contains__(self, name: object) -> bool:
        return isinstance(name, str) and bool(self._read("applies", name))

    def __iter__(self) -> Iterator[str]:
        return iter([n for n in SHEET if n in self])

    def __len__(self) -> int:
        return sum(1 for _ in self)

    def entry(self, name: str) -> Entry:
        """The sheet entry ``name`` (unit, method, machine kinds), computed here or not."""
        try:
            return SHEET[name]
        except KeyError:
            raise KeyError(f"{name!r} is not a calculation-sheet name") from None

    @property
    def winding_problems(self) -> tuple[str, ...]:
        """Why the winding is not a balanced, symmetric m-phase winding (empty if it is)."""
        return tuple(self._read("winding_problems"))

    @property
    def thermal_steps(self) -> tuple[ThermalStep, ...]:
        """The links of the winding's heat path behind ``winding.temperature_rise``."""
        return tuple(self._read("thermal_steps"))

    def magnet_field_with_current(self, current_factor: float, *, cold: bool = False) -> float:
        """``rotor.magnet_field_strength_worst`` (``_cold``) at ``current_factor`` times
        the rated current instead of at the rated current [A/m]."""
        return float(self._read("magnet_field", current_factor, cold))

    @property
    def winding_family(self) -> str:
        """'distributed', 'tooth_coil_double_layer' or 'tooth_coil_single_layer' (a coil
        pitch of one slot is a tooth coil)."""
        return str(self._read("winding_family"))

    @property
    def lowest_ambient(self) -> float:
        """The lowest coolant temperature of the worst cases [K]: cooling.ambient_min, or
        -15 degC when absent, never above cooling.ambient."""
        return float(self._read("lowest_ambient"))

    @property
    def top_speed(self) -> float:
        """rating.max_speed, or the rated speed when absent [1/s]."""
        return float(self._read("top_speed"))

    def fault_current(self, *, cold: bool = False) -> float:
        """The worst credible phase current, peak [A]: ``winding.fault_current_peak``, or
        with ``cold`` that of the magnet at the lowest ambient."""
        return float(self._read("fault_current", cold))

    def magnet_field_at_fault(self, current_factor: float, *, cold: bool = False) -> float:
        """``rotor.magnet_field_strength_fault_hot`` (``_cold``) at ``current_factor`` times
        the worst credible current [A/m]."""
        return float(self._read("magnet_field_at_fault", current_factor, cold))

    def slot_height_clearance(self, separator: float) -> float:
        """``stator.slot_height_clearance`` with ``separator`` [m] between the layers [m]."""
        return float(self._read("slot_height_clearance", separator))


def _value(c: Calculation, name: str) -> float:
    entry = SHEET.get(name)
    if entry is None:
        raise KeyError(f"{name!r} is not a calculation-sheet name")
    if not c.applies(name):
        raise KeyError(f"{name!r} is not computed for this record ({entry.scope})")
    try:
        return c.value(name)
    except (ValueError, ArithmeticError) as exc:
        from emgate.calc import winding  # here: every rule reads the sheet through _value

        if isinstance(exc, NotComputed) or not winding.winding_problems(c):
            raise
        raise NotComputed(name, str(exc)) from exc


def _magnet_field(c: Calculation, factor: float, cold: bool) -> float:
    from emgate.calc import rotor

    name = "rotor.magnet_field_strength_worst" + ("_cold" if cold else "")
    _value(c, name)  # applicability and the unbalanced-winding case, as for the name
    return rotor.magnet_h_with_current(c, factor, cold=cold)


def _guarded(c: Calculation, name: str, compute: Callable[[], float]) -> float:
    """A variant of the sheet quantity ``name``: applicable where it is, and on an
    unbalanced winding not computed, as the name itself."""
    from emgate.calc import winding

    _value(c, name)
    try:
        return compute()
    except (ValueError, ArithmeticError) as exc:
        if isinstance(exc, NotComputed) or not winding.winding_problems(c):
            raise
        raise NotComputed(name, str(exc)) from exc


def _fault_current(c: Calculation, cold: bool) -> float:
    from emgate.calc import worst_cases

    return _guarded(
        c, "winding.fault_current_peak", lambda: worst_cases.fault_current(c, cold=cold)
    )


def _magnet_field_at_fault(c: Calculation, factor: float, cold: bool) -> float:
    from emgate.calc import worst_cases

    name = "rotor.magnet_field_strength_fault_" + ("cold" if cold else "hot")
    return _guarded(c, name, lambda: worst_cases.magnet_field_at_fault(c, cold=cold, factor=factor))


def _slot_height_clearance(c: Calculation, separator: float) -> float:
    from emgate.calc import conductors

    return _guarded(
        c,
        "stator.slot_height_clearance",
        lambda: conductors.slot_height_clearance_with(c, separator),
    )


def _winding_family(c: Calculation) -> str:
    from emgate.calc import inductance

    return inductance.family(c)


def _lowest_ambient(c: Calculation) -> float:
    from emgate.calc import worst_cases

    return worst_cases.lowest_ambient(c)


def _top_speed(c: Calculation) -> float:
    from emgate.calc import worst_cases

    return worst_cases.top_speed(c)


def _thermal_steps(c: Calculation) -> tuple[ThermalStep, ...]:
    from emgate.calc import thermal

    return thermal.thermal_estimate(c).steps


def _winding_problems(c: Calculation) -> list[str]:
    from emgate.calc import winding

    return winding.winding_problems(c)


_OPS: dict[str, Callable[..., Any]] = {
    "value": _value,
    "applies": lambda c, name: name in SHEET and c.applies(name),
    "winding_problems": _winding_problems,
    "thermal_steps": _thermal_steps,
    "magnet_field": _magnet_field,
    "winding_family": _winding_family,
    "lowest_ambient": _lowest_ambient,
    "top_speed": _top_speed,
    "fault_current": _fault_current,
    "magnet_field_at_fault": _magnet_field_at_fault,
    "slot_height_clearance": _slot_height_clearance,
}
