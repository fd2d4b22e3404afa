"""Pictures for reports, drawn with schemdraw as inline SVG text.

- :func:`timing_svg`: trigger and output(s) over a few periods, from a :class:`Waves`
  (itself taken from the result: nominal width or high/low, trigger period,
  ``divide_by`` and ``stays_high``), so skipped triggers and a stuck-high output show.
- :func:`network_svg`: the timing network to fit (fixed R, variable resistor, C) wired
  to the part's pins, from a :class:`Network` (values from the result, pin numbers
  from the catalog's first package).

schemdraw is imported inside the functions (the CLI's start-up path stays light).
Each SVG gets its own id prefix, because several inline SVGs share one HTML id space
and schemdraw numbers its clip paths from ``clip0`` in every drawing.
"""

from __future__ import annotations

import itertools
import re

from advisor.report.model import Network, Waves
from advisor.values import format_eng

#: Our own palette (also used by html.py): ink, signal names, accents.
INK = "#1f2a33"
NAME = "#2b4c6f"
ACCENT = "#b5562a"
SKIP = "#8a8f94"
MEASURED = "#2f7d6d"  # the scope capture's row
FONT = "DejaVu Sans, Helvetica, Arial, sans-serif"

#: Width of the timing picture in drawing units (the grid spans it).
_SPAN = 16.0
_counter = itertools.count(1)


def _prepare():
    import schemdraw

    schemdraw.use("svg")  # an installed matplotlib would otherwise become the backend
    schemdraw.config(font=FONT, fontsize=12, color=INK, lw=1.6, bgcolor=None)
    return schemdraw


def _finish(drawing, title: str) -> str:
    """SVG text with unique ids, a title for screen readers, and fluid width."""
    svg = drawing.get_imagedata("svg")
    text = svg.decode("utf-8") if isinstance(svg, bytes) else str(svg)
    prefix = f"rt{next(_counter)}-"
    ids = set(re.findall(r'\bid="([^"]+)"', text))
    for i in sorted(ids, key=len, reverse=True):
        text = re.sub(rf'\bid="{re.escape(i)}"', f'id="{prefix}{i}"', text)
        text = re.sub(rf"url\(['\"]?#{re.escape(i)}['\"]?\)", f"url(#{prefix}{i})", text)
        text = text.replace(f'href="#{i}"', f'href="#{prefix}{i}"')
    text = re.sub(r"<\?xml[^>]*\?>\s*", "", text)
    safe = title.replace("&", "&amp;").replace("<", "&lt;")
    text = text.replace("<svg ", f'<svg role="img" aria-label="{safe}" class="pic" ', 1)
    return text


# --------------------------------------------------------------------------- timing


def _segments(points: list[tuple[float, str]], end: float) -> tuple[str, list[float]]:
    """(state, start) steps to schemdraw's async form: wave string and len+1 times."""
    wave = "".join(s for _, s in points)
    times = [t for t, _ in points] + [end]
    return wave, times


def _high_points(intervals, scale: float, end: float, min_width: float = 0.0) -> list[tuple[float, str]]:
    """High intervals (s) to (time unit, state) steps, each pulse at least ``min_width`` wide."""
    pts: list[tuple[float, str]] = []
    cursor = 0.0
    for a, b in intervals:
        xa = max(a * scale, cursor)  # an edge a hair before the window's start is drawn at 0
        xb = min(max(b * scale, xa + min_width), end)
        if xb <= xa:
            continue
        if xa > cursor or not pts:
            if xa > cursor:
                pts.append((cursor, "l"))
            pts.append((xa, "h"))
        if xb < end:
            pts.append((xb, "l"))
        cursor = xb
    return pts


