"""No-load (de-energized) primary taps of a distribution transformer.

Convention (the nameplate one): a primary tap is named by the primary voltage it is
meant for, as a percent of rated primary voltage. A "+" tap (above normal, e.g.
"+2.5 %" = 492 V on a 480 V winding) uses more primary turns, so for the same applied
primary voltage the secondary voltage is LOWER; a "-" tap (below normal) raises it.
Spellings without a sign, or with words whose direction is ambiguous (boost, buck,
raise, lower, up, down, ±), are refused: "raise" may mean the tap voltage or the
secondary voltage, the opposite directions.

Secondary voltage at no load: V_s = V_s,rated · (V_p,applied / V_p,rated) / (1 + t/100),
t the tap in percent (turns ratio changed in proportion to the tap voltage).

References
----------
.. [1] IEEE Std C57.12.00-2021, clause 5.9 (taps are rated primary voltages of the
   winding; full-capacity taps above and below rated voltage, FCAN / FCBN) and
   IEEE Std C57.12.80 (tap definition) — from memory, verify the clause numbers.
"""

from __future__ import annotations

import re

import numpy as np

MAX_TAP_PCT = 10.0  # common practice, no source: distribution transformers ±5 %, some -10 %
_SIGNED = re.compile(r"^\s*([+-])\s*(\d+(?:\.\d+)?)\s*%?\s*$")
_WORDED = re.compile(
    r"^\s*(\d+(?:\.\d+)?)\s*%?\s+(above|below)(?:\s+(?:normal|nominal|rated))?"
    r"\s*$",
    re.IGNORECASE,
)
_ZERO = re.compile(r"^\s*(?:[+-]?\s*0+(?:\.0+)?\s*%?|nominal|normal|rated)\s*$", re.IGNORECASE)
_AMBIGUOUS_WORDS = ("boost", "buck", "raise", "lower", "up", "down", "±", "+/-", "+-")


def parse_tap_pct(text: str) -> float:
    """Tap [%] of rated primary voltage from its spelling; + = above normal.

    Accepted: ``"+2.5 %"``, ``"-5%"``, ``"+2.5"``, ``"2.5 % above normal"``,
    ``"5 % below"``, ``"0"``, ``"nominal"``.

    Raises
    ------
    ValueError
        An unsigned nonzero tap, an ambiguous word, or a tap beyond ±10 %; the message
        names the value and the accepted spellings.

    Examples
    --------
    >>> parse_tap_pct("+2.5 %"), parse_tap_pct("5 % below normal"), parse_tap_pct("0")
    (2.5, -5.0, 0.0)
    """
    if not isinstance(text, str):
        raise ValueError(f"tap: got {text!r}; expected text such as '+2.5 %' or '-5 %'")
    expect = (
        "expected a signed percent of rated primary voltage, '+2.5 %' (above "
        "normal: lowers the secondary) or '-2.5 %' (below normal: raises it), or "
        "'2.5 % above' / '2.5 % below', or '0'"
    )
    low = text.strip().lower()
    if _ZERO.match(low):
        return 0.0
    if any(w in low for w in _AMBIGUOUS_WORDS if not w.isalpha()) or any(
        re.search(rf"\b{w}\b", low) for w in _AMBIGUOUS_WORDS if w.isalpha()
    ):
        raise ValueError(
            f"tap: got {text!r}, which is ambiguous (the direction may refer "
            f"to the tap or to the secondary voltage); {expect}"
        )
    m = _SIGNED.match(low)
    if m:
        value = float(m.group(2)) * (1 if m.group(1) == "+" else -1)
    else:
        m = _WORDED.match(low)
        if not m:
            raise ValueError(f"tap: got {text!r}; {expect}")
        value = float(m.group(1)) * (1 if m.group(2) == "above" else -1)
    if abs(value) > MAX_TAP_PCT:
        raise ValueError(
            f"tap: got {text!r}; expected at most ±{MAX_TAP_PCT:g} % "
            "(no-load taps of distribution transformers)"
        )
    return value


def secondary_voltage_v(primary_applied_v, primary_rated_v, secondary_rated_v, tap_pct):
    """No-load secondary voltage [V] on a primary tap (nameplate convention).

    Parameters
    ----------
    primary_applied_v : float or array
        Voltage applied to the primary [V].
    primary_rated_v, secondary_rated_v : float or array
        Rated winding voltages at the normal (0 %) tap [V].
    tap_pct : float or array
        Primary tap [%]; + = above normal (more primary turns).

    Returns
    -------
    float or ndarray
        Secondary voltage at no load [V].

    Examples
    --------
    Invented: 480 V applied to a 480-208Y/120 V unit on its +2.5 % tap (492 V):

    >>> round(float(secondary_voltage_v(480, 480, 208, 2.5)), 1)
    202.9
    >>> round(float(secondary_voltage_v(456, 480, 208, -5)), 1)
    208.0
    """
    vp = _positive("primary_applied_v", primary_applied_v)
    vr = _positive("primary_rated_v", primary_rated_v)
    vs = _positive("secondary_rated_v", secondary_rated_v)
    t = np.asarray(tap_pct, dtype=float)
    if not np.all(np.isfinite(t) & (np.abs(t) <= MAX_TAP_PCT)):
        raise ValueError(f"tap_pct: got {tap_pct!r}; expected within ±{MAX_TAP_PCT:g} %")
    out = vs * (vp / vr) / (1.0 + t / 100.0)
    return out if out.ndim else float(out)


def _positive(name, x):
    a = np.asarray(x, dtype=float)
    if not np.all(np.isfinite(a) & (a > 0)):
        raise ValueError(f"{name}: got {x!r}; expected a voltage > 0 V")
    return a
