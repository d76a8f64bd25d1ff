"""Gauss-Legendre quadrature nodes, computed once per order.

:func:`numpy.polynomial.legendre.leggauss` finds the nodes from an eigenvalue problem on
every call (about a millisecond for 48 nodes); the band averages and diffuse-field
integrals of the physics modules ask for the same few orders many times while a model
loads. :func:`gauss_legendre` returns the same arrays, remembered per order.
"""

from __future__ import annotations

from functools import lru_cache

import numpy as np
import numpy.typing as npt

__all__ = ["gauss_legendre"]

FloatArray = npt.NDArray[np.float64]


@lru_cache(maxsize=64)
def gauss_legendre(n: int) -> tuple[FloatArray, FloatArray]:
    """Nodes and weights of the n-point Gauss-Legendre rule on [-1, 1] (read-only arrays).

    Parameters
    ----------
    n : int
        Number of nodes (>= 1).

    Returns
    -------
    tuple of numpy.ndarray
        ``(x, w)`` with ``sum_i w_i g(x_i) = integral_{-1}^{1} g(x) dx`` exactly for
        polynomials ``g`` of degree up to ``2 n - 1``.

    References
    ----------
    .. [1] Abramowitz, M., Stegun, I.A. (1964). Handbook of Mathematical Functions, NBS
       AMS 55, eq. 25.4.29 and table 25.4.
    """
    if n < 1:
        msg = f"n must be >= 1, got {n!r}"
        raise ValueError(msg)
    x, w = np.polynomial.legendre.leggauss(n)
    x.flags.writeable = False
    w.flags.writeable = False
    return x, w
