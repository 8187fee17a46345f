"""
Hardening against bad input, measured: property-based fuzzing of configuration files.

The two packaged demos are mutated many hundred ways (keys dropped, renamed with typos and
duplicated; values of the wrong type, NaN and infinity, negative, zero, huge, with units of
the wrong dimension or garbage units; YAML syntax broken by deleting colons, unbalancing
brackets and quotes, bad indentation; empty, binary and non-UTF-8 files). Every case is
loaded with :func:`voltwake.load_config` and run through ``voltwake analyze --json``
in-process; a few also through ``python -m voltwake.cli`` in a subprocess. Every case must
end in one of three ways:

* exit 0: the file is valid and the design closes; standard output is one JSON object;
* exit 2: the documented configuration error, one line on standard error starting with
  ``voltwake: error:`` and naming the file, and, when the error is about a key, its line,
  its dotted key path and what was expected;
* exit 3: the file is valid but the design does not close; one line on standard error.

Never a traceback, never exit 1 (internal error), never a hang. The counts of every
outcome are printed at the end of the fuzzing test.

The oracle for lines is independent of the YAML reader (configuration.yamlio): each key line is
taken from PyYAML's own composer (``yaml.compose``) run on the mutated text.
"""

import collections
import contextlib
import dataclasses
import json
import math
import os
import re
import signal
import subprocess
import sys
import time
import tracemalloc
import warnings

import pytest
import yaml
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from voltwake.cli import main
from voltwake.configuration import yamlio
from voltwake.configuration.loader import demo_path, field_at, load_config
from voltwake.errors import EXIT_BAD_INPUT, EXIT_NOT_CLOSED, EXIT_OK, ConfigError

DEMOS = {'turbo': demo_path('turbo_electric'), 'conventional': demo_path('conventional')}

#: Examples drawn by hypothesis (each one case; at least 500 are required).
MAX_EXAMPLES = 640
#: Largest number of distinct valid designs analysed in-process (about 0.1-0.3 s each).
MAX_ANALYSES = 120
#: Cases also run through ``python -m voltwake.cli`` (in parallel, after the fuzzing), by
#: outcome.
SUBPROCESS_QUOTA = {'exit 0': 1, 'exit 3': 1, 'exit 2': 4}
#: Seconds one case may take before it counts as a hang.
CASE_TIMEOUT = 30


# --- the demos as PyYAML composes them -------------------------------------------------------


@dataclasses.dataclass(frozen=True)
class Entry:
    """One key of a demo, with the character spans of its key and value in the text."""

    path: tuple
    key_start: int
    key_end: int
    value_start: int
    value_end: int
    line: int  # 1-based line of the key
    flow: bool  # inside a flow mapping {...}
    block_collection: bool

    @property
    def dotted(self):
        return '.'.join(self.path)


def _line_start(text, index):
    return text.rfind('\n', 0, index) + 1


def _line_end(text, index):
    end = text.find('\n', index)
    return len(text) if end < 0 else end + 1


def _entries(text):
    """Every mapping key of ``text``, from PyYAML's composer."""
    out = []

    def walk(node, path, flow):
        for key, value in node.value:
            path_here = path + (key.value,)
            block = (
                isinstance(value, (yaml.MappingNode, yaml.SequenceNode)) and not value.flow_style
            )
            end = value.end_mark.index
            # A block collection ends where the next token starts: keep that line whole.
            if block and not text[_line_start(text, end) : end].strip():
                end = _line_start(text, end)
            out.append(
                Entry(
                    path_here,
                    key.start_mark.index,
                    key.end_mark.index,
                    value.start_mark.index,
                    end,
                    key.start_mark.line + 1,
                    flow,
                    block,
                )
            )
            if isinstance(value, yaml.MappingNode):
                walk(value, path_here, bool(value.flow_style))

    walk(yaml.compose(text, Loader=yaml.SafeLoader), (), False)
    return out


def _read(path):
    with open(path, encoding='utf-8') as handle:
        return handle.read()


TEXTS = {name: _read(path) for name, path in DEMOS.items()}
ENTRIES = {name: _entries(text) for name, text in TEXTS.items()}
#: Keys whose values the schema checks (the ones worth most of the value mutations).
CHECKED = {
    name: [e for e in entries if field_at(e.dotted) is not None]
    for name, entries in ENTRIES.items()
}
SECTIONS = {name: [e for e in entries if len(e.path) == 1] for name, entries in ENTRIES.items()}


class _Loader(yaml.SafeLoader):
    """PyYAML's safe loader, reading ``1e-8`` as a float as YAML 1.2 does (and voltwake)."""


# YAML 1.2 core schema, 10.3.2 (yaml.org/spec/1.2.2): a float needs no dot before an exponent.
_Loader.add_implicit_resolver(
    'tag:yaml.org,2002:float',
    re.compile(r'^[-+]?(?:[0-9][0-9_]*(?:\.[0-9_]*)?|\.[0-9_]+)[eE][-+]?[0-9]+$'),
    list('-+0123456789.'),
)


def shown_path(parts):
    """
    The dotted key path as error messages show it (see configuration.yamlio.key_path).

    A key that is empty, has spaces at either end or holds characters that are not printable
    is shown as its Python repr, so that the message stays on one line.
    """
    return '.'.join(p if p and p.isprintable() and p.strip() == p else repr(p) for p in parts)


