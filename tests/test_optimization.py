"""Optimisation through the framework: a known optimum, multiple starts, infeasibility, totals."""

import json
import math

import numpy as np
import pytest
import yaml
from openmdao.utils.assert_utils import assert_check_totals

from voltwake.cli import main
from voltwake.configuration.loader import demo_path, load_config
from voltwake.design.analysis import analyze
from voltwake.design.optimization import build_problem, optimize

TURBO_ELECTRIC = demo_path('turbo_electric')


def _conventional_with(optimization, wing_area=None, regression=False, overrides=None):
    with open(demo_path('conventional')) as handle:
        data = yaml.safe_load(handle)
    if wing_area is not None:  # a fixed wing area instead of the demo's wing loading
        del data['wing']['loading']
        data['wing']['area'] = wing_area
    data['optimization'] = optimization
    if regression:  # airframe mass from MTOW alone, whatever the wing
        data['structure'] = {'airframe_mass_coefficient': 1.1, 'airframe_mass_exponent': 0.94}
    for path, value in (overrides or {}).items():
        section, key = path.split('.')
        data[section][key] = value
    return load_config(data)


def test_wing_area_for_least_fuel_gives_the_best_lift_coefficient():
    """
    Check that the least-fuel wing area gives the best lift coefficient.

    Only the wing area varies; airframe mass depends on MTOW alone, and at Mach 0.6 the wing
    has no wave drag, so fuel is least where cruise drag is least at the mid-cruise weight:
    dD/dS = q d(C_D0 S)/dS - W^2/(q S^2 pi e AR) = 0, i.e. CL* = sqrt(c_S pi e AR) (the
    parabolic-polar minimum-drag condition, e.g. Anderson, Introduction to Flight, ch. 6;
    from memory), with c_S = d(C_D0 S)/dS the growth of the zero-lift drag area with the
    wing area: the miscellaneous increment, and the wing's and the tails' drag areas (the
    tails are sized on the wing by their volume coefficients). The fuselage and nacelles do
    not scale with the wing.
    """
    config = _conventional_with(
        {
            'objective': 'block_fuel',
            'design_variables': {'wing.area': {'lower': '60 m**2', 'upper': '250 m**2'}},
        },
        wing_area='122 m**2',
        regression=True,
        overrides={'mission.cruise_mach': 0.6},
    )
    result = optimize(config)
    assert result.success, result.message
    assert result.outputs['wave_drag_coefficient'] == pytest.approx(0.0, abs=1e-12)
    area = result.design['wing.area']['value']
    at_optimum = analyze(config, {'wing.area': area})
    scaling = ['wing_drag_area', 'horizontal_tail_drag_area', 'vertical_tail_drag_area']
    totals = at_optimum.problem.compute_totals(of=scaling, wrt=['wing_area'])
    growth = config.value('drag.miscellaneous_drag_coefficient') + sum(
        float(totals[name, 'wing_area'][0, 0]) for name in scaling
    )
    expected = math.sqrt(
        growth
        * math.pi
        * config.value('wing.oswald_efficiency')
        * config.value('wing.aspect_ratio')
    )
    assert result.outputs['cruise_cl'] == pytest.approx(expected, rel=1e-4)
    assert not result.design['wing.area']['active']


@pytest.fixture(scope='module')
def demo_optimum():
    result = optimize(TURBO_ELECTRIC)
    assert result.success, result.message
    return result


def test_the_optimum_does_not_depend_on_how_the_wing_is_given(demo_optimum):
    # The demo optimises the wing loading; with the wing area as the design variable instead
    # (bounds that contain the same optimum) the optimiser must find the same aircraft.
    data = load_config(TURBO_ELECTRIC).data
    del data['wing']['loading']
    data['wing']['area'] = '122 m**2'
    variables = data['optimization']['design_variables']
    del variables['wing.loading']
    variables['wing.area'] = {'lower': '55 m**2', 'upper': '150 m**2'}
    by_area = optimize(load_config(data))
    assert by_area.success, by_area.message
    for key in ('block_fuel_kg', 'mtow_kg', 'wing_area_m2', 'wingspan_m'):
        assert by_area.outputs[key] == pytest.approx(demo_optimum.outputs[key], rel=1e-5), key


