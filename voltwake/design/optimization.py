"""
Optimisation of a configured aircraft against fuel burn (or another output).

The performance constraints come from its ``optimization`` section; OpenMDAO's
ScipyOptimizeDriver uses the model's analytic total derivatives.
"""

import contextlib
import dataclasses
import difflib
import io
import sys
import warnings

import numpy as np
import openmdao.api as om
from openmdao.core.analysis_error import AnalysisError

from voltwake.models.aircraft import AircraftModel

from ..configuration.loader import load_config
from ..errors import ConfigError, InterruptedRun, NotClosedError
from .constraints import (
    FEASIBILITY_TOLERANCE,
    _active,
    _where,
    constraint_table,
    constraints,
    design_variables,
    in_units,
)
from .feasibility import (
    FAILED,
    INFEASIBLE,
    OPTIMUM,
    least_infeasible,
    violation_words,
    violations,
)
from .fields import read_fields
from .sizing import build_model_problem, closure_problem, run_sizing, set_model_inputs

#: Objective shortcuts -> promoted model output.
OBJECTIVES = {
    'block_fuel': 'block_fuel',
    'mtow': 'mtow',
    'block_energy': 'block_energy',
    'total_energy': 'block_energy',
    'total_fuel': 'total_fuel',
    'economic_block_fuel': 'economic_block_fuel',
    'economic_block_energy': 'economic_block_energy',
}


def _parity(perm):
    """Return +1 for an even permutation, -1 for an odd one."""
    seen = np.zeros(len(perm), dtype=bool)
    cycles = 0
    for start in range(len(perm)):
        if not seen[start]:
            cycles += 1
            j = start
            while not seen[j]:
                seen[j] = True
                j = perm[j]
    return -1 if (len(perm) - cycles) % 2 else 1


def jacobian_sign(solver):
    """
    Return the sign of the determinant of the last Jacobian a direct solver factorised.

    The sizing loop's mass balance can have two roots at the same inputs: the aircraft
    designers mean, and a far heavier one flying high up its drag polar, where adding payload
    would lower MTOW (a negative growth factor). The roots meet at a fold where the Jacobian
    is singular, so the sign of its determinant differs between them. From the LU factors
    P_r A P_c = L U with unit-diagonal L: sign det A = sign(prod diag U) parity(P_r)
    parity(P_c).

    Parameters
    ----------
    solver : om.DirectSolver
        A direct solver after a linearisation of a single-point model.

    Returns
    -------
    int
        +1 or -1, or 0 when the factors are not available.
    """
    lu = getattr(solver, '_lu', None)
    if lu is None or not hasattr(lu, 'U'):
        return 0
    sign = np.prod(np.sign(np.real(lu.U.diagonal())))
    return int(sign * _parity(lu.perm_r) * _parity(lu.perm_c))


