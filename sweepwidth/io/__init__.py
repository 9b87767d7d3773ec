"""Reading and writing plane graphs and graphs: our JSON document and common exchange formats.

Formats (``format=`` name: file extensions -> what ``read`` returns):

* ``json``: ``.json`` -> a PlaneGraph (``sweepwidth-plane`` document) or a
  networkx graph (``sweepwidth-graph`` document);
* ``gr``: ``.gr`` -> a PlaneGraph when connected and planar (embedding from
  networkx), else a networkx graph;
* ``planar_code``: ``.plc``, ``.pc``, ``.planar_code`` -> a PlaneGraph (the
  first graph; every graph with :func:`read_all`);
* ``off``, ``obj``: ``.off``, ``.obj`` -> a PlaneGraph (``from_faces``);
* ``graphml``: ``.graphml``, ``.xml`` -> a PlaneGraph (our rotation
  attributes, an x/y drawing, or networkx's embedding when connected and
  planar), else a networkx graph.

``kind='plane'`` forces a PlaneGraph (an error when the file's graph is not
connected and planar); ``kind='graph'`` always returns a networkx graph
(a PlaneGraph read from the file is turned into a MultiGraph keyed by edge
id).  Without ``format=`` the extension decides, and for an unknown
extension the first bytes of the file do.  The full description of each
format, including our extensions, is in ``docs/formats.md``.

Examples
--------
>>> import networkx as nx, sweepwidth as sw
>>> P = sw.PlaneGraph.from_graph(nx.cycle_graph(4))
>>> Q = sw.io.loads(sw.io.dumps(P))
>>> Q.same_embedding(P)
True
"""

from __future__ import annotations

import os
from typing import Any, Callable


from ..errors import FileFormatError, MissingFileError, StorageError, SweepwidthError, UnsupportedOptionError
from ..plane import PlaneGraph
from ._common import path_name
from ._json import dumps, from_document, loads, to_document

__all__ = ["read", "write", "read_all", "dumps", "loads", "to_document", "from_document", "FORMATS", "detect_format", "lost_in", "DOCUMENTARY"]

#: format name -> file extensions (lower case, with the dot)
FORMATS: dict[str, tuple[str, ...]] = {
    "json": (".json",),
    "gr": (".gr",),
    "planar_code": (".plc", ".pc", ".planar_code"),
    "off": (".off",),
    "obj": (".obj",),
    "graphml": (".graphml", ".xml"),
}

_KINDS = ("auto", "plane", "graph")


def _by_extension(path: Any) -> str | None:
    name = str(path_name(path)).lower()
    for fmt, exts in FORMATS.items():
        if any(name.endswith(x) for x in exts):
            return fmt
    return None


def detect_format(data: bytes) -> str | None:
    """Guess the format from the first bytes of a file (None when nothing fits).

    Examples
    --------
    >>> detect_format(b">>planar_code<<")
    'planar_code'
    >>> detect_format(b'{"format": "sweepwidth-plane"}')
    'json'
    >>> detect_format(b"# a mesh\\nOFF\\n3 1 0\\n")
    'off'
    """
    head = data[:4096]
    if head.startswith(b">>planar_code"):
        return "planar_code"
    text = head.lstrip(b"\xef\xbb\xbf").lstrip()
    if text.startswith(b"{"):
        return "json"
    if text.startswith(b"<"):
        return "graphml"
    first = text.split(b"\n", 1)[0].strip()
    if first[:3] in (b"OFF",) or first[:4] in (b"COFF", b"NOFF") or first[:5] == b"STOFF":
        return "off"
    for line in text.splitlines():
        s = line.strip()
        if not s:
            continue
        if s.startswith(b"p ") or s == b"p":
            return "gr"
        if s.split()[0] in (b"OFF", b"COFF", b"NOFF", b"CNOFF", b"STOFF"):
            return "off"
        if s.startswith((b"v ", b"f ", b"vt ", b"vn ", b"o ", b"g ", b"mtllib", b"usemtl")):
            return "obj"
        if s.startswith((b"c ", b"c\t")) or s == b"c":
            continue  # a .gr comment; keep looking for the header
        if s.startswith(b"#"):
            continue
        break
    return None


