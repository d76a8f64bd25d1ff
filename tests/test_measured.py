"""Power injection method: exact round trip on a solved model, levels, TOML output, and the
noise study of docs/theory/variance.md (error growth with coupling strength)."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

import seatool
from seatool.analysis._system import solve_sources
from seatool.analysis.measured import (
    energy_from_level,
    estimate_toml,
    power_injection,
)
from seatool.model import Model
from seatool.results import subsystem_level
from seatool.solve import assemble

MODELS = Path(__file__).resolve().parents[1] / "models"


def _true_loss_factors(model: Model) -> tuple[np.ndarray, np.ndarray]:
    asm = assemble(model)
    n, nb = asm.shape
    eta = np.zeros((n, n, nb))
    np.add.at(eta, (asm.a, asm.b), asm.eta_ab)
    np.add.at(eta, (asm.b, asm.a), asm.eta_ba)
    return asm.damping, eta


def _experiments(model: Model) -> np.ndarray:
    """Energies (N, N, B) with 1 W into each subsystem in turn (seatool's solver)."""
    asm = assemble(model)
    n, nb = asm.shape
    power = np.zeros((n, n, nb))
    power[np.arange(n), np.arange(n)] = 1.0
    return solve_sources(model, asm, power, np.zeros((n, n, nb)))


def test_round_trip_on_a_solved_model() -> None:
    # The SEA balance is exact for seatool's own solution, so the estimate must return the
    # model's loss factors to rounding (a check of the inversion, not of the physics).
    model = seatool.load(MODELS / "two_rooms.toml")
    damping, eta = _true_loss_factors(model)
    energy = _experiments(model)
    est = power_injection(
        model.bands.centre, np.ones((3, len(model.bands))), energy, names=model.names
    )
    np.testing.assert_allclose(est.damping, damping, rtol=1e-9)
    # every coupling loss factor to 1e-9 of the band's largest total loss factor (the
    # non-resonant path above coincidence is 1e-34 of it: zero to working precision) ...
    scale = np.max(assemble(model).diag, axis=0)
    assert np.all(np.abs(est.coupling - eta) <= 1e-9 * scale)
    # ... and to 1e-9 relative wherever it is above 1e-7 of that scale
    big = eta > 1e-7 * scale
    assert big.sum() == 6 * len(model.bands) - 14  # all but 7 vanishing bands, both ways
    np.testing.assert_allclose(est.coupling[big], eta[big], rtol=1e-9)
    assert est.condition.shape == (len(model.bands),) and np.all(est.condition >= 1)


def test_round_trip_through_levels() -> None:
    # levels as a measurement would report them (seatool's level conversions) and back
    model = seatool.load(MODELS / "two_rooms.toml")
    energy = _experiments(model)
    back = np.empty_like(energy)
    for i, sub in enumerate(model.subsystems):
        lv, quantity = subsystem_level(sub, energy[i])
        back[i] = energy_from_level(
            lv,
            quantity,
            mass=sub.mass,
            volume=sub.volume,
            density=sub.density,
            sound_speed=sub.sound_speed,
        )
    np.testing.assert_allclose(back, energy, rtol=1e-12)


def test_written_model_reads_back() -> None:
    # the TOML written from the estimate is a valid model file giving the same loss factors
    # (bands up to 2 kHz, where every loss factor is well above rounding)
    text = (MODELS / "two_rooms.toml").read_text().replace("highest = 10000", "highest = 2000")
    model = seatool.loads(text)
    damping, eta = _true_loss_factors(model)
    est = power_injection(
        model.bands.centre, np.ones((3, len(model.bands))), _experiments(model), names=model.names
    )
    band_list = ", ".join(f"{f:g}" for f in model.bands.centre)
    keys = {}
    for s in model.subsystems:
        nd = ", ".join(f"{x:.17g}" for x in s.modal_density)
        extra = f"mass = {s.mass}" if s.mass else f"volume = {s.volume}"
        kind = "structure" if s.mass else "cavity"
        keys[s.name] = (
            f'kind = "{kind}"\n{extra}\n'
            f"modal_density = {{ band_hz = [{band_list}], values = [{nd}] }}"
        )
    text = estimate_toml(
        est,
        modal_density={s.name: s.modal_density for s in model.subsystems},
        subsystem_keys=keys,
    )
    head = '[bands]\nspacing = "third-octave"\nlowest = 100\nhighest = 2000\n\n'
    back = seatool.loads(head + text)
    d2, eta2 = _true_loss_factors(back)
    np.testing.assert_allclose(d2, damping, rtol=1e-9)
    np.testing.assert_allclose(eta2[eta > 0], eta[eta > 0], rtol=1e-9)
    assert "reciprocity mismatch" in text and 'kind = "given"' in text


def _two_subsystem_energies(ratio: float) -> tuple[np.ndarray, float, float]:
    """Exact energies (2, 2) of two coupled subsystems with 1 W into each in turn;
    eta_12 = ratio * eta_1 (SEA balance of Lyon & DeJong 1995, ch. 3, solved by numpy)."""
    w = 2 * np.pi * 1000.0
    n = np.array([0.05, 0.2])
    eta = np.array([0.01, 0.02])
    e12 = ratio * eta[0]
    e21 = e12 * n[0] / n[1]
    lmat = np.array([[eta[0] + e12, -e21], [-e12, eta[1] + e21]])
    return np.linalg.inv(w * lmat), float(eta[0]), e12


RATIOS = (0.01, 0.1, 1.0, 3.0, 10.0, 100.0)
SIGMA_DB = 0.5  # standard deviation of each measured energy level [dB]


def _noise_study(ratio: float, trials: int = 4000) -> dict[str, float]:
    e, eta1, e12 = _two_subsystem_energies(ratio)
    rng = np.random.default_rng(int(ratio * 100) + 1)
    noisy = e[None] * 10 ** (SIGMA_DB * rng.standard_normal((trials, 2, 2)) / 10)
    est = power_injection(np.full(trials, 1000.0), np.ones((2, trials)), np.moveaxis(noisy, 0, 2))
    exact = power_injection([1000.0], np.ones((2, 1)), e[:, :, None])
    rel = np.log(10) / 10 * SIGMA_DB  # relative energy error (first order)
    d = est.damping[0] / eta1 - 1
    c = est.coupling[0, 1] / e12 - 1
    return {
        "condition": float(exact.condition[0]),
        "predicted_damping": float(exact.damping_sensitivity[0, 0] * rel),
        "predicted_coupling": float(exact.coupling_sensitivity[0, 1, 0] * rel),
        "rms_damping": float(np.sqrt(np.mean(d**2))),
        "rms_coupling": float(np.sqrt(np.mean(c**2))),
        "median_damping": float(np.median(np.abs(d))),
        "negative_damping": float(np.mean(est.damping[0] < 0)),
        "negative_coupling": float(np.mean(est.coupling[0, 1] < 0)),
        "warned": float(any("ill-determined" in w or "negative" in w for w in exact.warnings)),
    }


def test_noise_study_error_grows_with_coupling() -> None:
    # Independent check of the diagnostic: sampled errors (4000 noisy measurements per
    # case, 0.5 dB on every energy) against the first-order sensitivity. Numbers in
    # docs/theory/variance.md (power injection study).
    study = {r: _noise_study(r) for r in RATIOS}
    med = [study[r]["median_damping"] for r in RATIOS]
    cond = [study[r]["condition"] for r in RATIOS]
    # the damping error and the condition number grow with the coupling strength
    assert all(b > a for a, b in zip(med[1:], med[2:], strict=False))
    assert all(b > a for a, b in zip(cond, cond[1:], strict=False))
    assert med[-1] > 20 * med[0]
    # weak coupling: the first-order prediction matches the sampled RMS error (the
    # sampling error of an RMS over 4000 trials is about 1.5 %)
    for r in (0.01, 0.1, 1.0):
        s = study[r]
        assert s["rms_damping"] == pytest.approx(s["predicted_damping"], rel=0.1)
        assert s["rms_coupling"] == pytest.approx(s["predicted_coupling"], rel=0.15)
        assert s["negative_damping"] == 0.0 and s["warned"] == 0.0
    # strong coupling: the diagnostic warns, and noisy data gives negative damping
    for r in (10.0, 100.0):
        s = study[r]
        assert s["warned"] == 1.0 and s["predicted_damping"] > 1.0
        assert s["negative_damping"] > 0.1


def test_warnings_name_negative_and_ill_determined_estimates() -> None:
    e, _, _ = _two_subsystem_energies(100.0)
    noisy = e * np.array([[1.0, 1.1], [1.0, 1.0]])
    est = power_injection([1000.0], np.ones((2, 1)), noisy[:, :, None], names=["a", "b"])
    text = "\n".join(est.warnings)
    assert "negative" in text or "ill-determined" in text
    table = est.table()
    assert set(table["flag"]) <= {"ok", "negative", "ill-determined"}
    assert (table["flag"] != "ok").any()
    toml = estimate_toml(est)
    assert "# warning:" in toml


def test_bad_input() -> None:
    e = np.ones((2, 2, 1))
    for call, word in (
        (lambda: power_injection([1000.0], np.ones((3, 1)), e), "power"),
        (lambda: power_injection([1000.0], np.ones((2, 1)), np.ones((2, 3, 1))), "energy"),
        (lambda: power_injection([-1.0], np.ones((2, 1)), e), "f must"),
        (lambda: power_injection([1000.0], np.ones((2, 1)), -e), "energies"),
        (lambda: energy_from_level([80.0], "velocity"), "mass"),
        (lambda: energy_from_level([80.0], "pressure"), "quantity"),
    ):
        with pytest.raises(ValueError, match=word):
            call()


def _write_measurements(path: Path) -> Model:
    model = seatool.load(MODELS / "two_rooms.toml")
    energy = _experiments(model)
    lines = ["band_hz,driven,input_W,subsystem,energy_J"]
    for j, fc in enumerate(model.bands.centre):
        for k, driven in enumerate(model.names):
            for i, sub in enumerate(model.names):
                lines.append(f"{float(fc)!r},{driven},1.0,{sub},{float(energy[i, k, j])!r}")
    path.write_text("\n".join(lines) + "\n")
    return model


def test_command_writes_estimates(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    from seatool.cli import main

    data = tmp_path / "measured.csv"
    model = _write_measurements(data)
    out, table = tmp_path / "lf.toml", tmp_path / "lf.csv"
    assert main(["loss-factors", str(data), "--toml", str(out), "--csv", str(table)]) == 0
    text = out.read_text()
    assert "[connections.pane__receiving_room]" in text and 'kind = "given"' in text
    import pandas as pd

    df = pd.read_csv(table, comment="#")
    damp = df[(df["quantity"] == "damping") & (df["subsystem"] == "pane")]
    np.testing.assert_allclose(damp["loss_factor"], assemble(model).damping[1], rtol=1e-8)
    assert "power injection" in capsys.readouterr().out


@pytest.mark.parametrize(
    ("content", "word"),
    [
        ("band_hz,driven,subsystem\n500,a,a\n", "missing column"),
        ("band_hz,driven,input_W,subsystem,energy_J\n500,a,1,a,-1\n", "energy_J"),
        ("band_hz,driven,input_W,subsystem,energy_J\n500,a,1,a,1\n500,a,1,b,1\n", "driven"),
        (
            "band_hz,driven,input_W,subsystem,energy_J\n500,a,1,a,1\n500,b,1,b,1\n500,a,1,b,1\n",
            "no energy",
        ),
    ],
)
def test_command_bad_input(
    tmp_path: Path, capsys: pytest.CaptureFixture[str], content: str, word: str
) -> None:
    from seatool.cli import main

    data = tmp_path / "m.csv"
    data.write_text(content)
    assert main(["loss-factors", str(data)]) == 2
    assert word in capsys.readouterr().err
