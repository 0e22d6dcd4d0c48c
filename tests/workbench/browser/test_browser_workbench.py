"""The workbench page in headless Chromium, against the real server on a copy of the
sample jobs (see conftest.py). The oracle of every figure and message is the CLI itself
(`feedcheck check` on the same file); the page must show what it says, unchanged."""

from __future__ import annotations

import json
import re
import subprocess
import sys
from pathlib import Path

import pytest

pytestmark = pytest.mark.browser

try:
    from playwright.sync_api import expect
except ImportError:  # the browser fixture says why the tests do not run
    expect = None


# The scenario's own voltage-drop requirement (appended to the temporary copy only):
# drops held as failures against 3 % feeder / 5 % total, the job's stated limits.
DROP_AS_REQUIREMENT = (
    '\n[options]\nvoltage_drop = "mandatory"\nfeeder_drop = "3 %"\ntotal_drop = "5 %"\n'
)


def cli(*args: str) -> subprocess.CompletedProcess:
    return subprocess.run(
        [sys.executable, "-c", "from feedcheck.cli import main; main()", *args],
        capture_output=True,
        text=True,
    )


def shot(page, shots: Path, name: str) -> None:
    page.screenshot(path=str(shots / f"{name}.png"))


def notice_says(page, text: str) -> None:
    """The message at the bottom is shown (not merely left over, hidden) and says text."""
    expect(page.locator("#notice")).to_be_visible()
    expect(page.locator("#notice")).to_contain_text(text)


def open_element(page, kind: str, element_id: str) -> None:
    page.click(f"#elements .nav-item[data-kind='{kind}']:has-text('{element_id}')")
    expect(page.locator("#form-title")).to_contain_text(element_id)


def test_sample_job_opens_with_diagram_findings_and_caution(open_page, shots):
    page, bench = open_page()
    checked = json.loads(cli("check", str(bench.job), "--format", "json").stdout)
    counts = checked["counts"]
    expect(page.locator("#job-name")).to_have_text("harbor_kitchen.toml")
    expect(page.locator("#caution")).to_contain_text("licensed electrician or engineer")
    for node in checked["nodes"]:
        expect(page.locator(f"svg.feed [data-node='{node['id']}']")).to_be_visible()
    expect(page.locator("#status-line")).to_contain_text(
        f"{counts['fail']} fail · {counts['warn']} warn · {counts['info']} info · {counts['ok']} ok"
    )
    # failures first, then warnings, then notes: passing checks only on demand
    shown = page.locator("#finding-list .finding")
    expect(shown).to_have_count(counts["fail"] + counts["warn"] + counts["info"])
    statuses = [c.split("st-")[1] for c in shown.evaluate_all("els => els.map(e => e.className)")]
    order = {"fail": 0, "warn": 1, "info": 2}
    assert statuses == sorted(statuses, key=order.__getitem__)
    page.click("#toggle-ok")
    expect(shown).to_have_count(sum(counts.values()))
    # every status is a word as well as a colour
    for badge in page.locator("#finding-list .badge").all()[:10]:
        assert badge.inner_text().strip().lower() in {"fail", "warn", "info", "ok"}
    shot(page, shots, "01_opened")


def test_clicking_a_diagram_node_opens_its_form(open_page, shots):
    page, _ = open_page()
    page.click("svg.feed [data-node='LP1']")
    expect(page.locator("#form-title")).to_contain_text("LP1")
    expect(page.locator("#editor input[data-key='rating']")).to_have_value("225 A")
    page.click("svg.feed .via[data-run='F-EQ1']")
    expect(page.locator("#form-title")).to_contain_text("F-EQ1")
    expect(page.locator("#editor input[data-key='length']")).to_have_value("140 ft")
    page.click("svg.feed [data-node='T1']")
    expect(page.locator("#editor input[data-key='rating']")).to_have_value("75 kVA")
    shot(page, shots, "02_node_form")


