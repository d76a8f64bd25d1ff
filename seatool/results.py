"""Results of an SEA solve as tidy tables.

:class:`Result` only reads a solved model; it never changes it. Tables are pandas
DataFrames with one row per subsystem (or connection) and band; column names carry
their units.
"""

from __future__ import annotations

import html
import os
from dataclasses import dataclass

import numpy as np
import numpy.typing as npt
import pandas as pd

from . import levels
from .bands import a_weighting
from .levels import CAUTION
from .model import Model, Subsystem
from .outputs import write_text_atomic
from .solve import Solution, solve
from .validity_report import validity_table, weak_band_notes

__all__ = [
    "CAUTION",
    "Result",
    "csv_text",
    "neutralise_cell",
    "run",
    "subsystem_level",
    "write_csv",
    "write_text_atomic",
]

Array = npt.NDArray[np.float64]


def subsystem_level(sub: Subsystem, energy: npt.ArrayLike) -> tuple[Array, str]:
    """Level [dB] of a subsystem's band energy and the quantity it is a level of.

    Cavities: sound pressure level from <p^2> = rho c^2 E / V; structures with a mass:
    velocity level from <v^2> = E / M; otherwise the energy level (conversions and ISO 1683
    references in :mod:`seatool.levels`).
    """
    e = np.asarray(energy, dtype=float)
    if sub.quantity == "sound_pressure" and not sub.sink:
        assert sub.volume is not None and sub.density is not None and sub.sound_speed is not None
        p_sq = levels.mean_square_pressure(e, sub.volume, sub.density, sub.sound_speed)
        return levels.sound_pressure_level(p_sq), "sound_pressure"
    if sub.quantity == "velocity" and sub.mass is not None:
        return levels.velocity_level(levels.mean_square_velocity(e, sub.mass)), "velocity"
    return levels.energy_level(e), "energy"


def csv_text(table: pd.DataFrame) -> str:
    """A table as CSV text whose first line is the caution, as a ``#`` comment.

    The caution travels with the numbers: a spreadsheet shows it as the first row, and
    ``pandas.read_csv(path, comment="#")`` (or ``skiprows=1``) skips it. Text cells a
    spreadsheet would run as a formula are made inert (:func:`neutralise_cell`).
    """
    safe = table.copy(deep=False)
    for col in safe.columns:
        if not (
            pd.api.types.is_numeric_dtype(safe[col]) or pd.api.types.is_bool_dtype(safe[col])
        ):
            safe[col] = safe[col].map(neutralise_cell)
    return "# Caution: " + CAUTION + "\n" + safe.to_csv(index=False, float_format="%.10g")


#: First characters that make a spreadsheet read a cell as a formula (OWASP, "CSV
#: Injection"): such text cells get a leading apostrophe.
FORMULA_START = ("=", "+", "-", "@", "\t", "\r")


def neutralise_cell(value: object) -> object:
    """A text cell that a spreadsheet would run as a formula, made inert.

    Text starting with ``= + - @``, a tab or a carriage return gets a leading apostrophe
    (the cell is then shown as text); a number written as text (``-3.2``, ``+1e3``) and
    every non-text value are returned unchanged.
    """
    if not isinstance(value, str) or not value.startswith(FORMULA_START):
        return value
    try:
        float(value)
    except ValueError:
        return "'" + value
    return value


def write_csv(table: pd.DataFrame, path: str | os.PathLike[str]) -> None:
    """Write :func:`csv_text` of ``table`` to ``path`` atomically."""
    write_text_atomic(path, csv_text(table))


