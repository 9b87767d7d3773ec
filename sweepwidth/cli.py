"""The ``sweepwidth`` command line: a thin layer over the library.

Verbs
-----
``solve``    solve one or more files; a table, or one JSON object a line
``bench``    run instance sets into a results database (resumable)
``check``    replay a saved result's witness against its instance
``dual``     write (or describe) the dual of a plane graph
``convert``  convert between the file formats
``draw``     pictures of embeddings, duals and sweeps
``export``   results database to CSV or JSON lines
``demo``     the Larkspur Pavilion walk-through

Every failure prints one line ``sweepwidth: error: ...`` on standard error
and exits with status 1 (2 for a bad command line).  The library never
prints; everything shown here is formatted in this module.

Saved results
-------------
``solve --save DIR`` and ``solve -o FILE`` write one saved result per
solve, in the format of :mod:`sweepwidth.io.saved`.  ``check`` finds the instance (``--instance``, else ``instance_from_here``
relative to the result file, else the absolute path), refuses the result
when the digest does not match (the file was edited), when the instance's
content hash differs, or when the independent checker's replay of the
witness fails or does not attain the claimed upper bound;
``--recompute`` also solves again and compares the bounds.
"""

from __future__ import annotations

import argparse
import json
import os
import sys
import time
from typing import Any, Callable, Sequence

from .registry import PARAMETERS, methods

#: the parameters, from the registry (sweepwidth.solve.contract)
PARAMS = tuple(PARAMETERS)

__all__ = ["main", "build_parser"]

EXIT_FAIL = 1
EXIT_USAGE = 2


class CliError(Exception):
    """A failure to report as one line and exit status 1."""


class _Parser(argparse.ArgumentParser):
    """An argument parser whose errors are one line, naming where to find help."""

    def error(self, message: str) -> None:  # type: ignore[override]
        sys.stderr.write(f"sweepwidth: error: {message} (see '{self.prog} --help')\n")
        raise SystemExit(EXIT_USAGE)


def _formatter(prog: str) -> argparse.HelpFormatter:
    return argparse.RawDescriptionHelpFormatter(prog, max_help_position=30)


# ------------------------------------------------------------------ helpers
def _split(values: Sequence[str] | None, default: Sequence[str]) -> list[str]:
    """Repeatable options that also take comma lists: ``--param a,b --param c``."""
    if not values:
        return list(default)
    out: list[str] = []
    for v in values:
        out += [x.strip() for x in str(v).split(",") if x.strip()]
    return out


def _params(values: Sequence[str] | None, default: Sequence[str] = ("cutwidth",)) -> list[str]:
    ps = _split(values, default)
    for p in ps:
        if p not in PARAMS:
            raise CliError(f"unknown parameter {p!r}; valid: {', '.join(PARAMS)}")
    return ps


def _label(text: str, obj: Any) -> Any:
    """A vertex label typed on the command line, matched against the graph's vertices."""
    nodes = list(obj.vertices) if hasattr(obj, "vertices") and not callable(obj.vertices) else list(obj.nodes())
    cands: list[Any] = []
    try:
        parsed = json.loads(text)
        cands.append(tuple(parsed) if isinstance(parsed, list) else parsed)
    except json.JSONDecodeError:
        pass
    cands.append(text)
    for c in cands:
        try:
            if c in nodes:
                return c
        except TypeError:
            continue
    for v in nodes:
        if str(v) == text:
            return v
    raise CliError(f"{text!r} is not a vertex of the graph")


def _face_ids(text: str | None) -> list[int] | None:
    if text is None:
        return None
    out = []
    for x in text.split(","):
        x = x.strip()
        if not x:
            continue
        try:
            out.append(int(x))
        except ValueError:
            raise CliError(f"--holes takes face ids separated by commas, got {x!r}") from None
    return out


def _num(x: Any) -> str:
    if x is None:
        return "-"
    if isinstance(x, str):
        return x
    x = float(x)
    if x.is_integer():
        return str(int(x))
    return f"{x:.6g}"


def _table(rows: list[list[str]], headers: list[str]) -> str:
    widths = [max(len(h), *(len(r[i]) for r in rows)) if rows else len(h) for i, h in enumerate(headers)]
    lines = ["  ".join(h.ljust(w) for h, w in zip(headers, widths)).rstrip()]
    lines.append("  ".join("-" * w for w in widths))
    for r in rows:
        lines.append("  ".join(c.ljust(w) for c, w in zip(r, widths)).rstrip())
    return "\n".join(lines)


def _load(path: str) -> Any:
    from .bench.loading import load_instance

    return load_instance(path)


