"""Figures of results (matplotlib is imported here only, with a file-only backend).

Band levels are drawn as steps over the band edges (one flat segment per band), on a
logarithmic frequency axis labelled with the nominal band centres; every axis names its
reference. Bands where SEA validity is weak are hatched grey spans with their own legend
entry; where a model has ``[low_frequency]`` boxes, the bands of the modal solution are
shaded and the other method's level dotted where both were computed. Every figure carries
the caution in its footer.

Longer than 600 lines on purpose: every figure lives here so that matplotlib is imported in
one module only (DEVELOPERS.md, "Layers").
"""

from __future__ import annotations

import os
from collections.abc import Mapping, Sequence
from pathlib import Path
from typing import IO, Any

import networkx as nx
import numpy as np
import pandas as pd

from .analysis.confidence import band_limits
from .errors import InputError, Problem
from .levels import CAUTION, power_level
from .outputs import output_file
from .results import Result

__all__ = [
    "PALETTE",
    "PLOT_SUFFIXES",
    "plot_band_margins",
    "plot_contributions",
    "plot_energy_flow",
    "plot_levels",
    "plot_panel",
    "plot_receiver_levels",
    "plot_sensitivity",
    "plot_spread",
    "plot_sweep",
    "plot_sweep_matrix",
    "plot_target",
    "plot_variants",
    "save_figure",
]

#: File types a figure can be written as.
PLOT_SUFFIXES = (".png", ".pdf", ".svg")


def plot_target(value: str | None, option: str = "--plot") -> Path | None:
    """Check a figure file name given on the command line (InputError if it cannot be used)."""
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
    # names come from the user's model: '$' must not start mathematical text (a '$..^{'
    # name would make drawing fail); seatool writes no formulas in figures
    matplotlib.rcParams["text.parse_math"] = False
    import matplotlib.pyplot as plt

    return plt


def save_figure(fig: Any, out: Any, *, fmt: str | None = None) -> None:
    """Save ``fig`` to a file (through :func:`seatool.outputs.output_file`: whole or not at
    all, committed with the run's other outputs) or to an open binary stream."""
    if isinstance(out, str | os.PathLike):
        with output_file(out) as tmp:
            fig.savefig(tmp, format=fmt or Path(out).suffix.lstrip(".") or None, dpi=130)
    else:
        fig.savefig(out, format=fmt, dpi=130)


def _weak_bands(result: Result) -> dict[str, np.ndarray]:
    """Per subsystem, the bands whose validity flag is not 'ok' (see seatool.validity_report)."""
    table = result.validity()
    out: dict[str, np.ndarray] = {}
    for name, grp in table.groupby("subsystem", sort=False):
        out[str(name)] = (grp["flag"] != "ok").to_numpy(dtype=bool)
    return out


