"""The supported range of weights: checked once, at construction (issue 10, items 2 and 3).

A weight is a real number (not bool), finite, not NaN, ``>= 0``, and the
weights of a graph add up to at most ``MAX_TOTAL_WEIGHT`` so that no sum a
solver forms can overflow to inf or NaN.
"""

from __future__ import annotations

import math
import subprocess
import sys
import time
from pathlib import Path

import networkx as nx
import numpy as np
import pytest

import sweepwidth as sw
from sweepwidth._weights import MAX_TOTAL_WEIGHT
from sweepwidth.errors import WeightError
from sweepwidth.plane import PlaneGraph
from sweepwidth.problems.ordering import OrderingProblem

import _limited_helpers as H

ROOT = Path(__file__).resolve().parents[1]

BAD = [
    pytest.param(-1, "negative", id="negative"),
    pytest.param(math.nan, "NaN", id="nan"),
    pytest.param(math.inf, "infinite", id="inf"),
    pytest.param(True, "bool", id="bool"),
    pytest.param(10**400, "too large", id="int-beyond-float"),
    pytest.param(1e308, "at most", id="one-huge"),
]


def _tetra() -> PlaneGraph:
    return PlaneGraph.from_graph(nx.complete_graph(4))


@pytest.mark.parametrize("bad, words", BAD)
def test_with_weights_refuses(bad, words):
    T = _tetra()
    with pytest.raises(WeightError, match=words) as info:
        T.with_weights([1, 1, bad, 1, 1, 1])
    assert "edge 2" in str(info.value)
    with pytest.raises(WeightError, match=words):
        T.with_weights({2: bad})


@pytest.mark.parametrize("bad, words", BAD)
def test_plane_graph_init_refuses(bad, words):
    T = _tetra()
    ends = list(zip(T._eu, T._ev))
    with pytest.raises(WeightError, match=words) as info:
        PlaneGraph(T._labels, ends, [1, 1, 1, bad, 1, 1], T._next)
    assert "edge 3" in str(info.value)
    if not isinstance(bad, bool) and bad != 10**400:
        with pytest.raises(WeightError, match=words):
            PlaneGraph(T._labels, np.array(ends), np.array([1, 1, 1, bad, 1, 1], dtype=float), np.array(T._next))


@pytest.mark.parametrize("bad, words", BAD)
def test_networkx_constructors_refuse(bad, words):
    G = nx.complete_graph(4)
    nx.set_edge_attributes(G, 1, "weight")
    G[1][2]["weight"] = bad
    with pytest.raises(WeightError, match=words) as info:
        PlaneGraph.from_graph(G)
    assert "(1, 2)" in str(info.value)
    # networkx graphs given to cutwidth go through OrderingProblem.from_graph
    with pytest.raises(WeightError, match=words):
        OrderingProblem.from_graph(G)
    with pytest.raises(WeightError, match=words):
        sw.cutwidth(G, time_limit=5)


def test_sums_that_would_overflow_are_refused():
    # each weight is within range, but together they exceed the supported total (1e300)
    T = _tetra()
    for build in (lambda w: T.with_weights(w), lambda w: PlaneGraph(T._labels, list(zip(T._eu, T._ev)), w, T._next)):
        with pytest.raises(WeightError, match="add up") as info:
            build([5e299, 5e299, 5e299, 5e299, 1e300, 5e299])
        assert "edge 4" in str(info.value)  # the heaviest edge is named
    G = nx.complete_graph(4)
    nx.set_edge_attributes(G, 1e300, "weight")
    with pytest.raises(WeightError, match="add up"):
        sw.cutwidth(G)
    with pytest.raises(WeightError, match="add up"):
        PlaneGraph.from_graph(G)


def test_top_of_the_range_gives_scaled_answers():
    # weights up to the supported total: every parameter is the unit-weight answer times the
    # scale (each width is homogeneous of degree 1 in the weights: the definitions)
    T = _tetra()
    base = [1, 2, 3, 4, 5, 6]
    scale = MAX_TOTAL_WEIGHT / sum(base) * 0.999
    big = T.with_weights([scale * b for b in base])
    small = T.with_weights(base)
    for fn in (sw.cutwidth, sw.homology_width, sw.homotopy_height):
        t0 = time.monotonic()
        r = fn(big, time_limit=10)
        assert time.monotonic() - t0 < 12
        r0 = fn(small, time_limit=10)
        assert r.status == r0.status == "optimal"
        assert math.isfinite(r.lower) and math.isfinite(r.upper)
        assert r.upper / scale == pytest.approx(r0.upper, rel=1e-9)


def test_monotone_path_ends_on_a_table_of_nan():
    # the compiled path recovery looped forever when no table entry compared below inf
    from sweepwidth.solve._deadline import run_limited

    finished, value, _ = run_limited(H.monotone_path_all_nan, (5,), deadline=time.monotonic() + 60)
    assert finished
    assert sorted(value) == list(range(5))  # still a permutation of the faces


def test_cli_reports_overflowing_weights(tmp_path):
    # issue 10: a tetrahedron with every weight 1e308 never returned (homology) or said
    # "internal error OverflowError" (a weight of 10**400)
    for w in ("1e308", "1" + "0" * 400):
        G = nx.complete_graph(4)
        nx.set_edge_attributes(G, 12345.5, "weight")
        sw.io.write(PlaneGraph.from_graph(G), tmp_path / "unit.json")
        text = (tmp_path / "unit.json").read_text().replace("12345.5", w)
        path = tmp_path / "w.json"
        path.write_text(text)
        t0 = time.monotonic()
        out = subprocess.run(
            [sys.executable, "-m", "sweepwidth", "solve", str(path), "--param", "homology", "--time-limit", "10"],
            capture_output=True, text=True, cwd=ROOT, timeout=120,
        )
        assert time.monotonic() - t0 < 60
        assert out.returncode != 0
        assert "internal error" not in out.stderr
        assert "weight" in out.stderr, out.stderr


@pytest.mark.parametrize("bad, words", BAD)
def test_every_constructor_refuses(bad, words):
    # each public constructor ends in PlaneGraph.__init__, which checks the whole range once
    G = nx.complete_graph(4)
    nx.set_edge_attributes(G, 1, "weight")
    G[0][1]["weight"] = bad
    emb = nx.check_planarity(nx.complete_graph(4))[1]
    rotation = {v: list(emb.neighbors_cw_order(v))[::-1] for v in emb}
    pos = {0: (0.0, 0.0), 1: (4.0, 0.0), 2: (2.0, 3.0), 3: (2.0, 1.0)}  # a straight-line drawing of K4
    builds = {
        "from_embedding": lambda: PlaneGraph.from_embedding(emb, weights=G),
        "from_rotation": lambda: PlaneGraph.from_rotation(rotation, weights={(0, 1): bad}),
        "from_faces": lambda: PlaneGraph.from_faces([[0, 1, 2], [0, 2, 3], [0, 3, 1], [1, 3, 2]], weights={(0, 1): bad}),
        "from_positions": lambda: PlaneGraph.from_positions(G, pos),
    }
    for name, build in builds.items():
        with pytest.raises(WeightError, match=words):
            build()


@pytest.mark.parametrize("bad", [math.nan, math.inf, -1.0])
def test_ordering_problem_built_directly_refuses(bad):
    # the cutwidth kernels answered 'bounded' with NaN bounds on such a problem
    with pytest.raises(WeightError, match=r"edge \('a', 'b'\)"):
        OrderingProblem(("a", "b", "c"), np.array([[0, 1], [1, 2]]), np.array([bad, 1.0]), frozenset(), frozenset())
