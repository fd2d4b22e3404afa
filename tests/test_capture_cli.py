"""A scope capture given to check and swap (``--measured-from``) travels into the result as
``capture`` and into the reports as a measured row beside the predicted one.

The captures are made from ngspice runs of the behavioural one-shot in
support/captures.py (the simulator is the independent source), sampled as a scope
would with seeded noise. Reference values: the edges of the clean simulated waveform
(support.ngspice.crossings, via support.captures.clean_edges) and the one-shot law of
the 555 family, width = ln3·R·C (thresholds at 0 and 2/3 of the supply; TI NE555
SLFS022, "monostable operation", t = 1.1·R·C). The rest are properties: the summary
holds the same edges ``retime measure`` finds, the calibration uses the same median,
and every number a report shows is the JSON's.
"""

from __future__ import annotations

import json
import math
import re

import numpy as np
import pytest
from support.captures import clean_edges, one_shot, sample, write_csv
from support.report_html import read_page

from advisor.cli.main import main
from advisor.measure import measure_file, measured_value
from advisor.measure.summary import MAX_EDGES, MAX_PERIODS, capture_measurement
from advisor.values import format_eng, parse_quantity

pytestmark = pytest.mark.external

R, C = 10e3, 10e-9  # one-shot network: ln3·R·C = 109.86 µs
TOL = 0.005  # issue 10's acceptance for widths and periods: within 0.5 %


@pytest.fixture(scope="module")
def mono_sim():
    return one_shot(R, C, 250e-6)  # every trigger fires (the pulse is shorter than the period)


@pytest.fixture(scope="module")
def divide_sim():
    return one_shot(R, C, 80e-6)  # 110 µs pulse, 80 µs triggers: every second trigger fires


@pytest.fixture
def mono_csv(mono_sim, tmp_path):
    t, ch = sample(mono_sim, 30_000, noise=0.02, seed=11)
    return write_csv(tmp_path / "bench-mono.csv", t, ch, "comma-seconds")


@pytest.fixture
def divide_csv(divide_sim, tmp_path):
    t, ch = sample(divide_sim, 20_000, noise=0.02, seed=5)
    return write_csv(tmp_path / "bench-div2.csv", t, ch, "semicolon-decimal-comma-us-cp1252")


def _json(capsys, argv: list[str]) -> dict:
    assert main(argv + ["--json"]) == 0
    return json.loads(capsys.readouterr().out)


def _relative_edges(path, cap: dict) -> dict:
    """The edges ``retime measure`` finds (trigger ch 1, output ch 2) from the first active
    trigger edge, over the summary's window (which starts and ends one sample early)."""
    res = measure_file(path, trigger_channel=1, output_channel=2)
    trig = res.channel(1).edges
    t0 = float((trig.rising if res.pair.trigger_edge == "rising" else trig.falling)[0])
    step = res.sample_interval
    out = {}
    for role, n in (("trigger", 1), ("output", 2)):
        e = res.channel(n).edges
        for kind in ("rising", "falling"):
            times = getattr(e, kind) - t0
            out[(role, kind)] = times[(times >= -step) & (times < cap["window"] - step)]
    return out


# --------------------------------------------------------------------------- the summary


def test_summary_holds_the_measured_edges_and_the_calibration_median(mono_sim, mono_csv):
    m = capture_measurement(mono_csv)
    cap = m.capture
    # Same median as the measurement `--measured-from` used before the summary existed (property).
    assert m.quantity == "width" and m.value == measured_value(mono_csv)
    assert cap["value"] == m.value == cap["width"]
    assert (cap["trigger_channel"], cap["output_channel"]) == (1, 2) and cap["name"] == "bench-mono.csv"
    # Property: the summary's edges are exactly the measured edges inside its window.
    for (role, kind), times in _relative_edges(mono_csv, cap).items():
        assert cap[role][kind] == pytest.approx(list(times), abs=1e-15), (role, kind)
        assert len(cap[role]["rising"]) + len(cap[role]["falling"]) <= MAX_EDGES
    # ngspice: every summarised edge lies within one sample of the clean simulated edge.
    trig_rise, _ = clean_edges(mono_sim, 1)
    out_rise, out_fall = clean_edges(mono_sim, 2)
    t0 = trig_rise[0]
    step = cap["sample_interval"]
    for got, sim in ((cap["trigger"]["rising"], trig_rise), (cap["output"]["rising"], out_rise),
                     (cap["output"]["falling"], out_fall)):
        assert np.abs(np.array(got) - (sim[: len(got)] - t0)).max() < step
    # ngspice and the law: width ln3·R·C, trigger period 250 µs (the simulated PULSE source).
    assert cap["width"] == pytest.approx(math.log(3) * R * C, rel=TOL)
    assert cap["period"] == pytest.approx(250e-6, rel=TOL)
    # Window: whole trigger periods, at most MAX_PERIODS of them (12 triggers were simulated).
    assert cap["window"] == pytest.approx(MAX_PERIODS * 250e-6, rel=TOL)
    assert cap["trigger"]["starts_high"] is False and cap["output"]["starts_high"] is False
    json.dumps(cap)  # plain JSON values only


def test_divided_capture_keeps_one_pulse_per_two_triggers(divide_csv):
    cap = capture_measurement(divide_csv).capture
    # ngspice: 110 µs pulses on 80 µs triggers, non-retriggerable: every second trigger fires.
    assert cap["divide_by"] == 2 and cap["pulses"] == 6 and cap["triggers"] == 12
    assert len(cap["output"]["rising"]) == math.ceil(len(cap["trigger"]["rising"]) / 2)
    assert cap["width"] == pytest.approx(math.log(3) * R * C, rel=TOL)


