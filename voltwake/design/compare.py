"""Side-by-side comparison of a turbo-electric design with its conventional reference."""

import dataclasses

from ..configuration.loader import load_config
from ..errors import OptimizationError
from .analysis import AnalysisResult, analyze
from .fields import fuel_burn_field
from .optimization import optimize

#: Fields whose percentage change is reported.
CHANGED = (
    'block_fuel_kg',
    'total_fuel_kg',
    'mtow_kg',
    'oew_kg',
    'cruise_lift_to_drag',
    'tsfc_g_per_kN_s',
    'overall_efficiency',
    'block_energy_MJ',
    'propulsion_mass_kg',
    'engines_mass_kg',
    'turbofan_fan_diameter_m',
    'cruise_drag_kN',
    'economic_block_fuel_kg',
    'economic_block_energy_MJ',
)


@dataclasses.dataclass
class Comparison:
    """
    A design and its conventional reference.

    Parameters
    ----------
    design : AnalysisResult
        The turbo-electric design.
    reference : AnalysisResult
        The same configuration with the aft fan removed.
    change_percent : dict
        Field -> 100 (design - reference) / reference.
    fuel_field : str
        The field the fuel-burn change is measured on: the design mission's block fuel, or
        the economic mission's when that is the optimisation objective.
    """

    design: object
    reference: object
    change_percent: dict
    fuel_field: str = 'block_fuel_kg'

    @property
    def fuel_burn_change_percent(self):
        """float: Fuel-burn change of the design versus the reference, in percent."""
        return self.change_percent[self.fuel_field]

    def to_dict(self):
        """
        Return the comparison as a JSON-ready mapping.

        Returns
        -------
        dict
            ``design``, ``reference``, ``change_percent`` and ``fuel_burn_change_percent``.
        """
        return {
            'design': self.design.to_dict(),
            'reference': self.reference.to_dict(),
            'change_percent': dict(self.change_percent),
            'fuel_burn_change_percent': self.fuel_burn_change_percent,
            'fuel_burn_measured_on': self.fuel_field,
        }


def percent_changes(design_values, reference_values):
    """
    Return the percentage change of each compared field.

    Parameters
    ----------
    design_values, reference_values : dict
        Field -> value.

    Returns
    -------
    dict
        Field -> percent change.
    """
    return {
        key: 100.0 * (design_values[key] - reference_values[key]) / reference_values[key]
        for key in CHANGED
        if key in reference_values and reference_values[key] != 0.0
    }


def compare(config=None, overrides=None, optimized=False):
    """
    Analyse a design and its conventional reference (the aft fan removed) side by side.

    With ``optimized`` both are first optimised with the same objective and constraints (the
    reference without the aft-fan design variables and constraints): the fair comparison.

    Parameters
    ----------
    config : Config, dict, str or None
        The configuration; None for the packaged turbo-electric demo.
    overrides : dict or list of str or None
        Dotted key path -> value applied before validation.
    optimized : bool
        Compare the two optima instead of the two configured designs.

    Returns
    -------
    Comparison
        Both designs and the percentage changes.
    """
    config = load_config(config, overrides)
    if optimized:
        return _compare_optima(config)
    design = analyze(config, keep_problem=False)
    reference = analyze(config.without_aft_fan(), keep_problem=False)
    changes = percent_changes(design.values, reference.values)
    return Comparison(design, reference, changes, fuel_burn_field(config))


def _compare_optima(config):
    results = []
    for cfg in (config, config.without_aft_fan()):
        opt = optimize(cfg)
        if not opt.success:
            raise OptimizationError(f'optimising {cfg.name!r} failed: {opt.message}')
        results.append(AnalysisResult(cfg.name, True, opt.outputs, 0, None))
    design, reference = results
    changes = percent_changes(design.values, reference.values)
    return Comparison(design, reference, changes, fuel_burn_field(config))
