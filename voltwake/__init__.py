"""
voltwake: conceptual sizing and optimisation of turbo-electric airliners.

The package is laid out by task, each layer importing only the ones above it in this list:

* :mod:`voltwake.errors`: the errors a user can cause, with their exit codes;
* :mod:`voltwake.configuration`: the configuration schema, the YAML reader and the loader;
* :mod:`voltwake.design`: running one design (sizing, analysis, batches of points,
  optimisation, comparison with the reference, derivative checks);
* :mod:`voltwake.outputs`: text summaries, figures, files and the HTML report;
* :mod:`voltwake.studies`: trade studies over many designs (maps, Monte Carlo, target
  sweeps, break-even) and the study runner;
* :mod:`voltwake.cli`: the command line, a thin layer over the above.

The physics lives in :mod:`voltwake.components` and the model wiring in
:mod:`voltwake.models`. Conceptual estimates only: not for certification, flight or
operational decisions.
"""

from .configuration.loader import Config, demo_names, demo_path, load_config
from .design.analysis import AnalysisResult, analyze
from .design.compare import compare
from .design.optimization import OptimizationResult, build_problem, optimize
from .design.sizing import build_model_problem
from .errors import ConfigError, NotClosedError, OptimizationError, VoltwakeError
from .studies.results import (
    BreakevenResult,
    DesignMapResult,
    MonteCarloResult,
    StudyResult,
    TargetSweepResult,
)
from .studies.runner import breakeven, design_map, monte_carlo, target_sweep

__all__ = [
    'AnalysisResult',
    'BreakevenResult',
    'Config',
    'ConfigError',
    'DesignMapResult',
    'MonteCarloResult',
    'NotClosedError',
    'OptimizationError',
    'OptimizationResult',
    'StudyResult',
    'TargetSweepResult',
    'VoltwakeError',
    'analyze',
    'breakeven',
    'build_model_problem',
    'build_problem',
    'compare',
    'demo_names',
    'demo_path',
    'design_map',
    'load_config',
    'monte_carlo',
    'optimize',
    'target_sweep',
]
__version__ = '0.1.0'
