"""
PNG figures of results: fuel-burn and power-saving maps, masses, power flow, histories.

matplotlib is an optional dependency (``pip install 'voltwake[plot]'``); it is imported
only when a figure is drawn. Every figure is drawn on its own ``Figure`` with an explicit
Agg canvas, so no pyplot state is created or changed (an interactive user's open figures
and backend are left alone). Every function writes one PNG and returns its path as a
:class:`PlotFile`, a ``str`` that also carries what was drawn (for tests and callers).
"""

import numpy as np

from .errors import ConfigError

#: Floor of the worst constraint violation on the log axis of :func:`plot_history`.
VIOLATION_FLOOR = 1e-12

#: Relative tolerance of the power balance checked by :func:`plot_power_flow`.
POWER_BALANCE_RTOL = 1e-6

#: Relative tolerance of the mass build-up checked by :func:`plot_mass_breakdown`.
MASS_BALANCE_RTOL = 1e-6

_MASS_PARTS = [
    ('airframe_mass_kg', 'airframe'),
    ('engines_mass_kg', 'turbofans'),
    ('aft_fan_mass_kg', 'aft fan'),
    ('electrical_mass_kg', 'electrical (incl. thermal)'),
    ('payload_kg', 'payload'),
    ('total_fuel_kg', 'fuel (trip + reserve)'),
]

#: The airframe's own parts when it was built up from its components (build-up method).
_AIRFRAME_PARTS = [
    ('wing_mass_kg', 'wing'),
    ('fuselage_mass_kg', 'fuselage'),
    (('horizontal_tail_mass_kg', 'vertical_tail_mass_kg'), 'tails'),
    ('landing_gear_mass_kg', 'landing gear'),
    ('systems_mass_kg', 'systems, furnishings, operating items'),
]


def _parts_of(masses):
    """Return the (key or keys, label) parts for a design: airframe split when built up."""
    if 'wing_mass_kg' not in masses:
        return _MASS_PARTS
    return _AIRFRAME_PARTS + _MASS_PARTS[1:]


def _part_mass(masses, key):
    """Return the mass of a part (the sum when it names several keys; missing keys are 0)."""
    keys = key if isinstance(key, tuple) else (key,)
    return sum(float(masses.get(name, 0.0)) for name in keys)


_CHAIN = [
    ('generator', 'generator_loss_kW'),
    ('rectifier', 'rectifier_loss_kW'),
    ('cable', 'cable_loss_kW'),
    ('inverter', 'inverter_loss_kW'),
    ('motor', 'motor_loss_kW'),
]


class PlotFile(str):
    """
    Path of a written PNG that also carries a summary of what was drawn.

    It is a ``str`` and can be used wherever a path is expected.

    Parameters
    ----------
    path : str
        The PNG file.
    details : dict or None
        What was drawn (e.g. whether a break-even line exists); see each plot function.
    """

    def __new__(cls, path, details=None):
        """
        Create the path string.

        Parameters
        ----------
        path : str
            The PNG file.
        details : dict or None
            What was drawn.

        Returns
        -------
        PlotFile
            The path.
        """
        obj = super().__new__(cls, path)
        obj.details = dict(details or {})
        return obj


def _new_figure(figsize):
    """
    Return a matplotlib Figure with its own Agg canvas (no pyplot involved).

    Parameters
    ----------
    figsize : tuple of float
        Width and height in inches.

    Returns
    -------
    matplotlib.figure.Figure
        The figure.
    """
    try:
        from matplotlib.backends.backend_agg import FigureCanvasAgg
        from matplotlib.figure import Figure
    except ImportError:
        raise ConfigError("plots need matplotlib: pip install 'voltwake[plot]'") from None
    fig = Figure(figsize=figsize, layout='constrained')
    FigureCanvasAgg(fig)
    return fig


def _save(fig, path, details):
    """
    Write the figure as a PNG and return its path.

    Parameters
    ----------
    fig : matplotlib.figure.Figure
        The figure.
    path : str
        Destination file.
    details : dict
        What was drawn.

    Returns
    -------
    PlotFile
        The path.
    """
    fig.savefig(path, format='png', dpi=120)
    fig.clear()
    return PlotFile(str(path), details)


