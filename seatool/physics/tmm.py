"""Transfer-matrix method (TMM) for layered acoustic trim at oblique plane-wave incidence.

Each layer relates the acoustic state vector (p, v_x) (pressure [Pa] and normal particle
velocity [m/s]) on its front face to that on its back face, ``[p, v]_front = T [p, v]_back``,
for a plane wave with trace wavenumber k_t = k0 sin(theta) common to all layers (Snell).
Time convention exp(+j omega t).

Layer kinds (frozen dataclasses in :mod:`seatool.physics.tmm_layers`, also reachable from
here; any order):

* :class:`AirLayer` -- a gap of the surrounding air.
* :class:`PorousLayer` -- a fluid-equivalent porous layer (Delany–Bazley, Miki or
  Johnson–Champoux–Allard from :mod:`seatool.physics.porous`, rigid or limp frame).
* :class:`LimpLayer` -- a limp impervious heavy layer, series impedance j omega m''.
* :class:`PlateLayer` -- a thin elastic plate, series impedance
  j omega m'' (1 - (f/f_c)^2 sin^4(theta) (1 + j eta)).

Fluid layers transmit normal velocity (Darcy velocity in porous layers) continuously; a limp
or plate layer moves as a whole with the fluid on both faces (no decoupling film). The whole
build-up is therefore *extended reacting*.

Results: rigid-backed surface impedance and absorption (:func:`surface_impedance`,
:func:`absorption`, :func:`diffuse_absorption`); transmission and insertion loss from these
matrices are in :mod:`seatool.physics.tmm_transmission`. Frequencies are vectorised; angle integrals use Gauss–Legendre
quadrature in u = sin^2(theta), graded towards the coincidence angle of each plate.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import Literal

import numpy as np
import numpy.typing as npt

from .air import AIR_DENSITY, AIR_SOUND_SPEED
from .tmm_layers import AirLayer, Layer, LimpLayer, PlateLayer, PorousLayer, mass_per_area

__all__ = [
    "FIELD_INCIDENCE_LIMIT",
    "AirLayer",
    "Layer",
    "LimpLayer",
    "PlateLayer",
    "PorousLayer",
    "absorption",
    "diffuse_absorption",
    "mass_per_area",
    "surface_impedance",
    "transfer_matrix",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]

#: Upper incidence angle of "field incidence" [rad]: 78 degrees (common practice; Vigran
#: 2008 notes integrating the infinite-plate transmission up to about 78 deg reproduces the
#: field-incidence mass law).
FIELD_INCIDENCE_LIMIT: float = math.radians(78.0)


# ------------------------------------------------------------------------------------------
# matrices
# ------------------------------------------------------------------------------------------


def _fluid_matrix(zc: ComplexArray, kc: ComplexArray, d: float, kt2: FloatArray) -> ComplexArray:
    kx = np.sqrt(kc**2 - kt2)
    kx = np.where(kx.imag > 0.0, -kx, kx)
    wrho = zc * kc  # omega * rho_eq
    sinc = np.sinc(kx * d / math.pi)  # sin(kx d)/(kx d), finite at kx = 0
    t = np.empty(np.broadcast_shapes(kx.shape) + (2, 2), dtype=np.complex128)
    t[..., 0, 0] = np.cos(kx * d)
    t[..., 0, 1] = 1j * wrho * d * sinc
    t[..., 1, 0] = 1j * kx**2 * d * sinc / wrho
    t[..., 1, 1] = t[..., 0, 0]
    return t


def _series_matrix(z: ComplexArray) -> ComplexArray:
    t = np.zeros(z.shape + (2, 2), dtype=np.complex128)
    t[..., 0, 0] = 1.0
    t[..., 1, 1] = 1.0
    t[..., 0, 1] = z
    return t


def _layer_matrix(
    layer: Layer, f: FloatArray, u: FloatArray, rho0: float, c0: float
) -> ComplexArray:
    """Transfer matrix of one layer; f shape (nf,), u = sin^2(theta) broadcastable to it."""
    omega = 2.0 * math.pi * f
    k0 = omega / c0
    kt2 = np.broadcast_to(k0**2 * u, np.broadcast_shapes(f.shape, u.shape))
    if isinstance(layer, AirLayer):
        zc = np.asarray(rho0 * c0 + 0j * f, dtype=np.complex128)
        return _fluid_matrix(zc, np.asarray(k0 + 0j, dtype=np.complex128), layer.thickness, kt2)
    if isinstance(layer, PorousLayer):
        zc, kc = layer.impedance_wavenumber(f, rho0, c0)
        return _fluid_matrix(zc, kc, layer.thickness, kt2)
    if isinstance(layer, LimpLayer):
        z = 1j * omega * layer.surface_mass + 0j * kt2
        return _series_matrix(np.asarray(z, dtype=np.complex128))
    if isinstance(layer, PlateLayer):
        m = layer.mass_per_area
        dstar = layer.bending_stiffness * (1.0 + 1j * layer.loss_factor)
        z = 1j * omega * m * (1.0 - dstar * kt2**2 / (omega**2 * m))
        return _series_matrix(np.asarray(z, dtype=np.complex128))
    msg = f"unknown layer type {type(layer).__name__}"
    raise TypeError(msg)


def _total_matrix(
    layers: Sequence[Layer], f: FloatArray, u: FloatArray, rho0: float, c0: float
) -> ComplexArray:
    if len(layers) == 0:
        msg = "layers must contain at least one layer"
        raise ValueError(msg)
    shape = np.broadcast_shapes(f.shape, u.shape)
    total = np.broadcast_to(np.eye(2, dtype=np.complex128), shape + (2, 2)).copy()
    for layer in layers:
        total = total @ _layer_matrix(layer, f, u, rho0, c0)
    return total


def _prepare(f: npt.ArrayLike, angle: npt.ArrayLike) -> tuple[FloatArray, FloatArray]:
    f_ = np.asarray(f, dtype=np.float64)
    if not np.all(np.isfinite(f_)) or np.any(f_ <= 0.0):
        msg = f"f must be finite and > 0, got {f!r}"
        raise ValueError(msg)
    th = np.asarray(angle, dtype=np.float64)
    if np.any(th < 0.0) or np.any(th >= 0.5 * math.pi):
        msg = f"angle must lie in [0, pi/2) [rad], got {angle!r}"
        raise ValueError(msg)
    return f_, np.sin(th) ** 2


def transfer_matrix(
    f: npt.ArrayLike,
    layers: Sequence[Layer],
    *,
    angle: npt.ArrayLike = 0.0,
    rho0: float = AIR_DENSITY,
    c0: float = AIR_SOUND_SPEED,
) -> ComplexArray:
    """Total transfer matrix of a build-up, front (incidence side) to back.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    layers : sequence of Layer
        Layers in order from the incidence side.
    angle : float or array_like, optional
        Angle of incidence in the surrounding air [rad], broadcast against ``f``.
    rho0, c0 : float, optional
        Density [kg/m^3] and sound speed [m/s] of the surrounding air.

    Returns
    -------
    numpy.ndarray of complex
        Shape ``broadcast(f, angle).shape + (2, 2)``; ``[p, v]_front = T [p, v]_back``.

    Notes
    -----
    Fluid layer (Z_c, k_c, d), k_x = sqrt(k_c^2 - k_t^2), Im(k_x) <= 0:
    T = [[cos k_x d, j (omega rho/k_x) sin k_x d], [j (k_x/(omega rho)) sin k_x d, cos k_x d]],
    omega rho = Z_c k_c.  Limp or plate layer with series impedance Z: T = [[1, Z], [0, 1]].

    References
    ----------
    .. [1] Brouard, B., Lafarge, D., Allard, J.F. (1995) "A general method of modelling sound
       propagation in layered media", J. Sound Vib. 183(1), 129-142,
       doi:10.1006/jsvi.1995.0243.
    .. [2] Allard, J.F., Atalla, N. (2009) Propagation of Sound in Porous Media, 2nd ed.,
       Wiley, ISBN 978-0-470-74661-5, ch. 11.
    """
    f_, u = _prepare(f, angle)
    return _total_matrix(layers, f_, u, rho0, c0)


def _zs_from_matrix(t: ComplexArray, backing: str, zb: npt.ArrayLike) -> ComplexArray:
    if backing == "rigid":
        return np.asarray(t[..., 0, 0] / t[..., 1, 0], dtype=np.complex128)
    if backing == "anechoic":
        z = np.asarray(zb)
        return np.asarray(
            (t[..., 0, 0] * z + t[..., 0, 1]) / (t[..., 1, 0] * z + t[..., 1, 1]),
            dtype=np.complex128,
        )
    msg = f"backing must be 'rigid' or 'anechoic', got {backing!r}"
    raise ValueError(msg)


def surface_impedance(
    f: npt.ArrayLike,
    layers: Sequence[Layer],
    *,
    angle: npt.ArrayLike = 0.0,
    backing: Literal["rigid", "anechoic"] = "rigid",
    rho0: float = AIR_DENSITY,
    c0: float = AIR_SOUND_SPEED,
) -> ComplexArray:
    """Surface impedance Z_s = p/v_x of a build-up at an angle of incidence.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    layers : sequence of Layer
        Layers from the exposed face to the backing.
    angle : float or array_like, optional
        Angle of incidence [rad].
    backing : {"rigid", "anechoic"}, optional
        Rigid wall (Z_s = T11/T21) or a semi-infinite air space behind (Z_b = rho0 c0/cos).
    rho0, c0 : float, optional
        Air properties.

    Returns
    -------
    numpy.ndarray of complex
        Z_s [Pa s/m].

    References
    ----------
    .. [1] Allard, J.F., Atalla, N. (2009) Propagation of Sound in Porous Media, 2nd ed.,
       Wiley, ISBN 978-0-470-74661-5, ch. 11.
    """
    f_, u = _prepare(f, angle)
    t = _total_matrix(layers, f_, u, rho0, c0)
    return _zs_from_matrix(t, backing, rho0 * c0 / np.sqrt(1.0 - u))


def _reflection_absorption(zs: ComplexArray, u: FloatArray, rho0: float, c0: float) -> FloatArray:
    c = np.sqrt(1.0 - u)
    r = (zs * c - rho0 * c0) / (zs * c + rho0 * c0)
    return np.asarray(1.0 - np.abs(r) ** 2, dtype=np.float64)


def absorption(
    f: npt.ArrayLike,
    layers: Sequence[Layer],
    *,
    angle: npt.ArrayLike = 0.0,
    backing: Literal["rigid", "anechoic"] = "rigid",
    rho0: float = AIR_DENSITY,
    c0: float = AIR_SOUND_SPEED,
) -> FloatArray:
    """Plane-wave absorption coefficient of a build-up at an angle.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    layers : sequence of Layer
        Layers from the exposed face to the backing.
    angle : float or array_like, optional
        Angle of incidence [rad].
    backing : {"rigid", "anechoic"}, optional
        See :func:`surface_impedance`.
    rho0, c0 : float, optional
        Air properties.

    Returns
    -------
    numpy.ndarray
        alpha(theta) = 1 - |R|^2 [-].

    References
    ----------
    .. [1] Allard, J.F., Atalla, N. (2009) Propagation of Sound in Porous Media, 2nd ed.,
       Wiley, ISBN 978-0-470-74661-5, ch. 11.
    """
    f_, u = _prepare(f, angle)
    t = _total_matrix(layers, f_, u, rho0, c0)
    if backing == "rigid":
        # R = (Zs cos - rho c)/(Zs cos + rho c) with Zs = T11/T21 written without dividing,
        # so an impervious build-up on the wall (T21 = 0, Zs infinite) gives alpha = 0.
        c = np.sqrt(1.0 - u)
        num = t[..., 0, 0] * c - rho0 * c0 * t[..., 1, 0]
        den = t[..., 0, 0] * c + rho0 * c0 * t[..., 1, 0]
        return np.asarray(1.0 - np.abs(num / den) ** 2, dtype=np.float64)
    zs = _zs_from_matrix(t, backing, rho0 * c0 / np.sqrt(1.0 - u))
    return _reflection_absorption(zs, u, rho0, c0)


# ------------------------------------------------------------------------------------------
# angle quadrature in u = sin^2(theta)
# ------------------------------------------------------------------------------------------


_MAX_GAP_MODES = 64


def _mass_spring_frequencies(layers: Sequence[Layer], rho0: float, c0: float) -> list[float]:
    """Normal-incidence mass-air-mass frequencies of consecutive impervious layers."""
    out: list[float] = []
    last_mass: float | None = None
    gap = 0.0
    for layer in layers:
        if isinstance(layer, LimpLayer | PlateLayer):
            m = layer.mass_per_area
            if last_mass is not None and gap > 0.0:
                stiff = rho0 * c0**2 / gap
                out.append(math.sqrt(stiff * (1.0 / m + 1.0 / last_mass)) / (2.0 * math.pi))
            last_mass, gap = m, 0.0
        else:
            gap += layer.thickness
    return out


def _angle_nodes(
    f: FloatArray,
    layers: Sequence[Layer],
    u_max: float,
    n_per_segment: int,
    rho0: float,
    c0: float,
) -> tuple[FloatArray, FloatArray]:
    """Nodes u (n_nodes, nf) and weights for int_0^u_max g(u) du, graded at breakpoints.

    Breakpoints are 0, u_max, the coincidence values u_c = f_c/f of every plate and the
    angles 1 - (f_0/f)^2 at which the mass-air-mass resonance f_0/cos(theta) of two
    impervious layers falls, and the angles of the standing waves across each air gap
    (all clipped to [0, u_max]; an absent feature gives an empty segment).  Each segment uses
    Gauss–Legendre points mapped by s^4/(s^4 + (1-s)^4), which clusters nodes at both ends.
    """
    fcs = [layer.critical_frequency(c0) for layer in layers if isinstance(layer, PlateLayer)]
    brk = [np.zeros_like(f), np.full_like(f, u_max)]
    brk += [np.minimum(fc / f, u_max) for fc in fcs]
    brk += [
        np.clip(1.0 - (f0 / f) ** 2, 0.0, u_max)
        for f0 in _mass_spring_frequencies(layers, rho0, c0)
    ]
    for layer in layers:  # standing waves across air gaps: k0 d cos(theta) = n pi
        if isinstance(layer, AirLayer):
            n_max = min(int(2.0 * float(np.max(f)) * layer.thickness / c0), _MAX_GAP_MODES)
            for n in range(1, n_max + 1):
                brk.append(np.clip(1.0 - (n * c0 / (2.0 * f * layer.thickness)) ** 2, 0.0, u_max))
    b = np.sort(np.stack(brk), axis=0)  # (n_break, nf)
    x, w = np.polynomial.legendre.leggauss(n_per_segment)
    s = 0.5 * (x + 1.0)
    ws = 0.5 * w
    p = 4.0
    den = s**p + (1.0 - s) ** p
    g = s**p / den
    dg = p * s ** (p - 1.0) * (1.0 - s) ** (p - 1.0) / den**2
    lo, hi = b[:-1, None, :], b[1:, None, :]
    u = lo + (hi - lo) * g[None, :, None]
    wt = (hi - lo) * (ws * dg)[None, :, None]
    nf = f.shape[0]
    return u.reshape(-1, nf), wt.reshape(-1, nf)


def diffuse_absorption(
    f: npt.ArrayLike,
    layers: Sequence[Layer],
    *,
    backing: Literal["rigid", "anechoic"] = "rigid",
    rho0: float = AIR_DENSITY,
    c0: float = AIR_SOUND_SPEED,
    n_per_segment: int = 48,
) -> FloatArray:
    """Diffuse-field absorption coefficient of a build-up (Paris integral, extended reaction).

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz] (scalar or 1-D).
    layers : sequence of Layer
        Layers from the exposed face to the backing.
    backing : {"rigid", "anechoic"}, optional
        See :func:`surface_impedance`.
    rho0, c0 : float, optional
        Air properties.
    n_per_segment : int, optional
        Gauss–Legendre points per angular segment.

    Returns
    -------
    numpy.ndarray
        alpha_d = int_0^{pi/2} alpha(theta) sin(2 theta) d theta = int_0^1 alpha du [-].

    Notes
    -----
    The angle dependence of Z_s is that of the layered medium itself (refraction in each
    layer), i.e. the build-up is treated as extended reacting.

    References
    ----------
    .. [1] Paris, E.T. (1928) Phil. Mag. 5(29), 489-497.
    .. [2] Allard, J.F., Atalla, N. (2009) Propagation of Sound in Porous Media, 2nd ed.,
       Wiley, ISBN 978-0-470-74661-5, ch. 11.
    """
    f_, _ = _prepare(f, 0.0)
    f1 = np.atleast_1d(f_)
    u, w = _angle_nodes(f1, layers, 1.0, n_per_segment, rho0, c0)
    t = _total_matrix(layers, f1, u, rho0, c0)
    zs = _zs_from_matrix(t, backing, rho0 * c0 / np.sqrt(1.0 - u))
    a = _reflection_absorption(zs, u, rho0, c0)
    return np.asarray(np.sum(a * w, axis=0).reshape(f_.shape), dtype=np.float64)
