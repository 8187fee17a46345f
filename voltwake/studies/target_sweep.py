"""
Target sweeps: an optimisation at every point of a grid of fixed inputs or output targets.

At each point the swept config inputs are fixed (and taken out of the design variables), the
swept model outputs become equality constraints, and every other design variable is
optimised. Each optimum is compared with the optimised conventional reference (the same
configuration without the aft fan, same objective and constraints). The optimisations are
independent and run through :func:`voltwake.parallel.map_jobs`.
"""

import copy
import difflib
import itertools
import math
import numbers

from ..configuration.loader import field_at, input_paths, load_config, parse_quantity
from ..design.feasibility import FAILED, INFEASIBLE, OPTIMUM, amounts_text
from ..design.fields import fuel_burn_field
from ..design.optimization import optimize
from ..design.sizing import build_model_problem
from ..errors import ConfigError
from .maps import axis_count, axis_number
from .parallel import map_jobs

#: Result fields copied into every row (NaN for a failed point).
ROW_FIELDS = (
    'block_fuel_kg',
    'total_fuel_kg',
    'mtow_kg',
    'oew_kg',
    'power_saving_coefficient',
    'electrical_mass_kg',
    'aft_fan_mass_kg',
    'engines_mass_kg',
    'economic_block_fuel_kg',
)


def is_config_input(path):
    """
    Return True when ``path`` is a config key (fixed as an input), False for a model output.

    Parameters
    ----------
    path : str
        Dotted config key path or promoted model output name.

    Returns
    -------
    bool
        True for a config key.
    """
    return field_at(path) is not None


def in_reference(path, reference):
    """
    Return True when the config input ``path`` also acts on the conventional reference.

    Parameters
    ----------
    path : str
        Dotted config key path.
    reference : Config
        The conventional reference configuration.

    Returns
    -------
    bool
        False for the aft-fan and electrical sections and for limits only an aft fan has.
    """
    if path not in reference.values:
        return False
    target = field_at(path).target
    return not target or target in reference.model_inputs()


def fixed_config(config, inputs=None, outputs=None):
    """
    Return the configuration with inputs fixed and outputs constrained to given values.

    Each fixed input is set in its section and removed from
    ``optimization.design_variables``; each output gets the constraint ``{equals: value}``
    in ``optimization.constraints`` (replacing any constraint on it).

    Parameters
    ----------
    config : Config, dict, str or None
        The configuration (with an ``optimization`` section).
    inputs : dict or None
        Dotted config key path -> value (SI number, or a string with units).
    outputs : dict or None
        Promoted model output -> required value (in the output's units).

    Returns
    -------
    Config
        The validated configuration.
    """
    config = load_config(config)
    if 'optimization.design_variables' not in config.values:
        raise ConfigError(
            "no 'optimization' section; expected design_variables, constraints and an objective",
            source=config.source,
        )
    data = copy.deepcopy(config.data)
    opt = data['optimization']
    dvs = dict(opt.get('design_variables') or {})
    for path, value in (inputs or {}).items():
        _set_path(data, path, value, config.source)
        dvs.pop(path, None)
    if not dvs:
        raise ConfigError(
            'every design variable is fixed; nothing is left to optimise',
            source=config.source,
            path='optimization.design_variables',
        )
    opt['design_variables'] = dvs
    cons = dict(opt.get('constraints') or {})
    for name, value in (outputs or {}).items():
        cons[name] = {'equals': value}
    opt['constraints'] = cons
    return load_config(data)


def _set_path(data, path, value, source):
    node = data
    parts = path.split('.')
    for i, part in enumerate(parts[:-1]):
        if not isinstance(node.setdefault(part, {}), dict):
            raise ConfigError(
                f"'{part}' is not a section", source=source, path='.'.join(parts[: i + 1])
            )
        node = node[part]
    node[parts[-1]] = value


def _check_outputs(config, names, source=None):
    """
    Raise ConfigError for target names that are neither config keys nor model outputs.

    A misspelt name gets a did-you-mean over the model's outputs and the config's inputs.

    Returns
    -------
    dict
        Model output -> its units (None for a dimensionless output).
    """
    if not names:
        return {}
    units = _output_units(config)
    for name in names:
        if name not in units:
            close = difflib.get_close_matches(name, sorted(units) + input_paths(), n=1)
            hint = f" (did you mean '{close[0]}'?)" if close else ''
            raise ConfigError(
                f'neither a config key nor a model output of this design{hint}',
                source=source or config.source,
                path=name,
            )
    return {name: units[name] for name in names}


def _output_units(config):
    """
    Return every output of a configuration's model with its units.

    Parameters
    ----------
    config : Config
        The configuration.

    Returns
    -------
    dict
        Promoted output name -> units (None for a dimensionless output).
    """
    prob = build_model_problem(config)
    meta = prob.model.get_io_metadata(
        iotypes='output', metadata_keys=['units'], get_remote=True, return_rel_names=False
    )
    return {info['prom_name']: info['units'] for info in meta.values()}


