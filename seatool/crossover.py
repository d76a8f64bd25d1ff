"""One answer across the band range: the modal solution below the SEA range, SEA above.

For a box-shaped cavity of an SEA model and the panels in its walls,
:func:`modal_box_from_model` builds the modal description from the same subsystem data
(fluid, panel stiffness and mass, loss factors), :func:`crossover_band` finds the band from
which SEA holds (:func:`seatool.validity_report.assess_model`, i.e. the limits of
:func:`seatool.physics.validity.assess_bands`: at least ``MIN_MODES`` modes per band and
modal overlap at least ``MIN_OVERLAP`` for every subsystem of the box, in that band and in
every band above), :func:`solve_crossover` solves both and :func:`merge_tables` makes the
per-band table with a ``method`` column. :func:`plot_crossover` draws both solutions across
the overlap region.

Loss factors: a panel's modal damping is its damping loss factor plus its coupling loss
factors to every subsystem outside the box (those losses leave the modal model); the same
for the cavity. Couplings between the box's own subsystems are not used: the modal model
contains them.
"""

from __future__ import annotations

import os
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np
import numpy.typing as npt
import pandas as pd

from . import levels
from .errors import InputError, Problem
from .modal import (
    DiffuseField,
    Excitation,
    ModalBox,
    ModalPanel,
    ModalResult,
    PointForce,
    PointSource,
    solve_modal,
)
from .model import LowFrequency, Model, PanelPlacement
from .physics import mobility
from .plot import _pyplot, save_figure
from .results import CAUTION, Result
from .solve import assemble, solve
from .validity_report import assess_model

__all__ = [
    "CrossoverResult",
    "PanelPlacement",
    "crossover_band",
    "LowFrequencyResult",
    "SEA_ONLY_COLUMNS",
    "merge_tables",
    "with_methods",
    "modal_box_from_model",
    "plot_crossover",
    "solve_crossover",
    "solve_low_frequency",
]

Array = npt.NDArray[np.float64]

#: Default point of a power source in the cavity and of a force on a panel, as fractions of
#: the box sides and panel sides: away from nodal planes of the low modes and from
#: symmetry lines (a corner would excite every mode at its maximum, the centre only half).
DEFAULT_SOURCE_POINT = (0.31, 0.27, 0.23)
DEFAULT_FORCE_POINT = (0.37, 0.29)


def _outside_loss(model: Model, members: set[str]) -> dict[str, Array]:
    """Damping plus coupling loss factors to subsystems outside ``members``, per member."""
    asm = assemble(model)
    names = model.names
    out = {n: asm.damping[model.index()[n]].copy() for n in members}
    for c in range(asm.a.size):
        a, b = names[int(asm.a[c])], names[int(asm.b[c])]
        if a in members and b not in members:
            out[a] += asm.eta_ab[c]
        if b in members and a not in members:
            out[b] += asm.eta_ba[c]
    return out


def modal_box_from_model(
    model: Model,
    cavity: str,
    dims: tuple[float, float, float] | None,
    panels: Mapping[str, PanelPlacement],
) -> ModalBox:
    """The modal description of cavity ``cavity`` (box ``dims`` [m]; None: the cavity's
    ``dimensions`` property) and its ``panels``.

    Panels need the plate properties ``lx``, ``ly``, ``bending_stiffness`` and
    ``mass_per_area`` (plate readers store them); ``lx`` runs along the face's u axis.
    Raises ValueError naming what is missing or inconsistent.
    """
    sub = model.subsystem(cavity)
    if dims is None:
        given = getattr(sub.props, "dimensions", None)
        if given is None:
            msg = f"{cavity}: give the box dimensions (the cavity has none)"
            raise ValueError(msg)
        d = [float(x) for x in given]
        dims = (d[0], d[1], d[2])
    if sub.density is None or sub.sound_speed is None or sub.volume is None:
        msg = f"{cavity}: the modal solution needs a cavity with a fluid and a volume"
        raise ValueError(msg)
    vol = float(dims[0] * dims[1] * dims[2])
    if abs(vol / sub.volume - 1.0) > 0.01:
        msg = (
            f"{cavity}: box dimensions give {vol:.4g} m^3 but the cavity has "
            f"{sub.volume:.4g} m^3; make them agree"
        )
        raise ValueError(msg)
    loss = _outside_loss(model, {cavity, *panels})
    out = []
    for name, place in panels.items():
        props = model.subsystem(name).props
        keys = ("lx", "ly", "bending_stiffness", "mass_per_area")
        p = {k: getattr(props, k) for k in keys if getattr(props, k, None) is not None}
        missing = [k for k in keys if k not in p]
        if missing or np.ndim(p.get("bending_stiffness", 0.0)) != 0:
            msg = (
                f"{name}: the modal solution needs a flat isotropic plate "
                f"(missing: {', '.join(missing) or 'a single bending stiffness'})"
            )
            raise ValueError(msg)
        out.append(
            ModalPanel(name, place.face, (float(p["lx"]), float(p["ly"])), place.offset,
                       float(p["bending_stiffness"]), float(p["mass_per_area"]), loss[name])
        )  # fmt: skip
    return ModalBox(cavity, dims, float(sub.density), float(sub.sound_speed), loss[cavity],
                    tuple(out), model.bands)  # fmt: skip


