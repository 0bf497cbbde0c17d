"""The two ways a steam unit hammers besides the stall: differential shock in the return
line, and hydraulic shock where a moving column of condensate is stopped.

* **Differential shock.** Flash steam and condensate share the line from the trap. Where
  the flow is intermittent (slug) a wave of condensate seals the pipe and the steam
  behind drives it as a slug. The flow pattern comes from Taitel & Dukler (1976),
  written out here with the line's inclination (:func:`taitel_dukler_many`), and up a
  riser from Taitel, Barnea & Dukler (1980) (:func:`vertical_regime`); Mandhane,
  Gregory & Aziz (1974), from the ``fluids`` library, is the second opinion
  (:mod:`stallcheck.analysis.lines` runs them over a batch).
* **Hydraulic shock.** A column moving at v stopped within one wave round trip 2L/a
  raises the pressure by Joukowsky's Δp = ρ·a·Δv; the wave speed a in a pipe follows
  Korteweg's correction for the elasticity of its wall. A slower closure, t_c > 2L/a,
  raises it by about 2·ρ·L·Δv/t_c (Michaud's formula).

SI throughout: pressures [Pa], lengths [m], velocities [m/s], flows [kg/s].
"""

from __future__ import annotations

import math

import numpy as np

from stallcheck.physics.constants import GRAVITY

#: Young's modulus of pipe materials [Pa]: carbon steel 200 GPa, copper 117 GPa
#: (Wylie & Streeter, *Fluid Transients in Systems*, 1993, Table 2.1; from memory).
YOUNGS_MODULUS = {"steel": 200e9, "copper": 117e9}
#: Inside diameter and wall of Schedule 40 steel pipe by nominal size [m] (ASME B36.10M;
#: from memory): the standard bores a larger return line is chosen from.
SCHEDULE_40 = (
    ("1/2 in", 0.622 * 0.0254, 0.109 * 0.0254), ("3/4 in", 0.824 * 0.0254, 0.113 * 0.0254),
    ("1 in", 1.049 * 0.0254, 0.133 * 0.0254), ("1-1/4 in", 1.380 * 0.0254, 0.140 * 0.0254),
    ("1-1/2 in", 1.610 * 0.0254, 0.145 * 0.0254), ("2 in", 2.067 * 0.0254, 0.154 * 0.0254),
    ("2-1/2 in", 2.469 * 0.0254, 0.203 * 0.0254), ("3 in", 3.068 * 0.0254, 0.216 * 0.0254),
    ("4 in", 4.026 * 0.0254, 0.237 * 0.0254), ("6 in", 6.065 * 0.0254, 0.280 * 0.0254),
)
#: Below this flash fraction the line runs liquid only: no steam to drive a slug [-].
NO_FLASH = 1e-4
#: The pattern named where the line runs liquid only.
LIQUID = "liquid only"
#: Taitel-Dukler patterns in which the line stays stratified: condensate along the
#: bottom, steam above, no slug to drive.
STRATIFIED = ("stratified smooth", "stratified wavy", LIQUID)


#: Taitel, Barnea & Dukler's upward patterns, as :func:`vertical_regime_many` names them.
VERTICAL_PATTERNS = ("annular", "dispersed bubble", "bubbly", "churn", "slug")


def vertical_regime(u_ls: float, u_gs: float, rho_l: float, rho_g: float, mu_l: float, sigma: float,
                    bore: float, height: float) -> str:
    """:func:`vertical_regime_many` for one riser and flow: the pattern's name."""
    return str(vertical_regime_many(u_ls, u_gs, rho_l, rho_g, mu_l, sigma, bore, height).flat[0])


