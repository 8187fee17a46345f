"""What the report shows of a design, in which units, and the words it uses for it."""

from openmdao.utils.units import convert_units

from ...configuration.loader import field_at
from ..summary import input_label, pretty_units
from .html import NONE, _esc, _number, _pct, _shown, _sig, _table, _td

#: Aft-fan and electrical-chain quantities a conventional reference does not have (stored
#: there as 0, or 1 for an efficiency): shown as a dash.
_AFT_ONLY_PREFIXES = (
    'aft_',
    'cable_',
    'generator_',
    'rectifier_',
    'inverter_',
    'motor_',
    'thermal_',
    'electrical_',
    'power_saving_',
)


_AFT_ONLY = {'capture_height_m', 'boundary_layer_thickness_m', 'turbofan_power_extraction_kW'}


#: Grouped quantities of the side-by-side tables: (label, key, units, format, change).
#: The change is '%' (relative) or 'abs' (difference, for margins and coefficients).
QUANTITIES = [
    (
        'Masses',
        [
            ('MTOW', 'mtow_kg', 'kg', '{:,.0f}', '%'),
            ('Operating empty mass', 'oew_kg', 'kg', '{:,.0f}', '%'),
            ('Airframe', 'airframe_mass_kg', 'kg', '{:,.0f}', '%'),
            ('wing', 'wing_mass_kg', 'kg', '{:,.0f}', '%'),
            ('fuselage', 'fuselage_mass_kg', 'kg', '{:,.0f}', '%'),
            ('horizontal tail', 'horizontal_tail_mass_kg', 'kg', '{:,.0f}', '%'),
            ('vertical tail', 'vertical_tail_mass_kg', 'kg', '{:,.0f}', '%'),
            ('landing gear', 'landing_gear_mass_kg', 'kg', '{:,.0f}', '%'),
            ('systems, furnishings, operating items', 'systems_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Turbofans (with nacelles)', 'engines_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Aft fan', 'aft_fan_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Electrical chain (with thermal)', 'electrical_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Payload', 'payload_kg', 'kg', '{:,.0f}', '%'),
        ],
    ),
    (
        'Fuel',
        [
            ('Block fuel, design mission', 'block_fuel_kg', 'kg', '{:,.0f}', '%'),
            ('Reserve fuel', 'reserve_fuel_kg', 'kg', '{:,.0f}', '%'),
            ('Total fuel', 'total_fuel_kg', 'kg', '{:,.0f}', '%'),
            ('Block energy, design mission', 'block_energy_MJ', 'MJ', '{:,.0f}', '%'),
            ('Block fuel, economic mission', 'economic_block_fuel_kg', 'kg', '{:,.0f}', '%'),
            ('Block energy, economic mission', 'economic_block_energy_MJ', 'MJ', '{:,.0f}', '%'),
        ],
    ),
    (
        'Aerodynamics (cruise)',
        [
            ('Wing area', 'wing_area_m2', 'm²', '{:.2f}', '%'),
            ('Wing loading (MTOW / area)', 'wing_loading_kg_per_m2', 'kg/m²', '{:.1f}', '%'),
            ('Span', 'wingspan_m', 'm', '{:.2f}', '%'),
            ('Lift coefficient', 'cruise_cl', '-', '{:.4f}', 'abs'),
            ('Lift-to-drag ratio', 'cruise_lift_to_drag', '-', '{:.3f}', '%'),
            ('Zero-lift drag coefficient', 'zero_lift_drag_coefficient', '-', '{:.5f}', '%'),
            ('Induced drag coefficient', 'induced_drag_coefficient', '-', '{:.5f}', '%'),
            ('Wave drag coefficient', 'wave_drag_coefficient', '-', '{:.5f}', 'abs'),
            ('Drag-divergence Mach number', 'drag_divergence_mach', '-', '{:.4f}', 'abs'),
            ('Drag', 'cruise_drag_kN', 'kN', '{:.3f}', '%'),
        ],
    ),
    (
        'Propulsion',
        [
            ('TSFC', 'tsfc_g_per_kN_s', 'g/(kN·s)', '{:.3f}', '%'),
            ('Overall efficiency', 'overall_efficiency', '-', '{:.4f}', '%'),
            ('Turbofan fan diameter', 'turbofan_fan_diameter_m', 'm', '{:.3f}', '%'),
            ('Turbofan cruise net thrust (each)', 'turbofan_cruise_thrust_kN', 'kN', '{:.3f}', '%'),
            ('Turbofan rated thrust (each)', 'turbofan_rated_thrust_kN', 'kN', '{:.2f}', '%'),
            ('Aft-fan thrust fraction', 'aft_thrust_fraction', '-', '{:.4f}', 'abs'),
            ('Aft-fan shaft power', 'aft_fan_shaft_power_kW', 'kW', '{:,.1f}', '%'),
            ('Aft-fan tip diameter', 'aft_fan_diameter_m', 'm', '{:.3f}', '%'),
            ('Aft-fan hub-to-tip ratio', 'aft_fan_hub_to_tip_ratio', '-', '{:.3f}', 'abs'),
            (
                'Aft-fan efficiency in ingested flow',
                'aft_fan_installed_efficiency',
                '-',
                '{:.4f}',
                'abs',
            ),
            ('PSC vs same-FPR clean fan', 'power_saving_coefficient', '-', '{:.4f}', 'abs'),
            (
                'PSC vs same-mass-flow clean fan',
                'power_saving_coefficient_same_mass_flow',
                '-',
                '{:.4f}',
                'abs',
            ),
            ('Capture height', 'capture_height_m', 'm', '{:.4f}', '%'),
        ],
    ),
    (
        'Electrical chain',
        [
            ('Turbofan power extraction', 'turbofan_power_extraction_kW', 'kW', '{:,.1f}', '%'),
            ('Chain efficiency', 'electrical_chain_efficiency', '-', '{:.4f}', 'abs'),
            ('Motor rated power', 'motor_rated_power_kW', 'kW', '{:,.1f}', '%'),
            ('Generators', 'generator_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Rectifiers', 'rectifier_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Cable', 'cable_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Inverter', 'inverter_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Motor', 'motor_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Thermal management', 'thermal_mass_kg', 'kg', '{:,.0f}', '%'),
            ('Heat load at cruise', 'thermal_load_kW', 'kW', '{:,.1f}', '%'),
            ('Cable current', 'cable_current_A', 'A', '{:,.1f}', '%'),
        ],
    ),
    (
        'Performance margins',
        [
            ('Take-off field length', 'takeoff_field_length_m', 'm', '{:,.0f}', '%'),
            ('Landing field length', 'landing_field_length_m', 'm', '{:,.0f}', '%'),
            ('Approach speed', 'approach_speed_kn', 'kn', '{:.1f}', '%'),
            ('Top-of-climb thrust margin', 'climb_thrust_margin', '-', '{:.4f}', 'abs'),
            ('Buffet margin', 'buffet_margin', '-', '{:.4f}', 'abs'),
            ('Aft-fan diameter margin', 'aft_fan_diameter_margin', '-', '{:.4f}', 'abs'),
            ('Aft-fan hub-to-tip margin', 'aft_fan_hub_to_tip_margin', '-', '{:.4f}', 'abs'),
            ('Motor power margin', 'motor_power_margin', '-', '{:.4f}', 'abs'),
            ('Cable partial-discharge margin', 'cable_voltage_margin', '-', '{:.4f}', 'abs'),
            ('Economic take-off mass margin', 'economic_takeoff_mass_margin', '-', '{:.4f}', 'abs'),
        ],
    ),
]


