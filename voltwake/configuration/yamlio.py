"""
Safe YAML reading that keeps line numbers and refuses hostile or ambiguous documents.

Only PyYAML's safe loader is used. On top of it this module refuses files above a
size limit, duplicate keys (PyYAML silently keeps the last one) and documents whose
alias expansion would explode (the "billion laughs" pattern), and records the line
of every key so that validation errors can point at it. Nesting deeper than a limit and
recursive aliases are refused too (they would otherwise exhaust Python's recursion limit).
Numbers in exponent form without a dot or an exponent sign (``1e-8``, ``2.5e3``) are read as
numbers, as YAML 1.2 does; YAML 1.1 (PyYAML's default) would read them as text.
"""

import os
import re

import yaml

from ..errors import ConfigError

#: Largest configuration file accepted, in bytes.
MAX_FILE_BYTES = 1_000_000
#: Largest number of nodes a document may expand to once aliases are followed.
MAX_NODES = 100_000
#: Deepest nesting of mappings and lists accepted.
MAX_DEPTH = 64
#: Tags of the collections accepted (no sets, ordered maps or application tags).
_PLAIN_COLLECTIONS = ('tag:yaml.org,2002:map', 'tag:yaml.org,2002:seq')


class _LineLoader(yaml.SafeLoader):
    """
    Safe loader that limits nesting; the composed node tree is walked by :func:`_build`.

    Parameters
    ----------
    stream : str
        The document.
    source : str
        Name used in error messages.
    """

    def __init__(self, stream, source='<string>'):
        super().__init__(stream)
        self._source = source
        self._depth = 0

    def compose_node(self, parent, index):
        """
        Compose one node, refusing nesting deeper than :data:`MAX_DEPTH`.

        Parameters
        ----------
        parent : yaml.Node or None
            The enclosing node.
        index : object
            Key or index of the node in its parent.

        Returns
        -------
        yaml.Node
            The composed node.
        """
        self._depth += 1
        try:
            if self._depth > MAX_DEPTH:
                raise ConfigError(
                    f'nesting deeper than {MAX_DEPTH} levels; refusing it',
                    source=self._source,
                    line=self.peek_event().start_mark.line + 1,
                )
            return super().compose_node(parent, index)
        finally:
            self._depth -= 1


# YAML 1.2 floats in exponent form that YAML 1.1 leaves as text: 1e-8, 2.5e3, .5E2.
_LineLoader.add_implicit_resolver(
    'tag:yaml.org,2002:float',
    re.compile(r'^[-+]?(?:[0-9][0-9_]*(?:\.[0-9_]*)?|\.[0-9_]+)[eE][-+]?[0-9]+$'),
    list('-+0123456789.'),
)


#: What PyYAML's safe constructors raise for a scalar that does not fit its type (e.g.
#: ``!!bool maybe`` -> KeyError, ``!!timestamp xyz`` -> AttributeError, ``!!int ""`` ->
#: IndexError, ``2020-02-30`` -> ValueError).
_CONSTRUCT_ERRORS = (ArithmeticError, AttributeError, LookupError, TypeError, ValueError)


def _show_text(text):
    """Return ``repr(text)`` cut to a length that fits an error line."""
    shown = repr(text)
    return shown if len(shown) <= 60 else shown[:57] + '...'


def key_path(parts):
    r"""
    Return the dotted key path of ``parts`` as shown in error messages, or None when empty.

    A key that is empty, has spaces at either end or holds characters that are not printable
    (line breaks, control characters) is shown as its Python repr, so that the message stays
    on one line and the key can be told apart.

    Parameters
    ----------
    parts : tuple of str
        The keys from the top of the document.

    Returns
    -------
    str or None
        E.g. ``'wing.area'`` or ``"wing.'area\n'"``.
    """
    shown = [
        part if part and part.isprintable() and part.strip() == part else repr(part)
        for part in map(str, parts)
    ]
    return '.'.join(shown) or None


def _yaml_problem(err, text):
    """Return (one-line problem, 1-based line or None) of a PyYAML error."""
    mark = getattr(err, 'problem_mark', None)
    if mark is not None:
        line = mark.line + 1
    elif isinstance(getattr(err, 'position', None), int) and isinstance(text, str):
        # A ReaderError (a character YAML does not allow) gives an index into the text.
        line = text.count('\n', 0, err.position) + 1
    else:
        line = None
    problem = getattr(err, 'problem', None) or str(err).splitlines()[0]
    context = getattr(err, 'context', None)
    problem = f'{context}; {problem}' if context else problem
    return ' '.join(problem.split()), line


def _build(node, loader, path, lines, budget, source, active=None):
    budget[0] -= 1
    if budget[0] < 0:
        raise ConfigError(
            f'document expands to more than {MAX_NODES} nodes (alias expansion '
            'too large); refusing it',
            source=source,
            line=node.start_mark.line + 1,
        )
    if isinstance(node, (yaml.MappingNode, yaml.SequenceNode)):
        if node.tag not in _PLAIN_COLLECTIONS:
            raise ConfigError(
                f'unsupported tag {node.tag!r}; expected a plain mapping or list',
                source=source,
                line=node.start_mark.line + 1,
                path=key_path(path),
            )
        active = set() if active is None else active
        if id(node) in active:
            raise ConfigError(
                'recursive alias (a mapping or list contains itself); expected '
                'a tree of mappings and lists',
                source=source,
                line=node.start_mark.line + 1,
                path=key_path(path),
            )
        active.add(id(node))
        try:
            return _build_collection(node, loader, path, lines, budget, source, active)
        finally:
            active.discard(id(node))
    try:
        return loader.construct_object(node)
    except yaml.YAMLError:
        raise
    except _CONSTRUCT_ERRORS as err:
        # Python refuses to read integers of more than a few thousand digits; explicit tags
        # (!!float, !!int, !!bool, !!timestamp) on text that is not of that type fail too.
        if 'digits' in str(err):
            problem = (
                'a number with too many digits; expected a number of ordinary size '
                '(a float reaches about 1.8e308)'
            )
        else:
            kind = node.tag.rpartition(':')[2] or node.tag
            problem = (
                f'got {_show_text(node.value)}, which YAML reads as a {kind} (!!{kind}) '
                f'but is not a valid one; expected a valid {kind}, or quotes around '
                'the value to keep it as text'
            )
        raise ConfigError(
            problem, source=source, line=node.start_mark.line + 1, path=key_path(path)
        ) from None