def test_demo_optimum_reports_active_constraints_and_saves_fuel(demo_optimum):
    assert demo_optimum.failed_points == 0
    assert any(c['active'] for c in demo_optimum.constraints.values())
    assert all(c['violation'] <= 1e-5 for c in demo_optimum.constraints.values())
    assert demo_optimum.outputs['block_fuel_kg'] < demo_optimum.start['block_fuel_kg']
    assert len(demo_optimum.history) == demo_optimum.evaluations


def _starts(config):
    """Start points as fractions of each design variable's range (0 = lower, 1 = upper)."""
    paths = list(config.values['optimization.design_variables'])
    rng = np.random.default_rng(20261201)
    starts = [dict.fromkeys(paths, 0.0), dict.fromkeys(paths, 1.0), dict.fromkeys(paths, 0.5)]
    for _ in range(2):
        starts.append({path: float(rng.uniform(0.0, 1.0)) for path in paths})
    return starts


def _blend(config, fractions):
    """Design-variable values (SI) at the given fractions of their bounds."""
    from voltwake.design.constraints import design_variables

    bounds = {
        dv.path: (dv.lower, dv.upper) for dv in design_variables(config, config.model_inputs())
    }
    return {path: lo + fractions[path] * (hi - lo) for path, (lo, hi) in bounds.items()}


def test_demo_optimum_is_reached_from_other_starts(demo_optimum):
    config = load_config(TURBO_ELECTRIC)
    starts = _starts(config)
    best = demo_optimum.outputs['block_fuel_kg']
    for fractions in starts:
        result = optimize(config, _blend(config, fractions))
        assert result.success, (fractions, result.message)
        assert result.outputs['block_fuel_kg'] == pytest.approx(best, rel=1e-3), fractions


def test_infeasible_span_limit_is_not_a_success():
    # No wing inside the bounds meets a 20 m span: sqrt(7 * 95 m^2) = 25.8 m at the least.
    result = optimize(TURBO_ELECTRIC, {'optimization.constraints.wingspan': {'upper': '20 m'}})
    assert not result.success and result.status == 'infeasible'
    # The feasibility phase names what cannot be met, the span first.
    assert result.message.startswith('no feasible design: wingspan binds by')


def test_total_derivatives_of_the_optimisation_problem():
    from voltwake.design.derivatives import check_totals_cs

    prob = build_problem(TURBO_ELECTRIC)
    prob.run_model()
    data = check_totals_cs(prob, driver_scaling=True)
    assert_check_totals(data, atol=1e-9, rtol=1e-7)


def test_cruise_altitude_as_a_design_variable(demo_optimum):
    # Any configured input can be a design variable; the cruise altitude goes through the
    # ISA (both layers) into every discipline. Start in the troposphere; the bounds reach the
    # stratosphere.
    overrides = {
        'optimization.design_variables.mission.cruise_altitude': {
            'lower': '9000 m',
            'upper': '12500 m',
        }
    }
    prob = build_problem(TURBO_ELECTRIC, overrides)
    prob.run_model()
    from voltwake.design.derivatives import check_totals_cs

    assert_check_totals(check_totals_cs(prob, driver_scaling=True), atol=1e-9, rtol=1e-7)
    result = optimize(TURBO_ELECTRIC, overrides)
    assert result.success, result.message
    # A free altitude can only do as well or better than the fixed 35,000 ft.
    assert result.outputs['block_fuel_kg'] <= demo_optimum.outputs['block_fuel_kg'] * (1 + 1e-6)
    assert 9000.0 <= result.design['mission.cruise_altitude']['value'] <= 12500.0


def test_no_finite_difference_anywhere_in_the_model():
    prob = build_problem(TURBO_ELECTRIC)
    for system in prob.model.system_iter(include_self=True, recurse=True):
        assert not system._owns_approx_jac, system.pathname
        assert not system._approx_schemes, system.pathname


