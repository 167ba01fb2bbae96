"""Winding layouts, balance and winding factors against published values and closed forms."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from emgate.physics.star_of_slots import parallel_path_counts, star_of_slots
from emgate.physics.winding import WindingError, balance, feasibility, series_turns_per_phase
from emgate.physics.winding_factors import winding_factor_closed_form, winding_factors

# The tabulated winding factors are quoted to 4 decimals: half a unit in the last place.
TABLE_TOL = 5e-5
# Two exact expressions of the same sum differ by rounding only (~1e-15 per term).
EXACT_TOL = 1e-12


def kw(slots: int, pole_pairs: int, layers: int, pitch: int, order: int = 1) -> float:
    """Phase A winding factor of a generated 3-phase winding at electrical order ``order``."""
    layout = star_of_slots(slots, pole_pairs, 3, layers, pitch)
    return float(winding_factors(layout[0], np.array([order * pole_pairs]))[0])


def first_layout(slots: int, pole_pairs: int, phases: int, layers: int) -> np.ndarray | None:
    """The generated layout with the pitch nearest the pole pitch that builds, or None."""
    pole_pitch = slots / (2 * pole_pairs)
    for y in sorted(range(1, slots), key=lambda y: (abs(y - pole_pitch), y)):
        try:
            return star_of_slots(slots, pole_pairs, phases, layers, y)
        except WindingError:
            continue
    return None


# --- integral-slot windings, 60 degree belts ------------------------------------------------

# (slots, pole pairs, coil pitch in slots, kw1): q = Q/(2 p m).
INTEGRAL_SLOT = [
    (6, 1, 3, 1.0),  # q=1 full pitch  [calc, agrees with mem: Pyrhonen, Design of Rot. El. Mach.]
    (12, 2, 3, 1.0),  # q=1 full pitch, 4 poles  [calc, same source]
    (12, 1, 6, 0.9659),  # q=2 full pitch  [calc, agrees with mem: Pyrhonen]
    (24, 2, 5, 0.9330),  # q=2, 5/6 pitch  [calc, agrees with mem: Pyrhonen]
    (18, 1, 9, 0.9598),  # q=3 full pitch  [calc, agrees with mem: Pyrhonen]
    (36, 2, 8, 0.9452),  # q=3, 8/9 pitch  [calc, agrees with mem: Pyrhonen]
    (24, 1, 12, 0.9577),  # q=4 full pitch  [calc, agrees with mem: Pyrhonen]
    (192, 8, 12, 0.9577),  # q=4 full pitch, 16 poles, 192 slots  [calc, same source]
    (198, 11, 9, 0.9598),  # q=3 full pitch, 22 poles, 198 slots  [calc, same source]
]


@pytest.mark.parametrize(("slots", "pole_pairs", "pitch", "expected"), INTEGRAL_SLOT)
def test_integral_slot_winding_factor(
    slots: int, pole_pairs: int, pitch: int, expected: float
) -> None:
    assert kw(slots, pole_pairs, 2, pitch) == pytest.approx(expected, abs=TABLE_TOL)


def test_short_pitch_5_6_suppresses_5th_and_7th() -> None:
    # q=2, 5/6 pitch: kw5 = kw7 = 0.0670  [calc, agrees with mem: Pyrhonen]
    assert kw(12, 1, 2, 5, order=5) == pytest.approx(0.0670, abs=TABLE_TOL)
    assert kw(12, 1, 2, 5, order=7) == pytest.approx(0.0670, abs=TABLE_TOL)


@pytest.mark.parametrize("q", [1, 2, 3, 4])
def test_slot_harmonics_have_the_fundamental_winding_factor(q: int) -> None:
    # orders 2 m q k +- 1 have |kw| = kw1  [mem: Fitzgerald and Kingsley, Electric Machinery]
    slots, p = 6 * q * 2, 2
    pitch = 3 * q - 1 if q > 1 else 3  # short pitch where there is one: kp repeats too
    layout = star_of_slots(slots, p, 3, 2, pitch)
    orders = np.array([1, 6 * q - 1, 6 * q + 1, 12 * q - 1, 12 * q + 1]) * p
    kws = winding_factors(layout[0], orders)
    np.testing.assert_allclose(kws[1:], kws[0], rtol=EXACT_TOL)  # rounding only


def test_infinite_q_limit() -> None:
    # q -> infinity: kd -> 3/pi = 0.9549  [calc, agrees with mem: Pyrhonen]. At q = 30 the
    # excess is (3/pi)(pi/6q)^2/6 ~ 5e-5 [calc, series of sin], so 1e-4 and from above.
    value = kw(180, 1, 2, 90)
    assert 3 / math.pi < value < 3 / math.pi + 1e-4


def test_general_formula_matches_closed_form_integral_slot() -> None:
    # kd kp = sin(v pi/6)/(q sin(v pi/6q)) sin(v y/tau_p pi/2)  [mem: Pyrhonen]; the general
    # phasor sum [pub: Skaar, Kroevel, Nilssen, ICEM 2006] must give its magnitude at every odd
    # order. Even orders: the closed form assumes half-wave symmetry, the layout has none of them.
    odd = np.arange(1, 50, 2)
    for q in range(1, 7):
        for p in (1, 3):
            slots, pole_pitch = 6 * q * p, 3 * q
            # pitches with no same-phase sides cancelling in a slot: q .. 2 tau_p - q
            for y in range(q, 2 * pole_pitch - q + 1):
                layout = star_of_slots(slots, p, 3, 2, y)
                general = winding_factors(layout[0], odd * p)
                closed = [abs(winding_factor_closed_form(q, y / pole_pitch, int(v))) for v in odd]
                np.testing.assert_allclose(general, closed, rtol=0, atol=EXACT_TOL)
            # single layer: always full pitch in effect, kw = kd
            layout = star_of_slots(slots, p, 3, 1, pole_pitch)
            closed = [abs(winding_factor_closed_form(q, 1.0, int(v))) for v in odd]
            np.testing.assert_allclose(
                winding_factors(layout[0], odd * p), closed, rtol=0, atol=EXACT_TOL
            )


def test_integral_slot_phase_has_no_even_orders() -> None:
    # go and return belts a pole pitch apart: even orders cancel  [mem: Fitzgerald and Kingsley]
    layout = star_of_slots(36, 2, 3, 2, 7)
    assert np.all(winding_factors(layout, np.arange(2, 200, 2) * 2) < EXACT_TOL)


# --- tooth-coil (fractional-slot concentrated) windings --------------------------------------

TOOTH_COIL = [
    # (slots, pole pairs, layers, kw1)  [calc; agree with mem: El-Refaie, IEEE TIE 57(1), 2010]
    (12, 5, 2, 0.9330),  # 12 slots / 10 poles, double layer
    (9, 4, 2, 0.9452),  # 9 / 8, double layer
    (12, 4, 2, 0.8660),  # 12 / 8, double layer
    (6, 2, 2, 0.8660),  # 6 / 4, double layer
    (12, 5, 1, 0.9659),  # 12 / 10, single layer
]


@pytest.mark.parametrize(("slots", "pole_pairs", "layers", "expected"), TOOTH_COIL)
def test_tooth_coil_winding_factor(
    slots: int, pole_pairs: int, layers: int, expected: float
) -> None:
    assert kw(slots, pole_pairs, layers, 1) == pytest.approx(expected, abs=TABLE_TOL)
    assert balance(star_of_slots(slots, pole_pairs, 3, layers, 1), pole_pairs) == []


@pytest.mark.parametrize(("slots", "pole_pairs"), [(12, 5), (9, 4), (12, 4), (6, 2), (24, 11)])
def test_tooth_coil_closed_form_numerator_of_q(slots: int, pole_pairs: int) -> None:
    # [calc] q = z/n: kd_v = sin(v pi/6) / (z sin(v pi/6z)); checked at odd orders v
    q = slots / (6 * pole_pairs)
    pitch_ratio = 2 * pole_pairs / slots  # y = 1
    odd = np.arange(1, 40, 2)
    layout = star_of_slots(slots, pole_pairs, 3, 2, 1)
    closed = [abs(winding_factor_closed_form(q, pitch_ratio, int(v))) for v in odd]
    np.testing.assert_allclose(
        winding_factors(layout[0], odd * pole_pairs), closed, rtol=0, atol=EXACT_TOL
    )


# --- feasibility --------------------------------------------------------------


@pytest.mark.parametrize(
    ("slots", "pole_pairs", "phases", "layers"),
    # each meets Q/(m t) and, single layer, Q/(2 m t)  [mem: Pyrhonen]
    [
        (36, 2, 3, 2),
        (36, 2, 3, 1),
        (12, 5, 3, 1),
        (12, 5, 3, 2),
        (9, 4, 3, 2),
        (12, 4, 3, 2),
        (30, 2, 5, 2),
        (2, 1, 1, 1),
    ],
)
def test_feasible(slots: int, pole_pairs: int, phases: int, layers: int) -> None:
    # Q/(m t) integral, t = gcd(Q, p); single layer also Q/(2 m t)  [mem: Pyrhonen]
    assert feasibility(slots, pole_pairs, phases, layers) is None


@pytest.mark.parametrize(
    ("slots", "pole_pairs", "phases", "layers", "why"),
    [
        (9, 4, 3, 1, "Q/(2 m t)"),  # 9/6 not whole  [mem: Pyrhonen]
        (12, 4, 3, 1, "Q/(2 m t)"),  # t = 4: 12/24  [mem: Pyrhonen]
        (6, 2, 3, 1, "Q/(2 m t)"),  # t = 2: 6/12  [mem: Pyrhonen]
        (10, 4, 3, 2, "Q/(m t)"),  # t = 2: 10/6  [mem: Pyrhonen]
        (12, 3, 3, 2, "Q/(m t)"),  # t = 3: 12/9  [mem: Pyrhonen]
        (6, 3, 3, 2, "Q/(m t)"),  # one slot per pole: t = 3, 6/9  [mem: Pyrhonen]
        (2, 1, 3, 2, "Q < m"),  # common practice, no source
        (12, 1, 3, 3, "layers"),  # common practice, no source
        (12, 1, 2, 2, "antiphase"),  # even m with 2 pi/m displacement  [calc]
        (0, 1, 3, 2, "slots"),  # common practice, no source
    ],
)
def test_infeasible(slots: int, pole_pairs: int, phases: int, layers: int, why: str) -> None:
    reason = feasibility(slots, pole_pairs, phases, layers)
    assert reason is not None and why in reason
    with pytest.raises(WindingError, match=r"."):
        star_of_slots(slots, pole_pairs, phases, layers, 1)


def test_feasibility_conditions_and_generator_agree_over_a_range() -> None:
    # The integrality conditions  [mem: Pyrhonen], for m = 3; wherever they hold a balanced
    # layout must come out of the star of slots, wherever they fail none may.
    for slots in range(3, 61):
        for p in range(1, 13):
            t = math.gcd(slots, p)
            for layers in (1, 2):
                expected = slots % (3 * t) == 0 and (layers == 2 or slots % (6 * t) == 0)
                assert (feasibility(slots, p, 3, layers) is None) == expected, (slots, p, layers)
                if expected:
                    layout = first_layout(slots, p, 3, layers)
                    assert layout is not None, (slots, p, layers)
                    assert balance(layout, p) == [], (slots, p, layers)
                    sides = np.abs(layout).sum()
                    assert sides == slots * layers  # every slot filled  [calc]


@pytest.mark.parametrize(("slots", "pole_pairs", "phases"), [(30, 2, 5), (20, 3, 5), (28, 2, 7)])
def test_five_and_seven_phase_windings_balance(slots: int, pole_pairs: int, phases: int) -> None:
    # balanced m-phase: phasors equal, 2 pi/m apart  [mem: Pyrhonen]
    layout = first_layout(slots, pole_pairs, phases, 2)
    assert layout is not None and balance(layout, pole_pairs) == []


def test_single_layer_pitch_that_cannot_pair_is_refused() -> None:
    # 12 slots, coil span 4: s -> s+4 cycles have 3 slots, no pairing exists  [calc]
    with pytest.raises(WindingError, match="usable pitches"):
        star_of_slots(12, 1, 3, 1, 4)
    # 12/10 single layer with span 2: the belts do not alternate at two slots  [calc]
    with pytest.raises(WindingError, match="cannot be joined"):
        star_of_slots(12, 5, 3, 1, 2)


def test_double_layer_pitch_that_cancels_is_refused() -> None:
    # q = 3, span 1: both layers of a slot in the same belt, opposite signs  [calc]
    with pytest.raises(WindingError, match="cancel"):
        star_of_slots(36, 2, 3, 2, 1)


# --- balance of hand-made layouts ---------------------------------------------------------------


# 6 slots, 2 poles, single layer, q = 1, written out by hand from the conventions: phase A go
# in slot 0 and return a pole pitch on; phase k a further 2 pi k / 3 electrical (2k slots) on.
HAND_Q1 = np.array(
    [
        [1, 0, 0, -1, 0, 0],
        [0, 0, 1, 0, 0, -1],
        [0, -1, 0, 0, 1, 0],
    ]
)


def test_hand_made_layout_is_balanced_and_generated() -> None:
    # [calc] the phase-belt convention of the module docstring
    assert balance(HAND_Q1, 1) == []
    np.testing.assert_array_equal(star_of_slots(6, 1, 3, 1, 3), HAND_Q1)


def test_balance_detects_unequal_phases() -> None:
    layout = HAND_Q1.copy()
    layout[2] *= 2  # phase C with twice the coils
    problems = balance(layout, 1)
    assert any("differ" in msg for msg in problems)
    assert any("phase C: working-order phasor" in msg for msg in problems)


def test_balance_detects_an_open_coil() -> None:
    layout = HAND_Q1.copy()
    layout[1, 5] = 1  # B's return side reversed
    assert any("do not cancel" in msg for msg in balance(layout, 1))


def test_balance_detects_reversed_sequence_and_shifted_phase() -> None:
    # [calc] B and C swapped: C sits at 240 deg where B (120 deg) belongs
    assert any("expected 120" in msg for msg in balance(HAND_Q1[[0, 2, 1]], 1))
    shifted = HAND_Q1.copy()
    shifted[1] = np.roll(HAND_Q1[1], 1)  # [calc] B one slot (60 deg) on: 120 + 60 = 180 deg
    assert any("phase B is displaced 180 deg" in msg for msg in balance(shifted, 1))
    # [calc] the same fault in a generated 18-slot winding: 120 + 20 = 140 deg
    layout = star_of_slots(18, 1, 3, 2, 8)
    layout[1] = np.roll(layout[1], 1)
    assert any("phase B is displaced 140 deg" in msg for msg in balance(layout, 1))


def test_balance_of_one_full_pitch_coil_single_phase() -> None:
    # single phase, one coil: closed, nothing to compare  [calc]
    assert balance(np.array([[1, -1]]), 1) == []


# --- turns --------------------------------------------------------------------


def test_series_turns_per_phase() -> None:
    # N_ph = (Q layers / 2) N_c / (m a)  [calc, definition]
    assert series_turns_per_phase(36, 2, 3, 10, 1) == 120.0
    assert series_turns_per_phase(36, 2, 3, 10, 2) == 60.0
    assert series_turns_per_phase(36, 1, 3, 10, 1) == 60.0
    with pytest.raises(WindingError, match="parallel"):
        series_turns_per_phase(36, 2, 3, 10, 5)


# --- properties ---------------------------------------------------------------


@settings(max_examples=60, deadline=None)
@given(
    st.lists(st.integers(-3, 3), min_size=1, max_size=60).filter(any),
    st.lists(st.integers(-2000, 2000), min_size=1, max_size=20),
)
def test_winding_factors_lie_in_unit_interval(row: list[int], orders: list[int]) -> None:
    # |sum c e^{j..}| <= sum |c| (triangle inequality)  [calc]; 1e-12 allows for rounding
    kws = winding_factors(np.array(row), np.array(orders))
    assert np.all(kws >= 0.0) and np.all(kws <= 1.0 + EXACT_TOL)


@settings(max_examples=30, deadline=None)
@given(st.integers(3, 48), st.integers(1, 8), st.sampled_from([1, 2]))
def test_generated_phases_share_every_winding_factor(slots: int, p: int, layers: int) -> None:
    # a symmetric winding's phases are rotated copies: equal |kw| at every order  [mem: Pyrhonen]
    if feasibility(slots, p, 3, layers) is not None:
        with pytest.raises(WindingError):
            star_of_slots(slots, p, 3, layers, 1)
        return
    layout = first_layout(slots, p, 3, layers)
    assert layout is not None
    kws = winding_factors(layout, np.arange(0, 3 * slots))
    np.testing.assert_allclose(kws, np.broadcast_to(kws[0], kws.shape), rtol=0, atol=1e-9)


# --- parallel paths --------------------------------------------------------------------------


def _divisors(n: int) -> list[int]:
    return [a for a in range(1, n + 1) if n % a == 0]


@pytest.mark.parametrize(("q", "p"), [(1, 1), (2, 2), (3, 2), (2, 3), (4, 4)])
def test_integral_slot_parallel_paths(q: int, p: int) -> None:
    # [mem: Pyrhonen, Jokinen, Hrabovcova] integral-slot windings: any divisor of 2p parallel
    # paths for a double layer, of p for a single layer (all poles carry equal EMFs).
    slots = 2 * p * 3 * q
    pitch = 3 * q  # full pitch
    assert parallel_path_counts(slots, p, 3, 2, pitch) == _divisors(2 * p)
    assert parallel_path_counts(slots, p, 3, 1, pitch) == _divisors(p)


@pytest.mark.parametrize(
    ("slots", "p", "layers", "expected"),
    [
        (9, 4, 2, [1]),  # Q/t = 9 odd: no two coils of a phase share a phasor [calc]
        (12, 5, 2, [1, 2]),  # coils on opposite teeth pair up [calc: star of slots]
        (12, 5, 1, [1, 2]),
        (24, 5, 1, [1, 2]),
    ],
)
def test_tooth_coil_parallel_paths(slots: int, p: int, layers: int, expected: list[int]) -> None:
    pitch = 1 if layers == 2 or slots == 12 else 2
    assert parallel_path_counts(slots, p, 3, layers, pitch) == expected
