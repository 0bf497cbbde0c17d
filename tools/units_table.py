"""Write stallcheck/data/units.json: pint's answers for every unit spelling the unit
file accepts and every unit the tool prints, so that a run needs no pint (three
quarters of a second to import and build) even where the user's cache folder cannot be
written. A test holds the table to what the installed pint says.

    python tools/units_table.py
"""

from __future__ import annotations

import json
from pathlib import Path

from stallcheck.files import quantities as q

#: A sample quantity of every spelling, by the parser that reads it.
SAMPLES = {
    q.temperature: ["1 degC", "1 degF", "1 K", "1 °C", "1 °F"],
    q.pressure: [f"1 {u}" for u in ("psig", "psia", "barg", "bara", "kPag", "kPaa", "kPa(g)", "kPa(abs)")],
    q.differential: [f"1 {u}" for u in ("psi", "bar", "kPa", "inH2O", "Pa", "mbar")],
    q.length: [f"1 {u}" for u in ("in", "ft", "mm", "m", "cm")],
    q.mass_flow: [f"1 {u}" for u in ("kg/h", "kg/s", "lb/h")],
    q.flow: [f"1 {u}" for u in ("kg/h", "kg/s", "lb/h", "m3/h", "m3/s", "L/s", "gpm", "cfm")],
    q.fraction: ["1 %"],
    q.mass: ["1 lb", "1 t", "1 kg"],
    q.duration: ["1 s", "1 ms", "1 min"],
}


def main() -> None:
    q._answers.shipped = {}
    q._answers.data = {}
    q._answers.file = None
    for parse, texts in SAMPLES.items():
        for text in texts:
            parse("k", text)
    for kind in q.DISPLAY["si"]:
        for system in ("si", "us"):
            q.show(1.0e5 if kind.startswith("pressure") else 1.0, kind, system)
    q.show(90e3, "pressure", "us")  # below atmospheric: also in inHg vacuum
    q.gauge_reading("k", "10 inHg vacuum", q.STANDARD_ATMOSPHERE)
    q.gauge_reading("k", "25 kPa vacuum", q.STANDARD_ATMOSPHERE)
    out = Path(__file__).resolve().parent.parent / "stallcheck" / "data" / "units.json"
    out.write_text(json.dumps(dict(sorted(q._answers.data.items())), indent=1) + "\n", encoding="utf-8")
    print(f"wrote {out}: {len(q._answers.data)} answers")


if __name__ == "__main__":
    main()
