"""Guarded YAML loading that keeps the line and column of every node.

The document is built from libyaml's event stream (the C parser; never PyYAML's pure-Python
loader, measured ten times slower), so every hostile construct is refused before anything walks
the data: anchors and aliases (expansion bombs and cycles), merge keys, explicit tags, duplicate
keys, deep nesting, oversized files and scalars, and the YAML 1.1 scalars that silently change
meaning (yes/no/on/off, octal-looking numbers). Plain scalars resolve by the YAML 1.2 core
schema, restricted: null, true/false, decimal integers and floats; everything else is a string
(dates and sexagesimal numbers stay text; the model parses them where it wants them).
"""

from __future__ import annotations

import os
import re
import stat
from collections.abc import Callable, Mapping
from contextvars import ContextVar
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import yaml

from emgate.errors import InputError, Location
from emgate.terms import RecordPath, path_string

MAX_BYTES = 1 << 20
MAX_DEPTH = 24
MAX_SCALAR = 4096
MAX_NODES = 100_000
MAX_NUMBER_CHARS = 40

_INT = re.compile(r"[-+]?(0|[1-9][0-9]*)")
_FLOAT = re.compile(r"[-+]?(\.[0-9]+|[0-9]+(\.[0-9]*)?)([eE][-+]?[0-9]+)?")
_OCTALISH = re.compile(r"[-+]?0[0-9_]+|0o[0-7]+|0x[0-9a-fA-F]+|0b[01]+")
_BOOL11 = {"yes", "no", "on", "off", "y", "n"}
_NONFINITE = re.compile(r"[-+]?\.(inf|nan)", re.IGNORECASE)
#: Plain scalars that are no text, by the restricted core schema.
_SPECIAL: dict[str, Any] = {
    **dict.fromkeys(("", "~", "null", "Null", "NULL")),
    **dict.fromkeys(("true", "True", "TRUE"), True),
    **dict.fromkeys(("false", "False", "FALSE"), False),
}
_TEXT = object()
#: The first characters of whatever _INT, _FLOAT, _OCTALISH or _NONFINITE match.
_NUMBER_START = frozenset("+-.0123456789")
#: The event type of most nodes, compared by identity on the loader's hot path.
_SCALAR = yaml.ScalarEvent
_PLAIN_TAGS = {
    None,
    "!",
    "tag:yaml.org,2002:str",
    "tag:yaml.org,2002:map",
    "tag:yaml.org,2002:seq",
}


@dataclass
class Document:
    """A loaded YAML document: its data and where each node stands in the file."""

    path: Path
    data: Any
    marks: dict[RecordPath, tuple[int, int]] = field(default_factory=dict)
    key_marks: dict[RecordPath, tuple[int, int]] = field(default_factory=dict)
    collections: set[RecordPath] = field(default_factory=set)

    def locate(self, path: RecordPath) -> Location:
        """Location of the deepest existing node along ``path`` (1-based line and column).

        A mapping or list is located at its key (its first item may be lines below)."""
        for n in range(len(path), -1, -1):
            sub = tuple(path[:n])
            mark = self.key_marks.get(sub) if sub in self.collections else None
            mark = mark or self.marks.get(sub)
            if mark is not None:
                return Location(self.path, mark[0] + 1, mark[1] + 1, path_string(path))
        return Location(self.path, 1, 1, path_string(path))

    def locate_key(self, path: RecordPath) -> Location:
        """Location of the mapping key that names ``path`` (falls back to the value)."""
        mark = self.key_marks.get(tuple(path))
        if mark is None:
            return self.locate(path)
        return Location(self.path, mark[0] + 1, mark[1] + 1, path_string(path))


#: What libyaml says, one line late, about a key written without its colon.
_LOST_COLON = ("could not find expected ':'", "mapping values are not allowed in this context")


def _line_without_colon(text: str, problem_line: int) -> int | None:
    """The line a colon is likely missing from: the nearest line above the parser's mark
    that holds text and no ':' (libyaml reads such a line as the start of a key or a
    multi-line scalar and stops on the next line). 0-based; None when there is none."""
    lines = text.splitlines()
    for n in range(min(problem_line, len(lines)) - 1, -1, -1):
        content = lines[n].split(" #", 1)[0].strip()
        if not content or content.startswith("#"):
            continue
        return n if ":" not in content and not content.startswith(("-", "[", "{")) else None
    return None


