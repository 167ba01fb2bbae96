"""Option fields shared by the built-in rules: one limit per machine kind or cooling method."""

from __future__ import annotations

from typing import Any

from pydantic import Field


def limit(default: float, source: str) -> Any:
    """An option field whose default limit names its source in the schema and in explain."""
    return Field(default=default, description=f"default from {source}")


def basis(options: Any, field: str, default: float, source: str) -> str:
    """Where a limit comes from: the default's source, or the team's configuration."""
    return source if getattr(options, field) == default else "the team's limit (emgate.yaml)"
