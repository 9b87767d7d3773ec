"""Z2 cycles of a plane graph and the face sets that they bound.

Definitions
-----------
A *Z2 cycle* (a 1-cycle with coefficients mod 2) of a plane graph ``P`` is a
set of edge ids in which every vertex has even degree (a loop counts twice,
so loops may always be present).  The *boundary* ``dX`` of a face set ``X``
is the set of edges that have a face of ``X`` on exactly one side; every
boundary is a Z2 cycle, and on the sphere every Z2 cycle is the boundary of
exactly two face sets, complements of each other.

A *homology sweep* from ``c0`` to ``c1`` avoiding a set ``H`` of *holes*
toggles the faces of a set ``S`` (with ``S`` disjoint from ``H`` and
``dS = c0 + c1``) one at a time; the cycle after the first ``i`` toggles is
``c0 + d(S_i)``.  :class:`HomologyProblem` holds a validated start, end and
holes and the (zero, one or two) admissible swept sets ``S``.
:class:`FaceSweep` turns "the weight of ``c0 + dT``" for subsets ``T`` of a
set of free faces into a small weighted graph, which is what the solvers in
:mod:`sweepwidth.solve.homology` and :mod:`sweepwidth.solve.homology.face_sets`
work on.

Curve specifications
--------------------
``start`` and ``end`` accept

* ``None``: the default (start: the Z2 boundary of the outer face; end: empty);
* a ``set`` / ``frozenset`` of edge ids, or a list/tuple of edge ids;
* a list/tuple of vertex labels, read as the closed walk through them
  (a repeated first vertex at the end is allowed); parallel edges make this
  ambiguous and are refused;
* a dict in the shared walk form ``{"vertex": v, "darts": [d0, ...]}`` (a
  closed walk, reduced mod 2), or ``{"edges": [...]}``,
  ``{"vertices": [...]}``, ``{"faces": [...]}`` (the Z2 boundary of a face
  set);
* any object with a ``darts`` attribute (a closed walk).

A list of integers that is both a list of valid edge ids and a closed walk
through integer vertex labels with a different edge set is refused as
ambiguous: say ``{"edges": ...}`` or ``{"vertices": ...}``.
"""

from __future__ import annotations

from collections import deque
from dataclasses import dataclass
from typing import Any, Hashable, Iterable, Mapping, Sequence

from ..errors import InputTypeError, InvalidArgumentError, InvalidCurveError, NotInGraphError, SweepwidthError

__all__ = [
    "cycle_edges",
    "walk_cycle",
    "check_even",
    "cycle_weight",
    "parse_holes",
    "bounded_face_sets",
    "HomologyProblem",
    "FaceSweep",
]


def _plane(P: Any) -> None:
    if not (hasattr(P, "face_darts") and hasattr(P, "edge_faces") and hasattr(P, "outer_face")):
        raise InputTypeError(f"expected a PlaneGraph, got {type(P).__name__}")


def _is_int(x: Any) -> bool:
    return isinstance(x, int) and not isinstance(x, bool) or (hasattr(x, "dtype") and getattr(x.dtype, "kind", "") in "iu")


