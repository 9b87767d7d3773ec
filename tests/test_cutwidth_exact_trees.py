"""Exact cutwidth of unit-weight forests (:mod:`sweepwidth.solve.ordering.tree_heights`).

Every value is compared with the subset DP (an independent exact method), every
ordering is re-measured by the independent checker :func:`sweepwidth.verify.ordering_width`,
and the enumeration of trees comes from networkx (``nonisomorphic_trees``, a
reference library's generator).
"""

from __future__ import annotations

import math

import networkx as nx
import pytest
from hypothesis import given, settings, strategies as st

import sweepwidth as sw
from sweepwidth.errors import InvalidArgumentError, SweepwidthError
from sweepwidth.problems.ordering import OrderingProblem
from sweepwidth.solve.ordering.tree_heights import tree_cutwidth_exact
from sweepwidth.verify.ordering import ordering_width


def _exact(G: nx.Graph) -> int:
    P = OrderingProblem.from_graph(G)
    value, order = tree_cutwidth_exact(P)
    labels = [P.labels[i] for i in order]
    assert sorted(order) == list(range(P.n))
    assert ordering_width(G, labels) == value  # the witness attains the claimed value
    return value


def _dp(G: nx.Graph) -> float:
    return sw.cutwidth(G, method="dp").value


@pytest.mark.parametrize("n", range(2, 10))
def test_every_tree_up_to_nine_vertices_matches_the_dp(n):
    for T in nx.nonisomorphic_trees(n):
        assert _exact(T) == _dp(T), sorted(T.edges())


@pytest.mark.slow
@pytest.mark.parametrize("n", [10, 11, 12])
def test_every_tree_of_ten_to_twelve_vertices_matches_the_dp(n):
    for T in nx.nonisomorphic_trees(n):
        assert _exact(T) == _dp(T), sorted(T.edges())


@settings(max_examples=40, deadline=None)
@given(st.lists(st.integers(1, 7), min_size=1, max_size=3), st.integers(0, 10**6))
def test_random_forests_match_the_dp(sizes, seed):
    F = nx.Graph()
    offset = 0
    for k, size in enumerate(sizes):
        T = nx.random_labeled_tree(size, seed=seed + k) if size > 1 else nx.empty_graph(1)
        F.update(nx.relabel_nodes(T, {v: v + offset for v in T}))
        offset += size
    if F.number_of_edges() == 0:
        return
    assert _exact(F) == _dp(F)


@pytest.mark.parametrize("h", range(2, 9))
def test_complete_binary_trees(h):
    # ceil(h/2) + 1, attributed to Lengauer, SIAM J. Algebraic Discrete Methods 1982 (from memory);
    # the DP confirms it for h <= 3
    T = nx.balanced_tree(2, h)
    assert _exact(T) == math.ceil(h / 2) + 1
    if h <= 3:
        assert _dp(T) == math.ceil(h / 2) + 1


@pytest.mark.parametrize("n", [1, 2, 7, 200, 1001])
def test_stars(n):
    # cw(K_{1,n}) = ceil(n/2): the degree bound, met by putting the centre in the middle (common practice);
    # regression: a star with 200 leaves made the state enumeration hang
    assert _exact(nx.star_graph(n)) == math.ceil(n / 2)


def test_paths_and_caterpillars():
    assert _exact(nx.path_graph(50)) == 1  # common practice
    # a caterpillar: a spine with two legs at every spine vertex; the DP on 12 vertices
    C = nx.path_graph(4)
    for i in range(4):
        C.add_edge(i, (i, "a"))
        C.add_edge(i, (i, "b"))
    assert _exact(C) == _dp(C)


def test_auto_proves_random_large_trees():
    T = nx.random_labeled_tree(3000, seed=5)
    r = sw.cutwidth(T, time_limit=20)
    assert r.status == "optimal"
    assert r.check(T) == r.value


def test_bad_input():
    with pytest.raises(SweepwidthError):
        tree_cutwidth_exact(OrderingProblem.from_graph(nx.cycle_graph(5)))  # not a forest
    W = nx.path_graph(4)
    W[1][2]["weight"] = 3
    with pytest.raises(SweepwidthError):
        tree_cutwidth_exact(OrderingProblem.from_graph(W))  # weighted trees are NP-hard: general methods
    # regression: the pinned-vertex refusal called UnsupportedOptionError with one argument (a TypeError)
    with pytest.raises(InvalidArgumentError, match="pinned"):
        tree_cutwidth_exact(OrderingProblem.from_graph(nx.path_graph(4), first=0))
