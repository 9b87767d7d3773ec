"""Tests of the SAT engine for cutwidth and of the time-limit machinery.

Reference values come from outside the project: brute force over all
orderings (computed here from the networkx graph, not with the library's
width function), published formulas (sources beside each check) and the
definitions.
"""

from __future__ import annotations

import itertools
import math
import os
import time

import networkx as nx
import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st

import _limited_helpers as H
from sweepwidth.errors import SweepwidthError, UnsupportedOptionError, WeightError
from sweepwidth.problems.ordering import OrderingProblem
from sweepwidth.solve._deadline import ChildProcessError_, run_limited, sat_call
from sweepwidth.solve.ordering.sat import SatOutcome, greedy_order, solve_sat
from sweepwidth.solve.ordering.sat_encoding import _LevelProbe, _orbits

# ---------------------------------------------------------------------------
# independent reference: width straight from the networkx graph


def nx_width(G: nx.Graph, order: list, weight: str = "weight", nfirst: int = 0, nlast: int = 0) -> float:
    """Largest weight of edges between a prefix of ``order`` and the rest.

    With ``nfirst`` vertices pinned first and ``nlast`` pinned last only the
    prefixes of sizes nfirst..n-nlast count (the pinned sets act as single
    vertices: sweepwidth.problems.ordering, "Pinned ends").
    """
    pos = {v: i for i, v in enumerate(order)}
    edges = [(pos[u], pos[v], d.get(weight, 1)) for u, v, d in G.edges(data=True) if u != v]
    best = 0.0
    for i in range(max(1, nfirst), min(len(order) - 1, len(order) - nlast) + 1):
        cut = sum(w for a, b, w in edges if (a < i) != (b < i))
        best = max(best, cut)
    return best


def subset_cutwidth(G: nx.Graph, first=None) -> float:
    """Exhaustive search over prefix sets: f(S) = max(cut(S), min_v f(S - v)).

    With ``first`` (one vertex) only prefixes containing it exist.
    """
    nodes = list(G)
    idx = {v: i for i, v in enumerate(nodes)}
    edges = [(idx[u], idx[v], d.get("weight", 1)) for u, v, d in G.edges(data=True) if u != v]
    n = len(nodes)
    INF = math.inf
    a = None if first is None else idx[first]
    f = [INF] * (1 << n)
    f[0] = 0.0
    for S in range(1, 1 << n):
        if a is not None and not (S >> a) & 1:
            continue
        cut = sum(w for x, y, w in edges if ((S >> x) & 1) != ((S >> y) & 1))
        if a is not None and S == 1 << a:
            f[S] = cut
            continue
        f[S] = max(cut, min(f[S & ~(1 << v)] for v in range(n) if (S >> v) & 1 and v != a))
    return f[(1 << n) - 1]


def brute_cutwidth(G: nx.Graph, first=(), last=()) -> float:
    """Least width over all orderings with ``first`` first and ``last`` last."""
    first, last = list(first), list(last)
    mid = [v for v in G if v not in first and v not in last]
    best = math.inf
    for a in itertools.permutations(first):
        for b in itertools.permutations(mid):
            for c in itertools.permutations(last):
                best = min(best, nx_width(G, list(a) + list(b) + list(c), nfirst=len(first), nlast=len(last)))
    return 0.0 if best == math.inf else best


def solve_graph(G: nx.Graph, first=(), last=(), **kw) -> tuple[OrderingProblem, SatOutcome]:
    P = OrderingProblem.from_graph(G, first=set(first), last=set(last))
    return P, solve_sat(P, **kw)


def assert_valid(G: nx.Graph, P: OrderingProblem, out: SatOutcome) -> None:
    """The returned ordering is a permutation, respects pins, and has width ``upper``."""
    assert out.order is not None
    assert sorted(out.order) == list(range(P.n))
    f, l = len(P.first), len(P.last)
    assert set(out.order[:f]) == set(P.first)
    assert set(out.order[P.n - l:]) == set(P.last)
    labels = [P.labels[v] for v in out.order]
    assert nx_width(G, labels, nfirst=f, nlast=l) == out.upper
    assert P.width(out.order) == out.upper
    assert out.lower <= out.upper


# ---------------------------------------------------------------------------
# against brute force


