"""Vertex-ordering problems (cutwidth and its pinned variants) as plain arrays.

Solvers in :mod:`sweepwidth.solve` receive an :class:`OrderingProblem`, never a
networkx graph: the conversion and every check happen once, here.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Callable, Hashable, Iterable, Sequence

import networkx as nx
import numpy as np

from .._weights import check_weight, weight_function
from ..errors import SweepwidthError, UnsupportedOptionError

__all__ = ["OrderingProblem"]


def _as_set(x: Any, G: nx.Graph, what: str) -> frozenset:
    if x is None:
        return frozenset()
    if not isinstance(x, (set, frozenset, list, tuple)) or (isinstance(x, tuple) and x in G):
        x = [x]
    out = []
    for v in x:
        if v not in G:
            raise SweepwidthError(f"{what} vertex {v!r} is not a node of the graph")
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
            raise SweepwidthError(f"expected a networkx graph or a PlaneGraph, got {type(G).__name__}")
        if G.is_directed():
            G = G.to_undirected(as_view=False)
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
            raise SweepwidthError(f"vertices {', '.join(both)} are pinned both first and last")
        keys = sorted(acc)
        edges = np.array(keys, dtype=np.int64).reshape(-1, 2)
        weights = np.array([acc[k] for k in keys], dtype=np.float64)
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

    def width(self, order: Sequence[int]) -> float:
        """Width of an ordering of ``0..n-1`` (pins not checked here)."""
        pos = np.empty(self.n, dtype=np.int64)
        pos[np.asarray(order, dtype=np.int64)] = np.arange(self.n)
        if self.m == 0 or self.n < 2:
            return 0.0
        a = pos[self.edges[:, 0]]
        b = pos[self.edges[:, 1]]
        lo = np.minimum(a, b)
        hi = np.maximum(a, b)
        diff = np.zeros(self.n + 1)
        np.add.at(diff, lo, self.weights)
        np.add.at(diff, hi, -self.weights)
        return float(np.max(np.cumsum(diff)[: self.n - 1])) if self.n > 1 else 0.0

    def components(self) -> list[list[int]]:
        """Vertex sets of the connected components (isolated vertices included)."""
        H = nx.Graph()
        H.add_nodes_from(range(self.n))
        H.add_edges_from(self.edges.tolist())
        return [sorted(c) for c in nx.connected_components(H)]

    def subproblem(self, vertices: Sequence[int]) -> "OrderingProblem":
        """The induced subproblem on ``vertices`` (renumbered in the given order)."""
        idx = {v: i for i, v in enumerate(vertices)}
        keep = [k for k, (u, v) in enumerate(self.edges.tolist()) if u in idx and v in idx]
        e = np.array([[idx[int(self.edges[k, 0])], idx[int(self.edges[k, 1])]] for k in keep], dtype=np.int64).reshape(-1, 2)
        return OrderingProblem(
            labels=tuple(self.labels[v] for v in vertices),
            edges=e,
            weights=self.weights[keep].copy(),
            first=frozenset(idx[v] for v in self.first if v in idx),
            last=frozenset(idx[v] for v in self.last if v in idx),
        )
