"""Tests of the DC distribution cable: hand-computed cases, trends, limits and partials."""

import numpy as np
import openmdao.api as om
import pytest

from voltwake.components.cable import PASCHEN_PD_MIN, PASCHEN_V_MIN, CableComp, paschen_voltage

from partials import check_component_partials

# Conductor properties at 20 degC: CRC Handbook of Chemistry and Physics, "Electrical
# resistivity of pure metals" and density tables (edition and page from memory).
COPPER = {'resistivity': 1.68e-8, 'conductor_density': 8960.0}
ALUMINIUM = {'resistivity': 2.65e-8, 'conductor_density': 2700.0}

# Insulation defaults of the component, restated here so that a changed default shows:
# dielectric strength 100 kV/mm (low end for thin polyimide film, from memory), design factor
# 10 (common practice), polyimide density 1,420 kg/m**3 (from memory).
INSULATION = {
    'dielectric_strength': 1.0e8,
    'insulation_design_factor': 10.0,
    'insulation_density': 1420.0,
}

# Static pressure at 35,000 ft (10,668 m geopotential) ISA and at sea level, ISO 2533:1975.
P_35K = 23842.0
P_SL = 101325.0

# Hand case: 2 MW delivered over a 30 m run at 1 kV, 5 A/mm**2 at rated current,
# rated current 1.25 x cruise current, shield and supports 0.6 x conductor mass.
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
    dielectric_strength=INSULATION['dielectric_strength'],
    insulation_design_factor=INSULATION['insulation_design_factor'],
    insulation_density=INSULATION['insulation_density'],
):
    """
    Cable by hand, by a route independent of the component's closed form.

    Ohm's law per unit length gives the field E = rho_e J in each conductor, so the loop
    drop is dV = 2 L rho_e J with the cruise density J = J_lim / k_size (conductors sized at
    rated current); the load sees V - dV, hence I = P_out / (V - dV). The rest follows from
    A = k_size I / J_lim, R = 2 rho_e L / A, loss = I**2 R; the insulation is an annulus of
    inner radius r_c = sqrt(A / pi) and wall t = k_d V / E_d around each conductor, and
    m = 2 L A rho_m f_m + m_ins.
    """
    j_cruise = current_density_limit / sizing_factor
    drop = 2.0 * length * resistivity * j_cruise
    current = output_power / (voltage - drop)
    area = sizing_factor * current / current_density_limit
    resistance = 2.0 * resistivity * length / area
    loss = current**2 * resistance
    r_c = np.sqrt(area / np.pi)
    wall = insulation_design_factor * voltage / dielectric_strength
    annulus = np.pi * (r_c + wall) ** 2 - np.pi * r_c**2
    m_ins = 2.0 * length * insulation_density * annulus
    mass = 2.0 * length * area * conductor_density * mass_factor + m_ins
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
        'insulation_thickness': wall,
        'insulation_mass': m_ins,
    }


def paschen_torr_cm(p_torr, d_cm, a=15.0, b=365.0, gamma=0.01):
    """
    Paschen breakdown voltage (V) evaluated in the customary units, pressure in Torr and gap in cm.

    Air constants A = 15 /(cm Torr), B = 365 V/(cm Torr) (Raizer, Gas Discharge Physics,
    Springer 1991, ch. 4; from memory) and gamma = 0.01 (common practice; from memory).
    """
    pd = p_torr * d_cm
    return b * pd / (np.log(a * pd) - np.log(np.log(1.0 + 1.0 / gamma)))


@pytest.mark.parametrize('material', [COPPER, ALUMINIUM], ids=['copper', 'aluminium'])
def test_hand_case(material):
    prob = run_cable(**CASE, **material)
    expected = hand_cable(**CASE, **material)
    for name, value in expected.items():
        assert prob.get_val(name)[0] == pytest.approx(value, rel=1e-12), name


def test_copper_hand_numbers():
    # Rounded hand arithmetic for the copper case (calculator, 4 significant figures):
    # dV = 2 * 30 * 1.68e-8 * 4e6 = 4.032 V; I = 2e6 / 995.968 = 2008 A; A = 1.25 * I / 5e6
    # = 502.0 mm**2; R = 2 * 1.68e-8 * 30 / A = 2.008 mOhm; loss = I**2 R = 8097 W.
    # Insulation (hand value from the equations in the CableComp docstring): t = 10 * 1000 /
    # 1e8 = 0.1 mm; r_c = sqrt(502.02 / pi) = 12.641 mm; annulus = pi (12.741**2 - 12.641**2)
    # = 7.974 mm**2; m_ins = 2 * 30 * 1420 * 7.974e-6 = 0.6794 kg.
    # Mass: the conductor part 2 * 30 * A * 8960 * 1.6 = 431.82 kg is unchanged; it was the
    # whole cable mass while mass_factor also stood for the insulation, which is now computed
    # separately, so the total is 431.82 + 0.68 = 432.50 kg.
    prob = run_cable(**CASE, **COPPER)
    assert prob.get_val('current')[0] == pytest.approx(2008.1, rel=1e-4)
    assert prob.get_val('cross_section_area', units='mm**2')[0] == pytest.approx(502.02, rel=1e-4)
    assert prob.get_val('resistance', units='mohm')[0] == pytest.approx(2.0079, rel=1e-4)
    assert prob.get_val('voltage_drop')[0] == pytest.approx(4.032, rel=1e-4)
    assert prob.get_val('loss')[0] == pytest.approx(8096.6, rel=1e-4)
    assert prob.get_val('insulation_thickness', units='mm')[0] == pytest.approx(0.1, rel=1e-12)
    assert prob.get_val('insulation_mass')[0] == pytest.approx(0.6794, rel=2e-4)
    assert prob.get_val('mass')[0] == pytest.approx(432.50, rel=1e-4)


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


