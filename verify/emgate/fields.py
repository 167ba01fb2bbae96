"""Fields of a record's raw data by dotted path, and numbers in the form a record writes
them ('0.45 mm'): the leaf shared by tolerances, variants and sweeps."""

from __future__ import annotations

import re
from collections.abc import Mapping, Sequence
from typing import Any

_NUMBER_UNIT = re.compile(r"^\s*([-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$")


def split_quantity(value: Any) -> tuple[float, str] | None:
    """A record value as (number, unit text): '0.45 mm' -> (0.45, 'mm'), 21 -> (21.0, '');
    None for text that is not a number with a unit (a steel grade, a connection)."""
    if isinstance(value, bool):
        return None
    if isinstance(value, int | float):
        return float(value), ""
    if isinstance(value, str):
        m = _NUMBER_UNIT.match(value)
        if m:
            return float(m.group(1)), m.group(2)
    return None


def record_value(number: float, unit: str, like: Any) -> Any:
    """A number in the form the record writes it: text with its unit, or a bare number (an
    int where the record's value is an int and the number is whole)."""
    if unit:
        return f"{float(number)!r} {unit}"
    if isinstance(like, int) and not isinstance(like, bool) and float(number).is_integer():
        return int(number)
    return number


def dotted_path(dotted: str) -> tuple[str | int, ...]:
    return tuple(int(p) if p.isdigit() else p for p in dotted.split("."))


def get_field(data: Any, path: Sequence[str | int]) -> Any:
    node = data
    for part in path:
        node = node[part]  # KeyError / IndexError / TypeError: the caller locates it
    return node


def field_or_none(data: Any, path: Sequence[str | int]) -> Any:
    """The value at ``path``, None where the data has none."""
    try:
        return get_field(data, path)
    except (KeyError, IndexError, TypeError):
        return None


def _copy(node: Any) -> Any:
    """A copy of plain loaded data (dicts, lists, scalars): deepcopy's work, a tenth the time."""
    if isinstance(node, dict):
        return {k: _copy(v) for k, v in node.items()}
    if isinstance(node, list):
        return [_copy(v) for v in node]
    return node


def with_fields(data: Any, changes: Mapping[tuple[str | int, ...], Any]) -> Any:
    """A copy of ``data`` with the value at each path set (mappings on the way created)."""
    out = _copy(data)
    for path, value in changes.items():
        node = out
        for part in path[:-1]:
            if isinstance(node, dict) and part not in node:
                node[part] = {}
            node = node[part]
        node[path[-1]] = value
    return out
