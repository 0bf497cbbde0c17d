"""Start-up benchmark: measured as ratios in one run, so a busy machine affects both sides.

    python bench/run.py [--repeat N]

Prints the median wall time of each command and its ratio to its floor:
* ``stallcheck --help`` against ``python -c pass``;
* ``stallcheck check`` of a sample unit against ``python -c "import CoolProp.CoolProp"``.
"""

from __future__ import annotations

import argparse
import os
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
SAMPLE = ROOT / "sample_units" / "us_outdoor_air_preheat.toml"


def wall(cmd: list[str], repeat: int) -> float:
    times = []
    for _ in range(repeat):
        start = time.perf_counter()
        subprocess.run(cmd, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, env=dict(os.environ, NO_COLOR="1"))
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("--repeat", type=int, default=5)
    args = parser.parse_args()
    py = sys.executable
    pairs = [
        ("stallcheck --help", [py, "-m", "stallcheck", "--help"], "python -c pass", [py, "-c", "pass"]),
        ("stallcheck check (one unit)", [py, "-m", "stallcheck", "check", str(SAMPLE)],
         "import CoolProp", [py, "-c", "import CoolProp.CoolProp"]),
    ]
    print(f"cores: {os.cpu_count()}, repeat: {args.repeat}, median wall time")
    for name, cmd, floor_name, floor in pairs:
        # interleave so both sides see the same machine load
        a, b = [], []
        for _ in range(args.repeat):
            a.append(wall(cmd, 1))
            b.append(wall(floor, 1))
        ta, tb = statistics.median(a), statistics.median(b)
        print(f"{name:32s} {ta:6.2f} s   {floor_name:18s} {tb:6.2f} s   ratio {ta / tb:5.2f}")


if __name__ == "__main__":
    main()
