"""The language server over stdio (pygls, lsprotocol): diagnostics, hover, quick fixes.

Every open, change (full text) and save of a YAML document runs the gate on it
(:func:`emgate.lsp.gate.check_open`) and publishes its findings; a change to anything but a
design record (the policy, the waivers file, a materials file) re-checks every open
document, since each of them reads it. Hover on a record key lists the checks it drives.
Open and save also compute remedies (some tens of milliseconds a failing check, too slow
for every keystroke); each remedy that fixes its check is a quick fix on the finding, offered
while the text is the one the remedies were computed on (their edits locate its scalars).
"""

from __future__ import annotations

from pathlib import Path

from lsprotocol import types
from pygls.lsp.server import LanguageServer
from pygls.uris import to_fs_path

from emgate import __version__
from emgate.lsp.gate import (
    Checked,
    Mark,
    check_open,
    checks_under,
    hover_markdown,
    key_at,
    marks,
    names,
)
from emgate.plugins import PluginSet
from emgate.remedy_report import remedies_for

SEVERITY = {
    "error": types.DiagnosticSeverity.Error,
    "warning": types.DiagnosticSeverity.Warning,
    "info": types.DiagnosticSeverity.Information,
}


class GateServer(LanguageServer):
    def __init__(self, plugins: PluginSet) -> None:
        super().__init__(
            "emgate", __version__, text_document_sync_kind=types.TextDocumentSyncKind.Full
        )
        self.plugins = plugins
        self.checked: dict[str, Checked] = {}  # uri -> the last run for that document
        # uri -> (the text, the last run with remedies on it): the quick fixes' source
        self.remedied: dict[str, tuple[str, Checked]] = {}

    def buffers(self) -> dict[Path, str]:
        out = {}
        for uri, doc in self.workspace.text_documents.items():
            path = _path(uri)
            if path is not None:
                out[path] = doc.source
        return out

    def check(self, uri: str, remedies: bool = True) -> None:
        path = _path(uri)
        if path is None or path.suffix not in (".yaml", ".yml"):
            return
        text = self.workspace.get_text_document(uri).source
        try:
            checked = check_open(path, self.buffers(), self.plugins, remedies=remedies)
            found = marks(checked, path, text)
        except Exception as exc:  # fail closed: say so on the document, keep serving
            self.checked.pop(uri, None)
            self.remedied.pop(uri, None)
            message = f"emgate internal error, the file is not checked: {type(exc).__name__}: {exc}"
            found = [Mark(0, 0, max(len(text.split("\n", 1)[0]), 1), "error", "crash", message)]
        else:
            self.checked[uri] = checked
            if remedies:
                self.remedied[uri] = (text, checked)
        lines = text.splitlines() or [""]
        diagnostics = [
            types.Diagnostic(
                range=types.Range(
                    start=types.Position(line=m.line, character=_utf16(lines, m.line, m.start)),
                    end=types.Position(line=m.line, character=_utf16(lines, m.line, m.end)),
                ),
                message=m.message,
                severity=SEVERITY[m.severity],
                code=m.code,
                source="emgate",
            )
            for m in found
        ]
        self.text_document_publish_diagnostics(
            types.PublishDiagnosticsParams(
                uri=uri,
                diagnostics=diagnostics,
                version=self.workspace.get_text_document(uri).version,
            )
        )

    def changed(self, uri: str, remedies: bool = True) -> None:
        self.check(uri, remedies)
        checked = self.checked.get(uri)
        if checked is not None and checked.read_by_others:
            for other in list(self.workspace.text_documents):
                if other != uri:
                    self.check(other, remedies)

    def quick_fixes(
        self, uri: str, wanted: types.Range, diagnostics: list[types.Diagnostic]
    ) -> list[types.CodeAction]:
        """A quick fix for each remedy that fixes a finding of the document on a line of
        ``wanted``: its edits as the text's UTF-16 ranges, preferred when it breaks nothing.
        None while the text differs from the one the remedies were computed on."""
        path = _path(uri)
        text = self.workspace.get_text_document(uri).source
        source = self.remedied.get(uri)
        if path is None or source is None or source[0] != text:
            return []
        lines = text.splitlines() or [""]
        actions = []
        for f in source[1].result.findings:
            line = f.line - 1
            if not names(f.file, path) or not wanted.start.line <= line <= wanted.end.line:
                continue
            mine = [d for d in diagnostics if d.code == f.rule and d.range.start.line == line]
            for r in remedies_for(f):
                if r.status != "fix" or not r.edits:
                    continue
                edits = [
                    types.TextEdit(
                        range=types.Range(
                            start=types.Position(
                                line=e.line - 1, character=_utf16(lines, e.line - 1, e.column - 1)
                            ),
                            end=types.Position(
                                line=e.end_line - 1,
                                character=_utf16(lines, e.end_line - 1, e.end_column - 1),
                            ),
                        ),
                        new_text=e.new,
                    )
                    for e in r.edits
                ]
                actions.append(
                    types.CodeAction(
                        title=r.describe(),
                        kind=types.CodeActionKind.QuickFix,
                        diagnostics=mine or None,
                        is_preferred=not r.breaks,
                        edit=types.WorkspaceEdit(changes={uri: edits}),
                    )
                )
        return actions


