"""Small matrices stored entry by entry, each entry a stacked array (bands x nodes).

The line-junction scattering problem (:mod:`seatool.physics.junction_waves`) needs a 2 x 2
inverse, 2 x 2 products and one 4 x 4 solve at every band and quadrature node. Keeping each
matrix entry as its own contiguous array and writing the elimination out turns them into a
few dozen whole-array operations instead of a call of a general solver per small matrix.
An entry that is identically zero (a plate at a right angle to the line leaves several
stiffness entries empty) is ``None`` and costs nothing.

Plain linear algebra, no physics: Gaussian elimination by 2 x 2 blocks (Schur complement),
Golub, G.H., Van Loan, C.F. (2013), *Matrix Computations*, 4th ed., Johns Hopkins, sec.
3.2 (block LU) and sec. 4.1 (the Schur complement).
"""

from __future__ import annotations

from typing import Any

import numpy as np
import numpy.typing as npt

__all__ = ["Entry", "add", "as_array", "inv2", "mul", "mul2", "solve4"]

#: A dense stacked entry.
_C = npt.NDArray[Any]

#: One stacked matrix entry (complex array) or None for an identically zero entry.
Entry = npt.NDArray[Any] | None


def mul(a: Entry, b: Entry) -> Entry:
    """Product of two entries (None if either is zero)."""
    if a is None or b is None:
        return None
    out: npt.NDArray[Any] = a * b
    return out


def add(*terms: Entry) -> Entry:
    """Sum of entries, skipping zeros (None if all are zero)."""
    out: Entry = None
    for t in terms:
        if t is not None:
            out = t if out is None else out + t
    return out


def inv2(a: _C, b: _C, c: _C, d: _C) -> tuple[_C, _C, _C, _C]:
    """Entries of the inverse of the stacked 2 x 2 matrices [[a, b], [c, d]] (all given)."""
    inv_det = 1.0 / (a * d - b * c)
    return d * inv_det, -b * inv_det, -c * inv_det, a * inv_det


def mul2(x: tuple[_C, ...], y: tuple[_C, ...]) -> tuple[_C, _C, _C, _C]:
    """Entries of the product of stacked 2 x 2 matrices given row-wise (x11, x12, x21, x22)."""
    return (
        x[0] * y[0] + x[1] * y[2],
        x[0] * y[1] + x[1] * y[3],
        x[2] * y[0] + x[3] * y[2],
        x[2] * y[1] + x[3] * y[3],
    )


def _neg(a: Entry) -> Entry:
    return None if a is None else -a


def _inv2(a: Entry, b: Entry, c: Entry, d: Entry) -> tuple[Entry, Entry, Entry, Entry]:
    """:func:`inv2` with identically zero entries given as None.

    ``a`` and ``d`` must be given (a zero diagonal entry is a singular or badly ordered
    block here, raised as ValueError).
    """
    if a is None or d is None:
        msg = "2 x 2 block with an identically zero diagonal entry"
        raise ValueError(msg)
    det = a * d
    bc = mul(b, c)
    if bc is not None:
        det = det - bc
    inv_det = 1.0 / det
    return d * inv_det, mul(_neg(b), inv_det), mul(_neg(c), inv_det), a * inv_det


def _mul2(
    x: tuple[Entry, Entry, Entry, Entry], y: tuple[Entry, Entry, Entry, Entry]
) -> tuple[Entry, Entry, Entry, Entry]:
    """:func:`mul2` with identically zero entries given as None."""
    return (
        add(mul(x[0], y[0]), mul(x[1], y[2])),
        add(mul(x[0], y[1]), mul(x[1], y[3])),
        add(mul(x[2], y[0]), mul(x[3], y[2])),
        add(mul(x[2], y[1]), mul(x[3], y[3])),
    )


def _apply2(m: tuple[Entry, Entry, Entry, Entry], v: tuple[Entry, Entry]) -> tuple[Entry, Entry]:
    return add(mul(m[0], v[0]), mul(m[1], v[1])), add(mul(m[2], v[0]), mul(m[3], v[1]))


def solve4(k: list[list[Entry]], r: list[Entry]) -> list[Entry]:
    """Solve the stacked 4 x 4 systems ``K x = r`` by 2 x 2 blocks.

    Parameters
    ----------
    k : list of lists
        ``k[g][h]``: the entries of ``K`` (stacked arrays of one shape, or None for zero).
        The leading block ``K[0:2, 0:2]`` and the Schur complement of it must be regular.
    r : list
        The four entries of the right-hand side.

    Returns
    -------
    list
        The four entries of ``x`` (None where identically zero).

    Notes
    -----
    With ``K = [[A, B], [C, D]]`` (2 x 2 blocks) and ``r = (r1, r2)``:
    ``S = D - C A^-1 B``, ``x2 = S^-1 (r2 - C A^-1 r1)``, ``x1 = A^-1 (r1 - B x2)``
    (block Gaussian elimination without pivoting; Golub & Van Loan 2013, sec. 3.2.10).
    """
    a_inv = _inv2(k[0][0], k[0][1], k[1][0], k[1][1])
    b = (k[0][2], k[0][3], k[1][2], k[1][3])
    c = (k[2][0], k[2][1], k[3][0], k[3][1])
    d = (k[2][2], k[2][3], k[3][2], k[3][3])
    ca = _mul2(c, a_inv)
    cab = _mul2(ca, b)
    s = tuple(add(d[i], _neg(cab[i])) for i in range(4))
    s_inv = _inv2(*s)
    car1 = _apply2(ca, (r[0], r[1]))
    x2 = _apply2(s_inv, (add(r[2], _neg(car1[0])), add(r[3], _neg(car1[1]))))
    bx2 = _apply2(b, x2)
    x1 = _apply2(a_inv, (add(r[0], _neg(bx2[0])), add(r[1], _neg(bx2[1]))))
    return [x1[0], x1[1], x2[0], x2[1]]


def as_array(e: Entry, shape: tuple[int, ...]) -> npt.NDArray[np.complex128]:
    """The entry as a complex array of ``shape`` (zeros for None)."""
    if e is None:
        return np.zeros(shape, dtype=np.complex128)
    return np.broadcast_to(e, shape).astype(np.complex128, copy=False)
