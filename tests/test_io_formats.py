"""Round trips through every file format, format detection, and tables of malformed files."""

from __future__ import annotations

import io
import itertools

import networkx as nx
import numpy as np
import pytest
from hypothesis import given, settings

import sweepwidth as sw
from sweepwidth import generators
from sweepwidth.errors import (
    CrossingEdgesError,
    FileFormatError,
    InvalidEmbeddingError,
    SweepwidthError,
    UnsupportedOptionError,
    WeightError,
)
from sweepwidth.io import FORMATS, detect_format, read, read_all, write
from sweepwidth.io._gr import read_gr, write_gr
from sweepwidth.io._graphml import read_graphml, write_graphml
from sweepwidth.io._mesh import read_mesh, write_mesh
from sweepwidth.io._planar_code import HEADER, read_planar_code, write_planar_code

from strategies import plane_graphs, triangulated_disks


# ------------------------------------------------------------ comparisons
def _cyc(seq):
    """Canonical form of a cyclic sequence (the least rotation)."""
    seq = list(seq)
    if not seq:
        return ()
    return min(tuple(seq[i:] + seq[:i]) for i in range(len(seq)))


def neighbour_rotation(P, vmap):
    """{mapped vertex: canonical cyclic tuple of mapped neighbours, counterclockwise}."""
    return {vmap[v]: _cyc(vmap[P.head(d)] for d in P.darts_at(v)) for v in P.vertices}


def face_cycles(P, vmap):
    return sorted(_cyc(vmap[x] for x in P.boundary_walk(f)) for f in P.faces)


def outer_cycle(P, vmap):
    return _cyc(vmap[x] for x in P.boundary_walk(P.outer_face))


def _simple(P):
    return all(e.u != e.v for e in P.edges) and len({frozenset((e.u, e.v)) for e in P.edges}) == P.number_of_edges()


# --------------------------------------------------------------- round trips
@settings(max_examples=25, deadline=None)
@given(plane_graphs(1, 9, weighted=True))
def test_graphml_round_trip_is_exact(P):
    Q = read_graphml(write_graphml(P))
    assert Q.vertices == P.vertices
    assert Q.same_embedding(P)
    assert Q.outer_face == P.outer_face
    assert [tuple(e) for e in Q.edges] == [tuple(e) for e in P.edges]


@settings(max_examples=25, deadline=None)
@given(plane_graphs(1, 9, weighted=True))
def test_gr_round_trip_keeps_graph_and_weights(P):
    Q = read_gr(write_gr(P))
    vmap = {v: i + 1 for i, v in enumerate(P.vertices)}
    assert Q.number_of_edges() == P.number_of_edges()
    # edges in id order with their weights (the file keeps no rotation)
    got = [(e.u, e.v, e.weight) for e in Q.edges]
    want = [(vmap[e.u], vmap[e.v], e.weight) for e in P.edges]
    assert got == want
    # Euler's formula for the embedding networkx chose
    assert Q.number_of_faces() == P.number_of_faces()


@settings(max_examples=25, deadline=None)
@given(plane_graphs(1, 9, kinds=("delaunay", "tree", "chords")))
def test_planar_code_round_trip_keeps_rotation(P):
    assume_simple = _simple(P)
    assert assume_simple  # these families are simple graphs
    vmap = {v: i + 1 for i, v in enumerate(P.vertices)}
    ident = {v: v for v in range(1, P.number_of_vertices() + 1)}
    for mirror in (False, True):
        (Q,) = read_planar_code(write_planar_code(P, mirror=mirror), mirror=mirror)
        assert neighbour_rotation(Q, ident) == neighbour_rotation(P, vmap)
        assert face_cycles(Q, ident) == face_cycles(P, vmap)


def test_planar_code_orientation_option_mirrors():
    P = sw.PlaneGraph.from_graph(nx.octahedral_graph())
    data = write_planar_code(P)
    (A,) = read_planar_code(data)
    (B,) = read_planar_code(data, mirror=True)
    ident = {v: v for v in A.vertices}
    ra, rb = neighbour_rotation(A, ident), neighbour_rotation(B, ident)
    # every rotation reversed: the mirror image
    assert all(rb[v] == _cyc(reversed(ra[v])) for v in ra)
    assert face_cycles(A, ident) != face_cycles(B, ident)
    assert sorted(map(sorted, face_cycles(A, ident))) == sorted(map(sorted, face_cycles(B, ident)))


