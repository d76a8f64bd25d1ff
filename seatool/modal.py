"""The low-frequency (modal) solution of a rectangular cavity with flexible panels, per band.

Below the SEA range a box-shaped cavity and the simply supported panels in its walls are
described by their uncoupled modes (:mod:`seatool.physics.modal_box`) coupled through the
panel surfaces and solved per frequency line (:mod:`seatool.physics.modal_coupled`). This
module describes such a box (:class:`ModalBox`, :class:`ModalPanel`), its excitations
(:class:`PointForce`, :class:`DiffuseField`, :class:`PointSource`), picks the modes and the
frequency lines, and averages the responses into the model's bands (:func:`solve_modal`).

Mode truncation rule: every plate and cavity mode with natural frequency up to
``truncation_factor`` (default 2) times the upper edge of the highest solved band. A mode
of natural frequency f_n driven at f <= f_n / 2 responds below resonance with a dynamic
amplification 1 / (1 - (f/f_n)^2) <= 4/3, i.e. nearly statically; the modes left out only
add such stiffness-like residual terms, whose sum decays like 1/N (the one-dimensional
check of the tests shows 0.86/N). The convergence check re-solves with
``check_factor`` (default 1.5) times the upper edge and reports the largest level change
in any band; it is stored in :attr:`ModalResult.convergence_db` and in the notes.

The coupled equations are solved through the coupled modes (one eigendecomposition, modal
damping: :mod:`seatool.physics.modal_eigen`) or directly per line (exact:
:func:`seatool.physics.modal_coupled.solve_coupled`), whichever needs fewer operations
(``solver="auto"``); the notes say which.

Excitations are uncorrelated with each other; their mean-square responses add. Band values
are means over frequency lines that resolve the narrowest modal peak
(:func:`seatool.physics.modal_coupled.band_lines`), i.e. the response to a band-limited
white-noise source of the given band value.
"""

from __future__ import annotations

import time
from collections.abc import Sequence
from dataclasses import dataclass, field

import numpy as np
import numpy.typing as npt
import pandas as pd

from . import levels
from .bands import BandAxis
from .physics import modal_box as mb
from .physics import modal_coupled as mc
from .physics import modal_eigen as me

__all__ = [
    "DiffuseField",
    "ModalBox",
    "ModalPanel",
    "ModalResult",
    "PointForce",
    "PointSource",
    "SOLVERS",
    "solve_modal",
]

#: How the coupled equations are solved per line: through the coupled modes (one
#: eigendecomposition, modal damping with damping-coupled clusters,
#: :mod:`seatool.physics.modal_eigen`) or directly (the exact per-line solve,
#: :func:`seatool.physics.modal_coupled.solve_coupled`); "auto" takes the one with the
#: smaller operation count.
SOLVERS = ("auto", "coupled_modes", "direct")

Array = npt.NDArray[np.float64]

#: Diffuse-field plane-wave directions: Gauss nodes in cos(theta) x azimuths.
DIFFUSE_DIRECTIONS = (6, 12)


def _per_band(value: npt.ArrayLike, nb: int, what: str) -> Array:
    a = np.array(value, dtype=np.float64)
    if a.ndim == 0:
        a = np.full(nb, float(a))
    if a.shape != (nb,) or not np.all(np.isfinite(a)) or np.any(a < 0):
        msg = f"{what}: expected {nb} finite values >= 0 (one per band)"
        raise ValueError(msg)
    a.setflags(write=False)
    return a


@dataclass(frozen=True)
class ModalPanel:
    """A simply supported rectangular panel set into one face of the box.

    ``size`` (a, b) runs along the face's (u, v) axes, ``offset`` is its corner on the face
    (see :mod:`seatool.physics.modal_box` for the axes). ``loss_factor`` per band is the
    panel's modal damping: its own damping plus every loss to subsystems outside the modal
    model (e.g. radiation to the exterior) [-].
    """

    name: str
    face: str
    size: tuple[float, float]
    offset: tuple[float, float]
    bending_stiffness: float
    mass_per_area: float
    loss_factor: npt.ArrayLike


