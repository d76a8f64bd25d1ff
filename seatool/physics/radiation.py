"""Radiation efficiency of baffled rectangular panels vibrating in resonant bending waves.

All functions are pure and broadcast with numpy over frequency bands. The radiation efficiency
``sigma`` is one-sided: ``W_rad = rho0 c0 S <v^2> sigma`` for one face of the panel radiating
into a half-space (panel in an infinite rigid baffle).

Contents
--------
* :func:`radiation_efficiency_leppington` -- Leppington, Broadbent & Heron (1982), simply
  supported edges (the project default for plate -> cavity coupling) or, with
  ``edges="clamped"``, the edge-mode radiation doubled below coincidence.
* :func:`radiation_efficiency_maidanik` -- Maidanik (1962) with the later corrections; the
  corner-mode multiplier is an explicit parameter.
* :func:`radiation_efficiency_en12354` and :func:`forced_radiation_efficiency_en12354` --
  EN ISO 12354-1 Annex B free-wave and forced-wave radiation factors.
* :func:`radiation_efficiency_band` -- band average of any of the three single-frequency
  formulas (uniform average over frequency, the equal-weight mode average of a plate whose
  modal density does not depend on frequency).
* :func:`radiation_efficiency_curved_panel` -- curved panel / cylinder, band-averaged:
  Szechenyi's (1971) statistical mode count in wavenumber space with modal radiation
  efficiencies by mode class (acoustically fast, edge, corner).
* :func:`modal_radiation_efficiency_wallace` -- Wallace (1972) radiation efficiency of a single
  (m, n) mode of a simply supported panel by numerical double integration; an independent
  numerical reference for the statistical formulas.

Notation: ``l1, l2`` panel side lengths [m]; ``f_c`` critical (coincidence) frequency [Hz];
``c0`` speed of sound in the fluid [m/s]; ``k = 2 pi f / c0`` acoustic wavenumber [rad/m].
"""

from __future__ import annotations

import math
from collections.abc import Callable
from typing import Literal

import numpy as np
import numpy.typing as npt

from ._checks import positive as _positive

__all__ = [
    "EdgeCondition",
    "RadiationMethod",
    "forced_radiation_efficiency_en12354",
    "modal_radiation_efficiency_wallace",
    "radiation_efficiency",
    "radiation_efficiency_band",
    "radiation_efficiency_curved_panel",
    "radiation_efficiency_en12354",
    "radiation_efficiency_leppington",
    "radiation_efficiency_maidanik",
]

FloatArray = npt.NDArray[np.float64]

#: Names of the single-frequency resonant radiation formulas.
RadiationMethod = Literal["leppington", "maidanik", "en12354"]

#: Edge conditions of the panel offered by the ``edges`` option.
EdgeCondition = Literal["simply_supported", "clamped"]

#: Multiplier of the edge-mode radiation below coincidence for each edge condition
#: (Maidanik 1962; Leppington, Broadbent & Heron 1982; see radiation_efficiency_leppington).
_EDGE_FACTORS = {"simply_supported": 1.0, "clamped": 2.0}

_C0_DEFAULT = 343.0


# --------------------------------------------------------------------------------------------
# input checks and private helpers
# --------------------------------------------------------------------------------------------


def _wavenumber(f: FloatArray, c0: float) -> FloatArray:
    out: FloatArray = 2.0 * np.pi * f / c0
    return out


def _above_coincidence(f: FloatArray, f_c: FloatArray) -> FloatArray:
    """(1 - f_c/f)^(-1/2) for f > f_c, inf elsewhere (infinite-panel free-wave value)."""
    ratio = np.where(f > f_c, f_c / f, 1.0)
    with np.errstate(divide="ignore"):
        out: FloatArray = np.where(f > f_c, 1.0 / np.sqrt(1.0 - ratio), np.inf)
    return out


def _edge_mode_term(
    f: FloatArray, l1: FloatArray, l2: FloatArray, f_c: FloatArray, c0: float
) -> FloatArray:
    """Edge-mode term (P lambda_c / S) g2(alpha) for f < f_c, inf elsewhere."""
    below = f < f_c
    alpha = np.where(below, np.sqrt(np.where(below, f / f_c, 0.25)), 0.5)
    one_m = 1.0 - alpha**2
    g2 = (one_m * np.log((1.0 + alpha) / (1.0 - alpha)) + 2.0 * alpha) / (
        4.0 * np.pi**2 * one_m**1.5
    )
    perimeter = 2.0 * (l1 + l2)
    lam_c = c0 / f_c
    out: FloatArray = np.where(below, perimeter * lam_c / (l1 * l2) * g2, np.inf)
    return out


def _corner_mode_term(
    f: FloatArray, l1: FloatArray, l2: FloatArray, f_c: FloatArray, c0: float
) -> FloatArray:
    """Corner-mode term (lambda_c^2 / S) g1(alpha) for f < f_c/2, zero elsewhere."""
    below = f < 0.5 * f_c
    alpha = np.sqrt(np.where(below, f / f_c, 0.25))
    g1 = np.where(
        below, (4.0 / np.pi**4) * (1.0 - 2.0 * alpha**2) / (alpha * np.sqrt(1.0 - alpha**2)), 0.0
    )
    lam_c = c0 / f_c
    out: FloatArray = lam_c**2 / (l1 * l2) * g1
    return out


def _edge_factor(edges: str) -> float:
    if edges not in _EDGE_FACTORS:
        msg = f"edges must be one of {sorted(_EDGE_FACTORS)}, got {edges!r}"
        raise ValueError(msg)
    return _EDGE_FACTORS[edges]


def _check_common(
    f: npt.ArrayLike, l1: npt.ArrayLike, l2: npt.ArrayLike, f_c: npt.ArrayLike, c0: float
) -> tuple[FloatArray, ...]:
    f_arr = _positive("f", f)
    l1_arr = _positive("l1", l1)
    l2_arr = _positive("l2", l2)
    fc_arr = _positive("f_c", f_c)
    _positive("c0", c0)
    return np.broadcast_arrays(f_arr, l1_arr, l2_arr, fc_arr)


# --------------------------------------------------------------------------------------------
# single-frequency formulas
# --------------------------------------------------------------------------------------------


