"""Multi-start local search for cutwidth orderings: constructions, window re-optimisation, kicks.

The search, all under one deadline:

1. *Starts*: the given orderings, else the constructions of
   :mod:`sweepwidth.solve.ordering.heuristics` (level, two-source, spectral
   and greedy orderings) from several spread vertices, the pinned ends first.
2. *Descent* of each start: passes of best single-vertex moves, then window
   re-optimisation (:mod:`.windows`); the best few starts are kept.
3. *Kicks* (iterated local search): a random stretch of the current ordering
   is shuffled, reversed or moved (stretches around the gaps at the width
   are chosen more often); the windows around it are re-optimised with the
   current width as the threshold (so they repair the stretch when they can);
   the result is kept when it has a smaller width, or the same width and no
   more gaps at it, and undone otherwise.  Every few hundred kicks the whole
   ordering gets a pass with a larger window and a pass of vertex moves.

Every improvement of the best width is reported at once through
``on_improve(width, order)``, so a caller stopped by a time limit keeps it.

References
----------
.. [1] H. R. Lourenco, O. C. Martin and T. Stuetzle, "Iterated local
   search", in Handbook of Metaheuristics, Springer, 2003 -- the kick and
   repair scheme.
.. [2] H. L. Bodlaender, F. V. Fomin, A. M. C. A. Koster, D. Kratsch and
   D. M. Thilikos, "A note on exact algorithms for vertex ordering problems
   on graphs", Theory of Computing Systems 50 (2012) -- the subset
   recurrence inside windows.
"""

from __future__ import annotations

import time
from typing import Any, Sequence

import numpy as np

from ...problems.ordering import OrderingProblem
from . import kernels
from .windows import MergedPins, OnImprove, _check_window, _run, pinned_order, window_for

__all__ = ["search_orderings", "start_orderings"]


def start_orderings(problem: OrderingProblem, *, seed: int | None = None, count: int = 6, deadline: float | None = None) -> list[list[int]]:
    """Constructed orderings to start from (pins in place), the best construction first.

    Uses the public constructions of :mod:`sweepwidth.solve.ordering.heuristics`.

    Examples
    --------
    >>> import networkx as nx
    >>> P = OrderingProblem.from_graph(nx.path_graph(6))
    >>> len(start_orderings(P, seed=0)) >= 1
    True
    """
    from .heuristics import greedy_ordering, heuristic_ordering, level_ordering, two_source_ordering

    n = problem.n
    if n <= 1:
        return [list(range(n))]
    K = MergedPins(problem)
    Q = K.problem
    _, best, _ = heuristic_ordering(Q, seed=seed, deadline=deadline, improve=False)
    out = [best]
    rng = np.random.default_rng(seed)
    anchors: list[int] = sorted(Q.first) + sorted(Q.last)
    anchors += [int(x) for x in rng.choice(Q.n, size=min(Q.n, count), replace=False) if int(x) not in anchors]
    for p in anchors[:count]:
        if deadline is not None and time.monotonic() > deadline:
            break
        lv = level_ordering(Q, p)
        out.append(lv)
        out.append(greedy_ordering(Q, lv))
    if Q.first and Q.last:
        a, b = next(iter(Q.first)), next(iter(Q.last))
        out.append(two_source_ordering(Q, a, b))
    seen: set[tuple[int, ...]] = set()
    uniq = []
    for o in out:
        t = tuple(o)
        if t not in seen:
            seen.add(t)
            uniq.append(K.up(pinned_order(Q, o)))
    return uniq


class _State:
    """The current ordering of the merged problem with its cut profile."""

    def __init__(self, Q: OrderingProblem, arr: np.ndarray) -> None:
        self.Q = Q
        self.indptr, self.indices, self.wts = Q.csr()
        self.lo = len(Q.first)
        self.hi = Q.n - len(Q.last)
        self.tol = 1e-9 * max(1.0, float(Q.weights.max())) if Q.m else 1e-9
        self.accepted = 0  # kicks kept
        self.set(arr)

    def set(self, arr: np.ndarray) -> None:
        self.arr = np.asarray(arr, dtype=np.int64).copy()
        self.prof, self.pos = kernels.profile(self.arr, self.indptr, self.indices, self.wts)

    def key(self) -> tuple[float, int]:
        c = self.prof[self.lo : self.hi + 1]
        w = float(c.max()) if c.shape[0] else 0.0
        return w, int(np.count_nonzero(c >= w - self.tol))