# --------------------------------------------------------------------------- check and swap JSON


def test_check_json_carries_the_capture(mono_csv, capsys):
    argv = ["check", "NE555", "--r", "10k", "--c", "10n", "--vcc", "5"]
    plain = _json(capsys, argv)
    assert plain["capture"] is None  # the key is always there; null without a capture
    result = _json(capsys, argv + ["--measured-from", str(mono_csv)])
    cap = result["capture"]
    assert cap["file"] == str(mono_csv)
    # The calibration uses the capture's median output width (property: one number, one source).
    assert result["calibration"]["measured"] == cap["value"] == measured_value(mono_csv)
    # NE555 law 1.1·R·C (TI SLFS022) against ngspice's ln3·R·C: the factor is 1 within 0.5 %.
    assert result["calibration"]["factor"] == pytest.approx(1.0, abs=TOL)
    for (role, kind), times in _relative_edges(mono_csv, cap).items():
        assert cap[role][kind] == pytest.approx(list(times), abs=1e-15)
    # The design guide's keys stay as they were (additive change).
    assert set(plain) - {"capture"} <= set(result) and set(result) - set(plain) == set()


def test_swap_json_and_html_report_show_the_measured_row(divide_csv, tmp_path, capsys):
    report = tmp_path / "r.html"
    result = _json(capsys, ["swap", "NE555", "TLC555", "--r", "10k", "--c", "10n", "--vcc", "5",
                            "--trigger-period", "80us", "--measured-from", str(divide_csv), "--report", str(report)])
    cap = result["capture"]
    assert result["kept"]["basis"] == "measured" and result["kept"]["value"] == cap["value"]
    for (role, kind), times in _relative_edges(divide_csv, cap).items():
        assert cap[role][kind] == pytest.approx(list(times), abs=1e-15)

    html = report.read_text(encoding="utf-8")
    page = read_page(html)
    fig = re.search(r'<figure class="pic-timing">(.*?)</figure>', html, re.S).group(1)
    svg = fig[: fig.index("</svg>")]
    # The timing picture carries a measured row, marked with the capture's median width.
    assert ">measured output<" in svg
    assert f">{format_eng(cap['width'], 's', 4)}<" in svg
    caption = page.find("figcaption")[0].text
    assert "bench-div2.csv" in caption and "channel 1" in caption and "channel 2" in caption
    # Every capture number on the page is the JSON's (data-key into the result, data-si its value).
    tagged = [n for n in page.with_attr("data-key") if n.attrs["data-key"].startswith("capture.")]
    edges = sum(len(cap[r][k]) for r in ("trigger", "output") for k in ("rising", "falling"))
    assert len(tagged) >= edges + 2
    for node in tagged:
        node_key = node.attrs["data-key"].split(".")[1:]
        value = cap
        for part in node_key:
            value = value[int(part)] if isinstance(value, list) else value[part]
        assert float(node.attrs["data-si"]) == value
        if value > 0:  # the text reads back to it within the report's 4 significant digits
            assert parse_quantity(node.text.strip(), "time") == pytest.approx(value, rel=5e-4)


def test_markdown_report_has_the_measured_strip_and_edge_table(mono_csv, tmp_path, capsys):
    report = tmp_path / "r.md"
    result = _json(capsys, ["check", "NE555", "--r", "10k", "--c", "10n", "--vcc", "5", "--trigger-period", "250us",
                            "--measured-from", str(mono_csv), "--report", str(report)])
    md = report.read_text(encoding="utf-8")
    strip = md.split("```text\n", 1)[1].split("```", 1)[0].splitlines()
    measured = next(line for line in strip if line.startswith("measured output"))
    # Property: one measured pulse per captured output rising edge, each a run of high columns.
    assert len(re.findall("‾+", measured)) == len(result["capture"]["output"]["rising"])
    assert "bench-mono.csv" in md and "### Captured edge times" in md
    row = next(line for line in md.splitlines() if line.startswith("| output falling |"))
    assert format_eng(result["capture"]["output"]["falling"][0], "s", 4) in row


def test_falling_edge_trigger_is_anchored_on_its_falling_edge(mono_sim, tmp_path, capsys):
    # The ngspice trigger channel turned upside down: now its falling edge leads each pulse.
    t, ch = sample(mono_sim, 30_000, noise=0.02, seed=11)
    path = write_csv(tmp_path / "inverted.csv", t, [5.0 - ch[0], ch[1]], "comma-seconds")
    cap = capture_measurement(path).capture
    assert cap["trigger"]["edge"] == "falling" and cap["trigger"]["falling"][0] == 0.0
    assert cap["trigger"]["starts_high"] is True
    # ngspice: the output follows its trigger within the simulated propagation delay (tens of ns),
    # i.e. within one 100 ns sample, and the width is still ln3·R·C.
    assert abs(cap["output"]["rising"][0]) < cap["sample_interval"]
    assert cap["width"] == pytest.approx(math.log(3) * R * C, rel=TOL)
    report = tmp_path / "r.md"
    _json(capsys, ["check", "NE555", "--r", "10k", "--c", "10n", "--vcc", "5", "--trigger-period", "250us",
                   "--measured-from", str(path), "--report", str(report)])
    strip = report.read_text(encoding="utf-8").split("```text\n", 1)[1].split("```", 1)[0].splitlines()
    # Property: a mark per captured trigger edge, and a measured pulse per captured output pulse.
    assert strip[0].startswith("trigger") and strip[0].count("^") == len(cap["trigger"]["falling"])
    measured = next(line for line in strip if line.startswith("measured output"))
    assert len(re.findall("‾+", measured)) == len(cap["output"]["rising"])
