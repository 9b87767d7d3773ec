"""Walk states of a plane graph as tuples of darts, and the moves between them.

This module is the inner machinery of :mod:`sweepwidth.solve.homotopy.search`:
it compiles a :class:`~sweepwidth.plane.PlaneGraph` and the options of a
homotopy problem into flat Python lists (:class:`WalkSpace`) and generates, for
one walk, every walk one legal move away (face flips, spikes, unspikes, as
defined in the shared curve spec), together with the move in witness form.

State keys
----------
* A closed walk of length ``L >= 1`` is keyed by its *least rotation* (the
  lexicographically smallest cyclic shift of its dart tuple), so the ``L``
  rotations of one closed walk are one state.
* An open walk (fixed ends) is keyed by its dart tuple as it is.
* A point (a walk with no darts) at vertex index ``v`` is keyed ``(-1 - v,)``;
  darts are ``>= 0``, so points never collide with walks.

Winding numbers
---------------
For a closed walk ``W`` the winding number ``w(f)`` of face ``f`` is fixed by
``w(outer) = 0`` and ``w(left(d)) - w(right(d)) = #d - #d^1`` for every dart
``d`` (``#d`` = occurrences of ``d`` in ``W``).  A flip of face ``f`` changes
``w(f)`` by exactly one and no other winding number; spikes change none.  So
``sum_f |w(f) - w_end(f)|`` is a lower bound on the number of flips still
needed, and the differences of winding numbers between hole faces never
change (an invariant used to detect start and end curves that are not
homotopic).
"""

from __future__ import annotations

from collections.abc import Iterator, Sequence
from dataclasses import dataclass, field
from typing import Any

from ...errors import NotInGraphError, UnsupportedOptionError

__all__ = ["LENGTH_MODES", "WalkSpace", "find_rotation", "least_rotation"]

LENGTH_MODES = ("weight", "vertices")


def least_rotation(w: tuple) -> tuple:
    """The lexicographically least cyclic rotation of the tuple ``w``.

    Only rotations that start with the smallest entry can be least, so this
    compares the few rotations starting there (``O(L * r)`` for ``r``
    occurrences of the minimum; typical walks have ``r = 1``).

    Examples
    --------
    >>> least_rotation((3, 1, 2, 1, 0, 5))
    (0, 5, 3, 1, 2, 1)
    >>> least_rotation((2, 1, 2, 1))
    (1, 2, 1, 2)
    """
    L = len(w)
    if L <= 1:
        return w
    m = min(w)
    i = w.index(m)
    best = w[i:] + w[:i]
    i = w.index(m, i + 1) if w.count(m) > 1 else -1
    while i >= 0:
        r = w[i:] + w[:i]
        best = min(best, r)
        try:
            i = w.index(m, i + 1)
        except ValueError:
            break
    return best


def find_rotation(actual: Sequence[int], key: Sequence[int]) -> int:
    """An ``r`` with ``actual[j] == key[(j + r) % L]`` for all ``j`` (``-1`` if none).

    Examples
    --------
    >>> find_rotation((5, 0, 1), (0, 1, 5))
    2
    """
    L = len(actual)
    if L != len(key):
        return -1
    if L == 0:
        return 0
    kk = tuple(key) + tuple(key)
    a = tuple(actual)
    for r in range(L):
        if kk[r : r + L] == a:
            return r
    return -1


