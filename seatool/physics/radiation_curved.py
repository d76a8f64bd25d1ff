"""Radiation efficiency of curved panels and cylinders vibrating in resonant bending waves.

:func:`radiation_efficiency_curved_panel` -- band-averaged, after Szechenyi's (1971)
statistical mode count in wavenumber space with modal radiation efficiencies by mode class
(acoustically fast, edge, corner). The radiation efficiency is one-sided, as in
:mod:`seatool.physics.radiation` (flat panels).
"""

from __future__ import annotations

import math

import numpy as np
import numpy.typing as npt

from ._checks import positive as _positive
from .air import AIR_SOUND_SPEED
from .memo import memoised
from .quadrature import gauss_legendre
from .shells import ring_frequency

__all__ = [
    "radiation_efficiency_curved_panel",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]

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
    for step in range(60):
        mid = 0.5 * (lo + hi)
        above = (1.0 - r2 * mid**2) * (1.0 - mid) ** 2 > eps
        new_lo = np.where(above, mid, lo)
        new_hi = np.where(above, hi, mid)
        # stop once no bracket moves: every later step would repeat this one exactly
        if step % 8 == 7 and np.array_equal(new_lo, lo) and np.array_equal(new_hi, hi):
            break
        lo, hi = new_lo, new_hi
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
    d = s - k2
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        fast = k / np.sqrt(-d)
        # e(q, p, l) = k (2 q^2 - (k^2 - p^2)) / (l q d^(3/2)) with d = k_p^2 - k^2 and
        # k_p^2 = p^2 + q^2, i.e. k (q^2 + d) / (l q d^(3/2)): fewer whole-array operations
        k_ex = k / (d * np.sqrt(d))
        edge = np.where(ky2 < k2, k_ex * (kx2 + d) / (l1 * np.sqrt(kx2)), 0.0)
        if not closed:
            edge = edge + np.where(kx2 < k2, k_ex * (ky2 + d) / (l2 * np.sqrt(ky2)), 0.0)
    # capped; fmin takes the cap where sigma is not a number (0/0 at a class boundary)
    out: FloatArray = np.fmin(np.where(s < k2, fast, edge), cap)
    return out


