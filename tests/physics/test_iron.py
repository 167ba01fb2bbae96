"""Iron flux densities and magnetic voltages against closed forms, a published fit and scipy."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.integrate import quad
from scipy.optimize import brentq

from conftest import linear_curve, m350_50a_curve
from emgate.physics.bh import h_from_b, mean_field_strength, mean_field_strength_sine
from emgate.physics.constants import MU0
from emgate.physics.iron import (
    apparent_tooth_flux_density,
    real_tooth_flux_density,
    slot_flux_sharing_factor,
    solve_increasing,
    tooth_magnetic_voltage,
    yoke_flux_density,
    yoke_magnetic_voltage,
)

# Bounded, untimed property runs: keeps the suite at a few seconds and never fails on time.
PROPERTY = settings(max_examples=40, deadline=None)


M350 = m350_50a_curve()

# Tooth check [calc, method mem: Pyrhonen]: tau_s 11.5 mm, b_t 6 mm, k_Fe 0.97, l = l_Fe.
TAU_S, B_T, K_FE, LENGTH = 11.5e-3, 6e-3, 0.97, 0.14
TOOTH = (TAU_S, B_T, LENGTH, LENGTH, K_FE)


def test_apparent_tooth_flux_density_reference_check() -> None:
    # [calc] B_g tau_s l / (k_Fe l_Fe b_t) [mem: Pyrhonen]: B_g 0.75 T -> 1.482 T apparent.
    # Tolerance 5e-4 T: the check value is rounded to three decimals.
    assert apparent_tooth_flux_density(0.75, *TOOTH) == pytest.approx(1.482, abs=5e-4)


def test_slot_flux_sharing_factor_closed_form() -> None:
    # [calc] k_s = (tau_s l - k_Fe l_Fe b_t) / (k_Fe l_Fe b_t) = (11.5 - 5.82) / 5.82.
    # Tolerance 1e-12: the same arithmetic, only rounding differs.
    assert slot_flux_sharing_factor(*TOOTH) == pytest.approx(5.68 / 5.82, rel=1e-12)


def test_real_equals_apparent_without_slot_sharing() -> None:
    # [calc] k_s = 0 reduces B_app = B_real + mu0 k_s H to B_real = B_app: exact.
    assert real_tooth_flux_density(1.9, 0.0, M350) == 1.9


def test_real_tooth_flux_density_of_an_air_tooth_is_the_gap_flux_density() -> None:
    # [calc] with mu_r = 1 the tooth and the slot beside it are one uniform section, so the
    # "tooth" carries the gap flux density: B_real = B_app / (1 + k_s) = B_g.
    # Tolerance 1e-10 relative: the solver converges to 1e-13 T.
    b_app = apparent_tooth_flux_density(0.75, *TOOTH)
    b_real = real_tooth_flux_density(b_app, slot_flux_sharing_factor(*TOOTH), linear_curve(1.0))
    assert b_real == pytest.approx(0.75, rel=1e-10)


@pytest.mark.parametrize("b_app", [0.5, 1.482, 1.9, 2.1, 2.5, 3.0])
def test_real_tooth_flux_density_matches_brentq(b_app: float) -> None:
    # [calc] external check: scipy.optimize.brentq on the same equation
    # B_app = B_real + mu0 k_s H(B_real), including apparent values past the table end (2.2 T).
    # Tolerance 1e-11 T: both solvers are asked for better than 1e-12 T.
    k_s = slot_flux_sharing_factor(*TOOTH)

    def residual(b: float) -> float:
        return b + MU0 * k_s * h_from_b(M350, b) - b_app

    expected = brentq(residual, 0.0, b_app, xtol=1e-14, rtol=4 * np.finfo(float).eps)
    assert real_tooth_flux_density(b_app, k_s, M350) == pytest.approx(expected, abs=1e-11)


def test_real_tooth_flux_density_beyond_the_table_end_closed_form() -> None:
    # [calc] past the last point H = h_end + (B - b_end) / mu0, so the equation is linear:
    # B_real = (B_app - mu0 k_s h_end + k_s b_end) / (1 + k_s).
    # Tolerance 1e-11 T: solver convergence.
    k_s, b_app = 1.5, 3.2
    b_end, h_end = M350.b[-1], M350.h[-1]
    expected = (b_app - MU0 * k_s * h_end + k_s * b_end) / (1.0 + k_s)
    assert expected > b_end  # the case is really past the table
    assert real_tooth_flux_density(b_app, k_s, M350) == pytest.approx(expected, abs=1e-11)


def test_real_tooth_flux_density_is_odd() -> None:
    # [calc] the B-H curve is odd, so is the solution. Tolerance: exact by construction.
    assert real_tooth_flux_density(-2.0, 0.9, M350) == -real_tooth_flux_density(2.0, 0.9, M350)


def test_real_tooth_rejects_negative_sharing() -> None:
    with pytest.raises(ValueError):
        real_tooth_flux_density(1.5, -0.1, M350)


@PROPERTY
@given(
    b_app=st.floats(0.0, 3.0),
    k_s=st.floats(0.0, 3.0),
)
def test_real_tooth_at_most_apparent_and_solves_the_equation(b_app: float, k_s: float) -> None:
    # [calc] H >= 0 for B >= 0, so B_real <= B_app; the residual must vanish.
    # Tolerance 1e-10 T on the residual: solver convergence plus rounding of mu0 k_s H.
    b_real = real_tooth_flux_density(b_app, k_s, M350)
    assert 0.0 <= b_real <= b_app
    assert b_real + MU0 * k_s * h_from_b(M350, b_real) == pytest.approx(b_app, abs=1e-10)


def test_tooth_magnetic_voltage_closed_form() -> None:
    # [calc] linear steel: V = B h_t / (mu0 mu_r); 1.5 T, 20 mm, mu_r 1000 -> 23.87 A.
    # Tolerance 1e-12 relative: one interpolation on a straight line.
    expected = 1.5 * 0.02 / (MU0 * 1000.0)
    assert tooth_magnetic_voltage(1.5, 0.02, linear_curve(1000.0)) == pytest.approx(
        expected, rel=1e-12
    )


def test_yoke_flux_density_closed_form() -> None:
    # [calc] B_y = Phi / (2 k_Fe l_Fe h_y): 10 mWb, 20 mm, 140 mm, 0.97 -> 1.8409 T.
    # Tolerance 1e-4 T: the check value is rounded to four decimals.
    assert yoke_flux_density(0.01, 0.02, 0.14, 0.97) == pytest.approx(1.8409, abs=1e-4)


@pytest.mark.parametrize(
    ("ramp", "mean_over_peak"),
    [
        (None, 2.0 / math.pi),  # [calc] mean of sin over a quarter period
        (0.0, 1.0),  # [calc] uniform yoke
        (0.7, 1.0 - 0.7 / 2.0),  # [calc] linear ramp over 70 % of the path, flat after
        (1.0, 0.5),  # [calc] ramp over the whole path: triangle
    ],
)
def test_yoke_magnetic_voltage_linear_steel(ramp: float | None, mean_over_peak: float) -> None:
    # With a linear steel the voltage is path * mean(B)/(mu0 mu_r): closed forms above.
    # Tolerance 1e-10 relative: both distributions are integrated exactly but for rounding.
    b_peak, path, mu_r = 1.4, 0.12, 2000.0
    expected = path * mean_over_peak * b_peak / (MU0 * mu_r)
    got = yoke_magnetic_voltage(b_peak, path, linear_curve(mu_r), ramp)
    assert got == pytest.approx(expected, rel=1e-10)


@pytest.mark.parametrize("b_peak", [0.8, 1.4, 1.7, 2.0, 2.5])
@pytest.mark.parametrize("ramp", [None, 0.6])
def test_yoke_magnetic_voltage_matches_scipy_quad(b_peak: float, ramp: float | None) -> None:
    # [calc] external check: scipy.integrate.quad of H along the same distribution, with the
    # curve's kinks given as break points. Tolerance 1e-10 relative: both distributions are
    # integrated exactly on the piecewise-linear curve, and quad is exact on each piece but
    # for rounding (its error estimates are near 1e-14 here).
    path = 0.1
    kinks = M350.b[(M350.b > 0.0) & (M350.b < b_peak)] / b_peak
    if ramp is None:
        mean = quad(
            lambda t: h_from_b(M350, b_peak * math.sin(t)),
            0.0,
            math.pi / 2,
            points=np.arcsin(kinks),
            limit=1000,
        )[0] / (math.pi / 2)
    else:
        ramp_mean = quad(lambda u: h_from_b(M350, b_peak * u), 0.0, 1.0, points=kinks, limit=1000)[
            0
        ]
        mean = ramp * ramp_mean + (1.0 - ramp) * h_from_b(M350, b_peak)
    got = yoke_magnetic_voltage(b_peak, path, M350, ramp)
    assert got == pytest.approx(path * mean, rel=1e-10)


@pytest.mark.parametrize("b_end", [0.3, 1.45, 1.7, 2.2, 2.5, 4.0, -1.9])
def test_mean_field_strength_matches_scipy_quad(b_end: float) -> None:
    # [calc] external check: scipy.integrate.quad of H(B) from 0 to b_end over b_end, the
    # curve's kinks as break points, within the table, at its end (2.2 T) and beyond it.
    # Tolerance 1e-10 relative: both are exact for a piecewise-linear integrand but for
    # rounding (quad reports errors near 1e-14 here).
    x = abs(b_end)
    kinks = M350.b[(M350.b > 0.0) & (M350.b < x)]
    area = quad(lambda b: h_from_b(M350, b), 0.0, x, points=kinks, limit=1000)[0]
    expected = math.copysign(area / x, b_end)
    assert mean_field_strength(M350, b_end) == pytest.approx(expected, rel=1e-10)
    assert mean_field_strength(M350, 0.0) == 0.0


def test_yoke_magnetic_voltage_rejects_bad_ramp() -> None:
    with pytest.raises(ValueError):
        yoke_magnetic_voltage(1.0, 0.1, M350, 1.5)


@pytest.mark.parametrize(
    ("func", "lo", "hi"),
    [
        (lambda x: x**3 + x - 3.0, 0.0, 2.0),
        (lambda x: math.tanh(50.0 * (x - 0.3)), -1.0, 5.0),  # steep: regula falsi stalls
        (lambda x: max(x - 1.0, 0.0) * 1e6 + x - 1.2, 0.0, 10.0),  # a kink, as on a B-H table
    ],
)
def test_solve_increasing_matches_brentq(func, lo: float, hi: float) -> None:
    # [calc] external check against scipy.optimize.brentq.
    # Tolerance 1e-11 absolute: both are asked for ~1e-12 on roots of order 1.
    expected = brentq(func, lo, hi, xtol=1e-14)
    assert solve_increasing(func, lo, hi) == pytest.approx(expected, abs=1e-11)


def test_solve_increasing_rejects_a_bracket_without_a_root() -> None:
    with pytest.raises(ValueError):
        solve_increasing(lambda x: x + 1.0, 0.0, 1.0)


@pytest.mark.parametrize(
    ("func", "lo", "hi", "most"),
    [
        # convex on the bracket: plain regula falsi keeps one end and creeps in from the other
        (lambda x: math.exp(x) - 2.0, 0.0, 5.0, 12),
        # the shape of a surface's rise x conductance(rise) = heat (invented coefficients;
        # the reference is brentq)
        (lambda x: x * (3.0 + 0.8 * x**0.25) - 400.0, 0.0, 400.0, 10),
    ],
)
def test_solve_increasing_closes_the_bracket_in_few_evaluations(func, lo, hi, most) -> None:
    # [calc] root checked against scipy.optimize.brentq (1e-11 absolute, as above); the
    # evaluation counts are what the Anderson-Bjorck scaling and the step to the root's
    # other side buy: the Illinois solver before them took 27 and 24 (measured).
    calls = []

    def counted(x: float) -> float:
        calls.append(x)
        return func(x)

    root = solve_increasing(counted, lo, hi)
    assert root == pytest.approx(brentq(func, lo, hi, xtol=1e-14), abs=1e-11)
    assert len(calls) <= most


def test_solve_increasing_always_halves_the_bracket_in_five_evaluations() -> None:
    # a triple root slows every interpolation to a crawl: the bisection after four stalled
    # steps must still halve the bracket at least every five evaluations, down to the
    # tolerance 1e-12 x max(|lo|, |hi|) ~ 1e-12 x pi from a width of 10
    calls = []

    def cube(x: float) -> float:
        calls.append(x)
        return (x - math.pi) ** 3

    root = solve_increasing(cube, 0.0, 10.0)
    assert abs(root - math.pi) < 1e-11
    assert len(calls) <= 2 + 5 * math.ceil(math.log2(10.0 / (1e-12 * math.pi)))


@pytest.mark.parametrize(("b_app", "k_s"), [(math.nan, 0.5), (math.inf, 0.5), (1.8, math.inf)])
def test_real_tooth_flux_density_refuses_non_finite_input(b_app: float, k_s: float) -> None:
    # the exact segment solve must refuse what the bracketed solve it replaced refused
    with pytest.raises(ValueError):
        real_tooth_flux_density(b_app, k_s, M350)


def test_solve_increasing_takes_the_ends_it_is_given() -> None:
    # [calc] the same root (scipy brentq, 1e-11 absolute as above) with two evaluations
    # fewer when f(lo) and f(hi) come with the bracket; given ends that do not bracket a
    # root are refused as computed ones are
    def func(x: float) -> float:
        return x**3 + x - 3.0

    counted: list[list[float]] = [[], []]
    for calls, ends in zip(counted, (None, (func(0.0), func(2.0))), strict=True):

        def f(x: float, calls: list[float] = calls) -> float:
            calls.append(x)
            return func(x)

        root = solve_increasing(f, 0.0, 2.0, ends=ends)
        assert root == pytest.approx(brentq(func, 0.0, 2.0, xtol=1e-14), abs=1e-11)
    assert len(counted[1]) == len(counted[0]) - 2
    with pytest.raises(ValueError):
        solve_increasing(func, 0.0, 2.0, ends=(1.0, 2.0))


def test_real_tooth_flux_density_of_arrays_is_the_scalar_solve_element_by_element() -> None:
    # [calc] the array path (the sweep's) solves each element by the scalar path's formulas:
    # equal to the scalar results within 2 ulp (numpy and Python may round an operation in
    # a different order of evaluation; the formulas are the same). Flux densities from zero
    # to past the table's end, both signs; sharing factors 0 (no slot flux), two of a sweep's.
    rng = np.random.default_rng(3)
    b_app = rng.uniform(-3.2, 3.2, 400)
    b_app[:3] = (0.0, M350.b[-1], -M350.b[-1])
    k_s = rng.choice([0.0, 0.41, 0.9759], 400)
    got = real_tooth_flux_density(b_app, k_s, M350)
    assert isinstance(got, np.ndarray)
    assert got.shape == b_app.shape
    expected = np.array(
        [real_tooth_flux_density(float(b), float(k), M350) for b, k in zip(b_app, k_s, strict=True)]
    )
    np.testing.assert_array_max_ulp(got, expected, maxulp=2)
    # one sharing factor for all (a stator's teeth in a sweep of the gap)
    one = real_tooth_flux_density(b_app, np.full(400, 0.41), M350)
    np.testing.assert_array_max_ulp(
        one, np.array([real_tooth_flux_density(float(b), 0.41, M350) for b in b_app]), maxulp=2
    )


@pytest.mark.parametrize(
    ("b_app", "k_s"), [(math.nan, 0.5), (math.inf, 0.5), (1.8, math.inf), (1.8, -0.1)]
)
def test_real_tooth_flux_density_of_arrays_refuses_what_the_scalar_refuses(
    b_app: float, k_s: float
) -> None:
    with pytest.raises(ValueError):
        real_tooth_flux_density(np.array([1.0, b_app]), np.array([0.5, k_s]), M350)


@pytest.mark.parametrize("b_peak", [0.03, 0.3, 1.45, 1.7, 2.2, 2.5, 4.0, -1.9])
def test_mean_field_strength_sine_matches_scipy_quad(b_peak: float) -> None:
    # [calc] external check: scipy.integrate.quad of H(b sin t) over [0, pi/2], the angles
    # of the curve's kinks as break points, within the table, at its end (2.2 T) and beyond.
    # Tolerance 1e-12 relative: both are exact on each piece of the curve but for rounding.
    x = abs(b_peak)
    kinks = np.arcsin(M350.b[(M350.b > 0.0) & (M350.b < x)] / x)
    area = quad(
        lambda t: h_from_b(M350, x * math.sin(t)),
        0.0,
        math.pi / 2,
        points=kinks,
        limit=1000,
        epsabs=0.0,
        epsrel=1e-13,
    )[0]
    expected = math.copysign(area / (math.pi / 2), b_peak)
    assert mean_field_strength_sine(M350, b_peak) == pytest.approx(expected, rel=1e-12)
    assert mean_field_strength_sine(M350, 0.0) == 0.0


def test_mean_field_strength_sine_of_an_array_is_the_scalar_mean_element_by_element() -> None:
    # [calc] the same formulas on arrays (the sweep's path); a sum in another order may
    # round differently: 1e-14 relative, well inside the 1e-9 the sweep promises.
    peaks = np.array([0.0, 0.2, 1.0, M350.b[4], 1.9, M350.b[-1], 3.0, -1.2])
    got = mean_field_strength_sine(M350, peaks)
    expected = [mean_field_strength_sine(M350, float(b)) for b in peaks]
    np.testing.assert_allclose(got, expected, rtol=1e-14, atol=0.0)


def test_mean_field_strength_sine_of_non_finite_peaks_is_not_finite() -> None:
    # a non-finite peak must not come out as a finite voltage (plausibility refuses it)
    for peaks in (np.array([math.nan, 1.0]), np.array([math.inf, 1.0]), np.array([-math.inf, 1.0])):
        got = mean_field_strength_sine(M350, peaks)
        assert not math.isfinite(got[0]) and math.isfinite(got[1])
        assert not math.isfinite(mean_field_strength_sine(M350, float(peaks[0])))
    assert mean_field_strength_sine(M350, math.inf) == math.inf
    assert mean_field_strength_sine(M350, np.array([-math.inf]))[0] == -math.inf


def test_real_tooth_flux_density_of_a_0d_array() -> None:
    got = real_tooth_flux_density(np.array(1.8), 0.5, M350)
    assert np.ndim(got) == 0
    assert float(got) == real_tooth_flux_density(1.8, 0.5, M350)
