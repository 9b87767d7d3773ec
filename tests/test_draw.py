"""Pictures of embeddings: files, sizes, pixels where edges are, layouts that keep the rotation."""

from __future__ import annotations

import logging
import math
import sys
import xml.etree.ElementTree as ET

import networkx as nx
import numpy as np
import pytest
from hypothesis import HealthCheck, example, given, settings
from hypothesis import strategies as st
from PIL import Image

from sweepwidth import generators
from sweepwidth.draw import Geometry, draw, layout_positions
from sweepwidth.draw._layout import _point_in_polygon, _simple_rotation
from sweepwidth.draw._style import LINES, PALETTE, SERIES, lightness, require_matplotlib
from sweepwidth.errors import SweepwidthError
from sweepwidth.plane import PlaneGraph

from strategies import plane_graphs


# ------------------------------------------------------------------ helpers
def _angular_ccw(pos, v, nbrs):
    """Neighbours of v sorted counterclockwise by angle (plain trigonometry, for comparison)."""
    x0, y0 = pos[v]
    return sorted(nbrs, key=lambda w: math.atan2(pos[w][1] - y0, pos[w][0] - x0))


def _cyclic_equal(a, b):
    if len(a) != len(b):
        return False
    if not a:
        return True
    k = b.index(a[0]) if a[0] in b else -1
    return k >= 0 and b[k:] + b[:k] == a


def _assert_realises_rotation(P: PlaneGraph, pos) -> None:
    """The straight-line drawing ``pos`` of P's simple graph is plane and has P's rotation.

    Planarity is checked by PlaneGraph.from_positions (the plane module's own
    crossing test, not the drawing code); the rotation by sorting angles here.
    """
    rot = _simple_rotation(P)
    G = nx.Graph()
    G.add_nodes_from(P.vertices)
    G.add_edges_from((u, w) for u in rot for w in rot[u])
    PlaneGraph.from_positions(G, pos)  # raises CrossingEdgesError on any crossing
    for v in P.vertices:
        assert _cyclic_equal(rot[v], _angular_ccw(pos, v, rot[v])), v


def _pixel(fig, ax, xy):
    """RGB at data point ``xy`` in the figure as saved to PNG."""
    fig.canvas.draw()
    x, y = ax.transData.transform(xy)
    buf = np.asarray(fig.canvas.buffer_rgba())
    h = buf.shape[0]
    return tuple(int(c) for c in buf[int(round(h - y)), int(round(x)), :3])


def _hex(c):
    c = c.lstrip("#")
    return tuple(int(c[i : i + 2], 16) for i in (0, 2, 4))


# ------------------------------------------------------------------ files
def test_png_size_is_dpi_times_figsize(tmp_path):
    P = generators.grid(3, 4)
    ax = draw(P, figsize=(4.0, 3.0), dpi=50)
    out = tmp_path / "g.png"
    ax.figure.savefig(out, dpi=ax.figure.dpi)
    assert out.stat().st_size > 0
    with Image.open(out) as im:
        assert im.size == (200, 150)  # 4 in x 50 dpi, 3 in x 50 dpi


def test_svg_parses_as_xml(tmp_path):
    P = generators.wheel(5)
    ax = draw(P, dual=True, labels=True)
    out = tmp_path / "w.svg"
    ax.figure.savefig(out)
    root = ET.parse(out).getroot()
    assert root.tag.endswith("svg")
    assert len(list(root.iter())) > 20


def test_edges_leave_ink_where_they_are_and_faces_are_filled():
    # a unit square with one diagonal: edge midpoints must be dark ink, the middle
    # of a triangle white (inner face), a point far outside the outer-face tint
    G = nx.Graph([(0, 1), (1, 2), (2, 3), (3, 0), (0, 2)])
    pos = {0: (0.0, 0.0), 1: (1.0, 0.0), 2: (1.0, 1.0), 3: (0.0, 1.0)}
    P = PlaneGraph.from_positions(G, pos)
    ax = draw(P, figsize=(4, 4), dpi=100)
    fig = ax.figure
    ink = _hex(PALETTE["ink"])
    for a, b in [(0, 1), (1, 2), (0, 2)]:
        mid = ((pos[a][0] + pos[b][0]) / 2, (pos[a][1] + pos[b][1]) / 2)
        px = _pixel(fig, ax, mid)
        assert sum(px) < sum(ink) + 3 * 60, (a, b, px)
    assert _pixel(fig, ax, (0.75, 0.25)) == (255, 255, 255)  # inside triangle 0-1-2
    lo = ax.get_xlim()[0], ax.get_ylim()[0]
    corner = (lo[0] + 0.01, lo[1] + 0.01)
    assert _pixel(fig, ax, corner) == _hex(PALETTE["outer"])