def plot_levels(
    result: Result,
    path: str | os.PathLike[str],
    names: Sequence[str] | None = None,
    *,
    confidence: pd.DataFrame | None = None,
    merged: pd.DataFrame | None = None,
) -> Path:
    """Write a figure of the band levels of ``names`` (default: all with a level) to ``path``.

    One panel per quantity (sound pressure, velocity, energy level), each with its
    reference in the axis label. The file type follows the suffix (``.png``, ``.pdf``,
    ``.svg``). ``confidence`` (:func:`seatool.analysis.confidence.confidence_bands`)
    shades each curve's 5-95 % band. Returns the path written.
    With ``merged`` (a table with a ``method`` column,
    :func:`seatool.crossover.merge_tables`) the levels are those of the method of each
    band, the bands of the modal solution shaded and the other method's level dotted where
    both were computed.
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
    any_modal = False
    for ax, (q, members) in zip(axes[:, 0], groups.items(), strict=True):
        weak_any = np.zeros(len(bands), dtype=bool)
        modal_any = np.zeros(len(bands), dtype=bool)
        for k, n in enumerate(members):
            i = idx[n]
            got = _methods(merged, n, len(bands))
            level = lv[i] if got is None else got[0]
            y = np.append(level, level[-1])
            ax.step(edges, y, where="post", label=n, linewidth=1.6,
                    color=PALETTE[k % len(PALETTE)])  # fmt: skip
            if confidence is not None:
                _shade_band(ax, bands, confidence, n, PALETTE[k % len(PALETTE)])
            if got is not None:
                _draw_methods(ax, bands, n, PALETTE[k % len(PALETTE)], got)
                modal_any |= got[2]
            bad = weak.get(n)
            if bad is not None:
                weak_any |= bad & (got is None or ~got[2])
        _shade_weak(ax, bands, weak_any)
        _shade_modal(ax, bands, modal_any)
        any_modal |= bool(modal_any.any())
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
    ax_last.set_xlabel(f"{bands.spacing} band")
    title = model.title or "band levels"
    shaded = "; shaded: 5-95 % confidence band" if confidence is not None else ""
    axes[0, 0].set_title(title + "\n(hatched: bands where SEA validity is weak for a subsystem "
                         "of that panel" + (";\nshaded: " + METHOD_LABEL + "; dotted: the other "
                         "method where both were computed" if any_modal else "") + f"{shaded})",
                         fontsize=10)  # fmt: skip
    fig.text(0.01, 0.005, "Caution: " + CAUTION, fontsize=7, wrap=True)
    fig.tight_layout(rect=(0, 0.03, 1, 1))
    out = Path(path)
    save_figure(fig, out)
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
        y = power_level(np.maximum(result.solution.dissipated_power[r], 1e-300))
        ax1.set_ylabel("absorbed power level [dB re 1 pW]")
    else:
        y = lv[r]
        ax1.set_ylabel(f"level [dB {refs[r]}]")
    ax1.step(edges, np.append(y, y[-1]), where="post", color=PALETTE[0], linewidth=1.6)
    bottom = np.zeros(len(bands))
    for k, (s, share) in enumerate(zip(sources, shares, strict=True)):
        pct = 100 * np.nan_to_num(share)
        ax2.bar(bands.lower, pct, width=bands.width, bottom=bottom, align="edge", label=s,
                edgecolor="white", linewidth=0.5, color=PALETTE[k % len(PALETTE)])  # fmt: skip
        bottom = bottom + pct
    for ax in (ax1, ax2):
        _shade_weak(ax, bands, ~valid, label=ax is ax1)
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
                  "(hatched: bands where the receiver's SEA validity is weak)", fontsize=10)  # fmt: skip
    if (~valid).any():
        ax1.legend(fontsize=8, loc="upper right", framealpha=0.9)
    fig.text(0.01, 0.005, "Caution: " + CAUTION, fontsize=7, wrap=True)
    fig.tight_layout(rect=(0, 0.03, 1, 1))
    out = Path(path)
    save_figure(fig, out)
    plt.close(fig)
    return out


# -- report figures -------------------------------------------------------------------------
#
# One look for every figure of a report: a muted palette of our own (slate, teal, ochre,
# brick, plum, moss, ...), a light grid, band levels as steps over the band edges, weak-SEA
# bands as hatched grey spans with their own legend entry, the caution in the footer.

#: Colours of the report figures, in the order series are drawn.
PALETTE = (
    "#2f4858", "#1b8a8f", "#d08c2c", "#a8423a", "#7a5c99", "#5f7f3a",
    "#c46a9a", "#3f6fb0", "#8a6d3b", "#4d4d4d",
)  # fmt: skip
# Opaque face (a transparent face would fade the hatch too in SVG), drawn under the data.
_WEAK = {"facecolor": "#e4e8ea", "hatch": "///", "edgecolor": "#7d8a92", "zorder": 0}
_WEAK_LABEL = "SEA weak in this band (few modes or low modal overlap)"

Output = str | os.PathLike[str] | IO[bytes]


def _save(fig: Any, out: Output, fmt: str | None) -> None:
    plt = _pyplot()
    fig.text(0.01, 0.006, "Caution: " + CAUTION, fontsize=7, wrap=True, color="#444444")
    fig.tight_layout(rect=(0, 0.045, 1, 1))
    save_figure(fig, out, fmt=fmt)
    plt.close(fig)


def _new(figsize: tuple[float, float], rows: int = 1) -> tuple[Any, Any]:
    plt = _pyplot()
    with plt.rc_context({"svg.fonttype": "none", "font.size": 9}):
        fig, axes = plt.subplots(rows, 1, figsize=figsize, squeeze=False, sharex=True)
    for ax in axes[:, 0]:
        ax.set_facecolor("#fbfaf7")
        ax.grid(True, which="major", color="#d9d6cf", linewidth=0.6)
        for side in ("top", "right"):
            ax.spines[side].set_visible(False)
    return fig, axes[:, 0]


def _band_axis(ax: Any, bands: Any) -> None:
    ax.set_xscale("log")
    step = max(1, len(bands) // 12)
    ax.set_xticks(bands.centre[::step])
    ax.set_xticklabels([bands.label(k) for k in range(len(bands))][::step], rotation=45,
                       ha="right", fontsize=8)  # fmt: skip
    ax.minorticks_off()
    ax.set_xlim(bands.lower[0], bands.upper[-1])
    ax.set_xlabel(f"{bands.spacing} band")


def _shade_weak(
    ax: Any, bands: Any, weak: np.ndarray, *, label: bool = True, text: str = _WEAK_LABEL
) -> None:
    first = label
    for j in np.flatnonzero(weak):
        ax.axvspan(bands.lower[j], bands.upper[j], linewidth=0,
                   label=text if first else None, **_WEAK)  # fmt: skip
        first = False


def _steps(bands: Any, y: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    return np.append(bands.lower, bands.upper[-1]), np.append(y, y[-1])


def _shade_band(ax: Any, bands: Any, confidence: pd.DataFrame, name: str, colour: str) -> None:
    """Shade the 5-95 % confidence band of ``name`` (a confidence_bands table)."""
    lo, hi = band_limits(confidence, name, bands.nominal)
    if not np.any(np.isfinite(lo)):
        return
    x, y_lo = _steps(bands, lo)
    _, y_hi = _steps(bands, hi)
    ax.fill_between(x, y_lo, y_hi, step="post", color=colour, alpha=0.18, linewidth=0,
                    label=f"{name}: 5-95 %")  # fmt: skip


#: Caption of the bands of the modal solution and of the other method's level.
METHOD_LABEL = "method = modal (below the SEA range)"


def _methods(merged: pd.DataFrame | None, name: str, nb: int
             ) -> tuple[np.ndarray, np.ndarray, np.ndarray] | None:  # fmt: skip
    """(level used, level of the other method or NaN, modal mask) of ``name`` from a merged
    table (:func:`seatool.crossover.merge_tables`), or None if no band of it is modal."""
    if merged is None:
        return None
    rows = merged[merged["subsystem"] == name]
    modal = rows["method"].to_numpy() == "modal"
    if len(rows) != nb or not modal.any():
        return None
    mod = rows["modal_level_dB"].to_numpy(dtype=float)
    other = np.where(modal, rows["sea_level_dB"].to_numpy(dtype=float), mod)
    return rows["level_dB"].to_numpy(dtype=float), other, modal


def _draw_methods(ax: Any, bands: Any, name: str, colour: str,
                  got: tuple[np.ndarray, np.ndarray, np.ndarray]) -> None:  # fmt: skip
    """The other method's level (dotted) where both were computed: the overlap region."""
    _, other, _ = got
    ax.step(*_steps(bands, other), where="post", color=colour, linewidth=1.0, linestyle=":",
            label=f"{name}: other method")  # fmt: skip


