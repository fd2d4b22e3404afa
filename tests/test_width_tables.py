"""Every published min/typ/max width table in the catalog, one test per row.

The rows are data (``timing.widths`` in the family's YAML, each with its source id and
table name); this test reads them, so a new table adds cases without code. For each
row, with 0.1 % R and C and the row's own maker forced (its sheet, its constant):

- the nominal lands within 5 % of the sheet's typical;
- the worst-case band holds the sheet's guaranteed min..max;
- the band reaches no more than 30 % beyond it (band min ≥ 0.7·min, band max ≤ 1.3·max).

Sources (beside each row in the YAML): NXP HEF4538B rev 06 Table 8 (catalog/cd4538b.yaml),
onsemi MC14528B/D rev 3 switching characteristics (catalog/cd4528b.yaml), TI LMC555
SNAS558J Electrical Characteristics, timing accuracy (catalog/lmc555.yaml).
"""

from __future__ import annotations

import pytest

from advisor.catalog import load_catalog
from advisor.circuit import Circuit
from advisor.timing import analyse

CAT = load_catalog()


def _rows():
    for fid in CAT.ids():
        fam = CAT.families[fid]
        for i, row in enumerate(fam.timing.widths):
            yield pytest.param(fam, row, id=f"{fam.id}[{i}] {row.source} {row.table} {row.vcc:g}V {row.c:g}F")


def _maker(fam, row):
    if row.maker is not None:
        return row.maker
    src = fam.source(row.source)
    return src.maker if src is not None else None


def test_the_catalog_publishes_the_named_tables():
    having = {fid for fid, f in CAT.families.items() if f.timing.widths}
    assert {"CD4538B", "CD4528B", "LMC555"} <= having


@pytest.mark.parametrize("fam,row", list(_rows()))
def test_published_width_row_is_honoured(fam, row):
    maker = _maker(fam, row)
    circuit = Circuit(fam.id, vcc=row.vcc, r=row.r, c=row.c, r_tol=0.001, c_tol=0.001,
                      makers=(maker,) if maker else (), maker_basis="--maker" if maker else None)
    res = analyse(fam, circuit)
    nominal, lo, hi = (res.timing[k]["width"] for k in ("nominal", "min", "max"))
    assert nominal == pytest.approx(row.typ, rel=0.05)
    if row.min is not None:
        assert lo <= row.min * (1 + 1e-9)
        assert lo >= 0.7 * row.min
    if row.max is not None:
        assert hi >= row.max * (1 - 1e-9)
        assert hi <= 1.3 * row.max
