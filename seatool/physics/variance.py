"""Ensemble variance of SEA energies: band-averaged relative variance, excitation statistics
and the conversion of a relative variance into level quantiles.

A subsystem's natural frequencies and mode shapes vary from one nominally identical item
to the next. With natural frequencies distributed as the eigenvalues of the Gaussian
orthogonal ensemble (GOE) and light damping, the ensemble relative variance of the energy
averaged over a band follows from three numbers: the modal overlap m, the expected number
of modes in the band B = n(f) Delta_f, and alpha = E[a^2] / E[a]^2 of the modal
excitation coefficients (Langley & Brown 2004a, b). Poisson-distributed natural
frequencies (Lyon 1969) are available for comparison.

The single-frequency formula is :func:`seatool.physics.validity.relative_variance_goe`;
the propagation through a coupled model is in :mod:`seatool.analysis.confidence`; the law
that turns a relative variance into level quantiles is in
:mod:`seatool.physics.level_distribution` (re-exported here).
"""

from __future__ import annotations

from typing import Literal

import numpy as np
import numpy.typing as npt
from scipy import special

from ._checks import nonnegative as _nonnegative
from ._checks import positive as _positive
from .level_distribution import DISTRIBUTION, energy_ratio_samples, level_quantiles
from .validity import relative_variance_goe

__all__ = [
    "ALPHA_POINT",
    "ALPHA_RAIN_ON_THE_ROOF",
    "alpha_point_forces",
    "DISTRIBUTION",
    "combined_alpha",
    "energy_ratio_samples",
    "goe_form_factor",
    "level_quantiles",
    "point_response_cross_variance",
    "relative_variance_band",
    "relative_variance_alpha_slope",
    "product_variance_band",
]

FloatArray = npt.NDArray[np.float64]

#: alpha of one point force on a subsystem with Gaussian mode shapes: a_j = phi_j(x)^2 is
#: a chi-square variable with one degree of freedom, E[a^2] / E[a]^2 = 3 (Langley & Brown
#: 2004a; Langley & Cotoni 2004).
ALPHA_POINT = 3.0
#: alpha of rain-on-the-roof (delta-correlated distributed) excitation: every mode receives
#: the same generalised force, a_j constant (Langley & Brown 2004a).
ALPHA_RAIN_ON_THE_ROOF = 1.0

# Gauss-Legendre rule for the composite quadrature in log k (16 nodes per panel).
_GL_X, _GL_W = np.polynomial.legendre.leggauss(16)
_PANELS_PER_DECADE = 60
# Above k B > _OSC_LIMIT the factor sin^2(pi k B) is replaced by its mean 1/2.
_OSC_LIMIT = 77.0


def goe_form_factor(k: npt.ArrayLike) -> FloatArray:
    """Two-level form factor b(k) of the Gaussian orthogonal ensemble [-].

    Parameters
    ----------
    k : float or array_like
        Wavenumber conjugate to the eigenvalue separation in units of the mean spacing
        [-] (b is the Fourier transform of the two-level cluster function Y_2(s),
        ``b(k) = int Y_2(s) exp(2 pi i k s) ds``).

    Returns
    -------
    numpy.ndarray
        b(k) = 1 - 2|k| + |k| ln(1 + 2|k|) for |k| <= 1 and
        b(k) = -1 + |k| ln((2|k| + 1) / (2|k| - 1)) for |k| > 1.

    Notes
    -----
    b(0) = 1 and the integral of b over all k is Y_2(0) = 1 (complete level repulsion).
    The unitary ensemble has b(k) = 1 - |k| (|k| <= 1); Poisson spacing has b = 0.

    References
    ----------
    .. [1] Mehta, M.L. (2004). Random Matrices, 3rd ed., Elsevier, ISBN 0-12-088409-7,
       ch. 6 (two-level form factor of the orthogonal ensemble; from memory, checked
       in the tests by the Monte Carlo of GOE eigenvalues).
    """
    ka = np.abs(np.asarray(k, dtype=np.float64))
    inner = 1.0 - 2.0 * ka + ka * np.log1p(2.0 * np.minimum(ka, 1.0))
    with np.errstate(divide="ignore", invalid="ignore"):
        kk = np.maximum(ka, 1.0)
        # ln((2k+1)/(2k-1)) = 2 artanh(1/(2k)); the series form keeps precision at large k
        outer = -1.0 + 2.0 * kk * np.arctanh(0.5 / kk)
    return np.asarray(np.where(ka <= 1.0, inner, outer), dtype=np.float64)


