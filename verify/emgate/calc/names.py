"""The calculation sheet: every named quantity, its unit, method and machine kinds, in one list.

A name is stable: ``emgate show`` prints it, ``declared:`` blocks and findings use it, and a
rule reads the quantity by it. Each entry is computed by exactly one function of a domain
module of this package, bound to it with ``@quantity(name)`` (a test holds the two in step).
"""

from __future__ import annotations

from dataclasses import dataclass

from emgate.model import MACHINE_KINDS


@dataclass(frozen=True)
class Entry:
    """A named quantity of the calculation sheet (``unit`` is the display unit)."""

    name: str
    unit: str
    method: str
    machines: tuple[str, ...] = MACHINE_KINDS
    #: The condition beyond the machine kinds under which the quantity exists, in words
    #: ("round wire in a semi-closed slot"); its function states it in code.
    only: str = ""
    #: The record fields a designer would change to move the quantity, most direct first,
    #: as dotted record paths; fields the record does not have are skipped (a round wire
    #: has no width). Remedies (``emgate.remedies``) try the first three a record has.
    drivers: tuple[str, ...] = ()

    @property
    def scope(self) -> str:
        """For which records the quantity is computed, in words."""
        kinds = "all machines" if self.machines == MACHINE_KINDS else ", ".join(self.machines)
        return f"{kinds}, {self.only} only" if self.only else f"{kinds} only"

    def parse(self, text: str) -> float:
        """A figure of this quantity written with any unit of its dimension, in SI.

        Raises ValueError naming what was expected: a figure of another dimension, or a
        temperature difference written in degC ('80 degC' is a temperature, not a rise).
        """
        from emgate.units import QuantityError, convert, describe, parse_quantity, parse_unit

        q = parse_quantity(text)
        dims = parse_unit(self.unit)[1] if self.unit not in ("", "1") else (0,) * 5
        if q.dims != dims:
            raise QuantityError(
                f"is a {describe(q.dims)}; expected a {describe(dims)} such as '1 {self.unit}'"
            )
        if self.unit == "K":  # a rise written in degC would be read as a temperature
            convert(text, "temperature_difference")
        return q.value