def radiation_efficiency_leppington(
    f: npt.ArrayLike,
    l1: npt.ArrayLike,
    l2: npt.ArrayLike,
    f_c: npt.ArrayLike,
    *,
    c0: float = _C0_DEFAULT,
    edges: EdgeCondition = "simply_supported",
) -> FloatArray:
    """Resonant radiation efficiency of a baffled panel (Leppington et al.).

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    l1, l2 : float or array_like
        Panel side lengths [m].
    f_c : float or array_like
        Critical (coincidence) frequency of the panel [Hz].
    c0 : float, optional
        Speed of sound in the fluid [m/s].
    edges : {"simply_supported", "clamped"}, optional
        Edge condition. ``"clamped"`` doubles the below-coincidence value (see Notes); the
        coincidence limit and the value above coincidence do not change.

    Returns
    -------
    numpy.ndarray
        One-sided radiation efficiency [-], shape of the broadcast inputs.

    Notes
    -----
    With ``mu = sqrt(f_c/f) = k_B/k`` (Leppington, Broadbent & Heron 1982; the form quoted by
    most later texts, from memory):

    * below coincidence (mu > 1)::

        sigma = (l1 + l2) / (pi mu k l1 l2 sqrt(mu^2 - 1))
                * [ ln((mu + 1)/(mu - 1)) + 2 mu / (mu^2 - 1) ]

      which is algebraically the edge-mode term of Maidanik's formula (no corner-mode term);
    * above coincidence (mu < 1): ``sigma = (1 - mu^2)^(-1/2)``;
    * near coincidence both expressions diverge. The result is limited to the coincidence
      value ``sigma_c = (0.5 - 0.15 L1/L2) sqrt(k L1)`` with ``L1 = min(l1, l2)``,
      ``L2 = max(l1, l2)`` (Leppington et al. 1982, from memory, low confidence in the
      constants). For a square panel ``sigma_c`` equals the EN ISO 12354-1 value
      ``sqrt(k (l1 + l2)/16)`` within 1.1 %.

    Valid for resonant bending waves of a panel with many modes in the band; well below the
    first panel mode the panel response is not resonant and the formula does not apply.

    Clamped edges (``edges="clamped"``): below coincidence the radiation of a clamped panel
    is about twice that of a simply supported one (Maidanik 1962 as corrected; Leppington
    et al. 1982 give a clamped-edge result; Beranek & Ver 1992, ch. 9 -- all from memory),
    so the below-coincidence expression is multiplied by 2; the coincidence limit and the
    above-coincidence value are unchanged. An independent numerical check (band averages of
    clamped beam-function plate modes by the wavenumber-domain Rayleigh integral,
    ``tests/physics/test_radiation_edges.py``) gives clamped/simply supported ratios of
    1.86 ... 2.03 for f/f_c = 0.01 ... 0.08, falling to about 1.88 at f/f_c = 0.17: the
    constant 2 over-estimates somewhat as coincidence is approached.

    References
    ----------
    .. [1] Leppington, F.G., Broadbent, E.G., Heron, K.H. (1982). "The acoustic radiation
       efficiency of rectangular panels." Proc. R. Soc. Lond. A 382, 245-271.
       doi:10.1098/rspa.1982.0100
    .. [2] Maidanik, G. (1962). "Response of ribbed panels to reverberant acoustic fields."
       J. Acoust. Soc. Am. 34(6), 809-826. doi:10.1121/1.1918203 (clamped edges: factor 2)
    .. [3] Beranek, L.L., Ver, I.L. (eds.) (1992). Noise and Vibration Control Engineering.
       Wiley, ch. 9 (sound radiation from structures).
    """
    factor = _edge_factor(edges)
    f_a, l1_a, l2_a, fc_a = _check_common(f, l1, l2, f_c, c0)
    k = _wavenumber(f_a, c0)
    below = f_a < fc_a
    mu = np.sqrt(np.where(below, fc_a / f_a, 4.0))
    with np.errstate(divide="ignore", invalid="ignore"):
        low = (
            factor
            * (l1_a + l2_a)
            / (np.pi * mu * k * l1_a * l2_a * np.sqrt(mu**2 - 1.0))
            * (np.log((mu + 1.0) / (mu - 1.0)) + 2.0 * mu / (mu**2 - 1.0))
        )
    sigma = np.where(below, low, _above_coincidence(f_a, fc_a))
    short = np.minimum(l1_a, l2_a)
    long_ = np.maximum(l1_a, l2_a)
    cap = (0.5 - 0.15 * short / long_) * np.sqrt(k * short)
    out: FloatArray = np.minimum(sigma, cap)
    return out


