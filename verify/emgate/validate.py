"""Validation of loaded documents: the model, then the physical consistency of the record.

The translation of pydantic errors is :mod:`emgate.translate`; the physical consistency of a
design is :mod:`emgate.consistency`.
"""

from __future__ import annotations

from functools import cache
from typing import Any

from pydantic import TypeAdapter, ValidationError

from emgate.consistency import consistency_problems
from emgate.errors import InputError, InputErrors
from emgate.loader import Document
from emgate.model import DESIGN_MODELS, AnyDesign, Design
from emgate.model.materials import MaterialsFile
from emgate.terms import DESIGN_SCHEMA, MATERIALS_SCHEMA
from emgate.translate import describe_value, model_errors

KNOWN_SCHEMAS = (DESIGN_SCHEMA, MATERIALS_SCHEMA)


@cache
def _design_adapter() -> TypeAdapter[Any]:
    return TypeAdapter(Design)


def schema_of(doc: Document) -> str:
    """The record kind a document declares, or an InputError."""
    if not isinstance(doc.data, dict):
        raise InputError(
            f"expected a mapping with a 'schema' key, found {describe_value(doc.data)}",
            doc.locate(()),
        )
    declared = doc.data.get("schema")
    if declared not in KNOWN_SCHEMAS:
        expected = " or ".join(repr(s) for s in KNOWN_SCHEMAS)
        raise InputError(
            f"expected schema {expected}, found {describe_value(declared)}", doc.locate(("schema",))
        )
    return declared


def _design(data: Any) -> AnyDesign:
    """The model of the machine kind the record names; the union, with its message, for a
    kind missing or unknown. One kind's validator is built at start-up, not the three."""
    kind = data.get("machine") if isinstance(data, dict) else None
    model = DESIGN_MODELS.get(kind) if isinstance(kind, str) else None
    if model is None:
        return _design_adapter().validate_python(data)
    return model.model_validate(data)


def validate_design(doc: Document) -> AnyDesign:
    """Validate a design document: the model, then physical consistency."""
    try:
        design = _design(doc.data)
    except ValidationError as exc:
        raise InputErrors(model_errors(exc, doc)) from None
    problems = [
        InputError(message, doc.locate(path)) for path, message in consistency_problems(design)
    ]
    if problems:
        raise InputErrors(problems)
    return design


def validate_materials(doc: Document) -> MaterialsFile:
    try:
        return MaterialsFile.model_validate(doc.data)
    except ValidationError as exc:
        raise InputErrors(model_errors(exc, doc)) from None