def walk_cycle(
    P: Any, darts: Sequence[int], *, vertex: Hashable | None = None, what: str = "curve", closed: bool = True
) -> frozenset[int]:
    """The Z2 cycle of a closed walk given by its darts (edges used an odd number of times).

    Parameters
    ----------
    P : PlaneGraph
    darts : sequence of int
        ``head(d_i) == tail(d_{i+1})`` and ``head(last) == tail(first)``.
        Empty means a point.
    vertex : vertex label, optional
        The walk's first vertex (the point, for an empty walk); checked.
    what : str
        Name used in error messages ('start', 'end').
    closed : bool
        False accepts an open walk (a path form): the last dart need not
        end where the first starts, and the result is a chain whose odd
        vertices are the two ends (none when they coincide).

    Returns
    -------
    frozenset of int

    Raises
    ------
    InvalidCurveError
        A dart that does not exist, two consecutive darts that do not meet,
        a walk that does not close (``closed=True``), or a ``vertex`` that is
        not its start.

    Examples
    --------
    >>> from sweepwidth import generators
    >>> P = generators.wheel(3)
    >>> sorted(walk_cycle(P, P.face_darts(P.outer_face))) == sorted(P.face_boundary_cycle(P.outer_face))
    True
    """
    ds = list(darts)
    m2 = 2 * P.number_of_edges()
    for i, d in enumerate(ds):
        if not _is_int(d) or not 0 <= int(d) < m2:
            raise InvalidCurveError(f"{what}: dart {d!r} at position {i} does not exist (darts are 0..{m2 - 1})")
    ds = [int(d) for d in ds]
    if vertex is not None:
        if not P.has_vertex(vertex):
            raise InvalidCurveError(f"{what}: vertex {vertex!r} is not a vertex of the graph")
        if ds and P.tail(ds[0]) != vertex:
            raise InvalidCurveError(
                f"{what}: the walk is said to start at {vertex!r} but its first dart {ds[0]} leaves {P.tail(ds[0])!r}"
            )
    odd: set[int] = set()
    for i, d in enumerate(ds):
        nxt = ds[(i + 1) % len(ds)]
        if not closed and i == len(ds) - 1:
            odd ^= {d >> 1}
            break
        if P.head_index(d) != P.tail_index(nxt):
            if i == len(ds) - 1:
                raise InvalidCurveError(
                    f"{what}: the walk does not close: its last dart {d} ends at {P.head(d)!r} "
                    f"but the first dart {nxt} leaves {P.tail(nxt)!r}"
                )
            raise InvalidCurveError(
                f"{what}: darts {d} (position {i}) and {nxt} do not meet: {P.head(d)!r} != {P.tail(nxt)!r}"
            )
        odd ^= {d >> 1}
    return frozenset(odd)


def _edge_ids(P: Any, items: Iterable[Any], what: str) -> frozenset[int]:
    m = P.number_of_edges()
    odd: set[int] = set()
    for e in items:
        if not _is_int(e) or not 0 <= int(e) < m:
            raise InvalidCurveError(f"{what}: edge id {e!r} does not exist (edge ids are 0..{m - 1})")
        odd ^= {int(e)}
    return frozenset(odd)


def _vertex_walk(P: Any, seq: Sequence[Hashable], what: str, closed: bool = True) -> frozenset[int]:
    vs = list(seq)
    for v in vs:
        if not P.has_vertex(v):
            raise InvalidCurveError(f"{what}: {v!r} is not a vertex of the graph")
    if closed and len(vs) > 1 and vs[0] == vs[-1]:
        vs = vs[:-1]
    if len(vs) <= 1:
        return frozenset()
    odd: set[int] = set()
    steps = len(vs) if closed else len(vs) - 1
    for i in range(steps):
        u = vs[i]
        v = vs[(i + 1) % len(vs)]
        ds = P.darts_between(u, v)
        if u == v:
            ds = ds[::2]  # a loop shows up once per end
        if not ds:
            raise InvalidCurveError(f"{what}: consecutive vertices {u!r} and {v!r} are not adjacent")
        if len({d >> 1 for d in ds}) > 1:
            raise InvalidCurveError(
                f"{what}: {u!r} and {v!r} are joined by parallel edges {sorted({d >> 1 for d in ds})}; "
                "give the walk as darts ({'darts': [...]}) or the cycle as edge ids"
            )
        odd ^= {ds[0] >> 1}
    return frozenset(odd)


def _vertex_walk_or_none(P: Any, seq: Sequence[Any], closed: bool = True) -> frozenset[int] | None:
    try:
        return _vertex_walk(P, seq, "curve", closed)
    except InvalidCurveError:
        return None


def _face_boundary(P: Any, faces: Iterable[Any], what: str) -> frozenset[int]:
    F = P.number_of_faces()
    odd: set[int] = set()
    for f in faces:
        if not _is_int(f) or not 0 <= int(f) < F:
            raise InvalidCurveError(f"{what}: face id {f!r} does not exist (face ids are 0..{F - 1})")
        odd ^= set(P.face_boundary_cycle(int(f)))
    return frozenset(odd)


