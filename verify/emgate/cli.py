"""Command line: ``emgate check|show|rules|explain|plugins|schema``.

Exit codes: 0 clean; 1 a rule found an error; 2 input, configuration or usage error; 3 a rule,
a plugin or emgate itself crashed (fail closed: a crash never passes a merge).
"""

from __future__ import annotations

import argparse
import datetime as dt
import os
import sys
from pathlib import Path

from emgate import __version__
from emgate.report import FORMATS
from emgate.schemas import SCHEMA_KINDS
from emgate.terms import EXIT_CRASH, EXIT_INPUT, EXIT_OK


def _untrusted_path_guard() -> None:
    """Drop the working directory from the import path: plugins come only from installed
    distributions, never from the repository being checked."""
    cwd = os.path.realpath(os.getcwd())
    sys.path[:] = [p for p in sys.path if p not in ("", ".") and os.path.realpath(p) != cwd]


def _date(text: str) -> dt.date:
    try:
        return dt.date.fromisoformat(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a date YYYY-MM-DD, found {text!r}") from None


def _jobs(text: str) -> int:
    if not text.isdigit() or int(text) < 1:
        raise argparse.ArgumentTypeError(
            f"expected a whole number of processes >= 1, found {text!r}"
        )
    return int(text)


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(
        prog="emgate",
        description="Design-verification gate for electric machines. Results support, and do"
        " not replace, review by a qualified engineer under the applicable standards and local"
        " codes.",
    )
    p.add_argument("--version", action="version", version=f"emgate {__version__}")
    sub = p.add_subparsers(dest="command", required=True, metavar="COMMAND")
    c = sub.add_parser("check", help="check design records against the rules")
    c.add_argument(
        "paths",
        nargs="*",
        type=Path,
        metavar="PATH",
        help="record files or folders (default: the config's files, or '.')",
    )
    c.add_argument(
        "--format",
        action="append",
        metavar="NAME[:FILE]",
        dest="formats",
        help=f"output format, one of {', '.join(FORMATS)}; with :FILE, written to"
        " FILE atomically instead of standard output; repeatable",
    )
    c.add_argument("--config", type=Path, help="project config (default: nearest emgate.yaml)")
    c.add_argument(
        "--changed-since",
        metavar="REV",
        help="check only the records changed against git revision REV, and those"
        " that changed materials or configuration affect",
    )
    c.add_argument("--today", type=_date, help="judge waiver expiry as of this date")
    c.add_argument(
        "--jobs",
        type=_jobs,
        metavar="N",
        help="worker processes for the records (default: the available cores); the report"
        " is the same as with --jobs 1",
    )
    s = sub.add_parser("show", help="print the calculation sheet of a design")
    s.add_argument("file", type=Path)
    s.add_argument("--format", default="text", choices=["text", "json"])
    s.add_argument("--config", type=Path)
    w = sub.add_parser(
        "sweep", help="check variants of a record over a grid or random sample of its fields"
    )
    w.add_argument("record", type=Path)
    w.add_argument("spec", type=Path, help="the sweep: fields and their ranges or values")
    w.add_argument("--out", type=Path, help="table of variants: FILE.csv or FILE.parquet")
    w.add_argument(
        "--scheduler",
        default="local",
        help="local (default: a Dask cluster on this machine's cores), tcp://HOST:PORT"
        " (a running Dask scheduler), or none (this process)",
    )
    w.add_argument("--chunk", type=_jobs, default=256, help="variants per task (default 256)")
    w.add_argument("--config", type=Path)
    r = sub.add_parser("rules", help="list every installed rule")
    r.add_argument("--format", default="text", choices=["text", "json"])
    e = sub.add_parser("explain", help="print a rule's method, formulas and sources")
    e.add_argument("rule")
    sub.add_parser("plugins", help="list installed plugin packs")
    i = sub.add_parser("init", help="write a starter design repository (never overwrites)")
    i.add_argument("dir", nargs="?", type=Path, default=Path("."))
    sc = sub.add_parser("schema", help="print a JSON Schema")
    sc.add_argument("kind", nargs="?", default="design", choices=list(SCHEMA_KINDS))
    sc.add_argument(
        "--write",
        type=Path,
        metavar="DIR",
        help="write every schema as DIR/KIND.schema.json instead",
    )
    return p


def main(argv: list[str] | None = None) -> int:
    args = _parser().parse_args(argv)
    try:
        return _dispatch(args)
    except KeyboardInterrupt:
        print("emgate: interrupted", file=sys.stderr)
        return EXIT_CRASH
    except BrokenPipeError:
        return EXIT_OK
    except Exception as exc:  # fail closed, without a traceback for the user
        if os.environ.get("EMGATE_DEBUG"):
            raise
        print(
            f"emgate: internal error: {type(exc).__name__}: {exc}\n"
            "Set EMGATE_DEBUG=1 for the traceback; please report it.",
            file=sys.stderr,
        )
        return EXIT_CRASH


def _dispatch(args: argparse.Namespace) -> int:
    if args.command == "schema":
        from emgate.schemas import schema_text

        if args.write:
            from emgate.atomic import write_atomic

            for kind in SCHEMA_KINDS:
                write_atomic(args.write / f"{kind}.schema.json", schema_text(kind))
            return EXIT_OK
        sys.stdout.write(schema_text(args.kind))
        return EXIT_OK
    _untrusted_path_guard()
    from emgate.plugins import load_plugins

    plugins = load_plugins()
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

        return init(args.dir)
    if args.command == "sweep":
        return _sweep(args)
    if args.command == "show":
        from emgate.sheet import show

        return show(args.file, args.format)
    return _check(args, plugins)


def _plugin_errors(plugins) -> int:  # type: ignore[no-untyped-def]
    for err in [*plugins.errors, *plugins.crashes]:
        print(f"emgate: {err}", file=sys.stderr)
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
    lr = plugins.rules[rid]
    rule = lr.rule
    print(f"{rid} v{rule.version} ({lr.pack.distribution} {lr.pack.version})")
    print(f"{rule.summary}")
    print(f"applies to: {', '.join(rule.machines)}; default severity: {rule.severity}\n")
    print(rule.explain())
    fields = rule.options.model_fields
    if fields:
        print("\noptions (emgate.yaml: options: {" + rid + ": {NAME: VALUE}}), with defaults:")
        for name, info in fields.items():
            desc = f"  ({info.description})" if info.description else ""
            print(f"  {name} = {_default_text(info)}{desc}")
    return EXIT_OK


def _default_text(info) -> str:  # type: ignore[no-untyped-def]
    """An option's default in the unit its examples use ('5 A/mm^2', not 5000000.0), also
    for an optional quantity (``FluxDensity | None``), whose unit sits inside the union."""
    from typing import Annotated, get_args, get_origin

    from emgate.units import format_value

    metadata = list(info.metadata)
    pending = [info.annotation]
    while pending:  # the Annotated members of unions (Optional) carry their own metadata
        hint = pending.pop()
        if get_origin(hint) is Annotated:
            metadata.extend(hint.__metadata__)
        else:
            pending.extend(get_args(hint))
    default = info.get_default(call_default_factory=True)
    for meta in metadata:
        examples = getattr(meta, "json_schema", None) or {}
        example = (examples.get("examples") or [None])[0]
        if isinstance(example, str) and isinstance(default, float):
            unit = example.split(None, 1)[1] if " " in example else ""
            return format_value(default, unit)
    return repr(default)


def _outputs(specs: list[str] | None) -> list[tuple[str, Path | None]]:
    out: list[tuple[str, Path | None]] = []
    for spec in specs or ["text"]:
        name, _, file = spec.partition(":")
        if name not in FORMATS:
            raise _UsageError(f"unknown format {name!r}; expected one of {', '.join(FORMATS)}")
        out.append((name, Path(file) if file else None))
    if sum(1 for _, f in out if f is None) > 1:
        raise _UsageError("only one --format may go to standard output; give the others a FILE")
    return out


class _UsageError(Exception):
    pass


def _check(args: argparse.Namespace, plugins) -> int:  # type: ignore[no-untyped-def]
    from emgate.config import find_config, load_policy
    from emgate.engine import Run, execute, input_findings
    from emgate.errors import InputError, InputErrors
    from emgate.findings import RunResult

    try:
        outputs = _outputs(args.formats)
    except _UsageError as exc:
        print(f"emgate check: {exc}", file=sys.stderr)
        return EXIT_INPUT
    start = args.paths[0] if args.paths else Path.cwd()
    config = args.config or find_config(start if start.is_dir() else start.parent)
    installed = {p.distribution: p.version for p in plugins.packs}
    try:
        rules = {rid: lr.rule for rid, lr in plugins.rules.items()}
        policy = load_policy(config, rules, Path.cwd(), installed)
        paths = list(args.paths) or (policy.configured_files() if policy.source else [Path(".")])
        run = Run(paths=paths, policy=policy, plugins=plugins)
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
        result = RunResult(findings=input_findings(exc))
        _emit(result, outputs)
        return result.exit_code
    if args.today:
        run.today = args.today
    from emgate.parallel import available_cores

    run.jobs = args.jobs or available_cores()
    result = execute(run)
    return max(result.exit_code, _emit(result, outputs))


def _sweep(args: argparse.Namespace) -> int:
    from emgate.errors import InputError, InputErrors
    from emgate.sweep import SweepRun, sweep

    try:
        return sweep(
            SweepRun(args.record, args.spec, args.out, args.scheduler, args.chunk, args.config)
        )
    except (InputError, InputErrors) as exc:
        for err in exc.errors if isinstance(exc, InputErrors) else [exc]:
            where = f"{err.location}: " if err.location else ""
            print(f"emgate sweep: {where}{err.message}", file=sys.stderr)
        return EXIT_INPUT


def _inside(path: Path, root: Path) -> bool:
    try:
        path.resolve().relative_to(root.resolve())
    except ValueError:
        return False
    return path.is_file()


def _emit(result, outputs: list[tuple[str, Path | None]]) -> int:  # type: ignore[no-untyped-def]
    from emgate.atomic import write_atomic
    from emgate.report import reporter

    status = EXIT_OK
    for name, file in outputs:
        text = reporter(name)(result)
        if file is None:
            sys.stdout.write(text)
            continue
        try:
            write_atomic(file, text)
        except OSError as exc:
            print(f"emgate: cannot write {name} report to {file}: {exc.strerror}", file=sys.stderr)
            status = EXIT_INPUT
    return status


def entry() -> None:
    sys.exit(main())
