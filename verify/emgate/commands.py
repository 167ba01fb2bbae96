"""The handlers of the ``emgate`` subcommands, called once the command line is parsed
(:mod:`emgate.cli`); each imports the stages it needs only when it runs."""

from __future__ import annotations

import argparse
import os
import sys
from pathlib import Path
from typing import TYPE_CHECKING

from emgate.report import FORMATS
from emgate.schemas import SCHEMA_KINDS
from emgate.startup import started
from emgate.terms import EXIT_CRASH, EXIT_INPUT, EXIT_OK

if TYPE_CHECKING:
    from collections.abc import Iterable

    from emgate.findings import RunResult

#: The formats that read a record's summary alone (its check count, its check closest to a
#: limit, the rules it ran) and its findings, never its every outcome: with only these, a
#: run keeps (spools) each record's summary, not its outcomes.
SUMMARY_FORMATS = frozenset({"text", "annotations", "codequality", "sarif"})
#: The formats that read a run's findings and records through ``RunResult.each_finding`` and
#: ``each_record``: with only these, a run spools its records to disk as it goes
#: (``emgate.findings.Spool``), so its memory does not grow with them.
SPOOLING_FORMATS = SUMMARY_FORMATS | {"json", "markdown", "junit"}


def _untrusted_path_guard() -> None:
    """Drop the working directory from the import path: plugins come only from installed
    distributions, never from the repository being checked."""
    cwd = os.path.realpath(os.getcwd())
    sys.path[:] = [p for p in sys.path if p not in ("", ".") and os.path.realpath(p) != cwd]


def dispatch(args: argparse.Namespace) -> int:
    """Run the subcommand of parsed arguments; its exit code."""
    if args.command == "schema":
        from emgate.schemas import schema_text

        if args.write:
            from emgate.atomic import write_atomic

            for kind in SCHEMA_KINDS:
                write_atomic(args.write / f"{kind}.schema.json", schema_text(kind), parents=True)
            return EXIT_OK
        sys.stdout.write(schema_text(args.kind))
        return EXIT_OK
    _untrusted_path_guard()
    from emgate.plugins import load_plugins

    plugins = load_plugins()
    if args.command != "check":  # a check's start-up ends when its run is set up
        started()
    if args.command == "plugins":
        for pack in plugins.packs:
            n = sum(1 for lr in plugins.rules.values() if lr.pack == pack)
            print(f"{pack.name:<16} {pack.distribution} {pack.version}  ({pack.value}; {n} rules)")
        return _plugin_errors(plugins)
    if args.command == "rules":
        return _rules(plugins, args.format)
    if args.command == "explain":
        return _explain(plugins, args.rule)
    if args.command == "init":
        from emgate.scaffold import init

        return init(args.dir, args.machine)
    if args.command == "sweep":
        return _sweep(args)
    if args.command == "lsp":
        from emgate.lsp import main as lsp

        return lsp(plugins)
    if args.command == "show":
        if args.format.startswith("html"):
            from emgate.page import show_html

            out = args.format.partition(":")[2]
            return show_html(args.file, Path(out) if out else None, args.config, plugins)
        from emgate.sheet import show

        return show(args.file, args.format)
    if args.command == "diff":
        from emgate.diff import main as diff_main

        return diff_main(args, plugins)
    return _check(args, plugins)


def _plugin_errors(plugins) -> int:  # type: ignore[no-untyped-def]
    from emgate.report.common import one_line

    for err in [*plugins.errors, *plugins.crashes]:
        print(one_line(f"emgate: {err}"), file=sys.stderr)
    if plugins.crashes:
        return EXIT_CRASH
    return EXIT_INPUT if plugins.errors else EXIT_OK


def _rules(plugins, fmt: str) -> int:  # type: ignore[no-untyped-def]
    rows = [(rid, lr.rule, lr.pack) for rid, lr in sorted(plugins.rules.items())]
    if fmt == "json":
        import json

        print(
            json.dumps(
                [
                    {
                        "id": rid,
                        "summary": r.summary,
                        "version": r.version,
                        "severity": r.severity,
                        "machines": list(r.machines),
                        "tags": list(r.tags),
                        "origin": {"distribution": p.distribution, "version": p.version},
                    }
                    for rid, r, p in rows
                ],
                indent=2,
            )
        )
    else:
        for rid, r, p in rows:
            print(f"{rid:<24} {r.severity:<8} {p.distribution} {p.version:<8} {r.summary}")
    return _plugin_errors(plugins)


