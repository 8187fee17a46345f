"""
Tests of the ``voltwake`` command (voltwake.cli): outputs, exit codes and error lines.

Most tests call ``voltwake.cli.main`` in-process; two run ``python -m voltwake.cli`` in a
subprocess to check the real entry point, exit status and standard error.
"""

import contextlib
import io
import json
import math
import os
import re
import subprocess
import sys

import numpy as np
import pytest
from ambiance import Atmosphere

from voltwake.cli import main
from voltwake.configuration.loader import demo_names, demo_path, load_config
from voltwake.errors import EXIT_BAD_INPUT, EXIT_NOT_CLOSED, EXIT_OK
from voltwake.outputs.summary import CAUTION

TURBO = demo_path('turbo_electric')
CONVENTIONAL = demo_path('conventional')

ANALYSIS_KEYS = {
    'converged',
    'mtow_kg',
    'oew_kg',
    'payload_kg',
    'block_fuel_kg',
    'reserve_fuel_kg',
    'cruise_lift_to_drag',
    'cruise_cl',
    'tsfc_g_per_kN_s',
    'overall_efficiency',
    'wingspan_m',
}
AFT_FAN_KEYS = {
    'power_saving_coefficient',
    'aft_fan_shaft_power_kW',
    'aft_fan_diameter_m',
    'turbofan_power_extraction_kW',
    'electrical_chain_efficiency',
    'electrical_mass_kg',
    'thermal_load_kW',
}


def run(argv):
    """Run ``main`` in-process; return (exit code, stdout, stderr)."""
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        code = main(argv)
    return code, out.getvalue(), err.getvalue()


def run_subprocess(argv, cwd):
    env = dict(os.environ, OPENMDAO_REPORTS='0')
    env.pop('VOLTWAKE_DEBUG', None)
    return subprocess.run(
        [sys.executable, '-m', 'voltwake.cli', *argv],
        cwd=cwd,
        env=env,
        capture_output=True,
        text=True,
        timeout=600,
        check=False,
    )


def assert_one_error_line(stderr):
    """Standard error holds exactly one line, the voltwake error, and no traceback."""
    lines = stderr.splitlines()
    assert len(lines) == 1, stderr
    assert lines[0].startswith('voltwake: error: '), stderr
    assert 'Traceback' not in stderr
    return lines[0]


@pytest.fixture(scope='module')
def analyses():
    """``analyze --json`` of both demos, run once for the module."""
    out = {}
    for name, path in (('turbo', TURBO), ('conventional', CONVENTIONAL)):
        code, stdout, stderr = run(['analyze', path, '--json'])
        out[name] = (code, stdout, stderr)
    return out


# --- analyze --json ------------------------------------------------------------------------


@pytest.mark.parametrize('name', ['turbo', 'conventional'])
def test_analyze_json_is_one_object_with_the_fields(analyses, name):
    code, stdout, stderr = analyses[name]
    assert code == EXIT_OK
    assert stderr == ''
    result = json.loads(stdout)  # the whole output is one JSON document
    assert isinstance(result, dict)
    keys = ANALYSIS_KEYS | (AFT_FAN_KEYS if name == 'turbo' else set())
    assert keys <= result.keys()
    assert result['converged'] is True
    assert all(math.isfinite(v) for v in result.values() if isinstance(v, float))


@pytest.mark.parametrize('name, path', [('turbo', TURBO), ('conventional', CONVENTIONAL)])
def test_analyze_json_mass_and_fuel_balance(analyses, name, path):
    result = json.loads(analyses[name][1])
    config = load_config(path)
    assert result['payload_kg'] == pytest.approx(config.value('mission.payload'), rel=1e-12)
    # MTOW = empty (operating) mass + payload + fuel: Raymer, Aircraft Design: A Conceptual
    # Approach, 6th ed., eq. 3.1 (from memory; crew counted in the operating empty mass).
    assert result['mtow_kg'] == pytest.approx(
        result['oew_kg']
        + result['payload_kg']
        + result['block_fuel_kg']
        + result['reserve_fuel_kg'],
        rel=1e-9,
    )
    # The wing is sized to its loading, S = MTOW / (m/S), and its span follows from the
    # definition of aspect ratio, AR = b**2 / S (common practice).
    area = result['mtow_kg'] / config.value('wing.loading')
    assert result['wing_area_m2'] == pytest.approx(area, rel=1e-9)
    assert result['wingspan_m'] == pytest.approx(
        math.sqrt(config.value('wing.aspect_ratio') * area), rel=1e-9
    )