def _curve_arg(text: str, obj: Any, what: str) -> Any:
    """A curve typed on the command line (JSON), with vertex labels matched against the graph.

    Accepted: a vertex list ``[a, b, c]``, ``{"vertices": [...]}``,
    ``{"vertex": v, "darts": [...]}`` (a point when ``darts`` is empty),
    ``{"darts": [...]}`` or, for homology, ``{"edges": [...]}``.
    """
    try:
        spec = json.loads(text)
    except json.JSONDecodeError as err:
        raise CliError(f"--{what} takes a curve in JSON (e.g. '[0, 1, 2]' or '{{\"vertex\": 0, \"darts\": []}}'): {err.msg}") from None

    def lab(x: Any) -> Any:
        return _label(json.dumps(x) if not isinstance(x, str) else x, obj)

    if isinstance(spec, list):
        return [lab(v) for v in spec]
    if isinstance(spec, dict):
        out = dict(spec)
        if "vertices" in out:
            out["vertices"] = [lab(v) for v in out["vertices"]]
        if "vertex" in out:
            out["vertex"] = lab(out["vertex"])
        return out
    raise CliError(f"--{what} takes a JSON list of vertices or a JSON object, got {text!r}")


def _solver_options(args: argparse.Namespace, parameter: str, obj: Any) -> dict:
    """Options given on the command line for ``parameter`` (only those that apply)."""
    opts: dict[str, Any] = {}
    if parameter == "cutwidth":
        if getattr(args, "first", None):
            opts["first"] = [_label(x, obj) for x in _split(args.first, [])]
        if getattr(args, "last", None):
            opts["last"] = [_label(x, obj) for x in _split(args.last, [])]
        if getattr(args, "unit", False):
            opts["weight"] = None
        if getattr(args, "sat_solver", None):
            opts["solver"] = args.sat_solver
    else:
        holes = _face_ids(getattr(args, "holes", None))
        if holes is not None:
            opts["holes"] = holes
        for name in ("start", "end"):
            text = getattr(args, name, None)
            if text:
                opts[name] = _curve_arg(text, obj, name)
    if parameter == "homotopy":
        if getattr(args, "no_spikes", False):
            opts["spikes"] = False
        if getattr(args, "simple", False):
            opts["simple"] = True
        if getattr(args, "monotone", False):
            opts["monotone"] = True
        if getattr(args, "length", None):
            opts["weight"] = args.length  # the solvers' one weight keyword
        if getattr(args, "ends", None):
            try:
                pair = json.loads("[" + args.ends + "]")
                parts = [json.dumps(x) if not isinstance(x, str) else x for x in pair]
            except json.JSONDecodeError:
                parts = [x.strip() for x in args.ends.split(",") if x.strip()]
            if len(parts) != 2:
                raise CliError(f"--ends takes two vertices S,T, got {args.ends!r}")
            opts["s"], opts["t"] = (_label(x, obj) for x in parts)
    if parameter == "width":
        opts.update(_width_options(args, obj))
    return opts


def _curve_pair(text: str, obj: Any, what: str, names: tuple[str, str]) -> dict:
    """``--walks``/``--leashes``: two curve names of the instance file, or a JSON list of two walks.

    Names stay names (the loader looks them up in the file's ``curves``, so
    ``bench`` can pass them to every instance); JSON walks get their vertex
    labels matched against the graph.
    """
    text = text.strip()
    if text.startswith("["):
        try:
            pair = json.loads(text)
        except json.JSONDecodeError as err:
            raise CliError(f"--{what} takes two curve names N,M or a JSON list of two walks: {err.msg}") from None
        if not isinstance(pair, list) or len(pair) != 2:
            raise CliError(f"--{what} takes a JSON list of exactly two walks, got {text!r}")
        if obj is None:
            raise CliError(f"--{what} with JSON walks needs one instance at a time (use curve names for a set)")
        return {n: _curve_arg(json.dumps(w), obj, what) for n, w in zip(names, pair)}
    parts = [x.strip() for x in text.split(",")]
    if len(parts) != 2 or not all(parts):
        raise CliError(f"--{what} takes two curve names N,M (stored under 'curves' in the instance file), got {text!r}")
    return dict(zip(names, parts))


def _width_options(args: argparse.Namespace, obj: Any) -> dict:
    """The options of ``--param width``: walks, leashes, backward steps and the shared flags."""
    opts: dict[str, Any] = {}
    if getattr(args, "walks", None):
        opts.update(_curve_pair(args.walks, obj, "walks", ("a", "b")))
    if getattr(args, "leashes", None):
        opts.update(_curve_pair(args.leashes, obj, "leashes", ("start", "end")))
    if getattr(args, "backward", False):
        opts["backward"] = True
    if getattr(args, "no_spikes", False):
        opts["spikes"] = False
    if getattr(args, "simple", False):
        opts["simple"] = True
    if getattr(args, "unit", False):
        opts["weight"] = None
    if getattr(args, "length", None):
        opts["weight"] = args.length
    return opts


def _write_saved(doc: dict, target: str, instance: str) -> None:
    from .io.saved import write_saved

    try:
        write_saved(doc, target, instance)
    except OSError as err:
        raise CliError(f"{target}: cannot be written: {err.strerror}") from err


