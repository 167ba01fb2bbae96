"""Back-EMF of a surface-magnet machine against its supply voltage."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.api import AnyDesign, Check, Context, Limit, Options, Problem, Ratio, Rule, limit


class BackEmfOptions(Options):
    #: Back-EMF over phase voltage at rated speed: an inverter-fed surface-magnet motor
    #: needs its no-load EMF below the supply to drive rated current.
    max_ratio: Ratio = limit(1.0, "1", "common practice, no source")


class BackEmf(Rule[BackEmfOptions]):
    """No-load back-EMF at rated speed below the supply's phase voltage.

    Method: the phase EMF, rms, at the rated electrical frequency f with the magnets'
    no-load field, E = sqrt(2) pi f N_ph kw1 Phi1, Phi1 = (2/pi) B1 tau_p l the fundamental
    flux per pole [from memory: Fitzgerald and Kingsley, Electric Machinery]; B1 is the
    amplitude of the fundamental of the gap flux density from the magnet working point
    (iron included, as for gap-flux), N_ph the series turns per phase, kw1 the winding
    factor of the slot layout, tau_p the pole pitch at the bore and l the stack length. The
    phase voltage U_ph follows from the rated line voltage and the connection. The check:
    E / U_ph <= `max_ratio`, reported in volts as E <= max_ratio U_ph.

    Default: `max_ratio` 1.0 (common practice, no source): an inverter-fed surface-magnet
    motor needs its back-EMF below the supply at rated speed, or it cannot drive the rated
    current without field weakening; the ratio also bounds the voltage the magnets put on
    the inverter when it stops switching at rated speed. A team that designs for field
    weakening sets its own ratio.

    Not checked for a generator (rating.operation: generator): its EMF exceeds its terminal
    voltage by design, by the internal drop at rated load; the rule yields no check then.
    """

    id = "back-emf"
    summary = "no-load back-EMF at rated speed below the phase voltage"
    machines = ("surface_pm",)
    tags = ("electrical", "magnetic")

    @classmethod
    def applies(cls, design: AnyDesign) -> bool:
        return design.rating.operation != "generator"

    def check(
        self, design: AnyDesign, options: BackEmfOptions, context: Context
    ) -> Iterable[Check | Problem]:
        sheet = context.sheet
        emf, voltage = sheet["winding.back_emf"], sheet["winding.phase_voltage"]
        # Compared in volts, E <= max_ratio U_ph: the same verdict and margin as the ratio's.
        yield context.check(
            "winding.back_emf",
            Limit(
                options.max_ratio * voltage,
                f"{options.max_ratio:.3g} x the phase voltage {voltage:.4g} V: "
                + options.basis("max_ratio"),
            ),
            "max",
            path=("winding", "turns_per_coil"),
            label=f"no-load back-EMF at rated speed (E / U_ph {emf / voltage:.3g})",
        )
