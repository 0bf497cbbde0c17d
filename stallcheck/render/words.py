"""The words for what the rules found: one table of message templates per finding
code, per remedy and per drainage reason, filled from the SI facts the rules return.

The rules (``findings``, ``layout``, ``remedies``, ``drainage``) decide and measure;
they return codes, the names of the template parts that apply and the numbers that
matter, all SI. This module is the only place those become sentences, so the terminal,
the Markdown report, the JSON contract's ``message`` and ``note`` fields and the survey
all say the same thing, and a presenter can restyle or translate a finding without
touching a rule. The README's findings table lists the same codes
(``tests/test_words.py`` keeps the two in step).

A template is a :meth:`str.format` string. A field's format spec is either an ordinary
one (``{load:.0%}``) or a display kind of :data:`stallcheck.files.display.DISPLAY`
(``{back:pressure}``, ``{flow:mass_flow}``): the SI value is then converted and rounded
as :func:`stallcheck.files.display.show` prints it; ``~kind`` quotes a limit of practice
the way practitioners round it (:func:`stallcheck.files.display.show_about`).

A figure a user may act on is rounded in the safe direction, never to the nearest: a
spec ending in ``+`` rounds up and one ending in ``-`` rounds down at the printed
precision (``{required:mass_flow+}``, ``{selection:differential-}``, ``{load:.0%+}``),
so a trap rated for the flow printed at the differential printed, a minimum load set
at the load printed, or a pitch of the pitch printed does what the sentence says
(``tests/test_findings.py`` applies each as printed). ``cv`` is a flow coefficient
rounded up to three figures.
"""

from __future__ import annotations

import math
import string
from typing import Any, Mapping

from stallcheck.analysis.remedies import MARGIN
from stallcheck.files import quantities as q
from stallcheck.files import display

#: What fitting each required arrangement means (the "what to do" section and
#: diagnose's remedies say the same).
FIT = {
    "trap": "a trap",
    "trap-vacuum-breaker": "a vacuum breaker on the coil (a trap-vacuum-breaker arrangement)",
    "pump-trap": "a pump-trap (or a pump and receiver)",
}

#: Why a trap type does poorly on modulating service (finding ``trap-type-modulating``
#: and diagnose).
POOR_TRAP = {
    "thermodynamic": "a thermodynamic (disc) trap needs a working differential to snap shut and open, "
                     "and backs up condensate when the coil pressure falls",
    "thermostatic": "a thermostatic trap holds condensate back until it subcools, which floods "
                    "a modulating coil",
    "bimetallic": "a bimetallic trap holds condensate back until it subcools, which floods "
                  "a modulating coil",
    "inverted-bucket": "an inverted-bucket trap can lose its prime when the coil pressure swings, "
                       "and then blows steam or stalls",
}

