"""Plane graphs: darts, rotation systems, faces, validation, the embedded dual."""

from ._graph import Edge, PlaneGraph

__all__ = ["PlaneGraph", "Edge"]