def _build_collection(node, loader, path, lines, budget, source, active):
    if isinstance(node, yaml.MappingNode):
        out = {}
        for key_node, value_node in node.value:
            if not isinstance(key_node, yaml.ScalarNode):
                raise ConfigError(
                    'mapping keys must be plain words; expected a word, not a list or mapping',
                    source=source,
                    line=key_node.start_mark.line + 1,
                    path=key_path(path),
                )
            if key_node.tag == 'tag:yaml.org,2002:merge':
                raise ConfigError(
                    'merge keys (<<) are not supported; expected plain keys',
                    source=source,
                    line=key_node.start_mark.line + 1,
                    path=key_path(path),
                )
            key = _build(key_node, loader, path, lines, budget, source, active)
            try:
                key = str(key)
            except ValueError:  # an integer key of more than a few thousand digits
                raise ConfigError(
                    'a key with too many digits; expected a plain word',
                    source=source,
                    line=key_node.start_mark.line + 1,
                    path=key_path(path),
                ) from None
            sub = path + (key,)
            if key in out:
                raise ConfigError(
                    f'duplicate key (first given on line {lines[sub]})',
                    source=source,
                    line=key_node.start_mark.line + 1,
                    path=key_path(sub),
                )
            lines[sub] = key_node.start_mark.line + 1
            out[key] = _build(value_node, loader, sub, lines, budget, source, active)
        return out
    items = []
    for i, item in enumerate(node.value):
        sub = path + (str(i),)
        lines[sub] = item.start_mark.line + 1
        items.append(_build(item, loader, sub, lines, budget, source, active))
    return items


def parse_yaml(text, source='<string>'):
    """
    Parse one YAML document safely, keeping the line of every key.

    Parameters
    ----------
    text : str
        The document.
    source : str
        Name used in error messages.

    Returns
    -------
    data : object
        The parsed document (dicts, lists, scalars).
    lines : dict
        Tuple key path -> 1-based line number.
    """
    loader = None
    try:
        # The reader checks every character when the loader is made: keep that inside.
        loader = _LineLoader(text, source)
        node = loader.get_single_node()
    except yaml.YAMLError as err:
        problem, line = _yaml_problem(err, text)
        raise ConfigError(f'not valid YAML: {problem}', source=source, line=line) from None
    finally:
        if loader is not None:
            loader.dispose()
    if node is None or (
        isinstance(node, yaml.ScalarNode)
        and node.value == ''
        and node.tag == 'tag:yaml.org,2002:null'
    ):
        # No document at all, or a document marker with nothing under it ('---').
        raise ConfigError('the file is empty; expected a mapping of sections', source=source)
    lines = {}
    try:
        data = _build(node, loader, (), lines, [MAX_NODES], source)
    except yaml.YAMLError as err:
        problem, line = _yaml_problem(err, text)
        raise ConfigError(f'not valid YAML: {problem}', source=source, line=line) from None
    return data, lines


def parse_value(text, source='--set'):
    """
    Parse one value given on the command line, with the rules and limits of this module.

    Text that is not valid YAML, or that is empty, is kept as the plain string.

    Parameters
    ----------
    text : str
        The value as typed, e.g. ``'0.8'``, ``'1500 nmi'`` or ``'{efficiency: 0.9}'``.
    source : str
        Name used in error messages.

    Returns
    -------
    object
        The value (number, string, bool, None, list or mapping).
    """
    loader = None
    try:
        loader = _LineLoader(text, source)
        node = loader.get_single_node()
    except yaml.YAMLError:
        return text
    finally:
        if loader is not None:
            loader.dispose()
    if node is None:
        return text
    try:
        return _build(node, loader, (), {}, [MAX_NODES], source)
    except yaml.YAMLError:
        return text


def read_yaml_file(path):
    """
    Read and parse a YAML file with the limits of this module.

    Parameters
    ----------
    path : str or os.PathLike
        The file.

    Returns
    -------
    data : object
        The parsed document.
    lines : dict
        Tuple key path -> 1-based line number.
    """
    source = os.fspath(path)
    try:
        size = os.path.getsize(source)
        if size > MAX_FILE_BYTES:
            raise ConfigError(
                f'file is {size} bytes; the limit is {MAX_FILE_BYTES} bytes', source=source
            )
        with open(source, 'rb') as handle:
            raw = handle.read()
    except OSError as err:
        raise ConfigError(f'cannot read the file ({err.strerror})', source=source) from None
    if b'\x00' in raw:
        raise ConfigError('binary file (contains NUL bytes); expected YAML text', source=source)
    try:
        text = raw.decode('utf-8')
    except UnicodeDecodeError:
        raise ConfigError('not UTF-8 text; expected a YAML file', source=source) from None
    return parse_yaml(text, source)
