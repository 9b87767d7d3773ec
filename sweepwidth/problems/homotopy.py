"""Discrete homotopy problems: curves on a plane graph, the moves, the length.

A :class:`HomotopyProblem` holds everything a homotopy solver needs, checked
once: the plane graph as flat arrays, the start curve, the end condition, the
faces that may not be flipped (holes), the allowed moves and the length
convention.  Solvers work on :class:`Curve` values and call
:meth:`HomotopyProblem.apply_move`; the independent checker in
:mod:`sweepwidth.verify.homotopy` does NOT use this module's move code.

Curves
------
A walk is a tuple of darts ``(w_0, ..., w_{L-1})`` with
``head(w_i) = tail(w_{i+1})``; it is closed when ``head(w_{L-1}) = tail(w_0)``.
A closed walk of length 0 is a *point* at a vertex.  A :class:`Curve` is the
pair ``(darts, vertex)`` where ``vertex`` is ``tail(darts[0])``, or the point's
vertex.  Vertices are *indices* ``0..n-1`` inside a problem; labels appear only
in the JSON form ``{"vertex": label, "darts": [...]}``.

Curves can be given as

* a :class:`Curve`, or the JSON form ``{"vertex": v, "darts": [d0, ...]}``;
* ``{"vertices": [v0, v1, ...]}`` or ``{"darts": [...]}``;
* a plain list: read as darts when every entry is a dart id and the list is a
  walk, otherwise as a list of vertex labels.  A vertex list must be
  unambiguous: consecutive vertices joined by exactly one edge.  For a closed
  curve the walk returns from the last vertex to the first; a repeated first
  vertex at the end (``[a, b, c, a]``) is read as that return, not as a loop.

Moves
-----
As in the shared specification (positions index the CURRENT dart sequence):

``{"op": "flip", "face": f, "pos": i, "take": k, "put": [q...]}``
    The piece ``p = w_i .. w_{i+k-1}`` (mod L for closed walks) is replaced by
    ``q``; legal iff ``f`` is not a hole and ``p + reverse(q)`` is the boundary
    walk of ``f`` up to rotation, in either orientation.
``{"op": "spike", "pos": i, "dart": d}``
    Insert ``d, d^1`` before position ``i``.
``{"op": "unspike", "pos": i}``
    Remove ``w_i, w_{i+1}`` where ``w_{i+1} = w_i ^ 1``.

A move that leaves the walk empty leaves the point at the tail of the first
removed dart.

Clarifications of the shared specification (kept in the same JSON form)
-----------------------------------------------------------------------
* For a flip with ``k = 0`` on a nonempty closed walk ``pos`` is in
  ``0..L-1``; the inserted loop ``q`` must start at ``tail(w_i)`` (the rule
  "p + reverse(q) is the face boundary" alone does not fix where a loop
  attaches, so this is checked explicitly).
* For a closed walk ``pos`` is always in ``0..L-1`` (``0`` for a point); the
  value ``L`` is accepted only for open walks, at the end vertex.
* ``take`` is at most ``L``; ``take = L`` with ``pos > 0`` on a closed walk
  wraps and returns ``q`` (the walk is re-based at the start of ``q``).
* The unspike of ``(w_{L-1}, w_0)`` on a closed walk (``pos = L - 1``) gives
  ``w_1 .. w_{L-2}``; on a walk of exactly two darts the result is the point
  at ``tail(w_pos)``.

Length
------
``length='weight'``: the sum of edge weights of the darts (a point: 0).
``length='vertices'``: vertices visited with multiplicity: the number of
darts for a closed walk (a point counts 1), darts + 1 for an open walk.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Iterable, Mapping, NamedTuple, Sequence, cast

from ..errors import InvalidArgumentError, InvalidCurveError, NotInGraphError, SweepwidthError, UnsupportedOptionError

__all__ = [
    "Curve",
    "HomotopyProblem",
    "IllegalMoveError",
    "LENGTHS",
    "apply_move",
    "curve_from_json",
    "hole_faces",
]

#: the length conventions
LENGTHS = ("weight", "vertices")


class IllegalMoveError(SweepwidthError, ValueError):
    """A move that the rules of the problem do not allow on the current curve."""


class Curve(NamedTuple):
    """A walk as a tuple of darts with its base vertex (the point's vertex when empty).

    Attributes
    ----------
    darts : tuple of int
    vertex : int
        Vertex index: ``tail(darts[0])``, or the vertex of the point.
    """

    darts: tuple
    vertex: int


def _vertex_index(P: Any, x: Any, what: str) -> int:
    """Vertex index of label ``x`` (JSON turns tuple labels into lists: accept those)."""
    if P.has_vertex(x):
        return P.index(x)
    if isinstance(x, list):
        t = _deep_tuple(x)
        if P.has_vertex(t):
            return P.index(t)
    raise InvalidCurveError(f"{what}: {x!r} is not a vertex of the plane graph")


def _deep_tuple(x: Any) -> Any:
    return tuple(_deep_tuple(y) for y in x) if isinstance(x, list) else x


def _check_dart_walk(P: Any, darts: Sequence[int], closed: bool, what: str) -> None:
    m2 = 2 * P.number_of_edges()
    for i, d in enumerate(darts):
        if isinstance(d, bool) or not isinstance(d, int) or not 0 <= d < m2:
            raise InvalidCurveError(f"{what}: dart {i} is {d!r}, not a dart id in 0..{m2 - 1}")
    for i in range(len(darts) - 1):
        a, b = darts[i], darts[i + 1]
        if P.head_index(a) != P.tail_index(b):
            raise InvalidCurveError(
                f"{what}: darts {i} and {i + 1} do not meet: head of dart {i} (id {a}) is "
                f"{P.head(a)!r}, tail of dart {i + 1} (id {b}) is {P.tail(b)!r}"
            )
    if closed and darts and P.head_index(darts[-1]) != P.tail_index(darts[0]):
        k = len(darts) - 1
        raise InvalidCurveError(
            f"{what}: the walk is not closed: head of the last dart {k} (id {darts[k]}) is "
            f"{P.head(darts[k])!r}, tail of dart 0 (id {darts[0]}) is {P.tail(darts[0])!r}"
        )


def _darts_from_vertices(P: Any, seq: Sequence[Any], closed: bool, what: str) -> Curve:
    idx = [_vertex_index(P, x, f"{what}, vertex {i}") for i, x in enumerate(seq)]
    if not idx:
        raise InvalidCurveError(f"{what}: an empty vertex list")
    if closed:
        if len(idx) == 1:
            return Curve((), idx[0])
        if idx[-1] == idx[0]:
            idx = idx[:-1]
        pairs = list(zip(idx, idx[1:] + idx[:1]))
    else:
        pairs = list(zip(idx, idx[1:]))
    darts = []
    for i, (a, b) in enumerate(pairs):
        la, lb = P.label(a), P.label(b)
        cand = P.darts_between(la, lb)
        if a == b:
            # a loop has both darts leaving a: count each loop edge once
            cand = sorted({d & ~1 for d in cand})
        if not cand:
            raise InvalidCurveError(f"{what}: vertices {i} ({la!r}) and {i + 1} ({lb!r}) are not adjacent")
        if len(cand) > 1:
            raise InvalidCurveError(
                f"{what}: vertices {i} ({la!r}) and {i + 1} ({lb!r}) are joined by {len(cand)} edges; "
                "give the curve as darts"
            )
        darts.append(cand[0])
    return Curve(tuple(darts), idx[0])


def curve_from_json(P: Any, spec: Any, *, closed: bool = True, what: str = "curve") -> Curve:
    """Parse a curve given as a Curve, JSON walk form, dart list or vertex list.

    Parameters
    ----------
    P : PlaneGraph
    spec : Curve, dict or sequence
        See the module docstring for the accepted forms.
    closed : bool
        Whether the walk must be closed.
    what : str
        Name used in error messages ('start', 'end', ...).

    Returns
    -------
    Curve

    Raises
    ------
    InvalidCurveError
        Naming the bad step, e.g. two consecutive darts that do not meet.

    Examples
    --------
    >>> from sweepwidth.generators import wheel
    >>> P = wheel(3)
    >>> c = curve_from_json(P, [1, 2, 3])
    >>> len(c.darts), P.label(c.vertex)
    (3, 1)
    """
    if isinstance(spec, Curve):
        _check_dart_walk(P, spec.darts, closed, what)
        if spec.darts and spec.vertex != P.tail_index(spec.darts[0]):
            raise InvalidCurveError(f"{what}: base vertex {spec.vertex} is not the tail of dart 0")
        return Curve(tuple(spec.darts), int(spec.vertex))
    if isinstance(spec, Mapping):
        if "vertices" in spec:
            return _darts_from_vertices(P, list(spec["vertices"]), closed, what)
        if "darts" not in spec:
            raise InvalidCurveError(f"{what}: a walk needs 'darts' (and 'vertex') or 'vertices'; got keys {sorted(spec)}")
        darts = list(spec["darts"])
        _check_dart_walk(P, darts, closed, what)
        if "vertex" in spec and spec["vertex"] is not None:
            v = _vertex_index(P, spec["vertex"], f"{what}, 'vertex'")
            if darts and v != P.tail_index(darts[0]):
                raise InvalidCurveError(
                    f"{what}: 'vertex' is {spec['vertex']!r} but dart 0 (id {darts[0]}) leaves {P.tail(darts[0])!r}"
                )
        elif darts:
            v = P.tail_index(darts[0])
        else:
            raise InvalidCurveError(f"{what}: an empty walk (a point) needs its 'vertex'")
        return Curve(tuple(darts), v)
    if isinstance(spec, (str, bytes)) or not isinstance(spec, Iterable):
        raise InvalidCurveError(
            f"{what}: expected a list of darts or vertices, or {{'vertex': v, 'darts': [...]}}, got {spec!r}"
        )
    seq = list(spec)
    if not seq:
        raise InvalidCurveError(f"{what}: an empty list; give a point as {{'vertex': v, 'darts': []}}")
    m2 = 2 * P.number_of_edges()
    as_darts = all(isinstance(d, int) and not isinstance(d, bool) and 0 <= d < m2 for d in seq)
    dart_error: InvalidCurveError | None = None
    if as_darts:
        try:
            _check_dart_walk(P, seq, closed, what)
            return Curve(tuple(seq), P.tail_index(seq[0]))
        except InvalidCurveError as err:
            dart_error = err
    if all(P.has_vertex(x) or (isinstance(x, list) and P.has_vertex(_deep_tuple(x))) for x in seq):
        try:
            return _darts_from_vertices(P, seq, closed, what)
        except InvalidCurveError as verr:
            if dart_error is not None:
                raise InvalidCurveError(
                    f"{what}: {list(seq)!r} is neither a walk of darts ({dart_error}) "
                    f"nor a walk of vertices ({verr})"
                ) from None
            raise
    if dart_error is not None:
        raise dart_error
    _check_dart_walk(P, seq, closed, what)  # raises, naming the bad entry
    raise InvalidCurveError(f"{what}: cannot read {spec!r} as a walk")  # pragma: no cover


@dataclass(frozen=True, eq=False)
class HomotopyProblem:
    """A discrete homotopy problem on a plane graph, validated once.

    Build it with :meth:`build`.  The height of a homotopy (a sequence of
    curves, each one legal move from the last) is the largest length along
    it, start and end included; the problem asks for the least height of a
    homotopy from ``start`` to the end condition.

    Attributes
    ----------
    graph : PlaneGraph
    closed : bool
        Closed walks (free homotopy) or open walks with fixed ends (``s``, ``t``).
    start : Curve
    end : Curve or None
        None: any point (closed curves only).  A closed end curve is matched up
        to cyclic rotation (a point end at its vertex); an open one exactly.
    holes : frozenset of int
        Faces that may not be flipped.
    spikes, simple, monotone : bool
        Spike/unspike moves allowed; every walk but a final point a simple
        cycle or path; each face flipped at most once.
    length : str
        'weight' or 'vertices'.
    s, t : int or None
        End vertices (indices) of open walks.
    tail, head : tuple of int
        ``tail[d]``, ``head[d]`` vertex indices of dart d.
    cost : tuple of float
        Length contribution of dart d (its weight, or 1 for 'vertices').
    face_walks : tuple of tuple of int
        Boundary walk of each face (face on the left).
    dart_face : tuple of int
        Face on the left of dart d.
    dart_slot : tuple of int
        Index of dart d in ``face_walks[dart_face[d]]``.
    """

    graph: Any
    closed: bool
    start: Curve
    end: Curve | None
    holes: frozenset
    spikes: bool = True
    simple: bool = False
    monotone: bool = False
    length: str = "weight"
    s: int | None = None
    t: int | None = None
    tail: tuple = field(default=(), repr=False)
    head: tuple = field(default=(), repr=False)
    cost: tuple = field(default=(), repr=False)
    face_walks: tuple = field(default=(), repr=False)
    dart_face: tuple = field(default=(), repr=False)
    dart_slot: tuple = field(default=(), repr=False)

    # ------------------------------------------------------------ building
    @classmethod
    def build(
        cls,
        P: Any,
        *,
        start: Any = None,
        end: Any = None,
        spikes: bool = True,
        simple: bool = False,
        monotone: bool = False,
        length: str = "weight",
        holes: Iterable[int] | None = None,
        s: Any = None,
        t: Any = None,
    ) -> "HomotopyProblem":
        """Validate the options and build the problem.

        Parameters
        ----------
        P : PlaneGraph
        start, end : curve, optional
            Default (closed): start = the outer face's boundary walk, end = a
            point anywhere.  With ``s`` and ``t`` (open walks, both on the
            outer face): start = the outer boundary from ``s`` to ``t`` along
            the outer face's walk, end = the other way round from ``s`` to ``t``.
            An end given as ``{"vertex": v, "darts": []}`` asks for the point v.
        spikes, simple, monotone : bool
        length : {'weight', 'vertices'}
        holes : iterable of int, optional
            Default ``{P.outer_face}``.
        s, t : vertex labels, optional
            Fixed ends of open walks.

        Returns
        -------
        HomotopyProblem

        Raises
        ------
        InvalidCurveError
            A curve that is not a walk of P, an open start not running from s
            to t, s or t not on the outer face, ``s == t``.
        UnsupportedOptionError
            An unknown ``length``.
        SweepwidthError
            A hole that is not a face id.

        Examples
        --------
        >>> from sweepwidth.generators import wheel
        >>> H = HomotopyProblem.build(wheel(4))
        >>> H.length_of(H.start), H.end is None, sorted(H.holes) == [wheel(4).outer_face]
        (4.0, True, True)
        """
        if length not in LENGTHS:
            raise UnsupportedOptionError("length", length, list(LENGTHS))
        for name, val in (("spikes", spikes), ("simple", simple), ("monotone", monotone)):
            if not isinstance(val, bool):
                raise InvalidArgumentError(f"option {name} must be True or False, got {val!r}")
        F = P.number_of_faces()
        hole_set = hole_faces(P, holes, NotInGraphError)
        m = P.number_of_edges()
        tail = tuple(P.tail_index(d) for d in range(2 * m))
        head = tuple(P.head_index(d) for d in range(2 * m))
        if length == "weight":
            cost = tuple(float(P.weight(d >> 1)) for d in range(2 * m))
        else:
            cost = tuple(1.0 for _ in range(2 * m))
        walks = tuple(tuple(P.face_darts(f)) for f in range(F))
        dface = [0] * (2 * m)
        slot = [0] * (2 * m)
        for f, w in enumerate(walks):
            for k, d in enumerate(w):
                dface[d] = f
                slot[d] = k
        open_form = s is not None or t is not None
        si = ti = None
        if open_form:
            if s is None or t is None:
                raise InvalidCurveError("open walks need both ends s and t")
            si = _vertex_index(P, s, "s")
            ti = _vertex_index(P, t, "t")
            if si == ti:
                raise InvalidCurveError(f"s and t are the same vertex {s!r}; use a closed curve instead")
            outer = walks[P.outer_face]
            on_outer = {tail[d] for d in outer}
            for name, v, lab in (("s", si, s), ("t", ti, t)):
                if v not in on_outer:
                    raise InvalidCurveError(f"{name}={lab!r} is not on the outer face {P.outer_face}")
            k0 = next(k for k, d in enumerate(outer) if tail[d] == si)
            rot = outer[k0:] + outer[:k0]
            k1 = next(k for k, d in enumerate(rot) if tail[d] == ti)
            side_a, side_b = rot[:k1], rot[k1:]
            default_start = Curve(tuple(side_a), si)
            default_end = Curve(tuple(d ^ 1 for d in reversed(side_b)), si)
            st = default_start if start is None else curve_from_json(P, start, closed=False, what="start")
            en: Curve | None = default_end if end is None else curve_from_json(P, end, closed=False, what="end")
            for name, c in (("start", st), ("end", cast(Curve, en))):  # open form: en is always a Curve
                a = c.vertex
                b = head[c.darts[-1]] if c.darts else c.vertex
                if a != si or b != ti:
                    raise InvalidCurveError(
                        f"{name} runs from {P.label(a)!r} to {P.label(b)!r}, not from s={s!r} to t={t!r}"
                    )
            return cls(P, False, st, en, hole_set, spikes, simple, monotone, length, si, ti,
                       tail, head, cost, walks, tuple(dface), tuple(slot))
        if start is None:
            outer = walks[P.outer_face]
            st = Curve(tuple(outer), tail[outer[0]] if outer else 0)
        else:
            st = curve_from_json(P, start, closed=True, what="start")
        en = None if end is None else curve_from_json(P, end, closed=True, what="end")
        return cls(P, True, st, en, hole_set, spikes, simple, monotone, length, None, None,
                   tail, head, cost, walks, tuple(dface), tuple(slot))

    # ------------------------------------------------------------ queries
    @property
    def n_faces(self) -> int:
        return len(self.face_walks)

    @property
    def sweepable_faces(self) -> list[int]:
        """Faces that may be flipped (all faces but the holes)."""
        return [f for f in range(len(self.face_walks)) if f not in self.holes]

    def length_of(self, curve: Curve | Sequence[int]) -> float:
        """Length of a curve under the problem's convention.

        Examples
        --------
        >>> from sweepwidth.generators import wheel
        >>> H = HomotopyProblem.build(wheel(4), length="vertices")
        >>> H.length_of(Curve((), 0)), H.length_of(H.start)
        (1.0, 4.0)
        """
        darts = curve.darts if isinstance(curve, Curve) else curve
        if self.length == "vertices":
            return float(len(darts) + (0 if self.closed else 1)) if darts or not self.closed else 1.0
        c = self.cost
        return float(sum(c[d] for d in darts))

    def is_simple(self, curve: Curve) -> bool:
        """A simple cycle (closed) or simple path (open).

        A point is not simple (the rules allow it only as the final curve).
        """
        w = curve.darts
        if not w:
            return False
        tails = [self.tail[d] for d in w]
        if self.closed:
            if len(set(tails)) != len(tails):
                return False
            return len({d >> 1 for d in w}) == len(w)
        return len(set(tails)) == len(tails) and self.head[w[-1]] not in tails

    def is_end(self, curve: Curve) -> bool:
        """Whether ``curve`` meets the end condition."""
        if self.end is None:
            return not curve.darts
        if not self.closed:
            return curve.darts == self.end.darts
        a, b = curve.darts, self.end.darts
        if not b:
            return not a and curve.vertex == self.end.vertex
        if len(a) != len(b):
            return False
        L = len(a)
        first = b[0]
        return any(a[k] == first and a[k:] + a[:k] == b for k in range(L))

    def vertex_at(self, curve: Curve, pos: int) -> int:
        """The vertex at position ``pos`` (``tail(w_pos)``; the end vertex for ``pos = L``)."""
        w = curve.darts
        if not w:
            return curve.vertex
        if pos == len(w):
            return self.head[w[-1]]
        return self.tail[w[pos]]

    def to_json(self, curve: Curve) -> dict:
        """The JSON walk form ``{"vertex": label, "darts": [...]}``."""
        return {"vertex": self.graph.label(curve.vertex), "darts": list(curve.darts)}

    def curve(self, spec: Any, what: str = "curve") -> Curve:
        """Parse a curve in any accepted form for this problem (closed or open)."""
        return curve_from_json(self.graph, spec, closed=self.closed, what=what)

    def options(self) -> dict:
        """JSON-ready description of the problem (stored in result stats, read by the checker)."""
        return {
            "closed": self.closed,
            "start": self.to_json(self.start),
            "end": None if self.end is None else self.to_json(self.end),
            "holes": sorted(self.holes),
            "spikes": self.spikes,
            "simple": self.simple,
            "monotone": self.monotone,
            "length": self.length,
            "s": None if self.s is None else self.graph.label(self.s),
            "t": None if self.t is None else self.graph.label(self.t),
        }

    # ------------------------------------------------------------ moves
    def flip_fits(self, f: int, seq: Sequence[int]) -> bool:
        """Whether the closed dart sequence ``seq`` is the boundary walk of face f up to rotation (either orientation)."""
        B = self.face_walks[f]
        n = len(B)
        if len(seq) != n or n == 0:
            return False
        d0 = seq[0]
        if self.dart_face[d0] == f:
            r = self.dart_slot[d0]
            if all(seq[x] == B[(r + x) % n] for x in range(n)):
                return True
        if self.dart_face[d0 ^ 1] == f:
            # reverse orientation: (B[n-1]^1, ..., B[0]^1); seq[x] = B[r - x]^1
            r = self.dart_slot[d0 ^ 1]
            if all(seq[x] == B[(r - x) % n] ^ 1 for x in range(n)):
                return True
        return False

    def apply_move(self, curve: Curve, move: Mapping[str, Any], *, check: bool = True) -> Curve:
        """The curve after one move (see the module docstring for the rules).

        Parameters
        ----------
        curve : Curve
        move : dict
            A flip, spike or unspike in the JSON form.
        check : bool
            Check legality (holes, spikes allowed, face boundary, continuity).
            Solvers that generate only legal moves may pass False.  Simplicity
            and monotonicity are properties of whole homotopies: not checked here.

        Returns
        -------
        Curve

        Raises
        ------
        IllegalMoveError
            Naming the rule broken.

        Examples
        --------
        >>> from sweepwidth.generators import wheel
        >>> H = HomotopyProblem.build(wheel(3))
        >>> c = H.start
        >>> f = H.dart_face[c.darts[0] ^ 1]          # the inner face along dart 0
        >>> B = H.face_walks[f]
        >>> k = B.index(c.darts[0] ^ 1)
        >>> q = [B[(k + 1) % 3], B[(k + 2) % 3]]      # the rest of f's boundary
        >>> c2 = H.apply_move(c, {"op": "flip", "face": f, "pos": 0, "take": 1, "put": q})
        >>> len(c2.darts), H.length_of(c2)
        (4, 4.0)
        """
        return apply_move(self, curve, move, check=check)


def apply_move(problem: HomotopyProblem, curve: Curve, move: Mapping[str, Any], *, check: bool = True) -> Curve:
    """Module-level form of :meth:`HomotopyProblem.apply_move`."""
    W = curve.darts
    L = len(W)
    closed = problem.closed
    tail = problem.tail
    try:
        op = move["op"]
    except (KeyError, TypeError):
        raise IllegalMoveError(f"a move needs an 'op' ('flip', 'spike', 'unspike'), got {move!r}") from None
    pos = move.get("pos", 0)
    if isinstance(pos, bool) or not isinstance(pos, int):
        raise IllegalMoveError(f"'pos' must be an integer, got {pos!r}")
    hi = L if (not closed or L == 0) else L - 1
    if not 0 <= pos <= hi:
        raise IllegalMoveError(f"position {pos} is outside 0..{hi} for a walk of {L} darts")
    if op == "flip":
        f = move.get("face")
        k = move.get("take", 0)
        q = tuple(move.get("put", ()))
        if check:
            if isinstance(f, bool) or not isinstance(f, int) or not 0 <= f < len(problem.face_walks):
                raise IllegalMoveError(f"flip of {f!r}, which is not a face id")
            if f in problem.holes:
                raise IllegalMoveError(f"face {f} is a hole and may not be flipped")
            if isinstance(k, bool) or not isinstance(k, int) or not 0 <= k <= L:
                raise IllegalMoveError(f"'take' must be in 0..{L}, got {k!r}")
            if not closed and pos + k > L:
                raise IllegalMoveError("the piece of an open walk may not wrap around")
            m2 = len(tail)
            if any(isinstance(d, bool) or not isinstance(d, int) or not 0 <= d < m2 for d in q):
                raise IllegalMoveError(f"'put' holds something that is not a dart id: {list(q)!r}")
        if pos + k <= L:
            p = W[pos:pos + k]
        else:
            p = W[pos:] + W[:(pos + k) % L]
        if check:
            seq = tuple(p) + tuple(d ^ 1 for d in reversed(q))
            if not problem.flip_fits(cast(int, f), seq):  # f was checked to be a face id above
                raise IllegalMoveError(
                    f"piece {list(p)} followed by the reverse of {list(q)} is not the boundary of face {f}"
                )
            if k == 0 and q and tail[q[0]] != problem.vertex_at(curve, pos):
                raise IllegalMoveError(
                    f"the inserted loop starts at vertex {problem.graph.label(tail[q[0]])!r}, "
                    f"not at the walk's vertex {problem.graph.label(problem.vertex_at(curve, pos))!r} at position {pos}"
                )
        if pos + k <= L:
            new = W[:pos] + q + W[pos + k:]
        else:
            new = q + W[(pos + k) % L:pos]
        if new:
            return Curve(new, tail[new[0]])
        return Curve((), tail[p[0]] if p else curve.vertex)
    if op == "spike":
        if check and not problem.spikes:
            raise IllegalMoveError("spikes are not allowed in this problem")
        d = move.get("dart")
        if isinstance(d, bool) or not isinstance(d, int) or not 0 <= d < len(tail):
            raise IllegalMoveError(f"spike of {d!r}, which is not a dart id")
        if check and tail[d] != problem.vertex_at(curve, pos):
            raise IllegalMoveError(
                f"spike dart {d} leaves {problem.graph.label(tail[d])!r}, not the walk's vertex "
                f"{problem.graph.label(problem.vertex_at(curve, pos))!r} at position {pos}"
            )
        new = W[:pos] + (d, d ^ 1) + W[pos:]
        return Curve(new, tail[new[0]])
    if op == "unspike":
        if check and not problem.spikes:
            raise IllegalMoveError("unspikes are not allowed in this problem")
        if L < 2 or (not closed and pos + 2 > L):
            raise IllegalMoveError(f"no two darts at position {pos} to unspike")
        a = W[pos]
        b = W[(pos + 1) % L]
        if b != a ^ 1:
            raise IllegalMoveError(f"darts {a} and {b} at position {pos} are not a dart and its reverse")
        if pos + 2 <= L:
            new = W[:pos] + W[pos + 2:]
        else:
            new = W[(pos + 2) % L:pos]
        if new:
            return Curve(new, tail[new[0]])
        return Curve((), tail[a])
    raise IllegalMoveError(f"unknown move op {op!r}; valid: 'flip', 'spike', 'unspike'")


def hole_faces(P: Any, holes: Any, error: type[Exception]) -> frozenset:
    """The hole faces asked for (default: the outer face), each checked to be a face id of ``P``.

    ``holes`` is None, one face id or a collection of them; a bad id raises
    ``error`` naming it and the valid range.
    """
    F = P.number_of_faces()
    if holes is None:
        return frozenset({P.outer_face})
    if isinstance(holes, (int, str)):
        holes = [holes]
    hs = []
    for h in holes:
        if isinstance(h, bool) or not isinstance(h, int) or not 0 <= h < F:
            raise error(f"hole {h!r} is not a face id in 0..{F - 1}")
        hs.append(int(h))
    return frozenset(hs)
