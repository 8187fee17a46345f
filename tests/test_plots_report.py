"""Tests of the PNG figures (outputs.plots) and the HTML report (outputs.report)."""

import base64
import json
import math
import os
import stat
import struct
import subprocess
import sys
import zlib

import numpy as np
import pytest

from voltwake.errors import ConfigError
from voltwake.outputs import plots, report
from voltwake.outputs.files import current_umask, write_atomic, write_results
from voltwake.outputs.summary import CAUTION

PNG_SIGNATURE = b'\x89PNG\r\n\x1a\n'  # PNG specification (ISO/IEC 15948), section 5.2


def _assert_png(path):
    with open(path, 'rb') as handle:
        data = handle.read()
    assert data[:8] == PNG_SIGNATURE
    assert len(data) > 1024


def _grid(nx=6, ny=5):
    x = np.linspace(0.2, 0.6, nx)
    y = np.linspace(1.0, 3.0, ny)
    gx, gy = np.meshgrid(x, y)
    return x, y, gx, gy


def _chain_outputs():
    # Invented demo values; the delivered power is extraction minus the five losses.
    losses = {
        'generator_loss_kW': 60.0,
        'rectifier_loss_kW': 30.0,
        'cable_loss_kW': 20.0,
        'inverter_loss_kW': 30.0,
        'motor_loss_kW': 50.0,
    }
    return {
        'turbofan_power_extraction_kW': 3000.0,
        'aft_fan_shaft_power_kW': 2810.0,
        'electrical_chain_efficiency': 2810.0 / 3000.0,
        'thermal_load_kW': 190.0,
        **losses,
    }


# ----------------------------------------------------------------------------- plots


@pytest.fixture
def mpl():
    return pytest.importorskip('matplotlib')


def test_fuel_map_with_sign_change_draws_break_even(mpl, tmp_path):
    x, y, gx, gy = _grid()
    change = 10.0 * (gx - 0.4) + 0.5 * (gy - 2.0)  # crosses zero inside the range
    closed = np.ones_like(change, dtype=bool)
    closed[1, 2] = False
    closed[3, 4] = False
    path = plots.plot_fuel_map(
        x,
        y,
        change,
        closed,
        'fan pressure ratio [-]',
        'thrust fraction [-]',
        str(tmp_path / 'fuel_map.png'),
    )
    assert path == str(tmp_path / 'fuel_map.png')
    _assert_png(path)
    assert path.details['break_even_drawn'] is True
    assert path.details['failed_points'] == 2


def test_fuel_map_without_sign_change_has_no_break_even(mpl, tmp_path):
    x, y, gx, gy = _grid()
    change = 1.0 + gx + gy  # positive everywhere
    path = plots.plot_fuel_map(
        x,
        y,
        change,
        np.ones_like(change, dtype=bool),
        'x [m]',
        'y [m]',
        str(tmp_path / 'fuel_map.png'),
    )
    _assert_png(path)
    assert path.details['break_even_drawn'] is False
    assert path.details['failed_points'] == 0
    # Round levels covering the values: 2.2 ... 4.6 in steps of 0.2 (the 1-2-2.5-5 series
    # for about 12 bands: (4.6 - 2.2) / 12 = 0.2; hand value from round_levels' rule).
    levels = path.details['levels']
    assert levels[0] <= change.min() and levels[-1] >= change.max()
    assert np.diff(levels) == pytest.approx(0.2)
    # The colours are centred on zero even when every value is a penalty.
    low, high = path.details['norm_limits']
    assert low == pytest.approx(-high) and high >= change.max()


def test_fuel_map_sign_change_only_at_failed_point_has_no_break_even(mpl, tmp_path):
    x, y, gx, gy = _grid()
    change = 1.0 + gx + gy
    change[2, 3] = -5.0  # the only negative value ...
    closed = np.ones_like(change, dtype=bool)
    closed[2, 3] = False  # ... did not close: masked
    path = plots.plot_fuel_map(
        x, y, change, closed, 'x [m]', 'y [m]', str(tmp_path / 'fuel_map.png')
    )
    assert path.details['break_even_drawn'] is False
    assert path.details['failed_points'] == 1
    assert min(path.details['levels']) > 0.0


def test_fuel_map_all_failed_still_writes(mpl, tmp_path):
    x, y, gx, _ = _grid()
    change = gx - 0.4
    closed = np.zeros_like(change, dtype=bool)
    path = plots.plot_fuel_map(
        x, y, change, closed, 'x [m]', 'y [m]', str(tmp_path / 'fuel_map.png')
    )
    _assert_png(path)
    assert path.details['failed_points'] == change.size
    assert path.details['break_even_drawn'] is False


def test_fuel_map_non_finite_values_count_as_failed(mpl, tmp_path):
    x, y, gx, _ = _grid()
    change = gx - 0.4
    change[0, 0] = np.nan
    path = plots.plot_fuel_map(
        x,
        y,
        change,
        np.ones_like(change, dtype=bool),
        'x [m]',
        'y [m]',
        str(tmp_path / 'fuel_map.png'),
    )
    assert path.details['failed_points'] == 1


