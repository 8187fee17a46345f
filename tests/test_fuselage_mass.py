"""Tests of the statistical fuselage mass component."""

import numpy as np
import openmdao.api as om
import pytest

from voltwake.components.fuselage_mass import FuselageMassComp

from partials import check_component_partials

# Unit definitions for the independent imperial evaluation, written differently from the
# module: 1 ft = 12 in, 1 in = 2.54 cm (exact); 1 lb = 0.45359237 kg (exact).
M_PER_FT = 12.0 * 0.0254
KG_PER_LB = 0.45359237


def _run(inputs, vec_size=3):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', FuselageMassComp(vec_size=vec_size), promotes=['*'])
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, np.asarray(value, dtype=float))
    prob.run_model()
    return prob


def _imperial_fuselage_kg(
    mass_kg, n_z, length_m, area_m2, depth_m, span_m, sweep_deg, taper, k_p=1.0
):
    """Raymer's transport fuselage equation (6th ed., ch. 15; from memory) in lb and ft."""
    w_dg = mass_kg / KG_PER_LB
    length = length_m / M_PER_FT
    area = area_m2 / M_PER_FT**2
    depth = depth_m / M_PER_FT
    span = span_m / M_PER_FT
    k_ws = 0.75 * (1.0 + 2.0 * taper) / (1.0 + taper) * span * np.tan(np.radians(sweep_deg))
    k_ws = k_ws / length
    w_f = (
        0.3280
        * 1.06  # K_door, one side cargo door
        * 1.0  # K_Lg, wing-mounted main gear
        * (w_dg * n_z) ** 0.5
        * length**0.25
        * area**0.302
        * (1.0 + k_ws) ** 0.04
        * (length / depth) ** 0.10
    )
    return k_p * w_f * KG_PER_LB


# 70 t, 120-seat twin: 37 m x 3.9 m fuselage, wetted area from BodyDragComp's fuselage
# formula pi D L (1 - 2/f)**(2/3) (1 + 1/f**2) with f = 37/3.9, 36 m span, 25 deg, 0.25.
TWIN = {
    'design_mass': 70000.0,
    'ultimate_load_factor': 3.75,
    'fuselage_length': 37.0,
    'fuselage_wetted_area': 391.4432630122112,
    'fuselage_diameter': 3.9,
    'wingspan': 36.0,
    'sweep': np.radians(25.0),
    'taper_ratio': 0.25,
}


def test_wetted_area_of_the_twin_matches_the_body_drag_formula():
    # Guard for the TWIN value above: hand value from the fuselage wetted-area formula.
    fineness = 37.0 / 3.9
    area = np.pi * 3.9 * 37.0 * (1.0 - 2.0 / fineness) ** (2.0 / 3.0) * (1.0 + 1.0 / fineness**2)
    assert TWIN['fuselage_wetted_area'] == pytest.approx(area, rel=1e-14)


def test_hand_value_of_the_twin():
    # Hand value from the equation above, in lb and ft: W_dg = 154,323.58 lb, N_z = 3.75,
    # L = 121.3911 ft, S_f = 4,213.460 ft**2, D = 12.79528 ft, B_w = 118.1102 ft,
    # K_ws = 0.75 * 1.2 * 118.1102 * tan(25 deg) / 121.3911 = 0.4083343,
    # W_f = 0.328 * 1.06 * 760.73 * 3.3193 * 12.434 * 1.01379 * 1.2523 = 13,859.93 lb
    #     = 6,286.76 kg.
    prob = _run(TWIN, vec_size=1)
    assert prob.get_val('fuselage_mass')[0] == pytest.approx(6286.759000303, rel=1e-11)
    assert prob.get_val('fuselage_mass')[0] / KG_PER_LB == pytest.approx(13859.93111018, rel=1e-11)


def test_hand_values_against_an_independent_imperial_evaluation():
    points = {
        'design_mass': [30000.0, 70000.0, 250000.0],
        'ultimate_load_factor': [3.75, 3.0, 4.2],
        'fuselage_length': [25.0, 37.0, 62.0],
        'fuselage_wetted_area': [230.0, 391.0, 1050.0],
        'fuselage_diameter': [3.0, 3.9, 6.2],
        'wingspan': [27.0, 36.0, 64.0],
        'sweep': np.radians([0.0, 25.0, 32.0]),
        'taper_ratio': [0.4, 0.25, 0.2],
        'pressurisation_factor': [1.0, 1.08, 1.0],
    }
    prob = _run(points)
    expected = [
        _imperial_fuselage_kg(
            points['design_mass'][i],
            points['ultimate_load_factor'][i],
            points['fuselage_length'][i],
            points['fuselage_wetted_area'][i],
            points['fuselage_diameter'][i],
            points['wingspan'][i],
            [0.0, 25.0, 32.0][i],
            points['taper_ratio'][i],
            points['pressurisation_factor'][i],
        )
        for i in range(3)
    ]
    np.testing.assert_allclose(prob.get_val('fuselage_mass'), expected, rtol=1e-12)