@pytest.mark.parametrize('name, path', [('turbo', TURBO), ('conventional', CONVENTIONAL)])
def test_analyze_json_overall_efficiency(analyses, name, path):
    result = json.loads(analyses[name][1])
    config = load_config(path)
    # Overall efficiency = thrust power / fuel power = V / (TSFC * LHV) (common practice),
    # with the speed of sound of the ISA from the reference library ambiance (its
    # constructor takes geometric height; the config altitude is geopotential).
    height = Atmosphere.geop2geom_height(config.value('mission.cruise_altitude'))
    speed = config.value('mission.cruise_mach') * Atmosphere(height).speed_of_sound[0]
    tsfc = result['tsfc_g_per_kN_s'] * 1e-6  # g/(kN s) -> kg/(N s)
    assert result['overall_efficiency'] == pytest.approx(
        speed / (tsfc * config.value('fuel.heating_value')), rel=1e-9
    )


def test_analyze_json_power_balance_of_the_electrical_chain(analyses):
    result = json.loads(analyses['turbo'][1])
    extracted = result['turbofan_power_extraction_kW']
    # Energy conservation (common practice): the aft-fan shaft receives the extracted power
    # times the chain efficiency, and every watt lost in the chain is heat to reject.
    assert result['aft_fan_shaft_power_kW'] == pytest.approx(
        extracted * result['electrical_chain_efficiency'], rel=1e-9
    )
    assert result['thermal_load_kW'] == pytest.approx(
        extracted - result['aft_fan_shaft_power_kW'], rel=1e-9
    )
    assert 0.0 < result['power_saving_coefficient'] < 1.0
    assert 0.0 < result['electrical_chain_efficiency'] < 1.0
    assert result['aft_fan_diameter_m'] > 0.0 and result['electrical_mass_kg'] > 0.0


def test_analyze_json_conventional_has_no_aft_fan(analyses):
    result = json.loads(analyses['conventional'][1])
    assert result.get('aft_thrust_fraction', 0.0) == 0.0
    assert result.get('power_saving_coefficient', 0.0) == 0.0
    assert result.get('electrical_mass_kg', 0.0) == 0.0


def test_analyze_with_override_changes_the_design(analyses):
    code, stdout, _ = run(['analyze', CONVENTIONAL, '--json', '--set', 'wing.loading=500'])
    assert code == EXIT_OK
    result, base = json.loads(stdout), json.loads(analyses['conventional'][1])
    # A lighter wing loading gives a larger wing; span grows as the square root of the area
    # at fixed aspect ratio (AR = b**2 / S).
    assert result['wing_area_m2'] == pytest.approx(result['mtow_kg'] / 500.0, rel=1e-9)
    assert result['wing_area_m2'] > base['wing_area_m2']
    assert result['wingspan_m'] == pytest.approx(
        base['wingspan_m'] * math.sqrt(result['wing_area_m2'] / base['wing_area_m2']), rel=1e-9
    )


def test_analyze_flags_the_configured_constraints_a_closed_design_violates(tmp_path):
    # A closed design is not necessarily a feasible one: analyze lists the constraints of the
    # optimization section at the design, and says which are violated (exit code still 0).
    tight = ['--set', 'optimization.constraints.wingspan={upper: 30 m}']
    code, text, _ = run(['analyze', TURBO, *tight])
    assert code == EXIT_OK
    line = next(x for x in text.splitlines() if x.strip().startswith('wingspan '))
    assert line.rstrip().endswith('VIOLATED') and '<= 30 m' in line
    assert 'the design closes but violates' in text and 'wingspan' in text.splitlines()[-2]
    code, stdout, _ = run(['analyze', TURBO, '--json', *tight])
    entry = json.loads(stdout)['constraints']['wingspan']
    span = json.loads(stdout)['wingspan_m']
    assert entry['upper'] == 30.0 and entry['value'] == pytest.approx(span, rel=1e-12)
    assert entry['violation'] == pytest.approx((span - 30.0) / 30.0, rel=1e-12)
    loose = ['--set', 'optimization.constraints.wingspan={upper: 60 m}']
    code, text, _ = run(['analyze', TURBO, *loose])
    line = next(x for x in text.splitlines() if x.strip().startswith('wingspan '))
    assert line.rstrip().endswith('ok')
    # No optimization section: no constraint table.
    import yaml

    data = yaml.safe_load(open(CONVENTIONAL))
    del data['optimization']
    bare = tmp_path / 'no_optimization.yaml'
    bare.write_text(yaml.safe_dump(data))
    code, text, _ = run(['analyze', str(bare)])
    assert code == EXIT_OK and 'Constraints of the optimization section' not in text


