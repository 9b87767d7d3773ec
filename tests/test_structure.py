"""The package's import graph, read from the source with :mod:`ast`.

Two rules of the layout (see DEVELOPERS.md): no import cycle between the
package's modules, counting imports inside functions too (a lazy import that
closes a cycle is still a cycle of responsibilities), and no module imports a
private ``_name`` defined in another package of sweepwidth.  A package here is
a directory with an ``__init__.py``; its own modules may share private names.
"""

from __future__ import annotations

import ast
from pathlib import Path

import networkx as nx

ROOT = Path(__file__).resolve().parents[1] / "sweepwidth"


def _modules() -> dict[str, Path]:
    out = {}
    for path in ROOT.rglob("*.py"):
        parts = list(path.relative_to(ROOT.parent).with_suffix("").parts)
        if parts[-1] == "__init__":
            parts.pop()
        out[".".join(parts)] = path
    return out


MODULES = _modules()


def _is_package(name: str) -> bool:
    return MODULES[name].name == "__init__.py"


def _package_of(name: str) -> str:
    return name if _is_package(name) else name.rpartition(".")[0]


def _imports(name: str) -> list[tuple[str, str | None, int]]:
    """(imported module, imported name or None, line) for every import in module ``name``."""
    tree = ast.parse(MODULES[name].read_text(), filename=str(MODULES[name]))
    here = _package_of(name)
    found = []
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            for alias in node.names:
                if alias.name.startswith("sweepwidth"):
                    found.append((alias.name, None, node.lineno))
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = here.split(".")
                base = base[: len(base) - (node.level - 1)]
                mod = ".".join(base + ([node.module] if node.module else []))
            else:
                mod = node.module or ""
            if not mod.startswith("sweepwidth"):
                continue
            for alias in node.names:
                sub = f"{mod}.{alias.name}"
                if sub in MODULES:  # ``from pkg import module``
                    found.append((sub, None, node.lineno))
                else:
                    found.append((mod, alias.name, node.lineno))
    return found


def import_graph() -> nx.DiGraph:
    G = nx.DiGraph()
    G.add_nodes_from(MODULES)
    for name in MODULES:
        for mod, _, line in _imports(name):
            if mod in MODULES and mod != name:
                G.add_edge(name, mod, line=line)
    return G


def test_the_graph_sees_the_known_edges():
    # a sanity check of the reader itself: the dispatcher imports its DP (read from the source)
    G = import_graph()
    assert G.has_edge("sweepwidth.solve.ordering", "sweepwidth.solve.ordering.dp")
    assert G.has_edge("sweepwidth.solve.homotopy", "sweepwidth.solve.homotopy.free_group")
    assert G.has_edge("sweepwidth.solve.homotopy.search", "sweepwidth.solve.homotopy.free_group")


def test_no_import_cycles():
    G = import_graph()
    cycles = [c for c in nx.simple_cycles(G)]
    assert not cycles, "import cycles: " + "; ".join(" -> ".join(c + [c[0]]) for c in cycles[:10])


def _owner_of_private(mod: str, attr: str | None) -> str | None:
    """The package that owns the first private part of ``mod.attr`` (None if nothing is private)."""
    parts = mod.split(".")
    for i, part in enumerate(parts):
        if part.startswith("_"):
            return ".".join(parts[:i])
    if attr is not None and attr.startswith("_"):
        return _package_of(mod)
    return None


def test_no_module_imports_private_names_of_another_package():
    # a leading underscore means "internal to the enclosing package" (common practice,
    # PEP 8): usable by that package's modules and its subpackages, by no one else
    bad = []
    for name in MODULES:
        for mod, attr, line in _imports(name):
            owner = _owner_of_private(mod, attr)
            if owner is not None and not (name == owner or name.startswith(owner + ".")):
                bad.append(f"{MODULES[name].relative_to(ROOT.parent)}:{line} imports {mod}" + (f".{attr}" if attr else ""))
    assert not bad, "\n".join(bad)


def test_the_private_rule_catches_a_foreign_private_import():
    # the rule itself, on made-up names: plane's private module is foreign to draw, not to plane
    assert _owner_of_private("sweepwidth.plane._geometry", "find_crossing") == "sweepwidth.plane"
    assert _owner_of_private("sweepwidth.result", "_jsonable") == "sweepwidth"
    assert _owner_of_private("sweepwidth.solve.ordering", "cutwidth") is None


def test_the_repository_points_at_nothing_outside_it():
    # what a reader needs is said in the project's own docs; no path or note outside the repository
    repo = ROOT.parent
    outside = ["/" + "work/", "DESIGN" + ".md", "STYLE" + ".md", "CHECKS" + ".md", "shared" + "/"]
    skip = {".git", ".venv", "__pycache__", ".hypothesis", ".mypy_cache", "build", "dist"}
    bad = []
    for path in repo.rglob("*"):
        if not path.is_file() or skip & set(path.relative_to(repo).parts) or path.suffix not in (
                ".py", ".md", ".toml", ".cfg", ".txt", ".json", ".yml", ".yaml", "") :
            continue
        try:
            text = path.read_text(encoding="utf-8")
        except (UnicodeDecodeError, OSError):
            continue
        for word in outside:
            if word in text:
                bad.append(f"{path.relative_to(repo)}: {word}")
    assert not bad, "\n".join(bad)


def test_every_error_raised_on_purpose_derives_from_a_builtin():
    # regression: 113 raises of the bare SweepwidthError, which no ValueError/TypeError handler catches
    import inspect
    import pathlib

    import sweepwidth.errors as errors

    pkg = pathlib.Path(errors.__file__).parent
    bare = [f"{p.relative_to(pkg)}:{i}" for p in pkg.rglob("*.py")
            for i, line in enumerate(p.read_text(encoding="utf-8").splitlines(), 1) if "raise SweepwidthError(" in line]
    assert bare == []
    builtins_ = (ValueError, TypeError, LookupError, OSError, ImportError, RuntimeError, MemoryError)
    for name, cls in inspect.getmembers(errors, inspect.isclass):
        if issubclass(cls, errors.SweepwidthError) and cls is not errors.SweepwidthError:
            assert issubclass(cls, builtins_), name
