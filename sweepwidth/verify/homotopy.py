"""Independent replay of discrete homotopies (witnesses of ``parameter='homotopy'``).

The checker rebuilds every walk of a homotopy from the witness
``{"start": walk, "moves": [...]}`` using only PlaneGraph queries (tails,
heads, face boundary walks, weights) and its own code for walks and moves; it
does not use the solvers' move code in :mod:`sweepwidth.problems.homotopy`.

Rules checked for every move (the shared specification of curves and moves):

* the move is well formed (op, integer position in range, dart and face ids);
* a flip does not touch a hole, and the removed piece followed by the reverse
  of the inserted piece is the boundary walk of the face up to rotation, in
  either orientation; an inserted whole loop starts at the walk's vertex at
  that position; pieces of open walks do not wrap;
* spikes and unspikes only when allowed; a spike leaves the vertex at its
  position; an unspike removes a dart followed by its reverse;
* every walk is a walk (consecutive darts meet) and closed or from s to t;
* with ``simple=True`` every walk but a final point is a simple cycle or path;
  with ``monotone=True`` no face is flipped twice;
* the witness starts at the problem's start (closed: up to rotation) and ends
  at its end condition (a point anywhere by default; an end curve up to
  rotation for closed walks, exactly for open walks).

The recomputed height is the largest length over all walks.
"""

from __future__ import annotations

from typing import Any, Mapping, Sequence

from ..errors import InvalidArgumentError, SweepwidthError, WitnessError
from . import register_checker

__all__ = ["replay_homotopy", "check_homotopy"]


def _label_key(P: Any, x: Any) -> int:
    def tup(y: Any) -> Any:
        return tuple(tup(z) for z in y) if isinstance(y, list) else y

    for cand in (x, tup(x)):
        try:
            if P.has_vertex(cand):
                return P.index(cand)
        except TypeError:
            pass
    raise WitnessError(f"{x!r} is not a vertex of the plane graph")


class _Walk:
    """A walk as a list of darts plus the vertex of a point (own code, for checking only)."""

    __slots__ = ("darts", "point")

    def __init__(self, darts: list[int], point: int | None) -> None:
        self.darts = darts
        self.point = point


def _parse_walk(P: Any, spec: Any, what: str) -> _Walk:
    if not isinstance(spec, Mapping) or "darts" not in spec:
        raise WitnessError(f"{what} must be {{'vertex': v, 'darts': [...]}}, got {spec!r}")
    darts = list(spec["darts"])
    m2 = 2 * P.number_of_edges()
    for i, d in enumerate(darts):
        if isinstance(d, bool) or not isinstance(d, int) or not 0 <= d < m2:
            raise WitnessError(f"{what}: entry {i} is {d!r}, not a dart id")
    v = spec.get("vertex")
    vi = None if v is None else _label_key(P, v)
    if darts:
        if vi is not None and vi != P.tail_index(darts[0]):
            raise WitnessError(f"{what}: 'vertex' {v!r} is not the tail of its first dart")
        return _Walk(darts, None)
    if vi is None:
        raise WitnessError(f"{what}: a point needs its 'vertex'")
    return _Walk([], vi)


def _vertex_at(P: Any, w: _Walk, i: int) -> int:
    if not w.darts:
        return w.point  # type: ignore[return-value]
    if i == len(w.darts):
        return P.head_index(w.darts[-1])
    return P.tail_index(w.darts[i])


def _check_continuity(P: Any, w: _Walk, closed: bool, ends: tuple | None, where: str) -> None:
    ds = w.darts
    for i in range(len(ds) - 1):
        if P.head_index(ds[i]) != P.tail_index(ds[i + 1]):
            raise WitnessError(f"{where}: the walk breaks between darts {i} and {i + 1} ({ds[i]}, {ds[i + 1]})")
    if closed:
        if ds and P.head_index(ds[-1]) != P.tail_index(ds[0]):
            raise WitnessError(f"{where}: the walk is not closed")
    else:
        s, t = ends  # type: ignore[misc]
        a = P.tail_index(ds[0]) if ds else w.point
        b = P.head_index(ds[-1]) if ds else w.point
        if a != s or b != t:
            raise WitnessError(
                f"{where}: the walk runs from {P.label(a)!r} to {P.label(b)!r}, not from {P.label(s)!r} to {P.label(t)!r}"
            )


