"""A deliberately simple reference for the homotopy width (tests only).

Brute force straight from the definition: states are ``(i, j, leash)`` with
the leash as an exact dart tuple; face flips, spikes and unspikes come from
the brute-force move enumeration of ``tests/reference_homotopy.py`` (every
face, both orientations, every rotation and split, every position); the
endpoint steps are written here from the rule (remove the dart when the
leash starts/ends with it, else add the reverse).  A bottleneck Dijkstra
over states whose leash is at most ``max_width`` long: the first time the
end state is popped its key is the least width.  Tiny instances only.
"""

from __future__ import annotations

import heapq
import itertools
from types import SimpleNamespace
from typing import Any

from reference_homotopy import legal_moves

__all__ = ["reference_width"]


def _length(P: Any, leash: tuple, weight: Any) -> float:
    if weight == "weight":
        return float(sum(P.weight(d >> 1) for d in leash))
    if weight is None:
        return float(len(leash))
    return float(len(leash) + 1)


def _simple(P: Any, leash: tuple) -> bool:
    if not leash:
        return True
    vs = [P.tail_index(d) for d in leash] + [P.head_index(leash[-1])]
    return len(set(vs)) == len(vs)


def reference_width(W: Any, max_width: float, *, max_states: int = 400_000) -> float | None:
    """Least width of a leash sweep of the problem ``W`` with every leash at most ``max_width``.

    Uses only ``W.graph``, the walks' darts and first vertices, the leashes,
    holes and the option flags.  Returns None when no such sweep exists;
    raises RuntimeError past ``max_states`` states.
    """
    P = W.graph
    A, B = tuple(W.a.darts), tuple(W.b.darts)
    av = [W.a.vertex] + [P.head_index(d) for d in A]
    view = SimpleNamespace(graph=P, closed=False, holes=W.holes, spikes=W.spikes, length="weight")
    start = (0, 0, tuple(W.start.darts))
    goal = (len(A), len(B), tuple(W.end.darts))
    wt = W.weight
    best = {start: _length(P, start[2], wt)}
    heap = [(best[start], 0, start)]
    tick = itertools.count(1)
    done = set()
    while heap:
        f, _, s = heapq.heappop(heap)
        if s in done:
            continue
        done.add(s)
        if s == goal:
            return f
        if len(done) > max_states:
            raise RuntimeError("reference_width: too many states")
        i, j, L = s
        nxt = []
        for di in ((1, -1) if W.backward else (1,)):
            k = i + di
            if 0 <= k <= len(A):
                # dart from a_k to a_i
                x = A[i] ^ 1 if di == 1 else A[k]
                nxt.append((k, j, L[1:] if L and L[0] == x ^ 1 else (x,) + L))
            k = j + di
            if 0 <= k <= len(B):
                # dart from b_j to b_k
                y = B[j] if di == 1 else B[k] ^ 1
                nxt.append((i, k, L[:-1] if L and L[-1] == y ^ 1 else L + (y,)))
        for _mv, new, _v in legal_moves(view, L, av[i]):
            nxt.append((i, j, tuple(new)))
        for t in nxt:
            if W.simple and not _simple(P, t[2]):
                continue
            ln = _length(P, t[2], wt)
            if ln > max_width:
                continue
            g = max(f, ln)
            if g < best.get(t, float("inf")):
                best[t] = g
                heapq.heappush(heap, (g, next(tick), t))
    return None
