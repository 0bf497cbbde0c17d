"""The return line and the other two ways a unit hammers: Joukowsky's surge with
Korteweg's wave speed, and the flow-pattern maps, checked against hand arithmetic,
IAPWS-95 (the `iapws` package) and the maps as `fluids` publishes them."""

import math
import subprocess
import sys

import pytest
from conftest import BASE_UNIT, ROOT
from iapws import IAPWS95, IAPWS97

from stallcheck import analysis
from stallcheck.files import unitfile
from stallcheck.physics import hammer, properties
from stallcheck.render import words

FT = 0.3048
PSI = 6894.757293168
LB_FT3 = 0.45359237 / FT ** 3


def test_joukowsky_for_a_column_stopped_at_ten_feet_a_second():
    # Common practice: 1 ft³ of water weighs about 62.4 lb; a column at 10 ft/s stopped
    # at once in steel pipe (a = 4,000 to 4,700 ft/s) rises by about 550-650 psi.
    # Arithmetic: 62.4 lb/ft³ / 32.174 ft/s² x 4,300 ft/s x 10 ft/s / 144 in²/ft² = 579 psi.
    rise = hammer.joukowsky(62.4 * LB_FT3, 4300 * FT, 10 * FT) / PSI
    assert rise == pytest.approx(62.4 / 32.174 * 4300 * 10 / 144, rel=1e-4)
    assert 550 <= rise <= 650
    for a in (4000, 4700):
        assert 530 <= hammer.joukowsky(62.4 * LB_FT3, a * FT, 10 * FT) / PSI <= 650


def test_wave_speed_in_a_rigid_pipe_is_the_speed_of_sound():
    # IAPWS-95 (iapws): about 1,482 m/s in water at 20 °C and 1 atm.
    water = IAPWS95(T=293.15, P=0.101325)
    k = water.rho * water.w ** 2
    assert hammer.wave_speed(k, water.rho, 0.1, 0.005, 1e30) == pytest.approx(water.w, rel=1e-9)
    assert water.w == pytest.approx(1482, abs=2)


def test_the_speed_of_sound_in_saturated_condensate_is_iapws_s():
    # IAPWS-IF97 region 1 at saturation (iapws) against the property layer.
    for p in (0.101325, 0.5, 1.0):
        assert float(properties.liquid_sound_speed(p * 1e6)) == pytest.approx(IAPWS97(P=p, x=0).w, rel=1e-6)


def test_korteweg_on_a_thin_steel_pipe():
    # The form of Wylie & Streeter, Fluid Transients in Systems (1993), eq. 2.6 with
    # c1 = 1, worked by hand: K = 2.19 GPa, ρ = 998.2 kg/m³, D = 1 m, e = 10 mm,
    # E = 207 GPa (values from memory):
    # a = √(2.19e9/998.2 / (1 + 2.19e9·100/207e9)) = √(2.19399e6/2.05797) = 1,032.5 m/s.
    a = hammer.wave_speed(2.19e9, 998.2, 1.0, 0.010, 207e9)
    assert a == pytest.approx(math.sqrt(2.19e9 / 998.2 / (1 + 2.19e9 * 100 / 207e9)), rel=1e-12)
    assert a == pytest.approx(1032.5, abs=0.5)


def test_a_closure_slower_than_the_round_trip_lowers_the_surge():
    # Michaud: closing over 2x the round trip 2L/a halves Joukowsky's rise (hand).
    rho, a, dv, length = 960.0, 1300.0, 2.0, 100.0
    sudden = hammer.joukowsky(rho, a, dv)
    assert hammer.surge(rho, a, dv, length, 0.0) == sudden
    assert hammer.surge(rho, a, dv, length, 2 * length / a) == sudden
    assert hammer.surge(rho, a, dv, length, 4 * length / a) == pytest.approx(sudden / 2, rel=1e-12)


def _td(m, x, d, alpha=0.0, rhol=958.0, rhog=0.6, mul=2.8e-4, mug=1.2e-5):
    """Our Taitel & Dukler from a mass flow and quality (as fluids takes them)."""
    area = math.pi * d ** 2 / 4
    return hammer.taitel_dukler(m * (1 - x) / (rhol * area), m * x / (rhog * area), rhol, rhog, mul, mug, d, alpha)


