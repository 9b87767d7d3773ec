"""Regression tests of ``sweepwidth convert``: no data is dropped silently."""

from __future__ import annotations

import os

import pytest

import sweepwidth as sw
from sweepwidth.cli import main
from sweepwidth.io import lost_in
from cli_helpers import run_cli

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
PAVILION = os.path.join(ROOT, "instances", "demo", "pavilion.json")


_run = run_cli


@pytest.mark.parametrize(
    "ext, needles",
    [
        ("off", ["edge weights", "vertex names", "face names"]),
        ("obj", ["edge weights", "vertex names"]),
        ("plc", ["edge weights", "the choice of outer face", "vertex positions"]),
        ("gr", ["the embedding", "vertex positions"]),
    ],
)
def test_convert_refuses_to_drop_data_without_force(tmp_path, capsys, ext, needles):
    # regression: the pavilion converted to .off/.obj/planar code lost its weights and outer face
    # (homology 7 instead of 59) and to .gr its embedding, without a word
    target = tmp_path / f"pavilion.{ext}"
    rc, out, err = _run(capsys, "convert", PAVILION, target)
    assert rc == 1 and not target.exists()
    assert all(n in err for n in needles), err
    assert "--force" in err
    rc, out, err = _run(capsys, "convert", PAVILION, target, "--force")
    assert rc == 0 and target.exists()
    assert err.startswith("sweepwidth: warning: ") and all(n in err for n in needles)


def test_what_is_lost_is_really_lost(tmp_path):
    P = sw.read(PAVILION)
    path = tmp_path / "p.off"
    sw.write(P, str(path))
    Q = sw.read(str(path))
    # the pavilion's edges have weights other than 1; OFF keeps faces only
    assert sorted(e.weight for e in P.edges) != sorted(e.weight for e in Q.edges)
    assert "edge weights" in lost_in(P, "off")


def test_lossless_conversions_pass_quietly(tmp_path, capsys):
    rc, out, err = _run(capsys, "convert", PAVILION, tmp_path / "copy.json")
    assert rc == 0 and err == ""
    assert lost_in(sw.read(PAVILION), "json") == []
    cube = os.path.join(ROOT, "instances", "platonic", "cube.json")
    rc, out, err = _run(capsys, "convert", cube, tmp_path / "cube.graphml")
    assert rc == 0 and "provenance" in err  # documentary data: a warning, no refusal
