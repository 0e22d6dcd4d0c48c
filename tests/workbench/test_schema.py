"""The forms come from the readers' key lists; the few things kept here (required keys,
defaults) are held against the readers themselves."""

from __future__ import annotations

import dataclasses
import tomllib

import pytest

from feedcheck.errors import InputError
from feedcheck.inputs.job_file import parse_job_data
from feedcheck.inputs.workbook_cells import SHEETS
from feedcheck.workbench.document import JobDocument
from feedcheck.workbench.schema import DEFAULTS, EXAMPLES, REQUIRED, schema

from .conftest import SAMPLES

# sample jobs that hold an element of every kind between them
FULL = ("willow_yard_standby.toml", "cedar_annex_review.toml", "harbor_kitchen.toml")


def test_fields_are_the_readers_keys_in_page_order():
    kinds = schema()["kinds"]
    assert [k["kind"] for k in kinds] == [
        "project",
        "source",
        "transformer",
        "run",
        "panel",
        "motor",
        "generator",
        "transfer_switch",
        "options",
    ]
    for k in kinds:
        keys, multiple = SHEETS[k["kind"]]
        assert [f["key"] for f in k["fields"]] == list(keys)
        assert k["multiple"] is multiple
        for f in k["fields"]:
            assert set(f) == {"key", "label", "hint", "default", "required", "choices", "help"}


def _problems(text: str, path) -> list:
    try:
        parse_job_data(tomllib.loads(text), text, path)
    except InputError as exc:
        return exc.problems
    return []


def _cases():
    for name in FULL:
        text = (SAMPLES / name).read_text(encoding="utf-8")
        for e in JobDocument(text).elements():
            for key in REQUIRED[e["kind"]]:
                if key in e["values"]:
                    yield name, e["kind"], e["index"], key


@pytest.mark.parametrize("name,kind,index,key", list(_cases()))
def test_required_keys_are_required_by_the_reader(name, kind, index, key):
    path = SAMPLES / name
    doc = JobDocument(path.read_text(encoding="utf-8"))
    doc.apply({"op": "set", "kind": kind, "index": index, "key": key, "value": ""})
    problems = _problems(doc.text, path)
    where = f"{kind}[{index + 1}].{key}" if SHEETS[kind][1] else f"{kind}.{key}"
    assert any(p.where == where and p.value == "" for p in problems), (where, problems)


def test_every_required_key_is_tried():
    tried = {(kind, key) for _, kind, _, key in _cases()}
    assert tried == {(k, key) for k, keys in REQUIRED.items() for key in keys}


def _element(job, kind: str):
    if kind == "project":
        return job.project
    if kind == "options":
        return job.options
    return {"transformer": job.transformers, "run": job.runs, "panel": job.panels}[kind][0]


@pytest.mark.parametrize("kind,key", sorted(DEFAULTS))
def test_defaults_are_the_readers(kind, key):
    """The job with the key absent reads as the job with the key set to the default."""
    path = SAMPLES / "harbor_kitchen.toml"
    doc = JobDocument(path.read_text(encoding="utf-8"))
    if kind == "panel":
        doc.apply({"op": "set", "kind": "panel", "index": 0, "key": "area", "value": "1000 ft2"})
    doc.apply({"op": "set", "kind": kind, "index": 0, "key": key, "value": ""})
    absent = parse_job_data(tomllib.loads(doc.text), doc.text, path)
    doc.apply({"op": "set", "kind": kind, "index": 0, "key": key, "value": DEFAULTS[kind, key]})
    given = parse_job_data(tomllib.loads(doc.text), doc.text, path)
    a, g = _element(absent, kind), _element(given, kind)
    assert dataclasses.asdict(a) == dataclasses.asdict(g)


def test_help_texts_are_whole_sentences():
    """A comment continued on the template's next lines is joined: no help stops at a
    comma, colon, semicolon, open bracket or a dangling "or"."""
    for k in schema()["kinds"]:
        for f in k["fields"]:
            text = f["help"]
            assert not text.endswith((",", ":", ";", "(", " or", " the", " of")), (k, f)
            assert text.count("(") == text.count(")"), (k["kind"], f["key"], text)


def test_labels_spell_the_trade_terms():
    labels = {(k["kind"], f["key"]): f["label"] for k in schema()["kinds"] for f in k["fields"]}
    assert labels["source", "service_x_r"] == "Service X/R"
    assert labels["source", "primary_x_r"] == "Primary X/R"
    assert labels["source", "short_circuit_mva"] == "Short circuit (MVA)"
    assert all(" x r" not in v.lower() and " mva" not in v for v in labels.values())


def _sample_with(kind: str, key: str):
    if key.startswith("primary_"):  # keys of a service stated by its transformer
        return SAMPLES / "willow_yard_standby.toml", JobDocument(
            (SAMPLES / "willow_yard_standby.toml").read_text(encoding="utf-8")
        )
    for name in reversed(FULL):  # the plainest job that has one
        path = SAMPLES / name
        doc = JobDocument(path.read_text(encoding="utf-8"))
        if any(e["kind"] == kind for e in doc.elements()):
            return path, doc
    raise AssertionError(kind)


INSTEAD_OF = {
    ("motor", "kw"): ("hp",),
    ("source", "short_circuit_mva"): ("available_fault",),
}


@pytest.mark.parametrize("kind,key", sorted(EXAMPLES))
def test_examples_kept_here_are_read_by_the_reader(kind, key):
    """The page shows "e.g. <example>" beside a field: the example must be a value the
    reader takes for that key (no problem named at the key)."""
    path, doc = _sample_with(kind, key)
    for other in INSTEAD_OF.get((kind, key), ()):  # keys it stands in place of
        doc.apply({"op": "set", "kind": kind, "index": 0, "key": other, "value": ""})
    doc.apply({"op": "set", "kind": kind, "index": 0, "key": key, "value": EXAMPLES[kind, key]})
    where = f"{kind}[1].{key}" if SHEETS[kind][1] else f"{kind}.{key}"
    problems = [p for p in _problems(doc.text, path) if p.where.startswith(where)]
    assert problems == [], problems