def test_taitel_dukler_written_out_agrees_with_fluids_on_a_level_pipe():
    # Independent: fluids' Taitel_Dukler_regime (the paper's curves, digitised) for a
    # level pipe, over 600 generated flows of condensate and flash steam at 1 atm. Points
    # within a 25 % change of flow or quality of a boundary are left out: there a
    # digitised curve and the mechanistic model may fall either side.
    import random

    from fluids.two_phase import Taitel_Dukler_regime

    rng = random.Random(20261205)
    props = dict(rhol=958.0, rhog=0.6, mul=2.8e-4, mug=1.2e-5)
    judged = agree = 0
    seen = set()
    for _ in range(600):
        d, m, x = 10 ** rng.uniform(-2, -0.7), 10 ** rng.uniform(-3, 0.5), 10 ** rng.uniform(-4, -0.3)
        ref = Taitel_Dukler_regime(m=m, x=x, D=d, angle=0.0, **props)[0]
        if any(Taitel_Dukler_regime(m=m * a, x=x * b, D=d, angle=0.0, **props)[0] != ref
               for a in (0.8, 1.25) for b in (0.8, 1.25)):
            continue
        judged += 1
        agree += _td(m, x, d, **props) == ref
        seen.add(ref)
    assert judged > 400 and agree >= 0.99 * judged
    assert seen >= {"stratified smooth", "stratified wavy", "intermittent", "annular"}


def test_the_pitch_of_the_line_moves_the_pattern_as_the_paper_s_y_term_says():
    # Taitel & Dukler (1976), Y = (ρ_L − ρ_G)·g·sin α/(dp/dx)_Gs: a line falling with the
    # flow (α > 0) thins the liquid and keeps it stratified; one rising against it
    # (α < 0) thickens it into slugs. A flow that slugs in a level 25 mm line: pitched
    # 5 % down it runs stratified; pitched 5 % up it still slugs. fluids, which takes
    # only cos α, gives the same pattern for all three (the fault this replaces).
    from fluids.two_phase import Taitel_Dukler_regime

    m, x, d = 0.25, 0.003, 0.025
    level = _td(m, x, d)
    assert level == "intermittent"
    assert _td(m, x, d, math.atan(0.05)).startswith("stratified")
    assert _td(m, x, d, -math.atan(0.05)) == "intermittent"
    theirs = {Taitel_Dukler_regime(m=m, x=x, D=d, angle=a, rhol=958.0, rhog=0.6, mul=2.8e-4, mug=1.2e-5)[0]
              for a in (-2.86, 0.0, 2.86)}
    assert theirs == {"intermittent"}


def test_the_maps_need_no_scipy():
    # Our Taitel & Dukler is plain arithmetic; Mandhane's map comes from fluids, whose
    # import brings no SciPy (SciPy would cost more than a whole check).
    code = ("import sys\nfrom stallcheck import analysis\nfrom stallcheck.files import unitfile\n"
            f"r = analysis.analyse(unitfile.load({str(ROOT / 'sample_units' / 'us_outdoor_air_preheat.toml')!r}))\n"
            "assert r.return_line is not None\nprint('scipy' in sys.modules)")
    assert subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                          check=True).stdout.strip() == "False"


@pytest.mark.parametrize("v_ls, v_gs, pattern", [
    # Points read from the Mandhane-Gregory-Aziz map (Int. J. Multiphase Flow 1, 1974,
    # Fig. 8; superficial velocities in ft/s; from memory, well inside each region).
    (0.02, 1.0, "stratified"), (0.05, 40.0, "wave"), (1.0, 10.0, "slug"), (0.3, 200.0, "annular mist"),
    (1.0, 0.5, "elongated bubble"), (20.0, 1.0, "dispersed bubble"),
])
def test_mandhane_map_points(v_ls, v_gs, pattern):
    from fluids.two_phase import Mandhane_Gregory_Aziz_regime

    rho_l, rho_g, d = 1000.0, 1.2, 0.05
    area = math.pi * d ** 2 / 4
    gas, liquid = v_gs * FT * rho_g * area, v_ls * FT * rho_l * area
    got = Mandhane_Gregory_Aziz_regime(m=gas + liquid, x=gas / (gas + liquid), rhol=rho_l, rhog=rho_g, mul=1e-3,
                                       mug=1.8e-5, sigma=0.072, D=d)
    assert got[0] == pattern


