"""Pictures of one embedding: faces, edges, weights, vertices, the outer face and the dual."""

from __future__ import annotations

from typing import Any, Hashable, Iterable, Mapping, Sequence

import numpy as np

from ..errors import InputTypeError, InvalidArgumentError, NotInGraphError, SweepwidthError
from ..plane import PlaneGraph
from ._layout import Geometry, _bezier2, _bezier3, _unit
from ._style import LINES, PALETTE, new_figure, require_matplotlib

__all__ = ["draw", "Scene"]


def _fmt_weight(w: float) -> str:
    return str(int(w)) if float(w).is_integer() else f"{w:.3g}"


def face_names(P: Any) -> dict[int, str]:
    """Names of faces stored with the instance: ``meta['face_names']`` (id -> name) or ``meta['rooms']`` (name -> id).

    Examples
    --------
    >>> import networkx as nx, sweepwidth as sw
    >>> P = sw.PlaneGraph.from_graph(nx.cycle_graph(3))
    >>> P.meta["rooms"] = {"Hall": 0}
    >>> face_names(P)
    {0: 'Hall'}
    """
    meta = getattr(P, "meta", None) or {}
    out: dict[int, str] = {}
    given = meta.get("face_names")
    if isinstance(given, dict):
        for k, v in given.items():
            try:
                out[int(k)] = str(v)
            except (TypeError, ValueError):
                continue
    rooms = meta.get("rooms")
    if isinstance(rooms, dict):
        for name, f in rooms.items():
            if isinstance(f, int) and not isinstance(f, bool):
                out.setdefault(f, str(name))
    return out