def crossover_band(model: Model, members: Sequence[str]) -> int:
    """Position of the lowest band from which every member meets the SEA limits in it and in
    every band above (``len(model.bands)`` if the top band does not)."""
    ok = np.ones(len(model.bands), dtype=bool)
    for sv in assess_model(model):
        if sv.name in members:
            ok &= ~sv.bands.few_modes & ~sv.bands.low_overlap
    j = len(ok)
    while j > 0 and ok[j - 1]:
        j -= 1
    return j


def _force_point(box: ModalBox, panels: Mapping[str, PanelPlacement], name: str
                 ) -> tuple[float, float]:  # fmt: skip
    panel = box.panel(name)
    return panels[name].force_point or (DEFAULT_FORCE_POINT[0] * panel.size[0],
                                        DEFAULT_FORCE_POINT[1] * panel.size[1])  # fmt: skip


def _excitations(model: Model, box: ModalBox, panels: Mapping[str, PanelPlacement]
                 ) -> tuple[list[Excitation], list[str]]:  # fmt: skip
    exs: list[Excitation] = []
    skipped = []
    for e in model.excitations:
        if e.through and e.through in panels:
            # A diffuse field's non-resonant part: the modal solution's plane-wave response
            # of the panel's modes already contains the forced (off-resonance) transmission.
            continue
        if e.drive == "power" and e.subsystem == box.name:
            pt = tuple(f * d for f, d in zip(DEFAULT_SOURCE_POINT, box.dims, strict=True))
            exs.append(PointSource(e.name, (pt[0], pt[1], pt[2]), np.asarray(e.power)))
        elif e.drive == "power" and e.subsystem in panels and e.level is not None and (
            e.quantity in ("force", "diffuse_sound_pressure_level")
        ):
            if e.quantity == "force":
                fp = _force_point(box, panels, e.subsystem)
                exs.append(PointForce(e.name, e.subsystem, fp, np.asarray(e.level)))
            else:
                p2 = levels.REFERENCE["sound_pressure"] ** 2 * levels.db_to_ratio(e.level)
                exs.append(DiffuseField(e.name, e.subsystem, p2))
        elif e.drive == "power" and e.subsystem in panels:
            panel = box.panel(e.subsystem)
            fp = _force_point(box, panels, e.subsystem)
            re_y = float(mobility.plate_point_mobility(panel.bending_stiffness,
                                                       panel.mass_per_area).real)  # fmt: skip
            # SEA input power of a point force: W = F^2 Re(Y_inf) (Cremer, Heckl & Petersson)
            exs.append(PointForce(e.name, e.subsystem, fp, np.sqrt(np.asarray(e.power) / re_y)))
        else:
            skipped.append(e.name)
    return exs, skipped


@dataclass(frozen=True)
class CrossoverResult:
    """The SEA result, the modal result and the band from which SEA is used."""

    sea: Result
    modal: ModalResult
    crossover: int
    table: pd.DataFrame
    notes: tuple[str, ...] = field(default=())


def _set_modal(t: pd.DataFrame, modal: ModalResult, name: str, pos: np.ndarray, use: set[int]
               ) -> None:  # fmt: skip
    lv = modal.level(name)
    for j, b in enumerate(modal.band_positions):
        row = (t["subsystem"] == name) & (pos == b)
        t.loc[row, "modal_level_dB"] = lv[j]
        if int(b) in use:
            t.loc[row, "method"] = "modal"


