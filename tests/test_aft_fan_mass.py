"""Tests of the aft-fan installation mass."""

import numpy as np
import openmdao.api as om
import pytest

from voltwake.components.aft_fan_mass import AftFanMassComp

from partials import check_component_partials


def test_aft_fan_mass_hand_value():
    # m = (1 + f_s)(m''_fan A + m''_nac S_wet), areal-mass scaling (common practice); hand
    # calculation for an annulus of tip 2.4 m round a 1.8 m hub, A = pi/4 (2.4^2 - 1.8^2):
    # 1.2 (150 A + 15 * 15).
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('mass', AftFanMassComp(), promotes=['*'])
    prob.setup()
    prob.set_val('fan_face_area', np.pi / 4.0 * (2.4**2 - 1.8**2))
    prob.set_val('fan_areal_mass', 150.0)
    prob.set_val('nacelle_wetted_area', 15.0)
    prob.set_val('nacelle_areal_mass', 15.0)
    prob.set_val('structure_fraction', 0.2)
    prob.run_model()
    area = np.pi / 4.0 * (2.4**2 - 1.8**2)
    assert prob.get_val('mass')[0] == pytest.approx(1.2 * (150.0 * area + 225.0), rel=1e-14)


def test_aft_fan_mass_scales_with_face_area():
    # Fan part alone (no nacelle, no structure): doubling the annulus doubles the mass.
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('mass', AftFanMassComp(vec_size=2), promotes=['*'])
    prob.setup()
    prob.set_val('fan_face_area', [1.0, 2.0])
    prob.set_val('nacelle_wetted_area', 0.0)
    prob.set_val('structure_fraction', 0.0)
    prob.run_model()
    mass = prob.get_val('mass')
    assert mass[1] / mass[0] == pytest.approx(2.0, rel=1e-14)


def test_aft_fan_mass_partials():
    check_component_partials(
        AftFanMassComp(vec_size=3),
        {
            'fan_face_area': [1.2, 2.0, 3.1],
            'fan_areal_mass': [120.0, 150.0, 200.0],
            'nacelle_wetted_area': [8.0, 15.0, 30.0],
            'nacelle_areal_mass': [10.0, 15.0, 22.0],
            'structure_fraction': [0.1, 0.2, 0.35],
        },
    )
    check_component_partials(
        AftFanMassComp(vec_size=3),
        {
            'fan_face_area': [0.5, 4.0, 1.8],
            'fan_areal_mass': [90.0, 250.0, 140.0],
            'nacelle_wetted_area': [3.0, 45.0, 12.0],
            'nacelle_areal_mass': [8.0, 25.0, 12.0],
            'structure_fraction': [0.0, 0.5, 0.15],
        },
    )
