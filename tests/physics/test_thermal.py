"""Checks of emgate.physics.convection and emgate.physics.thermal against ht, fluids, handbook
values and closed forms."""

from __future__ import annotations

import math
from collections.abc import Callable
from typing import Any

import numpy as np
import pytest
from fluids.atmosphere import ATMOSPHERE_1976
from ht.conv_external import (
    Nu_horizontal_plate_laminar_Baehr,
    Nu_horizontal_plate_turbulent_Kreith,
    Nu_horizontal_plate_turbulent_Schlichting,
)
from ht.conv_free_immersed import Nu_horizontal_cylinder_Churchill_Chu
from scipy.constants import g as scipy_g
from scipy.constants import sigma as scipy_sigma

from emgate.physics import convection, slots
from emgate.physics.thermal import winding_temperature_rise
from emgate.physics.thermal_inputs import COOLING_METHODS, StatorThermalGeometry, ThermalParameters

MM = 1e-3


def air_1976(temperature: float) -> tuple[float, float, float]:
    """rho, mu, k of air at sea-level pressure from the fluids package (USSA 1976)."""
    atm = ATMOSPHERE_1976(0.0, dT=temperature - 288.15)
    return atm.rho, atm.mu, atm.k


# --- air properties --------------------------------------------------------------------------


@pytest.mark.parametrize("temperature", [250.0, 300.0, 350.0, 400.0])
def test_air_against_fluids_1976(temperature: float) -> None:
    rho, mu, k = air_1976(temperature)
    air = convection.air_properties(temperature)
    # Same USSA 1976 relations coded independently: float rounding only, 1e-9.
    assert air.viscosity == pytest.approx(mu, rel=1e-9)
    assert air.conductivity == pytest.approx(k, rel=1e-9)
    # Ideal gas with the 1976 constants; 1e-6 covers gas-constant digits.
    assert air.density == pytest.approx(rho, rel=1e-6)


@pytest.mark.parametrize(
    ("temperature", "rho", "mu", "k", "pr"),
    [
        # [mem: Bergman, Lavine, Incropera, DeWitt, Introduction to Heat Transfer, Table A.4]
        (300.0, 1.1614, 184.6e-7, 26.3e-3, 0.707),
        (350.0, 0.9950, 208.2e-7, 30.0e-3, 0.700),
    ],
)
def test_air_against_handbook_table(
    temperature: float, rho: float, mu: float, k: float, pr: float
) -> None:
    air = convection.air_properties(temperature)
    # The table and the closed forms come from different data fits: 2 % apart at most.
    assert air.density == pytest.approx(rho, rel=0.02)
    assert air.viscosity == pytest.approx(mu, rel=0.02)
    assert air.conductivity == pytest.approx(k, rel=0.02)
    assert air.prandtl == pytest.approx(pr, rel=0.02)


# --- correlations against ht -----------------------------------------------------------------


@pytest.mark.parametrize("prandtl", [0.7, 7.0, 100.0])
@pytest.mark.parametrize("rayleigh", [1e-3, 1.0, 1e4, 1e7, 1e9, 1e12])
def test_churchill_chu_against_ht(rayleigh: float, prandtl: float) -> None:
    # Churchill and Chu (1975), horizontal cylinder, coded independently in ht; ht takes
    # Gr = Ra / Pr. Same closed form: float rounding only, 1e-12.
    expected = Nu_horizontal_cylinder_Churchill_Chu(prandtl, rayleigh / prandtl)
    assert convection.nusselt_horizontal_cylinder(rayleigh, prandtl) == pytest.approx(
        expected, rel=1e-12
    )


def test_churchill_chu_textbook_example() -> None:
    # [mem: Bergman et al., Introduction to Heat Transfer 6e, Example 9.2, quoted in ht's
    # documentation]: Pr 0.69, Gr 2.63e9 -> Nu 139.13; the example is given to 5 figures.
    assert convection.nusselt_horizontal_cylinder(0.69 * 2.63e9, 0.69) == pytest.approx(
        139.13, rel=1e-4
    )


@pytest.mark.parametrize("prandtl", [0.7, 2.0, 7.0])
@pytest.mark.parametrize("reynolds", [1e3, 1e4, 1e5, 4e5])
def test_laminar_flat_plate_against_ht(reynolds: float, prandtl: float) -> None:
    # Pohlhausen 0.664 Re^0.5 Pr^(1/3): ht's Baehr correlation uses it for 0.6 < Pr < 10.
    expected = Nu_horizontal_plate_laminar_Baehr(reynolds, prandtl)
    assert convection.nusselt_flat_plate_laminar(reynolds, prandtl) == pytest.approx(
        expected, rel=1e-12
    )