class SizingOptimizeDriver(om.ScipyOptimizeDriver):
    """
    ScipyOptimizeDriver that survives trial points where the sizing loop does not close.

    Each model evaluation starts from the last converged state; a trial point that still
    does not close, or that closes on the heavy root of the mass balance (see
    :func:`jacobian_sign`), is counted (``failed_points``) and its outputs are left as found.

    Parameters
    ----------
    **kwargs : dict of keyword arguments
        Keyword arguments that will be mapped into the Driver options.
    """

    def __init__(self, **kwargs):
        super().__init__(**kwargs)
        self.failed_points = 0
        self.evaluations = 0
        self.history = []
        self.on_evaluation = None
        self._last_good = None
        self._first_good = None
        self._branch = None
        self.spec_constraints = []
        self.design_variables = []
        self.start_note = ''

    def _run_solve_nonlinear(self):
        model = self._problem().model
        loop = model.sizing
        self.evaluations += 1
        newton = loop.nonlinear_solver
        closed = False
        # From the last converged state plain Newton steps suffice; if they fail, solve again
        # from that state with the sub-system sweeps that make the solve robust, and last from
        # the first converged state (the start).
        attempts = [(self._last_good, False), (self._last_good, True), (self._first_good, True)]
        if self._last_good is None:
            attempts = [(None, True)]
        for state, sweeps in attempts:
            if state is not None:  # the loop's states only, not the design variables
                loop._outputs.set_val(state)
            newton.options['solve_subsystems'] = sweeps
            try:
                with np.errstate(all='ignore'):
                    super()._run_solve_nonlinear()
                closed = closure_problem(self._problem(), model.options['aft_fan']) is None
            except AnalysisError:
                closed = False
            finally:
                newton.options['solve_subsystems'] = True
            branch = jacobian_sign(loop.linear_solver) if closed else 0
            if closed and self._branch is None and branch:
                self._branch = branch  # the root of the first closed evaluation
            elif closed and branch and branch != self._branch:
                # The mass balance has a second, heavy root: an aircraft so heavy that it
                # flies far up its drag polar and needs the extra fuel that makes it heavy
                # (there, adding payload would lower MTOW: a negative growth factor). The
                # fold between the roots is where the loop's Jacobian is singular, so the
                # sign of its determinant tells the roots apart.
                closed = False
            if closed:
                break
        if closed:
            self._last_good = loop._outputs.asarray().copy()
            if self._first_good is None:
                self._first_good = self._last_good
        else:
            self.failed_points += 1
        self._log(closed)

    def _log(self, closed):
        prob = self._problem()
        paths = {dv.target: dv.path for dv in self.design_variables}
        objective = float(
            np.real(list(self.get_objective_values(driver_scaling=False).values())[0][0])
        )
        worst = 0.0
        for con in self.spec_constraints:
            value = float(np.real(prob.get_val(con.name, units=con.units)[0]))
            worst = max(worst, con.violation(value))
        entry = {
            'evaluation': self.evaluations,
            'objective': objective,
            'max_violation': worst,
            'closed': closed,
            'design': {
                paths.get(name, name): float(np.real(val[0]))
                for name, val in self.get_design_var_values(driver_scaling=False).items()
            },
        }
        self.history.append(entry)
        if self.on_evaluation is not None:
            self.on_evaluation(entry)


def build_problem(config, overrides=None, recorder_path=None):
    """
    Return the optimisation problem of a configuration, set up and ready to run.

    Parameters
    ----------
    config : Config, dict, str or None
        The configuration (its ``optimization`` section is required).
    overrides : dict or list of str or None
        Dotted key path -> value applied before validation.
    recorder_path : str or None
        Where to write an OpenMDAO SqliteRecorder case file of the driver iterations.

    Returns
    -------
    om.Problem
        The problem, with design variables, constraints and objective added. Its driver
        (a :class:`SizingOptimizeDriver`) carries ``design_variables`` and ``constraints``.
    """
    config = load_config(config, overrides)
    if 'optimization.design_variables' not in config.values:
        raise ConfigError(
            "no 'optimization' section; expected design_variables, constraints and an objective",
            source=config.source,
        )
    probe = build_model_problem(config)
    cons = constraints(config, probe)
    dvs = design_variables(config, config.model_inputs())
    objective = config.values['optimization.objective']
    target = OBJECTIVES.get(objective, objective)
    outputs = _outputs(probe)
    if target.startswith('economic_') and not config.has_economic_mission:
        raise ConfigError(
            f"objective '{objective}' needs an 'economic_mission' section (range and payload)",
            **_where(config, 'optimization.objective'),
        )
    if target not in outputs:
        close = difflib.get_close_matches(target, list(outputs), n=1)
        hint = f" (did you mean '{close[0]}'?)" if close else ''
        raise ConfigError(f'not a model output{hint}', **_where(config, 'optimization.objective'))
    probe, config, note = _closing_start(probe, config, dvs)
    start = abs(float(np.real(probe.get_val(target)[0])))

    driver = SizingOptimizeDriver(
        optimizer=config.values['optimization.optimizer.method'],
        tol=config.values['optimization.optimizer.tolerance'],
        maxiter=config.values['optimization.optimizer.max_iterations'],
        disp=False,
    )
    driver.design_variables, driver.spec_constraints, driver.config = dvs, cons, config
    driver.start_note = note
    prob = om.Problem(AircraftModel(vec_size=1, **config.model_options()), reports=False)
    prob.driver = driver
    for dv in dvs:
        prob.model.add_design_var(
            dv.target,
            lower=dv.lower,
            upper=dv.upper,
            units=dv.units,
            ref0=dv.lower if dv.ref0 is None else dv.ref0,
            ref=dv.upper if dv.ref is None else dv.ref,
        )
    for con in cons:
        scale = max(abs(b) for b in (con.lower, con.upper, con.equals) if b is not None)
        prob.model.add_constraint(
            con.name,
            lower=con.lower,
            upper=con.upper,
            equals=con.equals,
            units=con.units,
            ref=max(scale, 1.0),
        )
    prob.model.add_objective(target, ref=start if start > 0 else 1.0)
    if recorder_path:
        driver.add_recorder(om.SqliteRecorder(recorder_path))
        for key in ('record_desvars', 'record_objectives', 'record_constraints'):
            driver.recording_options[key] = True
    set_model_inputs(prob, config, setup=True)
    return prob


