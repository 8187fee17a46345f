"""
The ``voltwake`` command.

Every error a user can cause ends in one line on standard error and a documented exit
code (see README.md): 0 success, 2 bad input, 3 design did not close, 4 optimiser failed,
5 derivative check above tolerance, 6 no feasible design, 7 no break-even in the interval,
130 interrupted. Output cut short by its reader (``voltwake
analyze | head -3``) is not an error: the rest is dropped and the command keeps its code.
"""

import argparse
import json
import os
import sys
import warnings

from . import errors
from .errors import VoltwakeError

#: File ``voltwake model-view`` writes when no ``--output`` is given.
MODEL_VIEW_FILE = 'model_view.html'


class _ReaderSafeOutput:
    """
    Standard output that drops what is written after its reader has gone.

    When the reader of a pipe closes it early (``voltwake analyze | head -3``), the rest of
    the output has nobody to go to: that is not an error of the command, which finishes and
    keeps its exit code. The stream's file descriptor is pointed at the null device so that
    Python's own flush at exit does not fail again (the recipe of the Python documentation,
    "Note on SIGPIPE" in the ``signal`` module). Only writes to standard output are guarded:
    a broken pipe anywhere else is still an error.

    Parameters
    ----------
    stream : file-like
        The standard output to guard.
    """

    def __init__(self, stream):
        self._stream = stream
        self.reader_gone = False

    def _gone(self):
        self.reader_gone = True
        try:
            fd = self._stream.fileno()
        except (AttributeError, OSError, ValueError):  # in-process: no file descriptor
            return
        devnull = os.open(os.devnull, os.O_WRONLY)
        try:
            os.dup2(devnull, fd)
        finally:
            os.close(devnull)

    def write(self, text):
        """
        Write ``text``, or drop it once the reader has gone.

        Parameters
        ----------
        text : str
            What to write.

        Returns
        -------
        int
            The number of characters taken.
        """
        if not self.reader_gone:
            try:
                return self._stream.write(text)
            except BrokenPipeError:
                self._gone()
        return len(text)

    def flush(self):
        """Flush the stream, or nothing once the reader has gone."""
        if not self.reader_gone:
            try:
                self._stream.flush()
            except BrokenPipeError:
                self._gone()

    def __getattr__(self, name):
        """
        Give every other attribute of the guarded stream.

        Parameters
        ----------
        name : str
            Attribute name.

        Returns
        -------
        object
            The stream's attribute.
        """
        return getattr(self._stream, name)


def _config_arg(parser):
    parser.add_argument(
        'config',
        nargs='?',
        default=None,
        help='aircraft YAML file (default: the packaged turbo-electric demo)',
    )
    parser.add_argument(
        '--set',
        dest='overrides',
        action='append',
        default=[],
        metavar='KEY.PATH=VALUE',
        help="override one config value, e.g. --set 'mission.range=1200 nmi'",
    )


def _whole_or_text(text):
    """
    Return a count written on the command line as an int, or as written if it is not one.

    What is not a whole number is kept as text, so that the study checks it and ends with
    one line (argparse would print its usage as well).

    Parameters
    ----------
    text : str
        The value as written.

    Returns
    -------
    int or str
        The whole number, or ``text``.
    """
    try:
        return int(text)
    except ValueError:
        return text