def _shade_modal(ax: Any, bands: Any, modal: np.ndarray) -> None:
    first = True
    for j in np.flatnonzero(modal):
        ax.axvspan(bands.lower[j], bands.upper[j], color="#4c72b0", alpha=0.10, linewidth=0,
                   label=METHOD_LABEL if first else None)  # fmt: skip
        first = False


def plot_receiver_levels(
    result: Result,
    receivers: Sequence[str],
    out: Output,
    *,
    limits: Mapping[str, np.ndarray] | None = None,
    fmt: str | None = None,
    confidence: pd.DataFrame | None = None,
    merged: pd.DataFrame | None = None,
) -> None:
    """Band levels of the receivers, weak-SEA bands hatched, limits dashed where given.

    ``limits`` maps a receiver to its per-band limit [dB, same reference] (NaN: none).
    Bands are hatched where any shown receiver is weak. ``confidence``
    (:func:`seatool.analysis.confidence.confidence_bands`) shades each 5-95 % band.
    ``merged`` as in
    :func:`plot_levels`: the method of each band, modal bands shaded, the other method
    dotted where both were computed.
    """
    model = result.model
    bands = model.bands
    lv, _, refs = result.level_array()
    idx = model.index()
    weak_by = _weak_bands(result)
    fig, (ax,) = _new((8.0, 4.4))
    weak = np.zeros(len(bands), dtype=bool)
    modal_any = np.zeros(len(bands), dtype=bool)
    for k, name in enumerate(receivers):
        i = idx[name]
        colour = PALETTE[k % len(PALETTE)]
        got = _methods(merged, name, len(bands))
        level = lv[i] if got is None else got[0]
        ax.step(*_steps(bands, level), where="post", color=colour, linewidth=1.8, label=name)
        if got is not None:
            _draw_methods(ax, bands, name, colour, got)
            modal_any |= got[2]
        if confidence is not None:
            _shade_band(ax, bands, confidence, name, colour)
        if limits is not None and name in limits:
            ax.step(*_steps(bands, np.asarray(limits[name], dtype=float)), where="post",
                    color=colour, linewidth=1.2, linestyle="--", label=f"{name}: limit")  # fmt: skip
        w = weak_by.get(name)
        if w is not None:
            weak |= w & (got is None or ~got[2])
    _shade_weak(ax, bands, weak)
    _shade_modal(ax, bands, modal_any)
    _band_axis(ax, bands)
    _, quantity, _ = result.level_array()
    first = idx[receivers[0]] if receivers else 0
    ax.set_ylabel(f"{_QUANTITY_LABEL.get(quantity[first], 'level')} [dB {refs[first]}]")
    ax.set_title("Receiver levels per band", loc="left", fontsize=11)
    ax.legend(fontsize=8, ncol=2, loc="best", framealpha=0.9)
    _save(fig, out, fmt)


