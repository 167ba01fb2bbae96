"""The whitelist units parser against pint (a general-purpose units library from PyPI)."""

from __future__ import annotations

import math
from functools import cache
from typing import Any

import pint
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from emgate.units import (
    MAX_EXPONENT,
    MAX_NUMBER,
    MAX_TEXT,
    UNITS,
    Dims,
    QuantityError,
    convert,
    parse_quantity,
    parse_unit,
)

# Factors are exact decimal powers or short products of them; two correctly rounded
# computations of the same product differ by a few ulp.
REL = 1e-12
PINT_DIMS = ("[length]", "[mass]", "[time]", "[current]", "[temperature]")  # our m, kg, s, A, K


@cache
def ureg() -> pint.UnitRegistry:
    return pint.UnitRegistry()


def pint_si(expr: str) -> tuple[float, Dims]:
    """pint's SI value of a unit (or of a quantity text such as '3 ohm') and its dimensionality
    as our (m, kg, s, A, K) vector."""
    q = ureg().Quantity(expr).to_base_units()
    dims = dict(q.dimensionality)
    assert set(dims) <= set(PINT_DIMS), f"{expr}: pint dimension outside our five: {dims}"
    vector = tuple(dims.get(name, 0) for name in PINT_DIMS)
    assert all(float(e).is_integer() for e in vector)
    return float(q.magnitude), tuple(int(e) for e in vector)  # type: ignore[return-value]


# --- every unit of the whitelist -------------------------------------------------------------

# pint reads revolutions per minute as 2 pi rad/min; emgate counts a revolution as 1. pint
# keeps gauss and oersted in CGS dimensions, convertible to SI only in its Gaussian context.
SPECIAL = {"rpm", "r", "G", "kG", "Oe", "kOe"}


@pytest.mark.parametrize("name", sorted(set(UNITS) - SPECIAL))
def test_unit_factor_and_dimension_match_pint(name: str) -> None:
    factor, dims = UNITS[name]
    pint_factor, pint_dims = pint_si(name)  # [calc] external check: pint, same symbol
    assert dims == pint_dims
    assert factor == pytest.approx(pint_factor, rel=REL)


def test_rpm_is_revolutions_per_second() -> None:
    factor, dims = UNITS["rpm"]
    # [calc] external check: pint, 1 rpm in revolution/second = 1/60
    expected = ureg().Quantity(1.0, "rpm").to("revolution/second").magnitude
    assert factor == pytest.approx(expected, rel=REL)
    assert dims == pint_si("Hz")[1]  # a rate: per second
    assert parse_quantity("1470 rpm").value == pytest.approx(1470 / 60, rel=REL)  # [calc]


@pytest.mark.parametrize("name", ["deg", "°", "rad"])
def test_angles_are_dimensionless(name: str) -> None:
    factor, dims = UNITS[name]
    assert dims == (0, 0, 0, 0, 0)
    # [calc] external check: pint, degree and radian in radians
    assert factor == pytest.approx(ureg().Quantity(1.0, name).to("radian").magnitude, rel=REL)
    assert parse_quantity("180 deg").value == pytest.approx(math.pi, rel=REL)  # [calc] pi rad


def test_percent() -> None:
    assert UNITS["%"] == (0.01, (0, 0, 0, 0, 0))  # [calc] percent = 1/100; exact: same literal
    assert pint_si("%") == (pytest.approx(0.01, rel=REL), (0, 0, 0, 0, 0))


@pytest.mark.parametrize("celsius", [40.0, -273.15, 0.0, 155.0])
def test_degc_is_an_offset_unit(celsius: float) -> None:
    q = parse_quantity(f"{celsius} degC")
    # [calc] external check: pint Quantity(t, 'degC').to('K'); 40 degC = 313.15 K. Absolute
    # tolerance 1e-9 K: adding 273.15 rounds at about 1e-13 K.
    assert q.value == pytest.approx(ureg().Quantity(celsius, "degC").to("K").magnitude, abs=1e-9)
    assert q.dims == (0, 0, 0, 0, 1)


def test_degc_refused_inside_a_compound_unit() -> None:
    # An offset unit has no meaning in a product: 'per degC' is 'per K'.
    with pytest.raises(QuantityError, match="degC"):
        parse_quantity("0.4 %/degC")


def test_temperature_difference_refuses_degc() -> None:
    with pytest.raises(QuantityError, match="K"):
        convert("80 degC", "temperature_difference")
    assert convert("80 K", "temperature_difference") == 80.0  # [calc] factor 1: exact


