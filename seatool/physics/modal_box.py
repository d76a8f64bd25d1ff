"""Uncoupled modes of a rectangular box and its flexible panels, and their coupling integrals.

The low-frequency (modal) description of a rectangular cavity with simply supported
rectangular panels set into its walls:

* :func:`plate_modes` -- natural frequencies and modal masses of a simply supported
  rectangular plate (sine mode shapes);
* :func:`cavity_modes` -- natural frequencies and normalisation integrals of a
  rigid-walled rectangular cavity (cosine mode shapes);
* :func:`sine_cosine_integral` and :func:`coupling_matrix` -- the closed-form surface
  integral of a plate mode times a cavity mode over a panel anywhere on a face;
* :func:`cavity_mode_shape`, :func:`plate_mode_shape` -- shapes at points (point sources
  and point forces);
* :func:`plane_wave_modal_forces` and :func:`diffuse_field_directions` -- blocked-pressure
  modal forces of plane waves on a panel's outer face and the directions of a diffuse field.

The coupled equations are solved in :mod:`seatool.physics.modal_coupled`. Faces are named
``x0, x1, y0, y1, z0, z1`` (the wall at x = 0, x = Lx, ...). On a face the in-face
coordinates (u, v) are (y, z) for x faces, (x, z) for y faces and (x, y) for z faces; a
panel occupies ``u0 <= u <= u0 + a``, ``v0 <= v <= v0 + b``. Panel displacement is positive
into the cavity.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import numpy.typing as npt

from ._checks import nonnegative as _nonnegative
from ._checks import positive as _positive

__all__ = [
    "FACES",
    "CavityModes",
    "PlateModes",
    "cavity_mode_shape",
    "cavity_modes",
    "coupling_matrix",
    "diffuse_field_directions",
    "face_axes",
    "monopole_volume_velocity_squared",
    "plane_wave_modal_forces",
    "plate_mode_shape",
    "plate_modes",
    "sine_cosine_integral",
    "sine_exponential_integral",
]

FloatArray = npt.NDArray[np.float64]
IntArray = npt.NDArray[np.int64]
ComplexArray = npt.NDArray[np.complex128]

#: Face names: the wall at 0 or at L of the x, y or z axis.
FACES = ("x0", "x1", "y0", "y1", "z0", "z1")

#: Largest number of modes one call may return (guards against a runaway frequency limit).
MAX_MODES = 20000


def face_axes(face: str) -> tuple[int, int, int, bool]:
    """Axes of a face: (u axis, v axis, normal axis, face at the far end L).

    Raises ValueError for a name not in :data:`FACES`.
    """
    if face not in FACES:
        msg = f"face must be one of {', '.join(FACES)}, got {face!r}"
        raise ValueError(msg)
    normal = "xyz".index(face[0])
    u, v = (a for a in range(3) if a != normal)
    return u, v, normal, face[1] == "1"


@dataclass(frozen=True)
class PlateModes:
    """Modes of a simply supported rectangular plate (sides a along u, b along v).

    Attributes
    ----------
    p, q : numpy.ndarray of int
        Half-wave numbers along u and v (>= 1).
    frequency : numpy.ndarray
        Natural frequencies [Hz], ascending.
    modal_mass : float
        Generalised mass m'' a b / 4 of every mode [kg] (shape sin sin, unit peak).
    a, b : float
        Side lengths [m].
    """

    p: IntArray
    q: IntArray
    frequency: FloatArray
    modal_mass: float
    a: float
    b: float

    def __len__(self) -> int:
        return int(self.p.size)


@dataclass(frozen=True)
class CavityModes:
    """Modes of a rigid-walled rectangular cavity (sides lx, ly, lz).

    Attributes
    ----------
    index : numpy.ndarray of int, shape (N, 3)
        Mode indices (l, m, n) >= 0.
    frequency : numpy.ndarray
        Natural frequencies [Hz], ascending (the first is the 0 Hz bulk mode).
    norm : numpy.ndarray
        Normalisation integrals Lambda = integral of psi^2 over the volume [m^3].
    dims : tuple of float
        (lx, ly, lz) [m].
    """

    index: IntArray
    frequency: FloatArray
    norm: FloatArray
    dims: tuple[float, float, float]

    def __len__(self) -> int:
        return int(self.frequency.size)


def plate_modes(
    a: float,
    b: float,
    bending_stiffness: float,
    mass_per_area: float,
    f_max: float,
) -> PlateModes:
    """Simply supported rectangular plate modes with natural frequency up to ``f_max``.

    Parameters
    ----------
    a, b : float
        Side lengths [m].
    bending_stiffness : float
        D [N m].
    mass_per_area : float
        m'' [kg/m^2].
    f_max : float
        Highest natural frequency kept [Hz].

    Returns
    -------
    PlateModes
        Modes sorted by frequency (at least the (1, 1) mode).

    Notes
    -----
    Shapes phi_pq = sin(p pi u / a) sin(q pi v / b), natural frequencies

    .. math:: \\omega_{pq} = \\sqrt{D/m''}\\,[(p\\pi/a)^2 + (q\\pi/b)^2],

    generalised mass integral of m'' phi^2 over the plate = m'' a b / 4.

    References
    ----------
    .. [1] Leissa, A.W. (1969). Vibration of Plates, NASA SP-160, ch. 4 (rectangular
       plates, all edges simply supported; Navier solution), from memory.
    .. [2] Fahy, F.J., Gardonio, P. (2007). Sound and Structural Vibration, 2nd ed.,
       Academic Press, ISBN 978-0-12-373633-8, ch. 2 (modes of a simply supported
       rectangular plate), from memory.
    """
    a = float(_positive("a", a))
    b = float(_positive("b", b))
    d = float(_positive("bending_stiffness", bending_stiffness))
    m = float(_positive("mass_per_area", mass_per_area))
    fm = float(_positive("f_max", f_max))
    root = np.sqrt(d / m)
    # largest half-wave numbers: (p pi / a)^2 <= 2 pi f_max / root
    kmax2 = 2.0 * np.pi * fm / root
    pmax = max(1, int(np.sqrt(kmax2) * a / np.pi))
    qmax = max(1, int(np.sqrt(kmax2) * b / np.pi))
    if pmax * qmax > 4 * MAX_MODES:
        msg = f"f_max = {fm:g} Hz asks for too many plate modes (about {pmax * qmax})"
        raise ValueError(msg)
    pg, qg = np.meshgrid(np.arange(1, pmax + 1), np.arange(1, qmax + 1), indexing="ij")
    p, q = pg.ravel(), qg.ravel()
    f = root * ((p * np.pi / a) ** 2 + (q * np.pi / b) ** 2) / (2.0 * np.pi)
    keep = f <= fm
    keep[np.argmin(f)] = True
    order = np.argsort(f[keep], kind="stable")
    if order.size > MAX_MODES:
        msg = f"f_max = {fm:g} Hz asks for {order.size} plate modes (limit {MAX_MODES})"
        raise ValueError(msg)
    return PlateModes(
        p=p[keep][order].astype(np.int64),
        q=q[keep][order].astype(np.int64),
        frequency=np.asarray(f[keep][order], dtype=np.float64),
        modal_mass=m * a * b / 4.0,
        a=a,
        b=b,
    )


def cavity_modes(
    lx: float, ly: float, lz: float, sound_speed: float, f_max: float
) -> CavityModes:
    """Rigid-walled rectangular cavity modes with natural frequency up to ``f_max``.

    Parameters
    ----------
    lx, ly, lz : float
        Box dimensions [m].
    sound_speed : float
        c [m/s].
    f_max : float
        Highest natural frequency kept [Hz] (the 0 Hz bulk mode is always kept).

    Returns
    -------
    CavityModes
        Modes sorted by frequency.

    Notes
    -----
    Shapes psi = cos(l pi x / lx) cos(m pi y / ly) cos(n pi z / lz), natural frequencies

    .. math:: f_{lmn} = \\frac{c}{2}\\sqrt{(l/l_x)^2 + (m/l_y)^2 + (n/l_z)^2},

    normalisation Lambda = integral of psi^2 dV = V e_l e_m e_n with e_0 = 1 and
    e_i = 1/2 for i > 0 (the mean of cos^2 is 1/2 except for a zero index).

    References
    ----------
    .. [1] Morse, P.M., Ingard, K.U. (1968). Theoretical Acoustics, McGraw-Hill, sec. 9.4
       (rectangular room, rigid walls), from memory.
    .. [2] Fahy, F.J., Gardonio, P. (2007). Sound and Structural Vibration, 2nd ed.,
       Academic Press, ch. 7 (rigid-walled rectangular enclosure modes), from memory.
    """
    dims = tuple(float(_positive(n, v)) for n, v in (("lx", lx), ("ly", ly), ("lz", lz)))
    c = float(_positive("sound_speed", sound_speed))
    fm = float(_positive("f_max", f_max))
    top = [int(2.0 * fm * d / c) for d in dims]
    if (top[0] + 1) * (top[1] + 1) * (top[2] + 1) > 8 * MAX_MODES:
        msg = f"f_max = {fm:g} Hz asks for too many cavity modes"
        raise ValueError(msg)
    grids = np.meshgrid(*(np.arange(t + 1) for t in top), indexing="ij")
    idx = np.stack([g.ravel() for g in grids], axis=1).astype(np.int64)
    f = 0.5 * c * np.sqrt(sum((idx[:, i] / dims[i]) ** 2 for i in range(3)))
    keep = f <= fm
    order = np.argsort(f[keep], kind="stable")
    if order.size > MAX_MODES:
        msg = f"f_max = {fm:g} Hz asks for {order.size} cavity modes (limit {MAX_MODES})"
        raise ValueError(msg)
    idx = idx[keep][order]
    volume = dims[0] * dims[1] * dims[2]
    norm = volume * np.prod(np.where(idx == 0, 1.0, 0.5), axis=1)
    return CavityModes(
        index=idx,
        frequency=np.asarray(f[keep][order], dtype=np.float64),
        norm=np.asarray(norm, dtype=np.float64),
        dims=(dims[0], dims[1], dims[2]),
    )


def cavity_mode_shape(modes: CavityModes, point: npt.ArrayLike) -> FloatArray:
    """Cavity mode shapes psi_n at one point (x, y, z) [m] -> array (N,) [-]."""
    x = np.asarray(point, dtype=np.float64)
    if x.shape != (3,) or np.any(x < 0) or np.any(x > np.asarray(modes.dims)):
        msg = f"point must be (x, y, z) inside the box {modes.dims}, got {point!r}"
        raise ValueError(msg)
    arg = np.pi * modes.index * (x / np.asarray(modes.dims))
    return np.asarray(np.prod(np.cos(arg), axis=1), dtype=np.float64)


def plate_mode_shape(modes: PlateModes, u: float, v: float) -> FloatArray:
    """Plate mode shapes phi_k at (u, v) in panel coordinates [m] -> array (K,) [-]."""
    if not (0.0 <= u <= modes.a and 0.0 <= v <= modes.b):
        msg = f"point ({u!r}, {v!r}) is outside the panel {modes.a:g} m x {modes.b:g} m"
        raise ValueError(msg)
    out = np.sin(modes.p * np.pi * u / modes.a) * np.sin(modes.q * np.pi * v / modes.b)
    return np.asarray(out, dtype=np.float64)


def sine_cosine_integral(
    p: npt.ArrayLike, a: float, m: npt.ArrayLike, length: float, offset: float
) -> FloatArray:
    """Integral of sin(p pi s / a) cos(m pi (offset + s) / length) over 0 <= s <= a [m].

    Parameters
    ----------
    p : int or array_like of int
        Plate half-wave number(s) (>= 1).
    a : float
        Panel side [m].
    m : int or array_like of int
        Cavity mode index (indices) (>= 0) along the same axis.
    length : float
        Cavity side along this axis [m].
    offset : float
        Position of the panel edge from the cavity wall [m] (0 <= offset, offset + a <= length).

    Returns
    -------
    numpy.ndarray
        The integral, broadcast over ``p`` and ``m`` [m].

    Notes
    -----
    With alpha = p pi / a and beta = m pi / length, sin A cos B = [sin(A + B) + sin(A - B)] / 2
    and the integral of sin(k s + c) over [0, a] is a sin(c + k a / 2) sinc(k a / 2), so

    .. math:: I = \\frac{a}{2}\\left[\\sin(\\beta x_0 + (\\alpha+\\beta)\\tfrac{a}{2})
              \\,\\mathrm{sinc}((\\alpha+\\beta)\\tfrac{a}{2})
              + \\sin((\\alpha-\\beta)\\tfrac{a}{2} - \\beta x_0)
              \\,\\mathrm{sinc}((\\alpha-\\beta)\\tfrac{a}{2})\\right]

    (sinc x = sin x / x), which has no removable singularity at alpha = beta. For a panel
    filling the side (offset 0, a = length) it reduces to the closed form of Dowell,
    Gorman & Smith (1977), eq. for the coupling coefficient L_{n,m}: a p [1 - (-1)^(p+m)] /
    (pi (p^2 - m^2)) for p != m, 0 for p = m (checked in the tests); for a panel anywhere
    on the face it is the one-dimensional factor of the coupling integral of Pan & Bies
    (1990).

    References
    ----------
    .. [1] Dowell, E.H., Gorman, G.F., Smith, D.A. (1977). Acoustoelasticity: general
       theory, acoustic natural modes and forced response to sinusoidal excitation,
       including comparisons with experiment. J. Sound Vib. 52(4), 519-542 (coupling
       coefficients between panel and cavity modes).
    .. [2] Pan, J., Bies, D.A. (1990). The effect of fluid-structural coupling on sound
       waves in an enclosure -- theoretical part. J. Acoust. Soc. Am. 87(2), 691-707
       (coupling coefficient of a panel in a wall of a rectangular enclosure).
    """
    a = float(_positive("a", a))
    length = float(_positive("length", length))
    x0 = float(_nonnegative("offset", offset))
    if x0 + a > length * (1.0 + 1e-12):
        msg = f"panel (offset {x0:g} m, side {a:g} m) does not fit in {length:g} m"
        raise ValueError(msg)
    alpha = np.pi * np.asarray(p, dtype=np.float64) / a
    beta = np.pi * np.asarray(m, dtype=np.float64) / length
    hp = 0.5 * (alpha + beta) * a
    hm = 0.5 * (alpha - beta) * a
    out = 0.5 * a * (
        np.sin(beta * x0 + hp) * np.sinc(hp / np.pi) + np.sin(hm - beta * x0) * np.sinc(hm / np.pi)
    )
    return np.asarray(out, dtype=np.float64)


def sine_exponential_integral(p: npt.ArrayLike, a: float, k: npt.ArrayLike) -> ComplexArray:
    """Integral of sin(p pi s / a) exp(-j k s) over 0 <= s <= a [m].

    Parameters
    ----------
    p : int or array_like of int
        Half-wave number(s) (>= 1).
    a : float
        Panel side [m].
    k : float or array_like
        Trace wavenumber along the side [rad/m].

    Returns
    -------
    numpy.ndarray of complex
        (a / 2j) [exp(j(alpha - k) a/2) sinc((alpha - k) a/2) - exp(-j(alpha + k) a/2)
        sinc((alpha + k) a/2)], alpha = p pi / a (sinc x = sin x / x), broadcast over p, k.

    Notes
    -----
    From sin x = (e^{jx} - e^{-jx}) / 2j and the integral of exp(j kappa s) over [0, a],
    a exp(j kappa a / 2) sinc(kappa a / 2). This is the one-dimensional factor of the
    generalised force of a trace wave on a simply supported plate mode (the wavenumber
    transform of the mode shape).

    References
    ----------
    .. [1] Fahy, F.J., Gardonio, P. (2007). Sound and Structural Vibration, 2nd ed.,
       Academic Press, ch. 6 (modal generalised forces of an incident plane wave on a
       baffled rectangular plate), from memory.
    """
    a = float(_positive("a", a))
    alpha = np.pi * np.asarray(p, dtype=np.float64) / a
    kk = np.asarray(k, dtype=np.float64)
    hm = 0.5 * (alpha - kk) * a
    hp = 0.5 * (alpha + kk) * a
    out = (a / 2j) * (
        np.exp(1j * hm) * np.sinc(hm / np.pi) - np.exp(-1j * hp) * np.sinc(hp / np.pi)
    )
    return np.asarray(out, dtype=np.complex128)


def coupling_matrix(
    plate: PlateModes,
    cavity: CavityModes,
    face: str,
    offset: tuple[float, float] = (0.0, 0.0),
) -> FloatArray:
    """Coupling integrals C_nk of every cavity mode n with every plate mode k [m^2].

    Parameters
    ----------
    plate : PlateModes
        Panel modes; side ``a`` runs along the face's u axis, ``b`` along v.
    cavity : CavityModes
        Cavity modes.
    face : str
        One of :data:`FACES`.
    offset : (float, float), optional
        Panel corner (u0, v0) on the face [m].

    Returns
    -------
    numpy.ndarray, shape (N, K)
        C_nk = integral over the panel of psi_n phi_k dS [m^2].

    Notes
    -----
    The integrand separates on a face: psi_n = cos(l_u pi u / L_u) cos(l_v pi v / L_v)
    times cos(l_w pi w / L_w) at the face (1 at w = 0, (-1)^l_w at w = L_w), so

    .. math:: C_{nk} = s_n\\, I_u(p_k, l_{u,n})\\, I_v(q_k, l_{v,n})

    with the one-dimensional integrals of :func:`sine_cosine_integral` (Pan & Bies 1990;
    Dowell, Gorman & Smith 1977 for a panel filling a face).

    References
    ----------
    .. [1] Dowell, E.H., Gorman, G.F., Smith, D.A. (1977). J. Sound Vib. 52(4), 519-542.
    .. [2] Pan, J., Bies, D.A. (1990). J. Acoust. Soc. Am. 87(2), 691-707.
    """
    u, v, w, far = face_axes(face)
    dims = cavity.dims
    u0, v0 = (float(x) for x in offset)
    iu = sine_cosine_integral(plate.p[None, :], plate.a, cavity.index[:, u][:, None], dims[u], u0)
    iv = sine_cosine_integral(plate.q[None, :], plate.b, cavity.index[:, v][:, None], dims[v], v0)
    sign = np.where(far & (cavity.index[:, w] % 2 == 1), -1.0, 1.0)
    return np.asarray(sign[:, None] * iu * iv, dtype=np.float64)


def plane_wave_modal_forces(
    plate: PlateModes,
    wavenumber: npt.ArrayLike,
    directions: npt.ArrayLike,
    out: ComplexArray | None = None,
) -> ComplexArray:
    """Blocked-pressure modal forces of unit plane waves on a baffled panel [N per Pa].

    Parameters
    ----------
    plate : PlateModes
        Panel modes.
    wavenumber : float or array_like, shape (L,)
        Acoustic wavenumber k = omega / c on the exposed side [rad/m].
    directions : array_like, shape (R, 2)
        Incidence angles (theta, phi) [rad]: theta from the panel normal, phi from the
        u axis.
    out : numpy.ndarray of complex, shape (L, K, R), optional
        Where to write the result (e.g. a part of a larger right-hand side).

    Returns
    -------
    numpy.ndarray of complex, shape (L, K, R)
        F_k = 2 integral over the panel of phi_k exp(-j (k_u u + k_v v)) dS for an incident
        wave of unit pressure amplitude, with k_u = k sin(theta) cos(phi),
        k_v = k sin(theta) sin(phi).

    Notes
    -----
    The panel is taken as set in a rigid baffle, so the blocked pressure on its outer face is
    twice the incident pressure (pressure doubling at a rigid plane). The modal force
    separates into two :func:`sine_exponential_integral` factors.

    References
    ----------
    .. [1] Fahy, F.J., Gardonio, P. (2007). Sound and Structural Vibration, 2nd ed.,
       Academic Press, ch. 5-6 (blocked pressure of a plane wave, modal generalised
       forces), from memory.
    """
    k = np.atleast_1d(np.asarray(wavenumber, dtype=np.float64))
    d = np.asarray(directions, dtype=np.float64).reshape(-1, 2)
    st = np.sin(d[:, 0])
    ku = k[:, None] * (st * np.cos(d[:, 1]))[None, :]  # (L, R)
    kv = k[:, None] * (st * np.sin(d[:, 1]))[None, :]
    # each factor depends on one half-wave number only: evaluated once per distinct number
    up, at_p = np.unique(plate.p, return_inverse=True)
    uq, at_q = np.unique(plate.q, return_inverse=True)
    iu = 2.0 * sine_exponential_integral(up[None, :, None], plate.a, ku[:, None, :])
    iv = sine_exponential_integral(uq[None, :, None], plate.b, kv[:, None, :])
    if out is None:
        out = np.empty((k.size, len(plate), d.shape[0]), dtype=np.complex128)
    np.multiply(iu[:, at_p.ravel(), :], iv[:, at_q.ravel(), :], out=out)
    return out


def diffuse_field_directions(n_theta: int = 8, n_phi: int = 16) -> tuple[FloatArray, FloatArray]:
    """Directions and weights of plane waves making up a diffuse field on one side of a wall.

    Parameters
    ----------
    n_theta, n_phi : int, optional
        Gauss-Legendre nodes in cos(theta) over (0, 1) and equally spaced azimuths.

    Returns
    -------
    directions : numpy.ndarray, shape (n_theta * n_phi, 2)
        (theta, phi) [rad].
    weights : numpy.ndarray, shape (n_theta * n_phi,)
        Solid-angle weights summing to 1.

    Notes
    -----
    A diffuse field is a superposition of uncorrelated plane waves with directions spread
    uniformly over the solid angle (uniform in cos theta and phi over the half space
    facing the wall). If the field's space-averaged mean-square pressure is <p^2>, the
    waves arriving at the wall carry <p^2> / 2 (the other half are their reflections), so the
    mean-square response is <p^2> / 2 times the weighted sum of the unit-wave responses.
    The resulting mean-square blocked pressure on the wall, 4 <p^2> / 2 = 2 <p^2>, is the
    3 dB pressure rise at a rigid wall in a diffuse field.

    References
    ----------
    .. [1] Waterhouse, R.V. (1955). Interference patterns in reverberant sound fields.
       J. Acoust. Soc. Am. 27(2), 247-258 (3 dB at a rigid wall), from memory.
    .. [2] Pierce, A.D. (1981). Acoustics: An Introduction to Its Physical Principles and
       Applications, McGraw-Hill, sec. 6.4 (diffuse field as uncorrelated plane waves),
       from memory.
    """
    if n_theta < 1 or n_phi < 1:
        msg = "n_theta and n_phi must be >= 1"
        raise ValueError(msg)
    x, w = np.polynomial.legendre.leggauss(n_theta)
    mu = 0.5 * (x + 1.0)
    wt = 0.5 * w
    phi = (np.arange(n_phi) + 0.5) * 2.0 * np.pi / n_phi
    th, ph = np.meshgrid(np.arccos(mu), phi, indexing="ij")
    weights = np.repeat(wt, n_phi) / n_phi
    return np.stack([th.ravel(), ph.ravel()], axis=1), np.asarray(weights, dtype=np.float64)


def monopole_volume_velocity_squared(
    f: npt.ArrayLike, sound_power: npt.ArrayLike, *, density: float, sound_speed: float
) -> FloatArray:
    """Mean-square volume velocity of a point monopole of given free-field sound power.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    sound_power : float or array_like
        Free-field sound power W [W].
    density, sound_speed : float
        rho [kg/m^3], c [m/s].

    Returns
    -------
    numpy.ndarray
        <Q^2> = 4 pi c W / (rho omega^2) [m^6/s^2], from W = rho omega^2 <Q^2> / (4 pi c).

    References
    ----------
    .. [1] Pierce, A.D. (1981). Acoustics: An Introduction to Its Physical Principles and
       Applications, McGraw-Hill, sec. 4.3 (radiated power of a monopole source), from
       memory.
    """
    w = 2.0 * np.pi * _positive("f", f)
    p = _nonnegative("sound_power", sound_power)
    rho = float(_positive("density", density))
    c = float(_positive("sound_speed", sound_speed))
    return np.asarray(4.0 * np.pi * c * p / (rho * w**2), dtype=np.float64)
