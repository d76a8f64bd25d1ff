"""Parameter sweeps in one process: designs, the table, Sobol' indices, files, the command.

Outside checks:

* a single cavity with input power P and damping eta has E = P / (omega eta) (Lyon &
  DeJong 1995, Theory and Application of Statistical Energy Analysis, 2nd ed., the
  single-subsystem power balance), so its level falls by 10 lg(eta2 / eta1);
* a Latin hypercube has exactly one point in each of the n equal strata of every input
  (McKay, Beckman & Conover 1979, Technometrics 21(2), 239-245, section 2);
* the Ishigami function's Sobol' indices (Ishigami & Homma 1990; Saltelli et al. 2008,
  Global Sensitivity Analysis: The Primer, Wiley, p. 179 - 180: a = 7, b = 0.1 gives
  S1 = 0.3139, S2 = 0.4424, S3 = 0, ST3 = 0.2437), derived here from the closed-form
  variances and those checked by numerical quadrature (scipy.integrate).
"""

from __future__ import annotations

import tomllib
from pathlib import Path

import numpy as np
import pandas as pd
import pyarrow.parquet as pq
import pytest
from scipy import integrate

from seatool.analysis.sweep import (
    Parameter,
    SweepSpec,
    design,
    read_spec,
    saltelli_unit,
    sobol_indices,
    sobol_of,
    sweep,
    sweep_file,
    write_table,
)
from seatool.analysis.uncertainty import spread
from seatool.cli import main
from seatool.errors import InputError
from seatool.levels import CAUTION

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

OPERATOR = "models/operator_cab.toml"
TWO_ROOMS = "models/two_rooms.toml"


def _one(extra: str = "") -> dict:
    return tomllib.loads(ONE + extra)


# -- outside checks -------------------------------------------------------------------------


def test_damping_grid_follows_the_power_balance():
    # E = P / (omega eta): the level falls by 10 lg(eta / 0.01) (Lyon & DeJong 1995)
    spec = SweepSpec((Parameter("subsystems.room.damping", values=(0.01, 0.02, 0.05)),), "grid")
    s = sweep(_one(), spec, scheduler="serial")
    lv = s.levels[:, 0, :]
    drop = lv[0] - lv
    expect = 10 * np.log10(np.array([0.01, 0.02, 0.05]) / 0.01)
    np.testing.assert_allclose(drop, np.repeat(expect[:, None], lv.shape[1], axis=1), atol=1e-9)
    t = s.table()
    assert list(t["subsystems.room.damping"]) == [0.01, 0.02, 0.05]
    np.testing.assert_allclose(t["room.500Hz"], lv[:, 0])


def test_latin_hypercube_strata():
    # one point per stratum of every input (McKay et al. 1979)
    n = 16
    spec = SweepSpec(
        (
            Parameter("subsystems.room.damping", 0.01, 0.05),
            Parameter("subsystems.room.volume", 20.0, 80.0, scale="log"),
        ),
        "lhs",
        n,
        seed=4,
    )
    d = design(spec, _one())
    u0 = (d.values[:, 0] - 0.01) / 0.04
    u1 = np.log(d.values[:, 1] / 20.0) / np.log(4.0)
    for u in (u0, u1):
        assert sorted(np.floor(u * n).astype(int)) == list(range(n))


def _ishigami(x: np.ndarray, a: float = 7.0, b: float = 0.1) -> np.ndarray:
    return np.sin(x[:, 0]) + a * np.sin(x[:, 1]) ** 2 + b * x[:, 2] ** 4 * np.sin(x[:, 0])


def test_ishigami_closed_form_matches_the_published_indices():
    a, b, pi = 7.0, 0.1, np.pi
    # closed-form partial variances (Saltelli et al. 2008, The Primer, section 4.9)
    v1 = 0.5 * (1 + b * pi**4 / 5) ** 2
    v2 = a**2 / 8
    v13 = b**2 * pi**8 * (1 / 18 - 1 / 50)
    v = v1 + v2 + v13
    # the same by quadrature: V1 = Var_x1 E[Y | x1], V = Var Y (x uniform on [-pi, pi])
    e_x3_4 = integrate.quad(lambda t: t**4 / (2 * pi), -pi, pi)[0]
    e_sin2 = integrate.quad(lambda t: np.sin(t) ** 2 / (2 * pi), -pi, pi)[0]
    v1_q = integrate.quad(
        lambda t: (np.sin(t) * (1 + b * e_x3_4)) ** 2 / (2 * pi), -pi, pi
    )[0]
    ey2 = integrate.tplquad(
        lambda z, y, x: _ishigami(np.array([[x, y, z]]))[0] ** 2 / (2 * pi) ** 3,
        -pi, pi, -pi, pi, -pi, pi, epsabs=1e-6,
    )[0]  # fmt: skip
    ey = a * e_sin2  # E[sin x1] = 0
    assert v1_q == pytest.approx(v1, rel=1e-9)
    assert ey2 - ey**2 == pytest.approx(v, rel=1e-5)
    assert v1 / v == pytest.approx(0.3139, abs=5e-5)
    assert v2 / v == pytest.approx(0.4424, abs=5e-5)
    assert v13 / v == pytest.approx(0.2437, abs=5e-5)