def output_axis(config, text):
    """
    Parse ``OUTPUT=LO:HI:N``: a model output held at each of N values as a target.

    Units are allowed on LO and HI and converted to the output's units; a bare number is in
    the output's units. A name that is neither a model output nor a config key gets a
    did-you-mean over both.

    Parameters
    ----------
    config : Config
        The configuration (its model gives the outputs and their units).
    text : str
        E.g. ``'wingspan=30 m:36 m:3'``.

    Returns
    -------
    tuple
        (name, lower, upper, count, units): bounds in the output's units.
    """
    name, sep, spec = str(text).partition('=')
    name, parts = name.strip(), spec.split(':')
    where = {'source': 'command line', 'path': name or None}
    if not sep or len(parts) != 3:
        raise ConfigError(f'got {text!r}; expected PATH=LO:HI:N', **where)
    units = _check_outputs(config, [name], source='command line')[name]
    lower, upper = (
        parse_quantity(p.strip(), units, where, check_bare=False)
        if units
        else axis_number(p, where)
        for p in parts[:2]
    )
    return name, lower, upper, axis_count(parts[2], where), units


def optimize_job(job):
    """
    Optimise one configuration and return a picklable summary (a map_jobs worker).

    Parameters
    ----------
    job : dict
        ``data``: the configuration mapping.

    Returns
    -------
    dict
        ``success``, ``message``, ``outputs`` (analysis fields), ``design`` (path -> value),
        ``active`` (active constraint names and ``'bound:<path>'`` for design variables at a
        bound), ``evaluations``, ``status`` ('optimum', 'infeasible' or 'failed') and
        ``violations`` (for 'infeasible': the violated constraints at the least-infeasible
        design, whose variables are then ``design``). A point that raises is 'failed', with
        the error as its message.
    """
    try:
        result = optimize(load_config(job['data']))
    except Exception as exc:  # noqa: BLE001 - a failed point is reported in its row
        return {
            'success': False,
            'status': FAILED,
            'message': f'{type(exc).__name__}: {exc}',
            'outputs': {},
            'design': {},
            'active': [],
            'evaluations': 0,
            'violations': [],
        }
    active = [name for name, con in result.constraints.items() if con['active']]
    active += [f'bound:{path}' for path, dv in result.design.items() if dv['active']]
    return {
        'success': result.success,
        'message': result.message,
        'outputs': dict(result.outputs),
        'design': {path: dv['si']['value'] for path, dv in result.design.items()},
        'active': active,
        'evaluations': result.evaluations,
        'status': result.status,
        'violations': list(result.violations),
    }


def target_sweep(config, targets, jobs=None, progress=None):
    """
    Optimise the design at every point of a full-factorial grid of targets.

    Parameters
    ----------
    config : Config, dict, str or None
        The configuration (with an ``optimization`` section); None for the demo.
    targets : dict
        Dotted config key path or model output -> 1-D sequence of values (SI, or the
        output's units). Full factorial; the first key varies slowest. Config inputs are
        fixed (and dropped from the design variables); outputs become equality constraints.
    jobs : int or None
        Local processes (see :func:`voltwake.parallel.map_jobs`); None for all cores.
    progress : callable or None
        ``progress(done, failed, total, elapsed)`` after each point's optimisation: the
        reference optimisations are not points and are not counted; ``failed`` counts
        optimiser failures (not points without a feasible design).

    Returns
    -------
    dict
        ``targets``: the swept names in order; ``points``: one row per point with
        ``'target:<name>'`` values, ``success``, ``status`` ('optimum', 'infeasible': no
        feasible design, or 'failed': the optimiser failed), ``message``,
        ``violated_constraints`` (``name:amount`` pairs in the constraints' units at the
        least-infeasible design of an infeasible point), :data:`ROW_FIELDS`,
        ``'dv:<path>'`` optimised design variables (the least-infeasible design's for an
        infeasible point), ``active_constraints``, ``evaluations``,
        ``reference`` (index into ``references``) and ``fuel_burn_change_percent`` (block fuel
        against the reference, percent); failed points have NaN numbers. ``reference``: the
        first (usually only) reference, ``references``: all of them, each with ``targets``
        (the swept conventional inputs it is optimised at), ``success``, ``message``,
        ``outputs`` and ``design``. A reference is optimised once for every combination of
        swept inputs and output targets that the conventional design also has (once when
        only aft-fan or electrical inputs, or outputs only the turbo-electric model has,
        such as the power saving coefficient, are swept): a wingspan target holds the
        reference at the same span, so that both aircraft obey the same rule.
        The counts by status and the constraints that bind at the infeasible points come
        from :func:`status_summary`.
    """
    config = load_config(config)
    names = list(targets)
    if not names:
        raise ConfigError('no targets to sweep', source=config.source)
    grids = []
    for name in names:
        values = [
            float(v) if isinstance(v, numbers.Real) and not isinstance(v, bool) else v
            for v in targets[name]
        ]
        if not values:
            raise ConfigError('no values to sweep', source=config.source, path=name)
        grids.append(values)
    _check_outputs(config, [n for n in names if not is_config_input(n)])
    reference = config.without_aft_fan()
    swept_outputs = [n for n in names if not is_config_input(n)]
    shared_outputs = set(_output_units(reference)) & set(swept_outputs) if swept_outputs else set()

    points, ref_keys = [], {}
    for combo in itertools.product(*grids):
        point = dict(zip(names, combo))
        inputs = {n: v for n, v in point.items() if is_config_input(n)}
        outputs = {n: v for n, v in point.items() if not is_config_input(n)}
        ref_inputs = tuple((n, v) for n, v in inputs.items() if in_reference(n, reference))
        ref_outputs = tuple((n, v) for n, v in outputs.items() if n in shared_outputs)
        ref_index = ref_keys.setdefault((ref_inputs, ref_outputs), len(ref_keys))
        points.append((point, fixed_config(config, inputs, outputs), ref_index))
    ref_configs = [
        fixed_config(reference, dict(ins), dict(outs)) if ins or outs else reference
        for ins, outs in ref_keys
    ]

    jobs_list = [{'data': cfg.data} for cfg in ref_configs] + [
        {'data': cfg.data} for _, cfg, _ in points
    ]
    results = map_jobs(
        optimize_job, jobs_list, jobs=jobs, progress=progress, uncounted=len(ref_configs)
    )
    ref_results, point_results = results[: len(ref_configs)], results[len(ref_configs) :]

    references = [
        {
            'targets': {**dict(key[0]), **dict(key[1])},
            'success': res['success'],
            'status': res['status'],
            'message': res['message'],
            'outputs': res['outputs'],
            'design': res['design'],
        }
        for key, res in zip(ref_keys, ref_results)
    ]
    rows = []
    for (point, cfg, ref_index), res in zip(points, point_results):
        rows.append(_row(point, cfg, res, references[ref_index], ref_index))
    return {
        'targets': names,
        'points': rows,
        'reference': references[0],
        'references': references,
        **status_summary(point_results),
    }


