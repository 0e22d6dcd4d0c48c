"""Schedules as people export them (issue 16): header spellings, a column map, spares,
spaces and totals rows, the two-column panel form, per-file systems; each variant must
give the same results as the clean one-row-per-circuit file (round trip).

Every schedule here is invented test data, written by the test; the results of the clean
file are the reference the variants are held to (the computation itself is checked
against published tables in tests/checks and tests/calc).
"""

import numpy as np
import openpyxl
import pytest

from feedcheck.checks.schedules import check_schedule
from feedcheck.errors import InputError
from feedcheck.inputs.schedule_file import read_schedule
from feedcheck.inputs.schedule_header import ALIASES, parse_column_map
from feedcheck.units import parse_voltage_system

WYE = parse_voltage_system("208Y/120 V")
SPLIT = parse_voltage_system("120/240 V")
COLS = [
    "Circuit",
    "Description",
    "Poles",
    "Continuous",
    "Load [VA]",
    "Breaker [A]",
    "Conductor",
    "Length [ft]",
]
ROWS = [
    ["1", "Lights", "1", "yes", "1100", "20", "12 AWG Cu", "85"],
    ["2", "Receptacles", "1", "no", "1440", "20", "12 AWG Cu", "70"],
    ["3", "Heater", "2", "yes", "4000", "30", "10 AWG Cu", "35"],
    ["4", "Fan", "2", "no", "1800", "20", "12 AWG Cu", "50"],
]


def _csv(path, header, rows):
    path.write_text("\n".join(",".join(r) for r in [header, *rows]) + "\n", encoding="utf-8")
    return path


def _xlsx(path, header, rows):
    wb = openpyxl.Workbook()
    ws = wb.active
    for r in [header, *rows]:
        ws.append(r)
    wb.save(path)
    return path


def _result(path, **kw):
    r = check_schedule(read_schedule(path, panel_id="LP1", **kw), WYE)
    c = r.circuits.drop(columns=["row"]).sort_values("circuit").reset_index(drop=True)
    return c, r


@pytest.fixture
def clean(tmp_path):
    return _result(_csv(tmp_path / "clean.csv", COLS, ROWS))


SPELLINGS = {
    "circuit": ["Ckt #", "CKT", "Circuit No."],
    "description": ["Load Description", "Circuit description"],
    "load": ["Load VA", "Load (VA)", "VA"],
    "breaker": ["Brkr", "BKR (A)", "Trip", "Amps", "Breaker size"],
    "conductor": ["Wire", "Wire size"],
    "length": ["Length", "Run length (ft)", "Distance ft"],
}
_INDEX = {"circuit": 0, "description": 1, "load": 4, "breaker": 5, "conductor": 6, "length": 7}


@pytest.mark.parametrize(("key", "spelling"), [(k, s) for k, v in SPELLINGS.items() for s in v])
def test_each_accepted_spelling_round_trips(tmp_path, clean, key, spelling):
    header = list(COLS)
    header[_INDEX[key]] = spelling
    got, _ = _result(_csv(tmp_path / "x.csv", header, ROWS))
    assert got.equals(clean[0])


def test_unknown_column_is_named_and_can_be_mapped(tmp_path, clean):
    header = list(COLS)
    header[3] = "Cont"
    header.append("Ins")
    rows = [[*r, "90"] for r in ROWS]
    # "Cont" is a known spelling; "Ins" is not: named, never dropped in silence
    p = _csv(tmp_path / "x.csv", header, rows)
    s = read_schedule(p)
    assert any("'Ins' not understood" in n and "NOT used" in n for n in s.notices)
    mapped = read_schedule(p, columns=parse_column_map("Ins=insulation", "--columns"))
    assert not any("not understood" in n for n in mapped.notices)
    assert (mapped.circuits["insulation_c"] == 90.0).all()
    header[3] = "Cont?"  # "Cont?" reads as "cont" (punctuation does not matter)
    s = read_schedule(_csv(tmp_path / "y.csv", header, rows), columns={"ins": "ignore"})
    assert s.circuits["continuous"].tolist() == [True, False, True, False]
    assert any("ignored" in n for n in s.notices)


def test_bad_column_map_is_refused():
    with pytest.raises(ValueError, match="HEADER=COLUMN"):
        parse_column_map("Ins=insulatoin", "--columns")


