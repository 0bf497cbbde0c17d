"""Command line: parse options, call the core, hand the result to a presenter.

No physics here. The core (and with it CoolProp and pint) is imported inside the
commands that need it, so ``stallcheck --help`` starts fast. The annotations here are
evaluated when the module loads (no ``from __future__ import annotations``): typer
reads every command's signature on each run, and evaluating them as strings would cost
about 5 ms of every command's start.
"""

import sys
from enum import Enum
from pathlib import Path
from typing import Optional

import typer

from stallcheck import __version__
from stallcheck.errors import InputError, StallcheckError, printable

app = typer.Typer(
    name="stallcheck",
    help=("Will a steam coil on a modulating valve drain its condensate at every load? "
          "Reads a TOML unit file and reports the stall point, the drainage it needs, "
          "the control valve figures and a stall chart. A screening aid: local codes, "
          "makers' data and licensed practice govern."),
    no_args_is_help=True,
    add_completion=False,
    pretty_exceptions_enable=False,
    rich_markup_mode=None,
)


class Units(str, Enum):
    si = "si"
    us = "us"


class Method(str, Enum):
    ntu = "ntu"
    mean_temperature = "mean-temperature"


class XAxis(str, Enum):
    load = "load"
    inlet = "inlet"


UNIT_ARG = typer.Argument(..., help="Unit file (TOML, format 1).", show_default=False, metavar="UNIT.toml")
UNITS_OPT = typer.Option(None, "--units", help="Display units: si or us. Default: those the file is written in.")
METHOD_OPT = typer.Option(None, "--method", help="Heat-transfer method, overriding the file's.")
JSON_OPT = typer.Option(False, "--json", help="Print the result contract as JSON (SI units) and nothing else.")
WIDTH_OPT = typer.Option(None, "--width", min=60, max=250,
                         help="Columns to print in (60 to 250). Default: the terminal's, at most 100.")


def _say(message: str) -> None:
    """One line to stderr, its outside text made printable (:func:`errors.printable`)."""
    typer.echo(printable(message), err=True)


def _fail(message: str) -> None:
    _say(f"stallcheck: {message}")
    raise typer.Exit(2)


def _run(path: Path, units: Optional[Units], method: Optional[Method], warn: bool = True):
    """Load and analyse a unit; input errors become one message and exit 2."""
    return _load(path, units, method, warn)[1]


def _load(path: Path, units: Optional[Units], method: Optional[Method], warn: bool = True):
    """The unit and its result (see :func:`_run`); the file's input warnings go to
    stderr unless ``warn`` is false (``check`` prints them in its report)."""
    from stallcheck import api

    try:
        unit = api.read_unit(path)
        result = api.analyse(unit, units=units.value if units else None, method=method.value if method else None)
    except InputError as exc:
        _fail(str(exc if exc.file else exc.in_file(str(path))))
    except StallcheckError as exc:
        _fail(f"{path}: {exc}")
    if warn:
        for warning in result.warnings:
            _say(f"stallcheck: {result.source}: {warning}")
    return unit, result


def _show_check(result, as_json: bool, width: Optional[int] = None) -> None:
    if as_json:
        from stallcheck.render import json as json_out

        sys.stdout.write(json_out.dumps(result) + "\n")
        for warning in result.warnings:
            _say(f"stallcheck: {result.source}: {warning}")
    else:
        from stallcheck.render import page, terminal

        columns = page.width_for(sys.stdout, width)
        page.emit(terminal.report(result, result.system, width=columns), columns)
    raise typer.Exit(result.exit_status)


@app.command()
def check(unit: Path = UNIT_ARG, units: Optional[Units] = UNITS_OPT,
          method: Optional[Method] = METHOD_OPT, json: bool = JSON_OPT, width: Optional[int] = WIDTH_OPT) -> None:
    """Analyse one unit: stall point, drainage verdict, valve, findings and the stall chart.

    Exit status 0: drains at every load it runs at, nothing at warning or above;
    1: drainage not adequate or a warning; 2: bad input.
    """
    _show_check(_run(unit, units, method, warn=False), json, width)


