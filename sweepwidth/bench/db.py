"""The results database: one SQLite file in WAL mode, one row per finished task.

Rows are keyed by ``(instance_hash, config_hash)`` and written (and
committed) the moment a task finishes, so a run that is killed loses at most
the tasks that were still running, and ``resume`` skips every key already
present.  Each row points at the run that produced it; the ``runs`` table
holds that run's metadata (package versions, machine, git commit).

Tables
------
``runs(run_id, started, finished, meta)``
    ``meta`` is a JSON object (see :func:`sweepwidth.bench.meta.run_metadata`).
``results(instance_hash, config_hash, instance, name, parameter, method,
seed, time_limit, options, status, value, lower, upper, seconds, wall,
result_method, checked, message, known, verdict, result, run_id, finished_at)``
    ``options``, ``known`` and ``result`` are JSON texts.
"""

from __future__ import annotations

import csv
import io
import json
import os
import sqlite3
import time
import uuid
from typing import Any, Iterable, Iterator, Mapping, TextIO

from ..errors import FileFormatError, UnsupportedOptionError

__all__ = ["ResultsDB", "COLUMNS", "EXPORT_FORMATS"]

COLUMNS = (
    "instance_hash", "config_hash", "instance", "name", "parameter", "method", "seed",
    "time_limit", "options", "status", "value", "lower", "upper", "seconds", "wall",
    "result_method", "checked", "message", "known", "verdict", "result", "run_id", "finished_at",
)

EXPORT_FORMATS = ("csv", "jsonl")

_SCHEMA = """
CREATE TABLE IF NOT EXISTS runs (
    run_id TEXT PRIMARY KEY,
    started REAL NOT NULL,
    finished REAL,
    meta TEXT NOT NULL
);
CREATE TABLE IF NOT EXISTS results (
    instance_hash TEXT NOT NULL,
    config_hash TEXT NOT NULL,
    instance TEXT,
    name TEXT,
    parameter TEXT,
    method TEXT,
    seed INTEGER,
    time_limit REAL,
    options TEXT,
    status TEXT NOT NULL,
    value REAL,
    lower REAL,
    upper REAL,
    seconds REAL,
    wall REAL,
    result_method TEXT,
    checked REAL,
    message TEXT,
    known TEXT,
    verdict TEXT,
    result TEXT,
    run_id TEXT,
    finished_at REAL,
    PRIMARY KEY (instance_hash, config_hash)
);
CREATE TABLE IF NOT EXISTS info (key TEXT PRIMARY KEY, value TEXT);
"""

_SCHEMA_VERSION = "1"
_JSON_COLUMNS = ("options", "known", "result")


def _num(x: Any) -> float | None:
    if x is None:
        return None
    if x in ("inf", "-inf"):
        return float(x)
    try:
        return float(x)
    except (TypeError, ValueError):
        return None


def _stale(owner: Mapping[str, Any]) -> bool:
    """True when the lock owner is a process of this host that no longer runs."""
    import socket

    if owner.get("host") != socket.gethostname():
        return False  # cannot tell: another machine sharing the file
    pid = owner.get("pid")
    if not isinstance(pid, int) or pid <= 0:
        return True
    if pid == os.getpid():
        return True
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return True
    except PermissionError:
        return False
    return False


