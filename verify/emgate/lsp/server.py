"""The language server over stdio (pygls, lsprotocol): diagnostics and hover.

Every open, change (full text) and save of a YAML document runs the gate on it
(:func:`emgate.lsp.gate.check_open`) and publishes its findings; a change to anything but a
design record (the policy, the waivers file, a materials file) re-checks every open
document, since each of them reads it. Hover on a record key lists the checks it drives.
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
)
from emgate.plugins import PluginSet

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

    def buffers(self) -> dict[Path, str]:
        out = {}
        for uri, doc in self.workspace.text_documents.items():
            path = _path(uri)
            if path is not None:
                out[path] = doc.source
        return out

    def check(self, uri: str) -> None:
        path = _path(uri)
        if path is None or path.suffix not in (".yaml", ".yml"):
            return
        text = self.workspace.get_text_document(uri).source
        try:
            checked = check_open(path, self.buffers(), self.plugins)
            found = marks(checked, path, text)
        except Exception as exc:  # fail closed: say so on the document, keep serving
            self.checked.pop(uri, None)
            message = f"emgate internal error, the file is not checked: {type(exc).__name__}: {exc}"
            found = [Mark(0, 0, max(len(text.split("\n", 1)[0]), 1), "error", "crash", message)]
        else:
            self.checked[uri] = checked
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

    def changed(self, uri: str) -> None:
        self.check(uri)
        checked = self.checked.get(uri)
        if checked is not None and checked.read_by_others:
            for other in list(self.workspace.text_documents):
                if other != uri:
                    self.check(other)


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
        ls.changed(params.text_document.uri)

    @server.feature(types.TEXT_DOCUMENT_DID_SAVE)
    def did_save(ls: GateServer, params: types.DidSaveTextDocumentParams) -> None:
        ls.changed(params.text_document.uri)

    @server.feature(types.TEXT_DOCUMENT_DID_CLOSE)
    def did_close(ls: GateServer, params: types.DidCloseTextDocumentParams) -> None:
        ls.checked.pop(params.text_document.uri, None)
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

    return server


def serve(plugins: PluginSet) -> None:
    """Serve over standard input and output until the client exits."""
    build(plugins).start_io()
