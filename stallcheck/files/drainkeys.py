"""The ``[drain]`` table of a unit file. Its plain keys (the arrangement, heights and
pressures that decide drainage, the trap's ratings, a purge, the line from the trap) are
read from their rows in the key table; read here are those that depend on others: the
trap's rated table, a pump-trap's capacity (a figure or a table against back pressure)
and discharge rate (by mass or volume), and a purge given one way only. Read by
:mod:`stallcheck.files.unitfile`."""

from __future__ import annotations

from stallcheck.errors import InputError
from stallcheck.files import quantities as q
from stallcheck.files.ranges import check_pressure_range, require_positive
from stallcheck.inputs import CapacityPoint, Drain


def read(r, atm: float) -> Drain:
    """The validated ``[drain]`` table (``r``: the unit file's reader)."""
    d = r.table("drain")
    plain = r.plain(d, "drain")
    capacity = []
    for section, row in r.rows(d, "drain", "capacity"):
        dp = r.quantity(row, section, "differential", q.differential)
        w = r.quantity(row, section, "flow", q.mass_flow)
        require_positive(f"{section}.differential", dp)
        require_positive(f"{section}.flow", w)
        capacity.append(CapacityPoint(dp, w))
    if len(capacity) == 1:
        raise InputError("drain.capacity", "has one row; give at least two [[drain.capacity]] rows "
                                           "(differential and flow) so capacity can be read between them.")
    for a, b in zip(capacity, capacity[1:]):
        if b.differential <= a.differential:
            raise InputError("drain.capacity", "differentials must increase from row to row.")
    if "purge_orifice" in plain and "purge_rate" in plain:
        raise InputError("drain.purge_orifice", "give either purge_orifice or purge_rate, not both.")
    return Drain(capacity=tuple(capacity), **plain, **_pump(r, d, atm))


def _pump(r, d: dict, atm: float) -> dict:
    """A pump-trap's capacity (a figure, or a table against back pressure) and its
    discharge rate (by mass or by volume of condensate)."""
    out: dict = {}
    if isinstance(d.get("pump_capacity"), list):
        out["pump_table"] = _pump_table(r, d, atm)
    else:
        value = r.optional(d, "drain", "pump_capacity", q.mass_flow)
        if value is not None:
            out["pump_capacity"] = require_positive("drain.pump_capacity", value, f", got \"{d['pump_capacity']}\"")
    rate = r.optional(d, "drain", "pump_rate", q.flow)
    if rate is not None:
        require_positive("drain.pump_rate", rate.value, f", got \"{d['pump_rate']}\"")
        # pump-trap ratings are given by mass or by volume of condensate (gpm, m3/h)
        out["pump_rate" if rate.is_mass else "pump_rate_volume"] = rate.value
    return out


def _pump_table(r, d: dict, atm: float) -> tuple:
    """``[[drain.pump_capacity]]``: the maker's pumping capacity against back pressure."""
    table = []
    for section, row in r.rows(d, "drain", "pump_capacity", refused="takes a mass flow, or "
                               "[[drain.pump_capacity]] rows of back_pressure and flow."):
        back = r.quantity(row, section, "back_pressure", q.pressure).absolute(atm)
        check_pressure_range(f"{section}.back_pressure", back, row.get("back_pressure"))
        flow = r.quantity(row, section, "flow", q.mass_flow)
        require_positive(f"{section}.flow", flow)
        table.append((back, flow))
    if len(table) < 2:
        raise InputError("drain.pump_capacity", "a table needs at least two rows; for one figure write "
                                                "pump_capacity = \"<flow>\".")
    for a, b in zip(table, table[1:]):
        if b[0] <= a[0]:
            raise InputError("drain.pump_capacity", "back pressures must increase from row to row.")
    return tuple(table)
