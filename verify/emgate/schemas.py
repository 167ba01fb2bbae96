"""The JSON Schemas of the record kinds, as committed under schemas/ and written by ``emgate init``.

A module of its own so that the command line and the scaffold both use it without importing
each other; the models are imported only when a schema is asked for.

Two things are added to what pydantic generates, so that a generic validator (an editor's,
check-jsonschema) says what emgate says:

- a choice of model by a tag (``machine``, a slot's or a conductor's ``shape``) is written as
  ``if``/``then`` on the tag rather than ``oneOf`` with OpenAPI's ``discriminator``, which
  generic validators ignore and then report the closest-looking branch's errors;
- the configuration's ``options`` (and each override's) name every installed rule, each with
  its own options schema: a key a rule does not have, or an id no installed rule has, is red
  in the editor as it is an error for emgate;
- each record field's meaning, typical range and typical value (``emgate.field_docs``).
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

SCHEMA_KINDS = ("design", "materials", "waivers", "config")


def schema_text(kind: str, rules: Mapping[str, Any] | None = None) -> str:
    """The JSON Schema of a record kind, as committed under schemas/. The configuration's
    schema names the rules given, by default every rule installed (built-in and packs)."""
    import json

    if kind == "config":
        from emgate.config import config_json_schema

        schema = config_json_schema()
        _rule_options(schema, _installed_rules() if rules is None else rules)
    else:
        from emgate.field_docs import annotate
        from emgate.model import json_schema

        schema = annotate(json_schema(kind))
    schema = branch_by_tag(schema)
    return json.dumps(schema, indent=2, sort_keys=True) + "\n"


def _installed_rules() -> Mapping[str, Any]:
    from emgate.plugins import load_plugins

    return {rid: lr.rule for rid, lr in load_plugins().rules.items()}


def branch_by_tag(node: Any) -> Any:
    """Every ``oneOf`` + ``discriminator`` below ``node`` as ``if``/``then`` on the tag: the
    tag is required and one of the known values; its value picks the one branch checked."""
    if isinstance(node, list):
        return [branch_by_tag(n) for n in node]
    if not isinstance(node, dict):
        return node
    node = {k: branch_by_tag(v) for k, v in node.items()}
    disc = node.get("discriminator")
    if not (isinstance(disc, dict) and "oneOf" in node):
        return node
    tag = disc["propertyName"]
    mapping: dict[str, str] = disc.get("mapping", {})
    rest = {k: v for k, v in node.items() if k not in ("oneOf", "discriminator")}
    return {
        **rest,
        "type": "object",
        "required": sorted({*rest.get("required", []), tag}),
        "properties": {**rest.get("properties", {}), tag: {"enum": sorted(mapping)}},
        "allOf": [
            {
                "if": {"properties": {tag: {"const": value}}, "required": [tag]},
                "then": {"$ref": ref},
            }
            for value, ref in sorted(mapping.items())
        ],
    }


def _rule_options(schema: dict[str, Any], rules: Mapping[str, Any]) -> None:
    """Each rule's options model, by rule id, in the configuration's ``options`` and in each
    override's."""
    by_rule = {}
    for rule_id, rule in sorted(rules.items()):
        options = rule.options.model_json_schema(by_alias=True)
        options.pop("title", None)
        summary = getattr(rule, "summary", "")
        options["description"] = f"options of {rule_id}" + (f": {summary}" if summary else "")
        by_rule[rule_id] = options
    table = {
        "type": "object",
        "description": "per rule id (an installed rule): that rule's options, the team's"
        " limits; `emgate explain RULE` lists them with their defaults and sources",
        "properties": by_rule,
        "additionalProperties": False,
    }
    schema["$defs"]["RuleOptions"] = table
    schema["properties"]["options"] = {"$ref": "#/$defs/RuleOptions"}
    override = schema["$defs"].get("Override", {}).get("properties", {})
    if "options" in override:
        override["options"] = {"$ref": "#/$defs/RuleOptions"}
