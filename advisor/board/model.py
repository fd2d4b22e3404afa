"""The board as both readers give it: parts with their pins, nets joining pins, and problems.

A pin is named ``REF.NUMBER`` (``U3.7``): the reference designator of the part
(per sheet instance in a repeated hierarchy) and the pin number of its package.
Positions are kept only for messages: file, sheet path and reference locate
every problem.
"""

from __future__ import annotations

from dataclasses import dataclass, field


@dataclass(frozen=True)
class Where:
    """Where something sits: the file, the sheet path (``/`` is the root) and the reference."""

    file: str
    sheet: str = "/"
    ref: str | None = None

    def __str__(self) -> str:
        out = f"{self.file}, sheet {self.sheet}"
        return out + (f", {self.ref}" if self.ref else "")

    def to_json(self) -> dict:
        return {"file": self.file, "sheet": self.sheet, "ref": self.ref}


@dataclass
class PinInfo:
    number: str
    name: str = ""
    kind: str = "unspecified"  # KiCad electrical type: input, output, passive, power_in, ...


@dataclass
class Part:
    ref: str
    value: str
    lib_id: str
    where: Where
    footprint: str = ""
    pins: dict[str, PinInfo] = field(default_factory=dict)  # pin number -> info

    def to_json(self) -> dict:
        return {"ref": self.ref, "value": self.value, "lib_id": self.lib_id, "footprint": self.footprint,
                "where": self.where.to_json()}


@dataclass
class Net:
    name: str
    pins: list[tuple[str, str]] = field(default_factory=list)  # (ref, pin number), sorted
    power: bool = False  # named by a power symbol or a hidden power pin (a rail)
    no_connect: bool = False  # a no-connect flag sits on it

    def pin_names(self) -> list[str]:
        return [f"{r}.{p}" for r, p in self.pins]

    def to_json(self) -> dict:
        return {"name": self.name, "pins": self.pin_names()}


@dataclass(frozen=True)
class Problem:
    """Something the reader or the tracer could not resolve, with its reason and place."""

    reason: str
    where: Where
    kind: str = "unresolved"  # unresolved | file | symbol | value | network

    def to_json(self) -> dict:
        return {"kind": self.kind, "reason": self.reason, **self.where.to_json()}

    def __str__(self) -> str:
        return f"{self.where}: {self.reason}"


@dataclass
class Board:
    file: str
    source: str  # "kicad_sch" or "net"
    parts: dict[str, Part] = field(default_factory=dict)
    nets: list[Net] = field(default_factory=list)
    problems: list[Problem] = field(default_factory=list)
    sheets: int = 1
    _pin_net: dict[tuple[str, str], Net] | None = None

    def net_of(self, ref: str, pin: str) -> Net | None:
        if self._pin_net is None:
            self._pin_net = {p: n for n in self.nets for p in n.pins}
        return self._pin_net.get((ref, pin))

    def nets_json(self) -> list[dict]:
        return [n.to_json() for n in self.nets]
