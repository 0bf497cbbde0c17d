"""The hand-over report: Markdown for a design file or a work order, and the stall chart
as a picture (SVG or PNG) where matplotlib is installed (the ``plot`` extra)."""

from __future__ import annotations

import io


from stallcheck.files import display
from stallcheck.inputs import Unit
from stallcheck.physics.constants import FREEZING
from stallcheck.render import advice, chart, page, terminal, words
from stallcheck.result import Result

SEVERITY_WORD = {"danger": "DANGER", "warning": "Warning", "info": "Note"}


class MissingExtra(Exception):
    """An optional library is not installed; the message says how to install it."""


def markdown(unit: Unit, r: Result, system: str, version: str, date: str, pictures: tuple[str, ...] = ()) -> str:
    """The report as Markdown text.

    Parameters
    ----------
    unit : Unit
        The validated input (for the data section).
    r : Result
    system : str
        ``"si"`` or ``"us"`` display units.
    version, date : str
        The program version and the date, printed in the header.
    pictures : tuple of str
        Chart pictures written beside the report, linked (relative paths) under the
        text chart.
    """
    atm = r.atmospheric_pressure

    def show(value, kind):
        return display.show(value, kind, system, atm)

    d = unit.design
    dr = unit.drain
    out: list[str] = [f"# Stall check: {r.name}" + (f" ({r.tag})" if r.tag else ""), ""]
    out += [f"Unit file `{r.source}`, analysed by stallcheck {version} on {date}. "
            "A screening aid: the cautions at the end apply.", ""]

    rows = [
        ("Medium", d.medium + (f", {d.concentration:.0%} by mass" if d.concentration else "")),
        ("Design load", show(r.design.load, "power")),
        ("Entering at full load", show(d.inlet_temperature, "temperature")),
        ("Set point (leaving)", show(d.outlet_temperature, "temperature")),
        ("Design steam pressure", f"{show(d.steam_pressure, 'pressure')} ({show(r.design.steam_temperature, 'temperature')})"),
        ("Supply pressure", show(r.supply_pressure, "pressure")),
        ("Load varies with", r.varies),
        ("Minimum load", f"{r.minimum_load:.0%}"),
        ("Drain", f"{dr.arrangement}, {dr.trap} trap"),
        ("Fill head / lift", f"{show(dr.fill_head, 'length')} / {show(dr.lift, 'length')}"),
        ("Return pressure", show(dr.return_pressure, "pressure")),
        ("Back pressure on the trap", show(r.back_pressure, "pressure")),
    ]
    if unit.valve is not None:
        v = unit.valve
        rows.append(("Control valve", f"{words.coefficient(v.cv, v.given_as)}, {v.characteristic}, rangeability "
                                      f"{v.rangeability:g}"))
    out += ["## The unit", "", "| | |", "|---|---|"] + [f"| {a} | {b} |" for a, b in rows] + [""]

    out += ["## Method and assumptions", ""] + [f"- {a}" for a in words.assumptions(r, system)] + [""]

    s = r.stall
    out += ["## Stall point", ""]
    if not s.occurs and s.valve_load_fraction is None:
        out.append(f"None: the coil pressure stays above {show(s.threshold_pressure, 'pressure')}, where the "
                   f"trap would stop discharging, at every load.")
    elif not s.occurs:
        out.append(f"**{words.stall_summary(s).capitalize()}**.")
    elif s.load_fraction >= 1.0:
        out.append(f"**Stalled at every load**: the trap needs the coil above {show(s.threshold_pressure, 'pressure')}, "
                   f"more than it has at full load.")
    else:
        inlet = (f" (entering {words.safe(s.inlet_temperature, 'temperature', system, atm, up=False)} and warmer)"
                 if s.inlet_temperature is not None else "")
        out.append(f"**Stalls below {words.percent(s.load_fraction)} load**{inlet}: coil pressure {show(s.coil_pressure, 'pressure')}, "
                   f"steam {show(s.steam_temperature, 'temperature')}, condensate {show(s.condensate, 'mass_flow')}.")
    if s.valve_load_fraction is not None:
        out.append(_sentence(words.valve_floods(s, system, atm)))
    if r.stalled_hours is not None:
        out.append(_sentence(words.stalled_hours(r)))
    out.append("")

    dn = r.drainage
    out += ["## Verdict", "",
            f"Installed **{dn.installed}**, required **{dn.required}**: "
            + ("adequate." if dn.adequate else "**not adequate**."), ""]
    out += [f"- {reason}" for reason in words.drainage_reasons(dn, system, r.atmospheric_pressure)] + [""]

    out += ["## Stall chart", "", "```text", chart.plain(chart.render(r, system, width=78)), "```", ""]
    out += [f"![Stall chart]({link})" for link in pictures] + ([""] if pictures else [])
    year = terminal.year_section(r, system, 78)
    if year:
        out += ["## The site's year", "", "```text", page.plain(year[1:], 78).rstrip(), "```", ""]

    out += _figures(r, show, system)
    hammer = terminal.hammer_sections(r, system)
    if hammer:
        out += ["## Return line and surge", "", "```text", page.plain(hammer, 78).rstrip(), "```", ""]

    a = advice.advise(r, system)
    out += [f"## {a.title}", ""]
    lead = list(a.lead)
    if a.fit:
        lead[0] = f"**{lead[0]}**"
    out += [" ".join(lead), ""]
    if a.changes:
        out += [f"- `{m.key}`: {m.note}" for m in a.changes] + [""]
    if a.cannot:
        out += (["Not by changing one of these alone:", ""] if a.changes else [])
        out += [f"- `{m.key}`: {m.note}" for m in a.cannot] + [""]
    out += [f"_{note}_" for note in a.notes] + ([""] if a.notes else [])

    out += ["## Findings", ""]
    out += [f"- **{SEVERITY_WORD[f.severity]}** `{f.code}`: {words.finding(f, r, system)}" for f in r.findings] or ["None."]
    out += ["", "## Cautions", ""] + [f"- {c}" for c in words.cautions(r.cautions)] + [""]
    return "\n".join(out)


