"""Porous sound absorbers: equivalent-fluid models (characteristic impedance and wavenumber).

Time convention exp(+j omega t) throughout: a wave travelling in +x is exp(j(omega t - k x))
with Im(k) <= 0 (decaying), and a lossy porous material has Im(Z_c) <= 0 at low frequency.

Models
------
* Delany & Bazley (1970) empirical power laws in X = rho0 f / sigma (:func:`delany_bazley`).
* Miki (1990) modified power laws in f / sigma (:func:`miki`).
* Johnson–Champoux–Allard (JCA) five-parameter rigid-frame model
  (:func:`jca_effective_density`, :func:`jca_bulk_modulus`, :func:`johnson_champoux_allard`),
  plus the limp-frame density (:func:`limp_frame_density`).

Layers and their absorption are in :mod:`seatool.physics.surface_absorption`.
"""

from __future__ import annotations

import math
import warnings
from typing import Literal

import numpy as np
import numpy.typing as npt

from ._checks import positive as _positive
from .air import (
    AIR_DENSITY,
    AIR_PRANDTL,
    AIR_PRESSURE,
    AIR_RATIO_OF_SPECIFIC_HEATS,
    AIR_SOUND_SPEED,
    AIR_VISCOSITY,
)

__all__ = [
    "ValidityWarning",
    "characteristic_impedance_wavenumber",
    "delany_bazley",
    "jca_bulk_modulus",
    "jca_effective_density",
    "johnson_champoux_allard",
    "limp_frame_density",
    "miki",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]


#: Validity range of the Delany–Bazley data, 0.01 < rho0 f / sigma < 1.
_DB_RANGE = (0.01, 1.0)


class ValidityWarning(UserWarning):
    """An empirical model is used outside the range of the data it was fitted to."""


def _check_range(model: str, x: FloatArray) -> None:
    lo, hi = _DB_RANGE
    if np.any(x <= lo) or np.any(x >= hi):
        msg = (
            f"{model}: rho0*f/sigma outside the fitted range {lo} < X < {hi} "
            f"(min {float(np.min(x)):.3g}, max {float(np.max(x)):.3g}); results may be unphysical"
        )
        warnings.warn(msg, ValidityWarning, stacklevel=3)


def delany_bazley(
    f: npt.ArrayLike,
    flow_resistivity: npt.ArrayLike,
    *,
    rho0: float = AIR_DENSITY,
    c0: float = AIR_SOUND_SPEED,
) -> tuple[ComplexArray, ComplexArray]:
    """Delany–Bazley characteristic impedance and complex wavenumber of a fibrous absorber.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    flow_resistivity : float or array_like
        Static airflow resistivity sigma [Pa s/m^2].
    rho0 : float, optional
        Air density [kg/m^3].
    c0 : float, optional
        Speed of sound in air [m/s].

    Returns
    -------
    Z_c : numpy.ndarray of complex
        Characteristic impedance [Pa s/m].
    k_c : numpy.ndarray of complex
        Complex wavenumber [rad/m], Im(k_c) < 0 (decay for exp(+j omega t)).

    Warns
    -----
    ValidityWarning
        If any X = rho0 f / sigma lies outside 0.01 < X < 1.

    Notes
    -----
    With X = rho0 f / sigma and time dependence exp(+j omega t):

        Z_c = rho0 c0 (1 + 0.0571 X^-0.754 - j 0.087 X^-0.732)
        k_c = (omega/c0) (1 + 0.0978 X^-0.700 - j 0.189 X^-0.595)

    Fitted to fibrous materials with porosity close to 1. At low X it can give Re(Z_s) < 0
    for thin layers (non-physical); see :func:`miki`.

    References
    ----------
    .. [1] Delany, M.E., Bazley, E.N. (1970) "Acoustical properties of fibrous absorbent
       materials", Applied Acoustics 3(2), 105-116, doi:10.1016/0003-682X(70)90031-9.
    """
    f_ = _positive("f", f)
    sigma = _positive("flow_resistivity", flow_resistivity)
    x = rho0 * f_ / sigma
    _check_range("Delany-Bazley", x)
    z = rho0 * c0 * (1.0 + 0.0571 * x**-0.754 - 1j * 0.087 * x**-0.732)
    k = 2.0 * math.pi * f_ / c0 * (1.0 + 0.0978 * x**-0.700 - 1j * 0.189 * x**-0.595)
    return np.asarray(z, dtype=np.complex128), np.asarray(k, dtype=np.complex128)


