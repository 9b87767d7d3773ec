"""Plots from a results database: seconds against instance size, and solved counts, per method.

The reader relies on a small documented subset of the database written by
:mod:`sweepwidth.bench`: one table of finished tasks (``results`` when it
exists, else the first table that has ``status`` and ``method`` columns)
with, under any of these column names,

=============  ===============================================
field          columns tried, in order
=============  ===============================================
name           ``name``, ``instance_name``, ``instance``
size           ``size``, ``n``, ``vertices``, ``faces``
parameter      ``parameter``, ``param``
method         ``method``, ``result_method``
status         ``status``
seconds        ``seconds``, ``wall``, ``time``
=============  ===============================================

When no size column exists, the size is taken from the stored result JSON
(``stats`` entries ``n``/``vertices``/``faces``), else from reading the
instance file named in ``instance`` (vertex count), else left unknown (such
rows are counted but not placed on the size axis).
"""

from __future__ import annotations

import json
import os
import sqlite3
from collections import defaultdict
from typing import Any, Iterable

import numpy as np

from ..errors import FileFormatError, InvalidArgumentError, SweepwidthError
from ._style import PALETTE, SERIES, new_figure, require_matplotlib

__all__ = ["read_bench_rows", "bench_times", "bench_solved"]

_FIELDS = {
    "name": ("name", "instance_name", "instance"),
    "size": ("size", "n", "vertices", "faces"),
    "parameter": ("parameter", "param"),
    "method": ("method", "result_method"),
    "status": ("status",),
    "seconds": ("seconds", "wall", "time"),
}

SOLVED = ("optimal", "infeasible")


def _pick_table(con: sqlite3.Connection, path: str) -> tuple[str, list[str]]:
    tables = [r[0] for r in con.execute("SELECT name FROM sqlite_master WHERE type='table' ORDER BY name")]
    cols = {t: [r[1] for r in con.execute(f'PRAGMA table_info("{t}")')] for t in tables}
    if "results" in cols and {"status", "method"} <= set(cols["results"]):
        return "results", cols["results"]
    for t in tables:
        if {"status", "method"} <= set(cols[t]):
            return t, cols[t]
    raise FileFormatError(f"no table of tasks with 'status' and 'method' columns (tables: {tables})", path=path)


def _size_from_result(text: Any) -> float | None:
    if not text:
        return None
    try:
        d = json.loads(text) if isinstance(text, str) else dict(text)
    except (ValueError, TypeError):
        return None
    stats = d.get("stats") or {}
    for key in ("n", "vertices", "faces", "size"):
        v = stats.get(key) if isinstance(stats, dict) else None
        if isinstance(v, (int, float)) and not isinstance(v, bool):
            return float(v)
    return None


def _size_from_file(path: Any, base: str, cache: dict) -> float | None:
    if not isinstance(path, str) or not path:
        return None
    full = path if os.path.isabs(path) or os.path.exists(path) else os.path.join(base, path)
    if full in cache:
        return cache[full]
    size = None
    if os.path.exists(full):
        try:
            from .. import io as swio

            G = swio.read(full)
            size = float(G.number_of_nodes() if hasattr(G, "number_of_nodes") else G.number_of_vertices())
        except Exception:  # an unreadable instance only loses its size
            size = None
    cache[full] = size
    return size


