"""Batched LU of the point blocks of the sizing loop's Jacobian (models/solvers.py)."""

import numpy as np
import openmdao.api as om
import pytest
import scipy.sparse
import scipy.sparse.linalg

import voltwake
from voltwake.configuration.loader import demo_path, load_config
from voltwake.design.batch import analyze_points, full_factorial
from voltwake.design.derivatives import _spread, check_totals_cs
from voltwake.design.sizing import build_model_problem
from voltwake.models import solvers
from voltwake.models.aircraft import AircraftModel
from voltwake.models.solvers import BatchedBlockLU, PointBlocks, StaticPivotPlan, Workspace

TURBO_ELECTRIC = demo_path('turbo_electric')


def variable_major(blocks):
    """Assemble per-point dense blocks (points, n, n) the way OpenMDAO orders the unknowns."""
    points, n, _ = blocks.shape
    p, i, j = np.nonzero(blocks != 0)
    return scipy.sparse.csc_matrix(
        (blocks[p, i, j], (i * points + p, j * points + p)), shape=(n * points, n * points)
    )


def random_blocks(points=40, n=15, seed=0, dtype=float):
    """Blocks with one random sparsity, a small diagonal (pivoting needed) and spread values."""
    rng = np.random.default_rng(seed)
    pattern = rng.random((n, n)) < 0.25
    pattern[np.arange(n), rng.permutation(n)] = True  # structurally non-singular
    pattern[np.diag_indices(n)] = True
    base = rng.standard_normal((n, n)) * pattern
    base[np.diag_indices(n)] *= 1e-3
    # Rows and columns in very different units, as in the sizing loop.
    scale = 10.0 ** rng.uniform(-4, 5, n)
    base = scale[:, None] * base / scale[None, :]
    spread = 1.0 + 0.3 * rng.uniform(-1, 1, (points, n, n))
    blocks = base * spread
    if dtype is complex:
        blocks = blocks + 1j * 0.2 * base * rng.uniform(-1, 1, (points, n, n))
    return blocks


@pytest.mark.parametrize('dtype', [float, complex])
def test_batched_lu_matches_spsolve_forward_and_transpose(dtype):
    points = 40
    matrix = variable_major(random_blocks(points, dtype=dtype))
    blocks = PointBlocks.of(matrix, points)
    assert blocks is not None and blocks.size == 15
    lu = BatchedBlockLU(matrix, blocks)
    rng = np.random.default_rng(1)
    rhs = rng.standard_normal(matrix.shape[0])
    for trans, mat in (('N', matrix), ('T', matrix.T.tocsc())):
        x = lu.solve(rhs, trans)
        ref = scipy.sparse.linalg.spsolve(mat, rhs)
        np.testing.assert_allclose(x, ref, rtol=1e-9, atol=1e-12 * np.abs(ref).max())
        # As small as SuperLU's own (up to 3e-13 on this system, transposed).
        assert lu.backward_error(rhs, x, trans).max() < 1e-12
    # Every point went through the batched factors (no fallback needed here).
    assert lu.fallback_points.size == 0


def test_complex_right_hand_side_of_real_factors():
    points = 8
    matrix = variable_major(random_blocks(points, n=6, seed=3))
    lu = BatchedBlockLU(matrix, PointBlocks.of(matrix, points))
    rng = np.random.default_rng(2)
    rhs = rng.standard_normal(matrix.shape[0]) + 1e-30j * rng.standard_normal(matrix.shape[0])
    x = lu.solve(rhs, 'T')
    ref_re = scipy.sparse.linalg.spsolve(matrix.T.tocsc(), rhs.real)
    ref_im = scipy.sparse.linalg.spsolve(matrix.T.tocsc(), rhs.imag)
    np.testing.assert_allclose(x.real, ref_re, rtol=1e-9, atol=1e-12 * np.abs(ref_re).max())
    np.testing.assert_allclose(x.imag, ref_im, rtol=1e-9, atol=1e-12 * np.abs(ref_im).max())


def test_static_plan_reproduces_the_representative_factors():
    # The plan's factors of the representative block are those of SuperLU (same pivots).
    matrix = variable_major(random_blocks(5, n=10, seed=4))
    blocks = PointBlocks.of(matrix, 5)
    values = np.asarray(matrix.data)[blocks.gather]
    ref = scipy.sparse.linalg.splu(blocks.block(values, 2))
    plan = StaticPivotPlan(
        blocks.rows, blocks.cols, 10, np.argsort(ref.perm_r), np.argsort(ref.perm_c)
    )
    lu = plan.factorize(values)[:, 2]
    upper = np.zeros((10, 10))
    lower = np.eye(10)
    for k in range(10):
        upper[k, k] = lu[plan.diag[k]]
        upper[k, plan.u_cols[k]] = lu[plan.u_slice[k]]
        lower[plan.l_rows[k], k] = lu[plan.l_slice[k]]
    np.testing.assert_allclose(lower, ref.L.toarray(), rtol=1e-12, atol=1e-15)
    np.testing.assert_allclose(upper, ref.U.toarray(), rtol=1e-12, atol=1e-15 * abs(upper).max())


