"""Regression tests of ``sweepwidth check``: it says what it verified and refuses claims it can disprove."""

from __future__ import annotations

import json
import math
import os
import random

import networkx as nx
import pytest

import sweepwidth as sw
from sweepwidth import generators as gen
from sweepwidth.bench.hashing import instance_hash
from sweepwidth.cli import main
from sweepwidth.io.saved import digest, saved_result, write_saved
from sweepwidth.result import Result
from cli_helpers import run_cli


_run = run_cli


@pytest.fixture()
def grid(tmp_path):
    path = tmp_path / "grid.json"
    sw.write(gen.grid(3, 4), str(path))  # cw(P3 x P4) = 4 (Rolim, Sykora, Vrto, WG 1995; from memory)
    return path


def _bad_ordering(path):
    """An ordering of the grid much wider than its cutwidth 4, and its width by the checker."""
    P = sw.read(str(path))
    G = P.to_networkx()
    rng = random.Random(1)
    best = None
    for _ in range(50):
        order = list(G.nodes())
        rng.shuffle(order)
        # the width of an ordering straight from the definition: the most edges across a prefix cut
        w = max(sum((u in order[:i]) != (v in order[:i]) for u, v in G.edges()) for i in range(1, len(order)))
        if best is None or w > best[1]:
            best = (order, w)
    assert best[1] >= 7
    return best


def _forge(path, tmp_path, result, name="forged.json", edit=None):
    doc = saved_result(str(path), instance_hash(str(path)), result, {})
    if edit is not None:
        edit(doc)
        doc["digest"] = digest({k: doc[k] for k in ("instance", "options", "result")})  # an unkeyed hash: anyone can redo it
    target = tmp_path / name
    write_saved(doc, str(target), str(path))
    return target


def test_check_says_what_it_verified_and_recompute_refuses_a_false_optimum(grid, tmp_path, capsys):
    # regression: a 'bounded' result edited to 'optimal [w, w]' with its digest recomputed was "ok" and "consistent"
    order, w = _bad_ordering(grid)
    forged = _forge(grid, tmp_path, Result("cutwidth", "optimal", w, w, w, witness=order, method="bnb"))
    rc, out, _ = _run(capsys, "check", forged)
    assert rc == 0
    assert f"width {w:g}, so the upper bound {w:g} holds" in out
    assert "not verified" in out and "'optimal' are the solver's claim" in out
    rc, out, _ = _run(capsys, "check", forged, "--recompute", "--time-limit", "10")
    assert rc == 1, out
    assert "REFUSED" in out and "below the claimed optimal value" in out


def test_recompute_confirms_a_true_optimum(grid, tmp_path, capsys):
    saved = tmp_path / "good.json"
    assert _run(capsys, "solve", grid, "-o", saved)[0] == 0
    rc, out, _ = _run(capsys, "check", saved, "--recompute", "--time-limit", "10")
    assert rc == 0 and "re-derived: the optimal value 4 is confirmed" in out


@pytest.mark.parametrize(
    "edit, needle",
    [
        (lambda d: d["result"].update(lower=math.nan), "NaN"),
        (lambda d: d["result"].update(parameter="homotopy"), "homotopy witness"),
        (lambda d: d["result"].update(parameter="girth"), "parameter 'girth'"),
        (lambda d: d["result"].pop("status"), "no 'status'"),
        (lambda d: d["result"].pop("upper"), "no 'upper'"),
        (lambda d: d["result"].update(lower=9), "above its upper bound"),
        (lambda d: d["result"].update(status="bounded", lower="x"), "not a number"),
    ],
)
def test_bad_saved_files_give_one_clear_line(grid, tmp_path, capsys, edit, needle):
    # regression: a NaN lower bound was accepted, a changed parameter gave an internal TypeError
    res = sw.cutwidth(sw.read(str(grid)).to_networkx())
    forged = _forge(grid, tmp_path, res, edit=edit)
    rc, out, err = _run(capsys, "check", forged)
    assert rc == 1 and "internal error" not in err
    lines = [l for l in out.splitlines() if "REFUSED" in l]
    assert len(lines) == 1 and needle in lines[0], out


def test_check_says_height_for_a_homotopy(tmp_path, capsys):
    path = tmp_path / "tri.json"
    sw.write(gen.triangulated_grid(2), str(path))
    saved = tmp_path / "tri.homotopy.json"
    assert _run(capsys, "solve", path, "--param", "homotopy", "-o", saved)[0] == 0
    rc, out, _ = _run(capsys, "check", saved)
    assert rc == 0 and "with height" in out and "width" not in out.split("replays", 1)[1].split("\n")[0]
