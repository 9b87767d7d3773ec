"""planar_code: a binary format for many plane (simple) graphs in one file.

Layout
------
* The file starts with the header ``>>planar_code<<``, or ``>>planar_code le<<``
  / ``>>planar_code be<<`` which declare the byte order of two-byte entries
  (little or big endian).  Without a declaration two-byte entries are read
  little-endian (``endian=`` overrides).
* Graphs follow one after another.  A graph starts with its vertex count
  ``n`` as one byte (1..255), then for each vertex ``1..n`` the numbers of its
  neighbours in rotational order, ended by ``0``.
* A graph with 256 or more vertices (or any graph, at the writer's choice)
  starts with a ``0`` byte instead; its count and every entry are then two
  bytes.

Orientation
-----------
The bytes cannot say whether the lists run clockwise or counterclockwise.
We read and write them as **clockwise** (so the rotation of a vertex is the
reversed list); ``mirror=True`` reads and writes them as counterclockwise,
which gives the mirror image.  Either way the abstract graph and the faces
(as vertex sets) are the same; only the orientation changes.

Vertices are labelled with the file's numbers ``1..n``.  The format records
no outer face and no weights: the outer face is the longest face (the first
such) and weights are 1.
"""

from __future__ import annotations

from typing import Any, Literal, Sequence, cast

from ..errors import InputTypeError, InvalidArgumentError, InvalidEmbeddingError, SweepwidthError
from ..plane import PlaneGraph
from ._common import fail, located

__all__ = ["read_planar_code", "write_planar_code", "HEADER"]

HEADER = b">>planar_code<<"
_HEADERS = {b">>planar_code<<": None, b">>planar_code le<<": "little", b">>planar_code be<<": "big"}


def read_planar_code(
    data: bytes,
    path: Any = None,
    *,
    mirror: bool = False,
    endian: str | None = None,
    limit: int | None = None,
) -> list[PlaneGraph]:
    """Every graph of a planar_code file (at most ``limit`` of them).

    Parameters
    ----------
    data : bytes
        The file content, header included.
    path : str, optional
        For messages.
    mirror : bool
        Read neighbour lists as counterclockwise instead of clockwise.
    endian : {'little', 'big'}, optional
        Byte order of two-byte entries when the header does not declare it.
    limit : int, optional
        Stop after this many graphs.

    Returns
    -------
    list of PlaneGraph

    Raises
    ------
    FileFormatError
        Bad header, a file ending inside a graph, a neighbour number out of
        range, a vertex listed as its own neighbour, twice, or only on one
        side of an edge (each with its byte offset).
    InvalidEmbeddingError
        Lists that do not form a genus-0 rotation, or a disconnected graph.

    Notes
    -----
    O(total size of the file).

    Examples
    --------
    >>> data = HEADER + bytes([3, 2, 3, 0, 3, 1, 0, 1, 2, 0])   # a triangle
    >>> [P.number_of_faces() for P in read_planar_code(data)]
    [2]
    """
    if endian not in (None, "little", "big"):
        from ..errors import UnsupportedOptionError

        raise UnsupportedOptionError("endian", endian, ["little", "big"])
    order = None
    pos = 0
    for h, o in _HEADERS.items():
        if data.startswith(h):
            order, pos = o, len(h)
            break
    else:
        fail(f"expected the header {HEADER.decode()!r} (optionally with ' le' or ' be')", path=path, offset=0)
    order = cast(Literal["little", "big"], order or endian or "little")
    graphs: list[PlaneGraph] = []
    size = len(data)
    while pos < size and (limit is None or len(graphs) < limit):
        start = pos
        wide = data[pos] == 0
        if wide:
            if pos + 3 > size:
                fail(f"file ends inside the two-byte vertex count of graph {len(graphs)}", path=path, offset=pos)
            n = int.from_bytes(data[pos + 1 : pos + 3], order)
            pos += 3
            step = 2
        else:
            n = data[pos]
            pos += 1
            step = 1
        if n == 0:
            fail(f"graph {len(graphs)} declares 0 vertices", path=path, offset=start)
        # every vertex needs at least its terminating 0 entry
        if pos + n * step > size:
            fail(
                f"graph {len(graphs)} declares {n} vertices but only {(size - pos) // step} entries remain",
                path=path,
                offset=start,
            )
        lists: list[list[int]] = []
        offsets: list[int] = []
        for v in range(1, n + 1):
            nb: list[int] = []
            offsets.append(pos)
            while True:
                if pos + step > size:
                    fail(
                        f"file ends inside the neighbour list of vertex {v} of graph {len(graphs)} "
                        f"(expected entries ended by 0)",
                        path=path,
                        offset=pos,
                    )
                x = data[pos] if step == 1 else int.from_bytes(data[pos : pos + 2], order)
                if x == 0:
                    pos += step
                    break
                if x > n:
                    fail(f"neighbour {x} of vertex {v} is outside 1..{n} (graph {len(graphs)})", path=path, offset=pos)
                if x == v:
                    fail(f"vertex {v} lists itself: loops cannot be written in planar_code", path=path, offset=pos)
                if x in nb:
                    fail(f"vertex {v} lists {x} twice: parallel edges cannot be written in planar_code", path=path, offset=pos)
                nb.append(x)
                pos += step
                if len(nb) >= n:
                    fail(f"vertex {v} lists more than {n - 1} neighbours", path=path, offset=pos)
            lists.append(nb)
        sets = [set(nb) for nb in lists]
        for v in range(1, n + 1):
            for x in lists[v - 1]:
                if v not in sets[x - 1]:
                    fail(
                        f"vertex {v} lists {x} but vertex {x} does not list {v} (graph {len(graphs)})",
                        path=path,
                        offset=offsets[v - 1],
                    )
        rotation = {v: (lists[v - 1] if mirror else lists[v - 1][::-1]) for v in range(1, n + 1)}
        try:
            graphs.append(PlaneGraph.from_rotation(rotation))
        except InvalidEmbeddingError as err:
            raise located(err, path, f"graph {len(graphs)} at byte {start}") from None
    if not graphs and (limit is None or limit > 0):
        fail("no graph after the header", path=path, offset=pos)
    return graphs


