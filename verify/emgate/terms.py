"""The vocabulary every stage shares: record paths, severities, exit codes, schema ids.

One home each, so that the loader, the rules, the policy and the reporters cannot drift apart.
Nothing here imports anything heavier than the standard library.
"""

from __future__ import annotations

import re
from typing import Final, Literal

#: A path into a record, as keys and list indices: ``("stator", "slot", "opening")``.
RecordPath = tuple[str | int, ...]

Severity = Literal["error", "warning", "info"]
SEVERITIES: Final[tuple[Severity, ...]] = ("error", "warning", "info")

#: Exit codes of every command (fail closed: a crash never passes a merge).
EXIT_OK: Final = 0
EXIT_FINDINGS: Final = 1  # a rule found an error
EXIT_INPUT: Final = 2  # input, configuration or plugin could not be read or validated
EXIT_CRASH: Final = 3  # a rule, plugin or emgate itself crashed

DESIGN_SCHEMA: Final = "emgate/design@1"
MATERIALS_SCHEMA: Final = "emgate/materials@1"
WAIVERS_SCHEMA: Final = "emgate/waivers@1"
CONFIG_SCHEMA: Final = "emgate/config@1"

_IDENT = re.compile(r"[A-Za-z_][A-Za-z0-9_]*")


def path_string(path: RecordPath) -> str:
    """A record path as a JSON path: ``$.stator.slot.opening``, ``$.waivers[0]``."""
    out = "$"
    for part in path:
        if isinstance(part, int):
            out += f"[{part}]"
        elif _IDENT.fullmatch(part):
            out += f".{part}"
        else:
            out += f"[{part!r}]"
    return out
