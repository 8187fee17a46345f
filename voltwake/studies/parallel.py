"""
Run independent jobs (one optimisation or analysis each) over local processes or MPI ranks.

:func:`map_jobs` is the one entry point: it applies a picklable top-level function to every
item and returns the results in item order, the same on every rank and for any number of
processes. Under MPI (``mpiexec -n N``, with mpi4py installed) the items are dealt round-robin
over the ranks; otherwise they go to a pool of local processes. :func:`is_root` tells which
process should write files, and :class:`ProgressBar` shows progress on stderr.

Every job runs with one BLAS thread when threadpoolctl is installed: the parallelism is
across jobs, threaded linear algebra in each would oversubscribe the cores, and the thread
count changes the rounding of the linear solves, so a job gives the same numbers whether it
runs in this process, in a pool process or on an MPI rank.
"""

import concurrent.futures
import contextlib
import multiprocessing
import os
import sys
import time

#: Message tag of the per-item progress notes that ranks send to rank 0.
_PROGRESS_TAG = 7411
#: Message tag of the results that ranks stream to rank 0 (:func:`stream_jobs`).
_RESULT_TAG = 7412


def mpi_comm():
    """
    Return MPI's world communicator when this process is one of several MPI ranks.

    The MPI environment is detected the way OpenMDAO does it (launcher environment
    variables, ``OPENMDAO_USE_MPI``) so that mpi4py is not imported in a plain run.

    Returns
    -------
    mpi4py.MPI.Comm or None
        ``COMM_WORLD`` when it has more than one rank, else None.
    """
    from openmdao.utils.mpi import MPI

    if MPI is None:
        return None
    comm = MPI.COMM_WORLD
    return comm if comm.size > 1 else None


def is_root():
    """
    Return True in the process that should write files and print results.

    Returns
    -------
    bool
        True on MPI rank 0 and in every run without MPI.
    """
    comm = mpi_comm()
    return comm is None or comm.rank == 0


def _one_blas_thread():
    """Return a context in which BLAS uses one thread (no-op without threadpoolctl)."""
    try:
        from threadpoolctl import threadpool_limits
    except ImportError:
        return contextlib.nullcontext()
    return threadpool_limits(limits=1, user_api='blas')


def _call(func, item):
    """Run one job with one BLAS thread."""
    with _one_blas_thread():
        return func(item)


def _failed(result):
    """
    Return True when a job result is a mapping with ``success`` False.

    A result with a ``status`` (an optimisation) has failed only when that is 'failed': a
    point with no feasible design is an answer, not a failure.
    """
    if not isinstance(result, dict):
        return False
    if 'status' in result:
        return result['status'] == 'failed'
    return result.get('success', True) is False


def _init_worker():
    """Set up a pool process: no OpenMDAO report files."""
    os.environ['OPENMDAO_REPORTS'] = '0'


def _pool_context():
    """Return the 'fork' start method where there is one (fast start), else the default."""
    if sys.platform.startswith('linux') and 'fork' in multiprocessing.get_all_start_methods():
        return multiprocessing.get_context('fork')
    return None


def map_jobs(func, items, jobs=None, progress=None, uncounted=0, on_result=None):
    """
    Apply ``func`` to every item, in parallel, and return the results in item order.

    Without MPI the items go to ``jobs`` local processes (``concurrent.futures``); with
    ``jobs=1`` (or a single item) they run in this process. Under MPI with more than one
    rank, ``jobs`` is ignored: rank ``r`` runs items ``r, r + size, ...`` serially, the results
    are gathered on rank 0 and broadcast, so every rank returns the full list and all ranks
    must call this function together. The OpenMDAO problems a job builds live on its rank
    alone (``MPI.COMM_WORLD`` is the rank's ``COMM_SELF`` while the jobs run).

    Parameters
    ----------
    func : callable
        A picklable top-level function of one item. Results must be picklable.
    items : sequence
        The items (picklable).
    jobs : int or None
        Local processes; None for ``os.cpu_count()``.
    progress : callable or None
        ``progress(done, failed, total, elapsed)`` after every finished item (on rank 0 only
        under MPI); a result that is a dict with ``success`` False counts as failed.
    uncounted : int
        The first ``uncounted`` items (e.g. the reference optimisations of a target sweep)
        run like the others but are not points of the progress: ``total`` and ``done``
        count the rest.
    on_result : callable or None
        ``on_result(index, result)`` as each item finishes, in this process (so that a caller
        interrupted part-way keeps what was done). Under MPI it is called on every rank once
        the results are gathered.

    Returns
    -------
    list
        ``func(item)`` for every item, in item order.
    """
    items = list(items)
    comm = mpi_comm()
    if comm is not None:
        results = _map_mpi(comm, func, items, progress, uncounted)
        for index, result in enumerate(results):
            if on_result is not None:
                on_result(index, result)
        return results
    jobs = (os.cpu_count() or 1) if jobs is None else int(jobs)
    if jobs < 1:
        raise ValueError(f'jobs must be at least 1; got {jobs}')
    counter = _Counter(len(items), progress, uncounted)
    if jobs == 1 or len(items) <= 1:
        results = []
        with _one_blas_thread():
            for index, item in enumerate(items):
                results.append(func(item))
                if on_result is not None:
                    on_result(len(results) - 1, results[-1])
                counter.add(_failed(results[-1]), index)
        return results
    results = [None] * len(items)
    with concurrent.futures.ProcessPoolExecutor(
        max_workers=min(jobs, len(items)), mp_context=_pool_context(), initializer=_init_worker
    ) as pool:
        futures = {pool.submit(_call, func, item): index for index, item in enumerate(items)}
        try:
            for future in concurrent.futures.as_completed(futures):
                results[futures[future]] = future.result()
                if on_result is not None:
                    on_result(futures[future], results[futures[future]])
                counter.add(_failed(results[futures[future]]), futures[future])
        except BaseException:
            for future in futures:
                future.cancel()
            raise
    return results


