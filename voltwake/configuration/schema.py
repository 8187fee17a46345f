"""
The configuration schema: every key a config may hold, its kind, units and limits.

Each entry of :data:`SECTIONS` maps a key to a :class:`Field`. ``target`` names the
model input the value feeds (promoted name in :class:`voltwake.models.aircraft.AircraftModel`);
fields with no target set model options (counts, choices). Values are stored in SI
(``units``); a config may give any unit OpenMDAO can convert to it.
"""

import math
from dataclasses import dataclass

REQUIRED = object()


@dataclass(frozen=True)
class Field:
    """
    One configuration key.

    Parameters
    ----------
    kind : str
        'quantity' (float with units), 'number' (dimensionless float), 'integer',
        'choice', 'text' or 'mapping' (checked by its user, e.g. the optimisation spec).
    doc : str
        What the key means.
    units : str or None
        SI units the value is stored in (quantities only).
    default : object
        Default value (SI) or REQUIRED.
    check : str or None
        Physical limit: 'positive', 'nonnegative', 'fraction' (0 < x <= 1),
        'open_fraction' (0 < x < 1), 'unit_fraction' (0 <= x < 1), 'at_least_one',
        'above_one', 'above_two', 'isa_altitude' (0 to 20 km), 'below_right_angle' (0 to 80 deg).
    target : str or None
        Promoted model input fed by this value.
    choices : tuple
        Allowed values of a 'choice'.
    """

    kind: str
    doc: str
    units: str = None
    default: object = REQUIRED
    check: str = None
    target: str = None
    choices: tuple = ()


def _q(units, doc, target, check='positive', default=REQUIRED):
    return Field('quantity', doc, units=units, default=default, check=check, target=target)


def _n(doc, target, check='positive', default=REQUIRED):
    return Field('number', doc, default=default, check=check, target=target)


#: Conductor materials: resistivity at 20 degC (ohm m) and density (kg/m**3).
#: CRC Handbook of Chemistry and Physics, tables of electrical resistivity of pure metals and
#: of densities of the elements (from memory): copper 1.68e-8 ohm m, 8960 kg/m**3;
#: aluminium 2.65e-8 ohm m, 2700 kg/m**3.
CONDUCTORS = {
    'copper': {'resistivity': 1.68e-8, 'density': 8960.0},
    'aluminium': {'resistivity': 2.65e-8, 'density': 2700.0},
}

_DEVICE = {
    'efficiency': _n('efficiency at cruise (output / input power)', None, check='fraction'),
    'specific_power': _q('W/kg', 'rated power per unit mass', None),
}


def _device(name):
    return {
        key: Field(f.kind, f.doc, f.units, f.default, f.check, f'{name}_{key}')
        for key, f in _DEVICE.items()
    }


