"""Carving width by the ratcatcher game (sweepwidth.solve.ordering.ratcatcher).

Independent references: a brute force over all carving decompositions (recursion over
vertex subsets, tests/test_carving.py), the subset DP cutwidth optimum (solve_dp on the
pin-contracted problem), and known values.
"""

from __future__ import annotations

import math

import networkx as nx
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from sweepwidth import generators
from sweepwidth.errors import ProblemTooLargeError
from sweepwidth.problems.ordering import OrderingProblem
from sweepwidth.solve.ordering.dp import solve_dp
from sweepwidth.solve.ordering.ratcatcher import carving_width_game, rat_escapes, ratcatcher_bound

from strategies import plane_graphs
from test_carving import _carving_width


def _optimum(P: OrderingProblem) -> float:
    return solve_dp(P.contract_pins().problem)[0]


@settings(max_examples=120, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(plane_graphs(2, 7, weighted=True, max_weight=4))
def test_game_equals_brute_force_carving_width(PG):
    # the game's value against every carving decomposition (brute force, written in test_carving)
    P = OrderingProblem.from_graph(PG.to_networkx())
    lo, hi = carving_width_game(P, planar_embedding=PG)
    assert lo == hi == _carving_width(P)


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(plane_graphs(2, 7, weighted=False))
def test_game_without_embedding_equals_brute_force(PG):
    # the embedding found by networkx check_planarity instead of the given one
    P = OrderingProblem.from_graph(PG.to_simple_graph())
    assert carving_width_game(P)[0] == _carving_width(P)


def test_known_values():
    # from memory: carving width of the cycle C_n is 2, of K_4 is 4 (Seymour and Thomas 1994);
    # the wheels and small grids below are checked by the brute force
    assert carving_width_game(OrderingProblem.from_graph(nx.cycle_graph(9))) == (2.0, 2.0)
    assert carving_width_game(OrderingProblem.from_graph(nx.complete_graph(4))) == (4.0, 4.0)
    for G in (nx.wheel_graph(6), nx.grid_2d_graph(3, 4), nx.octahedral_graph()):
        P = OrderingProblem.from_graph(G)
        assert carving_width_game(P)[0] == _carving_width(P)


def test_real_weights_interval_contains_brute_force():
    G = nx.Graph()
    G.add_weighted_edges_from([(0, 1, 0.5), (1, 2, 0.75 + 1e-3), (2, 0, 1.25), (2, 3, math.pi), (3, 0, 0.1)])
    P = OrderingProblem.from_graph(G)
    lo, hi = carving_width_game(P)
    cv = _carving_width(P)
    assert lo <= cv + 1e-12 and cv <= hi + 1e-12 and hi - lo < 1e-6


def test_disconnected_and_tiny():
    G = nx.disjoint_union(nx.cycle_graph(4), nx.complete_graph(4))
    G.add_node(99)
    P = OrderingProblem.from_graph(G)
    assert carving_width_game(P) == (4.0, 4.0)
    assert carving_width_game(OrderingProblem.from_graph(nx.path_graph(1))) == (0.0, 0.0)
    assert rat_escapes(OrderingProblem.from_graph(nx.path_graph(2)), 1.0) is True
    assert rat_escapes(OrderingProblem.from_graph(nx.path_graph(2)), 1.5) is False


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(plane_graphs(2, 8, weighted=True, max_weight=5), st.data())
def test_cutwidth_bound_never_exceeds_optimum(PG, data):
    # weighted, with and without pins; the optimum from the subset DP
    G = PG.to_networkx()
    nodes = list(G.nodes())
    first = data.draw(st.sampled_from([None] + nodes))
    last = data.draw(st.sampled_from([None] + [v for v in nodes if v != first]))
    P = OrderingProblem.from_graph(G, first=first, last=last)
    assert ratcatcher_bound(P, planar_embedding=PG) <= _optimum(P) + 1e-9


def test_cutwidth_bound_pinned_sets_contracted():
    G = nx.grid_2d_graph(3, 4)
    P = OrderingProblem.from_graph(G, first={(0, 0), (0, 1)}, last={(2, 3)})
    assert 0 < ratcatcher_bound(P) <= _optimum(P)


def test_cutwidth_bound_on_disk_dual_is_sound():
    P = generators.weighted_delaunay_disk(12, seed=3)
    D = P.dual()
    pinned = OrderingProblem.from_graph(D.to_networkx(), first=P.outer_face)
    b = ratcatcher_bound(pinned, planar_embedding=D)
    if pinned.n <= 22:
        assert b <= _optimum(pinned) + 1e-9


def test_non_planar_gives_zero_and_memory_refusal():
    assert ratcatcher_bound(OrderingProblem.from_graph(nx.complete_graph(5))) == 0.0
    P = OrderingProblem.from_graph(nx.grid_2d_graph(6, 6))
    with pytest.raises(ProblemTooLargeError):
        carving_width_game(P, max_memory=1000)
    assert ratcatcher_bound(P, max_memory=1000) == 0.0


def test_deadline_past_returns_proven_interval():
    P = OrderingProblem.from_graph(nx.grid_2d_graph(5, 5))
    lo, hi = carving_width_game(P, deadline=0.0)
    assert lo == 4.0 and hi == 40.0  # the largest degree and the total weight: nothing was decided