def search_orderings(
    problem: OrderingProblem,
    deadline: float,
    *,
    start_orders: Sequence[Sequence[int]] | None = None,
    seed: int | None = None,
    on_improve: OnImprove | None = None,
    window: int | None = None,
    target: float | None = None,
    keep: int = 2,
) -> tuple[float, list[int], dict[str, Any]]:
    """Multi-start local search until ``deadline`` (see the module notes).

    Parameters
    ----------
    problem : OrderingProblem
        Any pinned sets (merged internally; they stay at the ends).
    deadline : float
        ``time.monotonic()`` value; the search returns within about 0.1 s of it.
    start_orders : sequence of orderings, optional
        Orderings of ``0..n-1`` to start from; default :func:`start_orderings`.
    seed : int, optional
        Makes the search reproducible (for a fixed amount of work).
    on_improve : callable, optional
        ``on_improve(width, order)`` each time the best width drops (the first
        call reports the best start after its descent).
    window : int, optional
        Window size of the re-optimisation (default from the size of the graph).
    target : float, optional
        A proven lower bound: stop as soon as an ordering of that width is found.
    keep : int
        Number of descended starts that take turns in the kick phase.

    Returns
    -------
    (width, order, stats)
        ``width == problem.width(order)``; ``order`` respects the pins;
        ``stats`` counts starts, kicks and accepted kicks.

    Examples
    --------
    >>> import networkx as nx, time
    >>> P = OrderingProblem.from_graph(nx.grid_2d_graph(5, 5))
    >>> search_orderings(P, time.monotonic() + 1.0, seed=0, target=6)[0]
    6.0
    """
    n = problem.n
    if n <= 1 or problem.m == 0:
        o = pinned_order(problem, start_orders[0] if start_orders else list(range(n)))
        return problem.width(o), o, {"starts": 1}
    K = MergedPins(problem)
    Q = K.problem
    w = window if window is not None else window_for(Q.n)
    _check_window(w)
    wk = min(w, 12)  # kicks repair with small windows: many kicks per second
    rng = np.random.default_rng(seed)
    stats: dict[str, Any] = {"window": int(w), "starts": 0, "kicks": 0, "accepted": 0, "improvements": 0}
    best: list[Any] = [np.inf, None]

    def offer(a: np.ndarray) -> None:
        o = K.up(a.tolist())
        wv = problem.width(o)
        if wv < best[0] - 1e-12:
            best[0], best[1] = wv, o
            stats["improvements"] += 1
            if on_improve is not None:
                on_improve(wv, list(o))

    def done() -> bool:
        return time.monotonic() > deadline or (target is not None and best[0] <= target + 1e-9)

    from .heuristics import improve_ordering

    starts = [pinned_order(problem, o) for o in start_orders] if start_orders else None
    if starts is None:
        starts = start_orderings(problem, seed=int(rng.integers(2**31)), deadline=time.monotonic() + 0.2 * (deadline - time.monotonic()))
    for o in starts[:1]:
        offer(np.asarray(K.down(o), dtype=np.int64))
    pool: list[tuple[tuple[float, int], np.ndarray]] = []
    share = 0.3 * max(0.0, deadline - time.monotonic()) / max(1, len(starts))
    for o in starts:
        if done():
            break
        stats["starts"] += 1
        sub = min(deadline, time.monotonic() + share)
        a = np.asarray(K.down(o), dtype=np.int64)
        a = np.asarray(improve_ordering(Q, a.tolist(), deadline=sub, seed=int(rng.integers(2**31))), dtype=np.int64)
        _run(Q, a, sub, w, rng, None)
        offer(a)
        st = _State(Q, a)
        pool.append((st.key(), st.arr))
    pool.sort(key=lambda t: t[0])
    pool = pool[: max(1, keep)]
    if not pool:
        return float(best[0]), list(best[1]), stats
    states = [_State(Q, a) for _, a in pool]
    turn = 0
    lo, hi = states[0].lo, states[0].hi
    span = hi - lo
    kicks_since = 0
    while not done() and span >= 3:
        st = states[turn % len(states)]
        turn += 1
        for _ in range(50):
            if done():
                break
            _kick(st, wk, rng)
            stats["kicks"] += 1
            kicks_since += 1
            if st.key()[0] < best[0] - 1e-9:
                offer(st.arr)
        if done():
            break
        if kicks_since >= 400:
            kicks_since = 0
            # a wider window and vertex moves over the whole ordering
            big = min(w, span)
            a = st.arr.copy()
            _run(Q, a, min(deadline, time.monotonic() + 0.1 * max(0.0, deadline - time.monotonic())), big, rng, None, max_passes=2)
            a = np.asarray(improve_ordering(Q, a.tolist(), deadline=deadline, max_passes=3, seed=int(rng.integers(2**31))), dtype=np.int64)
            old = st.key()
            cand = _State(Q, a)
            if cand.key() <= old:
                st.set(cand.arr)
            if st.key()[0] < best[0] - 1e-9:
                offer(st.arr)
    stats["accepted"] = sum(s.accepted for s in states)
    return float(best[0]), list(best[1]), stats


