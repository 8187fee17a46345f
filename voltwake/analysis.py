"""
Build, run and read the sizing model for one configuration.

This is the scripting front door for analysis: :func:`build_model_problem` gives the
OpenMDAO problem with every configured input set, :func:`analyze` converges it and returns
an :class:`AnalysisResult`.
"""

import dataclasses
import math

import numpy as np
import openmdao.api as om
from openmdao.core.analysis_error import AnalysisError

from voltwake.models.aircraft import AircraftModel

from .config import load_config
from .errors import NotClosedError

#: Result fields: name -> (promoted model output, units), for every design.
FIELDS = {
    'mtow_kg': ('mtow', 'kg'),
    'oew_kg': ('oew', 'kg'),
    'payload_kg': ('payload', 'kg'),
    'block_fuel_kg': ('block_fuel', 'kg'),
    'reserve_fuel_kg': ('reserve_fuel', 'kg'),
    'total_fuel_kg': ('total_fuel', 'kg'),
    'block_energy_MJ': ('block_energy', 'MJ'),
    'airframe_mass_kg': ('airframe_mass', 'kg'),
    'propulsion_mass_kg': ('propulsion_mass', 'kg'),
    'engines_mass_kg': ('engines_mass', 'kg'),
    'nacelle_mass_kg': ('nacelles_mass', 'kg'),
    'turbofan_core_shaft_power_kW': ('turbofan_core_shaft_power', 'kW'),
    'cruise_lift_to_drag': ('lift_to_drag', None),
    'cruise_cl': ('lift_coefficient', None),
    'cruise_drag_kN': ('drag', 'kN'),
    'zero_lift_drag_coefficient': ('zero_lift_drag_coefficient', None),
    'induced_drag_coefficient': ('induced_drag_coefficient', None),
    'wave_drag_coefficient': ('wave_drag_coefficient', None),
    'drag_divergence_mach': ('drag_divergence_mach', None),
    'wing_drag_area_m2': ('wing_drag_area', 'm**2'),
    'top_of_climb_cl': ('top_of_climb_lift_coefficient', None),
    'top_of_climb_lift_to_drag': ('top_of_climb_lift_to_drag', None),
    'tsfc_g_per_kN_s': ('tsfc', 'g/(kN*s)'),
    'overall_efficiency': ('overall_efficiency', None),
    'wingspan_m': ('wingspan', 'm'),
    'wing_area_m2': ('wing_area', 'm**2'),
    'turbofan_fan_diameter_m': ('turbofan_fan_diameter', 'm'),
    'turbofan_rated_thrust_kN': ('turbofan_rated_thrust', 'kN'),
    'turbofan_cruise_thrust_kN': ('turbofan_thrust', 'kN'),
    'turbofan_shaft_power_kW': ('turbofan_shaft_power', 'kW'),
    'fuselage_drag_kN': ('fuselage_drag', 'kN'),
    'takeoff_field_length_m': ('takeoff_field_length', 'm'),
    'landing_field_length_m': ('landing_field_length', 'm'),
    'approach_speed_kn': ('approach_speed', 'kn'),
    'takeoff_thrust_kN': ('installed_thrust', 'kN'),
    'turbofan_takeoff_thrust_kN': ('turbofan_takeoff_thrust', 'kN'),
    'takeoff_thrust_to_weight': ('takeoff_thrust_to_weight', None),
    'climb_thrust_margin': ('climb_thrust_margin', None),
    'buffet_margin': ('buffet_margin', None),
}

#: Extra fields of a design with a wake-ingesting aft fan (zero for a conventional one).
AFT_FAN_FIELDS = {
    'aft_thrust_fraction': ('aft_thrust_fraction', None),
    'power_saving_coefficient': ('power_saving_coefficient', None),
    'power_saving_coefficient_same_mass_flow': ('power_saving_coefficient_same_mass_flow', None),
    'aft_fan_shaft_power_kW': ('aft_shaft_power', 'kW'),
    'aft_fan_reference_shaft_power_kW': ('aft_reference_shaft_power', 'kW'),
    'aft_fan_diameter_m': ('aft_fan_diameter', 'm'),
    'aft_fan_hub_diameter_m': ('aft_fan_hub_diameter', 'm'),
    'aft_fan_hub_to_tip_ratio': ('aft_fan_hub_to_tip_ratio', None),
    'aft_fan_installed_efficiency': ('aft_fan_installed_efficiency', None),
    'aft_fan_inflow_nonuniformity': ('aft_fan_inflow_nonuniformity', None),
    'aft_fan_takeoff_thrust_kN': ('aft_fan_takeoff_thrust', 'kN'),
    'aft_fan_takeoff_power_kW': ('aft_fan_takeoff_power', 'kW'),
    'aft_fan_thrust_kN': ('aft_fan_thrust', 'kN'),
    'aft_fan_mass_kg': ('aft_fan_mass', 'kg'),
    'capture_height_m': ('capture_height', 'm'),
    'boundary_layer_thickness_m': ('boundary_layer_thickness', 'm'),
    'turbofan_power_extraction_kW': ('generator_input_power', 'kW'),
    'electrical_chain_efficiency': ('electrical_chain_efficiency', None),
    'electrical_mass_kg': ('electrical_mass', 'kg'),
    'thermal_load_kW': ('thermal_load', 'kW'),
    'thermal_rated_load_kW': ('thermal_rated_load', 'kW'),
    'cable_current_A': ('cable_current', 'A'),
    'cable_efficiency': ('cable_efficiency', None),
    'motor_mass_kg': ('motor_mass', 'kg'),
    'generator_mass_kg': ('generator_mass', 'kg'),
    'cable_mass_kg': ('cable_mass', 'kg'),
    'thermal_mass_kg': ('thermal_mass', 'kg'),
    'rectifier_mass_kg': ('rectifier_mass', 'kg'),
    'inverter_mass_kg': ('inverter_mass', 'kg'),
    'generator_loss_kW': ('generator_loss', 'kW'),
    'rectifier_loss_kW': ('rectifier_loss', 'kW'),
    'cable_loss_kW': ('cable_loss', 'kW'),
    'inverter_loss_kW': ('inverter_loss', 'kW'),
    'motor_loss_kW': ('motor_loss', 'kW'),
    'motor_rated_power_kW': ('motor_rated_power', 'kW'),
    'aft_fan_diameter_margin': ('aft_fan_diameter_margin', None),
    'aft_fan_hub_to_tip_margin': ('aft_fan_hub_to_tip_margin', None),
    'cable_voltage_margin': ('cable_voltage_margin', None),
    'cable_discharge_voltage_V': ('cable_discharge_voltage', 'V'),
    'cable_insulation_mass_kg': ('cable_insulation_mass', 'kg'),
    'motor_power_margin': ('motor_power_margin', None),
}


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