@dataclass(frozen=True)
class ModalBox:
    """A rigid-walled rectangular cavity with flexible panels, on a band axis.

    ``loss_factor`` per band is the cavity's modal damping (absorption and losses to
    subsystems outside the modal model) [-].
    """

    name: str
    dims: tuple[float, float, float]
    density: float
    sound_speed: float
    loss_factor: npt.ArrayLike
    panels: tuple[ModalPanel, ...]
    bands: BandAxis

    def __post_init__(self) -> None:
        nb = len(self.bands)
        if len(self.dims) != 3 or min(self.dims) <= 0:
            msg = f"{self.name}: dims must be three positive lengths [m]"
            raise ValueError(msg)
        object.__setattr__(self, "loss_factor", _per_band(self.loss_factor, nb, self.name))
        names = [self.name]
        panels = []
        for p in self.panels:
            if p.name in names:
                msg = f"duplicate name {p.name!r} in the modal box"
                raise ValueError(msg)
            names.append(p.name)
            u, v, _, _ = mb.face_axes(p.face)
            for side, off, ax in ((p.size[0], p.offset[0], u), (p.size[1], p.offset[1], v)):
                if side <= 0 or off < 0 or off + side > self.dims[ax] * (1 + 1e-12):
                    msg = (
                        f"{p.name}: a {side:g} m side at {off:g} m does not fit on face "
                        f"{p.face} ({self.dims[ax]:g} m)"
                    )
                    raise ValueError(msg)
            lf = _per_band(p.loss_factor, nb, p.name)
            panels.append(
                ModalPanel(p.name, p.face, p.size, p.offset, p.bending_stiffness,
                           p.mass_per_area, lf)  # fmt: skip
            )
        for i, p in enumerate(panels):
            for q in panels[i + 1 :]:
                if p.face == q.face and _overlap(p, q):
                    msg = f"panels {p.name!r} and {q.name!r} overlap on face {p.face}"
                    raise ValueError(msg)
        object.__setattr__(self, "panels", tuple(panels))

    @property
    def volume(self) -> float:
        return float(self.dims[0] * self.dims[1] * self.dims[2])

    def panel(self, name: str) -> ModalPanel:
        for p in self.panels:
            if p.name == name:
                return p
        msg = f"no panel {name!r} in the modal box {self.name!r}"
        raise KeyError(msg)


def _overlap(p: ModalPanel, q: ModalPanel) -> bool:
    return all(
        p.offset[i] < q.offset[i] + q.size[i] and q.offset[i] < p.offset[i] + p.size[i]
        for i in range(2)
    )


@dataclass(frozen=True)
class PointForce:
    """A point force on a panel at (u, v) in panel coordinates [m]; rms force per band [N]."""

    name: str
    panel: str
    position: tuple[float, float]
    force: npt.ArrayLike


@dataclass(frozen=True)
class DiffuseField:
    """A diffuse sound field on a panel's outer face; space-averaged <p^2> per band [Pa^2]."""

    name: str
    panel: str
    mean_square_pressure: npt.ArrayLike


@dataclass(frozen=True)
class PointSource:
    """A point monopole in the cavity at (x, y, z) [m]; free-field sound power per band [W]."""

    name: str
    position: tuple[float, float, float]
    sound_power: npt.ArrayLike


Excitation = PointForce | DiffuseField | PointSource