def _sinc2_exp_integral(c: FloatArray, a: FloatArray) -> FloatArray:
    """J0 = int_0^inf exp(-c k) (sin(a k) / (a k))^2 dk for c > 0, a >= 0 (closed form:
    Gradshteyn & Ryzhik 3.947, from memory; checked by quadrature in the tests)."""
    z = 2.0 * a / c
    small = z < 1e-3
    zs = np.where(small, 1.0, z)
    g_big = (zs * np.arctan(zs) - 0.5 * np.log1p(zs**2)) / zs**2
    g_small = 0.5 - z**2 / 12.0 + z**4 / 30.0
    return np.asarray(2.0 / c * np.where(small, g_small, g_big), dtype=np.float64)


def _form_factor_integral(c: FloatArray, bw: FloatArray) -> FloatArray:
    """I = int_0^inf b(k) exp(-c k) sinc^2(pi k B) dk by composite Gauss-Legendre in ln k.

    Element-wise over the flattened arrays ``c`` (> 0) and ``bw`` (>= 0). Three segments
    in ln k per element: below k = 0.2 / B (smooth), 0.2 / B to 80 / B where
    sin^2(pi k B) oscillates (:data:`_PANELS_PER_DECADE` panels per decade) and above
    (sin^2 replaced by its mean, smooth); the smooth segments need few panels.
    """
    scale = 1.0 / np.maximum.reduce([np.ones_like(c), c, bw])  # smallest feature in k
    lo = 1e-7 * scale
    hi = np.minimum(1e5, 60.0 / c)
    hi = np.maximum(hi, 10.0 * lo)
    with np.errstate(divide="ignore"):
        inv_b = np.where(bw > 0, 1.0 / np.where(bw > 0, bw, 1.0), np.inf)
    k_a = np.clip(0.2 * inv_b, lo, hi)
    k_b = np.clip((_OSC_LIMIT + 3.0) * inv_b, lo, hi)
    t_edges = np.log(np.stack([lo, k_a, k_b, hi]))  # (4, n) segment edges in ln k
    # panels per segment: smooth ones 4 per decade over up to 16 decades, the oscillatory
    # one (at most log10(400) = 2.6 decades) at the full density
    counts = (64, int(np.ceil(np.log10(400.0) * _PANELS_PER_DECADE)), 64)
    out = np.zeros_like(c)
    for seg, n_panels in enumerate(counts):
        t0, t1 = t_edges[seg], t_edges[seg + 1]
        edges = np.linspace(0.0, 1.0, n_panels + 1)
        for start in range(0, c.size, 64):  # chunks keep the work arrays small
            sl = slice(start, start + 64)
            span = (t1[sl] - t0[sl])[:, None, None]
            left = t0[sl][:, None, None] + span * edges[None, :-1, None]
            half = 0.5 * span / n_panels
            t = left + half * (_GL_X[None, None, :] + 1.0)
            k = np.exp(t)
            kb = k * bw[sl][:, None, None]
            if seg == 2:
                with np.errstate(divide="ignore"):
                    s2 = np.where(kb > 0, 0.5 / (np.pi * np.maximum(kb, 1e-300)) ** 2, 1.0)
            else:
                s2 = np.sinc(kb) ** 2  # numpy sinc(x) = sin(pi x) / (pi x)
                if seg == 1:
                    with np.errstate(divide="ignore"):
                        mean_sq = 0.5 / (np.pi * np.maximum(kb, 1e-300)) ** 2
                    s2 = np.where(kb > _OSC_LIMIT, mean_sq, s2)
            f = goe_form_factor(k) * np.exp(-c[sl][:, None, None] * k) * s2 * k  # dk = k dt
            out[sl] += np.sum(f * (half * _GL_W[None, None, :]), axis=(1, 2))
    return np.asarray(out + lo, dtype=np.float64)  # [0, lo]: b ~ 1, exp ~ 1, sinc ~ 1


