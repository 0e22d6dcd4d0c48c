"""The job's schedules checked in one frame equal each schedule checked on its own
(identity between two ways of the same computation, on invented data)."""

import numpy as np
import pandas as pd

from feedcheck.checks.schedules import check_schedule, schedule_demand
from feedcheck.inputs.job_file import read_job
from feedcheck.rulebook import current_rulebook
from feedcheck.runner import _read_job_schedules, check_job_with_schedules
from tests.bench.bench_building import job_text


def test_one_frame_equals_panel_by_panel(tmp_path):
    (tmp_path / "job.toml").write_text(job_text(12, tmp_path), encoding="utf-8")
    # the generated building passes: give two panels a 60 A breaker on 12 AWG (240.4(D)
    # fails it) so that the comparison covers failing circuits too
    for name in ("P0003.csv", "P0007.csv"):
        f = tmp_path / name
        text = f.read_text(encoding="utf-8")
        assert ",20,12 AWG Cu," in text
        f.write_text(text.replace(",20,12 AWG Cu,", ",60,12 AWG Cu,", 1), encoding="utf-8")
    job = read_job(tmp_path / "job.toml")
    schedules = _read_job_schedules(job)
    res = check_job_with_schedules(job, schedules, "2026-12-01")
    book = current_rulebook()
    from feedcheck.checks.drop_rules import job_drop_limits

    limits = job_drop_limits(job, book)
    drops = {n.id: float(n.values.get("conductor_vdrop_pct", 0.0) or 0.0) for n in res.nodes}
    assert list(res.schedules) == list(schedules) and len(schedules) == 12
    for p in job.panels:
        v = job.tree.voltage_of[p.id]
        alone = check_schedule(
            schedules[p.id],
            v,
            feeder_drop_pct=drops[p.id],
            occupancy=p.occupancy,
            bus_a=p.rating_a,
            main_a=p.main_device_a,
            limits=limits,
            demand=schedule_demand(schedules[p.id], v, p.occupancy, book),
            rules=book,
        )
        got = res.schedules[p.id]
        pd.testing.assert_frame_equal(got.circuits, alone.circuits, check_exact=True)
        pd.testing.assert_frame_equal(got.panels, alone.panels, check_exact=True)
        assert got.totals == alone.totals
        assert got.exit_code == alone.exit_code
        assert got.findings == alone.findings
        assert (got.path, got.system, got.demand, got.demands) == (
            alone.path,
            alone.system,
            alone.demand,
            alone.demands,
        )
    # the failing circuits of the invented data make the comparison bite
    assert any(f.status == "fail" for r in res.schedules.values() for f in r.findings)


def test_schedule_command_files_in_one_frame_equal_each_alone(tmp_path):
    # feedcheck schedule: alike one-panel files checked together (check_files) give what
    # check_schedule gives each file alone, totals' number types included
    from feedcheck.checks.schedule_batch import check_files
    from feedcheck.inputs.schedule_file import read_schedule
    from feedcheck.units import parse_voltage_system

    job_text(12, tmp_path)  # writes twelve invented one-panel schedules
    scheds = [read_schedule(p) for p in sorted(tmp_path.glob("*.csv"))]
    system, book = parse_voltage_system("208Y/120 V"), current_rulebook()
    got = check_files([(s, system) for s in scheds], 1.5, "other", 100.0, 100.0, book)
    assert len(got) == 12
    for s, g in zip(scheds, got, strict=True):
        alone = check_schedule(s, system, 1.5, "other", 100.0, 100.0, rules=book)
        pd.testing.assert_frame_equal(g.circuits, alone.circuits, check_exact=True)
        pd.testing.assert_frame_equal(g.panels, alone.panels, check_exact=True)
        assert [(k, type(v)) for k, v in g.totals.items()] == [
            (k, type(v)) for k, v in alone.totals.items()
        ]
        assert g.totals == alone.totals and g.exit_code == alone.exit_code
        assert [f.as_dict() for f in g.findings] == [f.as_dict() for f in alone.findings]


def test_stacked_frames_equal_pandas_concat(tmp_path):
    # identity between two ways of joining the same frames (no published value)
    from feedcheck.checks.schedule_batch import _stacked

    (tmp_path / "job.toml").write_text(job_text(12, tmp_path), encoding="utf-8")
    job = read_job(tmp_path / "job.toml")
    frames = [s.circuits for s in _read_job_schedules(job).values()]
    got = _stacked(frames)
    want = pd.concat(frames, ignore_index=True)
    pd.testing.assert_frame_equal(got, want, check_exact=True)
    assert list(got.dtypes) == list(want.dtypes) and type(got.index) is type(want.index)
    # a frame whose column differs in type is left to pandas (it would upcast)
    odd = frames[1].assign(circuit=frames[1]["circuit"].astype(float))
    assert _stacked([frames[0], odd]) is None
    assert _stacked([frames[0], frames[1].iloc[::-1]]) is None  # not a default index


