"""
Loading and strict validation of aircraft configurations.

A configuration is a YAML mapping of sections (see :mod:`voltwake.schema`). Dimensional
values are bare numbers in SI or strings with units (``"35000 ft"``, ``"10 kW/kg"``)
converted with OpenMDAO's unit system. Every error names the file, the line, the dotted
key path, the value and what was expected. Values given with ``--set`` are reported as
coming from ``--set``.

Unit strings are checked against a plain grammar (unit names, ``*``, ``/``, parentheses and
small integer powers) before OpenMDAO sees them, because OpenMDAO evaluates unit strings as
Python expressions.
"""

import copy
import difflib
import math
import numbers
import os
import re

from openmdao.utils.units import convert_units, is_compatible, valid_units

from ..errors import ConfigError
from .schema import (
    BARE_NUMBER_RANGES,
    CONDUCTORS,
    DEFAULTED_SECTIONS,
    LIKELY_UNITS,
    OPTIONAL_SECTIONS,
    REQUIRED,
    RETIRED_KEYS,
    SECTIONS,
    Field,
)
from .yamlio import key_path, parse_value, parse_yaml, read_yaml_file

#: Source name of values given as overrides.
OVERRIDE_SOURCE = '--set'

_UNIT_NAME = r'[A-Za-z][A-Za-z0-9_]*'
_UNIT_POWER = r'(?:\s*\*\*\s*(?:-?[0-9]{1,2}|\(\s*-?[0-9]{1,2}\s*\)))?'
_UNIT_TERM = (
    rf'(?:1\s*/\s*)?{_UNIT_NAME}{_UNIT_POWER}'
    rf'(?:\s*[*/]\s*{_UNIT_NAME}{_UNIT_POWER})*'
)
_UNIT_GROUP = re.compile(rf'\(\s*{_UNIT_TERM}\s*\){_UNIT_POWER}')
_UNIT_EXPR = re.compile(_UNIT_TERM)
_MAX_UNIT_CHARS = 64
_NUMBER_AND_UNIT = re.compile(r'([-+]?(?:[0-9]+\.?[0-9]*|\.[0-9]+)(?:[eE][-+]?[0-9]+)?)\s*(.*)')
#: Largest whole number accepted (the largest 32-bit signed integer).
_MAX_INTEGER = 2**31 - 1

#: Keys outside the aft-fan sections that only a turbo-electric model has inputs for.
_AFT_ONLY = (
    'performance.aft_fan_max_diameter_ratio',
    'performance.aft_fan_max_hub_to_tip_ratio',
    'performance.motor_power_limit',
)

#: Keys read only by one airframe-mass method (structure.method).
_REGRESSION_ONLY = ('structure.airframe_mass_coefficient', 'structure.airframe_mass_exponent')
_BUILD_UP_ONLY = (
    'structure.ultimate_load_factor',
    'structure.systems_fraction',
    'structure.mass_per_passenger',
    'structure.furnishings_per_passenger',
    'structure.operating_items_per_passenger',
)

_CHECKS = {
    'positive': (lambda v: v > 0, 'a value > 0'),
    'nonnegative': (lambda v: v >= 0, 'a value >= 0'),
    'fraction': (lambda v: 0 < v <= 1, 'a value in (0, 1]'),
    'open_fraction': (lambda v: 0 < v < 1, 'a value in (0, 1)'),
    'unit_fraction': (lambda v: 0 <= v < 1, 'a value in [0, 1)'),
    'at_least_one': (lambda v: v >= 1, 'a value >= 1'),
    'above_one': (lambda v: v > 1, 'a value > 1'),
    'above_two': (lambda v: v > 2, 'a value > 2'),
    'isa_altitude': (lambda v: 0 <= v <= 20000, 'a value from 0 to 20 km (the ISA range modelled)'),
    'below_right_angle': (lambda v: 0 <= v < 1.3962634015954636, 'an angle from 0 to 80 deg'),
}