def _closing_start(probe, config, dvs):
    """
    Return a converged problem at the start, moving the start if it does not close.

    A start that does not close is walked toward the centre of the design-variable bounds
    (25, 50, 75 and 100 % of the way) until the sizing loop closes.
    """
    try:
        run_sizing(probe, config.has_aft_fan)
        return probe, config, ''
    except NotClosedError as err:
        first = err.message
    values = {dv.path: float(config.values[dv.path]) for dv in dvs}
    for step in (0.25, 0.5, 0.75, 1.0):
        moved = {
            dv.path: values[dv.path] + step * (0.5 * (dv.lower + dv.upper) - values[dv.path])
            for dv in dvs
        }
        trial = config.with_overrides(moved)
        probe = build_model_problem(trial)
        try:
            run_sizing(probe, trial.has_aft_fan)
        except NotClosedError:
            continue
        return (
            probe,
            trial,
            (
                f'the configured start does not close ({first}); started '
                f'{100 * step:.0f}% of the way to the centre of the bounds'
            ),
        )
    raise NotClosedError(
        f'the starting design does not close ({first}), nor does any point '
        'between it and the centre of the design-variable bounds'
    )


def _outputs(prob):
    meta = prob.model.get_io_metadata(iotypes='output', get_remote=True)
    return {info['prom_name'] for info in meta.values()}


@dataclasses.dataclass
class OptimizationResult:
    """
    Outcome of an optimisation.

    Parameters
    ----------
    success : bool
        True only when the optimiser reports success and the final point is feasible.
    message : str
        The optimiser's message (and why the run is not a success, if it is not).
    design : dict
        Config key path -> {value, lower, upper, units, active, si}: in the unit the user wrote
        the bounds in, and under ``si`` in SI.
    constraints : dict
        Constraint output -> {value, lower, upper, equals, units, active, violation}.
    outputs : dict
        The same fields as :func:`voltwake.analyze` at the final point.
    start : dict
        The same fields at the configured (starting) design.
    history : list of dict
        One entry per model evaluation: objective, worst violation, closed, design.
    failed_points : int
        Trial points at which the sizing loop did not close.
    evaluations : int
        Model evaluations.
    objective : str
        Name of the objective output.
    best_feasible : dict or None
        The history entry with the least objective among closed, feasible evaluations.
    inputs : dict
        The configuration as given (after overrides).
    problem : om.Problem or None
        The OpenMDAO problem at the final point.
    status : str
        'optimum' (a feasible optimum), 'infeasible' (no feasible design: the feasibility
        phase's least-infeasible design still violates constraints; ``design``,
        ``constraints`` and ``outputs`` are at that design) or 'failed' (the optimiser
        failed; ``message`` says how).
    violations : list of dict
        For 'infeasible': the violated constraints at the least-infeasible design, worst
        first (see :func:`voltwake.design.feasibility.violations`); else empty.
    """

    success: bool
    message: str
    design: dict
    constraints: dict
    outputs: dict
    start: dict
    history: list
    failed_points: int
    evaluations: int
    objective: str
    best_feasible: dict = None
    inputs: dict = None
    problem: object = None
    status: str = OPTIMUM
    violations: list = dataclasses.field(default_factory=list)

    def to_dict(self):
        """
        Return the result as a JSON-ready mapping (no problem object).

        Returns
        -------
        dict
            Every field but ``problem``; ``status`` is given as ``outcome`` ('optimum',
            'infeasible' or 'failed'), since the ``status`` of a results file says whether
            the run is 'complete' or 'partial'.
        """
        out = dataclasses.asdict(dataclasses.replace(self, problem=None))
        out.pop('problem')
        out['outcome'] = out.pop('status')
        return out


