"""Carter's coefficient and the effective gap, against closed forms and a 2D field solution."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st
from skfem import Basis, ElementTriP2, MeshTri, asm, condense, solve
from skfem.models.poisson import laplace

from emgate.physics.airgap import (
    carter_coefficient,
    carter_gamma,
    carter_gamma_approx,
    effective_gap,
    magnetic_gap,
)

MM = 1e-3


def test_carter_check_value() -> None:
    # [calc] from Carter's formula [mem: Carter 1901, as given in Pyrhonen ch. 3]:
    # tau_s 10 mm, b0 2.5 mm, g 0.5 mm -> kc 1.1447; the approximation gives 1.1429.
    # Tolerance 5e-5: the check values are quoted to 4 decimals.
    assert carter_coefficient(10 * MM, 2.5 * MM, 0.5 * MM) == pytest.approx(1.1447, abs=5e-5)
    kc_approx = carter_coefficient(10 * MM, 2.5 * MM, 0.5 * MM, approximate=True)
    assert kc_approx == pytest.approx(1.1429, abs=5e-5)


def test_gamma_limits() -> None:
    # [calc] from gamma = (4/pi)[u atan u - ln sqrt(1 + u^2)]: small u gives 2 u^2 / pi;
    # large u gives (4/pi)[u pi/2 - 1 - ln u] + O(1/u^2).
    # Tolerance 1e-6 relative: the neglected terms are of order u^2 (small) and 1/u^2 (large).
    u = 1e-4
    assert carter_gamma(2 * u, 1.0) == pytest.approx(2 * u * u / math.pi, rel=1e-6)
    u = 1e4
    large = 4 / math.pi * (u * math.pi / 2 - 1 - math.log(u))
    assert carter_gamma(2 * u, 1.0) == pytest.approx(large, rel=1e-6)
    # a closed slot does not modulate the gap (exact)
    assert carter_gamma(0.0, 1.0) == 0.0
    assert carter_coefficient(10 * MM, 0.0, 0.5 * MM) == 1.0


def test_gamma_is_dimensionless() -> None:
    # [calc] gamma depends on b0/g only; scaling both by 1000 may change it only by rounding
    # (tolerance 1e-12 relative).
    assert carter_gamma(2.5, 0.5) == pytest.approx(carter_gamma(2.5 * MM, 0.5 * MM), rel=1e-12)


@pytest.mark.parametrize(
    ("args", "message"),
    [
        ((0.0, 2.5 * MM, 0.5 * MM), "slot pitch"),
        ((-10 * MM, 2.5 * MM, 0.5 * MM), "slot pitch"),
        ((10 * MM, -1 * MM, 0.5 * MM), "slot opening"),
        ((10 * MM, 2.5 * MM, 0.0), "air gap"),
        ((10 * MM, 2.5 * MM, math.nan), "air gap"),
        ((10 * MM, 10 * MM, 0.5 * MM), "smaller than the slot pitch"),
        ((10 * MM, 12 * MM, 0.5 * MM), "smaller than the slot pitch"),
    ],
)
def test_carter_rejects_bad_input(args: tuple[float, float, float], message: str) -> None:
    # behaviour of the API, no source
    with pytest.raises(ValueError, match=message):
        carter_coefficient(*args)


# Ranges where kc - 1 stays far above rounding, so strict growth is observable.
pitches = st.floats(min_value=1 * MM, max_value=100 * MM)
gap_fractions = st.floats(min_value=0.005, max_value=0.2)  # g / tau_s
opening_ratios = st.floats(min_value=0.1, max_value=20.0)  # b0 / g
steps = st.floats(min_value=1e-3, max_value=0.5)


@given(pitches, gap_fractions, opening_ratios, steps)
def test_kc_at_least_one_and_grows_with_opening(
    tau: float, gap_fraction: float, ratio: float, step: float
) -> None:
    # [calc] d(gamma g)/d b0 = (2/pi) atan(b0 / 2g) > 0, so kc >= 1 rises with the opening.
    g = gap_fraction * tau
    b0 = min(ratio * g, 0.9 * tau)
    wider = min(b0 * (1 + step), 0.95 * tau)
    kc = carter_coefficient(tau, b0, g)
    assert kc >= 1.0
    assert carter_coefficient(tau, wider, g) > kc
    assert carter_coefficient(tau, wider, g, approximate=True) > carter_coefficient(
        tau, b0, g, approximate=True
    )


@given(pitches, gap_fractions, opening_ratios, steps)
def test_kc_falls_as_gap_grows(tau: float, gap_fraction: float, ratio: float, step: float) -> None:
    # [calc] d(gamma g)/dg = -(2/pi) ln(1 + u^2) < 0 at fixed b0: a larger gap is less
    # affected by the same slot opening.
    g = gap_fraction * tau
    b0 = min(ratio * g, 0.9 * tau)
    assert carter_coefficient(tau, b0, g * (1 + step)) < carter_coefficient(tau, b0, g)


def test_magnetic_gap_of_surface_magnets() -> None:
    # [calc] g' = g + sleeve + h_m / mu_rec [mem: Pyrhonen ch. 3]:
    # 1 mm + 0.5 mm + 3 mm / 1.05 = 4.357142... mm. Tolerance 1e-12 relative: rounding only.
    g_mag = magnetic_gap(1 * MM, sleeve=0.5 * MM, magnet_thickness=3 * MM, recoil_permeability=1.05)
    assert g_mag == pytest.approx((1 + 0.5 + 3 / 1.05) * MM, rel=1e-12)
    # iron facing iron: the magnetic gap is the mechanical one (exact)
    assert magnetic_gap(0.45 * MM) == 0.45 * MM
    with pytest.raises(ValueError, match="recoil permeability"):
        magnetic_gap(1 * MM, magnet_thickness=3 * MM, recoil_permeability=0.0)
    with pytest.raises(ValueError, match="sleeve"):
        magnetic_gap(1 * MM, sleeve=-0.1 * MM)


def test_effective_gap_slots_on_both_sides() -> None:
    # [calc] kc = kc_s kc_r [mem: Pyrhonen ch. 3]; 1.1447 * 1.05 * 0.5 mm.
    # Tolerance 1e-12 relative: rounding only.
    kc_s = carter_coefficient(10 * MM, 2.5 * MM, 0.5 * MM)
    assert effective_gap(0.5 * MM, kc_s, 1.05) == pytest.approx(kc_s * 1.05 * 0.5 * MM, rel=1e-12)
    assert effective_gap(0.5 * MM, kc_s) == pytest.approx(kc_s * 0.5 * MM, rel=1e-12)
    with pytest.raises(ValueError, match="rotor Carter coefficient"):
        effective_gap(0.5 * MM, kc_s, 0.9)


# --- independent check: Laplace's equation over one slot pitch (scikit-fem) ---------------


def _graded(a: float, b: float, n: int, dense_at: float, ratio: float = 1.25) -> np.ndarray:
    """n + 1 nodes on [a, b], geometrically graded towards the end ``dense_at``."""
    w = (ratio ** np.arange(n + 1) - 1) / (ratio**n - 1)
    return a + (b - a) * w if dense_at == a else b - (b - a) * w[::-1]


def _carter_by_fem(ratio: float, tooth: float = 12.0, depth: float | None = None) -> float:
    """kc from the magnetic scalar potential over half a slot pitch (gap g = 1).

    Symmetry planes through the slot centre (x = 0) and the tooth centre (x = tau/2) are
    natural (zero-flux) boundaries, exact for a periodic row of slots. The smooth iron at
    y = g is at potential 1; the tooth top, slot walls and slot bottom at 0.

    Carter's closed form holds for an infinitely deep slot with teeth wide against the gap.
    The field in a slot of width b0 decays as exp(-pi y / b0), so a depth of 2 b0 + g leaves
    under 0.2 % of the mouth field at the bottom; a tooth of 12 g lets the fringe of each
    slot edge (decay length g / pi) die out before the next slot.
    """
    g = 1.0
    b0 = ratio * g
    tau = b0 + tooth * g
    d = 2 * b0 + g if depth is None else depth
    edge = b0 / 2
    # P2 elements on a tensor mesh graded towards the slot corner (edge, 0), where the
    # potential has its r^(2/3) singularity
    x = np.concatenate([_graded(0, edge, 24, edge), _graded(edge, tau / 2, 24, edge)[1:]])
    y = np.concatenate([_graded(-d, 0, 24, 0), _graded(0, g, 24, 0)[1:]])
    mesh = MeshTri.init_tensor(x, y)
    centre = mesh.p[:, mesh.t].mean(axis=1)
    mesh = mesh.remove_elements(np.nonzero((centre[0] > edge) & (centre[1] < 0))[0])
    basis = Basis(mesh, ElementTriP2())
    stiffness = asm(laplace, basis)
    smooth = basis.get_dofs(lambda p: np.isclose(p[1], g)).all()
    slotted = basis.get_dofs(
        lambda p: np.isclose(p[1], -d) | ((p[1] < 1e-12) & (p[0] > edge - 1e-12))
    ).all()
    psi = np.zeros(basis.N)
    psi[smooth] = 1.0
    psi = solve(*condense(stiffness, np.zeros(basis.N), x=psi, D=np.union1d(smooth, slotted)))
    # with unit potential difference, the field energy equals the permeance (per mu0, per
    # unit length); the smooth half pitch has permeance (tau/2)/g
    permeance = psi @ stiffness @ psi
    return (tau / 2 / g) / permeance


@pytest.mark.parametrize("ratio", [1.0, 2.0, 3.0, 4.0, 6.0, 8.0])
def test_carter_matches_field_solution(ratio: float) -> None:
    # [calc] independent: scikit-fem solution of Laplace's equation (general-purpose FE
    # library from PyPI), geometry as in _carter_by_fem.
    tau = ratio + 12.0
    kc_fem = _carter_by_fem(ratio)
    kc = carter_coefficient(tau, ratio, 1.0)
    # Tolerance 1 % on kc, as specified for the gate.
    assert kc_fem == pytest.approx(kc, rel=0.01)
    # kc - 1 is only about 1 % at b0/g = 1, so also compare the slot's lost width gamma,
    # the whole slotting effect. Tolerance 0.1 %: the FE energy converges from above; at
    # this mesh it is within 0.01 % of the converged value (a finer mesh moves it < 0.01 %).
    gamma_fem = tau * (1 - 1 / kc_fem)
    assert gamma_fem == pytest.approx(carter_gamma(ratio, 1.0), rel=1e-3)
    # and the field solution tells the exact form from the approximation where they differ
    # (9 % at b0/g = 1, 2 % at 2), so the check has teeth
    if ratio <= 2.0:
        assert abs(gamma_fem / carter_gamma_approx(ratio, 1.0) - 1) > 0.01


def test_field_solution_is_deep_enough() -> None:
    # [calc] the slot-depth assumption of the closed form: doubling the modelled depth at the
    # widest opening changes kc by < 0.01 % (tolerance: well inside the 0.1 % above)
    assert _carter_by_fem(8.0, depth=34.0) == pytest.approx(_carter_by_fem(8.0), rel=1e-4)
