"""Edits of the job in memory (set, add, remove, text), the revision guard, and saving
that keeps the user's file theirs."""

from __future__ import annotations

import difflib
import os

import pytest

from feedcheck.workbench.document import JobDocument, split_sections


def _changed_lines(before: str, after: str) -> tuple[list[str], list[str]]:
    """(lines removed, lines added) between two texts."""
    removed, added = [], []
    for line in difflib.ndiff(before.splitlines(), after.splitlines()):
        if line.startswith("- "):
            removed.append(line[2:])
        elif line.startswith("+ "):
            added.append(line[2:])
    return removed, added


def test_set_changes_one_value_and_rechecks(page):
    state = page.get("api/state").json
    assert state["rev"] == 0 and not state["job"]["dirty"]
    r = page.edit({"op": "set", "kind": "run", "index": 1, "key": "length", "value": "900 ft"})
    assert r.status_code == 200
    new = r.json
    assert new["rev"] == 1 and new["job"]["dirty"]
    run = next(e for e in new["elements"] if e["kind"] == "run" and e["index"] == 1)
    assert run["values"]["length"] == "900 ft"
    drop = [
        f
        for f in new["results"]["findings"]
        if f["check"] == "feeder voltage drop" and f["subject"] == "F-EQ1"
    ]
    assert drop[0]["status"] in ("warn", "fail")
    assert (drop[0]["kind"], drop[0]["index"], drop[0]["key"]) == ("run", 1, "length")
    removed, added = _changed_lines(state["text"], new["text"])
    assert removed == ['length = "140 ft"'] and added == ['length = "900 ft"']


def test_values_typed_become_toml_values(page):
    r = page.edit(
        {"op": "set", "kind": "run", "index": 0, "key": "sets", "value": "2"},
        {"op": "set", "kind": "panel", "index": 0, "key": "power_factor", "value": "0.85"},
        {"op": "set", "kind": "run", "index": 0, "key": "harmonic_neutral", "value": "true"},
        {"op": "set", "kind": "run", "index": 0, "key": "id", "value": "7"},
    )
    text = r.json["text"]
    assert "sets = 2\n" in text and "power_factor = 0.85\n" in text
    assert "harmonic_neutral = true\n" in text and 'id = "7"\n' in text


def test_empty_value_removes_the_key(page):
    r = page.edit({"op": "set", "kind": "run", "index": 1, "key": "ambient", "value": ""})
    run = next(e for e in r.json["elements"] if e["kind"] == "run" and e["index"] == 1)
    assert "ambient" not in run["values"]
    assert 'ambient = "30 degC"' not in r.json["text"]


def test_add_gives_an_unused_id_and_the_check_names_what_is_missing(page):
    r = page.edit({"op": "add", "kind": "panel"})
    panels = [e for e in r.json["elements"] if e["kind"] == "panel"]
    assert panels[-1]["id"] == "P1" and panels[-1]["index"] == 2
    res = r.json["results"]
    assert not res["valid"]
    missing = [e for e in res["input_errors"] if e["kind"] == "panel" and e["index"] == 2]
    assert {e["key"] for e in missing} == {"rating", "id"}  # rating missing, P1 not fed
    assert all("(missing)" in e["message"] for e in missing if e["key"] == "rating")


def test_add_a_single_table_and_refuse_a_second(page):
    r = page.edit({"op": "add", "kind": "options"})
    assert r.status_code == 200 and "\n[options]\n" in r.json["text"]
    again = page.edit({"op": "add", "kind": "options"})
    assert again.status_code == 400


def test_set_in_a_missing_single_table_creates_it(page):
    r = page.edit(
        {"op": "set", "kind": "options", "index": 0, "key": "voltage_drop", "value": "mandatory"}
    )
    assert '[options]\nvoltage_drop = "mandatory"\n' in r.json["text"]
    assert r.json["results"]["valid"]


def test_remove_an_element(page):
    state = page.get("api/state").json
    r = page.edit(
        {"op": "remove", "kind": "run", "index": 1}, {"op": "remove", "kind": "panel", "index": 1}
    )
    assert r.status_code == 200
    ids = [e["id"] for e in r.json["elements"]]
    assert "F-EQ1" not in ids and "EQ1" not in ids
    assert r.json["results"]["valid"]
    removed, added = _changed_lines(state["text"], r.json["text"])
    assert added == [] and 'id = "F-EQ1"' in removed and 'id = "LP1"' not in removed


def test_text_edit_replaces_the_whole_job(page):
    text = page.get("api/state").json["text"].replace('"95 ft"', '"96 ft"')
    r = page.edit({"op": "text", "text": text})
    assert r.json["text"] == text


def test_invalid_toml_text_gives_the_clis_message_and_text_only_mode(page):
    r = page.edit({"op": "text", "text": "[project\nname = 1\n"})
    state = r.json
    assert not state["job"]["form_edits"] and state["job"]["text_only_reason"]
    errors = state["results"]["input_errors"]
    assert len(errors) == 1 and errors[0]["line"] == 1
    assert errors[0]["message"].startswith("error: ") and "valid TOML" in errors[0]["message"]
    refused = page.edit({"op": "set", "kind": "run", "index": 0, "key": "length", "value": "1 ft"})
    assert refused.status_code == 400