@dataclass
class WalkSpace:
    """A plane graph and the options of one homotopy problem, compiled to flat lists.

    Attributes
    ----------
    tail, head : list of int
        Vertex indices of each dart's ends.
    dlen : list
        Length of each dart (edge weight, or 1 in vertex-count mode).
    face : list of int
        Face on the left of each dart.
    idx, ridx : list of int
        Position of dart ``d`` on its face's boundary walk ``C_f``, and of ``d``
        on the reversed boundary walk of the face on its right.
    CC, RCC : list of tuple
        Per face: its boundary walk doubled, and the reversed boundary walk
        (``RC = (C[m-1]^1, ..., C[0]^1)``) doubled.
    out : list of tuple
        Darts leaving each vertex.
    hole : list of bool
        Faces that may not be flipped.
    closed, spikes, simple, monotone : bool
    mode : str
        'weight' or 'vertices'.
    """

    n: int
    tail: list
    head: list
    dlen: list
    face: list
    idx: list
    ridx: list
    CC: list
    RCC: list
    flen: list
    out: list
    hole: list
    closed: bool = True
    spikes: bool = True
    simple: bool = False
    monotone: bool = False
    mode: str = "weight"
    integral: bool = True
    fweight: list = field(default_factory=list)
    tree: list = field(default_factory=list)
    outer: int = 0
    labels: list = field(default_factory=list)
    #: per vertex: the least length an insertion there adds (a face loop or a spike; inf if none)
    grow: list = field(default_factory=list)

    # ----------------------------------------------------------- building
    @classmethod
    def build(
        cls,
        P: Any,
        *,
        holes: Any = None,
        closed: bool = True,
        spikes: bool = True,
        simple: bool = False,
        monotone: bool = False,
        length: str = "weight",
    ) -> WalkSpace:
        """Compile ``P`` (a PlaneGraph) with the given options."""
        if length not in LENGTH_MODES:
            raise UnsupportedOptionError("length", length, list(LENGTH_MODES))
        m = P.number_of_edges()
        F = P.number_of_faces()
        n = P.number_of_vertices()
        tail = [P.tail_index(d) for d in range(2 * m)]
        head = [P.head_index(d) for d in range(2 * m)]
        w = [float(P.weight(d >> 1)) for d in range(2 * m)]
        integral = all(x.is_integer() for x in w)
        if length == "vertices":
            dlen: list = [1] * (2 * m)
        elif integral:
            dlen = [int(x) for x in w]
        else:
            dlen = w
        face = [P.face_of_dart(d) for d in range(2 * m)]
        idx = [0] * (2 * m)
        ridx = [0] * (2 * m)
        CC, RCC, flen = [], [], []
        for f in range(F):
            C = tuple(P.face_darts(f))
            k = len(C)
            RC = tuple(x ^ 1 for x in reversed(C))
            for j, d in enumerate(C):
                idx[d] = j
            for j, d in enumerate(RC):
                # RC[j] = C[k-1-j] ^ 1 ; RC lists darts of the faces on the right of C's darts
                ridx[d] = j
            CC.append(C + C)
            RCC.append(RC + RC)
            flen.append(k)
        if holes is None:
            hole_set = {P.outer_face}
        else:
            hole_set = set()
            for h in holes:
                if not (isinstance(h, int) and 0 <= h < F):
                    raise NotInGraphError(f"hole {h!r} is not a face id in 0..{F - 1}")
                hole_set.add(int(h))
        hole = [f in hole_set for f in range(F)]
        out = [tuple(P.darts_at(P.label(v))) for v in range(n)]
        fweight = [sum(dlen[d] for d in CC[f][: flen[f]]) for f in range(F)]
        # dual spanning tree from the outer face, for winding numbers
        outer = P.outer_face
        tree: list = []
        seen = [False] * F
        seen[outer] = True
        stack = [outer]
        while stack:
            g = stack.pop()
            for d in CC[g][: flen[g]]:
                # d has g on its left; the face on the right is face[d ^ 1]
                h = face[d ^ 1]
                if not seen[h]:
                    seen[h] = True
                    # w(g) - w(h) = n(d)  ->  w(h) = w(g) - n(d)
                    tree.append((h, g, d))
                    stack.append(h)
        grow = []
        for v in range(n):
            g = float("inf")
            for c in out[v]:
                for f in (face[c], face[c ^ 1]):
                    if not hole[f] and fweight[f] < g:
                        g = fweight[f]
                if spikes and 2 * dlen[c] < g:
                    g = 2 * dlen[c]
            grow.append(g)
        return cls(
            n=n, tail=tail, head=head, dlen=dlen, face=face, idx=idx, ridx=ridx, CC=CC, RCC=RCC,
            flen=flen, out=out, hole=hole, closed=closed, spikes=spikes, simple=simple,
            monotone=monotone, mode=length, integral=integral, fweight=fweight, tree=tree, outer=outer,
            labels=list(P.vertices), grow=grow,
        )

    # -------------------------------------------------------- basic facts
    def point(self, v: int) -> tuple:
        """Key of the point at vertex index ``v``."""
        return (-1 - v,)

    @staticmethod
    def is_point(key: tuple) -> bool:
        return len(key) == 1 and key[0] < 0

    def length(self, key: tuple) -> Any:
        """Length of a walk key: summed dart lengths, or the vertex count."""
        if len(key) == 1 and key[0] < 0:
            if self.mode == "vertices":
                return 1
            return 0
        dl = self.dlen
        s = sum(dl[d] for d in key)
        if self.mode == "vertices" and not self.closed:
            s += 1
        return s

    def key_of(self, darts: Sequence[int], vertex: int) -> tuple:
        """State key of a walk given as darts (and its vertex index when empty)."""
        t = tuple(int(d) for d in darts)
        if not t:
            return self.point(vertex)
        return least_rotation(t) if self.closed else t

    def darts_of(self, key: tuple) -> tuple:
        return () if self.is_point(key) else key

    def vertex_of(self, key: tuple) -> int:
        """Vertex index where the walk (or point) starts."""
        if self.is_point(key):
            return -1 - key[0]
        return self.tail[key[0]]

    def winding(self, key: tuple) -> list:
        """Winding number of every face (outer face 0); closed walks only."""
        F = len(self.flen)
        net: dict = {}
        if not self.is_point(key):
            for d in key:
                net[d] = net.get(d, 0) + 1
        wn = [0] * F
        for h, g, d in self.tree:
            wn[h] = wn[g] - net.get(d, 0) + net.get(d ^ 1, 0)
        return wn

    def is_simple(self, key: tuple) -> bool:
        """Simple cycle (distinct vertices, no edge used twice) or simple path.

        A point is not simple (the rules allow it only as the final walk).
        """
        if self.is_point(key):
            return False
        tl = self.tail
        if self.closed:
            L = len(key)
            if len({tl[d] for d in key}) != L:
                return False
            return len({d >> 1 for d in key}) == L
        vs = [tl[d] for d in key]
        vs.append(self.head[key[-1]])
        return len(set(vs)) == len(vs)

    # ------------------------------------------------------------- moves
    def dart_sum(self, key: tuple) -> Any:
        """Summed dart lengths of a walk key (0 for a point)."""
        if len(key) == 1 and key[0] < 0:
            return 0
        dl = self.dlen
        return sum(dl[d] for d in key)

    def moves(self, key: tuple, cap: Any = None, low: list | None = None) -> Iterator[tuple]:
        """All walks one legal move from ``key`` whose length is below ``cap``.

        Yields ``(new_darts, vertex, move, face, sign, new_length)``: the new
        dart tuple (not yet canonical; ``()`` for a point), the vertex index of
        the new point when ``new_darts`` is empty, a compact move record
        relative to ``key``'s dart sequence (see :meth:`move_json`), the flipped
        face (``-1`` for spikes), the change of that face's winding number, and
        the new walk's length.  Moves whose result has length ``>= cap`` are
        skipped before the new tuple is built.  Moves that produce the same
        walk several times are not removed here.  Open walks only: with a
        one-element list ``low``, the least length of a skipped move is kept
        in ``low[0]`` (when below its value), for searches that expand a
        state in parts.
        """
        if cap is None:
            cap = float("inf")
        ds = self.dart_sum(key)
        if self.closed:
            yield from self._moves_closed(key, ds, cap)
        else:
            yield from self._moves_open(key, ds, cap, low)

    def move_json(self, move: tuple) -> dict:
        """The witness form of a compact move record ``(kind, pos, arg, put, face)``."""
        kind, pos, arg, q, f = move
        if kind == 0:
            return {"op": "flip", "face": f, "pos": pos, "take": arg, "put": list(q)}
        if kind == 1:
            return {"op": "spike", "pos": pos, "dart": arg}
        return {"op": "unspike", "pos": pos}

    def _extra(self, empty: bool) -> int:
        # length = dart sum + extra: a vertex-count point counts 1, an open walk counts darts + 1
        if self.mode != "vertices":
            return 0
        return 1 if (empty or not self.closed) else 0

    def _insertions(self, v: int, pos: int, before: tuple, after: tuple, ds: Any, cap: Any,
                    low: list | None = None) -> Iterator[tuple]:
        CC, RCC, idx, ridx, face, flen, hole, fw = (
            self.CC, self.RCC, self.idx, self.ridx, self.face, self.flen, self.hole, self.fweight,
        )
        ex = self._extra(False)
        for c in self.out[v]:
            f = face[c]
            if not hole[f]:
                if ds + fw[f] + ex < cap:
                    m = flen[f]
                    o = idx[c]
                    loop = CC[f][o : o + m]  # boundary of f starting with dart c: winding of f +1
                    yield before + loop + after, v, (0, pos, 0, loop, f), f, 1, ds + fw[f] + ex
                elif low is not None and ds + fw[f] + ex < low[0]:
                    low[0] = ds + fw[f] + ex
            # a loop leaving v along c around the face g on the right of c, clockwise
            g = face[c ^ 1]
            if not hole[g]:
                if ds + fw[g] + ex < cap:
                    m = flen[g]
                    o = ridx[c]
                    loop = RCC[g][o : o + m]  # reversed boundary of g starting with c: winding of g -1
                    yield before + loop + after, v, (0, pos, 0, loop, g), g, -1, ds + fw[g] + ex
                elif low is not None and ds + fw[g] + ex < low[0]:
                    low[0] = ds + fw[g] + ex
            if self.spikes:
                nl = ds + 2 * self.dlen[c] + ex
                if nl < cap:
                    yield before + (c, c ^ 1) + after, v, (1, pos, c, (), -1), -1, 0, nl
                elif low is not None and nl < low[0]:
                    low[0] = nl

    def _moves_closed(self, key: tuple, ds: Any, cap: Any) -> Iterator[tuple]:
        if self.is_point(key):
            v = -1 - key[0]
            yield from self._insertions(v, 0, (), (), 0, cap)
            return
        W = key
        L = len(W)
        WW = W + W
        CC, RCC, idx, ridx, face, flen, hole, tl, dl, fw = (
            self.CC, self.RCC, self.idx, self.ridx, self.face, self.flen, self.hole, self.tail,
            self.dlen, self.fweight,
        )
        pt = self._extra(True)
        for i in range(L):
            d = W[i]
            # flips with a non-empty piece starting at position i
            for f, C, RC, o, sign in (
                (face[d], CC, RCC, idx[d], -1),
                (face[d ^ 1], RCC, CC, ridx[d], 1),
            ):
                if hole[f]:
                    continue
                m = flen[f]
                Cf = C[f]
                RCf = RC[f]
                kmax = min(L, m)
                k = 1
                plen = 0
                tot = fw[f]
                while k <= kmax and WW[i + k - 1] == Cf[o + k - 1]:
                    plen += dl[Cf[o + k - 1]]
                    nds = ds - plen + (tot - plen)
                    nl = pt if (k == L and k == m) else nds
                    if nl < cap:
                        # q = reverse of Cf[o+k : o+m] = RCf[m-o : 2m-o-k]
                        q = RCf[m - o : 2 * m - o - k]
                        if i + k <= L:
                            new = W[:i] + q + W[i + k :]
                        else:
                            new = q + W[i + k - L : i]
                        yield new, tl[d], (0, i, k, q, f), f, sign, nl
                    k += 1
            # unspike
            if self.spikes and WW[i + 1] == d ^ 1:
                nds = ds - 2 * dl[d]
                if L == 2:
                    new = ()
                    nl = pt
                else:
                    nl = nds
                    new = W[:i] + W[i + 2 :] if i + 2 <= L else W[1:i]
                if nl < cap:
                    yield new, tl[d], (2, i, 0, (), -1), -1, 0, nl
            # insertions before position i
            yield from self._insertions(tl[d], i, W[:i], W[i:], ds, cap)

    def _moves_open(self, key: tuple, ds: Any, cap: Any, low: list | None = None) -> Iterator[tuple]:
        ex = self._extra(False)
        grow = self.grow
        if self.is_point(key):
            v = -1 - key[0]
            yield from self._insertions(v, 0, (), (), 0, cap, low)
            return
        W = key
        L = len(W)
        CC, RCC, idx, ridx, face, flen, hole, tl, dl, fw = (
            self.CC, self.RCC, self.idx, self.ridx, self.face, self.flen, self.hole, self.tail,
            self.dlen, self.fweight,
        )
        for i in range(L):
            d = W[i]
            for f, C, RC, o, sign in (
                (face[d], CC, RCC, idx[d], -1),
                (face[d ^ 1], RCC, CC, ridx[d], 1),
            ):
                if hole[f]:
                    continue
                m = flen[f]
                Cf = C[f]
                RCf = RC[f]
                kmax = min(m, L - i)
                k = 1
                plen = 0
                tot = fw[f]
                while k <= kmax and W[i + k - 1] == Cf[o + k - 1]:
                    plen += dl[Cf[o + k - 1]]
                    nl = ds - plen + (tot - plen) + ex
                    if nl < cap:
                        q = RCf[m - o : 2 * m - o - k]
                        yield W[:i] + q + W[i + k :], tl[d], (0, i, k, q, f), f, sign, nl
                    elif low is not None and nl < low[0]:
                        low[0] = nl
                    k += 1
            if self.spikes and i + 1 < L and W[i + 1] == d ^ 1:
                nl = ds - 2 * dl[d] + ex
                if nl < cap:
                    yield W[:i] + W[i + 2 :], tl[d], (2, i, 0, (), -1), -1, 0, nl
                elif low is not None and nl < low[0]:
                    low[0] = nl
            # insertions at the tail of d: skipped at once when even the cheapest is too long
            nl = ds + grow[tl[d]] + ex
            if nl < cap:
                yield from self._insertions(tl[d], i, W[:i], W[i:], ds, cap, low)
            elif low is not None and nl < low[0]:
                low[0] = nl
        nl = ds + grow[self.head[W[-1]]] + ex
        if nl < cap:
            yield from self._insertions(self.head[W[-1]], L, W, (), ds, cap, low)
        elif low is not None and nl < low[0]:
            low[0] = nl

    # ------------------------------------------------------ applying moves
    def apply(self, darts: tuple, vertex: int, move: dict) -> tuple[tuple, int]:
        """Apply one witness move to an actual dart sequence (used to rebuild witnesses).

        Returns the new dart tuple and its vertex index (meaningful for a point).
        The move is assumed legal (it was generated by :meth:`moves`).
        """
        W = tuple(darts)
        L = len(W)
        op = move["op"]
        i = move["pos"]
        if op == "spike":
            d = move["dart"]
            new = W[:i] + (d, d ^ 1) + W[i:]
            return new, vertex
        if op == "unspike":
            k, q = 2, ()
        else:
            k, q = move["take"], tuple(move["put"])
        if k == 0:
            new = W[:i] + q + W[i:]
            return new, vertex
        start_v = self.tail[W[i % L]]
        if i + k <= L:
            new = W[:i] + q + W[i + k :]
        else:
            new = q + W[(i + k) % L : i]
        return new, (start_v if not new else vertex)
