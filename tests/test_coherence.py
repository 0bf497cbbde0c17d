"""One story per unit: over generated units of every arrangement (hypothesis,
derandomised in CI; ``STALLCHECK_EXAMPLES=1000`` for wide local runs) and every sample,
what the sections print agrees with what is installed and with each other.

Each property is a fact of the trade or of arithmetic, not the program's own figure:
advice never prescribes what is already fitted (common practice: a report that tells a
plant to fit what it has loses its trust); a danger beside an adequate verdict concerns
a mechanism the verdict does not cover; no printed differential is negative, no printed
load above 100 % and no pressure below absolute zero (physically impossible readings);
the stall load is printed the same wherever it is printed; and a unit written out reads
back to the same unit.
"""

from __future__ import annotations

import os
import re

import pytest
from conftest import SAMPLES
from hypothesis import given, settings
from test_properties_of_units import build, build_us
from test_properties_of_units import units as generated_units

from stallcheck import analysis
from stallcheck.files import unitfile, unitwriter
from stallcheck.render import advice, page, terminal, words
from stallcheck.render import json as json_out

#: Dangers a verdict of adequate drainage does not cover: the surge where a column is
#: stopped, a pump-trap's motive, a trap rated for less differential than it has, and
#: the layouts that trap steam pockets whatever drains the coil (each its own mechanism).
OTHER_MECHANISMS = {"hydraulic-shock", "pump-trap-motive-low", "trap-differential-over-rating",
                    "tube-fill-both-ends", "group-trapping", "tubes-not-pitched"}
#: Words that prescribe equipment, followed by the arrangement's name.
PRESCRIBE = re.compile(r"\b(?:[Ff]it|[Ii]nstall|[Dd]rain it with)(?: a| an)? (pump-trap|trap-vacuum-breaker|"
                       r"vacuum breaker|constant-purge|constant purge)\b")
_NAMES = {"vacuum breaker": "trap-vacuum-breaker", "constant purge": "constant-purge"}


def _text(r, system):
    return page.plain(terminal.report(r, system, width=80), 80)


def _story(r, system):
    text = _text(r, system)
    installed = r.drainage.installed
    # 1. nothing prescribes what is fitted
    said = [text] + [words.finding(f, r, system) for f in r.findings]
    a = advice.advise(r, system)
    said += list(a.lead) + [m.note for m in a.changes]
    for sentence in said:
        for m in PRESCRIBE.finditer(sentence):
            assert _NAMES.get(m.group(1), m.group(1)) != installed, (installed, sentence)
    # 2. a danger beside an adequate verdict is another mechanism's
    if r.drainage.adequate:
        dangers = {f.code for f in r.findings if f.severity == "danger"}
        assert dangers <= OTHER_MECHANISMS, (dangers, installed)
    # 3. no impossible figure printed
    for m in re.finditer(r"(-?\d[\d,]*(?:\.\d+)?)% load", text):
        assert float(m.group(1).replace(",", "")) <= 100.0, m.group(0)
    assert not re.search(r"-\d[\d.]* (?:psi|kPa) differential", text), text
    for m in re.finditer(r"(-?\d[\d,]*(?:\.\d+)?) (psia|kPa\(abs\))", text):
        assert float(m.group(1).replace(",", "")) >= 0.0, m.group(0)
    atm = r.atmospheric_pressure
    for m in re.finditer(r"(-\d[\d,]*(?:\.\d+)?) (psig|barg)", text):
        value = float(m.group(1).replace(",", ""))
        floor = -atm / (6894.757293168 if m.group(2) == "psig" else 1e5)
        assert value >= floor - 0.05, (m.group(0), floor)
    # 4. the stall load, wherever printed, is one figure
    flat = " ".join(text.split())
    loads = set(re.findall(r"stalls below (\d+)% load", flat))
    assert len(loads) <= 1, loads
    speeds = set(re.findall(r"wave speed (?:of )?([\d,]+ (?:ft/s|m/s))", flat))
    assert len(speeds) <= 1, speeds
    # the JSON says the same as the page
    data = json_out.to_dict(r)
    assert data["drainage"]["installed"] == installed
    assert [f["code"] for f in data["findings"]] == [f.code for f in r.findings]


def _reads_back(unit, system):
    again = unitfile.parse(unitwriter.dumps(unit, system), "written.toml")
    a, b = analysis.analyse(unit), analysis.analyse(again)
    assert (a.stall.load_fraction is None) == (b.stall.load_fraction is None)
    if a.stall.load_fraction is not None:
        assert b.stall.load_fraction == pytest.approx(a.stall.load_fraction, abs=1e-6)
    assert a.drainage.required == b.drainage.required and a.drainage.installed == b.drainage.installed


@settings(max_examples=int(os.environ.get("STALLCHECK_EXAMPLES", "40")), deadline=None)
@given(generated_units)
def test_every_section_of_a_generated_unit_tells_one_story(d):
    for unit in (build(d), build_us(d)):
        try:
            r = analysis.analyse(unit)
        except Exception as exc:  # a generated unit the analysis refuses as bad input
            from stallcheck.errors import StallcheckError

            assert isinstance(exc, StallcheckError)
            return
        _story(r, unit.system)
        _reads_back(unit, unit.system)


@pytest.mark.parametrize("sample", SAMPLES, ids=lambda p: p.name)
@pytest.mark.parametrize("system", ["us", "si"])
def test_every_section_of_a_sample_tells_one_story(sample, system):
    unit = unitfile.load(sample)
    _story(analysis.analyse(unit, system=system), system)


@pytest.mark.parametrize("rated", [None, "2 psi"])
@pytest.mark.parametrize("lift", ["8 ft", "20 ft"])
@pytest.mark.parametrize("arrangement", ["trap", "trap-vacuum-breaker", "pump-trap", "constant-purge"])
def test_each_arrangement_installed_on_a_lifted_coil_tells_one_story(arrangement, lift, rated):
    # a lift behind the trap of a 5 psig coil, every arrangement installed in turn: 8 ft
    # stalls it in its range, 20 ft (8.7 psi of water) at full load; and its trap rated
    # for 2 psi, less than it has at full load under 8 ft of lift
    data = {"format": 1, "unit": {"name": "Harrow Lane AHU-9 preheat"},
            "design": {"medium": "air", "flow": "6000 cfm", "inlet_temperature": "0 degF",
                       "outlet_temperature": "55 degF", "steam_pressure": "5 psig"},
            "steam": {"supply_pressure": "15 psig"}, "valve": {"cv": 12, "characteristic": "equal-percentage"},
            "drain": {"arrangement": arrangement, "trap": "float-thermostatic", "fill_head": "18 in",
                      "lift": lift, "return_pressure": "0 psig", "return_line": "1 in",
                      "purge_rate": "10 lb/h"}}
    if arrangement != "constant-purge":
        del data["drain"]["purge_rate"]
    if rated is not None:
        data["drain"]["trap_max_differential"] = rated
    r = analysis.analyse(unitfile.from_data(data, "harrow.toml"))
    assert (r.stall.load_fraction >= 1.0) == (lift == "20 ft")
    for system in ("us", "si"):
        _story(r, system)
