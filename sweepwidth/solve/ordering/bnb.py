"""Exact cutwidth by depth-first search over ordering prefixes.

The search answers "is there an ordering of width at most ``k``?" for a
rising sequence of thresholds ``k``.  A state is the *set* of vertices placed
so far (an int bitmask): two prefixes with the same set have the same future,
so a set from which the search failed is remembered and never expanded again.

Reductions, each proven to keep some optimal ordering:

* **free moves** -- if adding ``v`` to the prefix ``S`` does not raise the
  cut, ``v`` is added at once without branching.  By submodularity of the cut
  function, ``cut(S + P + v) <= cut(S + P) + cut(S + v) - cut(S) <= cut(S + P)``
  for every later prefix ``S + P``, so moving ``v`` forward never hurts.
* **twins** -- vertices with the same weighted neighbourhood are
  interchangeable; only the first unplaced one of each class is tried.
* **threshold jumps** -- when the search for ``k`` fails, every ordering has a
  cut at least the smallest cut value that the search rejected, which is the
  next threshold (and a proven lower bound).  This also makes real weights
  exact without any scaling.

The search runs compiled (:func:`sweepwidth.solve.ordering.kernels.prefix_search`,
failed sets in an open-addressing table of bitmask words) when numba is
available, in slices of a node budget so the time limit is checked between
slices; a slice restarts from the empty prefix but keeps the failed sets, so
little work is repeated.  Without numba a Python version (sets of ints) runs.
The table starts small and doubles (rehashing) when half full.  Timings:
``benchmarks/cutwidth_core.py`` (last run in ``benchmarks/NOTES.md``).
"""

from __future__ import annotations

import sys
import time
from typing import Any

import numpy as np

from ...problems.ordering import OrderingProblem
from . import kernels as _kernels

#: memory cap of the compiled search's table of failed sets, bytes
_TABLE_BYTES = 2048 << 20

__all__ = ["solve_bnb", "BnbOutcome", "states_for_memory"]


