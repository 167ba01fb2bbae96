"""Discovery: which files a run reads, and what each declares.

Files named, and ``*.yaml`` / ``*.yml`` under folders named, sniffed for the emgate schema they
declare; a file that resembles a record but is no valid emgate file is an input error. Also the
repository a path belongs to and its materials files.
"""

from __future__ import annotations

import os
import re
from collections.abc import Collection, Iterable, Iterator
from dataclasses import dataclass
from pathlib import Path

from emgate.changes import ChangeSet
from emgate.config import CONFIG_NAME, Policy
from emgate.errors import InputError, Location, display_path, within
from emgate.findings import Finding, RunResult, input_finding
from emgate.listing import yaml_names
from emgate.loader import load_text, read_head, read_text
from emgate.materials import Catalogue
from emgate.spill import Index, SpillMap, SpillSet
from emgate.terms import CONFIG_SCHEMA, DESIGN_SCHEMA, MATERIALS_SCHEMA, WAIVERS_SCHEMA

#: Characters at the top of a file in which its ``schema:`` line is looked for.
_HEAD_CHARS = 4096
_DECLARES = re.compile(r"^schema:\s*['\"]?(emgate/[a-z]+@\d+)", re.MULTILINE)


@dataclass(slots=True)
class Source:
    #: The file as discovery named it: text, not a Path (a Path object and its parts cost
    #: four times the name, and a run holds a Source for every record until it is checked).
    name: str
    #: The file's text; None for a design record whose text is read again when it is
    #: checked (``discover(..., design_text=False)``: a large run holds one record's text
    #: at a time, not every record's from discovery to its check).
    text: str | None
    declared: str | None
    explicit: bool
    #: ``path`` resolved, as text (once, in discovery: a change set and the sources' set
    #: compare it; a thousand-record run keeps one for each record)
    key: str

    @property
    def path(self) -> Path:
        return Path(self.name)


def discover(
    paths: Iterable[Path],
    result: RunResult,
    policy: Policy | None = None,
    changes: ChangeSet | None = None,
    verbose: bool = False,
    design_text: bool = True,
) -> list[Source]:
    """:func:`each_source`, as a list."""
    return list(each_source(paths, result, policy, changes, verbose, design_text))


