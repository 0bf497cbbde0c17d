"""Drainage: back pressure, the differential across the trap, the stall threshold, and
which arrangement a unit needs.

Pressures are absolute [Pa], heights [m]. A column of condensate of height h is worth
ρ·g·h, with ρ the density of saturated water at the return pressure and g = 9.80665 m/s².

The trap discharges while

    p_coil + ρ·g·fill_head  >  p_return + ρ·g·lift + Δp_trap,min,

so the coil stalls at or below the *stall pressure*

    p_stall = p_return + ρ·g·(lift − fill_head) + Δp_trap,min.

Verdicts compare with stated tolerances, so that a figure on a limit is not turned
into a stall by floating-point noise: a stall counts only where the stall pressure is
above the coil pressure by more than :data:`PRESSURE_TOLERANCE`. A vacuum breaker
counts only where gravity leaves the trap a working differential of at least
:data:`GRAVITY_MARGIN`.
"""

from __future__ import annotations

from dataclasses import dataclass

from stallcheck.physics.constants import GRAVITY
from stallcheck.physics.traps import SELECTION_DIFFERENTIAL

#: A stall counts only where the stall pressure exceeds the coil pressure by more than
#: this [Pa] (0.1 mbar, far below what any gauge reads): on a coil whose pressure curve
#: is flat at low load, a smaller gap is rounding, not a crossing.
PRESSURE_TOLERANCE = 10.0
#: The least differential gravity must leave across the trap for a vacuum breaker to
#: drain the coil [Pa]: 1/4 psi, the differential traps on modulating coils are sized
#: at (US Department of Veterans Affairs, HVAC Design Manual, steam section; common
#: practice).
GRAVITY_MARGIN = SELECTION_DIFFERENTIAL

#: What each installed arrangement can cope with: the required arrangements it covers.
COVERS = {
    "trap": {"trap"},
    "constant-purge": {"trap"},
    "trap-vacuum-breaker": {"trap", "trap-vacuum-breaker"},
    "pump-trap": {"trap", "trap-vacuum-breaker", "pump-trap"},
}


def head(height, density):
    """Pressure of a liquid column [Pa]: ρ·g·h, height [m], density [kg/m³]."""
    return density * GRAVITY * height


def back_pressure(return_pressure, lift, density):
    """Pressure the trap discharges against [Pa]: return pressure plus the lift head."""
    return return_pressure + head(lift, density)


@dataclass(frozen=True)
class Requirement:
    """The drainage a unit needs and why.

    Attributes
    ----------
    required : str
        ``"trap"``, ``"trap-vacuum-breaker"`` or ``"pump-trap"``.
    reason : str
        Why (the codes of :class:`stallcheck.result.Drainage`'s ``why_required``).
    facts : dict
        The SI figures that decide it (see :class:`stallcheck.result.Drainage`).
    """

    required: str
    reason: str
    facts: dict


def stalls_in_range(stall_fraction, minimum, stall_pressure, coil_pressure_at_minimum):
    """True where a unit stalls above its minimum load: the stall point lies above the
    minimum load *and* at the minimum load the coil pressure is below the stall pressure
    by more than :data:`PRESSURE_TOLERANCE` (arrays or floats)."""
    return (stall_fraction > minimum) & (stall_pressure - coil_pressure_at_minimum > PRESSURE_TOLERANCE)


def cannot_discharge(differential, trap_min_differential):
    """True where the trap cannot discharge: the differential across it (coil pressure
    plus fill head, less the back pressure [Pa]) is at or below the least it opens at
    [Pa], by more than :data:`PRESSURE_TOLERANCE` (arrays or floats). The one stall rule
    of the check's chart and of ``diagnose``'s readings."""
    return differential <= trap_min_differential - PRESSURE_TOLERANCE


def vacuum_breaker_acts(stall_pressure, atmospheric):
    """True where a vacuum breaker lets the coil drain by gravity: with the coil held at
    atmospheric pressure, the fill head leaves the trap at least :data:`GRAVITY_MARGIN`
    beyond its minimum differential against the back pressure,
    p_atm + ρ·g·fill ≥ p_back + Δp_trap,min + margin, that is
    p_stall ≤ p_atm − margin."""
    return stall_pressure <= atmospheric - GRAVITY_MARGIN


def required_arrangement(stall_fraction: float, in_range: bool, stall_pressure: float,
                atmospheric: float) -> Requirement:
    """Choose the drainage from the computed pressures.

    * never stalls above the minimum load → a plain trap;
    * stalls, but a vacuum breaker holding the coil at atmospheric pressure leaves
      gravity a working differential (:func:`vacuum_breaker_acts`) → a trap with a
      vacuum breaker;
    * otherwise only a pump-trap (or pump and receiver) can move the condensate against
      the back pressure.

    Parameters
    ----------
    stall_fraction : float
        Load below which the unit stalls (0: never). [-]
    in_range : bool
        Whether it stalls above its minimum load (:func:`stalls_in_range`).
    stall_pressure : float
        Coil pressure at which the trap stops discharging. [Pa]
    atmospheric : float
        Site atmospheric pressure. [Pa]

    References
    ----------
    .. [1] US Department of Veterans Affairs, HVAC Design Manual, steam section:
       float-and-thermostatic traps with vacuum breakers on modulating equipment,
       sized at 1/4 psi differential.
    """
    facts = {"load": stall_fraction, "stall_pressure": stall_pressure}
    if not in_range:
        return Requirement("trap", "below-minimum" if stall_fraction > 0 else "never", facts)
    gravity = atmospheric - stall_pressure
    facts.update(gravity=gravity, wanted=GRAVITY_MARGIN)
    if vacuum_breaker_acts(stall_pressure, atmospheric):
        return Requirement("trap-vacuum-breaker", "vacuum-breaker", facts)
    return Requirement("pump-trap", "gravity-short" if gravity > 0 else "above-atmospheric", facts)


def installed_adequate(installed: str, required: str) -> tuple[bool, str]:
    """Whether what is installed does the job required, with the reason's code
    (``"covers"``, ``"purge"``: a purge cannot drain a stall, or ``"cannot"``)."""
    if required in COVERS[installed]:
        return True, "covers"
    return False, "purge" if installed == "constant-purge" else "cannot"
