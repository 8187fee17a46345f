"""
voltwake: conceptual sizing and optimisation of turbo-electric airliners.

Conceptual estimates only: not for certification, flight or operational decisions.
"""

from .analysis import AnalysisResult, analyze, build_model_problem
from .compare import compare
from .config import Config, load_config
from .errors import ConfigError, NotClosedError, OptimizationError, VoltwakeError
from .optimization import OptimizationResult, build_problem, optimize

__all__ = [
    'AnalysisResult',
    'Config',
    'ConfigError',
    'NotClosedError',
    'OptimizationError',
    'OptimizationResult',
    'VoltwakeError',
    'analyze',
    'build_model_problem',
    'build_problem',
    'compare',
    'load_config',
    'optimize',
]
__version__ = '0.1.0'