def miki(
    f: npt.ArrayLike,
    flow_resistivity: npt.ArrayLike,
    *,
    rho0: float = AIR_DENSITY,
    c0: float = AIR_SOUND_SPEED,
) -> tuple[ComplexArray, ComplexArray]:
    """Miki's modification of the Delany–Bazley model.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    flow_resistivity : float or array_like
        Static airflow resistivity sigma [Pa s/m^2].
    rho0 : float, optional
        Air density [kg/m^3].
    c0 : float, optional
        Speed of sound in air [m/s].

    Returns
    -------
    Z_c : numpy.ndarray of complex
        Characteristic impedance [Pa s/m].
    k_c : numpy.ndarray of complex
        Complex wavenumber [rad/m].

    Warns
    -----
    ValidityWarning
        If any X = rho0 f / sigma lies outside 0.01 < X < 1 (the data range of
        Delany & Bazley, on which Miki's fit is based).

    Notes
    -----
    With F = f / sigma (f in Hz, sigma in Pa s/m^2), exp(+j omega t):

        Z_c = rho0 c0 (1 + 0.0699 F^-0.632 - j 0.107 F^-0.632)
        k_c = (omega/c0) (1 + 0.109 F^-0.618 - j 0.160 F^-0.618)

    These are Miki's coefficients 5.50, 8.43, 7.81, 11.41 for (10^3 f/sigma) rewritten for
    f/sigma. The equal exponents make the model a positive-real (causal) impedance, which
    removes the Re(Z_s) < 0 artefact of Delany–Bazley at low frequencies.

    References
    ----------
    .. [1] Miki, Y. (1990) "Acoustical properties of porous materials -- Modifications of
       Delany-Bazley models", J. Acoust. Soc. Jpn. (E) 11(1), 19-24,
       doi:10.1250/ast.11.19.
    """
    f_ = _positive("f", f)
    sigma = _positive("flow_resistivity", flow_resistivity)
    _check_range("Miki", rho0 * f_ / sigma)
    ff = f_ / sigma
    z = rho0 * c0 * (1.0 + 0.0699 * ff**-0.632 - 1j * 0.107 * ff**-0.632)
    k = 2.0 * math.pi * f_ / c0 * (1.0 + 0.109 * ff**-0.618 - 1j * 0.160 * ff**-0.618)
    return np.asarray(z, dtype=np.complex128), np.asarray(k, dtype=np.complex128)


def jca_effective_density(
    f: npt.ArrayLike,
    porosity: float,
    tortuosity: float,
    flow_resistivity: float,
    viscous_length: float,
    *,
    rho0: float = AIR_DENSITY,
    viscosity: float = AIR_VISCOSITY,
) -> ComplexArray:
    """Johnson et al. (1987) dynamic density of the equivalent fluid (rigid frame).

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    porosity : float
        Open porosity phi in (0, 1] [-].
    tortuosity : float
        High-frequency limit of the tortuosity alpha_inf >= 1 [-].
    flow_resistivity : float
        Static airflow resistivity sigma [Pa s/m^2].
    viscous_length : float
        Viscous characteristic length Lambda [m].
    rho0 : float, optional
        Air density [kg/m^3].
    viscosity : float, optional
        Dynamic viscosity of air eta [Pa s].

    Returns
    -------
    numpy.ndarray of complex
        rho_eq = rho/phi [kg/m^3] (the density of the homogenised fluid whose velocity is
        the volume-averaged (Darcy) velocity).

    Notes
    -----
    rho(omega) = alpha_inf rho0 [1 + sigma phi/(j omega rho0 alpha_inf)
    sqrt(1 + j 4 alpha_inf^2 eta rho0 omega / (sigma^2 Lambda^2 phi^2))],  rho_eq = rho/phi.

    Limits: omega -> 0: rho_eq ~ sigma/(j omega) (Darcy flow, viscosity dominated);
    omega -> inf: rho_eq -> alpha_inf rho0 / phi (inertia dominated).

    References
    ----------
    .. [1] Johnson, D.L., Koplik, J., Dashen, R. (1987) "Theory of dynamic permeability and
       tortuosity in fluid-saturated porous media", J. Fluid Mech. 176, 379-402,
       doi:10.1017/S0022112087000727.
    .. [2] Allard, J.F., Atalla, N. (2009) Propagation of Sound in Porous Media, 2nd ed.,
       Wiley, ISBN 978-0-470-74661-5, ch. 5.
    """
    f_ = _positive("f", f)
    phi = float(_positive("porosity", porosity))
    if phi > 1.0:
        msg = f"porosity must lie in (0, 1], got {porosity!r}"
        raise ValueError(msg)
    a_inf = float(_positive("tortuosity", tortuosity))
    if a_inf < 1.0:
        msg = f"tortuosity must be >= 1, got {tortuosity!r}"
        raise ValueError(msg)
    sigma = float(_positive("flow_resistivity", flow_resistivity))
    lam = float(_positive("viscous_length", viscous_length))
    w = 2.0 * math.pi * f_
    g = np.sqrt(1.0 + 4j * a_inf**2 * viscosity * rho0 * w / (sigma**2 * lam**2 * phi**2))
    rho = a_inf * rho0 * (1.0 + sigma * phi / (1j * w * rho0 * a_inf) * g)
    return np.asarray(rho / phi, dtype=np.complex128)


