"""Tests of the exact homotopy-height search (sweepwidth.solve.homotopy.search).

Independent references used here:

* ``_replay``: a witness replayer written from the shared curve spec's text,
  sharing no code with the solver (it re-derives face boundaries from the
  PlaneGraph and checks each rule literally).  The project's own checker in
  ``sweepwidth.verify.homotopy`` is used too when it is present.
* ``_brute_height``: a level-by-level breadth-first search over *all* dart
  sequences (no canonical rotations, no tie-breaks, no clamping), with moves
  enumerated from the definition (every face, both orientations, every
  rotation and split of its boundary, every occurrence in the walk).
* ``tests/reference_homotopy.py`` (another developer's reference BFS) when present.
"""

from __future__ import annotations

import os
import random
import sys
import time
from collections import deque

import pytest
from hypothesis import HealthCheck, example, given, settings
from hypothesis import strategies as st

import sweepwidth as sw
from sweepwidth import generators
from sweepwidth.errors import SweepwidthError
from sweepwidth.plane import PlaneGraph
from sweepwidth.problems.homotopy import Curve, HomotopyProblem
from sweepwidth.solve.homotopy.walks import WalkSpace, least_rotation
from sweepwidth.solve.homotopy.search import search_homotopy
from sweepwidth.verify.homotopy import replay_homotopy

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from reference_homotopy import legal_moves, reference_height

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))


# ---------------------------------------------------------------- references
def _boundaries(P, holes):
    """Every (oriented, rotated) boundary walk of every non-hole face."""
    out = []
    for f in P.faces:
        if f in holes:
            continue
        B = list(P.face_darts(f))
        R = [d ^ 1 for d in reversed(B)]
        for C in (B, R):
            m = len(C)
            for r in range(m):
                out.append((f, tuple(C[r:] + C[:r])))
    return out


def _dlen(P, d, mode):
    return 1 if mode == "vertices" else P.weight(d >> 1)


def _length(P, darts, closed, mode):
    if mode == "vertices":
        return len(darts) if (closed and darts) else len(darts) + 1
    return sum(P.weight(d >> 1) for d in darts)


def _is_walk(P, darts, closed):
    for a, b in zip(darts, darts[1:]):
        if P.head(a) != P.tail(b):
            return False
    if closed and darts and P.head(darts[-1]) != P.tail(darts[0]):
        return False
    return True


def _simple(P, darts, closed):
    if not darts:
        return True
    if closed:
        vs = [P.tail(d) for d in darts]
        if len(darts) == 2 and darts[0] >> 1 == darts[1] >> 1:
            return False
        return len(set(vs)) == len(vs)
    vs = [P.tail(d) for d in darts] + [P.head(darts[-1])]
    return len(set(vs)) == len(vs)


