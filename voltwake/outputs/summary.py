"""Plain-text summaries of results for the terminal."""

from ..design.fields import AFT_FAN_FIELDS

CAUTION = (
    'Conceptual estimates only: not for certification, flight or operational decisions; '
    'defer to the applicable airworthiness regulations and licensed engineering practice.'
)

#: How the analysis-only Monte Carlo is labelled wherever it appears (text, JSON, report,
#: figures), beside the study that re-optimises both aircraft at every sample.
ANALYSIS_ONLY = 'analysis only (configured design point, not re-optimised)'

#: Relative violation above which a configured constraint is shown as violated (that of the
#: optimiser's feasibility test, :data:`voltwake.optimization.FEASIBILITY_TOLERANCE`).
VIOLATION_SHOWN = 1e-5

#: What a table shows for a quantity a design does not have (the aft fan and electrical chain
#: of a conventional design, whose result fields are placeholders: 0, or 1 for efficiencies).
ABSENT = '—'

_ROWS = [
    (
        'Masses',
        [
            ('MTOW', 'mtow_kg', 'kg', '{:,.0f}'),
            ('OEW', 'oew_kg', 'kg', '{:,.0f}'),
            ('  airframe', 'airframe_mass_kg', 'kg', '{:,.0f}'),
            ('  propulsion', 'propulsion_mass_kg', 'kg', '{:,.0f}'),
            ('    turbofans (with nacelles)', 'engines_mass_kg', 'kg', '{:,.0f}'),
            ('      nacelles', 'nacelle_mass_kg', 'kg', '{:,.0f}'),
            ('    aft fan', 'aft_fan_mass_kg', 'kg', '{:,.0f}'),
            ('    electrical (incl. thermal)', 'electrical_mass_kg', 'kg', '{:,.0f}'),
            ('Payload', 'payload_kg', 'kg', '{:,.0f}'),
        ],
    ),
    (
        'Airframe build-up',
        [
            ('wing', 'wing_mass_kg', 'kg', '{:,.0f}'),
            ('fuselage', 'fuselage_mass_kg', 'kg', '{:,.0f}'),
            ('horizontal tail', 'horizontal_tail_mass_kg', 'kg', '{:,.0f}'),
            ('vertical tail', 'vertical_tail_mass_kg', 'kg', '{:,.0f}'),
            ('landing gear', 'landing_gear_mass_kg', 'kg', '{:,.0f}'),
            ('systems and furnishings', 'systems_mass_kg', 'kg', '{:,.0f}'),
            ('Horizontal tail area', 'horizontal_tail_area_m2', 'm**2', '{:.2f}'),
            ('Vertical tail area', 'vertical_tail_area_m2', 'm**2', '{:.2f}'),
            ('Fuselage length', 'fuselage_length_m', 'm', '{:.2f}'),
        ],
    ),
    (
        'Fuel',
        [
            ('Block (trip) fuel', 'block_fuel_kg', 'kg', '{:,.0f}'),
            ('Reserve fuel', 'reserve_fuel_kg', 'kg', '{:,.0f}'),
            ('Total fuel', 'total_fuel_kg', 'kg', '{:,.0f}'),
            ('Block energy', 'block_energy_MJ', 'MJ', '{:,.0f}'),
        ],
    ),
    (
        'Economic mission',
        [
            ('Block (trip) fuel', 'economic_block_fuel_kg', 'kg', '{:,.0f}'),
            ('Block energy', 'economic_block_energy_MJ', 'MJ', '{:,.0f}'),
            ('Reserve fuel', 'economic_reserve_fuel_kg', 'kg', '{:,.0f}'),
            ('Take-off mass', 'economic_takeoff_mass_kg', 'kg', '{:,.0f}'),
            ('Cruise lift-to-drag ratio', 'economic_cruise_lift_to_drag', '', '{:.3f}'),
        ],
    ),
    (
        'Cruise',
        [
            ('Lift coefficient', 'cruise_cl', '', '{:.4f}'),
            ('Lift-to-drag ratio', 'cruise_lift_to_drag', '', '{:.3f}'),
            ('Zero-lift drag coefficient', 'zero_lift_drag_coefficient', '', '{:.5f}'),
            ('Wave drag coefficient', 'wave_drag_coefficient', '', '{:.5f}'),
            ('Drag-divergence Mach number', 'drag_divergence_mach', '', '{:.4f}'),
            ('Drag', 'cruise_drag_kN', 'kN', '{:.3f}'),
            ('TSFC', 'tsfc_g_per_kN_s', 'g/(kN s)', '{:.3f}'),
            ('Overall efficiency', 'overall_efficiency', '', '{:.4f}'),
        ],
    ),
    (
        'Wing',
        [
            ('Reference area', 'wing_area_m2', 'm**2', '{:.2f}'),
            ('Loading (MTOW / area)', 'wing_loading_kg_per_m2', 'kg/m**2', '{:.1f}'),
            ('Span', 'wingspan_m', 'm', '{:.2f}'),
        ],
    ),
    (
        'Turbofans (each)',
        [
            ('Fan diameter', 'turbofan_fan_diameter_m', 'm', '{:.3f}'),
            ('Cruise net thrust', 'turbofan_cruise_thrust_kN', 'kN', '{:.3f}'),
            ('Rated thrust', 'turbofan_rated_thrust_kN', 'kN', '{:.2f}'),
        ],
    ),
    (
        'Performance',
        [
            ('Take-off field length', 'takeoff_field_length_m', 'm', '{:,.0f}'),
            ('Take-off thrust (all propulsors)', 'takeoff_thrust_kN', 'kN', '{:.2f}'),
            ('Take-off thrust / weight', 'takeoff_thrust_to_weight', '', '{:.4f}'),
            ('Approach speed', 'approach_speed_kn', 'kn', '{:.1f}'),
            ('Landing field length', 'landing_field_length_m', 'm', '{:,.0f}'),
            ('Top-of-climb thrust margin', 'climb_thrust_margin', '', '{:.4f}'),
            ('Buffet margin', 'buffet_margin', '', '{:.4f}'),
        ],
    ),
    (
        'Aft fan and electrical chain',
        [
            ('Thrust fraction', 'aft_thrust_fraction', '', '{:.4f}'),
            ('PSC vs same-FPR clean fan', 'power_saving_coefficient', '', '{:.4f}'),
            (
                'PSC vs same-mass-flow clean fan',
                'power_saving_coefficient_same_mass_flow',
                '',
                '{:.4f}',
            ),
            ('Shaft power', 'aft_fan_shaft_power_kW', 'kW', '{:,.1f}'),
            ('Fan efficiency in ingested flow', 'aft_fan_installed_efficiency', '', '{:.4f}'),
            ('Tip diameter', 'aft_fan_diameter_m', 'm', '{:.3f}'),
            ('Hub (tail-cone) diameter', 'aft_fan_hub_diameter_m', 'm', '{:.3f}'),
            ('Hub-to-tip ratio', 'aft_fan_hub_to_tip_ratio', '', '{:.3f}'),
            ('Take-off thrust', 'aft_fan_takeoff_thrust_kN', 'kN', '{:.2f}'),
            ('Take-off shaft power', 'aft_fan_takeoff_power_kW', 'kW', '{:,.1f}'),
            ('Capture height', 'capture_height_m', 'm', '{:.4f}'),
            ('Boundary-layer thickness', 'boundary_layer_thickness_m', 'm', '{:.4f}'),
            ('Turbofan power extraction', 'turbofan_power_extraction_kW', 'kW', '{:,.1f}'),
            ('Chain efficiency', 'electrical_chain_efficiency', '', '{:.4f}'),
            ('Heat load, cruise', 'thermal_load_kW', 'kW', '{:,.1f}'),
            ('Heat load, rated', 'thermal_rated_load_kW', 'kW', '{:,.1f}'),
            ('Cable current', 'cable_current_A', 'A', '{:,.1f}'),
            ('Aft-fan diameter margin', 'aft_fan_diameter_margin', '', '{:.4f}'),
            ('Aft-fan hub-to-tip margin', 'aft_fan_hub_to_tip_margin', '', '{:.4f}'),
            ('Motor power margin', 'motor_power_margin', '', '{:.4f}'),
            ('Cable partial-discharge margin', 'cable_voltage_margin', '', '{:.4f}'),
        ],
    ),
]