def _grid(x, y, z, closed):
    """
    Check the shapes of a map and return its arrays and the mask of usable points.

    Parameters
    ----------
    x, y : array_like
        1-D swept values (lengths nx and ny, at least 2 each).
    z : array_like
        Values at the points, shape (ny, nx).
    closed : array_like
        True where the sizing loop closed, shape (ny, nx).

    Returns
    -------
    tuple
        x, y, z as float arrays and the boolean mask of closed, finite points.
    """
    x = np.asarray(x, dtype=float)
    y = np.asarray(y, dtype=float)
    z = np.asarray(z, dtype=float)
    closed = np.asarray(closed, dtype=bool)
    if x.ndim != 1 or y.ndim != 1 or x.size < 2 or y.size < 2:
        raise ValueError(
            f'map axes must be 1-D with at least 2 values each; got shapes {x.shape} and {y.shape}'
        )
    shape = (y.size, x.size)
    if z.shape != shape or closed.shape != shape:
        raise ValueError(
            f'map values and closed flags must have shape (ny, nx) = {shape}; '
            f'got {z.shape} and {closed.shape}'
        )
    return x, y, z, closed & np.isfinite(z)


def _contour_map(x, y, z, closed, x_label, y_label, path, title, bar_label, cmap, break_even):
    """
    Draw a filled contour map with failed points masked grey and marked.

    Parameters
    ----------
    x, y : array_like
        1-D swept values.
    z : array_like
        Values, shape (ny, nx).
    closed : array_like
        True where the sizing loop closed, shape (ny, nx).
    x_label, y_label : str
        Axis labels (with units).
    path : str
        Destination PNG.
    title : str
        Figure title (the count of failed points is appended).
    bar_label : str
        Colour bar label.
    cmap : str
        Colour map name.
    break_even : bool
        Draw the zero contour as a bold labelled line where it exists.

    Returns
    -------
    PlotFile
        The path; details 'failed_points', 'break_even_drawn', 'levels'.
    """
    from matplotlib.colors import TwoSlopeNorm

    x, y, z, good = _grid(x, y, z, closed)
    failed = int(good.size - good.sum())
    fig = _new_figure((7.5, 5.5))
    ax = fig.add_subplot()
    ax.set_facecolor('0.85')
    details = {'failed_points': failed, 'break_even_drawn': False, 'levels': []}
    if failed == good.size:
        ax.text(
            0.5,
            0.5,
            'no point closed',
            transform=ax.transAxes,
            ha='center',
            va='center',
            fontsize=14,
            bbox={'facecolor': 'white', 'edgecolor': 'k'},
        )
        ax.set_xlim(x.min(), x.max())
        ax.set_ylim(y.min(), y.max())
    else:
        masked = np.ma.masked_array(z, mask=~good)
        low, high = float(masked.min()), float(masked.max())
        if high - low <= 1e-12 * max(1.0, abs(low)):
            low, high = low - 0.5, high + 0.5
        levels = np.linspace(low, high, 15)
        norm = TwoSlopeNorm(vcenter=0.0, vmin=low, vmax=high) if low < 0.0 < high else None
        filled = ax.contourf(x, y, masked, levels=levels, cmap=cmap, norm=norm)
        fig.colorbar(filled, ax=ax, label=bar_label)
        details['levels'] = [float(v) for v in levels]
        if break_even and low < 0.0 < high:
            line = ax.contour(x, y, masked, levels=[0.0], colors='k', linewidths=2.5)
            if any(len(seg) > 1 for seg in line.allsegs[0]):
                ax.clabel(line, fmt={0.0: 'break-even'}, fontsize=10)
                ax.plot([], [], 'k-', linewidth=2.5, label='break-even (0 %)')
                details['break_even_drawn'] = True
    if failed:
        grid_x, grid_y = np.meshgrid(x, y)
        ax.plot(
            grid_x[~good],
            grid_y[~good],
            'x',
            color='0.3',
            linestyle='none',
            label=f'did not close ({failed})',
        )
    if failed or details['break_even_drawn']:
        ax.legend(loc='best', fontsize=9)
    ax.set_xlabel(x_label)
    ax.set_ylabel(y_label)
    note = (
        f'{failed} of {good.size} points did not close'
        if failed
        else f'all {good.size} points closed'
    )
    ax.set_title(f'{title}\n({note})')
    return _save(fig, path, details)