# Values of _form_factor_integral by (c, B): a model re-solved with a few parameters changed
# (sweeps, searches) keeps most subsystems' overlap and modes in band, and the integral is
# the whole cost of relative_variance_band. Exact (the same floating-point values).
_MEMO: dict[tuple[float, float], float] = {}
_MEMO_LIMIT = 200_000


def _form_factor_integral_memo(c: FloatArray, bw: FloatArray) -> FloatArray:
    """:func:`_form_factor_integral`, remembering every value computed (up to
    :data:`_MEMO_LIMIT` pairs; the memory is cleared when full)."""
    keys = list(zip(c.tolist(), bw.tolist(), strict=True))
    found = [_MEMO.get(key) for key in keys]
    todo = [i for i, v in enumerate(found) if v is None]
    out = np.array([np.nan if v is None else v for v in found], dtype=np.float64)
    if todo:
        new = _form_factor_integral(c[todo], bw[todo])
        out[todo] = new
        if len(_MEMO) + len(todo) > _MEMO_LIMIT:
            _MEMO.clear()
        _MEMO.update(zip((keys[i] for i in todo), new.tolist(), strict=True))
    return out


def relative_variance_band(
    modal_overlap: npt.ArrayLike,
    modes_in_band: npt.ArrayLike,
    *,
    alpha: npt.ArrayLike = ALPHA_POINT,
    spacing: Literal["goe", "poisson"] = "goe",
) -> FloatArray:
    """Relative variance of the band-averaged energy of a random subsystem [-].

    Parameters
    ----------
    modal_overlap : float or array_like
        Modal overlap factor m = eta f n(f) [-], > 0.
    modes_in_band : float or array_like
        Expected number of natural frequencies in the band B = n(f) Delta_f [-], >= 0;
        0 gives the single-frequency value.
    alpha : float or array_like, optional
        E[a^2] / E[a]^2 of the modal excitation coefficients [-], >= 1:
        :data:`ALPHA_POINT` (3, default), :func:`alpha_point_forces`,
        :data:`ALPHA_RAIN_ON_THE_ROOF` (1), :func:`combined_alpha`.
    spacing : {'goe', 'poisson'}, optional
        Statistics of the natural frequencies: Gaussian orthogonal ensemble (default;
        the realistic choice for a system with random properties, Langley & Brown
        2004a) or independent (Poisson) natural frequencies (Lyon 1969).

    Returns
    -------
    numpy.ndarray
        r^2 = Var[E_band] / E[E_band]^2 [-], broadcast shape of the inputs.

    Notes
    -----
    The energy averaged over the band of B mean mode spacings is a sum over modes of
    a_j times a Lorentzian of half-width m/2 (in units of the mean spacing) averaged
    over the band. Its variance over the ensemble, written with the Fourier transform of
    the pair correlation of the natural frequencies, is

        r^2 = 2 int_0^inf [alpha - b(k)] exp(-2 pi m k) sinc^2(pi k B) dk,
        sinc(x) = sin(x) / x,

    with b the two-level form factor (:func:`goe_form_factor`; b = 0 for Poisson
    spacing). The alpha term has a closed form (Gradshteyn & Ryzhik 3.947); the b term
    is integrated numerically (relative accuracy about 1e-6). Limits:

    * B = 0: the single-frequency result of Langley & Brown (2004a),
      :func:`seatool.physics.validity.relative_variance_goe`;
    * Poisson, B = 0: alpha / (pi m) (Lyon 1969); Poisson, m -> 0: alpha / B (a Poisson
      number of modes in the band);
    * m -> 0 (resolved modes): (alpha - 1) / B + Sigma_2(B) / B^2 with Sigma_2 the
      number variance of the ensemble (the energy counts the modes in the band);
    * m -> infinity or B -> infinity: r^2 -> 0.

    The formulation is that of Langley & Brown (2004b) for band-averaged energy; the
    spectral form above is written out here (derivation in docs/theory/variance.md) and
    checked against a Monte Carlo simulation of GOE natural frequencies in the tests.

    References
    ----------
    .. [1] Langley, R.S., Brown, A.W.M. (2004a). The ensemble statistics of the energy of
       a random system subjected to harmonic excitation. J. Sound Vib. 275, 823-846
       (from memory for volume and pages).
    .. [2] Langley, R.S., Brown, A.W.M. (2004b). The ensemble statistics of the
       band-averaged energy of a random system. J. Sound Vib. 275, 847-857 (from memory
       for volume and pages).
    .. [3] Lyon, R.H. (1969). Statistical analysis of power injection and response in
       structures and rooms. J. Acoust. Soc. Am. 45(3), 545-565.
    .. [4] Mehta, M.L. (2004). Random Matrices, 3rd ed., Elsevier, ch. 6.
    .. [5] Gradshteyn, I.S., Ryzhik, I.M. (2007). Table of Integrals, Series, and
       Products, 7th ed., Academic Press, 3.947 (from memory).
    """
    m = _positive("modal_overlap", modal_overlap)
    bw = _nonnegative("modes_in_band", modes_in_band)
    a = np.asarray(alpha, dtype=np.float64)
    if np.any(a < 1.0) or not np.all(np.isfinite(a)):
        msg = "alpha must be finite and >= 1"
        raise ValueError(msg)
    if spacing not in ("goe", "poisson"):
        msg = f"spacing must be 'goe' or 'poisson', got {spacing!r}"
        raise ValueError(msg)
    shape = np.broadcast_shapes(m.shape, bw.shape, a.shape)
    c = np.broadcast_to(2.0 * np.pi * m, shape).ravel().copy()
    b_ = np.broadcast_to(bw, shape).ravel().copy()
    a_ = np.broadcast_to(a, shape).ravel()
    r2 = 2.0 * a_ * _sinc2_exp_integral(c, np.pi * b_)
    if spacing == "goe":
        r2 = r2 - 2.0 * _form_factor_integral_memo(c, b_)
    return np.asarray(np.maximum(r2, 0.0).reshape(shape), dtype=np.float64)


