"""What one page shows, gathered from a design, its calculation and the run's checks.

The only module of :mod:`emgate.page` (and of :mod:`emgate.diff`) that reads the
calculation object or the physics kernel: everything it hands on is plain dataclasses of
floats, strings and lists, so the plots and the HTML never recompute physics and the diff
compares like with like. Values are taken from the calculation; where a plot needs a curve
the sheet holds only as a number (the MMF staircase at an instant, its spectrum, a steel's
H at a working point) the kernel function that computes the number is called with the
calculation's own inputs.

Display lengths are millimetres; quantities keep the sheet's SI values with their display
unit beside them.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, Any

from emgate.calc import conductors as cc
from emgate.calc import magnetic as cm
from emgate.calc import thermal as ct
from emgate.calc import winding as cw
from emgate.page.shapes import ConductorDims, SlotDims

if TYPE_CHECKING:
    from emgate.findings import RecordResult, RunResult
    from emgate.plugins import PluginSet

MM = 1e3  # metres to millimetres, for drawings
#: The electrical instant of the MMF plot: phase A's current at its crest (omega t = 0).
MMF_INSTANT = 0.0


@dataclass(frozen=True)
class Quantity:
    """One row of the sheet: SI value (None when not computed), display unit and text."""

    name: str
    value: float | None
    unit: str
    method: str
    text: str
    error: str = ""


@dataclass(frozen=True)
class Section:
    """Cross-section of the machine for the drawings [mm]."""

    machine: str
    poles: int
    slots: int
    stator_outer_r: float
    bore_r: float
    stator_slot: SlotDims
    rotor_outer_r: float
    rotor_inner_r: float
    conductor: ConductorDims
    conductors_per_slot: int
    liner: float
    layers: int
    rotor_slots: int = 0
    rotor_slot: SlotDims | None = None
    magnet_thickness: float = 0.0
    magnet_arc: float = 0.0
    sleeve: float = 0.0
    shoe_arc: float = 0.0
    shoe_height: float = 0.0
    body_width: float = 0.0
    body_height: float = 0.0


@dataclass(frozen=True)
class StarPhasor:
    """A slot of the star of slots: 1-based slot number, electrical angle, its coil sides."""

    slot: int
    angle_deg: float
    sides: tuple[str, ...]


@dataclass(frozen=True)
class WindingTable:
    phases: int
    layers: int
    slots: int
    pole_pairs: int
    coil_pitch: int
    #: Per slot, the coil side of each layer, top (gap side) first: ("+A", "-C").
    table: list[tuple[str, ...]]
    origin: str
    star: list[StarPhasor]
    winding_factor: float | None
    #: The layout repeats this many times around the bore.
    periodicity: int


@dataclass(frozen=True)
class MMFData:
    instant_deg: float
    conductor_current: float
    #: Over one pole pair: electrical angle [deg], staircase and working-harmonic MMF [A].
    angle_deg: list[float]
    staircase: list[float]
    fundamental: list[float]
    #: Mechanical orders n = 1..N and their peak amplitudes [A], over the whole bore.
    orders: list[int]
    amplitudes: list[float]
    working_order: int
    thd: float | None


@dataclass(frozen=True)
class WorkingPoint:
    part: str
    quantity: str
    b: float
    h: float


@dataclass(frozen=True)
class SteelCurve:
    name: str
    source: str
    parts: tuple[str, ...]
    b: list[float]
    h: list[float]
    points: list[WorkingPoint]


@dataclass(frozen=True)
class ThermalStep:
    name: str
    resistance: float
    heat: float
    rise: float


@dataclass(frozen=True)
class Thermal:
    method: str
    coolant_c: float
    winding_c: float
    steps: list[ThermalStep]


@dataclass(frozen=True)
class RemedyRow:
    """One remedy of a failing check (:class:`emgate.remedy.Remedy` as plain text): the
    field, its value in the record and the suggested one, the check's margin there [1] and
    the checks that would newly fail; ``text`` is the report's line."""

    field: str
    status: str
    old: str
    new: str
    margin: float
    breaks: tuple[str, ...]
    text: str


