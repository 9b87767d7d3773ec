"""The relation between homotopy width and homotopy height by coning the two walks.

Construction
------------
Let A and B be vertex-disjoint simple paths running along the boundary of
the outer face of P (each a run of consecutive darts of the outer face's
boundary walk, in either orientation), with the outer face a hole.  Put a
new vertex ``x_A`` in the outer face and join it to every ``a_k`` by a *cone
edge* ``c_k`` of weight ``M``, so that each ``x_A a_{k-1} a_k`` bounds a
triangular face ``T_k``; the same for B with ``x_B``.  Call the result
``P^M``.  Its outer face (the rest of the old one) is a hole; the triangles
may be flipped.  The *coned height problem* is the path form of the
homotopy height on ``P^M`` from ``s = x_A`` to ``t = x_B``, with start
``c_0 . L_start . c'_0`` and end ``c_p . L_end . c'_q`` (cone edges read
from ``x_A`` and towards ``x_B``), the same holes, spikes and simplicity.
For the vertex-count convention the leash edges get weight 1 (a leash of
``k`` darts has ``k + 1`` vertices).

Theorem
-------
Let ``w_back`` be the homotopy width with backward steps allowed, ``w`` the
forward-only one, ``h`` the height of the coned problem and ``M > w_back``
(so ``M`` larger than the width of any known sweep suffices).  Write
``e = 1`` for the vertex-count convention and ``e = 0`` otherwise.  Then

* ``h - 2M + e <= w_back <= w`` always, and
* ``h - 2M + e = w_back`` when spikes are allowed or leashes are simple.

Proof.  (Upper bound on ``h``.)  Map a state ``(i, j, L)`` to the path
``c_i . L . c'_j``, of length ``2M + |L|`` (minus ``e``).  A flip, spike or
unspike of L is the same move one position further on; an endpoint step of
A from ``i`` to ``i + 1`` that adds ``alpha_{i+1}`` reversed is the flip of
``T_{i+1}`` replacing ``c_i`` by ``c_{i+1} . alpha_{i+1}^-1``, and one that
cancels ``alpha_{i+1}`` is the flip of ``T_{i+1}`` replacing
``c_i . alpha_{i+1}`` by ``c_{i+1}``; backward steps are the inverse flips,
and the steps of B the mirror images at ``x_B``.  So every width sweep,
backward steps allowed, is a homotopy of height ``2M + width - e``.

(Lower bound on ``h``.)  Take an optimal coned homotopy; its height is at
most ``2M + w_back - e < 4M``.  A path from ``x_A`` to ``x_B`` uses an odd
number of cone edges at ``x_A`` (each visit inside the path uses two more)
and an odd number at ``x_B``, so each path of the homotopy uses exactly one
of each: it is ``c_i . L . c'_j`` with L a walk of P from ``a_i`` to
``b_j``.  A move between two such paths either changes only L (a flip of
a face of P, whose boundary holds no cone edge, or a spike or unspike of a
dart of P) or flips a cone triangle at the first or last dart.  The
contiguous pieces of the path along ``T_k`` that contain ``x_A`` start with
the first dart, so the flip is one of the four steps above or the flip that
replaces ``c_i`` by ``c_{i+1} . alpha_{i+1}^-1`` while L starts with
``alpha_{i+1}``.  That last move is the cancelling step followed by a spike
of the same edge, whose intermediate leash is shorter; spikes on cone
edges, whole-triangle insertions and the flip of ``alpha_k`` inside L would
add cone edges.  Hence, with spikes allowed, the homotopy becomes a width
sweep of the same height minus ``2M - e``; with simple paths the extra
move never applies (``alpha^-1 alpha`` is not simple) and the others keep
simplicity.  Without spikes and without simplicity the extra move has no
counterpart, which leaves the inequality.  Forward-only sweeps are special
sweeps, so ``w_back <= w``.  QED.

So the height solver bounds the width from below (and decides it with
backward steps), and each solver checks the other on small instances
(``tests/test_width_coning.py``).
"""

from __future__ import annotations

from typing import Any

from ...errors import InvalidCurveError, InvalidEmbeddingError
from ...plane import PlaneGraph
from ..contract import Deadline