def _parser():
    parser = argparse.ArgumentParser(
        prog='voltwake',
        description='Conceptual sizing and optimisation of turbo-electric airliners with a '
        'wake-ingesting aft fan. Conceptual estimates only.',
    )
    sub = parser.add_subparsers(dest='command', required=True)

    p = sub.add_parser(
        'demos',
        help='list the packaged demo configurations (their names work wherever CONFIG does)',
    )
    p.add_argument('--json', action='store_true', help='print one JSON object')

    p = sub.add_parser('analyze', help='close the sizing loop of one design and summarise it')
    _config_arg(p)
    p.add_argument('--json', action='store_true', help='print one JSON object')

    p = sub.add_parser('compare', help='compare a design with its conventional reference')
    _config_arg(p)
    p.add_argument('--json', action='store_true', help='print one JSON object')
    p.add_argument(
        '--optimize',
        action='store_true',
        help='optimise both designs with the same objective and constraints first',
    )

    p = sub.add_parser(
        'optimize',
        help='minimise fuel burn (or the configured objective) under the configured constraints',
    )
    _config_arg(p)
    p.add_argument(
        '--out',
        metavar='DIR',
        help='write results (JSON, YAML) and the OpenMDAO case file (cases.sql) to DIR',
    )
    p.add_argument('--force', action='store_true', help='allow a non-empty --out DIR')
    p.add_argument('--json', action='store_true', help='print one JSON object at the end')

    p = sub.add_parser(
        'sweep',
        help='trade studies: design-space map, target sweep with '
        'optimisations, technology break-even, Monte Carlo',
    )
    _config_arg(p)
    p.add_argument(
        '--map',
        action='append',
        default=[],
        metavar='PATH=LO:HI:N',
        help='an axis of a vectorised design-space map (analysis only)',
    )
    p.add_argument(
        '--targets',
        action='append',
        default=[],
        metavar='PATH=LO:HI:N',
        help='an axis of a target sweep (an optimisation at every point)',
    )
    p.add_argument(
        '--breakeven',
        metavar='PATH=LO:HI',
        help='technology input at which the design burns as much fuel as the optimised reference',
    )
    p.add_argument(
        '--monte-carlo',
        dest='samples',
        type=_whole_or_text,
        metavar='N',
        help='Monte Carlo samples over study.uncertainty.distributions',
    )
    p.add_argument(
        '--optimize',
        action='store_true',
        help='with --monte-carlo: re-optimise the design and its conventional reference at '
        'every sample (needs an optimization section)',
    )
    p.add_argument('--seed', type=_whole_or_text, help='Monte Carlo seed')
    p.add_argument(
        '--jobs',
        type=int,
        default=None,
        help='local processes for the optimisations and the chunks of a map or Monte Carlo '
        '(default: all cores)',
    )
    p.add_argument(
        '--chunk-size',
        metavar='N',
        help='points per vectorised solve of a map or Monte Carlo (default 2500); rows are '
        'written to the CSV chunk by chunk',
    )
    p.add_argument('--out', metavar='DIR', help='write CSV, summaries, plots and report.html')
    p.add_argument('--force', action='store_true', help='allow a non-empty --out DIR')
    p.add_argument('--json', action='store_true', help='print one JSON object at the end')

    p = sub.add_parser('report', help='write one self-contained HTML report of a results directory')
    p.add_argument('results_dir', help='a directory written by optimize or sweep --out')
    p.add_argument('--output', help='HTML file (default: RESULTS_DIR/report.html)')

    p = sub.add_parser(
        'model-view',
        help="write OpenMDAO's model-structure diagram (N2) of the configured model as HTML",
    )
    _config_arg(p)
    p.add_argument(
        '--output',
        default=MODEL_VIEW_FILE,
        metavar='FILE',
        help=f'HTML file to write (default: {MODEL_VIEW_FILE} in the current directory)',
    )

    p = sub.add_parser('derivs', help='check partial and total derivatives against complex step')
    _config_arg(p)
    p.add_argument(
        '--tolerance',
        type=float,
        default=1e-6,
        help='largest relative error accepted (default 1e-6)',
    )
    return parser


def _cmd_analyze(args):
    from .design.analysis import analyze
    from .outputs.summary import analysis_text

    result = analyze(args.config, args.overrides, keep_problem=False)
    print(json.dumps(result.to_dict(), indent=2) if args.json else analysis_text(result))
    return errors.EXIT_OK


def _cmd_compare(args):
    from .design.compare import compare
    from .outputs.summary import absent_fields, comparison_text

    comp = compare(args.config, args.overrides, optimized=args.optimize)
    if args.json:
        data = comp.to_dict()
        # The numbers stay as the model gives them (0, or 1 for efficiencies, where the
        # reference has no aft fan or electrical chain); this names those placeholders.
        data['absent_in_reference'] = absent_fields(comp.reference.values)
        print(json.dumps(data, indent=2))
    else:
        print(comparison_text(comp.design, comp.reference, comp.change_percent))
    return errors.EXIT_OK


