"""
Build the sizing model of a configuration, run it, and say why a design does not close.

The lowest layer of running a design: :mod:`voltwake.design.analysis`,
:mod:`voltwake.design.batch` and :mod:`voltwake.design.optimization` build on it.
"""

import numpy as np
import openmdao.api as om
from openmdao.core.analysis_error import AnalysisError

from voltwake.models.aircraft import AircraftModel

from ..configuration.loader import load_config
from ..errors import NotClosedError


def build_model_problem(config, vec_size=1, driver=None):
    """
    Return a set-up OpenMDAO problem of the sizing model with the configured inputs set.

    Parameters
    ----------
    config : Config, dict, str or None
        The configuration (see :func:`voltwake.load_config`).
    vec_size : int
        Number of design points solved at once (all start from the configured values).
    driver : om.Driver or None
        Driver to attach before setup.

    Returns
    -------
    om.Problem
        The problem, set up, with inputs set and an initial guess in place.
    """
    config = load_config(config)
    model = AircraftModel(vec_size=vec_size, **config.model_options())
    prob = om.Problem(model, reports=False)
    if driver is not None:
        prob.driver = driver
    set_model_inputs(prob, config, setup=True)
    return prob


def set_model_inputs(prob, config, setup=False):
    """
    Set every configured input of the model, declaring their defaults before setup.

    Parameters
    ----------
    prob : om.Problem
        The problem (not yet set up when ``setup`` is True).
    config : Config
        The configuration.
    setup : bool
        Declare input defaults, set up the problem, then set values.
    """
    size = prob.model.options['vec_size']
    inputs = {
        name: (np.full(size, value), units)
        for name, (value, units) in config.model_inputs().items()
    }
    if setup:
        for name, (value, units) in inputs.items():
            prob.model.set_input_defaults(name, value, units=units)
        prob.setup(force_alloc_complex=True)
    for name, (value, units) in inputs.items():
        prob.set_val(name, value, units=units)


_CLOSED = 'the sizing loop did not close: '


_NO_CONVERGENCE = 'no convergence'


#: Checks of a converged state, in order: (test of the point, reason when it fails).
_CHECKS = [
    (
        lambda v, aft: v('turbofan_specific_thrust') > 0,
        'the under-wing fan gives no thrust (jet velocity not above flight speed; raise the fan '
        'pressure ratio)',
    ),
    (
        lambda v, aft: v('aft_specific_thrust') > 0 if aft else True,
        'the aft fan gives no thrust (jet velocity not above the ingested flow velocity; raise '
        'its pressure ratio)',
    ),
    (
        lambda v, aft: np.isfinite(v('mtow')) & (v('mtow') <= 50.0 * v('payload')),
        'MTOW ran away (weight grows without bound)',
    ),
    (
        lambda v, aft: (v('mtow') > 0) & (v('total_fuel') > 0) & (v('oew') > 0),
        'no positive MTOW satisfies the mass balance (weight grows without bound)',
    ),
    (
        lambda v, aft: v('capture_height') > 0 if aft else True,
        'no capture height satisfies the aft-fan mass flow',
    ),
    (
        lambda v, aft: v('cable_efficiency') > 0 if aft else True,
        'the cable loses all the power it carries',
    ),
    (lambda v, aft: v('lift_to_drag') > 0, 'no positive lift-to-drag ratio'),
]


#: Extra checks of the last finite state of a solve that failed: fans whose specific thrust
#: is a small fraction of the flight speed need enormous mass flows, and the design runs away.
_FAILED_CHECKS = [
    (
        lambda v, aft: v('turbofan_specific_thrust') > 0.05 * v('true_airspeed'),
        'the under-wing fan gives almost no thrust per unit mass flow, so the engines grow '
        'without bound (raise the fan pressure ratio)',
    ),
    (
        lambda v, aft: v('aft_specific_thrust') > 0.05 * v('true_airspeed') if aft else True,
        'the aft fan gives no thrust worth having (jet barely faster than the ingested flow), so '
        'it grows without bound (raise its pressure ratio)',
    ),
]


def closure_reasons(prob, aft_fan, failed=False):
    """
    Say, point by point, why a design did not close, from the state a solve left behind.

    Parameters
    ----------
    prob : om.Problem
        The problem after a solve (failed or not).
    aft_fan : bool
        Whether the design has an aft fan.
    failed : bool
        The solve failed: also apply the diagnostics of a runaway.

    Returns
    -------
    list of str or None
        One entry per design point: a one-line reason, or None when the state is physical.
    """

    def val(name):
        return np.real(prob.get_val(name))

    size = prob.model.options['vec_size']
    reasons = [None] * size
    checks = _CHECKS[:2] + (_FAILED_CHECKS if failed else []) + _CHECKS[2:]
    with np.errstate(all='ignore'):
        for test, reason in checks:
            ok = np.broadcast_to(np.asarray(test(val, aft_fan)), (size,))
            for i in np.flatnonzero(~ok):
                if reasons[i] is None:
                    reasons[i] = _CLOSED + reason
    return reasons


def closure_problem(prob, aft_fan, failed=False):
    """
    Say why a design did not close, from the state the failed solve left behind.

    Parameters
    ----------
    prob : om.Problem
        The problem after a failed or suspicious solve.
    aft_fan : bool
        Whether the design has an aft fan.
    failed : bool
        The solve failed: also apply the diagnostics of a runaway.

    Returns
    -------
    str or None
        A one-line reason (the first failing point's), or None when every point is physical.
    """
    reasons = [r for r in closure_reasons(prob, aft_fan, failed) if r is not None]
    if not reasons:
        return None
    if 'MTOW ran away' in reasons[0]:
        mtow = np.real(prob.get_val('mtow'))
        return reasons[0].replace('MTOW ran away', f'MTOW ran away to {np.max(mtow):.4g} kg')
    return reasons[0]


def run_sizing(prob, aft_fan):
    """
    Run the model and raise :class:`NotClosedError` with a reason when it does not close.

    Parameters
    ----------
    prob : om.Problem
        The set-up problem.
    aft_fan : bool
        Whether the design has an aft fan.

    Returns
    -------
    int
        Newton iterations used.
    """
    solver = prob.model.sizing.nonlinear_solver
    try:
        with np.errstate(all='ignore'):
            prob.run_model()
    except AnalysisError:
        # Diagnose from the last state in which every value was finite.
        solver.restore_last_finite()
        reason = closure_problem(prob, aft_fan, failed=True)
        if reason is None:
            mtow = np.real(prob.get_val('mtow'))
            reason = (
                _CLOSED + _NO_CONVERGENCE + ' within '
                f"{solver.options['maxiter']} Newton iterations (MTOW "
                f'{np.max(mtow):,.6g} kg at the last finite iterate)'
            )
        raise NotClosedError(reason) from None
    reason = closure_problem(prob, aft_fan)
    if reason:
        raise NotClosedError(reason)
    return solver._iter_count