SECTIONS = {
    'aircraft': Field('text', 'name of the design, used in reports', default='unnamed design'),
    'mission': {
        'range': _q('m', 'design range (cruise distance)', 'range'),
        'payload': _q('kg', 'design payload', 'payload'),
        'cruise_mach': _n('cruise Mach number', 'mach', check='open_fraction'),
        'cruise_altitude': _q(
            'm', 'cruise altitude (geopotential, ISA), 0 to 20 km', 'altitude', check='isa_altitude'
        ),
        'takeoff_fraction': _n(
            'mass fraction over engine start, taxi and take-off',
            'takeoff_fraction',
            check='fraction',
        ),
        'climb_fraction': _n('mass fraction over the climb', 'climb_fraction', check='fraction'),
        'landing_fraction': _n(
            'mass fraction over descent, landing and taxi', 'landing_fraction', check='fraction'
        ),
    },
    'reserves': {
        'diversion_range': _q(
            'm', 'distance to the alternate aerodrome', 'diversion_range', check='nonnegative'
        ),
        'hold_time': _q(
            's',
            'holding time, flown at the cruise TSFC and lift-to-drag ratio',
            'hold_time',
            check='nonnegative',
        ),
        'contingency_fraction': _n(
            'contingency fuel as a fraction of trip fuel',
            'contingency_fraction',
            check='unit_fraction',
        ),
    },
    'fuel': {
        'heating_value': _q('J/kg', 'lower heating value of the fuel', 'fuel_heating_value'),
    },
    'wing': {
        # Exactly one of area and loading is given (checked in voltwake.config).
        'area': _q('m**2', 'reference wing area (fixed)', 'wing_area', default=None),
        'loading': _q(
            'kg/m**2',
            'MTOW per unit wing area; the wing is sized to carry MTOW at this loading',
            'design_wing_loading',
            default=None,
        ),
        'aspect_ratio': _n('wing aspect ratio', 'aspect_ratio'),
        'oswald_efficiency': _n('Oswald span efficiency', 'oswald_efficiency', check='fraction'),
        # Wing geometry of the component mass build-up (structure.method: build_up).
        'sweep': _q(
            'rad',
            'quarter-chord sweep (e.g. 25 deg)',
            'wing_sweep',
            check='below_right_angle',
            default=math.radians(25.0),
        ),
        'thickness_to_chord': _n(
            'mean thickness-to-chord ratio',
            'thickness_to_chord',
            check='open_fraction',
            default=0.12,
        ),
        'taper_ratio': _n('tip chord / root chord', 'taper_ratio', check='fraction', default=0.25),
        'airfoil_technology_factor': _n(
            'Korn airfoil technology factor: 0.87 conventional, 0.95 supercritical sections',
            'airfoil_technology_factor',
            check='open_fraction',
            default=0.95,
        ),
        'interference_factor': _n(
            'interference factor of the wing drag', 'wing_interference_factor', default=1.0
        ),
    },
    'economic_mission': {
        'range': _q('m', 'economic-mission range (cruise distance)', 'economic_range'),
        'payload': _q('kg', 'economic-mission payload', 'economic_payload', check='nonnegative'),
    },
    'fuselage': {
        'diameter': _q('m', 'maximum fuselage diameter', 'fuselage_diameter'),
        'fineness_ratio': _n(
            'fuselage length / diameter (above 2 for the wetted-area formula)',
            'fuselage_fineness_ratio',
            check='above_two',
        ),
        'interference_factor': _n(
            'interference factor of the fuselage drag', 'fuselage_interference_factor', default=1.0
        ),
    },
    'drag': {
        'miscellaneous_drag_coefficient': _n(
            'zero-lift drag of excrescences, leakage, protuberances and interference not in the '
            'components\' factors (on wing area)',
            'miscellaneous_drag_coefficient',
            check='nonnegative',
            default=0.0015,
        ),
    },
    'structure': {
        # Left out: build_up, unless the regression constants are given (an older config).
        'method': Field(
            'choice',
            'airframe mass: build_up (wing, fuselage, tails, gear, systems from statistical '
            'equations) or regression (c * MTOW**k)',
            default=None,
            choices=('regression', 'build_up'),
        ),
        # regression (exactly these two; checked in voltwake.config)
        'airframe_mass_coefficient': _n(
            'c in airframe mass = c * MTOW**k (kg); method regression',
            'airframe_mass_coefficient',
            default=None,
        ),
        'airframe_mass_exponent': _n(
            'k in airframe mass = c * MTOW**k (kg); method regression',
            'airframe_mass_exponent',
            default=None,
        ),
        # build_up
        'ultimate_load_factor': _n(
            'ultimate load factor: 1.5 x the limit manoeuvring load factor (2.5 for transports)',
            'ultimate_load_factor',
            check='at_least_one',
            default=3.75,
        ),
        'horizontal_tail_volume_coefficient': _n(
            'horizontal tail volume coefficient',
            'horizontal_tail_volume_coefficient',
            default=1.0,
        ),
        'vertical_tail_volume_coefficient': _n(
            'vertical tail volume coefficient', 'vertical_tail_volume_coefficient', default=0.09
        ),
        'tail_arm_fraction': _n(
            'tail moment arm / fuselage length', 'tail_arm_fraction', check='fraction', default=0.5
        ),
        'systems_fraction': _n(
            'systems mass / MTOW (controls, hydraulics, electrical, avionics, APU, air '
            'conditioning, anti-ice)',
            'systems_fraction',
            check='open_fraction',
            default=0.08,
        ),
        'mass_per_passenger': _q(
            'kg', 'payload per passenger (with bags)', 'mass_per_passenger', default=100.0
        ),
        'furnishings_per_passenger': _q(
            'kg',
            'furnishings mass per passenger',
            'furnishings_per_passenger',
            check='nonnegative',
            default=50.0,
        ),
        'operating_items_per_passenger': _q(
            'kg',
            'operating items mass per passenger',
            'operating_items_per_passenger',
            check='nonnegative',
            default=15.0,
        ),
    },
    'turbofans': {
        'count': Field(
            'integer', 'number of under-wing turbofans', default=2, check='at_least_one'
        ),
        'fan_pressure_ratio': _n(
            'fan pressure ratio', 'turbofan_fan_pressure_ratio', check='above_one'
        ),
        'fan_efficiency': _n(
            'fan isentropic efficiency', 'turbofan_fan_efficiency', check='fraction'
        ),
        'fan_face_mach': _n(
            'axial Mach number at the fan face', 'turbofan_fan_face_mach', check='open_fraction'
        ),
        'hub_to_tip_ratio': _n(
            'fan hub-to-tip radius ratio', 'turbofan_hub_to_tip_ratio', check='unit_fraction'
        ),
        'core_thermal_efficiency': _n(
            'core shaft power delivered / fuel power', 'core_thermal_efficiency', check='fraction'
        ),
        'rated_to_cruise_thrust': _n(
            'rated sea-level static thrust / cruise thrust',
            'rated_to_cruise_thrust',
            check='at_least_one',
        ),
        'fan_areal_mass': _q(
            'kg/m**2',
            'fan section mass (fan, case, gearbox, low-pressure shaft) per fan disc area',
            'turbofan_fan_areal_mass',
            default=500.0,
        ),
        'core_specific_power': _q(
            'W/kg',
            'core maximum shaft power (fan at rated thrust plus generators) per core mass',
            'turbofan_core_specific_power',
            default=11.5e3,
        ),
        'nacelle_areal_mass': _q(
            'kg/m**2',
            'nacelle mass (inlet, cowls, reverser, pylon fairing) per wetted area',
            'turbofan_nacelle_areal_mass',
            default=20.0,
        ),
        'nacelle_diameter_ratio': _n(
            'nacelle maximum diameter / fan diameter',
            'turbofan_nacelle_diameter_ratio',
            check='at_least_one',
        ),
        'nacelle_fineness_ratio': _n(
            'nacelle length / nacelle diameter', 'turbofan_nacelle_fineness_ratio'
        ),
        'nacelle_interference_factor': _n(
            'interference factor of the nacelle drag',
            'turbofan_nacelle_interference_factor',
            default=1.3,
        ),
    },
}