#: Finding code → its template parts. A finding names the parts that apply, in order;
#: its message is those parts filled in and joined.
FINDINGS: dict[str, dict[str, str]] = {
    "stall-at-full-load": {
        "": "The back pressure on the trap ({back:pressure} with the lift) is at or above what the coil has "
            "at full load ({design:pressure} plus the fill head)",
        "fit": ": the coil floods at every load. Fit a pump-trap, or remove the lift and return pressure behind "
               "the trap.",
        "handled": ": no trap alone could discharge at any load. The installed {installed} moves the condensate "
                   "at every load; keep it working, and test it as its maker asks.",
    },
    "stall-in-operating-range": {
        "": "The coil stalls below {load:.0%+} load",
        "inlet": " (entering {inlet:temperature-} and warmer)",
        "why": ": the coil pressure falls to {coil:pressure} and the trap can no longer discharge "
               "{condensate:mass_flow} of condensate. Condensate backs up, which brings water hammer and "
               "corrosion. ",
        "handled": "The installed {installed} handles this; keep it working.",
        "drain": "Drain it with a {required} (see drainage).",
    },
    "drainage-inadequate": {
        "": "The installed {installed} is not enough: {reason}. Install a {required}.",
    },
    "freeze-risk": {
        "": "The coil stalls while the entering air is below freezing (",
        "span": "from {inlet:temperature-} up to {freezing:temperature}",
        "design": "at {inlet:temperature}",
        "valve": "from {inlet:temperature-} up to {upper:temperature+}, where the valve holds the coil under",
        "why": "): condensate held in the tubes can freeze and split them.",
        "hours": " The load bins put {hours:,.0f} h a year in that band.",
        "year": " In the weather year it runs stalled with the air below freezing {hours:,.0f} h, {run:,.0f} h "
                "at a stretch at the longest.",
        "year-none": " No operating hour of the weather year falls there; a colder year than the typical one "
                     "can.",
        "drained": " The installed {installed} drains it; test it before each winter, and keep a low-limit "
                   "(freezestat) on the leaving air.",
        "drain": " Drain it so it cannot hold water at any load (a pump-trap, or a vacuum breaker where "
                 "gravity suffices); in freezing air, consider holding the steam valve open and controlling "
                 "the leaving air with face-and-bypass dampers (common practice).",
    },
    "design-warmer-than-site": {
        "": "The coil was selected for air entering at {design:temperature}, warmer than this site's heating "
            "design condition: ",
        "outdoor": "the weather file's 99.6 % dry bulb is {dry_bulb:temperature}",
        "mixed": "the weather file's 99.6 % dry bulb, {dry_bulb:temperature}, enters the coil mixed at "
                 "{entering:temperature}",
        "why": ". Colder than its design for {hours:,.0f} h of the year's operating hours, the coil runs at full "
               "load with the air leaving below its set point, and steam held short in freezing air puts the "
               "tubes at risk. Check the selection with air entering at {entering:temperature-} (more coil or "
               "more steam pressure), then check the stall point again.",
        "why-none": ". Its season and hours keep it out of the year's colder hours, but a colder year can bring "
                    "them; if it may run then, check the selection with air entering at {entering:temperature-}.",
    },
    "site-elevation-differs": {
        "": "The weather file's station ({name}) is at {station:length}",
        "given": ", but site.elevation is {site:length}",
        "none": ", but the unit file gives no elevation, so gauge readings are taken at sea level (101.325 kPa)",
        "fix": ": the atmosphere differs by {dp:differential}. Give the site's own elevation in site.elevation "
               "(the station's, {station:length}, where the unit is near it and at about its height).",
    },
    "lift-after-trap": {
        "": "Condensate is lifted {lift:length} straight after the trap of a coil that stalls: the lift adds "
            "to the back pressure and floods the coil at low load (common practice: never lift directly "
            "after the trap of a modulating coil). Drain by gravity to a vented receiver and pump from "
            "there, or use a pump-trap.",
    },
    "trap-type-modulating": {
        "": "The coil runs at low differential",
        "low": "At its lowest working point the trap has only {working:differential} across it",
        "why": ", and {poor}. Use a float-and-thermostatic trap on modulating coils (common practice; "
               "VA HVAC Design Manual).",
    },
    "valve-too-small": {
        "": "The valve needs {coef} {required_cv:cv} at design but has {coef} {cv:.3g}: wide open it holds the coil "
            "at {limited_pressure:pressure} and delivers {limited_load:.0%-} of the design load.",
        "fit": " Fit a larger valve or raise the supply pressure.",
        "floods": " That is under the stall pressure of {stall_pressure:pressure}: the coil floods {from_load:where}, "
                  "however well it is trapped, because the valve holds it down.",
        "fix": " A valve of {coef} {drain_cv:cv} or more keeps it draining at full load (the {margin:differential} "
               "margin kept); {coef} {fit_cv:cv} or more also delivers the design load.",
        "no-fix": " No valve on this supply keeps it draining: the stall pressure is above what the supply can "
                  "hold the coil at; lower the back pressure or fit a pump-trap.",
    },
    "valve-oversized": {
        "": "At design the valve is only {opening:.0%} open ({coef} {required_cv:cv} needed of {cv:.3g}): it "
            "works near its seat at low load, where it hunts and cycles the coil pressure. A smaller valve "
            "controls better.",
    },
    "valve-low-load-control": {
        "": "Below about {load:.0%+} load the valve needs less than its smallest controllable {coef} "
            "({coef}/rangeability = {smallest_cv:.2g}): it opens and shuts instead of modulating, and each "
            "opening can drive condensate as a slug. Use a smaller valve, or two valves in sequence (1/3 "
            "and 2/3).",
        "minor": "Below about {load:.0%+} load the valve cannot modulate ({coef}/rangeability = {smallest_cv:.2g}) "
                 "and will cycle.",
    },
    "method-below-set-point": {
        "": "Below {load:.0%} load the mean-temperature method would need steam colder than the leaving set "
            "point ({set_point:temperature}), which cannot heat to it; there the set point's saturation "
            "temperature is used instead, a lower bound on what the coil needs, so the stall point and the "
            "remedies are on the safe side. The NTU method (design.method = \"ntu\") models a coil whose "
            "flow varies without this limit.",
    },
    "trap-capacity-short": {
        "": "Below {load:.0%+} load the trap cannot pass the condensate at the differential it has there "
            "({differential:differential-} for {condensate:mass_flow+}), before the stall proper",
        "stall": " at {stall:.0%+}",
        "fix": ": condensate backs into the coil from there down. Fit a trap rated for {required:mass_flow+} "
               "at {selection:differential-}, or give it more fill head.",
    },
    "trap-undersized": {
        "": "At the differential it is selected at ({selection:differential-}) the trap passes "
            "{installed:mass_flow-}; common practice for modulating coils asks {margin:g} x the full-load "
            "condensate, {required:mass_flow+} (VA HVAC Design Manual: 1.5-2 x; NAVFAC MO-209: 2-4 x). "
            "Select a larger trap on its hot-condensate rating.",
    },
    "trap-differential-over-rating": {
        "": "The trap opens against at most {rated:differential-} (its maker's rating), ",
        "full": "less than the {working:differential+} across it at full load: its valve stays shut and the coil "
                "floods in normal running. ",
        "open": "less than the {widest:differential+} across it with the control valve wide open (start-up, a "
                "cold pull-down) and the line after it empty: its valve stays shut and the coil floods until the "
                "pressure falls. ",
        "fix": "Fit a trap rated for at least {widest:differential+}, the supply pressure and fill head less the "
               "return pressure (common practice: rate a trap for the most its inlet can see).",
    },
    "pump-trap-motive-low": {
        "": "The pump-trap's motive pressure {motive:pressure}",
        "supply": " (the supply pressure; drain.motive_pressure not given)",
        "why": " is only {margin:differential-} above the back pressure it pumps against ({back:pressure}); it "
               "wants about {wanted:~differential} more (common practice; the maker's table governs). Raise "
               "the motive pressure to at least {target:pressure+}, or cut the lift.",
    },
    "pump-trap-fill-head-low": {
        "": "The pump-trap has {fill:length} of fill head; ",
        "maker": "its maker asks",
        "practice": "common practice asks about",
        "why": " {required:length+}. With less, condensate cannot run into its body fast enough and backs "
               "into the coil. Set it lower below the coil.",
    },
    "pump-trap-outside-table": {
        "": "The back pressure ({back:pressure}) is above the highest row of the pump-trap's capacity table: "
            "the maker does not rate it for this duty. Check with the maker, or cut the lift or return "
            "pressure.",
    },
    "pump-trap-undersized": {
        "": "The pump-trap is rated for {capacity:mass_flow-} at this duty, but must move "
            "{condensate:mass_flow+} at the stall point ({load:.0%+} load). Select a larger one, or two in "
            "parallel.",
    },
    "purge-size-unknown": {
        "": "A constant purge is installed but neither drain.purge_orifice nor drain.purge_rate is given, "
            "so its steam and cost are not worked out.",
    },
    "purge-cannot-hold": {
        "": "At the minimum load the coil pressure falls to the back pressure ({back:pressure}) or below: "
            "the purge stops bleeding there and cannot hold a differential on its own. Lower the back "
            "pressure, or drain with a vacuum breaker or pump-trap as required.",
    },
    "return-velocity-high": {
        "": "Flash steam ({fraction:.1%} of the condensate at full load) moves at {velocity:velocity} in the "
            "{bore:diameter} return line, above about {limit:~velocity} (common practice): it can drive "
            "condensate waves into slugs that hammer. Enlarge the line or flash the condensate in a vented "
            "receiver first.",
    },
    "flash-into-cool-return": {
        "": "The trap discharges hot condensate that flashes ({fraction:.1%} at full load) into a return at "
            "{return_temperature:temperature}, below its saturation {saturation:temperature}: steam bubbles "
            "collapse in the cooler water and hammer. Discharge along the direction of flow through a "
            "sparging fitting, or into a vented receiver.",
    },
    "return-line-slug-flow": {
        "": "Flash steam and condensate run in slug (intermittent) flow in the {bore:diameter} line from the trap "
            "at {where} (Taitel & Dukler's map; Mandhane's reads {second}): a wave seals the pipe and the steam "
            "behind drives it as a slug that hammers at bends and fittings (differential shock). ",
        "size": "A {size} line ({stratified:diameter} bore) keeps the flow stratified at every load shown; or "
                "flash the condensate in a vented receiver next to the trap.",
        "none": "No line up to 6 in keeps it stratified at every load: flash the condensate in a vented receiver "
                "next to the trap, or pump from one.",
    },
    "lift-slug-flow": {
        "": "Flash steam drives the condensate up the {lift:length} lift after the trap in {pattern} flow at "
            "{where} (Taitel, Barnea & Dukler's map for vertical upflow, {bore:diameter} bore): slugs of "
            "condensate rise and fall back in the riser and hammer. Flash the condensate in a vented receiver "
            "at the foot of the lift and pump it from there, or lift it with a pump-trap.",
    },
    "return-line-pitch": {
        "against": "The line from the trap rises against the flow ({pitch:.1%}): condensate lies in it and "
                   "steam drives it back and forth in slugs. Pitch it down in the direction of flow.",
        "flat": "The line from the trap falls only {pitch:.2%-} in the direction of flow, flatter than "
                "{least:.2%+} (1 in in 40 ft, common practice): condensate lies in it where it sags. Pitch it "
                "down in the direction of flow.",
    },
    "hydraulic-shock": {
        "pump": "When the pump-trap's discharge ({velocity:velocity}) is stopped by its check valve, the column "
                "raises the pressure by {surge:~differential} (Joukowsky, with a wave speed of "
                "{speed:~velocity}), to {peak:pressure}",
        "column": "When the trap shuts, the condensate rising in the lift after it at {velocity:velocity} (the "
                  "trap's full-load discharge) is stopped, and a column that falls back strikes the trap no "
                  "faster than it rose: the pressure rises by {surge:~differential} (Joukowsky, wave speed "
                  "{speed:~velocity}), to {peak:pressure}",
        "unrated": "; give drain.return_rating to compare it with the line's rating. ",
        "over": ", above the line's rating of {rating:pressure}. ",
        "near": ", above {share:.0%} of the line's rating of {rating:pressure}. ",
        "fix-pump": "Fit a non-slam (spring-loaded, centre-guided) check valve on the discharge",
        "fix-column": "Do not lift straight after the trap of a modulating coil: drain by gravity to a vented "
                      "receiver and pump from there, or fit a non-slam check valve after the trap",
        "slow": ", or close it over at least {slow:.2g} s",
        "flash": ". Flash steam collapsing in the riser can strike harder than this; no published method sizes "
                 "that from these inputs",
        "end": ". A screening figure: relief, ratings and the fix follow the piping code in force and licensed "
               "practice; make a hammering system safe before studying it.",
    },
    "tube-fill-both-ends": {
        "": "Steam enters the supply header at its centre and the coil has no steam-distributing tubes: "
            "steam reaches the return header through the middle tubes first and then enters the outer "
            "tubes from both ends. Condensate waves moving toward each other shut in a steam pocket, which "
            "collapses and hammers",
        "near": ", and this coil runs at or near its stall point, where the differential that would clear "
                "the tubes is lost. ",
        "far": ". ",
        "purge-holds": "The installed constant purge keeps steam moving from the supply end at every load; "
                       "keep it open and clean.",
        "purge-fails": "The installed purge cannot hold the differential at low load (see purge-cannot-hold): "
                       "drain the coil so it does not stall, or use an end-fed coil or one with "
                       "steam-distributing tubes.",
        "fix": "Hold a positive differential at every load (a constant-purge drain) so the tubes fill only "
               "from the supply end, or use an end-fed coil or one with steam-distributing inner tubes.",
    },
    "group-trapping": {
        "": "{coils} coils drain through one trap: coils at different pressures short-circuit, and the one at "
            "lower pressure is fed backwards from its return side, holding condensate that hammers. Give "
            "each coil its own trap (common practice).",
    },
    "drop-not-vented": {
        "": "The {drop:length} drop to the trap is not back-vented to the steam space: a condensate slug can "
            "seal it, the steam below condenses and the slug is driven into the trap. Vent the drop back to "
            "the coil's steam side above the water line (common practice).",
    },
    "valve-not-dripped": {
        "": "There is no drip leg and trap just ahead of the control valve: condensate pools there while the "
            "valve is shut and is driven through as a slug when it opens. Fit a drip leg with its own trap "
            "upstream of the valve (common practice).",
    },
    "tubes-not-pitched": {
        "": "The horizontal tubes are not pitched toward the return: condensate lies in them, and steam "
            "driven over it raises waves that hammer",
        "near": " - worse here, as the coil runs near its stall point",
        "fix": ". Pitch the coil toward its return header (common practice: as the coil maker directs).",
    },
}

