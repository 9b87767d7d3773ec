"""The demo: the Larkspur Pavilion (a fictional venue) and a small mixed set of plane graphs.

The Larkspur Pavilion
---------------------
A fictional exhibition pavilion.  Its floor plan is a plane graph: corners
and posts are vertices, walls and rope lines are edges weighted by their
length in metres (rounded to whole metres), and the rooms are the faces.
At closing time the stewards hold one connected cordon along the outer
walls and sweep the whole floor down to a single point without ever leaving
a gap:

* the **homotopy height** is the longest cordon they need;
* the **homology width** is what they would need if the cordon could split
  into several separate loops;
* where the two differ, keeping the cordon in one piece costs rope.

On this plan they do differ: the best separate-loops sweep crosses the Main
Hall early and leaves a loop around a room at the north end on its own, far
from the loop around the south galleries; a single cordon cannot do that
without running out to the north loop and back, and the best one-piece
sweep needs a few metres more.  The demo shows where the split happens
(:func:`first_split` replays the homology witness).  The numbers shown by the demo are computed by the
solvers each time (nothing is stored); the floor plan was chosen by asking
the exact solvers for a layout of this kind with such a difference.

The positions are in metres on a plan of about 16 m x 24 m.

This is an illustration of the mathematics, not crowd-safety guidance.
"""

from __future__ import annotations

import math
import os
import time
from typing import Any, Iterator

import networkx as nx

from .errors import SweepwidthError

__all__ = ["DISCLAIMER", "pavilion", "ROOMS", "demo_set", "run_demo", "first_split"]

DISCLAIMER = (
    "Note: the Larkspur Pavilion is fictional; this demo illustrates the mathematics of sweeps"
    " and is not crowd-safety guidance. Real venues follow local codes and their safety officers."
)

#: corner/post name -> position in metres
_CORNERS = {
    "south-gate": (7, 0),
    "loom-post": (7, 10),
    "west-tower": (3, 24),
    "print-post": (11, 6),
    "east-bay": (16, 16),
    "north-arch": (11, 23),
    "nook-post": (8, 17),
    "kiln-post": (10, 5),
    "cloak-post": (7, 22),
}

#: (u, v, kind): walls enclose the building and its rooms; rope lines are movable barriers
_LINES = [
    ("south-gate", "loom-post", "rope"),
    ("south-gate", "west-tower", "wall"),
    ("south-gate", "kiln-post", "rope"),
    ("south-gate", "print-post", "wall"),
    ("loom-post", "print-post", "rope"),
    ("loom-post", "east-bay", "rope"),
    ("loom-post", "kiln-post", "rope"),
    ("west-tower", "nook-post", "rope"),
    ("west-tower", "north-arch", "wall"),
    ("west-tower", "cloak-post", "rope"),
    ("print-post", "east-bay", "wall"),
    ("print-post", "kiln-post", "rope"),
    ("east-bay", "north-arch", "wall"),
    ("north-arch", "cloak-post", "rope"),
    ("nook-post", "cloak-post", "rope"),
]

#: room name -> its corners in order around it
ROOMS = {
    "Main Hall": ["south-gate", "loom-post", "east-bay", "north-arch", "cloak-post", "nook-post", "west-tower"],
    "Loom Room": ["loom-post", "south-gate", "kiln-post"],
    "Kiln Corner": ["kiln-post", "south-gate", "print-post"],
    "Print Gallery": ["loom-post", "print-post", "east-bay"],
    "Ticket Desk": ["print-post", "loom-post", "kiln-post"],
    "Reading Nook": ["west-tower", "nook-post", "cloak-post"],
    "Cloakroom": ["north-arch", "west-tower", "cloak-post"],
}


