"""Harmonic content of the winding's MMF."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.api import AnyDesign, Check, Context, Options, Problem, Ratio, Rule, limit

CP = "common practice, no source"


class MmfThdOptions(Options):
    induction: Ratio = limit(0.2, "1", CP)
    surface_pm: Ratio = limit(1.2, "1", CP)
    salient_field: Ratio = limit(0.2, "1", CP)


class MmfThd(Rule[MmfThdOptions]):
    """Total harmonic distortion of the stator MMF, sub-harmonics included.

    Method: the winding-function staircase MMF of the slot layout (conductors concentrated at
    slot centres) under balanced sinusoidal phase currents; THD = sqrt(sum over n != p of
    F_n^2) / F_p over all mechanical orders n, sub-harmonics included, relative to the working
    order p. Parseval gives it exactly from the mean square of the staircase, with no
    truncation (closed-form checks: a square wave 48.34 %, three-phase q = 1 full pitch
    31.08 %).

    Default upper limits, as ratios (0.2 or '20 %'; common practice, no source): distributed
    windings of induction and salient-pole machines 0.20 (a full-pitch q = 2 winding has 0.169);
    tooth-coil windings of surface-magnet machines 1.2 (a 12-slot 10-pole double layer has about
    0.98); their sub-harmonics cost rotor losses, which a team may bound tighter.

    An unbalanced winding (one that winding-balance reports) has no THD in this sense: the
    rule then says, as an info finding, that the THD was not computed.
    """

    id = "mmf-thd"
    summary = "MMF harmonic distortion of the winding within the limit"
    tags = ("winding",)
    needs_balanced_winding = True

    def check(
        self, design: AnyDesign, options: MmfThdOptions, context: Context
    ) -> Iterable[Check | Problem]:
        yield context.check(
            "winding.mmf_thd",
            options.limit_for(design.machine),
            "max",
            path=("winding", "coil_pitch"),
            label="MMF THD",
        )
