"""The page of a sweep (``emgate sweep ... --html FILE``): its maps against the table the same
run writes, the random sample's points and their cap, escaping, the missing extra, and the
page in a real headless browser."""

from __future__ import annotations

import csv
import json
import os
import re
import subprocess
import sys
from collections import Counter
from html import unescape
from pathlib import Path
from typing import Any

import pytest

from conftest import PUMP, REPO, requests, run_cli, write_variant

pytest.importorskip("matplotlib")

DEMO_SPEC = REPO / "examples" / "sweeps" / "pump-gap-turns.yaml"
# The README's demo sweep on a coarser grid: each region of its map, in 15 variants.
SMALL_GRID = """\
sample: grid
fields:
  air_gap: {from: 0.30 mm, to: 0.70 mm, steps: 3}
  winding.turns_per_coil: {from: 17, to: 25, step: 2}
"""


def sweep(
    tmp_path: Path, spec_text: str, record: Path = PUMP, name: str = "s"
) -> tuple[str, list[dict[str, str]]]:
    """The page and the CSV table of one run of ``emgate sweep``."""
    spec = tmp_path / f"{name}.yaml"
    spec.write_text(spec_text, encoding="utf-8")
    table, page = tmp_path / f"{name}.csv", tmp_path / f"{name}.html"
    done = run_cli("sweep", record, spec, "--scheduler", "none", "--out", table, "--html", page)
    assert done.code == 0, done.err
    with table.open(encoding="utf-8", newline="") as f:
        rows = list(csv.DictReader(f))
    return page.read_text(encoding="utf-8"), rows


def page_data(html: str) -> dict[str, Any]:
    block = re.search(r'<script type="application/json" id="sweep-data">(.*?)</script>', html)
    assert block is not None
    return json.loads(block.group(1))


def cell_of(edges: list[float], position: float) -> int:
    """The cell whose edges enclose a position (a cell's value lies strictly inside)."""
    hits = [k for k in range(len(edges) - 1) if edges[k] < position < edges[k + 1]]
    assert len(hits) == 1, (position, edges)
    return hits[0]


def table_rows(html: str, table_id: str) -> list[list[str]]:
    body = html.split(f'id="{table_id}"', 1)[1].split("<tbody>", 1)[1].split("</tbody>", 1)[0]
    return [
        [unescape(re.sub(r"<[^>]+>", "", c)) for c in re.findall(r"<td[^>]*>(.*?)</td>", row)]
        for row in re.findall(r"<tr[^>]*>(.*?)</tr>", body)
    ]


@pytest.fixture(scope="module")
def small(tmp_path_factory: pytest.TempPathFactory) -> tuple[str, list[dict[str, str]]]:
    return sweep(tmp_path_factory.mktemp("small"), SMALL_GRID)


def test_the_grid_map_holds_the_tables_feasible_column_cell_by_cell(
    small: tuple[str, list[dict[str, str]]],
) -> None:
    """The judge is the CSV table of the same run: each row's cell, found from its SI air
    gap in millimetres and its turns, is feasible on the map exactly when the row is, and
    otherwise carries the row's binding rule; every cell holds one row."""
    html, rows = small
    data = page_data(html)
    [m] = data["maps"]
    assert [f["name"] for f in data["fields"]] == ["air_gap", "winding.turns_per_coil"]
    assert [f["unit"] for f in data["fields"]] == ["mm", ""]  # as the record writes them
    labels = [o["label"] for o in data["outcomes"]]
    seen = set()
    for r in rows:
        ix = cell_of(m["x_edges"], float(r["air_gap"]) * 1e3)
        iy = cell_of(m["y_edges"], float(r["winding.turns_per_coil"]))
        seen.add((ix, iy))
        code = m["cells"][iy][ix]
        assert (code == 0) == (r["feasible"] == "True"), r["variant"]
        assert m["total"][iy][ix] == 1
        if r["feasible"] != "True":
            assert labels[code] == r["binding_rule"]
    assert len(seen) == len(rows) == 15
    feasible = sum(r["feasible"] == "True" for r in rows)
    assert 0 < feasible < len(rows)  # the small grid keeps both regions
    # the drawing: one rectangle a feasible cell in the feasible group of the SVG
    group = re.search(r'<g id="map-0-1-cells-0">(.*?)</g>', html, re.DOTALL)
    assert group is not None and group.group(1).count("<path ") == feasible
    assert f'<b id="feasible-count">{feasible}</b> feasible' in html
    assert "<b>15</b> variants · <b>15</b> valid" in html
    assert "qualified engineer" in html and "applicable standards and local codes" in html


