"""The public rule API: one module for packs, generic rules, a read-only sheet, limits
declared once, and every check naming a sheet quantity."""

from __future__ import annotations

import ast
import json
import math
from datetime import date
from pathlib import Path
from typing import Any

import pytest

from conftest import DEMO, GENSET, PUMP, REPO, SERVO, run_cli, write_variant

RULE_SOURCES = sorted((REPO / "rules" / "emgate_rules").glob("*.py")) + sorted(
    (REPO / "examples" / "company-pack").rglob("*.py")
)


def _emgate_imports(path: Path) -> list[str]:
    """Every module of emgate (or of emgate_rules) that a file imports, by its ast."""
    tree = ast.parse(path.read_text(encoding="utf-8"))
    out: list[str] = []
    for node in ast.walk(tree):
        if isinstance(node, ast.ImportFrom) and node.module:
            out.append(node.module)
        elif isinstance(node, ast.Import):
            out += [alias.name for alias in node.names]
    return [m for m in out if m.split(".")[0] in ("emgate", "emgate_rules")]


@pytest.mark.parametrize("path", RULE_SOURCES, ids=lambda p: p.name)
def test_rules_and_the_pack_import_emgate_only_through_its_api(path: Path) -> None:
    for module in _emgate_imports(path):
        if module.startswith("emgate_rules"):  # the built-in package's own modules
            assert path.parent.name == "emgate_rules", (path, module)
            continue
        assert module == "emgate.api", (path, module)


def test_the_api_exports_what_it_lists() -> None:
    import emgate.api as api

    assert len(set(api.__all__)) == len(api.__all__)
    for name in api.__all__:
        assert hasattr(api, name), name
    for name in ("Rule", "Options", "Check", "Problem", "Context", "hookimpl", "limit"):
        assert name in api.__all__


def _builtin_rules() -> list[Any]:
    from emgate_rules import emgate_rules

    return list(emgate_rules())


def test_each_rule_is_generic_over_its_options() -> None:
    from typing import get_args

    from emgate.api import Options, Rule

    for rule in _builtin_rules():
        (base,) = [b for b in rule.__orig_bases__ if getattr(b, "__origin__", None) is Rule]
        (model,) = get_args(base)
        assert rule.options is model and issubclass(model, Options), rule.id
    for path in RULE_SOURCES:
        assert "assert isinstance(options" not in path.read_text(encoding="utf-8"), path


# --- the sheet is read-only -----------------------------------------------------------------


def _servo_sheet() -> Any:
    from emgate.calc import Calculation
    from emgate.calc.view import Sheet
    from emgate.discovery import discover_materials
    from emgate.loader import load
    from emgate.validate import validate_design

    doc = load(SERVO)
    design = validate_design(doc)
    catalogue = discover_materials(SERVO)
    catalogue.resolve(doc, design)
    return Sheet(Calculation(design, catalogue))


def test_the_sheet_cannot_be_written() -> None:
    from emgate.api import Context

    sheet = _servo_sheet()
    before = sheet["stator.current_density"]
    with pytest.raises(TypeError):
        sheet["stator.current_density"] = 0.0  # type: ignore[index]
    with pytest.raises(AttributeError):
        sheet._read = None
    with pytest.raises(AttributeError):
        sheet.calc  # noqa: B018 - the calculation is not reachable by an attribute
    context = Context(sheet=sheet, file="x")
    with pytest.raises(AttributeError):
        context.sheet = {}  # type: ignore[misc]
    assert sheet["stator.current_density"] == before
    assert isinstance(sheet.winding_problems, tuple)
    assert isinstance(sheet.thermal_steps, tuple)


