"""Impossible counts given to ``voltwake sweep`` end with one line and exit code 2."""

import contextlib
import io

import pytest

from voltwake.cli import main
from voltwake.configuration.loader import demo_path
from voltwake.errors import EXIT_BAD_INPUT

TURBO_ELECTRIC = demo_path('turbo_electric')


def _run(argv):
    """Run ``main`` in-process; return (exit code, stdout, stderr)."""
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        code = main(argv)
    return code, out.getvalue(), err.getvalue()


@pytest.mark.parametrize('count', ['0', '-3', '2.5', 'many', '1e3'])
def test_an_impossible_monte_carlo_count_is_one_line_and_exit_2(count, tmp_path):
    out = tmp_path / 'out'
    code, stdout, stderr = _run(
        ['sweep', TURBO_ELECTRIC, f'--monte-carlo={count}', '--out', str(out)]
    )
    assert code == EXIT_BAD_INPUT
    assert stdout == ''
    shown = count if count.lstrip('-').isdigit() else repr(count)
    assert stderr.splitlines() == [
        f'voltwake: error: --monte-carlo: got {shown}; expected a whole number >= 1'
    ]
    assert not out.exists()  # nothing was run, nothing written


def test_an_impossible_seed_is_one_line_and_exit_2():
    code, stdout, stderr = _run(['sweep', TURBO_ELECTRIC, '--monte-carlo', '2', '--seed', '1.5'])
    assert code == EXIT_BAD_INPUT and stdout == ''
    assert stderr.splitlines() == [
        "voltwake: error: --seed: got '1.5'; expected a whole number >= 0"
    ]