def plot_energy_flow(
    result: Result,
    out: Output,
    *,
    band: int | None = None,
    highlight: Sequence[str] = (),
    fmt: str | None = None,
) -> None:
    """The subsystem graph with arrows along the net power flow of each connection.

    Arrow width and opacity grow with the square root of the net power in band ``band``
    (index) or, by default, summed over the bands; ``highlight`` is a path (subsystem
    names in order) drawn in a strong colour, e.g. the dominant path into the receiver.
    Node colour says what a subsystem is (cavity, structure, exterior); nodes fed by an
    excitation get a heavy outline. Layout: networkx's Kamada-Kawai placement of the
    undirected graph (deterministic).
    """
    model = result.model
    power = result.solution.connection_power
    p = power.sum(axis=1) if band is None else power[:, band]
    g = nx.Graph()
    g.add_nodes_from(model.names)
    for c in model.connections:
        g.add_edge(c.a, c.b)
    pos = nx.kamada_kawai_layout(g) if g.number_of_edges() else nx.circular_layout(g)
    n = len(model.names)
    fig, (ax,) = _new((9.0, 7.0 if n < 30 else 9.5))
    ax.grid(False)
    ax.set_xticks([])
    ax.set_yticks([])
    for side in ("left", "bottom"):
        ax.spines[side].set_visible(False)
    pmax = float(np.max(np.abs(p))) if len(p) and np.max(np.abs(p)) > 0 else 1.0
    on_path = {(a, b) for a, b in zip(highlight, highlight[1:], strict=False)}
    for c, pc in zip(model.connections, p, strict=True):
        a, b = (c.a, c.b) if pc >= 0 else (c.b, c.a)
        rel = float(np.sqrt(abs(pc) / pmax))  # width by the square root: big flows stand out
        width = 0.3 + 7.0 * rel
        hot = (a, b) in on_path
        width = max(width, 3.0) if hot else width
        ax.annotate(
            "", xy=pos[b], xytext=pos[a],
            arrowprops={"arrowstyle": "-|>", "lw": width, "shrinkA": 9, "shrinkB": 9,
                        "color": PALETTE[3] if hot else "#6f7f8a",
                        "alpha": 1.0 if hot else 0.2 + 0.7 * rel,
                        "mutation_scale": 8 + 1.5 * width},
            zorder=3 if hot else 2,
        )  # fmt: skip
    fed = {e.subsystem for e in model.excitations}
    for s in model.subsystems:
        colour = "#e9e4d8" if s.sink else (PALETTE[1] if s.quantity == "sound_pressure"
                                           else PALETTE[0])  # fmt: skip
        x, y = pos[s.name]
        ax.scatter([x], [y], s=110 if n < 30 else 70, color=colour, zorder=4,
                   edgecolors=PALETTE[2] if s.name in fed else "white",
                   linewidths=2.5 if s.name in fed else 1.0)  # fmt: skip
        ax.annotate(s.name, (x, y), xytext=(0, 7), textcoords="offset points", ha="center",
                    fontsize=8 if n < 30 else 6.5, zorder=5, color="#222222")  # fmt: skip
    plt = _pyplot()
    handles = [
        plt.Line2D([], [], marker="o", linestyle="", color=PALETTE[1], label="cavity"),
        plt.Line2D([], [], marker="o", linestyle="", color=PALETTE[0], label="structure"),
        plt.Line2D([], [], marker="o", linestyle="", color="#e9e4d8", label="exterior"),
        plt.Line2D([], [], marker="o", linestyle="", color="white", markeredgecolor=PALETTE[2],
                   markeredgewidth=2.5, label="excited"),  # fmt: skip
        plt.Line2D([], [], color="#7d8c96", linewidth=3, label="net power (width grows as its square root)"),
    ]
    if highlight:
        handles.append(plt.Line2D([], [], color=PALETTE[3], linewidth=3, label="dominant path"))
    ax.legend(handles=handles, fontsize=8, loc="lower left", framealpha=0.9)
    where = "summed over the bands" if band is None else f"in the {model.bands.label(band)} band"
    ax.set_title(f"Energy flow: net power through each connection, {where} "
                 f"(widest = {pmax:.3g} W)", loc="left", fontsize=11)  # fmt: skip
    _save(fig, out, fmt)