def stream_jobs(func, items, jobs=None):
    """
    Apply ``func`` to every item, in parallel, yielding the results in item order.

    The streaming form of :func:`map_jobs`: each result is yielded as soon as it and every
    result before it are available, so that the caller can write them out (and drop them)
    while later items still run. Without MPI the items go to ``jobs`` local processes (at
    most two items ahead of the one awaited per process are queued, so that finished
    results wait in memory only briefly); with ``jobs=1`` (or a single item) they run in
    this process, one at a time as the caller asks for them. Under MPI with more than one
    rank, rank ``r`` runs items ``r, r + size, ...`` and sends each result to rank 0, which
    runs its own share in turn and yields every result in order; on the other ranks the
    generator yields nothing. All ranks must iterate it together.

    Parameters
    ----------
    func : callable
        A picklable top-level function of one item. Results must be picklable.
    items : sequence
        The items (picklable).
    jobs : int or None
        Local processes; None for ``os.cpu_count()``.

    Yields
    ------
    object
        ``func(item)`` for every item, in item order (on rank 0 only under MPI).
    """
    items = list(items)
    comm = mpi_comm()
    if comm is not None:
        yield from _stream_mpi(comm, func, items)
        return
    jobs = (os.cpu_count() or 1) if jobs is None else int(jobs)
    if jobs < 1:
        raise ValueError(f'jobs must be at least 1; got {jobs}')
    if jobs == 1 or len(items) <= 1:
        for item in items:
            with _one_blas_thread():
                result = func(item)
            yield result
        return
    workers = min(jobs, len(items))
    pool = concurrent.futures.ProcessPoolExecutor(
        max_workers=workers, mp_context=_pool_context(), initializer=_init_worker
    )
    futures = {}
    try:
        ahead = 0
        for index in range(len(items)):
            while ahead < len(items) and ahead < index + 2 * workers:
                futures[ahead] = pool.submit(_call, func, items[ahead])
                ahead += 1
            yield futures.pop(index).result()
    finally:
        for future in futures.values():
            future.cancel()
        pool.shutdown(wait=True, cancel_futures=True)


def on_this_process():
    """
    Return a context in which OpenMDAO problems built here stay on this process.

    Under MPI a problem built without a communicator takes ``MPI.COMM_WORLD`` (every rank);
    a problem that each rank builds for itself, such as the reference of a map, needs its
    own. Without MPI the context does nothing.

    Returns
    -------
    contextlib.AbstractContextManager
        The context.
    """
    if mpi_comm() is None:
        return contextlib.nullcontext()
    from mpi4py import MPI

    return _problems_on_this_rank(MPI)


def _stream_mpi(comm, func, items):
    """Run this rank's share of the items; rank 0 yields every result in item order."""
    from mpi4py import MPI

    rank, size = comm.rank, comm.size
    sends = []
    with _problems_on_this_rank(MPI):
        if rank != 0:
            for index in range(rank, len(items), size):
                try:
                    message = (_call(func, items[index]), None)
                except Exception as exc:  # noqa: BLE001 - raised on rank 0
                    message = (None, exc)
                sends.append(comm.isend(message, dest=0, tag=_RESULT_TAG))
                if message[1] is not None:
                    break
            MPI.Request.waitall(sends)
            return
        for index in range(len(items)):
            owner = index % size
            if owner == 0:
                result = _call(func, items[index])
            else:
                result, error = comm.recv(source=owner, tag=_RESULT_TAG)
                if error is not None:
                    raise error
            yield result


