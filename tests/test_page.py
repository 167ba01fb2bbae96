"""The calculation sheet as an HTML page: its plot data against the sheet and independent
computations, the command line, escaping, and the page in a real headless browser."""

from __future__ import annotations

import math
import os
import re
from pathlib import Path
from typing import Any

import numpy as np
import pytest
import yaml

from conftest import DESIGNS, GENSET, PUMP, SERVO, STEELS, requests, run_cli, write_variant

RECORDS = sorted(DESIGNS.glob("*.yaml"))


def _gather(path: Path) -> Any:
    from emgate.page.data import gather
    from emgate.page.run import run_gate
    from emgate.plugins import load_plugins

    return gather(path, run_gate([path], load_plugins()))


def _sheet_json(path: Path) -> dict[str, Any]:
    done = run_cli("show", path, "--format", "json")
    assert done.code == 0, done.err
    return done.json()["quantities"]


# ------------------------------------------------------------------ plot data vs the sheet


@pytest.mark.parametrize("path", RECORDS, ids=lambda p: p.stem)
def test_bh_working_points_are_the_sheets_flux_densities(path: Path) -> None:
    sheet = _sheet_json(path)
    page = _gather(path)
    points = [wp for steel in page.steels for wp in steel.points]
    assert points, "every demo machine has teeth and yokes"
    for wp in points:
        # The same number the sheet prints, not a recomputation: equal to rounding only.
        assert wp.b == pytest.approx(sheet[wp.quantity]["value"], rel=1e-12)
    names = {wp.quantity for wp in points}
    assert {"stator.tooth_flux_density", "stator.yoke_flux_density"} <= names
    if page.machine == "salient_field":
        assert "rotor.pole_body_flux_density" in names
    if page.machine == "induction":
        assert "rotor.tooth_flux_density" in names


def test_bh_working_point_h_is_read_off_the_repositorys_own_table() -> None:
    """The genset's steel is a B-H table in the demo's materials file: read with PyYAML and
    interpolated linearly by numpy, the table gives the H the plot marks (within the table
    the curve is piecewise linear by definition; 1e-9 relative is rounding)."""
    table = yaml.safe_load(STEELS.read_text(encoding="utf-8"))["steels"]["M330-50A-lot2611"]
    b_tab, h_tab = np.array(table["points"], dtype=float).T
    page = _gather(GENSET)
    steel = next(s for s in page.steels if s.name == "M330-50A-lot2611")
    assert steel.points
    for wp in steel.points:
        assert wp.b <= b_tab[-1]
        assert wp.h == pytest.approx(float(np.interp(wp.b, b_tab, h_tab)), rel=1e-9)


def test_spectrum_bars_are_the_harmonics_of_the_staircase() -> None:
    """An FFT (numpy) of the staircase the page plots against the page's bars (exact slot
    phasor sums): over one pole pair of the 36-slot four-pole winding, FFT bin k is the
    mechanical order 2k. The staircase is sampled exactly at its step values, so the only
    error is aliasing of the 1/n tail: 1 % of the working amplitude covers it at 20
    samples a slot for orders up to 7 times the working one."""
    page = _gather(PUMP)
    m = page.mmf
    assert m is not None and m.working_order == 2
    samples = np.array(m.staircase)
    fft = 2.0 * np.abs(np.fft.rfft(samples)) / samples.size
    work = m.amplitudes[m.working_order - 1]
    for k in (1, 5, 7):
        order = k * m.working_order
        assert fft[k] == pytest.approx(m.amplitudes[order - 1], abs=0.01 * work)
    # Between the multiples of p the four-pole winding has no MMF at all.
    assert max(m.amplitudes[n - 1] for n in m.orders if n % 2) < 1e-9 * work