def _replay(P, witness, *, closed=True, end=None, holes=None, spikes=True, simple=False,
            monotone=False, mode="weight"):
    """Replay a witness literally by the spec; return its height (AssertionError on any illegal step)."""
    holes = {P.outer_face} if holes is None else set(holes)
    W = list(witness["start"]["darts"])
    v = witness["start"]["vertex"]
    assert _is_walk(P, W, closed)
    height = _length(P, W, closed, mode)
    flipped = []
    for step, mv in enumerate(witness["moves"]):
        L = len(W)
        i = mv["pos"]
        if mv["op"] == "spike":
            assert spikes, step
            d = mv["dart"]
            at = v if L == 0 else (P.head(W[-1]) if i == L else P.tail(W[i]))
            assert P.tail(d) == at, step
            W = W[:i] + [d, d ^ 1] + W[i:]
        elif mv["op"] in ("unspike", "flip"):
            if mv["op"] == "unspike":
                assert spikes, step
                k, q = 2, []
                piece = [W[i % L], W[(i + 1) % L]] if closed else W[i : i + 2]
                assert len(piece) == 2 and piece[1] == piece[0] ^ 1, step
            else:
                f, k, q = mv["face"], mv["take"], list(mv["put"])
                assert f not in holes, step
                if closed:
                    assert 0 <= k <= L, step
                    piece = [W[(i + j) % L] for j in range(k)]
                else:
                    assert i + k <= L, step
                    piece = W[i : i + k]
                loop = piece + [d ^ 1 for d in reversed(q)]
                B = list(P.face_darts(f))
                R = [d ^ 1 for d in reversed(B)]
                ok = any(loop == C[r:] + C[:r] for C in (B, R) for r in range(len(C)))
                assert ok and len(loop) == len(B), (step, "not a face boundary")
                flipped.append(f)
                if k == 0:
                    at = v if L == 0 else (P.head(W[-1]) if i == L else P.tail(W[i]))
                    assert not q or P.tail(q[0]) == at, step
            if k == 0:
                W = W[:i] + q + W[i:]
            else:
                start_v = P.tail(W[i % L])
                if i + k <= L:
                    W = W[:i] + q + W[i + k :]
                else:
                    W = q + W[(i + k) % L : i]
                if not W:
                    v = start_v
        else:
            raise AssertionError(f"unknown op at {step}")
        assert _is_walk(P, W, closed), (step, "not a walk")
        if W:
            v = P.tail(W[0])
        if simple and (step < len(witness["moves"]) - 1 or W):
            assert _simple(P, W, closed), (step, "not simple")
        height = max(height, _length(P, W, closed, mode))
    if monotone:
        assert len(flipped) == len(set(flipped)), "a face flipped twice"
    if end is None:
        assert W == [], "does not end in a point"
    elif closed:
        E = list(end)
        assert len(W) == len(E) and any(W == E[r:] + E[:r] for r in range(max(1, len(E)))), "wrong end"
    else:
        assert W == list(end), "wrong end"
    return height


def _brute_height(P, start, *, end=None, closed=True, holes=None, spikes=True, simple=False,
                  mode="weight", limit=30):
    """Least H such that the end is reachable through walks of length <= H (plain BFS per H)."""
    holes = {P.outer_face} if holes is None else set(holes)
    bounds = _boundaries(P, holes)
    start = tuple(start)
    s_v = P.tail(start[0]) if start else None

    def is_end(W, vv):
        if end is None:
            return not W
        if closed:
            E = tuple(end)
            return len(W) == len(E) and (not E or any(W == E[r:] + E[:r] for r in range(len(E))))
        return W == tuple(end)

    def nbrs(W, vv):
        L = len(W)
        positions = range(L + (0 if closed and L else 1))
        for i in positions:
            at = vv if L == 0 else (P.head(W[-1]) if i == L else P.tail(W[i]))
            for f, C in bounds:
                m = len(C)
                for k in range(m + 1):
                    if k > L or (not closed and i + k > L):
                        continue
                    if k == 0 and P.tail(C[0]) != at:
                        continue
                    piece = tuple(W[(i + j) % L] for j in range(k)) if k else ()
                    if piece != C[:k]:
                        continue
                    q = tuple(d ^ 1 for d in reversed(C[k:]))
                    if k == 0:
                        yield W[:i] + q + W[i:], vv
                    elif i + k <= L:
                        N = W[:i] + q + W[i + k :]
                        yield N, (P.tail(W[i]) if not N else vv)
                    else:
                        N = q + W[(i + k) % L : i]
                        yield N, (P.tail(W[i]) if not N else vv)
            if spikes:
                for d in P.darts_at(at):
                    yield W[:i] + (d, d ^ 1) + W[i:], vv
                if i < L and (closed or i + 1 < L) and L >= 2 and W[(i + 1) % L] == W[i] ^ 1:
                    if i + 2 <= L:
                        N = W[:i] + W[i + 2 :]
                    else:
                        N = W[1:i]
                    yield N, (P.tail(W[i]) if not N else vv)

    lo = _length(P, start, closed, mode)
    if end is not None:
        lo = max(lo, _length(P, tuple(end), closed, mode))
    elif mode == "vertices":
        lo = max(lo, 1)
    H = lo
    while H <= limit:
        seen = {(start, s_v if not start else None)}
        dq = deque([(start, s_v)])
        while dq:
            W, vv = dq.popleft()
            if is_end(W, vv):
                return H
            for N, nv in nbrs(W, vv):
                if _length(P, N, closed, mode) > H:
                    continue
                if simple and not (is_end(N, nv) and not N) and not _simple(P, N, closed):
                    continue
                key = (N, nv if not N else None)
                if key not in seen:
                    seen.add(key)
                    dq.append((N, nv))
        H += 1
    return None