def key_lines(text):
    """
    Return shown key path -> (lines of the key, lines of its value), or None.

    Taken from PyYAML's composer, independently of configuration.yamlio. None when PyYAML
    cannot compose the text (or it is too large to walk).
    """
    loader = None
    try:
        loader = _Loader(text)
        root = loader.get_single_node()
    except (yaml.YAMLError, RecursionError):
        return None
    finally:
        if loader is not None:
            loader.dispose()

    def name(key):
        # Keys are compared as text: '~' is 'None', '1e3' is '1000.0' (as voltwake reads).
        try:
            return str(loader.construct_object(key))
        except Exception:  # noqa: BLE001 - a key PyYAML cannot construct keeps its text
            return key.value

    lines = collections.defaultdict(lambda: (set(), set()))
    budget = [200_000]

    def walk(node, path):
        budget[0] -= 1
        if budget[0] < 0:
            raise OverflowError
        if isinstance(node, yaml.MappingNode):
            for key, value in node.value:
                if isinstance(key, yaml.ScalarNode):
                    sub = path + (name(key),)
                    keys, values = lines[shown_path(sub)]
                    keys.add(key.start_mark.line + 1)
                    values.add(value.start_mark.line + 1)
                    walk(value, sub)
        elif isinstance(node, yaml.SequenceNode):
            for i, item in enumerate(node.value):
                sub = path + (str(i),)
                lines[shown_path(sub)][1].add(item.start_mark.line + 1)
                walk(item, sub)

    if root is None:
        return {}
    try:
        walk(root, ())
    except (OverflowError, RecursionError):
        return None
    return dict(lines)


# --- mutations ---------------------------------------------------------------------------------


@dataclasses.dataclass
class Case:
    """One mutated file: its bytes, what was done, and the key path it was done to."""

    family: str
    what: str
    content: bytes
    path: str = None  # dotted key path the mutation is about (None: file-level)
    new_path: str = None  # for a renamed or moved key: where it went
    duplicate_of: int = None  # for a duplicated key: line of the first one


def _utf8(text):
    return text.encode('utf-8', 'surrogatepass')


def _number_of(entry, text):
    """The number at the start of a scalar value ('1500 nmi' -> 1500.0), or 1.0."""
    try:
        return float(text[entry.value_start : entry.value_end].split()[0])
    except (ValueError, IndexError):
        return 1.0


def _yaml_float(x):
    if math.isnan(x):
        return '.nan'
    if math.isinf(x):
        return '.inf' if x > 0 else '-.inf'
    return repr(x)


#: Values of the wrong type or hostile YAML, as written in a file.
WRONG_TYPE = [
    'ten',
    '"10.5"',
    'true',
    'no',
    'off',
    '~',
    'null',
    '[]',
    '[1, 2]',
    '{}',
    '{a: 1}',
    '2020-01-01',
    '2020-02-30',
    "''",
    '""',
    '0x10',
    '0o17',
    '1_000',
    '12:30:00',
    '!!binary aGVsbG8=',
    '!!set {a: null}',
    '!!float abc',
    '!!int ""',
    '!!bool maybe',
    '!!timestamp xyz',
    '!!timestamp 2020-13-45',
    '!!python/object:os.system x',
    '!custom 1',
    '*nowhere',
    '&here 5',
    '!!str 5',
    '!!null',
    '"\\x07"',
    '"line\\nbreak"',
    '"\\u2028"',
    '[1500, nmi]',
    '{value: 1500, units: nmi}',
    '- 5',
    '!!omap [{a: 1}]',
    '? x',
    '"\\ud800"',
    '|\n  text',
    '>\n  folded',
]
#: NaN, infinity and numbers too large for a float.
NONFINITE = [
    '.nan',
    '.NaN',
    '.inf',
    '-.inf',
    '+.inf',
    'nan',
    'inf',
    '1e400',
    '-1e400',
    '"nan m"',
    '"inf"',
    '"-inf kg"',
    '"1e400 m"',
    '"nan"',
    '!!float nan',
    '!!float .inf',
    '1' + '0' * 400,
    '1' + '0' * 5000,
    '0x' + 'f' * 4000,
    '-1e-400',
    '5e-324',
    '1e308',
]
#: Units of every dimension the schema uses, and some it does not.
UNITS = [
    'm',
    'ft',
    'nmi',
    'km',
    'kg',
    'lbm',
    's',
    'min',
    'h',
    'K',
    'degC',
    'W',
    'kW',
    'hp',
    'V',
    'A',
    'N',
    'lbf',
    'Pa',
    'MJ/kg',
    'kW/kg',
    'm**2',
    'kg/m**2',
    'A/mm**2',
    'kg/kW',
    'N/kW',
    'm/s',
    'kn',
    'Hz',
    'rad',
    'J',
    'ohm*m',
    'kg/m**3',
    'g/(kN*s)',
    '1/s',
]
#: Unit strings that no unit system should accept (some would be code if evaluated).
GARBAGE_UNITS = [
    'furlongs',
    'm**',
    'm/',
    '(m',
    'm)',
    'm m',
    'kg/m**3**2',
    '__import__("os")',
    'os.system',
    'm**99',
    'm^2',
    'm\u00b2',
    '\u00b5m',
    'kg*',
    '*kg',
    'km/h/h',
    ')',
    'm**(2)',
    '((m))',
    'K**1000',
    'e',
    'pi',
    'nan',
    'inf',
    'True',
    'None',
    'x' * 100,
    'm\tm',
    '9**9**9',
    '1/0',
    '0/m',
    'm**-1',
    '%',
    '$',
    'm;kg',
    'm,kg',
    'm kg',
    '-m',
]


def _quoted(text, ascii_only=True):
    """A YAML double-quoted scalar (JSON escapes are YAML escapes)."""
    return json.dumps(text, ensure_ascii=ascii_only)


