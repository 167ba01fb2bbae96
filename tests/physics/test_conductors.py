"""Checks of the conductor kernel against standards, closed forms and numpy.

The modules: slots, strands, currents, rotor_conductors, resistance, insulation.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import assume, given, settings
from hypothesis import strategies as st

from emgate.physics import currents, insulation, resistance, rotor_conductors, slots, strands

MM = 1e-3
MM2 = 1e-6


# --- helpers: independent geometry in numpy --------------------------------------------------


def shoelace(vertices: np.ndarray) -> float:
    """Polygon area from its vertices (either orientation) [calc]."""
    x, y = vertices[:, 0], vertices[:, 1]
    return 0.5 * abs(float(np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1))))


def offset_inward(vertices: np.ndarray, t: float) -> np.ndarray:
    """Convex polygon shifted inward by t: offset every edge line, intersect neighbours."""
    centre = vertices.mean(axis=0)
    n = len(vertices)
    lines = []
    for i in range(n):
        p, q = vertices[i], vertices[(i + 1) % n]
        d = (q - p) / np.linalg.norm(q - p)
        normal = np.array([-d[1], d[0]])
        if np.dot(centre - p, normal) < 0:
            normal = -normal
        lines.append((p + t * normal, d))
    out = []
    for i in range(n):
        (p1, d1), (p2, d2) = lines[i - 1], lines[i]
        s = np.linalg.solve(np.column_stack([d1, -d2]), p2 - p1)
        out.append(p1 + s[0] * d1)
    return np.array(out)


def trapezoid(top: float, bottom: float, height: float) -> np.ndarray:
    """Winding zone, y measured from its bore side."""
    return np.array([[-top / 2, 0.0], [top / 2, 0.0], [bottom / 2, height], [-bottom / 2, height]])


# --- IEC 60028 and temperature ---------------------------------------------------------------


def test_copper_and_aluminium_constants() -> None:
    # [pub: IEC 60028] rho20 = 1/58 ohm mm^2/m, alpha20 = 0.00393 /K; exact constants.
    assert resistance.COPPER.resistivity20 == pytest.approx(1.0 / 58.0 * 1e-6, rel=1e-15)
    assert resistance.COPPER.resistivity20 == pytest.approx(1.7241e-8, rel=1e-4)  # 5-digit rounding
    assert resistance.COPPER.alpha20 == 0.00393  # [pub: IEC 60028]
    assert resistance.ALUMINIUM.alpha20 == 0.00403  # [pub: IEC 60889]
    # At 20 degC the resistivity is rho20 itself (the law pivots there) [calc].
    assert resistance.resistivity(resistance.COPPER, 293.15) == pytest.approx(
        resistance.COPPER.resistivity20, rel=1e-15
    )


@pytest.mark.parametrize(
    ("letter", "ratio"),
    [
        ("B", 1.0 + 0.00393 * 75.0),  # [calc] 1.29475, 95 degC [mem: IEC 60034-1 reference]
        ("F", 1.0 + 0.00393 * 95.0),  # [calc] 1.37335, 115 degC
        ("H", 1.0 + 0.00393 * 115.0),  # [calc] 1.45195, 135 degC
    ],
)
def test_resistance_ratio_at_class_reference_temperature(letter: str, ratio: float) -> None:
    t_ref = insulation.reference_temperature(letter)
    # Float arithmetic of a closed form: 1e-12 covers rounding of the kelvin conversion.
    assert resistance.resistance_factor(resistance.COPPER.alpha20, t_ref) == pytest.approx(
        ratio, rel=1e-12
    )
    rho = resistance.resistivity(resistance.COPPER, t_ref)
    assert rho / resistance.COPPER.resistivity20 == pytest.approx(ratio, rel=1e-12)


def test_resistance_ratio_f_rounded_value() -> None:
    # R115/R20 = 1 + 0.00393 * 95 = 1.3734 [calc], to the 4 decimals quoted.
    assert resistance.resistance_factor(0.00393, 115.0 + 273.15) == pytest.approx(1.3734, abs=5e-5)


def test_aluminium_ratio() -> None:
    # [calc] 1 + 0.00403 * (115 - 20) = 1.38285 with alpha20 from [pub: IEC 60889].
    assert resistance.resistivity(
        resistance.ALUMINIUM, 388.15
    ) / resistance.ALUMINIUM.resistivity20 == pytest.approx(1.38285, rel=1e-12)


def test_insulation_classes() -> None:
    # [pub: IEC 60085] class temperatures in degC.
    expected = {"A": 105, "E": 120, "B": 130, "F": 155, "H": 180, "N": 200}
    for letter, t in expected.items():
        assert insulation.insulation_class(letter).class_temperature == pytest.approx(
            t + 273.15, abs=1e-9
        )
    # [pub: IEC 60034-1 via a manufacturer's manual] rise limits, 40 degC coolant.
    assert insulation.temperature_rise_limit("B") == 80.0
    assert insulation.temperature_rise_limit("f") == 105.0
    assert insulation.temperature_rise_limit("H") == 125.0
    # [mem] reference temperatures 95 / 115 / 135 degC.
    assert insulation.reference_temperature("B") == pytest.approx(368.15, abs=1e-9)
    assert insulation.reference_temperature("F") == pytest.approx(388.15, abs=1e-9)
    assert insulation.reference_temperature("H") == pytest.approx(408.15, abs=1e-9)
    # Rise limit plus 40 degC coolant stays below the class temperature (margin for the
    # hot spot) [pub: IEC 60034-1 / IEC 60085 values above].
    for letter in "BFH":
        cls = insulation.insulation_class(letter)
        assert cls.rise_limit is not None
        assert 313.15 + cls.rise_limit < cls.class_temperature


def test_classes_a_and_e_from_memory() -> None:
    # [from memory: IEC 60034-1 Table 7] A 60 K, E 75 K; reference temperatures taken as the
    # rise limit + 15 K, as for class B (95 degC) [from memory: IEC 60034-2-1].
    assert insulation.temperature_rise_limit("A") == 60.0
    assert insulation.temperature_rise_limit("E") == 75.0
    assert insulation.reference_temperature("A") == pytest.approx(348.15, abs=1e-9)
    assert insulation.reference_temperature("E") == pytest.approx(363.15, abs=1e-9)
    for letter in "AE":  # the hot-spot margin holds as for B, F, H
        cls = insulation.insulation_class(letter)
        assert 313.15 + cls.rise_limit < cls.class_temperature  # type: ignore[operator]


def test_class_n_without_limits_refuses() -> None:
    # No rise limit or reference temperature is held for N: never guess.
    with pytest.raises(ValueError):
        insulation.temperature_rise_limit("N")
    with pytest.raises(ValueError):
        insulation.reference_temperature("N")


def test_unknown_class() -> None:
    with pytest.raises(ValueError):
        insulation.insulation_class("Z")


# --- currents and loading --------------------------------------------------------------------


def test_phase_current() -> None:
    # Delta: I_line / sqrt(3) [mem: Fitzgerald and Kingsley]; 14.6 / 1.7320508 = 8.42931 [calc].
    assert currents.phase_current(14.6, "delta") == pytest.approx(
        8.42931, rel=1e-5
    )  # 6-digit literal
    assert currents.phase_current(14.6, "star") == 14.6
    with pytest.raises(ValueError):
        currents.phase_current(14.6, "zigzag")  # type: ignore[arg-type]


def test_winding_current_density_hand_calculation() -> None:
    # [calc] by hand: 14.6 A delta -> 8.42931 A; two 0.90 mm strands, S = pi 0.81/4 =
    # 0.636173 mm^2; J = 8.42931 / (1 * 2 * 0.636173) = 6.62502 A/mm^2.
    i_ph = currents.phase_current(14.6, "delta")
    j = currents.winding_current_density(i_ph, 1, 2, strands.round_strand_area(0.90 * MM))
    assert j == pytest.approx(6.62502e6, rel=1e-5)  # the 6-digit hand result
    # Two parallel paths halve it [calc].
    assert currents.winding_current_density(i_ph, 2, 2, strands.round_strand_area(0.90 * MM)) == (
        pytest.approx(j / 2, rel=1e-12)
    )


def test_field_coil_and_bar_density() -> None:
    # [calc] 12 A over 2 x 5 mm (10 mm^2) = 1.2 A/mm^2.
    assert rotor_conductors.field_coil_current_density(12.0, 10 * MM2) == pytest.approx(
        1.2e6, rel=1e-12
    )
    assert currents.current_density(300.0, 60 * MM2) == pytest.approx(5.0e6, rel=1e-12)  # [calc]


def test_electric_loading_hand_calculation() -> None:
    # [mem: Pyrhonen] A = 2 m N I / (pi D); by hand: 2*3*100*10 / (pi*0.1) = 19098.59 A/m.
    a = currents.electric_loading(3, 100, 10.0, 0.1)
    assert a == pytest.approx(19098.59, rel=1e-6)  # 7-digit literal
    # Thermal load with J = 5 A/mm^2: 95.49 A^2/mm^3 = 9.549e10 A^2/m^3 [calc].
    assert currents.thermal_load(a, 5e6) == pytest.approx(95.49e9, rel=1e-4)  # 4-digit literal


# --- cage ------------------------------------------------------------------------------------


@pytest.mark.parametrize(("p", "q_r"), [(1, 22), (2, 28), (2, 34), (3, 46), (4, 50)])
def test_ring_current_against_phasor_sum(p: int, q_r: int) -> None:
    """Ring currents by Kirchhoff's law on numpy phasors, independent of the closed form."""
    i_bar = 237.0  # demo value
    angles = 2 * np.pi * p * np.arange(q_r) / q_r  # electrical angle of each bar
    bars = i_bar * np.exp(-1j * angles)
    # Node k: the segment after bar k carries the segment before it plus the bar current.
    ring = np.cumsum(bars)
    ring -= ring.mean()  # no circulating current round a symmetric ring
    mags = np.abs(ring)
    # Every segment of a symmetric cage carries the same magnitude (float noise only).
    assert np.ptp(mags) < 1e-9 * mags.max()
    assert rotor_conductors.end_ring_current(i_bar, p, q_r) == pytest.approx(mags[0], rel=1e-10)