def each_source(
    paths: Iterable[Path],
    result: RunResult,
    policy: Policy | None = None,
    changes: ChangeSet | None = None,
    verbose: bool = False,
    design_text: bool = True,
    outside_ids: SpillMap[str] | None = None,
    index: Index | None = None,
) -> Iterator[Source]:
    """Files named, and *.yaml / *.yml under folders named, that declare an emgate schema,
    in the order named (a folder's files sorted by their path's parts).

    Fail closed: a file that is not a valid emgate file is an input error when it resembles
    one (a near-miss ``schema:`` value or key, a list root holding a record, a record's keys
    with no schema), and, in a configured repository, whenever the configuration's ``files``
    globs select it or it is named on the command line, unless ``ignore_files`` lists it.
    Otherwise it is skipped (with a note when named, or with ``verbose``). With a change
    set, only the files the change touches are held to this. Without ``design_text`` the
    design records are read here (read_text's refusals are reported) but their text is not
    kept: the pipeline reads it again when it checks the record. ``outside_ids`` is filled
    with the id of each design record outside a change set, and the file that holds it: a
    changed record may not take the id of one the change leaves alone. With a run's
    ``index`` the names listed and read are held on disk when there are many.
    """
    # Paths as strings until a file is kept: a thousand-record repository checked for one
    # changed file spends its time here, and pathlib's objects cost more than the file reads.
    seen = SpillSet(index)  # resolved names of the files read
    folders: dict[str, str] = {}
    # Outside a change set's files (with no grade or policy change) a record is read and
    # checked as a file (read_text's refusals are reported) but not parsed or kept.
    narrow = changes is not None and not (changes.everything or changes.grades)
    changed = {str(p) for p in changes.files} if changes is not None else set()
    for root in paths:
        if root.is_dir():
            listed = yaml_names(root, index)
            candidates: Iterable[str] = (p for p in listed if os.path.basename(p) != CONFIG_NAME)
            explicit = False
            inside: str | None = str(root.resolve())
        elif root.exists():
            candidates, explicit, inside = [str(root)], True, None
        else:
            missing = (
                f"a symbolic link that leads to no file (dangling, or in a loop): {root}"
                if os.path.islink(root)
                else f"no such file or folder: {root}"
            )
            result.findings.append(input_finding(InputError(missing)))
            continue
        for name in candidates:
            key = _resolved(name, folders)
            if not seen.add(key):
                continue
            if inside is not None and within(key, inside) is None:
                result.findings.append(
                    input_finding(
                        InputError(
                            f"a symbolic link leading outside {display_path(root)}: emgate"
                            " reads nothing outside the folders it checks",
                            Location(Path(name), 1, 1, "$"),
                        )
                    )
                )
                continue
            outside = narrow and key not in changed
            try:
                text = read_text(name)  # (a path object only for a file kept or refused)
            except InputError as exc:
                result.findings.append(input_finding(exc))
                continue
            declared = _declared(text)
            if outside and declared in (DESIGN_SCHEMA, WAIVERS_SCHEMA, CONFIG_SCHEMA):
                # only the records a full check reads: not a fixture the files globs leave out
                if (
                    outside_ids is not None
                    and declared == DESIGN_SCHEMA
                    and (policy is None or not policy.files or policy.selects(name, key))
                ):
                    for rid in record_ids(name, text):
                        outside_ids.setdefault(rid, name)
                continue  # outside the change by its path alone: not parsed
            path = Path(name)
            if declared is None:
                declared, problem, near_miss = _classify(path, text)
                named = explicit or bool(changes and changes.named and key in changed)
                strict = _strict(path, named, policy)
                if problem is not None and not near_miss and _ignored(path, policy):
                    problem = None  # the team says it is no record (a fixture, a draft)
                if problem is None and strict is not None:
                    problem = InputError(
                        "not an emgate file (no 'schema: emgate/...' line at the top level):"
                        f" {strict}; list it under ignore_files in {CONFIG_NAME} if it is no"
                        " record",
                        Location(path, 1, 1, "$"),
                    )
                if problem is not None and (
                    changes is None or changes.everything or key in changed
                ):
                    result.findings.append(input_finding(problem))
                    continue
            if declared is None:
                # a file named, or --verbose: say so, do not fail (pre-commit passes CI files)
                if explicit or verbose:
                    result.findings.append(
                        Finding(
                            "input",
                            "info",
                            display_path(path),
                            1,
                            1,
                            "$",
                            "skipped: not an emgate file (no 'schema: emgate/...' line)",
                            kind="note",
                        )
                    )
                continue
            if declared in (WAIVERS_SCHEMA, CONFIG_SCHEMA):
                continue  # read through the policy, not as records
            kept = text if design_text or declared != DESIGN_SCHEMA else None
            yield Source(name, kept, declared, explicit, key)


def _declared(text: str) -> str | None:
    """The emgate schema a file's ``schema:`` line declares in its head, if any."""
    m = _DECLARES.search(text, 0, _HEAD_CHARS)
    # the schema's own constant, not the match's copy: a run keeps one for every record
    return _CANONICAL.get(m.group(1)) if m else None


def _resolved(name: str, folders: dict[str, str]) -> str:
    """``os.path.realpath(name)``, each folder resolved once: a file that is no symbolic link
    resolves to its resolved folder and its own name."""
    if os.path.islink(name):
        return os.path.realpath(name)
    folder, base = os.path.split(name)
    real = folders.get(folder)
    if real is None:
        real = folders[folder] = os.path.realpath(folder or ".")
    key = os.path.join(real, base)
    return name if key == name else key  # one string kept, not two, for a resolved name


