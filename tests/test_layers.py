"""The package's layers point one way, read from the source (``ast``) of every module.

physics <- model <- readers <- solve <- results <- analysis <- reports <- package API <- cli

A module may import modules of its own layer or of a layer below it, at module level or
in an ``if TYPE_CHECKING:`` block; an import of a seatool module inside a function is
refused (the one lazy mechanism is :func:`seatool.__getattr__`), and so is loading
seatool modules by name (``importlib.import_module``, ``__import__``). Rules of the
project (DEVELOPERS.md, "Layers"); the checks read files only, nothing is imported.
"""

from __future__ import annotations

import ast
import sys
from pathlib import Path

import pytest

PACKAGE = Path(__file__).resolve().parent.parent / "seatool"

#: Layers from the bottom up.
ORDER = (
    "physics",
    "model",
    "readers",
    "solve",
    "results",
    "analysis",
    "reports",
    "api",
    "cli",
)

#: Layer of every module outside the sub-packages below (add a new module here).
MODULES = {
    "seatool._version": "model",
    "seatool.bands": "model",
    "seatool.errors": "model",
    "seatool.levels": "model",
    "seatool.progress": "model",
    "seatool.outputs": "model",
    "seatool.loudness": "model",
    "seatool.metrics": "model",
    "seatool.properties": "model",
    "seatool.materials": "model",
    "seatool.model": "model",
    "seatool.kinds": "readers",
    "seatool.modelfile": "readers",
    "seatool.catalogue": "readers",
    "seatool.targetfile": "readers",
    "seatool.bandsolve": "solve",
    "seatool.solve": "solve",
    "seatool.modal": "solve",
    "seatool.crossover": "reports",
    "seatool.results": "results",
    # per-band SEA validity of a model: Result.notes and Result.validity show it
    "seatool.validity_report": "results",
    "seatool.plot": "reports",
    "seatool.summary": "reports",
    # the package facade: imports nothing eagerly but seatool._version; its lazy
    # __getattr__ reaches every layer below the command line
    "seatool": "api",
    "seatool.__main__": "cli",
}

#: Sub-packages: every module in them has the package's layer.
PACKAGES = {
    "seatool.physics": "physics",
    "seatool.kinds": "readers",
    "seatool.analysis": "analysis",
    "seatool.report": "reports",
    "seatool.cli": "cli",
}

#: Function-local imports of seatool modules and loading by name that the rewrite of the
#: model-file readers (kinds/*, modelfile.py) removes; nothing may be added here.
PENDING: set[str] = set()

#: The one lazy-import mechanism (PEP 562) and where it lives: the package's public names
#: and, the same way, the analyses of seatool.analysis (each imported on first use).
LAZY = {("seatool", "_defining_module"), ("seatool.analysis", "_defining_module")}


def _modules() -> dict[str, Path]:
    out = {}
    for path in sorted(PACKAGE.rglob("*.py")):
        parts = list(path.relative_to(PACKAGE.parent).with_suffix("").parts)
        if parts[-1] == "__init__":
            parts = parts[:-1]
        out[".".join(parts)] = path
    return out


MODS = _modules()


def layer(module: str) -> str:
    if module in MODULES:
        return MODULES[module]
    for pkg, lay in PACKAGES.items():
        if module == pkg or module.startswith(pkg + "."):
            return lay
    raise AssertionError(
        f"module {module} has no layer: add it to MODULES in tests/test_layers.py"
    )


def _is_package(module: str) -> bool:
    return MODS[module].name == "__init__.py"


def _targets(module: str, node: ast.Import | ast.ImportFrom) -> list[str]:
    """The seatool modules an import statement imports."""
    if isinstance(node, ast.Import):
        return [a.name for a in node.names if a.name.split(".")[0] == "seatool"]
    if node.level:
        base_parts = module.split(".")
        if not _is_package(module):
            base_parts = base_parts[:-1]
        base_parts = base_parts[: len(base_parts) - (node.level - 1)]
        base = ".".join(base_parts + ([node.module] if node.module else []))
    else:
        base = node.module or ""
    if base.split(".")[0] != "seatool":
        return []
    out = []
    for a in node.names:
        sub = f"{base}.{a.name}"
        out.append(sub if sub in MODS else base)
    return out


