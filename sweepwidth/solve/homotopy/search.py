"""Exact discrete homotopy height by a bottleneck search over walk states.

Definition
----------
A *homotopy* of a plane graph moves a closed walk (or a walk with fixed ends)
by face flips, spikes and unspikes (see the shared curve spec and
:mod:`sweepwidth.problems.homotopy`); its *height* is the largest length of a
walk along it, start and end included.  The homotopy height from a start to
an end condition is the least height of a homotopy between them.

Method
------
The walks of a plane graph and the legal moves between them form an infinite
undirected graph (every move has an inverse move: a flip's inverse is the
flip of the same face putting the piece back, a spike's is an unspike).  The
homotopy height is the *bottleneck distance* from the start to the set of
end states, with the length of a walk as the cost of visiting it.  We run
Dijkstra's algorithm for bottleneck costs: a state's key is the largest
length along the best path found to it, and states are settled in order of
their keys.  When a state with key ``K`` is settled, every state whose
bottleneck is below ``K`` has already been settled, so ``K`` is a proven
lower bound; the first end state settled gives the exact height.  This is the
incremental "is the height at most H?" search for H = 1, 2, ... with all the
work of the smaller bounds reused, and it only ever touches walks of length
below the optimum plus the part of the optimal level it needs.

Each ingredient is exact for the definition:

* *Canonical forms.*  A closed walk is stored as its least rotation
  (:func:`~sweepwidth.solve.homotopy.walks.least_rotation`): rotations of one closed
  walk have the same moves up to renumbering positions, so they are one
  state.  Open walks are stored as they are.
* *Clamping by a lower bound.*  Keys are ``max(bottleneck, B)`` where ``B`` is
  a proven lower bound on the optimum: the lengths of the start and end
  walks, and, when available, the homology width of the same problem
  (reducing every walk of a homotopy mod 2 gives a homology sweep of no
  greater width).  Dijkstra on the clamped cost is still exact for the
  clamped cost, whose optimum is ``max(OPT, B) = OPT``.  Clamping merges all
  levels below ``B`` into one, so the search never exhausts walks that are
  shorter than a bound it already knows.
* *Tie-breaking.*  Within one key the order does not affect exactness; we
  prefer states whose winding numbers are closest to the end's (the sum of
  ``|w(f) - w_end(f)|`` is a lower bound on the number of flips left), then
  shorter walks.  Within the optimal level this makes the search a greedy
  descent that usually reaches the end state after few settled states.
* *Strict upper bound.*  With a known homotopy of height ``U`` (passed in or
  found on the way) walks of length ``>= U`` are never generated: they cannot
  lie on a strictly better homotopy.  When the key reaches ``U`` the known
  homotopy is optimal.
* *Variants.*  ``monotone=True``: when the outer face is a hole, a flip of
  face ``f`` changes the winding number ``w(f)`` by one and no other, so a
  monotone homotopy flips exactly the faces with ``w_start(f) != w_end(f)``,
  once each, towards ``w_end`` (infeasible when some difference is 2 or
  more); only those flips are generated and the state stays the walk.
  The faces that keep their winding number are never flipped, so a
  monotone homotopy is a homotopy of the complex without them: when the
  free-group test of :mod:`sweepwidth.solve.homotopy` says the start and end
  are not homotopic there, no monotone homotopy exists.
  Otherwise the set of flipped faces is added to the state.
  ``simple=True`` drops every non-simple walk except a final point;
  ``spikes=False`` drops spike and unspike moves.  Holes are never flipped.
  The research option ``max_repeated_faces=r`` adds the sets of faces
  flipped once and more than once to the state and allows at most ``r`` of
  the latter.

No other pruning is applied: in particular spikes are not removed eagerly,
since a homotopy may need a spike that a later flip uses.

Before the exact search a short greedy dive (states ordered by the winding
estimate alone) usually finds a good homotopy, which gives an upper bound and
a witness early (useful under a deadline) and enables the strict-bound
pruning.

References
----------
.. [1] E. W. Dijkstra, "A note on two problems in connexion with graphs",
   Numerische Mathematik 1 (1959) -- with the bottleneck (minimax) path cost.
.. [2] K. S. Booth, "Lexicographically least circular substrings", Information
   Processing Letters 10(4), 1980 -- the canonical rotation idea.
.. [3] E. W. Chambers, G. R. Chambers, A. de Mesmay, T. Ophelders, R. Rotman,
   "Constructing monotone homotopies and sweepouts", J. Geom. Anal. 2021.
.. [4] B. Burton, E. W. Chambers, M. van Kreveld, W. Meulemans, T. Ophelders,
   B. Speckmann, "Computing optimal homotopies over a spiked plane with
   polygonal boundary", ESA 2017 -- discrete homotopies with spikes.
"""

