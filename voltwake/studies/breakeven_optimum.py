"""
What holds the optimum at a technology break-even, and how fuel burn moves there.

:func:`explain_breakeven` adds to the result of :func:`voltwake.studies.breakeven.breakeven`:

- ``design_at_value``: the optimised turbo-electric design at the break-even (design
  variables with their bounds, the active constraints with their values and multipliers);
- ``bound_dependence``: for each design variable held at a bound there, the fuel-burn
  difference at the break-even value with that bound relaxed by :data:`BOUND_RELAXATION`
  of its range (the reference re-optimised with the same bound when it has the variable),
  and whether the break-even moves materially (:data:`MATERIAL_SHIFT`);
- ``sensitivities`` and ``sensitivities_at``: the post-optimality sensitivities of block
  fuel to the technology inputs at the optimised turbo-electric design (at the break-even
  when found, else at the configured value of the swept input), by the envelope theorem
  (:mod:`voltwake.studies.post_optimality`); the conventional reference has none of these
  inputs, so its sensitivities are zero.
"""

import copy
import math

from ..configuration.loader import _CHECKS, field_at, load_config
from ..design.constraints import design_variables
from ..design.fields import fuel_burn_field
from ..design.optimization import optimize
from ..errors import OptimizationError
from .breakeven import default_technology_paths
from .post_optimality import optimum_sensitivities
from .target_sweep import fixed_config, in_reference, optimize_job

#: A bound held at the break-even is relaxed by this fraction of its design variable's range
#: (halved until the relaxed bound passes the input's physical check).
BOUND_RELAXATION = 0.2

#: The break-even depends materially on a bound when relaxing it moves the estimated
#: break-even by more than this fraction of its value.
MATERIAL_SHIFT = 0.01

#: What the sensitivities mean (written into the JSON and shown in the report).
SENSITIVITY_MEANING = (
    'post-optimality sensitivity (envelope theorem): the change of the optimised block fuel '
    'per unit of the input, in kg per SI unit of the input (the unit under "units"), with '
    'every design variable re-optimised and the active constraints kept; '
    '"explicit" is the same derivative with the design held; "elasticity" is the percent '
    'change of block fuel per percent change of the input; '
    '"difference_per_unit" is the change of the fuel-burn difference against the optimised '
    'reference, in percentage points per SI unit of the input (the reference does not have '
    'these inputs: its sensitivities are zero)'
)


def _optimum(config):
    """Optimise a configuration in this process; raise when it fails."""
    result = optimize(config)
    if not result.success:
        raise OptimizationError(f'optimising the design failed: {result.message}')
    return result


def _design_table(result):
    """Return the design variables of an optimum: value, bounds, SI units and the bound held."""
    out = {}
    for path, dv in result.design.items():
        si = dv['si']
        side = None
        if dv['active']:
            side = (
                'lower'
                if abs(si['value'] - si['lower']) <= abs(si['value'] - si['upper'])
                else 'upper'
            )
        out[path] = {
            'value': si['value'],
            'lower': si['lower'],
            'upper': si['upper'],
            'units': si['units'],
            'at_bound': side,
        }
    return out


def _held(result, sens):
    """Return the summary of what holds an optimum (JSON-ready)."""
    design = _design_table(result)
    constraints = {
        name: {
            **{k: con['si'][k] for k in ('value', 'lower', 'upper', 'equals', 'units')},
            'multiplier': sens['multipliers'].get(name),
        }
        for name, con in result.constraints.items()
        if con['active']
    }
    active = list(constraints) + [f'bound:{p}' for p, d in design.items() if d['at_bound']]
    return {
        'success': result.success,
        'message': result.message,
        'design': {p: d['value'] for p, d in design.items()},
        'design_variables': design,
        'active': active,
        'active_constraints': constraints,
        'bound_multipliers': sens['bound_multipliers'],
        'wrong_sign': sens['wrong_sign'],
        'stationarity_residual': sens['residual'],
    }


def _relaxed_bound(config, path, side):
    """Return the relaxed value (SI) of a design variable's bound, or None if none is possible."""
    design = _design_table_of_config(config)[path]
    span = design['upper'] - design['lower']
    field = field_at(path)
    test = _CHECKS[field.check][0] if field.check in _CHECKS else (lambda v: True)
    step = BOUND_RELAXATION * span
    for _ in range(6):
        value = design[side] - step if side == 'lower' else design[side] + step
        if test(value):
            return value
        step /= 2.0
    return None


def _design_table_of_config(config):
    """Return path -> {lower, upper} (SI) of the configured design variables."""
    return {
        dv.path: {'lower': dv.lower, 'upper': dv.upper, 'units': dv.units}
        for dv in design_variables(config, config.model_inputs())
    }


def _with_bound(config, path, side, value):
    """Return ``config`` with one bound of a design variable set to ``value`` (SI)."""
    data = copy.deepcopy(config.data)
    bounds = dict(data['optimization']['design_variables'][path])
    units = field_at(path).units
    bounds[side] = f'{value!r} {units}' if units else float(value)
    data['optimization']['design_variables'][path] = bounds
    return load_config(data)