def test_the_tables_of_the_page_are_the_runs_rows(
    small: tuple[str, list[dict[str, str]]],
) -> None:
    """Binding rules by region counted from the CSV's columns, and the infeasible variants
    listed in the CSV's order with its rule and margin."""
    html, rows = small
    expected = Counter(
        ("feasible" if r["feasible"] == "True" else "infeasible", r["binding_rule"]) for r in rows
    )
    shown = {
        (region.split(":")[0], rule): int(n)
        for region, rule, _, n, _ in table_rows(html, "binding-table")
    }
    assert shown == dict(expected)
    listed = table_rows(html, "infeasible-table")
    bad = [r for r in rows if r["feasible"] != "True"]
    assert [int(r[0]) for r in listed] == [int(r["variant"]) for r in bad]
    for cells, r in zip(listed, bad, strict=True):
        assert float(cells[1]) == pytest.approx(float(r["air_gap"]) * 1e3, rel=1e-12)
        assert cells[3] == r["binding_rule"]
        assert cells[4] == f"{100 * float(r['binding_margin']):+.2f} %"


def test_a_cell_of_a_projected_map_is_its_closest_variant_over_the_other_field(
    tmp_path: Path,
) -> None:
    """Three fields: each pair's cell holds the rows with its two values (counted from the
    CSV) and is feasible when any of them is."""
    html, rows = sweep(
        tmp_path,
        "fields:\n  air_gap: [0.35 mm, 0.55 mm]\n  winding.turns_per_coil: [17, 21, 23]\n"
        "  stator.steel: [M400-50A, M270-35A]\n",
    )
    data = page_data(html)
    fields = data["fields"]
    assert len(data["maps"]) == 3

    def position(k: int, r: dict[str, str]) -> float:
        f = fields[k]
        value = r[f["name"]]
        if f["labels"]:
            return float(f["labels"].index(value))
        return float(value) * (1e3 if f["unit"] == "mm" else 1.0)

    for m in data["maps"]:
        x, y = m["x"], m["y"]
        groups: dict[tuple[int, int], list[dict[str, str]]] = {}
        for r in rows:
            at = (cell_of(m["x_edges"], position(x, r)), cell_of(m["y_edges"], position(y, r)))
            groups.setdefault(at, []).append(r)
        for (ix, iy), members in groups.items():
            assert m["total"][iy][ix] == len(members)
            n = sum(r["feasible"] == "True" for r in members)
            assert m["feasible"][iy][ix] == n
            assert (m["cells"][iy][ix] == 0) == (n > 0)
        assert sum(map(sum, m["total"])) == len(rows) == 12
    assert "Over the other field, a cell shows the variant that came closest" in html


