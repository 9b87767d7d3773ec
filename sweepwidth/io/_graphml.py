"""GraphML through networkx, with ``x``/``y`` node coordinates and our exact-embedding attributes.

Reading, in order of preference:

1. every node has ``sw_rotation`` and every edge ``sw_id`` (written by us):
   the exact rotation, edge ids and outer face (graph attribute ``sw_outer``);
2. every node has numeric ``x`` and ``y``: the straight-line drawing
   (:meth:`PlaneGraph.from_positions` rules, crossings are an error);
3. otherwise the abstract graph: a PlaneGraph from networkx's planarity test
   when connected and planar, else the networkx graph itself.

Labels are the node ids (strings), or the JSON-decoded ``sw_label`` when
present (so labels such as ``(2, 0)`` or ``7`` come back as they were).
Weights are the edge attribute ``weight`` (default 1).

Our attributes: node ``sw_label`` (JSON text of the label), ``sw_rotation``
(the node's darts counterclockwise, ``"e:end e:end ..."``), edge ``sw_id``
(the edge id), edge ``sw_from`` (the node id of the edge's first end, which
undirected GraphML does not keep), graph ``sw_outer`` (``"e:end"``, a dart with the outer face
on its left).  Other programs ignore them.
"""

from __future__ import annotations

import io
import json
import math
import warnings
from typing import Any

import networkx as nx

from .._weights import check_weight
from ..errors import FileFormatError, InputTypeError, NonPlanarError, SweepwidthError
from ..plane import PlaneGraph
from ._common import MAX_EDGES, MAX_VERTICES, decode_label, encode_label, fail, located

__all__ = ["read_graphml", "write_graphml"]


