"""End-to-end: ``sweepwidth bench --param width`` on instance files that store their walks.

The instances of ``instances/leashes`` carry their walks and leashes under
``curves`` and their exact widths under ``known`` (found by the exact search
and replayed by the checker; the manifest names the source).  The bench run
must solve each, compare with the known value (verdict), store the witness
in the results database, and the exported witness must replay through the
independent checker to the same width.
"""

from __future__ import annotations

import json
import os
import shutil
import subprocess
import sys

import pytest

import sweepwidth as sw

LEASHES = os.path.join(os.path.dirname(os.path.dirname(os.path.abspath(__file__))), "instances", "leashes")
NAMES = ("frechet-gap-delaunay-0", "backstep-delaunay-1037")


def _run(*args, timeout=300):
    p = subprocess.run([sys.executable, "-m", "sweepwidth", *map(str, args)], capture_output=True, text=True,
                       timeout=timeout)
    return p.returncode, p.stdout, p.stderr


def _known(name, key):
    with open(os.path.join(LEASHES, "manifest.json"), encoding="utf-8") as fh:
        return [e for e in json.load(fh)["instances"] if e["name"] == name][0]["known"][key]["value"]


@pytest.mark.parametrize("extra, key", [([], "width"), (["--backward"], "width_backward")])
def test_bench_width_on_files_with_walks(tmp_path, extra, key):
    folder = tmp_path / "set"
    folder.mkdir()
    for name in NAMES:
        shutil.copy(os.path.join(LEASHES, name + ".json"), folder / (name + ".json"))
    db = tmp_path / "runs.sqlite"
    rc, out, err = _run("bench", folder, "--param", "width", "--walks", "a,b", "--leashes", "start,end", *extra,
                        "--time-limit", "30", "--db", db)
    assert rc == 0, err
    assert "2 task(s) run, 0 skipped" in out
    rc, out, err = _run("export", "--db", db, "--format", "jsonl", "--param", "width")
    assert rc == 0, err
    rows = [json.loads(line) for line in out.splitlines() if line.strip()]
    assert len(rows) == 2
    for row in rows:
        name = row["name"]
        want = _known(name, key)
        res = sw.Result.from_dict(row["result"])
        assert res.parameter == "width" and res.status == "optimal" and res.value == want, row
        assert res.stats["options"]["backward"] is bool(extra)
        P = sw.read(str(folder / (name + ".json")))
        assert res.check(P) == want  # the stored witness replays through the checker
        assert row["verdict"] == "agrees", row  # the known value of the file (its key for these options) was read
