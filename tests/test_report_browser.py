"""
The HTML reports in a real browser: no console errors, and a page that is not blank.

Four small studies are run through the command line (an optimisation, a design-space map
with a Monte Carlo study, a target sweep and a technology break-even), each writes its
``report.html``, and Chromium (Debian package ``chromium``) renders it to a screenshot. The
tests skip, saying why, when ``chromium`` is not on PATH. Set ``VOLTWAKE_REPORT_SHOTS`` to a
directory to keep the screenshots.
"""

import os
import shutil
import stat
import subprocess
import sys

import numpy as np
import pytest

CHROMIUM = shutil.which('chromium')

pytestmark = pytest.mark.skipif(
    CHROMIUM is None,
    reason='chromium is not on PATH (Debian: apt-get install chromium); the browser test of '
    'the HTML reports needs it',
)

#: The four studies, small enough to take well under a minute each.
STUDIES = {
    'optimisation': ['optimize'],
    'map': [
        'sweep',
        '--map',
        'aft_fan.thrust_fraction=0.05:0.45:6',
        '--map',
        'electrical.motor.specific_power=2kW/kg:20kW/kg:6',
        '--monte-carlo',
        '50',
        '--seed',
        '1',
    ],
    'targets': [
        'sweep',
        '--targets',
        'aft_fan.thrust_fraction=0.1:0.3:2',
        '--targets',
        'electrical.motor.specific_power=5kW/kg:15kW/kg:2',
    ],
    'breakeven': ['sweep', '--breakeven', 'electrical.motor.specific_power=2kW/kg:20kW/kg'],
}

#: Console-message markers of Chromium's log on standard error (page errors, uncaught
#: exceptions); common practice for headless checks.
CONSOLE_ERRORS = ('ERROR:CONSOLE', 'Uncaught')


def _umask_022():
    os.umask(0o022)


@pytest.fixture(scope='module')
def reports(tmp_path_factory):
    """Run the four studies through the command line; return name -> results directory."""
    root = tmp_path_factory.mktemp('reports')
    env = dict(os.environ, OPENMDAO_REPORTS='0')
    out = {}
    for name, args in STUDIES.items():
        folder = root / name
        done = subprocess.run(
            [sys.executable, '-m', 'voltwake.cli', *args, '--out', str(folder)],
            capture_output=True,
            text=True,
            env=env,
            timeout=600,
            preexec_fn=_umask_022,
        )
        # The demo has no break-even in its interval: exit code 7, the files written.
        assert done.returncode == (7 if name == 'breakeven' else 0), done.stderr
        out[name] = folder
    return out


def render(html_path, shot, profile):
    """
    Render a page in headless Chromium; return (screenshot pixels, console error lines).

    Parameters
    ----------
    html_path : pathlib.Path
        The page.
    shot : pathlib.Path
        Where the screenshot goes.
    profile : pathlib.Path
        A fresh user-data directory.

    Returns
    -------
    tuple
        (RGB pixels as floats in 0..1, list of console error lines).
    """
    import matplotlib.image as mpimg

    done = subprocess.run(
        [
            CHROMIUM,
            '--headless',
            '--no-sandbox',
            '--disable-gpu',
            '--hide-scrollbars',
            '--no-first-run',
            f'--user-data-dir={profile}',
            '--enable-logging=stderr',
            '--v=0',
            f'--screenshot={shot}',
            '--window-size=1280,2000',
            html_path.resolve().as_uri(),
        ],
        capture_output=True,
        text=True,
        timeout=180,
    )
    assert shot.exists(), f'no screenshot; chromium said: {done.stderr[-2000:]}'
    errors = [line for line in done.stderr.splitlines() if any(m in line for m in CONSOLE_ERRORS)]
    return mpimg.imread(str(shot))[:, :, :3], errors


def dump_dom(html_path, profile):
    """Return the DOM of a page after Chromium loaded it."""
    done = subprocess.run(
        [
            CHROMIUM,
            '--headless',
            '--no-sandbox',
            '--disable-gpu',
            '--no-first-run',
            f'--user-data-dir={profile}',
            '--dump-dom',
            html_path.resolve().as_uri(),
        ],
        capture_output=True,
        text=True,
        timeout=180,
    )
    return done.stdout


def not_blank(pixels):
    """Return the share of pixels that are not near-white, and the pixel variance."""
    ink = float(np.mean(np.any(pixels < 0.9, axis=2)))
    return ink, float(np.var(pixels))


def _keep(shot, name):
    folder = os.environ.get('VOLTWAKE_REPORT_SHOTS')
    if folder:
        os.makedirs(folder, exist_ok=True)
        shutil.copy(shot, os.path.join(folder, f'{name}.png'))


@pytest.mark.parametrize('name', list(STUDIES))
def test_report_renders_in_chromium(reports, tmp_path, name):
    page = reports[name] / 'report.html'
    # Written with the user's umask (0o022 here), readable by colleagues like any file.
    assert stat.S_IMODE(page.stat().st_mode) == 0o644
    for data in reports[name].glob('*_summary.json'):
        assert stat.S_IMODE(data.stat().st_mode) == 0o644
    pixels, errors = render(page, tmp_path / 'shot.png', tmp_path / 'profile')
    _keep(tmp_path / 'shot.png', name)
    assert errors == [], errors
    assert pixels.shape[:2] == (2000, 1280)
    ink, variance = not_blank(pixels)
    # A page of text, tables and figures: a few per cent of its pixels are ink (a blank
    # page has none); the thresholds are far below what a report shows (about 10 %).
    assert ink > 0.02 and variance > 1e-3, (ink, variance)
    dom = dump_dom(page, tmp_path / 'profile2')
    assert 'id="verdict"' in dom and 'class="headline"' in dom
    assert dom.rstrip().endswith('</html>')
    assert dom.count('<img') >= 1 and 'Assumptions that matter' in dom


def test_the_checks_can_fail(tmp_path):
    # A page with a script error and a blank page: the checks above must catch both.
    broken = tmp_path / 'broken.html'
    broken.write_text(
        '<!DOCTYPE html><html><body><p>x</p><script>undefinedFunction();</script></body></html>'
    )
    _, errors = render(broken, tmp_path / 'broken.png', tmp_path / 'p1')
    assert errors, 'the console error of the page was not seen'
    blank = tmp_path / 'blank.html'
    blank.write_text('<!DOCTYPE html><html><body></body></html>')
    pixels, errors = render(blank, tmp_path / 'blank.png', tmp_path / 'p2')
    ink, variance = not_blank(pixels)
    assert errors == [] and ink < 0.02 and variance < 1e-3
