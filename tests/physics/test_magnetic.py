"""Magnetic circuit of one pole against textbook examples, closed forms and scipy."""

from __future__ import annotations

import dataclasses
import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.optimize import brentq

from conftest import linear_curve, m350_50a_curve
from emgate.physics.bh import b_from_h
from emgate.physics.constants import MU0
from emgate.physics.iron import (
    apparent_tooth_flux_density,
    real_tooth_flux_density,
    slot_flux_sharing_factor,
    tooth_magnetic_voltage,
    yoke_flux_density,
    yoke_magnetic_voltage,
)
from emgate.physics.magnetic import PolePath, SalientPole, SurfaceMagnet, Teeth, Yoke
from emgate.physics.magnetic_induction import DEFAULT_VOLTAGE_DROP, induction_gap
from emgate.physics.magnetic_salient_field import salient_field_gap
from emgate.physics.magnetic_surface_pm import remanence_at, surface_pm_gap
from emgate.physics.series_circuit import Segment, segment_mmf, series_flux, series_mmf

# Bounded, untimed property runs: keeps the suite at a few seconds and never fails on time.
PROPERTY = settings(max_examples=25, deadline=None)

M350 = m350_50a_curve()
# Ideal iron: mu_r 1e10 makes the iron's share of the MMF ~1e-8 of the gap's.
IDEAL = linear_curve(1e10)


def make_path(effective_gap: float = 0.55e-3, rotor_teeth: Teeth | None = None) -> PolePath:
    # invented demo geometry of a small four-pole machine (not a check value)
    return PolePath(
        pole_pitch=0.1,
        stack_length=0.14,
        iron_length=0.14,
        stacking_factor=0.97,
        effective_gap=effective_gap,
        stator_teeth=Teeth(slot_pitch=11.5e-3, width=6e-3, height=0.02),
        stator_yoke=Yoke(height=0.02, path_length=0.12),
        rotor_yoke=Yoke(height=0.02, path_length=0.06),
        rotor_teeth=rotor_teeth,
    )


# --------------------------------------------------------------- generic series circuit

# [mem: Fitzgerald and Kingsley, Example 1.1] area 9 cm^2, g 0.05 cm, core 30 cm,
# mu_r 70000, N 500, B 1.0 T.
FK_AREA, FK_GAP, FK_CORE, FK_MU_R, FK_TURNS, FK_B = 9e-4, 5e-4, 0.30, 70000.0, 500, 1.0
FK_CORE_SEG = Segment(FK_CORE, FK_AREA, curve=linear_curve(FK_MU_R))
FK_GAP_SEG = Segment(FK_GAP, FK_AREA)


def test_fitzgerald_example_reluctances_mmf_and_current() -> None:
    flux = FK_B * FK_AREA
    # [mem: Fitzgerald and Kingsley, Example 1.1] R_core 3.79e3 A/Wb, R_gap 4.42e5 A/Wb.
    # Tolerance 2e-3 relative: the book gives three significant figures.
    assert segment_mmf(FK_CORE_SEG, flux) / flux == pytest.approx(3.79e3, rel=2e-3)
    assert segment_mmf(FK_GAP_SEG, flux) / flux == pytest.approx(4.42e5, rel=2e-3)
    mmf = series_mmf([FK_CORE_SEG, FK_GAP_SEG], flux)
    # [mem: same] F about 401 A, i = 0.80 A. Tolerances: "about 401" (1 A), 0.80 to 2 decimals.
    assert mmf == pytest.approx(401.0, abs=1.0)
    assert mmf / FK_TURNS == pytest.approx(0.80, abs=0.005)


def test_fitzgerald_example_solved_for_the_flux() -> None:
    # [mem: Fitzgerald and Kingsley, Example 1.1] 500 turns at 0.80 A drive 1.0 T.
    # Tolerance 1 %: the current is given to two decimals (0.80 +- 0.005 is 0.6 %).
    flux = series_flux([FK_CORE_SEG, FK_GAP_SEG], FK_TURNS * 0.80)
    assert flux / FK_AREA == pytest.approx(FK_B, rel=0.01)


def test_series_flux_inverts_series_mmf_on_a_saturating_core() -> None:
    # [calc] series_flux is the inverse of series_mmf, also far into saturation.
    # Tolerance 1e-9 relative: the solver converges to 1e-12 of the bracket.
    segments = [Segment(FK_CORE, FK_AREA, curve=M350), Segment(FK_GAP, FK_AREA)]
    for b in (0.5, 1.5, 2.0, 2.6):
        mmf = series_mmf(segments, b * FK_AREA)
        assert series_flux(segments, mmf) == pytest.approx(b * FK_AREA, rel=1e-9)


