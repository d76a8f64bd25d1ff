"""The power balance: hand-solved systems, conservation, reciprocity, invariances."""

from __future__ import annotations

import numpy as np
import pytest
from conftest import chain_model, structure

import seatool
from seatool.bands import BandAxis
from seatool.model import Connection, Excitation, Model, Subsystem
from seatool.solve import SolveError, assemble, solve


def test_two_subsystems_hand_solved(one_band):
    # Closed form of the 2x2 power balance (Lyon & DeJong 1995, sec. 3.2; Vigran 2008,
    # eqs. 7.4-7.7): E2 = eta12 E1/(eta2 + eta21), E1 = P/(w(eta1 + eta12 - eta12 eta21/(eta2 + eta21))).
    n1, n2, eta1, eta2, eta12, p = 0.3, 0.7, 0.01, 0.02, 0.004, 1e-3
    m = chain_model(one_band, [n1, n2], [eta1, eta2], [eta12], p)
    e = solve(m).energy[:, 0]
    w = 2 * np.pi * 1000.0
    eta21 = eta12 * n1 / n2
    e1 = p / (w * (eta1 + eta12 - eta12 * eta21 / (eta2 + eta21)))
    e2 = eta12 * e1 / (eta2 + eta21)
    np.testing.assert_allclose(e, [e1, e2], rtol=1e-12)


@pytest.mark.regression
def test_two_plates_worked_example():
    # Regression values computed by hand outside the code (not published):
    # two 1 mm steel plates, 1 m^2 and 1.5 m^2, L-junction eta12 = 3.3493e-3 at 1 kHz,
    # eta = 0.01 each, 1 mW into plate 1 -> E1 = 1.2495e-5 J, E2 = 3.4209e-6 J.
    bands = BandAxis.from_range(1000, 1000)
    n1 = 0.31945
    m = chain_model(bands, [n1, 1.5 * n1], [0.01, 0.01], [3.3493e-3], 1e-3)
    e = solve(m).energy[:, 0]
    np.testing.assert_allclose(e, [1.2495e-5, 3.4209e-6], rtol=2e-4)


def test_three_subsystem_chain_hand_solved(one_band):
    # Closed-form elimination of a 1-2-3 chain (power into 1), derived by hand from the
    # power balance equations (Lyon & DeJong 1995, eq. 3.2.x form).
    n = [0.2, 1.0, 5.0]
    eta = [0.02, 0.005, 0.01]
    e12, e23 = 0.003, 0.001
    p = 2e-3
    m = chain_model(one_band, n, eta, [e12, e23], p)
    w = 2 * np.pi * 1000.0
    e21, e32 = e12 * n[0] / n[1], e23 * n[1] / n[2]
    r3 = e23 / (eta[2] + e32)  # E3 = r3 E2
    r2 = e12 / (eta[1] + e21 + e23 - e32 * r3)  # E2 = r2 E1
    e1 = p / (w * (eta[0] + e12 - e21 * r2))
    expected = [e1, r2 * e1, r3 * r2 * e1]
    np.testing.assert_allclose(solve(m).energy[:, 0], expected, rtol=1e-12)


def _random_model(seed: int, n: int = 12, nb: int = 5) -> Model:
    rng = np.random.default_rng(seed)
    bands = BandAxis(spacing="third-octave", indices=np.arange(nb, dtype=np.int64))
    subs = tuple(
        Subsystem(
            f"x{i}",
            "structure",
            rng.uniform(0.1, 10, nb),
            rng.uniform(1e-3, 3e-2, nb),
            quantity="velocity",
            mass=rng.uniform(1, 10),
        )
        for i in range(n)
    )
    cons = []
    for k in range(2 * n):
        i, j = rng.choice(n, 2, replace=False)
        cons.append(Connection(f"c{k}", f"x{i}", f"x{j}", rng.uniform(1e-4, 1e-2, nb)))
    exc = (
        Excitation("p0", "x0", "power", power=rng.uniform(1e-4, 1e-2, nb)),
        Excitation("p1", f"x{n // 2}", "power", power=rng.uniform(1e-4, 1e-2, nb)),
    )
    return Model(bands, subs, tuple(cons), exc)


