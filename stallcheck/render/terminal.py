"""The ``check`` report for people, as a page (:mod:`stallcheck.render.page`).

Reads well at 80 columns with and without colour: every mark and verdict is also a
word, so nothing depends on colour (``NO_COLOR`` and piped output print plain text,
without loading rich at all).
"""

from __future__ import annotations


from stallcheck.files import display
from stallcheck.physics.constants import FREEZING
from stallcheck.render import advice, chart, page, words
from stallcheck.render.page import BLANK, Para, bullets, runs
from stallcheck.result import Result

CHART_COLOURS = {"curve": "bold cyan", "need": "cyan", "back": "yellow", "atmos": "dim", "stall": "bold red", "limit": "bold magenta",
                 "zone": "red", "minimum": "magenta"}
SEVERITY_STYLE = {"danger": "bold red", "warning": "yellow", "info": "cyan"}
SEVERITY_WORD = {"danger": "DANGER", "warning": "WARNING", "info": "note"}

_heading = page.heading
_para = page.para


def chart_block(result: Result, system: str, width: int, x_axis: str = "load",
                height: int = chart.HEIGHT) -> page.Pre:
    """The stall chart as preformatted lines, coloured by mark (``height``: plot rows)."""
    return page.Pre(tuple(tuple((text, CHART_COLOURS.get(style) if style else None) for text, style in line)
                          for line in chart.render(result, system, width=width, height=height, x_axis=x_axis)))


def chart_text(result: Result, system: str, width: int, x_axis: str = "load", height: int = chart.HEIGHT):
    """The stall chart as a rich Text (for the full-screen ``explore``)."""
    from rich.text import Text

    out = Text()
    for i, line in enumerate(chart_block(result, system, width, x_axis, height).lines):
        if i:
            out.append("\n")
        for text, style in line:
            out.append(text, style=style)
    return out


def heading(r: Result, *lines: str, width: int = 80) -> list:
    """The unit's name and tag in bold, then dim lines (a path too long for a line
    folded after a folder separator, not inside a name), then a blank line."""
    title = runs((r.name, "bold"), f"  ({r.tag})" if r.tag else "")
    return [Para(title, 0), *(Para(((piece, "dim"),), 0) for line in lines for piece in fold_path(line, width)),
            BLANK]


def fold_path(text: str, width: int) -> list[str]:
    """``text`` as lines of at most ``width`` columns where it has a word (a path) longer
    than a line: each cut after the last ``/`` or ``\\`` that fits (else at the width).
    Text without such a word is one line, left to the page's own wrapping."""
    if all(len(word) <= width for word in text.split()):
        return [text]
    out, rest = [], text
    while len(rest) > width:
        cut = max(rest.rfind(" ", 0, width + 1), rest.rfind("/", 0, width), rest.rfind("\\", 0, width)) + 1 or width
        out.append(rest[:cut].rstrip(" "))
        rest = rest[cut:]
    return out + [rest] if rest else out