def _explain(plugins, rid: str) -> int:  # type: ignore[no-untyped-def]
    if rid not in plugins.rules:
        import difflib

        close = difflib.get_close_matches(rid, list(plugins.rules), n=1, cutoff=0.5)
        hint = f"; did you mean {close[0]!r}?" if close else ""
        print(f"emgate: no installed rule has the id {rid!r}{hint}", file=sys.stderr)
        return EXIT_INPUT
    from emgate.explain import explain_text

    sys.stdout.write(explain_text(rid, plugins.rules[rid]))
    return EXIT_OK


def _outputs(specs: list[str] | None) -> list[tuple[str, Path | None]]:
    out: list[tuple[str, Path | None]] = []
    for spec in specs or ["text"]:
        name, _, file = spec.partition(":")
        if name == "html" and not file:  # an index and a sheet per record: files only
            raise _UsageError("html needs a FILE (html:reports/index.html)")
        if name not in (*FORMATS, "html"):
            raise _UsageError(
                f"unknown format {name!r}; expected one of {', '.join(FORMATS)}, html:FILE"
            )
        out.append((name, Path(file) if file else None))
    if sum(1 for _, f in out if f is None) > 1:
        raise _UsageError("only one --format may go to standard output; give the others a FILE")
    return out


class _UsageError(Exception):
    pass


def _check(args: argparse.Namespace, plugins) -> int:  # type: ignore[no-untyped-def]
    from emgate.config import find_config, load_policy
    from emgate.engine import execute
    from emgate.errors import InputError, InputErrors
    from emgate.findings import RunResult, input_findings
    from emgate.pipeline import Run

    try:
        outputs = _outputs(args.formats)
        dropped = _deselected(plugins, args.select, args.ignore)
    except _UsageError as exc:
        from emgate.report.common import one_line

        print(one_line(f"emgate check: {exc}"), file=sys.stderr)
        return EXIT_INPUT
    start = args.paths[0] if args.paths else Path.cwd()
    config = args.config or find_config(start if start.is_dir() else start.parent)
    installed = {p.distribution: p.version for p in plugins.packs}
    try:
        rules = {rid: lr.rule for rid, lr in plugins.rules.items()}
        policy = load_policy(config, rules, Path.cwd(), installed)
        _narrow(policy, dropped)
        paths = list(args.paths) or (policy.configured_files() if policy.source else [Path(".")])
        run = Run(
            paths=paths,
            policy=policy,
            plugins=plugins,
            verbose=args.verbose,
            remedies=args.remedies == "on",
            details=not all(name in SUMMARY_FORMATS for name, _ in outputs),
            spool=all(name in SPOOLING_FORMATS for name, _ in outputs),
        )
        if args.changed_since:
            from emgate.changes import changed_since

            run.changes = changed_since(
                args.changed_since, Path.cwd(), policy.source, policy.waivers_file
            )
        elif policy.source and args.paths and all(_inside(p, policy.root) for p in paths):
            # Files named one by one (pre-commit passes the staged ones): check them and the
            # records that a named materials, config or waivers file affects.
            from emgate.changes import named_files

            run.changes = named_files(paths, policy.root, policy.source, policy.waivers_file)
            run.paths = [policy.root]
    except (InputError, InputErrors) as exc:
        from emgate.findings import anchor, source_root

        result = RunResult(findings=input_findings(exc))
        anchor(result, source_root(config.parent if config else Path.cwd()))
        _emit(result, outputs, args.quiet)
        return result.exit_code
    if args.today:
        run.today = args.today
    from emgate.parallel import available_cores

    run.jobs = args.jobs or available_cores()
    started()
    result = execute(run)
    try:
        return max(result.exit_code, _emit(result, outputs, args.quiet, run.jobs))
    finally:
        if result.spool is not None:
            result.spool.close()


def _narrow(policy, dropped: tuple[str, ...]) -> None:  # type: ignore[no-untyped-def]
    """Add the rules the command line leaves out to the ignores of every part of the policy."""
    from dataclasses import replace

    if dropped:
        policy.base = replace(policy.base, ignore=(*policy.base.ignore, *dropped))
        policy.overrides = [
            (globs, replace(rp, ignore=(*rp.ignore, *dropped))) for globs, rp in policy.overrides
        ]


