"""The curated instances: the manifest's claims are recomputed here.

Fast by default: every structural claim, and every known value of the small
instances; the rest behind ``@pytest.mark.slow``.
"""

from __future__ import annotations

import json
import math
import os

import networkx as nx
import pytest

import sweepwidth as sw
from sweepwidth.bench.hashing import instance_hash
from sweepwidth.bench.loading import check_object, solve_object

ROOT = os.path.join(os.path.dirname(os.path.dirname(os.path.abspath(__file__))), "instances")
MANIFEST = os.path.join(ROOT, "manifest.json")

pytestmark = pytest.mark.skipif(not os.path.exists(MANIFEST), reason="instances/manifest.json not built")


def _entries():
    if not os.path.exists(MANIFEST):
        return []
    with open(MANIFEST, encoding="utf-8") as fh:
        return json.load(fh)["instances"]


ENTRIES = _entries()


def _fast(entry, param):
    if param == "cutwidth":
        return entry["vertices"] <= 16
    if param == "homotopy":
        return (entry.get("faces") or 0) <= 10 and entry["vertices"] <= 12
    return (entry.get("faces") or 0) <= 13 and entry["vertices"] <= 16


def _cases():
    for e in ENTRIES:
        for param, known in sorted((e.get("known") or {}).items()):
            if "value" not in known:
                continue
            marks = [] if _fast(e, param) else [pytest.mark.slow]
            yield pytest.param(e, param, known, id=f"{e['name']}-{param}", marks=marks)


def _load(e):
    return sw.read(os.path.join(ROOT, e["path"]))


def test_manifest_lists_the_promised_sets():
    sets = {e["set"] for e in ENTRIES}
    for s in ("grids", "triangulated", "platonic", "wheels-fans", "nested", "random", "trees", "hypercubes", "tori", "demo"):
        assert s in sets, s


@pytest.mark.parametrize("e", ENTRIES, ids=[e["name"] for e in ENTRIES])
def test_entry_file_size_hash_and_sources(e):
    path = os.path.join(ROOT, e["path"])
    assert os.path.exists(path)
    assert instance_hash(path) == e["hash"], "file changed since the manifest was built"
    obj = _load(e)
    if e["kind"] == "plane":
        V, E, F = obj.number_of_vertices(), obj.number_of_edges(), obj.number_of_faces()
        assert (V, E, F) == (e["vertices"], e["edges"], e["faces"])
        assert V - E + F == 2  # Euler's formula for connected plane graphs (CHECKS.md)
    else:
        assert (obj.number_of_nodes(), obj.number_of_edges()) == (e["vertices"], e["edges"])
    for param, known in (e.get("known") or {}).items():
        assert param in ("cutwidth", "homology", "homotopy")
        assert known.get("source"), f"{param} value without a source"


# Platonic solids (V, E, F) -- CHECKS.md, "Plane graphs"
PLATONIC = {"tetrahedron": (4, 6, 4), "cube": (8, 12, 6), "octahedron": (6, 12, 8), "dodecahedron": (20, 30, 12), "icosahedron": (12, 30, 20)}


@pytest.mark.parametrize("name", sorted(PLATONIC))
def test_platonic_counts_and_duals(name):
    e = [x for x in ENTRIES if x["name"] == name][0]
    P = _load(e)
    assert (P.number_of_vertices(), P.number_of_edges(), P.number_of_faces()) == PLATONIC[name]
    # cube <-> octahedron, dodecahedron <-> icosahedron, tetrahedron self-dual (CHECKS.md)
    partner = {"cube": "octahedron", "octahedron": "cube", "dodecahedron": "icosahedron", "icosahedron": "dodecahedron", "tetrahedron": "tetrahedron"}[name]
    other = nx.Graph(_load([x for x in ENTRIES if x["name"] == partner][0]).to_networkx())
    assert nx.is_isomorphic(nx.Graph(P.dual().to_networkx()), other)


def test_published_formulas_match_the_manifest():
    """The manifest's values for the formula families equal the formulas (independent of the solvers)."""
    seen = 0
    for e in ENTRIES:
        cw = (e.get("known") or {}).get("cutwidth", {}).get("value")
        n = e["name"]
        if n.startswith("grid-"):
            m, k = map(int, n[5:].split("x"))
            assert cw == min(m, k) + 1  # Rolim, Sykora, Vrto, WG 1995 (from memory)
        elif n.startswith("ladder-"):
            assert cw == 3  # P_2 x P_n, n >= 3 (same source)
        elif n.startswith("hypercube-q"):
            d = int(n[len("hypercube-q"):])
            assert cw == 2 ** (d + 1) // 3  # Harper; Nakano (from memory)
        elif n.startswith("bintree-h"):
            h = int(n[len("bintree-h"):])
            assert cw == math.ceil(h / 2) + 1  # Lengauer 1982 (from memory)
        elif n.startswith("complete-k"):
            k = int(n[len("complete-k"):])
            assert cw == k * k // 4  # K_n (common practice, from memory)
        else:
            continue
        seen += 1
    assert seen >= 10


def test_pavilion_has_the_costly_spot():
    e = [x for x in ENTRIES if x["name"] == "pavilion"][0]
    k = e["known"]
    assert k["homotopy"]["value"] > k["homology"]["value"]  # one cordon costs more than separate loops


@pytest.mark.parametrize("e, param, known", list(_cases()))
def test_known_value_is_recomputed(e, param, known):
    obj = _load(e)
    # small instances run without a time limit: in this process, no child process to start
    limit = None if _fast(e, param) else 300
    # solve_object takes start/end curves and holes from the file, as the runner does
    r = solve_object(obj, param, time_limit=limit, options=(e.get("options") or {}).get(param, {}))
    width = check_object(r, obj)
    assert r.status == "optimal", r
    assert r.value == known["value"], known["source"]
    assert width == r.upper
