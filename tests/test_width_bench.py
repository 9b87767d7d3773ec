"""End-to-end: ``sweepwidth bench --param width`` on instance files that store their walks.

The instances of ``instances/leashes`` carry their walks and leashes under
``curves``; the set's manifest holds their exact widths (found by the exact
search and replayed by the checker; the manifest names the source).  The
bench run must solve each, agree with the known value (verdict), store the
witness in the results database, and the exported witness must replay
through the independent checker to the same width.
"""

from __future__ import annotations

import json
import os
import subprocess
import sys

import pytest

import sweepwidth as sw

LEASHES = os.path.join(os.path.dirname(os.path.dirname(os.path.abspath(__file__))), "instances", "leashes")
NAMES = ("frechet-gap-delaunay-0", "reflip-delaunay-1010", "backstep-delaunay-1037")


def _run(*args, timeout=300):
    p = subprocess.run([sys.executable, "-m", "sweepwidth", *map(str, args)], capture_output=True, text=True,
                       timeout=timeout)
    return p.returncode, p.stdout, p.stderr


def _known(name, key):
    with open(os.path.join(LEASHES, "manifest.json"), encoding="utf-8") as fh:
        return [e for e in json.load(fh)["instances"] if e["name"] == name][0]["known"][key]["value"]


@pytest.mark.parametrize("extra, key", [([], "width"), (["--backward"], "width_backward")])
def test_bench_width_on_the_leash_set(tmp_path, extra, key):
    # the set's manifest gives the known values (key 'width' or 'width_backward' for these options)
    db = tmp_path / "runs.sqlite"
    rc, out, err = _run("bench", LEASHES, "--param", "width", "--walks", "a,b", "--leashes", "start,end", *extra,
                        "--time-limit", "30", "--db", db)
    assert rc == 0, err
    assert f"{len(NAMES)} task(s) run, 0 skipped" in out
    rc, out, err = _run("export", "--db", db, "--format", "jsonl", "--param", "width")
    assert rc == 0, err
    rows = [json.loads(line) for line in out.splitlines() if line.strip()]
    assert sorted(r["name"] for r in rows) == sorted(NAMES)
    for row in rows:
        name = row["name"]
        want = _known(name, key)
        res = sw.Result.from_dict(row["result"])
        assert res.parameter == "width" and res.status == "optimal" and res.value == want, row
        assert res.stats["options"]["backward"] is bool(extra)
        assert row["verdict"] == "agrees", row
        P = sw.read(os.path.join(LEASHES, name + ".json"))
        assert res.check(P) == want  # the stored witness replays through the checker


def test_bench_width_needs_walks_for_files_without_them(tmp_path):
    # a plain grid file has no curves: the width task fails with an error naming the missing curve,
    # and the run itself goes on (one failed task in the summary)
    path = tmp_path / "grid.json"
    sw.write(sw.generators.grid(3, 3), str(path))
    rc, out, err = _run("bench", path, "--param", "width", "--walks", "a,b", "--time-limit", "5",
                        "--db", tmp_path / "r.sqlite")
    assert rc == 0, err
    assert "no curve named 'a" in out
    summary = [line.split() for line in out.splitlines() if line.startswith("width ")]
    assert summary and summary[-1][:6] == ["width", "auto", "1", "0", "0", "1"]