@pytest.mark.parametrize("reynolds", [1e4, 1e5, 3e5, 1e6])
def test_turbulent_flat_plate_against_ht(reynolds: float) -> None:
    pr = 0.71
    # Kreith, Manglik, Bohn, turbulent from the leading edge: same closed form in ht, 1e-12.
    kreith = Nu_horizontal_plate_turbulent_Kreith(reynolds, pr)
    assert convection.nusselt_flat_plate_turbulent(reynolds, pr) == pytest.approx(kreith, rel=1e-12)
    # An independent correlation (Schlichting / Petukhov form in ht): the two published fits
    # agree within 10 % for air from Re 1e4 to 1e6.
    schlichting = Nu_horizontal_plate_turbulent_Schlichting(reynolds, pr)
    assert convection.nusselt_flat_plate_turbulent(reynolds, pr) == pytest.approx(
        schlichting, rel=0.10
    )


def test_forced_coefficient_takes_laminar_floor() -> None:
    # At Re ~ 3e3 the turbulent fit falls below the laminar one; the laminar value is kept.
    air = convection.air_properties(320.0)
    length, velocity = 0.05, 3e3 * air.kinematic_viscosity / 0.05
    h = convection.forced_convection_coefficient(length, velocity, 340.0, 300.0)
    re = velocity * length / air.kinematic_viscosity
    lam = Nu_horizontal_plate_laminar_Baehr(re, air.prandtl) * air.conductivity / length
    assert h == pytest.approx(lam, rel=1e-9)  # same properties, float rounding


# --- the network -----------------------------------------------------------------------------


def demo_geometry(**overrides: float) -> StatorThermalGeometry:
    """Demo stator of the design notes (invented data)."""
    dims = (2.8 * MM, 0.8 * MM, 1.5 * MM, 6.0 * MM, 8.6 * MM, 16 * MM)
    values: dict = {
        "bore_diameter": 0.136,
        "outer_diameter": 0.210,
        "stack_length": 0.140,
        "slots": 36,
        "slot_depth": 16 * MM,
        "winding_area": slots.semi_closed_slot_area(*dims),
        "winding_height": slots.semi_closed_winding_height(0.8 * MM, 1.5 * MM, 16 * MM),
        "winding_perimeter": slots.semi_closed_slot_perimeter(*dims[1:]),
        "liner_thickness": 0.25 * MM,
        "stacking_factor": 0.97,
        "frame_length": 0.25,
    }
    values.update(overrides)
    return StatorThermalGeometry(**values)


@pytest.mark.parametrize("method", COOLING_METHODS)
def test_rise_is_the_sum_along_the_path(method: str) -> None:
    est = winding_temperature_rise(400.0, demo_geometry(), method, other_losses=150.0)
    # [calc] series chain: rise = sum of R_i P_i; the heat after the injection node is P + 150.
    path = sum(s.resistance * s.heat for s in est.steps)
    assert est.winding_rise == pytest.approx(path, rel=1e-12)  # float summation only
    assert est.winding_temperature == pytest.approx(313.15 + est.winding_rise, rel=1e-12)
    assert est.steps[0].heat == 400.0
    if method != "direct_liquid":
        assert est.steps[-1].heat == pytest.approx(550.0, rel=1e-12)
    assert all(s.resistance > 0 for s in est.steps)


def test_natural_surface_against_ht_and_fluids() -> None:
    """At the solved frame temperature, ht's Churchill-Chu with fluids' air properties plus
    grey-body radiation (scipy's sigma) reproduce the surface resistance."""
    geom = demo_geometry()
    est = winding_temperature_rise(150.0, geom, "enclosed_natural", other_losses=50.0)
    surface = est.steps[-1]
    assert surface.name == "frame surface"
    t_c = 313.15
    t_s = t_c + surface.rise
    film = 0.5 * (t_s + t_c)
    rho, mu, k = air_1976(film)
    pr = mu * 1007.0 / k  # cp [mem: Bergman et al., Table A.4]
    d = 0.210 + 2 * 6e-3  # core diameter plus two default frame walls
    gr = scipy_g * (t_s - t_c) / film * d**3 / (mu / rho) ** 2
    h_c = Nu_horizontal_cylinder_Churchill_Chu(pr, gr) * k / d
    h_r = 0.9 * scipy_sigma * (t_s**2 + t_c**2) * (t_s + t_c)
    area = math.pi * d * 0.25
    # 1e-5: gas-constant and sigma digits differ between the sources by ~1e-6.
    assert surface.resistance * (h_c + h_r) * area == pytest.approx(1.0, rel=1e-5)
    assert est.convection_coefficient == pytest.approx(h_c, rel=1e-5)
    assert est.radiation_coefficient == pytest.approx(h_r, rel=1e-5)
    # Free convection of gases 2-25 W/(m^2 K) [mem: Bergman et al., Table 1.1].
    assert 2.0 < h_c < 25.0


