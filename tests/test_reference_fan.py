"""Tests of SameMassFlowFanComp: round trip with DuctedFanComp, hand values, limits, partials."""

import math

import numpy as np
import openmdao.api as om
import pytest
from ambiance import Atmosphere
from scipy.optimize import brentq

from voltwake.components.ducted_fan import DuctedFanComp
from voltwake.components.reference_fan import SameMassFlowFanComp

from partials import check_component_partials

GAMMA = 1.4  # common practice (calorically perfect air)
R = 287.05287  # J/(kg K), ISO 2533:1975 standard atmosphere
CP = GAMMA * R / (GAMMA - 1.0)
K = (GAMMA - 1.0) / GAMMA

# Cruise point: Mach 0.78 at 35,000 ft (10,668 m geopotential) ISA, ISO 2533:1975 table values.
T_35K = 218.81  # K
P_35K = 23842.0  # Pa
MACH = 0.78


def _freestream(mach=MACH, t_static=T_35K, p_static=P_35K):
    """Return total temperature, total pressure and speed of an isentropic free stream."""
    f = 1.0 + 0.5 * (GAMMA - 1.0) * mach**2
    return (
        t_static * f,
        p_static * f ** (GAMMA / (GAMMA - 1.0)),
        mach * math.sqrt(GAMMA * R * t_static),
    )


TT0, PT0, V0 = _freestream()


def _run(comp_class, vec_size=1, **inputs):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('fan', comp_class(vec_size=vec_size), promotes=['*'])
    prob.setup(force_alloc_complex=True)
    for name, value in inputs.items():
        prob.set_val(name, value)
    prob.run_model()
    return prob


def _reference(thrust, mdot, eta=0.93, vec_size=1, tt0=TT0, pt0=PT0, v0=V0, p0=P_35K):
    return _run(
        SameMassFlowFanComp,
        vec_size=vec_size,
        net_thrust=thrust,
        mass_flow=mdot,
        true_airspeed=v0,
        total_temperature=tt0,
        total_pressure=pt0,
        ambient_pressure=p0,
        fan_efficiency=eta,
    )


def _ducted(thrust, fpr, eta, vec_size=1, tt0=TT0, pt0=PT0, v0=V0, p0=P_35K):
    return _run(
        DuctedFanComp,
        vec_size=vec_size,
        net_thrust=thrust,
        inflow_total_temperature=tt0,
        inflow_total_pressure=pt0,
        ram_velocity=v0,
        ambient_pressure=p0,
        fan_pressure_ratio=fpr,
        fan_efficiency=eta,
        fan_face_mach=0.62,  # any value: it sets only the fan-face area
    )


def test_cruise_point_matches_isa():
    # Reference library `ambiance` (ISO 2533:1975); 35,000 ft is a geopotential altitude.
    atm = Atmosphere(Atmosphere.geop2geom_height(35000 * 0.3048))
    assert atm.temperature[0] == pytest.approx(T_35K, abs=0.01)
    assert atm.pressure[0] == pytest.approx(P_35K, rel=1e-4)


def test_round_trip_with_ducted_fan():
    # The key consistency check: the pressure ratio returned here, fed into DuctedFanComp at
    # the same thrust on the same free stream, gives back the same mass flow, jet velocity and
    # shaft power.
    thrust = np.array([7000.0, 12000.0, 3000.0])
    mdot = np.array([90.0, 150.0, 40.0])
    eta = np.array([0.93, 0.90, 0.96])
    ref = _reference(thrust, mdot, eta, vec_size=3)
    fpr = ref.get_val('fan_pressure_ratio')
    fan = _ducted(thrust, fpr, eta, vec_size=3)
    assert np.all(fpr > 1.0)
    assert fan.get_val('mass_flow') == pytest.approx(mdot, rel=1e-10)
    assert fan.get_val('jet_velocity') == pytest.approx(ref.get_val('jet_velocity'), rel=1e-10)
    assert fan.get_val('shaft_power') == pytest.approx(ref.get_val('shaft_power'), rel=1e-10)


