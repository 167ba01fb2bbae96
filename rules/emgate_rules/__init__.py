"""emgate's built-in rules, registered through the same entry-point group as any pack."""

from __future__ import annotations

from emgate.hookspecs import hookimpl
from emgate.rule import Rule


@hookimpl
def emgate_rules() -> list[type[Rule]]:
    from emgate_rules.current_density import CurrentDensity

    return [CurrentDensity]