#: Sub-items of a group (indented in the table).
_SUB_ITEMS = {
    'wing_mass_kg',
    'fuselage_mass_kg',
    'horizontal_tail_mass_kg',
    'vertical_tail_mass_kg',
    'landing_gear_mass_kg',
    'systems_mass_kg',
}


def _aft_only(key):
    """Return True for a quantity only a design with an aft fan has."""
    return key in _AFT_ONLY or key.startswith(_AFT_ONLY_PREFIXES)


def _has_aft_fan(values):
    """Return True when a design's fields describe an aft fan."""
    return (_number(values.get('aft_thrust_fraction')) or 0.0) > 0.0 or (
        _number(values.get('aft_fan_mass_kg')) or 0.0
    ) > 0.0


def _with_derived(values):
    """Return the fields with the wing loading they imply (MTOW / wing area)."""
    out = dict(values or {})
    mtow, area = _number(out.get('mtow_kg')), _number(out.get('wing_area_m2'))
    if mtow is not None and area:
        out['wing_loading_kg_per_m2'] = mtow / area
    return out


def _value_of(values, key):
    """Return a design's value of ``key`` (None for a missing one or one it does not have)."""
    if _aft_only(key) and not _has_aft_fan(values):
        return None
    return _number(values.get(key))


def _change_text(a, b, mode, spec):
    """Return the change of ``a`` against ``b`` ('+1.23 %' or a signed difference)."""
    if a is None or b is None:
        return NONE
    if mode == '%':
        return NONE if b == 0.0 else _pct(100.0 * (a - b) / abs(b))
    text = spec.format(a - b)
    if text.lstrip('-').strip('0.,') == '':
        text = spec.format(0.0)  # no '-0.0000'
    return text if text.startswith('-') else '+' + text


