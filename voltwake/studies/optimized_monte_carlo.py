"""
Monte Carlo over technology inputs with both aircraft re-optimised at every sample.

The analysis-only Monte Carlo (:func:`voltwake.studies.maps.monte_carlo`) analyses the
configured design point; this study asks instead: if the technology lands anywhere in the
stated ranges and both aircraft are optimised to the same rules, how likely is the
turbo-electric one to win, and by how much? At every sample the turbo-electric design and
its conventional reference (the same configuration without the aft fan) are optimised with
the configured objective and constraints, each warm-started from its optimum at the nominal
(configured) inputs. The reference has no aft-fan or electrical inputs: when no sampled
input acts on it, its optimum is the same at every sample and it is optimised once.

The optimisations are independent and run through :func:`voltwake.parallel.map_jobs`
(local processes or MPI ranks). A sample whose optimisation fails keeps its row with the
optimiser's message; the probability of a win is computed over the successful samples, with
a Wilson score interval.
"""

import math
import statistics
from dataclasses import dataclass

import numpy as np

from ..configuration.loader import load_config
from ..design.fields import fuel_burn_field
from ..design.optimization import optimize
from ..errors import ConfigError, InterruptedRun, OptimizationError
from .maps import points_csv, points_units, sample_distributions
from .parallel import map_jobs
from .results import StudyResult
from .target_sweep import fixed_config, in_reference

#: Status of a sample: both optimisations found a feasible optimum; an optimisation closed
#: but ended on a design that violates a constraint; an optimisation failed otherwise (the
#: optimiser stopped, the design did not close, or an error was raised).
OPTIMUM, INFEASIBLE, FAILED = 'optimum', 'infeasible', 'failed'

#: Confidence level of the interval on the probability of a win.
CONFIDENCE = 0.95

#: What this study does, as the summary and the report say it.
ANALYSIS = (
    'both aircraft re-optimised at every sample (same objective and constraints), '
    'warm-started from their optima at the nominal inputs'
)


def wilson_interval(successes, trials, confidence=CONFIDENCE):
    """
    Return the Wilson score interval of a binomial proportion.

    With ``p = successes / trials`` and ``z`` the standard normal quantile of
    ``(1 + confidence) / 2`` the interval is
    ``(p + z²/2n ± z sqrt(p(1 - p)/n + z²/4n²)) / (1 + z²/n)`` (Wilson, "Probable inference,
    the law of succession, and statistical inference", J. Am. Stat. Assoc. 22 (1927)
    209-212; also Agresti and Coull, Am. Stat. 52 (1998) 119-126, eq. 2). Unlike the normal
    approximation it stays inside [0, 1] and is not empty at 0 or ``trials`` successes.

    Parameters
    ----------
    successes : int
        Number of successes (wins).
    trials : int
        Number of trials (successful samples).
    confidence : float
        Confidence level, e.g. 0.95.

    Returns
    -------
    tuple of float
        (lower, upper); (nan, nan) for no trials.
    """
    if trials <= 0:
        return math.nan, math.nan
    z = statistics.NormalDist().inv_cdf(0.5 + 0.5 * confidence)
    p = successes / trials
    denominator = 1.0 + z * z / trials
    centre = (p + z * z / (2 * trials)) / denominator
    half = z * math.sqrt(p * (1.0 - p) / trials + z * z / (4 * trials * trials)) / denominator
    return max(0.0, centre - half), min(1.0, centre + half)


def optimize_design_job(job):
    """
    Optimise one design of the study and return a picklable summary (a map_jobs worker).

    Parameters
    ----------
    job : dict
        ``data``: the configuration mapping; ``sample``: the sample index (None for the
        nominal inputs); ``role``: 'design' or 'reference'.

    Returns
    -------
    dict
        ``sample``, ``role``, ``status`` (:data:`OPTIMUM`, :data:`INFEASIBLE` or
        :data:`FAILED`), ``success``, ``message``, ``fuel`` (every fuel field of the final
        design, kg; empty when it does not close), ``design`` (path -> value, SI; empty for an
        error) and ``evaluations``.
    """
    out = {'sample': job.get('sample'), 'role': job.get('role', 'design')}
    try:
        result = optimize(load_config(job['data']))
    except InterruptedRun:
        raise
    except Exception as exc:  # noqa: BLE001 - a failed sample is reported in its row
        return {
            **out,
            'status': FAILED,
            'success': False,
            'message': f'{type(exc).__name__}: {exc}',
            'fuel': {},
            'design': {},
            'evaluations': 0,
        }
    # The optimiser's own verdict: an unsuccessful run is followed by a feasibility phase
    # that tells a design with no feasible point from an optimiser failure.
    status = result.status
    return {
        **out,
        'status': status,
        'success': result.success,
        'message': result.message,
        'fuel': {k: v for k, v in result.outputs.items() if k.endswith('block_fuel_kg')},
        'design': {path: dv['si']['value'] for path, dv in result.design.items()},
        'evaluations': result.evaluations,
    }


