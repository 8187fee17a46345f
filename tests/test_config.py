"""
Tests of configuration loading and validation (voltwake.configuration.loader, voltwake.yamlio).

Every bad configuration must end in one ConfigError whose one-line message names the file,
the line (when the file has one), the dotted key path, the value as written and what was
expected. The bad files are the packaged demos with one line changed, so that each error
has exactly one cause.
"""

import math
import re
import time

import numpy as np
import pytest

from voltwake.configuration import yamlio
from voltwake.configuration.loader import (
    Config,
    demo_path,
    load_config,
    parse_quantity,
    parse_yaml_text,
)
from voltwake.errors import EXIT_BAD_INPUT, ConfigError

TURBO = demo_path('turbo_electric')
CONVENTIONAL = demo_path('conventional')


def demo_text(path=TURBO):
    with open(path, encoding='utf-8') as handle:
        return handle.read()


def key_line(text, section, key):
    """Return the 1-based line of ``key`` inside top-level ``section`` of ``text``."""
    lines = text.splitlines()
    start = lines.index(f'{section}:')
    for number in range(start + 1, len(lines)):
        line = lines[number]
        if line and not line.startswith((' ', '#')):
            break
        if re.match(rf'\s+{re.escape(key)}:', line):
            return number + 1
    raise AssertionError(f'{section}.{key} not found in the demo')


def set_line(text, section, key, new):
    """Replace the line of ``section.key`` with ``new`` (indent kept); return text and line."""
    number = key_line(text, section, key)
    lines = text.splitlines()
    indent = re.match(r'\s*', lines[number - 1]).group(0)
    lines[number - 1] = indent + new
    return '\n'.join(lines) + '\n', number


def drop_line(text, section, key):
    """Remove the line of ``section.key``; return the text."""
    number = key_line(text, section, key)
    lines = text.splitlines()
    del lines[number - 1]
    return '\n'.join(lines) + '\n'


def section_range(text, section):
    """Return (first, last) 0-based line indices of a top-level section, comments excluded."""
    lines = text.splitlines()
    start = lines.index(f'{section}:')
    end = start + 1
    while end < len(lines) and (not lines[end] or lines[end].startswith(' ')):
        end += 1
    return start, end


def drop_section(text, section):
    lines = text.splitlines()
    start, end = section_range(text, section)
    del lines[start:end]
    return '\n'.join(lines) + '\n'


def write(tmp_path, text, name='aircraft.yaml'):
    path = tmp_path / name
    if isinstance(text, bytes):
        path.write_bytes(text)
    else:
        path.write_text(text, encoding='utf-8')
    return str(path)


def config_error(source, overrides=None):
    with pytest.raises(ConfigError) as info:
        load_config(source, overrides)
    err = info.value
    assert '\n' not in err.message, err.message
    assert err.exit_code == EXIT_BAD_INPUT
    return err


def assert_points_at(err, source, line, path):
    """The error names the source, line and key path, in its fields and in its message."""
    assert err.source == source
    assert err.line == line
    assert err.path == path
    where = source if line is None else f'{source}:{line}'
    assert err.message.startswith(f'{where}: {path}: '), err.message


# --- the demos themselves ------------------------------------------------------------------


@pytest.mark.parametrize('path', [TURBO, CONVENTIONAL])
def test_demos_load(path):
    config = load_config(path)
    assert isinstance(config, Config)
    assert config.source == path
    assert config.has_aft_fan == (path == TURBO)


def test_unit_strings_of_the_demo_are_converted_to_si():
    config = load_config(TURBO)
    # International foot = 0.3048 m exactly (NIST SP 811, 2008 ed., appendix B.8).
    assert config.value('mission.cruise_altitude') == pytest.approx(35000 * 0.3048, rel=1e-12)
    assert config.value('mission.cruise_altitude') == pytest.approx(10668.0, rel=1e-12)
    # International nautical mile = 1852 m exactly (NIST SP 811, 2008 ed., appendix B.8).
    assert config.value('mission.range') == pytest.approx(1500 * 1852.0, rel=1e-12)
    assert config.value('reserves.hold_time') == pytest.approx(30 * 60.0, rel=1e-12)
    assert config.value('electrical.generator.specific_power') == pytest.approx(9000.0, rel=1e-12)
    assert config.value('electrical.cable.current_density_limit') == pytest.approx(5e6, rel=1e-12)
    assert config.value('fuel.heating_value') == pytest.approx(43.1e6, rel=1e-12)


@pytest.mark.parametrize(
    'written, units, expected',
    [
        ('35000 ft', 'm', 10668.0),  # 1 ft = 0.3048 m exactly (NIST SP 811, appendix B.8)
        ('1500 nmi', 'm', 2778000.0),  # 1 nmi = 1852 m exactly (NIST SP 811, appendix B.8)
        ('10 kW/kg', 'W/kg', 10000.0),  # SI prefix k = 1e3 (BIPM SI Brochure, 9th ed.)
        ('5 A/mm**2', 'A/m**2', 5e6),  # SI prefix m = 1e-3 (BIPM SI Brochure, 9th ed.)
        ('1 kg/kW', 'kg/W', 1e-3),
        ('122 m ** 2', 'm**2', 122.0),
        ('2.5e3 m', 'm', 2500.0),
        ('12.5', 'm', 12.5),  # no unit: the value is taken as SI
        (12, 'm', 12.0),
    ],
)
def test_parse_quantity_converts(written, units, expected):
    assert parse_quantity(written, units, {}) == pytest.approx(expected, rel=1e-12)


