"""
Technology break-even and fuel-burn sensitivities of a turbo-electric design.

:func:`breakeven` finds the value of an aft-fan or electrical input (a motor specific power,
a converter efficiency...) at which the optimised turbo-electric design burns exactly the
fuel of the optimised conventional reference, by Brent's root-finding method on the
optimised fuel-burn difference. :func:`technology_sensitivities` gives the derivative and the
elasticity of block fuel with respect to the technology inputs of the analysed design, from
the model's analytic total derivatives.
"""

import math

import numpy as np
from openmdao.utils.units import convert_units, unit_conversion
from scipy.optimize import brentq

from ..configuration.loader import _CHECKS, field_at, load_config
from ..design.fields import fuel_burn_field
from ..design.sizing import build_model_problem, run_sizing
from ..errors import ConfigError, OptimizationError
from .parallel import map_jobs
from .target_sweep import fixed_config, optimize_job

#: Config sections whose inputs the conventional reference does not have.
TECHNOLOGY_SECTIONS = ('aft_fan', 'electrical')

#: Default break-even tolerance on the input, as a fraction of the search interval.
XTOL_FRACTION = 1e-5


def _technology_field(config, path):
    """Return the schema field of a numeric aft-fan or electrical input, or raise."""
    field = field_at(path)
    if (
        field is None
        or path.split('.')[0] not in TECHNOLOGY_SECTIONS
        or field.kind not in ('quantity', 'number')
        or not field.target
    ):
        raise ConfigError(
            'expected a numeric input of the aft_fan or electrical section '
            "(such as 'electrical.motor.specific_power'); the conventional "
            'reference must not depend on it',
            source=config.source,
            path=path,
        )
    return field


def _turbo_electric(config):
    config = load_config(config)
    if not config.has_aft_fan:
        raise ConfigError(
            'this design has no aft fan; a technology study needs the '
            "'aft_fan' and 'electrical' sections",
            source=config.source,
        )
    return config


def breakeven(config, path, lower, upper, jobs=None, xtol=None):
    """
    Find the value of a technology input at which both optimised designs burn the same fuel.

    The difference ``d(x) = 100 (F(x) - F_ref) / F_ref`` (percent) between the optimised block
    fuel ``F(x)`` of the turbo-electric design with the input fixed at ``x`` and that of the
    optimised conventional reference ``F_ref`` (same objective and constraints, no aft fan; it
    does not depend on ``x`` and is optimised once) is solved for ``d(x) = 0`` by Brent's
    method (``scipy.optimize.brentq``). The reference and both ends are optimised in
    parallel with :func:`voltwake.parallel.map_jobs`; the inner iterations are sequential.

    Parameters
    ----------
    config : Config, dict, str or None
        The turbo-electric configuration (with an ``optimization`` section).
    path : str
        Dotted key path of a numeric ``aft_fan`` or ``electrical`` input, e.g.
        ``'electrical.motor.specific_power'`` (W/kg) or ``'electrical.motor.efficiency'``.
        If it is a design variable it is taken out of the design variables.
    lower, upper : float
        Search interval, SI.
    jobs : int or None
        Local processes for the first three optimisations; None for all cores.
    xtol : float or None
        Absolute tolerance on the value (SI); None for ``1e-5 (upper - lower)``.

    Returns
    -------
    dict
        ``found``, ``message``, ``path``, ``units``, ``value`` (NaN when not found),
        ``difference_at_value`` (percent), ``lower``, ``upper``, ``difference_at_lower``,
        ``difference_at_upper``, ``reference_block_fuel_kg`` and ``evaluations`` (a list of
        {value, difference, block_fuel_kg} in the order evaluated). ``found`` is False, with
        a message, when the difference has the same sign at both ends.

    Raises
    ------
    OptimizationError
        When the reference or the design cannot be optimised at a value it needs.
    """
    config = _turbo_electric(config)
    field = _technology_field(config, path)
    lower, upper = float(lower), float(upper)
    if not lower < upper:
        raise ConfigError(
            f'lower bound {lower:g} is not below upper bound {upper:g}',
            source=config.source,
            path=path,
        )
    xtol = XTOL_FRACTION * (upper - lower) if xtol is None else float(xtol)

    reference = config.without_aft_fan()
    jobs_list = [{'data': reference.data}] + [
        {'data': fixed_config(config, {path: x}).data} for x in (lower, upper)
    ]
    ref, at_lower, at_upper = map_jobs(optimize_job, jobs_list, jobs=jobs)
    if not ref['success']:
        raise OptimizationError(f"optimising the conventional reference failed: {ref['message']}")
    fuel_field = fuel_burn_field(config)
    ref_fuel = ref['outputs'][fuel_field]
    evaluations, cache = [], {}
    units = f' {field.units}' if field.units else ''

    def record(x, res):
        if not res['success']:
            raise OptimizationError(
                f"optimising the design with {path} = {x:g}{units} failed: {res['message']}"
            )
        fuel = res['outputs'][fuel_field]
        diff = 100.0 * (fuel - ref_fuel) / ref_fuel
        evaluations.append({'value': x, 'difference': diff, 'block_fuel_kg': fuel})
        cache[x] = diff
        return diff

    def difference(x):
        x = float(x)
        if x not in cache:
            [res] = map_jobs(optimize_job, [{'data': fixed_config(config, {path: x}).data}], jobs=1)
            record(x, res)
        return cache[x]

    d_lower, d_upper = record(lower, at_lower), record(upper, at_upper)
    out = {
        'found': False,
        'path': path,
        'units': field.units,
        'value': math.nan,
        'difference_at_value': math.nan,
        'lower': lower,
        'upper': upper,
        'difference_at_lower': d_lower,
        'difference_at_upper': d_upper,
        'reference_block_fuel_kg': ref_fuel,
        'fuel_burn_measured_on': fuel_field,
        'evaluations': evaluations,
    }
    if d_lower * d_upper > 0.0:
        out['trend'] = no_breakeven_trend(out)
        out['message'] = no_breakeven_message(out)
        return out
    value = brentq(difference, lower, upper, xtol=xtol)
    out.update(
        found=True,
        value=value,
        difference_at_value=difference(value),
        message=f'break-even at {path} = {value:.6g}{units}',
    )
    return out