def report(result: Result, system: str, width: int = 80) -> list:
    """Everything ``check`` prints, in reading order.

    Parameters
    ----------
    result : Result
    system : str
        ``"si"`` or ``"us"``.
    width : int
        Columns available (the chart is drawn to fit).

    Returns
    -------
    list
        The page's blocks (:func:`stallcheck.render.page.emit` prints them).
    """
    r = result
    atm = r.atmospheric_pressure

    def p(pa):
        return display.show(pa, "pressure", system, atm)

    def t(k):
        return display.show(k, "temperature", system)

    def w(kg_s):
        return display.show(kg_s, "mass_flow", system)

    parts: list = heading(r, r.source, f"{r.medium}; load varies with {r.varies}; method {r.method}", width=width)

    d = r.design
    fill_note = (f"fill head {display.show(r.fill_head, 'length', system)} = "
                 f"{display.show(r.fill_head_pressure, 'differential', system)}")
    parts += [
        _heading("Design (full load)"),
        _para(f"load {display.show(d.load, 'power', system)}, steam {w(d.steam_flow)} "
              f"at {p(d.coil_pressure)} ({t(d.steam_temperature)}); supply {p(r.supply_pressure)}"),
        _para(f"back pressure on the trap {p(r.back_pressure)} (return {p(r.return_pressure)} plus "
              f"{display.show(r.lift, 'length', system)} lift); "
              f"{fill_note}"),
        BLANK,
    ]

    s = r.stall
    parts.append(_heading("Stall point"))
    if not s.occurs and s.valve_load_fraction is None:
        parts.append(_para(f"none: the coil pressure stays above {p(s.threshold_pressure)}, the pressure at "
                           f"which the trap stops discharging, at every load.", style="green"))
    elif not s.occurs:
        parts.append(Para(runs((f"  stalls {words.valve_stall_loads(s.valve_load_fraction, 0.0)}", "bold red")), 0))
    else:
        if s.load_fraction >= 1.0:
            lead = runs(("  stalled at every load, full load included", "bold red"))
        else:
            lead = runs((f"  stalls below {words.percent(s.load_fraction)} load", "bold"))
            if s.inlet_temperature is not None:
                lead += runs(f": entering {words.safe(s.inlet_temperature, 'temperature', system, atm, up=False)} "
                             "and warmer")
        parts.append(Para(lead, 0))
        if s.load_fraction >= 1.0:
            parts.append(_para(f"the coil has {p(s.coil_pressure)} at full load (steam {t(s.steam_temperature)}, "
                               f"condensate {w(s.condensate)}); the trap needs more than {p(s.threshold_pressure)} "
                               f"(the stall pressure)"))
        else:
            parts.append(_para(f"coil pressure {p(s.coil_pressure)}, steam {t(s.steam_temperature)}, "
                               f"condensate {w(s.condensate)}"))
        if not s.in_range and s.valve_load_fraction is None:
            parts.append(_para(f"below the minimum load of {r.minimum_load:.0%}: it never runs there.",
                               style="green"))
    if s.valve_load_fraction is not None:
        parts.append(_para(f"{words.valve_floods(s, system, atm)} (see control valve)", style="red"))
    if r.stalled_hours is not None:
        parts.append(_para(words.stalled_hours(r)))
    parts.append(BLANK)
    parts += year_section(r, system, width)

    drainage = r.drainage
    verdict = runs(f"  installed {drainage.installed}, required {drainage.required}: ",
                   ("adequate", "bold green") if drainage.adequate else ("NOT ADEQUATE", "bold red"))
    parts += [_heading("Drainage"), Para(verdict, 0),
              *bullets(words.drainage_reasons(drainage, system, r.atmospheric_pressure)), BLANK]
    parts += _devices(r, system)

    parts += hammer_sections(r, system)

    v = r.valve
    if v is not None:
        parts.append(_heading("Control valve"))
        opening = "more than fully open" if v.opening_design > 1 else f"{v.opening_design:.0%} open"
        parts.append(_para(f"{words.coefficient(v.cv, v.given_as)} installed ({v.characteristic}, rangeability "
                           f"{v.rangeability:g}); {words.coefficient(v.required_cv_design, v.given_as, needed=True)} "
                           f"needed at design, {opening}"
                          + ("; choked" if v.choked_at_design else "")))
        if not v.capacity_ok:
            parts.append(_para(f"too small: wide open it holds {p(v.limited_coil_pressure)} and delivers "
                               f"{words.percent(v.limited_load_fraction, up=False)} of design load", style="yellow"))
        parts.append(_para(f"controls down to about {words.percent(v.min_controllable_load)} load; below that it cycles"))
        parts.append(BLANK)

    parts.append(_heading("Findings"))
    if not r.findings:
        parts.append(Para(runs(("  none", "green")), 0))
    for f in r.findings:
        line = runs("  ", (SEVERITY_WORD[f.severity], SEVERITY_STYLE[f.severity]), (f"  {f.code}", "dim"))
        parts += [Para(line, 0), _para(words.finding(f, r, system), 4)]
    parts.append(BLANK)

    parts += _remedies(r, system)
    parts += [_heading("Stall chart"), chart_block(r, system, width=width - 2), *line_summary(r), BLANK]

    parts += [_heading("Assumptions"), *bullets(words.assumptions(r, system), style="dim"), BLANK]
    if r.warnings:
        parts += [_heading("Input warnings"), *bullets(r.warnings, style="yellow"), BLANK]
    parts += [_heading("Caution"), *bullets(words.cautions(r.cautions))]
    return parts


