"""
The coupled sizing model of a conventional or turbo-electric airliner.

Wiring only: every piece of physics lives in :mod:`voltwake.components`. The sizing
loop (mass -> wing area when the wing is sized to a wing loading -> lift -> drag -> thrust
-> engine and aft-fan size, nacelle drag, electrical chain -> fuel -> mass) is one group
solved by Newton's method with a direct linear solver.
"""

import numpy as np
import openmdao.api as om

from voltwake.components.aft_fan_mass import AftFanMassComp
from voltwake.components.atmosphere import AtmosphereComp, FlightConditionComp
from voltwake.components.body_drag import BodyDragComp
from voltwake.components.boundary_layer import FuselageBoundaryLayerComp, IngestedFlowComp
from voltwake.components.buffet import BuffetMarginComp
from voltwake.components.cable import CableComp
from voltwake.components.capture_height import CaptureHeightComp, initial_capture_height
from voltwake.components.climb import ThrustLapseComp, TopOfClimbComp
from voltwake.components.drag_polar import DragPolarComp
from voltwake.components.ducted_fan import DuctedFanComp
from voltwake.components.electrical_device import ElectricalDeviceComp
from voltwake.components.electrical_summary import ElectricalSummaryComp
from voltwake.components.equipment_mass import LandingGearMassComp, SystemsMassComp
from voltwake.components.fan_annulus import FanAnnulusComp
from voltwake.components.fuselage_mass import FuselageMassComp
from voltwake.components.inlet_distortion import DistortedFanEfficiencyComp
from voltwake.components.landing import LandingComp
from voltwake.components.mission import MissionFuelComp
from voltwake.components.nacelle import NacelleGeometryComp
from voltwake.components.overall_efficiency import OverallEfficiencyComp
from voltwake.components.power_saving import PowerSavingComp
from voltwake.components.propulsion_system import PropulsionSystemComp
from voltwake.components.ratings import DiameterLimitComp, RatingMarginComp
from voltwake.components.reference_fan import SameMassFlowFanComp
from voltwake.components.surface_drag import LiftingSurfaceDragComp
from voltwake.components.tail import (
    HT_ASPECT_RATIO,
    HT_SWEEP,
    VT_ASPECT_RATIO,
    VT_SWEEP,
    VT_THICKNESS_TO_CHORD,
    TailMassComp,
    TailSizingComp,
)
from voltwake.components.takeoff import TakeoffFieldLengthComp
from voltwake.components.takeoff_thrust import StaticThrustPerPowerComp, TakeoffThrustComp
from voltwake.components.thermal_management import CHAIN_LOSS_EXPONENTS, ThermalManagementComp
from voltwake.components.thrust_split import ThrustSplitComp
from voltwake.components.turbofan_core import EngineMassComp, TurbofanCoreComp
from voltwake.components.wave_drag import WaveDragComp
from voltwake.components.weights import AirframeMassComp, MassBuildUpComp, MassSumComp
from voltwake.components.wing import (
    ExposedWingComp,
    LiftCoefficientComp,
    WingAreaComp,
    WingGeometryComp,
)
from voltwake.components.wing_mass import WingMassComp
from voltwake.models.solvers import PointwiseDirectSolver, SizingNewtonSolver

#: Electrical devices from the aft-fan shaft back to the turbofan shafts.
CHAIN = ('motor', 'inverter', 'cable', 'rectifier', 'generator')

_FAN_OUTPUTS = (
    'jet_velocity',
    'specific_thrust',
    'mass_flow',
    'shaft_power',
    'fan_face_area',
    'fan_exit_total_temperature',
)


#: Options shared by the groups of this module: name -> keyword arguments of ``declare``.
#: SizingLoop and AircraftModel take all of them; the other groups a subset.
_OPTIONS = {
    'vec_size': dict(types=int, default=1, lower=1, desc='Number of independent design points.'),
    'num_engines': dict(types=int, default=2, lower=1, desc='Number of under-wing turbofans.'),
    'aft_fan': dict(
        types=bool,
        default=False,
        desc='Include the wake-ingesting aft fan and its electrical chain.',
    ),
    'profile_exponent': dict(
        types=(int, float),
        default=7.0,
        desc='Exponent n of the power-law boundary-layer profile.',
    ),
    'wing_sizing': dict(
        values=('area', 'loading'),
        default='area',
        desc="'area': the wing reference area is an input; 'loading': the wing is sized in the "
        'loop to carry MTOW at the input wing loading.',
    ),
    'structure': dict(
        values=('regression', 'build_up'),
        default='regression',
        desc="Airframe mass: 'regression' (c * MTOW**k) or 'build_up' (wing, fuselage, "
        'tails, landing gear, systems).',
    ),
    'max_iterations': dict(
        types=int, default=30, desc='Newton iteration limit of the sizing loop.'
    ),
    'tolerance': dict(
        types=float, default=1e-10, desc='Relative residual tolerance of the sizing loop.'
    ),
    'economic_mission': dict(
        types=bool,
        default=False,
        desc='Also fly the sized aircraft on the economic mission (its own payload and range).',
    ),
}


def _declare(options, *names):
    """Declare the named shared options."""
    for name in names:
        options.declare(name, **_OPTIONS[name])


#: Promotions of the aft fan's design settings (shared by the fan and its reference).
_AFT_FAN_SETTINGS = [
    ('fan_pressure_ratio', 'aft_fan_pressure_ratio'),
    ('fan_face_mach', 'aft_fan_face_mach'),
]


def _add(group, name, comp, inputs=(), outputs=()):
    """Add ``comp`` promoting the listed variables; a (local, promoted) pair renames one."""
    return group.add_subsystem(
        name, comp, promotes_inputs=list(inputs), promotes_outputs=list(outputs)
    )


