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
from advisor.values import parse_quantity

@dataclass(frozen=True)
class FieldSpec:
    """One input of the check/swap form: key, label, quantity kind, placeholder."""

    key: str
    label: str
    kind: str  # a kind of advisor.values.KINDS, or "part"
    placeholder: str
    tip: str


FIELDS: tuple[FieldSpec, ...] = (
    FieldSpec("old", "Part", "part", "e.g. 74HC221, NE555P", "the part on the board (any part number)"),
    FieldSpec("new", "Replace with", "part", "blank = check only", "the part to fit instead; blank checks the first part"),
    FieldSpec("vcc", "Supply", "voltage", "e.g. 5", "supply voltage of the circuit (V)"),
    FieldSpec("new_vcc", "New supply", "voltage", "blank = same", "supply after the change (V), for a swap"),
    FieldSpec("r", "R (Rext/RA)", "resistance", "e.g. 10k, 4k7", "main timing resistor"),
    FieldSpec("rb", "RB (astable)", "resistance", "555 astable only", "second resistor of a 555 astable"),
    FieldSpec("c", "C (Cext)", "capacitance", "e.g. 10n, 2n2", "timing capacitor"),
    FieldSpec("pot", "Pot", "resistance", "e.g. 10k", "variable resistor in series with R (RB in an astable)"),
    FieldSpec("pot_setting", "Pot setting", "fraction", "0..1 or 50%", "share of the pot's travel in circuit"),
    FieldSpec("trigger_period", "Trigger period", "time", "e.g. 64us", "time between trigger edges"),
)
FIELD_BY_KEY = {f.key: f for f in FIELDS}

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
ALL_FIELDS: tuple[FieldSpec, ...] = FIELDS + CAPTURE_FIELDS


#: Command-line flags the engine's messages name, and the form field a workbench user edits.
_FLAG_FIELD = {"vcc": "Supply", "new-vcc": "New supply", "r": "R", "ra": "R", "rb": "RB", "c": "C",
               "pot": "Pot", "pot-setting": "Pot setting", "trigger-period": "Trigger period"}
_FLAG = re.compile(r"--([a-z][a-z-]*)")


def ui_words(text: str | None) -> str | None:
    """Engine text speaks of CLI flags (``--c``); on the workbench they are fields ("C")."""
    if not text:
        return text
    text = text.replace("--mode mono", "one-shot mode (leave RB blank)")
    return _FLAG.sub(lambda m: f"'{_FLAG_FIELD[m.group(1)]}'" if m.group(1) in _FLAG_FIELD else m.group(0), text)


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
        if spec.kind == "part":
            values[spec.key] = text
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
        errors["pot_setting"] = f"pot setting {raw.get('pot_setting', '').strip()!r} is outside 0..1; expected a fraction such as 0.5 or 50%"
        values["pot_setting"] = None
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


def read_measurement(path: str, mode: str | None, trigger_channel: int | None, output_channel: int | None):
    """The capture's Measurement, exactly as ``--measured-from`` makes it (raises CaptureError)."""
    import os

    from advisor.measure.summary import capture_measurement

    try:
        st = os.stat(path)
        key = (os.path.abspath(path), st.st_size, st.st_mtime_ns, mode, trigger_channel, output_channel)
    except OSError:
        key = None  # let the reader say what is wrong with the path
    if key is not None and key in _CAPTURES:
        return _CAPTURES[key]
    m = capture_measurement(path, mode=mode, trigger_channel=trigger_channel, output_channel=output_channel)
    if key is not None:
        _CAPTURES[key] = m
        while len(_CAPTURES) > _CAPTURES_KEPT:
            _CAPTURES.pop(next(iter(_CAPTURES)))
    return m


def build_circuit(part: str, v: dict[str, object], measured=None) -> Circuit:
    """The form's values as one validated circuit (mode astable when RB is given)."""
    mode = "astable" if v.get("rb") is not None else None
    return Circuit(
        part=part,
        vcc=v.get("vcc"),  # type: ignore[arg-type]
        mode=mode,  # type: ignore[arg-type]
        r=v.get("r"),  # type: ignore[arg-type]
        rb=v.get("rb"),  # type: ignore[arg-type]
        c=v.get("c"),  # type: ignore[arg-type]
        pot=v.get("pot"),  # type: ignore[arg-type]
        pot_setting=v.get("pot_setting"),  # type: ignore[arg-type]
        trigger=Trigger(period=v.get("trigger_period")),  # type: ignore[arg-type]
        measured=measured,
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
    if values.get("capture"):
        try:
            measured = read_measurement(str(values["capture"]), "astable" if values.get("rb") is not None else None,
                                        values.get("trigger_channel"), values.get("output_channel"))  # type: ignore[arg-type]
        except RetimeError as exc:
            return Outcome("error", part=old_fam.id, field_errors={"capture": exc.render()},
                           problem="the capture cannot be used: see its field")
    if new_query and new_fam is not None:
        from advisor.substitute import swap

        circuit = build_circuit(old_fam.id, values, measured)
        result = swap(catalog, str(values["old"]), str(new_query), circuit, new_vcc=values.get("new_vcc"))
        data = result.to_json()
        return Outcome("swap", data=data, findings=sorted_findings(data.get("findings") or []), part=old_fam.id, new_part=new_fam.id)
    from advisor.checking import check_circuit

    circuit = build_circuit(old_fam.id, values, measured)
    data = check_circuit(old_fam, circuit, new_vcc=values.get("new_vcc")).to_json()
    return Outcome("check", data=data, findings=sorted_findings(data.get("findings") or []), part=old_fam.id)


@dataclass(frozen=True)
class Hit:
    family: str
    score: float
    how: str
    title: str


def find_parts(catalog, query: str, limit: int = 12) -> tuple[list[Hit], str | None]:
    """Ranked families for a typed query, and a one-line note when there are none.

    Uses ``advisor.partnumber.recognise`` (maker prefixes, suffixes, typos). Until it
    is installed only family ids that contain the typed text are offered.
    """
    q = query.strip()
    if not q:
        hits = [Hit(fid, 0.0, "list", catalog.families[fid].title) for fid in catalog.ids()]
        return hits, None
    try:
        from advisor.partnumber import recognise

        hits = []
        for m in recognise(catalog, q, limit=limit):
            fam = catalog.families.get(str(m.family).upper())
            hits.append(Hit(str(m.family), float(m.score), str(m.how), fam.title if fam else ""))
    except RetimeError as exc:
        return [], exc.render()
    except Exception as exc:  # recognition bug: say so in one line
        return [], f"internal error in part recognition: {type(exc).__name__}: {exc}"
    if not hits:
        return [], f"no family matches {q!r}"
    return hits[:limit], None
