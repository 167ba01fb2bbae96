"""The record across its manufacturing tolerances: every other rule at each corner of the
tolerance box, or on a Monte Carlo sample."""

from __future__ import annotations

from collections.abc import Iterable
from typing import Literal

from pydantic import Field

from emgate.api import AnyDesign, Check, Context, Options, Problem, Rule, tolerance_findings


class ToleranceOptions(Options):
    mode: Literal["worst_corner", "monte_carlo"] = Field(
        "worst_corner",
        description="worst_corner: every corner of the tolerance box; monte_carlo: a sample",
    )
    sigmas: float = Field(
        3.0, gt=0.0, le=10.0, description="a normal spread's corners, in standard deviations"
    )
    samples: int = Field(1000, ge=10, le=100_000, description="Monte Carlo sample size")
    percentile: float = Field(
        99.0, gt=0.0, le=100.0, description="share of the sample that must pass every rule [%]"
    )
    seed: int = Field(0, ge=0, description="seed of the Monte Carlo sample")
    max_fields: int = Field(
        10, ge=1, le=16, description="most toleranced fields for worst_corner (2^n corners)"
    )


class ToleranceCorners(Rule[ToleranceOptions]):
    """Every other selected rule at the corners of the record's tolerances (or on a Monte
    Carlo sample of them): the design must hold across what manufacturing makes of it.

    Method: `tolerances:` in the record gives, per field (dotted record path), a band
    ('+-0.05 mm', '+0.02 mm -0.05 mm', '+-3 %') or a normal spread ('normal 0.02 mm').
    worst_corner (the default): each field at the low and at the high end of its band (a
    normal spread at `sigmas` standard deviations, 3 by default), all 2^n combinations; each
    corner is validated and checked by every other rule as a record of its own; a rule that
    fails at any corner is a finding naming the corner where its margin is worst.
    monte_carlo: `samples` variants drawn (bands uniform, spreads normal, seeded by `seed`);
    at least `percentile` % of them must pass every rule, else a finding names the share
    and the worst sample. A corner the model refuses (a turn count of zero, a gap below
    zero) fails closed. Corners of a band are the extremes only when each quantity is
    monotone in each field over the band (usual over a tolerance band; common practice, no
    source); a Monte Carlo sample does not assume it.
    """

    id = "tolerance-corners"
    summary = "every rule holds at the corners of the record's manufacturing tolerances"
    tags = ("tolerances",)

    @classmethod
    def applies(cls, design: AnyDesign) -> bool:
        return bool(design.tolerances)

    def check(
        self, design: AnyDesign, options: ToleranceOptions, context: Context
    ) -> Iterable[Check | Problem]:
        for path, message in tolerance_findings(
            design,
            context,
            mode=options.mode,
            sigmas=options.sigmas,
            samples=options.samples,
            percentile=options.percentile,
            seed=options.seed,
            max_fields=options.max_fields,
        ):
            yield Problem(path, message)
