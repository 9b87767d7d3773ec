"""Lifting low-degree vertices away (sweepwidth.solve.ordering.lifting): a sound lower bound.

The floor and ceiling are the subset DP (the Bodlaender-Fomin-Koster-Kratsch-Thilikos
recurrence, exact) on the original graph; published values are named beside each check.
"""

from __future__ import annotations

import itertools
import time

import networkx as nx
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from sweepwidth import generators
from sweepwidth.problems.cycles import FaceSweep
from sweepwidth.problems.ordering import OrderingProblem
from sweepwidth.solve.ordering.dp import solve_dp
from sweepwidth.solve.ordering.lifting import lift_problem, lifted_bound

from strategies import weighted_graphs


def _problem(G, pins, real):
    if real:  # real weights: a deterministic irrational-looking scaling of the integers
        for u, v in G.edges():
            G[u][v]["weight"] = G[u][v]["weight"] * 0.7071
    nodes = sorted(G.nodes())
    first = nodes[0] if pins & 1 else None
    last = nodes[-1] if pins & 2 and len(nodes) > 1 else None
    return OrderingProblem.from_graph(G, first=first, last=last)


@settings(max_examples=80, deadline=None)
@given(weighted_graphs(2, 11, min_weight=0, max_weight=7), st.integers(0, 3), st.booleans())
def test_lifting_never_raises_the_cutwidth(G, pins, real):
    P = _problem(G, pins, real)
    Q, k = lift_problem(P)
    assert Q.n == P.n - k
    assert P.first <= set(range(P.n)) and len(Q.first) == len(P.first) and len(Q.last) == len(P.last)
    opt = solve_dp(P)[0]
    lifted = solve_dp(Q)[0] if Q.n else 0.0
    assert lifted <= opt + 1e-9
    bound, stats = lifted_bound(P, time.monotonic() + 5)
    assert bound <= opt + 1e-9
    if P.integral:
        assert bound == int(bound)


@settings(max_examples=30, deadline=None)
@given(st.integers(1, 9), st.integers(1, 9), st.integers(1, 9))
def test_star_to_triangle_keeps_every_one_two_split(a, b, c):
    # a degree-3 vertex with the triangle inequalities: for every split of its three
    # neighbours into one and two, the lifted triangle carries min(weight one side, other side)
    if max(a, b, c) > a + b + c - max(a, b, c):
        return
    G = nx.Graph()
    G.add_edge("v", 0, weight=a)
    G.add_edge("v", 1, weight=b)
    G.add_edge("v", 2, weight=c)
    for i in range(3):  # leaves of degree 4, so that the centre is the vertex lifted among them
        for j in range(3):
            G.add_edge(i, ("d", i, j), weight=1)
    P = OrderingProblem.from_graph(G)
    Q, k = lift_problem(P, max_share=1.0)
    assert "v" not in Q.labels and k == 10  # the centre and the nine pendant dummies
    lab = {x: i for i, x in enumerate(Q.labels)}
    w = {frozenset((Q.labels[u], Q.labels[v])): x for (u, v), x in zip(Q.edges.tolist(), Q.weights.tolist())}
    ws = {0: a, 1: b, 2: c}
    for one in range(3):
        others = [x for x in range(3) if x != one]
        crossing = sum(w.get(frozenset((one, o)), 0.0) for o in others)
        assert crossing == pytest.approx(min(ws[one], ws[others[0]] + ws[others[1]]))
    assert set(lab) == {0, 1, 2}
    # the lifted problem keeps the cutwidth floor: never above the original
    assert solve_dp(Q)[0] <= solve_dp(P)[0] + 1e-9


