"""How a run's results are pickled: to the spool of a large run, and back from ``--jobs``
workers, a block for every record.

A slotted dataclass pickles through the generic ``__getstate__`` and ``__setstate__`` that
``dataclasses`` adds, a Python loop over its fields at each end; :func:`by_fields` pickles it
as its class and its fields' values instead, rebuilt by its own ``__init__`` (half the time
both ways, measured on the bench's records).
"""

from __future__ import annotations

import copyreg
import dataclasses
import operator
from collections.abc import Callable
from typing import Any, TypeVar

T = TypeVar("T")


def by_fields(cls: type[T]) -> type[T]:
    """Give a dataclass of two fields or more a ``__reduce__`` of its fields' values, in
    the order its ``__init__`` takes them (every field must be an ``__init__`` argument).
    A subclass pickles as Python pickles it: its own fields and type are kept."""
    fields = dataclasses.fields(cls)  # type: ignore[arg-type]
    if len(fields) < 2 or not all(f.init for f in fields):
        raise TypeError(f"{cls.__name__}: by_fields needs two fields or more, all in __init__")
    values: Callable[[Any], tuple[Any, ...]] = operator.attrgetter(*(f.name for f in fields))

    def __reduce__(self: Any) -> Any:
        if type(self) is not cls:  # a subclass (a pack's own Check): as Python pickles it
            return copyreg.__newobj__, (type(self),), self.__getstate__()  # type: ignore[attr-defined]
        return cls, values(self)

    cls.__reduce__ = __reduce__  # type: ignore[method-assign]
    return cls