def side_by_side(columns, changes, key_field=None, require=None):
    """
    Return the grouped table of designs side by side with change columns.

    Parameters
    ----------
    columns : list of tuple
        (header, fields) of each design; fields are result fields (kg, kW, ...).
    changes : list of tuple
        (header, i, j): a column with the change of design ``i`` against design ``j``.
    key_field : str or None
        Field of the fuel-burn verdict (highlighted).
    require : int or None
        Show only the quantities the design of this column holds (a study row that keeps
        the main fields only); None for every quantity any design has.

    Returns
    -------
    str
        The table. A quantity a design does not have (the aft fan and electrical chain of a
        conventional design, stored as 0 or 1) is a dash; rows no design has are left out.
    """
    designs = [_with_derived(fields) for _, fields in columns]
    header = ['quantity', 'units'] + [h for h, _ in columns] + [h for h, _, _ in changes]
    rows = []
    for group, items in QUANTITIES:
        lines = []
        for label, key, units, spec, mode in items:
            values = [_value_of(d, key) for d in designs]
            if all(v is None for v in values):
                continue
            if require is not None and key not in designs[require]:
                continue
            label_text = ('\u2003' + label) if key in _SUB_ITEMS else label
            cells = [_td(label_text), _td(units)]
            cells += [_td(NONE if v is None else spec.format(v), 'num') for v in values]
            for _, i, j in changes:
                cells.append(_td(_change_text(values[i], values[j], mode, spec), 'num'))
            css = ' class="key"' if key == key_field else ''
            lines.append(f'<tr{css}>' + ''.join(cells) + '</tr>')
        if lines:
            rows.append(f'<tr class="group"><th colspan="{len(header)}">{_esc(group)}</th></tr>')
            rows += lines
    return _table(header, rows, css='compare')


#: Words for the constraint outputs of an optimisation.
CONSTRAINT_WORDS = {
    'wingspan': 'wing span',
    'takeoff_field_length': 'take-off field length',
    'approach_speed': 'approach speed',
    'landing_field_length': 'landing field length',
    'climb_thrust_margin': 'top-of-climb thrust margin',
    'buffet_margin': 'buffet margin',
    'aft_fan_diameter_margin': 'aft-fan tip diameter margin (tail-strike line)',
    'aft_fan_hub_to_tip_margin': 'aft-fan hub-to-tip margin (minimum blade height)',
    'motor_power_margin': 'motor power margin',
    'cable_current_density_margin': 'cable current-density margin',
    'cable_voltage_margin': 'bus-voltage partial-discharge margin',
}


#: Fields of objectives and fuel measures -> words.
FIELD_WORDS = {
    'block_fuel': 'block fuel',
    'mtow': 'MTOW',
    'block_energy': 'block energy',
    'total_energy': 'block energy',
    'total_fuel': 'total fuel',
    'economic_block_fuel': 'economic-mission block fuel',
    'economic_block_energy': 'economic-mission block energy',
}


#: The words of an active constraint in a sentence ("held by the span limit (36 m)").
ACTIVE_PHRASES = {
    'wingspan': 'the span limit',
    'takeoff_field_length': 'the take-off field length limit',
    'approach_speed': 'the approach speed limit',
    'landing_field_length': 'the landing field length limit',
    'climb_thrust_margin': 'the top-of-climb thrust requirement',
    'buffet_margin': 'the buffet margin',
    'aft_fan_diameter_margin': 'the aft-fan diameter limit (tail-strike line)',
    'aft_fan_hub_to_tip_margin': 'the minimum aft-fan blade height',
    'motor_power_margin': 'the motor power limit',
    'cable_current_density_margin': 'the cable current-density limit',
    'cable_voltage_margin': 'the partial-discharge limit of the bus voltage',
}


