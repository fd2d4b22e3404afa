"""Timing laws of 555-class timers and one-shots.

Every function takes SI quantities (Ω, F, V) and returns seconds. They accept
plain floats or numpy arrays of equal shape (the Monte Carlo module passes arrays),
and never import numpy themselves so the CLI's start-up path stays light.

Underneath all of them is the RC charge law: a capacitor charging through R from
V0 toward V∞ reaches Vth after

    t = R·C·ln((V∞ − V0)/(V∞ − Vth))                                     (1)

(first-order RC step response; any circuit-theory textbook, e.g. Horowitz & Hill,
*The Art of Electronics*, 3rd ed., §1.4.2). The published datasheet formulas are
special cases of (1) with the part's thresholds, or empirical K·R·C fits.
"""

from __future__ import annotations

import math

LN2 = math.log(2.0)
LN3 = math.log(3.0)


def _ln(x):
    """Natural log of a float or a numpy array (numpy only when the caller uses it)."""
    if isinstance(x, (int, float)):
        return math.log(x)
    import numpy as np  # only reached when the caller already passes arrays

    return np.log(x)


def rc_threshold_time(r, c, v_inf, v0, vth):
    """Time for an RC node to move from ``v0`` to ``vth`` while heading for ``v_inf``.

    Equation (1): t = R·C·ln((V∞ − V0)/(V∞ − Vth)). Units: R in Ω, C in F, voltages
    in V, t in s. Works for charging (V∞ > Vth > V0) and discharging (V∞ < Vth < V0).
    Raises ValueError when the threshold is never reached (Vth not strictly between
    V0 and V∞) for scalar inputs. Source: first-order step response (textbook).
    """
    if isinstance(v_inf, (int, float)) and isinstance(v0, (int, float)) and isinstance(vth, (int, float)):
        lo, hi = sorted((v0, v_inf))
        if not (lo <= vth < hi or lo < vth <= hi) or vth == v_inf:
            raise ValueError(f"threshold {vth:g} V is not between the start {v0:g} V and the final {v_inf:g} V")
    return r * c * _ln((v_inf - v0) / (v_inf - vth))


def k_rc(k, r, c, r_offset=0.0):
    """One-shot pulse width t = K·(R + r_offset)·C.

    K is the maker's published timing constant (dimensionless; 0.7 = ln 2 for the
    74121/74LS221/74HC221 class, 0.45–0.55 for the 74HC123 by supply, 1.0 for the
    CD4538B); ``r_offset`` (Ω) is a published internal-resistance correction where
    one exists. R in Ω, C in F, t in s. Sources: the family's catalog entries.
    """
    return k * (r + r_offset) * c


def ln_supply(a, r, c, vdd):
    """4528-class width t = a·R·C·ln(VDD − VSS), VSS = 0.

    a ≈ 0.2 (dimensionless, published), R in Ω, C in F, VDD in V, t in s; holds for
    Cx > 0.01 µF. Source: ON Semiconductor MC14528B; NXP HEF4528B rev 7.
    """
    return a * r * c * _ln(vdd)


def timer555_mono(r, c, upper):
    """555 monostable width, exact form: t = R·C·ln(1/(1 − u)).

    The capacitor starts discharged (V0 = 0) and charges toward VCC through R (RA)
    until THRES reaches u·VCC (u = 2/3 by the internal divider, or CONT/VCC when the
    control pin is driven). With u = 2/3: t = ln 3·R·C ≈ 1.0986·R·C; the datasheets
    round this to 1.1·R·C. R in Ω, C in F, t in s. Source: TI TLC555-Q1 SLFS078C
    (t = 1.1·RA·C); equation (1) with V∞ = VCC, V0 = 0, Vth = u·VCC.
    """
    return r * c * _ln(1.0 / (1.0 - upper))