def _length(P: Any, w: _Walk, closed: bool, length: str) -> float:
    if length == "vertices":
        if closed:
            return float(len(w.darts)) if w.darts else 1.0
        return float(len(w.darts) + 1)
    return float(sum(P.weight(d // 2) for d in w.darts))


def _is_simple(P: Any, w: _Walk, closed: bool) -> bool:
    ds = w.darts
    if not ds:
        return False
    verts = [P.tail_index(d) for d in ds]
    if not closed:
        verts.append(P.head_index(ds[-1]))
        return len(set(verts)) == len(verts)
    return len(set(verts)) == len(verts) and len({d // 2 for d in ds}) == len(ds)


def _same_cyclic(a: Sequence[int], b: Sequence[int]) -> bool:
    if len(a) != len(b):
        return False
    if not a:
        return True
    doubled = list(a) + list(a)
    n = len(a)
    return any(doubled[k:k + n] == list(b) for k in range(n))


def _is_face_boundary(P: Any, f: int, seq: list[int]) -> bool:
    """Is ``seq`` the boundary walk of face f up to rotation, in either orientation?"""
    fwd = list(P.face_darts(f))
    bwd = [d ^ 1 for d in reversed(fwd)]
    return bool(fwd) and (_same_cyclic(fwd, seq) or _same_cyclic(bwd, seq))


def _as_int(x: Any, name: str, where: str) -> int:
    if isinstance(x, bool) or not isinstance(x, int):
        raise WitnessError(f"{where}: {name!r} must be an integer, got {x!r}")
    return x


def _replace(w: _Walk, i: int, k: int, q: list[int], closed: bool, P: Any) -> _Walk:
    ds = w.darts
    L = len(ds)
    if i + k <= L:
        removed = ds[i:i + k]
        new = ds[:i] + q + ds[i + k:]
    else:
        removed = ds[i:] + ds[: (i + k) - L]
        new = q + ds[(i + k) - L:i]
    if new:
        return _Walk(new, None)
    # empty: the point where the removed piece started
    return _Walk([], P.tail_index(removed[0]) if removed else w.point)


def _default_start(P: Any, closed: bool, s: int | None, t: int | None) -> tuple[_Walk, _Walk | None]:
    outer = list(P.face_darts(P.outer_face))
    if closed:
        return (_Walk(outer, None) if outer else _Walk([], 0)), None
    k0 = next((k for k, d in enumerate(outer) if P.tail_index(d) == s), None)
    if k0 is None:
        raise WitnessError(f"s={P.label(s)!r} is not on the outer face")
    rot = outer[k0:] + outer[:k0]
    k1 = next((k for k, d in enumerate(rot) if P.tail_index(d) == t), None)
    if k1 is None:
        raise WitnessError(f"t={P.label(t)!r} is not on the outer face")
    a, b = rot[:k1], rot[k1:]
    return _Walk(a, None), _Walk([d ^ 1 for d in reversed(b)], None)


def replay_homotopy(
    P: Any,
    witness: Mapping[str, Any],
    *,
    start: Any = None,
    end: Any = None,
    closed: bool = True,
    holes: Sequence[int] | None = None,
    spikes: bool = True,
    simple: bool = False,
    monotone: bool = False,
    length: str = "weight",
    s: Any = None,
    t: Any = None,
) -> float:
    """Replay a homotopy witness on ``P`` and return its height.

    Parameters
    ----------
    P : PlaneGraph
    witness : dict
        ``{"start": {"vertex": v, "darts": [...]}, "moves": [move, ...]}``.
    start, end : dict, optional
        The problem's curves in the JSON walk form.  Default start: the outer
        face's boundary walk (closed) or the outer boundary from s to t; default
        end: a point anywhere (closed) or the outer boundary the other way.
        A point end ``{"vertex": v, "darts": []}`` must be met at v.
    closed : bool
        Closed walks, or open walks from ``s`` to ``t``.
    holes : sequence of int, optional
        Faces that may not be flipped (default: the outer face).
    spikes, simple, monotone : bool
    length : {'weight', 'vertices'}
    s, t : vertex labels
        Ends of open walks (taken from ``start`` when omitted).

    Returns
    -------
    float
        The largest length over all walks of the homotopy.

    Raises
    ------
    WitnessError
        Naming the move index (0-based) and the rule broken, or a start or
        end that does not match the problem.

    Notes
    -----
    O(M * (L + b)) for M moves, walks of length at most L and faces of
    boundary length at most b (plain list operations).

    Examples
    --------
    >>> from sweepwidth.generators import wheel
    >>> from sweepwidth.solve.homotopy import homotopy_height
    >>> r = homotopy_height(wheel(4), method="bounds")
    >>> replay_homotopy(wheel(4), r.witness) == r.upper
    True

    A flip of one face leaves a walk of four darts, not the point asked for:

    >>> P = wheel(3)
    >>> start = {"vertex": P.tail(P.face_darts(P.outer_face)[0]), "darts": P.face_darts(P.outer_face)}
    >>> d = start["darts"][0]
    >>> f = P.face_of_dart(d ^ 1)
    >>> B = P.face_darts(f); k = B.index(d ^ 1)
    >>> flip = {"op": "flip", "face": f, "pos": 0, "take": 1, "put": [B[(k + 1) % 3], B[(k + 2) % 3]]}
    >>> replay_homotopy(P, {"start": start, "moves": [flip]}, end={"vertex": 0, "darts": []})
    Traceback (most recent call last):
    ...
    sweepwidth.errors.WitnessError: the homotopy ends at a walk of 4 darts, not at the point 0
    """
    if length not in ("weight", "vertices"):
        raise InvalidArgumentError(f"unknown length convention {length!r}; valid: 'weight', 'vertices'")
    if not isinstance(witness, Mapping) or "start" not in witness or "moves" not in witness:
        raise WitnessError("a homotopy witness is {'start': walk, 'moves': [...]}")
    hole_set = {P.outer_face} if holes is None else {int(h) for h in holes}
    F = P.number_of_faces()
    m2 = 2 * P.number_of_edges()
    W = _parse_walk(P, witness["start"], "witness start")
    si = ti = None
    if not closed:
        if s is None or t is None:
            if start is None:
                raise WitnessError("open walks need s and t (or the problem's start)")
            st = _parse_walk(P, start, "problem start")
            si = P.tail_index(st.darts[0]) if st.darts else st.point
            ti = P.head_index(st.darts[-1]) if st.darts else st.point
        else:
            si, ti = _label_key(P, s), _label_key(P, t)
    # the problem's start and end
    dstart, dend = _default_start(P, closed, si, ti)
    want_start = dstart if start is None else _parse_walk(P, start, "problem start")
    want_end = dend if end is None else _parse_walk(P, end, "problem end")
    ends = (si, ti)
    _check_continuity(P, W, closed, ends, "witness start")
    same = _same_cyclic(W.darts, want_start.darts) if closed else W.darts == want_start.darts
    if not same or (not W.darts and W.point != want_start.point):
        raise WitnessError("the witness does not start at the problem's start curve")
    if simple and not _is_simple(P, W, closed) and (witness["moves"] or W.darts):
        # (a point start that is already the end needs no move and is allowed)
        raise WitnessError("simple homotopy: the start curve is not simple")
    height = _length(P, W, closed, length)
    flipped: set[int] = set()
    moves = list(witness["moves"])
    for idx, mv in enumerate(moves):
        where = f"move {idx}"
        if not isinstance(mv, Mapping) or "op" not in mv:
            raise WitnessError(f"{where}: not a move dict with an 'op': {mv!r}")
        op = mv["op"]
        L = len(W.darts)
        pos = _as_int(mv.get("pos"), "pos", where)
        top = L if (not closed or L == 0) else L - 1
        if not 0 <= pos <= top:
            raise WitnessError(f"{where} ({op}): position {pos} is outside 0..{top}")
        here = _vertex_at(P, W, pos)
        if op == "flip":
            f = _as_int(mv.get("face"), "face", where)
            if not 0 <= f < F:
                raise WitnessError(f"{where} (flip): {f} is not a face id")
            if f in hole_set:
                raise WitnessError(f"{where} (flip): face {f} is a hole and may not be flipped")
            if monotone and f in flipped:
                raise WitnessError(f"{where} (flip): monotone homotopy flips face {f} a second time")
            flipped.add(f)
            k = _as_int(mv.get("take"), "take", where)
            q = list(mv.get("put", []))
            for d in q:
                if isinstance(d, bool) or not isinstance(d, int) or not 0 <= d < m2:
                    raise WitnessError(f"{where} (flip): 'put' holds {d!r}, not a dart id")
            if not 0 <= k <= L:
                raise WitnessError(f"{where} (flip): takes {k} darts from a walk of {L}")
            if not closed and pos + k > L:
                raise WitnessError(f"{where} (flip): the piece wraps around the end of an open walk")
            piece = [W.darts[(pos + x) % L] for x in range(k)] if L else []
            loop = piece + [d ^ 1 for d in reversed(q)]
            if not _is_face_boundary(P, f, loop):
                raise WitnessError(
                    f"{where} (flip): illegal flip: piece {piece} and the reverse of {q} do not make the "
                    f"boundary of face {f}"
                )
            if k == 0 and q and P.tail_index(q[0]) != here:
                raise WitnessError(
                    f"{where} (flip): the inserted boundary loop starts at {P.tail(q[0])!r}, not at the "
                    f"walk's vertex {P.label(here)!r}"
                )
            W = _replace(W, pos, k, q, closed, P)
        elif op == "spike":
            if not spikes:
                raise WitnessError(f"{where} (spike): spikes are not allowed")
            d = mv.get("dart")
            if isinstance(d, bool) or not isinstance(d, int) or not 0 <= d < m2:
                raise WitnessError(f"{where} (spike): {d!r} is not a dart id")
            if P.tail_index(d) != here:
                raise WitnessError(f"{where} (spike): dart {d} does not leave the vertex {P.label(here)!r} at position {pos}")
            W = _Walk(W.darts[:pos] + [d, d ^ 1] + W.darts[pos:], None)
        elif op == "unspike":
            if not spikes:
                raise WitnessError(f"{where} (unspike): unspikes are not allowed")
            if L < 2 or (not closed and pos + 2 > L):
                raise WitnessError(f"{where} (unspike): no two darts at position {pos}")
            a, b = W.darts[pos], W.darts[(pos + 1) % L]
            if b != a ^ 1:
                raise WitnessError(f"{where} (unspike): darts {a}, {b} are not a dart and its reverse")
            W = _replace(W, pos, 2, [], closed, P)
        else:
            raise WitnessError(f"{where}: unknown op {op!r}")
        _check_continuity(P, W, closed, ends, where)
        height = max(height, _length(P, W, closed, length))
        last = idx == len(moves) - 1
        if simple and not _is_simple(P, W, closed) and not (last and not W.darts):
            raise WitnessError(f"{where} ({op}): simple homotopy: the walk after this move is not simple")
    # end condition
    if want_end is None:
        if W.darts:
            raise WitnessError(f"the homotopy ends at a walk of {len(W.darts)} darts, not at a point")
    elif not want_end.darts:
        if W.darts or W.point != want_end.point:
            got = f"a walk of {len(W.darts)} darts" if W.darts else f"the point {P.label(W.point)!r}"
            raise WitnessError(f"the homotopy ends at {got}, not at the point {P.label(want_end.point)!r}")
    else:
        ok = _same_cyclic(W.darts, want_end.darts) if closed else W.darts == want_end.darts
        if not ok:
            raise WitnessError("the homotopy does not end at the problem's end curve")
    return height


@register_checker("homotopy")
def check_homotopy(result: Any, obj: Any, **options: Any) -> float:
    """Check a homotopy result on a PlaneGraph (or a HomotopyProblem); return the recomputed height.

    The problem's options default to ``result.stats['options']`` (the solver
    stores them there) and may be overridden by keyword (``start``, ``end``,
    ``closed``, ``holes``, ``spikes``, ``simple``, ``monotone``, ``length``,
    ``s``, ``t``, ``tol``).

    Raises
    ------
    WitnessError
        No witness, an illegal move, or a height different from ``result.upper``.
    """
    tol = float(options.pop("tol", 1e-9))
    P = obj
    recorded: dict = dict((result.stats or {}).get("options", {}) or {})
    if hasattr(obj, "graph") and hasattr(obj, "options") and callable(obj.options):
        P = obj.graph
        recorded = dict(obj.options())
    valid = ("start", "end", "closed", "holes", "spikes", "simple", "monotone", "length", "s", "t")
    unknown = sorted(set(options) - set(valid))
    if unknown:
        raise InvalidArgumentError(f"unknown checker option(s) {unknown}; valid: {', '.join(valid)}, tol")
    kw = {k: recorded[k] for k in valid if k in recorded}
    kw.update(options)
    if result.witness is None:
        raise WitnessError(f"result ({result.status}) has no homotopy witness to check")
    h = replay_homotopy(P, result.witness, **kw)
    if result.upper is not None and abs(h - float(result.upper)) > tol:
        raise WitnessError(f"the witness has height {h:g} but the result claims upper = {result.upper:g}")
    return h
