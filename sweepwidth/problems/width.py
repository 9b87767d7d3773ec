"""Leash sweeps between two walks: the data of a homotopy width problem.

Definition
----------
Let P be a plane graph with non-negative edge weights, and let
``A = a_0 .. a_p`` and ``B = b_0 .. b_q`` be walks of P (``p, q >= 0``; a walk
of one vertex is allowed).  Write ``alpha_k`` for the dart of A from
``a_{k-1}`` to ``a_k`` and ``beta_k`` for the dart of B from ``b_{k-1}`` to
``b_k``.  A *leash* is a walk of P; a *state* is ``(i, j, L)`` with L a walk
from ``a_i`` to ``b_j`` (the empty walk, a point, when ``a_i = b_j``).

Moves from ``(i, j, L)``:

* a face flip, spike or unspike of L with its ends fixed, exactly as in the
  path form of the homotopy height (:mod:`sweepwidth.problems.homotopy`):
  holes are never flipped, spikes only when allowed;
* an *endpoint step* of A, ``i -> i + 1``: when L starts with ``alpha_{i+1}``
  that dart is removed, otherwise ``alpha_{i+1}`` reversed is put in front of
  L (the free reduction happens at the joint, so a step never pays for an
  edge twice); with ``backward=True`` also ``i -> i - 1``: when L starts with
  ``alpha_i`` reversed it is removed, otherwise ``alpha_i`` is put in front;
* the same for B at the other end: ``j -> j + 1`` removes a last dart
  ``beta_{j+1}`` reversed or appends ``beta_{j+1}``; backwards ``j -> j - 1``
  removes a last dart ``beta_j`` or appends ``beta_j`` reversed.

A *leash sweep* is a sequence of states, each one move from the last, from
``(0, 0, L_start)`` to ``(p, q, L_end)``; its *width* is the largest leash
length along it, both ends included.  The **homotopy width** (the discrete
homotopic Fréchet distance) is the least width of a leash sweep.  Options:
``spikes`` (spike and unspike moves allowed), ``simple`` (every leash a
simple path; a point counts as simple), ``holes`` (faces never flipped;
default the outer face), ``backward`` (endpoint steps back allowed) and the
length convention ``weight``:

* ``'weight'``: the sum of the edge weights of the leash's darts;
* ``None``: every edge counts 1 (the number of darts);
* ``'vertices'``: vertices visited with multiplicity (darts + 1; a point
  counts 1), the graph-drawing convention of the homotopy height.

Conventions chosen here
-----------------------
* One end moves at a time.  The discrete Fréchet distance of Eiter and
  Mannila also lets both ends move in one step; with leashes that would be
  two edge changes in one move, which no other move of the model allows.
  The single step keeps every move local (one dart added or removed at an
  end, or one face or spike), which the coning construction of
  :mod:`sweepwidth.solve.width.coning` turns into exactly one move of the
  homotopy height.
* A step is deterministic: it removes the dart when it can and only
  otherwise adds one.  Adding the dart as a spike instead is the same as the
  reducing step followed by a spike, so with spikes allowed nothing is lost.
* Default leashes: when ``start`` and ``end`` are omitted, A and B must be
  vertex-disjoint arcs of the outer face's boundary (a simple cycle), with
  the outer boundary running A forward, then from ``a_p`` to ``b_q``, then B
  backward, then from ``b_0`` to ``a_0`` (in either orientation).  The start
  leash is the boundary arc from ``a_0`` to ``b_0`` and the end leash the arc
  from ``a_p`` to ``b_q``, each taken as a walk from A to B.

Walks
-----
Walks A and B and the leashes are given as in the homotopy height: a dart
list, a vertex list (consecutive vertices joined by exactly one edge), or
``{"vertex": v, "darts": [...]}``.  A plain list of integers that is a walk
of darts is read as darts; give a one-vertex walk as ``{"vertices": [v]}``
or ``{"vertex": v, "darts": []}``.

Witness
-------
``{"start": leash, "moves": [...]}`` with leash ``{"vertex": label,
"darts": [...]}`` and moves the flip, spike and unspike moves of the height
witness (positions index the current leash) plus
``{"op": "step", "walk": "a" or "b", "to": k}``, an endpoint step of that
walk to index ``k`` (one more or, with ``backward=True``, one less than the
current index).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Iterable, Mapping, Sequence

from ..errors import InputTypeError, InvalidArgumentError, InvalidCurveError, SweepwidthError, UnsupportedOptionError
from .homotopy import Curve, HomotopyProblem, IllegalMoveError, apply_move, curve_from_json, hole_faces

__all__ = ["WEIGHTS", "WidthProblem", "WidthState", "IllegalMoveError"]

#: the length conventions (values of ``weight=``)
WEIGHTS = ("weight", None, "vertices")


@dataclass(frozen=True)
class WidthState:
    """A state ``(i, j, L)``: indices on A and B and the leash as a dart tuple.

    ``vertex`` is the leash's first vertex (``a_i``), meaningful for a point.
    """

    i: int
    j: int
    darts: tuple
    vertex: int


def _walk(P: Any, spec: Any, what: str) -> Curve:
    if spec is None:
        raise InvalidCurveError(f"walk {what} is missing")
    if isinstance(spec, (list, tuple)) and len(spec) == 0:
        raise InvalidCurveError(f"walk {what} is empty: give at least one vertex")
    if isinstance(spec, Mapping) and "vertices" in spec and not list(spec["vertices"]):
        raise InvalidCurveError(f"walk {what} is empty: give at least one vertex")
    return curve_from_json(P, spec, closed=False, what=f"walk {what}")


def _ends(head: Sequence[int], c: Curve) -> tuple[int, int]:
    return c.vertex, (head[c.darts[-1]] if c.darts else c.vertex)


@dataclass(frozen=True, eq=False)
class WidthProblem:
    """A homotopy width problem, validated once (build it with :meth:`build`).

    Attributes
    ----------
    graph : PlaneGraph
    a, b : Curve
        The walks A and B (open walks; ``a.darts[k-1]`` is ``alpha_k``).
    a_vertices, b_vertices : tuple of int
        ``a_0 .. a_p`` and ``b_0 .. b_q`` (vertex indices).
    start, end : Curve
        Start leash (``a_0 -> b_0``) and end leash (``a_p -> b_q``).
    holes : frozenset of int
    backward, spikes, simple : bool
    weight : str or None
        'weight', None or 'vertices' (see the module docstring).
    cost : tuple of float
        Length of each dart under the convention (weight or 1).
    path : HomotopyProblem
        The path-form homotopy problem used for flips and spikes on leashes.
    """

    graph: Any
    a: Curve
    b: Curve
    a_vertices: tuple
    b_vertices: tuple
    start: Curve
    end: Curve
    holes: frozenset
    backward: bool = False
    spikes: bool = True
    simple: bool = False
    weight: Any = "weight"
    cost: tuple = field(default=(), repr=False)
    tail: tuple = field(default=(), repr=False)
    head: tuple = field(default=(), repr=False)
    path: Any = field(default=None, repr=False)

    @property
    def p(self) -> int:
        return len(self.a.darts)

    @property
    def q(self) -> int:
        return len(self.b.darts)

    # ------------------------------------------------------------ building
    @classmethod
    def build(
        cls,
        P: Any,
        a: Any,
        b: Any,
        *,
        start: Any = None,
        end: Any = None,
        backward: bool = False,
        spikes: bool = True,
        simple: bool = False,
        holes: Iterable[int] | None = None,
        weight: Any = "weight",
    ) -> "WidthProblem":
        """Validate the input and build the problem.

        Raises
        ------
        InvalidCurveError
            A or B empty or not a walk of P; a leash that is not a walk or
            whose ends do not match ``a_0, b_0`` (start) or ``a_p, b_q`` (end);
            default leashes asked for when A and B are not disjoint arcs of
            the outer boundary; a non-simple leash with ``simple=True``.
        UnsupportedOptionError
            An unknown ``weight`` convention.
        SweepwidthError
            A hole that is not a face id; an option that is not a bool.

        Examples
        --------
        >>> from sweepwidth.generators import grid
        >>> P = grid(2, 3)                       # two squares side by side
        >>> W = WidthProblem.build(P, {"vertices": [(0, 0), (0, 1), (0, 2)]},
        ...                        {"vertices": [(1, 0), (1, 1), (1, 2)]})
        >>> W.length_of(W.start.darts), W.length_of(W.end.darts), W.p, W.q
        (1.0, 1.0, 2, 2)
        """
        if not hasattr(P, "face_darts") or not hasattr(P, "outer_face"):
            raise InputTypeError(f"homotopy width needs a PlaneGraph, got {type(P).__name__}")
        if weight not in WEIGHTS:
            raise UnsupportedOptionError("weight", weight, list(WEIGHTS))
        for name, val in (("backward", backward), ("spikes", spikes), ("simple", simple)):
            if not isinstance(val, bool):
                raise InvalidArgumentError(f"option {name} must be True or False, got {val!r}")
        F = P.number_of_faces()
        hole_set = hole_faces(P, holes, InvalidCurveError)
        A = _walk(P, a, "a")
        B = _walk(P, b, "b")
        m = P.number_of_edges()
        tail = tuple(P.tail_index(d) for d in range(2 * m))
        head = tuple(P.head_index(d) for d in range(2 * m))
        av = (A.vertex,) + tuple(head[d] for d in A.darts)
        bv = (B.vertex,) + tuple(head[d] for d in B.darts)
        if start is None or end is None:
            dstart, dend = default_leashes(P, A, B, tail, head)
            st = dstart if start is None else curve_from_json(P, start, closed=False, what="start leash")
            en = dend if end is None else curve_from_json(P, end, closed=False, what="end leash")
        else:
            st = curve_from_json(P, start, closed=False, what="start leash")
            en = curve_from_json(P, end, closed=False, what="end leash")
        for name, c, x, y, nx, ny in (("start leash", st, av[0], bv[0], "a_0", "b_0"),
                                      ("end leash", en, av[-1], bv[-1], "a_p", "b_q")):
            u, v = _ends(head, c)
            if u != x or v != y:
                raise InvalidCurveError(
                    f"{name} runs from {P.label(u)!r} to {P.label(v)!r}, but must run from "
                    f"{nx}={P.label(x)!r} to {ny}={P.label(y)!r}"
                )
        if weight == "weight":
            cost = tuple(float(P.weight(d >> 1)) for d in range(2 * m))
        else:
            cost = tuple(1.0 for _ in range(2 * m))
        faces = tuple(tuple(P.face_darts(f)) for f in range(F))
        dface = [0] * (2 * m)
        slot = [0] * (2 * m)
        for f, w in enumerate(faces):
            for k, d in enumerate(w):
                dface[d] = f
                slot[d] = k
        path = HomotopyProblem(P, False, st, en, hole_set, spikes, simple, False,
                               "vertices" if weight == "vertices" else "weight", None, None,
                               tail, head, cost, faces, tuple(dface), tuple(slot))
        W = cls(P, A, B, av, bv, st, en, hole_set, backward, spikes, simple, weight, cost, tail, head, path)
        if simple:
            for name, c in (("start leash", st), ("end leash", en)):
                if not W.is_simple(c.darts):
                    raise InvalidCurveError(f"simple leashes asked for, but the {name} is not a simple path")
        return W

    # ------------------------------------------------------------ queries
    def length_of(self, darts: Sequence[int]) -> float:
        """Length of a leash (dart sequence) under the problem's convention."""
        c = self.cost
        s = float(sum(c[d] for d in darts))
        return s + 1.0 if self.weight == "vertices" else s

    def is_simple(self, darts: Sequence[int]) -> bool:
        """A simple path (distinct vertices); a point is simple."""
        if not darts:
            return True
        vs = [self.tail[d] for d in darts]
        vs.append(self.head[darts[-1]])
        return len(set(vs)) == len(vs)

    def initial(self) -> WidthState:
        return WidthState(0, 0, tuple(self.start.darts), self.a_vertices[0])

    def is_final(self, s: WidthState) -> bool:
        return s.i == self.p and s.j == self.q and s.darts == tuple(self.end.darts)

    def leash_json(self, darts: Sequence[int], vertex: int) -> dict:
        v = self.tail[darts[0]] if darts else vertex
        return {"vertex": self.graph.label(v), "darts": [int(d) for d in darts]}

    def options(self) -> dict:
        """JSON-ready description of the problem (stored in result stats, read by the checker)."""
        return {
            "a": self.leash_json(self.a.darts, self.a.vertex),
            "b": self.leash_json(self.b.darts, self.b.vertex),
            "start": self.leash_json(self.start.darts, self.start.vertex),
            "end": self.leash_json(self.end.darts, self.end.vertex),
            "holes": sorted(self.holes),
            "backward": self.backward,
            "spikes": self.spikes,
            "simple": self.simple,
            "weight": self.weight,
        }

    # ------------------------------------------------------------ moves
    def step(self, s: WidthState, walk: str, to: int) -> WidthState:
        """The state after the endpoint step of ``walk`` ('a' or 'b') to index ``to``.

        Raises
        ------
        IllegalMoveError
            A step by other than one index, a backward step without
            ``backward=True``, or an index outside the walk.
        """
        if walk == "a":
            cur, top, darts = s.i, self.p, self.a.darts
        elif walk == "b":
            cur, top, darts = s.j, self.q, self.b.darts
        else:
            raise IllegalMoveError(f"a step moves walk 'a' or 'b', not {walk!r}")
        if isinstance(to, bool) or not isinstance(to, int) or not 0 <= to <= top:
            raise IllegalMoveError(f"step of walk {walk} to {to!r}, outside 0..{top}")
        if to == cur + 1:
            fwd = True
        elif to == cur - 1:
            if not self.backward:
                raise IllegalMoveError(f"walk {walk} steps back from {cur} to {to}, but backward=False")
            fwd = False
        else:
            raise IllegalMoveError(f"walk {walk} steps from {cur} to {to}: a step moves by one")
        L = s.darts
        if walk == "a":
            # dart x leaves the new a_i towards the old one; its reverse cancels
            x = darts[cur] ^ 1 if fwd else darts[to]
            new = L[1:] if (L and L[0] == x ^ 1) else (x,) + L
            i, j = to, s.j
            v = self.a_vertices[to]
        else:
            y = darts[cur] if fwd else darts[to] ^ 1
            new = L[:-1] if (L and L[-1] == y ^ 1) else L + (y,)
            i, j = s.i, to
            v = self.a_vertices[s.i]
        return WidthState(i, j, new, self.tail[new[0]] if new else v)

    def apply_move(self, s: WidthState, move: Mapping[str, Any], *, check: bool = True) -> WidthState:
        """The state after one move (flip, spike, unspike or step); see the module docstring."""
        if isinstance(move, Mapping) and move.get("op") == "step":
            return self.step(s, move.get("walk"), move.get("to"))  # type: ignore[arg-type]
        c = apply_move(self.path, Curve(s.darts, s.vertex), move, check=check)
        return WidthState(s.i, s.j, tuple(c.darts), c.vertex)


