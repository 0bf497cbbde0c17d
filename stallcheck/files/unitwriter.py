"""A unit back to unit-file text (format 1): for files saved from ``stallcheck explore``.

Values are written in the unit's own system (US or SI) to nine significant figures,
pressures as gauge, so the file reads as a person would have written it and reads back
to the same unit within about 1e-8.
"""

from __future__ import annotations

import dataclasses
import math
import os
from pathlib import Path

from stallcheck.files import quantities as q

from stallcheck.files import display, keys
from stallcheck.files.unitfile import MONTHS
from stallcheck.inputs import Unit

#: Units written, by system: (pressure, differential, temperature, length, mass flow,
#: diameter, mass).
_UNITS = {
    "us": {"pressure": ("psi", "psig"), "differential": "psi", "temperature": "degF", "length": "ft",
           "mass_flow": "lb/h", "diameter": "in", "mass": "lb"},
    "si": {"pressure": ("bar", "barg"), "differential": "kPa", "temperature": "degC", "length": "m",
           "mass_flow": "kg/h", "diameter": "mm", "mass": "kg"},
}
_SI = {"pressure": "Pa", "differential": "Pa", "temperature": "K", "length": "m", "mass_flow": "kg/s",
       "diameter": "m", "mass": "kg"}


def _g(x: float) -> str:
    return f"{0.0 if abs(x) < 1e-9 else x:.9g}"


def dumps(unit: Unit, system: str | None = None, folder: str | Path | None = None) -> str:
    """The unit as TOML text, written through the TOML library (tomlkit: every text
    escaped as TOML requires).

    Parameters
    ----------
    unit : Unit
    system : str, optional
        ``"us"`` or ``"si"``; default the unit's own.
    folder : str or Path, optional
        Where the text will be written: a weather file is named relative to it
        (default: by its absolute path).
    """
    import tomlkit

    system = system or unit.system
    names = _UNITS[system]
    atm = unit.site.atmospheric_pressure

    def val(value: float, kind: str) -> str:
        if kind == "pressure":
            unit_name, spelled = names["pressure"]
            return f"{_g(display.express(value - atm, 'Pa', unit_name))} {spelled}"
        return f"{_g(display.express(value, _SI[kind], names[kind]))} {names[kind]}"

    def number(x: float):
        return float(_g(x))

    def plain(section: str, record, special: dict) -> dict:
        """A section's keys in the key table's order: those its own code writes
        (``special``), and its plain keys from the record's field of each name."""
        out: dict = {}
        for row in keys.KEYS:
            if row.section != section:
                continue
            if row.name in special:
                out[row.name] = special[row.name]
            elif row.plain and record is not None:
                value = getattr(record, row.name)
                if value is not None and not (row.kind in ("words", "quantity") and value == _default(record, row.name)):
                    out[row.name] = _plain(row, value, val, number)
        return out

    d, dr, ld = unit.design, unit.drain, unit.load
    doc = tomlkit.document()
    doc["format"] = 1
    doc["unit"] = {"name": unit.name, **({"tag": unit.tag} if unit.tag else {})}
    site: dict = {}
    if unit.site.elevation is not None:
        site["elevation"] = val(unit.site.elevation, "length")
    elif abs(atm - q.STANDARD_ATMOSPHERE) > 1e-6:
        site["atmospheric_pressure"] = f"{_g(display.express(atm, 'Pa', 'kPa'))} kPaa"
    if unit.site.weather is not None:
        site["weather"] = weather_path(unit, folder)
    if unit.site.steam_price is not None:
        site.update(steam_price=number(unit.site.steam_price), steam_price_per=val(unit.site.steam_price_per, "mass"))
    site = plain("site", unit.site, site)
    if site:
        doc["site"] = site

    design: dict = {"medium": d.medium}
    if d.concentration is not None:
        design["concentration"] = f"{_g(d.concentration * 100)} %"
    if d.flow_is_mass:
        design["flow"] = val(d.flow, "mass_flow")
    else:
        volume = "cfm" if system == "us" and d.medium == "air" else "gpm" if system == "us" else "m3/h"
        design["flow"] = f"{_g(display.express(d.flow, 'm**3/s', volume))} {volume}"
    design.update(inlet_temperature=val(d.inlet_temperature, "temperature"),
                  outlet_temperature=val(d.outlet_temperature, "temperature"),
                  steam_pressure=val(d.steam_pressure, "pressure"))
    doc["design"] = plain("design", d, design)
    doc["steam"] = {"supply_pressure": val(unit.supply_pressure, "pressure")}
    if unit.valve is not None:
        v = unit.valve
        coefficient = {"kv": number(v.cv / q.CV_PER_KV)} if v.given_as == "kv" else {"cv": number(v.cv)}
        doc["valve"] = plain("valve", v, coefficient)
    load: dict = {"varies": ld.varies}
    if unit.site.weather is not None:
        load["outdoor_air_minimum"] = number(ld.outdoor_air_minimum)
        if ld.return_air_temperature is not None:
            load["return_air_temperature"] = val(ld.return_air_temperature, "temperature")
        if ld.mixed_air_temperature is not None:
            load["mixed_air_temperature"] = val(ld.mixed_air_temperature, "temperature")
        if ld.season:
            load["season"] = ", ".join(MONTHS[m - 1][:3].title() for m in ld.season)
        if ld.daily_hours is not None:
            load["daily_hours"] = f"{ld.daily_hours[0]:02d}:00-{ld.daily_hours[1]:02d}:00"
    if ld.bins:
        load["bins"] = _rows([({"inlet_temperature": val(b.inlet_temperature, "temperature")}
                               if b.inlet_temperature is not None else {"load": number(b.load)})
                              | {"hours": number(b.hours)} for b in ld.bins])
    doc["load"] = plain("load", ld, load)

    drain: dict = {}
    if dr.pump_capacity is not None:
        drain["pump_capacity"] = val(dr.pump_capacity, "mass_flow")
    if dr.pump_table:
        drain["pump_capacity"] = _rows([{"back_pressure": val(back, "pressure"), "flow": val(flow, "mass_flow")}
                                        for back, flow in dr.pump_table])
    if dr.pump_rate is not None:
        drain["pump_rate"] = val(dr.pump_rate, "mass_flow")
    if dr.pump_rate_volume is not None:
        volume = "gpm" if system == "us" else "m3/h"
        drain["pump_rate"] = f"{_g(display.express(dr.pump_rate_volume, 'm**3/s', volume))} {volume}"
    if dr.capacity:
        drain["capacity"] = _rows([{"differential": val(c.differential, "differential"),
                                    "flow": val(c.flow, "mass_flow")} for c in dr.capacity])
    doc["drain"] = plain("drain", dr, drain)

    geometry = plain("geometry", unit.geometry, {})
    if geometry:
        doc["geometry"] = geometry
    return tomlkit.dumps(doc)


