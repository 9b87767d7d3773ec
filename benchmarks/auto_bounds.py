"""What ``method='auto'`` gives on the instances of the bounds issue, before and after a change.

Usage::

    python benchmarks/auto_bounds.py                       # this checkout only
    python benchmarks/auto_bounds.py --old /tmp/old-main   # and an older checkout, same run
    python benchmarks/auto_bounds.py --only disk --limit 60

Each row runs in a fresh child process (``PYTHONPATH`` set to the checkout),
so the two codes never share compiled state; the seconds include loading the
compiled kernels.  Rows:

* weighted Delaunay disks (``generators.weighted_delaunay_disk(n, seed=1)``,
  boundary weight 1, interior 1..10), ``homology_width(P, time_limit=T)``;
* networkx's ``les_miserables_graph()``, unweighted and with its ``weight``
  attribute, ``cutwidth(G, time_limit=T)``;
* the 100 x 100 grid (cutwidth 101: Rolim, Sykora and Vrto, WG 1995; from
  memory), the complete binary tree of height 8 (cutwidth ceil(8/2) + 1 = 5:
  Lengauer 1982; from memory) and a random tree of 10^4 vertices
  (``nx.random_labeled_tree(10**4, seed=1)``), all ``cutwidth(G, time_limit=T)``.
"""

from __future__ import annotations

import argparse
import json
import os
import subprocess
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parents[1]

ROWS = {
    "disk 100 s1": "P = sw.generators.weighted_delaunay_disk(100, seed=1); r = sw.homology_width(P, time_limit=T)",
    "disk 200 s1": "P = sw.generators.weighted_delaunay_disk(200, seed=1); r = sw.homology_width(P, time_limit=T)",
    "disk 400 s1": "P = sw.generators.weighted_delaunay_disk(400, seed=1); r = sw.homology_width(P, time_limit=T)",
    "lesmis unweighted": "r = sw.cutwidth(nx.les_miserables_graph(), weight=None, time_limit=T)",
    "lesmis weighted": "r = sw.cutwidth(nx.les_miserables_graph(), time_limit=T)",
    "grid 100x100": "r = sw.cutwidth(nx.grid_2d_graph(100, 100), time_limit=T)",
    "bintree h=8": "r = sw.cutwidth(nx.balanced_tree(2, 8), time_limit=T)",
    "random tree 1e4": "r = sw.cutwidth(nx.random_labeled_tree(10**4, seed=1), time_limit=T)",
}

CHILD = """
import json, time, networkx as nx, sweepwidth as sw
T = {limit!r}
t0 = time.monotonic()
{code}
print(json.dumps({{"lower": r.lower, "upper": r.upper, "s": time.monotonic() - t0, "method": r.method}}))
"""


def run(root: str, code: str, limit: float) -> dict:
    env = dict(os.environ, PYTHONPATH=root)
    out = subprocess.run([sys.executable, "-c", CHILD.format(limit=limit, code=code)], env=env, cwd=root,
                         capture_output=True, text=True, timeout=limit * 3 + 120)
    if out.returncode != 0:
        return {"error": out.stderr.strip().splitlines()[-1] if out.stderr.strip() else f"exit {out.returncode}"}
    return json.loads(out.stdout.strip().splitlines()[-1])


def cell(d: dict | None) -> str:
    if d is None:
        return ""
    if "error" in d:
        return "error: " + d["error"][:40]
    lo, up = d["lower"], d["upper"]
    gap = 100.0 * (up - lo) / up if up else 0.0
    return f"[{lo:g}, {up:g}] {gap:4.1f}% {d['s']:5.1f}s"


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--old", help="an older checkout to run beside this one")
    ap.add_argument("--new", default=str(HERE), help="the checkout in the 'after' column (default: this one)")
    ap.add_argument("--limit", type=float, default=60.0, help="time limit per call (s)")
    ap.add_argument("--only", help="comma-separated substrings of row names")
    ap.add_argument("--out", help="also write the table to this file")
    a = ap.parse_args()
    names = [k for k in ROWS if not a.only or any(s in k for s in a.only.split(","))]
    lines = [f"{'instance':18s} {'before':32s} {'after':32s}" if a.old else f"{'instance':18s} {'after':32s}"]
    print(lines[0], flush=True)
    for k in names:
        old = run(a.old, ROWS[k], a.limit) if a.old else None
        new = run(a.new, ROWS[k], a.limit)
        line = f"{k:18s} {cell(old):32s} {cell(new):32s}" if a.old else f"{k:18s} {cell(new):32s}"
        if "method" in new:
            line += f" {new['method']}"
        print(line, flush=True)
        lines.append(line)
    if a.out:
        Path(a.out).write_text("\n".join(lines) + "\n")


if __name__ == "__main__":
    main()
