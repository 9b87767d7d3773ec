"""The one result type shared by every parameter and method.

Status table
------------
============  =============================================================
status        meaning
============  =============================================================
'optimal'     ``value == lower == upper``; ``witness`` attains it.
'bounded'     ``lower <= optimum <= upper``; ``witness`` (if any) attains
              ``upper``.  A time limit ends here, never in an exception.
'infeasible'  no sweep exists (start and end not homotopic / homologous);
              ``stats['reason']`` says why; ``value``/``upper`` are None.
============  =============================================================
"""

from __future__ import annotations

import json
import math
from dataclasses import dataclass, field, replace
from typing import Any, Mapping

__all__ = ["Result", "STATUSES"]

STATUSES = ("optimal", "bounded", "infeasible")


def _jsonable(x: Any) -> Any:
    """Turn witnesses and stats into JSON-friendly data (tuples -> lists, numpy -> python)."""
    if isinstance(x, Mapping):
        return {str(k): _jsonable(v) for k, v in x.items()}
    if isinstance(x, (list, tuple)):
        return [_jsonable(v) for v in x]
    if isinstance(x, (set, frozenset)):
        try:
            return sorted(_jsonable(v) for v in x)
        except TypeError:
            return [_jsonable(v) for v in x]
    if hasattr(x, "item") and callable(x.item):  # numpy scalar
        return x.item()
    if isinstance(x, float) and not math.isfinite(x):
        return None if math.isnan(x) else ("inf" if x > 0 else "-inf")
    return x


@dataclass(frozen=True)
class Result:
    """Outcome of one solve: bounds, status, witness and how it was found.

    Attributes
    ----------
    parameter : str
        'cutwidth', 'homology', 'homotopy' or 'width'.
    status : str
        'optimal', 'bounded' or 'infeasible' (see the module's status table).
    value : float or None
        The optimum, set only when ``status == 'optimal'``.
    lower, upper : float or None
        Proven bounds on the optimum (``upper`` is the witness's width).
    witness : object
        An ordering of the nodes (cutwidth), of the faces (homology), or a
        list of moves (homotopy, width).  Replayed by :meth:`check`.
    method : str
        The method that ran; for ``method='auto'`` it says what was chosen.
    seconds : float
        Wall-clock time of the solve.
    stats : dict
        Solver calls, conflicts, states, seed, versions, reasons.
    """

    parameter: str
    status: str
    value: float | None
    lower: float | None
    upper: float | None
    witness: Any = None
    method: str = ""
    seconds: float = 0.0
    stats: Mapping[str, Any] = field(default_factory=dict)

    def __post_init__(self) -> None:
        if self.status not in STATUSES:
            raise ValueError(f"status must be one of {STATUSES}, got {self.status!r}")
        if self.status == "optimal" and self.value is None:
            raise ValueError("an optimal result needs a value")
        if (
            self.lower is not None
            and self.upper is not None
            and self.lower > self.upper + 1e-9
        ):
            raise ValueError(f"lower bound {self.lower} exceeds upper bound {self.upper}")

    @property
    def gap(self) -> float | None:
        """``upper - lower``, or None when a bound is missing."""
        if self.lower is None or self.upper is None:
            return None
        return self.upper - self.lower

    @property
    def is_optimal(self) -> bool:
        return self.status == "optimal"

    def check(self, obj: Any, **options: Any) -> float:
        """Replay the witness on ``obj`` independently of the solver.

        Returns the recomputed width (or height).  Raises
        :class:`~sweepwidth.errors.WitnessError` when the witness is invalid or
        its width differs from ``upper``.
        """
        from .verify import check_result

        return check_result(self, obj, **options)

    def with_(self, **changes: Any) -> "Result":
        """A copy with some fields changed."""
        return replace(self, **changes)

    def to_dict(self) -> dict:
        """Plain JSON-ready dictionary (see :meth:`from_dict`)."""
        return {
            "parameter": self.parameter,
            "status": self.status,
            "value": _jsonable(self.value),
            "lower": _jsonable(self.lower),
            "upper": _jsonable(self.upper),
            "witness": _jsonable(self.witness),
            "method": self.method,
            "seconds": self.seconds,
            "stats": _jsonable(dict(self.stats)),
        }

    def to_json(self, **kw: Any) -> str:
        return json.dumps(self.to_dict(), **kw)

    @classmethod
    def from_dict(cls, d: Mapping[str, Any]) -> "Result":
        def num(x: Any) -> Any:
            if x == "inf":
                return math.inf
            if x == "-inf":
                return -math.inf
            return x

        return cls(
            parameter=d["parameter"],
            status=d["status"],
            value=num(d.get("value")),
            lower=num(d.get("lower")),
            upper=num(d.get("upper")),
            witness=d.get("witness"),
            method=d.get("method", ""),
            seconds=float(d.get("seconds", 0.0)),
            stats=dict(d.get("stats") or {}),
        )

    def __str__(self) -> str:
        if self.status == "optimal":
            core = f"{self.parameter} = {_fmt(self.value)} (optimal)"
        elif self.status == "infeasible":
            core = f"{self.parameter}: infeasible"
        else:
            core = f"{self.parameter} in [{_fmt(self.lower)}, {_fmt(self.upper)}] (bounded)"
        return f"{core} by {self.method} in {self.seconds:.2f} s"


def _fmt(x: float | None) -> str:
    if x is None:
        return "?"
    if float(x).is_integer():
        return str(int(x))
    return f"{x:.6g}"