def test_series_flux_without_an_air_gap() -> None:
    # [calc] a closed steel ring: B = B(H) with H = F / l. Tolerance 1e-9 relative (solver).
    ring = [Segment(0.5, 1e-4, curve=M350)]
    flux = series_flux(ring, 0.5 * 3000.0)
    expected = 1e-4 * float(b_from_h(M350, 3000.0))
    assert flux == pytest.approx(expected, rel=1e-9)


@pytest.mark.parametrize("curve", [linear_curve(3000.0), M350], ids=["mu_r 3000", "M350-50A"])
def test_rule_of_thumb_iron_changes_the_flux_by_a_few_percent(curve) -> None:
    # [cp] iron path 300 mm, gap 5 mm, mu_r several thousand: neglecting the
    # iron changes the flux by only a few percent. Taken here as 0 < change < 5 %, at the
    # MMF that drives 1 T through the gap alone (M350-50A is near its mu_r maximum there).
    area, mmf = 1e-3, 1.0 * 5e-3 / MU0
    gap_only = series_flux([Segment(5e-3, area)], mmf)
    with_iron = series_flux([Segment(5e-3, area), Segment(0.3, area, curve=curve)], mmf)
    change = 1.0 - with_iron / gap_only
    assert 0.0 < change < 0.05


# --------------------------------------------------------------- surface magnets

# [calc] B_g = Br l_m / (l_m + mu_rec kc g) [mem: Hendershot and Miller]: Br 1.2 T, l_m 3 mm,
# g 1 mm, kc 1.0, mu_rec 1.05 -> 0.8889 T.
BR, MU_REC, L_M, GAP = 1.2, 1.05, 3e-3, 1e-3
MAGNET = SurfaceMagnet(remanence=BR, recoil_permeability=MU_REC, thickness=L_M, arc_fraction=0.8)


def test_surface_pm_ideal_iron_reference_check() -> None:
    result = surface_pm_gap(make_path(GAP + L_M / MU_REC), MAGNET, IDEAL, IDEAL)
    # Tolerance 5e-5 T: the check value has four decimals.
    assert result.b_peak == pytest.approx(0.8889, abs=5e-5)
    # [calc] the closed form itself; tolerance 1e-7 relative (ideal iron's share ~1e-8).
    assert result.b_peak == pytest.approx(BR * L_M / (L_M + MU_REC * GAP), rel=1e-7)
    # [mem: Hendershot and Miller] H_m = (B_g - Br) / (mu0 mu_rec); tolerance 1e-7 relative.
    assert result.magnet_h == pytest.approx((result.b_peak - BR) / (MU0 * MU_REC), rel=1e-7)
    assert result.saturation_factor == pytest.approx(1.0, abs=1e-6)


def test_surface_pm_leakage_closed_form() -> None:
    # [calc] loop with B_m = k B_g and ideal iron: B_g = Br l_m / (k l_m + mu_rec kc g).
    # Tolerance 1e-7 relative: ideal iron's share of the MMF.
    k = 1.1
    result = surface_pm_gap(
        make_path(GAP + L_M / MU_REC), dataclasses.replace(MAGNET, leakage_factor=k), IDEAL, IDEAL
    )
    assert result.b_peak == pytest.approx(BR * L_M / (k * L_M + MU_REC * GAP), rel=1e-7)
    assert result.magnet_b == pytest.approx(k * result.b_peak, rel=1e-12)


def test_surface_pm_flux_and_fundamental_of_a_rectangular_wave() -> None:
    # [calc] rectangular gap flux over the arc fraction a: Phi = B a tau_p l and the Fourier
    # fundamental (4/pi) B sin(a pi/2). Tolerance 1e-12 relative: arithmetic only.
    path = make_path(GAP + L_M / MU_REC)
    result = surface_pm_gap(path, MAGNET, M350, M350)
    a = MAGNET.arc_fraction
    assert result.flux_per_pole == pytest.approx(
        result.b_peak * a * path.pole_pitch * path.stack_length, rel=1e-12
    )
    assert result.b_fundamental == pytest.approx(
        4.0 / math.pi * result.b_peak * math.sin(a * math.pi / 2.0), rel=1e-12
    )