@dataclass(frozen=True)
class ModalResult:
    """Band-averaged responses of a modal box.

    Attributes
    ----------
    box : ModalBox
    band_positions : numpy.ndarray of int
        Positions in ``box.bands`` of the solved bands.
    mean_square : dict
        Per subsystem name (cavity, panels): <p^2> [Pa^2] or <v^2> [m^2/s^2] per solved band.
    quantity : dict
        Per name: 'sound_pressure' or 'velocity'.
    truncation_hz : float
        Highest natural frequency kept.
    modes : dict
        Number of modes per subsystem.
    lines : int
        Number of frequency lines solved.
    convergence_db : float
        Largest level change [dB] between the ``check_factor`` and ``truncation_factor``
        truncations (NaN if not checked).
    seconds : float
        Time of the main solve.
    """

    box: ModalBox
    band_positions: npt.NDArray[np.int64]
    mean_square: dict[str, Array]
    quantity: dict[str, str]
    truncation_hz: float
    modes: dict[str, int]
    lines: int
    convergence_db: float
    seconds: float
    notes: tuple[str, ...] = field(default=())

    def level(self, name: str) -> Array:
        """Level [dB] of ``name`` per solved band (ISO 1683 references, seatool.levels)."""
        ms = self.mean_square[name]
        if self.quantity[name] == "sound_pressure":
            return levels.sound_pressure_level(ms)
        return levels.velocity_level(ms)

    def table(self) -> pd.DataFrame:
        """Tidy table: ``subsystem, band_hz, band_exact_hz, mean_square, level_dB, level_ref,
        quantity, method`` (method 'modal')."""
        b = self.box.bands
        pos = self.band_positions
        frames = []
        for name, q in self.quantity.items():
            frames.append(
                pd.DataFrame(
                    {
                        "subsystem": name,
                        "band_hz": b.nominal[pos],
                        "band_exact_hz": b.centre[pos],
                        "mean_square": self.mean_square[name],
                        "level_dB": self.level(name),
                        "level_ref": levels.reference_label(q),
                        "quantity": q,
                        "method": "modal",
                    }
                )
            )
        return pd.concat(frames, ignore_index=True)


@dataclass
class _Modes:
    plates: list[mb.PlateModes]
    cavity: mb.CavityModes
    coupling: Array
    slices: list[slice]


def _modes(box: ModalBox, f_trunc: float) -> _Modes:
    cav = mb.cavity_modes(*box.dims, box.sound_speed, f_trunc)
    plates, cols, slices, start = [], [], [], 0
    for p in box.panels:
        pm = mb.plate_modes(p.size[0], p.size[1], p.bending_stiffness, p.mass_per_area, f_trunc)
        plates.append(pm)
        cols.append(mb.coupling_matrix(pm, cav, p.face, p.offset))
        slices.append(slice(start, start + len(pm)))
        start += len(pm)
    coupling = np.concatenate(cols, axis=1) if cols else np.zeros((len(cav), 0))
    return _Modes(plates, cav, coupling, slices)


def _mode_loss(f_modes: Array, bands: BandAxis, eta: Array) -> Array:
    """Band loss factor at each mode's natural frequency (log-frequency interpolation,
    held constant beyond the first and last band centres)."""
    fm = np.maximum(f_modes, bands.centre[0])
    return np.asarray(np.interp(np.log(fm), np.log(bands.centre), eta), dtype=np.float64)