def _default(record, name: str):
    """A record's own default for a field (None where it has none)."""
    default = next(f.default for f in dataclasses.fields(record) if f.name == name)
    return None if default is dataclasses.MISSING else default


def _plain(row, value, val, number):
    """A plain key's value as the file writes it (``val``: a quantity in the unit's
    system; ``number``: a plain number to nine figures)."""
    if row.kind == "number":
        return number(value)
    if row.kind != "quantity":
        return value            # words, a flag, a whole number
    if row.measure == "fraction":
        return f"{_g(value * 100.0)} %"
    if row.measure == "duration":
        return f"{_g(value)} s"
    return val(value, row.measure)


def _rows(tables: list[dict]):
    """An array of tables (``[[load.bins]]``), as tomlkit writes it."""
    import tomlkit

    rows = tomlkit.aot()
    for values in tables:
        table = tomlkit.table()
        for key, value in values.items():
            table[key] = value
        rows.append(table)
    return rows


def weather_path(unit: Unit, folder: str | Path | None) -> str:
    """The unit's weather file as a file written in ``folder`` should name it: relative
    to that folder, or absolute where no folder is given (or none relative exists)."""
    resolved = unit.site.weather.resolved
    if folder is None:
        return resolved
    try:
        return os.path.relpath(resolved, Path(folder).resolve())
    except ValueError:  # another drive
        return resolved


#: The values ``explore`` changes: unit-file key → (display kind, how to read it from a unit).
EDITABLE = {
    "drain.lift": ("length", lambda u: u.drain.lift),
    "drain.return_pressure": ("pressure", lambda u: u.drain.return_pressure),
    "drain.fill_head": ("length", lambda u: u.drain.fill_head),
    "design.steam_pressure": ("pressure", lambda u: u.design.steam_pressure),
    "valve.cv": ("cv", lambda u: u.valve.cv if u.valve is not None else None),
    "load.minimum": ("fraction", lambda u: u.load.minimum),
}


