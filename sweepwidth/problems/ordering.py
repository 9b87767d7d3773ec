"""Vertex-ordering problems (cutwidth and its pinned variants) as plain arrays.

Solvers in :mod:`sweepwidth.solve` receive an :class:`OrderingProblem`, never a
networkx graph: the conversion and every check happen once, here.

Pinned ends
-----------
With ``first = A`` and ``last = B`` an ordering must list ``A`` (in any order)
before every other vertex and ``B`` after every other vertex, and its width is
the largest cut over the prefixes ``S`` with ``A <= S <= V - B``, that is over
the prefix sizes ``|A|, ..., n - |B|``.  Cuts inside ``A`` or inside ``B`` are
not counted: ``A`` behaves as one start vertex, ``B`` as one end vertex.  The
first counted cut is the full boundary ``w(delta(A))`` and the last one is
``w(delta(B))``.  :meth:`OrderingProblem.contract_pins` turns any problem into an
equivalent one whose pinned sets have at most one vertex each, so solvers only
ever meet single pinned vertices (where both readings agree).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from fractions import Fraction
from typing import Any, Callable, Hashable, Iterable, Sequence

import networkx as nx
import numpy as np
import scipy.sparse  # noqa: F401 - imported up front: its first import costs ~1 s
import scipy.sparse.csgraph  # noqa: F401

from .._weights import check_total, check_weight, weight_function
from ..errors import InputTypeError, InvalidArgumentError, NotInGraphError, SweepwidthError, UnsupportedOptionError

__all__ = ["OrderingProblem", "PinContraction"]


def _as_set(x: Any, G: nx.Graph, what: str) -> frozenset:
    if x is None:
        return frozenset()
    if not isinstance(x, (set, frozenset, list, tuple)) or (isinstance(x, tuple) and x in G):
        x = [x]
    out = []
    for v in x:
        if v not in G:
            raise NotInGraphError(f"{what} vertex {v!r} is not a node of the graph")
        out.append(v)
    return frozenset(out)


@dataclass(frozen=True, eq=False)
class OrderingProblem:
    """A weighted graph on vertices ``0..n-1`` with optional pinned ends.

    Attributes
    ----------
    labels : tuple
        ``labels[i]`` is the original node of vertex ``i``.
    edges : ndarray of shape (m, 2), int64
        Each pair ``u < v`` once: loops dropped, parallel edges merged.
    weights : ndarray of shape (m,), float64
        Summed weights of the merged edges (all > 0; zero edges dropped).
    first, last : frozenset of int
        Vertices that must come before (after) all the others.  The width of an
        ordering counts the cuts after each prefix, so with ``first = A`` every
        cut contains ``A`` and with ``last = B`` none contains ``B``.
    """

    labels: tuple
    edges: np.ndarray
    weights: np.ndarray
    first: frozenset
    last: frozenset

    def __post_init__(self) -> None:
        # every solver sums these weights: NaN, inf or negative values would give NaN bounds
        # or endless compiled loops, so a problem built directly is checked too (vectorised)
        w = np.asarray(self.weights, dtype=np.float64)
        bad = ~(np.isfinite(w) & (w >= 0))
        if bad.any():
            from ..errors import WeightError

            e = int(np.flatnonzero(bad)[0])
            u, v = (int(x) for x in self.edges[e])
            raise WeightError(
                f"weight of edge ({self.labels[u]!r}, {self.labels[v]!r}) is {float(w[e])!r}; "
                "expected a finite non-negative number"
            )

    @property
    def n(self) -> int:
        return len(self.labels)

    @property
    def m(self) -> int:
        return int(self.edges.shape[0])

    @property
    def integral(self) -> bool:
        """True when every weight is an integer (SAT encodings need that)."""
        return bool(np.all(self.weights == np.round(self.weights)))

    @classmethod
    def from_graph(
        cls,
        G: Any,
        *,
        weight: str | Callable | None = "weight",
        first: Any = None,
        last: Any = None,
    ) -> "OrderingProblem":
        """Build from a networkx (Multi)Graph or a PlaneGraph, checking everything once."""
        if hasattr(G, "to_networkx") and not isinstance(G, nx.Graph):
            G = G.to_networkx()
        if not isinstance(G, nx.Graph):
            raise InputTypeError(f"expected a networkx graph or a PlaneGraph, got {type(G).__name__}")
        if G.is_directed():
            # every arc is an edge (u -> v and v -> u both cross the cuts between them)
            M = nx.MultiGraph()
            M.add_nodes_from(G.nodes(data=True))
            M.add_edges_from((u, v, d) for u, v, d in G.edges(data=True))
            G = M
        labels = tuple(G.nodes())
        index = {v: i for i, v in enumerate(labels)}
        wf = weight_function(weight)
        acc: dict[tuple[int, int], float] = {}
        if G.is_multigraph():
            it: Iterable = ((u, v, d) for u, v, k, d in G.edges(keys=True, data=True))
        else:
            it = G.edges(data=True)
        for u, v, d in it:
            w = check_weight(wf(u, v, d), f"edge ({u!r}, {v!r})")
            if u == v or w == 0:
                continue
            a, b = index[u], index[v]
            key = (a, b) if a < b else (b, a)
            acc[key] = acc.get(key, 0.0) + w
        F = _as_set(first, G, "first")
        L = _as_set(last, G, "last")
        if F & L:
            both = sorted(map(repr, F & L))
            raise InvalidArgumentError(f"vertices {', '.join(both)} are pinned both first and last")
        keys = sorted(acc)
        edges = np.array(keys, dtype=np.int64).reshape(-1, 2)
        weights = np.array([acc[k] for k in keys], dtype=np.float64)
        check_total(weights, lambda e: f"edge ({labels[keys[e][0]]!r}, {labels[keys[e][1]]!r})")
        return cls(
            labels=labels,
            edges=edges,
            weights=weights,
            first=frozenset(index[v] for v in F),
            last=frozenset(index[v] for v in L),
        )

    def neighbours(self) -> list[dict[int, float]]:
        """Adjacency as one ``{neighbour: weight}`` dict per vertex."""
        adj: list[dict[int, float]] = [dict() for _ in range(self.n)]
        for (u, v), w in zip(self.edges.tolist(), self.weights.tolist()):
            adj[u][v] = w
            adj[v][u] = w
        return adj

    def cut_profile(self, order: Sequence[int]) -> np.ndarray:
        """Cut weights after each prefix: entry ``i`` is the cut after ``i`` vertices.

        Returns an array of length ``n + 1`` (entries 0 and n are 0).
        """
        n = self.n
        pos = np.empty(n, dtype=np.int64)
        pos[np.asarray(order, dtype=np.int64)] = np.arange(n)
        diff = np.zeros(n + 2)
        if self.m:
            a = pos[self.edges[:, 0]]
            b = pos[self.edges[:, 1]]
            np.add.at(diff, np.minimum(a, b) + 1, self.weights)
            np.add.at(diff, np.maximum(a, b) + 1, -self.weights)
        return np.cumsum(diff)[: n + 1]

    def width(self, order: Sequence[int]) -> float:
        """Width of an ordering of ``0..n-1``: the largest counted cut.

        Counted cuts are those after ``|first|, ..., n - |last|`` vertices (see
        the module notes); whether ``order`` respects the pins is not checked.
        """
        if self.n == 0:
            return 0.0
        prof = self.cut_profile(order)
        lo = len(self.first)
        hi = self.n - len(self.last)
        if lo > hi:
            return 0.0
        return float(np.max(prof[lo : hi + 1]))

    def respects_pins(self, order: Sequence[int]) -> bool:
        """True when ``order`` starts with ``first`` and ends with ``last``."""
        k, l = len(self.first), len(self.last)
        order = list(order)
        return set(order[:k]) == set(self.first) and (l == 0 or set(order[-l:]) == set(self.last))

    def degrees(self) -> np.ndarray:
        """Weighted degree of every vertex (loops excluded)."""
        d = np.zeros(self.n)
        if self.m:
            np.add.at(d, self.edges[:, 0], self.weights)
            np.add.at(d, self.edges[:, 1], self.weights)
        return d

    def csr(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """Adjacency in compressed rows: ``(indptr, indices, weights)``, both directions."""
        n, m = self.n, self.m
        if m == 0:
            return np.zeros(n + 1, dtype=np.int64), np.zeros(0, dtype=np.int64), np.zeros(0)
        src = np.concatenate([self.edges[:, 0], self.edges[:, 1]])
        dst = np.concatenate([self.edges[:, 1], self.edges[:, 0]])
        w = np.concatenate([self.weights, self.weights])
        idx = np.argsort(src, kind="stable")
        indptr = np.zeros(n + 1, dtype=np.int64)
        np.add.at(indptr, src + 1, 1)
        return np.cumsum(indptr), dst[idx].astype(np.int64), w[idx]

    def to_networkx(self) -> nx.Graph:
        """The (merged, loop-free) graph on ``0..n-1`` with a ``weight`` attribute."""
        H = nx.Graph()
        H.add_nodes_from(range(self.n))
        for (u, v), w in zip(self.edges.tolist(), self.weights.tolist()):
            H.add_edge(u, v, weight=w)
        return H

    def is_forest(self) -> bool:
        """True when the merged graph has no cycle."""
        return self.m == self.n - self.component_labels()[0]

    def integer_scale(self, max_denominator: int = 1000) -> int | None:
        """Smallest ``q <= max_denominator`` making every ``q * weight`` an integer, or None.

        Weights are read as exact binary fractions; ``1`` for integral problems.
        """
        if self.integral:
            return 1
        q = 1
        for w in np.unique(self.weights).tolist():
            f = Fraction(w)
            d = f.denominator
            if d > max_denominator:
                return None
            q = q * d // _gcd(q, d)
            if q > max_denominator:
                return None
        return q

    def scaled(self, factor: float) -> "OrderingProblem":
        """The same problem with every weight multiplied by ``factor``."""
        return OrderingProblem(self.labels, self.edges.copy(), self.weights * factor, self.first, self.last)

    def contract_pins(self) -> "PinContraction":
        """An equivalent problem whose ``first`` and ``last`` have at most one vertex each.

        Every counted cut contains all of ``first`` and none of ``last``, so
        each pinned set can be merged into one vertex (edges inside it vanish,
        parallel edges add up) without changing any counted cut.
        """
        return PinContraction.build(self)

    def component_labels(self) -> tuple[int, np.ndarray]:
        """``(count, label)``: the number of connected components and each vertex's component."""
        from scipy.sparse import coo_matrix
        from scipy.sparse.csgraph import connected_components

        n = self.n
        if n == 0:
            return 0, np.zeros(0, dtype=np.int64)
        A = coo_matrix((np.ones(self.m), (self.edges[:, 0], self.edges[:, 1])), shape=(n, n))
        k, lab = connected_components(A, directed=False)
        return int(k), lab

    def components(self) -> list[list[int]]:
        """Vertex sets of the connected components (isolated vertices included)."""
        k, lab = self.component_labels()
        order = np.argsort(lab, kind="stable")
        bounds = np.searchsorted(lab[order], np.arange(k + 1))
        return [order[bounds[i] : bounds[i + 1]].tolist() for i in range(k)]

    def subproblem(self, vertices: Sequence[int]) -> "OrderingProblem":
        """The induced subproblem on ``vertices`` (renumbered in the given order)."""
        vertices = [int(v) for v in vertices]
        idx = np.full(self.n, -1, dtype=np.int64)
        idx[np.asarray(vertices, dtype=np.int64)] = np.arange(len(vertices))
        if self.m:
            a = idx[self.edges[:, 0]]
            b = idx[self.edges[:, 1]]
            keep = (a >= 0) & (b >= 0)
            e = np.stack([np.minimum(a, b)[keep], np.maximum(a, b)[keep]], axis=1).reshape(-1, 2)
            w = self.weights[keep].copy()
            srt = np.lexsort((e[:, 1], e[:, 0]))
            e, w = e[srt], w[srt]
        else:
            e, w = np.zeros((0, 2), dtype=np.int64), np.zeros(0)
        return OrderingProblem(
            labels=tuple(self.labels[v] for v in vertices),
            edges=e,
            weights=w,
            first=frozenset(int(idx[v]) for v in self.first if idx[v] >= 0),
            last=frozenset(int(idx[v]) for v in self.last if idx[v] >= 0),
        )