@settings(max_examples=25, deadline=None)
@given(triangulated_disks(max_faces=14))
def test_mesh_round_trip_disks(P):
    vmap = {v: i for i, v in enumerate(P.vertices)}
    for fmt in ("off", "obj"):
        Q = read_mesh(write_mesh(P, fmt), fmt)
        m = vmap if fmt == "off" else {v: i + 1 for v, i in vmap.items()}
        ident = {v: v for v in Q.vertices}
        assert face_cycles(Q, ident) == face_cycles(P, m)
        assert outer_cycle(Q, ident) == outer_cycle(P, m)
        assert Q.pos == {m[v]: tuple(P.pos[v]) for v in P.vertices}


@settings(max_examples=25, deadline=None)
@given(plane_graphs(2, 9, kinds=("delaunay", "tree", "chords")))
def test_mesh_round_trip_general_plane_graphs(P):
    vmap = {v: i for i, v in enumerate(P.vertices)}
    Q = read_mesh(write_mesh(P, "off"), "off")
    ident = {v: v for v in Q.vertices}
    assert face_cycles(Q, ident) == face_cycles(P, vmap)
    assert outer_cycle(Q, ident) == outer_cycle(P, vmap)
    assert neighbour_rotation(Q, ident) == neighbour_rotation(P, vmap)


@pytest.mark.parametrize("ext", [x[0] for x in FORMATS.values()])
def test_read_write_every_extension(tmp_path, ext):
    P = generators.wheel(6)
    path = tmp_path / f"wheel{ext}"
    write(P, path)
    Q = read(path)
    assert isinstance(Q, sw.PlaneGraph)
    # Euler and the wheel's counts: V = 7, E = 12, F = 7 (common practice)
    assert (Q.number_of_vertices(), Q.number_of_edges(), Q.number_of_faces()) == (7, 12, 7)
    # content detection gives the same format when the extension says nothing
    plain = tmp_path / "wheel.data"
    plain.write_bytes(path.read_bytes())
    fmt = [k for k, v in FORMATS.items() if ext in v][0]
    assert detect_format(plain.read_bytes()) == fmt
    R = read(plain)
    assert R.number_of_faces() == 7


# ------------------------------------------------------------------- .gr
def test_gr_weighted_nonplanar_and_disconnected():
    text = b"c a weighted K3,3\nc @name k33\nc @weighted\np tw 6 9\n" + b"".join(
        f"{u} {v} {u + v}\n".encode() for u in (1, 2, 3) for v in (4, 5, 6)
    )
    G = read_gr(text)
    assert isinstance(G, nx.Graph) and not isinstance(G, sw.PlaneGraph)
    # networkx's own test agrees it is not planar (general-purpose reference)
    assert not nx.check_planarity(G)[0]
    assert G[1][4]["weight"] == 5.0 and G.graph["name"] == "k33"
    D = read_gr(b"p tw 4 2\n1 2\n3 4\n")
    assert isinstance(D, nx.Graph) and nx.number_connected_components(D) == 2
    M = read_gr(b"p tw 2 3\n1 2\n1 2\n2 2\n")  # parallel edges and a loop
    assert isinstance(M, sw.PlaneGraph) and M.number_of_faces() == 3


@pytest.mark.parametrize("weighted", [False, True])
def test_gr_bulk_parse_matches_networkx(tmp_path, weighted):
    # the bulk (numpy) parse against networkx's own edge-list reader on the same edges
    rng = np.random.default_rng(7)
    G0 = nx.gnm_random_graph(60, 150, seed=3)
    lines = ["c random graph", "c @weighted" if weighted else "c plain", f"p tw 60 {G0.number_of_edges()}"]
    ref = []
    for u, v in G0.edges():
        w = float(rng.integers(1, 9)) / 2
        lines.append(f"{u + 1} {v + 1} {w}" if weighted else f"{u + 1} {v + 1}")
        ref.append(f"{u + 1} {v + 1} {w}" if weighted else f"{u + 1} {v + 1}")
    path = tmp_path / "g.gr"
    path.write_text("\n".join(lines) + "\n")
    (tmp_path / "g.edges").write_text("\n".join(ref) + "\n")
    G = read(path, kind="graph")
    if weighted:
        N = nx.read_weighted_edgelist(tmp_path / "g.edges", nodetype=int)
    else:
        N = nx.read_edgelist(tmp_path / "g.edges", nodetype=int, data=False)
        nx.set_edge_attributes(N, 1.0, "weight")
    N.add_nodes_from(range(1, 61))
    assert nx.utils.graphs_equal(G, N)
    # the line-by-line path gives the same graph (a comment between edges forces it)
    lines.insert(4, "c between edges")
    path.write_text("\n".join(lines) + "\n")
    assert nx.utils.graphs_equal(read(path, kind="graph"), N)


