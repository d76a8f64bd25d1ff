"""Absorption of porous layers: rigid-backed surface impedance, angle and diffuse absorption.

* :func:`rigid_backed_impedance` (locally or extended reacting), :func:`absorption_coefficient`
  at an angle, :func:`diffuse_absorption` (Paris integral by Gauss-Legendre quadrature) and the
  closed-form locally reacting :func:`statistical_absorption_local`.

Time convention exp(+j omega t), as in :mod:`seatool.physics.porous`.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from typing import Literal

import numpy as np
import numpy.typing as npt

from ._checks import positive as _positive
from .air import AIR_DENSITY, AIR_SOUND_SPEED

__all__ = [
    "absorption_coefficient",
    "diffuse_absorption",
    "paris_integral",
    "rigid_backed_impedance",
    "statistical_absorption_local",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]

# ------------------------------------------------------------------------------------------
# layers and absorption
# ------------------------------------------------------------------------------------------


def rigid_backed_impedance(
    f: npt.ArrayLike,
    characteristic_impedance: npt.ArrayLike,
    wavenumber: npt.ArrayLike,
    thickness: float,
    *,
    angle: npt.ArrayLike = 0.0,
    reaction: Literal["local", "extended"] = "local",
    c0: float = AIR_SOUND_SPEED,
) -> ComplexArray:
    """Surface impedance of a fluid-equivalent layer on a rigid wall.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    characteristic_impedance : complex or array_like
        Z_c of the layer [Pa s/m].
    wavenumber : complex or array_like
        k_c of the layer [rad/m].
    thickness : float
        Layer thickness d [m].
    angle : float or array_like, optional
        Angle of incidence theta from the normal [rad] (used for extended reaction).
    reaction : {"local", "extended"}, optional
        ``"local"``: Z_s = -j Z_c cot(k_c d), the same at every angle. ``"extended"``:
        Z_s = -j Z_c (k_c/k_x) cot(k_x d), k_x = sqrt(k_c^2 - k0^2 sin^2 theta).
    c0 : float, optional
        Speed of sound in the incident medium [m/s].

    Returns
    -------
    numpy.ndarray of complex
        Surface impedance Z_s = p / v_n [Pa s/m].

    References
    ----------
    .. [1] Allard, J.F., Atalla, N. (2009) Propagation of Sound in Porous Media, 2nd ed.,
       Wiley, ISBN 978-0-470-74661-5, ch. 3 (layer of finite thickness on a rigid wall).
    """
    d = float(_positive("thickness", thickness))
    zc = np.asarray(characteristic_impedance, dtype=np.complex128)
    kc = np.asarray(wavenumber, dtype=np.complex128)
    if reaction == "local":
        kx = kc
    elif reaction == "extended":
        kt = 2.0 * math.pi * _positive("f", f) / c0 * np.sin(np.asarray(angle, dtype=np.float64))
        kx = np.sqrt(kc**2 - kt**2)
        kx = np.where(kx.imag > 0.0, -kx, kx)
    else:
        msg = f"reaction must be 'local' or 'extended', got {reaction!r}"
        raise ValueError(msg)
    zs = -1j * zc * (kc / kx) / np.tan(kx * d)
    return np.asarray(zs, dtype=np.complex128)


def absorption_coefficient(
    surface_impedance: npt.ArrayLike,
    *,
    angle: npt.ArrayLike = 0.0,
    rho0: float = AIR_DENSITY,
    c0: float = AIR_SOUND_SPEED,
) -> FloatArray:
    """Plane-wave absorption coefficient of a surface at an angle of incidence.

    Parameters
    ----------
    surface_impedance : complex or array_like
        Z_s [Pa s/m] (at that angle, for an extended-reacting surface).
    angle : float or array_like, optional
        Angle from the normal theta [rad] (default 0, normal incidence).
    rho0, c0 : float, optional
        Density [kg/m^3] and sound speed [m/s] of the incident medium.

    Returns
    -------
    numpy.ndarray
        alpha = 1 - |R|^2, R = (Z_s cos theta - rho0 c0)/(Z_s cos theta + rho0 c0) [-].

    References
    ----------
    .. [1] Kuttruff, H. (2009) Room Acoustics, 5th ed., Spon Press, ISBN 978-0-415-48021-5,
       ch. 2 (reflection at oblique incidence).
    """
    zs = np.asarray(surface_impedance, dtype=np.complex128)
    c = np.cos(np.asarray(angle, dtype=np.float64))
    z0 = rho0 * c0
    r = (zs * c - z0) / (zs * c + z0)
    return np.asarray(1.0 - np.abs(r) ** 2, dtype=np.float64)


def paris_integral(
    alpha_of_angle: Callable[[FloatArray], npt.ArrayLike],
    *,
    max_angle: float = 0.5 * math.pi,
    n_angles: int = 48,
) -> FloatArray:
    """Diffuse-field average of an angle-dependent absorption coefficient (Paris' formula).

    Parameters
    ----------
    alpha_of_angle : callable
        Function of an array of angles theta [rad] with shape (n_angles, 1, ..., 1) returning
        alpha(theta) broadcast to (n_angles, *shape).
    max_angle : float, optional
        Upper angle [rad] (default pi/2).
    n_angles : int, optional
        Number of Gauss–Legendre points in theta.

    Returns
    -------
    numpy.ndarray
        alpha_d = int_0^max alpha(theta) sin(2 theta) d theta / int_0^max sin(2 theta) d theta.
        (For max = pi/2 the denominator is 1.)

    References
    ----------
    .. [1] Paris, E.T. (1928) "On the coefficient of sound-absorption measured by the
       reverberation method", Phil. Mag. 5(29), 489-497.
    .. [2] London, A. (1950) "The determination of reverberant sound absorption
       coefficients from acoustic impedance measurements", J. Acoust. Soc. Am. 22(2),
       263-269, doi:10.1121/1.1906599.
    """
    if not 0.0 < max_angle <= 0.5 * math.pi:
        msg = f"max_angle must lie in (0, pi/2], got {max_angle!r}"
        raise ValueError(msg)
    x, w = np.polynomial.legendre.leggauss(n_angles)
    theta = 0.5 * max_angle * (x + 1.0)
    w = 0.5 * max_angle * w
    a = np.asarray(alpha_of_angle(theta), dtype=np.float64)
    weights = (w * np.sin(2.0 * theta)).reshape((-1,) + (1,) * (a.ndim - 1))
    norm = math.sin(max_angle) ** 2  # int_0^max sin(2t) dt
    return np.asarray(np.sum(a * weights, axis=0) / norm, dtype=np.float64)


def diffuse_absorption(
    f: npt.ArrayLike,
    characteristic_impedance: npt.ArrayLike,
    wavenumber: npt.ArrayLike,
    thickness: float,
    *,
    reaction: Literal["local", "extended"] = "extended",
    rho0: float = AIR_DENSITY,
    c0: float = AIR_SOUND_SPEED,
    n_angles: int = 48,
) -> FloatArray:
    """Diffuse-field (random-incidence) absorption of a rigid-backed fluid-equivalent layer.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    characteristic_impedance, wavenumber : complex or array_like
        Z_c [Pa s/m] and k_c [rad/m] of the layer, shape of ``f``.
    thickness : float
        Layer thickness [m].
    reaction : {"extended", "local"}, optional
        ``"extended"`` (default): the refraction into the layer is modelled, Z_s depends on
        theta. ``"local"``: the normal-incidence Z_s is used at all angles.
    rho0, c0 : float, optional
        Air properties.
    n_angles : int, optional
        Gauss–Legendre points over 0..pi/2.

    Returns
    -------
    numpy.ndarray
        Paris diffuse-field absorption coefficient [-], shape of ``f``.

    References
    ----------
    .. [1] Paris, E.T. (1928) Phil. Mag. 5(29), 489-497.
    .. [2] Allard, J.F., Atalla, N. (2009) Propagation of Sound in Porous Media, 2nd ed.,
       Wiley, ISBN 978-0-470-74661-5, ch. 3.
    """
    f_ = np.asarray(f, dtype=np.float64)
    zc = np.asarray(characteristic_impedance, dtype=np.complex128)
    kc = np.asarray(wavenumber, dtype=np.complex128)

    def alpha(theta: FloatArray) -> FloatArray:
        th = theta.reshape((-1,) + (1,) * f_.ndim)
        zs = rigid_backed_impedance(f_, zc, kc, thickness, angle=th, reaction=reaction, c0=c0)
        return absorption_coefficient(zs, angle=th, rho0=rho0, c0=c0)

    return paris_integral(alpha, n_angles=n_angles)


def statistical_absorption_local(
    surface_impedance: npt.ArrayLike, *, rho0: float = AIR_DENSITY, c0: float = AIR_SOUND_SPEED
) -> FloatArray:
    """Closed-form Paris absorption of a locally reacting surface.

    Parameters
    ----------
    surface_impedance : complex or array_like
        Normal-incidence surface impedance Z_s [Pa s/m] (angle independent).
    rho0, c0 : float, optional
        Air properties.

    Returns
    -------
    numpy.ndarray
        alpha_st [-].

    Notes
    -----
    With zeta = Z_s/(rho0 c0) = r + j x:

        alpha_st = (8 r/|zeta|^2) [1 - (r/|zeta|^2) ln((1 + r)^2 + x^2)
                   + (1/x) ((r^2 - x^2)/|zeta|^2) atan(x/(1 + r))]

    (the last factor (1/x) atan(x/(1 + r)) -> 1/(1 + r) for x -> 0). The maximum over real
    zeta is about 0.951 near zeta = 1.6 (from memory; :mod:`tests` confirm it numerically).

    References
    ----------
    .. [1] London, A. (1950) J. Acoust. Soc. Am. 22(2), 263-269, doi:10.1121/1.1906599.
    .. [2] Morse, P.M., Bolt, R.H. (1944) "Sound waves in rooms", Rev. Mod. Phys. 16(2),
       69-150, doi:10.1103/RevModPhys.16.69.
    """
    zeta = np.asarray(surface_impedance, dtype=np.complex128) / (rho0 * c0)
    r, x = zeta.real, zeta.imag
    if np.any(r < 0.0):
        msg = "surface_impedance must have a non-negative real part (passive surface)"
        raise ValueError(msg)
    m2 = np.abs(zeta) ** 2
    small = np.abs(x) < 1e-12
    x_safe = np.where(small, 1.0, x)
    atan_term = np.where(small, 1.0 / (1.0 + r), np.arctan(x_safe / (1.0 + r)) / x_safe)
    val = (8.0 * r / m2) * (
        1.0 - (r / m2) * np.log((1.0 + r) ** 2 + x**2) + (r**2 - x**2) / m2 * atan_term
    )
    return np.asarray(val, dtype=np.float64)
