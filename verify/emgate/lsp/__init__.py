"""``emgate lsp``: a language server that shows the gate's findings while a record is edited.

The LSP libraries (pygls, lsprotocol) are the optional extra ``emgate[lsp]`` and are imported
only when the server starts, so ``emgate check`` never pays for them.
"""

from __future__ import annotations

import sys

from emgate.plugins import PluginSet
from emgate.terms import EXIT_INPUT, EXIT_OK


def main(plugins: PluginSet) -> int:
    """Run the language server over stdio; exit code 2 with a message if the extra is missing."""
    try:
        from emgate.lsp.server import serve
    except ImportError as exc:
        if (exc.name or "").split(".")[0] not in ("pygls", "lsprotocol", "cattrs", "attrs"):
            raise
        print(
            f"emgate lsp: the language server needs the optional extra 'lsp' ({exc.name} is"
            " not installed); install it with: pip install 'emgate[lsp]'",
            file=sys.stderr,
        )
        return EXIT_INPUT
    serve(plugins)
    return EXIT_OK