@st.composite
def value_texts(draw, entry, text):
    """A replacement for the value of ``entry``: wrong type, non-finite, sign, size, units."""
    number = _number_of(entry, text)
    field = field_at(entry.dotted)
    units = field.units if field is not None else None
    kind = draw(
        st.sampled_from(
            [
                'wrong_type',
                'nonfinite',
                'zero_negative',
                'huge_tiny',
                'float',
                'integer',
                'wrong_units',
                'garbage_units',
                'random_text',
                'random_units',
            ]
        )
    )
    if kind == 'wrong_type':
        return kind, draw(st.sampled_from(WRONG_TYPE))
    if kind == 'nonfinite':
        return kind, draw(st.sampled_from(NONFINITE))
    if kind == 'zero_negative':
        options = [
            '0',
            '0.0',
            '-0.0',
            '-1',
            _yaml_float(-abs(number)),
            f'"0 {units or ""}"',
            f'"-{abs(number):g} {units or ""}"',
        ]
        return kind, draw(st.sampled_from(options))
    if kind == 'huge_tiny':
        options = [
            '1e300',
            '-1e300',
            '1e-300',
            _yaml_float(number * 1e6),
            _yaml_float(number * 1e-6),
            '123456789012345678901234567890',
            f'"1e300 {units or ""}"',
            f'"1e-300 {units or ""}"',
            f'"1e308 {units or ""}"',
        ]
        return kind, draw(st.sampled_from(options))
    if kind == 'float':
        return kind, _yaml_float(draw(st.floats(width=64)))
    if kind == 'integer':
        return kind, str(draw(st.integers(min_value=-(10**40), max_value=10**40)))
    if kind == 'wrong_units':
        unit = draw(st.sampled_from(UNITS))
        return kind, _quoted(f'{number:g} {unit}') if draw(st.booleans()) else f'{number:g} {unit}'
    if kind == 'garbage_units':
        return kind, _quoted(f'{number:g} {draw(st.sampled_from(GARBAGE_UNITS))}')
    if kind == 'random_units':
        return kind, _quoted(
            f'{number:g} {draw(st.text(max_size=12))}', ascii_only=draw(st.booleans())
        )
    return kind, _quoted(draw(st.text(max_size=30)), ascii_only=draw(st.booleans()))


def _replace_value(text, entry, new):
    if entry.block_collection:
        # 'key:\n  a: 1\n  b: 2\n' -> 'key: new\n'
        return text[: entry.key_end] + f': {new}\n' + text[entry.value_end :]
    return text[: entry.value_start] + new + text[entry.value_end :]


def _drop(text, entry):
    if entry.flow:
        start, end = entry.key_start, entry.value_end
        rest = text[end:]
        if rest.lstrip(' ').startswith(','):
            end += len(rest) - len(rest.lstrip(' ')) + 1
            end += len(text[end:]) - len(text[end:].lstrip(' '))
        else:
            before = text[:start].rstrip(' ')
            if before.endswith(','):
                start = len(before) - 1
        return text[:start] + text[end:]
    start = _line_start(text, entry.key_start)
    end = entry.value_end if entry.block_collection else _line_end(text, entry.value_end)
    return text[:start] + text[end:]


def _duplicate(text, entry):
    """Repeat a key (with its value) right after it; return text and line of the copy."""
    if entry.flow:
        copy = ', ' + text[entry.key_start : entry.value_end]
        return text[: entry.value_end] + copy + text[entry.value_end :], entry.line
    start = _line_start(text, entry.key_start)
    end = entry.value_end if entry.block_collection else _line_end(text, entry.value_end)
    block = text[start:end]
    if not block.endswith('\n'):
        block = '\n' + block
    return text[:end] + block + text[end:], text[:end].count('\n') + 1


_TYPO_CHARS = 'abcdefghijklmnopqrstuvwxyz_'


@st.composite
def typos(draw, key):
    """A misspelling of ``key`` (letters and underscores only, never ``key`` itself)."""
    op = draw(
        st.sampled_from(['delete', 'insert', 'swap', 'replace', 'upper', 'suffix', 'dash', 'space'])
    )
    i = draw(st.integers(0, len(key) - 1))
    char = draw(st.sampled_from(_TYPO_CHARS))
    if op == 'delete' and len(key) > 1:
        new = key[:i] + key[i + 1 :]
    elif op == 'insert':
        new = key[:i] + char + key[i:]
    elif op == 'swap' and i + 1 < len(key):
        new = key[:i] + key[i + 1] + key[i] + key[i + 2 :]
    elif op == 'replace':
        new = key[:i] + char + key[i + 1 :]
    elif op == 'upper':
        new = key[:i] + key[i].upper() + key[i + 1 :]
    elif op == 'dash':
        new = key.replace('_', '-') if '_' in key else key + '-'
    elif op == 'space':
        new = key.replace('_', ' ', 1) if '_' in key else key + ' x'
    else:
        new = key + 's'
    if new == key:
        new = key + '_'
    return new


@st.composite
def value_cases(draw):
    demo = draw(st.sampled_from(sorted(DEMOS)))
    text = TEXTS[demo]
    pool = CHECKED[demo] if draw(st.integers(0, 4)) else ENTRIES[demo]
    entry = draw(st.sampled_from(pool))
    kind, new = draw(value_texts(entry, text))
    return Case(
        'value',
        f'{demo}: {entry.dotted} = {new[:60]!r} ({kind})',
        _utf8(_replace_value(text, entry, new)),
        path=entry.dotted,
    )