def test_longer_run_shows_a_failure_and_the_finding_leads_to_the_field(jobs, open_page, shots):
    job = jobs / "harbor_kitchen.toml"
    job.write_text(job.read_text(encoding="utf-8") + DROP_AS_REQUIREMENT, encoding="utf-8")
    page, _ = open_page()
    expect(page.locator("#status-line")).to_contain_text("0 fail")
    page.click("svg.feed .via[data-run='F-EQ1']")
    edits = []
    page.on("request", lambda r: edits.append(r) if r.url.endswith("/api/edit") else None)
    field = page.locator("#editor input[data-key='length']")
    field.fill("")
    field.press_sequentially("400 ft", delay=40)  # typed, not committed: no Enter, no Tab
    failure = page.locator("#finding-list .finding.st-fail", has_text="F-EQ1").filter(
        has_text="feeder voltage drop"
    )
    expect(failure).to_be_visible()
    # the same words as the terminal's line for that finding
    job_after = jobs / "check_copy.toml"
    job_after.write_text(
        job.read_text(encoding="utf-8").replace('"140 ft"', '"400 ft"'), encoding="utf-8"
    )
    terminal = cli("check", str(job_after)).stdout
    line = next(x for x in terminal.splitlines() if x.startswith("FAIL") and "F-EQ1" in x)
    head = line.split("F-EQ1", 1)[1].split("[", 1)[0].strip()
    expect(failure.locator(".message")).to_have_text(head)
    expect(page.locator("svg.feed [data-node='EQ1']")).to_have_class(re.compile(r"\bst-fail\b"))
    expect(page.locator("svg.feed [data-node='EQ1'] .node-status")).to_have_text("FAIL")
    expect(page.locator("#status-line")).not_to_contain_text("0 fail")
    # debounced: the keystrokes went out as fewer requests than characters typed
    assert 1 <= len(edits) < len("400 ft")
    shot(page, shots, "03_failure")
    page.click("#elements .nav-item[data-kind='project']")  # away from the run's form
    failure.click()
    length = page.locator("#editor input[data-key='length']")
    expect(page.locator("#form-title")).to_contain_text("F-EQ1")
    expect(length).to_be_focused()
    expect(length).to_have_value("400 ft")
    shot(page, shots, "04_landed_on_field")


def test_input_error_shows_the_cli_message_under_the_field(jobs, open_page, shots):
    page, _ = open_page()
    open_element(page, "run", "F-LP1")
    page.fill("#editor input[data-key='length']", "95 furlongs")
    bad = jobs / "harbor_kitchen.toml"
    copy = jobs / "bad_copy.toml"
    copy.write_text(
        bad.read_text(encoding="utf-8").replace('"95 ft"', '"95 furlongs"'), encoding="utf-8"
    )
    result = cli("check", str(copy))
    assert result.returncode == 2
    message = result.stderr.splitlines()[0].replace(str(copy), str(bad))
    under = page.locator("#editor .field[data-key='length'] .field-error")
    expect(under).to_have_text(message)
    expect(page.locator("#status-line")).to_contain_text("input error")
    expect(page.locator("#input-errors .finding")).to_have_count(1)
    shot(page, shots, "05_input_error")
    page.fill("#editor input[data-key='length']", "95 ft")
    expect(under).to_be_hidden()
    expect(page.locator("#finding-list")).to_be_visible()


def test_pasting_three_rows_into_a_schedule_checks_each_row(jobs, open_page, shots):
    page, _ = open_page()
    open_element(page, "panel", "LP1")
    grid = page.locator("#schedule table.grid tbody tr")
    expect(grid.first).to_be_visible()
    before = grid.count()
    page.click("#schedule button:has-text('Add row')")
    rows = [
        "19\tPatio lights\t1\tlighting\tyes\t800\t0.95\t20\t12 AWG Cu\t90\t120\t12 AWG Cu",
        "21\tIce machine\t1\treceptacle\tno\t1200\t1\t20\t12 AWG Cu\t90\t40\t12 AWG Cu",
        "23\tCoffee brewer\t1\treceptacle\tno\t2400\t1\t15\t14 AWG Cu\t90\t30\t14 AWG Cu",
    ]
    first_cell = page.locator(f"#schedule input[data-row='{before}'][data-col='0']")
    expect(first_cell).to_be_focused()
    paste(page, first_cell, "\r\n".join(rows) + "\r\n")
    expect(grid).to_have_count(before + 3)
    expect(page.locator(f"#schedule input[data-row='{before + 2}'][data-col='1']")).to_have_value(
        "Coffee brewer"
    )
    # each pasted row carries its checked status, by word and colour
    for r in range(before, before + 3):
        expect(grid.nth(r).locator(".status-cell .badge")).to_be_visible()
    expect(grid.nth(before + 2).locator(".status-cell .badge")).to_have_text("fail")
    expect(grid.nth(before).locator(".status-cell .badge")).not_to_have_text("fail")
    expect(page.locator("#finding-list .finding.st-fail", has_text="LP1/23").first).to_be_visible()
    shot(page, shots, "06_pasted_schedule")
    # a circuit's finding leads to its row of the grid
    page.click("#elements .nav-item[data-kind='project']")
    page.locator("#finding-list .finding.st-fail", has_text="LP1/23").first.click()
    expect(page.locator(f"#schedule input[data-row='{before + 2}'][data-col='0']")).to_be_focused()
    page.click("#btn-save")
    notice_says(page, "LP1.csv")
    saved = (jobs / "LP1.csv").read_text(encoding="utf-8")
    assert "Coffee brewer" in saved and "Patio lights" in saved and "Ice machine" in saved
    # a cell typed just before Save is in the file (the grid's quiet time is not waited)
    page.click("#notice button:has-text('dismiss')")
    expect(page.locator("#notice")).to_be_hidden()
    page.fill(f"#schedule input[data-row='{before}'][data-col='1']", "Patio and path lights")
    page.keyboard.press("Control+s")
    notice_says(page, "LP1.csv")
    assert "Patio and path lights" in (jobs / "LP1.csv").read_text(encoding="utf-8")