#: Sections that may be left out: with no ``aft_fan`` the aircraft is conventional.
OPTIONAL_SECTIONS = {
    'aft_fan',
    'electrical',
    'economic_mission',
    'optimization',
    'solver',
    'performance',
}
#: Optional sections whose keys all have defaults: left out, the defaults apply.
DEFAULTED_SECTIONS = {'solver', 'performance'}

SECTIONS['performance'] = {
    'takeoff_max_lift_coefficient': _n(
        'maximum lift coefficient, take-off configuration',
        'takeoff_max_lift_coefficient',
        default=2.2,
    ),
    'landing_max_lift_coefficient': _n(
        'maximum lift coefficient, landing configuration',
        'landing_max_lift_coefficient',
        default=2.7,
    ),
    'buffet_lift_coefficient': _n(
        'buffet-onset lift coefficient at the cruise Mach number',
        'buffet_lift_coefficient',
        default=0.8,
    ),
    'buffet_margin_load_factor': _n(
        'load factor to buffet onset to be kept at cruise',
        'buffet_margin_load_factor',
        default=1.3,
        check='at_least_one',
    ),
    'residual_climb_rate': _q(
        'm/s',
        'rate of climb still available at top of climb',
        'residual_climb_rate',
        check='nonnegative',
        default=1.524,
    ),
    'throttle_ratio': _n(
        'engine throttle ratio of the thrust-lapse model',
        'throttle_ratio',
        default=1.05,
        check='at_least_one',
    ),
    'aft_fan_max_diameter_ratio': _n(
        'largest aft-fan tip diameter / maximum fuselage diameter (stands in for the '
        'tail-strike line at rotation)',
        'aft_fan_max_diameter_ratio',
        default=0.7,
    ),
    'aft_fan_max_hub_to_tip_ratio': _n(
        'largest aft-fan hub-to-tip ratio (a minimum blade height)',
        'aft_fan_max_hub_to_tip_ratio',
        default=0.8,
        check='open_fraction',
    ),
    'motor_power_limit': _q(
        'W', 'largest rated power of one aft-fan motor', 'motor_power_limit', default=4.0e6
    ),
}