def test_cli_optimize_writes_results_and_case_file(tmp_path, capsys):
    out = tmp_path / 'run'
    assert main(['optimize', '--out', str(out)]) == 0
    text = capsys.readouterr().out
    assert 'active' in text and 'eval' in text
    data = json.loads((out / 'results.json').read_text())
    assert data['status'] == 'complete' and data['success']
    assert (out / 'results.yaml').exists() and (out / 'cases.sql').stat().st_size > 0
    # An existing results directory is not overwritten without --force.
    assert main(['optimize', '--out', str(out)]) == 2
    assert main(['optimize', '--out', str(out), '--force']) == 0


def test_cli_optimize_infeasible_exits_6(capsys):
    code = main(['optimize', '--set', 'optimization.constraints.wingspan.upper=20 m'])
    assert code == 6
    err = capsys.readouterr().err
    assert len(err.strip().splitlines()) == 1 and 'no feasible design: wingspan' in err


def test_recorder_holds_driver_cases(tmp_path):
    import openmdao.api as om

    path = str(tmp_path / 'cases.sql')
    result = optimize(TURBO_ELECTRIC, recorder_path=path)
    reader = om.CaseReader(path)
    cases = reader.list_cases('driver', recurse=False, out_stream=None)
    # Every optimiser evaluation is recorded (the driver's initial run and the final
    # re-evaluation of the optimum are not optimiser evaluations).
    assert 10 <= len(cases) <= result.evaluations
    last = reader.get_case(cases[-1])
    assert last.get_objectives()['block_fuel'][0] == pytest.approx(
        result.outputs['block_fuel_kg'], rel=1e-6
    )


def test_trial_point_that_does_not_close_is_counted_not_fatal():
    prob = build_problem(TURBO_ELECTRIC)
    prob.final_setup()
    driver = prob.driver
    driver._run_solve_nonlinear()
    assert driver.failed_points == 0
    good = prob.get_val('block_fuel').copy()
    # A fan pressure ratio too low to give thrust: the sizing loop cannot close there.
    prob.set_val('turbofan_fan_pressure_ratio', 1.0)
    driver._run_solve_nonlinear()
    assert driver.failed_points == 1
    assert driver.history[-1]['closed'] is False
    # Back at the configured design, the next evaluation starts from the last converged
    # state and closes again.
    prob.set_val('turbofan_fan_pressure_ratio', 1.5)
    driver._run_solve_nonlinear()
    assert driver.history[-1]['closed'] is True
    assert prob.get_val('block_fuel') == pytest.approx(good, rel=1e-9)


def test_design_variable_scaling_and_bad_specs():
    from voltwake.errors import ConfigError

    prob = build_problem(
        TURBO_ELECTRIC,
        {'optimization.design_variables.wing.loading': {'lower': 450, 'upper': 750, 'ref': 455}},
    )
    meta = prob.model.get_design_vars()
    # ref0 defaults to the lower bound: scaler 1 / (455 - 450).
    assert meta['design_wing_loading']['total_scaler'] == pytest.approx(0.2)
    with pytest.raises(ConfigError, match='ref must differ from ref0'):
        build_problem(
            TURBO_ELECTRIC,
            {
                'optimization.design_variables.wing.loading': {
                    'lower': 450,
                    'upper': 750,
                    'ref0': 750,
                }
            },
        )
    with pytest.raises(ConfigError, match='not below upper'):
        build_problem(
            TURBO_ELECTRIC,
            {'optimization.design_variables.wing.loading': {'lower': 750, 'upper': 450}},
        )
    with pytest.raises(ConfigError, match='gives wing.loading instead'):
        build_problem(
            TURBO_ELECTRIC, {'optimization.design_variables.wing.area': {'lower': 95, 'upper': 150}}
        )
    with pytest.raises(ConfigError, match='not a configurable model input'):
        build_problem(
            TURBO_ELECTRIC, {'optimization.design_variables.wing.span': {'lower': 1, 'upper': 2}}
        )
    with pytest.raises(ConfigError, match="did you mean 'wingspan'"):
        build_problem(TURBO_ELECTRIC, {'optimization.constraints.wingspn': {'upper': 36}})