def bound_dependence(config, path, value, held, ref_fuel, slope):
    """
    Return, for each design variable at a bound at the break-even, what relaxing it does.

    Parameters
    ----------
    config : Config
        The turbo-electric configuration of the study.
    path : str
        The swept technology input.
    value : float
        The break-even value (SI).
    held : dict
        ``design_at_value`` (see :func:`explain_breakeven`).
    ref_fuel : float
        Block fuel of the optimised reference, kg.
    slope : float
        d(fuel-burn difference)/d(input) at the break-even, percentage points per SI unit.

    Returns
    -------
    list of dict
        One entry per bound held: ``path``, ``bound`` ('lower' or 'upper'), ``bound_value``,
        ``relaxed_to`` (SI, None when no relaxed bound passes the input's check), ``units``,
        ``difference_at_value`` (percent, with the bound relaxed), ``reference_relaxed``
        (whether the reference was re-optimised with the relaxed bound too),
        ``estimated_value`` (the break-even moved linearly by that difference and ``slope``),
        ``material`` and ``message``.
    """
    reference = config.without_aft_fan()
    fuel_field = fuel_burn_field(config)
    out = []
    for dv_path, entry in held['design_variables'].items():
        side = entry['at_bound']
        if not side:
            continue
        relaxed = _relaxed_bound(config, dv_path, side)
        item = {
            'path': dv_path,
            'bound': side,
            'bound_value': entry[side],
            'relaxed_to': relaxed,
            'units': entry['units'],
            'difference_at_value': math.nan,
            'reference_relaxed': False,
            'estimated_value': math.nan,
            'material': None,
        }
        if relaxed is None:
            item['message'] = f'the {side} bound of {dv_path} cannot be relaxed within its check'
            out.append(item)
            continue
        te = optimize_job(
            {'data': fixed_config(_with_bound(config, dv_path, side, relaxed), {path: value}).data}
        )
        ref = ref_fuel
        if in_reference(dv_path, reference):
            item['reference_relaxed'] = True
            res = optimize_job(
                {'data': _with_bound(config, dv_path, side, relaxed).without_aft_fan().data}
            )
            ref = res['outputs'].get(fuel_field, math.nan) if res['success'] else math.nan
        if not te['success'] or not math.isfinite(ref):
            item['message'] = (
                f'with the {side} bound of {dv_path} relaxed to {relaxed:.6g} the optimisation '
                f"failed: {te['message'] if not te['success'] else 'the reference failed'}"
            )
            out.append(item)
            continue
        diff = 100.0 * (te['outputs'][fuel_field] - ref) / ref
        shift = -diff / slope if slope else math.copysign(math.inf, -diff or 1.0)
        item['difference_at_value'] = diff
        check = _CHECKS.get(field_at(path).check, (lambda v: True,))[0]
        estimate = value + shift
        # A linear estimate that leaves what the input can take says only: out of reach.
        item['estimated_value'] = estimate if math.isfinite(estimate) and check(estimate) else None
        item['material'] = bool(
            not math.isfinite(shift) or abs(shift) > MATERIAL_SHIFT * abs(value)
        )
        units = f" {entry['units']}" if entry['units'] else ''
        item['message'] = (
            f"the break-even depends on the bound of {dv_path} (at its {side} bound "
            f"{entry[side]:.6g}{units}): with the bound relaxed to {relaxed:.6g}{units} the "
            f'difference at this value is {diff:+.3f} %'
            if item['material']
            else f'the break-even does not depend materially on the {side} bound of {dv_path} '
            f'(relaxed to {relaxed:.6g}{units}: the difference at this value is {diff:+.3f} %)'
        )
        out.append(item)
    return out


def explain_breakeven(config, result):
    """
    Add what holds the optimum, the bound dependence and the sensitivities to a break-even.

    Parameters
    ----------
    config : Config
        The turbo-electric configuration of the study.
    result : dict
        From :func:`voltwake.studies.breakeven.breakeven`; changed in place.

    Returns
    -------
    dict
        ``result``, with ``design_at_value`` and ``bound_dependence`` (when a break-even was
        found), ``sensitivities`` (path -> ``value``, ``units``, ``derivative``,
        ``explicit``, ``elasticity``, ``difference_per_unit``, ``block_fuel_kg``,
        ``reference_derivative``) and ``sensitivities_at`` (where they were taken and what
        they mean).
    """
    config = load_config(config)
    path = result['path']
    found = bool(result.get('found'))
    value = result['value'] if found else float(config.values[path])
    optimum = _optimum(fixed_config(config, {path: value}))
    paths = default_technology_paths(config)
    sens = optimum_sensitivities(optimum.problem, optimum, paths + [path] * (path not in paths))
    ref_fuel = result['reference_block_fuel_kg']
    fuel = sens['objective_value']
    result['sensitivities'] = {
        p: {
            **entry,
            'block_fuel_kg': fuel,
            'difference_per_unit': 100.0 * entry['derivative'] / ref_fuel,
            'reference_derivative': 0.0,
        }
        for p, entry in sens['inputs'].items()
    }
    held = _held(optimum, sens)
    result['sensitivities_at'] = {
        'design': 'the optimised turbo-electric design',
        'where': 'break-even' if found else 'configured value',
        'path': path,
        'value': value,
        'units': result.get('units'),
        'of': sens['objective'],
        'method': 'envelope theorem at the optimum: dF*/dp = dF/dp + sum of the active '
        "constraints' multipliers times their dg/dp (multipliers by least squares on the "
        'stationarity condition with the bounds held)',
        'meaning': SENSITIVITY_MEANING,
        'optimised_inputs': sens['optimised'],
        'active': held['active'],
        'multipliers': sens['multipliers'],
        'stationarity_residual': sens['residual'],
        'reference': {
            'block_fuel_kg': ref_fuel,
            'derivative': 0.0,
            'note': 'the conventional reference has no aft-fan or electrical inputs',
        },
    }
    if not found:
        return result
    result['design_at_value'] = held
    slope = result['sensitivities'].get(path, {}).get('difference_per_unit', math.nan)
    deps = bound_dependence(config, path, value, held, ref_fuel, slope)
    result['bound_dependence'] = deps
    material = [d for d in deps if d['material']]
    if material:
        result['message'] += '; ' + '; '.join(d['message'] for d in material)
    return result
