"""Tests of seatool.physics.acoustic against exact mode counts and reference data."""

from __future__ import annotations

import numpy as np
import pytest
from scipy import optimize, special

from seatool.physics import acoustic as ac
from seatool.physics import air

C0 = 343.0


BOX = (2.0, 1.5, 1.0)


def _box_mode_frequencies(lx: float, ly: float, lz: float, c: float, fmax: float) -> np.ndarray:
    """Exact rigid-box modes f_lmn = (c/2) sqrt((l/Lx)^2 + (m/Ly)^2 + (n/Lz)^2), l,m,n >= 0,
    (0,0,0) excluded (Morse & Bolt 1944; Kuttruff, Room Acoustics, ch. 3)."""
    nmax = [int(np.ceil(2 * fmax * length / c)) + 1 for length in (lx, ly, lz)]
    l, m, n = np.meshgrid(*(np.arange(k + 1) for k in nmax), indexing="ij")
    f = c / 2 * np.sqrt((l / lx) ** 2 + (m / ly) ** 2 + (n / lz) ** 2)
    f = f.ravel()
    return f[f > 0]


def test_rectangular_cavity_geometry() -> None:
    v, s, ell = ac.rectangular_cavity_geometry(*BOX)
    assert (v, s, ell) == pytest.approx((3.0, 2 * (3.0 + 1.5 + 2.0), 4 * 4.5))


def test_cavity_mode_count_vs_exact_enumeration() -> None:
    # independent method: enumeration of rigid-box modes (recomputed here, not
    # copied)
    v, s, ell = ac.rectangular_cavity_geometry(*BOX)
    f_modes = _box_mode_frequencies(*BOX, C0, 2100.0)
    for f, rtol in ((250.0, 0.10), (500.0, 0.03), (1000.0, 0.02), (2000.0, 0.01)):
        exact = np.count_nonzero(f_modes <= f)
        assert ac.cavity_mode_count(f, v, s, ell, C0) == pytest.approx(exact, rel=rtol)
    # the surface and edge terms matter: at 250 Hz the volume term alone is off by > 50 %
    exact_250 = np.count_nonzero(f_modes <= 250.0)
    assert ac.cavity_mode_count(250.0, v, s, ell, C0, terms="volume") < 0.5 * exact_250


def test_cavity_modal_density_vs_exact_band_counts() -> None:
    v, s, ell = ac.rectangular_cavity_geometry(*BOX)
    f_modes = _box_mode_frequencies(*BOX, C0, 3000.0)
    k = np.arange(26, 34)  # 400 Hz ... 2.5 kHz, exact base-10 bands
    fm = 10.0 ** (k / 10)
    lo, hi = fm * 10**-0.05, fm * 10**0.05
    counted = np.array(
        [np.count_nonzero((f_modes > a) & (f_modes <= b)) for a, b in zip(lo, hi, strict=True)]
    )
    # band integral of n(f) = N(hi) - N(lo) (exact for the polynomial n)
    expected = ac.cavity_mode_count(hi, v, s, ell, C0) - ac.cavity_mode_count(lo, v, s, ell, C0)
    mid = ac.cavity_modal_density(fm, v, s, ell, C0) * (hi - lo)
    assert counted.min() >= 20
    np.testing.assert_allclose(counted, expected, rtol=0.08)
    # n(f_m) * bandwidth underestimates the band integral of the ~f^2 term by about 1.5 %
    np.testing.assert_allclose(mid, expected, rtol=0.02)
    assert abs(counted.sum() / expected.sum() - 1) < 0.02


def test_cavity_modal_density_is_derivative_of_count() -> None:
    v, s, ell = 50.0, 82.0, 36.0
    f = np.array([50.0, 200.0, 1000.0])
    h = 1e-3
    num = (ac.cavity_mode_count(f + h, v, s, ell, C0) - ac.cavity_mode_count(f - h, v, s, ell, C0)) / (
        2 * h
    )
    np.testing.assert_allclose(ac.cavity_modal_density(f, v, s, ell, C0), num, rtol=1e-6)


