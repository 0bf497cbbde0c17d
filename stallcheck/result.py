"""The result of analysing one unit. Everything in SI base units: pressures [Pa]
absolute, temperatures [K], mass flows [kg/s], heat [W], fractions [-].

Presenters (``stallcheck.render``) turn it into text, a chart or JSON; nothing here
prints or formats.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Mapping

import numpy as np

SEVERITIES = ("info", "warning", "danger")

#: The cautions every result carries, as codes (their words: ``render/words.CAUTION_WORDS``):
#: a screening aid only, and steam's hazards.
CAUTIONS = ("screening-aid", "steam-hazard")
#: Added to the cautions where hours come from a weather file: a typical year is typical.
YEAR_CAUTION = "typical-year"


def caution_codes(weather: bool) -> tuple[str, ...]:
    """The cautions of a result (or of a survey): every page's, and a typical year's
    where hours come from a weather year."""
    return CAUTIONS + ((YEAR_CAUTION,) if weather else ())



@dataclass(frozen=True)
class Finding:
    """One thing the user should know, as facts: the words (what, why, and what to
    do) are made from them by :func:`stallcheck.render.words.finding`.

    Attributes
    ----------
    code : str
        Stable kebab-case identifier.
    severity : str
        ``"info"``, ``"warning"`` or ``"danger"``.
    parts : tuple of str
        Which parts of the code's message template apply, in order.
    facts : dict
        The numbers the message quotes (SI: pressures absolute [Pa], temperatures
        [K], flows [kg/s], lengths [m]; load fractions [-]) and the arrangement names.
    """

    code: str
    severity: str
    parts: tuple[str, ...] = ("",)
    facts: Mapping[str, Any] = field(default_factory=dict)


@dataclass(frozen=True)
class DesignPoint:
    """Full load.

    Attributes
    ----------
    load : float  [W]
    steam_flow : float  [kg/s]
    coil_pressure : float  [Pa]
    steam_temperature : float  [K]
    medium_mass_flow : float  [kg/s]
    medium_cp : float  [J/(kg·K)]
    """

    load: float
    steam_flow: float
    coil_pressure: float
    steam_temperature: float
    medium_mass_flow: float
    medium_cp: float


@dataclass(frozen=True)
class StallPoint:
    """Where the trap stops discharging.

    Attributes
    ----------
    occurs : bool
        True where the unit stalls at some load in (0, 1].
    threshold_pressure : float
        Coil pressure at or below which the trap cannot discharge. [Pa]
    load_fraction : float or None
        Load below which it stalls; 1.0 where stalled even at full load. [-]
    coil_pressure, steam_temperature, condensate, inlet_temperature : float or None
        At the stall point [Pa], [K], [kg/s], [K] (inlet only where the load follows it).
        Where the unit is stalled even at full load, these are the coil's own figures
        at full load, and ``threshold_pressure`` (above them) is what the trap needs.
    in_range : bool
        True where the load brings it to a stall above its minimum load, beyond the
        verdict's tolerance (:func:`stallcheck.physics.drainage.stalls_in_range`);
        :attr:`floods_in_range` adds the valve's stall.
    valve_load_fraction : float or None
        Where the control valve is too small: the load from which, up to full load, the
        open valve holds the coil at or under the stall pressure (0: at every load);
        None where the valve never does. The fields above describe the stall the load
        itself brings (``occurs`` and ``load_fraction``), this one the valve's. [-]
    valve_coil_pressure : float or None
        The coil pressure the open valve holds at full load, where it floods the coil. [Pa]
    """

    occurs: bool
    threshold_pressure: float
    load_fraction: float | None = None
    coil_pressure: float | None = None
    steam_temperature: float | None = None
    condensate: float | None = None
    inlet_temperature: float | None = None
    in_range: bool = False
    valve_load_fraction: float | None = None
    valve_coil_pressure: float | None = None

    @property
    def floods_in_range(self) -> bool:
        """True where the coil stalls at a load it runs at: by its load above its minimum
        load, or by its valve (which holds it under up to full load, where it runs)."""
        return self.in_range or self.valve_load_fraction is not None

    @property
    def floods(self) -> bool:
        """True where the coil stalls at some load in (0, 1], by its load or its valve."""
        return self.occurs or self.valve_load_fraction is not None

    @property
    def ranges(self) -> tuple[tuple[float, float], ...]:
        """The stalled load ranges [-], as (from, to) pairs in (0, 1], merged."""
        out = []
        if self.occurs:
            out.append([0.0, float(self.load_fraction)])
        if self.valve_load_fraction is not None:
            if out and self.valve_load_fraction <= out[-1][1]:
                out[-1][1] = 1.0
            else:
                out.append([self.valve_load_fraction, 1.0])
        return tuple((a, b) for a, b in out)


@dataclass(frozen=True)
class Points:
    """The unit across its load range, as arrays of equal length.

    Attributes
    ----------
    load_fraction : ndarray  [-]
    inlet_temperature : ndarray  [K]
    coil_pressure : ndarray  [Pa]
    steam_temperature : ndarray  [K]
    steam_flow : ndarray  [kg/s]
    drain_differential : ndarray
        p_coil + fill head − back pressure. [Pa]
    stalled : ndarray of bool
    valve_opening : ndarray or None
        Travel 0–1; 1 where the open valve cannot pass what the load needs. [-]
    needed_coil_pressure : ndarray or None
        The coil pressure each load needs; ``coil_pressure`` is below it where the
        valve holds the coil down (``valve_limited``). [Pa]
    """

    load_fraction: np.ndarray
    inlet_temperature: np.ndarray
    coil_pressure: np.ndarray
    steam_temperature: np.ndarray
    steam_flow: np.ndarray
    drain_differential: np.ndarray
    stalled: np.ndarray
    valve_opening: np.ndarray | None = None
    needed_coil_pressure: np.ndarray | None = None

    @property
    def valve_limited(self) -> np.ndarray:
        """True at the loads where the open valve holds the coil under what it needs."""
        if self.needed_coil_pressure is None:
            return np.zeros(self.load_fraction.shape, dtype=bool)
        return self.coil_pressure < self.needed_coil_pressure - 1e-6


@dataclass(frozen=True)
class Drainage:
    """Installed against required arrangement, and why (as codes and SI facts; the
    words are made by :func:`stallcheck.render.words.drainage_reasons`).

    Attributes
    ----------
    installed, required : str
        Arrangements.
    adequate : bool
    why_required : str
        Why the required arrangement: ``"never"`` (no stall), ``"below-minimum"``,
        ``"vacuum-breaker"``, ``"gravity-short"`` or ``"above-atmospheric"``.
    why_adequate : str
        Why the installed one is adequate or not: ``"covers"``, ``"purge"`` (a purge
        cannot drain a stall) or ``"cannot"``.
    facts : dict
        ``load`` (stall point [-]), ``stall_pressure`` [Pa], and where a vacuum breaker
        was weighed ``gravity`` (the differential it would leave [Pa]) and ``wanted``
        [Pa].
    """

    installed: str
    required: str
    adequate: bool
    why_required: str
    why_adequate: str
    facts: Mapping[str, Any] = field(default_factory=dict)


@dataclass(frozen=True)
class ValveResult:
    """Control valve figures.

    Attributes
    ----------
    cv : float
        Installed full-travel Cv. [-]
    required_cv_design : float  [-]
    opening_design : float
        Travel at design; above 1 where the valve is too small. [-]
    capacity_ok : bool
    choked_at_design : bool
    limited_load_fraction, limited_coil_pressure : float or None
        Where the open valve cannot pass the design load: what it delivers [-] and
        the coil pressure it holds [Pa].
    min_controllable_load : float
        Load at which the needed Cv falls to Cv/rangeability. [-]
    rangeability : float  [-]
    characteristic : str
    drain_cv : float or None
        Where the open valve holds the coil under its stall pressure: the least Cv
        that holds it the remedies' margin above it at full load, exact (printed
        rounded up); None where the valve does not stall the coil, or no valve on
        this supply can keep it draining. [-]
    given_as : str
        ``"cv"`` or ``"kv"``: the coefficient the unit file gave (every figure here is
        Cv; the words quote the file's own, Kv = Cv/1.156).
    """

    cv: float
    required_cv_design: float
    opening_design: float
    capacity_ok: bool
    choked_at_design: bool
    limited_load_fraction: float | None
    limited_coil_pressure: float | None
    min_controllable_load: float
    rangeability: float
    characteristic: str
    drain_cv: float | None = None
    given_as: str = "cv"


@dataclass(frozen=True)
class TrapFigures:
    """What the trap must pass, what it can, and where it falls short.

    Attributes
    ----------
    basis : str
        Where its capacity comes from: ``"table"`` (the maker's rows), ``"orifice"``
        (the seat bore given) or ``"selected"`` (nothing given: a trap selected by the
        usual rule, margin × full-load condensate at the working differential).
    bore : float or None
        Seat bore used by the orifice model (given, or the selected trap's). [m]
    margin : float
        Margin on the full-load condensate. [-]
    design_condensate, design_differential : float
        At full load. [kg/s], [Pa]
    working_load, working_condensate, working_differential : float
        The lowest differential the trap must still drain at, as arranged (or as the
        required arrangement would have it), with the load and condensate there.
        [-], [kg/s], [Pa]
    selection_differential : float
        The differential the trap is selected at: the working differential, but not
        less than 1/4 psi (no trap passes anything at no differential). [Pa]
    required_capacity : float
        margin × design condensate, to be passed at ``selection_differential``. [kg/s]
    installed_capacity : float or None
        What the trap passes at ``selection_differential`` (None when selected). [kg/s]
    limit_load : float or None
        Drainage limit: the highest load at which the trap cannot pass the condensate
        at the differential available there (None where it keeps up at every load). [-]
    limit_coil_pressure, limit_differential, limit_condensate, limit_inlet_temperature :
        float or None
        At the drainage limit. [Pa], [Pa], [kg/s], [K]
    widest_differential : float
        The most the trap's inlet can see against the least its outlet can: the supply
        pressure (the control valve wide open) and fill head less the return pressure
        (the line after it still empty). [Pa]
    rated_differential : float or None
        The largest differential the trap opens against, from its maker, where the unit
        file gives it (``drain.trap_max_differential``). [Pa]
    """

    basis: str
    bore: float | None
    margin: float
    design_condensate: float
    design_differential: float
    working_load: float
    working_condensate: float
    working_differential: float
    selection_differential: float
    required_capacity: float
    installed_capacity: float | None
    limit_load: float | None
    limit_coil_pressure: float | None = None
    limit_differential: float | None = None
    limit_condensate: float | None = None
    limit_inlet_temperature: float | None = None
    widest_differential: float = 0.0
    rated_differential: float | None = None

    @property
    def capacity_ok(self) -> bool | None:
        """Installed capacity at least the required (None when not known)."""
        if self.installed_capacity is None:
            return None
        return self.installed_capacity >= self.required_capacity * (1 - 1e-9)


@dataclass(frozen=True)
class PumpTrapFigures:
    """A pump-trap's duty, where one is installed or required.

    Attributes
    ----------
    installed : bool
    condensate : float
        The largest flow it must pump: the condensate at the stall point. [kg/s]
    load_fraction : float
        Where that is (the stall point). [-]
    back_pressure : float
        What it pumps against: return pressure plus lift head. [Pa]
    motive_pressure : float  [Pa]
    motive_given : bool
        False where the supply pressure was taken.
    fill_head, required_fill_head : float
        Available, and asked for by the maker (or common practice). [m]
    fill_head_given : bool
    capacity : float or None
        Rated pumping capacity at this duty: as given, or read from the maker's table
        at this back pressure. [kg/s]
    outside_table : bool
        The back pressure lies beyond the maker's table (no capacity is read off it).
    capacity_basis : str
        ``"given"``, ``"table"`` or ``""`` (not known).
    """

    installed: bool
    condensate: float
    load_fraction: float
    back_pressure: float
    motive_pressure: float
    motive_given: bool
    fill_head: float
    required_fill_head: float
    fill_head_given: bool
    capacity: float | None
    outside_table: bool = False
    capacity_basis: str = ""


@dataclass(frozen=True)
class PurgeFigures:
    """A constant purge's steam and cost.

    Attributes
    ----------
    basis : str
        ``"orifice"`` or ``"rate"``.
    bore : float or None  [m]
    design_rate, minimum_rate : float
        Steam bled at full load and at the minimum load. [kg/s]
    holds_differential : bool
        False where the coil pressure falls to the back pressure within the
        operating range (a purge cannot bleed then).
    hours, yearly_mass, yearly_cost : float or None
        Hours a year, steam bled a year [kg], and its cost [currency].
    hours_basis : str
        ``"bins"``, ``"weather"``, ``"site"`` or ``""`` (no hours known).
    currency : str
    """

    basis: str
    bore: float | None
    design_rate: float
    minimum_rate: float
    holds_differential: bool
    hours: float | None
    yearly_mass: float | None
    yearly_cost: float | None
    hours_basis: str
    currency: str


@dataclass(frozen=True, eq=False)
class YearFigures:
    """A year of the site's hourly weather run through the unit.

    Attributes
    ----------
    file, form, station : str
        The weather file as the unit file names it, ``"epw"`` or ``"tmy3"``, and the
        station it gives.
    station_elevation : float or None
        The station's elevation the file gives. [m]
    hours : int
        Hours in the file. [h]
    scheduled : int
        Hours in the unit's season and daily hours. [h]
    no_load : int
        Scheduled hours whose entering air needs no heat (at or above the set point). [h]
    operating : int
        Scheduled hours with a load: the hours the unit runs. [h]
    below_minimum : int
        Of those, hours asking less than the minimum load (run at the minimum). [h]
    above_full : int
        Of those, hours colder than the design entering temperature (run at full load,
        the air leaving short of its set point). [h]
    stalled : int
        Operating hours stalled. [h]
    stalled_freezing : int
        Stalled hours with the air entering the coil below 0 °C. [h]
    longest_freezing_run : int
        The longest run of consecutive stalled freezing hours, in the file's order. [h]
    dry_bulb_996, dry_bulb_990 : float
        The file's heating design dry bulbs: the temperatures at or below which 0.4 %
        and 1 % of its hours lie. [K]
    entering_996 : float
        The air entering the coil at the 99.6 % condition (mixed where it mixes). [K]
    design_inlet : float
        The design entering temperature, for comparison. [K]
    coldest_entering : float
        The coldest air entering the coil in the year's scheduled hours (mixed where it
        mixes). [K]
    stated_996, stated_990 : float or None
        The heating design dry bulbs the file itself states, where it does. [K]
    bands : tuple of (float, float or None, int, int)
        Operating hours by load band: the band's lower and upper load fraction [-]
        (the last band, from 1.0 with no upper end, holds the hours at or above full
        load), its hours and its stalled hours. [h]
    entering, running, stalled_hours : numpy.ndarray
        Each hour's entering temperature [K], whether the unit runs, and whether it
        runs stalled (for pictures of the year).
    month : numpy.ndarray
        Each hour's month, 1 to 12.
    """

    file: str
    form: str
    station: str
    station_elevation: float | None
    hours: int
    scheduled: int
    no_load: int
    operating: int
    below_minimum: int
    above_full: int
    stalled: int
    stalled_freezing: int
    longest_freezing_run: int
    dry_bulb_996: float
    dry_bulb_990: float
    entering_996: float
    design_inlet: float
    coldest_entering: float
    stated_996: float | None
    stated_990: float | None
    bands: tuple[tuple[float, float | None, int, int], ...]
    entering: Any = None
    running: Any = None
    stalled_hours: Any = None
    month: Any = None


@dataclass(frozen=True)
class FlashFigures:
    """Flash steam at full load, at the trap outlet and where it reaches the return.

    Attributes
    ----------
    fraction : float
        At the trap outlet, whose pressure is ``outlet_pressure``. [-]
    outlet_pressure : float
        The back pressure: the return plus the lift's head. [Pa] absolute
    return_fraction : float
        At the return pressure, where the condensate arrives (more than at the outlet
        where a lift lies between: the flash grows up it). [-]
    flow : float
        Flash steam at the return. [kg/s]
    volume_flow : float
        Its volume at the return pressure. [m³/s]
    line_diameter, velocity : float or None
        Return line bore [m] and mixture velocity in it at the return pressure [m/s],
        where the bore is given.
    return_temperature : float or None  [K]
    return_saturation_temperature : float  [K]
    """

    fraction: float
    outlet_pressure: float
    return_fraction: float
    flow: float
    volume_flow: float
    line_diameter: float | None
    velocity: float | None
    return_temperature: float | None
    return_saturation_temperature: float


#: Flow patterns in the line from the trap, worst first: slugs hammer; annular flow tears
#: condensate along at speed; the rest run quietly (``liquid only``: no flash).
PATTERNS = ("intermittent", "annular", "bubbly", "stratified wavy", "stratified smooth", "liquid only")
#: Patterns of vertical upflow in a riser (Taitel, Barnea & Dukler 1980) in which
#: slugs of condensate rise and fall back: the riser hammers.
RISER_SLUGGING = ("slug", "churn")


@dataclass(frozen=True)
class LinePoint:
    """The flow in the line from the trap at one load.

    Attributes
    ----------
    where : str
        ``"full load"``, ``"stall point"`` or ``"minimum load"``.
    load_fraction : float  [-]
    condensate : float
        Through the line, flash included. [kg/s]
    flash_fraction : float  [-]
    taitel_dukler, mandhane : str
        The flow pattern in the run to the return by each map
        (:func:`stallcheck.physics.hammer.taitel_dukler_many`, and Mandhane's map from
        ``fluids``).
    slugging : bool
        Intermittent (slug) flow in the run by Taitel & Dukler's map.
    riser : str or None
        Where a plain trap lifts: the worse of the vertical-upflow patterns at the
        riser's foot and head (:func:`stallcheck.physics.hammer.vertical_regime`);
        None without a lift.
    """

    where: str
    load_fraction: float
    condensate: float
    flash_fraction: float
    taitel_dukler: str
    mandhane: str
    slugging: bool
    riser: str | None = None

    @property
    def riser_slugging(self) -> bool:
        """Slug or churn flow up the riser (Taitel, Barnea & Dukler)."""
        return self.riser in RISER_SLUGGING


@dataclass(frozen=True)
class ReturnLineFigures:
    """The two-phase flow in the line from the trap, where its bore is given.

    Attributes
    ----------
    bore : float  [m]
    pitch : float or None
        Fall in the direction of flow per length (None: not given, taken level). [-]
    points : tuple of LinePoint
        At full load, at the stall point (where it stalls in range) and at the minimum
        load (where above zero).
    slugging : bool
        Intermittent (slug) flow at any of them (Taitel & Dukler).
    stratified_bore, stratified_size : float or None, str or None
        Where it slugs: the smallest Schedule 40 bore, not below the present one, that
        keeps the flow stratified at every one of those loads, and its nominal size;
        None where it does not slug, or no line up to 6 in does.
    """

    bore: float
    pitch: float | None
    points: tuple[LinePoint, ...]
    slugging: bool
    stratified_bore: float | None
    stratified_size: str | None

    @property
    def riser_slugging(self) -> bool:
        """Slug or churn flow up the riser at any of the points."""
        return any(p.riser_slugging for p in self.points)

    @property
    def worst(self) -> LinePoint:
        """The point with the worst flow pattern (:data:`PATTERNS`)."""
        return min(self.points, key=lambda p: PATTERNS.index(p.taitel_dukler))


@dataclass(frozen=True)
class SurgeFigures:
    """Hydraulic shock where a moving column of condensate is stopped.

    Attributes
    ----------
    basis : str
        ``"pump-trap"`` (its discharge stopped by the check valve) or
        ``"lift"`` (the trap's full-load discharge rising in a lift after it, stopped
        when the trap shuts).
    velocity : float
        Of the column before it is stopped. [m/s]
    wave_speed : float
        In the line (Korteweg). [m/s]
    density : float  [kg/m³]
    length : float or None
        Of the line (the wave's round trip is 2L/a). [m]
    closing_time : float  [s]
    surge : float
        The pressure rise. [Pa]
    working : float
        The pressure it adds to: the back pressure. [Pa] absolute
    peak : float
        working + surge. [Pa] absolute
    rating : float or None  [Pa] absolute
    slow_closing_time : float or None
        For the check valve on the discharge: a closing time that holds the peak to
        80 % of the rating (Michaud), where the rating and the line's length are known.
        [s]
    """

    basis: str
    velocity: float
    wave_speed: float
    density: float
    length: float | None
    closing_time: float
    surge: float
    working: float
    peak: float
    rating: float | None
    slow_closing_time: float | None

    @property
    def slowed(self) -> bool:
        """True where the closure outlasts the wave's round trip, so the rise is below
        Joukowsky's ρ·a·v."""
        return self.surge < self.density * self.wave_speed * self.velocity * (1 - 1e-12)


@dataclass(frozen=True)
class Remedy:
    """One single change that lets the installed drainage drain the unit, or, where it
    already does, how far one value can go before it stops doing so.

    Attributes
    ----------
    key : str
        The unit-file key to change.
    kind : str
        Display kind of its value (``"length"``, ``"pressure"``, ``"differential"``).
    current : float
        Its value now (SI).
    value : float or None
        The figure to apply, as printed (rounded in the safe direction, with the margin
        beyond the exact limit): the largest lift, return pressure or trap differential,
        the smallest fill head or design steam pressure (SI). None where no value works
        (``status`` ``"impossible"``) or any does (``"any"``).
    reason : str
        Which note applies (:data:`stallcheck.render.words.REMEDIES`): the status, or
        ``"tight"`` (drains now, within the margin), ``"margin-none"``,
        ``"impractical"``, ``"above-supply"``, ``"breaker"``, ``"any"``, ``"none"``,
        ``"too-high"``.
    status : str
        ``"change"`` (a change the unit needs), ``"margin"`` (the unit drains already:
        how far the value can go), ``"impossible"`` or ``"any"``.
    achievable : bool
        The figure can be applied to this unit as it stands (not: a fill head beyond
        what is found under a coil, or a design pressure at or above the supply).
    facts : dict
        Further SI numbers the note quotes.
    """

    key: str
    kind: str
    current: float
    value: float | None
    reason: str
    status: str = "change"
    achievable: bool = True
    facts: Mapping[str, Any] = field(default_factory=dict)


@dataclass(frozen=True)
class Basis:
    """What the analysis took as given, as facts: the Assumptions are said from them
    (:func:`stallcheck.render.words.assumptions`).

    Attributes
    ----------
    ua_exponent : float
        n in UA ∝ flowⁿ. [-]
    atmosphere : str
        How the atmospheric pressure was found: ``"standard"`` (sea level),
        ``"elevation"`` or ``"given"``.
    elevation : float or None
        The elevation it was found from. [m]
    valve : bool
        A control valve is described.
    clipped : bool
        The model asked for steam below 0 °C at the lowest loads.
    defaults : tuple of str
        Defaults taken for keys the file leaves out, as the file would write them.
    weather : str or None
        The weather file the hours come from.
    outdoor_air : float
        Its least outdoor-air share. [-]
    return_air, mixed_air : float or None
        The air mixed in and an economiser's set point. [K]
    scheduled : bool
        A season or daily hours are given.
    bins_unused : bool
        Load bins are given but the weather file's hours are used.
    """

    ua_exponent: float
    atmosphere: str
    elevation: float | None
    valve: bool
    clipped: bool
    defaults: tuple[str, ...]
    weather: str | None = None
    outdoor_air: float = 1.0
    return_air: float | None = None
    mixed_air: float | None = None
    scheduled: bool = False
    bins_unused: bool = False


@dataclass(frozen=True)
class Result:
    """Everything ``check`` reports about one unit.

    ``name`` is the unit's name (the contract's ``unit``). Pressures [Pa] absolute;
    ``back_pressure`` is return pressure plus the lift head, ``fill_head_pressure`` the
    head of the fill height [Pa]; ``lift`` and ``fill_head`` are heights [m].
    ``cautions`` are codes (:data:`CAUTIONS`, :data:`YEAR_CAUTION`), said in words by
    :func:`stallcheck.render.words.cautions`.
    """

    name: str
    tag: str
    source: str
    system: str
    method: str
    varies: str
    medium: str
    minimum_load: float
    atmospheric_pressure: float
    return_pressure: float
    back_pressure: float
    fill_head_pressure: float
    trap_min_differential: float
    lift: float
    fill_head: float
    supply_pressure: float
    design: DesignPoint
    stall: StallPoint
    points: Points | None
    stalled_hours: float | None
    total_hours: float | None
    drainage: Drainage
    valve: ValveResult | None
    findings: tuple[Finding, ...]
    basis: Basis | None
    trap: TrapFigures | None = None
    pump_trap: PumpTrapFigures | None = None
    purge: PurgeFigures | None = None
    flash: FlashFigures | None = None
    remedies: tuple[Remedy, ...] = ()
    return_line: ReturnLineFigures | None = None
    surge: SurgeFigures | None = None
    year: YearFigures | None = None
    warnings: tuple[str, ...] = ()
    #: Load below which the mean-temperature method, with the flow varying, would ask
    #: for steam colder than the set point, and the set point is used instead [-]
    #: (0 for every other coil; :func:`stallcheck.physics.coil.set_point_floor_load`).
    set_point_floor_load: float = 0.0
    cautions: tuple[str, ...] = field(default=CAUTIONS)
    format: int = 1

    @property
    def worst_severity(self) -> str | None:
        """The highest severity among the findings, or None."""
        present = [SEVERITIES.index(f.severity) for f in self.findings]
        return SEVERITIES[max(present)] if present else None

    @property
    def exit_status(self) -> int:
        """0 adequate and nothing at warning or above; 1 otherwise (the exit-status contract)."""
        worst = self.worst_severity
        if not self.drainage.adequate or worst in ("warning", "danger"):
            return 1
        return 0