def _same_file(a: str, b: str) -> bool:
    """True when paths ``a`` and ``b`` name one file (resolved paths, or the same inode)."""
    try:
        if os.path.exists(a) and os.path.exists(b):
            return os.path.samefile(a, b)
    except OSError:
        pass
    return os.path.realpath(a) == os.path.realpath(b)


def _refuse_overwrite(target: str, inputs: Sequence[str], what: str = "an input file") -> None:
    """CliError when writing ``target`` would overwrite one of ``inputs``."""
    for src in inputs:
        if _same_file(target, src):
            raise CliError(f"{target}: refusing to write over {what} ({src}); choose another output file")


def _save_names(files: Sequence[str]) -> dict[str, str]:
    """A distinct file-name stem per input for ``--save`` (files of the same name in other folders get their folder's name)."""
    real = {f: os.path.realpath(f) for f in files}
    by_stem: dict[str, set[str]] = {}
    for f in files:
        by_stem.setdefault(os.path.splitext(os.path.basename(f))[0], set()).add(real[f])
    names: dict[str, str] = {}
    used: dict[str, str] = {}  # stem -> real path that owns it
    for f in files:
        stem = os.path.splitext(os.path.basename(f))[0]
        if len(by_stem[stem]) > 1:
            folder = os.path.basename(os.path.dirname(real[f])) or "root"
            stem = f"{folder}-{stem}"
        base, k = stem, 2
        while used.get(stem, real[f]) != real[f]:
            stem, k = f"{base}-{k}", k + 1
        used[stem] = real[f]
        names[f] = stem
    return names


# -------------------------------------------------------------------- solve
def cmd_solve(args: argparse.Namespace, out: Callable[[str], None]) -> int:
    from .bench.hashing import instance_hash
    from .bench.loading import check_object, is_plane, solve_object
    from .io.saved import saved_result

    params = _params(args.param)
    if args.output and (len(args.files) > 1 or len(params) > 1):
        raise CliError("-o/--output takes one file and one parameter; use --save DIR for several")
    if args.output:
        _refuse_overwrite(args.output, args.files, "an input instance")
    save_names = _save_names(args.files)
    if args.save:
        os.makedirs(args.save, exist_ok=True)
        for f in args.files:
            for p in params:
                _refuse_overwrite(os.path.join(args.save, f"{save_names[f]}.{p}.json"), args.files, "an input instance")
    rows: list[list[str]] = []
    failures = 0
    for path in args.files:
        obj = _load(path)
        h = instance_hash(path, obj=None if path.lower().endswith(".json") else obj)
        for p in params:
            if PARAMETERS[p].problem == "plane" and not is_plane(obj):
                raise CliError(f"{path}: {p} needs a plane graph, but the file holds a graph without an embedding")
            opts = _solver_options(args, p, obj)
            res = solve_object(obj, p, method=args.method, time_limit=args.time_limit, seed=args.seed, options=opts)
            checked: float | None = None
            note = ""
            if not args.no_check and res.witness is not None:
                from .errors import WitnessError

                try:
                    checked = check_object(res, obj)
                except WitnessError as err:
                    failures += 1
                    note = f"witness refused: {err}"
            saved = saved_result(path, h, res, opts)
            targets = []
            if args.save:
                targets.append(os.path.join(args.save, f"{save_names[path]}.{p}.json"))
            if args.output:
                targets.append(args.output)
            for target in targets:
                _write_saved(saved, target, path)
            if args.json:
                line = {"instance": path, "instance_hash": h, **res.to_dict(), "checked": checked}
                if note:
                    line["check_error"] = note
                out(json.dumps(line))
            else:
                check_cell = "REFUSED" if note else ("-" if checked is None else "ok")
                rows.append(
                    [
                        os.path.basename(path),
                        p,
                        res.status,
                        _num(res.value),
                        _num(res.lower),
                        _num(res.upper),
                        res.method or "-",
                        f"{res.seconds:.2f}",
                        check_cell,
                    ]
                )
                if note:
                    rows.append(["", "", note, "", "", "", "", "", ""])
    if not args.json:
        out(_table(rows, ["instance", "param", "status", "value", "lower", "upper", "method", "seconds", "witness"]))
    return EXIT_FAIL if failures else 0


# -------------------------------------------------------------------- check
def _find_instance(saved: dict, result_path: str, override: str | None) -> str:
    if override:
        return override
    from .io.saved import instance_candidates

    p = (saved.get("instance") or {}).get("path")
    if not p:
        raise CliError(f"{result_path}: the saved result names no instance; give one with --instance")
    for c in instance_candidates(saved, result_path):
        if os.path.exists(c):
            return c
    raise CliError(f"{result_path}: its instance {p} is not there; give it with --instance")