@memoised(maxsize=64)
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
    c0: float = AIR_SOUND_SPEED,
    n_angle: int = 24,
    n_wavenumber: int = 12,
    lattice: bool = True,
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
    lattice : bool, optional
        Leave the first cell of the mode lattice empty for acoustically fast modes (default
        True, see Notes); False gives the continuous count.

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
      :func:`seatool.physics.shells.shell_bending_modal_density`::

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

    * First lattice cell (``lattice=True``, the default): a simply supported side of length l
      has its modes at k = n pi / l, n >= 1, so the strips ``k_x < pi/(2 l1)`` and
      ``k_y < pi/(2 l2)`` next to the axes hold no mode (the boundary correction of the mode
      count; Xie, Thompson & Jones 2004). In the strips

      - acoustically fast modes are not counted (the continuous count otherwise places
        fast modes close to the origin in the band containing ``f_m``);
      - edge and corner modes are counted with the bending share of their frequency,
        ``1 - omega_m^2 cos^4 phi / omega^2``. A bending-controlled mode (share 1) keeps
        the continuous count, whose band value is Leppington's asymptotic form (validated
        against Wallace modal averages for flat panels, so the flat limit is unchanged);
        a membrane-controlled mode (share 0) is not counted. Cause: in the band containing
        ``f_m`` the band region of the wavenumber plane reaches the axial axis
        (``cos^2 phi = omega/omega_m`` inside the band) and runs along it as a wedge a few
        degrees wide, so the strip ``k_y < pi/(2 l2)``, where the lattice has no mode, is a
        large part of it: the continuous count there is the (logarithmically) singular
        modal density at ``f_m``, which the discrete count of low circumferential orders
        does not have (Langley 1994). The interpolation by the bending share is derived
        here (it is continuous in the wavenumber plane and in the parameters).

      For a closed cylinder only the axial strip is empty (the circumferential order 0
      exists). ``lattice=False`` gives the continuous count everywhere.

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
    a factor of about 2.5 of the modal average below f_m and within 1.6 dB in the band
    containing f_m over an ensemble of 1.5 m x 1.0 m fuselage-like panels (3.2 dB with the
    strips empty for fast modes only, 5.5 dB with the continuous count); for a
    2.4 m x 2.9 m roof of radius 3 m it is within 1.5 dB in every band from 200 to 400 Hz.

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
    .. [5] Xie, G., Thompson, D.J., Jones, C.J.C. (2004). "Mode count and modal density of
       structural systems: relationships with boundary conditions." J. Sound Vib. 274(3-5),
       621-651 (first cell of the mode lattice; volume and pages from memory)
    .. [6] Langley, R.S. (1994). "The modal density and mode count of thin cylinders and
       curved panels." J. Sound Vib. 169(1), 43-53 (the mode count near the ring frequency
       from discrete circumferential orders; details from memory)
    """
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
    fm_a = ring_frequency(a_a, cl_a) * math.sqrt(1.0 - nu**2)
    arrays = np.broadcast_arrays(f_a, lo, hi, l1_a, l2_a, fc_a, fm_a)
    shape = arrays[0].shape
    f_b, lo_b, hi_b, l1_b, l2_b, fc_b, fm_b = (np.ravel(x).astype(np.float64) for x in arrays)
    if np.any(hi_b <= lo_b):
        msg = "f_upper must be greater than f_lower"
        raise ValueError(msg)

    w1, w2 = 2.0 * np.pi * lo_b, 2.0 * np.pi * hi_b
    wc, wm = 2.0 * np.pi * fc_b, 2.0 * np.pi * fm_b
    kc = wc / c0
    # first cell of the mode lattice (Xie, Thompson & Jones 2004): a simply supported side of
    # length l has its first mode at pi/l, so no mode lies in the strip k < pi/(2 l); the
    # circumferential direction of a closed cylinder has the mode n = 0 (no strip). Fast
    # modes there are not counted, slow ones with their bending share (see Notes).
    zero = np.zeros_like(l1_b)
    kx0 = np.pi / (2.0 * l1_b) if lattice else zero
    ky0 = zero if (closed or not lattice) else np.pi / (2.0 * l2_b)
    short = np.minimum(l1_b, l2_b)
    long_ = np.maximum(l1_b, l2_b)

    # angular sub-intervals: the band region starts where cos^2 phi = omega_2/omega_m, the
    # lower locus where cos^2 phi = omega_1/omega_m; class boundaries meet the band's loci
    def phi_of(v: FloatArray) -> FloatArray:
        return np.arccos(np.sqrt(np.clip(np.nan_to_num(v, nan=1.0), 0.0, 1.0)))

    p_start = phi_of(w2 / wm)
    cands = [phi_of(w1 / wm)]
    nb = w1.size
    # both band edges' loci in one pass (elementwise, so the same values as one by one)
    breaks = _locus_breaks(np.concatenate([w1, w2]), np.concatenate([wc, wc]), np.tile(wm, 2))
    for half in (slice(0, nb), slice(nb, 2 * nb)):
        cands.extend(phi_of(v[half]) for v in breaks)
    half_pi = np.full_like(p_start, 0.5 * np.pi)
    edges = np.sort(
        np.stack([p_start, *(np.clip(c, p_start, half_pi) for c in cands), half_pi], axis=-1),
        axis=-1,
    )
    xt, wt = gauss_legendre(n_angle)
    t = 0.5 * (xt + 1.0)
    # phi = start + width (1 - cos(pi t))/2: clusters the nodes at both ends (square-root
    # onset of the band region and of the class sub-regions)
    tau = 0.5 * (1.0 - np.cos(np.pi * t))
    dtau = 0.25 * np.pi * np.sin(np.pi * t) * wt
    xs, ws = gauss_legendre(n_wavenumber)
    us, ws = 0.5 * (xs + 1.0), 0.5 * ws

    # every angular sub-interval of every band at once: axes (band, interval, angle node)
    b3 = (slice(None), None, None)
    pa, pb = edges[:, :-1, None], edges[:, 1:, None]
    phi = pa + (pb - pa) * tau  # (B, J, n_angle)
    jac = (pb - pa) * dtau
    c2 = np.cos(phi) ** 2
    c4 = c2 * c2
    kcc = (kc / c0)[b3]
    wm2 = (wm**2)[b3]
    s1 = kcc * np.sqrt(np.maximum((w1**2)[b3] - wm2 * c4, 0.0))
    s2 = kcc * np.sqrt(np.maximum((w2**2)[b3] - wm2 * c4, 0.0))
    # along phi, k^2 = s^2/k_c^2 + (omega_m/c0)^2 cos^4 phi; class boundaries in s:
    # s = k^2, s cos^2 phi = k^2, s sin^2 phi = k^2 (quadratics in s)
    kc2 = (kc**2)[b3]
    cc = ((wm / c0) ** 2)[b3] * c4 * kc2
    roots = [
        *_quadratic_roots(kc2 * np.ones_like(c2), cc),
        *_quadratic_roots(kc2 * c2, cc),
        *_quadratic_roots(kc2 * (1.0 - c2), cc),
    ]
    if lattice:
        # boundaries of the strips next to the axes that hold no mode (k_x = kx0 and
        # k_y = ky0 in s = k_p^2 along phi)
        with np.errstate(divide="ignore", invalid="ignore"):
            roots.append(kx0[b3] ** 2 / c2)
            roots.append(ky0[b3] ** 2 / (1.0 - c2))
    pts = np.sort(
        np.stack(
            [s1, s2, *(np.clip(np.nan_to_num(r, nan=-1.0, posinf=-1.0), s1, s2) for r in roots)],
            -1,
        ),
        axis=-1,
    )  # (B, J, n_angle, points)
    sa, sb = pts[..., :-1], pts[..., 1:]
    # only the non-empty wavenumber segments are expanded into quadrature nodes
    band, ij, ia, iseg = np.nonzero((sb > sa) & (jac > 0.0)[..., None])
    sa_n, sb_n = sa[band, ij, ia, iseg], sb[band, ij, ia, iseg]
    weight = (jac[band, ij, ia] * (sb_n - sa_n))[:, None] * ws  # (segments, n_wavenumber)
    s = sa_n[:, None] + (sb_n - sa_n)[:, None] * us
    c2n = c2[band, ij, ia][:, None]
    c4n = c2n * c2n
    bn = band[:, None]
    # k^2 at the node
    k2_membrane = (wm[bn] / c0) ** 2 * c4n
    k2 = (s / kc[bn]) ** 2 + k2_membrane
    if lattice:
        in_lattice = (s * c2n >= kx0[bn] ** 2) & (s * (1.0 - c2n) >= ky0[bn] ** 2)
        # in the strips: no acoustically fast mode (s < k^2); slow (edge, corner) modes
        # counted with the bending share of omega^2 (k^2 = omega^2/c0^2), see Notes
        strip = ~in_lattice
        k2_st, w_st = k2[strip], weight[strip]
        k2m_st = np.broadcast_to(k2_membrane, k2.shape)[strip]
        weight[strip] = np.where(s[strip] >= k2_st, w_st * (1.0 - k2m_st / k2_st), 0.0)
    den = np.bincount(band, weights=weight.sum(axis=1), minlength=f_b.size)
    # sigma on the segments that hold a mode of non-zero modal sigma (fast or edge class;
    # corner modes radiate nothing here); zero-weight nodes add nothing. The per-band data
    # broadcast along the segment's nodes.
    kx2 = s * c2n
    radiating = (s < k2) | (s - kx2 < k2)
    if not closed:
        radiating |= kx2 < k2
    rows = np.flatnonzero(radiating.any(axis=1) & (weight > 0.0).any(axis=1))
    bn_r = bn[rows]
    kn = np.sqrt(k2[rows])
    sh = short[bn_r]
    cap = (0.5 - 0.15 * sh / long_[bn_r]) * np.sqrt(kn * sh)
    sigma = _mode_class_sigma(s[rows], c2n[rows], kn, l1_b[bn_r], l2_b[bn_r], cap, closed)
    num = np.bincount(band[rows], weights=(weight[rows] * sigma).sum(axis=1), minlength=f_b.size)
    out: FloatArray = (num / den).reshape(shape)
    return out
