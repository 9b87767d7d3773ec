"""The coning relation between homotopy width and homotopy height (sweepwidth.solve.width.coning).

Each solver checks the other: the exact width search (with and without
backward steps) against the exact height search of the coned instance.
The theorem (proved in the module docstring): ``height - 2M + e`` equals the
backward width when spikes are allowed or leashes simple, and is at most it
otherwise; the forward width is at least the backward width.
"""

from __future__ import annotations

import os
import sys

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import sweepwidth as sw
from sweepwidth import generators
from sweepwidth.errors import InvalidCurveError
from sweepwidth.problems.width import WidthProblem
from sweepwidth.solve.width.coning import cone_instance, coned_height

sys.path.insert(0, os.path.dirname(__file__))
from test_width import boundary_instances  # noqa: E402


@settings(max_examples=30, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(boundary_instances(max_faces=7), st.booleans(), st.sampled_from(["weight", "vertices"]))
def test_coned_height_gives_backward_width(inst, spikes, weight):
    P, a, b = inst
    fwd = sw.homotopy_width(P, a, b, method="search", spikes=spikes, weight=weight)
    bwd = sw.homotopy_width(P, a, b, method="search", spikes=spikes, weight=weight, backward=True)
    assert fwd.status == bwd.status == "optimal"
    assert bwd.value <= fwd.value
    W = WidthProblem.build(P, a, b, backward=True, spikes=spikes, weight=weight)
    h, C = coned_height(W, fwd.value + 1, method="search")
    assert h.status == "optimal"
    assert h.check(C["graph"]) == h.value  # the height checker replays the coned homotopy
    if spikes:
        assert h.value - C["offset"] == bwd.value
    else:
        assert h.value - C["offset"] <= bwd.value


@settings(max_examples=10, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(boundary_instances(max_faces=6, weighted=False))
def test_coned_height_simple(inst):
    P, a, b = inst
    bwd = sw.homotopy_width(P, a, b, method="search", simple=True, weight=None, backward=True)
    W = WidthProblem.build(P, a, b, backward=True, simple=True, weight=None)
    h, C = coned_height(W, bwd.value + 1, method="search")
    assert h.value - C["offset"] == bwd.value


def test_cone_faces():
    # Euler: p + q new triangles on top of the split outer face (the rest stays one hole)
    P = generators.grid(3, 4)
    W = WidthProblem.build(P, {"vertices": [(0, 0), (0, 1), (0, 2), (0, 3)]},
                           {"vertices": [(2, 0), (2, 1), (2, 2), (2, 3)]})
    C = cone_instance(W, 100)
    Q = C["graph"]
    assert Q.number_of_faces() == P.number_of_faces() + 3 + 3
    assert Q.number_of_vertices() == P.number_of_vertices() + 2
    assert Q.outer_face in C["holes"]


def test_cone_needs_boundary_walks():
    P = generators.grid(3, 3)
    W = WidthProblem.build(P, {"vertices": [(1, 1)]}, {"vertices": [(2, 2)]},
                           start={"vertices": [(1, 1), (1, 2), (2, 2)]}, end={"vertices": [(1, 1), (2, 1), (2, 2)]})
    with pytest.raises(InvalidCurveError):
        cone_instance(W, 10)


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(boundary_instances(max_faces=8), st.booleans())
def test_homology_lower_bound_is_sound(inst, backward):
    # the closed-cone homology bound never exceeds the exact width (checked against the reference
    # search in test_width.py); it needs the default leashes, which boundary_instances gives
    from sweepwidth.solve.width.coning import homology_lower

    P, a, b = inst
    r = sw.homotopy_width(P, a, b, method="search", backward=backward)
    W = WidthProblem.build(P, a, b, backward=backward)
    hl, note = homology_lower(W, r.value + 1)
    assert hl is not None, note
    assert hl <= r.value + 1e-9
