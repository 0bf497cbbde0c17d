"""Benchmarks, measured as ratios or differences in one run, so a busy machine affects
both sides alike.

    python bench/run.py [--repeat N] [--units N]

Prints medians of ``--repeat`` runs (default 3), interleaved with their floors:

* ``stallcheck --help`` against ``python -c pass``;
* ``stallcheck check`` of a steam-and-air and a steam-and-water sample unit against
  ``python -c "import numpy, typer, rich"`` (the floor of any command that prints a
  result); the weather sample against itself without its weather file;
* ``stallcheck explore`` to its first screen, in a pseudo-terminal, against the same
  floor; and one what-if (a key's analysis and redraw), timed inside the app;
* ``stallcheck survey`` of ``--units`` invented units (default 10,000 and 100,000), from
  a folder of TOML files and from one CSV table: the marginal cost per unit,
  (t(N) − t(1)) / (N − 1), and the peak resident memory of the survey process (and its
  workers); at the smallest size also the CSV survey in one process (``--jobs 1``), the
  work a unit costs whatever the processors.

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
WEATHER = ROOT / "sample_units" / "us_makeup_air_greensboro.toml"
PLAIN = ROOT / "sample_units" / "si_flooded_reheat.toml"   # steam and air, no return line described
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


#: Targets (issue: a check in a third of a second): ratio to the floor, ms per unit or
#: per what-if, MB at the largest survey.
TARGETS = {"check": 1.5, "check, return line": 1.6, "weather": 1.5, "refusal": 1.5, "explore": 1.5,
           "what-if": 30.0, "survey CSV": 0.15, "survey TOML": 0.4, "return lines": 1.2, "memory": 200.0}


def verdict(value: float, target: float | None) -> str:
    if target is None:
        return ""
    return f"target {target:g}: {'met' if value <= target else 'NOT MET'}"


def run(cmd: list[str]) -> tuple[float, float]:
    """Wall time [s] and peak resident memory [MB] of one command, run from a folder
    outside the repository so that the installed copy is the one measured."""
    start = time.perf_counter()
    proc = subprocess.Popen(cmd, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, env=ENV,
                            cwd=tempfile.gettempdir())
    _, _, usage = os.wait4(proc.pid, 0)
    return time.perf_counter() - start, usage.ru_maxrss / 1024.0


def first_screen(cmd: list[str], marker: bytes = b"stall point") -> float:
    """Seconds until a full-screen command shows ``marker`` in a pseudo-terminal (80x24),
    then quit it."""
    import pty
    import select
    import signal

    pid, fd = pty.fork()
    if pid == 0:  # the child: the terminal's size, then the command
        os.environ.update(ENV, COLUMNS="80", LINES="24", TERM="xterm-256color")
        os.chdir(tempfile.gettempdir())
        os.execv(cmd[0], cmd)
    import fcntl
    import struct
    import termios

    fcntl.ioctl(fd, termios.TIOCSWINSZ, struct.pack("HHHH", 24, 80, 0, 0))
    start = time.perf_counter()
    seen = b""
    try:
        while marker not in seen and time.perf_counter() - start < 60:
            ready, _, _ = select.select([fd], [], [], 0.05)
            if ready:
                try:
                    seen += os.read(fd, 65536)
                except OSError:
                    break
        return time.perf_counter() - start
    finally:
        os.kill(pid, signal.SIGKILL)
        os.waitpid(pid, 0)
        os.close(fd)


def _without_weather() -> Path:
    """The weather sample with its weather file and schedule taken out (a temporary file)."""
    keep = [line for line in WEATHER.read_text(encoding="utf-8").splitlines()
            if not line.startswith(("weather =", "season =", "daily_hours ="))]
    path = Path(tempfile.gettempdir()) / "stallcheck-bench-no-weather.toml"
    path.write_text("\n".join(keep) + "\n", encoding="utf-8")
    return path


def ratios(repeat: int) -> None:
    py = sys.executable
    floor = [py, "-c", "import numpy, typer, rich"]
    pairs = [
        ("--help", [py, "-m", "stallcheck", "--help"], "python -c pass", [py, "-c", "pass"], None),
        ("check, no return line", [py, "-m", "stallcheck", "check", str(PLAIN)], "floor", floor, "check"),
        ("check, air, return line", [py, "-m", "stallcheck", "check", str(SAMPLE)], "floor", floor,
         "check, return line"),
        ("check, water, ret. line", [py, "-m", "stallcheck", "check", str(WATER)], "floor", floor,
         "check, return line"),
        ("refusal of a bad file", [py, "-m", "stallcheck", "check", str(BAD)], "floor", floor, "refusal"),
        ("check with weather", [py, "-m", "stallcheck", "check", str(WEATHER)], "without",
         [py, "-m", "stallcheck", "check", str(_without_weather())], "weather"),
    ]
    for name, cmd, floor_name, floor_cmd, target in pairs:
        run(cmd), run(floor_cmd)  # warm-up: compiled modules and the units cache in place
        a, b = [], []
        for _ in range(repeat):  # interleaved: both sides see the same machine load
            a.append(run(cmd)[0])
            b.append(run(floor_cmd)[0])
        ta, tb = statistics.median(a), statistics.median(b)
        print(f"{name:23s}{ta:5.2f} s  {floor_name} {tb:4.2f} s  x{ta / tb:4.2f}  "
              f"{verdict(ta / tb, TARGETS.get(target) if target else None)}")
    explore = [py, "-m", "stallcheck", "explore", str(SAMPLE)]
    textual_floor = [py, "-c", "import textual.app"]   # the library explore runs on
    first_screen(explore)
    a, b = [], []
    for _ in range(repeat):
        a.append(first_screen(explore))
        b.append(run(textual_floor)[0])
    ta, tb = statistics.median(a), statistics.median(b)
    print(f"{'explore, first screen':23s}{ta:5.2f} s  textual {tb:4.2f} s  x{ta / tb:4.2f}  "
          f"{verdict(ta / tb, TARGETS['explore'])}")
    code = ("import asyncio, time, statistics\nfrom stallcheck import tui\nfrom stallcheck.files import unitfile\n"
            f"app = tui.Explorer(unitfile.load({str(SAMPLE)!r}))\ntimes = []\n"
            "async def go():\n    async with app.run_test(size=(80, 24)) as pilot:\n"
            "        for k in range(20):\n            t = time.perf_counter()\n"
            "            app.action_nudge('lift', 1 if k % 2 == 0 else -1)\n"
            "            times.append(time.perf_counter() - t)\n"
            "asyncio.run(go())\nprint(statistics.median(times) * 1000)")
    ms = float(subprocess.run([py, "-c", code], capture_output=True, text=True, env=ENV, check=True,
                              cwd=tempfile.gettempdir()).stdout.strip())
    print(f"{'explore, one what-if':23s}{ms:5.1f} ms analysis and redraw  {verdict(ms, TARGETS['what-if'])}")
    home = Path(tempfile.mkdtemp(prefix="stallcheck-home-"))
    home.chmod(0o555)
    code = ("import sys, io, contextlib\nfrom stallcheck.cli import main\n"
            f"sys.argv = ['stallcheck', 'check', {str(SAMPLE)!r}]\n"
            "try:\n    with contextlib.redirect_stdout(io.StringIO()):\n        main()\nexcept SystemExit:\n    pass\n"
            "print('pint' in sys.modules)")
    env = dict(ENV, HOME=str(home), XDG_CACHE_HOME=str(home / "cache"))
    pint = subprocess.run([py, "-c", code], capture_output=True, text=True, env=env, cwd=tempfile.gettempdir())
    print(f"{'read-only home':23s}pint imported: {pint.stdout.strip() or pint.stderr.strip()[-80:]}")
    shutil.rmtree(home, ignore_errors=True)


def write_units(n: int, folder: Path, csv_file: Path) -> None:
    """The first ``n`` invented units as a folder of unit files and as one CSV table."""
    units = invented(n)
    folder.mkdir()
    for k, u in enumerate(units):
        (folder / f"unit{k:06d}.toml").write_text(to_toml(u), encoding="utf-8")
    csv_file.write_text(to_csv(units), encoding="utf-8")


def surveys(sizes: list[int], repeat: int) -> None:
    py = sys.executable
    work = Path(tempfile.mkdtemp(prefix="stallcheck-bench-"))

    def make(n: int, folder: Path, csv_file: Path) -> None:
        # In a process of its own: a child's peak memory as the kernel reports it is at
        # least its parent's at the fork, so this process must never hold the units.
        subprocess.run([py, __file__, "--write", str(n), str(folder), str(csv_file)], check=True)

    try:
        make(1, work / "one", work / "one.csv")
        one = work / "one"
        for n in sizes:
            many = work / f"many{n}"
            make(n, many, work / f"many{n}.csv")
            cases = [("TOML", many, one, []), ("CSV", work / f"many{n}.csv", work / "one.csv", [])]
            if n == min(sizes):  # the work a unit costs, for comparison: one process, no target
                cases.append(("CSV", work / f"many{n}.csv", work / "one.csv", ["--jobs", "1"]))
            for name, big, small, options in cases:
                t_big, t_small, memory = [], [], []
                for _ in range(repeat if n <= 20_000 else 1):
                    t, m = run([py, "-m", "stallcheck", "survey", str(big), *options])
                    t_big.append(t)
                    memory.append(m)
                    t_small.append(run([py, "-m", "stallcheck", "survey", str(small)])[0])
                big_t, small_t = statistics.median(t_big), statistics.median(t_small)
                marginal = (big_t - small_t) / (n - 1) * 1000.0
                mem = "" if n < max(sizes) else f"  {verdict(max(memory), TARGETS['memory'])} MB"
                target = (f"{verdict(marginal, TARGETS['survey ' + name])}" if not options
                          else "one process, no target")
                print(f"survey {name:4s} {n:>7,} units {big_t:6.1f} s: {marginal:5.3f} ms/unit  "
                      f"{target}; peak {max(memory):3.0f} MB{mem}")
            shutil.rmtree(many, ignore_errors=True)
        # units that all describe their return line against the same units without: the
        # marginal cost a unit, one process each
        n = min(sizes)
        subprocess.run([py, __file__, "--write-lines", str(n), str(work / "lines.csv")], check=True)
        plain, lined = [], []
        for _ in range(repeat):
            plain.append(run([py, "-m", "stallcheck", "survey", str(work / f"many{n}.csv"), "--jobs", "1"])[0]
                         if (work / f"many{n}.csv").exists() else float("nan"))
            lined.append(run([py, "-m", "stallcheck", "survey", str(work / "lines.csv"), "--jobs", "1"])[0])
        one = statistics.median(run([py, "-m", "stallcheck", "survey", str(work / "one.csv")])[0]
                                for _ in range(repeat))
        ratio = (statistics.median(lined) - one) / (statistics.median(plain) - one)
        print(f"survey, return lines   {n:>7,} units: x{ratio:4.2f} the marginal cost without  "
              f"{verdict(ratio, TARGETS['return lines'])}")
    finally:
        shutil.rmtree(work, ignore_errors=True)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--repeat", type=int, default=3)
    parser.add_argument("--units", default="10000,100000",
                        help="survey sizes, comma-separated (default 10000,100000)")
    parser.add_argument("--write", nargs=3, metavar=("N", "FOLDER", "CSV"), help=argparse.SUPPRESS)
    parser.add_argument("--write-lines", nargs=2, metavar=("N", "CSV"), help=argparse.SUPPRESS)
    args = parser.parse_args()
    if args.write:
        write_units(int(args.write[0]), Path(args.write[1]), Path(args.write[2]))
        return
    if args.write_lines:
        units = invented(int(args.write_lines[0]))
        for u in units:   # each describes the line from its trap, pitched with the flow
            u["drain.return_line"] = "1 in" if u["design.medium"] == "air" else "25 mm"
            u["drain.return_pitch"] = "0.5 %"
        Path(args.write_lines[1]).write_text(to_csv(units), encoding="utf-8")
        return
    print(f"{time.strftime('%Y-%m-%d')}, {os.cpu_count()} cores, median of {args.repeat} runs "
          f"(one run above 20,000 units); floor: python -c 'import numpy, typer, rich'")
    ratios(args.repeat)
    surveys([int(n) for n in args.units.split(",")], args.repeat)


if __name__ == "__main__":
    main()