from __future__ import annotations

import heapq
import itertools
import time
from collections.abc import Callable
from dataclasses import dataclass, field
from typing import Any

from ...errors import InputTypeError, InvalidArgumentError, InvalidCurveError, OperationError, ProblemTooLargeError, SweepwidthError
from .walks import WalkSpace, find_rotation, least_rotation

__all__ = ["SearchOutcome", "WalkSpec", "search_homotopy"]

#: default limit on stored states (each costs about a kilobyte, see STATE_OVERHEAD)
MAX_STATES = 3_000_000
#: default memory budget of the stored states (bytes; the same default as the cutwidth subset DP)
DEFAULT_MAX_MEMORY = 1 << 30
#: estimated bytes per stored state beyond its walk (entries in the key, parent and settled
#: tables and the heap).  Measured with tracemalloc on triangulated grids of 49 to 225
#: vertices: 0.9-1.0 KB per stored state; the estimate is 0.95-1.3 KB there
STATE_OVERHEAD = 700
#: estimated bytes per dart of a stored walk (a tuple slot and a share of the int objects)
DART_BYTES = 12
#: wall-clock budget of the greedy dive (it only looks for an early upper bound)
DIVE_SECONDS = 0.5


@dataclass
class SearchOutcome:
    """What :func:`search_homotopy` proved.

    Attributes
    ----------
    lower : float
        Proven lower bound on the homotopy height.
    upper : float or None
        Height of ``witness`` (None when no homotopy is known).
    witness : dict or None
        ``{"start": walk_json, "moves": [...]}`` in the shared spec's form.
    optimal : bool
        ``lower == upper`` and the witness is optimal.
    stats : dict
        'states' (settled), 'generated', 'stored', 'dive_states', 'lower_from',
        'upper_from', 'reason' (for infeasible or stopped searches), ...
    """

    lower: float
    upper: float | None
    witness: dict | None
    optimal: bool
    stats: dict = field(default_factory=dict)


@dataclass
class WalkSpec:
    """A homotopy problem reduced to what the search needs (vertex indices and darts).

    ``end_darts is None`` means "a point anywhere" (closed walks only);
    ``end_darts == ()`` with ``end_vertex`` set means that particular point.
    """

    P: Any
    start_darts: tuple
    start_vertex: int
    end_darts: tuple | None = None
    end_vertex: int | None = None
    closed: bool = True
    holes: frozenset | None = None
    spikes: bool = True
    simple: bool = False
    monotone: bool = False
    length: str = "weight"


def _walk_from(P: Any, w: Any, what: str) -> tuple[tuple, int | None]:
    """(darts, vertex index or None) from the many shapes a walk may come in."""
    if w is None:
        return (), None
    if isinstance(w, dict):
        darts = tuple(int(d) for d in w.get("darts", ()))
        v = w.get("vertex")
        return darts, (P.index(v) if v is not None else (P.tail_index(darts[0]) if darts else None))
    if hasattr(w, "darts"):
        # a Curve of sweepwidth.problems.homotopy: its vertex is an index
        darts = tuple(int(d) for d in w.darts)
        v = getattr(w, "vertex", None)
        if v is None and darts:
            v = P.tail_index(darts[0])
        return darts, (None if v is None else int(v))
    darts = tuple(int(d) for d in w)
    return darts, (P.tail_index(darts[0]) if darts else None)


def spec_from_problem(problem: Any) -> WalkSpec:
    """Read a :class:`~sweepwidth.problems.homotopy.HomotopyProblem` (or a :class:`WalkSpec`)."""
    if isinstance(problem, WalkSpec):
        return problem
    P = None
    for name in ("graph", "P", "plane"):
        P = getattr(problem, name, None)
        if P is not None:
            break
    if P is None:
        raise InputTypeError(f"expected a HomotopyProblem, got {type(problem).__name__}")
    sd, sv = _walk_from(P, problem.start, "start")
    end = getattr(problem, "end", None)
    if end is None:
        ed, ev = None, None
    else:
        ed, ev = _walk_from(P, end, "end")
        if not ed and getattr(problem, "end_anywhere", False):
            ed, ev = None, None
    closed = bool(getattr(problem, "closed", True))
    if sv is None:
        raise InvalidCurveError("the start walk has no vertex")
    holes = getattr(problem, "holes", None)
    return WalkSpec(
        P=P,
        start_darts=sd,
        start_vertex=sv,
        end_darts=ed,
        end_vertex=ev,
        closed=closed,
        holes=frozenset(holes) if holes is not None else None,
        spikes=bool(getattr(problem, "spikes", True)),
        simple=bool(getattr(problem, "simple", False)),
        monotone=bool(getattr(problem, "monotone", False)),
        length=str(getattr(problem, "length", "weight")),
    )


