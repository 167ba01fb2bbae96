"""emgate's built-in rules, registered through the same entry-point group as any pack."""

from __future__ import annotations

from emgate.api import Rule, hookimpl


@hookimpl
def emgate_rules() -> list[type[Rule]]:
    from emgate_rules.back_emf import BackEmf
    from emgate_rules.back_emf_top_speed import BackEmfTopSpeed
    from emgate_rules.cold_magnet_flux import ColdMagnetFlux
    from emgate_rules.current_density import CurrentDensity
    from emgate_rules.declared_values import DeclaredValues
    from emgate_rules.demagnetisation import Demagnetisation
    from emgate_rules.demagnetisation_fault import DemagnetisationFault
    from emgate_rules.efficiency import Efficiency
    from emgate_rules.gap_flux import GapFlux
    from emgate_rules.mmf_thd import MmfThd
    from emgate_rules.nameplate import Nameplate
    from emgate_rules.shear_stress import ShearStress
    from emgate_rules.slot_fill import SlotFill
    from emgate_rules.temperature_rise import TemperatureRise
    from emgate_rules.thermal_load import ThermalLoadRule
    from emgate_rules.tolerance_corners import ToleranceCorners
    from emgate_rules.tooth_flux import ToothFlux
    from emgate_rules.winding_balance import WindingBalance
    from emgate_rules.yoke_flux import YokeFlux

    return [
        BackEmf,
        BackEmfTopSpeed,
        ColdMagnetFlux,
        CurrentDensity,
        DeclaredValues,
        Demagnetisation,
        Efficiency,
        DemagnetisationFault,
        GapFlux,
        MmfThd,
        Nameplate,
        ShearStress,
        SlotFill,
        TemperatureRise,
        ThermalLoadRule,
        ToleranceCorners,
        ToothFlux,
        WindingBalance,
        YokeFlux,
    ]
