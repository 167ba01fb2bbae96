"""Phase current and voltage through star and polygon connections of m phases, against
phasor geometry (numpy) and the three-phase textbook values, in the kernel and on the sheet.
"""

from __future__ import annotations

import math
from pathlib import Path
from typing import Any

import numpy as np
import pytest

from conftest import SERVO, sheet, variant
from emgate.physics import currents

# --- m-phase connections --------------------------------------------------------------------------


def adjacent_phasor_gap(m: int) -> float:
    """|exp(j 0) - exp(j 2 pi / m)|: a line quantity over the phase quantity between two
    adjacent phases of a symmetric m-phase system [calc: phasor geometry, numpy]."""
    return float(abs(1.0 - np.exp(2j * np.pi / m)))


@pytest.mark.parametrize("m", range(2, 13))
def test_polygon_current_and_star_voltage_from_the_phasor_difference(m: int) -> None:
    ratio = adjacent_phasor_gap(m)
    # Two independent float routes (sin against a complex difference): 1e-12 relative.
    assert currents.phase_current(10.0, "delta", m) == pytest.approx(10.0 / ratio, rel=1e-12)
    assert currents.phase_voltage(400.0, "star", m) == pytest.approx(400.0 / ratio, rel=1e-12)
    assert currents.phase_current(10.0, "star", m) == 10.0  # star: the line current, exactly
    assert currents.phase_voltage(400.0, "delta", m) == 400.0  # polygon: the line voltage, exactly


def test_three_phases_reduce_to_root_three() -> None:
    # [mem: Fitzgerald and Kingsley, Electric Machinery, three-phase connections]; 1e-15
    # relative is a couple of ulps of sin(pi/3).
    assert currents.phase_current(14.6, "delta", 3) == pytest.approx(14.6 / math.sqrt(3), rel=1e-15)
    assert currents.phase_voltage(400.0, "star", 3) == pytest.approx(
        400.0 / math.sqrt(3), rel=1e-15
    )


@pytest.mark.parametrize("connection", ["star", "delta"])
def test_one_phase_takes_the_line_values(connection: str) -> None:
    # One phase sits across the line: no star point, no polygon [calc].
    # Exact: the line values pass through untouched.
    assert currents.phase_current(3.9, connection, 1) == 3.9  # type: ignore[arg-type]
    assert currents.phase_voltage(400.0, connection, 1) == 400.0  # type: ignore[arg-type]


@pytest.mark.parametrize("phases", [0, -3, 2.5])
def test_a_phase_count_that_is_no_whole_positive_number_is_refused(phases: Any) -> None:
    with pytest.raises(ValueError, match="phases"):
        currents.phase_current(10.0, "delta", phases)


FIVE_PHASE_PUMP = {"winding.phases": 5, "stator.slots": 20, "winding.coil_pitch": 4}


def test_a_five_phase_polygon_divides_the_line_current_by_2_sin_36_degrees(repo: Path) -> None:
    s = sheet(variant(repo, FIVE_PHASE_PUMP))  # delta, as the pump
    # [calc: phasor geometry] I_ph = I_L / (2 sin(pi/5)) = 14.6 / 1.17557 = 12.420 A.
    # sin against a complex difference, through the JSON sheet: 1e-12 relative.
    assert s["winding.phase_current"] == pytest.approx(14.6 / adjacent_phasor_gap(5), rel=1e-12)
    assert s["winding.phase_voltage"] == pytest.approx(400.0, rel=1e-15)  # polygon: U_L, exact


def test_a_five_phase_star_induction_motor_takes_its_emf_from_the_phase_voltage(
    repo: Path,
) -> None:
    s = sheet(variant(repo, {**FIVE_PHASE_PUMP, "rating.connection": "star"}))
    u_ph = 400.0 / adjacent_phasor_gap(5)  # [calc: phasor geometry] 340.26 V
    assert s["winding.phase_voltage"] == pytest.approx(u_ph, rel=1e-12)  # two float routes
    # [mem: Pyrhonen] E = sqrt 2 pi f N_ph kw1 Phi with emgate's stated 3 % drop (common
    # practice, no source); N_ph = 20 coils / 5 phases x 21 turns = 84, kw1 = kp = sin(4/5
    # pi/2) for q = 1 [mem: Pyrhonen, pitch factor].
    kw1 = math.sin(0.8 * math.pi / 2)
    flux = 0.97 * u_ph / (math.sqrt(2) * math.pi * 50 * 84 * kw1)
    assert s["air_gap.flux_per_pole"] == pytest.approx(flux, rel=1e-9)  # closed form: rounding


def test_a_one_phase_record_takes_the_line_current(repo: Path) -> None:
    one = {
        "winding.phases": 1,
        "winding.layers": 1,
        "stator.slots": 10,
        "rating.connection": "delta",
        # 2.2 kW from one 400 V phase needs more than 3.9 A: 7 A gives eta cos(phi) 0.79 [calc]
        "rating.line_current": "7 A",
    }
    s = sheet(variant(repo, one, base=SERVO))
    # [calc] one phase across the line; exact, as no arithmetic touches the values.
    assert s["winding.phase_current"] == 7.0
    assert s["winding.phase_voltage"] == 400.0