@dataclass(frozen=True)
class Result:
    """Energies, levels and power flows of a solved model.

    Attributes
    ----------
    model : Model
        The model that was solved (unchanged).
    solution : Solution
        Raw arrays: ``energy`` (N, B) [J], ``input_power``, ``dissipated_power`` (N, B) [W],
        ``connection_power`` (C, B) [W], conservation ``residual`` and ``condition`` (B,).
    """

    model: Model
    solution: Solution

    # -- arrays ------------------------------------------------------------------------
    @property
    def energy(self) -> Array:
        """Band energies (N, B) [J]."""
        return self.solution.energy

    @property
    def notes(self) -> tuple[str, ...]:
        """Model and solver notes, then SEA validity warnings (weak bands, model limits)."""
        return self.model.notes + self.solution.notes + weak_band_notes(self.model)

    def validity(self) -> pd.DataFrame:
        """SEA validity per subsystem and band (:func:`seatool.validity_report.validity_table`):
        ``subsystem, band_hz, modes_in_band, modal_overlap, ..., flag, message``."""
        return validity_table(self.model)

    def sources(self) -> pd.DataFrame:
        """Overall input power per excitation: ``excitation, subsystem, given, input_W``
        (band sum; for a held level, the power its subsystem needs to stay there)."""
        m = self.model
        idx = m.index()
        rows = []
        for e in m.excitations:
            if e.drive == "power":
                assert e.power is not None
                total = float(np.sum(e.power))
            else:
                total = float(np.sum(self.solution.input_power[idx[e.subsystem]]))
            rows.append((e.name, e.subsystem, e.quantity or e.drive, total))
        return pd.DataFrame(rows, columns=["excitation", "subsystem", "given", "input_W"])

    def level_array(self) -> tuple[Array, list[str], list[str]]:
        """Levels (N, B) [dB], their quantity and reference label per subsystem."""
        out = np.empty_like(self.energy)
        quantity: list[str] = []
        refs: list[str] = []
        for i, s in enumerate(self.model.subsystems):
            out[i], q = subsystem_level(s, self.energy[i])
            quantity.append(q)
            refs.append(levels.reference_label(q))
        return out, quantity, refs

    # -- tables ------------------------------------------------------------------------
    def _band_columns(self, n_rows: int) -> dict[str, Array]:
        bands = self.model.bands
        return {
            "band_hz": np.tile(bands.nominal, n_rows),
            "band_exact_hz": np.tile(bands.centre, n_rows),
        }

    def table(self) -> pd.DataFrame:
        """Tidy table: one row per subsystem and band.

        Columns: ``subsystem, band_hz`` (nominal), ``band_exact_hz``, ``energy_J``,
        ``level_dB``, ``level_ref``, ``quantity``, ``velocity_level_dB``,
        ``acceleration_level_dB`` (structures only, else NaN).
        """
        m = self.model
        nb = len(m.bands)
        lv, quantity, refs = self.level_array()
        acc = np.full_like(lv, np.nan)
        for i, s in enumerate(m.subsystems):
            if quantity[i] == "velocity" and s.mass is not None:
                acc[i] = levels.acceleration_level(
                    levels.mean_square_velocity(self.energy[i], s.mass), m.bands.omega
                )
        return pd.DataFrame(
            {
                "subsystem": np.repeat(m.names, nb),
                **self._band_columns(len(m.subsystems)),
                "energy_J": self.energy.ravel(),
                "level_dB": lv.ravel(),
                "level_ref": np.repeat(refs, nb),
                "quantity": np.repeat(quantity, nb),
                "acceleration_level_dB": acc.ravel(),
            }
        )

    def power_balance(self) -> pd.DataFrame:
        """Per subsystem and band: ``input_W``, ``dissipated_W``, ``net_out_W``.

        ``input_W`` is the external input (for a held level, the power needed to hold it);
        ``dissipated_W`` the damping loss (for the exterior, the power it absorbs);
        ``net_out_W`` the net power sent to neighbours. input = dissipated + net_out.
        """
        m = self.model
        nb = len(m.bands)
        sol = self.solution
        net = sol.input_power - sol.dissipated_power
        return pd.DataFrame(
            {
                "subsystem": np.repeat(m.names, nb),
                **self._band_columns(len(m.subsystems)),
                "input_W": sol.input_power.ravel(),
                "dissipated_W": sol.dissipated_power.ravel(),
                "net_out_W": net.ravel(),
            }
        )

    def exchanges(self) -> pd.DataFrame:
        """Net power through each connection per band (positive from ``from`` to ``to``)."""
        m = self.model
        nb = len(m.bands)
        c = m.connections
        return pd.DataFrame(
            {
                "connection": np.repeat([x.name for x in c], nb),
                "from": np.repeat([x.a for x in c], nb),
                "to": np.repeat([x.b for x in c], nb),
                **self._band_columns(len(c)),
                "net_power_W": self.solution.connection_power.ravel(),
            }
        )

    def overall(self) -> pd.DataFrame:
        """Overall (energetic band sum) level per subsystem, and A-weighted for cavities.

        A-weighting per IEC 61672-1 at the exact mid-band frequencies.
        """
        m = self.model
        lv, quantity, refs = self.level_array()
        total = levels.level_sum(lv, axis=1)
        aw = a_weighting(m.bands.centre)
        a_total = np.where(
            np.array(quantity) == "sound_pressure", levels.level_sum(lv + aw, axis=1), np.nan
        )
        return pd.DataFrame(
            {
                "subsystem": list(m.names),
                "quantity": quantity,
                "overall_dB": total,
                "overall_dBA": a_total,
                "level_ref": refs,
            }
        )

    def wide(self, names: list[str] | None = None) -> pd.DataFrame:
        """Levels as a band x subsystem table (for printing)."""
        t = self.table()
        if names is not None:
            t = t[t["subsystem"].isin(names)]
        w = t.pivot(index="band_hz", columns="subsystem", values="level_dB")
        order = [n for n in self.model.names if n in w.columns]
        return w[order]

    # -- output ------------------------------------------------------------------------
    def to_csv(self, path: str | os.PathLike[str]) -> None:
        """Write :meth:`table` to ``path`` atomically, the caution first (:func:`csv_text`)."""
        write_csv(self.table(), path)

    def render(
        self,
        names: list[str] | None = None,
        *,
        digits: int = 1,
        caution: bool = True,
        merged: pd.DataFrame | None = None,
    ) -> str:
        """Compact text table of band levels with overall totals and notes.

        The last line is the caution (:data:`seatool.levels.CAUTION`) unless ``caution`` is
        False (the command line prints it once, after everything else). ``merged`` is a
        per-band table with a ``method`` column (:func:`seatool.crossover.merge_tables`):
        its ``level_dB`` is shown instead, bands of the modal solution marked ``*``, and the
        overall levels are the band sums of what is shown.
        """
        m = self.model
        if merged is None:
            w = self.wide(names)
            modal = np.zeros(w.shape, dtype=bool)
        else:
            t = merged if names is None else merged[merged["subsystem"].isin(names)]
            order = [n for n in m.names if n in set(t["subsystem"])]
            w = t.pivot(index="band_hz", columns="subsystem", values="level_dB")[order]
            modal = (t.pivot(index="band_hz", columns="subsystem", values="method")[order]
                     == "modal").to_numpy()  # fmt: skip
        _, quantity, refs = self.level_array()
        q = dict(zip(m.names, refs, strict=True))
        cols = list(w.columns)
        head = ["band"] + cols
        values = w.to_numpy(dtype=float)
        mark = np.where(modal, "*", " " if modal.any() else "")
        lines_tab = [
            [m.bands.label(i)]
            + [f"{values[i, k]:.{digits}f}{mark[i, k]}" for k in range(len(cols))]
            for i in range(values.shape[0])
        ]
        pad = " " if modal.any() else ""
        if merged is None:
            ov = self.overall()
            total = dict(zip(ov["subsystem"], ov["overall_dB"].to_numpy(dtype=float), strict=True))
            a_total = dict(
                zip(ov["subsystem"], ov["overall_dBA"].to_numpy(dtype=float), strict=True)
            )
        else:
            kind = dict(zip(m.names, quantity, strict=True))
            aw = a_weighting(m.bands.centre)
            total = {c: float(levels.level_sum(values[:, k])) for k, c in enumerate(cols)}
            a_total = {
                c: float(levels.level_sum(values[:, k] + aw))
                if kind[c] == "sound_pressure" else np.nan
                for k, c in enumerate(cols)
            }  # fmt: skip
        lines_tab.append(["overall"] + [f"{total[c]:.{digits}f}{pad}" for c in cols])
        if any(np.isfinite(a_total[c]) for c in cols):
            lines_tab.append(
                ["overall dB(A)"]
                + [f"{a_total[c]:.{digits}f}{pad}" if np.isfinite(a_total[c]) else f"-{pad}"
                   for c in cols]  # fmt: skip
            )
        widths = [max(len(r[k]) for r in [head, *lines_tab]) for k in range(len(head))]
        fmt = "  ".join(f"{{:>{wd}}}" for wd in widths)
        out = []
        if m.title:
            out.append(m.title)
        out.append(fmt.format(*head))
        out.append(fmt.format(*["-" * wd for wd in widths]))
        out.extend(fmt.format(*r) for r in lines_tab)
        out.append("")
        out.append("levels in dB: " + "; ".join(f"{c} {q[c]}" for c in cols))
        if modal.any():
            out.append("method: * modal solution (below the SEA range, [low_frequency]); "
                       "every other value SEA")  # fmt: skip
        out.append(f"conservation residual (max over bands): {self.solution.residual.max():.1e}")
        src = self.sources()
        if len(src):
            parts = ", ".join(f"{r.excitation} {r.input_W:.3g} W" for r in src.itertuples())
            out.append(f"input power (sum over bands): {src['input_W'].sum():.3g} W ({parts})")
        for note in self.notes:
            out.append(f"note: {note}")
        if caution:
            out += ["", "Caution: " + CAUTION]
        return "\n".join(out)

    def __str__(self) -> str:
        return self.render()

    def __repr__(self) -> str:
        m = self.model
        return (
            f"<Result {m.title or 'model'}: {len(m.subsystems)} subsystems x {len(m.bands)} bands>"
        )

    def _repr_html_(self) -> str:
        w = self.wide().round(1)
        title = f"<b>{html.escape(self.model.title)}</b>" if self.model.title else ""
        warned = "".join(
            f"<p><small>warning: {html.escape(str(x))}</small></p>" for x in self.model.warnings
        )
        return (
            title
            + w.to_html(escape=True)
            + warned
            + f"<p><small>Caution: {html.escape(CAUTION)}</small></p>"
        )


def run(model: Model) -> Result:
    """Solve ``model`` in every band and return a :class:`Result` (the model is not changed)."""
    return Result(model, solve(model))
