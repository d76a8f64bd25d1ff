"""Sound transmission through single panels: coincidence, finite-panel forced waves, Sharp.

All functions are pure and broadcast with numpy over frequency bands and return the
transmission coefficient ``tau`` (ratio of transmitted to incident sound power) unless the
name says ``transmission_loss`` (then ``R = -10 lg(tau)`` in dB). Complex impedances use the
time convention exp(+j omega t).

Contents
--------
* The mass law of a limp panel is in :mod:`seatool.physics.mass_law`.
* Infinite elastic panel with bending stiffness and damping:
  :func:`transmission_infinite_panel` and its diffuse-field average
  :func:`transmission_infinite_panel_diffuse`; Cremer's above-coincidence result
  :func:`transmission_cremer`.
* Non-resonant (forced-wave) transmission of a finite panel for the cavity-cavity SEA path:
  :func:`transmission_nonresonant` (EN ISO 12354-1 Annex B forced-radiation route).
* Sharp's single-panel prediction :func:`transmission_loss_sharp`.
* Double wall mass-air-mass resonance :func:`mass_air_mass_frequency`.
* Conversions :func:`loss_from_transmission` and :func:`transmission_from_loss`.

Symbols: ``m_area`` mass per unit area m'' [kg/m^2]; ``f_c`` critical frequency [Hz];
``eta`` loss factor [-]; ``rho0, c0`` fluid density [kg/m^3] and speed of sound [m/s].
"""

from __future__ import annotations

import math

import numpy as np
import numpy.typing as npt

from seatool.physics.radiation_forced import forced_radiation_efficiency_en12354

from . import resonators
from ._checks import fluid as _check_fluid
from ._checks import nonnegative as _nonnegative
from ._checks import positive as _positive
from .air import AIR_DENSITY as _RHO0
from .air import AIR_SOUND_SPEED as _C0

__all__ = [
    "loss_from_transmission",
    "mass_air_mass_frequency",
    "transmission_cremer",
    "transmission_from_loss",
    "transmission_infinite_panel",
    "transmission_infinite_panel_diffuse",
    "transmission_loss_sharp",
    "transmission_nonresonant",
]

FloatArray = npt.NDArray[np.float64]


def loss_from_transmission(tau: npt.ArrayLike) -> FloatArray:
    """Sound reduction index / transmission loss ``R = -10 lg(tau)`` [dB].

    Parameters
    ----------
    tau : float or array_like
        Transmission coefficient [-], > 0.

    Returns
    -------
    numpy.ndarray
        Transmission loss [dB].

    References
    ----------
    .. [1] ISO 10140-2:2021 / ISO 16283-1:2014, definition of the sound reduction index.
    """
    t = _positive("tau", tau)
    out: FloatArray = -10.0 * np.log10(t)
    return out


def transmission_from_loss(r_db: npt.ArrayLike) -> FloatArray:
    """Transmission coefficient ``tau = 10^(-R/10)`` from a transmission loss ``R`` [dB].

    Parameters
    ----------
    r_db : float or array_like
        Transmission loss [dB].

    Returns
    -------
    numpy.ndarray
        Transmission coefficient [-].

    References
    ----------
    .. [1] ISO 10140-2:2021, definition of the sound reduction index.
    """
    r = np.asarray(r_db, dtype=np.float64)
    if np.any(~np.isfinite(r)):
        msg = f"r_db must be finite, got {r_db!r}"
        raise ValueError(msg)
    out: FloatArray = 10.0 ** (-r / 10.0)
    return out


# --------------------------------------------------------------------------------------------
# infinite elastic panel, coincidence
# --------------------------------------------------------------------------------------------


