"""The bundled demo scenario (``advisor/data/demo/*.yaml``): load it and run every line.

The scenario is invented (see the file's header); it exercises the main job end
to end: swaps at a new supply with calibration, pin maps, rework and findings,
and one alternates list.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

import yaml

from advisor.circuit import Circuit, Measurement, Trigger
from advisor.errors import DataError
from advisor.resources import data_dir
from advisor.substitute.classify import CLASS_ORDER
from advisor.values import parse_quantity

_QUANTITY = {
    "vcc": "voltage", "r": "resistance", "ra": "resistance", "rb": "resistance", "pot": "resistance",
    "c": "capacitance", "trigger_period": "time", "trigger_high": "voltage", "measured_width": "time",
    "measured_high": "time", "measured_low": "time", "measured_period": "time", "pot_setting": "fraction",
    "r_tol": "fraction", "c_tol": "fraction",
}
_LINE_KEYS = {"ref", "role", "old", "new", "circuit", "new_vcc", "comment"}


@dataclass
class DemoLine:
    ref: str
    role: str
    old: str
    new: str
    circuit: Circuit
    new_vcc: float | None
    comment: str | None = None


@dataclass
class Scenario:
    title: str
    story: str
    lines: list[DemoLine]
    alternates: list[dict] = field(default_factory=list)
    file: str = ""


def scenario_files() -> list[Path]:
    return sorted(data_dir("demo").glob("*.yaml"))


def _circuit(raw: dict, where: str) -> Circuit:
    if not isinstance(raw, dict):
        raise DataError(f"{where}: expected a mapping of circuit values")
    v: dict = {}
    for key, text in raw.items():
        if key in _QUANTITY:
            v[key] = parse_quantity(str(text), _QUANTITY[key], zero_ok=True if _QUANTITY[key] == "fraction" else None)
        elif key not in ("mode", "trigger_edge", "measured_from"):
            raise DataError(f"{where}.{key}: unknown circuit key")
    measured = None
    for q in ("width", "high", "low", "period"):
        if f"measured_{q}" in v:
            measured = Measurement(q, v[f"measured_{q}"])
    if "measured_from" in raw:
        # A scope capture shipped beside the scenario (trigger on CH1, output on CH2).
        from advisor.measure.summary import capture_measurement

        measured = capture_measurement(data_dir("demo") / str(raw["measured_from"]), mode=raw.get("mode"),
                                       trigger_channel=1, output_channel=2)
    return Circuit(
        part="", vcc=v.get("vcc"), mode=raw.get("mode"), r=v.get("r"), ra=v.get("ra"), rb=v.get("rb"),
        c=v.get("c"), pot=v.get("pot"), pot_setting=v.get("pot_setting"), r_tol=v.get("r_tol"), c_tol=v.get("c_tol"),
        trigger=Trigger(v.get("trigger_period"), raw.get("trigger_edge"), v.get("trigger_high")), measured=measured,
    )


def load_scenario(path: Path | None = None) -> Scenario:
    """The scenario in ``path`` (default: the first shipped file), validated line by line."""
    if path is None:
        files = scenario_files()
        if not files:
            raise DataError("no demo scenario shipped in advisor/data/demo")
        path = files[0]
    label = f"demo/{path.name}"
    try:
        data = yaml.safe_load(path.read_text(encoding="utf-8"))
    except (OSError, yaml.YAMLError) as exc:
        raise DataError(f"{label}: cannot read the scenario: {exc}") from None
    lines = []
    for i, raw in enumerate(data.get("lines", [])):
        where = f"{label}: lines[{i}]"
        unknown = set(raw) - _LINE_KEYS
        if unknown:
            raise DataError(f"{where}: unknown key(s) {sorted(unknown)}")
        nv = raw.get("new_vcc")
        lines.append(DemoLine(
            ref=str(raw["ref"]), role=str(raw.get("role", "")), old=str(raw["old"]), new=str(raw["new"]),
            circuit=_circuit(raw.get("circuit", {}), f"{where}.circuit"),
            new_vcc=parse_quantity(str(nv), "voltage") if nv is not None else None,
            comment=raw.get("comment"),
        ))
    return Scenario(str(data.get("title", "")), str(data.get("story", "")).strip(), lines,
                    list(data.get("alternates", [])), label)


@dataclass
class DemoRun:
    scenario: Scenario
    swaps: list[tuple[DemoLine, object]]  # (line, SwapResult)
    alternates: list[tuple[DemoLine, object]]  # (line, AlternatesResult)

    def to_json(self) -> dict:
        return {
            "title": self.scenario.title,
            "story": self.scenario.story,
            "file": self.scenario.file,
            "swaps": [{"ref": ln.ref, "role": ln.role, "comment": ln.comment, **res.to_json()}
                      for ln, res in self.swaps],
            "alternates": [{"ref": ln.ref, **res.to_json()} for ln, res in self.alternates],
            "classes": sorted({res.cls for _, res in self.swaps}, key=CLASS_ORDER.index),
        }


def run_demo(catalog, scenario: Scenario | None = None) -> DemoRun:
    from advisor.substitute.alternates import alternates
    from advisor.substitute.swap import swap

    sc = scenario or load_scenario()
    swaps = []
    by_ref = {}
    for ln in sc.lines:
        circuit = ln.circuit.with_(part=ln.old)
        swaps.append((ln, swap(catalog, ln.old, ln.new, circuit, new_vcc=ln.new_vcc)))
        by_ref[ln.ref] = ln
    alts = []
    for a in sc.alternates:
        ln = by_ref.get(str(a.get("ref")))
        if ln is None:
            raise DataError(f"{sc.file}: alternates: no line with ref {a.get('ref')!r}")
        alts.append((ln, alternates(catalog, ln.old, ln.circuit.with_(part=ln.old), new_vcc=ln.new_vcc,
                                    limit=int(a.get("limit", 5)))))
    return DemoRun(sc, swaps, alts)


def render_demo(run: DemoRun) -> str:
    from advisor.substitute.text import render_alternates, render_swap

    out = [run.scenario.title, "=" * min(len(run.scenario.title), 100), run.scenario.story, ""]
    for ln, res in run.swaps:
        j = res.to_json()
        head = f"{ln.ref}  {ln.role}: {j['old']['family']} → {j['new']['family']}"
        out.append(render_swap(j, title=head))
        if ln.comment:
            out.append(f"  ({ln.comment})\n")
    for ln, res in run.alternates:
        out.append(f"{ln.ref}: " + render_alternates(res.to_json()))
    summary = {}
    for ln, res in run.swaps:
        summary.setdefault(res.cls, []).append(ln.ref)
    out.append("Summary: " + "; ".join(f"{cls}: {', '.join(refs)}" for cls, refs in summary.items()))
    return "\n".join(out) + "\n"
