"""Beam search over prefix sets (sweepwidth.solve.ordering.beam).

Every width is recomputed by the independent checker ``sweepwidth.verify.ordering_width``
on the networkx graph; the floor is the subset DP (the Bodlaender-Fomin-Koster-Kratsch-
Thilikos recurrence, an independent exact method) and published values named beside each check.
"""

from __future__ import annotations

import time

import networkx as nx
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from sweepwidth import generators
from sweepwidth.problems.cycles import FaceSweep
from sweepwidth.problems.ordering import OrderingProblem
from sweepwidth.solve.ordering import kernels
from sweepwidth.solve.ordering.beam import beam_ordering
from sweepwidth.solve.ordering.dp import solve_dp
from sweepwidth.verify.ordering import ordering_width

from strategies import weighted_graphs

needs_numba = pytest.mark.skipif(not kernels.HAVE_NUMBA, reason="the beam search is compiled (numba)")


def _check(G, P, width, order, first=None, last=None):
    assert sorted(order) == list(range(P.n))
    assert P.respects_pins(order)
    labels = [P.labels[v] for v in order]
    assert ordering_width(G, labels, first=first, last=last) == pytest.approx(width)


@needs_numba
@settings(max_examples=60, deadline=None)
@given(weighted_graphs(3, 10, min_weight=0, max_weight=6, connected=False), st.integers(0, 3), st.integers(0, 2**16))
def test_beam_is_an_ordering_of_its_width_and_never_beats_the_dp(G, pins, seed):
    nodes = sorted(G.nodes())
    first = nodes[0] if pins & 1 else None
    last = nodes[-1] if pins & 2 else None
    P = OrderingProblem.from_graph(G, first=first, last=last)
    out = beam_ordering(P, seed=seed, max_width=64)
    if P.m == 0:
        assert out is None
        return
    assert out is not None
    width, order, stats = out
    _check(G, P, width, order, first=first, last=last)
    # every run is recorded with the kernel's own width; none is below the returned one
    assert stats["runs"] and min(r[3] for r in stats["runs"]) == pytest.approx(width)
    opt = solve_dp(P)[0]
    assert width >= opt - 1e-9


@needs_numba
def test_beam_finds_published_values():
    # cutwidth of the m x n grid, m <= n, is m + 1 for m >= 3 (Rolim, Sykora and Vrto,
    # WG 1995; from memory); of the path 1, of the cycle 2 (common practice)
    for G, want in ((nx.grid_2d_graph(4, 6), 5.0), (nx.path_graph(30), 1.0), (nx.cycle_graph(25), 2.0)):
        P = OrderingProblem.from_graph(G)
        width, order, _ = beam_ordering(P, seed=1, max_width=256)
        _check(G, P, width, order)
        assert width == want


@needs_numba
def test_beam_on_a_weighted_disk_dual_meets_the_exact_value():
    # a small weighted disk: the pinned dual is small enough for the subset DP
    P0 = generators.weighted_delaunay_disk(11, seed=3)
    inner = [f for f in range(P0.number_of_faces()) if f != P0.outer_face]
    fs = FaceSweep.build(P0, P0.face_boundary_cycle(P0.outer_face), inner)
    G, first, last = fs.ordering_graph()
    G.remove_nodes_from([v for v in (last,) if G.degree(v) == 0])
    P = OrderingProblem.from_graph(G, weight="weight", first=first, last=last if last in G else None)
    if P.n - 2 > 22:
        pytest.skip("too many faces for the subset DP here")
    width, order, _ = beam_ordering(P, seed=0, max_width=1024)
    opt = solve_dp(P)[0]
    assert opt <= width <= opt * 1.15  # the beam is a heuristic: near, never below


@needs_numba
def test_beam_keeps_its_deadline_and_is_reproducible():
    P = OrderingProblem.from_graph(nx.grid_2d_graph(30, 30))
    t = time.monotonic()
    out = beam_ordering(P, deadline=t + 0.5, seed=5)
    assert time.monotonic() - t < 2.0
    assert out is None or out[0] >= 31.0  # grid value m + 1 (Rolim, Sykora and Vrto; from memory)
    a = beam_ordering(P, seed=5, max_width=64)
    b = beam_ordering(P, seed=5, max_width=64)
    assert a is not None and b is not None and a[0] == b[0] and a[1] == b[1]


def test_beam_without_numba_gives_none(monkeypatch):
    monkeypatch.setattr(kernels, "HAVE_NUMBA", False)
    P = OrderingProblem.from_graph(nx.cycle_graph(6))
    assert beam_ordering(P, seed=0) is None


def test_beam_rejects_wide_pins():
    P = OrderingProblem.from_graph(nx.path_graph(5), first=[0, 1])
    with pytest.raises(ValueError, match="contract_pins"):
        beam_ordering(P)