#: Top-level keys of emgate records: a file holding one of them is meant as a record.
RECORD_KEYS = frozenset({"machine", "stator", "rotor", "winding", "air_gap", "steels"})
_KNOWN = (DESIGN_SCHEMA, MATERIALS_SCHEMA, WAIVERS_SCHEMA, CONFIG_SCHEMA)
_CANONICAL = {schema: schema for schema in _KNOWN}


def _ignored(path: Path, policy: Policy | None) -> bool:
    """Whether a configuration's ignore_files lists a file."""
    return policy is not None and policy.source is not None and policy.ignored(path)


def _strict(path: Path, named: bool, policy: Policy | None) -> str | None:
    """Why a non-emgate file is an error here (None: it may be skipped)."""
    if policy is None or policy.source is None or not policy.inside(path):
        return None
    if policy.ignored(path):
        return None
    if named:
        return "it is named inside a configured repository"
    if policy.selects(path):
        return f"the files globs of {CONFIG_NAME} select it"
    return None


def _classify(path: Path, text: str) -> tuple[str | None, InputError | None, bool]:
    """A file the schema-line scan misses: (the emgate schema it declares, or None; the
    reason it is a broken emgate file, or None when it does not resemble one; whether the
    reason is a near-miss schema key or value, an error even where ignore_files lists it)."""
    import difflib

    try:
        doc = load_text(path, text)
    except InputError as exc:
        if "emgate" in text.lower() and exc.location is not None:
            problem = InputError(f"not a valid emgate file: {exc.message}", exc.location)
            return None, problem, False
        return None, None, False
    data = doc.data
    if isinstance(data, list):
        if any(isinstance(item, dict) and _resembles(item) for item in data):
            problem = InputError(
                "expected a mapping with a 'schema' key at the top level, found a list holding"
                " a record: an emgate file holds one record, not a list",
                doc.locate(()),
            )
            return None, problem, False
        return None, None, False
    if not isinstance(data, dict):
        return None, None, False
    for k in data:
        if k != "schema" and k.strip().lower() == "schema":
            problem = InputError(
                f"key {k!r} is not 'schema': emgate reads the key in lower case, without"
                " spaces; did you mean 'schema'?",
                doc.locate_key((k,)),
            )
            return None, problem, True
    if "schema" not in data:
        if _resembles(data):
            problem = InputError(
                "a record's keys with no 'schema' key: expected 'schema: emgate/design@1'"
                " (or another emgate schema) at the top level",
                doc.locate(()),
            )
            return None, problem, False
        return None, None, False
    declared = data["schema"]
    if isinstance(declared, str) and declared in _KNOWN:
        return declared, None, False  # (flow style, JSON, CR line ends)
    looks = isinstance(declared, str) and "emgate" in declared.lower()
    if not looks and not _resembles(data):
        return None, None, False
    hint = ""
    if isinstance(declared, str):
        close = difflib.get_close_matches(declared.strip().lower(), _KNOWN, n=1, cutoff=0.6)
        hint = f"; did you mean {close[0]!r}?" if close else ""
        if close and declared.strip().lower() != close[0]:
            hint += " (emgate reads version 1 of each schema)"
        hint += "; schema ids are lower case, without spaces"
    shown = (
        repr(declared)
        if isinstance(declared, str) and len(declared) <= 40
        else ("a list" if isinstance(declared, list) else type(declared).__name__)
    )
    problem = InputError(
        f"expected one of {', '.join(repr(s) for s in _KNOWN)}, found {shown}{hint}",
        doc.locate(("schema",)),
    )
    return None, problem, looks


def _resembles(data: dict) -> bool:
    return bool(RECORD_KEYS.intersection(data)) or (
        isinstance(data.get("schema"), str) and "emgate" in data["schema"].lower()
    )


#: A top-level ``id:`` line whose whole value is an id (quoted or not, a comment after it),
#: matched where ``str.find`` saw a line begin with ``id:`` (a scan of the whole text by the
#: pattern costs five times as much)
_RECORD_ID = re.compile(r"""id:[ \t]*(['"]?)([a-z0-9][a-z0-9._-]*)\1[ \t]*(?:#.*)?$""", re.M)