def test_fuel_map_rejects_wrong_shapes(mpl, tmp_path):
    x, y, gx, _ = _grid()
    with pytest.raises(ValueError, match='shape'):
        plots.plot_fuel_map(
            x, y, gx.T, np.ones_like(gx.T, dtype=bool), 'x', 'y', str(tmp_path / 'bad.png')
        )
    assert not (tmp_path / 'bad.png').exists()


def test_psc_map(mpl, tmp_path):
    x, y, gx, gy = _grid()
    psc = 0.05 + 0.1 * gx * gy
    closed = np.ones_like(psc, dtype=bool)
    closed[0, -1] = False
    path = plots.plot_psc_map(
        x,
        y,
        psc,
        closed,
        'thrust fraction [-]',
        'fan pressure ratio [-]',
        str(tmp_path / 'psc_map.png'),
    )
    _assert_png(path)
    assert path.details['failed_points'] == 1
    assert 'break_even_drawn' in path.details and not path.details['break_even_drawn']


def test_mass_breakdown_totals(mpl, tmp_path):
    # Invented demo masses; MTOW is the sum of the parts (the model's mass build-up).
    design = {
        'airframe_mass_kg': 30000.0,
        'engines_mass_kg': 7000.0,
        'aft_fan_mass_kg': 800.0,
        'electrical_mass_kg': 1500.0,
        'payload_kg': 15000.0,
        'total_fuel_kg': 12000.0,
    }
    reference = {
        'airframe_mass_kg': 29000.0,
        'engines_mass_kg': 7500.0,
        'payload_kg': 15000.0,
        'total_fuel_kg': 12500.0,
    }  # no aft fan: 0
    path = plots.plot_mass_breakdown(
        {'reference': reference, 'design': design}, str(tmp_path / 'masses.png')
    )
    _assert_png(path)
    # Drawn in the order given: the baseline first.
    assert path.details['totals_kg'] == pytest.approx([64000.0, 66300.0])
    assert path.details['labels'] == ['reference', 'design']
    assert path.details['chain_panel'] is False  # no device masses to split


def test_mass_breakdown_splits_the_chain_by_device(mpl, tmp_path):
    devices = {
        'generator_mass_kg': 175.0,
        'rectifier_mass_kg': 82.0,
        'cable_mass_kg': 283.0,
        'inverter_mass_kg': 81.0,
        'motor_mass_kg': 165.0,
        'thermal_mass_kg': 149.0,
    }
    design = {
        'airframe_mass_kg': 24000.0,
        'engines_mass_kg': 4500.0,
        'aft_fan_mass_kg': 755.0,
        'electrical_mass_kg': sum(devices.values()),
        'payload_kg': 12000.0,
        'total_fuel_kg': 8800.0,
        **devices,
    }
    start = {**design, 'airframe_mass_kg': 24500.0}
    path = plots.plot_mass_breakdown({'start': start, 'optimum': design}, str(tmp_path / 'm.png'))
    _assert_png(path)
    assert path.details['chain_panel'] is True
    assert path.details['labels'] == ['start', 'optimum']
    with pytest.raises(ValueError, match='no designs'):
        plots.plot_mass_breakdown({}, str(tmp_path / 'none.png'))


def test_mass_breakdown_checks_mtow(mpl, tmp_path):
    design = {'airframe_mass_kg': 30000.0, 'payload_kg': 15000.0, 'total_fuel_kg': 12000.0}
    consistent = {**design, 'mtow_kg': 57000.0}
    plots.plot_mass_breakdown({'a': consistent, 'b': consistent}, str(tmp_path / 'ok.png'))
    with pytest.raises(ValueError, match='mtow_kg'):
        plots.plot_mass_breakdown(
            {'a': {**design, 'mtow_kg': 58000.0}, 'b': design}, str(tmp_path / 'bad.png')
        )


def test_power_flow_closed_balance(mpl, tmp_path):
    out = _chain_outputs()
    path = plots.plot_power_flow(out, str(tmp_path / 'power_flow.png'))
    _assert_png(path)
    # Conservation of energy through the chain (common practice): P_k = P_(k-1) - loss_k.
    assert path.details['powers_kW'] == pytest.approx(
        [3000.0, 2940.0, 2910.0, 2890.0, 2860.0, 2810.0], rel=1e-12
    )


def test_power_flow_balance_within_tolerance(mpl, tmp_path):
    out = _chain_outputs()
    out['aft_fan_shaft_power_kW'] *= 1.0 + 1e-8  # well inside 1e-6 of extraction
    plots.plot_power_flow(out, str(tmp_path / 'power_flow.png'))


def test_power_flow_rejects_open_balance(tmp_path):
    # The check runs before any drawing, so this test needs no matplotlib.
    out = _chain_outputs()
    out['motor_loss_kW'] = 51.0  # 1 kW unaccounted for
    with pytest.raises(ValueError, match='does not close'):
        plots.plot_power_flow(out, str(tmp_path / 'power_flow.png'))
    assert not (tmp_path / 'power_flow.png').exists()
    out = _chain_outputs()
    out['aft_fan_shaft_power_kW'] *= 1.0 + 1e-5  # outside 1e-6 of extraction
    with pytest.raises(ValueError, match='does not close'):
        plots.power_chain(out)