def test_highlighted_edge_is_drawn_in_the_curve_colour():
    P = generators.grid(2, 2)
    e = 0
    ax = draw(P, highlight=[e], figsize=(3, 3), dpi=100)
    g = Geometry(P)
    px = _pixel(ax.figure, ax, tuple(g.midpoint(e)))
    assert px == _hex(PALETTE["curve"])


def test_weights_are_written_on_edges():
    G = nx.Graph()
    G.add_edge("a", "b", weight=7)
    G.add_edge("b", "c", weight=2)
    G.add_edge("c", "a", weight=5)
    P = PlaneGraph.from_positions(G, {"a": (0, 0), "b": (1, 0), "c": (0, 1)})
    ax = draw(P)
    texts = sorted(t.get_text() for t in ax.texts)
    assert {"7", "2", "5"} <= set(texts)
    ax = draw(PlaneGraph.from_positions(nx.cycle_graph(3), {0: (0, 0), 1: (1, 0), 2: (0, 1)}))
    assert not any(t.get_text().isdigit() for t in ax.texts)  # unit weights: no labels


def test_draw_into_a_given_axes_and_returns_it():
    from sweepwidth.draw._style import new_figure

    fig = new_figure((3, 3))
    ax = fig.add_subplot(1, 1, 1)
    assert draw(generators.fan(4), ax=ax) is ax


def test_sw_draw_is_callable_even_after_importing_the_package():
    # regression: ``import sweepwidth.draw`` rebinds ``sw.draw`` to the package
    import sweepwidth as sw
    import sweepwidth.draw  # noqa: F401

    ax = sw.draw(generators.grid(2, 2))
    assert ax.collections


def test_drawing_does_not_log_warnings(caplog):
    # regression: a fixed-limits/aspect clash made matplotlib log "Ignoring fixed x limits"
    with caplog.at_level(logging.WARNING):
        ax = draw(generators.delaunay(12, seed=2), dual=True)
        ax.figure.canvas.draw()
    assert not [r for r in caplog.records if r.levelno >= logging.WARNING]


# ------------------------------------------------------------------ layouts
def test_graph_without_positions_still_draws_with_its_rotation():
    P = PlaneGraph.from_graph(nx.icosahedral_graph())
    assert P.pos is None
    pos = layout_positions(P)
    _assert_realises_rotation(P, pos)
    ax = draw(P)
    assert ax.collections


def test_layout_keeps_the_outer_face_outside():
    # the octahedron's outer face is a triangle: its three vertices must be the convex hull
    P = PlaneGraph.from_graph(nx.octahedral_graph())
    pos = layout_positions(P)
    from scipy.spatial import ConvexHull

    pts = np.array([pos[v] for v in P.vertices])
    hull = {P.vertices[i] for i in ConvexHull(pts).vertices}
    assert hull == set(P.boundary_walk(P.outer_face))


def test_given_positions_are_used_as_they_are():
    P = generators.grid(3, 3)
    pos = layout_positions(P)
    assert all(np.allclose(pos[v], P.pos[v]) for v in P.vertices)


def test_positions_that_put_another_face_outside_are_replaced():
    # the same grid drawing, but with an inner square declared the outer face:
    # the picture must show that square as the unbounded face, so a layout is computed
    P = generators.grid(3, 3)
    inner = [f for f in P.faces if f != P.outer_face][0]
    rot = {v: [P.head(d) for d in P.darts_at(v)] for v in P.vertices}
    Q = PlaneGraph.from_rotation(rot, pos=P.pos, outer=P.boundary_walk(inner))
    pos = layout_positions(Q)
    assert any(not np.allclose(pos[v], P.pos[v]) for v in Q.vertices)
    _assert_realises_rotation(Q, pos)
    from scipy.spatial import ConvexHull

    pts = np.array([pos[v] for v in Q.vertices])
    hull = {Q.vertices[i] for i in ConvexHull(pts).vertices}
    assert hull <= set(Q.boundary_walk(Q.outer_face))


def test_dual_carries_face_points_but_gets_a_real_layout():
    # the dual's stored positions are face centroids, whose straight segments cross;
    # the layout must replace them with a drawing of the dual's rotation
    P = generators.delaunay(15, seed=4)
    D = P.dual()
    pos = layout_positions(D)
    _assert_realises_rotation(D, pos)