def transmission_infinite_panel(
    f: npt.ArrayLike,
    theta: npt.ArrayLike,
    m_area: npt.ArrayLike,
    f_c: npt.ArrayLike,
    eta: npt.ArrayLike,
    *,
    rho0: float = _RHO0,
    c0: float = _C0,
) -> FloatArray:
    """Oblique-incidence transmission coefficient of an infinite thin elastic panel.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    theta : float or array_like
        Angle of incidence from the normal [rad].
    m_area : float or array_like
        Mass per unit area [kg/m^2].
    f_c : float or array_like
        Critical frequency [Hz].
    eta : float or array_like
        Loss factor of the panel [-] (complex bending stiffness ``D (1 + j eta)``).
    rho0, c0 : float, optional
        Fluid density [kg/m^3] and speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        ``tau(theta)`` [-].

    Notes
    -----
    Panel wave impedance (exp(+j omega t)) for a trace wavenumber ``k sin(theta)``::

        Z_p = j omega m'' [1 - (1 + j eta) (f/f_c)^2 sin^4(theta)]
        tau = 1 / |1 + Z_p cos(theta) / (2 rho0 c0)|^2

    Coincidence (``tau -> ~1``) occurs at ``sin^2(theta) = f_c/f`` for ``f > f_c``.

    References
    ----------
    .. [1] Cremer, L. (1942). "Theorie der Schalldaemmung duenner Waende bei schraegem
       Einfall." Akust. Z. 7, 81-104.
    .. [2] Fahy, F.J. (1985). Sound and Structural Vibration. Academic Press, ch. 4.
       ISBN 0-12-247670-0
    """
    _check_fluid(rho0, c0)
    f_a = _positive("f", f)
    m_a = _positive("m_area", m_area)
    fc_a = _positive("f_c", f_c)
    eta_a = _nonnegative("eta", eta)
    th = np.asarray(theta, dtype=np.float64)
    s4 = np.sin(th) ** 4
    zp = 1j * 2.0 * np.pi * f_a * m_a * (1.0 - (1.0 + 1j * eta_a) * (f_a / fc_a) ** 2 * s4)
    out: FloatArray = 1.0 / np.abs(1.0 + zp * np.cos(th) / (2.0 * rho0 * c0)) ** 2
    return out


def transmission_infinite_panel_diffuse(
    f: npt.ArrayLike,
    m_area: npt.ArrayLike,
    f_c: npt.ArrayLike,
    eta: npt.ArrayLike,
    *,
    theta_limit: float = 0.5 * math.pi,
    rho0: float = _RHO0,
    c0: float = _C0,
) -> FloatArray:
    """Diffuse-field average of :func:`transmission_infinite_panel` by adaptive quadrature.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    m_area : float or array_like
        Mass per unit area [kg/m^2].
    f_c : float or array_like
        Critical frequency [Hz].
    eta : float or array_like
        Loss factor [-].
    theta_limit : float, optional
        Upper incidence angle [rad] (pi/2: random incidence; 78 deg: field incidence).
    rho0, c0 : float, optional
        Fluid density [kg/m^3] and speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        ``int_0^lim tau sin cos dtheta / int_0^lim sin cos dtheta`` [-].

    Notes
    -----
    Evaluated with ``u = sin^2(theta)`` (``sin cos dtheta = du/2``) by ``scipy.integrate.quad``
    with the coincidence point ``u = f_c/f`` passed as a break point. Includes both the forced
    (mass-law) and the coincident (resonant) transmission of the infinite panel: do not use it
    as the non-resonant path of an SEA model together with a resonant panel path.

    References
    ----------
    .. [1] Cremer, L. (1942). Akust. Z. 7, 81-104.
    .. [2] Fahy, F.J. (1985). Sound and Structural Vibration. Academic Press, ch. 4.
    """
    _check_fluid(rho0, c0)
    f_a, m_a, fc_a, eta_a = np.broadcast_arrays(
        _positive("f", f),
        _positive("m_area", m_area),
        _positive("f_c", f_c),
        _nonnegative("eta", eta),
    )
    if not 0.0 < theta_limit <= 0.5 * math.pi + 1e-12:
        msg = f"theta_limit must lie in (0, pi/2], got {theta_limit!r}"
        raise ValueError(msg)
    # heavy (about 0.5 s: scipy.integrate imports scipy.optimize) and needed by this
    # function only, so imported when it runs rather than when a model file is read
    from scipy import integrate

    u_lim = math.sin(theta_limit) ** 2
    out = np.empty(f_a.shape, dtype=np.float64)
    for idx in np.ndindex(f_a.shape):
        fi, mi, fci, ei = float(f_a[idx]), float(m_a[idx]), float(fc_a[idx]), float(eta_a[idx])

        def integrand(
            u: float, fi: float = fi, mi: float = mi, fci: float = fci, ei: float = ei
        ) -> float:
            th = math.asin(math.sqrt(min(u, 1.0)))
            return float(transmission_infinite_panel(fi, th, mi, fci, ei, rho0=rho0, c0=c0))

        u_c = fci / fi
        pts = [u_c] if 0.0 < u_c < u_lim else None
        val, _ = integrate.quad(
            integrand, 0.0, u_lim, points=pts, limit=400, epsabs=0.0, epsrel=1e-8
        )
        out[idx] = val / u_lim
    return out