def test_power_flow_rejects_missing_and_bad_fields():
    out = _chain_outputs()
    del out['cable_loss_kW']
    with pytest.raises(ValueError, match='cable_loss_kW'):
        plots.power_chain(out)
    out = _chain_outputs()
    out['turbofan_power_extraction_kW'] = 0.0
    with pytest.raises(ValueError, match='extraction'):
        plots.power_chain(out)
    out = _chain_outputs()
    out['cable_loss_kW'], out['motor_loss_kW'] = -10.0, 80.0  # closes, but a loss < 0
    with pytest.raises(ValueError, match='negative'):
        plots.power_chain(out)


def test_history(mpl, tmp_path):
    history = [
        {
            'evaluation': i,
            'objective': 12000.0 - 50.0 * i,
            'max_violation': 10.0 ** (-2 * i),
            'closed': i != 3,
        }
        for i in range(10)
    ]
    history[3]['objective'] = float('nan')
    history[9]['max_violation'] = 0.0  # shown at the floor on a log axis
    path = plots.plot_history(history, str(tmp_path / 'history.png'), 'block fuel [kg]')
    _assert_png(path)
    assert path.details == {'evaluations': 10, 'failed': 1}
    with pytest.raises(ValueError, match='empty'):
        plots.plot_history([], str(tmp_path / 'empty.png'))


def test_histogram_share_below(mpl, tmp_path):
    values = [-2.0, -1.0, -0.5, 1.0, 2.0, float('nan')]
    path = plots.plot_histogram(
        values, str(tmp_path / 'mc.png'), 'fuel-burn change [%]', 'Monte Carlo fuel-burn change'
    )
    _assert_png(path)
    assert path.details['share_below'] == pytest.approx(3.0 / 5.0)  # counted by hand
    assert path.details['samples'] == 5
    assert path.details['dropped'] == 1
    moved = plots.plot_histogram(values, str(tmp_path / 'mc2.png'), 'x [-]', 't', vertical_line=1.5)
    assert moved.details['share_below'] == pytest.approx(4.0 / 5.0)


def test_line(mpl, tmp_path):
    x = np.linspace(0.0, 0.3, 7)
    path = plots.plot_line(
        x,
        {'design': 1.0 - x, 'reference': np.ones_like(x)},
        'thrust fraction [-]',
        'block fuel [t]',
        str(tmp_path / 'sweep.png'),
    )
    _assert_png(path)
    assert path.details['curves'] == ['design', 'reference']
    with pytest.raises(ValueError, match='shape'):
        plots.plot_line(x, {'bad': x[:3]}, 'x', 'y', str(tmp_path / 'bad.png'))


def test_plots_leave_pyplot_state_alone(mpl, tmp_path):
    plt = pytest.importorskip('matplotlib.pyplot')
    backend = mpl.get_backend()
    before = plt.get_fignums()
    plots.plot_line([0.0, 1.0], {'a': [0.0, 1.0]}, 'x', 'y', str(tmp_path / 'a.png'))
    x, y, gx, _ = _grid()
    plots.plot_fuel_map(
        x, y, gx - 0.4, np.ones_like(gx, dtype=bool), 'x', 'y', str(tmp_path / 'b.png')
    )
    assert plt.get_fignums() == before
    assert mpl.get_backend() == backend


def test_missing_matplotlib_is_a_config_error(monkeypatch, tmp_path):
    monkeypatch.setitem(sys.modules, 'matplotlib.backends.backend_agg', None)
    with pytest.raises(ConfigError, match='plots need matplotlib, a dependency') as err:
        plots.plot_line([0.0, 1.0], {'a': [0.0, 1.0]}, 'x', 'y', str(tmp_path / 'a.png'))
    assert err.value.exit_code == 2


def test_round_levels_hand_values():
    # Rule: step = the first of 1, 2, 2.5, 5, 10 times a power of ten at or above
    # (high - low) / 12; levels are whole multiples of it (hand values below).
    assert list(plots.round_levels(2.16, 16.3)) == list(range(2, 20, 2))  # 14.14/12 -> 2
    levels = plots.round_levels(-0.37, 0.52)  # 0.89/12 = 0.074 -> 0.1
    assert levels == pytest.approx(np.round(np.arange(-4, 7) * 0.1, 6))
    assert 0.0 in list(levels)  # zero is a level whenever the range spans it
    assert plots.round_levels(3.0, 3.0)[0] <= 3.0 <= plots.round_levels(3.0, 3.0)[-1]


def test_fuel_map_centred_on_zero_with_round_levels(mpl, tmp_path):
    x, y, gx, gy = _grid(nx=30, ny=20)
    change = 10.0 * (gx - 0.3) + 0.3  # -0.7 ... +3.3: mostly a penalty
    path = plots.plot_fuel_map(
        x, y, change, np.ones_like(change, dtype=bool), 'x [-]', 'y [-]', str(tmp_path / 'f.png')
    )
    low, high = path.details['norm_limits']
    assert low == pytest.approx(-high)  # white is 0 %, whatever the spread
    step = np.diff(path.details['levels'])
    assert step == pytest.approx(0.5)  # 4.0 / 12 = 0.33 -> 0.5
    assert 0.0 in path.details['levels']
    assert path.details['break_even_drawn'] is True


