"""Exact cutwidth of unit-weight forests, with an optimal ordering.

**This is not Yannakakis' algorithm** [1]_ (whose ``O(n log n)`` label
calculus we do not reconstruct); it is an exact method of our own built on
the path characterisation of tree cutwidth (known from Chung [2]_, stated
here from memory and proved below).  It is exact on every input; its running
time is polynomial for bounded cutwidth (see *Complexity*), and fast in
practice (random trees of ``10^4`` vertices and the complete binary tree of
height 8 in well under a second each, see ``benchmarks/trees.py``).

Definitions
-----------
``cw(T)`` is the least, over orderings of the vertices, of the largest number
of edges joining a prefix to the rest.  ``cw`` never increases on subgraphs
(restrict the ordering).  A *branch* of a path ``P`` is a component of
``T - E(P)``; it contains exactly one vertex of ``P``.

Theorem 1 (path characterisation)
---------------------------------
For a tree ``T`` with at least one edge and ``k >= 1``: ``cw(T) <= k`` if and
only if ``T`` has a path ``P`` whose branches all have cutwidth ``<= k - 1``.

*Proof.* (only if) Take an ordering of width ``<= k`` with first vertex ``x``
and last ``y`` and let ``P`` be the ``x``-``y`` path.  Every gap between two
consecutive positions is crossed by an edge of ``P``.  Restrict the ordering
to a branch ``H``: the cut after its ``j``-th vertex (``j < |H|``) is the set of
``H``-edges crossing the gap after that vertex in the whole ordering, a gap
also crossed by an edge of ``P`` (not in ``H``), so it has at most ``k - 1``
edges.  (if) Let ``P = p_1 ... p_s`` and lay out each branch ``H_i`` (the one of
``p_i``) with width ``<= k - 1``, the blocks one after the other in the order
of ``P``.  A gap inside block ``i`` is crossed by at most ``k - 1`` edges of
``H_i``, by exactly one path edge (``p_{i-1}p_i`` if the gap is left of
``p_i``, ``p_i p_{i+1}`` if right of it) and by nothing else; a gap between
blocks ``i`` and ``i + 1`` by the single edge ``p_i p_{i+1}``.  QED.

Corollary 2 (height labelings)
------------------------------
Call ``h : E(T) -> {1..k}`` a *height labeling* when, for every ``j``, in every
component of the forest of edges of height ``<= j`` the edges of height
exactly ``j`` form a path (possibly empty).  Then ``cw(T) <= k`` iff ``T`` has
a height labeling with values in ``1..k``.  *Proof* by induction on ``k``
(``k = 0``: no edges).  Given ``P`` from Theorem 1, give ``P`` height ``k`` and
label the branches by induction with ``1..k-1``; conversely the height-``k``
edges form a path whose branches carry labelings with ``1..k-1``.  The
layout is rebuilt recursively by the "(if)" part, which is what
:func:`_layout_from_heights` does.

Equivalently (the form the dynamic programme checks): (a) no vertex has
three incident edges of one height ``j`` joined by edges of height ``<= j``
-- at a vertex, three edges of one height are always in one component, so:
no vertex has three edges of one height; and (b) whenever the tree path
between two edges of height ``j`` has all its edges of height ``<= j``, all
of them have height ``j``.  [(a) and (b) say the height-``j`` edges of each
component of the ``<= j`` forest are connected with maximum degree 2.]

The dynamic programme (Lemma 3)
-------------------------------
Root each tree at ``r``.  For a non-root vertex ``v`` with parent ``p`` and a
labeling of ``T_v`` plus the edge ``e_v = vp``, say height ``j`` is *visible*
(from ``p``) when some edge ``f`` of height ``j`` lies in ``T_v + e_v`` with
all edges of the ``p``-``f`` path of height ``<= j``.  With ``t = h(e_v)`` only
heights ``j >= t`` are visible; ``t`` is always visible (``f = e_v``), and by
(b) every visible height-``t`` edge lies on the height-``t`` path through
``e_v``, which ends at ``p``.  The *state* of the labeling is
``(t, V)`` with ``V`` the visible heights ``> t``.  Conditions (a), (b) for
pairs of edges on different sides of ``e_v`` only involve this state: an
outside edge ``g`` of height ``j`` joined to ``p`` by edges of height ``<= j``
conflicts with an inside visible ``j`` exactly when ``j in V`` (the path
between them has ``e_v`` of height ``t < j``), and when ``j = t`` the two must
continue one path through ``p``.  So a labeling of the whole tree exists iff
one can pick, for every child ``c`` of every vertex ``v``, a state
``(t_c, V_c)`` realisable for ``T_c + e_c`` such that at each vertex ``v``
(children ``c``, parent edge of height ``t`` if ``v != r``):

* each height ``j`` is visible (in ``V_c`` or ``= t_c``) from at most two
  children, from two only if both have ``t_c = j`` (the path runs through
  ``v``), and never from a child with ``j in V_c`` and another child;
* ``t`` is not visible from a child that makes ``t`` "blocked" (``t in V_c``,
  or ``t_c = t`` for two children), and
* the state of ``T_v + e_v`` is then ``(t, {j > t : j visible from a child})``.

The programme keeps, per child prefix, the per-height status vector
``s in {0, 1, 2}^k`` (0 = not visible, 1 = open once, 2 = blocked: visible
closed, or open twice), as two bit masks.  A pointwise smaller status vector
allows every continuation a larger one allows, and a child state with
``V subset V'`` (same ``t``) everything ``(t, V')`` allows, so dominated
entries are dropped; nothing else is pruned, so the decision is exact.
Back pointers rebuild a labeling, then the layout.  ``k`` runs upward from
the degree bound ``ceil(max degree / 2)``; each failure proves ``cw > k``.

Complexity
----------
A decision with bound ``k`` touches, per vertex, at most ``3^k`` status
vectors and per child at most ``k 2^k`` states: ``O(n 9^k k)`` time in the
worst case, polynomial for bounded cutwidth (``k <= cw``) but not in general.
In practice the antichains stay tiny (a handful of states per vertex on random
trees and complete binary trees), giving near-linear behaviour; stars and
caterpillars of high degree are also fast since the degree bound leaves no
slack.  Yannakakis [1]_ achieves ``O(n log n)`` in all cases.

References
----------
.. [1] M. Yannakakis, "A polynomial algorithm for the min-cut linear
   arrangement of trees", Journal of the ACM 32(4):950-988, 1985.
.. [2] F. R. K. Chung, "On the cutwidth and the topological bandwidth of a
   tree", SIAM J. Algebraic Discrete Methods 6(2):268-277, 1985 (the path
   characterisation; from memory, proved above independently).
.. [3] T. Lengauer, "Upper and lower bounds on the complexity of the min-cut
   linear arrangement problem on trees", SIAM J. Algebraic Discrete Methods
   3(1), 1982 (complete binary trees; from memory).

Examples
--------
>>> import networkx as nx
>>> from sweepwidth.problems.ordering import OrderingProblem
>>> tree_cutwidth_exact(OrderingProblem.from_graph(nx.balanced_tree(2, 6)))[0]   # ceil(6/2) + 1
4
"""