def relative_variance_alpha_slope(
    modal_overlap: npt.ArrayLike, modes_in_band: npt.ArrayLike
) -> FloatArray:
    """Derivative of the band-averaged relative variance with respect to alpha [-].

    Parameters
    ----------
    modal_overlap : float or array_like
        Modal overlap factor m [-], > 0.
    modes_in_band : float or array_like
        Expected number of modes in the band B [-], >= 0.

    Returns
    -------
    numpy.ndarray
        d r^2 / d alpha = 2 int_0^inf exp(-2 pi m k) sinc^2(pi k B) dk [-], the same for
        GOE and Poisson spacing (the spacing enters only the term without alpha).

    Notes
    -----
    Equation (1) of :func:`relative_variance_band` is linear in alpha, so
    r^2(alpha_2) - r^2(alpha_1) = (alpha_2 - alpha_1) d r^2 / d alpha wherever neither
    value is clipped at zero. Closed form of the integral: Gradshteyn & Ryzhik 3.947.
    At B = 0 it is 1 / (pi m), the alpha / (pi m) term of Langley & Brown (2004a).

    References
    ----------
    .. [1] Langley, R.S., Brown, A.W.M. (2004b). The ensemble statistics of the
       band-averaged energy of a random system. J. Sound Vib. 275, 847-857 (from memory
       for volume and pages).
    .. [2] Gradshteyn, I.S., Ryzhik, I.M. (2007). Table of Integrals, Series, and
       Products, 7th ed., Academic Press, 3.947 (from memory).
    """
    m = _positive("modal_overlap", modal_overlap)
    bw = _nonnegative("modes_in_band", modes_in_band)
    shape = np.broadcast_shapes(m.shape, bw.shape)
    c = np.broadcast_to(2.0 * np.pi * m, shape).ravel().copy()
    b_ = np.broadcast_to(bw, shape).ravel().copy()
    out = 2.0 * _sinc2_exp_integral(c, np.pi * b_)
    return np.asarray(out.reshape(shape), dtype=np.float64)


