"""Tests of the tail sizing by volume coefficients and the statistical tail masses."""

import numpy as np
import openmdao.api as om
import pytest

from voltwake.components.tail import TailMassComp, TailSizingComp

from partials import check_component_partials

# Exact unit definitions, written out again here so that the hand values below do not
# depend on the module's constants.
KG_PER_LB = 0.45359237
M_PER_FT = 0.3048


def _run(component, inputs):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', component, promotes=['*'])
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, np.asarray(value, dtype=float))
    prob.run_model()
    return prob


def _imperial_tail_masses(m_kg, n_z, s_ht_m2, s_vt_m2, arm_m):
    """Raymer's printed cargo/transport tail equations in lb and ft, converted to kg.

    Configuration constants of a conventional low-tail transport, as documented in
    TailMassComp: K_uht 1, F_w/B_h 0.2, K_y 0.3 L_t, K_z L_t, A_ht 4.5, sweep_ht 30 deg,
    S_e/S_ht 0.25, H_t/H_v 0, A_vt 1.6, sweep_vt 35 deg, (t/c)_vt 0.10.
    """
    w_dg = np.asarray(m_kg) / KG_PER_LB  # lb
    s_ht = np.asarray(s_ht_m2) / M_PER_FT**2  # ft**2
    s_vt = np.asarray(s_vt_m2) / M_PER_FT**2  # ft**2
    l_t = np.asarray(arm_m) / M_PER_FT  # ft
    k_y = 0.3 * l_t
    k_z = l_t
    w_ht = (
        0.0379
        * 1.0
        * (1.0 + 0.2) ** -0.25
        * w_dg**0.639
        * n_z**0.10
        * s_ht**0.75
        * l_t**-1
        * k_y**0.704
        / np.cos(np.deg2rad(30.0))
        * 4.5**0.166
        * (1.0 + 0.25) ** 0.1
    )
    w_vt = (
        0.0026
        * (1.0 + 0.0) ** 0.225
        * w_dg**0.556
        * n_z**0.536
        * l_t**-0.5
        * s_vt**0.5
        * k_z**0.875
        / np.cos(np.deg2rad(35.0))
        * 1.6**0.35
        * 0.10**-0.5
    )
    return w_ht * KG_PER_LB, w_vt * KG_PER_LB


# ---------------------------------------------------------------- tail sizing


def test_sizing_hand_values():
    # hand values from the volume-coefficient equations in TailSizingComp:
    # point 1: S 100, A 4 -> b 20, cbar 5; L 0.5 x 40 = 20;
    #          S_HT = 1.0 x 5 x 100/20 = 25; S_VT = 0.09 x 20 x 100/20 = 9
    # point 2: S 64, A 16 -> b 32, cbar 2; L 0.5 x 32 = 16;
    #          S_HT = 0.8 x 2 x 64/16 = 6.4; S_VT = 0.09 x 32 x 64/16 = 11.52
    # point 3: S 81, A 9 -> b 27, cbar 3; L 0.6 x 45 = 27;
    #          S_HT = 1.1 x 3 x 81/27 = 9.9; S_VT = 0.1 x 27 x 81/27 = 8.1
    prob = _run(
        TailSizingComp(vec_size=3),
        {
            'wing_area': [100.0, 64.0, 81.0],
            'aspect_ratio': [4.0, 16.0, 9.0],
            'fuselage_length': [40.0, 32.0, 45.0],
            'horizontal_tail_volume_coefficient': [1.0, 0.8, 1.1],
            'vertical_tail_volume_coefficient': [0.09, 0.09, 0.1],
            'tail_arm_fraction': [0.5, 0.5, 0.6],
        },
    )
    np.testing.assert_allclose(prob.get_val('tail_arm', units='m'), [20.0, 16.0, 27.0])
    np.testing.assert_allclose(
        prob.get_val('horizontal_tail_area', units='m**2'), [25.0, 6.4, 9.9], rtol=1e-14
    )
    np.testing.assert_allclose(
        prob.get_val('vertical_tail_area', units='m**2'), [9.0, 11.52, 8.1], rtol=1e-14
    )


