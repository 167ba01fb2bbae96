"""Doubts about the rating that are not outright contradictions."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.api import AnyDesign, Check, Context, Options, Problem, Ratio, Rule, limit


class NameplateOptions(Options):
    max_slip: Ratio = limit(0.15, "1", "common practice, no source")


class Nameplate(Rule[NameplateOptions]):
    """Rated slip of an induction machine within the usual range.

    Method: slip s = 1 - n / (f / p) from the rated speed n, frequency f and pole pairs p.
    Most induction motors run at a few percent slip; beyond 15 % (the default, common
    practice, no source) a 50/60 Hz mix-up or a miscounted pole number is likely, though
    high-slip designs exist: set `max_slip` for them. Gross contradictions (slip on the wrong
    side, beyond 50 %) are input errors already.
    """

    id = "nameplate"
    summary = "rated slip within the usual range"
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
