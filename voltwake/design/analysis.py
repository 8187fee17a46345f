"""
Analyse one configuration: converge its sizing loop and return an :class:`AnalysisResult`.

This is the scripting front door for analysis (:func:`analyze`); the model itself is
built by :func:`voltwake.design.sizing.build_model_problem`.
"""

import dataclasses
import math

from ..configuration.loader import load_config
from ..errors import NotClosedError
from .batch import close_by_continuation
from .constraints import configured_constraints
from .fields import read_fields
from .sizing import _NO_CONVERGENCE, build_model_problem, run_sizing


@dataclasses.dataclass
class AnalysisResult:
    """
    Converged results of one design.

    Parameters
    ----------
    name : str
        Name of the design.
    converged : bool
        True when the sizing loop closed.
    values : dict
        Field name -> value (see :data:`FIELDS` and :data:`AFT_FAN_FIELDS`).
    iterations : int
        Newton iterations of the sizing loop.
    problem : om.Problem or None
        The OpenMDAO problem, for scripting.
    continuation : bool
        The design closed only by the continuation from the same aircraft on a short range
        (``iterations`` then counts the final re-solve).
    constraints : dict
        The constraints of the config's optimisation section at this design: output name ->
        {value, lower, upper, equals, units, violation, active} (empty without that
        section). A closed design may still violate them.
    """

    name: str
    converged: bool
    values: dict
    iterations: int = 0
    problem: object = None
    continuation: bool = False
    constraints: dict = dataclasses.field(default_factory=dict)

    def __getattr__(self, key):
        """
        Give the result fields as attributes (``result.mtow_kg``).

        Parameters
        ----------
        key : str
            Field name.

        Returns
        -------
        float
            The value.
        """
        values = self.__dict__.get('values', {})
        if key in values:
            return values[key]
        raise AttributeError(key)

    def to_dict(self):
        """
        Return the result as a plain JSON-ready mapping.

        Returns
        -------
        dict
            ``name``, ``converged``, ``newton_iterations``, ``closed_by_continuation``,
            every field and ``constraints``.
        """
        return {
            'name': self.name,
            'converged': self.converged,
            'newton_iterations': self.iterations,
            'closed_by_continuation': self.continuation,
            **self.values,
            'constraints': self.constraints,
        }


def analyze(config=None, overrides=None, keep_problem=True):
    """
    Converge the sizing loop of one design and return its results.

    Parameters
    ----------
    config : Config, dict, str or None
        The configuration; None for the packaged turbo-electric demo.
    overrides : dict or list of str or None
        Dotted key path -> value applied before validation.
    keep_problem : bool
        Keep the OpenMDAO problem on the result (``result.problem``).

    Returns
    -------
    AnalysisResult
        The converged design.
    """
    config = load_config(config, overrides)
    prob = build_model_problem(config)
    continued = False
    try:
        iterations = run_sizing(prob, config.has_aft_fan)
    except NotClosedError as err:
        # A start far from the solution can fail where a solution exists: walk to the design
        # from the same aircraft on a short range (batch builds on this module, hence the
        # late import).

        prob, reason = close_by_continuation(config)
        if prob is None:
            # A diagnosis of the failed solve stands; a bare non-convergence gives way to
            # what the walk found.
            generic = _NO_CONVERGENCE in str(err)
            raise NotClosedError(reason if generic and reason else str(err)) from None
        iterations = run_sizing(prob, config.has_aft_fan)
        continued = True
    values = read_fields(prob, config.has_aft_fan)
    if not all(math.isfinite(v) for v in values.values()):
        raise NotClosedError('the sizing loop returned non-finite values')

    return AnalysisResult(
        config.name,
        True,
        values,
        iterations,
        prob if keep_problem else None,
        continued,
        configured_constraints(config, prob),
    )
