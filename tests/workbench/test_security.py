"""Each rule of the workbench's guard (feedcheck/workbench/security.py), one test each."""

from __future__ import annotations

import json

import pytest

from .conftest import BASE, PORT, TOKEN, copy_sample, make_page


def test_no_token_is_refused(page):
    for path in ("/", "/api/state", "/static/app.js", f"/api/state?t={TOKEN}"):
        r = page.client.get(path, base_url=BASE)
        assert r.status_code == 403
        assert r.get_data(as_text=True).startswith("refused:")


def test_wrong_token_is_refused(page):
    for token in (TOKEN[:-1] + "x", TOKEN + "x", TOKEN.upper(), ""):
        r = page.client.get(f"/{token}/api/state", base_url=BASE)
        assert r.status_code == 403, token
    assert page.get("api/state").status_code == 200  # the right one passes


@pytest.mark.parametrize(
    "host",
    [
        "evil.example:48123",
        "127.0.0.1",
        "localhost",
        "127.0.0.1:1",
        "127.0.0.2:48123",
        "0.0.0.0:48123",
        "[::1]:48123",
    ],
)
def test_wrong_host_header_is_refused(page, host):
    """A page of another site whose name points at 127.0.0.1 (DNS rebinding) sends its
    own name in Host."""
    r = page.client.get(f"/{TOKEN}/api/state", base_url=BASE, headers={"Host": host})
    assert r.status_code == 403
    assert "Host" in r.get_data(as_text=True)


def test_localhost_host_header_is_accepted(page):
    r = page.client.get(f"/{TOKEN}/api/state", base_url=f"http://localhost:{PORT}")
    assert r.status_code == 200


def test_foreign_origin_on_post_is_refused(page):
    for origin in ("http://evil.example", f"http://127.0.0.1:{PORT + 1}", "null"):
        r = page.post("api/ping", headers={"Origin": origin})
        assert r.status_code == 403, origin
        assert r.json["error"].startswith("refused")
    assert page.post("api/ping", headers={"Origin": f"http://localhost:{PORT}"}).status_code == 200
    assert page.post("api/ping").status_code == 200  # no Origin: a same-origin fetch


def test_foreign_origin_cannot_save(page, job):
    before = job.read_bytes()
    page.edit({"op": "set", "kind": "run", "index": 0, "key": "length", "value": "9 ft"})
    r = page.post("api/save", headers={"Origin": "http://evil.example"})
    assert r.status_code == 403
    assert job.read_bytes() == before


@pytest.mark.parametrize(
    "content_type", ["text/plain", "application/x-www-form-urlencoded", "multipart/form-data", None]
)
def test_post_not_json_is_refused(page, content_type):
    """A form post from another page (no preflight) cannot reach the API."""
    headers = {"Content-Type": content_type} if content_type else {}
    r = page.client.post(f"/{TOKEN}/api/save", base_url=BASE, data=b"{}", headers=headers)
    assert r.status_code == 415


def test_oversize_body_is_refused(page):
    big = {"rev": 0, "edits": [{"op": "text", "text": "#" * 2_100_000}]}
    r = page.post("api/edit", big)
    assert r.status_code == 413
    assert page.get("api/state").json["rev"] == 0


@pytest.mark.parametrize("body", [b"[1, 2]", b"not json", b'"text"', b"\xff\xfe"])
def test_body_not_a_json_object_is_refused(page, body):
    r = page.client.post(
        f"/{TOKEN}/api/edit", base_url=BASE, data=body, content_type="application/json"
    )
    assert r.status_code == 400
    assert "error" in r.json


def test_other_methods_are_refused(page):
    for method in ("PUT", "DELETE", "PATCH"):
        r = page.client.open(f"/{TOKEN}/api/state", base_url=BASE, method=method)
        assert r.status_code == 405


def test_every_response_carries_the_security_headers(page):
    responses = [
        page.get(""),
        page.get("static/app.js"),
        page.get("api/state"),
        page.get("static/nothing.js"),
        page.client.get("/", base_url=BASE),
        page.post("api/ping", headers={"Origin": "http://evil.example"}),
    ]
    for r in responses:
        assert r.headers["Cache-Control"] == "no-store"
        assert r.headers["X-Content-Type-Options"] == "nosniff"
        csp = r.headers["Content-Security-Policy"]
        assert "script-src 'self'" in csp and "frame-ancestors 'none'" in csp
        assert "unsafe-inline" not in csp


@pytest.mark.parametrize(
    "name",
    [
        "../harbor_kitchen.toml",
        "..%2Fharbor_kitchen.toml",
        "%2e%2e/%2e%2e/etc/passwd",
        "/etc/passwd",
        "harbor_kitchen.toml",
        "LP1.csv",
        "conftest.py",
        ".",
        "sub/app.js",
    ],
)
def test_static_serves_only_the_listed_page_files(page, name):
    r = page.get(f"static/{name}")
    assert r.status_code == 404
    assert page.get("static/app.js").status_code == 200


