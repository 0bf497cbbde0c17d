"""One grammar for quantities, in unit files, CSV cells, `new` and `diagnose`: values as
engineers type them. Expected values are the exact definitions of the units (NIST SP 811:
1 ft = 0.3048 m, 1 lb = 0.45359237 kg, 1 psi = 6894.757293168 Pa, °F = °C × 1.8 + 32)."""

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from stallcheck.errors import InputError
from stallcheck.files import quantities as q
from stallcheck.files import display
from stallcheck.files import unitfile

PSI = 6894.757293168
CFM = 0.3048 ** 3 / 60.0

ACCEPTED = [
    ("temperature", "15C", 288.15), ("temperature", "15 C", 288.15), ("temperature", "15 degc", 288.15),
    ("temperature", "15 °C", 288.15), ("temperature", "15°C", 288.15), ("temperature", "50F", 283.15),
    ("temperature", "0 deg F", (0 - 32) / 1.8 + 273.15), ("temperature", "-4 °F", 253.15),
    ("temperature", "288.15 K", 288.15),
    ("flow", "12,000 cfm", 12000 * CFM), ("flow", "12000 CFM", 12000 * CFM), ("flow", "40 GPM", 40 * 3.785411784e-3 / 60),
    ("mass_flow", "1,000 lb/h", 1000 * 0.45359237 / 3600), ("mass_flow", "500 kg/hr", 500 / 3600),
    ("length", "3 FT", 0.9144), ("length", "1,200 mm", 1.2), ("length", '18"', 18 * 0.0254),
    ("differential", "0.25 PSI", 0.25 * PSI), ("differential", "2 kpa", 2000.0),
    ("fraction", "10%", 0.1), ("fraction", "10 %", 0.1),
]
GAUGE = [("2 bar(g)", 2e5, True), ("2 bar(a)", 2e5, False), ("2 BARG", 2e5, True), ("15 PSIG", 15 * PSI, True),
         ("15 psi(g)", 15 * PSI, True), ("101.3 kPa(abs)", 101.3e3, False)]
REFUSED = [
    ("pressure", "2 bar", "does not say gauge or absolute"),      # a bare bar: the two readings spelled out
    ("pressure", "2 BAR", "does not say gauge or absolute"),
    ("pressure", "15 psi", "does not say gauge or absolute"),
    ("pressure", "1,5 barg", "decimal point"),                     # a decimal comma
    ("length", "12,00 m", "decimal point"),
    ("temperature", "15 C/s", "unknown unit 'C/s'"),
    ("length", "3 zorks", "unknown unit"),
]


@pytest.mark.parametrize("kind, text, si", ACCEPTED, ids=[t for _, t, _ in ACCEPTED])
def test_values_as_engineers_type_them(kind, text, si):
    value = getattr(q, kind)("design.x", text)
    value = getattr(value, "value", value)
    assert value == pytest.approx(si, rel=1e-12)


@pytest.mark.parametrize("text, pascal, gauge", GAUGE, ids=[t for t, _, _ in GAUGE])
def test_pressures_say_gauge_or_absolute_however_spelled(text, pascal, gauge):
    p = q.pressure("design.steam_pressure", text)
    assert p.pascal == pytest.approx(pascal, rel=1e-12) and p.gauge is gauge


@pytest.mark.parametrize("kind, text, words", REFUSED, ids=[t for _, t, _ in REFUSED])
def test_what_cannot_be_read_one_way_is_refused_in_words(kind, text, words):
    with pytest.raises(InputError, match=words):
        getattr(q, kind)("design.x", text)


def test_a_unit_file_and_a_csv_cell_read_the_same_grammar(tmp_path):
    from conftest import BASE_UNIT

    plain = unitfile.parse(BASE_UNIT, "a.toml")
    typed = BASE_UNIT.replace('"-10 degF"', '"-10F"').replace('"6000 cfm"', '"6,000 CFM"')
    assert typed != BASE_UNIT
    assert unitfile.parse(typed, "b.toml").design == plain.design
    from stallcheck.files import csvunits

    table = tmp_path / "units.csv"
    table.write_text('unit.name,design.inlet_temperature\nx,"-17.5C"\n', encoding="utf-8")
    (line, data), = list(csvunits.rows(table))
    assert q.temperature("design.inlet_temperature", data["design"]["inlet_temperature"]) == pytest.approx(255.65)


KINDS = {"pressure": (1.2e3, 2.0e6), "differential": (0.0, 5e5), "temperature": (230.0, 500.0),
         "length": (0.0, 50.0), "mass_flow": (0.0, 50.0), "diameter": (0.005, 0.5)}


