"""Grammar records (advisor/record.py) keep the guarantees of the pydantic models they stand for.

Properties that must hold: a record validated from a shipped file dumps exactly what the
pydantic model built from the same declaration dumps (so `show --json` and the cache see
the same data), remembers the same set fields, compares, copies and pickles as a value,
refuses to be changed, and the validation errors are pydantic's own.
"""

from __future__ import annotations

import copy
import pickle

import pytest
from pydantic import ValidationError

from advisor.parts import Family, Sourced
from advisor.record import pydantic_model
from advisor.resources import data_dir
from advisor.rules.model import Rule
from advisor.yamlload import load_yaml_file

FAMILY_FILES = sorted(p for p in data_dir("catalog").glob("*.yaml") if p.name != "makers.yaml")


@pytest.mark.parametrize("path", FAMILY_FILES, ids=lambda p: p.stem)
def test_a_family_record_dumps_what_its_pydantic_model_dumps(path):
    data = load_yaml_file(path, "catalog")
    rec = Family.model_validate(data)
    model = pydantic_model(Family).model_validate(data)
    assert rec.model_dump(mode="json") == model.model_dump(mode="json")
    assert rec.model_dump() == model.model_dump()
    assert rec.model_dump(mode="json", exclude_none=True, exclude={"sources"}) == model.model_dump(
        mode="json", exclude_none=True, exclude={"sources"})
    assert rec.model_fields_set == model.model_fields_set
    assert list(type(rec).model_fields) == list(type(model).model_fields)


def test_records_are_frozen_values():
    data = load_yaml_file(FAMILY_FILES[0], "catalog")
    fam = Family.model_validate(data)
    assert fam == Family.model_validate(data)
    assert copy.deepcopy(fam) == fam and copy.copy(fam) == fam
    back = pickle.loads(pickle.dumps(fam))
    assert back == fam and back.model_fields_set == fam.model_fields_set
    with pytest.raises(TypeError):
        fam.id = "X"
    other = fam.model_copy(update={"note": "changed"})
    assert other.note == "changed" and "note" in other.model_fields_set and fam.note != "changed"
    s = Sourced(value=1, source="memory")
    assert s.value == 1.0 and isinstance(s.value, float)  # validated as the grammar says
    assert s == Sourced.model_validate({"value": 1.0, "source": "memory"})
    assert hash(s) == hash(Sourced(value=1.0, source="memory"))


def test_validation_errors_are_pydantics_with_their_locations():
    with pytest.raises(ValidationError) as err:
        Sourced.model_validate({"value": "abc", "source": "memory", "colour": "red"})
    locs = {e["loc"] for e in err.value.errors()}
    assert ("value",) in locs and ("colour",) in locs
    with pytest.raises(ValidationError) as err:
        Rule.model_validate({"id": "x", "title": "t"})
    assert {e["type"] for e in err.value.errors()} >= {"missing", "string_pattern_mismatch"}


def test_case_values_are_validated_strictly():
    base = {"id": "some-rule", "title": "a rule", "condition": "part.vcc > 1", "severity": "note",
            "message": "msg", "fix": "fix", "source": "common-practice"}
    ok = Rule.model_validate({**base, "cases": {"fire": [{"part.vcc": 5}], "no_fire": [{"part.vcc": 0.5}]}})
    assert ok.cases.fire[0]["part.vcc"] == 5 and type(ok.cases.fire[0]["part.vcc"]) is int
    with pytest.raises(ValidationError):  # a list is not a scalar
        Rule.model_validate({**base, "cases": {"fire": [{"part.vcc": [5]}], "no_fire": [{"part.vcc": 0.5}]}})
