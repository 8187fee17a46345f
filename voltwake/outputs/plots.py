"""
PNG figures of results: fuel-burn and power-saving maps, masses, power flow, histories.

matplotlib is a dependency of voltwake; it is imported only when a figure is drawn, so the
rest of the package (and the HTML report) loads without it. Every figure is drawn on its own
``Figure`` with an explicit Agg canvas, so no pyplot state is created or changed (an
interactive user's open figures and backend are left alone). Every function writes one PNG
and returns its path as a :class:`PlotFile`, a ``str`` that also carries what was drawn (for
tests and callers).

Points that did not close and optimisations that closed but found no feasible optimum are
drawn as such (their own markers and counts), never dropped.
"""

import math
import textwrap

import numpy as np

from ..errors import ConfigError

#: Floor of the worst constraint violation on the log axis of :func:`plot_history`.
VIOLATION_FLOOR = 1e-12

#: Relative tolerance of the power balance checked by :func:`plot_power_flow`.
POWER_BALANCE_RTOL = 1e-6

#: Relative tolerance of the mass build-up checked by :func:`plot_mass_breakdown`.
MASS_BALANCE_RTOL = 1e-6

#: Maps with at most this many points carry the value at each point.
ANNOTATE_POINTS = 64

#: Status of a study point: an optimum (or a closed analysis), an optimisation that closed
#: but found no feasible optimum, and a point whose sizing loop did not close.
OK, INFEASIBLE, NOT_CLOSED = 'ok', 'infeasible', 'not closed'
#: A target-sweep point whose optimisation failed (the optimiser's failure, not the design's).
FAILED = 'optimiser failed'

#: How failed points are drawn: status -> (marker, colour, legend text).
_FAILED_STYLE = {
    NOT_CLOSED: ('x', '0.15', 'did not close'),
    INFEASIBLE: ('o', 'tab:purple', 'no feasible design'),
    FAILED: ('s', 'tab:red', 'optimiser failed'),
}