def test_fan_surface_against_ht() -> None:
    par = ThermalParameters(fin_area_factor=3.0, fin_efficiency=0.8, air_velocity=8.0)
    est = winding_temperature_rise(400.0, demo_geometry(), "enclosed_fan", parameters=par)
    surface = est.steps[-1]
    t_c = 313.15
    t_s = t_c + surface.rise
    film = 0.5 * (t_s + t_c)
    rho, mu, k = air_1976(film)
    re = 8.0 * 0.25 * rho / mu
    h_c = Nu_horizontal_plate_turbulent_Kreith(re, mu * 1007.0 / k) * k / 0.25
    h_r = 0.9 * scipy_sigma * (t_s**2 + t_c**2) * (t_s + t_c)
    envelope = math.pi * (0.210 + 12e-3) * 0.25
    conductance = h_c * envelope * (1 + 2.0 * 0.8) + h_r * envelope
    # 1e-5 as above: property-constant digits only.
    assert surface.resistance * conductance == pytest.approx(1.0, rel=1e-5)
    # Forced convection of gases 25-250 W/(m^2 K) [mem: Bergman et al., Table 1.1].
    assert 25.0 < est.convection_coefficient < 250.0


def test_jacket_and_conduction_closed_forms() -> None:
    par = ThermalParameters(jacket_coefficient=3000.0, coolant_capacity_rate=200.0)
    est = winding_temperature_rise(500.0, demo_geometry(), "liquid_jacket", parameters=par)
    r = est.resistances
    d_f = 0.210 + 12e-3
    # [calc] film 1/(h pi D L); yoke ln(r_o/r_b)/(2 pi k kFe L); liner t/(k Q P L);
    # coolant mean rise 1/(2C).
    assert r["frame surface"] == pytest.approx(1 / (3000.0 * math.pi * d_f * 0.25), rel=1e-12)
    yoke = math.log(0.105 / (0.068 + 0.016)) / (2 * math.pi * 25.0 * 0.97 * 0.14)
    assert r["stator yoke"] == pytest.approx(yoke, rel=1e-12)
    perim = slots.semi_closed_slot_perimeter(0.8 * MM, 1.5 * MM, 6 * MM, 8.6 * MM, 16 * MM)
    liner = 0.25e-3 / (0.15 * 36 * perim * 0.14)
    assert r["slot liner"] == pytest.approx(liner, rel=1e-12)
    assert r["coolant"] == pytest.approx(1 / 400.0, rel=1e-12)
    # Doubling h halves the film resistance [calc].
    par2 = ThermalParameters(jacket_coefficient=6000.0, coolant_capacity_rate=200.0)
    est2 = winding_temperature_rise(500.0, demo_geometry(), "liquid_jacket", parameters=par2)
    assert est2.resistances["frame surface"] == pytest.approx(r["frame surface"] / 2, rel=1e-12)


def test_bundle_resistance_against_finite_differences() -> None:
    """Mean rise of a slab with uniform heat, cooled on both faces, by finite differences."""
    geom = demo_geometry()
    power = 400.0
    est = winding_temperature_rise(power, geom, "liquid_jacket")
    width = geom.winding_area / geom.winding_height
    k = 0.6
    volume = geom.winding_area * geom.stack_length * geom.slots
    q = power / volume
    n = 2001
    x = np.linspace(0.0, width, n)
    dx = x[1] - x[0]
    # -k T'' = q with T = 0 at both faces (second-order central differences).
    main = np.full(n - 2, 2.0)
    off = np.full(n - 3, -1.0)
    a = np.diag(main) + np.diag(off, 1) + np.diag(off, -1)
    t_inner = np.linalg.solve(a, np.full(n - 2, q * dx**2 / k))
    t = np.concatenate([[0.0], t_inner, [0.0]])
    mean = float(np.sum(0.5 * (t[1:] + t[:-1])) * dx / width)  # trapezoid rule
    bundle = est.steps[0]
    # Central differences are exact for a parabola; trapezoid mean errs by O(dx^2): 1e-5.
    assert bundle.rise == pytest.approx(mean, rel=1e-5)


