"""
Run under ``mpiexec -n 2`` by tests/test_parallel_mpi.py (not a test module itself).

Usage: ``python mpi_jobs_script.py OUT TARGETS_JSON``. Every rank runs a small target sweep
of the packaged demo and a map_jobs call in which one item raises, both through
:func:`voltwake.studies.parallel.map_jobs` on the MPI ranks, and writes what it got to
``OUT.<rank>.json``.
"""

import json
import sys
import warnings

from voltwake.studies.parallel import is_root, map_jobs, mpi_comm
from voltwake.studies.target_sweep import target_sweep


def fail_on_odd(item):
    """Return ``item``; raise for odd items (the error must reach every rank)."""
    if item % 2:
        raise ValueError(f'item {item} fails')
    return item


def main(out, targets):
    """Run the jobs and write this rank's record."""
    warnings.filterwarnings('ignore')
    calls = []
    sweep = target_sweep(None, targets, progress=lambda *args: calls.append(list(args[:3])))
    try:
        map_jobs(fail_on_odd, range(4))
        error = None
    except ValueError as exc:
        error = str(exc)
    comm = mpi_comm()
    record = {
        'rank': comm.rank if comm else 0,
        'size': comm.size if comm else 1,
        'root': is_root(),
        'sweep': sweep,
        'progress': calls,
        'error': error,
    }
    with open(f'{out}.{record["rank"]}.json', 'w') as handle:
        json.dump(record, handle)


if __name__ == '__main__':
    main(sys.argv[1], json.loads(sys.argv[2]))
