"""Plugin hook specifications.

A plugin pack is an installed distribution with an entry point in the group ``emgate.plugins``
naming a module (or object) that implements these hooks, marked with :data:`hookimpl` (which
packs import from :mod:`emgate.api`). The
built-in rules register through the same group. The hooks only register things; the engine
itself calls each rule, so that it can select, configure and isolate them.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import pluggy

if TYPE_CHECKING:
    from emgate.rule import Rule

PROJECT = "emgate"
ENTRY_POINT_GROUP = "emgate.plugins"

hookspec = pluggy.HookspecMarker(PROJECT)
hookimpl = pluggy.HookimplMarker(PROJECT)


class Spec:
    @hookspec
    def emgate_rules(self) -> list[type[Rule]]:  # type: ignore[empty-body]
        """Return the rule classes this pack provides."""