def states_for_memory(n: int, max_memory: float) -> int:
    """How many failed sets the prefix-set search of an ``n``-vertex problem keeps in ``max_memory`` bytes.

    The compiled search's table holds a set in ``8 * ceil(n / 64) + 1`` bytes and
    is kept at most half full, so a cap of ``s`` states takes about
    ``2 * s * (8 * ceil(n / 64) + 1)`` bytes (and never more than the table's own
    cap, :data:`_TABLE_BYTES`).

    >>> states_for_memory(242, 1 << 30)    # 4 words a set: 16 M states in 1 GiB
    16268815
    """
    per_slot = 8 * ((int(n) + 63) // 64) + 1
    budget = min(float(max_memory), float(_TABLE_BYTES))
    return max(1024, int(budget // (2 * per_slot)))


class _OutOfTime(Exception):
    pass


class BnbOutcome:
    """Bounds and best ordering of a (possibly interrupted) search."""

    __slots__ = ("lower", "upper", "order", "optimal", "stats")

    def __init__(self, lower: float, upper: float, order: list[int], optimal: bool, stats: dict) -> None:
        self.lower, self.upper, self.order, self.optimal, self.stats = lower, upper, order, optimal, stats

    def __repr__(self) -> str:
        return f"BnbOutcome(lower={self.lower}, upper={self.upper}, optimal={self.optimal})"


def _twin_classes(problem: OrderingProblem) -> np.ndarray:
    """``rep[v]``: the smallest vertex interchangeable with ``v``.

    Open twins have equal weighted neighbourhoods; closed twins are adjacent
    and have equal weighted neighbourhoods apart from each other.  Pinned
    vertices are never twins.
    """
    n = problem.n
    rep = np.arange(n)
    indptr, indices, wts = problem.csr()
    pinned = problem.first | problem.last
    ilist, wlist = indices.tolist(), wts.tolist()
    rows = []
    for v in range(n):
        lo, hi = int(indptr[v]), int(indptr[v + 1])
        rows.append(dict(zip(ilist[lo:hi], wlist[lo:hi])))
    open_key: dict = {}
    closed_key: dict = {}
    for v in range(n):
        if v in pinned:
            continue
        row = rows[v]
        ok = tuple(sorted(row.items()))
        if ok in open_key:
            rep[v] = open_key[ok]
            continue
        open_key[ok] = v
        # closed twins u < v: N[u] - {v} = N[v] - {u} with equal weights; group by
        # the closed neighbourhood's vertex set and weight multiset
        ck = (tuple(sorted(set(row) | {v})), tuple(sorted(row.values())))
        u = closed_key.get(ck)
        if u is not None and v in rows[u]:
            a_ = {x: y for x, y in rows[u].items() if x != v}
            b_ = {x: y for x, y in row.items() if x != u}
            if a_ == b_:
                rep[v] = u
                continue
        closed_key.setdefault(ck, v)
    return rep


def solve_bnb(
    problem: OrderingProblem,
    *,
    lower: float = 0.0,
    upper: float | None = None,
    upper_order: list[int] | None = None,
    deadline: float | None = None,
    max_states: int = 4_000_000,
    force_python: bool = False,
    symmetry: bool = False,
) -> BnbOutcome:
    """Exact (pinned) cutwidth by threshold search over prefix sets.

    Parameters
    ----------
    problem : OrderingProblem
        At most one first and one last vertex (``contract_pins`` first).
    lower : float
        A proven lower bound to start from.
    upper, upper_order : optional
        A known ordering and its width; the search stops when a threshold
        reaches it.  Without one, the identity ordering (pins respected) is used.
    deadline : float, optional
        ``time.monotonic()`` value; the search returns its bounds there.
    max_states : int
        Remembered failed sets before the search gives up (bounded result).
    force_python : bool
        Use the pure Python search even when the compiled one is available
        (the two cross-check each other in the tests).
    symmetry : bool
        Break the reversal symmetry in the compiled search (problems without
        pins): the vertex of largest degree is kept in the second half.  Off
        by default: the chosen vertex may no longer move for free, which can
        cost more than the symmetry saves (``benchmarks/NOTES.md``).

    Returns
    -------
    BnbOutcome
        ``lower``, ``upper``, ``order`` (of width ``upper``), ``optimal``,
        ``stats`` (thresholds tried, states expanded, states remembered).

    Notes
    -----
    Worst case ``O(2^n n)`` like the subset DP, but only sets with cuts below
    the threshold are reached, which on sparse graphs of small cutwidth is a
    tiny fraction.  Works on disconnected graphs and real weights.

    References
    ----------
    .. [1] Martí, Pantrigo, Duarte and Pardo, "Branch and bound for the cutwidth
       minimization problem", Computers & Operations Research 40 (2013): plain
       branch and bound over prefixes; the threshold search and the state memory
       used here replace its bounding rules.

    Examples
    --------
    >>> import networkx as nx
    >>> out = solve_bnb(OrderingProblem.from_graph(nx.grid_2d_graph(4, 4)))
    >>> out.upper, out.optimal
    (5.0, True)
    """
    if len(problem.first) > 1 or len(problem.last) > 1:
        raise ValueError("solve_bnb needs pinned sets of at most one vertex; call contract_pins() first")
    t0 = time.perf_counter()
    n = problem.n
    a = next(iter(problem.first)) if problem.first else None
    b = next(iter(problem.last)) if problem.last else None
    if upper_order is None:
        mid = [v for v in range(n) if v != a and v != b]
        upper_order = ([a] if a is not None else []) + mid + ([b] if b is not None else [])
    best_order = list(upper_order)
    best = problem.width(best_order)
    if upper is not None and upper < best - 1e-12:
        raise ValueError("upper does not match the width of upper_order")
    stats: dict[str, Any] = {"thresholds": [], "expanded": 0, "remembered": 0}
    if n <= 1 or problem.m == 0:
        return BnbOutcome(best, best, best_order, True, stats)
    integral = problem.integral
    tol = 1e-9 * max(1.0, float(problem.weights.max()))
    deg = problem.degrees()
    indptr, indices, wts = problem.csr()
    nbr = [indices[indptr[v] : indptr[v + 1]] for v in range(n)]
    nbw = [wts[indptr[v] : indptr[v + 1]] for v in range(n)]
    rep = _twin_classes(problem) if n <= 20000 else np.arange(n)
    has_twins = bool(np.any(rep != np.arange(n)))
    full = (1 << n) - 1
    goal = full if b is None else full ^ (1 << b)
    final_cut = 0.0 if b is None else float(deg[b])
    inS = np.zeros(n, dtype=bool)
    wS = np.zeros(n)
    counter = [0]
    sys.setrecursionlimit(max(sys.getrecursionlimit(), 4 * n + 100))

    def place(v: int) -> None:
        inS[v] = True
        wS[nbr[v]] += nbw[v]

    def unplace(v: int) -> None:
        inS[v] = False
        wS[nbr[v]] -= nbw[v]

    lb = float(lower)
    if integral:
        lb = float(np.ceil(lb - tol))
    lb = max(lb, 0.0)
    if b is not None:
        lb = max(lb, final_cut)
    if a is not None:
        lb = max(lb, float(deg[a]))

    compiled = _kernels.HAVE_NUMBA and not force_python
    # reversal symmetry (no pins): an ordering and its reverse have the same
    # width, so some optimal ordering puts a chosen vertex x in the second
    # half; free moves keep that (they only shift x later), and x is made its
    # own twin class
    sx, st = -1, 0
    if a is None and b is None and n >= 4 and symmetry:
        sx = int(np.argmax(deg))
        st = n // 2  # = ceil((n - 1) / 2)
        rep = rep.copy()
        if rep[sx] != sx or np.any((rep == sx) & (np.arange(n) != sx)):
            members = np.nonzero(rep == rep[sx])[0]
            others = [int(v) for v in members if v != sx]
            rep[sx] = sx
            if others:
                rep[np.array(others)] = min(others)
        stats["symmetry"] = {"vertex": sx, "from_prefix_size": st}
    rep64 = rep.astype(np.int64)
    stats["engine"] = "compiled" if compiled else "python"
    while compiled and best > lb + tol:
        k = lb
        stats["thresholds"].append(k)
        W = (n + 63) // 64
        cap_max = 1 << max(10, min(int(2 * max_states - 1).bit_length(), n + 1))
        while cap_max > 1024 and cap_max * (8 * W + 1) > _TABLE_BYTES:
            cap_max //= 2
        cap = min(cap_max, 1 << 15)  # grows by rehashing when it fills up
        table = np.zeros((cap, W), dtype=np.uint64)
        used = np.zeros(cap, dtype=np.bool_)
        stored = np.zeros(1, dtype=np.int64)
        rejected: Any = np.inf  # a float here, a one-item list[float] in the threshold loop below
        status = -1
        # a node costs O(n): size the slices so that one lasts well under a second
        budget = max(200, int(2e6 // (n + 10)))
        while status == -1:
            if deadline is not None and time.monotonic() > deadline:
                break
            t_call = time.monotonic()
            status, order_arr, rej, nodes = _kernels.prefix_search(
                n, indptr, indices, wts, deg, -1 if a is None else a, -1 if b is None else b,
                float(k), tol, rep64, table, used, stored, budget, sx, st,
            )
            if status == -2 and cap < cap_max:
                # table half full: double it and carry on (the search restarts, keeping what it learnt)
                table, used = _kernels.memo_grow(table, used)
                cap *= 2
                status = -1
            spent = time.monotonic() - t_call
            counter[0] += int(nodes)
            rejected = min(rejected, float(rej))
            if spent < 0.1:
                budget = min(budget * 2, 20_000_000)
            elif spent > 0.4:
                budget = max(100, budget // 2)
        stats["remembered"] += int(stored[0])
        if status == -1:
            stats["stopped"] = "time limit"
            break
        if status == -2:
            stats["stopped"] = f"more than {cap // 2} remembered states"
            break
        if status == -3:
            stats["stopped"] = "candidate stack of the compiled search full"
            break
        if status == 1:
            order = [int(x) for x in order_arr]
            w = problem.width(order)
            if w < best - tol:
                best, best_order = w, order
            break
        if not np.isfinite(rejected):
            break
        lb = max(lb, float(rejected))

    while not compiled and best > lb + tol:
        k = lb
        failed: set[int] = set()
        rejected = [np.inf]
        path: list[int] = []
        stats["thresholds"].append(k)

        def dfs(S: int, cut: float) -> bool:
            counter[0] += 1
            if counter[0] & 1023 == 0 and deadline is not None and time.monotonic() > deadline:
                raise _OutOfTime
            added: list[int] = []
            # free moves
            while True:
                delta = deg - 2.0 * wS
                free = np.nonzero((~inS) & (delta <= tol))[0]
                if b is not None:
                    free = free[free != b]
                if free.shape[0] == 0:
                    break
                for v in free.tolist():
                    if inS[v]:
                        continue
                    d = deg[v] - 2.0 * wS[v]
                    if d <= tol:
                        place(v)
                        cut += d
                        S |= 1 << v
                        added.append(v)
            ok = False
            if S == goal:
                if final_cut <= k + tol:
                    path.extend(reversed(added))
                    return True
                rejected[0] = min(rejected[0], final_cut)
            elif S in failed:
                pass
            else:
                delta = deg - 2.0 * wS
                newcut = cut + delta
                mask = ~inS
                if b is not None:
                    mask[b] = False
                cand = np.nonzero(mask)[0]
                over = newcut[cand] > k + tol
                if over.any():
                    rejected[0] = min(rejected[0], float(newcut[cand][over].min()))
                cand = cand[~over]
                if has_twins and cand.shape[0]:
                    # keep one unplaced vertex per twin class
                    seen_rep: set[int] = set()
                    keep = []
                    for v in cand.tolist():
                        r = int(rep[v])
                        if r in seen_rep:
                            continue
                        seen_rep.add(r)
                        keep.append(v)
                    cand = np.array(keep, dtype=np.int64)
                if cand.shape[0]:
                    # most promising first: smallest next cut, then most weight into S
                    order_c = cand[np.lexsort((-wS[cand], newcut[cand]))]
                    for v in order_c.tolist():
                        place(v)
                        if dfs(S | (1 << v), float(newcut[v])):
                            path.append(v)
                            ok = True
                            break
                        unplace(v)
                    if ok:
                        path.extend(reversed(added))
                        # leave S placed: the caller reconstructs from `path`
                        return True
                failed.add(S)
                if len(failed) > max_states:
                    raise MemoryError
            for v in reversed(added):
                unplace(v)
            return ok

        inS[:] = False
        wS[:] = 0.0
        S0 = 0
        cut0 = 0.0
        if a is not None:
            place(a)
            S0 = 1 << a
            cut0 = float(deg[a])
        try:
            found = dfs(S0, cut0)
        except _OutOfTime:
            stats["stopped"] = "time limit"
            break
        except MemoryError:
            stats["stopped"] = f"more than {max_states} remembered states"
            break
        finally:
            stats["remembered"] += len(failed)
        stats["expanded"] = counter[0]
        if found:
            # path holds the vertices in reverse order of the last successful branch
            order = ([a] if a is not None else []) + path[::-1] + ([b] if b is not None else [])
            w = problem.width(order)
            if w < best - tol:
                best, best_order = w, order
            break
        nxt = rejected[0]
        if not np.isfinite(nxt):  # nothing rejected: cannot happen while best > k
            break
        lb = max(lb, float(nxt))
    stats["expanded"] = counter[0]
    stats["seconds"] = time.perf_counter() - t0
    optimal = best <= lb + tol
    if optimal:
        lb = best
    return BnbOutcome(min(lb, best), best, best_order, optimal, stats)