def timing_svg(w: Waves) -> str:
    """The timing picture as SVG text (trigger row when triggered, then outputs; a
    measured row last when the result carries a scope capture)."""
    schemdraw = _prepare()
    from schemdraw import elements as elm
    from schemdraw import logic

    yheight, ygap = 0.5, 0.7
    # Time unit: the trigger (or output) period, so the grid falls on every period;
    # hscale stretches the window to about _SPAN drawing units whatever its length.
    unit = w.period or w.end
    span_units = w.end / unit
    if w.period:
        span_units = max(1, int(round(span_units)))  # schemdraw draws the grid over whole periods
    hscale = _SPAN / (span_units * 2 * yheight)
    dx = 2 * yheight * hscale  # drawing units per time unit
    scale = 1.0 / unit  # time units per second
    end = span_units
    signals = []
    if w.kind == "triggered":
        # Trigger pulses are drawn narrow: only their active edge matters to the part.
        pw = min(0.2 * (w.period or w.end) * scale, 0.35 / dx * 1.0)
        idle, active = ("h", "l") if w.edge == "falling" else ("l", "h")
        if w.trigger_pulses is not None:  # the captured trigger pulses, each at least visible
            pts = [(x, idle if v == "l" else active) for x, v in _high_points(w.trigger_pulses, scale, end, pw)]
            if not pts or pts[0][0] > 0:
                pts.insert(0, (0.0, idle))
        else:
            pts = [(0.0, idle)]
            for t in w.triggers:
                x = t * scale
                if x <= 0:
                    pts = [(0.0, active)]
                else:
                    pts.append((x, active))
                pts.append((x + pw, idle))
        wave, times = _segments(pts or [(0.0, "l")], end)
        signals.append({"name": "trigger", "wave": wave, "async": times, "color": INK})
    for name, intervals, _width in w.rows:
        wave, times = _segments(_high_points(intervals, scale, end), end)
        signals.append({"name": name, "wave": wave, "async": times, "color": ACCENT if name == w.rows[-1][0] else INK})
    edges = []
    last = len(signals) - 1  # the predicted row the width is marked on
    name, intervals, width = w.rows[-1]
    if w.stays_high:
        edges.append(f"[{last}^:0]<->[{last}^:{end * 0.999:.5f}]{{{NAME}}} stays high: the pulse never ends")
    elif intervals and width:
        a, b = intervals[0]
        edges.append(f"[{last}^:{a * scale:.5f}]<->[{last}^:{b * scale:.5f}]{{{NAME}}} {format_eng(width, 's', 4)}")
    if w.measured is not None:
        wave, times = _segments(_high_points(w.measured, scale, end) or [(0.0, "l")], end)
        signals.append({"name": w.measured_name, "wave": wave, "async": times, "color": MEASURED})
        m = len(signals) - 1
        whole = [(a, b) for a, b in w.measured if b * scale < end]  # a pulse that ends inside the window
        if whole and w.measured_width:
            a, b = whole[0]
            edges.append(f"[{m}^:{a * scale:.5f}]<->[{m}^:{b * scale:.5f}]{{{MEASURED}}} "
                         f"{format_eng(w.measured_width, 's', 4)}")
    wavejson = {"signal": signals, "edge": edges, "config": {"hscale": hscale}}
    with schemdraw.Drawing(show=False) as d:
        d.config(fontsize=11, margin=0.5)
        td = logic.TimingDiagram(wavejson, yheight=yheight, ygap=ygap, namecolor=NAME, grid=bool(w.period),
                                 gridcolor="#cfd6dc", edgecolor=NAME, risetime=0.04, fontsize=11, datafontsize=10)
        d += td
        if w.kind == "triggered":
            # Mark the triggers the part ignores, just above the trigger row.
            for t, fired in zip(w.triggers, w.fired):
                if not fired and t * scale < end:
                    d += elm.Label().at((t * scale * dx + 0.12, yheight + 0.25)).label("×", fontsize=12, color=SKIP)
        bottom = -(len(signals) - 1) * (yheight + ygap) - 0.75
        if w.period:
            per = format_eng(w.period, "s", 4)
            what = "trigger period" if w.kind == "triggered" else "output period"
            if w.measured is not None:
                what = f"measured {what} (median)"
            ignored = not all(w.fired) and not w.stays_high
            d += elm.Label().at((0, bottom)).label(
                f"grid: one {what} = {per}" + ("     × trigger ignored" if ignored else ""),
                fontsize=9, color=SKIP, halign="left")
        else:
            d += elm.Label().at((0, bottom)).label(
                f"window {format_eng(w.end, 's', 4)}", fontsize=9, color=SKIP, halign="left")
    title = "Timing picture: trigger and output" + (", predicted and measured" if w.measured is not None else "")
    return _finish(d, title)


# --------------------------------------------------------------------------- network


