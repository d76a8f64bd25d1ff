"""Tests of seatool.physics.validity."""

from __future__ import annotations

import numpy as np
import pytest

from seatool.physics import acoustic as ac
from seatool.physics import elastic, plates
from seatool.physics import validity as va


def test_per_rad_conversion_is_two_pi() -> None:
    n_f = np.array([0.3, 1.0])
    np.testing.assert_allclose(va.modal_density_per_rad(n_f), n_f / (2 * np.pi))
    np.testing.assert_allclose(va.modal_density_per_hz(va.modal_density_per_rad(n_f)), n_f)


def test_modal_overlap_same_in_hz_and_rad() -> None:
    # M = eta f n(f) = eta omega n(omega)
    f, n_f, eta = 500.0, 0.4, 0.02
    m = va.modal_overlap(f, n_f, eta)
    assert m == pytest.approx(eta * 2 * np.pi * f * va.modal_density_per_rad(n_f))


@pytest.mark.regression
def test_plate_validity_table_regression() -> None:
    # computed by hand outside the code (not published): steel 1 mm, 1 m^2, eta = 0.01
    d = plates.bending_stiffness(210e9, 1e-3, 0.3)
    n = plates.plate_bending_modal_density(100.0, 1.0, d, 7.85)
    bw = (10 ** (1 / 20) - 10 ** (-1 / 20)) * 100.0
    assert va.modes_in_band(n, bw) == pytest.approx(7.37, rel=2e-3)
    assert va.modal_overlap(1000.0, n, 0.01) == pytest.approx(3.19, rel=2e-3)


def test_modal_overlap_at_schroeder_frequency() -> None:
    # Schroeder (1962): above f_S = 2000 sqrt(T60 / V) room modes overlap (about 3 modes
    # per half-power bandwidth; the constant 2000 is rounded, from memory). With
    # eta = 2.2 / (f T60) (ln(10^6)/(2 pi); Lyon & DeJong 1995) and the volume term of the
    # cavity modal density, M should be close to 3 at f_S.
    for t60, v in ((1.0, 200.0), (0.5, 50.0), (2.0, 2000.0)):
        f_s = 2000.0 * np.sqrt(t60 / v)
        n = ac.cavity_modal_density(f_s, v, 1.0, 1.0, 343.0, terms="volume")
        eta = np.log(1e6) / (2 * np.pi * f_s * t60)
        assert va.modal_overlap(f_s, n, eta) == pytest.approx(3.0, rel=0.10)


def test_relative_variance_large_overlap_limit() -> None:
    # Langley & Brown (2004a), GOE: r^2 -> (alpha - 1) / (pi m) + 1 / (pi m)^2 at large m
    # (the Monte Carlo checks over m = 0.3-10 are in test_variance.py)
    m = np.array([50.0, 200.0])
    np.testing.assert_allclose(
        va.relative_variance_goe(m, alpha=2.25), 1.25 / (np.pi * m), rtol=1 / (np.pi * 50)
    )


def test_level_spread_db_vs_lognormal_sampling() -> None:
    # independent: sample a log-normal energy with relative variance r2 and take the
    # standard deviation of 10 lg E
    rng = np.random.default_rng(5)
    r2 = 0.7
    s2 = np.log1p(r2)
    e = rng.lognormal(mean=0.0, sigma=np.sqrt(s2), size=400_000)
    assert e.var() / e.mean() ** 2 == pytest.approx(r2, rel=0.05)
    assert va.level_spread_db(r2) == pytest.approx(np.std(10 * np.log10(e)), rel=0.01)


def test_thin_plate_upper_frequency_gives_six_thicknesses_per_wavelength() -> None:
    h, e, rho, nu = 0.01, 210e9, 7850.0, 0.3
    cl = elastic.plate_longitudinal_speed(e, rho, nu)
    f_max = va.thin_plate_upper_frequency(h, cl)
    d = plates.bending_stiffness(e, h, nu)
    lam = plates.plate_bending_phase_speed(f_max, d, rho * h) / f_max
    assert lam == pytest.approx(6 * h, rel=1e-12)
    assert f_max == pytest.approx(0.0504 * cl / h, rel=1e-3)  # lambda_B = 6 h (common practice)


def test_assess_bands_flags_and_messages() -> None:
    f = np.array([50.0, 200.0, 1000.0, 4000.0])
    bw = 0.2316 * f
    n = np.array([0.02, 0.05, 0.1, 0.1])
    res = va.assess_bands(f, n, bw, 0.005)
    np.testing.assert_allclose(res.modes_in_band, n * bw)
    np.testing.assert_allclose(res.modal_overlap, 0.005 * f * n)
    assert res.very_few_modes.tolist() == [True, False, False, False]
    assert res.few_modes.tolist() == [True, True, False, False]
    assert res.low_overlap.tolist() == [True, True, True, False]
    assert res.ok.tolist() == [False, False, False, True]
    assert np.all(np.diff(res.level_std_db) < 0)  # more overlap, less spread
    msgs = res.messages()
    assert len(msgs) == 4
    assert msgs[0].startswith("50 Hz: 0.232 modes per band")
    assert "fewer than one mode" in msgs[0] and "or worse" in msgs[0]
    assert "too few modes" in msgs[1]
    assert "SEA conditions met" in msgs[3] and "or worse" not in msgs[3]


def test_validity_message_format() -> None:
    r2 = va.relative_variance_goe(0.13)
    std = float(va.level_spread_db(r2))
    msg = va.validity_message(1.3, 0.13, std)
    assert msg.startswith("1.3 modes per band, modal overlap 0.13: too few modes")
    assert f"+-{std:.1f} dB or worse" in msg


@pytest.mark.parametrize(
    ("call", "name"),
    [
        (lambda: va.modes_in_band(-1.0, 10.0), "modal_density"),
        (lambda: va.modes_in_band(1.0, 0.0), "bandwidth"),
        (lambda: va.modal_overlap(100.0, 1.0, -0.01), "loss_factor"),
        (lambda: va.relative_variance_goe(0.0), "modal_overlap"),
        (lambda: va.level_spread_db(-1.0), "relative_variance"),
    ],
)
def test_invalid_input(call, name: str) -> None:  # type: ignore[no-untyped-def]
    with pytest.raises(ValueError, match=name):
        call()