SILENCER = """
    from emgate.api import Rule, Options, hookimpl

    class Silencer(Rule[Options]):
        id = "aaa/silencer"  # runs before every built-in rule (rules run by id)
        summary = "tries to overwrite the shared calculation"

        def check(self, design, options, context):
            sheet = context.sheet
            attempts = [
                lambda: sheet.__setitem__("stator.current_density", 0.0),
                lambda: setattr(sheet, "_read", lambda *a: 0.0),
                lambda: setattr(context, "sheet", {{"stator.current_density": 0.0}}),
                lambda: context.calc._cache.clear(),
                lambda: setattr(design.winding.conductor, "strands", 1000),
                # past pydantic's frozen models: the rule's own copy of the record only
                lambda: object.__setattr__(design.winding.conductor, "strands", 1000),
            ]
            for attempt in attempts:
                try:
                    attempt()
                except Exception:
                    pass
            return []

    @hookimpl
    def emgate_rules():
        return [Silencer]
"""


def test_a_plugin_cannot_silence_another_rules_finding(plugin_host: Any, repo: Path) -> None:
    # Issue 9, item 4: the servo breaks the current-density limit on purpose.
    plugin_host.add("aaa", "aaa_silencer_pack", SILENCER.format())
    result = run_cli("check", "--format", "json", write_variant(repo, {}, base=SERVO))
    assert result.code == 1, result.out + result.err
    doc = result.json()
    assert any(f["rule"] == "current-density" for f in doc["findings"])
    (silencer,) = [o for o in doc["records"][0]["outcomes"] if o["rule"] == "aaa/silencer"]
    assert silencer["status"] == "pass"


def _mutables(node: Any, out: list[Any]) -> list[Any]:
    """Every object in a record's tree that could be changed in place."""
    from pydantic import BaseModel

    if isinstance(node, BaseModel):
        out.append(node)
        out.append(node.__dict__)
        for value in node.__dict__.values():
            _mutables(value, out)
    elif isinstance(node, dict):
        out.append(node)
        for value in node.values():
            _mutables(value, out)
    elif isinstance(node, list | tuple):
        if isinstance(node, list):
            out.append(node)
        for value in node:
            _mutables(value, out)
    elif isinstance(node, frozenset):
        for value in node:
            _mutables(value, out)
    elif not isinstance(node, str | int | float | bytes | type(None) | date):
        out.append(node)
    return out


def test_a_record_holds_only_what_the_pack_rules_copy_walks() -> None:
    # Every field type of every design model: models, dicts, lists, tuples and scalars,
    # which own_copy copies itself; a new kind of field must be looked at before it lands.
    import datetime
    import types
    from typing import Annotated, Literal, Union, get_args, get_origin

    from pydantic import BaseModel

    from emgate.model import DESIGN_MODELS

    walked = (str, int, float, bool, type(None), datetime.date, dict, list, tuple)
    seen: set[type] = set()

    def leaves(annotation: Any) -> None:
        origin = get_origin(annotation)
        if origin is Literal:
            assert all(type(a) in walked for a in get_args(annotation)), annotation
        elif origin is Annotated:
            leaves(get_args(annotation)[0])
        elif origin in (Union, types.UnionType, dict, list, tuple):
            for arg in get_args(annotation):
                if arg is not Ellipsis:
                    leaves(arg)
        elif origin is not None:
            raise AssertionError(f"a field type own_copy does not walk: {annotation}")
        elif isinstance(annotation, type) and issubclass(annotation, BaseModel):
            if annotation not in seen:
                seen.add(annotation)
                for info in annotation.model_fields.values():
                    leaves(info.annotation)
        else:
            assert annotation in walked, f"a field type own_copy does not walk: {annotation}"

    for model in DESIGN_MODELS.values():
        leaves(model)
    assert len(seen) > 20  # the walk reached the parts, not only the three kinds