def _pin(net: Network, func: str) -> tuple[str, str]:
    """(pin number text, label) of a function on channel 1, or ('', func) when unknown."""
    found = net.pins.get(func) or []
    if found:
        n, label = found[0]
        return str(n), label or func
    return "", func


def _item(net: Network, ref: str):
    return next((i for i in net.items if i.ref == ref), None)


def _label(item, with_setting: float | None = None) -> str:
    text = f"{item.ref} {item.code}"
    if item.ref == "VR" and with_setting is not None:
        text += f" (set {with_setting * 100:.3g} %)"
    return text


def network_svg(net: Network) -> str:
    """Drawing of the network on the part: one-shot (R/C pins) or 555 (mono or astable)."""
    schemdraw = _prepare()
    from schemdraw import elements as elm

    with schemdraw.Drawing(show=False) as d:
        d.config(unit=2.4, fontsize=11, margin=0.6)
        if net.function == "timer-555" and net.pins and "DIS" not in net.pins:
            _draw_555_from_out(d, elm, net)
        elif net.function == "timer-555":
            _draw_555(d, elm, net)
        else:
            _draw_one_shot(d, elm, net)
    return _finish(d, f"Timing network on the {net.part}")


def _spread(i: int, n: int) -> float:
    """Position (fraction of the side, from the bottom) of the i-th of n side pins,
    kept in the lower part of the box so the top pins' labels stay clear."""
    return 0.12 + (0.52 * i / (n - 1) if n > 1 else 0.2)


def _ic_pin(elm, net: Network, func: str, side: str, anchor: str, pos: float | None = None):
    num, label = _pin(net, func)
    return elm.IcPin(name=label, pin=num, side=side, anchorname=anchor, pos=pos)


def _supply_label(net: Network) -> str:
    return "VCC" + (f" {format_eng(net.vcc, 'V', 3)}" if net.vcc else "")


def _draw_one_shot(d, elm, net: Network) -> None:
    rpin = "RCEXT" if "RCEXT" in net.pins or not net.pins else ("REXT" if "REXT" in net.pins else "RC_COMMON")
    left = [f for f in ("CLEAR", "TRIG_RISE", "TRIG_FALL") if f in net.pins] or ["TRIG_FALL", "TRIG_RISE"]
    right = [f for f in ("QN", "Q") if f in net.pins] or ["Q"]
    pins = [_ic_pin(elm, net, f, "left", f, _spread(i, len(left))) for i, f in enumerate(reversed(left))]
    pins += [_ic_pin(elm, net, f, "right", f, _spread(i, len(right))) for i, f in enumerate(right)]
    pins += [_ic_pin(elm, net, "CEXT", "top", "CEXT"), _ic_pin(elm, net, rpin, "top", "RPIN"),
             _ic_pin(elm, net, "VCC", "top", "VCC"), _ic_pin(elm, net, "GND", "bottom", "GND")]
    d.move(0, 0)
    d.push()
    # An explicit size spreads the three top pins so their labels do not collide.
    ic = elm.Ic(pins=pins, size=(7.0, 4.2), leadlen=0.6, lblsize=10).right()
    ic.label(net.part + (f"\n{net.package}, section 1" if net.package else ""), "center", fontsize=11)
    d += ic
    c = _item(net, "C")
    r = _item(net, "R")
    vr = _item(net, "VR")
    d += elm.Line().at(ic.CEXT).up(0.9)
    a = d.here
    d += elm.Line().at(ic.RPIN).up(0.9)
    b = d.here
    if c is not None:
        d += elm.Capacitor(polar=c.value >= 1e-6).endpoints(b, a).label(_label(c), loc="top")
    d += elm.Line().at(b).up(0.4)
    if vr is not None:
        d += elm.Potentiometer().up().label(_label(vr, net.pot_setting), loc="bottom")
    if r is not None:
        d += elm.Resistor().up().label(_label(r), loc="bottom")
    top = d.here
    d += elm.Line().at(ic.VCC).toy(top)
    d += elm.Line().to(top)
    d += elm.Vdd().at(top).label(_supply_label(net))
    d += elm.Ground().at(ic.GND)
    _, cext_label = _pin(net, "CEXT")
    if any(w in cext_label.upper() for w in ("VSS", "GND")):  # e.g. a 4538's C pin goes to ground
        d += elm.Line().at(a).left(0.8)
        d += elm.Ground()
    _draw_ties(d, elm, net, ic, left)


