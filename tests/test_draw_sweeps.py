"""Pictures of sweeps: replayed states against the independent checkers, frames, GIFs, profiles,
bench plots and the command-line entry point."""

from __future__ import annotations

import json
import sqlite3
import xml.etree.ElementTree as ET

import networkx as nx
import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from PIL import Image

import sweepwidth as sw
from sweepwidth import generators
from sweepwidth.draw import (
    bench_solved,
    bench_times,
    read_bench_rows,
    render_cli,
    sweep_animation,
    sweep_frames,
    sweep_states,
    width_profile,
)
from sweepwidth.draw._profile import step_lengths
from sweepwidth.draw._sweep import _pick_steps, _walk_pieces
from sweepwidth.draw._layout import Geometry
from sweepwidth.errors import FileFormatError, SweepwidthError, UnsupportedOptionError, WitnessError
from sweepwidth.plane import PlaneGraph
from sweepwidth.result import Result
from sweepwidth.verify.homology import sweep_profile
from sweepwidth.verify.homotopy import replay_homotopy

from strategies import plane_graphs


def _inner(P):
    return [f for f in P.faces if f != P.outer_face]


def _homology(P, order):
    return Result("homology", "bounded", None, 0.0, 1e9, witness=list(order))


def _outer_walk(P):
    W = P.face_darts(P.outer_face)
    return {"vertex": P.tail(W[0]), "darts": W}


def _spiky_homotopy(P):
    """A homotopy of the square grid 2 x 2 (one face) from its boundary to a point,
    with a spike and an unspike on the way (built from the spec's moves)."""
    W = P.face_darts(P.outer_face)
    f = _inner(P)[0]
    B = P.face_darts(f)
    v0 = P.tail(W[0])
    d = W[0]
    moves = [
        {"op": "spike", "pos": 0, "dart": d},  # d, d^1, then the boundary
        {"op": "unspike", "pos": 0},
        # flip the inner face: remove the whole walk (it is the face boundary reversed)
        {"op": "flip", "face": f, "pos": 0, "take": len(W), "put": []},
    ]
    assert sorted(x ^ 1 for x in W) == sorted(B)
    return {"start": {"vertex": v0, "darts": W}, "moves": moves}


