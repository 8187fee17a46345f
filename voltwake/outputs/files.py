"""Atomic writing of result files under a chosen output directory."""

import json
import os
import tempfile

import yaml

from ..errors import ConfigError


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


def current_umask():
    """
    Return the process's file-mode creation mask without changing it for long.

    Linux reports it in ``/proc/self/status``; elsewhere it is read by setting and
    restoring it (``os.umask`` has no read-only form).

    Returns
    -------
    int
        The umask, e.g. ``0o022``.
    """
    try:
        with open('/proc/self/status', encoding='ascii') as handle:
            for line in handle:
                if line.startswith('Umask:'):
                    return int(line.split()[1], 8)
    except (OSError, ValueError, IndexError):
        pass
    mask = os.umask(0o022)
    os.umask(mask)
    return mask


def write_atomic(path, text):
    """
    Write ``text`` to ``path`` through a temporary file and a rename.

    The temporary file of :func:`tempfile.mkstemp` is readable by its owner only (0600);
    before the rename it gets the mode any file the user writes gets, ``0o666 & ~umask``,
    so colleagues can read the results when the user's umask allows it.

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
        os.chmod(tmp, 0o666 & ~current_umask())
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
