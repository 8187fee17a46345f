"""The whole report page: the verdict, the studies in order, the configuration, the cautions."""

import glob
import os

from ...errors import ConfigError
from ..files import write_atomic
from ..summary import CAUTION
from .html import _STYLE, _esc, _raw_td, _table, _td
from .optimisation import _optimization_study
from .optimized_monte_carlo import optimized_montecarlo_study
from .study import _Figures, _read_json, read_points
from .trade_studies import (
    _breakeven_study,
    _map_study,
    _montecarlo_study,
    _other_study,
    _targets_study,
)

#: The simplifications that matter for the answer (docs/theory.md, section 6, abridged).
ASSUMPTIONS = [
    'One cruise point at the mid-cruise mass stands for the whole cruise, the diversion and '
    'the hold; take-off, climb, descent and landing are fixed historical fuel fractions. The '
    'economic mission keeps the design cruise point’s overall efficiency (no part-power '
    'TSFC change, no off-design ingestion).',
    'Drag: a parabolic polar with a constant Oswald efficiency plus the wing’s wave drag '
    '(Korn equation with simple sweep theory); fully turbulent skin friction; one constant '
    'miscellaneous drag coefficient. Results well past the drag-divergence Mach number are '
    'extrapolation.',
    'Masses: statistical equations fitted to past, mostly metallic transports (Raymer, '
    'Aircraft Design: A Conceptual Approach; Torenbeek for the landing gear); very high '
    'aspect ratios or composite structure are extrapolation. Electrical devices scale '
    'linearly with rated power; turbofan masses use demo constants, not data.',
    'Fans are one-dimensional (fully expanded nozzle, no intake, duct or nozzle losses); the '
    'turbofan core is a shaft-power source of constant thermal efficiency.',
    'Boundary-layer ingestion pays only through a lower aft-fan shaft power; the drag is not '
    'reduced. The layer is axisymmetric with a power-law profile taken from the whole '
    'fuselage drag, and distortion costs efficiency through a stated linear law. Read the '
    'power saving coefficients as upper estimates.',
    'Electrical chain: constant cruise efficiencies, losses at cruise, a DC cable at 20 °C, '
    'and a partial-discharge limit from Paschen’s law for one assumed air gap.',
    'Take-off and landing at ISA sea level with statistical field-length correlations; no '
    'engine-failure case. The performance constraints act only through an optimisation.',
    'Design-space maps and analysis-only Monte Carlo studies analyse the configured design '
    'without re-optimising it; the re-optimised Monte Carlo study, target sweeps and '
    'break-even studies optimise every point and the reference. The optimiser is local: its '
    'result depends on the start. Brent’s method '
    'finds one break-even in the interval.',
]


_ORDER = [
    'optimization',
    'targets',
    'breakeven',
    'montecarlo_optimized',
    'montecarlo',
    'map',
    'other',
]


def _kind_of(name, data):
    """Return the study kind of a JSON file, 'reference' or 'other'."""
    if not isinstance(data, dict):
        return 'other'
    if data.get('role') == 'optimised conventional reference' or name == 'reference_results.json':
        return 'reference'
    if data.get('status') == 'partial':
        return 'partial'
    kind = data.get('kind')
    if kind in ('map', 'montecarlo', 'montecarlo_optimized', 'targets', 'breakeven'):
        return kind
    if 'design' in data and 'history' in data:
        return 'optimization'
    return 'other'


def collect_studies(results_dir):
    """
    Read every result of a directory and render its studies.

    Parameters
    ----------
    results_dir : str
        The results directory.

    Returns
    -------
    tuple
        (list of Study in reading order, list of notes on partial results, _Figures).
    """
    jsons = sorted(glob.glob(os.path.join(glob.escape(results_dir), '*.json')))
    loaded = [(os.path.basename(p), _read_json(p)) for p in jsons]
    figures = _Figures(results_dir)
    reference = next((d for n, d in loaded if _kind_of(n, d) == 'reference'), None)
    studies, notes = [], []
    for name, data in loaded:
        kind = _kind_of(name, data)
        stem = name[: -len('_summary.json')] if name.endswith('_summary.json') else None
        rows = read_points(os.path.join(results_dir, f'{stem}_points.csv')) if stem else []
        if kind == 'optimization':
            studies.append(_optimization_study(data, reference, figures))
        elif kind == 'map':
            studies.append(_map_study(data, rows, figures))
        elif kind == 'montecarlo':
            studies.append(_montecarlo_study(data, rows, figures))
        elif kind == 'montecarlo_optimized':
            studies.append(optimized_montecarlo_study(data, rows, figures))
        elif kind == 'targets':
            studies.append(_targets_study(data, rows, figures))
        elif kind == 'breakeven':
            studies.append(_breakeven_study(data, rows, figures))
        elif kind == 'partial':
            notes.append(f'{name}: {data.get("message", "partial results")}')
        elif kind == 'other':
            studies.append(_other_study(name, data))
    studies.sort(key=lambda s: _ORDER.index(s.kind))
    return studies, notes, figures


