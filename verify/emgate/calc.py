"""The calculation of one design: every recomputed quantity, from the raw record, once.

Each quantity is a lazily computed, cached attribute that calls the physics kernel with inputs
taken from the validated record (never from its ``declared`` block). Rules read what they need;
``emgate show`` prints the sheet of every quantity registered here, under a stable dotted name,
with its unit and method. Rules therefore share one computation of a quantity, not one
another's verdicts.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass
from functools import cached_property
from typing import TYPE_CHECKING, Any

from emgate import geometry as geo
from emgate.model import MACHINE_KINDS

if TYPE_CHECKING:
    import numpy as np

    from emgate.materials import Catalogue
    from emgate.model import (
        AnyDesign,
        OpenSlot,
        RectangularConductor,
        RoundConductor,
        SemiClosedSlot,
    )
    from emgate.physics.bh import BHCurve
    from emgate.physics.conductors import ConductorMaterial
    from emgate.physics.magnetic import GapResult, PolePath, SurfacePMResult
    from emgate.physics.thermal import ThermalEstimate


@dataclass(frozen=True)
class SheetEntry:
    """A named quantity of the calculation sheet."""

    name: str
    attribute: str
    unit: str
    method: str
    machines: tuple[str, ...]


SHEET: dict[str, SheetEntry] = {}

#: Slot liner when the record gives none: 0.25 mm of insulating paper is usual for
#: low-voltage random windings (common practice, no source).
DEFAULT_LINER = 0.25e-3
#: Cooled frame length over the stack length when the record gives no cooling.frame_length:
#: the frame with its end shields (the record's documented default; common practice, no
#: source).
FRAME_PER_STACK = 1.5
#: Flux of a salient pole's body over its gap flux, for the pole-to-pole leakage
#: (1.1 to 1.25 is usual; common practice, no source).
POLE_LEAKAGE = 1.15


def sheet(
    name: str, unit: str, method: str, machines: tuple[str, ...] = MACHINE_KINDS
) -> Callable[[Callable[[Any], float]], cached_property[float]]:
    """Register a Calculation property as a named quantity of the sheet."""

    def register(fn: Callable[[Any], float]) -> cached_property[float]:
        SHEET[name] = SheetEntry(name, fn.__name__, unit, method, machines)
        return cached_property(fn)

    return register


class Calculation:
    """Recomputed quantities of one design (SI floats)."""

    def __init__(self, design: AnyDesign, catalogue: Catalogue) -> None:
        self.d = design
        self.catalogue = catalogue

    def value(self, name: str) -> float:
        return float(getattr(self, SHEET[name].attribute))

    def applies(self, name: str) -> bool:
        return self.d.machine in SHEET[name].machines

    # --- materials -----------------------------------------------------------------------

    @cached_property
    def stator_steel(self) -> BHCurve:
        curve = self.catalogue.get(self.d.stator.steel)
        assert curve is not None  # resolved at validation
        return curve

    @cached_property
    def rotor_steel(self) -> BHCurve:
        name = self.d.rotor.steel or self.d.stator.steel
        curve = self.catalogue.get(name)
        assert curve is not None
        return curve

    # --- winding -------------------------------------------------------------------------

    @cached_property
    def layout(self) -> np.ndarray:
        """Signed coil sides per phase and slot, shape (m, Q)."""
        from emgate.physics import winding as wk

        w = self.d.winding
        if w.layout is not None:
            return layout_from_table(w.layout, w.phases)
        return wk.star_of_slots(
            self.d.stator.slots, self.d.pole_pairs, w.phases, w.layers, w.coil_pitch
        )

    @sheet(
        "winding.series_turns",
        "1",
        "series turns per phase N_ph: coils per phase times turns per coil, over parallel paths",
    )
    def series_turns(self) -> float:
        from emgate.physics.winding import series_turns_per_phase

        w = self.d.winding
        return series_turns_per_phase(
            self.d.stator.slots, w.layers, w.phases, w.turns_per_coil, w.parallel_paths
        )

    @sheet(
        "winding.phase_current",
        "A",
        "rated line current through the connection of m phases"
        " (star: equal; delta: over 2 sin(pi/m), sqrt 3 for three phases)",
    )
    def phase_current(self) -> float:
        from emgate.physics.conductors import phase_current

        r = self.d.rating
        return phase_current(r.line_current, r.connection, self.d.winding.phases)

    @sheet(
        "winding.phase_voltage",
        "V",
        "rated line voltage through the connection of m phases"
        " (delta: equal; star: over 2 sin(pi/m), sqrt 3 for three phases)",
    )
    def phase_voltage(self) -> float:
        from emgate.physics.conductors import phase_voltage

        r = self.d.rating
        return phase_voltage(r.line_voltage, r.connection, self.d.winding.phases)

    @cached_property
    def strand_area(self) -> float:
        return conductor_strand_area(self.d.winding.conductor)

    @sheet(
        "stator.current_density",
        "A/mm^2",
        "J = I_ph / (a n S): phase current over parallel paths a, strands in hand n and bare"
        " strand section S",
    )
    def stator_current_density(self) -> float:
        from emgate.physics.conductors import winding_current_density

        w = self.d.winding
        return winding_current_density(
            self.phase_current, w.parallel_paths, w.conductor.strands, self.strand_area
        )

    @cached_property
    def conductor_material(self) -> ConductorMaterial:
        from emgate.physics import conductors as ck

        return ck.COPPER if self.d.winding.conductor.material == "copper" else ck.ALUMINIUM

    # --- slots and conductors ------------------------------------------------------------

    @cached_property
    def liner(self) -> float:
        w = self.d.winding
        return DEFAULT_LINER if w.slot_liner is None else w.slot_liner

    @cached_property
    def slot_perimeter(self) -> float:
        """Perimeter of the slot's winding zone, along which the liner lies [m]."""
        from emgate.physics import conductors as ck

        sl = self.d.stator.slot
        if sl.shape == "semi_closed":
            return ck.semi_closed_slot_perimeter(
                sl.opening_height, sl.wedge_height, sl.top_width, sl.bottom_width, sl.height
            )
        return ck.open_slot_perimeter(sl.width, sl.height, sl.wedge_height)

    def _slot_area(self, liner: float) -> float:
        return slot_winding_area(self.d.stator.slot, liner)

    @sheet(
        "stator.slot_area_gross",
        "mm^2",
        "area of the slot's winding zone (below opening and wedge), liner not deducted",
    )
    def slot_area_gross(self) -> float:
        return self._slot_area(0.0)

    @sheet(
        "stator.slot_area", "mm^2", "winding zone net of the slot liner laid along its perimeter"
    )
    def slot_area(self) -> float:
        return self._slot_area(self.liner)

    @sheet("stator.conductors_per_slot", "1", "layers times turns per coil")
    def conductors_per_slot(self) -> float:
        return self.d.winding.layers * self.d.winding.turns_per_coil

    @sheet(
        "stator.copper_area",
        "mm^2",
        "bare copper per slot: conductors, strands in hand and strand section",
    )
    def copper_area(self) -> float:
        from emgate.physics.conductors import copper_area_per_slot

        return copper_area_per_slot(
            int(self.conductors_per_slot), self.d.winding.conductor.strands, self.strand_area
        )

    @sheet("stator.slot_fill", "1", "bare copper area over the slot area net of liner")
    def slot_fill(self) -> float:
        from emgate.physics.conductors import fill_factor

        return fill_factor(self.copper_area, self.slot_area)

    @sheet("stator.electric_loading", "kA/m", "A = 2 m N_ph I / (pi D), rms")
    def electric_loading(self) -> float:
        from emgate.physics.conductors import electric_loading

        return electric_loading(
            self.d.winding.phases,
            self.series_turns,
            self.phase_current,
            self.d.stator.bore_diameter,
        )

    @sheet("stator.thermal_load", "A^2/mm^3", "electric loading times current density, A J")
    def thermal_load(self) -> float:
        from emgate.physics.conductors import thermal_load

        return thermal_load(self.electric_loading, self.stator_current_density)

    @sheet(
        "winding.mean_turn_length",
        "mm",
        "distributed coils: 2 l + 2.4 W + 0.1 m, W the coil span at mid-slot (2.9 W + 0.2 m"
        " above 1 kV); tooth coils: 2 (l + b_t) + pi w_c, b_t the mean tooth width, w_c the"
        " coil-side width (the mean slot width over the layers)",
    )
    def mean_turn_length(self) -> float:
        from emgate.physics import conductors as ck

        d = self.d
        if d.winding.coil_pitch == 1:
            top, bottom, w_top, w_bottom = geo.winding_zone(d.stator.slot)
            slot_width = (w_top + w_bottom) / 2.0
            # Tooth and slot widths vary linearly with depth: their means sit at mid-zone.
            mid = d.stator.bore_diameter / 2.0 + (top + bottom) / 2.0
            tooth = geo.stator_slot_pitch_at(d, mid) - slot_width
            return ck.tooth_coil_mean_turn_length(
                d.stator.stack_length, tooth, slot_width / d.winding.layers
            )
        span = ck.coil_span_width(
            d.stator.bore_diameter, d.stator.slot.height, d.stator.slots, d.winding.coil_pitch
        )
        return ck.mean_turn_length(
            d.stator.stack_length, span, high_voltage=d.rating.line_voltage > 1000.0
        )

    def _phase_resistance(self, temperature: float) -> float:
        from emgate.physics import conductors as ck

        w = self.d.winding
        return ck.phase_resistance(
            ck.resistivity(self.conductor_material, temperature),
            self.series_turns,
            self.mean_turn_length,
            w.parallel_paths,
            w.conductor.strands,
            self.strand_area,
        )

    @sheet(
        "winding.phase_resistance_20c",
        "ohm",
        "DC phase resistance at 20 degC, rho20 N_ph l_av / (a n S), l_av the mean turn length"
        " (rho20: IEC 60028 copper, IEC 60889 aluminium)",
    )
    def phase_resistance_20c(self) -> float:
        return self._phase_resistance(293.15)

    @cached_property
    def class_reference_temperature(self) -> float:
        from emgate.physics.conductors import reference_temperature

        return reference_temperature(self.d.winding.insulation_class)

    @sheet(
        "winding.phase_resistance_hot",
        "ohm",
        "phase resistance at the reference temperature of the insulation class",
    )
    def phase_resistance_hot(self) -> float:
        return self._phase_resistance(self.class_reference_temperature)

    @sheet("winding.copper_loss", "W", "m I^2 R at the class reference temperature")
    def copper_loss(self) -> float:
        from emgate.physics.conductors import copper_loss

        return copper_loss(self.d.winding.phases, self.phase_current, self.phase_resistance_hot)

    def thermal_estimate(self) -> ThermalEstimate:
        """The lumped winding-temperature estimate, with the record's cooling-surface factors
        (``cooling.fin_area_factor``, ``frame_length``, ``core_area_factor``)."""
        return self._thermal_estimate

    @cached_property
    def _thermal_estimate(self) -> ThermalEstimate:
        from emgate.physics import thermal as tk

        d = self.d
        cooling = d.cooling
        frame = cooling.frame_length
        if frame is None:
            frame = FRAME_PER_STACK * d.stator.stack_length
        top, bottom, _, _ = geo.winding_zone(d.stator.slot)
        geometry = tk.StatorThermalGeometry(
            bore_diameter=d.stator.bore_diameter,
            outer_diameter=d.stator.outer_diameter,
            stack_length=d.stator.stack_length,
            slots=d.stator.slots,
            slot_depth=d.stator.slot.height,
            winding_area=self.slot_area_gross,
            winding_height=bottom - top,
            winding_perimeter=self.slot_perimeter,
            liner_thickness=self.liner,
            stacking_factor=d.stator.stacking_factor,
            frame_length=frame,
        )
        params = tk.ThermalParameters(
            fin_area_factor=cooling.fin_area_factor, core_area_factor=cooling.core_area_factor
        )
        return tk.winding_temperature_rise(
            self.copper_loss,
            geometry,
            cooling.method,
            coolant_temperature=cooling.ambient,
            parameters=params,
        )

    @sheet(
        "winding.temperature_rise",
        "K",
        "lumped steady-state estimate of the mean winding"
        " rise over the coolant, copper loss only (an estimate, to be confirmed by test)",
    )
    def temperature_rise(self) -> float:
        return self.thermal_estimate().winding_rise

    # --- rotor conductors ----------------------------------------------------------------

    @cached_property
    def bar_area(self) -> float:
        from emgate.physics import conductors as ck

        cage = self.d.rotor.cage
        if cage.bar is not None:
            return ck.rectangular_strand_area(cage.bar.width, cage.bar.height)
        sl = self.d.rotor.slot
        if sl.shape == "semi_closed":
            return ck.semi_closed_full_area(
                sl.opening,
                sl.opening_height,
                sl.wedge_height,
                sl.top_width,
                sl.bottom_width,
                sl.height,
            )
        return ck.open_full_area(sl.width, sl.height)

    @sheet(
        "rotor.bar_current",
        "A",
        "stator current referred to a bar by equal fundamental MMF,"
        " 2 m N_ph kw1 I / Q_r (magnetising share not deducted: an upper bound)",
        ("induction",),
    )
    def bar_current(self) -> float:
        from emgate.physics.conductors import bar_current

        return bar_current(
            self.phase_current,
            self.d.winding.phases,
            self.series_turns,
            self.winding_factor,
            self.d.rotor.slots,
        )

    @sheet(
        "rotor.bar_current_density",
        "A/mm^2",
        "bar current over bar section (a cast bar fills its slot)",
        ("induction",),
    )
    def bar_current_density(self) -> float:
        from emgate.physics.conductors import current_density

        return current_density(self.bar_current, self.bar_area)

    @sheet(
        "rotor.ring_current_density",
        "A/mm^2",
        "ring current I_bar / (2 sin(pi p / Q_r)) over the ring section",
        ("induction",),
    )
    def ring_current_density(self) -> float:
        from emgate.physics.conductors import current_density, end_ring_current

        ring = self.d.rotor.cage.end_ring
        current = end_ring_current(self.bar_current, self.d.pole_pairs, self.d.rotor.slots)
        return current_density(current, ring.axial_width * ring.radial_height)

    @sheet(
        "rotor.field_current_density",
        "A/mm^2",
        "field current over the conductor section",
        ("salient_field",),
    )
    def field_current_density(self) -> float:
        from emgate.physics.conductors import field_coil_current_density

        f = self.d.rotor.field
        return field_coil_current_density(
            f.current, f.conductor.strands * conductor_strand_area(f.conductor)
        )

    # --- winding factors and MMF ---------------------------------------------------------

    @sheet(
        "winding.winding_factor",
        "1",
        "general winding factor of phase A at the working"
        " order p from the slot layout: |sum c_s exp(j p theta_s)| / sum |c_s|",
    )
    def winding_factor(self) -> float:
        import numpy as np

        from emgate.physics.winding import winding_factors

        return float(winding_factors(self.layout[0], np.array([self.d.pole_pairs]))[0])

    @cached_property
    def winding_problems(self) -> list[str]:
        from emgate.physics.winding import balance, feasibility

        w = self.d.winding
        problems = list(balance(self.layout, self.d.pole_pairs))
        if w.layout is not None:
            reason = feasibility(self.d.stator.slots, self.d.pole_pairs, w.phases, w.layers)
            if reason:
                problems.append(reason)
        return problems

    @sheet(
        "winding.mmf_thd",
        "1",
        "total harmonic distortion of the staircase MMF, all orders"
        " including sub-harmonics, over the working harmonic (Parseval)",
    )
    def mmf_thd(self) -> float:
        from emgate.physics.mmf import mmf_thd

        return mmf_thd(self.layout, self.d.pole_pairs)

    @sheet(
        "winding.mmf_fundamental",
        "A",
        "peak rotating fundamental ampere-turns per pole, (sqrt 2 m / pi) kw1 N_ph I / p",
    )
    def mmf_fundamental(self) -> float:
        from emgate.physics.mmf import mmf_fundamental_peak

        return mmf_fundamental_peak(
            self.d.winding.phases,
            self.series_turns,
            self.winding_factor,
            self.phase_current,
            self.d.pole_pairs,
        )

    @sheet(
        "winding.mmf_peak",
        "A",
        "peak of the staircase MMF (ampere-turns per pole) over the gap and one electrical"
        " period at rated current, balanced sinusoidal currents; exact from the step levels:"
        " each level is a sinusoid in time, its crest sqrt(F_s(0)^2 + F_s(T/4)^2)",
    )
    def mmf_peak(self) -> float:
        from emgate.physics.mmf import mmf_peak

        w = self.d.winding
        return mmf_peak(self.layout, w.turns_per_coil, self.phase_current / w.parallel_paths)

    # --- air gap -------------------------------------------------------------------------

    @cached_property
    def slotting_gap(self) -> float:
        """The gap Carter's coefficient is taken on: with a surface magnet, the magnetic gap
        g + sleeve + h_m / mu_rec (the magnet is nearly air to the slot field)."""
        from emgate.physics.airgap import magnetic_gap

        if self.d.machine == "surface_pm":
            r = self.d.rotor
            return magnetic_gap(
                self.d.air_gap,
                sleeve=r.sleeve_thickness,
                magnet_thickness=r.magnet.thickness,
                recoil_permeability=r.magnet.material.recoil_permeability,
            )
        return self.d.air_gap

    @sheet(
        "air_gap.carter_coefficient",
        "1",
        "Carter's coefficient of the stator slotting,"
        " times that of the rotor slotting for a cage rotor",
    )
    def carter_coefficient(self) -> float:
        from emgate.physics.airgap import carter_coefficient

        kc = carter_coefficient(
            geo.stator_slot_pitch(self.d),
            geo.slot_width_at_gap(self.d.stator.slot),
            self.slotting_gap,
        )
        if self.d.machine == "induction":
            kc *= carter_coefficient(
                geo.rotor_slot_pitch(self.d),
                geo.slot_width_at_gap(self.d.rotor.slot),
                self.d.air_gap,
            )
        return kc

    @sheet(
        "air_gap.effective_length",
        "mm",
        "Carter's coefficient times the gap it is computed on: the mechanical gap, or for"
        " surface magnets the magnetic gap g + sleeve + h_m / mu_rec",
    )
    def effective_gap(self) -> float:
        return self.carter_coefficient * self.slotting_gap

    # --- magnetic circuit ----------------------------------------------------------------

    @cached_property
    def pole_path(self) -> PolePath:
        from emgate.physics.magnetic import PolePath, Teeth, Yoke

        d = self.d
        two_p = d.poles
        rotor_teeth = None
        if d.machine == "induction":
            rotor_teeth = Teeth(
                geo.rotor_slot_pitch(d), geo.rotor_tooth_width_min(d), d.rotor.slot.height
            )
        gap = self.effective_gap
        if d.machine == "surface_pm":
            # The kernel adds the magnet's h_m / mu_rec itself; hand it the rest of kc g'.
            m = d.rotor.magnet
            gap -= m.thickness / m.material.recoil_permeability
        return PolePath(
            pole_pitch=geo.pole_pitch(d),
            stack_length=d.stator.stack_length,
            iron_length=d.stator.stack_length,
            stacking_factor=d.stator.stacking_factor,
            effective_gap=gap,
            stator_teeth=Teeth(
                geo.stator_slot_pitch(d), geo.stator_tooth_width_min(d), geo.stator_tooth_height(d)
            ),
            stator_yoke=Yoke(
                geo.stator_yoke_height(d), math.pi * geo.stator_yoke_mean_diameter(d) / two_p
            ),
            rotor_yoke=Yoke(
                geo.rotor_yoke_height(d), math.pi * geo.rotor_yoke_mean_diameter(d) / two_p
            ),
            rotor_teeth=rotor_teeth,
        )

    @cached_property
    def magnetic(self) -> GapResult:
        """The machine's magnetic circuit at its rated (no-load for PM and field) point."""
        from emgate.physics import magnetic as mk

        d = self.d
        if d.machine == "induction":
            return mk.induction_gap(
                self.pole_path,
                self.stator_steel,
                self.rotor_steel,
                phase_voltage=self.phase_voltage,
                frequency=d.rating.frequency,
                series_turns=self.series_turns,
                winding_factor=self.winding_factor,
            )
        if d.machine == "surface_pm":
            return self._surface_pm_circuit(d.rotor.magnet.operating_temperature)
        pole = d.rotor.pole
        # The kernel's pole height runs from the gap to the rim, shoe included; the record's
        # body_height stops at the shoe. The body's flux density is carried over the shoe
        # too, which overrates the shoe's ampere-turns (safe side).
        salient = mk.SalientPole(
            geo.pole_shoe_width(d),
            pole.body_width,
            pole.body_height + pole.shoe_height,
            leakage_factor=POLE_LEAKAGE,
        )
        return mk.salient_field_gap(
            self.pole_path,
            salient,
            self.stator_steel,
            self.rotor_steel,
            field_mmf=d.rotor.field.turns_per_pole * d.rotor.field.current,
        )

    def _surface_pm_circuit(self, temperature: float) -> SurfacePMResult:
        """The surface-magnet circuit at no load with the magnet at ``temperature`` [K]."""
        from emgate.physics import magnetic as mk

        m = self.d.rotor.magnet
        br = mk.remanence_at(
            m.material.remanence,
            temperature,
            m.material.remanence_temperature_coefficient,
            m.material.reference_temperature,
        )
        magnet = mk.SurfaceMagnet(br, m.material.recoil_permeability, m.thickness, m.pole_arc)
        return mk.surface_pm_gap(self.pole_path, magnet, self.stator_steel, self.rotor_steel)

    @cached_property
    def magnetic_cold(self) -> SurfacePMResult:
        """The surface-magnet circuit at no load with the magnet at the coolant temperature
        (a cold start): Br, and so |H_0|, is higher cold for a negative remanence
        coefficient."""
        return self._surface_pm_circuit(self.d.cooling.ambient)

    @sheet(
        "air_gap.flux_density_peak",
        "T",
        "peak gap flux density from the magnetic circuit of the machine kind, iron included",
    )
    def gap_flux_density_peak(self) -> float:
        return self.magnetic.b_peak

    @sheet(
        "air_gap.flux_density_fundamental",
        "T",
        "amplitude of the fundamental of the gap flux density wave; above the peak for a"
        " flat-topped wave: (4/pi) sin(a pi/2) times it for a pole arc a, more than 1 for"
        " a > 0.575",
    )
    def gap_flux_density_fundamental(self) -> float:
        return self.magnetic.b_fundamental

    @sheet(
        "air_gap.flux_per_pole", "mWb", "gap flux of one pole (the whole wave, not its fundamental)"
    )
    def flux_per_pole(self) -> float:
        return self.magnetic.flux_per_pole

    @sheet("air_gap.saturation_factor", "1", "(gap + teeth ampere-turns) over gap ampere-turns")
    def saturation_factor(self) -> float:
        return self.magnetic.saturation_factor

    @sheet(
        "magnetic.total_mmf",
        "A",
        "ampere-turns per pole of the whole loop: gap, teeth, pole body and half of each yoke",
    )
    def total_mmf(self) -> float:
        return self.magnetic.total_mmf

    @sheet(
        "winding.back_emf",
        "V",
        "phase EMF rms at the rated frequency, no load: sqrt 2 pi f N_ph kw1 Phi1 with"
        " Phi1 = (2/pi) B1 tau_p l, B1 the fundamental gap flux density",
        ("surface_pm", "salient_field"),
    )
    def back_emf(self) -> float:
        """E = sqrt(2) pi f N_ph kw1 Phi1, Phi1 = (2/pi) B1 tau_p l [V] [from memory:
        Fitzgerald and Kingsley, Electric Machinery]: the fundamental flux per pole cut by
        the series turns at the rated electrical frequency."""
        d = self.d
        phi1 = 2.0 / math.pi * self.gap_flux_density_fundamental * geo.pole_pitch(d)
        phi1 *= d.stator.stack_length
        return (
            math.sqrt(2.0)
            * math.pi
            * d.rating.frequency
            * self.series_turns
            * self.winding_factor
            * phi1
        )

    @sheet(
        "stator.tooth_flux_density_apparent",
        "T",
        "B_g tau_s l / (k_Fe l_Fe b_t) at the narrowest tooth section",
    )
    def stator_tooth_b_apparent(self) -> float:
        return self.magnetic.iron.stator_tooth_b_apparent

    @sheet(
        "stator.tooth_flux_density",
        "T",
        "real tooth flux density with slot-flux sharing: B_app = B + mu0 k_s H(B)",
    )
    def stator_tooth_b(self) -> float:
        return self.magnetic.iron.stator_tooth_b

    @sheet("stator.yoke_flux_density", "T", "peak yoke flux density, Phi / (2 k_Fe l h_y)")
    def stator_yoke_b(self) -> float:
        return self.magnetic.iron.stator_yoke_b

    @sheet(
        "rotor.yoke_flux_density",
        "T",
        "peak rotor yoke flux density, Phi / (2 k_Fe l h_y), with pole leakage for salient poles",
    )
    def rotor_yoke_b(self) -> float:
        return self.magnetic.iron.rotor_yoke_b

    @sheet(
        "rotor.tooth_flux_density_apparent",
        "T",
        "apparent rotor tooth flux density at the narrowest tooth section, as for the stator",
        ("induction",),
    )
    def rotor_tooth_b_apparent(self) -> float:
        return self.magnetic.iron.rotor_tooth_b_apparent

    @sheet(
        "rotor.tooth_flux_density",
        "T",
        "real rotor tooth flux density with slot-flux sharing, as for the stator",
        ("induction",),
    )
    def rotor_tooth_b(self) -> float:
        return self.magnetic.iron.rotor_tooth_b

    @sheet(
        "rotor.pole_body_flux_density",
        "T",
        "pole-body flux density, leakage included",
        ("salient_field",),
    )
    def pole_body_b(self) -> float:
        return self.magnetic.iron.pole_body_b

    @sheet(
        "rotor.magnet_field_strength",
        "kA/m",
        "magnet working point H_m on the recoil line (negative: demagnetising)",
        ("surface_pm",),
    )
    def magnet_h(self) -> float:
        return self.magnetic.magnet_h  # type: ignore[attr-defined]

    @cached_property
    def magnet_h_cold(self) -> float:
        """No-load magnet working point H_0 with the magnet at the coolant temperature [A/m]."""
        return self.magnetic_cold.magnet_h

    def magnet_h_with_current(self, current_factor: float, *, cold: bool = False) -> float:
        """Magnet field strength with the stator's peak staircase MMF at ``current_factor``
        times the rated current taken wholly on the d-axis, demagnetising [A/m].

        Superposes on the no-load working point H_0 (iron included) the armature term of the
        linear magnet-and-gap loop, H = H_0 - F_max / (h_m + mu_rec g_e), g_e the gap beside
        the magnet that the circuit is handed (kc g' - h_m / mu_rec), so the denominator is
        mu_rec kc g'. F_max is the peak of the staircase MMF over the gap and the period
        (``winding.mmf_peak``), not the rotating fundamental F1: a tooth-coil winding's
        sub- and higher harmonics raise it well above F1. An approximation on the worst
        side: the whole peak on the d-axis, across magnet and gap only (iron reluctance and
        magnet leakage neglected). With ``cold``, H_0 is that of the magnet at the coolant
        temperature (``cooling.ambient``); the armature term is the same.
        """
        m = self.d.rotor.magnet
        mu_rec = m.material.recoil_permeability
        across = m.thickness + mu_rec * self.pole_path.effective_gap
        h0 = self.magnet_h_cold if cold else self.magnet_h
        return h0 - current_factor * self.mmf_peak / across

    @sheet(
        "rotor.magnet_field_strength_worst",
        "kA/m",
        "H_m with the rated-current staircase MMF peak F_max (winding.mmf_peak) wholly on the"
        " d-axis, H_0 - F_max / (h_m + mu_rec kc g) (a worst case; negative: demagnetising)",
        ("surface_pm",),
    )
    def magnet_h_worst(self) -> float:
        return self.magnet_h_with_current(1.0)

    @sheet(
        "rotor.magnet_field_strength_worst_cold",
        "kA/m",
        "as rotor.magnet_field_strength_worst with the magnet at the coolant temperature (a"
        " cold start): H_0 from Br at cooling.ambient, the same armature term",
        ("surface_pm",),
    )
    def magnet_h_worst_cold(self) -> float:
        return self.magnet_h_with_current(1.0, cold=True)

    def magnet_coercivity_at(self, temperature: float) -> float:
        """Intrinsic coercivity of the magnet at ``temperature`` [K], H_cJ0 (1 + beta (T -
        T0)) [A/m]: the same linear reversible law as the remanence's, with H_cJ's own
        coefficient."""
        from emgate.physics.magnetic import remanence_at

        mat = self.d.rotor.magnet.material
        return remanence_at(
            mat.intrinsic_coercivity,
            temperature,
            mat.coercivity_temperature_coefficient,
            mat.reference_temperature,
        )

    @sheet(
        "rotor.magnet_coercivity_hot",
        "kA/m",
        "intrinsic coercivity at the magnet operating temperature, H_cJ0 (1 + beta (T - T0))",
        ("surface_pm",),
    )
    def magnet_coercivity_hot(self) -> float:
        return self.magnet_coercivity_at(self.d.rotor.magnet.operating_temperature)

    @sheet(
        "rotor.magnet_coercivity_cold",
        "kA/m",
        "intrinsic coercivity at the coolant temperature (a cold start), H_cJ0 (1 + beta (T_c"
        " - T0)), T_c = cooling.ambient",
        ("surface_pm",),
    )
    def magnet_coercivity_cold(self) -> float:
        return self.magnet_coercivity_at(self.d.cooling.ambient)

    # --- geometry (for the sheet) --------------------------------------------------------

    @sheet("stator.slot_pitch", "mm", "bore circumference over slots")
    def slot_pitch(self) -> float:
        return geo.stator_slot_pitch(self.d)

    @sheet(
        "stator.tooth_width_min",
        "mm",
        "narrowest tooth along the winding zone: slot pitch at a depth less the slot width there",
    )
    def tooth_width_min(self) -> float:
        return geo.stator_tooth_width_min(self.d)

    @sheet("stator.yoke_height", "mm", "(outer - bore diameter) / 2 less the slot depth")
    def stator_yoke_height(self) -> float:
        return geo.stator_yoke_height(self.d)

    @sheet(
        "rotor.yoke_height",
        "mm",
        "radial height of the rotor yoke, from the inner diameter to the cage slots, magnets"
        " or pole bodies",
    )
    def rotor_yoke_height(self) -> float:
        return geo.rotor_yoke_height(self.d)


