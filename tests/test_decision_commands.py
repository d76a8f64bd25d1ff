"""The `variants` and `lightest` commands on the invented operator-cab demo, and their errors."""

from __future__ import annotations

import shutil
from pathlib import Path

import pandas as pd
import pytest

import seatool
from seatool.analysis.candidates import load_candidates
from seatool.analysis.lightest import lightest_treatment
from seatool.analysis.targets import probability_from_variance
from seatool.analysis.treatment_mass import total_added_mass
from seatool.analysis.variants import apply_changes
from seatool.cli import main
from seatool.modelfile import build

MODELS = Path("models")


def test_variants_command_prints_flags_and_writes_files(tmp_path, capsys):
    rc = main(
        [
            "variants",
            str(MODELS / "studies" / "operator_cab_variants.toml"),
            "--csv",
            str(tmp_path / "d.csv"),
            "--margins-csv",
            str(tmp_path / "m.csv"),
            "--plot",
            str(tmp_path / "d.png"),
        ]
    )
    out = capsys.readouterr().out
    assert rc == 0
    assert "Caution:" in out
    # A 5 kg/m^2 mat stated with `face` (its insertion loss only; no lining absorption in
    # the cab) raises the band of its mass-spring resonance, and the warning names it. (With
    # `facing`, as in the shipped variants, the mat's absorption in the cab keeps the rise
    # below 1 dB.)
    one = tmp_path / "one.toml"
    one.write_text(
        f'base = "{(MODELS / "operator_cab.toml").resolve().as_posix()}"\n[variants.floor_mat_5kg]\n'
        'set = { "subsystems.floor.treatment" = { trim = "spring_mass_5kg", face = "cab_air" } }\n',
        encoding="utf-8",
    )
    assert main(["variants", str(one)]) == 0
    out = capsys.readouterr().out
    assert "warning: variant floor_mat_5kg raises cab_air by more than 1 dB" in out
    assert "mass-spring resonance" in out
    d = pd.read_csv(tmp_path / "d.csv", comment="#")
    assert set(d["variant"]) >= {"base", "floor_mat_2kg", "thicker_rear_wall"}
    assert (tmp_path / "d.png").stat().st_size > 0
    assert "margin" in pd.read_csv(tmp_path / "m.csv", comment="#").columns


def test_demo_lightest_is_lighter_than_the_heaviest_trim_everywhere(tmp_path, capsys):
    data, file, folder, surfaces, settings = load_candidates(
        MODELS / "studies" / "operator_cab_candidates.toml"
    )
    heaviest: dict = {}
    for s in surfaces:
        heaviest.update(s.options[-1].changes)
    heavy = build(apply_changes(data, heaviest), file=file, base_dir=folder)
    ans = lightest_treatment(data, surfaces, file=file, base_dir=folder, **settings)
    assert ans.found
    assert ans.mass_kg < total_added_mass(heavy)
    rc = main(
        [
            "lightest",
            str(MODELS / "studies" / "operator_cab_candidates.toml"),
            "--csv",
            str(tmp_path / "a.csv"),
        ]
    )
    out = capsys.readouterr().out
    assert rc == 0
    assert out.startswith("lightest treatment meeting every target: ")
    assert "next-best combinations" in out and "Caution:" in out
    assert set(pd.read_csv(tmp_path / "a.csv", comment="#")["target"]) == {"operator_ear"}


def test_lightest_fails_on_miss_only_when_asked(tmp_path, capsys):
    (tmp_path / "studies").mkdir()
    shutil.copy(MODELS / "operator_cab.toml", tmp_path / "operator_cab.toml")
    shutil.copy(MODELS / "studies" / "operator_cab_candidates.toml", tmp_path / "studies")
    model = tmp_path / "operator_cab.toml"
    model.write_text(model.read_text().replace("limit_dBA = 75.0", "limit_dBA = 40.0"))
    cand = tmp_path / "studies" / "operator_cab_candidates.toml"
    assert main(["lightest", str(cand)]) == 0
    assert "no combination of the candidates meets every target" in capsys.readouterr().out
    assert main(["lightest", str(cand), "--fail-on-miss"]) == 3


@pytest.mark.parametrize(
    ("text", "words"),
    [
        ('base = "operator_cab.toml"\n[surfaces.floor.x]\nsett = {}\n', "did you mean 'set'"),
        ('base = "nope.toml"\n[surfaces.floor.x]\n', "file not found"),
        ("[surfaces.floor.x]\n", "base: must name the base model file"),
        (
            'base = "operator_cab.toml"\n[surfaces.floor.x]\nset = { "subsystems.flor.t" = 1 }\n',
            "did you mean 'floor'",
        ),
    ],
)
def test_bad_candidates_files(tmp_path, capsys, text, words):
    shutil.copy(MODELS / "operator_cab.toml", tmp_path / "operator_cab.toml")
    (tmp_path / "c.toml").write_text(text)
    assert main(["lightest", str(tmp_path / "c.toml")]) == 2
    err = capsys.readouterr().err
    assert words in err and "Traceback" not in err


def test_variants_and_lightest_print_the_confidence_of_meeting(capsys):
    # The variants table carries, per variant and target, the probability of meeting it over
    # nominally identical builds; it is the SEA-variance estimate of
    # seatool.analysis.targets.probability_from_variance (checked against scipy's Gamma
    # distribution in tests/test_confidence_outputs.py), here for the base model.
    assert main(["variants", str(MODELS / "studies" / "operator_cab_variants.toml")]) == 0
    out = capsys.readouterr().out
    assert "confidence" in out and "SEA variance estimate" in out
    base = seatool.run(seatool.load(MODELS / "operator_cab.toml"))
    p = float(probability_from_variance(base)["probability"].iloc[0])
    line = next(x for x in out.splitlines() if x.split()[:2] == ["base", "operator_ear"])
    assert line.split()[-2:] == [f"{100 * p:.0f}", "%"]
    assert main(["lightest", str(MODELS / "studies" / "operator_cab_candidates.toml")]) == 0
    out = capsys.readouterr().out
    assert "% confidence" in out