def _with_wing_loading(values):
    """Return the result fields with the wing loading they imply (MTOW / wing area)."""
    return {**values, 'wing_loading_kg_per_m2': values['mtow_kg'] / values['wing_area_m2']}


def _bound_text(entry):
    parts = [
        f'{word} {entry[key]:.6g}'
        for key, word in (('lower', '>='), ('upper', '<='), ('equals', '='))
        if entry[key] is not None
    ]
    return ', '.join(parts) + (f" {entry['units']}" if entry['units'] else '')


def constraint_lines(table):
    """
    Format the configured constraints of a design, flagging those it violates.

    Parameters
    ----------
    table : dict
        Output name -> {value, lower, upper, equals, units, violation, ...}.

    Returns
    -------
    list of str
        Lines to print (none for an empty table).
    """
    if not table:
        return []
    lines = ['Constraints of the optimization section']
    for name, entry in table.items():
        status = 'VIOLATED' if entry['violation'] > VIOLATION_SHOWN else 'ok'
        lines.append(f"  {name:<32s}{entry['value']:>14.6g}   {_bound_text(entry):<24s}{status}")
    broken = [name for name, entry in table.items() if entry['violation'] > VIOLATION_SHOWN]
    if broken:
        lines.append(
            f"  the design closes but violates {len(broken)} constraint(s): {', '.join(broken)}"
        )
    return lines


