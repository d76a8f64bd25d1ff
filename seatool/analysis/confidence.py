"""Confidence bands of SEA levels from the ensemble variance of built-up systems.

An SEA prediction is the mean over an ensemble of nominally identical systems whose modal
properties scatter (manufacturing and assembly tolerances). The spread of each
subsystem's band energy about that mean follows without sampling from each subsystem's
modal overlap, modes in band and excitation statistics (Langley & Brown 2004a, b;
:mod:`seatool.physics.variance`), propagated through the coupled power balance
(Langley & Cotoni 2004):

1. every free subsystem k receives the power ``Q_k = P_k + omega sum_s eta_sk E_s`` (its
   external input and the power sent to it by its neighbours) and, by its own balance,
   ``Q_k = omega L_kk E_k``;
2. the modal scatter of subsystem k changes how it answers that input by a random factor
   with relative variance r_k^2 = relative_variance_band(m_k, B_k, alpha_k), with
   m_k = f n_k L_kk (total loss factor), B_k = n_k Delta_f and alpha_k combined from the
   inputs (:func:`seatool.physics.variance.combined_alpha`): point forces, input powers
   and point-type connections (``point``, ``mount``, ``given``) count as point loads
   (alpha = 3), diffuse-field excitations and distributed connections (radiation, line,
   leak, non-resonant) as rain-on-the-roof (alpha = 1);
3. a point-type connection passes on the source subsystem's response at the junction
   point, not its energy: the power it sends, omega eta_sk E_s, gets the extra relative
   variance r^2(m_s, B_s, 3 alpha_s) - r^2(m_s, B_s, alpha_s) (a point response has
   modal coefficients phi_j(x_in)^2 phi_j(x_c)^2, alpha multiplied by 3); through a
   resilient mount (``mount``) it also gets the cross-modal variance of a point response,
   :func:`seatool.physics.variance.point_response_cross_variance` (the signs of the
   mode shapes at the mount);
4. at a point junction the receiver's energy is the band average of a product, the
   squared junction force (set by the source's modes) times the receiver's point
   receptance (set by its own modes); besides the two relative variances that a
   first-order propagation adds, the product has the second-order term of
   :func:`seatool.physics.variance.product_variance_band` (both vary over the band on
   the scale of their half-power bandwidths), added to V_k;
5. the subsystems scatter independently, so
   ``Var[E_j] = sum_k G_jk^2 [(omega L_kk E_k)^2 r_k^2 + V_k]`` with
   ``G = (omega L_UU)^-1`` and V_k the junction terms of items 3 and 4: the variance of a
   subsystem driven through others collects the scatter of every subsystem on the way.

Checks (docs/theory/variance.md, section 4): against the random-matrix Monte Carlo of a
plate radiating into a cavity the plate is within its standard error at weak coupling and up
to about 30 % low at strong coupling; the cavity lies between the estimate with
rain-on-the-roof loading (alpha = 1, the default, up to 31 % low) and the one with the
cavity's measured loading alpha (``distributed_alpha``); treated as point-like the cavity's
would be several times too large. For two subsystems joined by a point spring the directly
driven one is within a few percent; the receiver is within 0.98-1.11 of the Monte Carlo
through a soft spring (``mount``, item 3 with its cross-modal term) and 0.9-1.6 times it
through a stiff or rigid one (``point``: an upper estimate).

Levels are quantiles of a log-normal distribution with the SEA mean and the predicted
variance (:data:`seatool.physics.variance.DISTRIBUTION`,
:func:`seatool.physics.variance.level_quantiles`; docs/theory/variance.md, section 3, gives
the Monte Carlo evidence against the Gamma distribution). Held subsystems (measured levels)
and sinks have no spread.
"""

from __future__ import annotations

import textwrap
from collections.abc import Sequence
from typing import Literal

import numpy as np
import numpy.typing as npt
import pandas as pd
from scipy import special

from ..bands import BandAxis
from ..kinds.registry import CONNECTION_KINDS
from ..metrics import weighted_level
from ..model import Model
from ..physics.variance import (
    ALPHA_POINT,
    ALPHA_RAIN_ON_THE_ROOF,
    DISTRIBUTION,
    combined_alpha,
    level_quantiles,
    point_response_cross_variance,
    product_variance_band,
    relative_variance_alpha_slope,
    relative_variance_band,
)
from ..results import CAUTION, Result, subsystem_level
from ..solve import Assembly, assemble