@pytest.mark.parametrize("record", [PUMP, SERVO, GENSET], ids=lambda p: p.stem)
def test_a_pack_rules_copy_of_the_record_equals_pydantics_and_shares_nothing(
    record: Path,
) -> None:
    # Reference: pydantic's own deep copy (BaseModel.model_copy(deep=True)), which the
    # engine used until its copy took a third of the time.
    from emgate.loader import load_text, read_text
    from emgate.runner import own_copy
    from emgate.validate import validate_design

    design = validate_design(load_text(record, read_text(record)))
    ours, theirs = own_copy(design), design.model_copy(deep=True)
    assert ours == theirs == design
    assert ours.model_dump() == theirs.model_dump()
    assert ours.model_fields_set == design.model_fields_set
    shared = {id(o) for o in _mutables(design, [])} & {id(o) for o in _mutables(ours, [])}
    assert not shared  # a write past the frozen models reaches the copy alone
    assert len(_mutables(ours, [])) > 20  # the walk saw the tree (11 models, dicts, lists)


def test_a_pack_rules_copy_keeps_what_pydantic_keeps_of_any_model() -> None:
    from pydantic import BaseModel, ConfigDict, PrivateAttr

    from emgate.runner import own_copy

    class Part(BaseModel):
        model_config = ConfigDict(extra="allow")
        sizes: list[float] = [1.0]
        _note: list[str] = PrivateAttr(default_factory=lambda: ["a"])

    class Tag:  # hashable, and yet it can be changed
        def __init__(self) -> None:
            self.notes: list[str] = []

        def __eq__(self, other: object) -> bool:
            return isinstance(other, Tag) and other.notes == self.notes

        def __hash__(self) -> int:
            return 0

    class Whole(BaseModel):
        model_config = ConfigDict(arbitrary_types_allowed=True)
        parts: dict[str, Part]
        pair: tuple[list[int], str]
        raw: bytearray
        tags: frozenset[Tag]

    class Own(BaseModel):
        sizes: list[float] = [1.0]

        def __deepcopy__(self, memo: Any = None) -> Own:
            return Own(sizes=[*self.sizes, 2.0])  # a model's own copy is kept to

    part = Part(extra_key=[1])  # type: ignore[call-arg]
    whole = Whole(parts={"a": part}, pair=([1, 2], "x"), raw=bytearray(b"ab"), tags={Tag()})
    ours, theirs = own_copy(whole), whole.model_copy(deep=True)
    assert ours == theirs
    assert ours.parts["a"].__pydantic_extra__ == {"extra_key": [1]}
    assert ours.parts["a"]._note == ["a"]
    assert ours.parts["a"].model_fields_set == whole.parts["a"].model_fields_set == {"extra_key"}
    shared = {id(o) for o in _mutables(whole, [])} & {id(o) for o in _mutables(ours, [])}
    assert not shared
    assert ours.parts["a"].__pydantic_extra__ is not whole.parts["a"].__pydantic_extra__
    assert ours.parts["a"]._note is not whole.parts["a"]._note
    assert own_copy(Own()).sizes == [1.0, 2.0] == Own().model_copy(deep=True).sizes


# --- one declaration of each limit ----------------------------------------------------------


def _limit_fields() -> list[tuple[Any, str]]:
    return [
        (rule, name)
        for rule in _builtin_rules()
        for name in rule.options.model_fields
        if rule.options.source_of(name) is not None
    ]


def test_every_default_limit_names_its_source_in_the_schema_and_explain() -> None:
    fields = _limit_fields()
    assert len(fields) >= 30  # every limit of the built-in rules but the rise table's
    for rule, name in fields:
        source = rule.options.source_of(name)
        schema = rule.options.model_json_schema()["properties"][name]
        assert schema["description"] == f"default from {source}", (rule.id, name)
        shown = run_cli("explain", rule.id).out
        assert f"default from {source}" in shown, (rule.id, name)


def test_current_density_declares_its_sources_too() -> None:
    from emgate_rules.current_density import CurrentDensityOptions

    shown = run_cli("explain", "current-density").out
    assert (
        "\n  surface_pm_enclosed_fan = 10 A/mm^2  (default from Hendershot and Miller, fan-cooled"
        in shown
    )
    assert (
        "\n  induction_enclosed_fan = 8 A/mm^2  (default from Pyrhonen et al., Table 6.2" in shown
    )
    # 10 and 8 A/mm^2 in SI, the declared values and unit [calc]
    assert CurrentDensityOptions().surface_pm_enclosed_fan == 10e6
    assert CurrentDensityOptions().induction_enclosed_fan == 8e6
    # a cooling method's own option is the team's, for every machine kind: none by default
    assert CurrentDensityOptions().enclosed_fan is None


