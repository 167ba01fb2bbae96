"""SVG plots of a page, drawn with matplotlib, one module a family of figures.

matplotlib is imported by these modules only, and there inside the functions, off ``emgate
check``'s path. :mod:`.style`: the palette, the style and the SVG output every plot shares;
:mod:`.section` and :mod:`.slot`: the drawings; :mod:`.winding`: the star of slots and the
MMF; :mod:`.magnetic`: the B-H curves and the ampere-turns; :mod:`.margins`: the temperature
steps and the checks' margins; :mod:`.feasibility`: a sweep's maps (for its own page).
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from emgate.page.plots.magnetic import ampere_turns, bh_curve
from emgate.page.plots.margins import margins, thermal_steps
from emgate.page.plots.section import cross_section
from emgate.page.plots.slot import slot_detail
from emgate.page.plots.winding import mmf_wave, spectrum, star_of_slots

if TYPE_CHECKING:
    from emgate.page.content import PageData


def page_plots(page: PageData) -> dict[str, str]:
    """Every plot the page has data for, by name."""
    out: dict[str, str] = {}
    if page.section is not None:
        table = page.winding.table if page.winding else []
        out["section"] = cross_section(page.section, table)
        out["slot"] = slot_detail(page.section, table)
    if page.winding is not None:
        out["star"] = star_of_slots(page.winding)
    if page.mmf is not None:
        out["mmf"] = mmf_wave(page.mmf)
        out["spectrum"] = spectrum(page.mmf)
    for i, steel in enumerate(page.steels):
        out[f"bh-{i}"] = bh_curve(steel)
    if page.ampere_turns:
        out["ampere-turns"] = ampere_turns(page.ampere_turns)
    if page.thermal is not None and page.thermal.steps:
        out["thermal"] = thermal_steps(page.thermal)
    if page.checks:
        out["margins"] = margins(page.checks)
    return out