#: Why a unit needs the drainage it does (``Drainage.why_required``).
REQUIREMENTS = {
    "never": "the coil pressure stays above the stall pressure at every load, so a trap alone drains it",
    "below-minimum": "it stalls only below {load:.0%+} load, at or under its minimum load, so a trap alone "
                     "drains it wherever it runs",
    "vacuum-breaker": "{where}; a vacuum breaker holds the coil at atmospheric pressure there, and the fill "
                      "head then drives the condensate through the trap by gravity with "
                      "{gravity:differential-} to spare (at least {wanted:differential+} wanted)",
    "gravity-short": "{where}; a vacuum breaker would leave gravity only {gravity:differential-} across the "
                     "trap, less than the {wanted:differential+} a trap is sized at, so a pump-trap (or pump "
                     "and receiver) must move the condensate, or more fill head must be found (see what to do)",
    "above-atmospheric": "{where}; that is at or above atmospheric, and a vacuum breaker cannot help against "
                         "that back pressure, so a pump-trap (or pump and receiver) must lift the condensate",
}
#: Where a stalling unit stalls, the start of the reasons above that use ``{where}``.
STALLS_WHERE = {
    "part": "it stalls below {load:.0%+} load, where the coil pressure falls to {stall_pressure:pressure}",
    "full": "it stalls at every load: the trap needs the coil above {stall_pressure:pressure}, more than it "
            "has at full load",
}
#: Whether the installed drainage covers what is required (``Drainage.why_adequate``).
ADEQUACY = {
    "covers": "the installed {installed} covers what is required ({required})",
    "purge": "a constant purge keeps steam flowing only while the coil pressure is above the back pressure; "
             "it cannot drain a coil that stalls ({required} required)",
    "cannot": "the installed {installed} cannot drain the coil while it stalls ({required} required)",
}

