"""pydantic validation errors translated into located input errors.

Error locations are mapped back to the YAML nodes through the document's marks, so each
message names file:line:column, the record path, what was expected and what was found, with a
"did you mean" hint for a misspelt key. Used for design records, materials files, the project
configuration and waivers.
"""

from __future__ import annotations

import difflib
from functools import cache
from typing import Any, Literal, get_args, get_origin

from pydantic import BaseModel, ValidationError
from pydantic_core import ErrorDetails

from emgate.errors import InputError
from emgate.loader import Document
from emgate.model import UNION_TAGS
from emgate.terms import RecordPath


@cache
def _vocabulary() -> tuple[str, ...]:
    """Every field name of the record models, for 'did you mean' hints."""
    names: set[str] = set()
    seen: set[type] = set()

    def walk(model: type[BaseModel]) -> None:
        if model in seen:
            return
        seen.add(model)
        for name, info in model.model_fields.items():
            names.add(info.alias or name)
            for sub in _models_in(info.annotation):
                walk(sub)

    from emgate.model import InductionDesign, SalientFieldDesign, SurfacePMDesign, WaiversFile
    from emgate.model.materials import MaterialsFile

    # the root model of each record file: every other model is a part of one
    for root in (InductionDesign, SurfacePMDesign, SalientFieldDesign, MaterialsFile, WaiversFile):
        walk(root)
    return tuple(sorted(names))


#: Each string pattern of the models and the policy files, in words: no regex reaches a user.
PATTERN_WORDS = {
    r"^[a-z0-9][a-z0-9._-]{0,63}$": "an id of 1 to 64 lower-case letters, digits, '.', '_'"
    " or '-', starting with a letter or a digit, such as 'pump-drive-4p36s'",
    r"^\s*[-+]?[A-Z](\s+[-+]?[A-Z])?\s*$": "one or two coil sides, top layer first, each"
    " a phase letter with its sign, such as '+A' or '+A -C'",
    r"^IC[0-9A-Z]{2,12}$": "a cooling code of IEC 60034-6: 'IC' followed by 2 to 12 digits"
    " or capital letters, such as 'IC411'",
    r"^(all|tag:[a-z][a-z0-9-]*|[a-z][a-z0-9-]*(/([a-z][a-z0-9-]*)?)?)$": "a rule selector:"
    " 'all', a rule id such as 'slot-fill', a pack prefix such as 'acme/' or a tag such as"
    " 'tag:thermal'",
}


def _model_at(data: Any, path: RecordPath) -> type[BaseModel] | None:
    """The record model that holds the keys at ``path``, or None when not found."""
    from emgate import model as m

    kinds: dict[Any, type[BaseModel]] = {
        "induction": m.InductionDesign,
        "surface_pm": m.SurfacePMDesign,
        "salient_field": m.SalientFieldDesign,
    }
    node: Any = data
    current: Any = kinds.get(data.get("machine")) if isinstance(data, dict) else None
    for part in path:
        if current is None or not isinstance(node, dict | list):
            return None
        if isinstance(node, dict):
            node = node[part]
        else:
            node = node[part] if isinstance(part, int) else None
        if isinstance(part, int):
            continue  # a list item: the item model was chosen at the list's key
        info = current.model_fields.get(part) or next(
            (f for f in current.model_fields.values() if f.alias == part), None
        )
        if info is None:
            return None
        choices = _models_in(info.annotation)
        shape = node.get("shape") if isinstance(node, dict) else None
        current = next((c for c in choices if shape is None or _has_tag(c, shape)), None)
    return current


def _allowed_keys(data: Any, path: RecordPath) -> set[str] | None:
    """The keys the model allows at ``path`` of the record, or None when not found."""
    model = _model_at(data, path)
    if model is None:
        return None
    return {f.alias or name for name, f in model.model_fields.items()}


def _typical(data: Any, path: RecordPath) -> str:
    """What a missing key could be given: the field's first example (as the schema offers
    it to an editor), the choices of a closed set, or the keys a mapping needs."""
    from pydantic import WithJsonSchema

    model = _model_at(data, path[:-1])
    key = str(path[-1])
    info = None
    if model is not None:
        info = model.model_fields.get(key) or next(
            (f for f in model.model_fields.values() if f.alias == key), None
        )
    if info is None or model is None:
        return ""
    from emgate.field_docs import doc_for

    examples = doc_for(model.__name__, key)[1] + list(info.examples or [])
    for meta in info.metadata:
        if isinstance(meta, WithJsonSchema) and meta.json_schema:
            examples += meta.json_schema.get("examples", [])
    if examples:
        return f"; for example '{key}: {examples[0]}'"
    choices = [a for a in get_args(info.annotation) if isinstance(a, str | int)]
    if get_origin(info.annotation) is Literal and choices:
        return f"; one of {', '.join(map(str, choices))}"
    subs = _models_in(info.annotation)
    if len(subs) == 1:
        needed = [f.alias or n for n, f in subs[0].model_fields.items() if f.is_required()]
        return f"; a mapping with {', '.join(needed)}" if needed else ""
    return ""


