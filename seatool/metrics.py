"""Single-number metrics of sound pressure band levels, with their derivatives.

Every metric takes band levels ``levels`` [dB re 20 uPa] of shape (..., B) on a
:class:`~seatool.bands.BandAxis` and returns a :class:`MetricValue`: the value (shape ...),
its gradient with respect to each band level (shape (..., B), for sensitivities by the
chain rule), its unit, its source, and notes stating what was assumed where the model's
band range does not cover the metric's range.

The registry :data:`METRICS` maps a short name (``dB``, ``dBA``, ``dBC``, ``SIL``, ``sone``,
``phon``) to the metric function, so targets and sensitivities can ask for a metric by
name::

    value = METRICS["SIL"](levels, bands)
    value.value, value.gradient, value.notes

All metrics are pure functions of the levels: they read no model and write nothing.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import Literal

import numpy as np
import numpy.typing as npt

from .bands import BandAxis, a_weighting, c_weighting
from .levels import db
from .loudness import (
    LOUDNESS_BANDS_HZ,
    LOW_FREQUENCY_LIMIT_DB,
    Field,
    loudness_level,
    loudness_level_derivative,
    zwicker_loudness,
)

__all__ = [
    "METRICS",
    "SIL_OCTAVES_HZ",
    "MetricValue",
    "octave_levels",
    "speech_interference_level",
    "weighted_level",
    "zwicker_loudness_level",
    "zwicker_loudness_metric",
]

Array = npt.NDArray[np.float64]
Weighting = Literal["Z", "A", "C"]

#: Octave bands of the four-band speech interference level [Hz] (ISO 9921:2003).
SIL_OCTAVES_HZ: tuple[float, ...] = (500.0, 1000.0, 2000.0, 4000.0)


@dataclass(frozen=True)
class MetricValue:
    """A metric of band levels.

    Attributes
    ----------
    name : str
        Short name (a key of :data:`METRICS`).
    value : numpy.ndarray
        Metric value, shape (...) of the levels without the band axis; NaN where the
        metric cannot be formed (see ``notes``).
    gradient : numpy.ndarray
        d value / d L_k per band level, shape (..., B) [unit per dB].
    unit : str
        Unit of the value, e.g. ``dB(A) re 20 uPa``, ``sone``.
    reference : str
        The published source of the metric.
    notes : tuple of str
        What was assumed where the band range does not cover the metric's range.
    """

    name: str
    value: Array
    gradient: Array
    unit: str
    reference: str
    notes: tuple[str, ...] = ()


def _check(levels: npt.ArrayLike, bands: BandAxis) -> Array:
    lv = np.asarray(levels, dtype=float)
    if lv.ndim == 0 or lv.shape[-1] != len(bands):
        raise ValueError(
            f"levels must have {len(bands)} values along the last axis (one per band of "
            f"{bands!r}), got shape {lv.shape}"
        )
    return lv


def _band_range(bands: BandAxis) -> str:
    return f"{bands.label(0)} - {bands.label(-1)}"


def _labels(hz: list[float]) -> str:
    return ", ".join(f"{f / 1000:g} kHz" if f >= 1000 else f"{f:g} Hz" for f in hz)


def _energy_sum(levels: Array, axis: int = -1) -> tuple[Array, Array]:
    """10 lg sum 10^(L/10) over ``axis`` and the share of each term (0 where all silent)."""
    with np.errstate(divide="ignore", invalid="ignore"):
        top = np.max(levels, axis=axis, keepdims=True)
        top = np.where(np.isfinite(top), top, 0.0)
        e = 10.0 ** ((levels - top) / 10.0)
        total = np.sum(e, axis=axis, keepdims=True)
        share = np.divide(e, total, out=np.zeros_like(e), where=total > 0)
        level = db(total) + top
    return np.squeeze(level, axis=axis), share


_WEIGHTING_SOURCE = (
    "IEC 61672-1:2013, Annex E (frequency weightings at the exact mid-band frequencies); "
    "energetic band sum"
)


def weighted_level(
    levels: npt.ArrayLike, bands: BandAxis, weighting: Weighting = "A"
) -> MetricValue:
    """Overall frequency-weighted level [dB] of band levels: Z (none), A or C.

    Parameters
    ----------
    levels : array_like, shape (..., B)
        Band sound pressure levels [dB re 20 uPa]; ``-inf`` is a silent band.
    bands : BandAxis
        The bands of ``levels``.
    weighting : {'Z', 'A', 'C'}
        No weighting, A- or C-weighting.

    Returns
    -------
    MetricValue
        ``dB``, ``dBA`` or ``dBC``; gradient dL_W/dL_k = each band's share of the weighted
        mean-square pressure [dB/dB].

    Notes
    -----
    .. math:: L_W = 10\\lg\\sum_k 10^{(L_k + W(f_k))/10}

    with W the A- or C-weighting of IEC 61672-1:2013 (eqs. E.1, E.6) at the exact mid-band
    frequency f_k (or 0 dB). The sum runs over the model's bands only.

    References
    ----------
    IEC 61672-1:2013, Electroacoustics - Sound level meters - Part 1: Specifications,
    Annex E.
    """
    lv = _check(levels, bands)
    if weighting == "Z":
        w = np.zeros(len(bands))
        name, unit = "dB", "dB re 20 uPa"
    elif weighting == "A":
        w = a_weighting(bands.centre)
        name, unit = "dBA", "dB(A) re 20 uPa"
    elif weighting == "C":
        w = c_weighting(bands.centre)
        name, unit = "dBC", "dB(C) re 20 uPa"
    else:
        raise ValueError(f"weighting must be 'Z', 'A' or 'C', got {weighting!r}")
    value, share = _energy_sum(lv + w)
    note = f"overall levels (dB, dB(A), dB(C)): energetic sum over the model's bands {_band_range(bands)} only"
    return MetricValue(name, value, share, unit, _WEIGHTING_SOURCE, (note,))


def octave_levels(
    levels: npt.ArrayLike, bands: BandAxis
) -> tuple[Array, Array, Array, tuple[str, ...]]:
    """Octave-band levels [dB] from 1/3-octave band levels (or octave levels as given).

    Returns
    -------
    nominal_hz : numpy.ndarray, shape (O,)
        Nominal octave centres (ISO 266 labels) of every octave with at least one 1/3-octave
        band on the axis.
    octave : numpy.ndarray, shape (..., O)
        Octave-band levels: energetic sum of the three 1/3-octave bands of each octave
        (IEC 61260-1:2014: the octave with index x_o holds the 1/3-octave bands
        3 x_o - 1, 3 x_o, 3 x_o + 1).
    gradient : numpy.ndarray, shape (..., O, B)
        d L_octave / d L_k [dB/dB] (each band's share of its octave).
    notes : tuple of str
        Octaves missing one or two of their 1/3-octave bands (their level sums the bands
        present, a lower bound).

    References
    ----------
    IEC 61260-1:2014, Electroacoustics - Octave-band and fractional-octave-band filters -
    Part 1: Specifications, clause 5.4 (band indices, base 10).
    """
    lv = _check(levels, bands)
    if bands.spacing == "octave":
        eye = np.broadcast_to(np.eye(len(bands)), (*lv.shape[:-1], len(bands), len(bands)))
        return np.array(bands.nominal), lv.copy(), eye.copy(), ()
    x = bands.indices
    octave_index = np.floor_divide(x + 1, 3)  # 3 x_o - 1 .. 3 x_o + 1 -> x_o
    first, last = int(octave_index[0]), int(octave_index[-1])
    o_idx = np.arange(first, last + 1)
    out = np.empty((*lv.shape[:-1], o_idx.size))
    grad = np.zeros((*lv.shape[:-1], o_idx.size, len(bands)))
    notes: list[str] = []
    oct_axis = BandAxis("octave", o_idx)
    for k, xo in enumerate(o_idx):
        members = np.flatnonzero(octave_index == xo)
        out[..., k], share = _energy_sum(lv[..., members])
        grad[..., k, members] = share
        if members.size < 3:
            present = [float(v) for v in bands.nominal[members]]
            absent_x = [v for v in (3 * xo - 1, 3 * xo, 3 * xo + 1) if v not in x]
            absent = [float(BandAxis("third-octave", np.array([v])).nominal[0]) for v in absent_x]
            notes.append(
                f"octave {oct_axis.label(k)}: its 1/3-octave band(s) {_labels(absent)} are "
                f"outside the model, so the octave level sums {_labels(present)} only (a lower bound)"
            )
    return np.array(oct_axis.nominal), out, grad, tuple(notes)


_SIL_SOURCE = (
    "ISO 9921:2003, speech interference level SIL: arithmetic mean of the octave-band "
    "levels at 500 Hz, 1, 2 and 4 kHz (the definition of the four-band SIL; clause number "
    "from memory: the definitions clause)"
)


def speech_interference_level(levels: npt.ArrayLike, bands: BandAxis) -> MetricValue:
    """Speech interference level SIL [dB] of band levels (ISO 9921:2003).

    Parameters
    ----------
    levels : array_like, shape (..., B)
        1/3-octave (or octave) band sound pressure levels [dB re 20 uPa].
    bands : BandAxis

    Returns
    -------
    MetricValue
        ``SIL`` [dB]; NaN, with a note, when one of the four octaves has no band in the
        model. Gradient: 1/4 of each band's share of its octave [dB/dB].

    Notes
    -----
    .. math:: \\mathrm{SIL} = \\tfrac14\\left(L_{500} + L_{1000} + L_{2000} + L_{4000}\\right)

    with L_f the octave-band sound pressure levels, each the energetic sum of its three
    1/3-octave bands (IEC 61260-1 band indices).

    References
    ----------
    ISO 9921:2003, Ergonomics - Assessment of speech communication: the speech interference
    level (four octave bands 0.5, 1, 2, 4 kHz; the same four bands as SIL4 of ANSI S3.14-1977).
    """
    lv = _check(levels, bands)
    nominal, octv, grad, oct_notes = octave_levels(lv, bands)
    missing = [f for f in SIL_OCTAVES_HZ if not np.any(np.isclose(nominal, f, rtol=0.02))]
    notes = [
        f"SIL: {n}"
        for n in oct_notes
        if any(f"octave {_labels([f])}:" in n for f in SIL_OCTAVES_HZ)
    ]
    if missing:
        notes.insert(
            0,
            f"SIL not formed: octave band(s) {_labels(missing)} are outside the model's bands "
            f"{_band_range(bands)}",
        )
        shape = lv.shape[:-1]
        return MetricValue(
            "SIL", np.full(shape, np.nan), np.zeros(lv.shape), "dB re 20 uPa", _SIL_SOURCE,
            tuple(notes),
        )  # fmt: skip
    pos = [int(np.flatnonzero(np.isclose(nominal, f, rtol=0.02))[0]) for f in SIL_OCTAVES_HZ]
    value = np.mean(octv[..., pos], axis=-1)
    gradient = np.sum(grad[..., pos, :], axis=-2) / 4.0
    return MetricValue("SIL", value, gradient, "dB re 20 uPa", _SIL_SOURCE, tuple(notes))


_LOUDNESS_SOURCE = (
    "ISO 532-1:2017, Zwicker method for stationary sounds from 1/3-octave band levels "
    "25 Hz - 12.5 kHz (clause 5, Annex A)"
)


def _loudness_input(
    lv: Array, bands: BandAxis
) -> tuple[Array | None, npt.NDArray[np.bool_], npt.NDArray[np.int64], list[str]]:
    """The 28 loudness bands from the model's levels (-inf where missing), which of them the
    model has, their positions on the model's axis, and notes."""
    if bands.spacing != "third-octave":
        return None, np.array([], dtype=bool), np.array([], dtype=np.int64), [
            "loudness not formed: the Zwicker method needs 1/3-octave band levels, the model "
            "has octave bands"
        ]  # fmt: skip
    want = np.arange(-16, 12)  # band indices of 25 Hz .. 12.5 kHz
    pos = (want - int(bands.indices[0])).astype(np.int64)
    have = (pos >= 0) & (pos < len(bands))
    full = np.full((*lv.shape[:-1], want.size), -np.inf)
    full[..., have] = lv[..., pos[have]]
    notes = []
    miss = [LOUDNESS_BANDS_HZ[k] for k in np.flatnonzero(~have)]
    if miss:
        notes.append(
            f"loudness: 1/3-octave band(s) {_labels(miss)} are outside the model's bands "
            f"{_band_range(bands)} and treated as silent (below the threshold of hearing), so "
            "the loudness is a lower bound"
        )
    outside = (bands.indices < want[0]) | (bands.indices > want[-1])
    extra = [float(v) for v in bands.nominal[outside]]
    if extra:
        notes.append(
            f"loudness: band(s) {_labels(extra)} lie outside 25 Hz - 12.5 kHz and are not used"
        )
    low = lv[..., pos[have & (want <= -6)]]  # bands up to 250 Hz
    if low.size and np.any(low > LOW_FREQUENCY_LIMIT_DB):
        notes.append(
            "loudness: a band level at or below 250 Hz exceeds 120 dB, beyond the tables of "
            "ISO 532-1, so the highest level range was used"
        )
    return full, have, pos[have], notes


def zwicker_loudness_metric(
    levels: npt.ArrayLike, bands: BandAxis, *, field: Field = "diffuse"
) -> MetricValue:
    """Stationary loudness N [sone] of band levels (ISO 532-1:2017, Zwicker method).

    Bands 25 Hz - 12.5 kHz missing from the model are silent (stated in the notes); the
    gradient dN/dL_k [sone/dB] is :func:`seatool.loudness.zwicker_loudness`'s forward-mode
    derivative, zero for bands outside 25 Hz - 12.5 kHz. ``field``: ``'diffuse'`` (default,
    the field inside a cabin) or ``'free'``.

    References
    ----------
    ISO 532-1:2017, Acoustics - Methods for calculating loudness - Part 1: Zwicker method.
    """
    lv = _check(levels, bands)
    full, have, pos, notes = _loudness_input(lv, bands)
    grad = np.zeros(lv.shape)
    if full is None:
        value = np.full(lv.shape[:-1], np.nan)
    else:
        value, d = zwicker_loudness(full, field=field)
        grad[..., pos] = d[..., have]
    notes = [*notes, f"loudness: {field} sound field"]
    return MetricValue("sone", np.asarray(value), grad, "sone", _LOUDNESS_SOURCE, tuple(notes))


def zwicker_loudness_level(
    levels: npt.ArrayLike, bands: BandAxis, *, field: Field = "diffuse"
) -> MetricValue:
    """Loudness level L_N [phon] of band levels, from N of :func:`zwicker_loudness_metric`.

    Notes
    -----
    :math:`L_N = 40 + 33.22\\lg N` for N >= 1 sone, :math:`40 (N + 0.0005)^{0.35}` below
    (:func:`seatool.loudness.loudness_level`); gradient by the chain rule.

    References
    ----------
    ISO 532-1:2017, Acoustics - Methods for calculating loudness - Part 1: Zwicker method.
    """
    n = zwicker_loudness_metric(levels, bands, field=field)
    value = loudness_level(n.value)
    grad = loudness_level_derivative(n.value)[..., None] * n.gradient
    return MetricValue("phon", value, grad, "phon", n.reference, n.notes)


def _overall(levels: npt.ArrayLike, bands: BandAxis, *, field: Field = "diffuse") -> MetricValue:
    return weighted_level(levels, bands, "Z")


def _a(levels: npt.ArrayLike, bands: BandAxis, *, field: Field = "diffuse") -> MetricValue:
    return weighted_level(levels, bands, "A")


def _c(levels: npt.ArrayLike, bands: BandAxis, *, field: Field = "diffuse") -> MetricValue:
    return weighted_level(levels, bands, "C")


def _sil(levels: npt.ArrayLike, bands: BandAxis, *, field: Field = "diffuse") -> MetricValue:
    return speech_interference_level(levels, bands)


Metric = Callable[..., MetricValue]

#: Metrics by name: ``METRICS[name](levels, bands, field="diffuse") -> MetricValue``.
#: ``field`` matters only for ``sone`` and ``phon``.
METRICS: dict[str, Metric] = {
    "dB": _overall,
    "dBA": _a,
    "dBC": _c,
    "SIL": _sil,
    "sone": zwicker_loudness_metric,
    "phon": zwicker_loudness_level,
}
