"""
The results of the trade studies as Python objects, and the files they write.

:func:`voltwake.design_map`, :func:`voltwake.target_sweep`, :func:`voltwake.breakeven` and
:func:`voltwake.monte_carlo` each return one of the dataclasses below. Every one holds the
study's points as numpy arrays (one per CSV column, SI) with their units, the summary that
``voltwake sweep --out`` writes as ``<study>_summary.json``, and writes the same files as
that command (:meth:`StudyResult.to_csv`, :meth:`StudyResult.write`): the command line
goes through the same :meth:`StudyResult.write_files`.
"""

import math
import numbers
import os
from dataclasses import dataclass, field

import numpy as np

from ..configuration.loader import Config
from ..outputs.files import prepare_out_dir, write_atomic, write_results
from ..outputs.report import write_report
from ..outputs.summary import sweep_text
from .figures import study_figures
from .maps import points_csv, points_units


def clean(value):
    """
    Make a result JSON-ready and deterministic (NaN -> None, numpy -> Python).

    Parameters
    ----------
    value : object
        A result: dicts, lists, tuples, numpy arrays and scalars, numbers, text.

    Returns
    -------
    object
        The same result built from dicts, lists, floats, ints, bools, strings and None.
    """
    if isinstance(value, dict):
        return {str(k): clean(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [clean(v) for v in value]
    if isinstance(value, np.ndarray):
        return [clean(v) for v in value.tolist()]
    if isinstance(value, (np.floating, float)):
        value = float(value)
        return None if math.isnan(value) or math.isinf(value) else value
    if isinstance(value, np.integer):
        return int(value)
    if isinstance(value, np.bool_):
        return bool(value)
    return value


def points_arrays(rows):
    """
    Return the columns of a study's rows as numpy arrays.

    Parameters
    ----------
    rows : list of dict
        One dict per point, all with the same keys (as in the study's CSV).

    Returns
    -------
    dict
        Column -> 1-D array: ``bool`` for flags, ``int`` for counts and indices, ``float``
        for numbers (NaN where a point has none), ``object`` for text and lists.
    """
    if not rows:
        return {}
    out = {}
    for column in rows[0]:
        values = [row[column] for row in rows]
        if all(isinstance(v, (bool, np.bool_)) for v in values):
            out[column] = np.array(values, dtype=bool)
        elif all(isinstance(v, numbers.Integral) and not isinstance(v, bool) for v in values):
            out[column] = np.array(values, dtype=int)
        elif all(isinstance(v, numbers.Real) and not isinstance(v, bool) for v in values):
            out[column] = np.array(values, dtype=float)
        else:
            array = np.empty(len(values), dtype=object)
            array[:] = values
            out[column] = array
    return out


class PointRows:
    """
    The points of a study held as columns, seen as a sequence of row dicts.

    A map or Monte Carlo keeps one numpy array per column (a 100,000-point map costs little
    beyond its CSV); code that reads rows gets each row built on demand.

    Parameters
    ----------
    columns : dict
        Column -> 1-D array, all of one length.
    """

    def __init__(self, columns):
        self.columns = columns
        self._size = len(next(iter(columns.values()))) if columns else 0

    def __len__(self):
        """Return the number of points."""
        return self._size

    def __getitem__(self, index):
        """Return the row of point ``index`` (Python values), or a list for a slice."""
        if isinstance(index, slice):
            return [self[i] for i in range(*index.indices(self._size))]
        return {
            column: values[index].item() if hasattr(values[index], 'item') else values[index]
            for column, values in self.columns.items()
        }

    def __iter__(self):
        """Iterate over the rows."""
        lists = {column: values.tolist() for column, values in self.columns.items()}
        for i in range(self._size):
            yield {column: values[i] for column, values in lists.items()}

    def column(self, name, default=float('nan')):
        """
        Return one column as an array (``default`` everywhere when the study has none).

        Parameters
        ----------
        name : str
            The column.
        default : object
            The value of every point when the column is missing.

        Returns
        -------
        ndarray
            One value per point.
        """
        if name in self.columns:
            return self.columns[name]
        return np.full(self._size, default)


@dataclass(repr=False, eq=False)
class StudyResult:
    """
    One trade study: its points, its summary and the files ``voltwake sweep --out`` writes.

    Parameters
    ----------
    rows : list of dict
        One dict per point (a CSV row), values in SI.
    data : dict
        The study's numbers as the command line reports them (no points), including
        ``points_count`` and ``closed_count``.
    config : Config
        The configuration the study ran on.

    Attributes
    ----------
    points : dict
        Column -> numpy array (SI), one entry per point; see :func:`points_arrays`.
    units : dict
        Column -> units (``'-'`` for dimensionless numbers, None for flags and text), the
        same as the CSV header shows.
    """

    #: File stem of the study's files: ``<name>_points.csv``, ``<name>_summary.json``.
    name = 'study'

    rows: list
    data: dict
    config: Config
    points: dict = field(init=False)
    units: dict = field(init=False)

    def __post_init__(self):
        """Build the per-point arrays and their units from the rows (or take the columns)."""
        if isinstance(self.rows, dict):  # columns of a map or Monte Carlo
            self.points = self.rows
            self.rows = PointRows(self.points)
        elif isinstance(self.rows, PointRows):
            self.points = self.rows.columns
        else:
            self.points = points_arrays(self.rows)
        self.units = points_units(list(self.points), None)
        self.streamed = None

    @classmethod
    def from_study(cls, raw, config):
        """
        Wrap the dict a study function returns (with its ``points``).

        Parameters
        ----------
        raw : dict
            The study's numbers with its rows under ``points``; taken over (not copied).
        config : Config
            The configuration the study ran on.

        Returns
        -------
        StudyResult
            The result object.
        """
        rows = raw.pop('points', None)
        if isinstance(rows, dict):  # columns: a map or Monte Carlo
            closed = rows.get('closed', np.zeros(0, dtype=bool))
            raw['points_count'] = int(len(closed))
            raw['closed_count'] = int(np.count_nonzero(closed))
            return cls(rows, raw, config)
        rows = rows or []
        raw['points_count'] = len(rows)
        raw['closed_count'] = sum(bool(r.get('closed', r.get('success'))) for r in rows)
        return cls(rows, raw, config)

    @property
    def summary(self):
        """
        The summary written as ``<name>_summary.json`` (and ``.yaml``).

        Returns
        -------
        dict
            ``status`` ('complete'), the study's numbers (JSON-ready: NaN as None), the
            configuration it ran on under ``config`` and, once written, the figures drawn
            under ``plots``.
        """
        return {'status': 'complete', **clean(self.data), 'config': clean(self.config.data)}

    def csv_text(self):
        """
        Return the study's points as the CSV text of ``<name>_points.csv``.

        Returns
        -------
        str
            One row per point, units in the header (empty for a study without points).
        """
        if isinstance(self.rows, PointRows):
            return points_csv(self.points, shown=self._written())
        return points_csv(self.rows, shown=self._written())

    def _written(self):
        """Column -> the unit the user wrote that axis in (map axes and targets)."""
        written = self.data.get('axis_units') or {}
        return {**written, **{f'target:{p}': u for p, u in written.items()}}

    @property
    def csv_units(self):
        """
        The units of the CSV columns.

        Those of :attr:`units`, except the axes the user wrote with a unit, which the CSV
        gives in that unit.

        Returns
        -------
        dict
            Column -> units as the CSV header shows them.
        """
        return {**self.units, **{c: u for c, u in self._written().items() if c in self.units}}

    def to_csv(self, path):
        """
        Write the points as CSV, the same file as ``voltwake sweep`` writes.

        Parameters
        ----------
        path : str or os.PathLike
            The CSV file.

        Returns
        -------
        str
            The path written.
        """
        path = os.fspath(path)
        write_atomic(path, self.csv_text())
        return path

    def write_files(self, out_dir):
        """
        Write the CSV, figures and summaries of this study into an existing directory.

        This is what ``voltwake sweep --out`` writes for each study before the report.

        Parameters
        ----------
        out_dir : str
            The results directory (already prepared).

        Returns
        -------
        list of str
            The files written.
        """
        written = []
        csv_path = os.path.join(out_dir, f'{self.name}_points.csv')
        if self.streamed and os.path.abspath(self.streamed) == os.path.abspath(csv_path):
            written.append(csv_path)  # written chunk by chunk as the study ran
        elif self.rows:
            written.append(self.to_csv(csv_path))
        self.data['points'] = self.rows
        try:
            plots = study_figures(self.data.get('kind', self.name), self.data, out_dir, self.config)
        finally:
            self.data.pop('points', None)
        self.data['plots'] = [os.path.basename(p) for p in plots]
        written += plots
        # The configuration the study ran on, for the report's collapsible copy.
        write_results(
            out_dir,
            f'{self.name}_summary',
            {'status': 'complete', **clean(self.data), 'config': self.config.data},
        )
        written += [os.path.join(out_dir, f'{self.name}_summary.{ext}') for ext in ('json', 'yaml')]
        return written

    def write(self, out_dir, force=False):
        """
        Write the files of ``voltwake sweep --out``: CSV, summaries, figures and report.html.

        Parameters
        ----------
        out_dir : str or os.PathLike
            A new or empty directory (created if need be).
        force : bool
            Allow a directory that already holds files, e.g. to add a second study: the
            report then covers every study in the directory.

        Returns
        -------
        str
            The absolute path of ``report.html``.
        """
        out_dir = prepare_out_dir(os.fspath(out_dir), force)
        self.write_files(out_dir)
        return write_report(out_dir)

    def text(self):
        """
        Return the lines ``voltwake sweep`` prints for this study.

        Returns
        -------
        str
            A short summary with the caution.
        """
        return sweep_text({self.name: self.data})

    def __repr__(self):
        """Return a one-line description (the rows and the configuration are left out)."""
        return (
            f'{type(self).__name__}(design={self.data.get("design", self.config.name)!r}, '
            f'points={len(self.rows)}, columns={len(self.points)})'
        )


@dataclass(repr=False, eq=False)
class DesignMapResult(StudyResult):
    """
    A design-space map (:func:`voltwake.design_map`): a full-factorial grid, analysis only.

    ``points`` holds the axes' inputs, ``closed`` and ``reason`` per point, the result
    fields (``block_fuel_kg``, ``power_saving_coefficient``...) and
    ``fuel_burn_change_percent`` against the conventional reference as configured, or,
    when an axis is an input the reference shares (:attr:`reference_follows`), against the
    reference at each point's values (``reference_block_fuel_kg``, ``reference_closed``).
    """

    name = 'map'

    @property
    def axes(self):
        """Config key path -> grid values (SI), the first varying slowest."""
        return {path: np.array(values, dtype=float) for path, values in self.data['axes'].items()}

    @property
    def closure_rate(self):
        """The share of the points whose sizing loop closed."""
        return self.data['closure_rate']

    @property
    def reference(self):
        """Result fields of the analysed conventional reference (None when it follows)."""
        return self.data['reference']

    @property
    def reference_follows(self):
        """Inputs of the map the reference shares and is analysed at, point by point."""
        return list(self.data.get('reference_follows') or [])


@dataclass(repr=False, eq=False)
class TargetSweepResult(StudyResult):
    """
    A target sweep (:func:`voltwake.target_sweep`): an optimisation at every grid point.

    ``points`` holds ``target:<name>`` (the held values), ``success``, the optimised result
    fields, ``dv:<path>`` (the optimised design variables), ``active_constraints`` and
    ``fuel_burn_change_percent`` against the optimised conventional reference.
    """

    name = 'targets'

    @property
    def targets(self):
        """The swept config key paths or model outputs, in order."""
        return list(self.data['targets'])

    @property
    def reference(self):
        """The (first) optimised reference: ``success``, ``outputs``, ``design``."""
        return self.data['reference']


@dataclass(repr=False, eq=False)
class BreakevenResult(StudyResult):
    """
    A technology break-even (:func:`voltwake.breakeven`).

    ``points`` holds every optimised evaluation of the root search: the input's value,
    ``fuel_burn_change_percent`` and ``block_fuel_kg``.
    """

    name = 'breakeven'

    @property
    def found(self):
        """Whether the fuel-burn difference changes sign on the interval."""
        return bool(self.data['found'])

    @property
    def value(self):
        """The break-even value (SI; NaN when none was found)."""
        return self.data['value']

    @property
    def value_units(self):
        """SI units of the input (and of ``value``, ``lower``, ``upper``)."""
        return self.data['units']

    @property
    def message(self):
        """The answer in words."""
        return self.data['message']

    @property
    def sensitivities(self):
        """Path -> derivative and elasticity of block fuel at the configured design."""
        return self.data['sensitivities']


@dataclass(repr=False, eq=False)
class MonteCarloResult(StudyResult):
    """
    A Monte Carlo study (:func:`voltwake.monte_carlo`) over technology inputs.

    ``points`` holds the sampled inputs, ``closed``, the result fields and
    ``fuel_burn_change_percent`` against the conventional reference as configured.
    """

    name = 'montecarlo'

    @property
    def probability_of_win(self):
        """Share of the closed samples that burn less fuel than the reference."""
        return self.data['probability_of_win']

    @property
    def fuel_burn_change_percent(self):
        """``mean``, ``std``, ``p05``, ``p50``, ``p95`` of the fuel-burn change [%]."""
        return self.data['fuel_burn_change_percent']

    @property
    def reference_follows(self):
        """Sampled inputs the reference shares and is analysed at, sample by sample."""
        return list(self.data.get('reference_follows') or [])