def plot_sensitivity(ranking: Any, receiver: str, out: Output, *, top: int = 12,
                     fmt: str | None = None) -> None:  # fmt: skip
    """Horizontal bars of the largest overall sensitivities [dB per dB] of a receiver.

    ``ranking`` is :func:`seatool.analysis.sensitivity.ranking`'s table; the ``top``
    parameters with the largest magnitude are drawn, largest on top, positive to the
    right (the level rises with the parameter).
    """
    t = ranking.head(top).iloc[::-1]
    fig, (ax,) = _new((8.0, 0.9 + 0.32 * max(len(t), 3)))
    vals = t["overall_db_per_db"].to_numpy(dtype=float)
    colours = [PALETTE[3] if v > 0 else PALETTE[1] for v in vals]
    ax.barh(np.arange(len(t)), vals, color=colours, height=0.65)
    ax.set_yticks(np.arange(len(t)))
    ax.set_yticklabels(list(t["parameter"]), fontsize=8)
    ax.axvline(0.0, color="#444444", linewidth=0.8)
    ax.set_xlabel(f"change of the overall level of {receiver} [dB per dB of the parameter]")
    ax.set_title(f"Largest sensitivities of {receiver}", loc="left", fontsize=11)
    _save(fig, out, fmt)


def plot_spread(
    table: Any, receiver: str, bands: Any, out: Output, *, fmt: str | None = None
) -> None:
    """The 5-95 % band and median of a receiver's Monte Carlo levels, nominal level on top.

    ``table`` is :meth:`seatool.analysis.uncertainty.Spread.table`; bands where the
    receiver's SEA validity is weak are hatched.
    """
    t = table[table["subsystem"] == receiver].set_index("band_hz").reindex(bands.nominal)
    fig, (ax,) = _new((8.0, 4.2))
    x, lo = _steps(bands, t["p5_dB"].to_numpy(dtype=float))
    _, hi = _steps(bands, t["p95_dB"].to_numpy(dtype=float))
    ax.fill_between(x, lo, hi, step="post", color=PALETTE[1], alpha=0.3, linewidth=0,
                    label="5 % to 95 % of the samples")  # fmt: skip
    ax.step(*_steps(bands, t["p50_dB"].to_numpy(dtype=float)), where="post", color=PALETTE[1],
            linewidth=1.4, label="median (50 %)")  # fmt: skip
    ax.step(*_steps(bands, t["nominal_dB"].to_numpy(dtype=float)), where="post",
            color=PALETTE[0], linewidth=1.8, linestyle="--", label="nominal")  # fmt: skip
    _shade_weak(ax, bands, ~t["valid"].to_numpy(dtype=bool))
    _band_axis(ax, bands)
    ref = str(t["level_ref"].dropna().iloc[0]) if t["level_ref"].notna().any() else ""
    ax.set_ylabel(f"level [dB {ref}]")
    ax.set_title(f"Spread of {receiver} (Monte Carlo, {int(t['samples'].iloc[0])} samples)",
                 loc="left", fontsize=11)  # fmt: skip
    ax.legend(fontsize=8, loc="best", framealpha=0.9)
    _save(fig, out, fmt)