#: Keys of the optional sections with defaults, absent from both demos.
OPTIONAL = [
    'solver.max_iterations',
    'solver.tolerance',
    'performance.throttle_ratio',
    'performance.takeoff_max_lift_coefficient',
    'performance.residual_climb_rate',
    'performance.buffet_margin_load_factor',
    'performance.motor_power_limit',
    'performance.aft_fan_max_diameter_ratio',
]


@st.composite
def optional_cases(draw):
    """An optional section added at the end, with one key set to a mutated value."""
    demo = draw(st.sampled_from(sorted(DEMOS)))
    dotted = draw(st.sampled_from(OPTIONAL))
    section, key = dotted.split('.')
    default = field_at(dotted).default
    text = TEXTS[demo] + f'\n{section}:\n  {key}: {default!r}\n'
    entry = next(e for e in _entries(text) if e.dotted == dotted)
    kind, new = draw(value_texts(entry, text))
    return Case(
        'optional',
        f'{demo}: add {dotted} = {new[:60]!r} ({kind})',
        _utf8(_replace_value(text, entry, new)),
        path=dotted,
    )


@st.composite
def drop_cases(draw):
    demo = draw(st.sampled_from(sorted(DEMOS)))
    entry = draw(st.sampled_from(ENTRIES[demo]))
    return Case(
        'drop', f'{demo}: drop {entry.dotted}', _utf8(_drop(TEXTS[demo], entry)), path=entry.dotted
    )


@st.composite
def rename_cases(draw):
    demo = draw(st.sampled_from(sorted(DEMOS)))
    entry = draw(st.sampled_from(ENTRIES[demo]))
    key = entry.path[-1]
    if draw(st.integers(0, 3)):
        new_key = draw(typos(key))
    else:
        # Keys only a quoted YAML string can hold: line breaks, control characters, spaces.
        new_key = draw(
            st.sampled_from(
                [
                    key + '\n',
                    '\t' + key,
                    key + '\x1b[0m',
                    '',
                    key + '\u2028',
                    ' ' + key,
                    key + '\x85',
                    '\x00',
                    key + '\r',
                    key + '\x0c',
                    key + '\ufeff',
                ]
            )
        )
    text = TEXTS[demo]
    plain = new_key and new_key.isprintable() and new_key.strip() == new_key
    written = new_key if plain else _quoted(new_key)
    mutated = text[: entry.key_start] + written + text[entry.key_end :]
    return Case(
        'rename',
        f'{demo}: rename {entry.dotted} -> {new_key!r}',
        _utf8(mutated),
        path=entry.dotted,
        new_path=shown_path(entry.path[:-1] + (new_key,)),
    )


@st.composite
def duplicate_cases(draw):
    demo = draw(st.sampled_from(sorted(DEMOS)))
    entry = draw(st.sampled_from(ENTRIES[demo]))
    mutated, _ = _duplicate(TEXTS[demo], entry)
    return Case(
        'duplicate',
        f'{demo}: duplicate {entry.dotted}',
        _utf8(mutated),
        path=entry.dotted,
        duplicate_of=entry.line,
    )


@st.composite
def section_cases(draw):
    """A whole section replaced by a scalar or list, or a key moved to another section."""
    demo = draw(st.sampled_from(sorted(DEMOS)))
    text = TEXTS[demo]
    sections = [e for e in SECTIONS[demo] if e.block_collection]
    if draw(st.booleans()):
        entry = draw(st.sampled_from(SECTIONS[demo]))
        new = draw(
            st.sampled_from(
                ['5', '~', '[1, 2]', '{}', 'yes', '"wing"', '[]', '{area: 122}', '!!set {a: null}']
            )
        )
        return Case(
            'section',
            f'{demo}: section {entry.dotted} = {new!r}',
            _utf8(_replace_value(text, entry, new)),
            path=entry.dotted,
        )
    entry = draw(st.sampled_from([e for e in CHECKED[demo] if len(e.path) == 2 and not e.flow]))
    target = draw(st.sampled_from([s for s in sections if s.path[0] != entry.path[0]]))
    line = text[_line_start(text, entry.key_start) : _line_end(text, entry.value_end)]
    dropped = _drop(text, entry)
    # Insert the key as the first one of the target section.
    anchor = dropped.index(f'\n{target.path[0]}:\n') + len(f'\n{target.path[0]}:\n')
    mutated = dropped[:anchor] + line.rstrip('\n') + '\n' + dropped[anchor:]
    return Case(
        'section',
        f'{demo}: move {entry.dotted} to {target.dotted}',
        _utf8(mutated),
        path=entry.dotted,
        new_path=f'{target.dotted}.{entry.path[-1]}',
    )


