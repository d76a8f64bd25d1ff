"""Figures of results (matplotlib is imported here only, with a file-only backend).

Band levels are drawn as steps over the band edges (one flat segment per band), on a
logarithmic frequency axis labelled with the nominal band centres; every axis names its
reference. Bands where SEA validity is weak for a subsystem are drawn dashed.
"""

from __future__ import annotations

import os
from collections.abc import Sequence
from pathlib import Path
from typing import Any

import numpy as np
import pandas as pd

from .results import CAUTION, Result

__all__ = [
    "PLOT_SUFFIXES",
    "plot_band_margins",
    "plot_contributions",
    "plot_levels",
    "plot_target",
    "plot_variants",
]

#: File types a figure can be written as.
PLOT_SUFFIXES = (".png", ".pdf", ".svg")


def plot_target(value: str | None, option: str = "--plot") -> Path | None:
    """Check a figure file name given on the command line (InputError if it cannot be used)."""
    from .errors import InputError, Problem

    if value is None:
        return None
    p = Path(value)
    if p.suffix.lower() not in PLOT_SUFFIXES:
        raise InputError([Problem(str(p), option, "use a .png, .pdf or .svg file name")])
    if not p.parent.exists():
        raise InputError([Problem(str(p), option, f"folder {str(p.parent)!r} does not exist")])
    return p


_QUANTITY_LABEL = {
    "sound_pressure": "sound pressure level",
    "velocity": "velocity level",
    "energy": "energy level",
}


def _pyplot() -> Any:
    import matplotlib

    matplotlib.use("Agg", force=True)
    import matplotlib.pyplot as plt

    return plt


def _weak_bands(result: Result) -> dict[str, np.ndarray]:
    """Per subsystem, the bands whose validity flag is not 'ok' (see seatool.validity_report)."""
    table = result.validity()
    out: dict[str, np.ndarray] = {}
    for name, grp in table.groupby("subsystem", sort=False):
        out[str(name)] = (grp["flag"] != "ok").to_numpy(dtype=bool)
    return out


