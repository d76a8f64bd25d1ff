"""``seatool panel``: band-by-band properties of one flat isotropic panel.

For a material (built-in name or properties on the command line), a thickness and a size
``lx`` x ``ly``, print per band the coincidence (critical) frequency, modal density,
modes in band, modal overlap (with ``--loss-factor``, default the material's) and bending
wavelength; ``--csv FILE`` writes the same table. All values come from
:mod:`seatool.physics`.

Extension point
---------------
Other modules add columns and options without editing this file:

* append a function ``(spec: PanelSpec, bands: BandAxis) -> dict[str, ndarray]`` to
  :data:`PANEL_COLUMNS`; each key becomes a column (put the unit in the name, e.g.
  ``"radiation_efficiency"``, ``"transmission_loss_dB"``), each array has one value per
  band;
* append a function ``(parser: argparse.ArgumentParser) -> None`` to
  :data:`PANEL_ARGUMENTS` to add options; their parsed values reach the column function
  through ``spec.options`` (the ``argparse`` namespace as a dict, e.g.
  ``spec.options["treatment"]``).

Append at import time of the contributing module, and have that module imported before
the options are built: add its dotted name to :data:`PANEL_EXTENSION_MODULES` (a one-line
edit here), which ``seatool panel`` imports first. A column function reports bad input
by raising :class:`seatool.errors.InputError` (one line each, exit 2).
"""

from __future__ import annotations

import argparse
import importlib
import math
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np
import numpy.typing as npt
import pandas as pd

from .bands import BandAxis, BandError
from .errors import InputError, Problem, closest
from .materials import Fluid, Material, load_fluids, load_materials
from .physics import plates
from .physics import validity as pv

__all__ = [
    "PANEL_ARGUMENTS",
    "PANEL_COLUMNS",
    "PANEL_EXTENSION_MODULES",
    "PanelSpec",
    "add_commands",
    "panel_table",
]

Array = npt.NDArray[np.float64]


@dataclass(frozen=True)
class PanelSpec:
    """The panel described on the command line.

    Attributes
    ----------
    material : Material
        Panel material (density [kg/m^3], Young's modulus [Pa], Poisson's ratio,
        loss factor).
    thickness : float
        Thickness h [m].
    lx, ly : float
        Side lengths [m].
    loss_factor : float
        Damping loss factor used for the modal overlap [-].
    fluid : Fluid
        Fluid on the panel's faces (for the coincidence frequency).
    options : mapping
        Every parsed command-line option (for columns added by other modules).
    """

    material: Material
    thickness: float
    lx: float
    ly: float
    loss_factor: float
    fluid: Fluid
    options: Mapping[str, Any] = field(default_factory=dict)

    @property
    def area(self) -> float:
        """lx * ly [m^2]."""
        return self.lx * self.ly

    @property
    def mass_per_area(self) -> float:
        """rho h [kg/m^2]."""
        return self.material.density * self.thickness

    @property
    def bending_stiffness(self) -> float:
        """D [N m] (:func:`seatool.physics.plates.bending_stiffness`)."""
        m = self.material
        return float(plates.bending_stiffness(m.youngs_modulus, self.thickness, m.poisson_ratio))

    @property
    def critical_frequency(self) -> float:
        """Coincidence frequency in the fluid [Hz]."""
        return float(
            plates.critical_frequency(
                self.bending_stiffness, self.mass_per_area, self.fluid.sound_speed
            )
        )


PanelColumn = Callable[[PanelSpec, BandAxis], dict[str, Array]]
PanelArgument = Callable[[argparse.ArgumentParser], None]


def _basic_columns(spec: PanelSpec, bands: BandAxis) -> dict[str, Array]:
    f = bands.centre
    d, m = spec.bending_stiffness, spec.mass_per_area
    n = plates.plate_bending_modal_density(f, spec.area, d, m)
    k = plates.plate_bending_wavenumber(f, d, m)
    return {
        "critical_frequency_hz": np.full(f.shape, spec.critical_frequency),
        "modal_density_per_hz": n,
        "modes_in_band": pv.modes_in_band(n, bands.width),
        "modal_overlap": pv.modal_overlap(f, n, spec.loss_factor),
        "bending_wavelength_m": 2.0 * np.pi / k,
    }


