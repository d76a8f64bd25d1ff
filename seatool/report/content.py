"""What a report says: the model in words, its results, analyses and figures, as data.

:func:`collect` solves a model and runs the analyses a report shows (source
contributions and ranked paths, adjoint sensitivities, Monte Carlo spread where the model
has an ``[uncertainty]`` section, SEA validity), draws the figures (SVG) and gathers the
published sources of every formula used. :mod:`seatool.report.html` turns the result into
one HTML file; :func:`seatool.report.write_report` writes it with its JSON companion.
"""

from __future__ import annotations

import sys
import tempfile
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np
import pandas as pd
from tqdm import tqdm

from .. import crossover, plot
from .. import progress as progress_bars
from ..analysis import candidates as candidate_files
from ..analysis import comfort, confidence, uncertainty
from ..analysis import lightest as lightest_search
from ..analysis import paths as path_analysis
from ..analysis import sensitivity as sens
from ..analysis import targets as target_analysis
from ..analysis import variants as variant_analysis
from ..errors import InputError, Problem, closest
from ..model import Model, Subsystem
from ..modelfile import build
from ..outputs import immediate
from ..results import Result
from ..solve import solve
from ..validity_report import validity_table, weak_band_notes
from .references import Reference, model_references

__all__ = ["ASSUMPTIONS", "Content", "TargetHook", "collect", "default_receivers"]

#: What every SEA estimate of this tool assumes, in plain words (Lyon & DeJong 1995,
#: Theory and Application of Statistical Energy Analysis, 2nd ed., ch. 1-3; Fahy 1994,
#: "Statistical energy analysis: a critical overview", Phil. Trans. R. Soc. A 346, 431-447).
ASSUMPTIONS = (
    "Each subsystem's vibration or sound field is described by its band-averaged energy; "
    "levels are averages over the subsystem and over the band, not values at a point or a "
    "single frequency.",
    "Power flows between two subsystems in proportion to the difference of their modal "
    "energies (energy per mode), with coupling loss factors that do not depend on the rest "
    "of the system (weak coupling).",
    "Fields are diffuse and modes in a band share energy equally; this holds where a band "
    "holds several modes with overlapping resonances (see the validity section).",
    "Excitations are steady, broadband and uncorrelated between sources; every source's "
    "contribution adds in energy.",
    "Loss factors come from the materials and dimensions in the model file through the "
    "published formulas listed under References; where a value is given directly, the "
    "model file says so in the provenance column.",
)

#: A function that, given the solved result, returns the limits to show: a tidy table
#: with columns ``subsystem, band_hz, limit_dB`` (NaN where a band has no limit), and
#: optionally the overall A-weighted limit per receiver in ``attrs["overall_dBA"]``
#: (a mapping). The design-decision features plug in here; None shows no margins.
TargetHook = Callable[[Result], pd.DataFrame | None]


@dataclass
class Content:
    """Everything a report shows. Tables are DataFrames, figures SVG text."""

    title: str
    description: str
    source: str
    receiver: str
    receivers: list[str]
    band_label: str
    model: Model
    result: Result
    tables: dict[str, pd.DataFrame] = field(default_factory=dict)
    figures: dict[str, str] = field(default_factory=dict)
    validity_lines: list[str] = field(default_factory=list)
    treatment_lines: list[str] = field(default_factory=list)
    comfort_notes: list[str] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)
    references: list[Reference] = field(default_factory=list)
    spread_note: str = ""
    confidence_note: str = ""
    verdict_lines: list[str] = field(default_factory=list)
    variant_lines: list[str] = field(default_factory=list)
    lightest_lines: list[str] = field(default_factory=list)


def default_receivers(model: Model) -> list[str]:
    """Cavities with no excitation of their own, in model order (all cavities if none)."""
    fed = {e.subsystem for e in model.excitations}
    cav = [s.name for s in model.subsystems if s.quantity == "sound_pressure" and not s.sink]
    free = [n for n in cav if n not in fed]
    return free or cav


def _span(a: np.ndarray) -> str:
    lo, hi = float(np.min(a)), float(np.max(a))
    return f"{lo:.3g}" if np.isclose(lo, hi) else f"{lo:.3g} to {hi:.3g}"