@st.composite
def syntax_cases(draw):
    """The text broken as a person or a bad editor might break it."""
    demo = draw(st.sampled_from(sorted(DEMOS)))
    text = TEXTS[demo]
    lines = text.split('\n')
    op = draw(
        st.sampled_from(
            [
                'delete_colon',
                'unbalanced',
                'indent',
                'tab',
                'delete_char',
                'insert_text',
                'truncate',
                'duplicate_line',
                'delete_line',
                'swap_lines',
                'line_endings',
                'special',
            ]
        )
    )
    if op == 'delete_colon':
        colons = [i for i, c in enumerate(text) if c == ':']
        i = draw(st.sampled_from(colons))
        return Case('syntax', f'{demo}: delete the colon at {i}', _utf8(text[:i] + text[i + 1 :]))
    if op == 'unbalanced':
        entry = draw(st.sampled_from([e for e in ENTRIES[demo] if not e.block_collection]))
        mark = draw(
            st.sampled_from(
                [
                    '[',
                    '{',
                    '"',
                    "'",
                    ']',
                    '}',
                    '[[',
                    '{a: ',
                    '"\\',
                    '`',
                    '|',
                    '>',
                    '&',
                    '*',
                    '!',
                    '%',
                    '@',
                ]
            )
        )
        at = entry.value_start if draw(st.booleans()) else entry.value_end
        return Case(
            'syntax', f'{demo}: {mark!r} at {entry.dotted}', _utf8(text[:at] + mark + text[at:])
        )
    if op in ('indent', 'tab'):
        i = draw(st.sampled_from([n for n, line in enumerate(lines) if line.strip()]))
        line = lines[i]
        body = line.lstrip(' ')
        if op == 'tab':
            new = '\t' + body
        else:
            shift = draw(st.sampled_from([-3, -2, -1, 1, 2, 3]))
            new = ' ' * max(0, len(line) - len(body) + shift) + body
        return Case(
            'syntax',
            f'{demo}: line {i + 1} re-indented as {new[:20]!r}',
            _utf8('\n'.join(lines[:i] + [new] + lines[i + 1 :])),
        )
    if op == 'delete_char':
        i = draw(st.integers(0, len(text) - 1))
        return Case('syntax', f'{demo}: delete {text[i]!r} at {i}', _utf8(text[:i] + text[i + 1 :]))
    if op == 'insert_text':
        i = draw(st.integers(0, len(text)))
        new = draw(st.text(min_size=1, max_size=8))
        return Case('syntax', f'{demo}: insert {new!r} at {i}', _utf8(text[:i] + new + text[i:]))
    if op == 'truncate':
        i = draw(st.integers(1, len(text) - 1))
        return Case('syntax', f'{demo}: cut at {i}', _utf8(text[:i]))
    if op == 'duplicate_line':
        i = draw(st.integers(0, len(lines) - 1))
        return Case(
            'syntax', f'{demo}: line {i + 1} twice', _utf8('\n'.join(lines[: i + 1] + lines[i:]))
        )
    if op == 'delete_line':
        i = draw(st.integers(0, len(lines) - 1))
        return Case(
            'syntax', f'{demo}: delete line {i + 1}', _utf8('\n'.join(lines[:i] + lines[i + 1 :]))
        )
    if op == 'swap_lines':
        i = draw(st.integers(0, len(lines) - 2))
        j = draw(st.integers(i + 1, len(lines) - 1))
        swapped = list(lines)
        swapped[i], swapped[j] = swapped[j], swapped[i]
        return Case('syntax', f'{demo}: swap lines {i + 1} and {j + 1}', _utf8('\n'.join(swapped)))
    if op == 'line_endings':
        ending = draw(st.sampled_from(['\r\n', '\r', '\u2028', '\x85', '\x0c\n']))
        return Case('syntax', f'{demo}: line endings {ending!r}', _utf8(text.replace('\n', ending)))
    i = draw(st.integers(0, len(lines) - 1))
    snippet = draw(
        st.sampled_from(
            [
                '---',
                '...',
                '%YAML 1.1',
                '%YAML 2.0',
                '&anchor',
                '*alias',
                '? ',
                '- ',
                '!!map',
                '|',
                '>',
                '@',
                '`',
                '%',
                '<<: *x',
                '<<: {a: 1}',
                '\ufeff',
                '#',
                'x: &a [*a]',
                'key: !!python/tuple [1]',
            ]
        )
    )
    return Case(
        'syntax',
        f'{demo}: {snippet!r} before line {i + 1}',
        _utf8('\n'.join(lines[:i] + [snippet + lines[i]] + lines[i + 1 :])),
    )


def _laughs(levels):
    rows = ['a0: &a0 [x, x, x, x, x, x, x, x, x, x]']
    rows += [f'a{i}: &a{i} [' + ', '.join([f'*a{i - 1}'] * 10) + ']' for i in range(1, levels + 1)]
    return '\n'.join(rows) + '\n'


_WHOLE = {
    'empty': b'',
    'blank lines': b'\n\n\n',
    'spaces': b'   \n  \n',
    'comment': b'# nothing\n',
    'document start': b'---\n',
    'document end': b'...\n',
    'null': b'~\n',
    'list': b'- a\n- b\n',
    'flow list': b'[]\n',
    'flow mapping': b'{}\n',
    'scalar': b'just text\n',
    'number': b'42\n',
    'two documents': b'a: 1\n---\nb: 2\n',
    'directive only': b'%YAML 1.1\n---\n',
    'alias bomb': _laughs(9).encode(),
    'small aliases': _laughs(2).encode(),
    'deep nesting': b'a: ' + b'[' * 500 + b']' * 500 + b'\n',
    'long line': b'aircraft: ' + b'x' * 200_000 + b'\n',
    'many keys': b''.join(b'k%d: %d\n' % (i, i) for i in range(20_000)),
    'utf-16': TEXTS['turbo'].encode('utf-16'),
    'latin-1': ('aircraft: caf\u00e9\n' + TEXTS['conventional'].split('\n', 5)[5]).encode(
        'latin-1'
    ),
    'bom': b'\xef\xbb\xbf' + _utf8(TEXTS['conventional']),
    'nul inside': _utf8(TEXTS['turbo']).replace(b'range:', b'ran\x00ge:', 1),
    'over the size limit': b'#' * (yamlio.MAX_FILE_BYTES + 1),
}


