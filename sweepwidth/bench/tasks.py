"""Benchmark tasks: (instance, parameter, method, options, seed) plus limits, as plain data.

A :class:`Task` is frozen and JSON-serialisable (:meth:`Task.to_dict`), so it
can be hashed, stored in the results database and shipped to a worker
process or a cluster.  :func:`discover` turns paths (files, directories,
manifests) into instance entries and :func:`make_tasks` crosses them with
the configurations of a run.
"""

from __future__ import annotations

import json
import os
from dataclasses import asdict, dataclass, field
from typing import Any, Iterable, Mapping, Sequence

from ..errors import FileFormatError, InvalidArgumentError, SweepwidthError, UnsupportedOptionError
from .hashing import config_hash, instance_hash
from .. import registry
from .loading import OPTIONS, PARAMETERS

__all__ = [
    "Task",
    "InstanceEntry",
    "discover",
    "make_tasks",
    "known_key",
    "parse_known_key",
    "INSTANCE_SUFFIXES",
    "DEFAULT_MEMORY_MB",
]

#: File suffixes that :func:`discover` treats as instances inside a directory.
INSTANCE_SUFFIXES = (".json", ".gr", ".pc", ".planar_code", ".off", ".obj", ".graphml")

#: Default memory limit of one task's child process (address space, MiB).
DEFAULT_MEMORY_MB = 3072


@dataclass(frozen=True)
class InstanceEntry:
    """One instance file, with what a manifest says about it.

    Attributes
    ----------
    path : str
    name : str
    kind : str
        'plane', 'graph' or '' (unknown until loaded).
    known : dict
        ``{parameter: {"value" | "lower" | "upper": number, "source": text}}``.
    options : dict
        ``{parameter: {option: value}}`` that the instance needs (e.g. a start curve).
    """

    path: str
    name: str
    kind: str = ""
    known: Mapping[str, Any] = field(default_factory=dict)
    options: Mapping[str, Any] = field(default_factory=dict)
    set: str = ""


@dataclass(frozen=True)
class Task:
    """One unit of benchmark work.

    The *configuration* (everything but the instance and the bookkeeping
    fields ``name``/``known``) is hashed by :meth:`config_hash`; together with
    the instance's content hash it keys the task's row in the database.

    Attributes
    ----------
    instance : str
        Path of the instance file.
    instance_hash : str
        Content hash of the instance (see :func:`~sweepwidth.bench.hashing.instance_hash`).
    parameter : str
        'cutwidth', 'homology' or 'homotopy'.
    method : str
    options : dict
        Parameter-specific solver options.
    seed : int or None
    time_limit : float or None
        Seconds given to the solver; the child is killed at ``time_limit + grace``.
    memory_mb : int or None
        Address-space limit of the child process.
    grace : float
        Extra seconds before the child is killed.
    quick_bounds : bool
        Before solving, the child reports cheap proven bounds (see
        :func:`sweepwidth.bench.child.quick_bounds`), so that a task killed
        at its hard limit still records a bracket.
    solver : str or None
        ``"module:function"`` of a solver to run instead of the library's
        entry point for ``parameter``: ``fn(obj, *, method, time_limit, seed,
        progress, **options) -> Result`` (to benchmark your own code the same way).
    name : str
        Display name (not part of the key).
    known : dict
        Known value or bounds for this parameter, if any (not part of the key).
    """

    instance: str
    instance_hash: str
    parameter: str
    method: str = "auto"
    options: Mapping[str, Any] = field(default_factory=dict)
    seed: int | None = None
    time_limit: float | None = None
    memory_mb: int | None = DEFAULT_MEMORY_MB
    grace: float = 5.0
    solver: str | None = None
    quick_bounds: bool = True
    name: str = ""
    known: Mapping[str, Any] = field(default_factory=dict)

    def config(self) -> dict:
        """The configuration part of the task (what :meth:`config_hash` digests)."""
        return {
            "parameter": self.parameter,
            "method": self.method,
            "options": dict(self.options),
            "seed": self.seed,
            "time_limit": self.time_limit,
            "memory_mb": self.memory_mb,
            **({"solver": self.solver} if self.solver else {}),
            **({} if self.quick_bounds else {"quick_bounds": False}),
        }

    def config_hash(self) -> str:
        return config_hash(self.config())

    def key(self) -> tuple[str, str]:
        """``(instance_hash, config_hash)``: the task's key in the results database."""
        return (self.instance_hash, self.config_hash())

    def hard_limit(self) -> float | None:
        """Seconds after which the parent kills the child (None: never)."""
        if self.time_limit is None:
            return None
        return float(self.time_limit) + float(self.grace)

    def to_dict(self) -> dict:
        d = asdict(self)
        d["options"] = dict(self.options)
        d["known"] = dict(self.known)
        return d

    @classmethod
    def from_dict(cls, d: Mapping[str, Any]) -> "Task":
        return cls(**{k: d[k] for k in cls.__dataclass_fields__ if k in d})


