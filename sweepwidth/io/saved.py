"""Saved results: the file ``sweepwidth solve --save`` writes and ``check`` and ``draw`` read.

Format
------
One JSON object per result::

    {"format": "sweepwidth-saved-result", "version": 1,
     "instance": {"path": "/abs/path/grid.json", "hash": "<content hash>"},
     "options": {...},                  # the parameter options used
     "result": {...},                   # Result.to_dict()
     "sweepwidth": "0.1.0",
     "digest": "<digest of instance, options and result>",
     "instance_from_here": "../grid.json"}

``digest`` is :func:`digest` of the three fields ``instance``, ``options``
and ``result``: a SHA-256 of their canonical JSON (keys sorted, no
whitespace, UTF-8, whole floats written as integers), so re-indenting the
file keeps it valid while any edit of a bound or witness is detected.
``instance_from_here`` (where the instance is seen from the result file)
is outside the digest, so moving both files together keeps the result
valid.  A reader looks for the instance at ``instance_from_here`` first,
then at the absolute path.

The same canonical JSON keys the benchmark database
(:mod:`sweepwidth.bench.hashing`).

References
----------
.. [1] T. Bray (ed.), "The JavaScript Object Notation (JSON) Data Interchange
   Format", RFC 8259, IETF (2017).
.. [2] NIST, "Secure Hash Standard (SHS)", FIPS PUB 180-4 (2015).

See Also
--------
sweepwidth.result.Result.to_dict, sweepwidth.result.Result.from_dict
"""

from __future__ import annotations

import hashlib
import json
import math
import os
from typing import Any, Mapping

from ..errors import FileFormatError, MissingFileError

__all__ = [
    "SAVED_FORMAT",
    "SAVED_VERSION",
    "canonical_json",
    "digest",
    "saved_result",
    "write_saved",
    "read_saved",
    "digest_matches",
    "instance_candidates",
    "load_result",
    "validated_result",
]

SAVED_FORMAT = "sweepwidth-saved-result"
SAVED_VERSION = 1
_DIGESTED = ("instance", "options", "result")


def _normalise(x: Any) -> Any:
    if isinstance(x, Mapping):
        return {str(k): _normalise(v) for k, v in x.items()}
    if isinstance(x, (list, tuple)):
        return [_normalise(v) for v in x]
    if isinstance(x, (set, frozenset)):
        items = [_normalise(v) for v in x]
        return sorted(items, key=lambda v: json.dumps(v, sort_keys=True))
    if isinstance(x, bool) or x is None or isinstance(x, str):
        return x
    if hasattr(x, "item") and callable(x.item):  # numpy scalar
        x = x.item()
    if isinstance(x, float):
        if not math.isfinite(x):
            return "nan" if math.isnan(x) else ("inf" if x > 0 else "-inf")
        if x.is_integer() and abs(x) < 2**53:
            return int(x)
        return x
    if isinstance(x, int):
        return x
    return str(x)


def canonical_json(obj: Any) -> str:
    """The canonical JSON text of ``obj`` (sorted keys, no spaces, whole floats as ints).

    Examples
    --------
    >>> canonical_json({"b": 1.0, "a": [2, 0.5]})
    '{"a":[2,0.5],"b":1}'
    """
    return json.dumps(_normalise(obj), sort_keys=True, separators=(",", ":"), ensure_ascii=False)


def digest(obj: Any) -> str:
    """SHA-256 hex digest of :func:`canonical_json` of ``obj``.

    Examples
    --------
    >>> digest({"x": 1}) == digest({"x": 1.0})
    True
    """
    return hashlib.sha256(canonical_json(obj).encode("utf-8")).hexdigest()


