"""The sweep table's confidence columns: the 5 % and 95 % overall levels of nominally
identical builds per sample, against band energies sampled independently from the same
law, and in the command's output."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pandas as pd
import pytest

import seatool
from seatool.analysis.confidence import relative_variances
from seatool.analysis.sweep import Parameter, SweepSpec, sweep_file
from seatool.cli import main
from seatool.levels import db
from seatool.metrics import weighted_level
from seatool.physics.variance import energy_ratio_samples

MODELS = Path(__file__).resolve().parents[1] / "models"
OPERATOR = MODELS / "operator_cab.toml"
PATH = "subsystems.cab_air.damping.reverberation_time"


def test_overall_bounds_against_sampled_band_energies() -> None:
    # Reference: draw every band energy of the receiver independently from the log-normal
    # law with its SEA mean and relative variance, form the overall dB and dB(A) of each
    # draw (IEC 61672-1 A-weighting, seatool.metrics) and take the 5 % and 95 % quantiles.
    # The table's columns use the exact variance of the band sum with the sum taken as
    # log-normal (Fenton 1960); observed differences 0.00-0.05 dB. Tolerance: 3 binomial
    # standard errors of the sampled quantile (order statistics, about 0.02 dB here) plus
    # 0.1 dB for the log-normal form of the sum.
    nominal = seatool.load(OPERATOR)
    t60 = 0.15  # the file's value: sample 0 is the nominal model
    spec = SweepSpec((Parameter(PATH, values=(t60, 0.3)),), "list", receivers=("cab_air",))
    s = sweep_file(OPERATOR, spec, scheduler="serial")
    assert s.overall_variance is not None
    table = s.table()
    res = seatool.run(nominal)
    i = nominal.index()["cab_air"]
    lv = res.level_array()[0][i]
    np.testing.assert_allclose(table.loc[0, [c for c in table if c.endswith("Hz")]], lv)
    r2 = relative_variances(nominal, res.energy)[i]
    draws = lv + db(energy_ratio_samples(r2, 40000, np.random.default_rng(5)))
    for metric, weighting in (("dB", "Z"), ("dBA", "A")):
        total = weighted_level(draws, nominal.bands, weighting).value
        q = np.quantile(total, [0.05, 0.95])
        # standard error of a sample quantile: sqrt(p (1 - p) / n) / density (Cramer 1946,
        # sec. 28.5, from memory); the density from the spacing of neighbouring quantiles
        dens = 0.01 / np.diff(np.quantile(total, [[0.045, 0.055], [0.945, 0.955]]), axis=1)[:, 0]
        se = np.sqrt(0.05 * 0.95 / total.size) / dens
        got = table.loc[0, [f"cab_air.{metric}_p05", f"cab_air.{metric}_p95"]].to_numpy(float)
        assert np.all(np.abs(got - q) <= 3 * se + 0.1), (metric, got, q, se)
        assert got[0] < table.loc[0, f"cab_air.{metric}"] < got[1]
    # a longer reverberation time: louder, and its bounds follow the sample, not the nominal
    assert table.loc[1, "cab_air.dBA_p95"] > table.loc[0, "cab_air.dBA_p95"]


def test_command_prints_and_writes_the_bounds(
    tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    out = tmp_path / "s.csv"
    argv = ["sweep", str(OPERATOR), "--vary", f"{PATH}=0.1:0.3", "--samples", "3",
            "--scheduler", "serial", "--out", str(out)]  # fmt: skip
    assert main([*argv, "--plot", str(tmp_path / "s.png")]) == 0
    assert (tmp_path / "s.png").stat().st_size > 0  # levels with their 5-95 % bars
    text = capsys.readouterr().out
    flat = " ".join(text.split())  # the note is wrapped
    assert "builds 5-95 % (median)" in text and "log-normal about the SEA mean" in flat
    t = pd.read_csv(out, comment="#")
    cols = ["cab_air.dB_p05", "cab_air.dB_p95", "cab_air.dBA_p05", "cab_air.dBA_p95"]
    assert set(cols) <= set(t)
    assert np.all(t["cab_air.dBA_p05"] < t["cab_air.dBA"])
    assert np.all(t["cab_air.dBA"] < t["cab_air.dBA_p95"])
    assert main([*argv, "--no-confidence"]) == 0
    text = capsys.readouterr().out
    assert "builds 5-95 %" not in text
    assert not set(cols) & set(pd.read_csv(out, comment="#"))
