"""Per-subsystem, per-band SEA validity of a model, in tables and plain words.

Reads a model only (never solves or changes it). For every subsystem that stores energy
in modes (not the exterior sink, not a single resonator) and every band:

* modes in band N = n(f) Delta_f and modal overlap M = eta f n(f) with eta the *total*
  loss factor (damping plus every coupling loss factor out of the subsystem, the reverse
  ones from reciprocity, as the solver assembles them) — both from
  :func:`seatool.physics.validity.assess_bands`, with its thresholds (N >= 5, M >= 1)
  and its GOE spread estimate;
* model-specific limits stored by the subsystem readers: a duct above its cross-mode
  cut-on frequency, a thin plate above the thin-plate limit
  (:func:`seatool.physics.validity.thin_plate_upper_frequency`), a ribbed plate above its
  skin-bay frequency.

:func:`validity_table` gives the tidy DataFrame, :func:`weak_band_notes` one compact line
per subsystem with weak bands (used in ``seatool solve`` and ``Result.notes``) and
:func:`check_table` the text table of ``seatool check``.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import numpy.typing as npt
import pandas as pd

from .model import Model, Subsystem
from .physics import elastic
from .physics import validity as pv
from .physics.variance import ALPHA_POINT, level_quantiles, relative_variance_band
from .properties import DuctProps, PanelProps, has_thin_plate_limit, is_resonator
from .solve import assemble

__all__ = [
    "SubsystemValidity",
    "band_spread_db",
    "assess_model",
    "check_table",
    "validity_table",
    "weak_band_notes",
]

Array = npt.NDArray[np.float64]
BoolArray = npt.NDArray[np.bool_]

#: Loss factor used in place of zero (an undamped, unconnected subsystem) so that the
#: modal overlap is computed as practically zero instead of failing.
_ETA_FLOOR = 1e-12


@dataclass(frozen=True)
class SubsystemValidity:
    """Validity indicators of one subsystem in every band of the model.

    Attributes
    ----------
    name : str
        Subsystem name.
    bands : BandValidity
        Modes in band, modal overlap, spread and flags (see
        :class:`seatool.physics.validity.BandValidity`).
    total_loss_factor : ndarray
        Total loss factor used for the modal overlap [-].
    limits : tuple of (str, ndarray of bool, str)
        Model-specific limits: flag name, bands where it applies, plain-words message.
    """

    name: str
    bands: pv.BandValidity
    total_loss_factor: Array
    limits: tuple[tuple[str, BoolArray, str], ...]

    def flags(self) -> list[str]:
        """Flag per band: 'ok' or the '+'-joined problems."""
        out = []
        for j in range(self.bands.f.size):
            got = []
            if self.bands.very_few_modes[j]:
                got.append("very_few_modes")
            elif self.bands.few_modes[j]:
                got.append("few_modes")
            if self.bands.low_overlap[j]:
                got.append("low_overlap")
            got += [flag for flag, mask, _ in self.limits if mask[j]]
            out.append("+".join(got) if got else "ok")
        return out

    def band_spread(self, sl: slice = slice(None)) -> tuple[Array, Array]:
        """5 % and 95 % band levels relative to the SEA level [dB] in the bands ``sl``:
        this subsystem alone, driven at a point (:func:`band_spread_db`)."""
        return band_spread_db(self.bands.modal_overlap[sl], self.bands.modes_in_band[sl])

    def messages(self, spread: tuple[Array, Array] | None = None) -> list[str]:
        """Plain-words message per band (:func:`seatool.physics.validity.validity_message`),
        with the band-level spread (``spread``, default :meth:`band_spread`)."""
        out = []
        lo, hi = self.band_spread() if spread is None else spread
        for j in range(self.bands.f.size):
            msg = pv.validity_message(
                float(self.bands.modes_in_band[j]),
                float(self.bands.modal_overlap[j]),
                float(self.bands.level_std_db[j]),
                spread=_spread_words(float(lo[j]), float(hi[j])),
            )
            extra = [text for _, mask, text in self.limits if mask[j]]
            out.append("; ".join([msg, *extra]))
        return out


def band_spread_db(modal_overlap: npt.ArrayLike, modes_in_band: npt.ArrayLike) -> tuple[
    Array, Array
]:
    """5 % and 95 % levels of a subsystem's band energy relative to its mean [dB].

    The band-averaged relative variance of a point-driven subsystem
    (:func:`seatool.physics.variance.relative_variance_band`, GOE natural frequencies,
    alpha = 3; Langley & Brown 2004b) turned into log-normal quantiles
    (:func:`seatool.physics.variance.level_quantiles`). NaN where the modal overlap is
    not positive. The spread of a subsystem inside a solved model, with its actual
    inputs and the scatter of its neighbours, is :mod:`seatool.analysis.confidence`.
    """
    m = np.asarray(modal_overlap, dtype=float)
    nb = np.asarray(modes_in_band, dtype=float)
    lo = np.full(m.shape, np.nan)
    hi = np.full(m.shape, np.nan)
    ok = (m > 0) & np.isfinite(m) & np.isfinite(nb) & (nb >= 0)
    if np.any(ok):
        r2 = relative_variance_band(m[ok], nb[ok], alpha=ALPHA_POINT)
        q = level_quantiles(r2, [0.05, 0.95])
        lo[ok], hi[ok] = q[:, 0], q[:, 1]
    return lo, hi


def _spread_words(lo: float, hi: float) -> str:
    if not (np.isfinite(lo) and np.isfinite(hi)):
        return "band-level spread unknown"
    return (
        f"band levels of nominally identical builds {lo:+.1f}/{hi:+.1f} dB about the SEA "
        "level (5-95 %, point drive, this subsystem alone)"
    )


def _counted(s: Subsystem) -> bool:
    return not s.sink and not is_resonator(s)


def _limits(s: Subsystem, f: Array) -> tuple[tuple[str, BoolArray, str], ...]:
    p = s.props
    out: list[tuple[str, BoolArray, str]] = []
    if isinstance(p, DuctProps):
        fc = float(p.cut_on_frequency)
        out.append(
            (
                "above_cut_on",
                np.asarray(f >= fc),
                f"above the duct's first cross-mode cut-on ({fc:.4g} Hz): the plane-wave "
                "modal density undercounts the modes",
            )
        )
    if has_thin_plate_limit(s):
        assert isinstance(p, PanelProps)
        mat = p.material
        c_l = elastic.plate_longitudinal_speed(mat.youngs_modulus, mat.density, mat.poisson_ratio)
        f_max = float(pv.thin_plate_upper_frequency(p.thickness, c_l))
        out.append(
            (
                "thick_plate",
                np.asarray(f > f_max),
                f"above the thin-plate limit ({f_max:.4g} Hz, bending wavelength < 6 "
                "thicknesses): shear and rotary inertia lower the modal density estimate",
            )
        )
    if isinstance(p, PanelProps) and p.bay_frequency is not None:
        fb = float(p.bay_frequency)
        out.append(
            (
                "above_bay_frequency",
                np.asarray(f >= fb),
                f"above the skin-bay frequency ({fb:.4g} Hz): the smeared ribbed-plate model "
                "no longer holds; model the bays between ribs as plates of their own",
            )
        )
    return tuple(out)


def assess_model(
    model: Model,
    *,
    min_modes: float = pv.MIN_MODES,
    min_overlap: float = pv.MIN_OVERLAP,
) -> list[SubsystemValidity]:
    """Validity indicators of every modal subsystem of ``model`` (exterior and resonators
    are left out: the exterior holds no modes, a resonator is one mode by design)."""
    b = model.bands
    diag = assemble(model).diag
    out = []
    for i, s in enumerate(model.subsystems):
        if not _counted(s):
            continue
        eta = np.maximum(diag[i], _ETA_FLOOR)
        bv = pv.assess_bands(
            b.centre,
            s.modal_density,
            b.width,
            eta,
            min_modes=min_modes,
            min_overlap=min_overlap,
        )
        out.append(SubsystemValidity(s.name, bv, np.asarray(diag[i]), _limits(s, b.centre)))
    return out


def validity_table(model: Model) -> pd.DataFrame:
    """Tidy table, one row per subsystem and band.

    Columns: ``subsystem, band_hz`` (nominal), ``modes_in_band``, ``modal_overlap``,
    ``total_loss_factor``, ``level_std_dB`` (GOE single-frequency estimate),
    ``band_p05_dB``, ``band_p95_dB`` (band levels at 5 % and 95 % relative to the SEA
    level, :func:`band_spread_db`), ``flag`` ('ok' or '+'-joined problems), ``message``
    (plain words).
    """
    rows: dict[str, list[object]] = {
        k: []
        for k in (
            "subsystem",
            "band_hz",
            "modes_in_band",
            "modal_overlap",
            "total_loss_factor",
            "level_std_dB",
            "band_p05_dB",
            "band_p95_dB",
            "flag",
            "message",
        )
    }
    nominal = model.bands.nominal
    svs = assess_model(model)
    spreads = _spreads(svs, [slice(None)] * len(svs))
    for sv, (lo, hi) in zip(svs, spreads, strict=True):
        nb = nominal.size
        rows["subsystem"] += [sv.name] * nb
        rows["band_hz"] += list(nominal)
        rows["modes_in_band"] += list(sv.bands.modes_in_band)
        rows["modal_overlap"] += list(sv.bands.modal_overlap)
        rows["total_loss_factor"] += list(sv.total_loss_factor)
        rows["level_std_dB"] += list(sv.bands.level_std_db)
        rows["band_p05_dB"] += list(lo)
        rows["band_p95_dB"] += list(hi)
        rows["flag"] += sv.flags()
        rows["message"] += sv.messages((lo, hi))
    return pd.DataFrame(rows)


def _spreads(
    svs: list[SubsystemValidity], slices: list[slice]
) -> list[tuple[Array, Array]]:
    """:func:`band_spread_db` of the bands ``slices[i]`` of ``svs[i]``, in one call."""
    m = [sv.bands.modal_overlap[sl] for sv, sl in zip(svs, slices, strict=True)]
    n = [sv.bands.modes_in_band[sl] for sv, sl in zip(svs, slices, strict=True)]
    if not m:
        return []
    lo, hi = band_spread_db(np.concatenate(m), np.concatenate(n))
    cuts = np.cumsum([x.size for x in m])[:-1]
    return list(zip(np.split(lo, cuts), np.split(hi, cuts), strict=True))


def _runs(mask: BoolArray) -> list[tuple[int, int]]:
    """Contiguous runs of True as (first, last) index pairs."""
    out = []
    j = 0
    n = mask.size
    while j < n:
        if mask[j]:
            k = j
            while k + 1 < n and mask[k + 1]:
                k += 1
            out.append((j, k))
            j = k + 1
        else:
            j += 1
    return out


def _where(model: Model, first: int, last: int) -> str:
    b = model.bands
    n = len(b)
    if first == 0 and last == n - 1:
        return "in every band"
    if first == 0:
        return f"below {b.label(last + 1)}"
    if last == n - 1:
        return f"from {b.label(first)}"
    if first == last:
        return f"at {b.label(first)}"
    return f"from {b.label(first)} to {b.label(last)}"


def _span(a: Array) -> str:
    lo, hi = float(np.min(a)), float(np.max(a))
    return f"{lo:.2g}" if np.isclose(lo, hi, rtol=0.05) else f"{lo:.2g}-{hi:.2g}"


def weak_band_notes(model: Model) -> tuple[str, ...]:
    """One compact line per subsystem and run of bands where SEA is weak.

    E.g. ``"cabin_air below 250 Hz: 0.4-1.3 modes per band, modal overlap 0.05-0.3;
    band levels of nominally identical builds -7.9/+4.4 dB about the SEA level or wider
    (5-95 %, point drive)"``: the range of modes in band over the run's bands with too few
    modes, the range of modal overlap over its bands with too little overlap, and the
    narrowest band-level spread of the run (:func:`band_spread_db`), hence "or wider".
    Model-specific limits get a line of their own.
    """
    out: list[str] = []
    svs = assess_model(model)
    runs = [(sv, first, last) for sv in svs for first, last in _runs(~sv.bands.ok)]
    spreads = _spreads([r[0] for r in runs], [slice(r[1], r[2] + 1) for r in runs])
    by_run = {(r[0].name, r[1]): sp for r, sp in zip(runs, spreads, strict=True)}
    for sv in svs:
        bv = sv.bands
        weak = ~bv.ok
        for first, last in _runs(weak):
            sl = slice(first, last + 1)
            lo, hi = by_run[(sv.name, first)]
            if np.any(np.isfinite(hi)):
                k = int(np.nanargmin(hi - lo))  # the band of the narrowest spread
                spread = (
                    f"band levels of nominally identical builds {lo[k]:+.1f}/{hi[k]:+.1f} dB "
                    "about the SEA level or wider (5-95 %, point drive)"
                )
            else:
                spread = "band-level spread unknown"
            few = bv.few_modes[sl]
            low = bv.low_overlap[sl]
            parts = []
            if np.any(few):
                parts.append(f"{_span(bv.modes_in_band[sl][few])} modes per band")
            if np.any(low):
                parts.append(f"modal overlap {_span(bv.modal_overlap[sl][low])}")
            out.append(
                f"{sv.name} {_where(model, first, last)}: {', '.join(parts)}; {spread} "
                "(SEA validity)"
            )
        for _, mask, text in sv.limits:
            for first, last in _runs(mask):
                out.append(f"{sv.name} {_where(model, first, last)}: {text}")
    return tuple(out)


def _g(x: float) -> str:
    return f"{x:.0f}" if x >= 100 else f"{x:.2g}"


def check_table(model: Model) -> str:
    """Text table for ``seatool check``: per band and subsystem 'N / M', '*' if weak."""
    svs = assess_model(model)
    if not svs:
        return "SEA validity: no modal subsystems"
    b = model.bands
    head = ["band", *[sv.name for sv in svs]]
    rows = []
    for j in range(len(b)):
        row = [b.label(j)]
        for sv in svs:
            mark = "" if sv.bands.ok[j] else "*"
            if any(mask[j] for _, mask, _ in sv.limits):
                mark += "!"
            row.append(f"{_g(sv.bands.modes_in_band[j])}/{_g(sv.bands.modal_overlap[j])}{mark}")
        rows.append(row)
    widths = [max(len(r[k]) for r in [head, *rows]) for k in range(len(head))]
    fmt = "  ".join(f"{{:>{w}}}" for w in widths)
    lines = [
        "SEA validity per band: modes in band N / modal overlap M "
        f"(* weak: N < {pv.MIN_MODES:g} or M < {pv.MIN_OVERLAP:g}; ! outside a model limit)",
        fmt.format(*head),
        fmt.format(*["-" * w for w in widths]),
        *(fmt.format(*r) for r in rows),
    ]
    notes = weak_band_notes(model)
    if notes:
        lines.append("weak bands:")
        lines += [f"  {n}" for n in notes]
    return "\n".join(lines)
