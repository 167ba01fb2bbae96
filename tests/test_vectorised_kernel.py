"""The vectorised magnetic and electrical path (emgate.vector) agrees with the scalar
calculation, the reference here, to 1e-9 relative over a random sample of valid variants."""

from __future__ import annotations

import math

import numpy as np
import pytest

from conftest import PUMP
from emgate.calc import Calculation
from emgate.discovery import discover_materials
from emgate.loader import load
from emgate.validate import validate_design
from emgate.vector import Nominal, evaluate


def nominal_of(overrides: dict[str, object]) -> tuple[Calculation, object]:
    doc = load(PUMP)
    data = doc.data
    for key, value in overrides.items():
        node = data
        *parents, last = key.split(".")
        for part in parents:
            node = node[part]
        node[last] = value
    design = validate_design(doc)
    return Calculation(design, discover_materials(PUMP)), design


@pytest.mark.parametrize(
    "base",
    [
        {},
        {"stator.steel": "M270-35A", "stator.stack_length": "120 mm"},
        {"stator.steel": "M800-65A", "rating.line_voltage": "440 V"},
    ],
)
def test_the_vectorised_path_agrees_with_the_scalar_calculation(base: dict[str, object]) -> None:
    calc, design = nominal_of(base)
    nominal = Nominal.of(calc)
    rng = np.random.default_rng(9)
    n = 60
    gap = design.air_gap * rng.uniform(0.7, 1.4, n)  # type: ignore[attr-defined]
    turns = rng.integers(15, 26, n).astype(float)
    current = design.rating.line_current * rng.uniform(0.8, 1.2, n)  # type: ignore[attr-defined]
    vector = evaluate(nominal, gap, turns, current)
    assert len(vector) >= 20
    for k in range(n):
        # the scalar reference goes through the model, as a record with these values would
        scalar, _ = nominal_of(
            {
                **base,
                "air_gap": f"{float(gap[k])!r} m",
                "winding.turns_per_coil": int(turns[k]),
                "rating.line_current": f"{float(current[k])!r} A",
            }
        )
        for name, values in vector.items():
            # the same formulas on the same numbers; 1e-9 relative leaves room for a
            # summation order of the yoke integral and the tooth solver's last bit
            assert math.isclose(values[k], scalar.value(name), rel_tol=1e-9), (name, k)


def test_other_machine_kinds_have_no_vectorised_path() -> None:
    from conftest import SERVO

    doc = load(SERVO)
    calc = Calculation(validate_design(doc), discover_materials(SERVO))
    with pytest.raises(ValueError, match="induction"):
        Nominal.of(calc)
