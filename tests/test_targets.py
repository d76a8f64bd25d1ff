"""Targets: margins, verdicts, probability of meeting a target, the model-file section."""

from __future__ import annotations

import tomllib

import numpy as np
import pytest
from scipy import signal, stats

import seatool
from seatool.analysis.targets import (
    margin_table,
    margins_of_levels,
    probability_of_meeting,
    render_margins,
    verdicts,
)
from seatool.analysis.uncertainty import spread
from seatool.cli import main
from seatool.errors import InputError

# A cavity held at a given spectrum: its band levels are the given values, so every
# expected margin below follows from the input alone.
HELD = """
[bands]
spacing = "third-octave"
lowest = 100
highest = 1000
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
[excitations.measured.sound_pressure_level]
band_hz = [100, 125, 160, 200, 250, 315, 400, 500, 630, 800, 1000]
values = [80, 78, 76, 74, 72, 70, 68, 66, 64, 62, 60]
"""
GIVEN = np.array([80, 78, 76, 74, 72, 70, 68, 66, 64, 62, 60], dtype=float)
HZ = [100, 125, 160, 200, 250, 315, 400, 500, 630, 800, 1000]


def _a_weighting_from_poles(f: np.ndarray) -> np.ndarray:
    # IEC 61672-1:2013 Annex E (E.1-E.4): the A-weighting is the response of an analog filter
    # with four zeros at 0 Hz, double poles at f1 = 20.598997 Hz and f4 = 12194.217 Hz and
    # single poles at f2 = 107.65265 Hz and f3 = 737.86223 Hz, normalised to 0 dB at 1 kHz.
    # Evaluated here by scipy.signal.freqs_zpk (an independent numerical route).
    f1, f2, f3, f4 = 20.598997, 107.65265, 737.86223, 12194.217
    p = -2 * np.pi * np.array([f1, f1, f2, f3, f4, f4])
    z = np.zeros(4)
    _, h = signal.freqs_zpk(z, p, 1.0, worN=2 * np.pi * np.append(f, 1000.0))
    g = 20 * np.log10(np.abs(h))
    return g[:-1] - g[-1]


def test_a_weighted_margin_to_001_db():
    text = HELD + '\n[targets.ear]\nreceiver = "room"\nlimit_dBA = 70.0\n'
    result = seatool.run(seatool.loads(text))
    exact = 1000.0 * 10.0 ** (np.arange(-10, 1) / 10.0)  # IEC 61260-1 base-10 mid-bands
    la = 10 * np.log10(np.sum(10 ** ((GIVEN + _a_weighting_from_poles(exact)) / 10)))
    t = margin_table(result)
    row = t[t["limit_on"] == "dBA"].iloc[0]
    assert row["level"] == pytest.approx(la, abs=0.01)
    assert row["margin"] == pytest.approx(70.0 - la, abs=0.01)
    assert row["met"] == (la <= 70.0)


def test_band_limit_verdict_names_the_missed_bands():
    # Limit 70 dB in every band: the given spectrum exceeds it at 100-250 Hz (80..72 dB).
    text = HELD + '\n[targets.ear]\nreceiver = "room"\nlimit_per_band = 70.0\n'
    result = seatool.run(seatool.loads(text))
    (v,) = verdicts(result)
    assert not v.met
    assert v.missed == ("100 Hz", "125 Hz", "160 Hz", "200 Hz", "250 Hz")
    assert v.binding == "100 Hz"
    assert v.margin == pytest.approx(70.0 - 80.0, abs=1e-9)
    assert "by 10.0 dB in band(s) 100 Hz, 125 Hz, 160 Hz, 200 Hz, 250 Hz" in v.line
    t = margin_table(result)
    np.testing.assert_allclose(t["margin"], 70.0 - GIVEN, atol=1e-9)
    assert "band margins [dB]" in render_margins(result)


def test_met_target_and_several_metrics():
    # SIL of ISO 9921 needs the 500-4000 Hz octaves; limits in dB (overall, hand sum) and
    # a loose band table: met, binding where the margin is smallest.
    overall = 10 * np.log10(np.sum(10 ** (GIVEN / 10)))  # hand sum, common practice
    text = HELD + (
        '\n[targets.ear]\nreceiver = "room"\nlimit_dB = 90.0\n'
        f"limit_per_band = {{ band_hz = {HZ}, values = {[float(g + 3) for g in GIVEN]} }}\n"
    )
    result = seatool.run(seatool.loads(text))
    (v,) = verdicts(result)
    assert v.met and v.missed == ()
    assert v.margin == pytest.approx(3.0, abs=1e-9)
    t = margin_table(result)
    assert t[t["limit_on"] == "dB"]["margin"].iloc[0] == pytest.approx(90 - overall, abs=1e-9)
    assert "met, smallest margin 3.0 dB" in v.line