def _ccw_boundary(P):
    return tuple(d ^ 1 for d in reversed(P.face_darts(P.outer_face)))



def _ladder(k, w):
    """k squares in a row (diagonal b_i - t_{i+1}) with a detour triangle outside every top and bottom edge."""
    faces, W = [], {}
    for i in range(k):
        b0, b1, t0, t1 = ("b", i), ("b", i + 1), ("t", i), ("t", i + 1)
        faces += [[b0, b1, t1], [b0, t1, t0], [t1, ("a", i), t0], [b0, ("c", i), b1]]
        W[(t0, t1)], W[(b0, b1)], W[(b0, t1)] = w["t"], w["b"], w["d"]
        W[(t0, ("a", i))], W[(("a", i), t1)] = w["ta"], w["tb"]
        W[(b0, ("c", i))], W[(("c", i), b1)] = w["ba"], w["bb"]
    for i in range(k + 1):
        W[(("b", i), ("t", i))] = w["r0"] if i == 0 else (w["r1"] if i == k else w["ri"])
    P = PlaneGraph.from_faces(faces, weights=W)
    return P, [("b", i) for i in range(k + 1)] + [("t", i) for i in range(k, -1, -1)]


def _opts(H):
    o = H.options()
    return {k: o[k] for k in ("start", "end", "closed", "holes", "spikes", "simple", "monotone", "length")}


def _checked(H, **kw):
    """Solve, then replay the witness with the project's checker and with the spec-literal replayer."""
    out = search_homotopy(H, **kw)
    if out.witness is not None:
        h1 = replay_homotopy(H.graph, out.witness, **_opts(H))
        end = None if H.end is None else (list(H.end.darts) if H.end.darts else None)
        h2 = _replay(H.graph, out.witness, closed=H.closed, end=end, holes=H.holes, spikes=H.spikes,
                     simple=H.simple, monotone=H.monotone, mode=H.length)
        assert h1 == h2 == out.upper
    return out


def _tiny(seed, weighted=True, n=None):
    rng = random.Random(seed)
    P = generators.delaunay(n or rng.randint(4, 5), seed=seed)
    if weighted:
        P = P.with_weights([rng.randint(1, 3) for _ in range(P.number_of_edges())])
    return P


def _random_start(P, rng, flips, keep_winding=False):
    """A face boundary moved by a few random flips (moves from the reference's brute-force list)."""
    sp = WalkSpace.build(P)
    H0 = HomotopyProblem.build(P)
    inner = [f for f in P.faces if f != P.outer_face]
    d = P.face_darts(rng.choice(inner))
    c = Curve(tuple(d), P.tail_index(d[0]))
    for _ in range(flips):
        ms = [(new, nv) for mv, new, nv in legal_moves(H0, c.darts, c.vertex)
              if mv["op"] == "flip" and 0 < len(new) <= 7
              and (not keep_winding or max(map(abs, sp.winding(new))) <= 1)]
        if not ms:
            break
        c = Curve(*rng.choice(ms))
    return H0.to_json(c)


# ---------------------------------------------------------------- unit facts
def test_least_rotation_matches_brute_force():
    # common practice: the least rotation is the minimum over all rotations
    rng = random.Random(5)
    for _ in range(300):
        w = tuple(rng.randrange(4) for _ in range(rng.randrange(1, 9)))
        assert least_rotation(w) == min(w[i:] + w[:i] for i in range(len(w)))


