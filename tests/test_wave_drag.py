"""Tests of the wave-drag component (Korn equation with Lock's fourth-power law)."""

import numpy as np
import openmdao.api as om
import pytest

from voltwake.components.wave_drag import CRITICAL_OFFSET, WaveDragComp

from partials import check_component_partials


def _run(inputs, vec_size=3):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', WaveDragComp(vec_size=vec_size), promotes=['*'])
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, np.asarray(value, dtype=float))
    prob.run_model()
    return prob


# Three wings: (1) kappa 0.95, t/c 0.12, C_L 0.5, 25 deg; (2) kappa 0.87, t/c 0.10, C_L 0.4,
# unswept; (3) as (1) at 30 deg.
WINGS = {
    'technology_factor': [0.95, 0.87, 0.95],
    'thickness_to_chord': [0.12, 0.10, 0.12],
    'lift_coefficient': [0.5, 0.4, 0.5],
    'sweep': np.radians([25.0, 0.0, 30.0]),
}
# Hand values of M_dd = kappa / cos L - (t/c) / cos**2 L - C_L / (10 cos**3 L):
# (1) 0.95 / 0.9063078 - 0.12 / 0.8213938 - 0.5 / 7.4443483 = 1.0482082 - 0.1460930 - 0.0671653
#     = 0.8349509;
# (2) 0.87 - 0.10 - 0.04 = 0.73;
# (3) 0.95 / 0.8660254 - 0.12 / 0.75 - 0.5 / 6.4951905 = 1.0969655 - 0.16 - 0.0769800
#     = 0.8599855.
MDD = np.array([0.8349509062435, 0.73, 0.8599854755683])
# M_crit = M_dd - (0.1 / 80)**(1/3) = M_dd - 0.1077217 (hand value from the equation).
OFFSET = 0.1077217345015942
# C_Dw at M_dd = 20 (0.1 / 80)**(4/3) = 20 * 1.3465217e-4 = 2.6930434e-3 (hand value).
CDW_AT_MDD = 2.6930433625399e-3


def test_offset_hand_value():
    assert CRITICAL_OFFSET == pytest.approx(OFFSET, rel=1e-14)
    # The slope of 20 (M - M_crit)**4 at M_dd is 80 * offset**3 = 0.1 by construction.
    assert 80.0 * CRITICAL_OFFSET**3 == pytest.approx(0.1, rel=1e-14)


def test_divergence_and_critical_mach_hand_values():
    prob = _run(WINGS)
    np.testing.assert_allclose(prob.get_val('drag_divergence_mach'), MDD, rtol=1e-12)
    # (1) 0.8349509 - 0.1077217 = 0.7272292.
    np.testing.assert_allclose(
        prob.get_val('critical_mach'),
        [0.7272291717419, 0.6222782654984, 0.7522637410667],
        rtol=1e-12,
    )


def test_wave_drag_and_slope_at_divergence():
    prob = _run(dict(WINGS, mach=MDD))
    np.testing.assert_allclose(prob.get_val('wave_drag_coefficient'), CDW_AT_MDD, rtol=1e-10)
    # About 27 drag counts at M_dd, the same for every wing.
    assert 0.0026 < prob.get_val('wave_drag_coefficient')[0] < 0.0028
    totals = prob.compute_totals(of=['wave_drag_coefficient'], wrt=['mach'])
    np.testing.assert_allclose(
        totals['wave_drag_coefficient', 'mach'], 0.1 * np.eye(3), rtol=1e-10, atol=1e-15
    )


def test_wave_drag_hand_value_past_divergence():
    # M = M_dd + 0.05: 20 (0.1077217 + 0.05)**4 = 20 * 6.188226e-4 = 0.01237645 (hand value),
    # 4.6 times the value at M_dd: the rise is steep.
    prob = _run(dict(WINGS, mach=MDD + 0.05))
    np.testing.assert_allclose(prob.get_val('wave_drag_coefficient'), 0.01237645233277, rtol=1e-9)


def test_negligible_well_below_divergence():
    # 0.1 below M_dd: 20 (0.0077217)**4 = 7.1e-8; below M_crit: exactly zero.
    prob = _run(dict(WINGS, mach=MDD - np.array([0.1, 0.15, 0.3])))
    cdw = prob.get_val('wave_drag_coefficient')
    assert cdw[0] == pytest.approx(7.110325e-8, rel=1e-5)
    assert np.all(cdw < 1.0e-4)
    np.testing.assert_array_equal(cdw[1:], 0.0)


