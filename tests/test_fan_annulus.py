"""Tests of FanAnnulusComp: annulus geometry with the hub set by a ratio or by a diameter."""

import math

import numpy as np
import openmdao.api as om
import pytest

from voltwake.components.fan_annulus import FanAnnulusComp

from partials import check_component_partials


def _run(hub, **inputs):
    size = len(next(iter(inputs.values())))
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('annulus', FanAnnulusComp(vec_size=size, hub=hub), promotes=['*'])
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, value)
    prob.run_model()
    return prob


def test_hub_ratio_hand_values():
    # Annulus area pi/4 (D^2 - d^2) (geometry; common practice): D = 2 m, nu = 0.3.
    area = math.pi / 4.0 * 2.0**2 * (1.0 - 0.3**2)
    prob = _run('ratio', fan_face_area=[area], hub_to_tip_ratio=[0.3])
    assert prob.get_val('fan_diameter')[0] == pytest.approx(2.0, rel=1e-14)
    assert prob.get_val('hub_diameter')[0] == pytest.approx(0.6, rel=1e-14)


def test_hub_diameter_hand_values():
    # Hub 1.8 m, tip 2.4 m: area pi/4 (2.4^2 - 1.8^2) = 1.9792 m**2, nu = 0.75.
    area = math.pi / 4.0 * (2.4**2 - 1.8**2)
    prob = _run('diameter', fan_face_area=[area], hub_diameter=[1.8])
    assert prob.get_val('fan_diameter')[0] == pytest.approx(2.4, rel=1e-14)
    assert prob.get_val('hub_to_tip_ratio')[0] == pytest.approx(0.75, rel=1e-14)


def test_same_annulus_both_ways():
    # The two options describe one annulus: feeding the ratio found from a hub diameter back
    # in gives the same tip and hub.
    areas, hubs = [0.8, 1.4, 2.5], [1.2, 1.8, 2.6]
    by_diameter = _run('diameter', fan_face_area=areas, hub_diameter=hubs)
    ratios = by_diameter.get_val('hub_to_tip_ratio')
    by_ratio = _run('ratio', fan_face_area=areas, hub_to_tip_ratio=ratios)
    assert np.allclose(by_ratio.get_val('fan_diameter'), by_diameter.get_val('fan_diameter'))
    assert np.allclose(by_ratio.get_val('hub_diameter'), hubs, rtol=1e-13)


def test_a_small_area_round_a_large_hub_gives_a_short_blade():
    # Trend: at a fixed hub, a smaller annulus pushes the hub-to-tip ratio towards 1.
    prob = _run('diameter', fan_face_area=[2.0, 0.5, 0.05], hub_diameter=[1.8, 1.8, 1.8])
    ratios = prob.get_val('hub_to_tip_ratio')
    assert np.all(np.diff(ratios) > 0.0) and ratios[-1] > 0.98


@pytest.mark.parametrize('hub', ['ratio', 'diameter'])
def test_partials(hub):
    hub_input = {'ratio': [0.25, 0.45, 0.6], 'diameter': [1.2, 1.8, 2.6]}[hub]
    name = 'hub_to_tip_ratio' if hub == 'ratio' else 'hub_diameter'
    check_component_partials(
        FanAnnulusComp(vec_size=3, hub=hub), {'fan_face_area': [0.8, 1.4, 2.5], name: hub_input}
    )
    check_component_partials(
        FanAnnulusComp(vec_size=3, hub=hub),
        {'fan_face_area': [3.0, 0.3, 1.1], name: hub_input[::-1]},
    )