def _prefixed(prefix, names):
    return [(name, f'{prefix}_{name}') for name in names]


def _newton_solve(group, **kwargs):
    """
    Solve ``group`` by Newton's method with the point-by-point direct linear solver.

    The iteration limit and tolerance are the group's options; a solve that does not
    converge raises. No line search: every state stays defined along full Newton steps (the
    capture-height fluxes are continued as odd functions below the wall), and a line search
    would cost one more residual evaluation per iteration.

    Parameters
    ----------
    group : om.Group
        A group with the options ``max_iterations`` and ``tolerance``.
    **kwargs : dict
        Options of :class:`SizingNewtonSolver` (e.g. ``solve_subsystems``).
    """
    newton = group.nonlinear_solver = SizingNewtonSolver(**kwargs)
    newton.options['maxiter'] = group.options['max_iterations']
    newton.options['rtol'] = group.options['tolerance']
    newton.options['atol'] = 1e-8
    newton.options['iprint'] = -1
    newton.options['err_on_non_converge'] = True
    newton.linesearch = None
    group.linear_solver = PointwiseDirectSolver(assemble_jac=True)


class FlightConditionGroup(om.Group):
    """
    ISA atmosphere and free-stream conditions at one altitude and Mach number.

    Parameters
    ----------
    **kwargs : dict of keyword arguments
        Keyword arguments that will be mapped into the Group options.
    """

    def initialize(self):
        """
        Declare options.
        """
        _declare(self.options, 'vec_size')

    def setup(self):
        """
        Add the atmosphere and flight-condition components.
        """
        n = self.options['vec_size']
        atmos = ['temperature', 'pressure', 'density', 'speed_of_sound']
        _add(self, 'atmosphere', AtmosphereComp(vec_size=n), ['altitude'], atmos + ['viscosity'])
        _add(
            self,
            'condition',
            FlightConditionComp(vec_size=n),
            ['mach'] + atmos,
            ['true_airspeed', 'dynamic_pressure', 'total_temperature', 'total_pressure'],
        )


#: Zero-lift drag areas summed by the drag polar (promoted names).
DRAG_AREAS = (
    'wing_drag_area',
    'fuselage_drag_area',
    ('nacelle_drag_area', 'turbofan_nacelle_drag_area'),
    'aft_nacelle_drag_area',
    'horizontal_tail_drag_area',
    'vertical_tail_drag_area',
)


def _prefix(prefix, name):
    return f'{prefix}_{name}' if prefix else name


def add_polar_point(group, name, mass, prefix=''):
    """
    Add lift, wave drag and the drag polar at one aircraft mass to ``group``.

    Every point flies at the cruise altitude and Mach number (same dynamic pressure and
    component drag areas) and carries the thermal-management drag.

    Parameters
    ----------
    group : om.Group
        The group to add to.
    name : str
        Prefix of the subsystem names.
    mass : str
        Promoted name of the aircraft mass at the point.
    prefix : str
        Prefix of the promoted outputs ('' for the mid-cruise point).
    """
    n = group.options['vec_size']
    cl = _prefix(prefix, 'lift_coefficient')
    _add(
        group,
        f'{name}_lift',
        LiftCoefficientComp(vec_size=n),
        [('mass', mass), 'dynamic_pressure', 'wing_area'],
        [('lift_coefficient', cl)],
    )
    _add(
        group,
        f'{name}_wave',
        WaveDragComp(vec_size=n),
        [
            'mach',
            ('lift_coefficient', cl),
            ('sweep', 'wing_sweep'),
            'thickness_to_chord',
            ('technology_factor', 'airfoil_technology_factor'),
        ],
        [
            (out, _prefix(prefix, out))
            for out in ('drag_divergence_mach', 'critical_mach', 'wave_drag_coefficient')
        ],
    )
    _add(
        group,
        f'{name}_polar',
        DragPolarComp(vec_size=n),
        [
            ('lift_coefficient', cl),
            ('wave_drag_coefficient', _prefix(prefix, 'wave_drag_coefficient')),
            'aspect_ratio',
            'oswald_efficiency',
            'wing_area',
            'dynamic_pressure',
            'miscellaneous_drag_coefficient',
            ('extra_drag', 'thermal_drag'),
        ]
        + list(DRAG_AREAS),
        [
            (out, _prefix(prefix, out))
            for out in (
                'zero_lift_drag_coefficient',
                'induced_drag_coefficient',
                'drag_coefficient',
                'drag',
                'lift_to_drag',
                'fuselage_drag',
            )
        ],
    )


