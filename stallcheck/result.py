"""The result of analysing one unit. Everything in SI base units: pressures [Pa]
absolute, temperatures [K], mass flows [kg/s], heat [W], fractions [-].

Presenters (``stallcheck.render``) turn it into text, a chart or JSON; nothing here
prints or formats.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

SEVERITIES = ("info", "warning", "danger")

CAUTIONS = (
    "Screening aid only: it does not replace the equipment makers' data, local codes "
    "and licensed engineering practice, which govern installation and remedies.",
    "Steam and condensate scald and can burst coils, traps and piping. Make a banging "
    "(water-hammering) system safe - isolate, drain and cool it - before studying it.",
)


@dataclass(frozen=True)
class Finding:
    """One thing the user should know, with the remedy in ``message``.

    Attributes
    ----------
    code : str
        Stable kebab-case identifier.
    severity : str
        ``"info"``, ``"warning"`` or ``"danger"``.
    message : str
        Plain words: what, why, and what to do.
    """

    code: str
    severity: str
    message: str


@dataclass(frozen=True)
class DesignPoint:
    """Full load.

    Attributes
    ----------
    load : float  [W]
    steam_flow : float  [kg/s]
    coil_pressure : float  [Pa]
    steam_temperature : float  [K]
    medium_mass_flow : float  [kg/s]
    medium_cp : float  [J/(kg·K)]
    """

    load: float
    steam_flow: float
    coil_pressure: float
    steam_temperature: float
    medium_mass_flow: float
    medium_cp: float


@dataclass(frozen=True)
class StallPoint:
    """Where the trap stops discharging.

    Attributes
    ----------
    occurs : bool
        True where the unit stalls at some load in (0, 1].
    threshold_pressure : float
        Coil pressure at or below which the trap cannot discharge. [Pa]
    load_fraction : float or None
        Load below which it stalls; 1.0 where stalled even at full load. [-]
    coil_pressure, steam_temperature, condensate, inlet_temperature : float or None
        At the stall point [Pa], [K], [kg/s], [K] (inlet only where the load follows it).
    """

    occurs: bool
    threshold_pressure: float
    load_fraction: float | None = None
    coil_pressure: float | None = None
    steam_temperature: float | None = None
    condensate: float | None = None
    inlet_temperature: float | None = None


@dataclass(frozen=True)
class Points:
    """The unit across its load range, as arrays of equal length.

    Attributes
    ----------
    load_fraction : ndarray  [-]
    inlet_temperature : ndarray  [K]
    coil_pressure : ndarray  [Pa]
    steam_temperature : ndarray  [K]
    steam_flow : ndarray  [kg/s]
    drain_differential : ndarray
        p_coil + fill head − back pressure. [Pa]
    stalled : ndarray of bool
    valve_opening : ndarray or None
        Travel 0–1 needed; above 1 where the open valve cannot pass the flow. [-]
    """

    load_fraction: np.ndarray
    inlet_temperature: np.ndarray
    coil_pressure: np.ndarray
    steam_temperature: np.ndarray
    steam_flow: np.ndarray
    drain_differential: np.ndarray
    stalled: np.ndarray
    valve_opening: np.ndarray | None = None


@dataclass(frozen=True)
class Drainage:
    """Installed against required arrangement."""

    installed: str
    required: str
    adequate: bool
    reasons: tuple[str, ...]


@dataclass(frozen=True)
class ValveResult:
    """Control valve figures.

    Attributes
    ----------
    cv : float
        Installed full-travel Cv. [-]
    required_cv_design : float  [-]
    opening_design : float
        Travel at design; above 1 where the valve is too small. [-]
    capacity_ok : bool
    choked_at_design : bool
    limited_load_fraction, limited_coil_pressure : float or None
        Where the open valve cannot pass the design load: what it delivers [-] and
        the coil pressure it holds [Pa].
    min_controllable_load : float
        Load at which the needed Cv falls to Cv/rangeability. [-]
    rangeability : float  [-]
    characteristic : str
    """

    cv: float
    required_cv_design: float
    opening_design: float
    capacity_ok: bool
    choked_at_design: bool
    limited_load_fraction: float | None
    limited_coil_pressure: float | None
    min_controllable_load: float
    rangeability: float
    characteristic: str


@dataclass(frozen=True)
class Result:
    """Everything ``check`` reports about one unit.

    Pressures [Pa] absolute; ``back_pressure`` is return pressure plus the lift head,
    ``fill_head_pressure`` the head of the fill height [Pa]; ``lift`` and ``fill_head``
    are heights [m].
    """

    unit: str
    tag: str
    source: str
    system: str
    method: str
    varies: str
    medium: str
    minimum_load: float
    atmospheric_pressure: float
    return_pressure: float
    back_pressure: float
    fill_head_pressure: float
    trap_min_differential: float
    lift: float
    fill_head: float
    supply_pressure: float
    design: DesignPoint
    stall: StallPoint
    points: Points
    stalled_hours: float | None
    total_hours: float | None
    drainage: Drainage
    valve: ValveResult | None
    findings: tuple[Finding, ...]
    assumptions: tuple[str, ...]
    warnings: tuple[str, ...] = ()
    cautions: tuple[str, ...] = field(default=CAUTIONS)
    format: int = 1

    @property
    def worst_severity(self) -> str | None:
        """The highest severity among the findings, or None."""
        present = [SEVERITIES.index(f.severity) for f in self.findings]
        return SEVERITIES[max(present)] if present else None

    @property
    def exit_status(self) -> int:
        """0 adequate and nothing at warning or above; 1 otherwise (the exit-status contract)."""
        worst = self.worst_severity
        if not self.drainage.adequate or worst in ("warning", "danger"):
            return 1
        return 0