from __future__ import annotations

import time

import numpy as np

from ...errors import InvalidArgumentError, ProblemTooLargeError, SweepwidthError
from ...problems.ordering import OrderingProblem

__all__ = ["tree_cutwidth_exact", "TreeDeadlineError"]


class TreeDeadlineError(SweepwidthError, TimeoutError):
    """The deadline passed before the exact tree method finished.

    ``lower`` is the largest bound proven so far (every failed decision
    ``cw <= k`` proves ``cw >= k + 1``).
    """

    def __init__(self, message: str, lower: int) -> None:
        super().__init__(message)
        self.lower = lower


def _check_unit_forest(problem: OrderingProblem, what: str) -> None:
    if not problem.is_forest():
        raise InvalidArgumentError(f"{what} needs a forest; this graph has a cycle (after merging parallel edges)")
    if problem.m and not np.all(problem.weights == 1.0):
        bad = int(np.flatnonzero(problem.weights != 1.0)[0])
        u, v = problem.edges[bad].tolist()
        raise InvalidArgumentError(
            f"{what} needs unit weights (weighted trees are NP-hard; use sweepwidth.cutwidth); "
            f"edge ({problem.labels[u]!r}, {problem.labels[v]!r}) has weight {problem.weights[bad]} "
            "(parallel edges add up)"
        )