def optimize(config=None, overrides=None, recorder_path=None, on_evaluation=None):
    """
    Minimise the configured objective subject to the configured constraints.

    Parameters
    ----------
    config : Config, dict, str or None
        The configuration; None for the packaged turbo-electric demo.
    overrides : dict or list of str or None
        Dotted key path -> value applied before validation.
    recorder_path : str or None
        OpenMDAO SqliteRecorder case file written as the run goes.
    on_evaluation : callable or None
        Called with each history entry (for progress lines).

    Returns
    -------
    OptimizationResult
        The outcome; ``success`` is False when the optimiser failed or the final point is
        infeasible or does not close.
    """
    with warnings.catch_warnings():
        # OpenMDAO notes that the Newton-solved sizing loop is treated as one block when it
        # works out which systems the driver needs: true, expected and harmless here.
        warnings.filterwarnings('ignore', message='The following groups have a nonlinear solver')
        return _optimize(config, overrides, recorder_path, on_evaluation)


def design_table(dvs, prob):
    """
    Return each design variable at the problem's current (single) design point.

    Parameters
    ----------
    dvs : list of DesignVariable
        The design variables.
    prob : om.Problem
        A problem that has been run (``vec_size`` 1).

    Returns
    -------
    dict
        Config key path -> {value, lower, upper, units, active, si}: in the unit the user
        wrote the bounds in, and under ``si`` in SI.
    """
    design = {}
    for dv in dvs:
        value = float(np.real(prob.get_val(dv.target, units=dv.units)[0]))
        shown = dv.display_units or dv.units
        design[dv.path] = {
            'value': in_units(value, dv.units, shown),
            'lower': in_units(dv.lower, dv.units, shown),
            'upper': in_units(dv.upper, dv.units, shown),
            'units': shown,
            'active': _active(value, dv.lower, dv.upper),
            'si': {'value': value, 'lower': dv.lower, 'upper': dv.upper, 'units': dv.units},
        }
    return design


