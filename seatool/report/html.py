"""One self-contained HTML file from a report's :class:`~seatool.report.content.Content`.

jinja2 renders ``templates/report.html.j2`` with autoescaping on, so every string that
comes from a model file (title, description, names) is shown as text. Figures are
embedded as base64 ``data:`` URLs of SVG images; a Content-Security-Policy forbids every
other resource, so the file opens with no network and no JavaScript, and prints on A4.
"""

from __future__ import annotations

import base64
import datetime as _dt
import math
from importlib.metadata import PackageNotFoundError
from importlib.metadata import version as _dist_version
from typing import Any

import jinja2
import numpy as np
import pandas as pd

from ..results import CAUTION
from .content import ASSUMPTIONS, Content

__all__ = ["SECTIONS", "render_html"]

#: Sections of a report: (HTML id, heading in the contents list). Tests check each id.
SECTIONS = (
    ("model", "The job and the model"),
    ("levels", "Receiver levels per band"),
    ("overall", "Overall and A-weighted levels"),
    ("decisions", "Targets and design decisions"),
    ("flow", "Energy flow"),
    ("paths", "Sources and paths"),
    ("sensitivity", "Largest sensitivities"),
    ("spread", "Spread (5 / 50 / 95 %)"),
    ("validity", "SEA validity per band"),
    ("assumptions", "Assumptions"),
    ("cautions", "Caution"),
    ("references", "References"),
)


#: Columns of running text (set narrower and smaller than names and numbers).
_TEXT_COLUMNS = ("description", "derived from", "modal density from", "damping from", "message")


def _cell(column: str, value: Any) -> tuple[str, str]:
    if isinstance(value, bool | np.bool_):
        return ("yes" if value else "no"), ""
    if isinstance(value, int | np.integer):
        return str(int(value)), "num"
    if isinstance(value, float | np.floating):
        x = float(value)
        if math.isnan(x):
            return "-", "num"
        hz = column.startswith("band") or column.endswith("_hz")
        if "dB" in column or "margin" in column or hz:
            cls = "num bad" if "margin" in column and x < 0 else "num"
            return (f"{x:g}" if hz else f"{x:.1f}"), cls
        if column in ("share", "source_share"):
            return f"{100 * x:.1f} %", "num"
        return f"{x:.3g}", "num"
    text = str(value)
    if column in _TEXT_COLUMNS:
        return text, "text"
    # long names may wrap after an underscore, a dot or '>' (a zero-width space, not markup)
    if len(text) > 16:
        for sep in ("_", ".", ">"):
            text = text.replace(sep, sep + "\u200b")
    return text, ""


def _table(df: pd.DataFrame) -> dict[str, Any]:
    cols = [str(c) for c in df.columns]
    rows = [
        [_cell(c, v) for c, v in zip(cols, rec, strict=True)]
        for rec in df.itertuples(index=False, name=None)
    ]
    return {"columns": cols, "rows": rows}


def _data_url(svg: str) -> str:
    return "data:image/svg+xml;base64," + base64.b64encode(svg.encode("utf-8")).decode("ascii")


def _environment() -> jinja2.Environment:
    return jinja2.Environment(
        loader=jinja2.PackageLoader("seatool.report", "templates"),
        autoescape=True,
        undefined=jinja2.StrictUndefined,
        trim_blocks=False,
    )


def _version() -> str:
    try:
        return _dist_version("seatool")
    except PackageNotFoundError:  # running from a source tree that is not installed
        return "(source tree)"


def render_html(content: Content, *, created: str | None = None) -> str:
    """The report as one HTML document (text)."""
    env = _environment()
    tpl = env.get_template("report.html.j2")
    shown = {
        k: v for k, v in content.tables.items() if k not in ("contributions",)
    }
    tables = {k: _table(v) for k, v in shown.items()}
    if created is None:
        created = _dt.datetime.now(_dt.UTC).strftime("%Y-%m-%d %H:%M UTC")
    return tpl.render(
        c=content,
        t=tables,
        figures={k: _data_url(v) for k, v in content.figures.items()},
        caution=CAUTION,
        assumptions=ASSUMPTIONS,
        sections=SECTIONS,
        version=_version(),
        created=created,
    )
