"""The self-consistent winding temperature: copper loss and the rise it causes at one point.

The copper loss depends on the winding temperature it produces: :func:`operating_temperature`
iterates the two to a fixed point, the rise from the thermal network
(:func:`emgate.physics.thermal.machine_temperature_rise`), and reports a thermal run-away as
a result, never a hang.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from typing import NamedTuple

from emgate.physics.thermal import ThermalEstimate

#: Fixed-point tolerance on the winding temperature [K], and the iteration cap.
FIXED_POINT_TOLERANCE: float = 0.01
FIXED_POINT_MAX_ITERATIONS: int = 200
#: A winding estimated above this [K] (1000 degC) is a run-away, whatever the iteration does.
RUNAWAY_TEMPERATURE: float = 1273.15


class OperatingPoint(NamedTuple):
    """Result of :func:`operating_temperature`.

    Parameters
    ----------
    temperature : float
        Mean winding temperature at the fixed point [K] (the last iterate if not converged).
    copper_loss : float
        Copper loss at that temperature [W].
    estimate : ThermalEstimate or None
        The thermal estimate at the fixed point; None when the network failed (run-away).
    iterations : int
    converged : bool
        Within the tolerance.
    runaway : bool
        No fixed point: the copper loss grows with temperature faster than the cooling
        sheds it (the contraction ratio reached 1, the temperature passed
        :data:`RUNAWAY_TEMPERATURE`, or the surface could shed the heat at no plausible
        temperature).
    error_bound : float
        A-posteriori bound on the temperature error [K]: step q / (1 - q), q the observed
        contraction ratio.
    """

    temperature: float
    copper_loss: float
    estimate: ThermalEstimate | None
    iterations: int
    converged: bool
    runaway: bool
    error_bound: float


def operating_temperature(
    copper_loss_20: float,
    alpha20: float,
    estimate: Callable[[float], ThermalEstimate],
    coolant_temperature: float,
    *,
    tolerance: float = FIXED_POINT_TOLERANCE,
    max_iterations: int = FIXED_POINT_MAX_ITERATIONS,
) -> OperatingPoint:
    """Winding temperature at which the copper loss and the rise it causes agree.

    Solves ``T = T_c + rise(P_cu(T))`` with ``P_cu(T) = P_cu20 (1 + alpha20 (T - 20 degC))``
    (IEC 60028 linear resistance law) by fixed-point iteration from the coolant temperature.
    The map is increasing, so the iterates rise monotonically to the lowest fixed point;
    convergence is declared when the a-posteriori error bound ``dT q / (1 - q)`` (q the
    observed ratio of successive steps) is below ``tolerance``. A ratio of 1 or more, a
    temperature above :data:`RUNAWAY_TEMPERATURE` or a network that cannot shed the heat
    is a thermal run-away, reported in the result.

    Parameters
    ----------
    copper_loss_20 : float
        Copper loss with the winding at 20 degC [W].
    alpha20 : float
        Temperature coefficient of resistance at 20 degC [1/K] (copper 0.00393).
    estimate : callable
        ``estimate(copper_loss)`` returns the :class:`ThermalEstimate` with that copper
        loss (other losses fixed).
    coolant_temperature : float
        [K], the start.
    tolerance : float, optional
        [K], default 0.01 K.
    max_iterations : int, optional

    Returns
    -------
    OperatingPoint

    References
    ----------
    IEC 60028 (R(T) = R20 (1 + alpha20 (T - 20 degC)), alpha20 = 0.00393 /K for annealed
    copper); Banach's fixed-point theorem for the contraction and its a-posteriori error
    bound [calc].
    """
    if copper_loss_20 < 0.0 or not tolerance > 0.0 or max_iterations < 1:
        raise ValueError("copper loss must be >= 0, tolerance > 0, iterations >= 1")

    def loss_at(t: float) -> float:
        return copper_loss_20 * (1.0 + alpha20 * (t - 293.15))

    t = coolant_temperature
    last_step = math.inf
    q = 0.0
    est: ThermalEstimate | None = None
    for k in range(1, max_iterations + 1):
        try:
            est = estimate(loss_at(t))
        except ValueError:
            return OperatingPoint(t, loss_at(t), None, k, False, True, math.inf)
        t_new = est.winding_temperature
        step = abs(t_new - t)
        t = t_new
        if t > RUNAWAY_TEMPERATURE:
            return OperatingPoint(t, loss_at(t), est, k, False, True, math.inf)
        if step == 0.0:
            return OperatingPoint(t, loss_at(t), est, k, True, False, 0.0)
        if math.isfinite(last_step):
            q = step / last_step
            if q >= 1.0:
                return OperatingPoint(t, loss_at(t), est, k, False, True, math.inf)
            bound = step * q / (1.0 - q)
            if bound < tolerance:
                # One more evaluation so the estimate and the loss belong to t itself.
                est = estimate(loss_at(t))
                return OperatingPoint(t, loss_at(t), est, k, True, False, bound)
        last_step = step
    bound = last_step * q / (1.0 - q) if q < 1.0 else math.inf
    return OperatingPoint(t, loss_at(t), est, max_iterations, False, False, bound)
