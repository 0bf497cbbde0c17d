"""The keys of the unit file (format 1), one row each: the one table the readers of unit
files and CSV tables, the writer, and the questions of ``stallcheck new`` take their keys
from.

Each row names a dotted key, how its value is written, and what it is in a line. The
unit file's reader refuses any key not here (a misspelt key would leave its default in
force); a CSV column is read by its row's kind; ``new`` explains a key in its words.
Rows of an array of tables (``[[load.bins]]``) are named under it (``load.bins.hours``).

A row marked ``plain`` is read, held to its range, defaulted and written back from the
row alone, into the field of the same name on its section's record in
:mod:`stallcheck.inputs`. Adding such a key is its row here and that field (the field
is what the physics reads); a key whose reading depends on other keys (a pressure
against the back pressure, one of two ways to give a value) is read by its section's
own code and written by the writer's.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import cached_property

from stallcheck.errors import InputError
from stallcheck.files.ranges import (ELEVATION_RANGE, HOURS_A_YEAR, NARROWEST_LINE, TRAP_DIFFERENTIAL_LIMIT,
                                     check_pressure_range)
from stallcheck.inputs import ARRANGEMENTS, CHARACTERISTICS, METHODS, TRAPS


@dataclass(frozen=True)
class Key:
    """One key of the unit file.

    Attributes
    ----------
    key : str
        Dotted: section and name (``"drain.lift"``); a top-level key has no section.
    kind : str
        How its value is written: ``"quantity"`` (a string, number and unit),
        ``"number"`` (a plain number), ``"whole"`` (a whole number), ``"flag"`` (true or
        false), ``"words"`` (a string that is not a quantity), ``"table"`` (a table, or
        an array of tables, of the keys named under it), or ``"quantity-or-table"``.
    help : str
        What it is, in a line.
    low, high : float or None
        The range it is taken in, SI for a quantity (``low_open``, ``high_open``: the
        end itself excluded); a quantity whose range leaves out zero and below is
        refused there as "must be greater than zero".
    default : float or str or tuple of str or None
        The value taken where the file leaves the key out (said among the defaults
        taken): for a plain number or words, the value; for a quantity, as a US file
        and an SI file would write it (``("0 in", "0 m")``).
    measure : str
        For a quantity: what it measures, and so how it is read and written:
        ``"length"``, ``"diameter"`` (a length written in in or mm), ``"temperature"``,
        ``"pressure"`` (gauge or absolute, held absolute [Pa] on the steam tables'
        range), ``"differential"``, ``"mass_flow"``, ``"fraction"`` (a %),
        ``"duration"``, ``"mass"``.
    words : str
        A quantity's range as the message says it, in both systems of units; for free
        words, what they are ("a short text such as ...").
    choices : tuple of str
        For words: the values taken; none for free words (any text up to ``high``
        characters, its ends' spaces dropped).
    required : bool
        A plain key the file must give.
    plain : bool
        Read, checked and written from this row alone, into the field of the same
        name on its section's record.
    """

    key: str
    kind: str
    help: str
    low: float | None = None
    high: float | None = None
    low_open: bool = False
    high_open: bool = False
    default: float | str | tuple[str, str] | None = None
    measure: str = ""
    words: str = ""
    choices: tuple[str, ...] = ()
    required: bool = False
    plain: bool = False

    @cached_property
    def section(self) -> str:
        """The section the key is written in (``""``: the top level)."""
        return self.key.rpartition(".")[0]

    @cached_property
    def taken(self) -> bool:
        """Read where the file leaves it out: a default taken, or the key required."""
        return self.default is not None or self.required

    @cached_property
    def name(self) -> str:
        """The key's own name, and its field's on the section's record."""
        return self.key.rpartition(".")[2]


KEYS = (
    Key("format", "whole", "the format of the file: 1"),
    Key("unit", "table", "the unit's name and tag"),
    Key("unit.name", "words", "what the unit is called in reports"),
    Key("unit.tag", "words", "the plant's own tag for it"),
    Key("site", "table", "where the unit is"),
    Key("site.elevation", "quantity", "sets the atmospheric pressure that gauge readings are relative to",
        low=ELEVATION_RANGE[0], high=ELEVATION_RANGE[1], measure="length",
        words="-500 m to 9000 m (-1,640 ft to 29,527 ft)"),
    Key("site.atmospheric_pressure", "quantity", "the atmospheric pressure itself, absolute"),
    Key("site.hours_per_year", "number", "hours a year the unit runs, for a purge's yearly steam",
        low=0.0, high=HOURS_A_YEAR, plain=True),
    Key("site.steam_price", "number", "price of steam per site.steam_price_per", low=0.0, high=1e6),
    Key("site.steam_price_per", "quantity", "the mass of steam the price is for"),
    Key("site.currency", "words", "the price's currency, shown beside costs", high=12,
        words="a short text such as \"USD\" or \"EUR\"", plain=True),
    Key("site.weather", "words", "an hourly EPW or TMY3 CSV weather year, relative to the unit file"),
    Key("design", "table", "the selection point: full load"),
    Key("design.medium", "words", "the medium on the other side of the coil"),
    Key("design.concentration", "quantity", "mass fraction of glycol in the mix", low=0.0, high=0.6,
        low_open=True, measure="fraction", words="above 0 % to 60 %"),
    Key("design.flow", "quantity", "mass or volume flow at full load (air volumes are standard air)", low=0.0,
        low_open=True),
    Key("design.inlet_temperature", "quantity",
        "entering temperature at full load (for an outdoor-air coil, the coldest air)"),
    Key("design.outlet_temperature", "quantity", "the leaving set point the control valve holds"),
    Key("design.steam_pressure", "quantity", "the coil pressure at full load; it fixes the coil's size",
        high=2.0e6, measure="pressure", words="up to 2 MPa absolute (about 275 psig): coils on modulating valves "
        "run far lower; check the units"),
    Key("design.ua_flow_exponent", "number", "n in UA proportional to flow to the n",
        low=0.0, high=1.0, default=0.0, plain=True),
    Key("design.method", "words", "heat transfer: ntu or mean-temperature", default="ntu", choices=METHODS,
        plain=True),
    Key("steam", "table", "the steam supply"),
    Key("steam.supply_pressure", "quantity",
        "steam pressure ahead of the control valve, above the coil's so it can pass steam", measure="pressure"),
    Key("valve", "table", "the modulating control valve"),
    Key("valve.cv", "number", "full-travel flow coefficient, Cv", low=0.01, high=1e5),
    Key("valve.kv", "number", "full-travel flow coefficient, Kv (m³/h of water at 1 bar drop; Cv = 1.156 Kv)",
        low=0.01, high=1e5),
    Key("valve.characteristic", "words", "inherent flow characteristic", choices=CHARACTERISTICS,
        required=True, plain=True),
    Key("valve.rangeability", "number", "largest over smallest controllable Cv",
        low=1.0, high=1000.0, low_open=True, default=50.0, plain=True),
    Key("valve.xt", "number", "pressure-differential ratio factor at choked flow (IEC 60534-2-1)",
        low=0.0, high=1.0, low_open=True, default=0.70, plain=True),
    Key("load", "table", "how the load moves"),
    Key("load.varies", "words", "what moves the load: inlet-temperature or flow"),
    Key("load.minimum", "number",
        "lowest load fraction it runs at; below it the unit is off or held by other controls",
        low=0.0, high=1.0, high_open=True, default=0.0, plain=True),
    Key("load.bins", "table", "operating hours by entering temperature or load"),
    Key("load.bins.inlet_temperature", "quantity", "the bin's entering temperature"),
    Key("load.bins.load", "number", "or the bin's load fraction", low=0.0, high=1.0),
    Key("load.bins.hours", "number", "the bin's hours a year", low=0.0, high=HOURS_A_YEAR),
    Key("load.outdoor_air_minimum", "number", "with a weather file: the least outdoor-air share",
        low=0.0, high=1.0, low_open=True, default=1.0),
    Key("load.return_air_temperature", "quantity", "with a weather file: the air mixed with the outdoor air"),
    Key("load.mixed_air_temperature", "quantity", "with a weather file: an economiser's mixed-air set point"),
    Key("load.season", "words", "with a weather file: the months it runs"),
    Key("load.daily_hours", "words", "with a weather file: the hours of the day it runs"),
    Key("drain", "table", "what drains the coil"),
    Key("drain.arrangement", "words", "the installed drainage", choices=ARRANGEMENTS, required=True, plain=True),
    Key("drain.trap", "words", "the trade type of the trap", default="float-thermostatic", choices=TRAPS,
        plain=True),
    Key("drain.fill_head", "quantity",
        "height from the coil outlet down to the trap inlet: more of it drains a coil at low pressure",
        low=0.0, high=100.0, measure="length", words="0 to 100 m (328 ft)", default=("0 in", "0 m"), plain=True),
    Key("drain.lift", "quantity", "rise in the discharge after the trap, which adds to the back pressure",
        low=0.0, high=100.0, measure="length", words="0 to 100 m (328 ft)", default=("0 ft", "0 m"), plain=True),
    Key("drain.return_pressure", "quantity",
        "pressure in the return main or receiver: what the trap discharges against", measure="pressure",
        default=("0 psig", "0 barg"), plain=True),
    Key("drain.trap_min_differential", "quantity", "smallest differential at which the trap opens", low=0.0,
        high=TRAP_DIFFERENTIAL_LIMIT, measure="differential", words="0 to 2 bar (29 psi)",
        default=("0 psi", "0 kPa"), plain=True),
    Key("drain.capacity", "table", "the trap's rated capacity against differential"),
    Key("drain.capacity.differential", "quantity", "a row's differential"),
    Key("drain.capacity.flow", "quantity", "a row's rated flow"),
    Key("drain.trap_max_differential", "quantity", "the largest differential the trap opens against, from its "
        "maker", low=0.0, high=3.0e6, low_open=True, measure="differential", words="above 0 to 30 bar (435 psi)",
        plain=True),
    Key("drain.capacity_margin", "number", "margin on the full-load condensate when selecting the trap",
        low=1.0, high=10.0, plain=True),
    Key("drain.trap_orifice", "quantity", "seat bore of the trap", low=0.0, low_open=True, high=1.0,
        measure="diameter", words="above 0 to 1 m (39 in)", plain=True),
    Key("drain.motive_pressure", "quantity", "a pump-trap's motive pressure", measure="pressure", plain=True),
    Key("drain.pump_fill_head", "quantity", "the filling head the pump-trap's maker asks for", low=0.0,
        high=10.0, measure="length", words="0 to 10 m (32.8 ft)", plain=True),
    Key("drain.pump_capacity", "quantity-or-table", "the pump-trap's capacity at this duty, or its table"),
    Key("drain.pump_capacity.back_pressure", "quantity", "a row's back pressure"),
    Key("drain.pump_capacity.flow", "quantity", "a row's capacity"),
    Key("drain.purge_orifice", "quantity", "a constant purge's bore", low=0.0, low_open=True, high=1.0,
        measure="diameter", words="above 0 to 1 m (39 in)", plain=True),
    Key("drain.purge_rate", "quantity", "or its stated steam rate", low=0.0, low_open=True, measure="mass_flow",
        plain=True),
    Key("drain.return_line", "quantity", "inside diameter of the line the trap discharges into",
        low=NARROWEST_LINE, high=1.0, measure="diameter", words="5 mm (0.2 in) to 1 m", plain=True),
    Key("drain.return_temperature", "quantity", "temperature of the condensate already in that line",
        low=273.15, high=473.15, measure="temperature", words="0 °C to 200 °C (32 °F to 392 °F)", plain=True),
    Key("drain.return_length", "quantity", "length of that line to the receiver or main", low=0.0,
        high=2000.0, low_open=True, measure="length", words="above 0 to 2000 m (6,561 ft)", plain=True),
    Key("drain.return_pitch", "quantity", "its fall in the direction of flow per length", low=-1.0, high=1.0,
        measure="fraction", words="-100 % to 100 % (fall per length; negative rises against the flow)",
        plain=True),
    Key("drain.return_material", "words", "steel or copper", choices=("steel", "copper"), plain=True),
    Key("drain.return_wall", "quantity", "its wall thickness", low=0.0, high=0.05, measure="diameter",
        words="above 0 to 50 mm (1.96 in)", low_open=True, plain=True),
    Key("drain.return_rating", "quantity", "the pressure the line and its fittings are rated for",
        measure="pressure", plain=True),
    Key("drain.pump_rate", "quantity", "a pump-trap's discharge rate while it pumps"),
    Key("drain.check_closing_time", "quantity", "how long the check valve on the discharge takes to close",
        low=0.0, high=600.0, measure="duration", words="0 to 600 s", plain=True),
    Key("geometry", "table", "the coil's and piping's layout"),
    Key("geometry.tubes", "words", "horizontal or vertical tubes", choices=("horizontal", "vertical"), plain=True),
    Key("geometry.supply_feed", "words", "where steam enters the supply header: end or center",
        choices=("end", "center"), plain=True),
    Key("geometry.distributing_tubes", "flag", "steam-distributing inner tubes", plain=True),
    Key("geometry.pitched_to_return", "flag", "tubes pitched to the return header", plain=True),
    Key("geometry.coils_per_trap", "whole", "coils drained by one trap", low=1, high=1000, plain=True),
    Key("geometry.drop_to_trap", "quantity", "vertical drop from the coil outlet to the trap", low=0.0,
        high=100.0, measure="length", words="0 to 100 m (328 ft)", plain=True),
    Key("geometry.drop_vented", "flag", "the drop back-vented to the steam space", plain=True),
    Key("geometry.drip_before_valve", "flag", "a drip leg and trap just ahead of the control valve",
        plain=True),
)

#: A row's index in a section's name (``load.bins[2]``).
ROW_INDEX = re.compile(r"\[\d+\]")

#: Each key's row, by its dotted name.
BY_NAME = {row.key: row for row in KEYS}


def known() -> dict[str, set[str]]:
    """The names each section (``""``: the top level; ``"load.bins"``: the rows of an
    array of tables) takes."""
    out: dict[str, set[str]] = {}
    for row in KEYS:
        section, _, name = row.key.rpartition(".")
        out.setdefault(section, set()).add(name)
        if row.kind in ("table", "quantity-or-table"):
            out.setdefault(row.key, set())
    return out


def of_kind(*kinds: str) -> frozenset[str]:
    """The dotted keys written as any of ``kinds``."""
    return frozenset(row.key for row in KEYS if row.kind in kinds)


def check_number(key: str, value: float) -> float:
    """A plain number for ``key`` held to its row's range (the unit file's reader and
    ``new``'s questions both ask here); InputError naming the key where it is outside."""
    row = BY_NAME[key]
    below = value <= row.low if row.low_open else value < row.low
    above = value >= row.high if row.high_open else value > row.high
    if not math.isfinite(value) or below or above:
        raise InputError(key, f"{value:g} is out of range; accepted: {accepted(key)}.")
    return value


def accepted(key: str) -> str:
    """A plain number's range in words: ``"above 1 to 1000"``."""
    row = BY_NAME[key]
    return (f"{'above' if row.low_open else 'from'} {row.low:g} {'below' if row.high_open else 'to'} "
            f"{row.high:g}")


def check_quantity(key: str, value: float, text) -> float:
    """A quantity (SI) held to its row's range; InputError naming ``key`` where it is
    outside."""
    row = BY_NAME[key]
    low, high = row.low, row.high
    if math.isfinite(value) and (low is None or (value > low if row.low_open else value >= low)) and (
            high is None or (value < high if row.high_open else value <= high)):
        return value
    if low is not None and (low > 0 or (low == 0 and row.low_open)) and value <= 0:
        raise InputError(key, f"must be greater than zero, got \"{text}\".")
    if low == 0 and value < 0:
        raise InputError(key, f"\"{text}\" cannot be negative; accepted: {row.words}.")
    raise InputError(key, f"\"{text}\" is out of range; accepted: {row.words}.")


def check_measured(key: str, value: float, text) -> float:
    """A quantity (SI; a pressure absolute) held to all its row says: a pressure to the
    steam tables' range, and any quantity to its row's own (the unit file's reader and
    ``new``'s questions both ask here)."""
    if BY_NAME[key].measure == "pressure":
        check_pressure_range(key, value, text)
    return check_quantity(key, value, text)


#: The plain rows of each section, in the table's order (read for every unit a survey reads).
_PLAIN: dict[str, tuple[Key, ...]] = {}
for _row in KEYS:
    if _row.plain:
        _PLAIN[_row.section] = _PLAIN.get(_row.section, ()) + (_row,)


def plain(section: str) -> tuple[Key, ...]:
    """The plain rows of a section, in the table's order."""
    return _PLAIN.get(section, ())