def test_target_map_tells_infeasible_from_not_closed(mpl, tmp_path):
    x, y, gx, gy = _grid()
    change = gx - 0.4
    closed = np.ones_like(change, dtype=bool)
    closed[0, 0] = False  # the design did not close
    feasible = np.ones_like(change, dtype=bool)
    feasible[0, 0] = False
    feasible[2, 2] = False  # closed, but no feasible optimum
    change[2, 2] = np.nan
    path = plots.plot_fuel_map(
        x, y, change, closed, 'x', 'y', str(tmp_path / 't.png'), feasible=feasible
    )
    assert path.details['not_closed'] == 1
    assert path.details['infeasible'] == 1
    assert path.details['failed_points'] == 2


def test_point_status_of_study_rows():
    assert plots.point_status({'closed': True}) == plots.OK
    assert plots.point_status({'closed': 'False'}) == plots.NOT_CLOSED  # from a CSV file
    assert plots.point_status({'success': True, 'evaluations': 9}) == plots.OK
    assert plots.point_status({'success': False, 'evaluations': 14.0}) == plots.INFEASIBLE
    assert plots.point_status({'success': 'False', 'evaluations': 0}) == plots.NOT_CLOSED


def test_line_marks_failed_points_never_drops_them(mpl, tmp_path):
    x = np.array([0.1, 0.2, 0.3, 0.4])
    change = np.array([1.0, np.nan, -0.5, np.nan])
    status = [plots.OK, plots.INFEASIBLE, plots.OK, plots.NOT_CLOSED]
    path = plots.plot_line(
        x,
        {'change': change},
        'thrust fraction [-]',
        'fuel-burn change [%]',
        str(tmp_path / 'l.png'),
        status=status,
        zero_line='break-even (0 %)',
        vertical=(0.25, 'break-even'),
    )
    _assert_png(path)
    assert path.details['infeasible'] == 1 and path.details['not_closed'] == 1
    # Without a status a non-finite value is a point that did not close.
    plain = plots.plot_line(x, {'c': change}, 'x [-]', 'y [%]', str(tmp_path / 'p.png'))
    assert plain.details['not_closed'] == 2
    with pytest.raises(ValueError, match='status'):
        plots.plot_line(x, {'c': change}, 'x', 'y', str(tmp_path / 'b.png'), status=['ok'])


def test_histogram_counts_samples_that_did_not_close(mpl, tmp_path):
    values = [-1.0, 2.0, 3.0, 0.5]
    closed = [True, True, False, True]
    path = plots.plot_histogram(values, str(tmp_path / 'h.png'), 'x [%]', 't', closed=closed)
    assert path.details['samples'] == 3 and path.details['dropped'] == 1
    assert path.details['share_below'] == pytest.approx(1.0 / 3.0)  # counted by hand


def test_plots_follow_the_umask(mpl, tmp_path):
    old = os.umask(0o027)
    try:
        path = plots.plot_line([0.0, 1.0], {'a': [0.0, 1.0]}, 'x', 'y', str(tmp_path / 'a.png'))
    finally:
        os.umask(old)
    assert stat.S_IMODE(os.stat(path).st_mode) == 0o640


# ---------------------------------------------------------------------------- report


def _tiny_png(red, green, blue):
    """A valid 1 x 1 RGB PNG (PNG specification, ISO/IEC 15948, sections 5 and 11)."""

    def chunk(kind, data):
        return (
            struct.pack('>I', len(data))
            + kind
            + data
            + struct.pack('>I', zlib.crc32(kind + data) & 0xFFFFFFFF)
        )

    header = struct.pack('>IIBBBBB', 1, 1, 8, 2, 0, 0, 0)
    pixels = zlib.compress(bytes([0, red, green, blue]))
    return PNG_SIGNATURE + chunk(b'IHDR', header) + chunk(b'IDAT', pixels) + chunk(b'IEND', b'')


def _read(path):
    with open(path, encoding='utf-8') as handle:
        return handle.read()


#: Invented demo configuration (only what the report reads).
CONFIG = {
    'aircraft': 'Demo <b>TE</b>',
    'mission': {'range': '1500 nmi', 'payload': '12000 kg'},
    'economic_mission': {'range': '600 nmi', 'payload': '10200 kg'},
    'optimization': {
        'objective': 'block_fuel',
        'design_variables': {
            'wing.loading': {'lower': '450 kg/m**2', 'upper': '750 kg/m**2'},
            'aft_fan.fan_pressure_ratio': {'lower': 1.15, 'upper': 1.6},
        },
        'optimizer': {'method': 'SLSQP'},
    },
}


