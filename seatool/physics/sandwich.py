"""Sandwich panels with a shear-flexible core: section, dispersion and modal density.

All functions are pure and vectorised: array arguments broadcast against each other and
the result has the broadcast shape. SI units throughout. Modal densities are in modes per
hertz, ``n(f) = 2*pi*n(omega)``.

The formulas and their sources are collected in ``docs/theory/subsystems.md``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import numpy.typing as npt

from ._checks import nonnegative as _nonnegative
from ._checks import poisson as _poisson
from ._checks import positive as _positive
from .memo import memoised

__all__ = [
    "SandwichSection",
    "sandwich_critical_frequency",
    "sandwich_group_speed",
    "sandwich_modal_density",
    "sandwich_phase_speed",
    "sandwich_section",
    "sandwich_wavenumber",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]


# ---------------------------------------------------------------------------------------
# sandwich panels
# ---------------------------------------------------------------------------------------
@dataclass(frozen=True)
class SandwichSection:
    """Section properties of a symmetric sandwich panel (per unit width).

    Attributes
    ----------
    face_bending_stiffness : float
        D_f, sum of the face sheets' own bending stiffnesses [N m].
    sandwich_bending_stiffness : float
        D_0, parallel-axis (membrane) contribution of the faces [N m].
    shear_stiffness : float
        S, transverse shear stiffness of the core [N/m].
    surface_density : float
        Total mass per unit area m'' [kg/m^2].
    """

    face_bending_stiffness: float
    sandwich_bending_stiffness: float
    shear_stiffness: float
    surface_density: float

    @property
    def total_bending_stiffness(self) -> float:
        """Whole-section bending stiffness D_f + D_0 [N m] (no core shear)."""
        return self.face_bending_stiffness + self.sandwich_bending_stiffness


def sandwich_section(
    face_youngs_modulus: float,
    face_poisson_ratio: float,
    face_thickness: float,
    face_density: float,
    core_shear_modulus: float,
    core_thickness: float,
    core_density: float,
) -> SandwichSection:
    """Section properties of a symmetric sandwich panel with a shear-flexible core.

    Parameters
    ----------
    face_youngs_modulus : float
        Young's modulus of each face sheet E_f [Pa].
    face_poisson_ratio : float
        Poisson's ratio of the face sheets [-].
    face_thickness : float
        Thickness of each face sheet t [m].
    face_density : float
        Density of the face sheets [kg/m^3].
    core_shear_modulus : float
        Transverse shear modulus of the core G_c [Pa].
    core_thickness : float
        Core thickness c [m].
    core_density : float
        Core density [kg/m^3].

    Returns
    -------
    SandwichSection
        D_f = 2 E_f t^3 / (12 (1 - nu^2)), D_0 = E_f t d^2 / (2 (1 - nu^2)),
        S = G_c d^2 / c, m'' = 2 rho_f t + rho_c c, with d = c + t the distance between
        the face centroids.

    Notes
    -----
    Thick-face sandwich theory of Allen (1969), ch. 3: the core carries transverse shear
    only (its own bending and in-plane stiffness neglected); plate moduli E/(1 - nu^2)
    replace beam moduli.

    References
    ----------
    .. [1] Allen, H.G. (1969). Analysis and Design of Structural Sandwich Panels,
       Pergamon, ch. 2-3 (flexural and shear stiffness; thick faces; from memory).
    .. [2] Zenkert, D. (1995). An Introduction to Sandwich Construction, EMAS,
       ISBN 0-947817-77-8, ch. 3 (from memory).
    """
    ef = float(_positive("face_youngs_modulus", face_youngs_modulus))
    nu = float(_poisson(face_poisson_ratio))
    t = float(_positive("face_thickness", face_thickness))
    rho_f = float(_positive("face_density", face_density))
    gc = float(_positive("core_shear_modulus", core_shear_modulus))
    c = float(_positive("core_thickness", core_thickness))
    rho_c = float(_nonnegative("core_density", core_density))
    ep = ef / (1.0 - nu**2)
    d = c + t
    return SandwichSection(
        face_bending_stiffness=2.0 * ep * t**3 / 12.0,
        sandwich_bending_stiffness=0.5 * ep * t * d**2,
        shear_stiffness=gc * d**2 / c,
        surface_density=2.0 * rho_f * t + rho_c * c,
    )


def _sandwich_k2(omega: FloatArray, sec: SandwichSection) -> FloatArray:
    """Solve the sandwich dispersion for x = k^2 by bisection in log space (vectorised)."""
    df = sec.face_bending_stiffness
    d0 = sec.sandwich_bending_stiffness
    s = sec.shear_stiffness
    m = sec.surface_density

    def residual(x: FloatArray) -> FloatArray:
        return np.asarray(x**2 * (df + d0 * s / (d0 * x + s)) - m * omega**2, dtype=np.float64)

    # the root lies between the whole-section and the face-sheet bending solutions
    lo = np.log(omega * np.sqrt(m / (df + d0)))
    hi = np.log(omega * np.sqrt(m / df))
    for _ in range(80):
        mid = 0.5 * (lo + hi)
        pos = residual(np.exp(mid)) > 0.0
        hi = np.where(pos, mid, hi)
        lo = np.where(pos, lo, mid)
    x = np.exp(0.5 * (lo + hi))
    # two Newton polishing steps
    for _ in range(2):
        g = residual(x)
        dg = 2.0 * x * (df + d0 * s / (d0 * x + s)) - x**2 * d0**2 * s / (d0 * x + s) ** 2
        x = x - g / dg
    return np.asarray(x, dtype=np.float64)


@memoised(maxsize=256)
def sandwich_wavenumber(f: npt.ArrayLike, section: SandwichSection) -> FloatArray:
    """Free bending wavenumber of a sandwich panel with a shear-flexible core.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    section : SandwichSection
        Section properties (:func:`sandwich_section`).

    Returns
    -------
    numpy.ndarray
        Real positive root k [rad/m] of the sixth-order dispersion relation

        m'' omega^2 = k^4 (D_f + D_0 S / (D_0 k^2 + S)),

        i.e. D_f D_0 k^6 + (D_f + D_0) S k^4 - m'' omega^2 D_0 k^2 - m'' omega^2 S = 0.

    Notes
    -----
    Low frequency: k -> (m'' omega^2 / (D_f + D_0))^(1/4), whole-section bending.
    Intermediate: core shear, m'' omega^2 ~ S k^2. High frequency: k ->
    (m'' omega^2 / D_f)^(1/4), bending of the face sheets alone. Rotary and in-plane
    inertia and core compression are neglected (no dilatational resonance). The
    equation is the thick-face sandwich beam equation of Allen (1969) in plate form and
    the real-modulus special case of the sixth-order equation of Mead & Markus (1969).
    The left side is monotonic in k^2, so the positive root is unique; it is found by
    bisection between the two bending limits.

    References
    ----------
    .. [1] Allen, H.G. (1969). Analysis and Design of Structural Sandwich Panels,
       Pergamon, ch. 3 (thick faces; from memory).
    .. [2] Mead, D.J., Markus, S. (1969). The forced vibration of a three-layer, damped
       sandwich beam with arbitrary boundary conditions. J. Sound Vib. 10(2), 163-175.
    .. [3] Nilsson, A.C. (1990). Wave propagation in and sound transmission through
       sandwich plates. J. Sound Vib. 138(1), 73-94.
    """
    fr = _positive("f", f)
    return np.asarray(np.sqrt(_sandwich_k2(2.0 * np.pi * fr, section)), dtype=np.float64)


def sandwich_phase_speed(f: npt.ArrayLike, section: SandwichSection) -> FloatArray:
    """Bending phase speed omega / k of a sandwich panel [m/s].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    section : SandwichSection
        Section properties.

    Returns
    -------
    numpy.ndarray
        Phase speed [m/s] from :func:`sandwich_wavenumber`.

    References
    ----------
    .. [1] Nilsson, A.C. (1990). J. Sound Vib. 138(1), 73-94.
    """
    k = sandwich_wavenumber(f, section)
    return np.asarray(2.0 * np.pi * np.asarray(f, dtype=np.float64) / k, dtype=np.float64)


def sandwich_group_speed(f: npt.ArrayLike, section: SandwichSection) -> FloatArray:
    """Bending group speed d omega / dk of a sandwich panel [m/s].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    section : SandwichSection
        Section properties.

    Returns
    -------
    numpy.ndarray
        c_g = (4 k^3 B + k^4 dB/dk) / (2 m'' omega) [m/s] with
        B(k) = D_f + D_0 S / (D_0 k^2 + S) (differentiated dispersion relation of
        :func:`sandwich_wavenumber`).

    References
    ----------
    .. [1] Nilsson, A.C. (1990). J. Sound Vib. 138(1), 73-94.
    """
    fr = _positive("f", f)
    omega = 2.0 * np.pi * fr
    k = sandwich_wavenumber(fr, section)
    df = section.face_bending_stiffness
    d0 = section.sandwich_bending_stiffness
    s = section.shear_stiffness
    b = df + d0 * s / (d0 * k**2 + s)
    db = -2.0 * d0**2 * s * k / (d0 * k**2 + s) ** 2
    return np.asarray(
        (4.0 * k**3 * b + k**4 * db) / (2.0 * section.surface_density * omega), dtype=np.float64
    )


def sandwich_modal_density(
    f: npt.ArrayLike, area: npt.ArrayLike, section: SandwichSection
) -> FloatArray:
    """Asymptotic bending modal density of a sandwich panel [modes/Hz].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    area : float or array_like
        Panel area S [m^2].
    section : SandwichSection
        Section properties.

    Returns
    -------
    numpy.ndarray
        n(f) = S k / c_g = 2 pi f S / (c_p c_g) [modes/Hz].

    Notes
    -----
    Two-dimensional Weyl count N = S k^2 / (4 pi) of an in-plane isotropic dispersive wave
    field. Tends to the plate value with D_f + D_0 at low and with D_f at high frequency.

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5, ch. 8 (modal density
       from the dispersion relation; from memory).
    .. [2] Nilsson, A.C. (1990). J. Sound Vib. 138(1), 73-94.
    """
    s = _positive("area", area)
    k = sandwich_wavenumber(f, section)
    cg = sandwich_group_speed(f, section)
    return np.asarray(s * k / cg, dtype=np.float64)


def sandwich_critical_frequency(section: SandwichSection, sound_speed: float) -> float:
    """Coincidence frequency of a sandwich panel: bending phase speed = speed of sound [Hz].

    Parameters
    ----------
    section : SandwichSection
        Section properties (:func:`sandwich_section`).
    sound_speed : float
        Speed of sound c0 of the surrounding fluid [m/s].

    Returns
    -------
    float
        f_c = c0 k_c / (2 pi) [Hz] with ``x = k_c^2`` the positive root of
        ``D_f D_0 x^2 + (S (D_f + D_0) - m'' c0^2 D_0) x - m'' c0^2 S = 0``; ``inf`` when it
        lies outside 1 mHz to 1 GHz (no coincidence in any audible or structural range).

    Notes
    -----
    At coincidence the free bending wave travels at c0, ``k = omega / c0``. Putting this
    into the dispersion relation of :func:`sandwich_wavenumber`,
    ``m'' omega^2 = k^4 (D_f + D_0 S / (D_0 k^2 + S))``, gives
    ``m'' c0^2 = k^2 (D_f + D_0 S / (D_0 k^2 + S))``, a quadratic in ``k^2`` whose
    coefficients have signs (+, any, -): exactly one positive root (the phase speed rises
    monotonically from 0 to the face-sheet bending speed, which grows without bound).
    With D_0 -> 0 it is the critical frequency of the face sheets, with S -> infinity
    that of the whole section in pure bending.

    References
    ----------
    .. [1] Nilsson, A.C. (1990). Wave propagation in and sound transmission through
       sandwich plates. J. Sound Vib. 138(1), 73-94 (coincidence of the sandwich bending
       wave).
    .. [2] Allen, H.G. (1969). Analysis and Design of Structural Sandwich Panels,
       Pergamon, ch. 3 (thick faces; from memory).
    """
    c0 = float(_positive("sound_speed", sound_speed))
    df = section.face_bending_stiffness
    d0 = section.sandwich_bending_stiffness
    s = section.shear_stiffness
    m = section.surface_density
    a = df * d0
    b = s * (df + d0) - m * c0**2 * d0
    c = -m * c0**2 * s
    root = math.sqrt(b * b - 4.0 * a * c)
    # the positive root, without cancellation for either sign of b
    x = -2.0 * c / (b + root) if b > 0.0 else (root - b) / (2.0 * a)
    f_c = c0 * math.sqrt(x) / (2.0 * math.pi)
    return f_c if 1e-3 <= f_c <= 1e9 else math.inf
