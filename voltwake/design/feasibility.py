"""
Feasibility phase: the least-infeasible design of an optimisation problem.

When an optimisation ends without a feasible optimum the question is whether any design
satisfies the constraints. :func:`least_infeasible` minimises the sum of the squared
constraint violations over the same design variables and bounds, input targets fixed and
equality constraints (output targets) held. Each violation is scaled as the optimiser sees
it: the gap to the bound over ``max(|bound|, 1)``. The squared violations are made smooth
with one slack per inequality bound (minimise ``sum s**2`` subject to ``g + s >= 0`` and
``s >= 0``, the elastic form of a feasibility problem: Nocedal and Wright, Numerical
Optimization, 2nd ed., section 17.2, from memory) and solved with SciPy's SLSQP on the
model's analytic total derivatives. A least-infeasible design with no violation means the
original failure was the optimiser's; one with violations means no feasible design was
found, and :func:`violations` says which constraints bind and by how much.
"""

import contextlib
import io

import numpy as np
from scipy.optimize import minimize

from .constraints import FEASIBILITY_TOLERANCE, constraint_table

#: Outcomes of an optimisation: a feasible optimum, no feasible design, an optimiser failure.
OPTIMUM, INFEASIBLE, FAILED = 'optimum', 'infeasible', 'failed'

#: Iterations of the feasibility problem.
FEASIBILITY_ITERATIONS = 200


class _Feasibility:
    """
    The elastic feasibility problem of a built optimisation problem, in scaled variables.

    ``x`` (each design variable scaled to [0, 1] between its bounds) is followed by one
    slack per inequality bound.

    Parameters
    ----------
    prob : om.Problem
        From :func:`voltwake.design.optimization.build_problem`, run once.
    """

    def __init__(self, prob):
        self.prob, self.driver = prob, prob.driver
        self.dvs = self.driver.design_variables
        self.cons = self.driver.spec_constraints
        self.low = np.array([dv.lower for dv in self.dvs])
        self.span = np.array([dv.upper - dv.lower for dv in self.dvs])
        # (constraint index, sign, bound, normaliser) of each inequality bound; equalities.
        self.sides, self.equals = [], []
        for i, con in enumerate(self.cons):
            if con.equals is not None:
                self.equals.append((i, con.equals, max(abs(con.equals), 1.0)))
            for bound, sign in ((con.lower, 1.0), (con.upper, -1.0)):
                if bound is not None:
                    self.sides.append((i, sign, bound, max(abs(bound), 1.0)))
        self._at = None

    def _set(self, z):
        """Run the model at the design part of ``z`` unless it is already there."""
        x = np.clip(z[: len(self.dvs)], 0.0, 1.0)
        if self._at is not None and np.array_equal(x, self._at):
            return
        for dv, value in zip(self.dvs, self.low + x * self.span):
            self.prob.set_val(dv.target, value, units=dv.units)
        self.driver._run_solve_nonlinear()
        self.values = np.array(
            [float(np.real(self.prob.get_val(c.name, units=c.units)[0])) for c in self.cons]
        )
        self._jac = None
        self._at = x.copy()

    def jacobian(self, z):
        """Return d(constraint values)/d(scaled design variables), one row per constraint."""
        self._set(z)
        if self._jac is None:
            raw = self.driver._compute_totals(
                of=[c.name for c in self.cons],
                wrt=[dv.target for dv in self.dvs],
                return_format='array',
                driver_scaling=False,
            )
            self._jac = np.real(raw) * self.span
        return self._jac

    def margins(self, z):
        """Return the scaled margin ``g`` of every inequality bound (>= 0 is satisfied)."""
        self._set(z)
        return np.array(
            [sign * (self.values[i] - bound) / norm for i, sign, bound, norm in self.sides]
        )

    def problem(self):
        """Return the start, bounds and constraints of the SLSQP problem."""
        n, m = len(self.dvs), len(self.sides)
        x0 = np.clip((self._current() - self.low) / self.span, 0.0, 1.0)
        z0 = np.concatenate([x0, np.maximum(0.0, -self.margins(x0))])

        def ineq(z):
            return self.margins(z) + z[n:]

        def ineq_jac(z):
            rows = np.array([sign * self.jacobian(z)[i] / norm for i, sign, _, norm in self.sides])
            return np.hstack([rows.reshape(m, n), np.eye(m)])

        cons = [{'type': 'ineq', 'fun': ineq, 'jac': ineq_jac}]
        if self.equals:

            def eq(z):
                self._set(z)
                return np.array([(self.values[i] - b) / norm for i, b, norm in self.equals])

            def eq_jac(z):
                rows = np.array([self.jacobian(z)[i] / norm for i, _, norm in self.equals])
                return np.hstack([rows.reshape(len(self.equals), n), np.zeros((len(rows), m))])

            cons.append({'type': 'eq', 'fun': eq, 'jac': eq_jac})
        bounds = [(0.0, 1.0)] * n + [(0.0, None)] * m
        return z0, bounds, cons

    def _current(self):
        return np.array(
            [float(np.real(self.prob.get_val(dv.target, units=dv.units)[0])) for dv in self.dvs]
        )