class AerodynamicsGroup(om.Group):
    """
    Wing planform, tail sizing, component zero-lift drag and the mid-cruise drag polar.

    Parameters
    ----------
    **kwargs : dict of keyword arguments
        Keyword arguments that will be mapped into the Group options.
    """

    def initialize(self):
        """
        Declare options.
        """
        _declare(self.options, 'vec_size')

    def setup(self):
        """
        Add the planform, tail sizing, component drag and polar components.
        """
        n = self.options['vec_size']
        flight = ['mach', 'true_airspeed', 'density', 'viscosity']
        _add(
            self, 'span', WingGeometryComp(vec_size=n), ['wing_area', 'aspect_ratio'], ['wingspan']
        )
        _add(
            self,
            'exposed',
            ExposedWingComp(vec_size=n),
            ['wing_area', 'wingspan', 'taper_ratio', 'fuselage_diameter'],
            ['exposed_wing_area', 'exposed_wing_aspect_ratio'],
        )
        _add(
            self,
            'wing_drag',
            LiftingSurfaceDragComp(vec_size=n),
            [
                ('area', 'exposed_wing_area'),
                ('aspect_ratio', 'exposed_wing_aspect_ratio'),
                'thickness_to_chord',
                ('sweep', 'wing_sweep'),
                ('interference_factor', 'wing_interference_factor'),
            ]
            + flight,
            [
                ('drag_area', 'wing_drag_area'),
                ('wetted_area', 'wing_wetted_area'),
                ('reynolds_number', 'wing_reynolds_number'),
                ('skin_friction_coefficient', 'wing_skin_friction_coefficient'),
                ('form_factor', 'wing_form_factor'),
            ],
        )
        _add(
            self,
            'tail_size',
            TailSizingComp(vec_size=n),
            [
                'wing_area',
                'aspect_ratio',
                'fuselage_length',
                'horizontal_tail_volume_coefficient',
                'vertical_tail_volume_coefficient',
                'tail_arm_fraction',
            ],
            ['horizontal_tail_area', 'vertical_tail_area', 'tail_arm'],
        )
        # The tails' planform constants are those of their mass equations.
        for tail, aspect, sweep in (
            ('horizontal', HT_ASPECT_RATIO, HT_SWEEP),
            ('vertical', VT_ASPECT_RATIO, VT_SWEEP),
        ):
            _add(
                self,
                f'{tail}_tail_drag',
                LiftingSurfaceDragComp(vec_size=n),
                [
                    ('area', f'{tail}_tail_area'),
                    ('aspect_ratio', f'{tail}_tail_aspect_ratio'),
                    ('thickness_to_chord', 'tail_thickness_to_chord'),
                    ('sweep', f'{tail}_tail_sweep'),
                ]
                + flight,
                [
                    ('drag_area', f'{tail}_tail_drag_area'),
                    ('wetted_area', f'{tail}_tail_wetted_area'),
                ],
            )
            self.set_input_defaults(f'{tail}_tail_aspect_ratio', np.full(n, aspect))
            self.set_input_defaults(f'{tail}_tail_sweep', np.full(n, sweep), units='rad')
        self.set_input_defaults('tail_thickness_to_chord', np.full(n, VT_THICKNESS_TO_CHORD))
        add_polar_point(self, 'cruise', 'mid_cruise_mass')


class TurbofanGroup(om.Group):
    """
    The under-wing turbofans: fan, nacelle drag, core fuel flow, engine and nacelle mass.

    Parameters
    ----------
    **kwargs : dict of keyword arguments
        Keyword arguments that will be mapped into the Group options.
    """

    def initialize(self):
        """
        Declare options.
        """
        _declare(self.options, 'vec_size', 'num_engines', 'aft_fan')

    def setup(self):
        """
        Add the turbofan components.
        """
        n, count = self.options['vec_size'], self.options['num_engines']
        _add(
            self,
            'split',
            ThrustSplitComp(vec_size=n, num_engines=count),
            ['drag', 'aft_thrust_fraction'],
            ['turbofan_thrust', 'aft_fan_thrust'],
        )
        _add(
            self,
            'fan',
            DuctedFanComp(vec_size=n),
            [
                ('net_thrust', 'turbofan_thrust'),
                ('inflow_total_temperature', 'total_temperature'),
                ('inflow_total_pressure', 'total_pressure'),
                ('ram_velocity', 'true_airspeed'),
                ('ambient_pressure', 'pressure'),
            ]
            + _prefixed('turbofan', ['fan_pressure_ratio', 'fan_efficiency', 'fan_face_mach']),
            _prefixed('turbofan', _FAN_OUTPUTS),
        )
        _add(
            self,
            'annulus',
            FanAnnulusComp(vec_size=n, hub='ratio'),
            _prefixed('turbofan', ['fan_face_area', 'hub_to_tip_ratio']),
            _prefixed('turbofan', ['fan_diameter', 'hub_diameter']),
        )
        _add(
            self,
            'nacelle',
            NacelleGeometryComp(vec_size=n),
            [
                ('fan_diameter', 'turbofan_fan_diameter'),
                ('diameter_ratio', 'turbofan_nacelle_diameter_ratio'),
            ],
            [('nacelle_diameter', 'turbofan_nacelle_diameter')],
        )
        _add(
            self,
            'nacelle_drag',
            BodyDragComp(vec_size=n, shape='nacelle', count=count),
            [
                ('diameter', 'turbofan_nacelle_diameter'),
                ('fineness_ratio', 'turbofan_nacelle_fineness_ratio'),
                ('interference_factor', 'turbofan_nacelle_interference_factor'),
                'mach',
                'true_airspeed',
                'density',
                'viscosity',
            ],
            _prefixed(
                'turbofan_nacelle',
                [
                    'length',
                    'reynolds_number',
                    'skin_friction_coefficient',
                    'form_factor',
                    'wetted_area',
                    'drag_area',
                ],
            ),
        )
        _add(
            self,
            'core',
            TurbofanCoreComp(vec_size=n),
            [
                ('fan_shaft_power', 'turbofan_shaft_power'),
                ('power_extraction', 'engine_power_extraction'),
                ('thermal_efficiency', 'core_thermal_efficiency'),
                'fuel_heating_value',
                ('net_thrust', 'turbofan_thrust'),
            ],
            [('fuel_flow', 'engine_fuel_flow'), ('tsfc', 'turbofan_tsfc')],
        )
        _add(
            self,
            'static',
            StaticThrustPerPowerComp(vec_size=n),
            _prefixed('turbofan', ['fan_pressure_ratio', 'fan_efficiency']),
            [('thrust_per_power', 'turbofan_static_thrust_per_power')],
        )
        # The cores also drive the generators at their rated power.
        electric = (
            [
                ('shaft_power_extracted', 'generator_input_power'),
                ('sizing_factor', 'electrical_sizing_factor'),
            ]
            if self.options['aft_fan']
            else []
        )
        _add(
            self,
            'mass',
            EngineMassComp(vec_size=n, count=count),
            [
                ('cruise_thrust', 'turbofan_thrust'),
                'rated_to_cruise_thrust',
                ('static_thrust_per_power', 'turbofan_static_thrust_per_power'),
                ('fan_diameter', 'turbofan_fan_diameter'),
                ('nacelle_wetted_area', 'turbofan_nacelle_wetted_area'),
            ]
            + _prefixed('turbofan', ['fan_areal_mass', 'core_specific_power', 'nacelle_areal_mass'])
            + electric,
            [
                ('rated_thrust', 'turbofan_rated_thrust'),
                ('core_shaft_power', 'turbofan_core_shaft_power'),
                ('engine_mass', 'turbofan_engine_mass'),
                ('nacelle_mass', 'turbofan_nacelle_mass'),
                ('total_nacelle_mass', 'nacelles_mass'),
                ('total_engine_mass', 'engines_mass'),
            ],
        )


