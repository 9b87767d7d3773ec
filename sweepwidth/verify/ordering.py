"""Independent checker for cutwidth witnesses.

The code here reads the networkx graph directly and shares nothing with the
solvers or with :class:`~sweepwidth.problems.OrderingProblem`: it recomputes
every counted cut of an ordering edge by edge.
"""

from __future__ import annotations

import math
import numbers
from typing import Any, Callable, Hashable, Sequence

import networkx as nx

from ..errors import InvalidArgumentError, SweepwidthError, WitnessError
from . import register_checker

__all__ = ["ordering_width", "ordering_cuts", "check_cutwidth"]


def _graph(G: Any) -> nx.Graph:
    if hasattr(G, "to_networkx") and not isinstance(G, nx.Graph):
        G = G.to_networkx()
    if not isinstance(G, nx.Graph):
        raise WitnessError(f"expected a networkx graph or a PlaneGraph, got {type(G).__name__}")
    return G


def _weight_of(weight: str | Callable | None) -> Callable[[Any, Any, dict], float]:
    if weight is None:
        return lambda u, v, d: 1.0
    if callable(weight):
        return weight
    return lambda u, v, d: d.get(weight, 1)


def _as_list(x: Any, G: nx.Graph) -> list:
    if x is None:
        return []
    if isinstance(x, (set, frozenset, list)) or (isinstance(x, tuple) and x not in G):
        return list(x)
    return [x]


def ordering_cuts(
    G: Any, order: Sequence[Hashable], weight: str | Callable | None = "weight"
) -> list[float]:
    """Weights of the cuts after each prefix of ``order``.

    Entry ``i`` (``0 <= i <= n``) is the total weight of the edges with one end
    among the first ``i`` vertices of ``order`` and the other end after them.
    Loops never cross a cut; parallel edges of a multigraph each count.

    Parameters
    ----------
    G : networkx.Graph or MultiGraph, or an object with ``to_networkx()``
    order : sequence of nodes
        Every node of ``G`` exactly once.
    weight : str, callable or None
        Edge attribute (missing means 1), a function ``(u, v, data) -> w``, or
        None for unit weights.

    Returns
    -------
    list of float
        ``n + 1`` cut weights.

    Raises
    ------
    WitnessError
        If ``order`` is not a permutation of the nodes, or a weight is not a
        finite non-negative number.

    Notes
    -----
    ``O(n + m)`` time: each edge adds its weight to the gaps between its ends
    with a difference array.

    Examples
    --------
    >>> import networkx as nx
    >>> ordering_cuts(nx.path_graph(3), [0, 2, 1])
    [0.0, 1.0, 2.0, 0.0]
    """
    G = _graph(G)
    order = list(order)
    pos: dict = {}
    for i, v in enumerate(order):
        if v not in G:
            raise WitnessError(f"witness lists {v!r}, which is not a node of the graph")
        if v in pos:
            raise WitnessError(f"witness lists node {v!r} twice (positions {pos[v]} and {i})")
        pos[v] = i
    if len(pos) != G.number_of_nodes():
        missing = [v for v in G if v not in pos][:5]
        raise WitnessError(f"witness misses {G.number_of_nodes() - len(pos)} node(s), e.g. {missing!r}")
    wf = _weight_of(weight)
    n = len(order)
    diff = [0.0] * (n + 2)
    edges = G.edges(keys=True, data=True) if G.is_multigraph() else G.edges(data=True)
    for e in edges:
        u, v, d = e[0], e[1], e[-1]
        w = wf(u, v, d)
        if isinstance(w, bool) or not isinstance(w, numbers.Real) or not math.isfinite(w) or w < 0:
            raise WitnessError(f"edge ({u!r}, {v!r}) has weight {w!r}; expected a finite non-negative number")
        a, b = pos[u], pos[v]
        if a == b:
            continue
        if a > b:
            a, b = b, a
        diff[a + 1] += float(w)
        diff[b + 1] -= float(w)
    cuts = []
    run = 0.0
    for i in range(n + 1):
        run += diff[i]
        cuts.append(run)
    cuts[0] = 0.0
    cuts[n] = 0.0
    return cuts


