"""Our JSON document for plane graphs and plain graphs (schema in docs/formats.md).

A plane document::

    {"format": "sweepwidth-plane", "version": 1,
     "name": "two triangles", "provenance": {...},
     "vertices": [0, 1, 2, 3],
     "edges": [{"id": 0, "ends": [0, 1], "weight": 1}, ...],
     "rotation": [[[0, 0], [4, 0], [3, 1]], ...],     # per vertex, counterclockwise darts
     "positions": [[0.0, 0.0], ...],                  # optional, per vertex
     "outer": [3, 1],                                 # a dart with the outer face on its left
     "curves": {"start": {"vertex": 0, "darts": [[0, 0], [1, 0], [2, 0]]}},
     "holes": [[4, 1]], "known": {"cutwidth": {"value": 3, "source": "..."}}}

A dart is written ``[edge id, end]``: end 0 runs from ``ends[0]`` to
``ends[1]`` (dart ``2*id``), end 1 back (dart ``2*id + 1``).  Vertex labels
are JSON scalars or arrays; arrays are read back as tuples (recursively).
"""

from __future__ import annotations

import json
import math
from typing import Any, Hashable, Mapping, NoReturn

import networkx as nx
import numpy as np

from .._weights import check_weight
from ..errors import FileFormatError, InputTypeError, InvalidArgumentError, InvalidCurveError, InvalidEmbeddingError, SweepwidthError
from ..plane import PlaneGraph
from ._common import MAX_EDGES, MAX_VERTICES, decode_label, encode_label, fail, located

__all__ = ["PLANE_FORMAT", "GRAPH_FORMAT", "VERSION", "to_document", "from_document", "dumps", "loads"]

PLANE_FORMAT = "sweepwidth-plane"
GRAPH_FORMAT = "sweepwidth-graph"
VERSION = 1

# meta keys that have a place of their own in the document
_OWN_KEYS = ("name", "provenance", "curves", "holes", "known")


# =================================================================== writing
def _number(x: float) -> int | float:
    return int(x) if float(x).is_integer() and abs(x) < 2**53 else float(x)


def _jsonable(value: Any, where: str) -> Any:
    try:
        json.dumps(value, allow_nan=False)
    except (TypeError, ValueError) as err:
        raise InvalidArgumentError(f"{where} cannot be written to JSON: {err}") from err
    return value


def _dart(d: int) -> list[int]:
    return [int(d) >> 1, int(d) & 1]


def _curve_out(P: PlaneGraph, name: str, c: Any) -> dict:
    if not isinstance(c, Mapping):
        raise InvalidArgumentError(f"curve {name!r} in meta must be a dict with 'vertex' and 'darts', or 'edges'")
    if "edges" in c:
        return {"edges": [int(e) for e in c["edges"]]}
    if "vertex" not in c or "darts" not in c:
        raise InvalidArgumentError(f"curve {name!r} in meta needs 'vertex' and 'darts', or 'edges'")
    return {"vertex": encode_label(c["vertex"], f"vertex of curve {name!r}"), "darts": [_dart(d) for d in c["darts"]]}


def to_document(obj: PlaneGraph | nx.Graph) -> dict:
    """The JSON document (a dict) for a plane graph or a networkx graph.

    Parameters
    ----------
    obj : PlaneGraph or networkx.Graph
        A plane graph gives a ``sweepwidth-plane`` document with its
        rotation, outer face, positions and metadata; a networkx graph
        (simple or multi, undirected) gives a ``sweepwidth-graph`` document
        (vertices and weighted edges).

    Returns
    -------
    dict
        Ready for ``json.dumps``.

    Raises
    ------
    SweepwidthError
        A label or metadata value that JSON cannot hold.

    Examples
    --------
    >>> import networkx as nx
    >>> doc = to_document(PlaneGraph.from_graph(nx.path_graph(2)))
    >>> doc["format"], doc["edges"], doc["rotation"]
    ('sweepwidth-plane', [{'id': 0, 'ends': [0, 1], 'weight': 1}], [[[0, 0]], [[0, 1]]])
    """
    if isinstance(obj, PlaneGraph):
        return _plane_document(obj)
    if isinstance(obj, nx.Graph):
        return _graph_document(obj)
    raise InputTypeError(f"cannot write a {type(obj).__name__}; expected a PlaneGraph or a networkx graph")