@st.composite
def whole_file_cases(draw):
    kind = draw(
        st.sampled_from(sorted(_WHOLE) + ['random bytes with NUL', 'random bytes', 'random text'])
    )
    if kind == 'random bytes with NUL':
        data = draw(st.binary(max_size=400))
        i = draw(st.integers(0, len(data)))
        return Case('whole_file', kind, data[:i] + b'\x00' + data[i:])
    if kind == 'random bytes':
        return Case('whole_file', kind, draw(st.binary(min_size=1, max_size=400)))
    if kind == 'random text':
        return Case('whole_file', kind, _utf8(draw(st.text(min_size=1, max_size=200))))
    return Case('whole_file', kind, _WHOLE[kind])


FAMILIES = {
    'value': value_cases(),
    'optional': optional_cases(),
    'drop': drop_cases(),
    'rename': rename_cases(),
    'duplicate': duplicate_cases(),
    'section': section_cases(),
    'syntax': syntax_cases(),
    'whole_file': whole_file_cases(),
}
#: Draw weights of the families (values are the largest space).
WEIGHTS = {
    'value': 6,
    'optional': 1,
    'drop': 2,
    'rename': 2,
    'duplicate': 2,
    'section': 2,
    'syntax': 5,
    'whole_file': 2,
}
CASES = st.sampled_from([name for name, w in WEIGHTS.items() for _ in range(w)]).flatmap(
    FAMILIES.__getitem__
)


# --- the oracle --------------------------------------------------------------------------------


class CaseTimeout(BaseException):
    """A case ran longer than :data:`CASE_TIMEOUT` (a BaseException: nothing may catch it)."""


@contextlib.contextmanager
def time_limit(seconds):
    def stop(signum, frame):
        raise CaseTimeout(f'no result within {seconds} s')

    previous = signal.signal(signal.SIGALRM, stop)
    signal.alarm(seconds)
    try:
        yield
    finally:
        signal.alarm(0)
        signal.signal(signal.SIGALRM, previous)


def _decoded(content):
    """The text PyYAML would see, or None for files refused before parsing."""
    if b'\x00' in content or len(content) > yamlio.MAX_FILE_BYTES:
        return None
    try:
        return content.decode('utf-8')
    except UnicodeDecodeError:
        return None


def _parent(dotted):
    return dotted.rsplit('.', 1)[0] if '.' in dotted else None


def error_problems(err, file, case):
    """Return what is wrong with a ConfigError raised for ``case`` (empty when it is right)."""
    problems = []
    message = err.message
    if len(message.splitlines()) != 1 or '\n' in message:
        problems.append('message is not one line')
    if err.source != file or not message.startswith(file):
        problems.append('message does not start with the file name')
    where = file if err.line is None else f'{file}:{err.line}'
    head = f'{where}: {err.path}: ' if err.path else f'{where}: '
    if not message.startswith(head):
        problems.append(f'message does not start with {head!r}')
    text = _decoded(case.content)
    if text is not None and err.line is not None and not (1 <= err.line <= text.count('\n') + 2):
        problems.append(f'line {err.line} is outside the file')
    lines = key_lines(text) if text is not None else None
    if text is not None and lines is None and err.line is None:
        problems.append('YAML that PyYAML cannot compose, but no line in the error')
    if err.path and lines is not None:
        # The error is about a key: its line, and what was expected.
        if err.path in lines:
            wanted = set.union(*lines[err.path])
            if err.line not in wanted:
                problems.append(f'line {err.line}, but {err.path} is on line(s) {sorted(wanted)}')
        else:
            parent = _parent(err.path)
            while parent is not None and parent not in lines:
                parent = _parent(parent)
            wanted = lines[parent][0] if parent is not None else {None}
            if err.line not in wanted:
                problems.append(
                    f'line {err.line} for the missing key {err.path}; expected '
                    f'the line of its section {sorted(wanted, key=str)}'
                )
        if 'expected' not in err.detail and not err.detail.startswith('duplicate key'):
            problems.append('message does not say what was expected')
    if lines is not None and case.path is not None:
        problems += _targeted_problems(err, case, lines)
    return problems


def _targeted_problems(err, case, lines):
    """The error of a one-key mutation must be about that key."""
    path = err.path or ''
    if case.family == 'duplicate':
        ok = (
            path == case.path
            and err.detail.startswith('duplicate key')
            and f'first given on line {case.duplicate_of})' in err.detail
            and err.line == max(lines.get(case.path, ({0},))[0])
        )
        return [] if ok else [f'expected the duplicate of {case.path} with both lines']
    if case.family == 'rename':
        ok = _parent(path) == _parent(case.new_path) and (
            'unknown key' in err.detail or err.detail.startswith('duplicate key')
        )
        return [] if ok else [f'expected an unknown key next to {case.path}']
    allowed = {case.path}
    if case.new_path:
        allowed.add(case.new_path)
    if case.path in ('aft_fan', 'electrical'):
        allowed |= {'aft_fan', 'electrical'}
    if path in allowed or any(path.startswith(p + '.') for p in allowed):
        return []
    # A section left without keys by a drop or a move is empty (null): the error is about it.
    parent = _parent(case.path)
    while case.family in ('drop', 'section') and parent is not None:
        if path == parent:
            return []
        parent = _parent(parent)
    # Hostile YAML in the new value (tags, aliases) may be refused before validation.
    if err.line is not None and err.path is None:
        return []
    return [f'error about {err.path!r}, expected one about {sorted(allowed)}']


def _cut(text):
    """Start and end of a long text, for a failure message."""
    return text if len(text) <= 400 else f'{text[:200]} [...] {text[-200:]}'


