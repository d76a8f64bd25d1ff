"""Every kind of bad model file answers with one clear line per problem and exit code 2."""

from __future__ import annotations

from pathlib import Path

import pytest

from seatool.cli import main

GOOD = """
title = "two boxes"
[bands]
spacing = "third-octave"
lowest = 500
highest = 1000
[subsystems.box]
kind = "cavity"
volume = 2.0
modal_density = 0.5
damping = 0.01
[subsystems.panel]
kind = "structure"
mass = 10.0
modal_density = 0.3
damping = 0.005
[connections.rad]
between = ["panel", "box"]
coupling_loss_factor = 1e-4
[excitations.shaker]
subsystem = "panel"
power = 1e-3
"""


def run(tmp_path: Path, text: str | bytes | None, capsys, *extra: str):
    path = tmp_path / "model.toml"
    if isinstance(text, bytes):
        path.write_bytes(text)
    elif text is not None:
        path.write_text(text)
    out_csv = tmp_path / "out.csv"
    code = main(["solve", str(path), "--csv", str(out_csv), *extra])
    cap = capsys.readouterr()
    return code, cap.out, cap.err, out_csv


def test_good_model_solves(tmp_path, capsys):
    code, out, err, csv = run(tmp_path, GOOD, capsys)
    assert code == 0, err
    assert csv.exists()


CASES = [
    # (id, replace-from, replace-to, expected fragments in the one error line)
    ("missing-key", "volume = 2.0\n", "", ["subsystems.box.volume", "missing required key"]),
    (
        "wrong-type",
        "volume = 2.0",
        'volume = "big"',
        ["subsystems.box.volume", "must be a number", "string"],
    ),
    ("zero", "volume = 2.0", "volume = 0.0", ["subsystems.box.volume", "must be > 0"]),
    ("negative", "mass = 10.0", "mass = -10.0", ["subsystems.panel.mass", "must be > 0"]),
    ("nan", "mass = 10.0", "mass = nan", ["subsystems.panel.mass", "must be finite"]),
    ("inf", "mass = 10.0", "mass = inf", ["subsystems.panel.mass", "must be finite"]),
    (
        "unknown-key",
        "volume = 2.0",
        "volume = 2.0\nvolme = 3",
        ["subsystems.box.volme", "unknown key", "did you mean 'volume'"],
    ),
    (
        "unknown-kind",
        'kind = "cavity"',
        'kind = "cavty"',
        ["subsystems.box.kind", "did you mean 'cavity'"],
    ),
    (
        "missing-subsystem",
        '["panel", "box"]',
        '["panel", "bx"]',
        ["connections.rad.between[1]", "unknown subsystem 'bx'", "did you mean 'box'"],
    ),
    (
        "unknown-excited",
        'subsystem = "panel"',
        'subsystem = "panle"',
        ["excitations.shaker.subsystem", "did you mean 'panel'"],
    ),
    (
        "unknown-fluid",
        'kind = "cavity"',
        'kind = "cavity"\nfluid = "watr"',
        ["subsystems.box.fluid", "unknown fluid 'watr'", "did you mean 'water'"],
    ),
    (
        "zero-clf",
        "coupling_loss_factor = 1e-4",
        "coupling_loss_factor = 0.0",
        ["connections.rad.coupling_loss_factor", "must be > 0"],
    ),
    (
        "negative-damping",
        "damping = 0.01",
        "damping = -0.01",
        ["subsystems.box.damping", "must be >= 0"],
    ),
    (
        "empty-bands",
        "lowest = 500\nhighest = 1000",
        "lowest = 1000\nhighest = 500",
        ["bands", "empty band range"],
    ),
    ("low-bands", "lowest = 500", "lowest = 10", ["bands.lowest", "outside 20 Hz - 20 kHz"]),
    (
        "not-a-band",
        "lowest = 500",
        "lowest = 550",
        ["bands", "not the centre of a third-octave band"],
    ),
    (
        "band-spacing",
        'spacing = "third-octave"',
        'spacing = "thirds"',
        ["bands.spacing", "must be 'third-octave' or 'octave'"],
    ),
    (
        # `kind` is the older name of the [bands] key `spacing`: still read, still checked
        "band-kind",
        'spacing = "third-octave"',
        'kind = "thirds"',
        ["bands.kind", "must be 'third-octave' or 'octave'"],
    ),
    (
        "band-spacing-given-twice",
        'spacing = "third-octave"',
        'spacing = "third-octave"\nkind = "third-octave"',
        ["bands.kind", "spacing", "older name", "keep only"],
    ),
    (
        "table-length",
        "damping = 0.005",
        "damping = { band_hz = [500, 630, 800], values = [0.01, 0.02] }",
        ["subsystems.panel.damping", "band_hz has 3 entries but values has 2"],
    ),
    (
        "table-missing-band",
        "damping = 0.005",
        "damping = { band_hz = [500, 630, 800], values = [0.01, 0.02, 0.01] }",
        ["subsystems.panel.damping", "no value for band(s) 1 kHz"],
    ),
    (
        "table-bad-band",
        "damping = 0.005",
        "damping = { band_hz = [500, 630, 800, 1100], values = [0.01, 0.02, 0.01, 0.01] }",
        ["subsystems.panel.damping.band_hz[3]", "not the centre"],
    ),
    (
        "table-bad-key",
        "damping = 0.005",
        "damping = { bands = [500], values = [0.01] }",
        ["subsystems.panel.damping.bands", "unknown key", "did you mean 'band_hz'"],
    ),
    ("not-toml", None, None, ["not valid TOML"]),
    ("duplicate-table", "[subsystems.panel]", "[subsystems.box]", ["not valid TOML", "box"]),
    (
        "top-level-typo",
        "[excitations.shaker]",
        "[excitation.shaker]",
        ["excitation", "unknown key", "did you mean 'excitations'"],
    ),
    (
        "two-sources-one-held",
        "power = 1e-3",
        "power = 1e-3\nvelocity_level = 90",
        ["excitations.shaker", "exactly one of"],
    ),
    (
        "level-on-wrong-kind",
        "power = 1e-3",
        "sound_pressure_level = 90",
        ["excitations.shaker.sound_pressure_level", "'panel' is a structure"],
    ),
    (
        "between-self",
        '["panel", "box"]',
        '["panel", "panel"]',
        ["connections.rad.between", "itself"],
    ),
]


