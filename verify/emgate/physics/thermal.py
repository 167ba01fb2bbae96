"""A lumped steady-state estimate of the winding temperature rise over the coolant.

The heat path is a chain of thermal resistances in series, from the mean winding temperature
to the coolant:

winding bundle -> slot liner -> stator teeth -> stator yoke -> core-frame interface -> frame
wall -> frame surface (convection + radiation) -> coolant (mean rise of the coolant itself,
when its heat-capacity rate is given).

Which links exist depends on the cooling method (:data:`COOLING_METHODS`); the surface film
coefficients come from :mod:`emgate.physics.convection`. Stated
simplifications, all of them conservative or neutral for a limit check:

* all copper loss, end windings included, is taken to leave through the slot liner (heat from
  the end windings to the end-space air is neglected);
* other losses (iron, and rotor loss crossing the gap) join the path at the teeth-yoke
  boundary;
* the frame ends, the feet and the shaft carry no heat;
* the coolant temperature is the mean coolant temperature at the boundary (inlet air, or the
  mean liquid temperature), unless a heat-capacity rate adds the coolant's own mean rise.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass
from typing import Literal

from emgate.physics.convection import (
    STANDARD_PRESSURE,
    air_properties,
    forced_convection_coefficient,
    natural_convection_coefficient,
    radiation_coefficient,
)

#: Cooling methods the estimate knows.
COOLING_METHODS: tuple[str, ...] = (
    "enclosed_natural",
    "enclosed_fan",
    "open_ventilated",
    "liquid_jacket",
    "direct_liquid",
)
CoolingMethod = Literal[
    "enclosed_natural", "enclosed_fan", "open_ventilated", "liquid_jacket", "direct_liquid"
]


# --- the lumped network ----------------------------------------------------------------------


@dataclass(frozen=True)
class StatorThermalGeometry:
    """Stator dimensions the heat path needs (SI).

    Parameters
    ----------
    bore_diameter, outer_diameter, stack_length : float
        [m].
    slots : int
        ``Q`` [-].
    slot_depth : float
        Total slot depth from the bore [m].
    winding_area : float
        Gross winding-zone area of one slot [m^2].
    winding_height : float
        Radial height of the winding zone [m].
    winding_perimeter : float
        Perimeter of the winding zone, the liner's length [m].
    liner_thickness : float
        [m].
    stacking_factor : float, optional
        Iron share of the stack length [-]; default 0.95 [cp].
    frame_length : float or None, optional
        Cooled frame length [m]; None takes the stack length (conservative).
    frame_outer_diameter : float or None, optional
        Frame diameter at the fin roots [m]; None takes the core diameter plus two frame
        walls.
    """

    bore_diameter: float
    outer_diameter: float
    stack_length: float
    slots: int
    slot_depth: float
    winding_area: float
    winding_height: float
    winding_perimeter: float
    liner_thickness: float
    stacking_factor: float = 0.95
    frame_length: float | None = None
    frame_outer_diameter: float | None = None


@dataclass(frozen=True)
class ThermalParameters:
    """Material and cooling parameters, each default with its source.

    Parameters
    ----------
    liner_conductivity : float
        0.15 W/(m K): aramid insulating paper, manufacturers' datasheets 0.1-0.15 [mem].
    bundle_conductivity : float
        0.6 W/(m K): impregnated random winding across the wires [cp, no source]; reported
        values range widely with fill and impregnation.
    iron_conductivity : float
        25 W/(m K): non-oriented electrical steel in the sheet plane [cp, 20-30].
    interface_gap : float
        0.03 mm: equivalent air gap between core and frame [mem: Staton, Boglietti,
        Cavagnino, IEEE Trans. Energy Conversion 20(3), 2005, range 0.01-0.08 mm].
    frame_wall : float
        6 mm frame wall under the fins [cp].
    frame_conductivity : float
        150 W/(m K): cast aluminium alloy [cp].
    emissivity : float
        0.9: painted frame [mem: Bergman et al., Introduction to Heat Transfer, Table A.11].
    fin_area_factor : float
        Wetted frame area over the bare cylinder area; default 1 (smooth frame, conservative).
    fin_efficiency : float
        0.8 [cp]: share of the fin area that works like the base.
    air_velocity : float
        6 m/s: fan air along the frame fins [cp].
    internal_air_velocity : float
        5 m/s: through-flow air over the core back of an open machine [cp].
    core_area_factor : float
        Air-washed core area of an open machine over its back area (ducts, bore, core
        ends); default 1, the back alone (conservative).
    jacket_coefficient : float
        2000 W/(m^2 K) on the jacket's wetted wall [cp]; forced convection of liquids spans
        100-20000 [mem: Bergman et al., Introduction to Heat Transfer, Table 1.1].
    jacket_area_factor : float
        Wetted jacket area over the frame cylinder area; default 1.
    direct_coefficient : float
        1000 W/(m^2 K) from winding surface to a liquid in contact [cp]; same range as above.
    direct_wetted_area : float or None
        Winding surface wetted by the liquid [m^2]; None takes the liner area (slots x
        winding perimeter x stack length), as for channels along the slots.
    coolant_capacity_rate : float or None
        Coolant mass flow times specific heat [W/K]; None neglects the coolant's own rise.
    pressure : float
        Air pressure [Pa].
    """

    liner_conductivity: float = 0.15
    bundle_conductivity: float = 0.6
    iron_conductivity: float = 25.0
    interface_gap: float = 0.03e-3
    frame_wall: float = 6e-3
    frame_conductivity: float = 150.0
    emissivity: float = 0.9
    fin_area_factor: float = 1.0
    fin_efficiency: float = 0.8
    air_velocity: float = 6.0
    internal_air_velocity: float = 5.0
    core_area_factor: float = 1.0
    jacket_coefficient: float = 2000.0
    jacket_area_factor: float = 1.0
    direct_coefficient: float = 1000.0
    direct_wetted_area: float | None = None
    coolant_capacity_rate: float | None = None
    pressure: float = STANDARD_PRESSURE


@dataclass(frozen=True)
class ThermalStep:
    """One link of the heat path.

    Parameters
    ----------
    name : str
    resistance : float
        [K/W].
    heat : float
        Heat through the link [W].
    rise : float
        Temperature drop across it [K].
    """

    name: str
    resistance: float
    heat: float
    rise: float


@dataclass(frozen=True)
class ThermalEstimate:
    """Result of :func:`winding_temperature_rise`.

    Parameters
    ----------
    method : str
        Cooling method.
    winding_rise : float
        Mean winding temperature over the coolant [K] (the sum of the steps' rises).
    winding_temperature : float
        [K].
    coolant_temperature : float
        [K].
    steps : tuple of ThermalStep
        The heat path from the winding to the coolant.
    convection_coefficient : float
        At the cooled boundary [W/(m^2 K)].
    radiation_coefficient : float
        At the frame surface, 0 where not counted [W/(m^2 K)].
    """

    method: str
    winding_rise: float
    winding_temperature: float
    coolant_temperature: float
    steps: tuple[ThermalStep, ...]
    convection_coefficient: float
    radiation_coefficient: float

    @property
    def resistances(self) -> dict[str, float]:
        """Resistance of each link by name [K/W]."""
        return {s.name: s.resistance for s in self.steps}


def _cylinder_resistance(r_in: float, r_out: float, conductivity: float, length: float) -> float:
    """Radial conduction through a cylindrical shell [K/W]."""
    if not r_out > r_in > 0.0:
        raise ValueError("a cylindrical shell needs 0 < r_in < r_out")
    return math.log(r_out / r_in) / (2.0 * math.pi * conductivity * length)


def _solve_surface_rise(heat: float, conductance: Callable[[float], float]) -> float:
    """Rise dT with dT * conductance(dT) = heat, conductance(dT) [W/K] non-decreasing."""
    if heat <= 0.0:
        return 0.0
    hi = 1.0
    while hi * conductance(hi) < heat:
        hi *= 2.0
        if hi > 1e5:
            raise ValueError("the surface cannot shed this heat at any plausible temperature")
    lo = 0.0
    for _ in range(80):  # bisection to below 1e-20 of the bracket
        mid = 0.5 * (lo + hi)
        if mid * conductance(mid) < heat:
            lo = mid
        else:
            hi = mid
    return 0.5 * (lo + hi)


def _air_surface(
    cooling: str,
    heat: float,
    air_area: float,
    radiating_area: float,
    diameter: float,
    flow_length: float,
    coolant_temperature: float,
    par: ThermalParameters,
) -> tuple[float, float, float]:
    """Convection coefficient, radiation coefficient and resistance [K/W] of an air-cooled
    surface, at the surface temperature that sheds ``heat``."""
    t_c = coolant_temperature

    def h_air(rise: float) -> float:
        if cooling == "enclosed_natural":
            return natural_convection_coefficient(diameter, t_c + rise, t_c, par.pressure)
        v = par.air_velocity if cooling == "enclosed_fan" else par.internal_air_velocity
        return forced_convection_coefficient(flow_length, v, t_c + rise, t_c, par.pressure)

    def conductance(rise: float) -> float:
        h_r = radiation_coefficient(par.emissivity, t_c + rise, t_c) if radiating_area else 0.0
        return h_air(rise) * air_area + h_r * radiating_area

    # At zero heat, report the resistance the surface has as dT tends to 0.
    rise = max(_solve_surface_rise(heat, conductance), 1e-6)
    h_rad = radiation_coefficient(par.emissivity, t_c + rise, t_c) if radiating_area else 0.0
    return h_air(rise), h_rad, 1.0 / conductance(rise)


def winding_temperature_rise(
    copper_loss: float,
    geometry: StatorThermalGeometry,
    cooling: CoolingMethod,
    *,
    other_losses: float = 0.0,
    coolant_temperature: float = 313.15,
    parameters: ThermalParameters | None = None,
) -> ThermalEstimate:
    """Lumped steady-state rise of the mean winding temperature over the coolant.

    Parameters
    ----------
    copper_loss : float
        Stator copper loss [W], at the temperature it is to be checked at.
    geometry : StatorThermalGeometry
    cooling : str
        One of :data:`COOLING_METHODS`:

        * ``enclosed_natural``: free convection (Churchill-Chu) and radiation from the
          frame, a horizontal cylinder in still air;
        * ``enclosed_fan``: fan air along the frame (turbulent flat plate, fin area factor
          and efficiency), plus radiation;
        * ``open_ventilated``: through-flow air over the core back (times a core area
          factor), no frame; end windings and ducts are not credited unless through that
          factor;
        * ``liquid_jacket``: liquid in a frame jacket, a given coefficient;
        * ``direct_liquid``: liquid in contact with the winding; the iron path is neglected.
    other_losses : float, optional
        Iron and other losses joining the path at the teeth-yoke boundary [W].
    coolant_temperature : float, optional
        [K]; default 40 degC, the IEC 60034-1 reference coolant.
    parameters : ThermalParameters, optional

    Returns
    -------
    ThermalEstimate

    References
    ----------
    Lumped-parameter thermal networks [mem: Boglietti, Cavagnino, Staton, Shanel, Mueller,
    Mejuto, "Evolution and modern approaches for thermal analysis of electrical machines",
    IEEE Trans. Ind. Electron. 56(3), 2009]; mean temperature of a slab with uniform
    generation cooled on both faces, ``q w^2 / (12 k)`` [calc]; correlations as in
    :func:`natural_convection_coefficient` and :func:`forced_convection_coefficient`.
    """
    if cooling not in COOLING_METHODS:
        raise ValueError(f"cooling must be one of {COOLING_METHODS}, got {cooling!r}")
    if copper_loss < 0.0 or other_losses < 0.0:
        raise ValueError("losses must be >= 0")
    par = parameters or ThermalParameters()
    g = geometry
    q = g.slots
    length = g.stack_length
    iron_length = g.stacking_factor * length
    width = g.winding_area / g.winding_height  # mean width of the winding zone
    liner_area = q * g.winding_perimeter * length
    r_bore = 0.5 * g.bore_diameter
    r_bottom = r_bore + g.slot_depth
    r_mid = r_bottom - 0.5 * g.winding_height
    r_core = 0.5 * g.outer_diameter
    frame_length = g.frame_length or length
    d_frame = g.frame_outer_diameter or g.outer_diameter + 2.0 * par.frame_wall

    links: list[tuple[str, float, float]] = []  # name, resistance, heat
    # Both long sides of the slot cool the bundle: mean rise q w^2 / (12 k) of a slab.
    bundle = width / (12.0 * par.bundle_conductivity * g.winding_height * length * q)
    links.append(("winding bundle", bundle, copper_loss))
    h_conv = 0.0
    h_rad = 0.0

    if cooling == "direct_liquid":
        wetted = par.direct_wetted_area or liner_area
        h_conv = par.direct_coefficient
        links.append(("liquid film", 1.0 / (h_conv * wetted), copper_loss))
        to_coolant = copper_loss
    else:
        total = copper_loss + other_losses
        links.append(
            ("slot liner", g.liner_thickness / (par.liner_conductivity * liner_area), copper_loss)
        )
        iron_share = 1.0 - q * width / (2.0 * math.pi * r_mid)  # tooth share of the circle
        if not iron_share > 0.0:
            raise ValueError("the slots leave no tooth iron at mid-slot")
        teeth = _cylinder_resistance(
            r_mid, r_bottom, par.iron_conductivity * iron_share, iron_length
        )
        links.append(("stator teeth", teeth, copper_loss))
        yoke = _cylinder_resistance(r_bottom, r_core, par.iron_conductivity, iron_length)
        links.append(("stator yoke", yoke, total))
        env_area = math.pi * d_frame * frame_length
        conv_area = env_area * (1.0 + (par.fin_area_factor - 1.0) * par.fin_efficiency)
        if cooling != "open_ventilated":
            k_gap = air_properties(coolant_temperature, par.pressure).conductivity
            interface = par.interface_gap / (k_gap * math.pi * g.outer_diameter * length)
            links.append(("core-frame interface", interface, total))
            wall = _cylinder_resistance(r_core, 0.5 * d_frame, par.frame_conductivity, length)
            links.append(("frame wall", wall, total))
        if cooling == "liquid_jacket":
            h_conv = par.jacket_coefficient
            links.append(
                ("frame surface", 1.0 / (h_conv * env_area * par.jacket_area_factor), total)
            )
        else:
            if cooling == "open_ventilated":
                back = math.pi * g.outer_diameter * length
                name, air_area, rad_area = "core surface", back * par.core_area_factor, 0.0
                flow_length = length
            else:
                # Fins see each other: radiation leaves through the envelope only.
                name, air_area, rad_area = "frame surface", conv_area, env_area
                flow_length = frame_length
            h_conv, h_rad, surface = _air_surface(
                cooling, total, air_area, rad_area, d_frame, flow_length, coolant_temperature, par
            )
            links.append((name, surface, total))
        to_coolant = total

    if par.coolant_capacity_rate is not None:
        # The coolant warms by P / C along its path; the mean over the path is half that.
        links.append(("coolant", 0.5 / par.coolant_capacity_rate, to_coolant))

    steps = tuple(ThermalStep(n, r, p, r * p) for n, r, p in links)
    rise_total = sum(s.rise for s in steps)
    return ThermalEstimate(
        method=cooling,
        winding_rise=rise_total,
        winding_temperature=coolant_temperature + rise_total,
        coolant_temperature=coolant_temperature,
        steps=steps,
        convection_coefficient=h_conv,
        radiation_coefficient=h_rad,
    )
