"""Content hashes of instances and configurations.

A results database keys every finished task by two hashes: the *instance
hash* (what was solved) and the *configuration hash* (how it was solved).
Both are SHA-256 digests of a canonical JSON text: keys sorted, no
whitespace, UTF-8, floats that are whole numbers written as integers, so the
same content always gives the same key whatever the file's layout.
"""

from __future__ import annotations

import json
import os
from typing import Any, Mapping

from ..errors import FileFormatError
from ..io.saved import canonical_json, digest  # the canonical JSON lives with the saved-result format

__all__ = ["canonical_json", "digest", "instance_hash", "object_hash", "config_hash", "object_document"]


def object_document(obj: Any) -> dict:
    """A canonical plain-data description of a loaded instance (plane graph or graph).

    Used to hash instances read from formats other than our JSON document.
    A plane graph is described by its vertex labels, edge ends and weights,
    rotation and outer face; a networkx graph by its nodes and weighted edges.
    """
    if hasattr(obj, "rotation_by_edges") and hasattr(obj, "outer_face"):
        verts = [repr(v) for v in obj.vertices]
        edges = []
        for e in range(obj.number_of_edges()):
            a, b = obj.edge_ends(e)
            edges.append([repr(a), repr(b), float(obj.weight(e))])
        rot = {repr(v): [list(x) for x in lst] for v, lst in obj.rotation_by_edges().items()}
        return {"kind": "plane", "vertices": verts, "edges": edges, "rotation": rot, "outer": int(obj.outer_face)}
    import networkx as nx

    if isinstance(obj, nx.Graph):
        nodes = sorted(repr(v) for v in obj.nodes())
        if obj.is_multigraph():
            it = ((u, v, d) for u, v, _k, d in obj.edges(keys=True, data=True))
        else:
            it = obj.edges(data=True)
        edges = sorted(
            (sorted([repr(u), repr(v)]) + [float(d.get("weight", 1))] for u, v, d in it),
            key=lambda e: (e[0], e[1], e[2]),
        )
        return {"kind": "graph", "nodes": nodes, "edges": edges}
    raise TypeError(f"cannot describe an instance of type {type(obj).__name__}")


def instance_hash(path: str | os.PathLike | None = None, *, obj: Any = None) -> str:
    """Content hash of an instance file (or of a loaded object).

    For a ``.json`` file this is the digest of the file's canonical JSON, so
    re-indenting or reordering keys keeps the hash; other formats are read
    with :func:`sweepwidth.read` and hashed through :func:`object_document`.

    Raises
    ------
    FileFormatError
        If the file cannot be read or is not valid JSON.
    """
    if path is None:
        if obj is None:
            raise TypeError("instance_hash needs a path or an object")
        return object_hash(obj)
    p = os.fspath(path)
    if p.lower().endswith(".json"):
        try:
            with open(p, "r", encoding="utf-8") as fh:
                data = json.load(fh)
        except OSError as err:
            raise FileFormatError(f"cannot read: {err.strerror or err}", path=p) from err
        except json.JSONDecodeError as err:
            raise FileFormatError(f"not valid JSON: {err.msg}", path=p, line=err.lineno) from err
        return digest(data)
    if obj is None:
        from .loading import load_instance

        obj = load_instance(p)
    return object_hash(obj)


def object_hash(obj: Any) -> str:
    """Digest of a loaded instance: its JSON document (:func:`sweepwidth.io.to_document`) when available."""
    from ..io import to_document

    return digest(to_document(obj))


def config_hash(config: Mapping[str, Any]) -> str:
    """Digest of a task configuration (parameter, method, options, seed, limits)."""
    return digest(dict(config))
