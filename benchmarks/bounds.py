"""Bounds at scale: lower, upper, gap and seconds, now and before the bounds work, in one run.

Usage::

    python benchmarks/bounds.py                     # the full table: 60 s per call (hours on 2 cores)
    python benchmarks/bounds.py --quick             # 10 s per call, one seed, fewer rows
    python benchmarks/bounds.py --quick --only disk-100,lesmis
    python benchmarks/bounds.py --time-limit 30 --out table.txt

Rows
----
* ``disk-N-sS``: ``generators.weighted_delaunay_disk(N, seed=S)`` (light
  boundary, heavy interior) for N = 100, 200, 400, 1000 and S = 1, 2, 3:
  homology sweep width and homotopy height from the outer boundary to a point.
* ``lesmis`` / ``lesmis-w``: networkx's ``les_miserables_graph()`` (77
  vertices, 254 edges), cutwidth with unit weights and with its co-occurrence
  weights.
* ``grid-100``: the 100 x 100 grid graph, cutwidth (the known value is 101:
  m + 1 for P_m x P_n, Rolim, Sykora and Vrto, WG 1995; from memory).
* ``hypercube-6``: the hypercube Q_6 (64 vertices), cutwidth 42 =
  floor(2^7 / 3) (Harper's edge-isoperimetric theorem, J. SIAM 1964; from
  memory); ``grid-16``: the 16 x 16 grid, cutwidth 17 (Rolim, Sykora and
  Vrto, as above).
* ``bintree-8``: the complete binary tree of height 8 (cutwidth
  ceil(h/2) + 1 = 5, Lengauer 1982; from memory); ``tree-10k``: a uniformly
  random labelled tree on 10^4 vertices (networkx ``random_labeled_tree``, seed 1).

Columns
-------
For each row and parameter: the current code ("new") and the code as it was
before the bounds work (commit ``8908aee``, "old"; ``--baseline COMMIT``
names another one), each in its own child
process with the same time limit per parameter.  The instance is built here
by the current code and handed to both as a JSON file (``sweepwidth.write``
/ ``read``; the old code has no ``weighted_delaunay_disk``).  The old code is
exported with ``git archive 8908aee sweepwidth`` into a temporary directory
that goes first on the child's ``PYTHONPATH``.

New homology and homotopy rows are solved together by
:func:`sweepwidth.solve_parameters` with twice the limit for the pair (each
parameter gets about the limit a lone call gets; the pair shares bounds and
witnesses); the old code solves them one after the other with the limit each.
``gap`` is ``(upper - lower) / upper`` in per cent; ``gap ratio`` is the old
gap over the new one (``inf`` when the new gap is 0 and the old one is not).
"""

from __future__ import annotations

import argparse
import json
import math
import os
import subprocess
import sys
import tempfile
import time
from typing import Any, Callable

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(HERE)
sys.path.insert(0, ROOT)

BASELINE_COMMIT = "8908aee"

# the child: reads a JSON instance, runs the asked parameters, prints one JSON line per parameter
CHILD = r"""
import json, sys, time
import sweepwidth as sw
path, params, limit, joint = sys.argv[1], sys.argv[2].split(","), float(sys.argv[3]), sys.argv[4] == "1"
obj = sw.read(path)
out = {}
if joint and hasattr(sw, "solve_parameters") and {"homology", "homotopy"} <= set(params):
    t = time.monotonic()
    res = sw.solve_parameters(obj, ["homology", "homotopy"], time_limit=2 * limit)
    wall = time.monotonic() - t
    for p, r in res.items():
        out[p] = {"lower": r.lower, "upper": r.upper, "seconds": r.seconds, "wall_pair": wall}
    params = [p for p in params if p not in res]
for p in params:
    t = time.monotonic()
    if p == "cutwidth":
        r = sw.cutwidth(obj, time_limit=limit)
    elif p == "homology":
        r = sw.homology_width(obj, time_limit=limit)
    else:
        r = sw.homotopy_height(obj, time_limit=limit)
    out[p] = {"lower": r.lower, "upper": r.upper, "seconds": time.monotonic() - t, "method": r.method}
print("RESULT " + json.dumps(out), flush=True)
"""


def _rows(quick: bool) -> list[tuple[str, Callable[[], Any], list[str]]]:
    import networkx as nx

    from sweepwidth import generators

    rows: list[tuple[str, Callable[[], Any], list[str]]] = []
    sizes = (100, 200) if quick else (100, 200, 400, 1000)
    seeds = (1,) if quick else (1, 2, 3)
    for n in sizes:
        for s in seeds:
            rows.append((f"disk-{n}-s{s}", (lambda n=n, s=s: generators.weighted_delaunay_disk(n, seed=s)),
                         ["homology", "homotopy"]))

    def lesmis(weighted: bool) -> Any:
        G = nx.les_miserables_graph()
        H = nx.Graph()
        H.add_nodes_from(G.nodes)
        for u, v, d in G.edges(data=True):
            H.add_edge(u, v, weight=float(d.get("weight", 1)) if weighted else 1.0)
        return H

    rows.append(("lesmis", lambda: lesmis(False), ["cutwidth"]))
    rows.append(("lesmis-w", lambda: lesmis(True), ["cutwidth"]))
    rows.append(("hypercube-6", lambda: nx.convert_node_labels_to_integers(nx.hypercube_graph(6)), ["cutwidth"]))
    rows.append(("grid-16", lambda: nx.convert_node_labels_to_integers(nx.grid_2d_graph(16, 16)), ["cutwidth"]))
    if not quick:
        rows.append(("grid-100", lambda: nx.convert_node_labels_to_integers(nx.grid_2d_graph(100, 100)), ["cutwidth"]))
    rows.append(("bintree-8", lambda: nx.balanced_tree(2, 8), ["cutwidth"]))
    rows.append(("tree-10k", lambda: nx.random_labeled_tree(10_000, seed=1), ["cutwidth"]))
    return rows


