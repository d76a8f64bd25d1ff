"""Metrics of band levels: C-weighting, weighted totals, octave levels, SIL, loudness."""

from __future__ import annotations

import numpy as np
import pytest

from seatool.bands import BandAxis, c_weighting, exact_mid_frequency
from seatool.loudness import zwicker_loudness
from seatool.metrics import (
    METRICS,
    octave_levels,
    speech_interference_level,
    weighted_level,
    zwicker_loudness_level,
    zwicker_loudness_metric,
)

# IEC 61672-1:2013 Table 3: C-weighting at the 1/3-octave bands 10 Hz - 20 kHz (nominal
# values rounded to 0.1 dB).
C_TABLE = [
    -14.3, -11.2, -8.5, -6.2, -4.4, -3.0, -2.0, -1.3, -0.8, -0.5, -0.3, -0.2, -0.1,
    0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, -0.1, -0.2, -0.3, -0.5, -0.8, -1.3,
    -2.0, -3.0, -4.4, -6.2, -8.5, -11.2,
]  # fmt: skip


def test_c_weighting_iec61672_table3():
    # IEC 61672-1:2013 Table 3 at the exact base-10 frequencies 10 Hz - 20 kHz; the table is
    # the formula rounded to 0.1 dB, so half a step (12.5 Hz: -11.25 sits on the boundary).
    f = exact_mid_frequency(np.arange(-20, 14))
    np.testing.assert_allclose(c_weighting(f), C_TABLE, atol=0.051)
    # IEC 61672-1:2013 Annex E: C(1 kHz) = 0 dB to the rounding of C1000 = -0.062 dB.
    assert abs(float(c_weighting(1000.0))) < 0.001


FULL = BandAxis.from_range(25, 12500)


def _fd_gradient(fun, lv: np.ndarray, h: float = 1e-4) -> np.ndarray:
    eye = np.eye(lv.shape[-1]) * h
    return (fun(lv + eye) - fun(lv - eye)) / (2 * h)


def test_weighted_totals_of_a_flat_spectrum():
    # Hand sum (common practice): 28 bands at 60 dB -> 60 + 10 lg 28 = 74.47 dB; with the
    # IEC 61672-1 Table 3 weightings rounded to 0.1 dB the A and C totals are within 0.05 dB
    # of 60 + 10 lg sum 10^(W/10) computed from the table values.
    a_table_25_12500 = [
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
    ]  # fmt: skip  (IEC 61672-1:2013 Table 3)
    c_table = C_TABLE[4:32]
    lv = np.full(28, 60.0)
    assert float(weighted_level(lv, FULL, "Z").value) == pytest.approx(60 + 10 * np.log10(28))
    for w, table in (("A", a_table_25_12500), ("C", c_table)):
        expect = 60 + 10 * np.log10(np.sum(10 ** (np.array(table) / 10)))
        assert float(weighted_level(lv, FULL, w).value) == pytest.approx(expect, abs=0.05)


@pytest.mark.parametrize("weighting", ["Z", "A", "C"])
def test_weighted_total_gradient_matches_differences(weighting):
    # Independent numerical method: central differences of the total itself.
    rng = np.random.default_rng(1)
    lv = rng.uniform(30, 90, size=28)
    m = weighted_level(lv, FULL, weighting)
    fd = _fd_gradient(lambda x: weighted_level(x, FULL, weighting).value, lv)
    np.testing.assert_allclose(m.gradient, fd, rtol=1e-6, atol=1e-7)
    assert float(np.sum(m.gradient)) == pytest.approx(1.0)  # raising every band by 1 dB


def test_octave_levels_from_thirds():
    # Energetic sum (IEC 61260-1 band indices: octave 1 kHz holds 800, 1000, 1250 Hz):
    # three bands of 60 dB make 60 + 10 lg 3 = 64.77 dB.
    bands = BandAxis.from_range(400, 5000)
    nominal, octv, grad, notes = octave_levels(np.full(len(bands), 60.0), bands)
    np.testing.assert_array_equal(nominal, [500, 1000, 2000, 4000])
    np.testing.assert_allclose(octv, 60 + 10 * np.log10(3))
    np.testing.assert_allclose(grad.sum(axis=-1), 1.0)
    assert notes == ()
    # 400 Hz - 4 kHz: the 4 kHz octave lacks its 5 kHz band.
    bands = BandAxis.from_range(400, 4000)
    _, octv, _, notes = octave_levels(np.full(len(bands), 60.0), bands)
    assert octv[-1] == pytest.approx(60 + 10 * np.log10(2))
    assert len(notes) == 1
    assert "octave 4 kHz" in notes[0]
    assert "band(s) 5 kHz are outside" in notes[0]
    assert "sums 3.15 kHz, 4 kHz only" in notes[0]