def test_cooling_ranking_and_monotonicity() -> None:
    geom = demo_geometry()
    rises = {
        m: winding_temperature_rise(300.0, geom, m, other_losses=100.0).winding_rise
        for m in COOLING_METHODS
    }
    # Physical ordering of the default methods [cp]: liquid beats forced air beats still air.
    assert rises["liquid_jacket"] < rises["enclosed_fan"] < rises["enclosed_natural"]
    # More loss, more rise; the free-convection surface is nonlinear, so not proportional.
    low = winding_temperature_rise(100.0, geom, "enclosed_natural").winding_rise
    high = winding_temperature_rise(200.0, geom, "enclosed_natural").winding_rise
    assert low < high < 2.0 * low  # h grows with dT (Ra^(1/4) to ^(1/3), radiation ~T^3)


def test_zero_loss_and_validation() -> None:
    est = winding_temperature_rise(0.0, demo_geometry(), "enclosed_natural")
    assert est.winding_rise == 0.0
    with pytest.raises(ValueError):
        winding_temperature_rise(100.0, demo_geometry(), "immersion")  # type: ignore[arg-type]
    with pytest.raises(ValueError):
        winding_temperature_rise(-1.0, demo_geometry(), "enclosed_fan")


def test_radiation_coefficient_linearisation() -> None:
    # [calc] h_r dT equals eps sigma (Ts^4 - Tsur^4) exactly (difference of fourth powers).
    ts, tsur = 380.0, 313.15
    h_r = convection.radiation_coefficient(0.9, ts, tsur)
    assert h_r * (ts - tsur) == pytest.approx(0.9 * scipy_sigma * (ts**4 - tsur**4), rel=1e-9)


@pytest.mark.parametrize(
    "conductance",
    [
        lambda r: 40.0,  # a liquid film: constant
        lambda r: 12.0 * (1.0 + 0.02 * r) ** 0.25 + 0.3,  # free convection rising with dT
        lambda r: 55.0 / (1.0 + 1e-3 * r),  # a forced film falling a little as the air warms
        lambda r: 55.0 / (1.0 + 0.05 * r),  # falling faster: the bracket must widen
    ],
    ids=["constant", "rising", "falling-slightly", "falling"],
)
@pytest.mark.parametrize("heat", [1e-3, 35.0, 900.0])
def test_surface_rise_matches_brentq(conductance: Any, heat: float) -> None:
    # [calc] external check: scipy.optimize.brentq on dT G(dT) = heat. Tolerance 1e-11
    # relative: both solve to about 1e-12 of the root.
    from scipy.optimize import brentq

    from emgate.physics.thermal import _solve_surface_rise

    expected = brentq(lambda r: r * conductance(r) - heat, 0.0, 1e5, xtol=1e-14, rtol=1e-14)
    assert _solve_surface_rise(heat, conductance) == pytest.approx(expected, rel=1e-11)


@pytest.mark.parametrize(
    "conductance",
    [
        lambda r: 50.0 * (1.0 + 0.05 * r) ** 0.25,  # a free-convection film: G grows
        lambda r: 50.0 * (1.0 - 2e-4 * r),  # a forced film in warming air: G falls a little
    ],
    ids=["G rising", "G falling"],
)
@pytest.mark.parametrize("ratio", [1.0, 1.3, 0.7, 40.0, 0.02])
def test_a_surface_solve_from_a_near_solution_finds_the_root(
    conductance: Callable[[float], float], ratio: float
) -> None:
    # [calc] external check: scipy.optimize.brentq on dT G(dT) = heat, to 1e-14; the near
    # solution is the root for 300 W. Where G rises, the rise scaled from it and heat / G
    # there bracket the root; where G falls, both lie on one side and the margin's step
    # closes the bracket. 1e-11 relative: the solver's tolerance is about 1e-12.
    from scipy.optimize import brentq

    from emgate.physics.thermal import _solve_surface_rise

    def root(heat: float) -> float:
        return brentq(lambda r: r * conductance(r) - heat, 0.0, 2000.0, xtol=1e-14, rtol=1e-14)

    near = (300.0, root(300.0))
    heat = 300.0 * ratio
    assert _solve_surface_rise(heat, conductance, near) == pytest.approx(root(heat), rel=1e-11)


def test_a_surface_that_cannot_shed_the_heat_is_refused() -> None:
    # [calc] dT G(dT) with G = 55 / (1 + 0.05 dT) W/K tends to 1100 W as dT grows: 2000 W
    # has no finite rise, and the solver says so rather than return a bound.
    from emgate.physics.thermal import _solve_surface_rise

    with pytest.raises(ValueError, match="cannot shed"):
        _solve_surface_rise(2000.0, lambda r: 55.0 / (1.0 + 0.05 * r))