def radiation_efficiency_maidanik(
    f: npt.ArrayLike,
    l1: npt.ArrayLike,
    l2: npt.ArrayLike,
    f_c: npt.ArrayLike,
    *,
    c0: float = _C0_DEFAULT,
    corner_factor: float = 1.0,
    edges: EdgeCondition = "simply_supported",
) -> FloatArray:
    """Resonant radiation efficiency of a baffled panel after Maidanik, with later corrections.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    l1, l2 : float or array_like
        Panel side lengths [m].
    f_c : float or array_like
        Critical (coincidence) frequency [Hz].
    c0 : float, optional
        Speed of sound [m/s].
    corner_factor : float, optional
        Multiplier ``C_corner`` of the corner-mode term [-]. Texts print 1 (default here) or 2
        (the value implied by EN ISO 12354-1 Annex B); 0 gives the edge-mode term alone, which
        equals Leppington's formula below coincidence.
    edges : {"simply_supported", "clamped"}, optional
        Edge condition. ``"clamped"`` doubles the edge-mode term ``C_edge = 2`` (Maidanik
        1962, from memory); the corner-mode term, the coincidence limit and the value above
        coincidence do not change.

    Returns
    -------
    numpy.ndarray
        One-sided radiation efficiency [-].

    Notes
    -----
    With ``alpha = sqrt(f/f_c)``, ``lambda_c = c0/f_c``, ``P = 2 (l1 + l2)``, ``S = l1 l2``::

        f < f_c:  sigma = C_edge (P lambda_c / S) g2(alpha) + C_corner (lambda_c^2 / S) g1(alpha)
        g1 = (4/pi^4) (1 - 2 alpha^2) / (alpha sqrt(1 - alpha^2))   (f < f_c/2; else 0)
        g2 = [(1 - alpha^2) ln((1 + alpha)/(1 - alpha)) + 2 alpha] / (4 pi^2 (1 - alpha^2)^1.5)
        f = f_c:  sigma_c = sqrt(l1/lambda_c) + sqrt(l2/lambda_c)
        f > f_c:  sigma = (1 - f_c/f)^(-1/2)

    The single-frequency value is limited to ``sigma_c`` around coincidence, where the
    branches diverge. Formulas as quoted in later texts (from memory). ``C_edge = 1`` for
    simply supported and 2 for clamped edges (see :func:`radiation_efficiency_leppington`).
    No clamped-edge multiplier of the corner-mode term is applied: none is stated in the
    sources as recalled (set ``corner_factor`` if one is wanted).

    References
    ----------
    .. [1] Maidanik, G. (1962). "Response of ribbed panels to reverberant acoustic fields."
       J. Acoust. Soc. Am. 34(6), 809-826. doi:10.1121/1.1918203
    .. [2] Crocker, M.J., Price, A.J. (1969). "Sound transmission using statistical energy
       analysis." J. Sound Vib. 9(3), 469-486. doi:10.1016/0022-460X(69)90185-0
    """
    if not math.isfinite(corner_factor) or corner_factor < 0.0:
        msg = f"corner_factor must be finite and >= 0, got {corner_factor!r}"
        raise ValueError(msg)
    edge_factor = _edge_factor(edges)
    f_a, l1_a, l2_a, fc_a = _check_common(f, l1, l2, f_c, c0)
    below = f_a < fc_a
    edge = edge_factor * _edge_mode_term(f_a, l1_a, l2_a, fc_a, c0)
    corner = _corner_mode_term(f_a, l1_a, l2_a, fc_a, c0)
    sigma = np.where(below, edge + corner_factor * corner, _above_coincidence(f_a, fc_a))
    lam_c = c0 / fc_a
    cap = np.sqrt(l1_a / lam_c) + np.sqrt(l2_a / lam_c)
    out: FloatArray = np.minimum(sigma, cap)
    return out


def radiation_efficiency_en12354(
    f: npt.ArrayLike,
    l1: npt.ArrayLike,
    l2: npt.ArrayLike,
    f_c: npt.ArrayLike,
    *,
    c0: float = _C0_DEFAULT,
) -> FloatArray:
    """Radiation factor for free bending waves, EN ISO 12354-1 Annex B.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    l1, l2 : float or array_like
        Panel side lengths [m].
    f_c : float or array_like
        Critical frequency [Hz].
    c0 : float, optional
        Speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        One-sided radiation factor [-], at most 2.

    Notes
    -----
    As recalled from EN 12354-1:2000 Annex B (from memory; a 2025 critique reports errors and
    ambiguities in this annex, so this function is an option, not the default)::

        f11 = c0^2/(4 f_c) (1/l1^2 + 1/l2^2)
        sigma1 = (1 - f_c/f)^(-1/2);  sigma2 = 4 l1 l2 (f/c0)^2;  sigma3 = sqrt(2 pi f (l1+l2)/(16 c0))
        delta1 = [(1 - lam^2) ln((1+lam)/(1-lam)) + 2 lam] / (4 pi^2 (1 - lam^2)^1.5),  lam = sqrt(f/f_c)
        delta2 = 8 c0^2 (1 - 2 lam^2) / (f_c^2 pi^4 l1 l2 lam sqrt(1 - lam^2))  (f < f_c/2, else 0)
        f11 <= f_c/2:  f >= f_c: sigma1;  f < f_c: 2 (l1+l2) c0/(l1 l2 f_c) delta1 + delta2,
                       replaced by sigma2 when f < f11 and it exceeds sigma2
        f11 >  f_c/2:  sigma2 (f < f_c, sigma2 < sigma3), sigma1 (f > f_c, sigma1 < sigma3),
                       else sigma3
        sigma <= 2

    Near coincidence (``f11 <= f_c/2``) the branches diverge; as in the other formulas of this
    module the value is limited to ``sigma3`` there (interpretation of the standard's
    "f ~ f_c: sigma = sigma3" rule).

    The first term equals Maidanik's edge-mode term and ``delta2`` is Maidanik's corner-mode
    term with ``C_corner = 2``.

    References
    ----------
    .. [1] EN ISO 12354-1:2017, Building acoustics -- Estimation of acoustic performance of
       buildings from the performance of elements -- Part 1: Airborne sound insulation
       between rooms, Annex B (formerly EN 12354-1:2000 Annex B).
    """
    f_a, l1_a, l2_a, fc_a = _check_common(f, l1, l2, f_c, c0)
    f11 = c0**2 / (4.0 * fc_a) * (1.0 / l1_a**2 + 1.0 / l2_a**2)
    sigma1 = _above_coincidence(f_a, fc_a)
    sigma2 = 4.0 * l1_a * l2_a * (f_a / c0) ** 2
    sigma3 = np.sqrt(2.0 * np.pi * f_a * (l1_a + l2_a) / (16.0 * c0))
    below = f_a < fc_a
    low = _edge_mode_term(f_a, l1_a, l2_a, fc_a, c0) + 2.0 * _corner_mode_term(
        f_a, l1_a, l2_a, fc_a, c0
    )
    low = np.where((f_a < f11) & (f11 < 0.5 * fc_a) & (low > sigma2), sigma2, low)
    case_a = np.minimum(np.where(below, low, sigma1), sigma3)
    case_b = np.where(
        below & (sigma2 < sigma3), sigma2, np.where(~below & (sigma1 < sigma3), sigma1, sigma3)
    )
    sigma = np.where(f11 <= 0.5 * fc_a, case_a, case_b)
    out: FloatArray = np.minimum(sigma, 2.0)
    return out


