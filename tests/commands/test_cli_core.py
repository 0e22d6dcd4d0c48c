"""The core CLI: exit codes, output formats, help text everywhere."""

import json
import re

import click
import pytest
from click.testing import CliRunner

from feedcheck.cli import main


def _run(*args):
    return CliRunner().invoke(main, list(args))


def test_check_sample_json(samples):
    for p in sorted(samples.glob("*.toml")):
        r = _run("check", str(p), "--format", "json")
        assert r.exit_code in (0, 1), r.output
        d = json.loads(r.stdout)
        assert {"job", "nodes", "findings", "counts", "tables"} <= set(d)
        assert d["nodes"][0]["id"] == "source"
        assert all(f["status"] in ("ok", "warn", "fail", "info") for f in d["findings"])


def test_check_text_has_caution_and_nodes(samples):
    r = _run("check", str(samples / "harbor_kitchen.toml"))
    assert "licensed electrician or engineer" in r.stdout
    assert re.search(r"^T1\s+transformer", r.stdout, re.M)


def test_check_csv_has_header(samples):
    r = _run("check", str(samples / "harbor_kitchen.toml"), "--format", "csv")
    assert r.stdout.splitlines()[0] == "subject,check,value,limit,unit,status,rule_id,note"


def test_job_with_a_failure_exits_1(write_job, samples):
    text = (samples / "harbor_kitchen.toml").read_text()
    # a 200 A secondary device is fine, but a 400 A one exceeds 125 % of 208 A → 300 A
    p = write_job(text.replace('secondary_device = "250 A"', 'secondary_device = "400 A"'))
    r = _run("check", str(p), "--format", "json")
    assert r.exit_code == 1
    fails = [f for f in json.loads(r.stdout)["findings"] if f["status"] == "fail"]
    assert any(f["subject"] == "T1" and f["check"] == "secondary device" for f in fails)


def test_invalid_job_exits_2_with_one_line_per_problem(write_job, samples, tmp_path):
    text = (samples / "harbor_kitchen.toml").read_text()
    p = write_job(text.replace('length = "95 ft"', 'length = "95"'))
    out = tmp_path / "out.json"
    r = _run("check", str(p), "--format", "json", "--out", str(out))
    assert r.exit_code == 2
    assert "run[1].length" in r.stderr and "Traceback" not in r.stderr
    assert r.stdout == ""
    assert not out.exists()


def test_missing_file_exits_2(tmp_path):
    r = _run("check", str(tmp_path / "nope.toml"))
    assert r.exit_code == 2 and "readable job file" in r.stderr


def test_out_file_written_atomically(samples, tmp_path):
    out = tmp_path / "r.json"
    r = _run("check", str(samples / "harbor_kitchen.toml"), "--format", "json", "--out", str(out))
    assert r.exit_code in (0, 1)
    assert json.loads(out.read_text())["job"]["name"].startswith("Harbor")
    assert [p.name for p in tmp_path.iterdir()] == ["r.json"]


def test_init_writes_a_template_that_checks(tmp_path):
    p = tmp_path / "new.toml"
    assert _run("init", str(p)).exit_code == 0
    r = _run("check", str(p))
    assert r.exit_code in (0, 1), r.output
    again = _run("init", str(p))
    assert again.exit_code == 2 and "--force" in again.stderr


def test_tables_lists_sources():
    r = _run("tables", "--verify")
    assert r.exit_code == 0, r.stderr
    assert "device_ratings" in r.stdout and "240.6" in r.stdout


def test_calc_rated_current():
    r = _run("calc", "rated-current", "--rating", "75kVA", "--voltage", "208V")
    assert r.exit_code == 0
    assert r.stdout.startswith("208.2 A")  # S/(√3·V), IEEE Std 141-1993 ch. 4


def test_calc_rated_current_bad_unit_exits_2():
    r = _run("calc", "rated-current", "--rating", "75kg", "--voltage", "208V")
    assert r.exit_code == 2 and "expected an apparent power" in r.stderr


def test_calc_regulation():
    r = _run(
        "calc",
        "regulation",
        "--impedance",
        "5.1%",
        "--x-r",
        "3.5",
        "--load",
        "60kVA",
        "--rating",
        "75kVA",
        "--pf",
        "0.9",
    )
    assert r.exit_code == 0 and "exact:" in r.stdout and "approximate:" in r.stdout


def test_calc_regulation_needs_both_load_and_rating():
    r = _run("calc", "regulation", "--impedance", "5.1%", "--x-r", "3.5", "--load", "60kVA")
    assert r.exit_code == 2


def _all_commands(group, prefix=()):
    for name, cmd in group.commands.items():
        yield (*prefix, name), cmd
        if isinstance(cmd, click.Group):
            yield from _all_commands(cmd, (*prefix, name))


@pytest.mark.parametrize(
    ("path", "cmd"),
    list(_all_commands(main)),
    ids=lambda x: " ".join(x) if isinstance(x, tuple) else "",
)
def test_every_command_has_help_with_caution(path, cmd):
    assert cmd.help, path
    r = _run(*path, "--help")
    assert r.exit_code == 0
    assert "licensed electrician or engineer" in r.stdout


QUICK_COMMANDS = [
    ["calc", "rated-current", "--rating", "75kVA", "--voltage", "208V"],
    # the three that read tables (the rule book) must read them without pandas too
    ["calc", "fault", "--rating", "75kVA", "--primary", "480 V delta",
     "--secondary", "208Y/120 V", "--impedance", "5.1%"],
    ["calc", "ampacity", "--size", "3/0 AWG", "--material", "cu", "--insulation", "90degC",
     "--ambient", "40degC", "--current-carrying", "6", "--termination", "75degC"],
    ["calc", "voltage-drop", "--current", "150A", "--length", "200 ft", "--size", "3/0 AWG",
     "--material", "cu", "--raceway", "steel", "--system", "208Y/120 V"],
]  # fmt: skip


@pytest.mark.parametrize("args", QUICK_COMMANDS, ids=[a[1] for a in QUICK_COMMANDS])
def test_quick_figures_do_not_import_pandas_or_reportlab(args):
    """The quick `calc` commands must start fast: no pandas or reportlab on their path."""
    import subprocess
    import sys

    code = (
        "import sys; from click.testing import CliRunner; from feedcheck.cli import main; "
        f"r = CliRunner().invoke(main, {args!r}); assert r.exit_code == 0, r.output; "
        "print(sorted(m for m in ('pandas', 'reportlab') if m in sys.modules))"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True)
    assert out.returncode == 0, out.stderr
    assert out.stdout.strip() == "[]"


def test_internal_error_is_reported_without_traceback(monkeypatch, samples):
    import feedcheck.runner

    def boom(path, calc_date=None):
        raise ZeroDivisionError("simulated fault")

    monkeypatch.setattr(feedcheck.runner, "load_and_check", boom)  # check reads job + results
    r = _run("check", str(samples / "harbor_kitchen.toml"))
    assert r.exit_code == 3
    assert "internal error: ZeroDivisionError: simulated fault" in r.stderr
    assert "Traceback" not in r.stderr