def _cmd_demos(args):
    from .configuration.loader import demo_names, demo_path, load_config

    demos = []
    for name in demo_names():
        path = demo_path(name)
        demos.append(
            {
                'name': name,
                'aircraft': load_config(path).name,
                'description': _demo_description(path),
                'path': path,
            }
        )
    if args.json:
        print(json.dumps({'demos': demos}, indent=2))
        return errors.EXIT_OK
    width = max(len(d['name']) for d in demos)
    lines = ['Packaged demos: give the name wherever a config file goes, e.g.']
    lines.append(f"  voltwake analyze {demos[0]['name']}" if demos else '  (none packaged)')
    for demo in demos:
        lines.append(f"{demo['name']:<{width}s}  {demo['aircraft']}")
        if demo['description']:
            lines.append(f"{'':<{width}s}  {demo['description']}")
        lines.append(f"{'':<{width}s}  file (copy it to start your own): {demo['path']}")
    print('\n'.join(lines))
    return errors.EXIT_OK


def _demo_description(path):
    """
    Return what a demo is: the first comment line of its file, without 'voltwake demo:'.

    Parameters
    ----------
    path : str
        The demo's YAML file.

    Returns
    -------
    str
        One line ('' when the file does not start with a comment).
    """
    with open(path, encoding='utf-8') as handle:
        first = handle.readline().strip()
    if not first.startswith('#'):
        return ''
    text = first.lstrip('#').strip()
    head, sep, rest = text.partition(':')
    return rest.strip() if sep and head.strip().lower() == 'voltwake demo' else text


def _cmd_model_view(args):
    import openmdao.api as om

    from .configuration.loader import load_config
    from .design.sizing import build_model_problem

    output = os.path.abspath(args.output)
    if os.path.isdir(output):
        raise errors.ConfigError('is a directory; expected an HTML file name', source=args.output)
    if not os.path.isdir(os.path.dirname(output)):
        raise errors.ConfigError(
            'the directory of the file does not exist; expected a file in an existing directory',
            source=args.output,
        )
    config = load_config(args.config, args.overrides)
    prob = build_model_problem(config)
    prob.final_setup()
    try:
        om.n2(
            prob,
            outfile=output,
            show_browser=False,
            display_in_notebook=False,
            title=f'voltwake model: {config.name}',
        )
    except OSError as err:
        raise errors.ConfigError(
            f'cannot write the file ({err.strerror or err})', source=args.output
        ) from None
    print(f'model structure of {config.name} written to {output}')
    return errors.EXIT_OK


def _cmd_derivs(args):
    from .configuration.loader import load_config
    from .design.derivatives import check_derivatives

    worst = check_derivatives(load_config(args.config, args.overrides))
    failed = [
        (kind, worst[f'worst_{kind}'], worst[f'worst_{kind}_at'])
        for kind in ('partial', 'total')
        if worst[f'worst_{kind}'] > args.tolerance
    ]
    if failed:
        kind, rel, where = max(failed, key=lambda f: f[1])
        print(
            f'voltwake: derivative check failed: worst {kind} relative error {rel:.3e} at '
            f'{where}, above the tolerance {args.tolerance:g}',
            file=sys.stderr,
        )
        return errors.EXIT_DERIVATIVE_CHECK
    print(
        f"derivative check passed (tolerance {args.tolerance:g}; "
        f"{worst['partials_compared']} partial and {worst['totals_compared']} total pairs "
        'compared)'
    )
    return errors.EXIT_OK


def _optimization_plots(result, out_dir, reference=None):
    """
    Draw the convergence history, mass breakdown and power flow of an optimum.

    Parameters
    ----------
    result : OptimizationResult
        The optimisation.
    out_dir : str
        The results directory.
    reference : dict or None
        Outputs of the optimised conventional reference, drawn beside start and optimum.

    Returns
    -------
    str or None
        Why no figures were drawn (matplotlib missing), or None.
    """
    from .design.constraints import FEASIBILITY_TOLERANCE
    from .outputs.report import objective_label

    try:
        from .outputs import plots

        plots.plot_history(
            result.history,
            os.path.join(out_dir, 'convergence.png'),
            objective_label=objective_label(result.objective, result.outputs, result.history),
            feasibility_tolerance=FEASIBILITY_TOLERANCE,
        )
        if result.outputs:
            designs = {'start': result.start, 'optimum': result.outputs}
            if reference:
                designs['optimised reference'] = reference
            plots.plot_mass_breakdown(
                designs,
                os.path.join(out_dir, 'mass_breakdown.png'),
                title='Mass breakdown: start, optimum'
                + (' and optimised reference' if reference else ''),
            )
            if result.outputs.get('aft_thrust_fraction', 0.0) > 0:
                plots.plot_power_flow(result.outputs, os.path.join(out_dir, 'power_flow.png'))
    except errors.ConfigError as err:
        # No matplotlib: the results files and the report still stand; the report says why.
        print(f'voltwake: note: no figures drawn: {err.message}', file=sys.stderr)
        return f'no figures drawn: {err.message}'
    return None