def _unit(extra: str, lift: str = "0 ft", arrangement: str = "trap"):
    text = BASE_UNIT.replace('lift = "0 ft"', f'lift = "{lift}"').replace('arrangement = "trap"',
                                                                          f'arrangement = "{arrangement}"')
    return unitfile.parse(text + extra, "hammer.toml")


def test_a_pump_trap_discharge_surge_by_hand():
    # 2,000 lb/h through 1 in (25.4 mm) of Schedule 40 steel (wall 0.133 in), 10 ft of
    # lift: v = w/(ρ·A), a by Korteweg with K = ρc² of the condensate, Δp = ρ·a·v.
    u = _unit('motive_pressure = "60 psig"\npump_rate = "2000 lb/h"\nreturn_line = "1 in"\n',
              lift="10 ft", arrangement="pump-trap")
    r = analysis.analyse(u)
    sh = r.surge
    p = r.back_pressure
    water = IAPWS97(P=p / 1e6, x=0)
    v = 2000 * 0.45359237 / 3600 / (water.rho * math.pi * 0.0254 ** 2 / 4)
    a = math.sqrt(water.rho * water.w ** 2 / water.rho / (1 + water.rho * water.w ** 2 * 0.0254
                                                          / (200e9 * 0.133 * 0.0254)))
    assert sh.basis == "pump-trap" and sh.velocity == pytest.approx(v, rel=1e-5)
    assert sh.wave_speed == pytest.approx(a, rel=1e-5)
    assert sh.surge == pytest.approx(water.rho * a * v, rel=1e-5)
    assert sh.peak == pytest.approx(p + sh.surge, rel=1e-12)


def test_a_pump_rate_in_gpm_is_a_volume_of_condensate():
    # 5 US gpm (3.785411784 L each, exact) of condensate moves at v = Q/A whatever its
    # density: the velocity by hand, and the same surge as its mass flow at the
    # line's saturated liquid density (IAPWS-IF97, iapws)
    u = _unit('motive_pressure = "60 psig"\npump_rate = "5 gpm"\nreturn_line = "1 in"\n',
              lift="10 ft", arrangement="pump-trap")
    r = analysis.analyse(u)
    v = 5 * 3.785411784e-3 / 60 / (math.pi * 0.0254 ** 2 / 4)
    assert r.surge.velocity == pytest.approx(v, rel=1e-9)
    rho = IAPWS97(P=r.back_pressure / 1e6, x=0).rho
    mass = _unit(f'motive_pressure = "60 psig"\npump_rate = "{float(5 * 3.785411784e-3 / 60 * rho * 3600)!r} kg/h"\n'
                 'return_line = "1 in"\n', lift="10 ft", arrangement="pump-trap")
    assert analysis.analyse(mass).surge.surge == pytest.approx(r.surge.surge, rel=1e-4)


def test_the_closing_time_printed_holds_the_surge_when_applied():
    # Advice that survives being followed: the slower closure printed, put in the unit
    # file, takes the peak below 80 % of the rating, and the finding goes.
    extra = ('motive_pressure = "60 psig"\npump_rate = "3000 lb/h"\nreturn_line = "1 in"\nreturn_length = "100 ft"\n'
             'return_rating = "50 psig"\n')
    r = analysis.analyse(_unit(extra, lift="10 ft", arrangement="pump-trap"))
    shock = next(f for f in r.findings if f.code == "hydraulic-shock")
    text = words.finding(shock, r, "us")
    assert shock.severity == "danger" and "non-slam" in text
    seconds = text.split("close it over at least ")[1].split(" s")[0]
    again = analysis.analyse(_unit(extra + f'check_closing_time = "{seconds} s"\n', lift="10 ft",
                                   arrangement="pump-trap"))
    assert again.surge.peak < 0.8 * again.surge.rating
    assert again.surge.slowed and not r.surge.slowed  # Michaud's rise, below Joukowsky's
    assert "hydraulic-shock" not in {f.code for f in again.findings}


def _full_load_condensate_by_hand(steam_psig: float) -> float:
    """BASE_UNIT's condensate at full load [kg/s], worked outside the program: 6,000
    cfm of standard air (1.204 kg/m³, cp 1.006 kJ/(kg·K); ASHRAE standard air) heated
    60 degF (33.33 K), over IF97's latent heat (iapws) at the design pressure."""
    load = 6000 * FT ** 3 / 60 * 1.204 * 1006 * 60 / 1.8
    p = (101.325 + steam_psig * PSI / 1000) / 1000
    latent = IAPWS97(P=p, x=1).h - IAPWS97(P=p, x=0).h
    return load / (latent * 1000)