__all__ = [
    "BAND_NOTE",
    "DISTRIBUTED_CONNECTIONS",
    "RESILIENT_CONNECTIONS",
    "band_limits",
    "confidence_bands",
    "overall_relative_variance",
    "relative_variances",
    "render_bands",
    "table_with_confidence",
]

#: What a 5-95 % confidence band of this module is, in plain words (shown with every band).
BAND_NOTE = (
    "5-95 % band: the levels that 90 % of nominally identical builds fall between, from the "
    "SEA ensemble variance of each subsystem's band energy (scatter of natural frequencies "
    "and mode shapes; Langley & Brown 2004, Langley & Cotoni 2004), the energy taken as "
    "log-normal about the SEA mean (a product of factors along the transmission path; "
    "closer to random-matrix simulations than a Gamma law, whose low bound falls far too "
    "low where the spread is large); parameter spreads of an [uncertainty] section are "
    "not included."
)

Array = npt.NDArray[np.float64]

#: Connection kinds whose coupling acts over an area or a line, as each kind declares
#: (``Kind.extent``): their input is treated as rain-on-the-roof loading of the receiving
#: subsystem; every other kind is point-like.
DISTRIBUTED_CONNECTIONS = frozenset(
    k.name for k in CONNECTION_KINDS.values() if k.extent in ("line", "area")
)


#: Point-type connection kinds that are soft against the structures they join (resilient
#: mounts): the force is the mount stiffness times the source's free response at the mount.
RESILIENT_CONNECTIONS = frozenset({"mount"})


def _connection_alpha(kind: str, distributed: float = ALPHA_RAIN_ON_THE_ROOF) -> float:
    return distributed if kind in DISTRIBUTED_CONNECTIONS else ALPHA_POINT


def _excitation_alpha(quantity: str | None) -> float:
    return ALPHA_RAIN_ON_THE_ROOF if quantity and "diffuse" in quantity else ALPHA_POINT