def cmd_check(args: argparse.Namespace, out: Callable[[str], None]) -> int:
    from .bench.hashing import instance_hash
    from .bench.loading import check_object, solve_object
    from .io.saved import digest_matches, read_saved
    from .bench.summary import verdict
    from .errors import WitnessError
    from .result import Result

    bad = 0
    for rpath in args.results:
        saved = read_saved(rpath)
        if not digest_matches(saved):
            out(f"{rpath}: REFUSED: the file was edited after it was saved (its digest does not match its content)")
            bad += 1
            continue
        ipath = _find_instance(saved, rpath, args.instance)
        obj = _load(ipath)
        h = instance_hash(ipath, obj=None if ipath.lower().endswith(".json") else obj)
        if h != (saved.get("instance") or {}).get("hash"):
            out(f"{rpath}: REFUSED: the instance {ipath} is not the one the result was computed on (content hash differs)")
            bad += 1
            continue
        try:
            res = Result.from_dict(saved["result"])
        except (KeyError, ValueError, TypeError) as err:
            out(f"{rpath}: REFUSED: the result is malformed ({err})")
            bad += 1
            continue
        if res.status == "infeasible" or res.witness is None:
            out(f"{rpath}: {res.parameter} {res.status}: no witness to replay")
            width = None
        else:
            try:
                width = check_object(res, obj)
            except WitnessError as err:
                out(f"{rpath}: REFUSED: {err}")
                bad += 1
                continue
            out(
                f"{rpath}: ok: the {res.parameter} witness replays on {os.path.basename(ipath)} with width {_num(width)}"
                f" (claimed {res.status}, bounds [{_num(res.lower)}, {_num(res.upper)}])"
            )
        if args.recompute:
            opts = dict(saved.get("options") or {})
            again = solve_object(obj, res.parameter, method=args.method, time_limit=args.time_limit, options=opts)
            v = verdict({"lower": again.lower, "upper": again.upper}, {"lower": res.lower, "upper": res.upper})
            if v == "CONFLICT":
                out(
                    f"{rpath}: REFUSED: recomputing with method {again.method} gives [{_num(again.lower)}, {_num(again.upper)}],"
                    f" which contradicts the saved bounds [{_num(res.lower)}, {_num(res.upper)}]"
                )
                bad += 1
            else:
                out(
                    f"{rpath}: recomputed with {again.method}: [{_num(again.lower)}, {_num(again.upper)}]"
                    f" ({again.status}), consistent with the saved bounds"
                )
    return EXIT_FAIL if bad else 0


# -------------------------------------------------------------------- bench
def cmd_bench(args: argparse.Namespace, out: Callable[[str], None]) -> int:
    from .bench import discover, format_table, make_tasks, run_tasks, summarize

    params = _params(args.param)
    methods = _split(args.method, ["auto"])
    seeds: list[int | None] = [None]
    if args.seed:
        try:
            seeds = [int(s) for s in _split(args.seed, [])]
        except ValueError:
            raise CliError("--seed takes integers (a comma list for several seeds)") from None
    if args.jobs < 1:
        raise CliError(f"--jobs must be at least 1, got {args.jobs}")
    if args.time_limit is None:
        raise CliError("bench needs --time-limit (seconds per task)")
    opts: dict[str, Any] = {}
    if args.sat_solver:
        opts["solver"] = args.sat_solver
    if args.unit:
        opts["weight"] = None
    if args.holes:
        opts["holes"] = _face_ids(args.holes)
    if args.no_spikes:
        opts["spikes"] = False
    if args.simple:
        opts["simple"] = True
    if args.monotone:
        opts["monotone"] = True
    if args.length:
        opts["length"] = args.length
    if "width" in params:
        opts.update({k: v for k, v in _width_options(args, None).items() if k != "weight"})
    entries = discover(args.paths, sets=_split(args.sets, []) or None)
    if not entries:
        raise CliError("no instances found under " + ", ".join(args.paths))
    skipped: list = []
    tasks = make_tasks(
        entries,
        params,
        methods,
        options=opts,
        seeds=seeds,
        time_limit=args.time_limit,
        memory_mb=args.memory or None,
        grace=args.grace,
        solver=args.solver,
        skipped=skipped,
    )
    for name, p, why in skipped:
        sys.stderr.write(f"skipped {name} for {p}: {why}\n")
    if not tasks and skipped:
        raise CliError(f"no task left to run: {len(skipped)} instance/parameter pair(s) skipped (reasons above)")
    bar = None
    if sys.stderr.isatty() and not args.quiet:
        try:
            from tqdm import tqdm

            bar = tqdm(total=len(tasks), unit="task", file=sys.stderr, leave=False)
        except ImportError:
            bar = None

    def on_row(row: dict) -> None:
        if bar is not None:
            bar.update(1)
            bar.set_postfix_str(f"{row.get('name')} {row.get('parameter')} {row.get('status')}")

    try:
        report = run_tasks(tasks, args.db, jobs=args.jobs, executor=args.executor, resume=args.resume, on_row=on_row)
    finally:
        if bar is not None:
            bar.close()
    if args.resume and report.skipped:
        out(f"resumed: {report.skipped} of {report.total} task(s) already in {args.db}")
    if report.interrupted:
        out(f"interrupted: {report.finished} task(s) recorded in {args.db}; run again with --resume to continue")
    if not args.quiet and report.rows:
        lines = []
        for r in sorted(report.rows, key=lambda r: (r["name"] or "", r["parameter"], r["method"])):
            lines.append(
                [
                    str(r["name"]),
                    r["parameter"],
                    r["method"],
                    r["status"],
                    _num(r["lower"]),
                    _num(r["upper"]),
                    _num(round(r["seconds"], 2) if r.get("seconds") is not None else None),
                    r.get("verdict") or "",
                    (r.get("message") or "")[:60],
                ]
            )
        out(_table(lines, ["instance", "param", "method", "status", "lower", "upper", "seconds", "known", "note"]))
        out("")
    summary = summarize(report.rows)
    if summary:
        out(
            format_table(
                summary,
                ["parameter", "method", "tasks", "solved", "bounded", "failed", "conflicts", "median_s"],
                ["param", "method", "tasks", "solved", "bounded", "failed", "conflicts", "median s"],
            )
        )
    out(f"{report.finished} task(s) run, {report.skipped} skipped, in {report.seconds:.1f} s; results in {args.db}")
    conflicts = sum(s["conflicts"] for s in summary)
    if conflicts:
        out(f"warning: {conflicts} result(s) contradict a known value in the manifest")
    return EXIT_FAIL if (conflicts or report.interrupted) else 0


