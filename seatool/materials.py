"""Built-in material and fluid property tables.

The tables live in ``seatool/data/materials.csv`` and ``seatool/data/fluids.csv``; every
row carries a ``source`` column saying where the numbers come from (handbook, ``from
memory`` or ``common practice``). Values are typical, not certified: override them with
:meth:`Material.replace` / :meth:`Fluid.replace` when better data are known.
"""

from __future__ import annotations

import csv
import dataclasses
from dataclasses import dataclass
from importlib import resources
from typing import Any

import numpy as np

from seatool.physics import air

__all__ = ["Fluid", "Material", "air_at", "load_fluids", "load_materials"]


def _check_positive(owner: str, name: str, value: float) -> None:
    if not (np.isfinite(value) and value > 0.0):
        msg = f"{owner}: {name} must be finite and > 0, got {value!r}"
        raise ValueError(msg)


@dataclass(frozen=True)
class Material:
    """Isotropic solid material.

    Attributes
    ----------
    name : str
        Material name (table key).
    density : float
        Density [kg/m^3].
    youngs_modulus : float
        Young's modulus [Pa].
    poisson_ratio : float
        Poisson's ratio [-], in (-1, 0.5).
    loss_factor : float
        Typical damping loss factor of the material itself [-] (built-up structures are
        usually more damped; give the SEA model a per-band value).
    source : str
        Where the values come from.
    """

    name: str
    density: float
    youngs_modulus: float
    poisson_ratio: float
    loss_factor: float
    source: str = "user"

    def __post_init__(self) -> None:
        """Check the physical ranges of the properties."""
        _check_positive(self.name, "density", self.density)
        _check_positive(self.name, "youngs_modulus", self.youngs_modulus)
        if not (-1.0 < self.poisson_ratio < 0.5):
            msg = f"{self.name}: poisson_ratio must lie in (-1, 0.5), got {self.poisson_ratio!r}"
            raise ValueError(msg)
        if not (np.isfinite(self.loss_factor) and self.loss_factor >= 0.0):
            msg = f"{self.name}: loss_factor must be finite and >= 0, got {self.loss_factor!r}"
            raise ValueError(msg)

    @property
    def shear_modulus(self) -> float:
        """Shear modulus G = E / (2 (1 + nu)) [Pa]."""
        return self.youngs_modulus / (2.0 * (1.0 + self.poisson_ratio))

    def replace(self, **changes: Any) -> Material:
        """Return a copy with some properties changed (validated again).

        Parameters
        ----------
        **changes
            Field names and new values, e.g. ``loss_factor=0.01``. Unless ``source`` is
            given, it is marked as modified.
        """
        if "source" not in changes:
            changes["source"] = f"{self.source} [modified: {', '.join(sorted(changes))}]"
        return dataclasses.replace(self, **changes)


@dataclass(frozen=True)
class Fluid:
    """Fluid for acoustic subsystems.

    Attributes
    ----------
    name : str
        Fluid name (table key).
    density : float
        Density [kg/m^3].
    sound_speed : float
        Speed of sound [m/s].
    source : str
        Where the values come from.
    """

    name: str
    density: float
    sound_speed: float
    source: str = "user"

    def __post_init__(self) -> None:
        """Check the physical ranges of the properties."""
        _check_positive(self.name, "density", self.density)
        _check_positive(self.name, "sound_speed", self.sound_speed)

    @property
    def characteristic_impedance(self) -> float:
        """rho c [Pa s/m]."""
        return self.density * self.sound_speed

    def replace(self, **changes: Any) -> Fluid:
        """Return a copy with some properties changed (validated again).

        Parameters
        ----------
        **changes
            Field names and new values. Unless ``source`` is given, it is marked as
            modified.
        """
        if "source" not in changes:
            changes["source"] = f"{self.source} [modified: {', '.join(sorted(changes))}]"
        return dataclasses.replace(self, **changes)


def _read_rows(filename: str) -> list[dict[str, str]]:
    text = resources.files("seatool").joinpath("data", filename).read_text(encoding="utf-8")
    return list(csv.DictReader(text.splitlines()))


def load_materials() -> dict[str, Material]:
    """Load the built-in solid materials.

    Returns
    -------
    dict of str to Material
        Keyed by name: steel, aluminium, glass, plywood, gypsum_board, concrete, pmma,
        polycarbonate, cfrp_quasi_isotropic.
    """
    out: dict[str, Material] = {}
    for row in _read_rows("materials.csv"):
        mat = Material(
            name=row["name"],
            density=float(row["density"]),
            youngs_modulus=float(row["youngs_modulus"]),
            poisson_ratio=float(row["poisson_ratio"]),
            loss_factor=float(row["loss_factor"]),
            source=row["source"],
        )
        out[mat.name] = mat
    return out


def load_fluids() -> dict[str, Fluid]:
    """Load the built-in fluids.

    Returns
    -------
    dict of str to Fluid
        Keyed by name: air (20 C, 101.325 kPa), water, seawater.
    """
    out: dict[str, Fluid] = {}
    for row in _read_rows("fluids.csv"):
        fl = Fluid(
            name=row["name"],
            density=float(row["density"]),
            sound_speed=float(row["sound_speed"]),
            source=row["source"],
        )
        out[fl.name] = fl
    return out


def air_at(temperature_C: float = 20.0, pressure_Pa: float = 101325.0) -> Fluid:
    """Dry air as an ideal gas at the given temperature and static pressure.

    Parameters
    ----------
    temperature_C : float, optional
        Temperature [deg C], default 20.
    pressure_Pa : float, optional
        Static pressure [Pa], default 101325.

    Returns
    -------
    Fluid
        Density and speed of sound from :func:`seatool.physics.air.air_density` and
        :func:`seatool.physics.air.air_sound_speed`.
    """
    rho = float(air.air_density(temperature_C, pressure_Pa))
    c = float(air.air_sound_speed(temperature_C))
    return Fluid(
        name=f"air ({temperature_C:g} C, {pressure_Pa:g} Pa)",
        density=rho,
        sound_speed=c,
        source="ideal gas, dry air (seatool.physics.air)",
    )
