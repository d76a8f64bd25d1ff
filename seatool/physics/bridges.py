"""Structure-borne bridges across a trim: fixings (points) and edges (lines).

A trim's insertion loss from the transfer-matrix method (:mod:`seatool.physics.tmm_transmission`)
assumes a laterally uniform build-up. An installed trim is also held by fixings and along its
edges; each such bridge forces the trim's cover with the base panel's motion and the cover
radiates. This module gives the power of those bridges relative to the bare base and the
insertion loss of trim and bridges in parallel.
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

from ._checks import nonnegative as _nonnegative
from ._checks import positive as _positive
from .air import AIR_SOUND_SPEED

__all__ = [
    "bridged_insertion_loss",
    "line_bridge_power_ratio",
    "point_bridge_power_ratio",
]

FloatArray = npt.NDArray[np.float64]


def _stiffness(name: str, value: npt.ArrayLike) -> FloatArray:
    """A stiffness > 0 (``inf``: rigid) as a float array; ValueError otherwise."""
    arr = np.asarray(value, dtype=np.float64)
    if np.any(np.isnan(arr)) or np.any(arr <= 0.0):
        msg = f"{name} must be > 0 (inf for a rigid bridge), got {value!r}"
        raise ValueError(msg)
    return arr


def _spring_mobility(
    omega: FloatArray, stiffness: FloatArray, loss_factor: float
) -> npt.NDArray[np.complex128]:
    """j omega / (k (1 + j eta)), zero for a rigid bridge (k = inf)."""
    rigid = np.isinf(stiffness)
    k = np.where(rigid, 1.0, stiffness) * (1.0 + 1j * loss_factor)
    out: npt.NDArray[np.complex128] = np.where(rigid, 0.0, 1j * omega / k)
    return out


def point_bridge_power_ratio(
    f: npt.ArrayLike,
    per_area: npt.ArrayLike,
    stiffness: npt.ArrayLike,
    cover_mass_per_area: npt.ArrayLike,
    *,
    cover_bending_stiffness: npt.ArrayLike = 0.0,
    footprint_area: npt.ArrayLike = 0.0,
    loss_factor: float = 0.1,
    c0: float = AIR_SOUND_SPEED,
) -> FloatArray:
    """Power radiated by a trim cover through point fixings, relative to the bare base.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    per_area : float or array_like
        Number of fixings per area of the panel n [1/m^2] (1/e^2 for a square spacing e).
    stiffness : float or array_like
        Stiffness of one fixing between base and cover k [N/m]; ``inf`` for a rigid one.
    cover_mass_per_area : float or array_like
        Mass per area of the trim's cover m2 [kg/m^2].
    cover_bending_stiffness : float or array_like, optional
        Bending stiffness of the cover D2 [N m] (0 for a limp heavy layer).
    footprint_area : float or array_like, optional
        Area of the cover moved with the fixing's head A [m^2].
    loss_factor : float, optional
        Loss factor eta of the fixing's stiffness, k (1 + j eta) (default 0.1, within the
        0.05-0.2 usual for elastomers; common practice, from memory).
    c0 : float, optional
        Speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        r = n |T|^2 / (2 pi c0^2 m2^2) [-]: the power the covers radiate through the fixings
        over the power rho0 c0 S <v1^2> of the bare base at the same mean-square velocity v1
        (unit radiation efficiency).

    Notes
    -----
    The force through a fixing driven by the base velocity v1 is F = T v1 with
    T = 1 / (j omega / (k (1 + j eta)) + 1 / Z2), the fixing's spring in series with the cover's point
    impedance Z2 = 8 sqrt(D2 m2) + j omega m2 A (infinite plate, Cremer, Heckl & Petersson
    2005, ch. 5; plus the mass of the footprint). The base is taken as much stiffer than
    the cover (an upper bound of the force). Below the cover's coincidence, a point-driven
    plate radiates W = rho0 |F|^2 / (2 pi c0 m2^2), independently of D2 (Cremer, Heckl &
    Petersson 2005, ch. 7; Fahy & Gardonio 2007, ch. 3): the mass-controlled part of the
    wavenumber spectrum, F / (j omega m2), radiates. So
    r = n W / (rho0 c0 v1^2) = n |T|^2 / (2 pi c0^2 m2^2).

    For a rigid fixing on a plate cover (k = inf, A = 0) this is r = 8 n c0^2 / (pi^3 f_c2^2)
    with the cover's critical frequency f_c2: the sound-bridge term of Sharp (1978),
    Delta R = 20 lg(e f_c) - 45 dB for point connections at spacing e (checked in the tests).

    References
    ----------
    .. [1] Sharp, B.H. (1978). "Prediction methods for the sound transmission of building
       elements." Noise Control Eng. 11(2), 53-63 (sound bridges; issue and pages from
       memory).
    .. [2] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 3-540-22696-1, ch. 5 (point impedance of an infinite plate) and ch. 7
       (sound radiated by a point-excited plate) (chapters from memory).
    .. [3] Fahy, F., Gardonio, P. (2007). Sound and Structural Vibration, 2nd ed., Academic
       Press, ISBN 978-0-12-373633-8, ch. 3 (radiation of point-driven plates; chapter from
       memory).
    """
    fr = _positive("f", f)
    n = _nonnegative("per_area", per_area)
    k = _stiffness("stiffness", stiffness)
    m2 = _positive("cover_mass_per_area", cover_mass_per_area)
    d2 = _nonnegative("cover_bending_stiffness", cover_bending_stiffness)
    area = _nonnegative("footprint_area", footprint_area)
    _positive("c0", c0)
    w = 2.0 * np.pi * fr
    z2 = 8.0 * np.sqrt(d2 * m2) + 1j * w * m2 * area
    with np.errstate(divide="ignore", invalid="ignore"):
        t = 1.0 / (_spring_mobility(w, k, loss_factor) + 1.0 / z2)
    t = np.where(np.abs(z2) == 0.0, 0.0, t)
    return np.asarray(n * np.abs(t) ** 2 / (2.0 * np.pi * c0**2 * m2**2), dtype=np.float64)


def line_bridge_power_ratio(
    f: npt.ArrayLike,
    length_per_area: npt.ArrayLike,
    stiffness_per_length: npt.ArrayLike,
    cover_mass_per_area: npt.ArrayLike,
    *,
    cover_bending_stiffness: npt.ArrayLike = 0.0,
    width: npt.ArrayLike = 0.0,
    loss_factor: float = 0.1,
    c0: float = AIR_SOUND_SPEED,
) -> FloatArray:
    """Power radiated by a trim cover through line bridges (edges), relative to the bare base.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    length_per_area : float or array_like
        Bridge length per area of the panel L/S [1/m] (1/b for parallel lines at spacing b;
        perimeter / area for the edges of one trim piece).
    stiffness_per_length : float or array_like
        Stiffness of the bridge per length k' [N/m^2]; ``inf`` for a rigid one.
    cover_mass_per_area : float or array_like
        Mass per area of the trim's cover m2 [kg/m^2].
    cover_bending_stiffness : float or array_like, optional
        Bending stiffness of the cover D2 [N m] (0 for a limp heavy layer).
    width : float or array_like, optional
        Width of the cover strip moved with the bridge w [m].
    loss_factor : float, optional
        Loss factor eta of the bridge's stiffness (default 0.1, as for point fixings).
    c0 : float, optional
        Speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        r = (L/S) |T'|^2 / (2 omega c0 m2^2) [-], relative to rho0 c0 S <v1^2> as in
        :func:`point_bridge_power_ratio`.

    Notes
    -----
    Line force per length F' = T' v1 with T' = 1 / (j omega / k' + 1 / Z2'),
    Z2' = 2 m2 c_B (1 + j) + j omega m2 w: the line impedance of an infinite plate (that of
    an infinite beam of unit width, Cremer, Heckl & Petersson 2005, ch. 5), c_B the cover's
    bending wave speed, plus the strip's mass. Below coincidence the line-driven plate
    radiates from the mass-controlled part of its wavenumber spectrum F' / (j omega m2):
    W' = (1/2 pi) int_{-k0}^{k0} rho0 omega |F'|^2 / (omega^2 m2^2 sqrt(k0^2 - k_x^2)) dk_x
    = rho0 |F'|^2 / (2 omega m2^2) per length (Fahy & Gardonio 2007, ch. 3, wavenumber
    radiation of line-excited plates; integral evaluated here and checked numerically in
    the tests).

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 3-540-22696-1, ch. 5 (line impedance) (chapter from memory).
    .. [2] Fahy, F., Gardonio, P. (2007). Sound and Structural Vibration, 2nd ed., Academic
       Press, ISBN 978-0-12-373633-8, ch. 3 (chapter from memory).
    .. [3] Sharp, B.H. (1978). "Prediction methods for the sound transmission of building
       elements." Noise Control Eng. 11(2), 53-63 (line bridges; from memory).
    """
    fr = _positive("f", f)
    lpa = _nonnegative("length_per_area", length_per_area)
    k = _stiffness("stiffness_per_length", stiffness_per_length)
    m2 = _positive("cover_mass_per_area", cover_mass_per_area)
    d2 = _nonnegative("cover_bending_stiffness", cover_bending_stiffness)
    wd = _nonnegative("width", width)
    _positive("c0", c0)
    w = 2.0 * np.pi * fr
    c_b = np.sqrt(w) * (d2 / m2) ** 0.25
    z2 = 2.0 * m2 * c_b * (1.0 + 1j) + 1j * w * m2 * wd
    with np.errstate(divide="ignore", invalid="ignore"):
        t = 1.0 / (_spring_mobility(w, k, loss_factor) + 1.0 / z2)
    t = np.where(np.abs(z2) == 0.0, 0.0, t)
    return np.asarray(lpa * np.abs(t) ** 2 / (2.0 * w * c0 * m2**2), dtype=np.float64)


def bridged_insertion_loss(
    insertion_loss: npt.ArrayLike, bridge_ratio: npt.ArrayLike
) -> FloatArray:
    """Insertion loss of a trim with its bridges in parallel.

    Parameters
    ----------
    insertion_loss : float or array_like
        Insertion loss of the uniform trim IL [dB] (transfer-matrix method).
    bridge_ratio : float or array_like
        Power through the bridges relative to the bare base r [-]
        (:func:`point_bridge_power_ratio` + :func:`line_bridge_power_ratio`).

    Returns
    -------
    numpy.ndarray
        IL_b = -10 lg(10^(-IL/10) + r) [dB]: the transmitted powers of the two parallel
        paths add (Sharp 1978: a bridged partition transmits through the cavity path and the
        bridges in parallel); IL_b <= -10 lg(r), the ceiling the bridges set.

    References
    ----------
    .. [1] Sharp, B.H. (1978). "Prediction methods for the sound transmission of building
       elements." Noise Control Eng. 11(2), 53-63 (from memory).
    """
    il = np.asarray(insertion_loss, dtype=np.float64)
    r = _nonnegative("bridge_ratio", bridge_ratio)
    return np.asarray(-10.0 * np.log10(10.0 ** (-il / 10.0) + r), dtype=np.float64)
