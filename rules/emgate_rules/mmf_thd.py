"""Harmonic content of the winding's MMF, by winding family."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.api import (
    TEAM_LIMIT,
    AnyDesign,
    Check,
    Context,
    Limit,
    Options,
    Problem,
    Ratio,
    Rule,
    limit,
)

CP = "common practice, no source"


class MmfThdOptions(Options):
    # THD ceilings by winding family (the sheet's winding_family), each above what the
    # family's usual windings have by nature: distributed q = 2 full pitch 0.169, q = 3 with
    # 7/9 pitch 0.105 (a q = 1 full-pitch winding, 0.311, fails); tooth coils in two layers
    # 12/10 0.984, 9/8 1.087, 24/22 1.140; in one layer 12/10 1.635, 24/22 1.877 (all
    # [calc], exact spectra).
    distributed: Ratio = limit(0.2, "1", CP)
    tooth_coil_double_layer: Ratio = limit(1.3, "1", CP)
    tooth_coil_single_layer: Ratio = limit(2.0, "1", CP)
    #: Not checked unless the team sets them.
    subharmonic: Ratio | None = None
    slot_harmonic: Ratio | None = None


class MmfThd(Rule[MmfThdOptions]):
    """Total harmonic distortion of the stator MMF, sub-harmonics included, by winding
    family; optionally the largest single sub-harmonic and slot harmonic.

    Method: the winding-function staircase MMF of the slot layout (conductors concentrated at
    slot centres) under balanced sinusoidal phase currents; THD = sqrt(sum over n != p of
    F_n^2) / F_p over all mechanical orders n, sub-harmonics included, relative to the working
    order p. Parseval gives it exactly from the mean square of the staircase, with no
    truncation (closed-form checks: a square wave 48.34 %, three-phase q = 1 full pitch
    31.08 %). The largest sub-harmonic is the largest F_n / F_p over 1 <= n < p
    (winding.mmf_largest_subharmonic); the largest slot harmonic the largest over the slot
    orders |k Q +- p|, k = 1..3 (winding.mmf_largest_slot_harmonic; p / (Q - p) for k = 1).

    What the ceiling protects against: the harmonic fields of the winding's own MMF add the
    harmonic leakage sigma = THD^2 to its inductance (lower power factor, more voltage
    drop), induce eddy currents in whatever on the rotor conducts (magnets, sleeves, cage
    bars: losses and heat), and make parasitic torques, torque ripple and noise. A family
    has its THD by nature: distributed windings near 0.1 to 0.3, tooth coils in two layers
    near 1, in one layer near 1.5 and above; so the ceiling is set per family (a coil
    pitch of one slot is a tooth coil), and within a family it catches a poor choice of
    slots, poles and pitch. Tooth-coil
    designers bound the sub-harmonics (rotor eddy losses) and slot harmonics (noise, losses)
    themselves: the options `subharmonic` and `slot_harmonic` check them when set.

    Default upper limits, as ratios (0.2 or '20 %'; common practice, no source, each set
    above the family's standard windings [calc, exact spectra]): distributed 0.20 (q = 2
    full pitch 0.169; q = 3, 7/9 pitch 0.105; a full-pitch q = 1 winding, 0.311, fails);
    tooth coils in two layers 1.3 (12 slots/10 poles 0.984, 9/8 1.087, 24/22 1.140); in one
    layer 2.0 (12/10 1.635, 24/22 1.877). `subharmonic` and `slot_harmonic`: none (not
    checked) unless the team sets them.

    An unbalanced winding (one that winding-balance reports) has no THD in this sense: the
    rule then says, as an info finding, that the THD was not computed.
    """

    id = "mmf-thd"
    summary = "MMF harmonic distortion of the winding within the limit for its family"
    version = "2"
    tags = ("winding",)
    needs_balanced_winding = True

    def check(
        self, design: AnyDesign, options: MmfThdOptions, context: Context
    ) -> Iterable[Check | Problem]:
        family = context.sheet.winding_family
        yield context.check(
            "winding.mmf_thd",
            options.limit_for(family),
            "max",
            path=("winding", "coil_pitch"),
            label=f"MMF THD ({family.replace('_', ' ')})",
        )
        for field, name, label in (
            ("subharmonic", "winding.mmf_largest_subharmonic", "largest MMF sub-harmonic"),
            ("slot_harmonic", "winding.mmf_largest_slot_harmonic", "largest MMF slot harmonic"),
        ):
            bound = getattr(options, field)
            if bound is not None:
                yield context.check(
                    name,
                    Limit(bound, TEAM_LIMIT),
                    "max",
                    path=("winding", "coil_pitch"),
                    label=f"{label} over the working harmonic",
                )
