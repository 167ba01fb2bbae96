"""A rule's explanation: what ``emgate explain`` prints, and the same as Markdown for the
outputs that show a rule's help (SARIF)."""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from emgate.plugins import LoadedRule


def default_text(info: Any) -> str:
    """An option's default in the unit its examples use ('5 A/mm^2', not 5000000.0), also
    for an optional quantity (``FluxDensity | None``), whose unit sits inside the union."""
    from typing import Annotated, get_args, get_origin

    from annotated_types import GroupedMetadata

    from emgate.units import format_value

    metadata = list(info.metadata)
    pending = [info.annotation]
    while pending:  # the Annotated members of unions (Optional) carry their own metadata
        hint = pending.pop()
        if get_origin(hint) is Annotated:
            metadata.extend(hint.__metadata__)
        else:
            pending.extend(get_args(hint))
    default = info.get_default(call_default_factory=True)
    # a quantity's metadata comes as one group (emgate.quantity.Quantity): unpack it
    metadata = [m for g in metadata for m in (g if isinstance(g, GroupedMetadata) else [g])]
    for meta in metadata:
        examples = getattr(meta, "json_schema", None) or {}
        example = (examples.get("examples") or [None])[0]
        if isinstance(example, str) and isinstance(default, float):
            unit = example.split(None, 1)[1] if " " in example else ""
            return format_value(default, unit)
    return repr(default)


def _options(lr: LoadedRule) -> list[tuple[str, str, str]]:
    """(name, default, description) of each option of the rule."""
    fields = lr.rule.options.model_fields
    return [(n, default_text(i), i.description or "") for n, i in fields.items()]


def _head(rid: str, lr: LoadedRule) -> list[str]:
    rule = lr.rule
    return [
        f"{rid} v{rule.version} ({lr.pack.distribution} {lr.pack.version})",
        rule.summary,
        f"applies to: {', '.join(rule.machines)}; default severity: {rule.severity}",
    ]


def explain_text(rid: str, lr: LoadedRule) -> str:
    """The rule's method, formulas and sources, and its options with their defaults."""
    out = [*_head(rid, lr), "", lr.rule.explain()]
    options = _options(lr)
    if options:
        out += ["", "options (emgate.yaml: options: {" + rid + ": {NAME: VALUE}}), with defaults:"]
        out += [f"  {n} = {d}" + (f"  ({desc})" if desc else "") for n, d, desc in options]
    return "\n".join(out) + "\n"


def explain_markdown(rid: str, lr: LoadedRule) -> str:
    """:func:`explain_text` as Markdown: the method as preformatted text (its formulas are
    aligned by hand and use ``*`` and ``_``), the options as a table."""
    from emgate.report.markdown import md

    head = _head(rid, lr)
    method = lr.rule.explain().replace("```", "'''")
    out = [f"**{md(head[0])}**: {md(head[1])}", "", md(head[2]), "", "```text", method, "```"]
    options = _options(lr)
    if options:
        out += ["", f"Options (`emgate.yaml`: `options: {{{rid}: {{NAME: VALUE}}}}`):", ""]
        out += ["| option | default | meaning |", "|---|---|---|"]
        out += [f"| `{n}` | {md(d)} | {md(desc)} |" for n, d, desc in options]
    return "\n".join(out) + "\n"
