"""The analyses as Python functions with notebook views.

Each function does what one command does and returns a :class:`View`: named tidy
DataFrames (``view["ranking"]``, ``view.tables``) that show in a notebook as escaped HTML
tables with the caution (``_repr_html_``) and as text elsewhere. Solving itself is
:func:`seatool.run`, whose :class:`~seatool.results.Result` has its own notebook view.

=======================  ===================  =============================================
function                 command              tables
=======================  ===================  =============================================
:func:`source_paths`     ``seatool paths``    ``sources``, ``ranking``, ``paths``,
                                              ``contributions``, ``connections``
:func:`sensitivity`      ``seatool            ``ranking``, ``bands``
                         sensitivity``
:func:`level_spread`     ``seatool spread``   ``overall``, ``bands``
:func:`design_variants`  ``seatool            ``levels``, ``margins``, ``masses``,
                         variants``           ``difference``
:func:`lightest`         ``seatool            ``choice``, ``margins``, ``alternatives``
                         lightest``
=======================  ===================  =============================================
"""

from __future__ import annotations

import html
from collections.abc import Mapping
from dataclasses import dataclass, field
from pathlib import Path

import pandas as pd

from ..analysis import candidates as candidate_files
from ..analysis import lightest as lightest_search
from ..analysis import paths as path_analysis
from ..analysis import sensitivity as sens
from ..analysis import uncertainty
from ..analysis import variants as variant_analysis
from ..model import Model
from ..results import CAUTION, Result
from ..solve import solve

__all__ = ["View", "design_variants", "level_spread", "lightest", "sensitivity", "source_paths"]

#: Rows of each table shown in a notebook (the DataFrames themselves are complete).
SHOWN_ROWS = 15


@dataclass(frozen=True)
class View:
    """Named tables of one analysis, with a title and notes, for notebooks and text.

    ``view[name]`` is a table; ``view.tables`` all of them in order. The first
    :data:`SHOWN_ROWS` rows of each are shown; every string is escaped; the caution
    closes the view.
    """

    title: str
    tables: Mapping[str, pd.DataFrame]
    notes: tuple[str, ...] = field(default_factory=tuple)

    def __getitem__(self, name: str) -> pd.DataFrame:
        return self.tables[name]

    def _repr_html_(self) -> str:
        parts = [f"<h4>{html.escape(self.title)}</h4>"]
        for name, df in self.tables.items():
            more = f" (first {SHOWN_ROWS} of {len(df)} rows)" if len(df) > SHOWN_ROWS else ""
            parts.append(f"<p><b>{html.escape(name)}</b>{html.escape(more)}</p>")
            parts.append(
                df.head(SHOWN_ROWS).to_html(index=False, escape=True, float_format="{:.4g}".format)
            )
        parts.extend(f"<p><small>{html.escape(n)}</small></p>" for n in self.notes)
        parts.append(f"<p><small>Caution: {html.escape(CAUTION)}</small></p>")
        return "\n".join(parts)

    def __str__(self) -> str:
        out = [self.title]
        for name, df in self.tables.items():
            out += ["", name, df.head(SHOWN_ROWS).to_string(index=False)]
        out += ["", *self.notes, "Caution: " + CAUTION]
        return "\n".join(out)

    def __repr__(self) -> str:
        return f"<View {self.title!r}: {', '.join(self.tables)}>"


