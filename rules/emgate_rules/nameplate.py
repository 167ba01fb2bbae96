"""Doubts about the rating that are not outright contradictions."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.model import AnyDesign
from emgate.rule import Check, Context, Options, Problem, Rule
from emgate_rules._limits import Ratio, basis, limit

CP = "common practice, no source"
MAX_SLIP = 0.15


class NameplateOptions(Options):
    max_slip: Ratio = limit(MAX_SLIP, CP)


class Nameplate(Rule):
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
    options = NameplateOptions

    def check(
        self, design: AnyDesign, options: Options, context: Context
    ) -> Iterable[Check | Problem]:
        assert isinstance(options, NameplateOptions)
        sync = design.rating.frequency / design.pole_pairs
        slip = abs(1.0 - design.rating.speed / sync)
        yield Check(
            "rating.slip",
            "rated slip",
            ("rating", "speed"),
            slip,
            options.max_slip,
            "max",
            "%",
            basis(options, "max_slip", MAX_SLIP, CP),
        )
