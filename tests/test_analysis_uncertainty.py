"""Monte Carlo spread: zero spread reproduces the solve; analytic percentiles; bad input.

Analytic reference: a single cavity with input power P and damping eta has
E = P / (omega eta) (Lyon & DeJong 1995, the single-subsystem power balance), so its
level is L0 - (10 / ln 10) ln(eta / eta0): with ln(eta) normal (lognormal spread of factor
F) the level is normal with sd sigma_L = 10 lg F, and its q-quantile is
L0 + z_q sigma_L by symmetry (z_q the standard normal quantile, scipy.stats.norm).

Tolerance from the sampling distribution of a sample quantile (asymptotically normal with
sd sqrt(q (1 - q) / N) / f(x_q), f the density at the quantile; e.g. Cramer 1946,
Mathematical Methods of Statistics, sec. 28.5, from memory): we allow 4 such sd.
"""

from __future__ import annotations

import tomllib
from pathlib import Path

import numpy as np
import pytest
from scipy import stats

from seatool.analysis import _batched as batched_mod
from seatool.analysis import uncertainty as unc_mod
from seatool.analysis.uncertainty import read_uncertainty, spread
from seatool.cli import main
from seatool.errors import InputError

ONE = """
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
"""

COMPRESSOR = Path("models/compressor_enclosure.toml").read_text()


def _data(text: str, extra: str = "") -> dict:
    return tomllib.loads(text + "\n" + extra)


def _quantile_tol(q: float, n: int, pdf_at_q: float) -> float:
    return 4.0 * np.sqrt(q * (1.0 - q) / n) / pdf_at_q


@pytest.mark.parametrize(
    "spec",
    [
        'distribution = "lognormal"\nfactor = 1.0',
        'distribution = "uniform"\ntolerance = 0.0',
        'distribution = "normal"\nsd = 0.0',
    ],
)
@pytest.mark.parametrize("rebuild", [False, True])
def test_zero_spread_reproduces_the_solve(spec, rebuild):
    extra = f"""
[uncertainty.a]
parameter = "subsystems.walls.damping"
{spec}
[uncertainty.b]
parameter = "connections.mass_law.coupling_loss_factor"
distribution = "lognormal"
factor = 1.0
[uncertainty.c]
parameter = "subsystems.enclosure_air.volume"
distribution = "uniform"
tolerance = 0.0
"""
    data = _data(COMPRESSOR, extra)
    if not rebuild:
        del data["uncertainty"]["c"]  # keep the direct route
    sp = spread(data, samples=20, seed=1, force_rebuild=rebuild, base_dir="models")
    assert sp.method == ("rebuild per sample" if rebuild else "direct (batched dense)")
    t = sp.table()
    for col in ("p5_dB", "p50_dB", "p95_dB", "mean_dB"):
        np.testing.assert_allclose(t[col], t["nominal_dB"], rtol=0, atol=1e-9)


def test_lognormal_damping_analytic_percentiles():
    factor, n = 2.0, 20000
    extra = f"""
[uncertainty.d]
parameter = "subsystems.room.damping"
distribution = "lognormal"
factor = {factor}
"""
    sp = spread(_data(ONE, extra), samples=n, seed=7)
    assert sp.method == "direct (batched dense)"
    t = sp.table()
    sigma = 10 * np.log10(factor)
    for q in (0.05, 0.5, 0.95):
        want = t["nominal_dB"] + stats.norm.ppf(q) * sigma
        tol = _quantile_tol(q, n, stats.norm.pdf(stats.norm.ppf(q)) / sigma)
        got = t[f"p{100 * q:g}_dB"]
        np.testing.assert_allclose(got, want, rtol=0, atol=tol)
        assert tol < 0.2  # the check is tight enough to mean something (dB)


def test_lognormal_volume_rebuild_analytic():
    # the level depends on V only through <p^2> = rho c^2 E / V (damping given): normal in dB
    factor, n = 1.5, 1500
    extra = f"""
[uncertainty.v]
parameter = "subsystems.room.volume"
distribution = "lognormal"
factor = {factor}
"""
    sp = spread(_data(ONE, extra), samples=n, seed=3)
    assert sp.method == "rebuild per sample"
    t = sp.table()
    sigma = 10 * np.log10(factor)
    for q in (0.05, 0.95):
        want = t["nominal_dB"] + stats.norm.ppf(q) * sigma
        tol = _quantile_tol(q, n, stats.norm.pdf(stats.norm.ppf(q)) / sigma)
        np.testing.assert_allclose(t[f"p{100 * q:g}_dB"], want, rtol=0, atol=tol)


