"""Supply rails: which nets are ground, which carry a known voltage, and how much.

A net's voltage comes from ``--supply NET=V`` first, then from its name as power
symbols of the open symbol library spell rails: ``+15V``, ``+5V``, ``-12V``,
``+3V3`` / ``+3.3V`` (the letter as decimal point, IEC 60062 style), ``VCC_15V``.
Ground is ``GND`` and its variants (``GNDA``, ``GNDD``, ``GNDPWR``, ``VSS``, ``0V``,
``Earth``). ``VCC``, ``VDD`` and other names without a number are rails of unknown
voltage: the board plan asks for ``--supply``.
"""

from __future__ import annotations

import re

from advisor.errors import InputError
from advisor.values import parse_quantity

_VOLTS = re.compile(r"(?<![A-Za-z0-9.])([+-]?)(\d+(?:[.,]\d+)?)V(\d*)(?![A-Za-z0-9])", re.IGNORECASE)
_GROUND = re.compile(r"^/?(GND\w*|AGND|DGND|PGND|VSS\w*|0V|EARTH|CHASSIS)$", re.IGNORECASE)
_RAIL_WORDS = re.compile(r"^/?([+-]?)(VCC|VDD|V\+|VPP|VBAT|VIN|VS|VEE|V-)\w*$", re.IGNORECASE)


def is_ground_name(name: str) -> bool:
    return bool(_GROUND.match(name.strip()))


def voltage_from_name(name: str) -> float | None:
    """The voltage a rail name spells (``+15V`` → 15, ``+3V3`` → 3.3), else None."""
    if is_ground_name(name):
        return 0.0
    m = _VOLTS.search(name.strip().lstrip("/"))
    if not m:
        return None
    sign = -1.0 if m.group(1) == "-" else 1.0
    whole = m.group(2).replace(",", ".")
    frac = m.group(3)
    value = float(f"{whole}.{frac}") if frac and "." not in whole else float(whole)
    return sign * value


def looks_like_rail(name: str) -> bool:
    return voltage_from_name(name) is not None or bool(_RAIL_WORDS.match(name.strip()))


def parse_supplies(items: list[str] | None) -> dict[str, float]:
    """``--supply NET=V`` options as {net name: volts}."""
    out: dict[str, float] = {}
    for item in items or []:
        name, sep, volts = item.partition("=")
        if not sep or not name.strip():
            raise InputError(f"--supply {item!r}: give NET=VOLTS", got=item, expected="e.g. --supply VDD=12")
        out[name.strip()] = parse_quantity(volts.strip(), "voltage", zero_ok=True)
    return out


class Rails:
    """Voltages of the board's nets (by name), with the user's ``--supply`` values first."""

    def __init__(self, supplies: dict[str, float] | None = None) -> None:
        self.given = dict(supplies or {})
        self._given_lower = {k.lower().lstrip("/"): v for k, v in self.given.items()}

    def voltage(self, net_name: str) -> float | None:
        key = net_name.lower().lstrip("/")
        if key in self._given_lower:
            return self._given_lower[key]
        base = key.rsplit("/", 1)[-1]
        if base in self._given_lower:
            return self._given_lower[base]
        return voltage_from_name(net_name.rsplit("/", 1)[-1])

    def is_ground(self, net_name: str) -> bool:
        v = self.voltage(net_name)
        return v == 0.0