def _sentence(clause: str) -> str:
    """A clause of the terminal's words as a sentence: its first letter raised (not
    ``capitalize``, which would lower "inHg") and a full stop."""
    return clause[:1].upper() + clause[1:] + "."


def _figures(r: Result, show, system: str) -> list[str]:
    """Valve and drain-device figures as a table (``system``: the display units)."""
    rows = []
    v = r.valve
    if v is not None:
        rows.append(("Valve needs at design", f"{words.coefficient(v.required_cv_design, v.given_as, needed=True)} "
                     f"of {words.coefficient(v.cv, v.given_as)} "
                     f"({'more than fully open' if v.opening_design > 1 else f'{v.opening_design:.0%} open'})"))
        if not v.capacity_ok:
            rows.append(("Valve-limited", f"{words.percent(v.limited_load_fraction, up=False)} of design load at "
                         f"{show(v.limited_coil_pressure, 'pressure')}"))
        rows.append(("Valve controls down to", f"about {words.percent(v.min_controllable_load)} load"))
    t = r.trap
    if t is not None:
        rows.append(("Trap: full-load condensate", f"{show(t.design_condensate, 'mass_flow')} at "
                     f"{show(t.design_differential, 'differential')}"))
        rows.append(("Trap: select for", f"{show(t.required_capacity, 'mass_flow')} ({t.margin:g} x full load) at "
                     f"{show(t.selection_differential, 'differential')}"
                     + ("" if t.installed_capacity is None else
                        f"; passes {show(t.installed_capacity, 'mass_flow')} there")))
        if t.rated_differential is not None:
            rows.append(("Trap: rating", f"{words.trap_rating(t, system, r.atmospheric_pressure)}: "
                         f"{'enough' if t.rated_differential >= t.widest_differential else 'SHORT'}"))
        rows.append(("Drainage limit", "none" if t.limit_load is None else f"{words.percent(t.limit_load)} load"))
    p = r.pump_trap
    if p is not None:
        rows.append(("Pump-trap duty", f"{show(p.condensate, 'mass_flow')} against {show(p.back_pressure, 'pressure')}, "
                     f"motive {show(p.motive_pressure, 'pressure')}"))
    u = r.purge
    if u is not None:
        yearly = "" if u.yearly_mass is None else f"; {show(u.yearly_mass, 'mass')} a year"
        cost = "" if u.yearly_cost is None else f", {u.yearly_cost:,.0f} {u.currency}".rstrip()
        rows.append(("Constant purge", f"{show(u.design_rate, 'mass_flow')} at full load{yearly}{cost}"))
    f = r.flash
    if f is not None:
        velocity = "" if f.velocity is None else f"; {show(f.velocity, 'velocity')} in the return line"
        grown = f" (to {f.return_fraction:.1%} at the return)" if f.return_fraction > f.fraction + 1e-9 else ""
        rows.append(("Flash steam at full load", f"{f.fraction:.1%} at the trap outlet{grown}, "
                                                 f"{show(f.flow, 'mass_flow')}{velocity}"))
    return ["## Valve and drain figures", "", "| | |", "|---|---|"] + [f"| {a} | {b} |" for a, b in rows] + [""]


