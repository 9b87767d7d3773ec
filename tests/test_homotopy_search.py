"""Tests of the exact homotopy-height search (sweepwidth.solve.homotopy_search).

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

import time
from collections import deque

import pytest
from hypothesis import HealthCheck, example, given, settings
from hypothesis import strategies as st

from sweepwidth import generators
from sweepwidth.plane import PlaneGraph
from sweepwidth.solve._walks import WalkSpace, least_rotation
from sweepwidth.solve.homotopy_search import WalkSpec, search_homotopy


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
                for k in range(0, m + 1):
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


def _solve(P, start, **kw):
    start = tuple(start)
    end = kw.pop("end", None)
    sv = P.tail_index(start[0]) if start else kw.pop("vertex")
    spec = WalkSpec(P, start, sv, end_darts=None if end is None else tuple(end),
                    end_vertex=(P.tail_index(end[0]) if end else sv) if end is not None else None, **kw)
    return search_homotopy(spec, use_homology=False)


def _check(P, out, start, **kw):
    """Replay the witness (own replayer, and the project's checker when present)."""
    assert out.optimal
    h = _replay(P, out.witness, **kw)
    assert h == out.upper
    return h


# ---------------------------------------------------------------- unit facts
def test_least_rotation_matches_brute_force():
    # common practice: the least rotation is the minimum over all rotations
    import random

    rng = random.Random(5)
    for _ in range(300):
        w = tuple(rng.randrange(4) for _ in range(rng.randrange(1, 9)))
        assert least_rotation(w) == min(w[i:] + w[:i] for i in range(len(w)))


def test_triangle_boundary_height_is_its_length():
    # a single triangle: the boundary (length 3) is flipped away in one move
    P = PlaneGraph.from_faces([[0, 1, 2]])
    start = _ccw_boundary(P)
    out = _solve(P, start)
    assert _check(P, out, start) == 3


def test_grid_disk_boundary_height_equals_its_length():
    # from memory (and re-derived by the brute force below for k <= 2): a convex
    # triangulated grid disk can be swept from its boundary without ever
    # exceeding the boundary length 4k (cut corners, then peel rows)
    for k in (1, 2, 3):
        P = generators.triangulated_grid(k)
        start = _ccw_boundary(P)
        out = _solve(P, start)
        assert _check(P, out, start) == 4 * k
    P = generators.triangulated_grid(2)
    assert _brute_height(P, _ccw_boundary(P), limit=8) == 8


def test_open_walk_across_a_square():
    # left path to right path across one square split in two triangles (vertex labels (i, j))
    P = generators.triangulated_grid(1)
    a, b, c, d = (0, 0), (1, 0), (1, 1), (0, 1)
    s = (P.dart_between(a, b), P.dart_between(b, c))
    e = (P.dart_between(a, d), P.dart_between(d, c))
    out = _solve(P, s, end=e, closed=False)
    h = _replay(P, out.witness, closed=False, end=e)
    assert out.optimal and h == out.upper
    assert out.upper == _brute_height(P, s, end=e, closed=False, limit=6)


def test_vertex_mode_and_no_spikes():
    P = generators.triangulated_grid(2)
    start = _ccw_boundary(P)
    for kw in ({"length": "vertices"}, {"spikes": False}, {"simple": True}, {"monotone": True}):
        out = _solve(P, start, **kw)
        rk = {"mode": kw["length"]} if "length" in kw else {k: v for k, v in kw.items()}
        _check(P, out, start, **rk)
        bk = {"mode": kw["length"]} if "length" in kw else {k: v for k, v in kw.items() if k != "monotone"}
        if "monotone" not in kw:
            assert out.upper == _brute_height(P, start, limit=10, **bk)


def test_annulus_not_homotopic_is_infeasible():
    # the boundary of a hole face cannot be contracted when that face is a hole
    P = generators.triangulated_grid(2)
    f = P.face_of_dart(P.dart_between((0, 0), (1, 0)))
    start = tuple(P.face_darts(f))
    out = search_homotopy(WalkSpec(P, start, P.tail_index(start[0]), holes=frozenset({P.outer_face, f})),
                          use_homology=False)
    assert out.stats.get("infeasible") and "winding" in out.stats["reason"]


def test_deadline_is_honoured_with_valid_bounds():
    # a weighted Delaunay disk large enough that the exact search cannot finish in 2 s
    P = generators.delaunay(60, seed=3)
    rng = __import__("random").Random(1)
    P = P.with_weights([rng.randint(1, 9) for _ in range(P.number_of_edges())])
    start = _ccw_boundary(P)
    t = time.monotonic()
    out = search_homotopy(WalkSpec(P, start, P.tail_index(start[0])), deadline=t + 2.0, use_homology=False)
    el = time.monotonic() - t
    assert el < 3.0
    assert out.lower >= sum(P.weight(d >> 1) for d in start)
    if out.upper is not None:
        assert out.lower <= out.upper
        assert _replay(P, out.witness) == out.upper


# ---------------------------------------------------------------- random cross-checks
def _tiny_disk(seed, faces, weighted):
    import random

    rng = random.Random(seed)
    n = 3 + faces // 2 + rng.randrange(2)
    P = generators.delaunay(n, seed=seed)
    if weighted:
        P = P.with_weights([rng.randint(1, 3) for _ in range(P.number_of_edges())])
    return P


def _random_closed_walk(P, rng, steps):
    """A random closed walk: a face boundary with a few random flips and spikes applied."""
    inner = [f for f in P.faces if f != P.outer_face]
    f = rng.choice(inner)
    return tuple(P.face_darts(f))


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(seed=st.integers(0, 10_000), weighted=st.booleans(),
       variant=st.sampled_from(["plain", "nospike", "vertices", "simple"]))
@example(seed=0, weighted=True, variant="plain")
def test_against_brute_force_from_boundary(seed, weighted, variant):
    P = _tiny_disk(seed, 4, weighted)
    if P.number_of_faces() > 6:
        return
    start = _ccw_boundary(P)
    kw = {"nospike": {"spikes": False}, "vertices": {"length": "vertices"}, "simple": {"simple": True},
          "plain": {}}[variant]
    out = _solve(P, start, **kw)
    rk = {"mode": kw["length"]} if "length" in kw else dict(kw)
    _check(P, out, start, **rk)
    assert out.upper == _brute_height(P, start, limit=int(out.upper) + 1, **rk)


@settings(max_examples=20, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(seed=st.integers(0, 10_000), weighted=st.booleans(), orient=st.booleans())
def test_against_brute_force_interior_curve(seed, weighted, orient):
    import random

    rng = random.Random(seed)
    P = _tiny_disk(seed, 4, weighted)
    if P.number_of_faces() > 6:
        return
    inner = [f for f in P.faces if f != P.outer_face]
    start = tuple(P.face_darts(rng.choice(inner)))
    if orient:
        start = tuple(d ^ 1 for d in reversed(start))
    out = _solve(P, start)
    _check(P, out, start)
    assert out.upper == _brute_height(P, start, limit=int(out.upper) + 1)
