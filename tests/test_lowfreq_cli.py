"""The lowfreq command: the shipped rail cab uses the crossover; bad tables give one line
each and exit code 2."""

from __future__ import annotations

from pathlib import Path

import pandas as pd
import pytest

from seatool.cli import main

ROOT = Path(__file__).resolve().parents[1]


def test_rail_cab_low_frequency(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    csv = tmp_path / "cab.csv"
    png = tmp_path / "cab.png"
    assert main(["lowfreq", str(ROOT / "models" / "rail_cab.toml"), "--csv", str(csv),
                 "--plot", str(png)]) == 0  # fmt: skip
    out = capsys.readouterr().out
    assert "Caution:" in out
    assert "convergence check" in out
    t = pd.read_csv(csv, comment="#")
    air = t[t["subsystem"] == "cab_air"]
    assert set(air[air["band_hz"] <= 160]["method"]) == {"modal"}
    assert set(air[air["band_hz"] > 160]["method"]) == {"SEA"}
    assert png.stat().st_size > 10_000


@pytest.mark.parametrize(
    ("table", "message"),
    [
        ('[low_frequency.cab_ai]\n[low_frequency.cab_ai.panels.floor]\nface = "z0"\n',
         "not a cavity of the model (did you mean 'cab_air'?)"),
        ('[low_frequency.cab_air]\nup_to = "soon"\n[low_frequency.cab_air.panels.floor]\n'
         'face = "z0"\n', "up_to: use \"auto\""),
        ('[low_frequency.cab_air]\n[low_frequency.cab_air.panels.floor]\nface = "z3"\n',
         "face: use one of"),
        ('[low_frequency.cab_air]\n[low_frequency.cab_air.panels.flor]\nface = "z0"\n',
         "unknown subsystem (did you mean 'floor'?)"),
        ('[low_frequency.cab_air]\n[low_frequency.cab_air.panels.floor]\nface = "x0"\n',
         "does not fit on face x0"),
        ('[low_frequency.cab_air]\ndimensions = [1, 2, 3]\n'
         '[low_frequency.cab_air.panels.floor]\nface = "z0"\n', "box dimensions give"),
    ],
)
def test_bad_low_frequency_tables(
    tmp_path: Path, capsys: pytest.CaptureFixture[str], table: str, message: str
) -> None:
    text = (ROOT / "models" / "rail_cab.toml").read_text(encoding="utf-8")
    text = text[: text.index("[low_frequency.cab_air]")] + table
    path = tmp_path / "cab.toml"
    path.write_text(text, encoding="utf-8")
    csv = tmp_path / "out.csv"
    assert main(["lowfreq", str(path), "--csv", str(csv)]) == 2
    err = capsys.readouterr().err
    assert message in err
    assert "Traceback" not in err
    assert not csv.exists()
