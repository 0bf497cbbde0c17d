"""The questions ``stallcheck new`` asks, how each answer is checked, and the commented
unit file written from the answers.

Nothing here prompts or prints: the command line asks each :class:`Question` in turn,
hands the answer to :func:`accept` (which raises :class:`InputError` with what is
accepted) and, at the end, writes :func:`to_toml`. An answer is checked on its own
(unit, range) and against earlier answers (a set point above the entering temperature,
a supply above the coil pressure) as it is given.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from typing import Callable

from stallcheck.errors import InputError
from stallcheck.files import keys
from stallcheck.files import quantities as q
from stallcheck.files.ranges import check_entering
from stallcheck.inputs import MEDIA


@dataclass(frozen=True)
class Question:
    """One value the unit needs.

    Attributes
    ----------
    key : str
        Dotted unit-file key.
    ask : str
        The question.
    explain : str
        One line on what it means (also the comment in the file).
    kind : str
        ``"text"``, ``"choice"``, ``"number"`` or a quantity kind (``"flow"``,
        ``"temperature"``, ``"pressure"``, ``"length"``, ``"fraction"``).
    example : dict
        Example answer by unit system (``"us"``, ``"si"``), shown as the default.
    choices : tuple
    optional : bool
        A blank answer leaves the key out.
    when : callable
        Asked only where this returns True for the answers so far.
    """

    key: str
    ask: str
    explain: str
    kind: str
    example: dict = field(default_factory=dict)
    choices: tuple = ()
    optional: bool = False
    when: Callable[[dict], bool] = lambda answers: True


def _help(key: str) -> str:
    """A key's line in the key table: the question's explanation and the file's comment."""
    return keys.BY_NAME[key].help


QUESTIONS = (
    Question("unit.name", "Name of the unit", _help("unit.name"), "text",
             {"us": "", "si": ""}),
    Question("unit.tag", "Equipment tag (blank for none)", _help("unit.tag"), "text", optional=True),
    Question("site.elevation", "Site elevation above sea level (blank for sea level)", _help("site.elevation"),
             "elevation", optional=True),
    Question("design.medium", "What does it heat?", _help("design.medium"), "choice",
             {"us": "air", "si": "air"}, choices=MEDIA),
    Question("design.concentration", "Glycol concentration (mass %)", _help("design.concentration"),
             "fraction", {"us": "30 %", "si": "30 %"},
             when=lambda a: str(a.get("design.medium", "")).endswith("glycol")),
    Question("design.flow", "Design flow", _help("design.flow"),
             "flow", {"us": "6000 cfm", "si": "10000 m3/h"}),
    Question("design.inlet_temperature", "Entering temperature at full load", _help("design.inlet_temperature"),
             "temperature", {"us": "0 degF", "si": "-18 degC"}),
    Question("design.outlet_temperature", "Leaving temperature (the set point)", _help("design.outlet_temperature"),
             "temperature", {"us": "55 degF", "si": "13 degC"}),
    Question("design.steam_pressure", "Steam pressure in the coil at full load (gauge)",
             _help("design.steam_pressure"), "pressure", {"us": "5 psig", "si": "0.35 barg"}),
    Question("steam.supply_pressure", "Steam pressure ahead of the control valve (gauge)",
             _help("steam.supply_pressure"), "pressure", {"us": "15 psig", "si": "1 barg"}),
    Question("valve.cv", "Control valve Cv or Kv (a plain number is Cv, \"Kv 12\" a Kv; blank if not known)",
             _help("valve.cv"), "coefficient",
             optional=True),
    Question("valve.characteristic", "Valve characteristic", _help("valve.characteristic"), "choice",
             {"us": "equal-percentage", "si": "equal-percentage"},
             choices=keys.BY_NAME["valve.characteristic"].choices,
             when=lambda a: "valve.cv" in a),
    Question("load.minimum", "Lowest load it runs at, as a fraction (0 to below 1)", _help("load.minimum"),
             "number",
             {"us": "0", "si": "0"}),
    Question("drain.arrangement", "What drains it now?", _help("drain.arrangement"), "choice",
             {"us": "trap", "si": "trap"}, choices=keys.BY_NAME["drain.arrangement"].choices),
    Question("drain.trap", "Trap type", _help("drain.trap"), "choice",
             {"us": "float-thermostatic", "si": "float-thermostatic"}, choices=keys.BY_NAME["drain.trap"].choices),
    Question("drain.fill_head", "Height from the coil outlet down to the trap inlet", _help("drain.fill_head"),
             "length", {"us": "12 in", "si": "0.3 m"}),
    Question("drain.lift", "Rise in the discharge after the trap (0 if none)", _help("drain.lift"),
             "length", {"us": "0 ft", "si": "0 m"}),
    Question("drain.return_pressure", "Pressure in the return or receiver (gauge)", _help("drain.return_pressure"),
             "pressure", {"us": "0 psig", "si": "0 barg"}),
)


def asked(answers: dict) -> list[Question]:
    """The questions that apply given the answers so far."""
    return [x for x in QUESTIONS if x.when(answers)]


