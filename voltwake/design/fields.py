"""Result fields of a sized design: names, units, and reading them from a run problem."""

import numpy as np

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
