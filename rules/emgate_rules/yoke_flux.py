"""Yoke and pole-body flux density."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.api import (
    AnyDesign,
    Check,
    Context,
    FluxDensity,
    Options,
    Problem,
    RecordPath,
    Rule,
    limit,
)

PYRHONEN = "Pyrhonen et al., Design of Rotating Electrical Machines, Table 6.1"


#: The stator yoke limit of synchronous machines (value, unit, source); cold-magnet-flux's
#: too.
STATOR_SYNCHRONOUS = (
    1.5,
    "T",
    "Pyrhonen et al., Table 6.1, stator yoke of synchronous machines 1.0-1.5 T (from memory)",
)


class YokeFluxOptions(Options):
    stator_induction: FluxDensity = limit(
        1.7, "T", f"{PYRHONEN}, stator yoke of induction machines 1.4-1.7 T (from memory)"
    )
    stator_synchronous: FluxDensity = limit(*STATOR_SYNCHRONOUS)
    rotor: FluxDensity = limit(1.7, "T", "common practice, no source")
    pole_body: FluxDensity = limit(
        1.8, "T", "Pyrhonen et al., Table 6.1, pole core of salient-pole machines (from memory)"
    )


class YokeFlux(Rule[YokeFluxOptions]):
    """Peak flux density in the stator and rotor yokes, and in a salient pole's body.

    Method: half the flux per pole passes each way through the yoke, B_y = Phi / (2 k_Fe l
    h_y), with h_y the yoke height left by the slots (stator), or by the cage slots, magnets or
    pole bodies (rotor); a salient pole's rim carries the pole leakage too. A salient pole's
    body carries the whole pole flux with its leakage, B_p = k_leak Phi / (k_Fe l b_p), b_p
    the body width.

    Default limits: stator yoke 1.7 T for induction machines and 1.5 T for synchronous ones
    (surface PM, salient field), the upper ends of the usual ranges [from memory: Pyrhonen,
    Jokinen, Hrabovcova, Design of Rotating Electrical Machines, Table 6.1]; rotor yoke 1.7 T
    (common practice, no source); pole body 1.8 T, the upper end for the pole core [from
    memory: Pyrhonen et al., Table 6.1].
    """

    id = "yoke-flux"
    summary = "yoke and pole-body flux densities within the limits"
    tags = ("magnetic",)

    def check(
        self, design: AnyDesign, options: YokeFluxOptions, context: Context
    ) -> Iterable[Check | Problem]:
        field = "stator_induction" if design.machine == "induction" else "stator_synchronous"
        checks: list[tuple[str, str, str, RecordPath]] = [
            (
                field,
                "stator.yoke_flux_density",
                "stator yoke flux density",
                ("stator", "outer_diameter"),
            ),
            (
                "rotor",
                "rotor.yoke_flux_density",
                "rotor yoke flux density",
                ("rotor", "inner_diameter"),
            ),
        ]
        if design.machine == "salient_field":
            checks.append(
                (
                    "pole_body",
                    "rotor.pole_body_flux_density",
                    "pole-body flux density",
                    ("rotor", "pole", "body_width"),
                )
            )
        for option, name, label, path in checks:
            yield context.check(name, options.limit_for(option), "max", path=path, label=label)
