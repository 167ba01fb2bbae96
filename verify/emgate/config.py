"""The design repository's policy file, ``emgate.yaml``.

It says which files to check, which rules run, at which severity and with which limits, with
overrides for path globs, and which plugin packs must be installed. Each rule's options are
validated against that rule's own options model, with located errors.
"""

from __future__ import annotations

import fnmatch
import os
from collections.abc import Iterable
from dataclasses import dataclass, field
from functools import cache
from pathlib import Path
from typing import Annotated, Any, Literal

from pydantic import (
    AfterValidator,
    BaseModel,
    ConfigDict,
    Field,
    StringConstraints,
    ValidationError,
)

from emgate.errors import InputError, InputErrors, resolved, within
from emgate.loader import Document, load
from emgate.quantity import quantity
from emgate.rule import Options, Rule
from emgate.terms import RecordPath, Severity

CONFIG_NAME = "emgate.yaml"
WAIVERS_NAME = "waivers.yaml"

Selector = Annotated[
    str,
    StringConstraints(pattern=r"^(all|tag:[a-z][a-z0-9-]*|[a-z][a-z0-9-]*(/([a-z][a-z0-9-]*)?)?)$"),
    Field(
        description="'all', a rule id ('slot-fill'), a pack prefix ('acme/') or a tag"
        " ('tag:thermal')"
    ),
]


#: Default time budget of one rule on one record [s]: generous, a rule takes milliseconds.
RULE_TIME_BUDGET = 60.0
RuleTimeBudget = Annotated[float, quantity("time"), Field(le=3600.0)]


class _Strict(BaseModel):
    model_config = ConfigDict(extra="forbid", strict=True, frozen=True, defer_build=True)


class RuleSelection(_Strict):
    select: list[Selector] = Field(default_factory=lambda: ["all"])
    ignore: list[Selector] = Field(default_factory=list)


def _relative_glob(pattern: str) -> str:
    if pattern.startswith(("/", "\\")) or ":" in pattern[:3] or ".." in pattern.split("/"):
        raise ValueError(
            f"glob {pattern!r} must be relative to emgate.yaml, inside the repository"
            " (no leading '/', no '..')"
        )
    return pattern


RelativeGlobs = list[Annotated[str, AfterValidator(_relative_glob)]]

#: Files that need not be emgate files unless the policy says otherwise: hidden files and
#: folders (.github/, .gitlab-ci.yml, .pre-commit-config.yaml). '*' matches across folders.
DEFAULT_IGNORE = (".*", "*/.*")


def glob_match(rel: str, globs: Iterable[str]) -> bool:
    """Whether a path relative to the repository matches one of ``globs`` ('*' also
    matches across folders, and '**/' matches no folder too)."""
    return any(
        fnmatch.fnmatchcase(rel, g) or fnmatch.fnmatchcase(rel, g.replace("**/", "")) for g in globs
    )


class Override(_Strict):
    files: RelativeGlobs = Field(
        min_length=1,
        description="glob patterns relative to emgate.yaml; '*' also matches across folders",
    )
    rules: RuleSelection | None = None
    severity: dict[str, Severity] = Field(default_factory=dict)
    options: dict[str, dict[str, Any]] = Field(default_factory=dict)


class ConfigFile(_Strict):
    schema_: Literal["emgate/config@1"] = Field(alias="schema")
    files: RelativeGlobs | None = Field(
        default=None,
        description="glob patterns, relative to this file, of the records to check when"
        " `emgate check` is given no paths; when absent, every YAML file git lists in the"
        " work tree (tracked, or untracked and not ignored), else every YAML file outside"
        " hidden folders and virtual environments",
    )
    rules: RuleSelection = Field(default_factory=RuleSelection)
    severity: dict[str, Severity] = Field(default_factory=dict)
    options: dict[str, dict[str, Any]] = Field(
        default_factory=dict, description="per rule id: that rule's options (the team's limits)"
    )
    overrides: list[Override] = Field(default_factory=list)
    required_plugins: list[str] = Field(
        default_factory=list,
        description="distributions that must be installed, with version"
        " specifiers, e.g. 'acme-emgate-pack>=1.2'",
    )
    waivers: str = Field(
        default=WAIVERS_NAME,
        description="the reviewed waivers file, relative to this file, inside the repository"
        " (ignored when absent)",
    )
    ignore_files: RelativeGlobs = Field(
        default_factory=lambda: list(DEFAULT_IGNORE),
        description="glob patterns, relative to this file, of YAML files that are not emgate"
        " files and may stay so (hidden files and folders by default, where CI configuration"
        " lives); every other file the files globs select, or named on the command line, must"
        " be a valid emgate file. A valid emgate record is checked even when listed here",
    )
    rule_time_budget: RuleTimeBudget = Field(
        default=RULE_TIME_BUDGET,
        description="longest time one rule may take on one record, e.g. '60 s', at most"
        " '3600 s'; a rule that takes longer is a crash of that rule",
    )


