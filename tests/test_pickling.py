"""Results pickle by their fields (the spool of a large run, ``--jobs`` workers): what is
read back equals what was written, and a class the scheme cannot serve is refused."""

from __future__ import annotations

import copy
import pickle
from dataclasses import dataclass, field

import pytest

from emgate.findings import Finding, RecordResult, RecordSummary, RuleOutcome
from emgate.pickling import by_fields
from emgate.rule import Check


def _results() -> list[object]:
    check = Check(
        "stator.slot_fill",
        "slot fill",
        ("winding", "turns_per_coil"),
        0.7,
        0.65,
        "max",
        "",
        "common practice, no source",
    )
    finding = Finding(
        "slot-fill",
        "error",
        "designs/a.yaml",
        12,
        3,
        "winding.turns_per_coil",
        "slot fill 0.70 > 0.65",
        record_id="a",
        check=check,
        repo_file="d/a.yaml",
    )
    outcome = RuleOutcome("slot-fill", "fail", [check], "", 0.25)
    summary = RecordSummary(19, ("slot-fill", check), frozenset({"slot-fill", "gap-flux"}))
    return [
        check,
        finding,
        outcome,
        summary,
        RecordResult("designs/a.yaml", "a", "surface_pm", [outcome]),
        RecordResult("designs/a.yaml", "a", "surface_pm", [], summary),
    ]


@pytest.mark.parametrize("protocol", [2, pickle.HIGHEST_PROTOCOL])
def test_results_read_back_equal_to_what_was_written(protocol: int) -> None:
    for item in _results():
        back = pickle.loads(pickle.dumps(item, protocol=protocol))
        assert type(back) is type(item)
        assert back == item
        assert copy.deepcopy(item) == item


def test_a_field_left_out_of_init_is_refused() -> None:
    @dataclass(slots=True)
    class Derived:
        a: int
        b: int = field(init=False, default=0)

    with pytest.raises(TypeError, match="by_fields"):
        by_fields(Derived)


@dataclass(frozen=True, slots=True)
class Mine(Check):
    """A pack's own kind of Check (at module level: pickle finds a class by its name)."""

    extra: str = "x"


def test_a_subclass_of_a_result_keeps_its_own_type_and_fields() -> None:
    # a pack may extend Check: its results come back from --jobs workers as they were
    mine = Mine("q", "l", ("a",), 1.0, 2.0, "max", "A", "", extra="kept")
    back = pickle.loads(pickle.dumps(mine, protocol=pickle.HIGHEST_PROTOCOL))
    assert type(back) is Mine and back == mine and back.extra == "kept"
