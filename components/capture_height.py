"""Define the CaptureHeightComp class: the height of boundary layer the aft fan swallows."""

import numpy as np
import openmdao.api as om


def initial_capture_height(
    required_mass_flow, density, true_airspeed, perimeter, boundary_layer_thickness, n=7.0
):
    r"""
    Return the capture height that passes a given mass flow, by inverting the mass-flux formula.

    With the power-law profile :math:`u/V = (y/\delta)^{1/n}` the mass flow captured up to
    the height h is :math:`\dot m = C \rho V \delta \frac{n}{n+1} (h/\delta)^{(n+1)/n}` for
    :math:`h \le \delta` and :math:`\dot m = C \rho V (h - \delta/(n+1))` above. Its
    closed-form inverse, with :math:`\dot m_\delta = C \rho V \delta n / (n+1)`, is

    .. math::

        h = \begin{cases}
            \delta \left(\dot m / \dot m_\delta\right)^{n/(n+1)}, & \dot m \le \dot m_\delta \\
            \delta + \frac{\dot m - \dot m_\delta}{C \rho V}, & \dot m > \dot m_\delta
        \end{cases}

    Meant as the starting value of the capture-height state before a Newton solve.

    Parameters
    ----------
    required_mass_flow : float or ndarray
        Mass flow the fan must pass (kg/s).
    density : float or ndarray
        Free-stream density (kg/m**3).
    true_airspeed : float or ndarray
        Free-stream velocity (m/s).
    perimeter : float or ndarray
        Fuselage perimeter at the fan station (m).
    boundary_layer_thickness : float or ndarray
        Boundary layer thickness delta (m).
    n : float
        Exponent of the power-law profile.

    Returns
    -------
    ndarray
        Capture height (m).
    """
    free_flux = np.asarray(perimeter * density * true_airspeed)
    delta = np.asarray(boundary_layer_thickness)
    m_delta = free_flux * delta * n / (n + 1.0)
    ratio = np.asarray(required_mass_flow) / m_delta
    inner = ratio.real <= 1.0
    h_in = delta * np.where(inner, ratio, 1.0) ** (n / (n + 1.0))
    h_out = delta + (required_mass_flow - m_delta) / free_flux
    return np.where(inner, h_in, h_out)


def _check_positive(name, value):
    """
    Raise if an option value is not strictly positive.

    Parameters
    ----------
    name : str
        Option name.
    value : float
        Option value.
    """
    if not value > 0.0:
        raise ValueError(f"Option '{name}' must be positive, got {value}.")


class CaptureHeightComp(om.ImplicitComponent):
    r"""
    Capture height at which the boundary-layer flow captured equals the fan mass flow.

    The state is the capture height h; the residual is the mismatch between the mass flow
    captured from the fuselage boundary layer up to h and the mass flow the fan requires,
    scaled by a reference mass flow:

    .. math::

        R = \frac{\dot m_{captured}(h) - \dot m_{required}}{\dot m_{ref}}

    The residual depends on h only through the captured mass flow computed upstream, so
    the component must sit in a group with a Newton solver that sees that coupling. Mass
    continuity through the fan face (common practice). Use :func:`initial_capture_height`
    for the starting value.

    Parameters
    ----------
    **kwargs : dict of keyword arguments
        Keyword arguments that will be mapped into the Component options.
    """

    def initialize(self):
        """
        Declare options.
        """
        self.options.declare(
            'vec_size',
            types=int,
            default=1,
            lower=1,
            desc='Number of independent design points evaluated at once.',
        )
        self.options.declare(
            'mass_flow_ref',
            types=(int, float),
            default=100.0,
            check_valid=_check_positive,
            desc='Reference mass flow (kg/s) that scales the residual.',
        )

    def setup(self):
        """
        Add inputs and outputs.
        """
        n = self.options['vec_size']
        self.add_input(
            'captured_mass_flow',
            100.0 * np.ones(n),
            units='kg/s',
            desc='Mass flow captured from the boundary layer up to the height.',
        )
        self.add_input(
            'required_mass_flow',
            100.0 * np.ones(n),
            units='kg/s',
            desc='Mass flow the aft fan requires.',
        )
        self.add_output(
            'capture_height',
            0.3 * np.ones(n),
            units='m',
            lower=0.0,
            desc='Height above the fuselage wall up to which the fan captures flow.',
        )

    def setup_partials(self):
        """
        Declare the sparse (diagonal) partials.
        """
        idx = np.arange(self.options['vec_size'])
        self.declare_partials(
            'capture_height', ['captured_mass_flow', 'required_mass_flow'], rows=idx, cols=idx
        )

    def apply_nonlinear(self, inputs, outputs, residuals):
        """
        Compute the scaled mass-flow mismatch.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        residuals : Vector
            Unscaled, dimensional residuals written to via residuals[key].
        """
        residuals['capture_height'] = (
            inputs['captured_mass_flow'] - inputs['required_mass_flow']
        ) / self.options['mass_flow_ref']

    def linearize(self, inputs, outputs, partials):
        """
        Compute the analytic partials of the residual.

        Parameters
        ----------
        inputs : Vector
            Unscaled, dimensional input variables read via inputs[key].
        outputs : Vector
            Unscaled, dimensional output variables read via outputs[key].
        partials : Jacobian
            Sub-jac components written to partials[output_name, input_name].
        """
        scale = 1.0 / self.options['mass_flow_ref']
        partials['capture_height', 'captured_mass_flow'] = scale
        partials['capture_height', 'required_mass_flow'] = -scale
