"""Tests of the capture-height balance and of the coupled aft-fan solve with ingestion."""

import numpy as np
import openmdao.api as om
import pytest
from ambiance import Atmosphere

from voltwake.components.boundary_layer import (
    FuselageBoundaryLayerComp,
    IngestedFlowComp,
    layer_flux_shapes,
)
from voltwake.components.capture_height import CaptureHeightComp, initial_capture_height
from voltwake.components.ducted_fan import DuctedFanComp
from voltwake.components.gas import CP_AIR, GAMMA
from voltwake.components.power_saving import PowerSavingComp

from partials import check_component_partials

# Cruise at 35000 ft, ISA, Mach 0.78; atmosphere from the `ambiance` reference library.
ATM = Atmosphere(35000.0 * 0.3048)
RHO = float(ATM.density[0])
P_STATIC = float(ATM.pressure[0])
T_STATIC = float(ATM.temperature[0])
SPEED = 0.78 * float(ATM.speed_of_sound[0])
T_TOTAL = T_STATIC + SPEED**2 / (2.0 * CP_AIR)
# Isentropic total pressure (Anderson, Modern Compressible Flow; common practice).
PT_FREE = P_STATIC * (1.0 + 0.5 * (GAMMA - 1.0) * 0.78**2) ** (GAMMA / (GAMMA - 1.0))

# Illustrative airliner inputs (demo values, not checks): fuselage drag, diameter and the
# fuselage diameter ratio at the fan station.
FUSELAGE_DRAG = 8000.0
FUSELAGE_DIAMETER = 4.0
STATION_RATIO = 0.6
FAN = {
    'fan_pressure_ratio': 1.3,
    'fan_efficiency': 0.93,
    'fan_face_mach': 0.6,
}


def _captured(height, delta, perimeter, n=7.0):
    """Mass flow captured up to the height by a planar layer, C rho V f_1(h)."""
    height = np.atleast_1d(np.asarray(height, dtype=float))
    (f_1,), _, _ = layer_flux_shapes(height, delta * np.ones_like(height), n, 0, (1,))
    return perimeter * RHO * SPEED * f_1


@pytest.mark.parametrize('n', [7.0, 5.0])
def test_initial_capture_height_inverts_mass_flux(n):
    delta, perimeter = 0.5, 7.5
    m_delta = perimeter * RHO * SPEED * delta * n / (n + 1.0)
    required = m_delta * np.array([1e-3, 0.3, 0.999, 1.0, 1.001, 2.5])
    heights = initial_capture_height(required, RHO, SPEED, perimeter, delta, n)
    assert np.all(np.diff(heights) > 0.0)
    assert heights[3] == pytest.approx(delta, rel=1e-14)
    assert _captured(heights, delta, perimeter, n) == pytest.approx(required, rel=1e-12)


def test_capture_height_residual():
    prob = om.Problem(reports=False)
    prob.model.add_subsystem(
        'bal', CaptureHeightComp(vec_size=2, mass_flow_ref=50.0), promotes=['*']
    )
    prob.setup()
    prob.set_val('captured_mass_flow', [120.0, 80.0])
    prob.set_val('required_mass_flow', [100.0, 100.0])
    prob.run_model()
    prob.model.run_apply_nonlinear()
    residual = prob.model._residuals['bal.capture_height']
    assert residual == pytest.approx([0.4, -0.4], rel=1e-14)
    assert prob.get_val('capture_height') == pytest.approx([0.3, 0.3])


def test_capture_height_partials():
    for ref in (100.0, 35.0):
        check_component_partials(
            CaptureHeightComp(vec_size=3, mass_flow_ref=ref),
            {
                'captured_mass_flow': [90.0, 150.0, 400.0],
                'required_mass_flow': [100.0, 140.0, 380.0],
            },
            outputs={'capture_height': [0.2, 0.5, 1.1]},
        )


