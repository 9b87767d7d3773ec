"""The cutwidth dispatcher's automatic chain and the 'search' method.

Bounds are checked against the subset DP (:mod:`sweepwidth.solve.ordering.dp`,
an independent exact method) on small random plane graphs from
``tests/strategies.py``, with and without pinned ends and with integer, zero
and real weights; the witness orderings are replayed by the independent
checker of :mod:`sweepwidth.verify.ordering`.
"""

from __future__ import annotations

import time

import networkx as nx
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import sweepwidth as sw
from sweepwidth.verify.ordering import ordering_width

from strategies import plane_graphs

TOL = 1e-9


@st.composite
def pinned_graphs(draw, max_vertices: int = 11):
    """A small plane graph as a networkx multigraph, a weight scale and optional pins."""
    P = draw(plane_graphs(3, max_vertices, weighted=draw(st.booleans())))
    G = P.to_networkx()
    scale = draw(st.sampled_from([1.0, 0.37, 2.5]))  # 0.37: real weights, not binary fractions
    for _, _, d in G.edges(data=True):
        d["weight"] = d.get("weight", 1) * scale
    nodes = sorted(G.nodes)
    pin = draw(st.sampled_from(["none", "first", "last", "both"]))
    first = nodes[0] if pin in ("first", "both") else None
    last = nodes[-1] if pin in ("last", "both") and len(nodes) > 1 else None
    return G, first, last


def _optimum(G, first, last) -> float:
    return sw.cutwidth(G, method="dp", first=first, last=last).value


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(pinned_graphs())
def test_search_method_bounds_hold(case):
    G, first, last = case
    opt = _optimum(G, first, last)
    r = sw.cutwidth(G, method="search", first=first, last=last, time_limit=0.4, seed=0)
    assert r.lower <= opt + TOL * (1 + opt)
    assert r.upper >= opt - TOL * (1 + opt)
    # the witness replayed by the independent checker
    assert abs(ordering_width(G, r.witness, first=first, last=last) - r.upper) <= TOL * (1 + r.upper)
    for name, value in r.stats.get("lower_bounds", {}).items():
        assert value <= opt + TOL * (1 + opt), name


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(pinned_graphs())
def test_auto_without_dp_bounds_hold(case):
    # dp_limit=0 sends even tiny graphs through the general chain (bounds, search, bnb, SAT)
    G, first, last = case
    opt = _optimum(G, first, last)
    r = sw.cutwidth(G, first=first, last=last, time_limit=2.0, dp_limit=0, seed=0)
    assert r.lower <= opt + TOL * (1 + opt)
    assert r.upper >= opt - TOL * (1 + opt)
    if r.status == "optimal":
        assert abs(r.value - opt) <= TOL * (1 + opt)


def test_flow_stage_runs_and_is_reported():
    # a k x k grid has cutwidth k + 1 for k >= 3 (Rolim, Sykora and Vrto, WG 1995; from memory):
    # on the 16 x 16 grid the lifted-graph bound and the prefix-set slice stop short of 17, so the
    # face-walk bound runs (and the flow bound after it unless the walk bound already meets the
    # upper bound)
    G = nx.grid_2d_graph(16, 16)
    t0 = time.monotonic()
    r = sw.cutwidth(G, time_limit=4.0, seed=0)
    assert time.monotonic() - t0 < 4.0 + 1.5
    lbs = r.stats["lower_bounds"]
    assert "walk" in lbs and "degree" in lbs
    assert "flow" in lbs or lbs["walk"] >= r.upper
    assert r.lower == pytest.approx(max(lbs.values())) or r.status == "optimal"
    assert max(lbs.values()) <= 17
    assert r.upper >= 17
    assert "flow" in r.stats["auto"]["chain"]
    assert r.check(G) == r.upper


def test_lifted_stage_proves_the_12_grid():
    # same source: cutwidth 13; the search on the lifted graph (degree-3 border vertices split off)
    # reaches 13 before the flow stage is needed
    G = nx.grid_2d_graph(12, 12)
    r = sw.cutwidth(G, time_limit=4.0, seed=0)
    assert r.status == "optimal" and r.value == 13
    assert r.stats["lower_bounds"]["lifted"] <= 13
    assert r.check(G) == 13


