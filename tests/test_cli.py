"""Command line: solve, check, CSV columns, exit codes."""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

import seatool
from seatool.cli import main
from seatool.levels import CAUTION

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "models" / "compressor_enclosure.toml"
MODELS = sorted((ROOT / "models").glob("*.toml"))


def test_solve_prints_band_table(capsys):
    assert main(["solve", str(DEMO), "--show", "workshop_air"]) == 0
    out = capsys.readouterr().out
    assert "workshop_air" in out and "enclosure_air" not in out.split("levels in dB")[0]
    assert "1 kHz" in out and "overall dB(A)" in out
    assert "re 2e-05 Pa" in out
    assert "Caution" in out


def test_csv_columns(tmp_path, capsys):
    out = tmp_path / "levels.csv"
    assert main(["solve", str(DEMO), "--csv", str(out)]) == 0
    df = pd.read_csv(out, comment="#")
    for col in ("subsystem", "band_hz", "energy_J", "level_dB", "level_ref"):
        assert col in df.columns
    m = seatool.load(DEMO)
    assert len(df) == len(m.subsystems) * len(m.bands)
    assert set(df["subsystem"]) == set(m.names)


def test_balance_option(capsys):
    assert main(["solve", str(DEMO), "--balance"]) == 0
    assert "power balance [W]" in capsys.readouterr().out


def test_check_summarises(capsys):
    assert main(["check", str(DEMO)]) == 0
    out = capsys.readouterr().out
    assert "model is valid" in out
    assert "21 third-octave bands" in out


def test_no_command_is_usage_error(capsys):
    assert main([]) == 2


def test_help_carries_caution(capsys):
    assert main(["--help"]) == 0
    assert "verify by measurement" in capsys.readouterr().out.lower().replace("\n", " ")


def test_python_dash_m(tmp_path):
    r = subprocess.run(
        [sys.executable, "-m", "seatool", "check", str(DEMO)],
        capture_output=True,
        text=True,
        check=False,
    )
    assert r.returncode == 0, r.stderr
    assert "model is valid" in r.stdout


@pytest.mark.parametrize("path", MODELS, ids=[p.name for p in MODELS])
def test_every_shipped_model_conserves_energy(path):
    res = seatool.run(seatool.load(path))
    assert res.solution.residual.max() <= 1e-9
    assert np.all(res.energy >= 0)


def test_plot_option_writes_a_figure(tmp_path, capsys):
    out = tmp_path / "levels.png"
    assert main(["solve", str(DEMO), "--plot", str(out)]) == 0
    assert out.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"  # PNG signature (ISO/IEC 15948)
    assert out.stat().st_size > 10_000


def test_plot_option_bad_suffix(tmp_path, capsys):
    assert main(["solve", str(DEMO), "--plot", str(tmp_path / "levels.bmp")]) == 2
    err = capsys.readouterr().err
    assert "--plot" in err and ".png" in err
    assert not (tmp_path / "levels.bmp").exists()


def test_version(capsys):
    assert main(["--version"]) == 0
    assert capsys.readouterr().out.strip() == f"seatool {seatool.__version__}"
    # the package metadata reads the same one place (pyproject: dynamic version)
    import tomllib

    meta = tomllib.loads((ROOT / "pyproject.toml").read_text())
    assert "version" in meta["project"]["dynamic"]
    assert meta["tool"]["setuptools"]["dynamic"]["version"]["attr"] == (
        "seatool._version.__version__"
    )


def _imported_after(code: str) -> set[str]:
    # on a line of its own, outside any block of `code`
    probe = code + "\nimport sys\nprint(' '.join(sorted(sys.modules)))"
    out = subprocess.run(
        [sys.executable, "-c", probe], capture_output=True, text=True, cwd=ROOT, check=True
    ).stdout
    return set(out.split())


HEAVY = {"pandas", "scipy", "scipy.sparse", "matplotlib", "networkx"}


def test_import_seatool_imports_no_heavy_dependency():
    # lazy package attributes (PEP 562): `import seatool` loads none of the heavy
    # dependencies; the first use of seatool.run does
    assert not HEAVY & _imported_after("import seatool")
    assert {"pandas", "scipy.sparse"} <= _imported_after("import seatool; seatool.run")


