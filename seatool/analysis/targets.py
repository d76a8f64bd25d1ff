"""Targets: margins of each receiver to its limits, verdicts, probability of meeting them.

A target (``[targets.NAME]`` of the model file, :class:`seatool.model.Target`) states,
for one receiver subsystem, limits on single-number metrics (any metric of
:data:`seatool.metrics.METRICS`: ``dBA``, ``dB``, ``dBC``, ``SIL``, ``sone``, ``phon``)
and/or a limit per band. The margin is ``limit - level`` (positive = met), per band and
per metric; a target is met when every margin is >= 0.

The margins are computed from band levels of any leading shape (one solve, Monte Carlo
samples, candidate treatments), so the same function serves the verdict of ``solve``, the
probability of meeting a target and the search for the lightest treatment.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any, Literal

import numpy as np
import numpy.typing as npt
import pandas as pd

from ..bands import BandAxis
from ..errors import InputError, Problem, closest
from ..levels import db
from ..metrics import METRICS
from ..model import Model, Target
from ..physics.variance import DISTRIBUTION, energy_ratio_samples
from ..results import Result
from .confidence import relative_variances
from .uncertainty import Spread

__all__ = [
    "Margins",
    "Verdict",
    "margin_table",
    "margins_of_levels",
    "probability_from_variance",
    "probability_of_meeting",
    "render_confidence",
    "render_margins",
    "render_verdicts",
    "verdicts",
]

Array = npt.NDArray[np.float64]

#: Unit of a margin on each metric (margins on levels are in dB).
MARGIN_UNITS: dict[str, str] = {
    "dB": "dB",
    "dBA": "dB(A)",
    "dBC": "dB(C)",
    "SIL": "dB",
    "sone": "sone",
    "phon": "phon",
}


@dataclass(frozen=True)
class Margins:
    """Margins of levels of shape (..., B) to one target.

    Attributes
    ----------
    target : Target
    metric : dict of str to ndarray
        Per limited metric: its value (shape ...) and margin ``limit - value`` (shape ...).
    band : ndarray or None
        ``band_limit - level`` (..., B) [dB], or None without a band limit.
    """

    target: Target
    value: dict[str, Array]
    metric: dict[str, Array]
    band: Array | None

    @property
    def met(self) -> Array:
        """True where every margin is >= 0 (shape ...)."""
        ok: Any = True
        for m in self.metric.values():
            ok = ok & (m >= 0.0)
        if self.band is not None:
            ok = ok & np.all(self.band >= 0.0, axis=-1)
        return np.asarray(ok, dtype=bool)

    @property
    def smallest(self) -> Array:
        """The smallest margin (shape ...) in its own unit (dB for levels, sone for loudness)."""
        parts = list(self.metric.values())
        if self.band is not None:
            parts.append(np.min(self.band, axis=-1))
        return np.min(np.stack(np.broadcast_arrays(*parts)), axis=0)


def margins_of_levels(
    levels: npt.ArrayLike, bands: BandAxis, target: Target, *, field: str = "diffuse"
) -> Margins:
    """Margins of receiver band levels (..., B) [dB] to ``target``'s limits.

    Metric values come from :data:`seatool.metrics.METRICS` (A- and C-weighting of
    IEC 61672-1 at the exact mid-band frequencies, energetic band sums, ISO 9921 SIL,
    ISO 532-1 loudness in the given ``field``).
    """
    lv = np.asarray(levels, dtype=float)
    values: dict[str, Array] = {}
    metric: dict[str, Array] = {}
    for name, limit in target.limits.items():
        v = np.asarray(METRICS[name](lv, bands, field=field).value, dtype=float)
        values[name] = v
        metric[name] = float(limit) - v
    band = None
    if target.band_limit is not None:
        band = np.asarray(target.band_limit, dtype=float) - lv
    return Margins(target, values, metric, band)


def _targets(model: Model, names: Sequence[str] | None) -> list[Target]:
    if names is None:
        return list(model.targets)
    by = {t.name: t for t in model.targets}
    bad = [n for n in names if n not in by]
    if bad:
        raise InputError(
            [
                Problem(model.source, "targets", f"no target {n!r}" + closest(n, list(by)))
                for n in bad
            ]
        )
    return [by[n] for n in names]


def _receiver_levels(result: Result, receiver: str) -> Array:
    lv, _, _ = result.level_array()
    return np.asarray(lv[result.model.index()[receiver]], dtype=float)


def margin_table(
    result: Result, targets: Sequence[str] | None = None, *, field: str = "diffuse"
) -> pd.DataFrame:
    """Tidy table of the margins of a solved model to its targets.

    Columns: ``target, receiver, limit_on`` (a metric name, or ``band``), ``band_hz``,
    ``band_exact_hz`` (NaN on metric rows), ``level`` (metric value or band level),
    ``limit``, ``margin`` (limit - level; positive = met), ``unit``, ``met``.
    """
    model = result.model
    bands = model.bands
    _, _, refs = result.level_array()
    idx = model.index()
    rows: list[dict[str, Any]] = []
    for t in _targets(model, targets):
        lv = _receiver_levels(result, t.receiver)
        mg = margins_of_levels(lv, bands, t, field=field)
        for name, m in mg.metric.items():
            rows.append(
                {
                    "target": t.name,
                    "receiver": t.receiver,
                    "limit_on": name,
                    "band_hz": np.nan,
                    "band_exact_hz": np.nan,
                    "level": float(mg.value[name]),
                    "limit": float(t.limits[name]),
                    "margin": float(m),
                    "unit": MARGIN_UNITS.get(name, name),
                    "met": bool(m >= 0.0),
                }
            )
        if mg.band is not None:
            assert t.band_limit is not None
            ref = refs[idx[t.receiver]]
            for k in range(len(bands)):
                rows.append(
                    {
                        "target": t.name,
                        "receiver": t.receiver,
                        "limit_on": "band",
                        "band_hz": float(bands.nominal[k]),
                        "band_exact_hz": float(bands.centre[k]),
                        "level": float(lv[k]),
                        "limit": float(t.band_limit[k]),
                        "margin": float(mg.band[k]),
                        "unit": f"dB {ref}".strip(),
                        "met": bool(mg.band[k] >= 0.0),
                    }
                )
    cols = [
        "target", "receiver", "limit_on", "band_hz", "band_exact_hz",
        "level", "limit", "margin", "unit", "met",
    ]  # fmt: skip
    return pd.DataFrame(rows, columns=cols)


@dataclass(frozen=True)
class Verdict:
    """Whether one target is met, by how much, and where it binds.

    ``binding`` is the limit with the smallest margin: a metric name, or the band label
    (e.g. ``250 Hz``); ``missed`` lists every limit with a negative margin.
    """

    target: str
    receiver: str
    met: bool
    margin: float
    unit: str
    binding: str
    missed: tuple[str, ...]
    line: str


def _hz(f: float) -> str:
    return f"{f / 1000:g} kHz" if f >= 1000 else f"{f:g} Hz"


def verdicts(
    result: Result, targets: Sequence[str] | None = None, *, field: str = "diffuse"
) -> list[Verdict]:
    """One :class:`Verdict` per target of a solved model, with its line of text."""
    table = margin_table(result, targets, field=field)
    out = []
    for t in _targets(result.model, targets):
        rows = table[table["target"] == t.name]
        worst = rows.iloc[int(np.argmin(rows["margin"].to_numpy()))]
        binding = (
            _hz(float(worst["band_hz"])) if worst["limit_on"] == "band" else str(worst["limit_on"])
        )
        unit = str(worst["unit"]).split(" ")[0]
        missed_rows = rows[~rows["met"]]
        bands_missed = missed_rows[missed_rows["limit_on"] == "band"]
        metrics_missed = missed_rows[missed_rows["limit_on"] != "band"]
        missed = tuple(str(m) for m in metrics_missed["limit_on"]) + tuple(
            _hz(float(f)) for f in bands_missed["band_hz"]
        )
        head = f"target {t.name} ({t.receiver}): "
        if not missed:
            line = head + f"met, smallest margin {float(worst['margin']):.1f} {unit} ({binding})"
        else:
            parts = [
                f"{r['limit_on']} by {-float(r['margin']):.1f} {r['unit']}"
                for _, r in metrics_missed.iterrows()
            ]
            if len(bands_missed):
                bw = bands_missed.iloc[int(np.argmin(bands_missed["margin"].to_numpy()))]
                parts.append(
                    f"by {-float(bw['margin']):.1f} dB in band(s) "
                    + ", ".join(_hz(float(f)) for f in bands_missed["band_hz"])
                    + f" (worst {_hz(float(bw['band_hz']))})"
                )
            line = head + "MISSED " + "; ".join(parts)
        out.append(
            Verdict(
                t.name, t.receiver, not missed, float(worst["margin"]), unit, binding, missed, line
            )
        )
    return out


def render_verdicts(vs: Sequence[Verdict]) -> str:
    """The verdict lines, one per target."""
    return "\n".join(v.line for v in vs)


def probability_of_meeting(
    sp: Spread, targets: Sequence[str] | None = None, *, field: str = "diffuse"
) -> pd.DataFrame:
    """Probability of meeting each target over the Monte Carlo samples of a spread.

    Columns: ``target, receiver, probability`` (fraction of samples meeting every limit of
    the target), ``standard_error`` (binomial, sqrt(p (1 - p) / S)), ``samples``,
    ``nominal_met``.

    Notes
    -----
    The fraction of S independent samples is an unbiased estimate of the probability with
    the binomial standard error sqrt(p (1 - p) / S) (e.g. Cramer 1946, Mathematical
    Methods of Statistics, sec. 16.4, from memory).
    """
    model = sp.model
    lv_all = sp.levels()
    idx = model.index()
    rows = []
    for t in _targets(model, targets):
        lv = lv_all[:, idx[t.receiver], :]
        p = float(np.mean(margins_of_levels(lv, model.bands, t, field=field).met))
        s = sp.samples
        nominal = margins_of_levels(_receiver_levels(sp.nominal, t.receiver), model.bands, t)
        rows.append(
            {
                "target": t.name,
                "receiver": t.receiver,
                "probability": p,
                "standard_error": float(np.sqrt(p * (1.0 - p) / s)),
                "samples": s,
                "nominal_met": bool(nominal.met),
            }
        )
    return pd.DataFrame(
        rows,
        columns=["target", "receiver", "probability", "standard_error", "samples", "nominal_met"],
    )


#: How :func:`probability_from_variance` reaches its probability, in plain words.
VARIANCE_METHOD = (
    "SEA variance estimate: the receiver's band energies drawn as independent log-normal "
    "variables with the SEA mean and the predicted ensemble variance (scatter of modes "
    "between nominally identical builds only)"
)


def probability_from_variance(
    result: Result,
    targets: Sequence[str] | None = None,
    *,
    field: str = "diffuse",
    samples: int = 4000,
    seed: int = 0,
    relative_variance: npt.ArrayLike | None = None,
    distribution: Literal["gamma", "lognormal"] = DISTRIBUTION,
) -> pd.DataFrame:
    """Probability of meeting each target from the SEA ensemble variance (no re-solve).

    Parameters
    ----------
    result : Result
        The solved model.
    targets : sequence of str, optional
        Target names (default: all of the model).
    field : str, optional
        Sound field of the loudness metrics.
    samples, seed : int
        Draws of the receiver's band energies and the seed of the generator.
    relative_variance : array_like (N, B), optional
        :func:`seatool.analysis.confidence.relative_variances` if already at hand.
    distribution : {'lognormal', 'gamma'}, optional
        Distribution of each band energy (default log-normal, as the confidence bands;
        :func:`seatool.physics.variance.level_quantiles` says why).

    Returns
    -------
    pandas.DataFrame
        ``target, receiver, probability, standard_error, samples, nominal_met, method``
        (``method`` names the distribution when it is not the default).

    Notes
    -----
    Each band energy of the receiver is drawn from a log-normal distribution with the SEA
    mean and the relative variance r^2 of
    :func:`seatool.analysis.confidence.relative_variances` (s^2 = ln(1 + r^2);
    :func:`seatool.physics.variance.energy_ratio_samples`), the bands independently of one another (different bands hold
    different modes), and every limit of the target is judged on each draw by
    :func:`margins_of_levels`. The fraction of S draws meeting them estimates the
    probability with the binomial standard error sqrt(p (1 - p) / S) (Cramer 1946,
    Mathematical Methods of Statistics, sec. 16.4, from memory). Log-normal and Gamma:
    Johnson, Kotz & Balakrishnan (1994), Continuous Univariate Distributions, vol. 1,
    ch. 14 and 17.
    """
    model = result.model
    r2_all = (
        relative_variances(model, result.energy)
        if relative_variance is None
        else np.asarray(relative_variance, dtype=float)
    )
    rng = np.random.default_rng(seed)
    rows = []
    for t in _targets(model, targets):
        i = model.index()[t.receiver]
        lv = _receiver_levels(result, t.receiver)
        r2 = np.nan_to_num(r2_all[i], nan=0.0)
        ratio = energy_ratio_samples(r2, samples, rng, distribution=distribution)
        draws = lv + db(np.maximum(ratio, 1e-30))
        p = float(np.mean(margins_of_levels(draws, model.bands, t, field=field).met))
        nominal = margins_of_levels(lv, model.bands, t, field=field)
        rows.append(
            {
                "target": t.name,
                "receiver": t.receiver,
                "probability": p,
                "standard_error": float(np.sqrt(p * (1.0 - p) / samples)),
                "samples": samples,
                "nominal_met": bool(nominal.met),
                "method": VARIANCE_METHOD
                if distribution == DISTRIBUTION
                else VARIANCE_METHOD.replace("log-normal", distribution),
            }
        )
    return pd.DataFrame(
        rows,
        columns=["target", "receiver", "probability", "standard_error", "samples",
                 "nominal_met", "method"],
    )  # fmt: skip


def render_confidence(table: pd.DataFrame) -> str:
    """One line per target: ``target T (R): met with 87 % confidence (4000 draws, standard
    error 0.5 %)``, then the
    method (the ``method`` column of :func:`probability_from_variance`)."""
    if table.empty:
        return ""
    out = []
    for _, r in table.iterrows():
        p, se = 100.0 * float(r["probability"]), 100.0 * float(r["standard_error"])
        out.append(f"target {r['target']} ({r['receiver']}): met with {p:.0f} % confidence "
                   f"({int(r['samples'])} draws, standard error {se:.1f} %)")  # fmt: skip
    out.append("  (" + str(table["method"].iloc[0]) + ")")
    return "\n".join(out)


def render_margins(result: Result, *, digits: int = 1, field: str = "diffuse") -> str:
    """Text of the margins: metric limits per target, then band margins (one column each)."""
    table = margin_table(result, field=field)
    if table.empty:
        return ""
    out = ["margins to the targets (limit - level; positive = met)"]
    metric_rows = table[table["limit_on"] != "band"]
    for _, r in metric_rows.iterrows():
        out.append(
            f"  {r['target']} ({r['receiver']}): {r['limit_on']} {r['level']:.{digits}f} against "
            f"{r['limit']:.{digits}f}, margin {r['margin']:+.{digits}f} {r['unit']}"
        )
    band_rows = table[table["limit_on"] == "band"]
    if len(band_rows):
        names = list(dict.fromkeys(band_rows["target"]))
        w = max(9, *(len(n) for n in names))
        out.append("  band margins [dB]:")
        out.append("  " + f"{'band_hz':>8}" + "".join(f"  {n:>{w}}" for n in names))
        wide = band_rows.pivot(index="band_hz", columns="target", values="margin")
        for f, row in wide.iterrows():
            cells = "".join(f"  {row[n]:>+{w}.{digits}f}" for n in names)
            out.append("  " + f"{float(str(f)):>8g}" + cells)
    return "\n".join(out)