def record_ids(path: Path | str, text: str) -> list[str]:
    """The id a design record's text gives, without parsing it when an ``id:`` line says it
    plainly; otherwise (a quoted key, flow style, an id the pattern refuses) as parsed, and
    none when the text does not parse (its own check reports that)."""
    found = []
    padded = "\n" + text  # the first line begins after a line end too
    at = padded.find("\nid:")
    while at >= 0:
        if m := _RECORD_ID.match(padded, at + 1):
            found.append(m[2])
        at = padded.find("\nid:", at + 1)
    if len(found) == 1:
        return found
    # none, or more than one (a line of a multi-line quoted text may begin with "id:"): parsed
    try:
        data = load_text(Path(path), text).data
    except InputError:
        return []
    rid = data.get("id") if isinstance(data, dict) else None
    return [rid] if isinstance(rid, str) else []


def repository_record_ids(root: Path, among: set[str], index: Index | None = None) -> set[str]:
    """Which of the ids ``among`` a design record in the repository has, checked in this run
    or not, so that a waiver for a record outside the run is not taken for a typo."""
    ids: set[str] = set()
    if not among:
        return ids
    for src in each_source([root], RunResult(), design_text=False, index=index):  # one at a time
        if src.declared == DESIGN_SCHEMA:
            try:
                ids.update(among.intersection(record_ids(src.path, read_text(src.path))))
            except InputError:
                continue  # gone since discovery: its own check reports it
    return ids


def repository_root(start: Path) -> Path | None:
    """The design repository a path belongs to: the folder of the nearest emgate.yaml, else
    the git work tree's top; None outside both (then no folder is searched for materials)."""
    here = (start if start.is_dir() else start.parent).resolve()
    for folder in (here, *here.parents):
        if (folder / CONFIG_NAME).is_file() or (folder / ".git").exists():
            return folder
    return None


def materials_sources(
    root: Path, searched: Collection[str] = (), index: Index | None = None
) -> list[Source]:
    """Every materials file under a repository root but those under the folders ``searched``
    names (resolved paths: a run has read them already)."""
    # A file whose head declares another emgate schema is no materials file, as discovery
    # would find: its head alone is read (a check of one file in a repository of thousands
    # read every record whole). The others are read as discovery reads them.
    top = os.path.realpath(root)
    heads = (n for n in yaml_names(root, index, searched) if _head_schema(n) not in _NOT_MATERIALS)
    # (a symbolic link leading outside the repository is none of its files)
    kept = [Path(name) for name in heads if within(os.path.realpath(name), top) is not None]
    scratch = RunResult()  # (the findings of a search for materials are not the run's)
    sources = each_source(kept, scratch, changes=ChangeSet(), index=index)
    return [s for s in sources if s.declared == MATERIALS_SCHEMA]


_NOT_MATERIALS = frozenset({DESIGN_SCHEMA, WAIVERS_SCHEMA, CONFIG_SCHEMA})
_DECLARES_BYTES = re.compile(_DECLARES.pattern.encode("ascii"), re.MULTILINE)


def _head_schema(name: str) -> str | None:
    """The schema the first ``schema:`` line in a file's first bytes declares (as
    :func:`_declared` reads it from the text); None when there is none or the file cannot
    be read (then discovery reads it and says why)."""
    try:
        head = read_head(name, _HEAD_CHARS)
    except (OSError, InputError):
        return None
    m = _DECLARES_BYTES.search(head)
    return m.group(1).decode("ascii") if m else None


def discover_materials(start: Path) -> Catalogue:
    """The steel catalogue of the repository holding ``start`` (for ``emgate show``)."""
    from emgate.validate import validate_materials

    catalogue = Catalogue()
    root = repository_root(start)
    for src in materials_sources(root) if root is not None else []:
        assert src.text is not None  # a materials file's text is always kept
        doc = load_text(src.path, src.text)
        catalogue.add_file(doc, validate_materials(doc))
    return catalogue