def plot_fuel_map(
    x,
    y,
    change_percent,
    closed,
    x_label,
    y_label,
    path,
    title='Fuel-burn change versus the reference',
):
    """
    Draw a filled contour of the fuel-burn change over two swept quantities.

    Points whose sizing loop did not close (or whose value is not finite) are masked
    (grey background) and marked; their number is given in the title. The break-even
    contour (0 %) is drawn as a bold labelled line when it lies in the swept range.

    Parameters
    ----------
    x : array_like
        First swept quantity, 1-D of length nx (at least 2).
    y : array_like
        Second swept quantity, 1-D of length ny (at least 2).
    change_percent : array_like
        Fuel-burn change of the design versus its reference in percent, shape (ny, nx).
    closed : array_like
        True where the sizing loop closed, shape (ny, nx).
    x_label, y_label : str
        Axis labels with units.
    path : str
        Destination PNG.
    title : str
        Figure title.

    Returns
    -------
    PlotFile
        The path; ``details`` holds 'failed_points' (int), 'break_even_drawn' (bool)
        and 'levels' (the filled contour levels, percent).
    """
    return _contour_map(
        x,
        y,
        change_percent,
        closed,
        x_label,
        y_label,
        path,
        title,
        'fuel-burn change versus the reference [%]',
        'RdBu_r',
        True,
    )


def plot_psc_map(x, y, psc, closed, x_label, y_label, path, title='Power saving coefficient'):
    """
    Draw a filled contour of the power saving coefficient over two swept quantities.

    Points whose sizing loop did not close are masked (grey) and marked.

    Parameters
    ----------
    x : array_like
        First swept quantity, 1-D of length nx (at least 2).
    y : array_like
        Second swept quantity, 1-D of length ny (at least 2).
    psc : array_like
        Power saving coefficient (dimensionless), shape (ny, nx).
    closed : array_like
        True where the sizing loop closed, shape (ny, nx).
    x_label, y_label : str
        Axis labels with units.
    path : str
        Destination PNG.
    title : str
        Figure title.

    Returns
    -------
    PlotFile
        The path; ``details`` holds 'failed_points' and 'levels'.
    """
    return _contour_map(
        x,
        y,
        psc,
        closed,
        x_label,
        y_label,
        path,
        title,
        'power saving coefficient [-]',
        'viridis',
        False,
    )


def _mass_parts(masses, name):
    """
    Return the mass parts of one design (missing keys count as 0) and check the total.

    Parameters
    ----------
    masses : dict
        Field name -> mass in kg.
    name : str
        The design's label (for messages).

    Returns
    -------
    list of float
        The parts in the order of ``_parts_of(masses)``.
    """
    parts = [_part_mass(masses, key) for key, _ in _parts_of(masses)]
    if 'mtow_kg' in masses:
        mtow = float(masses['mtow_kg'])
        if abs(mtow - sum(parts)) > MASS_BALANCE_RTOL * abs(mtow):
            raise ValueError(
                f'{name}: the mass parts add up to {sum(parts):.6g} kg but mtow_kg is {mtow:.6g} kg'
            )
    return parts