class AftFanGroup(om.Group):
    """
    The wake-ingesting aft fan: boundary layer, capture height, fan, reference fan, mass.

    Parameters
    ----------
    **kwargs : dict of keyword arguments
        Keyword arguments that will be mapped into the Group options.
    """

    def initialize(self):
        """
        Declare options.
        """
        _declare(self.options, 'vec_size', 'profile_exponent')

    def setup(self):
        """
        Add the aft-fan components.
        """
        n, expo = self.options['vec_size'], self.options['profile_exponent']
        fan_settings = _AFT_FAN_SETTINGS
        _add(
            self,
            'boundary_layer',
            FuselageBoundaryLayerComp(vec_size=n, profile_exponent=expo),
            [
                'fuselage_drag',
                'density',
                'true_airspeed',
                'fuselage_diameter',
                'station_diameter_ratio',
            ],
            [
                ('station_diameter', 'aft_fan_hub_diameter'),
                'momentum_thickness',
                'boundary_layer_thickness',
            ],
        )
        _add(
            self,
            'ingested',
            IngestedFlowComp(vec_size=n, profile_exponent=expo),
            [
                'capture_height',
                'boundary_layer_thickness',
                ('station_diameter', 'aft_fan_hub_diameter'),
                'density',
                'true_airspeed',
                ('static_pressure', 'pressure'),
                'total_temperature',
            ],
            [
                'captured_mass_flow',
                'ingested_momentum_flow',
                'ingested_kinetic_energy_flow',
                'capture_area',
            ]
            + _prefixed(
                'aft_fan',
                [
                    'ram_velocity',
                    'energy_velocity',
                    'inflow_total_pressure',
                    'inflow_nonuniformity',
                ],
            ),
        )
        _add(
            self,
            'distortion',
            DistortedFanEfficiencyComp(vec_size=n),
            [
                ('clean_fan_efficiency', 'aft_fan_efficiency'),
                ('inflow_nonuniformity', 'aft_fan_inflow_nonuniformity'),
                ('distortion_sensitivity', 'aft_fan_distortion_sensitivity'),
            ],
            [('fan_efficiency', 'aft_fan_installed_efficiency')],
        )
        _add(
            self,
            'fan',
            DuctedFanComp(vec_size=n),
            [
                ('net_thrust', 'aft_fan_thrust'),
                ('inflow_total_temperature', 'total_temperature'),
                ('inflow_total_pressure', 'aft_fan_inflow_total_pressure'),
                ('ram_velocity', 'aft_fan_ram_velocity'),
                ('ambient_pressure', 'pressure'),
                ('fan_efficiency', 'aft_fan_installed_efficiency'),
            ]
            + fan_settings,
            _prefixed('aft', _FAN_OUTPUTS),
        )
        _add(
            self,
            'annulus',
            FanAnnulusComp(vec_size=n, hub='diameter'),
            [('fan_face_area', 'aft_fan_face_area'), ('hub_diameter', 'aft_fan_hub_diameter')],
            [
                ('fan_diameter', 'aft_fan_diameter'),
                ('hub_to_tip_ratio', 'aft_fan_hub_to_tip_ratio'),
            ],
        )
        _add(
            self,
            'capture',
            CaptureHeightComp(vec_size=n),
            ['captured_mass_flow', ('required_mass_flow', 'aft_mass_flow')],
            ['capture_height'],
        )
        _add(
            self,
            'nacelle',
            NacelleGeometryComp(vec_size=n),
            [
                ('fan_diameter', 'aft_fan_diameter'),
                ('diameter_ratio', 'aft_nacelle_diameter_ratio'),
            ],
            [('nacelle_diameter', 'aft_nacelle_diameter')],
        )
        _add(
            self,
            'nacelle_drag',
            BodyDragComp(vec_size=n, shape='nacelle', count=1),
            [
                ('diameter', 'aft_nacelle_diameter'),
                ('fineness_ratio', 'aft_nacelle_fineness_ratio'),
                ('interference_factor', 'aft_nacelle_interference_factor'),
                'mach',
                'true_airspeed',
                'density',
                'viscosity',
            ],
            _prefixed(
                'aft_nacelle',
                [
                    'length',
                    'reynolds_number',
                    'skin_friction_coefficient',
                    'form_factor',
                    'wetted_area',
                    'drag_area',
                ],
            ),
        )
        _add(
            self,
            'mass',
            AftFanMassComp(vec_size=n),
            [
                ('fan_face_area', 'aft_fan_face_area'),
                ('fan_areal_mass', 'aft_fan_areal_mass'),
                ('nacelle_wetted_area', 'aft_nacelle_wetted_area'),
                ('nacelle_areal_mass', 'aft_nacelle_areal_mass'),
                ('structure_fraction', 'aft_structure_fraction'),
            ],
            [('mass', 'aft_fan_mass')],
        )