@dataclass(frozen=True)
class CheckRow:
    rule: str
    quantity: str
    label: str
    value: float
    limit: float
    bound: str
    unit: str
    margin: float
    passed: bool
    basis: str
    display: str
    record_path: str
    severity: str = ""
    waived: bool = False
    #: What would make a failing check pass, as the text report lists it under the finding.
    remedies: tuple[RemedyRow, ...] = ()
    #: The line for a check no single field can fix ('' otherwise).
    remedy_summary: str = ""


@dataclass(frozen=True)
class RuleRow:
    rule: str
    status: str
    version: str
    summary: str
    origin: str
    message: str = ""


@dataclass
class PageData:
    """Everything the sheet of one record shows; plain data only."""

    file: str
    record_id: str
    title: str
    machine: str
    poles: int
    facts: list[tuple[str, str]]
    steels_used: list[tuple[str, str, str]]
    quantities: list[Quantity]
    fields: dict[str, str]
    section: Section | None = None
    winding: WindingTable | None = None
    mmf: MMFData | None = None
    steels: list[SteelCurve] = field(default_factory=list)
    ampere_turns: list[tuple[str, float]] = field(default_factory=list)
    losses: list[Quantity] = field(default_factory=list)
    thermal: Thermal | None = None
    checks: list[CheckRow] = field(default_factory=list)
    rules: list[RuleRow] = field(default_factory=list)
    findings: list[str] = field(default_factory=list)
    verdict: int = 0
    problems: list[str] = field(default_factory=list)

    def quantity(self, name: str) -> float | None:
        for q in self.quantities:
            if q.name == name:
                return q.value
        return None


# ------------------------------------------------------------------------- the gate run


def run_gate(
    paths: list[Path], plugins: PluginSet, config: Path | None = None, root: Path | None = None
) -> RunResult:
    """The gate's own run (engine, policy of the nearest emgate.yaml) over ``paths``; bad
    input comes back as input findings, as from ``emgate check``."""
    from emgate.config import find_config, load_policy
    from emgate.engine import execute
    from emgate.errors import InputError, InputErrors
    from emgate.findings import RunResult, input_findings
    from emgate.pipeline import Run

    start = paths[0] if paths else Path.cwd()
    if config is None:
        config = find_config(start if start.is_dir() else start.parent)
    installed = {p.distribution: p.version for p in plugins.packs}
    rules = {rid: lr.rule for rid, lr in plugins.rules.items()}
    try:
        policy = load_policy(config, rules, root or Path.cwd(), installed)
    except (InputError, InputErrors) as exc:
        return RunResult(findings=input_findings(exc))
    return execute(Run(paths=paths, policy=policy, plugins=plugins))


def gather_result(result: RunResult) -> list[PageData]:
    """The page of every record the run checked."""
    return [gather(Path(r.file), result, record=r) for r in result.records]


# ------------------------------------------------------------------------- one record


def gather(
    path: Path,
    result: RunResult | None = None,
    *,
    record: RecordResult | None = None,
    shown_as: str | None = None,
) -> PageData:
    """Gather the page of the design record at ``path``; its checks come from ``result``
    (the record of the run whose file or id matches). InputError(s) when it cannot be read.
    A part of the page the calculation cannot compute is left out and named in
    ``problems``."""
    from emgate.calc import Calculation
    from emgate.errors import display_path
    from emgate.sheet import load_design, sheet_values

    _, values, steels_used = sheet_values(path)
    doc, design, catalogue = load_design(path)
    calc = Calculation(design, catalogue)
    page = PageData(
        file=shown_as or display_path(path),
        record_id=design.id,
        title=design.title,
        machine=design.machine,
        poles=design.poles,
        facts=_facts(design),
        steels_used=steels_used,
        quantities=_quantities(values),
        fields=flatten(doc.data),
    )
    for what, build in (
        ("cross-section", _section),
        ("winding", _winding),
        ("MMF", _mmf),
        ("B-H curves", _steels),
        ("magnetic circuit", _ampere_turns),
        ("thermal network", _thermal),
    ):
        try:
            build(page, design, calc)
        except (ValueError, ArithmeticError) as exc:
            page.problems.append(f"{what}: not computed: {exc}")
    page.losses = [
        q for q in page.quantities if q.name.startswith("losses.") or q.name.endswith("_loss")
    ]
    if result is not None:
        if record is None:
            record = next((r for r in result.records if r.record_id == design.id), None)
        _checks(page, result, record)
    return page


