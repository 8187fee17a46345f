"""Run the scripts in examples/ as a user would and check what they print and write."""

import importlib.util
import os
import subprocess
import sys
from pathlib import Path

import numpy as np
import openmdao.api as om
import pytest

from voltwake.configuration.loader import load_config
from voltwake.studies.breakeven import default_technology_paths

REPO = Path(__file__).resolve().parents[1]
HAS_MATPLOTLIB = importlib.util.find_spec('matplotlib') is not None


def run_example(name, outdir, extra_env=None):
    """Run ``examples/<name>`` with OUTDIR ``outdir`` from the repo root; return the process."""
    env = dict(os.environ, OPENMDAO_REPORTS='0', **(extra_env or {}))
    return subprocess.run(
        [sys.executable, str(REPO / 'examples' / name), str(outdir)],
        check=False,
        cwd=REPO,
        env=env,
        capture_output=True,
        text=True,
        timeout=600,
    )


def table_rows(stdout):
    """Return the numeric rows (lists of floats) of a printed table."""
    rows = []
    for line in stdout.splitlines():
        try:
            rows.append([float(tok) for tok in line.split()])
        except ValueError:
            continue
    return [row for row in rows if row]


def test_optimize_and_read_recorder(tmp_path):
    proc = run_example('optimize_and_read_recorder.py', tmp_path)
    assert proc.returncode == 0, proc.stderr
    out = proc.stdout
    assert 'success: True' in out
    # Every design variable of the demo's optimization section is reported.
    design = [
        line.split()[0]
        for line in out.split('optimum design:\n')[1].split('block fuel:')[0].splitlines()
    ]
    assert design == list(load_config(None).values['optimization.design_variables'])
    assert 'at the optimum' in out

    case_file = tmp_path / 'optimization_cases.sql'
    assert case_file.is_file()
    cases = om.CaseReader(str(case_file)).list_cases('driver', recurse=False, out_stream=None)
    assert len(cases) >= 1
    assert f'driver cases: {len(cases)}' in out
    # One printed objective line per recorded driver case, finite and positive.
    history = [line.split() for line in out.splitlines() if line.startswith('rank0:')]
    assert [h[0] for h in history] == cases
    assert all(np.isfinite(float(h[1])) and float(h[1]) > 0 for h in history)


def check_sweep_table(stdout):
    """Check the eight rows of the thrust-fraction table."""
    rows = np.array(table_rows(stdout))
    assert rows.shape == (8, 4)
    assert np.allclose(rows[:, 0], np.linspace(0.05, 0.40, 8))
    assert np.all((rows[:, 1] > 0) & (rows[:, 1] < 1))  # a power saving coefficient
    # Electrical machines are sized by the power they carry (mass = power / specific
    # power, common practice), so more aft-fan thrust means a heavier electrical system.
    assert np.all(np.diff(rows[:, 3]) > 0)


def test_sweep_thrust_fraction(tmp_path):
    proc = run_example('sweep_thrust_fraction.py', tmp_path)
    assert proc.returncode == 0, proc.stderr
    check_sweep_table(proc.stdout)
    plot = tmp_path / 'thrust_fraction_sweep.png'
    if HAS_MATPLOTLIB:
        assert plot.is_file()
        assert plot.read_bytes()[:8] == b'\x89PNG\r\n\x1a\n'  # PNG signature
        assert f'plot: {plot}' in proc.stdout
    else:
        assert 'plot skipped' in proc.stdout
        assert not plot.exists()


def test_sweep_thrust_fraction_without_matplotlib(tmp_path):
    # A package named matplotlib that fails to import hides any installed one.
    blocker = tmp_path / 'block' / 'matplotlib'
    blocker.mkdir(parents=True)
    (blocker / '__init__.py').write_text("raise ImportError('hidden for this test')\n")
    path = os.pathsep.join(p for p in (str(blocker.parent), os.environ.get('PYTHONPATH')) if p)
    outdir = tmp_path / 'out'
    proc = run_example('sweep_thrust_fraction.py', outdir, {'PYTHONPATH': path})
    assert proc.returncode == 0, proc.stderr
    check_sweep_table(proc.stdout)
    assert 'matplotlib is not installed: plot skipped' in proc.stdout
    assert not (outdir / 'thrust_fraction_sweep.png').exists()


def test_cruise_mach_trade_prints_a_rising_fuel_table(tmp_path):
    proc = run_example('cruise_mach_trade.py', tmp_path)
    assert proc.returncode == 0, proc.stderr
    text = proc.stdout.replace('%', '').replace(',', '').replace('<- drag divergence', '')
    rows = [row for row in table_rows(text) if len(row) == 7]
    assert len(rows) == 11
    mach = [row[0] for row in rows]
    fuel = [row[1] for row in rows]
    assert mach[0] == 0.70 and mach[-1] == 0.95
    assert all(b > a for a, b in zip(fuel, fuel[1:]))
    assert '<- drag divergence' in proc.stdout and '11 of 11 designs closed' in proc.stdout


def numeric_rows(stdout, width):
    """Return the rows of ``width`` tokens whose first token is a number (text kept)."""
    rows = []
    for line in stdout.splitlines():
        tokens = line.split()
        if len(tokens) != width:
            continue
        try:
            float(tokens[0])
        except ValueError:
            continue
        rows.append(tokens)
    return rows


def study_files(outdir, name):
    """Check the files ``voltwake sweep --out`` writes for one study; return the CSV rows."""
    import csv
    import json

    assert (outdir / 'report.html').is_file()
    summary = json.loads((outdir / f'{name}_summary.json').read_text())
    assert summary['status'] == 'complete'
    assert (outdir / f'{name}_summary.yaml').is_file()
    for png in summary['plots']:
        assert (outdir / png).read_bytes()[:8] == b'\x89PNG\r\n\x1a\n'
    if HAS_MATPLOTLIB:
        assert summary['plots']
    return summary, list(csv.DictReader((outdir / f'{name}_points.csv').read_text().splitlines()))