def test_stale_rev_is_refused_with_the_current_one(page):
    page.edit({"op": "set", "kind": "run", "index": 0, "key": "length", "value": "90 ft"})
    r = page.edit(
        {"op": "set", "kind": "run", "index": 0, "key": "length", "value": "80 ft"}, rev=0
    )
    assert r.status_code == 409 and r.json["rev"] == 1
    assert '"90 ft"' in page.get("api/state").json["text"]


def test_a_refused_edit_applies_none_of_the_request(page):
    before = page.get("api/state").json
    r = page.edit(
        {"op": "set", "kind": "run", "index": 0, "key": "length", "value": "1 ft"},
        {"op": "set", "kind": "run", "index": 9, "key": "length", "value": "2 ft"},
    )
    assert r.status_code == 400
    after = page.get("api/state").json
    assert after["text"] == before["text"] and after["rev"] == before["rev"]


@pytest.mark.parametrize(
    "edit",
    [
        {"op": "jump"},
        {"op": "set", "kind": "nothing", "index": 0, "key": "a", "value": "1"},
        {"op": "set", "kind": "run", "index": -1, "key": "length", "value": "1 ft"},
        {"op": "set", "kind": "run", "index": True, "key": "length", "value": "1 ft"},
        {"op": "set", "kind": "run", "index": 0, "key": "length", "value": 5},
        {"op": "set", "kind": "panel", "index": 0, "key": "columns", "value": "{not a table"},
        {"op": "text", "text": None},
    ],
)
def test_malformed_edits_are_refused(page, edit):
    assert page.edit(edit).status_code == 400


def test_save_keeps_comments_key_order_and_layout_of_untouched_lines(page, job):
    original = job.read_text(encoding="utf-8")
    page.edit(
        {"op": "set", "kind": "source", "index": 0, "key": "available_fault", "value": "25 kA"},
        {"op": "set", "kind": "run", "index": 1, "key": "length", "value": "150 ft"},
        {"op": "set", "kind": "panel", "index": 0, "key": "power_factor", "value": "0.92"},
    )
    r = page.post("api/save")
    assert r.status_code == 200 and r.json["saved"] == job.name
    saved = job.read_text(encoding="utf-8")
    old_lines, new_lines = original.splitlines(), saved.splitlines()
    assert len(old_lines) == len(new_lines)
    changed = [i for i, (a, b) in enumerate(zip(old_lines, new_lines, strict=True)) if a != b]
    assert [new_lines[i] for i in changed] == [
        'available_fault = "25 kA"      # at the transformer primary terminals',
        "power_factor = 0.92",
        'length = "150 ft"',
    ]
    assert not page.get("api/state").json["job"]["dirty"]


def test_interleaved_arrays_of_tables_stay_where_they_are(page, job):
    """[[run]] and [[panel]] written apart stay apart (tomlkit alone would gather them)."""
    page.edit({"op": "set", "kind": "run", "index": 1, "key": "sets", "value": "2"})
    page.post("api/save")
    headers = [ln for ln in job.read_text(encoding="utf-8").splitlines() if ln.startswith("[")]
    assert headers == [
        "[project]",
        "[source]",
        "[[transformer]]",
        "[[run]]",
        "[[panel]]",
        "[[run]]",
        "[[panel]]",
    ]


def test_save_is_atomic_and_leaves_no_temporary_file(page, job):
    page.edit({"op": "set", "kind": "run", "index": 0, "key": "length", "value": "97 ft"})
    inode = os.stat(job).st_ino
    page.post("api/save")
    assert os.stat(job).st_ino != inode  # replaced by rename, not rewritten in place
    assert not [p for p in job.parent.iterdir() if p.name.endswith(".part")]


def test_save_of_a_read_only_job_writes_nothing(page, job):
    page.edit({"op": "set", "kind": "run", "index": 0, "key": "length", "value": "97 ft"})
    job.chmod(0o444)
    before = job.read_bytes()
    r = page.post("api/save")
    assert r.status_code == 400
    assert job.read_bytes() == before
    job.chmod(0o644)


def test_save_never_writes_outside_the_folder_when_the_job_is_a_link(tmp_path, static_dir):
    """A job file that is a link to a file elsewhere: saving replaces the link inside
    the folder, the file it pointed to is not written."""
    from .conftest import copy_sample, make_page

    elsewhere = tmp_path / "elsewhere"
    elsewhere.mkdir()
    target = copy_sample(elsewhere)
    work = tmp_path / "work"
    work.mkdir()
    (work / "job.toml").symlink_to(target)
    page = make_page(work / "job.toml", static_dir)
    before = target.read_bytes()
    page.edit({"op": "set", "kind": "run", "index": 0, "key": "length", "value": "97 ft"})
    r = page.post("api/save")
    assert target.read_bytes() == before
    if r.status_code == 200:
        assert not (work / "job.toml").is_symlink()


def test_sections_fall_back_to_text_when_the_cut_does_not_hold():
    text = 'x = [\n[1]\n]\n[project]\nname = "a"\n'
    doc = JobDocument(text)
    assert doc.sections is None and doc.why_text_only
    assert doc.text == text
    assert [s.kind for s in split_sections('[a]\ns = """\n[b]\n"""\n[[c]]\n')] == ["", "a", "c"]