_DICT_KEYS = ("edges", "darts", "vertex", "vertices", "faces")


def cycle_edges(
    P: Any, spec: Any, *, what: str = "curve", default: str = "empty", closed: bool = True
) -> frozenset[int]:
    """Parse a cycle specification into a set of edge ids, reduced mod 2 (evenness not checked).

    Parameters
    ----------
    P : PlaneGraph
    spec : see the module notes
        ``None`` gives the ``default``.
    what : str
        Name used in error messages ('start', 'end').
    default : {'empty', 'outer'}
        What ``None`` means: the empty cycle, or the Z2 boundary of the outer face.
    closed : bool
        False reads dart walks and vertex lists as open walks (paths).

    Returns
    -------
    frozenset of int

    Raises
    ------
    InvalidCurveError
        An unknown edge, dart, vertex or face, a walk that is not a closed
        walk of ``P``, or an ambiguous list.

    Examples
    --------
    >>> from sweepwidth import generators
    >>> P = generators.grid(2, 2)                  # one square, edges 0..3
    >>> sorted(cycle_edges(P, None, default="outer"))
    [0, 1, 2, 3]
    >>> sorted(cycle_edges(P, [(0, 0), (0, 1), (1, 1), (1, 0)]))
    [0, 1, 2, 3]
    >>> sorted(cycle_edges(P, {"edges": [0, 1, 1]}))
    [0]
    """
    if spec is None:
        if default == "outer":
            return frozenset(P.face_boundary_cycle(P.outer_face))
        return frozenset()
    if isinstance(spec, Mapping):
        unknown = sorted(set(map(str, spec)) - set(_DICT_KEYS))
        if unknown:
            raise InvalidCurveError(f"{what}: unknown key(s) {unknown}; valid: {', '.join(_DICT_KEYS)}")
        kinds = [k for k in ("edges", "darts", "vertices", "faces") if k in spec]
        if len(kinds) != 1:
            raise InvalidCurveError(f"{what}: give exactly one of 'edges', 'darts', 'vertices', 'faces' (got {kinds})")
        k = kinds[0]
        if k == "edges":
            return _edge_ids(P, spec["edges"], what)
        if k == "darts":
            return walk_cycle(P, spec["darts"], vertex=spec.get("vertex"), what=what, closed=closed)
        if k == "vertices":
            return _vertex_walk(P, spec["vertices"], what, closed)
        return _face_boundary(P, spec["faces"], what)
    if hasattr(spec, "darts") and not isinstance(spec, (str, bytes)):
        return walk_cycle(P, list(spec.darts), vertex=getattr(spec, "vertex", None), what=what, closed=closed)
    if isinstance(spec, (set, frozenset)):
        return _edge_ids(P, spec, what)
    if type(spec).__name__ == "ndarray" and hasattr(spec, "tolist"):
        spec = spec.tolist()
    if isinstance(spec, (list, tuple)):
        items = list(spec)
        if not items:
            return frozenset()
        m = P.number_of_edges()
        as_edges = all(_is_int(e) and 0 <= int(e) < m for e in items)
        as_walk = _vertex_walk_or_none(P, items, closed) if all(P.has_vertex(v) for v in items) else None
        if as_edges and as_walk is not None:
            edges = _edge_ids(P, items, what)
            if edges != as_walk:
                raise InvalidCurveError(
                    f"{what}: {items!r} reads both as edge ids and as a closed walk through vertices; "
                    "say {'edges': [...]} or {'vertices': [...]}"
                )
            return edges
        if as_edges:
            return _edge_ids(P, items, what)
        if all(P.has_vertex(v) for v in items):
            return _vertex_walk(P, items, what, closed)  # raises with the precise reason
        if all(_is_int(e) for e in items):
            return _edge_ids(P, items, what)  # raises naming the bad edge id
        bad = next(v for v in items if not P.has_vertex(v))
        raise InvalidCurveError(f"{what}: {bad!r} is neither an edge id nor a vertex of the graph")
    raise InvalidCurveError(
        f"{what}: cannot read a cycle from a {type(spec).__name__}; give edge ids, a vertex walk or a walk dict"
    )


