"""Balance and symmetry of the winding."""

from __future__ import annotations

from collections.abc import Iterable

from emgate.api import AnyDesign, Check, Context, Options, Problem, Rule, winding_path


class WindingBalance(Rule[Options]):
    """The winding is a balanced, symmetric m-phase winding.

    Method: the slot layout (the record's explicit table, or the one generated from the star
    of slots) must give every phase the same number of coil sides, close every phase's coils
    (net sum zero), and give working-order phasors of equal magnitude displaced by 2 pi / m
    electrical in the A-B-C sequence. An explicit table must also satisfy the integrality
    conditions: Q / (m t) whole with t = gcd(Q, p), and Q / (2 m t) whole for a single layer
    [from memory: Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical Machines].
    """

    id = "winding-balance"
    summary = "winding layout balanced and symmetric across the phases"
    tags = ("winding",)

    def check(
        self, design: AnyDesign, options: Options, context: Context
    ) -> Iterable[Check | Problem]:
        where = winding_path(design)
        for problem in context.sheet.winding_problems:
            yield Problem(where, f"winding is not balanced: {problem}")
