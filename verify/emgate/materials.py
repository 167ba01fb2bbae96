"""The steel catalogue of a run: built-in grades plus the design repository's own tables."""

from __future__ import annotations

import difflib
import math

import numpy as np

from emgate.errors import InputError, InputErrors
from emgate.loader import Document
from emgate.model import AnyDesign
from emgate.model.materials import LossCurveTable, MaterialsFile
from emgate.physics.bh import BHCurve
from emgate.physics.iron_loss import LossCurve
from emgate.terms import RecordPath
from emgate.units import QuantityError, convert, parse_unit

#: No soft-magnetic steel has a relative permeability above this (grain-oriented sheet peaks
#: near 1e5; common practice, no source): a larger one is a unit slip in the table.
MAX_RELATIVE_PERMEABILITY = 1e6


#: A steel table's plausible ends, after the columns' units: no iron carries more than
#: 10 T (saturation polarisation near 2.1 T, the rest mu0 H), 1e8 A/m is beyond any pulsed
#: magnetiser, and a steel's mass density lies between 1000 and 20000 kg/m^3 (common
#: practice, no source).
MAX_TABLE_B = 10.0
MAX_TABLE_H = 1e8
DENSITY_RANGE = (1000.0, 20000.0)


def steel_table_problem(
    b: list[float], h: list[float], density: float
) -> tuple[RecordPath, str] | None:
    """The first implausible entry of a B-H table in SI, as (path under the grade, message)."""
    for row, (bi, hi) in enumerate(zip(b, h, strict=True)):
        if not (math.isfinite(bi) and math.isfinite(hi)) or abs(bi) > MAX_TABLE_B:
            return (
                ("points", row),
                f"point {row} has B = {bi:.4g} T: expected at most {MAX_TABLE_B:g} T"
                " (check the columns' units)",
            )
        if abs(hi) > MAX_TABLE_H:
            return (
                ("points", row),
                f"point {row} has H = {hi:.4g} A/m: expected at most {MAX_TABLE_H:g} A/m"
                " (check the columns' units)",
            )
    low, high = DENSITY_RANGE
    if density != 0.0 and not low <= density <= high:
        return (
            ("density",),
            f"expected a steel's mass density between {low:g} and {high:g} kg/m^3,"
            f" found {density:.4g} kg/m^3",
        )
    return None


def _permeabilities(curve: BHCurve) -> np.ndarray:
    from emgate.physics.constants import MU0

    return curve.b[1:] / (MU0 * curve.h[1:])


def problem_row(curve: BHCurve) -> int:
    mu = _permeabilities(curve)
    bad = np.flatnonzero((mu < 1.0) | (mu > MAX_RELATIVE_PERMEABILITY))
    return int(bad[0]) + 1 if bad.size else 0


def _implausible(curve: BHCurve) -> str | None:
    """A table no steel can have: B below mu0 H (negative polarisation), or a permeability
    beyond any soft-magnetic material."""
    mu = _permeabilities(curve)
    row = problem_row(curve)
    if not row:
        return None
    b, h = curve.b[row], curve.h[row]
    return (
        f"point {row} ({b:g} T at {h:g} A/m) has a relative permeability of"
        f" {mu[row - 1]:.3g}: a steel lies between 1 and {MAX_RELATIVE_PERMEABILITY:g}"
        " (check the columns' units)"
    )


def _loss_curves(columns: list[str], curves: list[LossCurveTable]) -> tuple[LossCurve, ...]:
    """Loss curves in SI from a materials file's table (QuantityError, ValueError)."""
    fb, db = parse_unit(columns[0])
    fp, dp = parse_unit(columns[1])
    if db != (0, 1, -2, -1, 0) or dp != (2, 0, -3, 0, 0):
        raise ValueError(
            "expected columns of flux density and specific loss, such as ['T', 'W/kg'],"
            f" found {list(columns)}"
        )
    out = []
    for entry in curves:
        pts = np.asarray(entry.points, dtype=float)
        out.append(LossCurve(entry.frequency, pts[:, 0] * fb, pts[:, 1] * fp))
    if len({c.frequency for c in out}) != len(out):
        raise ValueError("two curves of the loss table share a frequency")
    return tuple(out)