def jca_bulk_modulus(
    f: npt.ArrayLike,
    porosity: float,
    thermal_length: float,
    *,
    rho0: float = AIR_DENSITY,
    pressure: float = AIR_PRESSURE,
    gamma: float = AIR_RATIO_OF_SPECIFIC_HEATS,
    viscosity: float = AIR_VISCOSITY,
    prandtl: float = AIR_PRANDTL,
) -> ComplexArray:
    """Champoux–Allard (1991) dynamic bulk modulus of the equivalent fluid (rigid frame).

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    porosity : float
        Open porosity phi in (0, 1] [-].
    thermal_length : float
        Thermal characteristic length Lambda' [m] (>= viscous length).
    rho0, pressure, gamma, viscosity, prandtl : float, optional
        Air density [kg/m^3], static pressure P0 [Pa], ratio of specific heats,
        dynamic viscosity [Pa s], Prandtl number.

    Returns
    -------
    numpy.ndarray of complex
        K_eq = K/phi [Pa].

    Notes
    -----
    K(omega) = gamma P0 / (gamma - (gamma - 1) [1 + 8 eta/(j Lambda'^2 Pr omega rho0)
    sqrt(1 + j rho0 omega Pr Lambda'^2/(16 eta))]^-1),  K_eq = K/phi.

    Limits: omega -> 0: K -> P0 (isothermal); omega -> inf: K -> gamma P0 (adiabatic).

    References
    ----------
    .. [1] Champoux, Y., Allard, J.F. (1991) "Dynamic tortuosity and bulk modulus in
       air-saturated porous media", J. Appl. Phys. 70(4), 1975-1979, doi:10.1063/1.349482.
    .. [2] Allard, J.F., Atalla, N. (2009) Propagation of Sound in Porous Media, 2nd ed.,
       Wiley, ISBN 978-0-470-74661-5, ch. 5.
    """
    f_ = _positive("f", f)
    phi = float(_positive("porosity", porosity))
    if phi > 1.0:
        msg = f"porosity must lie in (0, 1], got {porosity!r}"
        raise ValueError(msg)
    lam_t = float(_positive("thermal_length", thermal_length))
    w = 2.0 * math.pi * f_
    inner = 1.0 + 8.0 * viscosity / (1j * lam_t**2 * prandtl * w * rho0) * np.sqrt(
        1.0 + 1j * rho0 * w * prandtl * lam_t**2 / (16.0 * viscosity)
    )
    k = gamma * pressure / (gamma - (gamma - 1.0) / inner)
    return np.asarray(k / phi, dtype=np.complex128)


def characteristic_impedance_wavenumber(
    f: npt.ArrayLike, density: npt.ArrayLike, bulk_modulus: npt.ArrayLike
) -> tuple[ComplexArray, ComplexArray]:
    """Characteristic impedance and wavenumber of an equivalent fluid.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    density : complex or array_like
        Effective density rho_eq [kg/m^3] (Im <= 0 for exp(+j omega t)).
    bulk_modulus : complex or array_like
        Effective bulk modulus K_eq [Pa] (Im >= 0).

    Returns
    -------
    Z_c : numpy.ndarray of complex
        sqrt(rho_eq K_eq) [Pa s/m].
    k_c : numpy.ndarray of complex
        omega sqrt(rho_eq / K_eq) [rad/m].

    References
    ----------
    .. [1] Allard, J.F., Atalla, N. (2009) Propagation of Sound in Porous Media, 2nd ed.,
       Wiley, ISBN 978-0-470-74661-5, ch. 2 and 5.
    """
    f_ = _positive("f", f)
    rho = np.asarray(density, dtype=np.complex128)
    kk = np.asarray(bulk_modulus, dtype=np.complex128)
    z = np.sqrt(rho * kk)
    k = 2.0 * math.pi * f_ * np.sqrt(rho / kk)
    return np.asarray(z, dtype=np.complex128), np.asarray(k, dtype=np.complex128)