#: Each remedy's note: (unit-file key or ``*`` for any, reason) → template. ``{down_to}``
#: is how far down the load range the figure holds; ``{margin}`` the margin kept.
REMEDIES = {
    ("*", "tight"): "leave it as it is: the unit drains now, but with less than the {margin:differential} "
                    "margin these figures keep",
    ("drain.lift", "impossible"): "even with no lift the trap cannot drain it {down_to}: the return pressure "
                                  "({return_pressure:pressure}) and the trap's own differential are more than "
                                  "the coil and fill head have there",
    ("drain.lift", "margin"): "up to {value:length} of lift after the trap still drains it {down_to} "
                              "(now {current:length})",
    ("drain.lift", "change"): "a lift of at most {value:length} after the trap (now {current:length})",
    ("drain.return_pressure", "impossible"): "even against a full vacuum the lift takes more than the coil and "
                                             "fill head have {down_to}",
    ("drain.return_pressure", "margin"): "a return pressure up to {value:pressure}{vacuum} still drains it "
                                         "{down_to} (now {current:pressure})",
    ("drain.return_pressure", "change"): "a return pressure of at most {value:pressure}{vacuum} "
                                         "(now {current:pressure})",
    ("drain.trap_min_differential", "impossible"): "even a trap that opens at no differential cannot drain it "
                                                   "{down_to}: the back pressure less the fill head, "
                                                   "{back_less_fill:pressure}, is more than the coil has there",
    ("drain.trap_min_differential", "margin"): "a trap that needs up to {value:differential} to open still "
                                               "drains it {down_to} (now {current:differential})",
    ("drain.trap_min_differential", "change"): "a trap that opens at {value:differential} or less "
                                               "(now {current:differential})",
    ("drain.fill_head", "margin-none"): "a fill head of {value:length} (none at all) still drains it {down_to} "
                                        "(now {current:length})",
    ("drain.fill_head", "margin"): "a fill head down to {value:length} still drains it {down_to} "
                                   "(now {current:length})",
    ("drain.fill_head", "impractical"): "it would take a fill head of {value:length} (now {current:length}), "
                                        "more than the {practical:~length} or so found under a coil",
    ("drain.fill_head", "change"): "a fill head of at least {value:length} (now {current:length}: "
                                   "{more:length} more)",
    ("design.steam_pressure", "breaker"): "any design pressure: the vacuum breaker drains it whatever the coil "
                                          "pressure",
    ("design.steam_pressure", "any"): "any design pressure: the coil needs more than the stall pressure, "
                                      "{threshold:pressure}, at every load, since it can never run below the "
                                      "set point's saturation pressure",
    ("design.steam_pressure", "none"): "no design pressure does it: at no load the coil needs only the set "
                                       "point's saturation pressure, below the stall pressure of "
                                       "{threshold:pressure}",
    ("design.steam_pressure", "too-high"): "no practical design pressure does it: it would take more than "
                                           "{limit:pressure} at full load",
    ("design.steam_pressure", "margin"): "a design pressure down to {value:pressure} still drains it {down_to} "
                                        "(now {current:pressure})",
    ("design.steam_pressure", "change"): "a smaller coil selected for {value:pressure} at full load "
                                        "(now {current:pressure}): run hotter, it keeps the coil pressure up "
                                        "at part load",
    ("design.steam_pressure", "above-supply"): "a smaller coil selected for {value:pressure} at full load "
                                              "(now {current:pressure}): run hotter, it keeps the coil "
                                              "pressure up at part load; but that is at or above the supply "
                                              "({supply:pressure}), so it needs the supply raised too",
    ("valve.cv", "change"): "a control valve of {coef} {value:cv} or more (now {coef} {current:.3g}): wide open it holds the "
                            "coil above the stall pressure at full load, the {margin:differential} margin kept",
    ("valve.cv", "not-alone"): "a control valve of {coef} {value:cv} or more (now {coef} {current:.3g}) stops the valve holding "
                               "the coil under at high load, but alone it leaves the stall below {load:.0%+} load",
}
#: Filled into a return pressure below atmospheric (``{vacuum}`` above).
VACUUM_RETURN = ", below atmospheric: only a vacuum return holds that,"


