"""Tests for seatool.physics.tmm_transmission: closed forms, independent numerics, published trends."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad

from seatool.physics import tmm, tmm_transmission

RHO0, C0 = 1.21, 343.0


Z0 = RHO0 * C0


STEEL = {"young": 210e9, "density": 7850.0, "poisson": 0.3}


JCA_FOAM = {
    "model": "jca",
    "flow_resistivity": 1e4,
    "porosity": 0.98,
    "tortuosity": 1.02,
    "viscous_length": 100e-6,
    "thermal_length": 250e-6,
    "bulk_density": 20.0,
}


def test_anechoic_backing_energy_balance():
    # lossless build-up (air + limp masses): absorbed power = transmitted power
    layers = [tmm.LimpLayer(3.0), tmm.AirLayer(0.05), tmm.LimpLayer(2.0)]
    f = np.array([80.0, 400.0, 2000.0])
    for th in (0.0, 0.6, 1.2):
        a = tmm.absorption(f, layers, angle=th, backing="anechoic")
        t = tmm_transmission.transmission_coefficient(f, layers, angle=th)
        np.testing.assert_allclose(a, t, rtol=1e-8, atol=1e-15)  # 1 - |R|^2 cancels


def test_limp_mass_law_normal_incidence():
    # normal-incidence mass law (Fahy & Gardonio 2007, Sound and Structural Vibration, 2nd ed., ch. 5; from memory): tau = 1/(1 + (omega m/(2 rho c))^2)
    f = np.array([50.0, 500.0, 5000.0])
    m = 10.0
    tau = tmm_transmission.transmission_coefficient(f, [tmm.LimpLayer(m)], rho0=RHO0, c0=C0)
    np.testing.assert_allclose(tau, 1 / (1 + (2 * np.pi * f * m / (2 * Z0)) ** 2), rtol=1e-12)


def test_field_incidence_mass_law_vigran():
    # Vigran (2008) Building Acoustics eq. 6.102: R_field ~= R_0 - 5 dB ~= 20 lg(f m) - 47,
    # obtained by integrating the infinite-limp-wall tau to about 78 deg
    for f, m in ((500.0, 10.0), (250.0, 20.0), (1000.0, 5.0)):
        r0 = tmm_transmission.transmission_loss(f, [tmm.LimpLayer(m)], incidence="normal")
        rf = tmm_transmission.transmission_loss(f, [tmm.LimpLayer(m)], incidence="field")
        assert abs(rf - (r0 - 5.0)) < 0.3
        assert abs(rf - (20 * math.log10(f * m) - 47.0)) < 1.0


def test_random_incidence_mass_law_london():
    # London (1950), J. Acoust. Soc. Am. 22(2), 270-279 / Beranek, from memory: R_random ~= R_0 - 10 lg(0.23 R_0)
    for f, m in ((500.0, 10.0), (1000.0, 20.0)):
        r0 = float(tmm_transmission.transmission_loss(f, [tmm.LimpLayer(m)], incidence="normal"))
        rr = tmm_transmission.transmission_loss(f, [tmm.LimpLayer(m)], incidence="random")
        assert abs(rr - (r0 - 10 * math.log10(0.23 * r0))) < 0.2


def test_plate_coincidence_frequency_and_transmission():
    plate = tmm.PlateLayer(1e-3, loss_factor=0.02, **STEEL)
    # Long (2006) Architectural Acoustics Table 9.1: f_c h = 12.4 Hz m for steel (+-10 %)
    assert abs(plate.critical_frequency(c0=C0) * 1e-3 / 12.4 - 1) < 0.1
    # at the coincidence angle the stiffness cancels the mass: Z = eta omega m'' (analytic),
    # tau = 1/(1 + eta omega m'' cos(theta)/(2 rho c))^2
    f = 3 * plate.critical_frequency(c0=C0)
    th = math.asin(math.sqrt(plate.critical_frequency(c0=C0) / f))
    tau = tmm_transmission.transmission_coefficient(f, [plate], angle=th, rho0=RHO0, c0=C0)
    expected = 1 / (1 + 0.02 * 2 * math.pi * f * plate.mass_per_area * math.cos(th) / (2 * Z0)) ** 2
    np.testing.assert_allclose(tau, expected, rtol=1e-8)


def test_plate_diffuse_quadrature_against_adaptive_quad():
    # independent numerical method: scipy.integrate.quad with the coincidence angle as a
    # breakpoint, for a lightly damped steel plate below and above coincidence
    plate = tmm.PlateLayer(1e-3, loss_factor=0.005, **STEEL)
    fc = plate.critical_frequency()
    f = np.array([0.3 * fc, 1.2 * fc, 2.5 * fc])
    got = tmm_transmission.transmission_loss(f, [plate], incidence="field")
    u_max = math.sin(tmm.FIELD_INCIDENCE_LIMIT) ** 2
    for i, fi in enumerate(f):
        pts = [fc / fi] if fc / fi < u_max else None
        val = quad(
            lambda u, fi=fi: float(
                tmm_transmission.transmission_coefficient(
                    fi, [plate], angle=math.asin(math.sqrt(u))
                )
            ),
            0.0,
            u_max,
            points=pts,
            limit=500,
            epsabs=0.0,
            epsrel=1e-9,
        )[0]
        assert abs(got[i] - (-10 * math.log10(val / u_max))) < 0.02


def test_cremer_above_coincidence():
    # Cremer (1942), Akust. Z. 7, 81-104, from memory, valid well above f_c (f > 2 f_c):
    # R = 20 lg(pi f m/(rho c)) + 10 lg(2 eta f/(pi f_c)); tolerance 1.5 dB at f >= 4 f_c
    plate = tmm.PlateLayer(2e-3, loss_factor=0.01, **STEEL)
    fc, m = plate.critical_frequency(), plate.mass_per_area
    f = fc * np.array([4.0, 8.0])
    r = tmm_transmission.transmission_loss(f, [plate], incidence="random")
    rc = 20 * np.log10(np.pi * f * m / Z0) + 10 * np.log10(2 * 0.01 * f / (np.pi * fc))
    assert np.all(np.abs(r - rc) < 1.5)


def test_reciprocity_reversed_build_up():
    # reciprocity: tau is the same from either side of a passive build-up
    layers = [
        tmm.PlateLayer(0.8e-3, **STEEL),
        tmm.PorousLayer(0.02, **JCA_FOAM),
        tmm.LimpLayer(4.0),
    ]
    f = np.array([100.0, 1000.0, 5000.0])
    for th in (0.0, 0.7):
        np.testing.assert_allclose(
            tmm_transmission.transmission_coefficient(f, layers, angle=th),
            tmm_transmission.transmission_coefficient(f, layers[::-1], angle=th),
            rtol=1e-9,
        )


@pytest.mark.parametrize(("m1", "m2", "d"), [(10.0, 10.0, 0.1), (20.0, 5.0, 0.05)])
def test_mass_air_mass_resonance(m1, m2, d):
    # f0 = (1/2 pi) sqrt(rho0 c^2 (m1 + m2)/(d m1 m2)) (Long 2006, Architectural Acoustics,
    # eq. 9.48): the normal-incidence transmission peaks there (tau -> 1 for m1 = m2)
    f0 = math.sqrt(RHO0 * C0**2 * (m1 + m2) / (d * m1 * m2)) / (2 * math.pi)
    f = np.linspace(0.7 * f0, 1.3 * f0, 6001)
    layers = [tmm.LimpLayer(m1), tmm.AirLayer(d), tmm.LimpLayer(m2)]
    tau = tmm_transmission.transmission_coefficient(f, layers)
    assert abs(f[np.argmax(tau)] / f0 - 1) < 0.01  # spring approximation of the gap: k d < 0.2


def test_heavy_layer_insertion_loss_12db_per_octave():
    # common practice: a heavy layer on a decoupling layer gives an insertion loss rising
    # about 12 dB/octave (40 dB/decade) above the mass-spring resonance
    m1, m2, d = 20.0, 5.0, 0.005
    f0 = math.sqrt(RHO0 * C0**2 * (m1 + m2) / (d * m1 * m2)) / (2 * math.pi)
    f = f0 * np.array([0.25, 1.0, 4.0, 8.0])
    base = [tmm.LimpLayer(m1)]
    il_air = tmm_transmission.insertion_loss(
        f, base, [tmm.AirLayer(d), tmm.LimpLayer(m2)], incidence="normal"
    ).insertion_loss
    assert abs((il_air[3] - il_air[2]) - 12.0) < 1.0
    assert abs(il_air[0]) < 1.5  # well below resonance the trim does little
    assert il_air[1] < 0.0  # at resonance the trim makes things worse
    # with a limp porous decoupler (JCA) and field incidence
    res = tmm_transmission.insertion_loss(
        f,
        base,
        [tmm.PorousLayer(d, frame="limp", **JCA_FOAM), tmm.LimpLayer(m2)],
        incidence="field",
    )
    assert 9.0 < res.insertion_loss[3] - res.insertion_loss[2] < 15.0
    np.testing.assert_allclose(res.trim_mass_per_area, 20.0 * d + m2)
    np.testing.assert_allclose(res.base_mass_per_area, m1)
    np.testing.assert_allclose(
        res.insertion_loss, res.transmission_loss_treated - res.transmission_loss_base
    )


def test_trim_side_does_not_change_insertion_loss():
    # reciprocity again: a trim on the source or receiver side gives the same IL
    base = [tmm.PlateLayer(1e-3, **STEEL)]
    trim = [tmm.PorousLayer(0.02, **JCA_FOAM), tmm.LimpLayer(2.0)]
    f = np.array([200.0, 2000.0])
    a = tmm_transmission.insertion_loss(f, base, trim, trim_side="receiver").insertion_loss
    b = tmm_transmission.insertion_loss(f, base, trim, trim_side="source").insertion_loss
    np.testing.assert_allclose(a, b, rtol=1e-8)


def test_mass_per_area_and_validation():
    layers = [
        tmm.PlateLayer(1e-3, **STEEL),
        tmm.AirLayer(0.01),
        tmm.PorousLayer(0.02, **JCA_FOAM),
        tmm.LimpLayer(2.0),
    ]
    np.testing.assert_allclose(tmm.mass_per_area(layers), 7.85 + 0.4 + 2.0)
    with pytest.raises(ValueError, match="thickness"):
        tmm.AirLayer(-0.01)
    with pytest.raises(ValueError, match="viscous_length"):
        tmm.PorousLayer(0.02, "jca", 1e4)
    with pytest.raises(ValueError, match="angle"):
        tmm_transmission.transmission_coefficient(100.0, layers, angle=2.0)
    with pytest.raises(ValueError, match="at least one"):
        tmm_transmission.transmission_coefficient(100.0, [])


def test_shapes_vectorised():
    layers = [tmm.LimpLayer(5.0), tmm.AirLayer(0.05), tmm.LimpLayer(5.0)]
    f = np.array([100.0, 200.0, 400.0])
    assert tmm.transfer_matrix(f, layers).shape == (3, 2, 2)
    th = np.array([[0.0], [0.5]])
    assert tmm_transmission.transmission_coefficient(f, layers, angle=th).shape == (2, 3)
    assert tmm_transmission.transmission_loss(f, layers).shape == (3,)
    assert np.ndim(tmm_transmission.transmission_loss(300.0, layers)) == 0