@pytest.mark.regression
def test_box_exact_counts_regression() -> None:
    # exact counts 12 / 64 / 401 computed by hand outside the code (not published)
    f_modes = _box_mode_frequencies(*BOX, C0, 1100.0)
    counts = [np.count_nonzero(f_modes <= f) for f in (250.0, 500.0, 1000.0)]
    assert counts == [12, 64, 401]


@pytest.mark.regression
def test_cavity_regression_values() -> None:
    # computed by hand outside the code (Bies & Hansen 2009, Engineering Noise Control,
    # sec. 7.3.1, not published): n(f) at 250 / 1000 Hz for the 2 x 1.5 x 1 m box
    v, s, ell = ac.rectangular_cavity_geometry(*BOX)
    assert ac.cavity_modal_density(250.0, v, s, ell, C0) == pytest.approx(0.1083, rel=2e-3)
    assert ac.cavity_modal_density(1000.0, v, s, ell, C0) == pytest.approx(1.1143, rel=1e-3)


def test_duct_modal_density_vs_exact_count() -> None:
    # rigid-ended tube: f_n = n c / (2L) (Kinsler et al., sec. 10.x; plane-wave modes)
    length = 4.0
    fn = np.arange(1, 200) * C0 / (2 * length)
    count = np.count_nonzero((fn >= 500) & (fn < 2000))
    assert abs(count - float(ac.duct_modal_density(1000.0, length, C0)) * 1500) <= 1.0
    assert ac.duct_modal_density(np.ones((2, 3)), length, C0).shape == (2, 3)


def test_duct_cut_on_rectangular_vs_enumeration() -> None:
    # lowest nonzero cross mode f_mn = (c/2) sqrt((m/w)^2 + (n/h)^2)
    w, h = 0.3, 0.2
    m, n = np.meshgrid(np.arange(5), np.arange(5), indexing="ij")
    f = C0 / 2 * np.sqrt((m / w) ** 2 + (n / h) ** 2)
    assert ac.duct_cut_on_frequency_rectangular(w, h, C0) == pytest.approx(f[f > 0].min())
    assert ac.duct_cut_on_frequency_rectangular(h, w, C0) == pytest.approx(f[f > 0].min())


def test_duct_cut_on_circular_vs_bessel_root() -> None:
    # independent: first root of J1'(x) found numerically with scipy (Kinsler et al. 9.3)
    x11 = optimize.brentq(lambda x: special.jvp(1, x), 1.0, 3.0, xtol=1e-12)
    d = 0.1
    assert ac.duct_cut_on_frequency_circular(d, C0) == pytest.approx(x11 * C0 / (np.pi * d), rel=1e-5)


def test_characteristic_impedance_of_air() -> None:
    # rho0 c0 = 1.21 * 343 = 415 Pa s/m, the project's default air (seatool.physics.air)
    assert ac.characteristic_impedance(1.21, 343.0) == pytest.approx(415.03)
    # Kinsler et al. (2000) Table A10: air at 20 C and 1 atm, rho c = 415 Pa s/m with
    # rho = 1.21 (from memory); the dry ideal-gas value is 0.4 % lower
    z = ac.characteristic_impedance(air.air_density(20.0), air.air_sound_speed(20.0))
    assert z == pytest.approx(415.0, rel=6e-3)


@pytest.mark.parametrize(
    ("call", "name"),
    [
        (lambda: air.air_sound_speed(-300.0), "temperature_C"),
        (lambda: air.air_density(20.0, -1.0), "pressure_Pa"),
        (lambda: ac.cavity_modal_density(100.0, -1.0, 1.0, 1.0, C0), "volume"),
        (lambda: ac.cavity_modal_density(100.0, 1.0, 1.0, 1.0, C0, terms="x"), "terms"),  # type: ignore[arg-type]
        (lambda: ac.duct_cut_on_frequency_circular(0.0, C0), "diameter"),
    ],
)
def test_invalid_input(call, name: str) -> None:  # type: ignore[no-untyped-def]
    with pytest.raises(ValueError, match=name):
        call()