def test_sweep_term_and_pressurisation_factor():
    # Without sweep K_ws = 0, so the swept twin is heavier by (1 + 0.4083343)**0.04 (hand
    # value from the equation above); the pressurisation factor multiplies the mass and
    # defaults to 1.0 (the transport regression is read as including pressurisation).
    prob = _run(
        dict(TWIN, sweep=[np.radians(25.0), 0.0, np.radians(25.0)]),
    )
    mass = prob.get_val('fuselage_mass')
    assert mass[0] / mass[1] == pytest.approx(1.4083342736276**0.04, rel=1e-12)
    assert mass[2] == mass[0]
    assert prob.get_val('pressurisation_factor')[0] == 1.0
    pressurised = _run(dict(TWIN, pressurisation_factor=1.08), vec_size=1)
    assert pressurised.get_val('fuselage_mass')[0] == pytest.approx(1.08 * mass[0], rel=1e-14)


def test_power_law_exponents():
    # Doubling the design mass or the load factor scales the mass by 2**0.5; doubling the
    # wetted area by 2**0.302; doubling the depth by 2**-0.10 (equation above).
    base = _run(TWIN, vec_size=1).get_val('fuselage_mass')[0]
    for name, factor in [
        ('design_mass', 2.0**0.5),
        ('ultimate_load_factor', 2.0**0.5),
        ('fuselage_wetted_area', 2.0**0.302),
        ('fuselage_diameter', 2.0**-0.10),
    ]:
        mass = _run(dict(TWIN, **{name: 2.0 * TWIN[name]}), vec_size=1).get_val('fuselage_mass')
        assert mass[0] / base == pytest.approx(factor, rel=1e-13), name


@pytest.mark.parametrize(
    'name, values',
    [
        ('fuselage_length', [30.0, 37.0, 45.0]),
        ('ultimate_load_factor', [2.5, 3.75, 4.5]),
        ('design_mass', [50000.0, 70000.0, 90000.0]),
        ('fuselage_wetted_area', [300.0, 391.0, 480.0]),
        ('wingspan', [28.0, 36.0, 44.0]),
        ('sweep', np.radians([0.0, 25.0, 35.0])),
    ],
)
def test_mass_rises_with(name, values):
    mass = _run(dict(TWIN, **{name: values})).get_val('fuselage_mass')
    assert np.all(np.diff(mass) > 0.0)


def test_plausibility_of_the_twin():
    # Plausibility check, additional to the exact hand values: the fuselage group of a
    # single-aisle jet transport is about 8-12 % of MTOW (common practice, from memory).
    # Generous band 6-14 % of 70 t, i.e. 4.2-9.8 t, to cover the regression's scatter and
    # the use of the overall rather than the structural length.
    mass = _run(TWIN, vec_size=1).get_val('fuselage_mass')[0]
    assert 4200.0 < mass < 9800.0


POINTS = [
    {
        'design_mass': [30000.0, 70000.0, 250000.0],
        'ultimate_load_factor': [3.75, 3.0, 4.2],
        'fuselage_length': [25.0, 37.0, 62.0],
        'fuselage_wetted_area': [230.0, 391.0, 1050.0],
        'fuselage_diameter': [3.0, 3.9, 6.2],
        'wingspan': [27.0, 36.0, 64.0],
        'sweep': np.radians([15.0, 25.0, 32.0]),
        'taper_ratio': [0.4, 0.25, 0.2],
        'pressurisation_factor': [1.0, 1.08, 1.03],
    },
    {
        'design_mass': [45000.0, 120000.0, 80000.0],
        'ultimate_load_factor': [4.5, 3.75, 2.5],
        'fuselage_length': [32.0, 48.0, 40.0],
        'fuselage_wetted_area': [300.0, 610.0, 420.0],
        'fuselage_diameter': [3.5, 5.0, 4.1],
        'wingspan': [30.0, 48.0, 40.0],
        'sweep': np.radians([0.0, 30.0, 20.0]),
        'taper_ratio': [1.0, 0.3, 0.15],
        'pressurisation_factor': [1.1, 1.0, 0.95],
    },
]


@pytest.mark.parametrize('point', POINTS)
def test_partials(point):
    check_component_partials(FuselageMassComp(vec_size=3), point)
