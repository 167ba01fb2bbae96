"""The magnetic and electrical path of an induction machine over arrays of variants.

A sweep of a record's air gap, turns per coil and line current changes few inputs of the
calculation; the rest (slot geometry, winding factor, steels) is the nominal record's. This
module computes, for N variants at once, the sheet quantities of the magnetic circuit
(Carter's coefficient, effective gap, flux, gap flux density, tooth and yoke flux densities,
the iron's magnetic voltages, saturation factor, total MMF) and of the electrical path
(series turns, phase current, current density, electric loading, thermal load, copper area,
slot fill), by the kernel's own formulas on numpy arrays: the B-H lookups on arrays, the
yoke integrals in closed form on arrays, the tooth equation B_app = B + mu0 k_s H(B) solved
exactly on the segment of the steel's table that holds the root, as the scalar path does.

It takes the same inputs as :mod:`emgate.calc` and agrees with it to round-off (a test
holds it to 1e-9 relative over a random sample of valid variants); validation and the
rules stay on the scalar path (:mod:`emgate.variants`). Only induction machines, and only
these three fields, have this path.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np

from emgate.physics.bh import BHCurve, h_from_b
from emgate.physics.constants import MU0

if TYPE_CHECKING:
    from emgate.calc import Calculation

#: The fields this path takes as arrays (record paths).
FIELDS = ("air_gap", "winding.turns_per_coil", "rating.line_current")


@dataclass
class Nominal:
    """What the variants share, taken from the nominal record's scalar calculation."""

    calc: Calculation
    turns: float
    line_current: float

    @classmethod
    def of(cls, calc: Calculation) -> Nominal:
        if calc.d.machine != "induction":
            raise ValueError("the vectorised path covers induction machines only")
        return cls(calc, float(calc.d.winding.turns_per_coil), calc.d.rating.line_current)


