"""The cold magnets' back-EMF at the top speed against the converter's voltage."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.api import AnyDesign, Check, Context, Limit, Options, Problem, Ratio, Rule, limit


class BackEmfTopSpeedOptions(Options):
    max_ratio: Ratio = limit(1.0, "1", "common practice, no source")


class BackEmfTopSpeed(Rule[BackEmfTopSpeedOptions]):
    """The cold magnets' no-load EMF at the top speed stays below the converter's highest
    phase voltage (otherwise an uncontrolled-generator fault: when the converter stops
    switching, the magnets drive current through its diodes into the DC link, and its
    voltage rises beyond what the parts withstand).

    Method: the phase EMF, rms, E = sqrt(2) pi f kw1 N_ph Phi1, Phi1 = (2/pi) B1 tau_p l
    [from memory: Fitzgerald and Kingsley, Electric Machinery], with B1 from the magnetic
    circuit (iron included) with the magnet at the lowest ambient, cooling.ambient_min
    (-15 degC when absent, the lower end of the ambient range of IEC 60034-1, from memory),
    where a magnet with a negative remanence coefficient is strongest, and f at the top
    speed, rating.max_speed (the rated speed when absent) (winding.back_emf_cold_top_speed).
    The limit: rating.converter_max_phase_voltage (rms; a three-phase bridge on a DC link
    U_dc: U_dc / sqrt 6) when declared; otherwise the rated phase voltage stands in, which
    a converter sized for the rated point must at least withstand. Check:
    E <= max_ratio U_max. The tooth and yoke flux densities with the cold magnet are on the
    sheet (stator.tooth_flux_density_cold, stator.yoke_flux_density_cold); tooth-flux and
    yoke-flux hold the rated ones.

    Default: `max_ratio` 1.0 (common practice, no source).

    Not checked for a generator (rating.operation: generator), as back-emf.
    """

    id = "back-emf-top-speed"
    summary = "cold-magnet back-EMF at the top speed below the converter's phase voltage"
    machines = ("surface_pm",)
    tags = ("electrical", "magnetic", "fault")

    @classmethod
    def applies(cls, design: AnyDesign) -> bool:
        return design.rating.operation != "generator"

    def check(
        self, design: AnyDesign, options: BackEmfTopSpeedOptions, context: Context
    ) -> Iterable[Check | Problem]:
        sheet = context.sheet
        declared = design.rating.converter_max_phase_voltage
        if declared is None:
            voltage, against = sheet["winding.phase_voltage"], "the rated phase voltage"
        else:
            voltage, against = declared, "the converter's maximum phase voltage"
        speed = sheet.top_speed * 60.0
        cold = sheet.lowest_ambient - 273.15
        yield context.check(
            "winding.back_emf_cold_top_speed",
            Limit(
                options.max_ratio * voltage,
                f"{options.max_ratio:.3g} x {against} {voltage:.4g} V: "
                + options.basis("max_ratio"),
            ),
            "max",
            path=("winding", "turns_per_coil"),
            label=f"back-EMF, cold magnet ({cold:.4g} degC) at the top speed {speed:.5g} rpm",
        )