class Catalogue:
    """Steel grades by designation; repository tables shadow nothing (a clash is an error)."""

    def __init__(self) -> None:
        self.local: dict[str, tuple[BHCurve, str]] = {}
        self.failed: list[str] = []  # materials files that did not validate
        #: Measured loss tables by grade: the curves and their source.
        self.loss_tables: dict[str, tuple[tuple[LossCurve, ...], str]] = {}

    def add_file(self, doc: Document, materials: MaterialsFile) -> None:
        from emgate import steels

        errors: list[InputError] = []
        for name, table in materials.steels.items():
            at = ("steels", name)
            if steels.lookup(name) is not None or name in self.local:
                where = "built in" if name not in self.local else self.local[name][1]
                errors.append(
                    InputError(
                        f"steel grade {name!r} is already defined ({where});"
                        " give your table its own name",
                        doc.locate_key(at),
                    )
                )
                continue
            try:
                fb, db = parse_unit(table.columns[0])
                fh, dh = parse_unit(table.columns[1])
            except QuantityError as exc:
                errors.append(InputError(str(exc), doc.locate((*at, "columns"))))
                continue
            if db != (0, 1, -2, -1, 0) or dh != (-1, 0, 0, 1, 0):
                errors.append(
                    InputError(
                        "expected columns of flux density and field strength, such as ['T', 'A/m'],"
                        f" found {list(table.columns)}",
                        doc.locate((*at, "columns")),
                    )
                )
                continue
            try:
                density = convert(table.density, "density") if table.density else 0.0
            except QuantityError as exc:
                errors.append(InputError(str(exc), doc.locate((*at, "density"))))
                continue
            pts = np.asarray(table.points, dtype=float)
            implausible = steel_table_problem(list(pts[:, 0] * fb), list(pts[:, 1] * fh), density)
            if implausible:
                errors.append(InputError(implausible[1], doc.locate((*at, *implausible[0]))))
                continue
            try:
                curve = BHCurve(name, pts[:, 0] * fb, pts[:, 1] * fh, table.source, density)
            except ValueError as exc:
                errors.append(InputError(str(exc), doc.locate((*at, "points"))))
                continue
            problem = _implausible(curve)
            if problem:
                errors.append(InputError(problem, doc.locate((*at, "points", problem_row(curve)))))
                continue
            if table.losses is not None:
                try:
                    self.loss_tables[name] = (
                        _loss_curves(table.losses.columns, table.losses.curves),
                        table.losses.source,
                    )
                except (QuantityError, ValueError) as exc:
                    errors.append(InputError(str(exc), doc.locate((*at, "losses"))))
                    continue
            self.local[name] = (curve, str(doc.locate_key(at)))
        if errors:
            raise InputErrors(errors)

    def loss_table(self, name: str) -> tuple[tuple[LossCurve, ...], str] | None:
        """The measured loss curves of a repository grade and their source, if given."""
        return self.loss_tables.get(name)

    def get(self, name: str) -> BHCurve | None:
        from emgate import steels

        if name in self.local:
            return self.local[name][0]
        return steels.lookup(name)

    def names(self) -> list[str]:
        from emgate import steels

        return sorted({*steels.builtin_grades(), *self.local})

    def resolve(self, doc: Document, design: AnyDesign) -> None:
        """Check that every steel the design names exists; InputErrors otherwise (then
        :func:`emgate.plausible.plausible_calculation` checks the record with them)."""
        refs = [(("stator", "steel"), design.stator.steel)]
        if design.rotor.steel is not None:
            refs.append((("rotor", "steel"), design.rotor.steel))
        errors = []
        for path, name in refs:
            if self.get(name) is None:
                close = difflib.get_close_matches(name, self.names(), n=1, cutoff=0.6)
                hint = f"; did you mean {close[0]!r}?" if close else ""
                errors.append(
                    InputError(
                        f"unknown steel grade {name!r}{hint} (built in: {', '.join(self.names())};"
                        " add others in a materials file)",
                        doc.locate(path),
                    )
                )
        if errors:
            raise InputErrors(errors)
