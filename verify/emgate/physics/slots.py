"""Slot areas and perimeters, slot fill, and whether a strand passes the slot opening.

Slot conventions (as in the design record), all depths measured radially from the bore:

* ``semi_closed`` (trapezoidal slot of random-wound machines): opening ``b0`` over opening
  height ``h0`` (tooth tip); a wedge zone of height ``h1`` in which the slot widens from
  ``b0`` to ``top_width`` ``b1``; then the winding zone, a trapezoid from ``b1`` (bore side)
  to ``bottom_width`` ``b2`` (slot bottom) of height ``h2 = height - h0 - h1``, ``height``
  being the total depth from the bore to the slot bottom.
* ``open`` (rectangular slot of form-wound machines): width ``b``, total height ``h`` from
  the bore, wedge height ``hw`` at the bore side; the winding zone is ``b x (h - hw)``.
"""

from __future__ import annotations

import math

from emgate.physics._checks import check_positive


def _trapezoid_corner_cotangents(top: float, bottom: float, height: float) -> tuple[float, float]:
    """cot(alpha/2) at a top and at a bottom corner of a symmetric trapezoid."""
    slant = math.atan2((bottom - top) / 2.0, height)  # side's tilt from the radial direction
    return 1.0 / math.tan(math.pi / 4 + slant / 2), 1.0 / math.tan(math.pi / 4 - slant / 2)


def _trapezoid_net_area(top: float, bottom: float, height: float, liner: float) -> float:
    """Area of a symmetric trapezoid shrunk inward by a uniform thickness ``liner``."""
    if liner < 0.0:
        raise ValueError("liner thickness must be >= 0")
    area = 0.5 * (top + bottom) * height
    if liner == 0.0:
        return area
    side = math.hypot((bottom - top) / 2.0, height)
    c_top, c_bot = _trapezoid_corner_cotangents(top, bottom, height)
    # Inward parallel polygon with mitred corners: A - t P + t^2 sum cot(alpha_i / 2).
    net = area - liner * (top + bottom + 2.0 * side) + 2.0 * liner**2 * (c_top + c_bot)
    # Each edge loses t (cot(a/2) + cot(b/2)); the offset polygon exists while all stay > 0.
    edges = (top - 2 * liner * c_top, bottom - 2 * liner * c_bot, side - liner * (c_top + c_bot))
    if min(edges) <= 0.0 or net <= 0.0:
        raise ValueError("the slot liner is too thick for the winding zone")
    return net


def semi_closed_winding_height(opening_height: float, wedge_height: float, height: float) -> float:
    """Height of the winding zone of a semi-closed slot.

    Parameters
    ----------
    opening_height : float
        Tooth-tip height ``h0`` [m].
    wedge_height : float
        Wedge-zone height ``h1`` [m].
    height : float
        Total slot depth from the bore to the slot bottom [m].

    Returns
    -------
    float
        ``h2 = height - h0 - h1`` [m].

    References
    ----------
    Geometry convention of the design record (module docstring).
    """
    h2 = height - opening_height - wedge_height
    if opening_height < 0.0 or wedge_height < 0.0 or not h2 > 0.0:
        raise ValueError("slot height must exceed opening height plus wedge height (both >= 0)")
    return h2


def semi_closed_slot_area(
    opening: float,
    opening_height: float,
    wedge_height: float,
    top_width: float,
    bottom_width: float,
    height: float,
    *,
    liner: float = 0.0,
) -> float:
    """Winding-zone area of a semi-closed (trapezoidal) slot, gross or net of a liner.

    Parameters
    ----------
    opening, opening_height, wedge_height, top_width, bottom_width, height : float
        ``b0, h0, h1, b1, b2`` and total depth [m] (module docstring).
    liner : float, optional
        Slot-liner thickness [m]; 0 gives the gross area.

    Returns
    -------
    float
        Area available to the coil sides [m^2]. With a liner: the area inside a uniform
        layer of thickness ``liner`` laid along the whole perimeter of the winding zone
        (sides, bottom and the top under the wedge), with sharp inner corners. This is the
        stated approximation: real liners are U-shaped with a top closure of their own.

    References
    ----------
    Trapezoid area; inward parallel polygon ``A - tP + t^2 sum cot(alpha_i/2)`` [calc].
    """
    check_positive(opening=opening, top_width=top_width, bottom_width=bottom_width)
    h2 = semi_closed_winding_height(opening_height, wedge_height, height)
    if opening > top_width:
        raise ValueError("the slot opening cannot be wider than the winding zone's top width")
    return _trapezoid_net_area(top_width, bottom_width, h2, liner)


