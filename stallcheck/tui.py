"""``stallcheck explore``: a full-screen what-if on one unit (Textual).

The stall chart, the stall point and the drainage verdict, redrawn at once as keys
nudge the lift, the return pressure, the fill head, the design steam pressure, the
valve Cv and the minimum load. Each change re-runs the analysis (a few milliseconds
once the steam tables are loaded). ``s`` saves the changed unit as a new file (never
over the original, nor over any file, without confirmation); ``d`` lists the
differences from the original.
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

from rich.text import Text
from textual.app import App, ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.screen import ModalScreen
from textual.widgets import Footer, Header, Input, Static

from stallcheck import analysis
from stallcheck.errors import InputError, StallcheckError
from stallcheck.files import atomic, unitwriter
from stallcheck.files import quantities as q
from stallcheck.files import display
from stallcheck.inputs import Unit
from stallcheck.render import terminal, words

#: What the keys nudge: name → (unit-file key, display kind, step in SI by system).
KNOBS = {
    "lift": ("drain.lift", "length", {"us": 0.3048, "si": 0.25}),
    "return": ("drain.return_pressure", "pressure", {"us": 6894.757293168, "si": 10e3}),
    "fill": ("drain.fill_head", "length", {"us": 0.0762, "si": 0.05}),
    "design": ("design.steam_pressure", "pressure", {"us": 6894.757293168, "si": 10e3}),
    "cv": ("valve.cv", "cv", {"us": 1.1, "si": 1.1}),
    "minimum": ("load.minimum", "fraction", {"us": 0.05, "si": 0.05}),
}


#: How each knob is shown in the status lines.
KEYS = {"lift": "l/L", "return": "r/R", "fill": "f/F", "design": "p/P", "cv": "c/C", "minimum": "m/M"}
LABELS = {"lift": "lift", "return": "return", "fill": "fill head", "design": "design pressure", "cv": "Cv",
          "minimum": "minimum load"}


def value_of(unit: Unit, knob: str) -> float | None:
    """The present value of a knob (SI; the valve's coefficient as the file gives it, Cv or
    Kv; None where the unit has no valve)."""
    coefficient = None
    if unit.valve is not None:
        coefficient = unit.valve.cv / q.CV_PER_KV if unit.valve.given_as == "kv" else unit.valve.cv
    return {"lift": unit.drain.lift, "return": unit.drain.return_pressure, "fill": unit.drain.fill_head,
            "design": unit.design.steam_pressure, "cv": coefficient, "minimum": unit.load.minimum}[knob]


def nudged(unit: Unit, knob: str, sign: int, system: str) -> Unit:
    """The unit with one knob moved a step (clamped to what the format accepts)."""
    step = KNOBS[knob][2][system]
    if knob == "lift":
        return replace(unit, drain=replace(unit.drain, lift=max(0.0, unit.drain.lift + sign * step)))
    if knob == "fill":
        return replace(unit, drain=replace(unit.drain, fill_head=max(0.0, unit.drain.fill_head + sign * step)))
    if knob == "return":
        return replace(unit, drain=replace(unit.drain, return_pressure=max(5e3, unit.drain.return_pressure + sign * step)))
    if knob == "design":
        p = unit.design.steam_pressure + sign * step
        if p >= unit.supply_pressure:
            raise InputError("design.steam_pressure", "cannot reach the supply pressure: the valve needs a drop.")
        return replace(unit, design=replace(unit.design, steam_pressure=max(5e3, p)))
    if knob == "cv":
        if unit.valve is None:
            raise InputError("valve.cv", "the unit file has no [valve] to change.")
        return replace(unit, valve=replace(unit.valve, cv=unit.valve.cv * step ** sign))
    minimum = min(max(unit.load.minimum + sign * step, 0.0), 0.95)
    return replace(unit, load=replace(unit.load, minimum=round(minimum, 6)))


def shown(value: float | None, kind: str, system: str, atm: float) -> str:
    if value is None:
        return "—"
    if kind == "cv":
        return f"{value:.3g}"   # as the file gives it: Kv for a Kv file (see value_of)
    if kind == "fraction":
        return f"{value:.0%}"
    return display.show(value, kind, system, atm)


def differences(original: Unit, unit: Unit, system: str) -> list[str]:
    """Each knob that differs from the original: ``key: old -> new``."""
    atm = unit.site.atmospheric_pressure
    out = []
    for knob, (key, kind, _) in KNOBS.items():
        a, b = value_of(original, knob), value_of(unit, knob)
        if a != b:
            if knob == "cv" and unit.valve is not None and unit.valve.given_as == "kv":
                key = "valve.kv"
            out.append(f"{key}: {shown(a, kind, system, atm)} -> {shown(b, kind, system, atm)}")
    return out


class AskScreen(ModalScreen):
    """One line of input; dismissed with the text, or None on Escape."""

    BINDINGS = [Binding("escape", "cancel", "cancel")]

    def __init__(self, question: str, default: str = ""):
        super().__init__()
        self.question, self.default = question, default

    def compose(self) -> ComposeResult:
        with Vertical(id="dialog"):
            yield Static(self.question)
            yield Input(value=self.default, id="answer")

    def on_input_submitted(self, event: Input.Submitted) -> None:
        self.dismiss(event.value)

    def action_cancel(self) -> None:
        self.dismiss(None)


class TextScreen(ModalScreen):
    """A page of text; any of Escape, q or Enter closes it."""

    BINDINGS = [Binding("escape", "close", "close"), Binding("q", "close", "close"),
                Binding("enter", "close", "close")]

    def __init__(self, text: str):
        super().__init__()
        self.text = text

    def compose(self) -> ComposeResult:
        yield Static(self.text, id="page")

    def action_close(self) -> None:
        self.dismiss(None)


#: The help page: every key, what it does and by how much.
HELP = """Keys (lower-case lowers, capital raises)

  l L   lift after the trap          1 ft or 0.25 m a step
  r R   return pressure              1 psi or 0.1 bar
  f F   fill head under the coil     3 in or 50 mm
  p P   design steam pressure        1 psi or 0.1 bar
  c C   valve Cv                     10 %
  m M   minimum load                 5 points
  d     the changes from the file, in values and results
  s     save the changes as a new file (asks before replacing)
  ?     this page
  q     quit (asks first where the changes are not saved)

