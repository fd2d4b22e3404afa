"""Hand-written result dicts shaped per design.md's JSON contract, for the report tests.

These are FIXTURES for the reporters' shape handling, not claims about real parts:
the reporters must show whatever numbers a result carries, so the tests compare the
report with these dicts, never with physics. (Where a figure resembles a real swap it
was picked only to look plausible.)
"""

from __future__ import annotations

import copy


def _finding(rule, severity, message, fix, source, part=None):
    return {"rule": rule, "severity": severity, "message": message, "fix": fix, "source": source, "part": part}


SWAP = {
    "old": {"family": "74121", "mode": "mono", "values": {"r": 10000.0, "c": 1e-08, "vcc": 5.0},
            "timing": {"nominal": {"width": 6.931e-05}, "min": {"width": 5.9e-05}, "max": {"width": 8.1e-05}}},
    "new": {"family": "74HC221", "mode": "mono", "values": {"r": 9100.0, "pot": 2000.0, "pot_setting": 0.45, "c": 1e-08, "vcc": 5.0},
            "timing": {"nominal": {"width": 6.6997e-05}, "min": {"width": 5.71e-05}, "max": {"width": 7.83e-05}}},
    "class": "rewire",
    "pin_map": [
        {"channel": 1, "function": "TRIG_FALL", "old_pin": 3, "new_pin": 1},
        {"channel": 1, "function": "TRIG_RISE", "old_pin": 5, "new_pin": 2},
        {"channel": 1, "function": "Q", "old_pin": 6, "new_pin": 13},
    ],
    "rework": ["Lift the old part and fit a 16-pin socket on an adapter.",
               "Jumper the trigger net to new pin 1.",
               "Tie pin 3 (clear) high.",
               "Fit R 9k1 in series with a 2k trimmer, C 10n."],
    "findings": [
        _finding("fixture-note", "note", "Fixture note about the inputs.", "", "fixture", "74HC221"),
        _finding("fixture-danger", "danger", "Fixture danger: pulse outlasts trigger period.", "Shorten the pulse.", "fixture", "74HC221"),
        _finding("fixture-warning", "warning", "Fixture warning on the pinout.", "Use an adapter.", "fixture", None),
    ],
    "timing": {"nominal": {"width": 6.6997e-05}, "min": {"width": 5.71e-05}, "max": {"width": 7.83e-05}},
    "calibration": None,
    "trigger": {"period": 2e-05, "divide_by": 4, "stays_high": False},
}

CHECK_ASTABLE = {
    "part": "NE555", "mode": "astable",
    "values": {"ra": 4700.0, "rb": 47000.0, "c": 1e-08, "pot": None, "pot_setting": None, "vcc": 15.0},
    "timing": {"nominal": {"high": 3.584e-04, "low": 3.258e-04, "period": 6.842e-04, "frequency": 1461.6, "duty": 0.5238},
               "min": {"high": 3.0e-04, "low": 2.8e-04, "period": 5.8e-04, "frequency": 1300.0, "duty": 0.51},
               "max": {"high": 4.1e-04, "low": 3.7e-04, "period": 7.8e-04, "frequency": 1700.0, "duty": 0.54}},
    "adjust": None, "target": None, "calibration": None, "trigger": None,
    "findings": [_finding("fixture-w", "warning", "Fixture warning.", "Fixture fix.", "fixture")],
    "constants": {}, "tolerances": {"r_tol": 0.05, "c_tol": 0.1, "defaulted": True},
}

CHECK_STUCK = {
    "part": "74HC123", "mode": "mono",
    "values": {"r": 47000.0, "c": 1e-07, "vcc": 5.0},
    "timing": {"nominal": {"width": 2.115e-03}, "min": {"width": 1.8e-03}, "max": {"width": 2.5e-03}},
    "adjust": None, "target": None, "calibration": None,
    "trigger": {"period": 1e-03, "divide_by": None, "stays_high": True},
    "findings": [], "constants": {}, "tolerances": {"r_tol": 0.05, "c_tol": 0.1, "defaulted": True},
}


def swap():
    return copy.deepcopy(SWAP)