#: Column providers, called in order; append yours (see the module docstring).
PANEL_COLUMNS: list[PanelColumn] = [_basic_columns]
#: Functions adding argparse options to ``seatool panel``; append yours.
PANEL_ARGUMENTS: list[PanelArgument] = []
#: Modules imported before ``seatool panel`` builds its options, so that they can append
#: to :data:`PANEL_COLUMNS` / :data:`PANEL_ARGUMENTS`; append your module's dotted name.
PANEL_EXTENSION_MODULES: list[str] = ["seatool.kinds.treatment", "seatool.kinds.panel_coupling"]


def _load_extensions() -> None:
    for mod in PANEL_EXTENSION_MODULES:
        importlib.import_module(mod)


def panel_table(spec: PanelSpec, bands: BandAxis) -> pd.DataFrame:
    """The panel table: ``band_hz`` (nominal), ``band_exact_hz`` and every provider's columns."""
    cols: dict[str, Any] = {"band_hz": bands.nominal, "band_exact_hz": bands.centre}
    for provider in PANEL_COLUMNS:
        for key, val in provider(spec, bands).items():
            arr = np.asarray(val, dtype=float)
            if arr.shape != (len(bands),):
                msg = f"panel column {key!r} has shape {arr.shape}, expected ({len(bands)},)"
                raise ValueError(msg)
            cols[key] = arr
    return pd.DataFrame(cols)


# ----------------------------------------------------------------------------------------
# command line


def _arguments(p: argparse.ArgumentParser) -> None:
    _load_extensions()
    p.add_argument(
        "--material",
        metavar="NAME",
        help="built-in material (" + ", ".join(load_materials()) + "); properties given "
        "below replace the material's",
    )
    p.add_argument("--density", metavar="KG_M3", help="density [kg/m^3]")
    p.add_argument("--youngs-modulus", metavar="PA", help="Young's modulus [Pa]")
    p.add_argument("--poisson-ratio", metavar="NU", help="Poisson's ratio")
    p.add_argument("--thickness", metavar="M", help="thickness [m]")
    p.add_argument("--lx", metavar="M", help="side length [m]")
    p.add_argument("--ly", metavar="M", help="other side length [m]")
    p.add_argument(
        "--loss-factor",
        metavar="ETA",
        help="damping loss factor for the modal overlap (default: the material's)",
    )
    p.add_argument(
        "--fluid",
        metavar="NAME",
        default="air",
        help="fluid for the coincidence frequency (" + ", ".join(load_fluids()) + "; default air)",
    )
    p.add_argument("--lowest", metavar="HZ", default="50", help="lowest band centre (default 50)")
    p.add_argument(
        "--highest", metavar="HZ", default="10000", help="highest band centre (default 10000)"
    )
    p.add_argument("--octave", action="store_true", help="octave bands (default third-octave)")
    p.add_argument("--csv", metavar="FILE", help="write the table to FILE")
    for add in PANEL_ARGUMENTS:
        add(p)


def _num(
    problems: list[Problem], value: str | None, option: str, *, minimum: float | None = 0.0
) -> float | None:
    if value is None:
        return None
    try:
        x = float(value)
    except ValueError:
        problems.append(Problem("", option, f"must be a number, got {value!r}"))
        return None
    if not math.isfinite(x):
        problems.append(Problem("", option, f"must be finite, got {value!r}"))
        return None
    if minimum is not None and x <= minimum:
        problems.append(Problem("", option, f"must be > {minimum:g}, got {value}"))
        return None
    return x


