"""The new cutwidth lower bounds (sweepwidth.solve.ordering) never exceed the optimum.

The optimum comes from the subset DP (sweepwidth.solve.ordering.dp), an
independent exact method; small published values are named beside each check.
"""

from __future__ import annotations

import math

import networkx as nx
import numpy as np
import pytest
from hypothesis import HealthCheck, example, given, settings
from hypothesis import strategies as st

from sweepwidth.problems.ordering import OrderingProblem
from sweepwidth.solve.ordering.flow import flow_bound
from sweepwidth.solve.ordering.bounds import degree_bound
from sweepwidth.solve.ordering.dp import solve_dp


@st.composite
def multigraph_problems(draw, max_nodes: int = 10):
    """Small multigraphs with loops, parallel edges, zero / real / integer weights, optional pins."""
    n = draw(st.integers(2, max_nodes))
    G = nx.MultiGraph()
    G.add_nodes_from(range(n))
    m = draw(st.integers(0, 3 * n))
    kind = draw(st.sampled_from(["int", "real", "unit"]))
    for _ in range(m):
        u = draw(st.integers(0, n - 1))
        v = draw(st.integers(0, n - 1))
        if kind == "int":
            w: float = draw(st.integers(0, 10))
        elif kind == "real":
            w = draw(st.floats(0, 5, allow_nan=False, allow_infinity=False))
        else:
            w = 1
        G.add_edge(u, v, weight=w)
    if draw(st.booleans()):  # connect it most of the time, so the flow has work to do
        perm = draw(st.permutations(list(range(n))))
        for a, b in zip(perm, perm[1:]):
            G.add_edge(a, b, weight=1 if kind != "real" else 0.5)
    pin = draw(st.sampled_from(["none", "first", "last", "both", "sets"]))
    first: object = 0 if pin in ("first", "both") else None
    last: object = n - 1 if pin in ("last", "both") and n > 1 else None
    if pin == "sets" and n >= 4:  # pinned sets of two vertices each
        first, last = [0, 1], [n - 2, n - 1]
    return OrderingProblem.from_graph(G, first=first, last=last)


def _optimum(P: OrderingProblem) -> float:
    return solve_dp(P.contract_pins().problem)[0]


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(multigraph_problems())
# regressions: a subnormal weight made every routed load vanish (division by zero) or, beside
# ordinary weights, overflowed the load / weight ratios into a bound above the optimum
@example(OrderingProblem(labels=(0, 1), edges=np.array([[0, 1]]), weights=np.array([5e-324]), first=frozenset(), last=frozenset()))
@example(OrderingProblem(labels=(0, 1, 2), edges=np.array([[0, 1], [0, 2]]), weights=np.array([1.0, 5e-324]), first=frozenset(), last=frozenset()))
@example(OrderingProblem(labels=(0, 1, 2), edges=np.array([[0, 1], [0, 2]]), weights=np.array([5e-324, 2.0]), first=frozenset(), last=frozenset()))
def test_flow_bound_never_exceeds_optimum(P):
    lb = flow_bound(P)
    opt = _optimum(P)
    assert lb <= opt + 1e-9 * (1 + opt)
    assert lb >= 0


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(multigraph_problems(max_nodes=9), st.data())
def test_flow_bound_any_terminal_set_is_sound(P, data):
    U = data.draw(st.lists(st.sampled_from(list(P.labels)), unique=True, min_size=0, max_size=P.n))
    lb = flow_bound(P, terminals=U)
    assert lb <= _optimum(P) + 1e-9


def test_flow_bound_known_values():
    # cutwidth of a cycle is 2 and of K_n is floor(n^2/4) (common practice / from memory);
    # the flow bound reaches both, since uniform routing is optimal there.
    assert flow_bound(OrderingProblem.from_graph(nx.cycle_graph(9))) == 2.0
    assert flow_bound(OrderingProblem.from_graph(nx.complete_graph(7))) == 12.0
    # a path has cutwidth 1
    assert flow_bound(OrderingProblem.from_graph(nx.path_graph(6))) == 1.0


def test_flow_bound_grid_is_below_bisection_width():
    # the bisection width of the 10 x 10 grid is 10 (from memory) and the
    # cutwidth of P_m x P_n is m + 1 = 11 (Rolim, Sykora, Vrto, WG 1995; from memory):
    # a bisection-type bound may reach 10 but never more
    P = OrderingProblem.from_graph(nx.grid_2d_graph(10, 10))
    lb = flow_bound(P)
    assert 9 <= lb <= 10


def test_flow_bound_weights_scale():
    # scaling every weight scales the cutwidth (cw of P_4 x P_5 is 5: Rolim, Sykora,
    # Vrto, from memory); the routing ignores the scale, only the rounding differs
    G = nx.grid_2d_graph(4, 5)
    P = OrderingProblem.from_graph(G)
    Q = P.scaled(2.5)
    assert flow_bound(P) - 1 <= flow_bound(Q) / 2.5 <= 5


def test_flow_bound_disconnected_takes_largest_component():
    G = nx.disjoint_union(nx.complete_graph(6), nx.cycle_graph(5))
    # cutwidth of K_6 is 9 (floor(36/4), from memory)
    assert flow_bound(OrderingProblem.from_graph(G)) == 9.0


def test_flow_bound_zero_and_empty():
    assert flow_bound(OrderingProblem.from_graph(nx.empty_graph(5))) == 0.0
    G = nx.Graph()
    G.add_edge(0, 1, weight=0)
    G.add_edge(1, 1, weight=3)
    assert flow_bound(OrderingProblem.from_graph(G)) == 0.0


def test_flow_bound_respects_deadline():
    import time

    P = OrderingProblem.from_graph(nx.grid_2d_graph(40, 40))
    t = time.monotonic()
    lb = flow_bound(P, time.monotonic() + 0.5)
    assert time.monotonic() - t < 2.0
    assert 0 <= lb <= 41