def has_aft_fan(values):
    """
    Return True when result fields belong to a design with an aft fan.

    Parameters
    ----------
    values : dict
        Result fields of one design.

    Returns
    -------
    bool
        False for a conventional design (its aft-fan thrust fraction is zero or absent).
    """
    return values.get('aft_thrust_fraction', 0.0) != 0.0


def absent_fields(values):
    """
    Return the result fields a design reports only as placeholders.

    A design without an aft fan has no aft fan, electrical chain or their margins; its
    result fields for them hold 0 (1 for efficiencies) so that every design has the same
    fields. They are not quantities of that design.

    Parameters
    ----------
    values : dict
        Result fields of one design.

    Returns
    -------
    list of str
        Sorted field names (empty for a design with an aft fan).
    """
    if has_aft_fan(values):
        return []
    return sorted(key for key in AFT_FAN_FIELDS if key in values)


def _shown(values, key, fmt):
    """Return one value as a table shows it ('—' for a quantity the design lacks)."""
    if key in AFT_FAN_FIELDS and not has_aft_fan(values):
        return ABSENT
    return fmt.format(values[key])


def _table(header, rows, align, gaps=None):
    """
    Lay out a text table whose column widths are measured from its cells.

    Parameters
    ----------
    header : list of str or None
        Column headings (None for no heading line).
    rows : list
        Each a list of cell strings (one per column), or a plain string for a section title
        printed on its own line.
    align : str
        One of '<' or '>' per column.
    gaps : list of str or None
        The separator after each column but the last (default: two blanks).

    Returns
    -------
    list of str
        The lines, trailing blanks removed.
    """
    cells = [r for r in rows if not isinstance(r, str)] + ([header] if header else [])
    widths = [max(len(r[i]) for r in cells) for i in range(len(align))]
    out = []
    for row in ([header] if header else []) + rows:
        if isinstance(row, str):
            out.append(row)
            continue
        parts = [f'{cell:{a}{w}s}' for cell, a, w in zip(row, align, widths)]
        text = parts[0]
        for gap, part in zip(gaps or ['  '] * (len(parts) - 1), parts[1:]):
            text += gap + part
        out.append(text.rstrip())
    return out


def analysis_text(result):
    """
    Format one converged design.

    Parameters
    ----------
    result : AnalysisResult
        The design.

    Returns
    -------
    str
        The summary.
    """
    values = _with_wing_loading(result.values)
    closed = f'  sizing loop closed in {result.iterations} Newton iterations'
    if result.continuation:
        closed = '  sizing loop closed by continuation from the same design on a short range'
    rows = []
    for title, section in _ROWS:
        if title.startswith('Aft fan') and not has_aft_fan(values):
            continue
        if section[0][1] not in values:  # e.g. the build-up of a regression design
            continue
        rows.append(title)
        for label, key, unit, fmt in section:
            shown = _shown(values, key, fmt)
            rows.append([f'  {label}', shown, unit if shown != ABSENT else ''])
    lines = [f'{result.name}', closed] + _table(None, rows, '<><', gaps=['  ', ' '])
    lines += constraint_lines(result.constraints)
    lines.append(CAUTION)
    return '\n'.join(lines)


