"""The states of a sweep, step by step, rebuilt from a result's witness for drawing.

This module only rebuilds what the pictures show (the current cut, cycle or
walk, the swept faces, what the last step changed, the length).  Legality of
every step is the business of :mod:`sweepwidth.verify`; here a witness that
cannot be replayed at all (a dart that does not exist, a walk that falls
apart) raises :class:`~sweepwidth.errors.WitnessError` naming the step.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Hashable, Mapping, Sequence

import networkx as nx

from ..errors import InputTypeError, SweepwidthError, UnsupportedOptionError, WitnessError
from ..plane import PlaneGraph

__all__ = ["SweepState", "sweep_states", "as_result", "peak_step"]


def peak_step(lengths: Sequence[float]) -> int:
    """The step to show as the widest: a maximum, preferring one strictly inside the sweep.

    Examples
    --------
    >>> peak_step([4.0, 3.0, 4.0, 0.0])
    2
    >>> peak_step([4.0, 0.0])
    0
    """
    top = max(lengths)
    inner = [i for i in range(1, len(lengths) - 1) if lengths[i] >= top - 1e-12]
    return inner[0] if inner else max(range(len(lengths)), key=lambda i: lengths[i])


@dataclass
class SweepState:
    """One step of a sweep as the pictures need it.

    Attributes
    ----------
    step : int
        0 for the start, then one per witness entry.
    caption : str
        What the step did ("start", "sweep face 3", "flip face 2", "spike", ...).
    length : float
        The width of the cut, the weight of the cycle or the length of the walk.
    swept : set of int
        Faces swept so far (toggled or flipped an odd number of times); for a
        vertex ordering, empty.
    fresh : set of int
        Faces touched by this step.
    edges : set of int
        The cut or the Z2 cycle (homology, cutwidth); for a walk, its edges.
    placed : list
        Vertices placed so far (cutwidth of a graph's own vertices).
    walk : list of int or None
        The darts of the current walk (homotopy); ``[]`` for a point.
    point : hashable or None
        The vertex of a walk that is a point.
    changed : list of int
        Positions in ``walk`` inserted by this step (the new piece of a flip,
        the two darts of a spike).
    closed : bool
        Whether the walk is closed.
    """

    step: int
    caption: str
    length: float
    swept: set = field(default_factory=set)
    fresh: set = field(default_factory=set)
    edges: set = field(default_factory=set)
    placed: list = field(default_factory=list)
    walk: list | None = None
    point: Hashable | None = None
    changed: list = field(default_factory=list)
    closed: bool = True


def as_result(result: Any) -> Any:
    """A :class:`~sweepwidth.result.Result` from a Result, a ``to_dict()`` mapping or a JSON file path."""
    from ..result import Result

    if isinstance(result, Result):
        return result
    if isinstance(result, Mapping):
        try:
            return Result.from_dict(result)
        except (KeyError, TypeError, ValueError) as err:
            raise InputTypeError(f"not a result dictionary: {err}") from err
    raise InputTypeError(f"expected a Result or its to_dict() form, got {type(result).__name__}")


def _plane(obj: Any) -> PlaneGraph:
    if isinstance(obj, PlaneGraph):
        return obj
    if isinstance(obj, nx.Graph):
        return PlaneGraph.from_graph(obj)
    raise InputTypeError(f"expected a PlaneGraph (or a planar networkx graph), got {type(obj).__name__}")


def _face_boundary(P: PlaneGraph, f: int) -> set[int]:
    return set(P.face_boundary_cycle(f))


def _edge_set(P: PlaneGraph, spec: Any, what: str) -> set[int] | None:
    """Edge ids from a stats summary: a list of edge ids, {'edges': [...]}, {'darts': [...]} or None."""
    if spec is None:
        return None
    m = P.number_of_edges()
    if isinstance(spec, Mapping):
        if "darts" in spec:
            out: set[int] = set()
            for d in spec["darts"]:
                if not isinstance(d, int) or not 0 <= d < 2 * m:
                    raise WitnessError(f"{what}: dart {d!r} does not exist")
                out ^= {d >> 1}
            return out
        if "edges" in spec:
            spec = spec["edges"]
        elif "faces" in spec:
            out = set()
            for f in spec["faces"]:
                out ^= _face_boundary(P, int(f))
            return out
        else:
            return None
    if isinstance(spec, (list, tuple, set, frozenset)):
        out = set()
        for e in spec:
            if isinstance(e, bool) or not isinstance(e, int) or not 0 <= e < m:
                return None  # a summary in some other form: infer instead
            out ^= {e}
        return out
    return None


def _check_face(P: PlaneGraph, f: Any, step: int) -> int:
    F = P.number_of_faces()
    if isinstance(f, bool) or not isinstance(f, int) or not 0 <= f < F:
        raise WitnessError(f"step {step}: {f!r} is not a face id (0..{F - 1})")
    return f


def _homology_states(P: PlaneGraph, result: Any, start: Any = None, end: Any = None) -> list[SweepState]:
    w = result.witness
    if isinstance(w, Mapping):
        w = w.get("toggles", w.get("order", w.get("faces")))
    if w is None:
        raise WitnessError("the result has no witness face order to draw")
    toggles = [_check_face(P, f, i + 1) for i, f in enumerate(w)]
    stats = dict(result.stats or {})
    c1 = _edge_set(P, end if end is not None else stats.get("end"), "end")
    c0 = _edge_set(P, start if start is not None else stats.get("start"), "start")
    odd: set[int] = set()
    for f in toggles:
        odd ^= {f}
    dS: set[int] = set()
    for f in odd:
        dS ^= _face_boundary(P, f)
    if c0 is None:
        c0 = dS ^ (c1 or set())
    weight = P.weight
    cur = set(c0)
    swept: set[int] = set()
    states = [SweepState(0, "start", float(sum(weight(e) for e in cur)), set(), set(), set(cur))]
    for i, f in enumerate(toggles, start=1):
        cur ^= _face_boundary(P, f)
        swept ^= {f}
        verb = "sweep" if f in swept else "unsweep"
        states.append(SweepState(i, f"{verb} face {f}", float(sum(weight(e) for e in cur)), set(swept), {f}, set(cur)))
    return states


def _cutwidth_states(P: PlaneGraph, result: Any, on: str) -> list[SweepState]:
    order = result.witness
    if isinstance(order, Mapping):
        order = order.get("order")
    if order is None:
        raise WitnessError("the result has no witness ordering to draw")
    order = [tuple(x) if isinstance(x, list) else x for x in order]
    if on == "auto":
        on = "vertices" if all(P.has_vertex(x) for x in order) else "faces"
    if on == "vertices":
        for i, v in enumerate(order):
            if not P.has_vertex(v):
                raise WitnessError(f"step {i + 1}: {v!r} is not a vertex of the graph")
        placed: list = []
        inside: set = set()
        states = [SweepState(0, "start", 0.0)]
        for i, v in enumerate(order, start=1):
            placed.append(v)
            inside.add(v)
            cut = {e.id for e in P.edges if (e.u in inside) != (e.v in inside)}
            states.append(SweepState(i, f"place {v!r}", float(sum(P.weight(e) for e in cut)), set(), set(),
                                     cut, list(placed)))
        return states
    if on != "faces":
        raise UnsupportedOptionError("ordering target", on, ["auto", "vertices", "faces"])
    # an ordering of the dual's vertices = the faces of P: the cut is the set of
    # primal edges between swept and unswept faces
    faces = [_check_face(P, f, i + 1) for i, f in enumerate(order)]
    swept: set[int] = set()
    states = [SweepState(0, "start", 0.0)]
    for i, f in enumerate(faces, start=1):
        swept.add(f)
        cut = {e for e in range(P.number_of_edges()) if (P.edge_faces(e)[0] in swept) != (P.edge_faces(e)[1] in swept)}
        states.append(SweepState(i, f"sweep face {f}", float(sum(P.weight(e) for e in cut)), set(swept), {f}, cut))
    return states


# ------------------------------------------------------------------ homotopy
def _label(P: PlaneGraph, x: Any) -> Hashable:
    def tup(y: Any) -> Any:
        return tuple(tup(z) for z in y) if isinstance(y, list) else y

    for cand in (x, tup(x)):
        if P.has_vertex(cand):
            return cand
    raise WitnessError(f"{x!r} is not a vertex of the graph")


def _walk_length(P: PlaneGraph, darts: Sequence[int], closed: bool, length: str) -> float:
    if length == "vertices":
        if closed:
            return float(len(darts)) if darts else 1.0
        return float(len(darts) + 1)
    return float(sum(P.weight(d >> 1) for d in darts))


def _homotopy_states(P: PlaneGraph, result: Any) -> list[SweepState]:
    wit = result.witness
    if not isinstance(wit, Mapping) or "start" not in wit or "moves" not in wit:
        raise WitnessError("a homotopy witness is {'start': walk, 'moves': [...]}")
    stats = dict(result.stats or {})
    opts = dict(stats.get("options") or {})
    length = opts.get("length", stats.get("length", "weight"))
    if length not in ("weight", "vertices"):
        length = "weight"
    closed = bool(opts.get("closed", stats.get("closed", True)))
    m2 = 2 * P.number_of_edges()
    start = wit["start"]
    if not isinstance(start, Mapping) or "darts" not in start:
        raise WitnessError("the witness start is not a walk {'vertex': v, 'darts': [...]}")
    W = [int(d) for d in start["darts"]]
    for d in W:
        if not 0 <= d < m2:
            raise WitnessError(f"witness start: dart {d} does not exist")
    point = _label(P, start["vertex"]) if not W and start.get("vertex") is not None else None

    def vertex_at(i: int) -> Hashable:
        if not W:
            return point
        L = len(W)
        if i < L:
            return P.tail(W[i])
        return P.head(W[-1])

    def edges_of(ws: list[int]) -> set[int]:
        return {d >> 1 for d in ws}

    swept: set[int] = set()
    states = [SweepState(0, "start", _walk_length(P, W, closed, length), set(), set(), edges_of(W), [],
                         list(W), point if not W else None, [], closed)]
    for step, mv in enumerate(wit["moves"], start=1):
        if not isinstance(mv, Mapping) or "op" not in mv:
            raise WitnessError(f"step {step}: a move is a dict with 'op'")
        op = mv["op"]
        L = len(W)
        try:
            i = int(mv.get("pos", 0))
        except (TypeError, ValueError):
            raise WitnessError(f"step {step}: position {mv.get('pos')!r} is not an integer") from None
        if not 0 <= i <= L:
            raise WitnessError(f"step {step}: position {i} is outside 0..{L}")
        fresh: set[int] = set()
        if op == "flip":
            f = _check_face(P, mv.get("face"), step)
            k = int(mv.get("take", 0))
            q = [int(d) for d in mv.get("put", [])]
            for d in q:
                if not 0 <= d < m2:
                    raise WitnessError(f"step {step}: dart {d} does not exist")
            if not 0 <= k <= L:
                raise WitnessError(f"step {step}: take {k} is outside 0..{L}")
            removed_first = W[i % L] if (k and L) else None
            at = vertex_at(i) if L else point
            if i + k <= L:
                W = W[:i] + q + W[i + k :]
                changed = list(range(i, i + len(q)))
            else:
                W = q + W[(i + k) % L : i]
                changed = list(range(len(q)))
            swept ^= {f}
            fresh = {f}
            caption = f"flip face {f}"
            if not W:
                point = P.tail(removed_first) if removed_first is not None else at
        elif op == "spike":
            d = int(mv.get("dart", -1))
            if not 0 <= d < m2:
                raise WitnessError(f"step {step}: dart {d} does not exist")
            at = vertex_at(i) if W else point
            if at is not None and P.tail(d) != at:
                raise WitnessError(f"step {step}: the spike's dart leaves {P.tail(d)!r}, not {at!r}")
            W = W[:i] + [d, d ^ 1] + W[i:]
            changed = [i, i + 1]
            caption = f"spike along edge {d >> 1}"
        elif op == "unspike":
            if L < 2:
                raise WitnessError(f"step {step}: nothing to unspike in a walk of {L} darts")
            j = (i + 1) % L
            if W[j] != W[i % L] ^ 1:
                raise WitnessError(f"step {step}: darts at {i} and {j} are not a dart and its reverse")
            first = W[i % L]
            if i + 2 <= L:
                W = W[:i] + W[i + 2 :]
            else:
                W = W[(i + 2) % L : i]
            changed = []
            caption = f"unspike edge {first >> 1}"
            if not W:
                point = P.tail(first)
        else:
            raise WitnessError(f"step {step}: unknown move {op!r}; valid: 'flip', 'spike', 'unspike'")
        for a in range(len(W) - (0 if closed else 1)):
            b = (a + 1) % len(W)
            if len(W) > 1 or closed:
                if P.head(W[a]) != P.tail(W[b]):
                    raise WitnessError(f"step {step}: after the move, darts at positions {a} and {b} do not meet")
        states.append(SweepState(step, caption, _walk_length(P, W, closed, length), set(swept), fresh, edges_of(W),
                                 [], list(W), point if not W else None, changed, closed))
    return states


def sweep_states(P: Any, result: Any, *, on: str = "auto", start: Any = None, end: Any = None) -> list[SweepState]:
    """Every state of a sweep, rebuilt from a result's witness.

    Parameters
    ----------
    P : PlaneGraph or networkx graph
        The graph the result is about (a cutwidth result on a plain networkx
        graph needs a planar graph, which is embedded with ``from_graph``).
    result : Result or dict
        A result with a witness: a vertex ordering (``'cutwidth'``), a face
        order or toggle sequence (``'homology'``), or ``{"start", "moves"}``
        (``'homotopy'``).
    on : {'auto', 'vertices', 'faces'}
        For cutwidth: whether the ordering lists the graph's vertices or its
        faces (the cutwidth of the dual); 'auto' decides by the labels.
    start, end : optional
        Homology start and end cycles (edge ids), overriding the result's
        ``stats``.  Without them the start is ``stats['start']`` or, failing
        that, inferred from the witness and the end (empty by default).

    Returns
    -------
    list of SweepState
        ``len(witness) + 1`` states; state 0 is the start.

    Raises
    ------
    WitnessError
        A witness that cannot be replayed (names the step).
    SweepwidthError
        An unknown parameter or a graph that is not a plane graph.

    Notes
    -----
    O(steps * m) for cuts and cycles (each recomputed), O(steps * L) for walks.

    Examples
    --------
    >>> from sweepwidth import generators
    >>> from sweepwidth.result import Result
    >>> P = generators.grid(2, 3)                  # two squares
    >>> inner = [f for f in P.faces if f != P.outer_face]
    >>> r = Result("homology", "bounded", None, 0.0, 7.0, witness=inner)
    >>> [s.length for s in sweep_states(P, r)]
    [6.0, 4.0, 0.0]
    """
    result = as_result(result)
    P = _plane(P)
    if result.parameter == "homology":
        return _homology_states(P, result, start, end)
    if result.parameter == "homotopy":
        return _homotopy_states(P, result)
    if result.parameter == "cutwidth":
        return _cutwidth_states(P, result, on)
    raise UnsupportedOptionError("parameter", result.parameter, ["cutwidth", "homology", "homotopy"])