class _Builder:
    def __init__(self, path: Path, text: str) -> None:
        self.path = path
        self.doc = Document(path, None)
        self.text = text
        self.loader = yaml.CSafeLoader(text)
        self.nodes = 0

    def fail(self, mark: Any, message: str, record_path: RecordPath = ()) -> InputError:
        line = getattr(mark, "line", 0) + 1
        col = getattr(mark, "column", 0) + 1
        return InputError(message, Location(self.path, line, col, path_string(record_path)))

    def yaml_error(self, exc: yaml.YAMLError) -> InputError:
        """libyaml's error, located, in the words a designer reads."""
        if not isinstance(exc, yaml.MarkedYAMLError):
            return InputError(f"YAML error: {exc}", Location(self.path, 1, 1, "$"))
        mark = exc.problem_mark or exc.context_mark
        problem = exc.problem or exc.context or ""
        if "nesting depth" in problem:  # newer libyaml scans ahead and stops at 1000
            line, col = _flow_depth_mark(self.text, MAX_DEPTH)
            return InputError(
                f"nesting deeper than {MAX_DEPTH} levels", Location(self.path, line, col, "$")
            )
        if problem in _LOST_COLON and mark is not None:
            lost = _line_without_colon(self.text, mark.line)
            if lost is not None:
                text = self.text.splitlines()[lost]
                return InputError(
                    "YAML syntax error: a ':' is likely missing after the key on this"
                    f" line (write 'key: value'; the parser stopped on line"
                    f" {mark.line + 1}: {problem})",
                    Location(self.path, lost + 1, len(text) - len(text.lstrip()) + 1, "$"),
                )
        return self.fail(mark, f"YAML syntax error: {problem}")

    def build(self) -> Document:
        # libyaml's events straight from the parser (a generator in between cost a fifth of
        # the build); its errors, raised by any get_event, are translated here.
        get = self.loader.get_event
        documents = 0
        try:
            while (event := get()) is not None:
                if isinstance(event, yaml.DocumentStartEvent):
                    documents += 1
                    if documents > 1:
                        raise self.fail(event.start_mark, "expected one YAML document, found more")
                    self.doc.data = self.node(get, get(), (), 0)
        except yaml.YAMLError as exc:
            raise self.yaml_error(exc) from None
        finally:
            self.loader.dispose()
        if documents == 0:
            raise InputError("the file is empty", Location(self.path, 1, 1, "$"))
        return self.doc

    def node(self, get: Callable[[], Any], event: Any, path: RecordPath, depth: int) -> Any:
        self.nodes += 1
        if event is None:  # (libyaml reports a truncated stream before it ends)
            raise InputError("the YAML ends inside a value", Location(self.path, 1, 1, "$"))
        if self.nodes > MAX_NODES:
            raise self.fail(event.start_mark, f"more than {MAX_NODES} YAML nodes", path)
        if type(event) is _SCALAR:  # most nodes: the checks below, without the lookups
            tag = event.tag
            if event.anchor is None and (tag is None or not _refused_tag(tag, event.implicit[0])):
                mark: Any = event.start_mark
                self.doc.marks[path] = (mark.line, mark.column)
                return self.scalar(event, path)
        if isinstance(event, yaml.AliasEvent):
            raise self.fail(
                event.start_mark,
                f"YAML aliases (*{event.anchor}) are not allowed: write the value out",
                path,
            )
        if getattr(event, "anchor", None) is not None:
            raise self.fail(
                event.start_mark,
                f"YAML anchors (&{event.anchor}) are not allowed: write each value out",
                path,
            )
        tag = getattr(event, "tag", None)
        implicit: Any = getattr(event, "implicit", True)
        if _refused_tag(tag, isinstance(event, yaml.ScalarEvent) and implicit[0]):
            raise self.fail(event.start_mark, f"YAML tags such as {tag!r} are not allowed", path)
        self.doc.marks[path] = (event.start_mark.line, event.start_mark.column)
        if isinstance(event, yaml.ScalarEvent):
            return self.scalar(event, path)
        if depth >= MAX_DEPTH:
            raise self.fail(event.start_mark, f"nesting deeper than {MAX_DEPTH} levels", path)
        self.doc.collections.add(path)
        if isinstance(event, yaml.SequenceStartEvent):
            items: list[Any] = []
            while (item := get()) is not None:
                if isinstance(item, yaml.SequenceEndEvent):
                    return items
                items.append(self.node(get, item, (*path, len(items)), depth + 1))
        if isinstance(event, yaml.MappingStartEvent):
            mapping: dict[str, Any] = {}
            key_marks = self.doc.key_marks
            while (key_event := get()) is not None:
                if isinstance(key_event, yaml.MappingEndEvent):
                    return mapping
                # a plain key without anchor or tag passes key()'s checks but its length
                key = key_event.value if type(key_event) is _SCALAR else None
                if (
                    key is None
                    or key_event.anchor is not None
                    or key_event.tag is not None
                    or len(key) > 200
                    or (key == "<<" and not key_event.style)
                ):
                    key = self.key(key_event, path)
                sub = (*path, key)
                if key in mapping:
                    first = key_marks[sub]
                    raise self.fail(
                        key_event.start_mark,
                        f"duplicate key {key!r} (first given at line {first[0] + 1})",
                        sub,
                    )
                mark = key_event.start_mark
                key_marks[sub] = (mark.line, mark.column)
                mapping[key] = self.node(get, get(), sub, depth + 1)
        raise self.fail(event.start_mark, f"unexpected YAML event {type(event).__name__}", path)

    def key(self, event: Any, path: RecordPath) -> str:
        if not isinstance(event, yaml.ScalarEvent):
            raise self.fail(event.start_mark, "mapping keys must be plain text", path)
        if event.anchor is not None or (event.tag not in _PLAIN_TAGS and not event.implicit[0]):
            raise self.fail(event.start_mark, "mapping keys cannot carry anchors or tags", path)
        if event.value == "<<" and not event.style:
            raise self.fail(event.start_mark, "YAML merge keys (<<) are not allowed", path)
        if len(event.value) > 200:
            raise self.fail(event.start_mark, "mapping key longer than 200 characters", path)
        return event.value

    def scalar(self, event: Any, path: RecordPath) -> Any:
        value: str = event.value
        if len(value) > MAX_SCALAR:
            raise self.fail(event.start_mark, f"text longer than {MAX_SCALAR} characters", path)
        if event.style or event.tag == "tag:yaml.org,2002:str":
            return value  # quoted or block scalars are text
        if " " in value:
            return value  # no null, boolean or number has a space: '0.45 mm' is text
        special = _SPECIAL.get(value, _TEXT)
        if special is not _TEXT:
            return special
        if value.lower() in _BOOL11:
            raise self.fail(
                event.start_mark,
                f"ambiguous value {value!r}: YAML 1.1 reads it as a boolean; write true or false,"
                " or quote it for text",
                path,
            )
        if not value or value[0] not in _NUMBER_START:
            return value  # no number, octal-looking or not, nor .inf or .nan begins so
        is_int = _INT.fullmatch(value) is not None
        if not is_int:
            if _NONFINITE.fullmatch(value):
                raise self.fail(event.start_mark, f"{value!r} is not a finite number", path)
            if _OCTALISH.fullmatch(value):
                raise self.fail(
                    event.start_mark,
                    f"ambiguous number {value!r}: YAML 1.1 reads leading zeros as octal or a"
                    " prefix as another base; write a plain decimal number, or quote it for text",
                    path,
                )
            if not _FLOAT.fullmatch(value):
                return value
        if len(value) > MAX_NUMBER_CHARS:
            raise self.fail(
                event.start_mark, f"number longer than {MAX_NUMBER_CHARS} characters", path
            )
        if is_int:
            return int(value)
        number = float(value)
        if number in (float("inf"), float("-inf")):
            raise self.fail(event.start_mark, f"{value!r} is not a finite number", path)
        return number


