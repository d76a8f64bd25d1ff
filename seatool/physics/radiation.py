"""Radiation efficiency of flat baffled rectangular panels vibrating in resonant bending waves.

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
* :func:`radiation_efficiency_en12354` -- EN ISO 12354-1 Annex B free-wave radiation
  factor (its forced-wave factor is in :mod:`seatool.physics.radiation_forced`).
* :func:`radiation_efficiency_band` -- band average of any of the three single-frequency
  formulas (uniform average over frequency, the equal-weight mode average of a plate whose
  modal density does not depend on frequency).

Curved panels and cylinders are in :mod:`seatool.physics.radiation_curved`; the radiation of
single modes (Wallace 1972), a numerical reference, in :mod:`seatool.physics.radiation_modal`.

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
from .air import AIR_SOUND_SPEED
from .memo import memoised
from .quadrature import gauss_legendre

__all__ = [
    "EdgeCondition",
    "RadiationMethod",
    "radiation_efficiency",
    "radiation_efficiency_band",
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
    c0: float = AIR_SOUND_SPEED,
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
    c0: float = AIR_SOUND_SPEED,
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
    c0: float = AIR_SOUND_SPEED,
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
    c0: float = AIR_SOUND_SPEED,
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


@memoised(maxsize=256)
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
    c0: float = AIR_SOUND_SPEED,
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

    x, w = gauss_legendre(n_points)
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