def _reader(fmt: str) -> Callable[..., list]:
    """A function ``(data: bytes, path, **options) -> list of graphs``."""
    if fmt == "json":
        return lambda data, path, **kw: [loads(data, path=path, **kw)]
    if fmt == "gr":
        from ._gr import read_gr

        return lambda data, path, **kw: [read_gr(data, path=path, **kw)]
    if fmt == "planar_code":
        from ._planar_code import read_planar_code

        return read_planar_code
    if fmt in ("off", "obj"):
        from ._mesh import read_mesh

        return lambda data, path, **kw: [read_mesh(data, fmt, path=path, **kw)]
    if fmt == "graphml":
        from ._graphml import read_graphml

        return lambda data, path, **kw: [read_graphml(data, path=path, **kw)]
    raise UnsupportedOptionError("format", fmt, list(FORMATS))


def _writer(fmt: str) -> Callable[..., bytes]:
    if fmt == "json":
        return lambda obj, **kw: dumps(obj, **kw).encode("utf-8")
    if fmt == "gr":
        from ._gr import write_gr

        return write_gr
    if fmt == "planar_code":
        from ._planar_code import write_planar_code

        return write_planar_code
    if fmt in ("off", "obj"):
        from ._mesh import write_mesh

        return lambda obj, **kw: write_mesh(obj, fmt, **kw)
    if fmt == "graphml":
        from ._graphml import write_graphml

        return write_graphml
    raise UnsupportedOptionError("format", fmt, list(FORMATS))


def _load(path: Any, format: str | None) -> tuple[bytes, str]:
    if format is not None and format not in FORMATS:
        raise UnsupportedOptionError("format", format, list(FORMATS))
    try:
        with open(path, "rb") as fh:
            data = fh.read()
    except FileNotFoundError:
        raise MissingFileError("no such file", path=path_name(path)) from None
    except IsADirectoryError:
        raise FileFormatError("is a directory, not a file", path=path_name(path)) from None
    except OSError as err:
        raise FileFormatError(f"cannot be read: {err.strerror}", path=path_name(path)) from err
    fmt = format or _by_extension(path) or detect_format(data)
    if fmt is None:
        raise FileFormatError(
            "unknown format: the extension is none of "
            + ", ".join(x for exts in FORMATS.values() for x in exts)
            + " and the content matches no format; pass format=",
            path=path_name(path),
        )
    return data, fmt


def _as_kind(obj: Any, kind: str, path: Any) -> Any:
    if kind == "graph":
        return obj.to_networkx() if isinstance(obj, PlaneGraph) else obj
    if kind == "plane" and not isinstance(obj, PlaneGraph):
        from ..errors import InvalidEmbeddingError, NonPlanarError

        try:
            return PlaneGraph.from_graph(obj, meta=dict(obj.graph))
        except (NonPlanarError, InvalidEmbeddingError) as err:
            from ._common import located

            raise located(err, path) from None
    return obj


def read_all(path: str | os.PathLike, *, format: str | None = None, kind: str = "auto", **options: Any) -> list:
    """Every graph in a file (planar_code files may hold many; other formats hold one).

    Parameters and returns as :func:`read`, but a list.
    """
    if kind not in _KINDS:
        raise UnsupportedOptionError("kind", kind, list(_KINDS))
    data, fmt = _load(path, format)
    graphs = _reader(fmt)(data, path, **options)
    return [_as_kind(g, kind, path) for g in graphs]


