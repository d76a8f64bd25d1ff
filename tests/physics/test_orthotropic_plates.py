"""Tests of seatool.physics.orthotropic_plates against independent methods and published tables."""

from __future__ import annotations

import numpy as np
import pytest
from scipy import integrate

from seatool.physics import orthotropic_plates, plates

C0 = 343.0


def third_octave_bands(k_lo: int, k_hi: int) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Exact base-10 1/3-octave mid-band frequencies 10^(k/10) and edges (IEC 61260-1)."""
    k = np.arange(k_lo, k_hi + 1)
    fm = 10.0 ** (k / 10.0)
    return fm, fm * 10.0**-0.05, fm * 10.0**0.05


# ---------------------------------------------------------------------------------------
# orthotropic and ribbed plates
# ---------------------------------------------------------------------------------------
def test_orthotropic_modal_density_vs_exact_navier_count() -> None:
    # Independent: SS orthotropic plate, Navier solution
    # m'' omega^2 = D_x (m pi/a)^4 + 2H (m pi/a)^2 (n pi/b)^2 + D_y (n pi/b)^4
    # (Timoshenko & Woinowsky-Krieger 1959 sec. 87; Leissa 1969 ch. 11).
    a, b, m = 2.0, 1.5, 10.0
    dx, dy, hh = 400.0, 25.0, 40.0  # strongly orthotropic, H != sqrt(DxDy) = 100
    kx = np.arange(1, 600)[:, None] * np.pi / a
    ky = np.arange(1, 600)[None, :] * np.pi / b
    omega = np.sqrt((dx * kx**4 + 2 * hh * kx**2 * ky**2 + dy * ky**4) / m)
    fmodes = (omega / (2 * np.pi)).ravel()
    fm, lo, hi = third_octave_bands(28, 34)
    counted = np.array([np.count_nonzero((fmodes >= x) & (fmodes < y)) for x, y in zip(lo, hi, strict=True)])
    n = orthotropic_plates.orthotropic_plate_modal_density(fm, a * b, dx, dy, m, torsional_stiffness=hh)
    assert counted.min() > 40
    np.testing.assert_allclose(counted, n * (hi - lo), rtol=0.12)
    assert abs(counted.sum() / (n * (hi - lo)).sum() - 1.0) < 0.05


def test_orthotropic_modal_density_angle_integral_by_quad() -> None:
    # independent numerical integration of (S/pi) * int sqrt(m/D(phi)) dphi
    s, m, dx, dy, hh = 2.0, 12.0, 300.0, 30.0, 20.0

    def integrand(phi: float) -> float:
        c2, s2 = np.cos(phi) ** 2, np.sin(phi) ** 2
        return float(np.sqrt(m / (dx * c2**2 + 2 * hh * c2 * s2 + dy * s2**2)))

    ref = s / np.pi * integrate.quad(integrand, 0.0, np.pi / 2, epsabs=0, epsrel=1e-12)[0]
    n = orthotropic_plates.orthotropic_plate_modal_density(500.0, s, dx, dy, m, torsional_stiffness=hh)
    assert n == pytest.approx(ref, rel=1e-9)


def test_orthotropic_huber_case_reduces_to_geometric_mean() -> None:
    # H = sqrt(Dx Dy): closed form (S/2) sqrt(m'') / (Dx Dy)^(1/4) (Lyon & DeJong, from memory)
    dx, dy, m = 90.0, 10.0, 5.0
    n = orthotropic_plates.orthotropic_plate_modal_density([100.0, 1000.0], 1.0, dx, dy, m)
    np.testing.assert_allclose(n, 0.5 * np.sqrt(m) / (dx * dy) ** 0.25, rtol=1e-12)
    iso = orthotropic_plates.orthotropic_plate_modal_density(100.0, 1.0, 30.0, 30.0, m, torsional_stiffness=30.0)
    assert iso == pytest.approx(plates.plate_bending_modal_density(100.0, 1.0, 30.0, m), rel=1e-12)


def test_ribbed_plate_smeared_stiffness() -> None:
    # Timoshenko & Woinowsky-Krieger sec. 86: D_x = D + E I / d, D_y = H = D.
    e, h, nu = 70e9, 2e-3, 0.33
    i_rib = orthotropic_plates.rib_second_moment_rectangular(5e-3, 30e-3, h)
    # parallel-axis theorem checked by direct numerical integration of z^2 over the rib
    z_lo, z_hi = h / 2, h / 2 + 30e-3
    i_num = 5e-3 * integrate.quad(lambda z: z**2, z_lo, z_hi)[0]
    assert i_rib == pytest.approx(i_num, rel=1e-12)
    dx, dy, hh = orthotropic_plates.ribbed_plate_stiffness(e, h, nu, i_rib, 0.15)
    d = plates.bending_stiffness(e, h, nu)
    assert dx == pytest.approx(d + e * i_num / 0.15, rel=1e-12)
    assert dy == pytest.approx(d) and hh == pytest.approx(d)
    # the ribs raise the stiffness: more than one coincidence frequency, n below the skin's
    fl, fh = orthotropic_plates.orthotropic_critical_frequencies(dx, dy, 2700 * h, C0)
    assert fl < fh
    assert orthotropic_plates.orthotropic_plate_modal_density(
        100.0, 1.0, dx, dy, 2700 * h, torsional_stiffness=hh
    ) < plates.plate_bending_modal_density(100.0, 1.0, d, 2700 * h)


def test_bay_frequency_is_first_strip_mode() -> None:
    # bending wavelength at f_bay equals twice the bay width (half a wavelength per bay)
    d, m, width = 50.0, 5.4, 0.2
    f_bay = orthotropic_plates.ribbed_plate_bay_frequency(width, d, m)
    k = plates.plate_bending_wavenumber(f_bay, d, m)
    assert 2 * np.pi / k == pytest.approx(2 * width, rel=1e-12)
