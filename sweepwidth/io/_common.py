"""Helpers shared by the readers and writers: labels, size caps, error wrapping."""

from __future__ import annotations

import copy
import math
import os
from typing import Any, Hashable, NoReturn

from ..errors import FileFormatError, InvalidArgumentError, SweepwidthError

__all__ = [
    "MAX_VERTICES",
    "MAX_EDGES",
    "encode_label",
    "decode_label",
    "fail",
    "located",
    "path_name",
]

#: Hard caps on declared sizes, checked before anything is allocated.
MAX_VERTICES = 10_000_000
MAX_EDGES = 30_000_000


def path_name(path: Any) -> str | None:
    """The file name to show in messages (None for in-memory text)."""
    if path is None:
        return None
    try:
        return os.fspath(path)
    except TypeError:
        return str(path)


def fail(message: str, *, path: Any = None, line: int | None = None, offset: int | None = None) -> NoReturn:
    """Raise FileFormatError with the file and the position."""
    raise FileFormatError(message, path=path_name(path), line=line, offset=offset)


def located(err: SweepwidthError, path: Any, where: str | None = None) -> SweepwidthError:
    """A copy of ``err`` (same class, same attributes) whose message starts with the file and place.

    Used when a plane graph built from a file is rejected (bad rotation,
    weights, crossings): the error keeps its specific class and tells the
    user which file, and which part of it, to look at.
    """
    if isinstance(err, FileFormatError):
        return err
    prefix = ", ".join(x for x in (path_name(path), where) if x)
    if not prefix:
        return err
    new = copy.copy(err)
    new.args = (f"{prefix}: {err}",) + tuple(err.args[1:])
    return new


_SCALARS = (str, int, float, bool, type(None))

#: deepest nesting of arrays accepted in a label (guards the recursion)
MAX_LABEL_DEPTH = 32


def encode_label(v: Hashable, where: str = "vertex label", _depth: int = 0) -> Any:
    """A JSON value for a vertex label: tuples become arrays, recursively.

    Strings, integers, finite floats, booleans and None are kept; anything
    else raises SweepwidthError.
    """
    if isinstance(v, tuple):
        if _depth >= MAX_LABEL_DEPTH:
            raise InvalidArgumentError(f"{where} nests tuples more than {MAX_LABEL_DEPTH} deep")
        return [encode_label(x, where, _depth + 1) for x in v]
    if isinstance(v, float) and not math.isfinite(v):
        raise InvalidArgumentError(f"{where} {v!r} is not finite and cannot be written to JSON")
    if isinstance(v, _SCALARS):
        return v
    try:
        import numpy as np

        if isinstance(v, np.integer):
            return int(v)
        if isinstance(v, np.floating):
            return encode_label(float(v), where)
    except ImportError:  # pragma: no cover
        pass
    raise InvalidArgumentError(
        f"{where} {v!r} of type {type(v).__name__} cannot be written; labels must be str, int, float, "
        "bool, None or tuples of these"
    )


def decode_label(x: Any, *, path: Any = None, where: str = "vertex label", _depth: int = 0) -> Hashable:
    """The label for a JSON value: arrays become tuples, recursively (at most 32 levels)."""
    if isinstance(x, list):
        if _depth >= MAX_LABEL_DEPTH:
            fail(f"{where} nests arrays more than {MAX_LABEL_DEPTH} deep", path=path)
        return tuple(decode_label(y, path=path, where=where, _depth=_depth + 1) for y in x)
    if isinstance(x, float) and not math.isfinite(x):
        fail(f"{where} is {x!r}; expected a finite number, a string or an array", path=path)
    if isinstance(x, _SCALARS):
        return x
    kind = "an object" if isinstance(x, dict) else f"a {type(x).__name__}"
    fail(f"{where} is {kind}; expected a string, number, boolean, null or array", path=path)