def test_spectrum_working_bar_is_the_sheets_rotating_fundamental_and_its_thd() -> None:
    """The working bar equals the sheet's winding.mmf_fundamental, F1 = (sqrt 2 m / pi) kw1
    N_ph I / p (Fitzgerald and Kingsley, Electric Machinery: a closed form, not the slot
    sums), to rounding; the bars' own THD up to order 4 Q (what is plotted) stays below the
    sheet's exact THD (Parseval over every order) and within 10 % of it: the slot-harmonic
    tail beyond 4 Q decays as 1/n^2 and is measured at 7.5 % for the pump winding."""
    for path in (PUMP, SERVO):
        sheet = _sheet_json(path)
        m = _gather(path).mmf
        p = m.working_order
        work = m.amplitudes[p - 1]
        assert work == pytest.approx(sheet["winding.mmf_fundamental"]["value"], rel=1e-9)
        others = sum(a * a for n, a in zip(m.orders, m.amplitudes, strict=True) if n != p)
        thd = math.sqrt(others) / work
        assert thd <= sheet["winding.mmf_thd"]["value"] * (1 + 1e-9)
        assert thd == pytest.approx(sheet["winding.mmf_thd"]["value"], rel=0.10)


def test_sub_harmonics_are_marked_in_the_spectrum() -> None:
    """The ten-pole, twelve-slot tooth-coil winding has an MMF sub-harmonic at mechanical
    order 1 (below the working order 5): its bar is drawn, hatched."""
    from emgate.page.plots.winding import spectrum

    m = _gather(SERVO).mmf
    assert m.working_order == 5
    assert m.amplitudes[0] > 0.01 * m.amplitudes[4]  # order 1
    svg = spectrum(m)
    bar = re.search(r'<g id="spectrum-harmonic-page-1">\s*<path [^>]*style="([^"]*)"', svg)
    assert bar is not None
    assert "url(#spectrum-" in bar.group(1)  # filled with the hatch pattern
    working = re.search(r'<g id="spectrum-harmonic-page-5">\s*<path [^>]*style="([^"]*)"', svg)
    assert working is not None and "url(#" not in working.group(1)


def test_plot_text_stays_text_and_ids_are_unique() -> None:
    from emgate.page import page_html

    html = page_html(_gather(PUMP))
    svgs = re.findall(r"<svg .*?</svg>", html, re.DOTALL)
    assert len(svgs) >= 8
    assert all("<text" in s for s in svgs)  # svg.fonttype none: no glyph outlines
    assert '<use xlink:href="#DejaVu' not in html
    ids = re.findall(r' id="([^"]+)"', html)
    assert len(ids) == len(set(ids))
    assert "$\\mathdefault" not in html  # log-axis labels as plain numbers


def test_thermal_steps_and_ampere_turns_are_the_calculations() -> None:
    """The steps' rises add up to the sheet's winding temperature rise, and the ampere-turns
    to its total MMF (both sums are how the kernel defines them; 1e-9 is rounding)."""
    for path in RECORDS:
        sheet = _sheet_json(path)
        page = _gather(path)
        rise = sum(s.rise for s in page.thermal.steps)
        assert rise == pytest.approx(sheet["winding.temperature_rise"]["value"], rel=1e-9)
        total = sum(v for _, v in page.ampere_turns)
        assert total == pytest.approx(sheet["magnetic.total_mmf"]["value"], rel=1e-9)


def test_losses_show_every_loss_name_present() -> None:
    page = _gather(PUMP)
    names = {q.name for q in page.losses}
    assert "winding.copper_loss" in names
    assert all(n.startswith("losses.") or n.endswith("_loss") for n in names)
    assert names >= {q.name for q in page.quantities if q.name.startswith("losses.")}


def test_checks_fail_first_with_their_basis() -> None:
    page = _gather(SERVO)
    assert page.checks and not page.checks[0].passed
    seen_pass = False
    for c in page.checks:
        seen_pass |= c.passed
        assert c.passed or not seen_pass, "a failing check after a passing one"
    assert all(c.basis for c in page.checks)