def _optimized_reference(config):
    """
    Optimise the conventional reference of a turbo-electric design (same objective).

    Returns
    -------
    dict or None
        The reference's results (``status`` 'complete' with the optimisation, or 'failed'
        with the message), or None for a design without an aft fan.
    """
    from .design.optimization import optimize

    if not config.has_aft_fan:
        return None
    reference = config.without_aft_fan()
    try:
        opt = optimize(reference)
    except errors.InterruptedRun:
        raise
    except VoltwakeError as err:
        return {
            'status': 'failed',
            'role': 'optimised conventional reference',
            'message': err.message,
        }
    return {'status': 'complete', 'role': 'optimised conventional reference', **opt.to_dict()}


def _cmd_optimize(args):
    from .design.optimization import optimize
    from .outputs.files import prepare_out_dir, write_results
    from .outputs.summary import optimization_text

    out_dir = prepare_out_dir(args.out, args.force) if args.out else None
    recorder = os.path.join(out_dir, 'cases.sql') if out_dir else None

    def progress(entry):
        if not args.json:
            flag = '' if entry['closed'] else '  (did not close)'
            print(
                f"eval {entry['evaluation']:4d}  objective {entry['objective']:14.6g}  "
                f"worst violation {entry['max_violation']:.3e}{flag}",
                flush=True,
            )

    try:
        result = optimize(
            args.config, args.overrides, recorder_path=recorder, on_evaluation=progress
        )
    except errors.InterruptedRun as stop:
        if out_dir and stop.partial is not None:
            write_results(out_dir, 'results', stop.partial)
        raise
    data = result.to_dict()
    if out_dir:
        from .configuration.loader import load_config
        from .outputs.report import write_report

        write_results(out_dir, 'results', {'status': 'complete', **data})
        # The answer a reader wants is the design against the conventional aircraft built to
        # the same rules: optimise that reference too, for the report's verdict.
        config = load_config(args.config, args.overrides)
        if config.has_aft_fan and not args.json:
            print(
                'optimising the conventional reference (aft fan removed) for the report', flush=True
            )
        reference = _optimized_reference(config)
        if reference is not None:
            write_results(out_dir, 'reference_results', reference)
        ref_outputs = (reference or {}).get('outputs') if (reference or {}).get('success') else None
        note = _optimization_plots(result, out_dir, ref_outputs)
        if note:
            write_results(out_dir, 'results', {'status': 'complete', **data, 'figures_note': note})
        write_report(out_dir)
    print(json.dumps(data, indent=2) if args.json else optimization_text(result))
    if result.status == 'infeasible':
        print(f'voltwake: error: {result.message}', file=sys.stderr)
        return errors.EXIT_INFEASIBLE
    if not result.success:
        print(f'voltwake: error: optimisation failed: {result.message}', file=sys.stderr)
        return errors.EXIT_OPTIMIZER_FAILED
    return errors.EXIT_OK