def read_bench_rows(db: Any) -> list[dict]:
    """Rows of a results database as dicts with keys name, size, parameter, method, status, seconds.

    Parameters
    ----------
    db : str, path-like, or list of dict
        An SQLite file, or rows already read (returned as normalised copies).

    Returns
    -------
    list of dict

    Raises
    ------
    FileFormatError
        A missing file, one that is not SQLite, or one without a table of tasks.

    Examples
    --------
    >>> rows = read_bench_rows([{"name": "a", "size": 4, "method": "dp", "status": "optimal", "seconds": 0.1}])
    >>> rows[0]["method"], rows[0]["size"], rows[0]["parameter"]
    ('dp', 4.0, None)
    """
    if isinstance(db, (list, tuple)):
        raw = [dict(r) for r in db]
        base = "."
    else:
        path = os.fspath(db)
        if not os.path.exists(path):
            raise FileFormatError("no such results database", path=path)
        base = os.path.dirname(os.path.abspath(path))
        try:
            con = sqlite3.connect(f"file:{path}?mode=ro", uri=True)
        except sqlite3.Error as err:
            raise FileFormatError(f"cannot open as SQLite: {err}", path=path) from err
        try:
            try:
                table, cols = _pick_table(con, path)
                cur = con.execute(f'SELECT * FROM "{table}"')
            except sqlite3.DatabaseError as err:
                raise FileFormatError(f"not an SQLite results database: {err}", path=path) from err
            names = [c[0] for c in cur.description]
            raw = [dict(zip(names, r)) for r in cur.fetchall()]
        finally:
            con.close()
    out = []
    cache: dict = {}
    for r in raw:
        row: dict[str, Any] = {}
        for key, cands in _FIELDS.items():
            row[key] = next((r[c] for c in cands if c in r and r[c] is not None), None)
        if row["size"] is None:
            row["size"] = _size_from_result(r.get("result"))
        if row["size"] is None:
            row["size"] = _size_from_file(r.get("instance"), base, cache)
        for key in ("size", "seconds"):
            try:
                row[key] = float(row[key]) if row[key] is not None else None
            except (TypeError, ValueError):
                row[key] = None
        row["method"] = str(row["method"]) if row["method"] is not None else "?"
        row["status"] = str(row["status"]) if row["status"] is not None else "?"
        out.append(row)
    return out


def _filter(rows: list[dict], parameter: str | None) -> list[dict]:
    if parameter is None:
        return rows
    return [r for r in rows if r["parameter"] == parameter]


def _methods(rows: Iterable[dict]) -> list[str]:
    return sorted({r["method"] for r in rows})


def bench_times(
    db: Any,
    *,
    parameter: str | None = None,
    ax: Any = None,
    figsize: tuple[float, float] = (6.0, 4.0),
    dpi: float = 100.0,
) -> Any:
    """Seconds against instance size, one series per method, log-scaled time axis.

    Solved tasks (optimal or infeasible) are filled markers; tasks that ended
    with bounds only are hollow; a line joins each method's median time per
    size.

    Parameters
    ----------
    db : str, path-like or list of dict
        A results database (see :func:`read_bench_rows`).
    parameter : str, optional
        Keep only tasks of this parameter.
    ax : matplotlib Axes, optional
    figsize, dpi

    Returns
    -------
    matplotlib.axes.Axes

    Raises
    ------
    SweepwidthError
        Without matplotlib, or when no task has both a size and a time.

    Examples
    --------
    >>> rows = [{"name": "g%d" % n, "size": n, "method": m, "status": "optimal", "seconds": 0.01 * n * k}
    ...         for n in (4, 8, 16) for k, m in ((1, "dp"), (3, "sat"))]
    >>> ax = bench_times(rows)
    >>> sorted(t.get_text() for t in ax.get_legend().get_texts())
    ['dp', 'sat']
    """
    require_matplotlib()
    rows = _filter(read_bench_rows(db), parameter)
    usable = [r for r in rows if r["size"] is not None and r["seconds"] is not None]
    if not usable:
        raise InvalidArgumentError("no task in the database has both an instance size and a time")
    if ax is None:
        fig = new_figure(figsize, dpi)
        ax = fig.add_axes((0.14, 0.13, 0.82, 0.78))
    for k, method in enumerate(_methods(usable)):
        colour, marker, ls = SERIES[k % len(SERIES)]
        mine = [r for r in usable if r["method"] == method]
        solved = [r for r in mine if r["status"] in SOLVED]
        other = [r for r in mine if r["status"] not in SOLVED]
        secs = lambda rs: [max(r["seconds"], 1e-4) for r in rs]  # noqa: E731 - log axis needs > 0
        if solved:
            ax.scatter([r["size"] for r in solved], secs(solved), marker=marker, color=colour, s=26, zorder=3,
                       edgecolors=PALETTE["ink"], linewidths=0.4)
        if other:
            ax.scatter([r["size"] for r in other], secs(other), marker=marker, facecolors="none",
                       edgecolors=colour, s=26, linewidths=1.1, zorder=3)
        by_size: dict[float, list[float]] = defaultdict(list)
        for r in mine:
            by_size[r["size"]].append(max(r["seconds"], 1e-4))
        xs = sorted(by_size)
        ax.plot(xs, [float(np.median(by_size[x])) for x in xs], color=colour, linestyle=ls, linewidth=1.4,
                marker=marker, markersize=4, label=method, zorder=2)
    ax.set_yscale("log")
    ax.set_xlabel("instance size (vertices)")
    ax.set_ylabel("seconds")
    ax.grid(True, which="both", color=PALETTE["grid"], linewidth=0.5)
    ax.set_axisbelow(True)
    for side in ("top", "right"):
        ax.spines[side].set_visible(False)
    ax.legend(fontsize=8, frameon=False, title="method (hollow: not solved)", title_fontsize=7)
    ax.set_title(f"time per instance{f' - {parameter}' if parameter else ''}", fontsize=10)
    return ax