def test_saltelli_estimator_on_ishigami():
    # published indices (Saltelli et al. 2008): S1, S2, S3 and the totals ST1 = S1 + S13,
    # ST2 = S2, ST3 = S13; 2^13 base points: Monte Carlo error about 0.01
    u = saltelli_unit(3, 2**13, seed=7)
    y = _ishigami(-np.pi + 2 * np.pi * u)
    si = sobol_of(y, 3, seed=7)
    np.testing.assert_allclose(si["S1"], [0.3139, 0.4424, 0.0], atol=0.03)
    np.testing.assert_allclose(si["ST"], [0.3139 + 0.2437, 0.4424, 0.2437], atol=0.03)
    assert np.all(si["S1_conf"] < 0.05)


# -- the designs ----------------------------------------------------------------------------


def test_grid_list_sobol_sizes_and_columns():
    p = (
        Parameter("subsystems.room.damping", 0.01, 0.04, points=3),
        Parameter("subsystems.room.volume", values=(20.0, 40.0)),
    )
    g = design(SweepSpec(p, "grid"), _one())
    assert g.values.shape == (6, 2)
    np.testing.assert_allclose(sorted(set(g.values[:, 0])), [0.01, 0.025, 0.04])
    lst = SweepSpec(
        (Parameter("subsystems.room.damping", values=(0.01, 0.02)),
         Parameter("subsystems.room.volume", values=(20.0, 40.0))), "list",
    )  # fmt: skip
    np.testing.assert_array_equal(design(lst, _one()).values, [[0.01, 20.0], [0.02, 40.0]])
    sob = design(SweepSpec(p[:1], "sobol", 8, seed=1), _one())
    assert sob.values.shape == (8, 1) and np.all((sob.values >= 0.01) & (sob.values <= 0.04))
    # a spectrum is scaled as a whole: its column is a factor
    f = design(SweepSpec((Parameter("excitations.src.power", 0.5, 2.0),), "lhs", 4), _one())
    assert f.columns == ("excitations.src.power",)  # a number in this file
    sal = design(SweepSpec(p[:1], "saltelli", 4), _one())
    assert sal.values.shape == (4 * 3, 1)


def test_spectrum_factor():
    data = tomllib.loads(
        ONE.replace("damping = 0.01", "damping = { band_hz = [500, 630, 800, 1000], "
                    "values = [0.01, 0.01, 0.02, 0.02] }")
    )  # fmt: skip
    spec = SweepSpec((Parameter("subsystems.room.damping", values=(1.0, 2.0)),), "list")
    s = sweep(data, spec, scheduler="serial")
    assert s.design.columns == ("subsystems.room.damping:factor",)
    np.testing.assert_allclose(s.levels[0, 0] - s.levels[1, 0], 10 * np.log10(2.0), atol=1e-9)


def test_uncertainty_design_reproduces_the_monte_carlo_spread():
    data = tomllib.loads(Path(TWO_ROOMS).read_text())
    sp = spread(data, samples=6, seed=11, force_rebuild=True, progress=False)
    s = sweep(data, SweepSpec(method="uncertainty", samples=6, seed=11,
                              receivers=("source_room", "receiving_room")), scheduler="serial")  # fmt: skip
    idx = [sp.model.names.index(r) for r in s.receivers]
    np.testing.assert_allclose(s.levels, sp.levels()[:, idx, :], atol=1e-12)


def test_table_has_margins_and_dba():
    spec = SweepSpec((Parameter("subsystems.cab_air.damping", 0.02, 0.1),), "lhs", 3, seed=2)
    s = sweep_file(OPERATOR, spec, scheduler="serial")
    t = s.table()
    assert {"cab_air.dB", "cab_air.dBA", "operator_ear.margin", "operator_ear.met"} <= set(t)
    # margin = limit - level (72 dB(A) limit and 77 dB per band, models/operator_cab.toml)
    bands = [c for c in t if c.startswith("cab_air.") and c.endswith("Hz")]
    smallest = np.minimum(72.0 - t["cab_air.dBA"], (77.0 - t[bands]).min(axis=1))
    np.testing.assert_allclose(t["operator_ear.margin"], smallest, atol=1e-9)
    assert list(t["operator_ear.met"]) == list(smallest >= 0)