_BASIS = {"table": "capacity from the maker's table",
          "orifice": "capacity from its seat bore",
          "selected": "capacity not given: a trap selected by the usual rule"}


def _devices(r: Result, system: str) -> list:
    """Trap, pump-trap, purge and flash-steam sections."""
    atm = r.atmospheric_pressure

    def p(pa, kind="pressure"):
        return display.show(pa, kind, system, atm)

    def w(kg_s):
        return display.show(kg_s, "mass_flow", system)

    parts: list = []
    tr = r.trap
    if tr is not None:
        parts.append(_heading("Trap"))
        parts.append(Para(runs((f"  {_BASIS[tr.basis]}"
                                + (f" ({display.show(tr.bore, 'diameter', system)} bore)" if tr.basis != "table" else ""),
                                "dim")), 0))
        flooded = "; below zero: the trap cannot discharge at all" if tr.design_differential <= 0 else ""
        parts.append(_para(f"full load: {w(tr.design_condensate)} at {p(tr.design_differential, 'differential')} "
                           f"differential{flooded}"))
        parts.append(_para(f"lowest working differential: {p(tr.working_differential, 'differential')} at "
                           f"{tr.working_load:.0%} load, with {w(tr.working_condensate)}"))
        floor = ("" if tr.selection_differential <= tr.working_differential else
                 " (1/4 psi, the usual sizing floor: it has less than that)")
        select = runs(f"select for {w(tr.required_capacity)} ({tr.margin:g} x full load, common practice) at "
                      f"{p(tr.selection_differential, 'differential')}{floor}")
        if tr.installed_capacity is not None:
            select += runs(f"; it passes {w(tr.installed_capacity)} there: ",
                           ("enough", "bold green") if tr.capacity_ok else ("SHORT", "bold red"))
        parts.append(_para(select))
        if tr.rated_differential is not None:
            enough = tr.rated_differential >= tr.widest_differential
            parts.append(_para(runs(f"{words.trap_rating(tr, system, atm)}: ",
                                    ("enough", "bold green") if enough else ("SHORT", "bold red"))))
        if r.stall.valve_load_fraction is not None:
            # the valve floods the coil from that load up: no trap keeps up there
            parts.append(_para(f"the valve holds the coil under the stall pressure "
                               f"{words.valve_stall_loads(r.stall.valve_load_fraction, 0.0)}: no trap "
                               f"discharges there", style="red"))
        elif tr.limit_load is None:
            parts.append(_para("drainage limit: none, it keeps up at every load above zero"))
        elif r.stall.occurs and r.stall.load_fraction >= 1.0:
            parts.append(_para("drainage limit: the coil stalls at full load, so no trap alone discharges at any load"
                               + (f"; the {r.drainage.installed} moves the condensate" if r.drainage.adequate else "")))
        elif r.stall.occurs and tr.limit_load <= r.stall.load_fraction + 0.005:
            parts.append(_para(f"drainage limit: at the stall point ({words.percent(tr.limit_load)} load); above it the "
                               f"trap keeps up"))
        else:
            stall = f"; the stall proper is at {words.percent(r.stall.load_fraction)}" if r.stall.occurs else ""
            where = f", entering {display.show(tr.limit_inlet_temperature, 'temperature', system)}" \
                if tr.limit_inlet_temperature is not None else ""
            parts.append(_para(f"drainage limit: {words.percent(tr.limit_load)} load{where} ({w(tr.limit_condensate)} at "
                               f"{p(tr.limit_differential, 'differential')}); below it the trap falls short{stall}"))
        parts.append(BLANK)
    pt = r.pump_trap
    if pt is not None:
        parts.append(_heading("Pump-trap " + ("(installed)" if pt.installed else "(required)")))
        if pt.condensate > 0:
            parts.append(_para(f"must move {w(pt.condensate)} at the stall point ({words.percent(pt.load_fraction)} load) "
                               f"against {p(pt.back_pressure)}"))
        else:
            parts.append(_para("the coil never stalls, so it only ever traps"))
        source = "given" if pt.motive_given else "the supply; drain.motive_pressure not given"
        parts.append(_para(f"motive {p(pt.motive_pressure)} ({source}): "
                           f"{p(pt.motive_pressure - pt.back_pressure, 'differential')} above the back pressure"))
        need = "the maker's figure" if pt.fill_head_given else "common practice"
        parts.append(_para(f"fill head {display.show(pt.fill_head, 'length', system)}; needs "
                           f"{display.show(pt.required_fill_head, 'length', system)} ({need})"))
        if pt.outside_table:
            parts.append(_para("the back pressure is above the maker's capacity table: not rated for this duty",
                               style="yellow"))
        elif pt.capacity is not None:
            source = " (read from the maker's table)" if pt.capacity_basis == "table" else ""
            parts.append(_para(f"rated {w(pt.capacity)} at this duty{source}: "
                               + ("enough" if pt.capacity >= pt.condensate else "SHORT")))
        parts.append(BLANK)
    pu = r.purge
    if pu is not None:
        parts.append(_heading("Constant purge"))
        size = (f"orifice {display.show(pu.bore, 'diameter', system)} bleeds" if pu.basis == "orifice"
                else "stated rate:")
        parts.append(_para(f"{size} {w(pu.design_rate)} at full load, {w(pu.minimum_rate)} at the minimum load"))
        if pu.yearly_mass is not None:
            hours = "load bins" if pu.hours_basis == "bins" else "site.hours_per_year, at the full-load rate"
            cost = ""
            if pu.yearly_cost is not None:
                cost = f", costing {pu.yearly_cost:,.0f} {pu.currency}".rstrip()
            parts.append(_para(f"{pu.hours:,.0f} h a year ({hours}): {display.show(pu.yearly_mass, 'mass', system)} "
                               f"of steam{cost}"))
        else:
            parts.append(_para("give site.hours_per_year (or load bins) and site.steam_price for its yearly cost",
                               ))
        parts.append(BLANK)
    fl = r.flash
    if fl is not None:
        parts.append(_heading("Flash steam at the trap outlet"))
        outlet = display.show(fl.outlet_pressure, 'pressure', system, r.atmospheric_pressure)
        lifted = fl.return_fraction > fl.fraction + 1e-9
        if fl.fraction > 0:
            parts.append(_para(f"{fl.fraction:.1%} of the condensate at full load, at the trap outlet's {outlet}"
                               + (" (the return plus the lift's head)" if lifted else "")))
        elif fl.return_fraction > 0:
            parts.append(_para(f"none at the trap outlet's {outlet}: the coil pressure is not above it"))
        else:
            parts.append(_para("none at full load: the coil pressure is not above the return pressure"))
        if fl.return_fraction > 0:
            parts.append(_para((f"growing up the lift to {fl.return_fraction:.1%} at the return: " if lifted
                                else "at the return: ")
                               + f"{w(fl.flow)}, {display.show(fl.volume_flow, 'volume_flow', system)}"))
        if fl.velocity is not None:
            from stallcheck.physics.constants import VELOCITY_LIMIT
            parts.append(_para(f"return line {display.show(fl.line_diameter, 'diameter', system)} bore: "
                               f"{display.show(fl.velocity, 'velocity', system)} (keep under about "
                               f"{display.show_about(VELOCITY_LIMIT, 'velocity', system)})"))
        parts.append(BLANK)
    return parts