def _job(config, role, sample, inputs, warm):
    """Return the job of one optimisation: ``inputs`` fixed, started at ``warm``."""
    overrides = {**warm, **inputs}
    cfg = config.with_overrides(overrides) if overrides else config
    return {'data': cfg.data, 'sample': sample, 'role': role}


def _nominal_base(config, paths):
    """Return ``config`` with the sampled inputs that are design variables held fixed."""
    dvs = config.values.get('optimization.design_variables') or {}
    held = {p: config.values[p] for p in paths if p in dvs}
    return fixed_config(config, held) if held else config


def optimized_monte_carlo(
    config, distributions, samples=100, seed=1, jobs=None, progress=None, written=None
):
    """
    Sample technology inputs and optimise both aircraft at every sample.

    Parameters
    ----------
    config : Config, dict, str or None
        A turbo-electric configuration with an ``optimization`` section.
    distributions : dict
        See :func:`voltwake.studies.maps.sample_distributions`.
    samples : int
        Number of samples.
    seed : int
        Random seed (the same seed gives the same samples as the analysis-only study).
    jobs : int or None
        Local processes (see :func:`voltwake.parallel.map_jobs`); None for all cores.
    progress : callable or None
        ``progress(done, failed, total, elapsed)`` after each optimisation of the samples.
    written : dict or None
        Sampled path -> the unit its distribution was written in (for the CSV).

    Returns
    -------
    OptimizedMonteCarloResult
        The rows (one per sample) and the summary.

    Raises
    ------
    InterruptedRun
        On Ctrl-C; its ``partial`` is the result of the samples finished so far (status
        'partial').
    """
    config = load_config(config)
    if not config.has_aft_fan:
        raise ConfigError(
            'a Monte Carlo study needs a turbo-electric design (aft_fan section)',
            source=config.source,
        )
    if 'optimization.design_variables' not in config.values:
        raise ConfigError(
            "--optimize needs an 'optimization' section (design_variables, constraints and an "
            'objective)',
            source=config.source,
        )
    columns = sample_distributions(distributions, samples, seed)
    paths = list(columns)
    reference = config.without_aft_fan()
    shared = [p for p in paths if in_reference(p, reference)]
    design_base = _nominal_base(config, paths)
    ref_base = _nominal_base(reference, shared)

    nominal_design, nominal_ref = map_jobs(
        optimize_design_job,
        [_job(design_base, 'design', None, {}, {}), _job(ref_base, 'reference', None, {}, {})],
        jobs=jobs,
    )
    if nominal_ref['status'] != OPTIMUM and not shared:
        raise OptimizationError(
            'the conventional reference has no optimum at the nominal inputs, so no sample '
            f"can be compared with it: {nominal_ref['message']}"
        )
    warm_design = nominal_design['design'] if nominal_design['status'] == OPTIMUM else {}
    warm_ref = nominal_ref['design'] if nominal_ref['status'] == OPTIMUM else {}

    items = []
    for i in range(samples):
        point = {p: float(columns[p][i]) for p in paths}
        items.append(_job(design_base, 'design', i, point, warm_design))
        if shared:
            items.append(_job(ref_base, 'reference', i, {p: point[p] for p in shared}, warm_ref))
    done = {}

    def keep(_, result):
        done[(result['sample'], result['role'])] = result

    study = _Study(config, columns, nominal_design, nominal_ref, shared, seed, distributions)
    study.written = dict(written or {})
    try:
        map_jobs(optimize_design_job, items, jobs=jobs, progress=progress, on_result=keep)
    except (KeyboardInterrupt, InterruptedRun):
        partial = study.result(done, status='partial')
        finished = partial.data['samples_finished']
        raise InterruptedRun(
            f'Monte Carlo study (re-optimised) interrupted after {finished} of {samples} '
            'samples; the finished samples are kept',
            partial,
        ) from None
    return study.result(done)


