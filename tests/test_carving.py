"""Face-graph walk bounds on cutwidth and carving width (sweepwidth.solve.ordering.carving).

Independent references: the subset DP cutwidth optimum (solve_dp on the pin-contracted
problem), a brute-force carving width by recursion over vertex subsets (written here),
brute-force minimum cuts of each size (written here), and published values.
"""

from __future__ import annotations

import itertools
import math
from functools import lru_cache

import networkx as nx
import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from sweepwidth import generators
from sweepwidth.errors import InvalidArgumentError
from sweepwidth.problems.ordering import OrderingProblem
from sweepwidth.solve.ordering.carving import carving_bound, carving_width_lower_bound, walk_profile
from sweepwidth.solve.ordering.dp import solve_dp

from strategies import plane_graphs, weighted_graphs


def _optimum(P: OrderingProblem) -> float:
    return solve_dp(P.contract_pins().problem)[0]


def _cut(P: OrderingProblem, S: frozenset) -> float:
    return float(sum(w for (u, v), w in zip(P.edges.tolist(), P.weights.tolist()) if (u in S) != (v in S)))


def _carving_width(P: OrderingProblem) -> float:
    """Brute force: carvw(S) = min over splits S = A + B of max(cut(A), cut(B), carvw(A), carvw(B)).

    A carving of the vertex set V (a tree of maximum degree 3 with leaves V)
    rooted at an edge is a binary tree; every tree edge is the cut of the leaf set
    below it.  Definition: Seymour and Thomas, Combinatorica 1994.
    """
    n = P.n

    @lru_cache(maxsize=None)
    def cw(S: frozenset) -> float:
        if len(S) == 1:
            return _cut(P, S)
        items = sorted(S)
        best = math.inf
        first, rest = items[0], items[1:]
        for k in range(0, len(rest)):
            for A in itertools.combinations(rest, k):
                A = frozenset((first,) + A)
                B = S - A
                best = min(best, max(_cut(P, A), _cut(P, B), cw(A), cw(B)))
        return best

    if n <= 1:
        return 0.0
    V = frozenset(range(n))
    items = sorted(V)
    # root the tree at a leaf edge of vertex 0: T minus that leaf is a carving of V - {0} plus the leaf edge
    rest = V - {items[0]}
    if len(rest) == 1:
        return _cut(P, frozenset({items[0]}))
    # the tree edge set = leaf edge of 0 (cut(0)) and the edges below the root split of rest
    best = math.inf
    r = sorted(rest)
    for k in range(0, len(r) - 1):
        for A in itertools.combinations(r[1:], k):
            A = frozenset((r[0],) + A)
            B = rest - A
            best = min(best, max(_cut(P, A), _cut(P, B), cw(A), cw(B)))
    return max(_cut(P, frozenset({items[0]})), best)


def _profile_brute(P: OrderingProblem, base: int, M: int) -> np.ndarray:
    """Least cut weight per area residue, over all vertex sets (the quantity g relaxes)."""
    g = np.full(M, np.inf)
    n = P.n
    for mask in range(1 << n):
        S = frozenset(i for i in range(n) if mask >> i & 1)
        r = (len(S) - (n if base in S else 0)) % M
        g[r] = min(g[r], _cut(P, S))
    return g


def test_cycle_and_path_values():
    # every proper cut of a cycle has >= 2 edges, cutwidth of C_n is 2 (common practice)
    assert carving_bound(OrderingProblem.from_graph(nx.cycle_graph(9))) == 2.0
    # a path: cutwidth 1
    assert carving_bound(OrderingProblem.from_graph(nx.path_graph(7))) == 1.0


@pytest.mark.parametrize("m", [3, 4, 5, 7])
def test_square_grids_reach_cutwidth(m):
    # cw(P_m x P_m) = m + 1 for m >= 3 (Rolim, Sykora and Vrto, WG 1995; from memory)
    P = OrderingProblem.from_graph(nx.grid_2d_graph(m, m))
    b = carving_bound(P)
    assert b <= m + 1
    if m <= 4:
        assert b <= _optimum(P)
    assert b >= m  # the bisection width of the m x m grid is m (common practice)


def test_profile_never_above_true_cuts_k4():
    P = OrderingProblem.from_graph(nx.complete_graph(4))
    g = walk_profile(P, base=0, modulus=7)
    assert np.all(g <= _profile_brute(P, 0, 7) + 1e-9)


