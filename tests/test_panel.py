"""``seatool panel``: table, CSV, bad input, the Python function behind it.

Outside checks: Long (2006) Table 9.1 f_c h products; at coincidence the bending
wavelength equals the wavelength in air (definition of the critical frequency); exact
mode count of a simply supported plate.
"""

from __future__ import annotations

import math

import numpy as np
import pandas as pd
import pytest

from seatool.analysis.panel import PanelSpec, panel_table
from seatool.bands import BandAxis
from seatool.cli import main
from seatool.materials import load_fluids, load_materials

ARGS = ["panel", "--material", "steel", "--thickness", "0.002", "--lx", "1.2", "--ly", "0.8"]


def test_prints_table(capsys):
    assert main([*ARGS, "--lowest", "100", "--highest", "1000"]) == 0
    out = capsys.readouterr().out
    assert "coincidence frequency in air" in out
    for col in ("modal_density_per_hz", "modes_in_band", "modal_overlap", "bending_wavelength_m"):
        assert col in out
    assert "1 kHz" in out and "Caution" in out


@pytest.mark.parametrize(("material", "fch"), [("steel", 12.4), ("aluminium", 12.0), ("glass", 12.7)])
def test_coincidence_matches_long_table(tmp_path, capsys, material, fch):
    # Long (2006), Architectural Acoustics, Table 9.1 (variations of 10 % are common)
    out = tmp_path / "p.csv"
    args = ["panel", "--material", material, "--thickness", "0.004", "--lx", "1", "--ly", "1"]
    assert main([*args, "--csv", str(out)]) == 0
    df = pd.read_csv(out)
    assert df["critical_frequency_hz"].iloc[0] * 0.004 == pytest.approx(fch, rel=0.10)


def test_bending_wavelength_equals_air_wavelength_at_coincidence(tmp_path, capsys):
    out = tmp_path / "p.csv"
    assert main([*ARGS, "--lowest", "1000", "--highest", "10000", "--csv", str(out)]) == 0
    df = pd.read_csv(out)
    fc = df["critical_frequency_hz"].iloc[0]
    # lambda_B ~ f^(-1/2); interpolate at fc in log-log and compare with c0 / fc
    lam = np.exp(np.interp(np.log(fc), np.log(df["band_exact_hz"]), np.log(df["bending_wavelength_m"])))
    assert lam == pytest.approx(343.2 / fc, rel=1e-6)


def test_modes_in_band_against_exact_count(tmp_path, capsys):
    # simply supported plate, f_mn = (pi/2) sqrt(D/m'') ((m/a)^2 + (n/b)^2)
    # (Cremer et al. 2005, sec. 7); 1-5 kHz total within 5 %
    out = tmp_path / "p.csv"
    assert main([*ARGS, "--lowest", "1000", "--highest", "5000", "--csv", str(out)]) == 0
    df = pd.read_csv(out)
    e, rho, nu, h = 2.1e11, 7850.0, 0.3, 0.002
    k = 0.5 * math.pi * math.sqrt(e * h**3 / (12 * (1 - nu**2)) / (rho * h))
    i = np.arange(1, 300)
    fmn = k * ((i[:, None] / 1.2) ** 2 + (i[None, :] / 0.8) ** 2)
    g = 10 ** 0.3
    lo = df["band_exact_hz"].iloc[0] / g ** (1 / 6)
    hi = df["band_exact_hz"].iloc[-1] * g ** (1 / 6)
    exact = np.count_nonzero((fmn >= lo) & (fmn < hi))
    assert df["modes_in_band"].sum() == pytest.approx(exact, rel=0.05)


def test_loss_factor_option_and_properties_on_command_line(tmp_path, capsys):
    out = tmp_path / "p.csv"
    args = ["panel", "--density", "2500", "--youngs-modulus", "6.2e10", "--poisson-ratio",
            "0.24", "--thickness", "0.006", "--lx", "1.5", "--ly", "1.25", "--loss-factor",
            "0.02", "--lowest", "500", "--highest", "500", "--csv", str(out)]  # fmt: skip
    assert main(args) == 0
    df = pd.read_csv(out)
    # M = eta f n(f) (Lyon & DeJong 1995) from the table's own n(f)
    assert df["modal_overlap"].iloc[0] == pytest.approx(
        0.02 * df["band_exact_hz"].iloc[0] * df["modal_density_per_hz"].iloc[0]
    )


@pytest.mark.parametrize(
    ("change", "frag"),
    [
        (["--material", "stel"], "--material: unknown material 'stel' (did you mean 'steel'?)"),
        (["--thickness", "-0.002"], "--thickness: must be > 0"),
        (["--thickness", "thin"], "--thickness: must be a number"),
        (["--fluid", "helum"], "--fluid: unknown fluid 'helum'"),
        (["--poisson-ratio", "0.7"], "--poisson-ratio: must be < 0.5"),
        (["--lowest", "550"], "--lowest/--highest"),
    ],
)
def test_bad_input_one_line(capsys, change, frag):
    args = list(ARGS)
    opt = change[0]
    if opt in args:
        args[args.index(opt) + 1] = change[1]
    else:
        args += change
    assert main(args) == 2
    err = [ln for ln in capsys.readouterr().err.splitlines() if ln.strip()]
    assert len(err) == 1, err
    assert frag in err[0]


def test_missing_size_is_one_line(capsys):
    assert main(["panel", "--material", "steel", "--lx", "1", "--ly", "1"]) == 2
    err = [ln for ln in capsys.readouterr().err.splitlines() if ln.strip()]
    assert err == ["error: --thickness: missing required option"]


def test_python_function_gives_the_command_table(tmp_path, capsys):
    # The command only parses options and prints: panel_table called from Python with the
    # same panel gives the CSV of the command, column for column (the Long 2006 and
    # exact-mode-count checks above therefore hold for the Python function too).
    out = tmp_path / "p.csv"
    assert main([*ARGS, "--lowest", "100", "--highest", "1000", "--csv", str(out)]) == 0
    capsys.readouterr()
    steel = load_materials()["steel"]
    spec = PanelSpec(steel, 0.002, 1.2, 0.8, steel.loss_factor, load_fluids()["air"])
    table = panel_table(spec, BandAxis.from_range(100, 1000))
    got = pd.read_csv(out)
    assert list(got.columns) == list(table.columns)
    np.testing.assert_allclose(got.to_numpy(), table.to_numpy(), rtol=1e-9)
