"""Conductors: slot area and fill, strand sections, currents, loading, resistance, classes.

Slot conventions (as in the design record), all depths measured radially from the bore:

* ``semi_closed`` (trapezoidal slot of random-wound machines): opening ``b0`` over opening
  height ``h0`` (tooth tip); a wedge zone of height ``h1`` in which the slot widens from
  ``b0`` to ``top_width`` ``b1``; then the winding zone, a trapezoid from ``b1`` (bore side)
  to ``bottom_width`` ``b2`` (slot bottom) of height ``h2 = height - h0 - h1``, ``height``
  being the total depth from the bore to the slot bottom.
* ``open`` (rectangular slot of form-wound machines): width ``b``, total height ``h`` from
  the bore, wedge height ``hw`` at the bore side; the winding zone is ``b x (h - hw)``.

Temperatures are in kelvin, as everywhere in the kernel; the standards quote degrees
Celsius, converted here with ``T[K] = t[degC] + 273.15``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

#: 0 degC in kelvin.
ZERO_CELSIUS: float = 273.15
#: The reference temperature of resistivity tables, 20 degC [K].
T20: float = 293.15

Connection = Literal["star", "delta"]


# --- slot geometry ---------------------------------------------------------------------------


def _trapezoid_corner_cotangents(top: float, bottom: float, height: float) -> tuple[float, float]:
    """cot(alpha/2) at a top and at a bottom corner of a symmetric trapezoid."""
    slant = math.atan2((bottom - top) / 2.0, height)  # side's tilt from the radial direction
    return 1.0 / math.tan(math.pi / 4 + slant / 2), 1.0 / math.tan(math.pi / 4 - slant / 2)


def _trapezoid_net_area(top: float, bottom: float, height: float, liner: float) -> float:
    """Area of a symmetric trapezoid shrunk inward by a uniform thickness ``liner``."""
    if liner < 0.0:
        raise ValueError("liner thickness must be >= 0")
    area = 0.5 * (top + bottom) * height
    if liner == 0.0:
        return area
    side = math.hypot((bottom - top) / 2.0, height)
    c_top, c_bot = _trapezoid_corner_cotangents(top, bottom, height)
    # Inward parallel polygon with mitred corners: A - t P + t^2 sum cot(alpha_i / 2).
    net = area - liner * (top + bottom + 2.0 * side) + 2.0 * liner**2 * (c_top + c_bot)
    # Each edge loses t (cot(a/2) + cot(b/2)); the offset polygon exists while all stay > 0.
    edges = (top - 2 * liner * c_top, bottom - 2 * liner * c_bot, side - liner * (c_top + c_bot))
    if min(edges) <= 0.0 or net <= 0.0:
        raise ValueError("the slot liner is too thick for the winding zone")
    return net


def _check_positive(**values: float) -> None:
    for name, value in values.items():
        if not (math.isfinite(value) and value > 0.0):
            raise ValueError(f"{name} must be a finite positive number, got {value!r}")


def semi_closed_winding_height(opening_height: float, wedge_height: float, height: float) -> float:
    """Height of the winding zone of a semi-closed slot.

    Parameters
    ----------
    opening_height : float
        Tooth-tip height ``h0`` [m].
    wedge_height : float
        Wedge-zone height ``h1`` [m].
    height : float
        Total slot depth from the bore to the slot bottom [m].

    Returns
    -------
    float
        ``h2 = height - h0 - h1`` [m].

    References
    ----------
    Geometry convention of the design record (module docstring).
    """
    h2 = height - opening_height - wedge_height
    if opening_height < 0.0 or wedge_height < 0.0 or not h2 > 0.0:
        raise ValueError("slot height must exceed opening height plus wedge height (both >= 0)")
    return h2


def semi_closed_slot_area(
    opening: float,
    opening_height: float,
    wedge_height: float,
    top_width: float,
    bottom_width: float,
    height: float,
    *,
    liner: float = 0.0,
) -> float:
    """Winding-zone area of a semi-closed (trapezoidal) slot, gross or net of a liner.

    Parameters
    ----------
    opening, opening_height, wedge_height, top_width, bottom_width, height : float
        ``b0, h0, h1, b1, b2`` and total depth [m] (module docstring).
    liner : float, optional
        Slot-liner thickness [m]; 0 gives the gross area.

    Returns
    -------
    float
        Area available to the coil sides [m^2]. With a liner: the area inside a uniform
        layer of thickness ``liner`` laid along the whole perimeter of the winding zone
        (sides, bottom and the top under the wedge), with sharp inner corners. This is the
        stated approximation: real liners are U-shaped with a top closure of their own.

    References
    ----------
    Trapezoid area; inward parallel polygon ``A - tP + t^2 sum cot(alpha_i/2)`` [calc].
    """
    _check_positive(opening=opening, top_width=top_width, bottom_width=bottom_width)
    h2 = semi_closed_winding_height(opening_height, wedge_height, height)
    if opening > top_width:
        raise ValueError("the slot opening cannot be wider than the winding zone's top width")
    return _trapezoid_net_area(top_width, bottom_width, h2, liner)


def semi_closed_slot_perimeter(
    opening_height: float, wedge_height: float, top_width: float, bottom_width: float, height: float
) -> float:
    """Perimeter of the winding zone of a semi-closed slot (the liner's length) [m].

    Parameters
    ----------
    opening_height, wedge_height, top_width, bottom_width, height : float
        ``h0, h1, b1, b2`` and total depth [m].

    Returns
    -------
    float
        ``b1 + b2 + 2 sqrt(h2^2 + ((b2 - b1)/2)^2)`` [m].

    References
    ----------
    Trapezoid perimeter [calc].
    """
    h2 = semi_closed_winding_height(opening_height, wedge_height, height)
    return top_width + bottom_width + 2.0 * math.hypot((bottom_width - top_width) / 2.0, h2)


def semi_closed_full_area(
    opening: float,
    opening_height: float,
    wedge_height: float,
    top_width: float,
    bottom_width: float,
    height: float,
) -> float:
    """Whole area of a semi-closed slot, opening included (a cast bar filling its slot).

    Parameters
    ----------
    opening, opening_height, wedge_height, top_width, bottom_width, height : float
        ``b0, h0, h1, b1, b2`` and total depth [m].

    Returns
    -------
    float
        ``b0 h0 + (b0 + b1) h1 / 2 + (b1 + b2) h2 / 2`` [m^2].

    References
    ----------
    Sum of a rectangle and two trapezoids [calc].
    """
    winding = semi_closed_slot_area(
        opening, opening_height, wedge_height, top_width, bottom_width, height
    )
    return opening * opening_height + 0.5 * (opening + top_width) * wedge_height + winding


def open_slot_area(
    width: float, height: float, wedge_height: float, *, liner: float = 0.0
) -> float:
    """Winding-zone area of an open rectangular slot, gross or net of a liner.

    Parameters
    ----------
    width : float
        Slot width ``b`` [m].
    height : float
        Total slot height ``h`` from the bore [m].
    wedge_height : float
        Wedge height ``hw`` at the bore side [m].
    liner : float, optional
        Liner (main-wall) thickness laid along the whole perimeter [m]; 0 for gross.

    Returns
    -------
    float
        ``(b - 2t)(h - hw - 2t)`` [m^2].

    References
    ----------
    Rectangle, inward offset [calc].
    """
    _check_positive(width=width)
    if wedge_height < 0.0 or not height > wedge_height:
        raise ValueError("slot height must exceed the wedge height (>= 0)")
    return _trapezoid_net_area(width, width, height - wedge_height, liner)


def open_slot_perimeter(width: float, height: float, wedge_height: float) -> float:
    """Perimeter of the winding zone of an open slot, ``2 (b + h - hw)`` [m].

    Parameters
    ----------
    width, height, wedge_height : float
        ``b``, ``h``, ``hw`` [m].

    Returns
    -------
    float
        Perimeter [m].

    References
    ----------
    Rectangle [calc].
    """
    if not height > wedge_height >= 0.0:
        raise ValueError("slot height must exceed the wedge height (>= 0)")
    return 2.0 * (width + height - wedge_height)


def open_full_area(width: float, height: float) -> float:
    """Whole area of an open rectangular slot, ``b h`` [m^2].

    Parameters
    ----------
    width, height : float
        ``b`` and total height ``h`` [m].

    Returns
    -------
    float
        Area [m^2].

    References
    ----------
    Rectangle [calc].
    """
    _check_positive(width=width, height=height)
    return width * height


# --- strands, fill, fit ----------------------------------------------------------------------


def round_strand_area(bare_diameter: float) -> float:
    """Section of a round strand, ``pi d^2 / 4`` [m^2].

    Parameters
    ----------
    bare_diameter : float
        Bare conductor diameter [m].

    Returns
    -------
    float
        Copper section [m^2].

    References
    ----------
    Circle area [calc].
    """
    _check_positive(bare_diameter=bare_diameter)
    return math.pi * bare_diameter**2 / 4.0


def rectangular_strand_area(width: float, height: float, corner_radius: float = 0.0) -> float:
    """Section of a rectangular strand with rounded corners.

    Parameters
    ----------
    width, height : float
        Bare conductor dimensions [m].
    corner_radius : float, optional
        Corner radius [m], at most half the smaller dimension.

    Returns
    -------
    float
        ``w h - (4 - pi) r^2`` [m^2].

    References
    ----------
    Corner deduction for rectangular winding wire [mem: IEC 60317-0-2, rectangular
    enamelled copper wire, conductor cross-section]; exact for quarter-circle corners [calc].
    """
    _check_positive(width=width, height=height)
    if not 0.0 <= corner_radius <= 0.5 * min(width, height):
        raise ValueError("corner radius must lie between 0 and half the smaller side")
    return width * height - (4.0 - math.pi) * corner_radius**2


def copper_area_per_slot(conductors_per_slot: int, strands: int, strand_area: float) -> float:
    """Bare copper section in one slot.

    Parameters
    ----------
    conductors_per_slot : int
        Turns crossing the slot, summed over its coil sides (layers x turns per coil).
    strands : int
        Strands in hand per conductor.
    strand_area : float
        Bare section of one strand [m^2].

    Returns
    -------
    float
        Copper area [m^2].

    References
    ----------
    Definition [calc].
    """
    if conductors_per_slot < 1 or strands < 1:
        raise ValueError("conductors per slot and strands must be >= 1")
    return conductors_per_slot * strands * strand_area


def fill_factor(copper_area: float, slot_area: float) -> float:
    """Slot fill: bare copper over slot area.

    emgate's convention: ``slot_area`` is the winding zone net of the slot liner (from
    :func:`semi_closed_slot_area` or :func:`open_slot_area` with ``liner``); pass the gross
    area instead to get the gross fill some catalogues quote.

    Parameters
    ----------
    copper_area : float
        Bare copper area in the slot [m^2].
    slot_area : float
        Slot winding-zone area [m^2].

    Returns
    -------
    float
        Fill factor [-].

    References
    ----------
    Definition; typical ranges [cp] in REFERENCE.md (round wire 0.35-0.45).
    """
    _check_positive(slot_area=slot_area)
    return copper_area / slot_area


#: Default clearance between an insulated strand and the slot opening [m] [cp, no source].
OPENING_CLEARANCE: float = 0.2e-3


def strand_passes_opening(
    insulated_diameter: float, opening: float, clearance: float = OPENING_CLEARANCE
) -> bool:
    """Whether an insulated round strand can be fed through the slot opening.

    Parameters
    ----------
    insulated_diameter : float
        Strand diameter over the enamel [m].
    opening : float
        Slot opening ``b0`` [m].
    clearance : float, optional
        Free width the strand needs beyond its own diameter [m]; default 0.2 mm, common
        practice for strands fed one at a time (no source).

    Returns
    -------
    bool
        ``insulated_diameter + clearance <= opening``.

    References
    ----------
    Geometric condition [calc]; clearance [cp].
    """
    return opening_clearance(opening, insulated_diameter) >= clearance


def opening_clearance(opening: float, insulated_diameter: float) -> float:
    """Free width left beside an insulated round strand passing the slot opening.

    Parameters
    ----------
    opening : float
        Slot opening ``b0`` [m].
    insulated_diameter : float
        Strand diameter over the enamel [m].

    Returns
    -------
    float
        ``b0 - d_ins`` [m]; negative when the strand does not pass.

    References
    ----------
    Geometric condition [calc].
    """
    return opening - insulated_diameter


def slot_width_clearance(slot_width: float, insulated_width: float, liner: float) -> float:
    """Free width left across an open slot by one rectangular strand and two liners.

    Parameters
    ----------
    slot_width : float
        Width ``b`` of the open slot [m].
    insulated_width : float
        Strand width over its insulation [m].
    liner : float
        Slot-liner thickness on each wall [m].

    Returns
    -------
    float
        ``b - (w_ins + 2 t)`` [m]; negative when the strand does not fit.

    References
    ----------
    Geometric condition [calc], strands stacked radially, one across the slot.
    """
    return slot_width - (insulated_width + 2.0 * liner)


# --- currents and current density ------------------------------------------------------------


def _connection_ratio(connection: Connection, phases: int) -> float:
    """Line over phase quantity across one polygon side or star point: ``2 sin(pi/m)``."""
    if connection not in ("star", "delta"):
        raise ValueError(f"connection must be 'star' or 'delta', got {connection!r}")
    if isinstance(phases, bool) or not isinstance(phases, int) or phases < 1:
        raise ValueError(f"phases must be a whole number >= 1, got {phases!r}")
    if phases == 1:
        return 1.0  # one phase: the winding sits across the line, star and delta alike
    return 2.0 * math.sin(math.pi / phases)


def phase_current(line_current: float, connection: Connection, phases: int = 3) -> float:
    """Winding phase current from the line current, for a symmetric m-phase connection.

    Parameters
    ----------
    line_current : float
        Rated rms line current [A].
    connection : {"star", "delta"}
        Star, or polygon ("delta", the polygon of three phases).
    phases : int, optional
        Phases ``m`` >= 1 [-], displaced ``2 pi / m`` electrical (so m = 2 means two phases
        pi apart, not a 90-degree two-phase system).

    Returns
    -------
    float
        Star: ``I_L``; polygon: ``I_L / (2 sin(pi/m))`` (``I_L / sqrt(3)`` for m = 3) [A];
        for m = 1 both give ``I_L``.

    References
    ----------
    Phasor geometry of a symmetric polygon: each line current is the difference of two
    adjacent phase currents ``2 pi / m`` apart, of magnitude ``2 sin(pi/m) I_ph`` [calc];
    for m = 3, [mem: Fitzgerald and Kingsley, Electric Machinery, three-phase connections].
    """
    ratio = _connection_ratio(connection, phases)
    return line_current if connection == "star" else line_current / ratio


def phase_voltage(line_voltage: float, connection: Connection, phases: int = 3) -> float:
    """Winding phase voltage from the line voltage, for a symmetric m-phase connection.

    Parameters
    ----------
    line_voltage : float
        Rated rms voltage between adjacent lines [V].
    connection : {"star", "delta"}
        Star, or polygon ("delta", the polygon of three phases).
    phases : int, optional
        Phases ``m`` >= 1 [-], displaced ``2 pi / m`` electrical (so m = 2 means two phases
        pi apart, not a 90-degree two-phase system).

    Returns
    -------
    float
        Star: ``U_L / (2 sin(pi/m))`` (``U_L / sqrt(3)`` for m = 3); polygon: ``U_L`` [V];
        for m = 1 both give ``U_L``.

    References
    ----------
    Phasor geometry of a symmetric star: the voltage between adjacent lines is the
    difference of two phase voltages ``2 pi / m`` apart, ``2 sin(pi/m) U_ph`` [calc]; for
    m = 3, [mem: Fitzgerald and Kingsley, Electric Machinery, three-phase connections].
    """
    ratio = _connection_ratio(connection, phases)
    return line_voltage / ratio if connection == "star" else line_voltage


def current_density(current: float, area: float, parallel: int = 1) -> float:
    """Current density in a conductor, with ``parallel`` equal conductors sharing the current.

    Used for strands, cage bars, end rings and field coils alike.

    Parameters
    ----------
    current : float
        Rms (or DC) current [A].
    area : float
        Section of one conductor [m^2].
    parallel : int, optional
        Equal conductors sharing ``current`` [-].

    Returns
    -------
    float
        ``I / (parallel * area)`` [A/m^2].

    References
    ----------
    Definition [calc].
    """
    _check_positive(area=area)
    if parallel < 1:
        raise ValueError("parallel must be >= 1")
    return current / (parallel * area)


def winding_current_density(
    phase_current: float, parallel_paths: int, strands: int, strand_area: float
) -> float:
    """Current density per strand of a stator winding, ``I_ph / (a n S)`` [A/m^2].

    Parameters
    ----------
    phase_current : float
        Rms phase current [A].
    parallel_paths : int
        Parallel paths ``a`` [-].
    strands : int
        Strands in hand ``n`` [-].
    strand_area : float
        Bare section of one strand ``S`` [m^2].

    Returns
    -------
    float
        [A/m^2].

    References
    ----------
    Definition [calc]; typical ranges in [mem: Pyrhonen, Design of Rotating Electrical
    Machines, Table 6.2].
    """
    return current_density(phase_current, strand_area, parallel_paths * strands)


def field_coil_current_density(field_current: float, conductor_area: float) -> float:
    """Current density in a salient-pole field coil, field current over conductor section.

    Parameters
    ----------
    field_current : float
        DC field current [A].
    conductor_area : float
        Bare section of the field conductor [m^2].

    Returns
    -------
    float
        [A/m^2].

    References
    ----------
    Definition [calc].
    """
    return current_density(field_current, conductor_area)


def bar_current_factor(power_factor: float) -> float:
    """Share of the stator current that the cage carries, ``k = 0.8 cos(phi) + 0.2``.

    Parameters
    ----------
    power_factor : float
        Rated power factor ``cos(phi)`` [-].

    Returns
    -------
    float
        ``k`` [-]; it tends to 1 as the magnetising share vanishes.

    References
    ----------
    [mem: Boldea and Nasar, The Induction Machine Design Handbook, rotor bar current
    estimate ``K_I = 0.8 cos(phi) + 0.2``].
    """
    if not 0.0 < power_factor <= 1.0:
        raise ValueError("power factor must lie in (0, 1]")
    return 0.8 * power_factor + 0.2


def bar_current(
    phase_current: float,
    phases: int,
    turns_per_phase: float,
    winding_factor: float,
    rotor_bars: int,
    factor: float = 1.0,
) -> float:
    """Cage bar current referred from the stator current by equal fundamental MMF.

    Parameters
    ----------
    phase_current : float
        Rms stator phase current [A].
    phases : int
        Stator phases ``m`` [-].
    turns_per_phase : float
        Series turns per phase ``N_ph`` [-].
    winding_factor : float
        Fundamental winding factor ``kw1`` [-].
    rotor_bars : int
        Bars ``Q_r`` [-].
    factor : float, optional
        Load share ``k`` of the stator current (see :func:`bar_current_factor`); the default
        1 refers the whole stator current, magnetising share included: an upper bound.

    Returns
    -------
    float
        ``I_bar = (2 m N_ph kw1 / Q_r) I_ph k`` [A, rms].

    References
    ----------
    [mem: Boldea and Nasar, The Induction Machine Design Handbook]; the same referral in
    [mem: Pyrhonen, Design of Rotating Electrical Machines].
    """
    if rotor_bars < 2:
        raise ValueError("a cage needs at least 2 bars")
    return 2.0 * phases * turns_per_phase * winding_factor / rotor_bars * phase_current * factor


def end_ring_current(bar_current: float, pole_pairs: int, rotor_bars: int) -> float:
    """End-ring current of a cage, ``I_bar / (2 sin(pi p / Q_r))`` [A, rms].

    Parameters
    ----------
    bar_current : float
        Rms bar current [A].
    pole_pairs : int
        Pole pairs ``p`` [-].
    rotor_bars : int
        Bars ``Q_r`` [-].

    Returns
    -------
    float
        Rms current in a ring segment [A].

    References
    ----------
    Kirchhoff's current law at each bar-ring node with adjacent bar currents shifted by
    ``2 pi p / Q_r`` [mem: Pyrhonen, Design of Rotating Electrical Machines].
    """
    s = math.sin(math.pi * pole_pairs / rotor_bars)
    if abs(s) < 1e-12:
        raise ValueError("p / Q_r must not be an integer: the ring would carry no defined current")
    return bar_current / (2.0 * abs(s))


# --- loading ---------------------------------------------------------------------------------


def electric_loading(
    phases: int, turns_per_phase: float, phase_current: float, bore_diameter: float
) -> float:
    """Electric (linear current) loading, ``A = 2 m N_ph I / (pi D)`` [A/m, rms].

    Parameters
    ----------
    phases : int
        ``m`` [-].
    turns_per_phase : float
        Series turns per phase ``N_ph`` [-].
    phase_current : float
        Rms phase current [A].
    bore_diameter : float
        Stator bore ``D`` [m].

    Returns
    -------
    float
        [A/m].

    References
    ----------
    [mem: Pyrhonen, Design of Rotating Electrical Machines].
    """
    _check_positive(bore_diameter=bore_diameter)
    return 2.0 * phases * turns_per_phase * phase_current / (math.pi * bore_diameter)


def thermal_load(electric_loading: float, current_density: float) -> float:
    """Thermal load ``A J`` [A^2/m^3]; ``rho A J`` is copper loss per bore area.

    Parameters
    ----------
    electric_loading : float
        ``A`` [A/m].
    current_density : float
        ``J`` [A/m^2].

    Returns
    -------
    float
        [A^2/m^3] (1 A^2/mm^3 = 1e9 A^2/m^3).

    References
    ----------
    [mem: Pyrhonen, Design of Rotating Electrical Machines].
    """
    return electric_loading * current_density


# --- resistance and loss ---------------------------------------------------------------------


@dataclass(frozen=True)
class ConductorMaterial:
    """Resistivity at 20 degC and its linear temperature coefficient.

    Parameters
    ----------
    name : str
    resistivity20 : float
        Resistivity at 20 degC [ohm m].
    alpha20 : float
        Temperature coefficient at 20 degC [1/K].
    source : str
    """

    name: str
    resistivity20: float
    alpha20: float
    source: str


#: Annealed copper: 1/58 ohm mm^2/m, alpha20 0.00393 /K [pub: IEC 60028].
COPPER = ConductorMaterial("annealed copper", 1e-6 / 58.0, 0.00393, "IEC 60028")
#: Hard-drawn aluminium: 0.028264 ohm mm^2/m [mem: IEC 60889], alpha20 0.00403 /K [pub].
#: Cast cage alloys conduct less: pass a material of their own.
ALUMINIUM = ConductorMaterial("aluminium", 0.028264e-6, 0.00403, "IEC 60889")


def resistance_factor(alpha20: float, temperature: float) -> float:
    """Resistance ratio ``R(T) / R20 = 1 + alpha20 (T - 20 degC)``.

    Parameters
    ----------
    alpha20 : float
        Temperature coefficient at 20 degC [1/K].
    temperature : float
        Conductor temperature [K].

    Returns
    -------
    float
        [-].

    References
    ----------
    [pub: IEC 60028] (linear law with alpha20).
    """
    return 1.0 + alpha20 * (temperature - T20)


def resistivity(material: ConductorMaterial, temperature: float) -> float:
    """Resistivity at a temperature, ``rho20 (1 + alpha20 (T - 20 degC))`` [ohm m].

    Parameters
    ----------
    material : ConductorMaterial
    temperature : float
        [K].

    Returns
    -------
    float
        [ohm m].

    References
    ----------
    [pub: IEC 60028].
    """
    return material.resistivity20 * resistance_factor(material.alpha20, temperature)


def coil_span_width(
    bore_diameter: float, slot_depth: float, slots: int, coil_pitch: float
) -> float:
    """Coil span measured along the circle through the middle of the slots.

    Parameters
    ----------
    bore_diameter : float
        [m].
    slot_depth : float
        Total slot depth [m].
    slots : int
        ``Q`` [-].
    coil_pitch : float
        Coil pitch in slots [-].

    Returns
    -------
    float
        ``pi (D + h) / Q * y`` [m].

    References
    ----------
    Geometry [calc].
    """
    return math.pi * (bore_diameter + slot_depth) / slots * coil_pitch


def mean_turn_length(stack_length: float, coil_span: float, *, high_voltage: bool = False) -> float:
    """Mean length of one turn: two stack lengths plus the two end windings.

    Parameters
    ----------
    stack_length : float
        Core length ``l`` [m].
    coil_span : float
        Coil span ``W`` [m] (:func:`coil_span_width`).
    high_voltage : bool, optional
        Form-wound high-voltage coils (longer end windings).

    Returns
    -------
    float
        ``2 l + 2.4 W + 0.1 m`` (low voltage) or ``2 l + 2.9 W + 0.2 m`` (high voltage) [m].
        For tooth coils the end-winding term overestimates: use
        :func:`tooth_coil_mean_turn_length`.

    References
    ----------
    [mem: Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical Machines, estimate
    of the average coil turn length].
    """
    if high_voltage:
        return 2.0 * stack_length + 2.9 * coil_span + 0.2
    return 2.0 * stack_length + 2.4 * coil_span + 0.1


def tooth_coil_mean_turn_length(
    stack_length: float, tooth_width: float, coil_side_width: float
) -> float:
    """Mean length of one turn of a coil wound around a single tooth.

    The coil hugs the tooth: the centre line of its side runs ``w_c / 2`` off the tooth's
    rectangular section ``l x b_t`` and turns the corners on arcs of that radius, so the mean
    turn is the perimeter of the section's parallel body at distance ``w_c / 2``.

    Parameters
    ----------
    stack_length : float
        Core length ``l`` [m].
    tooth_width : float
        Mean width ``b_t`` of the tooth along the coil side [m].
    coil_side_width : float
        Width ``w_c`` of one coil side across the slot [m]: half the mean slot width for a
        double layer (two coils side by side in a slot), the mean slot width for a single
        layer.

    Returns
    -------
    float
        ``2 (l + b_t) + pi w_c`` [m].

    References
    ----------
    [calc] Steiner's formula: the parallel body of a convex figure at distance ``r`` has the
    perimeter ``P + 2 pi r``, here ``P = 2 (l + b_t)`` and ``r = w_c / 2``. That the coil lies
    tight on the tooth, with no end-winding clearance, is common practice, no source.
    """
    _check_positive(
        stack_length=stack_length, tooth_width=tooth_width, coil_side_width=coil_side_width
    )
    return 2.0 * (stack_length + tooth_width) + math.pi * coil_side_width


def phase_resistance(
    resistivity: float,
    turns_per_phase: float,
    mean_turn_length: float,
    parallel_paths: int,
    strands: int,
    strand_area: float,
) -> float:
    """DC phase resistance, ``rho N_ph l_av / (a n S)`` [ohm].

    Parameters
    ----------
    resistivity : float
        At the temperature wanted [ohm m] (:func:`resistivity`).
    turns_per_phase : float
        Series turns per phase (per parallel path) ``N_ph`` [-].
    mean_turn_length : float
        ``l_av`` [m].
    parallel_paths : int
        ``a`` [-].
    strands : int
        Strands in hand ``n`` [-].
    strand_area : float
        ``S`` [m^2].

    Returns
    -------
    float
        [ohm], skin and proximity effects neglected.

    References
    ----------
    [mem: Pyrhonen, Design of Rotating Electrical Machines].
    """
    _check_positive(strand_area=strand_area)
    if parallel_paths < 1 or strands < 1:
        raise ValueError("parallel paths and strands must be >= 1")
    return (
        resistivity * turns_per_phase * mean_turn_length / (parallel_paths * strands * strand_area)
    )


def copper_loss(phases: int, phase_current: float, phase_resistance: float) -> float:
    """Winding loss ``m I^2 R`` [W].

    Parameters
    ----------
    phases : int
        ``m`` [-].
    phase_current : float
        Rms phase current [A].
    phase_resistance : float
        [ohm].

    Returns
    -------
    float
        [W].

    References
    ----------
    Joule's law [calc].
    """
    return phases * phase_current**2 * phase_resistance


# --- insulation classes ----------------------------------------------------------------------


@dataclass(frozen=True)
class InsulationClass:
    """A thermal class and the limits tied to it.

    Parameters
    ----------
    letter : str
        Letter designation (IEC 60085).
    class_temperature : float
        Thermal class [K] (e.g. 155 degC for F).
    rise_limit : float or None
        Winding rise by resistance, indirect air cooling, 40 degC coolant, machines up to
        200 kW [K] (IEC 60034-1); None where REFERENCE.md does not give it.
    reference_temperature : float or None
        Temperature for loss figures [K]; None where not covered.
    """

    letter: str
    class_temperature: float
    rise_limit: float | None
    reference_temperature: float | None


#: IEC 60085 classes [pub]; IEC 60034-1 rises for B, F, H [pub, via a manufacturer's
#: manual] and for A 60 K, E 75 K [from memory: IEC 60034-1 Table 7]; loss reference
#: temperatures [mem: IEC 60034-2-1], A and E taken as rise limit + 15 K like B (from memory).
#: N is not covered here.
INSULATION_CLASSES: dict[str, InsulationClass] = {
    c.letter: c
    for c in (
        InsulationClass("A", 105.0 + ZERO_CELSIUS, 60.0, 75.0 + ZERO_CELSIUS),
        InsulationClass("E", 120.0 + ZERO_CELSIUS, 75.0, 90.0 + ZERO_CELSIUS),
        InsulationClass("B", 130.0 + ZERO_CELSIUS, 80.0, 95.0 + ZERO_CELSIUS),
        InsulationClass("F", 155.0 + ZERO_CELSIUS, 105.0, 115.0 + ZERO_CELSIUS),
        InsulationClass("H", 180.0 + ZERO_CELSIUS, 125.0, 135.0 + ZERO_CELSIUS),
        InsulationClass("N", 200.0 + ZERO_CELSIUS, None, None),
    )
}


def insulation_class(letter: str) -> InsulationClass:
    """Look up an IEC 60085 thermal class by letter.

    Parameters
    ----------
    letter : str
        One of A, E, B, F, H, N (case-insensitive).

    Returns
    -------
    InsulationClass

    References
    ----------
    [pub: IEC 60085]; [pub: IEC 60034-1]; REFERENCE.md.
    """
    try:
        return INSULATION_CLASSES[letter.strip().upper()]
    except KeyError:
        raise ValueError(f"unknown insulation class {letter!r}") from None


def temperature_rise_limit(letter: str) -> float:
    """IEC 60034-1 winding rise limit for a class [K]; raises where not covered.

    Parameters
    ----------
    letter : str
        A, E, B, F or H (N raises).

    Returns
    -------
    float
        [K] over a 40 degC coolant, by resistance, indirect air cooling, up to 200 kW.

    References
    ----------
    [pub: IEC 60034-1, via a manufacturer's manual].
    """
    cls = insulation_class(letter)
    if cls.rise_limit is None:
        raise ValueError(f"no temperature-rise limit is on record for class {cls.letter}")
    return cls.rise_limit


def reference_temperature(letter: str) -> float:
    """Reference winding temperature for losses of a class [K]; raises where not covered.

    Parameters
    ----------
    letter : str
        A, E, B, F or H (N raises).

    Returns
    -------
    float
        [K] (A 75, E 90, B 95, F 115, H 135 degC; A and E from memory).

    References
    ----------
    [mem: IEC 60034-1 / IEC 60034-2-1 reference temperatures].
    """
    cls = insulation_class(letter)
    if cls.reference_temperature is None:
        raise ValueError(f"no reference temperature is on record for class {cls.letter}")
    return cls.reference_temperature
