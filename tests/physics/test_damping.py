"""Tests for seatool.physics.damping against standards, closed-form limits and numerics."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad, solve_ivp
from scipy.optimize import minimize_scalar

from seatool.physics import air_absorption, damping_layers
from seatool.physics import damping as dmp

# ------------------------------------------------------------------------------------------
# loss factor <-> T60
# ------------------------------------------------------------------------------------------


def test_loss_factor_rule_22_over_f_t60():
    # common practice (e.g. Cremer, Heckl & Petersson ch. 3): eta = 2.2/(f T60)
    f = np.array([100.0, 1000.0])
    t = np.array([1.0, 0.5])
    np.testing.assert_allclose(dmp.loss_factor_from_t60(f, t), 2.2 / (f * t), rtol=1e-14)
    # exact constant ln(10^6)/(2 pi) = 2.19881 (definition of a 60 dB decay)
    np.testing.assert_allclose(
        dmp.loss_factor_from_t60(f, t, exact=True) * f * t, 2.19881, rtol=1e-5
    )
    np.testing.assert_allclose(dmp.t60_from_loss_factor(f, dmp.loss_factor_from_t60(f, t)), t)


def test_loss_factor_from_simulated_free_decay():
    # independent numerical method: integrate a damped oscillator (scipy), measure the time
    # for the energy to fall 60 dB, and recover eta with the exact decay relation.
    f0, eta = 50.0, 0.02
    w0 = 2 * math.pi * f0

    def rhs(_t, y):
        return [y[1], -eta * w0 * y[1] - w0**2 * y[0]]

    t_end = 1.2 * math.log(1e6) / (eta * w0)
    sol = solve_ivp(rhs, (0, t_end), [1.0, 0.0], rtol=1e-10, atol=1e-14, dense_output=True)
    t = np.linspace(0, t_end, 200_001)
    x, v = sol.sol(t)
    energy = 0.5 * v**2 + 0.5 * w0**2 * x**2
    # energy decays as exp(-eta w0 t) modulated at 2 w0; fit the log-energy slope
    slope = np.polyfit(t, np.log(energy), 1)[0]
    t60 = math.log(1e6) / -slope
    np.testing.assert_allclose(dmp.loss_factor_from_t60(f0, t60, exact=True), eta, rtol=2e-3)
    np.testing.assert_allclose(dmp.loss_factor_from_t60(f0, t60), eta, rtol=3e-3)


# ------------------------------------------------------------------------------------------
# Sabine / Eyring
# ------------------------------------------------------------------------------------------


def test_sabine_0161():
    # ISO 354:2003 clause 8 / common practice: T = 55.3 V/(c A) = 0.161 V/A at c = 343 m/s
    v, a = 200.0, 12.0
    t = dmp.sabine_t60(v, a, c0=343.0)
    np.testing.assert_allclose(t, 0.161 * v / a, rtol=2e-3)
    np.testing.assert_allclose(t, 55.3 * v / (343.0 * a), rtol=1e-3)  # ISO 354 constant 55.3


def test_sabine_air_term_iso354():
    # ISO 354 clause 8: A = 55.3 V/(c T) - 4 V m -> round-trip with the 4 m V term
    v, a, m = 200.0, 12.0, 0.003
    t = dmp.sabine_t60(v, a, air_attenuation=m, c0=343.0)
    a_back = dmp.SABINE_CONSTANT * v / (343.0 * t) - 4 * v * m
    np.testing.assert_allclose(a_back, a, rtol=1e-12)


def test_eyring_tends_to_sabine_and_is_shorter():
    # Eyring (1930): -ln(1 - a) -> a for small a; and -ln(1 - a) > a so T_Eyring < T_Sabine
    v, s = 100.0, 130.0
    for alpha in (1e-4, 0.05, 0.3, 0.8):
        te = dmp.eyring_t60(v, s, alpha)
        ts = dmp.sabine_t60(v, s * alpha)
        assert te < ts
        np.testing.assert_allclose(te / ts, alpha / -math.log1p(-alpha), rtol=1e-12)
    np.testing.assert_allclose(dmp.eyring_t60(v, s, 1e-6), dmp.sabine_t60(v, s * 1e-6), rtol=1e-5)


def test_switch_rule_sabine_below_eyring_above():
    # common practice: Eyring when the mean absorption coefficient exceeds 0.2
    v = 60.0
    areas = np.array([40.0, 40.0, 22.0])
    low = np.array([0.1, 0.15, 0.2])
    high = np.array([0.3, 0.5, 0.4])
    alphas = np.stack([low, high])
    t = dmp.reverberation_time(v, areas, alphas)
    mean = (alphas * areas).sum(-1) / areas.sum()
    assert mean[0] <= 0.2 < mean[1]
    np.testing.assert_allclose(t[0], dmp.sabine_t60(v, (low * areas).sum()))
    np.testing.assert_allclose(t[1], dmp.eyring_t60(v, areas.sum(), mean[1]))
    with pytest.raises(ValueError, match="method"):
        dmp.reverberation_time(v, areas, low, method="bogus")  # type: ignore[arg-type]


def test_cavity_loss_factor_consistent_with_sabine_decay():
    # eta_c = c A/(8 pi f V) must equal ln(10^6)/(omega T60_Sabine) (Sabine + decay relation)
    f = np.array([125.0, 1000.0, 4000.0])
    v, a = 3.0, 2.0
    eta = dmp.cavity_loss_factor(f, v, a)
    np.testing.assert_allclose(
        eta, dmp.loss_factor_from_t60(f, dmp.sabine_t60(v, a), exact=True), rtol=1e-12
    )


def test_cavity_loss_factor_from_surfaces():
    f = np.array([250.0, 500.0])
    areas = [10.0, 5.0]
    alphas = np.array([[0.1, 0.3], [0.4, 0.8]])
    eta = dmp.cavity_loss_factor_from_surfaces(f, 4.0, areas, alphas, c0=343.0)
    a = (alphas * areas).sum(-1)
    np.testing.assert_allclose(eta, 343.0 * a / (8 * math.pi * f * 4.0))
    eta_e = dmp.cavity_loss_factor_from_surfaces(f, 4.0, areas, alphas, method="eyring", c0=343.0)
    # Eyring's absorption area -S ln(1 - mean) gives Eyring's T60 via the decay relation
    t_e = dmp.eyring_t60(4.0, 15.0, a / 15.0, c0=343.0)
    np.testing.assert_allclose(eta_e, dmp.loss_factor_from_t60(f, t_e, exact=True), rtol=1e-12)
    eta_auto = dmp.cavity_loss_factor_from_surfaces(f, 4.0, areas, alphas, method="auto", c0=343.0)
    np.testing.assert_allclose(eta_auto, [eta[0], eta_e[1]])


def test_invalid_inputs_raise():
    with pytest.raises(ValueError, match="volume"):
        dmp.sabine_t60(-1.0, 2.0)
    with pytest.raises(ValueError, match="mean_absorption"):
        dmp.eyring_t60(1.0, 2.0, 1.0)
    with pytest.raises(ValueError, match="t60"):
        dmp.loss_factor_from_t60(100.0, 0.0)
    with pytest.raises(ValueError, match="relative_humidity"):
        air_absorption.air_attenuation_iso9613(1000.0, relative_humidity=120.0)


# ------------------------------------------------------------------------------------------
# air absorption
# ------------------------------------------------------------------------------------------

# ISO 9613-2:1996 Table 2 (octave-band attenuation coefficients in dB/km computed from
# ISO 9613-1 at the exact mid-band frequencies), values FROM MEMORY. The table is rounded to
# 0.1 dB/km (three significant digits above 100); tolerance 0.06 dB/km or 0.5 %, whichever is
# larger (half a unit of the last digit plus a little for a value recalled at a rounding edge).
_ISO9613_TABLE = [
    # (T [C], RH [%], values at 63 ... 8000 Hz)
    (10.0, 70.0, [0.1, 0.4, 1.0, 1.9, 3.7, 9.7, 32.8, 117.0]),
    (20.0, 70.0, [0.1, 0.3, 1.1, 2.8, 5.0, 9.0, 22.9, 76.6]),
    (30.0, 70.0, [0.1, 0.3, 1.0, 3.1, 7.4, 12.7, 23.1, 59.3]),
    (15.0, 20.0, [0.3, 0.6, 1.2, 2.7, 8.2, 28.2, 88.8, 202.0]),
    (15.0, 50.0, [0.1, 0.5, 1.2, 2.2, 4.2, 10.8, 36.2, 129.0]),
    (15.0, 80.0, [0.1, 0.3, 1.1, 2.4, 4.1, 8.3, 23.7, 82.8]),
]


@pytest.mark.parametrize(("temp", "rh", "table"), _ISO9613_TABLE)
def test_air_absorption_iso9613_table(temp, rh, table):
    f_exact = 1000.0 * 10.0 ** (np.arange(-12, 10, 3) / 10.0)  # IEC 61260-1 base-10 octaves
    got = (
        air_absorption.air_attenuation_iso9613(f_exact, temperature=temp, relative_humidity=rh)
        * 1e3
    )
    table = np.asarray(table)
    tol = np.maximum(0.06, 0.005 * table)
    assert np.all(np.abs(got - table) <= tol), (got, table)


def test_air_attenuation_constant_convention():
    # intensity convention: a level falls by alpha dB per metre <=> I ~ exp(-m x)
    f = np.array([1000.0, 4000.0])
    alpha = air_absorption.air_attenuation_iso9613(f)
    m = air_absorption.air_attenuation_constant(f)
    np.testing.assert_allclose(10 * np.log10(np.exp(m * 1.0)), alpha, rtol=1e-12)


def test_air_loss_factor_equals_4mV_absorption():
    # Sabine's 4 m V term in a cavity (ISO 354 clause 8) -> same loss factor as m c/omega
    f = np.array([2000.0, 8000.0])
    v = 3.0
    m = air_absorption.air_attenuation_constant(f, temperature=20.0, relative_humidity=50.0)
    eta_air = air_absorption.air_absorption_loss_factor(f, temperature=20.0, relative_humidity=50.0)
    np.testing.assert_allclose(eta_air, dmp.cavity_loss_factor(f, v, 4 * m * v), rtol=1e-12)


@pytest.mark.regression
def test_air_regression_values():
    # regression: PHYSICS.md sec. 7.2 [C] values (computed, not published)
    np.testing.assert_allclose(air_absorption.air_attenuation_constant(4000.0), 6.83e-3, rtol=2e-3)
    np.testing.assert_allclose(
        air_absorption.air_absorption_loss_factor(4000.0), 9.32e-5, rtol=2e-3
    )


# ------------------------------------------------------------------------------------------
# modulus table
# ------------------------------------------------------------------------------------------


def test_modulus_table_log_log_interpolation():
    table = damping_layers.ModulusTable((100.0, 1000.0), (1e6, 1e7), (0.5, 1.0), kind="shear")
    g = damping_layers.complex_modulus([100.0, 1000.0, math.sqrt(1e5), 10.0, 1e5], table)
    np.testing.assert_allclose(g.real, [1e6, 1e7, math.sqrt(1e13), 1e6, 1e7], rtol=1e-12)
    np.testing.assert_allclose(g.imag / g.real, [0.5, 1.0, math.sqrt(0.5), 0.5, 1.0], rtol=1e-12)
    with pytest.raises(ValueError, match="increasing"):
        damping_layers.ModulusTable((1000.0, 100.0), (1e6, 1e7), (0.5, 1.0))


# ------------------------------------------------------------------------------------------
# free layer
# ------------------------------------------------------------------------------------------

E_STEEL, RHO_STEEL = 210e9, 7850.0


def _complex_neutral_axis_stiffness(h1, e1, h2, e2):
    """Independent: D* = int E*(z) (z - z_n)^2 dz by quadrature (complex neutral axis)."""

    def modulus(z):
        return e1 if z < h1 else e2

    def integral(fn):
        parts = ((0.0, h1), (h1, h1 + h2))
        re = sum(quad(lambda z: complex(fn(z)).real, a, b)[0] for a, b in parts)
        im = sum(quad(lambda z: complex(fn(z)).imag, a, b)[0] for a, b in parts)
        return re + 1j * im

    zn = integral(lambda z: modulus(z) * z) / integral(modulus)
    return integral(lambda z: modulus(z) * (z - zn) ** 2)


def test_free_layer_against_quadrature():
    # independent method: composite stiffness from numerical integration over the section
    h1, h2 = 1e-3, 2e-3
    e2 = 1e9 * (1 + 0.8j)
    res = damping_layers.free_layer_damping(1000.0, h1, E_STEEL, RHO_STEEL, h2, 1500.0, e2)
    d_ref = _complex_neutral_axis_stiffness(h1, E_STEEL, h2, e2) / (1 - 0.3**2)
    np.testing.assert_allclose(res.bending_stiffness, d_ref.real, rtol=1e-9)
    np.testing.assert_allclose(res.loss_factor, d_ref.imag / d_ref.real, rtol=1e-9)
    np.testing.assert_allclose(res.mass_per_area, RHO_STEEL * h1 + 1500.0 * h2)
    np.testing.assert_allclose(res.added_mass_per_area, 1500.0 * h2)


def test_free_layer_closed_form_first_order():
    # Ross, Kerwin & Ungar (1959) / Oberst (1952) closed form = first order in eta2
    h1 = 1e-3
    eta2 = 1e-4
    for h, e in ((0.5, 1e-3), (2.0, 1 / 210), (3.0, 0.3 / 210)):
        res = damping_layers.free_layer_damping(
            500.0, h1, E_STEEL, RHO_STEEL, h * h1, 1000.0, E_STEEL * e * (1 + 1j * eta2)
        )
        np.testing.assert_allclose(
            res.loss_factor / eta2, damping_layers.free_layer_loss_factor_ratio(e, h), rtol=1e-6
        )


def test_free_layer_thin_limit_3eh():
    # Oberst (1952) thin layer: extensional layer at distance H1/2 from the base mid-plane
    # adds E2 H2 (H1/2)^2 to D, so eta/eta2 -> E2 H2 H1^2/4 / (E1 H1^3/12) = 3 e h, i.e.
    # proportional to the layer thickness.
    e = 1e-2
    for h in (1e-4, 1e-3):
        np.testing.assert_allclose(
            damping_layers.free_layer_loss_factor_ratio(e, h) / (e * h), 3.0, rtol=4 * h + 1e-3
        )
    r1 = damping_layers.free_layer_loss_factor_ratio(e, 1e-4)
    r2 = damping_layers.free_layer_loss_factor_ratio(e, 2e-4)
    np.testing.assert_allclose(r2 / r1, 2.0, rtol=1e-3)


def test_free_layer_14_eh2_rule():
    # Ungar (Beranek & Ver 1992 ch. 12) rule of thumb for soft layers, H2/H1 ~ 0.5..2:
    # eta/eta2 ~= 14 e h^2 (within about 12 % over that range)
    e = 1e-4
    for h in (0.5, 1.0, 1.5, 2.0):
        ratio = damping_layers.free_layer_loss_factor_ratio(e, h) / (14 * e * h**2)
        assert 0.9 < ratio < 1.12, (h, ratio)


def test_free_layer_stiff_thick_limit():
    # Layer much stiffer and thicker than the base: the composite is the layer itself, so
    # eta -> eta2 (limit of the RKU formula for e h -> inf)
    assert damping_layers.free_layer_loss_factor_ratio(1.0, 1e4) > 0.999


def test_free_layer_frequency_dependence_via_table():
    table = damping_layers.ModulusTable((100.0, 10000.0), (1e8, 1e10), (1.0, 0.2), kind="young")
    f = np.array([100.0, 1000.0, 10000.0])
    res = damping_layers.free_layer_damping(f, 1e-3, E_STEEL, RHO_STEEL, 2e-3, 1800.0, table)
    assert res.loss_factor.shape == (3,)
    for i, fi in enumerate(f):
        one = damping_layers.free_layer_damping(
            fi,
            1e-3,
            E_STEEL,
            RHO_STEEL,
            2e-3,
            1800.0,
            complex(damping_layers.complex_modulus(fi, table)),
        )
        np.testing.assert_allclose(res.loss_factor[i], one.loss_factor, rtol=1e-12)
    with pytest.raises(ValueError, match="young"):
        damping_layers.free_layer_damping(
            f,
            1e-3,
            E_STEEL,
            RHO_STEEL,
            2e-3,
            1800.0,
            damping_layers.ModulusTable((1.0,), (1e6,), (1.0,), kind="shear"),
        )


# ------------------------------------------------------------------------------------------
# constrained layer
# ------------------------------------------------------------------------------------------


def _sandwich_stiffness_energy(k, h1, e1, h2, g2, h3, e3):
    """Independent derivation: minimise the strain energy of w = W cos kx over the face
    membrane displacements (u1, u3 = a, b sin kx); core in pure shear
    gamma = (u3 - u1 + d w')/H2. Returns complex D with U = D k^4 W^2 / 4 (per length)."""
    d = h2 + 0.5 * (h1 + h3)
    b1, b3 = e1 * h1**3 / 12, e3 * h3**3 / 12
    k1, k3 = e1 * h1, e3 * h3
    s = g2 / h2
    w = 1.0
    # dU/da = 0, dU/db = 0 with
    # U = 1/4 [(B1+B3) k^4 W^2 + K1 k^2 a^2 + K3 k^2 b^2 + s (b - a - d k W)^2]
    mat = np.array([[k1 * k**2 + s, -s], [-s, k3 * k**2 + s]], dtype=complex)
    rhs = np.array([-s * d * k * w, s * d * k * w], dtype=complex)
    a, b = np.linalg.solve(mat, rhs)
    u4 = (
        (b1 + b3) * k**4 * w**2 + k1 * k**2 * a**2 + k3 * k**2 * b**2 + s * (b - a - d * k * w) ** 2
    )
    return u4 / (k**4 * w**2)


def test_constrained_layer_against_energy_method():
    # asymmetric faces (1 mm steel base, 0.5 mm aluminium cover) -> also resolves the doubt
    # whether Y is valid beyond symmetric sandwiches
    h1, h2, h3 = 1e-3, 0.1e-3, 0.5e-3
    e3, rho3 = 70e9, 2700.0
    g2 = 1e6 * (1 + 1.0j)
    f = np.array([50.0, 500.0, 5000.0])
    res = damping_layers.constrained_layer_damping(
        f, h1, E_STEEL, RHO_STEEL, h2, 1000.0, g2, h3, e3, rho3
    )
    nu = 0.3
    e1p, e3p = E_STEEL / (1 - nu**2), e3 / (1 - nu**2)
    k = ((2 * math.pi * f) ** 2 * res.mass_per_area / res.bending_stiffness) ** 0.25
    for i in range(f.size):
        d = _sandwich_stiffness_energy(k[i], h1, e1p, h2, g2, h3, e3p)
        np.testing.assert_allclose(res.bending_stiffness[i], d.real, rtol=1e-9)
        np.testing.assert_allclose(res.loss_factor[i], d.imag / d.real, rtol=1e-9)


def test_constrained_layer_matches_rku_formula():
    # with undamped faces the complex model reduces to eta = beta Y g / (1 + (2+Y) g + ...)
    h1, h2, h3 = 1e-3, 0.1e-3, 0.5e-3
    beta = 1.0
    f = np.array([100.0, 1000.0])
    res = damping_layers.constrained_layer_damping(
        f, h1, E_STEEL, RHO_STEEL, h2, 1000.0, 1e6 * (1 + 1j * beta), h3, E_STEEL, RHO_STEEL
    )
    ep = E_STEEL / (1 - 0.3**2)
    k = ((2 * math.pi * f) ** 2 * res.mass_per_area / res.bending_stiffness) ** 0.25
    g = damping_layers.rku_shear_parameter(k, 1e6, h2, h1, ep, h3, ep)
    y = damping_layers.rku_geometric_parameter(h1, ep, h2, h3, ep)
    np.testing.assert_allclose(
        res.loss_factor, damping_layers.rku_loss_factor(g, y, beta), rtol=1e-10
    )


def test_rku_limits_and_optimum():
    # RKU (1959): no damping for g -> 0 (uncoupled faces) nor g -> inf (locked core);
    # maximum at g_opt = 1/sqrt((1+Y)(1+beta^2)) -- checked by numerical optimisation.
    y, beta = 2.569, 1.0
    assert damping_layers.rku_loss_factor(1e-8, y, beta) < 1e-7
    assert damping_layers.rku_loss_factor(1e8, y, beta) < 1e-7
    opt = minimize_scalar(
        lambda lg: -damping_layers.rku_loss_factor(10.0**lg, y, beta),
        bounds=(-4, 4),
        method="bounded",
        options={"xatol": 1e-10},
    )
    np.testing.assert_allclose(
        10.0**opt.x, damping_layers.rku_optimum_shear_parameter(y, beta), rtol=1e-4
    )
    eta_max = beta * y / (2 + y + 2 * math.sqrt((1 + y) * (1 + beta**2)))  # Ungar closed form
    np.testing.assert_allclose(-opt.fun, eta_max, rtol=1e-8)


def test_constrained_layer_versus_core_stiffness_has_peak():
    # sweeping the core shear modulus passes through the optimum: damping small at both ends
    f = 500.0
    etas = []
    for g2 in (1e2, 1e4, 1e6, 1e8, 1e10, 1e12):
        r = damping_layers.constrained_layer_damping(
            f, 1e-3, E_STEEL, RHO_STEEL, 0.1e-3, 1000.0, g2 * (1 + 1j), 0.5e-3, E_STEEL, RHO_STEEL
        )
        etas.append(float(r.loss_factor))
    etas_arr = np.array(etas)
    assert etas_arr[0] < 0.02 * etas_arr.max() and etas_arr[-1] < 0.02 * etas_arr.max()
    assert 0 < int(np.argmax(etas_arr)) < len(etas) - 1


@pytest.mark.regression
def test_rku_regression_values():
    # regression: PHYSICS.md sec. 7.3 [C] (steel 1 mm / VEM 0.1 mm / steel 0.5 mm)
    y = damping_layers.rku_geometric_parameter(1e-3, E_STEEL, 0.1e-3, 0.5e-3, E_STEEL)
    np.testing.assert_allclose(y, 2.569, rtol=1e-3)
    np.testing.assert_allclose(damping_layers.rku_optimum_shear_parameter(y, 1.0), 0.374, rtol=2e-3)
    np.testing.assert_allclose(
        damping_layers.rku_loss_factor(damping_layers.rku_optimum_shear_parameter(y, 1.0), y, 1.0),
        0.259,
        rtol=2e-3,
    )
    np.testing.assert_allclose(
        damping_layers.free_layer_loss_factor_ratio(1 / 210, 2.0), 0.2246, rtol=1e-3
    )
