"""
Many designs at once: one vectorised model whose Newton solve converges every point together.

Points that do not close are isolated and marked with a reason (they are never dropped or
filled with garbage): a failing point's inputs are set back to the base design so that it
cannot spoil the solve of the others, then a continuation walks it from the base design to
its own inputs in steps; whatever still does not close is reported as not closing.
"""

import dataclasses

import numpy as np
from openmdao.core.analysis_error import AnalysisError

from ..configuration.loader import _check_field, absent_input_hint, field_at, load_config
from ..errors import ConfigError
from ..models.solvers import SizingNewtonSolver
from .fields import AFT_FAN_FIELDS, ECONOMIC_FIELDS, FIELDS, read_field_arrays
from .sizing import build_model_problem, closure_reasons

#: Largest relative residual of a point accepted as converged.
RESIDUAL_TOLERANCE = 1e-7
#: Range of the easy design a single analysis walks from (fraction of the design range).
EASY_RANGE_FRACTION = 0.1
#: First continuation step (fraction of the way from the base design to the point); a step
#: that stalls is halved, down to FIRST_STEP / 16.
FIRST_STEP = 0.25


@dataclasses.dataclass
class BatchResult:
    """
    Results of many design points.

    Parameters
    ----------
    inputs : dict
        Dotted config path -> array of the varied inputs (SI).
    values : dict
        Result field -> array (NaN where the point did not close).
    closed : ndarray of bool
        Which points closed.
    reasons : list of str or None
        Why each point did not close (None where it closed).
    recovered : int
        Points that closed only through the continuation.
    """

    inputs: dict
    values: dict
    closed: np.ndarray
    reasons: list
    recovered: int = 0

    @property
    def closure_rate(self):
        """float: Share of the points that closed."""
        return float(np.mean(self.closed)) if len(self.closed) else 1.0


def _targets(config, columns):
    out = {}
    size = None
    for path, values in columns.items():
        field = field_at(path)
        if field is None or not field.target or field.target not in config.model_inputs():
            hint = absent_input_hint(config, path) if field is not None and field.target else ''
            raise ConfigError(
                'not a model input of this design'
                + (hint or "; expected a config key path such as 'aft_fan.thrust_fraction'"),
                source=config.source,
                path=path,
            )
        arr = np.asarray(values, dtype=float).ravel()
        for value in np.unique(arr):
            _check_field(field, float(value), {'source': config.source, 'line': None, 'path': path})
        if size is not None and arr.size != size:
            raise ConfigError(
                f'{arr.size} values where the other inputs have {size}',
                source=config.source,
                path=path,
            )
        size = arr.size
        out[path] = (field.target, field.units, arr)
    return out, size


def _point_residuals(prob):
    """Largest residual of each point relative to its output (after apply_nonlinear)."""
    loop = prob.model.sizing
    with np.errstate(all='ignore'):
        loop.run_apply_nonlinear()
    size = prob.model.options['vec_size']
    worst = np.zeros(size)
    outs = dict(loop._outputs._abs_item_iter())
    for name, res in loop._residuals._abs_item_iter():
        rel = np.abs(np.real(res)) / np.maximum(np.abs(np.real(outs[name])), 1.0)
        worst = np.maximum(worst, np.where(np.isfinite(rel), rel, np.inf).reshape(size))
    return worst


def _hold(prob, held):
    """Freeze ``held`` points in every pointwise Newton solve of the model (None: none)."""
    for system in prob.model.system_iter(include_self=True, recurse=True):
        solver = system.nonlinear_solver
        if isinstance(solver, SizingNewtonSolver):
            solver.held_points = held


def _solve(prob, aft_fan, held=None):
    """Run the model; return per-point converged flags, reasons and broken flags."""
    _hold(prob, held)
    try:
        with np.errstate(all='ignore'):
            prob.run_model()
    except AnalysisError:
        pass
    finally:
        _hold(prob, None)
    reasons = closure_reasons(prob, aft_fan)
    residual = _point_residuals(prob)
    broken = ~np.isfinite(residual) | np.array([r is not None for r in reasons])
    ok = (residual < RESIDUAL_TOLERANCE) & ~broken
    for i in np.flatnonzero(~ok):
        if reasons[i] is None:
            reasons[i] = (
                'the sizing loop did not close: Newton iterations did not converge '
                f'(relative residual {residual[i]:.2g})'
            )
    return ok, reasons, broken