def saved_result(instance_path: str, instance_hash: str, result: Any, options: Mapping[str, Any]) -> dict:
    """The saved-result document of ``result`` (without ``instance_from_here``).

    Examples
    --------
    >>> from sweepwidth.result import Result
    >>> doc = saved_result("g.json", "abc", Result("cutwidth", "optimal", 1, 1, 1, witness=[0, 1]), {})
    >>> doc["format"], digest_matches(doc)
    ('sweepwidth-saved-result', True)
    """
    from .. import __version__
    from ..result import _jsonable

    body = {
        "format": SAVED_FORMAT,
        "version": SAVED_VERSION,
        "instance": {"path": os.path.abspath(instance_path), "hash": instance_hash},
        "options": _jsonable(dict(options)),
        "result": result.to_dict(),
        "sweepwidth": __version__,
    }
    body["digest"] = digest({k: body[k] for k in _DIGESTED})
    return body


def _relative_to(result_file: str, instance: str) -> str | None:
    try:
        return os.path.relpath(os.path.abspath(instance), os.path.dirname(os.path.abspath(result_file)))
    except ValueError:  # another drive on Windows
        return None


def write_saved(doc: Mapping[str, Any], target: str, instance_path: str) -> None:
    """Write ``doc`` to ``target`` with ``instance_from_here`` filled in.

    Raises
    ------
    OSError
        When the file cannot be written.
    """
    with open(target, "w", encoding="utf-8") as fh:
        json.dump({**doc, "instance_from_here": _relative_to(target, instance_path)}, fh, indent=1, sort_keys=False)
        fh.write("\n")


def read_saved(path: str) -> dict:
    """Read a saved result document (its digest is not checked: see :func:`digest_matches`).

    Raises
    ------
    FileFormatError
        An unreadable file, invalid JSON, or JSON that is not a saved result.
    """
    try:
        with open(path, "r", encoding="utf-8") as fh:
            doc = json.load(fh)
    except FileNotFoundError:
        raise MissingFileError("no such file", path=path) from None
    except OSError as err:
        raise FileFormatError(f"cannot be read: {err.strerror}", path=path) from err
    except json.JSONDecodeError as err:
        raise FileFormatError(f"not valid JSON ({err.msg})", path=path, line=err.lineno) from err
    if not isinstance(doc, dict) or doc.get("format") != SAVED_FORMAT or "result" not in doc:
        raise FileFormatError(
            f"not a saved result (expected format {SAVED_FORMAT!r}, as written by 'solve --save' or '-o')", path=path
        )
    return doc


def digest_matches(doc: Mapping[str, Any]) -> bool:
    """Whether the recorded digest is that of the document's content (False: edited after saving)."""
    return doc.get("digest") == digest({k: doc.get(k) for k in _DIGESTED})


def instance_candidates(doc: Mapping[str, Any], result_path: str) -> list[str]:
    """Where the instance may be, in the order to try: ``instance_from_here``, then the absolute path."""
    inst = doc.get("instance") or {}
    out = []
    rel = doc.get("instance_from_here")
    if isinstance(rel, str):
        out.append(os.path.join(os.path.dirname(os.path.abspath(result_path)), rel))
    if inst.get("path"):
        out.append(inst["path"])
    return out


def load_result(path: str | os.PathLike) -> Any:
    """A Result from a JSON file: a ``Result.to_dict()``, or a saved result holding one under ``"result"``.

    Raises
    ------
    FileFormatError
        A missing or unreadable file, or JSON that holds no result.
    """
    from ..result import Result

    path = os.fspath(path)
    try:
        with open(path, encoding="utf-8") as fh:
            doc = json.load(fh)
    except FileNotFoundError:
        raise MissingFileError("no such file", path=path) from None
    except OSError as err:
        raise FileFormatError(f"cannot read the result file: {err.strerror or err}", path=path) from err
    except json.JSONDecodeError as err:
        raise FileFormatError(f"not JSON: {err.msg}", path=path, line=err.lineno) from err
    body = doc
    if isinstance(doc, dict) and "parameter" not in doc and isinstance(doc.get("result"), dict):
        body = doc["result"]
    if not isinstance(body, dict) or "parameter" not in body or "status" not in body:
        raise FileFormatError("expected a result object with 'parameter' and 'status'", path=path)
    try:
        return Result.from_dict(body)
    except (KeyError, TypeError, ValueError) as err:
        raise FileFormatError(f"not a valid result: {err}", path=path) from err


