"""Benchmarks, measured as ratios or differences in one run, so a busy machine affects
both sides alike.

    python bench/run.py [--repeat N] [--units N]

Prints medians of ``--repeat`` runs (default 3), interleaved with their floors:

* ``stallcheck --help`` against ``python -c pass``;
* ``stallcheck check`` of a steam-and-air and a steam-and-water sample unit against
  ``python -c "import numpy, typer, rich"`` (the floor of any command that prints a
  result);
* ``stallcheck survey`` of ``--units`` invented units (default 10,000), from a folder of
  TOML files and from one CSV table: the marginal cost per unit,
  (t(N) − t(1)) / (N − 1), and the peak resident memory of the survey process.

The invented units are generated here with a fixed seed (air preheat coils and
steam-to-water heaters across plausible ranges), written to a temporary folder, and
removed afterwards.
"""

from __future__ import annotations

import argparse
import os
import random
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
SAMPLE = ROOT / "sample_units" / "us_outdoor_air_preheat.toml"
WATER = ROOT / "sample_units" / "si_water_heater.toml"
BAD = ROOT / "tests" / "bad_units" / "64_return_hotter_than_boiling.toml"  # refused after the steam tables
ENV = dict(os.environ, NO_COLOR="1")
# Measure the program as installed, with its modules compiled once: some machines set
# this to keep source folders clean, which would make every run recompile them.
ENV.pop("PYTHONDONTWRITEBYTECODE", None)

ARRANGEMENTS = ("trap", "trap-vacuum-breaker", "pump-trap", "constant-purge")
TRAPS = ("float-thermostatic", "inverted-bucket", "thermodynamic", "thermostatic")


def air_coil(rng: random.Random, k: int) -> dict:
    """One invented outdoor-air preheat coil (US units), as unit-file values."""
    steam = rng.uniform(2, 15)
    return {
        "unit.name": f"Bench coil {k}", "unit.tag": f"AHU-{k}", "design.medium": "air",
        "design.flow": f"{rng.uniform(2000, 20000):.0f} cfm",
        "design.inlet_temperature": f"{rng.uniform(-20, 40):.1f} degF",
        "design.outlet_temperature": f"{rng.uniform(50, 75):.1f} degF",
        "design.steam_pressure": f"{steam:.1f} psig",
        "steam.supply_pressure": f"{steam + rng.uniform(5, 30):.1f} psig",
        "valve.cv": round(rng.uniform(5, 40), 1), "valve.characteristic": "equal-percentage",
        "load.minimum": round(rng.uniform(0, 0.4), 2),
        "drain.arrangement": rng.choice(ARRANGEMENTS), "drain.trap": rng.choice(TRAPS),
        "drain.fill_head": f"{rng.uniform(6, 36):.0f} in", "drain.lift": f"{rng.uniform(0, 15):.1f} ft",
        "drain.return_pressure": f"{rng.uniform(0, 5):.1f} psig",
    }


def water_heater(rng: random.Random, k: int) -> dict:
    """One invented steam-to-water heater (SI units)."""
    steam = rng.uniform(0.5, 5)
    return {
        "unit.name": f"Bench heater {k}", "unit.tag": f"HX-{k}", "design.medium": "water",
        "design.flow": f"{rng.uniform(1, 30):.1f} m3/h",
        "design.inlet_temperature": f"{rng.uniform(5, 15):.1f} degC",
        "design.outlet_temperature": f"{rng.uniform(50, 80):.1f} degC",
        "design.steam_pressure": f"{steam:.2f} barg",
        "steam.supply_pressure": f"{steam + rng.uniform(1, 4):.2f} barg",
        "valve.cv": round(rng.uniform(5, 40), 1), "valve.characteristic": "equal-percentage",
        "load.varies": "flow", "load.minimum": round(rng.uniform(0.05, 0.3), 2),
        "drain.arrangement": rng.choice(ARRANGEMENTS), "drain.trap": "float-thermostatic",
        "drain.fill_head": f"{rng.uniform(0.2, 1):.2f} m", "drain.lift": f"{rng.uniform(0, 4):.1f} m",
        "drain.return_pressure": f"{rng.uniform(0, 0.5):.2f} barg",
    }


def invented(n: int) -> list[dict]:
    rng = random.Random(20261202)
    return [(air_coil if k % 3 else water_heater)(rng, k) for k in range(n)]


def to_toml(unit: dict) -> str:
    tables: dict = {}
    for key, value in unit.items():
        section, name = key.split(".")
        tables.setdefault(section, []).append(f"{name} = {value!r}".replace("'", '"'))
    return "format = 1\n" + "".join(f"\n[{s}]\n" + "\n".join(lines) + "\n" for s, lines in tables.items())


