"""An explicit slot table that does not make a balanced winding: no rule crashes, the
winding-balance rule fails it, and the THD is reported as not computed; a balanced table is
checked as usual.
"""

from __future__ import annotations

from pathlib import Path

import pytest
import yaml

from conftest import GENSET, PUMP, SERVO, check_json, findings, outcome, run_cli, variant

# --- an unbalanced explicit layout crashes no rule ------------------------------------------------


def _table(base: Path) -> list[str]:
    """The star-of-slots layout of a demo record, written as the record's slot table."""
    from emgate.physics.star_of_slots import star_of_slots

    d = yaml.safe_load(base.read_text(encoding="utf-8"))
    w = d["winding"]
    lay = star_of_slots(d["stator"]["slots"], d["poles"] // 2, 3, w["layers"], w["coil_pitch"])
    return [
        " ".join(
            ("+" if lay[ph, s] > 0 else "-") + "ABC"[ph]
            for ph in range(3)
            for _ in range(abs(lay[ph, s]))
        )
        for s in range(lay.shape[1])
    ]


UNBALANCED = {
    # [calc] slot 1's A side becomes B: A nets -1 side, B +1, so the phases do not close.
    "one side moved": lambda t: [t[0].replace("A", "B", 1), *t[1:]],
    # [calc] slot 1 reversed: its phases net -2 sides each, no closed phase left there.
    "one slot reversed": lambda t: [
        t[0].replace("+", "#").replace("-", "+").replace("#", "-"),
        *t[1:],
    ],
    # [calc] phase A given to B everywhere: A has no coil sides, so no winding factor.
    "phase A missing": lambda t: [e.replace("A", "B") for e in t],
}


@pytest.mark.parametrize("base", [PUMP, SERVO, GENSET], ids=lambda p: p.stem)
@pytest.mark.parametrize("case", sorted(UNBALANCED))
def test_no_rule_crashes_on_an_unbalanced_explicit_layout(
    repo: Path, base: Path, case: str
) -> None:
    overrides = {
        "winding.layout": UNBALANCED[case](_table(base)),
        # declared-values must not crash on a figure the winding leaves undefined either
        "declared": {"winding.mmf_thd": 0.5, "winding.winding_factor": 0.9},
    }
    result = run_cli("check", "--format", "json", variant(repo, overrides, base=base))
    assert result.code == 1, result.out  # winding-balance fails it; no crash (exit 3)
    doc = result.json()
    assert not [f for f in doc["findings"] if f["kind"] == "crash"]
    assert any(f["rule"] == "winding-balance" for f in doc["findings"])
    (thd,) = findings(result, "mmf-thd")  # one info finding, and no check
    assert thd["severity"] == "info"
    assert "not computed" in thd["message"] and "unbalanced" in thd["message"]
    assert thd["record_path"] == "$.winding.layout"
    assert outcome(result, "mmf-thd")["checks"] == []


def test_a_balanced_explicit_layout_is_still_checked(repo: Path) -> None:
    # The star-of-slots table written out is the generated winding itself [calc].
    result = check_json(variant(repo, {"winding.layout": _table(PUMP)}))
    assert result.code == 0, result.out
    assert outcome(result, "mmf-thd")["checks"], "the THD of a balanced table is checked"