SECTIONS['aft_fan'] = {
    'thrust_fraction': _n(
        'share of the cruise net thrust produced by the aft fan',
        'aft_thrust_fraction',
        check='unit_fraction',
    ),
    'fan_pressure_ratio': _n('aft-fan pressure ratio', 'aft_fan_pressure_ratio', check='above_one'),
    'fan_efficiency': _n(
        'aft-fan isentropic efficiency on clean (uniform) inflow',
        'aft_fan_efficiency',
        check='fraction',
    ),
    'distortion_sensitivity': _n(
        'aft-fan efficiency lost per unit non-uniformity of the ingested flow',
        'aft_fan_distortion_sensitivity',
        check='nonnegative',
        default=1.2,
    ),
    'fan_face_mach': _n(
        'axial Mach number at the aft-fan face', 'aft_fan_face_mach', check='open_fraction'
    ),
    'station_diameter_ratio': _n(
        'fuselage diameter at the fan station (the fan hub) / maximum diameter',
        'station_diameter_ratio',
        check='fraction',
    ),
    'profile_exponent': Field(
        'number',
        'n of the power-law boundary-layer profile (1 or more; 1 is the linear profile)',
        default=7.0,
        check='at_least_one',
    ),
    'fan_areal_mass': _q(
        'kg/m**2', 'fan, casing and shaft mass per fan-face annulus area', 'aft_fan_areal_mass'
    ),
    'nacelle_areal_mass': _q(
        'kg/m**2', 'aft nacelle mass per wetted area', 'aft_nacelle_areal_mass'
    ),
    'structure_fraction': _n(
        'extra tail-cone structure / (fan + nacelle mass)',
        'aft_structure_fraction',
        check='nonnegative',
    ),
    'nacelle_diameter_ratio': _n(
        'aft nacelle diameter / fan diameter', 'aft_nacelle_diameter_ratio', check='at_least_one'
    ),
    'nacelle_fineness_ratio': _n(
        'aft nacelle length / nacelle diameter', 'aft_nacelle_fineness_ratio'
    ),
    'nacelle_interference_factor': _n(
        'interference factor of the aft nacelle drag',
        'aft_nacelle_interference_factor',
        default=1.0,
    ),
}

