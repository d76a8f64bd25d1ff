"""Radiation efficiency of single modes of a baffled simply supported rectangular panel.

:func:`modal_radiation_efficiency_wallace` -- Wallace (1972), by numerical double integration
over the radiation angles; an independent numerical reference for the statistical formulas in
:mod:`seatool.physics.radiation`.
"""

from __future__ import annotations

import math

import numpy as np
import numpy.typing as npt

from ._checks import positive as _positive
from .air import AIR_SOUND_SPEED

__all__ = [
    "modal_radiation_efficiency_wallace",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]

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
    c0: float = AIR_SOUND_SPEED,
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
