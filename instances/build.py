"""Regenerate the curated instance sets and their manifest (deterministic).

Run from the repository root::

    .venv/bin/python instances/build.py            # every set
    .venv/bin/python instances/build.py --sets grids,platonic

Every instance is made by a seeded generator of :mod:`sweepwidth.generators`
or by networkx, written in our JSON document format, and listed in
``instances/manifest.json`` with its size, content hash and known values.
A known value is recorded only when it is

* a published formula (the source is named in the manifest entry)
  that one exact solver reproduces here, or
* computed and cross-checked by two independent methods that agree (both
  named in the source text).

When a formula and a solver disagree, or two methods disagree, the build
stops with an error instead of writing a doubtful value.  The sweep
instances of ``instances/sweeps/`` (made by their own script) are listed in
the manifest by reference (its 'include' list) when that folder has its own
``manifest.json``.
"""

from __future__ import annotations

import argparse
import json
import math
import os
import sys
import time
from typing import Any, Callable

import networkx as nx

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.dirname(HERE))

import sweepwidth as sw  # noqa: E402
from sweepwidth import generators as gen  # noqa: E402
from sweepwidth.demo import pavilion  # noqa: E402
from sweepwidth.bench.hashing import instance_hash  # noqa: E402

TIME = 60.0  # seconds per solver call while building

SRC_GRID = (
    "Rolim, Sykora, Vrto, 'Optimal cutwidths and bisection widths of 2- and 3-dimensional meshes', "
    "WG 1995, LNCS 1017 (cw(P_m x P_n) = m + 1 for 3 <= m <= n; from memory)"
)
SRC_LADDER = "grid family P_2 x P_n, n >= 3: cutwidth 3 (same source as the grids; from memory)"
SRC_CUBE = "hypercube Q_d: floor(2^(d+1)/3), attributed to Harper and to Nakano, 'Linear layout of generalized hypercubes' (from memory)"
SRC_KN = "complete graph K_n: floor(n^2/4) (common practice, from memory)"
SRC_TREE = (
    "complete binary tree of height h >= 2: ceil(h/2) + 1, attributed to Lengauer, 'Upper and lower bounds on the "
    "complexity of the min-cut linear arrangement problem on trees', SIAM J. Algebraic Discrete Methods 1982 (from memory)"
)
SRC_CYCLE = "cycle C_n: cutwidth 2 (common practice)"


class BuildError(RuntimeError):
    pass


def _value(r: Any) -> float | None:
    return float(r.value) if r.status == "optimal" else None


def cutwidth_known(G: nx.Graph, formula: float | None = None, source: str = "") -> dict:
    """Cutwidth by two exact methods (or a formula and one method); raises on disagreement."""
    n = G.number_of_nodes()
    methods = (["dp"] if n <= 20 else []) + ["sat", "bnb"]
    values: dict[str, float] = {}
    for m in methods:
        r = sw.cutwidth(G, method=m, time_limit=TIME)
        r.check(G)
        v = _value(r)
        if v is not None:
            values[m] = v
        if formula is not None and values:
            break
        if len(values) >= 2:
            break
    if formula is not None:
        if not values:
            raise BuildError(f"no exact cutwidth within {TIME} s to confirm the formula value {formula}")
        (m, v), = list(values.items())[:1]
        if v != formula:
            raise BuildError(f"formula says cutwidth {formula}, method {m!r} computes {v}")
        return {"value": formula, "source": f"{source}; reproduced by the exact method {m!r}"}
    if len(values) < 2:
        return {}
    vs = set(values.values())
    if len(vs) != 1:
        raise BuildError(f"cutwidth methods disagree: {values}")
    names = " and ".join(f"'{m}'" for m in values)
    return {"value": vs.pop(), "source": f"computed and cross-checked by two independent methods: cutwidth {names}"}


def homology_known(P: Any) -> dict:
    """Homology width by two of: the subset DP over face sets, the pinned cutwidth of the dual, the face-set search.

    Methods that refuse the size (ProblemTooLargeError) are skipped; the
    value is recorded when two methods finish and agree.
    """
    names = {
        "subset-dp": "'subset-dp' (face-set DP)",
        "cutwidth": "'cutwidth' (pinned cutwidth of the dual)",
        "face-sets": "'face-sets' (search over swept face sets, faces may be toggled again)",
    }
    values: dict[str, float] = {}
    for m in names:
        kw = {"monotone": False} if m == "face-sets" else {}
        try:
            r = sw.homology_width(P, method=m, time_limit=TIME, **kw)
        except sw.ProblemTooLargeError:
            continue
        r.check(P)
        v = _value(r)
        if v is not None:
            values[m] = v
        if len(values) == 2:
            break
    if len(values) < 2:
        return {}
    if len(set(values.values())) != 1:
        raise BuildError(f"homology methods disagree: {values}")
    used = " and ".join(names[m] for m in values)
    return {"value": next(iter(values.values())), "source": f"computed and cross-checked by two independent methods: homology {used}"}