def test_sizing_plausibility_70t_twin():
    # hand values from the volume-coefficient equations with the defaults c_HT 1.00,
    # c_VT 0.09, tail arm 0.5 x 38 m = 19 m: b = sqrt(9.5 x 122) = 34.0441 m,
    # cbar = 122/34.0441 = 3.58359 m, S_HT = 3.58359 x 122/19 = 23.0104 m**2,
    # S_VT = 0.09 x 34.0441 x 122/19 = 19.6739 m**2
    prob = _run(
        TailSizingComp(), {'wing_area': 122.0, 'aspect_ratio': 9.5, 'fuselage_length': 38.0}
    )
    s_ht = prob.get_val('horizontal_tail_area', units='m**2')[0]
    s_vt = prob.get_val('vertical_tail_area', units='m**2')[0]
    assert s_ht == pytest.approx(23.0104, rel=1e-5)
    assert s_vt == pytest.approx(19.6739, rel=1e-5)
    # Plausibility check only (not a validation): a 70 t single-aisle twin has tail areas
    # near 30 m**2 (horizontal) and 25 m**2 (vertical) (typical of the class, from memory).
    # Generous band of +-30 %; the method sits low because it uses the geometric mean chord
    # S/b, shorter than the mean aerodynamic chord, and an arm of half the fuselage length.
    assert 0.7 * 30.0 < s_ht < 1.3 * 30.0
    assert 0.7 * 25.0 < s_vt < 1.3 * 25.0


@pytest.mark.parametrize(
    'name, values',
    [
        ('wing_area', [90.0, 122.0, 180.0]),  # larger wing -> larger tails
        ('fuselage_length', [45.0, 38.0, 30.0]),  # shorter fuselage -> shorter arm
        ('tail_arm_fraction', [0.6, 0.5, 0.4]),  # shorter arm -> larger tails
    ],
)
def test_sizing_trends(name, values):
    prob = _run(TailSizingComp(vec_size=3), {name: values})
    assert np.all(np.diff(prob.get_val('horizontal_tail_area')) > 0.0)
    assert np.all(np.diff(prob.get_val('vertical_tail_area')) > 0.0)


def test_sizing_aspect_ratio_trend():
    # at fixed wing area a higher aspect ratio shortens the chord (smaller horizontal tail)
    # and lengthens the span (larger vertical tail)
    prob = _run(TailSizingComp(vec_size=3), {'aspect_ratio': [7.0, 9.5, 12.0]})
    assert np.all(np.diff(prob.get_val('horizontal_tail_area')) < 0.0)
    assert np.all(np.diff(prob.get_val('vertical_tail_area')) > 0.0)


def test_sizing_partials():
    for point in (
        {
            'wing_area': [100.0, 64.0, 122.0],
            'aspect_ratio': [4.0, 16.0, 9.5],
            'fuselage_length': [40.0, 32.0, 38.0],
            'horizontal_tail_volume_coefficient': [1.0, 0.8, 1.1],
            'vertical_tail_volume_coefficient': [0.09, 0.07, 0.1],
            'tail_arm_fraction': [0.5, 0.45, 0.55],
        },
        {
            'wing_area': [360.0, 30.0, 200.0],
            'aspect_ratio': [9.0, 11.0, 7.5],
            'fuselage_length': [70.0, 20.0, 50.0],
            'horizontal_tail_volume_coefficient': [0.9, 0.6, 1.0],
            'vertical_tail_volume_coefficient': [0.08, 0.05, 0.09],
            'tail_arm_fraction': [0.48, 0.6, 0.5],
        },
    ):
        check_component_partials(TailSizingComp(vec_size=3), point)


# ---------------------------------------------------------------- tail mass


def test_mass_hand_values():
    # independent imperial evaluation of the printed equations (Raymer, 6th ed., ch. 15,
    # eqs. 15.26 and 15.27, from memory) with the fixed constants of TailMassComp
    inputs = {
        'design_mass': [7.0e4, 2.0e4, 3.0e5],
        'ultimate_load_factor': [3.75, 3.8, 4.2],
        'horizontal_tail_area': [23.0104, 9.0, 90.0],
        'vertical_tail_area': [19.6739, 8.0, 60.0],
        'tail_arm': [19.0, 11.0, 33.0],
    }
    prob = _run(TailMassComp(vec_size=3), inputs)
    m_ht, m_vt = _imperial_tail_masses(*(np.asarray(v) for v in inputs.values()))
    np.testing.assert_allclose(prob.get_val('horizontal_tail_mass', units='kg'), m_ht, rtol=1e-12)
    np.testing.assert_allclose(prob.get_val('vertical_tail_mass', units='kg'), m_vt, rtol=1e-12)
    # hand values of the 70 t twin (first point): 462.37 kg and 572.96 kg
    assert m_ht[0] == pytest.approx(462.37, rel=1e-4)
    assert m_vt[0] == pytest.approx(572.96, rel=1e-4)