def read(path: str | os.PathLike, *, format: str | None = None, kind: str = "auto", **options: Any) -> Any:
    """Read a plane graph (or a graph) from a file.

    Parameters
    ----------
    path : str or os.PathLike
        The file.
    format : str, optional
        One of ``FORMATS`` ('json', 'gr', 'planar_code', 'off', 'obj',
        'graphml'); default: by extension, else by content.
    kind : {'auto', 'plane', 'graph'}
        'auto' returns what the file holds (see the module table); 'plane'
        insists on a PlaneGraph; 'graph' returns a networkx graph.
    **options
        Format options: ``mirror=True`` (planar_code: read the neighbour
        lists as clockwise), ``index`` (planar_code: which graph, default 0),
        ``weight_column`` (gr), ``outer`` (off/obj: index of the given face
        that is the outer one, for spheres).

    Returns
    -------
    PlaneGraph or networkx.Graph
        File metadata (name, provenance, curves, holes, known values) is in
        ``P.meta`` (``G.graph`` for networkx graphs).

    Raises
    ------
    FileFormatError
        The file is missing, unreadable or malformed; the message gives the
        file, the line (text) or byte offset (binary) and what was expected.
    InvalidEmbeddingError, NonPlanarError, CrossingEdgesError, WeightError
        The file is well formed but describes no valid plane graph (message
        starts with the file name).
    UnsupportedOptionError
        Unknown ``format`` or ``kind``.

    Examples
    --------
    >>> import networkx as nx, os, tempfile, sweepwidth as sw
    >>> P = sw.PlaneGraph.from_graph(nx.octahedral_graph())
    >>> path = os.path.join(tempfile.mkdtemp(), "octahedron.json")
    >>> sw.write(P, path)
    >>> sw.read(path).same_embedding(P)
    True
    """
    if kind not in _KINDS:
        raise UnsupportedOptionError("kind", kind, list(_KINDS))
    data, fmt = _load(path, format)
    if fmt == "planar_code":
        from ._planar_code import read_planar_code

        index = options.pop("index", 0)
        graphs = read_planar_code(data, path, limit=index + 1, **options)
        if index >= len(graphs):
            raise FileFormatError(f"holds {len(graphs)} graphs; graph {index} was asked for", path=path_name(path))
        return _as_kind(graphs[index], kind, path)
    if fmt == "gr" and kind == "graph":
        options.setdefault("embed", False)  # no planarity test for a graph that will not be embedded
    return _as_kind(_reader(fmt)(data, path, **options)[0], kind, path)


def write(obj: Any, path: str | os.PathLike, *, format: str | None = None, **options: Any) -> None:
    """Write a plane graph (or a networkx graph) to a file, in the format of its extension.

    Parameters
    ----------
    obj : PlaneGraph, networkx.Graph, or a list of PlaneGraph (planar_code)
    path : str or os.PathLike
    format : str, optional
        One of ``FORMATS``; default: by extension.
    **options
        Format options: ``mirror`` and ``endian`` (planar_code),
        ``weight_column`` (gr), ``indent`` (json).

    Raises
    ------
    SweepwidthError
        The object cannot be represented in the format (for example
        parallel edges in planar_code, or a label JSON cannot hold).
    UnsupportedOptionError
        Unknown or undeducible format.
    """
    fmt = format or _by_extension(path)
    if fmt is None:
        raise UnsupportedOptionError("format (from the file extension)", os.path.splitext(str(path))[1], list(FORMATS))
    if fmt not in FORMATS:
        raise UnsupportedOptionError("format", fmt, list(FORMATS))
    data = _writer(fmt)(obj, **options)
    try:
        with open(path, "wb") as fh:
            fh.write(data)
    except OSError as err:
        raise StorageError(f"{path_name(path)}: cannot be written: {err.strerror}") from err



def _edge_key(obj: Any, u: Any, v: Any) -> tuple:
    a, b = str(u), str(v)
    return (a, b) if a <= b else (b, a)


def _vertex_names(vs: Any) -> list[str]:
    """Vertex names as text; integers 0..n-1 and 1..n (a format's own numbering) count as the same names."""
    vs = list(vs)
    n = len(vs)
    if all(isinstance(v, int) and not isinstance(v, bool) for v in vs):
        if sorted(vs) in (list(range(n)), list(range(1, n + 1))):
            return [f"#{i}" for i in range(n)]
    return sorted(str(v) for v in vs)


#: formats that store an embedding (the others get a new one from a planarity test when read)
_EMBEDDED = ("json", "planar_code", "off", "obj", "graphml")


def _plane_features(P: Any) -> dict[str, Any]:
    """What a plane graph holds, in comparable form (names as text, edges by their ends)."""
    edges = [(_edge_key(P, e.u, e.v), float(e.weight)) for e in P.edges]
    outer = sorted(_edge_key(P, *P.edge_ends(e)) for e in P.face_edges(P.outer_face)) if hasattr(P, "face_edges") else None
    meta = dict(P.meta or {})
    return {
        "vertices": _vertex_names(P.vertices),
        "labels": sorted(str(v) for v in P.vertices),
        "weights": sorted(edges),
        "positions": bool(P.pos),
        "outer": outer,
        "faces": P.number_of_faces(),
        "data": any(P.edge_data(e.id) for e in P.edges),
        "meta": meta,
    }