def test_bar_current_equal_mmf() -> None:
    """The referred bar currents build the stator's fundamental MMF.

    Check [calc, formula mem: Fitzgerald and Kingsley]: m=3, N_ph=100, kw1=0.933, I=10 A,
    p=2 give F1 = 630.0 A. The cage's MMF comes from an FFT of the staircase of its
    instantaneous bar currents (numpy), not from any formula in the module.
    """
    p, q_r = 2, 28
    i_bar = rotor_conductors.bar_current(10.0, 3, 100, 0.933, q_r)
    samples_per_bar = 512
    n = q_r * samples_per_bar
    theta = 2 * np.pi * np.arange(n) / n
    current = np.zeros(n)
    current[::samples_per_bar] = math.sqrt(2) * i_bar * np.cos(p * theta[::samples_per_bar])
    mmf = np.cumsum(current)
    mmf -= mmf.mean()
    f1 = 2 * abs(np.fft.rfft(mmf)[p]) / n
    # 630.0 is given to 4 figures: 1e-4; sampling the staircase adds ~1e-7.
    assert f1 == pytest.approx(630.0, rel=1e-4)


def test_bar_current_factor() -> None:
    # [mem: Boldea and Nasar] K_I = 0.8 cos(phi) + 0.2: 0.85 -> 0.88 [calc].
    assert rotor_conductors.bar_current_factor(0.85) == pytest.approx(0.88, rel=1e-12)
    assert rotor_conductors.bar_current(10.0, 3, 100, 0.933, 28, factor=0.88) == pytest.approx(
        0.88 * 2 * 3 * 100 * 0.933 / 28 * 10.0, rel=1e-12
    )


