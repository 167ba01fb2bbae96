"""The plugin host: entry-point discovery, each pack loaded in isolation.

Only installed distributions count: the entry points of the environment, never modules from
the working tree of the repository being checked (an untrusted change must not run code in CI;
the CLI drops the working directory from ``sys.path`` before it loads anything).
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from importlib.metadata import EntryPoint, entry_points
from typing import Any

import pluggy

from emgate.errors import InputError
from emgate.hookspecs import ENTRY_POINT_GROUP, PROJECT, Spec
from emgate.model import MACHINE_KINDS
from emgate.rule import Options, Rule
from emgate.terms import SEVERITIES

RULE_ID = re.compile(r"^([a-z][a-z0-9-]*/)?[a-z][a-z0-9-]*$")


@dataclass(frozen=True)
class Pack:
    """An installed plugin pack: entry point, distribution and version."""

    name: str
    distribution: str
    version: str
    value: str


@dataclass(frozen=True)
class LoadedRule:
    rule: type[Rule]
    pack: Pack


@dataclass
class PluginSet:
    packs: list[Pack] = field(default_factory=list)
    rules: dict[str, LoadedRule] = field(default_factory=dict)
    errors: list[InputError] = field(default_factory=list)


def _pack(ep: EntryPoint) -> Pack:
    dist = ep.dist
    return Pack(
        ep.name,
        dist.name if dist is not None else "?",
        dist.version if dist is not None else "?",
        ep.value,
    )


def _rule_problem(rule: object, pack: Pack) -> str | None:
    if not (isinstance(rule, type) and issubclass(rule, Rule)):
        return f"returned {rule!r}, which is not a subclass of emgate.rule.Rule"
    rid = getattr(rule, "id", None)
    if not isinstance(rid, str) or not RULE_ID.match(rid):
        return f"rule {rule.__name__} has id {rid!r}; expected a slug such as 'pack/tooth-tip'"
    if pack.distribution != "emgate" and "/" not in rid:
        return f"rule id {rid!r} needs its pack's prefix, such as '{pack.name}/{rid}'"
    if not isinstance(getattr(rule, "summary", None), str):
        return f"rule {rid!r} has no one-line summary"
    if rule.severity not in SEVERITIES:
        return f"rule {rid!r} has severity {rule.severity!r}; expected one of {SEVERITIES}"
    if not set(rule.machines) <= set(MACHINE_KINDS):
        return f"rule {rid!r} names unknown machine kinds {sorted(set(rule.machines))}"
    options: object = getattr(rule, "options", None)  # a pack may set anything here
    if not (isinstance(options, type) and issubclass(options, Options)):
        return f"rule {rid!r}: options must subclass emgate.rule.Options"
    try:
        rule.options()
    except Exception as exc:  # a default that does not validate is the pack's bug
        return f"rule {rid!r}: its options have no valid defaults ({exc})"
    return None


def load_plugins(eps: list[EntryPoint] | None = None) -> PluginSet:
    """Discover and load every installed pack, isolating each one's failure."""
    found = eps if eps is not None else list(entry_points(group=ENTRY_POINT_GROUP))
    out = PluginSet()
    pm = pluggy.PluginManager(PROJECT)
    pm.add_hookspecs(Spec)
    for ep in sorted(found, key=lambda e: e.name):
        pack = _pack(ep)
        where = f"plugin {ep.name!r} ({pack.distribution} {pack.version}, {ep.value})"
        try:
            plugin = ep.load()
            pm.register(plugin, name=ep.name)
            impls = [i for i in pm.hook.emgate_rules.get_hookimpls() if i.plugin_name == ep.name]
            rules: list[Any] = []
            for impl in impls:
                returned: Any = impl.function()  # a pack may return anything: checked below
                rules.extend(returned)
        except Exception as exc:
            out.errors.append(InputError(f"{where} failed to load: {type(exc).__name__}: {exc}"))
            continue
        out.packs.append(pack)
        for rule in rules:
            problem = _rule_problem(rule, pack)
            if problem:
                out.errors.append(InputError(f"{where}: {problem}"))
                continue
            if rule.id in out.rules:
                other = out.rules[rule.id].pack
                out.errors.append(
                    InputError(
                        f"{where}: rule id {rule.id!r} is already registered by"
                        f" {other.distribution}"
                    )
                )
                continue
            out.rules[rule.id] = LoadedRule(rule, pack)
    return out