def transmission_cremer(
    f: npt.ArrayLike,
    m_area: npt.ArrayLike,
    f_c: npt.ArrayLike,
    eta: npt.ArrayLike,
    *,
    rho0: float = _RHO0,
    c0: float = _C0,
) -> FloatArray:
    """Cremer's diffuse-field transmission coefficient of a single panel above coincidence.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz], ``f > f_c`` (best for ``f > 2 f_c``).
    m_area : float or array_like
        Mass per unit area [kg/m^2].
    f_c : float or array_like
        Critical frequency [Hz].
    eta : float or array_like
        Total loss factor of the panel [-], > 0.
    rho0, c0 : float, optional
        Fluid density [kg/m^3] and speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        ``tau = (pi/(2 eta)) (f_c/f) (rho0 c0/(pi f m''))^2`` [-]; NaN where ``f <= f_c``.

    Notes
    -----
    Equivalent to ``R = 20 lg(pi f m''/(rho0 c0)) + 10 lg(2 eta f/(pi f_c))``. It is the
    contribution of the coincidence peak to the random-incidence average of
    :func:`transmission_infinite_panel`, and equals the resonant SEA room-panel-room result
    with ``sigma = 1`` (see docs/theory/coupling.md).

    References
    ----------
    .. [1] Cremer, L. (1942). "Theorie der Schalldaemmung duenner Waende bei schraegem
       Einfall." Akust. Z. 7, 81-104.
    .. [2] Davy, J.L. (2009). "Predicting the sound insulation of single leaf walls: extension
       of Cremer's model." J. Acoust. Soc. Am. 126(4), 1871-1877. doi:10.1121/1.3206582
    """
    _check_fluid(rho0, c0)
    f_a = _positive("f", f)
    m_a = _positive("m_area", m_area)
    fc_a = _positive("f_c", f_c)
    eta_a = _positive("eta", eta)
    tau = (np.pi / (2.0 * eta_a)) * (fc_a / f_a) * (rho0 * c0 / (np.pi * f_a * m_a)) ** 2
    out: FloatArray = np.where(f_a > fc_a, tau, np.nan)
    return out


# --------------------------------------------------------------------------------------------
# finite panel, non-resonant (forced) transmission
# --------------------------------------------------------------------------------------------


