"""Every section of every shipped model file is validated when the file is loaded, by
``check`` and ``solve`` alike: a bogus key injected into any top-level section (into its
first entry, for sections of named entries) answers exit code 2 and one line naming the
key path. Study files (design variants, candidate treatments) are validated the same way
by the commands that read them. The files themselves are the project's invented demos."""

from __future__ import annotations

import re
import shutil
from pathlib import Path

import pytest

from seatool.cli import main

MODELS = Path(__file__).resolve().parents[1] / "models"
BOGUS = "bogus_key"
_HEADER = re.compile(r"^\[([A-Za-z_][A-Za-z0-9_]*)((?:\.[A-Za-z0-9_]+)*)\]\s*(#.*)?$")


def injections(text: str) -> list[tuple[str, str]]:
    """``(key path, text with the bogus key)``: at the top, and in the first table of each
    top-level section (``[bands]``; ``[subsystems.NAME]`` ...)."""
    out = [(BOGUS, f"{BOGUS} = 1\n{text}")]
    lines = text.split("\n")
    seen: set[str] = set()
    for i, line in enumerate(lines):
        m = _HEADER.match(line)
        if m is None or m.group(1) in seen:
            continue
        seen.add(m.group(1))
        path = f"{m.group(1)}{m.group(2)}.{BOGUS}"
        out.append((path, "\n".join([*lines[: i + 1], f"{BOGUS} = 1", *lines[i + 1 :]])))
    return out


def sections(path: Path) -> set[str]:
    return {m.group(1) for ln in path.read_text().split("\n") if (m := _HEADER.match(ln))}


MODEL_FILES = sorted(MODELS.glob("*.toml"))
#: Study files by the command that reads them (design variants; candidate treatments).
STUDY_COMMANDS = {"_variants.toml": "variants", "_candidates.toml": "lightest"}
STUDY_FILES = {
    p.name: cmd
    for p in sorted((MODELS / "studies").glob("*.toml"))
    for end, cmd in STUDY_COMMANDS.items()
    if p.name.endswith(end)
}


def test_the_shipped_files_cover_every_section():
    # the check below reaches every top-level section a model file may have
    seen = set().union(*(sections(p) for p in MODEL_FILES))
    assert seen >= {"bands", "subsystems", "connections", "excitations", "fluids",
                    "materials", "uncertainty", "targets", "low_frequency"}  # fmt: skip
    # every study file is read by a known command
    assert {p.name for p in (MODELS / "studies").glob("*.toml")} == set(STUDY_FILES)
    assert set(STUDY_FILES.values()) == set(STUDY_COMMANDS.values())


def _run(args: list[str], capsys: pytest.CaptureFixture[str]) -> tuple[int, list[str]]:
    code = main(args)
    err = capsys.readouterr().err
    return code, [ln for ln in err.splitlines() if ln.strip()]


@pytest.mark.parametrize("model", MODEL_FILES, ids=[p.stem for p in MODEL_FILES])
def test_bogus_key_in_any_section_is_refused_by_check_and_solve(model, tmp_path, capsys):
    work = tmp_path / "models"
    shutil.copytree(MODELS, work)  # relative paths (csv spectra, base files) keep working
    assert _run(["check", str(work / model.name)], capsys)[0] == 0
    cases = injections(model.read_text())
    assert len(cases) >= 5
    for key_path, text in cases:
        bad = work / f"bogus_{model.name}"
        bad.write_text(text)
        for command in (["check"], ["solve", "--csv", str(tmp_path / "out.csv")]):
            code, lines = _run([command[0], str(bad), *command[1:]], capsys)
            assert code == 2, (key_path, command[0])
            assert len(lines) == 1, (key_path, lines)
            assert f": {key_path}: unknown key" in lines[0], lines[0]
        assert not (tmp_path / "out.csv").exists()


@pytest.mark.parametrize("study", sorted(STUDY_FILES))
def test_bogus_key_in_a_study_file_is_refused(study, tmp_path, capsys):
    work = tmp_path / "models"
    shutil.copytree(MODELS, work)
    for key_path, text in injections((MODELS / "studies" / study).read_text()):
        bad = work / "studies" / f"bogus_{study}"
        bad.write_text(text)
        code, lines = _run([STUDY_FILES[study], str(bad)], capsys)
        assert code == 2, key_path
        assert len(lines) == 1, (key_path, lines)
        assert f": {key_path}: unknown key" in lines[0], lines[0]


@pytest.mark.parametrize("study", sorted(STUDY_FILES))
def test_check_on_a_study_file_names_the_command_that_reads_it(study, capsys):
    code, lines = _run(["check", str(MODELS / "studies" / study)], capsys)
    assert code == 2
    assert len(lines) == 1, lines
    assert "a study file of" in lines[0] and f"seatool {STUDY_FILES[study]} " in lines[0]
