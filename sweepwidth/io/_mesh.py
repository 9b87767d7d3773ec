"""OFF and OBJ face lists: meshes of disks and spheres as plane graphs.

Reading
-------
Faces become :meth:`PlaneGraph.from_faces` faces (a consistently oriented
mesh; counterclockwise faces seen from outside).  The boundary of a disk
closes up into the outer face.  For a closed mesh (a sphere) the outer face
is the listed face named by ``outer=`` or by our comment ``# @outer k``,
else the first face.  Vertex labels are the file's vertex numbers: 0-based
in OFF, 1-based in OBJ.  Vertices that no face uses are an error (the plane
graph would be disconnected).

Positions
---------
* 2D files (every z equal to 0, or OBJ ``v x y`` lines): ``(x, y)`` as given.
* 3D disks: orthogonal projection onto the plane of the two main axes of
  the vertex cloud (principal component analysis), oriented so that the
  first listed face stays counterclockwise.
* 3D spheres: stereographic projection.  The points are centred on their
  mean and put on the unit sphere along their directions; the pole is the
  direction of the outer face's centroid, and each point ``p`` goes to the
  plane through the opposite pole, ``p ↦ (p · a, p · b) / (1 - p · c)`` for
  the pole ``c`` and an orthonormal ``a, b ⟂ c`` chosen to keep the first
  inner face counterclockwise.  For a convex polyhedron this draws the outer
  face around everything else.

The positions are for drawing only; the embedding comes from the faces.

Writing
-------
Every face except the outer one, when the outer face's boundary is a simple
cycle (it is rebuilt from the mesh boundary on reading); otherwise every
face, with ``# @outer k`` naming the outer one.  Coordinates are the
positions with z = 0 (zeros and ``# @no-positions`` when the graph has
none).  Weights are not kept, and loops or parallel edges cannot be written.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from ..errors import InputTypeError, InvalidArgumentError, InvalidEmbeddingError, SweepwidthError
from ..plane import PlaneGraph
from ._common import MAX_EDGES, MAX_VERTICES, fail, located

__all__ = ["read_mesh", "write_mesh"]


class _Lines:
    """Tokens of the non-comment lines, with their line numbers; collects our '# @' directives."""

    def __init__(self, text: str, comment: str = "#") -> None:
        self.rows: list[tuple[int, list[str]]] = []
        self.directives: dict[str, str] = {}
        for lineno, raw in enumerate(text.splitlines(), start=1):
            line = raw.strip()
            if line.startswith(comment):
                body = line[1:].strip()
                if body.startswith("@"):
                    key, _, val = body[1:].partition(" ")
                    self.directives[key] = val.strip()
                continue
            line = line.split(comment, 1)[0].strip()
            if line:
                self.rows.append((lineno, line.split()))


def read_mesh(data: bytes, fmt: str, *, path: Any = None, outer: int | None = None) -> PlaneGraph:
    """Parse an OFF (``fmt='off'``) or OBJ (``fmt='obj'``) file into a plane graph.

    Parameters
    ----------
    data : bytes
        The file content.
    fmt : {'off', 'obj'}
    path : str, optional
        For messages.
    outer : int, optional
        Index (0-based, in file order) of the listed face that is the outer
        face, for closed meshes; overrides ``# @outer``.

    Returns
    -------
    PlaneGraph
        With ``pos`` (see the module notes) unless the file says
        ``# @no-positions``; ``meta['name']`` from ``# @name``.

    Raises
    ------
    FileFormatError
        Bad header or counts, a bad number, a vertex index out of range (each
        with its line).
    InvalidEmbeddingError
        A mesh that is not an oriented disk or sphere.

    Notes
    -----
    O(size of the file) plus ``from_faces``.

    Examples
    --------
    >>> P = read_mesh(b"OFF\\n4 2 0\\n0 0 0\\n1 0 0\\n1 1 0\\n0 1 0\\n3 0 1 2\\n3 0 2 3\\n", "off")
    >>> P.number_of_faces(), P.pos[2]
    (3, (1.0, 1.0))
    """
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as err:
        fail(f"not UTF-8 text ({err.reason})", path=path, offset=err.start)
    L = _Lines(text)
    if fmt == "off":
        xyz, faces, lines, base = _parse_off(L, path)
    elif fmt == "obj":
        xyz, faces, lines, base = _parse_obj(L, path)
    else:  # pragma: no cover - dispatch guarantees the name
        raise InvalidArgumentError(f"unknown mesh format {fmt!r}")
    nv = len(xyz)
    if not faces:
        fail("the mesh has no faces", path=path)
    used = np.zeros(nv, dtype=bool)
    for fc in faces:
        used[np.asarray(fc, dtype=np.int64) - base] = True
    if not used.all():
        k = int(np.argmin(used))
        fail(f"vertex {k + base} belongs to no face (the plane graph would not be connected)", path=path)
    if outer is None and "outer" in L.directives:
        try:
            outer = int(L.directives["outer"])
        except ValueError:
            fail(f"'# @outer' expects a face index, got {L.directives['outer']!r}", path=path)
    if outer is not None and not 0 <= outer < len(faces):
        fail(f"outer face {outer} is not one of the {len(faces)} faces (0..{len(faces) - 1})", path=path)
    for fc, ln in zip(faces, lines):
        if len(fc) < 2:
            fail(f"a face needs at least 2 vertices, got {len(fc)}", path=path, line=ln)
    try:
        P = PlaneGraph.from_faces(faces, outer=outer)
    except InvalidEmbeddingError as err:
        raise located(err, path) from None
    if "no-positions" not in L.directives:
        P.pos = _positions(np.asarray(xyz, dtype=float), faces, base, P, outer)
    if "name" in L.directives:
        P.meta["name"] = L.directives["name"]
    return P


def _num(tok: str, what: str, path: Any, line: int) -> float:
    try:
        x = float(tok)
    except ValueError:
        fail(f"expected {what} (a number), got {tok[:30]!r}", path=path, line=line)
    if not math.isfinite(x):
        fail(f"{what} is {tok!r}; expected a finite number", path=path, line=line)
    return x


def _idx(tok: str, path: Any, line: int) -> int:
    try:
        return int(tok)
    except ValueError:
        fail(f"expected a vertex index (an integer), got {tok[:30]!r}", path=path, line=line)


def _parse_off(L: _Lines, path: Any) -> tuple[list, list, list, int]:
    rows = L.rows
    if not rows:
        fail("empty file; expected the header 'OFF'", path=path, line=1)
    ln, tok = rows[0]
    head = tok[0]
    if head not in ("OFF", "COFF", "NOFF", "CNOFF", "STOFF"):
        fail(f"expected the header 'OFF', got {head[:30]!r}", path=path, line=ln)
    rest = tok[1:]
    k = 1
    if not rest:
        if len(rows) < 2:
            fail("expected the counts 'vertices faces edges' after the header", path=path, line=ln)
        ln, rest = rows[1]
        k = 2
    if len(rest) < 2:
        fail("expected the counts 'vertices faces edges'", path=path, line=ln)
    nv, nf = _idx(rest[0], path, ln), _idx(rest[1], path, ln)
    if nv < 0 or nf < 0 or nv > MAX_VERTICES or nf > MAX_EDGES:
        fail(f"counts {nv} vertices, {nf} faces are outside 0..{MAX_VERTICES} / 0..{MAX_EDGES}", path=path, line=ln)
    if k + nv + nf > len(rows):
        fail(
            f"declares {nv} vertices and {nf} faces but only {len(rows) - k} lines follow",
            path=path,
            line=ln,
        )
    xyz = []
    for i in range(nv):
        ln, t = rows[k + i]
        if len(t) < 3:
            fail(f"vertex {i}: expected 'x y z', got {len(t)} numbers", path=path, line=ln)
        xyz.append([_num(c, f"coordinate of vertex {i}", path, ln) for c in t[:3]])
    faces, lines = [], []
    for j in range(nf):
        ln, t = rows[k + nv + j]
        c = _idx(t[0], path, ln)
        if c < 0 or len(t) < c + 1:
            fail(f"face {j}: declares {c} vertices but lists {len(t) - 1}", path=path, line=ln)
        fc = [_idx(x, path, ln) for x in t[1 : c + 1]]
        for x in fc:
            if not 0 <= x < nv:
                fail(f"face {j}: vertex index {x} is outside 0..{nv - 1}", path=path, line=ln)
        faces.append(fc)
        lines.append(ln)
    if len(rows) > k + nv + nf:
        fail("unexpected lines after the last face", path=path, line=rows[k + nv + nf][0])
    return xyz, faces, lines, 0


def _parse_obj(L: _Lines, path: Any) -> tuple[list, list, list, int]:
    xyz: list[list[float]] = []
    raw_faces: list[tuple[int, list[str], int]] = []
    for ln, t in L.rows:
        kw = t[0]
        if kw == "v":
            if len(t) < 3:
                fail("expected 'v x y [z]'", path=path, line=ln)
            c = [_num(x, "a coordinate", path, ln) for x in t[1:4]]
            xyz.append(c + [0.0] * (3 - len(c)))
            if len(xyz) > MAX_VERTICES:
                fail(f"more than {MAX_VERTICES} vertices", path=path, line=ln)
        elif kw == "f":
            if len(t) < 3:
                fail("expected 'f i j ...' with at least two vertices", path=path, line=ln)
            raw_faces.append((ln, t[1:], len(xyz)))
        elif kw in ("vt", "vn", "vp", "o", "g", "s", "usemtl", "mtllib", "l", "p"):
            if kw in ("l", "p"):
                fail(f"'{kw}' elements (lines, points) are not faces; a plane graph needs faces", path=path, line=ln)
            continue
        else:
            fail(f"unknown OBJ statement {kw[:30]!r}; expected v, f, vt, vn, o, g, s, usemtl or mtllib", path=path, line=ln)
    nv = len(xyz)
    faces, lines = [], []
    for j, (ln, toks, seen) in enumerate(raw_faces):
        fc = []
        for x in toks:
            i = _idx(x.split("/", 1)[0], path, ln)
            if i < 0:
                i = seen + 1 + i  # relative: -1 is the last vertex read before this line
            if not 1 <= i <= nv:
                fail(f"face {j}: vertex index {x!r} is outside 1..{nv}", path=path, line=ln)
            fc.append(i)
        faces.append(fc)
        lines.append(ln)
    return xyz, faces, lines, 1


def _orthonormal(c: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    t = np.array([1.0, 0.0, 0.0]) if abs(c[0]) < 0.9 else np.array([0.0, 1.0, 0.0])
    a = t - (t @ c) * c
    a /= np.linalg.norm(a)
    return a, np.cross(c, a)


def _positions(xyz: np.ndarray, faces: list, base: int, P: PlaneGraph, outer: int | None) -> dict:
    if xyz.shape[0] == 0:
        return {}
    if np.all(xyz[:, 2] == 0):
        return {i + base: (float(xyz[i, 0]), float(xyz[i, 1])) for i in range(xyz.shape[0])}
    closed = len(P.face_darts(P.outer_face)) and P.number_of_faces() == len(faces)
    X = xyz - xyz.mean(axis=0)
    if not closed:
        # disk: the two main axes of the point cloud
        _, _, vt = np.linalg.svd(X, full_matrices=False)
        a, b = vt[0], vt[1]
        uv = np.stack([X @ a, X @ b], axis=1)
    else:
        norms = np.linalg.norm(X, axis=1)
        norms[norms == 0] = 1.0
        S = X / norms[:, None]
        of = faces[outer if outer is not None else 0]
        c = S[np.asarray(of) - base].mean(axis=0)
        if np.linalg.norm(c) < 1e-12:
            c = S[of[0] - base]
        c = c / np.linalg.norm(c)
        a, b = _orthonormal(c)
        den = 1.0 - S @ c
        den[np.abs(den) < 1e-9] = 1e-9
        uv = np.stack([(S @ a) / den, (S @ b) / den], axis=1)
    # keep the first inner face counterclockwise
    inner = [k for k in range(len(faces)) if not (closed and k == (outer or 0))]
    if inner:
        fc = np.asarray(faces[inner[0]]) - base
        p = uv[fc]
        area = float(np.sum(p[:, 0] * np.roll(p[:, 1], -1) - np.roll(p[:, 0], -1) * p[:, 1]))
        if area < 0:
            uv[:, 1] = -uv[:, 1]
    return {i + base: (float(uv[i, 0]), float(uv[i, 1])) for i in range(uv.shape[0])}


def write_mesh(P: PlaneGraph, fmt: str, **_: Any) -> bytes:
    """OFF or OBJ text for a plane graph (see the module notes).

    Examples
    --------
    >>> P = PlaneGraph.from_faces([[0, 1, 2], [0, 2, 3]])
    >>> print(write_mesh(P, "off").decode().splitlines()[:3])
    ['OFF', '# written by sweepwidth', '# @no-positions']
    """
    if not isinstance(P, PlaneGraph):
        raise InputTypeError(f"cannot write a {type(P).__name__} as a mesh; expected a PlaneGraph")
    seen: set[tuple[int, int]] = set()
    for e in P.edges:
        iu, iv = P.index(e.u), P.index(e.v)
        if iu == iv:
            raise InvalidArgumentError(f"edge {e.id} is a loop at {e.u!r}; OFF and OBJ cannot hold loops")
        key = (min(iu, iv), max(iu, iv))
        if key in seen:
            raise InvalidArgumentError(f"edge {e.id} is parallel to another edge; OFF and OBJ cannot hold parallel edges")
        seen.add(key)
    n = P.number_of_vertices()
    if P.number_of_edges() == 0:
        raise InvalidArgumentError("a plane graph without edges has no face boundary to write as a mesh")
    walks = {f: [P.tail_index(d) for d in P.face_darts(f)] for f in P.faces}
    ow = walks[P.outer_face]
    simple_outer = len(ow) >= 3 and len(set(ow)) == len(ow)
    if simple_outer:
        order = [f for f in P.faces if f != P.outer_face]
        outer_k = None
    else:
        order = list(P.faces)
        outer_k = order.index(P.outer_face)
    if not order:  # pragma: no cover - a simple outer cycle always leaves an inner face
        raise InvalidArgumentError("no face to write")
    head = ["# written by sweepwidth"]
    if P.pos is None:
        head.append("# @no-positions")
        xy: list[tuple[float, ...]] = [(0.0, 0.0)] * n
    else:
        xy = [tuple(P.pos.get(P.label(i), (0.0, 0.0))) for i in range(n)]
    if outer_k is not None:
        head.append(f"# @outer {outer_k}")
    if P.meta.get("name"):
        head.append(f"# @name {' '.join(str(P.meta['name']).split())}")
    if fmt == "off":
        out = ["OFF"] + head + [f"{n} {len(order)} {P.number_of_edges()}"]
        out += [f"{_c(x)} {_c(y)} 0" for x, y in xy]
        out += [" ".join([str(len(walks[f]))] + [str(i) for i in walks[f]]) for f in order]
    elif fmt == "obj":
        out = head + [f"v {_c(x)} {_c(y)} 0" for x, y in xy]
        out += ["f " + " ".join(str(i + 1) for i in walks[f]) for f in order]
    else:
        raise InvalidArgumentError(f"unknown mesh format {fmt!r}")
    return ("\n".join(out) + "\n").encode("utf-8")


def _c(x: float) -> str:
    return repr(float(x))
