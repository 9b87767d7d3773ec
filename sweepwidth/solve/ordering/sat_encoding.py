"""The SAT encoding of "cutwidth <= k": variables, clauses, cardinality counters, probes.

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

See Also
--------
sweepwidth.solve.ordering.sat.solve_sat : the search that asks this formula for ever smaller k.

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
from typing import Any, Sequence, cast

import numpy as np

from ...errors import WeightError
from ...problems.ordering import OrderingProblem

#: nothing public: the formula and the probes are driven by :mod:`.sat`
__all__: list[str] = []

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

