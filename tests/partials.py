"""Complex-step partial-derivative check of a single component, used by the component tests."""

import numpy as np
import openmdao.api as om
from openmdao.utils.assert_utils import assert_check_partials


def check_component_partials(component, inputs, outputs=None, atol=1e-14, rtol=1e-8):
    """
    Check the analytic partials of ``component`` against complex step.

    Parameters
    ----------
    component : om.ExplicitComponent or om.ImplicitComponent
        A freshly constructed component (typically with ``vec_size=3``).
    inputs : dict
        Input name -> value (SI, in the component's declared units); arrays give
        a different value at each point so that off-diagonal mistakes show.
    outputs : dict or None
        For implicit components: output (state) name -> value at which to check.
    atol, rtol : float
        Tolerances passed to ``assert_check_partials`` (elementwise |a - b| <= atol + rtol |b|);
        atol is tiny by default so that small partials are checked relatively too, while
        partials that are zero in exact arithmetic may carry round-off.

    Returns
    -------
    om.Problem
        The problem, run once at the given point, for further assertions.
    """
    prob = om.Problem(reports=False)
    prob.model.add_subsystem('comp', component, promotes=['*'])
    prob.setup(force_alloc_complex=True)
    for name, value in inputs.items():
        prob.set_val(name, np.asarray(value, dtype=float))
    for name, value in (outputs or {}).items():
        prob.set_val(name, np.asarray(value, dtype=float))
    prob.run_model()
    data = prob.check_partials(method='cs', compact_print=True, out_stream=None)
    assert_check_partials(data, atol=atol, rtol=rtol)
    return prob
