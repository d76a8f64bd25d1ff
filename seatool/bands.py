"""Frequency bands (IEC 61260-1) and frequency weighting (IEC 61672-1).

This module holds the one definition of band edges used everywhere in seatool:
the base-10 fractional-octave bands of IEC 61260-1:2014. The :class:`BandAxis`
stores exact mid-band frequencies and edges in hertz and keeps the nominal
(ISO 266 preferred-number) labels for display only.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field
from typing import Literal

import numpy as np
import numpy.typing as npt

__all__ = [
    "OCTAVE_RATIO",
    "BandAxis",
    "BandError",
    "a_weighting",
    "band_index",
    "c_weighting",
    "exact_mid_frequency",
]

#: Octave frequency ratio, base 10: G = 10^(3/10) [IEC 61260-1:2014, clause 5.2].
OCTAVE_RATIO: float = 10.0**0.3

#: Reference frequency f_r = 1000 Hz [IEC 61260-1:2014, clause 5.3].
REFERENCE_FREQUENCY: float = 1000.0

BandSpacing = Literal["third-octave", "octave"]

# Nominal mid-band frequencies, 1/3-octave bands 20 Hz - 20 kHz (band index x = -17 .. 13),
# IEC 61260-1:2014 Annex E / ISO 266 preferred numbers. These are labels only; all arithmetic
# uses the exact base-10 values.
_NOMINAL_THIRD = (
    20,
    25,
    31.5,
    40,
    50,
    63,
    80,
    100,
    125,
    160,
    200,
    250,
    315,
    400,
    500,
    630,
    800,
    1000,
    1250,
    1600,
    2000,
    2500,
    3150,
    4000,
    5000,
    6300,
    8000,
    10000,
    12500,
    16000,
    20000,
)
_X_MIN = -17  # index of the 20 Hz band


class BandError(ValueError):
    """A band range or band list that cannot be built."""


def _fraction(spacing: BandSpacing) -> int:
    if spacing == "third-octave":
        return 3
    if spacing == "octave":
        return 1
    raise BandError(f"unknown band spacing {spacing!r}; use 'third-octave' or 'octave'")


def exact_mid_frequency(
    x: npt.ArrayLike, spacing: BandSpacing = "third-octave"
) -> npt.NDArray[np.float64]:
    """Exact base-10 mid-band frequency of band index ``x``.

    Parameters
    ----------
    x : int or array_like of int
        Band index; ``x = 0`` is the 1000 Hz band.
    spacing : {'third-octave', 'octave'}
        Bandwidth designator (b = 3 or b = 1).

    Returns
    -------
    numpy.ndarray
        Mid-band frequency f_m [Hz].

    Notes
    -----
    For odd b, :math:`f_m = f_r G^{x/b}` with :math:`G = 10^{3/10}` and
    :math:`f_r = 1000` Hz (IEC 61260-1:2014, eq. 2).

    References
    ----------
    IEC 61260-1:2014, Electroacoustics - Octave-band and fractional-octave-band filters -
    Part 1: Specifications, clause 5.4, eq. (2).
    """
    b = _fraction(spacing)
    return REFERENCE_FREQUENCY * OCTAVE_RATIO ** (np.asarray(x, dtype=float) / b)


def band_index(nominal_hz: float, spacing: BandSpacing = "third-octave") -> int:
    """Band index x of a nominal mid-band frequency (e.g. 31.5 -> -15).

    Accepts nominal labels (ISO 266) and exact values: the nearest band is taken if the
    frequency lies within 2 % of its exact centre (nominal labels differ from the exact
    base-10 values by at most about 1 %), otherwise :class:`BandError` is raised.
    """
    b = _fraction(spacing)
    if not np.isfinite(nominal_hz) or nominal_hz <= 0:
        raise BandError(f"band frequency must be a positive number, got {nominal_hz!r}")
    xf = b * np.log(nominal_hz / REFERENCE_FREQUENCY) / np.log(OCTAVE_RATIO)
    x = round(float(xf))
    if abs(nominal_hz / float(exact_mid_frequency(x, spacing)) - 1.0) > 0.02:
        raise BandError(f"{nominal_hz:g} Hz is not the centre of a {spacing} band")
    return x


def _nominal_label(x: int, b: int) -> float:
    x3 = x * (3 // b)
    i = x3 - _X_MIN
    if 0 <= i < len(_NOMINAL_THIRD):
        return float(_NOMINAL_THIRD[i])
    # Outside 20 Hz - 20 kHz: round the exact value to 3 significant figures.
    fm = float(exact_mid_frequency(x, "octave" if b == 1 else "third-octave"))
    return float(f"{fm:.3g}")


@dataclass(frozen=True, eq=False)
class BandAxis:
    """A contiguous set of fractional-octave bands (IEC 61260-1, base 10).

    Build it with :meth:`from_range`; arithmetic uses :attr:`centre` (exact),
    :attr:`lower`, :attr:`upper` and :attr:`width`; :attr:`nominal` is for display.

    Attributes
    ----------
    spacing : {'third-octave', 'octave'}
    indices : numpy.ndarray of int
        Band indices x (x = 0 is the 1 kHz band).
    """

    spacing: BandSpacing
    indices: npt.NDArray[np.int64]
    centre: npt.NDArray[np.float64] = field(init=False, repr=False)
    lower: npt.NDArray[np.float64] = field(init=False, repr=False)
    upper: npt.NDArray[np.float64] = field(init=False, repr=False)
    nominal: npt.NDArray[np.float64] = field(init=False, repr=False)

    def __post_init__(self) -> None:
        b = _fraction(self.spacing)
        idx = np.asarray(self.indices, dtype=np.int64)
        if idx.ndim != 1 or idx.size == 0:
            raise BandError("a band axis needs at least one band")
        if np.any(np.diff(idx) != 1):
            raise BandError("bands of an axis must be contiguous and increasing")
        centre = exact_mid_frequency(idx, self.spacing)
        half = OCTAVE_RATIO ** (1.0 / (2 * b))
        for name, value in (
            ("indices", idx),
            ("centre", centre),
            # Band edges f1 = f_m G^(-1/2b), f2 = f_m G^(1/2b) [IEC 61260-1:2014, eqs. 5-6].
            ("lower", centre / half),
            ("upper", centre * half),
            ("nominal", np.array([_nominal_label(int(x), b) for x in idx])),
        ):
            value.setflags(write=False)
            object.__setattr__(self, name, value)

    @classmethod
    def from_range(
        cls, lowest_hz: float, highest_hz: float, spacing: BandSpacing = "third-octave"
    ) -> BandAxis:
        """Bands whose nominal centres run from ``lowest_hz`` to ``highest_hz`` inclusive."""
        lo = band_index(lowest_hz, spacing)
        hi = band_index(highest_hz, spacing)
        if hi < lo:
            raise BandError(
                f"empty band range: lowest band {lowest_hz:g} Hz is above highest {highest_hz:g} Hz"
            )
        return cls(spacing, np.arange(lo, hi + 1, dtype=np.int64))

    @property
    def width(self) -> npt.NDArray[np.float64]:
        """Bandwidth f2 - f1 [Hz]."""
        return self.upper - self.lower

    @property
    def omega(self) -> npt.NDArray[np.float64]:
        """Angular mid-band frequency 2 pi f_m [rad/s]."""
        return 2.0 * np.pi * self.centre

    def __len__(self) -> int:
        return int(self.indices.size)

    def __eq__(self, other: object) -> bool:
        if not isinstance(other, BandAxis):
            return NotImplemented
        return self.spacing == other.spacing and np.array_equal(self.indices, other.indices)

    def __hash__(self) -> int:
        return hash((self.spacing, tuple(self.indices.tolist())))

    def __repr__(self) -> str:
        return f"BandAxis({self.spacing}, {len(self)} bands, {self.label(0)} - {self.label(-1)})"

    def label(self, i: int) -> str:
        """Display label of band ``i``, e.g. '31.5 Hz' or '1.25 kHz'."""
        v = float(self.nominal[i])
        return f"{v / 1000:g} kHz" if v >= 1000 else f"{v:g} Hz"

    def position(self, nominal_hz: Sequence[float]) -> npt.NDArray[np.int64]:
        """Positions in this axis of the bands with the given nominal centres.

        Raises :class:`BandError` naming the first frequency not on the axis.
        """
        out = np.empty(len(nominal_hz), dtype=np.int64)
        for k, f in enumerate(nominal_hz):
            x = band_index(float(f), self.spacing)
            j = x - int(self.indices[0])
            if not 0 <= j < len(self):
                raise BandError(f"{f:g} Hz is not in the model's band range {self!r}")
            out[k] = j
        return out


def a_weighting(f: npt.ArrayLike) -> npt.NDArray[np.float64]:
    """A-weighting [dB] at frequency ``f`` [Hz].

    Notes
    -----
    IEC 61672-1:2013, eq. (E.6):

    .. math:: A(f) = 20\\lg\\frac{f_4^2 f^4}{(f^2+f_1^2)\\sqrt{f^2+f_2^2}\\sqrt{f^2+f_3^2}
              (f^2+f_4^2)} - A_{1000}

    with f1 = 20.598997 Hz, f2 = 107.65265 Hz, f3 = 737.86223 Hz, f4 = 12194.217 Hz,
    A_1000 = -2.000 dB (IEC 61672-1:2013, Annex E, eqs. E.1-E.6).

    References
    ----------
    IEC 61672-1:2013, Electroacoustics - Sound level meters - Part 1: Specifications,
    Annex E.
    """
    f = np.asarray(f, dtype=float)
    f1, f2, f3, f4 = 20.598997, 107.65265, 737.86223, 12194.217
    f_sq = f * f
    ra = (f4**2 * f_sq**2) / (
        (f_sq + f1**2) * np.sqrt(f_sq + f2**2) * np.sqrt(f_sq + f3**2) * (f_sq + f4**2)
    )
    with np.errstate(divide="ignore"):
        return 20.0 * np.log10(ra) + 2.000


def c_weighting(f: npt.ArrayLike) -> npt.NDArray[np.float64]:
    """C-weighting [dB] at frequency ``f`` [Hz].

    Notes
    -----
    IEC 61672-1:2013, eq. (E.1):

    .. math:: C(f) = 20\\lg\\frac{f_4^2 f^2}{(f^2+f_1^2)(f^2+f_4^2)} - C_{1000}

    with the same pole frequencies f1 = 20.598997 Hz and f4 = 12194.217 Hz as the
    A-weighting and C_1000 = -0.062 dB, the value that makes C(1 kHz) = 0 dB
    (IEC 61672-1:2013, Annex E, eqs. E.1-E.3).

    References
    ----------
    IEC 61672-1:2013, Electroacoustics - Sound level meters - Part 1: Specifications,
    Annex E, eq. (E.1); nominal values in Table 3.
    """
    f = np.asarray(f, dtype=float)
    f1, f4 = 20.598997, 12194.217
    f_sq = f * f
    rc = (f4**2 * f_sq) / ((f_sq + f1**2) * (f_sq + f4**2))
    with np.errstate(divide="ignore"):
        return 20.0 * np.log10(rc) + 0.062
