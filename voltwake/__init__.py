"""
voltwake: conceptual sizing and optimisation of turbo-electric airliners.

Conceptual estimates only: not for certification, flight or operational decisions.
"""

from .analysis import AnalysisResult, analyze, build_model_problem
from .config import Config, load_config
from .errors import ConfigError, NotClosedError, OptimizationError, VoltwakeError

__all__ = ['AnalysisResult', 'Config', 'ConfigError', 'NotClosedError', 'OptimizationError',
           'VoltwakeError', 'analyze', 'build_model_problem', 'load_config']
__version__ = '0.1.0'
