"""Air properties and heat-transfer coefficients at the surfaces of a machine.

Dry air at a temperature and pressure, the Nusselt correlations of a horizontal cylinder in
still air and of a flat plate in a flow, the linearised radiation coefficient and the
Nusselt number of the gap between a rotating and a still cylinder: the film coefficients the
lumped winding-rise estimate (:mod:`emgate.physics.thermal`) needs.
"""

from __future__ import annotations

import math
from typing import NamedTuple

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


class AirProperties(NamedTuple):
    """Dry air at one temperature and pressure (SI). A named tuple: the thermal network
    builds one per convection evaluation, and a tuple is built faster than a dataclass.

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


def gap_nusselt(taylor: float) -> float:
    """Nusselt number of the air gap between a rotating cylinder and a still one.

    Parameters
    ----------
    taylor : float
        Modified Taylor number ``Ta_m = Omega^2 r_m g^3 / nu^2`` (geometric factor taken as
        1, a narrow gap) [-].

    Returns
    -------
    float
        ``Nu = h 2 g / k``: 2 (conduction) below 1700; ``0.128 Ta_m^0.367`` up to 1e4;
        ``0.409 Ta_m^0.241`` up to 1e7 (and beyond, as an extrapolation) [-]. The two
        correlations meet the conduction value near Ta_m = 1700 and each other near 1e4.

    References
    ----------
    Becker, K. M. and Kaye, J., "Measurements of diabatic flow in an annulus with an inner
    rotating cylinder", J. Heat Transfer 84 (1962) 97-105 [from memory, as quoted in
    Boglietti et al., IEEE Trans. Ind. Electron. 56(3), 2009].
    """
    if taylor < 0.0:
        raise ValueError("Taylor number must be >= 0")
    if taylor < 1700.0:
        return 2.0
    if taylor < 1e4:
        return max(2.0, 0.128 * taylor**0.367)
    return 0.409 * taylor**0.241