def edit(text: str, original: Unit, changed: Unit, system: str | None = None,
         folder: str | Path | None = None) -> str:
    """The user's own unit file with only the changed values rewritten.

    Comments, key order, spellings and every value not changed are kept as written
    (``tomlkit``, a style-preserving TOML library). A changed value is written in the
    unit the file used for it (``"8 ft"`` stays in feet, ``"0.5 psig"`` in psig) at the
    precision it is shown on screen; a value the file did not give is added in the
    display units of ``system``.

    Parameters
    ----------
    text : str
        The original unit file's text.
    original, changed : Unit
        The unit as read from ``text``, and as changed.
    system : str, optional
        ``"us"`` or ``"si"`` for values the file did not give; default the unit's own.
    folder : str or Path, optional
        Where the text will be written: a weather file the unit names is renamed
        relative to it where the file is saved in another folder.
    """
    import tomlkit

    system = system or changed.system
    atm = changed.site.atmospheric_pressure
    doc = tomlkit.parse(text)
    for key, (kind, read) in EDITABLE.items():
        old, new = read(original), read(changed)
        if new is None or (old is not None and abs(new - old) <= 1e-9 * max(1.0, abs(old))):
            continue
        section, name = key.split(".")
        table = doc.get(section)
        if table is None:
            doc[section] = table = tomlkit.table()
        if key == "valve.cv" and "kv" in table and "cv" not in table:
            # a file that gives Kv keeps Kv: writing cv beside it would make it unreadable
            name, new = "kv", new / q.CV_PER_KV
        written = table.get(name)
        value = _written(kind, new, str(written) if isinstance(written, str) else None, system, atm)
        if written is not None and hasattr(written, "trivia"):
            item = tomlkit.item(value)
            item.trivia.comment = written.trivia.comment
            item.trivia.comment_ws = written.trivia.comment_ws
            table[name] = item
        else:
            table[name] = value
    w = changed.site.weather
    if w is not None and folder is not None:
        site = doc["site"]
        written = str(site.get("weather"))
        if (Path(folder) / written).resolve() != Path(w.resolved).resolve():
            site["weather"] = weather_path(changed, folder)
    return tomlkit.dumps(doc)


def _written(kind: str, value: float, old: str | None, system: str, atm: float):
    """A changed value as the file should say it: in the unit of ``old`` (the text it
    replaces) where that is a quantity, at the precision shown on screen."""
    if kind == "cv":
        return float(f"{value:.3g}")
    if kind == "fraction":
        return round(value, 2)
    shown = value
    unit = old.split(None, 1)[1].strip() if old and len(old.split(None, 1)) == 2 else None
    if unit is None:  # as shown on screen: number and unit (psig, barg, ft, m)
        return " ".join(display.show(shown, kind, system, atm).replace(",", "").split()[:2])
    if kind == "pressure":
        gauge = unit in ("psig", "barg", "kPag", "kPa(g)", "bar(g)", "psi(g)")
        base = {"psig": "psi", "psia": "psi", "psi(g)": "psi", "psi(a)": "psi", "barg": "bar", "bara": "bar",
                "bar(g)": "bar", "bar(a)": "bar", "bar(abs)": "bar", "kPag": "kPa", "kPaa": "kPa", "kPa(g)": "kPa",
                "kPa(abs)": "kPa", "kPa(a)": "kPa"}.get(unit)
        if base is None:
            return " ".join(display.show(shown, kind, system, atm).replace(",", "").split()[:2])
        number = display.express(shown - atm if gauge else shown, "Pa", base)
    else:
        number = display.express(shown, "m", unit)
    # the precision a screen or a gauge shows in that unit
    step = _STEP.get(unit, 0.01)
    figure = f"{round(number / step) * step:.{max(0, -math.floor(math.log10(step)))}f}"
    if "." in figure:
        figure = figure.rstrip("0").rstrip(".")
    return f"{'0' if figure in ('-0', '') else figure} {unit}"


#: The step each unit's figures are written to (as they are shown and read on gauges).
_STEP = {"ft": 0.1, "in": 0.1, "m": 0.01, "mm": 1.0, "psig": 0.1, "psia": 0.1, "psi(g)": 0.1, "psi(a)": 0.1,
         "barg": 0.01, "bara": 0.01, "bar(g)": 0.01, "bar(a)": 0.01, "bar(abs)": 0.01, "kPag": 0.1, "kPaa": 0.1,
         "kPa(g)": 0.1, "kPa(abs)": 0.1, "kPa(a)": 0.1}