def pavilion() -> Any:
    """The Larkspur Pavilion floor plan as a :class:`~sweepwidth.plane.PlaneGraph`.

    Edge weights are the lengths of the walls and rope lines in whole metres;
    each edge has ``kind`` 'wall' or 'rope'.  ``P.meta['rooms']`` maps room
    names to face ids.

    Returns
    -------
    PlaneGraph
        9 corners, 15 walls and rope lines, 7 rooms plus the outside.

    Examples
    --------
    >>> P = pavilion()
    >>> P.number_of_vertices(), P.number_of_edges(), P.number_of_faces()
    (9, 15, 8)
    >>> P.face_length(P.outer_face)     # metres of outer wall
    59.0
    """
    from .plane import PlaneGraph

    G = nx.Graph()
    for u, v, kind in _LINES:
        w = round(math.dist(_CORNERS[u], _CORNERS[v]))
        G.add_edge(u, v, weight=max(1, w), kind=kind)
    P = PlaneGraph.from_positions(G, {k: tuple(map(float, p)) for k, p in _CORNERS.items()})
    P.meta.update(
        name="Larkspur Pavilion",
        provenance={
            "description": "fictional exhibition pavilion; walls and rope lines weighted in metres",
            "built_by": "sweepwidth.demo.pavilion",
        },
        rooms={name: P.find_face(walk) for name, walk in ROOMS.items()},
    )
    return P


def demo_set() -> list[tuple[str, str, Any]]:
    """The demo's instances: ``(name, description, plane graph)``, the pavilion first."""
    from . import generators as gen

    return [
        ("Larkspur Pavilion", "floor plan, walls and rope lines in metres", pavilion()),
        ("wheel-6", "a hub with 6 spokes (unit weights)", gen.wheel(6)),
        ("triangulated-grid-2", "a 2 x 2 grid disk cut into 8 triangles", gen.triangulated_grid(2)),
        ("nested-triangles-2", "two nested triangles joined by three edges", gen.nested_triangles(2)),
        ("grid-3x3", "the 3 x 3 grid graph (4 square faces)", gen.grid(3, 3)),
    ]


def _result_event(label: str, res: Any, P: Any, obj: Any) -> dict:
    checked = "-"
    if res.witness is not None:
        try:
            w = res.check(obj)
            checked = "yes" if abs(float(w) - float(res.upper)) <= 1e-9 * max(1.0, abs(float(w))) else f"REFUSED (replays with {w:g})"
        except Exception as err:  # noqa: BLE001 - shown, not hidden
            checked = f"REFUSED ({err})"
    return {
        "kind": "result",
        "label": label,
        "status": res.status,
        "lower": res.lower,
        "upper": res.upper,
        "method": res.method or "-",
        "seconds": float(res.seconds),
        "checked": checked,
        "result": res,
    }


def _save_picture(fn: Any, path: str) -> str | None:
    """Run a drawing function returning an Axes or Figure and save it; None on success, else the error."""
    try:
        obj = fn()
        fig = getattr(obj, "figure", obj)
        if isinstance(obj, (list, tuple)) and obj:
            fig = getattr(obj[0], "figure", obj[0])
        fig.savefig(path, dpi=110, bbox_inches="tight")
        return None
    except Exception as err:  # noqa: BLE001 - a picture failure is reported, the demo goes on
        return f"{type(err).__name__}: {err}"