def forced_radiation_efficiency_en12354(
    f: npt.ArrayLike,
    l1: npt.ArrayLike,
    l2: npt.ArrayLike,
    *,
    c0: float = _C0_DEFAULT,
) -> FloatArray:
    """Radiation factor for forced (non-resonant) bending waves, EN ISO 12354-1 Annex B.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    l1, l2 : float or array_like
        Panel side lengths [m] (order does not matter).
    c0 : float, optional
        Speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        Forced-wave radiation factor ``sigma_f`` [-], at most 2.

    Notes
    -----
    With ``l1 >= l2`` and ``k0 = 2 pi f / c0`` (EN 12354-1:2000 Annex B, from memory)::

        Lambda = -0.964 - (0.5 + l2/(pi l1)) ln(l2/l1) + 5 l2/(2 pi l1) - 1/(4 pi l1 l2 k0^2)
        sigma_f = 0.5 (ln(k0 sqrt(l1 l2)) - Lambda),   sigma_f <= 2

    Validity: ``k0 sqrt(l1 l2) >~ 1``. Below ``k0 sqrt(l1 l2) ~ 0.4`` the last term of
    ``Lambda`` makes ``sigma_f`` rise again as ``f -> 0``, which is not physical (a small
    panel radiates forced waves like a piston, ``sigma -> 0``); such panels are outside the
    range of SEA anyway.

    The finite-panel forced radiation follows Sewell (1970); it enters the non-resonant
    transmission coefficient of :func:`seatool.physics.transmission.transmission_nonresonant`.

    References
    ----------
    .. [1] EN ISO 12354-1:2017, Annex B (formerly EN 12354-1:2000 Annex B).
    .. [2] Sewell, E.C. (1970). "Transmission of reverberant sound through a single-leaf
       partition surrounded by an infinite rigid baffle." J. Sound Vib. 12(1), 21-32.
       doi:10.1016/0022-460X(70)90046-5
    """
    f_a = _positive("f", f)
    a = _positive("l1", l1)
    b = _positive("l2", l2)
    _positive("c0", c0)
    f_a, a, b = np.broadcast_arrays(f_a, a, b)
    long_ = np.maximum(a, b)
    short = np.minimum(a, b)
    k0 = _wavenumber(f_a, c0)
    lam = (
        -0.964
        - (0.5 + short / (np.pi * long_)) * np.log(short / long_)
        + 5.0 * short / (2.0 * np.pi * long_)
        - 1.0 / (4.0 * np.pi * long_ * short * k0**2)
    )
    sigma_f = 0.5 * (np.log(k0 * np.sqrt(long_ * short)) - lam)
    out: FloatArray = np.minimum(sigma_f, 2.0)
    return out


_METHODS: dict[str, Callable[..., FloatArray]] = {
    "leppington": radiation_efficiency_leppington,
    "maidanik": radiation_efficiency_maidanik,
    "en12354": radiation_efficiency_en12354,
}


def radiation_efficiency(
    f: npt.ArrayLike,
    l1: npt.ArrayLike,
    l2: npt.ArrayLike,
    f_c: npt.ArrayLike,
    *,
    method: RadiationMethod = "leppington",
    c0: float = _C0_DEFAULT,
    corner_factor: float = 1.0,
    edges: EdgeCondition = "simply_supported",
) -> FloatArray:
    """Single-frequency resonant radiation efficiency by the named method.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    l1, l2 : float or array_like
        Panel side lengths [m].
    f_c : float or array_like
        Critical frequency [Hz].
    method : {"leppington", "maidanik", "en12354"}, optional
        Formula: :func:`radiation_efficiency_leppington` (default, see the theory page for
        why), :func:`radiation_efficiency_maidanik` or :func:`radiation_efficiency_en12354`.
    c0 : float, optional
        Speed of sound [m/s].
    corner_factor : float, optional
        Corner-mode multiplier, used by ``method="maidanik"`` only.
    edges : {"simply_supported", "clamped"}, optional
        Edge condition, for ``method="leppington"`` and ``"maidanik"``; EN ISO 12354-1
        Annex B has no edge-condition option, so ``"clamped"`` with ``"en12354"`` raises.

    Returns
    -------
    numpy.ndarray
        One-sided radiation efficiency [-].

    References
    ----------
    See the functions named under ``method``.
    """
    if method not in _METHODS:
        msg = f"method must be one of {sorted(_METHODS)}, got {method!r}"
        raise ValueError(msg)
    _edge_factor(edges)
    if method == "maidanik":
        return radiation_efficiency_maidanik(
            f, l1, l2, f_c, c0=c0, corner_factor=corner_factor, edges=edges
        )
    if method == "leppington":
        return radiation_efficiency_leppington(f, l1, l2, f_c, c0=c0, edges=edges)
    if edges != "simply_supported":
        msg = f"edges={edges!r} is not available for method {method!r}"
        raise ValueError(msg)
    return _METHODS[method](f, l1, l2, f_c, c0=c0)


# --------------------------------------------------------------------------------------------
# band average
# --------------------------------------------------------------------------------------------


