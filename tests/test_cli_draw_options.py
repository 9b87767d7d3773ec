"""Regression tests of ``sweepwidth draw`` options and labels."""

from __future__ import annotations

import os

import pytest

pytest.importorskip("matplotlib")

import sweepwidth as sw
from sweepwidth.cli import main
from cli_helpers import run_cli

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
PAVILION = os.path.join(ROOT, "instances", "demo", "pavilion.json")


_run = run_cli


def test_frames_without_a_sweep_is_refused(tmp_path, capsys):
    # regression: draw --frames without --param was silently ignored
    rc, out, err = _run(capsys, "draw", PAVILION, "--frames", "4", "-o", tmp_path / "p.png")
    assert rc == 1 and "--frames does not apply" in err


def test_draw_takes_a_time_limit(tmp_path, capsys, monkeypatch):
    # regression: draw --param solved with a fixed 10 s
    import sweepwidth.draw._cli as dcli

    seen = []
    real = dcli._solve
    monkeypatch.setattr(dcli, "_solve", lambda obj, p, dual, limit=10.0: seen.append(limit) or real(obj, p, dual, limit))
    rc, out, err = _run(capsys, "draw", PAVILION, "--param", "homology", "--time-limit", "3", "-o", tmp_path / "p.png")
    assert rc == 0, err
    assert seen == [3.0]
    rc, out, err = _run(capsys, "draw", PAVILION, "--time-limit", "3", "-o", tmp_path / "q.png")
    assert rc == 1 and "--time-limit does not apply" in err


def test_faces_are_labelled_with_the_instance_names(tmp_path):
    # regression: the pavilion's rooms were labelled f0-f7
    import matplotlib

    matplotlib.use("Agg")
    from sweepwidth.draw._draw import draw

    P = sw.read(PAVILION)
    ax = draw(P, face_labels=True)
    texts = {t.get_text().replace("\n", " ") for t in ax.texts}
    assert {"Main Hall", "Reading Nook", "Cloakroom"} <= texts  # from the "rooms" of instances/demo/pavilion.json
    assert not any(t.startswith("f") and t[1:].isdigit() and int(t[1:]) in P.meta["rooms"].values() for t in texts)


def test_profile_legend_and_axis_use_one_word(tmp_path):
    import matplotlib

    matplotlib.use("Agg")
    from sweepwidth.draw._profile import width_profile

    P = sw.read(PAVILION)
    r = sw.cutwidth(P.to_networkx(), time_limit=10)
    ax = width_profile(r, P.to_networkx())
    labels = [t.get_text() for t in ax.get_legend().get_texts()]
    assert ax.get_ylabel() == "cut weight" and "cut weight at step" in labels
    assert not any("length" in l for l in labels)


def test_draw_width_says_it_has_no_picture_yet(capsys, tmp_path):
    # regression: 'draw --param width' called the width solver without its two walks (an internal TypeError)
    inst = os.path.join(os.path.dirname(os.path.dirname(os.path.abspath(__file__))), "instances", "leashes",
                        "backstep-delaunay-1037.json")
    rc, out, err = _run(capsys, "draw", inst, "--param", "width", "-o", tmp_path / "w.png")
    assert rc != 0
    assert "not drawn yet" in err and "internal error" not in err