class _Fill(string.Formatter):
    """Fills a template: a display kind as format spec converts an SI value."""

    def __init__(self, system: str, atmospheric: float):
        super().__init__()
        self.system = system
        self.atmospheric = atmospheric

    def format_field(self, value: Any, format_spec: str) -> str:
        if format_spec[-1:] in ("+", "-"):
            return self.safe(value, format_spec[:-1], format_spec[-1] == "+")
        if format_spec == "cv":
            return cv_up(value)
        if format_spec == "where":
            return valve_stall_loads(value, 0.0)
        if format_spec.startswith("~"):
            return display.show_about(value, format_spec[1:], self.system)
        if format_spec in display.DISPLAY[self.system]:
            return display.show(value, format_spec, self.system, self.atmospheric)
        return format(value, format_spec)

    def safe(self, value: float, spec: str, up: bool) -> str:
        """``value`` rounded up (or down) at the precision ``spec`` prints it: a display
        kind, or a fixed-point or percent spec such as ``.0%``."""
        if spec in display.DISPLAY[self.system]:
            return display.show(display.rounded(value, spec, self.system, self.atmospheric, up=up), spec, self.system,
                          self.atmospheric)
        places = int(spec[1:-1])
        return format(_round_at(value, 10.0 ** places * (100.0 if spec.endswith("%") else 1.0), up), spec)


