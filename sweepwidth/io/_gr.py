"""The ``.gr`` edge-list format of the graph-parameter challenges, with a declared weight column.

::

    c any comment
    c @name pavilion-east          (our extension: the graph's name)
    c @weighted                    (our extension: every edge line has a third column, the weight)
    p tw 4 4
    1 2 3
    2 3 1.5
    3 4 2
    4 1 1

The header ``p <word> n m`` declares ``n`` vertices numbered ``1..n`` and
``m`` edges, one per line ``u v`` (``u v w`` when ``c @weighted`` appears
before the first edge).  Vertices keep the file's numbers as labels.
"""

from __future__ import annotations

from typing import Any

import networkx as nx

from .._weights import check_weight
from ..errors import InvalidEmbeddingError, NonPlanarError, SweepwidthError
from ..plane import PlaneGraph
from ._common import MAX_EDGES, MAX_VERTICES, fail, located

__all__ = ["read_gr", "write_gr"]

#: isolated vertices accepted beyond those touched by edges (guards the allocation of nodes)
MAX_ISOLATED = 100_000


def read_gr(data: bytes, *, path: Any = None, weight_column: bool | None = None) -> PlaneGraph | nx.Graph:
    """Parse a ``.gr`` file.

    Parameters
    ----------
    data : bytes
        The file content.
    path : str, optional
        For messages.
    weight_column : bool, optional
        Force reading (True) or not reading (False) a third column of edge
        weights; default: as declared by a ``c @weighted`` line.

    Returns
    -------
    PlaneGraph or networkx.Graph
        A PlaneGraph (edge ids in file order, embedding from networkx's
        planarity test) when the graph is connected and planar; otherwise a
        networkx Graph (MultiGraph when an edge repeats or a loop occurs)
        with ``weight`` on every edge.

    Raises
    ------
    FileFormatError
        Missing or repeated header, a bad token, a vertex outside ``1..n``,
        an edge count different from the header.
    WeightError
        A weight that is negative or NaN.

    Notes
    -----
    O(n + m) plus the planarity test.

    Examples
    --------
    >>> G = read_gr(b"p tw 3 2\\n1 2\\n2 3\\n")
    >>> G.number_of_vertices(), G.number_of_edges(), G.vertices
    (3, 2, [1, 2, 3])
    """
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as err:
        fail(f"not UTF-8 text ({err.reason})", path=path, offset=err.start)
    n = m = -1
    weighted = False
    name = None
    ends: list[tuple[int, int]] = []
    weights: list[float] = []
    for lineno, raw in enumerate(text.splitlines(), start=1):
        line = raw.strip()
        if not line:
            continue
        tok = line.split()
        if tok[0] == "c":
            if len(tok) >= 2 and tok[1] == "@weighted":
                if ends:
                    fail("'c @weighted' must come before the first edge", path=path, line=lineno)
                weighted = True
            elif len(tok) >= 2 and tok[1] == "@name":
                name = line.split(None, 2)[2] if len(tok) > 2 else ""
            continue
        if tok[0] == "p":
            if n >= 0:
                fail("a second 'p' header line", path=path, line=lineno)
            if len(tok) != 4:
                fail(f"expected the header 'p tw <vertices> <edges>', got {line[:60]!r}", path=path, line=lineno)
            n = _int(tok[2], "the vertex count", path, lineno)
            m = _int(tok[3], "the edge count", path, lineno)
            if n > MAX_VERTICES or m > MAX_EDGES:
                fail(f"declares {n} vertices and {m} edges, above the limits {MAX_VERTICES} / {MAX_EDGES}", path=path, line=lineno)
            if n < 1:
                fail("declares no vertices; a graph needs at least one", path=path, line=lineno)
            if m > text.count("\n") + 1:
                fail(f"declares {m} edges but the file has fewer lines", path=path, line=lineno)
            if n > 2 * m + MAX_ISOLATED:
                fail(f"declares {n} vertices for {m} edges: more than {MAX_ISOLATED} isolated vertices", path=path, line=lineno)
            continue
        if n < 0:
            fail(f"expected a comment 'c ...' or the header 'p tw <n> <m>' before edges, got {line[:60]!r}", path=path, line=lineno)
        use_w = weighted if weight_column is None else weight_column
        want = 3 if use_w else 2
        if len(tok) != want:
            what = "'u v weight'" if use_w else "'u v'"
            fail(f"expected an edge line {what}, got {len(tok)} fields", path=path, line=lineno)
        u = _int(tok[0], "a vertex number", path, lineno)
        v = _int(tok[1], "a vertex number", path, lineno)
        for x in (u, v):
            if not 1 <= x <= n:
                fail(f"vertex {x} is outside 1..{n}", path=path, line=lineno)
        if len(ends) >= m:
            fail(f"more edge lines than the {m} declared", path=path, line=lineno)
        w = 1.0
        if use_w:
            try:
                w = check_weight(_num(tok[2], path, lineno), f"edge {u}-{v}")
            except SweepwidthError as err:
                raise located(err, path, f"line {lineno}") from None
        ends.append((u, v))
        weights.append(w)
    if n < 0:
        fail("no header line 'p tw <vertices> <edges>'", path=path)
    if len(ends) != m:
        fail(f"the header declares {m} edges but {len(ends)} edge lines follow", path=path)
    multi = any(u == v for u, v in ends) or len({(min(u, v), max(u, v)) for u, v in ends}) < len(ends)
    G: nx.Graph = nx.MultiGraph() if multi else nx.Graph()
    G.add_nodes_from(range(1, n + 1))
    for (u, v), w in zip(ends, weights):
        G.add_edge(u, v, weight=w)
    if name is not None:
        G.graph["name"] = name
    if not nx.is_connected(G):
        return G
    from ._json import _from_planarity

    try:
        P = _from_planarity(list(range(1, n + 1)), [(u - 1, v - 1) for u, v in ends], weights, None)
    except NonPlanarError:
        return G
    except InvalidEmbeddingError as err:  # pragma: no cover - connected graphs always embed when planar
        raise located(err, path) from None
    if name is not None:
        P.meta["name"] = name
    return P


