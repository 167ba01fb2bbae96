"""The scalar path of the B-H lookups (plain floats, for the magnetic circuit of one record)
gives the same numbers as the array path (numpy.interp, a general-purpose reference)."""

from __future__ import annotations

import numpy as np
import pytest

from emgate import steels
from emgate.physics.bh import BHCurve, b_from_h, h_from_b


@pytest.mark.parametrize("grade", ["M400-50A", "M270-35A", "M800-65A"])
def test_scalar_lookup_equals_numpy_interp(grade: str) -> None:
    curve = steels.lookup(grade)
    assert isinstance(curve, BHCurve)
    rng = np.random.default_rng(14)
    # random points inside and beyond the table, the table's own points, zero, and points
    # past the 100 T the array path's table is extended by along the straight line
    far = curve.b[-1] + np.array([99.0, 101.0, 1e4])
    bs = np.concatenate([rng.uniform(-3.0, 3.0, 2000), curve.b, -curve.b, [0.0], far, -far])
    hs = np.concatenate([rng.uniform(-4e5, 4e5, 2000), curve.h, -curve.h, [0.0]])
    h_array = h_from_b(curve, bs)
    b_array = b_from_h(curve, hs)
    h_scalar = np.array([h_from_b(curve, float(b)) for b in bs])
    b_scalar = np.array([b_from_h(curve, float(h)) for h in hs])
    # the same formula in the same order inside the table; beyond it the array path
    # interpolates along the line's extension (its slope rounded once): 1e-12 relative
    # allows for that and for a compiler's fused multiply-add in numpy's loop
    np.testing.assert_allclose(h_scalar, h_array, rtol=1e-12, atol=0.0)
    np.testing.assert_allclose(b_scalar, b_array, rtol=1e-12, atol=0.0)
    assert all(type(h_from_b(curve, float(b))) is float for b in bs[:10])
