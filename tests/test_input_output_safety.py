"""Files read and written: spectrum files stay in the model's folder, outputs are whole.

Spectrum CSV files: relative to the model file, regular files only (no devices, pipes),
inside the model's folder tree unless --allow-outside-files, at most 1 MiB, one cell
echoed in a message. Outputs: committed together at the end of a run (a figure that fails
leaves no CSV), permissions from the umask, spreadsheet formulas neutralised, user text
escaped in HTML. Messages: unknown keys with the closest valid name, no numpy warning on
the terminal, bands outside the model's range refused. All model data invented.
"""

from __future__ import annotations

import os
import stat
import sys
from pathlib import Path

import pandas as pd
import pytest

import seatool
from seatool.cli import main
from seatool.kinds.reader import MAX_CSV_BYTES
from seatool.outputs import OutputBatch, output_file, write_text_atomic
from seatool.results import csv_text, neutralise_cell

BASE = """
title = "file probe (invented)"
[bands]
spacing = "third-octave"
lowest = 100
highest = 125
[subsystems.p]
kind = "plate"
material = "steel"
thickness = 0.002
lx = 1.0
ly = 1.2
damping = 0.01
[subsystems.room]
kind = "cavity"
dimensions = [2.0, 2.5, 3.0]
damping = { reverberation_time = 0.5 }
[connections.rad]
kind = "radiation"
between = ["p", "room"]
[excitations.src]
subsystem = "p"
power = 1e-3
"""

SPECTRUM = 'power = { csv = "%s", column = "w" }'


def _model(folder: Path, text: str) -> Path:
    folder.mkdir(parents=True, exist_ok=True)
    f = folder / "model.toml"
    f.write_text(text, encoding="utf-8")
    return f


def _check(f: Path, capsys, *extra: str) -> tuple[int, str]:
    code = main(["check", str(f), *extra])
    return code, capsys.readouterr().err


def _with_csv(name: str) -> str:
    return BASE.replace("power = 1e-3", SPECTRUM % name)


def test_spectrum_file_in_a_subfolder_is_read_relative_to_the_model(tmp_path, capsys):
    (tmp_path / "m" / "data").mkdir(parents=True)
    (tmp_path / "m" / "data" / "p.csv").write_text("band_hz,w\n100,1e-3\n125,1e-3\n")
    code, err = _check(_model(tmp_path / "m", _with_csv("data/p.csv")), capsys)
    assert code == 0, err


@pytest.mark.parametrize("where", ["../outside.csv", "ABSOLUTE"])
def test_spectrum_file_outside_the_model_folder_needs_the_option(tmp_path, capsys, where):
    (tmp_path / "outside.csv").write_text("band_hz,w\n100,1e-3\n125,1e-3\n")
    name = str(tmp_path / "outside.csv") if where == "ABSOLUTE" else where
    f = _model(tmp_path / "m", _with_csv(name))
    code, err = _check(f, capsys)
    assert code == 2
    assert "excitations.src.power.csv" in err and "outside the model's folder" in err
    assert "--allow-outside-files" in err
    code, err = _check(f, capsys, "--allow-outside-files")
    assert code == 0, err


def test_a_link_out_of_the_folder_is_outside_too(tmp_path, capsys):
    (tmp_path / "secret.csv").write_text("band_hz,w\n100,1\n125,1\n")
    (tmp_path / "m").mkdir()
    (tmp_path / "m" / "link.csv").symlink_to(tmp_path / "secret.csv")
    code, err = _check(_model(tmp_path / "m", _with_csv("link.csv")), capsys)
    assert code == 2 and "outside the model's folder" in err


@pytest.mark.skipif(not hasattr(os, "mkfifo"), reason="needs named pipes")
def test_a_pipe_is_refused_without_waiting(tmp_path, capsys):
    (tmp_path / "m").mkdir()
    os.mkfifo(tmp_path / "m" / "pipe.csv")  # no writer: a blocking open would hang
    code, err = _check(_model(tmp_path / "m", _with_csv("pipe.csv")), capsys)
    assert code == 2 and "not a regular file" in err


