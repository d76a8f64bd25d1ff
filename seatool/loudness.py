"""Stationary loudness from 1/3-octave band levels: the Zwicker method of ISO 532-1:2017.

The procedure (ISO 532-1:2017, clause 5 and Annex A, the method of DIN 45631:1991 and of
Zwicker, Fastl, Widmann, Kurakata, Kuwano, Namba 1991) takes the 28 one-third-octave band
levels from 25 Hz to 12.5 kHz and

1. corrects the 11 bands from 25 Hz to 250 Hz for the equal-loudness contours (table
   ``_DLL`` chosen by level range ``_RAP``) and sums them into the first three critical
   bands (25-80 Hz, 100-160 Hz, 200-250 Hz);
2. applies the transmission of the outer/middle ear (``_A0``), the diffuse-field
   correction (``_DDF``, diffuse field only) and the adaptation of 1/3-octave to
   critical-band levels (``_DCB``) to the 20 critical-band levels, and turns each level
   above the threshold in quiet (``_LTQ``) into a core loudness

   .. math:: N'_i = 0.0635\\cdot 10^{0.025 L_{TQ,i}}
             \\left[\\left(1 - s + s\\,10^{(L_{E,i} - L_{TQ,i})/10}\\right)^{0.25} - 1\\right],
             \\quad s = 0.25;

3. corrects the lowest critical band for the slope of the threshold
   (factor ``0.4 + 0.32 N'^{0.2}``, at most 1);
4. attaches the upper slopes of masking (steepness ``_USL`` by specific-loudness range
   ``_RNS`` and critical band) and integrates the specific loudness over the critical-band
   rate up to 24 Bark (band edges ``_ZUP``) to the total loudness N [sone].

The tables below are those of ISO 532-1:2017, Annex A (the same values as the program of
Zwicker et al. 1991). The numbers follow that program listing (keyed in from memory of it;
the tests compare the whole procedure with an independent implementation and the published
example).

This module also returns the derivative dN/dL of the total loudness with respect to each
band level, by forward-mode differentiation of the same steps with the discrete choices
(level range of the low-frequency correction, specific-loudness range of the slope, the
critical band where a slope ends) held fixed. N is piecewise smooth in the band levels: the
low-frequency correction changes in steps of 1-3 dB where a band level crosses a range
limit, so N jumps there, and its derivative is the one-sided value of the current range.

References
----------
ISO 532-1:2017, Acoustics - Methods for calculating loudness - Part 1: Zwicker method,
clause 5 and Annex A.

Zwicker, E., Fastl, H., Widmann, U., Kurakata, K., Kuwano, S., Namba, S. (1991). Program for
calculating loudness according to DIN 45631 (ISO 532B). J. Acoust. Soc. Jpn. (E) 12(1), 39-42.
"""

from __future__ import annotations

from typing import Literal

import numpy as np
import numpy.typing as npt

__all__ = [
    "LOUDNESS_BANDS_HZ",
    "Field",
    "loudness_level",
    "loudness_level_derivative",
    "zwicker_loudness",
]

Array = npt.NDArray[np.float64]
Field = Literal["free", "diffuse"]

#: Nominal centres of the 28 one-third-octave bands the method uses, 25 Hz - 12.5 kHz
#: (ISO 532-1:2017, clause 5.1).
LOUDNESS_BANDS_HZ: tuple[float, ...] = (
    25, 31.5, 40, 50, 63, 80, 100, 125, 160, 200, 250, 315, 400, 500,
    630, 800, 1000, 1250, 1600, 2000, 2500, 3150, 4000, 5000, 6300, 8000, 10000, 12500,
)  # fmt: skip

# -- tables of ISO 532-1:2017, Annex A (Zwicker et al. 1991) -------------------------------

#: Upper limits of the level ranges for the low-frequency correction [dB].
_RAP = np.array([45.0, 55.0, 65.0, 71.0, 80.0, 90.0, 100.0, 120.0])