__all__ = ["ConedInstance", "cone_instance", "coned_height"]


class ConedInstance(dict):
    """The coned height problem: keys 'graph', 's', 't', 'start', 'end', 'holes', 'spikes', 'simple', 'M', 'offset'.

    ``offset`` is ``2M - e``: the width with backward steps is ``height - offset``.
    """


def _fresh(P: Any, base: str) -> str:
    lab = base
    while P.has_vertex(lab):
        lab += "'"
    return lab


def _corners(P: Any, W: Any, walk: Any) -> tuple[list[tuple[int, int]], bool]:
    """Per vertex of the walk, the outer-face corner ``(d_in, d_out)`` the cone edge goes into."""
    outer = P.outer_face
    darts = list(walk.darts)
    verts = [walk.vertex] + [W.head[d] for d in darts]
    if len(set(verts)) != len(verts):
        raise InvalidCurveError("coning needs walks a and b without repeated vertices")
    fw = list(P.face_darts(outer))
    pred = {P.face_next(d): d for d in fw}
    if not darts:
        out = [d for d in fw if W.tail[d] == verts[0]]
        if len(out) != 1:
            raise InvalidCurveError("coning: a one-vertex walk must meet the outer boundary exactly once")
        return [(pred[out[0]], out[0])], True
    if all(P.face_of_dart(d) == outer for d in darts) and all(P.face_next(x) == y for x, y in zip(darts, darts[1:])):
        cs = [(pred[darts[0]], darts[0])] + list(zip(darts, darts[1:])) + [(darts[-1], P.face_next(darts[-1]))]
        return cs, True
    rev = [d ^ 1 for d in darts]
    if all(P.face_of_dart(d) == outer for d in rev) and all(P.face_next(y) == x for x, y in zip(rev, rev[1:])):
        cs = [(rev[0], P.face_next(rev[0]))] + [(y, x) for x, y in zip(rev, rev[1:])] + [(pred[rev[-1]], rev[-1])]
        return cs, False
    raise InvalidCurveError("coning needs walks a and b that run along the outer face's boundary")


