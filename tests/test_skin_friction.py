"""Tests of the compressibility-corrected turbulent flat-plate skin friction."""

import numpy as np
import pytest

from voltwake.components.skin_friction import compressibility_factor, turbulent_skin_friction

# Prandtl-Schlichting cf = 0.455 / (log10 Re)**2.58 at Re = 1e6, 1e7, 1e8, evaluated by hand:
# 0.455 / 6**2.58, 0.455 / 7**2.58, 0.455 / 8**2.58 (the incompressible values).
INCOMPRESSIBLE = np.array([0.004470758085612, 0.003003713133159, 0.002128331291413])
REYNOLDS = np.array([1.0e6, 1.0e7, 1.0e8])


def test_compressibility_factor_hand_values():
    # Hand values from k = (1 + 0.144 M**2)**-0.65 (Raymer, Aircraft Design: A Conceptual
    # Approach, 6th ed., ch. 12, eq. 12.27; equation number from memory):
    # M = 0: 1; M = 0.78: 1.0876096**-0.65 = 0.9468747 (about 5 % less friction);
    # M = 0.85: 1.10404**-0.65 = 0.9376913.
    factor, _ = compressibility_factor(np.array([0.0, 0.78, 0.85]))
    np.testing.assert_allclose(factor, [1.0, 0.9468747357762, 0.9376912739477], rtol=1e-12)
    assert 0.94 < factor[1] < 0.95


def test_zero_mach_is_incompressible():
    cf, _, dcf_dmach = turbulent_skin_friction(REYNOLDS, np.zeros(3))
    np.testing.assert_allclose(cf, INCOMPRESSIBLE, rtol=1e-12)
    # The correction is even in M, so it is flat at M = 0.
    np.testing.assert_array_equal(dcf_dmach, 0.0)


def test_corrected_hand_values():
    # cf = incompressible value times the factor above, at M = 0.3, 0.78, 0.85:
    # 0.3: 1.01296**-0.65 = 0.9916651 (hand value from the equation).
    cf, _, _ = turbulent_skin_friction(REYNOLDS, np.array([0.3, 0.78, 0.85]))
    np.testing.assert_allclose(
        cf, INCOMPRESSIBLE * [0.9916650503421787, 0.9468747357762, 0.9376912739477], rtol=1e-12
    )
    # Re = 1e7, M = 0.78: 0.0030037131 * 0.9468747 = 0.0028441401.
    assert cf[1] == pytest.approx(2.84414007931e-3, rel=1e-10)


def test_trends():
    # Skin friction falls with Reynolds number at fixed Mach number and with Mach number at
    # fixed Reynolds number.
    cf_re, dcf_dre, _ = turbulent_skin_friction(REYNOLDS, np.full(3, 0.78))
    assert np.all(np.diff(cf_re) < 0.0) and np.all(dcf_dre < 0.0)
    mach = np.array([0.2, 0.5, 0.85])
    cf_m, _, dcf_dmach = turbulent_skin_friction(np.full(3, 1.0e7), mach)
    assert np.all(np.diff(cf_m) < 0.0) and np.all(dcf_dmach < 0.0)


@pytest.mark.parametrize(
    'reynolds, mach',
    [
        ([1.0e6, 2.0e7, 3.0e8], [0.3, 0.78, 0.85]),
        ([5.0e8, 1.4e7, 3.0e6], [0.85, 0.3, 0.78]),
    ],
)
def test_partials_by_complex_step(reynolds, mach):
    reynolds = np.array(reynolds)
    mach = np.array(mach)
    cf, dcf_dre, dcf_dmach = turbulent_skin_friction(reynolds, mach)
    step = 1.0e-30
    cs_re = turbulent_skin_friction(reynolds * (1.0 + 1j * step), mach)[0].imag / (reynolds * step)
    cs_mach = turbulent_skin_friction(reynolds, mach + 1j * step)[0].imag / step
    np.testing.assert_allclose(dcf_dre, cs_re, rtol=1e-12, atol=0.0)
    np.testing.assert_allclose(dcf_dmach, cs_mach, rtol=1e-12, atol=0.0)
    # Complex inputs with zero imaginary part give the real result.
    np.testing.assert_allclose(
        turbulent_skin_friction(reynolds + 0j, mach + 0j)[0].real, cf, rtol=1e-14
    )
