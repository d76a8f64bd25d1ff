"""The one schema of materials and fluids (``[materials.NAME]``, ``[fluids.NAME]`` and
inline ``material = { base, ... }`` tables), and the built-in tables they start from.

The bounds are hard limits against typing slips and wrong units (common practice: the
lightest foams are about 5 kg/m^3, the densest metals about 2.3e4 kg/m^3; Young's moduli of
solids lie between soft rubbers, about 1e5 Pa, and diamond, about 1.2e12 Pa).
"""

from __future__ import annotations

import functools

from .. import materials as _materials
from .params import Param

__all__ = ["FLUID_PARAMS", "MATERIAL_PARAMS", "MATERIAL_VALUES", "builtin_fluids", "builtin_materials"]

#: Keys of a material, in the order of the documentation (``base`` names a built-in one).
MATERIAL_PARAMS: tuple[Param, ...] = (
    Param("base", "string", doc="start from this built-in material; the keys below change only what they name"),
    Param("density", unit="kg/m^3", doc="density", bounds=(0.1, 3e4), default_doc="required unless base"),
    Param("youngs_modulus", unit="Pa", doc="Young's modulus", bounds=(1e3, 2e12), default_doc="required unless base"),
    Param("poisson_ratio", doc="Poisson's ratio, -1 < nu < 0.5", minimum=-1.0, maximum=0.5, strict_max=True, default_doc="required unless base"),
    Param("loss_factor", doc="damping loss factor of the material itself", strict=False, bounds=(0.0, 1.0), typical=(0.0, 0.5), why="loss factors above 0.5 are beyond highly damped polymers; the modal picture of SEA needs light damping"),
)  # fmt: skip

#: The property keys of a material (without ``base``).
MATERIAL_VALUES = ("density", "youngs_modulus", "poisson_ratio", "loss_factor")

#: Keys of a fluid.
FLUID_PARAMS: tuple[Param, ...] = (
    Param("density", unit="kg/m^3", doc="density", required=True, bounds=(1e-3, 3e4)),
    Param("sound_speed", unit="m/s", doc="speed of sound", required=True, bounds=(1.0, 2e4)),
)


@functools.cache
def builtin_materials() -> dict[str, _materials.Material]:
    """The built-in materials of :func:`seatool.materials.load_materials` (cached)."""
    return _materials.load_materials()


@functools.cache
def builtin_fluids() -> dict[str, _materials.Fluid]:
    """The built-in fluids of :func:`seatool.materials.load_fluids` (cached)."""
    return _materials.load_fluids()
