"""A lumped steady-state estimate of the winding temperature rise over the coolant.

The heat path is a chain of thermal resistances in series, from the mean winding temperature
to the coolant:

winding bundle -> slot liner -> stator teeth -> stator yoke -> core-frame interface -> frame
wall -> frame surface (convection + radiation) -> coolant (mean rise of the coolant itself,
when its heat-capacity rate is given).

Which links exist depends on the cooling method
(:data:`~emgate.physics.thermal_inputs.COOLING_METHODS`); the surface film coefficients come
from :mod:`emgate.physics.convection`. Each loss joins the path where it arises
(:class:`~emgate.physics.thermal_inputs.HeatSources`, :func:`machine_temperature_rise`). Stated
simplifications, all of them conservative or neutral for a limit check:

* all copper loss, end windings included, is taken to leave through the slot liner (the end
  windings' loss conducts along the copper into the slots; their own cooling to the
  end-space air is neglected);
* tooth iron loss and the rotor loss crossing the gap join at the top of the teeth (the
  bore side), so the whole tooth carries them; yoke iron loss joins at the teeth-yoke
  boundary; friction and windage join at the frame (bearings and fan), so only the frame
  surface carries it;
* the frame ends, the feet and the shaft carry no heat; the rotor's loss leaves only across
  the gap;
* the coolant temperature is the mean coolant temperature at the boundary (inlet air, or the
  mean liquid temperature), unless a heat-capacity rate adds the coolant's own mean rise.

The copper loss depends on the winding temperature it produces:
:func:`emgate.physics.winding_temperature.operating_temperature` iterates the two to a fixed
point and reports a thermal run-away as a result, never a hang.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from typing import NamedTuple

from emgate.physics.convection import (
    air_properties,
    forced_convection_coefficient,
    gap_nusselt,
    natural_convection_coefficient,
    radiation_coefficient,
)
from emgate.physics.iron import solve_increasing
from emgate.physics.thermal_inputs import (
    COOLING_METHODS,
    CoolingMethod,
    HeatSources,
    RotorGap,
    StatorThermalGeometry,
    ThermalParameters,
)


def gap_resistance(gap: RotorGap, stack_length: float, air_temperature: float) -> float:
    """Thermal resistance across the air gap, rotor surface to bore [K/W].

    Parameters
    ----------
    gap : RotorGap
    stack_length : float
        [m].
    air_temperature : float
        Gap air temperature for its properties [K].

    Returns
    -------
    float
        ``1 / (h pi D l)``, ``h = Nu k / (2 g)`` by
        :func:`~emgate.physics.convection.gap_nusselt`; both surfaces of the gap share the one
        coefficient (a lumped estimate).

    References
    ----------
    As :func:`emgate.physics.convection.gap_nusselt`.
    """
    if not (gap.air_gap > 0.0 and gap.rotor_diameter > 0.0 and stack_length > 0.0):
        raise ValueError("gap, rotor diameter and length must be > 0")
    air = air_properties(air_temperature)
    omega = 2.0 * math.pi * gap.speed
    r_m = 0.5 * gap.rotor_diameter + 0.5 * gap.air_gap
    taylor = omega**2 * r_m * gap.air_gap**3 / air.kinematic_viscosity**2
    h = gap_nusselt(taylor) * air.conductivity / (2.0 * gap.air_gap)
    return 1.0 / (h * math.pi * gap.rotor_diameter * stack_length)


class ThermalStep(NamedTuple):
    """One link of the heat path (a named tuple: the network builds one per link and
    evaluation).

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


