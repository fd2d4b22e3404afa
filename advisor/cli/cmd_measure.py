"""`retime measure FILE`: edges, widths and periods from an oscilloscope capture (CSV)."""

from __future__ import annotations

import argparse
import sys

NAME = "measure"
HELP = "edges, widths and periods from a scope capture (CSV: a time column, voltage columns)"
DESCRIPTION = (
    "Read a scope capture saved as CSV (a time column and one or more voltage columns; heading or "
    "none; , ; tab or space delimited; decimal commas; units such as 'Time (us)' in the heading) and "
    "report per channel the high time, low time, period, frequency and duty (median, min, max, count). "
    "Edges are found with hysteresis (20 % of the swing by default) so noise and ringing do not count, "
    "and timed by interpolation where the trace crosses the threshold. Channels are the voltage columns "
    "numbered from 1, the time column left out. With --trigger-channel and --output-channel it also "
    "reports the trigger-to-output delay, the output width and how many triggers fired a pulse."
)


def _channel(text: str) -> int:
    try:
        n = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"channel {text!r} is not a whole number (channels count from 1)") from None
    if n < 1:
        raise argparse.ArgumentTypeError(f"channel {n} is below 1 (channels count from 1, time column left out)")
    return n


def register(p: argparse.ArgumentParser) -> None:
    p.add_argument("file", metavar="FILE", help="capture file (CSV or other delimited text)")
    p.add_argument("--trigger-channel", type=_channel, metavar="N", help="channel on the trigger input (1-based)")
    p.add_argument("--output-channel", type=_channel, metavar="N", help="channel on the output (1-based)")
    th = p.add_mutually_exclusive_group()
    th.add_argument("--threshold", metavar="V", help="edge threshold in volts, e.g. 1.4 or 2.5V")
    th.add_argument("--threshold-fraction", metavar="F",
                    help="edge threshold as a fraction of the way from low to high level (default 0.5)")
    p.add_argument("--hysteresis", metavar="F", default="0.2",
                   help="width of the band an edge must cross, as a fraction of the swing (default 0.2)")
    p.add_argument("--trigger-edge", choices=["rising", "falling", "auto"], default="auto",
                   help="active edge of the trigger (default auto: the edge the output pulses follow)")
    p.add_argument("--output-active", choices=["high", "low"], default="high",
                   help="level of the output during its pulse (default high; low for a Q-bar output)")


def _number(raw: str | None, kind: str, flag: str) -> float | None:
    from advisor.errors import ValueParseError
    from advisor.values import parse_quantity

    if raw is None:
        return None
    try:
        return parse_quantity(raw, kind, zero_ok=True)
    except ValueParseError as exc:
        raise ValueParseError(f"{flag}: {exc.message}", got=raw, expected=exc.expected) from None


def _threshold(raw: str | None) -> float | None:
    """Volts, sign allowed: ``1.4``, ``2.5V``, ``-300mV``."""
    if raw is None:
        return None
    body = raw.strip()
    body = body[:-1].rstrip() if body[-1:] in ("V", "v") else body
    value = _number(body, "number", "--threshold")
    return value


def run(args: argparse.Namespace) -> int:
    from advisor.cli.output import emit_json
    from advisor.measure import measure_file

    result = measure_file(
        args.file,
        trigger_channel=args.trigger_channel,
        output_channel=args.output_channel,
        threshold=_threshold(args.threshold),
        fraction=_number(args.threshold_fraction, "fraction", "--threshold-fraction"),
        hysteresis=_number(args.hysteresis, "fraction", "--hysteresis"),
        trigger_edge=args.trigger_edge,
        output_active=args.output_active,
    )
    if args.json:
        emit_json(result)
    else:
        sys.stdout.write(render_text(result))
    return 0


def _row(label: str, stats, unit: str, scale: float = 1.0, pct: bool = False) -> str:
    from advisor.values import format_eng

    if stats.count == 0:
        return f"  {label:<10} —\n"

    def f(v: float) -> str:
        return f"{v * 100:.2f} %" if pct else format_eng(v * scale, unit, 5)

    spread = "" if stats.count == 1 else f"   ({f(stats.min)} … {f(stats.max)})"
    return f"  {label:<10} {f(stats.median):>12}{spread}   n={stats.count}\n"


def render_text(result) -> str:
    """A compact summary for people: one block per channel, then the pair."""
    from advisor.values import format_eng

    out = [
        f"{result.source}: {result.samples:,} samples over {format_eng(result.duration, 's')} "
        f"(step {format_eng(result.sample_interval, 's')}), {len(result.names)} channel(s)\n"
    ]
    for c in result.channels:
        lv, th = c.edges.levels, c.edges.thresholds
        out.append(
            f"channel {c.index} ({c.name}): levels {format_eng(lv.low, 'V', 3)} / "
            f"{format_eng(lv.high, 'V', 3)}, edges at {format_eng(th.center, 'V', 3)} "
            f"(band {format_eng(th.lower, 'V', 3)} … {format_eng(th.upper, 'V', 3)}), "
            f"{c.edges.rising.size} rising, {c.edges.falling.size} falling\n"
        )
        out.append(_row("high", c.high, "s"))
        out.append(_row("low", c.low, "s"))
        out.append(_row("period", c.period, "s"))
        out.append(_row("frequency", c.frequency, "Hz"))
        out.append(_row("duty", c.duty, "", pct=True))
    for s in result.skipped:
        out.append(f"channel {s['index']}: not timed: {s['reason']}\n")
    p = result.pair
    if p is not None:
        out.append(f"trigger channel {p.trigger_channel} ({p.trigger_edge} edge) → output channel "
                   f"{p.output_channel} (active {p.output_active})\n")
        out.append(_row("delay", p.delay, "s"))
        out.append(_row("width", p.width, "s"))
        verdict = f"  {p.triggers} triggers, {p.pulses} pulses"
        if p.stays_active:
            verdict += ": the output stays active (retriggered, or stuck)"
        elif p.divide_by == 1:
            verdict += ": every trigger fires a pulse"
        elif p.divide_by:
            verdict += f": one pulse per {p.divide_by} triggers"
        out.append(verdict + "\n")
    return "".join(out)
