"""Drainage: back pressure, the differential across the trap, the stall threshold, and
which arrangement a unit needs.

Pressures are absolute [Pa], heights [m]. A column of condensate of height h is worth
ρ·g·h, with ρ the density of saturated water at the return pressure and g = 9.80665 m/s².

The trap discharges while

    p_coil + ρ·g·fill_head  >  p_return + ρ·g·lift + Δp_trap,min,

so the coil stalls at or below the *stall pressure*

    p_stall = p_return + ρ·g·(lift − fill_head) + Δp_trap,min.
"""

from __future__ import annotations

from dataclasses import dataclass

from stallcheck.quantities import GRAVITY

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


def stall_pressure(return_pressure, lift, fill_head, trap_min_differential, density):
    """Coil pressure at or below which the trap cannot discharge [Pa] (module docstring)."""
    return back_pressure(return_pressure, lift, density) + trap_min_differential - head(fill_head, density)


@dataclass(frozen=True)
class Requirement:
    """The drainage a unit needs and why.

    Attributes
    ----------
    required : str
        ``"trap"``, ``"trap-vacuum-breaker"`` or ``"pump-trap"``.
    reason : str
        In plain words, with the pressures that decide it.
    """

    required: str
    reason: str


def requirement(stall_fraction: float, minimum: float, stall_pressure_: float,
                atmospheric: float, words) -> Requirement:
    """Choose the drainage from the computed pressures.

    * never stalls above the minimum load → a plain trap;
    * stalls, but only once the coil is below atmospheric pressure → a vacuum breaker
      lets air in at atmospheric pressure, and the fill head then drains the coil by
      gravity (stall pressure ≤ atmospheric);
    * stalls while the coil is still above atmospheric → only a pump-trap (or pump
      and receiver) can lift the condensate against the back pressure.

    Parameters
    ----------
    stall_fraction : float
        Load below which the unit stalls (0: never). [-]
    minimum : float
        Lowest load the unit runs at. [-]
    stall_pressure_ : float
        Coil pressure at which the trap stops discharging. [Pa]
    atmospheric : float
        Site atmospheric pressure. [Pa]
    words : callable
        Formats a pressure [Pa] for the reason text (display units).

    References
    ----------
    .. [1] US Department of Veterans Affairs, HVAC Design Manual, steam section:
       float-and-thermostatic traps with vacuum breakers on modulating equipment.
    """
    if stall_fraction <= minimum:
        if stall_fraction > 0:
            why = (f"it stalls only below {stall_fraction:.0%} load, under the minimum load of "
                   f"{minimum:.0%}, so a trap alone drains it wherever it runs")
        else:
            why = "the coil pressure stays above the back pressure at every load, so a trap alone drains it"
        return Requirement("trap", why)
    where = (f"it stalls below {stall_fraction:.0%} load, where the coil pressure falls to "
             f"{words(stall_pressure_)}" if stall_fraction < 1 else
             f"it stalls at every load: the trap needs the coil above {words(stall_pressure_)}, "
             f"more than it has at full load")
    if stall_pressure_ <= atmospheric:
        return Requirement(
            "trap-vacuum-breaker",
            f"{where}; that is below atmospheric, so a vacuum breaker "
            f"can hold the coil at atmospheric pressure and the fill head then drains it by gravity")
    return Requirement(
        "pump-trap",
        f"{where}; that is above atmospheric, and a vacuum breaker cannot help against "
        f"that back pressure, so a pump-trap (or pump and receiver) must lift the condensate")


def adequacy(installed: str, required: str) -> tuple[bool, str]:
    """Whether what is installed does the job required, with the reason."""
    ok = required in COVERS[installed]
    if ok:
        return True, f"the installed {installed} covers what is required ({required})"
    if installed == "constant-purge":
        return False, ("a constant purge keeps steam flowing only while the coil pressure is above the "
                       f"back pressure; it cannot drain a coil that stalls ({required} required)")
    return False, f"the installed {installed} cannot drain the coil while it stalls ({required} required)"