SECTIONS['electrical'] = {
    'sizing_factor': _n(
        'rated power / cruise power of the electrical devices',
        'electrical_sizing_factor',
        check='at_least_one',
    ),
    'generator': _device('generator'),
    'rectifier': _device('rectifier'),
    'inverter': _device('inverter'),
    'motor': _device('motor'),
    'cable': {
        'voltage': _q('V', 'DC bus voltage', 'cable_voltage'),
        'length': _q('m', 'one-way cable length from generators to motor', 'cable_length'),
        'conductor': Field(
            'choice', 'conductor material', default='copper', choices=tuple(CONDUCTORS)
        ),
        'current_density_limit': _q(
            'A/m**2', 'conductor current density at rated current', 'cable_current_density_limit'
        ),
        'mass_factor': _n(
            'cable mass without insulation / conductor mass (shield, supports)',
            'cable_mass_factor',
            check='at_least_one',
        ),
        'dielectric_strength': _q(
            'V/m',
            'dielectric strength of the insulation',
            'cable_dielectric_strength',
            default=1.0e8,
        ),
        'insulation_design_factor': _n(
            'insulation wall / the wall that just withstands the bus voltage',
            'cable_insulation_design_factor',
            check='at_least_one',
            default=10.0,
        ),
        'insulation_density': _q(
            'kg/m**3', 'insulation density', 'cable_insulation_density', default=1420.0
        ),
        'discharge_gap': _q(
            'm',
            'characteristic air gap for partial discharge (Paschen) at cable surfaces and ends',
            'cable_discharge_gap',
            default=1.0e-3,
        ),
        'discharge_safety_factor': _n(
            'Paschen breakdown voltage / highest allowed bus voltage',
            'cable_discharge_safety_factor',
            check='at_least_one',
            default=1.5,
        ),
    },
    'thermal': {
        'specific_mass': _q(
            'kg/W',
            'thermal-management mass per unit rated heat load',
            'thermal_specific_mass',
            check='nonnegative',
        ),
        'drag_per_power': _q(
            'N/W',
            'cruise drag per unit heat rejected (ram-air heat exchangers)',
            'thermal_drag_per_power',
            check='nonnegative',
            default=1.4e-3,
        ),
    },
}

#: Plausible range (SI, inclusive) of a dimensional key written as a bare number. A bare
#: number is read in the key's SI unit; outside this range (zero excepted) it is far more
#: likely a value whose unit was left out ("range: 1500" meant in nmi, "hold_time: 30" in
#: minutes) than a design, so it is refused with "did you forget the unit?". A value with
#: its unit written is never held to these ranges, only to the key's physical check.
BARE_NUMBER_RANGES = {
    'mission.range': (50.0e3, 25.0e6),
    'mission.payload': (100.0, 300.0e3),
    'mission.cruise_altitude': (300.0, 20.0e3),
    'economic_mission.range': (50.0e3, 25.0e6),
    'economic_mission.payload': (100.0, 300.0e3),
    'reserves.diversion_range': (10.0e3, 2.0e6),
    'reserves.hold_time': (300.0, 4.0 * 3600.0),
    'fuel.heating_value': (5.0e6, 1.5e8),
    'wing.area': (5.0, 2000.0),
    'wing.loading': (50.0, 1500.0),
    'wing.sweep': (0.0, 1.4),
    'fuselage.diameter': (0.5, 12.0),
    'structure.mass_per_passenger': (50.0, 200.0),
    'structure.furnishings_per_passenger': (5.0, 300.0),
    'structure.operating_items_per_passenger': (2.0, 100.0),
    'turbofans.fan_areal_mass': (20.0, 5000.0),
    'turbofans.core_specific_power': (500.0, 100.0e3),
    'turbofans.nacelle_areal_mass': (1.0, 500.0),
    'aft_fan.fan_areal_mass': (20.0, 5000.0),
    'aft_fan.nacelle_areal_mass': (1.0, 500.0),
    'performance.residual_climb_rate': (0.1, 20.0),
    'performance.motor_power_limit': (10.0e3, 100.0e6),
    'electrical.generator.specific_power': (100.0, 200.0e3),
    'electrical.rectifier.specific_power': (100.0, 200.0e3),
    'electrical.inverter.specific_power': (100.0, 200.0e3),
    'electrical.motor.specific_power': (100.0, 200.0e3),
    'electrical.cable.voltage': (24.0, 100.0e3),
    'electrical.cable.length': (0.5, 500.0),
    'electrical.cable.current_density_limit': (1.0e5, 1.0e8),
    'electrical.cable.dielectric_strength': (1.0e5, 1.0e10),
    'electrical.cable.insulation_density': (100.0, 5000.0),
    'electrical.cable.discharge_gap': (1.0e-6, 0.1),
    'electrical.thermal.specific_mass': (1.0e-6, 0.05),
    'electrical.thermal.drag_per_power': (1.0e-5, 0.05),
}

