"""Treatments for ``seatool panel`` (its --damping-layer, --cover and --trim columns).

The model-file side lives in :mod:`seatool.kinds.plate_treatment` (plate treatments),
:mod:`seatool.kinds.layers` (trim and lining layers) and :mod:`seatool.kinds.damping_forms`
(damping forms); their public names are re-exported here for existing callers.
"""

from __future__ import annotations

import functools
from pathlib import Path
from typing import Any

import numpy as np
import numpy.typing as npt

from seatool.catalogue import Treatment, load_treatments
from seatool.kinds.layers import TrimLayer, lining_absorption, read_layers
from seatool.kinds.plate_treatment import PlateTreatment, read_plate_treatment, summary_lines
from seatool.kinds.reader import Reader

__all__ = [
    "PlateTreatment",
    "TrimLayer",
    "lining_absorption",
    "read_layers",
    "read_plate_treatment",
    "summary_lines",
]

Array = npt.NDArray[np.float64]


@functools.lru_cache(maxsize=1)
def _library() -> dict[str, Treatment]:
    return load_treatments()


# ------------------------------------------------------------------------------------------
# seatool panel: --damping-layer, --cover, --trim


def _panel_arguments(p: Any) -> None:
    g = p.add_argument_group("treatment (seatool.kinds.treatment)")
    g.add_argument(
        "--damping-layer",
        metavar="NAME",
        help="viscoelastic layer of the treatment library bonded to the panel: adds the "
        "composite_loss_factor column ("
        + ", ".join(n for n, t in _library().items() if t.kind == "viscoelastic")
        + ")",
    )
    g.add_argument(
        "--cover",
        metavar="MATERIAL:THICKNESS",
        help="constraining cover over the damping layer (constrained layer), e.g. steel:0.0005",
    )
    g.add_argument(
        "--trim",
        metavar="NAME",
        help="trim layer or build-up of the treatment library on one face: adds its "
        "diffuse rigid-backed absorption and its field-incidence insertion loss ("
        + ", ".join(_library())
        + ")",
    )


_PANEL_OPTIONS = {"damping_layer": "--damping-layer", "cover": "--cover", "trim": "--trim"}


def _panel_columns(spec: Any, bands: Any) -> dict[str, Array]:
    """Treatment columns of ``seatool panel`` (none unless a treatment option is given)."""
    from seatool.errors import InputError, Problem

    opts = spec.options
    value: dict[str, Any] = {}
    if opts.get("damping_layer"):
        value["damping_layer"] = opts["damping_layer"]
    if opts.get("trim"):
        value["trim"] = opts["trim"]
        value["face"] = "treated side"
    if opts.get("cover"):
        mat, _, thick = str(opts["cover"]).partition(":")
        try:
            h3: Any = float(thick)
        except ValueError:
            raise InputError(
                [Problem("", "--cover", f"give MATERIAL:THICKNESS_M, got {opts['cover']!r}")]
            ) from None
        value["cover"] = {"material": mat, "thickness": h3}
    if not value:
        return {}
    m = spec.material
    plate = {
        "thickness": spec.thickness,
        "material": {
            "density": m.density,
            "youngs_modulus": m.youngs_modulus,
            "poisson_ratio": m.poisson_ratio,
            "loss_factor": m.loss_factor,
        },
        "mass_per_area": spec.mass_per_area,
        "fluid": {"density": spec.fluid.density, "sound_speed": spec.fluid.sound_speed},
    }
    rd = Reader(file="", base_dir=Path("."), bands=bands)
    got = read_plate_treatment(rd, value, "", plate)
    if rd.problems or got is None:
        problems = []
        for pr in rd.problems:
            key, _, rest = pr.path.partition(".")
            option = _PANEL_OPTIONS.get(key, key)
            problems.append(Problem("", option + (f" ({rest})" if rest else ""), pr.message))
        raise InputError(problems or [Problem("", "--trim", "treatment could not be read")])
    out: dict[str, Array] = {}
    if got.loss_factor is not None:
        out["composite_loss_factor"] = np.asarray(got.loss_factor)
        out["bonded_mass_kg_m2"] = np.full(len(bands), got.added_mass_per_area)
    if got.insertion_loss_db is not None:
        out["trim_absorption"] = lining_absorption(
            bands.centre, got.trim, rho0=spec.fluid.density, c0=spec.fluid.sound_speed
        )
        out["trim_insertion_loss_dB"] = np.asarray(got.insertion_loss_db)
        out["trim_mass_kg_m2"] = np.full(len(bands), got.trim_mass_per_area)
    return out


def _register_panel() -> None:
    from seatool import panel

    if _panel_columns not in panel.PANEL_COLUMNS:
        panel.PANEL_COLUMNS.append(_panel_columns)
    if _panel_arguments not in panel.PANEL_ARGUMENTS:
        panel.PANEL_ARGUMENTS.append(_panel_arguments)


_register_panel()
