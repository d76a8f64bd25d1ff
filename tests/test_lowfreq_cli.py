"""The lowfreq command: the shipped rail cab uses the crossover; bad tables give one line
each and exit code 2."""

from __future__ import annotations

from pathlib import Path

import numpy as np
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


def test_solve_shows_the_method_per_band(tmp_path: Path, capsys: pytest.CaptureFixture[str]
                                         ) -> None:  # fmt: skip
    # the rail cab asks for the cab air and the floor modally up to the 160 Hz band
    model = ROOT / "models" / "rail_cab.toml"
    csv, png = tmp_path / "levels.csv", tmp_path / "levels.png"
    assert main(["solve", str(model), "--show", "cab_air,floor,roof", "--csv", str(csv),
                 "--plot", str(png)]) == 0  # fmt: skip
    out = capsys.readouterr().out
    rows: dict[str, list[str]] = {}
    for p in (line.split() for line in out.splitlines()):
        if len(p) == 5 and p[1] == "Hz":  # band, "Hz", floor, roof, cab_air
            rows.setdefault(p[0], p[2:])  # the level table (the confidence table follows)
    assert rows["160"][0].endswith("*") and rows["160"][2].endswith("*")  # floor, cab_air
    assert not rows["160"][1].endswith("*")  # the roof is not in the box: SEA
    assert not rows["200"][2].endswith("*")
    assert "method: * modal solution" in out
    t = pd.read_csv(csv, comment="#")
    air = t[t["subsystem"] == "cab_air"]
    modal = air["band_hz"] <= 160
    assert set(air[modal]["method"]) == {"modal"} and set(air[~modal]["method"]) == {"SEA"}
    np.testing.assert_array_equal(air[modal]["level_dB"], air[modal]["modal_level_dB"])
    np.testing.assert_array_equal(air[~modal]["level_dB"], air[~modal]["sea_level_dB"])
    # the SEA spread describes the SEA estimate only: blank where the level is modal
    assert air[modal]["level_std_dB"].isna().all() and air[~modal]["level_std_dB"].notna().all()
    # both solutions across the overlap region (two bands above the crossover)
    assert air[~modal]["modal_level_dB"].notna().sum() == 2
    assert set(t[t["subsystem"] == "roof"]["method"]) == {"SEA"}
    assert png.stat().st_size > 10_000


def test_solve_without_the_section_is_unchanged(tmp_path: Path,
                                                capsys: pytest.CaptureFixture[str]) -> None:  # fmt: skip
    csv = tmp_path / "levels.csv"
    assert main(["solve", str(ROOT / "models" / "two_rooms.toml"), "--csv", str(csv)]) == 0
    assert "method" not in capsys.readouterr().out
    assert "method" not in pd.read_csv(csv, comment="#").columns


@pytest.mark.parametrize(
    ("table", "message"),
    [
        ('[low_frequency.cab_ai]\n[low_frequency.cab_ai.panels.floor]\nface = "z0"\n',
         "not a cavity of the model (did you mean 'cab_air'?)"),
        ('[low_frequency.cab_air]\nup_to = "soon"\n[low_frequency.cab_air.panels.floor]\n'
         'face = "z0"\n', "up_to: use \"auto\""),
        ('[low_frequency.cab_air]\n[low_frequency.cab_air.panels.floor]\nface = "z3"\n',
         "face: must be one of 'x0', 'x1', 'y0', 'y1', 'z0', 'z1', got 'z3'"),
        ('[low_frequency.cab_air]\n[low_frequency.cab_air.panels.flor]\nface = "z0"\n',
         "unknown subsystem (did you mean 'floor'?)"),
        ('[low_frequency.cab_air]\n[low_frequency.cab_air.panels.floor]\nface = "x0"\n',
         "does not fit on face x0"),
        ('[low_frequency.cab_air]\ndimensions = [1, 2, 3]\n'
         '[low_frequency.cab_air.panels.floor]\nface = "z0"\n', "box dimensions give"),
        ('[low_frequency.cab_air]\nup_too = 100\n[low_frequency.cab_air.panels.floor]\n'
         'face = "z0"\n', "up_too: unknown key (did you mean 'up_to'?)"),
        ('[low_frequency.cab_air]\nup_to = -5\n[low_frequency.cab_air.panels.floor]\n'
         'face = "z0"\n', "up_to: must be > 0 [Hz], got -5"),
        ('[low_frequency.cab_air]\n[low_frequency.cab_air.panels.floor]\nface = "z0"\n'
         'offset = [0.1]\n', "offset: must be an array of 2 numbers [m], got [0.1]"),
        ('[low_frequency.cab_air]\n[low_frequency.cab_air.panels.floor]\nface = "z0"\n'
         'force_point = [0.5, 2000]\n', "force_point[1]: 2000 [m] is outside the physical bounds"),
        ('[low_frequency.cab_air]\n[low_frequency.cab_air.panels.floor]\nface = "z0"\n'
         'force_point = [0.5, 9]\n', "force_point: (0.5, 9) m is outside the"),
        ('[low_frequency.cab_air]\nup_to = 100\n', "low_frequency.cab_air.panels: missing required key"),
        ('[low_frequency.cab_air]\n[low_frequency.cab_air.panels.rear_wall]\nface = "x1"\n',
         "low_frequency.cab_air.panels.rear_wall: the modal solution needs a flat isotropic"),
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
    assert len(err.strip().splitlines()) == 1, err
    # read at load: every command refuses the file the same way
    assert main(["check", str(path)]) == 2
    assert message in capsys.readouterr().err
    assert "Traceback" not in err
    assert not csv.exists()
