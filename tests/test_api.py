"""The public interface that users and outside checks rely on (the names in ``sweepwidth.__all__``)."""

import importlib

import pytest

import sweepwidth as sw

# names promised in README.md and the docstring of sweepwidth; renaming one needs an issue note
PUBLIC = [
    "PlaneGraph",
    "read",
    "write",
    "draw",
    "cutwidth",
    "homology_width",
    "homotopy_height",
    "Result",
    "SweepwidthError",
    "InvalidEmbeddingError",
    "NonPlanarError",
    "CrossingEdgesError",
    "WeightError",
    "FileFormatError",
    "UnsupportedOptionError",
]


@pytest.mark.parametrize("name", PUBLIC)
def test_public_name_resolves(name):
    assert name in sw.__all__
    obj = getattr(sw, name)
    assert obj is not None


def test_errors_subclass_builtins():
    # errors.py: library errors also subclass the matching builtin (DEVELOPERS.md, conventions)
    assert issubclass(sw.WeightError, ValueError)
    assert issubclass(sw.FileFormatError, ValueError)
    assert issubclass(sw.NonPlanarError, sw.InvalidEmbeddingError)
    assert issubclass(sw.CrossingEdgesError, sw.SweepwidthError)


def test_result_fields_and_round_trip():
    r = sw.Result("cutwidth", "optimal", 3, 3, 3, witness=[2, 0, 1], method="dp", seconds=0.1, stats={"n": 3})
    for field in ("status", "value", "lower", "upper", "witness", "method", "seconds", "stats"):
        assert hasattr(r, field)
    assert sw.Result.from_dict(r.to_dict()) == r
    with pytest.raises(ValueError):
        sw.Result("cutwidth", "optimal", None, 1, 1)
    with pytest.raises(ValueError):
        sw.Result("cutwidth", "bounded", None, 5, 4)


def test_unknown_attribute():
    with pytest.raises(AttributeError):
        sw.no_such_thing  # noqa: B018


def test_facades_import():
    for mod in ("sweepwidth.plane", "sweepwidth.verify", "sweepwidth.solve", "sweepwidth.problems"):
        importlib.import_module(mod)