#: option values that give a variant its own key among an instance's known values
_VARIANT_FLAGS = (("monotone", True, "monotone"), ("simple", True, "simple"), ("spikes", False, "nospikes"),
                  ("backward", True, "backward"))


def known_key(parameter: str, options: Mapping[str, Any] | None = None) -> str:
    """The key of a parameter variant among known values: 'homotopy', 'homotopy_monotone', ...

    Examples
    --------
    >>> known_key("homotopy", {"monotone": True, "spikes": False})
    'homotopy_monotone_nospikes'
    """
    opts = options or {}
    flags = [name for opt, value, name in _VARIANT_FLAGS if opts.get(opt, None) is value]
    return "_".join([parameter] + flags)


def parse_known_key(key: str) -> tuple[str, dict] | None:
    """Inverse of :func:`known_key`: ``(parameter, options)``, or None for a key we do not read.

    Examples
    --------
    >>> parse_known_key("homotopy_monotone")
    ('homotopy', {'monotone': True})
    """
    parts = key.split("_")
    if parts[0] not in PARAMETERS:
        return None
    by_name = {name: (opt, value) for opt, value, name in _VARIANT_FLAGS}
    opts: dict = {}
    for part in parts[1:]:
        if part not in by_name:
            return None
        opt, value = by_name[part]
        opts[opt] = value
    return parts[0], opts


def _read_manifest(path: str, _seen: frozenset = frozenset()) -> list[InstanceEntry]:
    try:
        with open(path, "r", encoding="utf-8") as fh:
            data = json.load(fh)
    except OSError as err:
        raise FileFormatError(f"cannot read manifest: {err.strerror or err}", path=path) from err
    except json.JSONDecodeError as err:
        raise FileFormatError(f"manifest is not valid JSON: {err.msg}", path=path, line=err.lineno) from err
    if not isinstance(data, dict) or not isinstance(data.get("instances"), list):
        raise FileFormatError("a manifest is a JSON object with a list 'instances'", path=path)
    base = os.path.dirname(os.path.abspath(path))
    out = []
    here = _seen | {os.path.abspath(path)}
    for inc in data.get("include") or []:
        sub = os.path.normpath(os.path.join(base, str(inc)))
        if sub in here:
            raise FileFormatError(f"manifest includes itself through {inc!r}", path=path)
        if not os.path.exists(sub):
            raise FileFormatError(f"included manifest {inc!r} does not exist", path=path)
        folder = os.path.basename(os.path.dirname(sub))
        out += [e if e.set else InstanceEntry(**{**e.__dict__, "set": folder}) for e in _read_manifest(sub, here)]
    for i, item in enumerate(data["instances"]):
        if not isinstance(item, dict) or "path" not in item:
            raise FileFormatError(f"manifest entry {i} has no 'path'", path=path)
        p = os.path.normpath(os.path.join(base, item["path"]))
        known = {k: v for k, v in (item.get("known") or {}).items()}
        out.append(
            InstanceEntry(
                path=p,
                name=str(item.get("name") or os.path.splitext(os.path.basename(p))[0]),
                kind=str(item.get("kind", "")),
                known=known,
                options=dict(item.get("options") or {}),
                set=str(item.get("set", "")),
            )
        )
    return out


