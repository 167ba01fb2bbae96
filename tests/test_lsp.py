"""``emgate lsp`` driven by a real LSP client (pytest-lsp, over stdio).

The server runs as a subprocess (``python -m emgate lsp``) on a design repository in a
temporary folder: the demo pump record and a default ``emgate.yaml``. Expected lines are read
off the text itself (the line that holds the key), not from emgate.
"""

from __future__ import annotations

import asyncio
import shutil
import sys
from collections.abc import Callable, Sequence
from pathlib import Path

import pytest
import pytest_lsp
from lsprotocol import types
from pytest_lsp import ClientServerConfig, LanguageClient

from conftest import DEMO, PUMP, SERVO

ASYNC = pytest.mark.asyncio(loop_scope="module")

CONFIG = "schema: emgate/config@1\n"
ERROR = types.DiagnosticSeverity.Error


@pytest.fixture(scope="module")
def designs(tmp_path_factory: pytest.TempPathFactory) -> Path:
    root = tmp_path_factory.mktemp("lsp-repo")
    (root / ".git").mkdir()
    (root / "emgate.yaml").write_text(CONFIG, encoding="utf-8")
    (root / "designs").mkdir()
    shutil.copy(PUMP, root / "designs" / PUMP.name)
    return root


@pytest_lsp.fixture(
    scope="module",
    config=ClientServerConfig(server_command=[sys.executable, "-m", "emgate", "lsp"]),
)
async def client(lsp_client: LanguageClient, designs: Path):  # type: ignore[no-untyped-def]
    await lsp_client.initialize_session(
        types.InitializeParams(
            capabilities=types.ClientCapabilities(),
            root_uri=designs.as_uri(),
            workspace_folders=[types.WorkspaceFolder(uri=designs.as_uri(), name="designs")],
        )
    )
    yield
    await lsp_client.shutdown_session()


class Editor:
    """One open document: full-text changes with increasing versions."""

    def __init__(self, client: LanguageClient, path: Path) -> None:
        self.client, self.path, self.uri, self.version = client, path, path.as_uri(), 1
        self.text = path.read_text(encoding="utf-8")

    async def published(
        self,
        until: Callable[[Sequence[types.Diagnostic]], bool] = lambda d: True,
        timeout: float = 10,
    ) -> Sequence[types.Diagnostic]:
        """Wait (10 s at most: a subprocess on a loaded machine) for diagnostics of this
        document that satisfy ``until``."""

        async def wait() -> Sequence[types.Diagnostic]:
            while True:
                found = self.client.diagnostics.get(self.uri)  # (maybe in already)
                if found is not None and until(found):
                    return found
                await self.client.wait_for_notification(types.TEXT_DOCUMENT_PUBLISH_DIAGNOSTICS)

        return await asyncio.wait_for(wait(), timeout)

    def forget(self) -> None:
        """Drop the diagnostics received so far, to wait for the next ones."""
        self.client.diagnostics.pop(self.uri, None)

    def open(self) -> None:
        self.forget()
        self.client.text_document_did_open(
            types.DidOpenTextDocumentParams(
                text_document=types.TextDocumentItem(
                    uri=self.uri, language_id="yaml", version=self.version, text=self.text
                )
            )
        )

    def edit(self, old: str, new: str) -> None:
        assert self.text.count(old) == 1, old
        self.text = self.text.replace(old, new)
        self.version += 1
        self.forget()
        self.client.text_document_did_change(
            types.DidChangeTextDocumentParams(
                text_document=types.VersionedTextDocumentIdentifier(
                    uri=self.uri, version=self.version
                ),
                content_changes=[types.TextDocumentContentChangeWholeDocument(text=self.text)],
            )
        )

    def line_of(self, start: str) -> int:
        """0-based line of the one line that starts with ``start``."""
        (n,) = [i for i, line in enumerate(self.text.splitlines()) if line.startswith(start)]
        return n


def errors(diagnostics: Sequence[types.Diagnostic]) -> list[types.Diagnostic]:
    return [d for d in diagnostics if d.severity == ERROR]


@ASYNC
async def test_a_record_edited_into_a_failing_state_and_back(
    client: LanguageClient, designs: Path
) -> None:
    record = Editor(client, designs / "designs" / PUMP.name)
    record.open()
    assert errors(await record.published()) == []  # the pump passes every rule

    # A thinner strand: J grows by (0.90 / 0.60)^2 = 2.25, 6.6 A/mm^2 -> 14.9 A/mm^2, over
    # the default 10 A/mm^2 of a fan-cooled frame [calc, the limit from emgate explain].
    record.edit("bare_diameter: 0.90 mm", "bare_diameter: 0.60 mm")
    found = await record.published(lambda d: bool(errors(d)))
    density = [d for d in found if d.code == "current-density"]
    assert density, [(d.code, d.message) for d in found]
    assert density[0].severity == ERROR
    assert density[0].range.start.line == record.line_of("  conductor:")
    assert density[0].source == "emgate"
    assert "exceeds the limit" in density[0].message

    record.edit("bare_diameter: 0.60 mm", "bare_diameter: 0.90 mm")
    await record.published(lambda d: not errors(d))  # cleared (or a timeout fails the test)
    record.forget()  # a save checks again too
    client.text_document_did_save(
        types.DidSaveTextDocumentParams(text_document=types.TextDocumentIdentifier(uri=record.uri))
    )
    assert errors(await record.published()) == []


