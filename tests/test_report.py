"""The report: command, companion, atomic writing, escaping, targets hook, references.

The browser checks are in ``test_report_browser.py``.
"""

from __future__ import annotations

import json
import os
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

import seatool
from seatool import report as report_pkg
from seatool.analysis import targets as target_analysis
from seatool.analysis import variants as variant_analysis
from seatool.cli import main
from seatool.report import collect, render_html, write_report
from seatool.report.references import docstring_references, model_references
from seatool.results import CAUTION

ROOT = Path(__file__).resolve().parent.parent
RAIL = str(ROOT / "models" / "rail_cab.toml")


def test_command_writes_html_and_json(tmp_path, capsys):
    out = tmp_path / "cab.html"
    assert main(["report", RAIL, "-o", str(out), "--quiet", "--band", "500"]) == 0
    text = capsys.readouterr().out
    assert "wrote" in text and CAUTION in text
    html = out.read_text(encoding="utf-8")
    assert html.startswith("<!DOCTYPE html>")
    assert CAUTION in html
    assert "in the 500 Hz band" in html or "500 Hz" in html
    # self-contained: no link to anything outside the file
    assert "http://" not in html.replace("http://www.w3.org", "")
    assert "https://" not in html
    data = json.loads(out.with_suffix(".json").read_text(encoding="utf-8"))
    assert data["caution"] == CAUTION
    levels = data["tables"]["levels"]
    assert levels["columns"][0] == "band [Hz]"
    assert len(levels["data"]) == 22  # 63 Hz .. 8 kHz third-octave bands
    # the companion's tables can be read back into pandas
    t = pd.DataFrame(levels["data"], columns=levels["columns"])
    assert np.isfinite(t.iloc[:, 1].to_numpy(dtype=float)).all()


@pytest.mark.parametrize(
    ("argv", "what"),
    [
        (["--to", "cab_aire"], "did you mean 'cab_air'"),
        (["--band", "99"], "not a band of the model"),
        (["--samples", "0"], "must be >= 1"),
    ],
)
def test_bad_options_exit_2_and_write_nothing(tmp_path, capsys, argv, what):
    out = tmp_path / "cab.html"
    assert main(["report", RAIL, "-o", str(out), "--quiet", *argv]) == 2
    err = capsys.readouterr().err
    assert what in err and "Traceback" not in err
    assert list(tmp_path.iterdir()) == []


def test_bad_output_names(tmp_path, capsys):
    assert main(["report", RAIL, "-o", str(tmp_path / "cab.pdf"), "--quiet"]) == 2
    assert main(["report", RAIL, "-o", str(tmp_path / "no" / "cab.html"), "--quiet"]) == 2
    assert "does not exist" in capsys.readouterr().err
    assert list(tmp_path.iterdir()) == []


def test_failure_while_rendering_leaves_nothing(tmp_path, monkeypatch):
    def broken(*args, **kwargs):
        raise RuntimeError("template failed")

    monkeypatch.setattr(report_pkg, "render_html", broken)
    with pytest.raises(RuntimeError):
        write_report(RAIL, tmp_path / "cab.html", progress=False)
    assert list(tmp_path.iterdir()) == []


def test_failure_between_the_two_renames_leaves_nothing(tmp_path, monkeypatch):
    calls = []
    real = os.replace

    def second_fails(src, dst):
        calls.append(dst)
        if len(calls) == 2:
            raise OSError(28, "No space left on device")
        real(src, dst)

    monkeypatch.setattr(report_pkg.os, "replace", second_fails)
    assert main(["report", RAIL, "-o", str(tmp_path / "cab.html"), "--quiet"]) == 2
    assert len(calls) == 2
    assert list(tmp_path.iterdir()) == []


def test_markup_in_the_model_is_escaped(tmp_path):
    text = (ROOT / "models" / "rail_cab.toml").read_text(encoding="utf-8")
    text = text.replace("Rail driver's cab (invented demo)", "<b onclick=x()>cab</b>")
    text = text.replace("6 mm steel floor plate", "<script>alert(1)</script>")
    model = tmp_path / "m.toml"
    model.write_text(text, encoding="utf-8")
    html = write_report(model, tmp_path / "m.html", progress=False).html.read_text()
    assert "<script>" not in html and "<b onclick" not in html
    assert "&lt;b onclick=x()&gt;cab&lt;/b&gt;" in html
    assert "&lt;script&gt;alert(1)&lt;/script&gt;" in html