def point_response_cross_variance(
    modal_overlap: npt.ArrayLike, modes_in_band: npt.ArrayLike
) -> FloatArray:
    """Extra relative variance of a band-averaged squared point response from its
    cross-modal terms [-].

    Parameters
    ----------
    modal_overlap : float or array_like
        Modal overlap factor m [-], > 0.
    modes_in_band : float or array_like
        Expected number of modes in the band B [-], > 0.

    Returns
    -------
    numpy.ndarray
        r_x^2 [-]: the band average of |sum_j c_j H_j(f)|^2, with c_j = phi_j(x_1)
        phi_j(x_2) products of independent zero-mean mode-shape values, has the relative
        variance r^2(m, B, alpha_c) (:func:`relative_variance_band`, the modal sum's part)
        plus r_x^2. It is the part that the signs of the c_j add: a response at a point is
        a sum of complex modal amplitudes, not a sum of modal energies.

    Notes
    -----
    With unit mean spacing, H(x, f) = 1 / (x - f - i m/2) and GOE natural frequencies, the
    cross terms of E[|X(f)|^2 |X(f')|^2] add to the normalised covariance over the lag u

        c_x(u) = (1 - beta) m^2 / (u^2 + m^2)
                 - (4 m^2 / u^2) int_0^inf b(k) exp(-2 pi m k) sin^2(pi k u) dk,
        beta = 2 int_0^inf b(k) exp(-2 pi m k) dk

    (b the GOE two-level form factor, :func:`goe_form_factor`; the first term is the
    Rayleigh-like correlation of a complex sum of many overlapping modes, reduced by level
    repulsion; the second removes the pairs of one mode counted twice). Band averaging,
    r_x^2 = (1/B) int_{-B}^{B} (1 - |u|/B) c_x(u) du, gives

        r_x^2 = (1 - beta) (2m/B) [arctan(B/m) - (m / 2B) ln(1 + B^2/m^2)]
                - (8 m^2 / B) int_0^inf b(k) exp(-2 pi m k) K(k) dk,
        K(k) = pi k Si(2 pi k B) - sin^2(pi k B) / B - Cin(2 pi k B) / (2B)

    (Si the sine integral, Cin(x) = gamma + ln x - Ci(x); Abramowitz & Stegun 5.2.1-5.2.2).
    Limits: m -> 0: r_x^2 -> 0 (one mode at a time); m -> infinity: beta -> 0 and
    r_x^2 -> pi m / B for B >> m, -> 1 for B << m (a complex Gaussian response at one
    frequency). Derivation (Fourier transforms of products of Lorentzians) in
    docs/theory/variance.md, section 2; checked against a Monte Carlo of point responses in
    tests/physics/test_variance.py.

    References
    ----------
    .. [1] Langley, R.S., Brown, A.W.M. (2004b). The ensemble statistics of the
       band-averaged energy of a random system. J. Sound Vib. 275, 847-857 (from memory
       for volume and pages; the spectral form with the GOE form factor).
    .. [2] Mehta, M.L. (2004). Random Matrices, 3rd ed., Elsevier, ch. 6 (b(k)).
    .. [3] Abramowitz, M., Stegun, I.A. (1964). Handbook of Mathematical Functions, NBS,
       5.2 (sine and cosine integrals).
    """
    m = _positive("modal_overlap", modal_overlap)
    bw = _positive("modes_in_band", modes_in_band)
    shape = np.broadcast_shapes(m.shape, bw.shape)
    m_ = np.broadcast_to(m, shape).ravel()[:, None]
    b_ = np.broadcast_to(bw, shape).ravel()[:, None]
    c = 2.0 * np.pi * m_
    # composite Gauss-Legendre in ln k from 1e-6 / max(1, m, B) to 40 / (2 pi m)
    lo = np.log(1e-6 / np.maximum(np.maximum(1.0, m_), b_))
    hi = np.log(40.0 / c)
    n_panels = 48  # 1e-6 relative against 160 panels (m 0.01-100, B 0.05-3000)
    edges = np.linspace(0.0, 1.0, n_panels + 1)
    left = lo + (hi - lo) * edges[None, :-1]
    half = 0.5 * (hi - lo) / n_panels
    t = (left[:, :, None] + half[:, :, None] * (_GL_X[None, None, :] + 1.0)).reshape(
        m_.shape[0], n_panels * _GL_X.size
    )
    w = (half[:, :, None] * _GL_W[None, None, :]).repeat(n_panels, axis=1).reshape(t.shape)
    k = np.exp(t)
    weight = goe_form_factor(k) * np.exp(-c * k) * k * w  # dk = k dt
    x = 2.0 * np.pi * k * b_
    si, ci = special.sici(x)
    cin = np.euler_gamma + np.log(x) - ci
    kern = np.pi * k * si - np.sin(0.5 * x) ** 2 / b_ - cin / (2.0 * b_)
    beta = 2.0 * (np.sum(goe_form_factor(k) * np.exp(-c * k) * k * w, axis=1) + np.exp(lo[:, 0]))
    first = (1.0 - beta) * (2.0 * m_[:, 0] / b_[:, 0]) * (
        np.arctan(b_[:, 0] / m_[:, 0]) - m_[:, 0] / (2.0 * b_[:, 0]) * np.log1p((b_[:, 0] / m_[:, 0]) ** 2)
    )
    second = 8.0 * m_[:, 0] ** 2 / b_[:, 0] * np.sum(weight * kern, axis=1)
    return np.asarray(np.maximum(first - second, 0.0).reshape(shape), dtype=np.float64)