def _set(prob, targets, fraction, base, where):
    for target, units, arr in targets.values():
        value = np.asarray(prob.get_val(target, units=units), dtype=float).copy()
        value[where] = base[target] + fraction[where] * (arr[where] - base[target])
        prob.set_val(target, value, units=units)


def _reset_states(prob, bad, good, start):
    """Give bad points the converged states of a good point, or their starting states."""
    size = prob.model.options['vec_size']
    for name, flat in prob.model.sizing._outputs._abs_item_iter():
        flat = flat.reshape(size)
        flat[bad] = flat[good] if good is not None else start[name].reshape(size)[bad]


def _isolate(prob, aft_fan, targets, fraction, base, active, fallback=None):
    """
    Solve, setting failing points back until the rest converge.

    Failing points are set back to ``fallback`` (default: the base design). Every solve
    after the first holds the points that converged (and, with a ``fallback``, the points
    set back to it with the states they started from, converged there) and points that are
    not ``active``: each point's answer is that of its own Newton iterations, whichever
    neighbours failed.
    """
    size = len(fraction)
    start = {name: flat.copy() for name, flat in prob.model.sizing._outputs._abs_item_iter()}
    failed = np.zeros(size, dtype=bool)
    reasons = [None] * size
    held = ~active
    for _ in range(size + 1):
        ok, why, broken = _solve(prob, aft_fan, held)
        # Points that are plainly broken (NaN, no thrust, ...) stop the Newton solve of all:
        # set them aside first; only then is a point that merely did not converge failed.
        bad = broken & active & ~failed
        if not bad.any():
            bad = ~ok & active & ~failed
        if not bad.any():
            return failed, reasons
        for i in np.flatnonzero(bad):
            reasons[i] = why[i]
        failed |= bad
        frac = fraction.copy()
        frac[failed] = 0.0 if fallback is None else fallback[failed]
        _set(prob, targets, frac, base, failed)
        good = np.flatnonzero(ok & ~failed)
        if fallback is None:
            _reset_states(prob, failed, good[0] if good.size else None, start)
            held = ~active | (ok & ~failed)
        else:
            _reset_states(prob, failed, None, start)
            held = ~active | (ok & ~failed) | failed
    return failed | (~_solve(prob, aft_fan, held)[0] & active), reasons


def _setup(config, targets, size):
    prob = build_model_problem(config, vec_size=size)
    base = {t: float(np.asarray(config.model_inputs()[t][0])) for t, _, _ in targets.values()}
    return prob, base