def _dense_reference(m: Model) -> np.ndarray:
    """Independent dense solve, matrix built entry by entry in plain loops."""
    idx = m.index()
    n, nb = len(m.subsystems), len(m.bands)
    out = np.zeros((n, nb))
    for j in range(nb):
        mat = np.zeros((n, n))
        for i, s in enumerate(m.subsystems):
            mat[i, i] += s.damping[j]
        for c in m.connections:
            a, b = idx[c.a], idx[c.b]
            eab = c.coupling_loss_factor[j]
            eba = eab * m.subsystems[a].modal_density[j] / m.subsystems[b].modal_density[j]
            mat[a, a] += eab
            mat[b, b] += eba
            mat[b, a] -= eab
            mat[a, b] -= eba
        rhs = np.zeros(n)
        for e in m.excitations:
            rhs[idx[e.subsystem]] += e.power[j]
        out[:, j] = np.linalg.solve(mat * m.bands.omega[j], rhs)
    return out


@pytest.mark.parametrize("seed", [1, 2, 3])
def test_sparse_solve_matches_dense_reference(seed):
    m = _random_model(seed)
    np.testing.assert_allclose(solve(m).energy, _dense_reference(m), rtol=1e-10)


def test_conservation_and_positivity():
    m = _random_model(7)
    sol = solve(m)
    assert np.all(sol.energy > 0)
    # total input = total dissipated in every band
    np.testing.assert_allclose(sol.input_power.sum(0), sol.dissipated_power.sum(0), rtol=1e-12)
    assert sol.residual.max() <= 1e-9


def test_reciprocity_makes_weighted_matrix_symmetric():
    # n_i eta_ij = n_j eta_ji  <=>  L diag(n) symmetric (Vigran 2008, eq. 7.6).
    m = _random_model(4)
    asm = assemble(m)
    n = np.vstack([s.modal_density for s in m.subsystems])
    for j in range(len(m.bands)):
        mat = asm.matrix(j).toarray()
        sym = mat * n[:, j][None, :]
        np.testing.assert_allclose(sym, sym.T, rtol=1e-13, atol=0)
        # column sums equal the damping loss factors (energy conservation, common practice)
        np.testing.assert_allclose(mat.sum(axis=0), asm.damping[:, j], rtol=1e-12, atol=1e-18)


def test_invariant_to_subsystem_order():
    m = _random_model(5)
    perm = np.random.default_rng(0).permutation(len(m.subsystems))
    m2 = Model(m.bands, tuple(m.subsystems[i] for i in perm), m.connections[::-1], m.excitations)
    e1 = dict(zip(m.names, solve(m).energy, strict=True))
    e2 = dict(zip(m2.names, solve(m2).energy, strict=True))
    for k in e1:
        np.testing.assert_allclose(e1[k], e2[k], rtol=1e-12)


def test_band_by_band_equals_all_bands():
    m = _random_model(6)
    full = solve(m).energy
    for j in range(len(m.bands)):
        bj = BandAxis(m.bands.spacing, m.bands.indices[j : j + 1])
        mj = Model(
            bj,
            tuple(
                Subsystem(
                    s.name,
                    s.kind,
                    s.modal_density[j : j + 1],
                    s.damping[j : j + 1],
                    quantity=s.quantity,
                    mass=s.mass,
                )
                for s in m.subsystems
            ),
            tuple(
                Connection(c.name, c.a, c.b, c.coupling_loss_factor[j : j + 1])
                for c in m.connections
            ),
            tuple(
                Excitation(e.name, e.subsystem, "power", power=e.power[j : j + 1])
                for e in m.excitations
            ),
        )
        np.testing.assert_allclose(solve(mj).energy[:, 0], full[:, j], rtol=1e-12)