@st.composite
def small_instances(draw):
    n = draw(st.integers(1, 7))
    G = nx.Graph()
    G.add_nodes_from(range(n))
    pairs = list(itertools.combinations(range(n), 2))
    chosen = draw(st.lists(st.sampled_from(pairs), unique=True, max_size=len(pairs))) if pairs else []
    for u, v in chosen:
        G.add_edge(u, v, weight=draw(st.integers(1, 4)))
    nodes = draw(st.permutations(list(range(n))))
    nf = draw(st.integers(0, min(2, n)))
    nl = draw(st.integers(0, min(2, n - nf)))
    first, last = nodes[:nf], nodes[nf:nf + nl]
    options = draw(
        st.fixed_dictionaries(
            {},
            optional={
                "direction": st.sampled_from(["down", "up"]),
                "symmetry": st.booleans(),
                "counter": st.sampled_from(["itot", "seq"]),
                "counts": st.sampled_from(["band", "all", "none"]),
                "solver": st.sampled_from(["cadical195", "glucose4"]),
                "probe": st.booleans(),
                "windows": st.booleans(),
            },
        )
    )
    return G, first, last, options


@settings(max_examples=60, deadline=None)
@given(small_instances())
# two triangles far apart, pins in different components (disconnected)
@example((nx.Graph([(0, 1), (1, 2), (0, 2), (3, 4), (4, 5), (3, 5)]), [0], [5], {}))
# a vertex pinned first with no edges at all
@example((nx.empty_graph(3), [2], [], {"direction": "up"}))
def test_sat_matches_brute_force(case):
    G, first, last, options = case
    P, out = solve_graph(G, first, last, **options)
    assert out.optimal
    assert out.upper == brute_cutwidth(G, first, last)
    assert_valid(G, P, out)


def test_kissat_matches_brute_force():
    G = nx.Graph()
    G.add_weighted_edges_from([(0, 1, 2), (1, 2, 1), (2, 3, 3), (3, 0, 1), (0, 2, 2), (4, 5, 1)])
    P, out = solve_graph(G, solver="kissat404")
    assert out.optimal and out.upper == brute_cutwidth(G)
    assert_valid(G, P, out)


def test_brute_force_is_the_definition():
    # the reference itself, on graphs whose cutwidth is common practice
    assert brute_cutwidth(nx.path_graph(5)) == 1  # path: 1 (common practice)
    assert brute_cutwidth(nx.cycle_graph(5)) == 2  # cycle: 2 (common practice)


# ---------------------------------------------------------------------------
# published and well-known values (source beside each)


@pytest.mark.parametrize("n", [2, 5, 12])
def test_paths(n):
    # cw(P_n) = 1 for n >= 2: common practice
    G = nx.path_graph(n)
    P, out = solve_graph(G)
    assert out.optimal and out.upper == 1
    assert_valid(G, P, out)


@pytest.mark.parametrize("n", [3, 6, 11])
def test_cycles(n):
    # cw(C_n) = 2 for n >= 3: common practice
    G = nx.cycle_graph(n)
    P, out = solve_graph(G)
    assert out.optimal and out.upper == 2
    assert_valid(G, P, out)


@pytest.mark.parametrize("leaves", [3, 4, 7, 10])
def test_stars(leaves):
    # cw(K_{1,n}) = ceil(n/2): the degree bound, which a star meets (common practice)
    G = nx.star_graph(leaves)
    P, out = solve_graph(G)
    assert out.optimal and out.upper == math.ceil(leaves / 2)
    assert_valid(G, P, out)


@pytest.mark.parametrize("n", [3, 4, 5, 6, 7, 8])
def test_complete_graphs(n):
    # cw(K_n) = floor(n^2/4): common practice, from memory; verified exhaustively up to n = 7
    G = nx.complete_graph(n)
    P, out = solve_graph(G)
    assert out.optimal and out.upper == n * n // 4
    if n <= 7:
        assert subset_cutwidth(G) == n * n // 4
    assert_valid(G, P, out)


@pytest.mark.parametrize("m,n", [(3, 3), (3, 4), (3, 6), (4, 4), (4, 5), (5, 5)])
def test_grids(m, n):
    # cw(P_m x P_n) = m + 1 for 3 <= m <= n: Rolim, Sykora, Vrto, "Optimal cutwidths and
    # bisection widths of 2- and 3-dimensional meshes", WG 1995, LNCS 1017 (from memory)
    G = nx.grid_2d_graph(m, n)
    P, out = solve_graph(G)
    assert out.optimal and out.upper == m + 1
    assert_valid(G, P, out)