def test_triangle_boundary_height_is_its_length():
    # a single triangle: the boundary (length 3) is flipped away in one move (definition)
    P = PlaneGraph.from_faces([[0, 1, 2]])
    out = _checked(HomotopyProblem.build(P))
    assert out.optimal and out.upper == 3


def test_grid_disks_from_the_boundary():
    # lower bound: a homotopy's height is at least its start length 4k (definition); the search
    # finds a homotopy of exactly that height; k = 2 is confirmed by the spec-literal brute force
    for k in (1, 2, 3, 4):
        P = generators.triangulated_grid(k)
        out = _checked(HomotopyProblem.build(P))
        assert out.optimal and out.upper == 4 * k
    P = generators.triangulated_grid(1)
    assert _brute_height(P, _ccw_boundary(P), limit=6) == 4


def test_open_walk_across_a_square():
    # left path to right path across one square split in two triangles (vertex labels (i, j))
    P = generators.triangulated_grid(1)
    H = HomotopyProblem.build(P, s=(0, 0), t=(1, 1))
    out = _checked(H)
    ref, _ = reference_height(H, 10)
    assert out.optimal and out.upper == ref
    s = tuple(H.start.darts)
    assert out.upper == _brute_height(P, s, end=tuple(H.end.darts), closed=False, limit=6)


@pytest.mark.parametrize("opts", [{}, {"length": "vertices"}, {"spikes": False}, {"simple": True}, {"monotone": True}],
                         ids=["plain", "vertices", "nospikes", "simple", "monotone"])
def test_variants_on_a_small_disk_match_the_reference(opts):
    P = _tiny(11, True, n=5)
    H = HomotopyProblem.build(P, **opts)
    out = _checked(H)
    ref, _ = reference_height(H, out.upper)
    assert out.optimal and out.upper == ref


@pytest.mark.slow
@pytest.mark.parametrize("opts", [{"length": "vertices"}, {"spikes": False}, {"simple": True}, {"monotone": True}],
                         ids=["vertices", "nospikes", "simple", "monotone"])
def test_variants_on_a_grid_disk_match_the_reference(opts):
    # about 3 minutes in all: the reference BFS is the slow side
    P = generators.triangulated_grid(2)
    P = P.with_weights([1 + (e % 3) for e in range(P.number_of_edges())])
    H = HomotopyProblem.build(P, **opts)
    out = _checked(H)
    ref, _ = reference_height(H, out.upper)
    assert out.optimal and out.upper == ref


def test_annulus_not_homotopic_is_infeasible():
    # the boundary of a hole face cannot be contracted when that face is a hole (winding invariant)
    P = generators.triangulated_grid(2)
    f = P.face_of_dart(P.dart_between((0, 0), (1, 0)))
    d = P.face_darts(f)
    H = HomotopyProblem.build(P, start={"vertex": P.tail(d[0]), "darts": d}, holes=[P.outer_face, f])
    out = search_homotopy(H)
    assert out.stats.get("infeasible") and "winding" in out.stats["reason"]


@pytest.mark.parametrize("seed", [3, 8, 21])
def test_annulus_boundary_to_hole_matches_the_reference(seed):
    # holes {outer, f}: the outer boundary (counterclockwise) is homotopic to the boundary of f
    # (both wind once around f); compare with the reference BFS
    P = _tiny(seed, True, n=5)
    inner = [g for g in P.faces if g != P.outer_face]
    f = inner[seed % len(inner)]
    start = _ccw_boundary(P)
    e = P.face_darts(f)
    H = HomotopyProblem.build(P, start={"vertex": P.tail(start[0]), "darts": list(start)},
                              end={"vertex": P.tail(e[0]), "darts": e}, holes=[P.outer_face, f])
    out = _checked(H)
    assert out.optimal
    assert reference_height(H, out.upper)[0] == out.upper


