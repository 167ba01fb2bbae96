"""The JSON Schema pattern of a quantity of one dimension: the number and the units of that
dimension emgate reads, so that an editor flags ``air_gap: 3 A`` or ``-0.45 mm`` as emgate does.

The units are the whitelist's symbols of the dimension (with ``^2``/``^3`` or ``2``/``3``
powers); for a dimension without a symbol of its own, the quotients and products of two
everyday symbols that have it ("A/mm^2", "kA/m", "%/K"); and the compounds of :data:`EXTRA`
("N*m", "r/min"). emgate's parser reads any product and quotient; another compound ("J/N"
for a length) is not in the pattern (the agreement test lists that case).
Exponents of the number have at most two digits: a value of 1e100 in any unit is outside
every plausible range, and 1e400 is not a number.
"""

from __future__ import annotations

import re
from functools import cache

from emgate.units import CELSIUS, DIMENSIONS, UNITS, Dims

_ONE: Dims = (0, 0, 0, 0, 0)
#: Compounds of three symbols that data sheets and handbooks write.
EXTRA = {
    "resistivity": ("ohm*mm^2/m", "ohm*mm2/m", "ohm*m"),
    "thermal_conductivity": ("W/(m*K)",),
    "heat_transfer_coefficient": ("W/(m^2*K)", "W/(m2*K)"),
    "torque": ("N*m", "kN*m"),
    "frequency": ("r/min", "r/s"),
    "speed": ("r/min", "r/s"),
    "flux_density": ("Wb/m^2",),
}
#: Symbols that stand in compounds: the everyday ones, so the pattern stays readable.
_COMPOUND = (
    "m", "mm", "cm", "km", "um", "in", "kg", "g", "s", "min", "h", "A", "kA", "mA", "V", "kV",
    "W", "kW", "J", "N", "kN", "T", "mT", "Wb", "H", "mH", "ohm", "K", "%", "r", "rad", "deg",
)  # fmt: skip


def _scaled(d: Dims, n: int) -> Dims:
    return tuple(n * x for x in d)  # type: ignore[return-value]


def _sub(a: Dims, b: Dims, k: int = -1) -> Dims:
    return tuple(x + k * y for x, y in zip(a, b, strict=True))  # type: ignore[return-value]


def _tokens(names: tuple[str, ...] | list[str]) -> dict[str, Dims]:
    out: dict[str, Dims] = {}
    for name in names:
        d = UNITS[name][1]
        out[name] = d
        if d != _ONE:
            for n in (2, 3):
                out[f"{name}^{n}"] = out[f"{name}{n}"] = _scaled(d, n)
    return out


@cache
def unit_spellings(dimension: str) -> tuple[str, ...]:
    """The unit texts the pattern of ``dimension`` accepts, simple symbols first."""
    target = DIMENSIONS[dimension][0]
    simple = [t for t, d in _tokens(list(UNITS)).items() if d == target]
    if dimension == "temperature":
        simple += list(CELSIUS)
    compound = _tokens(_COMPOUND)
    quotients = [
        f"{a}/{b}"
        for a, da in compound.items()
        for b, db in compound.items()
        if db != _ONE and _sub(da, db) == target and ("^" in a or not a[-1].isdigit())
    ]
    products = [
        f"{a}*{b}"
        for a, da in compound.items()
        for b, db in compound.items()
        if da != _ONE and db != _ONE and _sub(da, db, 1) == target and a < b
    ]
    si_symbol = {n for n, (f, d) in UNITS.items() if d == target and f == 1.0}
    if si_symbol or dimension in ("dimensionless", "angle"):
        quotients = products = []  # 'm', not 'J/N'; 'T', not 'Wb/m^2'; '%', not 'm/mm'
    return tuple(dict.fromkeys([*simple, *quotients, *products, *EXTRA.get(dimension, ())]))


def _unit_regex(unit: str) -> str:
    parts = re.split(r"([*/()])", unit)
    return r"\s*".join(re.escape(p) if p not in "*" else r"[*·]" for p in parts if p)


def number_regex(sign: str) -> str:
    """A number as emgate reads it: '+' or (for ``sign`` "any") '-' in front; a positive
    one has a non-zero digit; an exponent of at most two digits."""
    lead = r"[-+]?" if sign == "any" else r"\+?"
    nonzero = r"(?=[0-9.]*[1-9])" if sign == "positive" else ""
    return lead + nonzero + r"(\d+(\.\d*)?|\.\d+)([eE][-+]?\d{1,2})?"


@cache
def quantity_pattern(dimension: str, sign: str) -> str:
    """The pattern of a quantity text of ``dimension``: number, optional space, a unit of
    that dimension (for "dimensionless" the unit is optional)."""
    units = sorted(unit_spellings(dimension), key=lambda u: (-len(u), u))
    alternatives = "|".join(_unit_regex(u) for u in units)
    unit = f"({alternatives})" + ("?" if dimension == "dimensionless" else "")
    return rf"^\s*{number_regex(sign)}\s*{unit}\s*$"