#: The unit a user most likely meant for a bare number, shown in the "did you forget the
#: unit?" message (keys not listed show their SI unit).
LIKELY_UNITS = {
    'mission.range': 'nmi',
    'economic_mission.range': 'nmi',
    'reserves.diversion_range': 'nmi',
    'reserves.hold_time': 'min',
    'mission.cruise_altitude': 'ft',
    'fuel.heating_value': 'MJ/kg',
    'wing.sweep': 'deg',
    'turbofans.core_specific_power': 'kW/kg',
    'performance.residual_climb_rate': 'ft/min',
    'performance.motor_power_limit': 'MW',
    'electrical.generator.specific_power': 'kW/kg',
    'electrical.rectifier.specific_power': 'kW/kg',
    'electrical.inverter.specific_power': 'kW/kg',
    'electrical.motor.specific_power': 'kW/kg',
    'electrical.cable.current_density_limit': 'A/mm**2',
    'electrical.cable.dielectric_strength': 'kV/mm',
    'electrical.cable.discharge_gap': 'mm',
    'electrical.thermal.specific_mass': 'kg/kW',
    'electrical.thermal.drag_per_power': 'N/kW',
}

#: Keys that older configs may hold and that are no longer read: path -> why.
RETIRED_KEYS = {
    'reserves.hold_speed': 'the hold is flown at the cruise TSFC and lift-to-drag ratio '
    '(Breguet endurance form), so its speed does not enter',
    'aft_fan.hub_to_tip_ratio': 'the aft-fan hub is the fuselage at the fan station '
    '(aft_fan.station_diameter_ratio) and the hub-to-tip ratio follows from the annulus area',
    'turbofans.thrust_to_weight': 'the engine mass is built from its fan size and its core '
    'power (turbofans.fan_areal_mass, core_specific_power, nacelle_areal_mass)',
    'drag.cd0_other': 'the zero-lift drag is built up by component (wing, fuselage, nacelles, '
    'tails, each from its wetted area and skin friction); only excrescences and interference '
    'are left, as drag.miscellaneous_drag_coefficient',
}

SECTIONS['optimization'] = {
    'objective': Field(
        'text',
        'model output to minimise: block_fuel, economic_block_fuel (with an economic_mission '
        'section), mtow, block_energy or any scalar model output',
        default='block_fuel',
    ),
    'design_variables': Field('mapping', 'config key path -> {lower, upper[, scaler]}'),
    'constraints': Field('mapping', 'model output -> {lower | upper | equals}', default={}),
    'optimizer': {
        'method': Field(
            'choice', 'SciPy optimizer', default='SLSQP', choices=('SLSQP', 'trust-constr')
        ),
        'tolerance': _n('optimizer convergence tolerance', None, default=1e-8),
        'max_iterations': Field(
            'integer', 'optimizer iteration limit', default=100, check='at_least_one'
        ),
    },
}

SECTIONS['study'] = Field(
    'mapping',
    'trade study for voltwake sweep: map, targets, breakeven and/or uncertainty (see README)',
    default={},
)

SECTIONS['solver'] = {
    'max_iterations': Field(
        'integer', 'Newton iteration limit of the sizing loop', default=30, check='at_least_one'
    ),
    'tolerance': _n('relative residual tolerance of the sizing loop', None, default=1e-10),
}