def _plane_document(P: PlaneGraph) -> dict:
    doc: dict[str, Any] = {"format": PLANE_FORMAT, "version": VERSION}
    meta = P.meta
    if meta.get("name") is not None:
        doc["name"] = str(meta["name"])
    if meta.get("provenance") is not None:
        doc["provenance"] = _jsonable(meta["provenance"], "meta['provenance']")
    labels = P.vertices
    doc["vertices"] = [encode_label(v) for v in labels]
    edges = []
    for e in P.edges:
        item: dict[str, Any] = {
            "id": e.id,
            "ends": [encode_label(e.u), encode_label(e.v)],
            "weight": _number(e.weight),
        }
        data = P.edge_data(e.id)
        if data:
            item["data"] = _jsonable(data, f"data of edge {e.id}")
        edges.append(item)
    doc["edges"] = edges
    rot = P.rotation_by_edges()
    doc["rotation"] = [[[e, end] for e, end in rot[v]] for v in labels]
    if P.pos is not None:
        doc["positions"] = [
            [float(P.pos[v][0]), float(P.pos[v][1])] if v in P.pos else None for v in labels
        ]
    walk = P.face_darts(P.outer_face)
    doc["outer"] = _dart(walk[0]) if walk else None
    if meta.get("curves"):
        doc["curves"] = {str(k): _curve_out(P, str(k), c) for k, c in meta["curves"].items()}
    if meta.get("holes"):
        holes = []
        for f in meta["holes"]:
            darts = P.face_darts(int(f))
            if not darts:
                raise InvalidArgumentError(f"hole {f!r} is a face without boundary darts")
            holes.append(_dart(darts[0]))
        doc["holes"] = holes
    if meta.get("known"):
        doc["known"] = _jsonable(dict(meta["known"]), "meta['known']")
    extra = {k: v for k, v in meta.items() if k not in _OWN_KEYS}
    if extra:
        doc["extra"] = {str(k): _jsonable(v, f"meta[{k!r}]") for k, v in extra.items()}
    return doc


def _graph_document(G: nx.Graph) -> dict:
    if G.is_directed():
        raise InvalidArgumentError("directed graphs are not supported; pass G.to_undirected()")
    doc: dict[str, Any] = {"format": GRAPH_FORMAT, "version": VERSION}
    name = G.graph.get("name")
    if name:
        doc["name"] = str(name)
    for k in ("provenance", "known"):
        if G.graph.get(k) is not None:
            doc[k] = _jsonable(G.graph[k], f"G.graph[{k!r}]")
    doc["multigraph"] = bool(G.is_multigraph())
    doc["vertices"] = [encode_label(v) for v in G.nodes()]
    edges = []
    items = G.edges(keys=True, data=True) if G.is_multigraph() else ((u, v, None, d) for u, v, d in G.edges(data=True))
    for i, (u, v, _k, d) in enumerate(items):
        w = check_weight(d.get("weight", 1), f"edge ({u!r}, {v!r})")
        item: dict[str, Any] = {"id": i, "ends": [encode_label(u), encode_label(v)], "weight": _number(w)}
        data = {k: val for k, val in d.items() if k != "weight"}
        if data:
            item["data"] = _jsonable(data, f"data of edge ({u!r}, {v!r})")
        edges.append(item)
    doc["edges"] = edges
    return doc


def dumps(obj: PlaneGraph | nx.Graph, *, indent: int | None = 1) -> str:
    """The JSON document of ``obj`` as text (see :func:`to_document`).

    Examples
    --------
    >>> import networkx as nx
    >>> P = PlaneGraph.from_graph(nx.cycle_graph(3))
    >>> loads(dumps(P)).same_embedding(P)
    True
    """
    doc = to_document(obj)
    if indent is None:
        return json.dumps(doc, allow_nan=False, separators=(",", ":")) + "\n"
    return _layout(doc, " " * max(0, int(indent))) + "\n"


def _layout(doc: dict, pad: str) -> str:
    """Top-level keys one per line; the items of long arrays and objects one per line.

    Keeps a document of a large graph readable (an edge or a vertex's
    rotation per line) without the one-number-per-line blow-up of
    ``json.dumps(indent=...)``.
    """

    def one(x: Any) -> str:
        return json.dumps(x, allow_nan=False, separators=(", ", ": "))

    parts = []
    for k, v in doc.items():
        key = json.dumps(k)
        if isinstance(v, list) and v and not all(isinstance(x, (int, float, str, bool)) for x in v):
            inner = (",\n" + pad * 2).join(one(x) for x in v)
            parts.append(f"{pad}{key}: [\n{pad * 2}{inner}\n{pad}]")
        elif isinstance(v, dict) and v:
            inner = (",\n" + pad * 2).join(f"{json.dumps(str(a))}: {one(b)}" for a, b in v.items())
            parts.append(f"{pad}{key}: {{\n{pad * 2}{inner}\n{pad}}}")
        else:
            parts.append(f"{pad}{key}: {one(v)}")
    return "{\n" + ",\n".join(parts) + "\n}"


