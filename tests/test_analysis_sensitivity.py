"""Adjoint sensitivities equal central finite differences of full solves.

Reference: central finite differences (step h = 1e-4 in ln x, truncation O(h^2)) of
complete solves by the core solver, an independent numerical method. Tolerance: 1e-6 dB
per unit ln x, as asked of the analysis.
"""

from __future__ import annotations

import dataclasses as dc
import glob
import tomllib
from pathlib import Path

import numpy as np
import pytest

import seatool
from seatool.analysis._keypath import resolve, with_value
from seatool.analysis.sensitivity import (
    add_levels,
    gradients,
    parameter_sensitivities,
    ranking,
    sensitivities,
)
from seatool.bands import BandAxis
from seatool.errors import InputError
from seatool.model import Connection, Excitation, Model, Subsystem
from seatool.modelfile import build

MODELS = sorted(glob.glob("models/*.toml"))
H = 1e-4
TOL_DB = 1e-6


def levels(model: Model) -> np.ndarray:
    """Band levels (N, B); the sink's minus infinity replaced by NaN (no level)."""
    lv, _, _ = seatool.run(model).level_array()
    return np.where(np.isfinite(lv), lv, np.nan)


def _scale_sub(m, i, field, f):
    subs = list(m.subsystems)
    subs[i] = dc.replace(subs[i], **{field: getattr(subs[i], field) * f})
    return dc.replace(m, subsystems=tuple(subs))


def _scale_con(m, i, f):
    cons = list(m.connections)
    cons[i] = dc.replace(cons[i], coupling_loss_factor=cons[i].coupling_loss_factor * f)
    return dc.replace(m, connections=tuple(cons))


def _scale_exc(m, i, f):
    exs = list(m.excitations)
    e = exs[i]
    exs[i] = dc.replace(e, power=e.power * f) if e.drive == "power" else dc.replace(e, energy=e.energy * f)
    return dc.replace(m, excitations=tuple(exs))


def finite_differences(m: Model) -> dict[str, np.ndarray]:
    """dL/d ln x (N, B) for every model quantity by central differences of full solves."""
    out = {}
    ep, em = np.exp(H), np.exp(-H)
    for i, s in enumerate(m.subsystems):
        if s.sink:
            continue
        for field, key in (("damping", "damping"), ("modal_density", "modal_density")):
            out[f"{key}:{s.name}"] = (levels(_scale_sub(m, i, field, ep)) - levels(_scale_sub(m, i, field, em))) / (2 * H)
    for i, c in enumerate(m.connections):
        out[f"coupling:{c.name}"] = (levels(_scale_con(m, i, ep)) - levels(_scale_con(m, i, em))) / (2 * H)
    for i, e in enumerate(m.excitations):
        key = "power" if e.drive == "power" else "held_level"
        out[f"{key}:{e.name}"] = (levels(_scale_exc(m, i, ep)) - levels(_scale_exc(m, i, em))) / (2 * H)
    return out


def _check_against_fd(m: Model) -> None:
    fd = finite_differences(m)
    checked = 0
    for r, s in enumerate(m.subsystems):
        if s.sink:
            continue
        t = sensitivities(m, s.name)
        assert set(t["parameter"]) == set(fd)
        for name, d in fd.items():
            got = t[t["parameter"] == name]["dL_dlnx_dB"].to_numpy()
            ok = np.isfinite(d[r])
            np.testing.assert_allclose(got[ok], d[r][ok], rtol=0, atol=TOL_DB, err_msg=f"{s.name} {name}")
            checked += 1
    assert checked > 0


@pytest.fixture
def mixed() -> Model:
    bands = BandAxis.from_range(250, 1000)
    nb = len(bands)

    def st(name, n, eta, mass=2.0):
        return Subsystem(name, "structure", np.full(nb, n), np.full(nb, eta), quantity="velocity", mass=mass)

    subs = (
        st("a", 2.0, 0.01),
        st("b", 0.5, 0.02),
        st("c", 1.0, 0.005),
        st("d", 3.0, 0.01),
        Subsystem("room", "cavity", np.linspace(1, 4, nb), np.full(nb, 0.01), quantity="sound_pressure", volume=20.0, density=1.2, sound_speed=343.0),
        Subsystem("out", "exterior", np.full(nb, np.inf), np.zeros(nb), sink=True),
    )
    cons = (
        Connection("ab", "a", "b", np.linspace(1e-3, 3e-3, nb)),
        Connection("bc", "b", "c", np.full(nb, 2e-3)),
        Connection("cd", "c", "d", np.full(nb, 1e-3)),
        Connection("ac", "a", "c", np.full(nb, 2e-4)),
        Connection("d_room", "d", "room", np.full(nb, 5e-4)),
        Connection("c_room", "c", "room", np.full(nb, 2e-4)),
        Connection("rad", "d", "out", np.full(nb, 1e-3)),
    )
    exc = (
        Excitation("p1", "a", "power", power=np.full(nb, 1e-2)),
        Excitation("held", "b", "prescribed", energy=np.full(nb, 2e-5)),
    )
    return Model(bands, subs, cons, exc)


