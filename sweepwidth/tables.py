"""Plain-text tables of results: the one formatter behind ``solve``, ``demo`` and ``bench``.

Every table of results has the columns of :data:`RESULT_COLUMNS` (or a
subset, in that order); numbers are written by :func:`number` (whole values
without a decimal point, others with six significant digits, never a numpy
repr) and seconds by :func:`seconds` (always two decimals).  A
:class:`StreamTable` prints rows as they arrive, with column widths fixed up
front, so that a long run shows its finished rows at once.

Examples
--------
>>> print(format_table([["a", 1.0, None]], ["instance", "value", "lower"]))
instance  value  lower
--------  -----  -----
a         1      -
"""

from __future__ import annotations

import math
from typing import Any, Callable, Iterable, Sequence

__all__ = ["RESULT_COLUMNS", "number", "seconds", "size", "plain", "cell", "format_table", "StreamTable"]

#: the columns of every table of results, in this order (tables may omit some)
RESULT_COLUMNS = ("instance", "parameter", "status", "value", "lower", "upper", "method", "seconds", "checked", "note")

#: widths reserved up front for streamed tables (a longer cell just pushes its line)
_MIN_WIDTH = {"parameter": 9, "status": 11, "value": 5, "lower": 5, "upper": 5, "method": 18, "seconds": 7, "checked": 8}


def number(x: Any) -> str:
    """A number as a table shows it: ``-`` for None, ``12`` for 12.0, else six significant digits.

    Examples
    --------
    >>> import numpy as np
    >>> number(np.float64(0.0)), number(2.5), number(None), number(float("inf"))
    ('0', '2.5', '-', 'inf')
    """
    if x is None:
        return "-"
    if isinstance(x, str):
        return x
    try:
        f = float(x)
    except (TypeError, ValueError):
        return str(x)
    if math.isnan(f):
        return "nan"
    if math.isinf(f):
        return "inf" if f > 0 else "-inf"
    if f.is_integer() and abs(f) < 1e15:
        return str(int(f))
    return f"{f:.6g}"


def plain(x: Any) -> str:
    """A value for a message: its repr, with numpy scalars written as the Python number they hold.

    Examples
    --------
    >>> import numpy as np
    >>> plain(np.float64(-1.5)), plain("x"), plain(np.int64(3))
    ('-1.5', "'x'", '3')
    """
    item = getattr(x, "item", None)
    if callable(item) and type(x).__module__ == "numpy":
        try:
            return repr(item())
        except (TypeError, ValueError):
            pass
    return repr(x)


def size(nbytes: float) -> str:
    """A memory size in plain words: MiB or GiB with a few digits, powers of ten beyond a million GiB.

    Examples
    --------
    >>> size(3 * 2**20), size(5.5 * 2**30), size(16 * 2**400)
    ('3 MiB', '5.5 GiB', '3.8e+112 GiB')
    """
    x = float(nbytes)
    if x < 2**30:
        return f"{x / 2**20:.0f} MiB"
    g = x / 2**30
    return f"{g:.3g} GiB" if g < 1e6 else f"{g:.1e} GiB"


def seconds(x: Any) -> str:
    """Seconds with two decimals (``-`` when unknown).

    Examples
    --------
    >>> seconds(0), seconds(1.234), seconds(None)
    ('0.00', '1.23', '-')
    """
    if x is None:
        return "-"
    try:
        return f"{float(x):.2f}"
    except (TypeError, ValueError):
        return str(x)


def cell(column: str, x: Any) -> str:
    """The text of value ``x`` in ``column`` (seconds, numbers, or text)."""
    if column in ("seconds", "median seconds", "median_s", "median_solved_s"):
        return seconds(x)
    if x is None:
        return "-" if column not in ("note",) else ""
    if isinstance(x, str):
        return x
    if isinstance(x, bool):
        return "yes" if x else "no"
    return number(x)


def _line(cells: Sequence[str], widths: Sequence[int]) -> str:
    return "  ".join(c.ljust(w) for c, w in zip(cells, widths)).rstrip()


def format_table(rows: Iterable[Sequence[Any]], headers: Sequence[str], kinds: Sequence[str] | None = None) -> str:
    """A table: a header line, a rule, one line per row (cells formatted by :func:`cell`).

    ``kinds`` names the column of each cell for formatting when the headers
    are other words (default: the headers).
    """
    names = list(kinds or headers)
    texts = [[cell(h, x) for h, x in zip(names, r)] for r in rows]
    widths = [max([len(h)] + [len(r[i]) for r in texts]) for i, h in enumerate(headers)]
    lines = [_line(list(headers), widths), "  ".join("-" * w for w in widths)]
    lines += [_line(r, widths) for r in texts]
    return "\n".join(lines)


class StreamTable:
    """A table printed row by row: the header with the first row, widths fixed up front.

    Parameters
    ----------
    headers : sequence of str
    write : callable
        Called with each line.
    widths : dict, optional
        Width of some columns (e.g. the longest instance name); the others
        get a width that fits their usual values.

    Examples
    --------
    >>> t = StreamTable(["instance", "status"], print, widths={"instance": 4})
    >>> t.row(["a", "optimal"])
    instance  status
    --------  -----------
    a         optimal
    """

    def __init__(self, headers: Sequence[str], write: Callable[[str], None], widths: dict[str, int] | None = None) -> None:
        self.headers = list(headers)
        self.write = write
        given = widths or {}
        self.widths = [max(len(h), given.get(h, 0), _MIN_WIDTH.get(h, 0)) for h in self.headers]
        self.started = False

    def header(self) -> None:
        if not self.started:
            self.started = True
            self.write(_line(self.headers, self.widths))
            self.write("  ".join("-" * w for w in self.widths))

    def row(self, values: Sequence[Any]) -> None:
        self.header()
        self.write(_line([cell(h, x) for h, x in zip(self.headers, values)], self.widths))
