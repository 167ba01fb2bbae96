"""The flow of one run: discover, load, validate, check, waive, collect.

Each stage has one home: which files in :mod:`emgate.discovery`, loading in
:mod:`emgate.loader`, validation in :mod:`emgate.validate`, policy in :mod:`emgate.config`,
plugins in :mod:`emgate.plugins`, each design record in :mod:`emgate.pipeline`; this module
only sequences them and collects the records' findings in file order.
"""

from __future__ import annotations

import dataclasses
import functools
from pathlib import Path
from typing import TYPE_CHECKING

from emgate.discovery import (
    Source,
    each_source,
    materials_sources,
    repository_record_ids,
    repository_root,
)
from emgate.errors import InputError, InputErrors, Location, display_path
from emgate.findings import (
    RuleInfo,
    RunResult,
    Spool,
    anchor,
    anchor_findings,
    input_finding,
    input_findings,
    source_root,
)
from emgate.loader import Document, load_text
from emgate.materials import Catalogue
from emgate.pipeline import RecordDone, Run, check_source
from emgate.runner import rule_guards
from emgate.terms import DESIGN_SCHEMA, MATERIALS_SCHEMA
from emgate.waivers import WaiverEntry, load_waivers_file, unknown_record_waivers

if TYPE_CHECKING:
    from emgate.spill import Index, SpillMap, SpillQueue


def execute(run: Run) -> RunResult:
    """Run the gate over ``run.paths``; never raises for bad input or a failing rule."""
    from emgate.spill import Index

    index = Index()  # the records to check and the names and ids seen: on disk when many
    try:
        return _execute(run, index)
    finally:
        index.close()