def test_round_trip_sea_level_static():
    # Same round trip at sea-level static (ISA sea level 288.15 K, 101325 Pa; ISO 2533:1975),
    # where a = 1 and the ram velocity is zero.
    thrust = np.array([60000.0, 80000.0, 20000.0])
    mdot = np.array([300.0, 250.0, 200.0])
    eta = np.array([0.90, 0.92, 1.0])
    kwargs = dict(tt0=288.15, pt0=101325.0, v0=0.0, p0=101325.0)
    ref = _reference(thrust, mdot, eta, vec_size=3, **kwargs)
    fan = _ducted(thrust, ref.get_val('fan_pressure_ratio'), eta, vec_size=3, **kwargs)
    assert fan.get_val('mass_flow') == pytest.approx(mdot, rel=1e-10)
    assert fan.get_val('shaft_power') == pytest.approx(ref.get_val('shaft_power'), rel=1e-10)


def test_inverse_round_trip_from_ducted_fan():
    # Reverse direction: the mass flow DuctedFanComp needs at a given pressure ratio gives
    # that pressure ratio back here.
    fpr = np.array([1.2, 1.4, 1.7])
    eta = np.array([0.92, 0.94, 0.88])
    thrust = np.array([7000.0, 9000.0, 15000.0])
    fan = _ducted(thrust, fpr, eta, vec_size=3)
    ref = _reference(thrust, fan.get_val('mass_flow'), eta, vec_size=3)
    assert ref.get_val('fan_pressure_ratio') == pytest.approx(fpr, rel=1e-10)


def test_hand_value_by_root_finding():
    # Hand value from the jet-velocity equation of the docstring (Cumpsty, Jet Propulsion,
    # 2nd ed., one-dimensional propulsor relations; from memory), solved here for the fan
    # pressure ratio by bracketed root finding on the original equation, not the quadratic.
    thrust, mdot, eta = 7000.0, 90.0, 0.93  # demo inputs
    vj = V0 + thrust / mdot

    def residual(fpr):
        tau_s = fpr**K
        return (
            2.0 * CP * TT0 * (1.0 + (tau_s - 1.0) / eta) * (1.0 - (P_35K / (fpr * PT0)) ** K)
            - vj**2
        )

    fpr = brentq(residual, 1.0, 3.0, xtol=1e-15, rtol=1e-15)
    power = mdot * CP * TT0 * (fpr**K - 1.0) / eta

    ref = _reference(thrust, mdot, eta)
    assert ref.get_val('jet_velocity')[0] == pytest.approx(vj, rel=1e-14)
    assert ref.get_val('fan_pressure_ratio')[0] == pytest.approx(fpr, rel=1e-12)
    assert ref.get_val('shaft_power')[0] == pytest.approx(power, rel=1e-12)
    # Rounded figures of this point, for the record (hand value from the equation above).
    assert vj == pytest.approx(309.08, abs=0.01)
    assert fpr == pytest.approx(1.3266, abs=1e-4)
    assert power == pytest.approx(2.0068e6, rel=1e-4)


def test_ideal_fan_hand_values():
    # Ideal fan (eta = 1) expanded to free-stream static pressure: the jet static temperature
    # is the free-stream static temperature, so Tt0 tau_s = T0 + Vj^2 / (2 cp), and the shaft
    # power is the jet kinetic-energy rise mdot (Vj^2 - V0^2) / 2 (energy balance; common
    # practice).
    thrust = np.array([3000.0, 7000.0, 12000.0])
    mdot = np.array([120.0, 90.0, 60.0])
    ref = _reference(thrust, mdot, eta=1.0, vec_size=3)
    vj = V0 + thrust / mdot
    tau_s = (T_35K + vj**2 / (2.0 * CP)) / TT0
    assert ref.get_val('fan_pressure_ratio') == pytest.approx(tau_s ** (1.0 / K), rel=1e-12)
    assert ref.get_val('shaft_power') == pytest.approx(mdot * (vj**2 - V0**2) / 2.0, rel=1e-10)


def test_no_thrust_limit():
    # F / mdot -> 0: no work, FPR -> 1 and P -> 0 on an isentropic free stream.
    ref = _reference(np.array([0.0, 1e-3, 1.0]), 100.0, eta=0.9, vec_size=3)
    fpr = ref.get_val('fan_pressure_ratio')
    power = ref.get_val('shaft_power')
    assert fpr[0] == pytest.approx(1.0, abs=1e-13)
    assert abs(power[0]) < 1e-13 * 100.0 * CP * TT0
    assert np.all(np.diff(fpr) > 0.0)
    assert np.all(np.diff(power) > 0.0)


