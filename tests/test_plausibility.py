"""Plausibility warnings: unusual values are accepted with one line each; --strict refuses them.

Each case changes one value of a small valid model (invented data) and checks the warning
line (file, key path, value, range) on stderr, exit code 0, and exit code 2 with
``--strict``. The shipped models raise no warning, except the treated floor's trim whose
mass-spring resonance really raises four bands.
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest

import seatool
from seatool.cli import main

MODELS = Path(__file__).resolve().parent.parent / "models"

BASE = """
title = "plausibility probe (invented)"
[bands]
spacing = "third-octave"
lowest = 100
highest = 1000
[subsystems.p]
kind = "plate"
material = "steel"
thickness = 0.002
lx = 1.0
ly = 1.2
damping = 0.01
[subsystems.q]
kind = "plate"
material = "steel"
thickness = 0.002
lx = 0.8
ly = 1.0
damping = 0.01
[subsystems.room]
kind = "cavity"
dimensions = [2.0, 2.5, 3.0]
damping = { reverberation_time = 0.5 }
[connections.rad]
kind = "radiation"
between = ["p", "room"]
[connections.seam]
kind = "line"
between = ["p", "q"]
length = 1.0
[excitations.src]
subsystem = "p"
power = 1e-3
"""


def _run(tmp_path: Path, text: str, capsys: pytest.CaptureFixture[str], *extra: str):
    f = tmp_path / "model.toml"
    f.write_text(text, encoding="utf-8")
    code = main(["check", str(f), *extra])
    return code, capsys.readouterr().err, f


def test_the_probe_model_raises_no_warning(tmp_path, capsys):
    code, err, _ = _run(tmp_path, BASE, capsys, "--strict")
    assert code == 0 and err == ""


CASES = [
    # (id, old, new, key path, fragments of the message)
    ("thickness in mm", "thickness = 0.002\nlx = 1.0", "thickness = 0.2\nlx = 1.0",
     "subsystems.p.thickness", ["0.2 [m]", "typical range 0.0003 .. 0.1 [m]"]),
    ("thin sheet", "thickness = 0.002\nlx = 1.0", "thickness = 0.0001\nlx = 1.0",
     "subsystems.p.thickness", ["0.0001 [m]", "0.3 mm"]),
    ("cavity side in mm", "[2.0, 2.5, 3.0]", "[2000.0, 2.5, 3.0]",
     "subsystems.room.dimensions[0]", ["2000 [m]", "over 100 m"]),
    ("high loss factor", "ly = 1.2\ndamping = 0.01", "ly = 1.2\ndamping = 0.6",
     "subsystems.p.damping", ["loss factor 0.6", "above 0.5"]),
    ("material loss factor", 'material = "steel"\nthickness = 0.002\nlx = 1.0',
     'material = { base = "steel", loss_factor = 0.7 }\nthickness = 0.002\nlx = 1.0',
     "subsystems.p.material.loss_factor", ["0.7", "typical range 0 .. 0.5"]),
    ("seam longer than the edges", "length = 1.0", "length = 1.5",
     "connections.seam.length", ["1.5 m", "longest edge of 'q' (1 m)"]),
    ("absorbing area above the boundary", "damping = { reverberation_time = 0.5 }",
     "damping = { absorption_area = 50.0 }", "subsystems.room.damping.absorption_area",
     ["50 m^2", "boundary area 37 m^2"]),
]  # fmt: skip


@pytest.mark.parametrize(("old", "new", "key", "frags"), [c[1:] for c in CASES],
                         ids=[c[0] for c in CASES])  # fmt: skip
def test_unusual_values_warn_and_strict_refuses(tmp_path, capsys, old, new, key, frags):
    assert old in BASE
    text = BASE.replace(old, new, 1)
    code, err, f = _run(tmp_path, text, capsys)
    assert code == 0
    lines = [x for x in err.splitlines() if x.startswith(f"warning: {f}: {key}: ")]
    assert len(lines) == 1, err
    for frag in frags:
        assert frag in lines[0]
    code, err, _ = _run(tmp_path, text, capsys, "--strict")
    assert code == 2
    assert f"error: {f}: {key}: " in err and "--strict" in err


def test_implied_absorption_of_a_constant_cavity_loss_factor(tmp_path, capsys):
    # Sabine (Kuttruff 2009, Room Acoustics, eq. 5.23): T = 0.161 V / (S alpha). The room is
    # 2 x 2.5 x 3 m: V = 15 m^3, S = 37 m^2. A loss factor 0.05 at 1 kHz means
    # T60 = ln(10^6) / (2 pi f eta) = 0.0440 s and alpha = 0.161 * 15 / (37 * 0.0440) = 1.48
    text = BASE.replace("damping = { reverberation_time = 0.5 }", "damping = 0.05")
    code, err, f = _run(tmp_path, text, capsys)
    assert code == 0
    (line,) = [x for x in err.splitlines() if "subsystems.room.damping" in x]
    assert "above 1" in line
    m = re.search(r"1 kHz: alpha ([0-9.]+), T60 ([0-9.]+) s", line)
    assert m is not None, line
    assert float(m.group(1)) == pytest.approx(0.161 * 15 / (37 * 0.0440), rel=0.01)
    assert float(m.group(2)) == pytest.approx(0.0440, rel=0.01)
    assert "in 2 band(s): 800 Hz" in line  # alpha 0.93 at 630 Hz: not reported


def test_a_very_reverberant_cavity_warns_below_one_percent(tmp_path, capsys):
    # T60 = 30 s in the 15 m^3 room: alpha = 0.161 * 15 / (37 * 30) = 0.0022 < 0.01
    text = BASE.replace("reverberation_time = 0.5", "reverberation_time = 30.0")
    code, err, _ = _run(tmp_path, text, capsys)
    assert code == 0 and "below 0.01" in err
    m = re.search(r"1 kHz: alpha ([0-9.]+), T60 30 s", err)
    assert m is not None and float(m.group(1)) == pytest.approx(0.161 * 15 / (37 * 30), rel=0.01)


@pytest.mark.regression
def test_a_trim_that_raises_a_band_is_named_with_its_bands(tmp_path, capsys):
    code = main(["check", str(MODELS / "treated_floor.toml")])
    err = capsys.readouterr().err
    assert code == 0
    assert "subsystems.floor.treatment.trim: the trim of 'floor' raises" in err
    assert "160 Hz: -8.1 dB" in err  # regression: this project's TMM insertion loss


@pytest.mark.parametrize(
    "name",
    ["compressor_enclosure", "rail_cab", "two_rooms", "operator_cab", "wheelhouse"],
)
def test_shipped_models_raise_no_warning(name):
    assert seatool.load(MODELS / f"{name}.toml").warnings == ()


def test_rail_cab_cavity_implies_a_sensible_absorption():
    # the cab's reverberation time 0.3 s in every band: alpha = 0.161 V / (S T) (Sabine)
    m = seatool.load(MODELS / "rail_cab.toml")
    cab = m.subsystem("cab_air")
    v, s = cab.props.volume, cab.props.surface_area
    assert 0.1 < 0.161 * v / (s * 0.3) < 0.5


def test_warnings_reach_python_users_and_strict_is_a_keyword(tmp_path):
    f = tmp_path / "model.toml"
    f.write_text(BASE.replace("damping = 0.01", "damping = 0.6", 1), encoding="utf-8")
    m = seatool.load(f)
    assert [w.path for w in m.warnings] == ["subsystems.p.damping"]
    with pytest.raises(seatool.InputError, match="--strict"):
        seatool.load(f, strict=True)