def _verdict(studies, notes):
    """Return the verdict paragraph and the headline table."""
    main = [s for s in studies if s.kind != 'other']
    sentences = ' '.join(s.sentence for s in main if s.sentence)
    if not sentences:
        sentences = 'This directory holds no study with a fuel-burn answer.'
    rows = [
        [
            _raw_td(f'<a href="#{s.anchor}">{_esc(s.title)}</a>'),
            _raw_td(s.answer),
            _td(s.fuel),
            _td(s.reference),
        ]
        for s in main
    ]
    out = [
        '<section class="verdict" id="verdict">',
        '<h2 style="margin-top:0.2em;border:none">Verdict</h2>',
        f'<p>{sentences}</p>',
    ]
    if rows:
        out.append(
            _table(['study', 'answer', 'fuel burn measured on', 'compared with'], rows, 'headline')
        )
    for note in notes:
        out.append(f'<p class="note">Incomplete: {_esc(note)}</p>')
    out.append('</section>')
    return '\n'.join(out)


def _config_section(studies):
    """Return the configurations used, collapsible (one block per distinct one)."""
    import yaml

    seen = []
    for s in studies:
        if s.config and s.config not in [c for c, _ in seen]:
            seen.append((s.config, s.title))
    if not seen:
        return ''
    out = ['<h2 id="configuration">Configuration used</h2>']
    for config, title in seen:
        text = yaml.safe_dump(config, sort_keys=False, default_flow_style=False, allow_unicode=True)
        which = '' if len(seen) == 1 else f' by {title}'
        out.append(
            f'<details><summary>The configuration used{_esc(which)} '
            f'({_esc(config.get("aircraft", ""))}, {text.count(chr(10))} lines of YAML)</summary>'
            f'<pre>{_esc(text)}</pre></details>'
        )
    return '\n'.join(out)


def write_report(results_dir, out_path=None):
    """
    Write one self-contained HTML report of a results directory.

    Parameters
    ----------
    results_dir : str
        Directory holding the result files (``*.json``, ``*_points.csv``, ``*.png``).
    out_path : str or None
        Destination (default ``<results_dir>/report.html``).

    Returns
    -------
    str
        The path of the written report.

    Raises
    ------
    ConfigError
        If the directory does not exist, holds no PNG or JSON file, a JSON file cannot
        be read, or the destination's directory does not exist.
    """
    if not os.path.isdir(results_dir):
        raise ConfigError('the results directory does not exist', source=str(results_dir))
    pngs = glob.glob(os.path.join(glob.escape(results_dir), '*.png'))
    jsons = glob.glob(os.path.join(glob.escape(results_dir), '*.json'))
    if not pngs and not jsons:
        raise ConfigError(
            'the results directory holds no results (no .png or .json files)',
            source=str(results_dir),
        )
    out_path = out_path or os.path.join(results_dir, 'report.html')
    if not os.path.isdir(os.path.dirname(os.path.abspath(out_path))):
        raise ConfigError('the directory of the report does not exist', source=str(out_path))
    studies, notes, figures = collect_studies(results_dir)
    design = next(
        (s.config.get('aircraft') for s in studies if s.config and s.config.get('aircraft')),
        None,
    )
    folder = os.path.basename(os.path.abspath(results_dir))
    title = design or f'voltwake results: {folder}'
    kinds = ', '.join(s.title for s in studies) or 'figures only'
    parts = [
        f'<h1>{_esc(title)}</h1>',
        '<p class="subtitle">Does the turbo-electric design with a wake-ingesting aft fan burn '
        'less fuel than the conventional aircraft built to the same rules? · voltwake report '
        f'of <code>{_esc(folder)}</code>: {_esc(kinds)}</p>',
        f'<p class="caution"><b>Caution.</b> {_esc(CAUTION)}</p>',
        _verdict(studies, notes),
    ]
    if len(studies) > 1:
        links = ''.join(f'<li><a href="#{s.anchor}">{_esc(s.title)}</a></li>' for s in studies)
        parts.append(
            f'<nav><b>Contents</b><ul>{links}'
            '<li><a href="#assumptions">Assumptions and cautions</a></li></ul></nav>'
        )
    for s in studies:
        parts.append(f'<h2 id="{s.anchor}">{_esc(s.title)}</h2>')
        parts.append(s.body)
    leftover = figures.take(*sorted(figures.left))
    if leftover:
        parts.append('<h2 id="figures">Other figures</h2>')
        parts.append(leftover)
    elif not pngs:
        parts.append(
            '<p class="note">This directory holds no figures (they need matplotlib, a '
            'dependency of voltwake).</p>'
        )
    parts.append(_config_section(studies))
    parts.append('<h2 id="assumptions">Assumptions that matter</h2>')
    parts.append(
        '<ul class="assumptions">'
        + ''.join(f'<li>{_esc(a)}</li>' for a in ASSUMPTIONS)
        + '</ul><p class="note">The full list: docs/theory.md, section 6 '
        '"Simplifications and validity".</p>'
    )
    parts.append('<h2 id="cautions">Cautions</h2>')
    parts.append(f'<p class="caution">{_esc(CAUTION)}</p>')
    text = (
        '\n'.join(
            [
                '<!DOCTYPE html>',
                '<html lang="en">',
                '<head>',
                '<meta charset="utf-8">',
                '<meta name="viewport" content="width=device-width, initial-scale=1">',
                f'<title>{_esc(title)}</title>',
                f'<style>{_STYLE}</style>',
                '</head>',
                '<body>',
                *parts,
                '</body>',
                '</html>',
            ]
        )
        + '\n'
    )
    write_atomic(out_path, text)
    return out_path
