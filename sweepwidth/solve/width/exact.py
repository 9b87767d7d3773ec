"""Exact homotopy width by a bottleneck search over leash states.

Method
------
The states ``(i, j, L)`` (see :mod:`sweepwidth.problems.width`) and the moves
between them form an infinite graph; the homotopy width is the bottleneck
distance from the start state to the end state, the cost of a state being
the length of its leash.  As for the homotopy height
(:mod:`sweepwidth.solve.homotopy_search`), Dijkstra's algorithm with
bottleneck keys settles states in order of the largest leash length on the
best sequence found to them; when a state of key ``K`` is settled no
sequence of width below ``K`` remains unexplored, so ``K`` is a proven lower
bound, and the first time the end state is reached within the current level
its key is the homotopy width.

* Keys are clamped at a proven lower bound ``B`` (the Fréchet bound of
  :mod:`.bounds`): the clamped optimum is ``max(OPT, B) = OPT``.
* Keys also carry a bound on the rest of the sweep
  (:class:`.bounds.StateBound`: the face-passage bound of the faces still
  to be flipped an odd number of times, measured from the remaining parts
  of A and B, and the suffix Fréchet value).  The rest bound is admissible
  but can rise along a move (a face flipped the wrong way must come back);
  for bottleneck keys that is enough: while the end state is unsettled some
  state of an optimal sequence waits with key at most the optimum, so
  every settled key is a lower bound and the first end state settled is
  optimal.  A state whose rest bound reaches the known upper bound is never
  stored.
* Within one key, states with larger ``i + j`` come first (closer to the
  end), then shorter leashes: a greedy descent inside the optimal level.
* With a known sweep of width ``U`` only leashes shorter than ``U`` are
  generated; reaching key ``U`` proves that sweep optimal.
* Partial expansion (after Yoshizumi, Miura and Ishida [2]_): a state's
  successors with a key above its own are neither built nor stored; the
  state goes back on the heap with the least such key (a lower bound from
  the lengths the walk space skipped) and is expanded again there.  The
  settled order is that of the full search; the stored states are a small
  fraction (most successors of a level are never reached before the end).
* Leashes are exact dart tuples (their ends are fixed by ``(i, j)``), so no
  canonical form is needed.  Flips, spikes and unspikes come from the walk
  machinery of the height search; endpoint steps are generated here.

Zero weights
------------
With edges of weight 0 the leashes below a given length are infinitely
many (spikes and face loops of weight 0), so a level may never be
exhausted: the search is then exact only when it reaches the end state in
the optimal level, and otherwise stops at its time or state limit with
proven bounds.

Memory
------
:func:`memory_estimate` is worked out before anything is allocated: the
compiled walk space (about ``TABLE_BYTES_PER_DART`` bytes per dart: ten flat
per-dart lists and the doubled face walks, plus ``TABLE_BYTES_PER_FACE`` per
face) and each stored state at about ``STATE_BYTES + 8 * darts`` bytes (the
tuple, two dictionary entries and a heap entry) for the longest leash below
the upper bound.  The state limit is what ``max_memory`` holds after the
tables; the search stops with its bounds when it is reached
(``stats['reason']``); the rest bound's caches are capped on their own
(:attr:`.bounds.StateBound.CACHE_ENTRIES`, ``ORDER_ENTRIES``); and it
raises :class:`ProblemTooLargeError` up front when ``max_memory`` cannot
hold the tables and one state per index pair.  The dispatcher's 'auto'
method then keeps its bounds and witness instead (``stats['search']['reason']``);
'search' asked for by name raises.

References
----------
.. [1] E. W. Dijkstra, "A note on two problems in connexion with graphs",
   Numerische Mathematik 1 (1959), with the bottleneck (minimax) path cost.
.. [2] T. Yoshizumi, T. Miura and T. Ishida, "A* with partial expansion for
   large branching factor problems", AAAI 2000.
"""

from __future__ import annotations

import heapq
import itertools
import time
from math import nextafter
from dataclasses import dataclass, field
from typing import Any, Callable

from ...errors import ProblemTooLargeError
from ..homotopy.walks import WalkSpace
from .bounds import StateBound

__all__ = ["DEFAULT_MAX_MEMORY", "WidthSearchOutcome", "memory_estimate", "search_width", "walk_space"]

