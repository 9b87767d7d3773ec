"""Cutwidth of unit-weight forests (sweepwidth.solve.ordering.trees).

References for the checks: networkx's enumeration of non-isomorphic trees with the
subset DP as the exact value; complete binary trees of height h >= 2 have cutwidth
ceil(h/2) + 1 (Lengauer, SIAM J. Algebraic Discrete Methods 1982; from memory);
paths have cutwidth 1 and stars K_{1,n} ceil(n/2) (common practice: the centre's
edges split over its two sides).  Witnesses are recomputed by sweepwidth.verify.
"""

from __future__ import annotations

import math
import time

import networkx as nx
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from sweepwidth.errors import SweepwidthError
from sweepwidth.problems.ordering import OrderingProblem
from sweepwidth.solve.ordering.trees import block_layout, branch_bound, tree_cutwidth
from sweepwidth.solve.ordering.dp import solve_dp
from sweepwidth.verify.ordering import ordering_width


def _check(T, P, width, order, **pins):
    assert ordering_width(T, [P.labels[v] for v in order], weight=None, **pins) == width


@pytest.mark.parametrize("n", range(2, 12))
def test_all_small_trees_against_the_dp(n):
    for T in nx.nonisomorphic_trees(n):
        P = OrderingProblem.from_graph(T)
        opt = solve_dp(P)[0]
        w, order = block_layout(P)
        _check(T, P, w, order)
        lb = branch_bound(P)
        # measured: both are exact on every tree up to 11 vertices (not a theorem)
        assert lb == opt == w


@pytest.mark.parametrize("h", range(2, 10))
def test_complete_binary_trees(h):
    T = nx.balanced_tree(2, h)
    P = OrderingProblem.from_graph(T)
    out = tree_cutwidth(P, time.monotonic() + 20, seed=0)
    assert out.lower <= math.ceil(h / 2) + 1 <= out.upper
    _check(T, P, out.upper, out.order)
    if h <= 3:
        assert solve_dp(P)[0] == math.ceil(h / 2) + 1  # the formula itself, by the DP
    # block layouts alone are not optimal here (they give h)
    assert block_layout(P)[0] == h


def test_complete_binary_tree_height_8_is_solved():
    T = nx.balanced_tree(2, 8)
    P = OrderingProblem.from_graph(T)
    out = tree_cutwidth(P, time.monotonic() + 60, seed=0)
    assert out.optimal and out.upper == 5
    _check(T, P, out.upper, out.order)


@pytest.mark.parametrize("n", [2, 3, 10, 200])
def test_paths_and_stars(n):
    T = nx.path_graph(n)
    P = OrderingProblem.from_graph(T)
    out = tree_cutwidth(P)
    assert out.optimal and out.upper == 1
    S = nx.star_graph(n)  # K_{1,n}
    Q = OrderingProblem.from_graph(S)
    out = tree_cutwidth(Q)
    assert out.optimal and out.upper == math.ceil(n / 2)
    _check(S, Q, out.upper, out.order)


@settings(max_examples=60, deadline=None)
@given(st.integers(2, 14), st.integers(0, 2**20))
def test_random_trees_bounds_bracket_the_dp(n, seed):
    T = nx.random_labeled_tree(n, seed=seed)
    P = OrderingProblem.from_graph(T)
    opt = solve_dp(P)[0]
    assert branch_bound(P) <= opt <= block_layout(P)[0]
    out = tree_cutwidth(P, time.monotonic() + 1, seed=seed)
    assert out.lower <= opt <= out.upper
    _check(T, P, out.upper, out.order)


@pytest.mark.parametrize("n", [1000, 10000])
def test_large_random_trees_witness(n):
    T = nx.random_labeled_tree(n, seed=7)
    P = OrderingProblem.from_graph(T)
    w, order = block_layout(P)
    _check(T, P, w, order)
    assert branch_bound(P) <= w


def test_forests_and_pins():
    F = nx.disjoint_union(nx.star_graph(5), nx.balanced_tree(2, 3))
    P = OrderingProblem.from_graph(F)
    out = tree_cutwidth(P, time.monotonic() + 5, seed=0)
    assert out.optimal and out.upper == 3  # max of the components: ceil(5/2) and 3
    _check(F, P, out.upper, out.order)
    T = nx.balanced_tree(2, 3)
    Q = OrderingProblem.from_graph(T, first=7, last=14)
    out = tree_cutwidth(Q, time.monotonic() + 2, seed=0)
    assert Q.respects_pins(out.order)
    _check(T, Q, out.upper, out.order, first=7, last=14)
    assert out.lower <= solve_dp(Q)[0] <= out.upper


def test_refuses_cycles_and_weights():
    with pytest.raises(SweepwidthError, match="forest"):
        tree_cutwidth(OrderingProblem.from_graph(nx.cycle_graph(5)))
    T = nx.path_graph(4)
    T[1][2]["weight"] = 3
    with pytest.raises(SweepwidthError, match="unit weights"):
        block_layout(OrderingProblem.from_graph(T))
