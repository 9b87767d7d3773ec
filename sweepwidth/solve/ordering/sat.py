"""SAT encoding of "cutwidth <= k", built once and tightened incrementally.

The width of an ordering is its heaviest counted cut (with pins, only the
prefixes of sizes ``|first| .. n - |last|`` count, see
:mod:`sweepwidth.problems.ordering`); :func:`solve_sat` finds an ordering of
least width, or proven bounds when its deadline comes first.

Model
-----
An ordering is described by its chain of prefixes: ``x[v][i]`` is true when
vertex ``v`` is among the first ``i`` (levels ``i = 1..n-1``; level 0 is empty
and level n is everything).  Clauses:

* monotone chain: ``x[v][i] -> x[v][i+1]``;
* one vertex enters per step: ``p[v][i] <- x[v][i] & ~x[v][i-1]`` with an
  at-most-one (ladder) over ``p[.][i]`` and the at-least-one, for every step.
  With n steps and n vertices this makes ``|prefix i| = i``;
* level counts (redundant): "exactly i of the ``x[.][i]``" as a two-sided
  totalizer at the levels of the middle half (option ``counts``).  Without
  them the solver has to rediscover pigeonhole arguments ("more than i
  vertices before position i") by resolution, which it cannot do cheaply;
  this is the idea that buys most (table below);
* crossing indicators only as implications, ``x[u][i] & ~x[v][i] -> c[e][i]``
  (and the mirror), which is all an upper bound on the cut needs;
* per counted level a totalizer (python-sat's C++ one; a weight w is w copies
  of the indicator) or a weighted sequential counter over the ``c[.][i]``,
  with outputs "the cut at level i weighs more than t" for t up to the
  largest bound ever asked (upper - 1).  "width <= k" is the set of negated
  outputs at t = k: added as units once an ordering of width k + 1 is known
  (downward search, the default) or assumed (upward search).  The formula is
  never rebuilt.

Two cheaper questions come first.  *Level probes*: is there a counted prefix
of size i with cut <= k at all?  A "no" for one i proves width > k (an
edge-isoperimetric bound decided by SAT on a formula of one level); it
settles grids and hypercubes at k = cw - 1 (e.g. no 13 vertices of Q_5 have
a boundary below 21, no 30 vertices of the 8 x 8 grid one below 9).
*Windows*: to find an ordering of width <= k, the best ordering known is
kept outside a window around its too heavy cuts and the solver reorders the
window (assumptions, small conflict budgets); only when both fail does the
full chain question run.

Pins fix position windows, so many ``x`` are constants and many crossings
cannot happen at a level; both are folded away.  Symmetry breaking (option
``symmetry``): automorphisms preserving the pins are found with VF2, the
vertex at the first free position is restricted to orbit representatives,
the next one to representatives of the orbits of the stabiliser of the
first, and without pins the reversal is broken by orbit ranks of the first
and last vertex.  Phases are set from the best ordering known.

What each idea buys is measured by ``benchmarks/cutwidth.py --ablation``;
the last table is in ``benchmarks/NOTES.md``.

References
----------
.. [1] C. Sinz, "Towards an optimal CNF encoding of Boolean cardinality
   constraints", CP 2005, LNCS 3709 (sequential counter).
.. [2] O. Bailleux and Y. Boufkhad, "Efficient CNF encoding of Boolean
   cardinality constraints", CP 2003, LNCS 2833 (totalizer).
.. [3] L. P. Cordella, P. Foggia, C. Sansone and M. Vento, "A (sub)graph
   isomorphism algorithm for matching large graphs", IEEE TPAMI 26(10), 2004
   (VF2, used through networkx for the automorphisms).
.. [4] J. Crawford, M. Ginsberg, E. Luks and A. Roy, "Symmetry-breaking
   predicates for search problems", KR 1996 (why fixing orbit
   representatives is sound).
.. [5] J. Rolim, O. Sykora and I. Vrto, "Optimal cutwidths and bisection
   widths of 2- and 3-dimensional meshes", WG 1995, LNCS 1017 (the grid
   values used in the tests).
"""

from __future__ import annotations

import time
from dataclasses import dataclass, field, replace
from typing import Any, Callable, Sequence, cast

import numpy as np

from ...errors import InputTypeError, InvalidArgumentError, OperationError, SweepwidthError, UnsupportedOptionError, WeightError
from ...problems.ordering import OrderingProblem
from .._deadline import BUDGET_SOLVERS, run_limited, sat_call

__all__ = ["SatOutcome", "solve_sat", "greedy_order", "SOLVERS"]

#: Solver names accepted by :func:`solve_sat`.  kissat404 has no assumptions
#: in python-sat and is rebuilt for every bound.
SOLVERS = ("cadical195", "cadical153", "glucose4", "glucose42", "minisat22", "maplechrono", "kissat404")

_OPTIONS = {
    "direction": ("down", "up"),
    "symmetry": (True, False),
    "phases": (True, False),
    "counter": ("itot", "seq"),
    "counts": ("band", "all", "none"),
    "hard_deadline": (False, True),
    "probe": (True, False),
    "windows": (True, False),
}


@dataclass
class SatOutcome:
    """What the SAT engine proved and found.

    Attributes
    ----------
    lower : int
        Proven lower bound (from UNSAT answers, or the given lower).
    upper : int
        Width of ``order`` (or the given upper if no better order was found).
    order : list of int or None
        An ordering of ``0..n-1`` of width ``upper`` respecting the pins.
    optimal : bool
        ``lower == upper`` was proven.
    stats : dict
        ``calls`` (list of ``(k, answer, seconds, conflicts)`` for the chain
        formula), ``probes`` (list of ``(k, level or None, answer,
        seconds)``), ``vars``, ``clauses``, ``build_seconds``,
        ``load_seconds``, ``orbits``, ``solver``, ``options``, ``seconds``,
        and ``stopped`` / ``killed`` when the deadline cut the search short.
    """

    lower: int
    upper: int
    order: list[int] | None
    optimal: bool
    stats: dict = field(default_factory=dict)


# ---------------------------------------------------------------------------
# helpers on the problem