def test_a_lift_after_a_plain_trap_stops_the_trap_s_discharge_not_a_free_fall():
    # The trap's full-load discharge rising in the lift, stopped when it shuts: the
    # velocity is the condensate over the bore (Wylie & Streeter's rigid column: a
    # column thrown up a riser falls back no faster than it rose); Joukowsky on it.
    r = analysis.analyse(_unit('return_line = "1 in"\n', lift="10 ft"))
    sh = r.surge
    water = IAPWS97(P=r.back_pressure / 1e6, x=0)
    v = _full_load_condensate_by_hand(5.0) / (water.rho * math.pi * 0.0254 ** 2 / 4)
    assert sh.basis == "lift" and sh.velocity == pytest.approx(v, rel=1e-3)
    free_fall = math.sqrt(2 * 9.80665 * 10 * FT)   # 7.7 m/s: what a free fall would give
    assert sh.velocity < free_fall / 20
    assert sh.surge == pytest.approx(water.rho * sh.wave_speed * v, rel=1e-3)
    shock = next(f for f in r.findings if f.code == "hydraulic-shock")
    text = words.finding(shock, r, "us")
    assert shock.severity == "info" and "drain.return_rating" in text and "free fall" not in text
    assert "no published method" in text   # the flash-driven shock: said in words, no number


@pytest.mark.parametrize("lift", ["10 ft", "15 ft", "4 m"])
def test_a_rated_lift_is_not_a_danger_by_itself(lift):
    # A 1 in line rated 150 psig (a class 150 screwed line; common practice) under an
    # ordinary lift: the trap's own discharge stopped raises it by about 20-40 psi.
    r = analysis.analyse(_unit('return_line = "1 in"\nreturn_rating = "150 psig"\n', lift=lift))
    assert r.surge.basis == "lift"
    assert r.surge.peak < 0.8 * r.surge.rating
    assert "hydraulic-shock" not in {f.code for f in r.findings}


def test_a_lift_s_check_valve_closing_time_is_used_and_the_printed_one_holds():
    # Michaud (Thorley 2004, section 2.3): a closure slower than 2L/a rises by
    # 2·ρ·L·Δv/t_c. The closing time printed for a lift, applied, clears the finding.
    extra = 'return_line = "1 in"\nreturn_length = "300 ft"\nreturn_rating = "15 psig"\n'
    r = analysis.analyse(_unit(extra, lift="10 ft"))
    shock = next(f for f in r.findings if f.code == "hydraulic-shock")
    assert shock.severity == "danger"
    text = words.finding(shock, r, "us")
    seconds = text.split("close it over at least ")[1].split(" s")[0]
    again = analysis.analyse(_unit(extra + f'check_closing_time = "{seconds} s"\n', lift="10 ft"))
    sh = again.surge
    assert sh.closing_time == float(seconds)
    assert sh.surge == pytest.approx(2 * sh.density * 300 * FT * sh.velocity / float(seconds), rel=1e-9)
    assert sh.peak < 0.8 * sh.rating and "hydraulic-shock" not in {f.code for f in again.findings}


@pytest.mark.parametrize("pitch, severity", [("-1 %", "warning"), ("0.1 %", "info"), ("1 %", None)])
def test_the_line_s_pitch(pitch, severity):
    # Common practice (from memory): a return falls at least 1 in in 40 ft with the flow.
    r = analysis.analyse(_unit(f'return_line = "1 in"\nreturn_pitch = "{pitch}"\n'))
    found = [f.severity for f in r.findings if f.code == "return-line-pitch"]
    assert found == ([severity] if severity else [])


def test_the_bore_printed_for_slug_flow_keeps_the_line_stratified_when_applied():
    from test_diagnosis import LOW_PRESSURE_HEATER

    u = unitfile.parse(LOW_PRESSURE_HEATER + 'return_line = "25 mm"\nreturn_pitch = "1 %"\n', "heater.toml")
    r = analysis.analyse(u)
    slug = next(f for f in r.findings if f.code == "return-line-slug-flow")
    text = words.finding(slug, r, "si")
    bore = text.split("line (")[1].split(" bore")[0]
    assert r.return_line.points[0].taitel_dukler == "intermittent"
    again = analysis.analyse(unitfile.parse(LOW_PRESSURE_HEATER + f'return_line = "{bore}"\nreturn_pitch = "1 %"\n',
                                            "heater.toml"))
    assert not again.return_line.slugging
    assert all(p.taitel_dukler in hammer.STRATIFIED for p in again.return_line.points)