@settings(max_examples=300, deadline=None)
@given(kind=st.sampled_from(sorted(KINDS)), system=st.sampled_from(["si", "us"]), share=st.floats(0, 1),
       atm=st.floats(70e3, 105e3))
def test_any_quantity_the_tool_prints_reads_back_as_the_value_printed(kind, system, share, atm):
    lo, hi = KINDS[kind]
    value = lo + share * (hi - lo)
    text = display.show(value, kind, system, atm).split(" (")[0]          # "-0.8 psig (1.7 inHg vac)": the gauge part
    number = float(text.split()[0].replace(",", ""))
    stated = display.from_display(number, kind, system, atm)
    if kind == "pressure":
        read = q.pressure("k", text).absolute(atm)
    elif kind == "diameter":
        read = q.length("k", text)
    else:
        read = getattr(q, kind)("k", text)
    assert math.isclose(read, stated, rel_tol=1e-12, abs_tol=1e-9), (text, read, stated)


#: Trade spellings whose reading by the trade and by a units library differ, each read
#: or refused as docs/reference.md says. Sources: "M" for a thousand (MBH = 1,000 Btu/h,
#: MMBtu/h = a million; Roman numeral convention of US steam and HVAC practice, common
#: practice); acfm, actual cubic feet a minute at the flowing density, scfm at standard
#: conditions (common practice in US fan and compressor ratings).
TRADE = [
    ("mass_flow", "12 Mlb/h", "a thousand in US practice"),
    ("mass_flow", "12 M lb/h", "a thousand in US practice"),
    ("mass_flow", "1.2 MMlb/h", "a million in US practice"),
    ("flow", "12 Mcfm", "a thousand in US practice"),
    ("flow", "500 MBH", "a thousand in US practice"),
    ("flow", "6000 acfm", "acfm is actual cubic feet a minute"),
    ("flow", "6000 a cfm", "acfm is actual cubic feet a minute"),
    ("length", "10 ft%", "percent sign after a unit"),
    ("length", "10 m%", "percent sign after a unit"),
    ("length", "3 (ft", "unknown unit"),
    ("length", "3 ft)", "unknown unit"),
    ("length", "3 ft**2/ft", "unknown unit"),
    ("length", "3 ft/0", "unknown unit"),
    ("length", "1/0 in", "fraction over zero"),
    ("length", "3 kft", "unknown unit"),
    ("flow", "6000 kcfm", "unknown unit"),
    ("temperature", "10 delta_degC", "temperature difference"),
]


@pytest.mark.parametrize("kind, text, words", TRADE, ids=[t for _, t, _ in TRADE])
def test_trade_spellings_are_read_the_trade_s_way_or_refused_with_both_readings(kind, text, words):
    with pytest.raises(InputError, match=words):
        getattr(q, kind)("design.x", text)


def test_standard_cfm_reads_as_the_standard_air_the_file_assumes():
    # scfm: standard air, which is how the unit file reads every air volume (1.204 kg/m³).
    assert q.flow("design.flow", "6000 scfm").value == pytest.approx(6000 * CFM, rel=1e-12)


PIECES = st.sampled_from(["ft", "in", "m", "mm", "psi", "psig", "barg", "kPa", "cfm", "lb/h", "degF", "%", "M",
                          "MM", "k", "a", "s", "(", ")", "/", "*", "**", "0", "1", "^", "-", " ", "·", "µ", "°",
                          "ｍ", "ⅿ", "\u200b", "e", "E", "inf", "nan"])


@settings(max_examples=300, deadline=None)
@given(number=st.sampled_from(["3", "-3", "1/2", "1-1/2", "0", "1e3", "1e400", ".5", "3,000"]),
       unit=st.lists(PIECES, max_size=6).map("".join),
       kind=st.sampled_from(["length", "pressure", "differential", "temperature", "flow", "mass_flow", "fraction"]))
def test_any_quantity_string_is_read_by_the_grammar_or_refused_in_words(number, unit, kind):
    # Never an exception but ours; anything read is finite and its unit is one the
    # grammar lists for that kind (after the typed spellings).
    text = f"{number} {unit}"
    try:
        value = getattr(q, kind)("design.x", text)
    except InputError:
        return
    value = getattr(value, "value", getattr(value, "pascal", value))
    assert math.isfinite(value)
    read = q._read(text)
    assert isinstance(read, tuple) and any(read[1] in spellings for spellings in q.GRAMMAR.values()), text
