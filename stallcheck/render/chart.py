"""The stall chart as text: coil steam pressure against load (or entering temperature).

Marks, chosen to read without colour:

    *   steam pressure the coil runs at: what the load needs, or what the open valve
        gives where that is less
    o   what the load needs, where a too-small valve holds the coil below it
    -   back pressure on the trap (return pressure plus lift)
    ~   atmospheric pressure (0 gauge), where it is not the back-pressure line
    X   the stall point
    D   the drainage limit: below it the trap cannot pass the condensate (shown where
        it lies apart from the stall point)
    .   the stalled zone: loads where the trap cannot discharge
    |   the minimum load the unit runs at (when above zero)

The chart is returned as lines of (text, style) runs so that the terminal presenter
can colour it and the plain presenters can join it.
"""

from __future__ import annotations

import numpy as np


from stallcheck.files import display
from stallcheck.result import Result

#: Style names the terminal maps to colours.
STYLES = {"*": "curve", "o": "need", "-": "back", "~": "atmos", "X": "stall", "D": "limit", ".": "zone",
          "|": "minimum"}

LEGEND = [
    ("*", "steam pressure the coil needs"),
    ("o", "what the load needs, where the open valve holds the coil lower"),
    ("-", "back pressure on the trap"),
    ("~", "atmospheric (0 gauge)"),
    ("X", "stall point"),
    ("D", "drainage limit: the trap falls short below it"),
    (".", "stalled: the trap cannot discharge"),
    ("|", "minimum load"),
]


def _nice_step(span: float, target: int) -> float:
    raw = span / max(target, 1)
    power = 10 ** np.floor(np.log10(raw))
    for m in (1, 2, 2.5, 5, 10):
        if m * power >= raw:
            return float(m * power)
    return float(10 * power)


#: Rows the chart may use unless told: 16 holds five steps of three rows each.
HEIGHT = 16


