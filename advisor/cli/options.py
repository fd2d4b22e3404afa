"""Circuit options shared by check, design, swap, alternates and the BOM.

Flags are kept as text by argparse and parsed here, so a bad value becomes one
:class:`ValueParseError` line (exit 2) naming the flag and quoting the input.
"""

from __future__ import annotations

import argparse

from advisor.circuit import Circuit, Measurement, Target, Trigger
from advisor.errors import RetimeError, ValueParseError
from advisor.inputnames import typed_flag
from advisor.values import parse_count, parse_range, read_value

_FLAGS: list[tuple[str, str, str]] = [
    # flag, quantity kind, help
    ("--vcc", "voltage", "supply voltage (V), e.g. 5 or 15V"),
    ("--r", "resistance", "main timing resistor (Rext, or RA of a 555), e.g. 10k, 4k7"),
    ("--ra", "resistance", "555 astable RA"),
    ("--rb", "resistance", "555 astable RB"),
    ("--pot", "resistance", "variable resistor (trimmer) in series with the main timing resistor; in a 555 "
                            "astable with RA unless --pot-in rb"),
    ("--pot-setting", "fraction", "fraction 0..1 of the variable resistor's travel in circuit"),
    ("--pot-tol", "fraction", "the trimmer's own tolerance on its value (default 20%%)"),
    ("--pot-end", "resistance", "resistance left at each stop of the trimmer (default: 1%% of its value or 2 ohm, "
                                "whichever is greater; never 0)"),
    ("--c", "capacitance", "timing capacitor, e.g. 10n, 2n2, 0.01u"),
    ("--cont", "voltage", "555 control pin driven to this voltage (V); default open (2/3 of the supply)"),
    ("--r-tol", "fraction", "resistor tolerance, e.g. 1%% or 0.01 (default 5%%)"),
    ("--c-tol", "fraction", "capacitor tolerance (default 10%%)"),
    ("--trigger-period", "time", "period of the trigger signal, e.g. 64us"),
    ("--trigger-high", "voltage", "high level of the driving signal (V)"),
    ("--measured-width", "time", "measured output pulse width of the real circuit"),
    ("--measured-high", "time", "measured high time (astable)"),
    ("--measured-low", "time", "measured low time (astable)"),
    ("--measured-period", "time", "measured period (astable)"),
    ("--target-width", "time", "wanted pulse width"),
    ("--target-period", "time", "wanted period"),
    ("--target-freq", "frequency", "wanted frequency"),
]


def add_circuit_options(p: argparse.ArgumentParser, *, targets: bool = True) -> None:
    g = p.add_argument_group("circuit")
    for flag, _kind, help_ in _FLAGS:
        if not targets and flag.startswith("--target"):
            continue
        g.add_argument(flag, metavar="VALUE", help=help_)
    g.add_argument("--mode", choices=["mono", "astable"], help="555-class mode (default: mono, astable when RB is given)")
    g.add_argument("--pot-in", choices=["ra", "rb"],
                   help="555 astable: the trimmer sits with RA (default: moves the period, keeps the low time) or RB")
    g.add_argument("--trigger-edge", choices=["rising", "falling"], help="active edge of the trigger signal")
    g.add_argument("--divide", metavar="N",
                   help="counter-based timers (CD4541B, 74HC4060, ...): the divide ratio N of the counter output "
                        "used, one the part can select (retime show PART lists them); default: the oscillator itself")
    g.add_argument("--maker", metavar="NAME",
                   help="use this maker's published constant (a maker of catalog/makers.yaml, e.g. NXP, TI, "
                        "Fairchild); default: the maker the part number names, else the band spans the makers")
    _add_capture_options(g)


def _add_capture_options(g) -> None:
    """--measured-from: take the measured time from a scope capture (advisor.measure)."""
    g.add_argument("--measured-from", metavar="FILE",
                   help="scope capture (CSV) of the real circuit; its median output width (or "
                        "--measured-quantity) calibrates the timing, in place of --measured-width etc.")
    g.add_argument("--measured-quantity", choices=["width", "high", "low", "period"],
                   help="what to take from the capture (default: width; period for an astable)")
    g.add_argument("--trigger-channel", type=int, metavar="N",
                   help="capture channel on the trigger (voltage columns numbered from 1; default 1)")
    g.add_argument("--output-channel", type=int, metavar="N",
                   help="capture channel on the output (default 2, or 1 when the capture has one channel)")