def paste(page, target, text: str) -> None:
    """Put tab-separated text on the clipboard, then Ctrl+V into the focused cell."""
    target.focus()
    page.evaluate("text => navigator.clipboard.writeText(text)", text)
    page.keyboard.press("Control+V")


def test_save_writes_the_change_and_keeps_the_comments(jobs, open_page, shots):
    page, bench = open_page()
    original = bench.job.read_text(encoding="utf-8")
    open_element(page, "run", "F-LP1")
    page.fill("#editor input[data-key='length']", "110 ft")
    expect(page.locator("#job-dirty")).to_be_visible()
    page.click("#btn-save")
    notice_says(page, "Saved harbor_kitchen.toml")
    expect(page.locator("#job-dirty")).to_be_hidden()
    saved = bench.job.read_text(encoding="utf-8")
    assert saved == original.replace('length = "95 ft"', 'length = "110 ft"', 1)
    assert "# at the transformer primary terminals" in saved
    shot(page, shots, "07_saved")


def test_write_report_downloads_a_pdf(open_page, shots):
    page, bench = open_page()
    # an unsaved change: the report is written from the saved files, so the page asks
    open_element(page, "project", "Project")
    page.fill("#editor input[data-key='revision']", "C")
    expect(page.locator("#job-dirty")).to_be_visible()
    questions = []
    page.on("dialog", lambda d: (questions.append(d.message), d.accept()))
    with page.expect_download() as download:
        page.click("#btn-report")
    assert len(questions) == 1 and "Save" in questions[0]
    assert 'revision = "C"' in bench.job.read_text(encoding="utf-8")
    pdf = Path(download.value.path()).read_bytes()
    assert pdf.startswith(b"%PDF-")
    assert download.value.suggested_filename == "harbor_kitchen_report.pdf"
    written = bench.folder / "harbor_kitchen_report.pdf"
    assert written.read_bytes() == pdf
    expect(page.locator("#report-link")).to_be_visible()
    shot(page, shots, "08_report")


def test_new_job_from_the_template(open_page, shots):
    page, bench = open_page()
    page.click("#btn-new")
    page.fill("#new-name", "fresh_site.toml")
    shot(page, shots, "09_new_job_dialog")
    page.click("#new-create")
    expect(page.locator("#job-name")).to_have_text("fresh_site.toml")
    assert (bench.folder / "fresh_site.toml").is_file()
    expect(page.locator("svg.feed .node").first).to_be_visible()


def test_requests_without_the_token_are_refused(browser, start):
    bench = start()
    context = browser.new_context()
    page = context.new_page()
    try:
        for path in ("/", "/api/state", "/static/app.js", "/not-the-token/api/state"):
            response = page.goto(bench.origin + path)
            assert response.status == 403, path
            assert "refused" in page.content()
        # the right token is accepted (the refusals above are not a dead server)
        assert page.goto(bench.url).status == 200
        status = page.evaluate(
            "fetch('/api/state').then(r => r.status)",
        )
        assert status == 403
    finally:
        context.close()


def test_two_pages_on_one_job_lose_no_edit(open_page):
    """A second page edits on a revision the first has moved past: the server answers
    409, the page reads the state again and sends the same edit on the new revision."""
    first, bench = open_page()
    second = first.context.new_page()
    second.goto(bench.url)
    second.wait_for_selector("body[data-ready=true]")
    open_element(first, "run", "F-LP1")
    first.fill("#editor input[data-key='length']", "110 ft")
    expect(first.locator("#status-line")).to_contain_text("checked in")
    expect(first.locator("#job-dirty")).to_be_visible()
    answers = []
    second.on("response", lambda r: answers.append(r.status) if "/api/" in r.url else None)
    open_element(second, "project", "Project")
    second.fill("#editor input[data-key='revision']", "D")
    expect(second.locator("#job-dirty")).to_be_visible()
    second.click("#btn-save")
    notice_says(second, "Saved")
    assert 409 in answers
    saved = bench.job.read_text(encoding="utf-8")
    assert 'length = "110 ft"' in saved and 'revision = "D"' in saved
    second.close()