def _draw_ties(d, elm, net: Network, ic, left: list[str]) -> None:
    """Inputs held at a level, drawn to a supply rail and a ground rail left of the part;
    the trigger input drawn as the signal's entry."""
    tied = {f: lvl for f, lvl in net.ties if f in left}
    x0 = min(getattr(ic, f)[0] for f in left) - 0.6  # end of the pin leads
    rails = {"VCC": x0 - 1.0, "GND": x0 - 2.0}
    for level in ("VCC", "GND"):
        funcs = [f for f, lvl in tied.items() if lvl == level]
        if not funcs:
            continue
        x = rails[level]
        ys = [getattr(ic, f)[1] for f in funcs]
        for f in funcs:
            d += elm.Line().at(getattr(ic, f)).tox(x)
            d += elm.Dot().at((x, getattr(ic, f)[1]))
        # A rail runs away from the trigger's entry so the two never cross: up to a supply
        # mark, or down to a ground mark (a ground mark drawn above when the trigger enters below).
        trig_y = getattr(ic, net.trigger_in)[1] if net.trigger_in in left and net.trigger_in not in tied else None
        up = level == "VCC"
        if trig_y is not None and (trig_y > min(ys) if up else trig_y < max(ys)):
            up = not up
        end = max(ys) + 1.0 if up else min(ys) - 1.0
        d += elm.Line().at((x, min(ys) if up else max(ys))).toy(end)
        if level == "VCC":
            mark = elm.Vdd().at((x, end)) if up else elm.Vss().at((x, end))
            d += mark.label("VCC")
        else:
            d += elm.Ground().at((x, end)) if not up else elm.Ground().at((x, end)).left()
    if net.trigger_in in left and net.trigger_in not in tied:
        d += elm.Line().at(getattr(ic, net.trigger_in)).tox(rails["GND"] - 0.6)
        d += elm.Dot(open=True).label("trigger in", loc="left")


def _timing_c_and_ground(d, elm, net: Network, ic, low) -> None:
    """The timing capacitor from the THR/TRG node down to ground (polarised from 1 µF), and GND."""
    c = _item(net, "C")
    d += elm.Line().at(low).down(0.3)
    if c is not None:
        d += elm.Capacitor(polar=c.value >= 1e-6).down().label(_label(c), loc="bottom")
    d += elm.Ground()
    d += elm.Ground().at(ic.GND)


def _555_body(d, elm, net: Network, left: list[str], right: list[str]):
    """The 555's box with its signal pins on the given sides, VCC on top and GND below."""
    pins = [_ic_pin(elm, net, f, "left", f) for f in reversed(left)]
    pins += [_ic_pin(elm, net, f, "right", f) for f in reversed(right)]
    pins += [_ic_pin(elm, net, "VCC", "top", "VCC"), _ic_pin(elm, net, "GND", "bottom", "GND")]
    ic = elm.Ic(pins=pins, edgepadW=3.2, edgepadH=0.8, pinspacing=2.0, leadlen=0.6, lblsize=10).right()
    ic.label(net.part + (f"\n{net.package}" if net.package else ""), "center", fontsize=11)
    d += ic
    return ic