# =================================================================== reading
def loads(text: str | bytes, *, path: Any = None) -> PlaneGraph | nx.Graph:
    """Read a JSON document from text: a PlaneGraph or (``sweepwidth-graph``) a networkx graph.

    Raises
    ------
    FileFormatError
        Not JSON (with line and column), not one of our documents, a
        missing or ill-typed key (named by its place, e.g. ``edges[3].ends``).
    InvalidEmbeddingError, WeightError
        The document is well formed but its graph is not a valid plane graph
        or a weight is negative or NaN; the message starts with the file.
    """
    if isinstance(text, bytes):
        try:
            text = text.decode("utf-8")
        except UnicodeDecodeError as err:
            fail(f"not UTF-8 text ({err.reason})", path=path, offset=err.start)
    try:
        doc = json.loads(text)
    except json.JSONDecodeError as err:
        fail(f"not valid JSON: {err.msg} (column {err.colno})", path=path, line=err.lineno)
    except RecursionError:
        fail("JSON nested too deeply", path=path)
    return from_document(doc, path=path)


class _Reader:
    """Typed access to a decoded document, with errors naming the key's place."""

    def __init__(self, path: Any) -> None:
        self.path = path

    def fail(self, where: str, message: str) -> NoReturn:
        fail(f"{where}: {message}", path=self.path)

    def get(self, obj: Mapping, key: str, types: type | tuple, where: str, *, required: bool = True) -> Any:
        if key not in obj:
            if required:
                self.fail(where, f"missing key {key!r}")
            return None
        val = obj[key]
        if val is None and not required:
            return None
        if not isinstance(val, types) or (isinstance(val, bool) and bool not in _astuple(types)):
            self.fail(f"{where}.{key}" if where else key, f"expected {_typename(types)}, got {_jsonname(val)}")
        return val

    def integer(self, x: Any, where: str, lo: int, hi: int) -> int:
        if isinstance(x, bool) or not isinstance(x, int):
            self.fail(where, f"expected an integer, got {_jsonname(x)}")
        if not lo <= x <= hi:
            self.fail(where, f"{x} is outside {lo}..{hi}")
        return int(x)

    def dart(self, x: Any, where: str, m: int) -> int:
        if isinstance(x, list) and len(x) == 2:
            e = self.integer(x[0], f"{where}[0]", 0, max(0, m - 1)) if m else self.fail(where, "there are no edges")
            end = self.integer(x[1], f"{where}[1]", 0, 1)
            return 2 * int(e) + end  # type: ignore[arg-type]
        self.fail(where, f"expected a dart [edge id, end], got {_jsonname(x)}")
        raise AssertionError  # pragma: no cover


def _astuple(t: type | tuple) -> tuple:
    return t if isinstance(t, tuple) else (t,)


def _typename(t: type | tuple) -> str:
    names = {list: "an array", dict: "an object", str: "a string", int: "an integer", float: "a number", bool: "a boolean"}
    return " or ".join(names.get(x, x.__name__) for x in _astuple(t))


def _jsonname(x: Any) -> str:
    if x is None:
        return "null"
    if isinstance(x, bool):
        return "a boolean"
    if isinstance(x, (int, float)):
        return f"the number {x!r}"
    if isinstance(x, str):
        return f"the string {x[:40]!r}"
    if isinstance(x, list):
        return f"an array of {len(x)}"
    if isinstance(x, dict):
        return "an object"
    return type(x).__name__


def from_document(doc: Any, *, path: Any = None) -> PlaneGraph | nx.Graph:
    """Build the graph described by a decoded JSON document (see :func:`loads`).

    Examples
    --------
    >>> doc = {"format": "sweepwidth-plane", "version": 1, "vertices": ["a"], "edges": []}
    >>> from_document(doc).number_of_vertices()
    1
    """
    R = _Reader(path)
    if not isinstance(doc, dict):
        fail(f"expected a JSON object at the top level, got {_jsonname(doc)}", path=path)
    fmt = doc.get("format")
    if fmt not in (PLANE_FORMAT, GRAPH_FORMAT):
        fail(
            f"key 'format' is {fmt!r}; expected {PLANE_FORMAT!r} or {GRAPH_FORMAT!r}",
            path=path,
        )
    version = R.get(doc, "version", int, "")
    if isinstance(version, bool) or version < 1:
        R.fail("version", f"expected a positive integer, got {version!r}")
    if version > VERSION:
        R.fail("version", f"version {version} is newer than this library reads ({VERSION})")
    labels, ends, weights, data = _read_edges(R, doc)
    if fmt == GRAPH_FORMAT:
        return _build_nx(R, doc, labels, ends, weights, data)
    return _build_plane(R, doc, labels, ends, weights, data)