def test_the_basis_is_the_source_or_the_teams_limit() -> None:
    from emgate_rules.tooth_flux import ToothFluxOptions

    source = ToothFluxOptions.source_of("stator_apparent")
    assert ToothFluxOptions().limit_for("stator_apparent").basis == source
    # the same limit written in another unit is still the default
    assert ToothFluxOptions(stator_apparent="2100 mT").basis("stator_apparent") == source
    team = ToothFluxOptions(stator_apparent="1.9 T").limit_for("stator_apparent")
    assert (team.value, team.basis) == (1.9, "the team's limit (emgate.yaml)")


def test_a_limit_in_a_unit_of_the_wrong_dimension_is_refused() -> None:
    from emgate.api import FluxDensity, Options, limit

    with pytest.raises(TypeError, match="wrong"):

        class Wrong(Options):
            wrong: FluxDensity = limit(2.0, "mm", "common practice, no source")


def _installed_options() -> list[type[Any]]:
    from emgate.plugins import load_plugins

    return sorted({r.rule.options for r in load_plugins().rules.values()}, key=lambda c: c.__name__)


def test_the_default_check_takes_each_limit_as_pydantic_validates_it() -> None:
    """The check at class definition runs a limit's text through the field's converters
    without building the validator; pydantic's own validation of the same text is the
    reference, for every limit of every installed rule (bundled and the sample pack)."""
    from emgate.rule import _UNHANDLED, _field_validated, _float_metadata, _plain, _through_field

    limits = 0
    for cls in _installed_options():
        for name, info in cls.model_fields.items():
            if cls.source_of(name) is None:
                continue
            text = str(info.json_schema_extra["default_text"])  # type: ignore[index]
            data: Any = float(text) if " " not in text else text
            metadata = _float_metadata(info)
            fast = _plain(cls) and not _field_validated(cls, name) and metadata is not None
            assert fast, (cls.__name__, name)  # every installed limit takes the fast path
            ours = _through_field(metadata, data)
            assert ours is not _UNHANDLED, (cls.__name__, name)
            theirs = getattr(cls.model_validate({name: data}), name)
            assert ours == theirs, (cls.__name__, name)  # the same float, bit for bit
            limits += 1
    assert limits > 40


def test_a_default_outside_its_fields_bounds_or_optional_of_the_wrong_unit_is_refused() -> None:
    from emgate.api import FluxDensity, Options, limit

    with pytest.raises(TypeError, match="bound"):

        class Above(Options):
            share: float = limit(0.95, "", "common practice, no source", le=0.91)

    with pytest.raises(TypeError, match="which is a length"):

        class Optional(Options):
            optional: FluxDensity | None = limit(2.0, "mm", "common practice, no source")


def test_a_limit_with_a_validator_of_its_own_is_checked_by_pydantic() -> None:
    from typing import Annotated

    from pydantic import AfterValidator

    from emgate.api import Options, limit

    def below_one(v: float) -> float:
        if v >= 1.0:
            raise ValueError("must be below 1")
        return v

    with pytest.raises(TypeError, match="below 1"):

        class Own(Options):
            share: Annotated[float, AfterValidator(below_one)] = limit(
                1.5, "", "common practice, no source"
            )