def test_targets_hook_shows_margins(tmp_path):
    """A limit curve through the hook gives limit - level per band, negative shown as missed."""
    import tomllib

    data = tomllib.loads(Path(RAIL).read_text(encoding="utf-8"))

    def limits(result):
        nominal = result.model.bands.nominal
        return pd.DataFrame({"subsystem": "cab_air", "band_hz": nominal, "limit_dB": 60.0})

    c = collect(data, file=RAIL, base_dir=ROOT / "models", targets=limits, progress=False)
    m = c.tables["margins"]
    lv = c.result.table().query("subsystem == 'cab_air'")["level_dB"].to_numpy()
    np.testing.assert_allclose(m["margin_dB"].to_numpy(), 60.0 - lv)
    html = render_html(c)
    assert "Margins to the limits" in html and 'class="num bad"' in html


def test_references_name_the_published_sources_of_the_kinds_used():
    """The rail cab uses plates radiating into a cavity, line junctions and a cavity.

    Sources expected from the literature behind these formulas (from memory): Leppington,
    Broadbent & Heron 1982 for the radiation efficiency of a rectangular panel; Morse &
    Bolt 1944 for a room's modal density; IEC 61672-1 for the A-weighting of the overall
    level; Langley & Heron 1990 for wave transmission through a line junction.
    """
    import seatool

    refs = model_references(seatool.load(RAIL))
    text = "\n".join(r.text for r in refs)
    for expected in ("Leppington", "Morse, P.M., Bolt, R.H. (1944)", "IEC 61672-1",
                     "Langley, R.S., Heron, K.H. (1990)"):  # fmt: skip
        assert expected in text, expected
    # a model of given values only uses no plate physics
    few = "\n".join(r.text for r in model_references(seatool.load(ROOT / "models" /
                                                                   "compressor_enclosure.toml")))
    assert "Leppington" not in few


def test_docstring_references_parses_numpydoc():
    def f() -> None:
        """Thing.

        References
        ----------
        .. [1] Author, A. (1999). A title,
           continued on a second line.
        .. [2] ISO 1683:2015, Acoustics.
        .. [3] See another function.

        Examples
        --------
        nothing
        """

    assert docstring_references(f) == [
        "Author, A. (1999). A title, continued on a second line.",
        "ISO 1683:2015, Acoustics.",
    ]


def test_notebook_views_escape_and_carry_the_caution(tmp_path):
    import seatool
    from seatool.report import views

    text = (ROOT / "models" / "two_rooms.toml").read_text(encoding="utf-8")
    text = text.replace("Two rooms separated by a glass pane (invented demo)", "<script>x</script>")
    text = text.replace("[subsystems.receiving_room]", '[subsystems."<i>room</i>"]')
    text = text.replace('"receiving_room"]', '"<i>room</i>"]')
    model_file = tmp_path / "m.toml"
    model_file.write_text(text, encoding="utf-8")
    model = seatool.load(model_file)
    shown = [
        seatool.run(model)._repr_html_(),
        views.source_paths(model, "<i>room</i>")._repr_html_(),
        views.sensitivity(model, "<i>room</i>")._repr_html_(),
        views.level_spread(model_file, samples=20, progress=False)._repr_html_(),
    ]
    for page in shown:
        assert "<script>" not in page and "<i>room" not in page
        assert "&lt;i&gt;room&lt;/i&gt;" in page
        assert "Caution: " + html_escape(CAUTION) in page


def html_escape(text: str) -> str:
    import html

    return html.escape(text)


def test_every_csv_starts_with_the_caution(tmp_path, capsys):
    two = str(ROOT / "models" / "two_rooms.toml")
    runs = {
        "levels.csv": ["solve", RAIL, "--csv"],
        "comfort.csv": ["solve", RAIL, "--metrics-csv"],
        "paths.csv": ["paths", RAIL, "--to", "cab_air", "--csv"],
        "sens.csv": ["sensitivity", RAIL, "--to", "cab_air", "--csv"],
        "spread.csv": ["spread", two, "--samples", "20", "--csv"],
        "panel.csv": ["panel", "--material", "glass", "--thickness", "0.006", "--lx", "1.2",
                      "--ly", "0.9", "--csv"],
    }  # fmt: skip
    for name, argv in runs.items():
        out = tmp_path / name
        assert main([*argv, str(out)]) == 0, name
        first = out.read_text(encoding="utf-8").splitlines()[0]
        assert first == "# Caution: " + CAUTION, name
        table = pd.read_csv(out, comment="#")
        assert len(table) > 0 and not str(table.columns[0]).startswith("#"), name
    capsys.readouterr()
    assert main(["--help"]) == 0
    assert "Caution" in capsys.readouterr().out