@app.command()
def chart(unit: Path = UNIT_ARG, units: Optional[Units] = UNITS_OPT,
          method: Optional[Method] = METHOD_OPT,
          x: Optional[XAxis] = typer.Option(None, "--x", help="x axis: load (%) or inlet (entering "
                                            "temperature). Default: inlet where the load follows it."),
          width: Optional[int] = WIDTH_OPT,
          csv: Optional[Path] = typer.Option(None, "--csv", metavar="OUT.csv",
                                             help="Also write the chart's points (101 loads, display units) "
                                                  "to this CSV file."),
          force: bool = typer.Option(False, "--force", help="Let --csv replace an existing file.")) -> None:
    """Print the stall chart alone (--csv also writes its points for a spreadsheet)."""
    from stallcheck.render import terminal

    if csv is not None:
        from stallcheck.files import atomic

        try:
            atomic.check_target(csv, "--csv", force, inputs=(unit,))
        except InputError as exc:
            _fail(str(exc))
    result = _run(unit, units, method)
    if x is not None and x.value == "inlet" and result.varies != "inlet-temperature":
        _fail(f"{unit}, option '--x': inlet needs a unit whose load follows its entering temperature "
              f"(load.varies = \"inlet-temperature\"); this one's load varies with {result.varies}. Accepted "
              f"here: load.")
    axis = x.value if x else ("inlet" if result.varies == "inlet-temperature" else "load")
    from stallcheck.render import page

    columns = page.width_for(sys.stdout, width)
    page.emit([terminal.chart_block(result, result.system, width=columns - 2, x_axis=axis),
               *terminal.line_summary(result)], columns)
    if csv is not None:
        from stallcheck.files import atomic
        from stallcheck.render import chart as chartmod

        try:
            atomic.write_new(csv, chartmod.points_csv(result, result.system), "--csv", force, inputs=(unit,))
        except InputError as exc:
            _fail(str(exc))
    raise typer.Exit(result.exit_status)


@app.command()
def demo(units: Optional[Units] = UNITS_OPT, json: bool = JSON_OPT, width: Optional[int] = WIDTH_OPT) -> None:
    """Analyse the example unit shipped with stallcheck (an invented air preheat coil)."""
    from importlib.resources import as_file, files

    with as_file(files("stallcheck") / "data" / "demo.toml") as path:
        result = _run(path, units, None)
    _show_check(result, json, width)


@app.command()
def report(unit: Path = UNIT_ARG,
           output: Path = typer.Option(..., "-o", "--output", help="The Markdown report to write.",
                                       metavar="FILE.md"),
           svg: Optional[Path] = typer.Option(None, "--svg", help="Also draw the stall chart as SVG.",
                                              metavar="FILE.svg"),
           png: Optional[Path] = typer.Option(None, "--png", help="Also draw the stall chart as PNG.",
                                              metavar="FILE.png"),
           force: bool = typer.Option(False, "--force", help="Replace files that exist."),
           units: Optional[Units] = UNITS_OPT, method: Optional[Method] = METHOD_OPT) -> None:
    """Write a Markdown report for a design file or a work order: the unit, the method,
    the stall point, the chart, the verdict, valve and drain figures, findings and
    cautions. --svg/--png draw the chart (needs the plot extra: matplotlib).

    Exit status as for check; 2 where a file cannot be written.
    """
    import datetime

    from stallcheck.files import atomic
    from stallcheck.render import report as rep

    targets = [("--output", output)] + [(o, p) for o, p in (("--svg", svg), ("--png", png)) if p is not None]
    try:
        for option, path in targets:
            atomic.check_target(path, option, force, inputs=(unit,))
    except InputError as exc:
        _fail(str(exc))
    unit_obj, result = _load(unit, units, method)
    import os

    links = tuple(Path(os.path.relpath(p.resolve(), output.resolve().parent)).as_posix() for _, p in targets[1:])
    text = rep.markdown(unit_obj, result, result.system, __version__, datetime.date.today().isoformat(), links)
    try:
        pictures = [(o, p, rep.picture(result, result.system, o[2:])) for o, p in targets[1:]]
        for option, path, data in pictures:
            atomic.write_new(path, data, option, force, inputs=(unit,))
        atomic.write_new(output, text, "--output", force, inputs=(unit,))
    except rep.MissingExtra as exc:
        _fail(str(exc))
    except InputError as exc:
        _fail(str(exc))
    _say(f"wrote {output}" + "".join(f", {p}" for _, p in targets[1:]))
    raise typer.Exit(result.exit_status)