def evaluate(
    nominal: Nominal, air_gap: np.ndarray, turns_per_coil: np.ndarray, line_current: np.ndarray
) -> dict[str, np.ndarray]:
    """Sheet quantities [SI] of N variants (arrays of equal length; turns whole numbers)."""
    from emgate.calc import Calculation, conductors, magnetic, winding
    from emgate.physics.currents import phase_current
    from emgate.physics.iron import (
        apparent_tooth_flux_density,
        real_tooth_flux_density,
        slot_flux_sharing_factor,
        yoke_magnetic_voltage,
    )

    c = nominal.calc
    d = c.d
    g = np.asarray(air_gap, dtype=float)
    t = np.asarray(turns_per_coil, dtype=float)
    i_line = np.asarray(line_current, dtype=float)
    # The gap sets Carter's coefficient and, through the rotor diameter, the rotor's slot
    # pitch, teeth and yoke: taken per distinct gap (a sweep has few) from the scalar path.
    gaps, where = np.unique(g, return_inverse=True)
    per_gap = [Calculation(d.model_copy(update={"air_gap": x}), c.catalogue) for x in gaps.tolist()]
    paths = [magnetic.pole_path(cu) for cu in per_gap]

    def gap_array(fn: Callable[[Any], float]) -> np.ndarray:
        return np.array([fn(p) for p in paths])[where]

    kc = np.array([magnetic.carter_coefficient(cu) for cu in per_gap])[where]
    eff_gap = kc * g
    # winding: N_ph is linear in the turns per coil (coils per phase over paths, a scalar)
    n_ph = winding.series_turns(c) / nominal.turns * t
    i_ph = np.asarray(phase_current(i_line, d.rating.connection, d.winding.phases))  # type: ignore[arg-type]
    kw = winding.winding_factor(c)
    path = paths[0]  # for what the gap leaves alone: pole pitch, stack, stator
    stator_curve, rotor_curve = magnetic.stator_steel(c), magnetic.rotor_steel(c)
    # induction_gap: the EMF sets the flux; a sinusoidal gap wave
    emf = (1.0 - 0.03) * winding.phase_voltage(c)
    flux = emf / (math.sqrt(2.0) * math.pi * d.rating.frequency * n_ph * kw)
    b_avg = flux / (path.pole_pitch * path.stack_length)
    b_peak = 0.5 * math.pi * b_avg
    flux_pole = b_peak * (2.0 / math.pi) * path.pole_pitch * path.stack_length
    out: dict[str, np.ndarray] = {}

    def teeth(
        pitch: Any, width: Any, height: Any, curve: BHCurve
    ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        geometry = (pitch, width, path.stack_length, path.iron_length, path.stacking_factor)
        # elementwise kernel functions, annotated for scalars
        b_app = np.asarray(apparent_tooth_flux_density(b_peak, *geometry))  # type: ignore[arg-type]
        ks = np.broadcast_to(slot_flux_sharing_factor(*geometry), b_app.shape)
        b_real = np.asarray(real_tooth_flux_density(b_app, ks, curve))
        return b_app, b_real, np.asarray(h_from_b(curve, b_real)) * height

    sth = path.stator_teeth
    st_app, st_b, st_mmf = teeth(sth.slot_pitch, sth.width, sth.height, stator_curve)
    rt_app, rt_b, rt_mmf = teeth(
        gap_array(lambda p: p.rotor_teeth.slot_pitch),
        gap_array(lambda p: p.rotor_teeth.width),
        gap_array(lambda p: p.rotor_teeth.height),
        rotor_curve,
    )
    ry_height = gap_array(lambda p: p.rotor_yoke.height)
    ry_path = gap_array(lambda p: p.rotor_yoke.path_length)
    sy_b = flux_pole / (2.0 * path.stacking_factor * path.iron_length * path.stator_yoke.height)
    ry_b = flux_pole / (2.0 * path.stacking_factor * path.iron_length * ry_height)
    sy_mmf = yoke_magnetic_voltage(sy_b, 0.5 * path.stator_yoke.path_length, stator_curve)  # type: ignore[arg-type]
    ry_mmf = yoke_magnetic_voltage(ry_b, 0.5 * ry_path, rotor_curve)  # type: ignore[arg-type]
    gap_mmf_ = b_peak * eff_gap / MU0
    out["air_gap.carter_coefficient"] = kc
    out["air_gap.effective_length"] = eff_gap
    out["air_gap.flux_density_peak"] = b_peak
    out["air_gap.flux_density_fundamental"] = b_peak * 1.0
    out["air_gap.flux_per_pole"] = flux_pole
    out["stator.tooth_flux_density_apparent"] = st_app
    out["stator.tooth_flux_density"] = st_b
    out["rotor.tooth_flux_density_apparent"] = rt_app
    out["rotor.tooth_flux_density"] = rt_b
    out["stator.yoke_flux_density"] = sy_b
    out["rotor.yoke_flux_density"] = ry_b
    out["magnetic.total_mmf"] = gap_mmf_ + (st_mmf + sy_mmf + ry_mmf + rt_mmf)
    out["air_gap.saturation_factor"] = (gap_mmf_ + (st_mmf + rt_mmf)) / gap_mmf_
    # electrical path
    area = conductors.strand_area(c)
    strands = d.winding.conductor.strands
    out["winding.series_turns"] = n_ph
    out["winding.phase_current"] = i_ph * np.ones_like(t)
    j = i_ph / (d.winding.parallel_paths * strands * area) * np.ones_like(t)
    out["stator.current_density"] = j
    loading = 2.0 * d.winding.phases * n_ph * i_ph / (math.pi * d.stator.bore_diameter)
    out["stator.electric_loading"] = loading
    out["stator.thermal_load"] = loading * j
    copper = d.winding.layers * t * strands * area
    out["stator.copper_area"] = copper
    out["stator.slot_fill"] = copper / conductors.slot_area(c)
    return out


def bench_vector_rates(
    evaluator: Any, n: int, rate: Callable[[Callable[[], int]], float]
) -> dict[str, tuple[float, str]]:
    """Rates for ``bench/bench.py``: the magnetic and electrical path of ``n`` variants,
    scalar (one calculation a variant, no validation) and vectorised, in the same run."""
    from emgate.calc import Calculation
    from emgate.validate import validate_design

    design = validate_design(evaluator.doc)
    if design.machine != "induction":
        return {}
    nominal = Nominal.of(Calculation(design, evaluator.catalogue))
    rng = np.random.default_rng(14)
    # a grid of 41 gaps (the geometry is taken once per distinct gap), random turns, current
    gap = design.air_gap * rng.choice(np.linspace(0.8, 1.2, 41), n)
    turns = rng.integers(int(nominal.turns) - 3, int(nominal.turns) + 4, n).astype(float)
    current = nominal.line_current * rng.uniform(0.9, 1.1, n)
    names = list(evaluate(nominal, gap[:2], turns[:2], current[:2]))
    designs = [
        design.model_copy(
            update={
                "air_gap": float(gap[k]),
                "winding": design.winding.model_copy(update={"turns_per_coil": int(turns[k])}),
                "rating": design.rating.model_copy(update={"line_current": float(current[k])}),
            }
        )
        for k in range(min(n, 400))
    ]

    def scalar() -> int:
        for dk in designs:
            ck = Calculation(dk, evaluator.catalogue)
            for name in names:
                ck.value(name)
        return len(designs)

    def vector() -> int:
        evaluate(nominal, gap, turns, current)
        return n

    s, v = rate(scalar), rate(vector)
    return {
        "magnetic + electrical path, scalar": (s, "variants/s"),
        f"magnetic + electrical path, vectorised ({n} a call)": (v, "variants/s"),
        "vectorised over scalar": (v / s, "x"),
    }