def test_typing_keeps_the_field_while_answers_arrive(open_page):
    """Answers to earlier keystrokes redraw findings and diagram, never the field being
    typed in: focus and text stay, even when the typed key is the element's id."""
    page, _ = open_page()
    open_element(page, "run", "F-LP1")
    field = page.locator("#editor input[data-key='id']")
    field.click()
    field.press("End")
    answers = []
    page.on("response", lambda r: answers.append(r) if r.url.endswith("/api/edit") else None)
    field.press_sequentially("AB", delay=600)  # slower than the page's 350 ms quiet time
    expect(page.locator("#form-title")).to_contain_text("F-LP1AB")
    assert len(answers) >= 2  # each keystroke was answered while typing went on
    expect(field).to_be_focused()
    expect(field).to_have_value("F-LP1AB")
    expect(page.locator("svg.feed .via[data-run='F-LP1AB']")).to_be_visible()


def test_a_bad_cell_typed_in_the_grid_can_be_fixed_there(open_page):
    page, _ = open_page()
    open_element(page, "panel", "LP1")
    cell = page.locator("#schedule input[data-row='2'][data-col='5']")
    cell.fill("abc")
    expect(page.locator("#input-errors .finding")).to_have_count(1)
    cell.fill("1440")
    expect(page.locator("#finding-list")).to_be_visible(timeout=3000)
    expect(page.locator("#status-line")).to_contain_text("0 fail")


def test_adding_a_motor_names_what_it_needs_and_removing_it_restores_the_job(open_page):
    page, bench = open_page()
    before = page.locator("#status-line").inner_text().split(" · checked")[0]
    page.click("#elements [data-add-kind='motor']")
    expect(page.locator("#form-title")).to_contain_text("Motors")
    # the new motor's missing keys are named under their fields, as the CLI names them
    expect(page.locator("#editor .field.has-error").first).to_be_visible()
    expect(page.locator("#status-line")).to_contain_text("input error")
    first_error = page.locator("#editor .field.has-error .field-error").first.inner_text()
    assert first_error.startswith(f"error: {bench.job}:")
    page.on("dialog", lambda d: d.accept())
    page.click("#editor button:has-text('Remove')")
    expect(page.locator("#elements .nav-item[data-kind='motor']")).to_have_count(0)
    expect(page.locator("#status-line")).to_contain_text(before)


def test_the_job_file_text_is_checked_as_it_is_typed(open_page):
    page, bench = open_page()
    page.click("#elements .nav-text")
    area = page.locator("#job-text")
    text = area.input_value()
    assert text == bench.job.read_text(encoding="utf-8")  # comments included
    area.fill(text.replace('length = "95 ft"', 'length = "110 ft"', 1))
    lp1 = page.locator("svg.feed [data-node='LP1']")
    expect(lp1.locator(".fig-value").last).to_have_text("110 ft")
    area.fill(text.replace("[source]", "[source", 1))
    expect(page.locator("#input-errors .finding")).to_have_count(1)
    page.click("#input-errors .finding-body")  # names a line only: that line is selected
    selected = area.evaluate("a => a.value.slice(a.selectionStart, a.selectionEnd)")
    assert selected == "[source"


def test_clipboard_text_is_split_as_spreadsheets_write_it(open_page):
    """Tab-separated clipboard text as spreadsheet programs write it (common practice, no
    source): tabs between cells, CR LF or LF between rows, a cell holding a tab, a line
    break or a quote is quoted, a quote inside doubled."""
    page, _ = open_page()
    split = page.evaluate(
        """async text => (await import('./static/schedule.js')).parseTabText(text)""",
        'a\t"b\tc"\r\n"x ""y"""\t\n"two\nlines"\tz\n',
    )
    assert split == [["a", "b\tc"], ['x "y"', ""], ["two\nlines", "z"]]


def test_motors_and_the_standby_source_are_drawn_and_open_their_forms(open_page):
    page, _ = open_page("willow_yard_standby.toml")
    for node_id, title in (("AC-1", "AC-1"), ("ATS-1", "Transfer switch"), ("GEN-1", "Generator")):
        node = page.locator(f"svg.feed [data-node='{node_id}']")
        expect(node).to_be_visible()
        node.locator(".node-box").click()
        expect(page.locator("#form-title")).to_contain_text(title)
