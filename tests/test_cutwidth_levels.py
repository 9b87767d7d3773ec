"""Edge-isoperimetric level bounds by integer programming (sweepwidth.solve.ordering.level_bound).

References outside the library: the subset DP optimum (an independent exact method), a brute
force over all prefix sets of each size (written here), Harper's hypercube theorem.
"""

from __future__ import annotations

import itertools

import networkx as nx
import pytest
from hypothesis import HealthCheck, given, settings

import sweepwidth as sw
from sweepwidth.errors import InvalidArgumentError
from sweepwidth.problems.ordering import OrderingProblem
from sweepwidth.solve.ordering.dp import solve_dp
from sweepwidth.solve.ordering.level_bound import level_bound, level_value, symmetry_rows

from test_cutwidth_flow import multigraph_problems


def _b_brute(P: OrderingProblem, i: int) -> float:
    """Least boundary over sets of size i containing the first pin and avoiding the last one."""
    best = float("inf")
    for S in itertools.combinations(range(P.n), i):
        s = set(S)
        if not P.first <= s or P.last & s:
            continue
        best = min(best, sum(w for (a, b), w in zip(P.edges.tolist(), P.weights.tolist()) if (a in s) != (b in s)))
    return best


@settings(max_examples=100, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(multigraph_problems(max_nodes=9))
def test_level_bound_never_exceeds_optimum(P):
    # loops, parallel edges, zero / real / integer weights and pins come from the strategy
    Q = P.contract_pins().problem
    opt = solve_dp(Q)[0]
    lb, info = level_bound(Q, max_idle=Q.n)
    assert 0 <= lb <= opt + 1e-9 * (1 + opt)


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(multigraph_problems(max_nodes=8))
def test_level_value_is_the_enumerated_minimum_with_symmetry(P):
    Q = P.contract_pins().problem
    f, l = len(Q.first), len(Q.last)
    sym = symmetry_rows(Q, 1.0)
    for i in range(f, Q.n - l + 1):
        want = _b_brute(Q, i)
        for s in (None, sym):
            val, exact = level_value(Q, i, symmetry=s)
            assert exact
            assert val <= want + 1e-9 * (1 + want)
            if Q.integral:
                assert val == want, (i, s)
            else:
                assert val >= want - 1e-4 * (1 + want + float(Q.weights.sum()))


@pytest.mark.parametrize("d", [2, 3, 4, 5])
def test_hypercube_levels_reach_harper_value(d):
    # cw(Q_d) = floor(2^(d+1) / 3): Harper, J. SIAM 12 (1964), edge-isoperimetric theorem (from memory)
    want = (2 ** (d + 1)) // 3
    P = OrderingProblem.from_graph(nx.convert_node_labels_to_integers(nx.hypercube_graph(d)))
    lb, info = level_bound(P, target=want)
    assert lb == want
    assert sw.cutwidth(nx.hypercube_graph(d), time_limit=60).value == want


def test_symmetry_rows_on_a_path_and_a_pinned_problem():
    # the path P_5 has the reversal only: orbits {0,4}, {1,3}, {2}; representatives 0, 1, 2
    reps, extra = symmetry_rows(OrderingProblem.from_graph(nx.path_graph(5)), 1.0)
    assert reps == [0, 1, 2] and extra is None
    # a pinned first vertex: nothing assumed
    assert symmetry_rows(OrderingProblem.from_graph(nx.cycle_graph(5), first=0)) == ([], None)


def test_level_value_rejects_uncounted_sizes():
    P = OrderingProblem.from_graph(nx.cycle_graph(5), first=0)
    with pytest.raises(InvalidArgumentError, match="level 0"):
        level_value(P, 0)


def test_level_bound_keeps_its_deadline_on_a_graph_without_symmetry():
    # regression: the automorphism search ran in-process and one VF2 search on the weighted Les
    # Miserables graph (networkx's shipped graph) kept 'auto' busy 100 s past a 60 s limit
    import time

    G = nx.les_miserables_graph()
    P = OrderingProblem.from_graph(G, weight="weight")
    t = time.monotonic()
    lb, info = level_bound(P, deadline=t + 8.0, max_idle=100)
    assert time.monotonic() - t < 10.0
    assert 0 < lb <= 141  # 141: width of an ordering found by the kick search
