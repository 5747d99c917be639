"""The package's layers: imports go only downward, without cycles, and loading a
scenario or running a model pulls in no pictures, films or cluster library.

The import graph is built from the source (every ``import`` statement,
including those inside functions), so a late import cannot hide an edge.
"""

from __future__ import annotations

import ast
import subprocess
import sys
from pathlib import Path

PKG = Path(__file__).resolve().parents[1] / "unsteady"

#: Lowest first; a module may import from its own layer and the layers below.
#: ``vortex`` and ``linear`` are the two numerical models, side by side.
LAYERS = [("core",), ("theory",), ("inputs",), ("vortex", "linear"), ("dynamics",),
          ("analysis",), ("simulation",), ("outputs",), ("apps",), ("__init__", "__main__")]

#: The one edge that points up, and why: ``Result.save``/``Result.load`` (public API)
#: hand over to the run-directory writer of the outputs layer when called.
ALLOWED_UPWARD = {("unsteady.simulation.result", "unsteady.outputs.rundir")}


def _rank(module):
    part = module.split(".")[1] if "." in module else "__init__"
    for i, group in enumerate(LAYERS):
        if part in group:
            return i
    raise AssertionError(f"{module} is in no layer; add its subpackage to LAYERS")


def _module_name(path):
    rel = path.relative_to(PKG.parent).with_suffix("")
    parts = list(rel.parts)
    if parts[-1] == "__init__" and len(parts) > 1:
        parts = parts[:-1]
    return ".".join(parts)


def _resolve(module, is_pkg, level, name):
    base = module.split(".") if is_pkg else module.split(".")[:-1]
    if level:
        base = base[: len(base) - (level - 1)]
        return ".".join(base + ([name] if name else []))
    return name


def import_graph():
    """{module: {imported unsteady module, ...}} from the source files."""
    modules = {_module_name(p): p for p in PKG.rglob("*.py")}
    graph = {}
    for mod, path in modules.items():
        is_pkg = path.name == "__init__.py"
        edges = set()
        for node in ast.walk(ast.parse(path.read_text(), str(path))):
            targets = []
            if isinstance(node, ast.Import):
                targets = [a.name for a in node.names]
            elif isinstance(node, ast.ImportFrom):
                base = _resolve(mod, is_pkg, node.level, node.module)
                subs = [f"{base}.{a.name}" for a in node.names if f"{base}.{a.name}" in modules]
                targets = subs or [base]     # `from pkg import module` imports the module
            for t in targets:
                if t in modules and t != mod:
                    edges.add(t)
        graph[mod] = edges
    return graph


def test_no_upward_imports():
    bad = []
    for mod, edges in import_graph().items():
        if mod == "unsteady":
            continue
        for t in edges:
            if t != "unsteady" and _rank(t) > _rank(mod) and (mod, t) not in ALLOWED_UPWARD:
                bad.append(f"{mod} -> {t}")
            if t == "unsteady" and mod not in ("unsteady.__main__",):
                bad.append(f"{mod} -> unsteady (the package facade)")
    assert not bad, "imports that point up a layer:\n" + "\n".join(sorted(bad))


def test_no_import_cycles():
    graph = {m: {t for t in e if (m, t) not in ALLOWED_UPWARD} for m, e in import_graph().items()}
    state, stack, cycles = {}, [], []

    def visit(m):
        state[m] = 1
        stack.append(m)
        for t in graph.get(m, ()):
            if state.get(t) == 1:
                cycles.append(stack[stack.index(t):] + [t])
            elif t not in state:
                visit(t)
        stack.pop()
        state[m] = 2

    for m in graph:
        if m not in state:
            visit(m)
    assert not cycles, "import cycles:\n" + "\n".join(" -> ".join(c) for c in cycles)


def test_the_graph_sees_late_imports():
    # a function-level import is an edge too (the check cannot be fooled by hiding one)
    g = import_graph()
    assert "unsteady.outputs.rundir" in g["unsteady.simulation.result"]


HEAVY = ("matplotlib", "imageio", "imageio_ffmpeg", "dask", "distributed")


def _loaded_after(code):
    out = subprocess.run([sys.executable, "-c", code + "\nimport sys\nprint(' '.join(sorted(sys.modules)))"],
                         capture_output=True, text=True, check=True, cwd=PKG.parent)
    return set(out.stdout.split())


def test_loading_a_scenario_imports_no_pictures_films_or_cluster():
    mods = _loaded_after("import unsteady\nunsteady.load_scenario('scenarios/drone-gust-1cos.toml')")
    assert not [m for m in mods if m.split(".")[0] in HEAVY]


def test_running_a_model_imports_no_pictures_films_or_cluster():
    mods = _loaded_after("import unsteady\nsc = unsteady.load_scenario('scenarios/pitch-step.toml', "
                         "overrides=['run.model=linear'])\nunsteady.simulate(sc)")
    assert not [m for m in mods if m.split(".")[0] in HEAVY]