class ElectricalChainGroup(om.Group):
    """
    Generator -> rectifier -> cable -> inverter -> motor, and thermal management.

    Power flows backwards from the aft-fan shaft power; the generators' input is the shaft
    power extracted from the turbofans.

    Parameters
    ----------
    **kwargs : dict of keyword arguments
        Keyword arguments that will be mapped into the Group options.
    """

    def initialize(self):
        """
        Declare options.
        """
        _declare(self.options, 'vec_size')

    def setup(self):
        """
        Add one component per device.
        """
        n = self.options['vec_size']
        delivered = 'aft_shaft_power'
        for device in CHAIN:
            outputs = _prefixed(device, ['input_power', 'loss', 'mass'])
            if device == 'cable':
                comp = CableComp(vec_size=n)
                inputs = [
                    ('output_power', delivered),
                    ('sizing_factor', 'electrical_sizing_factor'),
                    ('ambient_pressure', 'pressure'),
                ] + _prefixed(
                    'cable',
                    [
                        'voltage',
                        'length',
                        'current_density_limit',
                        'resistivity',
                        'conductor_density',
                        'mass_factor',
                        'dielectric_strength',
                        'insulation_design_factor',
                        'insulation_density',
                        'discharge_gap',
                        'discharge_safety_factor',
                    ],
                )
                outputs += _prefixed(
                    'cable',
                    [
                        'efficiency',
                        'current',
                        'rated_current',
                        'cross_section_area',
                        'resistance',
                        'current_density',
                        'voltage_drop',
                        'insulation_thickness',
                        'insulation_mass',
                        'discharge_voltage',
                        'voltage_margin',
                    ],
                )
            else:
                comp = ElectricalDeviceComp(vec_size=n)
                inputs = [
                    ('output_power', delivered),
                    ('sizing_factor', 'electrical_sizing_factor'),
                ] + _prefixed(device, ['efficiency', 'specific_power'])
                outputs += _prefixed(device, ['rated_power'])
            _add(self, device, comp, inputs, outputs)
            delivered = f'{device}_input_power'
        _add(
            self,
            'thermal',
            ThermalManagementComp(vec_size=n, sources=dict(CHAIN_LOSS_EXPONENTS)),
            [f'{device}_loss' for device in CHAIN]
            + [('sizing_factor', 'electrical_sizing_factor')]
            + _prefixed('thermal', ['specific_mass', 'drag_per_power']),
            [
                ('heat_load', 'thermal_load'),
                ('rated_heat_load', 'thermal_rated_load'),
                ('mass', 'thermal_mass'),
                ('drag', 'thermal_drag'),
            ],
        )
        _add(
            self,
            'summary',
            ElectricalSummaryComp(vec_size=n, devices=list(CHAIN) + ['thermal']),
            [f'{device}_mass' for device in CHAIN]
            + [
                'thermal_mass',
                ('shaft_power_extracted', 'generator_input_power'),
                ('aft_fan_shaft_power', 'aft_shaft_power'),
            ],
            ['electrical_mass', ('chain_efficiency', 'electrical_chain_efficiency')],
        )


#: Items of the airframe build-up, summed into the airframe mass.
AIRFRAME_ITEMS = (
    'wing',
    'fuselage',
    'horizontal_tail',
    'vertical_tail',
    'landing_gear',
    'systems',
    'furnishings',
    'operating_items',
)


class AirframeBuildUpGroup(om.Group):
    """
    Airframe mass built up from its components: wing, fuselage, tails, gear and systems.

    Parameters
    ----------
    **kwargs : dict of keyword arguments
        Keyword arguments that will be mapped into the Group options.
    """

    def initialize(self):
        """
        Declare options.
        """
        _declare(self.options, 'vec_size')

    def setup(self):
        """
        Add one component per mass item.
        """
        n = self.options['vec_size']
        design = ('design_mass', 'mtow')
        sweep = ('sweep', 'wing_sweep')
        _add(
            self,
            'wing',
            WingMassComp(vec_size=n),
            [
                design,
                'ultimate_load_factor',
                'wing_area',
                'aspect_ratio',
                sweep,
                'thickness_to_chord',
                'taper_ratio',
            ],
            ['wing_mass'],
        )
        _add(
            self,
            'tails',
            TailMassComp(vec_size=n),
            [
                design,
                'ultimate_load_factor',
                'horizontal_tail_area',
                'vertical_tail_area',
                'tail_arm',
            ],
            ['horizontal_tail_mass', 'vertical_tail_mass'],
        )
        _add(
            self,
            'fuselage',
            FuselageMassComp(vec_size=n),
            [
                design,
                'ultimate_load_factor',
                'fuselage_length',
                'fuselage_wetted_area',
                'fuselage_diameter',
                'wingspan',
                sweep,
                'taper_ratio',
            ],
            ['fuselage_mass'],
        )
        _add(self, 'gear', LandingGearMassComp(vec_size=n), [design], ['landing_gear_mass'])
        _add(
            self,
            'systems',
            SystemsMassComp(vec_size=n),
            [
                design,
                'payload',
                'systems_fraction',
                'mass_per_passenger',
                'furnishings_per_passenger',
                'operating_items_per_passenger',
            ],
            ['systems_mass', 'furnishings_mass', 'operating_items_mass'],
        )
        _add(
            self,
            'equipment',
            MassSumComp(
                vec_size=n,
                items=['systems', 'furnishings', 'operating_items'],
                total='equipment_mass',
            ),
            ['systems_mass', 'furnishings_mass', 'operating_items_mass'],
            ['equipment_mass'],
        )
        _add(
            self,
            'sum',
            MassSumComp(vec_size=n, items=list(AIRFRAME_ITEMS)),
            [f'{item}_mass' for item in AIRFRAME_ITEMS],
            ['airframe_mass'],
        )


