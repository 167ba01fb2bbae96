"""Report writes: a reader sees the old file or the new one, never half of one.

Only a regular file (or a new one) is replaced atomically, through a temporary file beside it.
Anything else the path names is written in place and never replaced: a character device (the
null device), a FIFO, or a symbolic link (its target is written, the link kept). A temporary is
named ``.NAME.PID.emgate-tmp...``: it is removed when the write fails or the run is stopped by
SIGTERM, and a later write of the same report removes one whose process is gone (SIGKILL).
Files that land together (an HTML index and its sheets) are written into a staging folder of
the same name's pattern first, and moved into place once all are in (:func:`staging`).
A report path in a folder that does not exist is an error; nothing creates folders unasked.
"""

from __future__ import annotations

import contextlib
import errno
import os
import shutil
import signal
import stat
import tempfile
import threading
from collections.abc import Callable, Iterable, Iterator
from pathlib import Path
from typing import IO

TEMP_MARK = ".emgate-tmp"


def write_atomic(path: Path, text: str | Iterable[str], *, parents: bool = False) -> None:
    """Write ``text`` to ``path`` (UTF-8, LF line ends).

    Parameters
    ----------
    path : Path
        The file to write; its folder must exist unless ``parents``.
    text : str or iterable of str
        The text, or its pieces in order (a report written as it is made: the pieces go to
        the temporary file one at a time, and the file is replaced only once all are in)
    parents : bool
        Create missing folders (for ``emgate schema --write DIR``, which names a folder).

    Raises
    ------
    OSError
        FileNotFoundError when the folder does not exist; any error of the write itself.
    """
    if parents:
        path.parent.mkdir(parents=True, exist_ok=True)
    elif not path.parent.is_dir():
        raise FileNotFoundError(2, "the folder does not exist (emgate creates no folders)")
    try:
        mode = os.lstat(path).st_mode
    except FileNotFoundError:
        mode = None
    if mode is not None and not stat.S_ISREG(mode):
        # A device, FIFO or link: write through it, never replace the node itself.
        with open(path, "w", encoding="utf-8", newline="\n") as handle:
            _write(handle, text)
        return
    remove_stale(path)
    fd, tmp = tempfile.mkstemp(
        prefix=f".{path.name}.{os.getpid()}.", suffix=TEMP_MARK, dir=path.parent
    )
    with _removed_on_sigterm(Path(tmp)):
        try:
            with os.fdopen(fd, "w", encoding="utf-8", newline="\n") as handle:
                _write(handle, text)
                handle.flush()
                os.fsync(handle.fileno())
            umask = os.umask(0)
            os.umask(umask)
            os.chmod(tmp, 0o666 & ~umask)
            os.replace(tmp, path)
        except BaseException:
            Path(tmp).unlink(missing_ok=True)
            raise


def _write(handle: IO[str], text: str | Iterable[str]) -> None:
    if isinstance(text, str):
        handle.write(text)
    else:
        handle.writelines(text)


def remove_stale(path: Path) -> list[Path]:
    """Remove temporaries of ``path`` left by runs whose process no longer exists."""
    removed = []
    head = f".{path.name}."
    for name in os.listdir(path.parent):  # (not a glob: the report's name may hold '[')
        if not (name.startswith(head) and name.endswith(TEMP_MARK)):
            continue
        tmp = path.parent / name
        pid_text = name[len(head) :].split(".", 1)[0]
        if not pid_text.isdigit() or int(pid_text) == os.getpid() or _alive(int(pid_text)):
            continue
        with contextlib.suppress(OSError):
            if tmp.is_dir() and not tmp.is_symlink():  # a staging folder (:func:`staging`)
                shutil.rmtree(tmp)
            else:
                tmp.unlink()
            removed.append(tmp)
    return removed


@contextlib.contextmanager
def staging(path: Path) -> Iterator[Path]:
    """A temporary folder beside ``path`` for files that land together (:func:`land`, once
    all are written), removed with whatever is left in it when the block ends or SIGTERM
    ends the run; one that a run killed outright leaves is removed by the next write of
    ``path`` (:func:`remove_stale`)."""
    remove_stale(path)
    tmp = tempfile.mkdtemp(prefix=f".{path.name}.{os.getpid()}.", suffix=TEMP_MARK, dir=path.parent)

    def remove() -> None:
        shutil.rmtree(tmp, ignore_errors=True)

    with _removed_on_sigterm(Path(tmp), remove):
        try:
            yield Path(tmp)
        finally:
            remove()


def check_landing(path: Path) -> None:
    """Raise the OSError that :func:`land` would meet at ``path`` that can be seen before
    anything lands: a folder in the way, a symbolic link in a loop or into a folder that does
    not exist. (An error of the rename or the write itself can still come later.)"""
    if os.path.isdir(path):
        raise IsADirectoryError(errno.EISDIR, "a folder is in the way", str(path))
    if os.path.islink(path):
        try:
            os.stat(path)  # (a loop raises here)
        except FileNotFoundError:  # a dangling link: written through, its folder must exist
            if not os.path.isdir(os.path.dirname(os.path.realpath(path))):
                raise FileNotFoundError(
                    errno.ENOENT, "a link into a folder that does not exist", str(path)
                ) from None


def land(staged: Path, path: Path) -> None:
    """Move a file written in a :func:`staging` folder to ``path``: a rename, or written
    through ``path`` when that is a device, FIFO or link, as :func:`write_atomic` does."""
    try:
        mode: int | None = os.lstat(path).st_mode
    except FileNotFoundError:
        mode = None
    if mode is not None and not stat.S_ISREG(mode):
        write_atomic(path, staged.read_text(encoding="utf-8"))
        return
    os.replace(staged, path)


def _alive(pid: int) -> bool:
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except (PermissionError, OverflowError):
        return True  # another user's process: leave its file alone
    return True


@contextlib.contextmanager
def _removed_on_sigterm(tmp: Path, remove: Callable[[], object] | None = None) -> Iterator[None]:
    """While writing, SIGTERM removes the temporary (``remove``, by default unlinking
    ``tmp``) and then ends the run as SIGTERM would. A process forked meanwhile (a worker of
    ``--jobs``) inherits the handler but not the temporary: there SIGTERM ends it alone."""
    if threading.current_thread() is not threading.main_thread():
        yield
        return
    previous = signal.getsignal(signal.SIGTERM)
    owner = os.getpid()

    def stop(signum: int, frame: object) -> None:
        if os.getpid() != owner:
            signal.signal(signal.SIGTERM, signal.SIG_DFL)
            os.kill(os.getpid(), signal.SIGTERM)
            return
        if remove is None:
            tmp.unlink(missing_ok=True)
        else:
            remove()
        signal.signal(signal.SIGTERM, previous)
        raise SystemExit(128 + signum)

    signal.signal(signal.SIGTERM, stop)
    try:
        yield
    finally:
        signal.signal(signal.SIGTERM, previous)