def _flow_depth_mark(text: str, limit: int) -> tuple[int, int]:
    """1-based line and column of the flow bracket that reaches nesting ``limit`` (quoted
    text skipped); the start of the file when none does."""
    depth, line, col, quote = 0, 1, 0, ""
    for ch in text:
        col += 1
        if ch == "\n":
            line, col = line + 1, 0
        elif quote:
            quote = "" if ch == quote else quote
        elif ch in "'\"":
            quote = ch
        elif ch in "[{":
            depth += 1
            if depth >= limit:  # as the event builder counts, under a block mapping
                return line, col
        elif ch in "]}":
            depth -= 1
    return 1, 1


def _refused_tag(tag: str | None, plain_scalar: bool) -> bool:
    """Whether a node's tag is an explicit one, which is refused: a tag other than the
    plain ones (a plain scalar's resolved tag excepted), or any local ``!tag``."""
    explicit = tag not in _PLAIN_TAGS and not plain_scalar
    return explicit or (tag is not None and tag.startswith("!") and tag != "!")


#: Unsaved editor text by resolved path, read in place of the file (``emgate lsp``); the
#: same checks apply to it as to a file's bytes.
BUFFERS: ContextVar[Mapping[Path, str] | None] = ContextVar("emgate_buffers", default=None)