def _refused_option_classes() -> dict[str, Any]:
    """Options classes whose declared default pydantic refuses, each in another way: the
    default check must refuse them all when the class is defined, whatever path it takes."""
    from typing import Literal

    from pydantic import ConfigDict, field_validator

    from emgate.api import FluxDensity, Options, Ratio, limit

    src = "common practice, no source"

    def field_validated() -> type:
        class FieldValidated(Options):
            share: Ratio = limit(1.5, "1", src)

            @field_validator("share")
            @classmethod
            def _at_most_one(cls, v: float) -> float:
                if v > 1.0:
                    raise ValueError("a share above 1 is meaningless")
                return v

        return FieldValidated

    def whole() -> type:
        class Whole(Options):
            count: int = limit(2.5, "1", src)

        return Whole

    def choice() -> type:
        class Choice(Options):
            level: Literal[1.0, 2.0] = limit(1.5, "1", src)

        return Choice

    def text() -> type:
        class Text(Options):
            name: str = limit(1.5, "1", src)

        return Text

    def optional_bounded() -> type:  # the field's gt must not hide the type's own range
        class OptionalBounded(Options):
            share: Ratio | None = limit(2000.0, "1", src, gt=0)

        return OptionalBounded

    def either() -> type:
        class Either(Options):
            value: Ratio | FluxDensity = limit(2000.0, "1", src)

        return Either

    def finite() -> type:
        class Finite(Options):
            model_config = ConfigDict(allow_inf_nan=False)
            share: float = limit(math.inf, "1", src)

        return Finite

    return {
        "field validator": field_validated,
        "int": whole,
        "literal": choice,
        "str": text,
        "optional with a bound": optional_bounded,
        "union of quantities": either,
        "no infinity": finite,
    }


@pytest.mark.parametrize("case", sorted(_refused_option_classes()))
def test_a_default_that_pydantic_refuses_is_refused_at_definition(case: str) -> None:
    with pytest.raises(TypeError, match="default"):
        _refused_option_classes()[case]()


def test_defaults_are_the_options_that_the_class_gives() -> None:
    from pydantic import Field, PrivateAttr, ValidationError, model_validator

    from emgate.api import Options

    for cls in _installed_options():
        assert cls.defaults() == cls(), cls.__name__

    class Shared(Options):  # immutable defaults: one instance serves every record
        share: float = 0.5
        grades: tuple[str, ...] = ("M400-50A",)

    class Own(Options):  # a mutable default: each rule run gets its own, as cls() gives
        grades: list[str] = ["M400-50A"]  # noqa: RUF012 - the case under test

    assert Shared.defaults() is Shared.defaults()
    first = Own.defaults()
    first.grades.append("M270-35A")
    assert Own.defaults().grades == ["M400-50A"]
    assert Own.defaults() is not Own.defaults()
    assert Own.defaults().grades is not Own.defaults().grades

    class Ordered(Options):  # a model validator still runs on the defaults
        low: float = 2.0
        high: float = 1.0

        @model_validator(mode="after")
        def _ordered(self) -> Ordered:
            if self.low > self.high:
                raise ValueError("low above high")
            return self

    with pytest.raises(ValidationError, match="low above high"):
        Ordered.defaults()

    class Required(Options):
        needed: float

    with pytest.raises(ValidationError, match="needed"):
        Required.defaults()

    class Validated(Options):  # a default to validate: cls() validates it, so do defaults()
        count: int = Field(2, validate_default=True, ge=3)

    with pytest.raises(ValidationError, match="count"):
        Validated.defaults()

    class Kept(Options):  # private state: each run gets its own instance
        _seen: list[str] = PrivateAttr(default_factory=list)
        share: float = 0.5

    Kept.defaults()._seen.append("record 1")
    assert Kept.defaults()._seen == []


def test_a_check_that_keeps_the_defaults_builds_no_options_validator() -> None:
    """Start-up: emgate's own options that the team did not set are never validated, so
    their validators are not built (pydantic's defer_build); a team's options are (the
    example repository's emgate.yaml sets current-density's and efficiency's), and a pack's
    are built whole when it loads."""
    import subprocess
    import sys

    code = (
        "from emgate.cli import main\n"
        "import contextlib, io, sys\n"
        "with contextlib.redirect_stdout(io.StringIO()):\n"
        f"    main(['check', {str(PUMP)!r}])\n"
        "from emgate.plugins import load_plugins\n"
        "print(sorted(i for i, r in load_plugins().rules.items()"
        " if r.rule.options.__pydantic_complete__))\n"
    )
    out = subprocess.run(
        [sys.executable, "-c", code], capture_output=True, text=True, check=True
    ).stdout
    assert out.strip().splitlines()[-1] == (
        "['brennfeld/stack-aspect', 'current-density', 'efficiency']"
    )