def transmission_nonresonant(
    f: npt.ArrayLike,
    m_area: npt.ArrayLike,
    l1: npt.ArrayLike,
    l2: npt.ArrayLike,
    f_c: npt.ArrayLike,
    *,
    stiffness_factor: bool = False,
    rho0: float = _RHO0,
    c0: float = _C0,
) -> FloatArray:
    """Non-resonant (forced-wave) transmission coefficient of a finite baffled panel.

    For the cavity -> cavity "mass-law" path of an SEA model, in parallel with the resonant
    path through the panel subsystem.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    m_area : float or array_like
        Mass per unit area [kg/m^2].
    l1, l2 : float or array_like
        Panel side lengths [m].
    f_c : float or array_like
        Critical frequency [Hz]; the forced path is zero at and above ``f_c``.
    stiffness_factor : bool, optional
        If True, divide by ``(1 - f^2/f_c^2)^2``, the stiffness correction of the mass-law
        impedance for near-grazing forced waves used by Leppington et al. (1987) as quoted by
        Craik (1996, eq. 4.22; secondary source only). It grows without bound as ``f -> f_c``;
        use it only for ``f < f_c/2``. Default False (EN ISO 12354-1 Annex B as recalled).
    rho0, c0 : float, optional
        Fluid density [kg/m^3] and speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        ``tau_NR`` [-].

    Notes
    -----
    EN ISO 12354-1 Annex B, forced-wave part of the single-leaf transmission coefficient
    below coincidence (from memory)::

        tau_NR = (2 rho0 c0 / (omega m''))^2 * 2 sigma_f           (f < f_c)
        tau_NR = 0                                                 (f >= f_c)

    with ``sigma_f`` from
    :func:`seatool.physics.radiation_forced.forced_radiation_efficiency_en12354`. Annex B keeps only
    the resonant term above ``f_c``; the resonant path of the SEA model covers it. This route
    was chosen over the Leppington et al. (1987) closed form because that form is available
    to this project only as a secondary quotation that could not be checked.

    References
    ----------
    .. [1] EN ISO 12354-1:2017, Annex B (formerly EN 12354-1:2000 Annex B).
    .. [2] Leppington, F.G., Heron, K.H., Broadbent, E.G., Mead, S.M. (1987). "Resonant and
       non-resonant acoustic properties of elastic panels. II. The transmission problem."
       Proc. R. Soc. Lond. A 412, 309-337. doi:10.1098/rspa.1987.0091
    .. [3] Craik, R.J.M. (1996). Sound Transmission through Buildings using Statistical Energy
       Analysis. Gower, eq. 4.22. ISBN 0-566-07572-5
    """
    _check_fluid(rho0, c0)
    f_a = _positive("f", f)
    m_a = _positive("m_area", m_area)
    fc_a = _positive("f_c", f_c)
    sig_f = forced_radiation_efficiency_en12354(f_a, l1, l2, c0=c0)
    tau = (2.0 * rho0 * c0 / (2.0 * np.pi * f_a * m_a)) ** 2 * 2.0 * sig_f
    below = f_a < fc_a
    if stiffness_factor:
        ratio = np.where(below, f_a / fc_a, 0.0)
        tau = tau / (1.0 - ratio**2) ** 2
    out: FloatArray = np.where(below, tau, 0.0)
    return out


# --------------------------------------------------------------------------------------------
# Sharp single panel, double wall resonance
# --------------------------------------------------------------------------------------------


