"""Radiation of forced (non-resonant) bending waves of a flat baffled rectangular panel.

The forced-wave radiation factor of EN ISO 12354-1 Annex B, which enters the non-resonant
transmission of :func:`seatool.physics.transmission.transmission_nonresonant`. The
radiation of the panel's own (free, resonant) bending waves is in
:mod:`seatool.physics.radiation`.
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

from ._checks import positive as _positive
from .air import AIR_SOUND_SPEED

__all__ = ["forced_radiation_efficiency_en12354"]

FloatArray = npt.NDArray[np.float64]


def forced_radiation_efficiency_en12354(
    f: npt.ArrayLike,
    l1: npt.ArrayLike,
    l2: npt.ArrayLike,
    *,
    c0: float = AIR_SOUND_SPEED,
) -> FloatArray:
    """Radiation factor for forced (non-resonant) bending waves, EN ISO 12354-1 Annex B.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    l1, l2 : float or array_like
        Panel side lengths [m] (order does not matter).
    c0 : float, optional
        Speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        Forced-wave radiation factor ``sigma_f`` [-], at most 2.

    Notes
    -----
    With ``l1 >= l2`` and ``k0 = 2 pi f / c0`` (EN 12354-1:2000 Annex B, from memory)::

        Lambda = -0.964 - (0.5 + l2/(pi l1)) ln(l2/l1) + 5 l2/(2 pi l1) - 1/(4 pi l1 l2 k0^2)
        sigma_f = 0.5 (ln(k0 sqrt(l1 l2)) - Lambda),   sigma_f <= 2

    Validity: ``k0 sqrt(l1 l2) >~ 1``. Below ``k0 sqrt(l1 l2) ~ 0.4`` the last term of
    ``Lambda`` makes ``sigma_f`` rise again as ``f -> 0``, which is not physical (a small
    panel radiates forced waves like a piston, ``sigma -> 0``); such panels are outside the
    range of SEA anyway.

    The finite-panel forced radiation follows Sewell (1970); it enters the non-resonant
    transmission coefficient of :func:`seatool.physics.transmission.transmission_nonresonant`.

    References
    ----------
    .. [1] EN ISO 12354-1:2017, Annex B (formerly EN 12354-1:2000 Annex B).
    .. [2] Sewell, E.C. (1970). "Transmission of reverberant sound through a single-leaf
       partition surrounded by an infinite rigid baffle." J. Sound Vib. 12(1), 21-32.
       doi:10.1016/0022-460X(70)90046-5
    """
    f_a = _positive("f", f)
    a = _positive("l1", l1)
    b = _positive("l2", l2)
    _positive("c0", c0)
    f_a, a, b = np.broadcast_arrays(f_a, a, b)
    long_ = np.maximum(a, b)
    short = np.minimum(a, b)
    k0 = 2.0 * np.pi * f_a / c0
    lam = (
        -0.964
        - (0.5 + short / (np.pi * long_)) * np.log(short / long_)
        + 5.0 * short / (2.0 * np.pi * long_)
        - 1.0 / (4.0 * np.pi * long_ * short * k0**2)
    )
    sigma_f = 0.5 * (np.log(k0 * np.sqrt(long_ * short)) - lam)
    out: FloatArray = np.minimum(sigma_f, 2.0)
    return out