def test_help_imports_no_heavy_dependency():
    # `seatool --help` builds the parser only: no command module imports its heavy
    # dependencies at start. The module list is printed after the captured --help output.
    code = (
        "import contextlib, io, seatool.cli as c\n"
        "with contextlib.redirect_stdout(io.StringIO()):\n"
        "    assert c.main(['--help']) == 0"
    )
    imported = _imported_after(code)
    assert "seatool.cli" in imported  # the probe ran and printed its list
    assert not (HEAVY | {"dask", "SALib", "scipy.stats"}) & imported


def test_solve_imports_only_what_it_uses():
    # `seatool solve` of the shipped rail cab reads, solves and prints levels with their
    # confidence bands: none of the sweeps' scipy.stats, the paths' networkx, the figures'
    # matplotlib or scipy.integrate (scipy.optimize) is imported on the way
    code = (
        "import contextlib, io, seatool.cli as c\n"
        "with contextlib.redirect_stdout(io.StringIO()):\n"
        f"    assert c.main(['solve', {str(ROOT / 'models' / 'rail_cab.toml')!r}]) == 0"
    )
    imported = _imported_after(code)
    assert {"seatool.solve", "seatool.analysis.confidence", "pandas"} <= imported
    assert not {"scipy.stats", "scipy.optimize", "scipy.integrate", "networkx",
                "matplotlib", "dask", "SALib"} & imported  # fmt: skip


def test_import_analysis_imports_no_heavy_dependency():
    # `import seatool.analysis` resolves its submodules on first use (PEP 562), so it
    # loads none of the analyses' heavy dependencies; the names still resolve
    imported = _imported_after("import seatool.analysis")
    assert "seatool.analysis" in imported
    assert not {"scipy.stats", "networkx", "dask", "SALib"} & imported
    used = _imported_after(
        "import seatool.analysis as a; from seatool.analysis import paths, receiver_index\n"
        "assert a.sweep.__name__ == 'seatool.analysis.sweep' and callable(receiver_index)"
    )
    assert {"seatool.analysis.paths", "seatool.analysis.sweep"} <= used


def test_python_m_seatool_help():
    out = subprocess.run(
        [sys.executable, "-m", "seatool", "--help"], capture_output=True, text=True, cwd=ROOT
    )
    assert out.returncode == 0
    for name in ("solve", "check", "panel", "paths", "sensitivity", "spread", "Caution"):
        assert name in out.stdout


def test_one_caution_wording_everywhere():
    # the caution is defined once (seatool.levels.CAUTION) and shown verbatim: in the
    # README, in --help, at the end of Result.render(); no second wording in the package
    flat = " ".join((ROOT / "README.md").read_text().split())
    assert " ".join(CAUTION.split()) in flat.replace("> ", "")
    help_text = subprocess.run(
        [sys.executable, "-m", "seatool", "--help"], capture_output=True, text=True, cwd=ROOT
    ).stdout
    assert " ".join(CAUTION.split()) in " ".join(help_text.split())
    res = seatool.run(seatool.load(DEMO))
    assert res.render().endswith("Caution: " + CAUTION)
    assert "Caution: " + CAUTION not in res.render(caution=False)
    for path in (ROOT / "seatool").rglob("*.py"):
        text = path.read_text()
        assert "do not certify" not in text or path.name == "levels.py", path
        assert "they do not certify" not in text, path


def test_every_public_name_resolves():
    # the lazy package attributes (seatool.__getattr__): every name of __all__ is found,
    # an unknown one is an AttributeError, and seatool.solve is the module, not a function
    code = (
        "import seatool, types\n"
        "missing = [n for n in seatool.__all__ if getattr(seatool, n, None) is None]\n"
        "assert not missing, missing\n"
        "assert isinstance(seatool.solve, types.ModuleType)\n"
        "assert not hasattr(seatool, 'no_such_name')\n"
        "print('ok')"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, cwd=ROOT)
    assert out.stdout.strip() == "ok", out.stderr