def _solve_once(
    box: ModalBox,
    excitations: Sequence[Excitation],
    pos: npt.NDArray[np.int64],
    f_trunc: float,
    lines: tuple[Array, Array, npt.NDArray[np.int64]],
    solver: str = "auto",
) -> tuple[dict[str, Array], dict[str, int], str]:
    md = _modes(box, f_trunc)
    f, weight, band_of_line = lines
    w = 2.0 * np.pi * f
    bands = box.bands
    cav = md.cavity
    plate_f = np.concatenate([pm.frequency for pm in md.plates]) if md.plates else np.zeros(0)
    plate_m = np.concatenate([np.broadcast_to(pm.modal_mass, (len(pm),)) for pm in md.plates]
                             ) if md.plates else np.zeros(0)  # fmt: skip
    plate_eta = np.concatenate([
        _mode_loss(pm.frequency, bands, np.asarray(p.loss_factor))
        for p, pm in zip(box.panels, md.plates, strict=True)
    ]) if md.plates else np.zeros(0)  # fmt: skip
    cav_eta = _mode_loss(cav.frequency, bands, np.asarray(box.loss_factor))
    nk, nn, nl = plate_f.size, len(cav), w.size
    line_band = pos[band_of_line]
    loads = [_Load.of(e, box, md, f, line_band) for e in excitations]
    nr = sum(ld.columns for ld in loads)
    cw = np.concatenate([ld.weight for ld in loads], axis=1)  # (L, R)
    if solver == "auto":
        diffuse = any(isinstance(e, DiffuseField) for e in excitations)
        solver = _cheaper(nk, nn, nl, nr, frequency_dependent=diffuse)
    if solver == "coupled_modes" and nk > 0:
        modes = me.coupled_modes(plate_f, plate_m, plate_eta, cav.frequency, cav.norm, cav_eta,
                                 md.coupling, density=box.density, sound_speed=box.sound_speed)  # fmt: skip
        n = len(modes)
        step = max(1, _BLOCK_ELEMENTS // max(1, n * nr))
    else:
        solver = "direct"
        z = mc.modal_impedance(w, plate_f, plate_m, plate_eta) if nk else np.zeros((nl, 0), complex)
        y = mc.cavity_modal_admittance_term(w, cav.frequency, cav.norm, cav_eta,
                                            density=box.density, sound_speed=box.sound_speed)  # fmt: skip
        ns, ng = min(nk, nn), max(nk, nn)
        groups = mc.coupling_group_count(md.coupling)
        if groups < ns:  # the coupling groups are eliminated: (lines, K, G) temporaries
            ns, ng = nk, groups
        step = max(1, _BLOCK_ELEMENTS // max(1, ns * max(ng, nr)))
    ms_p = np.empty(nl)
    ms_v = np.empty((nl, len(box.panels)))
    norm_p = cav.norm / box.volume
    rhs_q = np.concatenate([ld.source(nn) for ld in loads], axis=1)  # the same at every line
    for s in range(0, nl, step):  # blocks of lines: the responses are reduced as they come
        sl = slice(s, min(nl, s + step))
        rhs_f = np.zeros((sl.stop - sl.start, nk, nr), dtype=np.complex128)
        col = 0
        for ld in loads:
            ld.write_force(sl, rhs_f[:, :, col : col + ld.columns])
            col += ld.columns
        if solver == "coupled_modes":
            vel, prs = me.solve_coupled_modes(modes, w[sl], _constant(rhs_f), rhs_q)
            p2 = np.einsum("n,lnr->lr", norm_p, _abs2(prs))
        else:
            vel, p2 = mc.solve_coupled_squares(z[sl], y[sl], md.coupling, rhs_f, rhs_q,
                                               pressure_weight=norm_p)  # fmt: skip
        ms_p[sl] = np.sum(cw[sl] * p2, axis=1)
        for j, sj in enumerate(md.slices):
            ms_v[sl, j] = np.sum(cw[sl] * 0.25 * np.sum(_abs2(vel[:, sj, :]), axis=1), axis=1)
    out = {box.name: mc.line_average(ms_p, weight, band_of_line, pos.size)}
    counts = {box.name: len(cav)}
    for j, (p, pm) in enumerate(zip(box.panels, md.plates, strict=True)):
        out[p.name] = mc.line_average(ms_v[:, j], weight, band_of_line, pos.size)
        counts[p.name] = len(pm)
    return out, counts, solver


#: Complex numbers held per block of lines (about 8 MB): the reduced matrices of the direct
#: solve or the responses to every load. Blocks of a few MB keep the temporaries in memory
#: that is reused rather than in fresh pages (page faults are system time).
_BLOCK_ELEMENTS = 500_000


def _abs2(x: npt.NDArray[np.complex128]) -> Array:
    """|x|^2 elementwise."""
    return np.asarray(x.real**2 + x.imag**2, dtype=np.float64)


@dataclass(frozen=True)
class _Load:
    """One excitation's right-hand sides: a constant modal force or source vector, or
    per-line plane-wave forces (``directions``), and the weight of each column per line."""

    panel_slice: slice | None
    force_vector: Array | None
    source_vector: Array | None
    plate: mb.PlateModes | None
    directions: Array | None
    wavenumber: Array
    weight: Array  # (L, columns)

    @property
    def columns(self) -> int:
        return int(self.weight.shape[1])

    @classmethod
    def of(cls, e: Excitation, box: ModalBox, md: _Modes, f: Array,
           line_band: npt.NDArray[np.int64]) -> _Load:  # fmt: skip
        nb = len(box.bands)
        k = 2.0 * np.pi * f / box.sound_speed
        if isinstance(e, PointForce):
            i = [p.name for p in box.panels].index(e.panel)
            amp = _per_band(e.force, nb, e.name)
            return cls(md.slices[i], mb.plate_mode_shape(md.plates[i], *e.position), None,
                       None, None, k, (amp**2)[line_band][:, None])  # fmt: skip
        if isinstance(e, DiffuseField):
            i = [p.name for p in box.panels].index(e.panel)
            dirs, wd = mb.diffuse_field_directions(*DIFFUSE_DIRECTIONS)
            p2 = _per_band(e.mean_square_pressure, nb, e.name)
            return cls(md.slices[i], None, None, md.plates[i], dirs, k,
                       0.5 * p2[line_band][:, None] * wd[None, :])  # fmt: skip
        q = mb.cavity_mode_shape(md.cavity, e.position)
        pw = _per_band(e.sound_power, nb, e.name)
        q2 = mb.monopole_volume_velocity_squared(f, pw[line_band], density=box.density,
                                                 sound_speed=box.sound_speed)  # fmt: skip
        return cls(None, None, q, None, None, k, q2[:, None])

    def write_force(self, sl: slice, out: npt.NDArray[np.complex128]) -> None:
        """Write the generalised forces of the lines ``sl`` into ``out`` (lines, nk,
        columns), which holds zeros."""
        if self.force_vector is not None:
            out[:, self.panel_slice, 0] = self.force_vector
        elif self.plate is not None and self.directions is not None:
            mb.plane_wave_modal_forces(self.plate, self.wavenumber[sl], self.directions,
                                       out=out[:, self.panel_slice, :])  # fmt: skip

    def source(self, nn: int) -> npt.NDArray[np.complex128]:
        """Modal volume-velocity sources (the same at every line), shape (nn, columns)."""
        out = np.zeros((nn, self.columns), dtype=np.complex128)
        if self.source_vector is not None:
            out[:, 0] = self.source_vector
        return out


def _constant(rhs: npt.NDArray[np.complex128] | Array) -> npt.NDArray[np.complex128] | Array:
    """(L, S, R) loads the same at every line -> (S, R), so they are projected once."""
    if rhs.shape[0] > 0 and np.all(rhs == rhs[:1]):
        return np.asarray(rhs[0])
    return rhs


def _cheaper(nk: int, nn: int, nl: int, nr: int, *, frequency_dependent: bool) -> str:
    """The solver with the smaller multiply-add count (dense LAPACK/BLAS estimates)."""
    ns, ng = min(nk, nn), max(nk, nn)
    direct = nl * (ns * ns * ng + ns**3 / 3.0 + ns * ns * nr)
    n = nk + nn
    modal = 10.0 * n**3 + nl * nr * n * (2 * n + (nk if frequency_dependent else 0))
    return "coupled_modes" if modal < direct else "direct"


def solve_modal(
    box: ModalBox,
    excitations: Sequence[Excitation],
    f_max: float,
    *,
    f_min: float | None = None,
    truncation_factor: float = 2.0,
    check_factor: float | None = 1.5,
    lines_per_bandwidth: float = 4.0,
    solver: str = "auto",
) -> ModalResult:
    """Band-averaged modal solution of ``box`` for the bands with centre up to ``f_max`` [Hz].

    Parameters
    ----------
    box : ModalBox
    excitations : sequence of PointForce, DiffuseField, PointSource
        Uncorrelated sources (at least one).
    f_max : float
        Highest band centre solved [Hz].
    f_min : float or None, optional
        Lowest band centre solved [Hz] (default: the lowest band).
    truncation_factor : float, optional
        Modes up to this factor times the upper edge of the highest solved band (default 2;
        see the module docstring for the reason).
    check_factor : float or None, optional
        Truncation factor of the convergence check (default 1.5; None skips the check).
    lines_per_bandwidth : float, optional
        Lines per half-power bandwidth of the most lightly damped mode (default 4).
    solver : {"auto", "coupled_modes", "direct"}, optional
        See :data:`SOLVERS` (default "auto"; the notes say which one ran).

    Returns
    -------
    ModalResult
    """
    if not excitations:
        msg = "the modal solution needs at least one excitation"
        raise ValueError(msg)
    names = {p.name for p in box.panels}
    for e in excitations:
        if isinstance(e, PointForce | DiffuseField) and e.panel not in names:
            msg = f"{e.name}: no panel {e.panel!r} in the modal box {box.name!r}"
            raise ValueError(msg)
    bands = box.bands
    low = bands.centre[0] if f_min is None else f_min * (1 - 1e-9)
    pos = np.flatnonzero((bands.centre <= f_max * (1 + 1e-9)) & (bands.centre >= low))
    pos = pos.astype(np.int64)
    if pos.size == 0:
        msg = f"no band with centre between f_min and f_max = {f_max:g} Hz"
        raise ValueError(msg)
    if solver not in SOLVERS:
        msg = f"solver must be one of {', '.join(SOLVERS)}, got {solver!r}"
        raise ValueError(msg)
    if truncation_factor < 1.0:
        msg = "truncation_factor must be >= 1"
        raise ValueError(msg)
    f_top = float(bands.upper[pos[-1]])
    etas = [np.asarray(box.loss_factor)[pos]] + [np.asarray(p.loss_factor)[pos] for p in box.panels]
    eta_min = max(float(np.min(np.concatenate(etas))), 1e-4)
    lines = mc.band_lines(bands.lower[pos], bands.upper[pos], eta_min,
                          lines_per_bandwidth=lines_per_bandwidth)  # fmt: skip
    t0 = time.perf_counter()
    ms, counts, used = _solve_once(box, excitations, pos, truncation_factor * f_top, lines, solver)
    seconds = time.perf_counter() - t0
    conv = float("nan")
    notes = [
        f"{box.name}: modal solution up to {bands.label(int(pos[-1]))} with "
        + ", ".join(f"{n} {k} modes" for k, n in counts.items())
        + f" (natural frequencies up to {truncation_factor:g} x {f_top:.4g} Hz), "
        f"{lines[0].size} frequency lines, "
        + ("through the coupled modes (modal damping)" if used == "coupled_modes"
           else "solved directly per line")  # fmt: skip
    ]
    if check_factor is not None and check_factor < truncation_factor:
        ms2, _, _ = _solve_once(box, excitations, pos, check_factor * f_top, lines, used)
        with np.errstate(divide="ignore", invalid="ignore"):
            diffs = [np.abs(levels.db(ms[k] / ms2[k])) for k in ms]
        conv = float(np.nanmax(np.concatenate(diffs)))
        notes.append(
            f"{box.name}: convergence check, largest band-level change {conv:.2g} dB between "
            f"modes up to {check_factor:g} x and {truncation_factor:g} x the top band edge"
        )
    quantity = {box.name: "sound_pressure", **{p.name: "velocity" for p in box.panels}}
    return ModalResult(box, pos, ms, quantity, truncation_factor * f_top, counts,
                       int(lines[0].size), conv, seconds, tuple(notes))  # fmt: skip