def _read_edges(R: _Reader, doc: dict) -> tuple[list[Hashable], list[tuple[int, int]], list[float], list[dict]]:
    raw_v = R.get(doc, "vertices", list, "")
    if len(raw_v) > MAX_VERTICES:
        R.fail("vertices", f"{len(raw_v)} vertices is more than the limit {MAX_VERTICES}")
    labels = [decode_label(x, path=R.path, where=f"vertices[{i}]") for i, x in enumerate(raw_v)]
    index: dict[Hashable, int] = {}
    for i, v in enumerate(labels):
        if v in index:
            R.fail(f"vertices[{i}]", f"label {v!r} repeats vertices[{index[v]}]")
        index[v] = i
    raw_e = R.get(doc, "edges", list, "")
    m = len(raw_e)
    if m > MAX_EDGES:
        R.fail("edges", f"{m} edges is more than the limit {MAX_EDGES}")
    ends: list[tuple[int, int] | None] = [None] * m
    weights: list[float] = [1.0] * m
    data: list[dict] = [{} for _ in range(m)]
    for k, item in enumerate(raw_e):
        where = f"edges[{k}]"
        if not isinstance(item, dict):
            R.fail(where, f"expected an object, got {_jsonname(item)}")
        e = R.integer(item.get("id", k), f"{where}.id", 0, m - 1)
        if ends[e] is not None:
            R.fail(f"{where}.id", f"edge id {e} is used twice")
        pair = R.get(item, "ends", list, where)
        if len(pair) != 2:
            R.fail(f"{where}.ends", f"expected two vertex labels, got {len(pair)}")
        iu_iv = []
        for j in (0, 1):
            lab = decode_label(pair[j], path=R.path, where=f"{where}.ends[{j}]")
            try:
                iu_iv.append(index[lab])
            except (KeyError, TypeError):
                R.fail(f"{where}.ends[{j}]", f"{lab!r} is not listed in 'vertices'")
        ends[e] = (iu_iv[0], iu_iv[1])
        if "weight" in item:
            try:
                weights[e] = check_weight(item["weight"], f"edge {e}")
            except SweepwidthError as err:
                raise located(err, R.path, f"{where}.weight") from None
        if "data" in item and item["data"] is not None:
            if not isinstance(item["data"], dict):
                R.fail(f"{where}.data", f"expected an object, got {_jsonname(item['data'])}")
            data[e] = dict(item["data"])
    return labels, ends, weights, data  # type: ignore[return-value]


def _meta_common(R: _Reader, doc: dict) -> dict:
    meta: dict[str, Any] = {}
    name = R.get(doc, "name", str, "", required=False)
    if name is not None:
        meta["name"] = name
    prov = doc.get("provenance")
    if prov is not None:
        meta["provenance"] = prov
    known = R.get(doc, "known", dict, "", required=False)
    if known:
        for k, v in known.items():
            if not isinstance(v, dict) or "value" not in v:
                R.fail(f"known.{k}", "expected an object with 'value' (and 'source')")
        meta["known"] = known
    extra = R.get(doc, "extra", dict, "", required=False)
    if extra:
        for k, v in extra.items():
            if k not in meta:
                meta[k] = v
    return meta


def _build_nx(R, doc, labels, ends, weights, data) -> nx.Graph:  # type: ignore[no-untyped-def]
    multi = R.get(doc, "multigraph", bool, "", required=False)
    G: nx.Graph = nx.MultiGraph() if multi else nx.Graph()
    G.add_nodes_from(labels)
    for e, (iu, iv) in enumerate(ends):
        u, v = labels[iu], labels[iv]
        if not multi and G.has_edge(u, v):
            R.fail(f"edges (id {e})", f"a second edge joins {u!r} and {v!r} but 'multigraph' is false")
        G.add_edge(u, v, **data[e], weight=weights[e])
    G.graph.update(_meta_common(R, doc))
    return G


