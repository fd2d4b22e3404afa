"""Engineering quantities as practitioners write them, and back.

Reads SI-prefixed numbers with or without unit and space (``10n``, ``10 nF``,
``0.01µF``, ``2.2 MΩ``, ``64 µs``, ``15.625kHz``), IEC 60062 value codes
(RKM code: ``4k7``, ``4K7``, ``2n2``, ``4R7``, ``R47``, ``47K3``, ``470R``) and plain
numbers (``1e-8``). Formats back in engineering notation with the unit symbol.

Sources: IEC 60062 (formerly IEC 62), "Marking codes for resistors and capacitors",
as summarised in Wikipedia "RKM code"; SI prefixes per the SI brochure.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

from advisor.errors import ValueParseError

#: SI prefixes by exponent (input); ``u``, ``µ`` (U+00B5) and ``μ`` (U+03BC) are micro.
_PREFIX_EXP = {"f": -15, "p": -12, "n": -9, "u": -6, "m": -3, "": 0, "k": 3, "K": 3, "M": 6, "G": 9, "T": 12}
#: Kept for callers that scale by prefix letter.
PREFIXES: dict[str, float] = {k: 10.0 ** e for k, e in _PREFIX_EXP.items()}

#: Output prefixes by power of 1000.
_OUT_PREFIX = {-5: "f", -4: "p", -3: "n", -2: "µ", -1: "m", 0: "", 1: "k", 2: "M", 3: "G", 4: "T"}


@dataclass(frozen=True)
class Limits:
    """Plausible magnitudes of a quantity (inclusive); outside them a value is refused.

    ``low`` applies to non-zero magnitudes (a 0 Ω link stays legal where zero is)."""

    low: float
    high: float
    low_why: str
    high_why: str


@dataclass(frozen=True)
class QuantityKind:
    """What a value means: its unit symbol, examples and plausible magnitudes."""

    name: str
    unit: str
    example: str
    zero_ok: bool = False
    negative_ok: bool = False
    limits: Limits | None = None


# Plausibility limits: wide enough for every real timing network, narrow enough that
# a slip (a bare capacitor code read as farads, a supply in gigavolts) is caught.
# Common practice, each stated with its reason in the refusal.
KINDS: dict[str, QuantityKind] = {
    "resistance": QuantityKind("resistance", "Ω", "4k7, 10 kΩ, 470R, R47", zero_ok=True, limits=Limits(
        1e-3, 1e9, "less than a wire link", "more than any timing resistor: leakage would set the time")),
    "capacitance": QuantityKind("capacitance", "F", "10n, 2n2, 0.01µF, 100 pF", limits=Limits(
        1e-13, 1.0, "less than the stray capacitance of a pin", "larger than any timing capacitor")),
    "time": QuantityKind("time", "s", "64us, 64 µs, 1.5 ms", limits=Limits(
        1e-12, 1e5, "shorter than any logic edge", "longer than a day: use a counter or a clock")),
    "frequency": QuantityKind("frequency", "Hz", "15.625kHz, 1 MHz", limits=Limits(
        1e-5, 1e10, "slower than one cycle a day", "faster than any timer or one-shot")),
    "voltage": QuantityKind("voltage", "V", "5, 15 V, 3.3V", limits=Limits(
        1e-3, 1e3, "below any logic level",
        "no timer or one-shot runs from that; for mains or high-voltage circuits follow the maker's "
        "datasheet, local codes and licensed practice")),
    "fraction": QuantityKind("fraction", "", "0.05, 5%", zero_ok=True),
    "number": QuantityKind("number", "", "1.5, 2e-3", zero_ok=True, negative_ok=True),
}


@dataclass(frozen=True)
class Reading:
    """A value as read: SI base units, how an unusual form was read, what followed it.

    ``notes`` explain a reading the user should confirm (an old ``MFD`` marking read as
    µF, a bare three-digit capacitor code); ``marks`` are the words after the value that
    were recognised and kept (tolerance letter, rating, dielectric). Front ends show both.
    """

    value: float
    text: str
    notes: tuple[str, ...] = ()
    marks: tuple[str, ...] = ()

    def remarks(self, label: str) -> list[str]:
        """One line per note and per kept mark, prefixed with ``label`` (e.g. ``--c``)."""
        out = [f"{label} {self.text!r}: {n}" for n in self.notes]
        if self.marks:
            out.append(f"{label} {self.text!r}: kept as printed, not used in the timing: " + ", ".join(self.marks))
        return out


_NUM = r"[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?"
_SPACES = str.maketrans({"\u2009": " ", "\u00a0": " ", "\u202f": " ", "\t": " ", "µ": "u", "μ": "u",
                         "\u2126": "Ω", "\u2212": "-"})


def _fail(text: str, kind: QuantityKind, why: str = "") -> ValueParseError:
    what = f"a {kind.name}" + (f" in {kind.unit}" if kind.unit else "")
    shown = text if len(text) <= 60 else text[:57] + "..."
    msg = f"cannot read {shown!r} as {what}"
    if why:
        msg += f" ({why})"
    return ValueParseError(msg, got=shown, expected=f"{what}, for example {kind.example}")


class _Refused(Exception):
    """Raised inside the grammar with the reason; turned into ValueParseError once."""


def _scaled(number: str, exp: int) -> float:
    mant, _, e = number.lower().partition("e")
    return float(f"{mant}e{int(e or 0) + exp}")


def _code(whole: str, frac: str, exp: int) -> float:
    """A value code (4k7: 4.7e3): the letter stands for the decimal point."""
    return _scaled(f"{whole or '0'}.{frac or '0'}", exp)


def _resistance(tok: str, notes: list[str]) -> float | None:
    m = re.fullmatch(r"(\d*)(meg|Meg|MEG|[RrKkMG])(\d*)", tok)
    if m and (m.group(1) or m.group(3)):
        letter = m.group(2)
        exp = {"R": 0, "r": 0, "k": 3, "K": 3, "M": 6, "G": 9}.get(letter, 6)
        return _code(m.group(1), m.group(3), exp)
    m = re.fullmatch(r"(\d*)m(\d*)", tok)
    if m and (m.group(1) or m.group(2)):
        v = f"{m.group(1) or '0'}.{m.group(2) or '0'}"
        raise _Refused(f"'m' on a resistance is ambiguous: {float(v):g} mΩ (milli) or {float(v):g} MΩ (mega); "
                       f"write {float(v):g}M for megohms")
    m = re.fullmatch(rf"({_NUM})((?i:meg)|[pnumkKMGT]?)(Ω|R|r|(?i:ohms?))?", tok)
    if not m:
        return None
    num, prefix, unit = m.group(1), m.group(2), m.group(3) or ""
    if unit and unit not in ("Ω", "R", "r") and unit.lower() not in ("ohm", "ohms"):
        return None
    if prefix.lower() == "meg":
        return _scaled(num, 6)
    if prefix == "m" and unit != "Ω":  # SI milli only with the symbol: 1 mΩ
        raise _Refused(f"'m' on a resistance is ambiguous: {num} mΩ (milli) or {num} MΩ (mega); "
                       f"write {num}M for megohms or {num} mΩ for milliohms")
    return _scaled(num, _PREFIX_EXP[prefix])


def _three_digit_code(tok: str, notes: list[str]) -> float | None:
    """EIA three-digit capacitor code: two significant digits and a multiplier, in pF."""
    m = re.fullmatch(r"([1-9]\d)(\d)", tok)
    if not m:
        return None
    digit = int(m.group(2))
    if digit == 7:
        raise _Refused(f"{tok!r} is not a capacitor code (no code uses 7 as the multiplier digit); "
                       "give the value with its unit, e.g. 100n")
    exp = {8: -2, 9: -1}.get(digit, digit)
    value = _scaled(m.group(1), exp - 12)
    notes.append(f"read as the capacitor code {m.group(1)}×10^{exp} pF = {format_eng(value, 'F')}; "
                 f"write {tok}p for {tok} pF")
    return value


def _capacitance(tok: str, notes: list[str]) -> float | None:
    code = _three_digit_code(tok, notes)
    if code is not None:
        return code
    m = re.fullmatch(r"(\d*)([pPnNuUm])(\d*)", tok)
    if m and (m.group(1) or m.group(3)):
        return _code(m.group(1), m.group(3), _PREFIX_EXP[m.group(2).lower()])
    if re.fullmatch(r"\d*[Rr]\d*", tok) and tok not in ("R", "r"):
        raise _Refused("'R' marks ohms")
    m = re.fullmatch(r"(\d*)M(\d+)", tok)
    if m:
        v = float(f"{m.group(1) or '0'}.{m.group(2)}")
        raise _Refused(f"'M' in a capacitance is ambiguous: {v:g} µF (as old MF markings) or {v:g} mF; "
                       f"write {v:g}u or {v:g}m")
    m = re.fullmatch(rf"({_NUM})((?i:mm|uu)|[pPnNuUmMfkKGT]?)((?i:fd|f|farads?))?", tok)
    if not m:
        return None
    num, prefix, unit = m.group(1), m.group(2), m.group(3) or ""
    old = unit.lower() == "fd" or (prefix == "M" and unit) or (prefix == "m" and unit == "f")
    if prefix.lower() in ("mm", "uu") and unit:  # micro-micro-farad: the old name of the picofarad
        notes.append(f"'{prefix}{unit}' read as micro-microfarads (the old name of pF)")
        return _scaled(num, -12)
    if prefix in ("k", "K", "G", "T"):
        raise _Refused(f"'{prefix}' is not a capacitance prefix")
    if prefix == "f" and not unit:
        return None
    if prefix in ("m", "M") and old:
        notes.append(f"'{prefix}{unit}' read as microfarads (the old marking MFD/MF), not millifarads")
        return _scaled(num, -6)
    if prefix == "M":
        raise _Refused(f"'M' on a capacitance is ambiguous: {num} µF (as old MF markings) or {num} MF; write {num}u")
    if not prefix and unit.lower() == "fd":  # 10 FD: farads spelled out; the limit judges it
        return _scaled(num, 0)
    return _scaled(num, _PREFIX_EXP[prefix.lower()])


def _time(tok: str, notes: list[str]) -> float | None:
    m = re.fullmatch(r"(\d*)([pnum])(\d*)", tok)
    if m and (m.group(1) or m.group(3)) and m.group(3):
        return _code(m.group(1), m.group(3), _PREFIX_EXP[m.group(2)])
    m = re.fullmatch(rf"({_NUM})([pPnNuUmMkK]?)((?i:s|sec|secs|seconds?))?", tok)
    if not m:
        return None
    num, prefix, unit = m.group(1), m.group(2), m.group(3) or ""
    if prefix == "M":
        if not unit:
            raise _Refused(f"'M' on a time is ambiguous: {num} ms (milli) or {num} Ms (mega); write {num}ms")
        if unit.isupper():  # all capitals carry no case: MS is how milliseconds are typed in capitals
            notes.append(f"'M{unit}' read as milliseconds (written in capitals; no time here is in megaseconds)")
            return _scaled(num, -3)
        # 'Ms' is the SI megasecond: read as written, and the plausibility limit judges it.
        return _scaled(num, 6)
    return _scaled(num, _PREFIX_EXP[prefix.lower()])


def _frequency(tok: str, notes: list[str]) -> float | None:
    m = re.fullmatch(r"(\d*)([kKM])(\d+)", tok)
    if m:
        return _code(m.group(1), m.group(3), _PREFIX_EXP[m.group(2)])
    m = re.fullmatch(rf"({_NUM})((?i:meg)|[umkKMG]?)((?i:hz))?", tok)
    if not m:
        return None
    num, prefix, unit = m.group(1), m.group(2), m.group(3) or ""
    if prefix.lower() == "meg":
        return _scaled(num, 6)
    if prefix == "m":
        if unit == "Hz":  # the SI spelling, exactly: millihertz
            return _scaled(num, -3)
        raise _Refused(f"'m' on a frequency is ambiguous: {num} mHz (milli) or {num} MHz (mega); write {num}MHz")
    return _scaled(num, _PREFIX_EXP[prefix])


def _voltage(tok: str, notes: list[str]) -> float | None:
    m = re.fullmatch(r"(\d*)[Vv](\d+)", tok)
    if m:
        return _code(m.group(1), m.group(2), 0)
    m = re.fullmatch(r"(\d*)([RrKkM])(\d+)", tok)
    if m:
        raise _Refused(f"{tok!r} is a resistor-style code ({m.group(2)} stands for "
                       f"{'ohms' if m.group(2) in 'Rr' else 'kilo' if m.group(2) in 'kK' else 'mega'}); "
                       f"a voltage is written {m.group(1) or '0'}V{m.group(3)} or {m.group(1) or '0'}.{m.group(3)} V")
    m = re.fullmatch(rf"({_NUM})([mkK]?)((?i:v|vdc|vac))?", tok)
    if not m:
        return None
    num, prefix, unit = m.group(1), m.group(2), (m.group(3) or "").lower()
    if unit == "vac":
        raise _Refused("an AC voltage is not a timer's supply; give the DC supply")
    return _scaled(num, _PREFIX_EXP[prefix.lower()])


def _fraction(tok: str, notes: list[str]) -> float | None:
    for lead in ("±", "+/-", "+-"):
        if tok.startswith(lead):
            tok = tok[len(lead):]
            break
    percent = tok.endswith("%")
    if percent:
        tok = tok[:-1]
    if not re.fullmatch(_NUM, tok):
        return None
    return _scaled(tok, -2 if percent else 0)


def _number(tok: str, notes: list[str]) -> float | None:
    return _scaled(tok, 0) if re.fullmatch(_NUM, tok) else None


_GRAMMAR = {"resistance": _resistance, "capacitance": _capacitance, "time": _time, "frequency": _frequency,
            "voltage": _voltage, "fraction": _fraction, "number": _number}


def _decimal_comma(tok: str, kind: str) -> str:
    """``4,7k`` → ``4.7k``; a comma that may be a thousands separator is refused with both readings."""
    if "," not in tok:
        return tok
    m = re.fullmatch(r"([+-]?)(\d+),(\d+)(.*)", tok)
    if not m or "," in m.group(4) or "." in m.group(4):
        raise _Refused("a comma here is neither a decimal comma nor a single thousands separator; "
                       "write the value without separators, e.g. 4700p")
    sign, whole, frac, tail = m.groups()
    if len(frac) == 3 and len(whole) <= 3:
        readings = []
        for text in (f"{sign}{whole}.{frac}{tail}", f"{sign}{whole}{frac}{tail}"):
            try:
                readings.append(format_eng(_read_token(text, kind, [], []), KINDS[kind].unit))
            except (_Refused, ValueParseError):
                readings.append(text)
        raise _Refused(f"the comma is ambiguous: {readings[0]} (decimal comma) or {readings[1]} (thousands "
                       f"separator); write {whole}.{frac}{tail} or {whole}{frac}{tail}")
    return f"{sign}{whole}.{frac}{tail}"


def _read_token(tok: str, kind: str, notes: list[str], marks: list[str]) -> float:
    """One word (no spaces): the value, possibly with a tolerance letter attached (4K7J, 104K)."""
    from advisor.markings import ATTACHED_TOLERANCE, describe_mark

    tok = _decimal_comma(tok, kind)
    grammar = _GRAMMAR[kind]
    refused: _Refused | None = None
    try:
        value = grammar(tok, notes)
    except _Refused as exc:
        value, refused = None, exc
    if value is not None:
        return value
    # A capital tolerance letter right after a value code: 4K7J, 104K, 2n2J (IEC 60062 letters).
    if kind in ("resistance", "capacitance") and len(tok) > 1 and tok[-1] in ATTACHED_TOLERANCE:
        stem = tok[:-1]
        coded = re.search(r"[A-Za-z]", stem) or (kind == "capacitance" and re.fullmatch(r"[1-9]\d\d", stem))
        if coded:
            stem_notes: list[str] = []
            try:
                value = grammar(stem, stem_notes)
            except _Refused:
                value = None
            if value is not None:
                notes.extend(stem_notes)
                marks.append(describe_mark(tok[-1]) or tok[-1])
                return value
    raise refused or _Refused("")


def read_value(text: object, kind: str = "number", *, zero_ok: bool | None = None) -> Reading:
    """Read ``text`` as a quantity of ``kind`` (see :data:`KINDS`) as parts and schematics print it.

    Returns a :class:`Reading` in SI base units with its notes and kept marks. Raises
    :class:`ValueParseError` quoting the input and the expected form for anything else:
    an ambiguous form (both readings named), a value outside the quantity's plausible
    magnitudes (the limit named), zero, negative, NaN or infinite where the quantity
    cannot take them. The forms are listed in README.md ("Values as printed").
    """
    qk = KINDS[kind]
    allow_zero = qk.zero_ok if zero_ok is None else zero_ok
    if isinstance(text, bool):
        raise _fail(str(text), qk)
    if isinstance(text, (int, float)):
        value = float(text)
        return Reading(_check(value, str(text), qk, allow_zero), str(text))
    if not isinstance(text, str):
        raise _fail(repr(text), qk, "not text")
    raw = text
    body = " ".join(text.translate(_SPACES).split())
    if not body:
        raise _fail(raw, qk, "empty")
    if kind == "fraction":
        body = body.replace(" ", "")
    words = body.split(" ")
    notes: list[str] = []
    marks: list[str] = []
    value: float | None = None
    why = ""
    # The value is the first word, or the first two or three when they are its prefix and
    # unit ("10 nF", "470 R", "12 VDC", "1 Meg Ω"); every later word must be a recognised mark (tolerance, rating, dielectric).
    for n in (3, 2, 1):
        if len(words) < n or any(not w[:1].isalpha() for w in words[1:n]):  # a unit starts with a letter (or Ω)
            continue
        trial_notes: list[str] = []
        trial_marks: list[str] = []
        try:
            value = _read_token("".join(words[:n]), kind, trial_notes, trial_marks)
        except _Refused as exc:
            why = why or str(exc)
            continue
        rest = words[n:]
        from advisor.markings import describe_mark

        described = [describe_mark(w) for w in rest]
        unknown = [w for w, d in zip(rest, described) if d is None]
        if unknown:
            value = None
            why = why or f"{unknown[0]!r} after the value is not a tolerance, rating or dielectric"
            continue
        notes, marks = trial_notes, trial_marks + [d for d in described if d]
        break
    if value is None:
        raise _fail(raw, qk, why)
    return Reading(_check(value, raw, qk, allow_zero), raw.strip(), tuple(notes), tuple(marks))


def parse_quantity(text: object, kind: str = "number", *, zero_ok: bool | None = None) -> float:
    """``read_value(text, kind).value``: the value in SI base units (see :func:`read_value`)."""
    return read_value(text, kind, zero_ok=zero_ok).value


def check_plausible(value: object, kind: str, label: str) -> float:
    """Refuse a number of ``kind`` that is not finite, has the wrong sign or lies outside the
    quantity's plausible magnitudes (:class:`Limits`), naming ``label`` and the limit.

    For values that do not come from text: the Python API, numbers in BOM cells, the
    engine's own circuits. Zero is accepted where the kind allows it."""
    qk = KINDS[kind]
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise ValueParseError(f"{label}: {value!r} is not a number", got=value, expected=f"a {qk.name}")
    why = _refusal(float(value), qk, qk.zero_ok)
    if why:
        raise ValueParseError(f"{label} {value!r}: {why}", got=value,
                              expected=f"a {qk.name}" + (f" in {qk.unit}" if qk.unit else ""))
    return float(value)