def test_sil_worked_example():
    # Worked by hand from the ISO 9921:2003 definition (mean of the octave levels at 0.5,
    # 1, 2, 4 kHz): the three 1/3-octave bands of each octave at 60, 55, 50, 45 dB make
    # octaves of 60/55/50/45 + 10 lg 3, so SIL = 52.5 + 4.7712 = 57.2712 dB.
    bands = BandAxis.from_range(400, 5000)
    lv = np.repeat([60.0, 55.0, 50.0, 45.0], 3)
    sil = speech_interference_level(lv, bands)
    assert float(sil.value) == pytest.approx(57.2712, abs=1e-4)
    assert sil.notes == ()
    # Bands outside the four octaves do not count.
    wide = BandAxis.from_range(100, 10000)
    lv_wide = np.full(len(wide), 90.0)
    lv_wide[wide.position([400.0])[0] : wide.position([5000.0])[0] + 1] = lv
    assert float(speech_interference_level(lv_wide, wide).value) == pytest.approx(57.2712)
    # Octave input gives the same mean directly.
    octave = BandAxis.from_range(500, 4000, "octave")
    assert float(speech_interference_level([64.0, 58.0, 52.0, 46.0], octave).value) == 55.0


def test_sil_gradient_and_missing_octave():
    rng = np.random.default_rng(2)
    lv = rng.uniform(30, 90, size=28)
    sil = speech_interference_level(lv, FULL)
    fd = _fd_gradient(lambda x: speech_interference_level(x, FULL).value, lv)
    np.testing.assert_allclose(sil.gradient, fd, rtol=1e-6, atol=1e-7)
    assert float(np.sum(sil.gradient)) == pytest.approx(1.0)
    short = BandAxis.from_range(100, 2500)
    out = speech_interference_level(np.full(len(short), 50.0), short)
    assert np.isnan(out.value)
    assert "4 kHz" in out.notes[0]
    assert "not formed" in out.notes[0]


def test_loudness_metric_on_a_shorter_band_range():
    # A model with bands 50 Hz - 8 kHz: the loudness takes the missing bands 25 - 40 Hz and
    # 10 - 12.5 kHz as silent and says so; equal to the standard's procedure with those bands
    # at -inf (the module function, itself checked against mosqito and ISO 532-1).
    bands = BandAxis.from_range(50, 8000)
    rng = np.random.default_rng(3)
    lv = rng.uniform(40, 80, size=(2, len(bands)))
    m = zwicker_loudness_metric(lv, bands, field="diffuse")
    full = np.full((2, 28), -np.inf)
    full[:, 3:26] = lv
    n, d = zwicker_loudness(full, field="diffuse")
    np.testing.assert_allclose(m.value, n)
    np.testing.assert_allclose(m.gradient, d[:, 3:26])
    text = " ".join(m.notes)
    assert "25 Hz, 31.5 Hz, 40 Hz, 10 kHz, 12.5 kHz" in text
    assert "lower bound" in text
    assert "diffuse" in text
    # Bands beyond 12.5 kHz are named as unused and get zero gradient.
    wide = BandAxis.from_range(20, 16000)
    lw = np.full(len(wide), 60.0)
    mw = zwicker_loudness_metric(lw, wide)
    assert "20 Hz, 16 kHz" in " ".join(mw.notes)
    assert mw.gradient[0] == 0.0
    assert mw.gradient[-1] == 0.0


def test_loudness_level_metric_chain_rule():
    rng = np.random.default_rng(4)
    lv = rng.uniform(20, 70, size=28)
    m = zwicker_loudness_level(lv, FULL)
    fd = _fd_gradient(lambda x: zwicker_loudness_level(x, FULL).value, lv, h=1e-5)
    np.testing.assert_allclose(m.gradient, fd, rtol=1e-5, atol=1e-7)


def test_loudness_needs_third_octaves():
    octave = BandAxis.from_range(63, 8000, "octave")
    m = zwicker_loudness_metric(np.full(len(octave), 60.0), octave)
    assert np.isnan(m.value)
    assert "1/3-octave" in m.notes[0]


def test_loudness_notes_levels_beyond_the_tables():
    lv = np.full(28, 60.0)
    lv[2] = 125.0  # 40 Hz above the 120 dB of the tables
    m = zwicker_loudness_metric(lv, FULL)
    assert any("120 dB" in n for n in m.notes)


def test_registry_by_name():
    rng = np.random.default_rng(5)
    lv = rng.uniform(30, 80, size=(3, 28))
    for name, fun in METRICS.items():
        m = fun(lv, FULL, field="diffuse")
        assert m.name == name
        assert m.value.shape == (3,)
        assert m.gradient.shape == (3, 28)
        assert np.all(np.isfinite(m.value))
        assert m.reference
    with pytest.raises(ValueError, match="one per band"):
        METRICS["dBA"](np.zeros(5), FULL)