def _build_plane(R, doc, labels, ends, weights, data) -> PlaneGraph:  # type: ignore[no-untyped-def]
    path = R.path
    n, m = len(labels), len(ends)
    meta = _meta_common(R, doc)
    pos: dict[Hashable, tuple[float, float]] | None = None
    raw_p = R.get(doc, "positions", list, "", required=False)
    if raw_p is not None:
        if len(raw_p) != n:
            R.fail("positions", f"{len(raw_p)} entries for {n} vertices")
        pos = {}
        for i, p in enumerate(raw_p):
            if p is None:
                continue
            if (
                not isinstance(p, list)
                or len(p) not in (2, 3)
                or not all(isinstance(c, (int, float)) and not isinstance(c, bool) for c in p)
            ):
                R.fail(f"positions[{i}]", f"expected [x, y], got {_jsonname(p)}")
            if not all(math.isfinite(c) for c in p):
                R.fail(f"positions[{i}]", f"coordinates {p!r} are not finite")
            pos[labels[i]] = (float(p[0]), float(p[1]))
        if not pos:
            pos = None
    raw_rot = R.get(doc, "rotation", list, "", required=False)
    outer_dart = None
    if doc.get("outer") is not None:
        outer_dart = R.dart(doc["outer"], "outer", m)
    try:
        if raw_rot is not None:
            P = _from_rotation(R, raw_rot, labels, ends, weights, outer_dart, pos)
        elif pos is not None and len(pos) == n:
            P = _from_drawing(labels, ends, weights, pos, outer_dart)
        else:
            P = _from_planarity(labels, ends, weights, outer_dart)
    except SweepwidthError as err:
        if isinstance(err, FileFormatError):
            raise
        raise located(err, path) from None
    P.set_edge_data(data)
    if pos is not None:
        P.pos = pos
    P.meta = meta
    if doc.get("curves") is not None:
        P.meta["curves"] = _read_curves(R, doc["curves"], P)
    if doc.get("holes") is not None:
        raw_h = R.get(doc, "holes", list, "")
        P.meta["holes"] = [P.face_of_dart(R.dart(h, f"holes[{i}]", m)) for i, h in enumerate(raw_h)]
    return P


def _from_rotation(R, raw_rot, labels, ends, weights, outer_dart, pos) -> PlaneGraph:  # type: ignore[no-untyped-def]
    n, m = len(labels), len(ends)
    if len(raw_rot) != n:
        R.fail("rotation", f"{len(raw_rot)} entries for {n} vertices")
    nxt = [-1] * (2 * m)
    seen = [-1] * (2 * m)
    for i, lst in enumerate(raw_rot):
        where = f"rotation[{i}]"
        if not isinstance(lst, list):
            R.fail(where, f"expected an array of darts, got {_jsonname(lst)}")
        darts = []
        for j, x in enumerate(lst):
            if isinstance(x, list):
                d = R.dart(x, f"{where}[{j}]", m)
            else:
                e = R.integer(x, f"{where}[{j}]", 0, max(0, m - 1)) if m else R.fail(where, "there are no edges")
                a, b = ends[e]  # type: ignore[index]
                if a == b:
                    R.fail(f"{where}[{j}]", f"edge {e} is a loop: write its darts as [{e}, 0] and [{e}, 1]")
                if i not in (a, b):
                    R.fail(f"{where}[{j}]", f"edge {e} does not touch vertex {labels[i]!r}")
                d = 2 * e if a == i else 2 * e + 1  # type: ignore[operator]
            tail = ends[d >> 1][d & 1]
            if tail != i:
                R.fail(
                    f"{where}[{j}]",
                    f"dart [{d >> 1}, {d & 1}] leaves {labels[tail]!r}, not vertex {labels[i]!r}",
                )
            if seen[d] >= 0:
                R.fail(f"{where}[{j}]", f"dart [{d >> 1}, {d & 1}] is listed twice")
            seen[d] = i
            darts.append(d)
        for k, d in enumerate(darts):
            nxt[d] = darts[(k + 1) % len(darts)]
    for d in range(2 * m):
        if seen[d] < 0:
            v = labels[ends[d >> 1][d & 1]]
            R.fail("rotation", f"dart [{d >> 1}, {d & 1}] is missing from the rotation of vertex {v!r}")
    return PlaneGraph(labels, ends, weights, nxt, outer_dart=outer_dart, pos=pos)


