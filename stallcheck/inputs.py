"""Validated input objects: one unit, all SI, every pressure absolute.

:mod:`stallcheck.files.unitfile` builds these from a TOML unit file; the physics reads only
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
#: Margin on the full-load condensing rate a trap on a modulating coil is selected
#: with, where the unit file gives none [-] (common practice: 1.5 to 2 in the VA HVAC
#: Design Manual, 2 to 4 in NAVFAC MO-209).
DEFAULT_MARGIN = 2.0



@dataclass(frozen=True)
class Site:
    """Where the unit is.

    Attributes
    ----------
    atmospheric_pressure : float
        Atmospheric pressure used for every gauge value. [Pa]
    hours_per_year : float or None
        Hours a year the unit runs, for yearly purge figures (load bins override). [h]
    steam_price : float or None
        Money per ``steam_price_per`` of steam. [currency]
    steam_price_per : float or None
        The quantity of steam the price is for (set wherever a price is). [kg]
    currency : str
        The price's currency, as written (shown beside costs).
    elevation : float or None
        The elevation given in the file, where given. [m]
    pressure_given : bool
        True where the file gives the atmospheric pressure itself.
    weather : WeatherYear or None
        The site's hourly weather year, where the file names one.
    """

    atmospheric_pressure: float
    hours_per_year: float | None = None
    steam_price: float | None = None
    steam_price_per: float | None = None
    currency: str = ""
    elevation: float | None = None
    pressure_given: bool = False
    weather: "WeatherYear | None" = None


@dataclass(frozen=True, eq=False)
class WeatherYear:
    """A year of hourly weather at a station, as read from an EPW or TMY3 file.

    Attributes
    ----------
    path : str
        The file as the unit file names it (relative to the unit file, or absolute).
    resolved : str
        The file's absolute path.
    form : str
        ``"epw"`` or ``"tmy3"``.
    station : str
        The station's name, state and country as the file gives them.
    elevation : float or None
        The station's elevation. [m]
    dry_bulb : numpy.ndarray
        Dry-bulb temperature of each hour, in the file's order. [K]
    month : numpy.ndarray
        Month of each hour, 1 to 12. [-]
    hour : numpy.ndarray
        Hour of the day each hour begins at, 0 to 23, local standard time. [-]
    design_996, design_990 : float or None
        The heating 99.6 % and 99 % dry bulbs the file itself states (an EPW
        ``DESIGN CONDITIONS`` line), where it does. [K]
    """

    path: str
    resolved: str
    form: str
    station: str
    elevation: float | None
    dry_bulb: object
    month: object
    hour: object
    design_996: float | None = None
    design_990: float | None = None


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
    given_as : str
        ``"cv"`` or ``"kv"``: the coefficient the file gave, which every output quotes.
    """

    cv: float
    characteristic: str
    rangeability: float
    xt: float
    given_as: str = "cv"


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
    outdoor_air_minimum : float
        With a weather file: the least share of outdoor air in what enters the coil
        (1: all outdoor air). [-]
    return_air_temperature : float or None
        The air mixed with the outdoor air (required where the share is below 1). [K]
    mixed_air_temperature : float or None
        The mixed temperature an economiser holds by opening the outdoor air beyond
        its minimum, where it does. [K]
    season : tuple of int
        Months the unit runs (1 to 12); empty: all year.
    daily_hours : tuple of (int, int) or None
        The hour of the day it starts and the hour it stops (0 to 24, local standard
        time; a stop before the start runs past midnight); None: all day.
    """

    varies: str
    minimum: float
    bins: tuple[LoadBin, ...] = ()
    outdoor_air_minimum: float = 1.0
    return_air_temperature: float | None = None
    mixed_air_temperature: float | None = None
    season: tuple[int, ...] = ()
    daily_hours: tuple[int, int] | None = None


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
        The trap's rated capacity against differential, differentials increasing.
    capacity_margin : float
        Margin on the full-load condensing rate when selecting the trap. [-]
    trap_max_differential : float or None
        The largest differential the trap opens against (its maker's maximum
        operating differential), where given. [Pa]
    trap_orifice : float or None
        Bore of the trap seat, used where no capacity table is given. [m]
    motive_pressure : float or None
        Steam or air pressure driving a pump-trap; None: the supply pressure. [Pa]
    pump_fill_head : float or None
        Filling head the pump-trap's maker asks for. [m]
    pump_capacity : float or None
        Pump-trap capacity from the maker's table at this unit's motive pressure,
        back pressure and fill head. [kg/s]
    pump_table : tuple of (float, float)
        Or the maker's table itself at this motive pressure and fill head: rows of
        back pressure [Pa] absolute, increasing, and capacity [kg/s].
    purge_orifice, purge_rate : float or None
        A constant purge's bore [m], or its stated steam rate [kg/s].
    return_line : float or None
        Inside diameter of the line the trap discharges into. [m]
    return_temperature : float or None
        Temperature of the condensate already in that line (a pumped or flooded
        return runs below saturation). [K]
    return_length : float or None
        Length of that line from the trap (or pump-trap) to the receiver or main. [m]
    return_pitch : float or None
        Its fall in the direction of flow per length; negative where it rises against
        the flow. [-]
    return_material : str
        ``"steel"`` or ``"copper"``: the wall's elasticity sets the surge wave speed.
    return_wall : float or None
        Its wall thickness; None: Schedule 40 steel for the bore. [m]
    return_rating : float or None
        The pressure the line and its fittings are rated for. [Pa] absolute
    pump_rate : float or None
        A pump-trap's discharge rate while it pumps (the maker's figure). [kg/s]
    pump_rate_volume : float or None
        Or that rate as a volume of condensate (taken at the line's saturated liquid
        density). [m³/s]
    check_closing_time : float
        How long the check valve on the discharge takes to close; 0: at once (a
        swing check that slams). [s]
    """

    arrangement: str
    trap: str
    fill_head: float
    lift: float
    return_pressure: float
    trap_min_differential: float
    capacity: tuple[CapacityPoint, ...] = ()
    capacity_margin: float = DEFAULT_MARGIN
    trap_max_differential: float | None = None
    trap_orifice: float | None = None
    motive_pressure: float | None = None
    pump_fill_head: float | None = None
    pump_capacity: float | None = None
    pump_table: tuple[tuple[float, float], ...] = ()
    purge_orifice: float | None = None
    purge_rate: float | None = None
    return_line: float | None = None
    return_temperature: float | None = None
    return_length: float | None = None
    return_pitch: float | None = None
    return_material: str = "steel"
    return_wall: float | None = None
    return_rating: float | None = None
    pump_rate: float | None = None
    pump_rate_volume: float | None = None
    check_closing_time: float = 0.0


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