def plot_panel(table: Any, bands: Any, out: Output, *, title: str = "panel",
               fmt: str | None = None) -> None:  # fmt: skip
    """The quick look at one panel: transmission loss and radiation efficiency per band.

    ``table`` is :func:`seatool.analysis.panel.panel_table`'s. Upper panel: the SEA
    two-room transmission loss (and the trim's insertion loss where the table has it);
    lower panel: the radiation efficiency (log scale). Hatched: bands with fewer than one
    mode of the panel (SEA weak whatever the damping; the modal overlap of a panel alone,
    with its material damping only, says little about the panel once it is built in);
    dotted line: the coincidence frequency.
    """
    t = table.set_index("band_hz").reindex(bands.nominal)
    fig, (ax1, ax2) = _new((8.0, 6.0), rows=2)
    weak = (t["modes_in_band"] < 1.0).to_numpy(dtype=bool)
    if "transmission_loss_sea_dB" in t:
        ax1.step(*_steps(bands, t["transmission_loss_sea_dB"].to_numpy(dtype=float)),
                 where="post", color=PALETTE[0], linewidth=1.8,
                 label="transmission loss (SEA, two rooms)")  # fmt: skip
    if "trim_insertion_loss_dB" in t:
        ax1.step(*_steps(bands, t["trim_insertion_loss_dB"].to_numpy(dtype=float)),
                 where="post", color=PALETTE[2], linewidth=1.5, label="trim insertion loss")  # fmt: skip
    ax1.set_ylabel("[dB]")
    ax2.step(*_steps(bands, t["radiation_efficiency"].to_numpy(dtype=float)), where="post",
             color=PALETTE[1], linewidth=1.8, label="radiation efficiency")  # fmt: skip
    ax2.set_yscale("log")
    ax2.set_ylabel("radiation efficiency [-]")
    fc = float(t["critical_frequency_hz"].iloc[0])
    for ax in (ax1, ax2):
        _shade_weak(ax, bands, weak, label=ax is ax1,
                    text="fewer than one panel mode per band (SEA weak)")  # fmt: skip
        if bands.lower[0] <= fc <= bands.upper[-1]:
            ax.axvline(fc, color="#444444", linestyle=":", linewidth=1.0,
                       label=f"coincidence {fc:.0f} Hz" if ax is ax1 else None)  # fmt: skip
        _band_axis(ax, bands)
    ax1.set_xlabel("")
    ax1.legend(fontsize=8, loc="best", framealpha=0.9)
    ax1.set_title(title, loc="left", fontsize=11)
    _save(fig, out, fmt)


