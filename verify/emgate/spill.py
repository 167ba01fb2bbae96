"""A run's per-record index (the records still to check, the files and ids already seen),
kept in memory up to :data:`SPILL_AT` entries a collection and beyond that in a temporary
SQLite database, so that the memory of a run does not grow with its records.

A check of a few records never imports :mod:`sqlite3`: the database is made on the first
spill. Without a writable temporary folder (or without :mod:`sqlite3`) the collections stay
in memory, as :class:`~emgate.findings.Spool` does: the run is the same, only larger.
"""

from __future__ import annotations

import os
from collections.abc import Callable, Iterable, Iterator
from typing import TYPE_CHECKING, Any, Generic, TypeVar

if TYPE_CHECKING:
    import sqlite3

_Table = tuple["sqlite3.Connection", str]  # a collection's table: (the database, its name)
T = TypeVar("T")
V = TypeVar("V")

#: Entries a collection holds in memory before it moves to disk: a few thousand records'
#: index is a few MiB at most, and a check of that many is seconds long, so the database's
#: few ms of set-up are never paid where a run is start-up bound.
SPILL_AT = 2048
#: The database's page cache, KiB (SQLite's default is 2 MiB): what it holds in memory. A
#: record costs a few lookups of an id or a name, each a few pages: the operating system's
#: file cache serves those the page cache does not hold, far faster than a record's check.
CACHE_KIB = 256
#: Items read back at a time from a spilled queue.
PAGE = 256


def _blob(text: str) -> bytes:
    """A text as a key SQLite compares byte for byte: any Python text (a file name that is
    no UTF-8 holds lone surrogates), one to one."""
    return text.encode("utf-8", "surrogatepass")


def _dump(value: object) -> bytes:
    import pickle  # here: a check that spills nothing does not import it

    return pickle.dumps(value, pickle.HIGHEST_PROTOCOL)


def _load(data: bytes) -> Any:
    import pickle

    return pickle.loads(data)


class Index:
    """The temporary database a run's collections spill to, made when the first one does;
    :meth:`close` removes it. (A collection made with no index stays in memory.)"""

    def __init__(self) -> None:
        self._db: sqlite3.Connection | None = None
        self._file: str | None = None
        self._unavailable = False
        self._tables = 0

    def queue(self) -> SpillQueue[Any]:
        return SpillQueue(self)

    def keys(self) -> SpillSet:
        return SpillSet(self)

    def map(self) -> SpillMap[Any]:
        return SpillMap(self)

    @property
    def spilled(self) -> bool:
        """Whether any collection went to disk."""
        return self._db is not None

    def table(self, columns: str, rowid: bool = True) -> _Table | None:
        """A new table of ``columns`` in the database (made on the first call), or None
        when there is no database to be had: the caller stays in memory."""
        if self._db is None and not self._unavailable:
            self._db = self._open()
            self._unavailable = self._db is None
        if self._db is None:
            return None
        self._tables += 1
        name = f"t{self._tables}"
        self._db.execute(f"CREATE TABLE {name} ({columns}){'' if rowid else ' WITHOUT ROWID'}")
        return self._db, name

    def _open(self) -> sqlite3.Connection | None:
        import tempfile

        try:
            import sqlite3
        except ImportError:  # a Python built without it
            return None
        try:
            fd, self._file = tempfile.mkstemp(prefix="emgate-index-", suffix=".sqlite")
            os.close(fd)
            db = sqlite3.connect(self._file)
            # scratch data: no journal, no sync; one transaction for the run, never
            # committed (what overflows the page cache is written to the file)
            db.execute("PRAGMA journal_mode = OFF")
            db.execute("PRAGMA synchronous = OFF")
            db.execute(f"PRAGMA cache_size = -{CACHE_KIB}")
            db.execute("PRAGMA temp_store = FILE")
            if os.name == "posix":
                # nameless from here on (SQLite keeps the open file, and with no journal
                # opens no other by its name): a run killed outright leaves nothing behind
                self._remove()
            return db
        except (OSError, sqlite3.Error):  # no writable temporary folder
            self._remove()
            return None

    def close(self) -> None:
        if self._db is not None:
            self._db.close()
            self._db = None
        self._remove()

    def _remove(self) -> None:
        if self._file is not None:
            try:
                os.remove(self._file)
            except OSError:
                pass
            self._file = None


def _table(index: Index | None, columns: str, rowid: bool = True) -> _Table | None:
    return None if index is None else index.table(columns, rowid)


