"""Plane graphs: darts, rotation systems, faces, validation, the embedded dual."""

from ._geometry import drawing_rotation, find_crossing
from ._graph import Edge, PlaneGraph

__all__ = ["PlaneGraph", "Edge", "drawing_rotation", "find_crossing"]
