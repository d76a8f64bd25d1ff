"""Key tables of ``docs/model-format.md`` generated from the kinds' declarations.

Each table sits between marker comments in the document::

    <!-- keys: subsystem plate -->
    | key | type | required | meaning |
    ...
    <!-- end keys -->

``python -m seatool.kinds.docs`` rewrites every such block from :data:`KINDS` (and the
material and fluid schema); ``python -m seatool.kinds.docs --check`` exits 1 when a block
is stale or a kind has no block (the test suite runs the same check).
"""

from __future__ import annotations

import re
import sys
from pathlib import Path

from ..outputs import write_text_atomic
from .media import FLUID_PARAMS, MATERIAL_PARAMS
from .params import Param, type_doc
from .registry import KINDS

__all__ = ["DOC", "block_names", "missing_blocks", "render_params", "update"]

#: The document holding the tables (relative to the repository root).
DOC = Path(__file__).resolve().parents[2] / "docs" / "model-format.md"

#: A marker block; a new kind's empty block may be written on one line
#: (``<!-- keys: FAMILY NAME --><!-- end keys -->``): it is filled on the next run.
_BLOCK = re.compile(r"(<!-- keys: (\w+) (\w+) -->)\n?(.*?)(<!-- end keys -->)", re.S)


def _default(p: Param) -> str:
    if p.required:
        return "yes"
    if p.default_doc:
        return f"no ({p.default_doc})"
    if p.default is not None and p.default is not False:
        d = f'"{p.default}"' if isinstance(p.default, str) else f"{p.default:g}"
        return f"no ({d})"
    return "no"


def _bounds(p: Param) -> str:
    parts = []
    unit = f" {p.unit}" if p.unit else ""
    if p.bounds is not None:
        parts.append(f"accepted {p.bounds[0]:g} .. {p.bounds[1]:g}{unit} ({p.basis})")
    elif p.type in ("number", "spectrum") and p.minimum is not None:
        parts.append(f"{'>' if p.strict else '>='} {p.minimum:g}")
    if p.maximum is not None:
        parts.append(f"{'<' if p.strict_max else '<='} {p.maximum:g}")
    if p.typical is not None:
        parts.append(f"typical {p.typical[0]:g} .. {p.typical[1]:g}{unit}")
    return "; ".join(parts)


def render_params(params: tuple[Param, ...]) -> str:
    """A markdown key table of some parameters."""
    lines = ["| key | type | required | meaning |", "|---|---|---|---|"]
    for p in params:
        meaning = p.doc
        b = _bounds(p)
        if b:
            meaning = f"{meaning}; {b}" if meaning else b
        lines.append(f"| `{p.name}` | {type_doc(p)} | {_default(p)} | {meaning} |")
    return "\n".join(lines) + "\n"


def _tables() -> dict[tuple[str, str], str]:
    out = {(k.family, k.name): render_params(k.params) for k in KINDS if k.params}
    out[("schema", "material")] = render_params(MATERIAL_PARAMS)
    out[("schema", "fluid")] = render_params(FLUID_PARAMS)
    return out


def block_names(text: str) -> set[tuple[str, str]]:
    """The (family, name) of every marker block in ``text``."""
    return {(m.group(2), m.group(3)) for m in _BLOCK.finditer(text)}


def missing_blocks(text: str) -> list[tuple[str, str]]:
    """Declared kinds (with parameters) that have no marker block in ``text``."""
    have = block_names(text)
    return [k for k in _tables() if k not in have]


def update(text: str) -> str:
    """``text`` with every marker block rewritten from the declarations."""
    tables = _tables()

    def sub(m: re.Match[str]) -> str:
        key = (m.group(2), m.group(3))
        if key not in tables:
            raise KeyError(f"docs block for an unknown kind: {key[0]} {key[1]}")
        return m.group(1) + "\n" + tables[key] + m.group(5)

    return _BLOCK.sub(sub, text)


def main(argv: list[str] | None = None) -> int:
    args = sys.argv[1:] if argv is None else argv
    text = DOC.read_text(encoding="utf-8")
    new = update(text)
    missing = missing_blocks(text)
    if "--check" in args:
        for fam, name in missing:
            print(f"{DOC.name}: no key table for {fam} kind {name!r}", file=sys.stderr)
        if new != text:
            print(f"{DOC.name}: key tables are stale; run python -m seatool.kinds.docs", file=sys.stderr)
        return 1 if missing or new != text else 0
    if new != text:
        write_text_atomic(DOC, new)
    for fam, name in missing:
        print(f"{DOC.name}: no key table for {fam} kind {name!r}", file=sys.stderr)
    return 1 if missing else 0


if __name__ == "__main__":
    raise SystemExit(main())
