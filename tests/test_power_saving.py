"""Tests of the power saving coefficient, alone and fed by the ingested-flow and fan models."""

import numpy as np
import openmdao.api as om
import pytest
from ambiance import Atmosphere

from voltwake.components.boundary_layer import IngestedFlowComp
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


def test_power_saving_hand_values():
    # PSC = 1 - P/P_ref (Smith, "Wake ingestion propulsion benefit", J. Propulsion and
    # Power, 1993; from memory).
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('psc', PowerSavingComp(vec_size=3), promotes=['*'])
    prob.setup()
    prob.set_val('shaft_power', [1.6e6, 2.0e6, 2.2e6])
    prob.set_val('reference_shaft_power', [2.0e6, 2.0e6, 2.0e6])
    prob.run_model()
    assert prob.get_val('power_saving_coefficient') == pytest.approx([0.2, 0.0, -0.1], abs=1e-15)


def test_power_saving_partials():
    check_component_partials(
        PowerSavingComp(vec_size=3),
        {'shaft_power': [1.6e6, 5.0e5, 9.0e6], 'reference_shaft_power': [2.0e6, 5.5e5, 9.5e6]},
    )
    check_component_partials(
        PowerSavingComp(vec_size=3),
        {'shaft_power': [3.0e3, 2.5e7, 1.0e6], 'reference_shaft_power': [4.0e3, 2.6e7, 1.2e6]},
    )


def _psc_at_heights(heights, delta=0.5, thrust=7000.0):
    """PSC of a fan fed by the flow captured up to each height versus a free-stream fan."""
    heights = np.asarray(heights, dtype=float)
    n = heights.size
    prob = om.Problem(reports=False)
    model = prob.model
    model.add_subsystem('flow', IngestedFlowComp(vec_size=n))
    model.add_subsystem('fan', DuctedFanComp(vec_size=n))
    model.add_subsystem('ref_fan', DuctedFanComp(vec_size=n))
    model.add_subsystem('psc', PowerSavingComp(vec_size=n))
    model.connect('flow.ram_velocity', 'fan.ram_velocity')
    model.connect('flow.inflow_total_pressure', 'fan.inflow_total_pressure')
    model.connect('fan.shaft_power', 'psc.shaft_power')
    model.connect('ref_fan.shaft_power', 'psc.reference_shaft_power')
    prob.setup()
    prob.set_val('flow.capture_height', heights)
    prob.set_val('flow.boundary_layer_thickness', delta)
    prob.set_val('flow.station_diameter', 2.4)
    prob.set_val('flow.density', RHO)
    prob.set_val('flow.true_airspeed', SPEED)
    prob.set_val('flow.static_pressure', P_STATIC)
    prob.set_val('flow.total_temperature', T_TOTAL)
    for fan in ('fan', 'ref_fan'):
        prob.set_val(f'{fan}.net_thrust', thrust)
        prob.set_val(f'{fan}.inflow_total_temperature', T_TOTAL)
        prob.set_val(f'{fan}.ambient_pressure', P_STATIC)
        prob.set_val(f'{fan}.fan_pressure_ratio', 1.3)
        prob.set_val(f'{fan}.fan_efficiency', 0.93)
    prob.set_val('ref_fan.inflow_total_pressure', PT_FREE)
    prob.set_val('ref_fan.ram_velocity', SPEED)
    prob.run_model()
    return prob


def test_free_stream_limit_gives_no_saving():
    # Capturing a layer thin compared to the capture height, the fan sees free-stream inflow:
    # V_m -> V, pt_in -> pt_0, the fan matches the free-stream fan and PSC -> 0.
    delta = 0.5
    ratios = np.array([1.0e1, 1.0e2, 1.0e3, 1.0e4])
    prob = _psc_at_heights(ratios * delta, delta=delta)
    psc = prob.get_val('psc.power_saving_coefficient')
    assert np.all(psc > 0.0)
    assert psc[-1] < 1e-4
    # The saving goes with the share of layer fluid in the capture area, which grows like h^2
    # once h is well above the station radius (1.2 m): a hundredfold less for every tenfold
    # taller capture.
    assert psc[1:-1] / psc[2:] == pytest.approx(100.0, rel=5e-2)
    assert prob.get_val('fan.mass_flow')[-1] == pytest.approx(
        prob.get_val('ref_fan.mass_flow')[-1], rel=1e-4
    )
    assert prob.get_val('fan.jet_velocity')[-1] == pytest.approx(
        prob.get_val('ref_fan.jet_velocity')[-1], rel=1e-4
    )


def test_deeper_ingestion_saves_more():
    # Fed by slower, lower-pressure inflow (smaller capture height) the same thrust at the same
    # fan pressure ratio needs less shaft power.
    psc = _psc_at_heights([0.1, 0.25, 0.5, 1.0]).get_val('psc.power_saving_coefficient')
    assert np.all(psc > 0.0) and np.all(np.diff(psc) < 0.0)