def _imports(module: str) -> list[tuple[ast.Import | ast.ImportFrom, str | None]]:
    """Every import statement of ``module`` with the function it sits in (None: module level)."""
    tree = ast.parse(MODS[module].read_text(encoding="utf-8"))
    found: list[tuple[ast.Import | ast.ImportFrom, str | None]] = []

    def visit(node: ast.AST, func: str | None) -> None:
        for child in ast.iter_child_nodes(node):
            if isinstance(child, ast.Import | ast.ImportFrom):
                found.append((child, func))
            inner = child.name if isinstance(child, ast.FunctionDef | ast.AsyncFunctionDef) else func
            visit(child, inner)

    visit(tree, None)
    return found


def test_every_module_has_a_layer():
    for module in MODS:
        assert layer(module) in ORDER


@pytest.mark.parametrize("module", sorted(MODS))
def test_imports_point_down(module):
    own = ORDER.index(layer(module))
    for node, func in _imports(module):
        if func is not None and (module, func) in LAZY:
            continue  # the lazy package attributes reach every layer below the command line
        for target in _targets(module, node):
            assert ORDER.index(layer(target)) <= own, (
                f"{module} (layer {layer(module)}) imports {target} "
                f"(layer {layer(target)}) at line {node.lineno}: imports must point down"
            )


@pytest.mark.parametrize("module", sorted(MODS))
def test_no_function_local_import_of_seatool(module):
    if module in PENDING:
        pytest.skip("removed by the rewrite of the readers")
    for node, func in _imports(module):
        if func is None or (module, func) in LAZY:
            continue
        targets = _targets(module, node)
        assert not targets, (
            f"{module}: function {func}() imports {targets} at line {node.lineno}; import at "
            "module level (the one lazy mechanism is seatool.__getattr__)"
        )


@pytest.mark.parametrize("module", sorted(MODS))
def test_no_module_loaded_by_name(module):
    if module in PENDING:
        pytest.skip("removed by the rewrite of the readers")
    tree = ast.parse(MODS[module].read_text(encoding="utf-8"))
    for node in ast.walk(tree):
        if isinstance(node, ast.Call):
            f = node.func
            name = f.attr if isinstance(f, ast.Attribute) else getattr(f, "id", "")
            assert name not in ("import_module", "__import__", "LazyLoader"), (
                f"{module} line {node.lineno}: modules are imported by import statements, "
                "never loaded by name"
            )


def test_the_facade_imports_nothing_eagerly():
    # `import seatool` stays fast: at module level the package imports only its version
    for node, func in _imports("seatool"):
        if func is None and not _in_type_checking("seatool", node):
            assert _targets("seatool", node) in ([], ["seatool._version"]), node.lineno


def _in_type_checking(module: str, target: ast.AST) -> bool:
    tree = ast.parse(MODS[module].read_text(encoding="utf-8"))
    for node in ast.walk(tree):
        if isinstance(node, ast.If) and getattr(node.test, "id", "") == "TYPE_CHECKING":
            for child in ast.walk(node):
                if isinstance(child, ast.Import | ast.ImportFrom) and child.lineno == target.lineno:
                    return True
    return False


def test_the_checks_catch_an_upward_import(tmp_path, monkeypatch):
    # the checks above can fail: a physics module importing the solver is refused
    bad = tmp_path / "seatool" / "physics"
    bad.mkdir(parents=True)
    (bad / "__init__.py").write_text("")
    (bad / "bad.py").write_text("from ..solve import solve\n\ndef f():\n    import seatool.bands\n")
    (tmp_path / "seatool" / "solve.py").write_text("")
    (tmp_path / "seatool" / "bands.py").write_text("")
    (tmp_path / "seatool" / "__init__.py").write_text("")
    monkeypatch.setattr(sys.modules[__name__], "PACKAGE", tmp_path / "seatool")
    mods = _modules()
    monkeypatch.setattr(sys.modules[__name__], "MODS", mods)
    with pytest.raises(AssertionError, match="imports must point down"):
        test_imports_point_down("seatool.physics.bad")
    with pytest.raises(AssertionError, match="imports"):
        test_no_function_local_import_of_seatool("seatool.physics.bad")