def comparison_text(design, reference, diff):
    """
    Format a design beside its conventional reference.

    Columns are as wide as their widest entry. A quantity a design does not have (the aft
    fan and electrical chain of the reference) shows as '—', not as its placeholder 0 or 1.

    Parameters
    ----------
    design, reference : AnalysisResult
        The two designs.
    diff : dict
        Field -> percentage difference (design vs reference).

    Returns
    -------
    str
        The side-by-side table.
    """
    ours, theirs = _with_wing_loading(design.values), _with_wing_loading(reference.values)
    header = ['', 'turbo-electric' if has_aft_fan(ours) else 'design', 'reference', 'change']
    rows = []
    for title, section in _ROWS:
        if section[0][1] not in ours:
            continue
        body = []
        for label, key, unit, fmt in section:
            a, b = _shown(ours, key, fmt), _shown(theirs, key, fmt)
            if a == b == ABSENT:
                continue
            change = f'{diff[key]:+.2f}%' if key in diff and ABSENT not in (a, b) else ''
            body.append([f'  {label}' + (f' [{unit}]' if unit else ''), a, b, change])
        if body:
            rows += [title, *body]
    lines = _table(header, rows, '<>>>')
    lines.append(f'Block fuel change versus the reference: {diff["block_fuel_kg"]:+.2f}%')
    lines.append(CAUTION)
    return '\n'.join(lines)


def optimization_text(result):
    """
    Format the outcome of an optimisation.

    Parameters
    ----------
    result : OptimizationResult
        The outcome.

    Returns
    -------
    str
        Design variables (active bounds marked), constraints (active ones marked),
        objective and its change from the starting design.
    """
    lines = [
        f"{'optimum' if result.success else 'NOT a successful optimum'}: {result.message}",
        f'{result.evaluations} model evaluations, {result.failed_points} trial points '
        'did not close',
        'Design variables                         value        lower        upper',
    ]
    for path, dv in result.design.items():
        mark = '  <- active bound' if dv['active'] else ''
        lines.append(
            f"  {path:<34s}{dv['value']:>12.5g}{dv['lower']:>13.5g}"
            f"{dv['upper']:>13.5g} {dv['units'] or ''}{mark}"
        )
    lines.append('Constraints                              value        bound')
    for name, con in result.constraints.items():
        bound = ' '.join(
            f'{k} {con[k]:g}' for k in ('lower', 'upper', 'equals') if con[k] is not None
        )
        mark = '  <- active' if con['active'] else ''
        lines.append(f"  {name:<34s}{con['value']:>12.5g}   {bound} {con['units'] or ''}{mark}")
    if result.outputs:
        key = {
            'block_fuel': 'block_fuel_kg',
            'mtow': 'mtow_kg',
            'block_energy': 'block_energy_MJ',
            'total_fuel': 'total_fuel_kg',
        }
        field = key.get(result.objective, 'block_fuel_kg')
        start, end = result.start[field], result.outputs[field]
        lines.append(
            f'Objective {result.objective}: {end:,.6g} (start {start:,.6g}, '
            f'{100 * (end - start) / start:+.2f}%)'
        )
        lines.append(
            f"Block fuel {result.outputs['block_fuel_kg']:,.1f} kg, MTOW "
            f"{result.outputs['mtow_kg']:,.1f} kg, L/D "
            f"{result.outputs['cruise_lift_to_drag']:.3f}"
        )
    if not result.success:
        best = result.best_feasible
        lines.append(
            'Best feasible point found: '
            + (
                'none'
                if best is None
                else f"evaluation {best['evaluation']}, objective "
                f"{best['objective']:,.6g}, design "
                + ', '.join(f'{k} = {v:.5g}' for k, v in best['design'].items())
            )
        )
    lines.append(CAUTION)
    return '\n'.join(lines)