@app.command()
def new(file: Optional[Path] = typer.Argument(None, help="Where to write the unit file (asked at the end "
                                              "if not given).", show_default=False, metavar="[FILE.toml]")) -> None:
    """Build a unit file by answering questions: each answer is checked as you give it,
    the stall point and chart are shown at the end, and a commented unit file is
    written (never over an existing file without your say-so).
    """
    from rich.prompt import Confirm, Prompt

    from stallcheck import wizard
    from stallcheck.files import atomic
    from stallcheck.render import page, terminal, words

    err = terminal.console(stderr=True)
    try:
        system = Prompt.ask("Units for your answers", choices=["us", "si"], default="us", console=err)
        answers: dict = {}
        while True:
            try:
                _ask_all(answers, system, err)
            except InputError as exc:
                _fail(f"{exc.key}: {exc.message}")
            text = wizard.to_toml(answers)
            try:
                unit, result = _analyse_text(text)
            except InputError as exc:
                err.print(printable(f"  {exc.message}"), highlight=False, markup=False)
                answers.pop(exc.key, None)
                continue
            break
        out = terminal.console()
        verdict = words.stall_summary(result.stall)
        out.print(printable(f"{result.name}: {verdict}; needs {result.drainage.required}, has "
                            f"{result.drainage.installed} ({'adequate' if result.drainage.adequate else 'NOT adequate'})"),
                  highlight=False, markup=False)
        page.emit([terminal.chart_block(result, result.system, width=min(out.width, page.MAX_WIDTH) - 2)],
                  min(out.width, page.MAX_WIDTH))
        out.print("")
        out.print("The unit file will hold:", highlight=False, markup=False)
        for key, value in wizard.summary(answers):
            out.print(printable(f"  {key} = {value}"), highlight=False, markup=False)
        out.print("")
        path = file
        for _ in range(ASK_TRIES):
            if path is None:
                default = "".join(c if c.isalnum() else "_" for c in answers["unit.name"].lower()).strip("_")
                path = Path(Prompt.ask("Save the unit file as", default=f"{default or 'unit'}.toml", console=err))
            if path.exists() and not Confirm.ask(f"{path} exists. Replace it?", default=False, console=err):
                path = None
                continue
            try:
                atomic.write_new(path, text, "FILE", force=True)
            except InputError as exc:
                err.print(printable(f"  {exc}"), highlight=False, markup=False)
                if file is not None:
                    raise typer.Exit(2)
                path = None
                continue
            break
        else:
            _fail(f"no file name accepted in {ASK_TRIES} tries; nothing written.")
    except KeyboardInterrupt:
        typer.echo("\nstallcheck: stopped; nothing written.", err=True)
        raise typer.Exit(130)
    except EOFError:
        _fail("the answers ended before the unit was complete; nothing written.")
    _say(f"wrote {path}")