def timer555_astable(ra, rb, c, upper, lower, r_dis=0.0):
    """555 astable high and low times (tH, tL) in s, exact form.

    High: C charges from l·VCC to u·VCC through RA + RB toward VCC:
        tH = (RA + RB)·C·ln((1 − l)/(1 − u))
    Low: the discharge transistor (on-resistance Rd) pulls DIS low; seen from C the
    source is RB + RA‖Rd heading for VCC·Rd/(RA + Rd):
        tL = (RB + RA‖Rd)·C·ln((u − d)/(l − d)),  d = Rd/(RA + Rd)
    With Rd = 0 this is tL = RB·C·ln(u/l). At u = 2/3, l = 1/3: tH = ln 2·(RA+RB)·C,
    tL = ln 2·RB·C, f = 1/(ln 2·(RA+2RB)·C) ≈ 1.44/((RA+2RB)·C). Driving CONT to Vc
    gives u = Vc/VCC, l = Vc/(2·VCC). Units: Ω, F, fractions of VCC, s.
    Sources: Diodes NE555 DS35112 rev 4; TI TLC555 SLFS043C (discharge on-resistance
    adds to RB); equation (1).
    """
    t_high = (ra + rb) * c * _ln((1.0 - lower) / (1.0 - upper))
    if isinstance(ra, (int, float)) and isinstance(r_dis, (int, float)) and ra + r_dis == 0:
        d, r_low = 0.0, rb  # RA = Rd = 0: no divider (the domain guards refuse a zero time)
    else:
        d = r_dis / (ra + r_dis)
        r_low = rb + ra * r_dis / (ra + r_dis)
    if isinstance(d, (int, float)) and isinstance(lower, (int, float)):
        # d >= l: the divider RA/Rd holds C above the lower threshold, the low phase
        # never ends (advisor.timing.domain refuses such a circuit with its reason).
        t_low = r_low * c * _ln((upper - d) / (lower - d)) if lower > d else math.inf
    else:
        import numpy as np  # arrays only come from callers that already use numpy

        ok = np.asarray(lower > d)
        with np.errstate(divide="ignore", invalid="ignore"):
            t_low = np.where(ok, r_low * c * np.log(np.where(ok, (upper - d) / (lower - d), 1.0)), np.inf)
    return t_high, t_low


def cd4047_mono(k_mono, r, c):
    """4047 monostable width t = k·Rt·Ct, k = 2.48 typ (2.48–2.88 over makers).

    Rt in Ω, Ct in F, t in s. Source: Philips HEF4047B (1995); Fairchild CD4047BC
    DS005969.
    """
    return k_mono * r * c


def cd4047_astable(k_astable, r, c):
    """4047 astable period at Q: T = k·Rt·Ct, k = 4.40 typ; Q is square (duty 0.5).

    The OSC output runs at twice Q's frequency. Rt in Ω, Ct in F, T in s.
    Source: Philips HEF4047B (1995); Fairchild CD4047BC DS005969.
    """
    return k_astable * r * c


def cd4541_oscillator(k_osc, r, c):
    """4541 RC oscillator period T = k·Rt·Ct (k ≈ 2.3, published), in s.

    The output is the oscillator divided by 2^8, 2^10, 2^13 or 2^16 (pins A, B).
    Rt in Ω, Ct in F. Source: the family's catalog entry (maker's datasheet).
    """
    return k_osc * r * c


#: Divide ratios a 4541 can select with its A/B program pins.
CD4541_DIVIDERS = (2 ** 8, 2 ** 10, 2 ** 13, 2 ** 16)


def counter_period(k_osc, r, c, n):
    """Counter-timer output period T_out = N·k·Rt·Ct, in s.

    An RC oscillator of period T = k·Rt·Ct drives a binary counter (or a programmed
    count); the output taken at divide ratio N has the period N·T and, for a binary
    stage, a square shape. k is the maker's oscillator constant (dimensionless: 2.3 in
    the Philips HEF4541B, January 1995, "typical formula for oscillator frequency"
    f = 1/(2.3·Rt·Ct); 2.5 in the Philips 74HC/HCT4060, December 1990, Fig.10). N is a
    count the family publishes (``counter.divide_by``). Rt in Ω, Ct in F.
    Sources: the family's catalog entries (maker's datasheet, oscillator formula and
    frequency-selection table).
    """
    return n * k_osc * r * c


def counter_delay(k_osc, r, c, n, fraction):
    """Counter-timer single interval t = fraction·N·k·Rt·Ct, in s.

    From the reset's release the output at divide ratio N first changes after
    fraction·N oscillator periods: a binary stage 2^n first rises after 2^(n-1)
    counts (fraction 0.5: Philips HEF4541B, January 1995, function table note 2,
    "the output changes state after 2^(n-1) counts"); a programmed count after N
    (fraction 1). Units and k as :func:`counter_period`.
    """
    return fraction * n * k_osc * r * c