def test_gr_kind_graph_runs_no_planarity_test(tmp_path, monkeypatch):
    # issue 10: kind='graph' ran the planarity test (most of the 83 s and 4.1 GB at 10^6 edges)
    import sweepwidth.io._json as js

    def refuse(*a, **k):
        raise AssertionError("planarity test run for kind='graph'")

    path = tmp_path / "grid.gr"
    path.write_bytes(write_gr(nx.grid_2d_graph(5, 5)))
    monkeypatch.setattr(js, "_from_planarity", refuse)
    G = read(path, kind="graph")
    assert isinstance(G, nx.Graph) and G.number_of_edges() == 40
    with pytest.raises(AssertionError, match="planarity"):
        read(path)  # auto still embeds


@pytest.mark.parametrize(
    "text, words",
    [
        (b"p tw 3 2\n1 2\n2 4\n", "outside 1..3"),
        (b"p tw 3 2\n1 2 3\n2 3\n", "fields"),
        (b"c @weighted\np tw 3 2\n1 2 1\n2 3 nan\n", "NaN"),
        (b"c @weighted\np tw 3 2\n1 2 1\n2 3 -2\n", "negative"),
        (b"p tw 3 3\n1 2\n2 3\n", "declares 3 edges"),
        (b"p tw 3 2\n1 2\n2 x\n", "integer"),
    ],
)
def test_gr_errors_still_name_the_line(text, words):
    with pytest.raises(FileFormatError if words not in ("NaN", "negative") else sw.WeightError, match=words):
        read_gr(text, embed=False)


def test_gr_writes_networkx_graphs_and_weights():
    G = nx.cycle_graph(4)
    G[0][1]["weight"] = 2.5
    text = write_gr(G).decode()
    assert "c @weighted" in text and "1 2 2.5" in text
    Q = read_gr(text.encode())
    assert Q.weights.tolist() == [2.5, 1, 1, 1] or sorted(Q.weights.tolist()) == [1, 1, 1, 2.5]


# ---------------------------------------------------------- planar_code
def test_planar_code_hand_made_bytes():
    # the tetrahedron written by hand: every vertex sees the other three
    body = bytes([4, 2, 3, 4, 0, 1, 4, 3, 0, 1, 2, 4, 0, 1, 3, 2, 0])
    (P,) = read_planar_code(HEADER + body)
    assert (P.number_of_vertices(), P.number_of_edges(), P.number_of_faces()) == (4, 6, 4)
    two = read_planar_code(HEADER + body + body)
    assert len(two) == 2


def test_planar_code_two_byte_entries_and_byte_orders(tmp_path):
    big = generators.delaunay(300, seed=4)  # >= 256 vertices: two-byte form
    small = sw.PlaneGraph.from_graph(nx.cycle_graph(5))
    for endian in ("little", "big"):
        data = write_planar_code([small, big], endian=endian)
        assert data.startswith(b">>planar_code le<<" if endian == "little" else b">>planar_code be<<")
        A, B = read_planar_code(data)
        assert B.number_of_vertices() == 300 and B.number_of_edges() == big.number_of_edges()
        assert A.number_of_vertices() == 5
    wide = write_planar_code(small, wide=True)
    assert wide[len(b">>planar_code le<<")] == 0
    assert read_planar_code(wide)[0].number_of_edges() == 5
    # no byte-order declaration: little-endian unless endian= says otherwise
    plain = HEADER + wide[len(b">>planar_code le<<") :]
    assert read_planar_code(plain)[0].number_of_edges() == 5
    swapped = write_planar_code(small, wide=True, endian="big")
    plain_be = HEADER + swapped[len(b">>planar_code be<<") :]
    assert read_planar_code(plain_be, endian="big")[0].number_of_edges() == 5
    # read_all and read(index=)
    path = tmp_path / "two.plc"
    write([small, big], path)
    assert [g.number_of_vertices() for g in read_all(path)] == [5, 300]
    assert read(path, index=1).number_of_vertices() == 300
    with pytest.raises(FileFormatError, match="holds 2 graphs"):
        read(path, index=5)


