"""The coupled structural-acoustic modal equations solved through the coupled modes.

The equations of :mod:`seatool.physics.modal_coupled` (structural modal velocities V_k,
cavity modal pressures P_n, coupling integrals C_nk) written for the structural modal
displacements W = V / (j omega) and multiplied through by j omega read

.. math::

    (K + j\\omega D - \\omega^2 M)\\,x = b, \\qquad x = (W, P), \\qquad
    b = (F, j\\omega Q),

    K = \\begin{bmatrix} K_s & C^T \\\\ 0 & K_a \\end{bmatrix}, \\quad
    M = \\begin{bmatrix} M_s & 0 \\\\ -C & M_a \\end{bmatrix}, \\quad
    D = \\mathrm{diag}(\\eta_k \\omega_k M_k,\\ \\eta_n \\omega_n M_{a,n}),

with K_s = diag(M_k omega_k^2), M_a = diag(Lambda_n / (rho c^2)), K_a = M_a diag(omega_n^2):
the unsymmetric displacement-pressure form of the coupled problem (Craggs 1971; Everstine
1981 discusses why it is unsymmetric). Its left eigenvectors are (lambda w, p) for a right
eigenvector (w, p) of eigenvalue lambda (Ma & Hagiwara 1991), so premultiplying by

.. math::

    T^T, \\qquad T = \\begin{bmatrix} \\Omega_s^2 & M_s^{-1} C^T \\\\ 0 & I \\end{bmatrix}

gives a symmetric pencil with the same eigenvectors:

.. math::

    \\tilde K = \\begin{bmatrix} K_s \\Omega_s^2 & \\Omega_s^2 C^T \\\\
                 C \\Omega_s^2 & K_a + C M_s^{-1} C^T \\end{bmatrix} \\succeq 0, \\qquad
    \\tilde M = \\mathrm{diag}(K_s, M_a) \\succ 0 .

One symmetric eigendecomposition of the diagonal-scaled tilde K (``scipy.linalg.eigh``)
gives the undamped coupled modes Phi (tilde-M orthonormal) and their eigenvalues
omega_i^2. In those coordinates the damping term Delta = Phi^T T^T D Phi is full.
The **modal-damping approximation** keeps its diagonal d_i and, where two coupled modes lie
within their bandwidths of each other and their damping couples them, the small blocks
that join them: an off-diagonal term is kept when its first-order effect on the response,
r_ij = omega_ij |Delta_ij| / |omega_i^2 - omega_j^2| with omega_ij^2 the mean of the two
eigenvalues, exceeds :data:`COUPLING_LIMIT` (Hasselman 1976: the terms left out change
the responses by about r_ij; with equal loss factors everywhere Delta is nearly diagonal
and no block forms). Modes joined through such terms form clusters (connected components);
each line then costs O(n) for the single modes plus one small dense solve per cluster:

.. math::

    (\\Lambda_c - \\omega^2 I + j\\omega \\Delta_c)\\, z_c = \\Phi_c^T T^T b,
    \\qquad x = \\Phi z .

The exact path stays :func:`seatool.physics.modal_coupled.solve_coupled`; the tests compare
the two on the one-dimensional tube and on a plate-box case and state the differences.

References
----------
.. [1] Craggs, A. (1971). The transient response of a coupled plate-acoustic system using
   plate and acoustic finite elements. J. Sound Vib. 15(4), 509-528 (the unsymmetric
   displacement-pressure equations), from memory.
.. [2] Everstine, G.C. (1981). A symmetric potential formulation for fluid-structure
   interaction. J. Sound Vib. 79(1), 157-160, from memory.
.. [3] Ma, Z.-D., Hagiwara, I. (1991). Sensitivity analysis methods for coupled
   acoustic-structural systems, part I: modal sensitivities. AIAA J. 29(11), 1787-1795
   (left and right eigenvectors of the unsymmetric coupled problem), from memory.
.. [4] Hasselman, T.K. (1976). Modal coupling in lightly damped structures. AIAA J. 14(11),
   1627-1628 (when neglecting off-diagonal modal damping is accurate), from memory.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
import numpy.typing as npt
import scipy.linalg
from scipy.sparse import csr_matrix
from scipy.sparse.csgraph import connected_components

from ._checks import nonnegative as _nonnegative
from ._checks import positive as _positive
from ._threads import one_blas_thread
from .modal_coupled import _apply, _rhs

__all__ = ["COUPLING_LIMIT", "CoupledModes", "coupled_modes", "solve_coupled_modes"]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]
IntArray = npt.NDArray[np.int64]

#: Off-diagonal modal damping terms whose first-order effect r_ij exceeds this are kept
#: (module docstring). 0.003: the band-level checks of the tests stay within 0.01 dB.
COUPLING_LIMIT = 0.003

#: Complex numbers held per block of lines and right-hand sides while expanding the modes.
_BLOCK_ELEMENTS = 4_000_000


@dataclass(frozen=True)
class CoupledModes:
    """Undamped coupled modes of a structure-cavity system and their modal damping.

    Attributes
    ----------
    eigenvalue : numpy.ndarray, shape (n,)
        omega_i^2 of the coupled modes [rad^2/s^2], ascending.
    structure : numpy.ndarray, shape (K, n)
        Structural modal displacements of each coupled mode (tilde-M orthonormal).
    cavity : numpy.ndarray, shape (N, n)
        Cavity modal pressures of each coupled mode.
    damping : numpy.ndarray, shape (n,)
        Diagonal of the modal damping Delta [rad/s].
    force_load : numpy.ndarray, shape (n, K)
        Phi^T T^T restricted to a structural load: (Omega_s^2 Phi_s + M_s^-1 C^T Phi_a)^T.
    clusters : tuple of (index, block)
        Modes coupled by their damping: ``index`` (m, s) the positions of m clusters of s
        modes, ``block`` (m, s, s) their part of Delta [rad/s].
    """

    eigenvalue: FloatArray
    structure: FloatArray
    cavity: FloatArray
    damping: FloatArray
    force_load: FloatArray
    clusters: tuple[tuple[IntArray, FloatArray], ...] = field(default=())

    def __len__(self) -> int:
        return int(self.eigenvalue.size)


def _clusters(lam: FloatArray, delta: FloatArray, limit: float
              ) -> tuple[tuple[IntArray, FloatArray], ...]:  # fmt: skip
    """Connected groups of modes with r_ij > limit, grouped by size (size >= 2 only)."""
    gap = np.abs(lam[:, None] - lam[None, :])
    wc = np.sqrt(0.5 * (lam[:, None] + lam[None, :]))
    with np.errstate(divide="ignore", invalid="ignore"):
        linked = wc * np.abs(delta) > limit * gap
    np.fill_diagonal(linked, False)
    if not linked.any():
        return ()
    _, label = connected_components(csr_matrix(linked), directed=False)
    groups: dict[int, list[IntArray]] = {}
    for lab in np.unique(label):
        idx = np.flatnonzero(label == lab).astype(np.int64)
        if idx.size > 1:
            groups.setdefault(idx.size, []).append(idx)
    out = []
    for size in sorted(groups):
        index = np.stack(groups[size])
        out.append((index, delta[index[:, :, None], index[:, None, :]]))
    return tuple(out)


def coupled_modes(
    structure_frequency: npt.ArrayLike,
    modal_mass: npt.ArrayLike,
    structure_loss_factor: npt.ArrayLike,
    cavity_frequency: npt.ArrayLike,
    norm: npt.ArrayLike,
    cavity_loss_factor: npt.ArrayLike,
    coupling: npt.ArrayLike,
    *,
    density: float,
    sound_speed: float,
    coupling_limit: float = COUPLING_LIMIT,
) -> CoupledModes:
    """Coupled modes of in-vacuo structural modes and rigid-walled cavity modes.

    Parameters
    ----------
    structure_frequency : array_like, shape (K,)
        In-vacuo natural frequencies f_k [Hz] (> 0).
    modal_mass : float or array_like, shape (K,)
        Generalised masses M_k [kg].
    structure_loss_factor : float or array_like, shape (K,)
        Modal loss factors eta_k [-].
    cavity_frequency : array_like, shape (N,)
        Rigid-walled natural frequencies f_n [Hz] (>= 0).
    norm : array_like, shape (N,)
        Normalisation integrals Lambda_n [m^3].
    cavity_loss_factor : float or array_like, shape (N,)
        Modal loss factors eta_n [-].
    coupling : array_like, shape (N, K)
        Coupling integrals C_nk [m^2].
    density, sound_speed : float
        rho [kg/m^3] and c [m/s] of the fluid.
    coupling_limit : float, optional
        Keep off-diagonal damping terms with r_ij above this [-] (default
        :data:`COUPLING_LIMIT`; ``inf`` keeps the diagonal only).

    Returns
    -------
    CoupledModes

    Notes
    -----
    Eigenvalues and vectors of the symmetric pencil (tilde K, tilde M) of the module
    docstring, computed as the eigenproblem of S tilde K S with S = tilde M^(-1/2); modal
    damping Delta = Phi^T T^T D Phi, its diagonal and the clusters of the module docstring
    (Hasselman 1976).

    References
    ----------
    .. [1] Ma, Z.-D., Hagiwara, I. (1991). Sensitivity analysis methods for coupled
       acoustic-structural systems, part I: modal sensitivities. AIAA J. 29(11), 1787-1795,
       from memory.
    .. [2] Hasselman, T.K. (1976). Modal coupling in lightly damped structures. AIAA J.
       14(11), 1627-1628, from memory.
    """
    ws = 2.0 * np.pi * np.atleast_1d(_positive("structure_frequency", structure_frequency))
    wa = 2.0 * np.pi * np.atleast_1d(_nonnegative("cavity_frequency", cavity_frequency))
    nk, nn = ws.size, wa.size
    ms = np.broadcast_to(_positive("modal_mass", modal_mass), (nk,)).astype(np.float64)
    eta_s = np.broadcast_to(_nonnegative("structure_loss_factor", structure_loss_factor), (nk,))
    eta_a = np.broadcast_to(_nonnegative("cavity_loss_factor", cavity_loss_factor), (nn,))
    rho = float(_positive("density", density))
    c0 = float(_positive("sound_speed", sound_speed))
    ma = np.broadcast_to(_positive("norm", norm), (nn,)) / (rho * c0**2)
    cm = np.asarray(coupling, dtype=np.float64)
    if cm.shape != (nn, nk):
        msg = f"coupling must have shape ({nn}, {nk}), got {cm.shape}"
        raise ValueError(msg)
    # S tilde-K S with S = diag((M_s Omega_s^2)^-1/2, M_a^-1/2): every block of order omega^2
    sa = 1.0 / np.sqrt(ma)
    b = (sa[:, None] * cm) / np.sqrt(ms)[None, :]  # M_a^-1/2 C M_s^-1/2
    a = np.empty((nk + nn, nk + nn))
    a[:nk, :nk] = np.diag(ws**2)
    a[nk:, :nk] = b * ws[None, :]
    a[:nk, nk:] = a[nk:, :nk].T
    with one_blas_thread():
        a[nk:, nk:] = b @ b.T
        a[nk + np.arange(nn), nk + np.arange(nn)] += wa**2
        lam, u = scipy.linalg.eigh(a, driver="evd", check_finite=False)
        lam = np.maximum(lam, 0.0)
        phi_s = u[:nk] / (np.sqrt(ms) * ws)[:, None]
        phi_a = u[nk:] * sa[:, None]
        ds = ms * eta_s * ws
        da = ma * eta_a * wa
        # Delta = Phi^T T^T D Phi; T^T D = [[Omega_s^2 D_s, 0], [C M_s^-1 D_s, D_a]]
        delta = phi_s.T @ ((ws**2 * ds)[:, None] * phi_s) + phi_a.T @ (
            cm @ ((ds / ms)[:, None] * phi_s) + da[:, None] * phi_a
        )
        force_load = ((ws**2)[:, None] * phi_s + (cm.T @ phi_a) / ms[:, None]).T
    clusters = _clusters(lam, delta, coupling_limit) if np.isfinite(coupling_limit) else ()
    return CoupledModes(lam, phi_s, phi_a, np.ascontiguousarray(np.diag(delta)),
                        np.ascontiguousarray(force_load), clusters)  # fmt: skip


def solve_coupled_modes(
    modes: CoupledModes,
    omega: npt.ArrayLike,
    force: npt.ArrayLike | None = None,
    volume_velocity: npt.ArrayLike | None = None,
) -> tuple[ComplexArray, ComplexArray]:
    """Responses at every frequency line through the coupled modes (modal damping).

    Parameters
    ----------
    modes : CoupledModes
        From :func:`coupled_modes`.
    omega : array_like, shape (L,)
        Angular frequencies of the lines [rad/s] (> 0).
    force : array_like, optional
        Generalised forces F_k [N], shape (K,), (K, R) or (L, K, R).
    volume_velocity : array_like, optional
        Modal sources Q_n [m^3/s], shape (N,), (N, R) or (L, N, R).

    Returns
    -------
    velocity : numpy.ndarray of complex, shape (L, K, R)
        Modal velocities V_k [m/s] of the in-vacuo structural modes.
    pressure : numpy.ndarray of complex, shape (L, N, R)
        Modal pressures P_n [Pa] of the rigid-walled cavity modes.

    Notes
    -----
    z_i = phi_i^T T^T b / (omega_i^2 - omega^2 + j omega d_i) for a single mode, one small
    dense solve per cluster, x = Phi z, V = j omega W (module docstring): the equations of
    :func:`seatool.physics.modal_coupled.solve_coupled` up to the modal-damping
    approximation.

    References
    ----------
    .. [1] Hasselman, T.K. (1976). Modal coupling in lightly damped structures. AIAA J.
       14(11), 1627-1628, from memory.
    """
    w = np.atleast_1d(_positive("omega", omega))
    nl = w.size
    nk, nn = modes.structure.shape[0], modes.cavity.shape[0]
    f = _rhs(force, nl, nk)
    q = _rhs(volume_velocity, nl, nn)
    nr = max(f.shape[2], q.shape[2])
    vel = np.empty((nl, nk, nr), dtype=np.complex128)
    prs = np.empty((nl, nn, nr), dtype=np.complex128)
    n = len(modes)
    block = max(1, _BLOCK_ELEMENTS // max(1, n * nr))
    with one_blas_thread():
        # loads that do not change with frequency are projected once
        g_f = _apply(modes.force_load, f[:1]) if force is None or np.ndim(force) < 3 else None
        g_q = (_apply(modes.cavity.T, q[:1])
               if volume_velocity is None or np.ndim(volume_velocity) < 3 else None)  # fmt: skip
        for s in range(0, nl, block):
            sl = slice(s, min(nl, s + block))
            ws = w[sl]
            gf = g_f if g_f is not None else _apply(modes.force_load, f[sl])
            gq = g_q if g_q is not None else _apply(modes.cavity.T, q[sl])
            g = gf + (1j * ws)[:, None, None] * gq
            den = modes.eigenvalue[None, :] - ws[:, None] ** 2 + 1j * ws[:, None] * modes.damping
            z = g / den[:, :, None]
            for index, dblock in modes.clusters:
                m, size = index.shape
                a = np.broadcast_to(1j * ws[:, None, None, None] * dblock,
                                    (ws.size, m, size, size)).copy()  # fmt: skip
                diag = np.arange(size)
                a[:, :, diag, diag] += modes.eigenvalue[index] - ws[:, None, None] ** 2
                gc = np.broadcast_to(g, (ws.size, n, nr))[:, index, :]  # (l, m, s, r)
                z[:, index, :] = np.linalg.solve(a, gc)
            vel[sl] = (1j * ws)[:, None, None] * _apply(modes.structure, z)
            prs[sl] = _apply(modes.cavity, z)
    return vel, prs
