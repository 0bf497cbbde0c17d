"""The key table (``files/keys.py``) is the one list of unit-file keys: each row's kind
is how the reader takes the key, so a row with the wrong kind, or a key read that has
no row, fails here."""

from __future__ import annotations

import copy
from pathlib import Path

import pytest

from stallcheck import wizard
from stallcheck.errors import InputError
from stallcheck.files import csvunits, keys, unitfile

WEATHER = str(Path(__file__).resolve().parent.parent / "sample_units" / "weather"
              / "greensboro_723170_tmy3_drybulb.csv")

#: A unit giving every section, so that each key is read where it is written.
BASE = {
    "format": 1, "unit": {"name": "Pellham Street AHU-6 preheat", "tag": "AHU-6"},
    "site": {"elevation": "100 m", "weather": WEATHER},
    "design": {"medium": "air", "flow": "5000 cfm", "inlet_temperature": "0 degF",
               "outlet_temperature": "55 degF", "steam_pressure": "5 psig"},
    "steam": {"supply_pressure": "15 psig"},
    "valve": {"cv": 12, "characteristic": "equal-percentage"},
    "load": {"minimum": 0.1, "outdoor_air_minimum": 0.3, "return_air_temperature": "20 degC"},
    "drain": {"arrangement": "trap", "trap": "float-thermostatic", "fill_head": "18 in", "lift": "0 ft",
              "return_pressure": "0 psig"},
    "geometry": {"tubes": "horizontal"},
}

#: What a key needs beside it to be read: (section, key to drop), {section: values to add}.
NEEDS = {
    "valve.kv": ([("valve", "cv")], {}),
    "site.atmospheric_pressure": ([("site", "elevation")], {}),
    "site.steam_price_per": ([], {"site": {"steam_price": 20}}),
    "design.concentration": ([], {"design": {"medium": "propylene-glycol", "flow": "50 gpm",
                                             "inlet_temperature": "140 degF", "outlet_temperature": "180 degF",
                                             "steam_pressure": "5 psig"},
                                  "load": {"varies": "flow", "minimum": 0.1}, "site": {"elevation": "100 m"}}),
}
#: A value of the wrong kind for each kind.
WRONG = {"number": "3 ft", "whole": "two", "flag": "sometimes", "quantity": 7, "words": 7}


def _data(row):
    data = copy.deepcopy(BASE)
    drop, add = NEEDS.get(row.key, ([], {}))
    for section, key in drop:
        data[section].pop(key, None)
    for section, values in add.items():
        if row.key == "design.concentration":
            data[section] = dict(values)
        else:
            data[section].update(values)
    if row.key == "design.concentration":
        data["site"].pop("weather", None)
    return data


def test_the_base_unit_reads():
    assert unitfile.from_data(copy.deepcopy(BASE), "pellham.toml").site.weather is not None


@pytest.mark.parametrize("row", [r for r in keys.KEYS if r.kind in WRONG and r.key.count(".") == 1],
                         ids=lambda r: r.key)
def test_a_value_of_the_wrong_kind_is_refused_naming_its_key(row):
    data = _data(row)
    section, name = row.key.split(".")
    data.setdefault(section, {})[name] = WRONG[row.kind]
    with pytest.raises(InputError) as err:
        unitfile.from_data(data, "pellham.toml")
    assert err.value.key == row.key, str(err.value)


def test_a_key_not_in_the_table_is_refused():
    data = copy.deepcopy(BASE)
    data["drain"]["lfit"] = "2 ft"
    with pytest.raises(InputError, match="did you mean 'lift'"):
        unitfile.from_data(data, "pellham.toml")


def test_csv_columns_and_the_questions_of_new_come_from_the_table():
    assert csvunits.NUMBERS == keys.of_kind("number") and csvunits.FLAGS == keys.of_kind("flag")
    for question in wizard.QUESTIONS:
        assert question.explain == keys.BY_NAME[question.key].help


@pytest.mark.parametrize("row", [r for r in keys.KEYS if r.kind == "number" and r.key.count(".") == 1],
                         ids=lambda r: r.key)