@pytest.mark.parametrize(("frm", "to", "frags"), [c[1:] for c in CASES], ids=[c[0] for c in CASES])
def test_bad_input_one_line_exit_2(tmp_path, capsys, frm, to, frags):
    if frm is None:
        text = "this is [ not toml"
    else:
        assert frm in GOOD, frm
        text = GOOD.replace(frm, to, 1)
    code, out, err, csv = run(tmp_path, text, capsys)
    lines = [ln for ln in err.splitlines() if ln.strip()]
    assert code == 2, (out, err)
    assert len(lines) == 1, err
    assert "Traceback" not in err
    assert str(tmp_path / "model.toml") in lines[0]
    for frag in frags:
        assert frag in lines[0], (frag, lines[0])
    assert not csv.exists(), "no output file may be written on bad input"


def test_several_problems_reported_together(tmp_path, capsys):
    text = GOOD.replace("volume = 2.0", "volume = -1").replace("mass = 10.0", 'mass = "x"')
    code, _, err, _ = run(tmp_path, text, capsys)
    assert code == 2
    lines = err.strip().splitlines()
    assert len(lines) == 2
    assert "subsystems.box.volume" in lines[0]
    assert "subsystems.panel.mass" in lines[1]


def test_older_band_key_kind_still_works(tmp_path, capsys):
    # [bands] kind = ... is the older name of spacing = ...: same model, same levels
    code_new, _, err_new, csv_new = run(tmp_path, GOOD, capsys)
    assert code_new == 0, err_new
    new = csv_new.read_text()
    older = GOOD.replace('spacing = "third-octave"', 'kind = "third-octave"')
    code_old, _, err_old, csv_old = run(tmp_path, older, capsys)
    assert code_old == 0, err_old
    assert csv_old.read_text() == new


def test_missing_file(tmp_path, capsys):
    code = main(["solve", str(tmp_path / "nope.toml")])
    err = capsys.readouterr().err
    assert code == 2
    assert "nope.toml: file not found" in err
    assert "Traceback" not in err


def test_binary_file(tmp_path, capsys):
    code, _, err, _ = run(tmp_path, b"\xff\xfe\x00\x01", capsys)
    assert code == 2
    assert "not a text file" in err