class Config:
    """
    A validated configuration.

    Parameters
    ----------
    data : dict
        The raw mapping as written (after overrides), kept for re-validation and output.
    values : dict
        Dotted key path -> validated value (SI for quantities).
    origins : dict
        Dotted key path -> (source, line) where the value was given.
    source : str
        Name of the file (or ``<dict>``) the configuration came from.

    Attributes
    ----------
    data : dict
        The raw mapping.
    values : dict
        Dotted key path -> validated value.
    source : str
        Where it came from.
    """

    def __init__(self, data, values, origins, source, lines=None, overridden=()):
        self.data = data
        self.values = values
        self.origins = origins
        self.source = source
        self._lines = dict(lines or {})
        self._overridden_paths = set(overridden)

    def where(self, parts):
        """
        Return the :class:`ConfigError` keywords (source, line, path) of a key as written.

        Parameters
        ----------
        parts : tuple of str
            The key's path as written in the file, one entry per mapping level (a design
            variable's name, itself a dotted path, is one entry).

        Returns
        -------
        dict
            ``source``, ``line`` and ``path`` for :class:`ConfigError`.
        """
        return _where(tuple(parts), self._lines, self.source, self._overridden_paths)

    @property
    def name(self):
        """str: Name of the design."""
        return self.values['aircraft']

    @property
    def has_aft_fan(self):
        """
        bool: True for a turbo-electric design with a wake-ingesting aft fan.

        An ``aft_fan`` section with a thrust fraction of exactly zero is the conventional
        aircraft: the model is then built without the aft fan and its electrical chain.
        """
        return 'aft_fan' in self.data and self.values['aft_fan.thrust_fraction'] > 0.0

    @property
    def has_economic_mission(self):
        """bool: True when the design is also flown on an economic mission."""
        return 'economic_mission' in self.data

    @property
    def structure(self):
        """str: The airframe-mass method, 'regression' or 'build_up'."""
        return self.values['structure.method']

    def model_inputs(self):
        """
        Return the model inputs set by this configuration.

        Returns
        -------
        dict
            Promoted model input name -> (SI value, SI units).
        """
        out = {}
        unread = _BUILD_UP_ONLY if self.structure == 'regression' else _REGRESSION_ONLY
        for path, value in self.values.items():
            if not self.has_aft_fan and (
                path.split('.')[0] in ('aft_fan', 'electrical') or path in _AFT_ONLY
            ):
                continue
            if path in unread:
                continue
            field = field_at(path)
            if field is not None and field.target:
                out[field.target] = (value, field.units)
        if self.has_aft_fan:
            metal = CONDUCTORS[self.values['electrical.cable.conductor']]
            out['cable_resistivity'] = (metal['resistivity'], 'ohm*m')
            out['cable_conductor_density'] = (metal['density'], 'kg/m**3')
        return out

    def model_options(self):
        """
        Return the options of :class:`voltwake.models.aircraft.AircraftModel` for this design.

        Returns
        -------
        dict
            Option name -> value.
        """
        opts = {
            'num_engines': self.values['turbofans.count'],
            'aft_fan': self.has_aft_fan,
            'wing_sizing': 'loading' if 'wing.loading' in self.values else 'area',
            'structure': self.structure,
            'max_iterations': self.values.get('solver.max_iterations', 30),
            'tolerance': self.values.get('solver.tolerance', 1e-10),
            'economic_mission': self.has_economic_mission,
        }
        if self.has_aft_fan:
            opts['profile_exponent'] = self.values['aft_fan.profile_exponent']
        return opts

    def with_overrides(self, overrides):
        """
        Return a new configuration with ``overrides`` applied and validated.

        Parameters
        ----------
        overrides : dict or list of str or None
            Dotted key path -> value, or ``"key.path=value"`` strings.

        Returns
        -------
        Config
            The new configuration.
        """
        return _validate(
            copy.deepcopy(self.data),
            self.source,
            self.origins_lines(),
            overrides,
            self._overridden(),
        )

    def without_aft_fan(self):
        """
        Return the conventional reference: the same design with the aft fan removed.

        Returns
        -------
        Config
            The reference configuration.
        """
        data = copy.deepcopy(self.data)
        data.pop('aft_fan', None)
        data.pop('electrical', None)
        data['aircraft'] = f"{self.name} (conventional reference)"
        return _validate(data, self.source, self.origins_lines(), None, self._overridden())

    def _overridden(self):
        """Return the tuple key paths whose values were given as overrides."""
        return {
            tuple(p.split('.')) for p, (src, _) in self.origins.items() if src == OVERRIDE_SOURCE
        }

    def origins_lines(self):
        """
        Return the line of every key path given in the source file.

        Returns
        -------
        dict
            Tuple key path -> 1-based line.
        """
        return {
            tuple(p.split('.')): line
            for p, (src, line) in self.origins.items()
            if src == self.source and line is not None
        }

    def value(self, path):
        """
        Return the validated value at a dotted key path.

        Parameters
        ----------
        path : str
            Dotted key path, e.g. ``'wing.area'``.

        Returns
        -------
        object
            The value (SI for quantities).
        """
        try:
            return self.values[path]
        except KeyError:
            raise ConfigError(
                'no such key in this configuration', source=self.source, path=path
            ) from None


