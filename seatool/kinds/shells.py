"""Shell kind ``cylindrical_shell``: a closed cylinder or a curved panel.

Declaration plus one derive function; the formulas are in
:mod:`seatool.physics.structural` (Heckl 1962 dispersion, Szechenyi 1971 mode count).
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np
import numpy.typing as npt

from ..model import Subsystem
from ..physics import elastic, plates, quadrature, shells
from .fields import (
    LENGTH_BOUNDS,
    LX,
    MATERIAL,
    PANEL_COMMON,
    THICKNESS,
    bands_of,
    bending_fields,
    finish_panel,
)
from .params import Kind, Param
from .reader import Reader
from .validate import check_derived, default_fluid

__all__ = ["CYLINDRICAL_SHELL"]

Array = npt.NDArray[np.float64]

#: Gauss-Legendre nodes per half band used to band-average the shell modal density.
_SHELL_NODES = 24


def _shell(
    rd: Reader, name: str, v: dict[str, Any], s: dict[str, Any], path: str
) -> list[Subsystem] | None:
    mat, h, a, lx = v["material"], v["thickness"], v["radius"], v["lx"]
    fluid = v["fluid"] if v["fluid"] is not None else default_fluid(rd)
    closed = v["ly"] is None
    ly = v["ly"]
    if h >= 0.1 * a:
        rd.error(f"{path}.thickness", f"thin-shell theory needs thickness << radius ({a:g} m)")
        return None
    if ly is None:
        ly = 2.0 * math.pi * a
    elif ly > 2.0 * math.pi * a * (1 + 1e-9):
        rd.error(
            f"{path}.ly", f"arc length {ly:g} m exceeds the circumference {2 * math.pi * a:g} m"
        )
        return None
    perimeter = 2.0 * ly if closed else 2.0 * (lx + ly)
    geom = (lx, ly, lx * ly, perimeter)
    b = bands_of(rd)
    e, rho, nu = mat.youngs_modulus, mat.density, mat.poisson_ratio
    d = float(plates.bending_stiffness(e, h, nu))
    c_l = float(elastic.plate_longitudinal_speed(e, rho, nu))
    if not check_derived(
        rd, path, {"bending stiffness": d}, (f"{path}.thickness", f"{path}.material")
    ):
        return None
    c0 = fluid.sound_speed
    # Band average of the shell modal density. Its continuous form has a logarithmic
    # singularity at f_m = sqrt(E/rho)/(2 pi a) (shell_bending_modal_density): split each
    # band at f_m (clipped to the band) and cluster Gauss-Legendre nodes towards it with
    # f = f_m -+ D u^3 (integrand ~ u^2 ln u, smooth enough; 2e-9 relative against
    # scipy.integrate.quad in development).
    f_m = math.sqrt(e / rho) / (2.0 * math.pi * a)
    x, w = quadrature.gauss_legendre(_SHELL_NODES)
    u, wu = 0.5 * (x + 1.0), 0.5 * w
    split = np.clip(f_m, b.lower, b.upper)
    total = np.zeros(len(b))
    for sign, span in ((-1.0, split - b.lower), (1.0, b.upper - split)):
        fq = split[:, None] + sign * span[:, None] * u[None, :] ** 3
        fq = np.clip(fq, b.lower[:, None], b.upper[:, None])
        fq = np.where(span[:, None] > 0, fq, b.centre[:, None])  # empty half: weight 0
        n_nodes = shells.shell_bending_modal_density(fq, geom[2], a, h, e, rho, nu)
        total += (wu[None, :] * 3.0 * span[:, None] * u[None, :] ** 2 * n_nodes).sum(axis=1)
    n_shell = np.asarray(total / (b.upper - b.lower), dtype=float)

    def bending(m: float) -> tuple[Array, dict[str, Any], str]:
        # added treatment mass scales the plate-like count as sqrt(m''); shell count likewise
        n = n_shell * math.sqrt(m / (rho * h))
        props = {
            **bending_fields(b.centre, d, m),
            "bending_stiffness": d,
            "critical_frequency": float(plates.critical_frequency(d, m, c0)),
        }
        return (
            n,
            props,
            "shell_bending_modal_density, band average (Heckl 1962 dispersion, Szechenyi 1971 count)",
        )

    extra = {"radius": a, "ring_frequency": float(shells.ring_frequency(a, c_l)), "closed": closed}
    return finish_panel(
        rd, name, s, path, role="cylindrical_shell", mat=mat, geom=geom, thickness=h,
        m_bare=rho * h, fluid=fluid, bending=bending, extra=extra, fields=["bending"], shell=True,
    )  # fmt: skip


CYLINDRICAL_SHELL = Kind(
    "subsystem", "cylindrical_shell", "Thin cylindrical shell: a closed cylinder or a curved panel.",
    (
        MATERIAL,
        THICKNESS,
        Param("radius", unit="m", doc="radius of curvature (thin: thickness < radius / 10)", required=True, bounds=LENGTH_BOUNDS),
        LX,
        Param("ly", unit="m", doc="developed arc width of a curved panel", default_doc="closed cylinder, 2 pi radius", bounds=LENGTH_BOUNDS),
        *PANEL_COMMON,
    ),
    _shell,
)  # fmt: skip