class Scene:
    """Layered drawing of a plane graph on one Axes; sweep pictures add layers on top.

    Parameters
    ----------
    P : PlaneGraph
    ax : matplotlib Axes
    geometry : Geometry, optional
        Reuse the curves of an earlier scene (frames of one sweep share it).

    Examples
    --------
    >>> from sweepwidth import generators
    >>> from sweepwidth.draw._style import new_figure
    >>> P = generators.grid(2, 3)
    >>> sc = Scene(P, new_figure((3, 2)).add_subplot(1, 1, 1))
    >>> inner = [f for f in P.faces if f != P.outer_face]
    >>> sc.frame(); sc.faces(shade=inner[:1]); sc.edges(); sc.heavy_edges([0, 1]); sc.vertices()
    >>> len(sc.ax.collections)      # plain faces, swept faces, edges, heavy edges, vertices
    5
    """

    # z-orders of the layers, bottom to top
    Z_FACE, Z_SHADE, Z_EDGE, Z_DUAL, Z_CURVE, Z_MOVE, Z_VERTEX, Z_TEXT = 0, 1, 2, 3, 4, 5, 6, 7

    def __init__(self, P: PlaneGraph, ax: Any, geometry: Geometry | None = None) -> None:
        self.P = P
        self.ax = ax
        self.g = geometry if geometry is not None else Geometry(P)
        n = P.number_of_vertices()
        self.vertex_size = float(np.clip(260.0 / np.sqrt(max(n, 1)), 9.0, 90.0))

    # ------------------------------------------------------------ layers
    def frame(self, margin: float = 0.12, ring: bool = False) -> None:
        """Limits, aspect and the tinted background that marks the outer face.

        ``ring=True`` makes room for the dual edges that run around the drawing.
        """
        ax = self.ax
        lo, hi = self.g.bounds()
        pts = [lo, hi]
        if ring and self.P.number_of_edges():
            c, R = self.g.ring()
            pts += [c - R, c + R, self.g.face_point(self.P.outer_face)]
        allp = np.vstack(pts)
        lo, hi = allp.min(axis=0), allp.max(axis=0)
        span = float(max(hi[0] - lo[0], hi[1] - lo[1], self.g.scale))
        pad = margin * span + 0.15 * self.g.scale
        x0, x1, y0, y1 = lo[0] - pad, hi[0] + pad, lo[1] - pad, hi[1] + pad
        # widen the limits to the axes' own shape, so that equal scaling fills the whole box
        box = ax.get_position()
        fw, fh = ax.figure.get_size_inches()
        if box.width > 0 and box.height > 0:
            want = (box.height * fh) / (box.width * fw)
            dx, dy = x1 - x0, y1 - y0
            if dy / dx < want:
                grow = 0.5 * (dx * want - dy)
                y0, y1 = y0 - grow, y1 + grow
            else:
                grow = 0.5 * (dy / want - dx)
                x0, x1 = x0 - grow, x1 + grow
        ax.set_xlim(x0, x1)
        ax.set_ylim(y0, y1)
        ax.set_aspect("equal", adjustable="box")
        ax.set_facecolor(PALETTE["outer"])
        ax.set_xticks([])
        ax.set_yticks([])
        for s in ax.spines.values():
            s.set_visible(False)

    def faces(self, shade: Iterable[int] = (), holes: Iterable[int] = (), fresh: Iterable[int] = ()) -> None:
        """Fill inner faces white, swept faces pale, holes grey and hatched, fresh faces dotted."""
        from matplotlib.collections import PolyCollection

        P = self.P
        shade, holes, fresh = set(shade), set(holes), set(fresh)
        groups: dict[str, list[np.ndarray]] = {"plain": [], "swept": [], "hole": [], "fresh": []}
        for f in P.faces:
            if f == P.outer_face:
                if f in shade:
                    self.ax.set_facecolor(PALETTE["swept"])  # a swept outer face tints the background
                continue
            poly = self.g.face_polygon(f)
            if len(poly) < 3:
                continue
            groups["hole" if f in holes else "swept" if f in shade else "plain"].append(poly)
            if f in fresh:
                groups["fresh"].append(poly)
        styles: dict[str, dict[str, Any]] = {
            "plain": dict(facecolors="white", edgecolors="none", zorder=self.Z_FACE),
            "swept": dict(facecolors=PALETTE["swept"], edgecolors="none", zorder=self.Z_SHADE),
            "hole": dict(facecolors=PALETTE["hole"], edgecolors=PALETTE["ink"], hatch="///", linewidths=0,
                         zorder=self.Z_SHADE),
            "fresh": dict(facecolors="none", edgecolors=PALETTE["move"], hatch=".", linewidths=0,
                          zorder=self.Z_SHADE),
        }
        for key, polys in groups.items():
            if polys:
                self.ax.add_collection(PolyCollection(polys, closed=True, **styles[key]))

    def edges(self, weights: bool | str = True, colour: str | None = None, width: float | None = None) -> None:
        """All edges (curves for parallels and loops) and, optionally, their weights."""
        from matplotlib.collections import LineCollection

        P = self.P
        m = P.number_of_edges()
        if m == 0:
            return
        style, lw = LINES["edge"]
        segs = [self.g.edge_points(e) for e in range(m)]
        self.ax.add_collection(LineCollection(segs, colors=colour or PALETTE["ink"], linewidths=width or lw,
                                              linestyles=style, zorder=self.Z_EDGE, capstyle="round"))
        w = P.weights
        show = weights == "all" or (weights and not np.all(w == 1.0))
        if show:
            fs = float(np.clip(11.0 - 0.04 * m, 5.0, 9.0))
            for e in range(m):
                p = self.g.midpoint(e)
                self.ax.text(p[0], p[1], _fmt_weight(w[e]), fontsize=fs, ha="center", va="center",
                             color=PALETTE["label"], zorder=self.Z_TEXT,
                             bbox=dict(boxstyle="round,pad=0.12", fc=PALETTE["weight_box"], ec="none", alpha=0.85))

    def heavy_edges(self, edges: Iterable[int], colour: str | None = None, style: str = "curve") -> None:
        """Edges drawn heavy: a cut or a Z2 cycle."""
        from matplotlib.collections import LineCollection

        es = sorted(set(edges))
        if not es:
            return
        ls, lw = LINES[style]
        segs = [self.g.edge_points(e) for e in es]
        self.ax.add_collection(LineCollection(segs, colors=colour or PALETTE["curve"], linewidths=lw,
                                              linestyles=ls, zorder=self.Z_CURVE if style == "curve" else self.Z_MOVE,
                                              capstyle="round"))

    def vertices(self, labels: bool = False, filled: Iterable[Hashable] = (), mark: Iterable[Hashable] = (),
                 faint: bool = False) -> None:
        """Vertex discs; ``filled`` ones drawn dark (e.g. already placed by an ordering); ``faint``: small and pale."""
        P = self.P
        filled, mark = set(filled), set(mark)
        vs = P.vertices
        xy = np.array([self.g.xy[v] for v in vs])
        face = [PALETTE["curve"] if v in filled else PALETTE["vertex_face"] for v in vs]
        short = labels and max((len(t) for t in self._label_texts()), default=1) <= 3
        size = self.vertex_size * (3.2 if short else 0.6 if faint else 1.0)
        self.ax.scatter(xy[:, 0], xy[:, 1], s=size, c=face, edgecolors=PALETTE["faint"] if faint else PALETTE["vertex_edge"],
                        linewidths=0.9, zorder=self.Z_FACE if faint else self.Z_VERTEX)
        if mark:
            mxy = np.array([self.g.xy[v] for v in vs if v in mark])
            self.ax.scatter(mxy[:, 0], mxy[:, 1], s=size * 2.6, facecolors="none", edgecolors=PALETTE["move"],
                            linewidths=2.0, zorder=self.Z_VERTEX)
        if labels:
            texts = self._label_texts()
            fs = float(np.clip(10.0 - 0.03 * len(vs), 5.0, 8.5))
            inside = max((len(t) for t in texts), default=1) <= 3
            if not inside:
                import matplotlib.patheffects as pe

                halo = [pe.withStroke(linewidth=2.2, foreground="white")]
            for v, p, txt in zip(vs, xy, texts):
                if inside:
                    self.ax.text(p[0], p[1], txt, fontsize=fs * (1.0 if len(txt) <= 2 else 0.8), ha="center",
                                 va="center", zorder=self.Z_TEXT,
                                 color=PALETTE["ink"] if v not in filled else "white")
                else:  # long labels sit beside the vertex, with a white halo
                    self.ax.annotate(txt, (p[0], p[1]), xytext=(4, 4), textcoords="offset points",
                                     fontsize=fs * 0.85, ha="left", va="bottom", zorder=self.Z_TEXT,
                                     color=PALETTE["ink"], path_effects=halo)

    def _label_texts(self) -> list[str]:
        return [",".join(str(x) for x in v) if isinstance(v, tuple) else str(v) for v in self.P.vertices]

    def outer_label(self) -> None:
        """A small note on the outer face."""
        P = self.P
        if P.number_of_edges() == 0:
            return
        self.ax.text(0.012, 0.988, "outer face", transform=self.ax.transAxes, fontsize=7, style="italic",
                     ha="left", va="top",
                     color=PALETTE["label"], zorder=self.Z_TEXT)

    def face_labels(self) -> None:
        """Each inner face's name where the instance names it (e.g. rooms of a floor plan), else ``f<id>``."""
        names = face_names(self.P)
        import matplotlib.patheffects as pe

        halo = [pe.withStroke(linewidth=2.2, foreground="white")]
        for f in self.P.faces:
            if f == self.P.outer_face:
                continue
            p = self.g.face_point(f)
            name = names.get(f)
            txt = name.replace(" ", "\n") if name and len(name) > 10 else (name or f"f{f}")
            self.ax.text(p[0], p[1], txt, fontsize=6.5 if name is None else 6.0, ha="center", va="center",
                         color=PALETTE["dual"], zorder=self.Z_TEXT, clip_on=False, path_effects=halo)

    def dual_curve(self, e: int) -> np.ndarray:
        """The dual edge of primal edge ``e``: from the face on its left to the face on its right,
        crossing ``e`` at its midpoint."""
        P, g = self.P, self.g
        fl, fr = P.edge_faces(e)
        m = g.midpoint(e)
        a, b = g.face_point(fl), g.face_point(fr)
        outer = P.outer_face
        if fl == fr == outer:  # a bridge on the outer face: in from the ring, across, back out
            nrm = g.dart_normal(2 * e)
            left = m + nrm * 0.2 * g.scale
            right = m - nrm * 0.2 * g.scale
            return np.vstack([self._to_outer(left)[::-1], m[None, :], self._to_outer(right)])
        if fl == fr:  # a bridge inside a face: a loop through the midpoint
            t = _unit(g.point_on(2 * e, 0.55) - g.point_on(2 * e, 0.45))
            out = _unit(m - a)
            s = 0.45 * g.scale
            return _bezier3(a, m + out * s + t * s, m + out * s - t * s, a)
        if outer in (fl, fr):
            inner_pt = a if fr == outer else b
            # normal of e pointing into the outer face: left of the dart that has the outer face on its left
            d = 2 * e if fl == outer else 2 * e + 1
            p1 = m + g.dart_normal(d) * 0.25 * g.scale
            pts = np.vstack([inner_pt[None, :], m[None, :], self._to_outer(p1)])
            return pts if fr == outer else pts[::-1]
        c = 2 * m - 0.5 * (a + b)
        return _bezier2(a, c, b)

    def _to_outer(self, p: np.ndarray) -> np.ndarray:
        """A route from ``p`` (just outside the drawing) out to the ring and along it to the
        outer face's point."""
        g = self.g
        c, R = g.ring()
        phi1 = float(np.arctan2(p[1] - c[1], p[0] - c[0]))
        turn = (g.OUTER_ANGLE - phi1 + np.pi) % (2 * np.pi) - np.pi
        steps = max(2, int(abs(turn) / 0.05))
        ang = phi1 + turn * np.arange(steps + 1) / steps
        arc = c + R * np.column_stack([np.cos(ang), np.sin(ang)])
        return np.vstack([p[None, :], arc, g.face_point(self.P.outer_face)[None, :]])

    def dual(self) -> None:
        """The dual overlaid: a vertex in each face, each dual edge crossing its primal edge."""
        from matplotlib.collections import LineCollection

        P = self.P
        if P.number_of_edges() == 0:
            return
        ls, lw = LINES["dual"]
        segs = [self.dual_curve(e) for e in range(P.number_of_edges())]
        self.ax.add_collection(LineCollection(segs, colors=PALETTE["dual"], linewidths=lw, linestyles=ls,
                                              zorder=self.Z_DUAL))
        pts = np.array([self.g.face_point(f) for f in P.faces])
        self.ax.scatter(pts[:, 0], pts[:, 1], marker="D", s=max(self.vertex_size * 0.8, 14.0),
                        c=PALETTE["dual"], edgecolors="white", linewidths=0.6, zorder=self.Z_DUAL)