def cone_instance(W: Any, M: float) -> ConedInstance:
    """Build the coned height problem of a width problem (see the module docstring).

    Parameters
    ----------
    W : WidthProblem
        A and B disjoint simple paths along the outer boundary; the outer face a hole.
    M : float
        Weight of the cone edges; the theorem needs ``M`` above the backward width.

    Returns
    -------
    ConedInstance

    Raises
    ------
    InvalidCurveError
        When the walks do not fit the construction.

    Examples
    --------
    >>> from sweepwidth.generators import grid
    >>> from sweepwidth.problems.width import WidthProblem
    >>> P = grid(2, 3)
    >>> W = WidthProblem.build(P, {"vertices": [(0, 0), (0, 1), (0, 2)]}, {"vertices": [(1, 0), (1, 1), (1, 2)]})
    >>> C = cone_instance(W, 10)
    >>> C["graph"].number_of_faces() - P.number_of_faces(), C["offset"]
    (4, 20.0)
    """
    P = W.graph
    if P.outer_face not in W.holes:
        raise InvalidCurveError("coning needs the outer face as a hole")
    if set(W.a_vertices) & set(W.b_vertices):
        raise InvalidCurveError("coning needs walks a and b without common vertices")
    ca, _ = _corners(P, W, W.a)
    cb, _ = _corners(P, W, W.b)
    n, m = P.number_of_vertices(), P.number_of_edges()
    xa_lab = _fresh(P, "cone-a")
    xb_lab = _fresh(P, "cone-b")
    xa, xb = n, n + 1
    labels = list(P.vertices) + [xa_lab, xb_lab]
    ends = [(P.tail_index(2 * e), P.head_index(2 * e)) for e in range(m)]
    if W.weight == "weight":
        weights = [float(P.weight(e)) for e in range(m)]
    else:
        weights = [1.0] * m
    nxt = [P.next_dart(d) for d in range(2 * m)]
    prv = [P.prev_dart(d) for d in range(2 * m)]
    cone_a: list[int] = []
    cone_b: list[int] = []
    for verts, corners, x, store in ((W.a_vertices, ca, xa, cone_a), (W.b_vertices, cb, xb, cone_b)):
        for v, (d_in, d_out) in zip(verts, corners):
            e = len(ends)
            ends.append((v, x))
            weights.append(float(M))
            c = 2 * e
            nxt += [0, 0]
            prv += [0, 0]
            # c goes into the angle clockwise from rev(d_in) to d_out (face_next(d) = prev(d ^ 1))
            r = d_in ^ 1
            prv[r], nxt[c], prv[c], nxt[d_out] = c, r, d_out, c
            store.append(c)
    last: Exception | None = None
    for oa in (1, -1):
        for ob in (1, -1):
            nn = list(nxt)
            for darts, o in ((cone_a, oa), (cone_b, ob)):
                at = [c ^ 1 for c in darts][::o]
                for k, d in enumerate(at):
                    nn[d] = at[(k + 1) % len(at)]
            try:
                Q = PlaneGraph(labels, ends, weights, nn)
            except InvalidEmbeddingError as err:
                last = err
                continue
            outer = [f for f in range(Q.number_of_faces())
                     if {xa, xb} <= {Q.tail_index(d) for d in Q.face_darts(f)}]
            if len(outer) != 1:
                continue
            tri_ok = all(len(Q.face_darts(Q.face_of_dart(c))) == 3 or len(Q.face_darts(Q.face_of_dart(c ^ 1))) == 3
                         for c in cone_a[1:] + cone_b[1:])
            if not tri_ok:
                continue
            Q = PlaneGraph(labels, ends, weights, nn, outer=outer[0])
            holes = (set(W.holes) - {P.outer_face}) | {outer[0]}
            start = [cone_a[0] ^ 1] + list(W.start.darts) + [cone_b[0]]
            end = [cone_a[-1] ^ 1] + list(W.end.darts) + [cone_b[-1]]
            ex = 1.0 if W.weight == "vertices" else 0.0
            return ConedInstance(graph=Q, s=xa_lab, t=xb_lab, start=start, end=end, holes=holes,
                                 spikes=W.spikes, simple=W.simple, M=float(M), offset=2.0 * float(M) - ex)
    raise InvalidCurveError(f"coning: no planar placement of the cone vertices found ({last})")


def coned_height(W: Any, M: float, *, method: str = "auto", deadline: Deadline | None = None,
                 seed: int | None = None) -> tuple[Any, ConedInstance]:
    """``(homotopy height Result of the coned problem, the instance)``, solved under ``deadline`` (default none)."""
    from ...problems.homotopy import HomotopyProblem
    from ..homotopy import solve_problem as solve_height

    C = cone_instance(W, M)
    H = HomotopyProblem.build(C["graph"], start=C["start"], end=C["end"], s=C["s"], t=C["t"], holes=C["holes"],
                              spikes=C["spikes"], simple=C["simple"])
    r = solve_height(H, method=method, deadline=deadline if deadline is not None else Deadline.from_limit(None),
                     seed=seed)
    return r, C