def test_insulation_hand_values():
    # Hand value from the equations in the CableComp docstring: 3 kV, E_d = 150 kV/mm, factor 8
    # gives t = 8 * 3000 / 1.5e8 = 0.16 mm exactly; the annulus around the conductor follows
    # from the conductor area of the same run.
    inputs = {
        **CASE,
        **COPPER,
        'voltage': 3000.0,
        'dielectric_strength': 1.5e8,
        'insulation_design_factor': 8.0,
        'insulation_density': 2150.0,
    }
    prob = run_cable(**inputs)
    assert prob.get_val('insulation_thickness')[0] == pytest.approx(1.6e-4, rel=1e-12)
    area = prob.get_val('cross_section_area')[0]
    r_c = np.sqrt(area / np.pi)
    m_ins = 2.0 * 30.0 * 2150.0 * np.pi * ((r_c + 1.6e-4) ** 2 - r_c**2)
    assert prob.get_val('insulation_mass')[0] == pytest.approx(m_ins, rel=1e-12)
    m_cond = 2.0 * 30.0 * area * COPPER['conductor_density'] * CASE['mass_factor']
    assert prob.get_val('mass')[0] == pytest.approx(m_cond + m_ins, rel=1e-12)


def test_paschen_unit_conversion():
    # 1 Torr = 101325/760 Pa (exact by definition), 1 cm = 0.01 m:
    # A = 15 / (0.01 * 133.3224) = 11.2509 /(Pa m), B = 365 / 1.333224 = 273.773 V/(Pa m).
    # The SI evaluation at p = 23842 Pa, d = 1 mm must equal the Torr-cm one at 0.1 cm.
    p_torr = P_35K * 760.0 / 101325.0
    v_cgs = paschen_torr_cm(p_torr, 0.1)
    v_si, _ = paschen_voltage(np.array([P_35K * 1.0e-3]))
    assert v_si[0] == pytest.approx(v_cgs, rel=1e-12)


def test_paschen_hand_value_at_cruise():
    # 35,000 ft ISA, d = 1 mm: p = 23842 Pa = 178.83 Torr, p d = 17.883 Torr cm;
    # ln(15 * 17.883) = 5.5919, ln(ln(101)) = 1.5293, V_b = 365 * 17.883 / 4.0626 = 1606.7 V
    # (hand value from Paschen's law; the brief's expectation is of order 1-2 kV).
    prob = run_cable(**CASE, **COPPER, ambient_pressure=P_35K, discharge_gap=1.0e-3)
    v_b = paschen_torr_cm(P_35K * 760.0 / 101325.0, 0.1)
    assert v_b == pytest.approx(1606.7, rel=1e-4)
    assert prob.get_val('discharge_voltage')[0] == pytest.approx(v_b / 1.5, rel=1e-12)
    assert prob.get_val('voltage_margin')[0] == pytest.approx(1.0 - 1000.0 * 1.5 / v_b, rel=1e-12)


def test_paschen_hand_value_at_sea_level():
    # Sea level, d = 1 mm: p d = 76 Torr cm; V_b = 365 * 76 / (ln(1140) - ln(ln(101)))
    # = 27740 / 5.5095 = 5035 V (hand value from Paschen's law).
    prob = run_cable(
        **CASE, **COPPER, ambient_pressure=P_SL, discharge_gap=1.0e-3, discharge_safety_factor=2.0
    )
    assert prob.get_val('discharge_voltage')[0] * 2.0 == pytest.approx(5035.0, rel=1e-4)
    assert prob.get_val('discharge_voltage')[0] * 2.0 == pytest.approx(
        paschen_torr_cm(760.0, 0.1), rel=1e-12
    )