def _gcd(a: int, b: int) -> int:
    while b:
        a, b = b, a % b
    return a


@dataclass(frozen=True, eq=False)
class PinContraction:
    """A problem with its pinned sets merged, and the way back.

    Attributes
    ----------
    original : OrderingProblem
    problem : OrderingProblem
        Vertices are ``original`` vertices, except that ``first`` (``last``) of
        more than one vertex became one vertex (the lowest index in the set
        represents it, ``labels`` keeps that vertex's label).
    groups : tuple of tuple of int
        ``groups[i]`` lists the original vertices behind vertex ``i``.
    """

    original: OrderingProblem
    problem: OrderingProblem
    groups: tuple = field(default=())

    @classmethod
    def build(cls, P: OrderingProblem) -> "PinContraction":
        if len(P.first) <= 1 and len(P.last) <= 1:
            return cls(P, P, tuple((i,) for i in range(P.n)))
        rep = list(range(P.n))
        for S in (P.first, P.last):
            if len(S) > 1:
                r = min(S)
                for v in S:
                    rep[v] = r
        keep = sorted(set(rep))
        new = {v: i for i, v in enumerate(keep)}
        groups: list[list[int]] = [[] for _ in keep]
        for v in range(P.n):
            groups[new[rep[v]]].append(v)
        acc: dict[tuple[int, int], float] = {}
        for (u, v), w in zip(P.edges.tolist(), P.weights.tolist()):
            a, b = new[rep[u]], new[rep[v]]
            if a == b:
                continue
            key = (a, b) if a < b else (b, a)
            acc[key] = acc.get(key, 0.0) + w
        keys = sorted(acc)
        Q = OrderingProblem(
            labels=tuple(P.labels[v] for v in keep),
            edges=np.array(keys, dtype=np.int64).reshape(-1, 2),
            weights=np.array([acc[k] for k in keys], dtype=np.float64),
            first=frozenset(new[rep[v]] for v in P.first),
            last=frozenset(new[rep[v]] for v in P.last),
        )
        return cls(P, Q, tuple(tuple(g) for g in groups))

    def expand(self, order: Sequence[int]) -> list[int]:
        """An ordering of the original vertices from one of the contracted problem."""
        out: list[int] = []
        for i in order:
            out.extend(self.groups[int(i)])
        return out