# --- unknown and missing keys -------------------------------------------------------------


def test_unknown_key_suggests_the_close_one(tmp_path):
    text, line = set_line(demo_text(), 'wing', 'loading', 'laoding: 600 kg/m**2')
    path = write(tmp_path, text)
    err = config_error(path)
    assert_points_at(err, path, line, 'wing.laoding')
    assert "unknown key (did you mean 'loading'?)" in err.message
    assert 'aspect_ratio' in err.message  # the keys known here are listed


@pytest.mark.parametrize(
    'section, key, line_text, reason',
    [
        ('reserves', 'hold_time', 'hold_speed: 150 m/s', 'cruise TSFC'),
        ('aft_fan', 'fan_face_mach', 'hub_to_tip_ratio: 0.45', 'station_diameter_ratio'),
    ],
)
def test_a_retired_key_is_refused_saying_why(tmp_path, section, key, line_text, reason):
    text, line = set_line(demo_text(), section, key, line_text)
    path = write(tmp_path, text)
    err = config_error(path)
    assert_points_at(err, path, line, f"{section}.{line_text.split(':')[0]}")
    assert 'no longer read' in err.message and reason in err.message


def test_unknown_section_suggests_the_close_one(tmp_path):
    text = demo_text().replace('\nwing:\n', '\nwings:\n')
    line = text.splitlines().index('wings:') + 1
    path = write(tmp_path, text)
    err = config_error(path)
    assert_points_at(err, path, line, 'wings')
    assert "did you mean 'wing'?" in err.message


def test_wing_takes_an_area_or_a_loading_not_both(tmp_path):
    text = demo_text()
    line = key_line(text, 'wing', 'loading')
    both = text.replace('  loading: 600', '  area: 122 m**2\n  loading: 600', 1)
    err = config_error(write(tmp_path, both, name='both.yaml'))
    assert_points_at(err, str(tmp_path / 'both.yaml'), line + 1, 'wing.loading')
    assert "got both 'area' and 'loading'" in err.message
    err = config_error(TURBO, ['wing.area=120'])  # an override that adds the other one
    assert "got both 'area' and 'loading'" in err.message
    neither = write(tmp_path, drop_line(text, 'wing', 'loading'), name='neither.yaml')
    err = config_error(neither)
    assert err.path == 'wing' and err.line == text.splitlines().index('wing:') + 1
    assert 'expected wing.area' in err.message and 'or wing.loading' in err.message


def test_a_fixed_wing_area_is_an_input_and_a_loading_sizes_the_wing(tmp_path):
    text = demo_text().replace('  loading: 600 kg/m**2', '  area: 1300 ft**2', 1)
    config = load_config(write(tmp_path, text))
    # 1 ft = 0.3048 m exactly (NIST SP 811, appendix B.8).
    assert config.value('wing.area') == pytest.approx(1300 * 0.3048**2, rel=1e-12)
    assert 'wing.loading' not in config.values
    assert config.model_options()['wing_sizing'] == 'area'
    assert 'wing_area' in config.model_inputs()
    sized = load_config(TURBO)
    assert sized.model_options()['wing_sizing'] == 'loading'
    assert sized.model_inputs()['design_wing_loading'] == (600.0, 'kg/m**2')
    assert 'wing_area' not in sized.model_inputs()


def test_unknown_key_with_nothing_close_has_no_suggestion(tmp_path):
    text, line = set_line(demo_text(), 'wing', 'loading', 'zzzz: 1')
    path = write(tmp_path, text)
    err = config_error(path)
    assert_points_at(err, path, line, 'wing.zzzz')
    assert 'did you mean' not in err.message


def test_missing_required_key_points_at_its_section(tmp_path):
    text = drop_line(demo_text(), 'wing', 'aspect_ratio')
    path = write(tmp_path, text)
    err = config_error(path)
    assert_points_at(err, path, text.splitlines().index('wing:') + 1, 'wing.aspect_ratio')
    assert 'missing required key' in err.message


def test_missing_section(tmp_path):
    path = write(tmp_path, drop_section(demo_text(), 'fuselage'))
    err = config_error(path)
    assert_points_at(err, path, None, 'fuselage')
    assert 'missing section' in err.message and 'diameter' in err.message