Each key re-runs the analysis and redraws the chart.
"was -> now" compares with the unit as its file has it.
Escape closes this page."""


def compared(before, after, system: str) -> list[str]:
    """The results that differ between two analyses: ``what was -> now``."""
    atm = after.atmospheric_pressure
    out = []

    def stall(r) -> str:
        s = r.stall
        return words.stall_summary(s)

    def verdict(r) -> str:
        return f"{r.drainage.required}, {'adequate' if r.drainage.adequate else 'NOT ADEQUATE'}"

    pairs = [("coil", stall(before), stall(after)), ("needs", verdict(before), verdict(after))]
    if before.valve is not None and after.valve is not None:
        pairs.append(("valve", f"{before.valve.opening_design:.0%} open", f"{after.valve.opening_design:.0%} open"))
    if before.trap is not None and after.trap is not None:
        pairs.append(("trap sized at", display.show(before.trap.selection_differential, "differential", system, atm),
                      display.show(after.trap.selection_differential, "differential", system, atm)))
    out += [f"{name} {a} -> {b}" for name, a, b in pairs if a != b]
    return out


def wrapped(text: str, width: int) -> list[str]:
    """Plain words wrapped to ``width`` columns (status lines must not wrap on screen,
    so that their height, and so the chart's, is known)."""
    import textwrap

    return textwrap.wrap(text, width=max(width, 20), break_on_hyphens=False) or [""]


def keyboard_driver():
    """Textual's driver for this platform; on Linux and macOS one whose keyboard reading
    survives a byte that is not UTF-8 (a stray key, a terminal set to another encoding).

    The stock reader decodes each read of the keyboard as UTF-8 and stops on an error,
    leaving the app without keys (a hang behind a traceback). Here the reader starts
    again on the next read: the keys in the read that held the bad byte are dropped,
    nothing else.
    """
    import sys as _sys

    if _sys.platform == "win32":
        return None
    from textual.drivers.linux_driver import LinuxDriver

    class TolerantDriver(LinuxDriver):
        def run_input_thread(self) -> None:
            while not self.exit_event.is_set():
                try:
                    super().run_input_thread()
                    return
                except UnicodeDecodeError:
                    continue  # that read is lost; the keyboard is read afresh

    return TolerantDriver


class Explorer(App):
    """The what-if app for one unit."""

    TITLE = "stallcheck explore"
    CSS = """
    #chart { height: 1fr; }
    #status { height: auto; }
    #dialog, #page { border: round $accent; padding: 0 1; height: auto; max-height: 90%; margin: 1 2; }
    #dialog { width: 90%; max-width: 76; }
    #page { width: auto; max-width: 90%; }
    """
    BINDINGS = [
        Binding(key, f"nudge('{knob}', {sign})", f"{LABELS[knob]} {'+' if sign > 0 else '-'}", show=False)
        for knob, keys in KEYS.items() for key, sign in ((keys[0], -1), (keys[2], 1))
    ] + [Binding("question_mark", "keys", "keys"), Binding("d", "diff", "changes"),
         Binding("s", "save", "save as"), Binding("q", "quit", "quit")]

    def __init__(self, unit: Unit, system: str | None = None, result=None):
        """``result``: the unit's result in ``system``, where the caller has it already."""
        super().__init__(driver_class=keyboard_driver())
        self.original = unit
        self.unit = unit
        self.system = system or unit.system
        self.result = result if result is not None else analysis.analyse(unit, system=self.system)
        self.baseline = self.result
        self.message = "lower-case keys lower a value, capitals raise it; ? lists the keys"
        self.saved: Path | None = None
        self.kept = unit          # the unit as last saved (or as the file has it)

    def compose(self) -> ComposeResult:
        yield Header()
        yield Static(id="chart")
        yield Static(id="status")
        yield Footer()

    def on_mount(self) -> None:
        self.sub_title = self.unit.name
        self.redraw()

    def on_resize(self, event) -> None:
        # the new size reaches the widgets after this event: redraw once it has
        self.call_after_refresh(self.redraw)

    def status_lines(self, width: int) -> list[Text]:
        """The lines under the chart, each at most ``width`` columns."""
        r, system, atm = self.result, self.system, self.result.atmospheric_pressure
        s = r.stall
        lines: list[Text] = []
        if not s.occurs:
            lines.append(Text("stall point: none, it drains at every load", style="green"))
        elif s.load_fraction >= 1:
            lines.append(Text("stall point: stalled at every load", style="bold red"))
        else:
            lines.append(Text(f"stall point: below {words.percent(s.load_fraction)} load, coil at "
                              f"{display.show(s.coil_pressure, 'pressure', system, atm)}", style="bold"))
        dn = r.drainage
        verdict = Text(f"drainage: needs {dn.required}, has {dn.installed}: ")
        verdict.append("adequate" if dn.adequate else "NOT ADEQUATE", style="green" if dn.adequate else "bold red")
        lines.append(verdict)
        for row in (("lift", "return", "fill"), ("design", "cv", "minimum")):
            line = Text()
            for k in row:
                line.append(f"{KEYS[k]} ", style="bold")
                label = "Kv" if k == "cv" and self.unit.valve is not None and self.unit.valve.given_as == "kv" \
                    else LABELS[k]
                line.append(f"{label} {shown(value_of(self.unit, k), KNOBS[k][1], system, atm)}   ")
            line.rstrip()
            lines.append(line)
        # "drain.lift: 0.0 ft -> 1.0 ft" shortened to "lift 0.0 ft -> 1.0 ft"
        changes = [key.split(".")[-1] + " " + change
                   for key, change in (c.split(": ", 1) for c in differences(self.original, self.unit, system))]
        changes += compared(self.baseline, r, system)
        if changes:
            lines += [Text(t, style="yellow") for t in wrapped("was -> now: " + "; ".join(changes), width)]
        lines += [Text(t, style="dim") for t in wrapped(self.message, width)]
        for line in lines:
            line.truncate(width)
        return lines

    def redraw(self) -> None:
        width = max(min(self.size.width, 120) - 1, 40)
        status = self.status_lines(width)
        room = self.size.height - 2 - len(status)  # header and footer
        rows = max(room - 6, 4)
        for _ in range(3):  # the legend takes one line or two: fit the chart to the room left
            chart = terminal.chart_text(self.result, self.system, width=width, height=rows)
            over = len(chart.plain.splitlines()) - room
            if over <= 0 or rows <= 4:
                break
            rows = max(rows - over, 4)
        self.query_one("#chart", Static).update(chart)
        self.query_one("#status", Static).update(Text("\n").join(status))

    def action_nudge(self, knob: str, sign: int) -> None:
        try:
            unit = nudged(self.unit, knob, sign, self.system)
            result = analysis.analyse(unit, system=self.system)
        except StallcheckError as exc:
            self.message = f"not changed: {exc.message if isinstance(exc, InputError) else exc}"
        else:
            self.unit, self.result = unit, result
            key, kind, _ = KNOBS[knob]
            self.message = f"{key} now {shown(value_of(unit, knob), kind, self.system, result.atmospheric_pressure)}"
        self.redraw()

    def action_keys(self) -> None:
        self.push_screen(TextScreen(HELP))

    def action_diff(self) -> None:
        inputs = differences(self.original, self.unit, self.system)
        lines = (["Changes from the file", ""] + inputs + ["", "Results, was -> now", ""]
                 + (compared(self.baseline, self.result, self.system) or ["no result changed"])
                 if inputs else ["No changes from the file."])
        self.push_screen(TextScreen("\n".join(lines)))

    async def action_quit(self) -> None:
        """Quit, asking first where there are changes not saved."""
        if self.unit == self.kept:
            self.exit()
            return
        self.push_screen(AskScreen("The changes are not saved. Quit anyway? (yes/no)", "no"),
                         lambda yes: self.exit() if (yes or "").strip().lower() in ("y", "yes")
                         else self._say("not quit: s saves the changes"))

    def action_save(self) -> None:
        source = Path(self.original.source)
        default = source.with_name(source.stem + "-variant.toml")

        def chosen(answer: str | None) -> None:
            if not answer:
                return
            path = Path(answer)
            if path.exists():
                self.push_screen(AskScreen(f"{path} exists. Replace it? (yes/no)", "no"),
                                 lambda yes: self._write(path) if (yes or "").strip().lower() in ("y", "yes")
                                 else self._say("not saved"))
            else:
                self._write(path)

        self.push_screen(AskScreen("Save the changed unit as:", str(default)), chosen)

    def _write(self, path: Path) -> None:
        try:
            atomic.write_new(path, self._text(path.parent), "save", force=True, inputs=(self.original.source,))
        except InputError as exc:
            self._say(f"not saved: {exc}")
            return
        self.saved = path
        self.kept = self.unit
        self._say(f"saved {path}")

    def _text(self, folder: Path) -> str:
        """The user's file with only the changed values rewritten; a unit with no file
        behind it (or one that cannot be read now) is written whole. ``folder``: where
        it is saved (a weather file is named from there)."""
        from stallcheck.files import unitfile

        try:
            text = unitfile.read_text(self.original.source)
        except InputError:
            return unitwriter.dumps(self.unit, self.system, folder)
        return unitwriter.edit(text, self.original, self.unit, self.system, folder)

    def _say(self, message: str) -> None:
        self.message = message
        self.redraw()
