"""The scope capture beside the prediction: the result's ``capture`` JSON for the reports.

``capture`` (advisor.measure.summary) carries the edge times of the first periods of
the captured trigger and output, in s from the first trigger edge. Here they become
a "measured output" row of the pulse picture, the trigger row itself (the captured
edges replace the evenly spaced ones), a caption naming the file and the channels,
and a table of the edge times. Nothing is measured again: every number shown is one
of the JSON's.

The predicted rows are laid on the captured trigger edges: a pulse of the nominal
width on every n-th edge when the result's trigger analysis says the part divides
by n, one pulse that never ends when it says the output stays high, and the first
pulse only when the result carries no trigger analysis.
"""

from __future__ import annotations

import math
from typing import Any

from advisor.report.model import CaptureView, Quantity, Waves, quantity

MEASURED_NAME = "measured output"


def _num(x: Any) -> float | None:
    return float(x) if isinstance(x, (int, float)) and not isinstance(x, bool) else None


def _times(side: Any, key: str) -> list[float]:
    vals = side.get(key) if isinstance(side, dict) else None
    return [float(v) for v in vals or [] if _num(v) is not None]


def usable(capture: Any) -> bool:
    """True when ``capture`` has what the picture needs (a window and the output's edges)."""
    return (isinstance(capture, dict) and (_num(capture.get("window")) or 0) > 0
            and isinstance(capture.get("output"), dict))


def level_intervals(side: dict, end: float, high: bool = True) -> tuple[tuple[float, float], ...]:
    """Where a captured channel sits at the ``high`` (or low) level over the window up to
    ``end``, from its edges and its level before the window. A run that began before the
    window starts at 0 (or at the first edge, when that is a hair below 0)."""
    events = sorted([(t, True) for t in _times(side, "rising")] + [(t, False) for t in _times(side, "falling")])
    first = min(0.0, events[0][0]) if events else 0.0
    start = first if bool(side.get("starts_high")) == high else None
    out = []
    for t, up in events:
        if up == high and start is None:
            start = t
        elif up != high and start is not None:
            if t > start:
                out.append((start, t))
            start = None
    if start is not None and end > start:
        out.append((start, end))
    return tuple(out)


def high_intervals(side: dict, end: float) -> tuple[tuple[float, float], ...]:
    """Where a captured channel is high over the window up to ``end``."""
    return level_intervals(side, end, True)


def _pattern(trigger: Any) -> tuple[bool, int | None] | None:
    """(stays_high, divide_by) from a result's trigger analysis, or None without one."""
    if not isinstance(trigger, dict) or not ("divide_by" in trigger or "stays_high" in trigger):
        return None
    n = trigger.get("divide_by")
    ok = isinstance(n, (int, float)) and not isinstance(n, bool) and n >= 1
    return bool(trigger.get("stays_high")), int(n) if ok else None


#: The result's trigger analysis is laid on the captured triggers only when its trigger
#: period is the captured one within this fraction (a display choice of ours).
SAME_PERIOD = 0.05


def prediction_pattern(trigger: Any, capture: dict) -> tuple[tuple[bool, int | None] | None, str | None]:
    """(stays_high, divide_by) to lay on the captured triggers, or None with the reason:
    no trigger analysis in the result, or one made for another trigger period."""
    pat = _pattern(trigger)
    if pat is None:
        return None, "the result carries no trigger analysis (give the trigger period)"
    typed, seen = _num((trigger or {}).get("period")), _num(capture.get("period"))
    if typed and seen and abs(typed / seen - 1) > SAME_PERIOD:
        return None, (f"the trigger period given ({quantity('', typed, 's').text}) is not the captured one "
                      f"({quantity('', seen, 's').text})")
    return pat, None


def _on_triggers(triggers: tuple[float, ...], width: float, pattern, end: float) -> tuple[tuple[float, float], ...]:
    if not triggers:
        return ()
    if pattern is None:
        return ((triggers[0], min(triggers[0] + width, end)),)
    stays, n = pattern
    if stays:
        return ((triggers[0], end),)
    step = n or 1
    return tuple((t, min(t + width, end)) for k, t in enumerate(triggers) if k % step == 0)