def merge_tables(sea: Result, modal: ModalResult | None, modal_bands: npt.ArrayLike
                 ) -> pd.DataFrame:  # fmt: skip
    """Per-band levels of every subsystem with the method that produced each band.

    ``modal_bands`` are the band positions where the modal value is used (for the box's
    subsystems). Columns: ``subsystem, band_hz, band_exact_hz, level_dB, level_ref,
    quantity, method`` ('modal' or 'SEA'), ``modal_level_dB`` (NaN where not solved),
    ``sea_level_dB``.
    """
    t = sea.table()[["subsystem", "band_hz", "band_exact_hz", "level_dB", "level_ref",
                     "quantity"]].copy()  # fmt: skip
    t = t.rename(columns={"level_dB": "sea_level_dB"})
    t["modal_level_dB"] = np.nan
    use = set(np.asarray(modal_bands, dtype=np.int64).tolist())
    nb = len(sea.model.bands)
    pos_in_table = np.tile(np.arange(nb), len(sea.model.subsystems))
    t["method"] = "SEA"
    for name in modal.quantity if modal is not None else ():
        _set_modal(t, modal, name, pos_in_table, use)  # type: ignore[arg-type]
    t["level_dB"] = np.where(t["method"] == "modal", t["modal_level_dB"], t["sea_level_dB"])
    return t[["subsystem", "band_hz", "band_exact_hz", "level_dB", "level_ref", "quantity",
              "method", "modal_level_dB", "sea_level_dB"]]  # fmt: skip


def solve_crossover(
    model: Model,
    cavity: str,
    dims: tuple[float, float, float] | None,
    panels: Mapping[str, PanelPlacement],
    *,
    up_to: float | None = None,
    overlap_bands: int = 2,
    sea: Result | None = None,
) -> CrossoverResult:
    """SEA for the whole model, the modal solution of the box below the crossover.

    Parameters
    ----------
    model : Model
    cavity, dims, panels
        As in :func:`modal_box_from_model`.
    up_to : float or None, optional
        Use the modal solution for the bands with centre up to this frequency [Hz]; None
        (default) chooses the crossover automatically (:func:`crossover_band`).
    overlap_bands : int, optional
        Bands above the last modal band that are solved both ways, for the figure (default 2).
    sea : Result, optional
        An SEA result of ``model`` already at hand.
    """
    sea = sea if sea is not None else Result(model, solve(model))
    box = modal_box_from_model(model, cavity, dims, panels)
    members = [cavity, *panels]
    bands = model.bands
    if up_to is None:
        j = crossover_band(model, members)
    else:
        j = int(np.count_nonzero(bands.centre <= up_to * (1 + 1e-9)))
    if j == 0:
        j_solve = min(len(bands), overlap_bands)
    else:
        j_solve = min(len(bands), j + overlap_bands)
    exs, skipped = _excitations(model, box, panels)
    if not exs:
        msg = (
            f"no power excitation on {', '.join(members)}: the modal solution has nothing to "
            "solve for"
        )
        raise ValueError(msg)
    modal = solve_modal(box, exs, float(bands.centre[max(j_solve, 1) - 1]))
    notes = list(modal.notes)
    if j < len(bands):
        notes.append(f"{cavity}: modal solution below {bands.label(j)}, SEA from {bands.label(j)}")
    else:
        notes.append(f"{cavity}: SEA limits not met in any top band; modal solution throughout")
    if skipped:
        notes.append(
            "not in the modal solution (SEA only): excitations " + ", ".join(skipped)
        )
    notes.append("subsystems outside the box keep their SEA levels in every band")
    table = merge_tables(sea, modal, np.arange(j))
    return CrossoverResult(sea, modal, j, table, tuple(notes))


@dataclass(frozen=True)
class LowFrequencyResult:
    """Every ``[low_frequency]`` box of a model solved, merged with its SEA result.

    ``table`` has one row per subsystem and band (every subsystem of the model) with the
    columns of :func:`merge_tables`: ``level_dB`` is the level of the ``method`` ('modal'
    or 'SEA') used in that band. ``boxes`` are the crossover results per box.
    """

    sea: Result
    boxes: tuple[CrossoverResult, ...]
    table: pd.DataFrame
    notes: tuple[str, ...]

    def box_rows(self, requests: Sequence[LowFrequency]) -> pd.DataFrame:
        """The rows of each box's cavity and panels, box after box (``requests`` in the
        order the boxes were solved), as one table."""
        return pd.concat(
            [b.table[b.table["subsystem"].isin([rq.cavity, *rq.panels])]
             for rq, b in zip(requests, self.boxes, strict=True)]
        )  # fmt: skip


