"""Plane geometry of the drawings [mm]: slot outlines and layers, conductors as placed for the
fill, a slot's frame turned into the lamination's plane.

A slot is drawn in its own frame: x across the slot (0 on its centre line), y the depth from
the air gap. The placement is a drawing of how the conductors can lie, row by row from the
slot bottom, hexagonal for round wire; the slot fill on the sheet is computed from areas
and does not depend on it.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass


@dataclass(frozen=True)
class SlotDims:
    """A slot's dimensions [mm]; an open slot has opening = top = bottom width and no
    opening height."""

    shape: str
    opening: float
    opening_height: float
    wedge_height: float
    top_width: float
    bottom_width: float
    height: float

    @property
    def zone_top(self) -> float:
        """Depth of the winding zone's gap-side edge (below opening and wedge)."""
        return self.opening_height + self.wedge_height

    def width_at(self, y: float) -> float:
        """Width of the winding zone at depth ``y``: linear from top to bottom width."""
        span = self.height - self.zone_top
        t = 0.0 if span <= 0.0 else min(max((y - self.zone_top) / span, 0.0), 1.0)
        return self.top_width + (self.bottom_width - self.top_width) * t


@dataclass(frozen=True)
class ConductorDims:
    """A conductor's strand: round (width = height = diameter) or rectangular [mm]."""

    shape: str
    strands: int
    width: float
    height: float
    bare_width: float
    bare_height: float


@dataclass(frozen=True)
class Placed:
    """One strand as drawn: centre, insulated and bare size, and the layer it belongs to."""

    x: float
    y: float
    width: float
    height: float
    bare_width: float
    bare_height: float
    layer: int


def slot_outline(s: SlotDims) -> list[tuple[float, float]]:
    """Closed outline of a slot from the gap down, as (x, y) points."""
    if s.shape == "open":
        h = s.width_at(0.0) / 2.0
        return [(-h, 0.0), (-h, s.height), (h, s.height), (h, 0.0)]
    o = s.opening / 2.0
    left = [
        (-o, 0.0),
        (-o, s.opening_height),
        (-s.top_width / 2.0, s.zone_top),
        (-s.bottom_width / 2.0, s.height),
    ]
    return left + [(-x, y) for x, y in reversed(left)]


def layer_boundary(s: SlotDims, layers: int) -> float | None:
    """Depth that splits the winding zone into two layers of equal area, or None for one."""
    if layers < 2:
        return None
    a, b = s.top_width, s.bottom_width
    h = s.height - s.zone_top
    if h <= 0.0:
        return None
    if abs(a - b) < 1e-12:
        return s.zone_top + h / 2.0
    # Width w(t) = a + (b - a) t / h; area to t is a t + (b - a) t^2 / (2 h) = (a + b) h / 4.
    k = (b - a) / (2.0 * h)
    t = (-a + math.sqrt(a * a + 4.0 * k * (a + b) * h / 4.0)) / (2.0 * k)
    return s.zone_top + t


def to_plane(
    points: Sequence[tuple[float, float]], angle: float, radius: float, inward: bool = False
) -> list[tuple[float, float]]:
    """Slot-frame points (x across, y depth from the gap) to the lamination's plane."""
    ux, uy = math.cos(angle), math.sin(angle)
    tx, ty = -uy, ux
    sign = -1.0 if inward else 1.0
    return [
        ((radius + sign * y) * ux + x * tx, (radius + sign * y) * uy + x * ty) for x, y in points
    ]


def zone_band(s: SlotDims, y0: float, y1: float) -> list[tuple[float, float]]:
    """The winding zone between depths ``y0`` and ``y1`` as a closed outline."""
    a, b = s.width_at(y0) / 2.0, s.width_at(y1) / 2.0
    return [(-a, y0), (-b, y1), (b, y1), (a, y0)]


def layer_bands(s: SlotDims, layers: int) -> list[tuple[float, float]]:
    """The depth range (top, bottom) of each layer of the winding zone, top first."""
    split = layer_boundary(s, layers)
    if split is None:
        return [(s.zone_top, s.height)]
    return [(s.zone_top, split), (split, s.height)]


def place_conductors(
    s: SlotDims, c: ConductorDims, count: int, layers: int, liner: float
) -> list[Placed]:
    """Strands placed in the winding zone net of the liner, ``count // layers`` per layer,
    from the far side of each layer towards the gap; fewer when they do not fit."""
    split = layer_boundary(s, layers)
    bounds = [(s.zone_top + liner, s.height - liner)]
    if split is not None:
        bounds = [(s.zone_top + liner, split), (split, s.height - liner)]
    out: list[Placed] = []
    per_layer = [count // len(bounds)] * len(bounds)
    per_layer[-1] += count - sum(per_layer)
    for layer, ((y0, y1), n) in enumerate(zip(bounds, per_layer, strict=True)):
        out += _fill(s, c, n, y0, y1, liner, layer)
    return out


def _fill(
    s: SlotDims, c: ConductorDims, n: int, y0: float, y1: float, liner: float, layer: int
) -> list[Placed]:
    out: list[Placed] = []
    w, h = c.width, c.height
    if w <= 0.0 or h <= 0.0:
        return out
    pitch = h * (math.sqrt(3.0) / 2.0 if c.shape == "round" else 1.0)
    y = y1 - h / 2.0
    row = 0
    while len(out) < n and y - h / 2.0 >= y0 - 1e-9:
        # The narrower of the zone's widths at the row's two edges, less the liner.
        room = min(s.width_at(y - h / 2.0), s.width_at(y + h / 2.0)) - 2.0 * liner
        # Round wire: alternate rows on lattices offset by half a diameter (hexagonal).
        # Rectangular strands: the lattice that fits the most side by side.
        if c.shape == "round":
            offset = w / 2.0 if row % 2 else 0.0
        else:
            offset = 0.0 if int((room + 1e-9) // w) % 2 else w / 2.0
        limit = (room - w) / 2.0 + 1e-9
        k = math.floor((limit - offset) / w) if limit >= offset else -1
        slots = sorted(
            (offset + j * w for j in range(-k - 1, k + 1) if abs(offset + j * w) <= limit),
            key=lambda x: (abs(x), x),
        )
        if not slots:
            break
        for x in sorted(slots[: n - len(out)]):
            out.append(Placed(x, y, w, h, c.bare_width, c.bare_height, layer))
        y -= pitch
        row += 1
    return out
