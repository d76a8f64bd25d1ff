"""Drive-point mobilities of infinite structures and power input to SEA subsystems.

Complex quantities use the time convention exp(+j omega t): a mass has mobility
1/(j omega m) (negative imaginary part), a spring j omega / k. Mobility = velocity / force
[m/(N s)]; for torsion, angular velocity / moment [rad/(N m s)].

Band-averaged point-force power input to a reverberant subsystem is well estimated by the
mobility of the corresponding infinite system; its real part satisfies
Re(Y) = pi n(omega) / (2 M) = n(f) / (4 M) (mass M, modal density n).
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

from seatool.physics.beams import beam_bending_phase_speed

from ._checks import nonnegative as _nonnegative
from ._checks import positive as _positive

__all__ = [
    "beam_end_mobility",
    "beam_point_mobility",
    "diffuse_field_power_input",
    "diffuse_field_transmitted_power",
    "plate_point_mobility",
    "point_force_power",
    "rod_end_mobility",
    "rod_point_mobility",
    "torsion_end_mobility",
    "torsion_point_mobility",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]


def plate_point_mobility(
    bending_stiffness: npt.ArrayLike, surface_density: npt.ArrayLike
) -> ComplexArray:
    """Drive-point mobility of an infinite thin plate in bending (force normal to plate).

    Parameters
    ----------
    bending_stiffness : float or array_like
        Plate bending stiffness D [N m].
    surface_density : float or array_like
        Mass per unit area m'' [kg/m^2].

    Returns
    -------
    numpy.ndarray of complex
        Y = 1 / (8 sqrt(D m'')) [m/(N s)], real and frequency independent.

    Notes
    -----
    Cremer, Heckl & Petersson (2005) eq. for the point-excited infinite plate
    (ch. 4, "Impedances and mobilities"); equivalently Y = pi n(omega) / (2 m'' S).
    Valid for a force spread over a region small against the bending wavelength and
    above the thin-plate limit.

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, ch. 4 (point mobility of the infinite plate;
       equation number not checked).
    """
    d = _positive("bending_stiffness", bending_stiffness)
    m = _positive("surface_density", surface_density)
    return np.asarray(1.0 / (8.0 * np.sqrt(d * m)), dtype=np.complex128)


def beam_point_mobility(
    f: npt.ArrayLike,
    youngs_modulus: npt.ArrayLike,
    second_moment: npt.ArrayLike,
    mass_per_length: npt.ArrayLike,
) -> ComplexArray:
    """Drive-point force mobility of an infinite Euler-Bernoulli beam in bending.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    second_moment : float or array_like
        Second moment of area I for the bending plane [m^4].
    mass_per_length : float or array_like
        Mass per unit length m' [kg/m].

    Returns
    -------
    numpy.ndarray of complex
        Y = (1 - j) / (4 m' c_B) [m/(N s)] (exp(+j omega t)); c_B the bending phase speed.

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, ch. 4 (infinite beam, force excitation; from
       memory).
    """
    c_b = beam_bending_phase_speed(f, youngs_modulus, second_moment, mass_per_length)
    m = _positive("mass_per_length", mass_per_length)
    return np.asarray((1.0 - 1.0j) / (4.0 * m * c_b), dtype=np.complex128)


def beam_end_mobility(
    f: npt.ArrayLike,
    youngs_modulus: npt.ArrayLike,
    second_moment: npt.ArrayLike,
    mass_per_length: npt.ArrayLike,
) -> ComplexArray:
    """Force mobility at the free end of a semi-infinite Euler-Bernoulli beam.

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
    numpy.ndarray of complex
        Y = (1 - j) / (m' c_B) [m/(N s)], four times the infinite-beam value.

    Notes
    -----
    From w = A exp(-j k x) + B exp(-k x) with zero bending moment and shear force equal
    to the applied force at x = 0 (derived; consistent with the tables of Cremer, Heckl
    & Petersson).

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, ch. 4 (semi-infinite beam; from memory).
    """
    return 4.0 * beam_point_mobility(f, youngs_modulus, second_moment, mass_per_length)


def rod_point_mobility(
    youngs_modulus: npt.ArrayLike, density: npt.ArrayLike, area: npt.ArrayLike
) -> ComplexArray:
    """Axial force mobility of an infinite rod at a point, 1 / (2 rho c_L A) [m/(N s)].

    Parameters
    ----------
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    density : float or array_like
        Density rho [kg/m^3].
    area : float or array_like
        Cross-section area A [m^2].

    Returns
    -------
    numpy.ndarray of complex
        Y = 1 / (2 A sqrt(E rho)) (real): two waves leave the driving point.

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, ch. 4 (from memory).
    """
    return 0.5 * rod_end_mobility(youngs_modulus, density, area)


def rod_end_mobility(
    youngs_modulus: npt.ArrayLike, density: npt.ArrayLike, area: npt.ArrayLike
) -> ComplexArray:
    """Axial force mobility at the end of a semi-infinite rod, 1 / (rho c_L A) [m/(N s)].

    Parameters
    ----------
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    density : float or array_like
        Density rho [kg/m^3].
    area : float or array_like
        Cross-section area A [m^2].

    Returns
    -------
    numpy.ndarray of complex
        Y = 1 / (A sqrt(E rho)) (real), c_L = sqrt(E / rho).

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, ch. 4 (from memory).
    """
    e = _positive("youngs_modulus", youngs_modulus)
    rho = _positive("density", density)
    a = _positive("area", area)
    return np.asarray(1.0 / (a * np.sqrt(e * rho)), dtype=np.complex128)


def torsion_end_mobility(
    shear_modulus: npt.ArrayLike,
    torsion_constant: npt.ArrayLike,
    density: npt.ArrayLike,
    polar_moment: npt.ArrayLike,
) -> ComplexArray:
    """Moment mobility at the end of a semi-infinite beam in torsion [rad/(N m s)].

    Parameters
    ----------
    shear_modulus : float or array_like
        Shear modulus G [Pa].
    torsion_constant : float or array_like
        Torsion constant J [m^4].
    density : float or array_like
        Density rho [kg/m^3].
    polar_moment : float or array_like
        Polar second moment of area I_p [m^4].

    Returns
    -------
    numpy.ndarray of complex
        Y_T = 1 / sqrt(G J rho I_p) = 1 / (rho I_p c_T) (real).

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, ch. 4 (torsional waves; from memory).
    """
    g = _positive("shear_modulus", shear_modulus)
    j = _positive("torsion_constant", torsion_constant)
    rho = _positive("density", density)
    ip = _positive("polar_moment", polar_moment)
    return np.asarray(1.0 / np.sqrt(g * j * rho * ip), dtype=np.complex128)


def torsion_point_mobility(
    shear_modulus: npt.ArrayLike,
    torsion_constant: npt.ArrayLike,
    density: npt.ArrayLike,
    polar_moment: npt.ArrayLike,
) -> ComplexArray:
    """Moment mobility of an infinite beam in torsion at a point [rad/(N m s)].

    Parameters
    ----------
    shear_modulus : float or array_like
        Shear modulus G [Pa].
    torsion_constant : float or array_like
        Torsion constant J [m^4].
    density : float or array_like
        Density rho [kg/m^3].
    polar_moment : float or array_like
        Polar second moment of area I_p [m^4].

    Returns
    -------
    numpy.ndarray of complex
        Y_T = 1 / (2 sqrt(G J rho I_p)) (real).

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, ch. 4 (from memory).
    """
    return 0.5 * torsion_end_mobility(shear_modulus, torsion_constant, density, polar_moment)


def point_force_power(force_rms: npt.ArrayLike, mobility: npt.ArrayLike) -> FloatArray:
    """Mean power injected by a point force, P = F_rms^2 Re(Y) [W].

    Parameters
    ----------
    force_rms : float or array_like
        Band rms force F [N] (per band: the square root of the band-integrated force
        spectrum).
    mobility : complex or array_like
        Drive-point mobility Y of the receiving structure [m/(N s)].

    Returns
    -------
    numpy.ndarray
        Time-averaged input power [W].

    Notes
    -----
    With the infinite-system mobility this is the band- and ensemble-average power into
    a reverberant finite subsystem (Cremer, Heckl & Petersson; Lyon & DeJong ch. 5).

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, ch. 4 (power input; from memory).
    .. [2] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5 (from memory).
    """
    f_rms = _nonnegative("force_rms", force_rms)
    y = np.asarray(mobility, dtype=np.complex128)
    if np.any(y.real < 0.0):
        msg = "mobility must have a non-negative real part (passive structure)"
        raise ValueError(msg)
    return np.asarray(f_rms**2 * y.real, dtype=np.float64)


def diffuse_field_power_input(
    f: npt.ArrayLike,
    mean_square_pressure: npt.ArrayLike,
    radiation_efficiency: npt.ArrayLike,
    modal_density: npt.ArrayLike,
    surface_density: npt.ArrayLike,
    sound_speed: npt.ArrayLike,
) -> FloatArray:
    """Resonant power a diffuse sound field injects into a panel (one exposed side).

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    mean_square_pressure : float or array_like
        Space- and time-averaged mean-square pressure of the reverberant field <p^2>
        [Pa^2] (band value).
    radiation_efficiency : float or array_like
        Radiation efficiency sigma of the panel's resonant modes into the fluid on the
        exposed side [-] (supplied by the caller, e.g. from a radiation-efficiency model).
    modal_density : float or array_like
        Panel modal density n(f) [modes/Hz].
    surface_density : float or array_like
        Panel mass per unit area m'' [kg/m^2].
    sound_speed : float or array_like
        Speed of sound of the fluid c [m/s].

    Returns
    -------
    numpy.ndarray
        P = sigma n(f) <p^2> c^2 / (4 pi f^2 m'') = 2 pi^2 c^2 sigma n(omega) <p^2> /
        (omega^2 m'') [W].

    Notes
    -----
    SEA reciprocity (Lyon & DeJong 1995): the power from a cavity of energy
    E_c = <p^2> V / (rho c^2) into the panel is P = omega eta_cp E_c with
    eta_cp = eta_pc n_p / n_c, eta_pc = rho c sigma / (omega m'') the radiation CLF and
    n_c = 4 pi f^2 V / c^3 the (volume-term) cavity modal density. V and rho cancel.
    This is the SEA form of the diffuse-field reciprocity relation of Shorter & Langley
    (2005) between the blocked-force cross-spectrum of a diffuse field and the
    radiation resistance of the structure. It gives the resonant (free-wave) response
    only; the non-resonant mass-law transmission is a separate path.
    Above coincidence it reproduces Cremer's resonant transmission coefficient (checked
    in the tests).

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5, ch. 3 and 10
       (reciprocity of coupling loss factors; from memory).
    .. [2] Shorter, P.J., Langley, R.S. (2005). On the reciprocity relationship between
       direct field radiation and diffuse reverberant loading. J. Acoust. Soc. Am.
       117(1), 85-95 (volume and pages from memory).
    """
    fr = _positive("f", f)
    p2 = _nonnegative("mean_square_pressure", mean_square_pressure)
    sigma = _nonnegative("radiation_efficiency", radiation_efficiency)
    n = _positive("modal_density", modal_density)
    m = _positive("surface_density", surface_density)
    c = _positive("sound_speed", sound_speed)
    return np.asarray(sigma * n * p2 * c**2 / (4.0 * np.pi * fr**2 * m), dtype=np.float64)


def diffuse_field_transmitted_power(
    mean_square_pressure: npt.ArrayLike,
    area: npt.ArrayLike,
    transmission_coefficient: npt.ArrayLike,
    density: npt.ArrayLike,
    sound_speed: npt.ArrayLike,
) -> FloatArray:
    """Power a diffuse sound field on one face sends through a partition of given ``tau``.

    Parameters
    ----------
    mean_square_pressure : float or array_like
        Space- and time-averaged mean-square pressure of the diffuse field <p^2> [Pa^2]
        (band value).
    area : float or array_like
        Partition area S [m^2].
    transmission_coefficient : float or array_like
        Diffuse-field transmission coefficient tau of the path [-], e.g. the non-resonant
        (forced-wave) :func:`seatool.physics.transmission.transmission_nonresonant`.
    density, sound_speed : float or array_like
        Density rho [kg/m^3] and speed of sound c [m/s] of the fluid of the incident field.

    Returns
    -------
    numpy.ndarray
        W = tau S <p^2> / (4 rho c) [W].

    Notes
    -----
    In a diffuse field of energy density w = <p^2>/(rho c^2) the power incident on a wall
    per unit area is I = c w / 4 = <p^2> / (4 rho c) (Kuttruff 2009, ch. 5, the
    irradiation strength of a diffuse field). The transmission coefficient is by definition
    the ratio of transmitted to incident power (Fahy & Gardonio 2007, ch. 5), so
    W = tau S I. This is the power the cavity-to-cavity coupling ``c S tau / (4 omega V)``
    of :func:`seatool.physics.coupling.clf_nonresonant` carries from a cavity at the same
    <p^2> (Crocker & Price 1969): a diffuse field stated as a level on a panel face and a
    source room held at that level give the same forced transmission.

    References
    ----------
    .. [1] Kuttruff, H. (2009). Room Acoustics, 5th ed., Spon Press, ISBN 978-0-415-48021-5,
       ch. 5 (energy incident on a wall in a diffuse field; chapter from memory).
    .. [2] Fahy, F., Gardonio, P. (2007). Sound and Structural Vibration, 2nd ed., Academic
       Press, ISBN 978-0-12-373633-8, ch. 5 (transmission coefficient; chapter from memory).
    .. [3] Crocker, M.J., Price, A.J. (1969). Sound transmission using statistical energy
       analysis. J. Sound Vib. 9(3), 469-486.
    """
    p2 = _nonnegative("mean_square_pressure", mean_square_pressure)
    s = _positive("area", area)
    tau = _nonnegative("transmission_coefficient", transmission_coefficient)
    rho = _positive("density", density)
    c = _positive("sound_speed", sound_speed)
    return np.asarray(tau * s * p2 / (4.0 * rho * c), dtype=np.float64)