def _ask_all(answers: dict, system: str, err) -> None:
    """Ask every question not yet answered, each again until its answer is accepted."""
    from rich.prompt import Prompt

    from stallcheck import wizard

    skipped: set = set()
    order: list = [key for key in answers]  # what was answered, in order, for "back"
    refused: dict = {}   # refusals in a row, by question
    if not answers:
        err.print("[dim]Type 'back' to change the answer before.[/dim]")
    while True:
        pending = [x for x in wizard.asked(answers) if x.key not in answers and x.key not in skipped]
        if not pending:
            return
        x = pending[0]
        err.print(f"[dim]{x.key}: {x.explain}[/dim]")
        default = wizard.suggestion(x, system, answers)
        if x.choices:
            err.print(f"[dim]  one of: {', '.join(x.choices)}[/dim]")
        text = Prompt.ask(x.ask, default=default, console=err) if default else Prompt.ask(x.ask, default="", console=err,
                                                                                          show_default=False)
        if text.strip().lower() == "back":
            if order:
                last = order.pop()
                answers.pop(last, None)
                skipped.discard(last)
            continue
        try:
            value = wizard.accept(x, text, answers, system=system)
        except InputError as exc:
            err.print(printable(f"  {exc.message}"), highlight=False, markup=False)
            refused[x.key] = refused.get(x.key, 0) + 1
            if refused[x.key] >= ASK_TRIES:
                raise InputError(x.key, f"no answer accepted in {ASK_TRIES} tries; nothing written.") from None
            continue
        refused.pop(x.key, None)
        order.append(x.key)
        if value is None:
            skipped.add(x.key)
        else:
            answers[x.key] = value


def _analyse_text(text: str):
    """The unit a wizard wrote, validated and analysed (InputError names the key)."""
    from stallcheck import analysis
    from stallcheck.files import unitfile

    unit = unitfile.parse(text, "the new unit")
    return unit, analysis.analyse(unit)


@app.command()
def explore(unit: Path = UNIT_ARG, units: Optional[Units] = UNITS_OPT) -> None:
    """Explore what-ifs on a live stall chart: keys nudge the lift (l/L), return pressure
    (r/R), fill head (f/F), design steam pressure (p/P), valve Cv (c/C) and minimum load
    (m/M); ? lists the keys, d shows the changes, s saves them as a new unit file, q quits
    (asking first where changes are not saved). Needs an interactive terminal.
    """
    if not (sys.stdin.isatty() and sys.stdout.isatty()):
        _fail("explore needs an interactive terminal (its keys are read from one); for a file or a pipe "
              "use `stallcheck check` or `stallcheck chart`.")
    unit_obj, result = _load(unit, units, None)
    from stallcheck import tui

    tui.Explorer(unit_obj, units.value if units else None, result).run()


#: Show a progress bar on stderr above this many units.
PROGRESS_FROM = 300


