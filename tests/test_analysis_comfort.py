"""Comfort metrics of the cavities of a solved model (seatool.analysis.comfort)."""

from __future__ import annotations

import tomllib
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

import seatool
from seatool.analysis.comfort import (
    metric_sensitivities,
    receiver_metric,
    receiver_metrics,
    receivers,
)
from seatool.analysis.sensitivity import parameter_sensitivities
from seatool.cli import main
from seatool.errors import InputError
from seatool.metrics import METRICS
from seatool.modelfile import build
from seatool.results import CAUTION

MODELS = Path(__file__).resolve().parents[1] / "models"

HELD_ROOM = """
title = "A room held at a given spectrum (invented test case)"
[bands]
spacing = "third-octave"
lowest = 25
highest = 12500
[subsystems.room]
kind = "cavity"
dimensions = [4.0, 3.0, 2.5]
damping = 0.01
[subsystems.panel]
kind = "plate"
material = "steel"
thickness = 0.002
lx = 1.0
ly = 1.0
damping = 0.01
[connections.radiation]
kind = "radiation"
between = ["panel", "room"]
[excitations.measured]
subsystem = "room"
sound_pressure_level = 60.0
"""


def test_held_room_matches_metrics_of_the_given_spectrum():
    # A cavity held at 60 dB in every 1/3-octave band 25 Hz - 12.5 kHz: its metrics are those
    # of that spectrum. Overall: 60 + 10 lg 28 (hand sum). Loudness: mosqito's ISO 532-1
    # implementation (independent) on the same 28 band levels, diffuse field, to its
    # rounding (0.01 sone above 16 sone). SIL: every octave 60 + 10 lg 3 (hand sum, ISO 9921).
    result = seatool.run(seatool.loads(HELD_ROOM))
    t = receiver_metrics(result)
    assert list(t["subsystem"]) == ["room"]
    row = t.iloc[0]
    assert row["overall_dB"] == pytest.approx(60 + 10 * np.log10(28), abs=1e-9)
    assert row["SIL_dB"] == pytest.approx(60 + 10 * np.log10(3), abs=1e-9)
    mq_main = pytest.importorskip("mosqito.sq_metrics.loudness.loudness_zwst._main_loudness")
    mq_slopes = pytest.importorskip("mosqito.sq_metrics.loudness.loudness_zwst._calc_slopes")
    ref = float(mq_slopes._calc_slopes(mq_main._main_loudness(np.full(28, 60.0), "diffuse"))[0])
    assert row["loudness_sone"] == pytest.approx(ref, abs=0.005 + 1e-9)
    assert row["field"] == "diffuse"
    assert "lower bound" not in row["notes"]  # the model covers the loudness bands
    free = receiver_metrics(result, field="free").iloc[0]
    assert free["loudness_sone"] != row["loudness_sone"]
    assert t.attrs["caution"] == CAUTION
    assert set(t.attrs["references"]) == {
        "overall_dB",
        "overall_dBA",
        "overall_dBC",
        "SIL_dB",
        "loudness_sone",
        "loudness_level_phon",
    }


def test_rail_cab_rows_agree_with_the_result_totals_and_state_missing_bands():
    # Consistency with Result.overall (the same IEC 61672-1 A-weighting, computed there).
    result = seatool.run(seatool.load(MODELS / "rail_cab.toml"))
    t = receiver_metrics(result)
    assert list(t["subsystem"]) == receivers(result) == ["cab_air"]
    ov = result.overall().set_index("subsystem")
    assert t.iloc[0]["overall_dB"] == pytest.approx(ov.loc["cab_air", "overall_dB"], abs=1e-9)
    assert t.iloc[0]["overall_dBA"] == pytest.approx(ov.loc["cab_air", "overall_dBA"], abs=1e-9)
    notes = t.iloc[0]["notes"]
    assert "25 Hz, 31.5 Hz, 40 Hz, 50 Hz, 10 kHz, 12.5 kHz" in notes
    assert "63 Hz - 8 kHz" in notes


@pytest.mark.parametrize("metric", list(METRICS))
def test_gradient_chains_with_a_change_of_source_power(metric):
    # Chain rule against a re-solve (independent numerical method): scaling the sound power
    # by (1 + eps) raises every band level of the linear SEA system by 10 lg(1 + eps), so
    # the metric changes by sum_k grad_k * 10 lg(1 + eps) to first order.
    text = (MODELS / "two_rooms.toml").read_text(encoding="utf-8")
    base = seatool.run(seatool.loads(text))
    eps_db = 0.01
    louder = text.replace("sound_power_level = 100.0", f"sound_power_level = {100.0 + eps_db}")
    assert louder != text
    up = seatool.run(seatool.loads(louder))
    m0 = receiver_metric(base, "receiving_room", metric)
    m1 = receiver_metric(up, "receiving_room", metric)
    predicted = float(np.sum(m0.gradient)) * eps_db
    assert float(m1.value - m0.value) == pytest.approx(predicted, rel=1e-3, abs=1e-9)


