"""Tests of DuctedFanComp: hand calculation, physics identities, trends and partials."""

import math

import numpy as np
import openmdao.api as om
import pytest
from ambiance import Atmosphere

from voltwake.components.ducted_fan import DuctedFanComp

from partials import check_component_partials

GAMMA = 1.4  # common practice (calorically perfect air)
R = 287.05287  # J/(kg K), ISO 2533:1975 standard atmosphere
CP = GAMMA * R / (GAMMA - 1.0)

# Cruise point: Mach 0.78 at 35,000 ft (10,668 m geopotential) ISA, ISO 2533:1975 table values.
T_35K = 218.81  # K
P_35K = 23842.0  # Pa
MACH = 0.78


def _freestream():
    """Return total temperature, total pressure and speed at the cruise point (isentropic)."""
    f = 1.0 + 0.5 * (GAMMA - 1.0) * MACH**2
    tt = T_35K * f
    pt = P_35K * f ** (GAMMA / (GAMMA - 1.0))
    v = MACH * math.sqrt(GAMMA * R * T_35K)
    return tt, pt, v


def _run(vec_size=1, **inputs):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('fan', DuctedFanComp(vec_size=vec_size), promotes=['*'])
    prob.setup(force_alloc_complex=True)
    for name, value in inputs.items():
        prob.set_val(name, value)
    prob.run_model()
    return prob


def _podded(fpr=1.5, eta=0.92, thrust=18000.0, fan_mach=0.65, vec_size=1):
    tt, pt, v = _freestream()
    return _run(
        vec_size=vec_size,
        net_thrust=thrust,
        inflow_total_temperature=tt,
        inflow_total_pressure=pt,
        ram_velocity=v,
        ambient_pressure=P_35K,
        fan_pressure_ratio=fpr,
        fan_efficiency=eta,
        fan_face_mach=fan_mach,
    )


def test_cruise_point_matches_isa():
    # Reference library `ambiance` (ISO 2533:1975); 35,000 ft is a geopotential altitude.
    atm = Atmosphere(Atmosphere.geop2geom_height(35000 * 0.3048))
    assert atm.temperature[0] == pytest.approx(T_35K, abs=0.01)
    assert atm.pressure[0] == pytest.approx(P_35K, rel=1e-4)


def test_hand_calculation_at_cruise():
    # Independent re-derivation with plain floats from the formulas named in the docstring
    # (Cumpsty, Jet Propulsion, 2nd ed.; Mattingly, Elements of Propulsion; from memory).
    fpr, eta, thrust, fan_mach = 1.5, 0.92, 18000.0, 0.65  # demo inputs
    tt, pt, v = _freestream()
    k = (GAMMA - 1.0) / GAMMA

    tt2 = tt * (1.0 + (fpr**k - 1.0) / eta)
    pt2 = fpr * pt
    v_jet = math.sqrt(2.0 * CP * tt2 * (1.0 - (P_35K / pt2) ** k))
    mdot = thrust / (v_jet - v)
    power = mdot * CP * (tt2 - tt)
    mfp = (
        math.sqrt(GAMMA / R)
        * fan_mach
        * (1.0 + 0.5 * (GAMMA - 1.0) * fan_mach**2) ** (-(GAMMA + 1.0) / (2.0 * (GAMMA - 1.0)))
    )
    area = mdot * math.sqrt(tt) / (pt * mfp)

    prob = _podded(fpr, eta, thrust, fan_mach)
    assert prob.get_val('fan_exit_total_temperature')[0] == pytest.approx(tt2, rel=1e-12)
    assert prob.get_val('jet_velocity')[0] == pytest.approx(v_jet, rel=1e-12)
    assert prob.get_val('specific_thrust')[0] == pytest.approx(v_jet - v, rel=1e-12)
    assert prob.get_val('mass_flow')[0] == pytest.approx(mdot, rel=1e-12)
    assert prob.get_val('shaft_power')[0] == pytest.approx(power, rel=1e-12)
    assert prob.get_val('fan_face_area')[0] == pytest.approx(area, rel=1e-12)


def test_froude_propulsive_efficiency():
    # Podded fan, eta_f = 1: F V / (mdot (Vj^2 - V^2) / 2) = 2 / (1 + Vj / V)
    # (Froude propulsive efficiency, textbook identity; common practice).
    v = _freestream()[2]
    prob = _podded(fpr=np.array([1.3, 1.5, 1.7]), eta=1.0, vec_size=3)
    vj = prob.get_val('jet_velocity')
    mdot = prob.get_val('mass_flow')
    thrust = prob.get_val('net_thrust')
    eta_p = thrust * v / (mdot * (vj**2 - v**2) / 2.0)
    assert np.allclose(eta_p, 2.0 / (1.0 + vj / v), rtol=1e-12)