def _cmd_sweep(args):
    from .configuration.loader import load_config
    from .outputs.files import prepare_out_dir
    from .studies.parallel import ProgressBar, is_root
    from .studies.results import clean
    from .studies.runner import run_sweep, study_spec

    if args.jobs is not None and args.jobs < 1:
        raise errors.ConfigError(f'got {args.jobs}; expected a whole number >= 1', source='--jobs')
    chunk_size = _chunk_size(args.chunk_size)
    config = load_config(args.config, args.overrides)
    spec = study_spec(
        config, args.map, args.targets, args.breakeven, args.samples, args.seed, args.optimize
    )
    root = is_root()
    out_dir = prepare_out_dir(args.out, args.force) if (args.out and root) else None
    bar = ProgressBar() if (root and not args.json) else None
    summaries = run_sweep(
        config, spec, jobs=args.jobs, out_dir=out_dir, progress=bar, chunk_size=chunk_size
    )
    if not root:
        return errors.EXIT_OK
    # No break-even in the interval: its answer is the one error line (exit 7), not also
    # a line of the summary; the files are written all the same.
    missed = summaries.get('breakeven', {}).get('found') is False
    if args.json:
        print(json.dumps(clean(summaries), indent=2, sort_keys=True))
    else:
        from .outputs.summary import sweep_text

        shown = {k: v for k, v in summaries.items() if not (missed and k == 'breakeven')}
        print(sweep_text(shown, out_dir))
    if missed:
        raise errors.NoBreakevenError(summaries['breakeven']['message'])
    return _sweep_exit_code(summaries)


def _sweep_exit_code(summaries):
    """
    Return the exit code of a sweep whose files are written.

    Returns
    -------
    int
        4 when an optimisation of a target sweep failed, else 6 when a target point has no
        feasible design, else 0.
    """
    targets = summaries.get('targets') or {}
    if targets.get('failed_count'):
        print(
            f"voltwake: error: {targets['failed_count']} target-sweep optimisations failed",
            file=sys.stderr,
        )
        return errors.EXIT_OPTIMIZER_FAILED
    if targets.get('infeasible_count'):
        from .outputs.summary import binding_words

        print(
            f"voltwake: error: {targets['infeasible_count']} target points have no feasible "
            f'design: {binding_words(targets)}',
            file=sys.stderr,
        )
        return errors.EXIT_INFEASIBLE
    return errors.EXIT_OK


def _chunk_size(text):
    """Return the ``--chunk-size`` as an int (None when not given), or raise ConfigError."""
    if text is None:
        return None
    try:
        value = int(text)
    except ValueError:
        value = None
    if value is None or value < 1:
        raise errors.ConfigError(
            f'got {text!r}; expected a whole number of points >= 1', source='--chunk-size'
        )
    return value


def _cmd_report(args):
    from .outputs.report import write_report

    print(write_report(args.results_dir, args.output))
    return errors.EXIT_OK


COMMANDS = {
    'demos': _cmd_demos,
    'model-view': _cmd_model_view,
    'analyze': _cmd_analyze,
    'compare': _cmd_compare,
    'derivs': _cmd_derivs,
    'optimize': _cmd_optimize,
    'sweep': _cmd_sweep,
    'report': _cmd_report,
}


def main(argv=None):
    """
    Run the ``voltwake`` command.

    Parameters
    ----------
    argv : list of str or None
        Arguments (default: ``sys.argv[1:]``).

    Returns
    -------
    int
        The exit code.
    """
    os.environ.setdefault('OPENMDAO_REPORTS', '0')
    args = _parser().parse_args(argv)
    with warnings.catch_warnings():
        if not os.environ.get('VOLTWAKE_DEBUG'):
            # OpenMDAO's advisory warnings (relevance, zero partials) and numpy's floating-
            # point warnings from designs that run away are for developers; the user gets the
            # one-line reason.
            warnings.filterwarnings('ignore', module='openmdao')
            warnings.filterwarnings('ignore', category=RuntimeWarning)
        stdout = sys.stdout
        sys.stdout = _ReaderSafeOutput(stdout)
        try:
            code = _run(args)
            sys.stdout.flush()  # the reader may leave before the last buffered output
        finally:
            sys.stdout = stdout
    return code


def _run(args):
    try:
        return COMMANDS[args.command](args)
    except VoltwakeError as err:
        print(f'voltwake: error: {err.message}', file=sys.stderr)
        return err.exit_code
    except KeyboardInterrupt:
        print('voltwake: interrupted', file=sys.stderr)
        return errors.EXIT_INTERRUPTED
    except Exception as err:  # noqa: BLE001 - last resort: one line, not a traceback
        if os.environ.get('VOLTWAKE_DEBUG'):
            raise
        print(
            f'voltwake: internal error: {type(err).__name__}: {err} '
            '(set VOLTWAKE_DEBUG=1 for the traceback)',
            file=sys.stderr,
        )
        return errors.EXIT_INTERNAL


if __name__ == '__main__':
    sys.exit(main())
