"""Tests of the statistical transport wing mass."""

import numpy as np
import openmdao.api as om
import pytest

from voltwake.components.wing_mass import WingMassComp

from partials import check_component_partials

# Exact unit definitions, written out again here so that the hand values below do not
# depend on the module's constants.
KG_PER_LB = 0.45359237
M_PER_FT = 0.3048


def _run(component, inputs, units=None):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', component, promotes=['*'])
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, np.asarray(value, dtype=float), units=(units or {}).get(name))
    prob.run_model()
    return prob


def _imperial_wing_mass(m_kg, n_z, s_m2, aspect, sweep_rad, tc, taper, f_cs, k_tech=1.0):
    """Raymer's printed cargo/transport wing equation in lb and ft**2, converted to kg."""
    w_dg = np.asarray(m_kg) / KG_PER_LB  # design weight, lb (lbf = lbm at standard gravity)
    s_w = np.asarray(s_m2) / M_PER_FT**2  # wing area, ft**2
    s_csw = np.asarray(f_cs) * s_w  # wing-mounted control-surface area, ft**2
    w_lb = (
        0.0051
        * (w_dg * n_z) ** 0.557
        * s_w**0.649
        * aspect**0.5
        * tc**-0.4
        * (1.0 + taper) ** 0.1
        * np.cos(sweep_rad) ** -1
        * s_csw**0.1
    )
    return k_tech * w_lb * KG_PER_LB


def test_default_inputs_hand_value():
    # hand value from the equation above (Raymer, 6th ed., ch. 15, eq. 15.25, from memory),
    # evaluated in lb and ft**2 for 70,000 kg, N_z 3.75, 122 m**2, A 9.5, 25 deg, t/c 0.12,
    # taper 0.25, S_csw/S_w 0.2: 12,376.5 lb = 5,613.90 kg
    prob = _run(WingMassComp(), {})
    expected = _imperial_wing_mass(7.0e4, 3.75, 122.0, 9.5, np.deg2rad(25.0), 0.12, 0.25, 0.2)
    assert expected == pytest.approx(5613.90, rel=1e-6)
    assert prob.get_val('wing_mass', units='kg')[0] == pytest.approx(expected, rel=1e-12)


def test_hand_values_vectorised():
    # independent imperial evaluation of the printed equation at three different designs
    inputs = {
        'design_mass': [2.0e4, 7.8e4, 3.0e5],
        'ultimate_load_factor': [3.75, 3.8, 3.75],
        'wing_area': [60.0, 125.0, 360.0],
        'aspect_ratio': [8.0, 10.5, 9.0],
        'sweep': np.deg2rad([15.0, 27.0, 32.0]),
        'thickness_to_chord': [0.15, 0.11, 0.105],
        'taper_ratio': [0.4, 0.24, 0.2],
        'control_surface_fraction': [0.15, 0.2, 0.25],
        'technology_factor': [1.0, 0.9, 0.85],
    }
    prob = _run(WingMassComp(vec_size=3), inputs)
    a = {k: np.asarray(v, dtype=float) for k, v in inputs.items()}
    expected = _imperial_wing_mass(
        a['design_mass'],
        a['ultimate_load_factor'],
        a['wing_area'],
        a['aspect_ratio'],
        a['sweep'],
        a['thickness_to_chord'],
        a['taper_ratio'],
        a['control_surface_fraction'],
        a['technology_factor'],
    )
    np.testing.assert_allclose(prob.get_val('wing_mass', units='kg'), expected, rtol=1e-12)


def test_declared_units_convert():
    # the same design given in lbm, ft**2 and deg gives the same wing mass (declared units)
    si = _run(WingMassComp(), {})
    imperial = _run(
        WingMassComp(),
        {'design_mass': 7.0e4 / KG_PER_LB, 'wing_area': 122.0 / M_PER_FT**2, 'sweep': 25.0},
        units={'design_mass': 'lbm', 'wing_area': 'ft**2', 'sweep': 'deg'},
    )
    assert imperial.get_val('wing_mass', units='lbm')[0] == pytest.approx(
        si.get_val('wing_mass', units='kg')[0] / KG_PER_LB, rel=1e-12
    )


def test_limits_technology_factor_and_no_sweep():
    # technology factor multiplies the result; zero sweep removes the 1/cos factor
    base = _run(WingMassComp(vec_size=3), {'sweep': 0.0})
    scaled = _run(WingMassComp(vec_size=3), {'sweep': 0.0, 'technology_factor': [0.5, 0.85, 1.2]})
    np.testing.assert_allclose(
        scaled.get_val('wing_mass'), base.get_val('wing_mass') * [0.5, 0.85, 1.2], rtol=1e-14
    )
    swept = _run(WingMassComp(), {'sweep': np.deg2rad(60.0)})
    # cos 60 deg = 1/2: the swept wing is exactly twice as heavy (formula limit)
    assert swept.get_val('wing_mass')[0] == pytest.approx(2.0 * base.get_val('wing_mass')[0])


@pytest.mark.parametrize(
    'name, values, rises',
    [
        ('aspect_ratio', [7.0, 9.5, 12.0], True),
        ('sweep', np.deg2rad([10.0, 25.0, 35.0]), True),
        ('ultimate_load_factor', [3.0, 3.75, 4.5], True),
        ('wing_area', [90.0, 122.0, 180.0], True),
        ('design_mass', [5e4, 7e4, 9e4], True),
        ('thickness_to_chord', [0.09, 0.12, 0.15], False),
    ],
)
def test_trends(name, values, rises):
    mass = _run(WingMassComp(vec_size=3), {name: values}).get_val('wing_mass')
    steps = np.diff(mass)
    assert np.all(steps > 0.0) if rises else np.all(steps < 0.0)


def test_partials():
    for point in (
        {
            'design_mass': [2.0e4, 7.8e4, 3.0e5],
            'ultimate_load_factor': [3.75, 3.8, 4.2],
            'wing_area': [60.0, 125.0, 360.0],
            'aspect_ratio': [8.0, 10.5, 9.0],
            'sweep': np.deg2rad([15.0, 27.0, 32.0]),
            'thickness_to_chord': [0.15, 0.11, 0.105],
            'taper_ratio': [0.4, 0.24, 0.2],
            'control_surface_fraction': [0.15, 0.2, 0.25],
            'technology_factor': [1.0, 0.9, 0.85],
        },
        {
            'design_mass': [5.0e4, 1.2e5, 7.0e4],
            'ultimate_load_factor': [3.0, 4.5, 3.75],
            'wing_area': [100.0, 200.0, 122.0],
            'aspect_ratio': [12.0, 7.5, 9.5],
            'sweep': np.deg2rad([0.5, 35.0, 25.0]),
            'thickness_to_chord': [0.13, 0.09, 0.12],
            'taper_ratio': [0.3, 0.15, 0.25],
            'control_surface_fraction': [0.1, 0.3, 0.2],
            'technology_factor': [1.1, 0.8, 1.0],
        },
    ):
        check_component_partials(WingMassComp(vec_size=3), point)