def run_demo(out_dir: str | None = "demo-output", *, time_limit: float = 10.0, pictures: bool = True) -> Iterator[dict]:
    """Solve the demo set and yield what happened, one event at a time.

    Events are dicts with ``kind``: 'instance' (``name``, ``description``),
    'result' (``label``, ``status``, ``lower``, ``upper``, ``method``,
    ``seconds``, ``checked``, ``result``) or 'note' (``text``).  The caller
    prints them; this function never prints.

    Parameters
    ----------
    out_dir : str or None
        Folder for the pictures and the pavilion's JSON file (created); None
        writes nothing.
    time_limit : float
        Seconds per solve.
    pictures : bool
        Draw the pavilion and its sweeps when :mod:`sweepwidth.draw` is there.

    Notes
    -----
    Every solve but the pavilion's homotopy height is small; the run time is
    in ``benchmarks/NOTES.md``.
    """
    from .solve import cutwidth, homology_width, homotopy_height

    if out_dir:
        os.makedirs(out_dir, exist_ok=True)
    for name, desc, P in demo_set():
        yield {"kind": "instance", "name": name, "description": desc}
        results: dict[str, Any] = {}
        try:
            r = homology_width(P, time_limit=time_limit)
            results["homology"] = r
            yield _result_event("homology width", r, P, P)
        except Exception as err:  # noqa: BLE001
            yield {"kind": "note", "text": f"  homology width: not available ({type(err).__name__}: {err})"}
        try:
            r = homotopy_height(P, time_limit=time_limit)
            results["homotopy"] = r
            yield _result_event("homotopy height", r, P, P)
        except Exception as err:  # noqa: BLE001
            yield {"kind": "note", "text": f"  homotopy height: not available ({type(err).__name__}: {err})"}
        try:
            G = P.to_networkx()
            r = cutwidth(G, time_limit=time_limit)
            results["cutwidth"] = r
            yield _result_event("cutwidth (plan graph)", r, P, G)
        except Exception as err:  # noqa: BLE001
            yield {"kind": "note", "text": f"  cutwidth: not available ({type(err).__name__}: {err})"}
        h, t = results.get("homology"), results.get("homotopy")
        if h is not None and t is not None and h.lower is not None and t.lower is not None:
            if t.lower > (h.upper if h.upper is not None else math.inf) + 1e-9:
                exact = h.is_optimal and t.is_optimal
                yield {
                    "kind": "note",
                    "text": f"  -> keeping the cordon in one piece costs {'' if exact else 'at least '}{t.lower - h.upper:g} more"
                    f" ({_fmt(h.upper)} as separate loops, {_fmt(t.lower)} as one cordon)",
                }
                split = first_split(P, h.witness) if h.witness is not None else None
                if split is not None:
                    step, face, groups = split
                    names = _room_names(P)
                    parts = [" + ".join(sorted(names.get(f, f"face {f}") for f in g)) for g in groups]
                    yield {
                        "kind": "note",
                        "text": f"  -> where: the separate-loops sweep splits its cordon at step {step} (sweeping"
                        f" {names.get(face, f'face {face}')}), leaving loops around: " + "; ".join(parts),
                    }
            elif h.is_optimal and t.is_optimal:
                yield {"kind": "note", "text": f"  -> one cordon needs no more than separate loops here ({_fmt(t.value)})"}
        if name == "Larkspur Pavilion" and out_dir:
            yield from _pavilion_files(P, results, out_dir, pictures)


def _room_names(P: Any) -> dict[int, str]:
    rooms = (getattr(P, "meta", None) or {}).get("rooms") or {}
    return {int(f): name for name, f in rooms.items()}


def first_split(P: Any, order: Any) -> tuple[int, int, list[list[int]]] | None:
    """The first step of a homology sweep (a face order from the outer boundary) where the cycle falls apart.

    Replays the face order on the Z2 boundary of the outer face and returns
    ``(step, face, groups)``: the 1-based step, the face swept at that step,
    and for each connected piece of the cycle the faces not yet swept that
    border it.  None when the cycle stays in one piece.

    Examples
    --------
    >>> P = pavilion()
    >>> step, face, groups = first_split(P, [7, 0, 6, 5, 4, 3, 1])
    >>> len(groups) >= 2
    True
    """
    order = [int(f) for f in order]
    cycle = set(P.face_boundary_cycle(P.outer_face))
    swept: set[int] = set()
    for step, f in enumerate(order, start=1):
        cycle ^= set(P.face_boundary_cycle(f))
        swept.add(f)
        if not cycle:
            return None
        G = nx.Graph()
        for e in cycle:
            G.add_edge(*P.edge_ends(e))
        comps = list(nx.connected_components(G))
        if len(comps) > 1:
            groups = []
            for comp in comps:
                faces: set[int] = set()
                for e in cycle:
                    if P.edge_ends(e)[0] in comp:
                        faces.update(x for x in P.edge_faces(e) if x not in swept and x != P.outer_face)
                groups.append(sorted(faces))
            return step, f, groups
    return None