def write_planar_code(
    obj: PlaneGraph | Sequence[PlaneGraph],
    *,
    mirror: bool = False,
    endian: str | None = None,
    wide: bool | None = None,
    **_: Any,
) -> bytes:
    """The planar_code bytes of one plane graph or a list of them.

    Vertices are numbered ``1..n`` in vertex order; each list starts at the
    first dart of the vertex's rotation and runs clockwise (counterclockwise
    with ``mirror=True``).  Graphs with 256 or more vertices, or every graph
    with ``wide=True``, use two-byte entries; the header then declares the
    byte order (``endian``, default little).

    Raises
    ------
    SweepwidthError
        Loops or parallel edges (the format cannot hold them), or more than
        65535 vertices.

    Examples
    --------
    >>> import networkx as nx
    >>> P = PlaneGraph.from_graph(nx.cycle_graph(3))
    >>> read_planar_code(write_planar_code(P))[0].number_of_edges()
    3
    """
    import networkx as nx

    if isinstance(obj, nx.Graph):
        raise InvalidArgumentError("planar_code holds plane graphs; build one first with PlaneGraph.from_graph(G)")
    graphs = [obj] if isinstance(obj, PlaneGraph) else list(obj)
    if not graphs:
        raise InvalidArgumentError("planar_code needs at least one graph to write")
    if endian not in (None, "little", "big"):
        from ..errors import UnsupportedOptionError

        raise UnsupportedOptionError("endian", endian, ["little", "big"])
    order = cast(Literal["little", "big"], endian or "little")
    bodies = []
    any_wide = False
    for k, P in enumerate(graphs):
        if not isinstance(P, PlaneGraph):
            raise InputTypeError(f"item {k} is a {type(P).__name__}; planar_code holds PlaneGraphs")
        n = P.number_of_vertices()
        if n > 65535:
            raise InvalidArgumentError(f"graph {k} has {n} vertices; planar_code holds at most 65535")
        use_wide = bool(wide) or n >= 256
        any_wide |= use_wide
        out = bytearray()
        out += (b"\x00" + n.to_bytes(2, order)) if use_wide else bytes([n])
        for i in range(n):
            v = P.label(i)
            nbrs = [P.head_index(d) + 1 for d in P.darts_at(v)]
            if i + 1 in nbrs:
                raise InvalidArgumentError(f"graph {k} has a loop at {v!r}; planar_code cannot hold loops")
            if len(set(nbrs)) != len(nbrs):
                raise InvalidArgumentError(
                    f"graph {k} has parallel edges at {v!r}; planar_code cannot hold parallel edges"
                )
            seq = nbrs if mirror else ([nbrs[0]] + nbrs[1:][::-1] if nbrs else [])
            for x in seq + [0]:
                out += x.to_bytes(2, order) if use_wide else bytes([x])
        bodies.append(bytes(out))
    header = (b">>planar_code le<<" if order == "little" else b">>planar_code be<<") if any_wide else HEADER
    return header + b"".join(bodies)
