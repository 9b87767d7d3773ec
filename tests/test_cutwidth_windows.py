"""Window re-optimisation and the multi-start search (sweepwidth.solve.ordering).

Every width is recomputed by the independent checker ``sweepwidth.verify.ordering_width``
on the networkx graph; optimality references come from the subset DP and from published
values (named beside each check).
"""

from __future__ import annotations

import time

import networkx as nx
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from sweepwidth import generators
from sweepwidth.errors import SweepwidthError
from sweepwidth.problems.ordering import OrderingProblem
from sweepwidth.solve.ordering.local_search import search_orderings, start_orderings
from sweepwidth.solve.ordering.windows import improve_windows
from sweepwidth.solve.ordering.dp import solve_dp
from sweepwidth.verify.ordering import ordering_width

from strategies import plane_graphs


def _labels(P: OrderingProblem, order):
    return [P.labels[v] for v in order]


def _recheck(G, P, width, order, first=None, last=None):
    assert sorted(order) == list(range(P.n))
    assert ordering_width(G, _labels(P, order), first=first, last=last) == pytest.approx(width)


@settings(max_examples=40, deadline=None)
@given(plane_graphs(3, 11, weighted=True), st.integers(0, 2**16), st.integers(2, 12), st.booleans())
def test_windows_never_worsen_and_never_beat_the_dp(P0, seed, window, pin):
    G = P0.to_simple_graph()
    first = next(iter(G.nodes())) if pin else None
    P = OrderingProblem.from_graph(G, first=first)
    rng = np.random.default_rng(seed)
    start = rng.permutation(P.n).tolist()
    reports = []
    w, order = improve_windows(P, start, time.monotonic() + 5, window=window, seed=seed,
                               on_improve=lambda a, o: reports.append((a, o)))
    from sweepwidth.solve.ordering.windows import pinned_order

    assert w <= P.width(pinned_order(P, start)) + 1e-9
    _recheck(G, P, w, order, first=first)
    assert P.respects_pins(order)
    # each report is an ordering of the reported width, and the reports strictly decrease
    for a, o in reports:
        _recheck(G, P, a, o, first=first)
    assert all(x[0] > y[0] for x, y in zip(reports, reports[1:]))
    # subset DP (exact, Bodlaender et al. 2012 recurrence) is a floor for any ordering
    opt = solve_dp(P.contract_pins().problem)[0]
    assert w >= opt - 1e-9


def test_one_window_over_everything_is_the_dp():
    # a window covering all free positions re-optimises the whole ordering: the result
    # is the exact pinned cutwidth (checked against the subset DP)
    G = generators.weighted_delaunay_disk(9, seed=3).dual().to_simple_graph()
    P = OrderingProblem.from_graph(G, first=0)
    opt = solve_dp(P)[0]
    w, order = improve_windows(P, list(range(P.n))[::-1], window=P.n - 1)
    assert w == opt
    _recheck(G, P, w, order, first=0)


def test_pins_on_both_ends_stay():
    G = nx.grid_2d_graph(4, 6)
    a, b = (0, 0), (3, 5)
    P = OrderingProblem.from_graph(G, first=[a, (0, 1)], last=b)
    order = np.random.default_rng(1).permutation(P.n).tolist()
    w, out = improve_windows(P, order, time.monotonic() + 5, window=10, seed=2)
    assert P.respects_pins(out)
    _recheck(G, P, w, out, first=[a, (0, 1)], last=b)


def test_bad_input():
    P = OrderingProblem.from_graph(nx.path_graph(5))
    with pytest.raises(SweepwidthError, match="window"):
        improve_windows(P, list(range(5)), window=1)
    with pytest.raises(SweepwidthError, match="window"):
        improve_windows(P, list(range(5)), window=40)
    with pytest.raises(SweepwidthError, match="once"):
        improve_windows(P, [0, 1, 1, 2, 3])


def test_search_reaches_the_grid_value_and_reports():
    # grid P_m x P_n, 3 <= m <= n: cutwidth m + 1 (Rolim, Sykora, Vrto, WG 1995; from memory)
    G = nx.grid_2d_graph(6, 6)
    P = OrderingProblem.from_graph(G)
    seen = []
    w, order, stats = search_orderings(P, time.monotonic() + 5, seed=0, target=7,
                                       on_improve=lambda a, o: seen.append((a, list(o))))
    assert w == 7
    _recheck(G, P, w, order)
    assert seen and seen[-1][0] == w
    for a, o in seen:
        _recheck(G, P, a, o)


def test_search_keeps_the_deadline_and_pins():
    P0 = generators.weighted_delaunay_disk(60, seed=2)
    G = P0.dual().to_simple_graph()
    P = OrderingProblem.from_graph(G, first=P0.outer_face)
    t0 = time.monotonic()
    w, order, _ = search_orderings(P, t0 + 2.0, seed=1)
    assert time.monotonic() - t0 < 3.0
    assert P.respects_pins(order)
    _recheck(G, P, w, order, first=P0.outer_face)
    # never worse than the best start it was given
    starts = start_orderings(P, seed=1)
    w2, o2, _ = search_orderings(P, time.monotonic() + 1.0, start_orders=starts, seed=3)
    assert w2 <= min(P.width(o) for o in starts)
    _recheck(G, P, w2, o2, first=P0.outer_face)
