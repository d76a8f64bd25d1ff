"""Reference values and conversions from SEA band energy to levels.

All levels are 10 lg(quantity^2 / reference^2) in decibels; every function names its
reference. Reference values follow ISO 1683:2015 (preferred reference values for
acoustical and vibratory levels; values from memory of that standard's Table 1).
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

__all__ = [
    "CAUTION",
    "REFERENCE",
    "acceleration_level",
    "db",
    "db_to_ratio",
    "energy_level",
    "level_sum",
    "mean_square_pressure",
    "mean_square_velocity",
    "power_level",
    "sound_pressure_level",
    "velocity_level",
]

#: The one caution shown wherever a sound or vibration level reaches a user (terminal,
#: ``--help``, figures, notebook views). Defined here only; import it, never reword it.
CAUTION = (
    "Estimates guide design and do not certify: verify by measurement to the applicable "
    "standards; hearing-protection and exposure decisions follow local regulations and "
    "qualified professionals."
)

#: Reference values (ISO 1683:2015, Table 1; from memory): sound pressure 20 uPa,
#: velocity 1 nm/s, acceleration 1 um/s^2, sound power 1 pW, energy 1 pJ.
REFERENCE: dict[str, float] = {
    "sound_pressure": 20e-6,
    "velocity": 1e-9,
    "acceleration": 1e-6,
    "power": 1e-12,
    "energy": 1e-12,
}

_UNITS = {
    "sound_pressure": "Pa",
    "velocity": "m/s",
    "acceleration": "m/s^2",
    "power": "W",
    "energy": "J",
}


def reference_label(quantity: str, reference: float | None = None) -> str:
    """Human-readable reference, e.g. 're 2e-05 Pa'."""
    ref = REFERENCE[quantity] if reference is None else reference
    return f"re {ref:g} {_UNITS[quantity]}"


def db(ratio: npt.ArrayLike) -> npt.NDArray[np.float64]:
    """10 lg(ratio) [dB] of a ratio of powers, energies or mean squares (-inf at 0).

    The one decibel conversion of the package: every level shown to a user goes through
    it (ISO 1683:2015, clause 3; common practice).
    """
    with np.errstate(divide="ignore"):
        return np.asarray(10.0 * np.log10(np.asarray(ratio, dtype=float)), dtype=np.float64)


def db_to_ratio(level: npt.ArrayLike) -> npt.NDArray[np.float64]:
    """Ratio of powers or energies 10^(L/10) of a level L [dB] (inverse of :func:`db`)."""
    return np.asarray(10.0 ** (np.asarray(level, dtype=float) / 10.0), dtype=np.float64)



def mean_square_pressure(
    energy: npt.ArrayLike, volume: npt.ArrayLike, density: npt.ArrayLike, sound_speed: npt.ArrayLike
) -> npt.NDArray[np.float64]:
    """Space- and time-averaged mean-square pressure of a diffuse cavity field [Pa^2].

    Notes
    -----
    :math:`\\langle p^2\\rangle = \\rho c^2 E / V` for a diffuse field whose band energy
    E is shared equally between kinetic and potential parts (Lyon & DeJong 1995,
    sec. 2.6; Fahy & Gardonio 2007, sec. 6.x). ``energy`` E [J], ``volume`` V [m^3],
    ``density`` rho [kg/m^3], ``sound_speed`` c [m/s].

    References
    ----------
    Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
    Analysis, 2nd ed. Butterworth-Heinemann, ISBN 0-7506-9111-5.
    """
    e = np.asarray(energy, dtype=float)
    return (
        np.asarray(density, dtype=float)
        * np.asarray(sound_speed, dtype=float) ** 2
        * e
        / np.asarray(volume, dtype=float)
    )


def mean_square_velocity(energy: npt.ArrayLike, mass: npt.ArrayLike) -> npt.NDArray[np.float64]:
    """Space- and time-averaged mean-square velocity of a resonant structural field [m^2/s^2].

    Notes
    -----
    :math:`\\langle v^2\\rangle = E / M` (total energy equals twice the mean kinetic
    energy for resonant response; Lyon & DeJong 1995, sec. 2.6).

    References
    ----------
    Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
    Analysis, 2nd ed. Butterworth-Heinemann, ISBN 0-7506-9111-5.
    """
    return np.asarray(energy, dtype=float) / np.asarray(mass, dtype=float)


def sound_pressure_level(
    p_sq: npt.ArrayLike, *, reference: float = REFERENCE["sound_pressure"]
) -> npt.NDArray[np.float64]:
    """Sound pressure level [dB re 20 uPa] from mean-square pressure [Pa^2] (ISO 1683)."""
    return db(np.asarray(p_sq, dtype=float) / reference**2)


def velocity_level(
    v_sq: npt.ArrayLike, *, reference: float = REFERENCE["velocity"]
) -> npt.NDArray[np.float64]:
    """Velocity level [dB re 1 nm/s by default] from mean-square velocity [m^2/s^2] (ISO 1683).

    Older building-acoustics practice uses 5e-8 m/s; pass ``reference`` to change it.
    """
    return db(np.asarray(v_sq, dtype=float) / reference**2)


def acceleration_level(
    v_sq: npt.ArrayLike, omega: npt.ArrayLike, *, reference: float = REFERENCE["acceleration"]
) -> npt.NDArray[np.float64]:
    """Acceleration level [dB re 1 um/s^2] from mean-square velocity at band centre ``omega``.

    Uses <a^2> = omega^2 <v^2> at the band centre (narrow-band approximation, common practice).
    """
    a_sq = np.asarray(omega, dtype=float) ** 2 * np.asarray(v_sq, dtype=float)
    return db(a_sq / reference**2)


def energy_level(
    energy: npt.ArrayLike, *, reference: float = REFERENCE["energy"]
) -> npt.NDArray[np.float64]:
    """Energy level [dB re 1 pJ] (ISO 1683)."""
    return db(np.asarray(energy, dtype=float) / reference)


def power_level(
    power: npt.ArrayLike, *, reference: float = REFERENCE["power"]
) -> npt.NDArray[np.float64]:
    """Sound power level [dB re 1 pW] (ISO 1683)."""
    return db(np.asarray(power, dtype=float) / reference)


def level_sum(levels: npt.ArrayLike, axis: int = -1) -> npt.NDArray[np.float64]:
    """Energetic sum of levels [dB]: 10 lg(sum 10^(L/10)) (common practice)."""
    return db(np.sum(db_to_ratio(levels), axis=axis))