@dataclass(frozen=True)
class RulePolicy:
    """The policy in force for one record file."""

    select: tuple[str, ...]
    ignore: tuple[str, ...]
    severity: dict[str, Severity]
    options: dict[str, Options]
    #: selected() by rule class: asked for every rule of every record
    _chosen: dict[type[Rule], bool] = field(
        default_factory=dict, init=False, repr=False, compare=False
    )

    def selected(self, rule: type[Rule]) -> bool:
        chosen = self._chosen.get(rule)
        if chosen is None:
            chosen = self._chosen[rule] = any(_matches(s, rule) for s in self.select) and not any(
                _matches(s, rule) for s in self.ignore
            )
        return chosen

    def options_for(self, rule: type[Rule]) -> Options:
        return self.options.get(rule.id) or rule.options.defaults()

    def severity_for(self, rule: type[Rule]) -> Severity:
        return self.severity.get(rule.id, rule.severity)


@dataclass
class Policy:
    """The resolved configuration: a base rule policy and per-glob overrides."""

    root: Path
    base: RulePolicy = field(default_factory=lambda: RulePolicy(("all",), (), {}, {}))
    #: The config's globs; empty: the whole repository, as ``emgate.listing`` lists it.
    files: list[str] = field(default_factory=list)
    overrides: list[tuple[tuple[str, ...], RulePolicy]] = field(default_factory=list)
    source: Path | None = None
    waivers_file: Path | None = None
    ignore_files: list[str] = field(default_factory=lambda: list(DEFAULT_IGNORE))
    #: Longest time one rule may take on one record [s].
    rule_time_budget: float = 60.0

    #: The root resolved, once (a change of a large repository asks for every file outside it).
    _top: str | None = field(default=None, init=False, repr=False, compare=False)

    def relative(self, path: Path | str, real: str | None = None) -> str | None:
        """``path`` relative to the repository root (in / form; "." for the root itself), or
        None outside it. ``real``: the path resolved already (discovery resolves each file
        once)."""
        if os.name != "posix":  # (Windows compares paths case-folded: pathlib does that)
            try:
                return resolved(Path(path)).relative_to(resolved(self.root)).as_posix()
            except (ValueError, OSError):
                return None
        try:
            if self._top is None:
                self._top = os.path.realpath(self.root)
            full = os.path.realpath(path) if real is None else real
        except OSError:
            return None
        return within(full, self._top)

    def inside(self, path: Path) -> bool:
        return self.relative(path) is not None

    def selects(self, path: Path | str, real: str | None = None) -> bool:
        """Whether the ``files`` globs select a file (``real``: as :meth:`relative`)."""
        rel = self.relative(path, real)
        return rel is not None and glob_match(rel, self.files)

    def ignored(self, path: Path) -> bool:
        """Whether ``ignore_files`` lets a file be no emgate file."""
        rel = self.relative(path)
        return rel is not None and glob_match(rel, self.ignore_files)

    def for_file(self, path: Path) -> RulePolicy:
        """The policy for one record: the last matching override wins, else the base."""
        if not self.overrides:  # (no path to resolve: a record costs two resolves else)
            return self.base
        rel = self.relative(path)
        if rel is None:
            return self.base
        for globs, rule_policy in reversed(self.overrides):
            if glob_match(rel, globs):
                return rule_policy
        return self.base

    def configured_files(self) -> list[Path]:
        """The files the globs select, or the repository's folder when there are none."""
        if not self.files:
            return [self.root]
        out: set[Path] = set()
        for pattern in self.files:  # (a link leading out of the repository is not followed)
            out.update(p for p in self.root.glob(pattern) if p.is_file() and self.inside(p))
        return sorted(out)