def test_planar_code_refuses_multigraphs_and_plain_graphs():
    D = sw.PlaneGraph.from_graph(nx.cycle_graph(3)).dual()
    with pytest.raises(SweepwidthError, match="parallel"):
        write_planar_code(D)
    with pytest.raises(SweepwidthError, match="from_graph"):
        write_planar_code(nx.cycle_graph(3))
    loops = sw.PlaneGraph.from_graph(nx.path_graph(3)).dual()
    with pytest.raises(SweepwidthError, match="loop"):
        write_planar_code(loops)
    with pytest.raises(SweepwidthError, match="loop"):
        write_mesh(loops, "off")


# ----------------------------------------------------------------- meshes
def _cube_off() -> bytes:
    pts = list(itertools.product((0, 1), repeat=3))
    idx = {p: i for i, p in enumerate(pts)}
    faces = []
    for axis in range(3):
        for side in (0, 1):
            quad = [p for p in pts if p[axis] == side]
            c = np.mean(quad, axis=0)
            normal = np.zeros(3)
            normal[axis] = 1 if side else -1
            # order the square counterclockwise seen from outside (normal towards the viewer)
            a = np.array(quad[0]) - c
            b = np.cross(normal, a)
            quad.sort(key=lambda p: np.arctan2(np.dot(np.array(p) - c, b), np.dot(np.array(p) - c, a)))
            faces.append([idx[p] for p in quad])
    lines = ["OFF", f"{len(pts)} {len(faces)} 12"] + [" ".join(map(str, p)) for p in pts]
    lines += ["4 " + " ".join(map(str, f)) for f in faces]
    return ("\n".join(lines) + "\n").encode()


def test_off_cube_sphere_with_stereographic_positions():
    P = read_mesh(_cube_off(), "off")
    # the cube: (V, E, F) = (8, 12, 6) (H. S. M. Coxeter, "Regular Polytopes", Dover 1973, Table I)
    assert (P.number_of_vertices(), P.number_of_edges(), P.number_of_faces()) == (8, 12, 6)
    # the projected positions are a planar straight-line drawing of the same graph
    G = P.to_simple_graph()
    Q = sw.PlaneGraph.from_positions(G, P.pos)
    assert Q.number_of_faces() == 6
    # and its unbounded face is the face we chose as outer (face 0 of the file)
    ident = {v: v for v in P.vertices}
    assert outer_cycle(Q, ident) == outer_cycle(P, ident)


def test_off_tilted_disk_is_projected_flat():
    k = 3
    T = generators.triangulated_grid(k)
    vmap = {v: i for i, v in enumerate(T.vertices)}
    rot = np.array([[1, 0, 0], [0, np.cos(0.7), -np.sin(0.7)], [0, np.sin(0.7), np.cos(0.7)]])
    xyz = np.array([[T.pos[v][0], T.pos[v][1], 0.0] for v in T.vertices]) @ rot.T
    lines = ["OFF", f"{len(xyz)} {T.number_of_faces() - 1} 0"] + [" ".join(map(repr, p)) for p in xyz.tolist()]
    lines += [
        "3 " + " ".join(str(vmap[x]) for x in T.boundary_walk(f)) for f in T.faces if f != T.outer_face
    ]
    P = read_mesh(("\n".join(lines) + "\n").encode(), "off")
    Q = sw.PlaneGraph.from_positions(P.to_simple_graph(), P.pos)  # no crossings after projection
    ident = {v: v for v in P.vertices}
    assert face_cycles(Q, ident) == face_cycles(P, ident)


def test_obj_with_slashes_negative_indices_and_2d_vertices():
    text = b"# square\no sq\nv 0 0\nv 1 0\nv 1 1\nv 0 1\nvt 0 0\nf 1/1 2/1 3/1\nf -4 -2 -1\n"
    P = read_mesh(text, "obj")
    assert P.number_of_faces() == 3 and P.pos[3] == (1.0, 1.0)
    assert sorted(P.vertices) == [1, 2, 3, 4]


def test_off_sphere_outer_option():
    P = read_mesh(_cube_off(), "off", outer=3)
    Q = read_mesh(_cube_off().replace(b"OFF\n", b"OFF\n# @outer 3\n"), "off")
    assert P.outer_face == Q.outer_face
    assert sorted(P.boundary_walk(P.outer_face)) == sorted(Q.boundary_walk(Q.outer_face))


