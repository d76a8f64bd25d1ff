"""Tests for seatool.physics.damping against standards, closed-form limits and numerics."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from seatool.physics import air_absorption
from seatool.physics import damping as dmp


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


def test_absorption_area_implied_by_a_loss_factor_matches_sabines_formula():
    # Sabine's formula (Kuttruff 2009, Room Acoustics, eq. 5.23): T = 0.161 V / A with c =
    # 343 m/s. A room of 200 m^3 with T = 1 s at 500 Hz has A = 32.2 m^2; its loss factor by
    # the 60 dB decay (ln(10^6)/(2 pi f T)) must give back that area within 1 %.
    f, v, t = 500.0, 200.0, 1.0
    eta = dmp.loss_factor_from_t60(f, t, exact=True)
    a = dmp.absorption_area_from_loss_factor(f, v, eta, c0=343.0)
    assert float(a) == pytest.approx(0.161 * v / t, rel=0.01)
    # (0.161 is Sabine's rounded 24 ln10 / 343 = 0.1611: the 1 % tolerance can fail)
    with pytest.raises(ValueError, match="volume"):
        dmp.absorption_area_from_loss_factor(f, -1.0, eta)