def absent_input_hint(config, path):
    """
    Say why a config key that feeds a model input has no input in this design's model.

    Parameters
    ----------
    config : Config
        The design.
    path : str
        Dotted key path of a schema field with a model input.

    Returns
    -------
    str
        A short explanation, starting with '; '.
    """
    other = {'wing.area': 'wing.loading', 'wing.loading': 'wing.area'}.get(path)
    if other and other in config.values:
        return f'; this design gives {other} instead (a config takes one of the two)'
    if path.split('.')[0] in ('aft_fan', 'electrical') and not config.has_aft_fan:
        return '; this design has no aft fan'
    return ''


def input_paths():
    """
    Return every config key path that feeds a model input (a design-variable candidate).

    Returns
    -------
    list of str
        Dotted key paths.
    """
    out = []

    def walk(node, prefix):
        for key, value in node.items():
            path = f'{prefix}.{key}' if prefix else key
            if isinstance(value, Field):
                if value.target:
                    out.append(path)
            elif isinstance(value, dict):
                walk(value, path)

    walk(SECTIONS, '')
    return out


def field_at(path):
    """
    Return the schema field at a dotted key path, or None.

    Parameters
    ----------
    path : str
        Dotted key path.

    Returns
    -------
    Field or None
        The field.
    """
    node = SECTIONS
    for part in path.split('.'):
        if not isinstance(node, dict) or part not in node:
            return None
        node = node[part]
    return node if isinstance(node, Field) else None


def _show(value):
    """Return ``repr(value)`` cut to a length that fits an error line."""
    try:
        text = repr(value)
    except ValueError:
        # Python refuses to write integers of more than a few thousand digits.
        return 'a number with too many digits'
    return text if len(text) <= 60 else text[:57] + '...'


def _expectation(field):
    """Return what a field expects, for the message of a missing key."""
    if field.kind == 'quantity':
        return f"a number in {field.units} or a string with units such as '12 {field.units}'"
    kinds = {
        'number': 'a number',
        'integer': 'a whole number',
        'text': 'text',
        'mapping': 'a mapping',
        'choice': f"one of {', '.join(field.choices)}",
    }
    return kinds[field.kind]


def _plain_unit(unit):
    """Return True when ``unit`` is a plain unit expression such as 'kg/m**3' or 'g/(kN*s)'."""
    if len(unit) > _MAX_UNIT_CHARS:
        return False
    for _ in range(4):
        unit, count = _UNIT_GROUP.subn('x', unit)
        if not count:
            break
    return _UNIT_EXPR.fullmatch(unit) is not None


def _known_unit(unit):
    """Return True when OpenMDAO knows the plain unit expression ``unit``."""
    if not _plain_unit(unit):
        return False
    try:
        return valid_units(unit)
    except (SyntaxError, NameError, TypeError, ValueError, ArithmeticError):
        return False