# --------------------------------------------------------------- graphml
def test_graphml_from_other_writers(tmp_path):
    G = nx.grid_2d_graph(3, 3)
    H = nx.convert_node_labels_to_integers(G, label_attribute="old")
    for v, d in H.nodes(data=True):
        d["x"], d["y"] = float(d["old"][0]), float(d["old"][1])
        del d["old"]
    buf = io.BytesIO()
    nx.write_graphml(H, buf)
    P = read_graphml(buf.getvalue())
    assert isinstance(P, sw.PlaneGraph) and P.number_of_faces() == 5  # a 3x3 grid: 4 squares + outer
    assert P.pos is not None
    buf = io.BytesIO()
    nx.write_graphml(nx.complete_graph(5), buf)
    K = read_graphml(buf.getvalue())
    assert isinstance(K, nx.Graph) and not isinstance(K, sw.PlaneGraph) and K.number_of_edges() == 10
    buf = io.BytesIO()
    nx.write_graphml(nx.cycle_graph(6), buf)
    assert read_graphml(buf.getvalue()).number_of_faces() == 2


def test_graphml_crossing_drawing():
    G = nx.Graph([(0, 2), (1, 3), (0, 1)])
    for v, (x, y) in {0: (0, 0), 1: (1, 0), 2: (1, 1), 3: (0, 1)}.items():
        G.nodes[v]["x"], G.nodes[v]["y"] = float(x), float(y)
    buf = io.BytesIO()
    nx.write_graphml(G, buf)
    with pytest.raises(CrossingEdgesError, match="cross"):
        read_graphml(buf.getvalue(), path="c.graphml")


# ------------------------------------------------------------- bad files
TRI = HEADER + bytes([3, 2, 3, 0, 3, 1, 0, 1, 2, 0])
OFF_OK = b"OFF\n3 1 0\n0 0 0\n1 0 0\n0 1 0\n3 0 1 2\n"

BAD = [
    # (id, format, data, error, message pattern)
    ("gr-no-header", "gr", b"1 2\n", FileFormatError, "line 1.*header"),
    ("gr-two-headers", "gr", b"p tw 2 1\np tw 2 1\n1 2\n", FileFormatError, "line 2.*second"),
    ("gr-bad-token", "gr", b"p tw 2 1\n1 x\n", FileFormatError, "line 2.*integer"),
    ("gr-vertex-range", "gr", b"p tw 2 1\n1 3\n", FileFormatError, "line 2.*outside 1..2"),
    ("gr-too-few-edges", "gr", b"p tw 3 2\n1 2\n", FileFormatError, "declares 2 edges but 1"),
    ("gr-too-many-edges", "gr", b"p tw 3 1\n1 2\n2 3\n", FileFormatError, "line 3.*more edge lines"),
    ("gr-negative-weight", "gr", b"c @weighted\np tw 2 1\n1 2 -1\n", WeightError, "line 3.*negative"),
    ("gr-nan-weight", "gr", b"c @weighted\np tw 2 1\n1 2 nan\n", WeightError, "NaN"),
    ("gr-missing-weight", "gr", b"c @weighted\np tw 2 1\n1 2\n", FileFormatError, "line 3.*u v weight"),
    ("gr-huge-declared", "gr", b"p tw 999999999 0\n", FileFormatError, "limits"),
    ("gr-isolated-flood", "gr", b"p tw 5000000 1\n1 2\n", FileFormatError, "isolated"),
    ("gr-binary", "gr", b"\xff\xfe", FileFormatError, "UTF-8"),
    ("pc-no-header", "planar_code", b"planar", FileFormatError, "byte 0.*header"),
    ("pc-truncated", "planar_code", TRI[:-3], FileFormatError, "byte.*(ends|remain)"),
    ("pc-truncated-wide", "planar_code", HEADER + b"\x00\x05", FileFormatError, "byte 15.*two-byte"),
    ("pc-out-of-range", "planar_code", HEADER + bytes([2, 3, 0, 1, 0]), FileFormatError, "outside 1..2"),
    ("pc-self-loop", "planar_code", HEADER + bytes([2, 1, 0, 0]), FileFormatError, "lists itself"),
    ("pc-one-sided", "planar_code", HEADER + bytes([3, 2, 3, 0, 1, 0, 0]), FileFormatError, "vertex 1 lists 3 but vertex 3 does not list 1"),
    ("pc-zero-vertices", "planar_code", HEADER + b"\x00\x00\x00", FileFormatError, "0 vertices"),
    (
        "pc-disconnected",
        "planar_code",
        HEADER + bytes([4, 2, 0, 1, 0, 4, 0, 3, 0]),
        InvalidEmbeddingError,
        "not connected",
    ),
    (
        "pc-genus-one",  # K4 with neighbours listed in increasing order everywhere: genus 1
        "planar_code",
        HEADER + bytes([4, 2, 3, 4, 0, 1, 3, 4, 0, 1, 2, 4, 0, 1, 2, 3, 0]),
        InvalidEmbeddingError,
        "genus 1",
    ),
    ("off-bad-header", "off", b"PLY\n", FileFormatError, "line 1.*OFF"),
    ("off-bad-index", "off", OFF_OK.replace(b"3 0 1 2", b"3 0 1 7"), FileFormatError, "line 6.*index 7.*0..2"),
    ("off-negative-index", "off", OFF_OK.replace(b"3 0 1 2", b"3 0 -1 2"), FileFormatError, "line 6.*outside"),
    ("off-short-face", "off", OFF_OK.replace(b"3 0 1 2", b"4 0 1 2"), FileFormatError, "line 6.*declares 4"),
    ("off-counts", "off", b"OFF\n3 1 0\n0 0 0\n", FileFormatError, "line 2.*only"),
    ("off-coordinate", "off", OFF_OK.replace(b"1 0 0", b"1 zz 0"), FileFormatError, "line 4.*number"),
    ("off-unused-vertex", "off", b"OFF\n4 1 0\n0 0 0\n1 0 0\n0 1 0\n5 5 0\n3 0 1 2\n", FileFormatError, "vertex 3 belongs to no face"),
    (
        "off-inconsistent-orientation",
        "off",
        b"OFF\n4 2 0\n0 0 0\n1 0 0\n1 1 0\n0 1 0\n3 0 1 2\n3 0 1 3\n",
        InvalidEmbeddingError,
        "same direction",
    ),
    (
        "off-pinched",
        "off",
        b"OFF\n5 2 0\n0 0 0\n1 0 0\n1 1 0\n-1 0 0\n-1 -1 0\n3 0 1 2\n3 0 3 4\n",
        InvalidEmbeddingError,
        "pinched",
    ),
    ("obj-bad-statement", "obj", b"v 0 0 0\nxyz 1\n", FileFormatError, "line 2.*unknown"),
    ("obj-index-range", "obj", b"v 0 0 0\nv 1 0 0\nv 0 1 0\nf 1 2 4\n", FileFormatError, "line 4.*outside 1..3"),
    ("graphml-not-xml", "graphml", b"<graphml><node", FileFormatError, "GraphML"),
    ("graphml-entity", "graphml", b"<!DOCTYPE x [<!ENTITY a 'b'>]><graphml/>", FileFormatError, "DOCTYPE"),
]