#: Marks of the year's table: an hour the trap drains, an hour stalled.
YEAR_MARKS = {"drains": "=", "stalled": "#"}


def year_section(r: Result, system: str, width: int = 80) -> list:
    """The site's weather year: hours run and stalled, freeze exposure, the heating
    design condition, and a table of the hours by load band (stalled hours marked)."""
    y = r.year
    if y is None:
        return []

    def t(k):
        return display.show(k, "temperature", system)

    where = f"{y.file}: {y.station}" if y.station else y.file
    elevation = (f", {display.convert(y.station_elevation, 'length', system):,.0f} {display.label('length', system)}"
                 if y.station_elevation is not None else "")
    parts = [_heading("The site's year"), _para(f"{where} ({y.form.upper()}{elevation}), {y.hours:,} h")]
    off = y.hours - y.scheduled
    parts.append(_para(f"runs {y.operating:,} h; {y.no_load:,} h need no heat"
                       + (f", {off:,} h are outside its season and hours" if off else "")))
    freezing = (f"; {y.stalled_freezing:,} h of them with the air entering below {t(FREEZING)}, "
                f"{y.longest_freezing_run:,} h at a stretch at the longest" if y.stalled_freezing else
                f"; none with the air entering below {t(FREEZING)}")
    parts.append(_para(f"stalled {y.stalled:,} h{freezing}", style="red" if y.stalled_freezing else None))
    stated = (f" (the file states {t(y.stated_996)} and {t(y.stated_990)})" if y.stated_996 is not None
              and y.stated_990 is not None else "")
    parts.append(_para(f"heating design dry bulb from its hours: 99.6 % {t(y.dry_bulb_996)}, 99 % "
                       f"{t(y.dry_bulb_990)}{stated}"))
    mixed = (f"; at 99.6 % the mixed air enters at {t(y.entering_996)}, and the coldest it enters in "
             f"the year's hours is {t(y.coldest_entering)}" if abs(y.entering_996 - y.dry_bulb_996) > 1e-9 else "")
    parts.append(_para(f"design entering air {t(y.design_inlet)}{mixed}; {y.above_full:,} h colder (full load, "
                       f"the air leaving short of its set point)"
                       + (f"; {y.below_minimum:,} h ask less than the minimum load and run at it"
                          if y.below_minimum else "")))
    parts += [_para("operating hours by load, % of design:"), _year_table(y, width)]
    parts += [_para(f"{YEAR_MARKS['drains']} hours the trap drains   {YEAR_MARKS['stalled']} hours stalled   "
                    f"(a typical year: see the cautions)"), BLANK]
    return parts


