"""Mass law: sound transmission through a limp panel between two fluid half-spaces.

:func:`transmission_mass_law_normal`, :func:`transmission_mass_law_oblique`,
:func:`transmission_mass_law_field` (limited angle, default 0-78 deg) and
:func:`transmission_mass_law_random` (0-90 deg). All functions are pure, broadcast with numpy
over frequency bands and return the transmission coefficient ``tau``.

Symbols: ``m_area`` mass per unit area m'' [kg/m^2]; ``rho0, c0`` fluid density [kg/m^3] and
speed of sound [m/s].
"""

from __future__ import annotations

import math

import numpy as np
import numpy.typing as npt

from ._checks import fluid as _check_fluid
from ._checks import positive as _positive
from .air import AIR_DENSITY as _RHO0
from .air import AIR_SOUND_SPEED as _C0

_FIELD_LIMIT = math.radians(78.0)


def _mass_ratio(f: FloatArray, m_area: FloatArray, rho0: float, c0: float) -> FloatArray:
    """a = omega m'' / (2 rho0 c0) [-]."""
    out: FloatArray = 2.0 * np.pi * f * m_area / (2.0 * rho0 * c0)
    return out


# --------------------------------------------------------------------------------------------
# conversions
# --------------------------------------------------------------------------------------------


__all__ = [
    "transmission_mass_law_field",
    "transmission_mass_law_normal",
    "transmission_mass_law_oblique",
    "transmission_mass_law_random",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]

# --------------------------------------------------------------------------------------------
# mass law
# --------------------------------------------------------------------------------------------


def transmission_mass_law_normal(
    f: npt.ArrayLike, m_area: npt.ArrayLike, *, rho0: float = _RHO0, c0: float = _C0
) -> FloatArray:
    """Normal-incidence mass-law transmission coefficient of a limp infinite panel.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    m_area : float or array_like
        Mass per unit area [kg/m^2].
    rho0 : float, optional
        Fluid density [kg/m^3].
    c0 : float, optional
        Speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        ``tau_0`` [-].

    Notes
    -----
    ``tau_0 = 1 / (1 + (omega m'' / (2 rho0 c0))^2)``, so that
    ``R_0 ~ 20 lg(f m'') - 42.4 dB`` for ``rho0 c0 = 415 Pa s/m`` and ``omega m'' >> rho0 c0``.

    References
    ----------
    .. [1] Vigran, T.E. (2008). Building Acoustics. Taylor & Francis, ch. 6 (mass law).
       ISBN 978-0-415-42853-8
    .. [2] Fahy, F.J. (1985). Sound and Structural Vibration. Academic Press, ch. 4.
       ISBN 0-12-247670-0
    """
    _check_fluid(rho0, c0)
    a = _mass_ratio(_positive("f", f), _positive("m_area", m_area), rho0, c0)
    out: FloatArray = 1.0 / (1.0 + a**2)
    return out


def transmission_mass_law_oblique(
    f: npt.ArrayLike,
    m_area: npt.ArrayLike,
    theta: npt.ArrayLike,
    *,
    rho0: float = _RHO0,
    c0: float = _C0,
) -> FloatArray:
    """Oblique-incidence mass-law transmission coefficient of a limp infinite panel.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    m_area : float or array_like
        Mass per unit area [kg/m^2].
    theta : float or array_like
        Angle of incidence from the panel normal [rad], 0 <= theta <= pi/2.
    rho0, c0 : float, optional
        Fluid density [kg/m^3] and speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        ``tau(theta) = 1 / (1 + (omega m'' cos(theta) / (2 rho0 c0))^2)`` [-].

    References
    ----------
    .. [1] Fahy, F.J. (1985). Sound and Structural Vibration. Academic Press, ch. 4.
       ISBN 0-12-247670-0
    """
    _check_fluid(rho0, c0)
    th = np.asarray(theta, dtype=np.float64)
    if np.any(th < 0.0) or np.any(th > 0.5 * np.pi + 1e-12):
        msg = f"theta must lie in [0, pi/2], got {theta!r}"
        raise ValueError(msg)
    a = _mass_ratio(_positive("f", f), _positive("m_area", m_area), rho0, c0)
    out: FloatArray = 1.0 / (1.0 + (a * np.cos(th)) ** 2)
    return out


def transmission_mass_law_field(
    f: npt.ArrayLike,
    m_area: npt.ArrayLike,
    *,
    theta_limit: float = _FIELD_LIMIT,
    rho0: float = _RHO0,
    c0: float = _C0,
) -> FloatArray:
    """Field-incidence (limited-angle diffuse) mass-law transmission coefficient.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    m_area : float or array_like
        Mass per unit area [kg/m^2].
    theta_limit : float, optional
        Upper limit of the angle of incidence [rad]; default 78 deg (field incidence).
    rho0, c0 : float, optional
        Fluid density [kg/m^3] and speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        Angle-averaged transmission coefficient [-].

    Notes
    -----
    Paris' diffuse-field average over ``0 <= theta <= theta_lim`` of the limp-panel
    ``tau(theta)``, evaluated in closed form (substitution ``u = cos^2 theta``)::

        tau_field = int tau sin cos dtheta / int sin cos dtheta
                  = ln[(1 + a^2) / (1 + a^2 cos^2 theta_lim)] / (a^2 sin^2 theta_lim),
        a = omega m'' / (2 rho0 c0)

    For ``a >> 1`` and 78 deg this is ``R_0 - 5.2 dB``; Vigran (2008, eq. 6.102) gives
    ``R_field ~ 20 lg(f m'') - 47 dB``, "about 5 dB below normal incidence".

    References
    ----------
    .. [1] Vigran, T.E. (2008). Building Acoustics. Taylor & Francis, eq. 6.102.
       ISBN 978-0-415-42853-8
    .. [2] Beranek, L.L. (ed.) (1971). Noise and Vibration Control. McGraw-Hill, ch. 11
       (field-incidence mass law, 0-78 deg).
    """
    _check_fluid(rho0, c0)
    if not 0.0 < theta_limit <= 0.5 * math.pi + 1e-12:
        msg = f"theta_limit must lie in (0, pi/2], got {theta_limit!r}"
        raise ValueError(msg)
    a2 = _mass_ratio(_positive("f", f), _positive("m_area", m_area), rho0, c0) ** 2
    s2 = math.sin(theta_limit) ** 2
    c2 = max(math.cos(theta_limit) ** 2, 0.0)
    out: FloatArray = np.log1p(a2) - np.log1p(a2 * c2)
    out = out / (a2 * s2)
    return out


def transmission_mass_law_random(
    f: npt.ArrayLike, m_area: npt.ArrayLike, *, rho0: float = _RHO0, c0: float = _C0
) -> FloatArray:
    """Random-incidence (0-90 deg) mass-law transmission coefficient.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    m_area : float or array_like
        Mass per unit area [kg/m^2].
    rho0, c0 : float, optional
        Fluid density [kg/m^3] and speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        ``tau = ln(1 + a^2) / a^2`` [-], ``a = omega m'' / (2 rho0 c0)``.

    Notes
    -----
    For ``a >> 1``: ``R_random = R_0 - 10 lg(0.23 R_0)`` (London 1950; 0.23 = ln(10)/10).

    References
    ----------
    .. [1] London, A. (1950). "Transmission of reverberant sound through double walls."
       J. Acoust. Soc. Am. 22(2), 270-279. doi:10.1121/1.1906601
    """
    return transmission_mass_law_field(f, m_area, theta_limit=0.5 * math.pi, rho0=rho0, c0=c0)