class Fuzzer:
    """Runs the cases and keeps the counts."""

    def __init__(self, directory, capfd):
        self.directory = directory
        self.capfd = capfd
        self.outcomes = collections.Counter()
        self.families = collections.Counter()
        self.problems = []
        self.designs = {}
        self.subprocess_cases = []
        self.count = 0
        self._last = None

    def cli(self, file):
        """Run ``voltwake analyze FILE --json``; return exit code, stdout and stderr."""
        self.capfd.readouterr()
        with warnings.catch_warnings(record=True) as caught:
            # pytest keeps warnings off stderr; a real run prints them with Python's default
            # filters (every category but the deprecation, import and resource ones).
            warnings.simplefilter('always')
            for category in (
                DeprecationWarning,
                PendingDeprecationWarning,
                ImportWarning,
                ResourceWarning,
            ):
                warnings.simplefilter('ignore', category)
            code = main(['analyze', file, '--json'])
        out, err = self.capfd.readouterr()
        err += ''.join(
            warnings.formatwarning(w.message, w.category, w.filename, w.lineno) for w in caught
        )
        return code, out, err

    def run(self, case):
        self.count += 1
        self.families[case.family] += 1
        file = os.path.join(self.directory, f'case_{self.count:04d}.yaml')
        with open(file, 'wb') as handle:
            handle.write(case.content)
        try:
            with time_limit(CASE_TIMEOUT):
                outcome, problems = self._check(case, file)
        except CaseTimeout as stop:
            outcome, problems = 'other', [str(stop)]
        except Exception as err:  # noqa: BLE001 - every escape is a finding, recorded
            outcome, problems = 'other', [f'{type(err).__name__}: {err}'[:300]]
        self.outcomes[outcome] += 1
        if problems:
            self.problems.append(f'{case.family}: {case.what}: ' + '; '.join(problems))
        # For the subprocess run: one design that closes, one that does not, and clean
        # errors of different kinds of mutation.
        kept = [(o, f) for _, o, f, _ in self.subprocess_cases]
        keep = (
            not problems
            and outcome in SUBPROCESS_QUOTA
            and kept.count((outcome, case.family)) == 0
            and [o for o, _ in kept].count(outcome) < SUBPROCESS_QUOTA[outcome]
        )
        if keep:
            self.subprocess_cases.append((file, outcome, case.family, self._last))
        else:
            os.remove(file)

    def _check(self, case, file):
        try:
            config = load_config(file)
        except ConfigError as err:
            problems = error_problems(err, file, case)
            code, out, stderr = self.cli(file)
            self._last = (code, out, stderr)
            if code != EXIT_BAD_INPUT or out or stderr != f'voltwake: error: {err.message}\n':
                problems.append(
                    f'CLI gave exit {code}, stdout {out[:80]!r}, stderr '
                    f'{stderr[:200]!r} for {err.message[:120]!r}'
                )
            return ('exit 2' if not problems else 'other'), problems
        inputs = config.model_inputs()
        bad = [name for name, (value, _) in inputs.items() if not math.isfinite(value)]
        if bad:
            return 'other', [f'validated with non-finite inputs {bad}']
        design = (
            config.name,
            tuple(sorted(inputs.items())),
            tuple(sorted(config.model_options().items())),
        )
        if design not in self.designs:
            if len(self.designs) >= MAX_ANALYSES:
                return 'valid, not analysed', []
            self.designs[design] = self.cli(file)
        code, out, stderr = self._last = self.designs[design]
        if code == EXIT_OK:
            try:
                result = json.loads(out)
            except ValueError:
                return 'other', [f'exit 0 but stdout is not JSON: {out[:120]!r}']
            if stderr or not isinstance(result, dict) or result.get('converged') is not True:
                return 'other', [f'exit 0 with stderr {_cut(stderr)!r}']
            return 'exit 0', []
        lines = stderr.splitlines()
        if (
            code == EXIT_NOT_CLOSED
            and not out
            and len(lines) == 1
            and lines[0].startswith('voltwake: error: ')
            and 'Traceback' not in stderr
        ):
            return 'exit 3', []
        return 'other', [
            f'valid config gave exit {code} and {len(lines)} line(s) on stderr: {_cut(stderr)!r}'
        ]


def _run_subprocesses(cases):
    env = dict(os.environ, OPENMDAO_REPORTS='0')
    env.pop('VOLTWAKE_DEBUG', None)
    procs = [
        subprocess.Popen(
            [sys.executable, '-m', 'voltwake.cli', 'analyze', file, '--json'],
            stdout=subprocess.PIPE,
            stderr=subprocess.PIPE,
            text=True,
            env=env,
        )
        for file, *_ in cases
    ]
    results = []
    for proc in procs:
        out, err = proc.communicate(timeout=300)
        results.append((proc.returncode, out, err))
    return results