@pytest.mark.parametrize(
    "make",
    [
        lambda: generators.random_tree(8, seed=1).dual(),  # one vertex, nested loops
        lambda: PlaneGraph.from_graph(nx.cycle_graph(5)).dual(),  # two vertices, 5 parallel edges
        lambda: generators.cycle_with_chords(8, 3, seed=1).dual(),
        lambda: PlaneGraph.from_graph(nx.path_graph(2)),
        lambda: PlaneGraph.from_graph(nx.empty_graph(1)),
    ],
    ids=["tree-dual", "cycle-dual", "chords-dual", "edge", "point"],
)
def test_multigraphs_draw(make, tmp_path):
    P = make()
    ax = draw(P, labels=True, dual=P.number_of_edges() > 0)
    out = tmp_path / "m.png"
    ax.figure.savefig(out)
    assert out.stat().st_size > 0
    _assert_realises_rotation(P, layout_positions(P))


def test_nested_loops_are_drawn_nested():
    # regression: loops whose darts sat at opposite angles collapsed into a line and
    # nested loops crossed; now an inner loop lies inside the loop that encloses it
    T = generators.random_tree(8, seed=1)
    D = T.dual()
    g = Geometry(D)
    (u,) = D.vertices
    ring = D.darts_at(u)
    where = {d: i for i, d in enumerate(ring)}
    span = {e: sorted((where[2 * e], where[2 * e + 1])) for e in range(D.number_of_edges())}
    checked = 0
    for e, (a, b) in span.items():
        for f, (c, d) in span.items():
            if f != e and a < c and d < b:  # f nested in e in the rotation
                outer = g.edge_points(e)
                inner = g.edge_points(f)[3:-3]  # away from the shared vertex
                assert all(_point_in_polygon(p, outer) for p in inner), (e, f)
                checked += 1
    assert checked > 0


def test_parallel_edges_are_drawn_apart():
    D = PlaneGraph.from_graph(nx.cycle_graph(4)).dual()
    g = Geometry(D)
    mids = [g.midpoint(e) for e in range(D.number_of_edges())]
    for i in range(len(mids)):
        for j in range(i + 1, len(mids)):
            assert np.hypot(*(mids[i] - mids[j])) > 0.05 * g.scale


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(plane_graphs(1, 9), st.booleans())
@example(generators.random_tree(8, seed=1).dual(), False)
@example(generators.cycle_with_chords(9, 4, seed=3), True)
@example(generators.cycle_with_chords(8, 4, seed=0).dual(), False)  # regression: a bend on a straight edge
def test_every_plane_graph_gets_a_layout_with_its_rotation(P, forget_positions):
    if forget_positions:
        P.pos = None
    pos = layout_positions(P)
    assert set(pos) == set(P.vertices)
    if P.number_of_vertices() >= 2:
        _assert_realises_rotation(P, pos)
    g = Geometry(P)
    for f in P.faces:
        assert np.all(np.isfinite(g.face_point(f)))


# ------------------------------------------------------------------ style and errors
def test_palette_roles_differ_in_lightness():
    # greyscale readability: ink, curve, last move and swept fill are separated by lightness
    roles = ["ink", "curve", "move", "swept"]
    Ls = sorted(lightness(PALETTE[r]) for r in roles)
    assert all(b - a >= 15 for a, b in zip(Ls, Ls[1:])), Ls
    assert lightness("#808080") == pytest.approx(53.6, abs=0.5)  # CIE L* of mid grey (common practice)
    # series also differ in marker and dash, not only in colour
    assert len({m for _, m, _ in SERIES}) == len(SERIES)
    assert LINES["lower"][0] != LINES["upper"][0]


def test_bad_highlight_and_shade_are_named():
    P = generators.grid(2, 2)
    with pytest.raises(SweepwidthError, match="not an edge id"):
        draw(P, highlight=[99])
    with pytest.raises(SweepwidthError, match="not a face id"):
        draw(P, shade=[42])
    with pytest.raises(SweepwidthError, match="PlaneGraph"):
        draw(nx.path_graph(3))


def test_missing_matplotlib_names_the_plot_extra(monkeypatch):
    monkeypatch.setitem(sys.modules, "matplotlib", None)
    with pytest.raises(SweepwidthError, match="plot"):
        require_matplotlib()
