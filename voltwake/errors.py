"""Errors a user can cause, each with its documented exit code."""

#: Exit codes of the ``voltwake`` command (documented in README.md).
EXIT_OK = 0
EXIT_INTERNAL = 1
EXIT_BAD_INPUT = 2
EXIT_NOT_CLOSED = 3
EXIT_OPTIMIZER_FAILED = 4
EXIT_DERIVATIVE_CHECK = 5
EXIT_INFEASIBLE = 6
EXIT_NO_BREAKEVEN = 7
EXIT_INTERRUPTED = 130


class VoltwakeError(Exception):
    """
    Base class of the errors that end a command with a one-line message.

    Parameters
    ----------
    message : str
        The one-line message shown to the user.
    """

    exit_code = EXIT_INTERNAL

    def __init__(self, message):
        super().__init__(message)
        self.message = message


class ConfigError(VoltwakeError):
    """
    A configuration file or override that cannot be used as given.

    Parameters
    ----------
    message : str
        What is wrong and what was expected.
    source : str or None
        File name (or ``<dict>``/``--set``) the value came from.
    line : int or None
        1-based line of the offending key or value, when known.
    path : str or None
        Dotted key path of the offending entry.
    """

    exit_code = EXIT_BAD_INPUT

    def __init__(self, message, source=None, line=None, path=None):
        where = source or '<config>'
        if line is not None:
            where += f':{line}'
        full = f'{where}: {path}: {message}' if path else f'{where}: {message}'
        super().__init__(full)
        self.source, self.line, self.path, self.detail = source, line, path, message


class NotClosedError(VoltwakeError):
    """
    The sizing loop did not close (no consistent design was found).

    Parameters
    ----------
    message : str
        Which quantity ran away, or why no solution exists.
    """

    exit_code = EXIT_NOT_CLOSED


class OptimizationError(VoltwakeError):
    """
    The optimiser did not reach a feasible optimum.

    Parameters
    ----------
    message : str
        The optimiser's message and what was found.
    """

    exit_code = EXIT_OPTIMIZER_FAILED


class InfeasibleError(VoltwakeError):
    """
    No design satisfies the constraints (the optimiser found only infeasible designs).

    Not an optimiser failure: the least-infeasible design was found and the message names
    the constraints it violates and by how much.

    Parameters
    ----------
    message : str
        The violated constraints, by name and amount, at the least-infeasible design.
    """

    exit_code = EXIT_INFEASIBLE


class NoBreakevenError(VoltwakeError):
    """
    A break-even study whose fuel-burn difference does not change sign in its interval.

    Parameters
    ----------
    message : str
        The difference at both ends of the interval and which design wins throughout.
    """

    exit_code = EXIT_NO_BREAKEVEN


class InterruptedRun(VoltwakeError):
    """
    A run stopped by the user (Ctrl-C); carries what was done so far.

    Parameters
    ----------
    message : str
        What was interrupted.
    partial : dict or None
        JSON-ready results of the part that was done.
    """

    exit_code = EXIT_INTERRUPTED

    def __init__(self, message, partial=None):
        super().__init__(message)
        self.partial = partial