# ------------------------------------------------------------------ states
@settings(max_examples=20, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(plane_graphs(3, 9), st.randoms(use_true_random=False))
def test_homology_states_match_the_independent_checker(P, rnd):
    order = _inner(P)
    rnd.shuffle(order)
    states = sweep_states(P, _homology(P, order))
    start = set(P.face_boundary_cycle(P.outer_face))
    prof, _ = sweep_profile(P, start, order, {P.outer_face})
    assert [s.length for s in states] == prof
    assert len(states) == len(order) + 1
    assert states[-1].edges == set()  # every inner face swept: the cycle is gone


def test_homology_with_recorded_start_and_end():
    P = generators.grid(3, 3)
    a, b = _inner(P)[:2]
    start = sorted(P.face_boundary_cycle(a))
    end = sorted(P.face_boundary_cycle(b))
    r = sw.homology_width(P, start={"faces": [a]}, end={"faces": [b]})
    states = sweep_states(P, r)
    assert states[0].edges == set(start) and states[-1].edges == set(end)
    assert max(s.length for s in states) == r.check(P)


def test_solver_results_replay_to_their_checked_width():
    P = generators.triangulated_grid(2)
    r = sw.homology_width(P)
    assert max(step_lengths(r, P)) == r.check(P)
    rc = sw.cutwidth(P.dual(), time_limit=10)
    assert max(step_lengths(rc, P, on="faces")) == rc.check(P.dual())
    rv = sw.cutwidth(P, time_limit=10)
    assert max(step_lengths(rv, P)) == rv.check(P)


def test_cutwidth_profile_on_a_plain_graph():
    # cycle C_6 in its natural order: cuts 0, 2, 2, 2, 2, 2, 0 (cutwidth of a cycle is 2, common practice)
    r = Result("cutwidth", "optimal", 2.0, 2.0, 2.0, witness=list(range(6)))
    assert step_lengths(r, nx.cycle_graph(6)) == [0.0, 2.0, 2.0, 2.0, 2.0, 2.0, 0.0]


def test_homotopy_states_match_the_independent_replay():
    P = generators.grid(2, 2)
    wit = _spiky_homotopy(P)
    height = replay_homotopy(P, wit)
    states = sweep_states(P, Result("homotopy", "bounded", None, 0.0, height, witness=wit))
    assert [s.caption.split()[0] for s in states] == ["start", "spike", "unspike", "flip"]
    assert [s.length for s in states] == [4.0, 6.0, 4.0, 0.0]
    assert max(s.length for s in states) == height
    assert states[1].changed == [0, 1]
    assert states[-1].walk == [] and states[-1].point == wit["start"]["vertex"]
    assert states[-1].swept == {_inner(P)[0]}


def test_homotopy_solver_witness_replays():
    P = generators.grid(3, 3)
    r = sw.homotopy_height(P, time_limit=20)
    states = sweep_states(P, r)
    assert max(s.length for s in states) == r.check(P)
    assert len(states) == len(r.witness["moves"]) + 1


def test_vertex_length_convention():
    P = generators.grid(2, 2)
    wit = _spiky_homotopy(P)
    r = Result("homotopy", "bounded", None, 0.0, 6.0, witness=wit, stats={"options": {"length": "vertices"}})
    # closed walks: vertices with multiplicity = number of darts, a point counts 1 (spec)
    assert [s.length for s in sweep_states(P, r)] == [4.0, 6.0, 4.0, 1.0]
    assert replay_homotopy(P, wit, length="vertices") == 6.0


def test_spikes_are_drawn_as_short_whiskers():
    P = generators.grid(2, 2)
    g = Geometry(P)
    W = P.face_darts(P.outer_face)
    d = W[0]
    pieces = _walk_pieces(g, [d, d ^ 1] + W, True)
    full = np.hypot(*(g.dart_points(d)[-1] - g.dart_points(d)[0]))
    out = np.hypot(*(pieces[0][-1] - pieces[0][0]))
    assert 0.4 * full < out < 0.7 * full  # the whisker stops short of the far vertex


def test_broken_witnesses_name_the_step():
    P = generators.grid(2, 2)
    with pytest.raises(WitnessError, match="step 1"):
        sweep_states(P, _homology(P, [99]))
    wit = _spiky_homotopy(P)
    wit["moves"][0]["dart"] = 10**6
    with pytest.raises(WitnessError, match="step 1"):
        sweep_states(P, Result("homotopy", "bounded", None, 0.0, 1.0, witness=wit))
    with pytest.raises(WitnessError, match="not a vertex"):
        sweep_states(P, Result("cutwidth", "bounded", None, 0.0, 1.0, witness=["nope"]), on="vertices")
    with pytest.raises(UnsupportedOptionError):
        sweep_states(P, Result("treewidth", "bounded", None, 0.0, 1.0, witness=[]))


def test_pick_steps_keeps_the_widest():
    lengths = [0.0] * 40
    lengths[17] = 5.0
    picks = _pick_steps(40, lengths, 6)
    assert 17 in picks and 0 in picks and 39 in picks and len(picks) <= 6


# ------------------------------------------------------------------ pictures
def test_frames_sheet(tmp_path):
    P = generators.grid(2, 3)
    r = Result("homology", "optimal", 6.0, 6.0, 6.0, witness=_inner(P))
    fig = sweep_frames(P, r, dpi=50, panel_size=2.0)
    assert len([a for a in fig.axes if a.get_visible()]) == 3
    assert any("widest" in a.get_title() for a in fig.axes)
    out = tmp_path / "frames.png"
    fig.savefig(out, dpi=fig.dpi)
    with Image.open(out) as im:
        # grid 2 x 3 is twice as wide as tall: panels 2 in x 1 in, plus 0.45 in of titles per row
        # and 0.35 in of headline (documented sizes); 3 frames fit best in one row
        w, h = im.size
        cols = round(w / 100)
        rows = round((h / 50 - 0.35) / 1.45)
        assert cols * rows >= 3 and w == 100 * cols and h == round(50 * (1.45 * rows + 0.35))


def test_frames_of_a_homotopy_and_an_ordering(tmp_path):
    P = generators.grid(2, 2)
    wit = _spiky_homotopy(P)
    fig = sweep_frames(P, Result("homotopy", "bounded", None, 4.0, 6.0, witness=wit), dpi=40)
    assert len([a for a in fig.axes if a.get_visible()]) == 4
    fig.savefig(tmp_path / "h.svg")
    ET.parse(tmp_path / "h.svg")
    order = P.vertices
    fig = sweep_frames(P, Result("cutwidth", "bounded", None, 0.0, 2.0, witness=order), steps=[0, 2], dpi=40)
    assert len([a for a in fig.axes if a.get_visible()]) == 2
    with pytest.raises(SweepwidthError, match="outside"):
        sweep_frames(P, Result("cutwidth", "bounded", None, 0.0, 2.0, witness=order), steps=[9])


def test_gif_has_one_frame_per_step(tmp_path):
    P = generators.grid(2, 3)
    r = Result("homology", "optimal", 6.0, 6.0, 6.0, witness=_inner(P))
    out = sweep_animation(P, r, tmp_path / "s.gif", dpi=30)
    with Image.open(out) as im:
        assert im.n_frames == len(r.witness) + 1
    wit = _spiky_homotopy(generators.grid(2, 2))
    out = sweep_animation(generators.grid(2, 2), Result("homotopy", "bounded", None, 4, 6, witness=wit),
                          tmp_path / "h.gif", dpi=30)
    with Image.open(out) as im:
        assert im.n_frames == len(wit["moves"]) + 1
    with pytest.raises(SweepwidthError, match="gif"):
        sweep_animation(P, r, tmp_path / "s.png")


def test_width_profile_lines_and_bounds():
    P = generators.triangulated_grid(2)
    r = sw.homology_width(P)
    ax = width_profile(r, P)
    ys = list(ax.lines[0].get_ydata())
    assert ys == step_lengths(r, P)
    bound_levels = {float(line.get_ydata()[0]) for line in ax.lines[1:]}
    assert bound_levels == {float(r.lower), float(r.upper)}
    labels = [t.get_text() for t in ax.get_legend().get_texts()]
    assert any(lab.startswith("widest") for lab in labels)


# ------------------------------------------------------------------ bench plots
def _fake_rows():
    rows = []
    for n in (4, 8, 12):
        for k, m in ((1, "dp"), (2, "sat")):
            rows.append({"name": f"g{n}", "size": n, "parameter": "cutwidth", "method": m,
                         "status": "optimal" if n < 12 or m == "dp" else "bounded", "seconds": 0.01 * n**k})
    return rows


def test_bench_plots_from_rows_and_from_a_minimal_database(tmp_path):
    rows = _fake_rows()
    ax = bench_solved(rows)
    widths = [round(p.get_width()) for p in ax.patches]
    assert widths[:2] == [3, 2]  # solved: dp 3 of 3, sat 2 of 3
    ax = bench_times(rows)
    assert ax.get_yscale() == "log"
    # the documented subset of the schema, with other column names
    db = tmp_path / "mini.sqlite"
    con = sqlite3.connect(db)
    con.execute("CREATE TABLE tasks (instance_name TEXT, n INTEGER, param TEXT, method TEXT, status TEXT, wall REAL)")
    con.executemany("INSERT INTO tasks VALUES (?, ?, ?, ?, ?, ?)",
                    [(r["name"], r["size"], r["parameter"], r["method"], r["status"], r["seconds"]) for r in rows])
    con.commit()
    con.close()
    got = read_bench_rows(db)
    assert sorted((r["method"], r["size"], r["status"]) for r in got) == sorted(
        (r["method"], float(r["size"]), r["status"]) for r in rows)
    out = tmp_path / "t.png"
    bench_times(db, parameter="cutwidth").figure.savefig(out)
    assert out.stat().st_size > 0


def test_bench_reader_on_the_runner_database(tmp_path):
    from sweepwidth.bench.db import ResultsDB

    path = tmp_path / "runs.sqlite"
    P = generators.grid(2, 3)
    res = {"stats": {"faces": P.number_of_faces()}}
    with ResultsDB(path) as db:
        run = db.start_run({"note": "test"})
        for i, (m, s) in enumerate([("dp", "optimal"), ("sat", "bounded")]):
            db.record({"instance_hash": f"i{i}", "config_hash": m, "name": "grid", "parameter": "homology",
                       "method": m, "status": s, "seconds": 0.5 + i, "result": res}, run)
    rows = read_bench_rows(path)
    assert sorted(r["method"] for r in rows) == ["dp", "sat"]
    assert all(r["size"] == float(P.number_of_faces()) for r in rows)
    assert bench_solved(path).patches


def test_bench_reader_errors(tmp_path):
    with pytest.raises(FileFormatError, match="no such"):
        read_bench_rows(tmp_path / "missing.sqlite")
    bad = tmp_path / "bad.sqlite"
    bad.write_text("not a database")
    with pytest.raises(FileFormatError):
        read_bench_rows(bad)
    with pytest.raises(SweepwidthError, match="no tasks"):
        bench_solved([])


# ------------------------------------------------------------------ command line
@pytest.fixture
def instance(tmp_path):
    P = generators.grid(2, 3)
    path = tmp_path / "g.json"
    sw.write(P, path)
    return P, path


def test_render_cli_from_a_saved_result(instance, tmp_path):
    P, path = instance
    r = sw.homology_width(P)
    saved = tmp_path / "r.json"
    saved.write_text(json.dumps({"format": "saved", "result": r.to_dict()}))  # wrapped, with extra keys
    out = render_cli(path, result=saved, out=tmp_path / "a.png")
    with Image.open(out) as im:
        assert im.size == (1100, 520)
    flat = tmp_path / "flat.json"
    flat.write_text(r.to_json())
    out = render_cli(path, result=flat, out=tmp_path / "a.gif")
    with Image.open(out) as im:
        assert im.n_frames == len(r.witness) + 1
    out = render_cli(path, result=flat, out=tmp_path / "a.svg", frames=2)
    ET.parse(out)


def test_render_cli_solves_draws_and_rejects(instance, tmp_path):
    P, path = instance
    out = render_cli(path, out=tmp_path / "plain.png", dual=True)
    assert (tmp_path / "plain.png").stat().st_size > 0 and out.endswith("plain.png")
    out = render_cli(path, param="cutwidth", dual=True, out=tmp_path / "cw.png")
    assert (tmp_path / "cw.png").stat().st_size > 0
    with pytest.raises(UnsupportedOptionError, match="png"):
        render_cli(path, out=tmp_path / "x.bmp")
    with pytest.raises(UnsupportedOptionError, match="homotopy"):
        render_cli(path, param="treewidth", out=tmp_path / "x.png")
    with pytest.raises(SweepwidthError, match="needs a sweep"):
        render_cli(path, out=tmp_path / "x.gif")
    bad = tmp_path / "bad.json"
    bad.write_text("{not json")
    with pytest.raises(FileFormatError):
        render_cli(path, result=bad, out=tmp_path / "x.png")
    r = sw.homology_width(P)
    saved = tmp_path / "r.json"
    saved.write_text(r.to_json())
    with pytest.raises(SweepwidthError, match="not 'homotopy'"):
        render_cli(path, param="homotopy", result=saved, out=tmp_path / "x.png")


@settings(max_examples=8, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(plane_graphs(2, 7, kinds=("dual", "tree", "chords")))
def test_frames_of_any_face_order_render(P):
    # duals carry loops and parallel edges; every face order is a valid homology sweep
    order = _inner(P)
    r = Result("homology", "bounded", None, 0.0, 1e9, witness=order)
    fig = sweep_frames(P, r, max_frames=3, dpi=20, panel_size=1.5)
    fig.canvas.draw()
    assert len([a for a in fig.axes if a.get_visible()]) == min(3, len(order) + 1)


def test_face_points_lie_inside_their_faces():
    # a non-convex face (an L-shaped hexagon) and convex triangles: each face's point
    # must be inside the face's polygon (tested with matplotlib's own Path, not our code)
    from matplotlib.path import Path

    for P in (generators.delaunay(20, seed=7), generators.cycle_with_chords(9, 2, seed=2),
              PlaneGraph.from_faces([[0, 1, 2, 3, 4, 5]],
                                    pos={0: (0, 0), 1: (2, 0), 2: (2, 1), 3: (1, 1), 4: (1, 2), 5: (0, 2)})):
        g = Geometry(P)
        for f in P.faces:
            if f == P.outer_face:
                continue
            assert Path(g.face_polygon(f)).contains_point(tuple(g.face_point(f))), f


def test_open_walk_homotopy_states_and_frames(tmp_path):
    # a path from s to t along one side of the square, flipped across the face to the other side
    P = generators.grid(2, 2)
    W = P.face_darts(P.outer_face)
    f = _inner(P)[0]
    q = [W[3] ^ 1, W[2] ^ 1]  # from s = tail(W[0]) round the other way to t = head(W[1])
    wit = {"start": {"vertex": P.tail(W[0]), "darts": [W[0], W[1]]},
           "moves": [{"op": "flip", "face": f, "pos": 0, "take": 2, "put": q}]}
    height = replay_homotopy(P, wit, closed=False, start=wit["start"],
                             end={"vertex": P.tail(W[0]), "darts": q})
    r = Result("homotopy", "optimal", height, height, height, witness=wit,
               stats={"options": {"closed": False, "length": "vertices"}})
    states = sweep_states(P, r)
    assert [s.closed for s in states] == [False, False]
    assert states[-1].walk == q and states[-1].changed == [0, 1]
    # open walks count darts + 1 vertices (spec)
    assert [s.length for s in states] == [3.0, 3.0]
    assert replay_homotopy(P, wit, closed=False, start=wit["start"], end={"vertex": P.tail(W[0]), "darts": q},
                           length="vertices") == 3.0
    fig = sweep_frames(P, r, dpi=30)
    fig.savefig(tmp_path / "open.png")
    assert (tmp_path / "open.png").stat().st_size > 0


def test_render_cli_on_a_graph_without_embedding(tmp_path):
    # K5 is not planar (Kuratowski): only the width profile of an ordering can be drawn
    path = tmp_path / "k5.json"
    sw.write(nx.complete_graph(5), path)
    out = render_cli(path, param="cutwidth", out=tmp_path / "k5.png")
    assert (tmp_path / "k5.png").stat().st_size > 0 and out.endswith("k5.png")
    with pytest.raises(SweepwidthError, match="planar"):
        render_cli(path, param="cutwidth", out=tmp_path / "k5.gif")
