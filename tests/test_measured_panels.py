"""`seatool panel` against published laboratory measurements of single panels.

Every published value here is from memory (the source named beside it could not be re-read);
the tolerances state the reproducibility of laboratory ratings (ISO 12999-1:2020 gives a
standard uncertainty of about 1 - 1.5 dB for Rw under reproducibility conditions, from
memory) plus the spread of the published values. Findings are in docs/validation.md
("Measured") and docs/theory/subsystems.md ("Installed damping").
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from seatool.analysis.panel import PanelSpec, panel_table
from seatool.analysis.rating import Rating, rating_of_bands
from seatool.bands import BandAxis
from seatool.materials import load_fluids, load_materials
from seatool.physics import radiation
from seatool.physics.radiation_modal import modal_radiation_efficiency_wallace

MATERIALS = load_materials()
AIR = load_fluids()["air"]
BANDS = BandAxis.from_range(100, 5000)
#: ISO 10140-1 test opening for windows and glazing: 1.25 m x 1.5 m (from memory).
WINDOW = (1.25, 1.5)


def _panel(name: str, h: float, size: tuple[float, float], **kw) -> tuple[np.ndarray, Rating]:
    mat = MATERIALS[name]
    eta = kw.pop("loss_factor", mat.loss_factor)
    spec = PanelSpec(mat, h, size[0], size[1], eta, AIR, **kw)
    r = panel_table(spec, BANDS)["transmission_loss_sea_dB"].to_numpy()
    rating = rating_of_bands(BANDS, r)
    assert rating is not None
    return r, rating


@pytest.mark.measured
@pytest.mark.parametrize("eta", [0.015, 0.02, 0.03])
def test_float_glass_6mm_rating_with_installed_glazing_damping(eta):
    # Published: 6 mm float glass Rw (C; Ctr) = 31 (-2; -3) dB (EN 12758:2019, table of
    # monolithic glass; Quirt 1982, J. Acoust. Soc. Am. 72(3), 834-844, measured
    # 6 mm glass in the NRC laboratory at STC 31; both from memory). With the loss factor of
    # glass as glazed (putty or gaskets: about 0.01 - 0.05, common practice, from memory)
    # stated, the prediction rates within 1 dB, and C and Ctr within 1 dB.
    _, got = _panel("glass", 0.006, WINDOW, loss_factor=eta, mounting="stated")
    assert abs(got.rw - 31) <= 1, got
    assert abs(got.c - -2) <= 1 and abs(got.ctr - -3) <= 1, got


@pytest.mark.measured
def test_float_glass_6mm_rating_with_absorbing_edges():
    # The same published Rw 31 dB with the edge-absorption form (EN ISO 12354-1 Annex C in
    # situ): glazing edges absorbing 30 - 50 % of the bending-wave power (an assumption
    # that the literature does not give; see docs/theory/subsystems.md) rate within 1 dB.
    for alpha in (0.3, 0.5):
        _, got = _panel("glass", 0.006, WINDOW, mounting="edges", edge_absorption=alpha)
        assert abs(got.rw - 31) <= 1, (alpha, got)


#: Laboratory transmission loss of 6 mm (1/4 in) monolithic glass in the octave bands
#: 125 Hz - 4 kHz [dB], STC 31, as tabulated in architectural-acoustics texts (e.g. Long 2006,
#: Architectural Acoustics, ch. 9; from memory, the table was not re-read).
GLASS_6MM_OCTAVES = np.array([25.0, 29.0, 33.0, 36.0, 26.0, 35.0])


def _octaves(r_third: np.ndarray) -> np.ndarray:
    """Octave-band R from the third-octave R of BANDS (100 Hz - 5 kHz) by averaging tau."""
    tau = 10 ** (-r_third / 10)
    return -10 * np.log10(tau[: 3 * 6].reshape(6, 3).mean(axis=1))


@pytest.mark.measured
@pytest.mark.parametrize("eta", [0.02, 0.03])
def test_float_glass_6mm_octave_spectrum_with_installed_glazing_damping(eta):
    # The band shape, not only the single number: with a mounted loss factor of 0.02 - 0.03
    # every octave lies within 4 dB of the remembered laboratory spectrum (found -3.4 ...
    # +1.4 dB; the coincidence octave 2 kHz within 1.4 dB and 4 kHz within 2 dB). The
    # tolerance: the recall uncertainty of the table plus the spread between laboratories
    # of octave-band R of glazing, larger at low frequencies where the size of the test
    # opening matters (a few dB, from memory). With the default laboratory mounting the
    # 2 kHz and 4 kHz octaves are 4.5 and 8.3 dB low (docs/theory/subsystems.md, sec. 11).
    r, _ = _panel("glass", 0.006, WINDOW, loss_factor=eta, mounting="stated")
    dev = _octaves(r) - GLASS_6MM_OCTAVES
    assert np.all(np.abs(dev) <= 4.0), np.round(dev, 1)


@pytest.mark.measured
def test_float_glass_6mm_rating_with_its_glazing_seal():
    # The same published Rw 31 (-2; -3) dB, now with the losses of the glazing's mounting
    # predicted rather than stated: the pane held by an EPDM gasket on each face (the
    # documented default seal, 5 MPa, loss factor 0.2, 10 mm x 4 mm: typical values chosen
    # before this comparison, common practice, from memory), its edge absorption from the
    # bending-wave reflection at a lossy elastic edge (seatool.physics.edge_mounting).
    # Found 31 (-3; -2). Across the plausible seal range (2 - 10 MPa, 0.1 - 0.5, 5 - 15 mm,
    # 2 - 6 mm) the rating spans 28 - 32 (docs/theory/subsystems.md, section 11). This is
    # the default mounting of glazing (no mounting given).
    _, got = _panel("glass", 0.006, WINDOW)
    assert abs(got.rw - 31) <= 1, got
    assert abs(got.c - -2) <= 1 and abs(got.ctr - -3) <= 1, got


@pytest.mark.measured
def test_float_glass_6mm_octave_spectrum_with_its_glazing_seal():
    # The band shape with the default glazing seal against the remembered laboratory
    # spectrum (tolerance as for the stated loss factors above, 4 dB): the octaves 125 Hz -
    # 2 kHz lie within it (found -3.9, -3.7, -2.9, -1.0, -0.1 dB), the coincidence octave
    # 2 kHz within 1 dB (the laboratory mounting: -4.5 dB). The 4 kHz octave is outside
    # (-4.8 dB, the laboratory mounting -8.3): the seal's absorption falls above its
    # matching frequency (diffuse 0.48 at 2 kHz, 0.22 at 5 kHz); kept visible by the
    # regression test below.
    r, _ = _panel("glass", 0.006, WINDOW, mounting="sealed")
    dev = _octaves(r) - GLASS_6MM_OCTAVES
    assert np.all(np.abs(dev[:5]) <= 4.0), np.round(dev, 1)
    assert abs(dev[4]) <= 1.0, np.round(dev, 1)


@pytest.mark.regression
def test_float_glass_with_its_glazing_seal_is_low_at_4_khz():
    # Known shortfall with the default seal: the 4 kHz octave is 4.8 dB below the
    # remembered laboratory spectrum (8.3 dB with the laboratory mounting).
    r, _ = _panel("glass", 0.006, WINDOW, mounting="sealed")
    dev = _octaves(r) - GLASS_6MM_OCTAVES
    assert dev[5] == pytest.approx(-4.8, abs=0.2), np.round(dev, 1)


@pytest.mark.regression
def test_gypsum_board_dip_is_not_explained_by_an_edge_seal():
    # Known shortfall: the same glazing seal on 12.5 mm gypsum board (3 m x 3.3 m) raises
    # the 3.15 kHz band from 20.1 to 21.0 dB (20.2 - 21.9 across the plausible seal range),
    # against about 25 - 28 dB measured on single boards (from memory): an edge seal does
    # not supply the 0.07 - 0.15 loss factor the dip would need (the seal gives 0.02).
    r, got = _panel("gypsum_board", 0.0125, (3.0, 3.3), mounting="sealed")
    at = list(BANDS.nominal).index(3150)
    assert r[at] == pytest.approx(21.0, abs=0.2), r[at]
    assert got.rw == 29, got


@pytest.mark.regression
def test_float_glass_in_the_laboratory_opening_alone_rates_below_the_measurement():
    # Known shortfall, kept visible: without its seal (internal 0.001 plus the
    # laboratory-opening term of EN ISO 12354-1 Annex C, made for heavy walls) glass rates
    # Rw 27, 4 dB below the published 31 dB: the damping of the glazing's mounting is
    # missing (docs/validation.md, "Measured"); the sealed mounting, the default for glazing,
    # supplies it (above). Before the installed damping it was 26.
    _, got = _panel("glass", 0.006, WINDOW, mounting="laboratory")
    assert got.rw == 27, got


@pytest.mark.measured
def test_gypsum_board_12_5mm_rating():
    # Published: one layer of 12.5 mm gypsum board, Rw about 28 - 29 dB (manufacturers'
    # laboratory data and NRC measurements of single gypsum board, e.g. Warnock & Quirt,
    # from memory). Default mounting, laboratory-size partition 3 m x 3.3 m; within 2 dB.
    _, got = _panel("gypsum_board", 0.0125, (3.0, 3.3))
    assert 26 <= got.rw <= 31, got


@pytest.mark.measured
@pytest.mark.parametrize("h", [0.001, 0.0015, 0.002])
def test_steel_sheet_follows_the_empirical_mass_law(h):
    # Sharp (1978), "Prediction methods for the sound transmission of building elements",
    # Noise Control Eng. 11, 53-63: R = 20 lg(m'' f) - 47 dB below f_c/2, an empirical fit
    # to laboratory measurements of single panels (from memory). Steel sheet 1 - 2 mm in
    # the window opening, 125 Hz up to f_c/3: within -3 ... +4.5 dB (the finite panel
    # transmits less than the infinite-panel law at the lowest bands, Sewell 1970, J. Sound
    # Vib. 12(1), 21-32, from memory).
    r, _ = _panel("steel", h, WINDOW)
    mat = MATERIALS["steel"]
    m = mat.density * h
    d = mat.youngs_modulus * h**3 / (12 * (1 - mat.poisson_ratio**2))
    f_c = AIR.sound_speed**2 / (2 * math.pi) * math.sqrt(m / d)
    f = BANDS.centre
    keep = (f > 110) & (f < f_c / 3)
    dev = r[keep] - (20 * np.log10(m * f[keep]) - 47)
    assert np.all((dev > -3.0) & (dev < 4.5)), np.round(dev, 1)


def test_radiation_efficiency_near_coincidence_is_the_modal_average():
    # Is the deep dip of light panels caused by an over-estimated radiation efficiency near
    # coincidence? Independent check: the equal-weight average over the modes resonant in
    # the band (SEA equipartition) of Wallace's (1972) modal radiation efficiency, for the
    # 6 mm glass pane in the band just above f_c = 2.1 kHz, where it is largest. The
    # band-averaged formula agrees within 6 % (found 2.44 vs 2.56; in the band holding f_c
    # 1.82 vs 1.91, 1.74 vs 1.73 at 3.15 kHz): it is not the cause.
    mat = MATERIALS["glass"]
    h, (a, b) = 0.006, WINDOW
    m = mat.density * h
    d = mat.youngs_modulus * h**3 / (12 * (1 - mat.poisson_ratio**2))
    c0 = AIR.sound_speed
    f_c = c0**2 / (2 * math.pi) * math.sqrt(m / d)
    axis = BandAxis.from_range(2500, 2500)
    for centre, lo, hi in zip(axis.centre, axis.lower, axis.upper, strict=True):
        modal = []
        for p in range(1, 80):
            for q in range(1, 80):
                f_pq = math.pi / 2 * math.sqrt(d / m) * ((p / a) ** 2 + (q / b) ** 2)
                if lo <= f_pq < hi:
                    modal.append(modal_radiation_efficiency_wallace(f_pq, p, q, a, b, c0=c0))
        band = radiation.radiation_efficiency_band(
            centre, a, b, f_c, f_lower=lo, f_upper=hi, c0=c0
        )
        assert len(modal) > 40
        assert float(band) == pytest.approx(np.mean(modal), rel=0.06)