def transmission_loss_sharp(
    f: npt.ArrayLike,
    m_area: npt.ArrayLike,
    f_c: npt.ArrayLike,
    eta: npt.ArrayLike,
    *,
    rho0: float = _RHO0,
    c0: float = _C0,
) -> FloatArray:
    """Sharp's (1978) single-panel transmission loss prediction [dB].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    m_area : float or array_like
        Mass per unit area [kg/m^2].
    f_c : float or array_like
        Critical frequency [Hz].
    eta : float or array_like
        Total loss factor of the panel [-], > 0.
    rho0, c0 : float, optional
        Fluid density [kg/m^3] and speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        Transmission loss ``R`` [dB].

    Notes
    -----
    In the form given by Bies & Hansen (from memory; constants differ between texts)::

        f <  f_c/2:  R = 20 lg(pi f m''/(rho0 c0)) - 5.5
        f >= f_c:    R = 20 lg(pi f m''/(rho0 c0)) + 10 lg(2 eta f/(pi f_c))
        between:     straight line in lg(f) from R(f_c/2) to R(f_c)

    Below ``f_c/2`` this is ``20 lg(f m'') - 47.9 dB`` for ``rho0 c0 = 415``, within 1 dB of
    the field-incidence mass law; above ``f_c`` it is Cremer's result.

    References
    ----------
    .. [1] Sharp, B.H. (1978). "Prediction methods for the sound transmission of building
       elements." Noise Control Eng. 11(2), 53-63.
    .. [2] Bies, D.A., Hansen, C.H. (2009). Engineering Noise Control, 4th ed. Spon Press,
       sec. 8.2 (single panel transmission loss, Sharp's method). ISBN 978-0-415-48707-8
    """
    _check_fluid(rho0, c0)
    f_a, m_a, fc_a, eta_a = np.broadcast_arrays(
        _positive("f", f), _positive("m_area", m_area), _positive("f_c", f_c), _positive("eta", eta)
    )

    def r0(fx: FloatArray) -> FloatArray:
        out: FloatArray = 20.0 * np.log10(np.pi * fx * m_a / (rho0 * c0))
        return out

    r_low = r0(f_a) - 5.5
    r_high = r0(f_a) + 10.0 * np.log10(2.0 * eta_a * f_a / (np.pi * fc_a))
    r_a = r0(0.5 * fc_a) - 5.5
    r_b = r0(fc_a) + 10.0 * np.log10(2.0 * eta_a / np.pi)
    frac = np.log10(f_a / (0.5 * fc_a)) / np.log10(2.0)
    r_mid = r_a + frac * (r_b - r_a)
    out: FloatArray = np.where(f_a < 0.5 * fc_a, r_low, np.where(f_a >= fc_a, r_high, r_mid))
    return out


def mass_air_mass_frequency(
    m1: npt.ArrayLike,
    m2: npt.ArrayLike,
    d: npt.ArrayLike,
    *,
    isothermal: bool = False,
    rho0: float = _RHO0,
    c0: float = _C0,
    gamma: float = 1.4,
) -> FloatArray:
    """Mass-air-mass resonance frequency of a double wall [Hz].

    Parameters
    ----------
    m1, m2 : float or array_like
        Masses per unit area of the two leaves [kg/m^2].
    d : float or array_like
        Cavity depth [m].
    isothermal : bool, optional
        If True (cavity filled with porous material), the air stiffness is the isothermal one,
        ``rho0 c0^2 / gamma``, which lowers ``f_0`` by ``sqrt(gamma)``.
    rho0, c0 : float, optional
        Air density [kg/m^3] and speed of sound [m/s].
    gamma : float, optional
        Ratio of specific heats [-].

    Returns
    -------
    numpy.ndarray
        ``f_0`` [Hz].

    Notes
    -----
    ``f_0 = (1/(2 pi)) sqrt( (rho0 c0^2/d) (m1 + m2)/(m1 m2) )``
    (:func:`seatool.physics.resonators.mass_spring_mass_frequency` with the air layer's
    stiffness per area ``s' = rho0 c0^2 / d``), about
    ``60 sqrt((m1 + m2)/(m1 m2 d))`` Hz for air at 20 C (adiabatic).

    References
    ----------
    .. [1] Long, M. (2006). Architectural Acoustics. Elsevier, sec. 9 (double-panel
       transmission, eq. 9.48). ISBN 978-0-12-455551-8
    .. [2] Fahy, F.J. (1985). Sound and Structural Vibration. Academic Press, ch. 4.
    """
    _check_fluid(rho0, c0)
    dd = _positive("d", d)
    _positive("gamma", gamma)
    stiff = rho0 * c0**2 / (gamma if isothermal else 1.0)
    return resonators.mass_spring_mass_frequency(stiff / dd, m1, m2)
