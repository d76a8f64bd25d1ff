"""Loss factors from measurements: the power injection method.

Each subsystem k of N is driven in turn with a measured input power P_k while the band
energies E_ik of all subsystems are measured (experiment k). The SEA power balance of
every band, ``omega L E = P`` with ``L_ii = eta_i + sum_j eta_ij`` and ``L_ij = -eta_ji``
(:mod:`seatool.solve`), then gives all damping and coupling loss factors at once:

    L = P E^-1 / omega,   eta_ij = -L_ji (i != j),   eta_i = sum_j L_ji (column sums)

(Bies & Hamid 1980; the normalised energy matrix as a conditioning measure after Lalor
1990). The inversion is ill-conditioned when the coupling is strong (eta_ij comparable
with eta_i): the subsystems then share nearly equal modal energies, E is close to rank
one and the damping is the small difference of large numbers. Each estimate therefore
comes with its first-order sensitivity to energy errors and the condition number of the
normalised energy matrix; negative and ill-determined estimates are named in plain words.

The writer emits the estimates as model-file TOML with given values
(docs/model-format.md): ``damping`` spectra and ``kind = "given"`` connections.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import numpy.typing as npt
import pandas as pd

from .. import levels
from ..errors import InputError, Problem

__all__ = [
    "SENSITIVITY_LIMIT",
    "LossFactorEstimate",
    "energy_from_level",
    "estimate_toml",
    "power_injection",
    "read_measurements",
]

Array = npt.NDArray[np.float64]

#: Relative sensitivity above which an estimate is called ill-determined: a 1 % error in
#: the measured energies then moves it by more than 10 % (a choice made here).
SENSITIVITY_LIMIT = 10.0


@dataclass(frozen=True)
class LossFactorEstimate:
    """Loss factors estimated by the power injection method.

    Attributes
    ----------
    names : tuple of str
        Subsystem names (N).
    f : ndarray (B,)
        Band centre frequencies [Hz].
    damping : ndarray (N, B)
        Damping loss factors eta_i [-].
    coupling : ndarray (N, N, B)
        Coupling loss factors, ``coupling[i, j] = eta_ij`` (diagonal zero) [-].
    damping_sensitivity, coupling_sensitivity : ndarray (N, B), (N, N, B)
        Relative error of each estimate per relative error of the measured energies [-]
        (first order, energy errors independent with equal relative standard deviation):
        S = sqrt(sum_kl (d eta / d E_kl E_kl)^2) / |eta|. A value of 10 means 1 % energy
        error gives 10 % error in that loss factor.
    condition : ndarray (B,)
        2-norm condition number of the normalised energy matrix
        E_ik / sqrt(E_ii E_kk) (Lalor 1990) [-].
    warnings : tuple of str
        Negative or ill-determined estimates, one line each.
    """

    names: tuple[str, ...]
    f: Array
    damping: Array
    coupling: Array
    damping_sensitivity: Array
    coupling_sensitivity: Array
    condition: Array
    warnings: tuple[str, ...]

    def table(self) -> pd.DataFrame:
        """Tidy table: ``quantity, subsystem, to, band_hz, loss_factor, sensitivity, flag``.

        ``quantity`` is ``damping`` or ``coupling`` (``subsystem`` -> ``to``); ``flag`` is
        ``ok``, ``negative`` or ``ill-determined``.
        """
        rows: list[dict[str, object]] = []
        n = len(self.names)

        def flag(value: float, sens: float) -> str:
            if not np.isfinite(value) or value < 0:
                return "negative" if np.isfinite(value) else "singular"
            return "ill-determined" if sens > SENSITIVITY_LIMIT else "ok"

        for i in range(n):
            for b, fc in enumerate(self.f):
                v, s = float(self.damping[i, b]), float(self.damping_sensitivity[i, b])
                rows.append(
                    {
                        "quantity": "damping",
                        "subsystem": self.names[i],
                        "to": "",
                        "band_hz": fc,
                        "loss_factor": v,
                        "sensitivity": s,
                        "condition": float(self.condition[b]),
                        "flag": flag(v, s),
                    }
                )
        for i in range(n):
            for j in range(n):
                if i == j:
                    continue
                for b, fc in enumerate(self.f):
                    v = float(self.coupling[i, j, b])
                    s = float(self.coupling_sensitivity[i, j, b])
                    rows.append(
                        {
                            "quantity": "coupling",
                            "subsystem": self.names[i],
                            "to": self.names[j],
                            "band_hz": fc,
                            "loss_factor": v,
                            "sensitivity": s,
                            "condition": float(self.condition[b]),
                            "flag": flag(v, s),
                        }
                    )
        return pd.DataFrame(rows)


def energy_from_level(
    level_db: npt.ArrayLike,
    quantity: str,
    *,
    mass: float | None = None,
    volume: float | None = None,
    density: float | None = None,
    sound_speed: float | None = None,
) -> Array:
    """Band energy [J] of a subsystem from its measured level [dB].

    Parameters
    ----------
    level_db : array_like
        Level [dB] re the ISO 1683 reference of ``quantity``.
    quantity : {'velocity', 'sound_pressure', 'energy'}
        Velocity level (re 1 nm/s; needs ``mass`` [kg]), sound pressure level (re 20 uPa;
        needs ``volume`` [m^3], ``density`` [kg/m^3], ``sound_speed`` [m/s]) or energy
        level (re 1 pJ).

    Returns
    -------
    numpy.ndarray
        E = M <v^2> or E = V <p^2> / (rho c^2) (the inverses of
        :func:`seatool.levels.mean_square_velocity` and
        :func:`seatool.levels.mean_square_pressure`; Lyon & DeJong 1995, sec. 2.6).
    """
    lv = np.asarray(level_db, dtype=float)
    if not np.all(np.isfinite(lv)):
        raise ValueError("levels must be finite numbers [dB]")
    ref = levels.REFERENCE
    if quantity == "velocity":
        if mass is None or not mass > 0:
            raise ValueError("a velocity level needs the subsystem mass > 0 [kg]")
        return np.asarray(mass * ref["velocity"] ** 2 * levels.db_to_ratio(lv))
    if quantity == "sound_pressure":
        if not all(x is not None and x > 0 for x in (volume, density, sound_speed)):
            raise ValueError(
                "a sound pressure level needs volume [m^3], density [kg/m^3] and "
                "sound_speed [m/s], all > 0"
            )
        assert volume is not None and density is not None and sound_speed is not None
        p_sq = ref["sound_pressure"] ** 2 * levels.db_to_ratio(lv)
        return np.asarray(p_sq * volume / (density * sound_speed**2))
    if quantity == "energy":
        return np.asarray(ref["energy"] * levels.db_to_ratio(lv))
    raise ValueError(f"quantity must be 'velocity', 'sound_pressure' or 'energy', got {quantity!r}")


def power_injection(
    f: npt.ArrayLike,
    power: npt.ArrayLike,
    energy: npt.ArrayLike,
    *,
    names: Sequence[str] | None = None,
    sensitivity_limit: float = SENSITIVITY_LIMIT,
) -> LossFactorEstimate:
    """Damping and coupling loss factors from power injection measurements.

    Parameters
    ----------
    f : array_like (B,)
        Band centre frequencies [Hz].
    power : array_like (N, B) or (N, N, B)
        Measured input power [W]: ``power[k, b]`` into subsystem k when it is driven
        (experiment k), or the full matrix ``power[i, k, b]`` into subsystem i in
        experiment k (several subsystems driven at once).
    energy : array_like (N, N, B)
        Measured band energies [J]: ``energy[i, k, b]`` of subsystem i in experiment k
        (:func:`energy_from_level` converts levels).
    names : sequence of str, optional
        Subsystem names (default ``s0, s1, ...``).
    sensitivity_limit : float, optional
        Sensitivity above which an estimate is reported as ill-determined (default
        :data:`SENSITIVITY_LIMIT`).

    Returns
    -------
    LossFactorEstimate

    Notes
    -----
    Per band, ``L = P E^-1 / omega``; eta_ij = -L_ji, eta_i = sum_j L_ji. With
    dL = -L dE E^-1 the sensitivities are
    d L_ab / d E_kl = -L_ak (E^-1)_lb and d eta_i / d E_kl = -eta_k (E^-1)_li.

    References
    ----------
    .. [1] Bies, D.A., Hamid, S. (1980). In situ determination of loss and coupling loss
       factors by the power injection method. J. Sound Vib. 70(2), 187-204 (volume
       from memory).
    .. [2] Lalor, N. (1990). Practical considerations for the measurement of internal and
       coupling loss factors on complex structures. ISVR Technical Report 182,
       University of Southampton (normalised energy matrix; title and number from
       memory).
    """
    fr = np.atleast_1d(np.asarray(f, dtype=float))
    e = np.asarray(energy, dtype=float)
    p = np.asarray(power, dtype=float)
    if fr.ndim != 1 or not np.all(fr > 0) or not np.all(np.isfinite(fr)):
        raise ValueError("f must be a 1-d array of band centre frequencies > 0 [Hz]")
    nb = fr.size
    if e.ndim != 3 or e.shape[0] != e.shape[1] or e.shape[2] != nb:
        raise ValueError(
            f"energy must have shape (N, N, {nb}): subsystem x experiment x band, got {e.shape}"
        )
    n = e.shape[0]
    if p.shape == (n, nb):
        pm = np.zeros((n, n, nb))
        pm[np.arange(n), np.arange(n)] = p
    elif p.shape == (n, n, nb):
        pm = p
    else:
        raise ValueError(f"power must have shape ({n}, {nb}) or ({n}, {n}, {nb}), got {p.shape}")
    if not np.all(np.isfinite(e)) or np.any(e < 0):
        raise ValueError("energies must be finite and >= 0 [J]")
    if not np.all(np.isfinite(pm)) or np.any(pm < 0):
        raise ValueError("input powers must be finite and >= 0 [W]")
    labels = tuple(names) if names is not None else tuple(f"s{i}" for i in range(n))
    if len(labels) != n:
        raise ValueError(f"{len(labels)} names for {n} subsystems")
    omega = 2.0 * np.pi * fr

    eb = np.moveaxis(e, 2, 0)  # (B, N, N)
    pb = np.moveaxis(pm, 2, 0)
    with np.errstate(all="ignore"):
        try:
            einv = np.linalg.inv(eb)
        except np.linalg.LinAlgError:
            einv = np.stack([_safe_inv(x) for x in eb])
        lmat = pb @ einv / omega[:, None, None]  # (B, N, N)
        eta = lmat.sum(axis=1)  # column sums (B, N)
        # S_L[a, c] = sqrt(sum_kl (L_ak E_kl Einv_lc)^2) / |L_ac|
        term = lmat[:, :, :, None, None] * eb[:, None, :, :, None] * einv[:, None, None, :, :]
        # term[b, a, k, l, c]
        s_l = np.sqrt((term**2).sum(axis=(2, 3))) / np.abs(lmat)
        # eta_i: sum_a -> d eta_i / d E_kl E_kl = -eta_k E_kl Einv_li
        term_d = eta[:, :, None, None] * eb[:, :, :, None] * einv[:, None, :, :]
        # term_d[b, k, l, i]
        s_d = np.sqrt((term_d**2).sum(axis=(1, 2))) / np.abs(eta)
        d = np.sqrt(np.abs(np.einsum("bii->bi", eb)))
        norm = eb / (d[:, :, None] * d[:, None, :])
        cond = np.linalg.cond(norm)
    coupling = -np.transpose(lmat, (0, 2, 1)).copy()  # eta_ij = -L_ji
    s_c = np.transpose(s_l, (0, 2, 1)).copy()
    idx = np.arange(n)
    coupling[:, idx, idx] = 0.0
    s_c[:, idx, idx] = 0.0
    est = LossFactorEstimate(
        names=labels,
        f=fr,
        damping=np.moveaxis(eta, 0, 1).copy(),
        coupling=np.moveaxis(coupling, 0, 2).copy(),
        damping_sensitivity=np.moveaxis(s_d, 0, 1).copy(),
        coupling_sensitivity=np.moveaxis(s_c, 0, 2).copy(),
        condition=np.asarray(cond, dtype=float),
        warnings=(),
    )
    return LossFactorEstimate(
        **{**est.__dict__, "warnings": tuple(_warnings(est, sensitivity_limit))}
    )


def _safe_inv(m: Array) -> Array:
    try:
        return np.asarray(np.linalg.inv(m))
    except np.linalg.LinAlgError:
        return np.full_like(m, np.nan)


def _warnings(est: LossFactorEstimate, limit: float) -> list[str]:
    out: list[str] = []
    names = est.names

    def bands(mask: npt.NDArray[np.bool_]) -> str:
        return ", ".join(f"{fc:g}" for fc in est.f[mask]) + " Hz"

    for b in np.flatnonzero(~np.isfinite(est.condition)):
        out.append(
            f"{est.f[b]:g} Hz: the energy matrix is singular; check that every subsystem "
            "was driven and that each experiment differs"
        )
    for i, name in enumerate(names):
        neg = est.damping[i] < 0
        if neg.any():
            out.append(
                f"damping of {name} is negative at {bands(neg)}: the measured energies do "
                "not determine it (strong coupling or energy errors); measure again with "
                "more averaging or fix it from a decay measurement"
            )
        ill = ~neg & (est.damping_sensitivity[i] > limit)
        if ill.any():
            out.append(
                f"damping of {name} is ill-determined at {bands(ill)} (1 % energy error "
                f"moves it by more than {limit:g} %)"
            )
    for i, a in enumerate(names):
        for j, b_ in enumerate(names):
            if i == j:
                continue
            neg = est.coupling[i, j] < 0
            if neg.any():
                out.append(
                    f"coupling loss factor {a} -> {b_} is negative at {bands(neg)}: not "
                    "determined by the data (weak or indirect coupling, or energy errors); "
                    "leave it out of the model or fix it to zero"
                )
            ill = ~neg & (est.coupling_sensitivity[i, j] > limit)
            if ill.any():
                out.append(
                    f"coupling loss factor {a} -> {b_} is ill-determined at {bands(ill)} "
                    f"(1 % energy error moves it by more than {limit:g} %)"
                )
    return out


def _num(x: float) -> str:
    return f"{x:.12g}"


def _spectrum(f: Array, values: Array) -> str:
    bands = ", ".join(f"{x:g}" for x in f)
    vals = ", ".join(_num(float(v)) for v in values)
    return f"{{ band_hz = [{bands}], values = [{vals}] }}"


def estimate_toml(
    est: LossFactorEstimate,
    *,
    modal_density: Mapping[str, npt.ArrayLike] | None = None,
    subsystem_keys: Mapping[str, str] | None = None,
) -> str:
    """Model-file TOML with the estimates as given values.

    Parameters
    ----------
    est : LossFactorEstimate
    modal_density : mapping of name to array (B,), optional
        Modal densities [modes/Hz]. With them each pair is written in the direction of
        the smaller sensitivity and the reciprocity mismatch n_i eta_ij / (n_j eta_ji) - 1
        is stated in a comment; without them the first-named direction is written.
    subsystem_keys : mapping of name to TOML text, optional
        Extra lines for each ``[subsystems.NAME]`` table (e.g. ``kind``, ``mass``,
        ``modal_density``) so that the table is complete; without them the tables hold
        only ``damping`` (merge them into the model's own tables).

    Returns
    -------
    str
        ``[subsystems.NAME]`` tables with ``damping`` and ``[connections.A__B]`` tables
        with ``kind = "given"``. Pairs whose estimate is not positive in every band are
        written as comments (a given coupling loss factor must be > 0), with the reason.
        The header lists the per-band condition numbers and the warnings.
    """
    f = est.f
    lines = [
        "# Loss factors estimated by the power injection method from measured energies",
        "# condition number of the normalised energy matrix per band: "
        + ", ".join(f"{fc:g} Hz {c:.3g}" for fc, c in zip(f, est.condition, strict=True)),
    ]
    lines += [f"# warning: {w}" for w in est.warnings]
    keys = subsystem_keys or {}
    for i, name in enumerate(est.names):
        lines += ["", f"[subsystems.{_key(name)}]"]
        if name in keys:
            lines.append(keys[name].strip())
        d = est.damping[i]
        if np.all(d >= 0) and np.all(np.isfinite(d)):
            lines.append(f"damping = {_spectrum(f, d)}")
        else:
            lines.append(f"# damping not written: negative or undetermined estimate {d}")
    n = len(est.names)
    for i in range(n):
        for j in range(i + 1, n):
            a, b = i, j
            note = ""
            if modal_density is not None:
                ni = np.asarray(modal_density[est.names[i]], dtype=float)
                nj = np.asarray(modal_density[est.names[j]], dtype=float)
                sij = est.coupling_sensitivity[i, j]
                sji = est.coupling_sensitivity[j, i]
                if np.nanmean(sji) < np.nanmean(sij):
                    a, b = j, i
                with np.errstate(all="ignore"):
                    mis = ni * est.coupling[i, j] / (nj * est.coupling[j, i]) - 1.0
                note = "# reciprocity mismatch n_i eta_ij / (n_j eta_ji) - 1: " + ", ".join(
                    f"{x:+.2g}" for x in mis
                )
            values = est.coupling[a, b]
            head = f"[connections.{_key(est.names[a] + '__' + est.names[b])}]"
            body = [
                'kind = "given"',
                f'between = ["{est.names[a]}", "{est.names[b]}"]',
                f"coupling_loss_factor = {_spectrum(f, values)}",
            ]
            lines.append("")
            if note:
                lines.append(note)
            if np.all(values > 0) and np.all(np.isfinite(values)):
                lines += [head, *body]
            else:
                lines.append("# not positive in every band, not written (not coupled, or")
                lines.append("# not determined by the data):")
                lines += ["# " + x for x in (head, *body)]
    return "\n".join(lines) + "\n"


def _key(name: str) -> str:
    """A TOML key: bare if it is one, quoted otherwise."""
    if name and all(c.isalnum() or c in "_-" for c in name):
        return name
    return '"' + name.replace("\\", "\\\\").replace('"', '\\"') + '"'


# the measurements file of `seatool loss-factors`
COLUMNS = ("band_hz", "driven", "input_W", "subsystem", "energy_J")


def read_measurements(path: Path) -> tuple[np.ndarray, np.ndarray, np.ndarray, list[str]]:
    """Bands (B,), input powers (N, B), energies (N, N, B) and names from the CSV."""
    file = str(path)
    try:
        df = pd.read_csv(path)
    except FileNotFoundError:
        raise InputError([Problem(file, "", "file not found")]) from None
    except (OSError, ValueError, pd.errors.ParserError) as exc:
        raise InputError([Problem(file, "", f"cannot read as CSV: {exc}")]) from None
    missing = [c for c in COLUMNS if c not in df.columns]
    if missing:
        raise InputError(
            [
                Problem(
                    file,
                    "header",
                    f"missing column(s) {', '.join(missing)}; expected {','.join(COLUMNS)}",
                )
            ]
        )
    for col in ("band_hz", "input_W", "energy_J"):
        vals = pd.to_numeric(df[col], errors="coerce")
        bad = vals.isna() | ~np.isfinite(vals) | (vals < 0) | ((vals <= 0) & (col == "band_hz"))
        if bad.any():
            row = int(np.flatnonzero(bad.to_numpy())[0]) + 2
            raise InputError(
                [Problem(file, f"line {row}, {col}", "must be a finite number >= 0 (band_hz > 0)")]
            )
        df[col] = vals
    names = sorted(set(df["subsystem"].astype(str)))
    drivers = sorted(set(df["driven"].astype(str)))
    if drivers != names:
        raise InputError(
            [
                Problem(
                    file,
                    "driven",
                    "every measured subsystem must be driven once: driven "
                    f"{drivers}, measured {names}",
                )
            ]
        )
    bands = np.sort(df["band_hz"].unique())
    n, nb = len(names), bands.size
    idx = {s: i for i, s in enumerate(names)}
    bidx = {b: j for j, b in enumerate(bands)}
    energy = np.full((n, n, nb), np.nan)
    power = np.full((n, nb), np.nan)
    for sub, drv, fb, e_j, p_w in zip(
        df["subsystem"].astype(str),
        df["driven"].astype(str),
        df["band_hz"],
        df["energy_J"],
        df["input_W"],
        strict=True,
    ):
        i, k, j = idx[sub], idx[drv], bidx[fb]
        energy[i, k, j] = e_j
        power[k, j] = p_w
    if np.isnan(energy).any():
        i, k, j = (int(x[0]) for x in np.nonzero(np.isnan(energy)))
        raise InputError(
            [
                Problem(
                    file,
                    "rows",
                    f"no energy of {names[i]} with {names[k]} driven at "
                    f"{bands[j]:g} Hz; every subsystem is measured in every experiment",
                )
            ]
        )
    return bands, power, energy, names