def plot_mass_breakdown(
    design, reference, path, design_label='optimum', reference_label='reference'
):
    """
    Draw stacked bars of the mass breakdown of a design and its reference.

    MTOW = airframe + turbofans + aft fan + electrical + payload + fuel (the mass
    build-up of the model), with the airframe split into wing, fuselage, tails, landing gear
    and systems when the design holds that build-up; each bar is labelled with its total. If
    a dict also holds 'mtow_kg', the parts must add up to it.

    Parameters
    ----------
    design : dict
        Masses in kg under 'airframe_mass_kg', 'engines_mass_kg', 'aft_fan_mass_kg',
        'electrical_mass_kg', 'payload_kg', 'total_fuel_kg' (missing keys count as 0).
    reference : dict
        The same for the reference.
    path : str
        Destination PNG.
    design_label, reference_label : str
        Bar labels.

    Returns
    -------
    PlotFile
        The path; ``details`` holds 'totals_kg' (design, reference).
    """
    bars = [
        (design_label, _mass_parts(design, design_label)),
        (reference_label, _mass_parts(reference, reference_label)),
    ]
    fig = _new_figure((7.0, 5.5))
    ax = fig.add_subplot()
    positions = np.arange(len(bars))
    bottom = np.zeros(len(bars))
    for i, (_, label) in enumerate(_parts_of(design)):
        heights = np.array([parts[i] for _, parts in bars]) / 1000.0
        ax.bar(positions, heights, 0.55, bottom=bottom, label=label)
        bottom = bottom + heights
    totals = [sum(parts) for _, parts in bars]
    for pos, total in zip(positions, totals):
        ax.text(pos, total / 1000.0, f'MTOW {total:,.0f} kg', ha='center', va='bottom')
    ax.set_xticks(positions, [label for label, _ in bars])
    ax.set_ylabel('mass [t]')
    ax.set_ylim(0.0, 1.12 * max(max(totals) / 1000.0, 1e-3))
    change = 100.0 * (totals[0] - totals[1]) / totals[1] if totals[1] else float('nan')
    ax.set_title(f'Mass breakdown (MTOW change {change:+.2f} %)')
    ax.legend(loc='upper left', bbox_to_anchor=(1.0, 1.0), fontsize=9)
    return _save(fig, path, {'totals_kg': totals})


def power_chain(outputs):
    """
    Return the power after each device of the electrical chain and check its balance.

    P_0 is the turbofan shaft power extraction; P_k = P_(k-1) - loss_k through generator,
    rectifier, cable, inverter and motor; P_5 must equal the aft-fan shaft power within
    ``POWER_BALANCE_RTOL`` (relative to the extraction): conservation of energy.

    Parameters
    ----------
    outputs : dict
        Analysis result fields (kW): 'turbofan_power_extraction_kW',
        'aft_fan_shaft_power_kW' and the five '<device>_loss_kW'.

    Returns
    -------
    list of float
        P_0 ... P_5 in kW.
    """
    needed = ['turbofan_power_extraction_kW', 'aft_fan_shaft_power_kW'] + [key for _, key in _CHAIN]
    missing = [key for key in needed if key not in outputs]
    if missing:
        raise ValueError(f'power flow needs the fields {missing}')
    extraction = float(outputs['turbofan_power_extraction_kW'])
    delivered = float(outputs['aft_fan_shaft_power_kW'])
    if not extraction > 0.0:
        raise ValueError(
            f'no electrical power flow to draw: the turbofan power extraction is {extraction:g} kW'
        )
    powers = [extraction]
    for device, key in _CHAIN:
        loss = float(outputs[key])
        if loss < 0.0:
            raise ValueError(f'{device} loss is negative ({loss:g} kW)')
        powers.append(powers[-1] - loss)
    if abs(powers[-1] - delivered) > POWER_BALANCE_RTOL * extraction:
        raise ValueError(
            f'power balance does not close: extraction {extraction:.6g} kW '
            f'minus losses {extraction - powers[-1]:.6g} kW is '
            f'{powers[-1]:.6g} kW, but the aft-fan shaft power is '
            f'{delivered:.6g} kW'
        )
    return powers