def _kick(st: _State, w: int, rng: np.random.Generator) -> None:
    """One kick: perturb a stretch, repair the windows around it, keep or undo."""
    lo, hi = st.lo, st.hi
    span = hi - lo
    old_key = st.key()
    T = old_key[0]
    saved_arr, saved_prof, saved_pos = st.arr.copy(), st.prof.copy(), st.pos.copy()
    # where: around a gap at the width (often) or anywhere
    if rng.random() < 0.6:
        at = np.flatnonzero(st.prof[lo + 1 : hi] >= T - st.tol) + lo + 1
        centre = int(at[rng.integers(at.shape[0])]) if at.shape[0] else int(rng.integers(lo, hi))
    else:
        centre = int(rng.integers(lo, hi))
    L = int(rng.integers(3, max(4, min(span, 2 * w))))
    a = min(max(lo, centre - L // 2), hi - L)
    b = a + L
    kind = rng.random()
    seg = st.arr[a:b].copy()
    if kind < 0.4:
        # shuffle a short piece
        k = min(L, max(3, w // 2))
        i = a + int(rng.integers(0, L - k + 1))
        piece = st.arr[i : i + k].copy()
        rng.shuffle(piece)
        st.arr[i : i + k] = piece
    elif kind < 0.7:
        st.arr[a:b] = seg[::-1]
    else:
        # move a block of the stretch to its other end
        k = int(rng.integers(1, max(2, L // 2)))
        st.arr[a:b] = np.concatenate([seg[k:], seg[:k]]) if rng.random() < 0.5 else np.concatenate([seg[-k:], seg[:-k]])
    st.prof, st.pos = kernels.profile(st.arr, st.indptr, st.indices, st.wts)
    ww = min(w, span)
    s0 = max(lo, a - ww + 1)
    s1 = min(hi - ww, b - 1)
    if s1 >= s0:
        step = max(1, ww // 3)
        for r in range(3):
            starts = np.arange(s0 + (r % step), s1 + 1, step, dtype=np.int64)
            if starts.shape[0] == 0:
                starts = np.array([s0], dtype=np.int64)
            ch = kernels.window_pass(st.arr, st.pos, st.prof, st.indptr, st.indices, st.wts, starts, ww, T, st.tol)
            if ch == 0 and r > 0:
                break
    # the profile was kept up to date by the windows; recompute to avoid drift
    st.prof, st.pos = kernels.profile(st.arr, st.indptr, st.indices, st.wts)
    new_key = st.key()
    if new_key <= old_key:
        st.accepted += 1
        return
    st.arr, st.prof, st.pos = saved_arr, saved_prof, saved_pos