def _optimize(config, overrides, recorder_path, on_evaluation, feasibility=True):
    config = load_config(config, overrides)
    prob = build_problem(config, recorder_path=recorder_path)
    driver = prob.driver
    if on_evaluation is not None:
        stream = sys.stdout

        def report(entry):
            # The optimiser's own prints are silenced below; progress goes to the caller.
            with contextlib.redirect_stdout(stream):
                on_evaluation(entry)

        driver.on_evaluation = report
    prob.run_model()
    start = read_fields(prob, config.has_aft_fan)
    try:
        with np.errstate(all='ignore'), contextlib.redirect_stdout(io.StringIO()):
            prob.run_driver()
    except KeyboardInterrupt:
        prob.cleanup()  # flush and close the case recorder
        history = list(driver.history)
        feasible = [
            e for e in history if e['closed'] and e['max_violation'] <= FEASIBILITY_TOLERANCE
        ]
        raise InterruptedRun(
            f'optimisation interrupted after {driver.evaluations} model evaluations',
            {
                'status': 'partial',
                'success': False,
                'message': 'interrupted by the user; these results are partial',
                'history': history,
                'evaluations': driver.evaluations,
                'failed_points': driver.failed_points,
                'start': start,
                'best_feasible': min(feasible, key=lambda e: e['objective']) if feasible else None,
                'inputs': config.data,
            },
        ) from None
    # Final evaluation at the optimiser's last design, from the last converged state.
    driver._run_solve_nonlinear()
    reason = closure_problem(prob, config.has_aft_fan)
    result = getattr(driver, '_scipy_optimize_result', None)
    design = design_table(driver.design_variables, prob)
    cons = constraint_table(driver.spec_constraints, prob)
    worst = max((c['violation'] for c in cons.values()), default=0.0)
    message = str(result.message) if result is not None else 'no optimiser result'
    if driver.start_note:
        message += f'; {driver.start_note}'
    success = (
        bool(result is not None and result.success)
        and reason is None
        and worst <= FEASIBILITY_TOLERANCE
    )
    if reason is not None:
        message += f'; final design does not close ({reason})'
    elif worst > FEASIBILITY_TOLERANCE:
        message += f'; final design infeasible (worst relative violation {worst:.3g})'
    outputs = read_fields(prob, config.has_aft_fan) if reason is None else {}
    objective = config.values['optimization.objective']
    feasible = [
        e for e in driver.history if e['closed'] and e['max_violation'] <= FEASIBILITY_TOLERANCE
    ]
    best = min(feasible, key=lambda e: e['objective']) if feasible else None
    result = OptimizationResult(
        success,
        message,
        design,
        cons,
        outputs,
        start,
        list(driver.history),
        driver.failed_points,
        driver.evaluations,
        objective,
        best,
        config.data,
        prob,
        OPTIMUM if success else FAILED,
    )
    if success or not feasibility:
        return result
    return _feasibility_phase(config, result, recorder_path, on_evaluation)


def _feasibility_phase(config, result, recorder_path, on_evaluation):
    """
    Decide whether a failed optimisation has a feasible design at all.

    The least-infeasible design is found over the same design variables and bounds (see
    :mod:`voltwake.design.feasibility`). If it still violates constraints the outcome is
    'infeasible', at that design; if it satisfies them the optimisation is run again from
    it, and only a second failure is 'failed'.
    """
    prob = build_problem(config)
    driver = prob.driver
    prob.run_model()
    reason = least_infeasible(prob) or closure_problem(prob, config.has_aft_fan)
    evaluations = result.evaluations + driver.evaluations
    if reason is not None:
        result.message += f'; the feasibility phase found no closed design ({reason})'
        result.evaluations = evaluations
        return result
    found = violations(driver.spec_constraints, prob)
    if found:
        return dataclasses.replace(
            result,
            status=INFEASIBLE,
            message=f'no feasible design: {violation_words(found)}',
            design=design_table(driver.design_variables, prob),
            constraints=constraint_table(driver.spec_constraints, prob),
            outputs=read_fields(prob, config.has_aft_fan),
            violations=found,
            evaluations=evaluations,
            failed_points=result.failed_points + driver.failed_points,
            problem=prob,
        )
    feasible = {
        dv.path: float(np.real(prob.get_val(dv.target, units=dv.units)[0]))
        for dv in driver.design_variables
    }
    try:
        retry = _optimize(
            config.with_overrides(feasible), None, recorder_path, on_evaluation, False
        )
    except (ConfigError, NotClosedError) as err:
        result.message += f'; a feasible design exists, but the retry from it stopped: {err}'
        result.evaluations = evaluations
        return result
    if retry.success:
        retry.message += (
            f'; reached from a feasible design found after a first run failed ({result.message})'
        )
    else:
        retry.message = (
            f'{result.message}; a feasible design exists, but the optimisation from it failed '
            f'too: {retry.message}'
        )
    retry.evaluations += evaluations
    retry.failed_points += result.failed_points + driver.failed_points
    retry.start, retry.inputs = result.start, result.inputs
    return retry
