"""Constructed leash sweeps: upper bounds with witnesses on large instances.

Construction
------------
Follow a grid path ``(0, 0) = c_0, c_1, ..., c_r = (p, q)`` of index pairs
(the one attaining the Fréchet bound of :mod:`.bounds`).  After each
endpoint step to ``c_k = (i, j)`` the leash is, when it is longer than the
shortest-path distance ``d(a_i, b_j)``, swept onto a shortest path from
``a_i`` to ``b_j`` by face flips (and spikes/unspikes): the path-form
homotopy constructed by :func:`sweepwidth.solve.homotopy.construct_homotopy`
between the two walks with the same ends, greedy by length.  When that
construction fails (e.g. the shortest path is in another homotopy class
around a hole) the leash is kept as it is.  At ``(p, q)`` the leash is swept
onto the end leash; a construction that cannot reach it gives no sweep.

Improvement
-----------
Several variants are built and the narrowest kept: the shortest paths taken
from the tree of ``a_i`` or of ``b_j``, and a slack ``s`` (retarget only
when the leash is more than ``s`` longer than the distance; a lazier leash
moves less and sometimes stays shorter over the next steps).  Every
variant's witness is replayed by the independent checker before it is
used.  When the walks fit the coning construction of :mod:`.coning`, the
height dispatcher's constructions on the coned instance (spectral,
straight-line and greedy face orders) are translated back into a leash
sweep too (:func:`coned_construction`).  The split sweeps of
:mod:`.splitting` (middle leashes through vertices halfway between two
leashes, recursively) and their local improvement (exact re-solves of
windows around the widest crossing) are the strongest constructions on
large disks; :func:`best_constructed` runs them all under the deadline.

Time: O(r) homotopy constructions, each O(M * L) for M moves and leashes of
length at most L, plus ``p + q + 2`` runs of Dijkstra's algorithm.
"""

from __future__ import annotations

import dataclasses
import time
from typing import Any

from ...problems.homotopy import Curve
from ..contract import Deadline
from ..homotopy import bfs_rank, construct_homotopy
from .bounds import distances_from, frechet_bound, leash_distances

__all__ = ["construct_sweep", "best_constructed", "coned_construction"]


def _path_to(par: list[int], tail: tuple, src: int, dst: int) -> tuple | None:
    if src == dst:
        return ()
    out = []
    v = dst
    while v != src:
        d = par[v]
        if d < 0:
            return None
        out.append(d)
        v = tail[d]
    return tuple(reversed(out))


def construct_sweep(
    W: Any,
    *,
    from_b: bool = False,
    slack: float = 0.0,
    path: list | None = None,
    deadline: float | None = None,
) -> tuple[float, dict] | None:
    """One constructed leash sweep (see the module docstring); ``(width, witness)`` or None.

    Examples
    --------
    >>> from sweepwidth.generators import grid
    >>> from sweepwidth.problems.width import WidthProblem
    >>> P = grid(3, 4)
    >>> W = WidthProblem.build(P, {"vertices": [(0, 0), (0, 1), (0, 2), (0, 3)]},
    ...                        {"vertices": [(2, 0), (2, 1), (2, 2), (2, 3)]})
    >>> construct_sweep(W)[0]
    4.0
    """
    if path is None:
        path = frechet_bound(W, leash_distances(W))[1]
    H0 = W.path
    rank = bfs_rank(H0)
    trees: dict = {}

    def tree(v: int) -> tuple:
        if v not in trees:
            trees[v] = distances_from(W, v)
        return trees[v]


    s = W.initial()
    moves: list = []
    width = W.length_of(s.darts)

    def sweep_to(target: tuple) -> bool:
        nonlocal s, width
        H = dataclasses.replace(H0, start=Curve(s.darts, s.vertex), end=Curve(target, s.vertex))
        got = construct_homotopy(H, rank, greedy=True, deadline=deadline)
        if got is None:
            return False
        h, wit = got
        moves.extend(wit["moves"])
        width = max(width, h)
        s = dataclasses.replace(s, darts=tuple(target))
        return True

    for (i0, j0), (i, j) in zip(path, path[1:]):
        if deadline is not None and time.monotonic() > deadline:
            return None
        if i != i0:
            mv = {"op": "step", "walk": "a", "to": i}
        else:
            mv = {"op": "step", "walk": "b", "to": j}
        s = W.step(s, mv["walk"], mv["to"])
        moves.append(mv)
        width = max(width, W.length_of(s.darts))
        a, b = W.a_vertices[i], W.b_vertices[j]
        if a == b:
            continue
        if from_b:
            dist, par = tree(b)
            rp = _path_to(par, W.tail, b, a)
            target = None if rp is None else tuple(d ^ 1 for d in reversed(rp))
            dab = dist[a]
        else:
            dist, par = tree(a)
            target = _path_to(par, W.tail, a, b)
            dab = dist[b]
        if target is None or target == s.darts:
            continue
        cur = W.length_of(s.darts) - (1.0 if W.weight == "vertices" else 0.0)
        if cur <= dab + slack + 1e-9:
            continue
        sweep_to(target)

    if s.darts != tuple(W.end.darts):
        if not s.darts and not W.end.darts:
            pass
        elif not sweep_to(tuple(W.end.darts)):
            return None
    return width, {"start": W.leash_json(W.start.darts, W.start.vertex), "moves": moves}


