"""Lower bounds on the (pinned) cutwidth of an :class:`OrderingProblem`.

Every bound here is proven, never estimated: floating-point results are
rounded down with a safety margin and, for integral weights, to the integer
below.  Pinned problems should be passed after
:meth:`~sweepwidth.problems.OrderingProblem.contract_pins`, but each bound is
valid for any problem (pins only remove orderings).
"""

from __future__ import annotations

import math
import time
from typing import Any

import numpy as np

from ...problems.ordering import OrderingProblem

__all__ = [
    "degree_bound",
    "pin_bound",
    "spectral_bound",
    "isoperimetric_bound",
    "routing_bound",
    "tree_bound",
    "lower_bounds",
]

_EPS = 1e-9


def _floor_safe(x: float, integral: bool) -> float:
    """Round a computed real bound down so that float error can never overstate it.

    For integral weights every cut is an integer, so the bound is the next
    integer at or above ``x`` minus a tolerance.
    """
    if not math.isfinite(x) or x <= 0:
        return 0.0
    tol = 1e-6 * (1.0 + abs(x))
    if integral:
        return float(max(0, math.ceil(x - tol)))
    return max(0.0, x - tol)


def degree_bound(problem: OrderingProblem) -> float:
    """Degree bound: ``max_v w(delta(v)) / 2`` (rounded up for integral weights).

    Placing ``v`` after a prefix ``S`` gives ``cut(S) + cut(S + v) >= w(delta(v))``,
    so one of the two cuts carries half of ``v``'s edges.  A pinned first vertex
    ``a`` contributes its full boundary (the cut after ``a`` is counted), and so
    does a pinned last vertex.  The vertex right after a pinned first vertex
    ``a`` (or before a pinned last one) is not covered by the half rule when
    ``S`` would be empty, but then ``S = {a}`` and the rule holds again.

    Parameters
    ----------
    problem : OrderingProblem
        Pinned sets of at most one vertex (use ``contract_pins`` first).

    Returns
    -------
    float

    Notes
    -----
    ``O(n + m)``.  For vertices that would come first without pins the half
    rule still holds because the empty prefix has cut 0.

    Examples
    --------
    >>> import networkx as nx
    >>> degree_bound(OrderingProblem.from_graph(nx.star_graph(5)))
    3.0
    """
    if problem.n < 2 or problem.m == 0:
        return 0.0
    deg = problem.degrees()
    half = float(deg.max()) / 2
    if problem.integral:
        half = float(math.ceil(half - 1e-9))
    best = half
    if len(problem.first) == 1:
        best = max(best, float(deg[next(iter(problem.first))]))
    if len(problem.last) == 1:
        best = max(best, float(deg[next(iter(problem.last))]))
    return best


def pin_bound(problem: OrderingProblem) -> float:
    """Cut between the pinned ends: every counted prefix separates ``first`` from ``last``.

    Returns the weight of a minimum ``first``-``last`` cut (maximum flow), or
    0 without both pins.

    Notes
    -----
    One maximum-flow computation (networkx preflow-push), ``O(n^2 sqrt(m))``.

    References
    ----------
    .. [1] Ford and Fulkerson, "Maximal flow through a network", Canadian J. Math. 1956.

    Examples
    --------
    >>> import networkx as nx
    >>> P = OrderingProblem.from_graph(nx.cycle_graph(6), first=0, last=3)
    >>> pin_bound(P)
    2.0
    """
    if not problem.first or not problem.last or problem.m == 0:
        return 0.0
    if problem.integral:
        return _pin_bound_scipy(problem)
    import networkx as nx
    from networkx.algorithms.flow import preflow_push

    H = nx.Graph()
    s, t = "s", "t"
    H.add_nodes_from(range(problem.n))
    for (u, v), w in zip(problem.edges.tolist(), problem.weights.tolist()):
        H.add_edge(u, v, capacity=w)
    for a in problem.first:
        H.add_edge(s, a, capacity=math.inf)
    for b in problem.last:
        H.add_edge(t, b, capacity=math.inf)
    value = nx.maximum_flow_value(H, s, t, flow_func=preflow_push)
    return _floor_safe(float(value), problem.integral)