@settings(max_examples=120, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(plane_graphs(1, 9, weighted=True), st.data())
def test_never_above_cutwidth_on_plane_graphs(PG, data):
    G = PG.to_networkx()
    nodes = list(G.nodes())
    pin = data.draw(st.sampled_from(["none", "first", "last", "both"]))
    first = nodes[0] if pin in ("first", "both") and nodes else None
    last = nodes[-1] if pin in ("last", "both") and len(nodes) > 1 else None
    P = OrderingProblem.from_graph(G, first=first, last=last)
    emb = data.draw(st.booleans())
    b = carving_bound(P, planar_embedding=PG if emb else None)
    assert b <= _optimum(P) + 1e-9
    # the relaxed profile never exceeds the true least cuts of each residue
    if P.n <= 9:
        base = min(P.first) if P.first else (min(P.last) if P.last else 0)
        M = 2 * P.n - 1 if (P.first or P.last) else max(P.n, 1)
        g = walk_profile(P, base=base, modulus=M, planar_embedding=PG if emb else None)
        assert np.all(g <= _profile_brute(P, base, M) + 1e-9)


@settings(max_examples=80, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(weighted_graphs(1, 8, max_weight=6), st.data())
def test_never_above_cutwidth_any_graph_any_rotation(G, data):
    # the argument holds for every rotation system, planar or not: shuffle the neighbour orders
    seed = data.draw(st.integers(0, 2**16))
    rng = np.random.default_rng(seed)
    rot = {v: [u for u in rng.permutation(list(G.neighbors(v))).tolist()] for v in G.nodes()}
    first = data.draw(st.sampled_from([None] + list(G.nodes())))
    P = OrderingProblem.from_graph(G, first=first)
    opt = _optimum(P)
    assert carving_bound(P, planar_embedding=rot) <= opt + 1e-9
    assert carving_bound(P) <= opt + 1e-9


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(plane_graphs(2, 7, weighted=True))
def test_carving_lower_bound_against_brute_force(PG):
    P = OrderingProblem.from_graph(PG.to_networkx())
    cv = _carving_width(P)
    b = carving_width_lower_bound(P, planar_embedding=PG)
    assert b <= cv + 1e-9
    # and carving width <= max(cutwidth, max degree): a layout is a caterpillar carving
    deg = float(P.degrees().max()) if P.m else 0.0
    assert cv <= max(_optimum(P), deg) + 1e-9


def test_brute_force_carving_known_values():
    # carving width of K_4 is 4 and of the cycle C_n is 2 (Seymour and Thomas 1994; from memory)
    assert _carving_width(OrderingProblem.from_graph(nx.complete_graph(4))) == 4.0
    assert _carving_width(OrderingProblem.from_graph(nx.cycle_graph(6))) == 2.0


def test_weighted_disk_dual_pinned_is_sound_and_pins_help():
    P = generators.weighted_delaunay_disk(12, seed=3)
    D = P.dual()
    pinned = OrderingProblem.from_graph(D.to_networkx(), first=P.outer_face)
    free = OrderingProblem.from_graph(D.to_networkx())
    if pinned.n <= 22:
        opt = _optimum(pinned)
        assert carving_bound(pinned, planar_embedding=D) <= opt + 1e-9
    assert carving_bound(free, planar_embedding=D) <= _optimum(free) + 1e-9


def test_real_zero_weights_loops_parallel_edges():
    G = nx.MultiGraph()
    G.add_edge(0, 1, weight=0.5)
    G.add_edge(0, 1, weight=0.25)
    G.add_edge(1, 2, weight=0.0)
    G.add_edge(2, 2, weight=3.0)
    G.add_edge(2, 3, weight=1.5)
    G.add_edge(3, 0, weight=2.0)
    P = OrderingProblem.from_graph(G, first=1)
    assert carving_bound(P) <= _optimum(P) + 1e-9
    # disconnected: two triangles
    H = nx.disjoint_union(nx.cycle_graph(3), nx.cycle_graph(3))
    Q = OrderingProblem.from_graph(H)
    assert carving_bound(Q) == _optimum(Q) == 2.0


def test_non_planar_is_sound():
    for G in (nx.complete_graph(6), nx.petersen_graph(), nx.complete_bipartite_graph(3, 4)):
        P = OrderingProblem.from_graph(G)
        assert 0 <= carving_bound(P) <= _optimum(P)


def test_deadline_past_gives_trivial_bound():
    P = OrderingProblem.from_graph(nx.grid_2d_graph(5, 5))
    assert carving_bound(P, deadline=0.0) == 0.0


def test_bad_embedding_type():
    P = OrderingProblem.from_graph(nx.cycle_graph(4))
    with pytest.raises(InvalidArgumentError):
        carving_bound(P, planar_embedding=42)
    with pytest.raises(ValueError):
        walk_profile(P, base=9)


def test_regression_parallel_face_arcs_not_added():
    # a triangle has two faces joined by three parallel dual edges; their shortest one
    # (not their sum) is the distance used for pruning, else cuts were missed
    G = nx.Graph()
    G.add_weighted_edges_from([(0, 1, 1), (0, 2, 1), (1, 2, 2)])
    P = OrderingProblem.from_graph(G, last=2)
    g = walk_profile(P, base=2, modulus=5)
    assert np.all(g <= _profile_brute(P, 2, 5) + 1e-9)
    assert g[2] == 3.0  # the cut {0, 1} weighs 1 + 2


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(plane_graphs(2, 9, weighted=True))
def test_pins_never_weaken(PG):
    G = PG.to_networkx()
    v = next(iter(G.nodes()))
    free = carving_bound(OrderingProblem.from_graph(G), planar_embedding=PG)
    pinned = carving_bound(OrderingProblem.from_graph(G, first=v), planar_embedding=PG)
    assert pinned >= free - 1e-9


def test_sampled_areas_and_memory_estimate():
    from sweepwidth.errors import ProblemTooLargeError

    P = OrderingProblem.from_graph(nx.grid_2d_graph(5, 5), first=(0, 0))
    small = carving_bound(P, max_memory=32 * 17 * 12)  # forces area on every few vertices only
    assert 0 < small <= _optimum(P)
    with pytest.raises(ProblemTooLargeError):
        walk_profile(P, max_memory=1000)