def test_analyze_json_through_python_m(tmp_path):
    proc = run_subprocess(['analyze', CONVENTIONAL, '--json'], cwd=tmp_path)
    assert proc.returncode == EXIT_OK, proc.stderr
    assert proc.stderr == ''
    result = json.loads(proc.stdout)
    assert ANALYSIS_KEYS <= result.keys() and result['converged'] is True
    assert list(tmp_path.iterdir()) == []  # no report files left behind


# --- text output ---------------------------------------------------------------------------


def test_analyze_text_ends_with_the_caution(capsys):
    assert main(['analyze', TURBO]) == EXIT_OK
    out = capsys.readouterr().out
    assert out.rstrip('\n').splitlines()[-1] == CAUTION
    assert 'PSC vs same-FPR clean fan' in out and 'PSC vs same-mass-flow clean fan' in out


def test_compare_text_ends_with_the_caution(capsys):
    assert main(['compare', TURBO]) == EXIT_OK
    out = capsys.readouterr().out
    assert out.rstrip('\n').splitlines()[-1] == CAUTION
    assert 'Block fuel change versus the reference:' in out


# --- compare --json ------------------------------------------------------------------------


def test_compare_json(capsys, analyses):
    assert main(['compare', TURBO, '--json']) == EXIT_OK
    captured = capsys.readouterr()
    assert captured.err == ''
    comp = json.loads(captured.out)
    design, reference = comp['design'], comp['reference']
    assert (ANALYSIS_KEYS | AFT_FAN_KEYS) <= design.keys()
    assert ANALYSIS_KEYS <= reference.keys()
    assert design['power_saving_coefficient'] > 0.0
    assert reference.get('aft_thrust_fraction', 0.0) == 0.0
    assert comp['fuel_burn_change_percent'] == pytest.approx(
        100.0 * (design['block_fuel_kg'] - reference['block_fuel_kg']) / reference['block_fuel_kg'],
        rel=1e-9,
    )
    # The reference is the same airframe without the aft fan: the conventional demo.
    conventional = json.loads(analyses['conventional'][1])
    assert reference['block_fuel_kg'] == pytest.approx(conventional['block_fuel_kg'], rel=1e-9)
    assert design['block_fuel_kg'] == pytest.approx(
        json.loads(analyses['turbo'][1])['block_fuel_kg'], rel=1e-9
    )
    # What the reference does not have keeps its placeholder numbers and is named as such;
    # no percentage change is given for it.
    absent = set(comp['absent_in_reference'])
    assert {'electrical_chain_efficiency', 'motor_power_margin', 'aft_fan_mass_kg'} <= absent
    assert reference['electrical_chain_efficiency'] == 1.0 and reference['aft_fan_mass_kg'] == 0.0
    assert not absent & set(comp['change_percent']) and 'mtow_kg' not in absent


# --- bad input: exit 2 with one line -------------------------------------------------------


def bad_config(tmp_path):
    with open(TURBO, encoding='utf-8') as handle:
        text = handle.read().replace('  aspect_ratio: 10.5\n', '  aspect_ratio: -10.5\n')
    line = text.splitlines().index('  aspect_ratio: -10.5') + 1
    path = tmp_path / 'bad.yaml'
    path.write_text(text, encoding='utf-8')
    return str(path), line


@pytest.mark.parametrize(
    'command', [['analyze'], ['analyze', '--json'], ['compare'], ['compare', '--json'], ['derivs']]
)
def test_bad_config_exits_2_with_one_line(capsys, tmp_path, command):
    path, line = bad_config(tmp_path)
    assert main([*command, path]) == EXIT_BAD_INPUT
    captured = capsys.readouterr()
    message = assert_one_error_line(captured.err)
    assert message.startswith(f'voltwake: error: {path}:{line}: wing.aspect_ratio: got -10.5')
    assert captured.out == ''