class SizingLoop(om.Group):
    """
    The coupled sizing loop, solved by Newton's method with a direct linear solver.

    Parameters
    ----------
    **kwargs : dict of keyword arguments
        Keyword arguments that will be mapped into the Group options.
    """

    def initialize(self):
        """
        Declare options.
        """
        _declare(self.options, *_OPTIONS)

    def setup(self):
        """
        Add the disciplines and the solvers.
        """
        opt = self.options
        n = opt['vec_size']
        if opt['wing_sizing'] == 'loading':
            _add(
                self,
                'wing_area',
                WingAreaComp(vec_size=n),
                ['mtow', 'design_wing_loading'],
                ['wing_area'],
            )
        _add(
            self,
            'aerodynamics',
            AerodynamicsGroup(vec_size=n),
            ['*'],
            ['*'],
        )
        _add(
            self,
            'turbofans',
            TurbofanGroup(vec_size=n, num_engines=opt['num_engines'], aft_fan=opt['aft_fan']),
            ['*'],
            ['*'],
        )
        items = ['engines']
        if opt['aft_fan']:
            _add(
                self,
                'aft_fan',
                AftFanGroup(vec_size=n, profile_exponent=opt['profile_exponent']),
                ['*'],
                ['*'],
            )
            _add(self, 'electrical', ElectricalChainGroup(vec_size=n), ['*'], ['*'])
            items += ['aft_fan', 'electrical']
            extracted = [('shaft_power_extracted', 'generator_input_power')]
        else:
            extracted = []
        _add(
            self,
            'propulsion',
            PropulsionSystemComp(vec_size=n, num_engines=opt['num_engines']),
            ['engine_fuel_flow'] + extracted,
            ['fuel_flow', 'engine_power_extraction'],
        )
        _add(
            self,
            'efficiency',
            OverallEfficiencyComp(vec_size=n),
            [('net_thrust', 'drag'), 'true_airspeed', 'fuel_flow', 'fuel_heating_value'],
            ['overall_efficiency', 'tsfc'],
        )
        if opt['structure'] == 'build_up':
            _add(self, 'airframe', AirframeBuildUpGroup(vec_size=n), ['*'], ['*'])
        else:
            _add(
                self,
                'airframe',
                AirframeMassComp(vec_size=n),
                ['mtow', 'airframe_mass_coefficient', 'airframe_mass_exponent'],
                ['airframe_mass'],
            )
        _add(
            self,
            'masses',
            MassBuildUpComp(vec_size=n, propulsion_items=items),
            ['airframe_mass', 'payload', 'total_fuel'] + [f'{item}_mass' for item in items],
            ['propulsion_mass', 'oew', 'mtow'],
        )
        _add(
            self,
            'mission',
            MissionFuelComp(vec_size=n),
            [
                'mtow',
                'range',
                'lift_to_drag',
                'overall_efficiency',
                'fuel_heating_value',
                'takeoff_fraction',
                'climb_fraction',
                'landing_fraction',
                'diversion_range',
                'hold_time',
                'true_airspeed',
                'contingency_fraction',
            ],
            [
                'cruise_fuel_fraction',
                'block_fuel',
                'reserve_fuel',
                'total_fuel',
                'top_of_climb_mass',
                'mid_cruise_mass',
                'landing_mass',
                'block_energy',
            ],
        )

        _newton_solve(self, solve_subsystems=True, max_sub_solves=2)

    def guess_nonlinear(self, inputs, outputs, residuals):
        """
        Start the aft-fan capture height from the closed-form inverse of its mass flux.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        residuals : Vector
            Unscaled, dimensional residuals read via residuals[key].
        """
        if not self.options['aft_fan']:
            return
        need = outputs['aft_mass_flow']
        if np.all(need > 0) and np.all(outputs['boundary_layer_thickness'] > 0):
            outputs['capture_height'] = initial_capture_height(
                need,
                inputs['aft_fan.boundary_layer.density'],
                inputs['aft_fan.boundary_layer.true_airspeed'],
                np.pi * outputs['aft_fan_hub_diameter'],
                outputs['boundary_layer_thickness'],
                self.options['profile_exponent'],
            )