def read_head(path: Path | str, size: int) -> bytes:
    """The first ``size`` bytes of a regular file (an editor's buffer of it if open), for a
    look at its head; OSError, or InputError for a file that is no regular file."""
    return _read_bytes(path, size)


def _read_bytes(path: Path | str, limit: int = MAX_BYTES + 1) -> bytes:
    buffers = BUFFERS.get()
    if buffers and (text := buffers.get(Path(path).resolve())) is not None:
        return text.encode("utf-8", "surrogatepass")[:limit]
    # Opened without blocking and checked on the open descriptor: a FIFO or a device would
    # otherwise hold the run forever (and a check before opening could be raced).
    fd = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0))
    try:
        info = os.fstat(fd)
        if not stat.S_ISREG(info.st_mode):
            raise InputError(
                "not a regular file (a pipe, device, socket or folder): emgate reads only"
                " regular files",
                Location(Path(path), 1, 1, "$"),
            )
        # Reads sized to the file: one of MAX_BYTES + 1 would allocate the whole 1 MiB
        # first, which costs more than reading a record. One byte more shows growth; a file
        # that grew is read on to the limit. On the descriptor itself: a buffered file
        # object costs more than the reads of a record.
        want = min(limit, info.st_size + 1)
        raw = b""
        while len(raw) < want:
            chunk = os.read(fd, want - len(raw))
            if not chunk:
                break
            raw += chunk
            if len(raw) == want:
                want = limit
        return raw
    finally:
        os.close(fd)


_CONTROL = re.compile(r"[\x00-\x08\x0b\x0c\x0e-\x1f\x7f\ufffe\uffff]")
#: _CONTROL's ASCII characters as bytes, and its two others in UTF-8: text without them has
#: no match, which bytes.translate tells five times faster than the search.
_CONTROL_BYTES = bytes([*range(0x00, 0x09), 0x0B, 0x0C, *range(0x0E, 0x20), 0x7F])
_NONCHARACTERS = (b"\xef\xbf\xbe", b"\xef\xbf\xbf")  # U+FFFE, U+FFFF


def read_text(path: Path | str) -> str:
    """Read a file as UTF-8 text, refusing oversized, binary or wrongly encoded files. (A
    name as text is read as its path: discovery reads a large repository's files without a
    path object each.)"""
    try:
        raw = _read_bytes(path)
    except OSError as exc:
        raise InputError(
            f"cannot read file: {exc.strerror}", Location(Path(path), 1, 1, "$")
        ) from None
    if len(raw) > MAX_BYTES:
        raise InputError(
            f"file larger than {MAX_BYTES // 1024} KiB; a design record is a few KiB",
            Location(Path(path), 1, 1, "$"),
        )
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = raw[: exc.start].count(b"\n") + 1
        col = exc.start - (raw.rfind(b"\n", 0, exc.start) + 1) + 1
        raise InputError(
            f"expected UTF-8 text, found byte 0x{raw[exc.start]:02x}",
            Location(Path(path), line, col, "$"),
        ) from None
    clean = len(raw.translate(None, _CONTROL_BYTES)) == len(raw)
    bad = None if clean and not any(n in raw for n in _NONCHARACTERS) else _CONTROL.search(text)
    if bad:
        line = text.count("\n", 0, bad.start()) + 1
        col = bad.start() - (text.rfind("\n", 0, bad.start()) + 1) + 1
        raise InputError(
            f"expected text, found control character U+{ord(bad.group()):04X} (binary file?)",
            Location(Path(path), line, col, "$"),
        )
    return text.removeprefix("\ufeff")


def load_text(path: Path, text: str) -> Document:
    """Build a :class:`Document` from YAML text, refusing hostile constructs."""
    return _Builder(path, text).build()


def load(path: Path) -> Document:
    """Read and load one YAML file."""
    return load_text(path, read_text(path))
