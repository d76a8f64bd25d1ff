"""The paths, sensitivity and spread commands: output, CSV files, one-line bad input."""

from __future__ import annotations

from pathlib import Path

import pandas as pd
import pytest

from seatool.cli import main

MODEL = "models/compressor_enclosure.toml"
SPREAD = """
[uncertainty.walls]
parameter = "subsystems.walls.damping"
distribution = "lognormal"
factor = 1.5
"""


def test_paths_command(tmp_path, capsys):
    out = tmp_path / "paths.csv"
    con = tmp_path / "con.csv"
    cp = tmp_path / "cp.csv"
    code = main(["paths", MODEL, "--to", "workshop_air", "--csv", str(out),
                 "--contributions-csv", str(con), "--connections-csv", str(cp)])  # fmt: skip
    text = capsys.readouterr().out
    assert code == 0
    assert "enclosure_air > workshop_air" in text and "Caution" in text
    p = pd.read_csv(out, comment="#")
    assert {"source", "path", "band_hz", "share", "rank", "valid"} <= set(p.columns)
    assert p.groupby("band_hz")["share"].sum().sub(1).abs().max() < 1e-9
    assert set(pd.read_csv(cp, comment="#")["connection"]) == {"walls_outside", "mass_law", "(input)"}
    assert set(pd.read_csv(con, comment="#")["source"]) == {"compressor"}


def test_sensitivity_command(tmp_path, capsys):
    out = tmp_path / "s.csv"
    code = main(["sensitivity", MODEL, "--to", "workshop_air", "--params",
                 "subsystems.workshop_air.volume,subsystems.walls.mass", "--csv", str(out)])  # fmt: skip
    text = capsys.readouterr().out
    assert code == 0
    assert "power:compressor" in text and "subsystems.workshop_air.volume" in text
    t = pd.read_csv(out, comment="#")
    vol = t[t["parameter"] == "subsystems.workshop_air.volume"]
    # <p^2> = rho c^2 E / V with the damping given: exactly -1 dB per dB (levels.py)
    assert (vol["db_per_db"] + 1).abs().max() < 1e-6


def test_spread_command(tmp_path, capsys):
    model = tmp_path / "m.toml"
    model.write_text(Path(MODEL).read_text() + SPREAD)
    out = tmp_path / "spread.csv"
    code = main(["spread", str(model), "--samples", "200", "--seed", "3", "--csv", str(out),
                 "--show", "walls"])  # fmt: skip
    text = capsys.readouterr().out
    assert code == 0
    assert "200 samples (seed 3" in text and "walls" in text
    t = pd.read_csv(out, comment="#")
    assert {"p5_dB", "p50_dB", "p95_dB", "nominal_dB", "valid"} <= set(t.columns)
    w = t[t["subsystem"] == "walls"]
    assert (w["p95_dB"] > w["p5_dB"]).all()


@pytest.mark.parametrize(
    ("argv", "where", "what"),
    [
        (["paths", MODEL, "--to", "wokshop_air"], "--to", "did you mean 'workshop_air'"),
        (["sensitivity", MODEL, "--to", "wals"], "--to", "did you mean 'walls'"),
        (
            ["sensitivity", MODEL, "--to", "walls", "--params", "subsystems.walls.mas"],
            "subsystems.walls.mas",
            "did you mean 'mass'",
        ),
        (
            ["paths", MODEL, "--to", "walls", "--csv", "/nonexistent/dir/x.csv"],
            "--csv",
            "does not exist",
        ),
        (["spread", MODEL, "--show", "wall"], "--show", "did you mean 'walls'"),
        (["paths", "models/nope.toml", "--to", "walls"], "", "file not found"),
    ],
)
def test_bad_input_one_line(capsys, argv, where, what):
    code = main(argv)
    err = capsys.readouterr().err.strip().splitlines()
    assert code == 2
    assert len(err) == 1, err
    assert where in err[0] and what in err[0], err[0]


def test_paths_plot(tmp_path, capsys):
    from seatool.cli import main

    out = tmp_path / "sources.png"
    assert main(["paths", "models/rail_cab.toml", "--to", "cab_air", "--plot", str(out)]) == 0
    assert out.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"  # PNG signature (ISO/IEC 15948)
    assert main(["paths", MODEL, "--to", "walls", "--plot", str(tmp_path / "x.gif")]) == 2
    assert "--plot" in capsys.readouterr().err