def test_rise_with_mach_number():
    # Default wing (kappa 0.95, t/c 0.12, C_L 0.5, 25 deg): M_crit = 0.72723, M_dd = 0.83495.
    mach = np.array([0.70, 0.72, 0.74, 0.78, 0.82, 0.86, 0.90])
    prob = _run({'mach': mach}, vec_size=mach.size)
    cdw = prob.get_val('wave_drag_coefficient')
    np.testing.assert_array_equal(cdw[:2], 0.0)
    assert np.all(np.diff(cdw[1:]) > 0.0)
    assert np.all(np.diff(cdw, 2)[1:] > 0.0)  # convex: the rise steepens
    assert cdw[3] < 2.0e-4  # 1.6 counts at the default cruise Mach number 0.78
    assert cdw[-1] > 10.0 * cdw[4]


def test_cubic_contact_at_critical_mach():
    # Just above M_crit the drag and its slope vanish as eps**4 and eps**3.
    eps = np.array([1.0e-2, 1.0e-3, -1.0e-3])
    prob = _run({'mach': 0.727229171741916 + eps})
    cdw = prob.get_val('wave_drag_coefficient')
    np.testing.assert_allclose(cdw[:2], 20.0 * eps[:2] ** 4, rtol=1e-6)
    assert cdw[2] == 0.0
    slope = np.diag(
        prob.compute_totals(of=['wave_drag_coefficient'], wrt=['mach'])[
            'wave_drag_coefficient', 'mach'
        ]
    )
    np.testing.assert_allclose(slope[:2], 80.0 * eps[:2] ** 3, rtol=1e-6)
    assert slope[2] == 0.0


@pytest.mark.parametrize(
    'name, values, sign',
    [
        ('sweep', np.radians([10.0, 25.0, 35.0]), 1.0),
        ('thickness_to_chord', [0.09, 0.12, 0.15], -1.0),
        ('lift_coefficient', [0.3, 0.5, 0.7], -1.0),
        ('technology_factor', [0.87, 0.91, 0.95], 1.0),
    ],
)
def test_trends(name, values, sign):
    # M_dd rises with sweep and technology factor and falls with t/c and C_L; at a fixed
    # Mach number above M_crit the wave drag moves the other way.
    prob = _run({name: values, 'mach': [0.84] * 3})
    mdd = prob.get_val('drag_divergence_mach')
    assert np.all(sign * np.diff(mdd) > 0.0)
    np.testing.assert_allclose(prob.get_val('critical_mach'), mdd - OFFSET, rtol=1e-14)
    assert np.all(-sign * np.diff(prob.get_val('wave_drag_coefficient')) > 0.0)


POINTS = [
    # Default wing at three Mach numbers: above, below and above M_crit = 0.72723.
    {
        'mach': [0.78, 0.70, 0.86],
        'lift_coefficient': [0.5, 0.45, 0.55],
        'sweep': np.radians([25.0, 27.0, 23.0]),
        'thickness_to_chord': [0.12, 0.11, 0.13],
        'technology_factor': [0.95, 0.95, 0.95],
    },
    # Conventional sections (M_crit near 0.62-0.66): below, above, above.
    {
        'mach': [0.55, 0.72, 0.80],
        'lift_coefficient': [0.6, 0.4, 0.3],
        'sweep': np.radians([0.0, 15.0, 35.0]),
        'thickness_to_chord': [0.15, 0.10, 0.09],
        'technology_factor': [0.87, 0.87, 0.87],
    },
    # Mixed: above, below, above.
    {
        'mach': [0.85, 0.60, 0.75],
        'lift_coefficient': [0.7, 0.2, 0.5],
        'sweep': np.radians([30.0, 10.0, 20.0]),
        'thickness_to_chord': [0.10, 0.14, 0.12],
        'technology_factor': [0.92, 0.90, 0.89],
    },
]


@pytest.mark.parametrize('point', POINTS)
def test_partials(point):
    prob = check_component_partials(WaveDragComp(vec_size=3), point)
    # Each point has designs on both sides of M_crit.
    above = prob.get_val('mach') > prob.get_val('critical_mach')
    assert above.any() and not above.all()