def test_fuzzed_configs_end_in_a_documented_way(tmp_path, capfd):
    fuzzer = Fuzzer(str(tmp_path), capfd)
    start = time.perf_counter()

    @settings(
        max_examples=MAX_EXAMPLES,
        derandomize=True,
        database=None,
        deadline=None,
        suppress_health_check=[
            HealthCheck.too_slow,
            HealthCheck.data_too_large,
            HealthCheck.filter_too_much,
            HealthCheck.large_base_example,
        ],
    )
    @given(case=CASES)
    def fuzz(case):
        fuzzer.run(case)

    fuzz()

    # The real entry point on a few of the cases, in parallel: same exit code and streams,
    # and never a traceback.
    for (file, outcome, _, (code, out, err)), (p_code, p_out, p_err) in zip(
        fuzzer.subprocess_cases, _run_subprocesses(fuzzer.subprocess_cases)
    ):
        if (
            (p_code, p_err) != (code, err)
            or 'Traceback' in p_err
            or (code == EXIT_OK and json.loads(p_out) != json.loads(out))
        ):
            fuzzer.problems.append(
                f'subprocess on {file} ({outcome}): exit {p_code}, '
                f'stderr {p_err[-300:]!r}; in-process stderr {err[-300:]!r}'
            )

    counts = fuzzer.outcomes
    summary = (
        f"config fuzzing: {fuzzer.count} cases, {counts['exit 2']} clean errors "
        f"(exit 2), {counts['exit 0']} analysed (exit 0), {counts['exit 3']} not closed "
        f"(exit 3), {counts['other']} other"
    )
    if counts['valid, not analysed']:
        summary += f", {counts['valid, not analysed']} valid but not analysed (budget)"
    summary += (
        f"; {len(fuzzer.designs)} distinct designs analysed, "
        f"{len(fuzzer.subprocess_cases)} cases also run in a subprocess, "
        f"{time.perf_counter() - start:.0f} s"
    )
    with capfd.disabled():
        print(f'\n{summary}')
        print('  by mutation: ' + ', '.join(f'{k} {v}' for k, v in sorted(fuzzer.families.items())))
    assert not fuzzer.problems, (
        f'{len(fuzzer.problems)} cases did not end in a documented '
        'way:\n' + '\n'.join(fuzzer.problems[:40])
    )
    assert fuzzer.count >= 500
    assert all(fuzzer.families[name] >= 20 for name in FAMILIES), fuzzer.families
    # Both kinds of ending were exercised, so the run measured something.
    assert counts['exit 2'] >= 100 and counts['exit 0'] >= 10
    assert len(fuzzer.subprocess_cases) >= 4


# --- direct tests ----------------------------------------------------------------------------


def _cli_error_line(capfd, file):
    capfd.readouterr()
    code = main(['analyze', file, '--json'])
    out, err = capfd.readouterr()
    assert code == EXIT_BAD_INPUT and out == ''
    lines = err.splitlines()
    assert len(lines) == 1 and lines[0].startswith(f'voltwake: error: {file}'), err
    return lines[0]


def test_billion_laughs_is_refused_with_little_memory(tmp_path, capfd):
    file = str(tmp_path / 'laughs.yaml')
    with open(file, 'w', encoding='utf-8') as handle:
        handle.write(_laughs(9))  # 10**9 nodes once expanded, a few hundred bytes
    tracemalloc.start()
    try:
        with pytest.raises(ConfigError) as info:
            load_config(file)
        _, peak = tracemalloc.get_traced_memory()
    finally:
        tracemalloc.stop()
    assert f'more than {yamlio.MAX_NODES} nodes' in info.value.message
    assert info.value.source == file and info.value.line is not None
    # Expanding even a tenth of the nodes would take gigabytes; the limit stops it early.
    assert peak < 50e6, peak
    _cli_error_line(capfd, file)


def test_file_above_the_size_limit_is_refused_unread(tmp_path, capfd):
    file = str(tmp_path / 'big.yaml')
    text = TEXTS['turbo']
    with open(file, 'w', encoding='utf-8') as handle:
        handle.write(text + '#' * (yamlio.MAX_FILE_BYTES - len(text.encode()) + 1) + '\n')
    tracemalloc.start()
    try:
        with pytest.raises(ConfigError) as info:
            load_config(file)
        _, peak = tracemalloc.get_traced_memory()
    finally:
        tracemalloc.stop()
    assert info.value.message == (
        f'{file}: file is {yamlio.MAX_FILE_BYTES + 2} bytes; the '
        f'limit is {yamlio.MAX_FILE_BYTES} bytes'
    )
    assert peak < yamlio.MAX_FILE_BYTES / 2, peak  # refused before it is read
    _cli_error_line(capfd, file)


@pytest.mark.parametrize(
    'section, key', [('wing', 'loading'), ('electrical', 'generator'), ('mission', None)]
)
def test_duplicate_keys_are_refused_naming_both_lines(tmp_path, capfd, section, key):
    text = TEXTS['turbo']
    entry = next(e for e in ENTRIES['turbo'] if e.path == ((section, key) if key else (section,)))
    mutated, second = _duplicate(text, entry)
    file = str(tmp_path / 'dup.yaml')
    with open(file, 'w', encoding='utf-8') as handle:
        handle.write(mutated)
    with pytest.raises(ConfigError) as info:
        load_config(file)
    err = info.value
    assert (err.line, err.path) == (second, entry.dotted)
    assert err.message == (
        f'{file}:{second}: {entry.dotted}: duplicate key (first given on line {entry.line})'
    )
    assert _cli_error_line(capfd, file) == f'voltwake: error: {err.message}'


def test_duplicate_key_inside_a_flow_mapping(tmp_path):
    text = TEXTS['turbo']
    entry = next(e for e in ENTRIES['turbo'] if e.dotted == 'electrical.motor.efficiency')
    mutated, line = _duplicate(text, entry)
    file = str(tmp_path / 'dup.yaml')
    with open(file, 'w', encoding='utf-8') as handle:
        handle.write(mutated)
    with pytest.raises(ConfigError) as info:
        load_config(file)
    assert info.value.message == (
        f'{file}:{line}: electrical.motor.efficiency: duplicate key '
        f'(first given on line {entry.line})'
    )