def ordering_width(
    G: Any,
    order: Sequence[Hashable],
    weight: str | Callable | None = "weight",
    *,
    first: Any = None,
    last: Any = None,
) -> float:
    """Width of an ordering: the heaviest cut between a prefix and the rest.

    With ``first = A`` (``last = B``) only the prefixes containing all of ``A``
    (none of ``B``) count, i.e. the cuts after ``|A|, ..., n - |B|`` vertices;
    the ordering must then start with ``A`` and end with ``B``.

    Parameters
    ----------
    G : networkx.Graph or MultiGraph, or an object with ``to_networkx()``
    order : sequence of nodes
    weight : str, callable or None
        As in :func:`ordering_cuts`.
    first, last : node or collection of nodes, optional
        Pinned start and end sets.

    Returns
    -------
    float

    Raises
    ------
    WitnessError
        If ``order`` is not a permutation of the nodes or breaks a pin.

    Notes
    -----
    ``O(n + m)`` time.

    Examples
    --------
    >>> import networkx as nx
    >>> ordering_width(nx.cycle_graph(5), [0, 1, 2, 3, 4])
    2.0
    >>> ordering_width(nx.star_graph(4), [1, 0, 2, 3, 4], first=1)
    3.0
    >>> ordering_width(nx.star_graph(4), [1, 2, 0, 3, 4], first=1)
    2.0
    """
    G = _graph(G)
    cuts = ordering_cuts(G, order, weight)
    order = list(order)
    A = _as_list(first, G)
    B = _as_list(last, G)
    for v in A + B:
        if v not in G:
            raise WitnessError(f"pinned vertex {v!r} is not a node of the graph")
    if set(A) & set(B):
        raise WitnessError(f"vertices {sorted(map(repr, set(A) & set(B)))} pinned both first and last")
    k, l = len(set(A)), len(set(B))
    if set(order[:k]) != set(A):
        bad = [v for v in A if v not in set(order[:k])]
        raise WitnessError(f"witness does not start with the first-pinned vertices; {bad[:5]!r} come later")
    if l and set(order[len(order) - l :]) != set(B):
        bad = [v for v in B if v not in set(order[len(order) - l :])]
        raise WitnessError(f"witness does not end with the last-pinned vertices; {bad[:5]!r} come earlier")
    n = len(order)
    lo, hi = k, n - l
    if n == 0 or lo > hi:
        return 0.0
    return max(cuts[lo : hi + 1])


@register_checker("cutwidth")
def check_cutwidth(result: Any, G: Any, **options: Any) -> float:
    """Check a cutwidth result against the graph ``G``; return the recomputed width.

    Options ``first``, ``last`` and ``weight`` default to the values recorded
    in ``result.stats['options']`` (the solver stores them there) and else to
    no pins and ``'weight'``.

    Raises
    ------
    WitnessError
        When the witness is missing, not a permutation of the nodes, breaks a
        pin, or its width differs from ``result.upper``.
    """
    recorded = dict((result.stats or {}).get("options", {}) or {})
    first = options.pop("first", recorded.get("first"))
    last = options.pop("last", recorded.get("last"))
    weight = options.pop("weight", recorded.get("weight", "weight"))
    tol = float(options.pop("tol", 1e-9))
    if options:
        raise InvalidArgumentError(f"unknown checker option(s) {sorted(options)}; valid: first, last, weight, tol")
    if weight == "<callable>":
        raise InvalidArgumentError("the result was computed with a weight function; pass it again: result.check(G, weight=fn)")
    if result.witness is None:
        raise WitnessError("result has no witness ordering to check")
    G = _graph(G)
    order = list(result.witness)
    # JSON round trips turn tuple labels into lists
    if order and any(isinstance(v, list) for v in order):
        order = [tuple(v) if isinstance(v, list) else v for v in order]
    if isinstance(first, list) and first and all(isinstance(v, list) for v in first):
        first = [tuple(v) for v in first]
    if isinstance(last, list) and last and all(isinstance(v, list) for v in last):
        last = [tuple(v) for v in last]
    w = ordering_width(G, order, weight, first=first, last=last)
    if result.upper is None or abs(w - float(result.upper)) > tol * max(1.0, abs(w)):
        raise WitnessError(f"witness has width {w:g} but the result claims upper bound {result.upper!r}")
    if result.lower is not None and float(result.lower) > w + tol * max(1.0, abs(w)):
        raise WitnessError(f"lower bound {result.lower!r} exceeds the witness width {w:g}")
    return w
