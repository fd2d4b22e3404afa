"""Reading captures and refusing bad ones with a clear message (properties, no reference values)."""

from __future__ import annotations

import json

import numpy as np
import pytest

from advisor.cli.main import main
from advisor.errors import CaptureError
from advisor.measure import measure_capture, parse_capture, read_capture

SQUARE = "\n".join(f"{i * 1e-6:.6e},{5.0 if (i // 10) % 2 else 0.0:.3f}" for i in range(200)) + "\n"


def test_units_in_heading_scale_time_to_seconds():
    text = "TIME[ms];CH1[mV]\n" + "\n".join(f"{i * 0.001:.3f};{5000 if (i // 10) % 2 else 0}".replace(".", ",")
                                             for i in range(100))
    cap = parse_capture(text)
    assert cap.time[1] == pytest.approx(1e-6)  # 0,001 ms = 1 µs
    assert cap.channels[0].max() == pytest.approx(5.0)  # 5000 mV = 5 V


def test_preamble_bom_cp1252_and_time_column_found_by_name(tmp_path):
    body = "Gerät;Demo\nVolts;Zeit (µs)\n" + "\n".join(
        f"{5.0 if (i // 10) % 2 else 0.0:.2f};{i * 0.5:.2f}".replace(".", ",") for i in range(100))
    p = tmp_path / "cap.csv"
    p.write_bytes(body.encode("cp1252"))
    cap = read_capture(p)
    assert cap.n_channels == 1 and cap.time[1] == pytest.approx(0.5e-6)
    p.write_bytes(("\ufeff" + SQUARE).encode("utf-8"))
    assert read_capture(p).n_samples == 200


def test_period_of_a_plain_square_wave():
    res = measure_capture(parse_capture(SQUARE))
    # Property: 10 samples high, 10 low at 1 µs a sample -> 20 µs period, 50 % duty.
    assert res.channels[0].period.median == pytest.approx(20e-6)
    assert res.channels[0].duty.median == pytest.approx(0.5)


@pytest.mark.parametrize(
    "text, words",
    [
        ("hello\nworld\n", "no usable time column"),
        ("1.0\n2.0\n3.0\n", "no usable time column"),
        ("t,v\n0,0\n1e-6,5\n0.5e-6,0\n2e-6,5\n3e-6,0\n", "time goes backwards at line 4"),
        ("t,v\n0,0\n1e-6,5\n1e-6,0\n2e-6,5\n3e-6,0\n", "time repeats"),
        ("\n".join(f"{i}e-6,{np.sin(i) * 0.01:.4f}" for i in range(100)), "never crosses"),
        ("\n".join(f"{i}e-6,{0 if i < 50 else 5}" for i in range(100)), "too few edges"),
    ],
)
def test_bad_captures_give_one_clear_line(text, words):
    with pytest.raises(CaptureError) as err:
        measure_capture(parse_capture(text, source="x.csv"))
    assert words in err.value.render()


def test_unknown_channel_names_the_range():
    with pytest.raises(CaptureError, match="1 to 1"):
        measure_capture(parse_capture(SQUARE), trigger_channel=1, output_channel=3)


def test_cli_json_and_error_exit(tmp_path, capsys):
    p = tmp_path / "sq.csv"
    p.write_text(SQUARE)
    assert main(["measure", str(p), "--json"]) == 0
    out = json.loads(capsys.readouterr().out)
    ch = out["channels"][0]
    assert ch["index"] == 1 and set(ch["period"]) == {"median", "min", "max", "count"}
    assert {"high", "low", "period", "frequency", "duty"} <= set(ch)
    assert "pair" not in out
    bad = tmp_path / "bad.csv"
    bad.write_text("nothing here\n")
    assert main(["measure", str(bad)]) == 2
    assert capsys.readouterr().err.count("\n") == 1  # one line, no traceback


def test_cli_text_summary(tmp_path, capsys):
    p = tmp_path / "sq.csv"
    p.write_text(SQUARE)
    assert main(["measure", str(p), "--threshold", "2.5V"]) == 0
    text = capsys.readouterr().out
    assert "period" in text and "20 µs" in text


def test_measured_from_feeds_the_circuit_measurement(tmp_path):
    import argparse

    from advisor.cli.options import add_circuit_options, circuit_from_args
    from advisor.errors import ValueParseError

    p = tmp_path / "sq.csv"
    p.write_text(SQUARE)
    parser = argparse.ArgumentParser()
    add_circuit_options(parser)
    circuit = circuit_from_args(parser.parse_args(["--measured-from", str(p)]), "NE555")
    # One channel: its high time is the width (10 samples at 1 µs, by construction).
    assert circuit.measured.quantity == "width" and circuit.measured.value == pytest.approx(10e-6)
    circuit = circuit_from_args(parser.parse_args(["--measured-from", str(p), "--measured-quantity", "period"]), "NE555")
    assert circuit.measured.value == pytest.approx(20e-6)
    with pytest.raises(ValueParseError, match="not both"):
        circuit_from_args(parser.parse_args(["--measured-from", str(p), "--measured-width", "1ms"]), "NE555")