def flatten(data: Any, prefix: str = "") -> dict[str, str]:
    """A record's plain data as dotted paths to their text ('stator.slot.opening': '2.8 mm')."""
    out: dict[str, str] = {}
    if isinstance(data, dict):
        for key, value in data.items():
            out.update(flatten(value, f"{prefix}.{key}" if prefix else str(key)))
    elif isinstance(data, list):
        for i, value in enumerate(data):
            out.update(flatten(value, f"{prefix}[{i}]"))
    else:
        out[prefix] = str(data)
    return out


def _facts(design: Any) -> list[tuple[str, str]]:
    from emgate.units import format_value

    r = design.rating
    return [
        ("machine", f"{design.machine.replace('_', ' ')}, {design.poles} poles"),
        ("rating", f"{format_value(r.power, 'kW')}, {r.operation}"),
        ("line voltage", f"{format_value(r.line_voltage, 'V')}, {r.connection}"),
        ("line current", format_value(r.line_current, "A")),
        ("frequency", format_value(r.frequency, "Hz")),
        ("speed", format_value(r.speed, "rpm")),
        ("stator", f"{design.stator.slots} slots, {design.stator.steel}"),
        ("winding", f"{design.winding.phases} phases, {design.winding.layers} layer(s)"),
        ("cooling", design.cooling.method.replace("_", " ") + f" {design.cooling.code or ''}"),
    ]


def _quantities(values: dict[str, tuple[float | None, str, str, str]]) -> list[Quantity]:
    from emgate.units import format_value

    out = []
    for name in sorted(values):
        value, unit, method, err = values[name]
        shown = err if value is None else format_value(value, "" if unit == "1" else unit, 5)
        out.append(Quantity(name, value, unit, method, shown, err))
    return out


def _slot_dims(slot: Any) -> SlotDims:
    if slot.shape == "semi_closed":
        return SlotDims(
            "semi_closed",
            slot.opening * MM,
            slot.opening_height * MM,
            slot.wedge_height * MM,
            slot.top_width * MM,
            slot.bottom_width * MM,
            slot.height * MM,
        )
    w = slot.width * MM
    return SlotDims("open", w, 0.0, slot.wedge_height * MM, w, w, slot.height * MM)


def _conductor_dims(conductor: Any) -> ConductorDims:
    if conductor.shape == "round":
        return ConductorDims(
            "round",
            conductor.strands,
            conductor.insulated_diameter * MM,
            conductor.insulated_diameter * MM,
            conductor.bare_diameter * MM,
            conductor.bare_diameter * MM,
        )
    return ConductorDims(
        "rectangular",
        conductor.strands,
        conductor.insulated_width * MM,
        conductor.insulated_height * MM,
        conductor.width * MM,
        conductor.height * MM,
    )


def _section(page: PageData, d: Any, calc: Any) -> None:
    from emgate import geometry as geo

    rotor = d.rotor
    extra: dict[str, Any] = {}
    if d.machine == "induction":
        extra = {"rotor_slots": rotor.slots, "rotor_slot": _slot_dims(rotor.slot)}
    elif d.machine == "surface_pm":
        extra = {
            "magnet_thickness": rotor.magnet.thickness * MM,
            "magnet_arc": rotor.magnet.pole_arc,
            "sleeve": rotor.sleeve_thickness * MM,
        }
    else:
        extra = {
            "shoe_arc": rotor.pole.shoe_arc,
            "shoe_height": rotor.pole.shoe_height * MM,
            "body_width": rotor.pole.body_width * MM,
            "body_height": rotor.pole.body_height * MM,
        }
    page.section = Section(
        machine=d.machine,
        poles=d.poles,
        slots=d.stator.slots,
        stator_outer_r=d.stator.outer_diameter * MM / 2,
        bore_r=d.stator.bore_diameter * MM / 2,
        stator_slot=_slot_dims(d.stator.slot),
        rotor_outer_r=geo.rotor_outer_diameter(d) * MM / 2,
        rotor_inner_r=rotor.inner_diameter * MM / 2,
        conductor=_conductor_dims(d.winding.conductor),
        conductors_per_slot=int(cc.conductors_per_slot(calc)),
        liner=cc.liner(calc) * MM,
        layers=d.winding.layers,
        **extra,
    )


