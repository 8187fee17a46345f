"""
Cost of the demo optimisation.

Analytic against finite-difference total derivatives, and the wall time of a command-line
run including interpreter start-up.

Run: ``python benchmarks/bench_optimize.py``. Prints one table; numbers only, no assertions.
"""

import contextlib
import io
import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

os.environ.setdefault('OPENMDAO_REPORTS', '0')

import numpy as np

from voltwake.configuration.loader import load_config
from voltwake.design.optimization import build_problem
from voltwake.design.sizing import set_model_inputs


def run_optimization(config, fd_totals):
    """
    Build and run the optimisation of ``config`` once, as :func:`voltwake.optimize` does.

    Parameters
    ----------
    config : Config
        The configuration.
    fd_totals : bool
        Approximate the model's total derivatives by forward finite differences instead of
        the analytic (linear-solve) totals.

    Returns
    -------
    dict
        setup and optimisation wall times [s], driver model and derivative evaluations, model
        solves including finite-difference steps, final block fuel [kg] and scaled design.
    """
    t0 = time.perf_counter()
    prob = build_problem(config)
    if fd_totals:
        # approx_totals only takes effect at setup, and build_problem returns a set-up
        # problem: declare it, set up again (design variables, constraints, objective and
        # input defaults are kept by the model) and set the configured inputs again.
        prob.model.approx_totals(method='fd')
        prob.setup(force_alloc_complex=True)
        set_model_inputs(prob, config)
    t1 = time.perf_counter()

    # Count every solve of the model: driver evaluations and finite-difference steps both
    # call model.run_solve_nonlinear.
    model, solves = prob.model, [0]
    solve = model.run_solve_nonlinear

    def counted():
        solves[0] += 1
        solve()

    model.run_solve_nonlinear = counted

    t2 = time.perf_counter()
    prob.run_model()
    with np.errstate(all='ignore'), contextlib.redirect_stdout(io.StringIO()):
        prob.run_driver()
    prob.driver._run_solve_nonlinear()  # final evaluation at the optimiser's design
    t3 = time.perf_counter()

    driver = prob.driver
    design = [
        (float(prob.get_val(dv.target, units=dv.units)[0]) - dv.lower) / (dv.upper - dv.lower)
        for dv in driver.design_variables
    ]
    return {
        'setup': t1 - t0,
        'optimise': t3 - t2,
        'model_evals': driver.result.model_evals,
        'deriv_evals': driver.result.deriv_evals,
        'deriv_time': driver.result.deriv_time,
        'solves': solves[0],
        'block_fuel': float(prob.get_val('block_fuel', units='kg')[0]),
        'success': driver._scipy_optimize_result.success,
        'design': np.array(design),
    }


def median_run(config, fd_totals, repeats):
    """
    Return the run with the median optimisation wall time of ``repeats`` runs.

    Parameters
    ----------
    config : Config
        The configuration.
    fd_totals : bool
        See :func:`run_optimization`.
    repeats : int
        Number of runs.

    Returns
    -------
    dict
        The median run of :func:`run_optimization`.
    """
    runs = sorted(
        (run_optimization(config, fd_totals) for _ in range(repeats)),
        key=lambda run: run['optimise'],
    )
    return runs[len(runs) // 2]


def cli_command():
    """
    Return the command-line optimisation to time, and a note when it is a stand-in.

    Returns
    -------
    list of str
        The command.
    str
        '' for ``voltwake optimize``, else what is timed instead.
    """
    script = Path(sys.executable).with_name('voltwake')
    cli = [str(script)] if script.is_file() else [sys.executable, '-m', 'voltwake.cli']
    probe = subprocess.run(cli + ['optimize', '--help'], capture_output=True, check=False)
    if probe.returncode == 0:
        return cli + ['optimize'], ''
    code = 'import voltwake.design.optimization as o; o.optimize()'
    return [sys.executable, '-c', code], (
        f"'voltwake optimize' is not available: timed python -c '{code}' instead"
    )


def time_command(command, repeats):
    """
    Return the median wall time of a command, start-up included.

    Parameters
    ----------
    command : list of str
        The command.
    repeats : int
        Number of runs.

    Returns
    -------
    float
        Median wall time [s].
    int
        Exit code of the last run.
    """
    env = dict(os.environ, OPENMDAO_REPORTS='0')
    times = []
    with tempfile.TemporaryDirectory() as cwd:  # anything the command writes goes here
        for _ in range(repeats):
            t0 = time.perf_counter()
            proc = subprocess.run(command, cwd=cwd, env=env, capture_output=True, check=False)
            times.append(time.perf_counter() - t0)
    return statistics.median(times), proc.returncode


def main(repeats=3):
    """
    Time the demo optimisation with analytic and finite-difference totals, and from the CLI.

    Parameters
    ----------
    repeats : int
        Runs of each case; the median is printed.
    """
    config = load_config(None)
    exact = median_run(config, False, repeats)
    fd = median_run(config, True, repeats)
    command, note = cli_command()
    cli_time, cli_rc = time_command(command, repeats)

    head = (
        f"{'case':<22s}{'setup [s]':>10s}{'optimise [s]':>13s}{'derivs [s]':>11s}"
        f"{'model evals':>12s}{'deriv evals':>12s}{'model solves':>13s}"
        f"{'block fuel [kg]':>16s}"
    )
    print(f'demo optimisation, median of {repeats} runs')
    print(head)
    print('-' * len(head))
    for name, run in (('analytic totals', exact), ('FD totals', fd)):
        print(
            f"{name:<22s}{run['setup']:10.2f}{run['optimise']:13.2f}{run['deriv_time']:11.2f}"
            f"{run['model_evals']:12d}{run['deriv_evals']:12d}{run['solves']:13d}"
            f"{run['block_fuel']:16.2f}"
        )
    ratio = {
        key: fd[key] / exact[key]
        for key in ('setup', 'optimise', 'deriv_time', 'model_evals', 'deriv_evals', 'solves')
    }
    print(
        f"{'FD / analytic':<22s}{ratio['setup']:10.2f}{ratio['optimise']:13.2f}"
        f"{ratio['deriv_time']:11.2f}{ratio['model_evals']:12.2f}{ratio['deriv_evals']:12.2f}"
        f"{ratio['solves']:13.2f}{fd['block_fuel'] / exact['block_fuel']:16.6f}"
    )
    label = 'CLI optimize' if not note else 'CLI stand-in'
    print(
        f"{label:<22s}{'':>10s}{cli_time:13.2f}   wall time, start-up included (exit code {cli_rc})"
    )
    print('-' * len(head))
    print(
        f"optimiser success: analytic {exact['success']}, FD {fd['success']}; "
        f"block fuel differs by {abs(fd['block_fuel'] / exact['block_fuel'] - 1):.1e} "
        f"(relative); largest design difference "
        f"{np.max(np.abs(fd['design'] - exact['design'])):.1e} of the bound range"
    )
    print(
        'setup: build_problem (and the second setup for FD); optimise: run_model, '
        'run_driver and the final evaluation; derivs: time in total derivatives'
    )
    print(
        'model evals: driver evaluations; model solves: all solves of the model, '
        'finite-difference steps included'
    )
    if note:
        print(note)


if __name__ == '__main__':
    main()