#: Choices as engineers type them (compared without case), and the unit-file word.
CHOICE_WORDS = {
    "f&t": "float-thermostatic", "ft": "float-thermostatic", "f & t": "float-thermostatic",
    "float and thermostatic": "float-thermostatic", "float thermostatic": "float-thermostatic",
    "ib": "inverted-bucket", "inverted bucket": "inverted-bucket", "td": "thermodynamic", "disc": "thermodynamic",
    "equal percentage": "equal-percentage", "eq%": "equal-percentage", "=%": "equal-percentage",
    "vacuum breaker": "trap-vacuum-breaker", "trap and vacuum breaker": "trap-vacuum-breaker",
    "pump trap": "pump-trap", "constant purge": "constant-purge", "purge": "constant-purge",
    "pg": "propylene-glycol", "propylene glycol": "propylene-glycol", "eg": "ethylene-glycol",
    "ethylene glycol": "ethylene-glycol",
}
#: Question kinds whose answers carry a unit (spelled by :func:`quantities.typed_unit`).
UNIT_KINDS = {"temperature", "flow", "pressure", "length", "elevation", "fraction"}
_TYPED = re.compile(r"^\s*([-+]?(?:\d{1,3}(?:,\d{3})+|\d+)?(?:\.\d+)?(?:[eE][-+]?\d+)?)\s*(.*?)\s*$")
#: A flow coefficient as typed: "12", "Cv 12", "12 Cv", "Kv 10.4", "10.4 kv".
_COEFFICIENT = re.compile(r"^\s*(cv|kv)?\s*=?\s*((?:\d{1,3}(?:,\d{3})+|\d+)(?:\.\d*)?|\.\d+)\s*(cv|kv)?\s*$", re.I)


class Kv(float):
    """A valve coefficient answered as Kv [m³/h at 1 bar]: written as ``kv`` in the file."""


def typed(question: Question, text: str) -> str:
    """An answer as an engineer types it, in the unit file's spelling: choices without
    regard to case or with the trade's abbreviations (``F&T``, ``Air``), numbers with
    thousands separators (``12,000 cfm``), units glued on or in capitals (``15C``,
    ``0 deg F``, ``12000 CFM``), a percentage for a fraction (``10%``). Text it does not
    recognise is returned as given, for :func:`accept` to refuse with what is accepted."""
    text = (text or "").strip()
    if question.kind == "choice":
        low = text.lower()
        if low in question.choices:
            return low
        word = CHOICE_WORDS.get(low, "-".join(low.replace("_", " ").split()))   # "trap vacuum breaker"
        return word if word in question.choices else text
    if question.kind == "number" and text.endswith("%"):
        try:
            return f"{float(text[:-1].strip().replace(',', '')) / 100.0:g}"
        except ValueError:
            return text
    if question.kind == "coefficient":
        match = _COEFFICIENT.match(text)
        if not match or (match.group(1) and match.group(3)):
            return text
        kind = (match.group(1) or match.group(3) or "cv").lower()
        return f"{kind} {match.group(2).replace(',', '')}"
    match = _TYPED.match(text)
    if question.kind not in UNIT_KINDS or not match or not match.group(1) or match.group(1) in "+-":
        return text
    number, unit = match.group(1).replace(",", ""), match.group(2)
    if unit.lower() == "percent":
        unit = "%"
    return f"{number} {q.typed_unit(unit)}"


#: The defaults offered for a liquid (water or glycol) instead of the air coil's: a
#: heating-water converter (invented figures of the usual size).
LIQUID_EXAMPLES = {
    "design.flow": {"us": "90 gpm", "si": "20 m3/h"},
    "design.inlet_temperature": {"us": "160 degF", "si": "70 degC"},
    "design.outlet_temperature": {"us": "180 degF", "si": "82 degC"},
}


def suggestion(question: Question, system: str, answers: dict) -> str | None:
    """The default offered for a question: its example in the chosen units, moved to
    follow earlier answers where it would contradict them (a supply above the coil
    pressure given, a set point above the entering temperature given)."""
    example = question.example.get(system) or None
    if answers.get("design.medium", "air") != "air" and question.key in LIQUID_EXAMPLES:
        example = LIQUID_EXAMPLES[question.key][system]   # a water or glycol heater, not an air coil
    if question.key == "steam.supply_pressure" and "design.steam_pressure" in answers:
        match = _TYPED.match(str(answers["design.steam_pressure"]))
        step = {"psig": 10.0, "psia": 10.0, "barg": 0.7, "bara": 0.7, "bar(g)": 0.7, "bar(a)": 0.7,
                "kPag": 70.0, "kPaa": 70.0, "kPa(g)": 70.0, "kPa(abs)": 70.0, "kPa(a)": 70.0}
        if match and match.group(2) in step:
            return f"{float(match.group(1)) + step[match.group(2)]:g} {match.group(2)}"
    if question.key == "design.outlet_temperature" and "design.inlet_temperature" in answers:
        match = _TYPED.match(str(answers["design.inlet_temperature"]))
        rise = {"degF": 55.0, "degC": 30.0, "K": 30.0}
        if match and match.group(2) in rise and example is not None:
            t_in = q.temperature(question.key, answers["design.inlet_temperature"])
            if q.temperature(question.key, example) <= t_in:
                return f"{float(match.group(1)) + rise[match.group(2)]:g} {match.group(2)}"
    return example