@pytest.mark.parametrize(
    'override, expected',
    [
        ('wing.aspect_ratio=0', '--set: wing.aspect_ratio: got 0; expected a value > 0'),
        ('wing.aera=3', "--set: wing.aera: unknown key (did you mean 'area'?)"),
        ('mission.range=1500 kg', "--set: mission.range: got '1500 kg': unit 'kg' cannot be"),
        (
            'mission.cruise_mach=1.2',
            '--set: mission.cruise_mach: got 1.2; expected a value in (0, 1)',
        ),
        ('mission.range', "--set: got 'mission.range'; expected key.path=value"),
    ],
)
def test_bad_override_exits_2_naming_set(capsys, override, expected):
    assert main(['analyze', TURBO, '--set', override]) == EXIT_BAD_INPUT
    message = assert_one_error_line(capsys.readouterr().err)
    assert message.startswith(f'voltwake: error: {expected}'), message


@pytest.mark.parametrize('content', [b'', b'\x00\x01\x02binary', b'wing: [1\n'])
def test_unreadable_files_exit_2(capsys, tmp_path, content):
    path = tmp_path / 'odd.yaml'
    path.write_bytes(content)
    assert main(['analyze', str(path)]) == EXIT_BAD_INPUT
    message = assert_one_error_line(capsys.readouterr().err)
    assert message.startswith(f'voltwake: error: {path}')


def test_missing_file_exits_2(capsys, tmp_path):
    path = tmp_path / 'nowhere.yaml'
    assert main(['analyze', str(path)]) == EXIT_BAD_INPUT
    message = assert_one_error_line(capsys.readouterr().err)
    assert message.startswith(f'voltwake: error: {path}: cannot read the file')


def test_bad_config_through_python_m(tmp_path):
    path, line = bad_config(tmp_path)
    proc = run_subprocess(['analyze', path], cwd=tmp_path)
    assert proc.returncode == EXIT_BAD_INPUT
    assert proc.stdout == ''
    message = assert_one_error_line(proc.stderr)
    assert f'{path}:{line}: wing.aspect_ratio' in message


# --- designs that cannot close: exit 3 with one line ---------------------------------------


def not_closed(capsys, path, *overrides):
    sets = [arg for override in overrides for arg in ('--set', override)]
    assert main(['analyze', path, '--json'] + sets) == EXIT_NOT_CLOSED
    captured = capsys.readouterr()
    assert captured.out == ''
    message = assert_one_error_line(captured.err)
    assert message.startswith('voltwake: error: the sizing loop did not close: ')
    return message


def test_airframe_mass_exponent_above_one_runs_away(capsys):
    # With airframe mass ~ MTOW**1.2 every added kilogram adds more than a kilogram of
    # structure: the mass balance has no finite root near the demo design.
    message = not_closed(
        capsys,
        CONVENTIONAL,
        'structure.method=regression',
        'structure.airframe_mass_coefficient=1.1',
        'structure.airframe_mass_exponent=1.2',
    )
    assert 'MTOW' in message and 'weight grows without bound' in message


@pytest.mark.parametrize('path', [TURBO, CONVENTIONAL])
@pytest.mark.parametrize('ratio', ['1.0', '0.95'])
def test_fan_pressure_ratio_of_one_or_less_is_refused(capsys, path, ratio):
    # A fan pressure ratio of one or less gives a jet no faster than flight: no thrust. The
    # config refuses it before any sizing.
    code = main(['analyze', path, '--set', f'turbofans.fan_pressure_ratio={ratio}'])
    err = capsys.readouterr().err
    assert code == 2
    assert 'turbofans.fan_pressure_ratio' in err and 'expected a value > 1' in err


@pytest.mark.parametrize('path', [TURBO, CONVENTIONAL])
def test_fan_pressure_ratio_barely_above_one(capsys, path):
    not_closed(capsys, path, 'turbofans.fan_pressure_ratio=1.01')


@pytest.mark.parametrize(
    'path, override, cause, not_cause',
    [
        (TURBO, 'structure.airframe_mass_exponent=1.2', 'weight grows without bound', 'aft fan'),
        (TURBO, 'turbofans.fan_pressure_ratio=1.01', 'under-wing fan', 'nan'),
        (TURBO, 'aft_fan.fan_pressure_ratio=1.005', 'aft fan gives no thrust', 'nan'),
        (CONVENTIONAL, 'structure.airframe_mass_exponent=1.05', 'MTOW', 'nan'),
    ],
)
def test_not_closed_reason_names_the_cause(capsys, path, override, cause, not_cause):
    # An airframe-mass exponent is a regression constant: those cases use the regression.
    regression = (
        ['structure.method=regression', 'structure.airframe_mass_coefficient=1.1']
        if 'airframe_mass_exponent' in override
        else []
    )
    message = not_closed(capsys, path, *regression, override)
    assert cause in message and not_cause not in message