def _year_table(y, width: int) -> page.Pre:
    """Operating hours by load band as text bars, stalled hours marked."""
    label_width, count_width = 10, 9
    room = max(10, min(width, 100) - 2 - label_width - count_width - 1)
    most = max((hours for _, _, hours, _ in y.bands), default=0) or 1
    lines = []
    for lower, upper, hours, stalled in y.bands:
        band = f"{lower * 100:.0f}-{upper:.0%}" if upper is not None else f"{lower:.0%}+"
        drains = hours - stalled
        bar_stalled = round(stalled / most * room)
        bar_drains = round(drains / most * room)
        if stalled and not bar_stalled:
            bar_stalled = 1
        if drains and not bar_drains:
            bar_drains = 1
        lines.append(((f"  {band:>{label_width - 2}}", None), (f"{hours:>{count_width - 2},} h ", None),
                      (YEAR_MARKS["stalled"] * bar_stalled, "red"), (YEAR_MARKS["drains"] * bar_drains, None)))
    return page.Pre(tuple(lines))


def line_summary(r: Result) -> list:
    """Under the chart: the worst flow pattern in the line from the trap, where the line
    is described (the return line section has the detail)."""
    line = r.return_line
    if line is None:
        return []
    worst = line.worst
    return [Para(runs("return line from the trap, at worst: ",
                      (worst.taitel_dukler, "bold red" if worst.slugging else None), f" ({worst.where})"), 2)]