@pytest.mark.skipif(not Path("/dev/zero").exists(), reason="needs /dev/zero")
def test_a_device_is_refused_even_when_outside_files_are_allowed(tmp_path, capsys):
    code, err = _check(_model(tmp_path, _with_csv("/dev/zero")), capsys, "--allow-outside-files")
    assert code == 2 and "not a regular file" in err


def test_a_file_over_the_size_cap_is_refused(tmp_path, capsys):
    (tmp_path / "big.csv").write_bytes(b"band_hz,w\n" + b"#" * MAX_CSV_BYTES)
    code, err = _check(_model(tmp_path, _with_csv("big.csv")), capsys)
    assert code == 2 and f"larger than {MAX_CSV_BYTES} bytes" in err


def test_a_bad_row_echoes_only_the_offending_cell_shortened(tmp_path, capsys):
    secret = "TOPSECRET"
    (tmp_path / "p.csv").write_text(f"band_hz,w,other\n100,{'x' * 500},{secret}\n125,1,2\n")
    code, err = _check(_model(tmp_path, _with_csv("p.csv")), capsys)
    assert code == 2
    assert secret not in err and "x" * 41 not in err and "'" + "x" * 40 + "...'" in err


def test_bands_outside_the_model_range_are_an_error(tmp_path, capsys):
    # docs/model-format.md: band_hz must cover every band of the model, extra bands are an error
    text = BASE.replace("power = 1e-3", "power = { band_hz = [80, 100, 125], values = [1, 1, 1] }")
    code, err = _check(_model(tmp_path, text), capsys)
    assert code == 2
    assert "excitations.src.power.band_hz[0]: band 80 Hz is outside the model's bands" in err


def test_toml_nested_too_deep_is_one_clear_line(tmp_path, capsys):
    text = BASE + "deep = " + "[" * 2000 + "]" * 2000 + "\n"
    code, err = _check(_model(tmp_path, text), capsys)
    assert code == 2 and "nested more than" in err and len(err.splitlines()) == 1


def test_a_misspelt_kind_is_named_as_the_unknown_key(tmp_path, capsys):
    text = BASE.replace('kind = "plate"', 'knd = "plate"')
    code, err = _check(_model(tmp_path, text), capsys)
    assert code == 2
    assert "subsystems.p.knd: unknown key (did you mean 'kind'?)" in err


def test_numpy_warnings_never_reach_the_terminal(tmp_path, capsys):
    # a source of 1e-300 W: levels far below any reference (log of tiny numbers)
    text = BASE.replace("power = 1e-3", "power = 1e-300")
    code = main(["solve", str(_model(tmp_path, text)), "--csv", str(tmp_path / "l.csv")])
    err = capsys.readouterr().err
    assert code == 0 and "RuntimeWarning" not in err and "Warning:" not in err
    assert (tmp_path / "l.csv").exists()  # the spread columns of energies that underflow


# -- outputs --------------------------------------------------------------------------------


def test_a_failing_figure_leaves_no_csv(tmp_path, capsys, monkeypatch):
    f = _model(tmp_path, BASE)

    def broken(*args, **kwargs):
        raise ValueError("drawing failed")

    monkeypatch.setattr(seatool, "plot_levels", broken)
    out = tmp_path / "levels.csv"
    code = main(["solve", str(f), "--csv", str(out), "--plot", str(tmp_path / "l.png")])
    capsys.readouterr()
    assert code == 1
    assert not out.exists() and not (tmp_path / "l.png").exists()
    assert [p.name for p in tmp_path.iterdir()] == ["model.toml"]  # no temporary left