# --- compare: a table that reads right -----------------------------------------------------

_ROW = re.compile(r'^(?P<label>  .*?\S)\s{2,}(?P<a>\S+)\s{2,}(?P<b>\S+)(?:\s{2,}(?P<change>\S+))?$')


def table_rows(text):
    """Return (header, {label: match}) of the compare table; section titles are left out."""
    lines = text.splitlines()
    header, rows = lines[0], {}
    for line in lines[1 : lines.index(next(x for x in lines if x.startswith('Block fuel change')))]:
        if line.startswith('  '):
            match = _ROW.match(line)
            assert match, line
            rows[match['label'].strip()] = match
    return header, rows


@pytest.fixture(scope='module')
def compared():
    """``compare`` text of the turbo-electric demo, run once for the module."""
    code, stdout, stderr = run(['compare', TURBO])
    assert code == EXIT_OK and stderr == ''
    return stdout


def test_compare_columns_line_up_on_every_row(compared):
    header, rows = table_rows(compared)
    design_end = header.index('turbo-electric') + len('turbo-electric')
    reference_end = header.index('reference') + len('reference')
    change_end = header.index('change') + len('change')
    assert len(rows) > 50
    for label, match in rows.items():
        assert match.end('a') == design_end, label
        assert match.end('b') == reference_end, label
        if match['change']:
            assert match.end('change') == change_end, label
    # The row the old fixed widths misaligned: its label is among the longest.
    assert 'electrical (incl. thermal) [kg]' in rows
    assert rows['Take-off thrust (all propulsors) [kN]'].end('a') == design_end


def test_compare_shows_a_dash_for_what_the_reference_does_not_have(compared):
    _, rows = table_rows(compared)
    for label in (
        'aft fan [kg]',
        'electrical (incl. thermal) [kg]',
        'Chain efficiency',
        'Thrust fraction',
        'Aft-fan diameter margin',
        'Motor power margin',
        'Cable partial-discharge margin',
    ):
        assert rows[label]['b'] == '—', label
        assert rows[label]['a'] != '—' and not rows[label]['change'], label
    # Quantities both designs have keep their numbers.
    assert rows['Top-of-climb thrust margin']['b'] != '—'
    assert rows['MTOW [kg]']['change'].endswith('%')
    assert '1.0000' not in rows['Chain efficiency'].group(0)


def test_compare_of_a_conventional_design_has_no_aft_fan_rows(capsys):
    assert main(['compare', CONVENTIONAL]) == EXIT_OK
    header, rows = table_rows(capsys.readouterr().out)
    assert 'turbo-electric' not in header and 'design' in header
    assert 'Chain efficiency' not in rows and 'aft fan [kg]' not in rows
    assert rows['MTOW [kg]']['a'] == rows['MTOW [kg]']['b']


def test_analyze_text_columns_line_up(capsys):
    assert main(['analyze', CONVENTIONAL]) == EXIT_OK
    lines = capsys.readouterr().out.splitlines()
    rows = [x for x in lines[2 : lines.index('Constraints of the optimization section')]]
    rows = [x for x in rows if x.startswith('  ')]
    ends = {re.match(r'^  .*?\S\s{2,}(\S+)', x).end(1) for x in rows}
    assert len(ends) == 1, rows  # every value ends in the same column
    assert any(x.split()[-1] == '—' and 'aft fan' in x for x in rows)


# --- derivs: what was measured -------------------------------------------------------------