def test_monotone_needs_windings_at_most_one():
    # a face boundary traversed twice has winding number 2: no monotone homotopy (each flip
    # changes one winding number by one), while the general one exists
    P = generators.triangulated_grid(1)
    f = next(f for f in P.faces if f != P.outer_face)
    d = P.face_darts(f) * 2
    H = HomotopyProblem.build(P, start={"vertex": P.tail(d[0]), "darts": d}, monotone=True)
    out = search_homotopy(H)
    assert out.stats.get("infeasible") and "winding number" in out.stats["reason"]
    out = _checked(HomotopyProblem.build(P, start={"vertex": P.tail(d[0]), "darts": d}))
    assert out.optimal and out.upper == _brute_height(P, d, limit=8)


def test_bad_problem_is_a_clear_error():
    with pytest.raises(SweepwidthError, match="HomotopyProblem"):
        search_homotopy(42)


def test_deadline_is_honoured_with_valid_bounds():
    # a weighted Delaunay disk large enough that the exact search cannot finish in 2 s
    P = generators.delaunay(60, seed=3)
    rng = random.Random(1)
    P = P.with_weights([rng.randint(1, 9) for _ in range(P.number_of_edges())])
    H = HomotopyProblem.build(P)
    t = time.monotonic()
    out = _checked(H, deadline=t + 2.0, use_homology=False)
    assert time.monotonic() - t < 3.0
    assert not out.optimal
    assert out.lower >= H.length_of(H.start)
    assert out.upper is None or out.lower <= out.upper


def test_progress_reports_improving_bounds():
    P = sw.read(os.path.join(ROOT, "instances", "sweeps", "split-delaunay-171.json"))
    H = HomotopyProblem.build(P, start=P.meta["curves"]["start"])
    seen = []
    out = _checked(H, progress=seen.append, use_homology=False)
    assert seen and all(a.lower <= b.lower for a, b in zip(seen, seen[1:]))
    assert all(r.upper is None or r.upper >= out.upper for r in seen)


# ---------------------------------------------------------------- research instances
def test_split_instance_homotopy_exceeds_homology():
    # value cross-checked by tests/reference_homotopy.py (no homotopy of height <= 14, 12 s; too slow
    # to repeat here) and the homology width by sw.homology_width (another developer's solver)
    P = sw.read(os.path.join(ROOT, "instances", "sweeps", "split-delaunay-171.json"))
    H = HomotopyProblem.build(P, start=P.meta["curves"]["start"])
    hw = sw.homology_width(P, start=P.meta["curves"]["start"])
    out = _checked(H)
    assert out.optimal and out.upper == P.meta["known"]["homotopy"]["value"] == 15
    assert hw.value == P.meta["known"]["homology"]["value"] == 14 < out.upper


def test_backtrack_instance_monotone_is_worse():
    P = sw.read(os.path.join(ROOT, "instances", "sweeps", "backtrack-delaunay-2454.json"))
    start = P.meta["curves"]["start"]
    out = _checked(HomotopyProblem.build(P, start=start))
    assert out.optimal and out.upper == P.meta["known"]["homotopy"]["value"]
    # no monotone homotopy at all: the faces of winding number 0 are never flipped by one, and
    # without them the curve is not contractible (free-group test of the dispatcher's module)
    mono = search_homotopy(HomotopyProblem.build(P, start=start, monotone=True))
    assert mono.stats.get("infeasible") and "never flipped" in mono.stats["reason"]
    assert mono.lower > out.upper
    # without the obstacle test the search alone proves a strictly larger monotone height
    # (every walk below general + 1 explored under the winding rule)
    P2 = sw.read(os.path.join(ROOT, "instances", "sweeps", "backtrack-delaunay-2026.json"))
    H2 = HomotopyProblem.build(P2, start=P2.meta["curves"]["start"], monotone=True)
    g2 = P2.meta["known"]["homotopy"]["value"]
    import sweepwidth.solve.homotopy.search as hs

    saved = hs._obstacle_test
    hs._obstacle_test = lambda *a: None
    try:
        b = search_homotopy(H2, upper=g2 + 1, use_homology=False)
    finally:
        hs._obstacle_test = saved
    assert b.lower > g2 and b.stats.get("reason") == "no homotopy of height below the given upper bound"


