"""The calculation of one design and the two decorators that make its quantities.

A quantity is a plain function of the calculation ``c`` in a domain module of this package;
``@memo`` computes it once per design, ``@quantity(name)`` also binds it to its entry of the
sheet (``emgate.calc.names``). Inputs come from the validated record ``c.d`` (never from its
``declared`` block) and the materials catalogue.
"""

from __future__ import annotations

import functools
from collections.abc import Callable
from typing import TYPE_CHECKING, Any, TypeVar

from emgate.calc.names import ENTRIES, Entry

if TYPE_CHECKING:
    from emgate.materials import Catalogue
    from emgate.model import AnyDesign

T = TypeVar("T")

#: The sheet by name, in the order of the one list.
SHEET: dict[str, Entry] = {e.name: e for e in ENTRIES}
#: The function computing each sheet name, filled as the domain modules are imported.
PROVIDERS: dict[str, Callable[[Calculation], float]] = {}
#: For the entries computed only for some records of their machine kinds, the condition.
CONDITIONS: dict[str, Callable[[AnyDesign], bool]] = {}


class Calculation:
    """Recomputed quantities of one design (SI floats), each computed once on demand."""

    def __init__(self, design: AnyDesign, catalogue: Catalogue) -> None:
        self.d = design
        self.catalogue = catalogue
        self._cache: dict[str, Any] = {}

    def value(self, name: str) -> float:
        """The sheet quantity ``name`` [SI]."""
        return float(PROVIDERS[name](self))

    def applies(self, name: str) -> bool:
        """Whether the sheet quantity ``name`` exists for this record: its machine kind, and
        the condition its entry states (``Entry.only``), such as a slot shape."""
        when = CONDITIONS.get(name)
        return self.d.machine in SHEET[name].machines and (when is None or when(self.d))


_MISSING: Any = object()


def memo(fn: Callable[[Calculation], T]) -> Callable[[Calculation], T]:
    """Compute ``fn(c)`` once per calculation."""
    key = f"{fn.__module__}.{fn.__qualname__}"

    @functools.wraps(fn)
    def once(c: Calculation) -> T:
        # get, not a KeyError caught: a record computes each of some hundred quantities
        # once, and a raised KeyError costs five times the lookup
        value = c._cache.get(key, _MISSING)
        if value is _MISSING:
            value = c._cache[key] = fn(c)
        return value

    once.memoized = True  # type: ignore[attr-defined]
    return once


Provider = Callable[["Calculation"], float]


def quantity(
    name: str, *, when: Callable[[AnyDesign], bool] | None = None
) -> Callable[[Provider], Provider]:
    """Bind a function to the sheet entry ``name`` (computed once per calculation); ``when``
    is the condition its entry states in words (``Entry.only``), if any."""
    if name not in SHEET:
        raise KeyError(f"{name!r} is not in emgate.calc.names")
    if (when is None) != (not SHEET[name].only):
        raise KeyError(f"{name!r}: a condition needs both its words (Entry.only) and `when`")

    def bind(fn: Provider) -> Provider:
        if name in PROVIDERS:
            raise KeyError(f"{name!r} is computed twice")
        once = memo(fn)
        PROVIDERS[name] = once
        if when is not None:
            CONDITIONS[name] = when
        return once

    return bind