def _year_picture(ax, r: Result, system: str) -> None:
    """The weather year on ``ax``: operating hours by entering temperature, stalled hours
    shaded, with freezing and the design entering temperature marked."""
    import numpy as np

    y = r.year
    entering = np.asarray(display.convert_array(y.entering[y.running], "temperature", system), dtype=float)
    stalled = y.stalled_hours[y.running]
    step = 2.0 if system == "si" else 4.0
    if entering.size:
        edges = np.arange(np.floor(entering.min() / step) * step, entering.max() + step, step)
    else:
        edges = np.array([0.0, step])
    all_hours, _ = np.histogram(entering, edges)
    stalled_hours, _ = np.histogram(entering[stalled], edges)
    unit = display.label("temperature", system)
    ax.bar(edges[:-1], all_hours - stalled_hours, width=step, align="edge", color="tab:blue", alpha=0.6,
           label="hours the trap drains")
    ax.bar(edges[:-1], stalled_hours, width=step, align="edge", bottom=all_hours - stalled_hours, color="tab:red",
           alpha=0.7, label="hours stalled")
    ax.axvline(display.convert(FREEZING, "temperature", system), color="tab:cyan", lw=1.2, ls="--",
               label="freezing")
    ax.axvline(display.convert(y.design_inlet, "temperature", system), color="black", lw=1.2, label="design entering air")
    ax.set_xlabel(f"air entering the coil, {unit}")
    ax.set_ylabel("hours a year")
    ax.set_title(f"The site's year: {y.file} ({y.stalled:,} h stalled, {y.stalled_freezing:,} h below freezing)",
                 fontsize=9)
    ax.grid(True, alpha=0.3)
    ax.legend(loc="upper left", fontsize=8)


def picture(r: Result, system: str, fmt: str) -> bytes:
    """The stall chart drawn with matplotlib, as SVG or PNG bytes.

    Raises
    ------
    MissingExtra
        Where matplotlib is not installed.
    """
    try:
        import matplotlib

        matplotlib.use("Agg")
        import matplotlib.pyplot as plt
    except ImportError:
        raise MissingExtra("drawing the chart needs matplotlib: pip install \"stallcheck[plot]\" "
                           "(or pip install matplotlib)") from None
    atm = r.atmospheric_pressure
    pts = r.points
    load = pts.load_fraction * 100
    pressure = display.convert_array(pts.coil_pressure, "pressure", system, atm)
    back = display.convert(r.back_pressure, "pressure", system, atm)
    unit = display.label("pressure", system)
    if r.year is None:
        fig, ax = plt.subplots(figsize=(7.5, 4.5), dpi=120)
    else:
        fig, (ax, year_ax) = plt.subplots(2, 1, figsize=(7.5, 8.5), dpi=120, height_ratios=(1.1, 1.0))
        _year_picture(year_ax, r, system)
    ax.plot(load, pressure, color="tab:blue", lw=2, label="steam pressure the coil needs")
    ax.axhline(back, color="tab:orange", lw=1.5, ls="--", label="back pressure on the trap")
    ax.axhline(0.0, color="grey", lw=0.8, ls=":", label="atmospheric (0 gauge)")
    ax.fill_between(load, min(min(pressure), back, 0.0), pressure, where=pts.stalled, color="tab:red", alpha=0.15,
                    label="stalled: the trap cannot discharge")
    if r.stall.occurs:
        ax.plot([r.stall.load_fraction * 100], [display.convert(r.stall.coil_pressure, "pressure", system, atm)], "X",
                color="tab:red", ms=10, label="stall point")
    t = r.trap
    if t is not None and t.limit_load is not None and (not r.stall.occurs or t.limit_load > r.stall.load_fraction + 0.005):
        ax.plot([t.limit_load * 100], [display.convert(t.limit_coil_pressure, "pressure", system, atm)], "D",
                color="tab:purple", ms=7, label="drainage limit")
    if r.minimum_load > 0:
        ax.axvline(r.minimum_load * 100, color="tab:green", lw=1, label="minimum load")
    ax.set_xlim(0, 100)
    ax.set_xlabel("load, % of design")
    ax.set_ylabel(f"coil pressure, {unit}")
    ax.set_title(r.name + (f" ({r.tag})" if r.tag else ""))
    ax.grid(True, alpha=0.3)
    ax.legend(loc="upper left", fontsize=8)
    fig.tight_layout()
    buffer = io.BytesIO()
    fig.savefig(buffer, format=fmt)
    plt.close(fig)
    return buffer.getvalue()