def relative_variances(
    model: Model,
    energy: npt.ArrayLike,
    *,
    asm: Assembly | None = None,
    spacing: Literal["goe", "poisson"] = "goe",
    distributed_alpha: float = ALPHA_RAIN_ON_THE_ROOF,
) -> Array:
    """Relative variance Var[E] / E[E]^2 (N, B) of every subsystem's band energy.

    Parameters
    ----------
    model : Model
    energy : array_like (N, B)
        The SEA (mean) energies of ``model`` [J].
    asm : Assembly, optional
        ``assemble(model)`` if already at hand.
    spacing : {'goe', 'poisson'}, optional
        Natural-frequency statistics of every subsystem (default GOE).
    distributed_alpha : float, optional
        alpha of the loading that a distributed (line or area) connection gives its
        receiver (default 1, rain-on-the-roof). The random-matrix Monte Carlo of a plate
        and a cavity finds 1.3-1.7 for the cavity's modal forces within the band
        (docs/theory/variance.md, section 4): the default gives a lower estimate of the
        receiver's variance, that value an upper one.

    Returns
    -------
    numpy.ndarray (N, B)
        r^2 per subsystem and band; 0 for held subsystems and sinks, NaN where a
        subsystem has zero energy.

    References
    ----------
    .. [1] Langley, R.S., Cotoni, V. (2004). Response variance prediction in the
       statistical energy analysis of built-up systems. J. Acoust. Soc. Am. 115(2),
       706-718 (first-order propagation of independent subsystem scatter through the
       SEA equations; the input-power form written out in the module docstring is
       the one used here).
    .. [2] Langley, R.S., Brown, A.W.M. (2004b). The ensemble statistics of the
       band-averaged energy of a random system. J. Sound Vib. 275, 847-857.
    """
    asm = assemble(model) if asm is None else asm
    e = np.asarray(energy, dtype=float)
    n, nb = asm.shape
    bands = model.bands
    omega = asm.omega
    free = np.flatnonzero(~asm.held)
    out = np.zeros((n, nb))
    if free.size == 0:
        return out
    modal = np.vstack([s.modal_density for s in model.subsystems])
    # inputs of each subsystem: external power and power from each connection end
    sources_w: list[Array] = []  # weights (N, B) per input
    sources_a: list[float] = []
    for ex in model.excitations:
        if ex.drive != "power" or ex.power is None:
            continue
        w = np.zeros((n, nb))
        w[model.index()[ex.subsystem]] = ex.power
        sources_w.append(w)
        sources_a.append(_excitation_alpha(ex.quantity))
    for c, (a, b) in enumerate(zip(asm.a, asm.b, strict=True)):
        w = np.zeros((n, nb))
        w[b] = omega * asm.eta_ab[c] * e[a]  # power sent from a into b
        w[a] = omega * asm.eta_ba[c] * e[b]
        sources_w.append(w)
        sources_a.append(_connection_alpha(model.connections[c].kind, distributed_alpha))
    if sources_w:
        weights = np.stack(sources_w)
        alphas = np.broadcast_to(np.asarray(sources_a)[:, None, None], weights.shape)
        with np.errstate(invalid="ignore", divide="ignore"):
            alpha = combined_alpha(weights, alphas)
        # no power reaches a subsystem in floating point (inputs near 1e-300 W underflow):
        # its sources have no weights, so take the point-source alpha, the largest spread
        alpha = np.where(np.isfinite(alpha), alpha, ALPHA_POINT)
    else:
        alpha = np.full((n, nb), ALPHA_POINT)
    total = asm.diag
    with np.errstate(invalid="ignore", divide="ignore"):
        m = bands.centre * modal * total
        n_band = modal * bands.width
    r2 = np.zeros((n, nb))
    ok = np.zeros((n, nb), dtype=bool)
    ok[free] = (m[free] > 0) & np.isfinite(m[free]) & np.isfinite(n_band[free])
    r2[ok] = relative_variance_band(m[ok], n_band[ok], alpha=alpha[ok], spacing=spacing)
    # point-type connections: the power sent from s follows s's response at the junction
    # point, which scatters more than s's energy (alpha of a point response: alpha_s x 3)
    # r^2 is linear in alpha: r^2(3 alpha) - r^2(alpha) = 2 alpha d r^2 / d alpha
    # and (3b) through a resilient mount the force follows the source's free response at
    # the mount, whose mode-shape signs add the cross-modal variance of a point response
    # (point_response_cross_variance); at a rigid point the driving-point receptances in
    # the denominator of the force smooth it instead (docs/theory/variance.md, section 4)
    xi_all = np.zeros((n, nb))
    xi_all[ok] = (ALPHA_POINT - 1.0) * alpha[ok] * relative_variance_alpha_slope(m[ok], n_band[ok])
    point_src = np.zeros((n, nb), dtype=bool)
    for c, (a, b) in enumerate(zip(asm.a, asm.b, strict=True)):
        if model.connections[c].kind in RESILIENT_CONNECTIONS:
            point_src[[a, b]] = True
    sel = ok & point_src & (n_band > 0)
    xi_all[sel] += point_response_cross_variance(m[sel], n_band[sel])
    extra = np.zeros((n, nb))  # variance of the input of each subsystem [W^2]
    for c, (a, b) in enumerate(zip(asm.a, asm.b, strict=True)):
        if model.connections[c].kind in DISTRIBUTED_CONNECTIONS:
            continue
        for src, dst, eta in ((a, b, asm.eta_ab[c]), (b, a, asm.eta_ba[c])):
            if asm.held[dst]:
                continue
            both = ok[src] & ok[dst]
            product = np.zeros(nb)  # the junction force and the receiver's receptance
            product[both] = product_variance_band(
                bands.centre[both],
                bands.width[both],
                modal[src, both],
                total[src, both],
                modal[dst, both],
                total[dst, both],
                alpha_1=ALPHA_POINT * alpha[src, both],
                alpha_2=ALPHA_POINT,
            )
            extra[dst] += (omega * eta * e[src]) ** 2 * (xi_all[src] + product)
    pos = {int(k): i for i, k in enumerate(free)}
    for j in range(nb):
        lmat = np.zeros((free.size, free.size))
        lmat[np.arange(free.size), np.arange(free.size)] = total[free, j]
        for c, (a, b) in enumerate(zip(asm.a, asm.b, strict=True)):
            if a in pos and b in pos:
                lmat[pos[b], pos[a]] -= asm.eta_ab[c, j]
                lmat[pos[a], pos[b]] -= asm.eta_ba[c, j]
        g = np.linalg.inv(omega[j] * lmat)
        q = omega[j] * total[free, j] * e[free, j]  # total input of each subsystem
        var = (g**2) @ (q**2 * r2[free, j] + extra[free, j])
        with np.errstate(invalid="ignore", divide="ignore"):
            out[free, j] = np.where(e[free, j] > 0, var / e[free, j] ** 2, np.nan)
    return out


