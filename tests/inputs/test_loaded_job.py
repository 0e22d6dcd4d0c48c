"""What read_job hands on: defaults filled (the typical X/R, flagged) and the feed tree,
built once, carried by the job."""

import shutil

import pytest

from feedcheck.inputs.job_file import read_job
from feedcheck.tables import load_table, set_user_tables_dir, shipped_tables_dir

from .test_job import GOOD


def _typical_row(rating_kva: float) -> float:
    # the rule the README states: the rating's row, else the next listed rating above it
    # (the higher X/R, conservative for the maximum fault; issue 12)
    t = load_table("transformer_xr").data
    return float(t[t["rating_kva"] >= rating_kva]["x_r"].iloc[0])


def test_missing_x_r_is_filled_from_the_typical_table_and_flagged(write_job):
    (t,) = read_job(write_job(GOOD)).transformers
    assert t.x_r == _typical_row(75.0)
    assert t.x_r_typical and t.x_r_typical_row == "75 kVA row"


def test_rating_between_rows_takes_the_next_row_above(write_job):
    (t,) = read_job(write_job(GOOD.replace('rating = "75 kVA"', 'rating = "80 kVA"'))).transformers
    assert t.x_r == _typical_row(80.0) == _typical_row(100.0) > _typical_row(75.0)
    assert t.x_r_typical_row.startswith("100 kVA row, the next listed rating")


def test_given_x_r_is_kept_and_not_flagged(write_job):
    text = GOOD.replace('impedance = "5 %"', 'impedance = "5 %"\nx_r = 3.5')
    (t,) = read_job(write_job(text)).transformers
    assert t.x_r == 3.5 and not t.x_r_typical and t.x_r_typical_row == ""


def test_filled_x_r_follows_the_users_tables(write_job, tmp_path):
    d = tmp_path / "mine"
    d.mkdir()
    shutil.copy(shipped_tables_dir() / "transformer_xr.csv", d / "transformer_xr.csv")
    p = d / "transformer_xr.csv"
    p.write_text(p.read_text().replace("75,2.0", "75,2.2"))
    set_user_tables_dir(d)
    (t,) = read_job(write_job(GOOD)).transformers
    assert t.x_r == 2.2


def test_job_carries_its_tree(write_job):
    job = read_job(write_job(GOOD))
    tree = job.tree
    assert tree.order == ("source", "T1", "P1")
    assert tree.kind == {"source": "source", "T1": "transformer", "P1": "panel"}
    assert tree.parent_node["P1"] == "T1" and tree.parent_run["P1"] is job.runs[0]
    assert tree.voltage_of["P1"].text == "208Y/120 V"
    assert tree.distance_m["P1"] == pytest.approx(15.24)  # 50 ft × 0.3048 m/ft


def test_the_checks_use_the_jobs_tree(write_job, monkeypatch):
    """The tree is built once, by the reader: checking the job builds no other."""
    from feedcheck.checks import check_job
    from feedcheck.model import Tree

    job = read_job(write_job(GOOD))

    def refuse(*a, **k):
        raise AssertionError("the tree was built again")

    monkeypatch.setattr(Tree, "__init__", refuse)
    results = check_job(job)
    assert [n.id for n in results.nodes] == list(job.tree.order)