def least_infeasible(prob):
    """
    Move a built optimisation problem to its least-infeasible design.

    Parameters
    ----------
    prob : om.Problem
        From :func:`voltwake.design.optimization.build_problem`, with its model run once.

    Returns
    -------
    str or None
        Why the feasibility phase could not finish (an exception's message), or None. The
        problem is left at the least-infeasible design found, its model run there.
    """
    feas = _Feasibility(prob)
    n = len(feas.dvs)
    try:
        z0, bounds, cons = feas.problem()

        def objective(z):
            return float(np.sum(z[n:] ** 2))

        def gradient(z):
            return np.concatenate([np.zeros(n), 2.0 * z[n:]])

        with np.errstate(all='ignore'), contextlib.redirect_stdout(io.StringIO()):
            res = minimize(
                objective,
                z0,
                jac=gradient,
                bounds=bounds,
                constraints=cons,
                method='SLSQP',
                options={'maxiter': FEASIBILITY_ITERATIONS, 'ftol': 1e-12},
            )
        feas._at = None  # the final evaluation runs the model at the result
        feas._set(res.x)
    except Exception as exc:  # noqa: BLE001 - reported as the point's failure
        return f'{type(exc).__name__}: {exc}'
    return None


def violations(specs, prob):
    """
    Return the constraints violated at the problem's current design, worst first.

    Parameters
    ----------
    specs : list of Constraint
        The constraints.
    prob : om.Problem
        A problem that has been run (``vec_size`` 1).

    Returns
    -------
    list of dict
        One per constraint violated beyond :data:`FEASIBILITY_TOLERANCE`: ``name``,
        ``value``, ``bound`` (the bound it crosses), ``side`` ('lower', 'upper' or 'equals'),
        ``amount`` (how far beyond the bound, positive) and ``units`` (the unit the user
        wrote the bounds in), ``percent`` (the amount as a percentage of the bound; for a
        dimensionless margin with bound 0, defined as ``1 - value / limit``, the amount
        itself is the fraction of the limit; None when neither applies) and ``relative``
        (the scaled violation the optimiser sees).
    """
    table = constraint_table(specs, prob)
    out = []
    for name, con in table.items():
        if con['violation'] <= FEASIBILITY_TOLERANCE:
            continue
        value = con['value']
        gaps = []
        for side, sign in (('upper', 1.0), ('lower', -1.0), ('equals', 0.0)):
            bound = con[side]
            if bound is not None:
                gap = abs(value - bound) if side == 'equals' else sign * (value - bound)
                gaps.append((gap, side, bound))
        amount, side, bound = max(gaps)
        if bound != 0.0:
            percent = 100.0 * amount / abs(bound)
        elif con['units'] is None:
            percent = 100.0 * amount
        else:
            percent = None
        out.append(
            {
                'name': name,
                'value': value,
                'bound': bound,
                'side': side,
                'amount': amount,
                'units': con['units'],
                'percent': percent,
                'relative': con['violation'],
            }
        )
    return sorted(out, key=lambda v: -v['relative'])


def violation_words(found, limit=3):
    """
    Return the violated constraints as words: name, amount in its units and percentage.

    Parameters
    ----------
    found : list of dict
        From :func:`violations`.
    limit : int
        Most constraints named; the rest are counted.

    Returns
    -------
    str
        E.g. ``'motor_power_margin binds by 53.2 % (0.532 below its lower bound 0)'``.
    """
    parts = []
    for v in found[:limit]:
        unit = f' {v["units"]}' if v['units'] else ''
        where = {'upper': 'above its upper bound', 'lower': 'below its lower bound'}.get(
            v['side'], 'off its target'
        )
        detail = f'{v["amount"]:.4g}{unit} {where} {v["bound"]:g}{unit}'
        if v['percent'] is not None:
            parts.append(f'{v["name"]} binds by {v["percent"]:.3g} % ({detail})')
        else:
            parts.append(f'{v["name"]} binds by {detail}')
    if len(found) > limit:
        parts.append(f'and {len(found) - limit} more')
    return '; '.join(parts)


def amounts_text(found):
    """
    Return the violated constraints as ``name:amount`` pairs (the amount in its units).

    Parameters
    ----------
    found : list of dict
        From :func:`violations`.

    Returns
    -------
    str
        E.g. ``'motor_power_margin:0.532;wingspan:1.2 m'`` (empty when nothing is violated).
    """
    return ';'.join(
        f'{v["name"]}:{v["amount"]:.6g}' + (f' {v["units"]}' if v['units'] else '') for v in found
    )