def test_csv_spectrum_problems(tmp_path, capsys):
    (tmp_path / "eta.csv").write_text("band_hz,eta\n500,0.01\n630,abc\n800,0.01\n1000,0.01\n")
    text = GOOD.replace("damping = 0.005", 'damping = { csv = "eta.csv", column = "eta" }')
    code, _, err, _ = run(tmp_path, text, capsys)
    assert code == 2
    assert "eta.csv' row 3: not a number" in err
    (tmp_path / "eta.csv").write_text("band_hz,eta\n500,0.01\n630,0.01\n800,0.01\n1000,0.01\n")
    text2 = GOOD.replace("damping = 0.005", 'damping = { csv = "eta.csv", column = "etta" }')
    code, _, err, _ = run(tmp_path, text2, capsys)
    assert code == 2
    assert "no column 'etta'" in err and "did you mean 'eta'" in err
    text3 = GOOD.replace("damping = 0.005", 'damping = { csv = "missing.csv", column = "eta" }')
    code, _, err, _ = run(tmp_path, text3, capsys)
    assert code == 2
    assert "file 'missing.csv' not found" in err


def test_csv_spectrum_read(tmp_path, capsys):
    (tmp_path / "eta.csv").write_text("band_hz,eta\n500,0.01\n630,0.02\n800,0.03\n1000,0.04\n")
    text = GOOD.replace("damping = 0.005", 'damping = { csv = "eta.csv", column = "eta" }')
    import seatool

    (tmp_path / "m.toml").write_text(text)
    m = seatool.load(tmp_path / "m.toml")
    assert list(m.subsystem("panel").damping) == [0.01, 0.02, 0.03, 0.04]


def test_unknown_show_name(tmp_path, capsys):
    code, _, err, _ = run(tmp_path, GOOD, capsys, "--show", "bx")
    assert code == 2
    assert "unknown subsystem 'bx'" in err and "did you mean 'box'" in err


def test_singular_model_exit_2(tmp_path, capsys):
    text = (
        GOOD
        + '[subsystems.loose]\nkind = "structure"\nmass = 1.0\nmodal_density = 1.0\ndamping = 0.0\n'
    )
    code, _, err, csv = run(tmp_path, text, capsys)
    assert code == 2
    assert "loose is undamped and unconnected" in err
    assert not csv.exists()


def test_internal_error_exit_1(tmp_path, capsys, monkeypatch):
    def boom(*a, **k):
        raise RuntimeError("simulated fault")

    monkeypatch.setattr("seatool.run", boom)
    code, _, err, csv = run(tmp_path, GOOD, capsys)
    assert code == 1
    assert "internal error" in err and "Traceback" not in err
    assert not csv.exists()


def test_csv_target_is_a_directory(tmp_path, capsys):
    path = tmp_path / "model.toml"
    path.write_text(GOOD)
    (tmp_path / "out").mkdir()
    code = main(["solve", str(path), "--csv", str(tmp_path / "out")])
    err = capsys.readouterr().err
    assert code == 2
    assert "--csv: cannot write" in err and "Traceback" not in err


def test_byte_order_mark_is_accepted(tmp_path, capsys):
    path = tmp_path / "model.toml"
    path.write_bytes(b"\xef\xbb\xbf" + GOOD.encode())
    assert main(["check", str(path)]) == 0


