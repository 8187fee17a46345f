r"""
Turbulent flat-plate skin friction with a compressibility correction.

Shared by the drag build-up of bodies (``BodyDragComp``) and lifting surfaces
(``LiftingSurfaceDragComp``) so that both use the same formula:

.. math::

    c_f = \frac{0.455}{(\log_{10} Re)^{2.58}\,(1 + 0.144 M^2)^{0.65}}

The first factor is the Prandtl-Schlichting fully turbulent flat-plate skin friction, the
second the compressibility correction for an adiabatic wall (Raymer, Aircraft Design: A
Conceptual Approach, 6th ed., ch. 12, parasite drag, eq. 12.27; equation number from
memory). At M = 0 the correction is 1; at the cruise Mach number 0.78 it is
:math:`1.0876^{-0.65} = 0.9469`, about 5 % less friction.

Attributes
----------
PRANDTL_SCHLICHTING_CONSTANT : float
    Numerator 0.455 of the skin-friction formula.
REYNOLDS_EXPONENT : float
    Exponent 2.58 on :math:`\log_{10} Re`.
COMPRESSIBILITY_SLOPE : float
    Coefficient 0.144 on :math:`M^2` in the compressibility correction.
COMPRESSIBILITY_EXPONENT : float
    Exponent 0.65 of the compressibility correction.
"""

import numpy as np

PRANDTL_SCHLICHTING_CONSTANT = 0.455
REYNOLDS_EXPONENT = 2.58
COMPRESSIBILITY_SLOPE = 0.144
COMPRESSIBILITY_EXPONENT = 0.65

_LN10 = np.log(10.0)


def compressibility_factor(mach):
    r"""
    Return the compressibility correction of the turbulent skin friction and its derivative.

    .. math::

        k_M = (1 + 0.144 M^2)^{-0.65}

    Parameters
    ----------
    mach : ndarray
        Flight Mach number.

    Returns
    -------
    tuple of ndarray
        :math:`k_M` and :math:`dk_M/dM`.
    """
    base = 1.0 + COMPRESSIBILITY_SLOPE * mach**2
    factor = base**-COMPRESSIBILITY_EXPONENT
    return factor, -COMPRESSIBILITY_EXPONENT * factor * 2.0 * COMPRESSIBILITY_SLOPE * mach / base


def turbulent_skin_friction(reynolds, mach):
    r"""
    Return the turbulent flat-plate skin-friction coefficient and its partials.

    .. math::

        c_f = \frac{0.455}{(\log_{10} Re)^{2.58}\,(1 + 0.144 M^2)^{0.65}}

    (Raymer, Aircraft Design: A Conceptual Approach, 6th ed., ch. 12, eq. 12.27; equation
    number from memory). Complex-step safe: no branches, no absolute values. Needs
    :math:`Re > 1`.

    Parameters
    ----------
    reynolds : ndarray
        Reynolds number on the reference length.
    mach : ndarray
        Flight Mach number.

    Returns
    -------
    cf : ndarray
        Skin-friction coefficient.
    dcf_dre : ndarray
        :math:`\partial c_f / \partial Re`.
    dcf_dmach : ndarray
        :math:`\partial c_f / \partial M`.
    """
    log_re = np.log10(reynolds)
    factor, dfactor_dmach = compressibility_factor(mach)
    incompressible = PRANDTL_SCHLICHTING_CONSTANT / log_re**REYNOLDS_EXPONENT
    cf = incompressible * factor
    dcf_dre = -REYNOLDS_EXPONENT * cf / (log_re * _LN10 * reynolds)
    return cf, dcf_dre, incompressible * dfactor_dmach
