"""The dart-based plane graph: rotation system, faces, dual.

Conventions
-----------
* Edge ``e`` (an integer ``0..m-1``) has two darts: ``2e`` runs from
  ``edge_ends(e)[0]`` to ``edge_ends(e)[1]`` and ``2e + 1`` back.  ``d ^ 1`` is
  the reverse of dart ``d``.
* The rotation lists the darts leaving each vertex **counterclockwise**:
  ``next_dart(d)`` is the next dart counterclockwise around ``tail(d)``.
* Faces are traced with the face on the **left** of each dart:
  the dart after ``d`` on its face is ``prev_dart(d ^ 1)`` (arrive at the head,
  turn to the next dart clockwise).  Inner faces of a drawing are then traced
  counterclockwise and the outer face clockwise.
* Face ids ``0..F-1`` are given in order of the smallest dart on each face.
"""

from __future__ import annotations

import itertools
import math
from typing import Any, Callable, Hashable, Mapping, NamedTuple, Sequence

import networkx as nx
import numpy as np

from .._weights import check_total, check_weight, check_weight_array, weight_function
from ..errors import InputTypeError, InvalidEmbeddingError, NonPlanarError, NotInGraphError, SweepwidthError
from . import _arrays

__all__ = ["PlaneGraph", "Edge"]

class _NoEdgeData(dict):
    """The read-only empty attribute dict shared by edges without attributes (pickles to itself)."""

    __slots__ = ()

    def _refuse(self, *args: Any, **kwargs: Any) -> Any:
        raise TypeError("edge attributes are read-only; use edge_data(e), which returns a copy")

    __setitem__ = __delitem__ = update = setdefault = pop = popitem = clear = __ior__ = _refuse  # type: ignore[assignment]

    def __reduce__(self) -> tuple:
        return (_no_edge_data, ())


def _no_edge_data() -> "_NoEdgeData":
    return _NO_DATA


_NO_DATA = _NoEdgeData()


class Edge(NamedTuple):
    """An edge of a plane graph: its id, its two ends (dart ``2*id`` runs u -> v) and weight."""

    id: int
    u: Hashable
    v: Hashable
    weight: float


