"""The library's exceptions.

Every error raised on purpose by sweepwidth is a :class:`SweepwidthError`.
Each subclass also derives from the matching builtin (``ValueError``,
``TypeError``, ...) so that generic handlers keep working.  Messages name the
vertex, edge, face, file position or option at fault and the rule broken.
"""

from __future__ import annotations

__all__ = [
    "SweepwidthError",
    "InvalidEmbeddingError",
    "NonPlanarError",
    "CrossingEdgesError",
    "WeightError",
    "FileFormatError",
    "MissingFileError",
    "UnsupportedOptionError",
    "InvalidArgumentError",
    "InputTypeError",
    "NotInGraphError",
    "MissingDependencyError",
    "OperationError",
    "StorageError",
    "InvalidCurveError",
    "ProblemTooLargeError",
    "WitnessError",
]


class SweepwidthError(Exception):
    """Base class of every error that sweepwidth raises on purpose."""


class InvalidEmbeddingError(SweepwidthError, ValueError):
    """A rotation system, face list or graph that is not a valid plane graph."""


class NonPlanarError(InvalidEmbeddingError):
    """The graph has no planar embedding.

    Attributes
    ----------
    kuratowski_edges : list of tuple
        Edges of a subgraph homeomorphic to K5 or K3,3 (a certificate).
    """

    def __init__(self, message: str, kuratowski_edges: list | None = None) -> None:
        super().__init__(message)
        self.kuratowski_edges = list(kuratowski_edges or [])


class CrossingEdgesError(InvalidEmbeddingError):
    """Two edges of a straight-line drawing cross or overlap.

    Attributes
    ----------
    edges : tuple
        The two offending edges, each as ``(u, v)``.
    """

    def __init__(self, message: str, edges: tuple = ()) -> None:
        super().__init__(message)
        self.edges = edges


class WeightError(SweepwidthError, ValueError):
    """A weight that is negative, NaN, infinite or not a number."""


class FileFormatError(SweepwidthError, ValueError):
    """A file that cannot be read: names the file, the position and what was expected.

    Attributes
    ----------
    path : str or None
    line : int or None
        1-based line number for text formats.
    offset : int or None
        0-based byte offset for binary formats.
    """

    def __init__(
        self,
        message: str,
        *,
        path: str | None = None,
        line: int | None = None,
        offset: int | None = None,
    ) -> None:
        where = []
        if path is not None:
            where.append(str(path))
        if line is not None:
            where.append(f"line {line}")
        if offset is not None:
            where.append(f"byte {offset}")
        prefix = (", ".join(where) + ": ") if where else ""
        super().__init__(prefix + message)
        self.path = path
        self.line = line
        self.offset = offset
        self.reason = message


class UnsupportedOptionError(SweepwidthError, ValueError, TypeError):
    """An unknown method, format, option value or keyword; the message lists the valid ones.

    Also a TypeError, as Python raises for an unknown keyword argument.
    """

    def __init__(self, what: str, value: object, valid: list | tuple | None = None) -> None:
        msg = f"unknown {what} {value!r}"
        if valid:
            msg += "; valid: " + ", ".join(repr(v) for v in valid)
        super().__init__(msg)
        self.what = what
        self.value = value
        self.valid = list(valid or [])


class MissingFileError(FileFormatError, FileNotFoundError):
    """A file that is not there (a FileNotFoundError, and a FileFormatError for handlers of unreadable files)."""


class InvalidArgumentError(SweepwidthError, ValueError):
    """A bad argument value: ``time_limit``, ``seed``, ``weight``, a size, an option, a graph a format cannot hold."""


class InputTypeError(SweepwidthError, TypeError):
    """An argument of the wrong type (e.g. a list where a PlaneGraph is expected)."""


class NotInGraphError(InvalidArgumentError, LookupError):
    """A vertex, edge or face that the graph does not have (also a LookupError)."""

    def __str__(self) -> str:
        return Exception.__str__(self)


class MissingDependencyError(SweepwidthError, ImportError):
    """An optional package that this feature needs is not installed (the message says which extra)."""


class OperationError(SweepwidthError, RuntimeError):
    """An operation that could not be carried out on valid input (a layout, a busy database, a lost state)."""


class StorageError(SweepwidthError, OSError):
    """A file that cannot be written or a service that cannot be reached."""


class InvalidCurveError(SweepwidthError, ValueError):
    """A start or end curve that is not a closed walk / cycle / path of the graph."""


class ProblemTooLargeError(SweepwidthError, MemoryError):
    """An exponential method whose estimated memory or size exceeds its limit."""


class WitnessError(SweepwidthError, ValueError):
    """A witness that does not replay, or whose recomputed width differs from the claim."""
