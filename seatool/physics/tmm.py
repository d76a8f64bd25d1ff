"""Transfer-matrix method (TMM) for layered acoustic trim at oblique plane-wave incidence.

Each layer relates the acoustic state vector (p, v_x) (pressure [Pa] and normal particle
velocity [m/s]) on its front face to that on its back face, ``[p, v]_front = T [p, v]_back``,
for a plane wave with trace wavenumber k_t = k0 sin(theta) common to all layers (Snell).
Time convention exp(+j omega t).

Layer kinds (frozen dataclasses, any order):

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
from dataclasses import dataclass
from typing import Literal, TypeAlias

import numpy as np
import numpy.typing as npt

from seatool.physics import porous as _porous

from .air import AIR_DENSITY, AIR_SOUND_SPEED
from .plates import bending_stiffness

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


def _positive(name: str, value: float) -> float:
    v = float(value)
    if not math.isfinite(v) or v <= 0.0:
        msg = f"{name} must be finite and > 0, got {value!r}"
        raise ValueError(msg)
    return v


def _non_negative(name: str, value: float) -> float:
    v = float(value)
    if not math.isfinite(v) or v < 0.0:
        msg = f"{name} must be finite and >= 0, got {value!r}"
        raise ValueError(msg)
    return v


# ------------------------------------------------------------------------------------------
# layers
# ------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class AirLayer:
    """A gap filled with the surrounding fluid (air).

    Parameters
    ----------
    thickness : float
        Gap depth [m].
    """

    thickness: float

    def __post_init__(self) -> None:
        _positive("AirLayer.thickness", self.thickness)

    @property
    def mass_per_area(self) -> float:
        """Mass per area counted for the build-up [kg/m^2]: 0 (air is not counted)."""
        return 0.0


@dataclass(frozen=True)
class PorousLayer:
    """A fluid-equivalent porous layer.

    Parameters
    ----------
    thickness : float
        Layer thickness [m].
    model : {"delany_bazley", "miki", "jca"}
        Equivalent-fluid model (see :mod:`seatool.physics.porous`).
    flow_resistivity : float
        Static airflow resistivity sigma [Pa s/m^2].
    porosity : float, optional
        Open porosity phi [-] (JCA and limp frame only).
    tortuosity : float, optional
        alpha_inf [-] (JCA only).
    viscous_length, thermal_length : float, optional
        Lambda, Lambda' [m] (JCA only; required for it).
    bulk_density : float, optional
        Apparent density of the frame [kg/m^3]; gives the layer's mass per area and is needed
        for ``frame="limp"``.
    frame : {"rigid", "limp"}, optional
        Frame model (limp only with ``model="jca"``).
    """

    thickness: float
    model: Literal["delany_bazley", "miki", "jca"]
    flow_resistivity: float
    porosity: float = 0.98
    tortuosity: float = 1.0
    viscous_length: float | None = None
    thermal_length: float | None = None
    bulk_density: float = 0.0
    frame: Literal["rigid", "limp"] = "rigid"

    def __post_init__(self) -> None:
        _positive("PorousLayer.thickness", self.thickness)
        _positive("PorousLayer.flow_resistivity", self.flow_resistivity)
        _non_negative("PorousLayer.bulk_density", self.bulk_density)
        if self.model not in ("delany_bazley", "miki", "jca"):
            msg = f"PorousLayer.model must be 'delany_bazley', 'miki' or 'jca', got {self.model!r}"
            raise ValueError(msg)
        if self.model == "jca" and (self.viscous_length is None or self.thermal_length is None):
            msg = "PorousLayer with model='jca' needs viscous_length and thermal_length"
            raise ValueError(msg)
        if self.frame not in ("rigid", "limp"):
            msg = f"PorousLayer.frame must be 'rigid' or 'limp', got {self.frame!r}"
            raise ValueError(msg)
        if self.frame == "limp" and (self.model != "jca" or self.bulk_density <= 0.0):
            msg = "PorousLayer frame='limp' needs model='jca' and bulk_density > 0"
            raise ValueError(msg)

    @property
    def mass_per_area(self) -> float:
        """Frame mass per area [kg/m^2]."""
        return self.bulk_density * self.thickness

    def impedance_wavenumber(
        self, f: FloatArray, rho0: float, c0: float
    ) -> tuple[ComplexArray, ComplexArray]:
        """Characteristic impedance [Pa s/m] and wavenumber [rad/m] at frequencies f."""
        if self.model == "delany_bazley":
            return _porous.delany_bazley(f, self.flow_resistivity, rho0=rho0, c0=c0)
        if self.model == "miki":
            return _porous.miki(f, self.flow_resistivity, rho0=rho0, c0=c0)
        assert self.viscous_length is not None and self.thermal_length is not None
        return _porous.johnson_champoux_allard(
            f,
            self.porosity,
            self.tortuosity,
            self.flow_resistivity,
            self.viscous_length,
            self.thermal_length,
            frame=self.frame,
            bulk_density=self.bulk_density,
            rho0=rho0,
        )


@dataclass(frozen=True)
class LimpLayer:
    """A limp impervious heavy layer (mass law, no bending stiffness).

    Parameters
    ----------
    surface_mass : float
        Mass per area m'' [kg/m^2].
    """

    surface_mass: float

    def __post_init__(self) -> None:
        _positive("LimpLayer.surface_mass", self.surface_mass)

    @property
    def mass_per_area(self) -> float:
        """Mass per area [kg/m^2]."""
        return self.surface_mass


@dataclass(frozen=True)
class PlateLayer:
    """A thin elastic (Kirchhoff) plate of infinite extent.

    Parameters
    ----------
    thickness : float
        Plate thickness h [m].
    young : float
        Young's modulus E [Pa].
    density : float
        Density [kg/m^3].
    poisson : float, optional
        Poisson's ratio (default 0.3).
    loss_factor : float, optional
        Loss factor eta (default 0.01).
    """

    thickness: float
    young: float
    density: float
    poisson: float = 0.3
    loss_factor: float = 0.01

    def __post_init__(self) -> None:
        _positive("PlateLayer.thickness", self.thickness)
        _positive("PlateLayer.young", self.young)
        _positive("PlateLayer.density", self.density)
        _non_negative("PlateLayer.loss_factor", self.loss_factor)
        if not -1.0 < self.poisson < 0.5:
            msg = f"PlateLayer.poisson must lie in (-1, 0.5), got {self.poisson!r}"
            raise ValueError(msg)

    @property
    def mass_per_area(self) -> float:
        """Mass per area rho h [kg/m^2]."""
        return self.density * self.thickness

    @property
    def bending_stiffness(self) -> float:
        """D = E h^3 / (12 (1 - nu^2)) [N m]."""
        return float(bending_stiffness(self.young, self.thickness, self.poisson))

    def critical_frequency(self, c0: float = AIR_SOUND_SPEED) -> float:
        """Coincidence frequency f_c = (c0^2/(2 pi)) sqrt(m''/D) [Hz]."""
        return c0**2 / (2.0 * math.pi) * math.sqrt(self.mass_per_area / self.bending_stiffness)


Layer: TypeAlias = AirLayer | PorousLayer | LimpLayer | PlateLayer


def mass_per_area(layers: Sequence[Layer]) -> float:
    """Mass per area of a build-up [kg/m^2] (air not counted, porous frames counted).

    Parameters
    ----------
    layers : sequence of Layer
        The build-up.

    Returns
    -------
    float
        Sum of the layers' ``mass_per_area``.
    """
    return float(sum(layer.mass_per_area for layer in layers))


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
