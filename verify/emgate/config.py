"""The design repository's policy file, ``emgate.yaml``.

It says which files to check, which rules run, at which severity and with which limits. Each
rule's options are validated against that rule's own options model, with located errors.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import Annotated, Any, Literal

from pydantic import BaseModel, ConfigDict, Field, StringConstraints, ValidationError

from emgate.errors import InputError, InputErrors
from emgate.loader import Document, load
from emgate.rule import Options, Rule, Severity

CONFIG_SCHEMA = "emgate/config@1"
CONFIG_NAME = "emgate.yaml"

Selector = Annotated[
    str,
    StringConstraints(pattern=r"^(tag:[a-z][a-z0-9-]*|[a-z][a-z0-9-]*(/([a-z][a-z0-9-]*)?)?)$"),
    Field(description="a rule id ('slot-fill'), a pack prefix ('acme/') or a tag ('tag:thermal')"),
]


class _Strict(BaseModel):
    model_config = ConfigDict(extra="forbid", strict=True, frozen=True)


class RuleSelection(_Strict):
    select: list[Selector] = Field(default_factory=lambda: ["all"])
    ignore: list[Selector] = Field(default_factory=list)


class ConfigFile(_Strict):
    schema_: Literal["emgate/config@1"] = Field(alias="schema")
    files: list[str] = Field(
        default_factory=lambda: ["**/*.yaml", "**/*.yml"],
        description="glob patterns, relative to this file, of the records to check",
    )
    rules: RuleSelection = Field(default_factory=RuleSelection)
    severity: dict[str, Literal["error", "warning", "info"]] = Field(default_factory=dict)
    options: dict[str, dict[str, Any]] = Field(
        default_factory=dict, description="per rule id: that rule's options (the team's limits)"
    )


@dataclass
class Policy:
    """The resolved configuration the engine applies."""

    root: Path
    files: list[str] = field(default_factory=lambda: ["**/*.yaml", "**/*.yml"])
    select: list[str] = field(default_factory=lambda: ["all"])
    ignore: list[str] = field(default_factory=list)
    severity: dict[str, Severity] = field(default_factory=dict)
    options: dict[str, Options] = field(default_factory=dict)
    source: Path | None = None

    def selected(self, rule: type[Rule]) -> bool:
        return any(_matches(s, rule) for s in self.select) and not any(
            _matches(s, rule) for s in self.ignore
        )

    def options_for(self, rule: type[Rule]) -> Options:
        return self.options.get(rule.id) or rule.options()

    def severity_for(self, rule: type[Rule]) -> Severity:
        return self.severity.get(rule.id, rule.severity)


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
    here = start.resolve()
    for folder in (here, *here.parents):
        candidate = folder / CONFIG_NAME
        if candidate.is_file():
            return candidate
        if (folder / ".git").exists():
            return None
    return None


def load_policy(path: Path | None, rules: dict[str, type[Rule]], root: Path) -> Policy:
    """Read and check a config file against the installed rules (InputErrors on failure)."""
    if path is None:
        return Policy(root=root)
    from emgate.validate import model_errors

    doc = load(path)
    try:
        cfg = ConfigFile.model_validate(doc.data)
    except ValidationError as exc:
        raise InputErrors(model_errors(exc, doc)) from None
    errors: list[InputError] = []
    policy = Policy(
        root=path.parent,
        files=list(cfg.files),
        select=list(cfg.rules.select),
        ignore=list(cfg.rules.ignore),
        source=path,
    )
    for rid, level in cfg.severity.items():
        if _known(rid, rules, doc, ("severity", rid), errors):
            policy.severity[rid] = level
    for rid, raw in cfg.options.items():
        if not _known(rid, rules, doc, ("options", rid), errors):
            continue
        try:
            policy.options[rid] = rules[rid].options.model_validate(raw)
        except ValidationError as exc:
            errors.extend(_option_errors(exc, doc, rid))
    for key in ("select", "ignore"):
        for i, sel in enumerate(getattr(cfg.rules, key)):
            if sel == "all" or sel.startswith("tag:") or sel.endswith("/"):
                continue
            _known(sel, rules, doc, ("rules", key, i), errors)
    if errors:
        raise InputErrors(errors)
    return policy


def _known(
    rid: str,
    rules: dict[str, type[Rule]],
    doc: Document,
    at: tuple[Any, ...],
    errors: list[InputError],
) -> bool:
    if rid in rules:
        return True
    import difflib

    close = difflib.get_close_matches(rid, list(rules), n=1, cutoff=0.6)
    hint = f"; did you mean {close[0]!r}?" if close else ""
    errors.append(InputError(f"no installed rule has the id {rid!r}{hint}", doc.locate_key(at)))
    return False


def _option_errors(exc: ValidationError, doc: Document, rid: str) -> list[InputError]:
    from emgate.validate import record_path

    out = []
    for error in exc.errors(include_url=False):
        path = record_path(doc.data, ("options", rid, *error["loc"]))
        msg = error["msg"].removeprefix("Value error, ")
        if error["type"] == "extra_forbidden":
            msg = f"rule {rid!r} has no option {str(path[-1])!r}"
        out.append(InputError(msg, doc.locate(path)))
    return out


def config_json_schema() -> dict[str, Any]:
    schema = ConfigFile.model_json_schema(by_alias=True)
    return {
        "$schema": "https://json-schema.org/draft/2020-12/schema",
        "$id": "urn:emgate:schema:config:1",
        "title": "emgate project configuration, version 1",
        **schema,
    }
