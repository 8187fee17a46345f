"""Tests of the fuselage boundary layer and of the flow captured from it."""

import numpy as np
import openmdao.api as om
import pytest
from ambiance import Atmosphere
from scipy.integrate import quad

from voltwake.components.boundary_layer import (
    FuselageBoundaryLayerComp,
    IngestedFlowComp,
    layer_flux_shapes,
)
from voltwake.components.gas import CP_AIR, GAMMA

from partials import check_component_partials

# Cruise at 35000 ft, ISA, Mach 0.78; atmosphere from the `ambiance` reference library.
ATM = Atmosphere(35000.0 * 0.3048)
RHO = float(ATM.density[0])
P_STATIC = float(ATM.pressure[0])
T_STATIC = float(ATM.temperature[0])
SPEED = 0.78 * float(ATM.speed_of_sound[0])
T_TOTAL = T_STATIC + SPEED**2 / (2.0 * CP_AIR)
# Free-stream total pressure, isentropic relation p_t/p = (1 + (g-1)/2 M^2)^(g/(g-1))
# (Anderson, Modern Compressible Flow, isentropic relations; common practice).
PT_FREE = P_STATIC * (1.0 + 0.5 * (GAMMA - 1.0) * 0.78**2) ** (GAMMA / (GAMMA - 1.0))


def _ingested_problem(heights, delta=0.5, perimeter=7.5, n=7.0):
    """Run IngestedFlowComp at the cruise condition for an array of capture heights."""
    heights = np.atleast_1d(np.asarray(heights, dtype=float))
    prob = om.Problem(reports=False)
    prob.model.add_subsystem(
        'flow', IngestedFlowComp(vec_size=heights.size, profile_exponent=n), promotes=['*']
    )
    prob.setup()
    prob.set_val('capture_height', heights)
    prob.set_val('boundary_layer_thickness', delta)
    prob.set_val('perimeter', perimeter)
    prob.set_val('density', RHO)
    prob.set_val('true_airspeed', SPEED)
    prob.set_val('static_pressure', P_STATIC)
    prob.set_val('total_temperature', T_TOTAL)
    prob.run_model()
    return prob


def _profile_integral(height, delta, n, k):
    """Quadrature of (u/V)^k from the wall to the height for the power-law profile."""
    inner, _ = quad(
        lambda y: (y / delta) ** (k / n), 0.0, min(height, delta), epsabs=1e-14, epsrel=1e-12
    )
    return inner + max(height - delta, 0.0)


def test_thickness_ratio_one_seventh_law():
    # theta/delta = 7/72 for the 1/7 power law (Schlichting, Boundary-Layer Theory, turbulent
    # flat plate with the 1/7 power law; from memory); theta = D/(rho V^2 C) is the
    # momentum-deficit/drag relation (common practice), evaluated by hand here.
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('bl', FuselageBoundaryLayerComp(), promotes=['*'])
    prob.setup()
    prob.set_val('fuselage_drag', 8000.0)
    prob.set_val('density', RHO)
    prob.set_val('true_airspeed', SPEED)
    prob.set_val('fuselage_diameter', 4.0)
    prob.set_val('station_diameter_ratio', 0.6)
    prob.run_model()
    perimeter = np.pi * 0.6 * 4.0
    theta = 8000.0 / (RHO * SPEED**2 * perimeter)
    assert prob.get_val('perimeter')[0] == pytest.approx(perimeter, rel=1e-14)
    assert prob.get_val('momentum_thickness')[0] == pytest.approx(theta, rel=1e-14)
    assert prob.get_val('momentum_thickness')[0] / prob.get_val('boundary_layer_thickness')[
        0
    ] == pytest.approx(7.0 / 72.0, rel=1e-14)


