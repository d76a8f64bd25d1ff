"""Contributions, connection powers and path powers add up to the solved totals.

Reference: the power balance itself (Vigran 2008, Building Acoustics, sec. 7, eqs.
7.4-7.7), solved here by a brute-force dense solve (numpy.linalg.solve of the full
matrix with held rows replaced by identities), independent of the analysis code.
"""

from __future__ import annotations

import glob

import numpy as np
import pytest

import seatool
from seatool.analysis.paths import (
    OTHER_PATHS,
    connection_powers,
    contributions,
    path_ranking,
    paths,
)
from seatool.bands import BandAxis
from seatool.model import Connection, Excitation, Model, Subsystem

MODELS = sorted(glob.glob("models/*.toml"))


def _structure(name, bands, n, eta, mass=1.0):
    nb = len(bands)
    return Subsystem(name, "structure", np.full(nb, n), np.full(nb, eta), quantity="velocity", mass=mass)


def brute_force(model: Model) -> np.ndarray:
    """Energies (N, B) by a dense solve of the full balance (held rows -> identity)."""
    idx = model.index()
    n, nb = len(model.subsystems), len(model.bands)
    out = np.zeros((n, nb))
    sink = [s.sink for s in model.subsystems]
    for j in range(nb):
        lmat = np.zeros((n, n))
        for i, s in enumerate(model.subsystems):
            lmat[i, i] = 0.0 if s.sink else s.damping[j]
        for c in model.connections:
            a, b = idx[c.a], idx[c.b]
            eab = c.coupling_loss_factor[j]
            eba = 0.0 if sink[b] else eab * model.subsystems[a].modal_density[j] / model.subsystems[b].modal_density[j]
            lmat[a, a] += eab
            lmat[b, b] += eba
            lmat[b, a] -= eab
            lmat[a, b] -= eba
        rhs = np.zeros(n)
        held = list(np.flatnonzero(sink))
        for e in model.excitations:
            i = idx[e.subsystem]
            if e.drive == "power":
                rhs[i] += e.power[j] / model.bands.omega[j]
            else:
                held.append(i)
                rhs[i] = e.energy[j]
        for i in held:
            lmat[i] = 0.0
            lmat[i, i] = 1.0
            if sink[i]:
                rhs[i] = 0.0
        out[:, j] = np.linalg.solve(lmat, rhs)
    return out


@pytest.fixture
def mixed() -> Model:
    """Five subsystems in a ring with a chord, a held level, two powers and a sink."""
    bands = BandAxis.from_range(250, 2000)
    nb = len(bands)
    subs = (
        _structure("a", bands, 2.0, 0.01),
        _structure("b", bands, 0.5, 0.02),
        _structure("c", bands, 1.0, 0.005),
        _structure("d", bands, 3.0, 0.01),
        _structure("e", bands, 0.8, 0.03),
        Subsystem("out", "exterior", np.full(nb, np.inf), np.zeros(nb), sink=True),
    )
    cons = (
        Connection("ab", "a", "b", np.linspace(1e-3, 3e-3, nb)),
        Connection("bc", "b", "c", np.full(nb, 2e-3)),
        Connection("cd", "c", "d", np.full(nb, 1e-3)),
        Connection("de", "d", "e", np.full(nb, 4e-3)),
        Connection("ea", "e", "a", np.full(nb, 5e-4)),
        Connection("ac", "a", "c", np.full(nb, 2e-4)),
        Connection("ac2", "a", "c", np.full(nb, 1e-4)),  # parallel connection
        Connection("rad", "d", "out", np.full(nb, 1e-3)),
    )
    exc = (
        Excitation("p1", "a", "power", power=np.full(nb, 1e-2)),
        Excitation("p2", "a", "power", power=np.linspace(1e-3, 5e-3, nb)),
        Excitation("held", "e", "prescribed", energy=np.full(nb, 2e-5)),
        Excitation("p3", "c", "power", power=np.full(nb, 3e-3)),
    )
    return Model(bands, subs, cons, exc)