def test_ring_current_refuses_integer_ratio() -> None:
    with pytest.raises(ValueError):
        rotor_conductors.end_ring_current(100.0, 4, 4)


# --- slot geometry ---------------------------------------------------------------------------


def test_semi_closed_areas_demo_slot() -> None:
    # Demo slot of the design notes: b0 2.8, h0 0.8, h1 1.5, b1 6.0, b2 8.6, height 16 mm.
    dims = (2.8 * MM, 0.8 * MM, 1.5 * MM, 6.0 * MM, 8.6 * MM, 16 * MM)
    # [calc] h2 = 13.7 mm; winding zone (6.0 + 8.6)/2 * 13.7 = 100.01 mm^2.
    assert slots.semi_closed_slot_area(*dims) == pytest.approx(100.01 * MM2, rel=1e-12)
    # [calc] full: 2.8*0.8 + (2.8+6.0)/2*1.5 + 100.01 = 2.24 + 6.6 + 100.01 = 108.85 mm^2.
    assert slots.semi_closed_full_area(*dims) == pytest.approx(108.85 * MM2, rel=1e-12)
    outline = np.array(
        [
            [-1.4, 0.0],
            [1.4, 0.0],
            [1.4, 0.8],
            [3.0, 2.3],
            [4.3, 16.0],
            [-4.3, 16.0],
            [-3.0, 2.3],
            [-1.4, 0.8],
        ]
    )
    # Shoelace of the whole outline, an independent polygon computation [calc].
    assert slots.semi_closed_full_area(*dims) == pytest.approx(shoelace(outline) * MM2, rel=1e-12)