#: Reduction [dB] of the 1/3-octave levels 25 Hz - 250 Hz (columns) within each of the
#: eight level ranges of _RAP (rows), after the equal-loudness contours.
_DLL = np.array(
    [
        [-32, -24, -16, -10, -5, 0, -7, -3, 0, -2, 0],
        [-29, -22, -15, -10, -4, 0, -7, -2, 0, -2, 0],
        [-27, -19, -14, -9, -4, 0, -6, -2, 0, -2, 0],
        [-25, -17, -12, -9, -3, 0, -5, -2, 0, -2, 0],
        [-23, -16, -11, -7, -3, 0, -4, -1, 0, -1, 0],
        [-20, -14, -10, -6, -3, 0, -4, -1, 0, -1, 0],
        [-18, -12, -9, -6, -2, 0, -3, -1, 0, -1, 0],
        [-15, -10, -8, -4, -2, 0, -3, -1, 0, -1, 0],
    ],
    dtype=float,
)

#: Critical-band level at the threshold in quiet [dB], 20 critical bands.
_LTQ = np.array([30, 18, 12, 8, 7, 6, 5, 4, 3, 3, 3, 3, 3, 3, 3, 3, 3, 3, 3, 3], dtype=float)

#: Transmission of the outer and middle ear [dB].
_A0 = np.array(
    [0, 0, 0, 0, 0, 0, 0, 0, 0, 0, -0.5, -1.6, -3.2, -5.4, -5.6, -4, -1.5, 2, 5, 12],
    dtype=float,
)

#: Level difference diffuse field minus free field [dB].
_DDF = np.array(
    [0, 0, 0.5, 0.9, 1.2, 1.6, 2.3, 2.8, 3, 2, 0, -1.4, -2, -1.9, -1, 0.5, 3, 4, 4.3, 4],
    dtype=float,
)

#: Adaptation of 1/3-octave band levels to critical-band levels [dB].
_DCB = np.array(
    [
        -0.25, -0.6, -0.8, -0.8, -0.5, 0, 0.5, 1.1, 1.5, 1.7,
        1.8, 1.8, 1.7, 1.6, 1.4, 1.2, 0.8, 0.5, 0, -0.5,
    ],
)  # fmt: skip

#: Upper limits of the 21 approximated critical bands [Bark].
_ZUP = np.array(
    [
        0.9, 1.8, 2.8, 3.5, 4.4, 5.4, 6.6, 7.9, 9.2, 10.6, 12.3,
        13.8, 15.2, 16.7, 18.1, 19.3, 20.6, 21.8, 22.7, 23.6, 24.0,
    ],
)  # fmt: skip

#: Ranges of specific loudness [sone/Bark] for the steepness of the upper slopes.
_RNS = np.array(
    [
        21.5, 18, 15.1, 11.5, 9, 6.1, 4.4, 3.1, 2.13, 1.36,
        0.82, 0.42, 0.30, 0.22, 0.15, 0.10, 0.035, 0,
    ],
)  # fmt: skip

#: Steepness of the upper slopes [sone/Bark per Bark] for the ranges _RNS (rows) and the
#: critical band where the slope runs (columns; the last column holds for band 8 and above).
_USL = np.array(
    [
        [13, 8.2, 6.3, 5.5, 5.5, 5.5, 5.5, 5.5],
        [9, 7.5, 6, 5.1, 4.5, 4.5, 4.5, 4.5],
        [7.8, 6.7, 5.6, 4.9, 4.4, 3.9, 3.9, 3.9],
        [6.2, 5.4, 4.6, 4.0, 3.5, 3.2, 3.2, 3.2],
        [4.5, 3.8, 3.6, 3.2, 2.9, 2.7, 2.7, 2.7],
        [3.7, 3.0, 2.8, 2.35, 2.2, 2.2, 2.2, 2.2],
        [2.9, 2.3, 2.1, 1.9, 1.8, 1.7, 1.7, 1.7],
        [2.4, 1.7, 1.5, 1.35, 1.3, 1.3, 1.3, 1.3],
        [1.95, 1.45, 1.3, 1.15, 1.1, 1.1, 1.1, 1.1],
        [1.5, 1.2, 0.94, 0.86, 0.82, 0.82, 0.82, 0.82],
        [0.72, 0.67, 0.64, 0.63, 0.62, 0.62, 0.62, 0.62],
        [0.59, 0.53, 0.51, 0.50, 0.42, 0.42, 0.42, 0.42],
        [0.40, 0.33, 0.26, 0.24, 0.24, 0.22, 0.22, 0.22],
        [0.27, 0.21, 0.20, 0.18, 0.17, 0.17, 0.17, 0.17],
        [0.16, 0.15, 0.14, 0.12, 0.11, 0.11, 0.11, 0.11],
        [0.12, 0.11, 0.10, 0.08, 0.08, 0.08, 0.08, 0.08],
        [0.09, 0.08, 0.07, 0.06, 0.06, 0.06, 0.06, 0.05],
        [0.06, 0.05, 0.03, 0.02, 0.02, 0.02, 0.02, 0.02],
    ]
)