def _rectangular_iron_mmf(
    path: PolePath, b_gap: float, arc: float, pole: SalientPole | None
) -> float:
    """The iron of one pole for a rectangular gap flux, written out from the iron formulas."""
    geometry = (11.5e-3, 6e-3, path.stack_length, path.iron_length, path.stacking_factor)
    b_tooth = real_tooth_flux_density(
        apparent_tooth_flux_density(b_gap, *geometry), slot_flux_sharing_factor(*geometry), M350
    )
    flux = b_gap * arc * path.pole_pitch * path.stack_length
    k = 1.0 if pole is None else pole.leakage_factor
    b_sy = yoke_flux_density(flux, 0.02, path.iron_length, path.stacking_factor)
    b_ry = yoke_flux_density(k * flux, 0.02, path.iron_length, path.stacking_factor)
    rim_ramp = arc if pole is None else pole.body_width / 0.06
    total = (
        tooth_magnetic_voltage(b_tooth, 0.02, M350)
        + yoke_magnetic_voltage(b_sy, 0.06, M350, arc)  # half of the 0.12 m stator yoke path
        + yoke_magnetic_voltage(b_ry, 0.03, M350, rim_ramp)  # half of the 0.06 m rotor path
    )
    if pole is not None:
        b_body = k * flux / (path.stacking_factor * path.iron_length * pole.body_width)
        total += tooth_magnetic_voltage(b_body, pole.body_height, M350)
    return total


def test_surface_pm_loop_matches_brentq() -> None:
    # [calc] external check: scipy.optimize.brentq on the loop H_m l_m + F_gap + F_iron = 0,
    # written out in the test from the iron formulas. Tolerance 1e-10 T: both solve to ~1e-12.
    path = make_path(GAP + L_M / MU_REC)

    def loop(b_gap: float) -> float:
        h_m = (b_gap - BR) / (MU0 * MU_REC)
        return h_m * L_M + b_gap * GAP / MU0 + _rectangular_iron_mmf(path, b_gap, 0.8, None)

    expected = brentq(loop, 0.0, BR, xtol=1e-14)
    result = surface_pm_gap(path, MAGNET, M350, M350)
    assert result.b_peak == pytest.approx(expected, abs=1e-10)
    # The saturating iron takes a visible share: below the ideal-iron 0.8889 T by > 1 %.
    assert result.b_peak < 0.99 * 0.8889
    # [calc] the loop closes at the working point; tolerance 1e-6 A (solver, ~1e-12 T).
    assert result.magnet_h * L_M + result.total_mmf == pytest.approx(0.0, abs=1e-6)


@PROPERTY
@given(gap=st.floats(0.3e-3, 3e-3), br=st.floats(0.4, 1.5))
def test_surface_pm_solve_finds_brentqs_root_whatever_the_saturation(gap: float, br: float) -> None:
    # [calc] external check: scipy.optimize.brentq on the same written-out loop, over gaps
    # and remanences from ideal-like iron to deep saturation: the solve's bracket (the
    # ideal-iron root from above) must hold everywhere. Tolerance 1e-11 relative: both
    # solve to ~1e-12.
    path = make_path(gap + L_M / MU_REC)
    magnet = dataclasses.replace(MAGNET, remanence=br)

    def loop(b_gap: float) -> float:
        h_m = (b_gap - br) / (MU0 * MU_REC)
        return h_m * L_M + b_gap * gap / MU0 + _rectangular_iron_mmf(path, b_gap, 0.8, None)

    expected = brentq(loop, 0.0, br, xtol=1e-15, rtol=1e-15)
    result = surface_pm_gap(path, magnet, M350, M350)
    assert result.b_peak == pytest.approx(expected, rel=1e-11)


def test_remanence_at_temperature() -> None:
    # [calc] Br(T) = Br20 (1 + alpha (T - T0)); alpha -0.12 %/K is typical of NdFeB
    # (from memory): 1.2 T at 120 degC -> 1.2 (1 - 0.12) = 1.056 T. Tolerance 1e-12 (arithmetic).
    assert remanence_at(1.2, 393.15, -0.0012) == pytest.approx(1.056, rel=1e-12)