def test_search_method_time_limit_and_witness():
    G = nx.convert_node_labels_to_integers(nx.grid_2d_graph(15, 15))
    t0 = time.monotonic()
    r = sw.cutwidth(G, method="search", time_limit=2.0, seed=1)
    assert time.monotonic() - t0 < 2.0 + 1.5
    assert r.method == "search"
    assert r.check(G) == r.upper
    assert 16 <= r.upper  # cutwidth of the 15 x 15 grid is 16 (same source as above)
    assert r.lower <= 16


@pytest.mark.parametrize(
    "G, known",
    [
        # complete binary trees of height h >= 2: ceil(h/2) + 1 (Lengauer 1982; from memory)
        (nx.balanced_tree(2, 6), 4),
        (nx.balanced_tree(2, 7), 5),
        # paths have cutwidth 1, stars K_{1,d} have ceil(d/2) (common practice)
        (nx.path_graph(40), 1),
        (nx.star_graph(9), 5),
    ],
)
def test_auto_sends_unit_forests_to_the_tree_bounds(G, known):
    r = sw.cutwidth(G, time_limit=10.0, seed=0)
    assert r.status == "optimal" and r.value == known
    assert r.method == "auto:tree"
    assert r.stats["auto"]["choice"] == "tree"
    assert r.check(G) == known


def test_weighted_forest_uses_the_general_chain():
    G = nx.balanced_tree(2, 4)
    for i, (u, v) in enumerate(sorted(G.edges)):
        G[u][v]["weight"] = 1 + i % 3
    r = sw.cutwidth(G, time_limit=10.0, seed=0, dp_limit=0)
    assert r.method != "auto:tree"
    assert r.value == sw.cutwidth(G, method="bnb").value  # the prefix-set search is exact on weights


@pytest.mark.parametrize(
    "G",
    [
        nx.les_miserables_graph(),
        nx.convert_node_labels_to_integers(nx.grid_2d_graph(9, 9)),
        nx.hypercube_graph(5),
    ],
)
def test_auto_upper_never_worse_than_its_first_heuristic(G):
    # the chain starts with the same heuristic stage: the later stages only improve it
    h = sw.cutwidth(G, method="heuristic", time_limit=3.0, seed=0)
    r = sw.cutwidth(G, time_limit=3.0, seed=0)
    assert r.upper <= h.upper + TOL
    assert r.lower >= h.lower - TOL
    assert r.check(G) == r.upper


def test_search_is_registered():
    from sweepwidth.registry import get_method

    m = get_method("cutwidth", "search")
    assert m.guarantee == "bounds"


class _FirstSlice(Exception):
    pass


@pytest.mark.parametrize("n,long_slice", [(80, False), (120, True), (190, True)])
def test_regression_first_prefix_set_slice_from_100_to_200_vertices(monkeypatch, n, long_slice):
    # regression: from 100 to 200 vertices the first prefix-set slice had shrunk to 15 % of the time left
    # (the SAT stage after it only builds its encoding there), losing a lower-bound level on the homology
    # reduction of the 100-point disk; it is 40 % again there, and stays short between 64 and 100 vertices
    import sweepwidth.solve.ordering as so

    seen: list[float] = []
    limit = 30.0
    end = time.monotonic() + limit

    def first_slice(P, *, deadline, **kw):
        now = time.monotonic()
        seen.append((deadline - now) / (end - now))
        raise _FirstSlice

    monkeypatch.setattr(so, "solve_bnb", first_slice)
    G = nx.random_regular_graph(3, n, seed=1)  # large width, weak lower bounds: the heuristics cannot close it
    with pytest.raises(_FirstSlice):
        sw.cutwidth(G, time_limit=limit, improve=False)
    assert seen
    if long_slice:
        assert seen[0] > 0.35
    else:
        assert seen[0] < 0.25
