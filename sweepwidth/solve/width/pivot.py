"""Pivot sweeps: leashes made of two shortest paths through a moving vertex.

Status: experimental, not used by the dispatcher yet.  With one shortest-path
tree per index pair the leashes of neighbouring states can lie on opposite
sides of the region, so one local sweep crosses all of it (measured on the
500-face disks of ``benchmarks/width.py``: pivot cost 10, local sweep 113);
the next step is one fixed forest from A and one from B, so that leashes of
neighbouring pivots stay close.

Construction
------------
For a vertex x (the *pivot*) and an index pair ``(i, j)`` let ``K(x, i, j)``
be the shortest path from ``a_i`` to x in the shortest-path tree of
``a_i``, followed by the shortest path from x to ``b_j`` in the tree of
``b_j``, freely reduced.  Its length is at most ``d(a_i, x) + d(x, b_j)``.
The pivot states ``(x, i, j)`` form a graph: the pivot moves to a
neighbouring vertex, or one index moves forward.  A bottleneck Dijkstra
search [1]_ over it, with cost ``d(a_i, x) + d(x, b_j)`` per state (ties:
fewer moves), finds a sequence of states from a pivot on the start leash at
``(0, 0)`` to a pivot on the end leash at ``(p, q)`` whose largest cost is
least.  The sweep follows it: an endpoint step where the indices move, and
after each state the leash is swept onto ``K(x, i, j)`` by face flips,
spikes and unspikes (the greedy path-form homotopy of
:func:`sweepwidth.solve.homotopy.construct_homotopy` between two walks with
the same ends); at the end it is swept onto the end leash.

Why it is good: the face-passage lower bound of
:func:`sweepwidth.solve.width.bounds.passage_bound` says that some leash
runs through each face with both ends on A and B, and the cheapest such
leash is ``d(A, x) + d(x, B)`` long; the pivot sweep offers exactly such
leashes, moving the pivot across the region like a comb.  Consecutive
leashes differ only near the pivot's edge and where the two trees
diverge, so each sweep between them is local.

Homotopy class: with holes besides the outer face a pivot leash may pass on
the wrong side of a hole.  Every state's leash is tested (the loop
``A[0..i] . K . B[0..j]^-1 . L_start^-1`` must be trivial in the free
group of :mod:`sweepwidth.solve.homotopy.free_group`) and states that fail
are never entered, so every leash of the sweep is in the class the problem
asks for.  With ``simple=True`` only simple pivot leashes are used.

Improvement: the widths of the sweeps between consecutive leashes are
known after a replay; states whose sweep was wider than the search's cost
are charged that width and the search is repeated (a few rounds, keeping
the narrowest sweep).

Time: ``p + q + 2`` runs of Dijkstra's algorithm, a search over
``V (p + 1)(q + 1)`` states (over the index pairs of the Fréchet path only,
when that product is above ``max_states``), and one local homotopy per
state of the path found.

References
----------
.. [1] E. W. Dijkstra, "A note on two problems in connexion with graphs",
   Numerische Mathematik 1, 1959 (here with the bottleneck path cost).
.. [2] E. W. Chambers, É. Colin de Verdière, J. Erickson, S. Lazard,
   F. Lazarus and S. Thite, "Homotopic Fréchet distance between curves or,
   walking your dog in the woods in polynomial time", Computational Geometry
   43(3), 2010 (leashes that are shortest paths in their homotopy class).
"""

from __future__ import annotations

import dataclasses
import heapq
import time
from typing import Any

from ...problems.homotopy import Curve
from ..homotopy import bfs_rank, construct_homotopy
from ..homotopy.free_group import FreeGroup
from .bounds import distances_from, frechet_bound, leash_distances

__all__ = ["pivot_sweep", "DEFAULT_MAX_STATES"]

#: above this many pivot states the index pairs are those of the Fréchet path only
DEFAULT_MAX_STATES = 400_000
#: rounds of re-charging wide local sweeps
ROUNDS = 4


def _tree_path(par: list[int], tail: tuple, src: int, dst: int) -> list[int] | None:
    out = []
    v = dst
    while v != src:
        d = par[v]
        if d < 0:
            return None
        out.append(d)
        v = tail[d]
    out.reverse()
    return out


def _reduce(darts: list[int]) -> tuple:
    st: list[int] = []
    for d in darts:
        if st and st[-1] == d ^ 1:
            st.pop()
        else:
            st.append(d)
    return tuple(st)