def sweep_text(summaries, out_dir=None):
    """
    Format the summaries of ``voltwake sweep``.

    Parameters
    ----------
    summaries : dict
        Study name -> summary.
    out_dir : str or None
        Where the files were written.

    Returns
    -------
    str
        A few lines per study.
    """
    lines = []
    for name, res in summaries.items():
        if name == 'map':
            lines.append(
                f"design-space map of {res.get('design', '')}: "
                f"{100 * res['closure_rate']:.2f}% of the points closed "
                f"({res.get('recovered', 0)} by continuation)"
            )
            lines.append(_reference_line(res))
        elif name == 'targets':
            lines += target_sweep_lines(res)
        elif name == 'breakeven':
            shown = res.get('display') or res  # in the unit the user wrote, when given
            units = shown.get('units') or ''
            if res.get('found'):
                lines.append(
                    f"break-even {res['path']} = {shown['value']:.6g} {units} (fuel-burn "
                    f"difference there {res['difference_at_value']:+.4f}%)"
                )
                lines.extend(_breakeven_held_lines(res))
            else:
                lines.append(
                    f"no break-even of {res['path']} in [{shown['lower']:g}, "
                    f"{shown['upper']:g}] {units}: the design burns "
                    f"{res['difference_at_lower']:+.2f}% at the lower end and "
                    f"{res['difference_at_upper']:+.2f}% at the upper end"
                )
        elif name == 'montecarlo_optimized':
            lines += optimized_monte_carlo_lines(res)
        elif name == 'montecarlo':
            stats = res['fuel_burn_change_percent']
            lines.append(
                f"Monte Carlo, {ANALYSIS_ONLY}, {res['samples']} samples: fuel-burn change mean "
                f"{stats.get('mean', float('nan')):+.3f}% (5-95%: "
                f"{stats.get('p05', float('nan')):+.3f}% to "
                f"{stats.get('p95', float('nan')):+.3f}%), probability that the "
                f"turbo-electric design wins {100 * res['probability_of_win']:.1f}%"
            )
            lines.append(_reference_line(res))
    if out_dir:
        lines.append(f'results written to {out_dir}')
    lines.append(CAUTION)
    return '\n'.join(lines)


def target_sweep_lines(res):
    """
    Return the lines of a target sweep: points by status, why points have no design.

    Parameters
    ----------
    res : dict
        The target sweep's summary.

    Returns
    -------
    list of str
        The counts of optima, points with no feasible design and optimiser failures; the
        constraints that bind at the infeasible points and by how much; the optimised
        reference block fuel (its range when the references differ by point).
    """
    total = res.get('points_count', 0)
    optimum = res.get('optimum_count', res.get('closed_count', 0))
    infeasible, failed = res.get('infeasible_count', 0), res.get('failed_count', 0)
    lines = [
        f'target sweep: {optimum} of {total} points have an optimum, {infeasible} have no '
        f'feasible design, {failed} optimisations failed'
    ]
    if infeasible:
        lines.append(f'{infeasible} points have no feasible design: {binding_words(res)}')
    if failed:
        lines.append(
            f'{failed} optimisations failed (the optimiser, not the design: see the '
            "'message' column of the points)"
        )
    fuels = [
        ((ref or {}).get('outputs') or {}).get('block_fuel_kg', float('nan'))
        for ref in (res.get('references') or [res.get('reference') or {}])
    ]
    fuels = [f for f in fuels if f is not None and f == f] or [float('nan')]
    if len(fuels) == 1 or min(fuels) == max(fuels):
        lines.append(f'optimised reference block fuel {fuels[0]:,.1f} kg')
    else:
        lines.append(
            f'optimised reference block fuel {min(fuels):,.1f} to {max(fuels):,.1f} kg '
            f'({len(fuels)} references, one per value of the targets the reference shares)'
        )
    return lines


def _breakeven_held_lines(res):
    """Return the lines of what holds the optimum at a break-even and its bound dependence."""
    held = res.get('design_at_value') or {}
    lines = []
    if held.get('active'):
        lines.append(
            '  held there by: '
            + ', '.join(
                f"{a[len('bound:') :]} at its "
                f"{held['design_variables'][a[len('bound:') :]]['at_bound']} bound"
                if a.startswith('bound:')
                else a
                for a in held['active']
            )
        )
    if held.get('design'):
        lines.append(
            '  design there: ' + ', '.join(f'{k} = {v:.5g}' for k, v in held['design'].items())
        )
    lines.extend(f"  {dep['message']}" for dep in res.get('bound_dependence') or [])
    sens = (res.get('sensitivities') or {}).get(res['path'])
    if sens:
        at = res.get('sensitivities_at') or {}
        units = sens.get('units') or '1'
        lines.append(
            f"  d(optimised block fuel)/d({res['path']}) at the {at.get('where', '')}: "
            f"{sens['derivative']:+.4g} kg per {units} (design re-optimised; the reference "
            'does not depend on it)'
        )
    return lines