def test_the_servos_page_lists_its_remedies_as_the_text_report_does() -> None:
    """The judge is the text report of the same run: every remedy line it prints under a
    finding appears, escaped, in the row under that failing check on the page, and no
    other; a passing check has none."""
    from html import unescape

    report = run_cli("check", "--format", "text", SERVO)
    assert report.code == 1, report.err
    # text report: "<file>:<line>:<col>: <severity> <rule>: ..." then the remedy lines
    expected: dict[str, list[str]] = {}
    rule = ""
    for line in report.out.splitlines():
        if m := re.match(r"\s+\S+:\d+:\d+: \w+ ([\w/.-]+): ", line):
            rule = m.group(1)
        elif line.startswith("      ") and rule:
            expected.setdefault(rule, []).append(line.strip())
    assert sum(map(len, expected.values())) >= 3  # the servo fails on purpose
    done = run_cli("show", SERVO, "--format", "html")
    assert done.code == 0, done.err
    table = done.out.split('id="checks-table"', 1)[1].split("<tbody>", 1)[1]
    table = table.split("</tbody>", 1)[0]
    rows = re.findall(r"<tr( class=\"[^\"]*\")?>(.*?)</tr>", table)
    shown: dict[str, list[str]] = {}
    for (cls, row), (_, below) in zip(rows, [*rows[1:], ("", "")], strict=True):
        if cls == ' class="remedies"':
            continue
        rule_cell = re.search(r'<td class="name">([^<]*)</td>', row)
        assert rule_cell is not None
        items = re.findall(r"<li>(.*?)</li>", below) if 'colspan="6"' in below else []
        if cls != ' class="fail"':
            assert items == [], row  # a passing check has no remedy row
            continue
        # escaped: "->" and the unit's "^" come through as text, not markup
        assert all("<" not in i and "->" not in i for i in items)
        shown.setdefault(unescape(rule_cell.group(1)), []).extend(map(unescape, items))
    assert {r: sorted(v) for r, v in shown.items() if v} == {
        r: sorted(v) for r, v in expected.items()
    }
    page = _gather(SERVO)
    density = next(c for c in page.checks if c.rule == "current-density")
    assert density.remedies and density.remedies[0].old == "0.71 mm"
    assert all(r.text.startswith(("fix: ", "no fix")) for r in density.remedies)


def test_slot_drawing_places_every_strand_of_the_demo_records() -> None:
    """Every conductor of the demo records fits the drawing's simple packing, each strand
    inside the slot's winding zone net of the liner."""
    from emgate.page.shapes import place_conductors

    for path in RECORDS:
        s = _gather(path).section
        count = s.conductors_per_slot * s.conductor.strands
        placed = place_conductors(s.stator_slot, s.conductor, count, s.layers, s.liner)
        assert len(placed) == count
        zone = s.stator_slot
        for p in placed:
            assert zone.zone_top + s.liner - 1e-9 <= p.y - p.height / 2
            assert p.y + p.height / 2 <= zone.height - s.liner + 1e-9
            assert abs(p.x) + p.width / 2 <= zone.width_at(p.y) / 2 + 1e-9 + p.height


# ------------------------------------------------------------------ command line, escaping


def test_show_html_to_a_file_and_to_stdout(tmp_path: Path) -> None:
    out = tmp_path / "pump.html"
    done = run_cli("show", PUMP, "--format", f"html:{out}")
    assert done.code == 0, done.err
    text = out.read_text(encoding="utf-8")
    assert text.startswith("<!DOCTYPE html>")
    assert "pump-drive-4p36s" in text and "qualified engineer" in text
    assert run_cli("show", PUMP, "--format", "html").out == text


def test_show_html_of_an_invalid_record_is_a_located_error(tmp_path: Path) -> None:
    bad = write_variant(tmp_path, {"stator.slots": "many"})
    done = run_cli("show", bad, "--format", "html")
    assert done.code == 2
    assert f"{bad.name}:" in done.err and "Traceback" not in done.err


def test_check_html_writes_an_index_and_every_sheet(tmp_path: Path) -> None:
    out = tmp_path / "report"
    done = run_cli("check", DESIGNS.parent, "--format", f"html:{out}", "--format", "json")
    assert done.code == 1  # the servo breaks a limit on purpose
    index = (out / "index.html").read_text(encoding="utf-8")
    for rec in done.json()["records"]:
        name = f"sheet-{rec['record_id']}.html"
        assert f'href="{name}"' in index
        assert rec["record_id"] in (out / name).read_text(encoding="utf-8")