def default_leashes(P: Any, A: Curve, B: Curve, tail: tuple, head: tuple) -> tuple[Curve, Curve]:
    """The two arcs of the outer boundary between A and B (see the module docstring)."""
    W = list(P.face_darts(P.outer_face))
    n = len(W)
    why = "give start and end leashes explicitly"
    if n == 0 or len({tail[d] for d in W}) != n:
        raise InvalidCurveError(f"default leashes need an outer face bounded by a simple cycle; {why}")
    av = [A.vertex] + [head[d] for d in A.darts]
    bv = [B.vertex] + [head[d] for d in B.darts]
    if set(av) & set(bv):
        raise InvalidCurveError(f"default leashes need walks a and b without common vertices; {why}")
    for O in (W, [d ^ 1 for d in reversed(W)]):
        pos = {tail[d]: k for k, d in enumerate(O)}
        if any(v not in pos for v in av + bv):
            raise InvalidCurveError(f"default leashes: walks a and b must lie on the outer boundary; {why}")
        k = pos[A.vertex]
        if any(O[(k + x) % n] != d for x, d in enumerate(A.darts)):
            continue
        brev = [d ^ 1 for d in reversed(B.darts)]
        k2 = pos[bv[-1]]
        if any(O[(k2 + x) % n] != d for x, d in enumerate(brev)):
            continue
        p, q = len(A.darts), len(brev)
        r1 = [O[x % n] for x in range(k + p, k2 + (n if k2 < k + p else 0))]
        e2 = k + (n if k < k2 + q else 0)
        r2 = [O[x % n] for x in range(k2 + q, e2)]
        if len(r1) + len(r2) + p + q != n:
            continue
        st = [d ^ 1 for d in reversed(r2)]
        return Curve(tuple(st), av[0]), Curve(tuple(r1), av[-1])
    raise InvalidCurveError(
        "default leashes need a and b to be arcs of the outer boundary, the boundary running a forward, "
        f"then b backward; {why}"
    )