#: The low-frequency correction is tabulated for band levels up to this value [dB]
#: (ISO 532-1:2017, Annex A: the last range of _RAP ends at 120 dB).
LOW_FREQUENCY_LIMIT_DB: float = 120.0

_NB = len(LOUDNESS_BANDS_HZ)
_LN10_10 = np.log(10.0) / 10.0


def _core_loudness(levels: Array, field: Field) -> tuple[Array, Array]:
    """Core loudness N'_i (S, 21) [sone/Bark] and its derivative (S, 21, 28) w.r.t. levels."""
    s_count = levels.shape[0]
    # 1. Equal-loudness correction of the bands 25 - 250 Hz: the first range j with
    #    L <= RAP_j - DLL_j (the last range above that).
    low = levels[:, :11]
    above = low[:, None, :] > (_RAP[:, None] - _DLL)[None, :, :]  # (S, 8, 11)
    j = np.minimum(np.sum(np.cumprod(above, axis=1), axis=1), 7)  # (S, 11)
    xp = low + _DLL[j, np.arange(11)]
    with np.errstate(over="ignore"):
        ti = 10.0 ** (xp / 10.0)
    groups = (slice(0, 6), slice(6, 9), slice(9, 11))
    le = np.empty((s_count, 20))
    dle = np.zeros((s_count, 20, _NB))
    for k, g in enumerate(groups):
        gi = np.sum(ti[:, g], axis=1)
        with np.errstate(divide="ignore"):
            le[:, k] = 10.0 * np.log10(gi)
        pos = gi > 0
        share = np.divide(ti[:, g], gi[:, None], out=np.zeros_like(ti[:, g]), where=pos[:, None])
        dle[:, k, g] = share
    # Critical bands 4..20 are the 1/3-octave bands 315 Hz - 12.5 kHz.
    le[:, 3:] = levels[:, 11:]
    dle[:, np.arange(3, 20), np.arange(11, 28)] = 1.0
    # 2. Ear transmission, diffuse field, 1/3-octave to critical band, core loudness.
    le = le - _A0
    if field == "diffuse":
        le = le + _DDF
    audible = le > _LTQ
    le = np.where(audible, le - _DCB, le)
    s = 0.25
    mp1 = 0.0635 * 10.0 ** (0.025 * _LTQ)
    with np.errstate(over="ignore", invalid="ignore"):
        e = 10.0 ** (0.1 * (le - _LTQ))
        base = 1.0 - s + s * e
        nm = mp1 * (base**0.25 - 1.0)
        dnm_dle = mp1 * 0.25 * base ** (-0.75) * s * e * _LN10_10
    on = audible & (nm > 0)
    nm = np.where(on, nm, 0.0)
    dnm_dle = np.where(on, dnm_dle, 0.0)
    dnm = dnm_dle[:, :, None] * dle
    # 3. Lowest critical band: threshold slope correction, factor at most 1.
    n0 = nm[:, 0]
    korr = 0.4 + 0.32 * n0**0.2
    use = korr < 1.0
    with np.errstate(divide="ignore", invalid="ignore"):
        dfac = np.where(use & (n0 > 0), 0.4 + 1.2 * 0.32 * n0**0.2, 1.0)
    dnm[:, 0, :] *= np.where(use, dfac, 1.0)[:, None]
    nm[:, 0] = np.where(use, n0 * korr, n0)
    # The 21st critical band (23.6 - 24 Bark) carries no core loudness.
    nm = np.concatenate([nm, np.zeros((s_count, 1))], axis=1)
    dnm = np.concatenate([dnm, np.zeros((s_count, 1, _NB))], axis=1)
    return nm, dnm