def _int_weights(problem: OrderingProblem) -> list[int]:
    if not problem.integral:
        raise WeightError("the SAT engine needs integer edge weights; this problem has fractional weights")
    return [int(round(w)) for w in problem.weights.tolist()]


def _windows(problem: OrderingProblem) -> tuple[list[int], list[int]]:
    """Allowed positions ``lo[v]..hi[v]`` (1-based) from the pins."""
    n = problem.n
    f, l = len(problem.first), len(problem.last)
    lo = [f + 1] * n
    hi = [n - l] * n
    for v in problem.first:
        lo[v], hi[v] = 1, f
    for v in problem.last:
        lo[v], hi[v] = n - l + 1, n
    return lo, hi


def _check_order(problem: OrderingProblem, order: Sequence[int], what: str) -> list[int]:
    order = [int(v) for v in order]
    n = problem.n
    if sorted(order) != list(range(n)):
        raise InvalidArgumentError(f"{what} is not an ordering of the vertices 0..{n - 1}")
    f, l = len(problem.first), len(problem.last)
    if set(order[:f]) != set(problem.first) or set(order[n - l:] if l else []) != set(problem.last):
        raise InvalidArgumentError(f"{what} does not respect the pinned first/last vertices")
    return order


def greedy_order(problem: OrderingProblem) -> list[int]:
    """A quick ordering respecting the pins: grow the prefix by the cheapest vertex.

    From a vertex of least degree (within the allowed window), repeatedly add
    the vertex whose entry gives the smallest next cut, ties broken towards
    more edges back into the prefix (this closes holes first).

    Parameters
    ----------
    problem : OrderingProblem

    Returns
    -------
    list of int
        An ordering of ``0..n-1`` with ``problem.first`` first and
        ``problem.last`` last.

    Notes
    -----
    O(n^2 + n m) time.  Only a starting upper bound for :func:`solve_sat`;
    the stronger heuristics live with the dispatcher.

    Examples
    --------
    >>> import networkx as nx
    >>> from sweepwidth.problems.ordering import OrderingProblem
    >>> P = OrderingProblem.from_graph(nx.path_graph(5))
    >>> P.width(greedy_order(P))
    1.0
    """
    n = problem.n
    adj = problem.neighbours()
    deg = [sum(a.values()) for a in adj]
    f, l = len(problem.first), len(problem.last)
    groups = [sorted(problem.first), sorted(set(range(n)) - problem.first - problem.last), sorted(problem.last)]
    placed = [False] * n
    back = [0.0] * n  # weight of edges into the prefix
    order: list[int] = []
    cut = 0.0
    for group in groups:
        todo = set(group)
        while todo:
            if not order or all(back[v] == 0 for v in todo):
                # start (or restart in a new component) at a least-degree vertex
                v = min(todo, key=lambda u: (deg[u] - 2 * back[u], -back[u], u))
                if not order:
                    v = min(todo, key=lambda u: (deg[u], u))
            else:
                v = min(todo, key=lambda u: (deg[u] - 2 * back[u], -back[u], u))
            todo.discard(v)
            placed[v] = True
            order.append(v)
            cut += deg[v] - 2 * back[v]
            for u, w in adj[v].items():
                if not placed[u]:
                    back[u] += w
    return order


# ---------------------------------------------------------------------------
# automorphism orbits (for symmetry breaking)


def _orbits(
    problem: OrderingProblem, time_budget: float = 0.5, fixed: Sequence[int] = (), cache: dict | None = None
) -> list[int]:
    """``rep[v]`` = least vertex known to share v's orbit under pin-preserving automorphisms.

    With ``fixed``, only automorphisms fixing each of those vertices count
    (the stabiliser); the fixed vertices are their own orbits.

    Automorphisms are searched with VF2 (networkx) one target at a time, so
    the result is exact when the budget suffices and otherwise a refinement
    of the true orbits (still sound for symmetry breaking: only automorphisms
    actually found are used).  ``cache`` (a dict) keeps the distance table
    between calls on the same problem.
    """
    import networkx as nx
    from networkx.algorithms.isomorphism import GraphMatcher

    n = problem.n
    rep = list(range(n))
    if n > 400 or n < 2:
        return rep
    G = nx.Graph()
    cls = [0] * n
    for v in problem.first:
        cls[v] = 1
    for v in problem.last:
        cls[v] = 2
    for j, v in enumerate(fixed):
        cls[v] = 3 + j
    for v in range(n):
        G.add_node(v, c=cls[v], mark=0)
    for (u, v), w in zip(problem.edges.tolist(), problem.weights.tolist()):
        G.add_edge(u, v, w=w)
    # invariant: pin class, weighted degree, the histogram of BFS distances, distances to `fixed`
    adj = problem.neighbours()
    deg = [round(sum(a.values()), 9) for a in adj]
    if cache is not None and "dist" in cache:
        dist = cache["dist"]
    else:
        dist = dict(nx.all_pairs_shortest_path_length(G))
        if cache is not None:
            cache["dist"] = dist
    inv = []
    for v in range(n):
        hist: dict[int, int] = {}
        for d in dist.get(v, {}).values():
            hist[d] = hist.get(d, 0) + 1
        to_fixed = tuple(dist.get(f, {}).get(v, -1) for f in fixed)
        inv.append((cls[v], deg[v], tuple(sorted(deg[u] for u in adj[v])), tuple(sorted(hist.items())), to_fixed))

    def find(v: int) -> int:
        while rep[v] != v:
            rep[v] = rep[rep[v]]
            v = rep[v]
        return v

    def union_perm(perm: dict) -> None:
        for a, b in perm.items():
            ra, rb = find(a), find(b)
            if ra != rb:
                if ra < rb:
                    rep[rb] = ra
                else:
                    rep[ra] = rb

    t_end = time.monotonic() + time_budget
    nm = lambda a, b: a["c"] == b["c"] and a["mark"] == b["mark"]  # noqa: E731
    em = lambda a, b: a["w"] == b["w"]  # noqa: E731
    for v in range(1, n):
        if find(v) != v:
            continue
        for r in range(v):
            if time.monotonic() > t_end:
                return [find(u) for u in range(n)]
            if find(r) != r or inv[r] != inv[v]:
                continue
            G1 = G.copy()
            G2 = G.copy()
            G1.nodes[r]["mark"] = 1
            G2.nodes[v]["mark"] = 1
            gm = GraphMatcher(G1, G2, node_match=nm, edge_match=em)
            perm = next(gm.isomorphisms_iter(), None)
            if perm is not None:
                union_perm(perm)
                break
    return [find(v) for v in range(n)]


