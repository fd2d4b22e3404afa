"""`retime catalog check --json` reports where the catalog's numbers come from (DEVELOPERS.md,
"Provenance counts"). Properties that must hold, on an inline family and on the shipped catalog."""

from __future__ import annotations

import json
import subprocess
import sys

from advisor.catalog import load_dirs, provenance
from support.minicat import write_family


def test_counts_follow_the_definition(tmp_path):
    write_family(tmp_path)
    fam = next(iter(load_dirs([tmp_path]).families.values()))
    p = provenance(fam)
    assert p["published"] + p["memory"] + p["common_practice"] <= p["values"]
    assert p["memory"] >= 1  # the inline family's r_min is from memory (tests/support/minicat.py)
    assert p["constants_from_memory"] == 0  # its K cites source s1


def test_catalog_check_json_carries_provenance():
    out = subprocess.run([sys.executable, "-m", "advisor", "catalog", "check", "--json"], capture_output=True, text=True)
    j = json.loads(out.stdout)
    prov = j["provenance"]
    assert set(prov) == {"values", "published", "memory", "common_practice", "constants_from_memory"}
    assert prov["values"] >= prov["published"] + prov["memory"] + prov["common_practice"]
    assert prov["values"] > 0
