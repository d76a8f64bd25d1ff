"""What the occupants hear: single-number metrics of every cavity (receiver) of a result.

For each cavity subsystem (a sound pressure level, not the exterior sink) the band levels of
a solved model give the overall level, the A- and C-weighted levels (IEC 61672-1), the
speech interference level (ISO 9921), and the stationary loudness and loudness level by the
Zwicker method (ISO 532-1), each with the assumptions made where the model's band range
does not cover the metric's range. The metrics themselves live in :mod:`seatool.metrics`.

Typical use::

    from seatool.analysis.comfort import receiver_metrics, receiver_metric
    table = receiver_metrics(result)              # one row per cavity
    sil = receiver_metric(result, "cab", "SIL")   # value, gradient per band, notes

This module only reads a result; it never changes the model.
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np
import pandas as pd

from ..errors import InputError, Problem, closest
from ..loudness import Field
from ..metrics import METRICS, MetricValue
from ..results import CAUTION, Result

__all__ = [
    "COLUMNS",
    "metric_sensitivities",
    "receiver_metric",
    "receiver_metrics",
    "receivers",
    "render",
]

#: Output column of each metric in :func:`receiver_metrics`, by metric name.
COLUMNS: dict[str, str] = {
    "dB": "overall_dB",
    "dBA": "overall_dBA",
    "dBC": "overall_dBC",
    "SIL": "SIL_dB",
    "sone": "loudness_sone",
    "phon": "loudness_level_phon",
}


def receivers(result: Result) -> list[str]:
    """Names of the cavity subsystems of a result (sound pressure levels, no sink)."""
    return [
        s.name for s in result.model.subsystems if s.quantity == "sound_pressure" and not s.sink
    ]


def _check_field(field: str) -> Field:
    if field not in ("free", "diffuse"):
        raise InputError(
            [Problem("", "field", f"sound field must be 'free' or 'diffuse', got {field!r}")]
        )
    return "free" if field == "free" else "diffuse"


def _levels(result: Result, names: Sequence[str]) -> np.ndarray:
    model = result.model
    allowed = receivers(result)
    problems = [
        Problem(
            model.source,
            "receiver",
            f"{n!r} is not a cavity with a sound pressure level"
            + (closest(n, allowed) if allowed else "; the model has no cavity"),
        )
        for n in names
        if n not in allowed
    ]
    if problems:
        raise InputError(problems)
    lv, _, _ = result.level_array()
    idx = model.index()
    return np.vstack([lv[idx[n]] for n in names]) if names else np.zeros((0, len(model.bands)))


def receiver_metric(
    result: Result, receiver: str, metric: str, *, field: str = "diffuse"
) -> MetricValue:
    """One metric of one cavity: value, gradient d value / d L_band per band, notes.

    Parameters
    ----------
    result : Result
        A solved model.
    receiver : str
        Name of a cavity subsystem.
    metric : str
        A key of :data:`seatool.metrics.METRICS`: ``dB``, ``dBA``, ``dBC``, ``SIL``,
        ``sone``, ``phon``.
    field : {'diffuse', 'free'}
        Sound field for the loudness (diffuse inside a cabin, the default).

    Returns
    -------
    MetricValue
        Scalar ``value``; ``gradient`` of shape (B,) over the model's bands, to be chained
        with the derivative of the band levels (e.g. adjoint sensitivities) by
        d metric / d p = sum_k gradient_k dL_k / dp.
    """
    if metric not in METRICS:
        same_case = [k for k in METRICS if k.lower() == metric.lower()]
        hint = f" (did you mean {same_case[0]!r}?)" if same_case else closest(metric, METRICS)
        raise InputError(
            [
                Problem(
                    result.model.source,
                    "metric",
                    f"unknown metric {metric!r}{hint}; choose one of {', '.join(METRICS)}",
                )
            ]
        )
    lv = _levels(result, [receiver])[0]
    return METRICS[metric](lv, result.model.bands, field=_check_field(field))


def receiver_metrics(
    result: Result, field: str = "diffuse", names: Sequence[str] | None = None
) -> pd.DataFrame:
    """Comfort metrics of every cavity (receiver) subsystem of a solved model.

    Parameters
    ----------
    result : Result
        A solved model.
    field : {'diffuse', 'free'}
        Sound field assumed for the loudness; ``diffuse`` (default) inside a cabin.
    names : sequence of str, optional
        Cavities to report (default: every cavity, in model order).

    Returns
    -------
    pandas.DataFrame
        One row per cavity: ``subsystem``, ``overall_dB``, ``overall_dBA``, ``overall_dBC``
        [dB re 20 uPa], ``SIL_dB`` (ISO 9921), ``loudness_sone``, ``loudness_level_phon``
        (ISO 532-1, Zwicker method), ``field``, ``notes`` (what each metric assumed where the
        model's bands do not cover its range, joined by ``'; '``). ``attrs['references']``
        names each metric's source and ``attrs['caution']`` the caution on levels.
    """
    fld = _check_field(field)
    chosen = receivers(result) if names is None else list(names)
    lv = _levels(result, chosen)
    bands = result.model.bands
    table: dict[str, object] = {"subsystem": chosen}
    notes: list[str] = []
    refs: dict[str, str] = {}
    for name, column in COLUMNS.items():
        m = METRICS[name](lv, bands, field=fld)
        table[column] = np.asarray(m.value, dtype=float)
        refs[column] = m.reference
        notes.extend(n for n in m.notes if n not in notes)
    table["field"] = [fld] * len(chosen)
    table["notes"] = ["; ".join(notes)] * len(chosen)
    out = pd.DataFrame(table)
    out.attrs["references"] = refs
    out.attrs["caution"] = CAUTION
    return out


_HEADINGS = {
    "overall_dB": "dB",
    "overall_dBA": "dB(A)",
    "overall_dBC": "dB(C)",
    "SIL_dB": "SIL dB",
    "loudness_sone": "sone",
    "loudness_level_phon": "phon",
}


def render(table: pd.DataFrame, *, digits: int = 1) -> str:
    """Text block of a :func:`receiver_metrics` table: one line per cavity, then the notes
    and the sources (the caller shows the caution once with the levels)."""
    if table.empty:
        return ""
    field = str(table["field"].iloc[0])
    head = ["cavity", *_HEADINGS.values()]
    rows = []
    for r in table.itertuples(index=False):
        cells = [str(r.subsystem)]
        for column in _HEADINGS:
            v = float(getattr(r, column))
            d = digits + 1 if column == "loudness_sone" else digits
            cells.append(f"{v:.{d}f}" if np.isfinite(v) else "-")
        rows.append(cells)
    widths = [max(len(x[k]) for x in [head, *rows]) for k in range(len(head))]
    fmt = "  ".join(f"{{:>{w}}}" if k else f"{{:<{w}}}" for k, w in enumerate(widths))
    out = [f"what the occupants hear (loudness for a {field} field)", fmt.format(*head)]
    out.append(fmt.format(*["-" * w for w in widths]))
    out.extend(fmt.format(*x) for x in rows)
    out.append("levels re 20 uPa; dB(A), dB(C): IEC 61672-1; SIL: ISO 9921; sone, phon: ISO 532-1")
    notes = str(table["notes"].iloc[0])
    out.extend(f"note: {n}" for n in notes.split("; ") if n)
    return "\n".join(out)


def metric_sensitivities(
    result: Result, sensitivities: pd.DataFrame, metric: str, *, field: str = "diffuse"
) -> pd.DataFrame:
    """Sensitivity of a metric of each receiver to each parameter, by the chain rule.

    Parameters
    ----------
    result : Result
        The solved model the sensitivities belong to.
    sensitivities : pandas.DataFrame
        Per-band level sensitivities of cavities, as returned by
        :func:`seatool.analysis.sensitivity.sensitivities` or
        :func:`~seatool.analysis.sensitivity.parameter_sensitivities` (columns
        ``receiver, parameter, parameter_type, target, band_exact_hz, dL_dlnx_dB``).
    metric : str
        A key of :data:`seatool.metrics.METRICS`.
    field : {'diffuse', 'free'}
        Sound field of the loudness.

    Returns
    -------
    pandas.DataFrame
        One row per receiver and parameter: ``receiver, parameter, parameter_type, target,
        metric, value, unit, dM_dlnx`` (change of the metric per unit change of ln x) and
        ``dM_per_percent`` (linearised change for a 1 % increase of x).

    Notes
    -----
    dM/d ln x = sum_k (dM/dL_k)(dL_k/d ln x), with dM/dL_k the metric's gradient
    (:mod:`seatool.metrics`) and dL_k/d ln x the band-level sensitivity (adjoint method).
    Bands where the metric's gradient is zero do not contribute, whatever their level
    sensitivity (e.g. a silent band).
    """
    bands = result.model.bands
    cache: dict[str, MetricValue] = {}
    rows = []
    for (rec, par), grp in sensitivities.groupby(["receiver", "parameter"], sort=False):
        rec = str(rec)
        if rec not in cache:
            cache[rec] = receiver_metric(result, rec, metric, field=field)
        m = cache[rec]
        pos = np.searchsorted(bands.centre, grp["band_exact_hz"].to_numpy(dtype=float))
        pos = np.clip(pos, 0, len(bands) - 1)
        dl = np.full(len(bands), np.nan)
        dl[pos] = grp["dL_dlnx_dB"].to_numpy(dtype=float)
        w = np.asarray(m.gradient, dtype=float)
        with np.errstate(invalid="ignore"):
            d = float(np.sum(np.where(w != 0.0, w * dl, 0.0)))
        first = grp.iloc[0]
        rows.append(
            (
                rec,
                par,
                first["parameter_type"],
                first["target"],
                metric,
                float(m.value),
                m.unit,
                d,
                d / 100.0,
            )
        )
    columns = [
        "receiver",
        "parameter",
        "parameter_type",
        "target",
        "metric",
        "value",
        "unit",
        "dM_dlnx",
        "dM_per_percent",
    ]
    return pd.DataFrame(rows, columns=columns)
