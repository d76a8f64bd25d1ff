"""Thin cylindrical shells: ring frequency and bending modal density.

All functions are pure and vectorised: array arguments broadcast against each other and
the result has the broadcast shape. SI units throughout. Modal densities are in modes per
hertz, ``n(f) = 2*pi*n(omega)``.

The formulas and their sources are collected in ``docs/theory/subsystems.md``.
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt
from scipy import special

from ._checks import positive as _positive
from .elastic import plate_longitudinal_speed

__all__ = [
    "cylinder_modal_density_ratio",
    "ring_frequency",
    "shell_bending_modal_density",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]


# ---------------------------------------------------------------------------------------
# thin cylindrical shell
# ---------------------------------------------------------------------------------------
def ring_frequency(radius: npt.ArrayLike, longitudinal_speed: npt.ArrayLike) -> FloatArray:
    """Ring frequency of a thin cylindrical shell.

    Parameters
    ----------
    radius : float or array_like
        Mean shell radius a [m].
    longitudinal_speed : float or array_like
        Quasi-longitudinal plate speed c_L' [m/s] (:func:`plate_longitudinal_speed`).

    Returns
    -------
    numpy.ndarray
        f_r = c_L' / (2 pi a) [Hz]: the frequency at which a longitudinal wavelength equals
        the circumference (breathing mode n = 0 of the infinite cylinder).

    References
    ----------
    .. [1] Heckl, M. (1962). Vibrations of point-driven cylindrical shells. J. Acoust.
       Soc. Am. 34(10), 1553-1557.
    .. [2] Leissa, A.W. (1973). Vibration of Shells, NASA SP-288 (ring frequency of the
       n = 0 mode; from memory).
    """
    a = _positive("radius", radius)
    c = _positive("longitudinal_speed", longitudinal_speed)
    return np.asarray(c / (2.0 * np.pi * a), dtype=np.float64)


def cylinder_modal_density_ratio(frequency_ratio: npt.ArrayLike) -> FloatArray:
    """Ratio of the thin-shell to the flat-plate bending modal density.

    Parameters
    ----------
    frequency_ratio : float or array_like
        nu = f / f_m [-], > 0, with f_m the frequency where the membrane term of the
        dispersion relation saturates (see :func:`shell_bending_modal_density`).

    Returns
    -------
    numpy.ndarray
        n_shell / n_plate [-]:

        * nu < 1: sqrt(nu / 2) K((1 + nu) / 2) * 2 / pi
        * nu > 1: sqrt(nu / (1 + nu)) K(2 / (1 + nu)) * 2 / pi
        * nu = 1: inf (logarithmic singularity of the continuous count)

        with K(m) the complete elliptic integral of the first kind, parameter m = k^2.

    Notes
    -----
    Heckl's simplified (Donnell-type) dispersion relation of the thin cylindrical shell,
    in non-dimensional form nu^2 = (k_x / k)^4 + beta'^2 (k a)^4 (beta' a constant;
    beta'^2 = h^2 / (12 a^2 (1 - nu_P^2)) with Poisson's ratio nu_P),
    and the wavenumber-area count of Szechenyi (1971) give

        n / n_p = (2 / pi) * integral over {0 < phi < pi/2, cos^2 phi < nu} of
                  nu / sqrt(nu^2 - cos^4 phi) dphi.

    With u = cos^2 phi the integral becomes integral du / sqrt(u (1-u) (nu-u) (nu+u)) * nu/2,
    a complete elliptic integral of the first kind (standard reduction of an integral
    over a quartic with four real roots, see Byrd & Friedman; the reduction was done here
    and is checked against direct numerical quadrature in the tests).
    Asymptotes: 0.8346 sqrt(nu) for nu << 1, 1 + 3/(16 nu^2) for nu >> 1.
    The peak at nu = 1 is an artefact of the continuous count; finite shells give a
    finite, rounded peak (band averaging and the axial mode spacing).

    References
    ----------
    .. [1] Heckl, M. (1962). Vibrations of point-driven cylindrical shells. J. Acoust.
       Soc. Am. 34(10), 1553-1557 (simplified dispersion relation).
    .. [2] Szechenyi, E. (1971). Modal densities and radiation efficiencies of unstiffened
       cylinders using statistical methods. J. Sound Vib. 19(1), 65-81 (wavenumber-space
       mode counting; closed forms there not checked here).
    .. [3] Byrd, P.F., Friedman, M.D. (1971). Handbook of Elliptic Integrals for Engineers
       and Scientists, 2nd ed., Springer (reduction to K).
    """
    nu = _positive("frequency_ratio", frequency_ratio)
    below = nu < 1.0
    above = nu > 1.0
    out = np.full(nu.shape, np.inf, dtype=np.float64)
    nb = np.where(below, nu, 0.5)
    na = np.where(above, nu, 2.0)
    val_b = np.sqrt(nb / 2.0) * special.ellipk((1.0 + nb) / 2.0)
    val_a = np.sqrt(na / (1.0 + na)) * special.ellipk(2.0 / (1.0 + na))
    out = np.where(below, val_b, out)
    out = np.where(above, val_a, out)
    return np.asarray(2.0 / np.pi * out, dtype=np.float64)


def shell_bending_modal_density(
    f: npt.ArrayLike,
    area: npt.ArrayLike,
    radius: npt.ArrayLike,
    thickness: npt.ArrayLike,
    youngs_modulus: npt.ArrayLike,
    density: npt.ArrayLike,
    poisson_ratio: npt.ArrayLike,
) -> FloatArray:
    """Asymptotic flexural modal density of a thin cylindrical shell or curved panel.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    area : float or array_like
        Shell area S [m^2] (2 pi a L for a closed cylinder of length L; the developed
        area for a curved panel).
    radius : float or array_like
        Radius of curvature a [m].
    thickness : float or array_like
        Shell thickness h [m].
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    density : float or array_like
        Density rho [kg/m^3].
    poisson_ratio : float or array_like
        Poisson's ratio nu [-].

    Returns
    -------
    numpy.ndarray
        n(f) = n_p * ratio(f / f_m) [modes/Hz] with the flat-plate value
        n_p = sqrt(3) S / (h c_L') and :func:`cylinder_modal_density_ratio` evaluated at
        f / f_m, f_m = sqrt(E / rho) / (2 pi a) = sqrt(1 - nu^2) * f_r.

    Notes
    -----
    The flexural (lowest) branch of the Donnell-Mushtari shell equations is, for
    k a >> 1 or k_x << k, Omega^2 = (1 - nu^2) (k_x / k)^4 + beta^2 (k a)^4 with
    Omega = f / f_r, f_r = c_L' / (2 pi a) (:func:`ring_frequency`) and
    beta = h / (a sqrt 12) (Heckl 1962). Dividing by (1 - nu^2) gives the form used by
    :func:`cylinder_modal_density_ratio` with frequency ratio f / f_m: the membrane term
    saturates at the ring frequency based on the bar speed sqrt(E / rho), which is where
    the continuous count peaks. The n = 0 breathing resonance itself is at f_r.

    Validity: thin shell (h << a), isotropic homogeneous wall, many modes per band.
    Below the ring frequency the axial mode spacing of short shells makes band counts
    scatter. Near f = f_m the continuous formula diverges logarithmically; band-average
    it (e.g. scipy.integrate.quad over the band) rather than sampling at f_m.
    In-plane (longitudinal, shear) wave families are not included.

    References
    ----------
    .. [1] Heckl, M. (1962). Vibrations of point-driven cylindrical shells. J. Acoust.
       Soc. Am. 34(10), 1553-1557 (simplified flexural dispersion relation).
    .. [2] Szechenyi, E. (1971). Modal densities and radiation efficiencies of unstiffened
       cylinders using statistical methods. J. Sound Vib. 19(1), 65-81 (wavenumber-space
       mode count).
    .. [3] Leissa, A.W. (1973). Vibration of Shells, NASA SP-288, ch. 2 (Donnell-Mushtari
       equations; from memory).
    """
    fr = _positive("f", f)
    s = _positive("area", area)
    h = _positive("thickness", thickness)
    c = plate_longitudinal_speed(youngs_modulus, density, poisson_ratio)
    nu = np.asarray(poisson_ratio, dtype=np.float64)
    n_p = np.sqrt(3.0) * s / (h * c)
    f_m = ring_frequency(radius, c) * np.sqrt(1.0 - nu**2)
    ratio = cylinder_modal_density_ratio(fr / f_m)
    return np.asarray(n_p * ratio, dtype=np.float64)
