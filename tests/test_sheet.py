"""``emgate show``: the calculation sheet's names, units and values, as a user meets them.

The sheet is checked against hand calculations from each demo record's raw numbers, done here
with the published closed forms (source tags as in DEVELOPERS.md), and against pint for the
unit conversions between the text and JSON forms; the method texts of the sheet are read back.
The helpers shared with other modules live in conftest.py.
"""

from __future__ import annotations

import math
import re
from pathlib import Path
from typing import Any

import numpy as np
import pint
import pytest

from conftest import (
    GENSET,
    MM,
    MM2,
    PUMP,
    REPO,
    SERVO,
    TOOTH_COIL_12_10,
    carter,
    kd_kp,
    phasors,
    run_cli,
    sheet,
    show_json,
    table_layout,
    variant,
)
from emgate.calc import SHEET
from emgate.model import MACHINE_KINDS

DEMOS = {"pump": PUMP, "servo": SERVO, "genset": GENSET}
UREG = pint.UnitRegistry()


# --- helpers shared by the rule tests --------------------------------------------------------


# --- hand calculations from the raw records ---------------------------------------------------


def belt_layout(slots: int, pole_pairs: int, pitch: int) -> np.ndarray:
    """(3, Q) signed coil sides of a 60-degree-belt double-layer winding, drawn by hand: top
    layer A -C B -A C -B, q slots each, per pole pair; bottom layer the top's return sides
    ``pitch`` slots on. Phase B lies 120 degrees electrical on in slot order."""
    q = slots // (6 * pole_pairs)
    belts = [(0, 1), (2, -1), (1, 1), (0, -1), (2, 1), (1, -1)]
    lay = np.zeros((3, slots), dtype=int)
    for s in range(slots):
        phase, sign = belts[(s // q) % 6]
        lay[phase, s] += sign
        lay[phase, (s + pitch) % slots] -= sign
    return lay


def layout_winding_factor(lay: np.ndarray, order: int) -> float:
    return float(abs(phasors(lay, order)[0]) / np.abs(lay[0]).sum())


def staircase_thd(lay: np.ndarray, pole_pairs: int, wt: float = 0.0) -> float:
    """THD of the staircase MMF at electrical instant wt, all orders, by Parseval [calc]: the
    MMF jumps by the slot's ampere-conductors a_s at each slot centre, so its order-n amplitude
    is |sum a_s exp(-j n theta_s)| / (pi n) and its mean square the sum of amplitude^2 / 2."""
    m, slots = lay.shape
    currents = np.cos(wt - 2.0 * np.pi * np.arange(m) / m)
    a = currents @ lay
    steps = np.cumsum(a)
    mean_square = np.mean((steps - steps.mean()) ** 2)
    theta = 2.0 * np.pi * np.arange(slots) / slots
    working = abs(np.sum(a * np.exp(-1j * pole_pairs * theta))) / (np.pi * pole_pairs)
    return math.sqrt(mean_square / (working**2 / 2.0) - 1.0)


def inset_trapezoid_area(top: float, bottom: float, height: float, t: float) -> float:
    """Area inside a liner t thick laid along all four sides of an isosceles trapezoid [calc]:
    the parallel sides move in by t, the slanted ones by t measured square to themselves."""
    tan_phi = (bottom - top) / 2.0 / height
    side_shift = 2.0 * t * math.sqrt(1.0 + tan_phi**2)  # 2 t / cos(phi)
    w_top = top + 2.0 * t * tan_phi - side_shift
    w_bottom = bottom - 2.0 * t * tan_phi - side_shift
    return (w_top + w_bottom) / 2.0 * (height - 2.0 * t)


# --- names and units -------------------------------------------------------------------------

#: The names the issues ask the sheet for, every machine kind.
REQUIRED = [
    "winding.winding_factor",
    "winding.mmf_thd",
    "winding.mmf_fundamental",
    "air_gap.carter_coefficient",
    "air_gap.effective_length",
    "air_gap.flux_density_peak",
    "air_gap.flux_density_fundamental",
    "stator.tooth_flux_density_apparent",
    "stator.tooth_flux_density",
    "stator.yoke_flux_density",
    "rotor.yoke_flux_density",
    "stator.slot_area",
    "stator.slot_fill",
    "stator.current_density",
    "stator.electric_loading",
    "stator.thermal_load",
    "winding.phase_resistance_20c",
    "winding.phase_resistance_hot",
    "winding.copper_loss",
    "winding.temperature_rise",
]
BY_MACHINE = {
    "pump": ["rotor.bar_current_density", "rotor.ring_current_density"],
    "servo": [],
    "genset": ["rotor.field_current_density"],
}
ROTOR_ONLY = {n for names in BY_MACHINE.values() for n in names}


@pytest.mark.parametrize("demo", DEMOS)
def test_json_sheet_has_the_required_names_in_si(demo: str) -> None:
    quantities = show_json(DEMOS[demo])
    for name in [*REQUIRED, *BY_MACHINE[demo]]:
        q = quantities[name]
        assert isinstance(q["value"], float) and math.isfinite(q["value"]), name
        assert isinstance(q["unit"], str), name
    # Rotor conductors of the other machine kinds are not on this sheet.
    assert not (ROTOR_ONLY - set(BY_MACHINE[demo])) & set(quantities)


def _dims(unit: str) -> Any:
    return UREG.dimensionless.dimensionality if unit == "1" else UREG(unit).dimensionality


@pytest.mark.parametrize("demo", DEMOS)
def test_json_units_are_coherent_si_of_the_display_unit(demo: str) -> None:
    # [pint] an independent unit library: the JSON unit is coherent SI (factor 1 to the base
    # units) and has the dimension of the display unit the sheet registers.
    for name, q in show_json(DEMOS[demo]).items():
        if q["unit"] != "1":
            factor = UREG.Quantity(1.0, q["unit"]).to_base_units().magnitude
            assert factor == pytest.approx(1.0, rel=1e-12), name  # exact SI: rounding only
        assert _dims(q["unit"]) == _dims(SHEET[name].unit), name


TEXT_LINE = re.compile(r"^  (\S+)\s+(\S+(?: \S+)?)   (.*)$", re.MULTILINE)


@pytest.mark.parametrize("demo", DEMOS)
def test_text_form_lists_the_same_names_and_values(demo: str) -> None:
    json_q = show_json(DEMOS[demo])
    text = run_cli("show", DEMOS[demo])
    assert text.code == 0, text.err
    rows = {m[1]: (m[2], m[3]) for m in TEXT_LINE.finditer(text.out)}
    assert set(rows) == set(json_q)
    for name, (shown, method) in rows.items():
        assert method == json_q[name]["method"]
        unit = json_q[name]["unit"]
        if json_q[name]["value"] is None:  # not defined for this record (NaN)
            assert shown.split()[0] == "nan", name
            continue
        si = UREG.Quantity(json_q[name]["value"], "" if unit == "1" else unit)
        number, _, display = shown.partition(" ")
        # an absolute temperature in degC is an offset unit: pint converts it alone
        text = UREG.Quantity(float(number), display) if display == "degC" else UREG(shown)
        # [pint] the display value converted to SI; 5 significant figures are shown, so the
        # relative rounding is at most 5e-5.
        assert text.to_base_units().magnitude == pytest.approx(
            si.to_base_units().magnitude, rel=1e-4
        ), name


def _developers_table() -> dict[str, tuple[str, str, str]]:
    text = (REPO / "DEVELOPERS.md").read_text(encoding="utf-8")
    section = text.split("## Calculation sheet", 1)[1]
    rows: dict[str, tuple[str, str, str]] = {}
    for line in section.splitlines():
        if line.startswith("| `"):
            cells = [c.strip() for c in re.split(r"(?<!\\)\|", line)[1:-1]]
            rows[cells[0].strip("`")] = (cells[1], cells[2], cells[3].replace("\\|", "|"))
    return rows


def test_every_sheet_name_is_documented_in_developers_md() -> None:
    # Drift: the contributor guide's table is the published list of stable names.
    table = _developers_table()
    assert set(table) == set(SHEET)
    for name, entry in SHEET.items():
        unit, machines, method = table[name]
        assert unit == entry.unit, name
        expected = "all" if entry.machines == MACHINE_KINDS else ", ".join(entry.machines)
        if entry.only:  # a condition beyond the machine kinds
            expected += f" ({entry.only})"
        assert machines == expected, name
        assert method == entry.method, name


# --- reference checks through the sheet -------------------------------------------------------


def test_winding_factor_of_the_pump_is_kd_kp() -> None:
    # [mem: Pyrhonen, Design of Rotating Electrical Machines] kd kp, q = 36/(4*3) = 3, slot
    # angle p 2 pi / Q = 20 deg electrical, pitch 7/9 (coil pitch 7 of a 9-slot pole pitch).
    expected = kd_kp(3, 2 * 2 * math.pi / 36, 7 / 9)  # 0.90191 [calc]
    assert sheet(PUMP)["winding.winding_factor"] == pytest.approx(expected, rel=1e-9)  # exact
    # The hand-drawn belt layout gives the same by the slot phasor sum (oracle cross-check).
    assert layout_winding_factor(belt_layout(36, 2, 7), 2) == pytest.approx(expected, rel=1e-12)


def test_winding_factor_of_the_genset_is_kd_kp() -> None:
    # [mem: Pyrhonen] q = 48/(4*3) = 4, slot angle 15 deg electrical, pitch 10/12.
    expected = kd_kp(4, 2 * 2 * math.pi / 48, 10 / 12)  # 0.92503 [calc]
    assert sheet(GENSET)["winding.winding_factor"] == pytest.approx(expected, rel=1e-9)  # exact


def test_winding_factor_of_the_servo_tooth_coils() -> None:
    # [calc] 12 slots / 10 poles double layer: kp = sin(75 deg), kd = cos(15 deg), so
    # kw = cos^2(15 deg) = (2 + sqrt 3) / 4 = 0.9330 [calc; agrees with mem: El-Refaie,
    # IEEE Trans. Ind. Electron. 57(1), 2010].
    value = sheet(SERVO)["winding.winding_factor"]
    assert value == pytest.approx((2 + math.sqrt(3)) / 4, rel=1e-9)  # closed form: rounding
    assert value == pytest.approx(0.9330, abs=5e-5)  # the published figure, 4 digits
    lay = table_layout(TOOTH_COIL_12_10)
    assert layout_winding_factor(lay, 5) == pytest.approx(value, rel=1e-12)  # oracle check


def test_staircase_thd_oracle_matches_the_closed_forms() -> None:
    # Guards the hand THD: three-phase q = 1 full pitch sqrt(pi^2/9 - 1) = 31.08 % [calc];
    # q = 2 full pitch 16.86 % [calc], both from the reference notes (4 digits given).
    assert staircase_thd(belt_layout(6, 1, 3), 1) == pytest.approx(
        math.sqrt(math.pi**2 / 9 - 1), rel=1e-12
    )  # exact: rounding only
    assert staircase_thd(belt_layout(12, 1, 6), 1) == pytest.approx(0.1686, abs=5e-5)


@pytest.mark.parametrize(
    ("demo", "lay", "p"),
    [("pump", belt_layout(36, 2, 7), 2), ("servo", table_layout(TOOTH_COIL_12_10), 5)],
)
def test_mmf_thd_is_a_ratio_from_parseval(demo: str, lay: np.ndarray, p: int) -> None:
    # [calc] THD of the staircase by Parseval (the method stated in the reference notes),
    # computed here from a layout drawn by hand; both exact, so rounding only.
    expected = staircase_thd(lay, p)
    assert staircase_thd(lay, p, wt=0.7) == pytest.approx(expected, rel=1e-9)  # any instant
    value = sheet(DEMOS[demo])["winding.mmf_thd"]
    assert 0.0 < value < 2.0  # a ratio, not a percentage
    assert value == pytest.approx(expected, rel=1e-9)


def test_mmf_fundamental_of_the_pump() -> None:
    # [mem: Fitzgerald and Kingsley, Electric Machinery] F1 = (sqrt 2 m / pi) kw1 N_ph I / p;
    # N_ph = 36 slots * 2 layers / 2 / 3 phases * 21 turns = 252; delta: I = 14.6 A / sqrt 3.
    kw = kd_kp(3, 2 * 2 * math.pi / 36, 7 / 9)
    expected = math.sqrt(2) * 3 / math.pi * kw * 252 * (14.6 / math.sqrt(3)) / 2  # 1293.6 A
    assert sheet(PUMP)["winding.mmf_fundamental"] == pytest.approx(expected, rel=1e-9)


def _carter_cases() -> list[tuple[str, float]]:
    # (demo, kc by hand) with the record's raw numbers.
    pump_s = carter(math.pi * 136 / 36, 2.8, 0.45)
    pump_r = carter(math.pi * (136 - 2 * 0.45) / 28, 1.0, 0.45)  # rotor: at the rotor surface
    # Surface magnets: the slotting sees g' = g + h_m / mu_rec [mem: Pyrhonen ch. 3].
    servo = carter(math.pi * 78 / 12, 2.0, 0.8 + 3.5 / 1.05)
    genset = carter(math.pi * 230 / 48, 7.0, 1.5)  # open slot: the opening is the slot width
    return [("pump", pump_s * pump_r), ("servo", servo), ("genset", genset)]


@pytest.mark.parametrize(("demo", "expected"), _carter_cases())
def test_carter_coefficient_and_effective_gap(demo: str, expected: float) -> None:
    # [mem: Carter 1901, in Pyrhonen ch. 3] closed form; stator times rotor for a cage rotor.
    s = sheet(DEMOS[demo])
    assert s["air_gap.carter_coefficient"] == pytest.approx(expected, rel=1e-9)  # rounding
    gap = {"pump": 0.45, "servo": 0.8 + 3.5 / 1.05, "genset": 1.5}[demo] * MM
    # kc times the gap Carter is taken on (DEVELOPERS.md definition).
    assert s["air_gap.effective_length"] == pytest.approx(expected * gap, rel=1e-9)


def test_carter_value_from_the_reference_notes() -> None:
    # Guards the hand formula itself: tau 10 mm, b0 2.5 mm, g 0.5 mm gives 1.1447 [calc, in
    # the reference notes]; 4 digits given.
    assert carter(10.0, 2.5, 0.5) == pytest.approx(1.1447, abs=5e-5)


@pytest.mark.parametrize(
    ("demo", "m", "n_ph", "i_ph", "bore"),
    [
        ("pump", 3, 252, 14.6 / math.sqrt(3), 136),  # delta
        ("servo", 3, 12 * 2 // 6 * 100, 3.9, 78),  # star; 4 coils of 100 turns per phase
        ("genset", 3, 48 * 2 // 6 * 4, 43.3, 230),  # star; 16 coils of 4 turns per phase
    ],
)
def test_electric_loading(demo: str, m: int, n_ph: int, i_ph: float, bore: float) -> None:
    # [mem: Pyrhonen] A = 2 m N_ph I / (pi D), rms.
    expected = 2 * m * n_ph * i_ph / (math.pi * bore * MM)
    s = sheet(DEMOS[demo])
    assert s["stator.electric_loading"] == pytest.approx(expected, rel=1e-12)  # rounding only
    # Thermal load A J [mem: Pyrhonen], J from this sheet's own current density.
    assert s["stator.thermal_load"] == pytest.approx(
        expected * s["stator.current_density"], rel=1e-12
    )


@pytest.mark.parametrize(
    ("demo", "expected"),
    [
        # [calc] J = I_ph / (a n S); round strand S = pi d^2 / 4.
        ("pump", (14.6 / math.sqrt(3)) / (2 * math.pi * 0.45**2)),
        ("servo", 3.9 / (math.pi * 0.355**2)),
        # Rectangular strand w h - (4 - pi) r^2 [calc: rectangle less its rounded corners].
        ("genset", 43.3 / (2 * (5.0 * 1.25 - (4 - math.pi) * 0.5**2))),
    ],
)
def test_current_density(demo: str, expected: float) -> None:
    value = sheet(DEMOS[demo])["stator.current_density"]
    assert value * MM2 == pytest.approx(expected, rel=1e-12)  # A/mm^2; rounding only


def test_slot_fill_of_the_pump() -> None:
    # [calc] winding zone: 20 mm deep less 0.8 mm opening and 1.5 mm wedge, 6.4 to 9.6 mm wide;
    # net of the record's 0.25 mm liner; bare copper 2 layers * 21 turns * 2 strands * pi/4
    # (0.90 mm)^2.
    net = inset_trapezoid_area(6.4, 9.6, 20 - 0.8 - 1.5, 0.25)  # 128.96 mm^2
    copper = 2 * 21 * 2 * math.pi / 4 * 0.90**2  # 53.44 mm^2
    s = sheet(PUMP)
    assert s["stator.slot_area_gross"] * 1e6 == pytest.approx((6.4 + 9.6) / 2 * 17.7, rel=1e-12)
    assert s["stator.slot_area"] / MM2 == pytest.approx(net, rel=1e-9)  # exact geometry
    assert s["stator.slot_fill"] == pytest.approx(copper / net, rel=1e-9)


def test_slot_fill_of_the_genset_open_slot() -> None:
    # [calc] open slot 7 x (30 - 3) mm net of a 0.4 mm liner: (b - 2t)(h - hw - 2t); copper
    # 2 layers * 4 turns * 2 strands * (5 x 1.25 mm less (4 - pi) (0.5 mm)^2).
    net = (7.0 - 0.8) * (30 - 3 - 0.8)
    copper = 2 * 4 * 2 * (5.0 * 1.25 - (4 - math.pi) * 0.5**2)
    s = sheet(GENSET)
    assert s["stator.slot_area"] / MM2 == pytest.approx(net, rel=1e-9)
    assert s["stator.slot_fill"] == pytest.approx(copper / net, rel=1e-9)


#: Reference temperatures of the losses by class [mem, reference notes]: B 95, F 115, H 135 degC.
REFERENCE_TEMPERATURE = {"B": 95.0, "F": 115.0, "H": 135.0}


@pytest.mark.parametrize(
    ("letter", "material", "alpha"),
    [
        ("F", "copper", 0.00393),  # [pub: IEC 60028] copper alpha20
        ("B", "copper", 0.00393),
        ("H", "copper", 0.00393),
        ("F", "aluminium", 0.00403),  # [pub] aluminium alpha20
    ],
)
def test_hot_resistance_ratio(repo: Path, letter: str, material: str, alpha: float) -> None:
    path = variant(
        repo, {"winding.insulation_class": letter, "winding.conductor.material": material}
    )
    s = sheet(path)
    ratio = s["winding.phase_resistance_hot"] / s["winding.phase_resistance_20c"]
    expected = 1 + alpha * (REFERENCE_TEMPERATURE[letter] - 20)  # R(T) = R20 [1 + a (T - 20)]
    assert ratio == pytest.approx(expected, rel=1e-12)  # a linear law: rounding only


def test_phase_resistance_and_copper_loss_of_the_pump() -> None:
    # [pub: IEC 60028] rho20 = 1/58 ohm mm^2/m; mean turn 2 l + 2.4 W + 0.1 m with W the coil
    # span on the slot-middle circle, pi (D + h_s) / Q * y [mem: Pyrhonen, average turn length];
    # R = rho N_ph l_av / (a n S).
    span = math.pi * (0.136 + 0.020) / 36 * 7
    turn = 2 * 0.140 + 2.4 * span + 0.1
    r20 = (1 / 58) * 252 * turn / (2 * math.pi / 4 * 0.90**2)
    s = sheet(PUMP)
    assert s["winding.mean_turn_length"] == pytest.approx(turn, rel=1e-12)  # rounding only
    assert s["winding.phase_resistance_20c"] == pytest.approx(r20, rel=1e-9)
    i_ph = 14.6 / math.sqrt(3)
    # m I^2 R at the class F reference temperature, 115 degC [mem].
    loss = 3 * i_ph**2 * r20 * (1 + 0.00393 * (115 - 20))
    assert s["winding.copper_loss"] == pytest.approx(loss, rel=1e-9)


def test_every_sheet_name_has_exactly_one_function() -> None:
    # The one list in emgate.calc.names and the @quantity bindings must agree both ways;
    # a second binding of a name raises at import (emgate.calc.core.quantity).
    from emgate.calc import PROVIDERS, SHEET

    assert set(PROVIDERS) == set(SHEET)
    assert len({id(fn) for fn in PROVIDERS.values()}) == len(PROVIDERS)


# --- method texts ---------------------------------------------------------------------------------


def test_the_fundamental_note_states_the_flat_top_factor() -> None:
    method = SHEET["air_gap.flux_density_fundamental"].method
    assert "(4/pi) sin(a pi/2)" in method
    # [calc] (4/pi) sin(a pi/2) = 1 at a = (2/pi) asin(pi/4) = 0.5751.
    assert f"a > {2 / math.pi * math.asin(math.pi / 4):.3f}" in method
    s = sheet(SERVO)  # pole arc 0.8: above the peak, as the note says
    assert s["air_gap.flux_density_fundamental"] > s["air_gap.flux_density_peak"]


def test_the_effective_gap_text_names_carter_and_both_gaps() -> None:
    method = SHEET["air_gap.effective_length"].method
    assert "is taken on" not in method  # the garbled phrase is gone
    assert "Carter's coefficient times" in method and "h_m / mu_rec" in method