class PlaneGraph:
    """A connected multigraph with a genus-0 rotation system and an outer face.

    Loops and parallel edges are allowed (duals have both).  Vertices may be
    any hashable labels; edges have ids ``0..m-1``; faces have ids ``0..F-1``.
    Everything is validated once, at construction; a ``PlaneGraph`` is not
    modified afterwards.

    Build one with :meth:`from_positions`, :meth:`from_embedding`,
    :meth:`from_rotation`, :meth:`from_faces` or :meth:`from_graph`.

    Examples
    --------
    >>> import networkx as nx
    >>> P = PlaneGraph.from_graph(nx.cycle_graph(4))
    >>> P.number_of_vertices(), P.number_of_edges(), P.number_of_faces()
    (4, 4, 2)
    >>> D = P.dual()
    >>> D.number_of_vertices(), D.number_of_edges(), D.number_of_faces()
    (2, 4, 4)
    """

    __slots__ = (
        "_labels",
        "_index",
        "_eu",
        "_ev",
        "_w",
        "_edata",
        "_next",
        "_prev",
        "_dface",
        "_faces",
        "_outer",
        "_out",
        "pos",
        "meta",
        "_dual_outer_vertex",
        "face_to_primal_vertex",
        "_arr",
    )

    _labels: list[Hashable]
    _index: dict[Hashable, int]
    _eu: list[int]
    _ev: list[int]
    _w: list[float]
    _edata: list[Mapping[str, Any]]
    _next: list[int]
    _prev: list[int]
    _dface: list[int]
    _faces: "Sequence[list[int]]"
    _outer: int
    _out: "Sequence[list[int]]"
    pos: dict[Hashable, tuple[float, float]] | None
    meta: dict[str, Any]
    _dual_outer_vertex: Hashable | None
    face_to_primal_vertex: dict[int, Hashable] | None
    _arr: dict[str, np.ndarray] | None

    # ------------------------------------------------------------------ core
    def __init__(
        self,
        labels: Sequence[Hashable],
        ends: Sequence[tuple[int, int]] | np.ndarray,
        weights: Sequence[float] | np.ndarray,
        next_dart: Sequence[int] | np.ndarray,
        *,
        outer: int | None = None,
        outer_dart: int | None = None,
        pos: Mapping[Any, tuple[float, float]] | None = None,
        edge_data: Sequence[Mapping[str, Any]] | None = None,
        meta: Mapping[str, Any] | None = None,
    ) -> None:
        """Low-level constructor from vertex indices; prefer the ``from_*`` class methods.

        ``ends[e] = (iu, iv)`` are vertex indices, ``next_dart`` the
        counterclockwise successor of each dart around its tail, ``outer`` a
        face id or ``outer_dart`` a dart whose left face is the outer face.
        ``ends`` (shape ``(m, 2)``) and ``next_dart`` may be integer numpy arrays.

        Validation and face tracing take O((V + E) log L) time with numpy (L
        the longest rotation or face; pointer doubling) from 256 darts on,
        and plain loops below that or when the input is invalid (those loops
        word the error).
        """
        self._labels = list(labels)
        self._index = {v: i for i, v in enumerate(self._labels)}
        if len(self._index) != len(self._labels):
            raise InvalidEmbeddingError("vertex labels are not distinct")
        n = len(self._labels)
        m = len(ends)
        pre: dict[str, np.ndarray] = {}  # arrays given by the caller, reused by the vectorised path
        if isinstance(ends, np.ndarray) and ends.ndim == 2 and ends.shape[1] == 2 and ends.dtype.kind in "iu":
            pre["eu"] = np.ascontiguousarray(ends[:, 0], dtype=np.int64)
            pre["ev"] = np.ascontiguousarray(ends[:, 1], dtype=np.int64)
            self._eu = pre["eu"].tolist()
            self._ev = pre["ev"].tolist()
        else:
            self._eu = [int(a) for a, _ in ends]
            self._ev = [int(b) for _, b in ends]
        if len(weights) != m:
            raise InvalidEmbeddingError(f"{m} edges but {len(weights)} weights")
        self._w = check_weight_array(weights, self._edge_name)
        # edges without attributes share one read-only empty mapping (edge_data() hands out copies)
        if edge_data is None:
            self._edata = [_NO_DATA] * m
        else:
            self._edata = [dict(d) if d else _NO_DATA for d in edge_data]
        if isinstance(next_dart, np.ndarray) and next_dart.ndim == 1 and next_dart.dtype.kind in "iu":
            pre["next"] = next_dart.astype(np.int64, copy=False)
            self._next = pre["next"].tolist()
        else:
            self._next = [int(x) for x in next_dart]
        self._arr = None
        self.pos = dict(pos) if pos is not None else None
        self.meta = dict(meta) if meta else {}
        self._dual_outer_vertex = None
        self.face_to_primal_vertex = None
        if len(self._w) != m:
            raise InvalidEmbeddingError(f"{m} edges but {len(self._w)} weights")
        if len(self._next) != 2 * m:
            raise InvalidEmbeddingError(f"rotation has {len(self._next)} darts, expected {2 * m}")
        if 2 * m >= _arrays.FAST_MIN_DARTS and self._fast_build(n, m, pre):
            pass
        else:
            self._validate_rotation(n, m)
            self._trace_faces()
            self._validate_topology()
        if outer is None and outer_dart is None:
            outer = self._largest_face()
        elif outer is None:
            if not 0 <= outer_dart < 2 * m:  # type: ignore[operator]
                raise InvalidEmbeddingError(f"outer dart {outer_dart} does not exist")
            outer = self._dface[outer_dart]  # type: ignore[index]
        if not (isinstance(outer, (int, np.integer)) and 0 <= outer < len(self._faces)):
            raise InvalidEmbeddingError(f"outer face {outer!r} is not a face id in 0..{len(self._faces) - 1}")
        self._outer = int(outer)

    def _fast_build(self, n: int, m: int, pre: dict[str, np.ndarray] | None = None) -> bool:
        """Validation and face tracing with numpy; False (nothing set) when the input is invalid.

        Computes exactly what ``_validate_rotation``, ``_trace_faces`` and
        ``_validate_topology`` compute.  On any violation it returns False and
        the caller runs those plain loops, which raise the precise error.
        """
        m2 = 2 * m
        if m == 0 or n == 0:
            return False  # nothing to vectorise
        pre = pre or {}
        try:
            eu = pre["eu"] if "eu" in pre else np.asarray(self._eu, dtype=np.int64)
            ev = pre["ev"] if "ev" in pre else np.asarray(self._ev, dtype=np.int64)
            nxt = pre["next"] if "next" in pre else np.asarray(self._next, dtype=np.int64)
        except (OverflowError, ValueError):
            return False
        if eu.min() < 0 or ev.min() < 0 or eu.max() >= n or ev.max() >= n:
            return False
        if nxt.min() < 0 or nxt.max() >= m2 or not np.all(np.bincount(nxt, minlength=m2) == 1):
            return False
        tail = np.empty(m2, dtype=np.int64)
        tail[0::2], tail[1::2] = eu, ev
        if not np.array_equal(tail[nxt], tail):
            return False
        ar = np.arange(m2, dtype=np.int64)
        prev = np.empty(m2, dtype=np.int64)
        prev[nxt] = ar
        rhead, rrank = _arrays.cycles(nxt, prev)
        is_head = rhead == ar
        if np.bincount(tail[is_head], minlength=n).max() > 1:
            return False  # some vertex has two rotation cycles
        lab = _arrays.components(n, eu, ev)
        if lab.max() > 0:
            return False
        degree = np.bincount(tail, minlength=n)
        # darts grouped by vertex, each group in rotation order from its smallest dart
        voff = np.cumsum(degree) - degree
        out_order = np.empty(m2, dtype=np.int64)
        out_order[voff[tail] + rrank] = ar
        # faces: cycles of d -> prev[d ^ 1]
        phi = prev[ar ^ 1]
        phinv = np.empty(m2, dtype=np.int64)
        phinv[phi] = ar
        fhead, frank = _arrays.cycles(phi, phinv)
        fstart = fhead == ar
        fid_of = np.cumsum(fstart) - 1
        dface = fid_of[fhead]
        f = int(fstart.sum())
        if n - m + f != 2:
            return False
        flen = np.bincount(dface, minlength=f)
        foff = np.cumsum(flen) - flen
        face_order = np.empty(m2, dtype=np.int64)
        face_order[foff[dface] + frank] = ar
        self._prev = prev.tolist()
        self._out = _arrays.split(out_order, degree)
        self._dface = dface.tolist()
        self._faces = _arrays.split(face_order, flen)
        self._arr = {"tail": tail, "next": nxt, "prev": prev, "dface": dface}
        return True

    def _validate_rotation(self, n: int, m: int) -> None:
        nxt = self._next
        for e in range(m):
            for end, x in ((self._eu[e], 0), (self._ev[e], 1)):
                if not 0 <= end < n:
                    raise InvalidEmbeddingError(f"edge {e} has an end {end} outside the vertex range")
        seen = [False] * (2 * m)
        for d in range(2 * m):
            t = nxt[d]
            if not 0 <= t < 2 * m:
                raise InvalidEmbeddingError(f"rotation successor {t} of dart {d} is not a dart")
            if seen[t]:
                raise InvalidEmbeddingError(
                    f"dart {t} (edge {t >> 1}) appears twice in the rotation: every dart must have exactly one place"
                )
            seen[t] = True
            if self.tail_index(t) != self.tail_index(d):
                raise InvalidEmbeddingError(
                    f"rotation at vertex {self._labels[self.tail_index(d)]!r} continues with dart {t} "
                    f"(edge {t >> 1}), which leaves vertex {self._labels[self.tail_index(t)]!r}"
                )
        prev = [0] * (2 * m)
        for d in range(2 * m):
            prev[nxt[d]] = d
        self._prev = prev
        # each vertex's darts form ONE cycle of the rotation
        out: list[list[int]] = [[] for _ in range(n)]
        done = [False] * (2 * m)
        for d in range(2 * m):
            if done[d]:
                continue
            v = self.tail_index(d)
            if out[v]:
                raise InvalidEmbeddingError(
                    f"the darts at vertex {self._labels[v]!r} form more than one rotation cycle"
                )
            x = d
            while not done[x]:
                done[x] = True
                out[v].append(x)
                x = nxt[x]
        self._out = out

    def _trace_faces(self) -> None:
        m2 = len(self._next)
        dface = [-1] * m2
        faces: list[list[int]] = []
        prev = self._prev
        for d in range(m2):
            if dface[d] != -1:
                continue
            f = len(faces)
            walk = []
            x = d
            while dface[x] == -1:
                dface[x] = f
                walk.append(x)
                x = prev[x ^ 1]
            faces.append(walk)
        if m2 == 0:
            faces.append([])  # a single vertex: one face with an empty boundary
        self._dface = dface
        self._faces = faces

    def _validate_topology(self) -> None:
        n, m, f = len(self._labels), len(self._eu), len(self._faces)
        if n == 0:
            raise InvalidEmbeddingError("a plane graph needs at least one vertex")
        # connected
        seen = [False] * n
        stack = [0]
        seen[0] = True
        while stack:
            v = stack.pop()
            for d in self._out[v]:
                h = self.head_index(d)
                if not seen[h]:
                    seen[h] = True
                    stack.append(h)
        if not all(seen):
            lonely = next(i for i in range(n) if not seen[i])
            raise InvalidEmbeddingError(
                f"graph is not connected: vertex {self._labels[lonely]!r} is not reachable from "
                f"{self._labels[0]!r}"
            )
        if n - m + f != 2:
            genus = (2 - (n - m + f)) / 2
            raise InvalidEmbeddingError(
                f"rotation system has genus {genus:g}, not 0: V - E + F = {n} - {m} + {f} = {n - m + f} "
                "(Euler's formula needs 2 for a plane graph)"
            )

    def _largest_face(self) -> int:
        if isinstance(self._faces, _arrays.Ragged):
            return int(np.argmax(self._faces.lengths()))  # the first longest, as below
        best, size = 0, -1
        for i, walk in enumerate(self._faces):
            if len(walk) > size:
                best, size = i, len(walk)
        return best

    # ------------------------------------------------------------- queries
    def number_of_vertices(self) -> int:
        return len(self._labels)

    def number_of_edges(self) -> int:
        return len(self._eu)

    def number_of_faces(self) -> int:
        return len(self._faces)

    def __len__(self) -> int:
        return len(self._labels)

    def __repr__(self) -> str:
        name = self.meta.get("name")
        nm = f" {name!r}" if name else ""
        return (
            f"<PlaneGraph{nm} with {self.number_of_vertices()} vertices, {self.number_of_edges()} edges, "
            f"{self.number_of_faces()} faces, outer face {self._outer}>"
        )

    @property
    def vertices(self) -> list[Hashable]:
        """Vertex labels, in index order."""
        return list(self._labels)

    @property
    def edges(self) -> list[Edge]:
        """All edges as ``Edge(id, u, v, weight)``."""
        L = self._labels
        return [Edge(e, L[self._eu[e]], L[self._ev[e]], self._w[e]) for e in range(len(self._eu))]

    @property
    def faces(self) -> list[int]:
        """Face ids ``0..F-1``."""
        return list(range(len(self._faces)))

    @property
    def outer_face(self) -> int:
        """Id of the outer face."""
        return self._outer

    @property
    def weights(self) -> np.ndarray:
        """Edge weights as an array indexed by edge id."""
        return np.asarray(self._w, dtype=float)

    def weight(self, e: int) -> float:
        return self._w[e]

    def edge_ends(self, e: int) -> tuple[Hashable, Hashable]:
        """``(u, v)``: dart ``2e`` runs from u to v."""
        return self._labels[self._eu[e]], self._labels[self._ev[e]]

    def edge_data(self, e: int) -> dict:
        """The attributes the edge was built with (a copy)."""
        return dict(self._edata[e])

    def set_edge_data(self, edge_data: Sequence[Mapping[str, Any]]) -> None:
        """Replace the extra attributes of every edge (one mapping per edge id, copied).

        Readers use it to keep attributes a file carries beside the weights;
        weights, rotation and faces do not change.

        Raises
        ------
        InvalidEmbeddingError
            When the number of mappings is not the number of edges.
        """
        data = list(edge_data)
        if len(data) != len(self._w):
            raise InvalidEmbeddingError(f"edge data for {len(data)} edges given to a graph with {len(self._w)} edges")
        self._edata = [dict(d) if d else _NO_DATA for d in data]

    def index(self, v: Hashable) -> int:
        """Vertex index of label ``v``."""
        try:
            return self._index[v]
        except (KeyError, TypeError):
            raise NotInGraphError(f"{v!r} is not a vertex of this plane graph") from None

    def label(self, i: int) -> Hashable:
        return self._labels[i]

    def has_vertex(self, v: Hashable) -> bool:
        try:
            return v in self._index
        except TypeError:
            return False

    # darts
    def tail_index(self, d: int) -> int:
        e = d >> 1
        return self._ev[e] if d & 1 else self._eu[e]

    def head_index(self, d: int) -> int:
        e = d >> 1
        return self._eu[e] if d & 1 else self._ev[e]

    def tail(self, d: int) -> Hashable:
        return self._labels[self.tail_index(d)]

    def head(self, d: int) -> Hashable:
        return self._labels[self.head_index(d)]

    @staticmethod
    def rev(d: int) -> int:
        return d ^ 1

    def next_dart(self, d: int) -> int:
        """Next dart counterclockwise around ``tail(d)``."""
        return self._next[d]

    def prev_dart(self, d: int) -> int:
        """Next dart clockwise around ``tail(d)``."""
        return self._prev[d]

    def face_next(self, d: int) -> int:
        """The dart after ``d`` on the boundary walk of its (left) face."""
        return self._prev[d ^ 1]

    def face_of_dart(self, d: int) -> int:
        """The face on the left of dart ``d``."""
        return self._dface[d]

    def darts_at(self, v: Hashable) -> list[int]:
        """The darts leaving ``v`` in counterclockwise order."""
        return list(self._out[self.index(v)])

    def degree(self, v: Hashable) -> int:
        return len(self._out[self.index(v)])

    def rotation(self) -> dict[Hashable, list[int]]:
        """``{vertex: [dart, ...]}``, darts counterclockwise."""
        return {self._labels[i]: list(ds) for i, ds in enumerate(self._out)}

    def dart_between(self, u: Hashable, v: Hashable) -> int:
        """A dart from u to v (the first in u's rotation); error when not adjacent."""
        iu, iv = self.index(u), self.index(v)
        for d in self._out[iu]:
            if self.head_index(d) == iv:
                return d
        raise NotInGraphError(f"no edge joins {u!r} and {v!r}")

    def darts_between(self, u: Hashable, v: Hashable) -> list[int]:
        iu, iv = self.index(u), self.index(v)
        return [d for d in self._out[iu] if self.head_index(d) == iv]

    # faces
    def face_darts(self, f: int) -> list[int]:
        """The boundary walk of face ``f`` as darts (face on the left)."""
        self._check_face(f)
        return list(self._faces[f])

    def boundary_walk(self, f: int) -> list[Hashable]:
        """The boundary walk of face ``f`` as the cyclic list of vertices visited."""
        self._check_face(f)
        if not self._faces[f]:
            return [self._labels[0]]
        return [self.tail(d) for d in self._faces[f]]

    def face_edges(self, f: int) -> list[int]:
        """Edge ids along the boundary walk of ``f`` (a bridge appears twice)."""
        self._check_face(f)
        return [d >> 1 for d in self._faces[f]]

    def face_length(self, f: int) -> float:
        """Weighted length of the boundary walk of ``f``."""
        return float(sum(self._w[d >> 1] for d in self.face_darts(f)))

    def edge_faces(self, e: int) -> tuple[int, int]:
        """``(left, right)``: the faces on the left of dart ``2e`` and of dart ``2e + 1``."""
        if not 0 <= e < len(self._eu):
            raise NotInGraphError(f"edge id {e} does not exist (0..{len(self._eu) - 1})")
        return self._dface[2 * e], self._dface[2 * e + 1]

    def _check_face(self, f: int) -> None:
        if not (isinstance(f, (int, np.integer)) and 0 <= f < len(self._faces)):
            raise NotInGraphError(f"face id {f!r} does not exist (0..{len(self._faces) - 1})")

    def face_boundary_cycle(self, f: int) -> frozenset[int]:
        """The Z2 boundary of face ``f``: edges appearing an odd number of times on its walk."""
        odd: set[int] = set()
        for d in self.face_darts(f):
            odd ^= {d >> 1}
        return frozenset(odd)

    def _edge_name(self, e: int) -> str:
        """``edge e (u, v)`` for messages (labels when the ends are valid)."""
        try:
            return f"edge {e} ({self._labels[self._eu[e]]!r}, {self._labels[self._ev[e]]!r})"
        except (IndexError, AttributeError):
            return f"edge {e}"

    def with_weights(self, weights: Sequence[float] | Mapping[int, float]) -> "PlaneGraph":
        """A copy with new edge weights; the embedding, faces and ids stay the same.

        Parameters
        ----------
        weights : sequence or mapping
            A weight per edge id (a sequence of length ``m``), or a mapping
            ``{edge id: weight}``; edges missing from a mapping keep theirs.

        Returns
        -------
        PlaneGraph
            A new plane graph (this one is not modified).

        Raises
        ------
        WeightError
            A weight that is negative, NaN, infinite or not a number.
        InvalidEmbeddingError
            A sequence of the wrong length or a mapping naming a missing edge.

        Notes
        -----
        O(V + E): the rotation and faces are shared, not recomputed.

        Examples
        --------
        >>> import networkx as nx
        >>> P = PlaneGraph.from_graph(nx.cycle_graph(3))
        >>> P.with_weights([1, 2, 3]).face_length(0)
        6.0
        """
        m = len(self._eu)
        if isinstance(weights, Mapping):
            w = list(self._w)
            for e, x in weights.items():
                if not (isinstance(e, (int, np.integer)) and 0 <= e < m):
                    raise InvalidEmbeddingError(f"weight given for edge {e!r}, which is not an edge id in 0..{m - 1}")
                w[int(e)] = check_weight(x, f"edge {e}")
        else:
            seq = list(weights)
            if len(seq) != m:
                raise InvalidEmbeddingError(f"{m} edges but {len(seq)} weights")
            w = [check_weight(x, f"edge {e}") for e, x in enumerate(seq)]
        check_total(w, self._edge_name)
        new = object.__new__(PlaneGraph)
        for slot in PlaneGraph.__slots__:
            setattr(new, slot, getattr(self, slot))
        new._w = w
        new.meta = dict(self.meta)
        new.pos = dict(self.pos) if self.pos is not None else None
        if self.face_to_primal_vertex is not None:
            new.face_to_primal_vertex = dict(self.face_to_primal_vertex)
        return new

    # ------------------------------------------------------------- exports
    def to_networkx(self) -> nx.MultiGraph:
        """A MultiGraph keyed by edge id, with ``weight`` and ``id`` on edges, ``pos`` on nodes."""
        G = nx.MultiGraph()
        for v in self._labels:
            if self.pos is not None and v in self.pos:
                G.add_node(v, pos=tuple(self.pos[v]))
            else:
                G.add_node(v)
        for e in range(len(self._eu)):
            data = dict(self._edata[e])
            data["weight"] = self._w[e]
            data["id"] = e
            G.add_edge(self._labels[self._eu[e]], self._labels[self._ev[e]], key=e, **data)
        return G

    def to_simple_graph(self) -> nx.Graph:
        """A simple Graph: loops dropped, parallel edges merged with summed weights."""
        G = nx.Graph()
        G.add_nodes_from(self._labels)
        for e in range(len(self._eu)):
            u, v = self._labels[self._eu[e]], self._labels[self._ev[e]]
            if u == v:
                continue
            if G.has_edge(u, v):
                G[u][v]["weight"] += self._w[e]
            else:
                G.add_edge(u, v, weight=self._w[e])
        return G

    def rotation_by_edges(self) -> dict[Hashable, list[tuple[int, int]]]:
        """``{vertex: [(edge id, end), ...]}`` counterclockwise; ``end`` 0 for dart 2e, 1 for 2e+1."""
        return {self._labels[i]: [(d >> 1, d & 1) for d in ds] for i, ds in enumerate(self._out)}

    # ------------------------------------------------------------- dual
    def dual(self) -> "PlaneGraph":
        """The embedded dual.

        Dual vertex ``f`` is face ``f`` of this graph; dual edge ``e`` crosses
        primal edge ``e`` (same weight), and dual dart ``d`` leaves the face on
        the left of primal dart ``d``.  The counterclockwise rotation at dual
        vertex ``f`` follows the boundary walk of face ``f``.  A bridge gives a
        loop; faces sharing k edges give k parallel edges.

        ``D.face_to_primal_vertex`` maps each face of the dual to the primal
        vertex inside it.  The dual's outer face is the face around the primal
        vertex ``P._dual_outer_vertex`` when set (so that ``P.dual().dual()``
        has P's outer face), otherwise around the first vertex of P's outer
        face.  ``P.dual().dual()`` equals P up to relabelling vertices through
        ``face_to_primal_vertex`` (same edge ids, rotation and weights).

        Examples
        --------
        >>> import networkx as nx
        >>> P = PlaneGraph.from_graph(nx.path_graph(3))   # a tree: one face
        >>> D = P.dual()
        >>> D.number_of_vertices(), D.number_of_edges()   # one vertex, two loops
        (1, 2)
        """
        m = len(self._eu)
        F = len(self._faces)
        # faces of the dual correspond to primal vertices: the dual face containing
        # dual dart d surrounds primal vertex head(d)
        if self._dual_outer_vertex is not None:
            v0 = self.index(self._dual_outer_vertex)
        else:
            walk = self._faces[self._outer]
            v0 = self.tail_index(walk[0]) if walk else 0
        dpos = None
        if self.pos is not None and m > 0 and all(v in self.pos for v in self._labels):
            dpos = self._face_points()
        if m == 0:
            D = PlaneGraph([0], [], [], [], outer=0, meta={"name": f"dual of {self.meta.get('name', 'graph')}"})
            D.face_to_primal_vertex = {0: self._labels[0]}
            D._dual_outer_vertex = 0
            return D
        # a dart into v0 is the reverse of one leaving it
        outer_dart = self._out[v0][0] ^ 1
        if 2 * m >= _arrays.FAST_MIN_DARTS:
            return self._dual_fast(outer_dart, dpos)
        ends = [(self._dface[2 * e], self._dface[2 * e + 1]) for e in range(m)]
        # dual rotation: next*(d) = face_next(d)
        nxt = [self._prev[d ^ 1] for d in range(2 * m)]
        D = PlaneGraph(
            list(range(F)),
            ends,
            self._w,
            nxt,
            outer_dart=outer_dart,
            pos=dpos,
            edge_data=self._edata,
            meta={"name": f"dual of {self.meta.get('name', 'graph')}"} if self.meta.get("name") else None,
        )
        D.face_to_primal_vertex = {D._dface[d]: self._labels[self.head_index(d)] for d in range(2 * m)}
        D._dual_outer_vertex = self._outer
        return D

    def _dual_fast(self, outer_dart: int, dpos: dict | None) -> "PlaneGraph":
        """The body of :meth:`dual` with numpy (same result; the tests compare both)."""
        m = len(self._eu)
        F = len(self._faces)
        arr = self._arrays()
        ar = np.arange(2 * m, dtype=np.int64)
        ends = arr["dface"].reshape(m, 2)
        nxt = arr["prev"][ar ^ 1]
        D = PlaneGraph(
            list(range(F)),
            ends,
            self._w,
            nxt,
            outer_dart=outer_dart,
            pos=dpos,
            edge_data=self._edata,
            meta={"name": f"dual of {self.meta.get('name', 'graph')}"} if self.meta.get("name") else None,
        )
        dd = D._arrays()["dface"]
        fids, first = np.unique(dd, return_index=True)
        o = np.argsort(first, kind="stable")
        heads = arr["tail"][ar ^ 1][first[o]]
        L = self._labels
        D.face_to_primal_vertex = dict(zip(fids[o].tolist(), [L[h] for h in heads.tolist()]))
        D._dual_outer_vertex = self._outer
        return D

    def _arrays(self) -> dict[str, np.ndarray]:
        """numpy copies of tails, rotation successors and predecessors, and dart faces (cached)."""
        if self._arr is None:
            m2 = len(self._next)
            tail = np.empty(m2, dtype=np.int64)
            tail[0::2] = self._eu
            tail[1::2] = self._ev
            self._arr = {
                "tail": tail,
                "next": np.asarray(self._next, dtype=np.int64),
                "prev": np.asarray(self._prev, dtype=np.int64),
                "dface": np.asarray(self._dface, dtype=np.int64),
            }
        return self._arr

    def _face_points(self) -> dict[int, tuple[float, float]]:
        """A point for each face: the centroid of its boundary vertices (outer face: outside the box)."""
        assert self.pos is not None
        if len(self._next) >= _arrays.FAST_MIN_DARTS:
            pos = self.pos
            xy = np.fromiter(
                itertools.chain.from_iterable((pos[v][0], pos[v][1]) for v in self._labels),
                dtype=float,
                count=2 * len(self._labels),
            ).reshape(-1, 2)
            if len(pos) == len(self._labels):  # pos holds exactly the vertices (the caller checked all are in)
                xs, ys = xy[:, 0], xy[:, 1]
            else:
                xs = np.array([p[0] for p in pos.values()], dtype=float)
                ys = np.array([p[1] for p in pos.values()], dtype=float)
            arr = self._arrays()
            F = len(self._faces)
            cnt = np.bincount(arr["dface"], minlength=F).astype(float)
            cx = np.bincount(arr["dface"], weights=xy[arr["tail"], 0], minlength=F) / np.maximum(cnt, 1)
            cy = np.bincount(arr["dface"], weights=xy[arr["tail"], 1], minlength=F) / np.maximum(cnt, 1)
            span = max(float(xs.max() - xs.min()), float(ys.max() - ys.min()), 1.0)
            cx[self._outer] = float(xs.max()) + 0.25 * span
            cy[self._outer] = float(ys.max()) + 0.25 * span
            return dict(enumerate(zip(cx.tolist(), cy.tolist())))
        pts: dict[int, tuple[float, float]] = {}
        lx = [p[0] for p in self.pos.values()]
        ly = [p[1] for p in self.pos.values()]
        for f, walk in enumerate(self._faces):
            if f == self._outer:
                span = max(max(lx) - min(lx), max(ly) - min(ly), 1.0)
                pts[f] = (max(lx) + 0.25 * span, max(ly) + 0.25 * span)
                continue
            vs = [self.pos[self.tail(d)] for d in walk]
            pts[f] = (sum(p[0] for p in vs) / len(vs), sum(p[1] for p in vs) / len(vs))
        return pts

    # ----------------------------------------------------- constructors
    @classmethod
    def from_rotation(
        cls,
        rotation: Mapping[Any, Sequence[Any]],
        *,
        edges: Mapping[int, tuple[Hashable, Hashable]] | Sequence[tuple[Hashable, Hashable]] | None = None,
        weights: Mapping[Any, float] | Sequence[float] | None = None,
        outer: Any = None,
        pos: Mapping[Any, tuple[float, float]] | None = None,
        meta: Mapping[str, Any] | None = None,
    ) -> "PlaneGraph":
        """Build from the counterclockwise order of edges at each vertex.

        Two forms:

        * **by neighbour** (``edges=None``, simple graphs): ``rotation[v]`` is the
          counterclockwise list of v's neighbours; ``w in rotation[v]`` iff
          ``v in rotation[w]``.  Edge ids follow the order of first appearance.
          ``weights`` may then map ``(u, v)`` pairs (either order) to weights.
        * **by edge id** (multigraphs): ``edges[e] = (u, v)`` for ``e = 0..m-1``
          and ``rotation[v]`` lists edge ids.  A loop's id appears twice at its
          vertex: its first occurrence is dart ``2e`` and its second dart
          ``2e + 1``, unless entries are given as ``(e, end)`` pairs with
          ``end`` 0 (dart ``2e``, leaving ``u``) or 1 (dart ``2e + 1``).

        ``outer`` selects the outer face: a dart given as a pair ``(u, v)``
        (the face on the left of u -> v; the first such dart in u's rotation),
        a list of vertices (a face's boundary walk, either direction), an
        ``("dart", d)`` pair, or None for the longest face.

        Examples
        --------
        >>> P = PlaneGraph.from_rotation({0: [1, 2], 1: [2, 0], 2: [0, 1]})
        >>> P.number_of_faces()
        2
        >>> P = PlaneGraph.from_rotation({"a": [0, 1, 1, 0]}, edges=[("a", "a"), ("a", "a")])
        >>> P.number_of_faces()
        3
        """
        labels = list(rotation.keys())
        index = {v: i for i, v in enumerate(labels)}
        if edges is None:
            ends: list[tuple[int, int]] = []
            eid: dict[tuple[int, int], int] = {}
            darts_at: dict[int, list[int]] = {}
            for v, nbrs in rotation.items():
                iv = index[v]
                if len(set(nbrs)) != len(nbrs):
                    raise InvalidEmbeddingError(
                        f"rotation at vertex {v!r} lists a neighbour twice; give multigraphs by edge id"
                    )
                lst = []
                for w in nbrs:
                    if w not in index:
                        raise InvalidEmbeddingError(f"rotation at vertex {v!r} names {w!r}, which has no rotation")
                    if w == v:
                        raise InvalidEmbeddingError(f"rotation at vertex {v!r} has a loop; give loops by edge id")
                    iw = index[w]
                    key = (min(iv, iw), max(iv, iw))
                    if key not in eid:
                        eid[key] = len(ends)
                        ends.append((iv, iw))
                    e = eid[key]
                    lst.append(2 * e if ends[e][0] == iv else 2 * e + 1)
                darts_at[iv] = lst
            for (a, b), e in eid.items():
                for x, y in ((a, b), (b, a)):
                    if labels[y] not in rotation[labels[x]]:
                        raise InvalidEmbeddingError(
                            f"vertex {labels[y]!r} lists {labels[x]!r} as a neighbour but not the other way round"
                        )
            wts = [1.0] * len(ends)
            if weights is not None:
                if not isinstance(weights, Mapping):
                    raise InvalidEmbeddingError("by-neighbour rotations take weights as a {(u, v): w} mapping")
                for (u, v), w in weights.items():
                    if u not in index or v not in index:
                        raise InvalidEmbeddingError(f"weight given for ({u!r}, {v!r}), which is not an edge")
                    key = (min(index[u], index[v]), max(index[u], index[v]))
                    if key not in eid:
                        raise InvalidEmbeddingError(f"weight given for ({u!r}, {v!r}), which is not an edge")
                    wts[eid[key]] = check_weight(w, f"edge ({u!r}, {v!r})")
        else:
            if isinstance(edges, Mapping):
                ids = sorted(edges)
                if ids != list(range(len(ids))):
                    raise InvalidEmbeddingError("edge ids must be 0..m-1")
                elist = [edges[i] for i in ids]
            else:
                elist = list(edges)
            ends = []
            for e, (u, v) in enumerate(elist):
                if u not in index or v not in index:
                    bad = u if u not in index else v
                    raise InvalidEmbeddingError(f"edge {e} has end {bad!r}, which has no rotation")
                ends.append((index[u], index[v]))
            used = [0] * (2 * len(ends))
            darts_at = {}
            for v, items in rotation.items():
                iv = index[v]
                lst = []
                for item in items:
                    if isinstance(item, tuple):
                        e, end = item
                        d = 2 * int(e) + int(end)
                    else:
                        e = int(item)
                        if not 0 <= e < len(ends):
                            raise InvalidEmbeddingError(f"rotation at vertex {v!r} names edge {item!r}, which does not exist")
                        u_, w_ = ends[e]
                        if u_ == w_:
                            d = 2 * e if used[2 * e] == 0 else 2 * e + 1
                        elif u_ == iv:
                            d = 2 * e
                        elif w_ == iv:
                            d = 2 * e + 1
                        else:
                            raise InvalidEmbeddingError(
                                f"rotation at vertex {v!r} names edge {e}, which joins "
                                f"{labels[u_]!r} and {labels[w_]!r}"
                            )
                    if not 0 <= d < 2 * len(ends):
                        raise InvalidEmbeddingError(f"rotation at vertex {v!r} names dart {d}, which does not exist")
                    tail = ends[d >> 1][d & 1]
                    if tail != iv:
                        raise InvalidEmbeddingError(f"rotation at vertex {v!r} names a dart of edge {d >> 1} that leaves {labels[tail]!r}")
                    if used[d]:
                        raise InvalidEmbeddingError(f"edge {d >> 1} appears too often in the rotation at vertex {v!r}")
                    used[d] = 1
                    lst.append(d)
                darts_at[iv] = lst
            missing = [d for d in range(2 * len(ends)) if not used[d]]
            if missing:
                d = missing[0]
                raise InvalidEmbeddingError(
                    f"edge {d >> 1} is missing from the rotation at vertex {labels[ends[d >> 1][d & 1]]!r}"
                )
            if weights is None:
                wts = [1.0] * len(ends)
            elif isinstance(weights, Mapping):
                wts = [check_weight(weights.get(e, 1), f"edge {e}") for e in range(len(ends))]
            else:
                if len(weights) != len(ends):
                    raise InvalidEmbeddingError(f"{len(ends)} edges but {len(weights)} weights")
                wts = [check_weight(w, f"edge {e}") for e, w in enumerate(weights)]
        nxt = [0] * (2 * len(ends))
        for iv, lst in darts_at.items():
            for k, d in enumerate(lst):
                nxt[d] = lst[(k + 1) % len(lst)]
        P = cls(labels, ends, wts, nxt, pos=pos, meta=meta)
        if outer is not None:
            P._outer = P.find_face(outer)
        return P

    def find_face(self, spec: Any) -> int:
        """Face id for a face given as ``("dart", d)``, a pair ``(u, v)`` or a vertex walk."""
        if isinstance(spec, tuple) and len(spec) == 2 and spec[0] == "dart":
            d = int(spec[1])
            if not 0 <= d < 2 * len(self._eu):
                raise InvalidEmbeddingError(f"dart {d} does not exist")
            return self._dface[d]
        if isinstance(spec, (int, np.integer)) and not isinstance(spec, bool):
            self._check_face(int(spec))
            return int(spec)
        seq = list(spec)
        if len(seq) == 2 and all(self.has_vertex(x) for x in seq):
            try:
                return self._dface[self.dart_between(seq[0], seq[1])]
            except SweepwidthError:
                pass
        try:
            target = [self.index(v) for v in seq]
        except SweepwidthError as err:
            raise InvalidEmbeddingError(f"face {spec!r} names a vertex that does not exist") from err
        k = len(target)
        for f, walk in enumerate(self._faces):
            if len(walk) != k:
                continue
            cyc = [self.tail_index(d) for d in walk]
            for seqc in (target, target[::-1]):
                for s in range(k):
                    if cyc[s:] + cyc[:s] == seqc:
                        return f
        raise InvalidEmbeddingError(f"no face has the boundary walk {spec!r}")

    @classmethod
    def from_embedding(
        cls,
        emb: nx.PlanarEmbedding,
        *,
        weights: Any = None,
        weight: str | Callable | None = "weight",
        outer: Any = None,
        pos: Mapping[Any, tuple[float, float]] | None = None,
        meta: Mapping[str, Any] | None = None,
    ) -> "PlaneGraph":
        """Build from a networkx ``PlanarEmbedding`` (simple graphs only).

        networkx stores clockwise neighbour orders; they are reversed into our
        counterclockwise rotation.  Edge weights are read from ``weights``, an
        undirected networkx graph with the same edges (attribute ``weight``),
        or from the embedding's own edge attributes.

        Examples
        --------
        >>> import networkx as nx
        >>> ok, emb = nx.check_planarity(nx.octahedral_graph())
        >>> PlaneGraph.from_embedding(emb).number_of_faces()
        8
        """
        if not isinstance(emb, nx.PlanarEmbedding):
            raise InvalidEmbeddingError(f"expected a networkx PlanarEmbedding, got {type(emb).__name__}")
        try:
            emb.check_structure()
        except nx.NetworkXException as err:
            raise InvalidEmbeddingError(f"the PlanarEmbedding is inconsistent: {err}") from err
        rotation = {v: list(emb.neighbors_cw_order(v))[::-1] for v in emb.nodes()}
        wf = weight_function(weight)
        src = weights if weights is not None else emb
        wmap = {}
        for u in rotation:
            for v in rotation[u]:
                if (v, u) in wmap:
                    continue
                if src.has_edge(u, v):
                    d = src.get_edge_data(u, v) or {}
                    if isinstance(src, nx.MultiGraph):
                        d = next(iter(d.values()), {})
                else:
                    d = {}
                wmap[(u, v)] = wf(u, v, d)
        return cls.from_rotation(rotation, weights=wmap, outer=outer, pos=pos, meta=meta)

    @classmethod
    def from_graph(
        cls,
        G: nx.Graph,
        *,
        weight: str | Callable | None = "weight",
        outer: Any = None,
        meta: Mapping[str, Any] | None = None,
    ) -> "PlaneGraph":
        """Find a planar embedding of ``G`` (networkx's planarity test) and build from it.

        Parallel edges are placed next to each other and loops bound empty
        faces.  A non-planar graph raises :class:`NonPlanarError` carrying the
        edges of a Kuratowski subgraph.

        Examples
        --------
        >>> import networkx as nx
        >>> PlaneGraph.from_graph(nx.complete_graph(4)).number_of_faces()
        4
        >>> PlaneGraph.from_graph(nx.complete_graph(5))
        Traceback (most recent call last):
        ...
        sweepwidth.errors.NonPlanarError: graph is not planar: a Kuratowski subgraph has 10 edges ...
        """
        if not isinstance(G, nx.Graph):
            raise InputTypeError(f"expected a networkx graph, got {type(G).__name__}")
        if G.number_of_nodes() == 0:
            raise InvalidEmbeddingError("a plane graph needs at least one vertex")
        if not nx.is_connected(G.to_undirected() if G.is_directed() else G):
            comps = list(nx.connected_components(G.to_undirected() if G.is_directed() else G))
            raise InvalidEmbeddingError(
                f"graph is not connected ({len(comps)} components); vertex {next(iter(comps[1]))!r} "
                f"is not reachable from {next(iter(comps[0]))!r}"
            )
        S = nx.Graph()
        S.add_nodes_from(G.nodes())
        S.add_edges_from((u, v) for u, v in G.edges() if u != v)
        ok, emb = nx.check_planarity(S, counterexample=True)
        if not ok:
            kedges = sorted(emb.edges(), key=repr)
            raise NonPlanarError(
                f"graph is not planar: a Kuratowski subgraph has {len(kedges)} edges "
                f"({', '.join(f'{u!r}-{v!r}' for u, v in kedges[:12])}{', ...' if len(kedges) > 12 else ''})",
                kedges,
            )
        wf = weight_function(weight)
        labels = list(G.nodes())
        index = {v: i for i, v in enumerate(labels)}
        ends: list[tuple[int, int]] = []
        wts: list[float] = []
        edata: list[dict] = []
        by_pair: dict[tuple[int, int], list[int]] = {}
        loops: dict[int, list[int]] = {}
        if G.is_multigraph():
            items = [(u, v, d) for u, v, k, d in G.edges(keys=True, data=True)]
        else:
            items = list(G.edges(data=True))
        for u, v, d in items:
            e = len(ends)
            iu, iv = index[u], index[v]
            ends.append((iu, iv))
            wts.append(check_weight(wf(u, v, d), f"edge ({u!r}, {v!r})"))
            edata.append({k: val for k, val in d.items() if k != "weight"})
            if iu == iv:
                loops.setdefault(iu, []).append(e)
            else:
                by_pair.setdefault((min(iu, iv), max(iu, iv)), []).append(e)
        darts_at: dict[int, list[int]] = {}
        for v in labels:
            iv = index[v]
            lst: list[int] = []
            for w in list(emb.neighbors_cw_order(v))[::-1]:
                iw = index[w]
                group = by_pair[(min(iv, iw), max(iv, iw))]
                seq = group if iv < iw else group[::-1]
                for e in seq:
                    lst.append(2 * e if ends[e][0] == iv else 2 * e + 1)
            for e in loops.get(iv, []):
                lst.extend([2 * e, 2 * e + 1])
            darts_at[iv] = lst
        nxt = [0] * (2 * len(ends))
        for lst in darts_at.values():
            for k, d in enumerate(lst):
                nxt[d] = lst[(k + 1) % len(lst)]
        P = cls(labels, ends, wts, nxt, edge_data=edata, meta=meta)
        if outer is not None:
            P._outer = P.find_face(outer)
        return P

    @classmethod
    def from_faces(
        cls,
        faces: Sequence[Sequence[Hashable]] | np.ndarray,
        *,
        outer: int | None = None,
        weights: Mapping[tuple[Hashable, Hashable], float] | None = None,
        pos: Mapping[Any, tuple[float, float]] | None = None,
        meta: Mapping[str, Any] | None = None,
    ) -> "PlaneGraph":
        """Build from the vertex cycles of a mesh of a disk or a sphere.

        Each face is a cyclic list of vertices; neighbouring faces must run
        through a shared edge in opposite directions (a consistently oriented
        mesh; faces given all the other way round give the mirror image).  A
        pair of vertices joined in exactly one face is a boundary edge: the
        boundary closes up into additional faces (one for a disk), and the
        first of them becomes the outer face unless ``outer`` (an index into
        ``faces``) names one of the given faces, as for a sphere.

        ``weights`` maps ``(u, v)`` pairs (either order) to edge weights (default 1).

        ``faces`` may also be an integer numpy array of shape ``(F, k)`` (all
        faces of length k, e.g. triangles); its labels are Python ints.

        Notes
        -----
        O(N log N) for N face corners with numpy (a sort to number the edges,
        pointer doubling to trace rotations and faces); small meshes and
        invalid ones take the plain loops, which give the error messages.

        Examples
        --------
        >>> P = PlaneGraph.from_faces([[0, 1, 2], [0, 2, 3]])     # a disk: two triangles
        >>> P.number_of_faces(), len(P.boundary_walk(P.outer_face))
        (3, 4)
        """
        if isinstance(faces, np.ndarray):
            built = cls._from_faces_fast(faces, outer=outer, weights=weights, pos=pos, meta=meta)
            if built is not None:
                return built
            faces = faces.tolist()
        elif sum(len(fc) for fc in faces) >= _arrays.FAST_MIN_DARTS:
            built = cls._from_faces_fast(faces, outer=outer, weights=weights, pos=pos, meta=meta)
            if built is not None:
                return built
        return cls._from_faces_slow(faces, outer=outer, weights=weights, pos=pos, meta=meta)  # type: ignore[arg-type]

    @classmethod
    def _from_faces_fast(
        cls,
        faces: Sequence[Sequence[Hashable]] | np.ndarray,
        *,
        outer: int | None = None,
        weights: Mapping[tuple[Hashable, Hashable], float] | None = None,
        pos: Mapping[Any, tuple[float, float]] | None = None,
        meta: Mapping[str, Any] | None = None,
    ) -> "PlaneGraph | None":
        """``from_faces`` with numpy; None when the mesh is invalid (the plain path then says why)."""
        prepared = _arrays.mesh_arrays(faces)
        if prepared is None:
            return None
        labels, a, lens = prepared
        k = lens.shape[0]
        N = a.shape[0]
        if k == 0 or N == 0 or lens.min() < 1:
            return None
        n = len(labels)
        starts = np.cumsum(lens) - lens
        succ = np.arange(1, N + 1, dtype=np.int64)
        succ[starts + lens - 1] = starts
        b = a[succ]
        if np.any(a == b):
            return None
        ukey = np.minimum(a, b) * n + np.maximum(a, b)
        uniq, first, inv = np.unique(ukey, return_index=True, return_inverse=True)
        m = uniq.shape[0]
        order = np.argsort(first, kind="stable")
        eid_of = np.empty(m, dtype=np.int64)
        eid_of[order] = np.arange(m, dtype=np.int64)
        eid = eid_of[inv.reshape(-1)]
        fa = first[order]
        eu, ev = a[fa], b[fa]
        dart = 2 * eid + (a != eu[eid]).astype(np.int64)
        m2 = 2 * m
        if np.bincount(dart, minlength=m2).max() > 1:
            return None  # an edge used twice in the same direction
        nxt = np.full(m2, -1, dtype=np.int64)
        nxt[dart[succ]] = dart ^ 1
        in_face = np.zeros(m2, dtype=bool)
        in_face[dart] = True
        free = np.flatnonzero(~in_face)
        if free.size:
            tail = np.empty(m2, dtype=np.int64)
            tail[0::2], tail[1::2] = eu, ev
            has_pred = np.zeros(m2, dtype=bool)
            has_pred[nxt[nxt >= 0]] = True
            xs = np.flatnonzero(nxt < 0)
            ys = np.flatnonzero(~has_pred)
            cx = np.bincount(tail[xs], minlength=n)
            cy = np.bincount(tail[ys], minlength=n)
            if cx.max() > 1 or np.any(cy[cx > 0] != 1):
                return None  # a pinched vertex
            y_at = np.full(n, -1, dtype=np.int64)
            y_at[tail[ys]] = ys
            nxt[xs] = y_at[tail[xs]]
        wts = [1.0] * m
        if weights:
            dart_of = dict(zip(zip(a.tolist(), b.tolist()), dart.tolist()))
            index = {v: i for i, v in enumerate(labels)}
            for (u, v), w in weights.items():
                d = dart_of.get((index.get(u, -1), index.get(v, -1)))
                if d is None:
                    d = dart_of.get((index.get(v, -1), index.get(u, -1)))
                if d is None:
                    raise InvalidEmbeddingError(f"weight given for ({u!r}, {v!r}), which is not an edge of the mesh")
                wts[d >> 1] = check_weight(w, f"edge ({u!r}, {v!r})")
        if outer is not None:
            if not 0 <= outer < k:
                raise InvalidEmbeddingError(f"outer face index {outer} is not one of the {k} faces")
            outer_dart = int(dart[starts[outer]])
        elif free.size:
            outer_dart = int(free[0])
        else:
            outer_dart = int(dart[starts[0]])
        ends = np.stack([eu, ev], axis=1)
        try:
            return cls(labels, ends, wts, nxt, outer_dart=outer_dart, pos=pos, meta=meta)
        except InvalidEmbeddingError:
            return None  # e.g. not connected or not genus 0: the plain path gives the message

    @classmethod
    def _from_faces_slow(
        cls,
        faces: Sequence[Sequence[Hashable]],
        *,
        outer: int | None = None,
        weights: Mapping[tuple[Hashable, Hashable], float] | None = None,
        pos: Mapping[Any, tuple[float, float]] | None = None,
        meta: Mapping[str, Any] | None = None,
    ) -> "PlaneGraph":
        """The plain-loop ``from_faces`` (reference for the vectorised one, and its error messages)."""
        labels: list[Hashable] = []
        index: dict[Hashable, int] = {}
        for fc in faces:
            for v in fc:
                if v not in index:
                    index[v] = len(labels)
                    labels.append(v)
        dart_of: dict[tuple[int, int], int] = {}
        ends: list[tuple[int, int]] = []
        # phi: face successor for darts in given faces
        phi: dict[int, int] = {}
        face_first_dart: list[int] = []
        for fi, fc in enumerate(faces):
            cyc = [index[v] for v in fc]
            k = len(cyc)
            if k < 1:
                raise InvalidEmbeddingError(f"face {fi} has no vertices")
            if k < 3 and len(set(cyc)) == k and k == 2:
                pass  # a digon is fine (parallel edges)
            darts = []
            for j in range(k):
                a, b = cyc[j], cyc[(j + 1) % k]
                if a == b:
                    raise InvalidEmbeddingError(f"face {fi} repeats vertex {labels[a]!r} consecutively")
                if (a, b) in dart_of:
                    raise InvalidEmbeddingError(
                        f"the edge {labels[a]!r} -> {labels[b]!r} is used in the same direction twice "
                        f"(face {fi}); the mesh is not consistently oriented or not a surface"
                    )
                if (b, a) in dart_of:
                    d = dart_of[(b, a)] ^ 1
                else:
                    e = len(ends)
                    ends.append((a, b))
                    d = 2 * e
                dart_of[(a, b)] = d
                darts.append(d)
            for j in range(k):
                phi[darts[j]] = darts[(j + 1) % k]
            face_first_dart.append(darts[0])
        m = len(ends)
        # rotation from phi: next[phi(d)] = d ^ 1
        nxt = [-1] * (2 * m)
        for d, pd in phi.items():
            nxt[pd] = d ^ 1
        # boundary darts (in no given face): close the fans
        free = [d for d in range(2 * m) if d not in phi]
        if free:
            # at each vertex, the dart with no successor is a free dart x leaving v;
            # the chain must start at y = d ^ 1 where d is a free dart entering v.
            starts: dict[int, list[int]] = {}
            ends_at: dict[int, list[int]] = {}
            has_pred = [False] * (2 * m)
            for d in range(2 * m):
                if nxt[d] >= 0:
                    has_pred[nxt[d]] = True
            for d in range(2 * m):
                v = ends[d >> 1][d & 1]
                if nxt[d] < 0:
                    ends_at.setdefault(v, []).append(d)
                if not has_pred[d]:
                    starts.setdefault(v, []).append(d)
            for v, xs in ends_at.items():
                ys = starts.get(v, [])
                if len(xs) != 1 or len(ys) != 1:
                    raise InvalidEmbeddingError(
                        f"the mesh boundary passes {len(xs)} times through vertex {labels[v]!r}: "
                        "not a disk or sphere (a pinched vertex)"
                    )
                nxt[xs[0]] = ys[0]
        given = len(faces)
        wts = [1.0] * m
        if weights:
            for (u, v), w in weights.items():
                hit = dart_of.get((index.get(u, -1), index.get(v, -1)))
                if hit is None:
                    hit = dart_of.get((index.get(v, -1), index.get(u, -1)))
                if hit is None:
                    raise InvalidEmbeddingError(f"weight given for ({u!r}, {v!r}), which is not an edge of the mesh")
                wts[hit >> 1] = check_weight(w, f"edge ({u!r}, {v!r})")
        outer_dart: int | None = None
        if outer is not None:
            if not 0 <= outer < given:
                raise InvalidEmbeddingError(f"outer face index {outer} is not one of the {given} faces")
            outer_dart = face_first_dart[outer]
        elif free:
            outer_dart = free[0]
        else:
            outer_dart = face_first_dart[0]
        P = cls(labels, ends, wts, nxt, outer_dart=outer_dart, pos=pos, meta=meta)
        return P

    @classmethod
    def from_positions(
        cls,
        G: nx.Graph,
        pos: Mapping[Any, Sequence[float]] | None = None,
        *,
        weight: str | Callable | None = "weight",
        meta: Mapping[str, Any] | None = None,
    ) -> "PlaneGraph":
        """Build from a straight-line drawing: rotation from the angles, the unbounded face outer.

        ``pos`` maps every node to ``(x, y)``; when omitted the node attribute
        ``pos`` (or ``x`` and ``y``) is used.  Two edges that cross or overlap,
        or a vertex lying on an edge, raise :class:`CrossingEdgesError` naming
        both.

        Examples
        --------
        >>> import networkx as nx
        >>> G = nx.grid_2d_graph(3, 3)
        >>> P = PlaneGraph.from_positions(G, {v: v for v in G})
        >>> P.number_of_faces(), len(P.boundary_walk(P.outer_face))
        (5, 8)
        """
        from ._geometry import drawing_rotation

        if not isinstance(G, nx.Graph):
            raise InputTypeError(f"expected a networkx graph, got {type(G).__name__}")
        if pos is None:
            pos = {}
            for v, d in G.nodes(data=True):
                if "pos" in d:
                    pos[v] = d["pos"]
                elif "x" in d and "y" in d:
                    pos[v] = (d["x"], d["y"])
        labels = list(G.nodes())
        if not labels:
            raise InvalidEmbeddingError("a plane graph needs at least one vertex")
        index = {v: i for i, v in enumerate(labels)}
        xy = np.empty((len(labels), 2))
        for v in labels:
            if v not in pos:
                raise InvalidEmbeddingError(f"vertex {v!r} has no position")
            p = pos[v]
            try:
                x, y = float(p[0]), float(p[1])
            except (TypeError, ValueError, IndexError) as err:
                raise InvalidEmbeddingError(f"position of vertex {v!r} is {p!r}; expected (x, y)") from err
            if not (math.isfinite(x) and math.isfinite(y)):
                raise InvalidEmbeddingError(f"position of vertex {v!r} is not finite: {p!r}")
            xy[index[v]] = (x, y)
        wf = weight_function(weight)
        ends: list[tuple[int, int]] = []
        wts: list[float] = []
        edata: list[dict] = []
        if G.is_multigraph():
            items = [(u, v, d) for u, v, k, d in G.edges(keys=True, data=True)]
        else:
            items = list(G.edges(data=True))
        seen_pairs: set[tuple[int, int]] = set()
        for u, v, d in items:
            iu, iv = index[u], index[v]
            if iu == iv:
                raise InvalidEmbeddingError(f"a straight-line drawing cannot have the loop at {u!r}")
            key = (min(iu, iv), max(iu, iv))
            if key in seen_pairs:
                from ..errors import CrossingEdgesError

                raise CrossingEdgesError(
                    f"edges ({u!r}, {v!r}) and ({u!r}, {v!r}) overlap: parallel edges cannot be drawn straight",
                    ((u, v), (u, v)),
                )
            seen_pairs.add(key)
            ends.append((iu, iv))
            wts.append(check_weight(wf(u, v, d), f"edge ({u!r}, {v!r})"))
            edata.append({k: val for k, val in d.items() if k != "weight"})
        nxt, outer_dart = drawing_rotation(xy, ends, labels)
        posd = {v: (float(xy[i, 0]), float(xy[i, 1])) for i, v in enumerate(labels)}
        return cls(labels, ends, wts, nxt, outer_dart=outer_dart, pos=posd, edge_data=edata, meta=meta)

    # ----------------------------------------------------- comparisons
    def same_embedding(self, other: "PlaneGraph", vertex_map: Mapping[Any, Any] | None = None) -> bool:
        """True when ``other`` has the same edge ids, ends (up to ``vertex_map``), rotation and weights.

        Dart orientation may differ by reversing whole edges; the cyclic
        rotation at each vertex must agree edge by edge.
        """
        if (
            self.number_of_vertices() != other.number_of_vertices()
            or self.number_of_edges() != other.number_of_edges()
        ):
            return False
        vm = vertex_map or {v: v for v in self._labels}
        for e in range(len(self._eu)):
            if abs(self._w[e] - other._w[e]) > 1e-12:
                return False
            a = {vm[self._labels[self._eu[e]]], vm[self._labels[self._ev[e]]]}
            b = set(other.edge_ends(e))
            if a != b:
                return False
        for i, ds in enumerate(self._out):
            v = vm[self._labels[i]]
            mine = [(d >> 1) for d in ds]
            theirs = [(d >> 1) for d in other._out[other.index(v)]]
            if len(mine) != len(theirs):
                return False
            if not mine:
                continue
            ok = False
            for s in range(len(theirs)):
                if theirs[s:] + theirs[:s] == mine:
                    ok = True
                    break
            if not ok:
                return False
        return True