class _Pivots:
    """Trees, the pivot leashes and their costs for one problem."""

    def __init__(self, W: Any) -> None:
        self.W = W
        self.trees: dict[int, tuple[list[float], list[int]]] = {}
        self.group = None
        self.extra = 1.0 if W.weight == "vertices" else 0.0
        if len(W.holes) > 1:
            self.group = FreeGroup(W.path)
        self.a_pre = [()] + [tuple(W.a.darts[:k]) for k in range(1, W.p + 1)]
        self.b_pre = [()] + [tuple(W.b.darts[:k]) for k in range(1, W.q + 1)]
        self._ok: dict[tuple, bool] = {}

    def tree(self, v: int) -> tuple[list[float], list[int]]:
        if v not in self.trees:
            self.trees[v] = distances_from(self.W, v)
        return self.trees[v]

    def cost(self, x: int, i: int, j: int) -> float:
        W = self.W
        return self.tree(W.a_vertices[i])[0][x] + self.tree(W.b_vertices[j])[0][x] + self.extra

    def leash(self, x: int, i: int, j: int) -> tuple | None:
        W = self.W
        a, b = W.a_vertices[i], W.b_vertices[j]
        pa = _tree_path(self.tree(a)[1], W.tail, a, x)
        pb = _tree_path(self.tree(b)[1], W.tail, b, x)
        if pa is None or pb is None:
            return None
        return _reduce(pa + [d ^ 1 for d in reversed(pb)])

    def admissible(self, x: int, i: int, j: int) -> bool:
        """The pivot leash exists, is in the problem's homotopy class and simple if asked."""
        key = (x, i, j)
        if key in self._ok:
            return self._ok[key]
        W = self.W
        L = self.leash(x, i, j)
        ok = L is not None
        if ok and W.simple:
            ok = W.is_simple(L)  # type: ignore[arg-type]
        if ok and self.group is not None:
            loop = list(self.a_pre[i]) + list(L) + [d ^ 1 for d in reversed(self.b_pre[j])] \
                + [d ^ 1 for d in reversed(W.start.darts)]  # type: ignore[arg-type]
            ok = not self.group.word(loop)
        self._ok[key] = ok
        return ok


def _cells(W: Any, V: int, max_states: int) -> tuple[list[tuple[int, int]], list[list[int]]]:
    p, q = W.p, W.q
    if V * (p + 1) * (q + 1) <= max_states:
        cells = [(i, j) for i in range(p + 1) for j in range(q + 1)]
        index = {c: k for k, c in enumerate(cells)}
        succ = [[index[n] for n in ((i + 1, j), (i, j + 1)) if n in index] for i, j in cells]
        return cells, succ
    path = frechet_bound(W, leash_distances(W))[1]
    if W.backward:  # the grid path may step back; keep its forward-monotone hull only
        mono = [path[0]]
        for c in path[1:]:
            if c[0] >= mono[-1][0] and c[1] >= mono[-1][1] and sum(c) == sum(mono[-1]) + 1:
                mono.append(c)
        if mono[-1] != (p, q):
            mono = [(i, 0) for i in range(p + 1)] + [(p, j) for j in range(1, q + 1)]
        path = mono
    return list(path), [[k + 1] if k + 1 < len(path) else [] for k in range(len(path))]


def _search(W: Any, piv: _Pivots, cells: list, succ: list, charge: dict, deadline: float | None) -> list | None:
    """Bottleneck path of pivot states (list of (x, cell index)) or None."""
    P = W.graph
    head = W.head
    out: list[list[int]] = [[] for _ in range(P.number_of_vertices())]
    for d, t in enumerate(W.tail):
        out[t].append(d)
    goal_cell = len(cells) - 1
    assert cells[goal_cell] == (W.p, W.q)
    start_v = {W.tail[d] for d in W.start.darts} | {W.a_vertices[0]}
    end_v = {W.tail[d] for d in W.end.darts} | {W.a_vertices[-1], W.b_vertices[-1]}

    def c_of(x: int, k: int) -> float:
        i, j = cells[k]
        return max(piv.cost(x, i, j), charge.get((x, k), 0.0))

    best: dict = {}
    parent: dict = {}
    heap: list = []
    for x in start_v:
        if piv.admissible(x, 0, 0):
            key = (c_of(x, 0), 0)
            best[(x, 0)] = key
            parent[(x, 0)] = None
            heap.append((key, x, 0))
    heapq.heapify(heap)
    done: set = set()
    pops = 0
    while heap:
        key, x, k = heapq.heappop(heap)
        if (x, k) in done:
            continue
        done.add((x, k))
        pops += 1
        if (pops & 255) == 0 and deadline is not None and time.monotonic() > deadline:
            return None
        if k == goal_cell and x in end_v:
            path = []
            s: Any = (x, k)
            while s is not None:
                path.append(s)
                s = parent[s]
            path.reverse()
            return path
        i, j = cells[k]
        nbrs = [(head[d], k) for d in out[x]] + [(x, k2) for k2 in succ[k]]
        for y, k2 in nbrs:
            if (y, k2) in done:
                continue
            i2, j2 = cells[k2]
            if not piv.admissible(y, i2, j2):
                continue
            nk = (max(key[0], c_of(y, k2)), key[1] + 1)
            if nk < best.get((y, k2), (float("inf"), 0)):
                best[(y, k2)] = nk
                parent[(y, k2)] = (x, k)
                heapq.heappush(heap, (nk, y, k2))
    return None