def _demo_run(tmp_path: Path) -> Any:
    """The gate's run over the demo repository (the servo fails, with remedies)."""
    from emgate.page.run import run_gate
    from emgate.plugins import load_plugins

    return run_gate([DESIGNS.parent], load_plugins())


def test_a_pages_findings_and_remedies_are_those_the_run_gives_its_record(
    tmp_path: Path,
) -> None:
    # the index built once must give each record what a search of the run's every finding
    # gives (the definition: a finding of the record's id or of its file, in the run's order;
    # a check's remedies are those of the first finding that reports it)
    from emgate.page.run import RunView

    result = _demo_run(tmp_path)
    view = RunView.of(result)
    assert len(result.records) == 3 and any(f.remedies for f in result.findings)
    assert any(view.findings_of(r) for r in result.records)
    for record in result.records:
        searched = [
            f for f in result.findings if f.record_id == record.record_id or f.file == record.file
        ]
        assert view.findings_of(record) == searched
        for outcome in record.outcomes:
            for c in outcome.checks:
                first = next((f for f in result.findings if f.check is c), None)
                assert view.remedies.get(id(c), []) == (list(first.remedies) if first else [])


def test_each_sheet_is_written_before_the_next_is_drawn(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    # a run of many records holds one page at a time, not every page until the last is
    # drawn: each is written to the run's staging folder, and lands with the others at the end
    import emgate.page as page_module

    out = tmp_path / "report"
    drawn: list[list[str]] = []
    real = page_module.page_html

    def watched(page: Any) -> str:
        assert list(out.glob("sheet-*.html")) == []  # nothing lands before every sheet is in
        drawn.append(sorted(p.name for p in out.glob(".index.html.*.emgate-tmp/sheet-*.html")))
        return real(page)

    monkeypatch.setattr(page_module, "page_html", watched)
    result = _demo_run(tmp_path)
    page_module.write_run(result, out)
    ids = [r.record_id for r in result.records]
    assert drawn == [sorted(f"sheet-{i}.html" for i in ids[:k]) for k in range(len(ids))]


def test_sheets_drawn_in_worker_processes_are_those_of_a_serial_run(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    import emgate.parallel as parallel
    from emgate.page import write_run

    if "fork" not in __import__("multiprocessing").get_all_start_methods():
        pytest.skip("worker processes are forked; this platform runs the pages in process")
    result = _demo_run(tmp_path)
    monkeypatch.setattr(parallel, "MIN_ITEMS_PER_WORKER", 1)  # two workers for three records
    assert parallel.workers_for(len(result.records), 2) == 2
    write_run(result, tmp_path / "serial", jobs=1)
    write_run(result, tmp_path / "parallel", jobs=2)
    serial = sorted(p.name for p in (tmp_path / "serial").iterdir())
    assert serial == sorted(p.name for p in (tmp_path / "parallel").iterdir())
    assert len(serial) == 4
    for name in serial:  # byte for byte
        assert (tmp_path / "serial" / name).read_bytes() == (
            tmp_path / "parallel" / name
        ).read_bytes(), name


def test_a_sheet_that_cannot_be_written_stops_the_run_with_its_error(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    import emgate.parallel as parallel

    monkeypatch.setattr(parallel, "MIN_ITEMS_PER_WORKER", 1)
    out = tmp_path / "report"
    out.mkdir()
    (out / "sheet-servo-10p12s.html").mkdir()  # a folder where the servo's sheet goes
    for jobs in ("1", "2"):
        done = run_cli("check", DESIGNS.parent, "--jobs", jobs, "--format", f"html:{out}")
        assert done.code == 2, jobs
        assert "cannot write html" in done.err and "Traceback" not in done.err, jobs
        # none of the run's files: no index, no other sheet, no staging folder
        assert [p.name for p in out.iterdir()] == ["sheet-servo-10p12s.html"], jobs


@pytest.mark.parametrize(
    "in_the_way",
    ["index.html", "sheet-servo-10p12s.html"],
)
@pytest.mark.parametrize("kind", ["folder", "link into a missing folder"])
def test_a_place_a_file_cannot_land_is_found_before_any_lands(
    tmp_path: Path, in_the_way: str, kind: str
) -> None:
    out = tmp_path / "report"
    out.mkdir()
    if kind == "folder":
        (out / in_the_way).mkdir()
    else:
        (out / in_the_way).symlink_to(tmp_path / "missing" / "x.html")
    done = run_cli("check", DESIGNS.parent, "--format", f"html:{out}")
    assert done.code == 2 and "Traceback" not in done.err
    assert f"cannot write html to {out}: " in done.err and in_the_way in done.err  # named
    assert [p.name for p in out.iterdir()] == [in_the_way]  # nothing of the run landed


@pytest.mark.parametrize("jobs", [1, 2])
def test_a_sheet_a_worker_cannot_write_leaves_none_of_the_runs_files(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, jobs: int
) -> None:
    import emgate.atomic
    import emgate.parallel as parallel
    from emgate.page import write_run

    real = emgate.atomic.write_atomic

    def refusing(path: Path, text: Any, **kw: Any) -> None:
        if path.name == "sheet-pump-drive-4p36s.html":
            raise PermissionError(13, "Permission denied", str(path))
        real(path, text, **kw)

    monkeypatch.setattr(emgate.atomic, "write_atomic", refusing)
    monkeypatch.setattr(parallel, "MIN_ITEMS_PER_WORKER", 1)
    out = tmp_path / "report"
    out.mkdir()
    with pytest.raises(PermissionError, match="Permission denied") as raised:
        write_run(_demo_run(tmp_path), out, jobs=jobs)
    assert raised.value.filename.endswith("sheet-pump-drive-4p36s.html")
    assert list(out.iterdir()) == []


@pytest.mark.parametrize("jobs", [1, 2])
def test_a_sheet_that_cannot_be_drawn_leaves_none_of_the_runs_files(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, jobs: int
) -> None:
    # an error of the calculation whose exception does not unpickle (its __init__ takes two
    # arguments): raised in a worker process it would stop the pool's result thread, and the
    # run would wait forever; the alarm turns such a hang into a failure of this test
    import signal

    import emgate.page as page_module
    import emgate.parallel as parallel
    from emgate.calc.view import NotComputed

    real = page_module.page_html

    def failing(page: Any) -> str:
        if page.record_id == "pump-drive-4p36s":
            raise NotComputed("stator.slot_fill", "no strands fit")
        return real(page)

    monkeypatch.setattr(page_module, "page_html", failing)
    monkeypatch.setattr(parallel, "MIN_ITEMS_PER_WORKER", 1)
    result = _demo_run(tmp_path)
    out = tmp_path / "report"
    out.mkdir()

    def hung(signum: int, frame: object) -> None:
        raise AssertionError("the run hung")

    previous = signal.signal(signal.SIGALRM, hung)
    signal.alarm(120)
    try:
        with pytest.raises(RuntimeError, match=r"pump-drive-4p36s.yaml could not be drawn: "):
            page_module.write_run(result, out, jobs=jobs)
    finally:
        signal.alarm(0)
        signal.signal(signal.SIGALRM, previous)
    assert list(out.iterdir()) == []  # the genset's sheet, drawn first, did not land


def test_a_staging_folder_a_killed_run_left_is_removed_by_the_next(tmp_path: Path) -> None:
    import subprocess
    import sys

    from emgate.page import write_run

    out = tmp_path / "report"
    out.mkdir()
    dead = subprocess.Popen([sys.executable, "-c", "pass"])  # a process no longer alive
    dead.wait()
    left = out / f".index.html.{dead.pid}.abc123.emgate-tmp"
    left.mkdir()
    (left / "sheet-old.html").write_text("half a run", encoding="utf-8")
    write_run(_demo_run(tmp_path), out)
    assert not left.exists()
    assert sorted(p.name for p in out.iterdir()) == [
        "index.html",
        "sheet-genset-4p48s.html",
        "sheet-pump-drive-4p36s.html",
        "sheet-servo-10p12s.html",
    ]


def test_check_html_needs_a_file() -> None:
    done = run_cli("check", PUMP, "--format", "html")
    assert done.code == 2 and "html needs a FILE" in done.err


def test_everything_from_the_record_is_escaped(tmp_path: Path) -> None:
    title = '<script>window.pwned = 1</script> & "quotes" <b>bold</b>'
    rec = write_variant(tmp_path, {"title": title})
    done = run_cli("show", rec, "--format", "html")
    assert done.code == 0, done.err
    assert "<script>window.pwned" not in done.out
    assert "&lt;script&gt;window.pwned = 1&lt;/script&gt;" in done.out
    assert "<b>bold</b>" not in done.out


# ------------------------------------------------------------------ a real browser


@pytest.fixture(scope="module")
def pages(tmp_path_factory: pytest.TempPathFactory) -> dict[str, Path]:
    out = tmp_path_factory.mktemp("sheets")
    done = run_cli("check", DESIGNS.parent, "--format", f"html:{out}")
    assert done.code == 1, done.err
    return {p.stem.removeprefix("sheet-"): p for p in out.glob("*.html")}


EXPECTED_PLOTS = {"section", "slot", "star", "mmf", "spectrum", "ampere-turns", "thermal"}


def test_the_request_log_sees_a_pages_request_for_an_outside_address(
    browser: Any, tmp_path: Path
) -> None:
    """The offline checks below rest on the performance log: a page that asks for an outside
    address shows it there (the request fails: ``.invalid`` never resolves, RFC 2606)."""
    page = tmp_path / "outside.html"
    page.write_text('<!doctype html><img src="https://emgate.invalid/x.png">', encoding="utf-8")
    browser.get_log("performance")
    browser.get(page.as_uri())
    assert "https://emgate.invalid/x.png" in requests(browser)


@pytest.mark.parametrize("record", ["pump-drive-4p36s", "servo-10p12s", "genset-4p48s"])
def test_page_loads_offline_without_console_errors(
    browser: Any, pages: dict[str, Path], record: str
) -> None:
    browser.get_log("browser")
    browser.get_log("performance")
    url = pages[record].as_uri()
    browser.set_window_size(1280, 900)
    browser.get(url)
    errors = [e for e in browser.get_log("browser") if e["level"] in ("SEVERE", "WARNING")]
    assert errors == []
    assert set(requests(browser)) <= {url}
    plots = browser.execute_script(
        """return Array.from(document.querySelectorAll('svg.plot')).map(function (s) {
             var r = s.getBoundingClientRect();
             return [s.getAttribute('data-plot'), r.width, r.height,
                     s.querySelectorAll('path').length, s.querySelectorAll('text').length];
           });"""
    )
    names = {p[0] for p in plots}
    assert names >= EXPECTED_PLOTS | {"margins"}
    assert any(n.startswith("bh-") for n in names)
    for name, width, height, paths, texts in plots:
        assert width > 200 and height > 80, name
        assert paths > 5 and texts > 2, name


@pytest.mark.parametrize("width", [1280, 400])
def test_page_is_usable_at_desktop_and_phone_width(
    browser: Any, pages: dict[str, Path], width: int, tmp_path: Path
) -> None:
    browser.set_window_size(width, 900)
    browser.get(pages["pump-drive-4p36s"].as_uri())
    inner = browser.execute_script("return window.innerWidth")
    # No sideways scrolling of the page: wide tables scroll inside their own box.
    assert browser.execute_script("return document.documentElement.scrollWidth") <= inner + 1
    widths = browser.execute_script(
        "return Array.from(document.querySelectorAll('svg.plot'))"
        ".map(function (s) { return s.getBoundingClientRect().right; })"
    )
    assert max(widths) <= inner + 1
    # The sheet's search narrows the table to the rows that hold every word typed.
    box = browser.find_element("id", "sheet-search")
    total = len(browser.find_elements("css selector", "#sheet-table tbody tr"))
    box.send_keys("tooth flux")
    shown = [
        r.text
        for r in browser.find_elements("css selector", "#sheet-table tbody tr")
        if r.is_displayed()
    ]
    assert 0 < len(shown) < total
    assert all("tooth" in t.lower() and "flux" in t.lower() for t in shown)
    count = browser.find_element("id", "sheet-table-count").text
    assert count == f"{len(shown)} shown"
    shot = os.environ.get("EMGATE_SCREENSHOTS")
    folder = Path(shot) if shot else tmp_path
    folder.mkdir(parents=True, exist_ok=True)
    browser.save_screenshot(str(folder / f"sheet-{width}.png"))


def test_a_script_in_the_title_renders_as_text(browser: Any, tmp_path: Path) -> None:
    title = "<script>window.pwned = 1</script><img src=x onerror=window.pwned=2>"
    rec = write_variant(tmp_path, {"title": title})
    out = tmp_path / "evil.html"
    assert run_cli("show", rec, "--format", f"html:{out}").code == 0
    browser.get_log("browser")
    browser.get(out.as_uri())
    assert browser.execute_script("return window.pwned === undefined")
    assert browser.find_element("tag name", "h1").text == title
    assert browser.find_elements("css selector", "main img") == []
    assert [e for e in browser.get_log("browser") if e["level"] == "SEVERE"] == []


def test_the_page_references_nothing_outside_itself() -> None:
    """A static look beside the browser's: a policy that forbids loading anything, and no
    address of another document, script, style, font or image in the markup."""
    from emgate.page import page_html

    html = page_html(_gather(GENSET))
    assert "Content-Security-Policy" in html and "default-src 'none'" in html
    assert re.search(r'(src|href)="(?!#)[^"]*"', html) is None
    assert "url(http" not in html and "@import" not in html


def test_phases_and_verdicts_differ_in_more_than_colour() -> None:
    """Okabe-Ito vermillion and bluish green differ by far less than the 3:1 contrast that
    WCAG 2.1 (success criterion 1.4.11, non-text contrast) asks of graphics (relative
    luminance 0.22 and 0.26 by the WCAG formula), so a greyscale print tells phases apart by
    hatch and letter: every phase has its own hatch, and a failing margin bar is hatched
    where a passing one is plain."""
    from emgate.page.content import CheckRow
    from emgate.page.plots.margins import margins
    from emgate.page.plots.style import GREEN, PHASE_STYLE, VERMILLION

    def luminance(colour: str) -> float:
        rgb = [int(colour[i : i + 2], 16) / 255 for i in (1, 3, 5)]
        lin = [c / 12.92 if c <= 0.04045 else ((c + 0.055) / 1.055) ** 2.4 for c in rgb]
        return 0.2126 * lin[0] + 0.7152 * lin[1] + 0.0722 * lin[2]

    lo, hi = sorted((luminance(VERMILLION), luminance(GREEN)))
    assert (hi + 0.05) / (lo + 0.05) < 3.0  # why hatches are needed
    hatches = [h for _, h in PHASE_STYLE]
    assert len(set(hatches)) == len(hatches) and all(hatches)
    row = dict(
        quantity="q",
        label="q",
        limit=1.0,
        bound="max",
        unit="1",
        basis="b",
        display="",
        record_path="$",
    )
    svg = margins(
        [
            CheckRow("r", value=1.2, margin=-0.2, passed=False, **row),
            CheckRow("s", value=0.5, margin=0.5, passed=True, **row),
        ]
    )
    bars = dict(re.findall(r'<g id="margins-margin-(\w)-q-max">\s*<path [^>]*style="([^"]*)"', svg))
    assert "url(#" in bars["r"] and "url(#" not in bars["s"]


def test_a_check_against_a_zero_limit_is_not_drawn_as_failing() -> None:
    """The form-wound genset's slot-width clearance is held to >= 0 mm: its margin is
    infinite; it passes, so it sorts after the finite margins and reads as inside."""
    from emgate.page import page_html

    page = _gather(GENSET)
    inf = [c for c in page.checks if not math.isfinite(c.margin)]
    assert inf and all(c.passed for c in inf)
    assert page.checks[-len(inf) :] == inf
    assert "inside (limit 0)" in page_html(page)
