"""Tests of seatool.physics.beams against independent methods and published tables."""

from __future__ import annotations

import numpy as np
import pytest
from scipy import integrate

from seatool.physics import beams, elastic

# steel: typical handbook values (Cremer, Heckl & Petersson 2005, Structure-Borne Sound, 3rd ed. Table 3.1; from memory)
E_ST, RHO_ST, NU_ST = 210e9, 7850.0, 0.30


def third_octave_bands(k_lo: int, k_hi: int) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Exact base-10 1/3-octave mid-band frequencies 10^(k/10) and edges (IEC 61260-1)."""
    k = np.arange(k_lo, k_hi + 1)
    fm = 10.0 ** (k / 10.0)
    return fm, fm * 10.0**-0.05, fm * 10.0**0.05


# ---------------------------------------------------------------------------------------
# beams
# ---------------------------------------------------------------------------------------
def test_beam_bending_modal_density_vs_exact_ss_beam_count() -> None:
    # Independent: SS Euler-Bernoulli beam, f_n = (pi/2) (n/L)^2 sqrt(EI/m')
    # (Cremer, Heckl & Petersson; Blevins 1979, Formulas for Natural Frequency, Table 8-1)
    sec = beams.rectangular_section(0.02, 0.01)
    length = 6.0
    mprime = RHO_ST * sec.area
    for i in (sec.second_moment_y, sec.second_moment_z):
        fn = np.pi / 2 * (np.arange(1, 3000) / length) ** 2 * np.sqrt(E_ST * i / mprime)
        fm, lo, hi = third_octave_bands(27, 37)
        counted = np.array([np.count_nonzero((fn >= x) & (fn < y)) for x, y in zip(lo, hi, strict=True)])
        expected = np.array(
            [
                integrate.quad(
                    lambda f, i=i: float(beams.beam_bending_modal_density(f, length, E_ST, i, mprime)),
                    x,
                    y,
                )[0]
                for x, y in zip(lo, hi, strict=True)
            ]
        )
        # 1-D counts are exact up to +-1 mode
        assert np.all(np.abs(counted - expected) <= 1.0)
        assert np.abs(counted.sum() - expected.sum()) <= 1.0


@pytest.mark.regression
def test_beam_regression_values() -> None:
    # computed by hand outside the code (not published): steel, h = 10 mm (bending in the thickness), L = 1 m
    sec = beams.rectangular_section(0.05, 0.01)
    m = RHO_ST * sec.area
    assert beams.beam_bending_phase_speed(100.0, E_ST, sec.second_moment_y, m) == pytest.approx(
        96.86, rel=1e-3
    )
    assert beams.beam_bending_modal_density(1000.0, 1.0, E_ST, sec.second_moment_y, m) == (
        pytest.approx(3.26e-3, rel=2e-3)
    )


def test_rod_and_torsion_modal_density_vs_exact_count() -> None:
    # free-free rod: f_n = n c / (2L) (Blevins 1979 Table 8-16, from memory); same for torsion
    length = 3.0
    sec = beams.circular_section(0.04, 0.03)
    g = E_ST / (2 * (1 + NU_ST))
    c_t = beams.torsion_speed(g, sec.torsion_constant, RHO_ST, sec.polar_moment)
    assert c_t == pytest.approx(np.sqrt(g / RHO_ST), rel=1e-12)  # circular: J = I_p
    c_l = elastic.bar_longitudinal_speed(E_ST, RHO_ST)
    for c, func in ((c_l, beams.longitudinal_modal_density), (c_t, beams.torsion_modal_density)):
        fn = np.arange(1, 400) * c / (2 * length)
        count = np.count_nonzero((fn >= 5000) & (fn < 20000))
        assert abs(count - float(func(10000.0, length, c)) * 15000) <= 1.0


@pytest.mark.parametrize(
    ("aspect", "beta"),
    # Timoshenko & Goodier (1951) Theory of Elasticity, table in sec. 93, J = beta a t^3
    # (from memory)
    [(1.0, 0.141), (1.5, 0.196), (2.0, 0.229), (3.0, 0.263), (5.0, 0.291), (10.0, 0.312)],
)
def test_rectangular_torsion_constant_timoshenko_table(aspect: float, beta: float) -> None:
    t = 0.01
    sec = beams.rectangular_section(aspect * t, t)
    assert sec.torsion_constant / (aspect * t * t**3) == pytest.approx(beta, abs=1.5e-3)


def test_torsion_speed_rectangular_below_shear_speed() -> None:
    sec = beams.rectangular_section(0.05, 0.01)
    g = E_ST / (2 * (1 + NU_ST))
    c_t = beams.torsion_speed(g, sec.torsion_constant, RHO_ST, sec.polar_moment)
    assert c_t < np.sqrt(g / RHO_ST)