INF = float("inf")
#: default memory budget of the exact search (bytes)
DEFAULT_MAX_MEMORY = 1 << 30
#: fixed cost of one stored state (bytes, measured order of magnitude)
STATE_BYTES = 420
#: bytes of the compiled walk space per dart (list slots and int objects, measured order of magnitude)
TABLE_BYTES_PER_DART = 200
#: bytes of the compiled walk space per face (two doubled walk tuples' headers, per-face list slots)
TABLE_BYTES_PER_FACE = 250


def memory_estimate(W: Any, upper: float | None = None) -> dict:
    """A priori memory of the exact search: ``{'tables', 'per_state', 'longest', 'cells', 'least'}`` in bytes.

    ``tables`` is the compiled walk space, ``per_state`` one stored state
    with the longest leash shorter than ``upper`` (``longest`` darts; without
    an upper bound a multiple of the start, end and walk lengths), ``cells``
    the number of index pairs and ``least`` the memory for the tables and one
    state per index pair (below it the search is refused).

    Examples
    --------
    >>> from sweepwidth.generators import grid
    >>> from sweepwidth.problems.width import WidthProblem
    >>> W = WidthProblem.build(grid(3, 3), {"vertices": [(0, 0), (0, 1), (0, 2)]},
    ...                        {"vertices": [(2, 0), (2, 1), (2, 2)]})
    >>> est = memory_estimate(W, upper=3.0)
    >>> est["cells"], est["longest"], est["least"] == est["tables"] + est["cells"] * est["per_state"]
    (9, 4, True)
    """
    P = W.graph
    m, F = P.number_of_edges(), P.number_of_faces()
    positive = [c for c in W.cost if c > 0]
    cmin = min(positive) if positive else 1.0
    if upper is not None and upper != float("inf"):
        longest = int(upper / cmin) + 1
    else:
        longest = 4 * (len(W.start.darts) + len(W.end.darts) + W.p + W.q) + 8
    per_state = STATE_BYTES + 8 * longest
    tables = TABLE_BYTES_PER_DART * 2 * m + TABLE_BYTES_PER_FACE * F
    cells = (W.p + 1) * (W.q + 1)
    return {"tables": tables, "per_state": per_state, "longest": longest, "cells": cells,
            "least": tables + cells * per_state}


@dataclass
class WidthSearchOutcome:
    """What :func:`search_width` proved (``optimal``: ``lower == upper`` attained by ``witness``)."""

    lower: float
    upper: float | None
    witness: dict | None
    optimal: bool
    stats: dict = field(default_factory=dict)


def walk_space(W: Any) -> Any:
    """The compiled walk machinery of the height search for this problem's leashes."""
    P = W.graph
    if W.weight is None:
        P = P.with_weights([1.0] * P.number_of_edges())
    return WalkSpace.build(P, holes=W.holes, closed=False, spikes=W.spikes, simple=W.simple,
                           monotone=False, length="vertices" if W.weight == "vertices" else "weight")