def no_breakeven_trend(result):
    """
    Return what the ends of an interval without a break-even say about a wider one.

    The fuel-burn difference is compared at the two ends: the gap to zero narrows toward the
    end where it is smaller. A straight line through the two ends gives where it would reach
    zero: an extrapolation, not a result (the optimised difference is not linear in the
    input; a specific power, for instance, acts through a mass that goes as its inverse).

    Parameters
    ----------
    result : dict
        A break-even result with ``path``, ``lower``, ``upper``, ``difference_at_lower`` and
        ``difference_at_upper``.

    Returns
    -------
    dict
        ``winner`` ('reference' or 'turbo-electric'), ``narrows_toward`` ('lower', 'upper'
        or None when the difference does not change), ``straight_line_zero`` (SI, None when
        flat) and ``straight_line_zero_possible`` (whether the input can take that value).
    """
    lo, hi = result['lower'], result['upper']
    d_lo, d_hi = result['difference_at_lower'], result['difference_at_upper']
    trend = {
        'winner': 'reference' if d_lo > 0.0 else 'turbo-electric',
        'narrows_toward': None,
        'straight_line_zero': None,
        'straight_line_zero_possible': None,
    }
    if abs(d_hi - d_lo) <= 1e-9 * max(abs(d_lo), abs(d_hi)):
        return trend
    trend['narrows_toward'] = 'upper' if abs(d_hi) < abs(d_lo) else 'lower'
    zero = lo - d_lo * (hi - lo) / (d_hi - d_lo)
    trend['straight_line_zero'] = zero
    field = field_at(result['path'])
    check = _CHECKS.get(getattr(field, 'check', None))
    trend['straight_line_zero_possible'] = bool(check[0](zero)) if check else True
    return trend