def check_even(P: Any, edges: Iterable[int], *, what: str = "curve") -> None:
    """Raise :class:`InvalidCurveError` naming a vertex of odd degree in ``edges``.

    Examples
    --------
    >>> from sweepwidth import generators
    >>> P = generators.grid(2, 2)
    >>> check_even(P, {0, 1, 2, 3})
    >>> check_even(P, {0})
    Traceback (most recent call last):
    ...
    sweepwidth.errors.InvalidCurveError: curve is not a Z2 cycle: vertex (0, 0) has odd degree 1 (and 1 more odd vertex)
    """
    deg: dict[int, int] = {}
    for e in edges:
        a, b = P.tail_index(2 * e), P.head_index(2 * e)
        deg[a] = deg.get(a, 0) + 1
        deg[b] = deg.get(b, 0) + 1
    odd = sorted(i for i, k in deg.items() if k % 2)
    if odd:
        v = odd[0]
        raise InvalidCurveError(
            f"{what} is not a Z2 cycle: vertex {P.label(v)!r} has odd degree {deg[v]}"
            + (f" (and {len(odd) - 1} more odd vertex{'es' if len(odd) > 2 else ''})" if len(odd) > 1 else "")
        )


def cycle_weight(P: Any, edges: Iterable[int]) -> float:
    """Total weight of a set of edge ids (the length of a Z2 cycle).

    Examples
    --------
    >>> from sweepwidth import generators
    >>> P = generators.grid(2, 3)
    >>> cycle_weight(P, P.face_boundary_cycle(P.outer_face))
    6.0
    """
    return float(sum(P.weight(e) for e in edges))


def parse_holes(P: Any, holes: Any) -> frozenset[int]:
    """Validated hole set: ``None`` means ``{P.outer_face}``; an int means one face.

    Raises
    ------
    SweepwidthError
        A face id that does not exist.

    Examples
    --------
    >>> from sweepwidth import generators
    >>> P = generators.grid(2, 3)
    >>> parse_holes(P, None) == {P.outer_face}, parse_holes(P, ()), sorted(parse_holes(P, 0))
    (True, frozenset(), [0])
    """
    if holes is None:
        return frozenset({P.outer_face})
    if _is_int(holes):
        holes = [holes]
    F = P.number_of_faces()
    out = set()
    for h in holes:
        if not _is_int(h) or not 0 <= int(h) < F:
            raise NotInGraphError(f"hole {h!r} is not a face id (face ids are 0..{F - 1})")
        out.add(int(h))
    return frozenset(out)


def _two_colouring(P: Any, cycle: frozenset[int]) -> list[int] | None:
    """Labels x_f in {0, 1} with x_f != x_g exactly across the edges of ``cycle``; None if none exist.

    Propagated along a BFS of the dual; every other dual edge is then checked.
    """
    F = P.number_of_faces()
    m = P.number_of_edges()
    adj: list[list[tuple[int, int]]] = [[] for _ in range(F)]
    for e in range(m):
        f, g = P.edge_faces(e)
        p = 1 if e in cycle else 0
        adj[f].append((g, p))
        adj[g].append((f, p))
    x = [-1] * F
    for root in range(F):
        if x[root] != -1:
            continue
        x[root] = 0
        queue = deque([root])
        while queue:
            f = queue.popleft()
            for g, p in adj[f]:
                want = x[f] ^ p
                if x[g] == -1:
                    x[g] = want
                    queue.append(g)
                elif x[g] != want:
                    return None
    return x


