"""Tests of the DC distribution cable: hand-computed cases, trends, limits and partials."""

import numpy as np
import openmdao.api as om
import pytest

from voltwake.components.cable import CableComp

from partials import check_component_partials

# Conductor properties at 20 degC: CRC Handbook of Chemistry and Physics, "Electrical
# resistivity of pure metals" and density tables (edition and page from memory).
COPPER = {'resistivity': 1.68e-8, 'conductor_density': 8960.0}
ALUMINIUM = {'resistivity': 2.65e-8, 'conductor_density': 2700.0}

# Hand case: 2 MW delivered over a 30 m run at 1 kV, 5 A/mm**2 at rated current,
# rated current 1.25 x cruise current, cable mass 1.6 x conductor mass.
CASE = {
    'output_power': 2.0e6,
    'voltage': 1000.0,
    'length': 30.0,
    'current_density_limit': 5.0e6,
    'sizing_factor': 1.25,
    'mass_factor': 1.6,
}


def run_cable(**inputs):
    """Run a single CableComp (vec_size 1) and return the problem."""
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('cable', CableComp(), promotes=['*'])
    prob.setup()
    for name, value in inputs.items():
        prob.set_val(name, value)
    prob.run_model()
    return prob


def hand_cable(
    output_power,
    voltage,
    length,
    current_density_limit,
    sizing_factor,
    mass_factor,
    resistivity,
    conductor_density,
):
    """
    Cable by hand, by a route independent of the component's closed form.

    Ohm's law per unit length gives the field E = rho_e J in each conductor, so the loop
    drop is dV = 2 L rho_e J with the cruise density J = J_lim / k_size (conductors sized at
    rated current); the load sees V - dV, hence I = P_out / (V - dV). The rest follows from
    A = k_size I / J_lim, R = 2 rho_e L / A, loss = I**2 R, m = 2 L A rho_m f_m.
    """
    j_cruise = current_density_limit / sizing_factor
    drop = 2.0 * length * resistivity * j_cruise
    current = output_power / (voltage - drop)
    area = sizing_factor * current / current_density_limit
    resistance = 2.0 * resistivity * length / area
    loss = current**2 * resistance
    mass = 2.0 * length * area * conductor_density * mass_factor
    return {
        'current': current,
        'rated_current': sizing_factor * current,
        'cross_section_area': area,
        'resistance': resistance,
        'loss': loss,
        'input_power': output_power + loss,
        'efficiency': output_power / (output_power + loss),
        'current_density': j_cruise,
        'mass': mass,
        'voltage_drop': drop,
    }


@pytest.mark.parametrize('material', [COPPER, ALUMINIUM], ids=['copper', 'aluminium'])
def test_hand_case(material):
    prob = run_cable(**CASE, **material)
    expected = hand_cable(**CASE, **material)
    for name, value in expected.items():
        assert prob.get_val(name)[0] == pytest.approx(value, rel=1e-12), name


def test_copper_hand_numbers():
    # Rounded hand arithmetic for the copper case (calculator, 4 significant figures):
    # dV = 2 * 30 * 1.68e-8 * 4e6 = 4.032 V; I = 2e6 / 995.968 = 2008 A; A = 1.25 * I / 5e6
    # = 502.0 mm**2; R = 2 * 1.68e-8 * 30 / A = 2.008 mOhm; loss = I**2 R = 8097 W;
    # m = 2 * 30 * A * 8960 * 1.6 = 431.8 kg.
    prob = run_cable(**CASE, **COPPER)
    assert prob.get_val('current')[0] == pytest.approx(2008.1, rel=1e-4)
    assert prob.get_val('cross_section_area', units='mm**2')[0] == pytest.approx(502.02, rel=1e-4)
    assert prob.get_val('resistance', units='mohm')[0] == pytest.approx(2.0079, rel=1e-4)
    assert prob.get_val('voltage_drop')[0] == pytest.approx(4.032, rel=1e-4)
    assert prob.get_val('loss')[0] == pytest.approx(8096.6, rel=1e-4)
    assert prob.get_val('mass')[0] == pytest.approx(431.84, rel=1e-4)


def test_loss_is_power_balance():
    # The explicit I**2 R loss must equal input minus output power (closed form consistency).
    prob = run_cable(**CASE, **ALUMINIUM)
    p_in = prob.get_val('input_power')[0]
    assert prob.get_val('loss')[0] == pytest.approx(p_in - CASE['output_power'], rel=1e-10)
    assert prob.get_val('voltage_drop')[0] / CASE['voltage'] == pytest.approx(
        1.0 - prob.get_val('efficiency')[0], rel=1e-12
    )


def test_higher_voltage_is_more_efficient_and_lighter():
    voltages = [270.0, 540.0, 1000.0, 3000.0]
    results = [run_cable(**{**CASE, 'voltage': v}, **COPPER) for v in voltages]
    eta = [r.get_val('efficiency')[0] for r in results]
    mass = [r.get_val('mass')[0] for r in results]
    assert all(np.diff(eta) > 0.0)
    assert all(np.diff(mass) < 0.0)


def test_aluminium_lighter_but_lossier_than_copper():
    # Same current density limit: aluminium has the higher resistivity and lower density.
    cu = run_cable(**CASE, **COPPER)
    al = run_cable(**CASE, **ALUMINIUM)
    assert al.get_val('loss')[0] > cu.get_val('loss')[0]
    assert al.get_val('mass')[0] < cu.get_val('mass')[0]


def test_short_cable_limit():
    # A vanishing length carries no loss and no mass.
    prob = run_cable(**{**CASE, 'length': 1e-9}, **COPPER)
    assert prob.get_val('efficiency')[0] == pytest.approx(1.0, abs=1e-12)
    assert prob.get_val('input_power')[0] == pytest.approx(CASE['output_power'], rel=1e-12)
    assert prob.get_val('mass')[0] == pytest.approx(0.0, abs=1e-6)


def test_larger_sizing_factor_lowers_loss_raises_mass():
    small = run_cable(**{**CASE, 'sizing_factor': 1.0}, **COPPER)
    large = run_cable(**{**CASE, 'sizing_factor': 2.0}, **COPPER)
    assert large.get_val('loss')[0] < small.get_val('loss')[0]
    assert large.get_val('mass')[0] > small.get_val('mass')[0]


@pytest.mark.parametrize(
    'point',
    [
        {
            'output_power': [2.0e6, 5.0e5, 4.0e6],
            'voltage': [1000.0, 540.0, 3000.0],
            'length': [30.0, 12.0, 45.0],
            'current_density_limit': [5.0e6, 3.0e6, 8.0e6],
            'sizing_factor': [1.25, 1.0, 1.6],
            'resistivity': [1.68e-8, 2.65e-8, 1.68e-8],
            'conductor_density': [8960.0, 2700.0, 8960.0],
            'mass_factor': [1.6, 1.4, 2.0],
        },
        {
            'output_power': [8.0e5, 3.0e6, 1.5e6],
            'voltage': [270.0, 800.0, 2000.0],
            'length': [50.0, 8.0, 25.0],
            'current_density_limit': [10.0e6, 4.0e6, 2.0e6],
            'sizing_factor': [1.1, 1.5, 1.3],
            'resistivity': [2.65e-8, 1.68e-8, 2.0e-8],
            'conductor_density': [2700.0, 8960.0, 5000.0],
            'mass_factor': [1.8, 1.5, 1.2],
        },
    ],
)
def test_partials(point):
    check_component_partials(CableComp(vec_size=3), point)