def semi_closed_slot_perimeter(
    opening_height: float, wedge_height: float, top_width: float, bottom_width: float, height: float
) -> float:
    """Perimeter of the winding zone of a semi-closed slot (the liner's length) [m].

    Parameters
    ----------
    opening_height, wedge_height, top_width, bottom_width, height : float
        ``h0, h1, b1, b2`` and total depth [m].

    Returns
    -------
    float
        ``b1 + b2 + 2 sqrt(h2^2 + ((b2 - b1)/2)^2)`` [m].

    References
    ----------
    Trapezoid perimeter [calc].
    """
    h2 = semi_closed_winding_height(opening_height, wedge_height, height)
    return top_width + bottom_width + 2.0 * math.hypot((bottom_width - top_width) / 2.0, h2)


def semi_closed_full_area(
    opening: float,
    opening_height: float,
    wedge_height: float,
    top_width: float,
    bottom_width: float,
    height: float,
) -> float:
    """Whole area of a semi-closed slot, opening included (a cast bar filling its slot).

    Parameters
    ----------
    opening, opening_height, wedge_height, top_width, bottom_width, height : float
        ``b0, h0, h1, b1, b2`` and total depth [m].

    Returns
    -------
    float
        ``b0 h0 + (b0 + b1) h1 / 2 + (b1 + b2) h2 / 2`` [m^2].

    References
    ----------
    Sum of a rectangle and two trapezoids [calc].
    """
    winding = semi_closed_slot_area(
        opening, opening_height, wedge_height, top_width, bottom_width, height
    )
    return opening * opening_height + 0.5 * (opening + top_width) * wedge_height + winding


def open_slot_area(
    width: float, height: float, wedge_height: float, *, liner: float = 0.0
) -> float:
    """Winding-zone area of an open rectangular slot, gross or net of a liner.

    Parameters
    ----------
    width : float
        Slot width ``b`` [m].
    height : float
        Total slot height ``h`` from the bore [m].
    wedge_height : float
        Wedge height ``hw`` at the bore side [m].
    liner : float, optional
        Liner (main-wall) thickness laid along the whole perimeter [m]; 0 for gross.

    Returns
    -------
    float
        ``(b - 2t)(h - hw - 2t)`` [m^2].

    References
    ----------
    Rectangle, inward offset [calc].
    """
    check_positive(width=width)
    if wedge_height < 0.0 or not height > wedge_height:
        raise ValueError("slot height must exceed the wedge height (>= 0)")
    return _trapezoid_net_area(width, width, height - wedge_height, liner)


def open_slot_perimeter(width: float, height: float, wedge_height: float) -> float:
    """Perimeter of the winding zone of an open slot, ``2 (b + h - hw)`` [m].

    Parameters
    ----------
    width, height, wedge_height : float
        ``b``, ``h``, ``hw`` [m].

    Returns
    -------
    float
        Perimeter [m].

    References
    ----------
    Rectangle [calc].
    """
    if not height > wedge_height >= 0.0:
        raise ValueError("slot height must exceed the wedge height (>= 0)")
    return 2.0 * (width + height - wedge_height)


def open_full_area(width: float, height: float) -> float:
    """Whole area of an open rectangular slot, ``b h`` [m^2].

    Parameters
    ----------
    width, height : float
        ``b`` and total height ``h`` [m].

    Returns
    -------
    float
        Area [m^2].

    References
    ----------
    Rectangle [calc].
    """
    check_positive(width=width, height=height)
    return width * height


def fill_factor(copper_area: float, slot_area: float) -> float:
    """Slot fill: bare copper over slot area.

    emgate's convention: ``slot_area`` is the winding zone net of the slot liner (from
    :func:`semi_closed_slot_area` or :func:`open_slot_area` with ``liner``); pass the gross
    area instead to get the gross fill some catalogues quote.

    Parameters
    ----------
    copper_area : float
        Bare copper area in the slot [m^2].
    slot_area : float
        Slot winding-zone area [m^2].

    Returns
    -------
    float
        Fill factor [-].

    References
    ----------
    Definition [calc]; typical ranges [cp] (round wire 0.35-0.45).
    """
    check_positive(slot_area=slot_area)
    return copper_area / slot_area