@app.command()
def survey(paths: list[Path] = typer.Argument(..., help="Unit files, folders of them (searched recursively) "
                                              "and CSV tables of units.", show_default=False, metavar="PATH..."),
           units: Optional[Units] = UNITS_OPT, method: Optional[Method] = METHOD_OPT,
           json: bool = typer.Option(False, "--json", help="Print JSON Lines, one a unit as it is done: the "
                                     "check --json fields (without the chart's points), then the errors and "
                                     "an end line; nothing else."),
           points: bool = typer.Option(False, "--points", help="With --json: include each unit's chart points."),
           words: bool = typer.Option(False, "--words", help="With --json: include the sentences (findings' "
                                      "messages, reasons, notes, assumptions, cautions) as check --json has them."),
           csv: Optional[Path] = typer.Option(None, "--csv", help="Also write the survey table to this CSV file.",
                                              metavar="OUT.csv"),
           force: bool = typer.Option(False, "--force", help="Let --csv replace an existing file."),
           width: Optional[int] = WIDTH_OPT,
           jobs: Optional[int] = typer.Option(None, "--jobs", min=1, max=64,
                                              help="Processes to survey in (1 to 64). Default: one per processor "
                                                   "from 2,000 units up (--json: 1).")) -> None:
    """Survey many units: one line each, worst first.

    Exit status 2 where any unit could not be read, else 1 where any is not adequate or
    has a warning, else 0.
    """
    from stallcheck.analysis import survey as surveymod
    from stallcheck.files import atomic

    found = surveymod.sources(paths)
    if not found:
        _fail("no unit files (.toml) or CSV tables (.csv) in " + ", ".join(str(p) for p in paths))
    if csv is not None:
        try:
            atomic.check_target(csv, "--csv", force, inputs=found)
        except InputError as exc:
            _fail(str(exc))
    system = units.value if units else None
    method_ = method.value if method else None
    stream = None
    if json:
        from stallcheck.render.survey import JsonStream

        stream = JsonStream(sys.stdout, points=points, words=words)
    # the number of units sizes the progress bar and decides the processes
    total = surveymod.count(found) if sys.stderr.isatty() or (jobs is None and not json) else 0
    progress = None
    if sys.stderr.isatty() and total > PROGRESS_FROM:
        from rich.progress import Progress

        from stallcheck.render import terminal

        # Redrawn as each batch is done, not by a thread of its own: the survey's
        # worker processes are forked from this one, which is safe without threads.
        progress = Progress(console=terminal.console(stderr=True), transient=True, auto_refresh=False)
        task = progress.add_task("surveying", total=total)
        progress.start()

    def advance(k: int) -> None:
        progress.advance(task, k)
        progress.refresh()

    try:
        summaries, failures = surveymod.run(
            found, system=system, method=method_, each=stream, advance=advance if progress else None,
            jobs=1 if json else surveymod.jobs_for(total, jobs), searched=True, points=points)
    except StallcheckError as exc:
        _fail(str(exc))
    finally:
        if progress is not None:
            progress.stop()
    status = surveymod.exit_status(summaries, failures)
    if stream is not None:
        stream.close(failures, status)
    else:
        from stallcheck.render import survey as show
        from stallcheck.render import terminal

        out = terminal.console(width=width)
        if out.is_terminal:
            out.print(show.table(summaries, failures, system, width=out.width))
        else:
            sys.stdout.write(show.plain(summaries, failures, system, width=out.width))
    for failure in failures:
        _say(f"stallcheck: {failure.message}")
    for summary in summaries:
        for warning in summary.warnings:
            _say(f"stallcheck: {summary.source}: {warning}")
    if csv is not None:
        from stallcheck.render import survey as show

        try:
            atomic.write_new(csv, show.csv_text(summaries, failures), "--csv", force, inputs=found)
        except InputError as exc:
            _fail(str(exc))
    raise typer.Exit(status)


#: What diagnose asks for, in order: (option, field, question).
QUESTIONS = (
    ("--coil-pressure", "coil_pressure", "Steam pressure read at the coil inlet (such as 3 psig, or 10 inHg vacuum), blank if not read"),
    ("--return-pressure", "return_pressure", "Return or receiver pressure (such as 0 psig), blank if not read"),
    ("--load", "load", "Present load as a fraction or % of design, blank if not known"),
    ("--inlet-temperature", "inlet_temperature", "Entering temperature now (such as 35 degF), blank if not read"),
    ("--outlet-temperature", "outlet_temperature", "Leaving temperature reached (such as 48 degF), blank if not read"),
    ("--noise", "noise", "When does it bang? start-up, low-load, mild-weather, valve-opens, all-the-time, none "
                         "(comma-separated)"),
    ("--trap-outlet", "trap_outlet", "What does the trap outlet look like? cold, hot-passing, blowing-steam "
                                     "(blank if not looked at)"),
)