def _to_float(value, where):
    """Convert a number to a finite float or raise :class:`ConfigError`."""
    try:
        out = float(value)
    except OverflowError:
        out = math.inf
    if not math.isfinite(out):
        raise ConfigError(f'got {_show(value)}; expected a finite number', **where)
    return out


def parse_quantity(value, units, where, key=None, check_bare=True):
    """
    Convert a bare number (SI) or a ``"number unit"`` string to SI ``units``.

    The space between number and unit may be left out (``"2kW/kg"``). A bare number (no unit
    written) for a key with a plausible range (:data:`voltwake.schema.BARE_NUMBER_RANGES`)
    must lie in that range or be zero.

    Parameters
    ----------
    value : object
        The value as written.
    units : str
        SI units to convert to.
    where : dict
        Keyword arguments for :class:`ConfigError` (source, line, path).
    key : str or None
        The config key the value is for (default: ``where['path']``).
    check_bare : bool
        Apply the plausible range of a bare number (the caller may do it after its own
        physical checks).

    Returns
    -------
    float
        The value in ``units``.
    """
    number = _parse_quantity(value, units, where)
    if check_bare and _is_bare(value):
        _check_bare(number, units, key or where.get('path'), value, where)
    return number


def written_unit(value):
    """
    Return the unit a quantity was written with, or None for a bare number.

    Parameters
    ----------
    value : object
        The value as written (``'35000 ft'``, ``'2kW/kg'``, ``1500.0``).

    Returns
    -------
    str or None
        The unit as written, e.g. ``'ft'``.
    """
    if not isinstance(value, str):
        return None
    text = value.strip()
    glued = _NUMBER_AND_UNIT.fullmatch(text)
    unit = glued.group(2) if glued else text.partition(' ')[2]
    return unit.strip() or None


def _is_bare(value):
    """Return True when a quantity was written without a unit."""
    if not isinstance(value, str):
        return True
    glued = _NUMBER_AND_UNIT.fullmatch(value.strip())
    unit = glued.group(2) if glued else value.strip().partition(' ')[2]
    return not unit.strip()


def _check_bare(number, units, key, value, where):
    """Refuse a bare number outside the plausible range of its key."""
    bounds = BARE_NUMBER_RANGES.get(key)
    if bounds is None or number == 0.0 or bounds[0] <= number <= bounds[1]:
        return
    lo, hi = bounds
    unit = LIKELY_UNITS.get(key, units)
    raise ConfigError(
        f'got {_show(value)} with no unit (read as {number:g} {units}); expected a value '
        f"with its unit, e.g. '{value} {unit}', or a bare number from {lo:g} to {hi:g} "
        f'{units}: did you forget the unit?',
        **where,
    )


def _parse_quantity(value, units, where):
    """Convert ``value`` to ``units`` (see :func:`parse_quantity`)."""
    expect = f"a number in {units} or a string with units such as '12 {units}'"
    if isinstance(value, str):
        text = value.strip()
        glued = _NUMBER_AND_UNIT.fullmatch(text)  # '2kW/kg' as well as '2 kW/kg'
        number, _, unit = (glued.group(1), '', glued.group(2)) if glued else text.partition(' ')
        try:
            number = float(number)
        except ValueError:
            raise ConfigError(f'got {_show(value)}; expected {expect}', **where) from None
        number = _to_float(number, where)
        unit = unit.strip() or units
        if not _known_unit(unit):
            raise ConfigError(
                f"got {_show(value)}: unknown unit {_show(unit)}; expected {expect}", **where
            )
        if not is_compatible(unit, units):
            raise ConfigError(
                f"got {_show(value)}: unit {unit!r} cannot be converted to "
                f"{units}; expected {expect}",
                **where,
            )
        return _to_float(convert_units(number, unit, units), where)
    if isinstance(value, (bool, complex)) or not isinstance(value, numbers.Real):
        raise ConfigError(f'got {_show(value)}; expected {expect}', **where)
    return _to_float(value, where)