@pytest.mark.parametrize("n", [2, 3, 5, 8])
def test_ladders(n):
    # ladder P_2 x P_n: 3 for n >= 3, and C_4 = P_2 x P_2 gives 2 (from memory, same family as the grids of Rolim, Sykora and Vrto, WG 1995)
    G = nx.grid_2d_graph(2, n)
    P, out = solve_graph(G)
    assert out.optimal and out.upper == (2 if n == 2 else 3)
    assert_valid(G, P, out)


@pytest.mark.parametrize("d", [2, 3, 4])
def test_hypercubes(d):
    # cw(Q_d) = floor(2^(d+1)/3): attributed to Harper and to Nakano, "Linear layout of
    # generalized hypercubes" (from memory); Q_3 also checked by brute force
    G = nx.hypercube_graph(d)
    P, out = solve_graph(G)
    assert out.optimal and out.upper == 2 ** (d + 1) // 3
    if d == 3:
        assert subset_cutwidth(G) == 5
    assert_valid(G, P, out)


@pytest.mark.parametrize("h", [2, 3, 4])
def test_complete_binary_tree(h):
    # height h >= 2: ceil(h/2) + 1, attributed to Lengauer, SIAM J. Algebraic Discrete Methods 1982
    # (from memory); started from a depth-first order so the test stays fast
    G = nx.balanced_tree(2, h)
    P = OrderingProblem.from_graph(G)
    dfs = [P.labels.index(v) for v in nx.dfs_preorder_nodes(G, 0)]
    out = solve_sat(P, upper_order=dfs)
    assert out.optimal and out.upper == math.ceil(h / 2) + 1
    assert_valid(G, P, out)


@pytest.mark.parametrize(
    "name,G",
    [
        ("petersen", nx.petersen_graph()),
        ("K_3,3", nx.complete_bipartite_graph(3, 3)),
        ("prism 5", nx.circular_ladder_graph(5)),
        ("cube + pendant", nx.hypercube_graph(3)),
        ("K_4 x K_2", nx.cartesian_product(nx.complete_graph(4), nx.path_graph(2))),
    ],
)
def test_symmetric_graphs_against_exhaustive_search(name, G):
    # symmetry breaking (orbits, stabilisers, reversal) must not lose the optimum
    if name == "cube + pendant":
        G = nx.Graph(G)
        G.add_edge((0, 0, 0), "tail")
    P, out = solve_graph(G)
    assert out.optimal and out.upper == subset_cutwidth(G)
    assert_valid(G, P, out)
    # with a pinned first vertex only the stabiliser of that vertex is used
    v = next(iter(G))
    P, out = solve_graph(G, first=[v])
    assert out.optimal and out.upper == subset_cutwidth(G, first=v)
    assert_valid(G, P, out)


def test_weighted_pins_against_brute_force():
    # a weighted wheel with a pinned first and last vertex; brute force is the reference
    G = nx.wheel_graph(7)
    for k, (u, v) in enumerate(G.edges):
        G[u][v]["weight"] = 1 + (3 * k) % 5
    P, out = solve_graph(G, first=[0], last=[3])
    assert out.optimal and out.upper == brute_cutwidth(G, [0], [3])
    assert_valid(G, P, out)


def test_disconnected_takes_the_largest_component():
    # cutwidth of a disjoint union is the largest component's (definition)
    G = nx.disjoint_union(nx.cycle_graph(5), nx.complete_graph(4))
    P, out = solve_graph(G)
    assert out.optimal and out.upper == 4  # K_4: floor(16/4)
    assert_valid(G, P, out)


@settings(max_examples=25, deadline=None)
@given(small_instances())
# one free vertex: its prefix count must still be enforced
@example((nx.Graph([(0, 1)]), [], [0], {}))
# vertex-transitive: the orbit-representative clause must not lose any prefix size
@example((nx.convert_node_labels_to_integers(nx.hypercube_graph(3)), [], [], {}))
@example((nx.cycle_graph(6), [], [3], {}))
def test_level_probe_matches_enumeration(case):
    # "a counted prefix of size i with cut <= k exists", against enumerating all subsets
    G, first, last, _ = case
    P = OrderingProblem.from_graph(G, first=set(first), last=set(last))
    n = P.n
    if n < 2:
        return
    total = int(sum(P.weights)) if P.m else 0
    probe = _LevelProbe(P, total + 1, "cadical195")
    try:
        free = [v for v in range(n) if v not in P.first and v not in P.last]
        for i in range(max(1, len(first)), min(n - 1, n - len(last)) + 1):
            cuts = []
            for extra in itertools.combinations(free, i - len(first)):
                S = set(P.first) | set(extra)
                cuts.append(sum(w for (u, v), w in zip(P.edges.tolist(), P.weights.tolist()) if (u in S) != (v in S)))
            for k in range(0, total + 1):
                assert probe.ask(i, k, None, 10**6) == (min(cuts) <= k)
    finally:
        probe.close()


