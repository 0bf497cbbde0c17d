"""Reading unit files: every bad input is an InputError naming the key and what is
accepted; good input arrives in SI with absolute pressures."""


import pytest
from conftest import BASE_UNIT

from stallcheck.errors import InputError
from stallcheck.files import quantities, unitfile
from stallcheck.files import display
from stallcheck.physics import atmosphere

PSI = 6894.757


def parse(**replace):
    text = BASE_UNIT
    for old, new in replace.items():
        assert old in text, old
        text = text.replace(old, new)
    return unitfile.parse(text, "bad.toml")


def test_good_unit_in_si():
    u = parse()
    assert u.design.steam_pressure == pytest.approx(101325 + 5 * PSI, rel=1e-7)
    assert u.design.inlet_temperature == pytest.approx((-10 - 32) / 1.8 + 273.15)
    assert u.design.flow == pytest.approx(6000 * 0.3048 ** 3 / 60)  # m³/s, not centi-fermi
    assert u.drain.fill_head == pytest.approx(18 * 0.0254)
    assert u.system == "us"
    assert any("atmospheric pressure 101.325 kPa" in d for d in u.defaults)


def test_gauge_follows_elevation():
    u = parse(**{"[design]": '[site]\nelevation = "1600 m"\n[design]'})
    atm = atmosphere.pressure_at(1600)
    assert u.site.atmospheric_pressure == pytest.approx(atm)
    assert u.supply_pressure == pytest.approx(atm + 15 * PSI)


@pytest.mark.parametrize("old, new, key, fragment", [
    ('steam_pressure = "5 psig"', 'steam_pressure = "5 psi"', "design.steam_pressure", "psig"),
    ('steam_pressure = "5 psig"', 'steam_pressure = "5 ft"', "design.steam_pressure", "not a pressure"),
    ('steam_pressure = "5 psig"', "steam_pressure = 5", "design.steam_pressure", "quantity string"),
    ('flow = "6000 cfm"', 'flow = "0 cfm"', "design.flow", "greater than zero"),
    ('flow = "6000 cfm"', 'flow = "-5 cfm"', "design.flow", "greater than zero"),
    ('flow = "6000 cfm"', 'flow = "nan cfm"', "design.flow", "finite"),
    ('medium = "air"', 'medium = "steam"', "design.medium", "air, water"),
    ('arrangement = "trap"', 'arrangement = "bucket"', "drain.arrangement", "pump-trap"),
    ('supply_pressure = "15 psig"', 'supply_pressure = "4 psig"', "steam.supply_pressure", "not above"),
    ('outlet_temperature = "50 degF"', 'outlet_temperature = "-20 degF"', "design.outlet_temperature", "above the inlet"),
    ("cv = 10", "cv = 0", "valve.cv", "out of range"),
    ("cv = 10", 'cv = "10"', "valve.cv", "plain number"),
    ('lift = "0 ft"', 'lift = "-2 ft"', "drain.lift", "negative"),
    ('return_pressure = "0 psig"', 'return_pressure = "-20 psig"', "drain.return_pressure", "absolute zero"),
    ('fill_head = "18 in"', 'fill_head = "18 wibbles"', "drain.fill_head", "unknown unit"),
])
def test_bad_values_name_the_key(old, new, key, fragment):
    with pytest.raises(InputError, match=fragment) as err:
        parse(**{old: new})
    assert err.value.key == key
    assert "bad.toml" in str(err.value)


def test_missing_section_and_key():
    with pytest.raises(InputError, match=r"\[drain\] is missing"):
        unitfile.parse(BASE_UNIT.split("[drain]")[0], "x.toml")
    with pytest.raises(InputError, match="design.flow"):
        parse(**{'flow = "6000 cfm"\n': ""})


def test_toml_syntax_error_gives_the_line():
    with pytest.raises(InputError) as err:
        unitfile.parse('format = 1\n[unit]\nname = "x\n', "broken.toml")
    assert err.value.line == 3 and "not valid TOML" in str(err.value)


def test_unknown_key_is_refused_with_nearest():
    with pytest.raises(InputError, match="unknown key; did you mean 'return_pressure'") as err:
        parse(**{'lift = "0 ft"': 'lift = "0 ft"\nretrun_pressure = "0 psig"'})
    assert err.value.key == "drain.retrun_pressure" and err.value.line is not None


def test_differential_refuses_gauge():
    with pytest.raises(InputError, match="neither gauge nor absolute"):
        parse(**{'lift = "0 ft"': 'lift = "0 ft"\ntrap_min_differential = "0.25 psig"'})


