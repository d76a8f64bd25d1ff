"""Command line: solve, check, CSV columns, exit codes."""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

import seatool
from seatool.cli import main

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "models" / "compressor_enclosure.toml"
MODELS = sorted((ROOT / "models").glob("*.toml"))


def test_solve_prints_band_table(capsys):
    assert main(["solve", str(DEMO), "--show", "workshop_air"]) == 0
    out = capsys.readouterr().out
    assert "workshop_air" in out and "enclosure_air" not in out.split("levels in dB")[0]
    assert "1 kHz" in out and "overall dB(A)" in out
    assert "re 2e-05 Pa" in out
    assert "Caution" in out


def test_csv_columns(tmp_path, capsys):
    out = tmp_path / "levels.csv"
    assert main(["solve", str(DEMO), "--csv", str(out)]) == 0
    df = pd.read_csv(out, comment="#")
    for col in ("subsystem", "band_hz", "energy_J", "level_dB", "level_ref"):
        assert col in df.columns
    m = seatool.load(DEMO)
    assert len(df) == len(m.subsystems) * len(m.bands)
    assert set(df["subsystem"]) == set(m.names)


def test_balance_option(capsys):
    assert main(["solve", str(DEMO), "--balance"]) == 0
    assert "power balance [W]" in capsys.readouterr().out


def test_check_summarises(capsys):
    assert main(["check", str(DEMO)]) == 0
    out = capsys.readouterr().out
    assert "model is valid" in out
    assert "21 third-octave bands" in out


def test_no_command_is_usage_error(capsys):
    assert main([]) == 2


def test_help_carries_caution(capsys):
    assert main(["--help"]) == 0
    assert "verify by measurement" in capsys.readouterr().out.lower().replace("\n", " ")


def test_python_dash_m(tmp_path):
    r = subprocess.run(
        [sys.executable, "-m", "seatool", "check", str(DEMO)],
        capture_output=True,
        text=True,
        check=False,
    )
    assert r.returncode == 0, r.stderr
    assert "model is valid" in r.stdout


@pytest.mark.parametrize("path", MODELS, ids=[p.name for p in MODELS])
def test_every_shipped_model_conserves_energy(path):
    res = seatool.run(seatool.load(path))
    assert res.solution.residual.max() <= 1e-9
    assert np.all(res.energy >= 0)


def test_plot_option_writes_a_figure(tmp_path, capsys):
    out = tmp_path / "levels.png"
    assert main(["solve", str(DEMO), "--plot", str(out)]) == 0
    assert out.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"  # PNG signature (ISO/IEC 15948)
    assert out.stat().st_size > 10_000


def test_plot_option_bad_suffix(tmp_path, capsys):
    assert main(["solve", str(DEMO), "--plot", str(tmp_path / "levels.bmp")]) == 2
    err = capsys.readouterr().err
    assert "--plot" in err and ".png" in err
    assert not (tmp_path / "levels.bmp").exists()
