"""Design variables and constraints of a configuration's optimisation section."""

import dataclasses
import difflib
import math

import numpy as np
from openmdao.utils.units import convert_units

from ..configuration.loader import (
    absent_input_hint,
    field_at,
    input_paths,
    parse_quantity,
    written_unit,
)
from ..errors import ConfigError

#: Largest scaled constraint violation accepted as feasible.
FEASIBILITY_TOLERANCE = 1e-5


#: Constraint outputs that only a design with an aft fan has; a conventional reference
#: optimised under the same section leaves them out.
AFT_FAN_CONSTRAINTS = (
    'aft_fan_diameter_margin',
    'aft_fan_hub_to_tip_margin',
    'motor_power_margin',
    'cable_current_density_margin',
    'cable_voltage_margin',
)


@dataclasses.dataclass
class DesignVariable:
    """
    One design variable: a config key path and the model input it sets.

    Parameters
    ----------
    path : str
        Dotted config key path.
    target : str
        Promoted model input.
    lower, upper : float
        Bounds in SI ``units``.
    units : str or None
        SI units.
    ref0, ref : float or None
        Values that the optimiser sees as 0 and 1 (each defaults to its bound: ref0 to the
        lower, ref to the upper).
    display_units : str or None
        The unit the user wrote the bounds in (results come back in it); None: ``units``.
    """

    path: str
    target: str
    lower: float
    upper: float
    units: str = None
    ref0: float = None
    ref: float = None
    display_units: str = None


@dataclasses.dataclass
class Constraint:
    """
    One constraint on a model output.

    Parameters
    ----------
    name : str
        Promoted model output.
    lower, upper, equals : float or None
        Bounds in ``units``.
    units : str or None
        Units of the bounds (the output's own).
    display_units : str or None
        The unit the user wrote the bounds in (results come back in it); None: ``units``.
    """

    name: str
    lower: float = None
    upper: float = None
    equals: float = None
    units: str = None
    display_units: str = None

    def violation(self, value):
        """
        Return the violation of this constraint at ``value``, relative to its bound.

        Parameters
        ----------
        value : float
            The output value in ``units``.

        Returns
        -------
        float
            0 when satisfied.
        """
        out = 0.0
        for bound, sign in ((self.upper, 1.0), (self.lower, -1.0), (self.equals, 0.0)):
            if bound is None:
                continue
            gap = abs(value - bound) if sign == 0.0 else sign * (value - bound)
            out = max(out, gap / max(abs(bound), 1.0))
        return out


def _where(config, path):
    head = 'optimization.design_variables.'
    if path.startswith(head):  # a design variable's name is itself a dotted key path
        return config.where(('optimization', 'design_variables', path[len(head) :]))
    head = 'optimization.constraints.'
    if path.startswith(head):
        return config.where(('optimization', 'constraints', path[len(head) :]))
    return config.where(tuple(path.split('.')))


def design_variables(config, model_inputs):
    """
    Read and check the design variables of the ``optimization`` section.

    Parameters
    ----------
    config : Config
        The configuration.
    model_inputs : dict
        Promoted model inputs set by the configuration (see ``Config.model_inputs``).

    Returns
    -------
    list of DesignVariable
        The design variables present in this model (aft-fan ones are dropped for a
        conventional design).
    """
    spec = config.values['optimization.design_variables']
    out = []
    for path, bounds in spec.items():
        where = _where(config, f'optimization.design_variables.{path}')
        field = field_at(path)
        if field is None or not field.target:
            close = difflib.get_close_matches(path, input_paths(), n=1, cutoff=0.6)
            hint = f" (did you mean '{close[0]}'?)" if close else ''
            raise ConfigError(
                f'not a configurable model input{hint}; expected a config key path such as '
                "'wing.aspect_ratio'",
                **where,
            )
        if field.target not in model_inputs:
            if path.split('.')[0] in ('aft_fan', 'electrical'):
                continue  # the conventional reference has no aft-fan variables
            raise ConfigError(
                f'this input is not in the model{absent_input_hint(config, path)}', **where
            )
        if (
            not isinstance(bounds, dict)
            or set(bounds) - {'lower', 'upper', 'ref0', 'ref'}
            or not {'lower', 'upper'} <= set(bounds)
        ):
            raise ConfigError(
                f'got {bounds!r}; expected {{lower: ..., upper: ...}} and '
                'optionally ref0 and ref (scaling)',
                **where,
            )
        units = field.units
        vals = {
            key: (parse_quantity(val, units, where, key=path) if units else _number(val, where))
            for key, val in bounds.items()
        }
        if not vals['lower'] < vals['upper']:
            raise ConfigError(
                f"lower bound {vals['lower']:g} is not below upper bound {vals['upper']:g}", **where
            )
        if ('ref' in vals or 'ref0' in vals) and vals.get('ref', vals['upper']) == vals.get(
            'ref0', vals['lower']
        ):
            raise ConfigError('ref must differ from ref0', **where)
        shown = _written(bounds, ('lower', 'upper'), units)
        out.append(DesignVariable(path, field.target, units=units, display_units=shown, **vals))
    if not out:
        raise ConfigError(
            'no design variables for this design',
            source=config.source,
            path='optimization.design_variables',
        )
    return out