def test_the_chart_and_the_survey_show_the_worst_pattern(tmp_path):
    from test_diagnosis import LOW_PRESSURE_HEATER
    from typer.testing import CliRunner

    from stallcheck.cli import app

    unit = tmp_path / "heater.toml"
    unit.write_text(LOW_PRESSURE_HEATER + 'return_line = "25 mm"\nreturn_pitch = "1 %"\n', encoding="utf-8")
    chart = CliRunner().invoke(app, ["chart", str(unit)], env={"NO_COLOR": "1"}).stdout
    assert "return line from the trap, at worst: intermittent (full load)" in chart
    survey = CliRunner().invoke(app, ["survey", str(tmp_path)], env={"NO_COLOR": "1"}).stdout
    assert "return line intermittent" in " ".join(survey.split())


@pytest.mark.parametrize("v_ls, v_gs, pattern", [
    # The corners of Taitel & Dukler's horizontal map (AIChE J. 22(1), 1976, Fig. 4, as
    # redrawn for air and water at 1 atm in a 50 mm pipe; from memory, well inside each
    # region): slow flows lie stratified, fast gas runs annular, a fast liquid with some
    # gas slugs, a fast liquid with little gas carries it as dispersed bubbles.
    (0.01, 0.5, "stratified smooth"), (0.01, 30.0, "annular"), (1.0, 2.0, "intermittent"), (5.0, 0.1, "bubbly"),
])
def test_taitel_dukler_map_corners(v_ls, v_gs, pattern):
    d = 0.05
    area = math.pi * d ** 2 / 4
    liquid, gas = v_ls * 998 * area, v_gs * 1.2 * area
    assert _td(liquid + gas, gas / (liquid + gas), d, 0.0, rhol=998.0, rhog=1.2, mul=1e-3, mug=1.8e-5) == pattern


def test_every_new_finding_shows_in_a_sample():
    from conftest import SAMPLES

    codes = {f.code for s in SAMPLES for f in analysis.analyse(unitfile.load(s)).findings}
    assert {"return-line-slug-flow", "return-line-pitch", "hydraulic-shock"} <= codes


def _examples(default: int) -> int:
    import os

    return int(os.environ.get("STALLCHECK_EXAMPLES", "0")) or default


from hypothesis import given, settings  # noqa: E402
from hypothesis import strategies as st  # noqa: E402
from test_properties_of_units import si_text  # noqa: E402
from test_properties_of_units import units as generated_units

LINES = st.fixed_dictionaries({
    "bore": st.floats(5, 200), "length": st.floats(1, 500), "pitch": st.floats(-5, 5),
    "material": st.sampled_from(["steel", "copper"]), "wall": st.one_of(st.none(), st.floats(0.5, 10)),
    "rating": st.one_of(st.none(), st.floats(1, 40)), "rate": st.one_of(st.none(), st.floats(10, 20000)),
    "closing": st.floats(0, 5),
})


