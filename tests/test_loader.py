"""The guarded YAML loader: hostile input is refused with line and column, marks are right.

Expected lines and columns are counted by hand from each text (1-based); the marks of whole
records are compared with PyYAML's own composer, an implementation independent of emgate's
event-stream builder.
"""

from __future__ import annotations

import re
from pathlib import Path
from typing import Any

import pytest
import yaml

from conftest import DESIGNS, GENSET, PUMP, STEELS, run_cli
from emgate.errors import InputError
from emgate.loader import (
    MAX_BYTES,
    MAX_DEPTH,
    MAX_NUMBER_CHARS,
    MAX_SCALAR,
    load,
    load_text,
    read_text,
)


def _alias_bomb() -> str:
    """Nine levels of nine aliases each (the 'billion laughs' shape): 9**9 leaves."""
    lines = ['a: &a ["lol", "lol", "lol", "lol", "lol", "lol", "lol", "lol", "lol"]']
    for prev, name in zip("abcdefgh", "bcdefghi", strict=True):
        lines.append(f"{name}: &{name} [{', '.join(['*' + prev] * 9)}]")
    return "\n".join(lines) + "\n"


# (id, file content, message pattern, line, column); positions counted by hand, 1-based.
HOSTILE: list[tuple[str, str | bytes, str, int, int]] = [
    ("alias-bomb", _alias_bomb(), "anchors", 1, 4),
    ("alias", "a: 1\nb:\n  c: *x\n", "aliases", 3, 6),
    ("self-alias", "a: &x [*x]\n", "anchors", 1, 4),
    ("anchor", "a: &x 1\nb: 2\n", "anchors", 1, 4),
    ("merge-key", "base: {a: 1}\nd:\n  <<: {a: 2}\n  b: 3\n", r"merge keys \(<<\)", 3, 3),
    ("python-tag", "a: !!python/object:os.system x\n", "tags", 1, 4),
    ("python-apply", "a: !!python/object/apply:os.system ['true']\n", "tags", 1, 4),
    ("custom-tag", "a: 1\nb: !thing x\n", "tags", 2, 4),
    ("custom-tag-map", "a: !thing {b: 1}\n", "tags", 1, 4),
    ("int-tag", "a: !!int '3'\n", "tags", 1, 4),
    ("duplicate-key", "a: 1\nb: 2\na: 3\n", r"duplicate key 'a' \(first given at line 1\)", 3, 1),
    ("duplicate-nested", "s:\n  x: 1\n  y: 2\n  x: 3\n", "first given at line 2", 4, 3),
    # The root mapping is level 0, so the '[' that opens level MAX_DEPTH is refused.
    ("deep", "a: " + "[" * 30 + "]" * 30 + "\n", f"deeper than {MAX_DEPTH}", 1, 3 + MAX_DEPTH),
    ("deeper-than-libyaml", "a: " + "[" * 5000 + "]" * 5000 + "\n", "deeper", 1, 3 + MAX_DEPTH),
    ("large-file", "# " + "x" * MAX_BYTES + "\n", "larger than 1024 KiB", 1, 1),
    ("long-scalar", "a: " + "x" * (MAX_SCALAR + 1) + "\n", f"longer than {MAX_SCALAR}", 1, 4),
    (
        "long-digits",
        "a: " + "7" * MAX_SCALAR + "\n",
        f"number longer than {MAX_NUMBER_CHARS}",
        1,
        4,
    ),
    ("longer-digits", "a: 1\nb: " + "7" * 5000 + "\n", "longer than", 2, 4),
    ("number-41", "a: " + "1" * (MAX_NUMBER_CHARS + 1) + "\n", "number longer", 1, 4),
    ("nan", "a: .nan\n", "not a finite number", 1, 4),
    ("NaN", "a: .NaN\n", "not a finite number", 1, 4),
    ("inf", "a: 1\nb: .inf\n", "not a finite number", 2, 4),
    ("minus-inf", "a: -.Inf\n", "not a finite number", 1, 4),
    ("overflow", "a: 1e999\n", "not a finite number", 1, 4),
    ("yes", "a: yes\n", "ambiguous value 'yes'", 1, 4),
    ("no", "a: no\n", "ambiguous value 'no'", 1, 4),
    ("On", "a: On\n", "ambiguous value 'On'", 1, 4),
    ("off", "list:\n  - off\n", "ambiguous value 'off'", 2, 5),
    ("y", "a: y\n", "ambiguous value 'y'", 1, 4),
    ("octal", "a: 017\n", "ambiguous number '017'", 1, 4),
    ("octal-negative", "a: -017\n", "ambiguous number", 1, 4),
    ("hex", "a: 0x1F\n", "ambiguous number '0x1F'", 1, 4),
    ("octal-1.2", "a: 0o17\n", "ambiguous number", 1, 4),
    ("binary", "a: 0b101\n", "ambiguous number", 1, 4),
    ("latin-1", b"a: 1\nb: caf\xe9\n", "UTF-8.*0xe9", 2, 7),
    ("nul", b"a: 1\nb: x\x00y\n", "control character U\\+0000", 2, 5),
    ("syntax", "a: [1, 2\nb: 3\n", "syntax error", 2, 2),  # where libyaml detects it
    ("tab-indent", "a:\n\tb: 1\n", "syntax error", 2, 1),
    ("two-documents", "a: 1\n---\nb: 2\n", "one YAML document", 2, 1),
    ("empty", "", "empty", 1, 1),
    ("only-comments", "# nothing here\n", "empty", 1, 1),
    ("complex-key", "? [a, b]\n: 1\n", "keys must be plain text", 1, 3),
]


