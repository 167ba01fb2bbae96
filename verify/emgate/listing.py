"""The YAML files of a folder, as the gate sees them when no ``files:`` names them.

In a git work tree git says which files belong to the repository: tracked ones and untracked
ones it does not ignore (``git ls-files --cached --others --exclude-standard``). Elsewhere, or
without git, a walk that does not enter hidden folders or virtual environments. Both skip
what is never a design record of the repository: virtual environments (any folder holding a
``pyvenv.cfg``, and the usual names), installed packages and caches, even when git does not
ignore them (a fresh repository with a ``.venv`` and no ``.gitignore``).
"""

from __future__ import annotations

import os
from collections.abc import Collection, Iterable, Iterator
from pathlib import Path
from typing import TYPE_CHECKING

from emgate.errors import within

if TYPE_CHECKING:
    from emgate.spill import Index

SUFFIXES = (".yaml", ".yml")
#: Folders never searched, whatever their place: environments, installed packages, caches.
SKIP_NAMES = frozenset({"venv", "site-packages", "dist-packages", "node_modules", "__pycache__"})


def _skipped(folder: Path) -> bool:
    """A folder that holds no design records of the repository: hidden (``.git``, ``.venv``,
    ``.nox``, ``.tox``), a virtual environment of any name, or one of :data:`SKIP_NAMES`."""
    name = folder.name
    return name.startswith(".") or name in SKIP_NAMES or (folder / "pyvenv.cfg").is_file()


def yaml_files(root: Path) -> list[Path]:
    """Every ``*.yaml``/``*.yml`` file under ``root`` that the gate should read, sorted."""
    return [Path(name) for name in yaml_names(root)]


def yaml_names(root: Path, index: Index | None = None, skip: Collection[str] = ()) -> Iterable[str]:
    """:func:`yaml_files` as path strings (``root`` joined with each file's relative path):
    discovery of a large repository builds a path object only for the files it keeps. With
    a run's ``index``, a long listing is sorted on disk (:class:`~emgate.spill.SpillSorted`),
    not held in memory. Nothing is listed under the folders ``skip`` names (resolved paths):
    a run that has read a folder already looks for materials files in the rest of its
    repository only."""
    listed = _git_listing(root, _relative_inside(root, skip))
    if listed is None:
        walked = _walk(root, frozenset(skip))
        return _sorted((p for p in walked if _readable_or_link(p)), index)
    top = str(root)
    verdict: dict[str, bool] = {}

    def kept(name: str) -> bool:
        folder = os.path.dirname(name)
        chain = []
        while folder and folder not in verdict:
            chain.append(folder)
            folder = os.path.dirname(folder)
        ok = verdict.get(folder, True)
        for f in reversed(chain):  # outermost first: a skipped parent skips its children
            ok = ok and not _skipped(Path(top, f))
            verdict[f] = ok
        return ok

    paths = (os.path.join(top, name) for name in listed if _suffix(name) in SUFFIXES and kept(name))
    return _sorted((p for p in paths if _readable_or_link(p)), index)


def _sorted(names: Iterator[str], index: Index | None) -> Iterable[str]:
    """The names, each once, in the order of :func:`_parts`."""
    if index is None or os.name != "posix":  # (elsewhere the key is a path, not a text)
        return sorted(dict.fromkeys(names), key=_parts)
    from emgate.spill import SpillSorted

    out = SpillSorted(index, _posix_parts, _unparts)
    out.update(names)
    return out


def _relative_inside(root: Path, folders: Collection[str]) -> list[str]:
    """The resolved ``folders`` that lie inside ``root``, relative to it."""
    if not folders:
        return []
    real = os.path.realpath(root)
    return [rel for f in folders if (rel := within(f, real)) not in (None, ".")]


def _readable_or_link(name: str) -> bool:
    """A file, or a symbolic link whatever it leads to: a link that leads nowhere (or in a
    loop) is kept, for discovery to report, not dropped as if it were no record."""
    return os.path.isfile(name) or os.path.islink(name)


def _suffix(name: str) -> str:
    """``Path(name).suffix``: a file named ``.yaml`` alone has none."""
    return os.path.splitext(os.path.basename(name))[1]


def _parts(name: str) -> str | Path:
    """Sort key: the order of the paths' parts, as paths sort (``a/x`` before ``a-b/x``).
    On POSIX the name with each ``/`` as NUL, the one character below all a name may hold:
    it sorts as the list of parts does, and a thousand-file listing sorts without a list of
    parts held for each file. Elsewhere the path itself (Windows paths sort by case-folded
    parts, and git names keep their ``/``)."""
    return _posix_parts(name) if os.name == "posix" else Path(name)


def _posix_parts(name: str) -> str:
    return name.replace("/", "\0")


def _unparts(key: str) -> str:
    """The name :func:`_posix_parts` gave ``key`` for."""
    return key.replace("\0", "/")


def _git_listing(root: Path, skip: Iterable[str] = ()) -> Iterator[str] | None:
    """Git's files under ``root`` but those under the folders ``skip`` names (relative to
    it), or None when ``root`` is not in a work tree (or git is missing or does not
    answer): then the caller walks the folder instead."""
    import subprocess  # here: a check of named files lists no folder

    left_out = [f":(exclude,literal){folder}" for folder in skip]
    try:
        done = subprocess.run(
            [
                *("git", "ls-files", "-z", "--cached", "--others", "--exclude-standard"),
                *("--", ".", *left_out),
            ],
            cwd=root,
            capture_output=True,
            check=False,
            timeout=60,
        )
    except (OSError, subprocess.TimeoutExpired):
        return None
    if done.returncode != 0:
        return None
    return _names(done.stdout)


def _names(listing: bytes) -> Iterator[str]:
    """The names in git's NUL-separated listing (relative, in git's / form), one at a time:
    a long listing is not held as a list of texts as well as its bytes."""
    at = 0
    while at < len(listing):
        end = listing.find(b"\0", at)
        end = len(listing) if end < 0 else end
        if end > at:
            yield listing[at:end].decode("utf-8", "surrogateescape")
        at = end + 1


def _walk(root: Path, skip: frozenset[str] = frozenset()) -> Iterator[str]:
    """The YAML files under ``root`` as ``os.walk`` finds them (a symbolic link to a folder
    is not entered, a folder that cannot be read is passed over), one at a time: a folder
    of many thousand records is not held as a list of its names (the caller sorts). The
    folders ``skip`` names (resolved) are not entered."""
    folders = [os.fspath(root)]
    while folders:
        try:
            entries = os.scandir(folders.pop())
        except OSError:
            continue
        with entries:
            for entry in entries:
                try:
                    is_dir = entry.is_dir()
                except OSError:
                    is_dir = False
                if is_dir:
                    if entry.is_symlink() or _skipped(Path(entry.path)):
                        continue
                    if not skip or os.path.realpath(entry.path) not in skip:
                        folders.append(entry.path)
                elif entry.name.endswith(SUFFIXES):
                    yield entry.path
