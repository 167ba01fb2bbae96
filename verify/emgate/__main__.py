"""``python -m emgate``: the same entry as the console script.

``python -m`` puts the working directory first on ``sys.path``; inside a design repository
that would let a planted module (an ``argparse.py``) run before emgate. It is dropped here,
before anything else is imported.
"""

import os
import sys

_cwd = os.path.realpath(os.getcwd())
sys.path[:] = [p for p in sys.path if p not in ("", ".") and os.path.realpath(p) != _cwd]

from emgate.cli import entry  # noqa: E402

entry()