def hammer_sections(r: Result, system: str) -> list:
    """The return line's flow pattern and the surge, where the line is described."""
    parts: list = []
    line = r.return_line
    if line is not None:
        pitch = "level (no pitch given)" if line.pitch is None else (
            f"falling {line.pitch:.1%} with the flow" if line.pitch >= 0 else f"rising {-line.pitch:.1%} against it")
        lift = any(pt.riser is not None for pt in line.points)
        parts += [_heading("Return line from the trap"),
                  _para(f"{display.show(line.bore, 'diameter', system)} bore"
                        + (f": up the {display.show(r.lift, 'length', system)} lift (vertical upflow, Taitel, Barnea & "
                           f"Dukler), then the run, {pitch}" if lift else f", {pitch}")
                        + "; the run's pattern by Taitel & Dukler (Mandhane's map beside it):")]
        for pt in line.points:
            flow = display.show(pt.condensate, "mass_flow", system)
            text = runs(f"{pt.where} ({words.percent(pt.load_fraction)}): ")
            if pt.riser is not None:
                text += runs("lift ", (pt.riser, "bold red" if pt.riser_slugging else None), "; run ")
            if pt.taitel_dukler == "liquid only":  # no flash: no two-phase pattern (physics.hammer)
                text += runs(f"liquid only, no flash; {flow}")
            else:
                text += runs((pt.taitel_dukler, "bold red" if pt.slugging else None),
                             f" ({pt.mandhane}); flash {pt.flash_fraction:.1%} of {flow}")
            parts.append(Para(text, 4, runs("  - ")))
        if line.slugging:
            parts.append(_para(f"stratified at every load from {line.stratified_size} "
                               f"({display.show(line.stratified_bore, 'diameter', system)} bore)" if line.stratified_bore
                               else "no line up to 6 in keeps it stratified at every load", style="yellow"))
        parts.append(BLANK)
    sh = r.surge
    if sh is not None:
        atm = r.atmospheric_pressure
        what = ("the pump-trap's discharge stopped by its check valve" if sh.basis == "pump-trap"
                else "the trap's full-load discharge rising in the lift, stopped when the trap shuts (a column "
                     "that falls back strikes no faster than it rose)")
        if sh.basis == "pump-trap":
            what += f", closing in {sh.closing_time:g} s" if sh.closing_time else ", closing at once"
        elif sh.closing_time:
            what += f"; the check valve after it closes in {sh.closing_time:g} s"
        parts += [_heading("Surge (hydraulic shock)"), _para(what),
                  _para(f"{display.show(sh.velocity, 'velocity', system)} stopped; wave speed "
                        f"{display.show_about(sh.wave_speed, 'velocity', system)} (Korteweg): a rise of "
                        f"{display.show_about(sh.surge, 'differential', system)} (Joukowsky"
                        + (", slowed by the closure" if sh.slowed else "") + f"), to {display.show(sh.peak, 'pressure', system, atm)}"
                        + (f" against a rating of {display.show(sh.rating, 'pressure', system, atm)}" if sh.rating else "")),
                  *([_para("flash steam collapsing in the riser can strike harder; no published method sizes "
                           "that from these inputs", style="dim")] if sh.basis == "lift" else []),
                  _para("a screening figure: relief, ratings and the fix follow the piping code and licensed "
                        "practice", style="dim"),
                  BLANK]
    return parts


def _remedies(r: Result, system: str) -> list:
    """The 'what to do' section (:mod:`stallcheck.render.advice`)."""
    a = advice.advise(r, system)
    parts: list = [_heading(a.title)]
    lead = list(a.lead)
    if a.fit:
        parts.append(_para(lead.pop(0), style="bold"))
    parts += [_para(line) for line in lead]
    parts += [Para(runs((rem.key, "bold"), ": ", rem.note), 4) for rem in a.changes]
    if a.cannot:
        if a.changes:
            parts.append(_para("Not by changing one of these alone:"))
        parts += [Para(runs((rem.key, "dim bold"), ": ", (rem.note, "dim")), 4) for rem in a.cannot]
    parts += [_para(note, style="dim") for note in a.notes]
    parts.append(BLANK)
    return parts


def console(stderr: bool = False, width: int | None = None):
    """A rich console for prompts and progress (stderr), honouring NO_COLOR; at most 100
    columns unless ``width`` is given."""
    from rich.console import Console

    import sys

    # the page's own rule (a COLUMNS of nothing is not known, and no page is narrower
    # than page.MIN_WIDTH), not rich's reading of the environment
    return Console(stderr=stderr, highlight=False, soft_wrap=False,
                   width=page.width_for(sys.stderr if stderr else sys.stdout, width))