# ------------------------------------------------------------------- export
def cmd_export(args: argparse.Namespace, out: Callable[[str], None]) -> int:
    from .bench.db import ResultsDB

    if not os.path.exists(args.db):
        raise CliError(f"{args.db}: no such results database")
    where = {}
    if args.param:
        where["parameter"] = args.param
    fmt = args.format
    if fmt is None:
        fmt = "jsonl" if args.output and args.output.endswith((".jsonl", ".ndjson")) else "csv"
    if args.output:
        _refuse_overwrite(args.output, [args.db], "the results database")
    with ResultsDB(args.db) as db:
        if args.output:
            try:
                with open(args.output, "w", encoding="utf-8", newline="") as fh:
                    n = db.export(fh, fmt, **where)
            except OSError as err:
                raise CliError(f"{args.output}: cannot be written: {err.strerror}") from err
            sys.stderr.write(f"{n} row(s) written to {args.output}\n")
        else:
            sys.stdout.write(db.export_text(fmt, **where))
    return 0


# --------------------------------------------------------------- dual, convert
def cmd_dual(args: argparse.Namespace, out: Callable[[str], None]) -> int:
    from .bench.loading import is_plane

    obj = _load(args.file)
    if not is_plane(obj):
        raise CliError(f"{args.file}: the file holds a graph without an embedding; the dual needs a plane graph")
    D = obj.dual()
    if args.output:
        from .io import write

        _refuse_overwrite(args.output, [args.file])
        write(D, args.output)
        out(f"dual written to {args.output}: {D.number_of_vertices()} vertices, {D.number_of_edges()} edges, {D.number_of_faces()} faces")
    else:
        out(
            f"{args.file}: {obj.number_of_vertices()} vertices, {obj.number_of_edges()} edges, {obj.number_of_faces()} faces"
            f" (outer face {obj.outer_face})"
        )
        out(
            f"dual: {D.number_of_vertices()} vertices, {D.number_of_edges()} edges, {D.number_of_faces()} faces;"
            f" dual vertex of the outer face: {obj.outer_face}"
        )
        nbrs: dict[int, set] = {f: set() for f in range(D.number_of_vertices())}
        for e in range(D.number_of_edges()):
            a, b = D.edge_ends(e)
            nbrs[a].add(b)
            nbrs[b].add(a)
        shown = min(len(nbrs), 40)
        for f in range(shown):
            out(f"  face {f}: boundary length {_num(obj.face_length(f))}, next to faces {sorted(nbrs[f])}")
        if shown < len(nbrs):
            out(f"  ... {len(nbrs) - shown} more faces (write the dual with -o to see all)")
    return 0


def cmd_convert(args: argparse.Namespace, out: Callable[[str], None]) -> int:
    from .io import read, write

    _refuse_overwrite(args.output, [args.input])
    obj = read(args.input, format=args.from_format) if args.from_format else read(args.input)
    if args.to_format:
        write(obj, args.output, format=args.to_format)
    else:
        write(obj, args.output)
    kind = "plane graph" if hasattr(obj, "outer_face") else "graph"
    out(f"{args.input} -> {args.output} ({kind})")
    return 0