@pytest.mark.parametrize(
    ("text", "pint_expr"),
    [
        ("3 Ω", "3 ohm"),
        ("3 ohm", "3 ohm"),
        ("12 mΩ", "12 milliohm"),
        ("12 mohm", "12 milliohm"),
        ("5 µm", "5 micrometer"),
        ("5 um", "5 micrometer"),
    ],
)
def test_unicode_and_ascii_spellings(text: str, pint_expr: str) -> None:
    q = parse_quantity(text)
    value, dims = pint_si(pint_expr)
    assert q.dims == dims
    assert q.value == pytest.approx(value, rel=REL)


# --- compound expressions --------------------------------------------------------------------


@pytest.mark.parametrize(
    ("expr", "pint_expr"),
    [
        ("A/mm^2", "A/mm**2"),
        ("A/mm²", "A/mm**2"),
        ("W/(m^2*K)", "W/(m**2*K)"),
        ("W/(m*K)", "W/(m*K)"),
        ("ohm*mm^2/m", "ohm*mm**2/m"),
        ("%/K", "percent/K"),
        ("1/K", "1/K"),
        ("mm²", "mm**2"),
        ("mm³", "mm**3"),
        ("mm**2", "mm**2"),
        ("kA/m", "kA/m"),
        ("kg/m^3", "kg/m**3"),
        ("N*m", "N*m"),
        ("N m", "N*m"),
        ("N·m", "N*m"),
        ("W/kg", "W/kg"),
        ("m/s^2", "m/s**2"),
        ("T^2/(A*s)", "T**2/(A*s)"),
    ],
)
def test_compound_units_match_pint(expr: str, pint_expr: str) -> None:
    factor, dims = parse_unit(expr)
    pint_factor, pint_dims = pint_si(pint_expr)  # [calc] external check: pint
    assert dims == pint_dims
    assert factor == pytest.approx(pint_factor, rel=REL)


def test_quantity_value_matches_pint() -> None:
    for text in (
        "0.45 mm",
        "5.5 A/mm^2",
        "0.0172 ohm*mm^2/m",
        "-0.12 %/K",
        "7650 kg/m^3",
        "900 kA/m",
        "1.2e-3 m",
    ):
        value, dims = pint_si(text)  # [calc] external check: pint, whole text
        q = parse_quantity(text)
        assert q.dims == dims, text
        assert q.value == pytest.approx(value, rel=REL), text


# --- hostile input ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("text", "match"),
    [
        ("1 m^9^9^8", "exponent"),  # hung pint for more than 20 s (our own measurement)
        (f"1 m^{MAX_EXPONENT + 1}", "exponent"),
        ("1 m^-9", "exponent"),
        ("1 m^99999999999999999999", "exponent"),
        ("1 m^0", "exponent"),
        ("1 m^x", "exponent"),
        ("1 m^", "ends too early"),
        ("1 (((m)))", "nests"),
        ("1 (m", "ends too early|missing"),
        ("nan mm", "starts with a number"),  # pint accepts it
        ("inf mm", "starts with a number"),
        ("NaN mm", "starts with a number"),
        ("1e999 mm", "finite"),  # pint accepts it as inf
        ("1e308 km", "finite"),  # finite number, infinite in SI
        ("9" * (MAX_NUMBER + 1) + " mm", "number longer"),
        ("1 " + "m*" * MAX_TEXT + "m", "longer than"),
        ("", "starts with a number"),
        ("mm", "starts with a number"),
        ("1 m\x00", "unexpected character"),
        ("1_000 mm", "unexpected character"),
    ],
)
def test_hostile_quantities_refused(text: str, match: str) -> None:
    with pytest.raises(QuantityError, match=match):
        parse_quantity(text)


@pytest.mark.parametrize(
    ("text", "hint"),
    [
        ("0.45 mmm", "'mm'"),
        ("3 Ohm", "'ohm'"),
        ("2 kWW", "'kW'"),
        ("50 hz", "'Hz'"),  # a case-only slip: 'Hz', not 'h' (hour)
        ("40 degc", "'degC'"),
        ("1 KW", "'kW'"),
    ],
)
def test_unknown_unit_has_a_did_you_mean_hint(text: str, hint: str) -> None:
    with pytest.raises(QuantityError, match=f"unknown unit .*did you mean {hint}"):
        parse_quantity(text)


