"""Ampacity steps show their source (issue 15, item 6): the table, row and column each
figure was read from and the formula of each factor, with the figures put into it.

Figures checked against NFPA 70-2023: Table 310.16, 300 kcmil Cu, 90 °C column = 320 A and
75 °C column = 285 A; Table 310.15(C)(1), 4–6 conductors = 80 %; 310.15(B)(1) equation
F = √((Tc − Ta)/(Tc − 30)) at 90 °C and 35 °C = √(55/60) = 0.9574.
"""

from __future__ import annotations

import math
from pathlib import Path

from feedcheck.runner import load_and_check

ROOT = Path(__file__).resolve().parents[2]


def test_run_sheet_names_table_row_column_and_formula():
    _, results = load_and_check(ROOT / "sample_jobs" / "harbor_kitchen.toml")
    steps = {s.label: s for s in results.sheets["F-LP1"].steps}
    base = steps["table ampacity, 90 °C column, one conductor"]
    assert "Table 310.16" in base.formula and "row 300 kcmil Cu" in base.formula
    assert "column c90_a" in base.formula
    assert base.result == 320.0  # NFPA 70-2023 Table 310.16, 300 kcmil Cu, 90 °C
    amb = steps["ambient correction factor"]
    assert "√((Tc − Ta)/(Tc − 30))" in amb.formula and "√((90 − 35) / (90 − 30))" in amb.substituted
    assert math.isclose(amb.result, math.sqrt(55 / 60), rel_tol=1e-12)  # 310.15(B)(1) equation
    adj = next(s for s in steps.values() if s.label.startswith("adjustment factor"))
    assert "Table 310.15(C)(1)" in adj.formula and "row 4–6" in adj.formula
    assert adj.result == 0.8  # NFPA 70-2023 Table 310.15(C)(1), 4-6 conductors
    cap = next(s for s in steps.values() if s.label.startswith("termination limit"))
    assert "column c75_a" in cap.formula and cap.result == 285.0  # Table 310.16 75 °C
    for s in results.sheets["F-LP1"].steps:
        assert s.formula, f"step {s.label!r} shows no formula or source"