def homotopy_known(P: Any, homology: float | None) -> dict:
    """Homotopy height by the exact search, compared with the proven bracket of the 'bounds' method."""
    b = sw.homotopy_height(P, method="bounds", time_limit=TIME)
    if b.witness is not None:
        b.check(P)
    s = sw.homotopy_height(P, method="search", time_limit=TIME)
    if s.status != "optimal":
        return {}
    s.check(P)
    v = float(s.value)
    if (b.lower is not None and v < b.lower - 1e-9) or (b.upper is not None and v > b.upper + 1e-9):
        raise BuildError(f"homotopy search gives {v}, outside the 'bounds' bracket [{b.lower}, {b.upper}]")
    if homology is not None and v < homology - 1e-9:
        raise BuildError(f"homotopy height {v} below the homology width {homology}")
    if b.status == "optimal":
        src = (
            "computed and cross-checked by two independent methods: homotopy 'search' (exact walk-state search) "
            "and 'bounds' (homology lower bound met by a constructed homotopy)"
        )
    else:
        src = (
            f"computed by the exact homotopy 'search'; consistent with the proven bracket [{b.lower:g}, {b.upper:g}] "
            "of the independent 'bounds' method"
        )
    return {"value": v, "source": src}


def complete_binary_tree(h: int) -> nx.Graph:
    return nx.balanced_tree(2, h)