def solve_low_frequency(
    model: Model, sea: Result | None = None, requests: Sequence[LowFrequency] | None = None
) -> LowFrequencyResult:
    """Solve the boxes ``requests`` (default: the model's ``low_frequency``) and merge them.

    A box the modal solution cannot take (nothing excites it, a panel that is not a plain
    plate ...) raises :class:`~seatool.errors.InputError` naming ``low_frequency.CAVITY``.
    """
    sea = sea if sea is not None else Result(model, solve(model))
    boxes = []
    for rq in model.low_frequency if requests is None else requests:
        try:
            boxes.append(solve_crossover(model, rq.cavity, rq.dims, rq.panels, up_to=rq.up_to,
                                         sea=sea))  # fmt: skip
        except ValueError as exc:
            raise InputError([Problem(model.source, f"low_frequency.{rq.cavity}", str(exc))]
                             ) from None  # fmt: skip
    if not boxes:
        return LowFrequencyResult(sea, (), merge_tables(sea, None, ()), ())
    table = boxes[0].table.copy()
    for box in boxes[1:]:
        own = box.table["subsystem"].isin(list(box.modal.quantity)).to_numpy()
        table.loc[own] = box.table.loc[own].to_numpy()
    notes = tuple(n for b in boxes for n in b.notes) + (
        "the comfort metrics, target margins, paths, sensitivities and spread use the SEA "
        "levels in every band",
    )
    return LowFrequencyResult(sea, tuple(boxes), table, notes)


#: Columns of a per-band SEA table that describe the SEA solution only (its energy and the
#: spread of the SEA estimate): blank in the bands of the modal solution.
SEA_ONLY_COLUMNS = ("energy_J", "acceleration_level_dB", "relative_variance", "level_std_dB")


def with_methods(table: pd.DataFrame, merged: pd.DataFrame) -> pd.DataFrame:
    """A per-band SEA table (``subsystem, band_hz, level_dB ...``, e.g. the CSV of ``solve``)
    with the merged levels of :class:`LowFrequencyResult`: ``level_dB`` the level of the
    method used, ``method``, ``modal_level_dB`` and ``sea_level_dB`` added after it, and the
    SEA-only columns (:data:`SEA_ONLY_COLUMNS`, ``level_p*``) blank where the method is
    modal."""
    cols = ["subsystem", "band_hz", "level_dB", "method", "modal_level_dB", "sea_level_dB"]
    out = table.drop(columns="level_dB").merge(merged[cols], on=["subsystem", "band_hz"],
                                                how="left", validate="one_to_one")  # fmt: skip
    modal = (out["method"] == "modal").to_numpy()
    for c in out.columns:
        if c in SEA_ONLY_COLUMNS or c.startswith("level_p"):
            out.loc[modal, c] = np.nan
    order = list(table.columns)
    at = order.index("level_dB") + 1
    order[at:at] = ["method", "modal_level_dB", "sea_level_dB"]
    out = out[order]
    out.attrs.update(table.attrs)
    return out


def plot_crossover(result: CrossoverResult, path: str | os.PathLike[str]) -> Path:
    """Figure of the box's levels: SEA and modal solutions as steps over the band edges, the
    bands where each is used marked, both drawn across the overlap region."""
    plt = _pyplot()
    bands = result.sea.model.bands
    t = result.table
    names = list(result.modal.quantity)
    fig, axes = plt.subplots(len(names), 1, figsize=(8.0, 2.8 * len(names) + 0.8),
                             squeeze=False, sharex=True)  # fmt: skip
    edges = np.append(bands.lower, bands.upper[-1])
    for ax, name in zip(axes[:, 0], names, strict=True):
        rows = t[t["subsystem"] == name]
        sea = rows["sea_level_dB"].to_numpy(dtype=float)
        mod = rows["modal_level_dB"].to_numpy(dtype=float)
        ax.step(edges, np.append(sea, sea[-1]), where="post", label="SEA", color="tab:blue")
        ax.step(edges, np.append(mod, mod[-1]), where="post", label="modal", color="tab:red")
        used = rows["method"].to_numpy() == "modal"
        for k in np.flatnonzero(used):
            ax.axvspan(bands.lower[k], bands.upper[k], color="tab:red", alpha=0.08, linewidth=0)
        ax.set_xscale("log")
        ax.set_ylabel(f"{name}\n[dB {rows['level_ref'].iloc[0]}]", fontsize=8)
        ax.grid(True, which="both", alpha=0.3)
        ax.legend(fontsize=8)
    step = max(1, len(bands) // 12)
    last = axes[-1, 0]
    last.set_xticks(bands.centre[::step])
    last.set_xticklabels([bands.label(k) for k in range(len(bands))][::step], rotation=45,
                         ha="right", fontsize=8)  # fmt: skip
    last.minorticks_off()
    last.set_xlabel(f"{bands.spacing} band (shaded: method = modal; unshaded: method = SEA)")
    axes[0, 0].set_title(
        f"{result.sea.model.title or 'model'}: modal and SEA solutions of {result.modal.box.name}",
        fontsize=10,
    )
    fig.text(0.01, 0.005, "Caution: " + CAUTION, fontsize=5.5, wrap=True)
    fig.tight_layout(rect=(0, 0.03, 1, 1))
    out = Path(path)
    save_figure(fig, out)
    plt.close(fig)
    return out