# --- wrong types ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    'section, key, new, path, shown, expected',
    [
        (
            'wing',
            'aspect_ratio',
            'aspect_ratio: ten',
            'wing.aspect_ratio',
            "'ten'",
            'expected a number',
        ),
        (
            'wing',
            'aspect_ratio',
            'aspect_ratio: "10.5"',
            'wing.aspect_ratio',
            "'10.5'",
            'expected a number',
        ),
        (
            'wing',
            'aspect_ratio',
            'aspect_ratio: true',
            'wing.aspect_ratio',
            'True',
            'expected a number',
        ),
        (
            'mission',
            'payload',
            'payload: yes',
            'mission.payload',
            'True',
            'expected a number in kg',
        ),
        (
            'mission',
            'range',
            'range: [1500, nmi]',
            'mission.range',
            "[1500, 'nmi']",
            'expected a number in m',
        ),
        ('mission', 'range', 'range: far', 'mission.range', "'far'", 'expected a number in m'),
        ('turbofans', 'count', 'count: 2.5', 'turbofans.count', '2.5', 'expected a whole number'),
        ('turbofans', 'count', 'count: true', 'turbofans.count', 'True', 'expected a whole number'),
        (
            'electrical',
            'cable',
            'cable: [1, 2]',
            'electrical.cable',
            '[1, 2]',
            'expected a mapping with keys voltage',
        ),
    ],
)
def test_wrong_type(tmp_path, section, key, new, path, shown, expected):
    text, line = set_line(demo_text(), section, key, new)
    if key == 'cable':  # drop the old block under 'cable:' so only the type is wrong
        lines = text.splitlines()
        while lines[line].startswith('    '):
            del lines[line]
        text = '\n'.join(lines) + '\n'
    file = write(tmp_path, text)
    err = config_error(file)
    assert_points_at(err, file, line, path)
    assert f'got {shown}' in err.message
    assert expected in err.message


def test_list_where_a_section_is_expected(tmp_path):
    text = drop_section(demo_text(), 'wing') + 'wing: [122, 10.5, 0.8]\n'
    file = write(tmp_path, text)
    err = config_error(file)
    assert_points_at(err, file, len(text.splitlines()), 'wing')
    assert 'got [122, 10.5, 0.8]; expected a mapping with keys area' in err.message


def test_top_level_must_be_a_mapping(tmp_path):
    file = write(tmp_path, '- wing\n- mission\n')
    err = config_error(file)
    assert err.source == file
    assert 'expected a mapping of sections' in err.message


def test_wrong_choice_suggests(tmp_path):
    text, line = set_line(demo_text(), 'electrical', 'conductor', 'conductor: coper')
    file = write(tmp_path, text)
    err = config_error(file)
    assert_points_at(err, file, line, 'electrical.cable.conductor')
    assert "got 'coper'" in err.message and "did you mean 'copper'?" in err.message


# --- physically impossible values ----------------------------------------------------------


@pytest.mark.parametrize(
    'section, key, new, path, shown, expected',
    [
        # efficiencies outside (0, 1]
        (
            'turbofans',
            'fan_efficiency',
            'fan_efficiency: 1.2',
            'turbofans.fan_efficiency',
            '1.2',
            'a value in (0, 1]',
        ),
        (
            'turbofans',
            'fan_efficiency',
            'fan_efficiency: 0',
            'turbofans.fan_efficiency',
            '0',
            'a value in (0, 1]',
        ),
        (
            'turbofans',
            'core_thermal_efficiency',
            'core_thermal_efficiency: -0.4',
            'turbofans.core_thermal_efficiency',
            '-0.4',
            'a value in (0, 1]',
        ),
        (
            'wing',
            'oswald_efficiency',
            'oswald_efficiency: 1.01',
            'wing.oswald_efficiency',
            '1.01',
            'a value in (0, 1]',
        ),
        (
            'electrical',
            'generator',
            'generator: {efficiency: 1.03, specific_power: 9 kW/kg}',
            'electrical.generator.efficiency',
            '1.03',
            'a value in (0, 1]',
        ),
        # negative lengths and masses, zero aspect ratio
        (
            'fuselage',
            'diameter',
            'diameter: -3.9 m',
            'fuselage.diameter',
            "'-3.9 m'",
            'a value > 0',
        ),
        ('fuselage', 'diameter', 'diameter: -3.9', 'fuselage.diameter', '-3.9 m', 'a value > 0'),
        (
            'electrical',
            'length',
            'length: -30 ft',
            'electrical.cable.length',
            "'-30 ft' (= -9.144 m)",
            'a value > 0',
        ),
        (
            'mission',
            'payload',
            'payload: -12000 kg',
            'mission.payload',
            "'-12000 kg'",
            'a value > 0',
        ),
        ('wing', 'aspect_ratio', 'aspect_ratio: 0', 'wing.aspect_ratio', '0', 'a value > 0'),
        ('wing', 'loading', 'loading: 0 kg/m**2', 'wing.loading', "'0 kg/m**2'", 'a value > 0'),
        # Mach number at or above one, or zero
        (
            'mission',
            'cruise_mach',
            'cruise_mach: 1.0',
            'mission.cruise_mach',
            '1.0',
            'a value in (0, 1)',
        ),
        (
            'mission',
            'cruise_mach',
            'cruise_mach: 1.3',
            'mission.cruise_mach',
            '1.3',
            'a value in (0, 1)',
        ),
        (
            'mission',
            'cruise_mach',
            'cruise_mach: 0',
            'mission.cruise_mach',
            '0',
            'a value in (0, 1)',
        ),
        # NaN and infinity, as YAML writes them and inside unit strings
        (
            'mission',
            'cruise_mach',
            'cruise_mach: .nan',
            'mission.cruise_mach',
            'nan',
            'a finite number',
        ),
        (
            'wing',
            'aspect_ratio',
            'aspect_ratio: .inf',
            'wing.aspect_ratio',
            'inf',
            'a finite number',
        ),
        ('wing', 'loading', 'loading: -.inf', 'wing.loading', '-inf', 'a finite number'),
        ('wing', 'loading', 'loading: .NaN', 'wing.loading', 'nan', 'a finite number'),
        ('mission', 'range', 'range: nan nmi', 'mission.range', 'nan', 'a finite number'),
        ('mission', 'range', 'range: inf km', 'mission.range', 'inf', 'a finite number'),
        ('mission', 'range', 'range: 1e400', 'mission.range', 'inf', 'a finite number'),
        (
            'mission',
            'payload',
            'payload: 1' + '0' * 400,
            'mission.payload',
            '1000',
            'a finite number',
        ),
        # other limits of the schema
        (
            'reserves',
            'contingency_fraction',
            'contingency_fraction: 1.0',
            'reserves.contingency_fraction',
            '1.0',
            'a value in [0, 1)',
        ),
        ('turbofans', 'count', 'count: 0', 'turbofans.count', '0', 'a value >= 1'),
        (
            'turbofans',
            'rated_to_cruise_thrust',
            'rated_to_cruise_thrust: 0.5',
            'turbofans.rated_to_cruise_thrust',
            '0.5',
            'a value >= 1',
        ),
    ],
)
def test_impossible_value(tmp_path, section, key, new, path, shown, expected):
    text, line = set_line(demo_text(), section, key, new)
    file = write(tmp_path, text)
    err = config_error(file)
    assert_points_at(err, file, line, path)
    assert f'got {shown}' in err.message
    assert f'expected {expected}' in err.message