def closed_cone(W: Any, M: float) -> dict:
    """One cone vertex ``x`` over both walks: leashes become closed walks ``x a_i L b_j x``.

    Used for the homology lower bound (:func:`homology_lower`).  Needs the
    default leashes (the boundary arcs between A and B): then the old outer
    face splits into the cone triangles and two faces ``R_0``, ``R_1``
    bounded by the start and end loops, which become the holes.

    Returns a dict with 'graph', 'x' (label), 'start', 'end' (dart lists of
    the loops), 'holes', 'M', 'offset' (``2M - e``).
    """
    from ...problems.width import default_leashes

    P = W.graph
    if W.holes != frozenset({P.outer_face}):
        raise InvalidCurveError("the closed cone needs the outer face as the only hole")
    ds, de = default_leashes(P, W.a, W.b, W.tail, W.head)
    if tuple(ds.darts) != tuple(W.start.darts) or tuple(de.darts) != tuple(W.end.darts):
        raise InvalidCurveError("the closed cone needs the default leashes (the boundary arcs)")
    ca, _ = _corners(P, W, W.a)
    cb, _ = _corners(P, W, W.b)
    n, m = P.number_of_vertices(), P.number_of_edges()
    x_lab = _fresh(P, "cone")
    x = n
    labels = list(P.vertices) + [x_lab]
    ends = [(P.tail_index(2 * e), P.head_index(2 * e)) for e in range(m)]
    weights = [float(P.weight(e)) if W.weight == "weight" else 1.0 for e in range(m)]
    nxt = [P.next_dart(d) for d in range(2 * m)]
    prv = [P.prev_dart(d) for d in range(2 * m)]
    outer = list(P.face_darts(P.outer_face))
    where = {W.tail[d]: k for k, d in enumerate(outer)}
    cone_a: list[int] = []
    cone_b: list[int] = []
    cone: list[tuple[int, int]] = []
    for verts, corners, store in ((W.a_vertices, ca, cone_a), (W.b_vertices, cb, cone_b)):
        for v, (d_in, d_out) in zip(verts, corners):
            e = len(ends)
            ends.append((v, x))
            weights.append(float(M))
            c = 2 * e
            nxt += [0, 0]
            prv += [0, 0]
            r = d_in ^ 1
            prv[r], nxt[c], prv[c], nxt[d_out] = c, r, d_out, c
            store.append(c)
            cone.append((where[v], c))
    cone.sort()
    for o in (1, -1):
        nn = list(nxt)
        at = [c ^ 1 for _, c in cone][::o]
        for k, d in enumerate(at):
            nn[d] = at[(k + 1) % len(at)]
        try:
            Q = PlaneGraph(labels, ends, weights, nn)
        except InvalidEmbeddingError:
            continue
        arc = set(W.start.darts) | set(W.end.darts)
        side = {d for d in outer if d in arc or d ^ 1 in arc}
        holes = {Q.face_of_dart(d) for d in side}
        if len(holes) != 2:
            continue
        start = [cone_a[0] ^ 1] + list(W.start.darts) + [cone_b[0]]
        end = [cone_a[-1] ^ 1] + list(W.end.darts) + [cone_b[-1]]
        ex = 1.0 if W.weight == "vertices" else 0.0
        return {"graph": Q, "x": x_lab, "start": start, "end": end, "holes": holes, "M": float(M),
                "offset": 2.0 * float(M) - ex}
    raise InvalidCurveError("closed cone: no planar placement of the cone vertex found")


def homology_lower(W: Any, M: float, *, deadline: Deadline | None = None) -> tuple[float | None, str]:
    """A proven lower bound on the homotopy width from the homology sweep of the closed cone.

    Map each state ``(i, j, L)`` to the closed walk ``x a_i L b_j x`` of
    :func:`closed_cone`: a flip of a face of P toggles that face, an
    endpoint step toggles a cone triangle, spikes change nothing, and the
    length grows by ``2M`` (less ``e``).  Reducing mod 2 gives a homology
    sweep from the start loop to the end loop of no greater weight, so
    ``homology width - 2M + e`` bounds every sweep, forward or backward.
    The sweep goes from the boundary of the hole ``R_0`` to that of all
    faces but ``R_1``, bottom to top, where the non-monotone homology width
    equals the monotone one (Brightwell and Winkler), which the homology
    solver computes or bounds from below on large instances.

    Returns ``(bound or None, note)``.

    References
    ----------
    .. [1] G. Brightwell and P. Winkler, "Submodular percolation", SIAM J. Discrete
       Math. 23(3), 2009.
    """
    from ...errors import SweepwidthError
    from ...problems.cycles import HomologyProblem
    from ..homology import solve_problem as solve_homology

    try:
        C = closed_cone(W, M)
    except SweepwidthError as err:
        return None, f"closed cone not available: {err}"
    try:
        hp = HomologyProblem.build(C["graph"], {"vertex": C["x"], "darts": C["start"]},
                                   {"vertex": C["x"], "darts": C["end"]}, C["holes"])
        r = solve_homology(hp, deadline=deadline if deadline is not None else Deadline.from_limit(None),
                           monotone=False)
    except SweepwidthError as err:
        return None, f"homology bound not available: {err}"
    if r.lower is None or r.status == "infeasible":
        return None, "homology bound: no value"
    return float(r.lower) - C["offset"], f"homology width of the closed cone ({r.status}, {r.method}) - 2M"