@pytest.mark.parametrize('n', [5.0, 7.0, 9.0])
def test_thickness_ratio_against_quadrature(n):
    # theta/delta = int_0^1 u/V (1 - u/V) d(y/delta), evaluated by quadrature.
    ratio, _ = quad(lambda s: s ** (1 / n) * (1.0 - s ** (1 / n)), 0.0, 1.0, epsrel=1e-12)
    comp_ratio = n / ((n + 1.0) * (n + 2.0))
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('bl', FuselageBoundaryLayerComp(profile_exponent=n), promotes=['*'])
    prob.setup()
    prob.run_model()
    assert comp_ratio == pytest.approx(ratio, rel=1e-10)
    assert prob.get_val('momentum_thickness')[0] / prob.get_val('boundary_layer_thickness')[
        0
    ] == pytest.approx(ratio, rel=1e-10)


def test_fluxes_at_edge_equal_closed_form():
    # At h = delta: f_k = delta n/(n+k); f_1 = delta - delta* with delta*/delta = 1/8 for the
    # 1/7 law (Schlichting, Boundary-Layer Theory; from memory).
    delta, perimeter = 0.5, 7.5
    prob = _ingested_problem([delta], delta=delta, perimeter=perimeter)
    flux = perimeter * RHO * SPEED
    assert prob.get_val('captured_mass_flow')[0] == pytest.approx(
        flux * delta * 7.0 / 8.0, rel=1e-13
    )
    assert prob.get_val('captured_mass_flow')[0] == pytest.approx(
        flux * (delta - delta / 8.0), rel=1e-13
    )
    assert prob.get_val('ingested_momentum_flow')[0] == pytest.approx(
        flux * SPEED * delta * 7.0 / 9.0, rel=1e-13
    )
    assert prob.get_val('ingested_kinetic_energy_flow')[0] == pytest.approx(
        0.5 * flux * SPEED**2 * delta * 7.0 / 10.0, rel=1e-13
    )


@pytest.mark.parametrize('n', [5.0, 7.0])
@pytest.mark.parametrize('eta', [0.05, 0.4, 0.9, 1.0, 1.3, 4.0])
def test_fluxes_against_quadrature(n, eta):
    delta, perimeter = 0.45, 6.0
    prob = _ingested_problem([eta * delta], delta=delta, perimeter=perimeter, n=n)
    flux = perimeter * RHO * SPEED
    q1, q2, q3 = (_profile_integral(eta * delta, delta, n, k) for k in (1, 2, 3))
    assert prob.get_val('captured_mass_flow')[0] == pytest.approx(flux * q1, rel=1e-10)
    assert prob.get_val('ingested_momentum_flow')[0] == pytest.approx(flux * SPEED * q2, rel=1e-10)
    assert prob.get_val('ingested_kinetic_energy_flow')[0] == pytest.approx(
        0.5 * flux * SPEED**2 * q3, rel=1e-10
    )
    assert prob.get_val('ram_velocity')[0] == pytest.approx(SPEED * q2 / q1, rel=1e-10)
    assert prob.get_val('energy_velocity')[0] == pytest.approx(SPEED * np.sqrt(q3 / q1), rel=1e-10)


def test_c1_continuity_at_edge():
    delta, n, eps = 0.5, 7.0, 1e-7
    heights = delta * np.array([1.0 - eps, 1.0 + eps])
    thick = delta * np.ones(2)
    f, df_dh, df_dd = layer_flux_shapes(heights, thick, n)
    for k in range(3):
        # Values: the jump across the edge is only the slope times the step (no offset).
        assert f[k][1] - f[k][0] == pytest.approx(2.0 * eps * delta, rel=1e-6)
        # Slopes from both sides agree, with the height and with the thickness.
        assert df_dh[k][0] == pytest.approx(df_dh[k][1], rel=1e-6)
        assert df_dh[k][1] == 1.0
        assert df_dd[k][0] == pytest.approx(df_dd[k][1], rel=1e-6)
        assert df_dd[k][1] == pytest.approx(-(k + 1) / (n + k + 1), rel=1e-14)


def test_averaged_velocities_ordering_and_total_pressure_loss():
    # Inside a decelerated layer V_m <= V_e <= V (Cauchy-Schwarz on the profile) and the
    # captured stream has lost total pressure.
    prob = _ingested_problem([0.1, 0.3, 0.5, 0.8, 2.0])
    v_m = prob.get_val('ram_velocity')
    v_e = prob.get_val('energy_velocity')
    pt_in = prob.get_val('inflow_total_pressure')
    assert np.all(v_m < v_e) and np.all(v_e < SPEED)
    assert np.all(pt_in < PT_FREE) and np.all(pt_in > P_STATIC)
    # A taller capture swallows relatively more fast fluid.
    assert np.all(np.diff(v_m) > 0.0) and np.all(np.diff(pt_in) > 0.0)