def _ask_missing(unit, given: dict) -> dict:
    """Ask for each reading not given, again after a bad answer (rich prompts on stderr)."""
    from rich.prompt import Prompt

    from stallcheck.files import readings
    from stallcheck.render import terminal

    err = terminal.console(stderr=True)
    answers = dict(given)
    for option, field, question in QUESTIONS:
        if answers.get(field) is not None:
            continue
        for _ in range(ASK_TRIES):
            try:
                text = Prompt.ask(question, console=err, default="", show_default=False)
            except (EOFError, KeyboardInterrupt):
                _fail(f"{option}: stopped with no answer (end of input); nothing was diagnosed.")
            try:
                readings.parse(unit, **{field: text or None})
            except InputError as exc:
                err.print(printable(f"  {exc.message}"), highlight=False, markup=False)
                continue
            answers[field] = text or None
            break
        else:
            _fail(f"{option}: no answer accepted in {ASK_TRIES} tries; nothing was diagnosed.")
    return answers


#: Answers refused in a row before a question gives up (exit 2): a script feeding the
#: same bad answer must not loop forever.
ASK_TRIES = 5


@app.command()
def diagnose(unit: Path = UNIT_ARG,
             coil_pressure: Optional[str] = typer.Option(None, "--coil-pressure", help="Gauge at the coil inlet, "
                                                         "such as '3 psig', '-0.3 barg' or '10 inHg vacuum'."),
             return_pressure: Optional[str] = typer.Option(None, "--return-pressure",
                                                           help="Return or receiver pressure."),
             load: Optional[str] = typer.Option(None, "--load", help="Present load: 0.4 or '40 %'."),
             inlet_temperature: Optional[str] = typer.Option(None, "--inlet-temperature",
                                                             help="Entering temperature now."),
             outlet_temperature: Optional[str] = typer.Option(None, "--outlet-temperature",
                                                              help="Leaving temperature reached."),
             noise: Optional[str] = typer.Option(None, "--noise", help="When it bangs: start-up, low-load, "
                                                 "mild-weather, valve-opens, all-the-time, none (comma-separated)."),
             trap_outlet: Optional[str] = typer.Option(None, "--trap-outlet", help="cold, hot-passing or "
                                                       "blowing-steam."),
             ask: Optional[bool] = typer.Option(None, "--ask/--no-ask", help="Ask for readings not given. "
                                                "Default: ask when input is a terminal."),
             units: Optional[Units] = UNITS_OPT, json: bool = JSON_OPT,
             width: Optional[int] = WIDTH_OPT) -> None:
    """Diagnose a unit in service from gauge readings and symptoms: the operating point,
    whether it is stalled now, and the likely causes ranked with how to confirm each.

    Exit status as for check, and 1 where the unit is stalled now; 2: bad input.
    """
    from stallcheck.analysis import diagnosis
    from stallcheck.files import readings

    unit_obj, result = _load(unit, units, None)
    given = dict(coil_pressure=coil_pressure, return_pressure=return_pressure, load=load,
                 inlet_temperature=inlet_temperature, outlet_temperature=outlet_temperature, noise=noise,
                 trap_outlet=trap_outlet)
    if ask is None:
        ask = sys.stdin.isatty() and not json
    try:
        if ask:
            given = _ask_missing(unit_obj, given)
        found = diagnosis.diagnose(unit_obj, result, readings.parse(unit_obj, **given))
    except InputError as exc:
        _fail(str(exc if exc.file else exc.in_file(str(unit))))
    from stallcheck.render import diagnosis as show

    if json:
        sys.stdout.write(show.dumps(found) + "\n")
    else:
        from stallcheck.render import page

        columns = page.width_for(sys.stdout, width)
        page.emit(show.report(found, result.system, columns), columns)
    raise typer.Exit(found.exit_status)


def _version(value: bool) -> None:
    if value:
        typer.echo(f"stallcheck {__version__}")
        raise typer.Exit()


@app.callback()
def _main(version: bool = typer.Option(False, "--version", callback=_version, is_eager=True,
                                       help="Print the version and exit.")) -> None:
    """stallcheck"""


def main() -> None:
    """Console-script entry point."""
    app()