def fill(template: str, facts: Mapping[str, Any], system: str, atmospheric: float) -> str:
    """One template filled with SI ``facts``, in ``system`` (``"si"`` or ``"us"``)
    display units; ``atmospheric`` [Pa] turns absolute pressures into gauge readings."""
    return _Fill(system, atmospheric).format(template, **facts)


def finding(f, r, system: str) -> str:
    """The message of a :class:`stallcheck.result.Finding` of the result ``r``: its
    parts' templates filled with its facts and joined."""
    parts = FINDINGS[f.code]
    atm = r.atmospheric_pressure
    facts = f.facts
    if f.code.startswith("valve-"):
        facts = coefficients(facts, r.valve.given_as, VALVE_FACTS)
    if f.code == "drainage-inadequate":
        facts = dict(facts, reason=drainage_reasons(r.drainage, system, atm)[0])
    elif f.code == "trap-type-modulating":
        facts = dict(facts, poor=POOR_TRAP[facts["trap"]])
    return "".join(fill(parts[name], facts, system, atm) for name in f.parts)


#: The flow-coefficient facts of the valve findings: Cv, quoted as the file gave it.
VALVE_FACTS = ("required_cv", "cv", "drain_cv", "fit_cv", "smallest_cv")


def coefficients(facts: Mapping[str, Any], given_as: str, keys) -> dict:
    """``facts`` with the flow coefficients among ``keys`` in the coefficient the unit
    file gave (Kv = Cv/1.156) and its name under ``coef``: a Kv file reads Kv."""
    out = dict(facts, coef="Kv" if given_as == "kv" else "Cv")
    if given_as == "kv":
        out.update({k: out[k] / q.CV_PER_KV for k in keys if out.get(k) is not None})
    return out


def coefficient(cv: float, given_as: str, needed: bool = False) -> str:
    """A flow coefficient (SI Cv) as the unit file gave it: ``"Kv 60"`` or ``"Cv 69.4"``;
    a ``needed`` one rounded up to three figures (a valve of it does the job)."""
    value = cv / q.CV_PER_KV if given_as == "kv" else cv
    return f"{'Kv' if given_as == 'kv' else 'Cv'} {cv_up(value) if needed else f'{value:.3g}'}"


def stalled_hours(r) -> str | None:
    """How many hours a year the unit runs stalled, and out of what (None without hours)."""
    if r.stalled_hours is None:
        return None
    if r.year is not None:
        return f"stalled {r.stalled_hours:,.0f} h of the {r.total_hours:,.0f} h it runs in the weather year"
    return f"stalled {r.stalled_hours:,.0f} h of the {r.total_hours:,.0f} h in the load bins"


def down_to(minimum: float) -> str:
    """How far down the load range a figure holds: the unit's minimum load [-]."""
    return f"down to {minimum:.0%} load" if minimum > 0 else "at every load"


def remedy(m, system: str, atmospheric: float, minimum: float) -> str:
    """The note of a :class:`stallcheck.result.Remedy`: what the figure means, or why
    no figure works; ``minimum`` is the unit's minimum load [-]."""
    key = "*" if m.reason == "tight" else m.key
    facts = {"value": m.value, "current": m.current, "margin": MARGIN, "down_to": down_to(minimum),
             **m.facts}
    if "vacuum" in facts:
        facts["vacuum"] = VACUUM_RETURN if facts["vacuum"] else ""
    if m.kind == "cv":
        facts = coefficients(facts, m.facts.get("given_as", "cv"), ("value", "current"))
    return fill(REMEDIES[key, m.reason], facts, system, atmospheric)


def percent(fraction: float, up: bool = True) -> str:
    """A load fraction [-] as a whole percent rounded up (a stall point, a load below
    which something fails: it starts no lower than printed) or down (a load delivered):
    the same figure wherever the result prints it."""
    return f"{_round_at(fraction, 100.0, up):.0%}"