def test_circuit_column_before_the_cut_equals_the_cut_frame(tmp_path):
    # identity between two ways of reading the same column (no published value): a
    # column read from the group's frame (not cut yet) equals the cut frame's column
    from feedcheck.checks.schedule_batch import check_files
    from feedcheck.inputs.schedule_file import read_schedule
    from feedcheck.units import parse_voltage_system

    job_text(5, tmp_path)
    scheds = [read_schedule(p) for p in sorted(tmp_path.glob("*.csv"))]
    system, book = parse_voltage_system("208Y/120 V"), current_rulebook()
    got = check_files([(s, system) for s in scheds], 1.5, "other", 100.0, 100.0, book)
    names = ("status", "panel", "circuit", "reason")
    before = [{k: g.column("circuits", k) for k in names} for g in got]
    assert all(g.__dict__["_circuits"].rows is not None for g in got)  # the fast path
    for g, cols in zip(got, before, strict=True):
        for k in names:
            want = g.circuits[k].to_numpy()  # cuts the frame
            assert cols[k].dtype == want.dtype and cols[k].tolist() == want.tolist()
            np.testing.assert_array_equal(g.column("circuits", k), want)  # after the cut
    assert {g.column("circuits", "panel")[0] for g in got} == {s.panels[0] for s in scheds}
    for g in got:  # the panel table likewise
        panel = g.column("panels", "panel")
        assert g.__dict__["_panels"].rows is not None
        assert panel.tolist() == g.panels["panel"].tolist() == [g.totals["panel"]]


def _checked_equal(got, want) -> None:
    for g, w in zip(got, want, strict=True):
        pd.testing.assert_frame_equal(g.circuits, w.circuits, check_exact=True)
        pd.testing.assert_frame_equal(g.panels, w.panels, check_exact=True)
        pd.testing.assert_frame_equal(g.review, w.review, check_exact=True)
        assert g.totals == w.totals and g.exit_code == w.exit_code
        assert [f.as_dict() for f in g.findings] == [f.as_dict() for f in w.findings]


def test_reader_frame_taken_whole_equals_the_pieces_joined(tmp_path):
    # identity between two ways of joining the same frames (no published value): files
    # read together are rows of one frame, taken as they are instead of joined again
    from feedcheck.checks.schedule_batch import _join, check_files
    from feedcheck.inputs.schedule_alike import CUT, cut_from, read_schedule_files
    from feedcheck.units import parse_voltage_system

    job_text(7, tmp_path)
    scheds = read_schedule_files(sorted(tmp_path.glob("*.csv")))
    frames = [s.circuits for s in scheds]
    _frame, a, b = cut_from(scheds)  # the fast path is taken
    assert (a, b) == (0, sum(len(f) for f in frames))
    want = pd.concat(frames, ignore_index=True)
    pd.testing.assert_frame_equal(_join(scheds).circuits, want, check_exact=True)
    assert cut_from(scheds[2:5])[1:] == (len(pd.concat(frames[:2])), len(pd.concat(frames[:5])))
    pd.testing.assert_frame_equal(
        _join(scheds[2:5]).circuits, pd.concat(frames[2:5], ignore_index=True), check_exact=True
    )
    assert cut_from([scheds[1], scheds[0]]) is None  # not in order: joined
    assert cut_from([scheds[0], scheds[2]]) is None  # not consecutive: joined
    system, book = parse_voltage_system("208Y/120 V"), current_rulebook()
    fast = check_files([(s, system) for s in scheds], 1.5, "other", 100.0, 100.0, book)
    for s in scheds:  # the same schedules without the note: pieces joined
        object.__delattr__(s, CUT)
    assert cut_from(scheds) is None
    slow = check_files([(s, system) for s in scheds], 1.5, "other", 100.0, 100.0, book)
    _checked_equal(fast, slow)


def test_reader_frame_not_taken_once_a_piece_changed(tmp_path):
    # a schedule whose column was replaced after reading is joined from its pieces
    from feedcheck.checks.schedule_batch import _join
    from feedcheck.inputs.schedule_alike import cut_from, read_schedule_files

    job_text(4, tmp_path)
    scheds = read_schedule_files(sorted(tmp_path.glob("*.csv")))
    assert cut_from(scheds) is not None
    with pd.option_context("mode.chained_assignment", None):
        scheds[1].circuits["pf"] = 0.5
    assert cut_from(scheds) is None
    joined = _join(scheds).circuits
    assert joined["pf"].iloc[len(scheds[0].circuits)] == 0.5  # the piece as it is now


def test_panel_totals_by_column_equal_totals_of_each_record():
    # identity between two ways of the same conversion (no published value): values
    # and Python types, column by column and record by record
    from feedcheck.checks.schedules import panel_totals, totals_of_record
    from feedcheck.units import parse_voltage_system

    system = parse_voltage_system("208Y/120 V")
    panels = pd.DataFrame(
        {
            "panel": ["A", "B", "C"],
            "circuits": np.array([3, 0, 12], dtype=np.int64),
            "connected_va": [1800.0, 0.0, float("nan")],
            "spares": np.array([1, 2, 3], dtype=np.int32),
            "worst": np.array([np.float64(2.5), np.int64(4), "x"], dtype=object),
            "flag": [True, False, True],
        }
    )
    got = panel_totals(panels, "other", system)
    want = [totals_of_record(r, "other", system) for r in panels.to_dict("records")]
    assert [[(k, type(v)) for k, v in t.items()] for t in got] == [
        [(k, type(v)) for k, v in t.items()] for t in want
    ]
    assert repr(got) == repr(want)  # NaN compares unequal; its text does not
