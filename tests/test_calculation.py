"""The calculation takes its shared pieces from the kernel: the liner perimeter of the thermal
path, the strand section of a field coil, the default opening clearance.
"""

from __future__ import annotations

import math
from pathlib import Path
from types import ModuleType
from typing import Any

import pytest

from conftest import GENSET, MM, PUMP, calculation, variant
from emgate.calc import conductors, thermal
from emgate.physics import rotor_conductors, slots

# --- one home for shared pieces -------------------------------------------------------------------


def spy(monkeypatch: pytest.MonkeyPatch, module: ModuleType, name: str) -> list[tuple[Any, ...]]:
    """Record the calls of a kernel function in its module, letting them run."""
    calls: list[tuple[Any, ...]] = []
    real = getattr(module, name)

    def recording(*args: Any, **kwargs: Any) -> Any:
        calls.append(args)
        return real(*args, **kwargs)

    monkeypatch.setattr(module, name, recording)
    return calls


@pytest.mark.parametrize(
    ("base", "kernel", "perimeter"),
    [
        # [calc: trapezoid] b1 + b2 + 2 sqrt(h2^2 + ((b2 - b1)/2)^2), h2 = 20 - 0.8 - 1.5 mm.
        (PUMP, "semi_closed_slot_perimeter", 6.4 + 9.6 + 2 * math.hypot(17.7, 1.6)),
        # [calc: rectangle] 2 (b + h - h_w) = 2 (7 + 30 - 3) mm.
        (GENSET, "open_slot_perimeter", 2 * (7.0 + 30.0 - 3.0)),
    ],
)
def test_the_thermal_path_takes_the_liner_perimeter_from_the_kernel(
    monkeypatch: pytest.MonkeyPatch, base: Path, kernel: str, perimeter: float
) -> None:
    calls = spy(monkeypatch, slots, kernel)
    calc = calculation(base)
    thermal.thermal_estimate(calc)
    assert calls, f"the thermal estimate did not use slots.{kernel}"
    assert conductors.slot_perimeter(calc) / MM == pytest.approx(perimeter, rel=1e-12)  # rounding


def test_the_field_coil_uses_the_shared_strand_section(
    repo: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    field = {
        "shape": "rectangular",
        "strands": 2,
        "width": "4 mm",
        "height": "1.5 mm",
        "corner_radius": "0.5 mm",
        "insulated_width": "4.2 mm",
        "insulated_height": "1.7 mm",
    }
    calls = spy(monkeypatch, rotor_conductors, "field_coil_current_density")
    calc = calculation(variant(repo, {"rotor.field.conductor": field}, base=GENSET))
    # [mem: IEC 60317-0-2] w h - (4 - pi) r^2 per strand, two in hand, 9 A.
    strand = (4.0 * 1.5 - (4 - math.pi) * 0.5**2) * MM**2
    assert calc.value("rotor.field_current_density") == pytest.approx(
        9.0 / (2 * strand), rel=1e-12
    )  # rounding
    assert calls, "the field coil did not use rotor_conductors.field_coil_current_density"


def test_the_opening_clearance_is_the_kernels_and_its_limit_is_declared_once(
    monkeypatch: pytest.MonkeyPatch,
) -> None:
    from emgate_rules.slot_fill import SlotFillOptions

    # The limit: one declaration on the option field, 0.2 mm with its source.
    default = SlotFillOptions.model_fields["opening_clearance"].default
    assert default == pytest.approx(0.2e-3, rel=1e-12)  # 0.2 mm, common practice, no source
    assert SlotFillOptions.source_of("opening_clearance") == "common practice, no source"
    # The quantity: the sheet's stator.opening_clearance is the kernel's function.
    calls = spy(monkeypatch, slots, "opening_clearance")
    value = calculation(PUMP).value("stator.opening_clearance")
    assert calls, "the sheet did not use slots.opening_clearance"
    # [calc] pump: opening 2.8 mm less the insulated strand 0.97 mm (rounding only)
    assert value / MM == pytest.approx(2.8 - 0.97, rel=1e-12)


# --- what depends on the winding alone is shared between records ---------------------------


def _winding_caches() -> list[Any]:
    from emgate.calc import winding

    return winding.PER_WINDING


def _sheets(paths: list[Path]) -> list[Any]:
    from emgate.sheet import load_design, sheet_of

    return [sheet_of(load_design(p)[3]) for p in paths]


def test_a_records_sheet_is_the_same_whatever_windings_came_before_it() -> None:
    """The per-winding analysis is computed once per distinct winding in a process: each
    example's sheet, computed first with every such cache empty, is the same (to the bit)
    after the other examples, of other windings, have filled them; and a sheet quantity
    that reads the winding reads it from the cache, not from a stale record."""
    from conftest import SERVO

    caches = _winding_caches()
    assert len(caches) >= 10  # layout, factor, balance, THD, peak, waves, family, ratios...
    paths = [PUMP, SERVO, GENSET]
    alone = []
    for p in paths:
        for f in caches:
            f.cache_clear()
        alone += _sheets([p])
    assert _sheets(paths[::-1]) == alone[::-1]
    assert sum(f.cache_info().currsize for f in caches) >= 3 * 5  # three windings kept


def test_the_shared_layout_is_read_only() -> None:
    from emgate.calc import winding

    layout = winding.layout(calculation(PUMP))
    assert layout is winding.layout(calculation(PUMP))  # shared, not recomputed
    with pytest.raises(ValueError, match="read-only"):
        layout[0, 0] = 0


@pytest.mark.parametrize("turns, current", [(1.0, 1.0), (7.0, 13.3), (23.0, 0.41)])
def test_the_mmf_peak_scales_the_windings_unit_peak(turns: float, current: float) -> None:
    """The sheet's MMF peak is the winding's peak for one turn and one ampere, scaled: the
    staircase is linear in both. Held to the kernel's own peak at those turns and current,
    within 1e-14 relative (a few rounding steps)."""
    from emgate.calc import winding
    from emgate.physics.mmf import mmf_peak

    c = calculation(PUMP)
    unit = winding._unit_mmf_peak(winding.spec(c))
    expected = mmf_peak(winding.layout(c), turns, current)
    assert unit * turns * current == pytest.approx(expected, rel=1e-14)


@pytest.mark.parametrize("turns, current", [(1.0, 1.0), (11.0, 6.5), (40.0, 0.2)])
def test_the_magnet_eddy_waves_scale_the_windings_unit_waves(turns: float, current: float) -> None:
    """The magnet eddy estimate takes the winding's travelling waves for one turn and one
    ampere, scaled: the same orders and directions as the kernel's waves at those turns and
    current, and amplitudes within 1e-14 relative (a few rounding steps)."""
    import numpy as np

    from conftest import SERVO
    from emgate.calc import losses, winding
    from emgate.physics.losses import mmf_travelling_waves

    c = calculation(SERVO)
    unit = losses._unit_waves(winding.spec(c))
    expected = mmf_travelling_waves(
        winding.layout(c), turns, current, c.d.pole_pairs, 40 * c.d.stator.slots
    )
    assert np.array_equal(unit.orders, expected.orders)
    assert np.array_equal(unit.directions, expected.directions)
    np.testing.assert_allclose(unit.amplitudes * (turns * current), expected.amplitudes, rtol=1e-14)
