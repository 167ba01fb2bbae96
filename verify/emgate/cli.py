"""Command line: ``emgate check|show|diff|sweep|rules|explain|plugins|init|lsp|schema``.

This module parses the command line and is all that ``emgate --version`` or ``-h`` imports;
the subcommands' handlers are :mod:`emgate.commands`.

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
from emgate.startup import hold_gc, one_blas_thread
from emgate.terms import EXIT_CRASH, EXIT_OK


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


def _show_format(text: str) -> str:
    if text in ("text", "json", "html") or text.startswith("html:"):
        return text
    raise argparse.ArgumentTypeError(f"expected text, json or html[:FILE], found {text!r}")


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(
        prog="emgate",
        description="Design-verification gate for electric machines. Results support, and do"
        " not replace, review by a qualified engineer under the applicable standards and local"
        " codes.",
    )
    p.add_argument("--version", action="version", version=f"emgate {__version__}")
    sub = p.add_subparsers(
        dest="command", required=True, metavar="COMMAND", help="what to do (COMMAND -h: its help)"
    )
    c = sub.add_parser(
        "check",
        help="check design records against the rules",
        description="Check design records against the installed rules and the policy of the"
        " nearest emgate.yaml.",
        epilog=EXIT_CODES,
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
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
        " FILE atomically instead of standard output; repeatable; html:FILE writes an index"
        " and every record's calculation sheet beside it",
    )
    c.add_argument("--config", type=Path, help="project config (default: nearest emgate.yaml)")
    c.add_argument(
        "--changed-since",
        metavar="REV",
        help="check only the records changed against git revision REV, and those"
        " that changed materials or configuration affect",
    )
    c.add_argument(
        "--today", type=_date, metavar="YYYY-MM-DD", help="judge waiver expiry as of this date"
    )
    for flag, what in (("--select", "run only the rules"), ("--ignore", "do not run the rules")):
        c.add_argument(
            flag,
            action="append",
            default=[],
            metavar="SELECTOR[,...]",
            help=f"{what} matched, on top of the policy: 'all', a rule id, a pack prefix"
            " ('acme/') or a tag ('tag:thermal'), as in emgate.yaml; repeatable",
        )
    c.add_argument(
        "-q",
        "--quiet",
        action="store_true",
        help="text output: the findings only (no margins, summary or rules line); no"
        " summary on standard error",
    )
    c.add_argument(
        "-v",
        "--verbose",
        action="store_true",
        help="also note each YAML file found under a folder that is not an emgate file"
        " (skipped silently otherwise)",
    )
    c.add_argument(
        "--remedies",
        choices=["on", "off"],
        default="on",
        help="for each failing check, the value of a record field that would fix it (default"
        " on; off is faster)",
    )
    c.add_argument(
        "--jobs",
        type=_jobs,
        metavar="N",
        help="worker processes for the records (default: the available cores); the report"
        " is the same as with --jobs 1",
    )
    s = sub.add_parser("show", help="print the calculation sheet of a design")
    s.add_argument("file", type=Path, metavar="FILE", help="a design record")
    s.add_argument(
        "--format",
        default="text",
        type=_show_format,
        metavar="{text,json,html[:FILE]}",
        help="html: the sheet as one self-contained page with plots (to FILE, or stdout)",
    )
    s.add_argument(
        "--config", type=Path, help="accepted and not used: the sheet does not depend on policy"
    )
    d = sub.add_parser(
        "diff", help="the physics of a change: records, quantities and margins between revisions"
    )
    d.add_argument(
        "refs",
        nargs="+",
        metavar="BASE [HEAD] [PATHS...]",
        help="git revisions to compare (HEAD omitted: the working tree) and paths to limit it"
        " to; or two record files",
    )
    d.add_argument(
        "--format",
        action="append",
        metavar="NAME[:FILE]",
        dest="formats",
        help="text, json, markdown or html; with :FILE, written to FILE; repeatable",
    )
    d.add_argument(
        "--threshold",
        default="0.1",
        metavar="PERCENT",
        help="report a quantity that moved by more than this, relative (default 0.1 %%)",
    )
    w = sub.add_parser(
        "sweep", help="check variants of a record over a grid or random sample of its fields"
    )
    w.add_argument("record", type=Path, metavar="RECORD", help="the design record to vary")
    w.add_argument(
        "spec", type=Path, metavar="SPEC", help="the sweep: fields and their ranges or values"
    )
    w.add_argument("--out", type=Path, help="table of variants: FILE.csv or FILE.parquet")
    w.add_argument(
        "--html",
        type=Path,
        metavar="FILE",
        help="a self-contained page of the feasibility maps (needs the extra emgate[html])",
    )
    w.add_argument(
        "--scheduler",
        default="local",
        help="local (default: a Dask cluster on this machine's cores), tcp://HOST:PORT"
        " (a running Dask scheduler), or none (this process)",
    )
    w.add_argument("--chunk", type=_jobs, default=256, help="variants per task (default 256)")
    w.add_argument(
        "--config", type=Path, help="project config (default: nearest emgate.yaml of the record)"
    )
    r = sub.add_parser("rules", help="list every installed rule")
    r.add_argument(
        "--format", default="text", choices=["text", "json"], help="output (default: text)"
    )
    e = sub.add_parser("explain", help="print a rule's method, formulas and sources")
    e.add_argument("rule", metavar="RULE", help="a rule id, as 'emgate rules' lists them")
    sub.add_parser("plugins", help="list installed plugin packs")
    i = sub.add_parser("init", help="write a starter design repository (never overwrites)")
    i.add_argument(
        "dir", nargs="?", type=Path, default=Path("."), help="folder to write into (default: .)"
    )
    i.add_argument(
        "--machine",
        choices=["induction", "surface_pm", "salient_field"],
        default="induction",
        help="the kind of machine of the starter record (default: induction)",
    )
    sub.add_parser(
        "lsp",
        help="run the language server on standard input and output (for an editor; needs"
        " the extra emgate[lsp])",
    )
    sc = sub.add_parser("schema", help="print a JSON Schema")
    sc.add_argument(
        "kind",
        nargs="?",
        default="design",
        choices=list(SCHEMA_KINDS),
        help="which schema (default: design)",
    )
    sc.add_argument(
        "--write",
        type=Path,
        metavar="DIR",
        help="write every schema as DIR/KIND.schema.json instead",
    )
    return p


EXIT_CODES = """exit codes:
  0  clean: no error finding (warnings and waived findings allowed)
  1  a rule found an error
  2  input, configuration, plugin or usage could not be read or validated
  3  a rule, a plugin or emgate itself crashed (fail closed)"""


def main(argv: list[str] | None = None) -> int:
    args = _parser().parse_args(argv)
    try:
        from emgate.commands import dispatch  # the handlers: off the start-up path

        return dispatch(args)
    except KeyboardInterrupt:
        print("emgate: interrupted", file=sys.stderr)
        return EXIT_CRASH
    except BrokenPipeError:  # the reader of our output left (| head)
        # a verdict that could not be told must not read as a pass
        return EXIT_CRASH if args.command in ("check", "diff") else EXIT_OK
    except Exception as exc:  # fail closed, without a traceback for the user
        if os.environ.get("EMGATE_DEBUG"):
            raise
        from emgate.report.common import one_line

        print(
            one_line(f"emgate: internal error: {type(exc).__name__}: {exc}")
            + "\nSet EMGATE_DEBUG=1 for the traceback; please report it.",
            file=sys.stderr,
        )
        return EXIT_CRASH


def entry() -> None:
    one_blas_thread()
    hold_gc()
    sys.exit(main())