def _reader(fmt):
    return {
        "gr": lambda d: read_gr(d, path="bad.gr"),
        "planar_code": lambda d: read_planar_code(d, "bad.plc"),
        "off": lambda d: read_mesh(d, "off", path="bad.off"),
        "obj": lambda d: read_mesh(d, "obj", path="bad.obj"),
        "graphml": lambda d: read_graphml(d, path="bad.graphml"),
    }[fmt]


@pytest.mark.parametrize("fmt,data,error,pattern", [b[1:] for b in BAD], ids=[b[0] for b in BAD])
def test_bad_files(fmt, data, error, pattern):
    with pytest.raises(error, match=pattern) as info:
        _reader(fmt)(data)
    assert "bad." in str(info.value)  # the file is named


def test_file_format_error_fields():
    with pytest.raises(FileFormatError) as info:
        read_gr(b"p tw 2 1\n1 3\n", path="g.gr")
    err = info.value
    assert (err.path, err.line, err.offset) == ("g.gr", 2, None)
    with pytest.raises(FileFormatError) as info:
        read_planar_code(HEADER + bytes([2, 3, 0]), "p.plc")
    assert info.value.offset == len(HEADER) + 1


def test_read_errors(tmp_path):
    with pytest.raises(FileFormatError, match="no such file"):
        read(tmp_path / "missing.json")
    with pytest.raises(FileFormatError, match="directory"):
        read(tmp_path)
    odd = tmp_path / "mystery.bin"
    odd.write_bytes(b"\x01\x02\x03")
    with pytest.raises(FileFormatError, match="unknown format"):
        read(odd)
    with pytest.raises(UnsupportedOptionError, match="format"):
        read(odd, format="yaml")
    with pytest.raises(UnsupportedOptionError, match="extension"):
        write(generators.wheel(3), tmp_path / "w.yaml")