def test_a_plain_number_is_held_to_its_row_s_range_in_a_file_and_in_new(row):
    # just inside each end is read; just outside is refused naming the key, by the unit
    # file and by new's question alike (one range: a file and new never disagree)
    step = 1e-6 * max(1.0, abs(row.high))
    inside = (row.low + step if row.low_open else row.low, row.high - step if row.high_open else row.high)
    outside = (row.low if row.low_open else row.low - step, row.high if row.high_open else row.high + step)
    section, name = row.key.split(".")
    for value, ok in [(v, True) for v in inside] + [(v, False) for v in outside]:
        data = _data(row)
        data.setdefault(section, {})[name] = value
        if row.key == "load.outdoor_air_minimum" and value >= 1:
            data["load"].pop("return_air_temperature")   # all outdoor air: nothing mixed in
        if ok:
            unitfile.from_data(data, "pellham.toml")
        else:
            with pytest.raises(InputError) as err:
                unitfile.from_data(data, "pellham.toml")
            assert err.value.key == row.key and "out of range" in err.value.message
    question = next((x for x in wizard.QUESTIONS if x.key == row.key and x.kind == "number"), None)
    if question is not None:
        with pytest.raises(InputError, match="out of range"):
            wizard.accept(question, f"{outside[1]!r}", {})
        assert wizard.accept(question, f"{inside[0]!r}", {}) == pytest.approx(inside[0])


# --- plain keys: read, ranged, defaulted and written from their row alone ------------------

#: Each section's record (stallcheck.inputs), whose field of a plain key's name it fills.
RECORDS = {"site": "Site", "design": "Design", "valve": "Valve", "load": "Load", "drain": "Drain",
           "geometry": "Geometry"}
#: The fields each record has that no plain row fills: read by their section's own code
#: (they depend on other keys, or are given one of two ways). A field added to a record
#: with neither a plain row nor a place here fails below.
READ_BY_CODE = {
    "Site": {"atmospheric_pressure", "steam_price", "steam_price_per", "elevation", "pressure_given", "weather"},
    "Design": {"medium", "concentration", "flow", "flow_is_mass", "inlet_temperature", "outlet_temperature",
               "steam_pressure"},
    "Valve": {"cv", "given_as"},
    "Load": {"varies", "bins", "outdoor_air_minimum", "return_air_temperature", "mixed_air_temperature", "season",
             "daily_hours"},
    "Drain": {"capacity", "pump_capacity", "pump_table", "pump_rate", "pump_rate_volume"},
    "Geometry": set(),
}


def test_every_field_of_a_record_is_a_plain_row_or_read_by_its_section_s_code():
    import dataclasses

    from stallcheck import inputs

    for section, name in RECORDS.items():
        fields = {f.name for f in dataclasses.fields(getattr(inputs, name))}
        rows = {row.name for row in keys.plain(section)}
        assert rows <= fields, (section, rows - fields)
        assert fields - rows == READ_BY_CODE[name], (section, fields - rows)


def test_a_plain_row_s_default_is_its_record_s():
    # the reader fills a row's default where the file leaves the key out; the writer
    # leaves out words or a quantity equal to the record's own default: the two agree
    import dataclasses

    from stallcheck import inputs

    for row in (r for r in keys.KEYS if r.plain):
        field = next(f for f in dataclasses.fields(getattr(inputs, RECORDS[row.section])) if f.name == row.name)
        if row.default is not None and field.default is not dataclasses.MISSING:
            assert field.default == row.default, row.key


#: A value inside its range for each plain quantity, and one just outside (as written).
QUANTITIES = {
    "drain.fill_head": ("18 in", "101 m"),
    "drain.lift": ("4 ft", "-1 ft"),
    "drain.return_pressure": ("5 psig", "3000 psig"),
    "drain.trap_min_differential": ("0.25 psi", "3 bar"),
    "drain.trap_orifice": ("0.25 in", "1.2 m"),
    "drain.trap_max_differential": ("15 psi", "31 bar"),
    "drain.motive_pressure": ("50 psig", "3000 psig"),
    "drain.pump_fill_head": ("12 in", "10.1 m"),
    "drain.purge_orifice": ("3 mm", "0 mm"),
    "drain.purge_rate": ("4 lb/h", "0 lb/h"),
    "drain.return_line": ("1.049 in", "4 mm"),
    "drain.return_temperature": ("180 degF", "201 degC"),
    "drain.return_length": ("120 ft", "2001 m"),
    "drain.return_pitch": ("0.5 %", "101 %"),
    "drain.return_wall": ("0.133 in", "51 mm"),
    "drain.return_rating": ("150 psig", "3000 psig"),
    "drain.check_closing_time": ("0.4 s", "601 s"),
    "geometry.drop_to_trap": ("2 ft", "-1 ft"),
}