#: Extra fields of a design whose airframe mass is built up from its components
#: (structure.method: build_up); absent with the regression.
BUILD_UP_FIELDS = {
    'wing_mass_kg': ('wing_mass', 'kg'),
    'fuselage_mass_kg': ('fuselage_mass', 'kg'),
    'horizontal_tail_mass_kg': ('horizontal_tail_mass', 'kg'),
    'vertical_tail_mass_kg': ('vertical_tail_mass', 'kg'),
    'landing_gear_mass_kg': ('landing_gear_mass', 'kg'),
    'systems_mass_kg': ('equipment_mass', 'kg'),
    'horizontal_tail_area_m2': ('horizontal_tail_area', 'm**2'),
    'vertical_tail_area_m2': ('vertical_tail_area', 'm**2'),
    'fuselage_length_m': ('fuselage_length', 'm'),
}

#: Extra fields of a design flown on an economic mission (economic_mission section).
ECONOMIC_FIELDS = {
    'economic_block_fuel_kg': ('economic_block_fuel', 'kg'),
    'economic_block_energy_MJ': ('economic_block_energy', 'MJ'),
    'economic_reserve_fuel_kg': ('economic_reserve_fuel', 'kg'),
    'economic_takeoff_mass_kg': ('economic_takeoff_mass', 'kg'),
    'economic_cruise_lift_to_drag': ('economic_lift_to_drag', None),
    'economic_cruise_cl': ('economic_lift_coefficient', None),
    'economic_takeoff_mass_margin': ('economic_takeoff_mass_margin', None),
}


def fuel_burn_field(config):
    """
    Return the result field a fuel-burn change is measured on for a configuration.

    The economic mission's block fuel when the optimisation objective is on the economic
    mission (``economic_block_fuel`` or ``economic_block_energy``), else the design
    mission's block fuel.

    Parameters
    ----------
    config : Config
        The configuration.

    Returns
    -------
    str
        'economic_block_fuel_kg' or 'block_fuel_kg'.
    """
    objective = str(config.values.get('optimization.objective', 'block_fuel'))
    if objective.startswith('economic_') and config.has_economic_mission:
        return 'economic_block_fuel_kg'
    return 'block_fuel_kg'


#: Values of the aft-fan fields for a design without an aft fan (efficiencies are 1).
_NO_AFT_FAN = {'electrical_chain_efficiency': 1.0, 'cable_efficiency': 1.0}


def read_field_arrays(prob, aft_fan, names=None):
    """
    Read result fields of every design point from a run problem.

    Parameters
    ----------
    prob : om.Problem
        A problem that has been run.
    aft_fan : bool
        Whether the design has an aft fan.
    names : list of str or None
        Fields to read (default: every field).

    Returns
    -------
    dict
        Field name -> float array of length ``vec_size``.
    """
    size = prob.model.options['vec_size']
    table = {**FIELDS, **AFT_FAN_FIELDS}
    if prob.model.options['structure'] == 'build_up':
        table.update(BUILD_UP_FIELDS)
    if prob.model.options['economic_mission']:
        table.update(ECONOMIC_FIELDS)
    out = {}
    for key in names or table:
        name, units = table[key]
        if key in AFT_FAN_FIELDS and not aft_fan:
            out[key] = np.full(size, _NO_AFT_FAN.get(key, 0.0))
        else:
            value = np.real(np.asarray(prob.get_val(name, units=units)))
            out[key] = np.broadcast_to(value, (size,)).astype(float)
    return out


def read_fields(prob, aft_fan, index=0):
    """
    Read the result fields of point ``index`` from a run problem.

    Parameters
    ----------
    prob : om.Problem
        A problem that has been run.
    aft_fan : bool
        Whether the design has an aft fan.
    index : int
        Design point.

    Returns
    -------
    dict
        Field name -> float.
    """
    return {key: float(arr[index]) for key, arr in read_field_arrays(prob, aft_fan).items()}


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
        from .batch import close_by_continuation

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
    from .optimization import configured_constraints  # builds on this module

    return AnalysisResult(
        config.name,
        True,
        values,
        iterations,
        prob if keep_problem else None,
        continued,
        configured_constraints(config, prob),
    )