class _Study:
    """What is known before the samples run, and how their results become rows."""

    def __init__(self, config, columns, nominal_design, nominal_ref, shared, seed, dists):
        self.config, self.columns = config, columns
        self.nominal_design, self.nominal_ref = nominal_design, nominal_ref
        self.shared, self.seed, self.distributions = shared, seed, dists
        self.field = fuel_burn_field(config)
        self.dv_paths = [
            p
            for p in config.values['optimization.design_variables']
            if p not in columns  # a sampled input is fixed, not optimised
        ]
        self.written = {}

    def _reference_of(self, done, sample):
        """Return the reference optimisation that a sample is compared with."""
        if not self.shared:
            return self.nominal_ref
        return done.get((sample, 'reference'))

    def row(self, sample, design, ref):
        """Return the CSV row of one sample."""
        field = self.field
        row = {'sample': sample}
        row.update({p: float(col[sample]) for p, col in self.columns.items()})
        status, message = design['status'], design['message']
        if status == OPTIMUM and ref['status'] != OPTIMUM:
            status, message = ref['status'], f"conventional reference: {ref['message']}"
        row['status'], row['message'] = status, message
        fuel = design['fuel'].get(field, math.nan) if design['status'] == OPTIMUM else math.nan
        ref_fuel = ref['fuel'].get(field, math.nan) if ref['status'] == OPTIMUM else math.nan
        row[f'turbo_electric_{field}'] = fuel
        row[f'reference_{field}'] = ref_fuel
        row['fuel_burn_change_percent'] = (
            100.0 * (fuel - ref_fuel) / ref_fuel if status == OPTIMUM else math.nan
        )
        row['evaluations'] = design['evaluations'] + (ref['evaluations'] if self.shared else 0)
        for path in self.dv_paths:
            row[f'dv:{path}'] = (
                design['design'].get(path, math.nan) if design['status'] == OPTIMUM else math.nan
            )
        return row

    def result(self, done, status='complete'):
        """Return the result of the samples finished (all of them unless partial)."""
        samples = len(next(iter(self.columns.values())))
        rows = []
        for i in range(samples):
            design, ref = done.get((i, 'design')), self._reference_of(done, i)
            if design is not None and ref is not None:
                rows.append(self.row(i, design, ref))
        data = self.summary(rows, samples)
        data['status'] = status
        data['samples_finished'] = data['points_count'] = len(rows)
        data['closed_count'] = data['successful_samples']
        if status == 'partial':
            data['message'] = (
                f'interrupted by the user after {len(rows)} of {samples} samples; the '
                'statistics cover the finished samples only'
            )
        return OptimizedMonteCarloResult(rows, data, self.config)

    def summary(self, rows, samples):
        """Return the study's numbers (no rows)."""
        field = self.field
        ok = [r for r in rows if r['status'] == OPTIMUM]
        change = np.array([r['fuel_burn_change_percent'] for r in ok], dtype=float)
        wins = int(np.sum(change < 0.0))
        lower, upper = wilson_interval(wins, len(ok))
        stats = {}
        if change.size:
            stats = {
                'mean': float(change.mean()),
                'std': float(change.std(ddof=1)) if change.size > 1 else 0.0,
                'p05': float(np.percentile(change, 5)),
                'p50': float(np.percentile(change, 50)),
                'p95': float(np.percentile(change, 95)),
            }
        counts = {s: sum(r['status'] == s for r in rows) for s in (OPTIMUM, INFEASIBLE, FAILED)}
        nd, nr = self.nominal_design, self.nominal_ref
        d_fuel = nd['fuel'].get(field, math.nan) if nd['status'] == OPTIMUM else math.nan
        r_fuel = nr['fuel'].get(field, math.nan) if nr['status'] == OPTIMUM else math.nan
        return {
            'kind': 'montecarlo_optimized',
            'analysis': ANALYSIS,
            'design': self.config.name,
            'objective': str(self.config.values['optimization.objective']),
            'fuel_burn_measured_on': field,
            'samples': samples,
            'seed': self.seed,
            'distributions': self.distributions,
            'axis_units': self.written,
            'fuel_burn_change_percent': stats,
            'probability_of_win': wins / len(ok) if ok else math.nan,
            'probability_of_win_interval': {
                'method': 'Wilson score interval',
                'confidence': CONFIDENCE,
                'lower': lower,
                'upper': upper,
            },
            'wins': wins,
            'successful_samples': len(ok),
            'status_counts': counts,
            'unsuccessful_samples': [
                {'sample': r['sample'], 'status': r['status'], 'message': r['message']}
                for r in rows
                if r['status'] != OPTIMUM
            ],
            'design_variables': self._dv_statistics(ok),
            'nominal': {
                'status': nd['status'],
                'message': nd['message'],
                'turbo_electric_fuel_kg': d_fuel,
                'reference_fuel_kg': r_fuel,
                'fuel_burn_change_percent': 100.0 * (d_fuel - r_fuel) / r_fuel,
                'design': nd['design'],
            },
            'reference': {
                'optimised': 'per sample' if self.shared else 'once',
                'why': (
                    'sampled inputs act on it: ' + ', '.join(self.shared)
                    if self.shared
                    else 'no sampled input acts on the conventional reference (it has no aft '
                    'fan or electrical chain), so its optimum is the same at every sample'
                ),
                'shared_inputs': list(self.shared),
                'status': nr['status'],
                'message': nr['message'],
                'fuel_kg': r_fuel,
                'design': nr['design'],
            },
        }

    def _dv_statistics(self, ok):
        """Return per design variable its percentiles and how many optima sit at a bound."""
        bounds = self._bounds()
        out = {}
        for path in self.dv_paths:
            values = np.array([r[f'dv:{path}'] for r in ok], dtype=float)
            lower, upper, units = bounds[path]
            entry = {'units': units, 'lower': lower, 'upper': upper}
            if values.size:
                tol = 1e-4 * max(abs(upper - lower), 1e-12)  # as the optimiser's active bounds
                entry.update(
                    p05=float(np.percentile(values, 5)),
                    p50=float(np.percentile(values, 50)),
                    p95=float(np.percentile(values, 95)),
                    at_lower=int(np.sum(np.abs(values - lower) <= tol)),
                    at_upper=int(np.sum(np.abs(values - upper) <= tol)),
                )
            out[path] = entry
        return out

    def _bounds(self):
        """Return path -> (lower, upper, units) of the design variables, SI."""
        from ..design.constraints import design_variables

        dvs = design_variables(self.config, self.config.model_inputs())
        return {dv.path: (dv.lower, dv.upper, dv.units) for dv in dvs}