def test_an_axis_of_more_values_than_cells_shares_them(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    from emgate.page import sweep_data

    monkeypatch.setattr(sweep_data, "MAP_CELLS", 2)
    html, rows = sweep(
        tmp_path,
        "fields:\n  air_gap: [0.35 mm, 0.55 mm]\n  winding.turns_per_coil: [17, 18, 21, 23]\n",
    )
    [m] = page_data(html)["maps"]
    assert len(m["y_edges"]) == 3 and len(m["x_edges"]) == 3
    for iy, turns in enumerate(((17, 18), (21, 23))):
        for ix, gap in enumerate((0.35e-3, 0.55e-3)):
            members = [
                r
                for r in rows
                if int(r["winding.turns_per_coil"]) in turns
                and float(r["air_gap"]) == pytest.approx(gap)
            ]
            assert m["total"][iy][ix] == len(members) == 2
            n = sum(r["feasible"] == "True" for r in members)
            assert m["feasible"][iy][ix] == n and (m["cells"][iy][ix] == 0) == (n > 0)
    assert "The 4 values of winding.turns_per_coil are drawn in 2 cells" in html


RANDOM = """\
sample: random
count: 24
seed: 5
fields:
  air_gap: {from: 0.30 mm, to: 0.70 mm}
  winding.turns_per_coil: {from: 17, to: 25}
  stator.steel: [M400-50A, M270-35A]
"""


def test_a_random_sample_page_draws_every_variant_as_a_point(tmp_path: Path) -> None:
    html, rows = sweep(tmp_path, RANDOM)
    plots = set(re.findall(r'<svg class="plot" data-plot="([^"]+)"', html))
    assert plots == {"map-0-1", "map-0-2", "map-1-2"}
    pts = page_data(html)["points"]
    assert pts["variant"] == [int(r["variant"]) for r in rows] == list(range(24))
    labels = page_data(html)["fields"][2]["labels"]
    for k, r in enumerate(rows):
        assert (pts["outcome"][k] == 0) == (r["feasible"] == "True")
        assert pts["positions"][0][k] == pytest.approx(float(r["air_gap"]) * 1e3, rel=1e-12)
        assert pts["positions"][1][k] == float(r["winding.turns_per_coil"])
        assert labels[int(pts["positions"][2][k])] == r["stator.steel"]
    assert "All 24 variants drawn (a map draws at most 20,000 points" in html


def test_a_large_sample_draws_every_kth_variant_and_says_so(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    from emgate.page import sweep_data

    monkeypatch.setattr(sweep_data, "MAX_POINTS", 5)
    html, rows = sweep(tmp_path, RANDOM.replace("count: 24", "count: 12"))
    pts = page_data(html)["points"]
    assert pts["stride"] == 3 and pts["variant"] == [0, 3, 6, 9]
    feasible = {int(r["variant"]): r["feasible"] == "True" for r in rows}
    assert [o == 0 for o in pts["outcome"]] == [feasible[v] for v in pts["variant"]]
    assert "4 of 12 variants drawn, one in every 3 (variants 0, 3, 6, ...)" in html


def test_a_sweep_of_one_field_draws_its_binding_margin(tmp_path: Path) -> None:
    html, rows = sweep(tmp_path, "fields:\n  winding.turns_per_coil: [17, 19, 21, 23, 25]\n")
    assert 'data-plot="margin-0"' in html and page_data(html)["maps"] == []
    pts = page_data(html)["points"]
    margins = [float(r["binding_margin"]) for r in rows]
    assert pts["margin"] == pytest.approx(margins, rel=1e-12)
    assert pts["positions"][0] == [17, 19, 21, 23, 25]


def test_the_record_title_is_escaped(tmp_path: Path) -> None:
    title = '<script>window.pwned = 1</script> & "quotes" <b>bold</b>'
    record = write_variant(tmp_path, {"title": title})
    html, _ = sweep(tmp_path, SMALL_GRID, record)
    assert "<script>window.pwned" not in html and "<b>bold</b>" not in html
    assert "<h1>&lt;script&gt;window.pwned = 1&lt;/script&gt; &amp; &quot;quotes&quot;" in html


def test_without_the_html_extra_the_sweep_says_what_to_install(tmp_path: Path) -> None:
    spec = tmp_path / "s.yaml"
    spec.write_text(SMALL_GRID, encoding="utf-8")
    page = tmp_path / "s.html"
    code = (
        "import sys; sys.modules['matplotlib'] = None\n"  # as if matplotlib were not installed
        "from emgate.cli import main\n"
        f"sys.exit(main(['sweep', {str(PUMP)!r}, {str(spec)!r}, '--scheduler', 'none',"
        f" '--html', {str(page)!r}]))"
    )
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=120)
    assert done.returncode == 2
    assert "pip install 'emgate[html]'" in done.stderr and "Traceback" not in done.stderr
    assert done.stdout == "" and not page.exists()  # refused before the sweep ran


def test_a_page_into_a_missing_folder_is_refused_before_the_sweep(tmp_path: Path) -> None:
    spec = tmp_path / "s.yaml"
    spec.write_text(SMALL_GRID, encoding="utf-8")
    page = tmp_path / "no" / "s.html"
    done = run_cli("sweep", PUMP, spec, "--scheduler", "none", "--html", page)
    assert done.code == 2 and "cannot write html" in done.err and done.out == ""


def test_a_sweep_without_html_does_not_import_matplotlib(tmp_path: Path) -> None:
    spec = tmp_path / "s.yaml"
    spec.write_text("fields:\n  air_gap: [0.35 mm, 0.45 mm]\n", encoding="utf-8")
    code = (
        "import sys\nfrom emgate.cli import main\n"
        f"code = main(['sweep', {str(PUMP)!r}, {str(spec)!r}, '--scheduler', 'none',"
        f" '--out', {str(tmp_path / 's.csv')!r}])\n"
        "print(code, 'matplotlib' in sys.modules)"
    )
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=120)
    assert done.stdout.strip().splitlines()[-1] == "0 False", done.stderr


