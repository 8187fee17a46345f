"""
Post-optimality sensitivities: how the optimum objective moves with a fixed input.

At a constrained optimum ``x*(p)`` of ``f(x, p)`` subject to the active constraints
``g_i(x, p)`` and design-variable bounds, the optimum value ``f*(p) = f(x*(p), p)`` has the
derivative of the Lagrangian (the envelope theorem of nonlinear programming; *Numerical
Optimization*, 2nd ed., 2006, section 12.8 "Sensitivity" - from memory):

    d f*/d p = d L/d p = ∂f/∂p + Σ_i λ_i ∂g_i/∂p,

with the multipliers ``λ`` of the active constraints from the stationarity condition
``∇_x f + Σ_i λ_i ∇_x g_i + Σ_j μ_j e_j = 0`` (``e_j`` the unit vector of a design variable
held at a bound; bounds do not depend on ``p``). :func:`kkt_multipliers` solves that
condition for ``λ`` and ``μ`` by linear least squares from the model's analytic total
derivatives; :func:`optimum_sensitivities` applies the formula. The derivative holds while
the active set does not change; a constraint whose multiplier has the wrong sign for its
side is reported (``wrong_sign``): the optimum would leave it, and the two one-sided
derivatives differ.
"""

import numpy as np
from openmdao.utils.units import unit_conversion

from ..configuration.loader import field_at

#: Relative stationarity residual above which the multipliers do not explain the optimum.
STATIONARITY_TOLERANCE = 1e-3


def _model_units(prob, name):
    """Return the units of a promoted output of the model."""
    meta = prob.model.get_io_metadata(iotypes='output', metadata_keys=['units'], get_remote=True)
    return next(info['units'] for info in meta.values() if info['prom_name'] == name)


def _bound_side(value, lower, upper):
    """Return 'lower' or 'upper' for the bound ``value`` sits on (the nearer one)."""
    return 'lower' if abs(value - lower) <= abs(value - upper) else 'upper'


def kkt_multipliers(prob, result, wrt_extra=()):
    """
    Return the multipliers of the active constraints and bounds at an optimum.

    Parameters
    ----------
    prob : om.Problem
        The optimisation problem at its final point (``OptimizationResult.problem``).
    result : OptimizationResult
        The optimisation's outcome (design variables and constraints with ``active``).
    wrt_extra : sequence of str
        Further promoted model inputs whose total derivatives are wanted as well.

    Returns
    -------
    dict
        ``objective`` (promoted output), ``active`` (constraint names), ``bounds`` (config key
        path -> 'lower' or 'upper'), ``multipliers`` (name -> λ in objective units per
        constraint unit, for ``f + Σ λ g``), ``bound_multipliers`` (path -> μ per SI unit of
        the variable), ``wrong_sign`` (active constraints whose multiplier has the sign of a
        constraint the optimum would leave), ``residual`` (the stationarity residual relative
        to the objective gradient, both per unit of the variables' ranges) and ``totals``
        (the total derivatives computed, OpenMDAO's dict form).
    """
    driver = prob.driver
    dvs = driver.design_variables
    objective = next(iter(driver.get_objective_values()))
    cons = {c.name: c for c in driver.spec_constraints}
    active = [name for name, con in result.constraints.items() if con['active']]
    bounds = {
        dv.path: _bound_side(result.design[dv.path]['si']['value'], dv.lower, dv.upper)
        for dv in dvs
        if result.design[dv.path]['active']
    }
    wrt = [dv.target for dv in dvs] + [t for t in wrt_extra if t not in {d.target for d in dvs}]
    totals = prob.compute_totals(of=[objective, *active], wrt=wrt, return_format='dict')
    span = np.array([dv.upper - dv.lower for dv in dvs])

    def grad(of):
        return np.array([float(np.real(totals[of][dv.target][0, 0])) for dv in dvs]) * span

    g_f = grad(objective)
    columns = [grad(name) for name in active]
    for path in bounds:
        e = np.zeros(len(dvs))
        e[[dv.path for dv in dvs].index(path)] = 1.0
        columns.append(e)
    lam = np.zeros(0)
    residual = 1.0 if np.any(g_f) else 0.0
    if columns:
        a = np.column_stack(columns)
        norms = np.linalg.norm(a, axis=0)
        norms[norms == 0.0] = 1.0
        scaled, *_ = np.linalg.lstsq(a / norms, -g_f, rcond=None)
        lam = scaled / norms
        residual = float(np.linalg.norm(g_f + a @ lam) / max(np.linalg.norm(g_f), 1e-300))
    elif not np.any(g_f):
        residual = 0.0
    else:
        residual = 1.0
    multipliers = dict(zip(active, lam[: len(active)].tolist()))
    bound_multipliers = {
        path: float(m) / (dv.upper - dv.lower)
        for (path, m), dv in zip(
            zip(bounds, lam[len(active) :]), [d for d in dvs if d.path in bounds]
        )
    }
    wrong_sign = []
    for name, lam_i in multipliers.items():
        con = cons[name]
        if con.equals is not None:
            continue
        value = result.constraints[name]['si']['value']
        side = (
            'upper'
            if con.lower is None
            else 'lower'
            if con.upper is None
            else _bound_side(value, con.lower, con.upper)
        )
        # For f + λ g at a minimum: λ >= 0 on an upper bound, λ <= 0 on a lower bound.
        scale = max(abs(v) for v in multipliers.values()) or 1.0
        if (side == 'upper' and lam_i < -1e-6 * scale) or (
            side == 'lower' and lam_i > 1e-6 * scale
        ):
            wrong_sign.append(name)
    return {
        'objective': objective,
        'active': active,
        'bounds': bounds,
        'multipliers': multipliers,
        'bound_multipliers': bound_multipliers,
        'wrong_sign': wrong_sign,
        'residual': residual,
        'totals': totals,
    }


