"""Mean turn length and phase resistance: the tooth-coil turn against Cauchy's perimeter
formula (scipy quadrature), the servo by hand, distributed windings by the end-winding
estimate.
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest
import scipy.integrate
import yaml

from conftest import MM, MM2, PUMP, SERVO, sheet, variant
from emgate.physics import resistance

# --- tooth-coil and distributed mean turn length --------------------------------------------------


RHO20_COPPER = 1e-6 / 58.0  # ohm m [pub: IEC 60028, 1/58 ohm mm^2/m]


@pytest.mark.parametrize(("length", "tooth", "side"), [(0.06, 0.013, 0.006), (0.2, 0.03, 0.0)])
def test_tooth_coil_turn_is_the_perimeter_of_the_offset_tooth(
    length: float, tooth: float, side: float
) -> None:
    if side == 0.0:
        with pytest.raises(ValueError, match="coil_side_width"):
            resistance.tooth_coil_mean_turn_length(length, tooth, side)
        return
    r = side / 2.0

    # Cauchy's formula: a convex figure's perimeter is the integral of its support function
    # over all directions; that of the rectangle l x b_t offset by r is
    # (l/2)|cos t| + (b_t/2)|sin t| + r [pub: Cauchy's surface area formula, integral
    # geometry]. scipy integrates it numerically.
    def support(t: float) -> float:
        return length / 2 * abs(math.cos(t)) + tooth / 2 * abs(math.sin(t)) + r

    perimeter, _ = scipy.integrate.quad(support, 0.0, 2.0 * math.pi, points=[math.pi / 2, math.pi])
    got = resistance.tooth_coil_mean_turn_length(length, tooth, side)
    assert got == pytest.approx(perimeter, rel=1e-9)  # quadrature error only


@pytest.mark.parametrize("layers", [2, 1])
def test_servo_mean_turn_length_and_resistance_by_hand(repo: Path, layers: int) -> None:
    s = sheet(variant(repo, {"winding.layers": layers}, base=SERVO))
    # [calc] winding zone 2.5 to 16 mm deep (opening 1 + wedge 1.5), 10 to 14 mm wide: the
    # mean slot width 12 mm; the tooth at mid-zone, radius 39 + 9.25 mm, 12 slots.
    tooth = 2 * math.pi * (39 + 9.25) / 12 - 12
    side = 12 / layers  # two coil sides side by side in a double-layer slot
    turn = 2 * (60 + tooth) + math.pi * side  # [calc] Steiner: 2 (l + b_t) + pi w_c
    assert s["winding.mean_turn_length"] == pytest.approx(turn * MM, rel=1e-12)  # rounding
    # [pub: IEC 60028] R20 = rho20 N_ph l_av / S; N_ph = coils per phase x 100 turns: 4 coils
    # (double layer) or 2 (single layer) of the 12 slots, 0.71 mm wire.
    n_ph = 12 * layers // 6 * 100
    r20 = RHO20_COPPER * n_ph * turn * MM / (math.pi / 4 * 0.71**2 * MM2)
    assert s["winding.phase_resistance_20c"] == pytest.approx(r20, rel=1e-9)  # rounding


def test_distributed_windings_keep_the_end_winding_estimate() -> None:
    s = sheet(PUMP)
    # [mem: Pyrhonen] 2 l + 2.4 W + 0.1 m, W = pi (D + h) / Q y: 136 mm bore, 20 mm slots,
    # 36 slots, pitch 7; 140 mm stack.
    data = yaml.safe_load(PUMP.read_text(encoding="utf-8"))
    assert data["stator"]["slot"]["height"] == "20 mm" and data["winding"]["coil_pitch"] == 7
    span = math.pi * (136 + 20) / 36 * 7
    turn = 2 * 140 + 2.4 * span + 100
    assert s["winding.mean_turn_length"] == pytest.approx(turn * MM, rel=1e-12)  # rounding