@settings(max_examples=_examples(40), deadline=None)
@given(generated_units, LINES)
def test_any_return_line_analyses_and_holds_its_invariants(d, line):
    # Physics the figures must obey whatever the line: the wave speed in an elastic pipe
    # is below the speed of sound in the water (Korteweg); a surge only raises the
    # pressure, and never above Joukowsky's for the same column; a bore offered for
    # slug flow is a standard one no smaller than the line's.
    from stallcheck.errors import InputError

    extra = (f'return_line = "{line["bore"]:.2f} mm"\nreturn_length = "{line["length"]:.1f} m"\n'
             f'return_pitch = "{line["pitch"]:.2f} %"\nreturn_material = "{line["material"]}"\n'
             f'check_closing_time = "{line["closing"]:.2f} s"\n')
    if line["wall"] is not None:
        extra += f'return_wall = "{line["wall"]:.2f} mm"\n'
    if line["rating"] is not None:
        extra += f'return_rating = "{line["rating"]:.1f} barg"\n'
    if line["rate"] is not None:
        extra += f'pump_rate = "{line["rate"]:.0f} kg/h"\n'
    try:
        u = unitfile.parse(si_text(d) + extra, "line.toml")
        r = analysis.analyse(u)
    except InputError:
        return  # a generated unit the format refuses (its own ranges)
    line_ = r.return_line
    assert line_ is not None and line_.points and line_.points[0].where == "full load"
    for p in line_.points:
        assert 0.0 <= p.flash_fraction < 1.0 and p.condensate >= 0.0
    if line_.stratified_bore is not None:
        assert line_.slugging and line_.stratified_bore + 1e-9 >= line_.bore
    sh = r.surge
    if sh is not None:
        c = float(properties.liquid_sound_speed(sh.working))
        assert 0 < sh.wave_speed < c
        assert 0 <= sh.surge <= hammer.joukowsky(sh.density, sh.wave_speed, sh.velocity) * (1 + 1e-12)
        assert sh.peak == pytest.approx(sh.working + sh.surge, rel=1e-12)
    for f in r.findings:
        assert words.finding(f, r, "si") and words.finding(f, r, "us")


def test_the_standard_wall_is_that_of_the_nearest_schedule_40_bore():
    # ASME B36.10M Schedule 40 (from memory): 2 in, bore 2.067 in, wall 0.154 in;
    # 1/2 in, bore 0.622 in, wall 0.109 in.
    assert hammer.standard_wall(2.0 * 0.0254) == pytest.approx(0.154 * 0.0254)
    assert hammer.standard_wall(0.6 * 0.0254) == pytest.approx(0.109 * 0.0254)



def test_the_line_s_pattern_is_both_maps_with_saturated_properties():
    # The check feeds the maps saturated water and steam at the line's pressure (IF97
    # via iapws for the densities and viscosities) and reports what each map says, at
    # each load it judges; a line with no flash runs liquid by both accounts.
    from fluids.two_phase import Mandhane_Gregory_Aziz_regime

    r = analysis.analyse(_unit('return_line = "1 in"\n'))
    p = r.return_pressure
    liquid, steam = IAPWS97(P=p / 1e6, x=0), IAPWS97(P=p / 1e6, x=1)
    bore = 0.0254
    flashing = [point for point in r.return_line.points if point.flash_fraction > hammer.NO_FLASH]
    assert flashing and len(r.return_line.points) >= 2
    for point in flashing:
        m, x = point.condensate, point.flash_fraction
        assert point.taitel_dukler == _td(m, x, bore, 0.0, rhol=liquid.rho, rhog=steam.rho, mul=liquid.mu,
                                          mug=steam.mu)
        assert point.mandhane == Mandhane_Gregory_Aziz_regime(m=m, x=x, rhol=liquid.rho, rhog=steam.rho,
                                                              mul=liquid.mu, mug=steam.mu, sigma=0.0589, D=bore)[0]
        assert point.slugging is (point.taitel_dukler == "intermittent")
    # a return above the coil's pressure: nothing flashes, the line runs liquid
    text = BASE_UNIT.replace('return_pressure = "0 psig"', 'return_pressure = "10 psig"')
    flooded = analysis.analyse(unitfile.parse(text + 'return_line = "1 in"\n', "hammer.toml"))
    for point in flooded.return_line.points:
        assert (point.taitel_dukler, point.mandhane, point.slugging) == (hammer.LIQUID, hammer.LIQUID, False)


# --- a lift after the trap: vertical upflow ----------------------------------------------

#: Air and water at 25 °C and 1 atm, the fluids of Taitel, Barnea & Dukler's (1980)
#: published map: densities 997 and 1.18 kg/m³, water viscosity 0.89 mPa·s, surface
#: tension 0.072 N/m (handbook values, from memory).
AIR_WATER = dict(rho_l=997.0, rho_g=1.18, mu_l=8.9e-4, sigma=0.072)