def _matches(selector: str, rule: type[Rule]) -> bool:
    if selector == "all":
        return True
    if selector.startswith("tag:"):
        return selector[4:] in rule.tags
    if selector.endswith("/"):
        return rule.id.startswith(selector)
    return rule.id == selector


def find_config(start: Path) -> Path | None:
    """The nearest ``emgate.yaml`` in ``start`` or its parents, up to a git root."""
    here = resolved(start)
    for folder in (here, *here.parents):
        candidate = folder / CONFIG_NAME
        if candidate.is_file():
            return candidate
        if (folder / ".git").exists():
            return None
    return None


class _Loader:
    def __init__(self, doc: Document, rules: dict[str, type[Rule]]) -> None:
        self.doc = doc
        self.rules = rules
        self.errors: list[InputError] = []

    def known(self, rid: str, at: RecordPath) -> bool:
        if rid in self.rules:
            return True
        import difflib

        close = difflib.get_close_matches(rid, list(self.rules), n=1, cutoff=0.6)
        hint = f"; did you mean {close[0]!r}?" if close else ""
        self.errors.append(
            InputError(f"no installed rule has the id {rid!r}{hint}", self.doc.locate_key(at))
        )
        return False

    def selection(self, sel: RuleSelection, at: RecordPath) -> tuple[tuple[str, ...], ...]:
        for key in ("select", "ignore"):
            for i, s in enumerate(getattr(sel, key)):
                if s == "all":
                    continue
                if s.startswith("tag:") or s.endswith("/"):
                    self.group_known(s, (*at, key, i))
                else:
                    self.known(s, (*at, key, i))
        return tuple(sel.select), tuple(sel.ignore)

    def group_known(self, selector: str, at: RecordPath) -> None:
        """A pack prefix or tag must match an installed rule: a typo must not select none."""
        if any(_matches(selector, rule) for rule in self.rules.values()):
            return
        import difflib

        groups = {f"tag:{t}" for r in self.rules.values() for t in r.tags}
        groups |= {r.id.split("/")[0] + "/" for r in self.rules.values() if "/" in r.id}
        close = difflib.get_close_matches(selector, sorted(groups), n=1, cutoff=0.6)
        hint = f"; did you mean {close[0]!r}?" if close else ""
        self.errors.append(
            InputError(f"{selector!r} matches no installed rule{hint}", self.doc.locate(at))
        )

    def options(
        self, base: dict[str, dict[str, Any]], extra: dict[str, dict[str, Any]], at: RecordPath
    ) -> dict[str, Options]:
        out: dict[str, Options] = {}
        for rid in extra:
            self.known(rid, (*at, rid))
        for rid in sorted(set(base) | set(extra)):
            if rid not in self.rules:
                continue
            merged = {**base.get(rid, {}), **extra.get(rid, {})}
            where = (*at, rid) if rid in extra else ("options", rid)
            try:
                out[rid] = self.rules[rid].options.model_validate(merged)
            except ValidationError as exc:
                self.errors.extend(_option_errors(exc, self.doc, where, rid))
        return out

    def severity(self, levels: dict[str, Severity], at: RecordPath) -> dict[str, Severity]:
        return {rid: lvl for rid, lvl in levels.items() if self.known(rid, (*at, rid))}


