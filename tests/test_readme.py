"""Every Python block of README.md runs as a user would run it: in a new process, elsewhere."""

import os
import re
import subprocess
import sys
from pathlib import Path

import pytest

README = Path(__file__).resolve().parents[1] / 'README.md'

#: A block whose first line starts with this comment is not run; the rest of the line says
#: why (for example, that it needs MPI or a file of the reader's own).
NOT_RUN = '# not run by the tests:'


def python_blocks(text):
    """
    Return the ```python blocks of a Markdown text.

    Parameters
    ----------
    text : str
        The Markdown document.

    Returns
    -------
    list of tuple
        (line of the opening fence, code) for every block, in order.
    """
    blocks = []
    for match in re.finditer(r'^```python[ \t]*\n(.*?)^```[ \t]*$', text, re.M | re.S):
        blocks.append((text.count('\n', 0, match.start()) + 1, match.group(1)))
    return blocks


def skip_reason(code):
    """
    Return why a block is not run, or None when it is run.

    Parameters
    ----------
    code : str
        The block.

    Returns
    -------
    str or None
        The reason given after :data:`NOT_RUN` on the block's first line.
    """
    first = code.lstrip().splitlines()[0] if code.strip() else ''
    if not first.startswith(NOT_RUN):
        return None
    reason = first[len(NOT_RUN) :].strip()
    if not reason:
        raise AssertionError(f'a block marked {NOT_RUN!r} must say why it is not run')
    return reason


BLOCKS = python_blocks(README.read_text(encoding='utf-8'))


def test_block_extraction_and_the_not_run_mark():
    text = (
        'intro\n```python\nprint(1)\n```\n\n```bash\nls\n```\n'
        f'```python\n{NOT_RUN} needs MPI\nimport mpi4py\n```\n'
    )
    blocks = python_blocks(text)
    assert blocks == [(2, 'print(1)\n'), (9, f'{NOT_RUN} needs MPI\nimport mpi4py\n')]
    assert skip_reason(blocks[0][1]) is None and skip_reason(blocks[1][1]) == 'needs MPI'
    with pytest.raises(AssertionError, match='must say why'):
        skip_reason(f'{NOT_RUN}\nimport mpi4py\n')


def test_the_readme_shows_the_python_api():
    code = '\n'.join(block for _, block in BLOCKS)
    for name in ('analyze', 'optimize', 'design_map', 'target_sweep', 'breakeven', 'monte_carlo'):
        assert f'voltwake.{name}(' in code, name


@pytest.mark.parametrize('line, code', BLOCKS, ids=[f'README.md:{line}' for line, _ in BLOCKS])
def test_readme_python_block_runs(line, code, tmp_path):
    reason = skip_reason(code)
    if reason:
        pytest.skip(f'README.md:{line} is marked as not run: {reason}')
    # From an empty directory, so that no block leans on files of the repository.
    proc = subprocess.run(
        [sys.executable, '-c', code],
        cwd=tmp_path,
        env=dict(os.environ, OPENMDAO_REPORTS='0'),
        capture_output=True,
        text=True,
        timeout=600,
        check=False,
    )
    assert proc.returncode == 0, f'README.md:{line}\n{code}\n{proc.stderr}'