def test_factors_replaced_in_a_shared_workspace_refuse_to_solve():
    points = 10
    matrix = variable_major(random_blocks(points, n=6, seed=6))
    blocks = PointBlocks.of(matrix, points)
    rhs = np.random.default_rng(3).standard_normal(matrix.shape[0])
    workspace = Workspace()
    first = BatchedBlockLU(matrix, blocks, workspace=workspace)
    x = first.solve(rhs)
    second = BatchedBlockLU(2.0 * matrix, blocks, workspace=workspace)
    np.testing.assert_allclose(second.solve(rhs), x / 2.0, rtol=1e-12)
    with pytest.raises(RuntimeError, match='replaced'):
        first.solve(rhs)


def test_point_blocks_reject_coupled_points_and_differing_patterns():
    blocks = random_blocks(4, n=5, seed=5)
    matrix = variable_major(blocks).tolil()
    matrix[0, 1] = 1.0  # unknown 0 of point 0 coupled to unknown 0 of point 1
    assert PointBlocks.of(matrix.tocsc(), 4) is None
    differing = blocks.copy()
    differing[2][differing[2] != 0] = 0.0
    differing[2][np.diag_indices(5)] = 1.0
    assert PointBlocks.of(variable_major(differing), 4) is None
    assert PointBlocks.of(variable_major(blocks), 3) is None  # 20 unknowns, not 3 points


def pivot_test_system(a=(2.0, 0.0, 1e-17, 3.0), b=1.0, d=1.0, c=(2.0, 0.0, 0.3, 1.0)):
    """2 x 2 blocks [[a, d], [b, c]], one per point, all four entries explicit."""
    a, b, d, c = np.broadcast_arrays(*(np.asarray(v, dtype=float) for v in (a, b, d, c)))
    points = a.size
    # Explicit entries also where a value is zero: the pattern is the same at every point.
    rows = np.array([0, 1, 0, 1])[:, None] * points + np.arange(points)
    cols = np.array([0, 0, 1, 1])[:, None] * points + np.arange(points)
    data = np.stack([a, b, d, c])
    matrix = scipy.sparse.csc_matrix(
        (data.ravel(), (rows.ravel(), cols.ravel())), shape=(2 * points, 2 * points)
    )
    return matrix, points


def test_zero_and_tiny_static_pivots_fall_back_to_superlu():
    matrix, points = pivot_test_system()
    assert matrix.nnz == 4 * points  # the explicit zeros are kept
    lu = BatchedBlockLU(matrix, PointBlocks.of(matrix, points), representative=0)
    # Point 1 has a zero static pivot: non-finite factors, SuperLU from the start.
    assert lu.fallback_points.tolist() == [1]
    rhs = np.array([1.0, 2.0, 3.0, 4.0, 5.0, 6.0, 7.0, 8.0])
    for trans, mat in (('N', matrix), ('T', matrix.T.tocsc())):
        x = lu.solve(rhs, trans)
        ref = scipy.sparse.linalg.spsolve(mat, rhs)
        np.testing.assert_allclose(x, ref, rtol=1e-12)
    # Point 2's pivot of 1e-17 leaves U_11 = 0.3 - 1e17 = -1e17 in floating point: the
    # solution's backward error is of order 0.1, so the point moves to SuperLU at the first
    # solve and stays there.
    assert lu.fallback_points.tolist() == [1, 2]


def test_batched_solution_of_tiny_pivot_would_be_wrong_without_the_check():
    # The check is what makes the fallback necessary: the static factors alone are wrong.
    matrix, points = pivot_test_system()
    blocks = PointBlocks.of(matrix, points)
    lu = BatchedBlockLU(matrix, blocks, representative=0)
    rhs = np.arange(1.0, 9.0)
    raw = lu.plan.solve(lu._lu, rhs.reshape(2, points)).ravel()
    ref = scipy.sparse.linalg.spsolve(matrix, rhs)
    point2 = [2, 2 + points]
    assert np.max(np.abs(raw[point2] - ref[point2]) / np.abs(ref[point2])) > 1e-3
    assert lu.backward_error(rhs, raw)[2] > solvers.BACKWARD_ERROR_LIMIT
    assert lu.backward_error(rhs, raw)[[0, 3]].max() < 1e-15


def test_singular_point_raises():
    # Point 1 is [[0, 1], [0, 0]]: singular, for the static pivots and for SuperLU alike.
    matrix, points = pivot_test_system(b=(1.0, 0.0, 1.0, 1.0))
    blocks = PointBlocks.of(matrix, points)
    assert blocks is not None
    with pytest.raises(RuntimeError):
        BatchedBlockLU(matrix, blocks, representative=0)