def confidence_bands(
    model: Model,
    result: Result,
    levels: Sequence[float] = (0.05, 0.95),
    *,
    distribution: Literal["gamma", "lognormal"] = DISTRIBUTION,
    spacing: Literal["goe", "poisson"] = "goe",
    relative_variance: npt.ArrayLike | None = None,
) -> pd.DataFrame:
    """Levels that a given share of nominally identical systems stays below.

    Parameters
    ----------
    model : Model
    result : Result
        The solved model (``seatool.run(model)``).
    levels : sequence of float, optional
        Probabilities (default 5 % and 95 %); the median (50 %) is always included.
    distribution : {'lognormal', 'gamma'}, optional
        Distribution of the energy with the SEA mean and the predicted variance
        (default log-normal; see :func:`seatool.physics.variance.level_quantiles`).
    spacing : {'goe', 'poisson'}, optional
        Natural-frequency statistics (default GOE).
    relative_variance : array_like (N, B), optional
        :func:`relative_variances` of the result if already at hand (``spacing`` is then
        not used).

    Returns
    -------
    pandas.DataFrame
        One row per subsystem and band: ``subsystem, band_hz, quantity, level_dB``
        (SEA mean), ``relative_variance``, ``level_std_dB`` (standard deviation of the
        level under the chosen distribution), and ``level_pNN_dB`` for each probability
        (``level_p05_dB``, ``level_p50_dB``, ``level_p95_dB``). Held subsystems have a
        zero-width band; sinks are left out. ``df.attrs['caution']`` carries the
        caution shown with every level.
    """
    probs = sorted({float(p) for p in levels} | {0.5})
    r2 = (
        relative_variances(model, result.energy, spacing=spacing)
        if relative_variance is None
        else np.asarray(relative_variance, dtype=float)
    )
    rows = []
    for i, s in enumerate(model.subsystems):
        if s.sink:
            continue
        lv, quantity = subsystem_level(s, result.energy[i])
        r = np.nan_to_num(r2[i], nan=0.0)
        q = level_quantiles(r, probs, distribution=distribution)
        frame = {
            "subsystem": s.name,
            "band_hz": model.bands.nominal,
            "quantity": quantity,
            "level_dB": lv,
            "relative_variance": r2[i],
            "level_std_dB": _level_std(r, distribution),
        }
        for k, p in enumerate(probs):
            frame[column_name(p)] = lv + q[:, k]
        rows.append(pd.DataFrame(frame))
    df = pd.concat(rows, ignore_index=True) if rows else pd.DataFrame()
    df.attrs["caution"] = CAUTION
    return df


def column_name(p: float) -> str:
    """Column of the level at probability ``p``: ``level_p05_dB`` for 0.05."""
    pct = 100.0 * p
    text = f"{pct:02.0f}" if abs(pct - round(pct)) < 1e-9 else f"{pct:g}".replace(".", "_")
    return f"level_p{text}_dB"


def _level_std(r2: Array, distribution: str) -> Array:
    """Standard deviation of 10 lg E [dB] for the chosen distribution (Gamma: trigamma
    function, var(ln X) = psi_1(k) with shape k = 1 / r^2; log-normal: ln(1 + r^2);
    Johnson, Kotz & Balakrishnan 1994, ch. 14 and 17)."""
    c = 10.0 / np.log(10.0)
    pos = r2 > 0
    safe = np.where(pos, r2, 1.0)
    if distribution == "gamma":
        var = special.polygamma(1, 1.0 / safe)
    else:
        var = np.log1p(safe)
    return np.asarray(np.where(pos, c * np.sqrt(var), 0.0), dtype=float)


