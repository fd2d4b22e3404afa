"""What the workbench asks of the engine, in one place, with every failure turned into text.

The screens never compute timing: they hand the form's raw text to :func:`evaluate`,
which parses it (quoting bad input back), builds one :class:`advisor.circuit.Circuit`,
calls the engine (``advisor.timing`` + ``advisor.rules`` for a check,
``advisor.substitute`` for a swap) and returns an :class:`Outcome` holding the
engine's JSON. Nothing here raises: a :class:`RetimeError` becomes ``problem`` (one
line), a bug inside the engine becomes a one-line internal-error note.

No Textual import here, so this module is tested and timed without a terminal.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field

from advisor.circuit import Circuit, Trigger
from advisor.errors import RetimeError, ValueParseError
from advisor.findings import SEVERITY_ORDER
from advisor.values import parse_count, parse_quantity

@dataclass(frozen=True)
class FieldSpec:
    """One input of the check/swap form: key, label, quantity kind, placeholder."""

    key: str
    label: str
    kind: str  # a kind of advisor.values.KINDS, or "part", "choice", "series", "file", "channel"
    placeholder: str
    tip: str
    choices: tuple[str, ...] = ()  # for kind "choice": the words it takes (a unique prefix will do)


FIELDS: tuple[FieldSpec, ...] = (
    FieldSpec("old", "Part", "part", "e.g. 74HC221, NE555P", "the part on the board (any part number)"),
    FieldSpec("new", "Replace with", "part", "blank = check only", "the part to fit instead; blank checks the first part"),
    FieldSpec("mode", "Mode", "choice", "mono / astable", "555-class mode (blank: one-shot, astable when RB is given)",
              ("mono", "astable")),
    FieldSpec("vcc", "Supply", "voltage", "e.g. 5", "supply voltage of the circuit (V)"),
    FieldSpec("new_vcc", "New supply", "voltage", "blank = same", "supply after the change (V), for a swap"),
    FieldSpec("r", "R (Rext/RA)", "resistance", "e.g. 10k, 4k7", "main timing resistor"),
    FieldSpec("rb", "RB (astable)", "resistance", "555 astable only", "second resistor of a 555 astable"),
    FieldSpec("c", "C (Cext)", "capacitance", "e.g. 10n, 2n2", "timing capacitor"),
    FieldSpec("pot", "Trimmer", "resistance", "e.g. 10k", "variable resistor in series with R (RB in an astable)"),
    FieldSpec("pot_setting", "Trimmer set", "fraction", "0..1 or 50%", "share of the trimmer's travel in circuit"),
    FieldSpec("pot_in", "Trimmer with", "choice", "ra / rb", "555 astable: the resistor the trimmer sits with (blank: RA)",
              ("ra", "rb")),
    FieldSpec("pot_tol", "Trimmer tol.", "fraction", "blank = 20%", "the trimmer's own tolerance on its full value"),
    FieldSpec("pot_end", "Trimmer ends", "resistance", "blank = its class", "resistance left at each stop of the trimmer"),
    FieldSpec("cont", "CONT driven", "voltage", "blank = open", "a 555's control pin driven to this voltage (V)"),
    FieldSpec("divide", "Divide by", "count", "e.g. 1024, 2^10",
              "counter timers (CD4541B, 74HC4060): the divide ratio of the output the board uses"),
    FieldSpec("new_divide", "New divide", "count", "blank = design picks",
              "counter timers: the ratio the replacement must use (blank: the design tries each it has)"),
    FieldSpec("trigger_period", "Trigger period", "time", "e.g. 64us", "time between trigger edges"),
    FieldSpec("trigger_edge", "Trigger edge", "choice", "rising / falling",
              "the trigger signal's active edge (blank: the part's first trigger input)", ("rising", "falling")),
    FieldSpec("trigger_high", "Trigger high", "voltage", "e.g. 3.3", "high level of the driving signal (V)"),
    FieldSpec("measured", "Measured", "time", "e.g. 68us", "a time measured on the real circuit: calibrates the timing"),
    FieldSpec("measured_quantity", "Measured is", "choice", "width / high / low / period",
              "what the measured time is (blank: width, period for an astable)", ("width", "high", "low", "period")),
    FieldSpec("target", "Target", "target", "e.g. 100us or 1kHz", "the time (or frequency) wanted"),
    FieldSpec("target_quantity", "Target is", "choice", "width / period / freq",
              "what the target is (blank: width, period for an astable; a frequency when given in Hz)",
              ("width", "period", "freq")),
    FieldSpec("r_tol", "R tolerance", "fraction", "blank = 5%", "resistor tolerance, e.g. 1% or 0.01"),
    FieldSpec("c_tol", "C tolerance", "fraction", "blank = 10%", "capacitor tolerance"),
    FieldSpec("series", "Series", "series", "blank = E24", "E-series for new resistor values (E3 … E192)"),
    FieldSpec("maker", "Maker", "text", "blank = from the number",
              "the maker of the part on the board (e.g. NXP, TI), whose published constant is used; "
              "blank: the maker its part number names"),
    FieldSpec("new_maker", "New maker", "text", "blank = from the number",
              "the maker of the replacement you will order, whose published constant is used; "
              "blank: the maker its part number names, else the band spans the makers"),
    FieldSpec("keep_within", "Keep within", "fraction", "blank = old band",
              "keep C and change one resistor when that lands within this fraction of the kept time (swap)"),
    FieldSpec("old_package", "Old package", "text", "blank = its first", "the fitted part's package, e.g. DIP-14"),
    FieldSpec("new_package", "New package", "text", "blank = closest", "the replacement's package"),
)
FIELD_BY_KEY = {f.key: f for f in FIELDS}

#: The form's sections: heading and the keys under it.
SECTIONS: tuple[tuple[str, tuple[str, ...]], ...] = (
    ("Parts and network", ("old", "new", "mode", "vcc", "new_vcc", "r", "rb", "c", "pot", "pot_setting", "pot_in", "pot_tol",
                           "pot_end", "cont", "divide", "new_divide")),
    ("Trigger", ("trigger_period", "trigger_edge", "trigger_high")),
    ("Measurement and target", ("measured", "measured_quantity", "target", "target_quantity")),
    ("Tolerances and values", ("r_tol", "c_tol", "series", "keep_within", "maker", "new_maker")),
    ("Packages", ("old_package", "new_package")),
)

#: The optional scope capture: read like ``--measured-from`` (advisor.measure.summary);
#: kept apart from FIELDS because it is a file, not a quantity.
CAPTURE_FIELDS: tuple[FieldSpec, ...] = (
    FieldSpec("capture", "Capture file", "file", "scope CSV, optional",
              "a scope capture (CSV) of the real circuit: its median output width (period for an astable) "
              "calibrates the timing"),
    FieldSpec("trigger_channel", "Trigger ch.", "channel", "1", "capture channel on the trigger (blank: 1)"),
    FieldSpec("output_channel", "Output ch.", "channel", "2",
              "capture channel on the output (blank: 2, or 1 for a one-channel capture)"),
)
#: Where the report key (Ctrl+W) writes: HTML, or Markdown for a name ending in .md.
REPORT_FIELDS: tuple[FieldSpec, ...] = (
    FieldSpec("report", "Report file", "file", "blank = retime-report.html",
              "where Ctrl+W writes the report of what is on screen (.html or .md)"),
)
ALL_FIELDS: tuple[FieldSpec, ...] = FIELDS + CAPTURE_FIELDS + REPORT_FIELDS


#: Command-line flags the engine's messages name, and the form field a workbench user edits.
_FLAG_FIELD = {"vcc": "Supply", "new-vcc": "New supply", "r": "R", "ra": "R", "rb": "RB", "c": "C",
               "pot": "Trimmer", "pot-setting": "Trimmer set", "pot-in": "Trimmer with",
               "pot-tol": "Trimmer tol.", "pot-end": "Trimmer ends", "trigger-period": "Trigger period",
               "trigger-edge": "Trigger edge", "trigger-high": "Trigger high", "mode": "Mode",
               "measured-width": "Measured", "measured-high": "Measured", "measured-low": "Measured",
               "measured-period": "Measured", "measured-from": "Capture file", "target-width": "Target",
               "target-period": "Target", "target-freq": "Target", "r-tol": "R tolerance", "c-tol": "C tolerance",
               "series": "Series", "maker": "Maker", "old-maker": "Maker", "cont": "CONT driven", "keep-within": "Keep within",
               "old-package": "Old package", "new-package": "New package", "measured-quantity": "Measured is",
               "trigger-channel": "Trigger ch.", "output-channel": "Output ch.", "report": "Report file",
               "divide": "Divide by", "new-divide": "New divide"}


def ui_words(text: str | None) -> str | None:
    """Engine text speaks of CLI flags (``--c``); on the workbench they are fields ("C"),
    renamed by the one flag renamer (advisor.inputnames)."""
    from advisor.inputnames import rename_flags

    if not text:
        return text
    text = text.replace("--mode mono", "one-shot mode (leave RB blank)")
    return rename_flags(text, lambda flag: f"'{_FLAG_FIELD[flag[2:]]}'" if flag[2:] in _FLAG_FIELD else None)


def _in_ui_words(data: dict, findings: list[dict]) -> None:
    if isinstance(data.get("assumptions"), list):
        data["assumptions"] = [ui_words(a) if isinstance(a, str) else a for a in data["assumptions"]]
    for f in findings:
        for key in ("message", "fix"):
            if isinstance(f.get(key), str):
                f[key] = ui_words(f[key])


def parse_fields(raw: dict[str, str]) -> tuple[dict[str, object], dict[str, str]]:
    """Parse every filled field; return (values, errors by field key).

    Part fields stay text; quantities become SI floats. Each error quotes the
    input and says what is expected (from :func:`advisor.values.parse_quantity`).
    """
    values: dict[str, object] = {}
    errors: dict[str, str] = {}
    for spec in FIELDS:
        text = (raw.get(spec.key) or "").strip()
        if not text:
            values[spec.key] = None
            continue
        if spec.kind in ("part", "text"):
            values[spec.key] = text
            continue
        if spec.kind == "choice":
            hits = [c for c in spec.choices if c.startswith(text.lower())]
            if len(hits) == 1:
                values[spec.key] = hits[0]
            else:
                values[spec.key] = None
                errors[spec.key] = f"cannot read {text!r}; expected one of: {', '.join(spec.choices)}"
            continue
        if spec.kind == "count":
            try:
                values[spec.key] = parse_count(text, spec.label)
            except RetimeError as exc:
                values[spec.key] = None
                errors[spec.key] = exc.render()
            continue
        if spec.kind == "series":
            from advisor.eseries import series_name

            try:
                values[spec.key] = series_name(text, "Series")
            except RetimeError as exc:
                values[spec.key] = None
                errors[spec.key] = exc.render()
            continue
        if spec.kind == "target":  # a time, or a frequency when it is given in Hz
            kind = "frequency" if text.lower().rstrip().endswith("hz") else "time"
            try:
                values[spec.key] = parse_quantity(text, kind)
                values["target_is_freq"] = kind == "frequency"
            except ValueParseError as exc:
                values[spec.key] = None
                errors[spec.key] = f"cannot read {text!r}; expected {exc.expected or 'a time such as 100us or a frequency such as 1kHz'}"
            continue
        try:
            zero_ok = True if spec.kind == "fraction" else None
            values[spec.key] = parse_quantity(text, spec.kind, zero_ok=zero_ok)
        except ValueParseError as exc:
            # Short form for a narrow column: the text quoted back, why, and what would read.
            why = re.search(r"\(([^()]*)\)$", exc.message)
            short = f"cannot read {text!r}" + (f" ({why.group(1)})" if why else "")
            errors[spec.key] = f"{short}; expected {exc.expected}" if exc.expected else exc.render()
            values[spec.key] = None
    sett = values.get("pot_setting")
    if sett is not None and not 0.0 <= float(sett) <= 1.0:  # type: ignore[arg-type]
        errors["pot_setting"] = f"trimmer setting {raw.get('pot_setting', '').strip()!r} is outside 0..1; expected a fraction such as 0.5 or 50%"
        values["pot_setting"] = None
    for key in ("r_tol", "c_tol"):
        tol = values.get(key)
        if tol is not None and not 0.0 <= float(tol) < 1.0:  # type: ignore[arg-type]
            errors[key] = f"tolerance {raw.get(key, '').strip()!r} is outside 0..100 %; expected e.g. 1% or 0.05"
            values[key] = None
    return values, errors


@dataclass
class Outcome:
    """Everything a screen shows after one recomputation."""

    kind: str  # "empty" | "check" | "swap" | "error"
    data: dict = field(default_factory=dict)  # the engine's to_json()
    findings: list[dict] = field(default_factory=list)  # most severe first
    field_errors: dict[str, str] = field(default_factory=dict)
    problem: str | None = None  # one line from the engine or the catalog
    hint: str | None = None
    part: str | None = None  # family id checked (old part)
    new_part: str | None = None

    @property
    def timing_json(self) -> dict:
        """The result whose timing the picture draws (the new part's in a swap)."""
        if self.kind == "swap":
            new = self.data.get("new") or {}
            out = dict(new) if isinstance(new, dict) else {}
            for key in ("timing", "trigger", "mode", "capture"):
                if self.data.get(key) is not None:
                    out.setdefault(key, self.data[key])
            return out
        return self.data


def resolve(catalog, query: str):
    """Family for a part number; falls back to exact ids until recognition lands."""
    try:
        return catalog.resolve(query)
    except ImportError:  # advisor.partnumber not there yet: exact family ids only
        return catalog.get(query)


def sorted_findings(items: list) -> list[dict]:
    """Finding objects or dicts to dicts, duplicates dropped, most severe first."""
    seen: set[tuple] = set()
    out: list[dict] = []
    for f in items:
        d = f.to_json() if hasattr(f, "to_json") else dict(f)
        key = (d.get("rule"), d.get("part"), d.get("message"))
        if key in seen:
            continue
        seen.add(key)
        out.append(d)
    return sorted(out, key=lambda d: SEVERITY_ORDER.get(str(d.get("severity")), 9))


def parse_capture_fields(raw: dict[str, str]) -> tuple[dict[str, object], dict[str, str]]:
    """The capture's path (``~`` expanded, surrounding quotes dropped) and channel numbers;
    (values, errors by field key). The file itself is read later, by :func:`read_measurement`."""
    import os

    values: dict[str, object] = {"capture": None, "trigger_channel": None, "output_channel": None}
    errors: dict[str, str] = {}
    path = (raw.get("capture") or "").strip()
    if len(path) >= 2 and path[0] == path[-1] and path[0] in "'\"":
        path = path[1:-1].strip()
    values["capture"] = os.path.expanduser(path) if path else None
    for key in ("trigger_channel", "output_channel"):
        text = (raw.get(key) or "").strip()
        if not text:
            continue
        if text.isdigit() and int(text) >= 1:
            values[key] = int(text)
        else:
            errors[key] = f"cannot read {text!r} as a channel; expected a channel number such as 1 or 2"
    return values, errors


#: Recently read captures: (path, size, mtime, quantity, channels) -> Measurement, so a
#: change in another field does not read the file again.
_CAPTURES: dict[tuple, object] = {}
_CAPTURES_KEPT = 4


def read_measurement(path: str, mode: str | None, trigger_channel: int | None, output_channel: int | None,
                     quantity: str | None = None):
    """The capture's Measurement, exactly as ``--measured-from`` makes it (raises CaptureError)."""
    import os

    from advisor.measure.summary import capture_measurement

    try:
        st = os.stat(path)
        key = (os.path.abspath(path), st.st_size, st.st_mtime_ns, mode, trigger_channel, output_channel, quantity)
    except OSError:
        key = None  # let the reader say what is wrong with the path
    if key is not None and key in _CAPTURES:
        return _CAPTURES[key]
    m = capture_measurement(path, quantity, mode=mode, trigger_channel=trigger_channel, output_channel=output_channel)
    if key is not None:
        _CAPTURES[key] = m
        while len(_CAPTURES) > _CAPTURES_KEPT:
            _CAPTURES.pop(next(iter(_CAPTURES)))
    return m


def form_mode(v: dict[str, object]) -> str | None:
    """The mode the form asks for: as chosen, else astable when RB is given."""
    return v.get("mode") or ("astable" if v.get("rb") is not None else None)  # type: ignore[return-value]


def build_circuit(part: str, v: dict[str, object], measured=None, catalog=None) -> Circuit:
    """The form's values as one validated circuit, exactly as the command line builds it
    from the same flags (advisor.cli.options.circuit_from_args)."""
    from advisor.circuit import Measurement, Target

    mode = form_mode(v)
    if measured is None and v.get("measured") is not None:
        q = v.get("measured_quantity") or ("period" if mode == "astable" else "width")
        measured = Measurement(q, v["measured"])  # type: ignore[arg-type]
    target = None
    if v.get("target") is not None:
        if v.get("target_is_freq"):
            kind = "freq"
        else:
            kind = v.get("target_quantity") or ("period" if mode == "astable" else "width")
            if kind == "freq":
                kind = "period"  # a time typed for a frequency target: the period it means
        target = Target(kind, v["target"])  # type: ignore[arg-type]
    series = v.get("series")
    makers: dict = {}
    if catalog is not None and (v.get("old") or v.get("maker")):
        from advisor.makers import makers_of

        found, basis = makers_of(catalog, str(v.get("old") or ""), v.get("maker"))  # type: ignore[arg-type]
        makers = {"makers": found, "maker_basis": basis}
    return Circuit(
        **makers,
        part=part,
        vcc=v.get("vcc"),  # type: ignore[arg-type]
        mode=mode,  # type: ignore[arg-type]
        r=v.get("r"),  # type: ignore[arg-type]
        rb=v.get("rb"),  # type: ignore[arg-type]
        c=v.get("c"),  # type: ignore[arg-type]
        pot=v.get("pot"),  # type: ignore[arg-type]
        pot_setting=v.get("pot_setting"),  # type: ignore[arg-type]
        pot_in=v.get("pot_in"),  # type: ignore[arg-type]
        pot_tol=v.get("pot_tol"),  # type: ignore[arg-type]
        pot_end=v.get("pot_end"),  # type: ignore[arg-type]
        r_tol=v.get("r_tol"),  # type: ignore[arg-type]
        c_tol=v.get("c_tol"),  # type: ignore[arg-type]
        trigger=Trigger(v.get("trigger_period"), v.get("trigger_edge"), v.get("trigger_high")),  # type: ignore[arg-type]
        measured=measured,
        target=target,
        r_series=series,  # type: ignore[arg-type]
        cont=v.get("cont"),  # type: ignore[arg-type]
        divide=v.get("divide"),  # type: ignore[arg-type]
    )


def evaluate(catalog, raw: dict[str, str]) -> Outcome:
    """Parse the form and run the check or the swap; never raises."""
    values, errors = parse_fields(raw)
    cap_values, cap_errors = parse_capture_fields(raw)
    values.update(cap_values)
    errors.update(cap_errors)
    old = values.get("old")
    if not old:
        return Outcome("empty", field_errors=errors, hint="Type the part on the board (F2 looks parts up).")
    try:
        out = _evaluate(catalog, values, errors)
    except RetimeError as exc:
        return Outcome("error", field_errors=errors, problem=ui_words(exc.render()))
    except Exception as exc:  # an engine bug must not reach the screen as a traceback
        return Outcome("error", field_errors=errors, problem=f"internal error: {type(exc).__name__}: {exc} (please report it)")
    out.problem = ui_words(out.problem)
    _in_ui_words(out.data, out.findings)
    return out


def _resolve_field(catalog, values: dict[str, object], errors: dict[str, str], key: str):
    """The family a part field names; an unknown part is marked on its own field."""
    try:
        return resolve(catalog, str(values[key]))
    except RetimeError as exc:
        errors[key] = exc.render()
        return None


def _evaluate(catalog, values: dict[str, object], errors: dict[str, str]) -> Outcome:
    from advisor.overrides import note_overrides

    old_fam = _resolve_field(catalog, values, errors, "old")
    new_query = values.get("new")
    new_fam = _resolve_field(catalog, values, errors, "new") if new_query else None
    if old_fam is None or (new_query and new_fam is None):
        bad = errors.get("old") or errors.get("new")
        return Outcome("error", field_errors=errors, part=old_fam.id if old_fam else None,
                       new_part=new_fam.id if new_fam else None, problem=bad)
    if errors:
        # Keep showing which part was recognised, but compute nothing from a half-read form.
        return Outcome("error", field_errors=errors, part=old_fam.id, problem="fix the marked field to recompute")
    if values.get("pot_setting") is not None and values.get("pot") is None:
        return Outcome("error", part=old_fam.id, field_errors={"pot_setting": "a pot setting needs the pot's value; fill in Pot"})
    measured = None
    if values.get("capture") and values.get("measured") is not None:
        return Outcome("error", part=old_fam.id, field_errors={
            "measured": "give a measured time or a capture file, not both"}, problem="fix the marked field to recompute")
    if values.get("capture"):
        try:
            measured = read_measurement(str(values["capture"]), form_mode(values),
                                        values.get("trigger_channel"), values.get("output_channel"),  # type: ignore[arg-type]
                                        values.get("measured_quantity"))  # type: ignore[arg-type]
        except RetimeError as exc:
            return Outcome("error", part=old_fam.id, field_errors={"capture": exc.render()},
                           problem="the capture cannot be used: see its field")
    if new_query and new_fam is not None:
        from advisor.substitute import swap

        circuit = build_circuit(old_fam.id, values, measured, catalog)
        result = swap(catalog, str(values["old"]), str(new_query), circuit, new_vcc=values.get("new_vcc"),
                      series=str(values.get("series") or "E24"), old_package=values.get("old_package"),
                      new_package=values.get("new_package"), keep_within=values.get("keep_within"),
                      new_maker=values.get("new_maker"), new_divide=values.get("new_divide"))
        data = note_overrides(result, catalog).to_json()
        return Outcome("swap", data=data, findings=sorted_findings(data.get("findings") or []), part=old_fam.id, new_part=new_fam.id)
    from advisor.checking import check_circuit

    circuit = build_circuit(old_fam.id, values, measured, catalog)
    data = note_overrides(check_circuit(old_fam, circuit, new_vcc=values.get("new_vcc")), catalog).to_json()
    return Outcome("check", data=data, findings=sorted_findings(data.get("findings") or []), part=old_fam.id)


@dataclass(frozen=True)
class Hit:
    family: str
    score: float
    how: str
    title: str


def natural_key(text: str) -> list:
    """Sort key that orders numbers by value: 74HC123 before 74HC1G123 before 74HC4538."""
    return [int(t) if t.isdigit() else t.lower() for t in re.split(r"(\d+)", text)]


def prefix_hits(catalog, query: str) -> list[Hit]:
    """Families whose id or a listed part number starts with ``query`` (case ignored),
    in natural order: what a user typing a part number from its start expects."""
    q = query.strip().upper()
    out = []
    for fid in catalog.ids():
        fam = catalog.families[fid]
        if fid.upper().startswith(q) or any(str(pn).upper().startswith(q) for pn in fam.part_numbers):
            out.append(Hit(fam.id, 100.0, "prefix", fam.title))
    return sorted(out, key=lambda h: natural_key(h.family))


def find_parts(catalog, query: str, limit: int = 30) -> tuple[list[Hit], str | None]:
    """Ranked families for a typed query, and a one-line note when there are none.

    Recognised part numbers (``advisor.partnumber.recognise``: maker prefixes,
    suffixes) come first, then every family whose number starts with what is typed
    (so "74H" lists the 74HC and 74HCT parts), in natural order, then near misses.
    """
    q = query.strip()
    if not q:
        hits = [Hit(catalog.families[fid].id, 0.0, "list", catalog.families[fid].title) for fid in catalog.ids()]
        return sorted(hits, key=lambda h: natural_key(h.family)), None
    recognised: list[Hit] = []
    try:
        from advisor.partnumber import recognise

        for m in recognise(catalog, q, limit=limit):
            fam = catalog.families.get(str(m.family).upper())
            recognised.append(Hit(str(m.family), float(m.score), str(m.how), fam.title if fam else ""))
    except RetimeError:
        recognised = []
    except Exception as exc:  # recognition bug: say so in one line
        return [], f"internal error in part recognition: {type(exc).__name__}: {exc}"
    strong = [h for h in recognised if h.how != "fuzzy"]
    fuzzy = [h for h in recognised if h.how == "fuzzy"]
    hits: list[Hit] = []
    seen: set[str] = set()
    for h in strong + prefix_hits(catalog, q) + fuzzy:
        if h.family.upper() not in seen:
            seen.add(h.family.upper())
            hits.append(h)
    if not hits:
        return [], f"no family matches {q!r}"
    return hits[:limit], None


def rank_alternates(catalog, raw: dict[str, str]) -> tuple[dict | None, str | None]:
    """The ranked alternates of the form's part with the form's circuit (the JSON of
    ``retime alternates``), or (None, one line) when the form does not read; never raises."""
    values, errors = parse_fields(raw)
    if errors or not values.get("old"):
        return None, "the form does not read"
    try:
        fam = resolve(catalog, str(values["old"]))
        from advisor.overrides import note_overrides
        from advisor.substitute.alternates import alternates

        res = alternates(catalog, fam.id, build_circuit(fam.id, values, catalog=catalog), new_vcc=values.get("new_vcc"),  # type: ignore[arg-type]
                         series=str(values.get("series") or "E24"))
        return note_overrides(res, catalog).to_json(), None
    except RetimeError as exc:
        return None, ui_words(exc.render())
    except Exception as exc:  # an engine bug: one line, never a traceback
        return None, f"internal error: {type(exc).__name__}: {exc} (please report it)"