def test_model_not_mutated_by_solve():
    m = _random_model(8)
    before = [s.damping.copy() for s in m.subsystems]
    seatool.run(m)
    for s, d in zip(m.subsystems, before, strict=True):
        np.testing.assert_array_equal(s.damping, d)
    assert not m.subsystems[0].damping.flags.writeable


def test_prescribed_energy_moves_to_rhs(one_band):
    # Holding E1 fixed: E2 = eta12 E1 / (eta2 + eta21) (second row of the 2x2 balance),
    # and the power needed to hold E1 is w(eta1 + eta12) E1 - w eta21 E2.
    n1, n2, eta1, eta2, eta12, e1 = 0.5, 2.0, 0.01, 0.03, 0.002, 1e-4
    subs = (structure("a", one_band, n1, eta1), structure("b", one_band, n2, eta2))
    m = Model(
        one_band,
        subs,
        (Connection("c", "a", "b", np.array([eta12])),),
        (Excitation("hold", "a", "prescribed", energy=np.array([e1])),),
    )
    sol = solve(m)
    eta21 = eta12 * n1 / n2
    e2 = eta12 * e1 / (eta2 + eta21)
    w = 2 * np.pi * 1000
    np.testing.assert_allclose(sol.energy[:, 0], [e1, e2], rtol=1e-12)
    np.testing.assert_allclose(
        sol.input_power[0, 0], w * ((eta1 + eta12) * e1 - eta21 * e2), rtol=1e-12
    )


def test_exterior_sink_absorbs_radiated_power(one_band):
    # A structure radiating into a free field: its total loss factor is eta + eta_rad and the
    # sink absorbs w eta_rad E (the sink returns nothing: anechoic, common practice).
    eta, eta_rad, p = 0.01, 0.002, 1e-3
    nb = 1
    subs = (
        structure("panel", one_band, 1.0, eta),
        Subsystem("outside", "exterior", np.full(nb, np.inf), np.zeros(nb), sink=True),
    )
    m = Model(
        one_band,
        subs,
        (Connection("rad", "panel", "outside", np.array([eta_rad])),),
        (Excitation("f", "panel", "power", power=np.array([p])),),
    )
    sol = solve(m)
    w = 2 * np.pi * 1000
    e = p / (w * (eta + eta_rad))
    np.testing.assert_allclose(sol.energy[:, 0], [e, 0.0], rtol=1e-12)
    np.testing.assert_allclose(sol.dissipated_power[1, 0], w * eta_rad * e, rtol=1e-12)


def test_undamped_unconnected_subsystem_is_named(one_band):
    subs = (structure("ok", one_band, 1.0, 0.01), structure("floating", one_band, 1.0, 0.0))
    m = Model(one_band, subs, (), (Excitation("f", "ok", "power", power=np.array([1.0])),))
    with pytest.raises(SolveError, match="floating is undamped and unconnected"):
        solve(m)


def test_undamped_group_is_named(one_band):
    subs = (
        structure("ok", one_band, 1.0, 0.01),
        structure("g1", one_band, 1.0, 0.0),
        structure("g2", one_band, 2.0, 0.0),
    )
    m = Model(one_band, subs, (Connection("c", "g1", "g2", np.array([0.01])),), ())
    with pytest.raises(SolveError, match="g1, g2 have no damping"):
        solve(m)


def test_undamped_subsystem_connected_to_damped_is_fine(one_band):
    subs = (structure("a", one_band, 1.0, 0.01), structure("b", one_band, 1.0, 0.0))
    m = Model(
        one_band,
        subs,
        (Connection("c", "a", "b", np.array([0.01])),),
        (Excitation("f", "a", "power", power=np.array([1e-3])),),
    )
    sol = solve(m)
    # b loses nothing, so it reaches equal modal energy with a (equipartition, Lyon & DeJong).
    np.testing.assert_allclose(sol.energy[1, 0], sol.energy[0, 0], rtol=1e-12)


