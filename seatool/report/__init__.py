"""Reports an engineer can hand over: one self-contained HTML file and a JSON companion.

:func:`write_report` solves a model file, runs the analyses a report shows and writes
``NAME.html`` (figures inline, no network, readable without JavaScript, prints on A4)
and ``NAME.json`` (every table of the report, with the caution) beside it, atomically:
either both files are written or neither is. :func:`collect` and :func:`render_html` are
the two halves for use from Python.
"""

from __future__ import annotations

import json
import os
from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from ..analysis._keypath import read_data
from ..errors import InputError, Problem
from ..outputs import OutputBatch, write_text_atomic
from ..results import CAUTION
from .content import Content, TargetHook, collect
from .html import SECTIONS, render_html

__all__ = [
    "SECTIONS",
    "Content",
    "ReportFiles",
    "TargetHook",
    "collect",
    "companion",
    "render_html",
    "write_report",
]


@dataclass(frozen=True)
class ReportFiles:
    """The files a report run wrote."""

    html: Path
    json: Path


def companion(content: Content) -> dict[str, Any]:
    """The report's tables as plain data (for the JSON companion).

    ``{"caution", "title", "source", "receiver", "tables": {name: {"columns": [...],
    "data": [[...], ...]}}}``; missing numbers are ``null``; units are in the column
    names or documented with the Python function that makes each table.
    """
    tables = {
        name: json.loads(df.to_json(orient="split", index=False, double_precision=10))
        for name, df in content.tables.items()
    }
    return {
        "caution": CAUTION,
        "title": content.title,
        "source": content.source,
        "receiver": content.receiver,
        "receivers": content.receivers,
        "confidence_note": content.confidence_note,
        "tables": tables,
        "references": [{"text": r.text, "used_by": list(r.used_by)} for r in content.references],
    }


def _write_all(files: Mapping[Path, str]) -> None:
    """Write every file or none (one :class:`~seatool.outputs.OutputBatch`)."""
    with OutputBatch():
        for path, text in files.items():
            write_text_atomic(path, text)


def write_report(
    model_file: str | os.PathLike[str],
    out: str | os.PathLike[str],
    **options: Any,
) -> ReportFiles:
    """Write the report of a model file to ``out`` (.html) and its JSON companion.

    ``options`` go to :func:`collect` (``receiver``, ``band``, ``samples``, ``seed``,
    ``targets``, ``progress``). The companion has the same name with ``.json``. Nothing
    is left behind when anything fails (bad input, a failed analysis, a full disk).
    """
    html_path = Path(out)
    if html_path.suffix.lower() not in (".html", ".htm"):
        raise InputError([Problem(str(html_path), "--output", "use a .html file name")])
    if not html_path.parent.exists():
        raise InputError(
            [Problem(str(html_path), "--output",
                     f"folder {str(html_path.parent)!r} does not exist")]
        )  # fmt: skip
    data, file, base = read_data(Path(model_file))
    content = collect(data, file=file, base_dir=base, **options)
    html = render_html(content)
    json_path = html_path.with_suffix(".json")
    payload = json.dumps(companion(content), indent=1, ensure_ascii=False)
    try:
        _write_all({html_path: html, json_path: payload})
    except OSError as exc:
        raise InputError(
            [Problem(str(html_path), "--output", f"cannot write: {exc.strerror or exc}")]
        ) from None
    return ReportFiles(html_path, json_path)