def limp_frame_density(
    rigid_density: npt.ArrayLike, bulk_density: float, porosity: float, *, rho0: float = AIR_DENSITY
) -> ComplexArray:
    """Effective density of a porous material with a limp (massive, stiffness-free) frame.

    Parameters
    ----------
    rigid_density : complex or array_like
        Rigid-frame equivalent density rho_eq [kg/m^3] (e.g. :func:`jca_effective_density`).
    bulk_density : float
        Apparent density of the frame rho_1 (mass of the dry material per volume) [kg/m^3].
    porosity : float
        Open porosity phi [-].
    rho0 : float, optional
        Air density [kg/m^3].

    Returns
    -------
    numpy.ndarray of complex
        rho_limp = (rho_t rho_eq - rho0^2) / (rho_t + rho_eq - 2 rho0), rho_t = rho_1 + phi rho0
        [kg/m^3].

    Notes
    -----
    Limits: rho_1 -> inf gives the rigid-frame rho_eq; rho_eq -> inf (fluid locked to the
    frame) gives rho_t, the total mass per volume. Use with the rigid-frame bulk modulus.
    Formula from memory of Panneton (2007); checked here only through its limits.

    References
    ----------
    .. [1] Panneton, R. (2007) "Comments on the limp frame equivalent fluid model for porous
       media", J. Acoust. Soc. Am. 122(6), EL217-EL222, doi:10.1121/1.2800895.
    .. [2] Allard, J.F., Atalla, N. (2009) Propagation of Sound in Porous Media, 2nd ed.,
       Wiley, ISBN 978-0-470-74661-5 (limp-frame equivalent fluid).
    """
    rho_eq = np.asarray(rigid_density, dtype=np.complex128)
    rho1 = float(np.asarray(bulk_density, dtype=np.float64))
    if not math.isfinite(rho1) or rho1 < 0.0:
        msg = f"bulk_density must be finite and >= 0, got {bulk_density!r}"
        raise ValueError(msg)
    phi = float(_positive("porosity", porosity))
    rho_t = rho1 + phi * rho0
    return np.asarray(
        (rho_t * rho_eq - rho0**2) / (rho_t + rho_eq - 2.0 * rho0), dtype=np.complex128
    )


def johnson_champoux_allard(
    f: npt.ArrayLike,
    porosity: float,
    tortuosity: float,
    flow_resistivity: float,
    viscous_length: float,
    thermal_length: float,
    *,
    frame: Literal["rigid", "limp"] = "rigid",
    bulk_density: float = 0.0,
    rho0: float = AIR_DENSITY,
    pressure: float = AIR_PRESSURE,
    gamma: float = AIR_RATIO_OF_SPECIFIC_HEATS,
    viscosity: float = AIR_VISCOSITY,
    prandtl: float = AIR_PRANDTL,
) -> tuple[ComplexArray, ComplexArray]:
    """JCA equivalent-fluid characteristic impedance and wavenumber.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    porosity, tortuosity, flow_resistivity, viscous_length, thermal_length : float
        phi [-], alpha_inf [-], sigma [Pa s/m^2], Lambda [m], Lambda' [m].
    frame : {"rigid", "limp"}, optional
        Frame model; ``"limp"`` uses :func:`limp_frame_density` with ``bulk_density``.
    bulk_density : float, optional
        Frame apparent density [kg/m^3], needed for ``frame="limp"``.
    rho0, pressure, gamma, viscosity, prandtl : float, optional
        Air properties.

    Returns
    -------
    Z_c : numpy.ndarray of complex
        Characteristic impedance [Pa s/m].
    k_c : numpy.ndarray of complex
        Complex wavenumber [rad/m].

    Notes
    -----
    Z_c = sqrt(rho_eq K_eq), k_c = omega sqrt(rho_eq/K_eq), with rho_eq from
    :func:`jca_effective_density` and K_eq from :func:`jca_bulk_modulus`.

    References
    ----------
    .. [1] Johnson, D.L., Koplik, J., Dashen, R. (1987) J. Fluid Mech. 176, 379-402.
    .. [2] Champoux, Y., Allard, J.F. (1991) J. Appl. Phys. 70(4), 1975-1979.
    .. [3] Allard, J.F., Atalla, N. (2009) Propagation of Sound in Porous Media, 2nd ed.,
       Wiley, ISBN 978-0-470-74661-5, ch. 5.
    """
    rho = jca_effective_density(
        f, porosity, tortuosity, flow_resistivity, viscous_length, rho0=rho0, viscosity=viscosity
    )
    if frame == "limp":
        if bulk_density <= 0.0:
            msg = "bulk_density must be > 0 for frame='limp'"
            raise ValueError(msg)
        rho = limp_frame_density(rho, bulk_density, porosity, rho0=rho0)
    elif frame != "rigid":
        msg = f"frame must be 'rigid' or 'limp', got {frame!r}"
        raise ValueError(msg)
    kk = jca_bulk_modulus(
        f,
        porosity,
        thermal_length,
        rho0=rho0,
        pressure=pressure,
        gamma=gamma,
        viscosity=viscosity,
        prandtl=prandtl,
    )
    return characteristic_impedance_wavenumber(f, rho, kk)