def table_with_confidence(
    model: Model, result: Result, conf: pd.DataFrame | None = None
) -> pd.DataFrame:
    """:meth:`seatool.results.Result.table` with the confidence columns added:
    ``relative_variance, level_std_dB, level_p05_dB, level_p50_dB, level_p95_dB``
    (``conf``, default :func:`confidence_bands`; NaN for sinks)."""
    base = result.table()
    conf = confidence_bands(model, result) if conf is None else conf
    keep = ["subsystem", "band_hz", "relative_variance", "level_std_dB"]
    keep += [c for c in conf.columns if c.startswith("level_p")]
    out = base.merge(conf[keep], on=["subsystem", "band_hz"], how="left")
    out.attrs["caution"] = CAUTION
    return out


def band_limits(
    conf: pd.DataFrame, name: str, bands_nominal: npt.ArrayLike
) -> tuple[Array, Array]:
    """The 5 % and 95 % levels [dB] of subsystem ``name`` per band (NaN where absent), read
    from a :func:`confidence_bands` table."""
    sel = conf[conf["subsystem"] == name].set_index("band_hz").reindex(
        np.asarray(bands_nominal, dtype=float)
    )
    lo = sel[column_name(0.05)].to_numpy(dtype=float)
    hi = sel[column_name(0.95)].to_numpy(dtype=float)
    return lo, hi


def render_bands(
    model: Model, conf: pd.DataFrame, names: Sequence[str], *, digits: int = 1
) -> str:
    """Text table of the 5 % and 95 % levels of ``names`` per band (``lo..hi`` per cell),
    headed by :data:`BAND_NOTE`."""
    shown = [n for n in names if n in set(conf["subsystem"])]
    if not shown:
        return ""
    bands = model.bands
    cells = {n: band_limits(conf, n, bands.nominal) for n in shown}
    head = ["band", *shown]
    rows = [
        [bands.label(j)]
        + [f"{cells[n][0][j]:.{digits}f}..{cells[n][1][j]:.{digits}f}" for n in shown]
        for j in range(len(bands))
    ]
    widths = [max(len(r[k]) for r in [head, *rows]) for k in range(len(head))]
    fmt = "  ".join(f"{{:>{wd}}}" for wd in widths)
    out = ["confidence bands [dB, same references as the levels]", *textwrap.wrap(BAND_NOTE, 92)]
    out.append(fmt.format(*head))
    out.append(fmt.format(*["-" * wd for wd in widths]))
    out.extend(fmt.format(*r) for r in rows)
    return "\n".join(out)



def overall_relative_variance(
    levels: npt.ArrayLike,
    relative_variance: npt.ArrayLike,
    bands: BandAxis,
    weighting: Literal["Z", "A"] = "A",
) -> Array:
    """Relative variance [-] of an overall (energetic band sum) level's energy.

    Parameters
    ----------
    levels : array_like (..., B)
        Band levels (SEA means) [dB].
    relative_variance : array_like (..., B)
        r^2 of each band energy (:func:`relative_variances`); NaN counts as 0.
    bands : BandAxis
    weighting : {'Z', 'A'}
        Unweighted (overall dB) or A-weighted sum.

    Returns
    -------
    numpy.ndarray (...)
        r_sum^2 = sum_k s_k^2 r_k^2 with s_k each band's share of the (weighted) mean
        square: the band energies are independent (different bands hold different modes),
        so their variances add. Turned into levels with
        :func:`seatool.physics.variance.level_quantiles`, the sum is taken as log-normal
        like each band (the Fenton-Wilkinson approximation of a sum of log-normal
        variables; checked against sampled sums in tests/test_sweep_confidence.py).

    References
    ----------
    .. [1] Fenton, L.F. (1960). The sum of log-normal probability distributions in scatter
       transmission systems. IRE Trans. Commun. Syst. 8(1), 57-67.
    """
    share = weighted_level(levels, bands, weighting).gradient
    r2 = np.nan_to_num(np.asarray(relative_variance, dtype=float), nan=0.0)
    return np.asarray(np.sum(share**2 * r2, axis=-1), dtype=float)