def _suggest(key, known):
    close = difflib.get_close_matches(key, known, n=1, cutoff=0.6)
    return f" (did you mean '{close[0]}'?)" if close else ''


def _check_field(field, value, where):
    raw = value
    if field.kind == 'quantity':
        value = parse_quantity(value, field.units, where, check_bare=False)
    elif field.kind == 'number':
        if isinstance(value, bool) or not isinstance(value, numbers.Real):
            raise ConfigError(f'got {_show(value)}; expected a number ({field.doc})', **where)
        value = _to_float(value, where)
    elif field.kind == 'integer':
        if isinstance(value, bool) or not isinstance(value, numbers.Integral):
            raise ConfigError(f'got {_show(value)}; expected a whole number ({field.doc})', **where)
        value = int(value)
        if abs(value) > _MAX_INTEGER:
            # The model takes counts and limits as floats or C integers.
            raise ConfigError(
                f'got {_show(value)}; expected a whole number of at most '
                f'{_MAX_INTEGER} ({field.doc})',
                **where,
            )
    elif field.kind == 'choice':
        if not isinstance(value, str) or value not in field.choices:
            hint = _suggest(value, field.choices) if isinstance(value, str) else ''
            raise ConfigError(
                f"got {_show(value)}; expected one of {', '.join(field.choices)}{hint}", **where
            )
    elif field.kind == 'mapping':
        if not isinstance(value, dict) or not value:
            raise ConfigError(f'got {_show(value)}; expected a mapping ({field.doc})', **where)
    elif field.kind == 'text' and not isinstance(value, str):
        raise ConfigError(f'got {_show(value)}; expected text', **where)
    if field.check:
        test, expect = _CHECKS[field.check]
        if not test(value):
            shown = _show(raw)
            if field.units and isinstance(raw, str):
                shown += f' (= {value:g} {field.units})'
            elif field.units:
                shown += f' {field.units}'
            raise ConfigError(f'got {shown}; expected {expect} ({field.doc})', **where)
    if field.kind == 'quantity' and _is_bare(raw):
        _check_bare(value, field.units, where.get('path'), raw, where)
    return value


def _where(sub, lines, source, overridden):
    """Return the :class:`ConfigError` keywords for the entry at tuple path ``sub``."""
    dotted = key_path(sub)
    if any(sub[:i] in overridden for i in range(1, len(sub) + 1)):
        return {'source': OVERRIDE_SOURCE, 'line': None, 'path': dotted}
    return {'source': source, 'line': lines.get(sub, lines.get(sub[:-1])), 'path': dotted}


def _all_default(schema):
    return all(
        _all_default(f) if isinstance(f, dict) else f.default is not REQUIRED
        for f in schema.values()
    )


def _walk(schema, data, path, lines, source, values, origins, overridden):
    known = list(schema)
    for key in data:
        if key not in schema:
            sub = path + (str(key),)
            where = _where(sub, lines, source, overridden)
            where['line'] = None if where['line'] is None else lines.get(sub)
            retired = RETIRED_KEYS.get('.'.join(sub))
            if retired:
                raise ConfigError(f'this key is no longer read: {retired}; remove it', **where)
            raise ConfigError(
                f'unknown key{_suggest(str(key), known)}; expected one of the '
                f"known keys here: {', '.join(known)}",
                **where,
            )
    for key, field in schema.items():
        sub = path + (key,)
        dotted = '.'.join(sub)
        where = _where(sub, lines, source, overridden)
        if isinstance(field, dict):
            if key not in data:
                if (not path and key in DEFAULTED_SECTIONS) or (path and _all_default(field)):
                    _walk(field, {}, sub, lines, source, values, origins, overridden)
                    continue
                if not path and key in OPTIONAL_SECTIONS:
                    continue
                raise ConfigError(
                    f"missing section; expected a mapping with keys {', '.join(field)}", **where
                )
            if not isinstance(data[key], dict):
                raise ConfigError(
                    f'got {_show(data[key])}; expected a mapping with keys {", ".join(field)}',
                    **where,
                )
            _walk(field, data[key], sub, lines, source, values, origins, overridden)
        elif key in data:
            values[dotted] = _check_field(field, data[key], where)
            origins[dotted] = (where['source'], where['line'])
        elif field.default is REQUIRED:
            raise ConfigError(
                f'missing required key ({field.doc}); expected {_expectation(field)}', **where
            )
        elif field.default is not None:
            values[dotted] = field.default
            origins[dotted] = ('default', None)