_MASS_PARTS = [
    ('airframe_mass_kg', 'airframe'),
    ('engines_mass_kg', 'turbofans (with nacelles)'),
    ('aft_fan_mass_kg', 'aft fan'),
    ('electrical_mass_kg', 'electrical chain (with thermal)'),
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

#: The aft fan and the devices of the electrical chain (second panel of the mass figure).
_CHAIN_PARTS = [
    ('aft_fan_mass_kg', 'aft fan'),
    ('generator_mass_kg', 'generators'),
    ('rectifier_mass_kg', 'rectifiers'),
    ('cable_mass_kg', 'cable'),
    ('inverter_mass_kg', 'inverter'),
    ('motor_mass_kg', 'motor'),
    ('thermal_mass_kg', 'thermal management'),
]

#: Bar colours of the designs of a mass breakdown, in the order given (baseline first).
_DESIGN_COLOURS = ['0.6', 'tab:blue', 'tab:orange', 'tab:green']


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
        raise ConfigError(
            'plots need matplotlib, a dependency of voltwake: pip install matplotlib '
            '(or reinstall voltwake with pip install .)'
        ) from None
    fig = Figure(figsize=figsize, layout='constrained')
    FigureCanvasAgg(fig)
    return fig


def _save(fig, path, details):
    """
    Write the figure as a PNG and return its path.

    The file is opened by matplotlib with an ordinary ``open()``, so it gets the user's
    umask like any other file the user writes.

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


def round_levels(low, high, count=12):
    """
    Return round contour levels covering ``[low, high]``.

    The step is 1, 2, 2.5 or 5 times a power of ten, chosen for about ``count`` bands; the
    levels are whole multiples of the step, so zero is a level whenever the range spans it.

    Parameters
    ----------
    low, high : float
        Range of the values (``low <= high``).
    count : int
        About how many bands.

    Returns
    -------
    numpy.ndarray
        Increasing levels, the first at or below ``low`` and the last at or above ``high``.
    """
    low, high = float(low), float(high)
    if not high > low:
        pad = 0.5 if low == 0.0 else 0.05 * abs(low)
        low, high = low - pad, high + pad
    raw = (high - low) / max(int(count), 1)
    power = 10.0 ** math.floor(math.log10(raw))
    step = next(m * power for m in (1.0, 2.0, 2.5, 5.0, 10.0) if m * power >= raw * (1 - 1e-9))
    first = math.floor(low / step + 1e-9)
    last = math.ceil(high / step - 1e-9)
    levels = np.arange(first, last + 1) * step
    # Round away the binary noise of the multiplication (0.30000000000000004 -> 0.3).
    digits = max(0, 1 - math.floor(math.log10(step)) + 1)
    return np.round(levels, digits)


def _grid(x, y, z, closed):
    """
    Check the shapes of a map and return its arrays.

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
        x, y, z as float arrays and ``closed`` as a boolean array.
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
    return x, y, z, closed


def _status_grid(z, closed, feasible):
    """
    Return the status of every map point (OK, INFEASIBLE or NOT_CLOSED).

    Parameters
    ----------
    z : numpy.ndarray
        Values (NaN where there is none).
    closed : numpy.ndarray of bool
        Where the sizing loop closed.
    feasible : array_like of bool or None
        Where an optimisation found a feasible optimum; None when the points are analyses
        (a closed point without a finite value then counts as not closed).

    Returns
    -------
    numpy.ndarray of str
        The status, same shape as ``z``.
    """
    status = np.full(z.shape, OK, dtype=object)
    if feasible is None:
        status[~(closed & np.isfinite(z))] = NOT_CLOSED
        return status
    feasible = np.asarray(feasible, dtype=bool)
    if feasible.shape != closed.shape:
        raise ValueError(f'feasible flags have shape {feasible.shape}; expected {closed.shape}')
    status[closed & ~(feasible & np.isfinite(z))] = INFEASIBLE
    status[~closed] = NOT_CLOSED
    return status


def point_status(row):
    """
    Return the status of one study row: OK, INFEASIBLE or NOT_CLOSED.

    A map or Monte Carlo row has ``closed``. A target-sweep row has ``success``; a failed
    optimisation that evaluated the model (``evaluations`` > 0) closed but found no feasible
    optimum, one that stopped before any evaluation (its design did not close, the error is
    its message) did not close.

    Parameters
    ----------
    row : dict
        The row (booleans may be the strings 'True'/'False' of a CSV file).

    Returns
    -------
    str
        The status.
    """

    def flag(value):
        return value is True or str(value).strip().lower() == 'true'

    if 'closed' in row:
        return OK if flag(row['closed']) else NOT_CLOSED
    status = str(row.get('status') or '').strip()
    if status in ('optimum', 'infeasible', 'failed'):  # a target-sweep row with its status
        return {'optimum': OK, 'infeasible': INFEASIBLE, 'failed': FAILED}[status]
    if flag(row.get('success')):
        return OK
    try:
        evaluations = float(row.get('evaluations') or 0)
    except (TypeError, ValueError):
        evaluations = 0.0
    return INFEASIBLE if evaluations > 0 else NOT_CLOSED


def _cell_edges(values):
    """Return the cell edges around grid values: midpoints, half a step beyond the ends."""
    mids = 0.5 * (values[1:] + values[:-1])
    return np.concatenate(
        [[values[0] - (mids[0] - values[0])], mids, [values[-1] + (values[-1] - mids[-1])]]
    )


def _failed_note(status, optimised=False):
    """Return '<n> did not close, <m> closed without a feasible optimum' (or all closed)."""
    total = status.size
    not_closed = int(np.sum(status == NOT_CLOSED))
    infeasible = int(np.sum(status == INFEASIBLE))
    parts = []
    if not_closed:
        parts.append(f'{not_closed} of {total} points did not close')
    if infeasible:
        parts.append(f'{infeasible} with no feasible design')
    failed = int(np.sum(status == FAILED))
    if failed:
        parts.append(f'{failed} optimisations failed')
    if parts:
        return '; '.join(parts)
    return (
        f'all {total} points have a feasible optimum' if optimised else f'all {total} points closed'
    )


def _hatch_cells(ax, x, y, where):
    """Hatch the grid cells of ``where`` (points with no feasible design)."""
    if not where.any():
        return
    from matplotlib.patches import Rectangle

    xe, ye = _cell_edges(x), _cell_edges(y)
    for j, i in zip(*np.nonzero(where)):
        ax.add_patch(
            Rectangle(
                (xe[i], ye[j]),
                xe[i + 1] - xe[i],
                ye[j + 1] - ye[j],
                fill=False,
                hatch='///',
                edgecolor='tab:purple',
                linewidth=0.0,
            )
        )


def _contour_map(
    x,
    y,
    z,
    closed,
    x_label,
    y_label,
    path,
    title,
    bar_label,
    cmap,
    break_even,
    feasible=None,
    marker=None,
    status=None,
):
    """
    Draw a filled contour map with round levels and failed points marked.

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
        Figure title (the count of failed points is added below it).
    bar_label : str
        Colour bar label (with units).
    cmap : str
        Colour map name.
    break_even : bool
        A fuel-burn change: colours centred on zero (a diverging map whose white is 0) and
        the zero contour drawn as a bold line labelled 'break-even' where it exists.
    feasible : array_like or None
        Where an optimisation found a feasible optimum (target sweeps); None for analyses.
    marker : tuple or None
        (x, y, label) of a point to mark, e.g. the configured design.
    status : array_like or None
        The status of every point (OK, INFEASIBLE, FAILED, NOT_CLOSED), shape (ny, nx);
        None: from ``closed`` and ``feasible``. Cells with no feasible design are hatched.

    Returns
    -------
    PlotFile
        The path; details 'failed_points', 'not_closed', 'infeasible', 'break_even_drawn',
        'levels', 'norm_limits' (colour limits, symmetric about 0 for a fuel-burn map).
    """
    x, y, z, closed = _grid(x, y, z, closed)
    if status is None:
        status = _status_grid(z, closed, feasible)
    else:
        status = np.asarray(status, dtype=object).reshape(z.shape)
    good = status == OK
    fig = _new_figure((7.5, 6.0))
    from matplotlib.colors import Normalize

    ax = fig.add_subplot()
    ax.set_facecolor('0.88')
    details = {
        'failed_points': int(good.size - good.sum()),
        'not_closed': int(np.sum(status == NOT_CLOSED)),
        'infeasible': int(np.sum(status == INFEASIBLE)),
        'break_even_drawn': False,
        'levels': [],
        'norm_limits': None,
    }
    extra = ''
    if not good.any():
        ax.text(
            0.5,
            0.5,
            'no point has a result',
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
        levels = round_levels(low, high)
        if break_even:
            reach = max(abs(levels[0]), abs(levels[-1]))
            norm = Normalize(vmin=-reach, vmax=reach)
        else:
            norm = Normalize(vmin=levels[0], vmax=levels[-1])
        details['norm_limits'] = [float(norm.vmin), float(norm.vmax)]
        small = good.size <= ANNOTATE_POINTS
        if small:
            # A small grid: one cell per point, coloured by its value and labelled with it,
            # so the reader need not interpolate between a handful of points.
            filled = ax.pcolormesh(
                _cell_edges(x), _cell_edges(y), masked, cmap=cmap, norm=norm, shading='flat'
            )
            grid_x, grid_y = np.meshgrid(x, y)
            for gx, gy, value in zip(grid_x[good], grid_y[good], z[good]):
                red, green, blue, _ = filled.cmap(norm(value))
                dark = 0.299 * red + 0.587 * green + 0.114 * blue < 0.5
                ax.text(
                    gx,
                    gy,
                    f'{value:.3g}',
                    ha='center',
                    va='center',
                    fontsize=9 if good.size <= 36 else 7,
                    color='white' if dark else 'black',
                )
        else:
            filled = ax.contourf(x, y, masked, levels=levels, cmap=cmap, norm=norm)
            lines = ax.contour(x, y, masked, levels=levels, colors='k', linewidths=0.4, alpha=0.5)
            ax.clabel(lines, levels=lines.levels[::2], fmt='%g', fontsize=8, inline=True)
        ticks = round_levels(norm.vmin, norm.vmax, 8) if small else levels
        bar = fig.colorbar(filled, ax=ax, label=bar_label, ticks=ticks[:: max(1, len(ticks) // 9)])
        bar.ax.tick_params(labelsize=9)
        details['levels'] = [float(v) for v in levels]
        if break_even:
            if low < 0.0 < high:
                line = ax.contour(x, y, masked, levels=[0.0], colors='k', linewidths=2.5)
                if any(len(seg) > 1 for seg in line.allsegs[0]):
                    ax.clabel(line, fmt={0.0: 'break-even (0 %)'}, fontsize=10, inline=True)
                    ax.plot([], [], 'k-', linewidth=2.5, label='break-even: 0 % change')
                    details['break_even_drawn'] = True
            if not details['break_even_drawn']:
                side = 'a penalty' if low > 0.0 else 'a saving'
                extra = (
                    f'no break-even in the map: {low:+.3g} % to {high:+.3g} %, {side} everywhere'
                )
    grid_x, grid_y = np.meshgrid(x, y)
    _hatch_cells(ax, x, y, status == INFEASIBLE)
    for kind, (symbol, colour, text) in _FAILED_STYLE.items():
        where = status == kind
        if where.any():
            ax.plot(
                grid_x[where],
                grid_y[where],
                symbol,
                color=colour,
                markerfacecolor='none',
                markersize=7,
                markeredgewidth=1.5,
                linestyle='none',
                label=f'{text} ({int(where.sum())})',
            )
    if marker is not None:
        mx, my, mlabel = marker
        if x.min() <= mx <= x.max() and y.min() <= my <= y.max():
            ax.plot(
                [mx],
                [my],
                '*',
                color='gold',
                markeredgecolor='k',
                markersize=14,
                linestyle='none',
                label=mlabel,
            )
    if good.size <= ANNOTATE_POINTS:
        # Cells: the ticks sit on the swept values, not on the cell edges.
        for axis, values in ((ax.xaxis, x), (ax.yaxis, y)):
            if values.size <= 12:
                axis.set_ticks(values, [_tick(v) for v in values])
    ax.set_xlabel(x_label)
    ax.set_ylabel(y_label)
    if ax.get_legend_handles_labels()[0]:
        fig.legend(loc='outside lower center', ncols=3, fontsize=9, frameon=False)
    note = _failed_note(status, optimised=feasible is not None)
    if extra:
        note += '; ' + extra if len(note) + len(extra) < 80 else '\n' + extra
    ax.set_title(f'{title}\n{note}', fontsize=10.5)
    return _save(fig, path, details)


def _tick(value):
    """Format a tick value as a reader writes it: ``35,000`` rather than ``3.5e+04``."""
    value = float(f'{value:.10g}')  # a unit conversion leaves 29999.999999 for 30,000
    if abs(value) >= 1e4 and value.is_integer():
        return f'{value:,.0f}'
    return f'{value:.4g}'


def plot_fuel_map(
    x,
    y,
    change_percent,
    closed,
    x_label,
    y_label,
    path,
    title='Fuel-burn change versus the reference',
    feasible=None,
    marker=None,
    bar_label='fuel-burn change versus the reference [%]',
    status=None,
):
    """
    Draw a filled contour of the fuel-burn change over two swept quantities.

    The colours are centred on zero (blue a saving, red a penalty, white break-even) and
    the contour levels are round numbers. The break-even contour (0 %) is drawn as a bold
    labelled line when it lies in the map; when it does not, the title says so. Points
    whose sizing loop did not close (or whose value is not finite) and, in a target sweep,
    optimisations that closed but found no feasible optimum are masked (grey background)
    and marked with their own symbols; their numbers are given in the title.

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
    feasible : array_like or None
        True where an optimisation found a feasible optimum, shape (ny, nx); None when the
        points are analyses.
    marker : tuple or None
        (x, y, label) of a point to mark, e.g. the configured design.
    bar_label : str
        Colour bar label.
    status : array_like or None
        Status of every point, shape (ny, nx) (see :func:`point_status`); cells with no
        feasible design are hatched. None: from ``closed`` and ``feasible``.

    Returns
    -------
    PlotFile
        The path; ``details`` holds 'failed_points', 'not_closed', 'infeasible' (int),
        'break_even_drawn' (bool), 'levels' (the filled contour levels, percent) and
        'norm_limits' (colour limits, symmetric about 0).
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
        bar_label,
        'RdBu_r',
        True,
        feasible=feasible,
        marker=marker,
        status=status,
    )


def plot_psc_map(
    x,
    y,
    psc,
    closed,
    x_label,
    y_label,
    path,
    title='Power saving coefficient of the aft fan',
    feasible=None,
    marker=None,
    status=None,
):
    """
    Draw a filled contour of the power saving coefficient over two swept quantities.

    Round contour levels; points that did not close or found no feasible optimum are
    masked (grey) and marked.

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
    feasible : array_like or None
        True where an optimisation found a feasible optimum; None for analyses.
    marker : tuple or None
        (x, y, label) of a point to mark.
    status : array_like or None
        Status of every point, shape (ny, nx); None: from ``closed`` and ``feasible``.

    Returns
    -------
    PlotFile
        The path; ``details`` holds 'failed_points', 'not_closed', 'infeasible' and 'levels'.
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
        'power saving coefficient (same-FPR clean fan) [-]',
        'viridis',
        False,
        feasible=feasible,
        marker=marker,
        status=status,
    )


def _mass_parts(masses, name, parts=None):
    """
    Return the mass parts of one design (missing keys count as 0) and check the total.

    Parameters
    ----------
    masses : dict
        Field name -> mass in kg.
    name : str
        The design's label (for messages).
    parts : list or None
        The (key, label) parts; None for ``_parts_of(masses)``.

    Returns
    -------
    list of float
        The parts in order.
    """
    parts = _parts_of(masses) if parts is None else parts
    values = [_part_mass(masses, key) for key, _ in parts]
    if 'mtow_kg' in masses:
        mtow = float(masses['mtow_kg'])
        if abs(mtow - sum(values)) > MASS_BALANCE_RTOL * abs(mtow):
            raise ValueError(
                f'{name}: the mass parts add up to {sum(values):.6g} kg but mtow_kg is '
                f'{mtow:.6g} kg'
            )
    return values


def _has_aft_fan(masses):
    """Return True when a design carries an aft fan (a positive aft-fan mass)."""
    return float(masses.get('aft_fan_mass_kg', 0.0)) > 0.0


def _grouped_bars(ax, categories, designs, values, unit_text):
    """
    Draw horizontal bars grouped by category, one bar per design, labelled with values.

    Parameters
    ----------
    ax : matplotlib.axes.Axes
        The axes.
    categories : list of str
        Category names, drawn top to bottom.
    designs : list of str
        Design names (legend), drawn top to bottom within a category.
    values : list of list of float or None
        values[d][c]; None leaves the bar out (the design has no such part).
    unit_text : str
        Appended to each value label.
    """
    count = len(designs)
    height = 0.8 / count
    peak = max((v for row in values for v in row if v is not None), default=1.0)
    for d, name in enumerate(designs):
        ys, widths = [], []
        for c in range(len(categories)):
            if values[d][c] is None:
                continue
            ys.append(c + (d - (count - 1) / 2.0) * height)
            widths.append(values[d][c])
        bars = ax.barh(
            ys,
            widths,
            height * 0.92,
            color=_DESIGN_COLOURS[d % len(_DESIGN_COLOURS)],
            label=name,
        )
        for bar, width in zip(bars, widths):
            ax.text(
                bar.get_width() + 0.01 * peak,
                bar.get_y() + bar.get_height() / 2.0,
                f'{width:,.0f}{unit_text}',
                va='center',
                ha='left',
                fontsize=7.5,
            )
    ax.set_yticks(range(len(categories)), categories)
    ax.invert_yaxis()
    ax.set_xlim(0.0, 1.22 * peak)
    ax.grid(True, axis='x', alpha=0.3)


def plot_mass_breakdown(designs, path, title='Mass breakdown by system'):
    """
    Draw the mass breakdown of designs side by side, grouped by system, with values.

    The left panel has one group of horizontal bars per system (the airframe split into
    wing, fuselage, tails, landing gear and systems when every design holds that build-up;
    turbofans; aft fan; electrical chain; payload; fuel), one bar per design in the order
    given (the baseline first: start before optimum, reference before design), each
    labelled with its mass in kg, so small items stay readable. When a design has an aft
    fan, the right panel splits the aft fan and the electrical chain by device. MTOW of
    every design is in the legend. If a dict holds 'mtow_kg', its parts must add up to it
    (MTOW = airframe + turbofans + aft fan + electrical + payload + fuel, the mass build-up
    of the model).

    Parameters
    ----------
    designs : dict
        Label -> masses in kg under 'airframe_mass_kg' (or the build-up's part keys),
        'engines_mass_kg', 'aft_fan_mass_kg', 'electrical_mass_kg', 'payload_kg',
        'total_fuel_kg' and optionally 'mtow_kg' and the device masses (missing keys count
        as 0), in drawing order.
    path : str
        Destination PNG.
    title : str
        Figure title.

    Returns
    -------
    PlotFile
        The path; ``details`` holds 'totals_kg' (one per design, in order), 'labels' and
        'chain_panel' (whether the aft fan and chain were split by device).
    """
    if not designs:
        raise ValueError('no designs to draw')
    labels = list(designs)
    built_up = all('wing_mass_kg' in m for m in designs.values())
    parts = _AIRFRAME_PARTS + _MASS_PARTS[1:] if built_up else _MASS_PARTS
    values = [_mass_parts(designs[name], name, parts) for name in labels]
    totals = [sum(v) for v in values]
    with_fan = [name for name in labels if _has_aft_fan(designs[name])]
    chain_parts = [
        (key, text) for key, text in _CHAIN_PARTS if any(key in designs[name] for name in with_fan)
    ]
    chain_panel = bool(with_fan) and len(chain_parts) > 2
    fig = _new_figure((11.0, 5.8) if chain_panel else (8.0, 5.8))
    if chain_panel:
        left, right = fig.subplots(1, 2, width_ratios=[1.35, 1.0])
    else:
        left, right = fig.add_subplot(), None
    legend = [f'{name} (MTOW {total:,.0f} kg)' for name, total in zip(labels, totals)]
    shown = [
        [
            None if (key in ('aft_fan_mass_kg', 'electrical_mass_kg') and v == 0.0) else v
            for (key, _), v in zip(parts, row)
        ]
        for row in values
    ]
    _grouped_bars(left, [text for _, text in parts], legend, shown, '')
    left.set_xlabel('mass [kg]')
    left.set_title('whole aircraft (bars absent: the design has no such part)', fontsize=9)
    if chain_panel:
        names = [name for name in labels if name in with_fan]
        chain_values = [
            [float(designs[name].get(key, math.nan)) for key, _ in chain_parts] for name in names
        ]
        chain_values = [[None if math.isnan(v) else v for v in row] for row in chain_values]
        colours_offset = [labels.index(name) for name in names]
        _grouped_bars(right, [text for _, text in chain_parts], names, chain_values, '')
        for bars, offset in zip(right.containers, colours_offset):
            for patch in bars:
                patch.set_facecolor(_DESIGN_COLOURS[offset % len(_DESIGN_COLOURS)])
        right.set_xlabel('mass [kg]')
        right.set_title('aft fan and electrical chain by device', fontsize=9)
    fig.legend(
        *left.get_legend_handles_labels(),
        loc='outside lower center',
        ncols=min(3, len(labels)),
        fontsize=9,
        frameon=False,
    )
    change = ''
    if len(totals) > 1 and totals[0]:
        change = f' (MTOW {labels[1]} vs {labels[0]}: {100.0 * (totals[1] / totals[0] - 1):+.2f} %)'
    fig.suptitle('\n'.join(textwrap.wrap(title + change, 95 if chain_panel else 70)), fontsize=11)
    return _save(fig, path, {'totals_kg': totals, 'labels': labels, 'chain_panel': chain_panel})


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
    Draw the power flow of the electrical chain at cruise, from the turbofans to the aft fan.

    Boxes for the turbofan shaft extraction, generator, rectifier, cable, inverter, motor
    and aft-fan shaft; arrows carry the power (kW, width proportional to it) and each
    device shows its loss in kW and in percent of the power it receives. The balance is
    checked first (see :func:`power_chain`).

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
    powers = power_chain(outputs)
    names = ['turbofan shaft\nextraction'] + [device for device, _ in _CHAIN] + ['aft-fan\nshaft']
    losses = [None] + [float(outputs[key]) for _, key in _CHAIN] + [None]
    fig = _new_figure((14.0, 4.2))
    from matplotlib.patches import FancyBboxPatch

    ax = fig.add_subplot()
    ax.set_xlim(-0.6, 2.0 * len(names) - 1.4)
    ax.set_ylim(-1.7, 1.0)
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
        ax.text(cx, 0.0, name, ha='center', va='center', fontsize=11)
        if not source_or_sink:
            ax.annotate(
                '',
                xy=(cx, -1.1),
                xytext=(cx, -half_h - 0.05),
                arrowprops={'arrowstyle': '-|>', 'color': 'tab:red', 'lw': 1.5},
            )
            share = 100.0 * loss / powers[i - 1]
            ax.text(
                cx,
                -1.2,
                f'loss {loss:,.1f} kW\n({share:.1f} % of its input)',
                ha='center',
                va='top',
                color='tab:red',
                fontsize=9,
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
        ax.text(
            0.5 * (start + end), 0.22, f'{power:,.1f} kW', ha='center', va='bottom', fontsize=9.5
        )
    title = 'Electrical power flow at cruise: power carried between devices and the loss of each'
    extra = []
    if 'electrical_chain_efficiency' in outputs:
        eff = float(outputs['electrical_chain_efficiency'])
        extra.append(f'chain efficiency {100.0 * eff:.2f} %')
    if 'thermal_load_kW' in outputs:
        extra.append(f"heat to reject {float(outputs['thermal_load_kW']):,.1f} kW")
    if extra:
        title += '\n' + ', '.join(extra)
    ax.set_title(title, fontsize=12)
    return _save(fig, path, {'powers_kW': powers})


def plot_history(history, path, objective_label='objective [-]', feasibility_tolerance=None):
    """
    Draw the convergence history of an optimisation.

    The objective (with its units) against the evaluation number on the left axis and the
    worst constraint violation, relative to its bound (log scale, floored at
    ``VIOLATION_FLOOR``), on the right axis, with the feasibility tolerance as a dotted line
    when given; evaluations whose sizing loop did not close are marked along the bottom and
    counted in the title, never dropped.

    Parameters
    ----------
    history : list of dict
        One entry per evaluation with 'evaluation', 'objective', 'max_violation' and
        'closed'.
    path : str
        Destination PNG.
    objective_label : str
        Label of the objective axis, with units in brackets.
    feasibility_tolerance : float or None
        Largest relative violation accepted as feasible (drawn when given).

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
    ax.set_xlabel('model evaluation [number]')
    ax.set_ylabel(objective_label, color='tab:blue')
    ax.grid(True, alpha=0.3)
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
    if feasibility_tolerance is not None:
        right.axhline(
            feasibility_tolerance,
            color='tab:orange',
            linestyle=':',
            linewidth=1.0,
            label=f'feasible below {feasibility_tolerance:g}',
        )
    right.set_ylabel(
        f'worst constraint violation, relative to its bound [-] (0 drawn at {VIOLATION_FLOOR:g})',
        color='tab:orange',
        fontsize=9,
    )
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


def _whole_number_ticks():
    """Return a tick locator for counts: whole numbers only."""
    from matplotlib.ticker import MaxNLocator

    return MaxNLocator(integer=True)


def plot_histogram(
    values,
    path,
    x_label,
    title,
    vertical_line=0.0,
    closed=None,
    win_label='below the line',
    dropped_label='did not close',
):
    """
    Draw a histogram of sampled values with the break-even line and the winning side shaded.

    The share of the samples with a result below ``vertical_line`` is given in the title.
    Samples without a result (their sizing loop did not close, or the value is not finite)
    are counted in the title and the legend, never dropped silently.

    Parameters
    ----------
    values : array_like
        The samples (1-D); NaN where a sample has no result.
    path : str
        Destination PNG.
    x_label : str
        Axis label with units.
    title : str
        Figure title.
    vertical_line : float
        Position of the break-even line.
    closed : array_like or None
        True where the sizing loop closed (None: every finite value).
    win_label : str
        Legend text of the shaded side below the line.
    dropped_label : str
        What the samples without a result did (legend and title), e.g. 'did not close'.

    Returns
    -------
    PlotFile
        The path; ``details`` holds 'share_below' (fraction of the samples with a result,
        0..1), 'samples' (with a result) and 'dropped' (without).
    """
    values = np.asarray(values, dtype=float).ravel()
    usable = np.isfinite(values)
    if closed is not None:
        closed = np.asarray(closed, dtype=bool).ravel()
        if closed.shape != values.shape:
            raise ValueError(f'closed flags have shape {closed.shape}; expected {values.shape}')
        usable &= closed
    finite = values[usable]
    if finite.size == 0:
        raise ValueError('no finite samples to draw')
    share = float(np.mean(finite < vertical_line))
    fig = _new_figure((7.5, 5.0))
    ax = fig.add_subplot()
    ax.hist(
        finite,
        bins=min(40, max(5, int(np.sqrt(finite.size)))),
        color='tab:blue',
        edgecolor='white',
        label=f'{finite.size} samples with a result',
    )
    low, high = min(finite.min(), vertical_line), max(finite.max(), vertical_line)
    pad = 0.08 * (high - low if high > low else 1.0)
    ax.set_xlim(low - pad, high + pad)
    ax.axvspan(low - pad, vertical_line, color='tab:green', alpha=0.08, label=win_label)
    ax.axvline(vertical_line, color='k', linewidth=2.0, label=f'break-even ({vertical_line:g} %)')
    ax.set_xlabel(x_label)
    ax.set_ylabel('samples [number]')
    ax.yaxis.set_major_locator(_whole_number_ticks())
    ax.grid(True, axis='y', alpha=0.3)
    dropped = int(values.size - finite.size)
    if dropped:
        ax.plot([], [], ' ', label=f'{dropped} samples {dropped_label} (not shown)')
    note = (
        f'{100.0 * share:.1f} % of the {finite.size} samples with a result lie below '
        f'{vertical_line:g}'
    )
    if dropped:
        note += f'; {dropped} of {values.size} {dropped_label}'
    ax.set_title(f'{title}\n{note}', fontsize=11)
    ax.legend(fontsize=9)
    return _save(fig, path, {'share_below': share, 'samples': int(finite.size), 'dropped': dropped})


def plot_line(
    x,
    ys,
    x_label,
    y_label,
    path,
    title=None,
    status=None,
    zero_line=None,
    vertical=None,
):
    """
    Draw one or more curves against a swept quantity, with failed points marked.

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
    status : sequence of str or None
        Status of each point (``OK``, ``INFEASIBLE`` or ``NOT_CLOSED``); failed points are
        drawn along the bottom of the axes with their own symbols and counted in the legend.
        None: a non-finite value is a point that did not close.
    zero_line : str or None
        Label of a horizontal line at 0 (e.g. 'break-even'); None for no line.
    vertical : tuple or None
        (x, label) of a vertical line (e.g. the break-even value).

    Returns
    -------
    PlotFile
        The path; ``details`` holds 'curves' (the labels), 'not_closed' and 'infeasible'
        (counts).
    """
    x = np.asarray(x, dtype=float)
    if not ys:
        raise ValueError('no curves to draw')
    curves = {}
    for label, values in ys.items():
        values = np.asarray(values, dtype=float)
        if values.shape != x.shape:
            raise ValueError(f'curve {label!r} has shape {values.shape}; expected {x.shape}')
        curves[str(label)] = values
    if status is None:
        bad = ~np.all([np.isfinite(v) for v in curves.values()], axis=0)
        status = np.where(bad, NOT_CLOSED, OK)
    status = np.asarray(list(status), dtype=object)
    if status.shape != x.shape:
        raise ValueError(f'status has shape {status.shape}; expected {x.shape}')
    fig = _new_figure((7.5, 5.0))
    ax = fig.add_subplot()
    for label, values in curves.items():
        good = status == OK
        ax.plot(x[good], values[good], 'o-', markersize=4, label=label)
    if zero_line:
        ax.axhline(0.0, color='k', linewidth=1.5, label=zero_line)
    if vertical is not None:
        ax.axvline(vertical[0], color='tab:green', linewidth=1.5, linestyle='--', label=vertical[1])
    counts = {}
    for kind, (symbol, colour, text) in _FAILED_STYLE.items():
        where = status == kind
        counts[kind] = int(where.sum())
        if where.any():
            ax.plot(
                x[where],
                np.zeros(counts[kind]),
                symbol,
                color=colour,
                markerfacecolor='none',
                markersize=8,
                markeredgewidth=1.5,
                transform=ax.get_xaxis_transform(),
                clip_on=False,
                linestyle='none',
                label=f'{text} ({counts[kind]})',
            )
    ax.set_xlabel(x_label)
    ax.set_ylabel(y_label)
    ax.set_title(title or f'{y_label} versus {x_label}', fontsize=11)
    ax.grid(True, alpha=0.3)
    ax.legend(fontsize=9)
    return _save(
        fig,
        path,
        {
            'curves': list(curves),
            'not_closed': counts[NOT_CLOSED],
            'infeasible': counts[INFEASIBLE],
        },
    )


def plot_value_distributions(columns, path, title):
    """
    Draw one histogram per quantity, each over its allowed range, with the bounds marked.

    Used for the design variables at the optima of a sampled study: a pile-up at a bound
    shows the bound, not the physics, holding the optimum.

    Parameters
    ----------
    columns : dict
        Label (with units) -> (values, lower, upper), in the units shown; NaN values are
        left out (and counted in the panel's title).
    path : str
        Destination PNG.
    title : str
        Figure title.

    Returns
    -------
    PlotFile
        The path; ``details`` holds per label 'samples' and 'at_bound' (values within
        1e-4 of the range from a bound).
    """
    count = len(columns)
    if count == 0:
        raise ValueError('no quantities to draw')
    ncols = min(3, count)
    nrows = math.ceil(count / ncols)
    fig = _new_figure((3.4 * ncols + 0.6, 2.6 * nrows + 0.8))
    details = {}
    for k, (label, (values, lower, upper)) in enumerate(columns.items()):
        ax = fig.add_subplot(nrows, ncols, k + 1)
        values = np.asarray(values, dtype=float).ravel()
        finite = values[np.isfinite(values)]
        span = abs(upper - lower) or 1.0
        at_bound = int(
            np.sum(np.minimum(np.abs(finite - lower), np.abs(finite - upper)) <= 1e-4 * span)
        )
        if finite.size:
            ax.hist(
                finite,
                bins=min(30, max(5, int(np.sqrt(finite.size)))),
                range=(lower, upper),
                color='tab:blue',
                edgecolor='white',
            )
        for bound in (lower, upper):
            ax.axvline(bound, color='tab:red', linestyle='--', linewidth=1.2)
        ax.set_xlim(lower - 0.03 * span, upper + 0.03 * span)
        ax.set_xlabel('\n'.join(textwrap.wrap(label, 34)), fontsize=9)
        ax.set_ylabel('samples', fontsize=9)
        ax.yaxis.set_major_locator(_whole_number_ticks())
        ax.tick_params(labelsize=8)
        missing = int(values.size - finite.size)
        note = f'{at_bound} of {finite.size} at a bound'
        if missing:
            note += f'; {missing} without a value'
        ax.set_title(note, fontsize=9)
        details[label] = {'samples': int(finite.size), 'at_bound': at_bound}
    fig.suptitle(f'{title}\n(dashed red: the bounds of the optimisation)', fontsize=11)
    return _save(fig, path, details)
