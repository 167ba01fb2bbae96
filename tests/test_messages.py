"""What a designer reads for a mistake: a unit suggestion of the field's own dimension,
patterns said in words, a typical value for a missing key, a lost colon on its own line."""

from __future__ import annotations

import importlib
import pkgutil
import typing
from pathlib import Path
from typing import Any

import pint
import pytest
from pydantic import BaseModel

from conftest import PUMP, run_cli
from emgate import config, model
from emgate.translate import PATTERN_WORDS


def errors_of(tmp_path: Path, text: str) -> list[dict[str, Any]]:
    path = tmp_path / "record.yaml"
    path.write_text(text)
    done = run_cli("check", "--format", "json", path)
    assert done.code == 2, done.out
    return done.input_findings()


def replaced(old: str, new: str) -> str:
    text = PUMP.read_text()
    assert old in text
    return text.replace(old, new, 1)


def test_a_power_in_hp_is_the_mechanical_horsepower(tmp_path: Path) -> None:
    from emgate.units import convert

    # [pub: pint's definition, horsepower = 550 ft lbf / s]; tolerance 1e-12 relative: the
    # same exact definitions, floating-point rounding only.
    expected = pint.UnitRegistry().Quantity(20, "hp").to("W").magnitude
    assert convert("20 hp", "power") == pytest.approx(expected, rel=1e-12)
    assert convert("20 hp", "power") == pytest.approx(14914, abs=1)  # 745.7 W each [calc]


@pytest.mark.parametrize(
    ("old", "new", "hint", "never"),
    [
        # a power is offered a power, never 'h' (hours)
        ("power: 7.5 kW", "power: 7.5 Kw", "did you mean 'kW'?", "'h'"),
        ("power: 7.5 kW", "power: 20 hq", "a power is written in W, mW, kW", "'h'"),
        # a length is offered a length, never 'min' (minutes), though 'mn' is closer to it
        ("air_gap: 0.45 mm", "air_gap: 0.45 mn", "did you mean 'm'?", "'min'"),
        ("speed: 1460 rpm", "speed: 1460 rpn", "did you mean 'rpm'?", "'r'"),
    ],
)
def test_a_unit_suggestion_has_the_fields_dimension(
    tmp_path: Path, old: str, new: str, hint: str, never: str
) -> None:
    text = replaced(old, new)
    (error,) = errors_of(tmp_path, text)
    assert hint in error["message"]
    assert never not in error["message"]
    line = next(n for n, t in enumerate(text.splitlines(), 1) if t.strip() == new)
    assert error["line"] == line


def _patterns(annotation: Any, seen: set[type]) -> set[str]:
    found: set[str] = set()
    for meta in getattr(annotation, "__metadata__", ()):
        if getattr(meta, "pattern", None):
            found.add(meta.pattern)
    if isinstance(annotation, type) and issubclass(annotation, BaseModel):
        if annotation not in seen:
            seen.add(annotation)
            for info in annotation.model_fields.values():
                for meta in info.metadata:
                    if getattr(meta, "pattern", None):
                        found.add(meta.pattern)
                found |= _patterns(info.annotation, seen)
    for arg in typing.get_args(annotation):
        found |= _patterns(arg, seen)
    return found


def test_every_pattern_of_the_models_is_said_in_words() -> None:
    seen: set[type] = set()
    found: set[str] = set()
    parts = [
        importlib.import_module(f"emgate.model.{m.name}")
        for m in pkgutil.iter_modules(model.__path__)
    ]
    for module in (model, *parts, config):
        for value in vars(module).values():
            if isinstance(value, type) and issubclass(value, BaseModel):
                found |= _patterns(value, seen)
    assert found and found <= set(PATTERN_WORDS)


def test_a_pattern_mismatch_says_the_form_in_words(tmp_path: Path) -> None:
    (error,) = errors_of(tmp_path, replaced("id: pump-drive-4p36s", "id: Pump_Drive"))
    assert "lower-case letters, digits" in error["message"]
    assert "'Pump_Drive'" in error["message"]
    assert "[a-z" not in error["message"] and "^" not in error["message"]


def test_a_missing_key_gives_a_typical_value(tmp_path: Path) -> None:
    text = replaced("air_gap: 0.45 mm\n", "")
    (error,) = errors_of(tmp_path, text)
    assert error["message"] == "required key 'air_gap' is missing; for example 'air_gap: 0.45 mm'"


def test_a_missing_whole_number_gives_a_typical_value(tmp_path: Path) -> None:
    (error,) = errors_of(tmp_path, replaced("poles: 4\n", ""))
    assert error["message"] == "required key 'poles' is missing; for example 'poles: 4'"


def test_a_missing_mapping_names_the_keys_it_needs(tmp_path: Path) -> None:
    text = PUMP.read_text()
    start = text.index("cooling:\n")
    end = text.index("\n", text.index("ambient:", start))
    (error,) = errors_of(tmp_path, text[:start] + text[end + 1 :])
    assert error["message"] == "required key 'cooling' is missing; a mapping with method, ambient"


@pytest.mark.parametrize(
    ("old", "new", "column"),
    [("poles: 4", "poles 4", 1), ("  bore_diameter: 136 mm", "  bore_diameter 136 mm", 3)],
)
def test_a_missing_colon_is_reported_on_its_line(
    tmp_path: Path, old: str, new: str, column: int
) -> None:
    """libyaml stops on the line after (the key is read as a scalar going on): the message
    points at the line that has no colon."""
    text = replaced(old + "\n", new + "\n")
    line = text.splitlines().index(new) + 1
    (error,) = errors_of(tmp_path, text)
    assert (error["line"], error["column"]) == (line, column)
    assert "':' is likely missing" in error["message"]
    assert f"stopped on line {line + 1}" in error["message"]
