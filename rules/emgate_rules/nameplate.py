"""Doubts about the rating that are not outright contradictions."""

from __future__ import annotations

import math
from collections.abc import Iterable
from typing import Literal

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


class NameplateOptions(Options):
    max_slip: Ratio = limit(0.15, "1", "common practice, no source")
    #: None: not checked (the sheet shows both); 0.1 suits the estimate (see the docstring).
    power_factor_tolerance: Ratio | None = None


class Nameplate(Rule[NameplateOptions]):
    """Rated slip of an induction machine within the usual range, and a motor's rated
    current in keeping with its design.

    Method: slip s = 1 - n / (f / p) from the rated speed n, frequency f and pole pairs p.
    Most induction motors run at a few percent slip; beyond 15 % (the default, common
    practice, no source) a 50/60 Hz mix-up or a miscounted pole number is likely, though
    high-slip designs exist: set `max_slip` for them. Gross contradictions (slip on the wrong
    side, beyond 50 %) are input errors already.

    Power factor (motors): the rating's cos phi, rating.power_factor_nameplate = P2 / (m U_ph
    I_ph eta) with the sheet's efficiency, against rating.power_factor_estimate from the
    design (active current from the input power, reactive current from the magnetising
    current and the leakage reactances; see `emgate show`), checked when the team sets
    `power_factor_tolerance` (none by default: a saturated circuit lowers the estimate, and
    the flux rules already judge saturation). 0.1 suits the estimate (common practice, no
    source: it assumes a 3 % stator voltage drop and equal stator and rotor leakage, which
    move it by a few hundredths). Beyond it the rated current does not fit the winding (a
    wrong current on the nameplate, or turns that set another flux): a warning at the rated
    current; an estimate without an operating point (NaN on the sheet) is a warning too.
    """

    id = "nameplate"
    version = "2"
    summary = "rated slip within the usual range; a motor's rated current fits its design"
    machines = ("induction",)
    severity = "warning"
    tags = ("review",)

    def check(
        self, design: AnyDesign, options: NameplateOptions, context: Context
    ) -> Iterable[Check | Problem]:
        yield context.check(
            "rating.slip",
            options.limit_for("max_slip"),
            "max",
            path=("rating", "speed"),
            label="rated slip",
        )
        tolerance = options.power_factor_tolerance
        if tolerance is None or "rating.power_factor_estimate" not in context.sheet:
            return  # not asked for, or a generator: its power factor is the grid's
        estimate = context.sheet["rating.power_factor_estimate"]
        if not math.isfinite(estimate):
            yield Problem(
                ("rating", "power"),
                "no power factor estimate: at the rated input the design has no operating"
                " point (rating.power_factor_estimate), so the rated current is not compared",
            )
            return
        bounds: tuple[tuple[Literal["min", "max"], float], ...] = (("min", -1.0), ("max", 1.0))
        for bound, sign in bounds:
            yield context.check(
                "rating.power_factor_nameplate",
                Limit(
                    estimate + sign * tolerance,
                    f"rating.power_factor_estimate {estimate:.3f} {'-+'[sign > 0]}"
                    f" {tolerance:g} ({TEAM_LIMIT})",
                ),
                bound,
                path=("rating", "line_current"),
                label="the rating's power factor P / (m U I eta) against the design's",
            )
