"""Runs the worked example of docs/python-api.md, block by block, in one namespace."""

from __future__ import annotations

import re
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
DOC = ROOT / "docs" / "python-api.md"


def test_python_api_doc_runs(monkeypatch, capsys):
    blocks = re.findall(r"```python\n(.*?)```", DOC.read_text(encoding="utf-8"), re.S)
    assert len(blocks) >= 5
    monkeypatch.chdir(ROOT)
    namespace: dict[str, object] = {}
    for i, code in enumerate(blocks):
        try:
            exec(compile(code, f"{DOC.name}[block {i}]", "exec"), namespace)
        except Exception as exc:  # name the block that failed
            pytest.fail(f"block {i} of {DOC.name} failed: {type(exc).__name__}: {exc}")
    out = capsys.readouterr().out
    assert "dB(A)" in out and "strongest path" in out