#: what describes a graph without changing it (``convert`` warns about these but does not refuse)
DOCUMENTARY = ("graph name", "provenance", "known values")

#: metadata keys of a plane graph and how a refusal names them
_META_WORDS = {
    "name": "graph name",
    "provenance": "provenance",
    "known": "known values",
    "rooms": "face names",
    "face_names": "face names",
    "holes": "holes",
    "curves": "start/end curves",
}


def lost_in(obj: Any, format: str) -> list[str]:
    """What writing ``obj`` in ``format`` would lose, found by writing it and reading it back.

    Compared: the embedding (rotation system and faces), edge weights,
    vertex names, vertex positions, the outer face (the hole swept around),
    edge data and the metadata (name, face names, holes, curves, known
    values).  An empty list: nothing is lost.

    Raises
    ------
    SweepwidthError
        When the object cannot be written in the format at all.

    Examples
    --------
    >>> import sweepwidth as sw
    >>> from sweepwidth import generators
    >>> P = generators.triangulated_grid(1).with_weights([2, 1, 1, 1, 1])
    >>> lost_in(P, "json"), "edge weights" in lost_in(P, "off")
    ([], True)
    """
    from ..plane import PlaneGraph

    if format not in FORMATS:
        raise UnsupportedOptionError("format", format, list(FORMATS))
    data = _writer(format)(obj)
    back = _reader(format)(data, None)[0]
    lost: list[str] = []
    if not isinstance(obj, PlaneGraph):
        import networkx as nx

        if isinstance(back, PlaneGraph):
            back = back.to_networkx()
        if _vertex_names(obj.nodes()) != _vertex_names(back.nodes()):
            lost.append("vertex names")
        w0 = sorted(float(d.get("weight", 1)) for *_, d in obj.edges(data=True))
        w1 = sorted(float(d.get("weight", 1)) for *_, d in back.edges(data=True))
        if w0 != w1:
            lost.append("edge weights")
        if any(set(d) - {"weight"} for *_, d in obj.edges(data=True)):
            if not any(set(d) - {"weight"} for *_, d in back.edges(data=True)):
                lost.append("edge data")
        del nx
        return lost
    if not isinstance(back, PlaneGraph) or format not in _EMBEDDED:
        if isinstance(back, PlaneGraph):
            back = back.to_networkx()
        lost = ["the embedding (rotation system, faces and outer face)"]
        if _vertex_names(obj.vertices) != _vertex_names(back.nodes()):
            lost.append("vertex names")
        if sorted(float(e.weight) for e in obj.edges) != sorted(float(d.get("weight", 1)) for *_, d in back.edges(data=True)):
            lost.append("edge weights")
        if any(obj.edge_data(e.id) for e in obj.edges) and not any(set(d) - {"weight", "id"} for *_, d in back.edges(data=True)):
            lost.append("edge data")
        return lost + _lost_plane(_plane_features(obj), None)
    return _lost_plane(_plane_features(obj), _plane_features(back))


def _lost_plane(a: dict, b: dict | None) -> list[str]:
    lost: list[str] = []
    if b is None:
        if a["positions"]:
            lost.append("vertex positions")
        for key, word in _META_WORDS.items():
            if a["meta"].get(key):
                lost.append(word)
        return lost
    if a["vertices"] != b["vertices"]:
        lost.append("vertex names")
    names_kept = a["labels"] == b["labels"]  # the same labels: edges and faces can be compared by their ends
    if sorted(w for _, w in a["weights"]) != sorted(w for _, w in b["weights"]):
        lost.append("edge weights")
    elif names_kept and a["weights"] != b["weights"] and len({w for _, w in a["weights"]}) > 1:
        lost.append("which edge has which weight")
    if a["faces"] != b["faces"]:
        lost.append("the embedding (rotation system and faces)")
    elif (names_kept and a["outer"] != b["outer"]) or len(a["outer"] or ()) != len(b["outer"] or ()):
        lost.append("the choice of outer face")
    if a["positions"] and not b["positions"]:
        lost.append("vertex positions")
    if a["data"] and not b["data"]:
        lost.append("edge data")
    for key, word in _META_WORDS.items():
        if a["meta"].get(key) and a["meta"].get(key) != b["meta"].get(key) and word not in lost:
            lost.append(word)
    return lost