def measured_waves(capture: dict, timing: dict | None, trigger: dict | None, *, mode: str | None, name: str,
                   old: tuple[str, dict | None, dict | None] | None = None) -> Waves | None:
    """The pulse picture over the capture's window: captured trigger, predicted output(s)
    laid on the captured trigger edges, and the measured output (see the module docstring)."""
    if not usable(capture):
        return None
    end = float(capture["window"])
    measured = high_intervals(capture["output"], end)
    mwidth = _num(capture.get("width"))
    period = _num(capture.get("period"))
    nominal = (timing or {}).get("nominal") or {}
    extra = {"measured": measured, "measured_name": MEASURED_NAME, "measured_width": mwidth}
    if mode == "astable" or ("high" in nominal and "low" in nominal and "width" not in nominal):
        high, low = _num(nominal.get("high")), _num(nominal.get("low"))
        if not high or not low:
            return None
        p = high + low
        rows = ((name, tuple((k * p, min(k * p + high, end)) for k in range(math.ceil(end / p))), high),)
        return Waves("astable", period or p, "rising", (), (), rows, end, None, False,
                     "The predicted output starts with the captured output's first rising edge, at the "
                     "nominal high and low times.", **extra)
    width = _num(nominal.get("width"))
    if not width:
        return None
    ctrig = capture.get("trigger")
    if not isinstance(ctrig, dict):
        # No trigger channel: the capture starts at the output's first rising edge.
        rows = [(name, ((0.0, min(width, end)),), width)]
        if old and _num(((old[1] or {}).get("nominal") or {}).get("width")):
            ow = float(old[1]["nominal"]["width"])  # type: ignore[index]
            rows.insert(0, (old[0], ((0.0, min(ow, end)),), ow))
        return Waves("triggered", None, "rising", (0.0,), (True,), tuple(rows), end, None, False,
                     "The capture has no trigger channel: the predicted pulse is drawn from the measured "
                     "output's first rising edge.", **extra)
    edge = "falling" if ctrig.get("edge") == "falling" else "rising"
    triggers = tuple(t for t in _times(ctrig, edge) if t < end)
    if not triggers:
        return None
    pat, why = prediction_pattern(trigger, capture)
    rows = [(name, _on_triggers(triggers, width, pat, end), width)]
    if pat is None:
        fired = tuple(True for _ in triggers)  # the result says nothing about the later triggers
        note = f"Triggers as captured. As {why}, the predicted row shows the pulse of the first trigger only."
        stays, n = False, None
    else:
        stays, n = pat
        fired = tuple(True for _ in triggers) if stays else tuple(k % (n or 1) == 0 for k in range(len(triggers)))
        note = ("Triggers as captured; the predicted row starts a pulse on "
                + ("the first of them and every trigger restarts it, so it never falls." if stays else
                   "every one of them." if (n or 1) == 1 else f"every {_ordinal(n or 1)} of them, as the trigger analysis says."))
    if old is not None:
        oname, otiming, otrig = old
        ow = _num(((otiming or {}).get("nominal") or {}).get("width"))
        if ow:
            rows.insert(0, (oname, _on_triggers(triggers, ow, prediction_pattern(otrig, capture)[0], end), ow))
    return Waves("triggered", period, edge, triggers, fired, tuple(rows), end, n, stays, note,
                 trigger_pulses=level_intervals(ctrig, end, edge == "rising"), **extra)


def _ordinal(n: int) -> str:
    from advisor.presentation import ordinal

    return ordinal(n)


def _channel(capture: dict, role: str) -> str:
    n = capture.get(f"{role}_channel")
    col = (capture.get("columns") or {}).get(role) if isinstance(capture.get("columns"), dict) else None
    th = (capture.get("threshold") or {}).get(role) if isinstance(capture.get("threshold"), dict) else None
    text = f"{role} on channel {n}" + (f', "{col}"' if col else "")
    if _num(th) is not None:
        text += f", edges at {quantity('', th, 'V').text}"
    return text


def capture_view(capture: Any, *, fitted: str | None = None) -> CaptureView | None:
    """Caption, medians and edge times of the capture; ``fitted`` names the old part in a swap."""
    if not usable(capture):
        return None
    name = str(capture.get("name") or capture.get("file") or "capture")
    roles = (["trigger"] if isinstance(capture.get("trigger"), dict) else []) + ["output"]
    caption = (f"Measured row: scope capture {name}" + (f" of the fitted {fitted}" if fitted else "") + "; "
               + "; ".join(_channel(capture, r) for r in roles)
               + ". Times from " + ("its first trigger edge." if "trigger" in roles else "the output's first rising edge."))
    facts: list[Quantity] = []
    period = "measured trigger period" if "trigger" in roles else "measured output period"
    width = "measured width" if "trigger" in roles else "measured high time"
    for key, label in (("width", width), ("period", period), ("delay", "measured trigger-to-output delay")):
        if _num(capture.get(key)) is not None:
            facts.append(quantity(f"{label} (capture median)", capture[key], "s", f"capture.{key}"))
    edges = []
    for role in roles:
        for kind in ("rising", "falling"):
            times = _times(capture[role], kind)
            if times:
                edges.append((f"{role} {kind}", tuple(
                    quantity(f"{role} {kind} {i + 1}", t, "s", f"capture.{role}.{kind}.{i}") for i, t in enumerate(times))))
    return CaptureView(caption, tuple(facts), tuple(edges))