def test_dollar_and_caret_in_names_draw(tmp_path, capsys):
    # '$..^{' would be read as mathematical text by matplotlib and fail to draw
    text = BASE.replace("subsystems.p]", 'subsystems."$a^{"]').replace('"p"', '"$a^{"')
    out = tmp_path / "l.png"
    code = main(["solve", str(_model(tmp_path, text)), "--csv", str(tmp_path / "x.csv"),
                 "--plot", str(out)])  # fmt: skip
    capsys.readouterr()
    assert code == 0 and out.stat().st_size > 0


@pytest.mark.skipif(sys.platform == "win32", reason="POSIX permissions")
@pytest.mark.parametrize(("umask", "mode"), [(0o022, 0o644), (0o077, 0o600), (0o002, 0o664)])
def test_output_permissions_follow_the_umask(tmp_path, capsys, umask, mode):
    f = _model(tmp_path, BASE)
    old = os.umask(umask)
    try:
        code = main(["solve", str(f), "--csv", str(tmp_path / "a.csv"),
                     "--plot", str(tmp_path / "a.svg")])  # fmt: skip
    finally:
        os.umask(old)
    capsys.readouterr()
    assert code == 0
    for name in ("a.csv", "a.svg"):
        assert stat.S_IMODE((tmp_path / name).stat().st_mode) == mode


def test_batch_commits_all_or_nothing(tmp_path):
    a, b = tmp_path / "a.txt", tmp_path / "b.txt"
    a.write_text("old")

    def failing_run() -> None:
        with OutputBatch():
            write_text_atomic(a, "new")
            write_text_atomic(b, "new")
            raise RuntimeError

    with pytest.raises(RuntimeError):
        failing_run()
    assert a.read_text() == "old" and not b.exists()
    with OutputBatch():
        write_text_atomic(a, "new")
        with output_file(b) as tmp:
            tmp.write_text("fig")
        assert a.read_text() == "old"  # nothing renamed before the end of the batch
    assert a.read_text() == "new" and b.read_text() == "fig"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["a.txt", "b.txt"]


@pytest.mark.parametrize(
    ("cell", "written"),
    [
        ("=1+2", "'=1+2"),
        ("+SUM(A1)", "'+SUM(A1)"),
        ("-2+3", "'-2+3"),
        ("@cmd", "'@cmd"),
        ("\tx", "'\tx"),
        ("\rx", "'\rx"),
        ("-3.2", "-3.2"),
        ("+1e3", "+1e3"),
        ("floor", "floor"),
        (-3.2, -3.2),
    ],
)
def test_spreadsheet_formulas_are_neutralised_numbers_are_not(cell, written):
    # OWASP "CSV Injection": cells starting with = + - @ tab CR are formulas in a spreadsheet
    assert neutralise_cell(cell) == written


def test_csv_text_neutralises_text_columns_only():
    table = pd.DataFrame({"subsystem": ["=cmd|' /C calc'!A0", "-3.5"], "level_dB": [-3.2, 1.0]})
    lines = csv_text(table).splitlines()
    assert lines[0].startswith("# Caution: ")
    assert lines[2] == "'=cmd|' /C calc'!A0,-3.2"
    assert lines[3] == "-3.5,1"


def test_notebook_view_escapes_the_title(tmp_path):
    f = _model(tmp_path, BASE.replace('title = "file probe (invented)"',
                                      'title = "<script>alert(1)</script>"'))  # fmt: skip
    html = seatool.run(seatool.load(f))._repr_html_()
    assert "<script>" not in html and "&lt;script&gt;" in html


def test_notebook_view_shows_the_plausibility_warnings_escaped(tmp_path):
    f = _model(tmp_path, BASE.replace('subsystem = "p"', 'subsystem = "p"\ndescription = "x"')
               .replace("damping = 0.01", "damping = 0.6"))  # fmt: skip
    html = seatool.run(seatool.load(f))._repr_html_()
    assert "warning: " in html and "subsystems.p.damping" in html and "&#x27;p&#x27;" in html