def _export_old(tmp: str, commit: str = BASELINE_COMMIT) -> str:
    dest = os.path.join(tmp, "old")
    os.makedirs(dest)
    archive = subprocess.run(["git", "-C", ROOT, "archive", commit, "sweepwidth"], check=True,
                             capture_output=True).stdout
    subprocess.run(["tar", "-x", "-C", dest], input=archive, check=True)
    return dest


def _run_child(pythonpath: str, path: str, params: list[str], limit: float, joint: bool) -> dict:
    env = dict(os.environ, PYTHONPATH=pythonpath)
    cap = 4 * limit * max(1, len(params)) + 120
    try:
        p = subprocess.run([sys.executable, "-c", CHILD, path, ",".join(params), str(limit), "1" if joint else "0"],
                           capture_output=True, text=True, env=env, cwd=tempfile.gettempdir(), timeout=cap)
    except subprocess.TimeoutExpired:
        return {q: {"error": f"no answer in {cap:.0f} s"} for q in params}
    for line in p.stdout.splitlines():
        if line.startswith("RESULT "):
            return json.loads(line[len("RESULT "):])
    err = (p.stderr.strip().splitlines() or ["no output"])[-1]
    return {q: {"error": err[:80]} for q in params}


def _gap(d: dict) -> float | None:
    lo, up = d.get("lower"), d.get("upper")
    if lo is None or up is None or up == 0:
        return None
    return 100.0 * (up - lo) / up


def _cell(d: dict) -> list[str]:
    if "error" in d:
        return ["-", "-", "-", "-"]
    g = _gap(d)
    return [f"{d['lower']:g}" if d.get("lower") is not None else "-",
            f"{d['upper']:g}" if d.get("upper") is not None else "-",
            "-" if g is None else f"{g:.1f}", f"{d['seconds']:.1f}"]


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true", help="10 s per call, one seed, n <= 200, no 100x100 grid")
    ap.add_argument("--time-limit", type=float, default=None, help="seconds per call (default 60, 10 with --quick)")
    ap.add_argument("--only", default=None, help="comma list of row-name prefixes (e.g. disk-100,lesmis)")
    ap.add_argument("--no-baseline", action="store_true", help="skip the old code's rows")
    ap.add_argument("--baseline", default=BASELINE_COMMIT, help=f"commit of the old code (default {BASELINE_COMMIT})")
    ap.add_argument("--out", default=None, help="also write the table to this file")
    args = ap.parse_args(argv)
    limit = args.time_limit if args.time_limit is not None else (10.0 if args.quick else 60.0)
    rows = _rows(args.quick)
    if args.only:
        keys = [k.strip() for k in args.only.split(",") if k.strip()]
        rows = [r for r in rows if any(r[0] == k or r[0].startswith(k + "-") or r[0].startswith(k) for k in keys)]
    import sweepwidth as sw

    header = ["row", "param", "new lo", "new up", "new gap%", "new s", "old lo", "old up", "old gap%", "old s", "gap ratio"]
    table: list[list[str]] = []
    with tempfile.TemporaryDirectory() as tmp:
        old = None if args.no_baseline else _export_old(tmp, args.baseline)
        for name, build, params in rows:
            obj = build()
            path = os.path.join(tmp, f"{name}.json")
            sw.write(obj, path)
            t = time.monotonic()
            new = _run_child(ROOT, path, params, limit, joint=True)
            base = {} if old is None else _run_child(old, path, params, limit, joint=False)
            for p in params:
                n, o = new.get(p, {"error": "missing"}), base.get(p, {"error": "not run"})
                gn, go = _gap(n), _gap(o)
                if gn is None or go is None:
                    ratio = "-"
                elif gn == 0:
                    ratio = "inf" if go > 0 else "1"
                else:
                    ratio = f"{go / gn:.2f}"
                table.append([name, p, *_cell(n), *_cell(o), ratio])
            print(f"# {name}: {time.monotonic() - t:.0f} s", file=sys.stderr, flush=True)
    widths = [max(len(h), *(len(r[i]) for r in table)) if table else len(h) for i, h in enumerate(header)]
    lines = ["  ".join(h.ljust(w) for h, w in zip(header, widths)), "  ".join("-" * w for w in widths)]
    lines += ["  ".join(c.ljust(w) for c, w in zip(r, widths)) for r in table]
    text = "\n".join(lines)
    print(f"time limit {limit:g} s per parameter; baseline commit {args.baseline}")
    print(text)
    if args.out:
        with open(args.out, "w") as fh:
            fh.write(text + "\n")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