def _outputs(block_fuel, aft=True):
    """Invented demo result fields; a conventional design stores its aft-fan fields as 0/1."""
    out = {
        'airframe_mass_kg': 24000.0,
        'engines_mass_kg': 4500.0,
        'aft_fan_mass_kg': 750.0 if aft else 0.0,
        'electrical_mass_kg': 900.0 if aft else 0.0,
        'payload_kg': 12000.0,
        'total_fuel_kg': block_fuel + 2500.0,
        'block_fuel_kg': block_fuel,
        'economic_block_fuel_kg': 0.5 * block_fuel,
        'oew_kg': 24000.0 + 4500.0 + (1650.0 if aft else 0.0),
        'wing_area_m2': 80.0,
        'cruise_lift_to_drag': 18.0,
        'aft_thrust_fraction': 0.2 if aft else 0.0,
        'electrical_chain_efficiency': 0.91 if aft else 1.0,
        'capture_height_m': 0.2 if aft else 0.0,
        'aft_fan_hub_to_tip_margin': 0.0,
        'buffet_margin': 0.05,
    }
    out['mtow_kg'] = out['oew_kg'] + out['payload_kg'] + out['total_fuel_kg']
    return out


def _optimisation_dir(tmp_path, rows=3, reference=True):
    folder = tmp_path / 'opt'
    folder.mkdir()
    (folder / 'mass_breakdown.png').write_bytes(_tiny_png(255, 0, 0))
    (folder / 'power-flow.png').write_bytes(_tiny_png(0, 0, 255))
    results = {
        'status': 'complete',
        'success': True,
        'message': 'Optimization terminated successfully',
        'objective': 'block_fuel',
        'evaluations': rows,
        'failed_points': 0,
        'inputs': CONFIG,
        'design': {
            'aft_fan.fan_pressure_ratio': {
                'value': 1.15,
                'lower': 1.15,
                'upper': 1.6,
                'units': None,
                'active': True,
            },
            'wing.loading': {
                'value': 658.5,
                'lower': 450.0,
                'upper': 750.0,
                'units': 'kg/m**2',
                'active': False,
            },
        },
        'constraints': {
            'wingspan': {
                'value': 36.0,
                'lower': None,
                'upper': 36.0,
                'equals': None,
                'units': 'm',
                'active': True,
                'violation': 0.0,
            },
            'approach_speed': {
                'value': 70.0,
                'lower': None,
                'upper': 72.0222,
                'equals': None,
                'units': 'm/s',
                'active': False,
                'violation': 0.0,
            },
            'cable_voltage_margin': {
                'value': 2.2e-16,
                'lower': 0.0,
                'upper': None,
                'equals': None,
                'units': None,
                'active': True,
                'violation': 0.0,
            },
        },
        'start': _outputs(7065.0),
        'outputs': _outputs(6313.0),
        'history': [
            {
                'evaluation': i + 1,
                'objective': 7065.0 - i,
                'max_violation': 0.0,
                'closed': True,
                'design': {'aft_fan.fan_pressure_ratio': 1.3, 'wing.loading': 600.0 + i + 0.5},
            }
            for i in range(rows)
        ],
    }
    (folder / 'results.json').write_text(json.dumps(results, sort_keys=True))
    if reference:
        ref = {
            'status': 'complete',
            'role': 'optimised conventional reference',
            'success': True,
            'message': 'Optimization terminated successfully',
            'evaluations': 20,
            'outputs': _outputs(6062.0, aft=False),
        }
        (folder / 'reference_results.json').write_text(json.dumps(ref, sort_keys=True))
    return folder


def _cells(text, label):
    """Return the cell texts of the table row whose first cell is ``label``."""
    import re

    match = re.search(rf'<tr[^>]*><td>{re.escape(label)}</td>(.*?)</tr>', text)
    assert match, label
    return re.findall(r'<td[^>]*>(.*?)</td>', match.group(1))


def test_report_opens_with_the_verdict(tmp_path):
    text = _read(report.write_report(str(_optimisation_dir(tmp_path))))
    verdict = text.index('id="verdict"')
    # The verdict and the headline table come before every table of detail and figure.
    assert verdict < text.index('<figure>') and verdict < text.index('class="compare"')
    # 100 (6313 - 6062) / 6062 = +4.14 % (hand value)
    assert 'burns 4.14 % more fuel</span> than the optimised reference' in text
    assert text.count('<table class="headline">') == 1
    assert 'block fuel of the design mission (1500 nmi, 12000 kg payload)' in text
    assert 'held by 2 active constraints and 1 bound' in text  # the headline line
    assert text.count(CAUTION) == 2
    assert text.index(CAUTION) < verdict  # at the top ...
    assert text.rindex(CAUTION) > text.rindex('<figure>')  # ... and at the bottom