def to_csv(units: list[dict]) -> str:
    keys = sorted({k for u in units for k in u})
    rows = [",".join(keys)]
    rows += [",".join(str(u.get(k, "")) for k in keys) for u in units]
    return "\n".join(rows) + "\n"


#: Targets (issue: a check in a third of a second): ratio to the floor, ms per unit.
TARGETS = {"--help": 3.5, "check": 1.5, "refusal": 1.5, "survey CSV": 0.15, "survey TOML": 0.4}


def verdict(value: float, target: float) -> str:
    return f"target {target:g}: {'met' if value <= target else 'NOT MET'}"


def run(cmd: list[str]) -> tuple[float, float]:
    """Wall time [s] and peak resident memory [MB] of one command, run from a folder
    outside the repository so that the installed copy is the one measured."""
    start = time.perf_counter()
    proc = subprocess.Popen(cmd, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, env=ENV,
                            cwd=tempfile.gettempdir())
    _, _, usage = os.wait4(proc.pid, 0)
    return time.perf_counter() - start, usage.ru_maxrss / 1024.0


def ratios(repeat: int) -> None:
    py = sys.executable
    floor = [py, "-c", "import numpy, typer, rich"]
    pairs = [
        ("stallcheck --help", [py, "-m", "stallcheck", "--help"], "python -c pass", [py, "-c", "pass"], "--help"),
        ("check, steam and air", [py, "-m", "stallcheck", "check", str(SAMPLE)], "numpy+typer+rich", floor, "check"),
        ("check, steam and water", [py, "-m", "stallcheck", "check", str(WATER)], "numpy+typer+rich", floor,
         "check"),
        ("refusal of a bad file", [py, "-m", "stallcheck", "check", str(BAD)], "numpy+typer+rich", floor,
         "refusal"),
    ]
    for name, cmd, floor_name, floor, target in pairs:
        run(cmd), run(floor)  # warm-up: compiled modules and the units cache in place
        a, b = [], []
        for _ in range(repeat):  # interleaved: both sides see the same machine load
            a.append(run(cmd)[0])
            b.append(run(floor)[0])
        ta, tb = statistics.median(a), statistics.median(b)
        print(f"{name:24s} {ta:6.2f} s   {floor_name:16s} {tb:6.2f} s   ratio {ta / tb:5.2f}   "
              f"{verdict(ta / tb, TARGETS[target])}")


def surveys(n: int, repeat: int) -> None:
    py = sys.executable
    units = invented(n)
    work = Path(tempfile.mkdtemp(prefix="stallcheck-bench-"))
    try:
        many, one = work / "many", work / "one"
        many.mkdir()
        one.mkdir()
        for k, u in enumerate(units):
            (many / f"unit{k:05d}.toml").write_text(to_toml(u), encoding="utf-8")
        (one / "unit00000.toml").write_text(to_toml(units[0]), encoding="utf-8")
        (work / "many.csv").write_text(to_csv(units), encoding="utf-8")
        (work / "one.csv").write_text(to_csv(units[:1]), encoding="utf-8")
        cases = [("TOML folder", many, one), ("one CSV", work / "many.csv", work / "one.csv")]
        for name, big, small in cases:
            t_big, t_small, memory, memory_one = [], [], [], []
            for _ in range(repeat):
                t, m = run([py, "-m", "stallcheck", "survey", str(big)])
                t_big.append(t)
                memory.append(m)
                t, m = run([py, "-m", "stallcheck", "survey", str(small)])
                t_small.append(t)
                memory_one.append(m)
            big_t, small_t = statistics.median(t_big), statistics.median(t_small)
            marginal = (big_t - small_t) / (n - 1) * 1000.0
            target = TARGETS["survey CSV" if name == "one CSV" else "survey TOML"]
            print(f"survey, {name:11s} {n:,} units {big_t:6.2f} s, 1 unit {small_t:5.2f} s: "
                  f"{marginal:5.3f} ms per unit ({verdict(marginal, target)}); peak memory "
                  f"{max(memory):4.0f} MB (1 unit: {max(memory_one):4.0f} MB)")
    finally:
        shutil.rmtree(work, ignore_errors=True)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--repeat", type=int, default=3)
    parser.add_argument("--units", type=int, default=10_000)
    args = parser.parse_args()
    print(f"{time.strftime('%Y-%m-%d')}, {os.cpu_count()} cores, median of {args.repeat} runs")
    ratios(args.repeat)
    surveys(args.units, args.repeat)


if __name__ == "__main__":
    main()
