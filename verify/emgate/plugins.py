"""The plugin host: entry-point discovery, each pack loaded in isolation.

Only installed distributions count: the entry points of the environment, never modules from
the working tree of the repository being checked (an untrusted change must not run code in CI;
the CLI drops the working directory from ``sys.path`` before it loads anything).
"""

from __future__ import annotations

import re
import signal
import threading
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import dataclass, field
from importlib.metadata import EntryPoint, entry_points
from typing import Any, cast

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
    #: Packs that are not installed or declare unusable rules (exit 2).
    errors: list[InputError] = field(default_factory=list)
    #: Packs whose code raised while loading, SystemExit included (exit 3).
    crashes: list[InputError] = field(default_factory=list)


class _Interrupts:
    """Tells the user's Ctrl-C from plugin code that raises KeyboardInterrupt itself."""

    pressed = False


@contextmanager
def watching_interrupts() -> Iterator[None]:
    """While plugin code runs, note a real SIGINT before it becomes KeyboardInterrupt.

    Only on the main thread and only over Python's own SIGINT handler; elsewhere a
    KeyboardInterrupt cannot be told apart and is taken as the user's (the run stops,
    exit 3: still closed)."""
    # The flag is read after the block, where the exception is handled: set it on entry.
    if (
        threading.current_thread() is not threading.main_thread()
        or signal.getsignal(signal.SIGINT) is not signal.default_int_handler
    ):
        _Interrupts.pressed = True  # cannot tell: treat every KeyboardInterrupt as real
        yield
        return

    def pressed(signum: int, frame: object) -> None:
        _Interrupts.pressed = True
        raise KeyboardInterrupt

    _Interrupts.pressed = False
    signal.signal(signal.SIGINT, pressed)
    try:
        yield
    finally:
        signal.signal(signal.SIGINT, signal.default_int_handler)


def users_interrupt(exc: BaseException) -> bool:
    """Whether an exception out of plugin code is the user stopping the run (re-raise it),
    rather than the plugin's failure (a crash of that plugin or rule)."""
    return isinstance(exc, KeyboardInterrupt) and _Interrupts.pressed


def describe_exception(exc: BaseException) -> str:
    """'SystemExit: 0', 'RuntimeError: broken': the type and, if any, the message."""
    text = str(exc)
    return f"{type(exc).__name__}: {text}" if text else type(exc).__name__


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
        return f"returned {rule!r}, which is not a subclass of emgate.api.Rule"
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
    options: object = getattr(rule, "options", None)  # a pack may set anything
    if not (isinstance(options, type) and issubclass(options, Options)):
        return f"rule {rid!r}: options must subclass emgate.api.Options"
    try:
        # A pack's options are built whole, as validation will build them: a model that
        # cannot be built is refused here, not when a team first sets its options. emgate's
        # own are built only when set (start-up); the test suite builds each of them.
        if pack.distribution == "emgate":
            rule.options.defaults()
        else:
            rule.options()
    except BaseException as exc:  # a default that does not validate is the pack's bug
        if users_interrupt(exc):
            raise
        return f"rule {rid!r}: its options have no valid defaults ({exc})"
    return None


def load_plugins(eps: list[EntryPoint] | None = None) -> PluginSet:
    """Discover and load every installed pack, isolating each one's failure."""
    found = eps if eps is not None else list(entry_points(group=ENTRY_POINT_GROUP))
    out = PluginSet()
    pm = pluggy.PluginManager(PROJECT)
    pm.add_hookspecs(Spec)
    with watching_interrupts():
        for ep in sorted(found, key=lambda e: e.name):
            _load_one(ep, pm, out)
    return out


def _load_one(ep: EntryPoint, pm: pluggy.PluginManager, out: PluginSet) -> None:
    pack = _pack(ep)
    where = f"plugin {ep.name!r} ({pack.distribution} {pack.version}, {ep.value})"
    try:
        plugin = ep.load()
        pm.register(plugin, name=ep.name)
        impls = [i for i in pm.hook.emgate_rules.get_hookimpls() if i.plugin_name == ep.name]
        # pluggy types a hook's result as object; _rule_problem checks each item below
        rules = [r for impl in impls for r in cast("list[type[Rule[Any]]]", impl.function())]
    except BaseException as exc:  # a plugin's SystemExit must not end the run
        if users_interrupt(exc):
            raise
        message = f"{where} failed to load: {describe_exception(exc)}"
        missing = isinstance(exc, ModuleNotFoundError) and exc.name == ep.module
        if missing:  # not installed: the environment, not the pack's code
            out.errors.append(InputError(message))
        else:
            out.crashes.append(InputError(f"{message} (a crash of the pack)"))
        return
    out.packs.append(pack)
    for rule in rules:
        problem = _rule_problem(rule, pack)
        if problem:
            out.errors.append(InputError(f"{where}: {problem}"))
            continue
        try:  # the engine and every report read it: a raise there would end the run
            text: object = rule.explain()  # a pack may override it to return anything
        except BaseException as exc:
            if users_interrupt(exc):
                raise
            crash = f"{where}: rule {rule.id!r}: explain() raised {describe_exception(exc)}"
            out.crashes.append(InputError(f"{crash} (a crash of the pack)"))
            continue
        if not isinstance(text, str):
            out.errors.append(InputError(f"{where}: rule {rule.id!r}: explain() is not text"))
            continue
        if rule.id in out.rules:
            other = out.rules[rule.id].pack
            out.errors.append(
                InputError(
                    f"{where}: rule id {rule.id!r} is already registered by {other.distribution}"
                )
            )
            continue
        out.rules[rule.id] = LoadedRule(rule, pack)
