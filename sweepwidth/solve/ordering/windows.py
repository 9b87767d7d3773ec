"""Improving a cutwidth ordering by exact re-arrangement of windows of consecutive positions.

Definition
----------
Given an ordering and a window of ``w`` consecutive positions ``s .. s+w-1``,
the vertices before the window (``A``) and after it (``B``) stay where they
are.  The cut after ``A`` plus a set ``X`` of window vertices is::

    cut(A + X) = cut(A) + sum_{x in X} (d_B(x) - d_A(x) + d_W(x)) - 2 w(E(X))

(``d_A(x)``: weight from ``x`` into ``A``, ``W`` the window), so every
arrangement of the window is a chain of subsets and the best one is found by
dynamic programming over the ``2^w`` subsets of the window, exactly as the
subset DP of the whole graph but with the outside fixed.  The objective,
additive over the ``w - 1`` gaps inside the window, forbids any cut above the
current width ``T``, charges a large constant for every cut at ``T`` and adds
the squared cut of every gap; a window is re-arranged only when that cost
drops strictly.  The counted cuts outside the window do not change, so the
number of gaps at the width never grows and the width never rises; when the
last gap at ``T`` disappears the width has dropped and ``T`` follows it.
Windows slide over the ordering (half a window apart with a random offset,
then one apart) until a whole pass changes nothing or time is up.

Complexity
----------
``O(2^w w)`` time and ``17 * 2^w`` bytes per window (``w = 14``: about
0.3 MB and a fraction of a millisecond compiled); a pass over ``n``
positions with step ``w / 2`` costs ``O(n 2^w)``.

References
----------
.. [1] H. L. Bodlaender, F. V. Fomin, A. M. C. A. Koster, D. Kratsch and
   D. M. Thilikos, "A note on exact algorithms for vertex ordering problems
   on graphs", Theory of Computing Systems 50 (2012) -- the subset
   recurrence used inside each window.
"""

from __future__ import annotations

import math
import time
from typing import Callable, Sequence

import numpy as np

from ...errors import InvalidArgumentError, SweepwidthError
from ...problems.ordering import OrderingProblem
from . import kernels

__all__ = ["improve_windows", "pinned_order", "MergedPins", "window_for"]

#: callback type: ``on_improve(width, order)``
OnImprove = Callable[[float, list], None]

_MAX_WINDOW = 22  # 2^22 states: 70 MB of tables, about 0.5 s per window


def pinned_order(problem: OrderingProblem, order: Sequence[int]) -> list[int]:
    """``order`` with the pinned first vertices moved to the front and the last ones to the end."""
    F, L = problem.first, problem.last
    order = [int(v) for v in order]
    if sorted(order) != list(range(problem.n)):
        raise InvalidArgumentError(f"an ordering must list each of the {problem.n} vertices 0..{problem.n - 1} once")
    if not F and not L:
        return order
    return [v for v in order if v in F] + [v for v in order if v not in F and v not in L] + [v for v in order if v in L]


class MergedPins:
    """A problem with its pinned sets merged (at most one first and one last vertex), and the way back."""

    def __init__(self, problem: OrderingProblem) -> None:
        C = problem.contract_pins()
        self.original = problem
        self.problem = C.problem
        self._C = C
        self.index = np.empty(problem.n, dtype=np.int64)
        for i, g in enumerate(C.groups):
            for v in g:
                self.index[v] = i

    def down(self, order: Sequence[int]) -> np.ndarray:
        """An ordering of the merged problem from one of the original (pins are put in place)."""
        order = pinned_order(self.original, order)
        seen = np.zeros(self.problem.n, dtype=bool)
        out = []
        for v in order:
            i = int(self.index[v])
            if not seen[i]:
                seen[i] = True
                out.append(i)
        return pinned_order(self.problem, out)  # type: ignore[return-value]

    def up(self, order: Sequence[int]) -> list[int]:
        return self._C.expand([int(v) for v in order])


def _check_window(window: int) -> None:
    if isinstance(window, bool) or not isinstance(window, (int, np.integer)) or not 2 <= window <= _MAX_WINDOW:
        raise InvalidArgumentError(f"window must be an integer in 2..{_MAX_WINDOW}, got {window!r}")