def source_paths(model: Model, receiver: str, *, max_length: int = 6, top: int = 10) -> View:
    """Where the receiver's energy comes from: sources, ranked paths, connection powers.

    Tables: ``sources`` (share of the receiver's band-summed energy per source),
    ``ranking`` (:func:`seatool.analysis.paths.path_ranking`, first ``top``), ``paths``
    (per band, :func:`~seatool.analysis.paths.paths`), ``contributions`` (per source and
    band, :func:`~seatool.analysis.paths.contributions`), ``connections`` (net power into
    the receiver per connection, :func:`~seatool.analysis.paths.connection_powers`).
    """
    result = Result(model, solve(model))
    con = path_analysis.contributions(model, receiver)
    quantity = "power_W" if model.subsystem(receiver).sink else "energy_J"
    tot = con.groupby("source", sort=False)[quantity].sum()
    sources = pd.DataFrame({"source": tot.index, "share": tot.to_numpy() / max(tot.sum(), 1e-300)})
    pt = path_analysis.paths(model, receiver, max_length=max_length)
    return View(
        f"{model.title or 'model'}: sources and paths into {receiver}",
        {
            "sources": sources.sort_values("share", ascending=False, kind="stable"),
            "ranking": path_analysis.path_ranking(pt).head(top),
            "paths": pt,
            "contributions": con,
            "connections": path_analysis.connection_powers(result, receiver),
        },
        ("share: fraction of the receiver's energy summed over the bands",),
    )


def sensitivity(model: Model, receiver: str) -> View:
    """dB-per-dB sensitivity of the receiver to every loss factor, modal density and power.

    Tables: ``ranking`` (:func:`seatool.analysis.sensitivity.ranking`: effect on the
    overall level, largest first) and ``bands`` (per parameter and band,
    :func:`~seatool.analysis.sensitivity.sensitivities` with the receiver's level).
    """
    result = Result(model, solve(model))
    bands = sens.add_levels(sens.sensitivities(model, receiver, result=result), model, result)
    return View(
        f"{model.title or 'model'}: sensitivities of {receiver}",
        {"ranking": sens.ranking(bands), "bands": bands},
        ("db_per_db: change of the receiver's level [dB] per dB change of the parameter",),
    )


def level_spread(
    model_file: str | Path, *, samples: int = 1000, seed: int = 0, progress: bool | None = None
) -> View:
    """Monte Carlo 5 / 50 / 95 % levels from the model file's ``[uncertainty]`` section.

    Tables: ``overall`` (:meth:`seatool.analysis.uncertainty.Spread.overall`) and
    ``bands`` (:meth:`~seatool.analysis.uncertainty.Spread.table`). ``progress`` shows a
    bar on stderr (default: when stderr is a terminal).
    """
    sp = uncertainty.spread_file(model_file, samples=samples, seed=seed, progress=progress)
    return View(
        f"{sp.model.title or 'model'}: spread of the levels",
        {"overall": sp.overall(), "bands": sp.table()},
        (f"{sp.samples} samples, seed {sp.seed}, {sp.method}",),
    )


def design_variants(variants_file: str | Path) -> View:
    """Design variants of a base model side by side (a variants file, as ``seatool
    variants``).

    Tables: ``levels``, ``margins``, ``masses`` and ``difference`` of
    :class:`seatool.analysis.variants.Comparison`; the notes name every band a variant
    raises by more than 1 dB, with the trim resonance that explains it where known.
    """
    data, file, folder, vs = variant_analysis.load_variants(variants_file)
    c = variant_analysis.compare(data, vs, file=file, base_dir=folder)
    return View(
        f"design variants of {file}",
        {"levels": c.levels, "margins": c.margins, "masses": c.masses,
         "difference": c.difference},
        tuple(c.flags),
    )  # fmt: skip


def lightest(candidates_file: str | Path, *, progress: bool | None = None) -> View:
    """The lightest combination of candidate treatments meeting every target (a candidates
    file, as ``seatool lightest``).

    Tables: ``choice`` (the option chosen per surface), ``margins`` (of the answer,
    :func:`seatool.analysis.targets.margin_table`) and ``alternatives`` (next-best
    combinations); the notes are the search's summary (mass, binding limit, method).
    """
    data, file, folder, surfaces, settings = candidate_files.load_candidates(candidates_file)
    got = lightest_search.lightest_treatment(
        data, surfaces, file=file, base_dir=folder, progress=progress, **settings
    )
    choice = pd.DataFrame({"surface": list(got.choice), "option": list(got.choice.values())})
    return View(
        f"lightest treatment for {file}",
        {"choice": choice, "margins": got.margins, "alternatives": got.alternatives},
        tuple(got.summary().splitlines()),
    )
