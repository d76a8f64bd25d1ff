"""Tests for seatool.physics.point_connections (sources beside each check)."""

from __future__ import annotations

import math

import numpy as np
import pytest

from seatool.physics import point_connections as pc

STEEL = (210e9, 7850.0, 0.3)

# ------------------------------------------------------------------------------------------
# point connections
# ------------------------------------------------------------------------------------------


def test_point_clf_identical_infinite_plates_against_mode_count():
    # Infinite-plate drive-point mobility Y = 1/(8 sqrt(D m'')) (Cremer, Heckl & Petersson,
    # from memory). For two identical plates eta_12 = 1/(4 omega M Y) = 1/(omega n(f)) with the
    # plate modal density n(f); n(f) is counted here from the exact simply supported natural
    # frequencies (Leissa 1969) of a 1.2 m x 0.9 m steel 1 mm plate, 500-2000 Hz. Within 3 %.
    e, rho, nu = STEEL
    h, a, b = 1e-3, 1.2, 0.9
    d = e * h**3 / (12 * (1 - nu**2))
    m = rho * h
    i = np.arange(1, 300)[:, None]
    j = np.arange(1, 300)[None, :]
    fmn = 0.5 * math.pi * math.sqrt(d / m) * ((i / a) ** 2 + (j / b) ** 2)
    n_count = np.count_nonzero((fmn >= 500.0) & (fmn < 2000.0)) / 1500.0
    f = 1000.0
    y = 1.0 / (8.0 * math.sqrt(d * m))
    eta = pc.clf_point_rigid(f, y, y, m * a * b)
    assert float(eta) == pytest.approx(1.0 / (2 * math.pi * f * n_count), rel=0.03)


def test_point_clf_dashpot_limit_and_n_points():
    # A dashpot c at a point of a reverberant plate absorbs c <v^2> = c E/M (Cremer, Heckl &
    # Petersson): eta = c/(omega M) when Y_1 << 1/c.
    f, mass, c = 500.0, 20.0, 0.5
    eta = pc.clf_point_rigid(f, 1e-6, 1.0 / c, mass)
    assert float(eta) == pytest.approx(c / (2 * math.pi * f * mass), rel=1e-4)
    eta3 = pc.clf_point_rigid(f, 1e-6, 1.0 / c, mass, n_points=3)
    assert float(eta3) == pytest.approx(3 * float(eta), rel=1e-12)


def test_resilient_mount_limits():
    f = np.array([100.0, 1000.0])
    y1 = np.array([0.01, 0.01 - 0.002j])
    y2 = np.array([0.004 + 0.001j, 0.004])
    rigid = pc.clf_point_rigid(f, y1, y2, 5.0)
    stiff = pc.clf_point_resilient(f, y1, y2, 5.0, 1e12)
    np.testing.assert_allclose(stiff, rigid, rtol=1e-6)
    # soft mount: |Y_m| >> |Y_1 + Y_2| -> eta = Re(Y_2) k^2 |1 + j eta_m|^2/(omega^3 M_1)
    k, eta_m = 10.0, 0.1
    soft = pc.clf_point_resilient(f, y1, y2, 5.0, k, loss_factor=eta_m)
    w = 2 * np.pi * f
    np.testing.assert_allclose(soft, y2.real * k**2 * (1 + eta_m**2) / (w**3 * 5.0), rtol=1e-3)


def test_validation():
    with pytest.raises(ValueError, match="stiffness"):
        pc.clf_point_resilient(100.0, 0.01, 0.01, 1.0, 0.0)
    with pytest.raises(ValueError, match="mass_1"):
        pc.clf_point_rigid(100.0, 0.01, 0.01, -1.0)


# --- resonator on a structure ------------------------------------------------------------


def _fr_bandwidth_loss_factor(m, k, mobility):  # type: ignore[no-untyped-def]
    """Independent numerical reference: the half-power bandwidth of the exact response of
    the mass (force on the mass, spring to a base of mobility Y(omega)), eta = df/f0."""
    from scipy.optimize import brentq

    w0 = np.sqrt(k / m)

    def resp(w):  # |x/F|^2 of m x'' + k_eff(w) x = F
        keff = k / (1.0 + k * mobility(w) / (1j * w))
        return 1.0 / abs(keff - m * w**2) ** 2

    ws = np.linspace(0.9 * w0, 1.1 * w0, 20001)
    r = np.array([resp(w) for w in ws])
    wp = ws[np.argmax(r)]
    half = resp(wp) / 2.0
    lo = brentq(lambda w: resp(w) - half, 0.9 * w0, wp)
    hi = brentq(lambda w: resp(w) - half, wp, 1.1 * w0)
    return (hi - lo) / wp


def test_resonator_on_plate_matches_exact_response_bandwidth():
    # Independent numerical method: half-power bandwidth of the exact frequency response of
    # the mass on a spring whose base is a real plate mobility (the plate acts as a dashpot).
    m, k = 2.0, 2.0e6
    y = 2.0e-5  # real mobility of a heavy plate; eta_0 = k y / omega_0 = 0.04 (weak coupling)
    f0 = np.sqrt(k / m) / (2 * np.pi)
    eta_formula = pc.clf_resonator_point(f0, f0, k, y)
    eta_exact = _fr_bandwidth_loss_factor(m, k, lambda w: y)
    assert float(eta_formula) == pytest.approx(0.04, rel=1e-12)
    assert float(eta_formula) == pytest.approx(eta_exact, rel=0.01)


def test_resonator_on_beam_matches_exact_response_bandwidth():
    # Complex, frequency-dependent infinite-beam mobility (1 - j)/(4 m' c_B)
    # (Cremer, Heckl & Petersson), evaluated inside the exact response.
    e_mod, rho, b, h = 210e9, 7850.0, 0.05, 0.04
    i_b, mp = b * h**3 / 12, rho * b * h

    def y_beam(w):  # type: ignore[no-untyped-def]
        c_b = np.sqrt(w) * (e_mod * i_b / mp) ** 0.25
        return (1 - 1j) / (4 * mp * c_b)

    m, k = 0.25, 1.0e6  # eta_0 about 0.03
    w0 = np.sqrt(k / m)
    eta_formula = pc.clf_resonator_point(w0 / (2 * np.pi), w0 / (2 * np.pi), k, y_beam(w0))
    eta_exact = _fr_bandwidth_loss_factor(m, k, y_beam)
    # The formula neglects the shift of the natural frequency by Im(Y) and the variation of
    # Y(omega) across the resonance: errors of order eta_0 (about 3 % here).
    assert float(eta_formula) == pytest.approx(eta_exact, rel=0.05)


def test_resonator_clf_scales_to_band_centre():
    # omega eta_rs E is the same power at any band centre (definition in the docstring).
    e1 = pc.clf_resonator_point(500.0, 400.0, 1e6, 1e-3)
    e2 = pc.clf_resonator_point(400.0, 400.0, 1e6, 1e-3)
    assert float(e1) * 500.0 == pytest.approx(float(e2) * 400.0, rel=1e-12)
    with pytest.raises(ValueError, match="stiffness"):
        pc.clf_resonator_point(500.0, 400.0, -1.0, 1e-3)
