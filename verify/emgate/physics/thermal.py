"""A lumped steady-state estimate of the winding temperature rise over the coolant.

The heat path is a chain of thermal resistances in series, from the mean winding temperature
to the coolant:

winding bundle -> slot liner -> stator teeth -> stator yoke -> core-frame interface -> frame
wall -> frame surface (convection + radiation) -> coolant (mean rise of the coolant itself,
when its heat-capacity rate is given).

Which links exist depends on the cooling method (:data:`COOLING_METHODS`). Stated
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

#: Standard gravity [m/s^2] (CGPM 1901).
STANDARD_GRAVITY: float = 9.80665
#: Stefan-Boltzmann constant [W/(m^2 K^4)] (CODATA 2018, exact from h, c, k).
STEFAN_BOLTZMANN: float = 5.670374419e-8
#: Standard atmospheric pressure [Pa].
STANDARD_PRESSURE: float = 101325.0
#: Molar mass of dry air [kg/mol] and the gas constant [J/(mol K)], both as in the
#: U.S. Standard Atmosphere 1976.
AIR_MOLAR_MASS: float = 28.9644e-3
GAS_CONSTANT_1976: float = 8.31432
#: Specific heat of air [J/(kg K)], nearly constant over 250-400 K
#: [mem: Bergman, Lavine, Incropera, DeWitt, Introduction to Heat Transfer, Table A.4, 300 K].
AIR_SPECIFIC_HEAT: float = 1007.0


# --- air and correlations --------------------------------------------------------------------


@dataclass(frozen=True)
class AirProperties:
    """Dry air at one temperature and pressure (SI).

    Parameters
    ----------
    temperature : float
        [K].
    density : float
        [kg/m^3].
    viscosity : float
        Dynamic viscosity [Pa s].
    conductivity : float
        [W/(m K)].
    specific_heat : float
        [J/(kg K)].
    """

    temperature: float
    density: float
    viscosity: float
    conductivity: float
    specific_heat: float

    @property
    def kinematic_viscosity(self) -> float:
        """[m^2/s]."""
        return self.viscosity / self.density

    @property
    def prandtl(self) -> float:
        """[-]."""
        return self.viscosity * self.specific_heat / self.conductivity


def air_properties(temperature: float, pressure: float = STANDARD_PRESSURE) -> AirProperties:
    """Properties of dry air from closed-form relations.

    Parameters
    ----------
    temperature : float
        [K], meaningful over about 200-500 K.
    pressure : float, optional
        [Pa].

    Returns
    -------
    AirProperties
        Density from the ideal gas law; viscosity by Sutherland's law
        ``1.458e-6 T^1.5 / (T + 110.4)``; conductivity ``2.64638e-3 T^1.5 /
        (T + 245.4 10^(-12/T))``; constant specific heat.

    References
    ----------
    U.S. Standard Atmosphere 1976 (NOAA, NASA, USAF), viscosity and thermal conductivity
    relations [mem]; specific heat [mem: Bergman et al., Introduction to Heat Transfer,
    Table A.4].
    """
    if not temperature > 0.0 or not pressure > 0.0:
        raise ValueError("temperature and pressure must be positive")
    t15 = temperature * math.sqrt(temperature)
    return AirProperties(
        temperature=temperature,
        density=pressure * AIR_MOLAR_MASS / (GAS_CONSTANT_1976 * temperature),
        viscosity=1.458e-6 * t15 / (temperature + 110.4),
        conductivity=2.64638e-3 * t15 / (temperature + 245.4 * 10.0 ** (-12.0 / temperature)),
        specific_heat=AIR_SPECIFIC_HEAT,
    )


def nusselt_horizontal_cylinder(rayleigh: float, prandtl: float) -> float:
    """Mean Nusselt number of free convection round an isothermal horizontal cylinder.

    Parameters
    ----------
    rayleigh : float
        ``Ra_D = g beta dT D^3 / (nu alpha)`` [-], up to about 1e12.
    prandtl : float
        [-].

    Returns
    -------
    float
        ``Nu_D = {0.60 + 0.387 Ra^(1/6) / [1 + (0.559/Pr)^(9/16)]^(8/27)}^2`` [-].

    References
    ----------
    Churchill, S. W. and Chu, H. H. S., "Correlating equations for laminar and turbulent
    free convection from a horizontal cylinder", Int. J. Heat Mass Transfer 18 (1975)
    1049-1053 [mem].
    """
    if rayleigh < 0.0 or not prandtl > 0.0:
        raise ValueError("Rayleigh number must be >= 0 and Prandtl number > 0")
    shape = (1.0 + (0.559 / prandtl) ** (9.0 / 16.0)) ** (8.0 / 27.0)
    return (0.60 + 0.387 * rayleigh ** (1.0 / 6.0) / shape) ** 2


def nusselt_flat_plate_laminar(reynolds: float, prandtl: float) -> float:
    """Mean Nusselt number of a laminar boundary layer on an isothermal flat plate.

    Parameters
    ----------
    reynolds : float
        ``Re_L`` on the plate length [-], below about 5e5.
    prandtl : float
        [-], about 0.6 and above.

    Returns
    -------
    float
        ``Nu_L = 0.664 Re_L^(1/2) Pr^(1/3)`` [-].

    References
    ----------
    Pohlhausen's similarity solution, as in [mem: Bergman et al., Introduction to Heat
    Transfer, ch. 7].
    """
    return 0.664 * math.sqrt(reynolds) * prandtl ** (1.0 / 3.0)


def nusselt_flat_plate_turbulent(reynolds: float, prandtl: float) -> float:
    """Mean Nusselt number of a flat plate turbulent from its leading edge.

    Parameters
    ----------
    reynolds : float
        ``Re_L`` on the plate length [-].
    prandtl : float
        [-].

    Returns
    -------
    float
        ``Nu_L = 0.036 Re_L^0.8 Pr^(1/3)`` [-].

    References
    ----------
    [mem: Kreith, Manglik, Bohn, Principles of Heat Transfer, turbulent flat plate].
    """
    return 0.036 * reynolds**0.8 * prandtl ** (1.0 / 3.0)


def natural_convection_coefficient(
    diameter: float,
    surface_temperature: float,
    fluid_temperature: float,
    pressure: float = STANDARD_PRESSURE,
) -> float:
    """Free-convection coefficient of a horizontal cylinder in still air.

    Parameters
    ----------
    diameter : float
        [m].
    surface_temperature, fluid_temperature : float
        [K]; properties at the film temperature, ``beta = 1 / T_film`` (ideal gas).
    pressure : float, optional
        [Pa].

    Returns
    -------
    float
        ``h = Nu_D k / D`` [W/(m^2 K)] (:func:`nusselt_horizontal_cylinder`).

    References
    ----------
    Churchill and Chu (1975) [mem]; film-temperature rule as in [mem: Bergman et al.,
    Introduction to Heat Transfer, ch. 9].
    """
    film = 0.5 * (surface_temperature + fluid_temperature)
    air = air_properties(film, pressure)
    nu = air.kinematic_viscosity
    grashof = STANDARD_GRAVITY * abs(surface_temperature - fluid_temperature) * diameter**3
    grashof /= film * nu**2
    return (
        nusselt_horizontal_cylinder(grashof * air.prandtl, air.prandtl)
        * air.conductivity
        / diameter
    )


def forced_convection_coefficient(
    length: float,
    velocity: float,
    surface_temperature: float,
    fluid_temperature: float,
    pressure: float = STANDARD_PRESSURE,
) -> float:
    """Forced-air coefficient along a surface of a given length in the flow direction.

    The air blown by a fan arrives turbulent, so the turbulent flat-plate correlation is
    used from the leading edge; at low Reynolds numbers, where that correlation falls below
    the laminar one, the laminar value is taken (a turbulent layer does not transfer less).

    Parameters
    ----------
    length : float
        Surface length along the flow [m].
    velocity : float
        Free-stream air velocity [m/s].
    surface_temperature, fluid_temperature : float
        [K]; properties at the film temperature.
    pressure : float, optional
        [Pa].

    Returns
    -------
    float
        ``h = Nu_L k / L`` [W/(m^2 K)].

    References
    ----------
    [mem: Kreith, Manglik, Bohn, Principles of Heat Transfer]; laminar: Pohlhausen
    [mem: Bergman et al., Introduction to Heat Transfer]; the max() of both [cp].
    """
    air = air_properties(0.5 * (surface_temperature + fluid_temperature), pressure)
    reynolds = velocity * length / air.kinematic_viscosity
    nusselt = max(
        nusselt_flat_plate_turbulent(reynolds, air.prandtl),
        nusselt_flat_plate_laminar(reynolds, air.prandtl),
    )
    return nusselt * air.conductivity / length


def radiation_coefficient(
    emissivity: float, surface_temperature: float, surroundings_temperature: float
) -> float:
    """Linearised radiation coefficient of a small grey body in large surroundings.

    Parameters
    ----------
    emissivity : float
        [-].
    surface_temperature, surroundings_temperature : float
        [K].

    Returns
    -------
    float
        ``eps sigma (Ts^2 + Tsur^2)(Ts + Tsur)`` [W/(m^2 K)].

    References
    ----------
    [mem: Bergman et al., Introduction to Heat Transfer, ch. 1].
    """
    ts, tsur = surface_temperature, surroundings_temperature
    return emissivity * STEFAN_BOLTZMANN * (ts**2 + tsur**2) * (ts + tsur)


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