# ------------------------------------------------------------------ a real browser


@pytest.fixture(scope="module")
def demo_page(tmp_path_factory: pytest.TempPathFactory) -> tuple[Path, list[dict[str, str]]]:
    """The README's demo sweep, as its page and table."""
    out = tmp_path_factory.mktemp("demo")
    html, rows = sweep(out, DEMO_SPEC.read_text(encoding="utf-8"), name="sweep")
    assert len(rows) == 81 and html
    return out / "sweep.html", rows


@pytest.mark.parametrize("width", [1280, 400])
def test_the_demo_sweep_page_renders_in_a_browser(
    browser: Any, demo_page: tuple[Path, list[dict[str, str]]], width: int, tmp_path: Path
) -> None:
    page, rows = demo_page
    browser.get_log("browser")
    browser.get_log("performance")
    browser.set_window_size(width, 900)
    url = page.as_uri()
    browser.get(url)
    errors = [e for e in browser.get_log("browser") if e["level"] in ("SEVERE", "WARNING")]
    assert errors == []
    assert set(requests(browser)) <= {url}
    assert browser.find_element("tag name", "h1").text == "7.5 kW four-pole pump drive"
    box = browser.execute_script(
        """var s = document.querySelector('svg.plot[data-plot="map-0-1"]');
           var r = s.getBoundingClientRect();
           return [r.width, r.height, r.right,
                   s.querySelectorAll('#map-0-1-cells-0 path').length,
                   getComputedStyle(s).visibility];"""
    )
    width_px, height_px, right, feasible_cells, visibility = box
    assert width_px > 300 * min(1.0, width / 1280) and height_px > 200 * min(1.0, width / 1280)
    assert visibility == "visible" and feasible_cells == sum(r["feasible"] == "True" for r in rows)
    inner = browser.execute_script("return window.innerWidth")
    assert right <= inner + 1
    assert browser.execute_script("return document.documentElement.scrollWidth") <= inner + 1
    shot = os.environ.get("EMGATE_SCREENSHOTS")
    folder = Path(shot) if shot else tmp_path
    folder.mkdir(parents=True, exist_ok=True)
    browser.save_screenshot(str(folder / f"sweep-{width}.png"))
