"""Tests for seatool.physics.damping_layers against standards, closed-form limits and numerics."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad
from scipy.optimize import minimize_scalar

from seatool.physics import damping_layers


def test_modulus_table_log_log_interpolation():
    table = damping_layers.ModulusTable((100.0, 1000.0), (1e6, 1e7), (0.5, 1.0), quantity="shear")
    g = damping_layers.complex_modulus([100.0, 1000.0, math.sqrt(1e5), 10.0, 1e5], table)
    np.testing.assert_allclose(g.real, [1e6, 1e7, math.sqrt(1e13), 1e6, 1e7], rtol=1e-12)
    np.testing.assert_allclose(g.imag / g.real, [0.5, 1.0, math.sqrt(0.5), 0.5, 1.0], rtol=1e-12)
    with pytest.raises(ValueError, match="increasing"):
        damping_layers.ModulusTable((1000.0, 100.0), (1e6, 1e7), (0.5, 1.0))


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
    table = damping_layers.ModulusTable((100.0, 10000.0), (1e8, 1e10), (1.0, 0.2), quantity="young")
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
            damping_layers.ModulusTable((1.0,), (1e6,), (1.0,), quantity="shear"),
        )


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
    # regression: computed by hand outside the code from Ross, Kerwin & Ungar (1959) as
    # given by Ungar (1992, ch. 12 of Beranek & Ver), not published (steel 1 mm / VEM 0.1 mm / steel 0.5 mm)
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