def slot_winding_area(slot: SemiClosedSlot | OpenSlot, liner: float = 0.0) -> float:
    """Winding-zone area of a slot, gross or net of a liner [m^2]."""
    from emgate.physics import conductors as ck

    if slot.shape == "semi_closed":
        return ck.semi_closed_slot_area(
            slot.opening,
            slot.opening_height,
            slot.wedge_height,
            slot.top_width,
            slot.bottom_width,
            slot.height,
            liner=liner,
        )
    return ck.open_slot_area(slot.width, slot.height, slot.wedge_height, liner=liner)


def conductor_strand_area(conductor: RoundConductor | RectangularConductor) -> float:
    """Bare section of one strand of a conductor, stator winding or field coil [m^2]."""
    from emgate.physics import conductors as ck

    c = conductor
    if c.shape == "round":
        return ck.round_strand_area(c.bare_diameter)
    return ck.rectangular_strand_area(c.width, c.height, c.corner_radius)


def layout_from_table(table: list[str], phases: int) -> np.ndarray:
    """The (m, Q) layout of an explicit slot table such as ['+A -C', '-B +A', ...]."""
    import numpy as np

    letters = [chr(ord("A") + k) for k in range(phases)]
    out = np.zeros((phases, len(table)), dtype=int)
    for s, entry in enumerate(table):
        for side in entry.split():
            sign = -1 if side.startswith("-") else 1
            letter = side.lstrip("+-")
            if letter not in letters:
                raise ValueError(f"slot {s + 1}: phase {letter!r} is not one of {letters}")
            out[letters.index(letter), s] += sign
    return out
