"""Reading panel schedules: forgiving headers, every bad cell reported, limits, XLSX = CSV."""

import zipfile

import numpy as np
import openpyxl
import pytest

from feedcheck.checks.schedules import check_schedule
from feedcheck.errors import InputError
from feedcheck.inputs import schedule_file as S
from feedcheck.inputs.schedule_file import read_schedule
from feedcheck.inputs.schedule_header import normalise_header
from feedcheck.units import parse_voltage_system

GOOD = (
    "Circuit,Description,Poles,Kind,Continuous,Load [VA],Power factor,Breaker [A],Conductor,"
    "Length [ft],Ground\n"
    "1,Lights,1,lighting,yes,1100,0.95,20,12 AWG Cu,85,12 AWG Cu\n"
    "2,Receptacles,1,receptacle,no,1440,1,20,12 AWG Cu,70,12 AWG Cu\n"
    "3,Heater,3,heating,yes,9000,1,35,8 AWG Cu,35,10 AWG Cu\n"
    "4,Fan,2,motor,no,1800,0.85,20,12 AWG Cu,50,12 AWG Cu\n"
)


def _write(tmp_path, text, name="LP1.csv"):
    p = tmp_path / name
    p.write_text(text, encoding="utf-8")
    return p


def _csv_to_xlsx(csv_text, path):
    wb = openpyxl.Workbook()
    ws = wb.active
    for line in csv_text.strip().splitlines():
        cells = []
        for c in line.split(","):
            try:
                cells.append(int(c))
            except ValueError:
                try:
                    cells.append(float(c))
                except ValueError:
                    cells.append(c)
        ws.append(cells)
    wb.save(path)
    return path


def _problems(exc):
    return [str(p) for p in exc.value.problems]


def test_headers_are_matched_forgivingly():
    assert normalise_header("LOAD_[VA]") == ("load", "va")
    assert normalise_header(" Breaker (A) ") == ("breaker", "a")
    assert normalise_header("current-carrying") == ("current carrying", "")


def test_reads_units_and_defaults(tmp_path):
    s = read_schedule(_write(tmp_path, GOOD))
    c = s.circuits
    assert s.panels == ("LP1",) and s.load_unit == "VA"
    assert c["length_m"].iloc[0] == pytest.approx(85 * 0.3048)  # international foot, exact
    assert c["insulation_c"].tolist() == [75.0] * 4  # documented default
    assert c["continuous"].tolist() == [True, False, True, False]
    assert c["size"].iloc[2] == "8 AWG" and c["material"].iloc[2] == "cu"
    assert c["row"].tolist() == [2, 3, 4, 5]


def test_xlsx_and_csv_give_identical_results(tmp_path):
    csv_p = _write(tmp_path, GOOD)
    xl_p = _csv_to_xlsx(GOOD, tmp_path / "LP1.xlsx")
    sys = parse_voltage_system("208Y/120 V")
    a = check_schedule(read_schedule(csv_p), sys, 1.2)
    b = check_schedule(read_schedule(xl_p), sys, 1.2)
    assert a.circuits.drop(columns=[]).equals(b.circuits)
    assert a.totals == b.totals
    assert a.findings == b.findings


def test_every_bad_cell_reported_with_file_row_column(tmp_path):
    text = GOOD.replace("1,Lights,1,lighting,yes,1100", "1,Lights,1,lighting,perhaps,lots")
    text = text.replace(
        "3,Heater,3,heating,yes,9000,1,35,8 AWG Cu,35",
        "3,Heater,4,heating,yes,9000,1,35 amps,8 AWG Gold,-5",
    )
    p = _write(tmp_path, text)
    with pytest.raises(InputError) as exc:
        read_schedule(p)
    msgs = _problems(exc)
    want = [
        ("row 2", "Continuous", "perhaps"),
        ("row 2", "Load [VA]", "lots"),
        ("row 4", "Poles", "4"),
        ("row 4", "Breaker [A]", "35 amps"),
        ("row 4", "Conductor", "8 AWG Gold"),
        ("row 4", "Length [ft]", "-5"),
    ]
    for row, col, val in want:
        assert any(
            str(p) in m and f"{row}, column '{col}'" in m and repr(val) in m for m in msgs
        ), (row, col, msgs)


def test_blank_rows_skipped_and_row_numbers_kept(tmp_path):
    lines = GOOD.splitlines()
    text = "\n".join([lines[0], lines[1], ",,,,,,,,,,", "", lines[2].replace("1440", "x")])
    with pytest.raises(InputError) as exc:
        read_schedule(_write(tmp_path, text + "\n"))
    assert any("row 5, column 'Load [VA]'" in m for m in _problems(exc))


def test_missing_column_and_title_row_hint(tmp_path):
    with pytest.raises(InputError) as exc:
        read_schedule(_write(tmp_path, "Panel LP1 schedule,,,,,,,,,,\n" + GOOD))
    (msg,) = _problems(exc)
    assert "row 1" in msg and "row 2" in msg and "header must be row 1" in msg
    with pytest.raises(InputError) as exc:
        read_schedule(_write(tmp_path, GOOD.replace("Breaker [A],", "Rating2,")))
    assert any("'breaker'" in m for m in _problems(exc))