def test_brute_force_matches_core_solve(mixed):
    # the reference used below agrees with the core solver (two independent codes)
    e = seatool.run(mixed).energy
    np.testing.assert_allclose(brute_force(mixed), e, rtol=1e-12, atol=0)


@pytest.mark.parametrize("receiver", ["a", "b", "c", "d", "e"])
def test_contributions_sum_to_total(mixed, receiver):
    total = brute_force(mixed)[mixed.index()[receiver]]
    c = contributions(mixed, receiver)
    assert set(c["source"]) == {"p1", "p2", "held", "p3"}
    s = c.groupby("band_exact_hz", sort=True)["energy_J"].sum().to_numpy()
    np.testing.assert_allclose(s, total, rtol=1e-9)
    np.testing.assert_allclose(c.groupby("band_exact_hz")["share"].sum().to_numpy(), 1.0, rtol=1e-9)


def test_held_receiver_is_its_own_source(mixed):
    c = contributions(mixed, "e")
    held = c[c["source"] == "held"]
    np.testing.assert_allclose(held["energy_J"], 2e-5, rtol=1e-12)
    assert (c[c["source"] != "held"]["energy_J"] == 0).all()


def test_source_drive_column_names_how_each_source_is_driven(mixed):
    # the fixture's excitations: p1, p2, p3 inject power, "held" prescribes e's energy
    want = {"p1": "power", "p2": "power", "p3": "power", "held": "held level"}
    c = contributions(mixed, "c")
    assert dict(zip(c["source"], c["source_drive"], strict=True)) == want
    p = paths(mixed, "c")
    assert set(zip(p["source"], p["source_drive"], strict=True)) <= set(want.items())
    assert "source_kind" not in c.columns and "source_kind" not in p.columns


def test_sink_receiver_absorbed_power_sums(mixed):
    res = seatool.run(mixed)
    c = contributions(mixed, "out")
    s = c.groupby("band_exact_hz")["power_W"].sum().to_numpy()
    np.testing.assert_allclose(s, res.solution.dissipated_power[mixed.index()["out"]], rtol=1e-9)
    p = paths(mixed, "out")
    np.testing.assert_allclose(p.groupby("band_exact_hz")["share"].sum().to_numpy(), 1.0, rtol=1e-9)


@pytest.mark.parametrize("receiver", ["a", "b", "c", "d", "e", "out"])
def test_connection_powers_sum_to_dissipated(mixed, receiver):
    res = seatool.run(mixed)
    t = connection_powers(res, receiver)
    s = t.groupby("band_exact_hz")["power_in_W"].sum().to_numpy()
    d = res.solution.dissipated_power[mixed.index()[receiver]]
    np.testing.assert_allclose(s, d, rtol=1e-9)


@pytest.mark.parametrize("receiver", ["b", "c", "d"])
def test_path_shares_sum_to_one_and_energy_to_total(mixed, receiver):
    p = paths(mixed, receiver)
    total = brute_force(mixed)[mixed.index()[receiver]]
    np.testing.assert_allclose(p.groupby("band_exact_hz")["energy_J"].sum().to_numpy(), total, rtol=1e-9)
    np.testing.assert_allclose(p.groupby("band_exact_hz")["share"].sum().to_numpy(), 1.0, rtol=1e-9)
    # per source, path powers add up to the source's arrival (source_share sums to 1)
    ss = p.groupby(["band_exact_hz", "source"])["source_share"].sum().to_numpy()
    np.testing.assert_allclose(ss, 1.0, rtol=1e-9)
    assert (p.groupby("band_exact_hz")["rank"].min() == 1).all()


def test_short_path_limit_keeps_the_sum(mixed):
    p = paths(mixed, "d", max_length=1)
    assert OTHER_PATHS in set(p["path"])
    np.testing.assert_allclose(p.groupby("band_exact_hz")["share"].sum().to_numpy(), 1.0, rtol=1e-9)