def discover(paths: Iterable[str | os.PathLike], *, sets: Sequence[str] | None = None) -> list[InstanceEntry]:
    """Instance entries for files, directories and manifests.

    A directory with a ``manifest.json`` contributes the manifest's
    instances (and those of the manifests it lists under ``include``, paths
    relative to it); any other directory every file below it with one of
    :data:`INSTANCE_SUFFIXES` (manifests excluded).  A file named
    ``manifest.json`` is read as a manifest; any other file is one instance.
    Duplicate paths are kept once.

    Parameters
    ----------
    paths : iterable of path
    sets : sequence of str, optional
        Keep only manifest entries of these sets.

    Raises
    ------
    FileFormatError
        For a missing path or a malformed manifest.
    """
    out: list[InstanceEntry] = []
    seen: set[str] = set()
    set_names: set[str] = set()

    def add(entries: Iterable[InstanceEntry]) -> None:
        for e in entries:
            if e.set:
                set_names.add(str(e.set))
            key = os.path.abspath(e.path)
            if key in seen:
                continue
            if sets and e.set not in sets:
                continue
            seen.add(key)
            out.append(e)

    for raw in paths:
        p = os.fspath(raw)
        if os.path.isdir(p):
            man = os.path.join(p, "manifest.json")
            if os.path.exists(man):
                add(_read_manifest(man))
                continue
            found = []
            for root, dirs, files in os.walk(p):
                dirs.sort()
                for f in sorted(files):
                    if f == "manifest.json" or not f.lower().endswith(INSTANCE_SUFFIXES):
                        continue
                    fp = os.path.join(root, f)
                    found.append(InstanceEntry(path=fp, name=os.path.splitext(f)[0]))
            add(found)
        elif os.path.isfile(p):
            if os.path.basename(p) == "manifest.json":
                add(_read_manifest(p))
            else:
                add([InstanceEntry(path=p, name=os.path.splitext(os.path.basename(p))[0])])
        else:
            raise FileFormatError("no such file or directory", path=p)
    for name in sets or ():
        if name not in set_names:
            raise UnsupportedOptionError("instance set", name, sorted(set_names))
    return out


def make_tasks(
    entries: Iterable[InstanceEntry],
    parameters: Sequence[str],
    methods: Sequence[str] = ("auto",),
    *,
    options: Mapping[str, Any] | None = None,
    seeds: Sequence[int | None] = (None,),
    time_limit: float | None = None,
    memory_mb: int | None = DEFAULT_MEMORY_MB,
    grace: float = 5.0,
    solver: str | None = None,
    skipped: list | None = None,
) -> list[Task]:
    """Cross instances with parameters, methods and seeds.

    Entries whose manifest kind is 'graph' (no embedding) get no homology or
    homotopy tasks.  ``solver`` (``"module:function"``) replaces the
    library's solver in every task (see :class:`Task`).  Per-instance options from the manifest are merged
    under the run's ``options`` (the run's win).

    ``skipped``, when given, receives ``(name, parameter, reason)`` for each
    instance and parameter that get no task.

    Raises
    ------
    UnsupportedOptionError
        For an unknown parameter, an option the parameter does not take, or
        (without ``solver``) a method not in the registry of
        :mod:`sweepwidth.solve.contract`.
    """
    for p in parameters:
        registry.parameter(p)  # UnsupportedOptionError listing the parameters
        if solver is None:
            for m in methods:
                registry.get_method(p, m)  # UnsupportedOptionError listing the registered methods
    opts = dict(options or {})
    if not parameters:
        raise InvalidArgumentError("a benchmark run needs at least one parameter")
    tasks: list[Task] = []
    for e in entries:
        h = instance_hash(e.path)
        for p in parameters:
            if registry.parameter(p).problem == "plane" and e.kind == "graph":
                if skipped is not None:
                    skipped.append((e.name, p, f"{p} needs a plane graph; the manifest lists this instance as a graph without an embedding"))
                continue
            mine = {k: v for k, v in opts.items() if k in OPTIONS[p]}
            merged = dict((e.options or {}).get(p, {}))
            merged.update(mine)
            for m in methods:
                for s in seeds:
                    tasks.append(
                        Task(
                            instance=e.path,
                            instance_hash=h,
                            parameter=p,
                            method=m,
                            options=merged,
                            seed=s,
                            time_limit=time_limit,
                            memory_mb=memory_mb,
                            grace=grace,
                            solver=solver,
                            name=e.name,
                            known=dict((e.known or {}).get(known_key(p, merged), {})),
                        )
                    )
    return tasks