def _round_at(value: float, scale: float, up: bool) -> float:
    """``value`` rounded up (or down) to a step of 1/``scale``; a value already on a step
    (to the last bits) stays there."""
    steps = value * scale
    steps = round(steps) if abs(steps - round(steps)) < 1e-9 else (math.ceil(steps) if up else math.floor(steps))
    return steps / scale


def safe(value: float, kind: str, system: str, atmospheric: float, up: bool) -> str:
    """An SI value printed as :func:`stallcheck.files.display.show` prints it, but
    rounded up (or down) rather than to the nearest: the ``kind+`` / ``kind-`` specs."""
    return _Fill(system, atmospheric).safe(value, kind, up)


def valve_floods(s, system: str, atmospheric: float) -> str:
    """Where a too-small valve floods the coil, in one sentence (no full stop), for the
    stall point section of every presenter (and the drainage reasons: one sentence)."""
    return valve_floods_at(s.valve_coil_pressure, s.threshold_pressure, s.valve_load_fraction,
                           s.load_fraction if s.in_range else 0.0, system, atmospheric)


def valve_floods_at(valve_pressure: float, stall_pressure: float, valve_load: float, below: float, system: str,
                    atmospheric: float) -> str:
    """:func:`valve_floods` from its figures: the pressure the open valve holds at full
    load and the stall pressure [Pa], the load it floods from and the load below which
    the load itself stalls the coil (0: none) [-]."""
    return (f"the control valve, wide open, holds the coil at "
            f"{display.show(valve_pressure, 'pressure', system, atmospheric)} at full load, under the stall "
            f"pressure of {display.show(stall_pressure, 'pressure', system, atmospheric)}: it floods "
            f"{valve_stall_loads(valve_load, below)}")


def trap_rating(trap, system: str, atmospheric: float) -> str:
    """The trap's rated differential against the most it can see, where the unit file
    gives the rating (the finding ``trap-differential-over-rating`` says what follows)."""
    return (f"rated to open against {safe(trap.rated_differential, 'differential', system, atmospheric, False)}; "
            f"the most it can see {safe(trap.widest_differential, 'differential', system, atmospheric, True)} (the "
            f"supply and fill head less the return)")


def stall_summary(s) -> str:
    """Where a unit stalls, in a few words, for one-line verdicts (``new``, ``explore``):
    the same load, rounded the same way, as the stall point section."""
    if s.valve_load_fraction is not None:
        return "stalls " + valve_stall_loads(s.valve_load_fraction, s.load_fraction if s.occurs else 0.0)
    if not s.occurs:
        return "never stalls"
    return "stalls at every load" if s.load_fraction >= 1.0 else f"stalls below {percent(s.load_fraction)} load"


def cv_up(value: float) -> str:
    """A flow coefficient someone will select a valve by, to three significant figures
    rounded up: a valve of at least the printed Cv does what the text says."""
    up = display.up_to_figures(value, 3)
    return f"{up:.{max(0, 2 - math.floor(math.log10(up)))}f}"


def valve_stall_loads(valve_load: float, below: float) -> str:
    """Where a too-small valve stalls the coil, in words: from a load up (percent
    rounded down, the safe way: the flooding starts no later than it says), merged with
    the stall below ``below`` where the load itself brings one (0: none)."""
    start = math.floor(valve_load * 100.0 + 1e-9)
    if start <= 0 or valve_load <= below:
        return "at every load"
    head = f"below {math.ceil(below * 100.0 - 1e-9):.0f}% load and " if below > 0 else ""
    return f"{head}from {start:.0f}% load up to full load"


def drainage_reasons(drainage, system: str, atmospheric: float) -> tuple[str, str]:
    """Why a unit needs the drainage it does, and whether what is installed covers it,
    for a :class:`stallcheck.result.Drainage`."""
    facts = dict(drainage.facts, installed=drainage.installed, required=drainage.required)
    if drainage.why_required in ("vacuum-breaker", "gravity-short", "above-atmospheric"):
        if facts.get("valve_load") is not None:
            facts["where"] = valve_floods_at(facts["valve_pressure"], facts["stall_pressure"], facts["valve_load"],
                                             facts["load"] if facts["by_load"] else 0.0, system, atmospheric)
        else:
            facts["where"] = fill(STALLS_WHERE["full" if facts["load"] >= 1 else "part"], facts, system, atmospheric)
    return (fill(REQUIREMENTS[drainage.why_required], facts, system, atmospheric),
            fill(ADEQUACY[drainage.why_adequate], facts, system, atmospheric))


# --- the assumptions --------------------------------------------------------------