def _hz_axis(ax: Any, hz: Sequence[float]) -> None:
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
        _hz_axis(ax, sorted(set(rows["band_hz"])))
        ax.legend(fontsize=8)
    ax.set_ylabel("margin = limit - level [dB] (positive = met)")
    ax.set_title("margins to the band limits", fontsize=10)
    fig.text(0.01, 0.005, "Caution: " + CAUTION, fontsize=5.5, wrap=True)
    fig.tight_layout(rect=(0, 0.03, 1, 1))
    out = Path(path)
    save_figure(fig, out)
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
        _hz_axis(ax, sorted(set(sub["band_hz"])) or [1.0])
        ax.set_ylabel(f"{r}: variant - base [dB]")
        ax.legend(fontsize=8)
    axes[0, 0].set_title("design variants against the base (dashed: +1 dB)", fontsize=10)
    fig.text(0.01, 0.005, "Caution: " + CAUTION, fontsize=5.5, wrap=True)
    fig.tight_layout(rect=(0, 0.03, 1, 1))
    out = Path(path)
    save_figure(fig, out)
    plt.close(fig)
    return out


def _finish(fig: Any, path: str | os.PathLike[str]) -> Path:
    fig.text(0.01, 0.005, "Caution: " + CAUTION, fontsize=5.5, wrap=True)
    fig.tight_layout(rect=(0, 0.03, 1, 1))
    out = Path(path)
    save_figure(fig, out)
    _pyplot().close(fig)
    return out


def plot_sweep(
    table: pd.DataFrame,
    parameters: Sequence[str],
    levels: Sequence[str],
    path: str | os.PathLike[str],
) -> Path:
    """Write a figure of each level column (``RECEIVER.dBA`` ...) of a sweep table against each
    parameter column, one panel per parameter, to ``path``; where the table has the
    column's 5 % and 95 % levels of builds (``RECEIVER.dBA_p05``, ``_p95``), each point
    carries them as a vertical bar."""
    plt = _pyplot()
    n = max(1, len(parameters))
    fig, axes = plt.subplots(1, n, figsize=(3.2 * n + 0.8, 3.8), squeeze=False, sharey=True)
    bars = all(f"{lv}_p05" in table and f"{lv}_p95" in table for lv in levels)
    for ax, par in zip(axes[0], parameters, strict=False):
        for k, lv in enumerate(levels):
            colour = PALETTE[k % len(PALETTE)]
            if bars:
                ax.vlines(table[par], table[f"{lv}_p05"], table[f"{lv}_p95"], color=colour,
                          alpha=0.25, linewidth=1.0)  # fmt: skip
            ax.scatter(table[par], table[lv], s=6, alpha=0.6, color=colour, label=lv)
        ax.set_xlabel(par, fontsize=8)
        ax.grid(True, alpha=0.3)
    axes[0, 0].set_ylabel("level [dB]; dBA: A-weighted re 20 uPa")
    axes[0, 0].legend(fontsize=7)
    bar_note = "\n(bars: 5-95 % of nominally identical builds)" if bars else ""
    fig.suptitle(f"levels over the sweep{bar_note}", fontsize=10)
    return _finish(fig, path)


def plot_sweep_matrix(
    table: pd.DataFrame, columns: Sequence[str], path: str | os.PathLike[str]
) -> Path:
    """Write a scatter matrix of ``columns`` of a sweep table (histograms on the diagonal)."""
    plt = _pyplot()
    n = len(columns)
    fig, axes = plt.subplots(n, n, figsize=(1.9 * n + 0.8, 1.9 * n + 0.8), squeeze=False)
    for i, yi in enumerate(columns):
        for j, xj in enumerate(columns):
            ax = axes[i, j]
            if i == j:
                ax.hist(table[xj], bins=20, color=PALETTE[0])
            else:
                ax.scatter(table[xj], table[yi], s=3, alpha=0.5, color=PALETTE[0])
            ax.tick_params(labelsize=6)
            if i == n - 1:
                ax.set_xlabel(xj, fontsize=7)
            if j == 0:
                ax.set_ylabel(yi, fontsize=7)
    fig.suptitle("sweep: scatter matrix (levels in dB)", fontsize=10)
    return _finish(fig, path)
