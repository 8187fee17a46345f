"""The test helper itself must catch a wrong partial (a check that cannot fail is worthless)."""

import numpy as np
import pytest

from voltwake.components.base import PointwiseComponent

from partials import check_component_partials


class _Square(PointwiseComponent):
    """y = x**2 with a deliberately selectable wrong derivative."""

    def initialize(self):
        super().initialize()
        self.options.declare('wrong', types=bool, default=False, desc='Use a wrong partial.')

    def setup(self):
        n = self.options['vec_size']
        self.add_input('x', np.ones(n), units='m')
        self.add_output('y', np.ones(n), units='m**2')

    def setup_partials(self):
        self.declare_diagonal_partials('y', 'x')

    def compute(self, inputs, outputs):
        outputs['y'] = inputs['x'] ** 2

    def compute_partials(self, inputs, partials):
        partials['y', 'x'] = (2.1 if self.options['wrong'] else 2.0) * inputs['x']


def test_helper_passes_correct_partials():
    check_component_partials(_Square(vec_size=3), {'x': [1.0, 2.0, 3.0]})


def test_helper_catches_wrong_partials():
    with pytest.raises(ValueError):
        check_component_partials(_Square(vec_size=3, wrong=True), {'x': [1.0, 2.0, 3.0]})