def test_triangle_path_powers_by_hand():
    """Source s0, receiver s2, paths s0>s2 and s0>s1>s2: proportional sharing by hand."""
    bands = BandAxis.from_range(1000, 1000)
    subs = tuple(_structure(f"s{i}", bands, n, eta) for i, (n, eta) in enumerate([(1.0, 0.01), (0.5, 0.02), (2.0, 0.01)]))
    cons = (
        Connection("01", "s0", "s1", np.array([3e-3])),
        Connection("12", "s1", "s2", np.array([2e-3])),
        Connection("02", "s0", "s2", np.array([1e-3])),
    )
    m = Model(bands, subs, cons, (Excitation("src", "s0", "power", power=np.array([1.0])),))
    e = brute_force(m)[:, 0]
    w = m.bands.omega[0]
    n = [1.0, 0.5, 2.0]
    flow = lambda a, b, eta: w * eta * n[a] * (e[a] / n[a] - e[b] / n[b])  # noqa: E731  (Vigran eq. 7.5 form)
    w01, w12, w02 = flow(0, 1, 3e-3), flow(1, 2, 2e-3), flow(0, 2, 1e-3)
    assert w01 > 0 and w12 > 0 and w02 > 0
    inflow1 = w01  # s1 gets power only from s0
    expected = {"s0 > s2": w02, "s0 > s1 > s2": w01 * w12 / inflow1}
    p = paths(m, "s2")
    got = dict(zip(p["path"], p["path_power_W"], strict=True))
    assert set(got) == set(expected)
    for k, v in expected.items():
        assert got[k] == pytest.approx(v, rel=1e-12)
    assert sum(got.values()) == pytest.approx(w02 + w12, rel=1e-12)
    rk = path_ranking(p)
    assert rk["share"].sum() == pytest.approx(1.0, rel=1e-12)


def test_source_free_receiver():
    bands = BandAxis.from_range(500, 1000)
    nb = len(bands)
    subs = (_structure("a", bands, 1.0, 0.01), _structure("b", bands, 1.0, 0.01), _structure("lonely", bands, 1.0, 0.01))
    cons = (Connection("ab", "a", "b", np.full(nb, 1e-3)),)
    m = Model(bands, subs, cons, (Excitation("src", "a", "power", power=np.full(nb, 1.0)),))
    c = contributions(m, "lonely")
    assert (c["energy_J"] == 0).all() and (c["share"] == 0).all()
    assert np.isneginf(c["level_dB"]).all()
    p = paths(m, "lonely")
    assert p.empty
    assert path_ranking(p).empty
    t = connection_powers(seatool.run(m), "lonely")
    assert (t["power_in_W"] == 0).all()


@pytest.mark.parametrize("path", MODELS)
def test_shipped_models_add_up(path):
    m = seatool.load(path)
    res = seatool.run(m)
    for i, s in enumerate(m.subsystems):
        if s.sink:
            continue
        c = contributions(m, s.name)
        np.testing.assert_allclose(c.groupby("band_exact_hz")["energy_J"].sum().to_numpy(), res.energy[i], rtol=1e-9)
        t = connection_powers(res, s.name)
        np.testing.assert_allclose(
            t.groupby("band_exact_hz")["power_in_W"].sum().to_numpy(), res.solution.dissipated_power[i], rtol=1e-9, atol=0
        )
        p = paths(m, s.name)
        got = p.groupby("band_exact_hz")["energy_J"].sum().reindex(m.bands.centre, fill_value=0.0).to_numpy()
        np.testing.assert_allclose(got, res.energy[i], rtol=1e-9)
        assert {"modes_in_band", "modal_overlap", "valid"} <= set(p.columns)


def test_validity_flag_from_physics(mixed):
    # modes in band N = n Delta_f, overlap M = eta_total f n (Lyon & DeJong 1995, Theory and Application of SEA, 2nd ed., from memory)
    c = contributions(mixed, "b")
    one = c[c["source"] == "p1"]
    bands = mixed.bands
    np.testing.assert_allclose(one["modes_in_band"], 0.5 * bands.width)
    eta_total = 0.02 + np.linspace(1e-3, 3e-3, len(bands)) * 2.0 / 0.5 + 2e-3
    np.testing.assert_allclose(one["modal_overlap"], eta_total * bands.centre * 0.5, rtol=1e-12)
    assert list(one["valid"]) == list((0.5 * bands.width >= 1) & (eta_total * bands.centre * 0.5 >= 1))
