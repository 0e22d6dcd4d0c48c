"""Report, new job from the template, and the schedule grid (read, edit, save)."""

from __future__ import annotations

import openpyxl

from feedcheck.template import TEMPLATE

from .conftest import make_page


def test_report_writes_a_pdf_in_the_folder_and_serves_it(page, job):
    r = page.post("api/report")
    assert r.status_code == 200, r.json
    assert r.json == {
        "file": "harbor_kitchen_report.pdf",
        "url": "api/download/harbor_kitchen_report.pdf",
    }
    pdf = job.parent / "harbor_kitchen_report.pdf"
    assert pdf.read_bytes()[:5] == b"%PDF-"
    d = page.get(r.json["url"])
    assert d.status_code == 200 and d.mimetype == "application/pdf"
    assert d.headers["Content-Disposition"] == 'attachment; filename="harbor_kitchen_report.pdf"'
    assert d.data == pdf.read_bytes()


def test_report_refused_while_unsaved_or_invalid(page, job):
    page.edit({"op": "set", "kind": "run", "index": 0, "key": "length", "value": "97 ft"})
    r = page.post("api/report")
    assert r.status_code == 409 and "save" in r.json["error"]
    page.edit({"op": "set", "kind": "run", "index": 0, "key": "length", "value": "-5 ft"})
    r = page.post("api/report")
    assert r.status_code == 400 and r.json["errors"]
    assert not (job.parent / "harbor_kitchen_report.pdf").exists()


def test_new_job_from_the_template(page, job):
    r = page.post("api/new", {"name": "second site.toml"})
    assert r.status_code == 200
    new = job.parent / "second site.toml"
    assert new.read_text(encoding="utf-8") == TEMPLATE
    state = r.json
    assert state["job"] == {
        **state["job"],
        "name": "second site.toml",
        "exists": True,
        "dirty": False,
    }
    assert state["text"] == TEMPLATE and state["results"]["valid"]
    assert page.get("api/state").json["job"]["name"] == "second site.toml"
    page.edit({"op": "set", "kind": "project", "index": 0, "key": "name", "value": "Site 2"})
    page.post("api/save")
    assert 'name = "Site 2"' in new.read_text(encoding="utf-8")
    assert "Harbor Street" in job.read_text(encoding="utf-8")  # the first job untouched


def test_a_missing_job_starts_from_the_template_and_save_creates_it(tmp_path, static_dir):
    target = tmp_path / "fresh.toml"
    page = make_page(target, static_dir, exists=False)
    state = page.get("api/state").json
    assert state["job"]["exists"] is False and state["job"]["dirty"] is True
    assert state["text"] == TEMPLATE and not target.exists()
    assert page.post("api/save").status_code == 200
    assert target.read_text(encoding="utf-8") == TEMPLATE


def test_schedule_grid_has_each_rows_status(page, job):
    r = page.get("api/schedule?panel=LP1")
    assert r.status_code == 200
    g = r.json
    lines = (job.parent / "LP1.csv").read_text(encoding="utf-8").splitlines()
    assert g["panel"] == "LP1" and g["file"] == "LP1.csv"
    assert g["columns"] == lines[0].split(",")
    assert [",".join(row) for row in g["rows"]] == lines[1:]
    assert len(g["status"]) == len(g["rows"]) == len(g["messages"])
    assert set(g["status"]) <= {"ok", "warn", "fail", "info", ""}
    assert "ok" in g["status"]


def test_schedule_of_a_panel_without_one_is_404(page):
    page.edit({"op": "set", "kind": "panel", "index": 1, "key": "schedule", "value": ""})
    assert page.get("api/schedule?panel=EQ1").status_code == 404


def test_schedule_edit_rechecks_and_save_writes_the_csv(page, job):
    g = page.get("api/schedule?panel=LP1").json
    col = g["columns"].index("Length [ft]")
    rows = [list(r) for r in g["rows"]]
    rows[0][col] = "900"
    r = page.post("api/schedule", {"panel": "LP1", "columns": g["columns"], "rows": rows})
    assert r.status_code == 200
    assert r.json["job"]["dirty"] and r.json["schedule"]["rows"][0][col] == "900"
    assert r.json["schedule"]["status"][0] in ("warn", "fail")
    assert r.json["schedule"]["messages"][0]
    subjects = [f for f in r.json["results"]["findings"] if f["subject"].startswith("LP1/1")]
    assert subjects and all(f["kind"] == "panel" and f["key"] == "schedule" for f in subjects)
    csv_before = (job.parent / "LP1.csv").read_text(encoding="utf-8")
    assert csv_before.splitlines()[1].split(",")[col] == "85"  # nothing written before asked
    assert page.post("api/schedule/save", {"panel": "LP1"}).json == {"saved": "LP1.csv"}
    after = (job.parent / "LP1.csv").read_text(encoding="utf-8").splitlines()
    assert after[1].split(",")[col] == "900"
    assert after[2:] == csv_before.splitlines()[2:]
    assert not page.get("api/state").json["job"]["dirty"]


