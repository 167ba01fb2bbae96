"""A record's numeric field as the record writes it, and the values a remedy may give it:
rounded away from the limit, or a standard wire size."""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

from emgate.fields import field_or_none, split_quantity
from emgate.terms import RecordPath

#: Nominal bare diameters of round enamelled winding wire [mm] from 0.1 to 5 mm: the R 20
#: preferred and R 40 intermediate sizes [mem: IEC 60317-0-1, table of nominal conductor
#: diameters; the R 40 series of ISO 3].
_R40 = (1.00, 1.06, 1.12, 1.18, 1.25, 1.32, 1.40, 1.50, 1.60, 1.70, 1.80, 1.90, 2.00, 2.12,
        2.24, 2.36, 2.50, 2.65, 2.80, 3.00, 3.15, 3.35, 3.55, 3.75, 4.00, 4.25, 4.50, 4.75,
        5.00, 5.30, 5.60, 6.00, 6.30, 6.70, 7.10, 7.50, 8.00, 8.50, 9.00, 9.50)  # fmt: skip
WIRE_DIAMETERS_MM: tuple[float, ...] = tuple(
    round(v * decade, 4) for decade in (0.1, 1.0) for v in _R40 if v * decade <= 5.0
)
WIRE_TABLE = "IEC 60317-0-1, from memory"

#: The insulated dimension of a strand that moves with each bare one.
INSULATED = {
    "bare_diameter": "insulated_diameter",
    "width": "insulated_width",
    "height": "insulated_height",
}


def _attr(model: Any, path: RecordPath) -> Any:
    for p in path:
        model = getattr(model, str(p), None)
    return model


@dataclass
class NumberField:
    """A numeric field as the record writes it: the number, its unit text, whole or not."""

    path: RecordPath
    number: float
    unit: str
    whole: bool
    raw: Any

    @classmethod
    def read(cls, data: Any, path: RecordPath, design: Any = None) -> NumberField | None:
        """The field at ``path`` of the raw record, or None where it is not a number; a
        count is one the validated ``design`` holds as an int (a float field may be
        written '4')."""
        raw = field_or_none(data, path)
        if isinstance(raw, int) and not isinstance(raw, bool):
            whole = design is None or isinstance(_attr(design, path), int)
            return cls(path, float(raw), "", whole, raw)
        split = split_quantity(raw)
        if split is None or split[1] in ("degC", "°C", "degF"):  # affine: not a factor
            return None
        return cls(path, split[0], split[1], False, raw)

    def text(self, number: float) -> Any:
        """The record value for ``number``, in the record's own style."""
        if self.whole:
            return int(number)
        if not self.unit and isinstance(self.raw, float):
            return float(number_text(number))
        return f"{number_text(number)} {self.unit}" if self.unit else number_text(number)


def number_text(x: float) -> str:
    """A number as a remedy writes it: six significant figures."""
    return f"{x:.6g}"


def round_away(x: float, up: bool, digits: int = 3) -> float:
    """``x`` rounded to ``digits`` significant figures, away from the limit."""
    if x == 0.0:
        return x
    scale = 10.0 ** (math.floor(math.log10(abs(x))) - digits + 1)
    q = x / scale
    q = math.ceil(q - 1e-9) if up else math.floor(q + 1e-9)
    return float(f"{q * scale:.{digits + 2}g}")