def bounded_face_sets(P: Any, cycle: Iterable[int], holes: Iterable[int] = ()) -> tuple[list[frozenset[int]], str | None]:
    """The face sets ``X`` avoiding ``holes`` with ``dX = cycle``, and a reason when there is none.

    On the sphere a Z2 cycle bounds exactly two face sets (complements); those
    that meet a hole are dropped, so the answer has 0, 1 or 2 sets (2 only
    without holes).

    Parameters
    ----------
    P : PlaneGraph
    cycle : iterable of int
        A Z2 cycle (edge ids).
    holes : iterable of int
        Faces that may not be in ``X``.

    Returns
    -------
    sets : list of frozenset of int
    reason : str or None
        Why ``sets`` is empty.

    Notes
    -----
    One BFS of the dual: O(V + E + F).

    Examples
    --------
    >>> from sweepwidth import generators
    >>> P = generators.grid(2, 3)                  # two squares side by side
    >>> c = P.face_boundary_cycle(P.outer_face)
    >>> sets, why = bounded_face_sets(P, c, {P.outer_face})
    >>> [sorted(s) for s in sets], why
    ([[0, 2]], None)
    """
    c = frozenset(cycle)
    H = frozenset(holes)
    x = _two_colouring(P, c)
    if x is None:
        return [], "the curve is not the boundary of any face set (not a Z2 cycle)"
    F = P.number_of_faces()
    one = frozenset(f for f in range(F) if x[f] == 1)
    zero = frozenset(f for f in range(F) if x[f] == 0)
    out = [X for X in (zero, one) if not (X & H)]
    out.sort(key=lambda X: (len(X), sorted(X)))
    if out:
        return out, None
    h1 = min(H & one)
    h0 = min(H & zero)
    return [], (
        f"holes {h0} and {h1} lie on different sides of start + end, so every face set bounded by it "
        "contains a hole: start and end are not homologous in the complement of the holes"
    )


@dataclass(frozen=True, eq=False)
class HomologyProblem:
    """A validated homology sweep problem.

    Attributes
    ----------
    graph : PlaneGraph
    start, end : frozenset of int
        Z2 cycles (edge ids).
    holes : frozenset of int
        Faces that are never toggled.
    swept : tuple of frozenset of int
        The admissible swept sets ``S`` (``dS = start + end``, ``S`` avoids
        the holes), smallest first; empty when infeasible.
    reason : str or None
        Why ``swept`` is empty.
    paths : bool
        True when start and end are chains with the same odd vertices (open
        walks with the same ends) rather than cycles.
    """

    graph: Any
    start: frozenset
    end: frozenset
    holes: frozenset
    swept: tuple
    reason: str | None = None
    paths: bool = False

    @classmethod
    def build(
        cls, P: Any, start: Any = None, end: Any = None, holes: Any = None, *, paths: bool = False
    ) -> "HomologyProblem":
        """Parse and check ``start``, ``end`` and ``holes`` (see the module notes).

        With ``paths=True`` dart walks and vertex lists are read as open walks
        and only ``start + end`` must be a Z2 cycle (the two have the same
        ends); the sweep then moves a chain with fixed boundary.

        Raises
        ------
        InvalidCurveError
            A start or end that is not a Z2 cycle of ``P`` (names the odd
            vertex, the unknown edge, dart or vertex).
        SweepwidthError
            ``P`` is not a plane graph, or a hole that is not a face.

        Examples
        --------
        >>> from sweepwidth import generators
        >>> P = generators.grid(3, 3)
        >>> hp = HomologyProblem.build(P)
        >>> len(hp.swept[0]), hp.reason                # the four squares
        (4, None)
        """
        _plane(P)
        closed = not paths
        c0 = cycle_edges(P, start, what="start", default="outer", closed=closed)
        c1 = cycle_edges(P, end, what="end", default="empty", closed=closed)
        if paths:
            check_even(P, c0 ^ c1, what="start + end (the two must have the same ends)")
        else:
            check_even(P, c0, what="start")
            check_even(P, c1, what="end")
        H = parse_holes(P, holes)
        sets, reason = bounded_face_sets(P, c0 ^ c1, H)
        return cls(P, c0, c1, H, tuple(sets), reason, bool(paths))

    @property
    def feasible(self) -> bool:
        return bool(self.swept)

    @property
    def free_faces(self) -> frozenset:
        """Faces that are not holes."""
        return frozenset(range(self.graph.number_of_faces())) - self.holes

    def summary(self) -> dict:
        """JSON-ready description (stored in ``Result.stats``; the checker reads it back)."""
        out: dict[str, Any] = {
            "start": sorted(self.start),
            "end": sorted(self.end),
            "holes": sorted(self.holes),
        }
        if self.paths:
            out["paths"] = True
        return out