def _utf16(lines: list[str], line: int, column: int) -> int:
    """A code-point column as the UTF-16 offset LSP positions count by default."""
    text = lines[line] if line < len(lines) else ""
    return len(text[:column].encode("utf-16-le")) // 2


def _code_points(lines: list[str], line: int, character: int) -> int:
    """The inverse of :func:`_utf16`: an LSP position's column in code points."""
    text = lines[line] if line < len(lines) else ""
    units = 0
    for i, ch in enumerate(text):
        if units >= character:
            return i
        units += 2 if ord(ch) > 0xFFFF else 1
    return len(text)


def _path(uri: str) -> Path | None:
    fs = to_fs_path(uri)
    return Path(fs).resolve() if fs else None


def build(plugins: PluginSet) -> GateServer:
    server = GateServer(plugins)

    @server.feature(types.TEXT_DOCUMENT_DID_OPEN)
    def did_open(ls: GateServer, params: types.DidOpenTextDocumentParams) -> None:
        ls.changed(params.text_document.uri)

    @server.feature(types.TEXT_DOCUMENT_DID_CHANGE)
    def did_change(ls: GateServer, params: types.DidChangeTextDocumentParams) -> None:
        ls.changed(params.text_document.uri, remedies=False)  # every keystroke: no remedies

    @server.feature(types.TEXT_DOCUMENT_DID_SAVE)
    def did_save(ls: GateServer, params: types.DidSaveTextDocumentParams) -> None:
        ls.changed(params.text_document.uri)

    @server.feature(types.TEXT_DOCUMENT_DID_CLOSE)
    def did_close(ls: GateServer, params: types.DidCloseTextDocumentParams) -> None:
        ls.checked.pop(params.text_document.uri, None)
        ls.remedied.pop(params.text_document.uri, None)
        ls.text_document_publish_diagnostics(
            types.PublishDiagnosticsParams(uri=params.text_document.uri, diagnostics=[])
        )

    @server.feature(types.TEXT_DOCUMENT_HOVER)
    def hover(ls: GateServer, params: types.HoverParams) -> types.Hover | None:
        uri = params.text_document.uri
        path, checked = _path(uri), ls.checked.get(uri)
        if path is None or checked is None:
            return None
        text = ls.workspace.get_text_document(uri).source
        pos = params.position
        column = _code_points(text.splitlines() or [""], pos.line, pos.character)
        key = key_at(text, path, pos.line, column)
        if key is None:
            return None
        markdown = hover_markdown(key, checks_under(checked.result, path, key))
        if markdown is None:
            return None
        return types.Hover(
            contents=types.MarkupContent(kind=types.MarkupKind.Markdown, value=markdown)
        )

    @server.feature(
        types.TEXT_DOCUMENT_CODE_ACTION,
        types.CodeActionOptions(code_action_kinds=[types.CodeActionKind.QuickFix]),
    )
    def code_action(ls: GateServer, params: types.CodeActionParams) -> list[types.CodeAction]:
        only = params.context.only
        if only is not None and not any(
            types.CodeActionKind.QuickFix.value.startswith(getattr(k, "value", k)) for k in only
        ):
            return []
        return ls.quick_fixes(
            params.text_document.uri, params.range, list(params.context.diagnostics)
        )

    return server


def serve(plugins: PluginSet) -> None:
    """Serve over standard input and output until the client exits."""
    build(plugins).start_io()