def _pin_bound_scipy(problem: OrderingProblem) -> float:
    """Integral case of :func:`pin_bound` with scipy's maximum flow (Edmonds-Karp / Dinic)."""
    import scipy.sparse as sp
    from scipy.sparse.csgraph import maximum_flow

    n = problem.n
    s, t = n, n + 1
    u = problem.edges[:, 0]
    v = problem.edges[:, 1]
    w = np.round(problem.weights).astype(np.int64)
    big = int(w.sum()) + 1
    F = sorted(problem.first)
    L = sorted(problem.last)
    rows = np.concatenate([u, v, np.full(len(F), s), np.array(L, dtype=np.int64)])
    cols = np.concatenate([v, u, np.array(F, dtype=np.int64), np.full(len(L), t)])
    cap = np.concatenate([w, w, np.full(len(F) + len(L), big)])
    if big >= 2**31:
        return 0.0  # capacities beyond int32: skip (the bound is optional)
    A = sp.csr_matrix((cap.astype(np.int32), (rows, cols)), shape=(n + 2, n + 2))
    A.sum_duplicates()
    return float(maximum_flow(A, s, t).flow_value)


def spectral_bound(problem: OrderingProblem) -> float:
    """Spectral bound ``lambda_2 * floor(n/2) * ceil(n/2) / n``.

    ``lambda_2`` is the second-smallest eigenvalue of the weighted Laplacian;
    ``w(delta(S)) >= lambda_2 |S| (n - |S|) / n`` for every ``S``, and some
    prefix has ``|S| = floor(n/2)``.

    Notes
    -----
    Dense ``eigvalsh`` for ``n <= 300``, sparse shift-invert Lanczos above (a
    few seconds at ``n = 10^4`` on meshes) when the Laplacian's factors stay
    sparse (small reverse Cuthill-McKee bandwidth), dense again up to 2500
    vertices otherwise, and skipped (0) beyond.  The eigenvalue is lowered by a relative
    ``1e-7`` before use, so numerical error never overstates the bound.  A
    disconnected graph gives 0.

    References
    ----------
    .. [1] Juvan and Mohar, "Optimal linear labelings and eigenvalues of graphs",
       Discrete Applied Mathematics 36 (1992).

    Examples
    --------
    >>> import networkx as nx
    >>> spectral_bound(OrderingProblem.from_graph(nx.complete_graph(6)))
    9.0
    """
    n = problem.n
    if n < 2 or problem.m == 0:
        return 0.0
    lam = _lambda2(problem)
    if lam is None or lam <= 0:
        return 0.0  # not computed, or disconnected
    lam = lam * (1 - 1e-7) - 1e-9 * float(problem.weights.max())
    val = lam * (n // 2) * ((n + 1) // 2) / n
    return _floor_safe(val, problem.integral)


def _factor_cheap(problem: OrderingProblem) -> bool:
    """True when a sparse LU of the Laplacian should be cheap (small profile after RCM).

    Shift-invert Lanczos factorises the Laplacian; on expanders the factors
    are nearly dense.  The reverse Cuthill-McKee bandwidth ``b`` bounds the
    fill, and ``n b^2`` estimates the work.
    """
    import scipy.sparse as sp
    from scipy.sparse.csgraph import reverse_cuthill_mckee

    n = problem.n
    if problem.m == 0:
        return True
    u, v = problem.edges[:, 0], problem.edges[:, 1]
    A = sp.coo_matrix((np.ones(2 * problem.m), (np.concatenate([u, v]), np.concatenate([v, u]))), shape=(n, n)).tocsr()
    perm = reverse_cuthill_mckee(A, symmetric_mode=True)
    pos = np.empty(n, dtype=np.int64)
    pos[perm] = np.arange(n)
    bw = int(np.abs(pos[u] - pos[v]).max())
    return n * bw * bw <= 3e9


def _lambda2(problem: OrderingProblem) -> float | None:
    import scipy.sparse as sp

    n = problem.n
    u, v = problem.edges[:, 0], problem.edges[:, 1]
    w = problem.weights
    A = sp.coo_matrix((np.concatenate([w, w]), (np.concatenate([u, v]), np.concatenate([v, u]))), shape=(n, n)).tocsr()
    L = sp.diags(np.asarray(A.sum(axis=1)).ravel()) - A
    cheap = n <= 300 or _factor_cheap(problem)
    if n <= 300 or (not cheap and n <= 2500):
        ev = np.linalg.eigvalsh(L.toarray())
        return float(ev[1])
    if not cheap:
        return None  # dense is too big and the factors would be dense too
    from scipy.sparse.linalg import eigsh

    try:
        # shift-invert about a small negative number: the two smallest eigenvalues
        vals = eigsh(L.tocsc(), k=2, sigma=-1e-3, which="LM", return_eigenvectors=False, tol=1e-10)
        return float(np.sort(vals)[1])
    except Exception:  # ARPACK failure: the bound is optional
        return None


def isoperimetric_bound(problem: OrderingProblem, max_n: int = 20) -> float | None:
    """Edge-isoperimetric bound ``max_k min_{|S|=k} w(delta(S))`` over counted prefixes.

    Each ordering has a prefix of every size ``k``; with pins, only sets
    containing ``first`` and avoiding ``last`` are minimised over.  Computed
    exactly by enumerating subsets, so only for ``n <= max_n`` (else None).

    Notes
    -----
    ``O(2^n m)`` time, vectorised with numpy.

    Examples
    --------
    >>> import networkx as nx
    >>> isoperimetric_bound(OrderingProblem.from_graph(nx.cycle_graph(6)))
    2.0
    """
    n = problem.n
    if n > max_n:
        return None
    if n < 2 or problem.m == 0:
        return 0.0
    S = np.arange(1 << n, dtype=np.int64)
    cut = np.zeros(1 << n)
    for (a, b), w in zip(problem.edges.tolist(), problem.weights.tolist()):
        cut += w * (((S >> a) ^ (S >> b)) & 1)
    ok = np.ones(1 << n, dtype=bool)
    for a in problem.first:
        ok &= ((S >> a) & 1).astype(bool)
    for b in problem.last:
        ok &= ~((S >> b) & 1).astype(bool)
    pc = np.zeros(1 << n, dtype=np.int64)
    for i in range(n):
        pc += (S >> i) & 1
    best = 0.0
    for k in range(len(problem.first), n - len(problem.last) + 1):
        sel = ok & (pc == k)
        if sel.any():
            best = max(best, float(cut[sel].min()))
    return best


def routing_bound(problem: OrderingProblem, time_budget: float = 5.0, seed: int = 0) -> float | None:
    """Multicommodity-flow bound from routing pairs along shortest paths.

    Choose source vertices ``T`` and let every pair ``(s, t)``, ``s`` in ``T``,
    send one unit split evenly over the shortest ``s``-``t`` paths (edge
    betweenness).  If the load on every edge is at most ``c * w(e)``, a set
    ``S`` of size ``k`` separates at least ``|T| min(k, n - k)`` of these pairs
    (``|T & S| (n - k) + |T - S| k``), each sending its unit across
    ``delta(S)``, so ``w(delta(S)) >= |T| min(k, n - k) / c``.  Some prefix
    has ``k = floor(n/2)``, which bounds the cutwidth.  With ``T`` all
    vertices this is ``n floor(n/2) / c``; a sample of sources (taken when the
    time budget is short) keeps the bound valid, only a little weaker.  Strong
    on meshes (about ``2n/3`` on the ``n x n`` grid, where the degree and
    spectral bounds stay constant).

    Parameters
    ----------
    problem : OrderingProblem
    time_budget : float
        Seconds; sources are processed in chunks until it is spent.
    seed : int
        Order in which sources are sampled.

    Returns
    -------
    float or None
        None for a disconnected graph.

    Notes
    -----
    Brandes' accumulation, ``O(|T| m)`` with a compiled kernel
    (:mod:`sweepwidth.solve.ordering.kernels`).

    References
    ----------
    .. [1] Leighton and Rao, "Multicommodity max-flow min-cut theorems and their use
       in designing approximation algorithms", J. ACM 46 (1999).
    .. [2] Brandes, "A faster algorithm for betweenness centrality", J. Math.
       Sociology 25 (2001).

    Examples
    --------
    >>> import networkx as nx
    >>> routing_bound(OrderingProblem.from_graph(nx.cycle_graph(8)))
    2.0
    """
    from . import kernels as _kernels

    n = problem.n
    if n < 2 or problem.m == 0:
        return 0.0
    if len(problem.components()) > 1:
        return None
    indptr, indices, eid = _kernels.csr_with_ids(n, problem.edges)
    order = np.random.default_rng(seed).permutation(n).astype(np.int64)
    load = np.zeros(problem.m)
    t_end = time.monotonic() + time_budget
    done = 0
    chunk = 1 if n > 2000 else max(1, n // 4)
    while done < n:
        t = time.monotonic()
        part = order[done : done + chunk]
        load += _kernels.edge_betweenness(n, indptr, indices, eid, problem.m, part)
        done += part.shape[0]
        spent = time.monotonic() - t
        if time.monotonic() > t_end:
            break
        # grow chunks to about a tenth of the budget
        per = spent / max(1, part.shape[0])
        chunk = int(max(1, min(n - done, (0.1 * time_budget) / max(per, 1e-7))))
    ratio = load / problem.weights
    c = float(ratio.max())
    if c <= 0:
        return 0.0
    c = c * (1 + 1e-9) + 1e-12
    val = done * (n // 2) / c
    return _floor_safe(val, problem.integral)


def tree_bound(problem: OrderingProblem, max_n: int = 5000) -> float | None:
    """Three-branch bound for forests with integer weights (None otherwise).

    If three branches at a vertex ``v`` (components of ``T - v``, each with
    ``v`` and its edge to ``v``) all have cutwidth at least ``k``, then
    ``cw(T) >= k + 1``: in a layout of width ``k`` each branch has a gap
    crossed by ``k`` of its own edges and by nothing else, so the rest of the
    tree (connected through ``v``) lies on one side of that gap; the middle one
    of the three gaps then has the other two branches on one side, yet one of
    them crosses a gap beyond it.

    The rule is applied recursively.  Root each tree; for a vertex ``v`` with
    parent ``p`` the piece ``P_v`` is the subtree of ``v`` plus ``p``.  Its
    bound ``f(v)`` is the largest of its edge weight, its children's bounds and
    the rule at every vertex ``z`` of the piece, where ``z``'s branches are the
    children's pieces and the part above ``z``; the part above is bounded by
    the largest of the subgraphs it contains: the edge to the parent ``q``,
    the sibling pieces below ``q``, and the part above ``q``.  On complete
    binary trees this reaches the exact value ``ceil(h/2) + 1``.

    Parameters
    ----------
    problem : OrderingProblem
    max_n : int
        Above this many vertices only the rule at piece roots is used
        (``O(n)`` instead of ``O(n * depth)``).

    Notes
    -----
    ``O(n * depth)`` time.

    References
    ----------
    .. [1] Ellis, Sudborough and Turner, "The vertex separation and search
       number of a graph", Information and Computation 113, 1994 (the rule is
       the cutwidth analogue of its three-branch lemma for trees).

    Examples
    --------
    >>> import networkx as nx
    >>> tree_bound(OrderingProblem.from_graph(nx.balanced_tree(2, 6)))
    4.0
    """
    if not problem.integral or not problem.is_forest():
        return None
    if problem.m == 0:
        return 0.0
    adj = problem.neighbours()
    n = problem.n
    deep = n <= max_n

    def third(vals: list[float]) -> float:
        vals = sorted(vals, reverse=True)
        return vals[2] if len(vals) >= 3 else 0.0

    def rule(up: float, kids: list[float]) -> float:
        t = third([up] + kids)
        return t + 1 if t > 0 else 0.0

    parent = [-1] * n
    children: list[list[int]] = [[] for _ in range(n)]
    post: list[int] = []
    roots: list[int] = []
    seen = [False] * n
    for r in range(n):
        if seen[r]:
            continue
        roots.append(r)
        seen[r] = True
        stack = [r]
        pre = []
        while stack:
            v = stack.pop()
            pre.append(v)
            for u in adj[v]:
                if not seen[u]:
                    seen[u] = True
                    parent[u] = v
                    children[v].append(u)
                    stack.append(u)
        post.extend(reversed(pre))
    f = [0.0] * n  # bound of the piece above each non-root vertex

    def scan(top: int, up_top: float) -> float:
        """Largest rule value over the subtree of ``top`` given its upward bound."""
        best = 0.0
        stack = [(top, up_top)]
        while stack:
            z, up = stack.pop()
            kids = [f[c] for c in children[z]]
            best = max(best, rule(up, kids))
            if not deep and z != top:
                continue
            if kids:
                order = sorted(kids, reverse=True)
                for c in children[z]:
                    sib = order[0] if order[0] != f[c] or order.count(f[c]) > 1 else (order[1] if len(order) > 1 else 0.0)
                    stack.append((c, max(adj[z][c], up, sib)))
        return best

    for v in post:
        p = parent[v]
        if p < 0:
            continue
        val = max([adj[p][v]] + [f[c] for c in children[v]])
        val = max(val, scan(v, adj[p][v]))
        f[v] = val
    best = max(f)
    for r in roots:
        best = max(best, scan(r, 0.0))
    return float(best)


def lower_bounds(
    problem: OrderingProblem, *, deadline: float | None = None, exact_small: int = 16, which: str = "all"
) -> dict[str, float]:
    """All cheap lower bounds that apply, by name.

    Parameters
    ----------
    problem : OrderingProblem
    deadline : float, optional
        ``time.monotonic()`` value; expensive bounds are skipped near it.
    exact_small : int
        Compute the isoperimetric bound up to this many vertices.
    which : str
        'cheap' (degree, pins, tree, small isoperimetric: linear time or
        tiny inputs), 'costly' (spectral and routing) or 'all'.

    Returns
    -------
    dict
        ``{'degree': ..., 'spectral': ..., ...}``; the bound is their maximum.

    Examples
    --------
    >>> import networkx as nx
    >>> b = lower_bounds(OrderingProblem.from_graph(nx.grid_2d_graph(4, 4)))
    >>> max(b.values()) <= 5
    True
    """

    def left() -> float:
        return math.inf if deadline is None else deadline - time.monotonic()

    out: dict[str, float] = {}
    if which in ("all", "cheap"):
        out["degree"] = degree_bound(problem)
        if problem.first and problem.last and problem.n <= 20000:
            out["pins"] = pin_bound(problem)
        if problem.m < problem.n and problem.is_forest():
            tb = tree_bound(problem)
            if tb is not None:
                out["tree"] = tb
        if problem.n <= exact_small and left() > 0.5:
            iso = isoperimetric_bound(problem, max_n=exact_small)
            if iso is not None:
                out["isoperimetric"] = iso
    if which == "cheap":
        return out
    if problem.n >= 3 and left() > 1.0 and problem.n <= 20000:
        out["spectral"] = spectral_bound(problem)
    if problem.n >= 3 and left() > 1.0:
        r = routing_bound(problem, time_budget=min(3.0, max(0.1, left() / 8)))
        if r is not None:
            out["routing"] = r
    return out