def _regroup_design_variable(parts):
    """Design-variable keys are dotted config paths: keep them whole in an override path."""
    head = ('optimization', 'design_variables')
    if parts[:2] != head or len(parts) < 4:
        return parts
    if parts[-1] in ('lower', 'upper', 'ref', 'ref0') and len(parts) > 4:
        return head + ('.'.join(parts[2:-1]), parts[-1])
    return head + ('.'.join(parts[2:]),)


def _apply_overrides(data, overrides, overridden):
    """Apply overrides to ``data`` in place, adding every path they set to ``overridden``."""
    items = overrides.items() if isinstance(overrides, dict) else None
    if items is None:
        items = []
        for text in overrides:
            path, sep, raw = str(text).partition('=')
            if not sep or not path.strip():
                raise ConfigError(
                    f"got {_show(text)}; expected key.path=value", source=OVERRIDE_SOURCE
                )
            value = parse_value(raw, OVERRIDE_SOURCE) if raw.strip() else raw
            items.append((path.strip(), value))
    for path, value in items:
        parts = tuple(part.strip() for part in str(path).split('.'))
        if not all(parts):
            raise ConfigError(
                f"got {_show(str(path))}; expected a dotted key path such as 'wing.area'",
                source=OVERRIDE_SOURCE,
            )
        parts = _regroup_design_variable(parts)
        node = data
        for i, part in enumerate(parts[:-1]):
            if not isinstance(node.get(part), dict):
                if part in node:
                    raise ConfigError(
                        f"'{part}' is not a section",
                        source=OVERRIDE_SOURCE,
                        path=key_path(parts[: i + 1]),
                    )
                node[part] = {}
                overridden.add(parts[: i + 1])
            node = node[part]
        node[parts[-1]] = value
        overridden.add(parts)


def _validate(data, source, lines, overrides, overridden=()):
    if not isinstance(data, dict):
        raise ConfigError(
            f'got {type(data).__name__}; expected a mapping of sections', source=source
        )
    overridden = set(overridden)
    if overrides:
        _apply_overrides(data, overrides, overridden)
    values, origins = {}, {}
    _walk(SECTIONS, data, (), lines, source, values, origins, overridden)
    if ('aft_fan' in data) != ('electrical' in data):
        present, missing = (
            ('aft_fan', 'electrical') if 'aft_fan' in data else ('electrical', 'aft_fan')
        )
        where = _where((present,), lines, source, overridden)
        raise ConfigError(
            f"missing section '{missing}'; expected both 'aft_fan' and "
            f"'electrical' sections for a design with an aft fan (only "
            f"'{present}' is given)",
            **where,
        )
    _check_wing(data, values, lines, source, overridden)
    _check_structure(values, lines, source, overridden)
    return Config(data, values, origins, source, lines, overridden)


def _check_structure(values, lines, source, overridden):
    """Resolve the airframe-mass method; the regression needs its two constants."""
    if values.get('structure.method') is None:
        # An older config names only the regression constants: it keeps the regression.
        given = any(path in values for path in _REGRESSION_ONLY)
        values['structure.method'] = 'regression' if given else 'build_up'
    if values['structure.method'] != 'regression':
        return
    for path in _REGRESSION_ONLY:
        if path not in values:
            raise ConfigError(
                'missing key; expected a number (the airframe-mass regression, '
                'structure.method: regression, needs airframe_mass_coefficient and '
                'airframe_mass_exponent)',
                **_where(tuple(path.split('.')), lines, source, overridden),
            )


