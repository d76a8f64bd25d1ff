"""Elastic constants and material wave speeds of isotropic solids.

Shear modulus, quasi-longitudinal speeds of thin plates and bars, shear wave speed.
All functions are pure and vectorised: array arguments broadcast against each other and
the result has the broadcast shape. SI units throughout. Modal densities are in modes per
hertz, ``n(f) = 2*pi*n(omega)``.

The formulas and their sources are collected in ``docs/theory/subsystems.md``.
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

from ._checks import poisson as _poisson
from ._checks import positive as _positive

__all__ = [
    "bar_longitudinal_speed",
    "plate_longitudinal_speed",
    "shear_modulus",
    "shear_speed",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]


# ---------------------------------------------------------------------------------------
# material wave speeds
# ---------------------------------------------------------------------------------------
def shear_modulus(youngs_modulus: npt.ArrayLike, poisson_ratio: npt.ArrayLike) -> FloatArray:
    """Shear modulus of an isotropic material.

    Parameters
    ----------
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    poisson_ratio : float or array_like
        Poisson's ratio nu [-].

    Returns
    -------
    numpy.ndarray
        G = E / (2 (1 + nu)) [Pa].

    References
    ----------
    .. [1] Timoshenko, S.P., Goodier, J.N. (1951). Theory of Elasticity, 2nd ed.,
       McGraw-Hill, sec. 6 (isotropic elastic constants).
    """
    e = _positive("youngs_modulus", youngs_modulus)
    nu = _poisson(poisson_ratio)
    return np.asarray(e / (2.0 * (1.0 + nu)), dtype=np.float64)


def plate_longitudinal_speed(
    youngs_modulus: npt.ArrayLike, density: npt.ArrayLike, poisson_ratio: npt.ArrayLike
) -> FloatArray:
    """Quasi-longitudinal (in-plane compressional) wave speed of a thin plate.

    Parameters
    ----------
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    density : float or array_like
        Material density rho [kg/m^3].
    poisson_ratio : float or array_like
        Poisson's ratio nu [-].

    Returns
    -------
    numpy.ndarray
        c_L' = sqrt(E / (rho (1 - nu^2))) [m/s].

    Notes
    -----
    Plane-stress compressional wave; valid while the wavelength is large compared with
    the thickness.

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 3.3 (quasi-longitudinal waves in plates).
    """
    e = _positive("youngs_modulus", youngs_modulus)
    rho = _positive("density", density)
    nu = _poisson(poisson_ratio)
    return np.asarray(np.sqrt(e / (rho * (1.0 - nu**2))), dtype=np.float64)


def bar_longitudinal_speed(youngs_modulus: npt.ArrayLike, density: npt.ArrayLike) -> FloatArray:
    """Quasi-longitudinal wave speed of a slender bar (rod).

    Parameters
    ----------
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    density : float or array_like
        Material density rho [kg/m^3].

    Returns
    -------
    numpy.ndarray
        c_L = sqrt(E / rho) [m/s].

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 3.3 (quasi-longitudinal waves in bars).
    """
    e = _positive("youngs_modulus", youngs_modulus)
    rho = _positive("density", density)
    return np.asarray(np.sqrt(e / rho), dtype=np.float64)


def shear_speed(
    youngs_modulus: npt.ArrayLike, density: npt.ArrayLike, poisson_ratio: npt.ArrayLike
) -> FloatArray:
    """Shear (transverse) wave speed, also the in-plane shear wave speed of a plate.

    Parameters
    ----------
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    density : float or array_like
        Material density rho [kg/m^3].
    poisson_ratio : float or array_like
        Poisson's ratio nu [-].

    Returns
    -------
    numpy.ndarray
        c_S = sqrt(G / rho), G = E / (2 (1 + nu)) [m/s].

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 3.4 (transverse/shear waves).
    """
    g = shear_modulus(youngs_modulus, poisson_ratio)
    rho = _positive("density", density)
    return np.asarray(np.sqrt(g / rho), dtype=np.float64)
