"""Total loss factor of a panel as built: internal damping plus losses at its edges.

A panel in a structure loses energy through its internal damping, by radiation (modelled by
the radiation couplings of an SEA model) and into the structure it is connected to. Where
those connections are modelled as junctions, the losses are coupling loss factors. Where
they are not, a boundary term stands for them:

* :func:`edge_absorption_loss_factor`: bending waves absorbed at the edges with an
  absorption coefficient ``alpha_k`` (EN ISO 12354-1:2017 Annex C, in situ; the diffuse
  bending-wave field of Cremer, Heckl & Petersson);
* :func:`laboratory_loss_factor`: the empirical total loss factor of an element built into
  the heavy opening of a test laboratory (EN ISO 12354-1:2017 Annex C, after Craik 1981).

All functions are pure and broadcast with numpy over frequency bands.
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

from ._checks import nonnegative as _nonnegative
from ._checks import positive as _positive
from .air import AIR_SOUND_SPEED

__all__ = [
    "LABORATORY_EDGE_CONSTANT",
    "edge_absorption_loss_factor",
    "laboratory_loss_factor",
]

FloatArray = npt.NDArray[np.float64]

#: The constant 485 [kg m^-2 s^-1/2] of the laboratory total loss factor
#: ``eta_int + m'/(485 sqrt(f))`` (EN ISO 12354-1:2017 Annex C, from memory; Craik 1981).
LABORATORY_EDGE_CONSTANT: float = 485.0


def edge_absorption_loss_factor(
    f: npt.ArrayLike,
    area: npt.ArrayLike,
    absorbing_length: npt.ArrayLike,
    f_c: npt.ArrayLike,
    *,
    c0: float = AIR_SOUND_SPEED,
) -> FloatArray:
    """Loss factor of a plate's bending field from absorption at its edges.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    area : float or array_like
        Plate area S [m^2].
    absorbing_length : float or array_like
        ``sum_k l_k alpha_k`` [m]: the length l_k of each edge times its bending-wave
        absorption coefficient alpha_k (0 = fully reflecting, 1 = fully absorbing).
    f_c : float or array_like
        Critical frequency of the plate in the fluid of speed ``c0`` [Hz].
    c0 : float, optional
        Speed of sound [m/s] that ``f_c`` refers to.

    Returns
    -------
    numpy.ndarray
        Edge loss factor [-].

    Notes
    -----
    EN ISO 12354-1:2017 Annex C, the edge term of the in-situ total loss factor (equation
    number from memory, C.1 in the 2000 edition)::

        eta_edge = c0 / (pi^2 S sqrt(f f_c)) * sum_k l_k alpha_k

    It is the power a diffuse bending-wave field of energy E carries onto its boundary,
    ``E c_g L / (pi S)`` per unit absorption (Cremer, Heckl & Petersson 2005, ch. 4, the
    diffuse-field flux of a plate), divided by ``omega E``: ``eta = c_g L alpha /
    (pi omega S)`` with the group speed ``c_g = 2 c_B = 2 c0 sqrt(f/f_c)``.

    References
    ----------
    .. [1] EN ISO 12354-1:2017, Building acoustics -- Estimation of acoustic performance of
       buildings from the performance of elements -- Part 1: Airborne sound insulation
       between rooms. Annex C (structural reverberation time, in situ).
    .. [2] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.
       Springer (diffuse bending-wave field and its boundary flux).
    """
    f_a = _positive("f", f)
    s = _positive("area", area)
    length = _nonnegative("absorbing_length", absorbing_length)
    fc = _positive("f_c", f_c)
    _positive("c0", c0)
    out: FloatArray = c0 * length / (np.pi**2 * s * np.sqrt(f_a * fc))
    return out


def laboratory_loss_factor(
    f: npt.ArrayLike,
    mass_per_area: npt.ArrayLike,
    internal: npt.ArrayLike,
) -> FloatArray:
    """Total loss factor of an element built into the opening of a test laboratory.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    mass_per_area : float or array_like
        Mass per unit area m' [kg/m^2].
    internal : float or array_like
        Internal loss factor eta_int of the material [-].

    Returns
    -------
    numpy.ndarray
        Total loss factor [-] (internal + the losses into the laboratory's structure).

    Notes
    -----
    EN ISO 12354-1:2017 Annex C, laboratory situation (from memory, the form and the
    constant; also in ISO 15712-1:2005 Annex C and Vigran 2008, ch. 8)::

        eta_tot,lab = eta_int + m' / (485 sqrt(f))

    An empirical fit to the structural reverberation times of masonry and concrete walls
    measured in laboratory openings (Craik 1981). The edge term grows with m': a light panel
    joined rigidly to heavy laboratory walls loses little energy into them (the impedance
    mismatch), a heavy one much more. The form includes the radiation losses of the
    measured walls only as part of the fit; for light panels the radiation couplings of an
    SEA model are the larger part and are modelled separately. It does not include the
    damping of resilient or viscoelastic mountings (gaskets, putty): give a measured loss
    factor for those, or use :func:`edge_absorption_loss_factor`. For a light panel joined
    rigidly to a heavy opening the form is of the right order: the bending power a rigid
    in-line joint of 6 mm glass to a 100 - 200 mm concrete wall takes (line-junction wave
    model) gives 0.65 - 2.7 times it (``tests/test_coincidence_dip.py``); a glazed pane
    needs 0.015 - 0.03 to rate as measured, which only its mounting can supply.

    References
    ----------
    .. [1] EN ISO 12354-1:2017, Annex C (structural reverberation time, laboratory).
    .. [2] Craik, R.J.M. (1981). "Damping of building structures." Applied Acoustics 14(5),
       347-359.
    .. [3] Vigran, T.E. (2008). Building Acoustics. Taylor & Francis, ch. 8.
    """
    f_a = _positive("f", f)
    m = _positive("mass_per_area", mass_per_area)
    eta = _nonnegative("internal", internal)
    out: FloatArray = eta + m / (LABORATORY_EDGE_CONSTANT * np.sqrt(f_a))
    return out