def search_width(
    W: Any,
    *,
    lower: float = 0.0,
    upper: float | None = None,
    upper_witness: dict | None = None,
    deadline: float | None = None,
    max_memory: int = DEFAULT_MAX_MEMORY,
    on_progress: Callable[[float, float | None], None] | None = None,
    allow_reflip: bool = True,
    use_rest: bool = True,
) -> WidthSearchOutcome:
    """Bottleneck search for the homotopy width of a :class:`~sweepwidth.problems.width.WidthProblem`.

    Parameters
    ----------
    W : WidthProblem
    lower : float
        A proven lower bound to clamp keys at.
    upper, upper_witness : optional
        Width and witness of a known sweep; only strictly better ones are searched for.
    deadline : float, optional
        ``time.monotonic()`` value; the bounds so far are returned then.
    max_memory : int
        Bytes the compiled walk space and the stored states may take (see
        the module docstring and :func:`memory_estimate`).
    on_progress : callable, optional
        Called with ``(lower, upper)`` when a bound improves.
    allow_reflip : bool
        False: research restriction, every face is flipped at most once
        (the set of flipped faces joins the state).
    use_rest : bool
        Key states by ``max(width so far, bound on the rest)`` with
        :class:`.bounds.StateBound` (default); False keys by the width so
        far alone (plain bottleneck Dijkstra, kept as a cross-check).

    Returns
    -------
    WidthSearchOutcome

    Raises
    ------
    ProblemTooLargeError
        When ``max_memory`` cannot hold the walk space and one state for
        each index pair (the message names the bytes needed).

    Examples
    --------
    >>> from sweepwidth.generators import grid
    >>> from sweepwidth.problems.width import WidthProblem
    >>> P = grid(2, 3)
    >>> W = WidthProblem.build(P, {"vertices": [(0, 0), (0, 1), (0, 2)]}, {"vertices": [(1, 0), (1, 1), (1, 2)]})
    >>> out = search_width(W)
    >>> out.optimal, out.upper
    (True, 2.0)
    """
    t0 = time.monotonic()
    p, q = W.p, W.q
    ex = 1 if W.weight == "vertices" else 0
    backward, simple = W.backward, W.simple
    est = memory_estimate(W, upper)
    per_state, cells = est["per_state"], est["cells"]
    max_states = int(max(0, max_memory - est["tables"]) // per_state)
    if max_states < cells:
        raise ProblemTooLargeError(
            f"homotopy width search: max_memory={max_memory} bytes holds the compiled walk space (about "
            f"{est['tables']} bytes) and {max_states} states of about {per_state} bytes, fewer than the "
            f"{cells} index pairs; it needs at least {est['least']} bytes: raise max_memory or use method='bounds'"
        )
    stats: dict = {"max_states": max_states, "bytes_per_state": per_state, "table_bytes": est["tables"]}
    sp = walk_space(W)
    A, B = W.a.darts, W.b.darts
    av = W.a_vertices
    tail = sp.tail
    dl = sp.dlen
    start = (0, 0, tuple(W.start.darts)) if allow_reflip else (0, 0, tuple(W.start.darts), 0)
    goal = (p, q, tuple(W.end.darts))

    def length(darts: tuple) -> Any:
        return sum(dl[d] for d in darts) + ex

    f0 = max(length(start[2]), lower)
    best: dict = {start: f0}
    parent: dict = {start: None}
    done: set = set()
    counter = itertools.count()
    rest = StateBound(W) if use_rest else None
    k0 = f0 if rest is None else max(f0, rest(0, 0, 0))
    if k0 == INF:
        stats.update(states=0, generated=0, stored=1, seconds=time.monotonic() - t0,
                     reason="no end state is reachable (no set of faces to flip joins the start and end leashes)",
                     infeasible=True)
        return WidthSearchOutcome(INF, None, None, False, stats)
    # entries: (key, -(i + j), leash length, tie, state, bottleneck so far, faces flipped an odd number of times)
    heap: list = [(k0, -0, length(start[2]), 0, start, f0, 0)]
    cap = upper
    level = f0
    settled = generated = 0
    found = None
    reason = None
    exhausted = False
    if start[:3] == goal:
        found = (length(start[2]), start)
    while found is None:
        if not heap:
            exhausted = True
            break
        key0, _, _, _, state, f, odd = heapq.heappop(heap)
        if state in done or best.get(state, f) < f:
            continue
        if key0 > level:
            level = key0
            if on_progress is not None:
                on_progress(level, cap)
        if state[:3] == goal:
            found = (f, state)
            break
        if cap is not None and key0 >= cap:
            exhausted = True
            break
        settled += 1
        if (settled & 15) == 0:
            if deadline is not None and time.monotonic() > deadline:
                reason = "time limit"
                break
            if len(best) > max_states:
                reason = f"state limit {max_states} (from max_memory={max_memory}) reached"
                break
        i, j, L = state[0], state[1], state[2]
        here = 0.0 if rest is None else rest(i, j, odd)
        mask = 0 if allow_reflip else state[3]
        succ: list = []
        # endpoint steps
        for walk, to in (("a", i + 1), ("a", i - 1), ("b", j + 1), ("b", j - 1)):
            if walk == "a":
                if to > p or to < 0 or (to < i and not backward):
                    continue
                x = A[i] ^ 1 if to > i else A[to]
                new = L[1:] if (L and L[0] == x ^ 1) else (x,) + L
                ni, nj = to, j
            else:
                if to > q or to < 0 or (to < j and not backward):
                    continue
                y = B[j] if to > j else B[to] ^ 1
                new = L[:-1] if (L and L[-1] == y ^ 1) else L + (y,)
                ni, nj = i, to
            succ.append((ni, nj, new, {"op": "step", "walk": walk, "to": to}, -1, length(new)))
        key = L if L else sp.point(av[i])
        # partial expansion: only leashes no longer than the current key are built now; the least
        # length of the others (a lower bound on their keys) decides when this state comes back
        low = [INF]
        gen_cap = min(INF if cap is None else cap, nextafter(key0, INF))
        for new, _v, move, face, _sign, nl in sp.moves(key, gen_cap, low):
            if face >= 0 and not allow_reflip and (mask >> face) & 1:
                continue
            succ.append((i, j, tuple(new), move, face, nl))
        later = low[0] if (cap is None or low[0] < cap) else INF
        for ni, nj, new, move, face, nl in succ:
            generated += 1
            f2 = max(f, nl)
            if cap is not None and f2 >= cap:
                continue
            if face >= 0:
                odd2 = odd ^ (1 << face)
                k2 = f2 if rest is None else max(f2, rest(ni, nj, odd2))
            else:
                odd2 = odd
                # spikes keep (i, j, odd): the popped state's rest bound holds
                k2 = max(f2, here) if (ni == i and nj == j) else (
                    f2 if rest is None else max(f2, rest(ni, nj, odd2)))
            if k2 == INF or (cap is not None and k2 >= cap):
                continue
            if simple and new and not W.is_simple(new):
                continue
            if allow_reflip:
                ns: tuple = (ni, nj, new)
            else:
                ns = (ni, nj, new, mask | (1 << face) if face >= 0 else mask)
            if ns in done:
                continue
            old = best.get(ns)
            if old is not None and old <= f2:
                continue
            if k2 > key0 and ns[:3] != goal:
                # partial expansion: kept for when the search reaches its key
                if k2 < later:
                    later = k2
                continue
            best[ns] = f2
            parent[ns] = (state, move)
            if ns[:3] == goal:
                if cap is None or f2 < cap:
                    cap = f2
                    if on_progress is not None:
                        on_progress(level, cap)
                if f2 <= key0:
                    found = (f2, ns)
                    break
            heapq.heappush(heap, (k2, -(ni + nj), nl, next(counter), ns, f2, odd2))
        if later == INF:
            done.add(state)
        elif found is None:
            heapq.heappush(heap, (later, -(i + j), len(L), next(counter), state, f, odd))
    stats.update(states=settled, generated=generated, stored=len(best), seconds=time.monotonic() - t0)

    def witness_of(state: Any) -> dict:
        chain = []
        s = state
        while parent[s] is not None:
            ps, mv = parent[s]
            chain.append(mv)
            s = ps
        chain.reverse()
        moves = [m if isinstance(m, dict) else _move_json(sp, m) for m in chain]
        return {"start": W.leash_json(W.start.darts, W.start.vertex), "moves": moves}

    # the best sequence to the goal seen (found, or the goal entry under the cap)
    goal_states = [s for s in best if s[:3] == goal] if found is None else [found[1]]
    if found is not None:
        h, st = found
        return WidthSearchOutcome(float(h), float(h), witness_of(st), True, stats)
    own = min(goal_states, key=lambda s: best[s]) if goal_states else None
    up, wit = upper, upper_witness
    if own is not None and (up is None or best[own] < up):
        up, wit = float(best[own]), witness_of(own)
    if exhausted:
        if up is not None:
            if wit is None:
                stats["reason"] = "no sweep of width below the given upper bound"
                return WidthSearchOutcome(float(up), float(up), None, False, stats)
            return WidthSearchOutcome(float(up), float(up), wit, True, stats)
        stats["reason"] = "no end state is reachable (every state reachable from the start was explored)"
        stats["infeasible"] = True
        return WidthSearchOutcome(float("inf"), None, None, False, stats)
    stats["reason"] = reason
    lo = float(level) if up is None else min(float(level), float(up))
    return WidthSearchOutcome(lo, None if up is None else float(up), wit, False, stats)


def _move_json(sp: Any, move: tuple) -> dict:
    mv = sp.move_json(move)
    if "put" in mv:
        mv["put"] = [int(d) for d in mv["put"]]
    return mv