def _description(data: Mapping[str, Any], section: str, name: str) -> str:
    tab = data.get(section, {})
    entry = tab.get(name, {}) if isinstance(tab, Mapping) else {}
    text = entry.get("description", "") if isinstance(entry, Mapping) else ""
    return str(text) if isinstance(text, str) else ""


def _damping_from(s: Subsystem, data: Mapping[str, Any]) -> str:
    """The subsystem's damping provenance; a damping form of the file is named as such."""
    how = s.provenance.get("damping", "")
    tab = data.get("subsystems", {})
    entry = tab.get(s.component, {}) if isinstance(tab, Mapping) else {}
    raw = entry.get("damping") if isinstance(entry, Mapping) else None
    if how == "given" and isinstance(raw, Mapping):
        forms = ", ".join(str(k).replace("_", " ") for k in raw)
        return f"derived from the damping form in the file ({forms})"
    return how


def _size(s: Subsystem) -> str:
    if s.sink:
        return "free field"
    if s.volume is not None:
        return f"{s.volume:.3g} m³"
    if s.mass is not None:
        return f"{s.mass:.3g} kg"
    return ""


def _model_tables(model: Model, result: Result, data: Mapping[str, Any]) -> dict[str, Any]:
    subs = pd.DataFrame(
        {
            "subsystem": [s.name for s in model.subsystems],
            "kind": [s.kind for s in model.subsystems],
            "size": [_size(s) for s in model.subsystems],
            "damping loss factor": [
                "-" if s.sink else _span(s.damping) for s in model.subsystems
            ],
            "description": [
                _description(data, "subsystems", s.component) for s in model.subsystems
            ],
            "modal density from": [
                s.provenance.get("modal_density", "") for s in model.subsystems
            ],
            "damping from": [_damping_from(s, data) for s in model.subsystems],
        }
    )
    cons = pd.DataFrame(
        {
            "connection": [c.name for c in model.connections],
            "from": [c.a for c in model.connections],
            "to": [c.b for c in model.connections],
            "kind": [c.kind for c in model.connections],
            "coupling loss factor": [_span(c.coupling_loss_factor) for c in model.connections],
            "derived from": [
                c.provenance.get("coupling_loss_factor", "") for c in model.connections
            ],
        }
    )
    src = result.sources()
    exc = pd.DataFrame(
        {
            "excitation": [e.name for e in model.excitations],
            "subsystem": [e.subsystem for e in model.excitations],
            "given as": [(e.quantity or e.drive).replace("_", " ") for e in model.excitations],
            "input power [W], band sum": src["input_W"].to_numpy(dtype=float),
            "description": [
                _description(data, "excitations", e.name) for e in model.excitations
            ],
        }
    )
    return {"subsystems": subs, "connections": cons, "excitations": exc}


def _treatment_lines(model: Model) -> list[str]:
    lines: list[str] = []
    for s in model.subsystems:
        t = getattr(s.props, "treatment", None)
        report = getattr(t, "report", None)
        if callable(report):
            lines.extend(str(x).strip() for x in report(s.name))
    lines.extend(str(x).strip() for x in model.reports)
    return lines


def _levels(result: Result, receivers: Sequence[str], merged: pd.DataFrame | None = None
            ) -> pd.DataFrame:  # fmt: skip
    """Band levels of the receivers; with a merged low-frequency table, the level of the
    method of each band and a method column beside each receiver."""
    w = result.wide(list(receivers))
    _, _, refs = result.level_array()
    ref = dict(zip(result.model.names, refs, strict=True))
    if merged is not None:
        t = merged[merged["subsystem"].isin(list(receivers))]
        w = t.pivot(index="band_hz", columns="subsystem", values="level_dB")[list(w.columns)]
        how = t.pivot(index="band_hz", columns="subsystem", values="method")
        for pos, n in enumerate(list(w.columns)):
            w.insert(2 * pos + 1, f"{n} method", how[n])
    w = w.rename(columns={n: f"{n} [dB {ref[n]}]" for n in w.columns if n in ref})
    return w.reset_index().rename(columns={"band_hz": "band [Hz]"})