def _check(problem: OrderingProblem) -> None:
    _check_unit_forest(problem, "tree_cutwidth_exact")
    if problem.first or problem.last:
        raise InvalidArgumentError(
            "tree_cutwidth_exact does not support pinned first/last vertices; "
            "use sweepwidth.cutwidth (or trees.tree_cutwidth for bounds)"
        )


def _prune_agg(states: dict) -> dict:
    """Drop status vectors (B, O) dominated pointwise by another (0 < 1 < 2)."""
    if len(states) <= 1:
        return states
    keys = sorted(states, key=lambda k: (k[0].bit_count(), (k[0] | k[1]).bit_count()))
    kept: list[tuple[int, int]] = []
    for B, O in keys:
        BO = B | O
        dominated = False
        for B2, O2 in kept:
            if B2 & ~B == 0 and (B2 | O2) & ~BO == 0:
                dominated = True
                break
        if not dominated:
            kept.append((B, O))
    return {k: states[k] for k in kept}


_STATE_CAP = 200_000


_pop = int.bit_count


def _flex_slots(B: int, O: int, k: int, t: int | None, X: int) -> list[int]:
    """Heights offered to the flexible children, in the order of Lemma 4 (module notes)."""
    slots: list[int] = []
    top = k if t is None else t - 1
    for h in range(1, top + 1):
        bit = 1 << (h - 1)
        slots.extend([h] * (0 if B & bit else 1 if O & bit else 2))
    if t is None:
        return slots
    bt = 1 << (t - 1)
    if not O & bt:
        slots.append(t)
    for h in range(t + 1, k + 1):
        if O >> (h - 1) & 1:
            slots.append(h)
    for h in range(t + 1, k + 1):
        if X >> (h - 1) & 1:
            slots.extend([h, h])
    return slots