# --------------------------------------------------------------------- draw
def cmd_draw(args: argparse.Namespace, out: Callable[[str], None]) -> int:
    import sweepwidth.draw as drawing
    render = getattr(drawing, "render_cli", None)
    if render is None:
        try:
            render = drawing.__getattr__("render_cli")  # lazy facades
        except (AttributeError, ImportError):
            render = None
    if render is None:
        raise CliError("drawing from the command line is not available yet (sweepwidth.draw.render_cli is missing)")
    if args.result and not os.path.exists(args.result):
        raise CliError(f"{args.result}: no such result file")
    if not os.path.exists(args.file):
        raise CliError(f"{args.file}: no such file")
    written = render(args.file, param=args.param, result=args.result, out=args.output, dual=args.dual, frames=args.frames)
    out(f"picture written to {written or args.output}")
    return 0


# --------------------------------------------------------------------- demo
def cmd_demo(args: argparse.Namespace, out: Callable[[str], None]) -> int:
    from .demo import DISCLAIMER, run_demo

    out("sweepwidth demo: the Larkspur Pavilion (a fictional venue) and a few small plane graphs")
    out(DISCLAIMER)
    out("")
    t0 = time.monotonic()
    current = None
    rows: list[list[str]] = []
    headers = ["instance", "parameter", "status", "lower", "upper", "method", "seconds", "witness"]
    for ev in run_demo(args.out, time_limit=args.time_limit, pictures=not args.no_pictures):
        kind = ev["kind"]
        if kind == "instance":
            if rows:
                out(_table(rows, headers))
                out("")
                rows = []
            current = ev["name"]
            out(f"== {ev['name']}: {ev['description']}")
        elif kind == "result":
            rows.append(
                [
                    current or "",
                    ev["label"],
                    ev["status"],
                    _num(ev["lower"]),
                    _num(ev["upper"]),
                    ev["method"],
                    f"{ev['seconds']:.2f}",
                    ev["checked"],
                ]
            )
        elif kind == "note":
            if rows:
                out(_table(rows, headers))
                rows = []
            out(ev["text"])
    if rows:
        out(_table(rows, headers))
    out("")
    out(f"demo finished in {time.monotonic() - t0:.1f} s")
    return 0


# ------------------------------------------------------------------- parser
def _add_solver_options(p: argparse.ArgumentParser, *, per_instance: bool = True) -> None:
    """Parameter options; those naming vertices or curves only where there is one instance at a time."""
    g = p.add_argument_group("parameter options")
    if per_instance:
        g.add_argument("--first", action="append", metavar="V", help="cutwidth: vertex (or comma list) placed first")
        g.add_argument("--last", action="append", metavar="V", help="cutwidth: vertex (or comma list) placed last")
    g.add_argument("--unit", action="store_true", help="cutwidth: ignore edge weights (every edge counts 1)")
    g.add_argument("--sat-solver", metavar="NAME", help="cutwidth: python-sat solver for the SAT method (e.g. cadical195, glucose4)")
    g.add_argument("--holes", metavar="F,F", help="homology/homotopy: face ids that may not be swept (default: the outer face)")
    if per_instance:
        g.add_argument("--start", metavar="CURVE", help="homology/homotopy: start curve in JSON, e.g. '[0, 1, 2]' (default: the outer boundary)")
        g.add_argument("--end", metavar="CURVE", help="homology/homotopy: end curve in JSON (default: empty / a point)")
        g.add_argument("--ends", metavar="S,T", help="homotopy: sweep walks from S to T (the outer boundary one way to the other)")
    g.add_argument("--no-spikes", action="store_true", help="homotopy: forbid spikes and unspikes")
    g.add_argument("--simple", action="store_true", help="homotopy: every intermediate curve must be simple")
    g.add_argument("--monotone", action="store_true", help="homotopy: flip each face at most once")
    g.add_argument("--length", choices=["weight", "vertices"], help="homotopy/width: how curves are measured (default weight)")
    g.add_argument("--walks", metavar="A,B", help="width: the two walks, as names of curves stored in the instance file "
                   "(default a,b) or a JSON list of two vertex lists")
    g.add_argument("--leashes", metavar="START,END", help="width: the start and end leashes, as curve names or a JSON list "
                   "of two walks (default: the file's start,end, else the boundary arcs between the walks)")
    g.add_argument("--backward", action="store_true", help="width: let the leash ends step back along the walks too")


def _param_list() -> str:
    names = list(PARAMETERS)
    return ", ".join(names[:-1]) + " or " + names[-1] if len(names) > 1 else names[0]


def _method_list() -> str:
    """The registered methods per parameter, for ``--help`` (read when the parser is built)."""
    return "; ".join(f"{p}: {', '.join(methods(p))}" for p in PARAMETERS)