def test_report_puts_the_design_beside_its_reference(tmp_path):
    text = _read(report.write_report(str(_optimisation_dir(tmp_path))))
    header = 'start</th><th>optimum</th><th>optimised reference</th>'
    assert header in text  # start before optimum, then the reference
    # MTOW = OEW + payload + fuel (hand values): start 30150 + 12000 + 9565 = 51715 kg,
    # optimum 30150 + 12000 + 8813 = 50963 kg, reference 28500 + 12000 + 8562 = 49062 kg;
    # -752 / 51715 = -1.45 % and 1901 / 49062 = +3.87 %.
    assert _cells(text, 'MTOW')[:6] == ['kg', '51,715', '50,963', '49,062', '-1.45 %', '+3.87 %']
    # What the conventional reference has not is a dash, never its stored 0 or 1.
    assert _cells(text, 'Chain efficiency')[3] == report.NONE
    assert _cells(text, 'Aft fan')[3] == report.NONE
    assert _cells(text, 'Capture height')[3] == report.NONE
    for group in ('Masses', 'Fuel', 'Aerodynamics (cruise)', 'Propulsion', 'Electrical chain'):
        assert f'>{group}</th></tr>' in text
    assert '<tr class="key"><td>Block fuel, design mission</td>' in text  # the verdict's fuel


def test_report_says_what_holds_the_optimum(tmp_path):
    text = _read(report.write_report(str(_optimisation_dir(tmp_path))))
    assert 'at its lower bound: the optimiser would take it lower if it could' in text
    assert 'the span limit (36 m)' in text
    assert 'the partial-discharge limit of the bus voltage' in text
    assert '2.2e-16' not in text and '2.22e-16' not in text  # shown as 0 at the limit
    assert '140 kn' in text  # an approach-speed limit in m/s is shown in knots
    assert 'free: set by the objective' in text


def test_report_without_a_reference_compares_with_the_start(tmp_path):
    text = _read(report.write_report(str(_optimisation_dir(tmp_path, reference=False))))
    # 100 (6313 - 7065) / 7065 = -10.64 % (hand value)
    assert 'burns 10.64 % less fuel</span> than its start' in text
    assert 'no optimised reference in this directory' in text


def test_report_is_self_contained_and_prints(tmp_path):
    folder = _optimisation_dir(tmp_path)
    text = _read(report.write_report(str(folder)))
    for name in ('mass_breakdown.png', 'power-flow.png'):
        data = base64.b64encode((folder / name).read_bytes()).decode('ascii')
        assert f'src="data:image/png;base64,{data}"' in text
    assert report.CAPTIONS['mass_breakdown.png'] in text  # a caption saying what to read
    assert 'alt="power flow"' in text  # a figure the report does not know: named by its file
    assert '<script' not in text.lower()
    assert 'http://' not in text and 'https://' not in text and '@import' not in text
    assert text.count('src="') == text.count('src="data:image/png;base64,')
    assert '@media print' in text and 'class="scroll"' in text
    assert '<details><summary>The configuration used' in text


def test_report_escapes_text(tmp_path):
    text = _read(report.write_report(str(_optimisation_dir(tmp_path))))
    assert '<b>TE</b>' not in text
    assert 'Demo &lt;b&gt;TE&lt;/b&gt;' in text


def test_report_truncates_long_tables(tmp_path):
    text = _read(report.write_report(str(_optimisation_dir(tmp_path, rows=250))))
    assert '>799.5</td>' in text  # wing loading of evaluation 200: 600 + 199.5
    assert '>800.5</td>' not in text
    assert f'First {report.MAX_ROWS} of 250 rows shown' in text


def test_report_is_deterministic_and_written_where_asked(tmp_path):
    folder = _optimisation_dir(tmp_path)
    first = report.write_report(str(folder), str(tmp_path / 'a.html'))
    second = report.write_report(str(folder), str(tmp_path / 'b.html'))
    assert first == str(tmp_path / 'a.html')
    assert _read(first) == _read(second)
    assert not (folder / 'report.html').exists()


def _write_study(folder, name, summary, rows):
    from voltwake.studies.maps import points_csv

    (folder / f'{name}_summary.json').write_text(json.dumps(summary, sort_keys=True))
    if rows:
        (folder / f'{name}_points.csv').write_text(points_csv(rows))


