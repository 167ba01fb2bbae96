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
        """Whether the sheet quantity ``name`` exists for this record's machine kind."""
        return self.d.machine in SHEET[name].machines

    def __getattr__(self, attr: str) -> Any:
        # Transitional: the attribute names of the former single class, until every rule
        # reads quantities by sheet name.
        import sys

        if not attr.startswith("__"):
            for module in sys.modules["emgate.calc"].DOMAINS:
                fn = getattr(module, attr, None)
                if callable(fn) and getattr(fn, "__module__", "") == module.__name__:
                    if getattr(fn, "memoized", False):
                        return fn(self)
                    return functools.partial(fn, self)
        raise AttributeError(attr)


def memo(fn: Callable[[Calculation], T]) -> Callable[[Calculation], T]:
    """Compute ``fn(c)`` once per calculation."""
    key = f"{fn.__module__}.{fn.__qualname__}"

    @functools.wraps(fn)
    def once(c: Calculation) -> T:
        try:
            return c._cache[key]  # type: ignore[no-any-return]
        except KeyError:
            value = c._cache[key] = fn(c)
            return value

    once.memoized = True  # type: ignore[attr-defined]
    return once


Provider = Callable[["Calculation"], float]


def quantity(name: str) -> Callable[[Provider], Provider]:
    """Bind a function to the sheet entry ``name`` (computed once per calculation)."""
    if name not in SHEET:
        raise KeyError(f"{name!r} is not in emgate.calc.names")

    def bind(fn: Provider) -> Provider:
        if name in PROVIDERS:
            raise KeyError(f"{name!r} is computed twice")
        once = memo(fn)
        PROVIDERS[name] = once
        return once

    return bind