def _has_tag(model: type[BaseModel], tag: Any) -> bool:
    field = model.model_fields.get("shape")
    return field is not None and tag in getattr(field.annotation, "__args__", ())


def _models_in(annotation: Any) -> list[type[BaseModel]]:
    out = []
    if isinstance(annotation, type) and issubclass(annotation, BaseModel):
        out.append(annotation)
    for arg in getattr(annotation, "__args__", ()) or ():
        out.extend(_models_in(arg))
    return out


def record_path(data: Any, loc: tuple[Any, ...]) -> RecordPath:
    """Map a pydantic error location onto the record, dropping discriminated-union tags."""
    path: list[str | int] = []
    node = data
    for part in loc:
        if isinstance(node, dict) and part in node:
            node = node[part]
            path.append(part)
        elif isinstance(node, list) and isinstance(part, int) and part < len(node):
            node = node[part]
            path.append(part)
        elif isinstance(part, str) and part in UNION_TAGS:
            continue
        elif isinstance(part, str) and "[" in part:  # tuple or function-validator labels
            continue
        else:
            path.append(part)
            node = None
    return tuple(path)


def describe_value(value: Any) -> str:
    """What a message says was found: the kind of a container, else the value, shortened."""
    if isinstance(value, dict):
        return "a mapping"
    if isinstance(value, list):
        return "a list"
    if isinstance(value, bool):
        return f"the boolean {str(value).lower()}"
    if value is None:
        return "nothing (null)"
    text = repr(value)
    return text if len(text) <= 60 else text[:57] + "..."


def _message(error: ErrorDetails, doc: Document, path: RecordPath) -> str:
    kind = error["type"]
    msg: str = error["msg"].removeprefix("Value error, ")
    if kind == "extra_forbidden":
        key = str(path[-1])
        allowed = _allowed_keys(doc.data, path[:-1])
        candidates = sorted(allowed) if allowed is not None else list(_vocabulary())
        close = difflib.get_close_matches(key, [c for c in candidates if c != key], n=1, cutoff=0.7)
        hint = f"; did you mean {close[0]!r}?" if close else ""
        if allowed is not None and not close:
            hint = f"; expected one of {', '.join(sorted(allowed))}"
        return f"unknown key {key!r}{hint}"
    if kind == "missing":
        return f"required key {str(path[-1])!r} is missing{_typical(doc.data, path)}"
    if kind == "string_pattern_mismatch":
        pattern = error.get("ctx", {}).get("pattern", "")
        words = PATTERN_WORDS.get(pattern, "text of another form (see the field's description)")
        return f"expected {words}, found {describe_value(error.get('input'))}"
    found = describe_value(error.get("input"))
    if kind == "literal_error":
        expected = msg.removeprefix("Input should be ")
        return f"expected {expected}, found {found}"
    if kind == "union_tag_invalid":
        ctx = error.get("ctx", {})
        return f"expected one of {ctx.get('expected_tags', '')}, found {ctx.get('tag')!r}"
    if kind == "union_tag_not_found":
        tag = error.get("ctx", {}).get("discriminator", "")
        return f"required key {tag} is missing"
    if kind in (
        "int_type",
        "float_type",
        "string_type",
        "bool_type",
        "date_type",
        "dict_type",
        "list_type",
        "model_type",
        "tuple_type",
    ):
        wanted = kind.removesuffix("_type").replace("model", "mapping").replace("dict", "mapping")
        wanted = {
            "int": "a whole number",
            "float": "a number",
            "string": "text",
            "bool": "true or false",
            "date": "a date (YYYY-MM-DD)",
        }.get(wanted, f"a {wanted}")
        return f"expected {wanted}, found {found}"
    if msg.startswith("Input should be"):
        return f"expected {msg.removeprefix('Input should be ').rstrip('.')}, found {found}"
    return msg[0].lower() + msg[1:] if msg else kind


def model_errors(exc: ValidationError, doc: Document) -> list[InputError]:
    """One located input error for each error pydantic raised on ``doc``."""
    out = []
    for error in exc.errors(include_url=False):
        path = record_path(doc.data, tuple(error["loc"]))
        if error["type"] == "union_tag_invalid":  # point at the discriminator's value
            path = (*path, error["ctx"]["discriminator"].strip("'"))
        loc = doc.locate_key(path) if error["type"] == "extra_forbidden" else doc.locate(path)
        out.append(InputError(_message(error, doc, path), loc))
    return out
