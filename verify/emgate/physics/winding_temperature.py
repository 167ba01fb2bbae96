"""The self-consistent winding temperature: copper loss and the rise it causes at one point.

The copper loss depends on the winding temperature it produces: :func:`operating_temperature`
iterates the two to a fixed point, the rise from the thermal network
(:func:`emgate.physics.thermal.machine_temperature_rise`), and reports a thermal run-away as
a result, never a hang.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

from emgate.physics.thermal import ThermalEstimate

#: Fixed-point tolerance on the winding temperature [K], and the iteration cap.
FIXED_POINT_TOLERANCE: float = 0.01
FIXED_POINT_MAX_ITERATIONS: int = 200
#: A winding estimated above this [K] (1000 degC) is a run-away, whatever the iteration does.
RUNAWAY_TEMPERATURE: float = 1273.15


@dataclass(frozen=True)
class OperatingPoint:
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
        A-posteriori bound on the temperature error [K] (see :func:`operating_temperature`).
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
    (IEC 60028 linear resistance law) by fixed-point iteration from the coolant temperature,
    accelerated by Steffensen's method (Aitken's extrapolation after every two steps).
    The map is increasing, so the plain iterates rise monotonically to the lowest fixed
    point. Convergence is declared when an a-posteriori error bound is below ``tolerance``
    (q the observed ratio of two successive plain steps, dT the last): ``dT / (1 - q)`` for
    the temperature the last estimate was made at, which is then the result, else ``dT q /
    (1 - q)`` for the one that step reached, where one more estimate is made. A ratio of 1
    or more, a temperature above :data:`RUNAWAY_TEMPERATURE` or a network that cannot shed
    the heat is a thermal run-away, reported in the result; one met after an extrapolation
    sends the iteration back to where it jumped from, to go on without jumps.

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
    bound [calc]; Aitken's delta-squared extrapolation (Steffensen's method), e.g. Burden and
    Faires, Numerical Analysis, section 2.5.
    """
    if copper_loss_20 < 0.0 or not tolerance > 0.0 or max_iterations < 1:
        raise ValueError("copper loss must be >= 0, tolerance > 0, iterations >= 1")

    def loss_at(t: float) -> float:
        return copper_loss_20 * (1.0 + alpha20 * (t - 293.15))

    t = coolant_temperature
    last_step = math.inf
    q = 0.0
    est: ThermalEstimate | None = None
    # Steffensen's acceleration: after two plain steps with the ratio q < 1, the iterate
    # jumps to Aitken's estimate of the limit (the map is nearly affine: the rise is linear
    # in the losses but for the surface's film), and plain steps resume from there. The
    # error bound and every run-away test are those of the plain steps; a run-away seen
    # after a jump restarts the plain iteration from before it, without jumps, so that a
    # jump past a higher, unstable fixed point is never taken for a run-away.
    plain, jumped_from, accelerate = 0, None, True
    k = 0
    while k < max_iterations:
        k += 1
        try:
            est = estimate(loss_at(t))
        except ValueError:
            if jumped_from is not None:
                t, last_step, plain, jumped_from, accelerate = jumped_from, math.inf, 0, None, False
                continue
            return OperatingPoint(t, loss_at(t), None, k, False, True, math.inf)
        t_new = est.winding_temperature
        step = abs(t_new - t)
        t_old, t = t, t_new
        plain += 1
        if t > RUNAWAY_TEMPERATURE or (math.isfinite(last_step) and step >= last_step > 0.0):
            if jumped_from is not None:
                t, last_step, plain, jumped_from, accelerate = jumped_from, math.inf, 0, None, False
                continue
            return OperatingPoint(t, loss_at(t), est, k, False, True, math.inf)
        if step == 0.0:
            return OperatingPoint(t, loss_at(t), est, k, True, False, 0.0)
        if math.isfinite(last_step) and plain >= 2:
            q = step / last_step
            here = step / (1.0 - q)  # the bound at t_old, where the estimate was made
            if here < tolerance:
                return OperatingPoint(t_old, loss_at(t_old), est, k, True, False, here)
            bound = step * q / (1.0 - q)
            if bound < tolerance:
                # One more evaluation so the estimate and the loss belong to t itself.
                est = estimate(loss_at(t))
                return OperatingPoint(t, loss_at(t), est, k, True, False, bound)
            if accelerate:
                jumped_from = t
                t += math.copysign(bound, t - t_old)  # Aitken's limit of the last two steps
                last_step, plain = math.inf, 0
                continue
        last_step = step
    bound = last_step * q / (1.0 - q) if q < 1.0 else math.inf
    return OperatingPoint(t, loss_at(t), est, max_iterations, False, False, bound)