# ---------------------------------------------------------------------------
# the encoding


def _count_tree(owner: Any, lits: list[int]) -> tuple[list[list[int]], np.ndarray]:
    """A two-sided totalizer over ``lits`` built with numpy; fresh variables from ``owner.top``.

    Returns the clauses and the root outputs ``root[t-1]`` <-> "at least t of
    ``lits`` are true" (t = 1..len(lits)); both directions are encoded at
    every node, so unit propagation counts exactly.  O(len(lits)^2) clauses.
    """
    tri: list[np.ndarray] = []
    duo: list[np.ndarray] = []

    def build(part: np.ndarray) -> np.ndarray:
        if len(part) == 1:
            return part
        mid = len(part) // 2
        a, b = build(part[:mid]), build(part[mid:])
        la, lb = len(a), len(b)
        o = np.arange(owner.top + 1, owner.top + 1 + la + lb, dtype=np.int64)
        owner.top += la + lb
        I, J = np.meshgrid(np.arange(la), np.arange(lb), indexing="ij")
        # upward: (>= i+1 of a) & (>= j+1 of b) -> (>= i+j+2); single sides below
        tri.append(np.stack([-a[I], -b[J], o[I + J + 1]], axis=-1).reshape(-1, 3))
        duo.append(np.stack([-a, o[:la]], axis=-1))
        duo.append(np.stack([-b, o[:lb]], axis=-1))
        # downward: (< i+1 of a) & (< j+1 of b) -> (< i+j+1)
        tri.append(np.stack([a[I], b[J], -o[I + J]], axis=-1).reshape(-1, 3))
        duo.append(np.stack([b, -o[la:la + lb]], axis=-1))
        duo.append(np.stack([a, -o[lb:la + lb]], axis=-1))
        return o

    root = build(np.asarray(lits, dtype=np.int64))
    out: list[list[int]] = []
    for arr in tri + duo:
        out.extend(arr.tolist())
    return out, root


def _automorphism(problem: OrderingProblem, mapping: dict[int, int]) -> dict[int, int] | None:
    """A pin-preserving automorphism extending ``mapping`` (VF2 with marked vertices), or None."""
    import networkx as nx
    from networkx.algorithms.isomorphism import GraphMatcher

    n = problem.n
    cls = [0] * n
    for v in problem.first:
        cls[v] = 1
    for v in problem.last:
        cls[v] = 2
    G1, G2 = nx.Graph(), nx.Graph()
    for v in range(n):
        G1.add_node(v, c=cls[v], mark=0)
        G2.add_node(v, c=cls[v], mark=0)
    for (u, v), w in zip(problem.edges.tolist(), problem.weights.tolist()):
        G1.add_edge(u, v, w=w)
        G2.add_edge(u, v, w=w)
    for j, (a, b) in enumerate(mapping.items()):
        G1.nodes[a]["mark"] = j + 1
        G2.nodes[b]["mark"] = j + 1
    gm = GraphMatcher(
        G1, G2, node_match=lambda a, b: a["c"] == b["c"] and a["mark"] == b["mark"], edge_match=lambda a, b: a["w"] == b["w"]
    )
    return next(gm.isomorphisms_iter(), None)


class _OutOfTime(Exception):
    """The deadline passed while the formula was being built or loaded."""