def _side(sign: int, k: int) -> str:
    from emgate.physics.winding import phase_name

    return ("+" if sign > 0 else "-") + phase_name(k)


def _winding(page: PageData, d: Any, calc: Any) -> None:
    import numpy as np

    from emgate.physics import winding as wk

    w = d.winding
    layout = np.asarray(cw.layout(calc))
    q, p = d.stator.slots, d.pole_pairs
    table: list[tuple[str, ...]]
    if w.layout is not None:
        table = [tuple(entry.split()) for entry in w.layout]
        origin = "the record's slot table"
    else:
        origin = "generated from the star of slots"
        # The kernel's own belts: the top layer of slot s is the go side of its belt, the
        # bottom layer the return side of the coil that starts y slots back.
        top = wk.belt_sides(q, p, w.phases)
        layers = [top] if w.layers == 1 else [top, -np.roll(top, w.coil_pitch, axis=1)]
        if not np.array_equal(sum(layers), layout):
            raise ValueError("the layers do not add up to the calculation's layout")
        table = [
            tuple(
                _side(int(lay[k, s]), k)
                for lay in layers
                for k in range(w.phases)
                if lay[k, s] != 0
            )
            for s in range(q)
        ]
    star = [
        StarPhasor(s + 1, (360.0 * p * s / q) % 360.0, table[s] if s < len(table) else ())
        for s in range(q)
    ]
    try:
        kw1: float | None = cw.winding_factor(calc)
    except (ValueError, ArithmeticError):
        kw1 = None
    page.winding = WindingTable(
        w.phases, w.layers, q, p, w.coil_pitch, table, origin, star, kw1, math.gcd(q, p)
    )