#: seconds of local improvement (:func:`.splitting.improve`) when no deadline is given
IMPROVE_SECONDS = 10.0
#: split variants improved locally (the narrowest ones)
IMPROVE_TOP = 3


def best_constructed(W: Any, *, deadline: float | None = None, lower: float | None = None,
                     hard_deadline: float | None = None, quick: bool = False) -> tuple[float, dict, str] | None:
    """The narrowest replayed sweep over the constructions: ``(width, witness, variant)``.

    Order: the split sweep of :mod:`.splitting` (first variant; the
    narrowest construction on every disk measured, and on 10^4 faces about
    as fast as one shortest-leash sweep with its replay), the shortest-leash
    sweeps of :func:`construct_sweep`, the
    coned height construction, the other split variants, then the local improvement of
    the narrowest split sweeps (exact re-solves of windows around their
    widest crossing) in the time left (``IMPROVE_SECONDS`` without a
    deadline).  Every witness is replayed by the independent checker
    (:func:`sweepwidth.verify.width.replay_width`) before it counts; the
    search stops early when a sweep meets ``lower``.  The first split sweep
    may run until ``hard_deadline`` (a later end, e.g. the caller's whole
    time limit) so that a short share still ends with a witness on large
    graphs; everything after it keeps to ``deadline``.  ``quick=True``
    skips the local improvement (on small problems the exact search that
    follows is faster than the window re-solves, while the other
    constructions' tighter upper bound still pays: it prunes the search).
    """
    from ...verify.width import replay_width
    from ...errors import WitnessError
    from . import splitting

    opts = W.options()
    kw = {k: opts[k] for k in ("a", "b", "start", "end", "holes", "backward", "spikes", "simple", "weight")}
    best: tuple[float, dict, str] | None = None

    def late() -> bool:
        return deadline is not None and time.monotonic() > deadline

    def met() -> bool:
        return best is not None and lower is not None and best[0] <= lower + 1e-9

    def consider(got: tuple[float, dict] | None, name: str) -> float | None:
        nonlocal best
        if got is None:
            return None
        try:
            w = replay_width(W.graph, got[1], **kw)
        except WitnessError:
            return None
        if best is None or w < best[0] - 1e-9:
            best = (w, got[1], name)
        return w

    def split_name(v: tuple) -> str:
        return f"split sweep (middle {v[0]:g}, balance {v[1]:g}, {v[2]} candidates)"

    frames_of: list = []

    def run_split(v: tuple, until: float | None = deadline) -> None:
        try:
            fr = splitting.keyframes(W, deadline=until, middle=v[0], balance=v[1], tries=v[2])
            segs = None if fr is None else splitting.crossings(W, fr, until)
        except Exception:  # noqa: BLE001 - a failed variant is skipped, never trusted
            return
        if fr is None or segs is None:
            return
        w = consider(splitting.join(W, segs), split_name(v))
        if w is not None:
            frames_of.append((w, v, fr, segs))

    first = deadline
    if deadline is not None and hard_deadline is not None and hard_deadline > deadline:
        first = hard_deadline
    elif deadline is not None and hard_deadline is None:
        first = deadline
    run_split(splitting.VARIANTS[0], first)
    path = frechet_bound(W, leash_distances(W))[1]
    scale = max([c for c in W.cost if c > 0], default=1.0)
    for from_b, slack in [(False, 0.0), (True, 0.0), (False, 2 * scale), (True, 2 * scale), (False, 5 * scale)]:
        if late() or met():
            break
        try:
            got = construct_sweep(W, from_b=from_b, slack=slack, path=path, deadline=deadline)
        except Exception:  # noqa: BLE001 - a failed variant is skipped, never trusted
            continue
        consider(got, f"shortest leashes from {'b' if from_b else 'a'}, slack {slack:g}")
    if not late() and not met():
        M = (best[0] if best is not None else sum(W.cost)) + 1.0
        try:
            got = coned_construction(W, M, deadline=deadline)
        except Exception:  # noqa: BLE001 - a failed variant is skipped, never trusted
            got = None
        consider(got, "height construction on the coned instance, translated back")
    for v in splitting.VARIANTS[1:]:
        if late() or met():
            break
        run_split(v)
    if quick:
        return best
    until = deadline if deadline is not None else time.monotonic() + IMPROVE_SECONDS
    frames_of.sort(key=lambda x: x[0])
    for w, v, fr, segs in frames_of[:IMPROVE_TOP]:
        if time.monotonic() > until or met():
            break
        try:
            fr2, segs2, st = splitting.improve(W, fr, segs, deadline=until)
        except Exception:  # noqa: BLE001 - an improvement that fails leaves the sweep as it was
            continue
        if st["narrowed"]:
            consider(splitting.join(W, segs2), split_name(v) + f", {st['narrowed']} windows re-solved exactly")
    return best