class _Formula:
    """Clauses of "width <= k" for every k up to ``kmax`` (see module docstring)."""

    def __init__(
        self,
        problem: OrderingProblem,
        kmax: int,
        *,
        symmetry: bool,
        counter: str,
        counts: str = "band",
        extra: dict | None = None,
        deadline: float | None = None,
    ) -> None:
        self.extra = extra = dict(extra or {})
        self.deadline = deadline
        self.problem = problem
        self.n = n = problem.n
        self.kmax = kmax
        self.top = 0
        self.clauses: list[list[int]] = []
        lo, hi = _windows(problem)
        self.lo, self.hi = lo, hi
        # x[v][i], i = 0..n: int literal, or True/False constants
        self.x: list[list[Any]] = []
        for v in range(n):
            row: list[Any] = []
            for i in range(n + 1):
                if i < lo[v]:
                    row.append(False)
                elif i >= hi[v]:
                    row.append(True)
                else:
                    row.append(self._new())
            self.x.append(row)
        self._chain()
        self._steps()
        if counts != "none":
            self._level_cards(counts)
        self.ge: list[list[int] | None] = [None] * (n + 1)  # ge[i][t], t = 1..kmax+1
        w = _int_weights(problem)
        self.fixed_cut = [0] * (n + 1)
        self._cuts(w, counter)
        self.n_orbits = 0
        if symmetry:
            self._symmetry()

    # -- basics
    def tick(self) -> None:
        """Give up building when the deadline has passed."""
        if self.deadline is not None and time.monotonic() > self.deadline:
            raise _OutOfTime

    def _new(self) -> int:
        self.top += 1
        return self.top

    def add(self, lits: Sequence[Any]) -> None:
        """Add a clause, folding True/False constants."""
        out = []
        for a in lits:
            if a is True:
                return
            if a is False:
                continue
            out.append(a)
        if not out:
            # the empty clause: make it an explicit contradiction
            z = self._new()
            self.clauses.append([z])
            self.clauses.append([-z])
            return
        self.clauses.append(out)

    @staticmethod
    def neg(a: Any) -> Any:
        if a is True:
            return False
        if a is False:
            return True
        return -a

    # -- structure
    def _chain(self) -> None:
        for row in self.x:
            for i in range(1, self.n):
                a, b = row[i], row[i + 1]
                self.add([self.neg(a), b])

    def _steps(self) -> None:
        n = self.n
        for i in range(1, n + 1):
            if i % 16 == 0:
                self.tick()
            ps: list[int] = []  # literals, or True for a vertex forced to enter
            for v in range(n):
                a, b = self.x[v][i], self.x[v][i - 1]
                if a is False or b is True:
                    continue  # cannot enter at step i
                if a is True and b is False:
                    ps.append(True)
                    continue
                p = self._new()
                ps.append(p)
                self.add([self.neg(a), b, p])  # enters -> p
                self.add([-p, a])
                self.add([-p, self.neg(b)])
            lits = [p for p in ps if p is not True]
            if len(lits) < len(ps):  # someone is forced to enter here
                for p in lits:
                    self.add([-p])
                continue
            self.add(lits)  # at least one enters
            self._amo(lits)

    def _level_cards(self, counts: str) -> None:
        """Redundant: exactly i of the x[.][i] are true (two-sided totalizer).

        ``counts='all'`` at every level, 'band' at the middle half of the
        levels (i within n/4 of n/2), where orderings of small width are most
        constrained and the counting saves most conflicts per clause.
        """
        every = int(self.extra.get("lc_every", 1))
        band = float(self.extra.get("lc_band", 0.5 if counts == "band" else 0.0))
        for i in range(1, self.n):
            if i % every and i != self.n - 1:
                continue
            if band and abs(i - self.n / 2) > band * self.n / 2:
                continue
            self.tick()
            lits = [row[i] for row in self.x if row[i] is not True and row[i] is not False]
            need = i - sum(1 for row in self.x if row[i] is True)
            if len(lits) < 2 or need <= 0 or need >= len(lits):
                continue
            self.clauses.extend(self._exact_card(lits, need))

    def _exact_card(self, lits: list[int], need: int) -> list[list[int]]:
        """Clauses of "exactly ``need`` of ``lits``" by a two-sided totalizer (see :func:`_count_tree`)."""
        out, root = _count_tree(self, lits)
        return [[int(root[need - 1])], [int(-root[need])]] + out

    def _amo(self, lits: list[int]) -> None:
        """Ladder (sequential) at-most-one."""
        if len(lits) <= 4:
            for a in range(len(lits)):
                for b in range(a + 1, len(lits)):
                    self.add([-lits[a], -lits[b]])
            return
        prev: int | None = None
        for j, a in enumerate(lits):
            if j == len(lits) - 1:
                self.add([-a, -cast(int, prev)])  # len(lits) > 4: prev was set
                break
            s = self._new()
            self.add([-a, s])
            if prev is not None:
                self.add([-prev, s])
                self.add([-a, -prev])
            prev = s

    def _cuts(self, w: list[int], counter: str) -> None:
        n = self.n
        cap = self.kmax + 1
        edges = self.problem.edges.tolist()
        eorder = list(range(len(edges)))
        exact_c = bool(self.extra.get("exact_c", False))
        hint = self.extra.get("hint")
        if hint is not None and self.extra.get("edge_order", "index") == "hint":
            pos = {v: j for j, v in enumerate(hint)}
            eorder.sort(key=lambda e: (min(pos[edges[e][0]], pos[edges[e][1]]), max(pos[edges[e][0]], pos[edges[e][1]])))
        # counted cuts: after |first|, ..., n - |last| vertices (levels 0 and n cut nothing)
        lo_level = max(1, len(self.problem.first))
        hi_level = min(n - 1, n - len(self.problem.last))
        for i in range(lo_level, hi_level + 1):
            self.tick()
            items: list[tuple[int, int]] = []  # (literal, weight)
            fixed = 0
            for e in eorder:
                u, v = edges[e]
                if w[e] == 0:
                    continue
                xu, xv = self.x[u][i], self.x[v][i]
                if (xu is True and xv is False) or (xu is False and xv is True):
                    fixed += w[e]
                    continue
                if (xu is True and xv is True) or (xu is False and xv is False):
                    continue
                c = self._new()
                self.add([self.neg(xu), xv, c])
                self.add([self.neg(xv), xu, c])
                if exact_c:
                    self.add([-c, xu, xv])
                    self.add([-c, self.neg(xu), self.neg(xv)])
                items.append((c, w[e]))
            self.fixed_cut[i] = fixed
            self.ge[i] = self._counter(items, cap - fixed, counter) if cap - fixed > 0 else None

    def _counter(self, items: list[tuple[int, int]], cap: int, kind: str) -> list[Any]:
        """``out[t]`` (t = 1..cap) is implied by "weight of true items >= t"; out[0] unused."""
        if not items:
            return [True] + [False] * cap
        if kind == "itot" and sum(wt for _, wt in items) <= 64 * cap + 256:
            # python-sat's C++ totalizer; a weight w is w copies of the literal
            from pysat.card import ITotalizer

            lits = [c for c, wt in items for _ in range(wt)]
            tot = ITotalizer(lits=lits, ubound=cap, top_id=self.top)
            self.clauses.extend(tot.cnf.clauses)
            self.top = max(self.top, tot.top_id)
            rhs = list(tot.rhs)
            tot.delete()
            out: list[Any] = [True] + rhs[:cap]
            out += [False] * (cap + 1 - len(out))
            return out
        prev: list[Any] = [True] + [False] * cap  # prev[t]: prefix sum >= t
        for c, wt in items:
            cur: list[Any] = [True]
            for t in range(1, cap + 1):
                if prev[t] is False and t > wt and prev[t - wt] is False:
                    cur.append(False)
                    continue
                s = self._new()
                cur.append(s)
                if prev[t] is not False:
                    self.add([self.neg(prev[t]), s])
                if t <= wt:
                    self.add([-c, s])
                elif prev[t - wt] is not False:
                    self.add([-c, self.neg(prev[t - wt]), s])
            prev = cur
        return prev

    def _symmetry(self) -> None:
        """Break automorphisms (preserving the pins) and, without pins, the reversal.

        Let q be the first position of a free (unpinned) vertex.  Any
        automorphism maps an ordering to one of the same width, so the vertex
        at q can be taken as the least vertex of its orbit, and then the
        vertex at q + 1 as the least of its orbit under the automorphisms
        fixing the vertex at q.  Without pins an ordering and its reverse
        have the same width, so the orbit of the first vertex can be taken of
        rank at most that of the last (orbits are invariant under the
        automorphisms, so the three choices are compatible).
        """
        p = self.problem
        n = self.n
        left = lambda: 0.5 if self.deadline is None else max(0.0, min(0.5, 0.1 * (self.deadline - time.monotonic())))  # noqa: E731
        cache: dict = {}
        rep = _orbits(p, left(), cache=cache)
        free = [v for v in range(n) if v not in p.first and v not in p.last]
        q = len(p.first) + 1
        reps = sorted(set(rep[v] for v in free))
        self.n_orbits = len(set(rep))
        self.sym: dict[str, Any] = {"rep": rep, "q": q, "rep2": {}, "rank": None}
        if not free:
            return
        for v in free:
            if rep[v] != v:
                self.add([self.neg(self.x[v][q])])  # v is not at position q
        if q + 1 <= n - len(p.last) and len(free) >= 2:
            t_end = time.monotonic() + 2 * left()
            for r in reps:
                budget = t_end - time.monotonic()
                if budget <= 0:
                    break
                rep2 = _orbits(p, budget, fixed=(r,), cache=cache)
                self.sym["rep2"][r] = rep2
                for v in free:
                    if v != r and rep2[v] != v:
                        # r at q and v at q + 1 cannot both hold
                        self.add([self.neg(self.x[r][q]), self.neg(self.x[v][q + 1])])
        if p.first or p.last or n < 2:
            return
        rank = {r: k for k, r in enumerate(sorted(set(rep)))}
        self.sym["rank"] = rank
        # last in orbit of rank b  ->  first has rank <= b
        for v in range(n):
            b = rank[rep[v]]
            for r in reps:
                if rank[r] > b:
                    self.add([self.x[v][n - 1], self.neg(self.x[r][1])])

    def canonical(self, order: Sequence[int]) -> list[int]:
        """An ordering of the same width that satisfies the symmetry-breaking clauses.

        Reverses ``order`` and applies automorphisms as in the soundness
        argument of :meth:`_symmetry`; used for phase hints, which would
        otherwise point into clauses that forbid them.  Returns ``order``
        unchanged when no symmetry clauses exist or an automorphism is not
        found again.
        """
        order = list(order)
        sym = getattr(self, "sym", None)
        if not sym:
            return order
        p, n = self.problem, self.n
        rep, q, rank = sym["rep"], sym["q"], sym["rank"]
        out = list(order)
        if rank is not None and rank[rep[out[0]]] > rank[rep[out[-1]]]:
            out.reverse()
        if q > n - len(p.last):
            return out
        v = out[q - 1]
        r = rep[v]
        if r != v:
            sigma = _automorphism(p, {v: r})
            if sigma is None:
                return order
            out = [sigma[u] for u in out]
        rep2 = sym["rep2"].get(r)
        if rep2 is not None and q + 1 <= n - len(p.last):
            u = out[q]
            if rep2[u] != u:
                tau = _automorphism(p, {r: r, u: rep2[u]})
                if tau is None:
                    return order
                out = [tau[a] for a in out]
        if abs(p.width(out) - p.width(order)) > 1e-9:  # pragma: no cover - defensive
            return order
        return out

    # -- queries
    def bound(self, k: int) -> tuple[list[int], bool]:
        """Literals meaning "every cut <= k"; False as 2nd item when impossible outright."""
        lits = []
        for i in range(1, self.n):
            t = k + 1 - self.fixed_cut[i]
            if t <= 0:
                return [], False
            g = self.ge[i]
            if g is None or t >= len(g):
                continue
            a = g[t]
            if a is True:
                return [], False
            if a is False:
                continue
            lits.append(-a)
        return lits, True

    def phases(self, order: Sequence[int]) -> list[int]:
        pos = {v: j + 1 for j, v in enumerate(order)}
        out = []
        for v in range(self.n):
            for i in range(1, self.n):
                a = self.x[v][i]
                if a is not True and a is not False:
                    out.append(a if pos[v] <= i else -a)
        return out

    def decode(self, model: Sequence[int]) -> list[int]:
        val = set(l for l in model if l > 0)
        first_in = []
        for v in range(self.n):
            for i in range(self.n + 1):
                a = self.x[v][i]
                if a is True or (a is not False and a in val):
                    first_in.append((i, v))
                    break
        return [v for _, v in sorted(first_in)]