#: Default clearance between an insulated strand and the slot opening [m] [cp, no source].
OPENING_CLEARANCE: float = 0.2e-3


def strand_passes_opening(
    insulated_diameter: float, opening: float, clearance: float = OPENING_CLEARANCE
) -> bool:
    """Whether an insulated round strand can be fed through the slot opening.

    Parameters
    ----------
    insulated_diameter : float
        Strand diameter over the enamel [m].
    opening : float
        Slot opening ``b0`` [m].
    clearance : float, optional
        Free width the strand needs beyond its own diameter [m]; default 0.2 mm, common
        practice for strands fed one at a time (no source).

    Returns
    -------
    bool
        ``insulated_diameter + clearance <= opening``.

    References
    ----------
    Geometric condition [calc]; clearance [cp].
    """
    return opening_clearance(opening, insulated_diameter) >= clearance


def opening_clearance(opening: float, insulated_diameter: float) -> float:
    """Free width left beside an insulated round strand passing the slot opening.

    Parameters
    ----------
    opening : float
        Slot opening ``b0`` [m].
    insulated_diameter : float
        Strand diameter over the enamel [m].

    Returns
    -------
    float
        ``b0 - d_ins`` [m]; negative when the strand does not pass.

    References
    ----------
    Geometric condition [calc].
    """
    return opening - insulated_diameter


def slot_width_clearance(slot_width: float, insulated_width: float, liner: float) -> float:
    """Free width left across an open slot by one rectangular strand and two liners.

    Parameters
    ----------
    slot_width : float
        Width ``b`` of the open slot [m].
    insulated_width : float
        Strand width over its insulation [m].
    liner : float
        Slot-liner thickness on each wall [m].

    Returns
    -------
    float
        ``b - (w_ins + 2 t)`` [m]; negative when the strand does not fit.

    References
    ----------
    Geometric condition [calc], strands stacked radially, one across the slot.
    """
    return slot_width - (insulated_width + 2.0 * liner)


#: Radial room between the coil sides of a two-layer form-wound slot, per separator [m]
#: (common practice, no source).
LAYER_SEPARATOR: float = 0.5e-3


def strands_across(slot_width: float, insulated_width: float, liner: float) -> int:
    """Insulated rectangular strands side by side across an open slot.

    Parameters
    ----------
    slot_width : float
        Width ``b`` of the open slot [m].
    insulated_width : float
        Strand width over its insulation [m], > 0.
    liner : float
        Slot-liner thickness on each wall [m].

    Returns
    -------
    int
        As many as the width net of two liners takes, ``floor((b - 2 t) / w_ins)``, at
        least one (a strand that does not fit is the width clearance's finding).

    References
    ----------
    Geometric condition [calc].
    """
    check_positive(insulated_width=insulated_width)
    return max(1, int((slot_width - 2.0 * liner) // insulated_width))


def slot_height_clearance(
    slot_height: float,
    wedge_height: float,
    insulated_height: float,
    rows_per_conductor: int,
    conductors: int,
    layers: int,
    liner: float,
    separator: float = LAYER_SEPARATOR,
) -> float:
    """Depth left in an open slot by the radial stack of a form-wound coil.

    Parameters
    ----------
    slot_height : float
        Total slot depth ``h`` from the bore [m].
    wedge_height : float
        Wedge height ``h_w`` at the bore side [m].
    insulated_height : float
        Strand height over its insulation ``h_ins`` [m].
    rows_per_conductor : int
        Strand rows of one conductor, ``n_r = ceil(strands / across)``.
    conductors : int
        Conductors a slot ``z`` (layers times turns per coil).
    layers : int
        Coil sides a slot; a separator lies between two.
    liner : float
        Slot-liner thickness ``t``, at the bottom and under the wedge [m].
    separator : float, optional
        Radial room between the layers ``s`` [m]; default 0.5 mm (common practice, no
        source).

    Returns
    -------
    float
        ``h - (n_r z h_ins + (layers - 1) s + 2 t + h_w)`` [m]; negative when the coil does
        not fit.

    References
    ----------
    Geometric condition [calc]; separator [cp].
    """
    stack = rows_per_conductor * conductors * insulated_height
    stack += (layers - 1) * separator + 2.0 * liner + wedge_height
    return slot_height - stack