class SpillQueue(Generic[T]):
    """Items appended, then read back once, in order (each dropped as it is read)."""

    def __init__(self, index: Index | None) -> None:
        self._index = index
        self._held: list[T] = []
        self._table: _Table | None = None
        self._count = 0

    def append(self, item: T) -> None:
        self._count += 1
        if self._table is None and len(self._held) >= SPILL_AT:
            self._table = _table(self._index, "item BLOB")
            if self._table is not None:
                self._write(self._held)
                self._held = []
        if self._table is None:
            self._held.append(item)
        else:
            self._write([item])

    def _write(self, items: list[T]) -> None:
        assert self._table is not None
        db, name = self._table
        db.executemany(
            f"INSERT INTO {name} (item) VALUES (?)",
            ((_dump(i),) for i in items),
        )

    def __len__(self) -> int:
        """The items appended and not yet read."""
        return self._count

    def __iter__(self) -> Iterator[T]:
        if self._table is None:
            self._held.reverse()
            while self._held:
                self._count -= 1
                yield self._held.pop()
            return
        db, name = self._table
        at = 0
        while True:  # a page at a time: the reader writes to the database in between
            rows = db.execute(
                f"SELECT rowid, item FROM {name} WHERE rowid > ? ORDER BY rowid LIMIT ?",
                (at, PAGE),
            ).fetchall()
            if not rows:
                return
            at = rows[-1][0]
            for _, item in rows:
                self._count -= 1
                yield _load(item)


class SpillSet:
    """A set of texts that is only added to and asked."""

    def __init__(self, index: Index | None) -> None:
        self._index = index
        self._held: set[str] = set()
        self._table: _Table | None = None

    def add(self, key: str) -> bool:
        """Add ``key``; whether it was new."""
        if self._table is None:
            if key in self._held:
                return False
            self._held.add(key)
            if len(self._held) > SPILL_AT:
                self._table = _table(self._index, "k BLOB PRIMARY KEY", rowid=False)
                if self._table is not None:
                    db, name = self._table
                    db.executemany(
                        f"INSERT INTO {name} VALUES (?)", ((_blob(k),) for k in self._held)
                    )
                    self._held = set()
            return True
        db, name = self._table
        return db.execute(f"INSERT OR IGNORE INTO {name} VALUES (?)", (_blob(key),)).rowcount == 1

    def __contains__(self, key: str) -> bool:
        if self._table is None:
            return key in self._held
        db, name = self._table
        return db.execute(f"SELECT 1 FROM {name} WHERE k = ?", (_blob(key),)).fetchone() is not None


class SpillMap(Generic[V]):
    """A map from texts to values, with the few operations the run needs."""

    def __init__(self, index: Index | None) -> None:
        self._index = index
        self._held: dict[str, V] = {}
        self._table: _Table | None = None

    def get(self, key: str) -> V | None:
        if self._table is None:
            return self._held.get(key)
        db, name = self._table
        row = db.execute(f"SELECT v FROM {name} WHERE k = ?", (_blob(key),)).fetchone()
        return None if row is None else _load(row[0])

    def __contains__(self, key: str) -> bool:
        return self.get(key) is not None

    def __setitem__(self, key: str, value: V) -> None:
        self._put(key, value, "REPLACE")

    def setdefault(self, key: str, value: V) -> None:
        """``key`` to ``value`` unless it has one already."""
        self._put(key, value, "IGNORE")

    def _put(self, key: str, value: V, conflict: str) -> None:
        if self._table is None:
            if conflict == "REPLACE":
                self._held[key] = value
            else:
                self._held.setdefault(key, value)
            if len(self._held) <= SPILL_AT:
                return
            self._table = _table(self._index, "k BLOB PRIMARY KEY, v BLOB", rowid=False)
            if self._table is None:
                return
            db, name = self._table
            db.executemany(
                f"INSERT INTO {name} VALUES (?, ?)",
                ((_blob(k), _dump(v)) for k, v in self._held.items()),
            )
            self._held = {}
            return
        db, name = self._table
        db.execute(
            f"INSERT OR {conflict} INTO {name} VALUES (?, ?)",
            (_blob(key), _dump(value)),
        )


class SpillSorted:
    """Texts added (a text added twice is kept once), read back sorted by ``key``: on disk,
    by SQLite's index, not in memory. ``key`` must be one to one, ``unkey`` its inverse,
    and its order that of UTF-8 bytes (a text's code points: Python's order of texts)."""

    def __init__(
        self, index: Index | None, key: Callable[[str], str], unkey: Callable[[str], str]
    ) -> None:
        self._index = index
        self._key, self._unkey = key, unkey
        self._held: dict[str, None] = {}
        self._table: _Table | None = None

    def update(self, texts: Iterable[str]) -> None:
        for text in texts:
            if self._table is None:
                self._held[text] = None
                if len(self._held) > SPILL_AT:
                    self._table = _table(self._index, "k BLOB PRIMARY KEY", rowid=False)
                    if self._table is not None:
                        self._insert(self._held)
                        self._held = {}
            else:
                self._insert((text,))

    def _insert(self, texts: Iterable[str]) -> None:
        assert self._table is not None
        db, name = self._table
        rows = ((_blob(self._key(t)),) for t in texts)
        db.executemany(f"INSERT OR IGNORE INTO {name} VALUES (?)", rows)

    def __iter__(self) -> Iterator[str]:
        if self._table is None:
            yield from sorted(self._held, key=self._key)
            return
        db, name = self._table
        after = b""
        while True:  # a page at a time: the reader writes to the database in between
            rows = db.execute(
                f"SELECT k FROM {name} WHERE k > ? ORDER BY k LIMIT ?", (after, PAGE)
            ).fetchall()
            if not rows:
                return
            after = rows[-1][0]
            for (k,) in rows:
                yield self._unkey(k.decode("utf-8", "surrogatepass"))