def binding_words(res):
    """
    Return which constraints bind at a target sweep's infeasible points, and by how much.

    Parameters
    ----------
    res : dict
        The target sweep's summary (``infeasible_constraints``).

    Returns
    -------
    str
        E.g. ``'motor_power_margin binds by 0.6-53 % (at 6 points)'``.
    """
    parts = []
    for name, entry in (res.get('infeasible_constraints') or {}).items():
        if entry.get('percent_min') is not None:
            low, high, unit = entry['percent_min'], entry['percent_max'], ' %'
        else:
            low, high = entry['amount_min'], entry['amount_max']
            unit = f" {entry['units']}" if entry.get('units') else ''
        span = f'{low:.3g}' if f'{low:.3g}' == f'{high:.3g}' else f'{low:.3g}-{high:.3g}'
        span += unit
        parts.append(f"{name} binds by {span} (at {entry['points']} points)")
    return '; '.join(parts) or 'no constraint recorded'


#: Unsuccessful samples listed by name in the text (all of them are in the CSV and JSON).
LISTED_FAILURES = 10


def _or_nan(value):
    """Return ``value``, or NaN for None (a NaN written to JSON)."""
    return float('nan') if value is None else value


def optimized_monte_carlo_lines(res):
    """
    Format a Monte Carlo study that re-optimises both aircraft at every sample.

    Parameters
    ----------
    res : dict
        Its summary (``kind`` 'montecarlo_optimized').

    Returns
    -------
    list of str
        The lines: the distribution of the fuel-burn change of the optima, the probability
        of a win with its Wilson score interval, the unsuccessful samples, the reference and
        the design variables at the optima.
    """
    nan = float('nan')
    stats = res.get('fuel_burn_change_percent') or {}
    counts = res.get('status_counts') or {}
    done = res.get('samples_finished', res.get('samples', 0))
    ok = res.get('successful_samples', 0)
    head = f"Monte Carlo, both aircraft re-optimised at every sample, {res['samples']} samples"
    if res.get('status') == 'partial':
        head += f' (interrupted: {done} finished)'
    lines = [head + ':']
    nominal = (res.get('nominal') or {}).get('fuel_burn_change_percent')
    if nominal is not None:
        lines.append(f'  at the nominal inputs the optima differ by {nominal:+.3f}%')
    if ok:
        lines.append(
            f"  fuel-burn change of the optima: mean {stats.get('mean', nan):+.3f}%, std "
            f"{stats.get('std', nan):.3f}%, 5/50/95%: {stats.get('p05', nan):+.3f}% / "
            f"{stats.get('p50', nan):+.3f}% / {stats.get('p95', nan):+.3f}%"
        )
        ci = res.get('probability_of_win_interval') or {}
        lines.append(
            f"  probability that the turbo-electric design wins "
            f"{100 * res['probability_of_win']:.1f}% ({res.get('wins', 0)} of {ok} successful "
            f"samples; {100 * ci.get('confidence', 0.95):.0f}% Wilson score interval "
            f"{100 * _or_nan(ci.get('lower')):.1f}% to {100 * _or_nan(ci.get('upper')):.1f}%)"
        )
    else:
        lines.append('  no sample has an optimum of both aircraft: no probability of a win')
    bad = res.get('unsuccessful_samples') or []
    if bad:
        lines.append(
            f"  {len(bad)} of {done} samples without an optimum ({counts.get('infeasible', 0)} "
            f"infeasible, {counts.get('failed', 0)} failed), not counted in the probability:"
        )
        for entry in bad[:LISTED_FAILURES]:
            lines.append(f"    sample {entry['sample']}: {entry['status']}: {entry['message']}")
        if len(bad) > LISTED_FAILURES:
            lines.append(f'    ... and {len(bad) - LISTED_FAILURES} more (see the CSV file)')
    ref = res.get('reference') or {}
    lines.append(
        f"  conventional reference optimised {ref.get('optimised', '?')}: {ref.get('why', '')}"
    )
    dvs = {p: d for p, d in (res.get('design_variables') or {}).items() if 'p50' in d}
    if dvs:
        lines.append('  design variables at the optima (5 / 50 / 95 %; optima at a bound):')
        width = max(len(p) for p in dvs)
        for path, d in dvs.items():
            shown, factor = display_units(d.get('units'))
            unit = pretty_units(shown) if shown else '-'
            lines.append(
                f"    {path:<{width}s}  {d['p05'] * factor:.4g} / {d['p50'] * factor:.4g} / "
                f"{d['p95'] * factor:.4g} {unit}; {d['at_lower']} at lower, "
                f"{d['at_upper']} at upper"
            )
    return lines