def test_small_thrust_slope():
    # First-order expansion of the quadratic about tau_s = 1 (hand value from the equations of
    # the docstring): d tau_s / d c = eta / (1 - a (1 - eta)) and dc = V0 dVj / (cp Tt0), so
    # P -> F V0 / (1 - a (1 - eta)) as F / mdot -> 0 with a = T0 / Tt0. The losses cost less
    # than 1 / eta at vanishing work because only the part T0 / Tt0 of them stays in the jet.
    eta = np.array([0.85, 0.92, 1.0])
    thrust = 1e-3
    ref = _reference(thrust, 100.0, eta=eta, vec_size=3)
    a = T_35K / TT0
    expected = thrust * V0 / (1.0 - a * (1.0 - eta))
    assert ref.get_val('shaft_power') == pytest.approx(expected, rel=1e-7)


def test_more_mass_flow_less_power():
    # Trend at fixed thrust (propulsive efficiency; common practice): a larger mass flow
    # needs a lower jet velocity, a lower pressure ratio and less shaft power, and the shaft
    # power always exceeds the thrust power F V0.
    thrust = 7000.0
    ref = _reference(thrust, np.array([50.0, 100.0, 200.0]), vec_size=3)
    power = ref.get_val('shaft_power')
    assert np.all(np.diff(ref.get_val('jet_velocity')) < 0.0)
    assert np.all(np.diff(ref.get_val('fan_pressure_ratio')) < 0.0)
    assert np.all(np.diff(power) < 0.0)
    assert np.all(power > thrust * V0)


def test_fan_losses_cost_power():
    # Trend (common practice): a lossier fan needs more shaft power for the same thrust and
    # mass flow. Its pressure ratio is slightly lower: at a given pressure ratio the loss
    # heats the jet, and Vj^2 = 2 cp Tt2 (1 - (p0 / pt2)^k) grows with Tt2 (from the
    # equation of the docstring), so less pressure rise gives the same jet velocity.
    ref = _reference(7000.0, 90.0, eta=np.array([1.0, 0.93, 0.85]), vec_size=3)
    assert np.all(np.diff(ref.get_val('shaft_power')) > 0.0)
    assert np.all(np.diff(ref.get_val('fan_pressure_ratio')) < 0.0)
    assert np.all(ref.get_val('fan_pressure_ratio') > 1.0)


def test_partials_cruise():
    check_component_partials(
        SameMassFlowFanComp(vec_size=3),
        {
            'net_thrust': [5000.0, 7000.0, 12000.0],
            'mass_flow': [80.0, 90.0, 150.0],
            'true_airspeed': [220.0, V0, 240.0],
            'total_temperature': [240.0, TT0, 250.0],
            'total_pressure': [34000.0, PT0, 37000.0],
            'ambient_pressure': [23000.0, P_35K, 24500.0],
            'fan_efficiency': [0.9, 0.93, 0.95],
        },
    )


def test_partials_static_ideal_and_no_thrust():
    # Sea-level static (ISA, ISO 2533:1975), an ideal fan and a cruise point with a small
    # specific thrust (2 m/s). At zero thrust exactly the power and its efficiency partial are
    # zero up to round-off of tau_s - 1 times mdot cp Tt0 (about 1e-9 W), which the absolute
    # tolerance of 1e-14 cannot take; the values there are checked in test_no_thrust_limit.
    check_component_partials(
        SameMassFlowFanComp(vec_size=3),
        {
            'net_thrust': [60000.0, 9000.0, 200.0],
            'mass_flow': [300.0, 70.0, 100.0],
            'true_airspeed': [0.0, 200.0, V0],
            'total_temperature': [288.15, 260.0, TT0],
            'total_pressure': [101325.0, 45000.0, PT0],
            'ambient_pressure': [101325.0, 32000.0, P_35K],
            'fan_efficiency': [0.88, 1.0, 0.91],
        },
    )
