"""Atomic writing of result files under a chosen output directory."""

import json
import os
import tempfile

import yaml

from .errors import ConfigError


def prepare_out_dir(path, force=False):
    """
    Create the results directory, refusing to reuse a non-empty one without ``force``.

    Parameters
    ----------
    path : str
        The directory.
    force : bool
        Allow writing into an existing non-empty directory.

    Returns
    -------
    str
        The absolute directory path.
    """
    path = os.path.abspath(path)
    if os.path.exists(path) and not os.path.isdir(path):
        raise ConfigError(f'--out {path!r} exists and is not a directory')
    if os.path.isdir(path) and os.listdir(path) and not force:
        raise ConfigError(
            f'--out {path!r} already holds results; expected a new or empty '
            'directory (or --force to overwrite)'
        )
    try:
        os.makedirs(path, exist_ok=True)
    except OSError as err:
        raise ConfigError(f'--out {path!r}: cannot create the directory ({err.strerror})') from None
    return path


def write_atomic(path, text):
    """
    Write ``text`` to ``path`` through a temporary file and a rename.

    Parameters
    ----------
    path : str
        Destination file.
    text : str
        Content.
    """
    folder = os.path.dirname(os.path.abspath(path))
    fd, tmp = tempfile.mkstemp(dir=folder, prefix='.tmp-', suffix=os.path.basename(path))
    try:
        with os.fdopen(fd, 'w', encoding='utf-8') as handle:
            handle.write(text)
        os.replace(tmp, path)
    except BaseException:
        if os.path.exists(tmp):
            os.remove(tmp)
        raise


def write_results(out_dir, name, data):
    """
    Write ``data`` as ``<name>.json`` and ``<name>.yaml`` in ``out_dir``, atomically.

    Parameters
    ----------
    out_dir : str
        The results directory.
    name : str
        Base file name.
    data : dict
        JSON-ready results.
    """
    write_atomic(
        os.path.join(out_dir, f'{name}.json'), json.dumps(data, indent=2, sort_keys=True) + '\n'
    )
    write_atomic(
        os.path.join(out_dir, f'{name}.yaml'),
        yaml.safe_dump(data, sort_keys=True, default_flow_style=False),
    )
