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

from .errors import ConfigError

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
                raise ConfigError(f'nesting deeper than {MAX_DEPTH} levels; refusing it',
                                  source=self._source,
                                  line=self.peek_event().start_mark.line + 1)
            return super().compose_node(parent, index)
        finally:
            self._depth -= 1


# YAML 1.2 floats in exponent form that YAML 1.1 leaves as text: 1e-8, 2.5e3, .5E2.
_LineLoader.add_implicit_resolver(
    'tag:yaml.org,2002:float',
    re.compile(r'^[-+]?(?:[0-9][0-9_]*(?:\.[0-9_]*)?|\.[0-9_]+)[eE][-+]?[0-9]+$'),
    list('-+0123456789.'))


def _build(node, loader, path, lines, budget, source, active=None):
    budget[0] -= 1
    if budget[0] < 0:
        raise ConfigError(f'document expands to more than {MAX_NODES} nodes (alias expansion '
                          'too large); refusing it', source=source, line=node.start_mark.line + 1)
    if isinstance(node, (yaml.MappingNode, yaml.SequenceNode)):
        if node.tag not in _PLAIN_COLLECTIONS:
            raise ConfigError(f'unsupported tag {node.tag!r}; expected a plain mapping or list',
                              source=source, line=node.start_mark.line + 1,
                              path='.'.join(path) or None)
        active = set() if active is None else active
        if id(node) in active:
            raise ConfigError('recursive alias (a mapping or list contains itself)',
                              source=source, line=node.start_mark.line + 1,
                              path='.'.join(path) or None)
        active.add(id(node))
        try:
            return _build_collection(node, loader, path, lines, budget, source, active)
        finally:
            active.discard(id(node))
    try:
        return loader.construct_object(node)
    except ValueError:
        # Python refuses to read integers of more than a few thousand digits.
        raise ConfigError('a number with too many digits', source=source,
                          line=node.start_mark.line + 1, path='.'.join(path) or None) from None


def _build_collection(node, loader, path, lines, budget, source, active):
    if isinstance(node, yaml.MappingNode):
        out = {}
        for key_node, value_node in node.value:
            if not isinstance(key_node, yaml.ScalarNode):
                raise ConfigError('mapping keys must be plain words', source=source,
                                  line=key_node.start_mark.line + 1, path='.'.join(path) or None)
            if key_node.tag == 'tag:yaml.org,2002:merge':
                raise ConfigError('merge keys (<<) are not supported', source=source,
                                  line=key_node.start_mark.line + 1, path='.'.join(path) or None)
            key = str(_build(key_node, loader, path, lines, budget, source, active))
            sub = path + (key,)
            if key in out:
                raise ConfigError(f'duplicate key (first given on line {lines[sub]})',
                                  source=source, line=key_node.start_mark.line + 1,
                                  path='.'.join(sub))
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
    loader = _LineLoader(text, source)
    try:
        node = loader.get_single_node()
    except yaml.YAMLError as err:
        mark = getattr(err, 'problem_mark', None)
        line = mark.line + 1 if mark is not None else None
        problem = getattr(err, 'problem', None) or str(err).splitlines()[0]
        context = getattr(err, 'context', None)
        problem = f'{context}; {problem}' if context else problem
        raise ConfigError(f'not valid YAML: {problem}', source=source, line=line) from None
    finally:
        loader.dispose()
    if node is None or (isinstance(node, yaml.ScalarNode) and node.value == ''
                        and node.tag == 'tag:yaml.org,2002:null'):
        # No document at all, or a document marker with nothing under it ('---').
        raise ConfigError('the file is empty; expected a mapping of sections', source=source)
    lines = {}
    try:
        data = _build(node, loader, (), lines, [MAX_NODES], source)
    except yaml.YAMLError as err:
        mark = getattr(err, 'problem_mark', None)
        line = mark.line + 1 if mark is not None else None
        raise ConfigError(f'not valid YAML: {getattr(err, "problem", None) or str(err)}',
                          source=source, line=line) from None
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
    loader = _LineLoader(text, source)
    try:
        node = loader.get_single_node()
    except yaml.YAMLError:
        return text
    finally:
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
            raise ConfigError(f'file is {size} bytes; the limit is {MAX_FILE_BYTES} bytes',
                              source=source)
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