def test_missing_required_column_lists_every_spelling(tmp_path):
    header = [h for h in COLS if h != "Breaker [A]"]
    rows = [r[:5] + r[6:] for r in ROWS]
    with pytest.raises(InputError) as e:
        read_schedule(_csv(tmp_path / "x.csv", header, rows))
    (p,) = e.value.problems
    assert p.value == ", ".join(header)  # the header echoed whole, never cut mid-word
    for a in ALIASES["breaker"]:
        assert f"'{a}'" in p.expected


def test_spares_spaces_totals_round_trip(tmp_path, clean):
    rows = [
        *ROWS,
        ["5", "SPARE", "1", "", "", "20", "", ""],  # breaker, no load: a spare
        ["6", "Spare", "1", "", "0", "20", "", "0"],  # a 0 length on a spare is fine
        ["7", "SPACE", "1", "", "", "", "", ""],  # no breaker: a space
        ["", "TOTAL", "", "", "8340", "", "", ""],
    ]
    got, r = _result(_csv(tmp_path / "x.csv", COLS, rows))
    assert got.equals(clean[0])
    assert (r.totals["spares"], r.totals["spaces"]) == (2, 1)
    assert r.totals["connected_va"] == clean[1].totals["connected_va"]
    assert any("'TOTAL'" in n and "agrees" in n for n in r.notices)


def test_stated_total_that_differs_is_a_warning(tmp_path):
    rows = [
        *ROWS,
        ["", "Subtotal", "", "", "2540", "", "", ""],
        ["", "Grand total", "", "", "9000", "", "", ""],
    ]
    s = read_schedule(_csv(tmp_path / "x.csv", COLS, rows))
    assert any(n.startswith("warning:") and "9,000 VA" in n and "8,340 VA" in n for n in s.notices)
    assert any("'Subtotal'" in n for n in s.notices)


def test_missing_load_on_a_wired_circuit_is_still_an_error(tmp_path):
    rows = [r[:] for r in ROWS]
    rows[1][4] = ""  # a real circuit (conductor and length given) with no load
    with pytest.raises(InputError, match="Load"):
        read_schedule(_csv(tmp_path / "x.csv", COLS, rows))


def test_spares_carry_no_demand_nfpa70_table_220_42(tmp_path):
    # NFPA 70-2023 Table 220.42, dwelling units: first 3000 VA at 100 %, the next
    # (3001 to 120 000 VA) at 35 %: 5000 VA of lighting -> 3000 + 0.35 * 2000 = 3700 VA.
    header = ["Circuit", "Kind", "Load [VA]", "Breaker [A]", "Conductor", "Length [ft]"]
    rows = [
        ["1", "lighting", "2500", "20", "12 AWG Cu", "40"],
        ["3", "lighting", "2500", "20", "12 AWG Cu", "40"],
        ["5", "spare", "", "20", "", ""],
        ["7", "space", "", "", "", ""],
    ]
    s = read_schedule(_csv(tmp_path / "x.csv", header, rows))
    r = check_schedule(s, SPLIT, occupancy="dwelling")
    assert r.totals["demand_va"] == pytest.approx(3700.0)
    assert (r.totals["spares"], r.totals["spaces"]) == (1, 1)


def _two_column(header, rows, mirrored):
    right_header = header[::-1] if mirrored else header
    odd = [r for r in rows if int(r[0]) % 2]
    even = [r for r in rows if not int(r[0]) % 2]
    body = [o + (e[::-1] if mirrored else e) for o, e in zip(odd, even, strict=True)]
    return header + right_header, body


@pytest.mark.parametrize("mirrored", [False, True], ids=["same-order", "mirrored"])
@pytest.mark.parametrize("fmt", ["csv", "xlsx"])
def test_two_column_form_round_trips(tmp_path, clean, mirrored, fmt):
    header, body = _two_column(COLS, ROWS, mirrored)
    write = _csv if fmt == "csv" else _xlsx
    p = write(tmp_path / f"x.{fmt}", header, body)
    got, r = _result(p)
    assert got.equals(clean[0])
    assert any("two-column" in n for n in r.notices)
    with pytest.raises(InputError):
        read_schedule(_csv(tmp_path / "y.csv", COLS, ROWS), layout="two-column")