def _confidence_table(
    result: Result, receivers: Sequence[str], conf: pd.DataFrame
) -> pd.DataFrame:
    """The 5 % and 95 % levels of each receiver per band (same references as the levels)."""
    nominal = result.model.bands.nominal
    cols: dict[str, np.ndarray] = {"band [Hz]": nominal}
    for n in receivers:
        lo, hi = confidence.band_limits(conf, n, nominal)
        cols[f"{n} 5 %"] = lo
        cols[f"{n} 95 %"] = hi
    return pd.DataFrame(cols)


def _margins(result: Result, limits: pd.DataFrame, receivers: Sequence[str]) -> pd.DataFrame:
    t = result.table()
    t = t[t["subsystem"].isin(receivers)][["subsystem", "band_hz", "level_dB"]]
    m = t.merge(limits[["subsystem", "band_hz", "limit_dB"]], on=["subsystem", "band_hz"])
    m["margin_dB"] = m["limit_dB"] - m["level_dB"]
    return m


def _band_limits(result: Result) -> pd.DataFrame:
    """The model's own per-band limits as ``subsystem, band_hz, limit_dB`` (the lowest
    limit where several targets of one receiver have a band limit)."""
    mt = target_analysis.margin_table(result)
    rows = mt[mt["limit_on"] == "band"]
    out = rows.groupby(["receiver", "band_hz"], sort=False)["limit"].min().reset_index()
    return out.rename(columns={"receiver": "subsystem", "limit": "limit_dB"})


def _decisions(
    content: Content,
    result: Result,
    variants: str | Path | None,
    candidates: str | Path | None,
    progress: bool | None,
) -> None:
    """Targets, design variants and the lightest treatment, where the model or the
    caller states them."""
    if result.model.targets:
        content.verdict_lines = [v.line for v in target_analysis.verdicts(result)]
        mt = target_analysis.margin_table(result)
        metric_rows = mt[mt["limit_on"] != "band"]
        content.tables["target_margins"] = metric_rows[
            ["target", "receiver", "limit_on", "level", "limit", "margin", "unit", "met"]
        ].rename(columns={"limit_on": "metric", "margin": "margin [dB or unit]"})
    if variants is not None:
        data, file, folder, vs = variant_analysis.load_variants(variants)
        cmp = variant_analysis.compare(data, vs, file=file, base_dir=folder)
        content.tables["variant_levels"] = cmp.levels
        if len(cmp.margins):
            sm = cmp.margins.groupby(["variant", "target"], sort=False)["margin"].min()
            content.tables["variant_margins"] = sm.reset_index().rename(
                columns={"margin": "smallest margin [dB or unit]"}
            )
        content.tables["variant_difference"] = cmp.difference
        content.variant_lines = [f"{v.name}: {v.description or ', '.join(v.changes)}" for v in vs]
        content.variant_lines += list(cmp.flags)
    if candidates is not None:
        data, file, folder, surfaces, settings = candidate_files.load_candidates(candidates)
        got = lightest_search.lightest_treatment(
            data, surfaces, file=file, base_dir=folder, progress=progress, **settings
        )
        content.lightest_lines = got.summary().splitlines()
        if len(got.alternatives):
            content.tables["lightest_alternatives"] = got.alternatives


def _validity_words(model: Model, receivers: Sequence[str]) -> pd.DataFrame:
    v = validity_table(model)
    v = v[v["subsystem"].isin(receivers)]
    return v[["subsystem", "band_hz", "modes_in_band", "modal_overlap", "message"]].rename(
        columns={"band_hz": "band [Hz]"}
    )


def _svg(draw: Callable[[Path], object]) -> str:
    with tempfile.TemporaryDirectory(prefix="seatool-fig-") as d, immediate():
        p = Path(d) / "figure.svg"
        draw(p)
        return p.read_text(encoding="utf-8")


def _check_choice(file: str, option: str, value: str, names: Sequence[str]) -> None:
    if value not in names:
        raise InputError(
            [Problem(file, option, f"unknown subsystem {value!r}" + closest(value, names))]
        )