class ThermalEstimate(NamedTuple):
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
    rotor_temperature : float or None
        Mean rotor surface temperature [K]: the bore temperature plus the rotor loss across
        the gap (:func:`gap_resistance`); None where not estimated.
    sources : HeatSources or None
        The losses the estimate was fed.
    air_surface : (float, float) or None
        Heat [W] and rise [K] of the air-cooled surface whose temperature was solved for;
        None for a liquid-cooled boundary. What ``surface_near`` of
        :func:`machine_temperature_rise` takes, for the next iterate of a fixed point.
    """

    method: str
    winding_rise: float
    winding_temperature: float
    coolant_temperature: float
    steps: tuple[ThermalStep, ...]
    convection_coefficient: float
    radiation_coefficient: float
    rotor_temperature: float | None = None
    sources: HeatSources | None = None
    air_surface: tuple[float, float] | None = None

    @property
    def resistances(self) -> dict[str, float]:
        """Resistance of each link by name [K/W]."""
        return {s.name: s.resistance for s in self.steps}


def _cylinder_resistance(r_in: float, r_out: float, conductivity: float, length: float) -> float:
    """Radial conduction through a cylindrical shell [K/W]."""
    if not r_out > r_in > 0.0:
        raise ValueError("a cylindrical shell needs 0 < r_in < r_out")
    return math.log(r_out / r_in) / (2.0 * math.pi * conductivity * length)


#: The highest surface rise [K] searched for: a surface that needs more sheds nothing.
_MAX_SURFACE_RISE = 65536.0


#: The margin [-] a bracket taken from a near solution is widened by on its far side: a
#: forced film's conductance may fall a little as the air warms.
_NEAR_MARGIN = 0.01


def _solve_surface_rise(
    heat: float,
    conductance: Callable[[float], float],
    near: tuple[float, float] | None = None,
) -> float:
    """Rise dT with dT * conductance(dT) = heat, conductance(dT) [W/K] non-decreasing.

    ``near`` is (heat, rise) of a solution of the same surface, such as the last iterate's
    of a fixed point. The rise it scales to, and heat / G there, lie on either side of the
    root when G is non-decreasing (G changes little over the step: the two are close), so
    two evaluations bracket the root tightly. The ends are checked; where they fail, the
    bracket is found as without it.
    """
    if heat <= 0.0:
        return 0.0

    def f(rise: float) -> float:
        return rise * conductance(rise) - heat

    if near is not None and near[0] > 0.0 and near[1] > 0.0:
        k = heat / near[0]
        guess = min(near[1] * k, _MAX_SURFACE_RISE)
        f_guess = guess * (g := conductance(guess)) - heat
        if f_guess == 0.0:
            return guess
        other = min(heat / g, _MAX_SURFACE_RISE)
        points = sorted(((guess, f_guess), (other, f(other))))
        if points[0][1] <= 0.0 <= points[1][1]:
            (lo, f_lo), (hi, f_hi) = points
            return solve_increasing(f, lo, hi, ends=(f_lo, f_hi))
        # Both on one side (a forced film's G falls a little as the air warms): the nearer
        # one bounds the root from that side, a step of the margin the other.
        if points[0][1] > 0.0:
            hi, f_hi = points[0]
            lo = near[1] * min(1.0, k) * (1.0 - _NEAR_MARGIN)
            if lo < hi and (f_lo := f(lo)) <= 0.0:
                return solve_increasing(f, lo, hi, ends=(f_lo, f_hi))
        else:
            lo, f_lo = points[1]
            hi = min(near[1] * max(1.0, k) * (1.0 + _NEAR_MARGIN), _MAX_SURFACE_RISE)
            if lo < hi and (f_hi := f(hi)) >= 0.0:
                return solve_increasing(f, lo, hi, ends=(f_lo, f_hi))
    # With G non-decreasing the root lies in [heat / G(hi), heat / G(0)]: two evaluations
    # instead of doubling a bracket from 1 K. Each end is checked, not assumed (a forced
    # film's coefficient may fall a little as the air warms), and widened if it fails; an
    # end that fails bounds the root from its side all the same, and is kept.
    lo, f_lo = 0.0, -heat
    hi = min(heat / conductance(1e-6), _MAX_SURFACE_RISE)
    while (f_hi := hi * (g_hi := conductance(hi)) - heat) < 0.0:
        if hi >= _MAX_SURFACE_RISE:
            raise ValueError("the surface cannot shed this heat at any plausible temperature")
        lo, f_lo = hi, f_hi
        hi = min(2.0 * hi, _MAX_SURFACE_RISE)
    if lo < (x := heat / g_hi) < hi:
        if (f_x := x * conductance(x) - heat) <= 0.0:
            lo, f_lo = x, f_x
        else:
            hi, f_hi = x, f_x
    # the ends' values go with them: the solver need not compute them again
    return solve_increasing(f, lo, hi, ends=(f_lo, f_hi))


def _air_surface(
    cooling: str,
    heat: float,
    air_area: float,
    radiating_area: float,
    diameter: float,
    flow_length: float,
    coolant_temperature: float,
    par: ThermalParameters,
    near: tuple[float, float] | None = None,
) -> tuple[float, float, float]:
    """Convection coefficient, radiation coefficient and resistance [K/W] of an air-cooled
    surface, at the surface temperature that sheds ``heat`` (``near``: as
    :func:`_solve_surface_rise`)."""
    t_c = coolant_temperature

    def h_air(rise: float) -> float:
        if cooling == "enclosed_natural":
            return natural_convection_coefficient(diameter, t_c + rise, t_c, par.pressure)
        v = par.air_velocity if cooling == "enclosed_fan" else par.internal_air_velocity
        return forced_convection_coefficient(flow_length, v, t_c + rise, t_c, par.pressure)

    def coefficients(rise: float) -> tuple[float, float, float]:
        """Convection and radiation coefficients, and the surface's conductance [W/K]."""
        h = h_air(rise)
        h_r = radiation_coefficient(par.emissivity, t_c + rise, t_c) if radiating_area else 0.0
        return h, h_r, h * air_area + h_r * radiating_area

    last = (math.nan, 0.0, 0.0)  # the rise and coefficients of the solver's last evaluation

    def conductance(rise: float) -> float:
        nonlocal last
        h, h_r, g = coefficients(rise)
        last = (rise, h, h_r)
        return g

    root = _solve_surface_rise(heat, conductance, near)
    if root > 1e-6 and abs(last[0] - root) <= 1e-10 * root:
        # Within the solver's tolerance of the root: its last coefficients, and the
        # resistance rise / heat, which the root makes equal to 1 / G (no evaluation more).
        return last[1], last[2], root / heat
    # At zero heat, report the resistance the surface has as dT tends to 0.
    rise = max(root, 1e-6)
    h, h_rad, g = coefficients(rise)
    return h, h_rad, 1.0 / g


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

    The copper loss and one lump of other losses at the teeth-yoke boundary: the same as
    :func:`machine_temperature_rise` with ``HeatSources(copper_slot=copper_loss,
    iron_yoke=other_losses)``.

    Parameters
    ----------
    copper_loss : float
        Stator copper loss [W], at the temperature it is to be checked at.
    geometry : StatorThermalGeometry
    cooling : str
        One of :data:`~emgate.physics.thermal_inputs.COOLING_METHODS` (see
        :func:`machine_temperature_rise`).
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
    As :func:`machine_temperature_rise`.
    """
    if copper_loss < 0.0 or other_losses < 0.0:
        raise ValueError("losses must be >= 0")
    return machine_temperature_rise(
        HeatSources(copper_slot=copper_loss, iron_yoke=other_losses),
        geometry,
        cooling,
        coolant_temperature=coolant_temperature,
        parameters=parameters,
    )


def machine_temperature_rise(
    sources: HeatSources,
    geometry: StatorThermalGeometry,
    cooling: CoolingMethod,
    *,
    coolant_temperature: float = 313.15,
    parameters: ThermalParameters | None = None,
    rotor_gap: RotorGap | None = None,
    surface_near: tuple[float, float] | None = None,
) -> ThermalEstimate:
    """Lumped steady-state rise of the mean winding temperature, every loss where it arises.

    Parameters
    ----------
    sources : HeatSources
        The losses [W] (module notes: where each joins the path).
    geometry : StatorThermalGeometry
    cooling : str
        One of :data:`~emgate.physics.thermal_inputs.COOLING_METHODS`:

        * ``enclosed_natural``: free convection (Churchill-Chu) and radiation from the
          frame, a horizontal cylinder in still air;
        * ``enclosed_fan``: fan air along the frame (turbulent flat plate, fin area factor
          and efficiency), plus radiation;
        * ``open_ventilated``: through-flow air over the core back (times a core area
          factor), no frame; end windings and ducts are not credited unless through that
          factor;
        * ``liquid_jacket``: liquid in a frame jacket, a given coefficient;
        * ``direct_liquid``: liquid in contact with the winding; the iron path is neglected
          (iron, rotor and friction losses are taken to leave by it without warming the
          winding).
    coolant_temperature : float, optional
        [K]; default 40 degC, the IEC 60034-1 reference coolant.
    parameters : ThermalParameters, optional
    rotor_gap : RotorGap, optional
        With it, the rotor temperature is estimated (:func:`gap_resistance`).
    surface_near : (float, float), optional
        ``air_surface`` of an estimate of the same machine with other losses (the last
        iterate of a fixed point): the air surface's solve starts from it. The result is
        the same within the solver's tolerance.

    Returns
    -------
    ThermalEstimate
        The steps name the heat each link carries.

    References
    ----------
    Lumped-parameter thermal networks [mem: Boglietti, Cavagnino, Staton, Shanel, Mueller,
    Mejuto, "Evolution and modern approaches for thermal analysis of electrical machines",
    IEEE Trans. Ind. Electron. 56(3), 2009]; mean temperature of a slab with uniform
    generation cooled on both faces, ``q w^2 / (12 k)`` [calc]; correlations as in
    :func:`~emgate.physics.convection.natural_convection_coefficient` and
    :func:`~emgate.physics.convection.forced_convection_coefficient`.
    """
    if cooling not in COOLING_METHODS:
        raise ValueError(f"cooling must be one of {COOLING_METHODS}, got {cooling!r}")
    src = sources
    if min(src.copper_slot, src.copper_end, src.iron_teeth, src.iron_yoke, src.rotor) < 0.0:
        raise ValueError("losses must be >= 0")
    if src.friction < 0.0:
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
    copper = src.copper
    teeth_heat = copper + src.iron_teeth + src.rotor
    core_heat = teeth_heat + src.iron_yoke
    total = src.total

    links: list[tuple[str, float, float]] = []  # name, resistance, heat
    air_surface: tuple[float, float] | None = None
    # Both long sides of the slot cool the bundle: mean rise q w^2 / (12 k) of a slab.
    bundle = width / (12.0 * par.bundle_conductivity * g.winding_height * length * q)
    links.append(("winding bundle", bundle, copper))
    h_conv = 0.0
    h_rad = 0.0
    iron_share = 1.0 - q * width / (2.0 * math.pi * r_mid)  # tooth share of the circle

    if cooling == "direct_liquid":
        wetted = par.direct_wetted_area or liner_area
        h_conv = par.direct_coefficient
        links.append(("liquid film", 1.0 / (h_conv * wetted), copper))
        to_coolant = copper
    else:
        links.append(
            ("slot liner", g.liner_thickness / (par.liner_conductivity * liner_area), copper)
        )
        if not iron_share > 0.0:
            raise ValueError("the slots leave no tooth iron at mid-slot")
        teeth = _cylinder_resistance(
            r_mid, r_bottom, par.iron_conductivity * iron_share, iron_length
        )
        links.append(("stator teeth", teeth, teeth_heat))
        yoke = _cylinder_resistance(r_bottom, r_core, par.iron_conductivity, iron_length)
        links.append(("stator yoke", yoke, core_heat))
        env_area = math.pi * d_frame * frame_length
        conv_area = env_area * (1.0 + (par.fin_area_factor - 1.0) * par.fin_efficiency)
        if cooling != "open_ventilated":
            k_gap = air_properties(coolant_temperature, par.pressure).conductivity
            interface = par.interface_gap / (k_gap * math.pi * g.outer_diameter * length)
            links.append(("core-frame interface", interface, core_heat))
            wall = _cylinder_resistance(r_core, 0.5 * d_frame, par.frame_conductivity, length)
            links.append(("frame wall", wall, core_heat))
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
                cooling,
                total,
                air_area,
                rad_area,
                d_frame,
                flow_length,
                coolant_temperature,
                par,
                surface_near,
            )
            links.append((name, surface, total))
            air_surface = (total, surface * total)
        to_coolant = total

    if par.coolant_capacity_rate is not None:
        # The coolant warms by P / C along its path; the mean over the path is half that.
        links.append(("coolant", 0.5 / par.coolant_capacity_rate, to_coolant))

    steps = tuple(ThermalStep(n, r, p, r * p) for n, r, p in links)
    rise_total = sum(s.rise for s in steps)
    rotor_temperature = None
    if rotor_gap is not None and cooling != "direct_liquid":
        # Bore temperature: the teeth node at mid-slot (below the winding's bundle and liner
        # steps) plus the rotor heat through the tooth from the bore to mid-slot.
        teeth_node = coolant_temperature + sum(s.rise for s in steps[2:])
        tip = _cylinder_resistance(r_bore, r_mid, par.iron_conductivity * iron_share, length)
        bore = teeth_node + tip * src.rotor
        rotor_temperature = bore + src.rotor * gap_resistance(rotor_gap, length, bore)
    return ThermalEstimate(
        method=cooling,
        winding_rise=rise_total,
        winding_temperature=coolant_temperature + rise_total,
        coolant_temperature=coolant_temperature,
        steps=steps,
        convection_coefficient=h_conv,
        radiation_coefficient=h_rad,
        rotor_temperature=rotor_temperature,
        sources=src,
        air_surface=air_surface,
    )