def bench_solved(
    db: Any,
    *,
    parameter: str | None = None,
    ax: Any = None,
    figsize: tuple[float, float] = (6.0, 3.5),
    dpi: float = 100.0,
) -> Any:
    """Tasks solved per method (optimal or infeasible), stacked with those left bounded or failed.

    Parameters
    ----------
    db : str, path-like or list of dict
    parameter : str, optional
    ax : matplotlib Axes, optional
    figsize, dpi

    Returns
    -------
    matplotlib.axes.Axes

    Raises
    ------
    SweepwidthError
        Without matplotlib, or for an empty database.

    Examples
    --------
    >>> rows = [{"method": "dp", "status": "optimal"}, {"method": "dp", "status": "bounded"},
    ...         {"method": "sat", "status": "optimal"}]
    >>> ax = bench_solved(rows)
    >>> [round(p.get_width()) for p in ax.patches][:2]    # solved: dp, sat
    [1, 1]
    """
    require_matplotlib()
    rows = _filter(read_bench_rows(db), parameter)
    if not rows:
        raise InvalidArgumentError("the database has no tasks" + (f" for {parameter!r}" if parameter else ""))
    methods = _methods(rows)
    solved = [sum(1 for r in rows if r["method"] == m and r["status"] in SOLVED) for m in methods]
    bounded = [sum(1 for r in rows if r["method"] == m and r["status"] == "bounded") for m in methods]
    other = [sum(1 for r in rows if r["method"] == m and r["status"] not in SOLVED + ("bounded",)) for m in methods]
    if ax is None:
        fig = new_figure((figsize[0], max(figsize[1], 1.4 + 0.35 * len(methods))), dpi)
        ax = fig.add_axes((0.22, 0.28, 0.72, 0.62))
    y = np.arange(len(methods))
    ax.barh(y, solved, color=PALETTE["curve"], edgecolor=PALETTE["ink"], linewidth=0.5, label="solved")
    ax.barh(y, bounded, left=solved, color=PALETTE["swept"], edgecolor=PALETTE["ink"], linewidth=0.5,
            hatch="//", label="bounds only")
    left2 = [a + b for a, b in zip(solved, bounded)]
    ax.barh(y, other, left=left2, color="white", edgecolor=PALETTE["ink"], linewidth=0.5, hatch="xx",
            label="failed")
    for yi, s, total in zip(y, solved, [a + b for a, b in zip(left2, other)]):
        ax.text(total + 0.1, yi, f"{s}/{total}", va="center", fontsize=8, color=PALETTE["ink"])
    ax.set_yticks(y)
    ax.set_yticklabels(methods, fontsize=8)
    ax.set_xlabel("tasks")
    ax.set_xlim(0, max(1, max(a + b for a, b in zip(left2, other))) * 1.15)
    for side in ("top", "right"):
        ax.spines[side].set_visible(False)
    ax.legend(fontsize=7, frameon=False, loc="upper center", bbox_to_anchor=(0.5, -0.2), ncol=3)
    ax.set_title(f"solved per method{f' - {parameter}' if parameter else ''}", fontsize=10)
    return ax