def test_probability_of_meeting_matches_the_lognormal_result():
    # One cavity, input power P, damping eta lognormal with factor F (median eta0):
    # E = P / (omega eta) (single-subsystem power balance, Lyon & DeJong 1995), so every band
    # level and the overall level shift by -(10/ln 10) ln F z, z standard normal. The target
    # "overall dB <= L0 + m" is met with probability Phi(m / (10 lg F)) (scipy.stats.norm).
    # Tolerance: 4 binomial standard errors sqrt(p (1 - p) / S).
    text = """
[bands]
lowest = 500
highest = 1000
[subsystems.room]
kind = "cavity"
volume = 50.0
modal_density = 2.0
damping = 0.01
[excitations.src]
subsystem = "room"
power = 1e-3
[uncertainty.eta]
parameter = "subsystems.room.damping"
distribution = "lognormal"
factor = 1.5
"""
    base = seatool.run(seatool.loads(text))
    lv = base.level_array()[0][0]
    l0 = 10 * np.log10(np.sum(10 ** (lv / 10)))
    m = 1.0
    data = tomllib.loads(text + f'\n[targets.t]\nreceiver = "room"\nlimit_dB = {l0 + m}\n')
    n = 4000
    sp = spread(data, samples=n, seed=3)
    p = probability_of_meeting(sp).iloc[0]
    expect = float(stats.norm.cdf(m / (10 * np.log10(1.5))))
    assert p["probability"] == pytest.approx(expect, abs=4 * np.sqrt(expect * (1 - expect) / n))
    assert p["nominal_met"]
    assert p["samples"] == n


def test_margins_vectorised_over_samples():
    model = seatool.loads(HELD + '\n[targets.ear]\nreceiver = "room"\nlimit_per_band = 70\n')
    (t,) = model.targets
    lv = np.stack([GIVEN, GIVEN - 20.0])
    mg = margins_of_levels(lv, model.bands, t)
    assert list(mg.met) == [False, True]
    np.testing.assert_allclose(mg.smallest, [-10.0, 10.0])


@pytest.mark.parametrize(
    ("extra", "where", "words"),
    [
        ('receiver = "rom"\nlimit_dBA = 70', "targets.ear.receiver", "did you mean 'room'"),
        ('receiver = "room"', "targets.ear", "no limit given"),
        ('receiver = "room"\nlimit_dbA = 70', "targets.ear.limit_dbA", "limit_dBA"),
        ('receiver = "panel"\nlimit_dBA = 70', "targets.ear.receiver", "needs a cavity"),
        ('receiver = "room"\nlimit_sone = -1', "targets.ear.limit_sone", "must be > 0"),
        (
            'receiver = "room"\nlimit_per_band = { csv = "nope.csv", column = "a" }',
            "targets.ear.limit_per_band.csv",
            "not found",
        ),
        (
            'receiver = "room"\nlimit_per_band = { band_hz = [100], values = [60] }',
            "targets.ear.limit_per_band",
            "no value for band(s)",
        ),
    ],
)
def test_bad_targets_are_refused_at_load(tmp_path, capsys, extra, where, words):
    path = tmp_path / "m.toml"
    path.write_text(HELD + "\n[targets.ear]\n" + extra + "\n")
    with pytest.raises(InputError) as exc:
        seatool.load(path)
    assert any(p.path == where and words in p.message for p in exc.value.problems), [
        str(p) for p in exc.value.problems
    ]
    for command in ("check", "solve"):
        assert main([command, str(path)]) == 2
        err = capsys.readouterr().err
        assert where in err and "Traceback" not in err


def test_solve_prints_verdicts_and_fails_on_miss_only_when_asked(tmp_path, capsys):
    path = tmp_path / "m.toml"
    path.write_text(HELD + '\n[targets.ear]\nreceiver = "room"\nlimit_per_band = 75\n')
    assert main(["solve", str(path)]) == 0
    out = capsys.readouterr().out
    assert "target ear (room): MISSED by 5.0 dB in band(s) 100 Hz, 125 Hz, 160 Hz" in out
    assert "Caution:" in out
    assert main(["solve", str(path), "--fail-on-miss"]) == 3
    capsys.readouterr()
    path.write_text(HELD + '\n[targets.ear]\nreceiver = "room"\nlimit_per_band = 85\n')
    assert main(["solve", str(path), "--fail-on-miss"]) == 0
    assert "target ear (room): met, smallest margin 5.0 dB (100 Hz)" in capsys.readouterr().out