def test_lifted_bound_is_valid_and_strong_on_a_disk_dual():
    # the dual of a weighted disk with its outer face pinned first: the bound never exceeds
    # the exact value (subset DP) and is at least the plain weighted-degree floor
    P0 = generators.weighted_delaunay_disk(11, seed=4)
    inner = [f for f in range(P0.number_of_faces()) if f != P0.outer_face]
    fs = FaceSweep.build(P0, P0.face_boundary_cycle(P0.outer_face), inner)
    G, first, last = fs.ordering_graph()
    G.remove_nodes_from([v for v in (last,) if G.degree(v) == 0])
    P = OrderingProblem.from_graph(G, weight="weight", first=first, last=last if last in G else None)
    opt = solve_dp(P)[0]
    bound, stats = lifted_bound(P, time.monotonic() + 10)
    assert stats["removed"] > 0
    assert float(P.degrees()[next(iter(P.first))]) <= opt
    assert bound <= opt


def test_lifted_bound_on_grids_and_cycles():
    # grid m x n (m <= n, m >= 3): cutwidth m + 1 (Rolim, Sykora and Vrto, WG 1995; from
    # memory); cycle: 2 (common practice)
    for G, want in ((nx.grid_2d_graph(5, 6), 6.0), (nx.cycle_graph(12), 2.0)):
        P = OrderingProblem.from_graph(G)
        bound, _ = lifted_bound(P, time.monotonic() + 10)
        assert bound <= want
    # the cycle's lifted graph is a cycle of half the length (every other vertex lifted)
    Q, k = lift_problem(OrderingProblem.from_graph(nx.cycle_graph(12)), max_share=0.5)
    assert (k, Q.n) == (6, 6) and np.allclose(Q.weights, 1.0)


def test_lifting_keeps_pins_and_their_edges():
    G = nx.path_graph(6)
    for u, v in G.edges():
        G[u][v]["weight"] = 1 + u
    P = OrderingProblem.from_graph(G, first=0, last=5)
    Q, k = lift_problem(P)
    assert {Q.labels[v] for v in Q.first} == {0} and {Q.labels[v] for v in Q.last} == {5}
    for lab in (0, 5):
        assert lab in Q.labels
    # every pair of a path lifted: the path's cutwidth can only drop
    assert solve_dp(Q)[0] <= solve_dp(P)[0]
    for a, b in itertools.combinations(range(Q.n), 2):
        assert Q.labels[a] != Q.labels[b]


def test_the_state_cap_grows_with_the_memory_budget_and_an_explicit_cap_is_kept():
    # regression: a long time limit ended early when the lifted search hit a fixed cap of
    # 4,194,304 states (the 200-vertex weighted disk's dual: [58, 70] after 87 s of 200 s)
    from sweepwidth.solve.ordering.bnb import states_for_memory

    assert states_for_memory(242, 1 << 30) > 4_000_000
    assert states_for_memory(64, 1 << 20) == (1 << 20) // (2 * 9)  # one word and a flag a set
    assert states_for_memory(10_000, 1) == 1024  # never below a usable table
    P = OrderingProblem.from_graph(nx.grid_2d_graph(6, 6))  # cutwidth 7 (from memory: min(m, n) + 1 for m x n grids)
    _, st_mem = lifted_bound(P, time.monotonic() + 5, max_states=2048, max_memory=1 << 26)
    assert st_mem["max_states"] == states_for_memory(st_mem["n"], 1 << 26)
    _, st_cap = lifted_bound(P, time.monotonic() + 5, max_states=2048)
    assert st_cap["max_states"] == 2048


def test_auto_spends_time_left_after_a_capped_search_on_the_upper_bound():
    # regression: the chain returned at 3.3 s of 6 when the last prefix-set search hit its state
    # cap; it now goes on with the kick search (stats['search_more'])
    import sweepwidth as sw

    P = generators.weighted_delaunay_disk(60, seed=3)
    from sweepwidth.problems.cycles import HomologyProblem

    hp = HomologyProblem.build(P)
    fs = FaceSweep.build(P, hp.start, hp.swept[0])
    G, a, b = fs.ordering_graph()
    r = sw.cutwidth(G, first=a, last=b, time_limit=6, max_states=20_000)
    part = max(r.stats["parts"], key=lambda p: p.get("n", 0))
    chain = part["auto"]["chain"]
    assert r.lower <= r.upper
    assert r.status == "optimal" or (chain[-1] == "search" and "search_more" in part), chain