def product_variance_band(
    f: npt.ArrayLike,
    bandwidth: npt.ArrayLike,
    modal_density_1: npt.ArrayLike,
    loss_factor_1: npt.ArrayLike,
    modal_density_2: npt.ArrayLike,
    loss_factor_2: npt.ArrayLike,
    *,
    alpha_1: npt.ArrayLike = 3.0 * ALPHA_POINT,
    alpha_2: npt.ArrayLike = ALPHA_POINT,
) -> FloatArray:
    """Second-order term of the band average of a product of two independent random responses [-].

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    bandwidth : float or array_like
        Band width Delta_f [Hz].
    modal_density_1, loss_factor_1 : float or array_like
        Modal density [modes/Hz] and total loss factor [-] of the first random system
        (at a point junction: the source, whose response at the junction sets the force).
    modal_density_2, loss_factor_2 : float or array_like
        The same for the second (the receiver, whose point receptance turns the force into
        energy).
    alpha_1, alpha_2 : float or array_like, optional
        alpha of each response (default 9: a point response of a point-driven source,
        Gaussian mode shapes; 3: a point-driven receiver).

    Returns
    -------
    numpy.ndarray
        T [-]: with X(f) and Y(f) independent random functions of frequency of relative
        variances r_X^2, r_Y^2 after band averaging, the band average of X Y has the
        relative variance r_X^2 + r_Y^2 + T (first-order propagation keeps the first two
        terms only).

    Notes
    -----
    With normalised covariance functions c_X, c_Y of the single-frequency responses over
    a frequency lag u, T = (1 / Delta_f^2) int int c_X(f - f') c_Y(f - f') df df'. Each
    c is a Lorentzian of half-width w = eta f (the modal sum with
    :func:`relative_variance_band`'s spectral form, alpha part) and area (alpha - 1) / n
    after the GOE level-repulsion part is removed (its area is 1 / n, the b(0) = 1 term);
    for a band wider than both half-widths the integral of two Lorentzians gives

        T = (alpha_1 - 1)(alpha_2 - 1) / (pi f (eta_1 + eta_2) n_1 n_2 Delta_f),

    capped at the single-frequency product r_1^2(B = 0) r_2^2(B = 0)
    (:func:`seatool.physics.validity.relative_variance_goe`), its limit for a narrow band.
    Derivation and the check against direct numerical integration of the covariance
    functions (within 10 % for modal overlaps 0.5 to 4): docs/theory/variance.md. The
    single-frequency identity Var[XY] / E[XY]^2 = r_X^2 + r_Y^2 + r_X^2 r_Y^2 for
    independent X, Y is Goodman (1960).

    References
    ----------
    .. [1] Goodman, L.A. (1960). On the exact variance of products. J. Am. Stat. Assoc.
       55(292), 708-713.
    .. [2] Langley, R.S., Brown, A.W.M. (2004b). The ensemble statistics of the
       band-averaged energy of a random system. J. Sound Vib. 275, 847-857 (from memory
       for volume and pages; the spectral form of the covariance).
    """
    fr = _positive("f", f)
    bw = _positive("bandwidth", bandwidth)
    n1 = _positive("modal_density_1", modal_density_1)
    n2 = _positive("modal_density_2", modal_density_2)
    e1 = _positive("loss_factor_1", loss_factor_1)
    e2 = _positive("loss_factor_2", loss_factor_2)
    a1 = np.asarray(alpha_1, dtype=np.float64)
    a2 = np.asarray(alpha_2, dtype=np.float64)
    if np.any(a1 < 1.0) or np.any(a2 < 1.0):
        msg = "alpha_1 and alpha_2 must be >= 1"
        raise ValueError(msg)
    wide = (a1 - 1.0) * (a2 - 1.0) / (np.pi * fr * (e1 + e2) * n1 * n2 * bw)
    narrow = relative_variance_goe(fr * n1 * e1, alpha=a1) * relative_variance_goe(
        fr * n2 * e2, alpha=a2
    )
    return np.asarray(np.minimum(wide, narrow), dtype=np.float64)