def test_uniform_tolerance_analytic():
    # L = L0 - 10 lg(1 + t u), u uniform on [-1, 1]: L's q-quantile is at u_(1-q)
    tol_rel, n = 0.4, 20000
    extra = f"""
[uncertainty.d]
parameter = "subsystems.room.damping"
distribution = "uniform"
tolerance = {tol_rel}
"""
    t = spread(_data(ONE, extra), samples=n, seed=11).table()
    for q in (0.05, 0.5, 0.95):
        u = 2 * (1 - q) - 1
        want = t["nominal_dB"] - 10 * np.log10(1 + tol_rel * u)
        dl_du = 10 / np.log(10) * tol_rel / (1 + tol_rel * u)
        tol = _quantile_tol(q, n, 0.5 / dl_du)
        np.testing.assert_allclose(t[f"p{100 * q:g}_dB"], want, rtol=0, atol=tol)


#: Three spreads on the compressor enclosure (a damping, a coupling, a modal density).
THREE_SPREADS = """
[uncertainty.a]
parameter = "subsystems.walls.damping"
distribution = "lognormal"
factor = 1.4
[uncertainty.b]
parameter = "connections.walls_outside.coupling_loss_factor"
distribution = "uniform"
tolerance = 0.3
[uncertainty.c]
parameter = "subsystems.workshop_air.modal_density"
distribution = "lognormal"
factor = 1.2
"""


def test_direct_and_rebuild_and_sparse_routes_agree(monkeypatch):
    extra = THREE_SPREADS
    data = _data(COMPRESSOR, extra)
    dense = spread(data, samples=40, seed=5, base_dir="models")
    rebuilt = spread(data, samples=40, seed=5, base_dir="models", force_rebuild=True)
    # the seed fixes the samples
    again = spread(data, samples=40, seed=5, base_dir="models")
    np.testing.assert_array_equal(again.mean_square, dense.mean_square)
    other = spread(data, samples=40, seed=6, base_dir="models")
    assert not np.array_equal(other.mean_square, dense.mean_square)
    monkeypatch.setattr(unc_mod, "DENSE_LIMIT", 0)
    sparse = spread(data, samples=40, seed=5, base_dir="models")
    assert sparse.method == "direct (sparse per sample)"
    np.testing.assert_allclose(dense.levels(), rebuilt.levels(), rtol=0, atol=1e-9)
    np.testing.assert_allclose(dense.levels(), sparse.levels(), rtol=0, atol=1e-9)


def test_batched_iterative_route_matches_dense_solves(monkeypatch):
    # Samples solved on the solver's iterative path (conjugate gradients over the samples
    # of each band, every energy verified by its balance) against the batched dense
    # route (numpy.linalg.solve, LAPACK), an independent method, to 1e-9 dB.
    extra = THREE_SPREADS
    import importlib

    solve_mod = importlib.import_module("seatool.solve")
    data = _data(COMPRESSOR, extra)
    dense = spread(data, samples=60, seed=3, base_dir="models")
    assert dense.method == "direct (batched dense)"
    monkeypatch.setattr(unc_mod, "ITERATIVE_ABOVE", 0)
    monkeypatch.setattr(solve_mod, "ITERATIVE_ABOVE", 0)
    monkeypatch.setattr(batched_mod, "SAMPLE_GROUP_BYTES", 4000)  # several groups of samples
    it = spread(data, samples=60, seed=3, base_dir="models")
    assert it.method == "direct (batched sparse)"
    ok = np.isfinite(dense.levels())
    assert np.array_equal(ok, np.isfinite(it.levels()))
    np.testing.assert_allclose(it.levels()[ok], dense.levels()[ok], rtol=0, atol=1e-9)
    np.testing.assert_allclose(it.mean_square, dense.mean_square, rtol=1e-9, atol=0)


def test_power_spread_and_held_level_model():
    text = ONE + """
[subsystems.panel]
kind = "structure"
mass = 10.0
modal_density = 0.5
damping = 0.01
[connections.c]
between = ["panel", "room"]
coupling_loss_factor = 1e-3
[excitations.held]
subsystem = "panel"
velocity_level = 100.0
[uncertainty.p]
parameter = "excitations.src.power"
distribution = "normal"
sd = 1e-4
"""
    sp = spread(_data(text), samples=200, seed=0)
    t = sp.table()
    panel = t[t["subsystem"] == "panel"]
    np.testing.assert_allclose(panel["p5_dB"], panel["nominal_dB"], atol=1e-9)  # held
    room = t[t["subsystem"] == "room"]
    assert (room["p95_dB"] > room["p5_dB"]).all()
    ov = sp.overall()
    assert list(ov["subsystem"]) == ["room", "panel"]