def _from_drawing(labels, ends, weights, pos, outer_dart) -> PlaneGraph:  # type: ignore[no-untyped-def]
    from ..plane import drawing_rotation

    for e, (a, b) in enumerate(ends):
        if a == b:
            raise InvalidEmbeddingError(
                f"edge {e} is a loop at {labels[a]!r}: a straight-line drawing cannot hold it; give a 'rotation'"
            )
    xy = np.array([pos[v] for v in labels], dtype=float).reshape(len(labels), 2)
    nxt, od = drawing_rotation(xy, ends, labels)
    return PlaneGraph(labels, ends, weights, nxt, outer_dart=outer_dart if outer_dart is not None else od, pos=pos)


def _from_planarity(labels, ends, weights, outer_dart) -> PlaneGraph:  # type: ignore[no-untyped-def]
    """An embedding from networkx's planarity test, keeping the document's edge ids."""
    G = nx.MultiGraph()
    G.add_nodes_from(labels)
    for e, (a, b) in enumerate(ends):
        G.add_edge(labels[a], labels[b], key=e, fid=e, weight=weights[e])
    Q = PlaneGraph.from_graph(G)
    new_id = [Q.edge_data(e)["fid"] for e in range(Q.number_of_edges())]
    flip = [Q.index(Q.edge_ends(e)[0]) != ends[new_id[e]][0] for e in range(Q.number_of_edges())]
    return renumber_edges(Q, new_id, flip=flip, outer_dart=outer_dart)


def renumber_edges(
    Q: PlaneGraph, new_id: list[int], *, flip: list[bool] | None = None, outer_dart: int | None = None
) -> PlaneGraph:
    """The same plane graph with edge ``e`` renamed ``new_id[e]`` (and its darts with it).

    ``flip[e]`` reverses the direction of edge ``e`` (its two darts swap
    numbers); ``outer_dart`` (in the new numbering) picks the outer face;
    default: Q's.
    """
    m = Q.number_of_edges()
    fl = flip or [False] * m
    ends = [(0, 0)] * m
    wts = [0.0] * m
    edata: list[dict] = [{}] * m
    for e in range(m):
        u, v = Q.edge_ends(e)
        if fl[e]:
            u, v = v, u
        ends[new_id[e]] = (Q.index(u), Q.index(v))
        wts[new_id[e]] = Q.weight(e)
        edata[new_id[e]] = {k: x for k, x in Q.edge_data(e).items() if k != "fid"}

    def nd(d: int) -> int:
        return 2 * new_id[d >> 1] + ((d & 1) ^ int(fl[d >> 1]))

    nxt = [0] * (2 * m)
    for d in range(2 * m):
        nxt[nd(d)] = nd(Q.next_dart(d))
    if outer_dart is None:
        walk = Q.face_darts(Q.outer_face)
        outer_dart = nd(walk[0]) if walk else None
    return PlaneGraph(Q.vertices, ends, wts, nxt, outer_dart=outer_dart, pos=Q.pos, edge_data=edata, meta=Q.meta)


def _read_curves(R: _Reader, raw: Any, P: PlaneGraph) -> dict:
    if not isinstance(raw, dict):
        R.fail("curves", f"expected an object of named curves, got {_jsonname(raw)}")
    m = P.number_of_edges()
    out: dict[str, dict] = {}
    for name, c in raw.items():
        where = f"curves.{name}"
        if not isinstance(c, dict):
            R.fail(where, f"expected an object, got {_jsonname(c)}")
        if "edges" in c:
            ids = R.get(c, "edges", list, where)
            out[name] = {"edges": [R.integer(x, f"{where}.edges[{i}]", 0, m - 1) for i, x in enumerate(ids)]}
            continue
        if "vertex" not in c:
            R.fail(where, "expected 'vertex' and 'darts' (a walk) or 'edges' (an edge set)")
        v = decode_label(c["vertex"], path=R.path, where=f"{where}.vertex")
        if not P.has_vertex(v):
            R.fail(f"{where}.vertex", f"{v!r} is not a vertex")
        raw_d = R.get(c, "darts", list, where)
        darts = [R.dart(x, f"{where}.darts[{i}]", m) for i, x in enumerate(raw_d)]
        at = v
        for i, d in enumerate(darts):
            if P.tail(d) != at:
                raise located(
                    InvalidCurveError(
                        f"dart {i} ([{d >> 1}, {d & 1}]) leaves {P.tail(d)!r} but the walk is at {at!r}"
                    ),
                    R.path,
                    where,
                )
            at = P.head(d)
        out[name] = {"vertex": v, "darts": darts}
    return out
