"""
Derivative checks of the assembled model.

Every component's partials against complex step, and the model's total derivatives against
complex step through fully iterated Newton solves.
"""

import warnings

import numpy as np
import openmdao.api as om
from openmdao.utils.om_warnings import DerivativesWarning

from ..configuration.loader import load_config
from .sizing import build_model_problem, run_sizing

#: Outputs and inputs whose total derivatives are checked (the wing's size enters as its area
#: or, for a wing sized to a wing loading, as that loading: see :func:`checked_totals`).
TOTALS_OF = [
    'block_fuel',
    'mtow',
    'lift_to_drag',
    'overall_efficiency',
    'wingspan',
    'wing_area',
    'takeoff_field_length',
    'climb_thrust_margin',
    'wave_drag_coefficient',
    'top_of_climb_lift_to_drag',
]
ECONOMIC_TOTALS_OF = ['economic_block_fuel', 'economic_takeoff_mass']
TOTALS_WRT = [
    'aspect_ratio',
    'wing_sweep',
    'thickness_to_chord',
    'turbofan_fan_pressure_ratio',
    'range',
    'payload',
    'altitude',
    'mach',
]
ECONOMIC_TOTALS_WRT = ['economic_range', 'economic_payload']
AFT_TOTALS_OF = [
    'power_saving_coefficient',
    'power_saving_coefficient_same_mass_flow',
    'electrical_mass',
    'aft_fan_diameter',
    'aft_fan_hub_to_tip_ratio',
    'aft_fan_installed_efficiency',
]
AFT_TOTALS_WRT = [
    'aft_thrust_fraction',
    'aft_fan_pressure_ratio',
    'cable_voltage',
    'motor_specific_power',
]


def checked_totals(config):
    """
    Return the outputs and inputs whose total derivatives are checked for a design.

    Parameters
    ----------
    config : Config
        The configuration.

    Returns
    -------
    of, wrt : list of str
        Promoted output and input names.
    """
    of = TOTALS_OF + (AFT_TOTALS_OF if config.has_aft_fan else [])
    if config.has_economic_mission:
        of = of + ECONOMIC_TOTALS_OF
    if config.model_options()['wing_sizing'] == 'loading':
        wing = ['design_wing_loading']
    else:
        of = [name for name in of if name != 'wing_area']
        wing = ['wing_area']
    wrt = wing + TOTALS_WRT + (AFT_TOTALS_WRT if config.has_aft_fan else [])
    if config.has_economic_mission:
        wrt = wrt + ECONOMIC_TOTALS_WRT
    return of, wrt


def _spread(prob, config, vec_size):
    """Give each design point slightly different inputs so that mixed-up points show."""
    for name, (value, units) in config.model_inputs().items():
        scale = 1.0 + 0.01 * (np.arange(vec_size) - (vec_size - 1) / 2.0)
        if name in ('aft_thrust_fraction', 'miscellaneous_drag_coefficient'):
            scale = 1.0 + 0.05 * np.arange(vec_size)
        prob.set_val(name, value * scale, units=units)


def check_totals_cs(prob, of=None, wrt=None, driver_scaling=False):
    """
    Check total derivatives against complex step through fully iterated Newton solves.

    A complex step from a converged state would otherwise be taken by a single Newton step,
    which propagates the imaginary part through the analytic Jacobian itself: the check would
    compare the analytic totals with themselves. Forcing the Newton iterations to continue
    (no tolerance, a fixed iteration count) lets the complex step follow the model's own
    residuals, so the comparison is independent.

    Parameters
    ----------
    prob : om.Problem
        A converged problem set up with ``force_alloc_complex=True``.
    of, wrt : list of str or None
        Outputs and inputs (default: the driver's responses and design variables).
    driver_scaling : bool
        Compare in the driver's scaled space.

    Returns
    -------
    dict
        The data of ``Problem.check_totals``.
    """
    keys = ('atol', 'rtol', 'maxiter', 'err_on_non_converge')
    solvers = [
        system.nonlinear_solver
        for system in prob.model.system_iter(include_self=True, recurse=True)
        if isinstance(system.nonlinear_solver, om.NewtonSolver)
    ]
    saved = [{key: newton.options[key] for key in keys} for newton in solvers]
    for newton in solvers:
        newton.options['atol'] = newton.options['rtol'] = 1e-300
        newton.options['maxiter'] = 25
        newton.options['err_on_non_converge'] = False
    try:
        return prob.check_totals(
            of=of,
            wrt=wrt,
            method='cs',
            compact_print=True,
            out_stream=None,
            driver_scaling=driver_scaling,
        )
    finally:
        for newton, options in zip(solvers, saved):
            for key, value in options.items():
                newton.options[key] = value
        prob.run_model()


def _relative(entry):
    """Worst error of one sub-Jacobian relative to its largest complex-step entry."""
    errors = entry['abs error']
    err = float(errors.forward if errors.forward is not None else errors.reverse)
    scale = float(entry['magnitude'].fd)
    return (err / scale if scale > 1e-12 else err), err


def _worst(data):
    worst = (0.0, '', '', 0.0)
    for comp, pairs in data.items():
        for (of, wrt), entry in pairs.items():
            if 'J_fwd' not in entry and 'J_rev' not in entry:  # undeclared: zero by design
                continue
            rel, err = _relative(entry)
            if rel > worst[0]:
                worst = (rel, comp, f'{of} wrt {wrt}', err)
    return worst


def check_derivatives(config=None, vec_size=3, out=print):
    """
    Check partials of every component and totals of the converged model.

    Parameters
    ----------
    config : Config, dict, str or None
        The configuration; None for the packaged turbo-electric demo.
    vec_size : int
        Number of (slightly different) design points in the checked model.
    out : callable
        Where to print the report lines.

    Returns
    -------
    dict
        ``worst_partial`` and ``worst_total`` relative errors and where they occur.
    """
    config = load_config(config)
    warnings.filterwarnings('ignore', category=DerivativesWarning)
    prob = build_model_problem(config, vec_size=vec_size)
    _spread(prob, config, vec_size)
    run_sizing(prob, config.has_aft_fan)
    partials = prob.check_partials(method='cs', compact_print=True, out_stream=None)
    rel, comp, pair, err = _worst(partials)
    count = sum(len(pairs) for pairs in partials.values())
    out(
        f'partials: {len(partials)} components, {count} sub-Jacobians checked against '
        f'complex step at vec_size {vec_size}'
    )
    out(f'  worst relative error {rel:.3e} ({comp}: {pair}; absolute {err:.3e})')
    totals = check_totals_cs(prob, *checked_totals(config))
    t_worst = (0.0, '')
    for (o, w), entry in totals.items():
        trel = _relative(entry)[0]
        if trel > t_worst[0]:
            t_worst = (trel, f'{o} wrt {w}')
    out(f'totals: {len(totals)} pairs of the converged model against complex step')
    out(f"  worst relative error {t_worst[0]:.3e} ({t_worst[1] or 'every pair agrees exactly'})")
    return {
        'worst_partial': rel,
        'worst_partial_at': f'{comp}: {pair}',
        'worst_total': t_worst[0],
        'worst_total_at': t_worst[1],
    }
