"""What one page shows, as plain dataclasses of floats, strings and lists.

Gathered by :mod:`emgate.page.data`, drawn by :mod:`emgate.page.plots`, written by
:mod:`emgate.page.html`, compared by :mod:`emgate.diff`. Display lengths are millimetres;
quantities keep the sheet's SI values with their display unit beside them.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from emgate.page.shapes import ConductorDims, SlotDims


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


@dataclass(frozen=True)
class IndexRow:
    """A record's line in a run's index: what the index keeps of its page once written."""

    record_id: str
    title: str
    file: str
    verdict: int
    closest: CheckRow | None  # the failing check, or the one closest to its limit

    @classmethod
    def of(cls, page: PageData) -> IndexRow:
        closest = page.checks[0] if page.checks else None
        return cls(page.record_id, page.title, page.file, page.verdict, closest)