@pytest.fixture
def batched_everywhere(monkeypatch):
    """Use the batched LU from 2 points on and record every factorisation."""
    made = []

    class Recorded(BatchedBlockLU):
        def __init__(self, *args, **kwargs):
            super().__init__(*args, **kwargs)
            made.append(self)

    monkeypatch.setattr(solvers, 'MIN_BATCHED_POINTS', 2)
    monkeypatch.setattr(solvers, 'BatchedBlockLU', Recorded)
    return made


def test_batched_map_matches_points_analysed_one_at_a_time(batched_everywhere):
    axes = {
        'aft_fan.fan_pressure_ratio': [1.2, 1.35, 1.5],
        'aft_fan.thrust_fraction': [0.1, 0.2, 0.3, 0.4],
    }
    columns = full_factorial(axes)
    batch = analyze_points(TURBO_ELECTRIC, columns)
    assert batch.closed.all()
    assert batched_everywhere and all(lu.plan is not None for lu in batched_everywhere)
    assert sum(lu.fallback_points.size for lu in batched_everywhere) == 0
    for i, (fpr, frac) in enumerate(zip(*columns.values())):
        single = voltwake.analyze(
            TURBO_ELECTRIC, {'aft_fan.fan_pressure_ratio': fpr, 'aft_fan.thrust_fraction': frac}
        )
        for key in ('block_fuel_kg', 'mtow_kg'):
            assert batch.values[key][i] == pytest.approx(single.values[key], rel=1e-9)


def test_batched_points_that_do_not_close_are_marked(batched_everywhere):
    # As tests/test_studies.py, through the batched LU: the non-closing points break their
    # blocks (non-finite or singular) without spoiling the others.
    columns = {'turbofans.fan_pressure_ratio': [1.01, 1.45, 1.01, 1.6]}
    batch = analyze_points(TURBO_ELECTRIC, columns)
    assert batched_everywhere
    assert batch.closed.tolist() == [False, True, False, True]
    single = voltwake.analyze(TURBO_ELECTRIC, {'turbofans.fan_pressure_ratio': 1.6})
    assert batch.values['block_fuel_kg'][3] == pytest.approx(single.block_fuel_kg, rel=1e-9)


@pytest.mark.parametrize('mode', ['fwd', 'rev'])
def test_batched_totals_equal_superlu_totals(mode, monkeypatch):
    # Reverse-mode totals solve the transposed system: both modes against SuperLU's solves.
    config = load_config(TURBO_ELECTRIC)
    solved = []
    plain = BatchedBlockLU.solve

    def solve(self, rhs, trans='N'):
        solved.append(trans)
        return plain(self, rhs, trans)

    monkeypatch.setattr(BatchedBlockLU, 'solve', solve)
    of, wrt = ['block_fuel', 'mtow'], ['aft_thrust_fraction', 'aft_fan_pressure_ratio']
    totals = {}
    for least in (2, 10**9):
        model = AircraftModel(vec_size=4, **config.model_options())
        prob = om.Problem(model, reports=False)
        for name, (value, units) in config.model_inputs().items():
            model.set_input_defaults(name, np.full(4, value), units=units)
        prob.setup(mode=mode)
        model.sizing.linear_solver.options['min_batched_points'] = least
        _spread(prob, config, 4)
        prob.run_model()
        solved.clear()
        totals[least] = prob.compute_totals(of=of, wrt=wrt, return_format='array')
        lu = model.sizing.linear_solver._lu
        assert isinstance(lu, BatchedBlockLU) == (least == 2)
        if least == 2:
            assert set(solved) == {'N' if mode == 'fwd' else 'T'}
            assert lu.fallback_points.size == 0
    # Points are independent: each total is non-zero only for a point's own inputs.
    assert np.count_nonzero(totals[2]) == 2 * 2 * 4
    np.testing.assert_allclose(totals[2], totals[10**9], rtol=1e-10)


def test_complex_step_through_batched_lu(batched_everywhere):
    # check_totals_cs iterates Newton in complex arithmetic: complex Jacobians, factorised by
    # the batched LU, must give the analytic totals.
    config = load_config(TURBO_ELECTRIC)
    prob = build_model_problem(config, vec_size=3)
    _spread(prob, config, 3)
    prob.run_model()
    data = check_totals_cs(prob, of=['block_fuel', 'mtow'], wrt=['aft_thrust_fraction'])
    assert any(np.iscomplexobj(lu.values) for lu in batched_everywhere)
    for entry in data.values():
        reference = np.abs(entry['J_fd']).max()
        assert reference > 0
        assert np.abs(entry['J_fwd'] - entry['J_fd']).max() <= 1e-8 * reference