def test_adjoint_matches_fd_mixed(mixed):
    _check_against_fd(mixed)


@pytest.mark.parametrize("path", MODELS)
def test_adjoint_matches_fd_shipped(path):
    _check_against_fd(seatool.load(path))


def _numeric_leaves(data, prefix=""):
    for k, v in data.items():
        p = f"{prefix}.{k}" if prefix else k
        if isinstance(v, dict):
            if "values" in v and "band_hz" in v:
                yield p
            else:
                yield from _numeric_leaves(v, p)
        elif isinstance(v, float) and not isinstance(v, bool) and v > 0:
            yield p
        elif isinstance(v, list) and v and all(isinstance(x, float) and x > 0 for x in v):
            yield p


#: Parameters per model in the physical-parameter check (model building can take ~0.5 s).
MAX_PARAMS = 4
H_PHYS = 1e-5  # smaller step: derived physics may have kinks (band switches) nearby


@pytest.mark.parametrize("path", MODELS)
def test_physical_parameters_match_fd_shipped(path):
    data = tomllib.loads(Path(path).read_text())
    base = Path(path).parent
    m0 = build(data, file=path, base_dir=base)
    cands = []
    for sec in ("subsystems", "connections", "excitations"):
        cands += [p for p in _numeric_leaves({sec: data.get(sec, {})}) if resolve(data, p)[1] is None]
    # an even spread over the candidates, deterministic
    picks = [cands[int(k)] for k in np.unique(np.linspace(0, len(cands) - 1, 2 * MAX_PARAMS).astype(int))]
    usable = []
    for p in picks:
        try:
            mp = build(with_value(data, p, lambda v: v * np.exp(H_PHYS)), file=path, base_dir=base)
            mm = build(with_value(data, p, lambda v: v * np.exp(-H_PHYS)), file=path, base_dir=base)
        except InputError:
            continue  # e.g. an integer count; not a continuous parameter
        if mp.names != m0.names:
            continue
        usable.append((p, levels(mp), levels(mm)))
        if len(usable) == MAX_PARAMS:
            break
    assert usable, "no continuous parameter found"
    receivers = [s.name for s in m0.subsystems if not s.sink]
    t = parameter_sensitivities(
        data, receivers, [u[0] for u in usable], file=path, base_dir=base, step=H_PHYS, model=m0
    )
    for r, name in enumerate(m0.names):
        if name not in receivers:
            continue
        for p, lp, lm in usable:
            fd = (lp[r] - lm[r]) / (2 * H_PHYS)
            sel = t[(t["parameter"] == p) & (t["receiver"] == name)]
            got = sel["dL_dlnx_dB"].to_numpy()
            ok = np.isfinite(fd)
            np.testing.assert_allclose(got[ok], fd[ok], rtol=0, atol=TOL_DB, err_msg=f"{path} {name} {p}")


def test_units_and_identities(mixed):
    t = sensitivities(mixed, "room")
    # dB per dB = (ln 10 / 10) dB per unit ln x, dB per percent = dB per unit ln x / 100
    np.testing.assert_allclose(t["db_per_db"], t["dL_dlnx_dB"] * np.log(10) / 10)
    np.testing.assert_allclose(t["db_per_percent"], t["dL_dlnx_dB"] / 100)
    # E_r is homogeneous of degree 1 in the sources (superposition): elasticities sum to 1
    src = t[t["parameter_type"].isin(["power", "held_level"])].groupby("band_hz")["db_per_db"].sum()
    np.testing.assert_allclose(src.to_numpy(), 1.0, rtol=1e-12)
    # with power sources only, E_r is homogeneous of degree -1 in all loss factors
    # together (omega L E = P); a held level breaks this (its energy stays fixed)
    powered = dc.replace(mixed, excitations=mixed.excitations[:1])
    t = sensitivities(powered, "room")
    lf = t[t["parameter_type"].isin(["damping", "coupling"])].groupby("band_hz")["db_per_db"].sum()
    np.testing.assert_allclose(lf.to_numpy(), -1.0, rtol=1e-12)
    # and of degree 0 in all modal densities together (only ratios n_a / n_b enter)
    md = t[t["parameter_type"] == "modal_density"].groupby("band_hz")["db_per_db"].sum()
    np.testing.assert_allclose(md.to_numpy(), 0.0, atol=1e-12)


def test_held_receiver(mixed):
    t = sensitivities(mixed, "b")
    own = t[t["parameter"] == "held_level:held"]["db_per_db"].to_numpy()
    np.testing.assert_allclose(own, 1.0)
    assert (t[t["parameter"] != "held_level:held"]["db_per_db"] == 0).all()


def test_reuse_of_result_gives_the_same(mixed):
    res = seatool.run(mixed)
    g1 = gradients(mixed, "room")
    g2 = gradients(mixed, "room", result=res)
    np.testing.assert_allclose(g1.damping, g2.damping, rtol=1e-12, atol=0)
    np.testing.assert_allclose(g1.energy, res.energy, rtol=1e-12, atol=0)