def build_parser() -> argparse.ArgumentParser:
    """The argument parser of the ``sweepwidth`` command, one subparser per verb.

    Returns
    -------
    argparse.ArgumentParser
        Its errors print one line ``sweepwidth: error: ...`` and exit with status 2.

    Examples
    --------
    >>> args = build_parser().parse_args(["solve", "g.json", "--param", "homology", "--time-limit", "5"])
    >>> args.verb, args.param, args.time_limit
    ('solve', ['homology'], 5.0)
    """
    from . import __version__

    top = _Parser(
        prog="sweepwidth",
        formatter_class=_formatter,
        description="Exact and bounded sweep parameters of plane graphs: cutwidth, homology sweep width, homotopy height.",
        epilog="examples:\n  sweepwidth solve instances/grids/grid-04x04.json --param cutwidth --time-limit 30\n"
        "  sweepwidth demo\n\nrun 'sweepwidth VERB --help' for each verb's options.",
    )
    top.add_argument("--version", action="version", version=f"sweepwidth {__version__}")
    sub = top.add_subparsers(dest="verb", metavar="VERB", parser_class=_Parser)

    def verb(name: str, help: str, example: str) -> argparse.ArgumentParser:
        return sub.add_parser(name, help=help, description=help, formatter_class=_formatter, epilog="example:\n  " + example)

    common_limit: dict[str, Any] = {"type": float, "metavar": "SECONDS"}

    s = verb("solve", "solve one or more instance files", "sweepwidth solve wheel.json --param homology,homotopy --time-limit 20 --save results/")
    s.add_argument("files", nargs="+", metavar="FILE")
    s.add_argument("--param", action="append", metavar="P", help=f"{_param_list()} (repeat or comma list; default cutwidth)")
    s.add_argument("--method", default="auto", help="solver method (default auto): " + _method_list())
    s.add_argument("--time-limit", **common_limit, help="seconds per solve (bounded answer when it runs out)")
    s.add_argument("--seed", type=int, help="seed for randomised heuristics")
    s.add_argument("--json", action="store_true", help="one JSON object a line instead of a table")
    s.add_argument("--save", metavar="DIR", help="save each result (with the instance's hash and path) into DIR")
    s.add_argument("-o", "--output", metavar="RESULT.json", help="save the single result to this file")
    s.add_argument("--no-check", action="store_true", help="do not replay the witness with the independent checker")
    _add_solver_options(s)

    b = verb(
        "bench",
        "run instance sets into a results database (pins and curves come per instance from a manifest's 'options' or the files)",
        "sweepwidth bench instances/ --param homology --jobs 2 --time-limit 30 --db runs.sqlite --resume",
    )
    b.add_argument("paths", nargs="+", metavar="PATH", help="instance files, folders, or manifest.json files")
    b.add_argument("--param", action="append", metavar="P", help="parameters (repeat or comma list; default cutwidth)")
    b.add_argument("--method", action="append", metavar="M", help="methods to compare (repeat or comma list; default auto): " + _method_list())
    b.add_argument("--time-limit", **common_limit, help="seconds per task (required)")
    b.add_argument("--memory", type=int, default=3072, metavar="MIB", help="address-space limit per task (default 3072; 0 for none)")
    b.add_argument("--grace", type=float, default=5.0, metavar="SECONDS", help="extra seconds before a task's process is killed (default 5)")
    b.add_argument("--jobs", type=int, default=1, metavar="N", help="tasks at once on this machine (default 1)")
    b.add_argument("--executor", metavar="SPEC", help="'local' (default), 'dask://HOST:PORT' or 'dask-local'")
    b.add_argument("--db", default="sweepwidth-runs.sqlite", metavar="FILE", help="results database (default sweepwidth-runs.sqlite)")
    b.add_argument("--resume", action="store_true", help="skip tasks already in the database")
    b.add_argument("--seed", action="append", metavar="S", help="seeds (repeat or comma list); each seed is its own task")
    b.add_argument("--sets", action="append", metavar="NAME", help="only these manifest sets (repeat or comma list)")
    b.add_argument("--solver", metavar="MODULE:FUNCTION", help="benchmark your own solver function instead of the library's (see sweepwidth.bench.Task)")
    b.add_argument("--quiet", action="store_true", help="print only the summary")
    _add_solver_options(b, per_instance=False)

    c = verb("check", "re-verify saved results against their instances", "sweepwidth check results/wheel.homology.json")
    c.add_argument("results", nargs="+", metavar="RESULT.json")
    c.add_argument("--instance", metavar="FILE", help="the instance file (default: the path saved in the result)")
    c.add_argument("--recompute", action="store_true", help="also solve again and compare the bounds")
    c.add_argument("--method", default="auto", help="method for --recompute (default auto): " + _method_list())
    c.add_argument("--time-limit", **common_limit, help="seconds for --recompute")

    d = verb("dual", "write or describe the dual of a plane graph", "sweepwidth dual instances/platonic/cube.json -o octahedron.json")
    d.add_argument("file", metavar="FILE")
    d.add_argument("-o", "--output", metavar="OUT", help="write the dual here (format from the extension); else describe it")

    v = verb("convert", "convert between file formats", "sweepwidth convert mesh.off mesh.json")
    v.add_argument("input", metavar="IN")
    v.add_argument("output", metavar="OUT")
    v.add_argument("--from", dest="from_format", metavar="FORMAT", help="input format (default: from the extension or content)")
    v.add_argument("--to", dest="to_format", metavar="FORMAT", help="output format (default: from the extension)")

    w = verb("draw", "draw a plane graph, its dual, or a sweep", "sweepwidth draw instances/demo/pavilion.json --param homotopy -o sweep.png")
    w.add_argument("file", metavar="FILE")
    w.add_argument("--param", choices=PARAMS, help="draw an optimal (or best found) sweep of this parameter")
    w.add_argument("--result", metavar="RESULT.json", help="draw the witness of a saved result")
    w.add_argument("-o", "--output", required=True, metavar="OUT", help="picture file: .png, .svg or .gif")
    w.add_argument("--dual", action="store_true", help="draw the dual graph too")
    w.add_argument("--frames", type=int, metavar="N", help="number of frames for an animated sweep")

    e = verb("export", "write a results database as CSV or JSON lines", "sweepwidth export --db runs.sqlite -o runs.csv")
    e.add_argument("--db", default="sweepwidth-runs.sqlite", metavar="FILE", help="results database")
    e.add_argument("--format", choices=["csv", "jsonl"], help="default csv (jsonl when OUT ends in .jsonl)")
    e.add_argument("-o", "--output", metavar="OUT", help="output file (default: standard output)")
    e.add_argument("--param", choices=PARAMS, help="only this parameter")

    m = verb("demo", "walk through the Larkspur Pavilion example", "sweepwidth demo --out demo-output")
    m.add_argument("--out", default="demo-output", metavar="DIR", help="folder for pictures and saved results (default demo-output)")
    m.add_argument("--time-limit", type=float, default=30.0, metavar="SECONDS", help="seconds per solve (default 30)")
    m.add_argument("--no-pictures", action="store_true", help="skip the pictures")
    return top


