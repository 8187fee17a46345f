"""Tests of the PNG figures (voltwake.plots) and the HTML report (voltwake.report)."""

import base64
import json
import os
import struct
import subprocess
import sys
import zlib

import numpy as np
import pytest

from voltwake import plots, report
from voltwake.errors import ConfigError
from voltwake.summary import CAUTION

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
    assert min(path.details['levels']) == pytest.approx(change.min())
    assert max(path.details['levels']) == pytest.approx(change.max())


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
    path = plots.plot_mass_breakdown(design, reference, str(tmp_path / 'masses.png'))
    _assert_png(path)
    assert path.details['totals_kg'] == pytest.approx([66300.0, 64000.0])


def test_mass_breakdown_checks_mtow(mpl, tmp_path):
    design = {'airframe_mass_kg': 30000.0, 'payload_kg': 15000.0, 'total_fuel_kg': 12000.0}
    consistent = {**design, 'mtow_kg': 57000.0}
    plots.plot_mass_breakdown(consistent, consistent, str(tmp_path / 'ok.png'))
    with pytest.raises(ValueError, match='mtow_kg'):
        plots.plot_mass_breakdown({**design, 'mtow_kg': 58000.0}, design, str(tmp_path / 'bad.png'))


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
    with pytest.raises(ConfigError, match=r"pip install 'voltwake\[plot\]'") as err:
        plots.plot_line([0.0, 1.0], {'a': [0.0, 1.0]}, 'x', 'y', str(tmp_path / 'a.png'))
    assert err.value.exit_code == 2


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


def _results_dir(tmp_path):
    folder = tmp_path / 'run'
    folder.mkdir()
    (folder / 'fuel_map.png').write_bytes(_tiny_png(255, 0, 0))
    (folder / 'power-flow.png').write_bytes(_tiny_png(0, 0, 255))
    results = {
        'status': 'complete',
        'success': True,
        'message': 'Optimization terminated',
        'inputs': {
            'name': '<script>alert(1)</script>',
            'mission': {'range_m': 5.0e6, 'payload_kg': 15000.0},
        },
        'design': {
            'aft_fan.thrust_fraction': {
                'value': 0.25,
                'lower': 0.0,
                'upper': 0.25,
                'units': None,
                'active': True,
            },
            'turbofan.fan_pressure_ratio': {
                'value': 1.48,
                'lower': 1.3,
                'upper': 1.7,
                'units': None,
                'active': False,
            },
        },
        'constraints': {
            'takeoff_field_length': {
                'value': 2500.0,
                'lower': None,
                'upper': 2500.0,
                'equals': None,
                'units': 'm',
                'active': True,
                'violation': 0.0,
            },
            'span': {
                'value': 34.0,
                'lower': None,
                'upper': 36.0,
                'equals': None,
                'units': 'm',
                'active': False,
                'violation': 0.0,
            },
        },
        'outputs': {'block_fuel_kg': 11234.5, 'mtow_kg': 70123.0},
        'history': [
            {
                'evaluation': i,
                'objective': 12000.0 - i,
                'max_violation': 0.0,
                'closed': True,
                'design': {'aft_fan.thrust_fraction': 0.2},
            }
            for i in range(3)
        ],
        'points': [{'x': k + 0.5} for k in range(250)],
    }
    (folder / 'results.json').write_text(json.dumps(results, sort_keys=True))
    return folder


def test_report_embeds_images_and_tables(tmp_path):
    folder = _results_dir(tmp_path)
    out = report.write_report(str(folder))
    assert out == os.path.join(str(folder), 'report.html')
    text = _read(out)
    for name in ('fuel_map.png', 'power-flow.png'):
        data = base64.b64encode((folder / name).read_bytes()).decode('ascii')
        assert f'src="data:image/png;base64,{data}"' in text
    assert '<figcaption>fuel map</figcaption>' in text
    assert '<figcaption>power flow</figcaption>' in text
    assert text.count(CAUTION) == 2
    assert text.index(CAUTION) < text.index('<h2>')  # at the top ...
    assert text.rindex(CAUTION) > text.rindex('<figure>')  # ... and at the bottom
    assert text.count('class="active-mark"') == 2  # one bound, one constraint
    assert 'Active constraints: takeoff_field_length</p>' in text
    assert 'mission.range_m' in text and '5e+06' in text
    assert 'outputs.block_fuel_kg' in text
    assert 'design.aft_fan.thrust_fraction' in text  # history column, flattened
    assert 'http://' not in text and 'https://' not in text  # no network needed


def test_report_escapes_text(tmp_path):
    text = _read(report.write_report(str(_results_dir(tmp_path))))
    assert '<script>' not in text
    assert '&lt;script&gt;alert(1)&lt;/script&gt;' in text


def test_report_truncates_long_tables(tmp_path):
    text = _read(report.write_report(str(_results_dir(tmp_path))))
    assert '<td class="num">199.5</td>' in text
    assert '<td class="num">200.5</td>' not in text
    assert f'First {report.MAX_ROWS} of 250 rows shown' in text


def test_report_is_deterministic_and_written_where_asked(tmp_path):
    folder = _results_dir(tmp_path)
    first = report.write_report(str(folder), str(tmp_path / 'a.html'))
    second = report.write_report(str(folder), str(tmp_path / 'b.html'))
    assert first == str(tmp_path / 'a.html')
    assert _read(first) == _read(second)
    assert not (folder / 'report.html').exists()


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
        report.write_report(str(_results_dir(tmp_path)), str(tmp_path / 'no' / 'r.html'))


def test_report_works_without_matplotlib(tmp_path):
    folder = _results_dir(tmp_path)
    code = (
        'import sys; sys.modules["matplotlib"] = None; '  # any import of it now fails
        'import voltwake.report as r; print(r.write_report(sys.argv[1]))'
    )
    done = subprocess.run(
        [sys.executable, '-c', code, str(folder)], capture_output=True, text=True, check=True
    )
    assert done.stdout.strip() == os.path.join(str(folder), 'report.html')
    assert (folder / 'report.html').stat().st_size > 1024


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
    plot = plots.plot_mass_breakdown(design, design, str(tmp_path / 'mass.png'))
    assert plot.details['totals_kg'][0] == pytest.approx(design['mtow_kg'], rel=1e-12)
    with pytest.raises(ValueError, match='add up'):
        plots._mass_parts({**design, 'mtow_kg': design['mtow_kg'] + 100.0}, 'design')