def test_probe_settles_grids():
    # on P_6 x P_6 (cutwidth 7) some prefix size admits no cut of weight 6: the
    # single-level questions prove optimality without the chain formula
    P = OrderingProblem.from_graph(nx.grid_2d_graph(6, 6))
    out = solve_sat(P)
    assert out.optimal and out.upper == 7
    assert out.stats["probes"][-1][2] is False and "clauses" not in out.stats
    out = solve_sat(P, probe=False)
    assert out.optimal and out.upper == 7 and "probes" not in out.stats


# ---------------------------------------------------------------------------
# bounds given by the caller, progress, symmetry


def test_given_bounds_and_order():
    G = nx.grid_2d_graph(4, 4)
    P = OrderingProblem.from_graph(G)
    order = list(range(P.n))  # row by row: width 5 (4 vertical edges + 1)
    out = solve_sat(P, lower=3, upper_order=order)
    assert out.optimal and out.upper == 5
    # a lower bound equal to the order's width: nothing to do, the order is kept
    out = solve_sat(P, lower=5, upper_order=order)
    assert out.optimal and out.order == order and out.stats["calls"] == []


def test_progress_reports_improvements():
    G = nx.grid_2d_graph(4, 4)
    P = OrderingProblem.from_graph(G)
    seen = []
    bad = list(range(0, P.n, 2)) + list(range(1, P.n, 2))  # a poor ordering
    out = solve_sat(P, upper_order=bad, progress=seen.append)
    assert out.optimal and out.upper == 5
    assert seen and all(isinstance(s, SatOutcome) for s in seen)
    assert seen[-1].lower == 5 and seen[-1].upper == 5
    uppers = [s.upper for s in seen]
    assert uppers == sorted(uppers, reverse=True)
    for s in seen:
        assert P.width(s.order) == s.upper


def test_windows_repair_a_local_defect():
    # the path 0-1-...-11 in order, with 5 and 6 swapped: width 3 at the swap, 1 elsewhere;
    # a window around the swap restores width 1 (cw(P_n) = 1, common practice)
    G = nx.path_graph(12)
    P = OrderingProblem.from_graph(G)
    order = list(range(12))
    order[5], order[6] = order[6], order[5]
    assert P.width(order) == 3
    out = solve_sat(P, upper_order=order, probe=False)
    assert out.optimal and out.upper == 1
    assert any(w[3] for w in out.stats["windows"])
    assert_valid(G, P, out)


def test_orbits_of_grid_and_cube():
    # the 4x4 grid has 3 vertex orbits (corners, edge middles, centre): from its 8 symmetries
    P = OrderingProblem.from_graph(nx.grid_2d_graph(4, 4))
    assert len(set(_orbits(P))) == 3
    # the hypercube is vertex-transitive (common practice)
    P = OrderingProblem.from_graph(nx.hypercube_graph(4))
    assert len(set(_orbits(P))) == 1
    # a pin breaks the symmetry: the first vertex is alone in its orbit
    P = OrderingProblem.from_graph(nx.cycle_graph(6), first={0})
    rep = _orbits(P)
    assert rep.count(rep[0]) == 1


def test_greedy_order_respects_pins():
    G = nx.petersen_graph()
    P = OrderingProblem.from_graph(G, first={3, 4}, last={7})
    g = greedy_order(P)
    assert sorted(g) == list(range(10))
    assert set(g[:2]) == {3, 4} and g[-1] == 7


# ---------------------------------------------------------------------------
# bad input


def test_fractional_weights_rejected():
    G = nx.Graph()
    G.add_edge(0, 1, weight=0.5)
    G.add_edge(1, 2, weight=1)
    with pytest.raises(WeightError, match="integer"):
        solve_sat(OrderingProblem.from_graph(G))


def test_unknown_solver_and_option():
    P = OrderingProblem.from_graph(nx.path_graph(4))
    with pytest.raises(UnsupportedOptionError, match="lingeling|cadical195"):
        solve_sat(P, solver="lingeling")
    with pytest.raises(UnsupportedOptionError, match="direction"):
        solve_sat(P, direction="sideways")
    with pytest.raises(UnsupportedOptionError, match="valid"):
        solve_sat(P, colour="blue")


