"""Tests of the fuselage boundary layer and of the flow captured from it."""

import numpy as np
import openmdao.api as om
import pytest
from ambiance import Atmosphere
from scipy.integrate import quad

from voltwake.components.boundary_layer import (
    FuselageBoundaryLayerComp,
    IngestedFlowComp,
    annular_flux_shapes,
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
EXPO = GAMMA / (GAMMA - 1.0)
PT_FREE = P_STATIC * (1.0 + 0.5 * (GAMMA - 1.0) * 0.78**2) ** EXPO


def _ingested_problem(heights, delta=0.5, station_diameter=1.8, n=7.0):
    """Run IngestedFlowComp at the cruise condition for an array of capture heights."""
    heights = np.atleast_1d(np.asarray(heights, dtype=float))
    prob = om.Problem(reports=False)
    prob.model.add_subsystem(
        'flow', IngestedFlowComp(vec_size=heights.size, profile_exponent=n), promotes=['*']
    )
    prob.setup()
    prob.set_val('capture_height', heights)
    prob.set_val('boundary_layer_thickness', delta)
    prob.set_val('station_diameter', station_diameter)
    prob.set_val('density', RHO)
    prob.set_val('true_airspeed', SPEED)
    prob.set_val('static_pressure', P_STATIC)
    prob.set_val('total_temperature', T_TOTAL)
    prob.run_model()
    return prob


def _annular_integral(height, delta, radius, n, k):
    """Quadrature of (u/V)^k 2 pi (r + y) from the wall to the height (power-law profile)."""

    def ratio(y):
        return (y / delta) ** (1.0 / n) if y < delta else 1.0

    value, _ = quad(
        lambda y: ratio(y) ** k * 2.0 * np.pi * (radius + y),
        0.0,
        height,
        points=[delta] if delta < height else None,
        epsabs=1e-14,
        epsrel=1e-12,
    )
    return value


def _layer(drag=8000.0, diameter=4.0, ratio=0.45, n=7.0):
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('bl', FuselageBoundaryLayerComp(profile_exponent=n), promotes=['*'])
    prob.setup()
    prob.set_val('fuselage_drag', drag)
    prob.set_val('density', RHO)
    prob.set_val('true_airspeed', SPEED)
    prob.set_val('fuselage_diameter', diameter)
    prob.set_val('station_diameter_ratio', ratio)
    prob.run_model()
    return prob


@pytest.mark.parametrize('n', [5.0, 7.0, 9.0])
def test_momentum_deficit_over_the_annulus_equals_the_drag(n):
    # D / (rho V^2) = int_0^delta u/V (1 - u/V) 2 pi (r + y) dy: momentum-deficit/drag relation
    # (Schlichting, Boundary-Layer Theory, drag of a body from its wake; common practice),
    # evaluated here by quadrature at the thickness the component returns.
    prob = _layer(n=n)
    delta = prob.get_val('boundary_layer_thickness')[0]
    radius = 0.5 * prob.get_val('station_diameter')[0]
    assert radius == pytest.approx(0.5 * 0.45 * 4.0, rel=1e-14)
    deficit, _ = quad(
        lambda y: (
            (y / delta) ** (1 / n) * (1.0 - (y / delta) ** (1 / n)) * 2 * np.pi * (radius + y)
        ),
        0.0,
        delta,
        epsrel=1e-12,
    )
    assert deficit * RHO * SPEED**2 == pytest.approx(8000.0, rel=1e-9)
    # theta/delta of the profile: 7/72 for the 1/7 law (Schlichting, Boundary-Layer Theory,
    # turbulent flat plate with the 1/7 power law; from memory); n/((n+1)(n+2)) in general.
    ratio = prob.get_val('momentum_thickness')[0] / delta
    assert ratio == pytest.approx(n / ((n + 1.0) * (n + 2.0)), rel=1e-13)
    if n == 7.0:
        assert ratio == pytest.approx(7.0 / 72.0, rel=1e-13)


def test_thin_layer_limit_is_the_planar_relation():
    # On a body much larger than the layer, theta -> D / (rho V^2 pi d_s) (planar).
    prob = _layer(drag=8000.0, diameter=400.0, ratio=1.0)
    theta_planar = 8000.0 / (RHO * SPEED**2 * np.pi * 400.0)
    assert prob.get_val('momentum_thickness')[0] == pytest.approx(theta_planar, rel=1e-3)


def test_curvature_thins_the_layer_against_the_planar_estimate():
    # The outer part of the layer lies on a larger circle, so the same deficit needs a
    # thinner layer than the planar estimate on the wall perimeter (trend).
    prob = _layer(ratio=0.45)
    theta_planar = 8000.0 / (RHO * SPEED**2 * np.pi * 0.45 * 4.0)
    assert prob.get_val('momentum_thickness')[0] < theta_planar


def test_fluxes_at_edge_thin_layer_closed_form():
    # At h = delta on a large body the fluxes per unit perimeter are delta n/(n+k); f_1 =
    # delta - delta* with delta*/delta = 1/8 for the 1/7 law (Schlichting; from memory).
    delta, diameter = 0.5, 1.0e4
    prob = _ingested_problem([delta], delta=delta, station_diameter=diameter)
    flux = np.pi * diameter * RHO * SPEED
    assert prob.get_val('captured_mass_flow')[0] == pytest.approx(
        flux * (delta - delta / 8.0), rel=1e-4
    )
    assert prob.get_val('ingested_momentum_flow')[0] == pytest.approx(
        flux * SPEED * delta * 7.0 / 9.0, rel=1e-4
    )


@pytest.mark.parametrize('n', [5.0, 7.0])
@pytest.mark.parametrize('eta', [0.05, 0.4, 0.9, 1.0, 1.3, 4.0])
def test_fluxes_against_quadrature(n, eta):
    delta, diameter = 0.45, 1.6
    prob = _ingested_problem([eta * delta], delta=delta, station_diameter=diameter, n=n)
    q0, q1, q2, q3 = (_annular_integral(eta * delta, delta, 0.8, n, k) for k in range(4))
    assert prob.get_val('capture_area')[0] == pytest.approx(q0, rel=1e-10)
    assert prob.get_val('captured_mass_flow')[0] == pytest.approx(RHO * SPEED * q1, rel=1e-10)
    assert prob.get_val('ingested_momentum_flow')[0] == pytest.approx(
        RHO * SPEED**2 * q2, rel=1e-10
    )
    assert prob.get_val('ingested_kinetic_energy_flow')[0] == pytest.approx(
        0.5 * RHO * SPEED**3 * q3, rel=1e-10
    )
    assert prob.get_val('ram_velocity')[0] == pytest.approx(SPEED * q2 / q1, rel=1e-10)
    assert prob.get_val('energy_velocity')[0] == pytest.approx(SPEED * np.sqrt(q3 / q1), rel=1e-10)
    assert prob.get_val('inflow_nonuniformity')[0] == pytest.approx(
        1.0 - q2**2 / (q1 * q3), rel=1e-8
    )


def test_capture_area_is_the_annulus():
    # A_0 = pi ((r + h)^2 - r^2) (geometry).
    prob = _ingested_problem([0.2, 0.7], station_diameter=1.8)
    expected = np.pi * ((0.9 + np.array([0.2, 0.7])) ** 2 - 0.9**2)
    assert prob.get_val('capture_area') == pytest.approx(expected, rel=1e-13)


def test_mixed_out_total_pressure_hand_value():
    # Constant-area mixing of the captured stream (mass and momentum conserved, density
    # constant; standard one-dimensional averaging, common practice), re-derived here from
    # quadrature of the profile: V_x = mdot/(rho A), p_x = p + (Mdot - mdot V_x)/A, then the
    # isentropic total pressure at T_x = T_t - V_x^2/(2 cp).
    height, delta, radius = 0.3, 0.5, 0.9
    prob = _ingested_problem([height], delta=delta, station_diameter=2 * radius)
    area, q1, q2 = (_annular_integral(height, delta, radius, 7.0, k) for k in range(3))
    mdot, mom = RHO * SPEED * q1, RHO * SPEED**2 * q2
    v_x = mdot / (RHO * area)
    p_x = P_STATIC + (mom - mdot * v_x) / area
    t_x = T_TOTAL - v_x**2 / (2.0 * CP_AIR)
    expected = p_x * (T_TOTAL / t_x) ** EXPO
    assert prob.get_val('inflow_total_pressure')[0] == pytest.approx(expected, rel=1e-10)


def test_mixing_loss_lies_below_the_energy_average():
    # The mixed-out total pressure is below the energy-averaged one (mixing loses total
    # pressure; second law) and above the static pressure.
    prob = _ingested_problem([0.1, 0.3, 0.5, 0.8, 2.0])
    v_e = prob.get_val('energy_velocity')
    t_e = T_TOTAL - v_e**2 / (2.0 * CP_AIR)
    pt_energy = P_STATIC * (T_TOTAL / t_e) ** EXPO
    pt_mixed = prob.get_val('inflow_total_pressure')
    assert np.all(pt_mixed < pt_energy) and np.all(pt_mixed > P_STATIC)


def test_averaged_velocities_ordering_and_total_pressure_loss():
    # Inside a decelerated layer V_m <= V_e <= V (Cauchy-Schwarz on the profile) and the
    # captured stream has lost total pressure.
    prob = _ingested_problem([0.1, 0.3, 0.5, 0.8, 2.0])
    v_m = prob.get_val('ram_velocity')
    v_e = prob.get_val('energy_velocity')
    pt_in = prob.get_val('inflow_total_pressure')
    assert np.all(v_m < v_e) and np.all(v_e < SPEED)
    assert np.all(pt_in < PT_FREE)
    # A taller capture swallows relatively more fast fluid.
    assert np.all(np.diff(v_m) > 0.0) and np.all(np.diff(pt_in) > 0.0)


def test_nonuniformity_of_a_planar_capture_inside_the_layer():
    # Self-similar power law: psi = 1 - (n+1)(n+3)/(n+2)^2 = 1/(n+2)^2 for any planar
    # capture inside the layer (from the flux formulas); curvature lowers it (the outer,
    # faster fluid weighs more); above the layer it falls towards 0.
    planar = _ingested_problem([0.1, 0.4], station_diameter=1.0e5)
    assert planar.get_val('inflow_nonuniformity') == pytest.approx(1.0 / 81.0, rel=1e-4)
    curved = _ingested_problem([0.1, 0.4, 1.0, 5.0, 50.0], station_diameter=1.8)
    psi = curved.get_val('inflow_nonuniformity')
    assert np.all(psi[:2] < 1.0 / 81.0) and np.all(np.diff(psi[1:]) < 0.0) and psi[-1] < 1e-4


def test_free_stream_limit():
    # For h >> delta the captured stream is almost all free stream: the mixed-out total
    # pressure tends to the free-stream total pressure and V_m to V.
    delta = 0.5
    heights = delta * np.array([1.0e1, 1.0e2, 1.0e3])
    prob = _ingested_problem(heights, delta=delta)
    deficit = (PT_FREE - prob.get_val('inflow_total_pressure')) / PT_FREE
    assert np.all(deficit > 0.0) and np.all(np.diff(deficit) < 0.0)
    assert deficit[-1] < 1e-5
    assert prob.get_val('ram_velocity')[-1] == pytest.approx(SPEED, rel=1e-5)


def test_c1_continuity_at_edge():
    delta, n, eps = 0.5, 7.0, 1e-7
    heights = delta * np.array([1.0 - eps, 1.0 + eps])
    thick = delta * np.ones(2)
    for moment in (0, 1):
        f, df_dh, df_dd = layer_flux_shapes(heights, thick, n, moment, (0, 1, 2, 3))
        for k in range(4):
            # Values: the jump across the edge is only the slope times the step.
            assert f[k][1] - f[k][0] == pytest.approx(2.0 * eps * delta ** (moment + 1), rel=1e-6)
            assert df_dh[k][0] == pytest.approx(df_dh[k][1], rel=1e-6)
            assert df_dd[k][0] == pytest.approx(df_dd[k][1], rel=1e-6, abs=1e-12)


def test_fuselage_boundary_layer_partials():
    for ratio in ([0.4, 0.6, 0.75], [0.3, 0.2, 1.0]):
        check_component_partials(
            FuselageBoundaryLayerComp(vec_size=3),
            {
                'fuselage_drag': [3000.0, 8000.0, 15000.0],
                'density': [0.38, 0.55, 1.1],
                'true_airspeed': [230.0, 200.0, 90.0],
                'fuselage_diameter': [3.0, 4.0, 6.0],
                'station_diameter_ratio': ratio,
            },
        )


@pytest.mark.parametrize('n', [7.0, 6.0])
def test_ingested_flow_partials_below_and_above_edge(n):
    # Points inside the layer and above it in one vector.
    for heights, thickness in (
        ([0.2, 0.36, 0.9], [0.5, 0.4, 0.5]),
        ([1.2, 0.05, 0.49], [0.5, 0.6, 0.5]),
    ):
        check_component_partials(
            IngestedFlowComp(vec_size=3, profile_exponent=n),
            {
                'capture_height': heights,
                'boundary_layer_thickness': thickness,
                'station_diameter': [1.5, 2.0, 3.0],
                'density': [0.38, 0.55, 1.1],
                'true_airspeed': [230.0, 200.0, 90.0],
                'static_pressure': [23900.0, 35000.0, 90000.0],
                'total_temperature': [245.0, 250.0, 290.0],
            },
        )


def test_negative_height_extension_is_odd():
    # Not physical: a Newton iterate below the wall sees A_k(-h) = -A_k(h) for the wall
    # terms, so the captured mass flow stays monotonic in h and the residual keeps pointing
    # back to h > 0.
    heights = np.array([0.1, 0.3])
    thick = 0.5 * np.ones(2)
    for moment in (0, 1):
        f_pos, dh_pos, dd_pos = layer_flux_shapes(heights, thick, 7.0, moment)
        f_neg, dh_neg, dd_neg = layer_flux_shapes(-heights, thick, 7.0, moment)
        for k in range(3):
            assert f_neg[k] == pytest.approx(-f_pos[k], rel=1e-14)
            assert dh_neg[k] == pytest.approx(dh_pos[k], rel=1e-14)
            assert dd_neg[k] == pytest.approx(-dd_pos[k], rel=1e-14)
    area, d_h, _, _ = annular_flux_shapes(np.array([-0.2, 0.2]), thick, 0.9, 7.0)
    assert np.all(d_h[1] > 0.0) and area[1][0] == pytest.approx(-area[1][1], rel=1e-14)
    check_component_partials(
        IngestedFlowComp(vec_size=3),
        {'capture_height': [-0.1, 0.2, 0.7], 'boundary_layer_thickness': [0.5, 0.5, 0.5]},
    )
