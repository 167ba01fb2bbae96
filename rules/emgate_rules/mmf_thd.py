"""Harmonic content of the winding's MMF."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.model import AnyDesign
from emgate.rule import Check, Context, Options, Problem, Rule
from emgate_rules._limits import Ratio, basis, limit
from emgate_rules._winding import UNBALANCED, winding_path

SOURCE = "common practice, no source"
DEFAULTS = {"induction": 0.2, "surface_pm": 1.2, "salient_field": 0.2}


class MmfThdOptions(Options):
    induction: Ratio = limit(DEFAULTS["induction"], SOURCE)
    surface_pm: Ratio = limit(DEFAULTS["surface_pm"], SOURCE)
    salient_field: Ratio = limit(DEFAULTS["salient_field"], SOURCE)


class MmfThd(Rule):
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
    options = MmfThdOptions

    def check(
        self, design: AnyDesign, options: Options, context: Context
    ) -> Iterable[Check | Problem]:
        if context.calc.winding_problems:
            yield Problem(
                winding_path(design), f"MMF THD not computed: {UNBALANCED}", severity="info"
            )
            return
        kind = design.machine
        yield Check(
            "winding.mmf_thd",
            "MMF THD",
            ("winding", "coil_pitch"),
            context.calc.mmf_thd,
            getattr(options, kind),
            "max",
            "",
            basis(options, kind, DEFAULTS[kind], SOURCE),
        )