def test_paschen_minimum_and_left_branch():
    # Minimum of the curve (hand value, dV_b/d(pd) = 0): A pd = e ln(1 + 1/gamma), so
    # pd_min = e * 4.6151 / 15 = 0.83635 Torr cm and V_min = 365 * 0.83635 = 305.27 V.
    pd_min_torr_cm = np.e * np.log(101.0) / 15.0
    assert PASCHEN_PD_MIN * 760.0 / 101325.0 * 100.0 == pytest.approx(pd_min_torr_cm, rel=1e-12)
    assert PASCHEN_V_MIN == pytest.approx(paschen_torr_cm(pd_min_torr_cm, 1.0), rel=1e-12)
    assert PASCHEN_V_MIN == pytest.approx(305.27, rel=1e-4)
    # To the right of the minimum the curve rises; to the left the component holds the
    # minimum (conservative), with no jump in value or slope.
    pd = PASCHEN_PD_MIN * np.array([0.1, 0.5, 0.999999, 1.000001, 1.5, 10.0])
    v_b, slope = paschen_voltage(pd)
    assert v_b[:3] == pytest.approx([PASCHEN_V_MIN] * 3, rel=1e-12)
    assert all(slope[:3] == 0.0)
    assert v_b[3] == pytest.approx(PASCHEN_V_MIN, rel=1e-9)
    assert slope[3] == pytest.approx(0.0, abs=1e-3)
    assert all(np.diff(v_b[3:]) > 0.0)
    assert all(v_b >= PASCHEN_V_MIN)
    # A sub-minimum gap in the component: 10 micrometres at 35,000 ft (p d = 0.24 Pa m).
    prob = run_cable(**CASE, **COPPER, ambient_pressure=P_35K, discharge_gap=1.0e-5)
    assert prob.get_val('discharge_voltage')[0] == pytest.approx(PASCHEN_V_MIN / 1.5, rel=1e-12)


def test_insulation_mass_rises_with_voltage():
    voltages = [270.0, 540.0, 1000.0, 1500.0, 3000.0, 6000.0]
    results = [run_cable(**{**CASE, 'voltage': v}, **COPPER) for v in voltages]
    wall = [r.get_val('insulation_thickness')[0] for r in results]
    m_ins = [r.get_val('insulation_mass')[0] for r in results]
    assert all(np.diff(wall) > 0.0)
    assert all(np.diff(m_ins) > 0.0)


def test_margin_falls_with_voltage_and_altitude():
    voltages = [270.0, 540.0, 1000.0, 1500.0, 3000.0]
    margin = [
        run_cable(**{**CASE, 'voltage': v}, **COPPER).get_val('voltage_margin')[0] for v in voltages
    ]
    assert all(np.diff(margin) < 0.0)
    # Lower pressure (higher altitude) lowers the breakdown voltage and the margin on the
    # right branch of the Paschen curve (1 mm gap: p d from 101 down to 5 Pa m).
    pressures = [P_SL, 54020.0, P_35K, 12000.0, 5000.0]
    runs = [run_cable(**CASE, **COPPER, ambient_pressure=p) for p in pressures]
    v_pd = [r.get_val('discharge_voltage')[0] for r in runs]
    margin = [r.get_val('voltage_margin')[0] for r in runs]
    assert all(np.diff(v_pd) < 0.0)
    assert all(np.diff(margin) < 0.0)


def test_margin_sign_at_cruise_and_sea_level():
    # 1 mm gap, safety factor 1.5: allowed peak 1071 V at 35,000 ft and 3357 V at sea level
    # (hand values from Paschen's law above), so 1.5 kV fails in cruise and passes at sea level.
    cruise = run_cable(**{**CASE, 'voltage': 1500.0}, **COPPER, ambient_pressure=P_35K)
    ground = run_cable(**{**CASE, 'voltage': 1500.0}, **COPPER, ambient_pressure=P_SL)
    assert cruise.get_val('voltage_margin')[0] < 0.0
    assert ground.get_val('voltage_margin')[0] > 0.0


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
            'dielectric_strength': [1.0e8, 1.5e8, 6.0e7],
            'insulation_design_factor': [10.0, 6.0, 12.0],
            'insulation_density': [1420.0, 2150.0, 1800.0],
            'ambient_pressure': [23842.0, 101325.0, 12000.0],
            'discharge_gap': [1.0e-3, 2.0e-3, 5.0e-4],
            'discharge_safety_factor': [1.5, 1.2, 2.0],
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
            'dielectric_strength': [2.0e8, 8.0e7, 1.2e8],
            'insulation_design_factor': [5.0, 10.0, 8.0],
            'insulation_density': [1800.0, 1420.0, 2200.0],
            # Second point: p d = 0.72 Pa m, below the Paschen minimum (held branch).
            'ambient_pressure': [50000.0, 3600.0, 23842.0],
            'discharge_gap': [3.0e-4, 2.0e-4, 1.5e-3],
            'discharge_safety_factor': [1.3, 1.5, 1.8],
        },
    ],
)
def test_partials(point):
    check_component_partials(CableComp(vec_size=3), point)