def test_every_plain_quantity_has_a_value_in_and_out_of_its_range_here():
    assert set(QUANTITIES) == {r.key for r in keys.KEYS if r.plain and r.kind == "quantity"}


@pytest.mark.parametrize("key", sorted(QUANTITIES))
def test_a_plain_quantity_is_read_in_its_range_and_refused_outside_naming_its_key(key):
    section, name = key.split(".")
    inside, outside = QUANTITIES[key]
    data = copy.deepcopy(BASE)
    data[section][name] = inside
    unitfile.from_data(data, "pellham.toml")
    data[section][name] = outside
    with pytest.raises(InputError) as err:
        unitfile.from_data(data, "pellham.toml")
    assert err.value.key == key and f'"{outside}"' in err.value.message   # the value as written, quoted
    assert any(said in err.value.message for said in ("out of range", "greater than zero", "critical pressure",
                                                      "cannot be negative"))


@pytest.mark.parametrize("system", ["us", "si"])
@pytest.mark.parametrize("row", [r for r in keys.KEYS if r.plain], ids=lambda r: r.key)
def test_every_plain_key_written_reads_back_the_same(row, system):
    # a value other than its default, read, written by the writer, read again
    from stallcheck.files import unitwriter

    if row.kind == "number":
        given = (row.low + row.high) / 2
    elif row.kind == "words":
        given = row.choices[-1] if row.choices else "EUR"
    else:
        given = {"flag": True, "whole": 2}.get(row.kind) or QUANTITIES[row.key][0]
    data = copy.deepcopy(BASE)
    data.setdefault(row.section, {})[row.name] = given
    unit = unitfile.from_data(data, "pellham.toml")
    again = unitfile.parse(unitwriter.dumps(unit, system), "written.toml")
    first, second = getattr(unit, row.section), getattr(again, row.section)
    first, second = getattr(first, row.name), getattr(second, row.name)
    assert second == (pytest.approx(first, rel=1e-8) if isinstance(first, float) else first)


def test_every_key_of_the_table_is_in_the_reference_s_unit_file_section():
    # the reference documents every key a file takes: a row added without its line in
    # docs/reference.md fails here
    root = Path(__file__).resolve().parent.parent
    text = (root / "docs" / "reference.md").read_text(encoding="utf-8")
    section = text[text.index("## The unit file"):text.index("## The result contract")]
    missing = [row.key for row in keys.KEYS
               if not any(f"{form}" in section for form in (f"`{row.name}`", f"] {row.name}`", f"[{row.key}]`",
                                                             f"[[{row.key}]]`", f"`[{row.key}] "))]
    assert not missing, missing


#: Values each side of a ranged quantity that `new` asks for, with what else the unit
#: needs for the value alone to decide (a supply above the design pressure).
ASKED = [
    ("site.elevation", ("7000 m", "9100 m", "-600 m"), {}),
    ("design.steam_pressure", ("5 psig", "280 psig", "-15 psig"), {"steam": {"supply_pressure": "400 psig"}}),
    ("steam.supply_pressure", ("15 psig", "3000 psig"), {}),
    ("design.inlet_temperature", ("-40 degF", "-100 degF"), {}),
    ("design.flow", ("5000 cfm", "0 cfm", "-5 cfm"), {}),
    ("drain.fill_head", ("18 in", "-2 in", "101 m"), {}),
    ("drain.lift", ("4 ft", "-1 ft", "400 ft"), {}),
    ("drain.return_pressure", ("5 psig", "3000 psig", "-15 psig"), {}),
]


