"""Point connections between structures: rigid points, resilient mounts, resonator springs.

:func:`clf_point_rigid` and :func:`clf_point_resilient` give the CLF of ``N`` incoherent point
connections from the drive-point mobilities of the two uncoupled subsystems;
:func:`clf_resonator_point` the CLF from a spring-mass resonator to the structure its spring
is attached to. Time dependence exp(+j omega t).
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

__all__ = ["clf_point_resilient", "clf_point_rigid", "clf_resonator_point"]

FloatArray = npt.NDArray[np.float64]


def _check_points(
    f: npt.ArrayLike, mass_1: npt.ArrayLike, n_points: int
) -> tuple[FloatArray, FloatArray]:
    f_a = np.asarray(f, dtype=np.float64)
    if np.any(~np.isfinite(f_a)) or np.any(f_a <= 0.0):
        msg = f"f must be finite and > 0, got {f!r}"
        raise ValueError(msg)
    m_a = np.asarray(mass_1, dtype=np.float64)
    if np.any(~np.isfinite(m_a)) or np.any(m_a <= 0.0):
        msg = f"mass_1 must be finite and > 0, got {mass_1!r}"
        raise ValueError(msg)
    if n_points < 1:
        msg = f"n_points must be >= 1, got {n_points!r}"
        raise ValueError(msg)
    return f_a, m_a


def clf_point_rigid(
    f: npt.ArrayLike,
    mobility_1: npt.ArrayLike,
    mobility_2: npt.ArrayLike,
    mass_1: npt.ArrayLike,
    *,
    n_points: int = 1,
) -> FloatArray:
    """CLF of rigid point connections between two structural subsystems.

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    mobility_1, mobility_2 : complex or array_like
        Drive-point mobilities ``Y_1, Y_2`` of the uncoupled subsystems at the connection
        [m/(N s)], exp(+j omega t); the infinite-system values are the usual SEA estimate.
    mass_1 : float or array_like
        Mass of the source subsystem ``M_1`` [kg].
    n_points : int, optional
        Number of connection points ``N``; the points are treated as incoherent.

    Returns
    -------
    numpy.ndarray
        ``eta_12 = N Re(Y_2) / (omega M_1 |Y_1 + Y_2|^2)`` [-].

    Notes
    -----
    The reverberant field of subsystem 1 gives the free velocity ``v_f`` at the point with
    ``<|v_f|^2> = <v_1^2> = E_1/M_1``; the connection force is ``v_f/(Y_1 + Y_2)`` and the
    power into 2 is ``|F|^2 Re(Y_2)``. For ``N`` points the powers add when the points are
    more than about half a bending wavelength apart (incoherent); closer points interact
    and the sum over-estimates the coupling.

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed. Butterworth-Heinemann (point connection CLF, from memory).
    .. [2] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-borne Sound, 3rd ed.
       Springer (mobilities, power through a point). ISBN 978-3-540-22696-3
    """
    f_a, m_a = _check_points(f, mass_1, n_points)
    y1 = np.asarray(mobility_1, dtype=np.complex128)
    y2 = np.asarray(mobility_2, dtype=np.complex128)
    out: FloatArray = n_points * y2.real / (2.0 * np.pi * f_a * m_a * np.abs(y1 + y2) ** 2)
    return out


def clf_point_resilient(
    f: npt.ArrayLike,
    mobility_1: npt.ArrayLike,
    mobility_2: npt.ArrayLike,
    mass_1: npt.ArrayLike,
    stiffness: npt.ArrayLike,
    *,
    loss_factor: npt.ArrayLike = 0.0,
    n_points: int = 1,
) -> FloatArray:
    """CLF of resilient mounts (massless springs) at points between two subsystems.

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    mobility_1, mobility_2 : complex or array_like
        Drive-point mobilities of the uncoupled subsystems [m/(N s)], exp(+j omega t).
    mass_1 : float or array_like
        Mass of the source subsystem [kg].
    stiffness : float or array_like
        Dynamic stiffness of one mount ``k`` [N/m], > 0.
    loss_factor : float or array_like, optional
        Loss factor of the mount material ``eta_m`` [-] (complex stiffness ``k (1 + j eta_m)``).
    n_points : int, optional
        Number of incoherent mounts.

    Returns
    -------
    numpy.ndarray
        ``eta_12 = N Re(Y_2) / (omega M_1 |Y_1 + Y_m + Y_2|^2)``,
        ``Y_m = j omega / (k (1 + j eta_m))`` [-].

    Notes
    -----
    The mount is in series with the two drive points. Power dissipated in the mount is lost
    from both subsystems (it is not part of ``eta_12``). A stiff mount (``k -> inf``) gives
    :func:`clf_point_rigid`. Same incoherence condition as :func:`clf_point_rigid`.

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of SEA, 2nd ed.
       (from memory).
    .. [2] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-borne Sound, 3rd ed.,
       ch. on vibration isolation (mobility of a spring).
    """
    f_a, m_a = _check_points(f, mass_1, n_points)
    k = np.asarray(stiffness, dtype=np.float64)
    if np.any(~np.isfinite(k)) or np.any(k <= 0.0):
        msg = f"stiffness must be finite and > 0, got {stiffness!r}"
        raise ValueError(msg)
    eta_m = np.asarray(loss_factor, dtype=np.float64)
    if np.any(~np.isfinite(eta_m)) or np.any(eta_m < 0.0):
        msg = f"loss_factor must be finite and >= 0, got {loss_factor!r}"
        raise ValueError(msg)
    w = 2.0 * np.pi * f_a
    y_m = 1j * w / (k * (1.0 + 1j * eta_m))
    y1 = np.asarray(mobility_1, dtype=np.complex128)
    y2 = np.asarray(mobility_2, dtype=np.complex128)
    out: FloatArray = n_points * y2.real / (w * m_a * np.abs(y1 + y_m + y2) ** 2)
    return out


def clf_resonator_point(
    f: npt.ArrayLike,
    natural_frequency: npt.ArrayLike,
    stiffness: npt.ArrayLike,
    mobility_at_f0: npt.ArrayLike,
) -> FloatArray:
    r"""CLF from a spring-mass resonator to the structure its spring is attached to.

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz] at which the SEA power balance is written.
    natural_frequency : float or array_like
        Natural frequency of the resonator on a rigid base, f0 = sqrt(k/m)/(2 pi) [Hz].
    stiffness : float or array_like
        Spring stiffness k [N/m].
    mobility_at_f0 : complex or array_like
        Drive-point mobility Y of the (reverberant, infinite-system) structure at the
        attachment, evaluated at f0 [m/(N s)], exp(+j omega t).

    Returns
    -------
    numpy.ndarray
        eta_rs [-], stated for the band centre: ``omega eta_rs E_r`` is the power the
        resonator of energy E_r gives to the structure.

    Notes
    -----
    With the base free to move with mobility Y, the spring in series with the structure
    acts on the mass as the complex stiffness (force-displacement ratio, exp(+j omega t))

    .. math:: k_{eff} = \frac{k}{1 - j a}, \qquad a = \frac{k Y}{\omega_0},

    so the resonator's loss factor through the attachment is
    :math:`\eta_0 = \mathrm{Im}\,k_{eff} / \mathrm{Re}\,k_{eff} = \mathrm{Re}(a) /
    (1 + \mathrm{Im}(a))`, which for a real mobility is :math:`k\,\mathrm{Re}(Y)/\omega_0
    = m\,\omega_0\,\mathrm{Re}(Y)` (the structure acts as a dashpot of impedance 1/Y at the
    base). The resonator only holds energy near f0, so the power is
    :math:`\omega_0 \eta_0 E_r`; written at the band centre omega the coupling loss factor
    is :math:`\eta_{rs} = (\omega_0/\omega)\,\eta_0`. Valid for weak coupling
    (eta_0 << 1; the shift of the natural frequency by the base mobility is neglected) and
    for a structure whose response at the attachment is reverberant (infinite-system
    mobility, the usual SEA estimate). The derivation is the series combination of a spring
    and a structural mobility (Cremer, Heckl & Petersson 2005, ch. on mobilities and
    isolation; from memory) applied to the SEA description of an oscillator coupled to a
    multimodal system (Lyon & DeJong 1995, ch. 3, "oscillator-to-oscillator" and
    "oscillator-to-multimodal" coupling; from memory).

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed. Butterworth-Heinemann. ISBN 0-7506-9111-5
    .. [2] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-borne Sound, 3rd ed.
       Springer. ISBN 978-3-540-22696-3
    """
    f_a = np.asarray(f, dtype=np.float64)
    f0 = np.asarray(natural_frequency, dtype=np.float64)
    k = np.asarray(stiffness, dtype=np.float64)
    if np.any(~np.isfinite(f_a) | (f_a <= 0)):
        raise ValueError("f must be positive and finite")
    if np.any(~np.isfinite(f0) | (f0 <= 0)):
        raise ValueError("natural_frequency must be positive and finite")
    if np.any(~np.isfinite(k) | (k <= 0)):
        raise ValueError("stiffness must be positive and finite")
    y = np.asarray(mobility_at_f0, dtype=np.complex128)
    if np.any(y.real < 0):
        raise ValueError("mobility_at_f0 must have a non-negative real part (a passive structure)")
    w0 = 2.0 * np.pi * f0
    a = k * y / w0
    eta0 = a.real / (1.0 + a.imag)
    out: FloatArray = np.asarray(eta0 * f0 / f_a, dtype=np.float64)
    return out