def test_repeated_header_duplicate_circuit_and_taken_space(tmp_path):
    lines = GOOD.splitlines()
    text = (
        "\n".join(
            [
                *lines,
                lines[0],
                "2,Dup,1,other,no,100,1,20,12 AWG Cu,10,",
                "5,Takes 5 and 7,2,other,no,100,1,20,12 AWG Cu,10,",
                "7,Clash,1,other,no,100,1,20,12 AWG Cu,10,",
            ]
        )
        + "\n"
    )
    with pytest.raises(InputError) as exc:
        read_schedule(_write(tmp_path, text))
    msgs = _problems(exc)
    assert any("row 6" in m and "repeated header" in m for m in msgs)
    assert any("row 7" in m and "not used twice" in m and "row 3" in m for m in msgs)
    # 3-pole circuit 3 (row 4) takes spaces 3, 5, 7: rows 8 and 9 clash with it
    assert any("row 8" in m and "space already taken" in m and "row 4" in m for m in msgs)
    assert any("row 9" in m and "space already taken" in m and "row 4" in m for m in msgs)
    # 3-pole circuit 3 takes spaces 3, 5, 7 — so a circuit 5 clashes too
    bad = GOOD + "5,Clash,1,other,no,100,1,20,12 AWG Cu,10,\n"
    with pytest.raises(InputError) as exc:
        read_schedule(_write(tmp_path, bad))
    assert any("space already taken" in m and "row 4" in m for m in _problems(exc))


def test_non_utf8_empty_directory_and_wrong_suffix(tmp_path):
    p = tmp_path / "bad.csv"
    p.write_bytes(GOOD.replace("Lights", "Lumi\xe8res").encode("latin-1"))
    with pytest.raises(InputError) as exc:
        read_schedule(p)
    assert "UTF-8" in _problems(exc)[0] and "row 2" in _problems(exc)[0]
    e = tmp_path / "empty.csv"
    e.write_bytes(b"")
    with pytest.raises(InputError, match="empty file"):
        read_schedule(e)
    with pytest.raises(InputError, match="not a folder"):
        read_schedule(tmp_path)
    t = _write(tmp_path, GOOD, "LP1.txt")
    with pytest.raises(InputError, match=r"\.csv or \.xlsx"):
        read_schedule(t)
    h = _write(tmp_path, GOOD.splitlines()[0] + "\n")
    with pytest.raises(InputError, match="no circuit rows"):
        read_schedule(h)


def test_ragged_row_reported(tmp_path):
    with pytest.raises(InputError) as exc:
        read_schedule(_write(tmp_path, GOOD + "6,a,b,c,d,e,f,g,h,i,j,k,l\n"))
    assert "row 6" in _problems(exc)[0]


def test_size_and_row_limits(tmp_path, monkeypatch):
    p = _write(tmp_path, GOOD)
    monkeypatch.setattr(S, "MAX_FILE_BYTES", 100)
    with pytest.raises(InputError, match="at most 100 bytes"):
        read_schedule(p)
    monkeypatch.setattr(S, "MAX_FILE_BYTES", 10_000)
    monkeypatch.setattr(S, "MAX_ROWS", 2)
    with pytest.raises(InputError, match="at most 2 circuit rows"):
        read_schedule(p)
    x = _csv_to_xlsx(GOOD, tmp_path / "LP1.xlsx")
    with pytest.raises(InputError, match="at most 2 circuit rows"):
        read_schedule(x)


def test_xlsx_zip_bomb_refused_before_opening(tmp_path, monkeypatch):
    p = tmp_path / "bomb.xlsx"
    with zipfile.ZipFile(p, "w", zipfile.ZIP_DEFLATED) as z:
        z.writestr("xl/worksheets/sheet1.xml", b"\0" * 20_000_000)
    with pytest.raises(InputError, match="zip bomb"):
        read_schedule(p)
    monkeypatch.setattr(S, "MAX_XLSX_UNPACKED_BYTES", 1000)
    with pytest.raises(InputError, match="unpacking to at most"):
        read_schedule(p)
    n = tmp_path / "notzip.xlsx"
    n.write_bytes(b"plain text")
    with pytest.raises(InputError, match="not a zip"):
        read_schedule(n)


def test_xlsx_formula_without_stored_value_is_empty(tmp_path):
    p = _csv_to_xlsx(GOOD, tmp_path / "LP1.xlsx")
    wb = openpyxl.load_workbook(p)
    wb.active["F3"] = "=F2*2"  # never calculated: no stored value, never evaluated
    wb.save(p)
    with pytest.raises(InputError) as exc:
        read_schedule(p)
    assert any("row 3, column 'Load [VA]'" in m and "(missing)" in m for m in _problems(exc))


def test_load_units_amperes_and_watts(tmp_path):
    amps = GOOD.replace("Load [VA]", "Load [A]").replace(",1440,", ",12,")
    s = read_schedule(_write(tmp_path, amps))
    r = check_schedule(s, parse_voltage_system("208Y/120 V"))
    assert r.circuits["load_va"].iloc[1] == pytest.approx(12 * 120)  # one pole: V_LN
    assert r.circuits["load_va"].iloc[2] == pytest.approx(9000 * np.sqrt(3) * 208)
    watts = GOOD.replace("Load [VA]", "Load [kW]")
    r = check_schedule(read_schedule(_write(tmp_path, watts)), parse_voltage_system("208Y/120 V"))
    assert r.circuits["load_va"].iloc[0] == pytest.approx(1100e3 / 0.95)  # W / pf
