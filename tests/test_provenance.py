"""`retime catalog check --json` reports where the catalog's numbers come from (DEVELOPERS.md,
"Provenance counts"). Properties that must hold, on an inline family and on the shipped catalog."""

from __future__ import annotations

import json
import subprocess
import sys

import pytest

from advisor.catalog import load_dirs, names_revision, provenance
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
    assert set(prov) == {"values", "published", "memory", "common_practice", "constants_from_memory", "unrevised"}
    assert prov["values"] >= prov["published"] + prov["unrevised"] + prov["memory"] + prov["common_practice"]
    assert prov["values"] > 0


@pytest.mark.parametrize("document, named", [
    ("TI SCHS142F (September 1997, revised October 2003)", True),  # literature number with its letter
    ("NXP product data sheet Rev. 7, 12 December 2011", True),
    ("Hitachi HD74LS122 data sheet, Rev.2.00, Feb.18.2005", True),
    ("Motorola REV 6, 10/95", True),
    ("Philips Semiconductors product specification, 1998 Jul 08", True),
    ("TI SCBA004", False),  # an id alone: which revision printed the figure?
    ("Hitachi data sheet", False),
    ("Intersil data sheet, stored copy; the FN number and revision are not on that page", False),
])
def test_published_means_the_document_names_its_revision(document, named):
    # Issue 15: "name a published document by id and revision".
    assert names_revision(document) is named


def test_a_source_without_revision_is_counted_apart(tmp_path):
    write_family(tmp_path)
    fam = next(iter(load_dirs([tmp_path]).families.values()))

    def citing(document: str) -> dict:
        return provenance(fam.model_copy(update={"sources": tuple(
            s.model_copy(update={"document": document}) for s in fam.sources)}))

    dated, undated = citing("maker's data sheet rev 2, 2001"), citing("maker's data sheet")
    assert dated["published"] > 0 and dated["unrevised"] == 0
    assert undated["published"] == 0 and undated["unrevised"] == dated["published"]