def radiation_efficiency_band(
    f: npt.ArrayLike,
    l1: npt.ArrayLike,
    l2: npt.ArrayLike,
    f_c: npt.ArrayLike,
    *,
    method: RadiationMethod = "leppington",
    bands_per_octave: float = 3.0,
    f_lower: npt.ArrayLike | None = None,
    f_upper: npt.ArrayLike | None = None,
    weighting: Literal["linear", "log"] = "linear",
    c0: float = _C0_DEFAULT,
    corner_factor: float = 1.0,
    n_points: int = 48,
    edges: EdgeCondition = "simply_supported",
) -> FloatArray:
    """Band-averaged resonant radiation efficiency.

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz] (exact mid-band frequency).
    l1, l2 : float or array_like
        Panel side lengths [m].
    f_c : float or array_like
        Critical frequency [Hz].
    method : {"leppington", "maidanik", "en12354"}, optional
        Single-frequency formula averaged (see :func:`radiation_efficiency`).
    bands_per_octave : float, optional
        ``b`` of the 1/b-octave band; edges ``f G^(-1/(2b))``, ``f G^(1/(2b))`` with the base-10
        octave ratio ``G = 10^(3/10)`` (IEC 61260-1). Ignored when both edges are given.
    f_lower, f_upper : float or array_like, optional
        Explicit band edges [Hz]; override ``bands_per_octave``.
    weighting : {"linear", "log"}, optional
        ``"linear"`` (default): uniform average over frequency in the band. A flat plate has a
        frequency-independent modal density, so its resonant modes are spread uniformly in
        frequency and this is the equal-weight average over the modes of the band (SEA
        equipartition). ``"log"``: uniform in ``ln f``.
    c0 : float, optional
        Speed of sound [m/s].
    corner_factor : float, optional
        Corner-mode multiplier for ``method="maidanik"``.
    n_points : int, optional
        Gauss-Legendre nodes per sub-interval (the band is split at ``f_c``).
    edges : {"simply_supported", "clamped"}, optional
        Edge condition passed to :func:`radiation_efficiency`.

    Returns
    -------
    numpy.ndarray
        Band-averaged one-sided radiation efficiency [-].

    Notes
    -----
    ``sigma_band = (1/(f_u - f_l)) integral_{f_l}^{f_u} sigma(f') df'`` (linear weighting).
    The single-frequency formulas diverge at ``f_c`` (below-coincidence branch like
    ``(mu^2 - 1)^(-3/2)``, which is not integrable); the coincidence limit built into each
    formula keeps the integral finite. The band containing ``f_c`` therefore depends on that
    limit; the other bands do not.

    References
    ----------
    .. [1] IEC 61260-1:2014, Electroacoustics -- Octave-band and fractional-octave-band
       filters -- Part 1: Specifications (band edges).
    .. [2] Leppington, F.G., Broadbent, E.G., Heron, K.H. (1982). Proc. R. Soc. Lond. A 382,
       245-271 (default formula).
    """
    if method not in _METHODS:
        msg = f"method must be one of {sorted(_METHODS)}, got {method!r}"
        raise ValueError(msg)
    if weighting not in ("linear", "log"):
        msg = f"weighting must be 'linear' or 'log', got {weighting!r}"
        raise ValueError(msg)
    if n_points < 2:
        msg = f"n_points must be >= 2, got {n_points!r}"
        raise ValueError(msg)
    _edge_factor(edges)
    if method == "en12354" and edges != "simply_supported":
        msg = f"edges={edges!r} is not available for method {method!r}"
        raise ValueError(msg)
    f_a = _positive("f", f)
    fc_a = _positive("f_c", f_c)
    l1_a = _positive("l1", l1)
    l2_a = _positive("l2", l2)
    if f_lower is not None and f_upper is not None:
        lo = _positive("f_lower", f_lower)
        hi = _positive("f_upper", f_upper)
    else:
        b = _positive("bands_per_octave", bands_per_octave)
        ratio = 10.0 ** (0.3 / (2.0 * b))
        lo = f_a / ratio
        hi = f_a * ratio
    f_a, lo, hi, fc_a, l1_a, l2_a = np.broadcast_arrays(f_a, lo, hi, fc_a, l1_a, l2_a)
    if np.any(hi <= lo):
        msg = "f_upper must be greater than f_lower"
        raise ValueError(msg)

    x, w = np.polynomial.legendre.leggauss(n_points)
    if weighting == "linear":
        to_var, from_var = (lambda v: v), (lambda v: v)
    else:
        to_var, from_var = np.log, np.exp
    a = to_var(lo)[..., None]
    c = to_var(hi)[..., None]
    m = to_var(np.clip(fc_a, lo, hi))[..., None]
    total = np.zeros(f_a.shape, dtype=np.float64)
    for s0, s1 in ((a, m), (m, c)):
        half = 0.5 * (s1 - s0)
        nodes = 0.5 * (s1 + s0) + half * x
        fn = from_var(nodes)
        sig = radiation_efficiency(
            fn,
            l1_a[..., None],
            l2_a[..., None],
            fc_a[..., None],
            method=method,
            c0=c0,
            corner_factor=corner_factor,
            edges=edges,
        )
        sig = np.where(half > 0.0, sig, 0.0)
        total = total + np.sum(sig * w * half, axis=-1)
    out: FloatArray = total / (to_var(hi) - to_var(lo))
    return out


# --------------------------------------------------------------------------------------------
# curved panels
# --------------------------------------------------------------------------------------------


def _quadratic_roots(b: FloatArray, c: FloatArray) -> tuple[FloatArray, FloatArray]:
    """Real roots of s^2 - b s + c = 0 (NaN where they are complex)."""
    disc = b * b - 4.0 * c
    sq = np.sqrt(np.where(disc >= 0.0, disc, np.nan))
    return 0.5 * (b - sq), 0.5 * (b + sq)


def _locus_breaks(w: FloatArray, wc: float | FloatArray, wm: FloatArray) -> list[FloatArray]:
    """cos^2(phi) on the shell locus omega = w where k_p = k, k_x = k or k_y = k (NaN: none).

    With v = cos^2 phi, r = omega_m/omega and eps = (omega/omega_c)^2 = (k/k_c)^2 the locus is
    k_p^4 = k_c^2 k^2 (1 - r^2 v^2), so k_p = k at r^2 v^2 = 1 - eps; k_x = k where
    (1 - r^2 v^2) v^2 = eps (two roots); k_y = k where (1 - r^2 v^2)(1 - v)^2 = eps (one root
    for eps < 1, left-hand side decreasing in v; bisection).
    """
    eps = (w / wc) ** 2
    r2 = (wm / w) ** 2
    with np.errstate(divide="ignore", invalid="ignore"):
        v_kp = np.sqrt((1.0 - eps) / r2)
        disc = 1.0 - 4.0 * r2 * eps
        sq = np.sqrt(np.where(disc >= 0.0, disc, np.nan))
        v_kx1 = np.sqrt(2.0 * eps / (1.0 + sq))
        v_kx2 = np.sqrt((1.0 + sq) / (2.0 * r2))
    lo = np.zeros_like(w)
    hi = np.minimum(1.0, 1.0 / np.sqrt(r2))
    for _ in range(60):
        mid = 0.5 * (lo + hi)
        above = (1.0 - r2 * mid**2) * (1.0 - mid) ** 2 > eps
        lo = np.where(above, mid, lo)
        hi = np.where(above, hi, mid)
    v_ky = np.where(eps < 1.0, 0.5 * (lo + hi), np.nan)
    return [v_kp, v_kx1, v_kx2, v_ky]


