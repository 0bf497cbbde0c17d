"""Validated input objects: one unit, all SI, every pressure absolute.

:mod:`stallcheck.unitfile` builds these from a TOML unit file; the physics reads only
these. Units in brackets: pressures [Pa] absolute unless named a differential,
temperatures [K], lengths [m], mass flows [kg/s], volume flows [m³/s].
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace

MEDIA = ("air", "water", "ethylene-glycol", "propylene-glycol")
METHODS = ("ntu", "mean-temperature")
VARIES = ("inlet-temperature", "flow")
ARRANGEMENTS = ("trap", "trap-vacuum-breaker", "pump-trap", "constant-purge")
TRAPS = ("float-thermostatic", "inverted-bucket", "thermodynamic", "thermostatic", "bimetallic")
CHARACTERISTICS = ("equal-percentage", "linear")


@dataclass(frozen=True)
class Site:
    """Where the unit is.

    Attributes
    ----------
    atmospheric_pressure : float
        Atmospheric pressure used for every gauge value. [Pa]
    basis : str
        How it was found, in words, for the assumptions list.
    """

    atmospheric_pressure: float
    basis: str


@dataclass(frozen=True)
class Design:
    """The selection point: full load.

    Attributes
    ----------
    medium : str
        One of :data:`MEDIA`.
    concentration : float or None
        Glycol mass fraction [-]; None for air and water.
    flow : float
        Design flow as written: mass [kg/s] where ``flow_is_mass``, else volume [m³/s]
        (air volumes are standard air).
    flow_is_mass : bool
    inlet_temperature : float
        Entering temperature at full load. [K]
    outlet_temperature : float
        Controlled leaving temperature (set point). [K]
    steam_pressure : float
        Steam pressure in the coil at full load. [Pa]
    ua_flow_exponent : float
        n in UA ∝ flowⁿ, 0 ≤ n ≤ 1. [-]
    method : str
        ``"ntu"`` or ``"mean-temperature"``.
    """

    medium: str
    concentration: float | None
    flow: float
    flow_is_mass: bool
    inlet_temperature: float
    outlet_temperature: float
    steam_pressure: float
    ua_flow_exponent: float
    method: str


@dataclass(frozen=True)
class Valve:
    """The modulating steam control valve.

    Attributes
    ----------
    cv : float
        Flow coefficient at full travel, US Cv (a Kv is stored as 1.156·Kv). [-]
    characteristic : str
        ``"equal-percentage"`` or ``"linear"``.
    rangeability : float
        Ratio of largest to smallest controllable Cv. [-]
    xt : float
        Pressure-differential ratio factor at choked flow (IEC 60534-2-1). [-]
    """

    cv: float
    characteristic: str
    rangeability: float
    xt: float


@dataclass(frozen=True)
class LoadBin:
    """Operating hours at one entering temperature [K] or one load fraction [-]."""

    hours: float
    inlet_temperature: float | None = None
    load: float | None = None


@dataclass(frozen=True)
class Load:
    """How the load moves.

    Attributes
    ----------
    varies : str
        ``"inlet-temperature"`` (flow fixed) or ``"flow"`` (temperatures fixed).
    minimum : float
        Lowest load fraction the unit runs at. [-]
    bins : tuple of LoadBin
    """

    varies: str
    minimum: float
    bins: tuple[LoadBin, ...] = ()


@dataclass(frozen=True)
class CapacityPoint:
    """One row of a drain device's rated capacity: differential [Pa], flow [kg/s]."""

    differential: float
    flow: float


@dataclass(frozen=True)
class Drain:
    """What drains the coil.

    Attributes
    ----------
    arrangement : str
        One of :data:`ARRANGEMENTS`.
    trap : str
        One of :data:`TRAPS`.
    fill_head : float
        Height from the coil's condensate outlet down to the trap inlet. [m]
    lift : float
        Vertical rise in the discharge after the trap. [m]
    return_pressure : float
        Pressure in the return main or receiver. [Pa]
    trap_min_differential : float
        Smallest differential at which the trap still opens. [Pa]
    capacity : tuple of CapacityPoint
    """

    arrangement: str
    trap: str
    fill_head: float
    lift: float
    return_pressure: float
    trap_min_differential: float
    capacity: tuple[CapacityPoint, ...] = ()


@dataclass(frozen=True)
class Geometry:
    """Coil and piping layout; None where the file does not say."""

    tubes: str | None = None
    supply_feed: str | None = None
    distributing_tubes: bool | None = None
    pitched_to_return: bool | None = None
    coils_per_trap: int | None = None
    drop_to_trap: float | None = None
    drop_vented: bool | None = None
    drip_before_valve: bool | None = None


@dataclass(frozen=True)
class Unit:
    """One steam-heated unit, validated.

    Attributes
    ----------
    name, tag : str
    source : str
        The file it came from (for messages).
    system : str
        ``"us"`` or ``"si"``: the units the file is written in, the default for display.
    defaults : tuple of str
        Defaults taken for keys the file leaves out, in words.
    warnings : tuple of str
        Unknown keys and the like: reported, not fatal.
    """

    name: str
    tag: str
    site: Site
    design: Design
    supply_pressure: float
    load: Load
    drain: Drain
    valve: Valve | None = None
    geometry: Geometry | None = None
    source: str = ""
    system: str = "si"
    defaults: tuple[str, ...] = ()
    warnings: tuple[str, ...] = field(default=())

    def with_method(self, method: str) -> "Unit":
        """The same unit analysed with another heat-transfer method."""
        return replace(self, design=replace(self.design, method=method))