def _coerce_highlight(P: PlaneGraph, highlight: Any) -> set[int]:
    if highlight is None:
        return set()
    try:
        items = list(highlight)
    except TypeError:
        raise InvalidArgumentError(f"highlight must be a collection of edge ids, got {highlight!r}") from None
    m = P.number_of_edges()
    out = set()
    for x in items:
        if isinstance(x, (bool, np.bool_)) or not isinstance(x, (int, np.integer)) or not 0 <= int(x) < m:
            raise InvalidArgumentError(f"highlight names {x!r}, which is not an edge id in 0..{m - 1}")
        out.add(int(x))
    return out


def draw(
    P: PlaneGraph,
    *,
    ax: Any = None,
    dual: bool = False,
    weights: bool | str = True,
    labels: bool = False,
    highlight: Iterable[int] | None = None,
    shade: Iterable[int] | None = None,
    holes: Iterable[int] | None = None,
    face_labels: bool = False,
    pos: Mapping[Hashable, Sequence[float]] | None = None,
    title: str | None = None,
    figsize: tuple[float, float] = (6.0, 6.0),
    dpi: float = 100.0,
) -> Any:
    """Draw a plane graph: its embedding, weights, outer face and optionally its dual.

    The picture follows the rotation system, not just the graph: parallel
    edges fan out as arcs in the order the rotation gives them, loops are
    petals in the angular gap where the rotation puts them (nested loops
    nested), and the outer face is the tinted background with a note on it.
    Vertex positions come from ``pos``, else ``P.pos``, else a planar layout
    computed from the rotation (see :func:`sweepwidth.draw.layout_positions`).

    Parameters
    ----------
    P : PlaneGraph
    ax : matplotlib Axes, optional
        Draw into it; by default a new Figure (Agg canvas, no pyplot) is made.
    dual : bool
        Overlay the dual: a diamond in each face, dashed dual edges each
        crossing its primal edge at the midpoint.
    weights : bool or 'all'
        Label edges with their weights (skipped when every weight is 1,
        unless ``'all'``).
    labels : bool
        Write vertex labels inside the vertex discs.
    highlight : iterable of int, optional
        Edge ids drawn heavy.
    shade : iterable of int, optional
        Face ids filled as swept.
    holes : iterable of int, optional
        Face ids drawn grey and hatched (faces a sweep may not cross).
    face_labels : bool
        Write face ids in the faces.
    pos : mapping, optional
        Vertex positions overriding ``P.pos``.
    title : str, optional
    figsize, dpi
        Size of a new figure (ignored when ``ax`` is given).

    Returns
    -------
    matplotlib.axes.Axes
        The Axes drawn into; ``ax.figure.savefig(path)`` writes it.

    Raises
    ------
    SweepwidthError
        When matplotlib is missing (install the ``plot`` extra), ``P`` is not a
        PlaneGraph, or ``highlight``/``shade``/``holes`` name missing edges or faces.

    Notes
    -----
    O(n + m) drawing primitives after the layout; face points cost O(length
    of the face boundary squared) each.

    Examples
    --------
    >>> import networkx as nx
    >>> from sweepwidth.plane import PlaneGraph
    >>> P = PlaneGraph.from_graph(nx.cycle_graph(4))
    >>> ax = draw(P, dual=True, labels=True)
    >>> len(ax.collections) >= 3          # edges, vertices, dual
    True
    """
    require_matplotlib()
    if not isinstance(P, PlaneGraph):
        raise InputTypeError(f"draw expects a PlaneGraph, got {type(P).__name__}")
    hl = _coerce_highlight(P, highlight)
    F = P.number_of_faces()
    sh = set(shade or ())
    hs = set(holes or ())
    for name, fs in (("shade", sh), ("holes", hs)):
        bad = [f for f in fs if not isinstance(f, (int, np.integer)) or not 0 <= f < F]
        if bad:
            raise NotInGraphError(f"{name} names {bad[0]!r}, which is not a face id in 0..{F - 1}")
    if ax is None:
        fig = new_figure(figsize, dpi)
        ax = fig.add_axes((0.02, 0.02, 0.96, 0.9 if title else 0.96))
    geom = Geometry(P, dict(pos) if pos is not None else None)
    sc = Scene(P, ax, geom)
    sc.frame(ring=dual)
    sc.faces(shade=sh, holes=hs)
    sc.edges(weights=weights)
    if dual:
        sc.dual()
    sc.heavy_edges(hl)
    sc.vertices(labels=labels)
    sc.outer_label()
    if face_labels:
        sc.face_labels()
    if title:
        ax.set_title(title, fontsize=10)
    return ax