def test_small_backtrack_instance_against_the_reference():
    # general 8 < monotone 9: both values also from the reference BFS (another developer's code)
    P = sw.read(os.path.join(ROOT, "instances", "sweeps", "backtrack-delaunay-1169.json"))
    start = P.meta["curves"]["start"]
    for mono, value in ((False, 8), (True, 9)):
        H = HomotopyProblem.build(P, start=start, monotone=mono)
        out = _checked(H)
        assert out.optimal and out.upper == value
        assert reference_height(H, value)[0] == value
        assert reference_height(H, value - 1)[0] is None


def test_backtrack_instance_needs_exactly_one_repeated_face():
    # with no repeated face (monotone) the optimum is out of reach (above); one repeated face suffices
    P = sw.read(os.path.join(ROOT, "instances", "sweeps", "backtrack-delaunay-2454.json"))
    H = HomotopyProblem.build(P, start=P.meta["curves"]["start"])
    out = _checked(H, max_repeated_faces=1)
    assert out.optimal and out.upper == P.meta["known"]["homotopy"]["value"]
    with pytest.raises(SweepwidthError, match="max_repeated_faces"):
        search_homotopy(H, max_repeated_faces=-1)


def test_ladder_needs_one_repeated_face():
    # detour-ladder-2: monotone 14 > general 13; one re-flipped face is enough (values in the instance file)
    P = sw.read(os.path.join(ROOT, "instances", "sweeps", "detour-ladder-2.json"))
    start = P.meta["curves"]["start"]
    H = HomotopyProblem.build(P, start=start)
    g = P.meta["known"]["homotopy"]["value"]
    assert _checked(H).upper == g
    assert _checked(HomotopyProblem.build(P, start=start, monotone=True)).upper == \
        P.meta["known"]["homotopy_monotone"]["value"] > g
    none = search_homotopy(H, max_repeated_faces=0, upper=g + 1, use_homology=False)
    assert none.lower > g
    one = _checked(H, max_repeated_faces=1)
    assert one.optimal and one.upper == g


# ---------------------------------------------------------------- regressions
def test_regression_homology_bound_is_the_non_monotone_width():
    # bug: the search clamped at the MONOTONE homology width (14) of this interior curve, above
    # its true homotopy height 13 (a homotopy that toggles a face twice mod 2); the non-monotone
    # width (13) is the valid bound.  A ladder of two squares with outside detour triangles.
    w = {"t": 1, "b": 3, "d": 6, "ta": 5, "tb": 5, "ba": 1, "bb": 1, "r0": 3, "r1": 1, "ri": 4}
    P, s = _ladder(2, w)
    H = HomotopyProblem.build(P, start=s)
    out = _checked(H)
    assert out.optimal and out.upper == 13
    assert sw.homology_width(P, start=H.to_json(H.start), monotone=False).value == 13
    assert reference_height(H, 12)[0] is None



def test_regression_dive_is_time_boxed():
    # bug: the greedy dive ran 35 s on this instance before the exact search (which needs 74 states)
    P = sw.read(os.path.join(ROOT, "instances", "sweeps", "backtrack-delaunay-2454.json"))
    t = time.monotonic()
    out = search_homotopy(HomotopyProblem.build(P, start=P.meta["curves"]["start"]), use_homology=False)
    assert out.optimal and time.monotonic() - t < 15


def test_regression_point_is_not_simple_midway():
    # bug: a point was accepted as a simple curve in the middle of a simple homotopy
    P = generators.triangulated_grid(1)
    f = next(f for f in P.faces if f != P.outer_face)
    d = P.face_darts(f)
    end_f = next(g for g in P.faces if g not in (f, P.outer_face))
    e = P.face_darts(end_f)
    H = HomotopyProblem.build(P, start={"vertex": P.tail(d[0]), "darts": d},
                              end={"vertex": P.tail(e[0]), "darts": e}, simple=True)
    out = _checked(H)
    ref, _ = reference_height(H, 10)
    assert out.optimal and out.upper == ref