def vertical_regime_many(u_ls, u_gs, rho_l, rho_g, mu_l, sigma, bore, height):
    """The flow pattern of a gas and a liquid rising in a vertical pipe, from superficial
    velocities U_Ls, U_Gs [m/s] (U_M = U_Ls + U_Gs) and the two phases' properties
    (densities [kg/m³], liquid viscosity [Pa·s], surface tension [N/m]): for condensate
    and its flash steam up a lift, or any gas and liquid. Taitel, Barnea & Dukler's
    transitions for steady upward flow:

    * **annular** where the gas can carry the largest drop up the wall:
      U_Gs·ρ_G^½ / [σ·g·(ρ_L − ρ_G)]^¼ ≥ 3.1 (eq. 20);
    * **dispersed bubble** where turbulence breaks the gas into bubbles smaller than
      the critical size, 2·[0.4σ/((ρ_L − ρ_G)g)]^½·(ρ_L/σ)^0.6·(2f/D)^0.4·U_M^1.2
      ≥ 0.725 + 4.15·(U_Gs/U_M)^½ (eq. 13, f = 0.046·Re^−0.2 of the mixture at the
      liquid's properties), while the gas is less than 52 % of the volume;
    * **bubbly** in a pipe wider than D* = 19·[(ρ_L − ρ_G)σ/(ρ_L²g)]^½ (eq. 9) while
      the void is under 25 %: U_Ls ≥ 3.0·U_Gs − 1.15·[g(ρ_L − ρ_G)σ/ρ_L²]^¼ (eq. 4);
    * otherwise **slug**, or **churn** where the pipe (``height`` [m]) is shorter than
      the entry length over which churn develops into slugs,
      l_E/D = 40.6·(U_M/√(gD) + 0.22) (eq. 21).

    Every argument may be an array (one pattern an element, broadcast).

    Returns
    -------
    ndarray of str
        ``annular``, ``dispersed bubble``, ``bubbly``, ``slug`` or ``churn``.

    References
    ----------
    .. [1] Taitel, Y., Barnea, D., Dukler, A. E. (1980). Modelling flow pattern
       transitions for steady upward gas-liquid flow in vertical tubes. AIChE J. 26(3),
       345-354.
    """
    u_ls, u_gs, rho_l, rho_g, mu_l, sigma, bore, height = np.broadcast_arrays(
        *(np.asarray(v, dtype=float) for v in (u_ls, u_gs, rho_l, rho_g, mu_l, sigma, bore, height)))
    u_m = u_ls + u_gs
    drho = rho_l - rho_g
    annular = u_gs * np.sqrt(rho_g) / (sigma * GRAVITY * drho) ** 0.25 >= 3.1
    friction = 0.046 * (rho_l * u_m * bore / mu_l) ** -0.2
    breakup = (2.0 * np.sqrt(0.4 * sigma / (drho * GRAVITY)) * (rho_l / sigma) ** 0.6
               * (2.0 * friction / bore) ** 0.4 * u_m ** 1.2)
    dispersed = (u_gs / u_m < 0.52) & (breakup >= 0.725 + 4.15 * np.sqrt(u_gs / u_m))
    wide = bore > 19.0 * np.sqrt(drho * sigma / (rho_l ** 2 * GRAVITY))
    bubbly = wide & (u_ls >= 3.0 * u_gs - 1.15 * (GRAVITY * drho * sigma / rho_l ** 2) ** 0.25)
    entry = 40.6 * (u_m / np.sqrt(GRAVITY * bore) + 0.22) * bore
    code = np.select([annular, dispersed, bubbly, height < entry], [0, 1, 2, 3], default=4)
    return np.asarray(VERTICAL_PATTERNS, dtype=object)[code.reshape(-1)].reshape(code.shape)


def standard_wall(bore: float) -> float:
    """Wall thickness [m] of the Schedule 40 steel pipe whose bore is nearest ``bore`` [m]."""
    return min(SCHEDULE_40, key=lambda row: abs(row[1] - bore))[2]


#: Wave-growth sheltering coefficient of Taitel & Dukler's stratified-wavy transition
#: (Jeffreys' s, 0.01 in the paper).
SHELTERING = 0.01


#: Taitel & Dukler's patterns, as :func:`taitel_dukler_many` names them.
TD_PATTERNS = ("stratified smooth", "stratified wavy", "intermittent", "annular", "bubbly")


def taitel_dukler(u_ls: float, u_gs: float, rho_l: float, rho_g: float, mu_l: float, mu_g: float, bore: float,
                  inclination: float) -> str:
    """:func:`taitel_dukler_many` for one line and flow: the pattern's name."""
    return str(taitel_dukler_many(u_ls, u_gs, rho_l, rho_g, mu_l, mu_g, bore, inclination).flat[0])