class _Counter:
    """Count finished and failed items and call the progress callback."""

    def __init__(self, total, progress, uncounted=0):
        self.total, self.progress = total - uncounted, progress
        self.uncounted = uncounted
        self.done = self.failed = self.finished = 0
        self.start = time.monotonic()

    def add(self, failed, index=None):
        self.finished += 1
        if index is not None and index < self.uncounted:
            return
        self.done += 1
        self.failed += bool(failed)
        if self.progress is not None:
            self.progress(self.done, self.failed, self.total, time.monotonic() - self.start)


@contextlib.contextmanager
def _problems_on_this_rank(mpi):
    """
    Keep the OpenMDAO problems that jobs build on this rank alone.

    A problem built without a communicator takes ``MPI.COMM_WORLD``; the ranks run different
    jobs, so for the duration of the jobs ``COMM_WORLD`` is this rank's ``COMM_SELF``.
    """
    world = mpi.COMM_WORLD
    mpi.COMM_WORLD = mpi.COMM_SELF
    try:
        yield
    finally:
        mpi.COMM_WORLD = world


def _map_mpi(comm, func, items, progress, uncounted=0):
    """Run this rank's share of the items, gather on rank 0, broadcast the results."""
    from mpi4py import MPI

    rank, size = comm.rank, comm.size
    counter = _Counter(len(items), progress if rank == 0 else None, uncounted)
    mine, sends = [], []
    with _problems_on_this_rank(MPI):
        for index in range(rank, len(items), size):
            try:
                result, error = _call(func, items[index]), None
            except Exception as exc:  # noqa: BLE001 - re-raised on every rank below
                result, error = None, exc
            mine.append((index, result, error))
            if rank == 0:
                counter.add(error is not None or _failed(result), index)
                while comm.iprobe(source=MPI.ANY_SOURCE, tag=_PROGRESS_TAG):
                    counter.add(*comm.recv(source=MPI.ANY_SOURCE, tag=_PROGRESS_TAG))
            else:
                note = (error is not None or _failed(result), index)
                sends.append(comm.isend(note, dest=0, tag=_PROGRESS_TAG))
    if rank == 0:
        while counter.finished < len(items):
            counter.add(*comm.recv(source=MPI.ANY_SOURCE, tag=_PROGRESS_TAG))
    MPI.Request.waitall(sends)
    gathered = comm.gather(mine, root=0)
    if rank == 0:
        results, errors = [None] * len(items), []
        for share in gathered:
            for index, result, error in share:
                results[index] = result
                if error is not None:
                    errors.append((index, error))
        payload = (results, min(errors, key=lambda e: e[0])[1] if errors else None)
    else:
        payload = None
    results, error = comm.bcast(payload, root=0)
    if error is not None:
        raise error
    return results


class ProgressBar:
    r"""
    Progress of a sweep on a text stream: points done, failed, total, elapsed and time left.

    On a terminal the line is rewritten in place (``'\r'``); otherwise one line is written
    each time another tenth of the points is done, and at the end.

    Parameters
    ----------
    label : str
        Text at the start of the line.
    stream : file-like or None
        Where to write; None for ``sys.stderr``.
    """

    def __init__(self, label='points', stream=None):
        self.label = label
        self.stream = sys.stderr if stream is None else stream
        isatty = getattr(self.stream, 'isatty', None)
        self.tty = bool(isatty and isatty())
        self._tenths = 0

    def __call__(self, done, failed, total, elapsed):
        """
        Show the progress after a finished point (the ``progress`` callback of map_jobs).

        Parameters
        ----------
        done : int
            Points finished.
        failed : int
            Points finished without success.
        total : int
            Points in the sweep.
        elapsed : float
            Seconds since the sweep started.
        """
        text = self.format(done, failed, total, elapsed)
        if self.tty:
            self.stream.write('\r' + text + ('\n' if done >= total else ''))
        else:
            tenths = 10 * done // total if total else 10
            if tenths <= self._tenths and done < total:
                return
            self._tenths = tenths
            self.stream.write(text + '\n')
        self.stream.flush()

    def format(self, done, failed, total, elapsed):
        """
        Return the progress line.

        Parameters
        ----------
        done : int
            Points finished.
        failed : int
            Points finished without success.
        total : int
            Points in the sweep.
        elapsed : float
            Seconds since the sweep started.

        Returns
        -------
        str
            E.g. ``'points 3/9 (1 failed), 00:12 elapsed, 00:24 left'``.
        """
        left = elapsed / done * (total - done) if done else None
        text = f'{self.label} {done}/{total}'
        if failed:
            text += f' ({failed} failed)'
        text += f', {_clock(elapsed)} elapsed'
        if left is not None and done < total:
            text += f', {_clock(left)} left'
        return text


def _clock(seconds):
    """Return ``seconds`` as mm:ss, or h:mm:ss from an hour."""
    seconds = round(seconds)
    hours, rest = divmod(seconds, 3600)
    minutes, secs = divmod(rest, 60)
    return f'{hours}:{minutes:02d}:{secs:02d}' if hours else f'{minutes:02d}:{secs:02d}'