class ResultsDB:
    """An open results database (a context manager; closing commits nothing new).

    Parameters
    ----------
    path : str
        The SQLite file (created when missing).

    Raises
    ------
    FileFormatError
        When the file exists but is not a sweepwidth results database.

    Examples
    --------
    >>> import tempfile, os
    >>> d = tempfile.mkdtemp()
    >>> with ResultsDB(os.path.join(d, "runs.sqlite")) as db:
    ...     run = db.start_run({"note": "example"})
    ...     db.record({"instance_hash": "i", "config_hash": "c", "status": "optimal", "value": 2}, run)
    ...     db.count()
    1
    """

    def __init__(self, path: str | os.PathLike) -> None:
        self.path = os.fspath(path)
        parent = os.path.dirname(os.path.abspath(self.path))
        if not os.path.isdir(parent):
            raise FileFormatError("the database's folder does not exist", path=self.path)
        if os.path.isfile(self.path) and os.path.getsize(self.path) == 0:
            # SQLite would silently take an empty file as a new database
            raise FileFormatError(
                "is an empty file (0 bytes), not a results database; remove it to start a new database there",
                path=self.path,
            )
        try:
            self.conn = sqlite3.connect(self.path, timeout=30.0, isolation_level=None)
            self.conn.execute("PRAGMA journal_mode=WAL")
            self.conn.execute("PRAGMA synchronous=FULL")
            self.conn.executescript(_SCHEMA)
            cur = self.conn.execute("SELECT value FROM info WHERE key='schema'")
            row = cur.fetchone()
            if row is None:
                self.conn.execute("INSERT OR IGNORE INTO info VALUES ('schema', ?)", (_SCHEMA_VERSION,))
            elif row[0] != _SCHEMA_VERSION:
                raise FileFormatError(f"results database schema {row[0]!r}, this version reads {_SCHEMA_VERSION!r}", path=self.path)
            cols = {r[1] for r in self.conn.execute("PRAGMA table_info(results)")}
            missing = set(COLUMNS) - cols
            if missing:
                raise FileFormatError(f"table 'results' lacks columns {sorted(missing)}; not a sweepwidth results database", path=self.path)
        except sqlite3.DatabaseError as err:
            raise FileFormatError(f"not a results database: {err}", path=self.path) from err

    # ---------------------------------------------------------------- lock
    def acquire_lock(self) -> None:
        """Make this process the only one running tasks into this database.

        The lock is a row in the ``info`` table holding the owner's host and
        process id; a row left by a process that no longer runs on this host
        (killed with SIGKILL) is taken over.

        Raises
        ------
        SweepwidthError
            When another live process holds the lock.
        """
        import socket

        from ..errors import OperationError, SweepwidthError

        me = json.dumps({"host": socket.gethostname(), "pid": os.getpid(), "since": time.time()})
        self.conn.execute("BEGIN IMMEDIATE")
        try:
            row = self.conn.execute("SELECT value FROM info WHERE key='lock'").fetchone()
            if row is not None:
                other = json.loads(row[0])
                if not _stale(other):
                    raise OperationError(
                        f"{self.path}: another benchmark run (process {other.get('pid')} on {other.get('host')}, since "
                        f"{time.strftime('%Y-%m-%d %H:%M:%S', time.localtime(other.get('since', 0)))}) is writing to this "
                        "database; wait for it to finish or use another --db"
                    )
            self.conn.execute("INSERT OR REPLACE INTO info VALUES ('lock', ?)", (me,))
            self.conn.execute("COMMIT")
        except BaseException:
            self.conn.execute("ROLLBACK")
            raise
        self._locked = True

    def release_lock(self) -> None:
        """Give the lock of :meth:`acquire_lock` back (a no-op when not held)."""
        if getattr(self, "_locked", False):
            self.conn.execute("DELETE FROM info WHERE key='lock' AND json_extract(value, '$.pid') = ?", (os.getpid(),))
            self._locked = False

    # ---------------------------------------------------------------- runs
    def start_run(self, meta: Mapping[str, Any]) -> str:
        """Register a run with its metadata; return its id."""
        run_id = time.strftime("%Y%m%dT%H%M%S") + "-" + uuid.uuid4().hex[:8]
        self.conn.execute(
            "INSERT INTO runs (run_id, started, meta) VALUES (?, ?, ?)",
            (run_id, time.time(), json.dumps(dict(meta), sort_keys=True, default=str)),
        )
        return run_id

    def finish_run(self, run_id: str) -> None:
        self.conn.execute("UPDATE runs SET finished=? WHERE run_id=?", (time.time(), run_id))

    def runs(self) -> list[dict]:
        cur = self.conn.execute("SELECT run_id, started, finished, meta FROM runs ORDER BY started")
        return [{"run_id": a, "started": b, "finished": c, "meta": json.loads(d)} for a, b, c, d in cur]

    # ------------------------------------------------------------- results
    def done_keys(self) -> set[tuple[str, str]]:
        """Every ``(instance_hash, config_hash)`` already recorded."""
        return set(self.conn.execute("SELECT instance_hash, config_hash FROM results"))

    def record(self, row: Mapping[str, Any], run_id: str | None = None) -> None:
        """Write one finished task at once (replacing an older row with the same key)."""
        data = {c: row.get(c) for c in COLUMNS}
        if run_id is not None:
            data["run_id"] = run_id
        if data.get("finished_at") is None:
            data["finished_at"] = time.time()
        for c in _JSON_COLUMNS:
            if data[c] is not None and not isinstance(data[c], str):
                data[c] = json.dumps(data[c], sort_keys=True, default=str)
        for c in ("value", "lower", "upper", "checked", "seconds", "wall", "time_limit"):
            data[c] = _num(data[c])
        if not data.get("instance_hash") or not data.get("config_hash") or not data.get("status"):
            raise ValueError("a result row needs instance_hash, config_hash and status")
        names = ", ".join(COLUMNS)
        marks = ", ".join("?" for _ in COLUMNS)
        self.conn.execute(f"INSERT OR REPLACE INTO results ({names}) VALUES ({marks})", [data[c] for c in COLUMNS])

    def count(self, **where: Any) -> int:
        sql, args = self._where(where)
        return int(self.conn.execute("SELECT COUNT(*) FROM results" + sql, args).fetchone()[0])

    def rows(self, **where: Any) -> list[dict]:
        """Rows as dicts (JSON columns decoded), optionally filtered by equality."""
        sql, args = self._where(where)
        cur = self.conn.execute(f"SELECT {', '.join(COLUMNS)} FROM results{sql} ORDER BY finished_at, name", args)
        out = []
        for r in cur:
            d = dict(zip(COLUMNS, r))
            for c in _JSON_COLUMNS:
                if d[c] is not None:
                    try:
                        d[c] = json.loads(d[c])
                    except json.JSONDecodeError:
                        pass
            out.append(d)
        return out

    def _where(self, where: Mapping[str, Any]) -> tuple[str, list]:
        if not where:
            return "", []
        for k in where:
            if k not in COLUMNS:
                raise UnsupportedOptionError("results column", k, COLUMNS)
        return " WHERE " + " AND ".join(f"{k} = ?" for k in where), list(where.values())

    # -------------------------------------------------------------- export
    def export(self, out: TextIO, fmt: str = "csv", *, columns: Iterable[str] | None = None, **where: Any) -> int:
        """Write the rows as CSV (JSON columns as JSON text) or JSON lines; return how many.

        The ``result`` column (witnesses, which can be large) is left out of
        CSV unless named in ``columns``.
        """
        if fmt not in EXPORT_FORMATS:
            raise UnsupportedOptionError("export format", fmt, EXPORT_FORMATS)
        rows = self.rows(**where)
        if columns is None:
            cols = [c for c in COLUMNS if not (fmt == "csv" and c == "result")]
        else:
            cols = list(columns)
            for c in cols:
                if c not in COLUMNS:
                    raise UnsupportedOptionError("results column", c, COLUMNS)
        if fmt == "jsonl":
            for r in rows:
                out.write(json.dumps({c: r[c] for c in cols}, sort_keys=False, default=str) + "\n")
        else:
            w = csv.writer(out)
            w.writerow(cols)
            for r in rows:
                w.writerow(
                    [json.dumps(r[c], sort_keys=True) if isinstance(r[c], (dict, list)) else ("" if r[c] is None else r[c]) for c in cols]
                )
        return len(rows)

    def export_text(self, fmt: str = "csv", **kw: Any) -> str:
        buf = io.StringIO()
        self.export(buf, fmt, **kw)
        return buf.getvalue()

    def close(self) -> None:
        self.conn.close()

    def __enter__(self) -> "ResultsDB":
        return self

    def __exit__(self, *exc: Any) -> None:
        self.close()

    def __iter__(self) -> Iterator[dict]:
        return iter(self.rows())