def _write(folder: Path, name: str, content: str | bytes) -> Path:
    path = folder / name
    if isinstance(content, str):
        content = content.encode("utf-8")
    path.write_bytes(content)
    return path


@pytest.mark.parametrize(
    ("content", "pattern", "line", "column"), [h[1:] for h in HOSTILE], ids=[h[0] for h in HOSTILE]
)
def test_hostile_input_is_a_located_error(
    tmp_path: Path, content: str | bytes, pattern: str, line: int, column: int
) -> None:
    path = _write(tmp_path, "hostile.yaml", content)
    with pytest.raises(InputError, match=pattern) as info:
        load(path)
    loc = info.value.location
    assert loc is not None
    assert (loc.file, loc.line, loc.column) == (path, line, column)


def located(output: str, file: str, line: int, column: int) -> bool:
    """Whether a text report locates something at file:line:column, written either on one
    line or as a file heading with 'line:column' entries beneath it."""
    if f"{file}:{line}:{column}" in output:
        return True
    entries = re.split(r"^(?=\S)", output, flags=re.MULTILINE)
    return any(
        block.splitlines()[0] == file
        and re.search(rf"^\s+{line}:{column}\s", block, flags=re.MULTILINE) is not None
        for block in entries
        if block.strip()
    )


DECLARES = "schema: emgate/design@1\n"  # what makes a named file an emgate record
# Read-level refusals locate the file itself, so the line above does not shift them.
FILE_LEVEL = {"large-file"}
# With the schema line these are no longer empty; see test_named_non_emgate_file_is_skipped.
NOT_RECORDS = {"empty", "only-comments"}
CLI_CASES = [h for h in HOSTILE if h[0] not in NOT_RECORDS]


@pytest.mark.parametrize(
    ("name", "content", "line", "column"),
    [(h[0], h[1], h[3], h[4]) for h in CLI_CASES],
    ids=[h[0] for h in CLI_CASES],
)
def test_hostile_input_through_the_cli(
    repo: Path,
    monkeypatch: pytest.MonkeyPatch,
    name: str,
    content: str | bytes,
    line: int,
    column: int,
) -> None:
    monkeypatch.chdir(repo)
    raw = content.encode("utf-8") if isinstance(content, str) else content
    _write(repo, "hostile.yaml", DECLARES.encode() + raw)
    shift = 0 if name in FILE_LEVEL else 1
    result = run_cli("check", "hostile.yaml")
    assert result.code == 2, result.out + result.err
    assert located(result.out, "hostile.yaml", line + shift, column), result.out