def render(result: Result, system: str, width: int = 78, height: int = HEIGHT,
           x_axis: str = "load") -> list[list[tuple[str, str | None]]]:
    """Draw the stall chart.

    Parameters
    ----------
    result : Result
    system : str
        ``"si"`` or ``"us"`` display units.
    width : int
        Total characters per line (≥ 50).
    height : int
        Rows of plot area.
    x_axis : str
        ``"load"`` (0–100 %) or ``"inlet"`` (entering temperature; only where the load
        follows it).

    Returns
    -------
    list of list of (str, str or None)
        Lines of runs of text with a style name from :data:`STYLES`.
    """
    atm = result.atmospheric_pressure
    pts = result.points
    pressure = np.array(display.convert_array(pts.coil_pressure, "pressure", system, atm))
    back = display.convert(result.back_pressure, "pressure", system, atm)
    unit = display.label("pressure", system)
    by_inlet = x_axis == "inlet" and result.varies == "inlet-temperature"

    label_w = 7
    plot_w = max(width - label_w - 2, 30)
    x_data = np.array(display.convert_array(pts.inlet_temperature, "temperature", system)) if by_inlet \
        else pts.load_fraction * 100.0
    x_lo, x_hi = float(np.min(x_data)), float(np.max(x_data))

    def col(x):
        return int(round((x - x_lo) / (x_hi - x_lo) * (plot_w - 1)))

    limited = pts.valve_limited
    needed = (np.array(display.convert_array(pts.needed_coil_pressure, "pressure", system, atm))
              if limited.any() else pressure)
    y_lo = min(float(pressure.min()), back, 0.0)
    y_hi = max(float(needed.max()), back)
    # every tick on a row of its own, a whole number of rows a step (a value is never
    # drawn a row away from its label): the usual step, widened until a row a step fits
    for ticks in range(5, 0, -1):
        step = _nice_step(y_hi - y_lo, ticks)
        lo = np.floor(y_lo / step + 1e-6) * step
        steps = max(int(round((np.ceil(y_hi / step - 1e-6) * step - lo) / step)), 1)
        if steps <= height - 1:
            break
    y_lo, y_hi = lo, lo + steps * step
    per_step = max((height - 1) // steps, 1)
    height = steps * per_step + 1
    # no row below a perfect vacuum: the axis stops at the row holding it
    vacuum = display.convert(0.0, "pressure", system, atm)
    height = min(height, int(np.floor((y_hi - vacuum) / (step / per_step) + 0.5)) + 1)

    def row(y):
        return min(int(round((y_hi - y) / step * per_step)), height - 1)

    grid = [[" "] * plot_w for _ in range(height)]
    # stalled zone: every column whose load is stalled, from the axis up to the curve
    x_fine = np.linspace(x_lo, x_hi, plot_w)
    stalled_fine = np.interp(x_fine, x_data[np.argsort(x_data)], pts.stalled[np.argsort(x_data)].astype(float)) > 0.5
    p_fine = np.interp(x_fine, x_data[np.argsort(x_data)], pressure[np.argsort(x_data)])
    for c in range(plot_w):
        if stalled_fine[c]:
            top = row(p_fine[c])
            for r in range(top + 1, height):
                if (r + c) % 2 == 0:
                    grid[r][c] = "."
    # atmospheric and back pressure lines
    if abs(back) > (y_hi - y_lo) / (height - 1) / 2:
        r0 = row(0.0)
        for c in range(plot_w):
            if c % 2 == 0:
                grid[r0][c] = "~"
    rb = row(back)
    for c in range(plot_w):
        grid[rb][c] = "-"
    # minimum load
    if result.minimum_load > 0:
        xm = float(display.convert_array([float(np.interp(result.minimum_load, pts.load_fraction, pts.inlet_temperature))],
                                   "temperature", system)[0]) if by_inlet else result.minimum_load * 100
        cm = col(xm)
        for r in range(height):
            if grid[r][cm] in " .~":
                grid[r][cm] = "|"
    # what the load needs where the valve holds the coil lower, then the curve over it
    if limited.any():
        order = np.argsort(x_data)
        need_fine = np.interp(x_fine, x_data[order], needed[order])
        lim_fine = np.interp(x_fine, x_data[order], limited[order].astype(float)) > 0.5
        for c in np.flatnonzero(lim_fine):
            grid[row(need_fine[c])][c] = "o"
    for c in range(plot_w):
        grid[row(p_fine[c])][c] = "*"
    # drainage limit
    tr = result.trap
    if tr is not None and tr.limit_load is not None:
        if by_inlet and tr.limit_inlet_temperature is not None:
            xl = display.convert(tr.limit_inlet_temperature, "temperature", system)
        else:
            xl = tr.limit_load * 100
        grid[row(display.convert(tr.limit_coil_pressure, "pressure", system, atm))][col(xl)] = "D"
    # stall point
    s = result.stall
    if s.occurs:
        xs = display.convert(s.inlet_temperature, "temperature", system) if by_inlet else s.load_fraction * 100
        ys = display.convert(s.coil_pressure, "pressure", system, atm)
        grid[row(ys)][col(xs)] = "X"

    lines: list[list[tuple[str, str | None]]] = []
    decimals = 0 if step >= 1 else (1 if step >= 0.1 else 2)
    tick_rows = {row(y): y for y in np.arange(y_lo, y_hi + step / 2, step) if y >= vacuum - 1e-9}
    lines.append([(f"{unit:>{label_w}}", None)])
    for r in range(height):
        text = f"{tick_rows[r]:{label_w}.{decimals}f} +" if r in tick_rows else " " * label_w + " |"
        runs: list[tuple[str, str | None]] = [(text, None)]
        for ch in grid[r]:
            style = STYLES.get(ch)
            if runs and runs[-1][1] == style:
                runs[-1] = (runs[-1][0] + ch, style)
            else:
                runs.append((ch, style))
        lines.append(runs)
    # x axis
    axis = [" "] * plot_w
    labels = [" "] * (plot_w + 6)
    if by_inlet:
        x_step = _nice_step(x_hi - x_lo, 6)
        ticks = np.arange(np.ceil(x_lo / x_step) * x_step, x_hi + 1e-9, x_step)
    else:
        ticks = np.arange(0.0, 100.1, 20.0)
    for x in ticks:
        c = col(x)
        if c > 0:
            axis[c] = "+"
        tick = f"{x:.0f}".replace("-0", "0") if abs(x) < 0.5 else f"{x:.0f}"
        start = max(0, min(c - len(tick) // 2, len(labels) - len(tick)))
        labels[start:start + len(tick)] = list(tick)
    lines.append([(" " * label_w + " +" + "".join(axis).replace(" ", "-"), None)])
    lines.append([(" " * (label_w + 2) + "".join(labels).rstrip(), None)])
    x_name = (f"entering temperature, {display.label('temperature', system)} (load falls to the right)"
              if by_inlet else "load, % of design")
    lines.append([(" " * (label_w + 2) + x_name.center(plot_w).rstrip(), None)])
    used = {ch for line in grid for ch in line}
    legend = [(m, "steam pressure the coil runs at" if m == "*" and "o" in used else words)
              for m, words in LEGEND if m in used]
    legend_runs: list[tuple[str, str | None]] = [("  ", None)]
    line_len = 2
    for mark, words in legend:
        piece = f"{words}   "
        if line_len + len(piece) + 2 > width:
            lines.append(legend_runs)
            legend_runs, line_len = [("  ", None)], 2
        legend_runs += [(mark, STYLES[mark]), (" " + piece, None)]
        line_len += len(piece) + 2
    lines.append(legend_runs)
    return lines


def plain(lines: list[list[tuple[str, str | None]]]) -> str:
    """Join chart lines to plain text."""
    return "\n".join("".join(text for text, _ in line).rstrip() for line in lines)


def points_csv(result: Result, system: str) -> str:
    """The chart's points as a CSV table for a spreadsheet: one row per load step, in the
    display units of ``system`` (each column's unit in its header; pressures gauge)."""
    import csv
    import io

    pts = result.points
    atm = result.atmospheric_pressure
    p_unit, t_unit = display.label("pressure", system), display.label("temperature", system)
    dp_unit, w_unit = display.label("differential", system), display.label("mass_flow", system)
    buffer = io.StringIO()
    out = csv.writer(buffer, lineterminator="\n")
    out.writerow(["load [%]", f"entering temperature [{t_unit}]", f"coil pressure [{p_unit}]",
                  f"back pressure [{p_unit}]", f"steam temperature [{t_unit}]", f"steam flow [{w_unit}]",
                  f"drain differential [{dp_unit}]", "stalled", "valve travel [%]"])
    back = display.convert(result.back_pressure, "pressure", system, atm)
    for i, f in enumerate(pts.load_fraction):
        opening = "" if pts.valve_opening is None else f"{100.0 * pts.valve_opening[i]:.1f}"
        out.writerow([f"{100.0 * f:g}", f"{display.convert(pts.inlet_temperature[i], 'temperature', system):.2f}",
                      f"{display.convert(pts.coil_pressure[i], 'pressure', system, atm):.4f}", f"{back:.4f}",
                      f"{display.convert(pts.steam_temperature[i], 'temperature', system):.2f}",
                      f"{display.convert(pts.steam_flow[i], 'mass_flow', system):.2f}",
                      f"{display.convert(pts.drain_differential[i], 'differential', system):.4f}",
                      "yes" if pts.stalled[i] else "no", opening])
    return buffer.getvalue()
