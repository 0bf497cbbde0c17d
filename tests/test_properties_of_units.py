"""Property-based checks over generated units (hypothesis): invariants the physics must
hold whatever the numbers. Independent tier: each property follows from the stall rule
p_coil + fill ≤ back + Δp_min and from a steam temperature that rises with load."""

import numpy as np
from hypothesis import given, settings, strategies as st

from stallcheck import analysis, unitfile

TEMPLATE = """
format = 1
[unit]
name = "Generated"
[design]
medium = "{medium}"
flow = "{flow} {flow_unit}"
inlet_temperature = "{t_in} degC"
outlet_temperature = "{t_out} degC"
steam_pressure = "{p_design} kPag"
ua_flow_exponent = {n}
[steam]
supply_pressure = "{p_supply} kPag"
[valve]
cv = {cv}
characteristic = "equal-percentage"
[load]
varies = "{varies}"
[drain]
arrangement = "trap"
fill_head = "{fill} m"
lift = "{lift} m"
return_pressure = "{p_return} kPag"
"""

units = st.fixed_dictionaries({
    "medium": st.sampled_from(["air", "water"]),
    "t_out": st.floats(10, 70),
    "rise": st.floats(5, 60),
    "p_design": st.floats(5, 400),
    "n": st.sampled_from([0.0, 0.5, 0.8]),
    "varies": st.sampled_from(["inlet-temperature", "flow"]),
    "fill": st.floats(0, 1.5),
    "lift": st.floats(0, 6),
    "p_return": st.floats(0, 60),
    "cv": st.floats(1, 60),
})


def build(d, **over):
    d = {**d, **over}
    t_in = d["t_out"] - d["rise"]
    if d["medium"] == "water":
        t_in = max(t_in, 2.0)
    return unitfile.parse(TEMPLATE.format(
        medium=d["medium"], flow=3 if d["medium"] == "air" else 5,
        flow_unit="m3/s" if d["medium"] == "air" else "m3/h", t_in=t_in, t_out=d["t_out"],
        p_design=d["p_design"], n=d["n"], p_supply=d["p_design"] + 150, cv=d["cv"], varies=d["varies"],
        fill=d["fill"], lift=d["lift"], p_return=d["p_return"]), "generated.toml")


@settings(max_examples=40, deadline=None)
@given(units)
def test_generated_units_analyse_and_hold_invariants(d):
    r = analysis.analyse(build(d))
    s = r.stall
    assert (s.load_fraction is None) != s.occurs
    if s.occurs:
        assert 0 < s.load_fraction <= 1
    assert np.all(np.diff(r.points.steam_flow) > 0)
    # more lift or a higher return pressure never lowers the stall load
    higher = analysis.analyse(build(d, lift=d["lift"] + 1.0, p_return=d["p_return"] + 10))
    assert (higher.stall.load_fraction or 0) >= (s.load_fraction or 0) - 1e-12
    # more fill head never raises it
    deeper = analysis.analyse(build(d, fill=d["fill"] + 0.5))
    assert (deeper.stall.load_fraction or 0) <= (s.load_fraction or 0) + 1e-12
