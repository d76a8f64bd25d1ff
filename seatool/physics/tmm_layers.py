"""Layers of the transfer-matrix method: what each layer of a trim build-up is.

Frozen records of the layers :mod:`seatool.physics.tmm` builds its matrices from: an air
gap, a fluid-equivalent porous layer, a limp impervious layer and a thin elastic plate,
and the mass per area of a build-up. The matrices, impedances and absorption are in
:mod:`seatool.physics.tmm`, transmission in :mod:`seatool.physics.tmm_transmission`.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Literal, TypeAlias

import numpy as np
import numpy.typing as npt

from seatool.physics import porous as _porous

from .air import AIR_SOUND_SPEED
from .plates import bending_stiffness

__all__ = ["AirLayer", "Layer", "LimpLayer", "PlateLayer", "PorousLayer", "mass_per_area"]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]


def _positive(name: str, value: float) -> float:
    v = float(value)
    if not math.isfinite(v) or v <= 0.0:
        msg = f"{name} must be finite and > 0, got {value!r}"
        raise ValueError(msg)
    return v


def _non_negative(name: str, value: float) -> float:
    v = float(value)
    if not math.isfinite(v) or v < 0.0:
        msg = f"{name} must be finite and >= 0, got {value!r}"
        raise ValueError(msg)
    return v


# ------------------------------------------------------------------------------------------
# layers
# ------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class AirLayer:
    """A gap filled with the surrounding fluid (air).

    Parameters
    ----------
    thickness : float
        Gap depth [m].
    """

    thickness: float

    def __post_init__(self) -> None:
        _positive("AirLayer.thickness", self.thickness)

    @property
    def mass_per_area(self) -> float:
        """Mass per area counted for the build-up [kg/m^2]: 0 (air is not counted)."""
        return 0.0


@dataclass(frozen=True)
class PorousLayer:
    """A fluid-equivalent porous layer.

    Parameters
    ----------
    thickness : float
        Layer thickness [m].
    model : {"delany_bazley", "miki", "jca"}
        Equivalent-fluid model (see :mod:`seatool.physics.porous`).
    flow_resistivity : float
        Static airflow resistivity sigma [Pa s/m^2].
    porosity : float, optional
        Open porosity phi [-] (JCA and limp frame only).
    tortuosity : float, optional
        alpha_inf [-] (JCA only).
    viscous_length, thermal_length : float, optional
        Lambda, Lambda' [m] (JCA only; required for it).
    bulk_density : float, optional
        Apparent density of the frame [kg/m^3]; gives the layer's mass per area and is needed
        for ``frame="limp"``.
    frame : {"rigid", "limp"}, optional
        Frame model (limp only with ``model="jca"``).
    """

    thickness: float
    model: Literal["delany_bazley", "miki", "jca"]
    flow_resistivity: float
    porosity: float = 0.98
    tortuosity: float = 1.0
    viscous_length: float | None = None
    thermal_length: float | None = None
    bulk_density: float = 0.0
    frame: Literal["rigid", "limp"] = "rigid"

    def __post_init__(self) -> None:
        _positive("PorousLayer.thickness", self.thickness)
        _positive("PorousLayer.flow_resistivity", self.flow_resistivity)
        _non_negative("PorousLayer.bulk_density", self.bulk_density)
        if self.model not in ("delany_bazley", "miki", "jca"):
            msg = f"PorousLayer.model must be 'delany_bazley', 'miki' or 'jca', got {self.model!r}"
            raise ValueError(msg)
        if self.model == "jca" and (self.viscous_length is None or self.thermal_length is None):
            msg = "PorousLayer with model='jca' needs viscous_length and thermal_length"
            raise ValueError(msg)
        if self.frame not in ("rigid", "limp"):
            msg = f"PorousLayer.frame must be 'rigid' or 'limp', got {self.frame!r}"
            raise ValueError(msg)
        if self.frame == "limp" and (self.model != "jca" or self.bulk_density <= 0.0):
            msg = "PorousLayer frame='limp' needs model='jca' and bulk_density > 0"
            raise ValueError(msg)

    @property
    def mass_per_area(self) -> float:
        """Frame mass per area [kg/m^2]."""
        return self.bulk_density * self.thickness

    def impedance_wavenumber(
        self, f: FloatArray, rho0: float, c0: float
    ) -> tuple[ComplexArray, ComplexArray]:
        """Characteristic impedance [Pa s/m] and wavenumber [rad/m] at frequencies f."""
        if self.model == "delany_bazley":
            return _porous.delany_bazley(f, self.flow_resistivity, rho0=rho0, c0=c0)
        if self.model == "miki":
            return _porous.miki(f, self.flow_resistivity, rho0=rho0, c0=c0)
        assert self.viscous_length is not None and self.thermal_length is not None
        return _porous.johnson_champoux_allard(
            f,
            self.porosity,
            self.tortuosity,
            self.flow_resistivity,
            self.viscous_length,
            self.thermal_length,
            frame=self.frame,
            bulk_density=self.bulk_density,
            rho0=rho0,
        )


@dataclass(frozen=True)
class LimpLayer:
    """A limp impervious heavy layer (mass law, no bending stiffness).

    Parameters
    ----------
    surface_mass : float
        Mass per area m'' [kg/m^2].
    """

    surface_mass: float

    def __post_init__(self) -> None:
        _positive("LimpLayer.surface_mass", self.surface_mass)

    @property
    def mass_per_area(self) -> float:
        """Mass per area [kg/m^2]."""
        return self.surface_mass


@dataclass(frozen=True)
class PlateLayer:
    """A thin elastic (Kirchhoff) plate of infinite extent.

    Parameters
    ----------
    thickness : float
        Plate thickness h [m].
    young : float
        Young's modulus E [Pa].
    density : float
        Density [kg/m^3].
    poisson : float, optional
        Poisson's ratio (default 0.3).
    loss_factor : float, optional
        Loss factor eta (default 0.01).
    """

    thickness: float
    young: float
    density: float
    poisson: float = 0.3
    loss_factor: float = 0.01

    def __post_init__(self) -> None:
        _positive("PlateLayer.thickness", self.thickness)
        _positive("PlateLayer.young", self.young)
        _positive("PlateLayer.density", self.density)
        _non_negative("PlateLayer.loss_factor", self.loss_factor)
        if not -1.0 < self.poisson < 0.5:
            msg = f"PlateLayer.poisson must lie in (-1, 0.5), got {self.poisson!r}"
            raise ValueError(msg)

    @property
    def mass_per_area(self) -> float:
        """Mass per area rho h [kg/m^2]."""
        return self.density * self.thickness

    @property
    def bending_stiffness(self) -> float:
        """D = E h^3 / (12 (1 - nu^2)) [N m]."""
        return float(bending_stiffness(self.young, self.thickness, self.poisson))

    def critical_frequency(self, c0: float = AIR_SOUND_SPEED) -> float:
        """Coincidence frequency f_c = (c0^2/(2 pi)) sqrt(m''/D) [Hz]."""
        return c0**2 / (2.0 * math.pi) * math.sqrt(self.mass_per_area / self.bending_stiffness)


Layer: TypeAlias = AirLayer | PorousLayer | LimpLayer | PlateLayer


def mass_per_area(layers: Sequence[Layer]) -> float:
    """Mass per area of a build-up [kg/m^2] (air not counted, porous frames counted).

    Parameters
    ----------
    layers : sequence of Layer
        The build-up.

    Returns
    -------
    float
        Sum of the layers' ``mass_per_area``.
    """
    return float(sum(layer.mass_per_area for layer in layers))
