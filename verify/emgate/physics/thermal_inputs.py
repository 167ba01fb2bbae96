"""What the lumped thermal network is fed: cooling, stator geometry, parameters, losses.

The cooling methods the network knows, the stator dimensions the heat path needs, the
material and cooling parameters (each default with its source), the losses by where they
arise and what the gap crossing needs. The network itself is
:func:`emgate.physics.thermal.machine_temperature_rise`.
"""

from __future__ import annotations

from typing import Literal, NamedTuple

from emgate.physics.convection import STANDARD_PRESSURE

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


class StatorThermalGeometry(NamedTuple):
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


class ThermalParameters(NamedTuple):
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


class HeatSources(NamedTuple):
    """Losses [W] by where they arise in the machine.

    Parameters
    ----------
    copper_slot, copper_end : float
        Stator copper loss in the slot parts and in the end windings.
    iron_teeth, iron_yoke : float
        Stator iron loss.
    rotor : float
        All rotor loss (cage or field copper, rotor iron, magnet eddy currents, the rotor
        share of stray load), leaving across the gap.
    friction : float
        Friction and windage, at the frame.
    """

    copper_slot: float = 0.0
    copper_end: float = 0.0
    iron_teeth: float = 0.0
    iron_yoke: float = 0.0
    rotor: float = 0.0
    friction: float = 0.0

    @property
    def copper(self) -> float:
        """[W]."""
        return self.copper_slot + self.copper_end

    @property
    def total(self) -> float:
        """[W]."""
        return self.copper + self.iron_teeth + self.iron_yoke + self.rotor + self.friction

    def with_copper(self, copper: float) -> HeatSources:
        """The same sources with the copper loss rescaled to ``copper`` [W], its slot and
        end shares kept (both shares at one mean winding temperature)."""
        total = self.copper
        slot_share = self.copper_slot / total if total > 0.0 else 1.0
        return HeatSources(
            copper * slot_share,
            copper * (1.0 - slot_share),
            self.iron_teeth,
            self.iron_yoke,
            self.rotor,
            self.friction,
        )


class RotorGap(NamedTuple):
    """What the gap crossing needs (SI).

    Parameters
    ----------
    air_gap : float
        Radial gap [m].
    rotor_diameter : float
        [m].
    speed : float
        [1/s].
    """

    air_gap: float
    rotor_diameter: float
    speed: float