# name, set, builder, {param: how}
def instance_list() -> list[dict]:
    items: list[dict] = []

    def plane(name: str, set_: str, make: Callable[[], Any], cw_formula: tuple | None = None, homotopy: bool = True, desc: str = "") -> None:
        items.append({"name": name, "set": set_, "make": make, "kind": "plane", "cw": cw_formula, "homotopy": homotopy, "description": desc})

    def graph(name: str, set_: str, make: Callable[[], Any], cw_formula: tuple | None = None, desc: str = "") -> None:
        items.append({"name": name, "set": set_, "make": make, "kind": "graph", "cw": cw_formula, "homotopy": False, "description": desc})

    for m, n in [(3, 3), (3, 4), (3, 5), (4, 4), (4, 5), (5, 5)]:
        plane(f"grid-{m:02d}x{n:02d}", "grids", lambda m=m, n=n: gen.grid(m, n), (m + 1, SRC_GRID), desc=f"grid P_{m} x P_{n}")
    for n in (3, 5, 8):
        plane(f"ladder-02x{n:02d}", "grids", lambda n=n: gen.grid(2, n), (3, SRC_LADDER), desc=f"ladder P_2 x P_{n}")
    for k in (2, 3, 4):
        plane(f"trigrid-{k}", "triangulated", lambda k=k: gen.triangulated_grid(k), desc=f"{k} x {k} grid disk, each square split by its main diagonal")
    plat = {
        "tetrahedron": (nx.tetrahedral_graph, (4, SRC_KN + " (K_4)")),
        "cube": (nx.cubical_graph, (5, SRC_CUBE + " (Q_3)")),
        "octahedron": (nx.octahedral_graph, None),
        "dodecahedron": (nx.dodecahedral_graph, None),
        "icosahedron": (nx.icosahedral_graph, None),
    }
    for name, (fn, cwf) in plat.items():
        plane(name, "platonic", lambda fn=fn: sw.PlaneGraph.from_graph(fn()), cwf, desc=f"the {name} (embedding from networkx's planarity test)")
    for k in (4, 6, 8):
        plane(f"wheel-{k}", "wheels-fans", lambda k=k: gen.wheel(k), desc=f"wheel with {k} spokes")
        plane(f"fan-{k}", "wheels-fans", lambda k=k: gen.fan(k), desc=f"fan of {k} triangles")
    for k in (2, 3, 4):
        plane(f"nested-{k}", "nested", lambda k=k: gen.nested_triangles(k), desc=f"{k} nested triangles")
    for n, seed in [(8, 1), (12, 2), (16, 3)]:
        plane(f"delaunay-{n:02d}-s{seed}", "random", lambda n=n, seed=seed: gen.delaunay(n, seed=seed), desc=f"Delaunay triangulation of {n} random points, seed {seed}")
    for n, seed in [(10, 4), (14, 5)]:
        plane(
            f"plane-{n:02d}-s{seed}",
            "random",
            lambda n=n, seed=seed: gen.random_plane_graph(n, seed=seed, weights=(1, 5)),
            desc=f"random plane graph on {n} points, weights 1..5, seed {seed}",
        )
    for h in (2, 3, 4, 5):
        graph(f"bintree-h{h}", "trees", lambda h=h: complete_binary_tree(h), (math.ceil(h / 2) + 1, SRC_TREE), desc=f"complete binary tree of height {h}")
    for d in (2, 3, 4):
        graph(f"hypercube-q{d}", "hypercubes", lambda d=d: nx.convert_node_labels_to_integers(nx.hypercube_graph(d)), ((2 ** (d + 1)) // 3, SRC_CUBE), desc=f"hypercube Q_{d}")
    for m, n in [(3, 3), (3, 4), (4, 4)]:
        graph(
            f"torus-{m}x{n}",
            "tori",
            lambda m=m, n=n: nx.convert_node_labels_to_integers(nx.grid_2d_graph(m, n, periodic=True)),
            desc=f"torus grid C_{m} x C_{n}",
        )
    for n in (5, 6, 7):
        graph(f"complete-k{n}", "complete", lambda n=n: nx.complete_graph(n), (n * n // 4, SRC_KN), desc=f"complete graph K_{n}")
    plane("pavilion", "demo", pavilion, desc="the Larkspur Pavilion (fictional venue; walls and rope lines in metres)")
    return items


def build(sets: list[str] | None, out: str = HERE, log: Callable[[str], None] = print) -> dict:
    entries = []
    old = {}
    man_path = os.path.join(out, "manifest.json")
    if sets and os.path.exists(man_path):
        with open(man_path, encoding="utf-8") as fh:
            old = {e["name"]: e for e in json.load(fh).get("instances", []) if not e.get("external")}
    for item in instance_list():
        if sets and item["set"] not in sets:
            if item["name"] in old:
                entries.append(old[item["name"]])
            continue
        t0 = time.monotonic()
        obj = item["make"]()
        known: dict[str, dict] = {}
        if item["kind"] == "plane":
            G = obj.to_networkx()
        else:
            G = obj
        cwf = item["cw"]
        k = cutwidth_known(G, *(cwf if cwf else (None, "")))
        if k:
            known["cutwidth"] = k
        if item["kind"] == "plane":
            k = homology_known(obj)
            if k:
                known["homology"] = k
            if item["homotopy"]:
                try:
                    k = homotopy_known(obj, known.get("homology", {}).get("value"))
                except BuildError:
                    raise
                except Exception as err:  # a solver failure leaves the value unknown, never wrong
                    log(f"{item['name']}: homotopy not recorded ({type(err).__name__}: {err})")
                    k = {}
                if k:
                    known["homotopy"] = k
            obj.meta["name"] = item["name"]
            obj.meta["known"] = known
            obj.meta["provenance"] = {"built_by": "instances/build.py", "description": item["description"]}
        else:
            obj.graph["name"] = item["name"]
            obj.graph["known"] = known
            obj.graph["provenance"] = {"built_by": "instances/build.py", "description": item["description"]}
        folder = os.path.join(out, item["set"])
        os.makedirs(folder, exist_ok=True)
        path = os.path.join(folder, item["name"] + ".json")
        sw.write(obj, path)
        entry = {
            "name": item["name"],
            "set": item["set"],
            "path": os.path.relpath(path, out),
            "kind": item["kind"],
            "description": item["description"],
            "vertices": obj.number_of_vertices() if item["kind"] == "plane" else G.number_of_nodes(),
            "edges": obj.number_of_edges(),
            "faces": obj.number_of_faces() if item["kind"] == "plane" else None,
            "hash": instance_hash(path),
            "known": known,
        }
        entries.append(entry)
        log(f"{item['name']:22s} {time.monotonic() - t0:6.1f} s  " + ", ".join(f"{p}={v['value']:g}" for p, v in known.items()))
    manifest = {
        "format": "sweepwidth-manifest",
        "version": 1,
        "description": "Curated instance sets with known values and where each value comes from. "
        "Regenerate with instances/build.py; tests/test_instances.py recomputes them. "
        "Sets made elsewhere keep their own manifest, listed under 'include'.",
        "instances": entries,
        "include": included_manifests(out),
    }
    with open(man_path, "w", encoding="utf-8") as fh:
        json.dump(manifest, fh, indent=1)
        fh.write("\n")
    return manifest


def included_manifests(out: str) -> list[str]:
    """Manifests of sets made elsewhere (``instances/sweeps/manifest.json``), relative to ``out``.

    They are included by reference, not copied, so their authors can change
    them without this manifest going stale; the runner and the tests read
    them through the 'include' list.
    """
    mine = {item["set"] for item in instance_list()}
    res = []
    for sub in sorted(os.listdir(out)):
        folder = os.path.join(out, sub)
        if sub in mine or not os.path.isdir(folder) or sub.startswith((".", "_")):
            continue
        if os.path.exists(os.path.join(folder, "manifest.json")):
            res.append(f"{sub}/manifest.json")
    return res


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--sets", help="comma list of sets to rebuild (others are kept from the manifest)")
    ap.add_argument("--out", default=HERE, help="output folder (default: this folder)")
    args = ap.parse_args(argv)
    sets = [s for s in (args.sets or "").split(",") if s] or None
    try:
        build(sets, args.out)
    except BuildError as err:
        print(f"build.py: error: {err}", file=sys.stderr)
        return 1
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
