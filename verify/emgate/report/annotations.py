"""CI annotation lines in the workflow-command format: ``::error file=F,line=L,col=C,title=T::M``.

One line per finding: ``error``, ``warning``, or ``notice`` for info; a waived finding is a
notice that says it is waived and by which waiver. ``file`` is relative to the repository's
root (the runner places annotations from there), whatever folder emgate ran in. The last
line is a notice with the verdict, the rules that ran with their versions, and the
disclaimer. Escaping follows the format: in the message ``%``, CR and LF become ``%25``,
``%0D``, ``%0A``; in property values ``:`` and ``,`` also become ``%3A`` and ``%2C``, so no
text can end a property or start a second command. Other control characters are shown as
escapes (``\\x1b``) so that none reaches the log raw.
"""

from __future__ import annotations

from emgate.findings import DISCLAIMER, Finding, RunResult
from emgate.report.common import printable, rules_line, summary_line

COMMANDS = {"error": "error", "warning": "warning", "info": "notice"}


def escape_data(text: str) -> str:
    """A message, escaped for the text after ``::``."""
    return printable(text).replace("%", "%25").replace("\r", "%0D").replace("\n", "%0A")


def escape_property(text: str) -> str:
    """A property value (file, title), escaped."""
    return escape_data(text).replace(":", "%3A").replace(",", "%2C")


def command(name: str, message: str, **props: str | int) -> str:
    """One workflow-command line; empty properties are left out."""
    args = ",".join(f"{k}={escape_property(str(v))}" for k, v in props.items() if v)
    return f"::{name}{' ' + args if args else ''}::{escape_data(message)}"


def annotation(f: Finding) -> str:
    message = f.message + (f" [{f.record_path}]" if f.record_path != "$" else "")
    if f.waived_by:
        name, title = "notice", f"emgate {f.rule} (waived)"
        message = f"waived {f.severity}: {message}; waived by {f.waived_by}"
    else:
        name, title = COMMANDS[f.severity], f"emgate {f.rule}"
    line = f.line if f.file else 0
    col = f.column if line else 0
    file = f.file if f.repo_file is None else f.repo_file  # the runner wants it from the root
    return command(name, message, file=file, line=line, col=col, title=title)


def render(result: RunResult) -> str:
    lines = [annotation(f) for f in result.each_finding()]
    final = f"{summary_line(result)}; {rules_line(result)}. {DISCLAIMER}"
    lines.append(command("notice", final, title="emgate"))
    return "\n".join(lines) + "\n"