_KNOT = 0.514444  # m/s per knot (1852 m / 3600 s, exact by definition of the nautical mile)


def objective_label(objective, outputs=None, history=None):
    """
    Return the axis label of an optimisation objective with its units.

    The units are those of the result field whose value is the objective at the optimum
    (``block_fuel`` -> ``block_fuel_kg`` -> kg), found by matching the values.

    Parameters
    ----------
    objective : str
        The objective name of the config (``block_fuel``, ``mtow``, an output name...).
    outputs : dict or None
        Result fields of the optimum.
    history : list of dict or None
        The evaluations (their objective values).

    Returns
    -------
    str
        E.g. ``'block fuel [kg]'``.
    """
    words = FIELD_WORDS.get(objective, str(objective).replace('_', ' '))
    target = {'total_energy': 'block_energy'}.get(objective, objective)
    values = [e['objective'] for e in (history or []) if e.get('closed')]
    value = _number(values[-1]) if values else None
    for key, field in (outputs or {}).items():
        if not key.startswith(f'{target}_'):
            continue
        field = _number(field)
        if field is not None and value is not None and abs(field - value) <= 1e-6 * abs(field):
            units = key[len(target) + 1 :]
            return f'{words} [{pretty_units(units)}]'
    for key in outputs or {}:
        if key.startswith(f'{target}_') and key[len(target) + 1 :] in ('kg', 'MJ', 'm', 'kN'):
            return f'{words} [{key[len(target) + 1 :]}]'
    return f'{words} [model units]'


def _fuel_words(field, config=None):
    """Return the words of the fuel a change is measured on, with the mission."""
    config = config or {}
    if field == 'economic_block_fuel_kg':
        mission = config.get('economic_mission') or {}
        what = 'block fuel of the economic mission'
    else:
        mission = config.get('mission') or {}
        what = 'block fuel of the design mission'
    parts = [str(mission[k]) for k in ('range',) if k in mission]
    if 'payload' in mission:
        parts.append(f"{mission['payload']} payload")
    return what + (f" ({', '.join(parts)})" if parts else '')


def _fuel_field_of(data, config=None):
    """Return the field a fuel-burn change is measured on (given, or from the objective)."""
    field = data.get('fuel_burn_measured_on')
    if field:
        return field
    objective = str(((config or {}).get('optimization') or {}).get('objective', 'block_fuel'))
    objective = data.get('objective', objective) or objective
    return 'economic_block_fuel_kg' if str(objective).startswith('economic_') else 'block_fuel_kg'


def _more_less(change, what='fuel'):
    """Return 'burns 4.1 % more fuel' / 'burns 2.0 % less fuel'."""
    change = _number(change)
    if change is None:
        return f'has no {what} figure'
    word = 'more' if change > 0.0 else 'less'
    return f'burns {abs(change):.2f} % {word} {what}'


def _axis_text(path, values, written=None):
    """
    Return 'motor specific power 2–20 kW/kg (6 values)'.

    In ``written`` (the unit the user wrote the axis in) when given, else in the units a
    reader sees.
    """
    field = field_at(path)
    units = field.units if field is not None else None
    nums = [_number(v) for v in values]
    nums = [v for v in nums if v is not None]
    if not nums:
        return input_label(path)
    if written and units and written != units:
        factor = float(convert_units(1.0, units, written))
        lo, hi, shown = min(nums) * factor, max(nums) * factor, written
    else:
        lo, shown = _shown(min(nums), units)
        hi, _ = _shown(max(nums), units)
    unit = pretty_units(shown)
    unit = '' if unit == '-' else f' {unit}'
    return f'{input_label(path)} {_sig(lo)}–{_sig(hi)}{unit} ({len(nums)} values)'


def _path_units(path):
    """Return the SI units of a config key path (None for dimensionless or unknown)."""
    field = field_at(path)
    return field.units if field is not None else None