@dataclass(frozen=True, eq=False)
class FaceSweep:
    """The weight of ``c0 + dT`` for subsets ``T`` of free faces, as a small weighted graph.

    Let ``z_f = [f in T]``.  A dual edge ``e`` of weight ``w`` between faces
    ``f != g`` is in ``c0 + dT`` iff ``[e in c0] + z_f + z_g`` is odd (for a
    cycle ``c0 = dA``, ``e`` is in ``c0`` iff its sides differ in ``A``; the
    formula also holds for a chain ``c0`` with a boundary, such as a path).
    Sorting the dual edges by which ends are free gives

    * ``const``: edges with no free end that lie in ``c0`` (always present);
    * ``to_first[i]``: edges of ``c0`` from free face ``i`` to a fixed face:
      present while ``i`` is untoggled, like an edge to a vertex pinned
      first;
    * ``to_last[i]``: edges not in ``c0`` from free face ``i`` to a fixed
      face: present once ``i`` is toggled, like an edge to a vertex pinned
      last;
    * ``pairs``: ``(i, j, w, sign)`` for edges between free faces: ``sign =
      +1`` ("normal", not in ``c0``: present iff exactly one end is toggled)
      or ``-1`` ("anti", in ``c0``: present iff both or neither are toggled).

    When there are no anti pairs, the weight of ``c0 + dT`` is ``const`` plus
    the cut of ``T + {first}`` in the graph with two pinned vertices, so a
    monotone sweep is an ordering with ``first`` pinned first and ``last``
    pinned last (a *nested* sweep, which includes the annulus and overlapping
    regions whose boundaries share no edge).  Anti pairs occur exactly when
    an edge of ``c0`` has free faces on both sides; when the free faces are
    the swept set, such an edge lies on both start and end (a *crossing*
    sweep).

    Attributes
    ----------
    faces : tuple of int
        The free faces; local index ``i`` is face ``faces[i]``.
    const : float
    to_first, to_last : tuple of float
    pairs : tuple of tuple
        ``(i, j, w, sign)`` with ``i < j``; parallel dual edges merged.
    start_weight : float
        Weight of ``c0`` (the weight at ``T`` empty).
    """

    faces: tuple
    const: float
    to_first: tuple
    to_last: tuple
    pairs: tuple
    start_weight: float

    @classmethod
    def build(cls, P: Any, start: Iterable[int], free: Iterable[int]) -> "FaceSweep":
        """Classify the dual edges for start cycle ``start`` and free faces ``free``.

        Examples
        --------
        >>> from sweepwidth import generators
        >>> P = generators.grid(2, 3)
        >>> fs = FaceSweep.build(P, P.face_boundary_cycle(P.outer_face), [0, 2])
        >>> fs.faces, fs.to_first, fs.to_last, fs.pairs
        ((0, 2), (3.0, 3.0), (0.0, 0.0), ((0, 1, 1.0, 1),))
        >>> fs.weight_of([0]), fs.weight_of([0, 2])
        (4.0, 0.0)
        """
        c0 = frozenset(start)
        faces = tuple(sorted(set(int(f) for f in free)))
        loc = {f: i for i, f in enumerate(faces)}
        k = len(faces)
        tf = [0.0] * k
        tl = [0.0] * k
        const = 0.0
        acc: dict[tuple[int, int], list[float]] = {}
        for e in range(P.number_of_edges()):
            f, g = P.edge_faces(e)
            w = float(P.weight(e))
            if f == g:  # a bridge: no toggle changes it (and no cycle contains it)
                if e in c0:
                    const += w
                continue
            across = e in c0  # for a cycle c0 = dA: the two sides differ in A
            i, j = loc.get(f), loc.get(g)
            if i is None and j is None:
                if across:
                    const += w
            elif i is None or j is None:
                t = i if i is not None else j
                if across:
                    tf[t] += w  # type: ignore[index]
                else:
                    tl[t] += w  # type: ignore[index]
            else:
                key = (i, j) if i < j else (j, i)
                slot = acc.setdefault(key, [0.0, 0.0])
                slot[1 if across else 0] += w
        pairs = []
        for (i, j), (normal, anti) in sorted(acc.items()):
            if normal:
                pairs.append((i, j, normal, 1))
            if anti:
                pairs.append((i, j, anti, -1))
        return cls(faces, const, tuple(tf), tuple(tl), tuple(pairs), cycle_weight(P, c0))

    @property
    def k(self) -> int:
        return len(self.faces)

    @property
    def nested(self) -> bool:
        """True when no pair is anti (the sweep is a pinned cutwidth problem)."""
        return all(s > 0 for _, _, _, s in self.pairs)

    def local(self, faces: Iterable[int]) -> list[int]:
        """Local indices of face ids (error for a face that is not free)."""
        loc = {f: i for i, f in enumerate(self.faces)}
        try:
            return [loc[int(f)] for f in faces]
        except KeyError as err:
            raise NotInGraphError(f"face {err.args[0]} is not a free face of this sweep") from None

    def weight_of(self, toggled: Iterable[int]) -> float:
        """Weight of ``c0 + dT`` for the face ids ``T`` (each toggled once)."""
        T = set(self.local(toggled))
        w = self.const
        for i in range(self.k):
            w += self.to_last[i] if i in T else self.to_first[i]
        for i, j, wt, s in self.pairs:
            differ = (i in T) != (j in T)
            w += wt if differ == (s > 0) else 0.0
        return w

    def profile(self, order: Sequence[int]) -> list[float]:
        """Weights after each prefix of a toggle sequence of face ids (length ``len(order) + 1``).

        A face appearing twice is toggled back.
        """
        idx = self.local(order)
        k = self.k
        state = [False] * k
        nb: list[list[tuple[int, float, int]]] = [[] for _ in range(k)]
        for i, j, wt, s in self.pairs:
            nb[i].append((j, wt, s))
            nb[j].append((i, wt, s))
        w = self.const + sum(self.to_first) + sum(wt for _, _, wt, s in self.pairs if s < 0)
        out = [w]
        for i in idx:
            sign = -1.0 if state[i] else 1.0  # +1 when toggling in
            delta = self.to_last[i] - self.to_first[i]
            for j, wt, s in nb[i]:
                delta += s * wt * (-1.0 if state[j] else 1.0)
            w += sign * delta
            state[i] = not state[i]
            out.append(w)
        return out

    def ordering_graph(self, *, drop_anti: bool = False) -> tuple[Any, Hashable, Hashable]:
        """The pinned ordering instance: a networkx Graph on the free face ids plus two pins.

        Returns ``(G, first, last)``; the width of an ordering of ``G`` with
        ``first`` pinned first and ``last`` pinned last, plus :attr:`const`,
        is the width of the sweep toggling the faces in that order.  Only
        valid for a :attr:`nested` sweep; ``drop_anti=True`` leaves the anti
        pairs out, which gives a lower bound in the crossing case (each
        dropped pair only ever adds weight).
        """
        import networkx as nx

        if not drop_anti and not self.nested:
            raise InvalidArgumentError("a crossing sweep (anti pairs) is not an ordering problem; use drop_anti=True")
        first: Hashable = ("pin", "first")
        last: Hashable = ("pin", "last")
        G = nx.Graph()
        G.add_node(first)
        G.add_nodes_from(self.faces)
        G.add_node(last)
        for i, f in enumerate(self.faces):
            if self.to_first[i]:
                G.add_edge(first, f, weight=self.to_first[i])
            if self.to_last[i]:
                G.add_edge(f, last, weight=self.to_last[i])
        for i, j, wt, s in self.pairs:
            if s > 0:
                G.add_edge(self.faces[i], self.faces[j], weight=wt)
        return G, first, last