@pytest.mark.parametrize(
    'name, values',
    [
        ('design_mass', [5e4, 7e4, 9e4]),
        ('ultimate_load_factor', [3.0, 3.75, 4.5]),
    ],
)
def test_mass_trends_mass_and_load(name, values):
    prob = _run(TailMassComp(vec_size=3), {name: values})
    assert np.all(np.diff(prob.get_val('horizontal_tail_mass')) > 0.0)
    assert np.all(np.diff(prob.get_val('vertical_tail_mass')) > 0.0)


def test_mass_trends_area_and_arm():
    prob = _run(
        TailMassComp(vec_size=3),
        {'horizontal_tail_area': [15.0, 25.0, 35.0], 'vertical_tail_area': [12.0, 20.0, 28.0]},
    )
    assert np.all(np.diff(prob.get_val('horizontal_tail_mass')) > 0.0)
    assert np.all(np.diff(prob.get_val('vertical_tail_mass')) > 0.0)
    # at fixed area the arm enters as L^-0.296 (HT, via K_y = 0.3 L_t) and L^0.375 (VT, via
    # K_z = L_t); hand value from the equations: 2**-0.296 and 2**0.375 for a doubled arm
    prob = _run(TailMassComp(vec_size=3), {'tail_arm': [10.0, 20.0, 40.0]})
    np.testing.assert_allclose(
        prob.get_val('horizontal_tail_mass')[1:] / prob.get_val('horizontal_tail_mass')[:-1],
        2.0**-0.296,
        rtol=1e-12,
    )
    np.testing.assert_allclose(
        prob.get_val('vertical_tail_mass')[1:] / prob.get_val('vertical_tail_mass')[:-1],
        2.0**0.375,
        rtol=1e-12,
    )


def test_sized_tails_heavier_with_larger_wing_or_shorter_arm():
    # chained sizing and mass: the tail area goes as 1/L, so the masses go as
    # L^(-0.75 - 0.296) (HT) and L^(-0.5 + 0.375) (VT): both grow as the arm shrinks
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('size', TailSizingComp(vec_size=3), promotes=['*'])
    prob.model.add_subsystem('mass', TailMassComp(vec_size=3), promotes=['*'])
    prob.setup()
    prob.set_val('wing_area', [90.0, 122.0, 180.0])
    prob.run_model()
    assert np.all(np.diff(prob.get_val('horizontal_tail_mass')) > 0.0)
    assert np.all(np.diff(prob.get_val('vertical_tail_mass')) > 0.0)
    prob.set_val('wing_area', 122.0)
    prob.set_val('fuselage_length', [45.0, 38.0, 30.0])
    prob.run_model()
    assert np.all(np.diff(prob.get_val('horizontal_tail_mass')) > 0.0)
    assert np.all(np.diff(prob.get_val('vertical_tail_mass')) > 0.0)


def test_mass_partials():
    for point in (
        {
            'design_mass': [7.0e4, 2.0e4, 3.0e5],
            'ultimate_load_factor': [3.75, 3.8, 4.2],
            'horizontal_tail_area': [23.0, 9.0, 90.0],
            'vertical_tail_area': [19.7, 8.0, 60.0],
            'tail_arm': [19.0, 11.0, 33.0],
        },
        {
            'design_mass': [1.2e5, 5.0e4, 8.0e3],
            'ultimate_load_factor': [4.5, 3.0, 3.75],
            'horizontal_tail_area': [40.0, 18.0, 4.0],
            'vertical_tail_area': [30.0, 15.0, 3.5],
            'tail_arm': [24.0, 16.0, 6.0],
        },
    ):
        check_component_partials(TailMassComp(vec_size=3), point)
