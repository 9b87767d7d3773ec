"""Pictures of leash sweeps (homotopy width): frames, profile and GIF against two independent replays.

References for the checks:

* ``sweepwidth.verify.width.leash_sweep``: the checker's replay the pictures
  are drawn from;
* ``sweepwidth.problems.width.WidthProblem.apply_move``: the solvers' move
  code, which shares nothing with the checker, as a second replay of every
  leash whose length a title states;
* ``instances/leashes/manifest.json``: the exact widths of the shipped
  instances (exact search, cross-checked by the brute force of
  ``tests/reference_width.py``).
"""

from __future__ import annotations

import dataclasses
import glob
import json
import os
import re

import pytest

pytest.importorskip("matplotlib")

import matplotlib  # noqa: E402

matplotlib.use("Agg")

from PIL import Image  # noqa: E402

import sweepwidth as sw  # noqa: E402
from sweepwidth import generators  # noqa: E402
from sweepwidth.bench.loading import solve_object  # noqa: E402
from sweepwidth.draw import leash_animation, leash_frames, leash_profile, width_profile  # noqa: E402
from sweepwidth.errors import InvalidArgumentError, SweepwidthError, WitnessError  # noqa: E402
from sweepwidth.problems.width import WidthProblem  # noqa: E402
from sweepwidth.result import Result  # noqa: E402
from sweepwidth.verify.width import leash_sweep  # noqa: E402

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
LEASHES = sorted(p for p in glob.glob(os.path.join(ROOT, "instances", "leashes", "*.json"))
                 if not p.endswith("manifest.json"))
TITLE = re.compile(r"^step (\d+): .*\nleash length (\S+)  \(a_(\d+), b_(\d+)\)")


def _known(path):
    with open(os.path.join(ROOT, "instances", "leashes", "manifest.json")) as fh:
        entries = json.load(fh)["instances"]
    name = os.path.splitext(os.path.basename(path))[0]
    return [e for e in entries if e["name"] == name][0]["known"]["width"]["value"]


@pytest.fixture(scope="module")
def solved():
    """Each shipped leash instance, solved once (walks from the file's curves a, b, start, end)."""
    out = {}
    for path in LEASHES:
        P = sw.read(path)
        out[path] = (P, solve_object(P, "width", time_limit=60))
    return out


def _disk():
    """A weighted Delaunay disk with walks A, B on opposite arcs of its outer boundary (default leashes)."""
    P = generators.delaunay(9, seed=4)
    cyc = [P.tail(d) for d in P.face_darts(P.outer_face)]
    assert len(cyc) >= 5
    a = cyc[:2]
    b = cyc[3:5][::-1]
    return P, sw.homotopy_width(P, {"vertices": a}, {"vertices": b}, time_limit=30)


def _second_replay(P, r):
    """Leash lengths from the solvers' move code (problems.width), not the checker."""
    o = r.stats["options"]
    W = WidthProblem.build(P, o["a"], o["b"], start=o["start"], end=o["end"], backward=o["backward"],
                           spikes=o["spikes"], simple=o["simple"], holes=o["holes"], weight=o["weight"])
    s = W.initial()
    out = [(W.length_of(s.darts), s.i, s.j)]
    for mv in r.witness["moves"]:
        s = W.apply_move(s, mv)
        out.append((W.length_of(s.darts), s.i, s.j))
    assert W.is_final(s)
    return out


def _panels(fig):
    return [ax for ax in fig.axes if ax.get_visible()]


def _titles(fig):
    rows = []
    for ax in _panels(fig):
        m = TITLE.match(ax.get_title())
        assert m, ax.get_title()
        rows.append((int(m.group(1)), float(m.group(2)), int(m.group(3)), int(m.group(4))))
    return rows


def _check_sheet(P, r, frames):
    ref = _second_replay(P, r)
    fig = leash_frames(P, r, frames=frames)
    n = len(r.witness["moves"]) + 1
    assert len(_panels(fig)) == min(frames, n)
    rows = _titles(fig)
    steps = [s for s, _, _, _ in rows]
    assert steps == sorted(steps) and steps[0] == 0 and steps[-1] == n - 1
    lengths = [x[0] for x in ref]
    assert max(lengths) in [L for _, L, _, _ in rows]  # the longest leash has a frame
    for s, L, i, j in rows:
        assert (L, i, j) == ref[s], s  # the title against the solvers' move code
    checker = leash_sweep(r, P)
    assert [x.length for x in checker.leashes] == lengths  # the two replays agree everywhere
    bold = [ax for ax in _panels(fig) if ax.title.get_fontweight() == "bold"]
    assert len(bold) == 1 and "longest" in bold[0].get_title()
    return fig, rows


@pytest.mark.parametrize("path", LEASHES, ids=os.path.basename)
def test_frames_on_the_shipped_leash_instances(solved, path):
    P, r = solved[path]
    assert r.status == "optimal" and r.value == _known(path)  # instances/leashes/manifest.json
    for frames in (4, 7, 100):
        _check_sheet(P, r, frames)