def test_bad_names_are_input_errors():
    result = seatool.run(seatool.load(MODELS / "two_rooms.toml"))
    with pytest.raises(InputError, match="did you mean 'receiving_room'"):
        receiver_metrics(result, names=["receiving_rom"])
    with pytest.raises(InputError, match="'pane' is not a cavity"):
        receiver_metric(result, "pane", "dBA")
    with pytest.raises(InputError, match="did you mean 'dBA'"):
        receiver_metric(result, "receiving_room", "dBa")
    with pytest.raises(InputError, match="'free' or 'diffuse'"):
        receiver_metrics(result, field="reverberant")


def test_solve_prints_the_metrics_and_writes_their_csv(tmp_path, capsys):
    out = tmp_path / "comfort.csv"
    model = str(MODELS / "two_rooms.toml")
    assert main(["solve", model, "--metrics-csv", str(out)]) == 0
    text = capsys.readouterr().out
    assert "what the occupants hear (loudness for a diffuse field)" in text
    assert "receiving_room" in text.split("what the occupants hear")[1]
    assert "so the loudness is a lower bound" in text
    assert text.rstrip().endswith(CAUTION)
    table = pd.read_csv(out, comment="#")
    expect = receiver_metrics(seatool.run(seatool.load(model)))
    assert list(table.columns) == list(expect.columns)
    np.testing.assert_allclose(table["loudness_sone"], expect["loudness_sone"], rtol=1e-9)
    # --show without a cavity prints no metrics block; the CSV still has every cavity.
    assert main(["solve", model, "--show", "pane", "--metrics-csv", str(out)]) == 0
    assert "what the occupants hear" not in capsys.readouterr().out
    assert len(pd.read_csv(out, comment="#")) == 2
    # The free field is a choice.
    assert main(["solve", model, "--field", "free"]) == 0
    assert "loudness for a free field" in capsys.readouterr().out


def test_solve_metrics_csv_bad_folder_is_exit_2(tmp_path, capsys):
    target = tmp_path / "missing" / "m.csv"
    assert main(["solve", str(MODELS / "two_rooms.toml"), "--metrics-csv", str(target)]) == 2
    err = capsys.readouterr().err
    assert "--metrics-csv" in err
    assert "does not exist" in err
    assert not target.exists()


@pytest.mark.parametrize("metric", ["dBA", "SIL", "sone", "phon"])
def test_metric_sensitivity_to_a_parameter_matches_a_resolve(metric):
    # Chain rule (adjoint band-level sensitivities x metric gradient) against central
    # differences of the metric through full rebuilds and re-solves of the model
    # (independent numerical method), for the pane's loss factor of the two-rooms demo.
    data = tomllib.loads((MODELS / "two_rooms.toml").read_text(encoding="utf-8"))
    key = "subsystems.pane.damping"
    model = build(data)
    result = seatool.run(model)
    sens = parameter_sensitivities(data, "receiving_room", [key], model=model)
    row = metric_sensitivities(result, sens, metric).iloc[0]
    assert row["parameter"] == key
    assert row["metric"] == metric

    def value(factor: float) -> float:
        changed = {**data, "subsystems": {**data["subsystems"]}}
        changed["subsystems"]["pane"] = {**data["subsystems"]["pane"]}
        changed["subsystems"]["pane"]["damping"] = data["subsystems"]["pane"]["damping"] * factor
        r = seatool.run(build(changed))
        return float(receiver_metric(r, "receiving_room", metric).value)

    h = 1e-3
    fd = (value(np.exp(h)) - value(np.exp(-h))) / (2 * h)
    assert abs(fd) > 1e-3  # the pane's damping matters
    assert row["dM_dlnx"] == pytest.approx(fd, rel=2e-3)
    assert row["value"] == pytest.approx(value(1.0))


def test_sensitivity_command_ranks_parameters_by_a_metric(capsys):
    # `seatool sensitivity --metric SIL --params subsystems.pane.damping`: the command's line
    # for the pane's damping is the linearised change for +1 %, checked against central
    # differences of re-solved models (independent numerical method), to the 4 printed digits.
    key = "subsystems.pane.damping"
    argv = ["sensitivity", str(MODELS / "two_rooms.toml"), "--to", "receiving_room",
            "--params", key, "--metric", "SIL", "--top", "50"]  # fmt: skip
    assert main(argv) == 0
    out = capsys.readouterr().out
    metric_part = out[out.index("sensitivity of SIL of receiving_room"):]
    line = next(x for x in metric_part.splitlines() if x.split()[1:2] == [key])
    printed = float(line.split()[2])
    data = tomllib.loads((MODELS / "two_rooms.toml").read_text(encoding="utf-8"))

    def value(factor: float) -> float:
        changed = {**data, "subsystems": {**data["subsystems"]}}
        changed["subsystems"]["pane"] = {**data["subsystems"]["pane"], "damping": data[
            "subsystems"]["pane"]["damping"] * factor}
        return float(receiver_metric(seatool.run(build(changed)), "receiving_room", "SIL").value)

    h = 1e-3
    fd = (value(np.exp(h)) - value(np.exp(-h))) / (2 * h)
    assert printed == pytest.approx(fd / 100, abs=6e-5)
    assert CAUTION in out
    # a structure cannot carry a metric of what the occupants hear
    assert main(["sensitivity", str(MODELS / "two_rooms.toml"), "--to", "pane", "--metric",
                 "SIL"]) == 2  # fmt: skip