_STATUSES = ("optimal", "bounded", "infeasible")
_EPS = 1e-9


def _bound(body: Mapping[str, Any], key: str, path: str | None) -> float | None:
    x = body.get(key)
    if x is None:
        return None
    if x in ("inf", "-inf"):
        return math.inf if x == "inf" else -math.inf
    if isinstance(x, bool) or not isinstance(x, (int, float)):
        raise FileFormatError(f"the result's {key!r} is {x!r}, not a number", path=path)
    if math.isnan(x):
        raise FileFormatError(f"the result's {key!r} is NaN, not a number", path=path)
    return float(x)


def validated_result(doc: Mapping[str, Any], path: str | None = None) -> Any:
    """The Result of a saved document, after checking that its fields make sense.

    Checks: ``parameter`` is a parameter of the library, ``status`` is
    'optimal', 'bounded' or 'infeasible', the bounds are numbers (not NaN),
    ``lower <= upper``, an 'optimal' result has equal bounds and its value,
    and a feasible result has both bounds.

    Raises
    ------
    FileFormatError
        Naming the first field at fault.

    Examples
    --------
    >>> doc = {"result": {"parameter": "cutwidth", "status": "optimal", "value": 2, "lower": 2, "upper": 2}}
    >>> validated_result(doc).value
    2.0
    >>> validated_result({"result": {"parameter": "cutwidth", "status": "optimal", "lower": 3, "upper": 2}})
    Traceback (most recent call last):
    ...
    sweepwidth.errors.FileFormatError: the result's lower bound 3 is above its upper bound 2
    """
    from ..registry import PARAMETERS
    from ..result import Result

    body = doc.get("result")
    if not isinstance(body, Mapping):
        raise FileFormatError("the saved result has no 'result' object", path=path)
    for key in ("parameter", "status"):
        if key not in body:
            raise FileFormatError(f"the result has no {key!r} field", path=path)
    param, status = body["parameter"], body["status"]
    if not isinstance(param, str) or param not in PARAMETERS:
        raise FileFormatError(f"the result's parameter {param!r} is none of {', '.join(PARAMETERS)}", path=path)
    if status not in _STATUSES:
        raise FileFormatError(f"the result's status {status!r} is none of {', '.join(_STATUSES)}", path=path)
    lower, upper, value = (_bound(body, k, path) for k in ("lower", "upper", "value"))
    if status != "infeasible":
        for key, x in (("lower", lower), ("upper", upper)):
            if x is None:
                raise FileFormatError(f"the {status} result has no {key!r} bound", path=path)
        assert lower is not None and upper is not None
        if lower > upper + _EPS:
            raise FileFormatError(f"the result's lower bound {lower:g} is above its upper bound {upper:g}", path=path)
        if status == "optimal":
            if upper - lower > _EPS * max(1.0, abs(upper)):
                raise FileFormatError(f"the result says 'optimal' but its bounds differ: [{lower:g}, {upper:g}]", path=path)
            if value is not None and abs(value - upper) > _EPS * max(1.0, abs(upper)):
                raise FileFormatError(f"the result says 'optimal' with value {value:g} but bounds [{lower:g}, {upper:g}]", path=path)
    for key in ("witness", "stats"):
        if key in body and body[key] is not None and not isinstance(body[key], (list, dict)):
            raise FileFormatError(f"the result's {key!r} is {type(body[key]).__name__}, not a list or object", path=path)
    try:
        seconds = float(body.get("seconds", 0.0))
    except (TypeError, ValueError):
        raise FileFormatError(f"the result's 'seconds' is {body.get('seconds')!r}, not a number", path=path) from None
    return Result(
        parameter=param,
        status=status,
        value=value,
        lower=lower,
        upper=upper,
        witness=body.get("witness"),
        method=str(body.get("method") or ""),
        seconds=seconds,
        stats=dict(body.get("stats") or {}),
    )
