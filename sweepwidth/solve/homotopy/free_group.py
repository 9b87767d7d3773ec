"""The feasibility test of a homotopy: words of walks in a free group.

The plane minus the hole faces deformation-retracts onto a graph, so its
fundamental group is free; its rank is the number of holes minus one (or zero
without holes).  A spanning tree of the graph and a spanning tree of the dual
through the non-hole faces give each non-tree edge a word in the generators
(one per hole but the root), and a walk's word is the product along its darts.
Two closed curves are freely homotopic iff their cyclically reduced words are
cyclic rotations of each other; two paths with the same ends are homotopic
relative to the ends iff ``w(a) w(b)^-1`` reduces to the empty word.

Both the dispatcher (:mod:`sweepwidth.solve.homotopy`) and the exact search
(:mod:`sweepwidth.solve.homotopy.search`) use it; it imports neither.

Complexity: O(n + m + F) to build the words, O(L) per walk of L darts (the
words have length at most the number of holes).

References
----------
.. [1] A. Hatcher, "Algebraic Topology", Cambridge University Press (2002),
   Section 1.A (graphs and free groups).

See Also
--------
sweepwidth.solve.homotopy.homotopy_height
"""

from __future__ import annotations

from collections import deque
from typing import Sequence

from ...problems.homotopy import HomotopyProblem

__all__ = ["FreeGroup", "homotopy_classes_equal"]


def _reduce(word: list[int]) -> list[int]:
    out: list[int] = []
    for x in word:
        if out and out[-1] == -x:
            out.pop()
        else:
            out.append(x)
    return out


def _cyclic_reduce(word: list[int]) -> list[int]:
    w = _reduce(word)
    a, b = 0, len(w)
    while b - a >= 2 and w[a] == -w[b - 1]:
        a += 1
        b -= 1
    return w[a:b]


def _inverse(word: Sequence[int]) -> list[int]:
    return [-x for x in reversed(word)]


class FreeGroup:
    """Words of walks in the fundamental group of graph + non-hole faces (see module docstring)."""

    def __init__(self, problem: HomotopyProblem) -> None:
        P = problem.graph
        n, m = P.number_of_vertices(), P.number_of_edges()
        tail, head = problem.tail, problem.head
        out: list[list[int]] = [[] for _ in range(n)]
        for d in range(2 * m):
            out[tail[d]].append(d)
        intree = [False] * m
        seen = [False] * n
        seen[0] = True
        queue = deque([0])
        while queue:
            v = queue.popleft()
            for d in out[v]:
                h = head[d]
                if not seen[h]:
                    seen[h] = True
                    intree[d >> 1] = True
                    queue.append(h)
        F = problem.n_faces
        adj: list[list[int]] = [[] for _ in range(F)]
        for e in range(m):
            if not intree[e]:
                adj[problem.dart_face[2 * e]].append(e)
                adj[problem.dart_face[2 * e + 1]].append(e)
        holes = problem.holes
        root = min(holes) if holes else 0
        parent_edge = [-1] * F
        order = [root]
        fseen = [False] * F
        fseen[root] = True
        i = 0
        while i < len(order):
            a = order[i]
            i += 1
            for e in adj[a]:
                b = problem.dart_face[2 * e + 1] if problem.dart_face[2 * e] == a else problem.dart_face[2 * e]
                if not fseen[b]:
                    fseen[b] = True
                    parent_edge[b] = e
                    order.append(b)
        word: dict[int, list[int]] = {}
        gens = 0
        for c in reversed(order[1:]):
            ep = parent_edge[c]
            if c in holes:
                gens += 1
                word[ep] = [gens]
                continue
            rel = [(d >> 1, 1 if d % 2 == 0 else -1) for d in problem.face_walks[c] if not intree[d >> 1]]
            k = next(x for x, (e, _) in enumerate(rel) if e == ep)
            eps = rel[k][1]
            R: list[int] = []
            for e, sgn in rel[k + 1:] + rel[:k]:
                R.extend(word[e] if sgn > 0 else _inverse(word[e]))
            word[ep] = _reduce(_inverse(R)) if eps > 0 else _reduce(R)
        self.rank = gens
        self._word = word

    def word(self, darts: Sequence[int]) -> list[int]:
        out: list[int] = []
        wd = self._word
        for d in darts:
            w = wd.get(d >> 1)
            if w:
                out.extend(w if d % 2 == 0 else _inverse(w))
        return _reduce(out)


def homotopy_classes_equal(problem: HomotopyProblem) -> tuple[bool, str]:
    """Whether the start can reach the end condition at all (topologically), with the reason.

    Closed curves: free homotopy in the plane minus the holes (conjugacy of
    cyclically reduced words); open curves: homotopy relative to the ends.
    ``simple=True`` also needs simple start and end curves.

    Returns
    -------
    (bool, str)

    Examples
    --------
    >>> from sweepwidth.generators import grid
    >>> from sweepwidth.problems.homotopy import HomotopyProblem
    >>> P = grid(3, 3)
    >>> inner = [f for f in P.faces if f != P.outer_face]
    >>> H = HomotopyProblem.build(P, holes={P.outer_face, inner[0]})
    >>> homotopy_classes_equal(H)[0]     # the outer boundary winds around the hole
    False
    """
    if problem.simple and not problem.is_end(problem.start):
        if not problem.is_simple(problem.start):
            return False, "simple homotopy: the start curve is not a simple cycle or path"
        if problem.end is not None and problem.end.darts and not problem.is_simple(problem.end):
            return False, "simple homotopy: the end curve is not a simple cycle or path"
    G = FreeGroup(problem)
    w0 = G.word(problem.start.darts)
    if problem.closed:
        w1 = [] if problem.end is None else G.word(problem.end.darts)
        a, b = _cyclic_reduce(w0), _cyclic_reduce(w1)
        ok = len(a) == len(b) and (not a or any(a[k:] + a[:k] == b for k in range(len(a))))
        if ok:
            return True, f"same free homotopy class (fundamental group free of rank {G.rank})"
        if problem.end is None or not problem.end.darts:
            return False, (
                f"the start curve is not contractible in the plane minus the {len(problem.holes)} holes "
                f"(its cyclically reduced word has {len(a)} letters in a free group of rank {G.rank})"
            )
        return False, "start and end are not freely homotopic in the plane minus the holes (words not conjugate)"
    w = _reduce(w0 + _inverse(G.word(problem.end.darts)))  # type: ignore[union-attr]
    if not w:
        return True, f"homotopic relative to the ends (fundamental group free of rank {G.rank})"
    return False, "start and end paths are not homotopic relative to their ends in the plane minus the holes"
