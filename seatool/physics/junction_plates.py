"""The plates at a line junction as stacked arrays, and elastic interlayers under their edges.

Data for the line-junction wave model of :mod:`seatool.physics.junction_waves`: the
stiffnesses of the ``N`` plates over ``B`` bands (:class:`PlateArrays`, :func:`plate_arrays`)
and the compliance of an elastic strip between a plate's edge and the junction line
(:func:`interlayer_compliance`).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np
import numpy.typing as npt

__all__ = ["PlateArrays", "interlayer_compliance", "plate_arrays"]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]


@dataclass(frozen=True)
class PlateArrays:
    """Stiffnesses of the ``N`` plates at a junction, each of shape ``(N, B)``.

    Attributes
    ----------
    bending : numpy.ndarray
        Bending stiffness ``D`` [N m].
    membrane : numpy.ndarray
        Membrane stiffness ``C = E h / (1 - nu^2)`` [N/m].
    shear : numpy.ndarray
        In-plane shear stiffness ``G h`` [N/m].
    mass : numpy.ndarray
        Mass per unit area ``m''`` [kg/m^2].
    poisson : numpy.ndarray
        Poisson's ratio [-].
    angle : numpy.ndarray
        Plate directions in the cross-section plane [rad], shape ``(N,)``.
    """

    bending: FloatArray
    membrane: FloatArray
    shear: FloatArray
    mass: FloatArray
    poisson: FloatArray
    angle: FloatArray

    @property
    def count(self) -> int:
        """Number of plates ``N``."""
        return int(self.angle.shape[0])

    def wavenumbers(self, f: FloatArray) -> tuple[FloatArray, FloatArray, FloatArray]:
        """Free bending, longitudinal and shear wavenumbers [rad/m], each ``(N, B)``.

        ``k_B = (omega^2 m''/D)^(1/4)``, ``k_L = omega sqrt(m''/C)``, ``k_S = omega sqrt(m''/(G h))``
        (Cremer, Heckl & Petersson 2005, *Structure-borne Sound*, 3rd ed., ch. 3).
        """
        w = 2.0 * math.pi * f
        k_b = (w**2 * self.mass / self.bending) ** 0.25
        k_l = w * np.sqrt(self.mass / self.membrane)
        k_s = w * np.sqrt(self.mass / self.shear)
        return k_b, k_l, k_s


def plate_arrays(
    thickness: Sequence[FloatArray] | FloatArray,
    youngs_modulus: Sequence[FloatArray] | FloatArray,
    density: Sequence[FloatArray] | FloatArray,
    poisson: Sequence[FloatArray] | FloatArray,
    angle: Sequence[float] | FloatArray,
    bending: Sequence[FloatArray] | FloatArray,
) -> PlateArrays:
    """Stack plate data (each ``(N, B)``; ``angle`` ``(N,)``) into :class:`PlateArrays`.

    ``bending`` is ``D`` computed by the caller with
    :func:`seatool.physics.plates.bending_stiffness` (one formula, one place).
    """
    h = np.asarray(thickness, dtype=np.float64)
    e = np.asarray(youngs_modulus, dtype=np.float64)
    rho = np.asarray(density, dtype=np.float64)
    nu = np.asarray(poisson, dtype=np.float64)
    return PlateArrays(
        bending=np.asarray(bending, dtype=np.float64),
        membrane=e * h / (1.0 - nu**2),
        shear=e * h / (2.0 * (1.0 + nu)),
        mass=rho * h,
        poisson=nu,
        angle=np.asarray(angle, dtype=np.float64),
    )


def interlayer_compliance(
    stiffness: float,
    *,
    width: float,
    shear_stiffness: float | None = None,
    loss_factor: float = 0.0,
) -> ComplexArray:
    """Compliance of an elastic strip under a plate's edge, in the edge dofs (u, v, w, theta).

    Parameters
    ----------
    stiffness : float
        Dynamic stiffness per unit length of seam in compression across the strip
        ``k'`` [N/m^2] (``s' b``: dynamic stiffness per unit area ``s'`` [N/m^3] of the
        resilient material times the strip width ``b``); ``inf`` for a rigid joint.
    width : float
        Width ``b`` of the strip across the seam [m], > 0 (usually the thickness of the
        plate standing on it; a very narrow strip passes almost no moment: a hinge).
    shear_stiffness : float, optional
        Dynamic stiffness per unit length in shear (both directions in the strip's
        plane) [N/m^2]; default ``k'/3``.
    loss_factor : float, optional
        Loss factor ``eta`` of the material [-]: stiffnesses ``k (1 + j eta)``.

    Returns
    -------
    numpy.ndarray
        ``(1/k', 1/k'_s, 1/k'_s, 1/k'_theta)`` (complex, shape ``(4,)``) [m^2/N, m^2/N,
        m^2/N, 1/N] for the plate's edge dofs: ``u`` (in the plate, compressing the strip),
        ``v`` (along the seam) and ``w`` (plate normal) shear the strip, ``theta`` rocks it.

    Notes
    -----
    The strip is a layer of independent springs (Winkler foundation) of stiffness
    ``k'/b`` per unit area of contact. Compression of the strip by ``u`` gives a force per
    unit length ``k' u``; a rotation ``theta`` of the plate's edge about the middle of the
    strip gives the moment per unit length
    ``int_{-b/2}^{b/2} (k'/b) theta x^2 dx = k' b^2 theta / 12`` [1]_. The default shear
    stiffness takes the strip as a free-to-bulge elastomer, ``G = E / 3``
    (``E = 2 G (1 + nu)``, ``nu = 0.5``) [2]_, so ``k'_s = G b / t = k' / 3``. A dynamic
    stiffness per unit area is what EN 29052-1 measures for resilient layers [3]_.

    References
    ----------
    .. [1] Hetenyi, M. (1946). Beams on Elastic Foundation. University of Michigan Press,
       ch. 1 (the Winkler foundation) (from memory).
    .. [2] Timoshenko, S.P., Goodier, J.N. (1970). Theory of Elasticity, 3rd ed.
       McGraw-Hill, sec. 3 (relations between the elastic constants).
    .. [3] EN 29052-1:1992 (ISO 9052-1:1989). Acoustics - Determination of dynamic
       stiffness - Part 1: Materials used under floating floors in dwellings, clause 3.
    """
    if not stiffness > 0.0:
        msg = f"stiffness must be > 0, got {stiffness!r}"
        raise ValueError(msg)
    if not (math.isfinite(width) and width > 0.0):
        msg = f"width must be finite and > 0, got {width!r}"
        raise ValueError(msg)
    ks = stiffness / 3.0 if shear_stiffness is None else shear_stiffness
    if not ks > 0.0:
        msg = f"shear_stiffness must be > 0, got {shear_stiffness!r}"
        raise ValueError(msg)
    if not (math.isfinite(loss_factor) and loss_factor >= 0.0):
        msg = f"loss_factor must be finite and >= 0, got {loss_factor!r}"
        raise ValueError(msg)
    k_rot = stiffness * width**2 / 12.0
    cplx = 1.0 + 1j * loss_factor
    out: ComplexArray = np.array(
        [0.0 if math.isinf(k) else 1.0 / (k * cplx) for k in (stiffness, ks, ks, k_rot)],
        dtype=np.complex128,
    )
    return out