def _total_loudness(nm: Array, dnm: Array) -> tuple[Array, Array]:
    """Integrate main loudness and upper slopes over 0-24 Bark: N (S,) and dN/dL (S, 28)."""
    s_count = nm.shape[0]
    total = np.zeros(s_count)
    d_total = np.zeros((s_count, _NB))
    n1 = np.zeros(s_count)
    dn1 = np.zeros((s_count, _NB))
    z1 = np.zeros(s_count)
    dz1 = np.zeros((s_count, _NB))
    j = np.zeros(s_count, dtype=np.int64)
    last = len(_RNS) - 1
    for i in range(len(_ZUP)):
        zup = _ZUP[i]
        ig = min(max(i - 1, 0), _USL.shape[1] - 1)
        nmi = nm[:, i]
        dnmi = dnm[:, i, :]
        active = z1 < zup
        while np.any(active):
            masked = active & (n1 > nmi)
            rising = active & ~masked & (n1 < nmi)
            flat = active & ~masked
            # Range of the new plateau: the first range whose lower limit is below it.
            j = np.where(rising, np.minimum(np.sum(_RNS[None, :] >= nmi[:, None], axis=1), last), j)
            # Unmasked: plateau at the core loudness up to the band's upper limit.
            n2 = np.where(flat, nmi, 0.0)
            dn2 = np.where(flat[:, None], dnmi, 0.0)
            z2 = np.where(flat, zup, z1)
            dz2 = np.where(flat[:, None], 0.0, dz1)
            add = np.where(flat, nmi * (zup - z1), 0.0)
            d_add = np.where(flat[:, None], dnmi * (zup - z1)[:, None] - nmi[:, None] * dz1, 0.0)
            # Masked: the upper slope of the band before runs down towards the next range
            # limit or to this band's core loudness.
            if np.any(masked):
                usl = _USL[j, ig]
                floor_is_nm = _RNS[j] < nmi
                m2 = np.maximum(_RNS[j], nmi)
                dm2 = np.where(floor_is_nm[:, None], dnmi, 0.0)
                dz = (n1 - m2) / usl
                ddz = (dn1 - dm2) / usl[:, None]
                zz = z1 + dz
                limited = zz > zup
                dz = np.where(limited, zup - z1, dz)
                ddz = np.where(limited[:, None], -dz1, ddz)
                zz = np.where(limited, zup, zz)
                dzz = np.where(limited[:, None], 0.0, dz1 + ddz)
                m2 = np.where(limited, n1 - dz * usl, m2)
                dm2 = np.where(limited[:, None], dn1 - ddz * usl[:, None], dm2)
                n2 = np.where(masked, m2, n2)
                dn2 = np.where(masked[:, None], dm2, dn2)
                z2 = np.where(masked, zz, z2)
                dz2 = np.where(masked[:, None], dzz, dz2)
                add = np.where(masked, dz * (n1 + m2) / 2.0, add)
                d_add = np.where(
                    masked[:, None],
                    ddz * ((n1 + m2) / 2.0)[:, None] + dz[:, None] * (dn1 + dm2) / 2.0,
                    d_add,
                )
            total += np.where(active, add, 0.0)
            d_total += np.where(active[:, None], d_add, 0.0)
            step = active & (n2 <= _RNS[j])
            j = np.where(step, np.minimum(j + 1, last), j)
            n1 = np.where(active, n2, n1)
            dn1 = np.where(active[:, None], dn2, dn1)
            z1 = np.where(active, z2, z1)
            dz1 = np.where(active[:, None], dz2, dz1)
            active = z1 < zup
    return total, d_total