def test_ideal_power_equals_jet_kinetic_energy_rise():
    # Energy balance (common practice): an isentropic fan expanded to free-stream static
    # pressure adds exactly the jet kinetic-energy rise, P = mdot (Vj^2 - V^2) / 2.
    v = _freestream()[2]
    prob = _podded(fpr=np.array([1.2, 1.5, 1.8]), eta=1.0, vec_size=3)
    vj = prob.get_val('jet_velocity')
    mdot = prob.get_val('mass_flow')
    assert np.allclose(prob.get_val('shaft_power'), mdot * (vj**2 - v**2) / 2.0, rtol=1e-10)


def test_fan_losses_cost_power():
    # A lossy fan needs more shaft power than the jet kinetic-energy rise (trend).
    v = _freestream()[2]
    prob = _podded(eta=0.92)
    vj = prob.get_val('jet_velocity')[0]
    mdot = prob.get_val('mass_flow')[0]
    assert prob.get_val('shaft_power')[0] > mdot * (vj**2 - v**2) / 2.0


def test_lower_fpr_gives_more_flow_bigger_fan_less_power():
    # Trend at fixed thrust (common practice): lower FPR -> larger mass flow and fan-face
    # area, lower shaft power.
    prob = _podded(fpr=np.array([1.3, 1.5, 1.7]), vec_size=3)
    assert np.all(np.diff(prob.get_val('mass_flow')) < 0.0)
    assert np.all(np.diff(prob.get_val('fan_face_area')) < 0.0)
    assert np.all(np.diff(prob.get_val('shaft_power')) > 0.0)


def test_choked_mass_flow_parameter():
    # At M = 1 the mass flow parameter mdot sqrt(Tt) / (A pt) is 0.0404 kg sqrt(K) / (N s)
    # for gamma = 1.4, R = 287 (Mattingly, Elements of Propulsion; from memory).
    prob = _podded(fan_mach=1.0)
    tt, pt, _ = _freestream()
    mfp = prob.get_val('mass_flow')[0] * math.sqrt(tt) / (prob.get_val('fan_face_area')[0] * pt)
    assert mfp == pytest.approx(0.0404, rel=2e-3)


@pytest.mark.filterwarnings('ignore:invalid value encountered in sqrt:RuntimeWarning')
def test_no_thrust_regime_is_not_hidden():
    # Wake inflow with 10 % total-pressure loss (demo value) but full free-stream ram velocity
    # and a low FPR: the jet is slower than the inflow and the model reports negative
    # specific thrust and mass flow (documented behaviour, checked by the enclosing model).
    tt, pt, v = _freestream()
    prob = _run(
        net_thrust=5000.0,
        inflow_total_temperature=tt,
        inflow_total_pressure=0.9 * pt,
        ram_velocity=v,
        ambient_pressure=P_35K,
        fan_pressure_ratio=1.05,
    )
    assert prob.get_val('jet_velocity')[0] < v
    assert prob.get_val('specific_thrust')[0] < 0.0
    assert prob.get_val('mass_flow')[0] < 0.0
    assert prob.get_val('fan_face_area')[0] < 0.0


def test_partials_podded_cruise():
    tt, pt, v = _freestream()
    check_component_partials(
        DuctedFanComp(vec_size=3),
        {
            'net_thrust': [15000.0, 18000.0, 22000.0],
            'inflow_total_temperature': [240.0, tt, 250.0],
            'inflow_total_pressure': [34000.0, pt, 37000.0],
            'ram_velocity': [220.0, v, 240.0],
            'ambient_pressure': [23000.0, P_35K, 24500.0],
            'fan_pressure_ratio': [1.35, 1.5, 1.65],
            'fan_efficiency': [0.9, 0.92, 0.94],
            'fan_face_mach': [0.6, 0.65, 0.7],
        },
    )


def test_partials_wake_ingesting_and_static():
    # Wake-like inflow (lower total pressure and ram velocity) and a static sea-level point
    # (ISA sea level: 288.15 K, 101325 Pa; ISO 2533:1975).
    check_component_partials(
        DuctedFanComp(vec_size=3),
        {
            'net_thrust': [4000.0, 6000.0, 80000.0],
            'inflow_total_temperature': [244.0, 246.0, 288.15],
            'inflow_total_pressure': [33000.0, 34500.0, 101325.0],
            'ram_velocity': [170.0, 190.0, 0.0],
            'ambient_pressure': [23842.0, 23842.0, 101325.0],
            'fan_pressure_ratio': [1.25, 1.4, 1.45],
            'fan_efficiency': [0.93, 0.91, 0.88],
            'fan_face_mach': [0.55, 0.62, 0.5],
        },
    )