@ASYNC
async def test_an_invalid_unit_is_an_input_error_on_its_line(
    client: LanguageClient, designs: Path
) -> None:
    record = Editor(client, designs / "designs" / PUMP.name)
    record.open()
    await record.published()
    record.edit("air_gap: 0.45 mm", "air_gap: 0.45 A")
    found = errors(await record.published(lambda d: bool(errors(d))))
    assert [d.code for d in found] == ["input"]
    assert found[0].range.start.line == record.line_of("air_gap:")
    assert "length" in found[0].message  # names the expected dimension
    record.edit("air_gap: 0.45 A", "air_gap: 0.45 mm")
    await record.published(lambda d: not errors(d))


@ASYNC
async def test_hover_on_a_key_shows_the_quantities_it_drives(
    client: LanguageClient, designs: Path
) -> None:
    record = Editor(client, designs / "designs" / PUMP.name)
    record.open()
    await record.published()
    line = record.line_of("  conductor:")
    hover = await client.text_document_hover_async(
        types.HoverParams(
            text_document=types.TextDocumentIdentifier(uri=record.uri),
            position=types.Position(line=line, character=4),
        )
    )
    assert hover is not None
    assert isinstance(hover.contents, types.MarkupContent)
    text = hover.contents.value
    # J = I_ph / (a n S): delta, I_ph = 14.6 A / sqrt 3 = 8.429 A; S = pi / 4 (0.90 mm)^2
    # = 0.6362 mm^2; n = 2, a = 1: J = 6.625 A/mm^2 [calc, IEC 60034 phase relations]; the
    # margin to the default 8 A/mm^2 of a fan-cooled induction motor (emgate_rules
    # current-density) is (8 - 6.625) / 8 = +17.2 % (rounded to 0.1 %).
    assert "stator.current_density" in text and "current-density" in text
    assert "+17.2 %" in text
    assert "$.winding.conductor" in text
    # not on a key: nothing
    blank = await client.text_document_hover_async(
        types.HoverParams(
            text_document=types.TextDocumentIdentifier(uri=record.uri),
            position=types.Position(line=0, character=0),
        )
    )
    assert blank is None


@ASYNC
async def test_a_broken_policy_marks_itself_and_the_open_record(
    client: LanguageClient, designs: Path
) -> None:
    record = Editor(client, designs / "designs" / PUMP.name)
    record.open()
    await record.published()
    config = Editor(client, designs / "emgate.yaml")
    config.open()
    assert errors(await config.published()) == []
    record.forget()
    config.edit(CONFIG, CONFIG + "severity:\n  curent-density: warning\n")
    found = errors(await config.published(lambda d: bool(errors(d))))
    assert found[0].range.start.line == config.line_of("  curent-density")
    assert "did you mean 'current-density'" in found[0].message
    # the open record is re-checked against the edited policy and says why it is not checked
    marked = errors(await record.published(lambda d: bool(errors(d))))
    assert marked[0].range.start.line == 0
    assert "emgate.yaml" in marked[0].message
    # a YAML file that is not an emgate file is left alone, broken policy or not
    other = designs / "ci.yaml"
    other.write_text("jobs:\n  test: {runs-on: any}\n", encoding="utf-8")
    ci = Editor(client, other)
    ci.open()
    assert list(await ci.published()) == []
    record.forget()
    config.edit(CONFIG + "severity:\n  curent-density: warning\n", CONFIG)
    await config.published(lambda d: not errors(d))
    await record.published(lambda d: not errors(d))  # the record is checked again


def test_without_the_extra_the_command_says_what_to_install() -> None:
    import subprocess

    code = (
        "import sys; sys.modules['pygls'] = None\n"  # as if pygls were not installed
        "from emgate.cli import main; sys.exit(main(['lsp']))"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=60)
    assert out.returncode == 2
    assert "pip install 'emgate[lsp]'" in out.stderr
    assert "Traceback" not in out.stderr