def zwicker_loudness(
    levels: npt.ArrayLike, *, field: Field = "free"
) -> tuple[npt.NDArray[np.float64], npt.NDArray[np.float64]]:
    """Stationary loudness N [sone] of 1/3-octave band levels, and dN/dL [sone/dB].

    Parameters
    ----------
    levels : array_like, shape (..., 28)
        Sound pressure levels [dB re 20 uPa] of the 1/3-octave bands 25 Hz - 12.5 kHz
        (:data:`LOUDNESS_BANDS_HZ`). ``-inf`` is a band without sound.
    field : {'free', 'diffuse'}
        Free (frontal incidence) or diffuse sound field.

    Returns
    -------
    loudness : numpy.ndarray, shape (...)
        Total loudness N [sone], not rounded (the standard's program rounds to 0.001 sone
        below 16 sone and to 0.01 sone above).
    derivative : numpy.ndarray, shape (..., 28)
        dN/dL_k [sone/dB] with the discrete table choices held fixed (see module notes).

    Notes
    -----
    Core loudness of critical band i (ISO 532-1:2017, Annex A):

    .. math:: N'_i = 0.0635\\cdot 10^{0.025 L_{TQ,i}}\\left[\\left(0.75 + 0.25\\cdot
              10^{(L_{E,i}-L_{TQ,i})/10}\\right)^{0.25} - 1\\right]

    and :math:`N = \\int_0^{24\\,\\mathrm{Bark}} N'(z)\\,dz` over the pattern of core loudness
    plateaus and upper masking slopes. Band levels above 120 dB below 315 Hz are outside
    the tables of the standard; they are computed with the highest level range.

    References
    ----------
    ISO 532-1:2017, Acoustics - Methods for calculating loudness - Part 1: Zwicker method,
    clause 5 and Annex A (its tables, keyed in from the listing of Zwicker et al. 1991).
    Zwicker, E. et al. (1991). Program for calculating loudness according to DIN 45631
    (ISO 532B). J. Acoust. Soc. Jpn. (E) 12(1), 39-42.
    """
    if field not in ("free", "diffuse"):
        raise ValueError(f"field must be 'free' or 'diffuse', got {field!r}")
    lv = np.asarray(levels, dtype=float)
    if lv.shape[-1:] != (_NB,):
        raise ValueError(f"loudness needs {_NB} band levels (25 Hz - 12.5 kHz), got {lv.shape}")
    if np.any(np.isnan(lv)) or np.any(lv == np.inf):
        raise ValueError("band levels must be finite numbers or -inf (no sound)")
    flat = lv.reshape(-1, _NB)
    nm, dnm = _core_loudness(flat, field)
    total, d_total = _total_loudness(nm, dnm)
    return total.reshape(lv.shape[:-1]), d_total.reshape(lv.shape)


def loudness_level(loudness: npt.ArrayLike) -> npt.NDArray[np.float64]:
    """Loudness level L_N [phon] of a loudness N [sone].

    Notes
    -----
    .. math:: L_N = 40 + 33.22\\lg N \\quad (N \\ge 1\\ \\mathrm{sone}), \\qquad
              L_N = 40\\,(N + 0.0005)^{0.35} \\quad (N < 1\\ \\mathrm{sone})

    (the conversion of loudness to loudness level given with the method in ISO 532-1:2017
    and in Zwicker & Fastl, sec. 8.7; equations from memory, clause number not re-read).
    33.22 = 10 / lg 2: loudness doubles for each 10 phon above 40 phon.

    References
    ----------
    ISO 532-1:2017, Acoustics - Methods for calculating loudness - Part 1: Zwicker method.
    Zwicker, E., Fastl, H. (2007). Psychoacoustics: Facts and Models, 3rd ed. Springer,
    sec. 8.7.
    """
    n = np.asarray(loudness, dtype=float)
    with np.errstate(divide="ignore"):
        high = 40.0 + 33.22 * np.log10(np.maximum(n, 1.0))
    return np.where(n >= 1.0, high, 40.0 * (np.maximum(n, 0.0) + 0.0005) ** 0.35)


def loudness_level_derivative(loudness: npt.ArrayLike) -> npt.NDArray[np.float64]:
    """dL_N/dN [phon/sone] of :func:`loudness_level` (same sources)."""
    n = np.asarray(loudness, dtype=float)
    nn = np.maximum(n, 0.0)
    high = 33.22 / (np.log(10.0) * np.maximum(nn, 1.0))
    low = 40.0 * 0.35 * (nn + 0.0005) ** (-0.65)
    return np.where(n >= 1.0, high, low)
