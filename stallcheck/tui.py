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
from stallcheck.inputs import Unit
from stallcheck.render import terminal

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
    """The present value of a knob (SI; the Cv as a number; None where the unit has no valve)."""
    return {"lift": unit.drain.lift, "return": unit.drain.return_pressure, "fill": unit.drain.fill_head,
            "design": unit.design.steam_pressure, "cv": unit.valve.cv if unit.valve else None,
            "minimum": unit.load.minimum}[knob]


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
        return f"{value:.3g}"
    if kind == "fraction":
        return f"{value:.0%}"
    return q.show(value, kind, system, atm)


def differences(original: Unit, unit: Unit, system: str) -> list[str]:
    """Each knob that differs from the original: ``key: old -> new``."""
    atm = unit.site.atmospheric_pressure
    out = []
    for knob, (key, kind, _) in KNOBS.items():
        a, b = value_of(original, knob), value_of(unit, knob)
        if a != b:
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


class Explorer(App):
    """The what-if app for one unit."""

    TITLE = "stallcheck explore"
    CSS = """
    #chart { height: auto; }
    #status { height: auto; padding: 1 0 0 0; }
    #dialog, #page { border: round $accent; padding: 1 2; width: 80%; height: auto; margin: 4 8; }
    """
    BINDINGS = [
        Binding(key, f"nudge('{knob}', {sign})", f"{LABELS[knob]} {'+' if sign > 0 else '-'}", show=False)
        for knob, keys in KEYS.items() for key, sign in ((keys[0], -1), (keys[2], 1))
    ] + [Binding("d", "diff", "differences"), Binding("s", "save", "save as"), Binding("q", "quit", "quit")]

    def __init__(self, unit: Unit, system: str | None = None):
        super().__init__()
        self.original = unit
        self.unit = unit
        self.system = system or unit.system
        self.result = analysis.analyse(unit, system=self.system)
        self.message = "lower-case keys lower a value, capitals raise it"
        self.saved: Path | None = None

    def compose(self) -> ComposeResult:
        yield Header()
        yield Static(id="chart")
        yield Static(id="status")
        yield Footer()

    def on_mount(self) -> None:
        self.sub_title = self.unit.name
        self.redraw()

    def status_text(self) -> Text:
        r, system, atm = self.result, self.system, self.result.atmospheric_pressure
        s = r.stall
        lines = Text()
        if not s.occurs:
            lines.append("stall point: none, it drains at every load\n", style="green")
        elif s.load_fraction >= 1:
            lines.append("stall point: stalled at every load\n", style="bold red")
        else:
            lines.append(f"stall point: below {s.load_fraction:.0%} load, coil at "
                         f"{q.show(s.coil_pressure, 'pressure', system, atm)}\n", style="bold")
        dn = r.drainage
        lines.append(f"drainage: needs {dn.required}, has {dn.installed}: ")
        lines.append("adequate\n" if dn.adequate else "NOT ADEQUATE\n", style="green" if dn.adequate else "bold red")
        for row in (("lift", "return", "fill"), ("design", "cv", "minimum")):
            for k in row:
                lines.append(f"{KEYS[k]} ", style="bold")
                lines.append(f"{LABELS[k]} {shown(value_of(self.unit, k), KNOBS[k][1], system, atm)}   ")
            lines.append("\n")
        lines.append(self.message, style="dim")
        return lines

    def redraw(self) -> None:
        width = max(min(self.size.width, 100) - 2, 60)
        self.query_one("#chart", Static).update(terminal.chart_text(self.result, self.system, width=width))
        self.query_one("#status", Static).update(self.status_text())

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

    def action_diff(self) -> None:
        lines = differences(self.original, self.unit, self.system) or ["no changes from the original"]
        self.push_screen(TextScreen("Changes from the original\n\n" + "\n".join(lines)))

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
            atomic.write_new(path, self._text(), "save", force=True)
        except InputError as exc:
            self._say(f"not saved: {exc}")
            return
        self.saved = path
        self._say(f"saved {path}")

    def _text(self) -> str:
        """The user's file with only the changed values rewritten; a unit with no file
        behind it (or one that cannot be read now) is written whole."""
        from stallcheck.files import unitfile

        try:
            text = unitfile.read_text(self.original.source)
        except InputError:
            return unitwriter.dumps(self.unit, self.system)
        return unitwriter.edit(text, self.original, self.unit, self.system)

    def _say(self, message: str) -> None:
        self.message = message
        self.redraw()