def spec_from_args(args: argparse.Namespace) -> tuple[PanelSpec, BandAxis]:
    """Validate the options of ``seatool panel``; raises InputError (one line per problem)."""
    problems: list[Problem] = []
    mats = load_materials()
    base: Material | None = None
    if args.material is not None:
        if args.material not in mats:
            hint = closest(args.material, mats) or f" (known: {', '.join(mats)})"
            problems.append(Problem("", "--material", f"unknown material {args.material!r}{hint}"))
        else:
            base = mats[args.material]
    rho = _num(problems, args.density, "--density")
    e = _num(problems, args.youngs_modulus, "--youngs-modulus")
    nu = _num(problems, args.poisson_ratio, "--poisson-ratio", minimum=-1.0)
    if nu is not None and nu >= 0.5:
        problems.append(Problem("", "--poisson-ratio", f"must be < 0.5, got {nu:g}"))
        nu = None
    for option in ("thickness", "lx", "ly"):
        if getattr(args, option) is None:
            problems.append(Problem("", f"--{option}", "missing required option"))
    h = _num(problems, args.thickness, "--thickness")
    lx = _num(problems, args.lx, "--lx")
    ly = _num(problems, args.ly, "--ly")
    eta = _num(problems, args.loss_factor, "--loss-factor")
    lo = _num(problems, args.lowest, "--lowest")
    hi = _num(problems, args.highest, "--highest")
    fluids = load_fluids()
    fluid = fluids.get(args.fluid)
    if fluid is None:
        hint = closest(args.fluid, fluids) or f" (known: {', '.join(fluids)})"
        problems.append(Problem("", "--fluid", f"unknown fluid {args.fluid!r}{hint}"))
    if base is None and args.material is None:
        missing = [
            o
            for o, v in (
                ("--density", args.density),
                ("--youngs-modulus", args.youngs_modulus),
                ("--poisson-ratio", args.poisson_ratio),
            )
            if v is None
        ]
        if missing:
            problems.append(
                Problem("", "--material", "give a material name or " + ", ".join(missing))
            )
    material: Material | None = None
    if not problems:
        changes = {
            k: v
            for k, v in (("density", rho), ("youngs_modulus", e), ("poisson_ratio", nu))
            if v is not None
        }
        if base is not None:
            material = base.replace(**changes) if changes else base
        else:
            assert rho is not None and e is not None and nu is not None
            material = Material("command line", rho, e, nu, 0.0, source="command line")
        if eta is None:
            eta = material.loss_factor
            if eta <= 0:
                problems.append(Problem("", "--loss-factor", "needed (the material has none)"))
    bands: BandAxis | None = None
    if lo is not None and hi is not None:
        try:
            bands = BandAxis.from_range(lo, hi, "octave" if args.octave else "third-octave")
        except BandError as exc:
            problems.append(Problem("", "--lowest/--highest", str(exc)))
    if args.csv is not None and not Path(args.csv).resolve().parent.exists():
        problems.append(Problem("", "--csv", f"folder of {args.csv!r} does not exist"))
    if problems:
        raise InputError(problems)
    assert material is not None and h is not None and lx is not None and ly is not None
    assert eta is not None and fluid is not None and bands is not None
    return PanelSpec(material, h, lx, ly, eta, fluid, options=vars(args)), bands


_FORMATS = {
    "critical_frequency_hz": "{:.0f}",
    "modal_density_per_hz": "{:.4g}",
    "modes_in_band": "{:.3g}",
    "modal_overlap": "{:.3g}",
    "bending_wavelength_m": "{:.4g}",
}


def render(spec: PanelSpec, table: pd.DataFrame, bands: BandAxis) -> str:
    """Text version of :func:`panel_table` with a header naming the panel."""
    m = spec.material
    lines = [
        f"panel: {m.name}, h = {spec.thickness:g} m, {spec.lx:g} x {spec.ly:g} m "
        f"(m'' = {spec.mass_per_area:.4g} kg/m^2, D = {spec.bending_stiffness:.4g} N m)",
        f"coincidence frequency in {spec.fluid.name}: {spec.critical_frequency:.0f} Hz; "
        f"loss factor {spec.loss_factor:g}",
    ]
    cols = [c for c in table.columns if c not in ("band_hz", "band_exact_hz")]
    head = ["band", *cols]
    rows = []
    for j in range(len(table)):
        row = [bands.label(j)]
        for c in cols:
            v = float(table[c].iloc[j])
            row.append(_FORMATS.get(c, "{:.4g}").format(v))
        rows.append(row)
    widths = [max(len(r[k]) for r in [head, *rows]) for k in range(len(head))]
    fmt = "  ".join(f"{{:>{w}}}" for w in widths)
    lines += [fmt.format(*head), fmt.format(*["-" * w for w in widths])]
    lines += [fmt.format(*r) for r in rows]
    return "\n".join(lines)


def _handler(args: argparse.Namespace) -> int:
    from .results import CAUTION

    spec, bands = spec_from_args(args)
    table = panel_table(spec, bands)
    print(render(spec, table, bands))
    if args.csv:
        table.to_csv(args.csv, index=False, float_format="%.10g")
        print(f"wrote {args.csv}")
    print()
    print("Caution: " + CAUTION)
    return 0


def add_commands(registry: dict[str, Any]) -> None:
    """Register ``seatool panel`` (called by :mod:`seatool.cli`)."""
    from .cli import Command

    registry["panel"] = Command(
        help="band-by-band properties of one flat panel (coincidence, modes, overlap)",
        arguments=_arguments,
        handler=_handler,
    )
