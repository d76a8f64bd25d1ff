"""The published sources of every formula a model used, gathered from the code itself.

Nothing is listed by hand: for every subsystem and connection kind in the model, the
reader function registered for it is read (its source, with :mod:`ast`), the functions it
calls are followed through the model-file readers, and every physics function reached
(:mod:`seatool.physics`) contributes the entries of the ``References`` section of its
numpydoc docstring. The functions the report itself uses for levels and weightings
(:mod:`seatool.levels`, :mod:`seatool.bands`) and for validity
(:mod:`seatool.physics.validity`) are added the same way. Parsing happens when a report is
built, never at import.
"""

from __future__ import annotations

import ast
import inspect
import re
import textwrap
import types
from collections.abc import Callable, Iterable
from dataclasses import dataclass

from .. import bands, levels, modelfile
from ..kinds.excitations import diffuse_nonresonant
from ..kinds.registry import EXCITATION_KINDS
from ..model import Model
from ..physics import validity as physics_validity

__all__ = ["Reference", "docstring_references", "model_references", "physics_functions"]

#: Modules whose functions are followed (readers and their helpers) to reach physics.
_FOLLOW = ("seatool.kinds", "seatool.modelfile", "seatool.catalogue", "seatool.materials")
#: Modules whose functions are formulas with cited sources.
_CITED = ("seatool.physics", "seatool.levels", "seatool.bands")

_SECTION = re.compile(r"^\s*References\s*\n\s*-{5,}\s*\n", re.MULTILINE)
_NEXT_SECTION = re.compile(r"\n\s*[A-Z][A-Za-z ]+\n\s*-{3,}\s*\n")
_ENTRY = re.compile(r"\.\.\s*\[[^\]]+\]\s*")
#: An entry is a published source when it has a year or names a standard.
_PUBLISHED = re.compile(r"\b(1[89]|20)\d\d\b|\b(ISO|IEC|EN|ANSI|DIN)\b")


@dataclass(frozen=True)
class Reference:
    """One published source and the functions of seatool that cite it."""

    text: str
    used_by: tuple[str, ...]


def docstring_references(func: Callable[..., object]) -> list[str]:
    """The entries of the ``References`` section of ``func``'s numpydoc docstring.

    Each entry is returned on one line (whitespace collapsed), without its ``.. [n]``
    label; an empty list when the docstring has no such section.
    """
    doc = inspect.getdoc(func) or ""
    m = _SECTION.search(doc)
    if m is None:
        return []
    body = doc[m.end() :]
    nxt = _NEXT_SECTION.search(body)
    if nxt is not None:
        body = body[: nxt.start()]
    parts = [p for p in _ENTRY.split(body) if p.strip()]
    out = [" ".join(p.split()) for p in parts]
    return [p for p in out if _PUBLISHED.search(p)]


def _module_of(obj: object) -> str:
    return str(getattr(obj, "__module__", "") or "")


def _called(func: types.FunctionType) -> Iterable[object]:
    """Objects named in ``func``'s body that resolve through its module globals."""
    try:
        tree = ast.parse(textwrap.dedent(inspect.getsource(func)))
    except (OSError, TypeError, SyntaxError):
        return []
    glob = func.__globals__
    found: list[object] = []
    for node in ast.walk(tree):
        if isinstance(node, ast.Name) and node.id in glob:
            found.append(glob[node.id])
        elif isinstance(node, ast.Attribute) and isinstance(node.value, ast.Name):
            base = glob.get(node.value.id)
            if isinstance(base, types.ModuleType):
                found.append(getattr(base, node.attr, None))
    return found


def physics_functions(
    roots: Iterable[Callable[..., object]], *, depth: int = 6
) -> list[types.FunctionType]:
    """Cited functions (physics, levels, bands) reached from ``roots`` through the readers.

    Follows calls through functions of the model-file readers (up to ``depth`` calls
    deep) and through cited functions that call other cited functions.
    """
    seen: set[types.FunctionType] = set()
    cited: dict[str, types.FunctionType] = {}
    todo: list[tuple[types.FunctionType, int]] = [
        (f, 0) for f in roots if isinstance(f, types.FunctionType)
    ]
    while todo:
        func, level = todo.pop()
        if func in seen or level > depth:
            continue
        seen.add(func)
        mod = _module_of(func)
        if mod.startswith(_CITED):
            cited[f"{mod}.{func.__qualname__}"] = func
        for obj in _called(func):
            if isinstance(obj, types.FunctionType) and _module_of(obj).startswith(
                _FOLLOW + _CITED
            ):
                todo.append((obj, level + 1))
    return [cited[k] for k in sorted(cited)]


def _reader_roots(model: Model) -> list[Callable[..., object]]:
    """The derive functions of the declared kinds the model uses."""
    roots: list[Callable[..., object]] = []

    def add(kind: object) -> None:
        derive = getattr(kind, "derive", kind)
        if callable(derive):
            roots.append(derive)

    for s in model.subsystems:
        if s.kind in modelfile.SUBSYSTEM_KINDS:
            add(modelfile.SUBSYSTEM_KINDS[s.kind])
    for c in model.connections:
        if c.kind in modelfile.CONNECTION_KINDS:
            add(modelfile.CONNECTION_KINDS[c.kind])
    for e in model.excitations:
        if e.through:
            add(diffuse_nonresonant)
        elif (e.quantity or "") in EXCITATION_KINDS:
            add(EXCITATION_KINDS[e.quantity or ""])
    return list(dict.fromkeys(roots))


#: Functions every report uses: levels and their references, band centres, A-weighting,
#: the SEA validity measures.
def _report_roots() -> list[Callable[..., object]]:
    return [
        levels.sound_pressure_level,
        levels.velocity_level,
        levels.mean_square_pressure,
        bands.exact_mid_frequency,
        bands.a_weighting,
        *[
            f
            for _, f in inspect.getmembers(physics_validity, inspect.isfunction)
            if _module_of(f) == physics_validity.__name__ and not f.__name__.startswith("_")
        ],
    ]


def model_references(model: Model) -> list[Reference]:
    """Every published source behind the numbers of a report on ``model``.

    Sorted by text; each names the seatool functions (module-qualified) that cite it.
    """
    funcs = physics_functions([*_reader_roots(model), *_report_roots()])
    by_text: dict[str, list[str]] = {}
    for f in funcs:
        name = f"{_module_of(f).removeprefix('seatool.')}.{f.__qualname__}"
        for ref in docstring_references(f):
            by_text.setdefault(ref, [])
            if name not in by_text[ref]:
                by_text[ref].append(name)
    return [Reference(t, tuple(by_text[t])) for t in sorted(by_text, key=str.casefold)]