def plot_power_flow(outputs, path):
    """
    Draw the power flow of the electrical chain from the turbofans to the aft fan.

    Boxes for the turbofan shaft extraction, generator, rectifier, cable, inverter, motor
    and aft-fan shaft; arrows carry the power (kW, width proportional to it) and each
    device shows its loss. The balance is checked first (see :func:`power_chain`).

    Parameters
    ----------
    outputs : dict
        Analysis result fields: 'turbofan_power_extraction_kW', 'aft_fan_shaft_power_kW',
        'generator_loss_kW', 'rectifier_loss_kW', 'cable_loss_kW', 'inverter_loss_kW',
        'motor_loss_kW', and (shown in the title if present)
        'electrical_chain_efficiency', 'thermal_load_kW'.
    path : str
        Destination PNG.

    Returns
    -------
    PlotFile
        The path; ``details`` holds 'powers_kW' (P_0 ... P_5).

    Raises
    ------
    ValueError
        If a field is missing, the extraction is not positive, a loss is negative or the
        losses do not add up to extraction minus delivered power.
    """
    from matplotlib.patches import FancyBboxPatch

    powers = power_chain(outputs)
    names = ['turbofan shaft\nextraction'] + [device for device, _ in _CHAIN] + ['aft-fan\nshaft']
    losses = [None] + [float(outputs[key]) for _, key in _CHAIN] + [None]
    fig = _new_figure((14.0, 4.2))
    ax = fig.add_subplot()
    ax.set_xlim(-0.6, 2.0 * len(names) - 1.4)
    ax.set_ylim(-1.6, 1.2)
    ax.axis('off')
    half_w, half_h = 0.55, 0.45
    for i, (name, loss) in enumerate(zip(names, losses)):
        cx = 2.0 * i
        source_or_sink = loss is None
        ax.add_patch(
            FancyBboxPatch(
                (cx - half_w, -half_h),
                2 * half_w,
                2 * half_h,
                boxstyle='round,pad=0.05',
                facecolor='#cfe3f5' if source_or_sink else '#f3f3f3',
                edgecolor='k',
            )
        )
        ax.text(cx, 0.0, name, ha='center', va='center', fontsize=10)
        if not source_or_sink:
            ax.annotate(
                '',
                xy=(cx, -1.15),
                xytext=(cx, -half_h - 0.05),
                arrowprops={'arrowstyle': '-|>', 'color': 'tab:red', 'lw': 1.5},
            )
            ax.text(
                cx, -1.3, f'loss {loss:,.1f} kW', ha='center', va='top', color='tab:red', fontsize=9
            )
    for i, power in enumerate(powers):
        start, end = 2.0 * i + half_w + 0.08, 2.0 * (i + 1) - half_w - 0.08
        ax.annotate(
            '',
            xy=(end, 0.0),
            xytext=(start, 0.0),
            arrowprops={
                'arrowstyle': '-|>',
                'color': 'tab:blue',
                'lw': 1.0 + 5.0 * power / powers[0],
            },
        )
        ax.text(0.5 * (start + end), 0.25, f'{power:,.1f} kW', ha='center', va='bottom', fontsize=9)
    title = 'Electrical power flow (power carried between devices, loss of each device)'
    extra = []
    if 'electrical_chain_efficiency' in outputs:
        extra.append(f"chain efficiency {float(outputs['electrical_chain_efficiency']):.4f}")
    if 'thermal_load_kW' in outputs:
        extra.append(f"thermal load {float(outputs['thermal_load_kW']):,.1f} kW")
    if extra:
        title += '\n' + ', '.join(extra)
    ax.set_title(title)
    return _save(fig, path, {'powers_kW': powers})


def plot_history(history, path, objective_label='objective'):
    """
    Draw the convergence history of an optimisation.

    The objective against the evaluation number on the left axis and the worst
    constraint violation (log scale, floored at ``VIOLATION_FLOOR``) on the right axis;
    evaluations whose sizing loop did not close are marked along the bottom.

    Parameters
    ----------
    history : list of dict
        One entry per evaluation with 'evaluation', 'objective', 'max_violation' and
        'closed'.
    path : str
        Destination PNG.
    objective_label : str
        Label (with units) of the objective axis.

    Returns
    -------
    PlotFile
        The path; ``details`` holds 'evaluations' and 'failed' (counts).
    """
    if not history:
        raise ValueError('the optimisation history is empty')
    evals = np.array([float(e['evaluation']) for e in history])
    objective = np.array([float(e['objective']) for e in history])
    violation = np.array([float(e['max_violation']) for e in history])
    closed = np.array([bool(e['closed']) for e in history])
    fig = _new_figure((8.0, 5.0))
    ax = fig.add_subplot()
    ok = closed & np.isfinite(objective)
    ax.plot(
        evals[ok], objective[ok], 'o-', color='tab:blue', markersize=3, label='objective (closed)'
    )
    ax.set_xlabel('evaluation')
    ax.set_ylabel(objective_label, color='tab:blue')
    right = ax.twinx()
    shown = np.where(np.isfinite(violation), violation, np.nan)
    right.semilogy(
        evals,
        np.maximum(shown, VIOLATION_FLOOR),
        's--',
        color='tab:orange',
        markersize=3,
        linewidth=1.0,
        label='worst constraint violation',
    )
    right.set_ylabel(f'worst constraint violation (floor {VIOLATION_FLOOR:g})', color='tab:orange')
    handles = ax.get_legend_handles_labels()[0] + right.get_legend_handles_labels()[0]
    failed = int((~closed).sum())
    if failed:
        handles += ax.plot(
            evals[~closed],
            np.zeros(failed),
            'x',
            color='tab:red',
            transform=ax.get_xaxis_transform(),
            clip_on=False,
            label=f'did not close ({failed})',
        )
    ax.legend(handles=handles, loc='upper right', fontsize=9)
    ax.set_title(f'Optimisation history: {len(history)} evaluations, {failed} did not close')
    return _save(fig, path, {'evaluations': len(history), 'failed': failed})