def load_policy(
    path: Path | None,
    rules: dict[str, type[Rule]],
    root: Path,
    installed: dict[str, str] | None = None,
) -> Policy:
    """Read and check a config file against the installed rules (InputErrors on failure).

    ``installed`` maps distribution names of loaded plugin packs to their versions, for
    ``required_plugins``.
    """
    if path is None:
        return Policy(root=root)
    from emgate.translate import model_errors

    doc = load(path)
    try:
        cfg = ConfigFile.model_validate(doc.data)
    except ValidationError as exc:
        raise InputErrors(model_errors(exc, doc)) from None
    ld = _Loader(doc, rules)
    select, ignore = ld.selection(cfg.rules, ("rules",))
    base = RulePolicy(
        select,
        ignore,
        ld.severity(cfg.severity, ("severity",)),
        ld.options({}, cfg.options, ("options",)),
    )
    overrides = []
    for i, ov in enumerate(cfg.overrides):
        at = ("overrides", i)
        sel = ld.selection(ov.rules, (*at, "rules")) if ov.rules else (select, ignore)
        levels = {**base.severity, **ld.severity(ov.severity, (*at, "severity"))}
        opts = ld.options(cfg.options, ov.options, (*at, "options"))
        overrides.append(
            (tuple(ov.files), RulePolicy(sel[0], sel[1], levels, {**base.options, **opts}))
        )
    _check_required(cfg.required_plugins, installed or {}, ld)
    policies: list[tuple[RecordPath, RulePolicy]] = [(("rules",), base)]
    policies += [(("overrides", i, "rules"), p) for i, (_, p) in enumerate(overrides)]
    for where, rule_policy in policies:
        if not ld.errors and not any(rule_policy.selected(r) for r in rules.values()):
            ld.errors.append(
                InputError(
                    "this selection runs no rule: a gate that checks nothing must not pass"
                    f" (installed: {', '.join(sorted(rules)) or 'none'})",
                    doc.locate(where),
                )
            )
    waivers = path.parent / cfg.waivers
    if not _within(waivers, path.parent):
        ld.errors.append(
            InputError(
                f"waivers file {cfg.waivers!r} lies outside the repository: every path the"
                " configuration names stays inside the folder of emgate.yaml",
                doc.locate(("waivers",)),
            )
        )
    if ld.errors:
        raise InputErrors(ld.errors)
    return Policy(
        root=path.parent,
        base=base,
        files=list(cfg.files or ()),
        overrides=overrides,
        source=path,
        waivers_file=waivers if waivers.is_file() else None,
        ignore_files=list(cfg.ignore_files),
        rule_time_budget=cfg.rule_time_budget,
    )


def _within(path: Path, root: Path) -> bool:
    """Whether ``path``, symbolic links resolved, lies inside ``root``."""
    try:
        resolved(path).relative_to(resolved(root))
    except (ValueError, OSError):
        return False
    return True


def _check_required(required: list[str], installed: dict[str, str], ld: _Loader) -> None:
    if not required:
        return
    from packaging.requirements import InvalidRequirement, Requirement
    from packaging.utils import canonicalize_name

    have = {canonicalize_name(k): v for k, v in installed.items()}
    for i, text in enumerate(required):
        at = ld.doc.locate(("required_plugins", i))
        try:
            req = Requirement(text)
        except InvalidRequirement as exc:
            ld.errors.append(
                InputError(
                    f"expected a requirement such as 'acme-pack>=1.2', found {text!r} ({exc})", at
                )
            )
            continue
        version = have.get(canonicalize_name(req.name))
        if version is None:
            ld.errors.append(
                InputError(
                    f"required plugin pack {req.name!r} is not installed (or failed to load);"
                    f" install it, e.g. pip install '{text}'",
                    at,
                )
            )
        elif req.specifier and not req.specifier.contains(version, prereleases=True):
            ld.errors.append(
                InputError(
                    f"required plugin pack {req.name} {version} does not satisfy {text!r}", at
                )
            )


#: Options that became record fields, for a helpful message to an old config.
MOVED_TO_RECORD = {
    "fin_area_factor": "cooling.fin_area_factor in each record",
    "frame_length_factor": "cooling.frame_length (a length) in each record",
    "core_area_factor": "cooling.core_area_factor in each record",
}


def _option_errors(
    exc: ValidationError, doc: Document, at: RecordPath, rid: str
) -> list[InputError]:
    from emgate.translate import record_path

    out = []
    for error in exc.errors(include_url=False):
        path = record_path(doc.data, (*at, *error["loc"]))
        msg = error["msg"].removeprefix("Value error, ")
        if error["type"] == "extra_forbidden":
            msg = f"rule {rid!r} has no option {str(path[-1])!r}"
            if str(path[-1]) in MOVED_TO_RECORD:
                msg += f"; it describes the machine, so it is now {MOVED_TO_RECORD[str(path[-1])]}"
            out.append(InputError(msg, doc.locate_key(path)))
            continue
        out.append(
            InputError(f"option {str(error['loc'][-1])!r} of rule {rid!r}: {msg}", doc.locate(path))
        )
    return out


@cache
def config_json_schema() -> dict[str, Any]:
    schema = ConfigFile.model_json_schema(by_alias=True)
    return {
        "$schema": "https://json-schema.org/draft/2020-12/schema",
        "$id": "urn:emgate:schema:config:1",
        "title": "emgate project configuration, version 1",
        **schema,
    }