def collect(
    data: Mapping[str, Any],
    *,
    file: str = "<data>",
    base_dir: str | Path = ".",
    receiver: str | None = None,
    band: float | None = None,
    samples: int = 300,
    seed: int = 0,
    targets: TargetHook | None = None,
    variants: str | Path | None = None,
    candidates: str | Path | None = None,
    progress: bool | None = None,
    confidence_bands: bool = True,
) -> Content:
    """Solve the model in ``data`` and gather everything its report shows.

    Parameters
    ----------
    data : mapping
        Parsed model file (not changed).
    file, base_dir :
        For messages and relative paths in the model.
    receiver : str, optional
        The subsystem whose paths, sensitivities and spread are shown (default: the first
        cavity without an excitation of its own). Levels are shown for every such cavity.
    band : float, optional
        Nominal band [Hz] of the energy-flow diagram (default: summed over the bands).
    samples, seed :
        Monte Carlo samples and seed for the spread (only when the model has an
        ``[uncertainty]`` section).
    targets : TargetHook, optional
        Limits to show with margins (default: the model's own ``[targets]``, if any).
    variants : path, optional
        A design-variants file (:func:`seatool.analysis.variants.load_variants`) whose
        comparison the report shows (levels, margins, added mass, differences to the base).
    candidates : path, optional
        A candidate-treatments file (:func:`seatool.analysis.candidates.load_candidates`)
        whose lightest combination meeting every target the report shows.
    progress : bool, optional
        Progress bar on stderr (default: :func:`seatool.progress.enabled`, i.e. on a
        terminal unless ``--quiet``).
    confidence_bands : bool, optional
        Show the 5-95 % confidence bands of the SEA ensemble variance
        (:mod:`seatool.analysis.confidence`) in the receiver figure and table (default).
    """
    if samples < 1:
        raise InputError([Problem(file, "--samples", f"must be >= 1, got {samples}")])
    if progress is None:
        progress = progress_bars.enabled()
    steps = ["model", "solve", "decisions", "paths", "sensitivity", "spread", "figures",
             "references"]
    bar = tqdm(total=len(steps), desc="report", disable=not progress, file=sys.stderr,
               leave=False)  # fmt: skip

    def step(name: str) -> None:
        bar.set_postfix_str(name)
        bar.update(1)

    model = build(data, file=file, base_dir=base_dir)
    receivers = default_receivers(model)
    if receiver is not None:
        _check_choice(file, "--to", receiver, model.names)
        same = model.subsystem(receiver).quantity  # one kind of level per figure and table
        receivers = [receiver] + [
            r for r in receivers if r != receiver and model.subsystem(r).quantity == same
        ]
    if not receivers:
        raise InputError(
            [Problem(file, "--to", "the model has no cavity; name the receiving subsystem")]
        )
    main = receivers[0]
    band_index: int | None = None
    if band is not None:
        hits = np.flatnonzero(np.isclose(model.bands.nominal, band))
        if not hits.size:
            raise InputError(
                [Problem(file, "--band", f"{band:g} Hz is not a band of the model; bands "
                         f"{model.bands.label(0)} to {model.bands.label(-1)}")]
            )  # fmt: skip
        band_index = int(hits[0])
    step("model")
    result = Result(model, solve(model))
    step("solve")
    desc = data.get("description", "")
    content = Content(
        title=model.title or Path(file).stem,
        description=desc.strip() if isinstance(desc, str) else "",
        source=file,
        receiver=main,
        receivers=receivers,
        band_label="all bands" if band_index is None else model.bands.label(band_index),
        model=model,
        result=result,
    )
    content.tables.update(_model_tables(model, result, data))
    content.treatment_lines = _treatment_lines(model)
    content.notes = list(model.notes) + list(result.solution.notes)
    conf = confidence.confidence_bands(model, result) if confidence_bands else None
    if conf is not None:
        content.confidence_note = confidence.BAND_NOTE
    low = crossover.solve_low_frequency(model, result) if model.low_frequency else None
    merged = low.table if low is not None else None
    if low is not None:
        content.notes += list(low.notes)
    content.tables["levels"] = _levels(result, receivers, merged)
    if conf is not None:
        content.tables["confidence"] = _confidence_table(result, receivers, conf)
    ov = result.overall()
    content.tables["overall"] = ov[ov["subsystem"].isin(receivers)].reset_index(drop=True)
    hear = comfort.receiver_metrics(result)
    hear = hear[hear["subsystem"].isin(receivers)].reset_index(drop=True)
    if len(hear):
        content.tables["comfort"] = hear.drop(columns="notes")
        content.comfort_notes = sorted({n for x in hear["notes"] for n in str(x).split("; ") if n})
    limits = targets(result) if targets is not None else None
    if limits is None and model.targets:
        limits = _band_limits(result)
    if limits is not None and len(limits):
        content.tables["margins"] = _margins(result, limits, receivers)
    else:
        limits = None
    _decisions(content, result, variants, candidates, progress)
    if conf is not None and model.targets:  # how sure each verdict is (SEA variance)
        pm = target_analysis.probability_from_variance(result)
        content.verdict_lines += target_analysis.render_confidence(pm).splitlines()
    step("decisions")

    con = path_analysis.contributions(model, main)
    tot = con.groupby("source", sort=False)["energy_J"].sum()
    content.tables["sources"] = pd.DataFrame(
        {
            "source": tot.index,
            "share of the overall level [%]": 100.0 * tot.to_numpy() / max(tot.sum(), 1e-300),
        }
    ).sort_values("share of the overall level [%]", ascending=False, kind="stable")
    content.tables["contributions"] = con
    pt = path_analysis.paths(model, main, max_length=5, max_paths=200)
    ranked = path_analysis.path_ranking(pt)
    content.tables["paths"] = ranked.head(10)
    step("paths")
    st = sens.add_levels(sens.sensitivities(model, main, result=result), model, result)
    rk = sens.ranking(st)
    content.tables["sensitivities"] = rk.head(15)
    step("sensitivity")
    spread_table = None
    if "uncertainty" in data:
        sp = uncertainty.spread(
            data, file=file, base_dir=base_dir, samples=samples, seed=seed, progress=progress
        )
        spread_table = sp.table()
        content.tables["spread"] = spread_table[spread_table["subsystem"].isin(receivers)]
        ovs = sp.overall()
        content.tables["spread_overall"] = ovs[ovs["subsystem"].isin(receivers)]
        content.spread_note = (
            f"{sp.samples} Monte Carlo samples (seed {sp.seed}, {sp.method}) of the spreads "
            "stated in the model's [uncertainty] section."
        )
    step("spread")
    content.tables["validity"] = _validity_words(model, receivers)
    content.validity_lines = list(weak_band_notes(model))

    top_path = str(ranked["path"].iloc[0]) if len(ranked) else ""
    highlight = top_path.split(" > ") if " > " in top_path else []
    lim_map = None
    if limits is not None:
        lim_map = {
            str(n): g.set_index("band_hz")
            .reindex(model.bands.nominal)["limit_dB"]
            .to_numpy(dtype=float)
            for n, g in limits.groupby("subsystem")
        }
    content.figures["levels"] = _svg(
        lambda p: plot.plot_receiver_levels(
            result, receivers, p, limits=lim_map, confidence=conf, merged=merged
        )
    )
    content.figures["flow"] = _svg(
        lambda p: plot.plot_energy_flow(result, p, band=band_index, highlight=highlight)
    )
    content.figures["contributions"] = _svg(
        lambda p: plot.plot_contributions(con, result, main, p)
    )
    if len(rk):
        content.figures["sensitivity"] = _svg(lambda p: plot.plot_sensitivity(rk, main, p))
    if "target_margins" in content.tables and limits is not None:
        mt = target_analysis.margin_table(result)
        content.figures["margins"] = _svg(lambda p: plot.plot_band_margins(mt, p))
    if "variant_levels" in content.tables:
        diff = content.tables["variant_difference"]
        content.figures["variants"] = _svg(lambda p: plot.plot_variants(diff, p))
    if spread_table is not None:
        content.figures["spread"] = _svg(
            lambda p: plot.plot_spread(spread_table, main, model.bands, p)
        )
    step("figures")
    content.references = model_references(model)
    step("references")
    bar.close()
    return content