def status_summary(results):
    """
    Count the points by status and say which constraints leave points with no design.

    Parameters
    ----------
    results : list of dict
        The results of :func:`optimize_job` at the points (``status``, ``violations``).

    Returns
    -------
    dict
        ``optimum_count``, ``infeasible_count``, ``failed_count`` and ``infeasible_constraints``:
        constraint name -> {``points`` (how many infeasible points violate it),
        ``percent_min``, ``percent_max`` (how far it binds, percent of its limit; None when
        it has no percentage), ``amount_min``, ``amount_max`` and ``units``}, the
        constraints violated at most points first.
    """
    counts = {OPTIMUM: 0, INFEASIBLE: 0, FAILED: 0}
    binding = {}
    for res in results:
        counts[res['status']] += 1
        for v in res.get('violations') or []:
            entry = binding.setdefault(
                v['name'], {'points': 0, 'percents': [], 'amounts': [], 'units': v['units']}
            )
            entry['points'] += 1
            entry['amounts'].append(v['amount'])
            if v['percent'] is not None:
                entry['percents'].append(v['percent'])
    summary = {}
    for name, entry in sorted(binding.items(), key=lambda item: -item[1]['points']):
        pct, amt = entry['percents'], entry['amounts']
        summary[name] = {
            'points': entry['points'],
            'percent_min': min(pct) if pct else None,
            'percent_max': max(pct) if pct else None,
            'amount_min': min(amt),
            'amount_max': max(amt),
            'units': entry['units'],
        }
    return {
        'optimum_count': counts[OPTIMUM],
        'infeasible_count': counts[INFEASIBLE],
        'failed_count': counts[FAILED],
        'infeasible_constraints': summary,
    }


def _row(point, cfg, res, reference, ref_index):
    """Return the result row of one point."""
    ok = res['success']
    status = res.get('status', OPTIMUM if ok else FAILED)
    row = {f'target:{name}': value for name, value in point.items()}
    row.update(success=ok, status=status, message=res['message'])
    row['violated_constraints'] = amounts_text(res.get('violations') or [])
    for key in ROW_FIELDS:
        row[key] = res['outputs'].get(key, math.nan) if ok else math.nan
    for path in cfg.values['optimization.design_variables']:
        # An infeasible point keeps the variables of its least-infeasible design.
        shown = ok or status == INFEASIBLE
        row[f'dv:{path}'] = res['design'].get(path, math.nan) if shown else math.nan
    row['active_constraints'] = list(res['active']) if ok else []
    row['evaluations'] = res['evaluations']
    row['reference'] = ref_index
    field = fuel_burn_field(cfg)
    ref_fuel = reference['outputs'].get(field, math.nan) if reference['success'] else math.nan
    fuel = res['outputs'].get(field, math.nan) if ok else math.nan
    row['fuel_burn_change_percent'] = 100.0 * (fuel - ref_fuel) / ref_fuel
    row['fuel_burn_measured_on'] = field
    return row