def _execute(run: Run, index: Index) -> RunResult:
    from emgate.explain import explain_markdown
    from emgate.validate import schema_of, validate_materials

    result = RunResult()
    for error in run.plugins.errors:
        result.findings.append(input_finding(error))
    for error in run.plugins.crashes:
        result.findings.append(dataclasses.replace(input_finding(error), kind="crash"))
    result.rules = [
        RuleInfo(
            rid,
            lr.rule.version,
            lr.rule.summary,
            lr.pack.distribution,
            lr.pack.version,
            lr.rule.severity,
            lr.rule.explain(),
            make_help=functools.partial(explain_markdown, rid, lr),
        )
        for rid, lr in sorted(run.plugins.rules.items())
    ]
    # the design records' texts are read again when each is checked (one held at a time)
    outside: SpillMap[str] = index.map()  # id -> file, of the records a change leaves alone
    designs: SpillQueue[Source] = index.queue()
    others: list[Source] = []  # materials (and any file not declared a design): a few
    for src in each_source(
        run.paths, result, run.policy, run.changes, run.verbose, False, outside, index
    ):
        (designs if src.declared == DESIGN_SCHEMA else others).append(src)
    # a materials file is none of the designs (a file declares one schema): their names
    # need not be held to keep the materials files of a repository from being read twice
    named = {src.key for src in others}
    # one root per folder: emgate.yaml's `files:` may name a thousand files in a few folders
    folders = {p if p.is_dir() else p.parent for p in run.paths if p.exists()}
    roots = {r for f in folders if (r := repository_root(f)) is not None}
    # the materials files of the folders searched are among the sources already
    searched = {str(p.resolve()) for p in run.paths if p.is_dir()}
    for root in sorted(roots):
        if str(root) in searched:
            continue
        found = materials_sources(root, searched, index)
        others += [m for m in found if m.key not in named]
        named |= {m.key for m in others}
    result.files_read = len(designs) + len(others)
    # Materials (and any file not declared a design) first: the catalogue is complete
    # before the first record is checked. Design files then stream through one at a time
    # (parsed, checked, dropped), in this process or in --jobs worker processes.
    docs: list[tuple[Source, Document, str]] = []
    for src in others:
        try:
            assert src.text is not None  # discovery keeps the text of what is no design
            doc = load_text(src.path, src.text)
            kind = schema_of(doc)
            if kind == DESIGN_SCHEMA:  # its first schema line and its parsed key disagree
                raise InputError(
                    f"expected one schema: the first 'schema:' line says {src.declared!r},"
                    f" the parsed document {kind!r}",
                    doc.locate(("schema",)),
                )
            docs.append((src, doc, kind))
        except (InputError, InputErrors) as exc:
            result.findings.extend(input_findings(exc))
    file_waivers: dict[str, list[WaiverEntry]] = {}
    if run.policy.waivers_file is not None:
        try:
            file_waivers = load_waivers_file(run.policy.waivers_file)
        except (InputError, InputErrors) as exc:
            result.findings.extend(input_findings(exc))
    catalogue = Catalogue()
    for _, doc, kind in docs:
        if kind == MATERIALS_SCHEMA:
            try:
                catalogue.add_file(doc, validate_materials(doc))
            except (InputError, InputErrors) as exc:
                catalogue.failed.append(display_path(doc.path))
                result.findings.extend(input_findings(exc))
    # nothing below reads the materials documents again, nor the sources but the designs
    # (which the check drains)
    del docs, others, named
    seen_ids: SpillMap[str] = index.map()  # id -> the file of the first record to claim it
    claimed: SpillMap[Location] = index.map()  # in a change set: where each checked id is
    interned: dict[frozenset[str], frozenset[str]] = {}
    if run.spool:  # the records go to disk as they are done
        result.spool = Spool()
        top = run_root(run).resolve()
    with rule_guards():
        from emgate.parallel import ordered_map

        def one(src: Source) -> RecordDone:
            return check_source(run, src, catalogue, file_waivers)

        for done in ordered_map(one, designs, run.jobs):
            if done.untouched_id is not None:  # (a grades change reads the others too)
                rid = done.untouched_id
                where = claimed.get(rid)
                if where is not None:  # a changed record before it in file order took its id
                    result.findings.append(
                        input_finding(
                            InputError(f"record id {rid!r} is already used by {done.file}", where)
                        )
                    )
                outside.setdefault(rid, done.file)
                continue
            taken = None if done.record_id is None else seen_ids.get(done.record_id)
            first = (
                None if taken is not None or done.record_id is None else outside.get(done.record_id)
            )
            if first is not None:
                taken = display_path(Path(first))
            if taken is not None:
                # the same verdict as a serial run: a record whose id is taken is not checked
                result.findings.append(
                    input_finding(
                        InputError(
                            f"record id {done.record_id!r} is already used by {taken}",
                            done.id_location,
                        )
                    )
                )
                continue
            if done.record_id is not None:
                seen_ids[done.record_id] = done.file
                if run.changes is not None and done.id_location is not None:
                    claimed[done.record_id] = done.id_location
            records = done.records
            if not run.details:
                records = [r.summarised(interned) for r in records]
            if result.spool is not None:
                anchor_findings(done.findings, top)
                result.spool.add(done.file, done.findings, records)
            else:
                result.findings.extend(done.findings)
                result.records.extend(records)
    if file_waivers:  # (only with a config: the waivers file is the config's)
        known = {rid for rid in file_waivers if rid in seen_ids}
        known |= repository_record_ids(run.policy.root, set(file_waivers) - known, index)
        result.findings.extend(
            input_finding(e) for e in unknown_record_waivers(file_waivers, known)
        )
    if run.changes is None:
        if (
            not result.count_records()
            and all(p.is_dir() for p in run.paths)
            and not any(f.kind == "input" and f.severity == "error" for f in result.each_finding())
        ):  # a glob or folder typo must not pass the gate with nothing checked
            looked = ", ".join(display_path(p) for p in run.paths) or "the files emgate.yaml names"
            result.findings.append(
                input_finding(
                    InputError(
                        f"no design record (a YAML file with 'schema: {DESIGN_SCHEMA}')"
                        f" found in {looked}"
                    )
                )
            )
    anchor(result, run_root(run))
    result.sort()
    return result


def run_root(run: Run) -> Path:
    """What a run's files are named from in SARIF and fingerprints: the git work tree of the
    policy's folder, else of the first path, else the working folder."""
    if run.policy.source is not None:
        return source_root(run.policy.root)
    first = next((p for p in run.paths if p.exists()), Path.cwd())
    return source_root(first if first.is_dir() else first.parent)