def taitel_dukler_many(u_ls, u_gs, rho_l, rho_g, mu_l, mu_g, bore, inclination):
    r"""Taitel & Dukler's (1976) flow pattern in a horizontal or near-horizontal pipe,
    from the momentum balance of stratified flow with the pipe's inclination.

    With the liquid's and the gas's superficial pressure gradients from Blasius'
    friction (C = 0.046, n = 0.2 turbulent; 16 and 1 laminar, below Re 2,000),

    .. math::
        X^2 = \frac{(dp/dx)_{Ls}}{(dp/dx)_{Gs}},\qquad
        Y = \frac{(\rho_L - \rho_G)\,g\sin\alpha}{(dp/dx)_{Gs}}

    the stratified liquid level h̃ = h_L/D solves (eq. 7)

    .. math::
        X^2\left[(\tilde u_L\tilde D_L)^{-n}\tilde u_L^2\frac{\tilde S_L}{\tilde A_L}\right]
        - \left[(\tilde u_G\tilde D_G)^{-m}\tilde u_G^2\left(\frac{\tilde S_G}{\tilde A_G}
        + \frac{\tilde S_i}{\tilde A_L} + \frac{\tilde S_i}{\tilde A_G}\right)\right] - 4Y = 0

    and the transitions follow: stratified flow is lost where
    F²·ũ_G²·S̃_i/((1 − h̃)²·Ã_G) ≥ 1 (A; F the gas Froude number,
    √(ρ_G/(ρ_L − ρ_G))·u_Gs/√(D·g·cos α)); then annular below h̃ = 0.5 (B), else
    intermittent, or dispersed bubble where T² ≥ 8Ã_G/(S̃_i·ũ_L²·(ũ_L·D̃_L)^−n),
    T² = (dp/dx)_Ls/((ρ_L − ρ_G)·g·cos α) (D); stratified flow is wavy where
    K ≥ 2/(√ũ_L·ũ_G·√s), s = :data:`SHELTERING`, K = F·√Re_Ls (C).

    The liquid level is found by bisection on whole arrays at once (60 halvings, to
    1e-18 of the diameter), so a survey's lines and loads are one call.

    Parameters
    ----------
    u_ls, u_gs : float or ndarray
        Superficial velocities of liquid and gas (the gas's above zero). [m/s]
    rho_l, rho_g : float or ndarray  [kg/m³]
    mu_l, mu_g : float or ndarray  [Pa·s]
    bore : float or ndarray  [m]
    inclination : float or ndarray
        α, positive where the pipe falls in the direction of flow (the paper's sign).
        [rad]

    Returns
    -------
    ndarray of str
        ``stratified smooth``, ``stratified wavy``, ``intermittent``, ``annular`` or
        ``bubbly`` (dispersed bubble), one per element of the broadcast inputs.

    References
    ----------
    .. [1] Taitel, Y., Dukler, A. E. (1976). AIChE J. 22(1), 47-55.
    """
    u_ls, u_gs, rho_l, rho_g, mu_l, mu_g, bore, inclination = np.broadcast_arrays(
        *(np.asarray(v, dtype=float) for v in (u_ls, u_gs, rho_l, rho_g, mu_l, mu_g, bore, inclination)))
    g = GRAVITY
    drho = rho_l - rho_g

    def gradient(rho, u, mu):
        re = rho * u * bore / mu
        laminar = re < 2000.0
        c, n = np.where(laminar, 16.0, 0.046), np.where(laminar, 1.0, 0.2)
        return 4.0 * c / bore * re ** -n * rho * u * u / 2.0, n

    dp_l, n = gradient(rho_l, u_ls, mu_l)
    dp_g, m = gradient(rho_g, u_gs, mu_g)
    x2, y = dp_l / dp_g, drho * g * np.sin(inclination) / dp_g

    def geometry(h):
        c = 2.0 * h - 1.0
        root = np.sqrt(np.maximum(1.0 - c * c, 0.0))
        turn = np.arccos(c)
        a_l = 0.25 * (np.pi - turn + c * root)
        a_g = 0.25 * (turn - c * root)
        s_l, s_g = np.pi - turn, turn
        u_l, u_g = (np.pi / 4.0) / a_l, (np.pi / 4.0) / a_g
        return a_l, a_g, s_l, s_g, root, u_l, u_g, 4.0 * a_l / s_l, 4.0 * a_g / (s_g + root)

    def balance(h):
        a_l, a_g, s_l, s_g, s_i, u_l, u_g, d_l, d_g = geometry(h)
        return (x2 * (u_l * d_l) ** -n * u_l * u_l * s_l / a_l
                - (u_g * d_g) ** -m * u_g * u_g * (s_g / a_g + s_i / a_l + s_i / a_g) - 4.0 * y)

    # the balance falls from +inf at no liquid to -inf at no gas
    lo, hi = np.full(u_ls.shape, 1e-6), np.full(u_ls.shape, 1.0 - 1e-6)
    for _ in range(60):
        mid = 0.5 * (lo + hi)
        above = balance(mid) > 0.0
        lo, hi = np.where(above, mid, lo), np.where(above, hi, mid)
    h = 0.5 * (lo + hi)
    a_l, a_g, s_l, s_g, s_i, u_l, u_g, d_l, d_g = geometry(h)
    froude2 = rho_g / drho * u_gs * u_gs / (bore * g * np.cos(inclination))
    unstable = froude2 * u_g * u_g * s_i / ((1.0 - h) ** 2 * a_g) >= 1.0
    t2 = dp_l / (drho * g * np.cos(inclination))
    bubbly = t2 >= 8.0 * a_g / (s_i * u_l * u_l * (u_l * d_l) ** -n)
    k = np.sqrt(froude2) * np.sqrt(rho_l * u_ls * bore / mu_l)
    wavy = k >= 2.0 / (np.sqrt(u_l) * u_g * np.sqrt(SHELTERING))
    code = np.where(unstable, np.where(h < 0.5, 3, np.where(bubbly, 4, 2)), np.where(wavy, 1, 0))
    return np.asarray(TD_PATTERNS, dtype=object)[code.reshape(-1)].reshape(code.shape)