def _refusal(value: float, qk: QuantityKind, allow_zero: bool) -> str:
    """Why ``value`` cannot be a ``qk`` (empty when it can)."""
    if math.isnan(value) or math.isinf(value):
        return "not a finite number"
    if value < 0 and not qk.negative_ok:
        return "must not be negative"
    if value == 0 and not allow_zero:
        return "must be greater than zero"
    lim = qk.limits
    if lim is not None and value != 0:
        mag = abs(value)
        if mag < lim.low:
            return (f"{format_eng(mag, qk.unit)} is below {format_eng(lim.low, qk.unit)}, "
                    f"the smallest accepted: {lim.low_why}")
        if mag > lim.high:
            return (f"{format_eng(mag, qk.unit)} is above {format_eng(lim.high, qk.unit)}, "
                    f"the largest accepted: {lim.high_why}")
    return ""


def _check(value: float, raw: str, qk: QuantityKind, allow_zero: bool) -> float:
    why = _refusal(value, qk, allow_zero)
    if why:
        raise _fail(raw, qk, why)
    return value


def format_eng(value: float, unit: str = "", digits: int = 4) -> str:
    """Format ``value`` with an SI prefix: ``4.7 kΩ``, ``10 nF``, ``64 µs``.

    ``digits`` is the number of significant digits kept (trailing zeros dropped).
    """
    if value is None:
        return "—"
    if value == 0 or not math.isfinite(value):
        return f"{value:g} {unit}".strip()
    exp3 = int(math.floor(math.log10(abs(value)) / 3))
    if not -5 <= exp3 <= 4:  # beyond the prefixes: plain scientific notation
        return f"{value:.{digits}g} {unit}".strip()
    mant = value / 1000.0**exp3
    text = f"{mant:.{digits}g}"
    if ("e" in text or abs(float(text)) >= 1000) and exp3 < 4:  # rounded up to 1000: next prefix
        exp3 += 1
        mant = value / 1000.0**exp3
        text = f"{mant:.{digits}g}"
    return f"{text} {_OUT_PREFIX[exp3]}{unit}".strip()