def _continue(config, targets, names, origin='the configured design'):
    """
    Walk points that did not close from the base design to their own inputs.

    The steps halve where the walk stalls; a point that stalls for good with its MTOW higher
    there than at the base design (``origin`` in the reasons) is past a fold of the mass
    balance (the weight grows without bound). Returns the closed flags, the reasons, the
    result fields and the problem holding the walked states.
    """
    size = len(next(iter(targets.values()))[2])
    prob, base = _setup(config, targets, size)
    aft = config.has_aft_fan
    every = np.ones(size, dtype=bool)
    fraction = np.zeros(size)
    _set(prob, targets, fraction, base, every)
    prob.final_setup()
    _solve(prob, aft)  # every point at the base design
    first = np.real(prob.get_val('mtow')).copy()
    last = first.copy()
    step = np.full(size, FIRST_STEP)
    walking = every.copy()
    reasons = [None] * size
    smallest = FIRST_STEP / 16.0
    while walking.any():
        trial = np.where(walking, np.minimum(fraction + step, 1.0), fraction)
        _set(prob, targets, trial, base, walking)
        stuck, why = _isolate(prob, aft, targets, trial, base, walking, fallback=fraction)
        moved = walking & ~stuck
        fraction[moved] = trial[moved]
        last[moved] = np.real(prob.get_val('mtow'))[moved]
        walking &= ~(moved & (fraction >= 1.0))
        halved = walking & stuck
        step[halved] /= 2.0
        for i in np.flatnonzero(halved & (step < smallest)):
            walking[i] = False
            reasons[i] = why[i]
            if last[i] > first[i] * (1.0 + 1e-6):
                reasons[i] = (
                    'the sizing loop did not close: no solution past '
                    f'{100 * fraction[i]:.0f}% of the way from {origin} (MTOW '
                    f'{first[i]:,.0f} kg there, {last[i]:,.0f} kg at {100 * fraction[i]:.0f}%): '
                    'weight grows without bound'
                )
        if halved.any():
            # Re-converge the stalled points at their last good inputs before the next step.
            _set(prob, targets, fraction, base, halved)
            _isolate(prob, aft, targets, fraction, base, halved, fallback=fraction)
    closed = fraction >= 1.0
    _set(prob, targets, fraction, base, every)
    ok = _solve(prob, aft)[0]
    closed &= ok
    return closed, reasons, read_field_arrays(prob, aft, names), prob


def close_by_continuation(config):
    """
    Close one design that Newton's method could not close from its default start.

    The same aircraft on a tenth of its design range (:data:`EASY_RANGE_FRACTION`) carries
    little fuel, so its mass balance is close to the default start; the continuation then
    walks the range back up to the design range, each step starting from the last closed
    design.

    Parameters
    ----------
    config : Config
        The design.

    Returns
    -------
    prob : om.Problem or None
        A problem (``vec_size`` 1) holding the closed design, or None when the walk failed.
    reason : str or None
        Why the walk failed (None when it succeeded or gave no reason).
    """
    design_range = config.value('mission.range')
    easy = config.with_overrides({'mission.range': EASY_RANGE_FRACTION * design_range})
    targets = {'mission.range': ('range', 'm', np.array([design_range]))}
    origin = f'the same design at {100 * EASY_RANGE_FRACTION:.0f}% of its range'
    closed, reasons, _, prob = _continue(easy, targets, ['mtow_kg'], origin)
    return (prob, None) if closed[0] else (None, reasons[0])


def _field_names(config, field_names):
    """Return the result fields of a batch: those asked for, or every analysis field."""
    names = field_names or list(FIELDS) + list(AFT_FAN_FIELDS)
    if field_names is None and config.has_economic_mission:
        names = names + list(ECONOMIC_FIELDS)
    return list(names)