def test_sobol_indices_of_an_additive_model():
    # p^2 = rho c^2 E / V and E = P / (omega eta) (Lyon & DeJong 1995): the level is
    # L0 - 10 lg eta - 10 lg V, additive in ln eta and ln V; both log-uniform over a factor
    # of 4 have equal variance, so S1 = ST = 1/2 for each (Sobol' decomposition of an
    # additive function: no interaction term)
    spec = SweepSpec(
        (Parameter("subsystems.room.damping", 0.01, 0.04, scale="log"),
         Parameter("subsystems.room.volume", 20.0, 80.0, scale="log")),
        "saltelli", 128, seed=3,
    )  # fmt: skip
    si = sobol_indices(sweep(_one(), spec, scheduler="serial"), metric="dB")
    assert list(si["parameter"]) == ["subsystems.room.damping", "subsystems.room.volume"]
    np.testing.assert_allclose(si["S1"], 0.5, atol=0.08)
    np.testing.assert_allclose(si["ST"], 0.5, atol=0.08)


# -- files and the command ------------------------------------------------------------------


def test_write_parquet_and_csv(tmp_path):
    spec = SweepSpec((Parameter("subsystems.room.damping", values=(0.01, 0.02)),), "list")
    s = sweep(_one(), spec, scheduler="serial")
    pq_path = write_table(s, tmp_path / "s.parquet")
    tab = pq.read_table(pq_path)
    assert tab.schema.metadata[b"seatool.caution"].decode() == CAUTION
    assert b"room" in tab.schema.metadata[b"seatool.levels"]
    pd.testing.assert_frame_equal(tab.to_pandas(), s.table())
    csv = write_table(s, tmp_path / "s.csv")
    assert csv.read_text().startswith("# Caution: " + CAUTION)
    back = pd.read_csv(csv, comment="#")
    np.testing.assert_allclose(back["room.dB"], s.table()["room.dB"], rtol=1e-9)


def test_read_spec(tmp_path):
    f = tmp_path / "sweep.toml"
    f.write_text('method = "grid"\nseed = 2\n[vary."subsystems.room.damping"]\n'
                 'low = 0.01\nhigh = 0.04\npoints = 4\nscale = "log"\n')  # fmt: skip
    spec = read_spec(f)
    assert spec.method == "grid" and spec.seed == 2
    assert spec.parameters == (Parameter("subsystems.room.damping", 0.01, 0.04, None, 4, "log"),)
    f.write_text('methd = "grid"\n[vary."a.b"]\nlow = 1\nhih = 2\n')
    with pytest.raises(InputError) as e:
        read_spec(f)
    text = str(e.value)
    assert "did you mean 'method'" in text and "did you mean 'high'" in text
    f.write_text('samples = "many"\nvary = 3\n')
    with pytest.raises(InputError) as e:
        read_spec(f)
    assert [p.path for p in e.value.problems] == ["vary", "samples"]


def test_command(tmp_path, capsys):
    model = tmp_path / "one.toml"
    model.write_text(ONE)
    out = tmp_path / "t.csv"
    code = main(["sweep", str(model), "--vary", "subsystems.room.damping=0.01:0.04:log",
                 "--method", "grid", "--points", "3", "--scheduler", "serial", "--out", str(out),
                 "--plot", str(tmp_path / "p.png"), "--matrix", str(tmp_path / "m.png")])  # fmt: skip
    text = capsys.readouterr().out
    assert code == 0
    assert "grid, 3 evaluations" in text and CAUTION in text
    t = pd.read_csv(out, comment="#")
    np.testing.assert_allclose(t["subsystems.room.damping"], [0.01, 0.02, 0.04])
    assert (tmp_path / "p.png").stat().st_size > 0 and (tmp_path / "m.png").stat().st_size > 0


@pytest.mark.parametrize(
    ("argv", "what"),
    [
        (["--vary", "subsystems.room.dampin=0.01:0.02"], "did you mean 'damping'"),
        (["--vary", "subsystems.room.damping=0.02:0.01"], "must be below high"),
        (["--vary", "subsystems.room.damping=a:b"], "numbers expected"),
        (["--vary", "subsystems.room.damping=0.01:0.02", "--method", "sobol", "--samples", "5"],
         "power of 2"),
        (["--vary", "subsystems.room.damping=-1:0.02"], "sample 0"),
        (["--method", "uncertainty"], "nothing to vary"),
        (["--vary", "subsystems.room.damping=0.01:0.02", "--receiver", "rom"], "did you mean"),
        (["--vary", "subsystems.room.damping=0.01:0.02", "--workers", "0"], "--workers"),
        (["--vary", "subsystems.room.damping=0.01:0.02", "--sobol-csv", "x.csv"], "saltelli"),
    ],
)  # fmt: skip
def test_bad_input_one_line_exit_2(tmp_path, capsys, argv, what):
    model = tmp_path / "one.toml"
    model.write_text(ONE)
    out = tmp_path / "t.csv"
    code = main(["sweep", str(model), "--scheduler", "serial", "--out", str(out), *argv])
    err = capsys.readouterr().err
    assert code == 2
    assert what in err and "Traceback" not in err
    assert len(err.strip().splitlines()) == 1
    assert not out.exists()  # nothing half-written
