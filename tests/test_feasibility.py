"""Infeasible points against optimiser failures: optimize, target sweeps and their exit codes."""

import csv
import json

import numpy as np
import pytest

from voltwake.cli import main
from voltwake.configuration.loader import demo_path, load_config
from voltwake.design.constraints import constraint_table
from voltwake.design.optimization import build_problem, optimize
from voltwake.errors import EXIT_BAD_INPUT, EXIT_INFEASIBLE, EXIT_OPTIMIZER_FAILED
from voltwake.outputs.summary import target_sweep_lines
from voltwake.studies.runner import study_spec
from voltwake.studies.target_sweep import fixed_config, target_sweep

DEMO = load_config(demo_path('turbo_electric'))

#: Few optimiser iterations keep the failing optimisations short; whether a point has a
#: feasible design is decided by the feasibility phase, not by the optimiser's budget.
SHORT = {'optimization.optimizer.max_iterations': 15}

#: A large aft-fan share at a low fan pressure ratio: the motor power (and other) limits
#: cannot all be met (the packaged demo's sweep of 0.1-0.4 by 1.2-1.5 has such points).
HEAVY = {'aft_fan.thrust_fraction': 0.45, 'aft_fan.fan_pressure_ratio': 1.2}


def _squared_violations(config, design):
    """Sum of squared scaled violations of the configured constraints at a design."""
    prob = build_problem(config.with_overrides(design))
    prob.run_model()
    table = constraint_table(prob.driver.spec_constraints, prob)
    return sum(c['violation'] ** 2 for c in table.values())


@pytest.fixture(scope='module')
def heavy():
    config = fixed_config(DEMO.with_overrides(SHORT), HEAVY)
    return config, optimize(config)


def test_an_infeasible_point_names_its_violated_constraints(heavy):
    _, result = heavy
    assert result.status == 'infeasible' and not result.success
    assert result.message.startswith('no feasible design: ')
    assert result.violations and all(v['amount'] > 0.0 for v in result.violations)
    names = {v['name'] for v in result.violations}
    assert 'motor_power_margin' in names
    assert all(v['name'] in result.message for v in result.violations[:3])
    # The design is the least-infeasible one: finite, within its bounds.
    for dv in result.design.values():
        assert dv['lower'] <= dv['value'] <= dv['upper']


def test_the_least_infeasible_design_is_less_infeasible_than_its_neighbours(heavy):
    config, result = heavy
    best = {path: dv['si']['value'] for path, dv in result.design.items()}
    least = _squared_violations(config, best)
    assert least == pytest.approx(sum(v['relative'] ** 2 for v in result.violations), rel=1e-6)
    # The configured start, and steps of 5 % of each variable's range either way from the
    # least-infeasible design (inside the bounds), all violate the constraints more.
    others = [_squared_violations(config, {})]
    for path in ('wing.loading', 'turbofans.rated_to_cruise_thrust', 'electrical.cable.voltage'):
        si = result.design[path]['si']
        for sign in (-1.0, 1.0):
            moved = np.clip(
                si['value'] + sign * 0.05 * (si['upper'] - si['lower']), si['lower'], si['upper']
            )
            if moved != si['value']:
                others.append(_squared_violations(config, {**best, path: float(moved)}))
    assert len(others) >= 5
    assert all(other > least for other in others), (least, others)


def test_a_forced_optimiser_failure_is_failed_not_infeasible(tmp_path, capsys):
    # Two iterations cannot converge; a feasible design exists (the demo's optimum), so the
    # retry from the feasibility phase's design fails too and the point is 'failed'.
    code = main(
        [
            'sweep',
            '--targets',
            'aft_fan.thrust_fraction=0.2:0.2:1',
            '--set',
            'optimization.optimizer.max_iterations=2',
            '--jobs',
            '1',
            '--out',
            str(tmp_path / 'out'),
        ]
    )
    assert code == EXIT_OPTIMIZER_FAILED
    with open(tmp_path / 'out' / 'targets_points.csv', encoding='utf-8') as f:
        (row,) = list(csv.DictReader(f))
    assert row['status'] == 'failed' and row['violated_constraints'] == ''
    err = capsys.readouterr().err.strip().splitlines()
    assert err[-1] == 'voltwake: error: 1 target-sweep optimisations failed'