def _walk_json(sp: WalkSpace, darts: tuple, vertex: int) -> dict:
    v = sp.tail[darts[0]] if darts else vertex
    return {"vertex": sp.labels[v], "darts": [int(d) for d in darts]}


class _Search:
    """One search (state bookkeeping shared by the dive and the exact phase)."""

    def __init__(self, spec: WalkSpec, sp: WalkSpace) -> None:
        self.spec = spec
        self.sp = sp
        self.start_key = sp.key_of(spec.start_darts, spec.start_vertex)
        if spec.end_darts is None:
            self.goal_key = None
        else:
            ev = spec.end_vertex if spec.end_vertex is not None else spec.start_vertex
            self.goal_key = sp.key_of(spec.end_darts, ev)
        # winding target for the tie-break estimate
        F = len(sp.flen)
        if sp.closed:
            self.wend = sp.winding(self.goal_key) if self.goal_key is not None else [0] * F
            self.rev_end = ()
        else:
            self.wend = [0] * F
            ed = spec.end_darts or ()
            self.rev_end = tuple(d ^ 1 for d in reversed(ed))
        self.free = [f for f in range(F) if not sp.hole[f]]

    # state = walk key, or (walk key, mask of flipped faces) when monotone and the
    # outer face may be flipped.  When the outer face is a hole, a flip of face f
    # changes the winding number w(f) by one and no other (outer face fixed at 0),
    # and the end fixes every w(f).  So in a monotone homotopy face f is flipped
    # exactly once if |w_start(f) - w_end(f)| = 1, never if it is 0, and the
    # problem is infeasible if it is >= 2; every flip must move w(f) towards
    # w_end(f).  Conversely, when all differences are <= 1, flips that move
    # towards the end flip each face at most once.  The flipped set is then
    # {f : w(f) != w_start(f)}, a function of the walk: no mask is needed.
    # With ``max_repeated`` (research option) the state is (walk key, faces flipped
    # at least once, faces flipped at least twice) and at most ``max_repeated``
    # faces may be flipped more than once.
    max_repeated: int | None = None

    def walk(self, state: Any) -> tuple:
        if self.max_repeated is not None:
            return state[0]
        return state[0] if (self.sp.monotone and not self.sp.hole[self.sp.outer]) else state

    def is_goal(self, key: tuple) -> bool:
        if self.goal_key is None:
            return self.sp.is_point(key)
        return key == self.goal_key

    def potential_and_winding(self, key: tuple) -> tuple[int, list]:
        sp = self.sp
        if sp.closed:
            wn = sp.winding(key)
        else:
            w = sp.darts_of(key) + self.rev_end
            wn = sp.winding(w if w else sp.point(0))
        we = self.wend
        return sum(abs(wn[f] - we[f]) for f in self.free), wn

    def end_length(self) -> Any:
        if self.goal_key is None:
            return 1 if self.sp.mode == "vertices" else 0
        return self.sp.length(self.goal_key)