@pytest.mark.parametrize("method", ["enclosed_natural", "enclosed_fan", "open_ventilated"])
@pytest.mark.parametrize("ratio", [1.0, 1.07, 0.93, 20.0, 0.05], ids=lambda r: f"heat x{r}")
def test_a_surface_solve_started_from_a_near_one_gives_the_same_estimate(
    method: str, ratio: float
) -> None:
    """A fixed point's next iterate starts its surface solve from the last one's (heat,
    rise): the estimate is the one computed from scratch, within 1e-11 relative (both solve
    to about 1e-12), whether the near solution is close, the same or far; and from a wrong
    one (ten times the rise), whose bracket fails its check, the solve starts over."""
    from emgate.physics.thermal import machine_temperature_rise
    from emgate.physics.thermal_inputs import HeatSources

    geom = demo_geometry()
    before = machine_temperature_rise(HeatSources(copper_slot=400.0, iron_yoke=150.0), geom, method)
    assert before.air_surface is not None
    sources = HeatSources(copper_slot=400.0 * ratio, iron_yoke=150.0)
    cold = machine_temperature_rise(sources, geom, method)
    warm = machine_temperature_rise(sources, geom, method, surface_near=before.air_surface)
    assert warm.winding_rise == pytest.approx(cold.winding_rise, rel=1e-11)
    assert warm.steps[-1].resistance == pytest.approx(cold.steps[-1].resistance, rel=1e-11)
    assert warm.convection_coefficient == pytest.approx(cold.convection_coefficient, rel=1e-11)
    wrong = (before.air_surface[0], 10.0 * before.air_surface[1])
    astray = machine_temperature_rise(sources, geom, method, surface_near=wrong)
    assert astray.winding_rise == pytest.approx(cold.winding_rise, rel=1e-11)


@pytest.mark.parametrize("cooling", ["enclosed_natural", "enclosed_fan", "open_ventilated"])
@pytest.mark.parametrize("heat", [0.5, 60.0, 800.0, 5000.0])
def test_an_air_surface_gives_the_coefficients_at_its_root(cooling: str, heat: float) -> None:
    # [calc] external check: the surface rise from scipy.optimize.brentq on
    # dT (h A + h_r A_r) = heat, with emgate's own film and radiation correlations; the
    # coefficients and the resistance 1 / (h A + h_r A_r) at that rise. The solve keeps its
    # last evaluation's coefficients and takes the resistance as rise / heat: 1e-9 relative
    # leaves room for both solvers' tolerances of about 1e-12.
    from scipy.optimize import brentq

    from emgate.physics.thermal import _air_surface

    par = ThermalParameters()
    area, rad_area, diameter, length, t_c = 0.9, 0.45, 0.3, 0.35, 313.15

    def film(rise: float) -> float:
        if cooling == "enclosed_natural":
            return convection.natural_convection_coefficient(diameter, t_c + rise, t_c)
        v = par.air_velocity if cooling == "enclosed_fan" else par.internal_air_velocity
        return convection.forced_convection_coefficient(length, v, t_c + rise, t_c)

    radiating = rad_area if cooling != "open_ventilated" else 0.0

    def conductance(rise: float) -> float:
        h_r = (
            convection.radiation_coefficient(par.emissivity, t_c + rise, t_c) if radiating else 0.0
        )
        return film(rise) * area + h_r * radiating

    rise = brentq(lambda r: r * conductance(r) - heat, 1e-9, 1e5, xtol=1e-14, rtol=1e-14)
    h, h_rad, resistance = _air_surface(cooling, heat, area, radiating, diameter, length, t_c, par)
    assert h == pytest.approx(film(rise), rel=1e-9)
    expected_h_r = convection.radiation_coefficient(par.emissivity, t_c + rise, t_c)
    assert h_rad == (pytest.approx(expected_h_r, rel=1e-9) if radiating else 0.0)
    assert resistance == pytest.approx(1.0 / conductance(rise), rel=1e-9)


def test_a_liquid_boundary_has_no_air_surface_to_start_from() -> None:
    from emgate.physics.thermal import machine_temperature_rise
    from emgate.physics.thermal_inputs import HeatSources

    sources = HeatSources(copper_slot=400.0, iron_yoke=150.0)
    for method in ("liquid_jacket", "direct_liquid"):
        assert machine_temperature_rise(sources, demo_geometry(), method).air_surface is None