def _measured_from_capture(args: argparse.Namespace, mode: str | None) -> Measurement | None:
    path = getattr(args, "measured_from", None)
    if path is None:
        return None
    # numpy: only when a capture is given. The Measurement carries a summary of the
    # capture (edges of the first periods) that the results pass on as "capture".
    from advisor.measure.summary import capture_measurement

    return capture_measurement(path, getattr(args, "measured_quantity", None), mode=mode,
                               trigger_channel=getattr(args, "trigger_channel", None),
                               output_channel=getattr(args, "output_channel", None))


def _get(args: argparse.Namespace, flag: str, kind: str, notes: list[str] | None = None) -> float | None:
    """The flag's value in SI units; how an unusual form was read goes to ``notes``."""
    raw = getattr(args, flag.lstrip("-").replace("-", "_"), None)
    if raw is None:
        return None
    zero_ok = True if flag in ("--pot-setting", "--r-tol", "--c-tol", "--pot-tol", "--pot-end") else None
    try:
        reading = read_value(raw, kind, zero_ok=zero_ok)
    except ValueParseError as exc:
        raise ValueParseError(f"{typed_flag(args, flag)}: {exc.message}", got=raw, expected=exc.expected) from None
    if notes is not None:
        notes.extend(reading.remarks(typed_flag(args, flag)))  # as typed: design's --width, not --target-width
    return reading.value


def count_from_args(args: argparse.Namespace, flag: str = "--divide") -> int | None:
    """A whole count given as text (``--divide 1024``, ``--divide 2^10``): one located error
    when it is not a whole number of 1 or more (the family's own set is checked by the engine,
    advisor.timing.model.check_divide)."""
    raw = getattr(args, flag.lstrip("-").replace("-", "_"), None)
    if raw is None:
        return None
    return parse_count(raw, flag)


def quantity_from_args(args: argparse.Namespace, flag: str, kind: str) -> float | None:
    """One flag's value (``--vcc`` of ``bom``, ...): a bad value is one error naming the flag."""
    return _get(args, flag, kind)


def circuit_from_args(args: argparse.Namespace, part: str) -> Circuit:
    """Build the validated circuit from parsed flags (raises on bad values)."""
    from advisor.partnumber import as_typed

    notes: list[str] = []
    v = {flag: _get(args, flag, kind, notes) for flag, kind, _ in _FLAGS if hasattr(args, flag.lstrip("-").replace("-", "_"))}
    mode = getattr(args, "mode", None)
    if mode is None and (v.get("--rb") is not None or v.get("--ra") is not None):
        mode = "astable"
    measured = None
    for q in ("width", "high", "low", "period"):
        if v.get(f"--measured-{q}") is not None:
            if measured is not None:
                raise ValueParseError("give one measured quantity at a time (--measured-width, -high, -low or -period)")
            measured = Measurement(q, v[f"--measured-{q}"])
    from_capture = _measured_from_capture(args, mode)
    if from_capture is not None:
        if measured is not None:
            raise ValueParseError("give --measured-from or a typed measured value (--measured-width, ...), not both")
        measured = from_capture
    target = None
    duty = _get(args, "--duty", "fraction") if hasattr(args, "duty") else None
    if duty is not None and not 0.0 < duty < 1.0:
        # the high share of a period: 2 (200 %) or 0 has no meaning, and was printed back as wanted
        raise ValueParseError(f"--duty {args.duty!r} is not a duty", got=args.duty,
                              expected="the high share of the period, above 0 and below 1 (e.g. 0.6 or 60%)")
    rng = None
    if getattr(args, "range", None):
        try:
            rng = parse_range(args.range, "time")
        except ValueParseError as exc:
            raise ValueParseError(f"--range: {exc.message}", got=args.range, expected=exc.expected) from None
    for q, kind in (("width", "width"), ("period", "period"), ("freq", "freq")):
        val = v.get(f"--target-{q}")
        if val is not None:
            if target is not None:
                raise ValueParseError("give one target at a time (--target-width, --target-period or --target-freq)")
            target = Target(kind, val, duty=duty, range=rng)
    if target is None and rng is not None:
        target = Target("width" if mode != "astable" else "period", (rng[0] * rng[1]) ** 0.5, duty=duty, range=rng)
    return Circuit(
        part=part,
        vcc=v.get("--vcc"),
        mode=mode,
        r=v.get("--r"),
        ra=v.get("--ra"),
        rb=v.get("--rb"),
        c=v.get("--c"),
        pot=v.get("--pot"),
        pot_setting=v.get("--pot-setting"),
        pot_in=getattr(args, "pot_in", None),
        pot_tol=v.get("--pot-tol"),
        pot_end=v.get("--pot-end"),
        r_tol=v.get("--r-tol"),
        c_tol=v.get("--c-tol"),
        trigger=Trigger(v.get("--trigger-period"), getattr(args, "trigger_edge", None), v.get("--trigger-high")),
        measured=measured,
        target=target,
        cont=v.get("--cont"),
        divide=count_from_args(args) if hasattr(args, "divide") else None,
        **_makers_from_args(args),
        part_number=as_typed(getattr(args, "part", None) or getattr(args, "old", None), part),
        notes=tuple(notes),
    )


