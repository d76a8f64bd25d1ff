"""Transfer-matrix method: sound transmission through layered trim and its insertion loss.

Transmission between two air half-spaces (:func:`transmission_coefficient`,
:func:`diffuse_transmission_coefficient`, :func:`transmission_loss`) and the insertion loss of
a trim on a base panel (:func:`insertion_loss`), from the layer matrices of
:mod:`seatool.physics.tmm`. Time convention exp(+j omega t); frequencies are vectorised; angle
integrals use Gauss-Legendre quadrature in u = sin^2(theta) (see :mod:`seatool.physics.tmm`).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Literal

import numpy as np
import numpy.typing as npt

from .air import AIR_DENSITY, AIR_SOUND_SPEED
from .tmm import FIELD_INCIDENCE_LIMIT, Layer, _angle_nodes, _prepare, _total_matrix, mass_per_area

__all__ = [
    "InsertionLossResult",
    "diffuse_transmission_coefficient",
    "insertion_loss",
    "transmission_coefficient",
    "transmission_loss",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]

# ------------------------------------------------------------------------------------------
# transmission
# ------------------------------------------------------------------------------------------


def _tau_from_matrix(t: ComplexArray, u: FloatArray, rho0: float, c0: float) -> FloatArray:
    zb = rho0 * c0 / np.sqrt(1.0 - u)
    den = t[..., 0, 0] + t[..., 0, 1] / zb + zb * t[..., 1, 0] + t[..., 1, 1]
    return np.asarray(np.abs(2.0 / den) ** 2, dtype=np.float64)


def transmission_coefficient(
    f: npt.ArrayLike,
    layers: Sequence[Layer],
    *,
    angle: npt.ArrayLike = 0.0,
    rho0: float = AIR_DENSITY,
    c0: float = AIR_SOUND_SPEED,
) -> FloatArray:
    """Plane-wave power transmission coefficient between two air half-spaces.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    layers : sequence of Layer
        The build-up.
    angle : float or array_like, optional
        Angle of incidence [rad].
    rho0, c0 : float, optional
        Air properties (same on both sides).

    Returns
    -------
    numpy.ndarray
        tau(theta) = |2 / (T11 + T12/Z + Z T21 + T22)|^2, Z = rho0 c0/cos(theta) [-].

    References
    ----------
    .. [1] Allard, J.F., Atalla, N. (2009) Propagation of Sound in Porous Media, 2nd ed.,
       Wiley, ISBN 978-0-470-74661-5, ch. 11.
    .. [2] Brouard, B., Lafarge, D., Allard, J.F. (1995) J. Sound Vib. 183(1), 129-142.
    """
    f_, u = _prepare(f, angle)
    t = _total_matrix(layers, f_, u, rho0, c0)
    return _tau_from_matrix(t, u, rho0, c0)


def diffuse_transmission_coefficient(
    f: npt.ArrayLike,
    layers: Sequence[Layer],
    *,
    max_angle: float = FIELD_INCIDENCE_LIMIT,
    rho0: float = AIR_DENSITY,
    c0: float = AIR_SOUND_SPEED,
    n_per_segment: int = 48,
) -> FloatArray:
    """Diffuse-field transmission coefficient integrated up to a limiting angle.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz] (scalar or 1-D).
    layers : sequence of Layer
        The build-up.
    max_angle : float, optional
        Limiting angle [rad]; default 78 deg (field incidence, common practice); use
        ``math.pi/2`` for random incidence.
    rho0, c0 : float, optional
        Air properties.
    n_per_segment : int, optional
        Gauss–Legendre points per angular segment.

    Returns
    -------
    numpy.ndarray
        tau_d = int_0^max tau sin cos d theta / int_0^max sin cos d theta [-].

    References
    ----------
    .. [1] Vigran, T.E. (2008) Building Acoustics, Taylor & Francis, ISBN 978-0-415-42853-8,
       ch. 6 (field incidence, eq. 6.102, and the ~78 deg limit).
    .. [2] Allard, J.F., Atalla, N. (2009) Propagation of Sound in Porous Media, 2nd ed.,
       Wiley, ISBN 978-0-470-74661-5, ch. 11.
    """
    if not 0.0 < max_angle <= 0.5 * math.pi:
        msg = f"max_angle must lie in (0, pi/2], got {max_angle!r}"
        raise ValueError(msg)
    f_, _ = _prepare(f, 0.0)
    f1 = np.atleast_1d(f_)
    u_max = math.sin(max_angle) ** 2
    u, w = _angle_nodes(f1, layers, u_max, n_per_segment, rho0, c0)
    t = _total_matrix(layers, f1, u, rho0, c0)
    tau = _tau_from_matrix(t, u, rho0, c0)
    return np.asarray((np.sum(tau * w, axis=0) / u_max).reshape(f_.shape), dtype=np.float64)


def transmission_loss(
    f: npt.ArrayLike,
    layers: Sequence[Layer],
    *,
    incidence: Literal["normal", "field", "random"] = "field",
    max_angle: float | None = None,
    rho0: float = AIR_DENSITY,
    c0: float = AIR_SOUND_SPEED,
    n_per_segment: int = 48,
) -> FloatArray:
    """Transmission loss R = -10 lg(tau) of a build-up between two air half-spaces [dB].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    layers : sequence of Layer
        The build-up.
    incidence : {"field", "normal", "random"}, optional
        ``"field"``: diffuse up to 78 deg (default); ``"random"``: up to 90 deg;
        ``"normal"``: theta = 0.
    max_angle : float, optional
        Overrides the limiting angle [rad] for diffuse incidence.
    rho0, c0 : float, optional
        Air properties.
    n_per_segment : int, optional
        Gauss–Legendre points per angular segment.

    Returns
    -------
    numpy.ndarray
        R [dB].

    References
    ----------
    .. [1] Vigran, T.E. (2008) Building Acoustics, Taylor & Francis, ISBN 978-0-415-42853-8.
    .. [2] Allard, J.F., Atalla, N. (2009) Propagation of Sound in Porous Media, 2nd ed.,
       Wiley, ISBN 978-0-470-74661-5, ch. 11.
    """
    if incidence == "normal":
        tau = transmission_coefficient(f, layers, rho0=rho0, c0=c0)
    elif incidence in ("field", "random"):
        lim = FIELD_INCIDENCE_LIMIT if incidence == "field" else 0.5 * math.pi
        tau = diffuse_transmission_coefficient(
            f,
            layers,
            max_angle=lim if max_angle is None else max_angle,
            rho0=rho0,
            c0=c0,
            n_per_segment=n_per_segment,
        )
    else:
        msg = f"incidence must be 'normal', 'field' or 'random', got {incidence!r}"
        raise ValueError(msg)
    return np.asarray(-10.0 * np.log10(tau), dtype=np.float64)


@dataclass(frozen=True)
class InsertionLossResult:
    """Insertion loss of a trim on a base build-up, per frequency.

    Attributes
    ----------
    insertion_loss : numpy.ndarray
        IL = R(base + trim) - R(base) [dB].
    transmission_loss_base : numpy.ndarray
        R of the base alone [dB].
    transmission_loss_treated : numpy.ndarray
        R of base plus trim [dB].
    base_mass_per_area : float
        Mass per area of the base [kg/m^2].
    trim_mass_per_area : float
        Mass per area of the trim (air not counted) [kg/m^2].
    """

    insertion_loss: FloatArray
    transmission_loss_base: FloatArray
    transmission_loss_treated: FloatArray
    base_mass_per_area: float
    trim_mass_per_area: float


def insertion_loss(
    f: npt.ArrayLike,
    base: Sequence[Layer],
    trim: Sequence[Layer],
    *,
    trim_side: Literal["receiver", "source"] = "receiver",
    incidence: Literal["normal", "field", "random"] = "field",
    max_angle: float | None = None,
    rho0: float = AIR_DENSITY,
    c0: float = AIR_SOUND_SPEED,
    n_per_segment: int = 48,
) -> InsertionLossResult:
    """Insertion loss of a trim build-up added onto a base panel.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    base : sequence of Layer
        The bare structure (e.g. one :class:`PlateLayer`).
    trim : sequence of Layer
        Trim layers, listed from the base outwards.
    trim_side : {"receiver", "source"}, optional
        Side of the base on which the trim lies.
    incidence, max_angle, rho0, c0, n_per_segment
        As in :func:`transmission_loss` (default field incidence, 78 deg).

    Returns
    -------
    InsertionLossResult
        IL [dB], both transmission losses [dB] and the masses per area [kg/m^2].

    References
    ----------
    .. [1] Allard, J.F., Atalla, N. (2009) Propagation of Sound in Porous Media, 2nd ed.,
       Wiley, ISBN 978-0-470-74661-5, ch. 11.
    """
    if trim_side == "receiver":
        treated = [*base, *trim]
    elif trim_side == "source":
        treated = [*reversed(trim), *base]
    else:
        msg = f"trim_side must be 'receiver' or 'source', got {trim_side!r}"
        raise ValueError(msg)
    r0, r1 = (
        transmission_loss(
            f,
            layers,
            incidence=incidence,
            max_angle=max_angle,
            rho0=rho0,
            c0=c0,
            n_per_segment=n_per_segment,
        )
        for layers in (base, treated)
    )
    return InsertionLossResult(
        insertion_loss=np.asarray(r1 - r0, dtype=np.float64),
        transmission_loss_base=r0,
        transmission_loss_treated=r1,
        base_mass_per_area=mass_per_area(base),
        trim_mass_per_area=mass_per_area(trim),
    )