def test_report_of_a_map_and_a_monte_carlo(tmp_path):
    folder = tmp_path / 'sweep'
    folder.mkdir()
    changes = [-1.0, 0.5, -2.0, 1.0, float('nan'), 3.0]
    rows = [
        {
            'aft_fan.thrust_fraction': 0.1 + 0.1 * (i // 3),
            'electrical.motor.specific_power': 5000.0 * (1 + i % 3),
            'closed': not math.isnan(c),
            'reason': '' if not math.isnan(c) else 'mass balance ran away',
            'block_fuel_kg': 6000.0 * (1 + c / 100.0),
            'fuel_burn_change_percent': c,
        }
        for i, c in enumerate(changes)
    ]
    summary = {
        'status': 'complete',
        'kind': 'map',
        'axes': {
            'aft_fan.thrust_fraction': [0.1, 0.2],
            'electrical.motor.specific_power': [5000.0, 10000.0, 15000.0],
        },
        'fuel_burn_measured_on': 'block_fuel_kg',
        'reference': _outputs(6000.0, aft=False),
        'points_count': 6,
        'recovered': 0,
        'config': CONFIG,
    }
    _write_study(folder, 'map', summary, rows)
    mc_rows = [{**r, 'closed': True} for r in rows[:4]]
    mc = {
        'status': 'complete',
        'kind': 'montecarlo',
        'samples': 4,
        'seed': 7,
        'distributions': {'electrical.motor.specific_power': {'uniform': ['5 kW/kg', '20 kW/kg']}},
        'fuel_burn_change_percent': {'mean': -0.375, 'p05': -1.9, 'p50': -0.25, 'p95': 0.9},
        'probability_of_win': 0.5,
        'fuel_burn_measured_on': 'block_fuel_kg',
        'config': CONFIG,
    }
    _write_study(folder, 'montecarlo', mc, mc_rows)
    text = _read(report.write_report(str(folder)))
    # Share of the map where the design wins, from the CSV: 2 of the 5 points with a result
    # (counted by hand) = 40 %.
    assert 'wins at 40 % of the map</span> (2 of 5 points with a result' in text
    assert '1 of 6 points did not close' in text
    assert 'probability of a win 50 %' in text
    assert 'uniform: 5 kW/kg to 20 kW/kg' in text and '>7</td>' in text  # inputs: seed
    # Axes as lo-hi with a count, not a list of every value.
    assert 'motor specific power</td><td>5–15 kW/kg (3 values)</td>' in text
    headline = text[text.index('<table class="headline">') :]
    headline = headline[: headline.index('</table>')]
    assert headline.count('<tr>') == 3  # the header and one line per study


def test_report_of_a_target_sweep_tells_failures_apart(tmp_path):
    folder = tmp_path / 'targets'
    folder.mkdir()
    base = {
        'block_fuel_kg': 6000.0,
        'total_fuel_kg': 8500.0,
        'mtow_kg': 50000.0,
        'oew_kg': 29500.0,
        'engines_mass_kg': 4500.0,
        'aft_fan_mass_kg': 700.0,
        'electrical_mass_kg': 900.0,
        'power_saving_coefficient': 0.17,
    }
    nan = float('nan')
    rows = [
        {
            'target:aft_fan.thrust_fraction': 0.1,
            'success': True,
            'message': 'Optimization terminated successfully',
            **base,
            'dv:wing.loading': 450.0,
            'active_constraints': ['wingspan', 'bound:wing.loading'],
            'evaluations': 20,
            'fuel_burn_change_percent': -0.5,
            'fuel_burn_measured_on': 'block_fuel_kg',
        },
        {
            'target:aft_fan.thrust_fraction': 0.2,
            'success': False,
            'message': 'Positive directional derivative for linesearch',
            **{k: nan for k in base},
            'dv:wing.loading': nan,
            'active_constraints': [],
            'evaluations': 14,
            'fuel_burn_change_percent': nan,
            'fuel_burn_measured_on': 'block_fuel_kg',
        },
        {
            'target:aft_fan.thrust_fraction': 0.3,
            'success': False,
            'message': 'NotClosedError: the weight grows without bound',
            **{k: nan for k in base},
            'dv:wing.loading': nan,
            'active_constraints': [],
            'evaluations': 0,
            'fuel_burn_change_percent': nan,
            'fuel_burn_measured_on': 'block_fuel_kg',
        },
    ]
    summary = {
        'status': 'complete',
        'kind': 'targets',
        'targets': ['aft_fan.thrust_fraction'],
        'target_axes': {'aft_fan.thrust_fraction': [0.1, 0.2, 0.3]},
        'reference': {'success': True, 'outputs': _outputs(6030.0, aft=False)},
        'references': [{}],
        'config': CONFIG,
    }
    _write_study(folder, 'targets', summary, rows)
    text = _read(report.write_report(str(folder)))
    assert '1 closed without a feasible optimum, 1 did not close' in text
    assert '<td>closed, no feasible optimum</td>' in text and '<td>did not close</td>' in text
    assert 'the span limit, wing loading at its lower bound' in text
    assert 'NotClosedError: the weight grows without bound' in text


def test_report_of_a_break_even(tmp_path):
    folder = tmp_path / 'be'
    folder.mkdir()
    summary = {
        'status': 'complete',
        'kind': 'breakeven',
        'found': True,
        'path': 'electrical.motor.specific_power',
        'units': 'W/kg',
        'value': 12345.0,
        'lower': 2000.0,
        'upper': 20000.0,
        'difference_at_lower': 3.0,
        'difference_at_upper': -1.0,
        'evaluations': [
            {'value': 2000.0, 'difference': 3.0, 'block_fuel_kg': 6200.0},
            {'value': 20000.0, 'difference': -1.0, 'block_fuel_kg': 5990.0},
        ],
        'design_at_value': {
            'success': True,
            'message': 'ok',
            'design': {'wing.loading': 750.0},
            'active': ['takeoff_field_length', 'bound:wing.loading'],
        },
        'fuel_burn_measured_on': 'block_fuel_kg',
        'config': CONFIG,
    }
    _write_study(folder, 'breakeven', summary, [])
    text = _read(report.write_report(str(folder)))
    assert 'break-even motor specific power <b>12.35 kW/kg</b>' in text
    assert 'the take-off field length limit, wing loading at its upper bound' in text
    summary.update(found=False, value=None, difference_at_upper=1.0, design_at_value=None)
    _write_study(folder, 'breakeven', summary, [])
    text = _read(report.write_report(str(folder)))
    assert 'no break-even in 2–20 kW/kg' in text
    assert '+3.00 %</span> at 2 kW/kg' in text and '+1.00 %</span> at 20 kW/kg' in text


def test_a_study_without_matplotlib_says_why_it_has_no_figures(monkeypatch, tmp_path, capsys):
    from voltwake.studies import runner as sweep

    monkeypatch.setitem(sys.modules, 'matplotlib.backends.backend_agg', None)
    result = {
        'kind': 'montecarlo',
        'points': [{'closed': True, 'fuel_burn_change_percent': 1.0}],
        'fuel_burn_measured_on': 'block_fuel_kg',
    }
    assert sweep._plots('montecarlo', result, str(tmp_path)) == []
    assert 'plots need matplotlib' in result['figures_note']
    assert 'no figures drawn' in capsys.readouterr().err
    assert list(tmp_path.iterdir()) == []


def test_report_keeps_unknown_results_as_tables(tmp_path):
    folder = tmp_path / 'other'
    folder.mkdir()
    (folder / 'notes.json').write_text(json.dumps({'a': {'b': 1.5}, 'rows': [{'x': 1}]}))
    text = _read(report.write_report(str(folder)))
    assert 'Other results: notes.json' in text and '<td>a.b</td>' in text


def test_report_errors(tmp_path):
    with pytest.raises(ConfigError, match='does not exist') as err:
        report.write_report(str(tmp_path / 'missing'))
    assert err.value.exit_code == 2
    empty = tmp_path / 'empty'
    empty.mkdir()
    (empty / 'notes.txt').write_text('nothing here')
    with pytest.raises(ConfigError, match='no results'):
        report.write_report(str(empty))
    broken = tmp_path / 'broken'
    broken.mkdir()
    (broken / 'results.json').write_text('{"status": ')
    with pytest.raises(ConfigError, match='JSON'):
        report.write_report(str(broken))
    assert not (broken / 'report.html').exists()
    with pytest.raises(ConfigError, match='directory of the report'):
        report.write_report(str(_optimisation_dir(tmp_path)), str(tmp_path / 'no' / 'r.html'))


def test_report_works_without_matplotlib(tmp_path):
    folder = _optimisation_dir(tmp_path)
    code = (
        'import sys; sys.modules["matplotlib"] = None; '  # any import of it now fails
        'import voltwake.outputs.report as r; print(r.write_report(sys.argv[1]))'
    )
    done = subprocess.run(
        [sys.executable, '-c', code, str(folder)], capture_output=True, text=True, check=True
    )
    assert done.stdout.strip() == os.path.join(str(folder), 'report.html')
    assert (folder / 'report.html').stat().st_size > 1024


@pytest.mark.parametrize('mask, mode', [(0o022, 0o644), (0o027, 0o640), (0o002, 0o664)])
def test_result_files_follow_the_umask(tmp_path, mask, mode):
    # Files are written as any other file the user writes: 0o666 & ~umask (POSIX open()).
    folder = _optimisation_dir(tmp_path)
    old = os.umask(mask)
    try:
        write_atomic(str(tmp_path / 'points.csv'), 'a,b\n1,2\n')
        write_results(str(tmp_path), 'summary', {'a': 1})
        html_path = report.write_report(str(folder))
    finally:
        os.umask(old)
    for path in ('points.csv', 'summary.json', 'summary.yaml'):
        assert stat.S_IMODE(os.stat(tmp_path / path).st_mode) == mode, path
    assert stat.S_IMODE(os.stat(html_path).st_mode) == mode
    assert current_umask() == old  # read, not changed


def test_mass_breakdown_splits_a_built_up_airframe(mpl, tmp_path):
    # With the build-up, the bar shows wing, fuselage, tails, gear and systems instead of one
    # airframe block; the parts must still add up to MTOW (bookkeeping check).
    items = {
        'wing_mass_kg': 4000.0,
        'fuselage_mass_kg': 5500.0,
        'horizontal_tail_mass_kg': 270.0,
        'vertical_tail_mass_kg': 400.0,
        'landing_gear_mass_kg': 2100.0,
        'systems_mass_kg': 12000.0,
    }
    design = {
        **items,
        'airframe_mass_kg': sum(items.values()),
        'engines_mass_kg': 4700.0,
        'payload_kg': 12000.0,
        'total_fuel_kg': 10500.0,
    }
    design['mtow_kg'] = sum(v for k, v in design.items() if k != 'airframe_mass_kg')
    parts = plots._mass_parts(design, 'design')
    assert len(parts) == 10 and parts[2] == 670.0  # the two tails together
    assert sum(parts) == pytest.approx(design['mtow_kg'], rel=1e-12)
    plot = plots.plot_mass_breakdown({'a': design, 'b': design}, str(tmp_path / 'mass.png'))
    assert plot.details['totals_kg'][0] == pytest.approx(design['mtow_kg'], rel=1e-12)
    with pytest.raises(ValueError, match='add up'):
        plots._mass_parts({**design, 'mtow_kg': design['mtow_kg'] + 100.0}, 'design')
