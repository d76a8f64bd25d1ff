"""docs/validation.md lists every test marked measured, consistency or regression in its
section (the markers are registered in pyproject.toml)."""

from __future__ import annotations

import ast
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
SECTIONS = {"measured": "Measured", "consistency": "Consistency", "regression": "Regression"}


def _marked() -> dict[str, list[str]]:
    found: dict[str, list[str]] = {m: [] for m in SECTIONS}
    for path in sorted((ROOT / "tests").rglob("test_*.py")):
        tree = ast.parse(path.read_text(encoding="utf-8"))
        for node in ast.walk(tree):
            if not isinstance(node, ast.FunctionDef) or not node.name.startswith("test_"):
                continue
            for dec in node.decorator_list:
                text = ast.unparse(dec)
                for mark in SECTIONS:
                    if text in (f"pytest.mark.{mark}", f"mark.{mark}"):
                        found[mark].append(f"{path.relative_to(ROOT).as_posix()}::{node.name}")
    return found


def _section(text: str, title: str) -> str:
    start = text.index(f"\n## {title}\n")
    end = text.find("\n## ", start + 1)
    return text[start : end if end >= 0 else len(text)]


def test_every_marked_test_is_listed_in_its_section():
    text = (ROOT / "docs" / "validation.md").read_text(encoding="utf-8")
    found = _marked()
    assert all(found.values()), found  # the scan finds each kind
    missing = [
        (mark, name)
        for mark, names in found.items()
        for name in names
        if f"`{name}`" not in _section(text, SECTIONS[mark])
    ]
    assert not missing, missing