def alpha_point_forces(count: npt.ArrayLike, *, single: npt.ArrayLike = ALPHA_POINT) -> FloatArray:
    """alpha of ``count`` uncorrelated point forces of equal strength [-].

    Parameters
    ----------
    count : float or array_like
        Number of uncorrelated point forces P, >= 1 (need not be an integer: an
        effective number of independent drive regions).
    single : float or array_like, optional
        alpha of one point force (default 3, Gaussian mode shapes).

    Returns
    -------
    numpy.ndarray
        alpha = 1 + (alpha_1 - 1) / P: the modal coefficients are means of P independent
        values, so their relative variance (alpha - 1) falls as 1 / P; P -> infinity is
        rain-on-the-roof (alpha = 1).

    References
    ----------
    .. [1] Langley, R.S., Cotoni, V. (2004). Response variance prediction in the
       statistical energy analysis of built-up systems. J. Acoust. Soc. Am. 115(2),
       706-718 (alpha as the normalised second moment of the modal loading).
    """
    p = _positive("count", count)
    if np.any(p < 1.0):
        msg = "count must be >= 1"
        raise ValueError(msg)
    a1 = np.asarray(single, dtype=np.float64)
    return np.asarray(1.0 + (a1 - 1.0) / p, dtype=np.float64)


def combined_alpha(weights: npt.ArrayLike, alphas: npt.ArrayLike) -> FloatArray:
    """alpha of the sum of statistically independent inputs [-].

    Parameters
    ----------
    weights : array_like, shape (S, ...)
        Mean power (or mean modal coefficient) of each input S, >= 0 (broadcast over the
        trailing axes).
    alphas : array_like, shape (S, ...)
        alpha of each input alone.

    Returns
    -------
    numpy.ndarray, shape (...)
        alpha = 1 + sum_s w_s^2 (alpha_s - 1) / (sum_s w_s)^2: the modal coefficient is
        a_j = sum_s a_j^(s) with independent terms, so its variance is the sum of the
        variances (1 where all weights are zero).

    References
    ----------
    .. [1] Langley, R.S., Cotoni, V. (2004). J. Acoust. Soc. Am. 115(2), 706-718
       (several independent loadings of one subsystem).
    """
    w = _nonnegative("weights", weights)
    al = np.asarray(alphas, dtype=np.float64)
    if np.any(al < 1.0):
        msg = "alphas must be >= 1"
        raise ValueError(msg)
    w, al = np.broadcast_arrays(w, al)
    total = w.sum(axis=0)
    num = (w**2 * (al - 1.0)).sum(axis=0)
    with np.errstate(divide="ignore", invalid="ignore"):
        out = np.where(total > 0, 1.0 + num / np.where(total > 0, total, 1.0) ** 2, 1.0)
    return np.asarray(out, dtype=np.float64)