@pytest.mark.parametrize("path", LEASHES, ids=os.path.basename)
def test_profile_maximum_is_the_value(solved, path):
    P, r = solved[path]
    fig = leash_profile(r, P)
    ax = fig.axes[0]
    ys = [float(y) for y in ax.lines[0].get_ydata()]
    assert ys == [x[0] for x in _second_replay(P, r)]
    assert max(ys) == r.value == _known(path)
    # the lower bound line is drawn at the result's lower bound; without one, no lower line
    labels = [t.get_text() for t in ax.get_legend().get_texts()]
    assert f"lower bound {r.lower:g}" in labels
    flat = dataclasses.replace(r, lower=None, status="bounded", value=None)
    labels = [t.get_text() for t in leash_profile(flat, P).axes[0].get_legend().get_texts()]
    assert not any(t.startswith("lower bound") for t in labels)
    # width_profile takes width results too and plots the same lengths
    assert [float(y) for y in width_profile(r, P).lines[0].get_ydata()] == ys


def test_frames_and_profile_on_a_generated_disk():
    P, r = _disk()
    assert r.check(P) == r.upper
    assert sum(m["op"] == "flip" for m in r.witness["moves"]) >= 3  # a sweep over faces, not only endpoint steps
    _check_sheet(P, r, 5)
    prof = leash_profile(r, P)
    assert float(max(prof.axes[0].lines[0].get_ydata())) == r.upper
    if r.status == "optimal":
        assert r.value == r.upper


def test_faces_flipped_since_the_previous_frame_are_shaded():
    from matplotlib.collections import PolyCollection
    from matplotlib.colors import to_hex

    from sweepwidth.draw import PALETTE

    path = [p for p in LEASHES if "reflip" in p][0]
    P = sw.read(path)
    r = solve_object(P, "width", time_limit=60)
    moves = r.witness["moves"]
    assert any(m["op"] == "flip" for m in moves)
    fig = leash_frames(P, r, steps=range(len(moves) + 1))  # every leash: each frame shades its own move's face
    for ax, (s, _, _, _) in zip(_panels(fig), _titles(fig)):
        shaded = [c for c in ax.collections if isinstance(c, PolyCollection)
                  and len(c.get_facecolor()) and to_hex(c.get_facecolor()[0]) == PALETTE["swept"]]
        n = sum(len(c.get_paths()) for c in shaded)
        flip = s > 0 and moves[s - 1]["op"] == "flip" and moves[s - 1]["face"] != P.outer_face
        assert n == (1 if flip else 0), (s, moves[s - 1] if s else None)
    # frames further apart shade every face flipped in between (here: the start and the end frame)
    fig = leash_frames(P, r, steps=[0, len(moves)])
    last = _panels(fig)[1]
    shaded = [c for c in last.collections if isinstance(c, PolyCollection)
              and len(c.get_facecolor()) and to_hex(c.get_facecolor()[0]) == PALETTE["swept"]]
    assert sum(len(c.get_paths()) for c in shaded) == len({m["face"] for m in moves if m["op"] == "flip"})


def test_animation_has_one_frame_per_leash(tmp_path, solved):
    P, r = solved[[p for p in LEASHES if "backstep" in p][0]]
    out = leash_animation(P, r, tmp_path / "leash.gif", dpi=30)
    with Image.open(out) as im:
        assert im.n_frames == len(r.witness["moves"]) + 1
    out = leash_animation(P, r, tmp_path / "few.gif", frames=3, dpi=30)
    with Image.open(out) as im:
        assert im.n_frames == 3


def test_bad_input_is_named(solved, tmp_path):
    P, r = solved[LEASHES[0]]
    hom = sw.homology_width(P, time_limit=10)
    with pytest.raises(InvalidArgumentError, match="homotopy width results .* got a 'homology' result"):
        leash_frames(P, hom)
    with pytest.raises(InvalidArgumentError, match="parameter 'width'"):
        leash_profile(hom, P)
    with pytest.raises(WitnessError, match="no leash sweep witness"):
        leash_frames(P, dataclasses.replace(r, witness=None))
    opts = {k: v for k, v in r.stats["options"].items() if k != "b"}
    with pytest.raises(WitnessError, match="walk 'b' is not recorded"):
        leash_frames(P, dataclasses.replace(r, stats={"options": opts}))
    # the walk given by keyword makes it drawable again
    fig = leash_frames(P, dataclasses.replace(r, stats={"options": opts}), frames=3, b=r.stats["options"]["b"])
    assert len(_panels(fig)) == 3
    for bad in (0, -2, 2.5, True):
        with pytest.raises(InvalidArgumentError, match="frames must be a positive integer"):
            leash_frames(P, r, frames=bad)
    with pytest.raises(InvalidArgumentError, match="outside 0.."):
        leash_frames(P, r, steps=[0, 999])
    with pytest.raises(InvalidArgumentError, match=r"\.gif"):
        leash_animation(P, r, tmp_path / "x.png")
    # a witness the checker refuses is not drawn (the move is named)
    moves = [dict(m) for m in r.witness["moves"]]
    k = next(i for i, m in enumerate(moves) if m["op"] == "step")
    moves[k]["to"] = moves[k]["to"] + 1
    with pytest.raises(WitnessError, match=f"move {k}"):
        leash_frames(P, dataclasses.replace(r, witness={"start": r.witness["start"], "moves": moves}))
    assert issubclass(InvalidArgumentError, SweepwidthError)