def no_breakeven_message(result):
    """
    Return the one-line answer of a break-even study that found none in its interval.

    Parameters
    ----------
    result : dict
        A break-even result (with ``display``, the values in the unit the user wrote, when
        there is one).

    Returns
    -------
    str
        The difference at both ends, which design wins throughout and the trend.
    """
    trend = result.get('trend') or no_breakeven_trend(result)
    shown = result.get('display') or {}
    si = result.get('units')
    units = shown.get('units') or si or ''

    def fmt(value):
        if shown.get('units') and si:
            value = float(convert_units(value, si, shown['units']))
        return f'{value:.4g}{" " + units if units else ""}'

    lo, hi = result['lower'], result['upper']
    d_lo, d_hi = result['difference_at_lower'], result['difference_at_upper']
    who = (
        'the optimised conventional reference burns less fuel'
        if trend['winner'] == 'reference'
        else 'the optimised turbo-electric design burns less fuel'
    )
    text = (
        f"no break-even of {result['path']} in [{fmt(lo)}, {fmt(hi)}]: {who} at both ends "
        f'(difference {d_lo:+.2f} % at {fmt(lo)}, {d_hi:+.2f} % at {fmt(hi)})'
    )
    side = trend['narrows_toward']
    if side is None:
        return text + '; the difference does not change over the interval'
    zero = trend['straight_line_zero']
    text += f'; the gap narrows toward the {side} end'
    if not trend['straight_line_zero_possible']:
        return text + (
            f'; a straight line through the ends would reach zero at {fmt(zero)}, a value '
            'the input cannot take: widening the interval cannot find a break-even'
        )
    return text + (
        f'; a straight line through the ends would reach zero near {fmt(zero)} (an '
        f'extrapolation, not a result): widening the interval '
        f'{"upward" if side == "upper" else "downward"} could find one, if such values are '
        'plausible'
    )


def default_technology_paths(config):
    """
    Return the technology inputs of a configuration.

    Parameters
    ----------
    config : Config
        A turbo-electric configuration.

    Returns
    -------
    list of str
        Every ``electrical.*.specific_power`` and ``electrical.*.efficiency``,
        ``electrical.cable.voltage`` and ``aft_fan.fan_efficiency``, in config order.
    """
    out = []
    for path in config.values:
        parts = path.split('.')
        section, key = parts[0], parts[-1]
        if (section == 'electrical' and key in ('specific_power', 'efficiency')) or path in (
            'electrical.cable.voltage',
            'aft_fan.fan_efficiency',
        ):
            out.append(path)
    return out


def technology_sensitivities(config, paths=None):
    """
    Return d(block fuel)/d(input) and the elasticity of block fuel for technology inputs.

    The derivatives are the analytic total derivatives of the converged sizing model at the
    configured design (not re-optimised): ``dF/dx`` in kg per SI unit of ``x`` and the
    elasticity ``(x / F) dF/dx`` (percent block-fuel change per percent input change).

    Parameters
    ----------
    config : Config, dict, str or None
        A turbo-electric configuration.
    paths : list of str or None
        Dotted key paths of numeric aft-fan or electrical inputs; None for
        :func:`default_technology_paths`.

    Returns
    -------
    dict
        Path -> {``value`` (SI), ``units``, ``derivative`` (kg per SI unit),
        ``elasticity``, ``block_fuel_kg``}.
    """
    config = _turbo_electric(config)
    paths = default_technology_paths(config) if paths is None else list(paths)
    targets = {}
    for path in paths:
        targets[path] = _technology_field(config, path).target
    prob = build_model_problem(config)
    run_sizing(prob, True)
    fuel = float(np.real(prob.get_val('block_fuel', units='kg')[0]))
    meta = prob.model.get_io_metadata(iotypes='output', metadata_keys=['units'], get_remote=True)
    units = next(info['units'] for info in meta.values() if info['prom_name'] == 'block_fuel')
    factor = unit_conversion(units, 'kg')[0] if units else 1.0
    totals = prob.compute_totals(of=['block_fuel'], wrt=list(targets.values()))
    out = {}
    for path, target in targets.items():
        value = config.values[path]
        deriv = factor * float(np.real(totals['block_fuel', target][0, 0]))
        out[path] = {
            'value': value,
            'units': field_at(path).units,
            'derivative': deriv,
            'elasticity': deriv * value / fuel,
            'block_fuel_kg': fuel,
        }
    return out
