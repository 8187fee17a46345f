"""Tests of the standard atmosphere and flight condition components."""

import numpy as np
import openmdao.api as om
import pytest
from ambiance import Atmosphere

from voltwake.components.atmosphere import AtmosphereComp, FlightConditionComp

from partials import check_component_partials


def _run(component, inputs):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', component, promotes=['*'])
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, np.asarray(value, dtype=float))
    prob.run_model()
    return prob


def _atmosphere(altitudes):
    altitudes = np.asarray(altitudes, dtype=float)
    return _run(AtmosphereComp(vec_size=altitudes.size), {'altitude': altitudes})


def test_against_ambiance_on_grid():
    # Reference library: ambiance (ICAO 1993 standard atmosphere). Its constructor takes
    # geometric height, so the geopotential grid is converted with its own
    # geop2geom_height (h = r H / (r - H), r = 6356766 m).
    geopotential = np.linspace(0.0, 20000.0, 81)
    prob = _atmosphere(geopotential)
    reference = Atmosphere(Atmosphere.geop2geom_height(geopotential))
    np.testing.assert_allclose(reference.H, geopotential, rtol=1e-12, atol=1e-6)
    # ambiance starts the isothermal layer from the rounded table value 22632.0 Pa; we
    # derive it from the troposphere (22632.04 Pa), a 2e-6 relative difference.
    for ours, theirs in [
        ('temperature', reference.temperature),
        ('pressure', reference.pressure),
        ('density', reference.density),
        ('speed_of_sound', reference.speed_of_sound),
        ('viscosity', reference.dynamic_viscosity),
    ]:
        np.testing.assert_allclose(prob.get_val(ours), theirs, rtol=1e-5, err_msg=ours)


def test_sea_level_table_values():
    prob = _atmosphere([0.0])
    # Tolerances are half a unit of the last tabulated digit.
    # ISO 2533:1975 defining sea-level constants: 288.15 K, 101325 Pa.
    assert prob.get_val('temperature')[0] == pytest.approx(288.15, abs=1e-10)
    assert prob.get_val('pressure')[0] == pytest.approx(101325.0, abs=1e-8)
    # ISO 2533 / ICAO Doc 7488 sea-level table: rho 1.2250 kg/m**3, a 340.294 m/s,
    # mu 1.7894e-5 Pa s (from memory).
    assert prob.get_val('density')[0] == pytest.approx(1.2250, abs=5e-5)
    assert prob.get_val('speed_of_sound')[0] == pytest.approx(340.294, abs=5e-4)
    assert prob.get_val('viscosity')[0] == pytest.approx(1.7894e-5, abs=5e-10)


def test_tropopause_and_20km_table_values():
    prob = _atmosphere([11000.0, 20000.0])
    # ISO 2533 / ICAO Doc 7488 table at 11 km geopotential: 216.65 K, 22632 Pa,
    # 0.36392 kg/m**3; at 20 km: 216.65 K, 5474.9 Pa (from memory).
    np.testing.assert_allclose(prob.get_val('temperature'), [216.65, 216.65], atol=1e-10)
    assert prob.get_val('pressure')[0] == pytest.approx(22632.0, abs=0.5)
    assert prob.get_val('density')[0] == pytest.approx(0.36392, abs=5e-6)
    assert prob.get_val('pressure')[1] == pytest.approx(5474.9, abs=0.05)


def test_continuous_at_tropopause():
    prob = _atmosphere([11000.0 - 1e-6, 11000.0])
    for name in ['temperature', 'pressure', 'density', 'speed_of_sound', 'viscosity']:
        below, above = prob.get_val(name)
        assert below == pytest.approx(above, rel=1e-9), name


def test_hydrostatic_trend():
    # Pressure and density fall monotonically; temperature is constant above 11 km.
    prob = _atmosphere(np.linspace(0.0, 20000.0, 41))
    assert np.all(np.diff(prob.get_val('pressure')) < 0.0)
    assert np.all(np.diff(prob.get_val('density')) < 0.0)
    temperature = prob.get_val('temperature')
    np.testing.assert_allclose(temperature[22:], 216.65, atol=1e-10)


@pytest.mark.parametrize('altitudes', [[0.0, 6000.0, 15000.0], [10500.0, 11500.0, 19800.0]])
def test_atmosphere_partials(altitudes):
    # atol=0: in SI the viscosity and density gradients are 1e-10..1e-4 per metre, so an
    # absolute tolerance would hide errors in them; complex step is exact to round-off.
    check_component_partials(AtmosphereComp(vec_size=3), {'altitude': altitudes}, atol=0.0)


def test_flight_condition_hand_values():
    mach = np.array([0.0, 0.78, 1.0])
    atmo = _atmosphere([0.0, 11000.0, 11000.0])
    names = ['temperature', 'pressure', 'density', 'speed_of_sound']
    prob = _run(
        FlightConditionComp(vec_size=3), dict({'mach': mach}, **{n: atmo.get_val(n) for n in names})
    )
    temperature = atmo.get_val('temperature')
    pressure = atmo.get_val('pressure')
    sound = atmo.get_val('speed_of_sound')
    np.testing.assert_allclose(prob.get_val('true_airspeed'), mach * sound, rtol=1e-14)
    # With a**2 = gamma p / rho, q = (gamma / 2) p M**2 (common practice).
    np.testing.assert_allclose(
        prob.get_val('dynamic_pressure'), 0.7 * pressure * mach**2, rtol=1e-12
    )
    # At rest the total state equals the static state.
    assert prob.get_val('total_temperature')[0] == pytest.approx(temperature[0], rel=1e-14)
    assert prob.get_val('total_pressure')[0] == pytest.approx(pressure[0], rel=1e-14)
    # Isentropic flow table at M = 1 (gamma 1.4): T0/T = 1.200, p0/p = 1.893
    # (Anderson, Modern Compressible Flow, appendix A, from memory).
    assert prob.get_val('total_temperature')[2] / temperature[2] == pytest.approx(1.200, abs=5e-4)
    assert prob.get_val('total_pressure')[2] / pressure[2] == pytest.approx(1.893, abs=5e-4)
    # Hand calculation at M = 0.78: T0/T = 1 + 0.2 * 0.78**2 = 1.12168,
    # p0/p = 1.12168**3.5 = 1.49466 (formula in the class docstring).
    assert prob.get_val('total_temperature')[1] / temperature[1] == pytest.approx(
        1.12168, rel=1e-12
    )
    assert prob.get_val('total_pressure')[1] / pressure[1] == pytest.approx(1.12168**3.5, rel=1e-12)


@pytest.mark.parametrize(
    'point',
    [
        {
            'mach': [0.3, 0.78, 0.85],
            'temperature': [288.15, 223.0, 216.65],
            'pressure': [101325.0, 26500.0, 22632.0],
            'density': [1.225, 0.414, 0.364],
            'speed_of_sound': [340.3, 299.4, 295.1],
        },
        {
            'mach': [0.1, 0.5, 1.2],
            'temperature': [300.0, 250.0, 210.0],
            'pressure': [90000.0, 50000.0, 10000.0],
            'density': [1.05, 0.70, 0.166],
            'speed_of_sound': [347.0, 317.0, 290.0],
        },
    ],
)
def test_flight_condition_partials(point):
    # atol=0 so that only the relative error counts (complex step is exact to round-off).
    check_component_partials(FlightConditionComp(vec_size=3), point, atol=0.0)