class _LevelProbe:
    """One level on its own: is there a counted prefix of size i with cut <= k?

    A "no" for some i proves width > k at once (the edge-isoperimetric
    bound, decided by SAT): on grids the chain question at k = cw - 1 is
    settled this way in a fraction of the chain's time, because some prefix
    size near n/2 admits no cut of weight cw - 1.  One small incremental
    formula serves every (i, k): the prefix size and the bound are assumed.
    """

    def __init__(self, problem: OrderingProblem, kmax: int, solver: str, symmetry: bool = True) -> None:
        from pysat.card import ITotalizer
        from pysat.solvers import Solver

        n = problem.n
        self.problem = problem
        self.f, self.l = len(problem.first), len(problem.last)
        self.free = [v for v in range(n) if v not in problem.first and v not in problem.last]
        x: dict[int, Any] = {v: True for v in problem.first}
        x.update({v: False for v in problem.last})
        top = 0
        for v in self.free:
            top += 1
            x[v] = top
        clauses: list[list[int]] = []
        w = _int_weights(problem)
        lits: list[int] = []
        self.fixed = 0
        for e, (u, v) in enumerate(problem.edges.tolist()):
            xu, xv = x[u], x[v]
            if isinstance(xu, bool) and isinstance(xv, bool):
                self.fixed += w[e] if xu != xv else 0
                continue
            top += 1
            c = top
            for a, b in ((xu, xv), (xv, xu)):
                if a is False or b is True:
                    continue
                cl: list[Any] = [c]
                if a is not True:
                    cl.append(-a)
                if b is not False:
                    cl.append(b)
                clauses.append(cl)
            lits.extend([c] * w[e])
        self.rhs: list[int] = []
        if lits and kmax + 1 - self.fixed > 0:
            tot = ITotalizer(lits=lits, ubound=kmax + 1 - self.fixed, top_id=top)
            clauses.extend(tot.cnf.clauses)
            top = max(top, tot.top_id)
            self.rhs = list(tot.rhs)
            tot.delete()
        self.count: list[int] = []
        if self.free:
            helper = _Formula.__new__(_Formula)
            helper.top = top
            cl, root = _count_tree(helper, [x[v] for v in self.free])
            clauses.extend(cl)
            top = helper.top
            self.count = [int(r) for r in root]  # count[t-1]: at least t free vertices in the prefix
        self.reps_clause: list[int] = []
        if symmetry and not problem.first and len(self.free) >= 2:
            # any nonempty prefix can be moved by an automorphism to contain an orbit representative
            rep = _orbits(problem, 0.3)
            reps = sorted(set(rep[v] for v in self.free))
            if len(reps) < len(self.free):
                self.reps_clause = [x[r] for r in reps]
        self.S = Solver(name=solver, bootstrap_with=clauses)
        if self.reps_clause:
            # as an assumption-guarded clause: only prefixes of size >= 1 need it
            top += 1
            self.guard = top
            self.S.add_clause([-self.guard] + self.reps_clause)
        self.name = solver

    def close(self) -> None:
        self.S.delete()

    def levels(self) -> list[int]:
        """Counted prefix sizes, middle first (only up to n/2 without pins: complements)."""
        n = self.problem.n
        lo, hi = max(1, self.f), min(n - 1, n - self.l)
        if not self.f and not self.l:
            hi = min(hi, n // 2)
        mid = (lo + hi + 1) // 2 if (self.f or self.l) else hi
        out = sorted(range(lo, hi + 1), key=lambda i: (abs(i - mid), -i))
        return out

    def ask(self, i: int, k: int, deadline: float | None, conflicts: int) -> bool | None:
        """True: a prefix of size i with cut <= k exists; False: none; None: budget spent."""
        t = k - self.fixed
        if t < 0:
            return False
        assume = []
        if self.rhs and t < len(self.rhs):
            assume.append(-self.rhs[t])
        need = i - self.f
        if self.reps_clause and need >= 1:
            assume.append(self.guard)
        if self.count:
            if need >= 1:
                assume.append(self.count[need - 1])
            if need < len(self.count):
                assume.append(-self.count[need])
        self.S.conf_budget(conflicts)
        if deadline is not None and time.monotonic() >= deadline:
            return None
        res = self.S.solve_limited(assumptions=assume)
        return None if res is None else bool(res)


# ---------------------------------------------------------------------------
# entry point


def _validate(problem: Any, lower: int, upper: int | None, solver: str, options: dict) -> dict:
    if not isinstance(problem, OrderingProblem):
        raise InputTypeError(f"solve_sat expects an OrderingProblem, got {type(problem).__name__}")
    if solver not in SOLVERS:
        raise UnsupportedOptionError("SAT solver", solver, SOLVERS)
    opts = {k: v[0] for k, v in _OPTIONS.items()}
    for k, v in options.items():
        if k == "_extra":  # experimental switches for the benchmarks
            continue
        if k not in _OPTIONS:
            raise UnsupportedOptionError("solve_sat option", k, sorted(_OPTIONS))
        if v not in _OPTIONS[k]:
            raise UnsupportedOptionError(f"value for option {k!r}", v, _OPTIONS[k])
        opts[k] = v
    if isinstance(lower, bool) or not isinstance(lower, (int, np.integer)) or lower < 0:
        raise InvalidArgumentError(f"lower must be a non-negative integer, got {lower!r}")
    if upper is not None and (isinstance(upper, bool) or not isinstance(upper, (int, np.integer))):
        raise InvalidArgumentError(f"upper must be an integer or None, got {upper!r}")
    return opts


def solve_sat(
    problem: OrderingProblem,
    *,
    lower: int = 0,
    upper: int | None = None,
    upper_order: list[int] | None = None,
    deadline: float | None = None,
    solver: str = "cadical195",
    progress: Callable[[SatOutcome], None] | None = None,
    **options: Any,
) -> SatOutcome:
    """Cutwidth by incremental SAT: prove ``lower`` up / improve ``upper`` down.

    The cutwidth of an ordering is the largest weight of edges between a
    prefix and the rest; this finds an ordering (respecting the pins) of least
    width, or bounds when ``deadline`` comes first.

    Parameters
    ----------
    problem : OrderingProblem
        Integral weights (``problem.integral``); pins and several components
        are allowed.
    lower : int
        A known lower bound (trusted).
    upper : int, optional
        A known upper bound; ``upper_order`` attains it when given.  Without
        either, :func:`greedy_order` supplies one.
    upper_order : list of int, optional
        An ordering of width ``upper`` (used as phase hints too).
    deadline : float, optional
        ``time.monotonic()`` value; the best bounds so far are returned then.
    solver : str
        A python-sat solver name from :data:`SOLVERS`.
    progress : callable, optional
        Called with a :class:`SatOutcome` after each improvement.
    **options
        ``direction`` ('down', default: ask upper-1, then below each new
        ordering, so one UNSAT answer ends the search; 'up': ask lower,
        lower+1, ...), ``symmetry`` (bool, default True), ``phases`` (bool,
        default True), ``counter`` ('itot' totalizer, default, or 'seq'
        weighted sequential counter), ``counts`` ('band' default, 'all',
        'none': where the redundant level counts go), ``hard_deadline``
        (default False; True runs the search in a child process killed at
        the deadline, for solvers or encodings where a conflict slice could
        overrun), ``probe`` (default True: before the chain formula, ask
        single levels whether a prefix of cut <= k exists at all; one "no"
        proves width > k), ``windows`` (default True: before each full
        call, reorder growing windows of the best ordering around its too
        heavy cuts under small conflict budgets, the rest fixed by
        assumptions).  ``_extra`` (dict) holds experimental switches for the
        benchmarks (``edge_order``: 'index' or 'hint'; ``exact_c``: also
        ``c -> x[u] xor x[v]``).

    Returns
    -------
    SatOutcome

    Raises
    ------
    WeightError
        Fractional weights.
    UnsupportedOptionError
        An unknown solver or option.
    SweepwidthError
        A bad ``upper_order`` (not an ordering, pins violated) or bounds.

    Notes
    -----
    The chain formula has O(n^2 + n m kmax) clauses for the order and the
    cut counters (n levels, counters of width kmax = upper - 1 over the m
    crossing indicators of each level, a weight w counting w times) plus
    O(n^3) for the level counts of the middle half, and is built once.  The
    single-level probe formula has O(n^2 + m kmax) clauses.  With a deadline
    every SAT call runs in conflict-budgeted slices
    (:func:`~sweepwidth.solve._deadline.sat_call`) and the build checks the
    clock, so the function returns within about a second of the deadline.
    Exponential in the worst case (cutwidth is NP-hard).

    References
    ----------
    See the module docstring.

    Examples
    --------
    >>> import networkx as nx
    >>> from sweepwidth.problems.ordering import OrderingProblem
    >>> out = solve_sat(OrderingProblem.from_graph(nx.grid_2d_graph(3, 3)))
    >>> out.lower, out.upper, out.optimal
    (4, 4, True)
    """
    t_start = time.monotonic()
    opts = _validate(problem, lower, upper, solver, options)
    if opts["hard_deadline"] and deadline is not None:
        return _solve_isolated(problem, lower, upper, upper_order, deadline, solver, progress, opts)
    _int_weights(problem)
    n = problem.n
    hint = None  # ordering used for phases
    best_order = None  # ordering attaining `upper`
    if upper_order is not None:
        hint = _check_order(problem, upper_order, "upper_order")
    else:
        hint = greedy_order(problem)
    w_hint = int(round(problem.width(hint)))
    if upper is None or w_hint <= int(upper):
        upper, best_order = w_hint, hint
    upper = int(upper)
    lower = int(lower)
    stats: dict = {"solver": solver, "options": dict(opts), "calls": []}
    if lower > upper:
        raise InvalidArgumentError(f"lower bound {lower} exceeds upper bound {upper}")
    best = SatOutcome(lower, upper, best_order, lower >= upper, stats)
    if best.optimal or n <= 1:
        best.optimal = True
        best.lower = best.upper
        stats["seconds"] = time.monotonic() - t_start
        return best

    def report() -> None:
        stats["seconds"] = time.monotonic() - t_start
        if progress is not None:
            progress(replace(best, order=list(best.order) if best.order else None, stats=dict(stats)))

    def out_of_time(where: str) -> SatOutcome:
        stats["stopped"] = f"deadline reached while {where}"
        stats["seconds"] = time.monotonic() - t_start
        return best

    probe: _LevelProbe | None = None
    if opts["probe"] and opts["direction"] == "down" and solver != "kissat404":
        # the cheap single-level questions first: they often settle k = upper - 1
        probe = _LevelProbe(problem, upper - 1, solver if solver in BUDGET_SOLVERS else "cadical195", opts["symmetry"])
        if _run_probes(probe, upper - 1, deadline, stats):
            probe.close()
            best.lower = best.upper
            best.optimal = True
            report()
            stats["seconds"] = time.monotonic() - t_start
            return best

    t0 = time.monotonic()
    try:
        F = _Formula(
            problem,
            upper - 1,
            symmetry=opts["symmetry"],
            counter=opts["counter"],
            counts=opts["counts"],
            extra={"hint": hint, **(options.get("_extra") or {})},
            deadline=deadline,
        )
    except _OutOfTime:
        if probe is not None:
            probe.close()
        return out_of_time("building the formula")
    stats["build_seconds"] = time.monotonic() - t0
    stats["vars"] = F.top
    stats["clauses"] = len(F.clauses)
    stats["orbits"] = F.n_orbits

    if solver == "kissat404":
        return _search_rebuild(F, best, deadline, opts, report)

    from pysat.solvers import Solver

    with Solver(name=solver) as S:
        chunk = 100_000
        for j in range(0, len(F.clauses), chunk):
            if deadline is not None and time.monotonic() > deadline:
                return out_of_time("loading the formula")
            S.append_formula(F.clauses[j : j + chunk])
        F.clauses = []  # free memory; the solver has them
        stats["load_seconds"] = time.monotonic() - t0 - stats["build_seconds"]
        if opts["phases"]:
            S.set_phases(F.phases(F.canonical(hint)))
        while not best.optimal:
            k = best.upper - 1 if opts["direction"] == "down" else best.lower
            lits, possible = F.bound(k)
            if possible and probe is not None and k < upper - 1 and k >= best.lower:
                if _run_probes(probe, k, deadline, stats):
                    possible = False
            if not possible:
                ans: bool | None = False
            else:
                if opts["direction"] == "down":
                    for a in lits:  # permanent: never ask above k again
                        S.add_clause([a])
                    assume: list[int] = []
                else:
                    assume = lits
                ans = None
                current = best.order if best.order is not None else hint
                if opts["windows"] and current is not None:
                    ans = _window_search(S, F, F.canonical(current), k, assume, deadline, stats)
                if ans is None:
                    cs: dict = {}
                    t1 = time.monotonic()
                    ans = sat_call(S, assume, deadline=deadline, name=solver, stats=cs)
                    stats["calls"].append((k, ans, round(time.monotonic() - t1, 4), cs.get("conflicts", 0)))
            if ans is None:
                break
            if ans:
                order = F.decode(S.get_model())
                w = int(round(problem.width(order)))
                if w > k:  # pragma: no cover - would be an encoding bug
                    raise OperationError(f"internal error: SAT ordering has width {w} > {k}")
                best.order, best.upper = order, w
                if opts["phases"]:
                    S.set_phases(F.phases(F.canonical(order)))
            else:
                best.lower = k + 1
            best.optimal = best.lower >= best.upper
            report()
        if probe is not None:
            probe.close()
    if best.optimal:
        best.lower = best.upper
    stats["seconds"] = time.monotonic() - t_start
    return best


def _window_search(
    S: Any, F: _Formula, order: list[int], k: int, assume: list[int], deadline: float | None, stats: dict
) -> bool | None:
    """Look for an ordering of width <= k near ``order``: free a window, fix the rest.

    The vertices placed before the window stay in the prefix before it, those
    after it stay out; the solver reorders the window under a small conflict
    budget.  Windows grow around the levels whose cut exceeds k.  Returns
    True when the solver's model (read by the caller) has width <= k, None
    otherwise: a failed window proves nothing.
    """
    p, n = F.problem, F.n
    prof = p.cut_profile(order)
    bad = [i for i in range(1, n) if prof[i] > k + 1e-9]
    if not bad:
        return None
    lo_bad, hi_bad = min(bad), max(bad)
    t0 = time.monotonic()
    rec = stats.setdefault("windows", [])
    for pad, budget in ((4, 500), (8, 1500), (16, 4000), (32, 10000)):
        a, b = max(1, lo_bad - pad + 1), min(n, hi_bad + pad)  # free positions a..b (1-based)
        if a == 1 and b == n:
            break
        fix: list[int] = []
        feasible = True
        for j, v in enumerate(order, start=1):
            if j < a:
                lit = F.x[v][a - 1]
            elif j > b:
                lit = F.neg(F.x[v][b])
            else:
                continue
            if lit is False:  # the pins forbid this split (not for orderings that respect them)
                feasible = False
                break
            if lit is not True:
                fix.append(lit)
        if not feasible:
            continue
        if deadline is not None and time.monotonic() >= deadline:
            return None
        S.conf_budget(budget)
        res = S.solve_limited(assumptions=assume + fix)
        rec.append((k, a, b, res, round(time.monotonic() - t0, 4)))
        if res:
            return True
    return None


#: Rounds of single-level probes: (conflicts per level, levels asked at most).
_PROBE_ROUNDS = ((1000, None), (8000, 8), (32000, 4), (128000, 2))
_PROBE_CAP = 300_000  # conflicts over all rounds


def _run_probes(probe: "_LevelProbe", k: int, deadline: float | None, stats: dict) -> bool:
    """Ask single levels middle-out whether a prefix of cut <= k exists; True when one cannot.

    Rounds of growing conflict budgets over fewer and fewer levels (the
    middle ones, see :data:`_PROBE_ROUNDS`); a level answered "yes" is not
    asked again.  Work is capped at :data:`_PROBE_CAP` conflicts and 30% of
    the time left before ``deadline``.
    """
    t0 = time.monotonic()
    stop = None if deadline is None else t0 + 0.3 * max(0.0, deadline - t0)
    spent = 0
    rec = stats.setdefault("probes", [])
    open_levels = probe.levels()
    for budget, many in _PROBE_ROUNDS:
        still = []
        for j, i in enumerate(open_levels):
            if many is not None and j >= many:
                still.append(i)
                continue
            if spent >= _PROBE_CAP or (stop is not None and time.monotonic() >= stop):
                rec.append((k, None, None, round(time.monotonic() - t0, 4)))
                return False
            before = probe.S.accum_stats().get("conflicts", 0)
            ans = probe.ask(i, k, stop, min(budget, _PROBE_CAP - spent))
            spent += probe.S.accum_stats().get("conflicts", 0) - before
            if ans is False:
                rec.append((k, i, False, round(time.monotonic() - t0, 4)))
                return True
            if ans is None:
                still.append(i)
        open_levels = still
        if not open_levels:
            break
    rec.append((k, None, None, round(time.monotonic() - t0, 4)))
    return False


def _search_rebuild(F: _Formula, best: SatOutcome, deadline: float | None, opts: dict, report: Callable[[], None]) -> SatOutcome:
    """Search for solvers without assumptions (kissat): a fresh solver per bound."""
    from pysat.solvers import Solver

    base = F.clauses
    stats = best.stats
    while not best.optimal:
        k = best.upper - 1 if opts["direction"] == "down" else best.lower
        lits, possible = F.bound(k)
        ans: bool | None = False
        if possible:
            t1 = time.monotonic()
            cs: dict = {}
            with Solver(name="kissat404", bootstrap_with=base + [[a] for a in lits]) as S:
                ans = sat_call(S, [], deadline=deadline, name="kissat404", stats=cs)
                model = S.get_model() if ans else None
            stats["calls"].append((k, ans, round(time.monotonic() - t1, 4), cs.get("conflicts", 0)))
            if ans is None:
                break
            if ans:
                order = F.decode(cast("Sequence[int]", model))  # ans is True: the model exists
                best.order, best.upper = order, int(round(F.problem.width(order)))
        if not ans:
            best.lower = k + 1
        best.optimal = best.lower >= best.upper
        report()
    if best.optimal:
        best.lower = best.upper
    return best


def _isolated_body(problem: OrderingProblem, kw: dict, *, progress: Callable) -> SatOutcome:
    return solve_sat(problem, progress=progress, **kw)


def _solve_isolated(
    problem: OrderingProblem,
    lower: int,
    upper: int | None,
    upper_order: list[int] | None,
    deadline: float,
    solver: str,
    progress: Callable[[SatOutcome], None] | None,
    opts: dict,
) -> SatOutcome:
    """``solve_sat`` in a child process killed at the deadline; the last report survives."""
    kw = dict(lower=lower, upper=upper, upper_order=upper_order, deadline=deadline, solver=solver)
    kw.update({k: v for k, v in opts.items() if k != "hard_deadline"})
    finished, value, reports = run_limited(_isolated_body, (problem, kw), deadline=deadline + 0.3, on_progress=progress)
    if finished:
        return value
    if reports:
        out = reports[-1]
        out.stats["killed"] = True
        return out
    hint = list(upper_order) if upper_order is not None else greedy_order(problem)
    w = int(round(problem.width(hint)))
    order: list[int] | None = hint
    if upper is not None and int(upper) < w:
        order, w = None, int(upper)
    return SatOutcome(int(lower), w, order, int(lower) >= w, {"solver": solver, "killed": True, "calls": []})