def test_compare_optimized_reference_has_no_aft_fan(demo_optimum):
    from voltwake.design.compare import compare

    comp = compare(TURBO_ELECTRIC, optimized=True)
    assert comp.design.values['block_fuel_kg'] == pytest.approx(
        demo_optimum.outputs['block_fuel_kg'], rel=1e-6
    )
    assert comp.reference.values['electrical_mass_kg'] == 0.0
    expected = 100 * (
        comp.design.values['block_fuel_kg'] / comp.reference.values['block_fuel_kg'] - 1
    )
    assert comp.fuel_burn_change_percent == pytest.approx(expected, rel=1e-12)


def test_ctrl_c_leaves_partial_results_and_a_readable_case_file(tmp_path):
    import os
    import subprocess
    import sys

    import openmdao.api as om

    out = tmp_path / 'run'
    env = dict(os.environ, OPENMDAO_REPORTS='0')
    # The interrupt is raised at a known point: a test double around the evaluation log
    # sends SIGINT to its own process right after the fifth logged evaluation. The signal
    # is the one Ctrl-C sends and goes through the same handler, but it no longer races
    # against the optimiser, which on a fast machine could finish before an interrupt
    # sent from outside arrived.
    interrupted = (
        'import signal, sys\n'
        'import voltwake.design.optimization as opt\n'
        'log = opt.SizingOptimizeDriver._log\n'
        'count = [0]\n'
        'def log_then_interrupt(self, closed):\n'
        '    log(self, closed)\n'
        '    count[0] += 1\n'
        '    if count[0] == 5:\n'
        '        signal.raise_signal(signal.SIGINT)\n'
        'opt.SizingOptimizeDriver._log = log_then_interrupt\n'
        'from voltwake.cli import main\n'
        'sys.exit(main(sys.argv[1:]))\n'
    )
    proc = subprocess.run(
        [sys.executable, '-c', interrupted, 'optimize', '--out', str(out)],
        capture_output=True,
        text=True,
        env=env,
        timeout=300,
    )
    err = proc.stderr
    assert proc.returncode == 130, err
    assert err.strip().splitlines() == [
        'voltwake: error: optimisation interrupted after ' + err.split('after ')[1].strip()
    ]
    data = json.loads((out / 'results.json').read_text())
    assert data['status'] == 'partial' and 'partial' in data['message']
    assert len(data['history']) >= 5
    cases = om.CaseReader(str(out / 'cases.sql')).list_cases(
        'driver', recurse=False, out_stream=None
    )
    assert len(cases) >= 1


def test_repeated_runs_give_byte_identical_json(capsys):
    outputs = []
    for _ in range(2):
        assert main(['optimize', '--json']) == 0
        outputs.append(capsys.readouterr().out)
    assert outputs[0] == outputs[1]
    for _ in range(2):
        assert main(['analyze', '--json']) == 0
        outputs.append(capsys.readouterr().out)
    assert outputs[2] == outputs[3]


def test_results_come_back_in_the_units_the_bounds_were_written_in():
    # cruise altitude bounded in ft, approach speed limited in kn (the demo), sweep in deg:
    # the design variables and constraints come back in those units, with SI alongside.
    overrides = {
        'optimization.design_variables.mission.cruise_altitude': {
            'lower': '30000 ft',
            'upper': '41000 ft',
        }
    }
    result = optimize(TURBO_ELECTRIC, overrides)
    assert result.success, result.message
    altitude = result.design['mission.cruise_altitude']
    assert altitude['units'] == 'ft' and altitude['lower'] == pytest.approx(30000.0)
    assert altitude['si']['units'] == 'm'
    assert altitude['value'] == pytest.approx(altitude['si']['value'] / 0.3048, rel=1e-12)
    sweep = result.design['wing.sweep']
    assert sweep['units'] == 'deg' and sweep['upper'] == pytest.approx(35.0)
    speed = result.constraints['approach_speed']
    assert speed['units'] == 'kn' and speed['upper'] == pytest.approx(140.0)
    assert speed['value'] == pytest.approx(speed['si']['value'] * 3600.0 / 1852.0, rel=1e-9)
    # a bound written in SI stays in SI
    assert result.constraints['wingspan']['units'] == 'm'
    assert 'si' in result.constraints['wingspan']
