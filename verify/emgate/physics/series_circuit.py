"""A general series magnetic circuit of uniform sections, solved on the B-H curves.

The textbook circuits: sections of one length and cross-section each, steel on its curve or a
linear medium (air, a magnet's recoil line), in series. All quantities SI; MMF in amperes
(ampere-turns).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from emgate.physics._checks import check_positive_fields
from emgate.physics.bh import BHCurve, h_from_b
from emgate.physics.constants import MU0
from emgate.physics.iron import solve_increasing


@dataclass(frozen=True)
class Segment:
    """A uniform section of a series magnetic circuit.

    Parameters
    ----------
    length : float
        Path length [m].
    area : float
        Cross-section the flux passes [m^2].
    curve : BHCurve or None
        Steel of the section; None for a linear medium (air, or a magnet's recoil line).
    relative_permeability : float
        Relative permeability of a linear section [-]; ignored when ``curve`` is given.
    """

    length: float
    area: float
    curve: BHCurve | None = None
    relative_permeability: float = 1.0

    def __post_init__(self) -> None:
        check_positive_fields(self, "length", "area", "relative_permeability")


def segment_mmf(segment: Segment, flux: float) -> float:
    """Magnetic voltage of one section carrying a flux: ``H(Phi / A) l``.

    Parameters
    ----------
    segment : Segment
    flux : float
        Flux through the section [Wb].

    Returns
    -------
    float
        Magnetic voltage [A].

    References
    ----------
    Fitzgerald, Kingsley, Umans, Electric Machinery, ch. 1 (magnetic circuits).
    """
    b = flux / segment.area
    if segment.curve is None:
        h = b / (MU0 * segment.relative_permeability)
    else:
        h = float(h_from_b(segment.curve, b))
    return h * segment.length


def series_mmf(segments: Sequence[Segment], flux: float) -> float:
    """MMF needed to drive a flux through sections in series [A] (sum of their voltages).

    References
    ----------
    Fitzgerald, Kingsley, Umans, Electric Machinery, ch. 1.
    """
    return sum(segment_mmf(s, flux) for s in segments)


def series_flux(segments: Sequence[Segment], mmf: float) -> float:
    """Flux that an MMF drives through sections in series, solved on the B-H curves.

    Parameters
    ----------
    segments : sequence of Segment
        At least one section.
    mmf : float
        Ampere-turns applied round the loop [A]; odd symmetry for negative values.

    Returns
    -------
    float
        Flux [Wb].

    References
    ----------
    Fitzgerald, Kingsley, Umans, Electric Machinery, ch. 1.
    """
    if not segments:
        raise ValueError("a magnetic circuit needs at least one segment")
    target = abs(mmf)
    if target == 0.0:
        return 0.0
    # Start from the flux the loop would carry if it were all air, and double until the
    # MMF is reached; it always is, as H grows at least at 1/mu0 beyond a curve's table.
    lo, hi = 0.0, target / sum(s.length / (MU0 * s.area) for s in segments)
    for _ in range(2000):
        if series_mmf(segments, hi) >= target:
            break
        lo, hi = hi, 2.0 * hi
    flux = solve_increasing(lambda phi: series_mmf(segments, phi) - target, lo, hi)
    return math.copysign(flux, mmf)
