"""Run the scripts in examples/ as a user would and check what they print and write."""

import importlib.util
import os
import subprocess
import sys
from pathlib import Path

import numpy as np
import openmdao.api as om

from voltwake.configuration.loader import load_config

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