def _invariant_check(search: _Search) -> tuple[bool, str | None, bool]:
    """(feasible so far, reason, invariant complete) from winding numbers at holes."""
    sp = search.sp
    holes = [f for f in range(len(sp.flen)) if sp.hole[f]]
    if sp.closed:
        wn = sp.winding(search.start_key)
        we = search.wend
    else:
        spec = search.spec

        def ends(darts: tuple, v: int | None) -> tuple[int, int]:
            if darts:
                return sp.tail[darts[0]], sp.head[darts[-1]]
            v = spec.start_vertex if v is None else v
            return v, v

        se = ends(spec.start_darts, spec.start_vertex)
        ee = ends(spec.end_darts or (), spec.end_vertex)
        if se != ee:
            return False, (
                f"the start walk runs {sp.labels[se[0]]!r} -> {sp.labels[se[1]]!r} but the end walk "
                f"{sp.labels[ee[0]]!r} -> {sp.labels[ee[1]]!r}: open walks keep their ends"
            ), True
        w = sp.darts_of(search.start_key) + search.rev_end
        wn = sp.winding(w if w else sp.point(0))
        we = [0] * len(sp.flen)
    complete = len(holes) <= 2
    if len(holes) >= 2:
        h0 = holes[0]
        for h in holes[1:]:
            if wn[h] - wn[h0] != we[h] - we[h0]:
                return (
                    False,
                    f"the start and end are not homotopic: their winding numbers around hole faces "
                    f"{h0} and {h} differ by {wn[h] - wn[h0]} and {we[h] - we[h0]}",
                    True,
                )
    return True, None, complete


def state_bytes(darts: int) -> int:
    """Estimated memory of one stored search state whose walk has ``darts`` darts."""
    return STATE_OVERHEAD + DART_BYTES * max(1, darts)


def _run(
    search: _Search,
    *,
    lower: float,
    upper: float | None,
    deadline: float | None,
    max_states: int,
    max_memory: int | None = None,
    greedy: bool,
    on_upper: Callable[[float, Any, dict], None] | None,
    on_lower: Callable[[float], None] | None,
    expand_limit: int | None = None,
) -> dict:
    """Best-first search; returns a dict with the outcome of this phase.

    ``greedy=False``: bottleneck Dijkstra with keys clamped at ``lower`` (exact).
    ``greedy=True``: order by the winding estimate first (a dive for an upper bound).
    """
    sp = search.sp
    # monotone homotopies with the outer face a hole: winding numbers decide which
    # flips are allowed and the flipped set is a function of the walk (see _Search)
    wind_mono = sp.monotone and sp.hole[sp.outer]
    monotone = sp.monotone and not wind_mono
    simple = sp.simple
    length = sp.length
    closed = sp.closed
    is_goal = search.is_goal
    outer = sp.outer
    wend = search.wend
    start_walk = search.start_key
    rep = search.max_repeated
    if rep is not None:
        monotone = False
        wind_mono = False
    start = (start_walk, 0, 0) if rep is not None else ((start_walk, 0) if monotone else start_walk)
    f0 = max(length(start_walk), lower)
    best: dict = {start: f0}
    stored_bytes = state_bytes(len(start_walk))
    parent: dict = {start: None}
    done: set = set()
    counter = itertools.count()
    pot0, _ = search.potential_and_winding(start_walk)
    heap: list = []
    if greedy:
        heap.append((pot0, f0, length(start_walk), 0, start))
    else:
        heap.append((f0, pot0, length(start_walk), 0, start))
    level = f0
    settled = 0
    generated = 0
    found: Any = None  # (height, state)
    cap = upper  # strict: only walks of length < cap, paths of height < cap
    reason = None
    exhausted = False
    while True:
        if not heap:
            exhausted = True
            break
        item = heapq.heappop(heap)
        if greedy:
            pot, f, _, _, state = item
        else:
            f, pot, _, _, state = item
        if state in done or best.get(state, f) < f:
            continue
        if not greedy and f > level:
            level = f
            if on_lower is not None:
                on_lower(level)
        if cap is not None and f >= cap:
            if greedy:
                continue
            # everything left has key >= cap: the known homotopy is optimal
            exhausted = True
            break
        key = search.walk(state)
        if is_goal(key):
            found = (f, state)
            break
        done.add(state)
        settled += 1
        if (settled & 7) == 0:
            if deadline is not None and time.monotonic() > deadline:
                reason = "deadline"
                break
            if len(best) > max_states:
                reason = f"state limit {max_states} reached"
                break
            if max_memory is not None and stored_bytes > max_memory:
                reason = f"memory limit reached: about {stored_bytes / 2**20:.0f} MiB of stored states (max_memory {max_memory / 2**20:.0f} MiB)"
                break
            if expand_limit is not None and settled > expand_limit:
                reason = "dive budget"
                break
        mask = state[1] if (monotone or rep is not None) else 0
        many = state[2] if rep is not None else 0
        _, wn = search.potential_and_winding(key)
        for new, v, move, face, sign, nl in sp.moves(key, cap):
            generated += 1
            if face >= 0:
                if wind_mono and (wn[face] - wend[face]) * sign >= 0:
                    continue
                if monotone and (mask >> face) & 1:
                    continue
            if new:
                nkey = least_rotation(new) if closed else new
            else:
                nkey = sp.point(v)
            f2 = max(f, nl)
            if cap is not None and f2 >= cap:
                continue
            goal = is_goal(nkey)
            if simple and not (goal and not new) and not sp.is_simple(nkey):
                continue
            nstate: Any
            if rep is not None:
                if face >= 0:
                    bit = 1 << face
                    nmany = many | bit if mask & bit else many
                    if nmany != many and bin(nmany).count("1") > rep:
                        continue
                    nstate = (nkey, mask | bit, nmany)
                else:
                    nstate = (nkey, mask, many)
            elif monotone:
                nstate = (nkey, mask | (1 << face) if face >= 0 else mask)
            else:
                nstate = nkey
            if nstate in done:
                continue
            old = best.get(nstate)
            if old is not None and old <= f2:
                continue
            if old is None:
                stored_bytes += STATE_OVERHEAD + DART_BYTES * max(1, len(nkey))
            best[nstate] = f2
            parent[nstate] = (state, move)
            if face >= 0 and face != outer:
                a = wn[face] - wend[face]
                pot2 = pot - abs(a) + abs(a + sign)
            else:
                pot2 = pot
            if goal:
                # a complete homotopy of height f2
                if cap is None or f2 < cap:
                    cap = f2
                    if on_upper is not None:
                        on_upper(f2, nstate, parent)
                if not greedy and f2 <= f:
                    found = (f2, nstate)
                    break
            c = next(counter)
            if greedy:
                heapq.heappush(heap, (pot2, f2, nl, c, nstate))
            else:
                heapq.heappush(heap, (f2, pot2, nl, c, nstate))
        if found is not None:
            break
    return {
        "found": found,
        "level": level,
        "exhausted": exhausted,
        "reason": reason,
        "settled": settled,
        "generated": generated,
        "stored": len(best),
        "stored_bytes": stored_bytes,
        "parent": parent,
        "cap": cap,
    }