def _int(s: str, what: str, path: Any, line: int) -> int:
    try:
        x = int(s)
    except ValueError:
        fail(f"expected {what} (an integer), got {s[:30]!r}", path=path, line=line)
    if x < 0:
        fail(f"expected {what} >= 0, got {x}", path=path, line=line)
    return x


def _num(s: str, path: Any, line: int) -> float:
    try:
        return float(s)
    except ValueError:
        fail(f"expected a weight (a number), got {s[:30]!r}", path=path, line=line)


def write_gr(obj: PlaneGraph | nx.Graph, *, weight_column: bool | None = None, **_: Any) -> bytes:
    """The ``.gr`` text of a graph: vertices renumbered ``1..n`` in vertex order, edges in id order.

    ``weight_column`` writes the weight column (default: when some weight
    is not 1).  The rotation is not kept (the format has no place for it).

    Examples
    --------
    >>> import networkx as nx
    >>> print(write_gr(nx.path_graph(3)).decode(), end="")
    c written by sweepwidth
    p tw 3 2
    1 2
    2 3
    """
    if isinstance(obj, PlaneGraph):
        labels = obj.vertices
        index = {v: i + 1 for i, v in enumerate(labels)}
        edges = [(index[e.u], index[e.v], e.weight) for e in obj.edges]
        name = obj.meta.get("name")
    elif isinstance(obj, nx.Graph):
        labels = list(obj.nodes())
        index = {v: i + 1 for i, v in enumerate(labels)}
        edges = [
            (index[u], index[v], check_weight(d.get("weight", 1), f"edge ({u!r}, {v!r})"))
            for u, v, d in obj.edges(data=True)
        ]
        name = obj.graph.get("name")
    else:
        raise SweepwidthError(f"cannot write a {type(obj).__name__} as .gr; expected a PlaneGraph or a networkx graph")
    use_w = any(w != 1 for *_, w in edges) if weight_column is None else bool(weight_column)
    out = ["c written by sweepwidth"]
    if name:
        out.append(f"c @name {' '.join(str(name).split())}")
    if use_w:
        out.append("c @weighted")
    out.append(f"p tw {len(labels)} {len(edges)}")
    for u, v, w in edges:
        out.append(f"{u} {v} {_fmt(w)}" if use_w else f"{u} {v}")
    return ("\n".join(out) + "\n").encode("utf-8")


def _fmt(w: float) -> str:
    return str(int(w)) if float(w).is_integer() and abs(w) < 2**53 else repr(float(w))
