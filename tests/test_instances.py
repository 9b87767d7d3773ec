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
from sweepwidth.bench.tasks import parse_known_key

ROOT = os.path.join(os.path.dirname(os.path.dirname(os.path.abspath(__file__))), "instances")
MANIFEST = os.path.join(ROOT, "manifest.json")

pytestmark = pytest.mark.skipif(not os.path.exists(MANIFEST), reason="instances/manifest.json not built")


def _entries():
    """Our entries, then those of the included manifests (paths made relative to instances/)."""
    if not os.path.exists(MANIFEST):
        return []
    with open(MANIFEST, encoding="utf-8") as fh:
        top = json.load(fh)
    out = list(top["instances"])
    for inc in top.get("include", []):
        folder = os.path.dirname(inc)
        with open(os.path.join(ROOT, inc), encoding="utf-8") as fh:
            for e in json.load(fh)["instances"]:
                e = dict(e, path=os.path.join(folder, e["path"]), external=True)
                e.setdefault("set", folder)
                e.setdefault("name", os.path.splitext(os.path.basename(e["path"]))[0])
                e.setdefault("kind", "plane")
                P = sw.read(os.path.join(ROOT, e["path"]))
                e.setdefault("vertices", P.number_of_vertices())
                e.setdefault("faces", P.number_of_faces())
                out.append(e)
    return out


ENTRIES = _entries()


def _fast(entry, param):
    if param == "cutwidth":
        return entry["vertices"] <= 16
    if param == "homotopy":
        return (entry.get("faces") or 0) <= 10 and entry["vertices"] <= 12
    return (entry.get("faces") or 0) <= 13 and entry["vertices"] <= 16


def _cases():
    for e in ENTRIES:
        for key, known in sorted((e.get("known") or {}).items()):
            if "value" not in known or parse_known_key(key) is None:
                continue
            param, variant = parse_known_key(key)
            marks = [] if _fast(e, param) else [pytest.mark.slow]
            yield pytest.param(e, param, variant, known, id=f"{e['name']}-{key}", marks=marks)


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
    if not e.get("external"):  # included sets are their authors' to keep; ours carry hash and sizes
        assert instance_hash(path) == e["hash"], "file changed since the manifest was built"
    obj = _load(e)
    if e["kind"] == "plane":
        V, E, F = obj.number_of_vertices(), obj.number_of_edges(), obj.number_of_faces()
        if not e.get("external"):
            assert (V, E, F) == (e["vertices"], e["edges"], e["faces"])
        assert V - E + F == 2  # Euler's formula, R. Diestel, "Graph Theory", Springer, Thm. 4.2.9
    else:
        assert (obj.number_of_nodes(), obj.number_of_edges()) == (e["vertices"], e["edges"])
    for key, known in (e.get("known") or {}).items():
        assert parse_known_key(key) is not None, f"{key!r} names no parameter variant"
        assert known.get("source"), f"{key} value without a source"


# Platonic solids (V, E, F) -- H. S. M. Coxeter, "Regular Polytopes", Dover 1973, Table I
PLATONIC = {"tetrahedron": (4, 6, 4), "cube": (8, 12, 6), "octahedron": (6, 12, 8), "dodecahedron": (20, 30, 12), "icosahedron": (12, 30, 20)}


@pytest.mark.parametrize("name", sorted(PLATONIC))
def test_platonic_counts_and_duals(name):
    e = [x for x in ENTRIES if x["name"] == name][0]
    P = _load(e)
    assert (P.number_of_vertices(), P.number_of_edges(), P.number_of_faces()) == PLATONIC[name]
    # cube <-> octahedron, dodecahedron <-> icosahedron, tetrahedron self-dual (H. S. M. Coxeter, "Regular Polytopes", Dover 1973, Table I)
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


@pytest.mark.parametrize("e, param, variant, known", list(_cases()))
def test_known_value_is_recomputed(e, param, variant, known):
    obj = _load(e)
    # small instances run without a time limit: in this process, no child process to start
    limit = None if _fast(e, param) else 300
    # solve_object takes start/end curves and holes from the file, as the runner does
    opts = {**(e.get("options") or {}).get(param, {}), **variant}
    r = solve_object(obj, param, time_limit=limit, options=opts)
    width = check_object(r, obj)
    assert r.status == "optimal", r
    assert r.value == known["value"], known["source"]
    assert width == r.upper