def _reference_line(res):
    """
    Say what a map or Monte Carlo was compared with: one fixed reference, or one per point.

    Parameters
    ----------
    res : dict
        The study's summary (``reference_follows``, ``reference``).

    Returns
    -------
    str
        One line.
    """
    follows = res.get('reference_follows') or []
    if follows:
        rate = res.get('reference_closure_rate')
        closed = '' if rate is None else f' ({100 * rate:.2f}% of the references closed)'
        return (
            f"reference: re-analysed at every point, following {', '.join(follows)}{closed}; "
            'each point is compared with its own reference'
        )
    ref = res.get('reference') or {}
    field = res.get('fuel_burn_measured_on') or 'block_fuel_kg'
    fuel = ref.get(field)
    shown = f'{fuel:,.1f} kg' if isinstance(fuel, (int, float)) else 'n/a'
    words = 'economic-mission block fuel' if field == 'economic_block_fuel_kg' else 'block fuel'
    return f'reference: fixed (the study varies technology inputs only), {words} {shown}'


#: Words for config key paths that studies and optimisations commonly vary.
INPUT_LABELS = {
    'wing.loading': 'wing loading',
    'wing.area': 'wing area',
    'wing.aspect_ratio': 'wing aspect ratio',
    'wing.sweep': 'wing sweep (quarter chord)',
    'wing.thickness_to_chord': 'wing thickness-to-chord ratio',
    'turbofans.fan_pressure_ratio': 'turbofan fan pressure ratio',
    'turbofans.rated_to_cruise_thrust': 'turbofan rated-to-cruise thrust ratio',
    'aft_fan.thrust_fraction': 'aft-fan thrust fraction',
    'aft_fan.fan_pressure_ratio': 'aft-fan fan pressure ratio',
    'aft_fan.fan_efficiency': 'aft-fan efficiency (clean inflow)',
    'electrical.cable.voltage': 'bus voltage',
    'mission.cruise_altitude': 'cruise altitude',
    'mission.cruise_mach': 'cruise Mach number',
    'mission.range': 'design range',
}

#: Units shown to a reader for SI units that make long numbers: SI unit -> (shown, factor).
DISPLAY_UNITS = {
    'W/kg': ('kW/kg', 1e-3),
    'W': ('kW', 1e-3),
    'rad': ('deg', 57.29577951308232),
    'Pa': ('kPa', 1e-3),
    'N': ('kN', 1e-3),
    'J/kg': ('MJ/kg', 1e-6),
}


def input_label(path):
    """
    Return the words for a config key path (or a model output name).

    Parameters
    ----------
    path : str
        Dotted config key path, e.g. ``'electrical.motor.specific_power'``.

    Returns
    -------
    str
        E.g. ``'motor specific power'``.
    """
    if path in INPUT_LABELS:
        return INPUT_LABELS[path]
    parts = path.split('.')
    section = {'aft_fan': 'aft-fan', 'turbofans': 'turbofan', 'electrical': ''}.get(
        parts[0], parts[0]
    )
    words = ([section] if section else []) + parts[1:] if len(parts) > 1 else parts
    return ' '.join(w.replace('_', ' ') for w in words if w).strip()


def display_units(units):
    """
    Return the units a reader sees for SI ``units`` and the factor from SI to them.

    Parameters
    ----------
    units : str or None
        SI units of a value (None or '' for a dimensionless one).

    Returns
    -------
    tuple
        (shown units or '', factor): shown value = factor * SI value.
    """
    if not units:
        return '', 1.0
    return DISPLAY_UNITS.get(units, (units, 1.0))


def pretty_units(units):
    """
    Return units as a reader writes them (``kg/m**2`` -> ``kg/m²``).

    Parameters
    ----------
    units : str or None
        Units in OpenMDAO's notation.

    Returns
    -------
    str
        The units ('-' for none).
    """
    if not units or units == '-':
        return '-'
    return units.replace('**2', '²').replace('**3', '³').replace('*', '·')


def axis_label(path, units):
    """
    Return an axis or column label with units in brackets, in the units a reader sees.

    Parameters
    ----------
    path : str
        Dotted config key path.
    units : str or None
        SI units of its values.

    Returns
    -------
    str
        E.g. ``'motor specific power [kW/kg]'``.
    """
    shown, _ = display_units(units)
    return f'{input_label(path)} [{pretty_units(shown)}]'
