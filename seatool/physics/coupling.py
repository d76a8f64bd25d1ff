"""Coupling loss factors (CLFs) from physical quantities, and the K_ij <-> CLF relation.

All functions are pure and broadcast with numpy over frequency bands. ``eta_ij`` is the CLF
from subsystem i to subsystem j: the net power is ``W_ij = omega (eta_ij E_i - eta_ji E_j)``,
and the pair obeys ``n_i eta_ij = n_j eta_ji`` (modal densities). Complex impedances use the
time convention exp(+j omega t).

Contents
--------
* :func:`clf_radiation` -- panel -> cavity (or exterior sink), resonant radiation, one side.
* :func:`clf_nonresonant` -- cavity -> cavity through a partition, non-resonant path.
* :func:`clf_line_junction` -- plate -> plate (any wave type) across a line junction.
* :func:`clf_aperture` and :func:`aperture_transmission_circular` -- leak through a hole.
* :func:`vibration_reduction_index`, :func:`vibration_reduction_index_from_clf`,
  :func:`clf_from_vibration_reduction_index` -- EN ISO 12354-1 ``K_ij``.

Point connections (rigid and resilient) are in :mod:`seatool.physics.junctions`.
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt
from scipy import special

from ._checks import nonnegative as _nonnegative
from ._checks import positive as _positive
from .air import AIR_DENSITY as _RHO0
from .air import AIR_SOUND_SPEED as _C0

__all__ = [
    "aperture_transmission_circular",
    "clf_aperture",
    "clf_from_vibration_reduction_index",
    "clf_line_junction",
    "clf_nonresonant",
    "clf_radiation",
    "piston_radiation_impedance",
    "vibration_reduction_index",
    "vibration_reduction_index_from_clf",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]

_F_REF = 1000.0


def _omega(f: npt.ArrayLike) -> FloatArray:
    out: FloatArray = 2.0 * np.pi * _positive("f", f)
    return out


# --------------------------------------------------------------------------------------------
# structure <-> fluid, fluid <-> fluid
# --------------------------------------------------------------------------------------------


def clf_radiation(
    f: npt.ArrayLike,
    sigma: npt.ArrayLike,
    m_area: npt.ArrayLike,
    *,
    rho0: float = _RHO0,
    c0: float = _C0,
) -> FloatArray:
    """CLF of a panel radiating resonantly into a cavity or an exterior sink, per side.

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    sigma : float or array_like
        One-sided (band-averaged) radiation efficiency [-], e.g. from
        :func:`seatool.physics.radiation.radiation_efficiency_band`.
    m_area : float or array_like
        Mass per unit area of the panel [kg/m^2].
    rho0, c0 : float, optional
        Fluid density [kg/m^3] and speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        ``eta_pc = rho0 c0 sigma / (omega m'')`` [-].

    Notes
    -----
    From ``W_rad = rho0 c0 S sigma <v^2>`` and ``E_p = m'' S <v^2>``: ``W_rad = omega eta E_p``.
    The reverse CLF follows from reciprocity, ``eta_cp = eta_pc n_p / n_c``. For a panel
    radiating into an anechoic exterior the same value is a loss (sink, no return path).
    A panel between two cavities has one such CLF to each side.

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed. Butterworth-Heinemann, ch. 11 (from memory). ISBN 0-7506-9111-5
    .. [2] Crocker, M.J., Price, A.J. (1969). "Sound transmission using statistical energy
       analysis." J. Sound Vib. 9(3), 469-486. doi:10.1016/0022-460X(69)90185-0
    """
    _positive("rho0", rho0)
    _positive("c0", c0)
    out: FloatArray = (
        rho0 * c0 * _nonnegative("sigma", sigma) / (_omega(f) * _positive("m_area", m_area))
    )
    return out


def clf_nonresonant(
    f: npt.ArrayLike,
    area: npt.ArrayLike,
    tau: npt.ArrayLike,
    volume: npt.ArrayLike,
    *,
    c0: float = _C0,
) -> FloatArray:
    """CLF from a diffuse cavity through a partition or opening of given ``tau``.

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    area : float or array_like
        Partition (or opening) area ``S`` [m^2].
    tau : float or array_like
        Diffuse-field transmission coefficient of the path [-], e.g. the non-resonant
        :func:`seatool.physics.transmission.transmission_nonresonant`.
    volume : float or array_like
        Volume of the source cavity ``V_i`` [m^3].
    c0 : float, optional
        Speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        ``eta_ij = c0 S tau / (4 omega V_i)`` [-].

    Notes
    -----
    The diffuse-field intensity on a wall is ``<p^2>/(4 rho0 c0)`` and the cavity energy is
    ``E = V <p^2>/(rho0 c0^2)``; the transmitted power ``S tau <p^2>/(4 rho0 c0)`` equals
    ``omega eta_ij E_i``. The reverse CLF uses ``V_j``; reciprocity holds because the cavity
    modal density is proportional to ``V``. Use only the non-resonant part of ``tau`` here
    when the partition is also modelled as a resonant subsystem.

    References
    ----------
    .. [1] Crocker, M.J., Price, A.J. (1969). J. Sound Vib. 9(3), 469-486.
    .. [2] Craik, R.J.M. (1996). Sound Transmission through Buildings using Statistical Energy
       Analysis. Gower, ch. 4. ISBN 0-566-07572-5
    """
    _positive("c0", c0)
    out: FloatArray = (
        c0
        * _positive("area", area)
        * _nonnegative("tau", tau)
        / (4.0 * _omega(f) * _positive("volume", volume))
    )
    return out


def clf_aperture(
    f: npt.ArrayLike,
    area: npt.ArrayLike,
    volume: npt.ArrayLike,
    tau: npt.ArrayLike = 1.0,
    *,
    c0: float = _C0,
) -> FloatArray:
    """CLF of a leak (aperture) of area ``S_a`` from a cavity of volume ``V``.

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    area : float or array_like
        Open area ``S_a`` [m^2].
    volume : float or array_like
        Source cavity volume [m^3].
    tau : float or array_like, optional
        Transmission coefficient of the aperture referred to its own area [-]; 1 for a large
        opening (``k a >> 1``), otherwise e.g. :func:`aperture_transmission_circular`.
    c0 : float, optional
        Speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        ``eta = c0 S_a tau / (4 omega V)`` [-].

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed. (from memory). ISBN 0-7506-9111-5
    """
    return clf_nonresonant(f, area, tau, volume, c0=c0)


def piston_radiation_impedance(
    f: npt.ArrayLike, radius: npt.ArrayLike, *, rho0: float = _RHO0, c0: float = _C0
) -> ComplexArray:
    """Specific radiation impedance of a baffled rigid circular piston, one side [Pa s/m].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    radius : float or array_like
        Piston radius [m].
    rho0, c0 : float, optional
        Fluid density [kg/m^3] and speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        ``Z_r = rho0 c0 [1 - J1(2ka)/(ka) + j H1(2ka)/(ka)]`` (exp(+j omega t)), complex.

    Notes
    -----
    ``J1`` Bessel and ``H1`` Struve functions of order one. Small ``ka``:
    ``Z_r ~ rho0 c0 [(ka)^2/2 + j 8 ka/(3 pi)]``, i.e. an end-correction mass of length
    ``8 a/(3 pi)``.

    References
    ----------
    .. [1] Kinsler, L.E., Frey, A.R., Coppens, A.B., Sanders, J.V. (2000). Fundamentals of
       Acoustics, 4th ed. Wiley, sec. 7.5. ISBN 0-471-84789-5
    """
    _positive("rho0", rho0)
    _positive("c0", c0)
    ka = 2.0 * np.pi * _positive("f", f) / c0 * _positive("radius", radius)
    x = 2.0 * ka
    out: ComplexArray = rho0 * c0 * (1.0 - special.j1(x) / ka + 1j * special.struve(1, x) / ka)
    return out


def aperture_transmission_circular(
    f: npt.ArrayLike,
    radius: npt.ArrayLike,
    depth: npt.ArrayLike,
    *,
    rho0: float = _RHO0,
    c0: float = _C0,
) -> FloatArray:
    """Normal-incidence transmission coefficient of a circular hole through a rigid wall.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    radius : float or array_like
        Hole radius ``a`` [m].
    depth : float or array_like
        Wall thickness (length of the hole) ``d`` [m], >= 0.
    rho0, c0 : float, optional
        Fluid density [kg/m^3] and speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        Transmission coefficient referred to the hole area ``pi a^2`` [-]; it can exceed 1 at
        the tube resonances of a deep hole.

    Notes
    -----
    Plane waves in the hole (a tube of length ``d``); each end is a baffled piston with
    radiation impedance ``Z_r`` (:func:`piston_radiation_impedance`), which supplies the end
    corrections; the incident wave drives the entrance with the blocked pressure ``2 p_i``
    through the source impedance ``Z_r``. With ``kd = k d``::

        tau = 4 rho0 c0 Re(Z_r) / | 2 Z_r cos(kd) + j sin(kd) (rho0 c0 + Z_r^2/(rho0 c0)) |^2

    ``tau -> 1`` for ``k a >> 1`` and ``d -> 0``. This is the approach of Wilson & Soroka
    (1965) for a circular aperture in a wall of finite thickness (method as recalled, the
    equation was derived here). Normal incidence only: for a hole much smaller than the
    wavelength the diffuse-field value is about twice this (3 dB), because the blocked
    pressure at a wall in a diffuse field has twice the room mean square while the incident
    intensity is a quarter of it (see docs/theory/coupling.md); not included. Visco-thermal
    losses in the hole are neglected, so the resonance peaks of narrow deep holes
    (``tau`` up to ``~2/(ka)^2``) are overestimated.

    References
    ----------
    .. [1] Wilson, G.P., Soroka, W.W. (1965). "Approximation to the diffraction of sound by a
       circular aperture in a rigid wall of finite thickness." J. Acoust. Soc. Am. 37(2),
       286-297. doi:10.1121/1.1909325
    .. [2] Kinsler, L.E. et al. (2000). Fundamentals of Acoustics, 4th ed., secs. 7.5, 10.
    """
    zr = piston_radiation_impedance(f, radius, rho0=rho0, c0=c0)
    kd = 2.0 * np.pi * _positive("f", f) / c0 * _nonnegative("depth", depth)
    z0 = rho0 * c0
    den = 2.0 * zr * np.cos(kd) + 1j * np.sin(kd) * (z0 + zr**2 / z0)
    out: FloatArray = 4.0 * z0 * zr.real / np.abs(den) ** 2
    return out


# --------------------------------------------------------------------------------------------
# structure <-> structure
# --------------------------------------------------------------------------------------------


def clf_line_junction(
    f: npt.ArrayLike,
    group_speed: npt.ArrayLike,
    length: npt.ArrayLike,
    tau_bar: npt.ArrayLike,
    area: npt.ArrayLike,
) -> FloatArray:
    """CLF across a line junction from the diffuse-field transmission coefficient.

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    group_speed : float or array_like
        Group speed of the incident wave type in the source plate ``c_g,i`` [m/s]
        (bending: ``2 c_B``; in-plane longitudinal or shear: the phase speed).
    length : float or array_like
        Junction length ``L`` [m].
    tau_bar : float or array_like
        Diffuse-field transmission coefficient ``int_0^{pi/2} tau(theta) cos(theta) dtheta``
        [-], e.g. from :func:`seatool.physics.junctions.line_junction_transmission_diffuse`.
    area : float or array_like
        Area of the source plate ``S_i`` [m^2].

    Returns
    -------
    numpy.ndarray
        ``eta_ij = c_g,i L tau_bar_ij / (pi omega S_i)`` [-].

    Notes
    -----
    A diffuse 2-D wave field of energy density ``E/S`` carries ``c_g E L/(pi S)`` per unit
    time onto a line of length ``L`` (cosine-weighted). With the plate modal density
    ``n_i(omega) = S_i k_i / (2 pi c_g,i)``, ``n_i eta_ij = k_i L tau_bar_ij / (2 pi^2 omega)``,
    so SEA reciprocity is equivalent to ``k_i tau_bar_ij = k_j tau_bar_ji``.

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of SEA, 2nd ed., ch. 11
       (from memory). ISBN 0-7506-9111-5
    .. [2] Craik, R.J.M. (1996). Sound Transmission through Buildings using SEA. Gower, ch. 5.
    """
    out: FloatArray = (
        _positive("group_speed", group_speed)
        * _positive("length", length)
        * _nonnegative("tau_bar", tau_bar)
        / (np.pi * _omega(f) * _positive("area", area))
    )
    return out


# --------------------------------------------------------------------------------------------
# vibration reduction index
# --------------------------------------------------------------------------------------------


def vibration_reduction_index(
    tau_ij: npt.ArrayLike,
    f_c_j: npt.ArrayLike,
    *,
    f_ref: float = _F_REF,
) -> FloatArray:
    """Vibration reduction index ``K_ij`` from a bending-wave transmission coefficient [dB].

    Parameters
    ----------
    tau_ij : float or array_like
        Diffuse-field bending-wave transmission coefficient from plate i to plate j [-].
    f_c_j : float or array_like
        Critical frequency of plate j [Hz].
    f_ref : float, optional
        Reference frequency [Hz] (1000 Hz in EN ISO 12354-1).

    Returns
    -------
    numpy.ndarray
        ``K_ij = -10 lg(tau_ij) + 5 lg(f_c,j / f_ref)`` [dB].

    Notes
    -----
    Derived (docs/theory/coupling.md) from the definition of EN ISO 12354-1 /
    Vigran (2008) eqs. 9.41-9.42, ``K_ij = D_v,ij_bar + 10 lg(l_ij / sqrt(a_i a_j))`` with
    ``a_i = 2.2 pi^2 S_i/(c0 T_s,i) sqrt(f_ref/f)``, applied to a two-plate SEA model with
    bending waves, ``c_B = c0 sqrt(f/f_c)``, and the reciprocity
    ``sqrt(f_c,i) tau_ij = sqrt(f_c,j) tau_ji``; the result is symmetric in i and j. The
    relation is also stated in EN ISO 12354-1 (from memory).

    References
    ----------
    .. [1] EN ISO 12354-1:2017, Building acoustics -- Estimation of acoustic performance of
       buildings from the performance of elements -- Part 1, clause on K_ij and Annex E.
    .. [2] Vigran, T.E. (2008). Building Acoustics. Taylor & Francis, eqs. 9.41-9.42.
       ISBN 978-0-415-42853-8
    """
    _positive("f_ref", f_ref)
    out: FloatArray = -10.0 * np.log10(_positive("tau_ij", tau_ij)) + 5.0 * np.log10(
        _positive("f_c_j", f_c_j) / f_ref
    )
    return out


def vibration_reduction_index_from_clf(
    f: npt.ArrayLike,
    eta_ij: npt.ArrayLike,
    area_i: npt.ArrayLike,
    length: npt.ArrayLike,
    f_c_i: npt.ArrayLike,
    f_c_j: npt.ArrayLike,
    *,
    c0: float = _C0,
    f_ref: float = _F_REF,
) -> FloatArray:
    """``K_ij`` [dB] from a bending-wave line-junction CLF ``eta_ij``.

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    eta_ij : float or array_like
        CLF from plate i to plate j [-].
    area_i : float or array_like
        Area of plate i [m^2].
    length : float or array_like
        Junction length ``l_ij`` [m].
    f_c_i, f_c_j : float or array_like
        Critical frequencies of plates i and j [Hz].
    c0 : float, optional
        Speed of sound used in the critical frequencies [m/s].
    f_ref : float, optional
        Reference frequency [Hz].

    Returns
    -------
    numpy.ndarray
        ``K_ij`` [dB].

    Notes
    -----
    ``tau_ij = pi^2 f S_i eta_ij / (c_B,i l_ij)`` with ``c_B,i = c0 sqrt(f/f_c,i)`` (inverse of
    :func:`clf_line_junction` with ``c_g = 2 c_B``), then :func:`vibration_reduction_index`.

    References
    ----------
    .. [1] EN ISO 12354-1:2017 (K_ij definition).
    .. [2] Vigran, T.E. (2008). Building Acoustics, eqs. 9.41-9.42.
    """
    _positive("c0", c0)
    f_a = _positive("f", f)
    c_b = c0 * np.sqrt(f_a / _positive("f_c_i", f_c_i))
    tau = (
        np.pi**2
        * f_a
        * _positive("area_i", area_i)
        * _positive("eta_ij", eta_ij)
        / (c_b * _positive("length", length))
    )
    return vibration_reduction_index(tau, f_c_j, f_ref=f_ref)


def clf_from_vibration_reduction_index(
    f: npt.ArrayLike,
    k_ij: npt.ArrayLike,
    area_i: npt.ArrayLike,
    length: npt.ArrayLike,
    f_c_i: npt.ArrayLike,
    f_c_j: npt.ArrayLike,
    *,
    c0: float = _C0,
    f_ref: float = _F_REF,
) -> FloatArray:
    """Bending-wave line-junction CLF ``eta_ij`` from a vibration reduction index ``K_ij``.

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    k_ij : float or array_like
        Vibration reduction index [dB] (e.g. EN ISO 12354-1 Annex E or measured).
    area_i : float or array_like
        Area of the source plate i [m^2].
    length : float or array_like
        Junction length [m].
    f_c_i, f_c_j : float or array_like
        Critical frequencies of plates i and j [Hz].
    c0 : float, optional
        Speed of sound [m/s].
    f_ref : float, optional
        Reference frequency [Hz].

    Returns
    -------
    numpy.ndarray
        ``eta_ij = c_B,i l_ij tau_ij / (pi^2 f S_i)``,
        ``tau_ij = 10^(-(K_ij - 5 lg(f_c,j/f_ref))/10)`` [-].

    References
    ----------
    .. [1] EN ISO 12354-1:2017 (K_ij definition).
    .. [2] Vigran, T.E. (2008). Building Acoustics, eqs. 9.41-9.42.
    """
    _positive("c0", c0)
    _positive("f_ref", f_ref)
    k = np.asarray(k_ij, dtype=np.float64)
    if np.any(~np.isfinite(k)):
        msg = f"k_ij must be finite, got {k_ij!r}"
        raise ValueError(msg)
    f_a = _positive("f", f)
    tau = 10.0 ** (-(k - 5.0 * np.log10(_positive("f_c_j", f_c_j) / f_ref)) / 10.0)
    c_b = c0 * np.sqrt(f_a / _positive("f_c_i", f_c_i))
    out: FloatArray = (
        c_b * _positive("length", length) * tau / (np.pi**2 * f_a * _positive("area_i", area_i))
    )
    return out