def test_derivs_prints_the_measured_worst_pair_and_the_count(capsys):
    assert main(['derivs', CONVENTIONAL]) == EXIT_OK
    lines = capsys.readouterr().out.splitlines()
    assert re.match(r'partials: \d+ components, \d+ declared sub-Jacobians compared', lines[0])
    assert re.match(r'totals: \d+ pairs \(of, wrt\) of the converged model compared', lines[2])
    number = r'\d\.\d{3}e[-+]\d+'
    measured = (
        # A number (0 said as such), the pair it was measured on and its scale ...
        rf'  worst relative error (0 \(exact to round-off\)|{number}) at .+ wrt .+, '
        rf'largest complex-step entry {number}',
        # ... or, where every complex-step entry of the worst pair is negligible, an
        # absolute error, said as such.
        rf'  worst error {number} \(absolute: the largest complex-step entry of the pair, '
        rf'{number}, is below 1e-12\) at .+ wrt .+',
    )
    for line in (lines[1], lines[3]):
        assert any(re.fullmatch(form + r'.*', line) for form in measured), line
    assert 'every pair agrees' not in '\n'.join(lines)
    passed = r'derivative check passed \(tolerance 1e-06; \d+ partial and \d+ total'
    assert re.match(passed, lines[4])


def test_worst_pair_when_every_pair_agrees_exactly():
    from types import SimpleNamespace

    from voltwake.design.derivatives import _worst, worst_line

    def entry(cs, err):
        # The fields of OpenMDAO's check data that are read (complex step = 'fd' there).
        return {
            'J_fd': np.array(cs, dtype=float),
            'abs error': SimpleNamespace(forward=err, reverse=None),
            'magnitude': SimpleNamespace(fd=float(np.max(np.abs(cs)))),
        }

    exact = [('a wrt x', entry([[0.5, 0.0]], 0.0)), ('b wrt y', entry([[-3.0, 1.0]], 0.0))]
    worst = _worst(exact)
    # Every error is zero: the pair with the largest complex-step entry is named.
    assert worst == {'relative': 0.0, 'absolute': 0.0, 'scale': 3.0, 'at': 'b wrt y', 'compared': 2}
    assert worst_line(worst) == (
        'worst relative error 0 (exact to round-off) at b wrt y, largest complex-step entry '
        '3.000e+00'
    )
    # Relative error = absolute error / largest complex-step entry (hand value: 1e-9 / 2).
    worst = _worst(exact + [('c wrt z', entry([[2.0]], 1e-9))])
    assert worst['at'] == 'c wrt z' and worst['relative'] == pytest.approx(5e-10, rel=1e-12)
    assert worst_line(worst) == (
        'worst relative error 5.000e-10 at c wrt z, largest complex-step entry 2.000e+00 '
        '(absolute error 1.000e-09)'
    )
    # Where the complex-step entries are negligible the error is measured absolutely.
    tiny = _worst([('d wrt w', entry([[1e-15]], 3e-16))])
    assert tiny['relative'] == 3e-16
    assert worst_line(tiny) == (
        'worst error 3.000e-16 (absolute: the largest complex-step entry of the pair, '
        '1.000e-15, is below 1e-12) at d wrt w'
    )
    assert worst_line(_worst([])) == 'no pairs compared'


def test_derivs_failure_names_the_pair(capsys, monkeypatch):
    import voltwake.design.derivatives as derivatives

    def fake(config, vec_size=3, out=print):
        return {
            'worst_partial': 2e-5,
            'worst_partial_at': 'sizing.wing: area wrt span',
            'worst_partial_scale': 1.0,
            'partials_compared': 10,
            'worst_total': 0.0,
            'worst_total_at': 'mtow wrt range',
            'worst_total_scale': 1.0,
            'totals_compared': 4,
        }

    monkeypatch.setattr(derivatives, 'check_derivatives', fake)
    assert main(['derivs', CONVENTIONAL]) == 5
    message = capsys.readouterr().err.strip()
    assert message == (
        'voltwake: derivative check failed: worst partial relative error 2.000e-05 at '
        'sizing.wing: area wrt span, above the tolerance 1e-06'
    )


# --- demos and model-view ------------------------------------------------------------------


def test_demos_lists_every_packaged_demo_with_its_aircraft(capsys):
    assert main(['demos']) == EXIT_OK
    text = capsys.readouterr().out
    for name in demo_names():
        config = load_config(name)
        line = next(x for x in text.splitlines() if x.startswith(name + ' '))
        assert line.split(None, 1)[1] == config.name
    assert 'voltwake analyze demo_' in text
    assert 'short-to-medium-haul twin' in text  # the first comment line of the demo file
    assert main(['demos', '--json']) == EXIT_OK
    demos = json.loads(capsys.readouterr().out)['demos']
    assert [d['name'] for d in demos] == demo_names()
    assert {d['path'] for d in demos} == {TURBO, CONVENTIONAL}
    assert all(d['aircraft'] and d['description'] for d in demos)