# --- standard-value series (--series, --c-series) ----------------------------------


def add_series_options(p: argparse.ArgumentParser, *, capacitors: bool = True) -> None:
    """Register ``--series`` (resistors) and ``--c-series`` (capacitors); checked by
    :func:`advisor.eseries.series_name` (a bad name is bad input, exit 2)."""
    p.add_argument("--series", default=None, metavar="E24",
                   help="E-series for new resistor values (E3…E192; default E24); without --r-tol the bands "
                        "use its tolerance (E96: 1%%)")
    if capacitors:
        p.add_argument("--c-series", default=None, metavar="E6",
                       help="E-series for new capacitor values (default E6); without --c-tol the bands use its tolerance")


def series_from_args(args: argparse.Namespace) -> tuple[str, str]:
    """(resistor series, capacitor series), validated; E24 and E6 when not given."""
    from advisor.eseries import series_name

    r = series_name(args.series, "--series") if getattr(args, "series", None) else "E24"
    c = series_name(args.c_series, "--c-series") if getattr(args, "c_series", None) else "E6"
    return r, c


def with_series(args: argparse.Namespace, circuit: Circuit) -> Circuit:
    """The circuit with the series the user named (their tolerances stand in for --r-tol/--c-tol)."""
    r, c = series_from_args(args)
    return circuit.with_(r_series=r if getattr(args, "series", None) else None,
                         c_series=c if getattr(args, "c_series", None) else None)


# --- alternates options (ranking inputs shared by alternates and bom) -----------------


def add_ranking_options(p: argparse.ArgumentParser) -> None:
    """``--include-obsolete``, ``--stock FILE`` and ``--keep-within`` (alternates, bom)."""
    p.add_argument("--include-obsolete", action="store_true",
                   help="also list obsolete families (after every family still made, marked)")
    p.add_argument("--stock", metavar="FILE",
                   help="CSV or XLSX list of part numbers on the shelf or the approved list: those rank first among equals")
    add_keep_within_option(p)


def add_keep_within_option(p: argparse.ArgumentParser) -> None:
    p.add_argument("--keep-within", metavar="FRACTION",
                   help="keep C and change one resistor when that lands within this fraction of the kept time "
                        "(default: within the old circuit's worst-case band), e.g. 3%%")


def keep_within_from_args(args: argparse.Namespace) -> float | None:
    return _get(args, "--keep-within", "fraction")


def stock_from_args(args: argparse.Namespace, catalog):
    path = getattr(args, "stock", None)
    if not path:
        return None
    from advisor.substitute.stock import read_stock

    return read_stock(path, catalog)
def _makers_from_args(args: argparse.Namespace) -> dict:
    """``makers``/``maker_basis`` of the typed part number (``PART`` of check and design,
    ``OLD`` of swap and alternates); ``--maker`` forces the maker of ``PART`` (swap
    applies it to the new part), ``--old-maker`` that of swap's ``OLD``."""
    typed = getattr(args, "part", None) or getattr(args, "old", None)
    forced = getattr(args, "maker", None) if getattr(args, "part", None) is not None else getattr(args, "old_maker", None)
    if typed is None and forced is None:
        return {}
    from advisor.cli.output import catalog_for
    from advisor.makers import makers_of

    try:
        makers, basis = makers_of(catalog_for(args), typed or "", forced)
    except RetimeError as exc:
        if getattr(args, "part", None) is None and forced is not None:
            from advisor.inputnames import renamed

            raise renamed(exc, {"--maker": "--old-maker"}) from None
        raise
    return {"makers": makers, "maker_basis": basis}


