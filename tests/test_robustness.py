"""Designs spread over the demo's design-variable bounds: closure and optimisation success."""

import numpy as np

from voltwake.batch import analyze_points
from voltwake.config import demo_path, load_config
from voltwake.optimization import design_variables, optimize

TURBO_ELECTRIC = demo_path('turbo_electric')


def _bounds(config):
    """Design-variable bounds (SI) as the optimisation reads them."""
    dvs = design_variables(config, config.model_inputs())
    return {dv.path: (dv.lower, dv.upper) for dv in dvs}


def test_a_thousand_random_designs_close_or_say_why(capsys):
    config = load_config(TURBO_ELECTRIC)
    rng = np.random.default_rng(20261201)
    columns = {path: rng.uniform(lo, hi, 1000) for path, (lo, hi) in _bounds(config).items()}
    batch = analyze_points(config, columns)
    closed = batch.closed
    # Every point closes or carries a reason; closed points have no NaN anywhere.
    assert all((r is None) == c for r, c in zip(batch.reasons, closed))
    for values in batch.values.values():
        assert np.all(np.isfinite(values[closed]))
    # Points that do not close are designs without a solution: the continuation from the
    # configured design found the weight running away (a fold of the mass balance).
    runaway = sum('grows without bound' in r for r in batch.reasons if r)
    with capsys.disabled():
        print(
            f'\nclosure of 1000 random in-bound designs: {100 * batch.closure_rate:.1f}% '
            f'closed, {int(np.sum(~closed))} not closing ({runaway} weight runaway), '
            f'{batch.recovered} closed by continuation'
        )
    # A regression of the solver would show as reasons other than a runaway, or a lower rate.
    assert batch.closure_rate >= 0.90
    assert runaway == int(np.sum(~closed))


def test_optimisation_from_twenty_random_starts(capsys):
    config = load_config(TURBO_ELECTRIC)
    bounds = _bounds(config)
    rng = np.random.default_rng(7)
    finals, messages = [], []
    for _ in range(20):
        start = {path: float(rng.uniform(lo, hi)) for path, (lo, hi) in bounds.items()}
        result = optimize(config, start)
        messages.append(result.message)
        finals.append(result.outputs['block_fuel_kg'] if result.success else np.nan)
    finals = np.array(finals)
    best = np.nanmin(finals)
    share = np.mean(np.abs(finals - best) <= 1e-3 * best)
    with capsys.disabled():
        print(
            f'\noptimisation from 20 random starts: {100 * share:.0f}% reach the best '
            f'block fuel ({best:,.2f} kg) within 0.1%'
        )
    assert share == 1.0, messages