def _solve_aft_fan(thrust):
    """
    Solve the aft fan with ingestion next to the same fan on free-stream inflow.

    Coupled group: boundary layer -> ingested flow -> aft fan -> capture-height balance,
    solved by Newton from the capture height given by initial_capture_height for the
    free-stream fan's mass flow.
    """
    thrust = np.atleast_1d(np.asarray(thrust, dtype=float))
    n = thrust.size
    prob = om.Problem(reports=False)
    model = prob.model
    model.add_subsystem(
        'bl', FuselageBoundaryLayerComp(vec_size=n), promotes_inputs=['*'], promotes_outputs=['*']
    )

    coupled = model.add_subsystem('coupled', om.Group(), promotes=['*'])
    coupled.add_subsystem(
        'flow',
        IngestedFlowComp(vec_size=n),
        promotes_inputs=['*'],
        promotes_outputs=['captured_mass_flow', 'ram_velocity', 'inflow_total_pressure'],
    )
    coupled.add_subsystem(
        'fan', DuctedFanComp(vec_size=n), promotes_inputs=['ram_velocity', 'inflow_total_pressure']
    )
    coupled.add_subsystem('bal', CaptureHeightComp(vec_size=n), promotes=['*'])
    coupled.connect('fan.mass_flow', 'required_mass_flow')
    coupled.nonlinear_solver = om.NewtonSolver(
        solve_subsystems=False,
        maxiter=30,
        atol=1e-12,
        rtol=1e-12,
        iprint=-1,
        err_on_non_converge=True,
    )
    coupled.linear_solver = om.DirectSolver()

    model.add_subsystem('ref_fan', DuctedFanComp(vec_size=n))
    model.add_subsystem('psc', PowerSavingComp(vec_size=n))
    model.connect('fan.shaft_power', 'psc.shaft_power')
    model.connect('ref_fan.shaft_power', 'psc.reference_shaft_power')
    prob.setup()

    prob.set_val('fuselage_drag', FUSELAGE_DRAG)
    prob.set_val('density', RHO)
    prob.set_val('true_airspeed', SPEED)
    prob.set_val('fuselage_diameter', FUSELAGE_DIAMETER)
    prob.set_val('station_diameter_ratio', STATION_RATIO)
    prob.set_val('static_pressure', P_STATIC)
    prob.set_val('total_temperature', T_TOTAL)
    for fan in ('fan', 'ref_fan'):
        prob.set_val(f'{fan}.net_thrust', thrust)
        prob.set_val(f'{fan}.inflow_total_temperature', T_TOTAL)
        prob.set_val(f'{fan}.ambient_pressure', P_STATIC)
        for name, value in FAN.items():
            prob.set_val(f'{fan}.{name}', value)
    prob.set_val('ref_fan.inflow_total_pressure', PT_FREE)
    prob.set_val('ref_fan.ram_velocity', SPEED)

    # First pass without Newton iterations only evaluates the boundary layer and the
    # free-stream fan, which give the starting value of the capture height.
    newton = coupled.nonlinear_solver
    newton.options['maxiter'] = 0
    newton.options['err_on_non_converge'] = False
    prob.run_model()
    start = initial_capture_height(
        prob.get_val('ref_fan.mass_flow'),
        RHO,
        SPEED,
        np.pi * prob.get_val('station_diameter'),
        prob.get_val('boundary_layer_thickness'),
    )
    prob.set_val('capture_height', start)
    newton.options['maxiter'] = 30
    newton.options['err_on_non_converge'] = True
    prob.run_model()
    return prob, start


def test_coupled_solve_cruise_aft_fan():
    # Aft fan of 7 kN at cruise: the solved capture stays inside the layer.
    prob, start = _solve_aft_fan([7000.0])
    height = prob.get_val('capture_height')
    delta = prob.get_val('boundary_layer_thickness')
    assert prob.get_val('captured_mass_flow') == pytest.approx(
        prob.get_val('fan.mass_flow'), rel=1e-10
    )
    assert 0.0 < height[0] < delta[0]
    # Ingestion changes the mass flow, so Newton had to move away from the starting value.
    assert abs(height[0] - start[0]) > 1e-3 * delta[0]
    # The fan meets its thrust with the ingested inflow: F = mdot (V_j - V_m).
    assert prob.get_val('fan.mass_flow') * (
        prob.get_val('fan.jet_velocity') - prob.get_val('ram_velocity')
    ) == pytest.approx(7000.0, rel=1e-10)
    # Power saving of fuselage boundary-layer ingestion is of the order of a few percent to a
    # few tens of percent; roughly 8 % less power than a podded fan was measured in wind-tunnel
    # tests of a BLI propulsor (common practice).
    psc = prob.get_val('psc.power_saving_coefficient')[0]
    assert 0.02 < psc < 0.4


def test_coupled_solve_below_and_above_layer_edge():
    # A tiny thrust swallows only the inner layer; a large one reaches into the free stream.
    thrust = np.array([300.0, 7000.0, 60000.0])
    prob, _ = _solve_aft_fan(thrust)
    height = prob.get_val('capture_height')
    delta = prob.get_val('boundary_layer_thickness')
    assert height[0] < delta[0] and height[1] < delta[1]
    assert height[2] > delta[2]
    assert prob.get_val('captured_mass_flow') == pytest.approx(
        prob.get_val('fan.mass_flow'), rel=1e-10
    )
    psc = prob.get_val('psc.power_saving_coefficient')
    # The more of the captured stream is slow boundary-layer fluid, the larger the saving.
    assert np.all(psc > 0.0)
    assert np.all(np.diff(psc) < 0.0)
    # Same vector solved point by point gives the same heights (points are independent).
    for i, value in enumerate(thrust):
        single, _ = _solve_aft_fan([value])
        assert single.get_val('capture_height')[0] == pytest.approx(height[i], rel=1e-9)