class PointBatch:
    """
    One vectorised model of ``size`` design points, solved again for chunk after chunk.

    Building and setting up the model (and the first assembly of its Jacobian) costs about
    as much as solving a thousand points; a map solved in chunks builds it once per process
    and, for every chunk, puts back the starting states the model had after set-up, sets the
    chunk's inputs and solves. A chunk of fewer points is padded with the base design
    (every point converges on its own: see :class:`voltwake.models.solvers.SizingNewtonSolver`,
    so the padding changes nothing of the others).

    Parameters
    ----------
    config : Config, dict, str or None
        The base configuration; every point starts from it.
    paths : sequence of str
        The dotted config paths that vary from point to point.
    size : int
        Points of the model (the largest chunk).
    field_names : list of str or None
        Result fields to return (default: every analysis field).
    """

    def __init__(self, config, paths, size, field_names=None):
        self.config = config = load_config(config)
        self.size = int(size)
        self.paths = list(paths)
        self.aft = config.has_aft_fan
        self.names = _field_names(config, field_names)
        # The configured values, checked as inputs of this design (a path the design does
        # not have is refused by _targets before its value is read).
        values = {p: config.values.get(p, 0.0) for p in self.paths}
        targets, _ = _targets(config, {p: np.full(self.size, values[p]) for p in self.paths})
        self.prob, self.base = _setup(config, targets, self.size)
        _set(self.prob, targets, np.ones(self.size), self.base, np.ones(self.size, dtype=bool))
        self.prob.final_setup()
        self._start = self.prob.model._outputs.asarray(copy=True)

    def solve(self, columns):
        """
        Analyse the points of ``columns`` (at most ``size`` of them).

        Parameters
        ----------
        columns : dict
            Dotted config path (those of ``paths``) -> 1-D sequence of values (SI), one per
            point (all of equal length).

        Returns
        -------
        BatchResult
            Inputs, result fields (NaN where a point did not close), closure flags and
            reasons.
        """
        config, prob, size = self.config, self.prob, self.size
        targets, count = _targets(config, {p: columns[p] for p in self.paths})
        if count > size:
            raise ValueError(f'{count} points for a batch of {size}')
        padded = {
            path: (target, units, np.concatenate([arr, np.full(size - count, self.base[target])]))
            for path, (target, units, arr) in targets.items()
        }
        prob.model._outputs.set_val(self._start)
        every = np.ones(size, dtype=bool)
        _set(prob, padded, np.ones(size), self.base, every)
        failed, reasons = _isolate(prob, self.aft, padded, np.ones(size), self.base, every)
        values = {
            key: arr[:count].copy()
            for key, arr in read_field_arrays(prob, self.aft, self.names).items()
        }
        failed, reasons = failed[:count], reasons[:count]
        recovered = 0
        if failed.any():
            idx = np.flatnonzero(failed)
            sub = {path: (t, u, arr[idx]) for path, (t, u, arr) in targets.items()}
            closed, why, sub_values, _ = _continue(config, sub, self.names)
            for j, i in enumerate(idx):
                if closed[j]:
                    failed[i] = False
                    reasons[i] = None
                    recovered += 1
                    for key in self.names:
                        values[key][i] = sub_values[key][j]
                else:
                    reasons[i] = why[j] or reasons[i]
        for key in self.names:
            values[key][failed] = np.nan
        inputs = {path: arr for path, (_, _, arr) in targets.items()}
        return BatchResult(inputs, values, ~failed, reasons, recovered)


def analyze_points(config, columns, field_names=None):
    """
    Analyse many designs in one vectorised model.

    Parameters
    ----------
    config : Config, dict, str or None
        The base configuration; every point starts from it.
    columns : dict
        Dotted config path -> 1-D sequence of values (SI), one per point (all equal length).
    field_names : list of str or None
        Result fields to return (default: every analysis field).

    Returns
    -------
    BatchResult
        Inputs, result fields (NaN where a point did not close), closure flags and reasons.
    """
    config = load_config(config)
    _, size = _targets(config, columns)
    return PointBatch(config, list(columns), size, field_names).solve(columns)


def full_factorial(axes):
    """
    Return the columns of a full-factorial grid.

    Parameters
    ----------
    axes : dict
        Dotted config path -> 1-D sequence of values; the first path varies slowest.

    Returns
    -------
    dict
        Dotted config path -> flattened column (C order over the axes).
    """
    grids = np.meshgrid(*[np.asarray(v, dtype=float) for v in axes.values()], indexing='ij')
    return {path: grid.ravel() for path, grid in zip(axes, grids)}


def decimal_grid(lower, upper, count):
    """
    Return ``count`` evenly spaced values from ``lower`` to ``upper`` that read as decimals.

    ``numpy.linspace(0.1, 0.4, 4)`` gives ``0.30000000000000004``; a user who asked for a
    grid from 0.1 to 0.4 in 4 steps means 0.3. Each value is rounded to 12 significant
    digits (far below any physical resolution and far above the float round-off), and the
    ends are the bounds themselves.

    Parameters
    ----------
    lower, upper : float
        First and last value.
    count : int
        Number of values (1 gives ``[lower]``).

    Returns
    -------
    list of float
        The grid.
    """
    values = [float(f'{v:.12g}') for v in np.linspace(lower, upper, count)]
    values[0] = float(lower)
    if count > 1:
        values[-1] = float(upper)
    return values