def test_an_infeasible_only_sweep_exits_6_and_writes_its_files(tmp_path, capsys):
    progress = []
    config = DEMO.with_overrides(SHORT)
    sweep = target_sweep(
        config,
        {'aft_fan.thrust_fraction': [0.4, 0.45], 'aft_fan.fan_pressure_ratio': [1.2]},
        jobs=1,
        progress=lambda *a: progress.append(a[:3]),
    )
    # The progress counts the two points, not the reference optimisation.
    assert [p[2] for p in progress] == [2, 2] and progress[-1][0] == 2
    assert sweep['infeasible_count'] == 2 and sweep['optimum_count'] == 0
    for row in sweep['points']:
        assert row['status'] == 'infeasible'
        assert 'motor_power_margin:' in row['violated_constraints']
        assert np.isfinite(row['dv:wing.loading'])  # the least-infeasible design, not NaN
    assert 'motor_power_margin' in sweep['infeasible_constraints']

    code = main(
        [
            'sweep',
            '--targets',
            'aft_fan.thrust_fraction=0.45:0.45:1',
            '--targets',
            'aft_fan.fan_pressure_ratio=1.2:1.2:1',
            '--set',
            'optimization.optimizer.max_iterations=15',
            '--jobs',
            '1',
            '--out',
            str(tmp_path / 'out'),
        ]
    )
    assert code == EXIT_INFEASIBLE
    out, err = capsys.readouterr()
    assert '1 points have no feasible design: motor_power_margin binds by' in out
    assert (
        err.strip()
        .splitlines()[-1]
        .startswith(
            'voltwake: error: 1 target points have no feasible design: motor_power_margin binds'
        )
    )
    summary = json.loads((tmp_path / 'out' / 'targets_summary.json').read_text())
    assert (summary['optimum_count'], summary['infeasible_count'], summary['failed_count']) == (
        0,
        1,
        0,
    )
    report = (tmp_path / 'out' / 'report.html').read_text()
    assert '1 points have no feasible design' in report and 'no feasible design' in report


def test_optimize_of_an_infeasible_config_exits_6_with_one_line(capsys):
    # A 20 m span limit: at the approach-speed limit the wing needs well over 80 m**2, and
    # even at the lowest aspect ratio allowed (7) that area spans more than 20 m.
    code = main(
        [
            'optimize',
            '--set',
            'optimization.constraints.wingspan.upper=20 m',
            '--set',
            'optimization.optimizer.max_iterations=15',
        ]
    )
    assert code == EXIT_INFEASIBLE
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1
    assert err[0].startswith('voltwake: error: no feasible design: ')
    assert 'wingspan binds by' in err[0]


def test_output_targets_from_the_command_line_in_any_unit():
    spec = study_spec(DEMO, targets=['wingspan=30 m:36 m:3'])
    assert spec['targets'] == {'wingspan': [30.0, 33.0, 36.0]}
    # 1 ft = 0.3048 m exactly (international foot, NIST SP 811, 2008, appendix B.9).
    spec = study_spec(DEMO, targets=['wingspan=100 ft:110 ft:2'])
    assert spec['targets']['wingspan'] == pytest.approx([30.48, 33.528], rel=1e-12)
    spec = study_spec(DEMO, targets=['wingspan=31:32:2'])  # bare: the output's units (m)
    assert spec['targets']['wingspan'] == [31.0, 32.0]


def test_a_misspelt_output_target_gets_a_hint_and_exit_2(capsys):
    assert main(['sweep', '--targets', 'wingspn=30 m:36 m:3']) == EXIT_BAD_INPUT
    err = capsys.readouterr().err.strip()
    assert "did you mean 'wingspan'" in err and len(err.splitlines()) == 1


def test_the_optimum_at_a_wingspan_target_has_that_span():
    result = optimize(fixed_config(DEMO, outputs={'wingspan': 33.0}))
    assert result.status == 'optimum', result.message
    span = result.constraints['wingspan']
    assert span['equals'] == 33.0
    assert abs(span['si']['value'] - 33.0) <= 1e-5 * 33.0  # FEASIBILITY_TOLERANCE, relative


def test_the_text_gives_the_reference_fuel_of_every_reference():
    summary = {
        'points_count': 2,
        'optimum_count': 2,
        'infeasible_count': 0,
        'failed_count': 0,
        'references': [
            {'outputs': {'block_fuel_kg': 5000.0}},
            {'outputs': {'block_fuel_kg': 6000.0}},
        ],
    }
    lines = target_sweep_lines(summary)
    assert lines[0] == (
        'target sweep: 2 of 2 points have an optimum, 0 have no feasible design, '
        '0 optimisations failed'
    )
    assert lines[-1].startswith('optimised reference block fuel 5,000.0 to 6,000.0 kg')
