"""Single-number rating of airborne sound insulation (ISO 717-1): Rw, C and Ctr.

:func:`weighted_sound_reduction_index` rates a sound reduction index (transmission loss)
given in the 16 third-octave bands 100 Hz - 3.15 kHz or the 5 octave bands 125 Hz - 2 kHz
by shifting the reference curve of ISO 717-1 in 1 dB steps; :func:`rating_of_bands` picks
those bands out of a longer band axis.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import numpy.typing as npt

from ..bands import BandAxis
from ..levels import db, db_to_ratio

__all__ = [
    "OCTAVE_BANDS",
    "THIRD_OCTAVE_BANDS",
    "Rating",
    "rating_of_bands",
    "weighted_sound_reduction_index",
]

Array = npt.NDArray[np.float64]

#: Nominal band centres [Hz] of the third-octave rating (ISO 717-1, Table 3).
THIRD_OCTAVE_BANDS = (100, 125, 160, 200, 250, 315, 400, 500, 630, 800, 1000, 1250, 1600,
                      2000, 2500, 3150)  # fmt: skip
#: Nominal band centres [Hz] of the octave rating.
OCTAVE_BANDS = (125, 250, 500, 1000, 2000)

# Reference values [dB] (ISO 717-1, Table 3), spectra No. 1 (C, A-weighted pink noise)
# and No. 2 (Ctr, A-weighted urban traffic noise) [dB] (ISO 717-1, Table 4); from memory.
_REFERENCE = {
    "third-octave": np.array([33, 36, 39, 42, 45, 48, 51, 52, 53, 54, 55, 56, 56, 56, 56, 56.0]),
    "octave": np.array([36, 45, 52, 55, 56.0]),
}
_SPECTRUM_C = {
    "third-octave": np.array(
        [-29, -26, -23, -21, -19, -17, -15, -13, -12, -11, -10, -9, -9, -9, -9, -9.0]
    ),
    "octave": np.array([-21, -14, -8, -5, -4.0]),
}
_SPECTRUM_CTR = {
    "third-octave": np.array(
        [-20, -20, -18, -16, -15, -14, -13, -12, -11, -9, -8, -9, -10, -11, -13, -15.0]
    ),
    "octave": np.array([-14, -10, -7, -4, -6.0]),
}
#: Largest sum of unfavourable deviations [dB]: 32.0 over 16 third-octave bands, 10.0 over
#: 5 octave bands (ISO 717-1, clause 4.4).
_LIMIT = {"third-octave": 32.0, "octave": 10.0}


@dataclass(frozen=True)
class Rating:
    """ISO 717-1 single-number quantities [dB].

    Attributes
    ----------
    rw : int
        Weighted sound reduction index Rw: the shifted reference curve at 500 Hz.
    c, ctr : int
        Spectrum adaptation terms for spectrum No. 1 (pink noise) and No. 2 (traffic).
    unfavourable : float
        Sum of the unfavourable deviations of the curve from the shifted reference [dB].
    """

    rw: int
    c: int
    ctr: int
    unfavourable: float

    def __str__(self) -> str:
        return f"Rw (C; Ctr) = {self.rw} ({self.c}; {self.ctr}) dB"


def weighted_sound_reduction_index(r_db: npt.ArrayLike, *, spacing: str = "third-octave") -> Rating:
    """Rw, C and Ctr of a sound reduction index curve (ISO 717-1).

    Parameters
    ----------
    r_db : array_like (16,) or (5,)
        Sound reduction index [dB] in the bands :data:`THIRD_OCTAVE_BANDS` (``spacing =
        "third-octave"``) or :data:`OCTAVE_BANDS` (``spacing = "octave"``).
    spacing : {"third-octave", "octave"}
        Band width of ``r_db``.

    Returns
    -------
    Rating

    Notes
    -----
    ISO 717-1:2020, clause 4.4: the values are taken to 0.1 dB; the reference curve is
    shifted in steps of 1 dB towards the measured curve until the sum of the unfavourable
    deviations (the curve below the shifted reference) is as large as possible but not
    more than 32.0 dB (16 third-octave bands) or 10.0 dB (5 octave bands); Rw is the
    shifted reference at 500 Hz. Clause 4.5: ``C_j = X_Aj - Rw`` with
    ``X_Aj = -10 lg sum_i 10^((L_ij - R_i)/10)``, rounded to an integer (spectra of
    Table 4).

    References
    ----------
    .. [1] ISO 717-1:2020, Acoustics -- Rating of sound insulation in buildings and of
       building elements -- Part 1: Airborne sound insulation. Clauses 4.4, 4.5, Tables 3
       and 4 (values from memory).
    """
    if spacing not in _REFERENCE:
        msg = f"spacing must be 'third-octave' or 'octave', got {spacing!r}"
        raise ValueError(msg)
    ref = _REFERENCE[spacing]
    r = np.asarray(r_db, dtype=np.float64)
    if r.shape != ref.shape or not np.all(np.isfinite(r)):
        msg = f"r_db must hold {ref.size} finite values ({spacing} bands), got shape {r.shape}"
        raise ValueError(msg)
    r = np.round(r, 1)
    limit = _LIMIT[spacing]
    # the largest shift whose unfavourable deviations stay within the limit; the sum only
    # grows with the shift, so start where it is zero and step up
    shift = int(np.floor(np.min(r - ref)))
    while np.sum(np.maximum(ref + shift + 1 - r, 0.0)) <= limit + 1e-9:
        shift += 1
    unfavourable = float(np.sum(np.maximum(ref + shift - r, 0.0)))
    rw = 52 + shift
    terms = []
    for spectrum in (_SPECTRUM_C[spacing], _SPECTRUM_CTR[spacing]):
        x_a = -db(np.sum(db_to_ratio(spectrum - r)))
        terms.append(int(np.round(x_a - rw)))
    return Rating(rw=rw, c=terms[0], ctr=terms[1], unfavourable=round(unfavourable, 1))


def rating_of_bands(bands: BandAxis, r_db: npt.ArrayLike) -> Rating | None:
    """The ISO 717-1 rating of ``r_db`` on ``bands``, or None if a rating band is missing."""
    wanted = THIRD_OCTAVE_BANDS if bands.spacing == "third-octave" else OCTAVE_BANDS
    nominal = [float(x) for x in bands.nominal]
    if not all(float(b) in nominal for b in wanted):
        return None
    r = np.asarray(r_db, dtype=np.float64)
    pick = [nominal.index(float(b)) for b in wanted]
    return weighted_sound_reduction_index(r[pick], spacing=str(bands.spacing))
