"""Quantities with units: a strict, bounded parser with a whitelist of units.

Why not a general units library: one measured here costs 120-190 ms to import and build its
registry (the whole budget of a pre-commit run), accepted 'nan mm' and '1e999 mm', and hung for
more than 20 s on the 10-character input '1 m^9^9^8'. Design records need a few dozen units, so a
whitelist with SI dimension vectors, bounded in length and exponent, is both faster and safer.
tests/test_units.py checks every unit's factor and dimension against pint.

Grammar (spaces between factors mean multiplication)::

    quantity := number [unit]
    unit     := ["1"] factor (("*" | "/" | "·" | " ") factor)*
    factor   := name [("^" | "**") int | "²" | "³"] | "(" unit ")"
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import lru_cache

# SI base dimensions in this order: metre, kilogram, second, ampere, kelvin.
Dims = tuple[int, int, int, int, int]
#: The SI base units, in the order of a dimension vector.
BASE_UNITS = ("m", "kg", "s", "A", "K")

MAX_TEXT = 64
MAX_NUMBER = 32
MAX_EXPONENT = 4
MAX_DEPTH = 2

_L: Dims = (1, 0, 0, 0, 0)
_M: Dims = (0, 1, 0, 0, 0)
_T: Dims = (0, 0, 1, 0, 0)
_I: Dims = (0, 0, 0, 1, 0)
_TH: Dims = (0, 0, 0, 0, 1)
_ONE: Dims = (0, 0, 0, 0, 0)


def _mul(a: Dims, b: Dims, k: int = 1) -> Dims:
    return tuple(x + k * y for x, y in zip(a, b, strict=True))  # type: ignore[return-value]


_HZ = _mul(_ONE, _T, -1)
_N = (1, 1, -2, 0, 0)
_J = (2, 1, -2, 0, 0)
_W = (2, 1, -3, 0, 0)
_V = (2, 1, -3, -1, 0)
_OHM = (2, 1, -3, -2, 0)
_TESLA = (0, 1, -2, -1, 0)
_WB = (2, 1, -2, -1, 0)
_HENRY = (2, 1, -2, -2, 0)
_SIEMENS = (-2, -1, 3, 2, 0)

#: name -> (factor to SI, dimension). degC is handled apart: it is an offset unit.
UNITS: dict[str, tuple[float, Dims]] = {
    "m": (1.0, _L),
    "km": (1e3, _L),
    "cm": (1e-2, _L),
    "mm": (1e-3, _L),
    "um": (1e-6, _L),
    "µm": (1e-6, _L),
    "in": (0.0254, _L),
    "kg": (1.0, _M),
    "g": (1e-3, _M),
    "t": (1e3, _M),
    "s": (1.0, _T),
    "ms": (1e-3, _T),
    "min": (60.0, _T),
    "h": (3600.0, _T),
    "Hz": (1.0, _HZ),
    "kHz": (1e3, _HZ),
    # Revolutions per minute, stored as revolutions per second (a revolution counts as 1).
    "rpm": (1.0 / 60.0, _HZ),
    "r": (1.0, _ONE),  # a revolution, for 'r/min' (IEC 60034 writes speeds so)
    "A": (1.0, _I),
    "kA": (1e3, _I),
    "mA": (1e-3, _I),
    "V": (1.0, _V),
    "kV": (1e3, _V),
    "mV": (1e-3, _V),
    "W": (1.0, _W),
    "mW": (1e-3, _W),
    "kW": (1e3, _W),
    "MW": (1e6, _W),
    "VA": (1.0, _W),
    "kVA": (1e3, _W),
    "MVA": (1e6, _W),
    "J": (1.0, _J),
    "kJ": (1e3, _J),
    "N": (1.0, _N),
    "kN": (1e3, _N),
    "T": (1.0, _TESLA),
    "mT": (1e-3, _TESLA),
    # CGS units of magnet data sheets, by their SI correspondence: 1 G = 1e-4 T and
    # 1 Oe = 1000 / (4 pi) A/m.
    "G": (1e-4, _TESLA),
    "kG": (0.1, _TESLA),
    "Oe": (1e3 / (4.0 * math.pi), (-1, 0, 0, 1, 0)),
    "kOe": (1e6 / (4.0 * math.pi), (-1, 0, 0, 1, 0)),
    "Wb": (1.0, _WB),
    "mWb": (1e-3, _WB),
    "H": (1.0, _HENRY),
    "mH": (1e-3, _HENRY),
    "ohm": (1.0, _OHM),
    "Ω": (1.0, _OHM),
    "mohm": (1e-3, _OHM),
    "mΩ": (1e-3, _OHM),
    "S": (1.0, _SIEMENS),
    "MS": (1e6, _SIEMENS),
    "K": (1.0, _TH),
    "%": (1e-2, _ONE),
    "rad": (1.0, _ONE),
    "deg": (math.pi / 180.0, _ONE),
    "°": (math.pi / 180.0, _ONE),
}

_DEGC_OFFSET = 273.15
CELSIUS = ("degC", "°C", "℃")

#: Named dimensions: what a field may expect, with an example for error messages.
DIMENSIONS: dict[str, tuple[Dims, str]] = {
    "length": (_L, "0.45 mm"),
    "area": ((2, 0, 0, 0, 0), "1.2 mm^2"),
    "mass": (_M, "12 kg"),
    "time": (_T, "10 s"),
    "frequency": (_HZ, "50 Hz"),
    "speed": (_HZ, "1470 rpm"),
    "velocity": ((1, 0, -1, 0, 0), "12 m/s"),
    "current": (_I, "14.6 A"),
    "voltage": (_V, "400 V"),
    "power": (_W, "7.5 kW"),
    "energy": (_J, "1 kJ"),
    "torque": (_J, "48 N*m"),
    "pressure": ((-1, 1, -2, 0, 0), "20 kN/m^2"),
    "temperature": (_TH, "40 degC"),
    "temperature_difference": (_TH, "80 K"),
    "flux_density": (_TESLA, "0.8 T"),
    "magnetic_flux": (_WB, "5 mWb"),
    "field_strength": ((-1, 0, 0, 1, 0), "900 kA/m"),
    "current_density": ((-2, 0, 0, 1, 0), "5.5 A/mm^2"),
    "thermal_load": ((-3, 0, 0, 2, 0), "200 A^2/mm^3"),
    "resistance": (_OHM, "0.8 ohm"),
    "resistivity": ((3, 1, -3, -2, 0), "0.0172 ohm*mm^2/m"),
    "thermal_conductivity": ((1, 1, -3, 0, -1), "0.2 W/(m*K)"),
    "heat_transfer_coefficient": ((0, 1, -3, 0, -1), "12 W/(m^2*K)"),
    "density": ((-3, 1, 0, 0, 0), "7650 kg/m^3"),
    "specific_loss": ((2, 0, -3, 0, 0), "4 W/kg"),
    "per_temperature": ((0, 0, 0, 0, -1), "-0.12 %/K"),
    "dimensionless": (_ONE, "0.97"),
    "angle": (_ONE, "30 deg"),
}


class QuantityError(ValueError):
    """A quantity string that does not parse or has the wrong dimension."""


@dataclass(frozen=True)
class Quantity:
    """A parsed quantity: its SI value and dimension vector."""

    value: float
    dims: Dims


_NUMBER = re.compile(r"[+-]?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][+-]?[0-9]{1,3})?")
_TOKEN = re.compile(r"\s*(\*\*|[*/·()^²³]|-?[0-9]+|[A-Za-zµΩ°%]+[234]?)")


def describe(dims: Dims) -> str:
    """A readable name for a dimension vector, e.g. 'current (A)' or 'm^-1·A'."""
    for name, (d, _) in DIMENSIONS.items():
        if d == dims and name not in {"speed", "torque", "angle", "temperature_difference"}:
            return f"{name.replace('_', ' ')} ({_si(dims)})"
    return _si(dims)


def _si(dims: Dims) -> str:
    if dims == _ONE:
        return "dimensionless"
    parts = [b if e == 1 else f"{b}^{e}" for b, e in zip(BASE_UNITS, dims, strict=True) if e]
    return "·".join(parts)


class _UnitParser:
    def __init__(self, text: str) -> None:
        self.text = text
        self.tokens = [m.group(1) for m in self._scan(text)]
        self.pos = 0

    @staticmethod
    def _scan(text: str) -> list[re.Match[str]]:
        out, pos = [], 0
        while pos < len(text):
            m = _TOKEN.match(text, pos)
            if not m or m.end() == pos:
                if text[pos:].strip() == "":
                    break
                raise QuantityError(f"unexpected character {text[pos:].strip()[0]!r} in unit")
            out.append(m)
            pos = m.end()
        return out

    def peek(self) -> str | None:
        return self.tokens[self.pos] if self.pos < len(self.tokens) else None

    def take(self) -> str:
        tok = self.peek()
        if tok is None:
            raise QuantityError("unit ends too early")
        self.pos += 1
        return tok

    def parse(self) -> tuple[float, Dims]:
        factor, dims = 1.0, _ONE
        if self.peek() == "1":  # '1/K'
            self.take()
            if self.peek() != "/":
                raise QuantityError("a unit may start with '1' only as in '1/K'")
        else:
            factor, dims = self.factor(0)
        factor, dims = self.rest(factor, dims, 0)
        if self.peek() is not None:
            raise QuantityError(f"unexpected {self.peek()!r} in unit")
        return factor, dims

    def rest(self, factor: float, dims: Dims, depth: int) -> tuple[float, Dims]:
        while (tok := self.peek()) not in (None, ")"):
            sign = 1
            if tok in ("*", "·"):
                self.take()
            elif tok == "/":
                self.take()
                sign = -1
            f, d = self.factor(depth)
            factor *= f**sign
            dims = _mul(dims, d, sign)
            if not math.isfinite(factor) or factor == 0.0:
                raise QuantityError("unit factor out of range")
            if any(abs(e) > MAX_EXPONENT * 2 for e in dims):
                raise QuantityError("unit exponents too large for a physical quantity")
        return factor, dims

    def factor(self, depth: int) -> tuple[float, Dims]:
        tok = self.take()
        if tok == "(":
            if depth >= MAX_DEPTH:
                raise QuantityError("unit nests parentheses too deeply")
            f, d = self.factor(depth + 1)
            f, d = self.rest(f, d, depth + 1)
            if self.take() != ")":
                raise QuantityError("missing ')' in unit")
        elif tok in UNITS:
            f, d = UNITS[tok]
        elif tok[-1] in "234" and tok[:-1] in UNITS and self.peek() not in ("^", "**"):
            # 'mm2', as data sheets write mm^2
            f, d = UNITS[tok[:-1]]
            exp = int(tok[-1])
            return f**exp, _mul(_ONE, d, exp)
        elif tok in CELSIUS:
            raise QuantityError("degC stands only alone ('40 degC'); in a compound unit use K")
        else:
            raise QuantityError(f"unknown unit {tok!r}{_hint(tok)}")
        exp = self.exponent()
        dims = _mul(_ONE, d, exp)
        if any(abs(e) > MAX_EXPONENT * 2 for e in dims):
            raise QuantityError("unit exponents too large for a physical quantity")
        try:
            return f**exp, dims
        except OverflowError:
            raise QuantityError("unit factor out of range") from None

    def exponent(self) -> int:
        tok = self.peek()
        if tok in ("²", "³"):
            self.take()
            return 2 if tok == "²" else 3
        if tok not in ("^", "**"):
            return 1
        self.take()
        raw = self.take()
        if not re.fullmatch(r"-?\d+", raw) or abs(int(raw)) > MAX_EXPONENT or int(raw) == 0:
            raise QuantityError(
                f"unit exponent must be a whole number from -{MAX_EXPONENT} to {MAX_EXPONENT},"
                f" not {raw!r}"
            )
        if self.peek() in ("^", "**"):
            raise QuantityError("a unit exponent cannot itself have an exponent")
        return int(raw)


def _hint(tok: str) -> str:
    import difflib  # only on the error path

    if tok in ("C", "c", "deg_C", "degree_Celsius", "celsius", "Celsius"):
        return " (for a temperature write '40 degC'; for a difference, K)"
    names = [*UNITS, "degC"]
    same_letters = [n for n in names if n.lower() == tok.lower()]
    close = same_letters or difflib.get_close_matches(tok, names, n=1, cutoff=0.6)
    return f" (did you mean {close[0]!r}?)" if close else ""


@lru_cache(maxsize=512)
def parse_unit(unit: str) -> tuple[float, Dims]:
    """Factor to SI and dimension of a unit expression such as 'A/mm^2'."""
    return _UnitParser(unit).parse()


@lru_cache(maxsize=4096)
def parse_quantity(text: str) -> Quantity:
    """Parse '0.45 mm' into its SI value and dimension.

    Raises
    ------
    QuantityError
        On an unknown unit, an over-long or non-finite number, or a bad exponent.
    """
    s = text.strip()
    if len(s) > MAX_TEXT:
        raise QuantityError(f"quantity text longer than {MAX_TEXT} characters")
    m = _NUMBER.match(s)
    if not m:
        raise QuantityError("a quantity starts with a number, as in '0.45 mm'")
    if len(m.group(0)) > MAX_NUMBER:
        raise QuantityError(f"number longer than {MAX_NUMBER} characters")
    number = float(m.group(0))
    unit = s[m.end() :].strip()
    if unit in CELSIUS:
        value, dims = number + _DEGC_OFFSET, _TH
    elif unit:
        factor, dims = parse_unit(unit)
        value = number * factor
    else:
        value, dims = number, _ONE
    if not math.isfinite(value):
        raise QuantityError("value is not a finite number")
    return Quantity(value, dims)


def convert(text: str | float | int, expected: str) -> float:
    """Parse a record value and check it against a named dimension; return SI.

    Parameters
    ----------
    text : str or float or int
        The raw value from the record. Plain numbers are accepted only for dimensionless
        fields: a length written '0.45' might mean metres or millimetres.
    expected : str
        A key of :data:`DIMENSIONS`.
    """
    dims, example = DIMENSIONS[expected]
    label = expected.replace("_", " ")
    if isinstance(text, bool):
        raise QuantityError(f"expected a {label} such as '{example}', found a boolean")
    if isinstance(text, int | float):
        if dims != _ONE and not (text == 0 and expected != "temperature"):  # 0 is 0 in any unit
            raise QuantityError(
                f"expected a {label} with its unit, such as '{example}', found the bare number"
                f" {text!r}"
            )
        value = float(text)
        if not math.isfinite(value):
            raise QuantityError("value is not a finite number")
        return value
    if expected == "temperature_difference" and text.strip().endswith(CELSIUS):
        raise QuantityError(f"a temperature difference is given in K, such as '{example}'")
    q = parse_quantity(text)
    if q.dims != dims:
        raise QuantityError(
            f"expected a {label} such as '{example}', found {text!r}, which is a {describe(q.dims)}"
        )
    return q.value


@lru_cache(maxsize=256)
def unit_factor(unit: str) -> float:
    """Factor from ``unit`` to SI, for presenting SI values in a chosen unit."""
    return parse_unit(unit)[0]


def format_value(value_si: float, unit: str, digits: int = 4) -> str:
    """Present an SI value in ``unit`` with ``digits`` significant figures."""
    if unit in ("", "1"):
        return f"{value_si:.{digits}g}"
    if unit == "degC":
        return f"{value_si - _DEGC_OFFSET:.{digits}g} degC"
    return f"{value_si / unit_factor(unit):.{digits}g} {unit}"


#: Names of the SI units whose dimensions (m, kg, s, A, K) have one.
_NAMED_SI = {
    _TESLA: "T",
    _I: "A",
    _OHM: "ohm",
    _W: "W",
    _TH: "K",
    _WB: "Wb",
    _V: "V",
    _HENRY: "H",
    _J: "N*m",
    (-1, 1, -2, 0, 0): "Pa",
}


def si_unit(unit: str) -> str:
    """The SI unit of a display unit ('A/mm^2' -> 'A/m^2', 'kA/m' -> 'A/m', '%' -> '1'), in
    which the JSON outputs give values."""
    if unit in ("", "1"):
        return "1"
    if unit in CELSIUS:  # a display unit of absolute temperature: SI kelvin
        return "K"
    dims = parse_unit(unit)[1]
    if dims in _NAMED_SI:
        return _NAMED_SI[dims]
    parts = [b if e == 1 else f"{b}^{e}" for b, e in zip(BASE_UNITS, dims, strict=True) if e > 0]
    neg = [b if e == -1 else f"{b}^{-e}" for b, e in zip(BASE_UNITS, dims, strict=True) if e < 0]
    text = "*".join(parts) or "1"
    return f"{text}/{'/'.join(neg)}" if neg else text
