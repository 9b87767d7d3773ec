"""Summaries of benchmark rows: counts per status and median seconds per parameter and method."""

from __future__ import annotations

import statistics
from typing import Any, Iterable, Mapping

__all__ = ["summarize", "format_table", "verdict"]

SOLVED = ("optimal", "infeasible")
FAILED = ("timeout", "memory", "error")


def verdict(row: Mapping[str, Any], known: Mapping[str, Any] | None) -> str:
    """Compare a row's bounds with a known value: 'agrees', 'CONFLICT' or '' (nothing known).

    A row conflicts when its proven lower bound exceeds the known value (or
    known upper bound) or its upper bound falls below the known value (or
    known lower bound).

    Examples
    --------
    >>> verdict({"lower": 3, "upper": 3}, {"value": 3})
    'agrees'
    >>> verdict({"lower": 4, "upper": 5}, {"value": 3})
    'CONFLICT'
    """
    if not known:
        return ""
    lo_k = known.get("value", known.get("lower"))
    hi_k = known.get("value", known.get("upper"))
    lo, hi = row.get("lower"), row.get("upper")
    if lo is None and hi is None:
        return ""
    eps = 1e-9
    try:
        if lo is not None and hi_k is not None and float(lo) > float(hi_k) + eps:
            return "CONFLICT"
        if hi is not None and lo_k is not None and float(hi) < float(lo_k) - eps:
            return "CONFLICT"
    except (TypeError, ValueError):
        return ""
    return "agrees"


def summarize(rows: Iterable[Mapping[str, Any]]) -> list[dict]:
    """One line per (parameter, method): tasks, solved, bounded, failed, contradicted (a known value), median seconds.

    Examples
    --------
    >>> s = summarize([{"parameter": "cutwidth", "method": "auto", "status": "optimal", "seconds": 1.0},
    ...                {"parameter": "cutwidth", "method": "auto", "status": "timeout", "seconds": 3.0}])
    >>> s[0]["solved"], s[0]["failed"], s[0]["median_s"]
    (1, 1, 2.0)
    """
    groups: dict[tuple[str, str], list[Mapping[str, Any]]] = {}
    for r in rows:
        groups.setdefault((str(r.get("parameter")), str(r.get("method"))), []).append(r)
    out = []
    for (p, m), rs in sorted(groups.items()):
        secs = [float(r["seconds"]) for r in rs if r.get("seconds") is not None]
        solved_secs = [float(r["seconds"]) for r in rs if r.get("status") in SOLVED and r.get("seconds") is not None]
        out.append(
            {
                "parameter": p,
                "method": m,
                "tasks": len(rs),
                "solved": sum(r.get("status") in SOLVED for r in rs),
                "bounded": sum(r.get("status") == "bounded" for r in rs),
                "failed": sum(r.get("status") in FAILED for r in rs),
                "contradicted": sum(r.get("verdict") == "CONFLICT" for r in rs),
                "refused": sum(bool(r.get("message", "") and str(r.get("message")).startswith("witness refused")) for r in rs),
                "median_s": statistics.median(secs) if secs else None,
                "median_solved_s": statistics.median(solved_secs) if solved_secs else None,
            }
        )
    return out


def format_table(rows: Iterable[Mapping[str, Any]], columns: list[str], headers: list[str] | None = None) -> str:
    """Plain-text table of dict rows, by :func:`sweepwidth.tables.format_table` (the one table formatter).

    Examples
    --------
    >>> print(format_table([{"a": 1, "b": "x"}], ["a", "b"]))
    a  b
    -  -
    1  x
    """
    from ..tables import format_table as table

    return table([[r.get(c) for c in columns] for r in rows], headers or columns, kinds=columns)