def test_long_values_are_cut_in_the_message(tmp_path):
    text, line = set_line(demo_text(), 'mission', 'payload', 'payload: 1' + '0' * 400)
    err = config_error(write(tmp_path, text))
    assert err.line == line
    assert len(err.message) < 400


# --- units ---------------------------------------------------------------------------------


@pytest.mark.parametrize(
    'new, expected',
    [
        ('range: 1500 kg', "unit 'kg' cannot be converted to m"),
        ('range: 1500 W', "unit 'W' cannot be converted to m"),
        ('range: 1500 leagues', "unknown unit 'leagues'"),
        ('range: 1500 m/', "unknown unit 'm/'"),
        ('range: 1500 m^2', "unknown unit 'm^2'"),
        ('range: 1500 kg)', "unknown unit 'kg)'"),
        ('range: 1500 nmi nmi', "unknown unit 'nmi nmi'"),
    ],
)
def test_bad_unit(tmp_path, new, expected):
    text, line = set_line(demo_text(), 'mission', 'range', new)
    file = write(tmp_path, text)
    err = config_error(file)
    assert_points_at(err, file, line, 'mission.range')
    assert f"got '{new.split(': ', 1)[1]}'" in err.message
    assert expected in err.message


@pytest.mark.parametrize(
    'unit',
    [
        '().__class__.__base__.__subclasses__()',
        '[m][0]',
        "getattr(m, 'x')",
        '9**9**9',  # would take forever to evaluate
        'm**2**2**2',
    ],
)
def test_unit_strings_are_never_evaluated_as_code(unit):
    # OpenMDAO evaluates unit strings as Python expressions; only plain unit expressions
    # may reach it.
    with pytest.raises(ConfigError, match='unknown unit'):
        parse_quantity(f'1 {unit}', 'm', {'path': 'mission.range'})


def test_exponent_floats_are_numbers(tmp_path):
    # YAML 1.2 core schema (yaml.org/spec/1.2.2, 10.3.2) reads 1e-8 as a float; YAML 1.1
    # would read it as text.
    text = demo_text()
    if '\nsolver:\n' in text:
        text = drop_section(text, 'solver')
    text += 'solver:\n  tolerance: 1e-8\n  max_iterations: 40\n'
    config = load_config(write(tmp_path, text))
    assert config.value('solver.tolerance') == 1e-8
    data, _ = yamlio.parse_yaml('a: 1e-8\nb: 2.5E3\nc: -.5e+2\nd: 15\ne: 1.5\nf: text1e5\n')
    assert data == {'a': 1e-8, 'b': 2500.0, 'c': -50.0, 'd': 15, 'e': 1.5, 'f': 'text1e5'}
    assert isinstance(data['d'], int)


# --- YAML-level problems -------------------------------------------------------------------


def test_yaml_syntax_error_names_its_line(tmp_path):
    text = demo_text()
    line = key_line(text, 'wing', 'aspect_ratio')
    lines = text.splitlines()
    lines[line - 1] = ' aspect_ratio: 10.5'  # indented one space: breaks the mapping
    file = write(tmp_path, '\n'.join(lines) + '\n')
    err = config_error(file)
    assert err.source == file and err.line == line
    assert err.message.startswith(f'{file}:{line}: not valid YAML: ')


