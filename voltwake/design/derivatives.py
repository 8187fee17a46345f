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


#: Largest complex-step entry below which an error is measured absolutely, not relatively.
_NEGLIGIBLE = 1e-12


def _relative(entry):
    """
    Return the worst error of one sub-Jacobian relative to its largest complex-step entry.

    Parameters
    ----------
    entry : dict
        One pair of the data of ``check_partials`` or ``check_totals``.

    Returns
    -------
    rel, err, scale : float
        Relative error (the absolute error where every complex-step entry is below
        :data:`_NEGLIGIBLE`), absolute error, and the largest complex-step entry in magnitude.
    """
    errors = entry['abs error']
    err = float(errors.forward if errors.forward is not None else errors.reverse)
    if entry.get('J_fd') is not None and np.size(entry['J_fd']):
        scale = float(np.max(np.abs(entry['J_fd'])))
    else:
        scale = float(entry['magnitude'].fd)
    return (err / scale if scale > _NEGLIGIBLE else err), err, scale


def _worst(pairs):
    """
    Return the worst of the compared pairs and how many were compared.

    Ties (every pair agreeing exactly, for one) go to the pair with the largest
    complex-step entry: the one where an error would have shown most.

    Parameters
    ----------
    pairs : iterable of (str, dict)
        Label ('<of> wrt <wrt>', with the component for partials) and check data.

    Returns
    -------
    dict
        ``relative``, ``absolute``, ``scale`` (largest complex-step entry), ``at`` (the
        label, '' when nothing was compared) and ``compared`` (number of pairs).
    """
    worst = {'relative': 0.0, 'absolute': 0.0, 'scale': 0.0, 'at': '', 'compared': 0}
    for label, entry in pairs:
        rel, err, scale = _relative(entry)
        worst['compared'] += 1
        if not worst['at'] or (rel, scale) > (worst['relative'], worst['scale']):
            worst.update(relative=rel, absolute=err, scale=scale, at=label)
    return worst


def _partial_pairs(data):
    """Yield (label, entry) of every declared sub-Jacobian of ``check_partials`` data."""
    for comp, pairs in data.items():
        for (of, wrt), entry in pairs.items():
            if 'J_fwd' not in entry and 'J_rev' not in entry:  # undeclared: zero by design
                continue
            yield f'{comp}: {of} wrt {wrt}', entry


def worst_line(worst):
    """
    Say what the worst compared pair measured, also when its error is zero.

    Parameters
    ----------
    worst : dict
        From :func:`_worst`.

    Returns
    -------
    str
        E.g. ``'worst relative error 0 (exact to round-off) at mtow wrt range, largest
        complex-step entry 1.2e+00'``.
    """
    if not worst['compared']:
        return 'no pairs compared'
    rel, scale = worst['relative'], worst['scale']
    if rel == 0.0:
        return (
            f"worst relative error 0 (exact to round-off) at {worst['at']}, largest "
            f'complex-step entry {scale:.3e}'
        )
    if scale <= _NEGLIGIBLE:
        return (
            f"worst error {worst['absolute']:.3e} (absolute: the largest complex-step entry "
            f"of the pair, {scale:.3e}, is below {_NEGLIGIBLE:g}) at {worst['at']}"
        )
    return (
        f"worst relative error {rel:.3e} at {worst['at']}, largest complex-step entry "
        f"{scale:.3e} (absolute error {worst['absolute']:.3e})"
    )


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
        ``worst_partial`` and ``worst_total`` relative errors, where they occur
        (``worst_partial_at``, ``worst_total_at``), the largest complex-step entry of those
        pairs (``worst_partial_scale``, ``worst_total_scale``) and how many pairs were
        compared (``partials_compared``, ``totals_compared``).
    """
    config = load_config(config)
    warnings.filterwarnings('ignore', category=DerivativesWarning)
    prob = build_model_problem(config, vec_size=vec_size)
    _spread(prob, config, vec_size)
    run_sizing(prob, config.has_aft_fan)
    partials = prob.check_partials(method='cs', compact_print=True, out_stream=None)
    p_worst = _worst(_partial_pairs(partials))
    count = sum(len(pairs) for pairs in partials.values())
    out(
        f'partials: {len(partials)} components, {p_worst["compared"]} declared sub-Jacobians '
        f'compared against complex step at vec_size {vec_size} ({count - p_worst["compared"]} '
        'undeclared pairs, zero by design, skipped)'
    )
    out(f'  {worst_line(p_worst)}')
    totals = check_totals_cs(prob, *checked_totals(config))
    t_worst = _worst((f'{o} wrt {w}', entry) for (o, w), entry in totals.items())
    out(
        f'totals: {t_worst["compared"]} pairs (of, wrt) of the converged model compared '
        'against complex step'
    )
    out(f'  {worst_line(t_worst)}')
    return {
        'worst_partial': p_worst['relative'],
        'worst_partial_at': p_worst['at'],
        'worst_partial_scale': p_worst['scale'],
        'partials_compared': p_worst['compared'],
        'worst_total': t_worst['relative'],
        'worst_total_at': t_worst['at'],
        'worst_total_scale': t_worst['scale'],
        'totals_compared': t_worst['compared'],
    }
