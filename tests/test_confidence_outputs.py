"""Confidence bands in every output that shows levels: solve (table, CSV, figure, target
confidence), the report, the validity notes and the notebook view; and the probability of
meeting a target from the SEA variance against scipy's log-normal and Gamma distributions."""

from __future__ import annotations

import json
import re
from pathlib import Path

import numpy as np
import pytest
from scipy import stats

import seatool
from seatool.analysis import confidence, targets
from seatool.cli import main
from seatool.physics.validity import relative_variance_goe
from seatool.physics.variance import relative_variance_band
from seatool.report import views, write_report
from seatool.validity_report import band_spread_db, validity_table

MODELS = Path(__file__).resolve().parents[1] / "models"
CAB = MODELS / "operator_cab.toml"


def _cab_with_band_limit(limit: float) -> seatool.Model:
    """The demo cab with one per-band limit only (no metric limit)."""
    text = CAB.read_text(encoding="utf-8")
    text = re.sub(r"(?m)^limit_dBA = .*\n", "", text)
    text = re.sub(r"(?m)^limit_per_band = .*$", f"limit_per_band = {limit}", text)
    assert f"limit_per_band = {limit}" in text and "limit_dBA" not in text
    return seatool.loads(text)


@pytest.mark.parametrize("distribution", ["lognormal", "gamma"])
def test_probability_of_meeting_against_scipy_distribution(distribution: str) -> None:
    # One band limit per band: the target is met when every band energy stays below its
    # limit; with independent band energies (mean the SEA energy, relative variance r^2;
    # log-normal: s^2 = ln(1 + r^2), Gamma: shape 1 / r^2) the probability is the product
    # over bands of scipy.stats.lognorm / gamma cdfs (reference library, independent of
    # the sampling in probability_from_variance).
    # the band limit is chosen where the exact probability is near one half (a case where
    # the answer is not trivially 0 or 1, whatever the demo's levels)
    base = seatool.run(seatool.load(CAB))
    i = base.model.index()["cab_air"]
    r2 = confidence.relative_variances(base.model, base.energy)
    lv, _, _ = base.level_array()
    shape = 1.0 / r2[i]
    s = np.sqrt(np.log1p(r2[i]))

    def exact(limit: float) -> float:
        ratio = 10.0 ** ((limit - lv[i]) / 10.0)  # limit energy / mean energy per band
        if distribution == "gamma":
            return float(np.prod(stats.gamma.cdf(ratio, a=shape, scale=1.0 / shape)))
        return float(np.prod(stats.lognorm.cdf(ratio, s, scale=np.exp(-(s**2) / 2))))

    limit = min(np.arange(50.0, 110.0, 0.5), key=lambda x: abs(exact(x) - 0.5))
    model = _cab_with_band_limit(float(limit))
    result = seatool.run(model)
    expected = exact(float(limit))
    assert 0.05 < expected < 0.95  # a case where the answer is not trivially 0 or 1
    samples = 20000
    got = targets.probability_from_variance(
        result, samples=samples, seed=3, distribution=distribution  # type: ignore[arg-type]
    )
    p = float(got["probability"].iloc[0])
    se = float(np.sqrt(expected * (1 - expected) / samples))
    assert abs(p - expected) < 4 * se  # 4 binomial standard errors (~0.014)
    assert got["standard_error"].iloc[0] == pytest.approx(se, rel=0.1)


def test_probability_extremes_and_method_named() -> None:
    far = targets.probability_from_variance(seatool.run(_cab_with_band_limit(120.0)))
    near = targets.probability_from_variance(seatool.run(_cab_with_band_limit(40.0)))
    assert far["probability"].iloc[0] == 1.0 and near["probability"].iloc[0] == 0.0
    assert "SEA variance estimate" in far["method"].iloc[0]
    text = targets.render_confidence(far)
    assert "met with 100 % confidence" in text and "SEA variance estimate" in text


def test_solve_prints_and_writes_confidence(
    tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    csv = tmp_path / "levels.csv"
    png = tmp_path / "levels.png"
    assert main(["solve", str(CAB), "--csv", str(csv), "--plot", str(png)]) == 0
    out = capsys.readouterr().out
    assert "confidence bands [dB" in out and "5-95 % band" in out
    assert "met with" in out and "SEA variance estimate" in out
    head = csv.read_text(encoding="utf-8").splitlines()[1]
    assert "level_p05_dB" in head and "level_p95_dB" in head
    assert png.stat().st_size > 0
    # the cell of cab_air at 1 kHz is the 5 % and 95 % level of the confidence table
    model = seatool.load(CAB)
    conf = confidence.confidence_bands(model, seatool.run(model))
    row = conf[(conf["subsystem"] == "cab_air") & (conf["band_hz"] == 1000)].iloc[0]
    assert f"{row['level_p05_dB']:.1f}..{row['level_p95_dB']:.1f}" in out


def test_solve_without_confidence(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    csv = tmp_path / "levels.csv"
    assert main(["solve", str(CAB), "--no-confidence", "--csv", str(csv)]) == 0
    out = capsys.readouterr().out
    assert "confidence bands [dB" not in out and "met with" not in out
    assert "level_p95_dB" not in csv.read_text(encoding="utf-8")


def test_figure_shades_the_band(tmp_path: Path) -> None:
    model = seatool.load(CAB)
    result = seatool.run(model)
    conf = confidence.confidence_bands(model, result)
    svg = tmp_path / "levels.svg"
    seatool.plot_levels(result, svg, ["cab_air"], confidence=conf)
    text = svg.read_text(encoding="utf-8")
    assert "cab_air: 5-95 %" in text and "shaded: 5-95 % confidence band" in text


def test_report_shows_the_band(tmp_path: Path) -> None:
    files = write_report(CAB, tmp_path / "r.html", progress=False)
    html = files.html.read_text(encoding="utf-8")
    assert "Shaded: the 5-95 % confidence band" in html
    assert "met with" in html and "SEA variance estimate" in html  # verdict confidence
    assert "log-normal about the SEA mean" in html  # the distribution assumed
    data = json.loads(files.json.read_text(encoding="utf-8"))
    cols = data["tables"]["confidence"]["columns"]
    assert cols == ["band [Hz]", "cab_air 5 %", "cab_air 95 %"]
    off = write_report(CAB, tmp_path / "q.html", progress=False, confidence_bands=False)
    assert "5-95 % band" not in off.html.read_text(encoding="utf-8")


def test_validity_states_the_band_level_spread() -> None:
    model = seatool.load(CAB)
    v = validity_table(model).set_index(["subsystem", "band_hz"])
    row = v.loc[("cab_air", 100)]
    lo, hi = band_spread_db(row["modal_overlap"], row["modes_in_band"])
    assert row["band_p05_dB"] == pytest.approx(float(lo)) and row["band_p95_dB"] == pytest.approx(
        float(hi)
    )
    assert f"{float(lo):+.1f}/{float(hi):+.1f} dB" in row["message"]
    assert "single-frequency" not in row["message"]
    # band levels vary less than single-frequency levels (Langley & Brown 2004b: band
    # averaging lowers the variance)
    r2_band = relative_variance_band(row["modal_overlap"], row["modes_in_band"])
    assert r2_band < relative_variance_goe(row["modal_overlap"], alpha=3.0)


def test_notebook_view() -> None:
    view = views.confidence(seatool.load(CAB))
    assert {"bands", "targets"} <= set(view.tables)
    html = view._repr_html_()
    assert "5-95 % band" in html and "Caution" in html