@pytest.mark.parametrize("u_ls, u_gs, bore, height, pattern", [
    # Regions of Taitel, Barnea & Dukler (AIChE J. 26(3), 1980), Fig. 5-6, air-water in
    # a 5 cm tube (from memory; well inside each region): annular above about 15 m/s of
    # gas; slug at a few m/s of gas and little liquid in a tall tube; dispersed bubble at
    # several m/s of liquid; bubbly at low gas in a tube wider than D* (about 5 cm for
    # air-water); churn in a tube shorter than its entry length.
    (0.1, 20.0, 0.05, 10.0, "annular"), (0.1, 1.0, 0.05, 10.0, "slug"), (5.0, 0.5, 0.05, 10.0, "dispersed bubble"),
    (0.5, 0.05, 0.10, 10.0, "bubbly"), (0.5, 0.05, 0.04, 10.0, "slug"), (0.1, 5.0, 0.05, 1.0, "churn"),
])
def test_vertical_upflow_regions_of_the_published_map(u_ls, u_gs, bore, height, pattern):
    assert hammer.vertical_regime(u_ls, u_gs, bore=bore, height=height, **AIR_WATER) == pattern


def test_vertical_upflow_transitions_by_hand():
    # The transitions worked by hand from the paper's equations, air-water: annular where
    # U_Gs·√ρ_G/(σ·g·Δρ)^¼ = 3.1 (eq. 20); bubbly below U_Ls = 3·U_Gs − 1.15·(g·Δρ·σ/ρ_L²)^¼
    # (eq. 4) in a tube wider than D* = 19·√(Δρ·σ/(ρ_L²·g)) (eq. 9); churn in a tube
    # shorter than l_E = 40.6·(U_M/√(g·D) + 0.22)·D (eq. 21).
    g, rl, rg, s = 9.80665, 997.0, 1.18, 0.072
    annular = 3.1 * (s * g * (rl - rg)) ** 0.25 / math.sqrt(rg)
    assert 14 < annular < 15.5   # "about 15 m/s" in the paper's air-water figure
    assert hammer.vertical_regime(0.05, 1.02 * annular, bore=0.05, height=50, **AIR_WATER) == "annular"
    assert hammer.vertical_regime(0.05, 0.98 * annular, bore=0.05, height=50, **AIR_WATER) != "annular"
    d_star = 19 * math.sqrt((rl - rg) * s / (rl ** 2 * g))
    assert 0.045 < d_star < 0.055
    u_gs = 0.1
    edge = 3.0 * u_gs - 1.15 * (g * (rl - rg) * s / rl ** 2) ** 0.25
    assert hammer.vertical_regime(1.05 * edge, u_gs, bore=0.1, height=50, **AIR_WATER) == "bubbly"
    assert hammer.vertical_regime(0.95 * edge, u_gs, bore=0.1, height=50, **AIR_WATER) == "slug"
    u_ls, u_gs, d = 0.1, 3.0, 0.05
    entry = 40.6 * ((u_ls + u_gs) / math.sqrt(g * d) + 0.22) * d
    assert hammer.vertical_regime(u_ls, u_gs, bore=d, height=0.95 * entry, **AIR_WATER) == "churn"
    assert hammer.vertical_regime(u_ls, u_gs, bore=d, height=1.05 * entry, **AIR_WATER) == "slug"


def test_flash_is_given_at_the_trap_outlet_and_grows_up_the_lift():
    # x = (h_f(p_coil) − h_f(p)) / h_fg(p) (IF97, iapws) at the trap outlet, whose pressure
    # is the return plus the lift's head ρ·g·h (ρ saturated at the return), and at the
    # return itself: 10 ft of lift to an open return from a coil at 5 psig.
    r = analysis.analyse(_unit('return_line = "1 in"\n', lift="10 ft"))
    p_coil = r.design.coil_pressure
    back = 101325.0 + IAPWS97(P=0.101325, x=0).rho * 9.80665 * 10 * FT

    def x(p):
        return (IAPWS97(P=p_coil / 1e6, x=0).h - IAPWS97(P=p / 1e6, x=0).h) / (
            IAPWS97(P=p / 1e6, x=1).h - IAPWS97(P=p / 1e6, x=0).h)

    fl = r.flash
    assert fl.outlet_pressure == pytest.approx(back, rel=1e-6)
    assert fl.fraction == pytest.approx(x(back), rel=1e-4)
    assert fl.return_fraction == pytest.approx(x(101325.0), rel=1e-4)
    assert fl.return_fraction > 2 * fl.fraction
    # the riser is judged at both ends; without a lift there is no riser
    assert all(p.riser is not None for p in r.return_line.points)
    flat = analysis.analyse(_unit('return_line = "1 in"\n'))
    assert all(p.riser is None for p in flat.return_line.points)
    assert flat.flash.fraction == flat.flash.return_fraction