def read_graphml(data: bytes, *, path: Any = None) -> PlaneGraph | nx.Graph:
    """Parse GraphML (see the module notes for what is returned).

    Raises
    ------
    FileFormatError
        XML or GraphML that networkx cannot read (with the line when the XML
        parser gives one), or bad values of our attributes.
    CrossingEdgesError, InvalidEmbeddingError, WeightError
        Coordinates that do not give a planar drawing, an inconsistent
        rotation, or bad weights.

    Examples
    --------
    >>> import networkx as nx
    >>> P = read_graphml(write_graphml(PlaneGraph.from_graph(nx.cycle_graph(4))))
    >>> P.number_of_faces()
    2
    """
    if b"<!ENTITY" in data[:65536] or b"<!DOCTYPE" in data[:65536]:
        fail("DOCTYPE and entity declarations are not accepted in GraphML", path=path)
    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")  # the library never talks; bad keys surface as errors below
            G = nx.read_graphml(io.BytesIO(data))
    except Exception as err:  # noqa: BLE001 - any parser failure is a malformed file
        line = None
        pos = getattr(err, "position", None)
        if isinstance(pos, tuple) and pos:
            line = int(pos[0])
        fail(f"not GraphML that can be read ({type(err).__name__}: {str(err)[:200]})", path=path, line=line)
    if G.is_directed():
        G = nx.MultiGraph(G) if G.is_multigraph() else nx.Graph(G)
    if G.number_of_nodes() > MAX_VERTICES or G.number_of_edges() > MAX_EDGES:
        fail("more vertices or edges than the limits", path=path)
    nodes = list(G.nodes())
    labels = []
    for v in nodes:
        raw = G.nodes[v].get("sw_label")
        if raw is None:
            labels.append(v)
            continue
        try:
            labels.append(decode_label(json.loads(raw), path=path, where=f"sw_label of node {v!r}"))
        except (json.JSONDecodeError, TypeError):
            fail(f"node {v!r}: sw_label {str(raw)[:40]!r} is not JSON", path=path)
    if len(set(labels)) != len(labels):
        fail("two nodes have the same sw_label", path=path)
    relabel = dict(zip(nodes, labels))
    index = {v: i for i, v in enumerate(nodes)}
    if G.is_multigraph():
        items = [(u, v, d) for u, v, _k, d in G.edges(keys=True, data=True)]
    else:
        items = list(G.edges(data=True))
    # edge ids: sw_id when every edge has one, else file order
    ids = [d.get("sw_id") for _u, _v, d in items]
    if items and all(isinstance(x, int) and not isinstance(x, bool) for x in ids):
        if sorted(ids) != list(range(len(items))):
            fail("the sw_id values are not exactly 0..m-1", path=path)
    else:
        ids = list(range(len(items)))
    m = len(items)
    ends: list[tuple[int, int]] = [(0, 0)] * m
    weights = [1.0] * m
    edata: list[dict] = [{}] * m
    for (u, v, d), e in zip(items, ids):
        if d.get("sw_from") == v and u != v:
            u, v = v, u  # undirected GraphML keeps no edge direction: sw_from names ends[0]
        ends[e] = (index[u], index[v])
        try:
            weights[e] = check_weight(d.get("weight", 1), f"edge ({u!r}, {v!r})")
        except SweepwidthError as err:
            raise located(err, path) from None
        edata[e] = {k: x for k, x in d.items() if k not in ("weight", "sw_id", "sw_from", "id")}
    name = G.graph.get("name")
    meta = {"name": str(name)} if name else {}
    from ._json import _from_drawing, _from_planarity

    def build() -> PlaneGraph | None:
        nd = G.nodes
        if m and all("sw_rotation" in nd[v] for v in nodes) and all(x is not None for x in (d.get("sw_id") for _u, _v, d in items)):
            return _exact(G, nodes, labels, ends, weights, path)
        if nodes and all(_is_num(nd[v].get("x")) and _is_num(nd[v].get("y")) for v in nodes):
            pos = {labels[i]: (float(nd[v]["x"]), float(nd[v]["y"])) for i, v in enumerate(nodes)}
            return _from_drawing(labels, ends, weights, pos, None)
        H = nx.MultiGraph()
        H.add_nodes_from(labels)
        H.add_edges_from((labels[a], labels[b]) for a, b in ends)
        if not nodes or not nx.is_connected(H):
            return None
        try:
            return _from_planarity(labels, ends, weights, None)
        except NonPlanarError:
            return None

    try:
        P = build()
    except FileFormatError:
        raise
    except SweepwidthError as err:
        raise located(err, path) from None
    if P is None:
        out = nx.relabel_nodes(G, relabel, copy=True)
        for _u, _v, d in out.edges(data=True):
            d.pop("sw_id", None)
            d.pop("sw_from", None)
            d["weight"] = float(d.get("weight", 1))
        for v in out.nodes():
            out.nodes[v].pop("sw_label", None)
            out.nodes[v].pop("sw_rotation", None)
        out.graph.pop("sw_outer", None)
        return out
    P.set_edge_data(edata)
    P.meta.update(meta)
    return P


def _is_num(x: Any) -> bool:
    return isinstance(x, (int, float)) and not isinstance(x, bool) and math.isfinite(x)


def _parse_dart(s: Any, m: int, where: str, path: Any) -> int:
    try:
        a, b = str(s).split(":")
        e, end = int(a), int(b)
    except ValueError:
        fail(f"{where}: expected a dart 'edge:end', got {str(s)[:40]!r}", path=path)
    if not (0 <= e < m and end in (0, 1)):
        fail(f"{where}: dart {s!r} does not exist (edges 0..{m - 1}, ends 0 or 1)", path=path)
    return 2 * e + end