def wave_speed(bulk_modulus: float, density: float, bore: float, wall: float, youngs_modulus: float) -> float:
    """Pressure-wave speed in liquid in an elastic pipe [m/s] (Korteweg):

    .. math:: a = \\sqrt{\\frac{K/\\rho}{1 + (K/E)(D/e)}}

    for a thin-walled pipe free to move along its length (the restraint factor c₁ = 1);
    in a rigid pipe (E → ∞) it is the speed of sound in the liquid, √(K/ρ).

    Parameters
    ----------
    bulk_modulus : float
        Of the liquid, K = ρ·c², c the speed of sound. [Pa]
    density : float  [kg/m³]
    bore, wall : float
        Inside diameter and wall thickness. [m]
    youngs_modulus : float
        Of the pipe wall. [Pa]

    References
    ----------
    .. [1] Korteweg, D. J. (1878). Über die Fortpflanzungsgeschwindigkeit des Schalles
       in elastischen Röhren. Ann. Phys. 241(12), 525-542.
    .. [2] Wylie, E. B., Streeter, V. L. (1993). Fluid Transients in Systems, eq. 2.6.
    """
    return math.sqrt(bulk_modulus / density / (1.0 + bulk_modulus * bore / (youngs_modulus * wall)))


def joukowsky(density: float, speed: float, velocity_change: float) -> float:
    """Pressure rise [Pa] when a column's velocity changes by Δv within 2L/a:
    Δp = ρ·a·Δv.

    References
    ----------
    .. [1] Joukowsky, N. (1898). Über den hydraulischen Stoss in Wasserleitungsröhren.
    .. [2] Wylie, E. B., Streeter, V. L. (1993). Fluid Transients in Systems, eq. 1.1.
    """
    return density * speed * velocity_change


def surge(density: float, speed: float, velocity_change: float, length: float, closing_time: float) -> float:
    """Pressure rise [Pa] of a closure taking ``closing_time`` [s] on a line ``length``
    [m] long: Joukowsky's within the round trip 2L/a, else Michaud's 2·ρ·L·Δv/t_c.

    References
    ----------
    .. [1] Michaud, J. (1878). Coups de bélier dans les conduites. Bull. Soc. Vaudoise
       Ing. Arch. 4; as given in Thorley, A. R. D. (2004), Fluid Transients in Pipeline
       Systems, 2nd ed., section 2.3.
    """
    sudden = joukowsky(density, speed, velocity_change)
    if closing_time <= 0.0:
        return sudden
    # Michaud's figure reaches Joukowsky's at t_c = 2L/a and exceeds it below: the
    # smaller of the two is the rise either side of the round trip
    return min(sudden, 2.0 * density * length * velocity_change / closing_time)