def accept(question: Question, text: str, answers: dict, atmospheric: float = q.STANDARD_ATMOSPHERE,
           system: str = "us"):
    """Check one answer; return the value to write (a string or a number), or None for a
    blank optional answer. The answer is first put in the unit file's spelling
    (:func:`typed`), and that spelling is what the file gets.

    Raises
    ------
    InputError
        Naming the key and what is accepted.
    """
    if question.kind == "length" and (text or "").strip() in ("0", "0.0"):
        text = f"0 {question.example[system].split()[-1]}"   # "0 if none": no unit needed for nothing
    text = typed(question, text)
    key = question.key
    if not text:
        if question.optional:
            return None
        raise InputError(key, "needs an answer" + (f", such as \"{question.example.get(system)}\"."
                                                    if question.example.get(system) else "."))
    kind = question.kind
    if kind == "text":
        return text
    if kind == "choice":
        if text not in question.choices:
            raise InputError(key, f"'{text}' is not one of: {', '.join(question.choices)}.")
        return text
    if kind == "coefficient":
        name, _, number = text.partition(" ")
        try:
            if name not in ("cv", "kv"):
                raise ValueError(name)
            value = float(number)
        except ValueError:
            raise InputError(key, f"'{text}' is not a flow coefficient; accepted: a number (Cv), such as 12, or "
                                  f"\"Kv 10.4\".") from None
        keys.check_number(f"valve.{name}", value)   # the range a unit file holds it to
        return Kv(value) if name == "kv" else value
    if kind == "number":
        try:
            value = float(text)
        except ValueError:
            raise InputError(key, f"takes a plain number {keys.accepted(key)}.") from None
        return keys.check_number(key, value)
    if kind == "fraction":
        keys.check_measured(key, q.fraction(key, text), text)   # the range a unit file holds it to
        return text
    if kind == "flow":
        keys.check_measured(key, q.flow(key, text).value, text)
        return text
    if kind == "temperature":
        t = q.temperature(key, text)
        if key == "design.outlet_temperature" and "design.inlet_temperature" in answers:
            t_in = q.temperature(key, answers["design.inlet_temperature"])
            if t <= t_in:
                raise InputError(key, f"must be above the entering temperature ({answers['design.inlet_temperature']}).")
        if key == "design.inlet_temperature":   # as a unit file holds it (a glycol's, at the end, by its data)
            check_entering(key, t, text, answers.get("design.medium", "air"))
        return text
    if kind == "pressure":
        p = keys.check_measured(key, q.pressure(key, text).absolute(atmospheric), text)  # as a unit file holds it
        if key == "steam.supply_pressure" and "design.steam_pressure" in answers:
            coil = q.pressure(key, answers["design.steam_pressure"]).absolute(atmospheric)
            if p <= coil:
                raise InputError(key, f"must be above the coil pressure ({answers['design.steam_pressure']}).")
        return text
    if kind in ("elevation", "length"):   # (a bare 0 length is typed as 0 in the example's unit)
        keys.check_measured(key, q.length(key, text), text)   # the range a unit file holds it to
        return text
    raise ValueError(f"unknown question kind {kind}")


def summary(answers: dict) -> list[tuple[str, str]]:
    """Every answer as the file will have it: (key, value), in the order asked."""
    out = []
    for x in QUESTIONS:
        if x.key in answers:
            value = answers[x.key]
            key = "valve.kv" if isinstance(value, Kv) else x.key
            out.append((key, f"{value:g}" if isinstance(value, float) else str(value)))
    return out


def to_toml(answers: dict) -> str:
    """A commented unit file (format 1) from the answers, written through the TOML
    library (tomlkit: every text escaped as TOML requires), each value commented with
    its line from the key table."""
    import tomlkit

    doc = tomlkit.document()
    doc.add(tomlkit.comment("Unit file written by stallcheck new. Each value is commented with what it means;"))
    doc.add(tomlkit.comment("stallcheck's reference (docs/reference.md) lists every key the format accepts."))
    doc["format"] = 1
    tables: dict = {}
    for x in QUESTIONS:
        if x.key not in answers:
            continue
        part, name = x.key.split(".")
        value = answers[x.key]
        explain = x.explain
        if isinstance(value, Kv):
            name, explain = "kv", keys.BY_NAME["valve.kv"].help
        item = tomlkit.item(float(value) if isinstance(value, float) else str(value))
        item.comment(explain)
        item.trivia.comment_ws = " " * max(2, 40 - len(f"{name} = {item.as_string()}"))   # comments in a column
        tables.setdefault(part, tomlkit.table())[name] = item
    for part, table in tables.items():
        doc[part] = table
    return tomlkit.dumps(doc)