def reference_fuel(stdout):
    """Return the reference block fuel printed as '... reference block fuel <F> kg'."""
    import re

    return float(re.search(r'reference block fuel ([\d.]+) kg', stdout).group(1))


def test_study_design_map(tmp_path):
    proc = run_example('study_design_map.py', tmp_path)
    assert proc.returncode == 0, proc.stderr
    rows = np.array([row for row in table_rows(proc.stdout) if len(row) == 5])
    assert rows.shape == (9, 5)
    # Full factorial, the aft-fan pressure ratio varying slowest.
    assert np.allclose(rows[:, 0], np.repeat([1.2, 1.3, 1.4], 3))
    assert np.allclose(rows[:, 1], np.tile([0.15, 0.25, 0.35], 3))
    assert np.all((rows[:, 3] > 0) & (rows[:, 3] < 1))  # a power saving coefficient
    # Change = 100 (F - F_ref) / F_ref (hand value from the equation in studies/maps.py),
    # from the printed values (fuel to 0.1 kg, change to 0.01 %).
    ref = reference_fuel(proc.stdout)
    assert np.allclose(rows[:, 4], 100 * (rows[:, 2] - ref) / ref, rtol=0, atol=0.006)
    assert '9 of 9 designs closed' in proc.stdout
    _, csv_rows = study_files(tmp_path, 'map')
    assert len(csv_rows) == 9
    assert [float(r['block_fuel_kg [kg]']) for r in csv_rows] == pytest.approx(rows[:, 2], abs=0.05)


def test_study_target_sweep(tmp_path):
    proc = run_example('study_target_sweep.py', tmp_path)
    assert proc.returncode == 0, proc.stderr
    rows = numeric_rows(proc.stdout, 6)
    assert [float(r[0]) for r in rows] == [0.15, 0.25, 0.35]
    assert [r[1] for r in rows] == ['yes'] * 3
    fuel, change, loading, fpr = (np.array([float(r[i]) for r in rows]) for i in (2, 3, 4, 5))
    ref = reference_fuel(proc.stdout)
    assert np.allclose(change, 100 * (fuel - ref) / ref, rtol=0, atol=0.006)
    # The optimised design variables stay within the demo's bounds.
    dvs = load_config(None).data['optimization']['design_variables']
    assert dvs['wing.loading'] == {'lower': '450 kg/m**2', 'upper': '750 kg/m**2'}
    assert np.all((loading >= 450 - 1e-6) & (loading <= 750 + 1e-6))
    assert np.all((fpr >= 1.15 - 1e-6) & (fpr <= 1.6 + 1e-6))
    summary, csv_rows = study_files(tmp_path, 'targets')
    assert len(csv_rows) == 3 and summary['closed_count'] == 3


def test_study_breakeven(tmp_path):
    proc = run_example('study_breakeven.py', tmp_path)
    assert proc.returncode == 0, proc.stderr
    rows = np.array([row for row in table_rows(proc.stdout) if len(row) == 3])
    assert rows[:, 0].tolist() == [5.0, 20.0]  # kW/kg, both ends of the interval
    # The demo burns more fuel than its optimised reference at both ends (the finding of
    # test_breakeven.py), so there is no break-even and no third evaluation.
    assert np.all(rows[:, 2] > 0)
    assert 'no break-even' in proc.stdout
    assert 'the optimised conventional reference burns less fuel at both ends' in proc.stdout
    table = proc.stdout.split('largest first):')[1].split('files written')[0]
    sens = [line.split() for line in table.splitlines()[2:] if line.strip()]
    sens = [(path, float(elasticity)) for path, elasticity in sens]
    # At the optimum the bus voltage is a design variable (optimised), not a fixed input.
    fixed = set(default_technology_paths(load_config(None))) - {'electrical.cable.voltage'}
    assert sorted(p for p, _ in sens) == sorted(fixed)
    assert [abs(e) for _, e in sens] == sorted((abs(e) for _, e in sens), reverse=True)
    summary, csv_rows = study_files(tmp_path, 'breakeven')
    assert summary['found'] is False and len(csv_rows) == 2


def test_study_monte_carlo(tmp_path):
    proc = run_example('study_monte_carlo.py', tmp_path)
    assert proc.returncode == 0, proc.stderr
    inputs = {
        r[0]: [float(v) for v in r[2:]]
        for r in (line.split() for line in proc.stdout.splitlines())
        if len(r) == 5 and r[0].startswith('electrical.')
    }
    # The demo's study.uncertainty distributions: uniform 5-20 kW/kg, triangular 0.95-0.99.
    assert sorted(inputs) == sorted(load_config(None).data['study']['uncertainty']['distributions'])
    for path, (low, mean, high) in inputs.items():
        lo, hi = (5000.0, 20000.0) if path.endswith('specific_power') else (0.95, 0.99)
        assert lo <= low <= mean <= high <= hi
    assert '300 of 300 samples closed' in proc.stdout
    stats = next(r for r in table_rows(proc.stdout) if len(r) == 5)
    mean, std, p05, p50, p95 = stats
    assert std > 0 and p05 <= p50 <= p95 and p05 <= mean <= p95
    win = float(proc.stdout.split('design wins:')[1].split('%')[0])
    assert 0.0 <= win <= 100.0
    _, csv_rows = study_files(tmp_path, 'montecarlo')
    assert len(csv_rows) == 300