@pytest.mark.parametrize("content", ["", "# nothing here\n", "jobs:\n  test: {runs-on: x}\n"])
def test_named_non_emgate_file_is_skipped(
    repo: Path, monkeypatch: pytest.MonkeyPatch, content: str
) -> None:
    # pre-commit passes every changed YAML file along: a file with no 'schema: emgate/...'
    # line is noted and skipped, not failed.
    monkeypatch.chdir(repo)
    _write(repo, "other.yaml", content)
    result = run_cli("check", "--format", "json", "other.yaml")
    assert result.code == 0
    (note,) = result.json()["findings"]
    assert note["severity"] == "info" and "not an emgate file" in note["message"]


def test_named_binary_file_without_schema_line_still_fails(
    repo: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.chdir(repo)
    _write(repo, "blob.yaml", b"a: 1\nb: x\x00y\n")
    result = run_cli("check", "blob.yaml")
    assert result.code == 2
    assert located(result.out, "blob.yaml", 2, 5), result.out


# --- what is accepted, and as what -----------------------------------------------------------


def test_boundaries_are_inclusive(tmp_path: Path) -> None:
    text = f"a: {'x' * MAX_SCALAR}\nb: {'1' * MAX_NUMBER_CHARS}\n"
    data = load(_write(tmp_path, "edge.yaml", text)).data
    assert data == {"a": "x" * MAX_SCALAR, "b": int("1" * MAX_NUMBER_CHARS)}


def test_nesting_below_the_cap_loads(tmp_path: Path) -> None:
    depth = MAX_DEPTH - 1  # the root mapping is one level: MAX_DEPTH - 1 lists fit inside it
    expected: list[Any] = []
    for _ in range(depth - 1):
        expected = [expected]
    text = "a: " + "[" * depth + "]" * depth + "\n"
    assert load(_write(tmp_path, "nest.yaml", text)).data == {"a": expected}


def test_scalars_resolve_by_a_restricted_core_schema(tmp_path: Path) -> None:
    text = (
        "date: 2027-03-31\n"  # YAML 1.1: a date object
        "stamp: 2027-03-31T10:00:00\n"
        "clock: 1:30\n"  # YAML 1.1: sexagesimal 90
        "grouped: 1_000\n"  # YAML 1.1: 1000
        "int: -3\nzero: 0\nfloat: 1.5\nexp: 1e5\n"
        "yes_quoted: 'yes'\noff_quoted: \"off\"\noctal_quoted: '017'\nhex_quoted: \"0x1F\"\n"
        "nan_quoted: '.nan'\n"
        "true: true\nfalse: False\nnull: ~\nempty:\n"
        "block: |\n  yes\n"
    )
    data: dict[str, Any] = load(_write(tmp_path, "scalars.yaml", text)).data
    assert data == {
        "date": "2027-03-31",
        "stamp": "2027-03-31T10:00:00",
        "clock": "1:30",
        "grouped": "1_000",
        "int": -3,
        "zero": 0,
        "float": 1.5,
        "exp": 1e5,
        "yes_quoted": "yes",
        "off_quoted": "off",
        "octal_quoted": "017",
        "hex_quoted": "0x1F",
        "nan_quoted": ".nan",
        "true": True,
        "false": False,
        "null": None,
        "empty": None,
        "block": "yes\n",
    }
    assert type(data["int"]) is int and type(data["float"]) is float


def test_byte_order_mark_is_ignored(tmp_path: Path) -> None:
    assert load(_write(tmp_path, "bom.yaml", "\ufeffa: 1\n")).data == {"a": 1}


# --- marks -----------------------------------------------------------------------------------


def test_nested_value_marks_counted_by_hand() -> None:
    text = "top:\n  mid:\n    leaf: 3\n  list:\n    - x\n    - {k: v}\n"
    doc = load_text(Path("f.yaml"), text)
    loc = doc.locate(("top", "mid", "leaf"))
    assert (loc.line, loc.column, loc.record_path) == (3, 11, "$.top.mid.leaf")
    loc = doc.locate(("top", "list", 1, "k"))
    assert (loc.line, loc.column, loc.record_path) == (6, 11, "$.top.list[1].k")
    key = doc.locate_key(("top", "list"))
    assert (key.line, key.column) == (4, 3)
    # A path below the deepest existing node falls back to that node, keeping the full path;
    # a mapping is located at its key ('mid:'), not at its first entry a line below.
    loc = doc.locate(("top", "mid", "missing", "deeper"))
    assert (loc.line, loc.column, loc.record_path) == (2, 3, "$.top.mid.missing.deeper")
    loc = doc.locate(("top", "list"))
    assert (loc.line, loc.column) == (4, 3)


def _composed_marks(node: yaml.Node, path: tuple[Any, ...], values: dict, keys: dict) -> None:
    values[path] = (node.start_mark.line, node.start_mark.column)
    if isinstance(node, yaml.MappingNode):
        for k, v in node.value:
            keys[(*path, k.value)] = (k.start_mark.line, k.start_mark.column)
            _composed_marks(v, (*path, k.value), values, keys)
    elif isinstance(node, yaml.SequenceNode):
        for i, item in enumerate(node.value):
            _composed_marks(item, (*path, i), values, keys)


@pytest.mark.parametrize("path", [*sorted(DESIGNS.glob("*.yaml")), STEELS], ids=lambda p: p.name)
def test_every_mark_agrees_with_pyyaml(path: Path) -> None:
    values: dict[tuple[Any, ...], tuple[int, int]] = {}
    keys: dict[tuple[Any, ...], tuple[int, int]] = {}
    _composed_marks(yaml.compose(path.read_text(encoding="utf-8")), (), values, keys)
    doc = load(path)
    assert doc.marks == values
    assert doc.key_marks == keys
    assert len(values) > 40  # the comparison covered whole records, not a stub


def test_loaded_data_equals_pyyaml_for_the_demo_records() -> None:
    for path in (PUMP, GENSET, STEELS):
        # [calc] external check: PyYAML safe_load; the demo records use no construct on
        # which the two schemas differ.
        assert load(path).data == yaml.safe_load(path.read_text(encoding="utf-8"))


#: What read_text refuses as binary: C0 controls but tab, line feed and carriage return, DEL,
#: and the noncharacters U+FFFE and U+FFFF (outside YAML 1.2's character set, section 5.1,
#: which PyYAML's reader would report less plainly). C1 controls are the reader's to refuse.
_REFUSED = {*range(0x00, 0x09), 0x0B, 0x0C, *range(0x0E, 0x20), 0x7F, 0xFFFE, 0xFFFF}


@pytest.mark.parametrize("context", ["a: 1\nb: x{}y\n", "a: 20 °C\nb: x{}y\n"])
def test_binary_text_is_refused_whatever_else_the_file_holds(tmp_path: Path, context: str) -> None:
    # every ASCII code point and the characters around the two noncharacters, in an ASCII
    # file and in one with UTF-8 multi-byte characters
    for code in [*range(0x80), 0x85, 0xA0, 0xB5, 0xFFFD, 0xFFFE, 0xFFFF, 0x10000]:
        path = _write(tmp_path, "t.yaml", context.format(chr(code)))
        if code in _REFUSED:
            with pytest.raises(InputError, match=f"control character U\\+{code:04X}") as info:
                read_text(path)
            assert info.value.location is not None
            assert (info.value.location.line, info.value.location.column) == (2, 5)
        else:
            assert read_text(path) == context.format(chr(code))


def test_a_file_of_the_largest_size_is_read_whole(tmp_path: Path) -> None:
    text = "a: 1\n#" + "x" * (MAX_BYTES - 7) + "\n"
    path = _write(tmp_path, "big.yaml", text)
    assert read_text(path) == text
    _write(tmp_path, "big.yaml", text + "\n")
    with pytest.raises(InputError, match="larger than 1024 KiB"):
        read_text(path)
