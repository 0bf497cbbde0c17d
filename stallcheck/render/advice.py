"""The one "what to do" section, shared by the terminal, the Markdown report and the
JSON contract, so the three never say different things.

* The installed drainage is not adequate: lead with the drainage the unit requires; then
  the single changes that would let the installed arrangement drain it (only those that
  can be applied to this unit), then in one list the values that cannot do it, and why.
* It is adequate: nothing prescriptive. With a trap, vacuum breaker or purge, the
  margins: how far each value can go, alone, before it no longer drains the unit. With
  a pump-trap, a note that the drainage needs no change.
"""

from __future__ import annotations

from dataclasses import dataclass

from stallcheck.analysis.remedies import MARGIN
from stallcheck.files import display
from stallcheck.render import words
from stallcheck.result import Remedy, Result


@dataclass(frozen=True)
class Line:
    """One remedy as printed: its key, its note in words, and the remedy itself."""

    key: str
    note: str
    remedy: Remedy


def lines(r: Result, system: str) -> tuple[Line, ...]:
    """Every remedy of a result with its note, in ``system`` units."""
    return tuple(Line(m.key, words.remedy(m, system, r.atmospheric_pressure, r.minimum_load), m)
                 for m in r.remedies)


@dataclass(frozen=True)
class Advice:
    """What to do for one unit, ready to print.

    Attributes
    ----------
    mode : str
        ``"fix"`` (the installed drainage is not adequate), ``"margins"`` (it is, and the
        margins follow) or ``"none"`` (it is, and nothing follows: a pump-trap).
    title : str
    lead : tuple of str
        Sentences before the list.
    changes : tuple of Line
        Each applicable alone: changes (``fix``) or margins (``margins``).
    cannot : tuple of Line
        Values that cannot do it on this unit, with the reason in their note.
    notes : tuple of str
        Sentences after the list: the margin and the rounding.
    fit : str or None
        The arrangement to fit, where the installed one is not adequate.
    """

    mode: str
    title: str
    lead: tuple[str, ...]
    changes: tuple[Line, ...]
    cannot: tuple[Line, ...]
    notes: tuple[str, ...]
    fit: str | None


def advise(r: Result, system: str) -> Advice:
    """The "what to do" section of a result, in ``system`` units for its words."""
    drainage = r.drainage
    installed = drainage.installed
    f_min = r.minimum_load
    down_to = f"down to its minimum load of {f_min:.0%}" if f_min > 0 else "at every load"
    margin = display.show(MARGIN, "differential", system)
    notes = (f"Each figure keeps {margin} of differential across the trap beyond its exact limit, and is "
             f"rounded in the safe direction: apply it as printed, one change at a time, and check again.",)
    if f_min == 0 and r.remedies:
        notes += ("load.minimum is 0, so these figures must drain the coil at no load at all; give the lowest "
                  "load the unit really runs at for figures that can be met.",)
    if not drainage.adequate:
        lead = [f"Fit {words.FIT[drainage.required]}: the installed {installed} cannot drain this coil wherever "
                f"it runs (see drainage)."]
        said = lines(r, system)
        changes = tuple(m for m in said if m.remedy.status == "change" and m.remedy.achievable)
        cannot = tuple(m for m in said if m not in changes and m.remedy.status != "any")
        if changes:
            lead.append(f"Or keep the installed {installed} and make any one of these changes; each, alone, "
                        f"lets it drain the coil {down_to}:")
        elif r.remedies:
            lead.append(f"No single change lets the installed {installed} drain it {down_to}:")
        return Advice("fix", "What to do", tuple(lead), changes, cannot, notes if changes else (), drainage.required)
    if not r.remedies:
        return Advice("none", "What to do", (f"Nothing to change in the drainage: the installed {installed} moves "
                                             f"the condensate at every load. Keep it working, and test it as its "
                                             f"maker asks.",), (), (), (), None)
    handled = (f"the installed {installed} drains the coil {down_to}" if not r.stall.in_range else
               f"the unit stalls below {words.percent(r.stall.load_fraction)} load, and the installed {installed} drains it "
               f"there")
    return Advice("margins", "Margins", (f"Nothing to change: {handled}. How far each value can go, alone, "
                                         f"before it no longer does:",),
                  lines(r, system), (), notes[:1], None)