def test_bad_orders_and_bounds():
    P = OrderingProblem.from_graph(nx.path_graph(4), first={2})
    with pytest.raises(SweepwidthError, match="not an ordering"):
        solve_sat(P, upper_order=[0, 1, 2])
    with pytest.raises(SweepwidthError, match="pinned"):
        solve_sat(P, upper_order=[0, 1, 2, 3])
    with pytest.raises(SweepwidthError, match="lower"):
        solve_sat(P, lower=-1)
    with pytest.raises(SweepwidthError, match="exceeds"):
        solve_sat(P, lower=5, upper_order=[2, 1, 0, 3])
    with pytest.raises(SweepwidthError, match="OrderingProblem"):
        solve_sat(nx.path_graph(4))


# ---------------------------------------------------------------------------
# deadlines


def _hard_problem() -> OrderingProblem:
    # the 11x11 grid: cutwidth 12 (Rolim, Sykora, Vrto, WG 1995; from memory) - far beyond 2 s
    return OrderingProblem.from_graph(nx.grid_2d_graph(11, 11))


@pytest.mark.parametrize("hard", [False, True])
def test_deadline_returns_bounds_in_time(hard):
    P = _hard_problem()
    t0 = time.monotonic()
    out = solve_sat(P, deadline=t0 + 2.0, hard_deadline=hard)
    dt = time.monotonic() - t0
    assert dt < 3.5
    assert not out.optimal
    assert out.lower <= 12 <= out.upper
    assert out.order is not None and P.width(out.order) == out.upper


# ---------------------------------------------------------------------------
# run_limited and sat_call


def test_run_limited_finishes_and_reports():
    finished, value, reports = run_limited(H.sleepy, (3,), deadline=time.monotonic() + 20)
    assert finished and value == "finished" and reports == [0, 1, 2]


def test_run_limited_kills_at_deadline():
    seen = []
    t0 = time.monotonic()
    finished, value, reports = run_limited(H.sleepy, (100,), deadline=t0 + 3.0, on_progress=seen.append)
    dt = time.monotonic() - t0
    assert not finished and value is None
    assert 3.0 <= dt < 3.5
    assert reports and reports == seen and reports[:3] == [0, 1, 2]


def test_run_limited_kills_native_code():
    t0 = time.monotonic()
    finished, value, reports = run_limited(H.native_forever, deadline=t0 + 3.0)
    assert not finished and reports == ["solving"]
    assert time.monotonic() - t0 < 3.5


def test_run_limited_passes_exceptions():
    with pytest.raises(ValueError, match="bad thing 42"):
        run_limited(H.raises_value_error, deadline=time.monotonic() + 20)
    with pytest.raises(ChildProcessError_, match="cannot be sent back"):
        run_limited(H.raises_unpicklable, deadline=time.monotonic() + 20)


def test_run_limited_without_deadline_runs_here():
    finished, value, _ = run_limited(H.pid, deadline=None)
    assert finished and value == os.getpid()
    finished, value, _ = run_limited(H.pid, deadline=time.monotonic() + 20)
    assert finished and value != os.getpid()


def test_run_limited_past_deadline_starts_nothing():
    t0 = time.monotonic()
    assert run_limited(H.sleepy, (5,), deadline=t0 - 1) == (False, None, [])
    assert time.monotonic() - t0 < 0.1


def test_sat_call_budgeted():
    from pysat.examples.genhard import PHP
    from pysat.solvers import Solver

    stats = {}
    with Solver(name="cadical195", bootstrap_with=PHP(11).clauses) as s:
        t0 = time.monotonic()
        assert sat_call(s, deadline=t0 + 0.5, name="cadical195", stats=stats) is None
        assert time.monotonic() - t0 < 1.5  # within a second of the deadline, even on a busy machine
        assert stats["slices"] >= 1 and stats["conflicts"] > 0
    with Solver(name="glucose4", bootstrap_with=[[1, 2], [-1]]) as s:
        assert sat_call(s, [-2], deadline=time.monotonic() + 5, name="glucose4") is False
        assert sat_call(s, [2], deadline=None) is True
    with Solver(name="lingeling", bootstrap_with=[[1]]) as s:
        with pytest.raises(UnsupportedOptionError, match="time-limited"):
            sat_call(s, deadline=time.monotonic() + 1, name="lingeling")