#: The cautions' words, by the codes a result carries (``Result.cautions``).
CAUTION_WORDS = {
    "screening-aid": ("Screening aid only: it does not replace the equipment makers' data, local codes "
                      "and licensed engineering practice, which govern installation and remedies."),
    "steam-hazard": ("Steam and condensate scald and can burst coils, traps and piping. Make a banging "
                     "(water-hammering) system safe - isolate, drain and cool it - before studying it."),
    "typical-year": ("Hours from a typical weather year are typical, not a guarantee: a colder or longer winter "
                     "stalls the coil longer."),
}


def cautions(codes) -> list[str]:
    """The cautions, in words, of the codes given (a result's, or several results'), in
    :data:`CAUTION_WORDS`' order and each once."""
    given = set(codes)
    return [text for code, text in CAUTION_WORDS.items() if code in given]


def assumptions(r, system: str) -> tuple[str, ...]:
    """What the analysis took as given, in sentences (empty for a result made without
    its basis, as a survey's table makes them): the method, the atmosphere, the steam
    and the medium, the valve and trap models, the weather year's hours, and every
    default taken."""
    b = r.basis
    if b is None:
        return ()
    method = ("NTU: condensing steam, ε = 1 − exp(−NTU), UA fixed by the design point"
              if r.method == "ntu" else
              "mean temperature: load ∝ (T_steam − mean of entering and leaving temperature)")
    if r.varies == "flow":
        method += f"; UA ∝ flow^{b.ua_exponent:g}"
    atm = r.atmospheric_pressure
    where = {"given": f"{atm / 1000:.2f} kPa (given)",
             "elevation": f"{atm / 1000:.2f} kPa (standard atmosphere at {b.elevation or 0.0:.0f} m)",
             "standard": "101.325 kPa (standard, sea level)"}[b.atmosphere]
    varies = ("entering temperature at fixed flow" if r.varies == "inlet-temperature"
              else "flow at fixed temperatures")
    out = [
        f"Method: {method}.",
        f"Load varies with {varies}.",
        f"Atmospheric pressure {where}; gauge values are relative to it.",
        "Steam saturated (IAPWS-IF97); condensate leaves at saturation; "
        "heads use saturated water density at the return pressure.",
    ]
    if r.medium == "air":
        out.append("Air cp 1.006 kJ/(kg·K); air volumes are standard air, 1.204 kg/m³.")
    else:
        out.append("Liquid cp (and density, for volume flows) at the mean design temperature (CoolProp: "
                   "HEOS water, incompressible glycol mixtures).")
    if b.valve:
        out.append("Valve: IEC 60534-2-1 with γ = 1.30 for steam, F_P = 1, inherent characteristic.")
    if r.trap is not None:
        out.append(_trap_basis(r.trap))
    if b.weather is not None:
        out.append(_year_basis(b, system))
    if r.method == "mean-temperature" and r.varies == "flow":
        out.append("Mean temperature with the flow varying: where the method would ask for steam colder than "
                   "the leaving set point, the set point's saturation temperature is used (a lower bound on "
                   "what the coil needs, so the stall point is on the safe side).")
    if b.clipped:
        out.append("At the lowest loads the steam temperature the model asks for is below 0 °C; "
                   "those points are held at the bottom of the steam tables (0 °C, 0.61 kPa(abs)).")
    out.extend(f"Default: {text}." for text in b.defaults)
    return tuple(out)


def _year_basis(b, system: str) -> str:
    """What the hours of the weather year stand for."""
    def t(kelvin):
        return display.show(kelvin, "temperature", system)

    if b.outdoor_air >= 1.0:
        air = "all outdoor air"
    else:
        air = f"at least {b.outdoor_air:.0%} outdoor air mixed with return air at {t(b.return_air)}"
        if b.mixed_air is not None:
            air += f", more outdoor air where it brings the mixture down to {t(b.mixed_air)}"
    text = (f"Hours: each hour of the weather file {b.weather} gives the air entering the coil ({air}; mixing "
            f"taken even, without stratification); the unit runs where that air is below the set point"
            + (", in its season and daily hours (local standard time)" if b.scheduled else "")
            + "; days of the week and holidays are not modelled.")
    if b.bins_unused:
        text += " The load bins are not used: the weather file's hours are."
    return text


def _trap_basis(trap) -> str:
    """Where the trap's capacity comes from."""
    if trap.basis == "table":
        return ("Trap capacity: the [[drain.capacity]] table, read on log-log axes, scaled as the square "
                "root of differential below its lowest row and never extrapolated above its highest.")
    model = ("a sharp-edged orifice, C_d 0.6, passing saturated condensate, reduced for flashing by "
             "Fauske's non-equilibrium model (5 mm seat) with the omega method's equilibrium flux")
    if trap.basis == "orifice":
        return f"Trap capacity: the seat bore given, as {model}."
    return (f"Trap capacity: none given, so a trap selected by the usual rule ({trap.margin:g} x full-load "
            f"condensate at the working differential, at least 1/4 psi), modelled as {model}.")