class PowerSavingGroup(om.Group):
    """
    The aft fan's free-stream references and its power saving coefficients.

    Nothing in the sizing loop depends on these, so they run after it. Both references
    give the same net thrust on clean free-stream inflow at the clean-inflow efficiency:
    one at the same fan pressure ratio (``power_saving_coefficient``), one with the same
    mass flow (``power_saving_coefficient_same_mass_flow``).

    Parameters
    ----------
    **kwargs : dict of keyword arguments
        Keyword arguments that will be mapped into the Group options.
    """

    def initialize(self):
        """
        Declare options.
        """
        _declare(self.options, 'vec_size')

    def setup(self):
        """
        Add the reference fan and the power saving coefficient.
        """
        n = self.options['vec_size']
        _add(
            self,
            'reference_fan',
            DuctedFanComp(vec_size=n),
            [
                ('net_thrust', 'aft_fan_thrust'),
                ('inflow_total_temperature', 'total_temperature'),
                ('inflow_total_pressure', 'total_pressure'),
                ('ram_velocity', 'true_airspeed'),
                ('ambient_pressure', 'pressure'),
                ('fan_efficiency', 'aft_fan_efficiency'),
            ]
            + _AFT_FAN_SETTINGS,
            _prefixed('aft_reference', _FAN_OUTPUTS),
        )
        _add(
            self,
            'same_mass_flow_fan',
            SameMassFlowFanComp(vec_size=n),
            [
                ('net_thrust', 'aft_fan_thrust'),
                ('mass_flow', 'aft_mass_flow'),
                'true_airspeed',
                'total_temperature',
                'total_pressure',
                ('ambient_pressure', 'pressure'),
                ('fan_efficiency', 'aft_fan_efficiency'),
            ],
            _prefixed('aft_same_mass_flow', ['fan_pressure_ratio', 'jet_velocity', 'shaft_power']),
        )
        for name, reference in (
            ('power_saving', 'aft_reference_shaft_power'),
            ('power_saving_same_mass_flow', 'aft_same_mass_flow_shaft_power'),
        ):
            _add(
                self,
                name,
                PowerSavingComp(vec_size=n),
                [('shaft_power', 'aft_shaft_power'), ('reference_shaft_power', reference)],
                [('power_saving_coefficient', name.replace('saving', 'saving_coefficient'))],
            )


class PerformanceGroup(om.Group):
    """
    Performance constraints of the sized aircraft: field lengths, climb, buffet, ratings.

    The take-off thrust counts the turbofans at their rated thrust (their cores are sized
    for the generators' take-off draw as well) and the aft fan at what its rated motor power
    gives at sea-level static. Top of climb is flown at cruise altitude and Mach number at
    the start-of-cruise mass, with the drag polar (and wave drag) at its own lift
    coefficient and that thrust lapsed.

    Parameters
    ----------
    **kwargs : dict of keyword arguments
        Keyword arguments that will be mapped into the Group options.
    """

    def initialize(self):
        """
        Declare options.
        """
        _declare(self.options, 'vec_size', 'num_engines', 'aft_fan')

    def setup(self):
        """
        Add the constraint components.
        """
        n, count = self.options['vec_size'], self.options['num_engines']
        aft = self.options['aft_fan']
        electric = []
        if aft:
            _add(
                self,
                'aft_fan_static',
                StaticThrustPerPowerComp(vec_size=n),
                [
                    ('fan_pressure_ratio', 'aft_fan_pressure_ratio'),
                    ('fan_efficiency', 'aft_fan_installed_efficiency'),
                ],
                [('thrust_per_power', 'aft_fan_static_thrust_per_power')],
            )
            electric = [
                'motor_rated_power',
                ('aft_thrust_per_power', 'aft_fan_static_thrust_per_power'),
            ]
        _add(
            self,
            'takeoff_thrust',
            TakeoffThrustComp(vec_size=n, num_engines=count),
            ['turbofan_rated_thrust'] + electric,
            [
                'installed_thrust',
                'turbofan_takeoff_thrust',
                'turbofans_takeoff_thrust',
                'aft_fan_takeoff_thrust',
                'aft_fan_takeoff_power',
            ],
        )
        _add(
            self,
            'takeoff',
            TakeoffFieldLengthComp(vec_size=n),
            [
                'mtow',
                'wing_area',
                ('takeoff_thrust', 'installed_thrust'),
                ('max_lift_coefficient_takeoff', 'takeoff_max_lift_coefficient'),
            ],
            [
                'takeoff_field_length',
                'takeoff_parameter',
                'wing_loading',
                ('thrust_to_weight', 'takeoff_thrust_to_weight'),
            ],
        )
        _add(
            self,
            'landing',
            LandingComp(vec_size=n),
            [
                'landing_mass',
                'wing_area',
                ('max_lift_coefficient_landing', 'landing_max_lift_coefficient'),
            ],
            ['stall_speed', 'approach_speed', 'landing_field_length'],
        )
        add_polar_point(self, 'climb', 'top_of_climb_mass', prefix='top_of_climb')
        _add(
            self,
            'lapse',
            ThrustLapseComp(vec_size=n),
            ['pressure', 'temperature', 'mach', 'throttle_ratio'],
            ['thrust_lapse'],
        )
        _add(
            self,
            'climb',
            TopOfClimbComp(vec_size=n),
            [
                ('rated_thrust', 'turbofans_takeoff_thrust'),
                'thrust_lapse',
                ('mass', 'top_of_climb_mass'),
                ('lift_to_drag', 'top_of_climb_lift_to_drag'),
                'true_airspeed',
                'residual_climb_rate',
            ]
            + (
                [
                    ('electric_thrust', 'aft_fan_thrust'),
                    ('electric_power_ratio', 'electrical_sizing_factor'),
                ]
                if aft
                else []
            ),
            [
                ('available_thrust', 'climb_available_thrust'),
                ('required_thrust', 'climb_required_thrust'),
                ('thrust_margin', 'climb_thrust_margin'),
            ],
        )
        _add(
            self,
            'buffet',
            BuffetMarginComp(vec_size=n),
            ['lift_coefficient', 'buffet_lift_coefficient', 'buffet_margin_load_factor'],
            ['buffet_margin'],
        )
        if not aft:
            return
        _add(
            self,
            'aft_fan_blade_height',
            RatingMarginComp(vec_size=n),
            [('value', 'aft_fan_hub_to_tip_ratio'), ('rating', 'aft_fan_max_hub_to_tip_ratio')],
            [('margin', 'aft_fan_hub_to_tip_margin')],
        )
        _add(
            self,
            'aft_fan_size',
            DiameterLimitComp(vec_size=n),
            [
                ('fan_diameter', 'aft_fan_diameter'),
                'fuselage_diameter',
                ('max_diameter_ratio', 'aft_fan_max_diameter_ratio'),
            ],
            [('diameter_margin', 'aft_fan_diameter_margin')],
        )
        _add(
            self,
            'motor_rating',
            RatingMarginComp(vec_size=n, units='W'),
            [('value', 'motor_rated_power'), ('rating', 'motor_power_limit')],
            [('margin', 'motor_power_margin')],
        )
        _add(
            self,
            'cable_rating',
            RatingMarginComp(vec_size=n, units='A/m**2'),
            [('value', 'cable_current_density'), ('rating', 'cable_current_density_limit')],
            [('margin', 'cable_current_density_margin')],
        )