def _witness(search: _Search, parent: dict, state: Any) -> dict:
    """Rebuild the witness (actual dart sequences, positions adjusted to rotations)."""
    sp = search.sp
    chain = []
    s = state
    while parent[s] is not None:
        ps, move = parent[s]
        chain.append((ps, move))
        s = ps
    chain.reverse()
    spec = search.spec
    A = tuple(spec.start_darts)
    vert = spec.start_vertex if not A else sp.tail[A[0]]
    moves = []
    for ps, move in chain:
        key = search.walk(ps)
        mv = sp.move_json(move)
        if sp.closed and not sp.is_point(key):
            L = len(key)
            r = find_rotation(A, key)
            if r < 0:  # pragma: no cover - internal consistency
                raise OperationError("internal error: witness walk lost track of its state")
            mv["pos"] = (move[1] - r) % L
        if "put" in mv:
            mv["put"] = list(mv["put"])
        moves.append(mv)
        A, vert2 = sp.apply(A, vert, mv)
        if A:
            vert = sp.tail[A[0]]
        else:
            vert = vert2
    return {"start": _walk_json(sp, tuple(spec.start_darts), spec.start_vertex), "moves": moves}


def _homology_lower(spec: WalkSpec, deadline: float | None) -> tuple[float | None, str]:
    """Homology width of the same start, end and holes (a lower bound), with the note how it was found."""
    from ...problems.cycles import HomologyProblem
    from ..contract import Deadline
    from ..homology import solve_problem as solve_homology

    try:
        P = spec.P
        if spec.closed:
            start = {"vertex": P.label(spec.start_vertex), "darts": list(spec.start_darts)}
            end = None if spec.end_darts is None else {
                "vertex": P.label(spec.end_vertex if spec.end_vertex is not None else spec.start_vertex),
                "darts": list(spec.end_darts),
            }
        else:
            # the homology solver sweeps Z2 cycles; an open walk's chain is not one
            return None, "open walks: homology bound not used"
        if spec.length != "weight":
            # a closed walk of L darts has vertex count L (a point 1 >= 0): unit weights bound it
            P = P.with_weights([1.0] * P.number_of_edges())
        limit = None
        if deadline is not None:
            limit = max(0.2, 0.25 * (deadline - time.monotonic()))
        # The mod-2 image of a homotopy may toggle a face several times, so in general the
        # valid bound is the NON-monotone homology width.  Face orders (the monotone width)
        # suffice when the homotopy is monotone (its image is a face order) or for a sweep of
        # the disk from its outer boundary to a point (Brightwell and Winkler).
        outer = P.outer_face
        holes = set(spec.holes) if spec.holes is not None else {outer}
        z0: set = set()
        for d in spec.start_darts:
            z0 ^= {d >> 1}
        disk = spec.end_darts is None and holes == {outer} and z0 == set(P.face_boundary_cycle(outer))
        mono = bool(spec.monotone or disk)
        try:
            # the built problem and a deadline, not the public arguments again
            problem = HomologyProblem.build(P, start, end, set(spec.holes) if spec.holes is not None else None)
            r = solve_homology(problem, deadline=Deadline.from_limit(limit), monotone=mono)
        except ProblemTooLargeError as err:
            return None, f"homology bound not available: {err}"
        if r.status == "infeasible":
            return None, "homology: infeasible"
        kind = "monotone" if mono else "non-monotone"
        return (float(r.lower) if r.lower is not None else None), f"{kind} homology width ({r.status}, {r.method})"
    except Exception as err:  # the bound is optional: never let it break the exact search
        return None, f"homology bound failed: {type(err).__name__}: {err}"