# --- every check names a sheet quantity -----------------------------------------------------


def _show(path: Path) -> dict[str, Any]:
    result = run_cli("show", "--format", "json", path)
    assert result.code == 0, result.err
    return json.loads(result.out)["quantities"]


def test_every_check_on_every_example_names_a_sheet_quantity() -> None:
    from emgate.calc import SHEET
    from emgate.units import si_unit

    result = run_cli("check", "--format", "json", DEMO)
    assert result.code == 1, result.err  # the servo breaks a limit on purpose
    sheets = {p.stem.split("-")[0]: _show(p) for p in (PUMP, SERVO, GENSET)}
    seen = 0
    for record in result.json()["records"]:
        sheet = sheets[record["record_id"].split("-")[0]]
        for out in record["outcomes"]:
            for check in out["checks"]:
                name = check["quantity"]
                assert name in SHEET, (out["rule"], name)
                seen += 1
                if out["rule"] == "declared-values":  # a relative difference of the name
                    assert check["unit"] == "1"
                    continue
                assert check["unit"] == si_unit(SHEET[name].unit), (out["rule"], name)
                value = sheet[name]["value"]
                if out["rule"] in ("demagnetisation", "demagnetisation-fault"):  # magnitude
                    value = abs(value)
                # the sheet's own number, through the same JSON: exact up to rounding
                assert check["value"] == pytest.approx(value, rel=1e-12), (out["rule"], name)
    assert seen >= 45


def test_the_new_sheet_names_are_shown_and_can_be_declared(repo: Path) -> None:
    pump, genset = _show(PUMP), _show(GENSET)
    # [calc] pump: 4 poles at 50 Hz, 1460 rpm; slip 1 - 1460 / 1500
    assert pump["rating.slip"]["value"] == pytest.approx(1 - 1460 / 1500, rel=1e-12)
    assert pump["stator.aspect_ratio"]["value"] == pytest.approx(140 / 136, rel=1e-12)
    assert "stator.opening_clearance" in pump and "stator.slot_width_clearance" not in pump
    assert "stator.slot_width_clearance" in genset and "stator.opening_clearance" not in genset
    path = write_variant(repo, {"declared": {"rating.slip": "2.7 %", "stator.aspect_ratio": 1.03}})
    result = run_cli("check", "--format", "json", path)
    checks = {
        c["quantity"]: c
        for o in result.json()["records"][0]["outcomes"]
        if o["rule"] == "declared-values"
        for c in o["checks"]
    }
    assert set(checks) == {"rating.slip", "stator.aspect_ratio"}
    assert all(c["passed"] for c in checks.values())
    # [calc] |0.026667 - 0.027| / 0.027 = 1.2 %
    assert checks["rating.slip"]["value"] == pytest.approx(
        abs((1 - 1460 / 1500) - 0.027) / 0.027, rel=1e-9
    )
    assert math.isfinite(checks["stator.aspect_ratio"]["value"])


# --- the contributor guide's example is a working pack --------------------------------------


def _guide_example() -> str:
    text = (REPO / "DEVELOPERS.md").read_text(encoding="utf-8")
    section = text.split("## Adding a rule", 1)[1].split("\n## ", 1)[0]
    return section.split("```python\n", 1)[1].split("```", 1)[0]