def test_material_section_with_base(tmp_path, capsys):
    import seatool

    text = (
        "[bands]\nlowest = 1000\nhighest = 1000\n"
        '[materials.laminated]\nbase = "glass"\nloss_factor = 0.03\n'
        '[subsystems.pane]\nkind = "plate"\nmaterial = "laminated"\nthickness = 0.006\nlx = 1.0\nly = 0.8\n'
    )
    path = tmp_path / "m.toml"
    path.write_text(text)
    m = seatool.load(path)
    pane = m.subsystem("pane")
    # the built-in glass with a changed loss factor: damping defaults to it
    assert float(pane.damping[0]) == 0.03
    assert (
        pane.props.material.density
        == seatool.materials.load_materials()["glass"].density
    )
    path.write_text(text.replace('base = "glass"', 'base = "glas"'))
    assert main(["check", str(path)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert (
        len(err) == 1 and "materials.laminated.base" in err[0] and "did you mean 'glass'" in err[0]
    )


# -- checks driven by the kinds' declarations ----------------------------------------------

DECLARED_CASES = [
    # (id, replace-from, replace-to, expected fragments, number of lines)
    (
        # a misspelt 'between' is named as unknown with the right name, not only "missing"
        "misspelt-between",
        'between = ["panel", "box"]',
        'betwen = ["panel", "box"]',
        ["connections.rad.betwen", "unknown key", "did you mean 'between'"],
        1,
    ),
    (
        # the second name of the cavity kind is gone: a clear rename message
        "renamed-kind",
        'kind = "cavity"',
        'kind = "acoustic_cavity"',
        ["subsystems.box.kind", "renamed to 'cavity'"],
        1,
    ),
    (
        # physical bounds (common practice): a cavity of 1e300 m^3 is a typing slip
        "volume-out-of-bounds",
        "volume = 2.0",
        "volume = 1e300",
        ["subsystems.box.volume", "outside the physical bounds", "common practice"],
        1,
    ),
    (
        "huge-sound-power-level",
        "power = 1e-3",
        "sound_power_level = 1e10",
        ["excitations.shaker.sound_power_level", "outside the physical bounds"],
        1,
    ),
    (
        "empty-subsystem-name",
        "[subsystems.panel]",
        '[subsystems.""]\nkind = "exterior"\n[subsystems.panel]',
        ['subsystems.', "non-empty name"],
        1,
    ),
    (
        "uncertainty-bogus-key",
        "[excitations.shaker]",
        '[uncertainty.eta]\nparameter = "subsystems.panel.damping"\ndistribution = "lognormal"\n'
        "factor = 1.5\nfactr = 2\n[excitations.shaker]",
        ["uncertainty.eta.factr", "unknown key", "did you mean 'factor'"],
        1,
    ),
]


@pytest.mark.parametrize(
    ("frm", "to", "frags", "nlines"),
    [c[1:] for c in DECLARED_CASES],
    ids=[c[0] for c in DECLARED_CASES],
)
@pytest.mark.parametrize("command", ["check", "solve"])
def test_declared_checks_exit_2(tmp_path, capsys, frm, to, frags, nlines, command):
    assert frm in GOOD, frm
    path = tmp_path / "model.toml"
    path.write_text(GOOD.replace(frm, to, 1))
    code = main([command, str(path)])
    err = [ln for ln in capsys.readouterr().err.splitlines() if ln.strip()]
    assert code == 2, err
    assert len(err) == nlines, err
    assert "Traceback" not in "\n".join(err)
    for frag in frags:
        assert frag in err[0], (frag, err[0])


def test_plate_thickness_in_millimetres_is_refused_with_a_hint(tmp_path, capsys):
    # bounds of a plate thickness: 1e-5 .. 1 m (common practice); 6 typed for 6 mm
    text = (
        "[bands]\nlowest = 1000\nhighest = 1000\n"
        '[subsystems.pane]\nkind = "plate"\nmaterial = "glass"\nthickness = 6\nlx = 1.0\nly = 0.8\n'
    )
    path = tmp_path / "m.toml"
    path.write_text(text)
    assert main(["check", str(path)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "subsystems.pane.thickness" in err[0], err
    assert "millimetres" in err[0], err


def test_generated_name_colliding_with_a_declared_one_is_an_error(tmp_path, capsys):
    # a plate with in-plane fields makes 'pane.longitudinal'; a second subsystem of that
    # name must not silently replace (or be replaced by) it
    text = (
        "[bands]\nlowest = 1000\nhighest = 1000\n"
        '[subsystems.pane]\nkind = "plate"\nmaterial = "glass"\nthickness = 0.006\nlx = 1.0\n'
        'ly = 0.8\nwave_fields = ["bending", "longitudinal"]\n'
        '[subsystems."pane.longitudinal"]\nkind = "structure"\nmass = 1.0\nmodal_density = 1.0\n'
        "damping = 0.01\n"
    )
    path = tmp_path / "m.toml"
    path.write_text(text)
    assert main(["check", str(path)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1, err
    assert "'pane.longitudinal'" in err[0] and "subsystems.pane" in err[0], err


def test_derived_values_must_be_finite_and_positive():
    # the generic check run on every derived quantity: a non-finite or non-positive value
    # is an input problem naming the key paths it came from (never an internal error)
    from pathlib import Path

    from seatool.kinds.reader import Reader
    from seatool.kinds.validate import check_derived

    rd = Reader("m.toml", Path("."))
    keys = ("subsystems.p.thickness", "subsystems.p.material")
    assert check_derived(rd, "subsystems.p", {"bending stiffness": 2.0}, keys)
    assert not rd.problems
    assert not check_derived(rd, "subsystems.p", {"bending stiffness": float("inf")}, keys)
    assert not check_derived(rd, "subsystems.p", {"volume": [1.0, 0.0]}, keys)
    assert len(rd.problems) == 2
    for pr in rd.problems:
        assert pr.path == "subsystems.p" and "subsystems.p.thickness" in pr.message
