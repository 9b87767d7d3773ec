"""A deliberately simple reference for discrete homotopy height (tests only).

Everything here is brute force, written straight from the shared move rules
and independent of :mod:`sweepwidth.problems.homotopy`'s move code: every
legal flip is found by trying every face, both orientations, every rotation
and every split of the boundary walk against every position of the walk;
spikes try every dart at every position; unspikes every position.  The
search is a bottleneck Dijkstra over walks (exact dart sequences, no
canonical forms), so the first time an end curve is popped its key is the
least height of a homotopy.

Use it only on tiny instances (a few faces, short walks).

Public function: :func:`reference_height`.
"""

from __future__ import annotations

import heapq
import itertools
from typing import Any

__all__ = ["reference_height", "legal_moves"]


def _length(problem: Any, walk: tuple, vertex: int) -> float:
    P = problem.graph
    if problem.length == "vertices":
        if problem.closed:
            return float(max(len(walk), 1))
        return float(len(walk) + 1)
    return float(sum(P.weight(d >> 1) for d in walk))


def _vertex_at(P: Any, walk: tuple, vertex: int, i: int) -> int:
    if not walk:
        return vertex
    if i == len(walk):
        return P.head_index(walk[-1])
    return P.tail_index(walk[i])


def _simple(P: Any, walk: tuple, closed: bool) -> bool:
    if not walk:
        return False  # a point is not a cycle; only the final point is allowed
    vs = [P.tail_index(d) for d in walk]
    if not closed:
        vs.append(P.head_index(walk[-1]))
        return len(set(vs)) == len(vs)
    return len(set(vs)) == len(vs) and len({d >> 1 for d in walk}) == len(walk)


def legal_moves(problem: Any, walk: tuple, vertex: int):
    """Yield ``(move, new_walk, new_vertex)`` for every legal move (duplicates possible)."""
    P = problem.graph
    closed = problem.closed
    L = len(walk)
    positions = range(L) if (closed and L) else range(L + 1)
    # flips
    for f in range(P.number_of_faces()):
        if f in problem.holes:
            continue
        B = list(P.face_darts(f))
        n = len(B)
        if n == 0:
            continue
        for orient in (B, [d ^ 1 for d in reversed(B)]):
            for r in range(n):
                rot = orient[r:] + orient[:r]
                for k in range(n + 1):
                    if k > L:
                        break
                    p = tuple(rot[:k])
                    q = tuple(d ^ 1 for d in reversed(rot[k:]))
                    for i in positions:
                        if k == 0:
                            if not q or P.tail_index(q[0]) != _vertex_at(P, walk, vertex, i):
                                continue
                            new = walk[:i] + q + walk[i:]
                            yield ({"op": "flip", "face": f, "pos": i, "take": 0, "put": list(q)},
                                   new, P.tail_index(new[0]))
                            continue
                        if closed:
                            piece = tuple(walk[(i + x) % L] for x in range(k))
                        else:
                            if i + k > L:
                                continue
                            piece = walk[i:i + k]
                        if piece != p:
                            continue
                        if i + k <= L:
                            new = walk[:i] + q + walk[i + k:]
                        else:
                            new = q + walk[(i + k) % L:i]
                        nv = P.tail_index(new[0]) if new else P.tail_index(p[0])
                        yield ({"op": "flip", "face": f, "pos": i, "take": k, "put": list(q)}, new, nv)
    if not problem.spikes:
        return
    for i in positions:
        v = _vertex_at(P, walk, vertex, i)
        for d in P.darts_at(P.label(v)):
            new = walk[:i] + (d, d ^ 1) + walk[i:]
            yield ({"op": "spike", "pos": i, "dart": d}, new, P.tail_index(new[0]))
    for i in range(L):
        if not closed and i + 2 > L:
            continue
        if L < 2:
            continue
        a, b = walk[i], walk[(i + 1) % L]
        if b != a ^ 1:
            continue
        new = walk[:i] + walk[i + 2:] if i + 2 <= L else walk[(i + 2) % L:i]
        nv = P.tail_index(new[0]) if new else P.tail_index(a)
        yield ({"op": "unspike", "pos": i}, new, nv)


def _is_end(problem: Any, walk: tuple, vertex: int) -> bool:
    end = problem.end
    if end is None:
        return not walk
    target = tuple(end.darts)
    if not problem.closed:
        return walk == target
    if not target:
        return not walk and vertex == end.vertex
    return len(walk) == len(target) and any(walk[k:] + walk[:k] == target for k in range(len(walk)))


def reference_height(problem: Any, max_height: float) -> tuple[float | None, dict | None]:
    """Least height of a homotopy whose walks all have length <= ``max_height``.

    Parameters
    ----------
    problem : HomotopyProblem
        Uses its graph, closed/open, start, end, holes, spikes, simple,
        monotone and length fields.
    max_height : float
        Walks longer than this are not explored.

    Returns
    -------
    (height, witness)
        ``witness = {"start": walk_json, "moves": [...]}`` attains ``height``;
        ``(None, None)`` when no homotopy stays within ``max_height``.
    """
    P = problem.graph
    start = (tuple(problem.start.darts), problem.start.vertex)
    if problem.simple and not _simple(P, start[0], problem.closed):
        return None, None
    k0 = _length(problem, *start)
    if k0 > max_height + 1e-9:
        return None, None
    s0 = (start[0], start[1], frozenset())
    best = {s0: k0}
    parent: dict = {s0: None}
    tick = itertools.count()
    heap = [(k0, next(tick), s0)]
    while heap:
        key, _, state = heapq.heappop(heap)
        if key > best.get(state, float("inf")):
            continue
        walk, vertex, used = state
        if _is_end(problem, walk, vertex):
            moves = []
            x = state
            while parent[x] is not None:
                prev, mv = parent[x]
                moves.append(mv)
                x = prev
            moves.reverse()
            return key, {"start": {"vertex": P.label(start[1]), "darts": list(start[0])}, "moves": moves}
        for mv, new, nv in legal_moves(problem, walk, vertex):
            if problem.monotone and mv["op"] == "flip":
                if mv["face"] in used:
                    continue
                nused = used | {mv["face"]}
            else:
                nused = used
            if problem.simple and not _simple(P, new, problem.closed):
                # the final point is allowed; other walks must be simple
                if not (not new and _is_end(problem, new, nv)):
                    continue
            nk = max(key, _length(problem, new, nv))
            if nk > max_height + 1e-9:
                continue
            ns = (new, nv, nused if problem.monotone else frozenset())
            if nk < best.get(ns, float("inf")):
                best[ns] = nk
                parent[ns] = (state, mv)
                heapq.heappush(heap, (nk, next(tick), ns))
    return None, None