def test_open_slot_areas() -> None:
    # [calc] b 12, h 50, hw 5 mm: 12 x 45 = 540 mm^2; liner 0.5: 11 x 44 = 484 mm^2.
    assert slots.open_slot_area(12 * MM, 50 * MM, 5 * MM) == pytest.approx(540 * MM2, rel=1e-12)
    net = slots.open_slot_area(12 * MM, 50 * MM, 5 * MM, liner=0.5 * MM)
    assert net == pytest.approx(484 * MM2, rel=1e-12)
    assert slots.open_slot_perimeter(12 * MM, 50 * MM, 5 * MM) == pytest.approx(114 * MM, rel=1e-12)
    assert slots.open_full_area(12 * MM, 50 * MM) == pytest.approx(600 * MM2, rel=1e-12)


@settings(max_examples=200, deadline=None)
@given(
    top=st.floats(2.0, 15.0),
    bottom=st.floats(2.0, 15.0),
    height=st.floats(5.0, 40.0),
    liner_share=st.floats(0.0, 0.15),
)
def test_liner_offset_against_polygon_offset(
    top: float, bottom: float, height: float, liner_share: float
) -> None:
    """Net winding area equals the shoelace area of the inward-offset trapezoid (numpy)."""
    t = liner_share * min(top, bottom)
    expected = shoelace(offset_inward(trapezoid(top, bottom, height), t))
    got = slots.semi_closed_slot_area(1.0, 0.5, 1.0, top, bottom, height + 1.5, liner=t)
    # Same geometry by two routes: only float rounding (mm-scale inputs): 1e-9 relative.
    assert got == pytest.approx(expected, rel=1e-9)
    perim = slots.semi_closed_slot_perimeter(0.5, 1.0, top, bottom, height + 1.5)
    # First-order check: net ~ gross - t P, the t^2 corner term is small and positive.
    gross = 0.5 * (top + bottom) * height
    assert gross - t * perim <= got + 1e-9


def test_slot_validation() -> None:
    with pytest.raises(ValueError):  # opening wider than the slot top
        slots.semi_closed_slot_area(7 * MM, 0.8 * MM, 1.5 * MM, 6 * MM, 8.6 * MM, 16 * MM)
    with pytest.raises(ValueError):  # no winding zone left
        slots.semi_closed_slot_area(2 * MM, 1 * MM, 2 * MM, 6 * MM, 8 * MM, 3 * MM)
    with pytest.raises(ValueError):  # liner eats the slot
        slots.open_slot_area(2 * MM, 10 * MM, 1 * MM, liner=1.0 * MM)


# --- strands and fill ------------------------------------------------------------------------


