"""
Loading and strict validation of aircraft configurations.

A configuration is a YAML mapping of sections (see :mod:`voltwake.schema`). Dimensional
values are bare numbers in SI or strings with units (``"35000 ft"``, ``"10 kW/kg"``)
converted with OpenMDAO's unit system. Every error names the file, the line, the dotted
key path, the value and what was expected.
"""

import copy
import difflib
import math
import os

import yaml
from openmdao.utils.units import convert_units, is_compatible, valid_units

from .errors import ConfigError
from .schema import CONDUCTORS, OPTIONAL_SECTIONS, REQUIRED, SECTIONS, Field
from .yamlio import parse_yaml, read_yaml_file

_CHECKS = {
    'positive': (lambda v: v > 0, 'a value > 0'),
    'nonnegative': (lambda v: v >= 0, 'a value >= 0'),
    'fraction': (lambda v: 0 < v <= 1, 'a value in (0, 1]'),
    'open_fraction': (lambda v: 0 < v < 1, 'a value in (0, 1)'),
    'unit_fraction': (lambda v: 0 <= v < 1, 'a value in [0, 1)'),
    'at_least_one': (lambda v: v >= 1, 'a value >= 1'),
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

    def __init__(self, data, values, origins, source):
        self.data = data
        self.values = values
        self.origins = origins
        self.source = source

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

    def model_inputs(self):
        """
        Return the model inputs set by this configuration.

        Returns
        -------
        dict
            Promoted model input name -> (SI value, SI units).
        """
        out = {}
        for path, value in self.values.items():
            if not self.has_aft_fan and path.split('.')[0] in ('aft_fan', 'electrical'):
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
        opts = {'num_engines': self.values['turbofans.count'],
                'aft_fan': self.has_aft_fan,
                'max_iterations': self.values.get('solver.max_iterations', 30),
                'tolerance': self.values.get('solver.tolerance', 1e-10)}
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
        return _validate(copy.deepcopy(self.data), self.source, self.origins_lines(), overrides)

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
        return _validate(data, self.source, self.origins_lines(), None)

    def origins_lines(self):
        """
        Return the line of every key path given in the source file.

        Returns
        -------
        dict
            Tuple key path -> 1-based line.
        """
        return {tuple(p.split('.')): line for p, (src, line) in self.origins.items()
                if src == self.source and line is not None}

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
            raise ConfigError('no such key in this configuration', source=self.source,
                              path=path) from None


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


def parse_quantity(value, units, where):
    """
    Convert a bare number (SI) or a ``"number unit"`` string to SI ``units``.

    Parameters
    ----------
    value : object
        The value as written.
    units : str
        SI units to convert to.
    where : dict
        Keyword arguments for :class:`ConfigError` (source, line, path).

    Returns
    -------
    float
        The value in ``units``.
    """
    expect = f"a number in {units} or a string with units such as '12 {units}'"
    if isinstance(value, bool) or not isinstance(value, (int, float, str)):
        raise ConfigError(f'got {value!r}; expected {expect}', **where)
    if isinstance(value, str):
        text = value.strip()
        number, _, unit = text.partition(' ')
        try:
            number = float(number)
        except ValueError:
            raise ConfigError(f'got {value!r}; expected {expect}', **where) from None
        unit = unit.strip() or units
        if not valid_units(unit):
            raise ConfigError(f"got {value!r}: unknown unit {unit!r}; expected {expect}",
                              **where)
        if not is_compatible(unit, units):
            raise ConfigError(f"got {value!r}: unit {unit!r} cannot be converted to {units}; "
                              f"expected {expect}", **where)
        value = float(convert_units(number, unit, units))
    value = float(value)
    if not math.isfinite(value):
        raise ConfigError(f'got {value!r}; expected a finite number', **where)
    return value


def _suggest(key, known):
    close = difflib.get_close_matches(key, known, n=1, cutoff=0.6)
    return f" (did you mean '{close[0]}'?)" if close else ''


def _check_field(field, value, where):
    if field.kind == 'quantity':
        value = parse_quantity(value, field.units, where)
    elif field.kind == 'number':
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            raise ConfigError(f'got {value!r}; expected a number ({field.doc})', **where)
        value = float(value)
        if not math.isfinite(value):
            raise ConfigError(f'got {value!r}; expected a finite number', **where)
    elif field.kind == 'integer':
        if isinstance(value, bool) or not isinstance(value, int):
            raise ConfigError(f'got {value!r}; expected a whole number ({field.doc})', **where)
    elif field.kind == 'choice':
        if not isinstance(value, str) or value not in field.choices:
            hint = _suggest(str(value), field.choices)
            raise ConfigError(f"got {value!r}; expected one of {', '.join(field.choices)}{hint}",
                              **where)
    elif field.kind == 'text':
        if not isinstance(value, str):
            raise ConfigError(f'got {value!r}; expected text', **where)
    if field.check:
        test, expect = _CHECKS[field.check]
        if not test(value):
            shown = f'{value:g} {field.units}' if field.units else f'{value!r}'
            raise ConfigError(f'got {shown}; expected {expect} ({field.doc})', **where)
    return value


def _walk(schema, data, path, lines, source, values, origins):
    known = list(schema)
    for key in data:
        if key not in schema:
            sub = path + (str(key),)
            raise ConfigError(f'unknown key{_suggest(str(key), known)}; known keys here: '
                              f"{', '.join(known)}", source=source, line=lines.get(sub),
                              path='.'.join(sub))
    for key, field in schema.items():
        sub = path + (key,)
        dotted = '.'.join(sub)
        where = {'source': source, 'line': lines.get(sub, lines.get(path)), 'path': dotted}
        if isinstance(field, dict):
            if key not in data:
                if not path and key in OPTIONAL_SECTIONS:
                    continue
                raise ConfigError(f"missing section; expected a mapping with keys "
                                  f"{', '.join(field)}", **where)
            if not isinstance(data[key], dict):
                raise ConfigError(f'got {data[key]!r}; expected a mapping with keys '
                                  f"{', '.join(field)}", **where)
            _walk(field, data[key], sub, lines, source, values, origins)
        elif key in data:
            values[dotted] = _check_field(field, data[key], where)
            origins[dotted] = (source, where['line'])
        elif field.default is REQUIRED:
            raise ConfigError(f'missing required key ({field.doc})', **where)
        else:
            values[dotted] = field.default
            origins[dotted] = ('default', None)


def _apply_overrides(data, overrides, lines):
    items = overrides.items() if isinstance(overrides, dict) else None
    if items is None:
        items = []
        for text in overrides:
            path, sep, raw = str(text).partition('=')
            if not sep or not path.strip():
                raise ConfigError(f"got {text!r}; expected key.path=value", source='--set')
            try:
                value = yaml.safe_load(raw) if raw.strip() else raw
            except yaml.YAMLError:
                value = raw
            items.append((path.strip(), value))
    for path, value in items:
        parts = str(path).split('.')
        node = data
        for i, part in enumerate(parts[:-1]):
            if not isinstance(node.get(part), dict):
                if part in node:
                    raise ConfigError(f"'{part}' is not a section", source='--set',
                                      path='.'.join(parts[:i + 1]))
                node[part] = {}
            node = node[part]
        node[parts[-1]] = value
        lines.pop(tuple(parts), None)


def _validate(data, source, lines, overrides):
    if not isinstance(data, dict):
        raise ConfigError(f'got {type(data).__name__}; expected a mapping of sections',
                          source=source)
    lines = dict(lines)
    if overrides:
        _apply_overrides(data, overrides, lines)
    values, origins = {}, {}
    _walk(SECTIONS, data, (), lines, source, values, origins)
    if ('aft_fan' in data) != ('electrical' in data):
        missing = 'electrical' if 'aft_fan' in data else 'aft_fan'
        raise ConfigError("missing section; an aft fan needs both 'aft_fan' and 'electrical'",
                          source=source, path=missing)
    return Config(data, values, origins, source)


def load_config(path_or_dict=None, overrides=None):
    """
    Load and validate a configuration.

    Parameters
    ----------
    path_or_dict : str, os.PathLike, dict, Config or None
        A YAML file, an already parsed mapping, a Config, or None for the packaged
        turbo-electric demo.
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
    data, lines = read_yaml_file(path_or_dict)
    return _validate(data, os.fspath(path_or_dict), lines, overrides)


def demo_path(name='turbo_electric'):
    """
    Return the path of a packaged demo configuration.

    Parameters
    ----------
    name : str
        'turbo_electric' or 'conventional'.

    Returns
    -------
    str
        Path of the YAML file.
    """
    from importlib import resources
    path = resources.files('voltwake.configs') / f'demo_{name}.yaml'
    if not path.is_file():
        raise ConfigError(f"no packaged demo named {name!r}; expected 'turbo_electric' or "
                          "'conventional'")
    return str(path)


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
