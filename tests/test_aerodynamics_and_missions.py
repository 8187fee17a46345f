"""Component drag, wave drag, top of climb and the economic mission in the assembled model."""

import copy

import numpy as np
import pytest
from openmdao.utils.assert_utils import assert_check_totals

import voltwake
from voltwake.configuration.loader import demo_path, load_config
from voltwake.design.batch import analyze_points
from voltwake.design.optimization import build_problem
from voltwake.design.sizing import build_model_problem, run_sizing
from voltwake.errors import ConfigError

CONVENTIONAL = demo_path('conventional')
TURBO_ELECTRIC = demo_path('turbo_electric')


@pytest.fixture(scope='module')
def conventional():
    return voltwake.analyze(CONVENTIONAL)


def test_zero_lift_drag_is_the_sum_of_its_components(conventional):
    prob = conventional.problem
    areas = [
        'wing_drag_area',
        'fuselage_drag_area',
        'turbofan_nacelle_drag_area',
        'horizontal_tail_drag_area',
        'vertical_tail_drag_area',
    ]
    total = sum(float(prob.get_val(name)[0]) for name in areas)
    cd0 = float(prob.get_val('miscellaneous_drag_coefficient')[0]) + total / float(
        prob.get_val('wing_area')[0]
    )
    assert conventional.zero_lift_drag_coefficient == pytest.approx(cd0, rel=1e-12)
    # A 120-seat twin at cruise: zero-lift drag coefficient about 0.018-0.025 on the wing
    # area and cruise L/D about 15-18 (common practice, from memory).
    assert 0.018 < cd0 < 0.025
    assert 15.0 < conventional.cruise_lift_to_drag < 18.0


def test_wave_drag_is_negligible_slow_and_steep_past_divergence():
    # Korn/Lock (see components/wave_drag.py): no wave drag well below the drag-divergence
    # Mach number; past it the fuel climbs steeply.
    machs = [0.70, 0.78, 0.85, 0.90]
    batch = analyze_points(CONVENTIONAL, {'mission.cruise_mach': machs})
    assert batch.closed.all()
    wave = batch.values['wave_drag_coefficient']
    fuel = batch.values['block_fuel_kg']
    divergence = batch.values['drag_divergence_mach']
    assert wave[0] < 1e-5 and machs[0] < divergence[0] - 0.1
    assert np.all(np.diff(wave) > 0) and np.all(np.diff(fuel) > 0)
    # 0.70 -> 0.78 costs a few per cent; 0.85 -> 0.90 (past M_dd) far more per step.
    slow = fuel[1] / fuel[0] - 1.0
    fast = fuel[3] / fuel[2] - 1.0
    assert slow < 0.05 and fast > 4.0 * slow
    assert machs[3] > divergence[3]


def test_top_of_climb_is_flown_at_its_own_lift_coefficient(conventional):
    prob = conventional.problem
    mass = float(prob.get_val('top_of_climb_mass')[0])
    mid = float(prob.get_val('mid_cruise_mass')[0])
    assert mass > mid
    ratio = conventional.top_of_climb_cl / conventional.cruise_cl
    assert ratio == pytest.approx(mass / mid, rel=1e-12)
    # the start of cruise is heavier: a higher lift coefficient, nearer the best-L/D one of
    # this wing (the demo cruises below it), so a higher L/D than at mid-cruise
    assert conventional.top_of_climb_cl > conventional.cruise_cl
    assert conventional.top_of_climb_lift_to_drag > conventional.cruise_lift_to_drag


def test_economic_mission_at_the_design_point_is_the_design_mission():
    # Flown at the design range and payload, the economic mission is the design mission: the
    # same take-off mass (MTOW) and the same fuel.
    config = load_config(CONVENTIONAL)
    same = load_config(
        CONVENTIONAL,
        {
            'economic_mission.range': config.values['mission.range'],
            'economic_mission.payload': config.values['mission.payload'],
        },
    )
    result = voltwake.analyze(same)
    assert result.economic_takeoff_mass_kg == pytest.approx(result.mtow_kg, rel=1e-9)
    assert result.economic_block_fuel_kg == pytest.approx(result.block_fuel_kg, rel=1e-9)
    assert result.economic_takeoff_mass_margin == pytest.approx(0.0, abs=1e-9)