def plot_levels(
    result: Result, path: str | os.PathLike[str], names: Sequence[str] | None = None
) -> Path:
    """Write a figure of the band levels of ``names`` (default: all with a level) to ``path``.

    One panel per quantity (sound pressure, velocity, energy level), each with its
    reference in the axis label. The file type follows the suffix (``.png``, ``.pdf``,
    ``.svg``). Returns the path written.
    """
    plt = _pyplot()
    model = result.model
    bands = model.bands
    lv, quantity, refs = result.level_array()
    chosen = [s.name for s in model.subsystems if not s.sink] if names is None else list(names)
    idx = model.index()
    groups: dict[str, list[str]] = {}
    for n in chosen:
        groups.setdefault(quantity[idx[n]], []).append(n)
    weak = _weak_bands(result)
    fig, axes = plt.subplots(
        len(groups), 1, figsize=(8.0, 3.2 * len(groups) + 0.6), squeeze=False, sharex=True
    )
    edges = np.append(bands.lower, bands.upper[-1])
    for ax, (q, members) in zip(axes[:, 0], groups.items(), strict=True):
        for n in members:
            i = idx[n]
            y = np.append(lv[i], lv[i][-1])
            (line,) = ax.step(edges, y, where="post", label=n, linewidth=1.6)
            bad = weak.get(n)
            if bad is not None and bad.any():
                yb = np.where(np.append(bad, bad[-1]), y, np.nan)
                ax.step(edges, yb, where="post", color=line.get_color(), linewidth=3.0,
                        alpha=0.35)  # fmt: skip
        ax.set_xscale("log")
        ax.set_ylabel(f"{_QUANTITY_LABEL.get(q, q)} [dB {refs[idx[members[0]]]}]")
        ax.grid(True, which="both", alpha=0.3)
        ax.legend(fontsize=8, ncol=2)
    ax_last = axes[-1, 0]
    ticks = bands.centre
    labels = [bands.label(k) for k in range(len(bands))]
    step = max(1, len(ticks) // 12)
    ax_last.set_xticks(ticks[::step])
    ax_last.set_xticklabels(labels[::step], rotation=45, ha="right", fontsize=8)
    ax_last.minorticks_off()
    ax_last.set_xlabel(f"{bands.kind} band")
    title = model.title or "band levels"
    axes[0, 0].set_title(title + "\n(wide pale segments: bands where SEA validity is weak)",
                         fontsize=10)  # fmt: skip
    fig.text(0.01, 0.005, "Caution: " + CAUTION, fontsize=5.5, wrap=True)
    fig.tight_layout(rect=(0, 0.03, 1, 1))
    out = Path(path)
    fig.savefig(out, dpi=130)
    plt.close(fig)
    return out


def plot_contributions(
    contributions: Any, result: Result, receiver: str, path: str | os.PathLike[str]
) -> Path:
    """Write a figure of the share of each source in a receiver's level, band by band.

    ``contributions`` is the table of :func:`seatool.analysis.paths.contributions`. Upper
    panel: the receiver's level with its reference; lower panel: stacked shares [%] per
    band (they add up to 100 %). Bands where the receiver's SEA validity is weak are shaded.
    """
    plt = _pyplot()
    model = result.model
    bands = model.bands
    r = model.index()[receiver]
    lv, _, refs = result.level_array()
    sources = list(dict.fromkeys(contributions["source"]))
    shares = np.vstack(
        [
            contributions[contributions["source"] == s]
            .set_index("band_hz")
            .reindex(bands.nominal)["share"]
            .to_numpy(dtype=float)
            for s in sources
        ]
    )
    valid = (
        contributions.drop_duplicates("band_hz")
        .set_index("band_hz")
        .reindex(bands.nominal)["valid"]
    ).to_numpy(dtype=bool)
    fig, (ax1, ax2) = plt.subplots(2, 1, figsize=(8.0, 6.4), sharex=True)
    edges = np.append(bands.lower, bands.upper[-1])
    sink = model.subsystems[r].sink
    if sink:
        y = 10 * np.log10(np.maximum(result.solution.dissipated_power[r], 1e-300) / 1e-12)
        ax1.set_ylabel("absorbed power level [dB re 1 pW]")
    else:
        y = lv[r]
        ax1.set_ylabel(f"level [dB {refs[r]}]")
    ax1.step(edges, np.append(y, y[-1]), where="post", color="black", linewidth=1.6)
    bottom = np.zeros(len(bands))
    for s, share in zip(sources, shares, strict=True):
        pct = 100 * np.nan_to_num(share)
        ax2.bar(bands.lower, pct, width=bands.width, bottom=bottom, align="edge", label=s,
                edgecolor="white", linewidth=0.5)  # fmt: skip
        bottom = bottom + pct
    for ax in (ax1, ax2):
        for j in np.flatnonzero(~valid):
            ax.axvspan(bands.lower[j], bands.upper[j], color="grey", alpha=0.15, linewidth=0)
        ax.set_xscale("log")
        ax.grid(True, which="both", alpha=0.3)
    ax2.set_ylim(0, 100)
    ax2.set_ylabel("share of the receiver's total [%]")
    ax2.legend(fontsize=8, ncol=3, loc="upper center", bbox_to_anchor=(0.5, -0.28))
    step = max(1, len(bands) // 12)
    ax2.set_xticks(bands.centre[::step])
    ax2.set_xticklabels([bands.label(k) for k in range(len(bands))][::step], rotation=45,
                        ha="right", fontsize=8)  # fmt: skip
    ax2.minorticks_off()
    ax1.set_title(f"{model.title or 'model'}: sources of {receiver}\n"
                  "(shaded: bands where the receiver's SEA validity is weak)", fontsize=10)  # fmt: skip
    fig.text(0.01, 0.005, "Caution: " + CAUTION, fontsize=5.5, wrap=True)
    fig.tight_layout(rect=(0, 0.03, 1, 1))
    out = Path(path)
    fig.savefig(out, dpi=130)
    plt.close(fig)
    return out


def _band_axis(ax: Any, hz: Sequence[float]) -> None:
    ax.set_xscale("log")
    ticks = list(hz)
    step = max(1, len(ticks) // 12)
    ax.set_xticks(ticks[::step])
    ax.set_xticklabels([f"{f:g}" for f in ticks[::step]], rotation=45, ha="right", fontsize=8)
    ax.minorticks_off()
    ax.set_xlabel("band [Hz]")
    ax.grid(True, which="both", alpha=0.3)


def plot_band_margins(margins: pd.DataFrame, path: str | os.PathLike[str]) -> Path:
    """Write a figure of the margin per band (limit - level, positive = met) of each target
    with a band limit (rows ``limit_on == 'band'`` of a margin table, optionally with a
    ``variant`` column) to ``path``."""
    plt = _pyplot()
    rows = margins[margins["limit_on"] == "band"]
    fig, ax = plt.subplots(figsize=(8.0, 4.2))
    keys = ["variant", "target"] if "variant" in rows.columns else ["target"]
    for key, grp in rows.groupby(keys, sort=False):
        label = " / ".join(str(k) for k in (key if isinstance(key, tuple) else (key,)))
        ax.plot(grp["band_hz"], grp["margin"], marker="o", markersize=3, label=label)
    ax.axhline(0.0, color="k", linewidth=1.0)
    if len(rows):
        _band_axis(ax, sorted(set(rows["band_hz"])))
        ax.legend(fontsize=8)
    ax.set_ylabel("margin = limit - level [dB] (positive = met)")
    ax.set_title("margins to the band limits", fontsize=10)
    fig.text(0.01, 0.005, "Caution: " + CAUTION, fontsize=5.5, wrap=True)
    fig.tight_layout(rect=(0, 0.03, 1, 1))
    out = Path(path)
    fig.savefig(out, dpi=130)
    plt.close(fig)
    return out


def plot_variants(difference: pd.DataFrame, path: str | os.PathLike[str]) -> Path:
    """Write a figure of the band-by-band level difference of each variant to the base
    (a variants ``difference`` table), one panel per receiver, to ``path``."""
    plt = _pyplot()
    recs = list(dict.fromkeys(difference["receiver"]))
    fig, axes = plt.subplots(
        max(1, len(recs)), 1, figsize=(8.0, 3.2 * max(1, len(recs)) + 0.6), squeeze=False
    )
    for ax, r in zip(axes[:, 0], recs, strict=False):
        sub = difference[(difference["receiver"] == r) & (difference["variant"] != "base")]
        for v, grp in sub.groupby("variant", sort=False):
            ax.plot(grp["band_hz"], grp["difference_dB"], marker="o", markersize=3, label=str(v))
        ax.axhline(0.0, color="k", linewidth=1.0)
        ax.axhline(1.0, color="r", linewidth=0.8, linestyle="--")
        _band_axis(ax, sorted(set(sub["band_hz"])) or [1.0])
        ax.set_ylabel(f"{r}: variant - base [dB]")
        ax.legend(fontsize=8)
    axes[0, 0].set_title("design variants against the base (dashed: +1 dB)", fontsize=10)
    fig.text(0.01, 0.005, "Caution: " + CAUTION, fontsize=5.5, wrap=True)
    fig.tight_layout(rect=(0, 0.03, 1, 1))
    out = Path(path)
    fig.savefig(out, dpi=130)
    plt.close(fig)
    return out