def coned_construction(W: Any, M: float, *, deadline: float | None = None) -> tuple[float, dict] | None:
    """A leash sweep from the height constructions on the coned instance (:mod:`.coning`).

    The height dispatcher's constructed homotopy (several face orders) of
    the coned problem is translated back move by move: flips of cone
    triangles become endpoint steps, every other move shifts by one
    position.  Paths with more than two cone edges, backward steps in a
    forward-only problem, or a step whose leash is not the free-reduction
    result discard the translation.  Returns ``(width, witness)`` (not yet
    replayed) or None.
    """
    from ...errors import SweepwidthError
    from ...problems.homotopy import HomotopyProblem, apply_move
    from ..homotopy import solve_problem as solve_height
    from .coning import cone_instance

    try:
        C = cone_instance(W, M)
    except SweepwidthError:
        return None
    Q = C["graph"]
    H = HomotopyProblem.build(Q, start=C["start"], end=C["end"], s=C["s"], t=C["t"], holes=C["holes"],
                              spikes=C["spikes"], simple=C["simple"])
    sub = Deadline.at_time(None if deadline is None else max(time.monotonic() + 0.5, deadline))
    r = solve_height(H, method="bounds", deadline=sub)
    if r.witness is None:
        return None
    m, p = W.graph.number_of_edges(), W.p

    def decode(darts: tuple) -> tuple[int, int, tuple] | None:
        if len(darts) < 2:
            return None
        ea, eb = (darts[0] >> 1) - m, (darts[-1] >> 1) - m - (p + 1)
        inner = darts[1:-1]
        if not 0 <= ea <= p or not 0 <= eb <= W.q or any((d >> 1) >= m for d in inner):
            return None
        return ea, eb, tuple(inner)

    cur = Curve(tuple(C["start"]), int(H.s or 0))
    s = W.initial()
    moves: list = []
    width = W.length_of(s.darts)
    for mv in r.witness["moves"]:
        cur = apply_move(H, cur, mv, check=False)
        got = decode(cur.darts)
        if got is None:
            return None
        i, j, L = got
        if (i, j) != (s.i, s.j):
            if abs(i - s.i) + abs(j - s.j) != 1:
                return None
            walk, to = ("a", i) if i != s.i else ("b", j)
            if to < (s.i if walk == "a" else s.j) and not W.backward:
                return None
            s = W.step(s, walk, to)
            if s.darts != L:
                return None
            moves.append({"op": "step", "walk": walk, "to": to})
        else:
            m2 = dict(mv)
            m2["pos"] = int(mv["pos"]) - 1
            if mv["op"] == "flip":
                # face ids of the coned graph differ: name the face by one of its darts
                fd = [d for d in Q.face_darts(mv["face"]) if d < 2 * m]
                if not fd:
                    return None
                m2["face"] = W.graph.face_of_dart(fd[0])
            if m2["pos"] < 0:
                return None
            s = W.apply_move(s, m2, check=False)
            if s.darts != L:
                return None
            moves.append(m2)
        width = max(width, W.length_of(s.darts))
    if not W.is_final(s):
        return None
    return width, {"start": W.leash_json(W.start.darts, W.start.vertex), "moves": moves}
