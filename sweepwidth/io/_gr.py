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
import numpy as np

from .._weights import MAX_TOTAL_WEIGHT, check_weight
from ..errors import InputTypeError, InvalidEmbeddingError, NonPlanarError, SweepwidthError
from ..plane import PlaneGraph
from ._common import MAX_EDGES, MAX_VERTICES, fail, located

__all__ = ["read_gr", "write_gr"]

#: isolated vertices accepted beyond those touched by edges (guards the allocation of nodes)
MAX_ISOLATED = 100_000


def read_gr(data: bytes, *, path: Any = None, weight_column: bool | None = None, embed: bool = True) -> PlaneGraph | nx.Graph:
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
    embed : bool
        False returns the networkx graph without running the planarity test
        (what ``read(path, kind='graph')`` asks for).

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
    O(n + m) plus the planarity test (skipped with ``embed=False``).  Edge
    lines are parsed in bulk with numpy; a file that does not parse that way
    is read line by line, which words the error.  ``benchmarks/io_read.py``
    measures 10^6 edges against networkx's own edge-list reader.

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
    fast = _read_fast(text, weight_column)
    if fast is not None:
        n, ends_arr, weights_arr, name = fast
        return _build(n, ends_arr, weights_arr, name, path, embed)
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
    return _build(n, np.array(ends, dtype=np.int64).reshape(-1, 2), np.array(weights, dtype=np.float64), name, path, embed)


def _read_fast(text: str, weight_column: bool | None) -> tuple[int, np.ndarray, np.ndarray, str | None] | None:
    """Bulk parse of a well-formed file: ``(n, ends, weights, name)``, or None to take the checking path."""
    lines = text.splitlines()
    n = m = -1
    weighted = False
    name = None
    start = None
    for i, raw in enumerate(lines):  # comments and the header come first
        tok = raw.split()
        if not tok:
            continue
        if tok[0] == "c":
            if len(tok) >= 2 and tok[1] == "@weighted":
                weighted = True
            elif len(tok) >= 2 and tok[1] == "@name":
                name = raw.strip().split(None, 2)[2] if len(tok) > 2 else ""
            continue
        if tok[0] != "p" or len(tok) != 4 or not (tok[2].isdigit() and tok[3].isdigit()):
            return None
        n, m = int(tok[2]), int(tok[3])
        start = i + 1
        break
    if start is None or n < 1 or n > MAX_VERTICES or m > MAX_EDGES or n > 2 * m + MAX_ISOLATED:
        return None
    body = lines[start:]
    use_w = weighted if weight_column is None else weight_column
    width = 3 if use_w else 2
    flat = " ".join(body).split()
    if len(flat) != width * m or (m and "c" in flat) or "p" in flat:
        return None
    if m == 0:
        return n, np.zeros((0, 2), dtype=np.int64), np.zeros(0), name
    try:
        table = np.array(flat, dtype=np.float64 if use_w else np.int64).reshape(m, width)
    except (ValueError, OverflowError):
        return None
    if use_w:
        uv = table[:, :2]
        if not np.all(uv == np.round(uv)):
            return None
        ends = uv.astype(np.int64)
        weights = np.ascontiguousarray(table[:, 2])
        if not np.all(np.isfinite(weights) & (weights >= 0)) or weights.sum() > MAX_TOTAL_WEIGHT:
            return None  # the line-by-line path names the line and the edge
    else:
        ends = table.astype(np.int64, copy=False)
        weights = np.ones(m)
    # every edge line must have exactly `width` fields (the joined split hides line breaks)
    fields = 0
    for ln in body:
        k = len(ln.split())
        if k and k != width:
            return None
        fields += k
    if fields != width * m:  # pragma: no cover - implied by the token count
        return None
    if ends.size and (ends.min() < 1 or ends.max() > n):
        return None
    return n, ends, weights, name


def _build(n: int, ends: np.ndarray, weights: np.ndarray, name: str | None, path: Any, embed: bool) -> PlaneGraph | nx.Graph:
    """The graph of checked edges: a PlaneGraph when ``embed`` and planar and connected, else networkx."""
    m = len(ends)
    lo = np.minimum(ends[:, 0], ends[:, 1])
    hi = np.maximum(ends[:, 0], ends[:, 1])
    multi = bool(np.any(lo == hi)) or (m > 0 and len(np.unique(lo * (n + 1) + hi)) < m)
    G: nx.Graph = nx.MultiGraph() if multi else nx.Graph()
    G.add_nodes_from(range(1, n + 1))
    G.add_weighted_edges_from(zip(ends[:, 0].tolist(), ends[:, 1].tolist(), weights.tolist()))
    if name is not None:
        G.graph["name"] = name
    if not embed or not _connected(n, ends):
        return G
    from ._json import _from_planarity

    try:
        P = _from_planarity(list(range(1, n + 1)), (ends - 1).tolist(), weights.tolist(), None)
    except NonPlanarError:
        return G
    except InvalidEmbeddingError as err:  # pragma: no cover - connected graphs always embed when planar
        raise located(err, path) from None
    if name is not None:
        P.meta["name"] = name
    return P


def _connected(n: int, ends: np.ndarray) -> bool:
    if n <= 1:
        return True
    from scipy.sparse import coo_matrix
    from scipy.sparse.csgraph import connected_components

    A = coo_matrix((np.ones(len(ends)), (ends[:, 0] - 1, ends[:, 1] - 1)), shape=(n, n))
    return int(connected_components(A, directed=False)[0]) == 1


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
        raise InputTypeError(f"cannot write a {type(obj).__name__} as .gr; expected a PlaneGraph or a networkx graph")
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
