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


LEASH = os.path.join(ROOT, "instances", "leashes", "backstep-delaunay-1037.json")


def test_draw_width_writes_leash_pictures(capsys, tmp_path):
    # regression: 'draw --param width' first called the width solver without its two walks (an internal
    # TypeError), then refused with "not drawn yet"; now it draws leash pictures like the other parameters
    import matplotlib

    matplotlib.use("Agg")
    from PIL import Image

    from sweepwidth.draw._cli import NOT_DRAWN

    assert "width" not in NOT_DRAWN
    rc, out, err = _run(capsys, "draw", LEASH, "--param", "width", "-o", tmp_path / "w.png")
    assert rc == 0, err
    with Image.open(tmp_path / "w.png") as im:
        assert im.size == (1100, 520)  # the still: the longest leash beside the profile (11 x 5.2 in at 100 dpi)
    # a saved result: a sheet of frames and a GIF, nothing solved again
    rc, out, err = _run(capsys, "solve", LEASH, "--param", "width", "--save", tmp_path / "res")
    assert rc == 0, err
    saved = tmp_path / "res" / "backstep-delaunay-1037.width.json"
    rc, out, err = _run(capsys, "draw", LEASH, "--result", saved, "--frames", "5", "-o", tmp_path / "f.svg")
    assert rc == 0, err
    assert (tmp_path / "f.svg").read_text().count("leash length") == 5  # one title per frame
    rc, out, err = _run(capsys, "draw", LEASH, "--result", saved, "--frames", "4", "-o", tmp_path / "w.gif")
    assert rc == 0, err
    with Image.open(tmp_path / "w.gif") as im:
        assert im.n_frames == 4
    # the walks by name and backward steps reach the solve (width 5 with backward steps: instances/leashes/manifest.json)
    rc, out, err = _run(capsys, "draw", LEASH, "--param", "width", "--walks", "a,b", "--backward", "--frames", "3",
                        "-o", tmp_path / "b.svg")
    assert rc == 0, err
    assert "width 5 (optimal)" in (tmp_path / "b.svg").read_text()


def test_draw_width_bad_input_is_named(capsys, tmp_path):
    def refused(*argv):
        rc, out, err = _run(capsys, "draw", *argv)
        assert rc != 0 and "internal error" not in err, err
        return err

    rc, out, err = _run(capsys, "solve", PAVILION, "--param", "homology", "--save", tmp_path / "res")
    assert rc == 0, err
    other = tmp_path / "res" / "pavilion.homology.json"
    assert "the result is about 'homology', not 'width'" in refused(PAVILION, "--param", "width", "--result", other,
                                                                    "-o", tmp_path / "x.png")
    # the pavilion stores no walks: the message says how to give them
    assert "width needs two walks" in refused(PAVILION, "--param", "width", "-o", tmp_path / "x.png")
    assert "no curve named 'zz' for b" in refused(LEASH, "--param", "width", "--walks", "a,zz", "-o", tmp_path / "x.png")
    assert "--walks applies to --param width only" in refused(PAVILION, "--param", "homology", "--walks", "a,b",
                                                              "-o", tmp_path / "x.png")
    assert "--backward does not apply with --result" in refused(PAVILION, "--result", other, "--backward",
                                                                "-o", tmp_path / "x.png")
    assert not list(tmp_path.glob("x.*"))


def test_draw_after_the_facade_function_was_looked_up(tmp_path, capsys):
    # regression: once ``sweepwidth.draw`` (the facade's draw function) had been read, the CLI's
    # ``import sweepwidth.draw as m`` got the function and said "drawing ... not available"
    assert callable(sw.draw)
    rc, out, err = _run(capsys, "draw", PAVILION, "--frames", "4", "-o", tmp_path / "p.png")
    assert rc == 1 and "--frames does not apply" in err
    rc, out, err = _run(capsys, "draw", PAVILION, "-o", tmp_path / "p.png")
    assert rc == 0 and (tmp_path / "p.png").exists(), err
