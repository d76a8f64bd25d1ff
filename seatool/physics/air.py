"""Air: the one default fluid of seatool and the ideal-gas properties of dry air.

:data:`AIR_DENSITY` and :data:`AIR_SOUND_SPEED` are the defaults of every physics function
that takes ``rho0`` / ``c0`` and of the model file reader (dry air at 20 deg C and
101.325 kPa). The other constants are the air properties used by the porous-material models;
:func:`air_sound_speed` and :func:`air_density` give dry air at other temperatures.
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

from ._checks import positive as _positive

__all__ = [
    "AIR_DENSITY",
    "AIR_PRANDTL",
    "AIR_PRESSURE",
    "AIR_RATIO_OF_SPECIFIC_HEATS",
    "AIR_SOUND_SPEED",
    "AIR_TEMPERATURE_C",
    "AIR_VISCOSITY",
    "GAS_CONSTANT",
    "MOLAR_MASS_DRY_AIR",
    "air_density",
    "air_sound_speed",
]

FloatArray = npt.NDArray[np.float64]

#: Temperature of the default air [deg C] (the reference temperature 293.15 K of ISO 9613-1).
AIR_TEMPERATURE_C: float = 20.0
#: Static pressure of the default air [Pa] (standard atmosphere, ISO 9613-1 reference
#: pressure 101.325 kPa).
AIR_PRESSURE: float = 101_325.0
#: Speed of sound in the default air [m/s]: 343.2 m/s, the reference speed of sound at
#: 293.15 K of ISO 9613-1:1993 (Acoustics - Attenuation of sound during propagation
#: outdoors - Part 1, clause 6 / Annex B; from memory); :func:`air_sound_speed` gives
#: 343.23 m/s at 20 deg C.
AIR_SOUND_SPEED: float = 343.2
#: Density of the default air [kg/m^3]: 1.204 kg/m^3, ideal-gas dry air at 20 deg C and
#: 101.325 kPa, rho = p M / (R T) (Bies, D.A., Hansen, C.H. (2009). Engineering Noise
#: Control, 4th ed., sec. 1.4.2; Picard et al. (2008), Metrologia 45, 149-155, the CIPM-2007
#: air-density formula, gives 1.2041 kg/m^3 for dry air; from memory);
#: :func:`air_density` gives 1.2041 kg/m^3.
AIR_DENSITY: float = 1.204
#: Ratio of specific heats of dry air near room temperature [-] (common practice).
AIR_RATIO_OF_SPECIFIC_HEATS: float = 1.4
#: Dynamic viscosity of air at 20 deg C [Pa s] (textbook value, from memory).
AIR_VISCOSITY: float = 1.81e-5
#: Prandtl number of air [-] (textbook value, from memory).
AIR_PRANDTL: float = 0.71
#: Molar gas constant R [J/(mol K)] (exact in the 2019 SI, CODATA 2018).
GAS_CONSTANT: float = 8.314462618
#: Molar mass of dry air [kg/mol] (CIPM-2007 air-density formula, Picard et al. 2008;
#: from memory).
MOLAR_MASS_DRY_AIR: float = 0.0289647
_KELVIN = 273.15


def _temperature_kelvin(temperature_C: npt.ArrayLike) -> FloatArray:
    t = np.asarray(temperature_C, dtype=np.float64)
    if not np.all(np.isfinite(t)) or np.any(t <= -_KELVIN):
        msg = f"temperature_C must be finite and above -273.15 C, got {temperature_C!r}"
        raise ValueError(msg)
    return np.asarray(t + _KELVIN, dtype=np.float64)


def air_sound_speed(temperature_C: npt.ArrayLike) -> FloatArray:
    """Speed of sound in dry air, ideal gas.

    Parameters
    ----------
    temperature_C : float or array_like
        Air temperature [deg C].

    Returns
    -------
    numpy.ndarray
        c = sqrt(gamma R T / M) [m/s] with gamma = 1.4, R = 8.314462618 J/(mol K),
        M = 0.0289647 kg/mol; 343.2 m/s at 20 C. Independent of static pressure for an
        ideal gas.

    Notes
    -----
    Humidity is neglected (it raises c by up to about 0.3 % at room temperature).
    ISO 9613-1 writes the same law as c = 343.2 sqrt(T / 293.15 K).

    References
    ----------
    .. [1] Bies, D.A., Hansen, C.H. (2009). Engineering Noise Control, 4th ed., Spon,
       ISBN 978-0-415-48707-8, sec. 1.4.2, eq. (1.6) (speed of sound in an ideal gas;
       equation number from memory).
    .. [2] ISO 9613-1:1993. Acoustics - Attenuation of sound during propagation outdoors -
       Part 1: Calculation of the absorption of sound by the atmosphere (reference speed
       of sound; from memory).
    """
    t = _temperature_kelvin(temperature_C)
    return np.asarray(
        np.sqrt(AIR_RATIO_OF_SPECIFIC_HEATS * GAS_CONSTANT * t / MOLAR_MASS_DRY_AIR),
        dtype=np.float64,
    )


def air_density(temperature_C: npt.ArrayLike, pressure_Pa: npt.ArrayLike = 101325.0) -> FloatArray:
    """Density of dry air, ideal gas.

    Parameters
    ----------
    temperature_C : float or array_like
        Air temperature [deg C].
    pressure_Pa : float or array_like, optional
        Static pressure [Pa]; default 101325 Pa.

    Returns
    -------
    numpy.ndarray
        rho = p M / (R T) [kg/m^3]; 1.204 kg/m^3 at 20 C and 101.325 kPa.

    References
    ----------
    .. [1] Bies, D.A., Hansen, C.H. (2009). Engineering Noise Control, 4th ed., Spon,
       ISBN 978-0-415-48707-8, sec. 1.4.2 (ideal gas law; from memory).
    """
    t = _temperature_kelvin(temperature_C)
    p = _positive("pressure_Pa", pressure_Pa)
    return np.asarray(p * MOLAR_MASS_DRY_AIR / (GAS_CONSTANT * t), dtype=np.float64)
