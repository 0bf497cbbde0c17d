"""The ``[drain]`` table of a unit file: the installed arrangement, the heights and
pressures that decide drainage, the trap's and pump-trap's ratings, a purge, and the
line from the trap (its bore, run, pitch, wall and rating, and what drives or stops the
flow in it). Read by :mod:`stallcheck.files.unitfile`."""

from __future__ import annotations

from stallcheck.errors import InputError
from stallcheck.files import quantities as q
from stallcheck.files.ranges import (NARROWEST_LINE, TRAP_DIFFERENTIAL_LIMIT, check_pressure_range,
                                     require_positive)
from stallcheck.inputs import ARRANGEMENTS, TRAPS, CapacityPoint, Drain


def read(r, atm: float) -> Drain:
    """The validated ``[drain]`` table (``r``: the unit file's reader)."""
    d = r.table("drain")
    arrangement = r.choice(d, "drain", "arrangement", ARRANGEMENTS)
    trap = r.choice(d, "drain", "trap", TRAPS, default="float-thermostatic")
    fill = r.quantity(d, "drain", "fill_head", q.length, default="0 in",
                      note="height from the coil outlet down to the trap inlet, such as \"18 in\".")
    lift = r.quantity(d, "drain", "lift", q.length, default="0 ft")
    for key, value in (("drain.fill_head", fill), ("drain.lift", lift)):
        if value < 0:
            raise InputError(key, "cannot be negative; give the height as a positive length.")
        if value > 100:
            raise InputError(key, "is over 100 m; check the units.")
    ret = r.quantity(d, "drain", "return_pressure", q.pressure, default="0 psig").absolute(atm)
    check_pressure_range("drain.return_pressure", ret, d.get("return_pressure"))
    dpmin = r.quantity(d, "drain", "trap_min_differential", q.differential, default="0 psi")
    if dpmin < 0 or dpmin > TRAP_DIFFERENTIAL_LIMIT:
        raise InputError("drain.trap_min_differential", f"\"{d['trap_min_differential']}\" is out of range; accepted: "
                                                        "0 to 2 bar (0 to 29 psi).")
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
    extra = _drain_devices(r, d, atm)
    return Drain(arrangement, trap, fill, lift, ret, dpmin, tuple(capacity), **extra)


def _drain_devices(r, d: dict, atm: float) -> dict:
    """The optional keys that size the trap, pump-trap, purge and return line."""
    out: dict = {}
    if "capacity_margin" in d:
        out["capacity_margin"] = r.number(d, "drain", "capacity_margin")
    for key in ("trap_orifice", "purge_orifice", "return_line"):
        value = r.optional(d, "drain", key, q.length)
        if value is not None:
            require_positive(f"drain.{key}", value, f", got \"{d[key]}\"")
            if value > 1.0:
                raise InputError(f"drain.{key}", f"\"{d[key]}\" is over 1 m; check the units.")
            if key == "return_line" and value < NARROWEST_LINE:
                raise InputError(f"drain.{key}", f"\"{d[key]}\" is narrower than any line from a trap; accepted: "
                                                 "5 mm (0.2 in) to 1 m.")
            out[key] = value
    if isinstance(d.get("pump_capacity"), list):
        out["pump_table"] = _pump_table(r, d, atm)
    for key in ("purge_rate",) if "pump_table" in out else ("pump_capacity", "purge_rate"):
        value = r.optional(d, "drain", key, q.mass_flow)
        if value is not None:
            require_positive(f"drain.{key}", value, f", got \"{d[key]}\"")
            out[key] = value
    if "purge_orifice" in out and "purge_rate" in out:
        raise InputError("drain.purge_orifice", "give either purge_orifice or purge_rate, not both.")
    fill = r.optional(d, "drain", "pump_fill_head", q.length)
    if fill is not None:
        if not 0.0 <= fill <= 10.0:
            raise InputError("drain.pump_fill_head", f"\"{d['pump_fill_head']}\" is out of range; "
                                                     "accepted: 0 to 10 m.")
        out["pump_fill_head"] = fill
    motive = _absolute(r, d, "motive_pressure", atm)
    if motive is not None:
        out["motive_pressure"] = motive
    t = r.optional(d, "drain", "return_temperature", q.temperature)
    if t is not None:
        if not 273.15 <= t <= 473.15:
            raise InputError("drain.return_temperature", f"\"{d['return_temperature']}\" is out of range; "
                                                         "accepted: 0 °C to 200 °C.")
        out["return_temperature"] = t
    out.update(_return_line(r, d, atm))
    return out


def _absolute(r, d: dict, key: str, atm: float) -> float | None:
    """An optional pressure of the ``[drain]`` table, absolute [Pa] and on the steam
    tables' range; None where the file leaves it out."""
    pressure = r.optional(d, "drain", key, q.pressure)
    if pressure is None:
        return None
    value = pressure.absolute(atm)
    check_pressure_range(f"drain.{key}", value, d[key])
    return value


def _return_line(r, d: dict, atm: float) -> dict:
    """The optional keys of the line from the trap: its run, pitch, wall and rating,
    and what drives or stops the flow in it."""
    out: dict = {}
    length = r.optional(d, "drain", "return_length", q.length)
    if length is not None:
        if not 0.0 < length <= 2000.0:
            raise InputError("drain.return_length", f"\"{d['return_length']}\" is out of range; accepted: above "
                                                    "0 to 2000 m.")
        out["return_length"] = length
    pitch = r.optional(d, "drain", "return_pitch", q.fraction)
    if pitch is not None:
        if not -1.0 <= pitch <= 1.0:
            raise InputError("drain.return_pitch", f"\"{d['return_pitch']}\" is out of range; accepted: -100 % "
                                                   "to 100 % (fall per length; negative rises against the flow).")
        out["return_pitch"] = pitch
    if "return_material" in d:
        out["return_material"] = r.choice(d, "drain", "return_material", ("steel", "copper"))
    wall = r.optional(d, "drain", "return_wall", q.length)
    if wall is not None:
        require_positive("drain.return_wall", wall, f", got \"{d['return_wall']}\"")
        if wall > 0.05:
            raise InputError("drain.return_wall", f"\"{d['return_wall']}\" is over 50 mm; check the units.")
        out["return_wall"] = wall
    rating = _absolute(r, d, "return_rating", atm)
    if rating is not None:
        out["return_rating"] = rating
    rate = r.optional(d, "drain", "pump_rate", q.flow)
    if rate is not None:
        require_positive("drain.pump_rate", rate.value, f", got \"{d['pump_rate']}\"")
        # pump-trap ratings are given by mass or by volume of condensate (gpm, m3/h)
        out["pump_rate" if rate.is_mass else "pump_rate_volume"] = rate.value
    closing = r.optional(d, "drain", "check_closing_time", q.duration)
    if closing is not None:
        if not 0.0 <= closing <= 600.0:
            raise InputError("drain.check_closing_time", f"\"{d['check_closing_time']}\" is out of range; "
                                                         "accepted: 0 to 600 s.")
        out["check_closing_time"] = closing
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