def _fmt(x: Any) -> str:
    if x is None:
        return "?"
    return f"{float(x):g}"


def _optional(module: Any, name: str) -> Any:
    """``module.name``, or None when the lazy facade cannot load it yet."""
    try:
        return getattr(module, name)
    except (AttributeError, ImportError):
        return None


def _pavilion_files(P: Any, results: dict, out_dir: str, pictures: bool) -> Iterator[dict]:
    try:
        from .io import write

        path = os.path.join(out_dir, "pavilion.json")
        write(P, path)
        yield {"kind": "note", "text": f"  floor plan written to {path}"}
    except Exception as err:  # noqa: BLE001
        yield {"kind": "note", "text": f"  floor plan not written ({type(err).__name__}: {err})"}
    saved_names: list[str] = []
    for key, res in results.items():
        # the format and names of 'sweepwidth solve --save', so that 'sweepwidth check' reads them
        try:
            from .bench.hashing import instance_hash
            from .io.saved import saved_result, write_saved

            target = os.path.join(out_dir, f"pavilion.{key}.json")
            write_saved(saved_result(path, instance_hash(path), res, {}), target, path)
            saved_names.append(os.path.basename(target))
        except (OSError, SweepwidthError) as err:
            yield {"kind": "note", "text": f"  result not saved: {err}"}
    if saved_names:
        yield {
            "kind": "note",
            "text": f"  results saved in {out_dir}/: {', '.join(saved_names)}"
            f" (verify one: sweepwidth check {os.path.join(out_dir, saved_names[0])})",
        }
    if not pictures:
        return
    try:
        import importlib

        # the package, not the facade's ``sweepwidth.draw`` function that may shadow it as an attribute
        drawing = importlib.import_module("sweepwidth.draw")
        draw_fn = drawing.draw
    except (AttributeError, ImportError) as err:  # noqa: BLE001
        yield {"kind": "note", "text": f"  pictures skipped: the drawing module is not available ({err})"}
        return
    made: list[str] = []
    errs: list[str] = []
    e = _save_picture(lambda: draw_fn(P, dual=False, face_labels=True, title="Larkspur Pavilion (metres)"), os.path.join(out_dir, "pavilion.png"))
    (errs if e else made).append(e or "pavilion.png")
    for key in ("homology", "homotopy"):
        res = results.get(key)
        if res is None or res.witness is None:
            continue
        for fname, maker in (
            (f"pavilion-{key}-frames.png", _optional(drawing, "sweep_frames")),
            (f"pavilion-{key}-profile.png", _optional(drawing, "width_profile")),
        ):
            if maker is None:
                continue
            if fname.endswith("profile.png"):
                e = _save_picture(lambda m=maker, r=res: m(r, P), os.path.join(out_dir, fname))
            else:
                e = _save_picture(lambda m=maker, r=res: m(P, r), os.path.join(out_dir, fname))
            (errs if e else made).append(e or fname)
    anim = _optional(drawing, "sweep_animation")
    res = results.get("homotopy")
    if anim is not None and res is not None and res.witness is not None:
        gif = os.path.join(out_dir, "pavilion-homotopy.gif")
        try:
            anim(P, res, gif, weights=True)
            made.append("pavilion-homotopy.gif")
        except Exception as err:  # noqa: BLE001 - reported, the demo goes on
            errs.append(f"{type(err).__name__}: {err}")
    if made:
        yield {"kind": "note", "text": f"  pictures in {out_dir}/: " + ", ".join(made)}
    for e in errs:
        yield {"kind": "note", "text": f"  a picture failed: {e}"}
