"""Issue 13 item 8: one 250.122(B) rule for runs and schedule circuits.

NFPA 70-2023 250.122(B): where ungrounded conductors are increased in size from the
minimum size that has sufficient ampacity for the intended installation, wire-type
equipment grounding conductors are increased in proportion to the circular-mil area of
the ungrounded conductors. "For the intended installation": conductors made larger by
ambient correction or by the adjustment for many current-carrying conductors are the
minimum size, not an increase; only an increase beyond it (e.g. for voltage drop)
grows the EGC. One kernel (calc.protection.egc_area_mm2) serves both.
"""

from __future__ import annotations

import pytest

from feedcheck.calc.protection import egc_area_mm2, egc_size
from feedcheck.calc.sizes import SIZES
from feedcheck.checks.schedules import check_schedule
from feedcheck.inputs.schedule_file import read_schedule
from feedcheck.rulebook import default_rulebook
from feedcheck.units import parse_voltage_system

HEAD = (
    "circuit,load [VA],continuous,breaker [A],conductor,insulation,current carrying,"
    "length [ft],ground\n"
)


def _flagged(tmp_path, rows: str):
    p = tmp_path / "P.csv"
    p.write_text(HEAD + rows, encoding="utf-8")
    res = check_schedule(read_schedule(p), parse_voltage_system("208Y/120 V"))
    return sorted(f.subject for f in res.findings if f.rule_id == "sched-egc"), res


def test_derated_branch_circuit_keeps_the_table_ground(tmp_path):
    """20 A breaker, 16 A continuous (1920 VA at 120 V; 125 % = 20 A, 210.19(A)(1)), 20
    current-carrying conductors in the raceway: 50 % (NFPA 70-2023 Table 310.15(C)(1)).
    12 AWG Cu 90 °C: 30 A × 0.5 = 15 A < 20 A; 10 AWG Cu 90 °C: 40 A × 0.5 = 20 A, within
    its 60 °C termination column 30 A (Table 310.16, 110.14(C)(1)(a)): 10 AWG is the
    minimum for this installation, so the 12 AWG Cu ground of Table 250.122 (20 A)
    stands. Before: the minimum was taken at 30 °C and three conductors (12 AWG) and the
    ground was failed as if the conductors had been upsized (×1.59 → 10 AWG)."""
    flagged, res = _flagged(tmp_path, "1,1920,yes,20,10 AWG Cu,90,20,10,12 AWG Cu\n")
    assert flagged == []
    assert res.circuits["ampacity_a"].iloc[0] == pytest.approx(20.0)  # 40 A × 0.5


def test_upsized_beyond_the_derated_minimum_still_grows(tmp_path):
    """The same circuit in 8 AWG Cu (for voltage drop): 16,510 / 10,380 cmil = 1.59
    (NFPA 70-2023 Ch. 9 Table 8) over the derated minimum 10 AWG; 12 AWG (6,530 cmil,
    Table 250.122 for 20 A) × 1.59 = 10,386 cmil → 10 AWG Cu (250.122(B)): a 12 AWG
    ground fails, a 10 AWG ground passes."""
    flagged, _ = _flagged(
        tmp_path,
        "1,1920,yes,20,8 AWG Cu,90,20,10,12 AWG Cu\n3,1920,yes,20,8 AWG Cu,90,20,10,10 AWG Cu\n",
    )
    assert flagged == ["P/1"]


def test_run_and_schedule_use_the_same_kernel():
    """A run's EGC (egc_size) and a schedule circuit's required area come from
    egc_area_mm2: 20 A, 8 AWG installed over a 10 AWG minimum → 12 AWG × 16,510/10,380
    (Table 250.122; Ch. 9 Table 8) → 10 AWG (NFPA 70-2023 250.122(B))."""
    book = default_rulebook()
    need, table, ratio, _cap = egc_area_mm2(
        20.0, "cu", SIZES["8 AWG"].area_mm2, SIZES["10 AWG"].area_mm2, tables=book.protection
    )
    assert float(table) == pytest.approx(SIZES["12 AWG"].area_mm2)
    assert float(ratio) == pytest.approx(16_510 / 10_380, rel=2e-3)  # Ch. 9 Table 8 cmil
    r = egc_size(20.0, "cu", "8 AWG", "10 AWG", tables=book.protection)
    assert r.size == "10 AWG" and r.ratio == pytest.approx(float(ratio))
    assert SIZES[r.size].area_mm2 >= float(need) * (1 - 1e-9)


def test_egc_area_vector_equals_scalar():
    book = default_rulebook()
    dev = [20.0, 60.0, 200.0]
    ps = [SIZES[s].area_mm2 for s in ("10 AWG", "4 AWG", "250 kcmil")]
    pm = [SIZES[s].area_mm2 for s in ("12 AWG", "6 AWG", "3/0 AWG")]
    vec = egc_area_mm2(dev, "cu", ps, pm, tables=book.protection)[0]
    for k in range(3):
        one = egc_area_mm2(dev[k], "cu", ps[k], pm[k], tables=book.protection)[0]
        assert float(vec[k]) == pytest.approx(float(one))
    with pytest.raises(ValueError, match="device_a"):
        egc_area_mm2(7000.0, tables=book.protection)