def _mmf(page: PageData, d: Any, calc: Any) -> None:
    import numpy as np

    from emgate.physics import mmf as mk
    from emgate.physics.winding import harmonic_phasors

    w = d.winding
    p = d.pole_pairs
    current = cw.phase_current(calc) / w.parallel_paths
    currents = mk.balanced_currents(w.phases, current, MMF_INSTANT)
    sps = max(4, 720 // d.stator.slots)
    theta, staircase = mk.mmf_staircase(cw.layout(calc), w.turns_per_coil, currents, sps)
    top = max(4 * d.stator.slots, 12 * p)
    amplitudes = mk.mmf_spectrum(cw.layout(calc), w.turns_per_coil, currents, top)
    # The working harmonic's phase from the same slot phasor sum as its amplitude: a step
    # C_s at theta_s gives the order-n term (|Y_n| / (pi n)) cos(n theta + arg Y_n - pi/2),
    # Y_n = sum C_s exp(-j n theta_s).
    ac = mk.slot_ampere_conductors(cw.layout(calc), w.turns_per_coil, currents)
    y_p = np.conj(harmonic_phasors(ac, p))
    keep = theta < 2.0 * math.pi / p
    fundamental = amplitudes[p] * np.cos(p * theta[keep] + np.angle(y_p) - math.pi / 2)
    thd = page.quantity("winding.mmf_thd")
    page.mmf = MMFData(
        instant_deg=math.degrees(MMF_INSTANT),
        conductor_current=current,
        angle_deg=[float(a) for a in np.degrees(p * theta[keep])],
        staircase=[float(v) for v in staircase[keep]],
        fundamental=[float(v) for v in fundamental],
        orders=list(range(1, top + 1)),
        amplitudes=[float(a) for a in amplitudes[1:]],
        working_order=p,
        thd=thd,
    )


#: Working points: (part, sheet name of its flux density, stator or rotor steel).
_PARTS = (
    ("stator teeth", "stator.tooth_flux_density", "stator"),
    ("stator yoke", "stator.yoke_flux_density", "stator"),
    ("rotor teeth", "rotor.tooth_flux_density", "rotor"),
    ("rotor yoke", "rotor.yoke_flux_density", "rotor"),
    ("pole body", "rotor.pole_body_flux_density", "rotor"),
)


def _steels(page: PageData, d: Any, calc: Any) -> None:
    from emgate.physics.bh import h_from_b

    curves = {"stator": cm.stator_steel(calc), "rotor": cm.rotor_steel(calc)}
    out: dict[str, SteelCurve] = {}
    for part, name, member in _PARTS:
        curve = curves[member]
        steel = out.get(curve.name)
        if steel is None:
            steel = SteelCurve(
                curve.name,
                curve.source,
                (),
                [float(b) for b in curve.b],
                [float(h) for h in curve.h],
                [],
            )
        if member not in steel.parts:
            steel = SteelCurve(
                steel.name, steel.source, (*steel.parts, member), steel.b, steel.h, steel.points
            )
        out[curve.name] = steel
        b = page.quantity(name)
        if b is not None and math.isfinite(b) and b > 0.0:
            steel.points.append(WorkingPoint(part, name, b, float(h_from_b(curve, b))))
    page.steels = list(out.values())


def _ampere_turns(page: PageData, d: Any, calc: Any) -> None:
    mag = cm.magnetic(calc)
    iron = mag.iron
    parts = [
        ("air gap", mag.gap_mmf),
        ("stator teeth", iron.stator_tooth_mmf),
        ("rotor teeth", iron.rotor_tooth_mmf),
        ("pole body", iron.pole_body_mmf),
        ("stator yoke (half)", iron.stator_yoke_mmf),
        ("rotor yoke (half)", iron.rotor_yoke_mmf),
    ]
    page.ampere_turns = [(n, float(v)) for n, v in parts if v > 0.0]


def _thermal(page: PageData, d: Any, calc: Any) -> None:
    est = ct.thermal_estimate(calc)
    page.thermal = Thermal(
        est.method,
        est.coolant_temperature - 273.15,
        est.winding_temperature - 273.15,
        [ThermalStep(s.name, s.resistance, s.heat, s.rise) for s in est.steps],
    )


def _checks(page: PageData, result: RunResult, record: RecordResult | None) -> None:
    from emgate.remedy_report import remedies_for_check, summary
    from emgate.report.common import check_display
    from emgate.terms import path_string

    page.verdict = result.exit_code
    if record is None:
        page.problems.append("checks: the run did not check this record")
        return
    infos = {r.id: r for r in result.rules}
    mine = [f for f in result.findings if f.record_id == record.record_id or f.file == record.file]
    page.findings = [f"{f.severity}: {f.rule}: {f.message}" for f in mine if f.check is None]
    live = [f for f in mine if f.waived_by is None]
    page.verdict = (
        3
        if any(f.kind == "crash" for f in live)
        else 2
        if any(f.kind == "input" for f in live)
        else 1
        if any(f.severity == "error" for f in live)
        else 0
    )
    for o in record.outcomes:
        info = infos.get(o.rule)
        page.rules.append(
            RuleRow(
                o.rule,
                o.status,
                info.version if info else "?",
                info.summary if info else "",
                f"{info.distribution} {info.distribution_version}" if info else "",
                o.message,
            )
        )
        for c in o.checks:
            finding = next((f for f in mine if f.rule == o.rule and f.check == c), None)
            remedies = remedies_for_check(result, c)
            page.checks.append(
                CheckRow(
                    o.rule,
                    c.quantity,
                    c.label,
                    c.value,
                    c.limit,
                    c.bound,
                    c.unit,
                    c.margin,
                    c.passed,
                    c.basis,
                    check_display(c),
                    path_string(c.path),
                    finding.severity if finding else "",
                    bool(finding and finding.waived_by),
                    tuple(
                        RemedyRow(
                            r.field_name,
                            r.status,
                            r.old,
                            r.new,
                            r.margin,
                            r.breaks,
                            r.describe(),
                        )
                        for r in remedies
                    ),
                    summary(remedies),
                )
            )
    # Failing first, then the closest to its limit.
    # (A margin is +-inf against a zero limit: a pass sorts last, a failure first.)
    page.checks.sort(key=lambda c: (c.passed, c.margin if c.margin == c.margin else -math.inf))