def test_source_free_subsystem_spread():
    text = ONE + """
[subsystems.lonely]
kind = "structure"
mass = 1.0
modal_density = 1.0
damping = 0.01
[uncertainty.d]
parameter = "subsystems.room.damping"
distribution = "lognormal"
factor = 1.3
"""
    t = spread(_data(text), samples=50, seed=0).table()
    lonely = t[t["subsystem"] == "lonely"]
    assert np.isneginf(lonely["p50_dB"]).all() and np.isneginf(lonely["nominal_dB"]).all()


BAD = [
    ('parameter = "subsystems.room.damping"\ndistribution = "lognormal"', "uncertainty.x.factor", "missing"),
    ('parameter = "subsystems.room.damping"\ndistribution = "lognormal"\nfactor = 0.5', "uncertainty.x.factor", ">= 1"),
    ('parameter = "subsystems.room.damping"\ndistribution = "lognormel"\nfactor = 2.0', "uncertainty.x.distribution", "did you mean 'lognormal'"),
    ('parameter = "subsystems.room.dampnig"\ndistribution = "lognormal"\nfactor = 2.0', "uncertainty.x.parameter", "did you mean 'damping'"),
    ('parameter = "subsystems.rom.damping"\ndistribution = "lognormal"\nfactor = 2.0', "uncertainty.x.parameter", "did you mean 'room'"),
    ('parameter = "subsystems.room.kind"\ndistribution = "lognormal"\nfactor = 2.0', "uncertainty.x.parameter", "not a number"),
    ('parameter = "bands.lowest"\ndistribution = "lognormal"\nfactor = 2.0', "uncertainty.x.parameter", "cannot be varied"),
    ('parameter = "subsystems.room.damping"\ndistribution = "uniform"\ntolerance = 1.5', "uncertainty.x.tolerance", "< 1"),
    ('parameter = "subsystems.room.damping"\ndistribution = "uniform"', "uncertainty.x", "either tolerance"),
    ('parameter = "subsystems.room.damping"\ndistribution = "uniform"\nlow = 0.02\nhigh = 0.01', "uncertainty.x.high", "must be > low"),
    ('parameter = "subsystems.room.damping"\ndistribution = "uniform"\nlow = 0.01', "uncertainty.x.high", "missing"),
    ('parameter = "subsystems.room.damping"\ndistribution = "normal"\nsd = -1.0', "uncertainty.x.sd", ">= 0"),
    ('parameter = "subsystems.room.damping"\ndistribution = "normal"\nsd = 0.01', "uncertainty.x.sd", "lognormal"),
    ('parameter = "subsystems.room.damping"\ndistribution = "lognormal"\nfactor = 2.0\nsd = 1.0', "uncertainty.x.sd", "not used"),
    ('parameter = "subsystems.room.damping"\ndistribution = "lognormal"\nfactr = 2.0', "uncertainty.x.factr", "did you mean 'factor'"),
    ('parameter = 3\ndistribution = "lognormal"\nfactor = 2.0', "uncertainty.x.parameter", "must be a string"),
]


@pytest.mark.parametrize(("body", "where", "what"), BAD)
def test_bad_uncertainty_one_line_exit_2(tmp_path, capsys, body, where, what):
    path = tmp_path / "m.toml"
    path.write_text(ONE + "\n[uncertainty.x]\n" + body + "\n")
    code = main(["spread", str(path), "--samples", "5"])
    err = capsys.readouterr().err.strip().splitlines()
    assert code == 2
    assert len(err) == 1, err
    assert f"{where}:" in err[0] and what in err[0], err[0]


def test_low_high_needs_a_number_and_duplicates():
    text = COMPRESSOR + """
[uncertainty.a]
parameter = "subsystems.enclosure_air.damping"
distribution = "uniform"
low = 0.01
high = 0.02
[uncertainty.b]
parameter = "subsystems.walls.damping"
distribution = "lognormal"
factor = 1.2
[uncertainty.c]
parameter = "subsystems.walls.damping"
distribution = "lognormal"
factor = 1.3
"""
    with pytest.raises(InputError) as exc:
        read_uncertainty(_data(text))
    msgs = [str(p) for p in exc.value.problems]
    assert len(msgs) == 2
    assert "single-number parameter" in msgs[0]
    assert "already has the spread 'b'" in msgs[1]


def test_no_uncertainty_section(tmp_path, capsys):
    code = main(["spread", "models/compressor_enclosure.toml", "--samples", "5"])
    err = capsys.readouterr().err.strip().splitlines()
    assert code == 2 and len(err) == 1 and "nothing to vary" in err[0]


def test_progress_bar_writes_to_the_stream():
    import io

    buf = io.StringIO()
    bar = unc_mod._Progress(10, True, stream=buf)
    bar.update(10)
    assert "10/10" in buf.getvalue() and buf.getvalue().endswith("\n")