def _decide(adj: list[list[int]], order: list[int], parent: list[int], k: int, deadline: float | None):
    """Heights of the parent edges of a labeling with values ``1..k``, or None (module notes)."""
    from itertools import combinations

    full = (1 << k) - 1
    up: dict[int, list[tuple[int, int, tuple]]] = {}
    flex: dict[int, bool] = {}
    stages: dict[int, list[dict]] = {}
    hard_of: dict[int, list[int]] = {}
    flex_of: dict[int, list[int]] = {}
    choice: dict[int, tuple] = {}  # root: chosen aggregated key
    for count, v in enumerate(reversed(order)):
        if deadline is not None and count % 64 == 0 and time.monotonic() > deadline:
            raise TimeoutError
        p = parent[v]
        kids = [c for c in adj[v] if c != p]
        if not kids:  # a leaf: states (t, {}) for every t, i.e. flexible (no list kept)
            flex[v] = True
            hard_of[v], flex_of[v] = kids, kids
            continue
        hard = [c for c in kids if not flex[c]]
        fl = [c for c in kids if flex[c]]
        hard_of[v], flex_of[v] = hard, fl
        F = len(fl)
        cur: dict = {(0, 0): None}
        st: list[dict] = []
        for c in hard:
            nxt: dict = {}
            cs = up[c]
            for key in cur:
                B, O = key
                BO = B | O
                for idx, (t, V, _) in enumerate(cs):
                    if V & BO:
                        continue
                    bt = 1 << (t - 1)
                    if B & bt:
                        continue
                    if O & bt:
                        k2 = (B | V | bt, O ^ bt)
                    else:
                        k2 = (B | V, O | bt)
                    if k2 not in nxt:
                        nxt[k2] = (key, idx)
                if len(nxt) > _STATE_CAP:
                    raise ProblemTooLargeError(f"tree_cutwidth_exact: more than {_STATE_CAP} states at one vertex")
            if not nxt:
                return None
            if len(nxt) > 1:
                nxt = _prune_agg(nxt)
            st.append(nxt)
            cur = nxt
            if deadline is not None and time.monotonic() > deadline:
                raise TimeoutError
        stages[v] = st
        if p < 0:
            for key in cur:
                B, O = key
                if 2 * k - 2 * _pop(B) - _pop(O) >= F:
                    choice[v] = (key, None, 0)
                    break
            else:
                return None
            continue
        by_t: dict[int, dict[int, tuple]] = {}
        for key in cur:
            B, O = key
            BO = B | O
            for t in range(1, k + 1):
                bt = 1 << (t - 1)
                if B & bt:
                    continue
                above = full & ~((1 << t) - 1)
                low = bt - 1
                cap = 2 * (t - 1) - 2 * _pop(B & low) - _pop(O & low) + (0 if O & bt else 1)
                r = F - cap
                base = BO & above
                d = by_t.setdefault(t, {})
                if r > 0:
                    r -= _pop(O & above)
                if r <= 0:
                    if base not in d:
                        d[base] = (key, 0)
                    continue
                q = (r + 1) // 2
                free = above & ~BO
                bits = [1 << i for i in range(k) if free >> i & 1]
                if len(bits) < q:
                    continue
                n_comb = 1
                for i in range(q):
                    n_comb = n_comb * (len(bits) - i) // (i + 1)
                if n_comb > _STATE_CAP:
                    raise ProblemTooLargeError(f"tree_cutwidth_exact: more than {_STATE_CAP} states at one vertex")
                for comb in combinations(bits, q):
                    X = sum(comb)
                    V = base | X
                    if V not in d:
                        d[V] = (key, X)
        ups: list[tuple[int, int, tuple]] = []
        for t, d in by_t.items():
            vs = sorted(d, key=_pop)
            kept: list[int] = []
            for V in vs:
                if all(W & ~V for W in kept):
                    kept.append(V)
            ups.extend((t, V, d[V]) for V in kept)
        if not ups:
            return None
        up[v] = ups
        zero = {t for t, V, _ in ups if V == 0}
        flex[v] = len(zero) == k
    # rebuild the heights of parent edges
    height = [0] * len(parent)
    r = order[0]
    key, t0, X0 = choice[r]
    stack: list[tuple[int, tuple, int | None, int]] = [(r, key, None, 0)]
    while stack:
        v, key, t_par, X = stack.pop()
        hard = hard_of[v]
        st = stages[v]
        B, O = key
        slots = _flex_slots(B, O, k, t_par, X)
        fl = flex_of[v]
        if len(slots) < len(fl):
            raise AssertionError("internal error: too few slots for the flexible children")
        for c, hc in zip(fl, slots):
            height[c] = hc
            if c not in up:  # a leaf
                continue
            for tt, V, (ckey, cX) in up[c]:
                if tt == hc and V == 0:
                    stack.append((c, ckey, hc, cX))
                    break
            else:
                raise AssertionError("internal error: flexible child without a free state")
        for i in range(len(hard) - 1, -1, -1):
            prev, idx = st[i][key]
            c = hard[i]
            tc, _, (ckey, cX) = up[c][idx]
            height[c] = tc
            stack.append((c, ckey, tc, cX))
            key = prev
    return height