# --- reports (--report FILE on check, swap, alternates and bom) ---------------------


def output_path(text: str) -> str:
    """argparse type for every flag naming a file the command writes (``-o``, ``--report``):
    a target that exists and is not a regular file (``/dev/null``, a FIFO, a folder, a
    link to one) is refused while the command line is read, so nothing is computed or
    written first (exit 2, one line with the path). ``-`` (standard output, where a
    command takes it) passes. The atomic writer checks again when it writes."""
    from advisor.files import target_problem

    if text == "-":
        return text
    why = target_problem(text)
    if why is not None:
        raise argparse.ArgumentTypeError(why)
    return text


def _report_path(text: str) -> str:
    """argparse type for --report: the format must be clear from the extension."""
    from pathlib import Path

    suffix = Path(text).suffix.lower()
    if suffix not in (".html", ".htm", ".md", ".markdown"):
        raise argparse.ArgumentTypeError(
            f"cannot tell the report format from {text!r}; name the file .html, .htm or .md"
        )
    return output_path(text)


def add_report_option(p: argparse.ArgumentParser) -> None:
    """Register ``--report FILE`` (HTML or Markdown by the file's extension)."""
    p.add_argument("--report", metavar="FILE", type=_report_path,
                   help="also write a shareable report: FILE.html (pictures inline) or FILE.md")


def write_report_if_asked(args: argparse.Namespace, result: object, kind: str) -> None:
    """Write the report when ``--report`` was given; a note goes to stderr (stdout may hold JSON).

    ``result`` is the engine's result object (or its ``to_json()`` dict); ``kind`` is
    ``check``, ``swap``, ``alternates`` or ``bom``.
    """
    path = getattr(args, "report", None)
    if not path:
        return
    import sys

    from advisor.cli.output import catalog_for, to_plain
    from advisor.report import render_report

    written = render_report(to_plain(result), path, kind, catalog_for(args))
    sys.stderr.write(f"retime: report written to {written}\n")


# --- supply migration (--new-vcc on check, swap, alternates, demo) -------------------


def add_new_vcc_option(p: argparse.ArgumentParser) -> None:
    """Register ``--new-vcc V``: the supply the circuit moves to (swap, alternates, check)."""
    p.add_argument("--new-vcc", metavar="V",
                   help="supply the circuit moves to, e.g. 5 or 3.3V (default: the old supply)")


def new_vcc_from_args(args: argparse.Namespace) -> float | None:
    """The parsed ``--new-vcc`` (V), or None when absent; a bad value is one located error."""
    return _get(args, "--new-vcc", "voltage")


# --- exit status scripts can use (--fail-on on check, design, swap, alternates, bom, ...) ----

#: Exit status when a finding of the --fail-on severity (or worse) is present.
FAIL_ON_EXIT = 4


def add_fail_on_option(p: argparse.ArgumentParser) -> None:
    """Register ``--fail-on danger|warning``: exit 4 when such a finding (or a worse one) is in the answer."""
    p.add_argument("--fail-on", choices=["danger", "warning"], metavar="SEVERITY",
                   help="exit with status 4 when the answer holds a finding of this severity "
                        "(danger or warning) or worse; 0 otherwise")


def _severities(answer: object):
    """Every finding severity anywhere in an answer's JSON (``findings``/``*_findings`` lists at any depth)."""
    if isinstance(answer, dict):
        for key, value in answer.items():
            if (key == "findings" or key.endswith("_findings")) and isinstance(value, list):
                for f in value:
                    if isinstance(f, dict) and isinstance(f.get("severity"), str):
                        yield f["severity"]
            else:
                yield from _severities(value)
    elif isinstance(answer, list):
        for item in answer:
            yield from _severities(item)


def fail_on_status(args: argparse.Namespace, answer: object) -> int:
    """0, or :data:`FAIL_ON_EXIT` when ``--fail-on`` was given and the answer holds such a finding.

    ``answer`` is the result object (its ``to_json()`` is read) or the JSON dict itself.
    """
    level = getattr(args, "fail_on", None)
    if not level:
        return 0
    from advisor.findings import SEVERITY_ORDER

    data = answer.to_json() if hasattr(answer, "to_json") else answer
    limit = SEVERITY_ORDER[level]
    return FAIL_ON_EXIT if any(SEVERITY_ORDER.get(s, 99) <= limit for s in _severities(data)) else 0
