"""Tests of seatool.physics.shells against independent methods and published tables."""

from __future__ import annotations

import numpy as np
import pytest
from scipy import integrate, special

from seatool.physics import elastic, plates, shells

# steel: typical handbook values (Cremer, Heckl & Petersson 2005, Structure-Borne Sound, 3rd ed. Table 3.1; from memory)
E_ST, RHO_ST, NU_ST = 210e9, 7850.0, 0.30


def third_octave_bands(k_lo: int, k_hi: int) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Exact base-10 1/3-octave mid-band frequencies 10^(k/10) and edges (IEC 61260-1)."""
    k = np.arange(k_lo, k_hi + 1)
    fm = 10.0 ** (k / 10.0)
    return fm, fm * 10.0**-0.05, fm * 10.0**0.05


# ---------------------------------------------------------------------------------------
# cylindrical shell
# ---------------------------------------------------------------------------------------
def test_cylinder_ratio_closed_form_vs_quadrature() -> None:
    # independent: direct scipy quadrature of (2/pi) int nu / sqrt(nu^2 - cos^4 phi) dphi
    for nu in (0.05, 0.3, 0.8, 0.97, 1.03, 1.5, 4.0):
        phi0 = np.arccos(np.sqrt(min(nu, 1.0)))
        val = integrate.quad(
            lambda p, nu=nu: nu / np.sqrt(max(nu**2 - np.cos(p) ** 4, 1e-300)),
            phi0,
            np.pi / 2,
            limit=400,
            epsrel=1e-10,
        )[0]
        assert shells.cylinder_modal_density_ratio(nu) == pytest.approx(2 / np.pi * val, rel=1e-6)


def test_cylinder_ratio_asymptotes() -> None:
    # low: (2/pi) Gamma(1/4)^2 / (4 sqrt(2 pi)) sqrt(nu) (derived by area counting in wavenumber space
    # from the Donnell-type shell dispersion relation, Heckl 1962, J. Acoust. Soc. Am. 34(10),
    # 1553-1557, from memory);
    # high: 1 + 3/(16 nu^2)
    c_low = 2 / np.pi * special.gamma(0.25) ** 2 / (4 * np.sqrt(2 * np.pi))
    nu = np.array([1e-4, 1e-3])
    np.testing.assert_allclose(shells.cylinder_modal_density_ratio(nu) / np.sqrt(nu), c_low, rtol=1e-3)
    nu = np.array([20.0, 50.0])
    np.testing.assert_allclose(
        shells.cylinder_modal_density_ratio(nu), 1 + 3 / (16 * nu**2), rtol=1e-4
    )
    assert np.isinf(shells.cylinder_modal_density_ratio(1.0))


def _donnell_mode_frequencies(
    e: float, rho: float, nu: float, h: float, a: float, length: float, mmax: int, nmax: int
) -> tuple[np.ndarray, np.ndarray]:
    """All three Donnell-Mushtari branches of a closed shear-diaphragm cylinder.

    Frequency matrix of Leissa (1973), Vibration of Shells, NASA SP-288, ch. 2 (from
    memory), modes sin(m pi x/L) cos(n theta): lambda = m pi a / L, k = h^2/(12 a^2),
    Omega^2 = rho (1 - nu^2) a^2 omega^2 / E are the eigenvalues of the 3x3 matrix.
    Returns frequencies [Hz] and multiplicities (2 for n >= 1: sine and cosine modes).
    """
    lam = (np.arange(1, mmax + 1) * np.pi * a / length)[:, None] * np.ones((1, nmax + 1))
    n = np.ones((mmax, 1)) * np.arange(0, nmax + 1)[None, :]
    kk = h**2 / (12 * a**2)
    mat = np.zeros((*lam.shape, 3, 3))
    mat[..., 0, 0] = lam**2 + (1 - nu) / 2 * n**2
    mat[..., 0, 1] = mat[..., 1, 0] = (1 + nu) / 2 * lam * n
    mat[..., 0, 2] = mat[..., 2, 0] = nu * lam
    mat[..., 1, 1] = (1 - nu) / 2 * lam**2 + n**2
    mat[..., 1, 2] = mat[..., 2, 1] = n
    mat[..., 2, 2] = 1 + kk * (lam**2 + n**2) ** 2
    om2 = np.linalg.eigvalsh(mat)
    c_lp = np.sqrt(e / (rho * (1 - nu**2)))
    f = np.sqrt(np.abs(om2)) * c_lp / (2 * np.pi * a)
    mult = np.broadcast_to(np.where(n >= 1, 2, 1)[..., None], f.shape)
    return f.ravel(), mult.ravel()


def test_shell_modal_density_vs_donnell_mode_count() -> None:
    # Independent: count the natural frequencies of a closed cylinder from the full
    # Donnell-Mushtari equations (all branches), over (m, n); compare band counts with
    # the band integral of the asymptotic flexural modal density.
    e, rho, nu, h, a, length = E_ST, RHO_ST, NU_ST, 1e-3, 0.5, 2.0
    fmodes, mult = _donnell_mode_frequencies(e, rho, nu, h, a, length, 140, 110)
    area = 2 * np.pi * a * length
    f_peak = float(shells.ring_frequency(a, elastic.plate_longitudinal_speed(e, rho, nu))) * np.sqrt(
        1 - nu**2
    )
    fm, lo, hi = third_octave_bands(24, 37)  # 250 Hz ... 5 kHz, f_r = 1726 Hz
    ratios = []
    for x, y in zip(lo, hi, strict=True):
        count = mult[(fmodes >= x) & (fmodes < y)].sum()
        pts = [f_peak] if x < f_peak < y else None
        pred = integrate.quad(
            lambda f: float(shells.shell_bending_modal_density(f, area, a, h, e, rho, nu)),
            x,
            y,
            points=pts,
            limit=200,
        )[0]
        assert count >= 40
        ratios.append(count / pred)
    ratios_arr = np.array(ratios)
    assert np.all(np.abs(ratios_arr - 1) < 0.10)
    assert np.mean(np.abs(ratios_arr - 1)) < 0.03
    # well above the ring frequency the shell tends to the flat plate
    n_p = plates.plate_bending_modal_density(
        1.0, area, plates.bending_stiffness(e, h, nu), rho * h
    )
    assert shells.shell_bending_modal_density(10 * f_peak, area, a, h, e, rho, nu) == pytest.approx(
        n_p, rel=0.01
    )


def test_ring_frequency_is_breathing_mode_of_donnell_equations() -> None:
    # independent: n = 0 breathing mode of a very long cylinder (lambda -> 0) from the
    # Donnell-Mushtari matrix equals c_L' / (2 pi a)
    fmodes, mult = _donnell_mode_frequencies(E_ST, RHO_ST, NU_ST, 1e-3, 1.0, 1e4, 1, 0)
    fr = shells.ring_frequency(1.0, elastic.plate_longitudinal_speed(E_ST, RHO_ST, NU_ST))
    assert fmodes.max() == pytest.approx(fr, rel=1e-6)


@pytest.mark.regression
def test_ring_frequency_regression() -> None:
    # f_r = c_L'/(2 pi a) (Szechenyi 1971, J. Sound Vib. 19(1), 65-81) computed by hand
    # outside the code (not published): steel, a = 1 m -> 863 Hz
    fr = shells.ring_frequency(1.0, elastic.plate_longitudinal_speed(E_ST, RHO_ST, NU_ST))
    assert fr == pytest.approx(863, rel=2e-3)