def _obstacle_test(problem: Any, spec: WalkSpec, fixed: list) -> str | None:
    """Reason why no monotone homotopy exists, or None when the test passes (or is unavailable)."""
    from ...problems.homotopy import HomotopyProblem
    from .free_group import homotopy_classes_equal

    P = spec.P
    holes = set(spec.holes if spec.holes is not None else {P.outer_face}) | set(fixed)
    kw: dict = {"start": {"vertex": P.label(spec.start_vertex), "darts": list(spec.start_darts)}, "holes": holes}
    if spec.end_darts is not None:
        ev = spec.end_vertex if spec.end_vertex is not None else spec.start_vertex
        kw["end"] = {"vertex": P.label(ev), "darts": list(spec.end_darts)}
    if not spec.closed:
        s = getattr(problem, "s", None)
        t = getattr(problem, "t", None)
        if s is None or t is None:
            return None
        kw["s"], kw["t"] = P.label(s), P.label(t)
    try:
        H = HomotopyProblem.build(P, **kw)
        ok, why = homotopy_classes_equal(H)
    except SweepwidthError:
        return None
    if ok:
        return None
    return (f"monotone homotopy: faces {sorted(fixed)} keep their winding numbers, so they are never "
            f"flipped; without them {why}")


def search_homotopy(
    problem: Any,
    *,
    upper: float | None = None,
    upper_witness: dict | None = None,
    deadline: float | None = None,
    progress: Callable[[SearchOutcome], None] | None = None,
    lower: float | None = None,
    use_homology: bool = True,
    dive: int = 400,
    max_states: int = MAX_STATES,
    max_repeated_faces: int | None = None,
    max_memory: int | None = DEFAULT_MAX_MEMORY,
) -> SearchOutcome:
    """Exact discrete homotopy height by a bottleneck search over walk states.

    Parameters
    ----------
    problem : HomotopyProblem or WalkSpec
        Plane graph, start walk, end condition, holes, variant flags, length mode.
    upper : float, optional
        Height of a known homotopy (``upper_witness``); only strictly better
        homotopies are searched for.
    upper_witness : dict, optional
        Witness of ``upper``, returned when nothing better exists.
    deadline : float, optional
        A ``time.monotonic()`` value; the best proven bounds are returned by then.
    progress : callable, optional
        Called with a :class:`SearchOutcome` whenever a bound improves.
    lower : float, optional
        A proven lower bound to clamp the search at (e.g. a homology width).
    use_homology : bool
        Ask :func:`sweepwidth.solve.homology.homology_width` for a lower bound
        first (closed walks, weight length) when that solver is present and
        no ``lower`` is given.
    dive : int
        Settled-state budget of the greedy dive for an early upper bound (0: none).
    max_states : int
        Stop (with bounds) when this many states are stored.
    max_memory : int or None
        Bytes the stored states may take (estimated per state from its walk
        length, :func:`state_bytes`); the search stops with its bounds when
        they would take more.  None: no limit.
    max_repeated_faces : int, optional
        Research option: allow at most this many faces to be flipped more
        than once (0 is the monotone variant).  The least value that keeps the
        optimum is the number of faces that every optimal homotopy re-flips.

    Returns
    -------
    SearchOutcome

    Raises
    ------
    SweepwidthError
        When ``problem`` is not a homotopy problem.

    Notes
    -----
    Exponential in the worst case: the number of walks of length below the
    optimum reachable from the start.  Each settled state costs
    ``O(L * (deg + face length) * L)`` for a walk of ``L`` darts.

    Examples
    --------
    >>> from sweepwidth.generators import triangulated_grid
    >>> from sweepwidth.solve.homotopy.search import WalkSpec, search_homotopy
    >>> P = triangulated_grid(1)                       # a square split into two triangles
    >>> start = tuple(P.face_darts(P.outer_face))[::-1]
    >>> start = tuple(d ^ 1 for d in start)             # the boundary, counterclockwise
    >>> out = search_homotopy(WalkSpec(P, start, P.tail_index(start[0])), use_homology=False)
    >>> out.optimal, out.upper
    (True, 4.0)
    """
    t0 = time.monotonic()
    spec = spec_from_problem(problem)
    sp = WalkSpace.build(
        spec.P, holes=spec.holes, closed=spec.closed, spikes=spec.spikes, simple=spec.simple,
        monotone=spec.monotone, length=spec.length,
    )
    search = _Search(spec, sp)
    if max_repeated_faces is not None:
        if isinstance(max_repeated_faces, bool) or not isinstance(max_repeated_faces, int) or max_repeated_faces < 0:
            raise InvalidArgumentError(f"max_repeated_faces must be a non-negative integer, got {max_repeated_faces!r}")
        search.max_repeated = max_repeated_faces
    stats: dict = {"states": 0, "generated": 0, "stored": 0, "dive_states": 0}
    ok, reason, complete = _invariant_check(search)
    stats["invariant_complete"] = complete
    if not ok:
        stats["reason"] = reason
        stats["infeasible"] = True
        return SearchOutcome(lower=float("inf"), upper=None, witness=None, optimal=False, stats=stats)

    if spec.simple and not sp.is_simple(search.start_key):
        stats["reason"] = "simple homotopy: the start walk is not simple"
        stats["infeasible"] = True
        return SearchOutcome(lower=float("inf"), upper=None, witness=None, optimal=False, stats=stats)
    if spec.monotone and sp.hole[sp.outer]:
        w0 = sp.winding(search.start_key) if sp.closed else search.potential_and_winding(search.start_key)[1]
        for f in search.free:
            if abs(w0[f] - search.wend[f]) >= 2:
                stats["reason"] = (
                    f"monotone homotopy: the winding number of face {f} must change by "
                    f"{abs(w0[f] - search.wend[f])}, but each flip changes it by one and a face is flipped at most once"
                )
                stats["infeasible"] = True
                return SearchOutcome(lower=float("inf"), upper=None, witness=None, optimal=False, stats=stats)
        # faces whose winding number must not change are never flipped by a monotone
        # homotopy: it is a homotopy of the complex without them, so the start must be
        # homotopic to the end there (free-group test of sweepwidth.solve.homotopy)
        fixed = [f for f in search.free if w0[f] == search.wend[f]]
        if fixed:
            why = _obstacle_test(problem, spec, fixed)
            if why is not None:
                stats["reason"] = why
                stats["infeasible"] = True
                return SearchOutcome(lower=float("inf"), upper=None, witness=None, optimal=False, stats=stats)
    if max_memory is not None:
        if isinstance(max_memory, bool) or not isinstance(max_memory, int) or max_memory <= 0:
            raise InvalidArgumentError(f"max_memory must be a positive number of bytes or None, got {max_memory!r}")
        # a homotopy flips every face at least |w_start(f) - w_end(f)| times and each flip
        # stores at least one new state; the walks are at least as long as the start walk
        need_flips, _ = search.potential_and_winding(search.start_key)
        need = max(1, int(need_flips)) * state_bytes(len(search.start_key)) + 1000 * state_bytes(len(search.start_key))
        if need > max_memory:
            raise ProblemTooLargeError(
                f"exact homotopy search: at least {need / 2**20:.1f} MiB of search states are needed "
                f"({int(need_flips)} forced flips of a {len(search.start_key)}-dart walk), more than the "
                f"max_memory limit of {max_memory / 2**20:.1f} MiB; raise max_memory or use method='bounds'"
            )
    lo = max(sp.length(search.start_key), search.end_length())
    lower_from = "lengths of the start and end walks"
    if lower is not None and lower > lo:
        lo, lower_from = lower, "given lower bound"
    state = {"lower": lo, "upper": upper, "witness": upper_witness, "upper_from": "given" if upper is not None else None}
    stats["lower_from"] = lower_from

    def outcome(optimal: bool) -> SearchOutcome:
        st = dict(stats)
        st["upper_from"] = state["upper_from"]
        st["seconds"] = time.monotonic() - t0
        up = state["upper"]
        lw = state["lower"]
        if up is not None and lw > up:
            lw = up
        return SearchOutcome(
            lower=float(lw), upper=None if up is None else float(up), witness=state["witness"],
            optimal=optimal, stats=st,
        )

    def report() -> None:
        if progress is not None:
            progress(outcome(False))

    # the start already satisfies the end condition
    if search.is_goal(search.start_key):
        h = sp.length(search.start_key)
        state.update(lower=h, upper=h, upper_from="start is an end state",
                     witness={"start": _walk_json(sp, spec.start_darts, spec.start_vertex), "moves": []})
        return outcome(True)

    def on_upper_factory(phase: str) -> Callable:
        def on_upper(h: float, st_: Any, parent: dict) -> None:
            if state["upper"] is None or h < state["upper"]:
                state["upper"] = h
                state["witness"] = _witness(search, parent, st_)
                state["upper_from"] = phase
                report()
        return on_upper

    def on_lower(v: float) -> None:
        if v > state["lower"]:
            state["lower"] = v
            report()

    if dive and (deadline is None or time.monotonic() < deadline):
        # the dive gets at most a third of the time left and half a second
        dl = time.monotonic() + DIVE_SECONDS
        if deadline is not None:
            dl = min(dl, time.monotonic() + (deadline - time.monotonic()) / 3)
        r = _run(search, lower=lo, upper=state["upper"], deadline=dl, max_states=max_states, max_memory=max_memory, greedy=True,
                 on_upper=on_upper_factory("greedy dive"), on_lower=None, expand_limit=dive)
        stats["dive_states"] = r["settled"]
        if r["found"] is not None:
            h, st_ = r["found"]
            on_upper_factory("greedy dive")(h, st_, r["parent"])
        if state["upper"] is not None and state["upper"] <= lo:
            state["lower"] = state["upper"]
            return outcome(True)
    # the homology bound is asked for only when the cheap bounds and the dive leave a gap
    if use_homology and lower is None:
        hl, how = _homology_lower(spec, deadline)
        stats["homology"] = how
        if hl is not None and state["upper"] is not None and hl > state["upper"]:
            # impossible for a valid bound (the known homotopy projects to a homology sweep)
            stats["homology"] = how + f"; ignored: {hl:g} exceeds the height {state['upper']:g} of a known homotopy"
            hl = None
        if hl is not None and hl > lo:
            lo, lower_from = hl, how
            stats["lower_from"] = lower_from
            state["lower"] = max(state["lower"], lo)
            report()
        if state["upper"] is not None and state["upper"] <= lo:
            state["lower"] = state["upper"]
            return outcome(True)
    r = _run(search, lower=lo, upper=state["upper"], deadline=deadline, max_states=max_states, max_memory=max_memory, greedy=False,
             on_upper=on_upper_factory("exact search"), on_lower=on_lower)
    stats["states"] = r["settled"]
    stats["generated"] = r["generated"]
    stats["stored"] = r["stored"]
    stats["stored_bytes"] = r["stored_bytes"]
    if r["found"] is not None:
        h, st_ = r["found"]
        if state["upper"] is None or h < state["upper"]:
            state["upper"] = h
            state["witness"] = _witness(search, r["parent"], st_)
            state["upper_from"] = "exact search"
        state["lower"] = h
        return outcome(True)
    if r["exhausted"]:
        if state["upper"] is not None:
            state["lower"] = state["upper"]
            if state["witness"] is None:
                # an upper bound was given without a witness: what is proved is
                # only that no homotopy has a smaller height
                stats["reason"] = "no homotopy of height below the given upper bound"
                return outcome(False)
            return outcome(True)
        # finite component without an end state: not homotopic
        stats["reason"] = "no end state is reachable (all walks reachable from the start were explored)"
        stats["infeasible"] = True
        state["lower"] = float("inf")
        return outcome(False)
    stats["reason"] = r["reason"]
    state["lower"] = max(state["lower"], r["level"])
    return outcome(False)