def _draw_555(d, elm, net: Network) -> None:
    astable = net.mode == "astable"
    right = ["DIS", "THRES", "TRIG"] if astable else ["DIS", "THRES"]
    left = ["CONT", "RESET", "OUT"] + ([] if astable else ["TRIG"])
    ic = _555_body(d, elm, net, left, right)
    x = ic.DIS[0] + 1.6
    top_y = ic.VCC[1] + 1.2
    d += elm.Line().at(ic.VCC).toy(top_y)
    d += elm.Line().tox(x)
    d += elm.Vdd().at((x, top_y)).label(_supply_label(net))
    first = _item(net, "RA") or _item(net, "R")
    vr = _item(net, "VR")
    dis = (x, ic.DIS[1])
    thr = (x, ic.THRES[1])
    if not astable and vr is not None and first is not None:  # fixed R then the variable one
        mid = (x, (top_y + dis[1]) / 2)
        d += elm.Resistor().endpoints((x, top_y), mid).label(_label(first), loc="bottom")
        d += elm.Potentiometer().endpoints(mid, dis).label(_label(vr, net.pot_setting), loc="bottom")
    elif first is not None:
        d += elm.Resistor().endpoints((x, top_y), dis).label(_label(first), loc="bottom")
    else:
        d += elm.Line().endpoints((x, top_y), dis)
    d += elm.Line().at(ic.DIS).to(dis)
    d += elm.Dot().at(dis)
    if astable:
        rb = _item(net, "RB")
        if vr is not None and rb is not None:
            mid = (x, (dis[1] + thr[1]) / 2)
            d += elm.Resistor().endpoints(dis, mid).label(_label(rb), loc="bottom")
            d += elm.Potentiometer().endpoints(mid, thr).label(_label(vr, net.pot_setting), loc="bottom")
        elif rb is not None:
            d += elm.Resistor().endpoints(dis, thr).label(_label(rb), loc="bottom")
        d += elm.Line().at(ic.TRIG).tox(x)
        d += elm.Line().toy(thr[1])
        low = (x, ic.TRIG[1])
    else:
        d += elm.Line().endpoints(dis, thr)
        low = thr
    d += elm.Line().at(ic.THRES).to(thr)
    d += elm.Dot().at(thr)
    _timing_c_and_ground(d, elm, net, ic, low)
    # RESET held high (it would otherwise hold the timer off); CONT decoupled to ground:
    # the usual 10 nF (common practice; the makers' application circuits show it).
    d += elm.Line().at(ic.RESET).left(0.9)
    d += elm.Line().up(0.9)
    d += elm.Vdd().label("VCC")
    d += elm.Line().at(ic.CONT).left(0.9)
    d += elm.Capacitor().down().label("10n", loc="bottom")
    d += elm.Ground()
    if not astable:
        d += elm.Line().at(ic.TRIG).left(1.8)
        d += elm.Dot(open=True).label("trigger in", loc="left")


def _draw_555_from_out(d, elm, net: Network) -> None:
    """A 555 with no DISCHARGE pin (the 5-pin MIC1555): the timing resistor runs from OUT to
    THR (and TRG for an oscillator), the capacitor from there to ground (Micrel MIC1555/1557
    M9999-052610-D, May 2010, Figures 1 and 3); no RESET or CONT pin to tie."""
    astable = net.mode == "astable"
    right = ["THRES", "TRIG"] if astable else ["THRES"]
    left = ["OUT"] + ([] if astable else ["TRIG"])
    ic = _555_body(d, elm, net, left, right)
    d += elm.Line().at(ic.VCC).up(0.6)
    d += elm.Vdd().label(_supply_label(net))
    x_out, x = ic.OUT[0] - 1.2, ic.THRES[0] + 1.6
    top_y = ic.VCC[1] + 2.0
    d += elm.Line().at(ic.OUT).tox(x_out)
    d += elm.Dot().at((x_out, ic.OUT[1])).label("output", loc="left")
    d += elm.Line().at((x_out, ic.OUT[1])).toy(top_y)
    r = _item(net, "RB") or _item(net, "R")
    vr = _item(net, "VR")
    thr = (x, ic.THRES[1])
    if r is not None and vr is not None:
        mid = ((x_out + x) / 2, top_y)
        d += elm.Resistor().endpoints((x_out, top_y), mid).label(_label(r), loc="top")
        d += elm.Potentiometer().endpoints(mid, (x, top_y)).label(_label(vr, net.pot_setting), loc="top")
    elif r is not None:
        d += elm.Resistor().endpoints((x_out, top_y), (x, top_y)).label(_label(r), loc="top")
    else:
        d += elm.Line().endpoints((x_out, top_y), (x, top_y))
    d += elm.Line().at((x, top_y)).toy(thr[1])
    d += elm.Line().at(ic.THRES).to(thr)
    d += elm.Dot().at(thr)
    low = thr
    if astable:
        d += elm.Line().at(ic.TRIG).tox(x)
        d += elm.Line().toy(thr[1])
        low = (x, ic.TRIG[1])
    _timing_c_and_ground(d, elm, net, ic, low)
    if not astable:
        d += elm.Line().at(ic.TRIG).left(1.8)
        d += elm.Dot(open=True).label("trigger in", loc="left")