def test_the_guides_example_rule_runs_as_a_pack(plugin_host: Any, repo: Path) -> None:
    import shutil

    from conftest import STEELS

    plugin_host.add("acme", "acme_guide_example_pack", _guide_example())
    (repo / "materials").mkdir()
    shutil.copy(STEELS, repo / "materials" / STEELS.name)
    path = write_variant(repo, {}, base=GENSET)
    result = run_cli("check", "--format", "json", path)
    assert result.code in (0, 1), result.err
    (out,) = [o for o in result.json()["records"][0]["outcomes"] if o["rule"] == "acme/pole-body"]
    (check,) = out["checks"]
    assert check["quantity"] == "rotor.pole_body_flux_density"
    assert check["limit"] == 1.9  # the declared default, in SI (tesla)
    assert check["basis"] == "acme design manual, table 4"
    sheet_value = _show(GENSET)["rotor.pole_body_flux_density"]["value"]
    assert check["value"] == pytest.approx(sheet_value, rel=1e-12)  # the same number
    # the team's limit, in its own unit, and the basis that says so
    (repo / "emgate.yaml").write_text(
        "schema: emgate/config@1\noptions:\n  acme/pole-body:\n    maximum: 1800 mT\n",
        encoding="utf-8",
    )
    doc = run_cli("check", "--format", "json", path).json()
    (out,) = [o for o in doc["records"][0]["outcomes"] if o["rule"] == "acme/pole-body"]
    assert out["checks"][0]["basis"] == "the team's limit (emgate.yaml)"
    assert out["checks"][0]["limit"] == pytest.approx(1.8, rel=1e-12)  # 1800 mT [calc]


def test_a_declared_figure_the_record_has_no_value_for_is_an_error(repo: Path) -> None:
    # The pump's round wire in semi-closed slots has no slot-width clearance.
    path = write_variant(repo, {"declared": {"stator.slot_width_clearance": "1 mm"}})
    result = run_cli("check", "--format", "json", path)
    assert result.code == 1
    (finding,) = [f for f in result.json()["findings"] if f["rule"] == "declared-values"]
    assert finding["record_path"] == "$.declared['stator.slot_width_clearance']"
    assert "rectangular strands in an open slot only" in finding["message"]


def test_the_quick_look_at_a_rules_check_agrees_with_the_full_one() -> None:
    # runner._malformed passes the usual Check at a glance; a subclass of Check takes the
    # full path, which must give the same answer for anything a rule may put in a Check.
    from dataclasses import dataclass

    from hypothesis import given, settings
    from hypothesis import strategies as st

    from emgate.rule import Check
    from emgate.runner import _malformed

    @dataclass(frozen=True, slots=True)
    class Full(Check):
        pass

    anything = st.one_of(
        st.floats(allow_nan=True, allow_infinity=True),
        st.integers(-3, 3),
        st.booleans(),
        st.none(),
        st.text(max_size=3),
        st.lists(st.integers(), max_size=1),
    )
    texts = st.one_of(st.sampled_from(["", "1", "degC", "T", "A/mm^2", "furlong", "m/s"]), anything)
    keys = st.one_of(st.text(max_size=3), st.integers(-2, 5), st.booleans(), st.floats())
    paths = st.one_of(st.tuples(keys, keys), st.lists(keys, max_size=2), anything)

    @settings(max_examples=400, deadline=None, derandomize=True)
    @given(
        st.one_of(st.text(max_size=3), anything),
        texts,
        paths,
        anything,
        anything,
        st.one_of(st.sampled_from(["max", "min", "MAX"]), anything),
        texts,
        texts,
    )
    def agree(quantity, label, path, value, limit, bound, unit, basis) -> None:  # type: ignore[no-untyped-def]
        fields = dict(quantity=quantity, label=label, path=path, value=value, limit=limit)
        fields |= dict(bound=bound, unit=unit, basis=basis)
        assert _malformed(Check(**fields)) == _malformed(Full(**fields))

    usual = dict(quantity="q", label="l", path=("a", 0), value=1.0, limit=2.0)
    usual |= dict(bound="max", unit="T", basis="b")
    assert _malformed(Check(**usual)) == _malformed(Full(**usual)) == ""
    agree()
