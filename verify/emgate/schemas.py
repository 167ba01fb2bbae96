"""The JSON Schemas of the record kinds, as committed under schemas/ and written by ``emgate init``.

A module of its own so that the command line and the scaffold both use it without importing
each other; the models are imported only when a schema is asked for.
"""

from __future__ import annotations

SCHEMA_KINDS = ("design", "materials", "waivers", "config")


def schema_text(kind: str) -> str:
    """The JSON Schema of a record kind, as committed under schemas/."""
    import json

    if kind == "config":
        from emgate.config import config_json_schema

        schema = config_json_schema()
    else:
        from emgate.model import json_schema

        schema = json_schema(kind)
    return json.dumps(schema, indent=2, sort_keys=True) + "\n"