@pytest.mark.parametrize("value", [0.45, 3, "0.45"])
def test_bare_number_for_a_length_names_the_dimension(value: Any) -> None:
    with pytest.raises(QuantityError, match="length"):
        convert(value, "length")


def test_boolean_refused_for_a_length() -> None:
    with pytest.raises(QuantityError, match=r"length.*boolean"):
        convert(True, "length")


def test_wrong_dimension_names_expected_and_found() -> None:
    with pytest.raises(QuantityError, match=r"expected a length.*'3 A'.*current"):
        convert("3 A", "length")


def test_dimensionless_field_takes_a_plain_number() -> None:
    assert convert(0.97, "dimensionless") == 0.97  # [calc] identity: exact
    assert convert("97 %", "dimensionless") == pytest.approx(0.97, rel=REL)  # [calc]
    with pytest.raises(QuantityError, match="finite"):
        convert(float("nan"), "dimensionless")


@pytest.mark.parametrize(
    "text", ["1 ((MW^4*MVA^4)^4)^4", "1 ((um^4 um^4)^-4)^4", "1 (MW^4 MW^4)^4", "1e300 MW^4"]
)
def test_nested_exponents_are_bounded(text: str) -> None:
    # Exponents of parenthesised groups multiply; a float power can overflow (OverflowError).
    with pytest.raises(QuantityError):
        parse_quantity(text)


# --- fuzz ------------------------------------------------------------------------------------


def _never_worse_than_quantity_error(text: str) -> None:
    try:
        q = parse_quantity(text)
    except QuantityError:
        return
    assert math.isfinite(q.value)


@settings(max_examples=400, deadline=None)
@given(st.text(max_size=24))
def test_fuzz_random_text(text: str) -> None:
    _never_worse_than_quantity_error(text)


_TOKENS = [
    *UNITS,
    "degC",
    "1",
    "2",
    "-1",
    "4",
    "*",
    "/",
    "·",
    " ",
    "^",
    "**",
    "²",
    "³",
    "(",
    ")",
    "e5",
    ".",
    "-",
]


@settings(max_examples=400, deadline=None, derandomize=True)
@given(
    st.floats(allow_nan=False, allow_infinity=False, width=32),
    st.lists(st.sampled_from(_TOKENS), max_size=10),
)
def test_fuzz_unit_grammar(number: float, tokens: list[str]) -> None:
    # Well-formed-looking texts reach deeper into the grammar than random characters.
    _never_worse_than_quantity_error(f"{number:g} {''.join(tokens)}")


@pytest.mark.parametrize(
    ("name", "si"), [("G", "tesla"), ("kG", "tesla"), ("Oe", "A/m"), ("kOe", "A/m")]
)
def test_cgs_magnet_units_match_pint_gaussian(name: str, si: str) -> None:
    factor, _ = UNITS[name]
    with ureg().context("Gaussian"):
        expected = ureg().Quantity(1.0, name).to(si).magnitude  # [calc] external check: pint
    # pint converts through its CODATA mu0, emgate by the exact SI correspondence
    # (1 G = 1e-4 T, 1 Oe = 1000/(4 pi) A/m): they differ by about 7e-11 relative.
    assert factor == pytest.approx(expected, rel=1e-9)


def test_revolutions_per_minute_spelled_the_iec_way() -> None:
    # [calc] external check: pint, 1 revolution/minute in revolution/second = 1/60
    expected = ureg().Quantity(1470.0, "revolution/minute").to("revolution/second").magnitude
    assert parse_quantity("1470 r/min").value == pytest.approx(expected, rel=REL)
    assert parse_quantity("1470 r/min") == parse_quantity("1470 rpm")


@pytest.mark.parametrize("text", ["40 °C", "40 ℃", "40 degC"])
def test_celsius_spellings(text: str) -> None:
    # [calc] external check: pint Quantity(40, 'degC').to('K')
    assert parse_quantity(text).value == pytest.approx(
        ureg().Quantity(40.0, "degC").to("K").magnitude, abs=1e-9
    )


def test_an_attached_exponent_as_data_sheets_write_it() -> None:
    # [calc] external check: pint, 6 A/mm**2 in SI
    expected = ureg().Quantity("6 A/mm**2").to_base_units().magnitude
    assert parse_quantity("6 A/mm2").value == pytest.approx(expected, rel=REL)


def test_a_bare_celsius_letter_gets_a_hint() -> None:
    with pytest.raises(QuantityError, match="40 degC"):
        parse_quantity("40 C")