def _mode_class_sigma(
    s: FloatArray,
    c2: FloatArray,
    k: FloatArray,
    l1: FloatArray,
    l2: FloatArray,
    cap: FloatArray,
    closed: bool,
) -> FloatArray:
    """Capped modal sigma of a mode with k_p^2 = s, cos^2(phi) = c2 at acoustic wavenumber k."""
    k2 = k * k
    kx2 = s * c2
    ky2 = s - kx2
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        fast = k / np.sqrt(k2 - s)
        ex = (s - k2) ** 1.5
        edge_y = k * (2.0 * ky2 - (k2 - kx2)) / (l2 * np.sqrt(ky2) * ex)
        edge_x = k * (2.0 * kx2 - (k2 - ky2)) / (l1 * np.sqrt(kx2) * ex)
    edge = np.where(ky2 < k2, edge_x, 0.0)
    if not closed:
        edge = edge + np.where(kx2 < k2, edge_y, 0.0)
    sigma = np.where(s < k2, fast, edge)
    sigma = np.where(np.isfinite(sigma), sigma, np.inf)
    out: FloatArray = np.minimum(sigma, cap)
    return out


def radiation_efficiency_curved_panel(
    f: npt.ArrayLike,
    l1: npt.ArrayLike,
    l2: npt.ArrayLike,
    f_c: npt.ArrayLike,
    radius: npt.ArrayLike,
    *,
    longitudinal_speed: npt.ArrayLike,
    poisson_ratio: float = 0.3,
    closed: bool = False,
    bands_per_octave: float = 3.0,
    f_lower: npt.ArrayLike | None = None,
    f_upper: npt.ArrayLike | None = None,
    c0: float = _C0_DEFAULT,
    n_angle: int = 24,
    n_wavenumber: int = 12,
) -> FloatArray:
    """Band-averaged resonant radiation efficiency of a curved panel or cylinder (Szechenyi).

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    l1 : float or array_like
        Axial (straight) side length of the panel [m]; the cylinder length.
    l2 : float or array_like
        Developed (arc) length of the curved side [m]; ``2 pi radius`` for a closed cylinder.
    f_c : float or array_like
        Critical frequency of the flat panel of the same wall in this fluid [Hz]
        (``c0^2/(2 pi) sqrt(m''/D)``).
    radius : float or array_like
        Radius of curvature a [m].
    longitudinal_speed : float or array_like
        Quasi-longitudinal plate speed c_L' = sqrt(E/(rho (1 - nu^2))) of the wall [m/s]. For a
        wall carrying non-structural mass (a treatment), pass ``c_L' sqrt(rho h / m'')`` so that
        the membrane stiffness is divided by the same mass per area as ``f_c``.
    poisson_ratio : float, optional
        Poisson's ratio nu of the wall [-].
    closed : bool, optional
        True for a closed cylinder: the circumferential direction is periodic, so there are no
        straight edges along the axis and the edge-mode class radiating from them is absent.
    bands_per_octave : float, optional
        ``b`` of the 1/b-octave band around ``f`` (IEC 61260-1 base 10); ignored when both
        edges are given.
    f_lower, f_upper : float or array_like, optional
        Explicit band edges [Hz].
    c0 : float, optional
        Speed of sound [m/s].
    n_angle, n_wavenumber : int, optional
        Gauss-Legendre nodes per angular sub-interval and per wavenumber sub-interval.

    Returns
    -------
    numpy.ndarray
        Band-averaged one-sided radiation efficiency [-], broadcast shape of the inputs.

    Notes
    -----
    Statistical mode-counting in wavenumber space, the approach of Szechenyi (1971): the band
    value is the equal-weight (SEA equipartition) average over the modes resonant in the band
    of a modal radiation efficiency that depends only on the class of the mode's trace
    wavenumbers relative to the acoustic wavenumber ``k = omega/c0`` at the mode's own
    frequency. What is implemented here (the details of Szechenyi's paper are from memory;
    the modal edge-mode expression was derived here):

    * Modes. A mode has trace wavenumbers ``k_x`` (axial) and ``k_y`` (circumferential),
      ``k_p^2 = k_x^2 + k_y^2``, ``cos phi = k_x/k_p``; modes are spread uniformly over the
      quarter wavenumber plane with density ``S/pi^2`` (simply supported panel; also the
      closed cylinder, sine and cosine modes). Its natural frequency follows Heckl's
      simplified (Donnell-type) flexural dispersion relation of the thin shell, as in
      :func:`seatool.physics.structural.shell_bending_modal_density`::

          m'' omega^2 = D k_p^4 + (E h / a^2) cos^4 phi
          i.e. omega^2 = (c0 / k_c)^2 k_p^4 + omega_m^2 cos^4 phi,
          k_c = 2 pi f_c / c0,  omega_m = 2 pi f_r sqrt(1 - nu^2),  f_r = c_L' / (2 pi a)

      Below ``f_m = omega_m/(2 pi)`` the membrane term lifts modes with small ``k_p`` into the
      band; some of them have ``k_p < k`` (acoustically fast) although the flat panel of the
      same wall is far below coincidence.

    * Modal radiation efficiency, by class (``k`` at the mode's own frequency):

      - acoustically fast, ``k_p < k``: ``sigma = (1 - k_p^2/k^2)^(-1/2)`` (infinite-panel
        value; Maidanik 1962);
      - ``k_p > k``: edge modes,
        ``sigma = [k_x < k] e(k_y, k_x, l2) + [k_y < k] e(k_x, k_y, l1)`` with
        ``e(q, p, l) = k (2 q^2 - (k^2 - p^2)) / (l q (k_p^2 - k^2)^(3/2))``: the power of the
        two subsonic edges of a simply supported mode from its wavenumber transform, with the
        transform's oscillating end term averaged (derived here). Averaged over the flat-panel
        wavenumber circle this gives exactly the below-coincidence formula of Leppington,
        Broadbent & Heron (1982) (= Maidanik's edge-mode term); for ``q >> k`` it is
        ``2 k / (l q^2)``. For a closed cylinder the first term (straight edges along the
        axis) is absent;
      - corner modes (``k_x > k`` and ``k_y > k``): 0, as in Leppington's form (the project's
        Wallace ensemble shows the corner term over-predicts, docs/theory/coupling.md);
      - every modal value is limited to Leppington's coincidence value
        ``sigma_c = (0.5 - 0.15 L1/L2) sqrt(k L1)``, ``L1 = min(l1, l2)``, as in
        :func:`radiation_efficiency_leppington` (the fast and edge values diverge at
        ``k_p = k``).

    * Band average over the band region ``A`` of the wavenumber plane
      (``f_lower <= f(k_x, k_y) < f_upper``)::

          sigma_band = integral_A sigma dk_x dk_y / integral_A dk_x dk_y

      evaluated in polar coordinates (phi, s = k_p^2) by Gauss-Legendre quadrature split at
      the class boundaries, so the class jumps and the onset of the band region are resolved.

    Limits: as ``a -> infinity`` the result is :func:`radiation_efficiency_band` with the
    Leppington formula (the fast class is the above-coincidence value, the edge class averages
    to Leppington's formula, the cap is the same), and far above the ring frequency the
    membrane term is negligible and the flat value is recovered. Validity: thin shell
    (h << a), many modes in the band, panel large compared with the acoustic wavelength; the
    radiation of each mode is that of a flat baffled panel of the developed size (curvature
    of the radiating surface and fluid loading ignored). With few modes per band the
    statistical count misplaces the few low-order modes that dominate the radiation: against
    exact Donnell-Mushtari modes and Wallace's modal integral (tests) the band value is within
    a factor of about 2.5 of the modal average below f_m and about 3.5 times too high in the
    band containing f_m, where the continuum puts acoustically fast modes near the origin of
    the wavenumber plane that the mode lattice does not have.

    References
    ----------
    .. [1] Szechenyi, E. (1971). "Modal densities and radiation efficiencies of unstiffened
       cylinders using statistical methods." J. Sound Vib. 19(1), 65-81.
       doi:10.1016/0022-460X(71)90426-3 (method; details from memory)
    .. [2] Heckl, M. (1962). "Vibrations of point-driven cylindrical shells." J. Acoust. Soc.
       Am. 34(10), 1553-1557 (simplified dispersion relation).
    .. [3] Leppington, F.G., Broadbent, E.G., Heron, K.H. (1982). "The acoustic radiation
       efficiency of rectangular panels." Proc. R. Soc. Lond. A 382, 245-271.
       doi:10.1098/rspa.1982.0100 (edge-mode formula and coincidence limit)
    .. [4] Maidanik, G. (1962). "Response of ribbed panels to reverberant acoustic fields."
       J. Acoust. Soc. Am. 34(6), 809-826. doi:10.1121/1.1918203 (mode classes)
    """
    from . import structural  # local: keeps the import graph of the physics modules flat

    if n_angle < 2 or n_wavenumber < 2:
        msg = f"n_angle and n_wavenumber must be >= 2, got {n_angle!r}, {n_wavenumber!r}"
        raise ValueError(msg)
    nu = float(poisson_ratio)
    if not (-1.0 < nu < 0.5):
        msg = f"poisson_ratio must lie in (-1, 0.5), got {poisson_ratio!r}"
        raise ValueError(msg)
    f_a = _positive("f", f)
    l1_a = _positive("l1", l1)
    l2_a = _positive("l2", l2)
    fc_a = _positive("f_c", f_c)
    a_a = _positive("radius", radius)
    cl_a = _positive("longitudinal_speed", longitudinal_speed)
    _positive("c0", c0)
    if f_lower is not None and f_upper is not None:
        lo = _positive("f_lower", f_lower)
        hi = _positive("f_upper", f_upper)
    else:
        ratio = 10.0 ** (0.3 / (2.0 * float(_positive("bands_per_octave", bands_per_octave))))
        lo, hi = f_a / ratio, f_a * ratio
    fm_a = structural.ring_frequency(a_a, cl_a) * math.sqrt(1.0 - nu**2)
    arrays = np.broadcast_arrays(f_a, lo, hi, l1_a, l2_a, fc_a, fm_a)
    shape = arrays[0].shape
    f_b, lo_b, hi_b, l1_b, l2_b, fc_b, fm_b = (np.ravel(x).astype(np.float64) for x in arrays)
    if np.any(hi_b <= lo_b):
        msg = "f_upper must be greater than f_lower"
        raise ValueError(msg)

    w1, w2 = 2.0 * np.pi * lo_b, 2.0 * np.pi * hi_b
    wc, wm = 2.0 * np.pi * fc_b, 2.0 * np.pi * fm_b
    kc = wc / c0
    short = np.minimum(l1_b, l2_b)
    long_ = np.maximum(l1_b, l2_b)

    # angular sub-intervals: the band region starts where cos^2 phi = omega_2/omega_m, the
    # lower locus where cos^2 phi = omega_1/omega_m; class boundaries meet the band's loci
    def phi_of(v: FloatArray) -> FloatArray:
        return np.arccos(np.sqrt(np.clip(np.nan_to_num(v, nan=1.0), 0.0, 1.0)))

    p_start = phi_of(w2 / wm)
    cands = [phi_of(w1 / wm)]
    for w in (w1, w2):
        cands.extend(phi_of(v) for v in _locus_breaks(w, wc, wm))
    half_pi = np.full_like(p_start, 0.5 * np.pi)
    edges = np.sort(
        np.stack([p_start, *(np.clip(c, p_start, half_pi) for c in cands), half_pi], axis=-1),
        axis=-1,
    )
    xt, wt = np.polynomial.legendre.leggauss(n_angle)
    t = 0.5 * (xt + 1.0)
    # phi = start + width (1 - cos(pi t))/2: clusters the nodes at both ends (square-root
    # onset of the band region and of the class sub-regions)
    tau = 0.5 * (1.0 - np.cos(np.pi * t))
    dtau = 0.25 * np.pi * np.sin(np.pi * t) * wt
    xs, ws = np.polynomial.legendre.leggauss(n_wavenumber)
    us, ws = 0.5 * (xs + 1.0), 0.5 * ws

    col = (slice(None), None)
    num = np.zeros_like(f_b)
    den = np.zeros_like(f_b)
    for j in range(edges.shape[-1] - 1):
        pa, pb = edges[:, j][col], edges[:, j + 1][col]
        phi = pa + (pb - pa) * tau  # (B, n_angle)
        jac = (pb - pa) * dtau
        c2 = np.cos(phi) ** 2
        c4 = c2 * c2
        s1 = (kc[col] / c0) * np.sqrt(np.maximum(w1[col] ** 2 - wm[col] ** 2 * c4, 0.0))
        s2 = (kc[col] / c0) * np.sqrt(np.maximum(w2[col] ** 2 - wm[col] ** 2 * c4, 0.0))
        # along phi, k^2 = s^2/k_c^2 + (omega_m/c0)^2 cos^4 phi; class boundaries in s:
        # s = k^2, s cos^2 phi = k^2, s sin^2 phi = k^2 (quadratics in s)
        kc2 = (kc**2)[col]
        cc = ((wm / c0) ** 2)[col] * c4 * kc2
        roots = [
            *_quadratic_roots(kc2 * np.ones_like(c2), cc),
            *_quadratic_roots(kc2 * c2, cc),
            *_quadratic_roots(kc2 * (1.0 - c2), cc),
        ]
        pts = np.sort(
            np.stack([s1, s2, *(np.clip(np.nan_to_num(r, nan=-1.0), s1, s2) for r in roots)], -1),
            axis=-1,
        )
        sa, sb = pts[..., :-1, None], pts[..., 1:, None]
        s = sa + (sb - sa) * us  # (B, n_angle, 7, n_wavenumber)
        weight = jac[..., None, None] * (sb - sa) * ws
        c2e, c4e = c2[..., None, None], c4[..., None, None]
        e3 = (slice(None), None, None, None)
        k = np.sqrt((s / kc[e3]) ** 2 + (wm[e3] / c0) ** 2 * c4e)
        cap = (0.5 - 0.15 * short[e3] / long_[e3]) * np.sqrt(k * short[e3])
        sigma = _mode_class_sigma(s, c2e, k, l1_b[e3], l2_b[e3], cap, closed)
        num += np.sum(weight * sigma, axis=(1, 2, 3))
        den += np.sum(weight, axis=(1, 2, 3))
    out: FloatArray = (num / den).reshape(shape)
    return out


