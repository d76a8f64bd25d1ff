"""Per-band SEA validity indicators: modes in band, modal overlap, expected spread.

The thresholds used here are rules of thumb. Where a source is known it is cited; the
rest is marked *common practice*. The spread estimate is the ensemble relative variance
of the energy of a randomly perturbed (GOE) subsystem under point excitation after
Langley & Brown (2004), checked in the tests against a Monte Carlo simulation with GOE
natural frequencies; the band-averaged and built-up forms are in
:mod:`seatool.physics.variance`.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import numpy.typing as npt
from scipy import special

from ._checks import positive as _positive

__all__ = [
    "BandValidity",
    "assess_bands",
    "level_spread_db",
    "modal_density_per_hz",
    "modal_density_per_rad",
    "modal_overlap",
    "modes_in_band",
    "relative_variance_goe",
    "thin_plate_upper_frequency",
    "validity_message",
]

FloatArray = npt.NDArray[np.float64]
BoolArray = npt.NDArray[np.bool_]

#: Default minimum number of modes per band (common practice: 5; 3 as a bare minimum).
MIN_MODES = 5.0
#: Default minimum modal overlap (Fahy & Mohammed 1992, from memory).
MIN_OVERLAP = 1.0


def modal_density_per_rad(modal_density: npt.ArrayLike) -> FloatArray:
    """Convert n(f) [modes/Hz] to n(omega) = n(f) / (2 pi) [modes/(rad/s)].

    Parameters
    ----------
    modal_density : float or array_like
        n(f) [modes/Hz].

    Returns
    -------
    numpy.ndarray
        n(omega) [modes/(rad/s)].
    """
    return np.asarray(np.asarray(modal_density, dtype=np.float64) / (2.0 * np.pi))


def modal_density_per_hz(modal_density_per_rad: npt.ArrayLike) -> FloatArray:
    """Convert n(omega) [modes/(rad/s)] to n(f) = 2 pi n(omega) [modes/Hz].

    Parameters
    ----------
    modal_density_per_rad : float or array_like
        n(omega) [modes/(rad/s)].

    Returns
    -------
    numpy.ndarray
        n(f) [modes/Hz].
    """
    return np.asarray(np.asarray(modal_density_per_rad, dtype=np.float64) * 2.0 * np.pi)


def modes_in_band(modal_density: npt.ArrayLike, bandwidth: npt.ArrayLike) -> FloatArray:
    """Expected number of modes in a band, N = n(f) * Delta_f [-].

    Parameters
    ----------
    modal_density : float or array_like
        n(f) at the band centre [modes/Hz].
    bandwidth : float or array_like
        Bandwidth Delta_f [Hz].

    Returns
    -------
    numpy.ndarray
        N [-].

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5 (from memory).
    """
    n = np.asarray(modal_density, dtype=np.float64)
    if np.any(n < 0) or not np.all(np.isfinite(n)):
        msg = "modal_density must be finite and >= 0"
        raise ValueError(msg)
    bw = _positive("bandwidth", bandwidth)
    return np.asarray(n * bw, dtype=np.float64)


def modal_overlap(
    f: npt.ArrayLike, modal_density: npt.ArrayLike, loss_factor: npt.ArrayLike
) -> FloatArray:
    """Modal overlap factor M = eta f n(f) = eta omega n(omega) [-].

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    modal_density : float or array_like
        n(f) [modes/Hz].
    loss_factor : float or array_like
        Total loss factor eta of the subsystem [-].

    Returns
    -------
    numpy.ndarray
        Half-power bandwidth eta f over mean mode spacing 1 / n(f).

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5 (from memory).
    .. [2] Fahy, F.J., Mohammed, A.D. (1992). A study of uncertainty in applications of
       SEA to coupled beam and plate systems, part I. J. Sound Vib. 158(1), 45-67
       (from memory).
    """
    fr = _positive("f", f)
    n = np.asarray(modal_density, dtype=np.float64)
    if np.any(n < 0) or not np.all(np.isfinite(n)):
        msg = "modal_density must be finite and >= 0"
        raise ValueError(msg)
    eta = _positive("loss_factor", loss_factor)
    return np.asarray(eta * fr * n, dtype=np.float64)


def relative_variance_goe(
    modal_overlap: npt.ArrayLike, *, alpha: npt.ArrayLike = 3.0
) -> FloatArray:
    """Relative variance of the single-frequency energy of a random (GOE) subsystem.

    Parameters
    ----------
    modal_overlap : float or array_like
        Modal overlap factor m [-], > 0.
    alpha : float or array_like, optional
        alpha = E[a^2] / E[a]^2 of the modal excitation coefficients a_j [-]: 3 for a
        point force on Gaussian mode shapes (default), 9/4 for sin x sin plate modes,
        3/2 for sine beam modes, 1 + 2/P for P uncorrelated point forces, 1 for
        rain-on-the-roof excitation.

    Returns
    -------
    numpy.ndarray
        r^2 = Var[E] / E[E]^2 [-].

    Notes
    -----
    Natural frequencies with the statistics of the Gaussian orthogonal ensemble, light
    damping, energy at one frequency (Langley & Brown 2004, the GOE result):

        r^2 = (1 / (pi m)) [alpha - 1 + (1 - exp(-2 pi m)) / (2 pi m)
                            + E_1(pi m) (cosh(pi m) - sinh(pi m) / (pi m))]

    with E_1 the exponential integral. It equals
    ``alpha / (pi m) - 2 int_0^inf b(k) exp(-2 pi m k) dk`` with b the GOE two-level form
    factor (:func:`seatool.physics.variance.goe_form_factor`); without the E_1 term it
    would be the result for the unitary ensemble (b = 1 - |k|). Large overlap:
    r^2 -> (alpha - 1) / (pi m) + 1 / (pi m)^2. Averaging over a band lowers the
    variance (:func:`seatool.physics.variance.relative_variance_band`). The tests check
    the formula against a Monte Carlo simulation (GOE eigenvalues from the tridiagonal
    model of Dumitriu & Edelman 2002, random mode shapes) to within a few percent.

    References
    ----------
    .. [1] Langley, R.S., Brown, A.W.M. (2004). The ensemble statistics of the energy of
       a random system subjected to harmonic excitation. J. Sound Vib. 275, 823-846
       (GOE result for point and rain-on-the-roof loading; volume and pages from memory).
    .. [2] Langley, R.S., Cotoni, V. (2004). Response variance prediction in the
       statistical energy analysis of built-up systems. J. Acoust. Soc. Am. 115(2),
       706-718 (the same formula, used per subsystem).
    .. [3] Dumitriu, I., Edelman, A. (2002). Matrix models for beta ensembles. J. Math.
       Phys. 43(11), 5830-5847 (used in the tests).
    """
    m = _positive("modal_overlap", modal_overlap)
    a = np.asarray(alpha, dtype=np.float64)
    if np.any(a < 1.0) or not np.all(np.isfinite(a)):
        msg = "alpha must be finite and >= 1"
        raise ValueError(msg)
    x = np.pi * m
    return np.asarray(
        (a - 1.0 + (-np.expm1(-2.0 * x)) / (2.0 * x) + _e1_hyperbolic(x)) / x,
        dtype=np.float64,
    )


def _e1_hyperbolic(x: FloatArray) -> FloatArray:
    """E_1(x) (cosh x - sinh x / x) for x > 0 without overflow (Abramowitz & Stegun
    1964, 5.1.51 asymptotic series of e^x E_1(x) above x = 500)."""
    xs = np.minimum(x, 500.0)
    ex_e1 = np.where(
        x <= 500.0,
        special.exp1(xs) * np.exp(xs),
        (1.0 - 1.0 / x + 2.0 / x**2 - 6.0 / x**3 + 24.0 / x**4) / x,
    )
    em2 = np.exp(-2.0 * x)
    return np.asarray(ex_e1 * (0.5 * (1.0 + em2) - 0.5 * (1.0 - em2) / x), dtype=np.float64)


def level_spread_db(relative_variance: npt.ArrayLike) -> FloatArray:
    """Standard deviation of a level [dB] from the relative variance of the energy.

    Parameters
    ----------
    relative_variance : float or array_like
        r^2 = Var[E] / E[E]^2 [-].

    Returns
    -------
    numpy.ndarray
        sigma_L = (10 / ln 10) sqrt(ln(1 + r^2)) [dB], the standard deviation of
        10 lg E if E is log-normal with the given mean and variance (common practice
        conversion; exact only for a log-normal distribution).
    """
    r2 = np.asarray(relative_variance, dtype=np.float64)
    if np.any(r2 < 0) or not np.all(np.isfinite(r2)):
        msg = "relative_variance must be finite and >= 0"
        raise ValueError(msg)
    return np.asarray(10.0 / np.log(10.0) * np.sqrt(np.log1p(r2)), dtype=np.float64)


def thin_plate_upper_frequency(
    thickness: npt.ArrayLike,
    longitudinal_speed: npt.ArrayLike,
    *,
    wavelengths_per_thickness: float = 6.0,
) -> FloatArray:
    """Upper frequency of thin-plate (Kirchhoff) bending theory.

    Parameters
    ----------
    thickness : float or array_like
        Plate thickness h [m].
    longitudinal_speed : float or array_like
        Quasi-longitudinal plate speed c_L' [m/s].
    wavelengths_per_thickness : float, optional
        Required ratio lambda_B / h (default 6, common practice).

    Returns
    -------
    numpy.ndarray
        f_max = 2 pi c_L' / (sqrt(12) r^2 h) [Hz], where lambda_B = r h (about
        0.05 c_L' / h for r = 6). Above it shear deformation and rotary inertia lower
        the bending speed (Mindlin); the thin-plate modal density and mobility become
        inaccurate.

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, ch. 3 (limit of the bending-wave equation;
       the factor 6 is common practice).
    """
    h = _positive("thickness", thickness)
    c = _positive("longitudinal_speed", longitudinal_speed)
    r = float(_positive("wavelengths_per_thickness", wavelengths_per_thickness))
    return np.asarray(2.0 * np.pi * c / (np.sqrt(12.0) * r**2 * h), dtype=np.float64)


@dataclass(frozen=True)
class BandValidity:
    """Per-band SEA validity indicators of one subsystem.

    Attributes
    ----------
    f : numpy.ndarray
        Band centre frequencies [Hz].
    modes_in_band : numpy.ndarray
        Expected number of modes per band N [-].
    modal_overlap : numpy.ndarray
        Modal overlap factor M [-].
    relative_variance : numpy.ndarray
        Relative variance of the single-frequency energy (GOE estimate) [-].
    level_std_db : numpy.ndarray
        Standard deviation of the level [dB] from ``relative_variance``.
    very_few_modes : numpy.ndarray of bool
        N < 1: fewer than one mode per band.
    few_modes : numpy.ndarray of bool
        N below the chosen minimum (default 5, common practice).
    low_overlap : numpy.ndarray of bool
        M below the chosen minimum (default 1, Fahy & Mohammed 1992).
    ok : numpy.ndarray of bool
        Neither ``few_modes`` nor ``low_overlap``.
    """

    f: FloatArray
    modes_in_band: FloatArray
    modal_overlap: FloatArray
    relative_variance: FloatArray
    level_std_db: FloatArray
    very_few_modes: BoolArray
    few_modes: BoolArray
    low_overlap: BoolArray
    ok: BoolArray

    def messages(self) -> list[str]:
        """One plain-words message per band (flattened band order)."""
        return [
            f"{fc:g} Hz: " + validity_message(n, m, s)
            for fc, n, m, s in zip(
                self.f.ravel(),
                self.modes_in_band.ravel(),
                self.modal_overlap.ravel(),
                self.level_std_db.ravel(),
                strict=True,
            )
        ]


def assess_bands(
    f: npt.ArrayLike,
    modal_density: npt.ArrayLike,
    bandwidth: npt.ArrayLike,
    loss_factor: npt.ArrayLike,
    *,
    min_modes: float = MIN_MODES,
    min_overlap: float = MIN_OVERLAP,
    alpha: float = 3.0,
) -> BandValidity:
    """Classify bands of one subsystem by mode count and modal overlap.

    Parameters
    ----------
    f : float or array_like
        Band centre frequencies [Hz].
    modal_density : float or array_like
        n(f) per band [modes/Hz].
    bandwidth : float or array_like
        Bandwidths [Hz].
    loss_factor : float or array_like
        Total loss factor per band [-].
    min_modes : float, optional
        Minimum modes per band for a confident SEA estimate (default 5; common practice,
        with 3 as a bare minimum and 10 for confident predictions).
    min_overlap : float, optional
        Minimum modal overlap (default 1; Fahy & Mohammed 1992, from memory).
    alpha : float, optional
        Mode-shape kurtosis for :func:`relative_variance_goe` (default 3).

    Returns
    -------
    BandValidity
        Indicators and flags with the broadcast shape of the inputs.

    References
    ----------
    .. [1] Fahy, F.J., Mohammed, A.D. (1992). J. Sound Vib. 158(1), 45-67 (from memory).
    .. [2] Langley, R.S., Brown, A.W.M. (2004). J. Sound Vib. 275, 823-846 (from memory).
    """
    fr = _positive("f", f)
    n_band = modes_in_band(modal_density, bandwidth)
    m = modal_overlap(fr, modal_density, loss_factor)
    shape = np.broadcast_shapes(fr.shape, n_band.shape, m.shape)
    fr = np.array(np.broadcast_to(fr, shape), dtype=np.float64)
    n_band = np.array(np.broadcast_to(n_band, shape), dtype=np.float64)
    m = np.array(np.broadcast_to(m, shape), dtype=np.float64)
    with np.errstate(divide="ignore", invalid="ignore"):
        r2 = np.where(m > 0, relative_variance_goe(np.where(m > 0, m, 1.0), alpha=alpha), np.inf)
    std = level_spread_db(np.where(np.isfinite(r2), r2, 0.0))
    std = np.where(np.isfinite(r2), std, np.inf)
    few = n_band < min_modes
    low = m < min_overlap
    return BandValidity(
        f=fr,
        modes_in_band=n_band,
        modal_overlap=m,
        relative_variance=np.asarray(r2, dtype=np.float64),
        level_std_db=np.asarray(std, dtype=np.float64),
        very_few_modes=np.asarray(n_band < 1.0),
        few_modes=np.asarray(few),
        low_overlap=np.asarray(low),
        ok=np.asarray(~few & ~low),
    )


def validity_message(
    n_modes: float,
    overlap: float,
    std_db: float,
    *,
    min_modes: float = MIN_MODES,
    min_overlap: float = MIN_OVERLAP,
    spread: str | None = None,
) -> str:
    """Short plain-words assessment of one band.

    Parameters
    ----------
    n_modes : float
        Modes in band N.
    overlap : float
        Modal overlap M.
    std_db : float
        Level standard deviation [dB] (:func:`level_spread_db`).
    min_modes, min_overlap : float, optional
        Thresholds as in :func:`assess_bands`.
    spread : str, optional
        Words on the spread to use instead of the single-frequency ``std_db`` (e.g. the
        band-level spread of :func:`seatool.physics.variance.relative_variance_band`).

    Returns
    -------
    str
        E.g. "1.3 modes per band, modal overlap 0.13: too few modes; expect +-5.6 dB or
        worse (1 standard deviation, single-frequency estimate)".
    """
    head = f"{n_modes:.3g} modes per band, modal overlap {overlap:.2g}"
    problems = []
    if n_modes < 1.0:
        problems.append("fewer than one mode per band, SEA gives only a rough average")
    elif n_modes < min_modes:
        problems.append("too few modes")
    if overlap < min_overlap:
        problems.append("modal overlap below 1, response dominated by single modes")
    if spread is not None:
        tail = spread
    elif not np.isfinite(std_db):
        tail = "spread unknown (1 standard deviation, single-frequency estimate)"
    else:
        worse = " or worse" if problems else ""
        tail = f"expect +-{std_db:.1f} dB{worse} (1 standard deviation, single-frequency estimate)"
    if not problems:
        return f"{head}: SEA conditions met; {tail}"
    return f"{head}: {'; '.join(problems)}; {tail}"