def test_economic_fuel_rises_with_its_range_and_stays_below_the_design_fuel():
    ranges = [300.0 * 1852.0, 600.0 * 1852.0, 1000.0 * 1852.0]
    batch = analyze_points(TURBO_ELECTRIC, {'economic_mission.range': ranges})
    assert batch.closed.all()
    fuel = batch.values['economic_block_fuel_kg']
    assert np.all(np.diff(fuel) > 0)
    assert np.all(fuel < batch.values['block_fuel_kg'])
    # the sized aircraft is the same at every point: only the economic mission changes
    assert np.ptp(batch.values['mtow_kg']) == pytest.approx(0.0, abs=1e-6)
    assert np.all(batch.values['economic_takeoff_mass_margin'] > 0)


def test_an_economic_mission_beyond_the_payload_range_shows_a_negative_margin():
    result = voltwake.analyze(
        CONVENTIONAL, {'economic_mission.range': 3.0e6, 'economic_mission.payload': 12000.0}
    )
    assert result.economic_takeoff_mass_kg > result.mtow_kg
    assert result.economic_takeoff_mass_margin < 0


def test_the_economic_objective_needs_its_section():
    data = copy.deepcopy(load_config(TURBO_ELECTRIC).data)
    data.pop('economic_mission')
    data['optimization']['objective'] = 'economic_block_fuel'
    with pytest.raises(ConfigError, match="needs an 'economic_mission' section"):
        build_problem(data)


@pytest.mark.parametrize('path', [CONVENTIONAL, TURBO_ELECTRIC])
def test_total_derivatives_through_both_missions(path):
    from voltwake.design.derivatives import check_totals_cs

    config = load_config(path)
    prob = build_model_problem(config, vec_size=3)
    prob.set_val('economic_range', [0.8e6, 1.1e6, 1.5e6])
    prob.set_val('mach', [0.76, 0.80, 0.84])
    run_sizing(prob, config.has_aft_fan)
    data = check_totals_cs(
        prob,
        ['economic_block_fuel', 'block_fuel', 'climb_thrust_margin', 'wave_drag_coefficient'],
        ['mach', 'wing_sweep', 'thickness_to_chord', 'economic_payload', 'aspect_ratio'],
    )
    assert_check_totals(data, atol=1e-10, rtol=1e-7)


def test_fuel_burn_follows_an_economic_objective():
    from voltwake.design.compare import compare

    comparison = compare(
        TURBO_ELECTRIC, {'optimization.objective': 'economic_block_fuel'}, optimized=False
    )
    design, reference = comparison.design.values, comparison.reference.values
    expected = 100.0 * (
        design['economic_block_fuel_kg'] / reference['economic_block_fuel_kg'] - 1.0
    )
    assert comparison.fuel_burn_change_percent == pytest.approx(expected, rel=1e-12)
    assert comparison.to_dict()['fuel_burn_measured_on'] == 'economic_block_fuel_kg'
    block = compare(TURBO_ELECTRIC)
    assert block.fuel_burn_change_percent == pytest.approx(block.change_percent['block_fuel_kg'])


def test_cruise_mach_and_altitude_as_design_variables():
    # Block fuel alone does not price time: with the wave drag the optimiser slows down to
    # its lowest allowed Mach number, where the wing needs no sweep and the engines prefer a
    # low fan pressure ratio; the altitude is interior, held by the buffet margin.
    from voltwake.design.optimization import optimize

    data = copy.deepcopy(load_config(TURBO_ELECTRIC).without_aft_fan().data)
    spec = data['optimization']
    spec['design_variables'] = {
        k: v
        for k, v in spec['design_variables'].items()
        if not k.startswith(('aft_fan', 'electrical'))
    }
    spec['design_variables']['mission.cruise_altitude'] = {'lower': '25000 ft', 'upper': '41000 ft'}
    spec['design_variables']['mission.cruise_mach'] = {'lower': 0.70, 'upper': 0.85}
    spec['constraints'] = {
        k: v
        for k, v in spec['constraints'].items()
        if not k.startswith(('aft_fan', 'motor', 'cable'))
    }
    result = optimize(load_config(data))
    assert result.success, result.message
    design = result.design
    assert design['mission.cruise_mach']['value'] == pytest.approx(0.70, abs=1e-6)
    assert design['wing.sweep']['active']
    assert not design['mission.cruise_altitude']['active']
    assert result.constraints['buffet_margin']['active']
    assert result.outputs['wave_drag_coefficient'] < 1e-4
