"""Peak air-gap flux density."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.api import AnyDesign, Check, Context, FluxDensity, Options, Problem, Rule, limit

PYRHONEN = "Pyrhonen et al., Design of Rotating Electrical Machines, Table 6.1 (from memory)"
CP = "common practice, no source"
#: What a designer changes to move the gap flux density, by machine kind.
DRIVERS = {
    "induction": ("winding", "turns_per_coil"),
    "surface_pm": ("rotor", "magnet", "thickness"),
    "salient_field": ("rotor", "field"),
}


class GapFluxOptions(Options):
    induction: FluxDensity = limit(0.9, "T", PYRHONEN)
    surface_pm: FluxDensity = limit(1.1, "T", CP)
    salient_field: FluxDensity = limit(1.05, "T", PYRHONEN)
    # Lower limits, null switches one off: below them the iron (a saturated pole body, too
    # thin a magnet) starves the gap. Surface magnets 0.3 T: a ferrite machine's gap runs at
    # about that.
    induction_min: FluxDensity | None = limit(0.6, "T", CP)
    surface_pm_min: FluxDensity | None = limit(0.3, "T", CP)
    salient_field_min: FluxDensity | None = limit(0.6, "T", CP)


class GapFlux(Rule[GapFluxOptions]):
    """Peak air-gap flux density from the machine's magnetic circuit, iron included.

    Method, by machine kind (emgate.physics.magnetic):
    - induction: flux per pole from the voltage equation Phi = E / (4.44 f N_ph kw1), E the
      phase voltage less a 3 % drop; B_peak = (pi/2) Phi / (tau_p l);
    - surface PM: the magnet working point on its recoil line at the operating temperature,
      Br(T) = Br20 (1 + alpha (T - 20 degC)), solved in the loop with gap kc g' (Carter on the
      magnetic gap g' = g + sleeve + h_m / mu_rec) and the iron's B-H curves;
    - salient field: field ampere-turns per pole against gap, teeth, pole body and yokes.
    kc is Carter's coefficient (stator, times rotor for a cage rotor); the winding factor
    comes from the slot layout.

    Default upper limits: induction 0.9 T and salient pole 1.05 T, the upper ends of the usual
    ranges [from memory: Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical Machines,
    Table 6.1]; surface PM 1.1 T (common practice, no source).

    Default lower limits (options `induction_min`, `surface_pm_min`, `salient_field_min`;
    null switches one off): induction 0.6 T, surface PM 0.3 T, salient pole 0.6 T (common
    practice, no source). A gap below them is starved: a saturated pole body or yoke, or a
    magnet too thin for its gap, so the machine falls short of its rating. The surface-PM
    floor admits ferrite magnets, whose gaps run at about 0.3 T; a team with rare-earth
    magnets only may raise it (0.5 T or more).
    """

    id = "gap-flux"
    summary = "peak air-gap flux density within the limits for the machine kind"
    tags = ("magnetic",)

    def check(
        self, design: AnyDesign, options: GapFluxOptions, context: Context
    ) -> Iterable[Check | Problem]:
        kind = design.machine
        name = "air_gap.flux_density_peak"
        label = "peak air-gap flux density"
        yield context.check(name, options.limit_for(kind), "max", path=DRIVERS[kind], label=label)
        if getattr(options, f"{kind}_min") is not None:
            yield context.check(
                name,
                options.limit_for(f"{kind}_min"),
                "min",
                path=DRIVERS[kind],
                label=f"{label} (lower limit)",
            )