def optimum_sensitivities(prob, result, paths):
    """
    Return d(optimum objective)/d(input) for fixed inputs, by the envelope theorem.

    Parameters
    ----------
    prob : om.Problem
        The optimisation problem at its final point (``OptimizationResult.problem``).
    result : OptimizationResult
        The optimisation's outcome.
    paths : sequence of str
        Config key paths of numeric inputs. Those that are design variables of this
        optimisation are not fixed inputs: they are listed under ``optimised`` instead.

    Returns
    -------
    dict
        ``objective``, ``objective_kg`` (the optimum objective in kg when it is a mass, else
        in its own units) and ``objective_units``; ``inputs``: path -> {``value`` (SI),
        ``units`` (SI), ``derivative`` (objective units per SI unit of the input, at the
        optimum, the design re-optimised), ``explicit`` (``∂f/∂p`` alone: the design held),
        ``elasticity`` (percent objective per percent input)}; ``optimised``: the paths that
        are design variables; and the multipliers of :func:`kkt_multipliers` (without the
        totals).
    """
    dv_paths = {dv.path for dv in prob.driver.design_variables}
    fixed = [p for p in paths if p not in dv_paths]
    targets = {p: field_at(p).target for p in fixed}
    kkt = kkt_multipliers(prob, result, wrt_extra=list(targets.values()))
    totals = kkt.pop('totals')
    objective = kkt['objective']
    units = _model_units(prob, objective)
    factor, shown = 1.0, units
    try:
        factor, shown = unit_conversion(units, 'kg')[0], 'kg'
    except (TypeError, ValueError, KeyError):  # not a mass: kept in its own units
        pass
    value = factor * float(np.real(prob.get_val(objective)[0]))
    inputs = {}
    for path, target in targets.items():
        explicit = float(np.real(totals[objective][target][0, 0]))
        total = explicit + sum(
            lam * float(np.real(totals[name][target][0, 0]))
            for name, lam in kkt['multipliers'].items()
        )
        x = float(np.real(prob.get_val(target)[0]))
        inputs[path] = {
            'value': x,
            'units': field_at(path).units,
            'derivative': factor * total,
            'explicit': factor * explicit,
            'elasticity': factor * total * x / value if value else float('nan'),
        }
    return {
        'objective': objective,
        'objective_value': value,
        'objective_units': shown,
        'inputs': inputs,
        'optimised': [p for p in paths if p in dv_paths],
        **kkt,
    }