def test_ranking_overall_is_energy_weighted(mixed):
    t = add_levels(sensitivities(mixed, "room"), mixed)
    rk = ranking(t)
    assert list(rk["rank"]) == list(range(1, len(rk) + 1))
    assert rk["overall_db_per_db"].abs().is_monotonic_decreasing
    # the overall-level derivative by finite differences of the band-summed level
    lv0 = t[t["parameter"] == "damping:a"]["level_dB"].to_numpy()
    w = 10 ** (lv0 / 10)
    s = t[t["parameter"] == "damping:a"]["db_per_db"].to_numpy()
    got = float(rk[rk["parameter"] == "damping:a"]["overall_db_per_db"].iloc[0])
    assert got == pytest.approx(float(np.sum(w * s) / w.sum()), rel=1e-12)


def test_source_free_receiver_gives_nan():
    bands = BandAxis.from_range(500, 1000)
    nb = len(bands)
    subs = tuple(Subsystem(n, "structure", np.ones(nb), np.full(nb, 0.01), quantity="velocity", mass=1.0) for n in ("a", "b", "lonely"))
    m = Model(bands, subs, (Connection("ab", "a", "b", np.full(nb, 1e-3)),), (Excitation("src", "a", "power", power=np.ones(nb)),))
    t = sensitivities(m, "lonely")
    assert t["db_per_db"].isna().all()


def test_bad_receiver_and_parameter(mixed):
    with pytest.raises(InputError, match="did you mean 'room'"):
        sensitivities(mixed, "rom")
    with pytest.raises(InputError, match="exterior sink"):
        sensitivities(mixed, "out")
    data = tomllib.loads(Path("models/compressor_enclosure.toml").read_text())
    with pytest.raises(InputError, match="did you mean 'volume'"):
        parameter_sensitivities(data, "workshop_air", ["subsystems.workshop_air.volum"])
    with pytest.raises(InputError, match="boolean|not a number"):
        parameter_sensitivities(data, "workshop_air", ["subsystems.walls.kind"])


def test_iterative_route_matches_fd(mixed, monkeypatch):
    # The adjoint solved by the batched iterative route (as the forward solve of large
    # models) against central differences of full solves by sparse LU.
    import importlib

    solve_mod = importlib.import_module("seatool.solve")
    fd = finite_differences(mixed)
    monkeypatch.setattr(solve_mod, "ITERATIVE_ABOVE", 0)
    assert solve_mod.solve(mixed).method == "iterative"
    for r, s in enumerate(mixed.subsystems):
        if s.sink:
            continue
        t = sensitivities(mixed, s.name)
        for name, d in fd.items():
            got = t[t["parameter"] == name]["dL_dlnx_dB"].to_numpy()
            ok = np.isfinite(d[r])
            np.testing.assert_allclose(got[ok], d[r][ok], rtol=0, atol=TOL_DB, err_msg=f"{s.name} {name}")


def test_iterative_route_matches_fd_on_a_lattice(monkeypatch):
    # 5 x 5 x 4 lattice of subsystems (more unknowns than ITERATIVE_ABOVE, so the solver
    # and the adjoint take the iterative route); finite differences by sparse LU solves.
    import importlib

    solve_mod = importlib.import_module("seatool.solve")
    rng = np.random.default_rng(2)
    bands = BandAxis.from_range(250, 1000)
    nb = len(bands)
    shape = (5, 5, 4)
    idx = np.arange(100).reshape(shape)
    subs = tuple(
        Subsystem(f"s{i}", "structure", rng.uniform(0.1, 10, nb), rng.uniform(1e-3, 2e-2, nb), quantity="velocity", mass=1.0)
        for i in range(100)
    )
    pairs = [(int(a), int(b)) for ax in range(3) for a, b in zip(np.take(idx, range(shape[ax] - 1), axis=ax).ravel(), np.take(idx, range(1, shape[ax]), axis=ax).ravel(), strict=True)]
    cons = tuple(Connection(f"c{k}", f"s{a}", f"s{b}", rng.uniform(1e-4, 3e-3, nb)) for k, (a, b) in enumerate(pairs))
    m = Model(bands, subs, cons, (Excitation("p", "s0", "power", power=np.full(nb, 1e-3)),))
    assert solve_mod.solve(m).method == "iterative"
    t = sensitivities(m, "s37")
    monkeypatch.setattr(solve_mod, "ITERATIVE_ABOVE", 10**9)
    ep, em = np.exp(H), np.exp(-H)
    r = 37
    checks = [(f"damping:s{i}", lambda f, i=i: _scale_sub(m, i, "damping", f)) for i in (0, 1, 36, 37, 99)]
    checks += [(f"coupling:c{k}", lambda f, k=k: _scale_con(m, k, f)) for k in (0, 5, 50, 100, 200)]
    checks += [("modal_density:s12", lambda f: _scale_sub(m, 12, "modal_density", f))]
    for name, vary in checks:
        d = (levels(vary(ep))[r] - levels(vary(em))[r]) / (2 * H)
        got = t[t["parameter"] == name]["dL_dlnx_dB"].to_numpy()
        np.testing.assert_allclose(got, d, rtol=0, atol=TOL_DB, err_msg=name)