def test_a_demo_name_works_as_the_config_argument(capsys, analyses):
    assert main(['analyze', 'demo_conventional', '--json']) == EXIT_OK
    by_name = json.loads(capsys.readouterr().out)
    assert by_name['mtow_kg'] == json.loads(analyses['conventional'][1])['mtow_kg']


def test_model_view_writes_the_n2_diagram(capsys, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    assert main(['model-view', 'demo_conventional']) == EXIT_OK
    default = tmp_path / 'model_view.html'  # the documented default, in the current directory
    assert str(default) in capsys.readouterr().out
    html = default.read_text(encoding='utf-8')
    assert html.lstrip().lower().startswith('<!doctype html')
    assert 'VW-120 demo (conventional)' in html  # the title names the design
    systems = n2_systems(html)
    assert any(name.startswith('sizing.airframe.') for name in systems)
    assert not any('aft_fan' in name for name in systems)
    # The model of the configured design: the turbo-electric demo has its aft fan.
    out = tmp_path / 'te.html'
    assert main(['model-view', '--output', str(out)]) == EXIT_OK
    assert any(name.startswith('sizing.aft_fan') for name in n2_systems(out.read_text()))


def n2_systems(html):
    """The component path names in an N2 file (OpenMDAO embeds the model as zlib + base64)."""
    import base64
    import zlib

    packed = re.search(r'compressedModel = "([^"]+)"', html).group(1)
    return set(json.loads(zlib.decompress(base64.b64decode(packed)))['sys_pathnames_list'])


@pytest.mark.parametrize('where', ['missing_dir/view.html', '.'])
def test_model_view_bad_output_exits_2(capsys, tmp_path, monkeypatch, where):
    monkeypatch.chdir(tmp_path)
    assert main(['model-view', CONVENTIONAL, '--output', where]) == EXIT_BAD_INPUT
    message = assert_one_error_line(capsys.readouterr().err)
    assert message.startswith(f'voltwake: error: {where}: ')
    assert list(tmp_path.iterdir()) == []


def test_model_view_bad_config_exits_2(capsys, tmp_path):
    path, line = bad_config(tmp_path)
    assert main(['model-view', path, '--output', str(tmp_path / 'v.html')]) == EXIT_BAD_INPUT
    message = assert_one_error_line(capsys.readouterr().err)
    assert message.startswith(f'voltwake: error: {path}:{line}: wing.aspect_ratio')


# --- output cut short by its reader --------------------------------------------------------


def test_closed_output_pipe_is_not_an_error(tmp_path):
    # `voltwake analyze | head -3`: the reader goes before the output is written. Here the
    # reader closes its end at once, so the write always meets a closed pipe.
    env = dict(os.environ, OPENMDAO_REPORTS='0')
    env.pop('VOLTWAKE_DEBUG', None)
    proc = subprocess.Popen(
        [sys.executable, '-m', 'voltwake.cli', 'analyze', CONVENTIONAL],
        cwd=tmp_path,
        env=env,
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        text=True,
    )
    proc.stdout.close()
    _, err = proc.communicate(timeout=600)
    assert proc.returncode == EXIT_OK
    assert err == ''


class _ClosedPipe(io.StringIO):
    """Standard output whose reader has gone."""

    def write(self, text):
        raise BrokenPipeError(32, 'Broken pipe')


def test_closed_output_keeps_the_exit_code(capsys, monkeypatch):
    monkeypatch.setattr(sys, 'stdout', _ClosedPipe())
    err = io.StringIO()
    with contextlib.redirect_stderr(err):
        assert main(['analyze', CONVENTIONAL]) == EXIT_OK
        # A design that does not close still says so, on standard error, with its code.
        code = main(['analyze', CONVENTIONAL, '--set', 'turbofans.fan_pressure_ratio=1.01'])
    assert code == EXIT_NOT_CLOSED
    assert assert_one_error_line(err.getvalue()).startswith('voltwake: error: the sizing loop')


def test_a_broken_pipe_elsewhere_is_still_an_error(capsys, monkeypatch):
    import voltwake.cli as cli

    def broken(args):
        raise BrokenPipeError(32, 'Broken pipe')

    monkeypatch.setitem(cli.COMMANDS, 'analyze', broken)
    assert main(['analyze']) == 1
    assert 'internal error: BrokenPipeError' in capsys.readouterr().err