def test_unclosed_flow_mapping(tmp_path):
    text, line = set_line(
        demo_text(),
        'electrical',
        'generator',
        'generator: {efficiency: 0.97, specific_power: 9 kW/kg',
    )
    err = config_error(write(tmp_path, text))
    assert 'not valid YAML' in err.message
    assert err.line is not None and err.line >= line


@pytest.mark.parametrize('content', ['', '\n\n', '# only a comment\n', '---\n'])
def test_empty_file(tmp_path, content):
    file = write(tmp_path, content)
    err = config_error(file)
    assert err.message == f'{file}: the file is empty; expected a mapping of sections'


def test_binary_file(tmp_path):
    file = write(tmp_path, bytes(range(256)) * 4, name='aircraft.bin')
    err = config_error(file)
    assert err.source == file and 'binary file' in err.message


def test_file_that_is_not_utf8(tmp_path):
    file = write(tmp_path, 'aircraft: caf\u00e9\n'.encode('latin-1'))
    err = config_error(file)
    assert err.source == file and 'not UTF-8' in err.message


def test_file_too_large(tmp_path):
    body = '# padding\n' * (yamlio.MAX_FILE_BYTES // 10 + 1)
    file = write(tmp_path, demo_text() + body)
    err = config_error(file)
    assert err.source == file
    assert f'the limit is {yamlio.MAX_FILE_BYTES} bytes' in err.message


def test_file_just_under_the_limit_is_read(tmp_path):
    text = demo_text()
    pad = yamlio.MAX_FILE_BYTES - len(text.encode('utf-8'))
    file = write(tmp_path, text + '#' * (pad - 1) + '\n')
    assert load_config(file).value('wing.aspect_ratio') == 10.5


def test_missing_file(tmp_path):
    file = str(tmp_path / 'nowhere.yaml')
    err = config_error(file)
    assert err.source == file and 'cannot read the file' in err.message


def test_duplicate_key_names_both_lines(tmp_path):
    text = demo_text()
    first = key_line(text, 'wing', 'loading')
    lines = text.splitlines()
    lines.insert(first + 1, '  loading: 650 kg/m**2')  # after aspect_ratio
    file = write(tmp_path, '\n'.join(lines) + '\n')
    err = config_error(file)
    assert_points_at(err, file, first + 2, 'wing.loading')
    assert f'duplicate key (first given on line {first})' in err.message


def test_duplicate_section(tmp_path):
    text = demo_text() + 'wing:\n  area: 130 m**2\n'
    file = write(tmp_path, text)
    err = config_error(file)
    first = text.splitlines().index('wing:') + 1
    assert_points_at(err, file, len(text.splitlines()) - 1, 'wing')
    assert f'first given on line {first}' in err.message


def billion_laughs(levels=9):
    """Nine levels of ten aliases each: 10**9 nodes once expanded (a few hundred bytes)."""
    rows = ['a0: &a0 [x, x, x, x, x, x, x, x, x, x]']
    for i in range(1, levels + 1):
        rows.append(f'a{i}: &a{i} [' + ', '.join([f'*a{i - 1}'] * 10) + ']')
    return '\n'.join(rows) + '\n'


def test_alias_bomb_is_refused_quickly(tmp_path):
    file = write(tmp_path, billion_laughs())
    start = time.perf_counter()
    err = config_error(file)
    elapsed = time.perf_counter() - start
    assert err.source == file
    assert f'more than {yamlio.MAX_NODES} nodes' in err.message
    # A guard against expanding the 10**9 nodes (hours and gigabytes), not a speed benchmark.
    assert elapsed < 10.0


def test_small_aliases_are_allowed():
    data, _ = yamlio.parse_yaml(billion_laughs(levels=2))
    assert len(data['a2']) == 10 and len(data['a2'][0]) == 10


@pytest.mark.parametrize('text', ['a: &x [1, *x]\n', 'a: &x {b: *x}\n'])
def test_recursive_alias_is_refused(text):
    with pytest.raises(ConfigError, match='recursive alias') as info:
        yamlio.parse_yaml(text, 'loop.yaml')
    assert info.value.line == 1


def test_deep_nesting_is_refused():
    text = 'a: ' + '[' * 5000 + ']' * 5000 + '\n'
    with pytest.raises(ConfigError, match=f'nesting deeper than {yamlio.MAX_DEPTH}'):
        yamlio.parse_yaml(text, 'deep.yaml')
    shallow = 'a: ' + '[' * (yamlio.MAX_DEPTH - 1) + ']' * (yamlio.MAX_DEPTH - 1) + '\n'
    assert 'a' in yamlio.parse_yaml(shallow)[0]


@pytest.mark.parametrize(
    'text, expected',
    [
        (
            'a: !!python/object/apply:os.system [echo]\n',
            "unsupported tag 'tag:yaml.org,2002:python",
        ),
        ('a: !!python/name:os.system\n', 'could not determine a constructor'),
        ('a: !!set {x, y}\n', "unsupported tag 'tag:yaml.org,2002:set'"),
        ('a: !custom {x: 1}\n', "unsupported tag '!custom'"),
        ('a: 1\n---\nb: 2\n', 'expected a single document'),
        ('a: 1\n<<: {b: 2}\n', 'merge keys'),
        ('[1, 2]: 3\n', 'mapping keys must be plain words'),
        ('a: 1' + '0' * 5000 + '\n', 'too many digits'),
    ],
)
def test_hostile_or_unsupported_yaml(text, expected):
    with pytest.raises(ConfigError, match=re.escape(expected)) as info:
        yamlio.parse_yaml(text, 'odd.yaml')
    assert info.value.source == 'odd.yaml'
    assert '\n' not in info.value.message


# --- aft fan and electrical chain come together --------------------------------------------


def test_aft_fan_without_electrical(tmp_path):
    text = drop_section(demo_text(), 'electrical')
    file = write(tmp_path, text)
    err = config_error(file)
    assert_points_at(err, file, text.splitlines().index('aft_fan:') + 1, 'aft_fan')
    assert "missing section 'electrical'" in err.message


def test_electrical_without_aft_fan(tmp_path):
    text = drop_section(demo_text(), 'aft_fan')
    file = write(tmp_path, text)
    err = config_error(file)
    assert_points_at(err, file, text.splitlines().index('electrical:') + 1, 'electrical')
    assert "missing section 'aft_fan'" in err.message


def test_zero_thrust_fraction_is_the_conventional_aircraft():
    config = load_config(TURBO, ['aft_fan.thrust_fraction=0'])
    assert not config.has_aft_fan
    assert not any(
        name.startswith(('aft_', 'cable_', 'motor_', 'generator_'))
        for name in config.model_inputs()
    )


# --- overrides -----------------------------------------------------------------------------


def test_string_overrides_apply_with_units():
    config = load_config(
        TURBO,
        [
            'wing.loading=650 kg/m**2',
            'mission.range = 1200 nmi',
            'turbofans.count=3',
            "aircraft=renamed",
        ],
    )
    assert config.value('wing.loading') == 650.0
    # 1 nmi = 1852 m exactly (NIST SP 811, appendix B.8).
    assert config.value('mission.range') == pytest.approx(1200 * 1852.0, rel=1e-12)
    assert config.value('turbofans.count') == 3
    assert config.name == 'renamed'
    assert config.origins['wing.loading'] == ('--set', None)
    assert config.origins['wing.aspect_ratio'][0] == TURBO


def test_dict_overrides_apply_and_take_sections():
    config = load_config(
        TURBO,
        {
            'wing.loading': 625.0,
            'electrical.motor': {'efficiency': 0.95, 'specific_power': '12 kW/kg'},
        },
    )
    assert config.value('wing.loading') == 625.0
    assert config.value('electrical.motor.efficiency') == 0.95
    assert config.value('electrical.motor.specific_power') == 12000.0


def test_overrides_apply_before_validation(tmp_path):
    text, _ = set_line(demo_text(), 'wing', 'aspect_ratio', 'aspect_ratio: -1')
    file = write(tmp_path, text)
    config_error(file)  # invalid as written ...
    config = load_config(file, ['wing.aspect_ratio=9'])  # ... valid once overridden
    assert config.value('wing.aspect_ratio') == 9.0
    missing = write(tmp_path, drop_line(demo_text(), 'wing', 'loading'), name='missing.yaml')
    assert load_config(missing, {'wing.area': 100}).value('wing.area') == 100.0
    assert load_config(missing, {'wing.loading': 550}).value('wing.loading') == 550.0


def test_override_yaml_values():
    config = load_config(
        TURBO,
        ['solver.tolerance=1e-9', 'electrical.generator={efficiency: 0.9, specific_power: 8e3}'],
    )
    assert config.value('solver.tolerance') == 1e-9
    assert config.value('electrical.generator.efficiency') == 0.9
    assert config.value('electrical.generator.specific_power') == 8000.0


@pytest.mark.parametrize(
    'override, path, expected',
    [
        ('wing.aspect_ratio=-1', 'wing.aspect_ratio', 'got -1; expected a value > 0'),
        ('wing.aera=130', 'wing.aera', "unknown key (did you mean 'area'?)"),
        ('mission.range=1500 kg', 'mission.range', "unit 'kg' cannot be converted to m"),
        ('mission=3', 'mission', 'got 3; expected a mapping'),
        ('mission.cruise_mach=.nan', 'mission.cruise_mach', 'a finite number'),
        ('mission.cruise_mach=', 'mission.cruise_mach', "got ''; expected a number"),
        (
            'electrical.generator={efficiency: 0.9}',
            'electrical.generator.specific_power',
            'missing required key',
        ),
        ('optimisation.objective=mtow', 'optimisation', "did you mean 'optimization'?"),
    ],
)
def test_bad_override_is_reported_as_from_set(override, path, expected):
    err = config_error(TURBO, [override])
    assert_points_at(err, '--set', None, path)
    assert expected in err.message


def test_bad_dict_override_is_reported_as_from_set():
    err = config_error(TURBO, {'wing.oswald_efficiency': 1.5})
    assert_points_at(err, '--set', None, 'wing.oswald_efficiency')


def test_section_created_by_an_override_is_reported_as_from_set():
    err = config_error(CONVENTIONAL, ['aft_fan.thrust_fraction=0.2'])
    assert err.source == '--set' and err.path.startswith('aft_fan.')
    assert 'missing required key' in err.message


@pytest.mark.parametrize(
    'override, expected',
    [
        ('wing.area', 'expected key.path=value'),
        ('=3', 'expected key.path=value'),
        ('wing..area=3', 'expected a dotted key path'),
        ('aircraft.name=x', "'aircraft' is not a section"),
    ],
)
def test_malformed_override(override, expected):
    err = config_error(TURBO, [override])
    assert err.source == '--set' and err.line is None
    assert err.message.startswith('--set: ') and expected in err.message


def test_alias_bomb_in_an_override_is_refused():
    flow = '{' + ', '.join(billion_laughs().splitlines()) + '}'  # the same, in flow style
    err = config_error(TURBO, [f'aircraft={flow}'])
    assert err.source == '--set'
    assert f'more than {yamlio.MAX_NODES} nodes' in err.message


def test_override_errors_keep_their_origin_through_with_overrides():
    config = load_config(TURBO, ['wing.loading=650'])
    err = config_error(config, ['wing.aspect_ratio=-2'])
    assert_points_at(err, '--set', None, 'wing.aspect_ratio')
    again = config.with_overrides(['wing.aspect_ratio=11'])
    assert again.value('wing.loading') == 650.0 and again.value('wing.aspect_ratio') == 11.0
    assert again.origins['wing.loading'] == ('--set', None)


def test_overrides_do_not_change_the_input():
    data = yamlio.read_yaml_file(TURBO)[0]
    before = repr(data)
    load_config(data, {'wing.loading': 650.0, 'solver.max_iterations': 5})
    assert repr(data) == before


def test_file_errors_keep_file_and_line_next_to_overrides(tmp_path):
    text, line = set_line(demo_text(), 'wing', 'oswald_efficiency', 'oswald_efficiency: 2')
    file = write(tmp_path, text)
    err = config_error(file, ['wing.loading=650'])
    assert_points_at(err, file, line, 'wing.oswald_efficiency')


# --- scripting entry points ----------------------------------------------------------------


def test_load_config_from_a_dict_matches_the_file():
    data = yamlio.read_yaml_file(TURBO)[0]
    from_dict, from_file = load_config(data), load_config(TURBO)
    assert from_dict.source == '<dict>'
    assert from_dict.values == from_file.values
    assert from_dict.model_inputs() == from_file.model_inputs()


def test_load_config_from_a_dict_reports_errors():
    data = yamlio.read_yaml_file(TURBO)[0]
    data['wing']['aspect_ratio'] = 'long'
    err = config_error(data)
    assert_points_at(err, '<dict>', None, 'wing.aspect_ratio')


def test_dict_accepts_numpy_scalars():
    data = yamlio.read_yaml_file(CONVENTIONAL)[0]
    data['turbofans']['count'] = np.int64(3)
    data['wing']['aspect_ratio'] = np.float32(9.5)
    config = load_config(data)
    assert config.value('turbofans.count') == 3 and isinstance(config.value('turbofans.count'), int)
    assert config.value('wing.aspect_ratio') == 9.5


def test_load_config_defaults_and_passes_configs_through():
    config = load_config()
    assert config.source == TURBO
    assert load_config(config) is config


def test_parse_yaml_text_names_its_source():
    text, line = set_line(demo_text(), 'wing', 'aspect_ratio', 'aspect_ratio: 0')
    with pytest.raises(ConfigError) as info:
        parse_yaml_text(text, 'pasted')
    assert_points_at(info.value, 'pasted', line, 'wing.aspect_ratio')


def test_without_aft_fan_drops_both_sections():
    design = load_config(TURBO)
    reference = design.without_aft_fan()
    assert design.has_aft_fan and not reference.has_aft_fan
    assert 'aft_fan' not in reference.data and 'electrical' not in reference.data
    assert 'aft_fan' in design.data and 'electrical' in design.data  # original unchanged
    assert not any(path.startswith(('aft_fan.', 'electrical.')) for path in reference.values)
    assert reference.name == f'{design.name} (conventional reference)'
    shared = {
        k: v
        for k, v in design.values.items()
        if not k.startswith(('aft_fan.', 'electrical.')) and k != 'aircraft'
    }
    assert all(reference.values[k] == v for k, v in shared.items())
    assert not reference.model_options()['aft_fan']


def test_without_aft_fan_matches_the_conventional_demo():
    # The two demos describe the same airframe; only the aft-fan sections and the
    # optimisation variables of the aft fan differ.
    reference = load_config(TURBO).without_aft_fan().model_inputs()
    conventional = load_config(CONVENTIONAL).model_inputs()
    assert reference.keys() == conventional.keys()
    for name, (value, units) in conventional.items():
        assert reference[name][1] == units
        assert reference[name][0] == pytest.approx(value, rel=1e-15), name


def test_value_of_an_unknown_path():
    with pytest.raises(ConfigError, match='no such key'):
        load_config(TURBO).value('wing.aera')


def test_model_inputs_are_finite_si_numbers():
    for path in (TURBO, CONVENTIONAL):
        for name, (value, _) in load_config(path).model_inputs().items():
            assert math.isfinite(value), name


@pytest.mark.parametrize(
    'text, expected',
    [
        ('2kW/kg', 2000.0),
        ('2 kW/kg', 2000.0),
        ('1.5e3W/kg', 1500.0),
        ('.5 kW/kg', 500.0),
        ('9000', 9000.0),
    ],
)
def test_the_space_between_number_and_unit_may_be_left_out(text, expected):
    config = load_config(TURBO, {'electrical.motor.specific_power': text})
    assert config.value('electrical.motor.specific_power') == pytest.approx(expected, rel=1e-15)


def test_a_glued_unit_is_still_checked():
    err = config_error(TURBO, {'electrical.motor.specific_power': '2kg'})
    assert "unit 'kg' cannot be converted to W/kg" in err.message


# --- bare numbers: a missing unit -------------------------------------------------------


@pytest.mark.parametrize(
    'section, key, new, path, likely',
    [
        ('mission', 'range', 'range: 1500', 'mission.range', "'1500 nmi'"),
        ('reserves', 'hold_time', 'hold_time: 30', 'reserves.hold_time', "'30 min'"),
        ('fuel', 'heating_value', 'heating_value: 43.1', 'fuel.heating_value', "'43.1 MJ/kg'"),
        (
            'turbofans',
            'core_specific_power',
            'core_specific_power: 11.5',
            'turbofans.core_specific_power',
            "'11.5 kW/kg'",
        ),
    ],
)
def test_a_bare_number_outside_its_plausible_range_is_refused(
    tmp_path, section, key, new, path, likely
):
    text, line = set_line(demo_text(), section, key, new)
    file = write(tmp_path, text)
    err = config_error(file)
    assert_points_at(err, file, line, path)
    assert 'did you forget the unit?' in err.message and likely in err.message
    assert 'with no unit' in err.message


def test_a_bare_number_inside_its_range_and_zero_are_taken_as_si():
    config = load_config(
        TURBO, {'mission.range': 2.778e6, 'reserves.hold_time': 1800, 'reserves.diversion_range': 0}
    )
    assert config.value('mission.range') == 2.778e6
    assert config.value('reserves.hold_time') == 1800.0
    assert config.value('reserves.diversion_range') == 0.0
    # with its unit written, a value is held to the physical check only
    assert load_config(TURBO, {'reserves.hold_time': '1 min'}).value('reserves.hold_time') == 60.0


def test_a_bare_number_is_checked_on_the_command_line_and_in_bounds_and_axes():
    err = config_error(TURBO, ['mission.range=1500'])
    assert err.source == '--set' and 'did you forget the unit?' in err.message
    from voltwake.design.optimization import build_problem
    from voltwake.studies.maps import parse_axis

    data = load_config(TURBO).data
    data['optimization']['design_variables']['electrical.cable.voltage'] = {
        'lower': 0.54,
        'upper': 3,
    }
    with pytest.raises(ConfigError, match='did you forget the unit'):
        build_problem(data)
    with pytest.raises(ConfigError, match='did you forget the unit'):
        parse_axis('electrical.motor.specific_power=2:20:5')
    path, lower, upper, count = parse_axis('electrical.motor.specific_power=2kW/kg:20kW/kg:5')
    assert (lower, upper, count) == (2000.0, 20000.0, 5)


# --- packaged demos by name and the optimisation section's checks ------------------------


def test_demos_load_by_name():
    from voltwake.configuration.loader import demo_names

    assert demo_names() == ['demo_conventional', 'demo_turbo_electric']
    assert load_config('demo_conventional').source == demo_path('conventional')
    assert load_config('demo_turbo_electric').has_aft_fan
    err = config_error('demo_conventinal')
    assert "did you mean 'demo_conventional'?" in err.message
    assert 'demo_turbo_electric' in err.message


def test_a_misspelt_design_variable_gets_its_line_and_a_suggestion(tmp_path):
    lines = demo_text().splitlines()
    index = next(i for i, s in enumerate(lines) if s.strip().startswith('wing.aspect_ratio:'))
    lines[index] = lines[index].replace('wing.aspect_ratio', 'wing.aspect_ratoi')
    file = write(tmp_path, '\n'.join(lines) + '\n')
    from voltwake.design.optimization import build_problem

    with pytest.raises(ConfigError) as info:
        build_problem(file)
    err = info.value
    assert_points_at(err, file, index + 1, 'optimization.design_variables.wing.aspect_ratoi')
    assert "did you mean 'wing.aspect_ratio'?" in err.message


def test_both_demos_optimise():
    from voltwake.design.optimization import optimize

    result = optimize('demo_conventional')
    assert result.success, result.message
    assert set(result.design) == {
        'wing.loading',
        'wing.aspect_ratio',
        'wing.sweep',
        'wing.thickness_to_chord',
        'turbofans.fan_pressure_ratio',
        'turbofans.rated_to_cruise_thrust',
    }