@PROPERTY
@given(gap=st.floats(0.3e-3, 3e-3), ratio=st.floats(1.01, 3.0), br=st.floats(0.4, 1.4))
def test_surface_pm_gap_flux_density_falls_as_the_gap_grows(
    gap: float, ratio: float, br: float
) -> None:
    # [calc] every term of the loop but the magnet's grows with the gap, so B_g must fall.
    magnet = dataclasses.replace(MAGNET, remanence=br)
    narrow = surface_pm_gap(make_path(gap + L_M / MU_REC), magnet, M350, M350)
    wide = surface_pm_gap(make_path(gap * ratio + L_M / MU_REC), magnet, M350, M350)
    assert wide.b_peak < narrow.b_peak


@PROPERTY
@given(br=st.floats(1.0, 1.5), step=st.floats(0.01, 0.3))
def test_surface_pm_saturation_factor_grows_with_the_flux(br: float, step: float) -> None:
    # [calc] above the permeability maximum of the steel (~0.95 T for this M350-50A fit;
    # these teeth run above 1.2 T) H/B rises with B, so k_sat >= 1 rises with the flux.
    path = make_path(GAP + L_M / MU_REC)
    low = surface_pm_gap(path, dataclasses.replace(MAGNET, remanence=br), M350, M350)
    high = surface_pm_gap(path, dataclasses.replace(MAGNET, remanence=br + step), M350, M350)
    assert low.iron.stator_tooth_b > 1.0
    assert 1.0 <= low.saturation_factor < high.saturation_factor


# --------------------------------------------------------------- salient poles

POLE = SalientPole(shoe_width=0.07, body_width=0.04, body_height=0.04, leakage_factor=1.15)


def test_salient_ideal_iron_is_the_iron_free_gap() -> None:
    # [calc] iron-free gap: B = mu0 F / (kc g). Tolerance 1e-7 relative
    # (ideal iron's share ~1e-8).
    gap, field = 1.5e-3, 1500.0
    result = salient_field_gap(make_path(gap), POLE, IDEAL, IDEAL, field_mmf=field)
    assert result.b_peak == pytest.approx(MU0 * field / gap, rel=1e-7)
    # [calc] flat flux under the shoe: Phi = B b_p l. Tolerance 1e-12 (arithmetic).
    assert result.flux_per_pole == pytest.approx(result.b_peak * 0.07 * 0.14, rel=1e-12)


def test_salient_loop_matches_brentq_and_closes() -> None:
    # [calc] external check: brentq on F_f = F_gap + F_iron written out in the test.
    # Tolerance 1e-10 T: both solve to ~1e-12.
    gap, field = 1.5e-3, 2000.0
    path = make_path(gap)
    arc = POLE.shoe_width / path.pole_pitch

    def loop(b_gap: float) -> float:
        return b_gap * gap / MU0 + _rectangular_iron_mmf(path, b_gap, arc, POLE) - field

    expected = brentq(loop, 0.0, MU0 * field / gap, xtol=1e-14)
    result = salient_field_gap(path, POLE, M350, M350, field_mmf=field)
    assert result.b_peak == pytest.approx(expected, abs=1e-10)
    # Tolerance 1e-6 A: the loop closes to the solver's accuracy.
    assert result.total_mmf == pytest.approx(field, abs=1e-6)
    assert result.iron.pole_body_b == pytest.approx(
        POLE.leakage_factor * result.flux_per_pole / (0.97 * 0.14 * 0.04), rel=1e-12
    )


@PROPERTY
@given(gap=st.floats(0.5e-3, 4e-3), ratio=st.floats(1.01, 3.0), field=st.floats(200.0, 4000.0))
def test_salient_gap_flux_density_falls_as_the_gap_grows(
    gap: float, ratio: float, field: float
) -> None:
    # [calc] the same ampere-turns over a longer gap drive less flux.
    narrow = salient_field_gap(make_path(gap), POLE, M350, M350, field_mmf=field)
    wide = salient_field_gap(make_path(gap * ratio), POLE, M350, M350, field_mmf=field)
    assert wide.b_peak < narrow.b_peak


@PROPERTY
@given(field=st.floats(1200.0, 3000.0), step=st.floats(50.0, 1000.0))
def test_salient_saturation_factor_grows_with_the_flux(field: float, step: float) -> None:
    # [calc] as for the magnets: teeth above the permeability maximum, so k_sat rises.
    path = make_path(1.5e-3)
    low = salient_field_gap(path, POLE, M350, M350, field_mmf=field)
    high = salient_field_gap(path, POLE, M350, M350, field_mmf=field + step)
    assert low.iron.stator_tooth_b > 1.0
    assert 1.0 <= low.saturation_factor < high.saturation_factor


# --------------------------------------------------------------- induction machines