def _deselected(plugins, select: list[str], ignore: list[str]) -> tuple[str, ...]:  # type: ignore[no-untyped-def]
    """Ids of the installed rules that --select/--ignore leave out (none without them);
    a selector that matches no installed rule is a usage error, as in emgate.yaml."""
    import difflib

    from emgate.config import RulePolicy

    def split(values: list[str]) -> tuple[str, ...]:
        return tuple(v.strip() for value in values for v in value.split(",") if v.strip())

    chosen = RulePolicy(split(select) or ("all",), split(ignore), {}, {})
    rules = {rid: lr.rule for rid, lr in plugins.rules.items()}
    groups = {f"tag:{t}" for r in rules.values() for t in r.tags}
    groups |= {rid.split("/")[0] + "/" for rid in rules if "/" in rid}
    for flag, selectors in (("--select", chosen.select), ("--ignore", chosen.ignore)):
        for selector in selectors:
            if selector == "all" or any(
                RulePolicy((selector,), (), {}, {}).selected(r) for r in rules.values()
            ):
                continue
            close = difflib.get_close_matches(selector, [*rules, *sorted(groups)], n=1)
            hint = f"; did you mean {close[0]!r}?" if close else ""
            raise _UsageError(f"{flag} {selector!r} matches no installed rule{hint}")
    return tuple(rid for rid, rule in sorted(rules.items()) if not chosen.selected(rule))


def _sweep(args: argparse.Namespace) -> int:
    from emgate.errors import InputError, InputErrors
    from emgate.sweep import SweepRun, sweep

    try:
        return sweep(
            SweepRun(
                args.record,
                args.spec,
                args.out,
                args.scheduler,
                args.chunk,
                args.config,
                args.html,
            )
        )
    except (InputError, InputErrors) as exc:
        for err in exc.errors if isinstance(exc, InputErrors) else [exc]:
            where = f"{err.location}: " if err.location else ""
            print(f"emgate sweep: {where}{err.message}", file=sys.stderr)
        return EXIT_INPUT


def _inside(path: Path, root: Path) -> bool:
    from emgate.errors import resolved

    try:
        resolved(path).relative_to(resolved(root))
    except ValueError:
        return False
    return path.is_file()


def _colour(stream) -> bool:  # type: ignore[no-untyped-def]
    """Colour on a terminal; NO_COLOR turns it off and FORCE_COLOR on, checked in that order
    (no-color.org, force-color.org: set and not empty)."""
    if os.environ.get("NO_COLOR"):
        return False
    if os.environ.get("FORCE_COLOR"):
        return True
    return stream.isatty() and os.environ.get("TERM") != "dumb"


def _to_stdout(text: Iterable[str]) -> None:
    """Write a report to standard output; a reader that stops early (``| head``) ends the
    writing, never the run: the exit code stays the verdict's, and the other reports are
    still written."""
    _written(sys.stdout, text)


def _to_stderr(line: str) -> None:
    """:func:`_to_stdout` for a line on standard error."""
    _written(sys.stderr, [line + "\n"])


def _written(stream, text: Iterable[str]) -> None:  # type: ignore[no-untyped-def]
    try:
        stream.writelines(text)
        stream.flush()
    except BrokenPipeError:
        # nothing more reaches the reader; the interpreter's last flush must not fail either
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, stream.fileno())
        os.close(devnull)


def _emit(
    result: RunResult, outputs: list[tuple[str, Path | None]], quiet: bool = False, jobs: int = 1
) -> int:
    from emgate.atomic import write_atomic
    from emgate.report import writer
    from emgate.report.common import one_line

    status, written = EXIT_OK, []
    for name, file in outputs:
        if name == "html" and file is not None:
            from emgate.page import write_run

            try:
                write_run(result, file, jobs)
            except OSError as exc:
                why = exc.strerror or str(exc)
                if exc.filename:
                    why += f": {exc.filename}"
                _to_stderr(one_line(f"emgate: cannot write html to {file}: {why}"))
                status = EXIT_INPUT
            continue
        text: Iterable[str]
        # written piece by piece: a spooled run is read back as it goes
        if name == "text":
            from emgate.report.text import chunks

            text = chunks(result, quiet=quiet, colour=file is None and _colour(sys.stdout))
        else:
            text = writer(name)(result)
        if file is None:
            _to_stdout(text)
            continue
        try:
            write_atomic(file, text)
            written.append(f"{name} to {file}")
        except OSError as exc:
            message = f"emgate: cannot write {name} report to {file}: {exc.strerror}"
            _to_stderr(one_line(message))
            status = EXIT_INPUT
    if not quiet and all(file is not None for _, file in outputs):  # nothing on the terminal
        from emgate.report.common import summary_line

        wrote = f"; wrote {', '.join(written)}" if written else ""
        _to_stderr(one_line(f"emgate: {summary_line(result)}{wrote}"))
    return status