def test_ill_conditioned_system_is_refused(one_band):
    # condition number ~ 2 / eta = 2e14 > 1e13
    subs = (structure("a", one_band, 1.0, 1e-14), structure("b", one_band, 1.0, 1e-14))
    m = Model(
        one_band,
        subs,
        (Connection("c", "a", "b", np.array([1.0])),),
        (Excitation("f", "a", "power", power=np.array([1e-3])),),
    )
    with pytest.raises(SolveError, match="ill-conditioned.*energy piles up in"):
        solve(m)


def test_numerically_singular_system_is_refused(one_band):
    subs = (structure("a", one_band, 1.0, 1e-17), structure("b", one_band, 1.0, 1e-17))
    m = Model(
        one_band,
        subs,
        (Connection("c", "a", "b", np.array([1.0])),),
        (Excitation("f", "a", "power", power=np.array([1e-3])),),
    )
    with pytest.raises(SolveError, match="singular to working precision.*a, b"):
        solve(m)


def test_condition_number_is_exact_for_small_case(one_band):
    # The transposed-solve 1-norm of the inverse equals numpy's dense condition number.
    m = _random_model(9, n=6, nb=3)
    sol = solve(m)
    asm = assemble(m)
    for j in range(3):
        mat = asm.matrix(j).toarray()
        np.testing.assert_allclose(sol.condition[j], np.linalg.cond(mat, 1), rtol=1e-10)


@pytest.mark.parametrize("seed", [11, 12])
def test_iterative_path_matches_dense_reference(seed, monkeypatch):
    # Large models are solved by Jacobi-preconditioned conjugate gradients; force that path
    # on a small model and compare with the independent dense solve.
    import importlib

    solve_mod = importlib.import_module("seatool.solve")
    monkeypatch.setattr(solve_mod, "ITERATIVE_ABOVE", 3)
    m = _random_model(seed, n=30)
    sol = solve(m)
    np.testing.assert_allclose(sol.energy, _dense_reference(m), rtol=1e-9)
    assert sol.residual.max() <= 1e-9
    asm = assemble(m)
    for j in range(len(m.bands)):
        np.testing.assert_allclose(sol.condition[j], np.linalg.cond(asm.matrix(j).toarray(), 1), rtol=1e-8)


@pytest.mark.parametrize("seed", [21, 22, 23])
def test_condition_bound_is_an_upper_bound(seed, monkeypatch):
    # Varah (1975): ||A^-1||_1 <= 1 / min column excess for a column diagonally dominant A,
    # so cond_1 <= ||A||_1 / min excess. Checked against numpy's exact 1-norm condition
    # number of the free block (dense), with a held level and damping spread over 3 decades.
    import dataclasses as dc
    import importlib

    solve_mod = importlib.import_module("seatool.solve")
    monkeypatch.setattr(solve_mod, "ITERATIVE_ABOVE", 3)
    m = _random_model(seed, n=30)
    rng = np.random.default_rng(seed)
    subs = tuple(
        dc.replace(s, damping=s.damping * 10 ** rng.uniform(-2, 1)) for s in m.subsystems
    )
    held = Excitation("h", "x5", "prescribed", energy=np.full(len(m.bands), 1e-3))
    m = dc.replace(m, subsystems=subs, excitations=(*m.excitations, held))
    sol = solve(m)
    asm = assemble(m)
    keep = np.flatnonzero(~asm.held)
    for j in range(len(m.bands)):
        exact = np.linalg.cond(asm.matrix(j).toarray()[np.ix_(keep, keep)], 1)
        assert exact <= sol.condition_bound[j] * (1 + 1e-12)
        np.testing.assert_allclose(sol.condition[j], exact, rtol=1e-8)
