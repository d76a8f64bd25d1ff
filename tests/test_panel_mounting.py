"""``seatool panel``: the installed loss factor (mounting) options and the ISO 717-1 line."""

from __future__ import annotations

import re

import numpy as np
import pandas as pd
import pytest

from seatool.analysis.panel import MOUNTING_NOTE, PanelSpec, installed_loss_factor
from seatool.cli import main
from seatool.materials import load_fluids, load_materials

GLASS = ["panel", "--material", "glass", "--thickness", "0.006", "--lx", "1.25", "--ly", "1.5"]


def _csv(tmp_path, capsys, *extra: str) -> pd.DataFrame:
    out = tmp_path / "p.csv"
    assert main([*GLASS, "--lowest", "100", "--highest", "3150", *extra, "--csv", str(out)]) == 0
    capsys.readouterr()
    return pd.read_csv(out, comment="#")


def test_default_is_the_laboratory_loss_factor(tmp_path, capsys):
    # EN ISO 12354-1 Annex C laboratory form, eta_int + m''/(485 sqrt(f)), for the material's
    # internal 0.001 and m'' = 15 kg/m^2: at 100 Hz 0.001 + 15/4850 = 0.004093
    t = _csv(tmp_path, capsys)
    f = t["band_exact_hz"].to_numpy()
    np.testing.assert_allclose(t["loss_factor"], 0.001 + 15.0 / (485.0 * np.sqrt(f)), rtol=1e-9)
    assert t["loss_factor"].iloc[0] == pytest.approx(0.004093, abs=1e-6)


def test_stated_loss_factor_is_used_as_given(tmp_path, capsys):
    t = _csv(tmp_path, capsys, "--loss-factor", "0.02")
    np.testing.assert_allclose(t["loss_factor"], 0.02)
    # more damping, less resonant transmission: every band at least as high as the default
    base = _csv(tmp_path, capsys)
    assert np.all(t["transmission_loss_sea_dB"] >= base["transmission_loss_sea_dB"] - 1e-9)


def test_edge_absorption_grows_with_alpha_and_falls_with_frequency(tmp_path, capsys):
    low = _csv(tmp_path, capsys, "--edge-absorption", "0.2")["loss_factor"].to_numpy()
    high = _csv(tmp_path, capsys, "--edge-absorption", "0.4")["loss_factor"].to_numpy()
    # eta_edge proportional to alpha and to 1/sqrt(f) (EN ISO 12354-1 Annex C)
    np.testing.assert_allclose(high - 0.001, 2 * (low - 0.001), rtol=1e-9)
    assert np.all(np.diff(low) < 0)


def test_rating_line_printed_only_with_the_rating_bands(capsys):
    assert main([*GLASS, "--lowest", "100", "--highest", "3150"]) == 0
    out = capsys.readouterr().out
    line = "single-number rating of the transmission loss (ISO 717-1): Rw (C; Ctr) = "
    assert re.search(re.escape(line) + r"\d+ \(-?\d+; -?\d+\) dB", out), out
    assert "internal + laboratory opening (EN ISO 12354-1 Annex C)" in out
    assert main([*GLASS, "--lowest", "125", "--highest", "3150"]) == 0
    assert "ISO 717-1" not in capsys.readouterr().out


@pytest.mark.parametrize(
    ("extra", "fragment"),
    [
        (["--edge-absorption", "1.5"], "--edge-absorption: must lie in 0 .. 1, got 1.5"),
        (["--edge-absorption", "x"], "--edge-absorption: must be a number"),
        (
            ["--edge-absorption", "0.3", "--loss-factor", "0.02"],
            "--edge-absorption: not with --loss-factor",
        ),
    ],
)
def test_bad_mounting_options_one_line(capsys, extra, fragment):
    assert main([*GLASS, *extra]) == 2
    err = [ln for ln in capsys.readouterr().err.splitlines() if ln.strip()]
    assert len(err) == 1 and fragment in err[0], err


def test_spec_refuses_an_unknown_mounting():
    glass, air = load_materials()["glass"], load_fluids()["air"]
    with pytest.raises(ValueError, match="mounting"):
        PanelSpec(glass, 0.006, 1.25, 1.5, 0.001, air, mounting="bolted")
    spec = PanelSpec(glass, 0.006, 1.25, 1.5, 0.001, air, mounting="edges", edge_absorption=0.0)
    np.testing.assert_allclose(installed_loss_factor(spec, [100.0, 1000.0]), 0.001)


@pytest.mark.parametrize(
    ("material", "thickness", "extra", "noted"),
    [
        ("glass", "0.006", [], True),  # 6 mm glass: 0.0017 against 0.008 at 2 kHz
        ("glass", "0.006", ["--loss-factor", "0.02"], False),  # stated: no note
        ("glass", "0.006", ["--edge-absorption", "0.3"], False),
        ("gypsum_board", "0.0125", [], True),  # 0.0104 against 0.013 at 3.15 kHz
        ("concrete", "0.15", [], False),  # the laboratory term dominates at f_c = 124 Hz
        ("steel", "0.001", [], False),  # f_c = 12 kHz: no band reaches it
    ],
)
def test_mounting_note_where_radiation_outweighs_the_laboratory_losses(
    capsys, material, thickness, extra, noted
):
    # The note marks a panel whose dip at coincidence goes as 10 lg(eta + eta_rad) with the
    # laboratory losses the smaller part (docs/theory/subsystems.md, section 11): its depth
    # then depends on mounting losses that the default does not know.
    args = ["panel", "--material", material, "--thickness", thickness, "--lx", "1.25"]
    assert main([*args, "--ly", "1.5", "--lowest", "100", "--highest", "5000", *extra]) == 0
    out = capsys.readouterr().out
    assert (MOUNTING_NOTE in out) is noted, out[-600:]
