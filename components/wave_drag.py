"""Transonic wave drag of a swept wing: Korn equation and Lock's fourth-power law."""

import numpy as np

from voltwake.components.base import PointwiseComponent

#: Slope dC_D/dM that defines the drag-divergence Mach number (common practice).
DIVERGENCE_SLOPE = 0.1

#: Coefficient of Lock's fourth-power law C_Dw = LOCK_COEFFICIENT (M - M_crit)**4.
LOCK_COEFFICIENT = 20.0

#: M_dd - M_crit: the Mach-number offset at which the fourth-power law has the slope 0.1,
#: 4 * 20 * offset**3 = 0.1, so offset = (0.1 / 80)**(1/3) = 0.10772 (hand value).
CRITICAL_OFFSET = (DIVERGENCE_SLOPE / (4.0 * LOCK_COEFFICIENT)) ** (1.0 / 3.0)


class WaveDragComp(PointwiseComponent):
    r"""
    Drag-divergence Mach number, critical Mach number and wave drag of a swept wing.

    Korn equation for the drag-divergence Mach number of a section, extended to a swept wing
    by simple sweep theory, and Lock's fourth-power law for the wave drag (Mason,
    Configuration Aerodynamics, course notes, Virginia Tech, transonic aerodynamics chapter;
    Gur, Mason and Schetz, "Full-configuration drag estimation", J. Aircraft 47(4), 2010;
    both from memory):

    .. math::

        M_{dd} = \frac{\kappa_A}{\cos\Lambda} - \frac{t/c}{\cos^2\Lambda}
                 - \frac{C_L}{10\cos^3\Lambda}

    .. math::

        M_{crit} = M_{dd} - \left(\frac{0.1}{80}\right)^{1/3}, \qquad
        C_{D,w} = \begin{cases} 20\,(M - M_{crit})^4 & M > M_{crit} \\
                                0 & M \le M_{crit} \end{cases}

    The sweep form follows from the two-dimensional Korn equation
    :math:`M_{dd,n} = \kappa_A - (t/c)_n - C_{L,n}/10` applied to the flow normal to the
    isobars, with :math:`M_n = M\cos\Lambda`, :math:`(t/c)_n = (t/c)/\cos\Lambda` and
    :math:`C_{L,n} = C_L/\cos^2\Lambda` (simple sweep theory, common practice). Simple sweep
    theory applies to the sweep of the isobars, which on a transonic wing lie between the
    quarter and the half chord; the published applications take a chord-line sweep as its
    proxy (which one varies, from memory, not checked). Here :math:`\Lambda` is the wing's
    quarter-chord sweep, the model's only wing sweep. :math:`t/c` is the streamwise
    thickness-to-chord ratio and :math:`C_L` the wing lift coefficient, used in place of the
    section lift coefficient (common practice in conceptual design).

    :math:`\kappa_A` is the airfoil technology factor: 0.87 for conventional (NACA 6-series)
    sections and 0.95 for supercritical sections (Mason, same notes; from memory). The
    default is 0.95.

    The offset between :math:`M_{crit}` and :math:`M_{dd}` makes the slope of the fourth-power
    law :math:`dC_{D,w}/dM = 80 (M - M_{crit})^3` equal to 0.1 at :math:`M_{dd}`, the usual
    definition of drag divergence; there :math:`C_{D,w} = 20 (0.1/80)^{4/3} = 0.00269`.
    :math:`C_{D,w}` is continuous with its first three derivatives at :math:`M_{crit}`; the
    branch is taken on the real part so that the component is complex-step safe. The wave drag
    coefficient is on the wing reference area, like :math:`C_L`.

    Parameters
    ----------
    **kwargs : dict of keyword arguments
        Keyword arguments that will be mapped into the Component options.
    """

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        self.add_input('mach', np.full(n, 0.78), units=None, desc='Flight Mach number')
        self.add_input(
            'lift_coefficient',
            np.full(n, 0.5),
            units=None,
            desc='Wing lift coefficient on wing reference area',
        )
        self.add_input(
            'sweep',
            np.full(n, np.radians(25.0)),
            units='rad',
            desc='Wing quarter-chord sweep, taken as the sweep of the isobars',
        )
        self.add_input(
            'thickness_to_chord',
            np.full(n, 0.12),
            units=None,
            desc='Streamwise thickness-to-chord ratio of the wing section',
        )
        self.add_input(
            'technology_factor',
            np.full(n, 0.95),
            units=None,
            desc='Airfoil technology factor kappa_A (0.87 conventional, 0.95 supercritical)',
        )
        self.add_output(
            'drag_divergence_mach',
            np.full(n, 0.83),
            units=None,
            desc='Drag-divergence Mach number (dC_D/dM = 0.1)',
        )
        self.add_output(
            'critical_mach',
            np.full(n, 0.73),
            units=None,
            desc='Critical Mach number of the fourth-power law (wave drag starts)',
        )
        self.add_output(
            'wave_drag_coefficient',
            np.zeros(n),
            units=None,
            desc='Wave drag coefficient on wing reference area',
        )

    def setup_partials(self):
        """
        Declare the diagonal partials.
        """
        wing = ['lift_coefficient', 'sweep', 'thickness_to_chord', 'technology_factor']
        self.declare_diagonal_partials(['drag_divergence_mach', 'critical_mach'], wing)
        self.declare_diagonal_partials('wave_drag_coefficient', ['mach'] + wing)

    @staticmethod
    def _divergence_mach(inputs):
        """
        Return the drag-divergence Mach number and its partials.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].

        Returns
        -------
        tuple
            M_dd and a dict of its partials keyed by input name.
        """
        kappa = inputs['technology_factor']
        thickness = inputs['thickness_to_chord']
        lift = inputs['lift_coefficient']
        sweep = inputs['sweep']
        cos = np.cos(sweep)
        sin = np.sin(sweep)
        mdd = kappa / cos - thickness / cos**2 - lift / (10.0 * cos**3)
        partials = {
            'technology_factor': 1.0 / cos,
            'thickness_to_chord': -1.0 / cos**2,
            'lift_coefficient': -1.0 / (10.0 * cos**3),
            'sweep': sin
            * (kappa / cos**2 - 2.0 * thickness / cos**3 - 3.0 * lift / (10.0 * cos**4)),
        }
        return mdd, partials

    def compute(self, inputs, outputs):
        """
        Compute the drag-divergence and critical Mach numbers and the wave drag.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        """
        mdd, _ = self._divergence_mach(inputs)
        mcrit = mdd - CRITICAL_OFFSET
        excess = inputs['mach'] - mcrit
        outputs['drag_divergence_mach'] = mdd
        outputs['critical_mach'] = mcrit
        outputs['wave_drag_coefficient'] = np.where(
            excess.real > 0.0, LOCK_COEFFICIENT * excess**4, 0.0
        )

    def compute_partials(self, inputs, partials):
        """
        Compute the analytic partials.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        partials : Jacobian
            Sub-jac components written to partials[output_name, input_name].
        """
        mdd, dmdd = self._divergence_mach(inputs)
        excess = inputs['mach'] - (mdd - CRITICAL_OFFSET)
        # d C_Dw / d M; d C_Dw / d M_crit is its negative.
        slope = np.where(excess.real > 0.0, 4.0 * LOCK_COEFFICIENT * excess**3, 0.0)
        partials['wave_drag_coefficient', 'mach'] = slope
        for name, value in dmdd.items():
            partials['drag_divergence_mach', name] = value
            partials['critical_mach', name] = value
            partials['wave_drag_coefficient', name] = -slope * value