_COMMANDS = {
    "solve": cmd_solve,
    "bench": cmd_bench,
    "check": cmd_check,
    "dual": cmd_dual,
    "convert": cmd_convert,
    "draw": cmd_draw,
    "export": cmd_export,
    "demo": cmd_demo,
}


class _Terminated(KeyboardInterrupt):
    """SIGTERM, turned into an exception so that running children are stopped on the way out."""


def _on_sigterm(signum: int, frame: Any) -> None:
    raise _Terminated()


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; return the exit status.

    Parameters
    ----------
    argv : sequence of str, optional
        The arguments after the program name (default: ``sys.argv[1:]``).

    Returns
    -------
    int
        0 on success; 1 when a check refuses a result, a result contradicts
        a known value, or an error was reported; 2 for a bad command line
        (raised as ``SystemExit`` by the parser); 130 when interrupted.

    Examples
    --------
    >>> main(["solve", "no-such-file.json"])
    1
    """
    parser = build_parser()
    args = parser.parse_args(argv)
    if not args.verb:
        parser.print_help()
        return EXIT_USAGE

    def out(line: str) -> None:
        print(line, flush=True)

    from .errors import SweepwidthError

    import signal
    import threading

    previous = None
    if threading.current_thread() is threading.main_thread() and hasattr(signal, "SIGTERM"):
        previous = signal.signal(signal.SIGTERM, _on_sigterm)
    try:
        return _COMMANDS[args.verb](args, out)
    except _Terminated:
        sys.stderr.write("sweepwidth: terminated\n")
        return 143
    except CliError as err:
        sys.stderr.write(f"sweepwidth: error: {err}\n")
    except SweepwidthError as err:
        msg = " ".join(str(err).split("\n")[0].split())
        sys.stderr.write(f"sweepwidth: error: {msg}\n")
    except OSError as err:
        where = f"{err.filename}: " if getattr(err, "filename", None) else ""
        sys.stderr.write(f"sweepwidth: error: {where}{err.strerror or err}\n")
    except KeyboardInterrupt:
        sys.stderr.write("sweepwidth: interrupted\n")
        return 130
    except BrokenPipeError:
        return 0
    except Exception as err:  # noqa: BLE001 - a bug somewhere below: still one line, traceback on request
        if os.environ.get("SWEEPWIDTH_TRACEBACK"):
            raise
        msg = " ".join(str(err).split())
        sys.stderr.write(
            f"sweepwidth: error: internal error {type(err).__name__}: {msg} (set SWEEPWIDTH_TRACEBACK=1 for the traceback)\n"
        )
    finally:
        if previous is not None:
            signal.signal(signal.SIGTERM, previous)
    return EXIT_FAIL


if __name__ == "__main__":  # pragma: no cover
    raise SystemExit(main())