def test_static_list_is_made_once_at_start(page, static_dir):
    (static_dir / "late.js").write_text("// added after start\n", encoding="utf-8")
    assert page.get("static/late.js").status_code == 404


@pytest.mark.parametrize(
    "name",
    [
        "../harbor_kitchen.toml",
        "harbor_kitchen.toml",
        "LP1.csv",
        "/etc/passwd",
        "..%2F..%2Fetc%2Fpasswd",
        "harbor_kitchen_report.pdf",
    ],
)
def test_download_serves_only_files_this_session_wrote(page, name):
    r = page.get(f"api/download/{name}")
    assert r.status_code == 404
    assert "error" in r.json


@pytest.mark.parametrize(
    "name",
    [
        "../escape.toml",
        "/tmp/escape.toml",
        "sub/x.toml",
        "..\\x.toml",
        "x.toml/",
        "x.txt",
        ".toml",
        "x\x00.toml",
        "",
        None,
        5,
        "harbor_kitchen.toml",
    ],
)
def test_new_job_name_stays_in_the_folder(page, job, name):
    before = sorted(p.name for p in job.parent.iterdir())
    r = page.post("api/new", {"name": name})
    assert r.status_code in (400, 409)
    assert sorted(p.name for p in job.parent.iterdir()) == before
    assert not (job.parent.parent / "escape.toml").exists()


def test_new_job_through_a_link_out_of_the_folder_is_refused(page, job, tmp_path_factory):
    outside = tmp_path_factory.mktemp("outside")
    (job.parent / "link.toml").symlink_to(outside / "target.toml")
    r = page.post("api/new", {"name": "link.toml"})
    assert r.status_code in (400, 409)
    assert not (outside / "target.toml").exists()


def test_schedule_of_a_panel_not_in_the_job_is_refused(page):
    assert page.get("api/schedule?panel=../../etc/passwd").status_code == 404
    r = page.post("api/schedule/save", {"panel": "../LP1"})
    assert r.status_code == 404


HOSTILE = """\
[project]
name = "<script>alert(1)</script>"
site = "__import__('os').system('touch {marker}')"
prepared_by = "{{{{7*7}}}} $(touch {marker}) `touch {marker}`"
"""


def test_the_jobs_values_are_never_executed(tmp_path, static_dir):
    """Values that would run if anything evaluated them come back as text, and nothing
    runs: no marker file appears; the page's policy refuses inline scripts."""
    job = copy_sample(tmp_path)
    marker = tmp_path / "ran"
    text = job.read_text(encoding="utf-8").split("[source]")[1]
    job.write_text(HOSTILE.format(marker=marker) + "\n[source]" + text, encoding="utf-8")
    page = make_page(job, static_dir)
    state = page.get("api/state").json
    project = next(e for e in state["elements"] if e["kind"] == "project")
    assert project["values"]["name"] == "<script>alert(1)</script>"
    assert "__import__" in project["values"]["site"]
    assert state["results"]["valid"]
    r = page.edit(
        {
            "op": "set",
            "kind": "project",
            "index": 0,
            "key": "notes",
            "value": f"__import__('os').system('touch {marker}')",
        }
    )
    assert r.status_code == 200
    page.post("api/save")
    assert not marker.exists()
    assert "script-src 'self'" in page.get("").headers["Content-Security-Policy"]


def test_schedule_cells_that_look_like_formulas_are_saved_as_text(tmp_path, static_dir):
    """An XLSX schedule saved from the grid never holds a formula."""
    import openpyxl

    job = copy_sample(tmp_path)
    wb = openpyxl.Workbook()
    ws = wb.active
    for row in (tmp_path / "LP1.csv").read_text(encoding="utf-8").splitlines():
        ws.append(row.split(","))
    wb.save(tmp_path / "LP1.xlsx")
    job.write_text(job.read_text(encoding="utf-8").replace("LP1.csv", "LP1.xlsx"), "utf-8")
    page = make_page(job, static_dir)
    grid = page.get("api/schedule?panel=LP1").json
    rows = grid["rows"]
    rows[0][1] = '=HYPERLINK("http://evil.example","x")'
    assert (
        page.post(
            "api/schedule", {"panel": "LP1", "columns": grid["columns"], "rows": rows}
        ).status_code
        == 200
    )
    assert page.post("api/schedule/save", {"panel": "LP1"}).status_code == 200
    cell = openpyxl.load_workbook(tmp_path / "LP1.xlsx").worksheets[0]["B2"]
    assert cell.data_type == "s"
    assert cell.value.startswith("=HYPERLINK")


def test_json_error_bodies_for_the_api(page):
    r = page.get("api/nothing")
    assert r.status_code == 404
    assert json.loads(r.get_data(as_text=True))["error"]