def _exact(G, nodes, labels, ends, weights, path) -> PlaneGraph:  # type: ignore[no-untyped-def]
    m = len(ends)
    nxt = [-1] * (2 * m)
    seen = [False] * (2 * m)
    for i, v in enumerate(nodes):
        raw = str(G.nodes[v]["sw_rotation"]).split()
        darts = [_parse_dart(t, m, f"sw_rotation of node {v!r}", path) for t in raw]
        for d in darts:
            if ends[d >> 1][d & 1] != i:
                fail(f"sw_rotation of node {v!r}: dart {d >> 1}:{d & 1} does not leave this node", path=path)
            if seen[d]:
                fail(f"sw_rotation of node {v!r}: dart {d >> 1}:{d & 1} is listed twice", path=path)
            seen[d] = True
        for k, d in enumerate(darts):
            nxt[d] = darts[(k + 1) % len(darts)]
    if not all(seen):
        d = seen.index(False)
        fail(f"dart {d >> 1}:{d & 1} is in no sw_rotation", path=path)
    outer = G.graph.get("sw_outer")
    od = _parse_dart(outer, m, "sw_outer", path) if outer is not None else None
    return PlaneGraph(labels, ends, weights, nxt, outer_dart=od)


def write_graphml(obj: PlaneGraph | nx.Graph, **_: Any) -> bytes:
    """GraphML bytes: node ids ``n0, n1, ...``, ``sw_label``, ``x``/``y`` when known, ``weight``.

    A PlaneGraph also gets ``sw_rotation``, ``sw_id`` and ``sw_outer`` so that
    it reads back exactly.  Edge attributes must be strings, numbers or
    booleans.
    """
    H = nx.MultiGraph()
    if isinstance(obj, PlaneGraph):
        P = obj
        if P.meta.get("name"):
            H.graph["name"] = str(P.meta["name"])
        walk = P.face_darts(P.outer_face)
        if walk:
            H.graph["sw_outer"] = f"{walk[0] >> 1}:{walk[0] & 1}"
        rot = P.rotation_by_edges()
        for i, v in enumerate(P.vertices):
            attrs: dict[str, Any] = {"sw_label": json.dumps(encode_label(v))}
            if P.pos is not None and v in P.pos:
                attrs["x"], attrs["y"] = float(P.pos[v][0]), float(P.pos[v][1])
            attrs["sw_rotation"] = " ".join(f"{e}:{end}" for e, end in rot[v])
            H.add_node(f"n{i}", **attrs)
        for e in P.edges:
            data = _scalars(P.edge_data(e.id), f"edge {e.id}")
            H.add_edge(
                f"n{P.index(e.u)}", f"n{P.index(e.v)}", key=e.id, weight=float(e.weight), sw_id=e.id,
                sw_from=f"n{P.index(e.u)}", **data,
            )
    elif isinstance(obj, nx.Graph):
        G = obj
        if G.graph.get("name"):
            H.graph["name"] = str(G.graph["name"])
        index = {v: i for i, v in enumerate(G.nodes())}
        for v, d in G.nodes(data=True):
            H.add_node(f"n{index[v]}", sw_label=json.dumps(encode_label(v)), **_scalars(d, f"node {v!r}"))
        items = G.edges(data=True, keys=True) if G.is_multigraph() else ((u, v, None, d) for u, v, d in G.edges(data=True))
        for u, v, _k, d in items:
            w = check_weight(d.get("weight", 1), f"edge ({u!r}, {v!r})")
            rest = _scalars({k: x for k, x in d.items() if k != "weight"}, f"edge ({u!r}, {v!r})")
            H.add_edge(f"n{index[u]}", f"n{index[v]}", weight=float(w), **rest)
    else:
        raise InputTypeError(f"cannot write a {type(obj).__name__} as GraphML; expected a PlaneGraph or a networkx graph")
    buf = io.BytesIO()
    nx.write_graphml(H, buf)
    return buf.getvalue()


def _scalars(d: dict, where: str) -> dict:
    out = {}
    for k, x in d.items():
        if isinstance(x, (str, int, float, bool)):
            out[str(k)] = x
        else:
            raise InputTypeError(f"attribute {k!r} of {where} is a {type(x).__name__}; GraphML holds strings and numbers")
    return out