ENTRIES: tuple[Entry, ...] = (
    Entry(
        "air_gap.carter_coefficient",
        "1",
        "Carter's coefficient of the stator slotting,"
        " times that of the rotor slotting for a cage rotor",
    ),
    Entry(
        "air_gap.effective_length",
        "mm",
        "Carter's coefficient times the gap it is computed on: the mechanical gap, or for"
        " surface magnets the magnetic gap g + sleeve + h_m / mu_rec",
    ),
    Entry(
        "air_gap.flux_density_fundamental",
        "T",
        "amplitude of the fundamental of the gap flux density wave; above the peak for a"
        " flat-topped wave: (4/pi) sin(a pi/2) times it for a pole arc a, more than 1 for"
        " a > 0.575",
    ),
    Entry(
        "air_gap.flux_density_peak",
        "T",
        "peak gap flux density from the magnetic circuit of the machine kind, iron included",
        drivers=(
            "air_gap",
            "rotor.magnet.thickness",
            "winding.turns_per_coil",
            "rotor.field.current",
        ),
    ),
    Entry(
        "air_gap.flux_per_pole",
        "mWb",
        "gap flux of one pole (the whole wave, not its fundamental)",
    ),
    Entry(
        "air_gap.saturation_factor",
        "1",
        "(gap + teeth ampere-turns) over gap ampere-turns",
    ),
    Entry(
        "losses.friction_windage",
        "W",
        "losses.friction_windage of the record when declared (measured), else the estimate"
        " k D (l + 0.6 tau_p) v^2, v = pi D n, k = 15 W s^2/m^4 with a shaft fan and 10"
        " without (common practice, after Pyrhonen; from memory)",
    ),
    Entry(
        "losses.rotor",
        "W",
        "induction: cage loss |s| P_gap, P_gap = (P2 + P_fw) / (1 - s) for a motor, output"
        " plus stator losses for a generator; rotor iron loss not counted (slip frequency in"
        " a cage rotor, steady flux in a synchronous one; slot-ripple pole-face loss is left"
        " to the stray-load allowance); wound"
        " field: I_f^2 R_f at the class reference temperature plus two brushes' drop"
        " (carbon 1.0 V, metal-carbon 0.3 V; IEC 60034-2-1, from memory) times I_f;"
        " surface magnets: losses.magnet_eddy of the record when declared, else an upper"
        " bound from the travelling waves of the staircase MMF, B_n = mu0 F_n / g_m seen at"
        " |n/p -+ 1| omega by unsegmented magnets of unlimited length, resistance limited"
        " (rho 1.4 uOhm m); slot-permeance and inverter harmonics not included",
    ),
    Entry(
        "losses.stator_copper",
        "W",
        "m I^2 R at the reference temperature of the insulation class, the IEC 60034-2-1"
        " basis of the efficiency (the thermal estimate re-evaluates it at"
        " winding.operating_temperature)",
    ),
    Entry(
        "losses.stator_iron",
        "W",
        "losses.stator_iron_teeth plus losses.stator_iron_yoke",
    ),
    Entry(
        "losses.stator_iron_teeth",
        "W",
        "build factor x specific loss at stator.tooth_flux_density and the rated frequency x"
        " tooth mass (bore to slot bottom, less the slots); build factor 1.8 induction, 2.0"
        " synchronous (from memory: Pyrhonen); specific loss from the steel's loss table when"
        " a materials file gives one, else the designation's 1.5 T / 50 Hz figure split into"
        " hysteresis f B^2, classical eddy pi^2 d^2 (B f)^2 / (6 rho_e rho_m) and excess"
        " (f B)^1.5 (15 % of the non-classical part) (Bertotti); no-load flux for magnet and"
        " field machines; valid while the sheet is thinner than the skin depth (above, it"
        " overstates)",
    ),
    Entry(
        "losses.stator_iron_yoke",
        "W",
        "as losses.stator_iron_teeth at stator.yoke_flux_density with the yoke mass and a"
        " build factor of 1.5",
    ),
    Entry(
        "losses.stray_load",
        "W",
        "losses.stray_load of the record when declared (measured), else the IEC 60034-2-1"
        " assigned allowance P1 (0.025 - 0.005 log10(P2 / 1 kW)), 2.5 % of input up to 1 kW,"
        " 0.5 % from 10 MW (from memory)",
    ),
    Entry(
        "losses.total",
        "W",
        "stator copper, stator iron, rotor, stray load, friction and windage",
    ),
    Entry(
        "magnetic.total_mmf",
        "A",
        "ampere-turns per pole of the whole loop: gap, teeth, pole body and half of each yoke",
    ),
    Entry(
        "rating.efficiency",
        "1",
        "output over input, P2 / (P2 + losses.total), copper at the reference temperature of"
        " the insulation class (the IEC 60034-2-1 basis of IEC 60034-30-1)",
    ),
    Entry(
        "rating.efficiency_class",
        "1",
        "IEC 60034-30-1 class reached by rating.efficiency at the rated power, poles and"
        " frequency: 1 to 4 for IE1 to IE4, 0 below IE1; not computed outside the standard"
        " (a generator, not 50/60 Hz, not 2-8 poles, outside 0.12-1000 kW); table from"
        " memory, linear in log10 P between rated powers",
        ("induction",),
        only="a motor within the scope of IEC 60034-30-1",
    ),
    Entry(
        "rating.input_power",
        "kW",
        "motor: electrical input P2 + losses.total; generator: shaft input, output plus"
        " losses (output = input - losses)",
    ),
    Entry(
        "rating.slip",
        "%",
        "rated slip |1 - n / n_s|, n_s = f / p the synchronous speed (motor or generator)",
        ("induction",),
        drivers=("rating.speed",),
    ),
    Entry(
        "rating.torque",
        "N*m",
        "T = P / (2 pi n) at the rated speed; P the shaft power of a motor, P cos phi"
        " for a generator (its active output, losses neglected; cos phi from"
        " rating.power_factor, 0.8 when absent)",
    ),
    Entry(
        "rotor.bar_current",
        "A",
        "stator current referred to a bar by equal fundamental MMF,"
        " 2 m N_ph kw1 I / Q_r (magnetising share not deducted: an upper bound)",
        ("induction",),
    ),
    Entry(
        "rotor.bar_current_density",
        "A/mm^2",
        "bar current over bar section (a cast bar fills its slot)",
        ("induction",),
        drivers=(
            "rotor.cage.bar.width",
            "rotor.cage.bar.height",
            "rotor.slot.height",
            "rotor.slot.width",
            "rotor.slot.top_width",
        ),
    ),
    Entry(
        "rotor.field_copper_loss_rated_load",
        "W",
        "I_f^2 R_f with the field current at rated load, R_f = rho(T) 2p N_f l_f / S_f"
        " at the reference temperature of the insulation class; l_f = 2 (l + b_p) + pi"
        " w_f round the pole body, w_f = N_f n A_ins / h_p the coil's width with its"
        " turns filling the body height (A_ins the insulated strand's square or"
        " rectangle)",
        ("salient_field",),
    ),
    Entry(
        "rotor.field_current_density",
        "A/mm^2",
        "field current over the conductor section",
        ("salient_field",),
        drivers=(
            "rotor.field.conductor.bare_diameter",
            "rotor.field.conductor.width",
            "rotor.field.conductor.height",
            "rotor.field.conductor.strands",
            "rotor.field.current",
        ),
    ),
    Entry(
        "rotor.field_current_density_rated_load",
        "A/mm^2",
        "field current at rated load over the conductor section",
        ("salient_field",),
    ),
    Entry(
        "rotor.field_current_rated_load",
        "A",
        "field MMF on load over turns per pole: the resultant MMF that the no-load magnetic"
        " circuit (iron included) needs for the air-gap EMF E_d = U + (R + j X_s) I less,"
        " as phasors, the armature's fundamental MMF at rated current referred to the field,"
        " C_d F_1 / ((4/pi) sin(a pi/2)) along the current (a motor: E_d = U - (R + j X_s) I,"
        " current leading); X_s the slot, end and harmonic leakage reactance, R hot, cos phi"
        " rating.power_factor or 0.8 lagging; the whole armature MMF on the d-axis, as for a"
        " cylindrical rotor (overrates the field current of salient poles: the safe side)",
        ("salient_field",),
    ),
    Entry(
        "rotor.magnet_coercivity_cold",
        "kA/m",
        "intrinsic coercivity at the coolant temperature (a cold start), H_cJ0 (1 + beta (T_c"
        " - T0)), T_c = cooling.ambient",
        ("surface_pm",),
    ),
    Entry(
        "rotor.magnet_coercivity_hot",
        "kA/m",
        "intrinsic coercivity at the magnet operating temperature, H_cJ0 (1 + beta (T - T0))",
        ("surface_pm",),
    ),
    Entry(
        "rotor.magnet_temperature",
        "degC",
        "magnet temperature of the magnet checks: rotor.magnet.operating_temperature of the"
        " record, or when it declares none the estimated rotor temperature (one pass of the"
        " thermal network with the magnet at the class reference temperature; that"
        " temperature where the network gives none)",
        ("surface_pm",),
    ),
    Entry(
        "rotor.magnet_coercivity_lowest_ambient",
        "kA/m",
        "intrinsic coercivity at the lowest ambient (cooling.ambient_min, -15 degC when"
        " absent: IEC 60034-1's range), H_cJ0 (1 + beta (T - T0))",
        ("surface_pm",),
    ),
    Entry(
        "rotor.magnet_field_strength",
        "kA/m",
        "magnet working point H_m on the recoil line (negative: demagnetising)",
        ("surface_pm",),
    ),
    Entry(
        "rotor.magnet_field_strength_fault_cold",
        "kA/m",
        "as rotor.magnet_field_strength_fault_hot with the magnet at the lowest"
        " ambient: H_0 from Br there and, without a declared peak current, the"
        " short-circuit current of the cold magnet",
        ("surface_pm",),
    ),
    Entry(
        "rotor.magnet_field_strength_fault_hot",
        "kA/m",
        "H_m with the worst credible current winding.fault_current_peak wholly on the"
        " d-axis, magnet at its operating temperature: H_0 - (i / (sqrt 2 I_ph)) F_max /"
        " (h_m + mu_rec kc g), F_max = winding.mmf_peak at rated current",
        ("surface_pm",),
    ),
    Entry(
        "rotor.magnet_field_strength_worst",
        "kA/m",
        "H_m with the rated-current staircase MMF peak F_max (winding.mmf_peak) wholly on the"
        " d-axis, H_0 - F_max / (h_m + mu_rec kc g) (a worst case; negative: demagnetising)",
        ("surface_pm",),
        drivers=(
            "rotor.magnet.thickness",
            "winding.turns_per_coil",
            "air_gap",
        ),
    ),
    Entry(
        "rotor.magnet_field_strength_worst_cold",
        "kA/m",
        "as rotor.magnet_field_strength_worst with the magnet at the coolant temperature (a"
        " cold start): H_0 from Br at cooling.ambient, the same armature term",
        ("surface_pm",),
        drivers=(
            "rotor.magnet.thickness",
            "winding.turns_per_coil",
            "air_gap",
        ),
    ),
    Entry(
        "rotor.pole_body_flux_density",
        "T",
        "pole-body flux density, leakage included",
        ("salient_field",),
        drivers=("rotor.pole.body_width",),
    ),
    Entry(
        "rotor.ring_current_density",
        "A/mm^2",
        "ring current I_bar / (2 sin(pi p / Q_r)) over the ring section",
        ("induction",),
        drivers=(
            "rotor.cage.end_ring.axial_width",
            "rotor.cage.end_ring.radial_height",
        ),
    ),
    Entry(
        "rotor.shear_stress",
        "kN/m^2",
        "air-gap tangential stress T / (2 V_r), V_r = pi D_r^2 l / 4, D_r = D - 2 g the"
        " rotor's outer diameter, T = rating.torque",
    ),
    Entry(
        "rotor.tooth_flux_density",
        "T",
        "real rotor tooth flux density with slot-flux sharing, as for the stator",
        ("induction",),
    ),
    Entry(
        "rotor.tooth_flux_density_apparent",
        "T",
        "apparent rotor tooth flux density at the narrowest tooth section, as for the stator",
        ("induction",),
        drivers=("rotor.slot.bottom_width", "rotor.slot.width"),
    ),
    Entry(
        "rotor.yoke_flux_density",
        "T",
        "peak rotor yoke flux density, Phi / (2 k_Fe l h_y), with pole leakage for salient poles",
        drivers=("rotor.inner_diameter",),
    ),
    Entry(
        "rotor.yoke_height",
        "mm",
        "radial height of the rotor yoke, from the inner diameter to the cage slots, magnets"
        " or pole bodies",
    ),
    Entry(
        "rotor.temperature",
        "degC",
        "estimated rotor surface temperature: the bore temperature of the thermal network"
        " plus losses.rotor across the gap (Becker and Kaye gap Nusselt number, from"
        " memory); not estimated for direct liquid and open ventilated cooling (the"
        " through air carries the rotor loss)",
        only="cooling other than direct liquid and open ventilated",
    ),
    Entry(
        "stator.aspect_ratio",
        "1",
        "stack length over bore diameter, l / D",
        drivers=(
            "stator.stack_length",
            "stator.bore_diameter",
        ),
    ),
    Entry(
        "stator.conductors_per_slot",
        "1",
        "layers times turns per coil",
    ),
    Entry(
        "stator.copper_area",
        "mm^2",
        "bare copper per slot: conductors, strands in hand and strand section",
    ),
    Entry(
        "stator.current_density",
        "A/mm^2",
        "J = I_ph / (a n S): phase current over parallel paths a, strands in hand n and bare"
        " strand section S",
        drivers=(
            "winding.conductor.bare_diameter",
            "winding.conductor.width",
            "winding.conductor.height",
            "winding.conductor.strands",
            "winding.parallel_paths",
        ),
    ),
    Entry(
        "stator.electric_loading",
        "kA/m",
        "A = 2 m N_ph I / (pi D), rms",
        drivers=(
            "winding.turns_per_coil",
            "winding.parallel_paths",
            "stator.bore_diameter",
        ),
    ),
    Entry(
        "stator.opening_clearance",
        "mm",
        "slot opening less the insulated strand diameter, b0 - d_ins: the free width of a"
        " strand fed through the opening",
        only="round wire in a semi-closed slot",
        drivers=(
            "stator.slot.opening",
            "winding.conductor.insulated_diameter",
        ),
    ),
    Entry(
        "stator.slot_area",
        "mm^2",
        "winding zone net of the slot liner laid along its perimeter",
    ),
    Entry(
        "stator.slot_area_gross",
        "mm^2",
        "area of the slot's winding zone (below opening and wedge), liner not deducted",
    ),
    Entry(
        "stator.slot_fill",
        "1",
        "bare copper area over the slot area net of liner",
        drivers=(
            "winding.turns_per_coil",
            "winding.conductor.bare_diameter",
            "winding.conductor.width",
            "stator.slot.height",
            "winding.conductor.strands",
        ),
    ),
    Entry(
        "stator.slot_fill_insulated",
        "1",
        "insulated conductor area over the slot area net of liner: conductors x strands"
        " x (d_ins^2 for round wire, w_ins h_ins for rectangular), the square each round"
        " wire takes in a layer",
    ),
    Entry(
        "stator.slot_height_clearance",
        "mm",
        "slot depth less the form-wound coil's radial stack, h - (n_r z h_ins + (layers - 1)"
        " s + 2 t + h_w): z conductors a slot of n_r strand rows each (stator.strands_across"
        " side by side, the rest stacked), a separator s = 0.5 mm between layers (slot-fill's"
        " `separator` option sets another), a liner t at the bottom and under the wedge, the"
        " wedge h_w",
        only="rectangular strands in an open slot",
    ),
    Entry(
        "stator.slot_permeance",
        "1",
        "slot-leakage permeance coefficient lambda = k1 lambda_zone + k2 lambda_above:"
        " the winding zone h / (3 b) (trapezoid: its strip integral), wedge zone 2 h_w /"
        " (b_0 + b_1) and opening h_0 / b_0 (open slot: h_w / b); k1, k2 from the"
        " layers' currents (distributed: layers stacked, tooth coils: side by side);"
        " straight flux lines: the fringing under tooth tips overhanging a wide slot is"
        " left out (a field solution of the servo's slot gives 30 % more), so it errs low",
    ),
    Entry(
        "stator.slot_pitch",
        "mm",
        "bore circumference over slots",
    ),
    Entry(
        "stator.slot_width_clearance",
        "mm",
        "slot width less the insulated strand width and a liner on each wall,"
        " b - (w_ins + 2 t), strands stacked radially",
        only="rectangular strands in an open slot",
        drivers=(
            "stator.slot.width",
            "winding.conductor.insulated_width",
            "winding.slot_liner",
        ),
    ),
    Entry(
        "stator.strands_across",
        "1",
        "insulated strands side by side across the slot: as many as the width net of two"
        " liners takes, floor((b - 2 t) / w_ins), at least one",
        only="rectangular strands in an open slot",
    ),
    Entry(
        "stator.thermal_load",
        "A^2/mm^3",
        "electric loading times current density, A J",
        drivers=(
            "winding.conductor.bare_diameter",
            "winding.conductor.width",
            "winding.turns_per_coil",
            "winding.conductor.strands",
            "winding.parallel_paths",
        ),
    ),
    Entry(
        "stator.tooth_flux_density",
        "T",
        "real tooth flux density with slot-flux sharing: B_app = B + mu0 k_s H(B)",
    ),
    Entry(
        "stator.tooth_flux_density_apparent",
        "T",
        "B_g tau_s l / (k_Fe l_Fe b_t) at the narrowest tooth section",
        drivers=(
            "stator.slot.top_width",
            "stator.slot.bottom_width",
            "stator.slot.width",
            "winding.turns_per_coil",
        ),
    ),
    Entry(
        "stator.tooth_flux_density_apparent_cold",
        "T",
        "as stator.tooth_flux_density_apparent with the magnet at the lowest ambient"
        " (cooling.ambient_min, -15 degC when absent)",
        ("surface_pm",),
    ),
    Entry(
        "stator.tooth_flux_density_cold",
        "T",
        "as stator.tooth_flux_density with the magnet at the lowest ambient"
        " (cooling.ambient_min, -15 degC when absent)",
        ("surface_pm",),
    ),
    Entry(
        "stator.tooth_width_min",
        "mm",
        "narrowest tooth along the winding zone: slot pitch at a depth less the slot width there",
    ),
    Entry(
        "stator.yoke_flux_density",
        "T",
        "peak yoke flux density, Phi / (2 k_Fe l h_y)",
        drivers=(
            "stator.outer_diameter",
            "stator.slot.height",
            "winding.turns_per_coil",
        ),
    ),
    Entry(
        "stator.yoke_flux_density_cold",
        "T",
        "as stator.yoke_flux_density with the magnet at the lowest ambient"
        " (cooling.ambient_min, -15 degC when absent)",
        ("surface_pm",),
    ),
    Entry(
        "stator.yoke_height",
        "mm",
        "(outer - bore diameter) / 2 less the slot depth",
    ),
    Entry(
        "winding.back_emf",
        "V",
        "phase EMF rms at the rated frequency, no load: sqrt 2 pi f N_ph kw1 Phi1 with"
        " Phi1 = (2/pi) B1 tau_p l, B1 the fundamental gap flux density",
        ("surface_pm", "salient_field"),
        drivers=(
            "winding.turns_per_coil",
            "rotor.magnet.thickness",
            "stator.stack_length",
        ),
    ),
    Entry(
        "winding.back_emf_cold_top_speed",
        "V",
        "phase EMF rms with the magnet at the lowest ambient (cooling.ambient_min, -15"
        " degC when absent) at the top speed (rating.max_speed, the rated speed when"
        " absent): as winding.back_emf, B1 from the cold circuit, f n_max / n",
        ("surface_pm",),
    ),
    Entry(
        "winding.copper_loss",
        "W",
        "m I^2 R at the class reference temperature",
    ),
    Entry(
        "winding.end_leakage_inductance",
        "mH",
        "each coil group's ends, both ends together, as one circular loop in air: mu0"
        " z^2 R (ln(8R/r) - 2), R = l_e / (2 pi), l_e = l_av - 2 l, r the radius of the"
        " group's coil-side section; groups in series, their coupling and the end face's"
        " image neglected (low: the safe side for fault currents)",
    ),
    Entry(
        "winding.fault_current_peak",
        "A",
        "worst credible phase current, peak, for demagnetisation: rating.peak_current"
        " when declared, else sqrt 2 winding.short_circuit_current (hot magnet), its"
        " steady value wholly on the d-axis",
        ("surface_pm",),
    ),
    Entry(
        "winding.harmonic_leakage_coefficient",
        "1",
        "sigma_delta = sum over n != p of (p kw_n / (n kw_p))^2 = winding.mmf_thd"
        " squared (the gap's harmonic fields relative to the working one)",
    ),
    Entry(
        "winding.magnetising_current",
        "A",
        "I_m = pi p F / (sqrt 2 m kw1 N_ph), F = magnetic.total_mmf at the rated"
        " voltage (iron included)",
        ("induction",),
    ),
    Entry(
        "winding.magnetising_inductance",
        "mH",
        "L_m = (m / pi) mu0 (kw1 N_ph)^2 D l / (p^2 g_e), g_e ="
        " air_gap.effective_length (unsaturated; surface magnets count as gap); salient"
        " poles: the d-axis C_d L_m, C_d = a + sin(a pi) / pi for the pole-shoe arc a",
    ),
    Entry(
        "winding.mean_turn_length",
        "mm",
        "distributed coils: 2 l + 2.4 W + 0.1 m, W the coil span at mid-slot (2.9 W + 0.2 m"
        " above 1 kV); tooth coils: 2 (l + b_t) + pi w_c, b_t the mean tooth width, w_c the"
        " coil-side width (the mean slot width over the layers)",
    ),
    Entry(
        "winding.mmf_fundamental",
        "A",
        "peak rotating fundamental ampere-turns per pole, (sqrt 2 m / pi) kw1 N_ph I / p",
    ),
    Entry(
        "winding.mmf_largest_slot_harmonic",
        "1",
        "largest MMF harmonic of the slot orders |k Q +- p|, k = 1..3, over the working"
        " harmonic (exact spectrum; p / (Q - p) for k = 1)",
    ),
    Entry(
        "winding.mmf_largest_subharmonic",
        "1",
        "largest single MMF harmonic of order below p over the working harmonic (exact"
        " spectrum); 0 for p = 1 and for integral-slot windings",
    ),
    Entry(
        "winding.mmf_peak",
        "A",
        "peak of the staircase MMF (ampere-turns per pole) over the gap and one electrical"
        " period at rated current, balanced sinusoidal currents; exact from the step levels:"
        " each level is a sinusoid in time, its crest sqrt(F_s(0)^2 + F_s(T/4)^2)",
    ),
    Entry(
        "winding.mmf_thd",
        "1",
        "total harmonic distortion of the staircase MMF, all orders"
        " including sub-harmonics, over the working harmonic (Parseval)",
        drivers=("winding.coil_pitch",),
    ),
    Entry(
        "winding.operating_temperature",
        "degC",
        "mean winding temperature at the fixed point T = T_c + rise(P_cu(T)), R(T) by IEC"
        " 60028 (copper alpha20 0.00393 /K), all losses in the thermal network, to 0.01 K; a"
        " run-away (no fixed point) is not computed",
    ),
    Entry(
        "winding.phase_current",
        "A",
        "rated line current through the connection of m phases"
        " (star: equal; delta: over 2 sin(pi/m), sqrt 3 for three phases)",
    ),
    Entry(
        "winding.phase_resistance_20c",
        "ohm",
        "DC phase resistance at 20 degC, rho20 N_ph l_av / (a n S), l_av the mean turn length"
        " (rho20: IEC 60028 copper, IEC 60889 aluminium)",
    ),
    Entry(
        "winding.phase_resistance_hot",
        "ohm",
        "phase resistance at the reference temperature of the insulation class",
    ),
    Entry(
        "winding.phase_resistance_operating",
        "ohm",
        "phase resistance at winding.operating_temperature",
    ),
    Entry(
        "winding.phase_voltage",
        "V",
        "rated line voltage through the connection of m phases"
        " (delta: equal; star: over 2 sin(pi/m), sqrt 3 for three phases)",
    ),
    Entry(
        "winding.series_turns",
        "1",
        "series turns per phase N_ph: coils per phase times turns per coil, over parallel paths",
    ),
    Entry(
        "winding.short_circuit_current",
        "A",
        "steady three-phase short-circuit current rms, psi / L_s = E / (omega L_s) with"
        " the hot magnet's EMF, resistance neglected (the highest)",
        ("surface_pm",),
    ),
    Entry(
        "winding.slot_leakage_inductance",
        "mH",
        "L_u = 4 m mu0 l N_ph^2 lambda / Q, lambda = stator.slot_permeance",
    ),
    Entry(
        "winding.synchronous_inductance",
        "mH",
        "L_m (1 + sigma_delta) + L_u + L_ew: magnetising (salient poles: d-axis),"
        " harmonic, slot and end leakage; unsaturated",
        ("surface_pm", "salient_field"),
    ),
    Entry(
        "winding.temperature_rise",
        "K",
        "lumped steady-state estimate of the mean winding rise over the coolant, every loss"
        " where it arises (copper in slots and ends at winding.operating_temperature, iron in"
        " teeth and yoke with the stray load at the teeth, rotor loss across the gap,"
        " friction at the frame; open machines: rotor loss and friction leave with the"
        " through air; an estimate, to be confirmed by test)",
        drivers=(
            "winding.conductor.bare_diameter",
            "winding.conductor.width",
            "cooling.fin_area_factor",
            "winding.conductor.strands",
            "cooling.frame_length",
            "winding.turns_per_coil",
        ),
    ),
    Entry(
        "winding.torque_constant",
        "N*m/A",
        "k_T = m p E / omega (torque per rms ampere on the q-axis), E ="
        " winding.back_emf with the hot magnet; the JSON unit Wb is N m/A",
        ("surface_pm",),
    ),
    Entry(
        "winding.winding_factor",
        "1",
        "general winding factor of phase A at the working"
        " order p from the slot layout: |sum c_s exp(j p theta_s)| / sum |c_s|",
    ),
)