def format_code(value: float, kind: str = "resistance") -> str:
    """IEC 60062 value code for a resistor or capacitor: 4k7, 470R, 2n2, 1M, 10u.

    Resistors use R/k/M; capacitors p/n/u/m. Three significant digits at most.
    """
    if kind == "resistance":
        letters = [(1e6, "M"), (1e3, "k"), (1.0, "R")]
    else:
        letters = [(1e-3, "m"), (1e-6, "u"), (1e-9, "n"), (1e-12, "p")]
    for scale, letter in letters:
        if abs(value) >= scale * 0.9995 or scale == letters[-1][0]:
            mant = value / scale
            text = f"{mant:.3g}"
            if "e" in text:
                text = f"{mant:.0f}"
            if "." in text:
                whole, frac = text.split(".")
                return f"{whole}{letter}{frac}" if whole != "0" else f"{letter}{frac}" if letter == "R" else f"0{letter}{frac}"
            return f"{text}{letter}" if letter != "R" or kind != "resistance" else f"{text}R"
    return f"{value:g}"


def parse_range(text: str, kind: str) -> tuple[float, float]:
    """Parse ``TMIN..TMAX`` (also ``TMIN-TMAX`` with units) into an ordered pair."""
    for sep in ("..", "…", " to "):
        if sep in text:
            lo, hi = text.split(sep, 1)
            a, b = parse_quantity(lo, kind), parse_quantity(hi, kind)
            if a >= b:
                raise ValueParseError(
                    f"range {text!r}: the first value must be the smaller",
                    got=text, expected="MIN..MAX, for example 50us..70us",
                )
            return a, b
    raise ValueParseError(
        f"cannot read {text!r} as a range", got=text, expected="MIN..MAX, for example 50us..70us"
    )


def parse_count(raw: object, label: str) -> int:
    """A divide ratio as the sheets print it: ``1024`` or ``2^10``; refused (naming ``label``) unless
    a whole count of 1 or more."""
    text = str(raw).strip().replace(" ", "")
    try:
        if "^" in text or "**" in text:  # 2^10: how the sheets print a binary tap
            base, exp = text.replace("**", "^").split("^", 1)
            value = int(base) ** int(exp) if 0 <= int(exp) <= 64 else 0
        else:
            value = int(text)
    except ValueError:
        value = 0
    if value < 1:
        raise ValueParseError(f"{label}: cannot read {raw!r} as a divide ratio", got=raw,
                              expected="a whole count of 1 or more, such as 1024 or 2^10")
    return value
