"""Hand-built run results for the reporter tests: a waived finding, a crash, input errors with
and without a file, and hostile messages and file names."""

from __future__ import annotations

from typing import Literal

from emgate.findings import Finding, RecordResult, RuleInfo, RuleOutcome, RunResult
from emgate.rule import Check

# Hostile text: table pipes, code and emphasis marks, a second workflow command after a line
# break, a terminal escape, HTML, a mention, a link, percent signs that look like escapes.
HOSTILE = (
    "density | `x` 50%25 a:b,c\nsecond ::warning::line\r\n\x1b[31m<b>&amp;</b>"
    " @team [x](y) *em* _u_ ~s~ \\ end"
)
FILE_A = "designs/motor,a:b%c.yaml"
FILE_B = "designs/two\nlines%0A.yaml"
FILE_BAD = "designs/broken.yaml"
FILE_CI = "ci/pipeline.yaml"  # named on the command line, not an emgate file
SKIPPED = "skipped: not an emgate file (no 'schema: emgate/...' line)"
WAIVER = "waiver of 'acme/aspect' owned by Ada, until 2099-01-01: tooling trial, see note"
CRASH = (
    "rule crashed: ZeroDivisionError: division by zero (at balance.py:7); the record is not"
    " verified by this rule"
)
PLUGIN_ERROR = "plugin 'acme' failed to load: ImportError: no module named acme_rules"


# Demo numbers; the margins follow from Check.margin = (limit - value) / |limit| for a max
# bound and its negative for a min bound [calc] closed form, the definition in emgate.rule.
def _density(value: float, limit: float, quantity: str = "stator.current_density") -> Check:
    """A current-density check, value and limit in A/mm^2 (SI inside: 1 A/mm^2 = 1e6 A/m^2)."""
    return Check(
        quantity, quantity, ("winding", "conductor"), value * 1e6, limit * 1e6, "max", "A/mm^2"
    )


def _aspect(value: float, limit: float, bound: Literal["max", "min"]) -> Check:
    return Check(
        "stator.aspect_ratio",
        "stack length / bore",
        ("stator", "stack_length"),
        value,
        limit,
        bound,
        "",
    )


J_FAIL = _density(8.8, 8)  # margin (8 - 8.8) / 8 = -10 %
J_FIELD = _density(4, 5, "rotor.field_current_density")  # margin (5 - 4) / 5 = +20 %
J_WIDE = _density(4, 8)  # margin (8 - 4) / 8 = +50 %
J_CLOSE = _density(7.6, 8)  # margin (8 - 7.6) / 8 = +5 %: the worst of record B
ASPECT_LOW = _aspect(0.54, 0.6, "min")  # margin -(0.6 - 0.54) / 0.6 = -10 %
ASPECT_OK = _aspect(1.2, 1.6, "max")  # margin (1.6 - 1.2) / 1.6 = +25 %


def hand_result() -> RunResult:
    """Two records, a waived finding, a crash, a warning, a note, two input errors, and a
    file skipped as not an emgate file."""
    rules = [
        RuleInfo("acme/aspect", "2.3", "stack aspect | within `tooling`", "acme-pack", "2.3.0"),
        RuleInfo("current-density", "1", "current density within the limit", "emgate", "0.1.0"),
        RuleInfo("gap-flux", "1", "air-gap flux density within the limit", "emgate", "0.1.0"),
        RuleInfo("winding-balance", "1", "the winding is balanced", "emgate", "0.1.0"),
    ]
    rec_a = RecordResult(
        FILE_A,
        "m-1",
        "pmsm",
        [
            RuleOutcome("acme/aspect", "waived", [ASPECT_LOW]),
            RuleOutcome("current-density", "fail", [J_FIELD, J_FAIL]),
            RuleOutcome("gap-flux", "not_applicable"),
            RuleOutcome("winding-balance", "crash", [], CRASH),
        ],
    )
    rec_b = RecordResult(
        FILE_B,
        "m-2",
        "pmsm",
        [
            RuleOutcome("acme/aspect", "fail", [ASPECT_OK]),
            RuleOutcome("current-density", "pass", [J_WIDE, J_CLOSE]),
            RuleOutcome("gap-flux", "not_applicable"),
            RuleOutcome("winding-balance", "fail", []),
        ],
    )
    findings = [
        Finding(
            "current-density",
            "error",
            FILE_A,
            12,
            5,
            "$.winding.conductor",
            HOSTILE,
            "m-1",
            check=J_FAIL,
        ),
        Finding(
            "acme/aspect",
            "error",
            FILE_A,
            20,
            3,
            "$.stator.stack_length",
            "stack length / bore 0.54 is below the minimum 0.6",
            "m-1",
            check=ASPECT_LOW,
            waived_by=WAIVER,
        ),
        Finding("winding-balance", "error", FILE_A, 1, 1, "$", CRASH, "m-1", kind="crash"),
        Finding(
            "winding-balance",
            "warning",
            FILE_B,
            30,
            9,
            "$.winding.layout",
            "coil groups differ by one turn between phases",
            "m-2",
        ),
        Finding(
            "acme/aspect",
            "info",
            FILE_B,
            8,
            3,
            "$.stator.stack_length",
            "aspect ratio within 30 % of the tooling limit",
            "m-2",
        ),
        Finding(
            "input",
            "error",
            FILE_BAD,
            3,
            7,
            "$.stator.slots",
            "expected an integer, found 'many'",
            kind="input",
        ),
        Finding("input", "error", "", 0, 0, "$", PLUGIN_ERROR, kind="input"),
        Finding("input", "info", FILE_CI, 1, 1, "$", SKIPPED, kind="note"),
    ]
    result = RunResult([rec_a, rec_b], findings, rules, files_read=3)
    result.sort()
    return result


def clean_result() -> RunResult:
    rules = [RuleInfo("current-density", "1", "current density", "emgate", "0.1.0")]
    rec = RecordResult(
        "designs/ok.yaml", "ok", "pmsm", [RuleOutcome("current-density", "pass", [J_WIDE])]
    )
    return RunResult([rec], [], rules, files_read=1)