def test_free_stream_limit():
    # For h >> delta: V_m/V = 1 - theta/h + O((delta/h)^2) from the flux formulas, and the
    # inflow total pressure tends to the free-stream total pressure.
    delta = 0.5
    theta = delta * 7.0 / 72.0
    heights = delta * np.array([1.0e2, 1.0e3, 1.0e4])
    prob = _ingested_problem(heights, delta=delta)
    v_m = prob.get_val('ram_velocity')
    pt_in = prob.get_val('inflow_total_pressure')
    assert 1.0 - v_m / SPEED == pytest.approx(theta / heights, rel=2e-2)
    deficit = (PT_FREE - pt_in) / PT_FREE
    assert np.all(deficit > 0.0)
    assert deficit[-1] < 1e-4
    # The deficit falls about tenfold for every tenfold taller capture.
    assert deficit[:-1] / deficit[1:] == pytest.approx(10.0, rel=5e-2)


def test_fuselage_boundary_layer_partials():
    check_component_partials(
        FuselageBoundaryLayerComp(vec_size=3),
        {
            'fuselage_drag': [3000.0, 8000.0, 15000.0],
            'density': [0.38, 0.55, 1.1],
            'true_airspeed': [230.0, 200.0, 90.0],
            'fuselage_diameter': [3.0, 4.0, 6.0],
            'station_diameter_ratio': [0.5, 0.6, 0.75],
        },
    )


@pytest.mark.parametrize('n', [7.0, 6.0])
def test_ingested_flow_partials_below_and_above_edge(n):
    # Points at h/delta = 0.4, 0.9 (inside the layer) and 1.8 (above it) in one vector.
    check_component_partials(
        IngestedFlowComp(vec_size=3, profile_exponent=n),
        {
            'capture_height': [0.2, 0.36, 0.9],
            'boundary_layer_thickness': [0.5, 0.4, 0.5],
            'perimeter': [7.5, 6.0, 9.0],
            'density': [0.38, 0.55, 1.1],
            'true_airspeed': [230.0, 200.0, 90.0],
            'static_pressure': [23900.0, 35000.0, 90000.0],
            'total_temperature': [245.0, 250.0, 290.0],
        },
    )
    check_component_partials(
        IngestedFlowComp(vec_size=3, profile_exponent=n),
        {
            'capture_height': [1.2, 0.05, 0.49],
            'boundary_layer_thickness': [0.5, 0.6, 0.5],
            'perimeter': [7.5, 6.0, 9.0],
            'density': [0.38, 0.55, 1.1],
            'true_airspeed': [230.0, 200.0, 90.0],
            'static_pressure': [23900.0, 35000.0, 90000.0],
            'total_temperature': [245.0, 250.0, 290.0],
        },
    )


def test_negative_height_extension_is_odd():
    # Not physical: a Newton iterate below the wall sees f_k(-h) = -f_k(h), so the captured
    # mass flow stays monotonic in h and the residual keeps pointing back to h > 0.
    heights = np.array([0.1, 0.3])
    thick = 0.5 * np.ones(2)
    f_pos, dh_pos, dd_pos = layer_flux_shapes(heights, thick, 7.0)
    f_neg, dh_neg, dd_neg = layer_flux_shapes(-heights, thick, 7.0)
    for k in range(3):
        assert f_neg[k] == pytest.approx(-f_pos[k], rel=1e-14)
        assert dh_neg[k] == pytest.approx(dh_pos[k], rel=1e-14)
        assert dd_neg[k] == pytest.approx(-dd_pos[k], rel=1e-14)
    check_component_partials(
        IngestedFlowComp(vec_size=3),
        {'capture_height': [-0.1, 0.2, 0.7], 'boundary_layer_thickness': [0.5, 0.5, 0.5]},
    )