# invented demo rating (not a check value)
SUPPLY = {"phase_voltage": 230.0, "frequency": 50.0, "series_turns": 120.0, "winding_factor": 0.92}
ROTOR_TEETH = Teeth(slot_pitch=9e-3, width=4.5e-3, height=0.025)


def test_induction_flux_from_the_voltage_equation() -> None:
    result = induction_gap(make_path(rotor_teeth=ROTOR_TEETH), M350, M350, **SUPPLY)
    # [mem: Fitzgerald and Kingsley] E = 4.44 f N kw Phi, with 4.44 = sqrt(2) pi rounded
    # (4.443). Tolerance 1e-4 relative: the constant is given to four figures.
    assert result.emf == pytest.approx((1.0 - DEFAULT_VOLTAGE_DROP) * 230.0, rel=1e-12)
    assert result.flux_per_pole * 4.443 * 50.0 * 120.0 * 0.92 == pytest.approx(result.emf, rel=1e-4)
    # [calc] sinusoidal distribution: B_peak = (pi/2) Phi / (tau_p l). Tolerance 1e-12.
    b_avg = result.flux_per_pole / (0.1 * 0.14)
    assert result.b_peak == pytest.approx(math.pi / 2.0 * b_avg, rel=1e-12)
    assert result.b_fundamental == result.b_peak
    assert result.iron.rotor_tooth_mmf > 0.0
    # [calc] k_sat = (F_gap + F_teeth) / F_gap, teeth of both sides. Tolerance 1e-12.
    teeth = result.iron.stator_tooth_mmf + result.iron.rotor_tooth_mmf
    assert result.saturation_factor == pytest.approx(1.0 + teeth / result.gap_mmf, rel=1e-12)


def test_induction_ideal_iron_needs_only_the_gap_mmf() -> None:
    # [calc] iron-free gap, inverted: F = B kc g / mu0 and k_sat = 1.
    # Tolerance 1e-7 relative: ideal iron's share.
    gap = 0.55e-3
    result = induction_gap(make_path(gap, ROTOR_TEETH), IDEAL, IDEAL, **SUPPLY, voltage_drop=0.0)
    assert result.total_mmf == pytest.approx(result.b_peak * gap / MU0, rel=1e-7)
    assert result.saturation_factor == pytest.approx(1.0, abs=1e-7)


@PROPERTY
@given(gap=st.floats(0.2e-3, 2e-3), ratio=st.floats(1.01, 3.0))
def test_induction_gap_sets_the_magnetising_mmf_not_the_flux(gap: float, ratio: float) -> None:
    # [calc] the voltage fixes the flux: a longer gap leaves B unchanged and needs more
    # magnetising ampere-turns (the voltage-driven counterpart of "B falls with the gap").
    narrow = induction_gap(make_path(gap, ROTOR_TEETH), M350, M350, **SUPPLY)
    wide = induction_gap(make_path(gap * ratio, ROTOR_TEETH), M350, M350, **SUPPLY)
    assert wide.b_peak == narrow.b_peak
    assert wide.total_mmf > narrow.total_mmf


@PROPERTY
@given(voltage=st.floats(160.0, 260.0), step=st.floats(2.0, 40.0))
def test_induction_saturation_factor_grows_with_the_flux(voltage: float, step: float) -> None:
    # [calc] teeth above the permeability maximum of the steel, so k_sat >= 1 rises.
    path = make_path(rotor_teeth=ROTOR_TEETH)
    low = induction_gap(path, M350, M350, **{**SUPPLY, "phase_voltage": voltage})
    high = induction_gap(path, M350, M350, **{**SUPPLY, "phase_voltage": voltage + step})
    assert low.iron.stator_tooth_b > 1.0
    assert 1.0 <= low.saturation_factor < high.saturation_factor
    assert high.iron.stator_tooth_b <= high.iron.stator_tooth_b_apparent


def test_invalid_inputs_are_refused() -> None:
    with pytest.raises(ValueError):
        Teeth(slot_pitch=0.01, width=-1e-3, height=0.02)
    with pytest.raises(ValueError):
        dataclasses.replace(MAGNET, arc_fraction=1.2)
    with pytest.raises(ValueError):
        salient_field_gap(
            make_path(), dataclasses.replace(POLE, shoe_width=0.2), M350, M350, field_mmf=1.0
        )
    with pytest.raises(ValueError):
        induction_gap(make_path(), M350, M350, **SUPPLY, voltage_drop=1.0)