@pytest.mark.parametrize("key, values, beside", ASKED, ids=[a[0] for a in ASKED])
def test_new_takes_a_quantity_where_a_unit_file_takes_it(key, values, beside):
    # one range for a key, whoever reads it: each value is accepted by new's question
    # exactly where a unit file giving it is read (and refused naming the key where not)
    question = next(x for x in wizard.QUESTIONS if x.key == key)
    section, name = key.split(".")
    read = []
    for value in values:
        data = copy.deepcopy(BASE)
        for table, more in beside.items():
            data[table].update(more)
        data[section][name] = value
        try:
            unitfile.from_data(data, "pellham.toml")
            in_file = True
        except InputError as exc:
            assert exc.key == key, exc
            in_file = False
        try:
            wizard.accept(question, value, {})
            in_new = True
        except InputError as exc:
            assert exc.key == key, exc
            in_new = False
        assert in_new == in_file, (value, in_file)
        read.append(in_file)
    assert read[0] and not any(read[1:])   # the first of each inside, the others outside


def test_new_holds_an_entering_liquid_as_a_unit_file_does():
    # water at or below 0 °C is refused by both; a glycol below 0 °C is what glycol is
    # for (its own freezing point, from its mixture data, is held by the analysis)
    question = next(x for x in wizard.QUESTIONS if x.key == "design.inlet_temperature")
    with pytest.raises(InputError, match="freezing for water"):
        wizard.accept(question, "0 degC", {"design.medium": "water"})
    assert wizard.accept(question, "-10 degC", {"design.medium": "propylene-glycol"}) == "-10 degC"
    share = next(x for x in wizard.QUESTIONS if x.key == "design.concentration")
    for given, ok in (("30 %", True), ("60 %", True), ("61 %", False), ("0 %", False)):
        if ok:
            wizard.accept(share, given, {})
        else:
            with pytest.raises(InputError):
                wizard.accept(share, given, {})
        data = _data(keys.BY_NAME["design.concentration"])
        data["design"]["concentration"] = given
        if ok:
            unitfile.from_data(data, "pellham.toml")
        else:
            with pytest.raises(InputError):
                unitfile.from_data(data, "pellham.toml")
    data = copy.deepcopy(BASE)
    data["design"].update(medium="water", flow="50 gpm", inlet_temperature="0 degC", outlet_temperature="60 degC")
    data["load"] = {"varies": "flow"}
    data["site"].pop("weather")
    with pytest.raises(InputError, match="freezing for water"):
        unitfile.from_data(data, "pellham.toml")


def test_a_plain_number_s_range_is_said_as_the_contract_gives_it():
    # the unit-file contract (shared/unit-file.md, README): the minimum load from 0 to
    # below 1, a rangeability above 1, xt above 0 to 1; a message says the range so
    for key, value, said in (("load.minimum", 1.0, "from 0 below 1"), ("valve.rangeability", 1.0, "above 1 to 1000"),
                             ("valve.xt", 0.0, "above 0 to 1")):
        section, name = key.split(".")
        data = copy.deepcopy(BASE)
        data[section][name] = value
        with pytest.raises(InputError, match=said):
            unitfile.from_data(data, "pellham.toml")


def test_free_words_and_whole_numbers_are_held_to_their_rows_ends():
    # a currency up to 12 characters ("USD", or a longer name); coils per trap 1 to 1000
    for value, ok in (("x" * 12, True), ("x" * 13, False)):
        data = copy.deepcopy(BASE)
        data["site"].update(currency=value, steam_price=20)
        if ok:
            assert unitfile.from_data(data, "pellham.toml").site.currency == value
        else:
            with pytest.raises(InputError, match="short text such as"):
                unitfile.from_data(data, "pellham.toml")
    for value, ok in ((1, True), (1000, True), (1001, False), (0, False)):
        data = copy.deepcopy(BASE)
        data["geometry"]["coils_per_trap"] = value
        if ok:
            assert unitfile.from_data(data, "pellham.toml").geometry.coils_per_trap == value
        else:
            with pytest.raises(InputError, match="whole number from 1 to 1000"):
                unitfile.from_data(data, "pellham.toml")
