"""Beams: cross-sections, bending (two planes), torsion and longitudinal waves.

All functions are pure and vectorised: array arguments broadcast against each other and
the result has the broadcast shape. SI units throughout. Modal densities are in modes per
hertz, ``n(f) = 2*pi*n(omega)``.

The formulas and their sources are collected in ``docs/theory/subsystems.md``.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import numpy.typing as npt

from ._checks import full as _full
from ._checks import nonnegative as _nonnegative
from ._checks import positive as _positive

__all__ = [
    "BeamSection",
    "beam_bending_group_speed",
    "beam_bending_modal_density",
    "beam_bending_phase_speed",
    "beam_bending_wavenumber",
    "circular_section",
    "longitudinal_modal_density",
    "rectangular_section",
    "torsion_modal_density",
    "torsion_speed",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]


# ---------------------------------------------------------------------------------------
# beams
# ---------------------------------------------------------------------------------------
@dataclass(frozen=True)
class BeamSection:
    """Cross-section constants of a beam.

    Attributes
    ----------
    area : float
        Cross-section area A [m^2].
    second_moment_y : float
        Second moment of area I_y about the y axis (bending deflection along z) [m^4].
    second_moment_z : float
        Second moment of area I_z about the z axis (bending deflection along y) [m^4].
    torsion_constant : float
        Saint-Venant torsion constant J [m^4].
    polar_moment : float
        Polar second moment of area I_p = I_y + I_z [m^4].
    """

    area: float
    second_moment_y: float
    second_moment_z: float
    torsion_constant: float
    polar_moment: float


def rectangular_section(width: float, height: float, *, terms: int = 50) -> BeamSection:
    """Section constants of a solid rectangular beam.

    Parameters
    ----------
    width : float
        Width b along y [m].
    height : float
        Height h along z [m].
    terms : int, optional
        Number of odd terms of the Saint-Venant series for J (default 50).

    Returns
    -------
    BeamSection
        A = b h, I_y = b h^3 / 12, I_z = h b^3 / 12, I_p = I_y + I_z, and the torsion
        constant J = (1/3) a t^3 [1 - (192 / pi^5) (t / a) sum_{n odd} tanh(n pi a / (2 t))
        / n^5] with a = max(b, h), t = min(b, h).

    References
    ----------
    .. [1] Timoshenko, S.P., Goodier, J.N. (1951). Theory of Elasticity, 2nd ed.,
       McGraw-Hill, sec. 93 (torsion of a rectangular bar, series solution; from memory).
    """
    b = float(_positive("width", width))
    h = float(_positive("height", height))
    a, t = max(b, h), min(b, h)
    n = np.arange(1, 2 * terms, 2, dtype=np.float64)
    series = np.sum(np.tanh(n * np.pi * a / (2.0 * t)) / n**5)
    j = a * t**3 / 3.0 * (1.0 - 192.0 / np.pi**5 * (t / a) * series)
    iy = b * h**3 / 12.0
    iz = h * b**3 / 12.0
    return BeamSection(
        area=b * h,
        second_moment_y=iy,
        second_moment_z=iz,
        torsion_constant=float(j),
        polar_moment=iy + iz,
    )


def circular_section(outer_diameter: float, inner_diameter: float = 0.0) -> BeamSection:
    """Section constants of a solid or hollow circular beam (tube).

    Parameters
    ----------
    outer_diameter : float
        Outer diameter D [m].
    inner_diameter : float, optional
        Inner diameter d [m], 0 for a solid bar.

    Returns
    -------
    BeamSection
        A = pi (D^2 - d^2) / 4, I_y = I_z = pi (D^4 - d^4) / 64,
        J = I_p = pi (D^4 - d^4) / 32.

    References
    ----------
    .. [1] Timoshenko, S.P., Goodier, J.N. (1951). Theory of Elasticity, 2nd ed.,
       McGraw-Hill, sec. 90 (torsion of circular shafts).
    """
    do = float(_positive("outer_diameter", outer_diameter))
    di = float(_nonnegative("inner_diameter", inner_diameter))
    if di >= do:
        msg = f"inner_diameter ({di}) must be smaller than outer_diameter ({do})"
        raise ValueError(msg)
    i = np.pi * (do**4 - di**4) / 64.0
    return BeamSection(
        area=np.pi * (do**2 - di**2) / 4.0,
        second_moment_y=i,
        second_moment_z=i,
        torsion_constant=2.0 * i,
        polar_moment=2.0 * i,
    )


def beam_bending_wavenumber(
    f: npt.ArrayLike,
    youngs_modulus: npt.ArrayLike,
    second_moment: npt.ArrayLike,
    mass_per_length: npt.ArrayLike,
) -> FloatArray:
    """Bending wavenumber of an Euler-Bernoulli beam.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    second_moment : float or array_like
        Second moment of area I for the bending plane considered (I_y or I_z) [m^4].
    mass_per_length : float or array_like
        Mass per unit length m' [kg/m].

    Returns
    -------
    numpy.ndarray
        k_B = (omega^2 m' / (E I))^(1/4) [rad/m].

    Notes
    -----
    Bending in the two principal planes are two independent wave types; call the
    function once with I_y and once with I_z. Valid while the wavelength is long against
    the section depth (shear and rotary inertia neglected).

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 3.5 (bending waves in beams).
    """
    fr = _positive("f", f)
    e = _positive("youngs_modulus", youngs_modulus)
    i = _positive("second_moment", second_moment)
    m = _positive("mass_per_length", mass_per_length)
    omega = 2.0 * np.pi * fr
    return np.asarray((omega**2 * m / (e * i)) ** 0.25, dtype=np.float64)


def beam_bending_phase_speed(
    f: npt.ArrayLike,
    youngs_modulus: npt.ArrayLike,
    second_moment: npt.ArrayLike,
    mass_per_length: npt.ArrayLike,
) -> FloatArray:
    """Bending phase speed of a beam, c_B = (omega^2 E I / m')^(1/4) [m/s].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    second_moment : float or array_like
        Second moment of area I [m^4].
    mass_per_length : float or array_like
        Mass per unit length m' [kg/m].

    Returns
    -------
    numpy.ndarray
        Phase speed [m/s].

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 3.5.
    """
    k = beam_bending_wavenumber(f, youngs_modulus, second_moment, mass_per_length)
    return np.asarray(2.0 * np.pi * np.asarray(f, dtype=np.float64) / k, dtype=np.float64)


def beam_bending_group_speed(
    f: npt.ArrayLike,
    youngs_modulus: npt.ArrayLike,
    second_moment: npt.ArrayLike,
    mass_per_length: npt.ArrayLike,
) -> FloatArray:
    """Bending group speed of a beam, c_g = 2 c_B [m/s].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    second_moment : float or array_like
        Second moment of area I [m^4].
    mass_per_length : float or array_like
        Mass per unit length m' [kg/m].

    Returns
    -------
    numpy.ndarray
        Group speed [m/s].

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 3.5.
    """
    return 2.0 * beam_bending_phase_speed(f, youngs_modulus, second_moment, mass_per_length)


def beam_bending_modal_density(
    f: npt.ArrayLike,
    length: npt.ArrayLike,
    youngs_modulus: npt.ArrayLike,
    second_moment: npt.ArrayLike,
    mass_per_length: npt.ArrayLike,
) -> FloatArray:
    """Asymptotic bending modal density of a beam in one plane [modes/Hz].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    length : float or array_like
        Beam length L [m].
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    second_moment : float or array_like
        Second moment of area I for the plane considered [m^4].
    mass_per_length : float or array_like
        Mass per unit length m' [kg/m].

    Returns
    -------
    numpy.ndarray
        n(f) = 2 L / c_g = L / c_B [modes/Hz].

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5, ch. 8 (one-dimensional
       modal density; from memory).
    .. [2] Harris' Shock and Vibration Handbook, SEA chapter (c_g = 2 c_B).
    """
    ell = _positive("length", length)
    c = beam_bending_phase_speed(f, youngs_modulus, second_moment, mass_per_length)
    return np.asarray(ell / c, dtype=np.float64)


def torsion_speed(
    shear_modulus: npt.ArrayLike,
    torsion_constant: npt.ArrayLike,
    density: npt.ArrayLike,
    polar_moment: npt.ArrayLike,
) -> FloatArray:
    """Torsional wave speed of a beam, c_T = sqrt(G J / (rho I_p)) [m/s].

    Parameters
    ----------
    shear_modulus : float or array_like
        Shear modulus G [Pa].
    torsion_constant : float or array_like
        Saint-Venant torsion constant J [m^4].
    density : float or array_like
        Density rho [kg/m^3].
    polar_moment : float or array_like
        Polar second moment of area I_p [m^4].

    Returns
    -------
    numpy.ndarray
        c_T [m/s]; equals sqrt(G / rho) for circular sections (J = I_p).

    Notes
    -----
    Saint-Venant torsion without warping restraint; non-dispersive.

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 3.4 (torsional waves).
    """
    g = _positive("shear_modulus", shear_modulus)
    j = _positive("torsion_constant", torsion_constant)
    rho = _positive("density", density)
    ip = _positive("polar_moment", polar_moment)
    return np.asarray(np.sqrt(g * j / (rho * ip)), dtype=np.float64)


def longitudinal_modal_density(
    f: npt.ArrayLike, length: npt.ArrayLike, wave_speed: npt.ArrayLike
) -> FloatArray:
    """Modal density of a non-dispersive one-dimensional wave field [modes/Hz].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz] (sets the output shape).
    length : float or array_like
        Length L [m].
    wave_speed : float or array_like
        Wave speed c [m/s] (c_L of a rod, c_T for torsion, c0 of a 1-D duct).

    Returns
    -------
    numpy.ndarray
        n(f) = 2 L / c [modes/Hz].

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5, ch. 8 (from memory).
    """
    fr = _positive("f", f)
    ell = _positive("length", length)
    c = _positive("wave_speed", wave_speed)
    return _full(2.0 * ell / c, fr)


def torsion_modal_density(
    f: npt.ArrayLike, length: npt.ArrayLike, torsion_speed: npt.ArrayLike
) -> FloatArray:
    """Torsional modal density of a beam, n(f) = 2 L / c_T [modes/Hz].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    length : float or array_like
        Beam length L [m].
    torsion_speed : float or array_like
        Torsional wave speed c_T [m/s] (:func:`torsion_speed`).

    Returns
    -------
    numpy.ndarray
        n(f) [modes/Hz].

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5, ch. 8 (from memory).
    """
    return longitudinal_modal_density(f, length, torsion_speed)