#: Inputs of the Breguet mission shared by the design and the economic missions.
_MISSION_SHARED = [
    'overall_efficiency',
    'fuel_heating_value',
    'takeoff_fraction',
    'climb_fraction',
    'landing_fraction',
    'diversion_range',
    'hold_time',
    'true_airspeed',
    'contingency_fraction',
]


class EconomicMissionGroup(om.Group):
    """
    The sized aircraft flown on a shorter economic mission.

    The masses, wing, engines and aft fan are those the design mission sized; the economic
    mission sets its own payload and range, and its take-off mass (operating empty mass,
    payload and fuel, reserves included) is solved with its fuel by Newton's method. It
    cruises at the design cruise altitude and Mach number with the drag polar at its own
    lift coefficient, and with the design cruise point's overall efficiency (part-power
    changes of the propulsion system are not modelled).

    Parameters
    ----------
    **kwargs : dict of keyword arguments
        Keyword arguments that will be mapped into the Group options.
    """

    def initialize(self):
        """
        Declare options.
        """
        _declare(self.options, 'vec_size', 'max_iterations', 'tolerance')

    def setup(self):
        """
        Add the mission, its drag polar, its take-off mass and the take-off mass margin.
        """
        opt = self.options
        n = opt['vec_size']
        _add(
            self,
            'mission',
            MissionFuelComp(vec_size=n),
            [
                ('mtow', 'economic_takeoff_mass'),
                ('range', 'economic_range'),
                ('lift_to_drag', 'economic_lift_to_drag'),
            ]
            + _MISSION_SHARED,
            _prefixed(
                'economic',
                [
                    'cruise_fuel_fraction',
                    'block_fuel',
                    'reserve_fuel',
                    'total_fuel',
                    'top_of_climb_mass',
                    'mid_cruise_mass',
                    'landing_mass',
                    'block_energy',
                ],
            ),
        )
        add_polar_point(self, 'economic', 'economic_mid_cruise_mass', prefix='economic')
        _add(
            self,
            'takeoff_mass',
            MassSumComp(vec_size=n, items=['empty', 'payload', 'fuel'], total='takeoff_mass'),
            [
                ('empty_mass', 'oew'),
                ('payload_mass', 'economic_payload'),
                ('fuel_mass', 'economic_total_fuel'),
            ],
            [('takeoff_mass', 'economic_takeoff_mass')],
        )
        _add(
            self,
            'takeoff_mass_margin',
            RatingMarginComp(vec_size=n, units='kg'),
            [('value', 'economic_takeoff_mass'), ('rating', 'mtow')],
            [('margin', 'economic_takeoff_mass_margin')],
        )
        _newton_solve(self, solve_subsystems=False)


class AircraftModel(om.Group):
    """
    The whole aircraft: cruise flight condition, fuselage drag and the sizing loop.

    Parameters
    ----------
    **kwargs : dict of keyword arguments
        Keyword arguments that will be mapped into the Group options.
    """

    def initialize(self):
        """
        Declare options.
        """
        _declare(self.options, *_OPTIONS)

    def setup(self):
        """
        Add the flight condition, the fixed geometry and the sizing loop.
        """
        opt = self.options
        n = opt['vec_size']
        _add(self, 'cruise', FlightConditionGroup(vec_size=n), ['*'], ['*'])
        _add(
            self,
            'fuselage',
            BodyDragComp(vec_size=n, shape='fuselage', count=1),
            [
                ('diameter', 'fuselage_diameter'),
                ('fineness_ratio', 'fuselage_fineness_ratio'),
                ('interference_factor', 'fuselage_interference_factor'),
                'mach',
                'true_airspeed',
                'density',
                'viscosity',
            ],
            _prefixed(
                'fuselage',
                [
                    'length',
                    'reynolds_number',
                    'skin_friction_coefficient',
                    'form_factor',
                    'wetted_area',
                    'drag_area',
                ],
            ),
        )
        loop = {name: opt[name] for name in _OPTIONS}
        _add(self, 'sizing', SizingLoop(**loop), ['*'], ['*'])
        if opt['aft_fan']:
            _add(self, 'power_saving', PowerSavingGroup(vec_size=n), ['*'], ['*'])
        if opt['economic_mission']:
            _add(
                self,
                'economic',
                EconomicMissionGroup(
                    vec_size=n, max_iterations=opt['max_iterations'], tolerance=opt['tolerance']
                ),
                ['*'],
                ['*'],
            )
        _add(
            self,
            'performance',
            PerformanceGroup(vec_size=n, num_engines=opt['num_engines'], aft_fan=opt['aft_fan']),
            ['*'],
            ['*'],
        )