# --------------------------------------------------------------------------------------------
# Wallace modal radiation efficiency
# --------------------------------------------------------------------------------------------


def _wallace_factor(arg: FloatArray, q: int) -> FloatArray:
    """T_q(arg/2) / ((arg/(q pi))^2 - 1) with its removable singularity at arg = q pi."""
    trig = np.cos if q % 2 == 1 else np.sin
    x = arg / (q * np.pi)
    den = x**2 - 1.0
    near = np.abs(den) < 1e-6
    safe = np.where(near, 1.0, den)
    # limit at x -> 1: |T_q(q pi x/2)| ~ (q pi/2)|x - 1|, den ~ 2 (x - 1) -> (q pi / 4)^2 squared
    limit = q * np.pi / 4.0
    out: FloatArray = np.where(near, limit, trig(0.5 * arg) / safe)
    return out


def modal_radiation_efficiency_wallace(
    f: float,
    m: int,
    n: int,
    a: float,
    b: float,
    *,
    c0: float = _C0_DEFAULT,
    n_theta: int | None = None,
    n_phi: int | None = None,
) -> float:
    """Radiation efficiency of mode (m, n) of a simply supported baffled panel (Wallace 1972).

    Parameters
    ----------
    f : float
        Frequency of vibration [Hz] (for a resonant mode, its natural frequency).
    m, n : int
        Mode indices (half-waves along sides ``a`` and ``b``), >= 1.
    a, b : float
        Panel side lengths [m]; index ``m`` counts along ``a``.
    c0 : float, optional
        Speed of sound [m/s].
    n_theta, n_phi : int, optional
        Gauss-Legendre nodes in the polar and azimuthal angle. The default grows with
        ``k max(a, b)`` and with the mode indices so the lobes of the integrand are resolved.

    Returns
    -------
    float
        One-sided modal radiation efficiency [-], mean-square velocity averaged over the panel.

    Notes
    -----
    Vigran (2008) eqs. 6.46-6.47, after Wallace (1972)::

        sigma_mn = 64 k^2 a b / (pi^6 m^2 n^2) int_0^{pi/2} int_0^{pi/2}
                   { T_m(alpha/2) / ((alpha/(m pi))^2 - 1) * T_n(beta/2) / ((beta/(n pi))^2 - 1) }^2
                   sin(theta) dtheta dphi
        alpha = k a sin(theta) cos(phi),  beta = k b sin(theta) sin(phi)
        T_q = cos for odd q, sin for even q

    The removable singularities at ``alpha = m pi`` and ``beta = n pi`` are replaced by their
    limit ``(q pi / 4)`` of the factor. The integral is evaluated by tensor Gauss-Legendre
    quadrature; it is meant as a numerical reference, not for production loops.

    References
    ----------
    .. [1] Wallace, C.E. (1972). "Radiation resistance of a rectangular panel." J. Acoust. Soc.
       Am. 51(3B), 946-952. doi:10.1121/1.1912943
    .. [2] Vigran, T.E. (2008). Building Acoustics. Taylor & Francis, eqs. 6.46-6.47.
       ISBN 978-0-415-42853-8
    """
    if m < 1 or n < 1:
        msg = f"mode indices m, n must be >= 1, got ({m}, {n})"
        raise ValueError(msg)
    for name, val in (("f", f), ("a", a), ("b", b), ("c0", c0)):
        _positive(name, val)
    k = 2.0 * math.pi * f / c0
    ka = k * max(a, b)
    base = int(24 + ka + max(m, n))
    nt = n_theta if n_theta is not None else base
    npf = n_phi if n_phi is not None else base
    xt, wt = np.polynomial.legendre.leggauss(nt)
    xp, wp = np.polynomial.legendre.leggauss(npf)
    theta = 0.25 * np.pi * (xt + 1.0)
    phi = 0.25 * np.pi * (xp + 1.0)
    th, ph = np.meshgrid(theta, phi, indexing="ij")
    alpha = k * a * np.sin(th) * np.cos(ph)
    beta = k * b * np.sin(th) * np.sin(ph)
    integrand = (_wallace_factor(alpha, m) * _wallace_factor(beta, n)) ** 2 * np.sin(th)
    integral = float(np.einsum("i,j,ij->", wt, wp, integrand)) * (0.25 * np.pi) ** 2
    return 64.0 * k**2 * a * b / (math.pi**6 * m**2 * n**2) * integral