# ---------------------------------------------------------------- random cross-checks
VARIANTS = [{}, {"spikes": False}, {"length": "vertices"}, {"simple": True}, {"monotone": True}]


@settings(max_examples=30, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(seed=st.integers(0, 10_000), weighted=st.booleans(), variant=st.integers(0, len(VARIANTS) - 1),
       interior=st.booleans(), flips=st.integers(0, 2))
@example(seed=0, weighted=True, variant=0, interior=True, flips=2)
def test_against_reference_on_tiny_disks(seed, weighted, variant, interior, flips):
    rng = random.Random(seed)
    P = _tiny(seed, weighted)
    opts = dict(VARIANTS[variant])
    start = _random_start(P, rng, flips, keep_winding=True) if interior else None
    H = HomotopyProblem.build(P, start=start, **opts)
    out = _checked(H, deadline=time.monotonic() + 20)
    if out.stats.get("infeasible"):
        assert reference_height(H, 12)[0] is None
        return
    assert out.optimal
    ref, _ = reference_height(H, out.upper)
    assert ref == out.upper


@settings(max_examples=15, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(seed=st.integers(0, 10_000), interior=st.booleans())
def test_between_homology_and_constructed_homotopy(seed, interior):
    # homology width <= homotopy height <= the bounded mode's constructed homotopy (definitions: reduce mod 2; the bound is a witness)
    rng = random.Random(seed)
    P = _tiny(seed, True, n=rng.randint(5, 7))
    start = _random_start(P, rng, 2) if interior else None
    H = HomotopyProblem.build(P, start=start)
    out = _checked(H, deadline=time.monotonic() + 20)
    assert out.optimal
    # the mod-2 image of a homotopy may toggle faces twice: compare with the non-monotone width
    hw = sw.homology_width(P, start=H.to_json(H.start), monotone=False)
    assert hw.lower <= out.upper
    b = sw.homotopy_height(P, start=H.to_json(H.start), method="bounds")
    assert b.lower <= out.upper <= b.upper


# ------------------------------------------------------- memory limit (issue 10)
def test_search_memory_is_estimated_before_it_starts():
    from sweepwidth.errors import ProblemTooLargeError
    from sweepwidth.generators import triangulated_grid

    P = triangulated_grid(6)
    with pytest.raises(ProblemTooLargeError, match="max_memory") as info:
        sw.homotopy_height(P, method="search", max_memory=100_000)
    assert isinstance(info.value, MemoryError)  # also the matching builtin
    with pytest.raises(sw.SweepwidthError, match="max_memory"):
        sw.homotopy_height(P, method="search", max_memory=-5)


def test_search_stops_at_its_memory_limit():
    # issue 10: 'search' on 200 vertices grew past 1.6 GB with no limit; now the stored states
    # are counted and the search stops at max_memory (traced memory stays near it)
    import tracemalloc

    from sweepwidth.errors import ProblemTooLargeError
    from sweepwidth.generators import delaunay

    P = delaunay(200, seed=1)  # ~900 000 walk states (~0.9 GB) in 15 s without a limit (measured)
    limit = 4 << 20
    tracemalloc.start()
    try:
        with pytest.raises(ProblemTooLargeError, match="max_memory") as info:
            sw.homotopy_height(P, method="search", max_memory=limit, time_limit=120)
        _, peak = tracemalloc.get_traced_memory()
    finally:
        tracemalloc.stop()
    assert "bounds [" in str(info.value)
    assert peak < 4 * limit + (16 << 20), peak  # the states, plus the graph and the bounds' own work
    # 'auto' keeps its proven bounds instead, and they are sound (the witness replays)
    r = sw.homotopy_height(P, method="auto", max_memory=limit, time_limit=20)
    assert r.lower <= r.upper and r.check(P) == pytest.approx(r.upper)
