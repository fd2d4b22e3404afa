"""What may follow a value as printed on a part: tolerance letter, rating, dielectric.

``4K7J``, ``104K``, ``22uF 25V``, ``100nF X7R``, ``10k 1%``: the value is read by
:mod:`advisor.values`; the rest is recognised here, kept and shown with the answer
(never silently dropped, never guessed: an unknown word after a value is refused).

Sources: tolerance letters (F ±1 %, G ±2 %, J ±5 %, K ±10 %, M ±20 %, Z +80/−20 %;
B, C, D as absolute pF tolerances on small capacitors) per the IEC 60062 letter
code as tabulated on eestudenthelp.blogspot.com "Capacitor markings" (2009); the
capacitor marking "105K 330V" = 1 µF ±10 %, 330 V per IEC 60384-1 as summarised
at primidi.com/rated_capacitance (Wikipedia "Capacitor"). Dielectric names (X7R,
C0G/NP0, X5R, Y5V, Z5U: EIA class 1 and 2 ceramic codes; MKT, MKP, MKC film
codes) are common practice.
"""

from __future__ import annotations

import re

#: IEC 60062 tolerance letters and what they mean.
TOLERANCE_LETTERS: dict[str, str] = {
    "B": "±0.1 pF", "C": "±0.25 pF", "D": "±0.5 pF", "F": "±1 %", "G": "±2 %",
    "J": "±5 %", "K": "±10 %", "M": "±20 %", "Z": "+80/−20 %",
}
#: Letters that may follow a value code directly (4K7J, 104K); B, C, D only as separate words.
ATTACHED_TOLERANCE = frozenset("FGJKMZ")

_DIELECTRICS = frozenset({
    "X7R", "X5R", "X6S", "X7S", "X8R", "Y5V", "Z5U", "X7T", "C0G", "COG", "NP0", "NPO", "U2J",
    "MKT", "MKP", "MKC", "MKS", "KT", "KP", "KS", "PP", "PET", "PPS", "PEN", "MICA", "TANT", "ELKO",
})
_RATING = re.compile(r"^(?P<num>\d+(?:[.,]\d+)?)(?P<unit>V|VDC|VAC|WV|WVDC|KV|kV)$", re.IGNORECASE)
_POWER = re.compile(r"^(?:\d+/\d+|\d+(?:\.\d+)?)W$", re.IGNORECASE)
_PERCENT = re.compile(r"^(?:±|\+/-|\+-)?\d+(?:\.\d+)?%$")


def describe_mark(word: str) -> str | None:
    """A readable description of one word after a value, or None when it is not a mark."""
    w = word.strip()
    up = w.upper()
    if up in TOLERANCE_LETTERS and len(w) == 1:
        return f"tolerance letter {up} ({TOLERANCE_LETTERS[up]})"
    if _PERCENT.match(w):
        return f"tolerance {w if w[0] in '±+' else '±' + w}"
    if up in _DIELECTRICS:
        return f"dielectric {up}"
    m = _RATING.match(w)
    if m:
        return f"rated {m.group('num')} {m.group('unit').upper().replace('KV', 'kV')}"
    if _POWER.match(w):
        return f"rated {w.upper()}"
    return None