#: Units of the columns that are not config keys or known result fields.
_UNITS = {
    'sample': None,
    'status': None,
    'message': None,
    'evaluations': None,
    'turbo_electric_block_fuel_kg': 'kg',
    'reference_block_fuel_kg': 'kg',
    'turbo_electric_economic_block_fuel_kg': 'kg',
    'reference_economic_block_fuel_kg': 'kg',
}


@dataclass(repr=False, eq=False)
class OptimizedMonteCarloResult(StudyResult):
    """
    A Monte Carlo study with both aircraft re-optimised at every sample.

    ``points`` holds per sample: ``sample``, the sampled inputs, ``status`` ('optimum',
    'infeasible' or 'failed') and ``message``, ``turbo_electric_<fuel>`` and
    ``reference_<fuel>`` (kg), ``fuel_burn_change_percent``, ``evaluations`` and
    ``dv:<path>``, the design variables of the turbo-electric optimum (SI).
    """

    name = 'montecarlo_optimized'

    def __post_init__(self):
        """Build the per-point arrays and their units from the rows."""
        super().__post_init__()
        self.units = points_units(list(self.points), _UNITS)

    def csv_text(self):
        """
        Return the samples as the CSV text of ``montecarlo_optimized_points.csv``.

        Returns
        -------
        str
            One row per sample, the sampled inputs in the units they were written in.
        """
        return points_csv(self.rows, units=_UNITS, shown=self._written())

    @property
    def probability_of_win(self):
        """Share of the successful samples whose turbo-electric optimum burns less fuel."""
        return self.data['probability_of_win']

    @property
    def probability_of_win_interval(self):
        """(lower, upper) of the 95 % Wilson score interval of the probability of a win."""
        interval = self.data['probability_of_win_interval']
        return interval['lower'], interval['upper']

    @property
    def fuel_burn_change_percent(self):
        """``mean``, ``std``, ``p05``, ``p50``, ``p95`` of the fuel-burn change [%]."""
        return self.data['fuel_burn_change_percent']

    @property
    def status(self):
        """'complete', or 'partial' for a study interrupted part-way."""
        return self.data['status']
