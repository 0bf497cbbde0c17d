"""Write stallcheck/data/units.json: pint's answers for every unit spelling of the
grammar (``quantities.GRAMMAR``) and every unit the tool prints, so that a run needs no
pint (three quarters of a second to import and build). A test holds the table to what
the installed pint says, and to the grammar.

    python tools/units_table.py
"""

from __future__ import annotations

import json
from pathlib import Path

from stallcheck.files import quantities as q

from stallcheck.files import display

def main() -> None:
    q._answers.shipped = {}
    q._answers.data = {}
    for kind, spellings in q.GRAMMAR.items():
        q._dimension(kind)
        for spelling in spellings:
            unit, _ = q._unit_info(spelling)
            q._line(unit, kind)
    for kind in display.DISPLAY["si"]:
        for system in ("si", "us"):
            display.show(1.0e5 if kind.startswith("pressure") else 1.0, kind, system)
    display.show(90e3, "pressure", "us")  # below atmospheric: also in inHg vacuum
    q.gauge_reading("k", "10 inHg vacuum", q.STANDARD_ATMOSPHERE)
    q.gauge_reading("k", "25 kPa vacuum", q.STANDARD_ATMOSPHERE)
    out = Path(__file__).resolve().parent.parent / "stallcheck" / "data" / "units.json"
    out.write_text(json.dumps(dict(sorted(q._answers.data.items())), indent=1) + "\n", encoding="utf-8")
    print(f"wrote {out}: {len(q._answers.data)} answers")


if __name__ == "__main__":
    main()