def test_capacity_table_must_increase():
    rows = '\n[[drain.capacity]]\ndifferential = "2 psi"\nflow = "900 lb/h"\n[[drain.capacity]]\ndifferential = "1 psi"\nflow = "600 lb/h"\n'
    with pytest.raises(InputError, match="increase"):
        unitfile.parse(BASE_UNIT + rows, "x.toml")


@pytest.mark.parametrize("content, fragment", [
    (b"", "format"), (b"\x00\x01\x02", "binary"), (b'format = 1\nname = "\xff\xfe"\n', "UTF-8"),
])
def test_unreadable_files(tmp_path, content, fragment):
    path = tmp_path / "u.toml"
    path.write_bytes(content)
    with pytest.raises(InputError, match=fragment):
        unitfile.load(path)


def test_missing_file_and_folder(tmp_path):
    with pytest.raises(InputError, match="no such file"):
        unitfile.load(tmp_path / "nope.toml")
    with pytest.raises(InputError, match="folder"):
        unitfile.load(tmp_path)


DRAIN_END = 'return_pressure = "0 psig"'


@pytest.mark.parametrize("extra, key, fragment", [
    ('return_line = "0 in"', "drain.return_line", "greater than zero"),
    ('trap_orifice = "-3 mm"', "drain.trap_orifice", "greater than zero"),
    ('pump_capacity = "-100 lb/h"', "drain.pump_capacity", "greater than zero"),
    ('motive_pressure = "50 psi"', "drain.motive_pressure", "psig"),
    ('purge_orifice = "2 mm"\npurge_rate = "5 kg/h"', "drain.purge_orifice", "not both"),
    ("capacity_margin = 0.5", "drain.capacity_margin", "out of range"),
    ('return_temperature = "400 degC"', "drain.return_temperature", "out of range"),
    ('[[drain.capacity]]\ndifferential = "1 psi"\nflow = "-900 lb/h"\n'
     '[[drain.capacity]]\ndifferential = "2 psi"\nflow = "1200 lb/h"', "drain.capacity[1].flow", "greater than zero"),
    ('[[drain.capacity]]\ndifferential = "2 psi"\nflow = "900 lb/h"\n'
     '[[drain.capacity]]\ndifferential = "1 psi"\nflow = "1200 lb/h"', "drain.capacity", "increase"),
])
def test_bad_drain_device_keys_name_the_key(extra, key, fragment):
    with pytest.raises(InputError, match=fragment) as err:
        parse(**{DRAIN_END: DRAIN_END + "\n" + extra})
    assert err.value.key == key


def test_steam_price_basis_follows_the_file_units():
    u = parse(**{"[design]": "[site]\nsteam_price = 15\n[design]"})
    assert u.site.steam_price_per == pytest.approx(453.59237)  # 1000 lb: the file is in US units
    assert any("steam_price_per" in d for d in u.defaults)
    with pytest.raises(InputError, match="without site.steam_price"):
        parse(**{"[design]": '[site]\nsteam_price_per = "1 t"\n[design]'})


def test_quantities_read_through_the_shipped_answers_convert_as_pint_does():
    # Independent: pint itself (the registry) against quantities read as a run reads
    # them, from the answers shipped with the package.
    texts = ["15 psig", "-10 degF", "6000 cfm", "18 in", "900 lb/h", "2.5 barg", "30 gpm"]
    first = [display.convert(1.0, "pressure_abs", "us")] + [
        quantities._magnitude("k", t, quantities._quantity("k", t, dim, "", "")[0], si)
        for t, dim, si in [(texts[0], "Pa", "Pa"), (texts[1], "K", "K"), (texts[2], "m**3/s", "m**3/s"),
                           (texts[3], "m", "m"), (texts[4], "kg/s", "kg/s"), (texts[5], "Pa", "Pa"),
                           (texts[6], "m**3/s", "m**3/s")]]
    ureg = quantities.registry()
    by_pint = [ureg.Quantity(1.0, "Pa").to("psi").magnitude, ureg.Quantity(15, "psig").to("Pa").magnitude,
               ureg.Quantity(-10, "degF").to("K").magnitude, ureg.Quantity(6000, "cfm").to("m**3/s").magnitude,
               ureg.Quantity(18, "inch").to("m").magnitude, ureg.Quantity(900, "lb/h").to("kg/s").magnitude,
               ureg.Quantity(2.5, "barg").to("Pa").magnitude, ureg.Quantity(30, "gpm").to("m**3/s").magnitude]
    assert first == pytest.approx(by_pint, rel=1e-12)


def test_pressure_spellings_with_brackets_are_read():
    from stallcheck.files import quantities

    assert quantities.pressure("k", "101 kPa(a)") == quantities.pressure("k", "101 kPaa")
    assert quantities.pressure("k", "2 bar(g)") == quantities.pressure("k", "2 barg")