def _run(
    Q: OrderingProblem,
    arr: np.ndarray,
    deadline: float | None,
    window: int,
    rng: np.random.Generator,
    report: Callable[[float, np.ndarray], None] | None,
    max_passes: int | None = None,
    smallest: int = 8,
) -> float:
    """Window passes on the merged problem ``Q``, ``arr`` changed in place; returns the width.

    The window grows from ``smallest`` to ``window`` in steps of two, each size
    running until a pass changes nothing (windows of more than 14 positions
    slide half a window apart only: a pass one apart would cost too much).
    """
    n = Q.n
    nf, nl = len(Q.first), len(Q.last)
    lo, hi = nf, n - nl  # counted gaps are after lo .. hi vertices; movable positions lo .. hi-1
    indptr, indices, wts = Q.csr()
    prof, pos = kernels.profile(arr, indptr, indices, wts)
    if hi <= lo:
        return 0.0
    width = float(prof[lo : hi + 1].max())
    top = min(window, hi - lo)
    if top < 2 or Q.m == 0:
        return width
    tol = 1e-9 * max(1.0, float(Q.weights.max()))
    sizes = list(range(min(smallest, top), top + 1, 2))
    if sizes[-1] != top:
        sizes.append(top)
    passes = 0
    for w in sizes:
        per_window = float(1 << w) * w * 4e-9 + 2e-6
        batch = max(1, int(0.05 / per_window))
        step = max(1, w // 2)
        quiet_big = False
        while True:
            if deadline is not None and time.monotonic() > deadline:
                return width
            if max_passes is not None and passes >= max_passes:
                return width
            passes += 1
            last = hi - w
            if step > 1:
                off = int(rng.integers(step))
                starts = list(range(lo + off, last + 1, step))
                if not starts or starts[-1] != last:
                    starts.append(last)
                if lo + off != lo:
                    starts.insert(0, lo)
            else:
                starts = list(range(lo, last + 1))
            # windows over the gaps at the width first
            at = np.flatnonzero(prof[lo + 1 : hi] >= width - tol) + lo + 1
            focus = [min(max(lo, int(g) - w // 2), last) for g in at[:: max(1, len(at) // 64)]]
            seq = np.array(focus + starts, dtype=np.int64)
            changed = 0
            for b in range(0, len(seq), batch):
                if deadline is not None and time.monotonic() > deadline:
                    break
                changed += kernels.window_pass(arr, pos, prof, indptr, indices, wts, seq[b : b + batch], w, width, tol)
                now = float(prof[lo : hi + 1].max())
                if now < width - tol:
                    width = now
                    if report is not None:
                        report(width, arr)
            if changed == 0:
                if step == 1 or quiet_big or w > 14:
                    break
                quiet_big = True
                step = 1
            else:
                quiet_big = False
                step = max(1, w // 2)
    return width


def improve_windows(
    problem: OrderingProblem,
    order: Sequence[int],
    deadline: float | None = None,
    *,
    window: int = 14,
    seed: int | None = None,
    on_improve: OnImprove | None = None,
    max_passes: int | None = None,
) -> tuple[float, list[int]]:
    """Improve an ordering by exact re-arrangement of sliding windows (see the module notes).

    Parameters
    ----------
    problem : OrderingProblem
        Any pinned sets (they are merged internally and stay at the ends).
    order : sequence of int
        An ordering of ``0..n-1``; pinned vertices are first moved to their ends.
    deadline : float, optional
        ``time.monotonic()`` value at which to stop (checked about every 0.05 s).
    window : int
        Largest number of positions per window, 2..22 (``2^window`` subsets
        per window); the windows grow from 8 positions to this size.
    seed : int, optional
        Offsets of the passes.
    on_improve : callable, optional
        Called as ``on_improve(width, order)`` each time the width drops, with
        the new width (recomputed on ``problem``) and a copy of the ordering.
    max_passes : int, optional
        Stop after that many passes.

    Returns
    -------
    (width, order)
        ``width == problem.width(order)``, never more than the width of the
        input ``order`` (with its pins put in place).

    Raises
    ------
    SweepwidthError
        ``order`` is not an ordering of the vertices, or ``window`` is out of range.

    Examples
    --------
    >>> import networkx as nx
    >>> P = OrderingProblem.from_graph(nx.cycle_graph(10))
    >>> improve_windows(P, [0, 5, 1, 6, 2, 7, 3, 8, 4, 9], window=10)[0]
    2.0
    """
    _check_window(window)
    K = MergedPins(problem)
    Q = K.problem
    start = pinned_order(problem, order)
    w0 = problem.width(start)
    arr = np.asarray(K.down(start), dtype=np.int64)
    rng = np.random.default_rng(seed)
    best = [w0]

    def report(width: float, a: np.ndarray) -> None:
        o = K.up(a.tolist())
        wv = problem.width(o)
        if wv < best[0]:
            best[0] = wv
            if on_improve is not None:
                on_improve(wv, o)

    _run(Q, arr, deadline, int(window), rng, report, max_passes)
    out = K.up(arr.tolist())
    wo = problem.width(out)
    if wo > w0:  # cannot happen (no window accepts a cut above the width); kept as a guard
        return w0, start
    return wo, out


def window_for(n: int) -> int:
    """The largest window for ``n`` positions: a pass half a window apart stays near a second."""
    return int(max(10, min(18, math.floor(math.log2(max(2.0, 4e9 / max(1, n) / 16))))))