def _layout_from_heights(adj: list[list[int]], parent: list[int], height: list[int], root: int, k: int) -> list[int]:
    """The ordering of the "(if)" part of Theorem 1, applied level by level."""

    def h(u: int, w: int) -> int:
        return height[u] if parent[u] == w else height[w]

    out: list[int] = []
    stack: list[tuple[int, int]] = [(root, k)]  # (seed vertex, height limit); processed LIFO
    while stack:
        seed, lim = stack.pop()
        comp = [seed]
        seen = {seed}
        top = 0
        for x in comp:
            for y in adj[x]:
                if y not in seen:
                    hy = h(x, y)
                    if hy <= lim:
                        seen.add(y)
                        comp.append(y)
                        if hy > top:
                            top = hy
        if top == 0:
            out.append(seed)
            continue
        padj: dict[int, list[int]] = {}
        for x in comp:
            for y in adj[x]:
                if y in seen and h(x, y) == top:
                    padj.setdefault(x, []).append(y)
        ends = [x for x, ys in padj.items() if len(ys) == 1]
        if len(ends) != 2 or any(len(ys) > 2 for ys in padj.values()):
            raise AssertionError("internal error: height-%d edges do not form a path" % top)
        path = [ends[0]]
        prev = -1
        while True:
            x = path[-1]
            nxt = [y for y in padj[x] if y != prev]
            if not nxt:
                break
            prev = x
            path.append(nxt[0])
        if len(path) != sum(len(ys) for ys in padj.values()) // 2 + 1:
            raise AssertionError("internal error: height-%d edges are not connected" % top)
        for x in reversed(path):
            stack.append((x, top - 1))
    return out


def tree_cutwidth_exact(problem: OrderingProblem, deadline: float | None = None) -> tuple[int, list[int]]:
    """Exact cutwidth of a unit-weight forest and an optimal ordering (module notes).

    Parameters
    ----------
    problem : OrderingProblem
        A forest with unit weights and no pinned vertices.
    deadline : float, optional
        ``time.monotonic()`` value; past it :class:`TreeDeadlineError` is raised
        with the best proven lower bound.

    Returns
    -------
    (width, order)
        ``width = cw`` and ``order`` an ordering of that width (recomputed and
        checked before returning).

    Raises
    ------
    SweepwidthError
        A cycle or a weight other than 1.
    InvalidArgumentError
        Pinned first/last vertices.
    TreeDeadlineError
        The deadline passed.

    Examples
    --------
    >>> import networkx as nx
    >>> tree_cutwidth_exact(OrderingProblem.from_graph(nx.star_graph(7)))[0]   # K_{1,7}: ceil(7/2)
    4
    >>> tree_cutwidth_exact(OrderingProblem.from_graph(nx.path_graph(5)))
    (1, [0, 1, 2, 3, 4])
    """
    _check(problem)
    n = problem.n
    adj: list[list[int]] = [[] for _ in range(n)]
    for u, v in problem.edges.tolist():
        adj[u].append(v)
        adj[v].append(u)
    seen = [False] * n
    parent = [-1] * n
    # roots at vertices of largest degree (any root is exact; this keeps early states small)
    by_deg = sorted(range(n), key=lambda x: -len(adj[x]))
    comps: list[list[int]] = []
    for r in by_deg:
        if seen[r]:
            continue
        seen[r] = True
        comp = [r]
        for x in comp:
            for y in adj[x]:
                if not seen[y]:
                    seen[y] = True
                    parent[y] = x
                    comp.append(y)
        comps.append(comp)
    best = 0
    lower = 0
    order: list[int] = []
    for comp in comps:
        if len(comp) == 1:
            order.append(comp[0])
            continue
        k = max(best, (max(len(adj[x]) for x in comp) + 1) // 2)
        while True:
            try:
                height = _decide(adj, comp, parent, k, deadline)
            except TimeoutError:
                raise TreeDeadlineError(f"tree_cutwidth_exact: deadline passed while deciding cutwidth <= {k}", max(lower, k)) from None
            except ProblemTooLargeError as e:
                e.lower = max(lower, k)  # type: ignore[attr-defined]
                raise
            if height is not None:
                break
            lower = max(lower, k + 1)
            k += 1
        best = k
        lower = max(lower, k)
        order.extend(_layout_from_heights(adj, parent, height, comp[0], k))
    w = problem.width(order)
    if len(order) != n or sorted(order) != list(range(n)) or w != best:
        raise AssertionError(f"internal error: rebuilt ordering has width {w}, expected {best}")
    return best, order