def _written(bounds, keys, units):
    """Return the unit the bounds were written in, if it converts to ``units``; else None."""
    for key in keys:
        unit = written_unit(bounds.get(key))
        if unit is not None and units is not None and unit != units:
            return unit
    return None


def in_units(value, units, display_units):
    """
    Convert a value (or None) from ``units`` to ``display_units`` (None: unchanged).

    Parameters
    ----------
    value : float or None
        The value in ``units``.
    units, display_units : str or None
        From and to.

    Returns
    -------
    float or None
        The value in ``display_units``.
    """
    if value is None or display_units is None or units is None:
        return value
    return float(convert_units(value, units, display_units))


def _number(value, where):
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise ConfigError(f'got {value!r}; expected a finite number', **where)
    return float(value)


def constraints(config, prob):
    """
    Read and check the constraints of the ``optimization`` section against the model.

    Parameters
    ----------
    config : Config
        The configuration.
    prob : om.Problem
        The set-up problem (for output names and units).

    Returns
    -------
    list of Constraint
        Constraints on outputs of this model (aft-fan ones are dropped for a conventional
        design).
    """
    meta = prob.model.get_io_metadata(
        iotypes='output', metadata_keys=['units'], get_remote=True, return_rel_names=False
    )
    units_of = {}
    for abs_name, info in meta.items():
        units_of[info['prom_name']] = info['units']
    out = []
    for name, bounds in config.values['optimization.constraints'].items():
        where = _where(config, f'optimization.constraints.{name}')
        if name not in units_of:
            if name in AFT_FAN_CONSTRAINTS and not config.has_aft_fan:
                continue
            close = difflib.get_close_matches(name, list(units_of), n=1)
            hint = f" (did you mean '{close[0]}'?)" if close else ''
            raise ConfigError(f'not a model output{hint}', **where)
        if not isinstance(bounds, dict) or not bounds or set(bounds) - {'lower', 'upper', 'equals'}:
            raise ConfigError(f'got {bounds!r}; expected lower, upper and/or equals', **where)
        units = units_of[name]
        conv = {
            key: (parse_quantity(val, units, where) if units else _number(val, where))
            for key, val in bounds.items()
        }
        shown = _written(bounds, ('lower', 'upper', 'equals'), units)
        out.append(Constraint(name, units=units, display_units=shown, **conv))
    return out


def constraint_table(specs, prob):
    """
    Return each constraint at the problem's current (single) design point.

    Parameters
    ----------
    specs : list of Constraint
        The constraints.
    prob : om.Problem
        A problem that has been run (``vec_size`` 1).

    Returns
    -------
    dict
        Output name -> {value, lower, upper, equals, units, violation, active, si}: the
        values in the unit the user wrote the bounds in, and under ``si`` in SI.
    """
    table = {}
    for con in specs:
        value = float(np.real(prob.get_val(con.name, units=con.units)[0]))
        shown = con.display_units or con.units
        table[con.name] = {
            'value': in_units(value, con.units, shown),
            'lower': in_units(con.lower, con.units, shown),
            'upper': in_units(con.upper, con.units, shown),
            'equals': in_units(con.equals, con.units, shown),
            'units': shown,
            'violation': con.violation(value),
            'active': con.equals is not None or _active(value, con.lower, con.upper),
            'si': {
                'value': value,
                'lower': con.lower,
                'upper': con.upper,
                'equals': con.equals,
                'units': con.units,
            },
        }
    return table


def configured_constraints(config, prob):
    """
    Return the constraints of the config's optimisation section at an analysed design.

    Parameters
    ----------
    config : Config
        The configuration (no optimisation section: no constraints).
    prob : om.Problem
        The analysed problem.

    Returns
    -------
    dict
        As :func:`constraint_table`.
    """
    if 'optimization.constraints' not in config.values:
        return {}
    return constraint_table(constraints(config, prob), prob)


def _active(value, lower, upper, tol=1e-4):
    span = max(abs(upper - lower), 1e-12) if lower is not None and upper is not None else 1.0
    return bool(
        (lower is not None and abs(value - lower) <= tol * max(span, abs(lower)))
        or (upper is not None and abs(value - upper) <= tol * max(span, abs(upper)))
    )
