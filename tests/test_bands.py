"""Bands (IEC 61260-1:2014) and A-weighting (IEC 61672-1:2013)."""

from __future__ import annotations

import numpy as np
import pytest

from seatool.bands import BandAxis, BandError, a_weighting, band_index, exact_mid_frequency

# Nominal 1/3-octave centres 20 Hz - 20 kHz (IEC 61260-1:2014 Annex E / ISO 266) and the
# A-weighting at those bands from IEC 61672-1:2013 Table 3 (values rounded to 0.1 dB).
NOMINAL = [
    20,
    25,
    31.5,
    40,
    50,
    63,
    80,
    100,
    125,
    160,
    200,
    250,
    315,
    400,
    500,
    630,
    800,
    1000,
    1250,
    1600,
    2000,
    2500,
    3150,
    4000,
    5000,
    6300,
    8000,
    10000,
    12500,
    16000,
    20000,
]
A_TABLE = [
    -50.5,
    -44.7,
    -39.4,
    -34.6,
    -30.2,
    -26.2,
    -22.5,
    -19.1,
    -16.1,
    -13.4,
    -10.9,
    -8.6,
    -6.6,
    -4.8,
    -3.2,
    -1.9,
    -0.8,
    0.0,
    0.6,
    1.0,
    1.2,
    1.3,
    1.2,
    1.0,
    0.5,
    -0.1,
    -1.1,
    -2.5,
    -4.3,
    -6.6,
    -9.3,
]


def test_iec61260_exact_mid_band_spot_values():
    # IEC 61260-1 base-10 exact mid-band frequencies (values quoted from the standard's
    # predecessor IEC 1260:1995, as quoted in secondary sources; from memory).
    f = exact_mid_frequency([-2, -1, 0, 1, 2])
    # Compare to the printed precision of each quoted value (half a unit of the last digit).
    quoted = np.array([630.96, 794.33, 1000.0, 1258.9, 1584.9])
    half_digit = np.array([0.005, 0.005, 0.005, 0.05, 0.05])
    assert np.all(np.abs(f - quoted) <= half_digit)


def test_full_axis_nominal_labels_and_edges():
    ax = BandAxis.from_range(20, 20000)
    assert len(ax) == 31
    assert list(ax.nominal) == [float(x) for x in NOMINAL]
    # Band edges f1,2 = f_m G^(-+1/6) (IEC 61260-1:2014 eqs. 5-6): 1 kHz band 891.25 - 1122.02 Hz.
    k = list(ax.nominal).index(1000.0)
    assert ax.lower[k] == pytest.approx(891.2509, abs=1e-4)
    assert ax.upper[k] == pytest.approx(1122.0185, abs=1e-4)
    # Contiguous: each upper edge is the next lower edge.
    np.testing.assert_allclose(ax.upper[:-1], ax.lower[1:], rtol=1e-14)
    # Relative bandwidth of a base-10 third octave: 10^0.05 - 10^-0.05 = 0.230768.
    np.testing.assert_allclose(ax.width / ax.centre, 0.230768, rtol=0, atol=5e-7)


def test_octave_bands():
    ax = BandAxis.from_range(31.5, 16000, "octave")
    assert list(ax.nominal) == [31.5, 63, 125, 250, 500, 1000, 2000, 4000, 8000, 16000]
    np.testing.assert_allclose(ax.upper / ax.lower, 10**0.3, rtol=1e-12)


def test_band_index_accepts_nominal_and_exact():
    assert band_index(31.5) == -15
    assert band_index(31.6228) == -15
    with pytest.raises(BandError):
        band_index(1100.0)


def test_empty_range_refused():
    with pytest.raises(BandError, match="empty band range"):
        BandAxis.from_range(1000, 500)


def test_axes_compare_by_bands():
    assert BandAxis.from_range(100, 1000) == BandAxis.from_range(100, 1000)
    assert BandAxis.from_range(100, 1000) != BandAxis.from_range(100, 1250)


def test_a_weighting_iec61672_table3():
    # IEC 61672-1:2013 Table 3; table values are the formula rounded to 0.1 dB at the exact
    # base-10 frequencies, so allow half a rounding step. 160 Hz (-13.350) sits on the
    # rounding boundary, hence 0.051 rather than 0.050.
    f = exact_mid_frequency(np.arange(-17, 14))
    np.testing.assert_allclose(a_weighting(f), A_TABLE, atol=0.051)


def test_a_weighting_normalised_at_1khz():
    # IEC 61672-1:2013 Annex E: A(1 kHz) = 0 dB (to the rounding of A1000 = -2.000 dB).
    assert abs(float(a_weighting(1000.0))) < 0.001