def _check_wing(data, values, lines, source, overridden):
    """Exactly one of ``wing.area`` and ``wing.loading`` sizes the wing."""
    given = [key for key in ('area', 'loading') if f'wing.{key}' in values]
    if len(given) == 1:
        return
    if given:
        where = _where(('wing', 'loading'), lines, source, overridden)
        raise ConfigError(
            f"got both 'area' and 'loading' ({_show(data['wing']['loading'])}); expected one "
            'of them: a fixed wing area, or a wing loading the wing is sized to',
            **where,
        )
    raise ConfigError(
        'missing key; expected wing.area (a fixed reference area, m**2) or wing.loading '
        '(MTOW per wing area the wing is sized to, kg/m**2)',
        **_where(('wing',), lines, source, overridden),
    )


def load_config(path_or_dict=None, overrides=None):
    """
    Load and validate a configuration.

    Parameters
    ----------
    path_or_dict : str, os.PathLike, dict, Config or None
        A YAML file, the name of a packaged demo (``'demo_conventional'``,
        ``'demo_turbo_electric'``; see :func:`demo_names`), an already parsed mapping, a
        Config, or None for the packaged turbo-electric demo.
    overrides : dict or list of str or None
        Dotted key path -> value (or ``"key.path=value"`` strings) applied before validation.

    Returns
    -------
    Config
        The validated configuration.
    """
    if isinstance(path_or_dict, Config):
        return path_or_dict.with_overrides(overrides) if overrides else path_or_dict
    if path_or_dict is None:
        path_or_dict = demo_path('turbo_electric')
    if isinstance(path_or_dict, dict):
        return _validate(copy.deepcopy(path_or_dict), '<dict>', {}, overrides)
    path_or_dict = resolve_source(path_or_dict)
    data, lines = read_yaml_file(path_or_dict)
    return _validate(data, os.fspath(path_or_dict), lines, overrides)


def demo_names():
    """
    Return the names of the packaged demo configurations.

    Returns
    -------
    list of str
        Names such as 'demo_conventional', usable wherever a config path is.
    """
    from importlib import resources

    return sorted(
        entry.name.removesuffix('.yaml')
        for entry in resources.files('voltwake.configs').iterdir()
        if entry.name.startswith('demo_') and entry.name.endswith('.yaml')
    )


def demo_path(name='turbo_electric'):
    """
    Return the path of a packaged demo configuration.

    Parameters
    ----------
    name : str
        A demo name with or without its 'demo_' prefix ('demo_conventional',
        'conventional', 'demo_turbo_electric', 'turbo_electric').

    Returns
    -------
    str
        Path of the YAML file.
    """
    from importlib import resources

    stem = name if name.startswith('demo_') else f'demo_{name}'
    path = resources.files('voltwake.configs') / f'{stem}.yaml'
    if not path.is_file():
        raise ConfigError(
            f"no packaged demo named {name!r}; expected one of {', '.join(demo_names())}"
        )
    return str(path)


def resolve_source(source):
    """
    Return the file a configuration source names: a path, or a packaged demo's name.

    Parameters
    ----------
    source : str or os.PathLike
        A YAML file path, or a demo name such as 'demo_conventional'.

    Returns
    -------
    str or os.PathLike
        The path to read.
    """
    text = os.fspath(source)
    if os.path.exists(text) or not isinstance(text, str):
        return source
    if text in demo_names():
        return demo_path(text)
    looks_like_name = os.sep not in text and not text.endswith(('.yaml', '.yml'))
    if looks_like_name:
        hint = _suggest(text, demo_names())
        raise ConfigError(
            f"no such file or packaged demo{hint}; demos: {', '.join(demo_names())}",
            source=text,
        )
    return source


def parse_yaml_text(text, source='<string>'):
    """
    Parse and validate a configuration given as YAML text.

    Parameters
    ----------
    text : str
        The YAML document.
    source : str
        Name for error messages.

    Returns
    -------
    Config
        The validated configuration.
    """
    data, lines = parse_yaml(text, source)
    return _validate(data, source, lines, None)
