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

#: SI prefixes accepted on input.  ``u``, ``µ`` (U+00B5) and ``μ`` (U+03BC) are micro;
#: ``K`` is accepted for kilo because value codes print it that way (4K7).
PREFIXES: dict[str, float] = {
    "f": 1e-15,
    "p": 1e-12,
    "n": 1e-9,
    "u": 1e-6,
    "m": 1e-3,
    "": 1.0,
    "k": 1e3,
    "K": 1e3,
    "M": 1e6,
    "G": 1e9,
    "T": 1e12,
}

_PREFIX_EXP = {"f": -15, "p": -12, "n": -9, "u": -6, "m": -3, "": 0, "k": 3, "K": 3, "M": 6, "G": 9, "T": 12}

#: Output prefixes by power of 1000.
_OUT_PREFIX = {-5: "f", -4: "p", -3: "n", -2: "µ", -1: "m", 0: "", 1: "k", 2: "M", 3: "G", 4: "T"}


@dataclass(frozen=True)
class QuantityKind:
    """What a value means: its unit symbol, accepted unit spellings, and examples."""

    name: str
    unit: str
    spellings: tuple[str, ...]
    example: str
    zero_ok: bool = False
    negative_ok: bool = False


KINDS: dict[str, QuantityKind] = {
    "resistance": QuantityKind("resistance", "Ω", ("Ω", "Ω", "ohms", "ohm", "r"), "4k7, 10 kΩ, 470R, R47", zero_ok=True),
    "capacitance": QuantityKind("capacitance", "F", ("mfd", "f"), "10n, 2n2, 0.01µF, 100 pF"),
    "time": QuantityKind("time", "s", ("sec", "s"), "64us, 64 µs, 1.5 ms"),
    "frequency": QuantityKind("frequency", "Hz", ("hz",), "15.625kHz, 1 MHz"),
    "voltage": QuantityKind("voltage", "V", ("v",), "5, 15 V, 3.3V"),
    "fraction": QuantityKind("fraction", "", ("%",), "0.05, 5%", zero_ok=True),
    "number": QuantityKind("number", "", (), "1.5, 2e-3", zero_ok=True, negative_ok=True),
}

_MICRO = str.maketrans({"µ": "u", "μ": "u"})
_NUMBER = re.compile(r"^(?P<num>[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*(?P<prefix>[fpnumkKMGT]?)$")
# Value code: digits, a multiplier letter in place of the decimal point, digits.
_RKM = re.compile(r"^(?P<int>\d*)(?P<letter>[pnumkKMGTRr])(?P<frac>\d*)$")


def _fail(text: str, kind: QuantityKind, why: str = "") -> ValueParseError:
    what = f"a {kind.name}" + (f" in {kind.unit}" if kind.unit else "")
    msg = f"cannot read {text!r} as {what}"
    if why:
        msg += f" ({why})"
    return ValueParseError(msg, got=text, expected=f"{what}, for example {kind.example}")


def _strip_unit(body: str, kind: QuantityKind) -> tuple[str, bool]:
    """Remove a trailing unit spelling; returns (rest, was_mfd)."""
    low = body.lower()
    for spelling in kind.spellings:
        if spelling in ("r",):
            continue  # 'R' belongs to value codes (470R); handled there
        if low.endswith(spelling.lower()) and len(body) > len(spelling):
            rest = body[: len(body) - len(spelling)].rstrip()
            if kind.name == "capacitance" and spelling == "f" and rest[-1:] in ("f",):
                # 'ff' would be femtofarad; keep the first f as the prefix.
                return rest, False
            return rest, spelling == "mfd"
    return body, False


def parse_quantity(text: object, kind: str = "number", *, zero_ok: bool | None = None) -> float:
    """Parse ``text`` as a quantity of ``kind`` (see :data:`KINDS`); return SI base units.

    Raises :class:`ValueParseError` quoting the input and the expected form for
    anything else, and for zero, negative, NaN or infinite values where the
    quantity cannot take them.
    """
    qk = KINDS[kind]
    allow_zero = qk.zero_ok if zero_ok is None else zero_ok
    if isinstance(text, bool):
        raise _fail(str(text), qk)
    if isinstance(text, (int, float)):
        value = float(text)
        return _check(value, str(text), qk, allow_zero)
    if not isinstance(text, str):
        raise _fail(repr(text), qk, "not text")
    raw = text
    body = text.strip().translate(_MICRO).replace("\u2009", " ").replace("\u00a0", " ")
    if not body:
        raise _fail(raw, qk, "empty")
    percent = False
    if kind == "fraction" and body.endswith("%"):
        body, percent = body[:-1].rstrip(), True
    body, mfd = _strip_unit(body, qk)
    body = body.strip()
    if "," in body and "." not in body and re.fullmatch(r"[+-]?\d+,\d+\s*[fpnumkKMGT]?", body) and not re.fullmatch(r"[+-]?\d{1,3},\d{3}", body):
        body = body.replace(",", ".")  # decimal comma (4,7 nF); '1,000' stays ambiguous
    value: float | None = None
    m = _NUMBER.match(body)
    if m:
        prefix = m.group("prefix")
        if mfd and prefix:
            raise _fail(raw, qk)
        if qk.name in ("fraction", "number") and prefix:
            raise _fail(raw, qk, "no unit prefix expected")
        # Build the decimal text and let float() round once: 2n2 -> 2.2e-9 exactly.
        value = _scaled(m.group("num"), _PREFIX_EXP[prefix] - (6 if mfd else 0))
    else:
        r = _RKM.match(body)
        if r and (r.group("int") or r.group("frac")) and not mfd and qk.name not in ("fraction", "number"):
            letter = r.group("letter")
            if letter in "Rr":
                if qk.name != "resistance":
                    raise _fail(raw, qk, "'R' marks ohms")
                exp = 0
            else:
                exp = _PREFIX_EXP[letter]
            value = _scaled(f"{r.group('int') or '0'}.{r.group('frac') or '0'}", exp)
    if value is None:
        raise _fail(raw, qk)
    if percent:
        value /= 100.0
    return _check(value, raw, qk, allow_zero)


def _scaled(number: str, exp: int) -> float:
    mant, _, e = number.lower().partition("e")
    return float(f"{mant}e{int(e or 0) + exp}")


def _check(value: float, raw: str, qk: QuantityKind, allow_zero: bool) -> float:
    if math.isnan(value) or math.isinf(value):
        raise _fail(raw, qk, "not a finite number")
    if value < 0 and not qk.negative_ok:
        raise _fail(raw, qk, "must not be negative")
    if value == 0 and not allow_zero:
        raise _fail(raw, qk, "must be greater than zero")
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
    exp3 = max(-5, min(4, exp3))
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
