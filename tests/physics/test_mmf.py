"""Staircase MMF, its spectrum and THD against closed forms and published check values."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.special import zeta

from emgate.physics.mmf import (
    balanced_currents,
    mmf_fundamental_peak,
    mmf_spectrum,
    mmf_staircase,
    mmf_thd,
    slot_ampere_conductors,
)
from emgate.physics.star_of_slots import star_of_slots
from emgate.physics.winding import (
    WindingError,
    feasibility,
    harmonic_phasors,
    series_turns_per_phase,
)
from emgate.physics.winding_factors import winding_factor_closed_form, winding_factors

# Exact results (Parseval, closed forms) differ by rounding only.
EXACT_TOL = 1e-12
# The hand-computed percentages are quoted to 2 decimals: half a unit in the last place.
PERCENT_TOL = 5e-5

SQUARE_WAVE = np.array([[1, -1]])  # one full-pitch coil, single phase, 2 poles


# --- THD ----------------------------------------------------------------------


def test_thd_square_wave() -> None:
    # sqrt(pi^2/8 - 1) = 48.34 %  [calc: Parseval on the staircase]
    assert mmf_thd(SQUARE_WAVE, 1) == pytest.approx(math.sqrt(math.pi**2 / 8 - 1), abs=EXACT_TOL)
    assert mmf_thd(SQUARE_WAVE, 1) == pytest.approx(0.4834, abs=PERCENT_TOL)
    # the same coil in a 24-slot stator is the same square wave  [calc]
    one_coil = np.zeros((1, 24), dtype=int)
    one_coil[0, [0, 12]] = [1, -1]
    assert mmf_thd(one_coil, 1) == pytest.approx(math.sqrt(math.pi**2 / 8 - 1), abs=EXACT_TOL)


@pytest.mark.parametrize(("slots", "pole_pairs", "layers"), [(6, 1, 2), (6, 1, 1), (12, 2, 2)])
def test_thd_three_phase_q1_full_pitch(slots: int, pole_pairs: int, layers: int) -> None:
    # sqrt(pi^2/9 - 1) = 31.08 %  [calc: Parseval on the staircase]
    layout = star_of_slots(slots, pole_pairs, 3, layers, 3)
    thd = mmf_thd(layout, pole_pairs)
    assert thd == pytest.approx(math.sqrt(math.pi**2 / 9 - 1), abs=EXACT_TOL)
    assert thd == pytest.approx(0.3108, abs=PERCENT_TOL)


def test_thd_three_phase_q2_full_pitch() -> None:
    # 16.86 %  [calc: Parseval on the staircase]
    assert mmf_thd(star_of_slots(12, 1, 3, 2, 6), 1) == pytest.approx(0.1686, abs=PERCENT_TOL)


def thd_from_series(q: int, pitch: int) -> float:
    """THD of an integral-slot 3-phase winding summed in closed form with Hurwitz zeta.

    F_v = F1 kw_v / (v kw1) over v = 6k +- 1  [mem: Fitzgerald and Kingsley, Electric
    Machinery]; kw_v = kd_v kp_v  [mem: Pyrhonen] repeats (up to sign) with period P = 12 q
    in v, so sum_v (kw_v / v)^2 = sum_r kw_r^2 zeta(2, r/P) / P^2 over residues r = +-1 mod 6.
    """
    period = 12 * q
    ratio = pitch / (3 * q)
    total = 0.0
    for r in range(1, period):
        if r % 6 in (1, 5):
            total += winding_factor_closed_form(q, ratio, r) ** 2 * zeta(2, r / period)
    total /= period**2
    return math.sqrt(total / winding_factor_closed_form(q, ratio, 1) ** 2 - 1.0)


@pytest.mark.parametrize(("q", "pitch"), [(1, 3), (2, 6), (2, 5), (3, 9), (3, 7), (4, 10)])
def test_thd_matches_the_harmonic_series(q: int, pitch: int) -> None:
    # the infinite series via scipy.special.zeta: exact, so rounding tolerance (1e-10, a few
    # dozen terms of ~1e-15 each, with margin)
    layout = star_of_slots(6 * q, 1, 3, 2, pitch)
    assert mmf_thd(layout, 1) == pytest.approx(thd_from_series(q, pitch), abs=1e-10)


def test_capped_thd_from_the_spectrum() -> None:
    # truncated at order 49: 47.30 % (square wave) and 30.02 % (3-phase q = 1)  [calc:
    # Fourier series of the staircase]
    for layout, expected in ((SQUARE_WAVE, 0.4730), (star_of_slots(6, 1, 3, 2, 3), 0.3002)):
        a = mmf_spectrum(layout, 1, balanced_currents(layout.shape[0], 1.0, 0.0), 49)
        capped = math.sqrt(np.sum(a[2:] ** 2)) / a[1]
        assert capped == pytest.approx(expected, abs=PERCENT_TOL)


# --- spectrum -----------------------------------------------------------------


@pytest.mark.parametrize(
    ("q", "pole_pairs", "pitch", "layers"),
    [(1, 1, 3, 2), (2, 2, 5, 2), (3, 1, 8, 2), (3, 2, 9, 1), (4, 3, 10, 2)],
)
def test_integral_slot_orders_are_6k_pm_1(q: int, pole_pairs: int, pitch: int, layers: int) -> None:
    # balanced 3-phase integral-slot: only v = 6k +- 1 of the fundamental  [mem: Fitzgerald and
    # Kingsley, Electric Machinery]. Others must vanish to rounding: 1e-9 of the fundamental.
    layout = star_of_slots(6 * q * pole_pairs, pole_pairs, 3, layers, pitch)
    a = mmf_spectrum(layout, 7, balanced_currents(3, 5.0, 0.4), 90 * pole_pairs)
    n = np.arange(a.size)
    allowed = (n % pole_pairs == 0) & np.isin((n // pole_pairs) % 6, [1, 5])
    assert np.all(a[~allowed] < 1e-9 * a[pole_pairs])
    assert a[5 * pole_pairs] > 1e-6 * a[pole_pairs]  # the 5th is really there


@pytest.mark.parametrize(("slots", "pole_pairs", "pitch"), [(36, 2, 7), (12, 5, 1), (30, 2, 5)])
def test_positive_sequence_field_moves_towards_increasing_angle(
    slots: int, pole_pairs: int, pitch: int
) -> None:
    # phase k lagging by 2 pi k/m in time and placed 2 pi k/m further on in space: the working
    # wave travels forward by dt/p mechanical  [mem: Fitzgerald and Kingsley]; rounding only
    layout = star_of_slots(slots, pole_pairs, 3, 2, pitch)
    dt = 0.3

    def crest(instant: float) -> float:
        ac = slot_ampere_conductors(layout, 1, balanced_currents(3, 1.0, instant))
        # exact coefficient of exp(j p theta) is X_-p / (2 pi j p); crest at -arg / p
        return -float(np.angle(harmonic_phasors(ac, -pole_pairs) / 1j)) / pole_pairs

    moved = (crest(dt) - crest(0.0)) % (2 * math.pi / pole_pairs)
    assert moved == pytest.approx(dt / pole_pairs, abs=EXACT_TOL)


def test_fundamental_check_value() -> None:
    # m=3, N_ph=100, kw1=0.933, I=10 A, p=2: F1 = 630.0 A [calc, formula mem: Fitzgerald and
    # Kingsley]; 1 decimal
    assert mmf_fundamental_peak(3, 100, 0.933, 10.0, 2) == pytest.approx(630.0, abs=0.05)


@pytest.mark.parametrize(
    ("slots", "pole_pairs", "pitch", "layers"),
    [(36, 2, 7, 2), (48, 2, 10, 2), (24, 2, 6, 1), (12, 5, 1, 2), (9, 4, 1, 2)],
)
def test_spectrum_working_order_matches_rotating_field_formula(
    slots: int, pole_pairs: int, pitch: int, layers: int
) -> None:
    # F1 = (sqrt(2) m / pi) kw1 N_ph I / p at any instant  [mem: Fitzgerald and Kingsley];
    # the staircase spectrum must agree to rounding (1e-12 relative)
    turns, current = 11, 6.5
    layout = star_of_slots(slots, pole_pairs, 3, layers, pitch)
    n_ph = series_turns_per_phase(slots, layers, 3, turns, 1)
    kw1 = float(winding_factors(layout[0], np.array([pole_pairs]))[0])
    f1 = mmf_fundamental_peak(3, n_ph, kw1, current, pole_pairs)
    for instant in (0.0, 0.9, 2.5):
        a = mmf_spectrum(layout, turns, balanced_currents(3, current, instant), pole_pairs)
        assert a[pole_pairs] == pytest.approx(f1, rel=EXACT_TOL)


def test_harmonic_amplitudes_follow_kw_over_v() -> None:
    # F_v = F1 kw_v / (v kw1)  [mem: Fitzgerald and Kingsley]; q = 3, 7/9 pitch, 4 poles
    p, layout = 2, star_of_slots(36, 2, 3, 2, 7)
    a = mmf_spectrum(layout, 1, balanced_currents(3, 1.0, 0.0), 40 * p)
    v = np.array([5, 7, 11, 13, 17, 19, 35, 37])
    kw = winding_factors(layout[0], np.concatenate(([p], v * p)))
    np.testing.assert_allclose(a[v * p], a[p] * kw[1:] / (v * kw[0]), rtol=1e-10)


# --- staircase ----------------------------------------------------------------


def test_staircase_of_one_coil_is_a_square_wave() -> None:
    # +-N I / 2 about the mean  [calc: the square wave of one coil]; exact in floating point
    theta, f = mmf_staircase(SQUARE_WAVE, 5, np.array([2.0]), samples_per_slot=4)
    assert theta.shape == f.shape == (8,)
    np.testing.assert_array_equal(f, [5.0] * 4 + [-5.0] * 4)


def test_staircase_steps_by_the_slot_current() -> None:
    # the MMF rises by the ampere-conductors at each slot centre  [calc, Ampere's law]
    layout = star_of_slots(24, 2, 3, 2, 5)
    currents = balanced_currents(3, 4.0, 0.3)
    _, f = mmf_staircase(layout, 3, currents, samples_per_slot=5)
    steps = np.diff(np.concatenate((f[-1:], f[::5])))
    np.testing.assert_allclose(steps, slot_ampere_conductors(layout, 3, currents), atol=1e-12)
    assert abs(f.mean()) < 1e-12 * np.abs(f).max()  # mean removed, to rounding


def test_open_coil_is_refused() -> None:
    with pytest.raises(ValueError, match="open"):
        mmf_staircase(np.array([[1, 0, 0]]), 1, np.array([1.0]))


def test_balanced_currents() -> None:
    # balanced set: sum zero, peak sqrt(2) I  [calc]; rounding tolerance
    i = balanced_currents(5, 3.0, 0.0)
    assert abs(i.sum()) < EXACT_TOL and i[0] == pytest.approx(3.0 * math.sqrt(2), rel=EXACT_TOL)


# --- properties ---------------------------------------------------------------

FEASIBLE = [
    (slots, p, m, layers)
    for m in (3, 5)
    for slots in range(3, 49)
    for p in range(1, 9)
    for layers in (1, 2)
    if feasibility(slots, p, m, layers) is None
]


@st.composite
def windings(draw: st.DrawFn) -> tuple[np.ndarray, int]:
    """A generated winding (layout, pole pairs) with one of the pitches it accepts."""
    slots, p, m, layers = draw(st.sampled_from(FEASIBLE))
    layouts = []
    for y in range(1, slots):
        try:
            layouts.append(star_of_slots(slots, p, m, layers, y))
        except WindingError:
            continue
    return draw(st.sampled_from(layouts)), p


@settings(max_examples=40, deadline=None)
@given(windings(), st.floats(0.0, 2 * math.pi), st.floats(0.0, 2 * math.pi))
def test_thd_does_not_depend_on_the_instant(winding: tuple[np.ndarray, int], t1: float, t2: float):
    # balanced symmetric winding: every harmonic is a wave of constant amplitude  [calc];
    # 1e-9 relative covers rounding in a ratio of sums of squares
    layout, p = winding
    assert mmf_thd(layout, p, t1) == pytest.approx(mmf_thd(layout, p, t2), rel=1e-9, abs=1e-12)


@settings(max_examples=40, deadline=None)
@given(windings(), st.data())
def test_parseval_against_the_harmonic_sum(winding: tuple[np.ndarray, int], data: st.DataObject):
    # mean(F^2) = sum_n A_n^2 / 2  [calc, Parseval]. A_n <= sum|C| / (pi n), so the orders past
    # N hold at most (sum|C|)^2 / (2 pi^2 N): the truncated sum lies in [mean - bound, mean].
    layout, p = winding
    m, slots = layout.shape
    currents = np.array(data.draw(st.lists(st.floats(-10, 10), min_size=m, max_size=m)))
    ac = slot_ampere_conductors(layout, 3, currents)
    _, f = mmf_staircase(layout, 3, currents, samples_per_slot=1)
    mean_square = float(np.mean(f**2))
    top = 40 * slots
    partial = float(np.sum(mmf_spectrum(layout, 3, currents, top) ** 2) / 2)
    bound = np.abs(ac).sum() ** 2 / (2 * math.pi**2 * top)
    slack = 1e-10 * max(mean_square, 1e-300)  # rounding of the two sums
    assert -slack <= mean_square - partial <= bound + slack
    # the same for THD with balanced currents: the capped value approaches mmf_thd from below
    a = mmf_spectrum(layout, 1, balanced_currents(m, 1.0, 0.0), top)
    thd = mmf_thd(layout, p)
    capped_sq = (np.sum(a[1:] ** 2) - a[p] ** 2) / a[p] ** 2
    ac1 = slot_ampere_conductors(layout, 1, balanced_currents(m, 1.0, 0.0))
    bound_sq = 2 * np.abs(ac1).sum() ** 2 / (2 * math.pi**2 * top) / a[p] ** 2
    assert -1e-9 <= thd**2 - capped_sq <= bound_sq + 1e-9
