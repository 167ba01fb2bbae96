"""Located errors: what reaches a user instead of a traceback."""

from __future__ import annotations

import os
from dataclasses import dataclass
from pathlib import Path


@dataclass(frozen=True)
class Location:
    """Where something stands: file, 1-based line and column, and the record path."""

    file: Path
    line: int
    column: int
    record_path: str = "$"

    def __str__(self) -> str:
        return f"{display_path(self.file)}:{self.line}:{self.column}"


def within(path: str, folder: str) -> str | None:
    """``path`` relative to ``folder`` (both resolved, as texts; "." for the folder itself),
    or None when it lies outside: by whole parts (``/a/bc`` is not inside ``/a/b``)."""
    if path == folder:
        return "."
    prefix = folder if folder.endswith(os.sep) else folder + os.sep
    return path[len(prefix) :] if path.startswith(prefix) else None


def resolved(path: Path) -> Path:
    """``path.resolve()``, except that a symbolic-link loop is left as it stands (Python
    3.11's pathlib raises RuntimeError on one): the file's read then reports it, located."""
    return Path(os.path.realpath(path))


def display_path(path: Path, real: str | None = None) -> str:
    """A path relative to the working directory where possible, with forward slashes.
    ``real``: the path resolved already (discovery resolves each file once)."""
    if os.name == "posix":  # strings, not pathlib: a check names every record's file
        try:
            cwd = os.getcwd()  # the kernel's own: no symbolic link in it to resolve
            if real is None:
                real = os.path.realpath(path)
        except OSError:
            return Path(path).as_posix()
        if real == cwd:
            return "."
        inside = cwd if cwd.endswith("/") else cwd + "/"
        return real[len(inside) :] if real.startswith(inside) else Path(path).as_posix()
    try:
        rel = path.resolve().relative_to(Path.cwd().resolve())
    except (ValueError, OSError):
        rel = path
    return rel.as_posix()


class InputError(Exception):
    """Input or configuration that cannot be read or validated (exit code 2)."""

    def __init__(self, message: str, location: Location | None = None) -> None:
        super().__init__(message)
        self.message = message
        self.location = location

    def __str__(self) -> str:
        if self.location is None:
            return self.message
        where = str(self.location)
        at = f" at {self.location.record_path}" if self.location.record_path != "$" else ""
        return f"{where}: {self.message}{at}"


class InputErrors(Exception):
    """Several located input errors from one file, reported together."""

    def __init__(self, errors: list[InputError]) -> None:
        super().__init__(f"{len(errors)} input errors")
        self.errors = errors