def plot_histogram(values, path, x_label, title, vertical_line=0.0):
    """
    Draw a histogram of sampled values with a break-even line.

    The share of finite samples below ``vertical_line`` is given in the title; samples
    that are not finite (e.g. points that did not close) are counted there and left out.

    Parameters
    ----------
    values : array_like
        The samples (1-D).
    path : str
        Destination PNG.
    x_label : str
        Axis label with units.
    title : str
        Figure title.
    vertical_line : float
        Position of the break-even line.

    Returns
    -------
    PlotFile
        The path; ``details`` holds 'share_below' (fraction, 0..1), 'samples' (finite)
        and 'dropped' (not finite).
    """
    values = np.asarray(values, dtype=float).ravel()
    finite = values[np.isfinite(values)]
    if finite.size == 0:
        raise ValueError('no finite samples to draw')
    share = float(np.mean(finite < vertical_line))
    fig = _new_figure((7.0, 5.0))
    ax = fig.add_subplot()
    ax.hist(
        finite,
        bins=min(40, max(5, int(np.sqrt(finite.size)))),
        color='tab:blue',
        edgecolor='white',
        label=f'{finite.size} samples',
    )
    ax.axvline(vertical_line, color='k', linewidth=2.0, label=f'break-even ({vertical_line:g})')
    ax.set_xlabel(x_label)
    ax.set_ylabel('samples')
    dropped = int(values.size - finite.size)
    note = f'{100.0 * share:.1f} % of samples below {vertical_line:g}'
    if dropped:
        note += f'; {dropped} samples not finite, left out'
    ax.set_title(f'{title}\n({note})')
    ax.legend(fontsize=9)
    return _save(fig, path, {'share_below': share, 'samples': int(finite.size), 'dropped': dropped})


def plot_line(x, ys, x_label, y_label, path, title=None):
    """
    Draw one or more curves against a swept quantity.

    Parameters
    ----------
    x : array_like
        Swept values (1-D).
    ys : dict
        Curve label -> values of the same length as ``x`` (non-finite values leave gaps).
    x_label, y_label : str
        Axis labels with units.
    path : str
        Destination PNG.
    title : str or None
        Figure title (default: "<y_label> versus <x_label>").

    Returns
    -------
    PlotFile
        The path; ``details`` holds 'curves' (the labels).
    """
    x = np.asarray(x, dtype=float)
    if not ys:
        raise ValueError('no curves to draw')
    fig = _new_figure((7.0, 5.0))
    ax = fig.add_subplot()
    for label, values in ys.items():
        values = np.asarray(values, dtype=float)
        if values.shape != x.shape:
            raise ValueError(f'curve {label!r} has shape {values.shape}; expected {x.shape}')
        ax.plot(x, values, 'o-', markersize=3, label=str(label))
    ax.set_xlabel(x_label)
    ax.set_ylabel(y_label)
    ax.set_title(title or f'{y_label} versus {x_label}')
    ax.grid(True, alpha=0.3)
    ax.legend(fontsize=9)
    return _save(fig, path, {'curves': [str(label) for label in ys]})