def test_single_phase_phases_and_multipole_order(tmp_path):
    # common practice, no source: spaces 1,2 on A, 3,4 on B, 5,6 on C (three-phase)
    rows = [
        ["5", "x", "3", "no", "900", "20", "12 AWG Cu", "10"],
        ["2", "y", "2", "no", "900", "20", "12 AWG Cu", "10"],
    ]
    s = read_schedule(_csv(tmp_path / "x.csv", COLS, rows))
    r = check_schedule(s, WYE)
    assert r.circuits["phase"].tolist() == ["A-B-C", "A-B"]  # space order CAB, written A-B-C
    r2 = check_schedule(read_schedule(_csv(tmp_path / "y.csv", COLS, rows[1:])), SPLIT)
    assert r2.circuits["phase"].tolist() == ["A-B"]
    from feedcheck.render.schedule_text import render_schedule_summary

    text = render_schedule_summary([r2], False)
    assert "phases A/B " in text and "A/B/C" not in text


def test_counts_are_integers(tmp_path, clean):
    t = clean[1].totals
    assert isinstance(t["circuits"], int) and isinstance(t["fail_circuits"], int)
    assert isinstance(t["spares"], int)


def test_system_column(tmp_path):
    header = [*COLS, "System"]
    rows = [[*r, "120/240 V"] for r in ROWS]
    s = read_schedule(_csv(tmp_path / "x.csv", header, rows))
    assert s.system == "120/240 V"
    rows[1][-1] = "208Y/120 V"
    with pytest.raises(InputError, match="one voltage system"):
        read_schedule(_csv(tmp_path / "y.csv", header, rows))


def test_metre_lengths_kept_for_people(tmp_path):
    header = list(COLS)
    header[7] = "Length [m]"
    s = read_schedule(_csv(tmp_path / "x.csv", header, ROWS))
    assert s.length_unit == "m"
    assert np.allclose(s.circuits["length_m"], [85, 70, 35, 50])


@pytest.mark.parametrize(
    ("cell", "size", "mat", "ins", "ground"),
    [
        ("500 MCM CU THHN", "500 kcmil", "cu", 90.0, ""),
        ("3#12, 1#12G", "12 AWG", "cu", 75.0, "12 AWG"),
        ("3-#10 CU THWN, #10 CU GND", "10 AWG", "cu", 75.0, "10 AWG"),
        ("2 AWG AL XHHW-2", "2 AWG", "al", 90.0, ""),
        ("12 AWG Cu TW", "12 AWG", "cu", 60.0, ""),
    ],
)
def test_trade_conductor_cells(tmp_path, cell, size, mat, ins, ground):
    # insulation temperature ratings: NFPA 70-2023 Table 310.4(1) (from memory):
    # THHN, XHHW-2 90 °C; THWN 75 °C; TW 60 °C
    rows = [["1", "x", "1", "no", "1000", "20", f'"{cell}"', "30"]]
    s = read_schedule(_csv(tmp_path / "x.csv", COLS, rows))
    c = s.circuits.iloc[0]
    assert (c["size"], c["material"], c["insulation_c"], c["ground_size"]) == (
        size,
        mat,
        ins,
        ground,
    )
    assumed = any("read as copper" in n for n in s.notices)
    assert assumed == (cell == "3#12, 1#12G")


def test_conductor_cell_says_what_could_not_be_read(tmp_path):
    rows = [["1", "x", "1", "no", "1000", "20", "12 AWG Cu blue", "30"]]
    with pytest.raises(InputError) as e:
        read_schedule(_csv(tmp_path / "x.csv", COLS, rows))
    assert "could not read 'blue'" in e.value.problems[0].expected


def test_insulation_column_and_cell_type_take_the_lower(tmp_path):
    header = [*COLS, "Insulation"]
    rows = [["1", "x", "1", "no", "1000", "20", "12 AWG Cu TW", "30", "90"]]
    s = read_schedule(_csv(tmp_path / "x.csv", header, rows))
    assert s.circuits["insulation_c"].iloc[0] == 60.0


@pytest.mark.parametrize("cell", ["20A 22kAIC", "20 A, 22 kAIC", "20/10kAIC", "20"])
def test_aic_after_breaker_rating(tmp_path, clean, cell):
    rows = [r[:] for r in ROWS]
    rows[0][5] = f'"{cell}"'
    got, _ = _result(_csv(tmp_path / "x.csv", COLS, rows))
    assert got.equals(clean[0])


def test_aic_column_read_and_said_unchecked(tmp_path):
    header = [*COLS, "AIC"]
    rows = [[*r, "22kAIC"] for r in ROWS]
    s = read_schedule(_csv(tmp_path / "x.csv", header, rows))
    assert any("interrupting ratings" in n and "not checked" in n for n in s.notices)
    rows[0][-1] = "strong"
    with pytest.raises(InputError, match="interrupting rating"):
        read_schedule(_csv(tmp_path / "y.csv", header, rows))