def _replay(W: Any, piv: _Pivots, cells: list, path: list, rank: list, deadline: float | None
            ) -> tuple[float, dict, dict] | None:
    """Follow the pivot path; returns (width, witness, local widths per state) or None."""
    H0 = W.path
    s = W.initial()
    moves: list = []
    width = W.length_of(s.darts)
    local: dict = {}

    def sweep_to(target: tuple) -> float | None:
        nonlocal s
        if target == s.darts:
            return W.length_of(target)
        H = dataclasses.replace(H0, start=Curve(s.darts, s.vertex), end=Curve(target, s.vertex))
        got = construct_homotopy(H, rank, greedy=True, deadline=deadline)
        if got is None:
            return None
        h, wit = got
        moves.extend(wit["moves"])
        s = dataclasses.replace(s, darts=tuple(target))
        return float(h)

    for x, k in path:
        i, j = cells[k]
        h = W.length_of(s.darts)
        for walk, to in (("a", i), ("b", j)):
            cur = s.i if walk == "a" else s.j
            while cur < to:
                cur += 1
                s = W.step(s, walk, cur)
                moves.append({"op": "step", "walk": walk, "to": cur})
                h = max(h, W.length_of(s.darts))
        target = piv.leash(x, i, j)
        if target is None:
            return None
        got = sweep_to(target)
        if got is None:
            return None
        h = max(h, got)
        local[(x, k)] = h
        width = max(width, h)
    got = sweep_to(tuple(W.end.darts))
    if got is None:
        return None
    width = max(width, got)
    return width, {"start": W.leash_json(W.start.darts, W.start.vertex), "moves": moves}, local


def pivot_sweep(W: Any, *, deadline: float | None = None, max_states: int = DEFAULT_MAX_STATES,
                rounds: int = ROUNDS) -> tuple[float, dict] | None:
    """The narrowest pivot sweep found (see the module docstring): ``(width, witness)`` or None.

    The witness is not replayed here (:func:`.construct.best_constructed`
    replays every candidate with the checker before using it).

    Examples
    --------
    >>> from sweepwidth.generators import grid
    >>> from sweepwidth.problems.width import WidthProblem
    >>> P = grid(4, 4)
    >>> W = WidthProblem.build(P, {"vertices": [(0, 0), (0, 1)]}, {"vertices": [(3, 0), (3, 1)]})
    >>> from sweepwidth.verify.width import replay_width
    >>> w, wit = pivot_sweep(W)
    >>> opts = W.options()
    >>> replay_width(P, wit, **{k: opts[k] for k in ("a", "b", "start", "end")}) == w
    True
    """
    if W.p + W.q == 0 and not W.start.darts and not W.end.darts:
        return None
    piv = _Pivots(W)
    cells, succ = _cells(W, W.graph.number_of_vertices(), max_states)
    rank = bfs_rank(W.path)
    charge: dict = {}
    best: tuple[float, dict] | None = None
    for _ in range(max(1, rounds)):
        if deadline is not None and time.monotonic() > deadline:
            break
        path = _search(W, piv, cells, succ, charge, deadline)
        if path is None:
            break
        got = _replay(W, piv, cells, path, rank, deadline)
        if got is None:
            break
        width, wit, local = got
        if best is None or width < best[0]:
            best = (width, wit)
        # charge the states whose local sweep was wider than their cost
        worse = False
        for st, h in local.items():
            x, k = st
            i, j = cells[k]
            if h > max(piv.cost(x, i, j), charge.get(st, 0.0)) + 1e-9:
                charge[st] = h
                worse = True
        if not worse:
            break
    return best
