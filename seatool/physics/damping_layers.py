"""Viscoelastic damping layers on a plate: free layer and constrained layer (RKU).

Free and constrained viscoelastic damping layers (:func:`free_layer_damping`,
:func:`constrained_layer_damping`, the RKU parameters) with a frequency-dependent complex
modulus given as a table (:class:`ModulusTable`). All functions are pure and broadcast with
numpy over frequency bands. Complex moduli use the time convention exp(+j omega t): a lossy
material has ``E* = E' (1 + j eta)``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

import numpy as np
import numpy.typing as npt

from ._checks import nonnegative as _non_negative
from ._checks import positive as _positive

__all__ = [
    "CompositeDamping",
    "ModulusTable",
    "complex_modulus",
    "constrained_layer_damping",
    "free_layer_damping",
    "free_layer_loss_factor_ratio",
    "rku_geometric_parameter",
    "rku_loss_factor",
    "rku_optimum_shear_parameter",
    "rku_shear_parameter",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]

# ------------------------------------------------------------------------------------------
# viscoelastic damping layers
# ------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class ModulusTable:
    """Frequency-dependent complex modulus of a viscoelastic material, as a table.

    Parameters
    ----------
    frequency : tuple of float
        Table frequencies [Hz], strictly increasing, > 0.
    storage_modulus : tuple of float
        Storage (real) modulus at those frequencies [Pa], > 0.
    loss_factor : tuple of float
        Material loss factor eta = E''/E' at those frequencies [-], > 0.
    quantity : {"young", "shear"}
        Whether the table gives Young's modulus E or the shear modulus G.

    Notes
    -----
    Evaluated by :func:`complex_modulus` with linear interpolation of lg(E') and lg(eta)
    against lg(f) (log-log), held constant beyond the table ends.
    """

    frequency: tuple[float, ...]
    storage_modulus: tuple[float, ...]
    loss_factor: tuple[float, ...]
    quantity: Literal["young", "shear"] = "young"

    def __post_init__(self) -> None:
        n = len(self.frequency)
        if n == 0 or len(self.storage_modulus) != n or len(self.loss_factor) != n:
            msg = (
                "ModulusTable: frequency, storage_modulus and loss_factor need equal, "
                "non-zero length"
            )
            raise ValueError(msg)
        fr = np.asarray(self.frequency, dtype=np.float64)
        _positive("ModulusTable.frequency", fr)
        if np.any(np.diff(fr) <= 0.0):
            msg = "ModulusTable.frequency must be strictly increasing"
            raise ValueError(msg)
        _positive("ModulusTable.storage_modulus", self.storage_modulus)
        _positive("ModulusTable.loss_factor", self.loss_factor)
        if self.quantity not in ("young", "shear"):
            msg = f"ModulusTable.quantity must be 'young' or 'shear', got {self.quantity!r}"
            raise ValueError(msg)


def complex_modulus(f: npt.ArrayLike, modulus: ModulusTable | complex | float) -> ComplexArray:
    """Complex modulus E* = E' (1 + j eta) at frequencies f (exp(+j omega t)).

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    modulus : ModulusTable or complex or float
        A table (interpolated log-log in f, constant outside the table) or a
        frequency-independent complex modulus [Pa].

    Returns
    -------
    numpy.ndarray of complex
        E*(f) [Pa], shape of ``f``.

    Notes
    -----
    lg E'(f) and lg eta(f) are interpolated linearly in lg f. Log-log interpolation follows
    the power-law behaviour of viscoelastic materials in the transition region (e.g. Nashif,
    Jones & Henderson 1985, ch. 3).

    References
    ----------
    .. [1] Nashif, A.D., Jones, D.I.G., Henderson, J.P. (1985) Vibration Damping, Wiley,
       ISBN 0-471-86772-1, ch. 3 (frequency dependence of complex moduli).
    """
    f_ = _positive("f", f)
    if isinstance(modulus, ModulusTable):
        lf = np.log10(np.asarray(modulus.frequency, dtype=np.float64))
        le = np.log10(np.asarray(modulus.storage_modulus, dtype=np.float64))
        ln = np.log10(np.asarray(modulus.loss_factor, dtype=np.float64))
        x = np.log10(f_)
        e1 = 10.0 ** np.interp(x, lf, le)
        eta = 10.0 ** np.interp(x, lf, ln)
        return np.asarray(e1 * (1.0 + 1j * eta), dtype=np.complex128)
    value = complex(modulus)
    if value.real <= 0.0 or value.imag < 0.0:
        msg = (
            "modulus must have a positive real part and a non-negative imaginary part "
            f"(exp(+j omega t) convention), got {modulus!r}"
        )
        raise ValueError(msg)
    return np.full(f_.shape, value, dtype=np.complex128)


@dataclass(frozen=True)
class CompositeDamping:
    """Result of a damping-layer calculation, per frequency.

    Attributes
    ----------
    loss_factor : numpy.ndarray
        Composite loss factor eta = Im(D*)/Re(D*) [-].
    bending_stiffness : numpy.ndarray
        Composite bending stiffness Re(D*) [N m] (per unit width of plate).
    mass_per_area : float
        Mass per unit area of the composite m'' [kg/m^2].
    added_mass_per_area : float
        Mass per unit area of the added layers (treatment only) [kg/m^2].
    """

    loss_factor: FloatArray
    bending_stiffness: FloatArray
    mass_per_area: float
    added_mass_per_area: float


def free_layer_loss_factor_ratio(
    modulus_ratio: npt.ArrayLike, thickness_ratio: npt.ArrayLike
) -> FloatArray:
    """Oberst / Ross–Kerwin–Ungar free-layer loss-factor ratio eta/eta2.

    Parameters
    ----------
    modulus_ratio : float or array_like
        e = E2/E1, layer storage modulus over base modulus [-].
    thickness_ratio : float or array_like
        h = H2/H1, layer thickness over base thickness [-].

    Returns
    -------
    numpy.ndarray
        eta/eta2 [-] (first order in eta2, base undamped).

    Notes
    -----
    eta/eta2 = e h (3 + 6 h + 4 h^2 + 2 e h^3 + e^2 h^4)
    / ((1 + e h)(1 + 4 e h + 6 e h^2 + 4 e h^3 + e^2 h^4)).
    Thin, soft layers (e h << 1): eta/eta2 ~= e h (3 + 6 h + 4 h^2); for h in about 0.5..2
    this is ~= 14 e h^2 (Ungar's rule of thumb).

    References
    ----------
    .. [1] Oberst, H. (1952) "Über die Dämpfung der Biegeschwingungen dünner Bleche durch
       fest haftende Beläge", Acustica 2 (Akustische Beihefte 4), 181-194.
    .. [2] Ross, D., Ungar, E.E., Kerwin, E.M. (1959) "Damping of plate flexural vibrations
       by means of viscoelastic laminae", in Structural Damping (J.E. Ruzicka, ed.), ASME,
       New York, 49-88.
    .. [3] Ungar, E.E. (1992) "Structural damping", ch. 12 in Beranek, L.L., Vér, I.L.
       (eds.) Noise and Vibration Control Engineering, Wiley, ISBN 0-471-61751-2.
    """
    e = _positive("modulus_ratio", modulus_ratio)
    h = _positive("thickness_ratio", thickness_ratio)
    num = e * h * (3.0 + 6.0 * h + 4.0 * h**2 + 2.0 * e * h**3 + e**2 * h**4)
    den = (1.0 + e * h) * (1.0 + 4.0 * e * h + 6.0 * e * h**2 + 4.0 * e * h**3 + e**2 * h**4)
    return np.asarray(num / den, dtype=np.float64)


def free_layer_damping(
    f: npt.ArrayLike,
    base_thickness: float,
    base_young: float,
    base_density: float,
    layer_thickness: float,
    layer_density: float,
    layer_modulus: ModulusTable | complex | float,
    *,
    base_loss_factor: float = 0.0,
    base_poisson: float = 0.3,
    layer_poisson: float = 0.3,
) -> CompositeDamping:
    """Composite loss factor and bending stiffness of a plate with a free damping layer.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    base_thickness : float
        Base plate thickness H1 [m].
    base_young : float
        Base plate Young's modulus E1 [Pa].
    base_density : float
        Base plate density [kg/m^3].
    layer_thickness : float
        Damping layer thickness H2 [m].
    layer_density : float
        Damping layer density [kg/m^3].
    layer_modulus : ModulusTable or complex or float
        Young's modulus of the layer: a table of kind ``"young"`` or a constant
        complex value E2 (1 + j eta2) [Pa].
    base_loss_factor : float, optional
        Loss factor of the bare base plate eta1 [-] (default 0).
    base_poisson, layer_poisson : float, optional
        Poisson's ratios; plate moduli E/(1 - nu^2) are used.

    Returns
    -------
    CompositeDamping
        Loss factor, Re(D*) [N m], total and added mass per area.

    Notes
    -----
    Pure bending of a two-layer plate with the neutral plane shifted by the layer
    (Oberst 1952; Ross, Kerwin & Ungar 1959), evaluated with complex moduli
    (exp(+j omega t)):

        D*/D1* = 1 + e h^3 + 3 (1 + h)^2 e h / (1 + e h),  e = E2*/E1*,  h = H2/H1,

    eta = Im(D*)/Re(D*).  To first order in eta2 and with eta1 = 0 this is exactly
    :func:`free_layer_loss_factor_ratio`.  Frequency enters only through E2*(f); shear in
    the layer and rotary inertia are neglected (thin layers, bending wavelength >> H1+H2).

    References
    ----------
    .. [1] Oberst, H. (1952) Acustica 2 (Akustische Beihefte 4), 181-194.
    .. [2] Ross, D., Ungar, E.E., Kerwin, E.M. (1959) in Structural Damping, ASME, 49-88.
    .. [3] Ungar, E.E. (1992) ch. 12 in Beranek & Vér, Noise and Vibration Control
       Engineering, Wiley, ISBN 0-471-61751-2.
    """
    h1 = float(_positive("base_thickness", base_thickness))
    e1 = float(_positive("base_young", base_young))
    rho1 = float(_positive("base_density", base_density))
    h2 = float(_positive("layer_thickness", layer_thickness))
    rho2 = float(_non_negative("layer_density", layer_density))
    eta1 = float(_non_negative("base_loss_factor", base_loss_factor))
    if isinstance(layer_modulus, ModulusTable) and layer_modulus.quantity != "young":
        msg = "layer_modulus must be a table of Young's modulus (quantity='young') for a free layer"
        raise ValueError(msg)
    e2 = complex_modulus(f, layer_modulus)
    e1c = e1 * (1.0 + 1j * eta1) / (1.0 - base_poisson**2)
    e2c = e2 / (1.0 - layer_poisson**2)
    e = e2c / e1c
    h = h2 / h1
    d1 = e1c * h1**3 / 12.0
    d = d1 * (1.0 + e * h**3 + 3.0 * (1.0 + h) ** 2 * e * h / (1.0 + e * h))
    added = rho2 * h2
    return CompositeDamping(
        loss_factor=np.asarray(d.imag / d.real, dtype=np.float64),
        bending_stiffness=np.asarray(d.real, dtype=np.float64),
        mass_per_area=rho1 * h1 + added,
        added_mass_per_area=added,
    )


def rku_geometric_parameter(
    base_thickness: npt.ArrayLike,
    base_young: npt.ArrayLike,
    core_thickness: npt.ArrayLike,
    cover_thickness: npt.ArrayLike,
    cover_young: npt.ArrayLike,
) -> FloatArray:
    """Geometric parameter Y of a constrained-layer (three-layer) plate.

    Parameters
    ----------
    base_thickness : float or array_like
        H1 [m].
    base_young : float or array_like
        E1 [Pa] (a plate modulus E/(1 - nu^2) if used for plates).
    core_thickness : float or array_like
        Viscoelastic core thickness H2 [m].
    cover_thickness : float or array_like
        Constraining layer thickness H3 [m].
    cover_young : float or array_like
        E3 [Pa].

    Returns
    -------
    numpy.ndarray
        Y = (D_inf - D_0)/D_0 [-].

    Notes
    -----
    Y = 12 d^2 / (E1 H1^3 + E3 H3^3) * E1 H1 E3 H3 / (E1 H1 + E3 H3),
    d = H2 + (H1 + H3)/2 (distance between the mid-planes of base and cover).
    D_0 = (E1 H1^3 + E3 H3^3)/12 is the stiffness of the uncoupled faces and D_inf the
    fully coupled one (parallel-axis theorem); the core's own extensional and bending
    stiffness are neglected.  This is not restricted to symmetric sandwiches.

    References
    ----------
    .. [1] Ross, D., Ungar, E.E., Kerwin, E.M. (1959) in Structural Damping, ASME, 49-88.
    .. [2] Ungar, E.E. (1962) "Loss factors of viscoelastically damped beam structures",
       J. Acoust. Soc. Am. 34(8), 1082-1089, doi:10.1121/1.1918249.
    """
    h1 = _positive("base_thickness", base_thickness)
    e1 = _positive("base_young", base_young)
    h2 = _non_negative("core_thickness", core_thickness)
    h3 = _positive("cover_thickness", cover_thickness)
    e3 = _positive("cover_young", cover_young)
    d = h2 + 0.5 * (h1 + h3)
    k1 = e1 * h1
    k3 = e3 * h3
    return np.asarray(
        12.0 * d**2 / (e1 * h1**3 + e3 * h3**3) * k1 * k3 / (k1 + k3), dtype=np.float64
    )


def rku_shear_parameter(
    wavenumber: npt.ArrayLike,
    core_shear_modulus: npt.ArrayLike,
    core_thickness: npt.ArrayLike,
    base_thickness: npt.ArrayLike,
    base_young: npt.ArrayLike,
    cover_thickness: npt.ArrayLike,
    cover_young: npt.ArrayLike,
) -> FloatArray:
    """Shear parameter g of a constrained-layer plate.

    Parameters
    ----------
    wavenumber : float or array_like
        Bending wavenumber k [rad/m].
    core_shear_modulus : float or array_like
        Storage shear modulus of the core G2 [Pa].
    core_thickness : float or array_like
        H2 [m].
    base_thickness, base_young, cover_thickness, cover_young : float or array_like
        H1 [m], E1 [Pa], H3 [m], E3 [Pa].

    Returns
    -------
    numpy.ndarray
        g = G2 / (k^2 H2) (1/(E1 H1) + 1/(E3 H3)) [-].

    References
    ----------
    .. [1] Ross, D., Ungar, E.E., Kerwin, E.M. (1959) in Structural Damping, ASME, 49-88.
    .. [2] Ungar, E.E. (1962) J. Acoust. Soc. Am. 34(8), 1082-1089.
    """
    k = _positive("wavenumber", wavenumber)
    g2 = _positive("core_shear_modulus", core_shear_modulus)
    h2 = _positive("core_thickness", core_thickness)
    h1 = _positive("base_thickness", base_thickness)
    e1 = _positive("base_young", base_young)
    h3 = _positive("cover_thickness", cover_thickness)
    e3 = _positive("cover_young", cover_young)
    return np.asarray(g2 / (k**2 * h2) * (1.0 / (e1 * h1) + 1.0 / (e3 * h3)), dtype=np.float64)


def rku_loss_factor(
    shear_parameter: npt.ArrayLike,
    geometric_parameter: npt.ArrayLike,
    core_loss_factor: npt.ArrayLike,
) -> FloatArray:
    """Constrained-layer composite loss factor (faces undamped).

    Parameters
    ----------
    shear_parameter : float or array_like
        g [-] (see :func:`rku_shear_parameter`).
    geometric_parameter : float or array_like
        Y [-] (see :func:`rku_geometric_parameter`).
    core_loss_factor : float or array_like
        Core shear loss factor beta = eta2 [-].

    Returns
    -------
    numpy.ndarray
        eta = beta Y g / (1 + (2 + Y) g + (1 + Y)(1 + beta^2) g^2) [-].

    Notes
    -----
    Follows from D*/D_0 = 1 + Y g* / (1 + g*), g* = g (1 + j beta).  Maximum at
    g_opt = 1/sqrt((1 + Y)(1 + beta^2)) (:func:`rku_optimum_shear_parameter`), and
    eta -> 0 for g -> 0 (faces slide freely) and g -> inf (core locked, no shear).

    References
    ----------
    .. [1] Ross, D., Ungar, E.E., Kerwin, E.M. (1959) in Structural Damping, ASME, 49-88.
    .. [2] Ungar, E.E. (1992) ch. 12 in Beranek & Vér, Noise and Vibration Control
       Engineering, Wiley, ISBN 0-471-61751-2.
    """
    g = _non_negative("shear_parameter", shear_parameter)
    y = _non_negative("geometric_parameter", geometric_parameter)
    b = _non_negative("core_loss_factor", core_loss_factor)
    return np.asarray(
        b * y * g / (1.0 + (2.0 + y) * g + (1.0 + y) * (1.0 + b**2) * g**2), dtype=np.float64
    )


def rku_optimum_shear_parameter(
    geometric_parameter: npt.ArrayLike, core_loss_factor: npt.ArrayLike
) -> FloatArray:
    """Shear parameter that maximises :func:`rku_loss_factor`, 1/sqrt((1 + Y)(1 + beta^2)).

    Parameters
    ----------
    geometric_parameter : float or array_like
        Y [-].
    core_loss_factor : float or array_like
        beta [-].

    Returns
    -------
    numpy.ndarray
        g_opt [-].

    References
    ----------
    .. [1] Ungar, E.E. (1992) ch. 12 in Beranek & Vér, Noise and Vibration Control
       Engineering, Wiley, ISBN 0-471-61751-2.
    """
    y = _non_negative("geometric_parameter", geometric_parameter)
    b = _non_negative("core_loss_factor", core_loss_factor)
    return np.asarray(1.0 / np.sqrt((1.0 + y) * (1.0 + b**2)), dtype=np.float64)


def constrained_layer_damping(
    f: npt.ArrayLike,
    base_thickness: float,
    base_young: float,
    base_density: float,
    core_thickness: float,
    core_density: float,
    core_shear_modulus: ModulusTable | complex | float,
    cover_thickness: float,
    cover_young: float,
    cover_density: float,
    *,
    base_loss_factor: float = 0.0,
    cover_loss_factor: float = 0.0,
    base_poisson: float = 0.3,
    cover_poisson: float = 0.3,
    wavenumber: Literal["composite", "base"] = "composite",
) -> CompositeDamping:
    """Composite loss factor and bending stiffness of a constrained-layer damped plate.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    base_thickness, base_young, base_density : float
        Base plate H1 [m], E1 [Pa], density [kg/m^3].
    core_thickness, core_density : float
        Viscoelastic core H2 [m] and density [kg/m^3].
    core_shear_modulus : ModulusTable or complex or float
        Complex shear modulus of the core G2 (1 + j beta): a table of kind ``"shear"`` or a
        constant [Pa].
    cover_thickness, cover_young, cover_density : float
        Constraining layer H3 [m], E3 [Pa], density [kg/m^3].
    base_loss_factor, cover_loss_factor : float, optional
        Loss factors of the elastic faces (default 0).
    base_poisson, cover_poisson : float, optional
        Poisson's ratios of the faces; plate moduli E/(1 - nu^2) are used.
    wavenumber : {"composite", "base"}, optional
        Bending wavenumber used in the shear parameter: that of the composite plate,
        k^4 = omega^2 m''/Re(D*), found by fixed-point iteration (default), or that of the
        bare base plate.

    Returns
    -------
    CompositeDamping
        Loss factor, Re(D*) [N m], total and added mass per area.

    Notes
    -----
    Ross–Kerwin–Ungar three-layer model without the core's extensional and bending
    stiffness, written with complex moduli (exp(+j omega t)):

        D* = D_0* (1 + Y* g* / (1 + g*)),   D_0* = (E1* H1^3 + E3* H3^3)/12,
        g* = G2* / (k^2 H2) (1/(E1* H1) + 1/(E3* H3)),   Y* from :func:`rku_geometric_parameter`,

    eta = Im(D*)/Re(D*).  With undamped faces this reduces exactly to
    :func:`rku_loss_factor`.  Assumes faces in pure bending plus membrane action, core in
    pure shear, equal transverse displacement of all layers.

    References
    ----------
    .. [1] Ross, D., Ungar, E.E., Kerwin, E.M. (1959) in Structural Damping, ASME, 49-88.
    .. [2] Kerwin, E.M. (1959) "Damping of flexural waves by a constrained viscoelastic
       layer", J. Acoust. Soc. Am. 31(7), 952-962, doi:10.1121/1.1907821.
    .. [3] Ungar, E.E. (1962) J. Acoust. Soc. Am. 34(8), 1082-1089, doi:10.1121/1.1918249.
    """
    h1 = float(_positive("base_thickness", base_thickness))
    e1 = float(_positive("base_young", base_young))
    rho1 = float(_positive("base_density", base_density))
    h2 = float(_positive("core_thickness", core_thickness))
    rho2 = float(_non_negative("core_density", core_density))
    h3 = float(_positive("cover_thickness", cover_thickness))
    e3 = float(_positive("cover_young", cover_young))
    rho3 = float(_non_negative("cover_density", cover_density))
    eta1 = float(_non_negative("base_loss_factor", base_loss_factor))
    eta3 = float(_non_negative("cover_loss_factor", cover_loss_factor))
    if isinstance(core_shear_modulus, ModulusTable) and core_shear_modulus.quantity != "shear":
        msg = "core_shear_modulus must be a table of shear modulus (quantity='shear')"
        raise ValueError(msg)
    if wavenumber not in ("composite", "base"):
        msg = f"wavenumber must be 'composite' or 'base', got {wavenumber!r}"
        raise ValueError(msg)
    f_ = _positive("f", f)
    g2 = complex_modulus(f_, core_shear_modulus)
    e1c = e1 * (1.0 + 1j * eta1) / (1.0 - base_poisson**2)
    e3c = e3 * (1.0 + 1j * eta3) / (1.0 - cover_poisson**2)
    d0 = (e1c * h1**3 + e3c * h3**3) / 12.0
    dist = h2 + 0.5 * (h1 + h3)
    k1, k3 = e1c * h1, e3c * h3
    coupled = dist**2 * k1 * k3 / (k1 + k3)  # D_inf - D_0
    omega = 2.0 * math.pi * f_
    added = rho2 * h2 + rho3 * h3
    mass = rho1 * h1 + added

    def stiffness(k: FloatArray) -> ComplexArray:
        gs = g2 / (k**2 * h2) * (1.0 / k1 + 1.0 / k3)
        return np.asarray(d0 + coupled * gs / (1.0 + gs), dtype=np.complex128)

    if wavenumber == "base":
        k = (omega**2 * rho1 * h1 / (e1 * h1**3 / (12.0 * (1.0 - base_poisson**2)))) ** 0.25
        d = stiffness(k)
    else:
        # k -> k(D(k)) is increasing with slope <= 1/2 in log terms: monotone convergence.
        k = (omega**2 * mass / d0.real) ** 0.25
        for _ in range(200):
            d = stiffness(k)
            k_new = (omega**2 * mass / d.real) ** 0.25
            converged = np.max(np.abs(k_new / k - 1.0)) < 1e-12
            k = k_new
            if converged:
                break
        d = stiffness(k)
    return CompositeDamping(
        loss_factor=np.asarray(d.imag / d.real, dtype=np.float64),
        bending_stiffness=np.asarray(d.real, dtype=np.float64),
        mass_per_area=mass,
        added_mass_per_area=added,
    )