def test_rectangular_strand_area() -> None:
    # [mem: IEC 60317-0-2] A = a b - (4 - pi) r^2: 2 x 5 mm, r 0.5 -> 9.785398 mm^2 [calc].
    assert strands.rectangular_strand_area(2 * MM, 5 * MM, 0.5 * MM) == pytest.approx(
        9.785398 * MM2, rel=1e-7
    )
    # Independent: shoelace of the rounded rectangle traced with 4 x 2000 arc points.
    w, h, r = 2.0, 5.0, 0.5
    pts = []
    for cx, cy, a0 in ((w - r, h - r, 0.0), (r, h - r, 0.5), (r, r, 1.0), (w - r, r, 1.5)):
        phi = np.pi * (a0 + np.linspace(0.0, 0.5, 2000))
        pts.append(np.column_stack([cx + r * np.cos(phi), cy + r * np.sin(phi)]))
    # The inscribed 8000-gon of the corners misses ~1e-8 of the area: 1e-6 is ample.
    assert strands.rectangular_strand_area(w * MM, h * MM, r * MM) / MM2 == pytest.approx(
        shoelace(np.vstack(pts)), rel=1e-6
    )
    assert strands.rectangular_strand_area(2 * MM, 5 * MM) == pytest.approx(10 * MM2, rel=1e-12)
    with pytest.raises(ValueError):
        strands.rectangular_strand_area(2 * MM, 5 * MM, 1.2 * MM)


def test_round_strand_area() -> None:
    # [calc] pi 0.9^2 / 4 = 0.6361725 mm^2.
    assert strands.round_strand_area(0.9 * MM) == pytest.approx(0.6361725 * MM2, rel=1e-7)


SQUARE_CEILING = math.pi / 4  # [calc] square packing of equal circles
HEX_CEILING = math.pi / math.sqrt(12)  # [calc] hexagonal packing, the densest


@settings(max_examples=300, deadline=None)
@given(data=st.data(), open_slot=st.booleans())
def test_round_wire_fill_below_packing_ceilings(data: st.DataObject, open_slot: bool) -> None:
    """Fill of wires that physically fit by square packing stays below the ceilings.

    Asserted: for a random slot (either shape), liner and wire, place n insulated wires
    that fit on a square grid inside a rectangle lying within the liner's inner outline
    (built here in numpy), then the module's fill (bare copper over net slot area) is
    <= (pi/4) (d_bare/d_ins)^2 <= pi/4 < pi/sqrt(12). It fails if the strand area is
    overstated (e.g. d^2 for pi d^2/4), if the net area is understated, or if the fill
    divides by anything smaller than the liner's inner area.
    """
    d_ins = data.draw(st.floats(0.3, 2.5), label="insulated diameter mm")
    d_bare = d_ins * data.draw(st.floats(0.85, 0.99), label="bare share")
    if open_slot:
        b = data.draw(st.floats(3.0, 20.0), label="width")
        hw = data.draw(st.floats(0.0, 5.0), label="wedge")
        h = hw + data.draw(st.floats(8.0, 60.0), label="winding height")
        top = bottom = b
        zone_h = h - hw
        t = data.draw(st.floats(0.0, 0.5), label="liner mm")
        net = slots.open_slot_area(b * MM, h * MM, hw * MM, liner=t * MM)
    else:
        b0 = data.draw(st.floats(1.5, 4.0), label="opening")
        h0 = data.draw(st.floats(0.5, 1.5), label="h0")
        h1 = data.draw(st.floats(0.5, 3.0), label="h1")
        top = data.draw(st.floats(max(b0, 3.0), 12.0), label="top width")
        bottom = top * data.draw(st.floats(0.8, 2.0), label="bottom ratio")
        zone_h = data.draw(st.floats(8.0, 40.0), label="h2")
        t = data.draw(st.floats(0.0, 0.5), label="liner mm")
        net = slots.semi_closed_slot_area(
            b0 * MM, h0 * MM, h1 * MM, top * MM, bottom * MM, (h0 + h1 + zone_h) * MM, liner=t * MM
        )
    inner = offset_inward(trapezoid(top, bottom, zone_h), t)
    width = min(inner[1, 0] - inner[0, 0], inner[2, 0] - inner[3, 0])  # narrower inner edge
    height = inner[2, 1] - inner[1, 1]
    fit = math.floor(width / d_ins) * math.floor(height / d_ins)
    assume(fit >= 1)
    n = data.draw(st.integers(1, fit), label="wires")
    fill = slots.fill_factor(
        strands.copper_area_per_slot(n, 1, strands.round_strand_area(d_bare * MM)), net
    )
    # 1e-9: float rounding of areas built in mm and m.
    assert 0.0 < fill <= SQUARE_CEILING * (d_bare / d_ins) ** 2 * (1 + 1e-9)
    assert fill < SQUARE_CEILING < HEX_CEILING