@ASYNC
async def test_the_waivers_file_is_checked_in_the_editor(
    client: LanguageClient, tmp_path: Path
) -> None:
    repo = tmp_path / "other-repo"
    (repo / "designs").mkdir(parents=True)
    (repo / ".git").mkdir()
    (repo / "emgate.yaml").write_text(CONFIG, encoding="utf-8")
    shutil.copy(PUMP, repo / "designs" / PUMP.name)
    waivers = repo / "waivers.yaml"
    waivers.write_text(
        "schema: emgate/waivers@1\n"
        "waivers:\n"
        "  - rule: slot-fill\n"
        "    record: pump-drive-4p36s\n"
        "    reason: reviewed by the winding shop\n"
        "    owner: Ada\n"
        "    expires: 2099-01-01\n",
        encoding="utf-8",
    )
    editor = Editor(client, waivers)
    editor.open()
    # the pump passes slot-fill, so the waiver suppresses nothing: reported on the waiver
    found = await editor.published(lambda d: any(x.code == "waiver" for x in d))
    (stale,) = [d for d in found if d.code == "waiver"]
    assert stale.range.start.line == editor.line_of("  - rule: slot-fill")
    editor.edit("record: pump-drive-4p36s", "record: pump-drive-4p63s")  # a typo
    found = await editor.published(lambda d: bool(errors(d)))
    assert errors(found)[0].range.start.line in range(2, 7)  # on the waiver's entry
    assert "pump-drive-4p63s" in errors(found)[0].message


def _apply(text: str, edits: Sequence[types.TextEdit]) -> str:
    """``text`` with LSP edits applied (one line each; the servo record is ASCII, so UTF-16
    units and code points agree)."""
    lines = text.splitlines(keepends=True)
    for te in sorted(edits, key=lambda t: (t.range.start.line, t.range.start.character))[::-1]:
        start, end = te.range.start, te.range.end
        assert start.line == end.line
        row = lines[start.line]
        lines[start.line] = row[: start.character] + te.new_text + row[end.character :]
    return "".join(lines)


@ASYNC
async def test_a_remedy_is_a_quick_fix_that_clears_its_finding(
    client: LanguageClient, tmp_path: Path
) -> None:
    repo = tmp_path / "demo"
    shutil.copytree(DEMO, repo)
    (repo / ".git").mkdir()
    record = Editor(client, repo / "designs" / SERVO.name)
    record.open()

    def density_fails(d: Sequence[types.Diagnostic]) -> bool:
        return any(x.code == "current-density" for x in errors(d))

    # the servo's stator current density breaks its limit on purpose; opening computes
    # remedies, some tens of milliseconds a failing check (a generous wait on a loaded host)
    found = await record.published(density_fails, timeout=60)
    (density,) = [d for d in found if d.code == "current-density"]
    params = types.CodeActionParams(
        text_document=types.TextDocumentIdentifier(uri=record.uri),
        range=density.range,
        context=types.CodeActionContext(diagnostics=[density]),
    )
    actions = await client.text_document_code_action_async(params)
    fixes = [
        a
        for a in actions or []
        if isinstance(a, types.CodeAction)
        and [d.code for d in a.diagnostics or []] == [density.code]
    ]
    assert fixes and all(a.kind == types.CodeActionKind.QuickFix for a in fixes)
    assert all(a.title.startswith("fix: ") for a in fixes)
    # preferred exactly when the remedy breaks no other check (its title says what it breaks)
    assert all(a.is_preferred == ("but breaks" not in a.title) for a in fixes)
    (chosen,) = [a for a in fixes if a.is_preferred]
    assert chosen.edit is not None and chosen.edit.changes is not None
    edits = chosen.edit.changes[record.uri]
    assert edits
    fixed = _apply(record.text, edits)
    assert fixed != record.text
    record.edit(record.text, fixed)
    # re-checked on the change: the finding clears (or the wait times out and fails)
    after = await record.published(lambda d: not density_fails(d), timeout=30)
    assert all(d.code != "current-density" for d in after)
    # the edited text is not the one the remedies were computed on: no stale quick fix
    stale = await client.text_document_code_action_async(params)
    assert not stale


def test_columns_are_utf16_units_as_lsp_counts_them() -> None:
    from emgate.lsp.server import _code_points, _utf16

    # LSP 3.17, Position: character offsets in UTF-16 code units by default; U+1F600 is a
    # surrogate pair (two units), U+00B0 one unit [pub: Unicode, UTF-16 encoding form]
    line = ["ambient: 40 \u00b0C  # \U0001f600 note"]
    after_emoji = line[0].index("\U0001f600") + 1
    assert _utf16(line, 0, after_emoji) == after_emoji + 1
    assert _utf16(line, 0, 12) == 12  # before the emoji, code points and units agree
    assert _code_points(line, 0, _utf16(line, 0, after_emoji)) == after_emoji


def test_a_keystrokes_check_skips_remedies_and_an_open_computes_them() -> None:
    from emgate.lsp.gate import check_open
    from emgate.plugins import load_plugins
    from emgate.remedy_report import remedies_for

    plugins = load_plugins()
    path = SERVO.resolve()
    quick = check_open(path, {}, plugins, remedies=False).result
    full = check_open(path, {}, plugins).result
    failing = [f for f in full.findings if f.check is not None and not f.check.passed]
    assert failing and all(remedies_for(f) for f in failing)
    assert all(remedies_for(f) == [] for f in quick.findings)
    # the same findings either way: remedies add, they do not change the verdict
    assert [(f.rule, f.line) for f in quick.findings] == [(f.rule, f.line) for f in full.findings]