def test_schedule_edit_with_a_bad_cell_names_the_row(page):
    g = page.get("api/schedule?panel=LP1").json
    col = g["columns"].index("Breaker [A]")
    rows = [list(r) for r in g["rows"]]
    rows[2][col] = "twenty"
    state = page.post("api/schedule", {"panel": "LP1", "columns": g["columns"], "rows": rows}).json
    errors = state["results"]["input_errors"]
    assert errors and errors[0]["kind"] == "panel" and errors[0]["index"] == 0
    assert errors[0]["key"] == "schedule" and errors[0]["row"] == 4
    assert "LP1.csv" in errors[0]["message"] and "'twenty'" in errors[0]["message"]


def test_a_bad_cell_can_be_fixed_in_the_grid_while_the_job_is_not_checked(page):
    """The grid stays readable and editable while its own bad cell keeps the job from
    being checked; the row the error names is marked, and fixing the cell checks again."""
    g = page.get("api/schedule?panel=LP1").json
    col = g["columns"].index("Breaker [A]")
    rows = [list(r) for r in g["rows"]]
    good = rows[2][col]
    rows[2][col] = "twenty"
    state = page.post("api/schedule", {"panel": "LP1", "columns": g["columns"], "rows": rows}).json
    assert not state["results"]["valid"]
    assert state["schedule"]["rows"][2][col] == "twenty"
    again = page.get("api/schedule?panel=LP1")
    assert again.status_code == 200 and again.json["rows"][2][col] == "twenty"
    assert again.json["status"][2] == "fail" and "'twenty'" in again.json["messages"][2]
    assert again.json["status"][0] == ""  # nothing checked: no other row has a status
    rows[2][col] = good
    state = page.post("api/schedule", {"panel": "LP1", "columns": g["columns"], "rows": rows}).json
    assert state["results"]["valid"] and not state["results"]["input_errors"]
    assert state["schedule"]["status"][0] in ("ok", "warn", "fail", "info")
    assert state["schema"]["kinds"]  # a state like every other answer


def test_schedule_of_a_job_whose_file_does_not_read_is_refused(page):
    text = page.get("api/state").json["text"]
    page.edit({"op": "text", "text": text.replace("[source]", "[source", 1)})
    r = page.get("api/schedule?panel=LP1")
    assert r.status_code == 409 and "job file has input errors" in r.json["error"]


def test_schedule_save_to_xlsx_keeps_other_sheets(tmp_path, static_dir):
    from .conftest import copy_sample

    job = copy_sample(tmp_path)
    wb = openpyxl.Workbook()
    ws = wb.active
    for row in (tmp_path / "LP1.csv").read_text(encoding="utf-8").splitlines():
        ws.append([int(c) if c.isdigit() else c for c in row.split(",")])
    wb.create_sheet("notes")["A1"] = "kept"
    wb.save(tmp_path / "LP1.xlsx")
    job.write_text(job.read_text(encoding="utf-8").replace("LP1.csv", "LP1.xlsx"), "utf-8")
    page = make_page(job, static_dir)
    g = page.get("api/schedule?panel=LP1").json
    assert g["file"] == "LP1.xlsx"
    rows = [list(r) for r in g["rows"]]
    rows[0][1] = "Dining lights, revised"
    page.post("api/schedule", {"panel": "LP1", "columns": g["columns"], "rows": rows})
    assert page.post("api/schedule/save", {"panel": "LP1"}).status_code == 200
    back = openpyxl.load_workbook(tmp_path / "LP1.xlsx")
    assert back.worksheets[0]["B2"].value == "Dining lights, revised"
    assert back.worksheets[0]["A2"].value == 1  # numbers stay numbers
    assert back["notes"]["A1"].value == "kept"
    assert page.get("api/state").json["results"]["valid"]


def test_schedule_grid_that_is_not_a_table_is_refused(page):
    for body in (
        {"panel": "LP1", "columns": "x", "rows": []},
        {"panel": "LP1", "columns": ["a"], "rows": [[{"x": 1}]]},
        {"panel": "LP1", "columns": ["a"], "rows": ["abc"]},
    ):
        assert page.post("api/schedule", body).status_code == 400