def test_strand_passes_opening() -> None:
    # [calc] 0.97 + 0.2 = 1.17 mm <= 2.8 mm; 2.7 + 0.2 > 2.8 mm; the clearance is [cp].
    assert slots.strand_passes_opening(0.97 * MM, 2.8 * MM)
    assert not slots.strand_passes_opening(2.7 * MM, 2.8 * MM)
    assert slots.strand_passes_opening(2.7 * MM, 2.8 * MM, clearance=0.0)


def test_fill_demo_record() -> None:
    # Demo: 2 layers x 22 turns x 2 strands of 0.90 mm in the demo slot with 0.25 mm liner.
    net = slots.semi_closed_slot_area(
        2.8 * MM, 0.8 * MM, 1.5 * MM, 6.0 * MM, 8.6 * MM, 16 * MM, liner=0.25 * MM
    )
    cu = strands.copper_area_per_slot(44, 2, strands.round_strand_area(0.90 * MM))
    # [calc] 88 x 0.636173 = 55.98 mm^2 of copper; fill in the round-wire range 0.35-0.70 is
    # a sanity bound only [cp].
    assert cu == pytest.approx(55.98 * MM2, rel=1e-4)
    assert 0.35 < slots.fill_factor(cu, net) < SQUARE_CEILING


# --- resistance and loss ---------------------------------------------------------------------


def test_mean_turn_length() -> None:
    # [mem: Pyrhonen] l_av = 2 l + 2.4 W + 0.1 m: l 0.14, W 0.1 -> 0.62 m [calc]; HV
    # 2 l + 2.9 W + 0.2 -> 0.77 m [calc].
    assert resistance.mean_turn_length(0.14, 0.1) == pytest.approx(0.62, rel=1e-12)
    assert resistance.mean_turn_length(0.14, 0.1, high_voltage=True) == pytest.approx(
        0.77, rel=1e-12
    )
    # [calc] span of 7 slots of 36 at the mid-slot circle D + h = 0.152 m: pi 0.152 7/36.
    assert resistance.coil_span_width(0.136, 0.016, 36, 7) == pytest.approx(
        math.pi * 0.152 * 7 / 36, rel=1e-12
    )


def test_phase_resistance_and_loss_hand_calculation() -> None:
    # [calc] by hand: rho20 = 1/58 ohm mm^2/m [pub: IEC 60028]; N 264; l_av 0.6 m; a 1;
    # two strands of 0.636173 mm^2: R = 264 * 0.6 / (58 * 2 * 0.636173) = 2.14646 ohm.
    r = resistance.phase_resistance(
        resistance.COPPER.resistivity20, 264, 0.6, 1, 2, strands.round_strand_area(0.90 * MM)
    )
    assert r == pytest.approx(2.14646, rel=1e-5)  # 6-digit hand result
    # [calc] m I^2 R = 3 * 8.42931^2 * 2.14646 = 457.54 W.
    assert resistance.copper_loss(3, 8.42931, r) == pytest.approx(457.54, rel=1e-4)
    # At class F reference temperature the resistance grows by 1.37335 [calc].
    r_f = resistance.phase_resistance(
        resistance.resistivity(resistance.COPPER, insulation.reference_temperature("F")),
        264,
        0.6,
        1,
        2,
        strands.round_strand_area(0.90 * MM),
    )
    assert r_f / r == pytest.approx(1.37335, rel=1e-12)