@pytest.mark.parametrize(
    "argv",
    [
        ["sensitivity", RAIL, "--to", "cab_air"],
        ["spread", str(ROOT / "models" / "two_rooms.toml"), "--samples", "20", "--show",
         "receiving_room"],
        ["panel", "--material", "glass", "--thickness", "0.006", "--lx", "1.2", "--ly", "0.9",
         "--trim", "spring_mass_2kg"],
    ],
)  # fmt: skip
def test_figures_of_the_commands(tmp_path, capsys, argv):
    out = tmp_path / "figure.png"
    assert main([*argv, "--plot", str(out)]) == 0
    assert out.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    assert main([*argv, "--plot", str(tmp_path / "figure.gif")]) == 2
    assert "use a .png, .pdf or .svg" in capsys.readouterr().err


def test_a_structure_as_receiver(tmp_path):
    """A plate chosen with --to: velocity levels only, labelled as such; the sink is refused."""
    import base64
    import re

    out = tmp_path / "floor.html"
    assert main(["report", RAIL, "-o", str(out), "--to", "floor", "--quiet"]) == 0
    html = out.read_text(encoding="utf-8")
    first = re.search(r"data:image/svg\+xml;base64,([A-Za-z0-9+/=]+)", html)
    assert first is not None
    assert "velocity level" in base64.b64decode(first.group(1)).decode("utf-8")
    data = json.loads(out.with_suffix(".json").read_text(encoding="utf-8"))
    assert data["receivers"] == ["floor"]
    assert main(["report", RAIL, "-o", str(tmp_path / "x.html"), "--to", "outside",
                 "--quiet"]) == 2  # fmt: skip
    assert not (tmp_path / "x.html").exists()


def test_report_shows_what_the_occupants_hear(tmp_path):
    # the cabin's comfort metrics in the report equal the analysis function's (one source of
    # each number: seatool.analysis.comfort, checked against ISO 532-1 / IEC 61672-1 there)
    import seatool
    from seatool.analysis import comfort

    out = tmp_path / "cab.html"
    assert main(["report", RAIL, "-o", str(out), "--quiet"]) == 0
    text = out.read_text(encoding="utf-8")
    assert "What the occupants hear" in text
    assert "ISO 532-1" in text and "ISO 9921" in text
    hear = comfort.receiver_metrics(seatool.run(seatool.load(RAIL)))
    sone = float(hear.loc[hear["subsystem"] == "cab_air", "loudness_sone"].iloc[0])
    companion = json.loads(out.with_suffix(".json").read_text(encoding="utf-8"))
    t = companion["tables"]["comfort"]
    got = pd.DataFrame(t["data"], columns=t["columns"]).set_index("subsystem")
    got = got.loc["cab_air", "loudness_sone"]
    assert got == pytest.approx(sone, rel=1e-9)


def test_report_shows_targets_variants_and_the_lightest_treatment(tmp_path, capsys):
    # The operator cab (invented demo) states a target; its studies folder has design
    # variants and candidate treatments. The report shows the verdicts, the margins, the
    # variants side by side and the lightest answer, and its tables are the analysis
    # functions' own (seatool.analysis.targets / variants).
    out = tmp_path / "cab.html"
    studies = ROOT / "models" / "studies"
    argv = ["report", str(ROOT / "models" / "operator_cab.toml"), "-o", str(out), "--quiet",
            "--variants", str(studies / "operator_cab_variants.toml"),
            "--candidates", str(studies / "operator_cab_candidates.toml")]  # fmt: skip
    assert main(argv) == 0
    html = out.read_text(encoding="utf-8")
    companion = json.loads(out.with_suffix(".json").read_text(encoding="utf-8"))["tables"]
    result = seatool.run(seatool.load(ROOT / "models" / "operator_cab.toml"))
    for v in target_analysis.verdicts(result):
        assert v.line in html
    mt = target_analysis.margin_table(result)
    got = pd.DataFrame(**companion["target_margins"])
    metric = mt[mt["limit_on"] != "band"]
    assert np.allclose(got["margin [dB or unit]"], metric["margin"], atol=1e-9)
    data, file, folder, vs = variant_analysis.load_variants(studies / "operator_cab_variants.toml")
    cmp = variant_analysis.compare(data, vs, file=file, base_dir=folder)
    lv = pd.DataFrame(**companion["variant_levels"])
    assert np.allclose(lv["overall_dBA"], cmp.levels["overall_dBA"], atol=1e-9)
    assert "lightest_alternatives" in companion
    assert "The lightest treatment meeting every target" in html
    assert 'alt="Margins to the band limits"' in html
    assert 'alt="Design variants against the base"' in html
