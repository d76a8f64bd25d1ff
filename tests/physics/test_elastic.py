"""Tests of seatool.physics.elastic against independent methods and published tables."""

from __future__ import annotations

import numpy as np
import pytest

from seatool.physics import elastic

# steel: typical handbook values (Cremer, Heckl & Petersson 2005, Structure-Borne Sound, 3rd ed. Table 3.1; from memory)
E_ST, RHO_ST, NU_ST = 210e9, 7850.0, 0.30


def test_wave_speeds_known_relations() -> None:
    # c_S / c_L' = sqrt((1 - nu)/2) for any isotropic material (elasticity identity)
    cl = elastic.plate_longitudinal_speed(E_ST, RHO_ST, NU_ST)
    cs = elastic.shear_speed(E_ST, RHO_ST, NU_ST)
    assert cs / cl == pytest.approx(np.sqrt((1 - NU_ST) / 2), rel=1e-12)
    assert elastic.bar_longitudinal_speed(E_ST, RHO_ST) == pytest.approx(
        cl * np.sqrt(1 - NU_ST**2), rel=1e-12
    )
