"""The steel catalogue of a run: built-in grades plus the design repository's own tables."""

from __future__ import annotations

import difflib

import numpy as np

from emgate.errors import InputError, InputErrors
from emgate.loader import Document
from emgate.model import AnyDesign, MaterialsFile
from emgate.physics.bh import BHCurve
from emgate.units import QuantityError, convert, parse_unit


class Catalogue:
    """Steel grades by designation; repository tables shadow nothing (a clash is an error)."""

    def __init__(self) -> None:
        self.local: dict[str, tuple[BHCurve, str]] = {}
        self.failed: list[str] = []  # materials files that did not validate

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
            pts = np.asarray(table.points, dtype=float)
            try:
                density = convert(table.density, "density") if table.density else 0.0
                curve = BHCurve(name, pts[:, 0] * fb, pts[:, 1] * fh, table.source, density)
            except (ValueError, QuantityError) as exc:
                errors.append(InputError(str(exc), doc.locate((*at, "points"))))
                continue
            self.local[name] = (curve, str(doc.locate_key(at)))
        if errors:
            raise InputErrors(errors)

    def get(self, name: str) -> BHCurve | None:
        from emgate import steels

        if name in self.local:
            return self.local[name][0]
        return steels.lookup(name)

    def names(self) -> list[str]:
        from emgate import steels

        return sorted({*steels.builtin_grades(), *self.local})

    def resolve(self, doc: Document, design: AnyDesign) -> None:
        """Check that every steel the design names exists (InputErrors otherwise)."""
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
