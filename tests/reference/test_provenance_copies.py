"""Rows confirmed on 2026-12-02 that the cell-by-cell table tests do not reach, and the
confidence spelling every table's rows must keep (issue 18 items 1, 2 and 4).

Sources are named in each copy's header under ``tests/reference/tables/``.
"""

from __future__ import annotations

import csv
from pathlib import Path

import pandas as pd
import pytest

from feedcheck.tables import CONFIDENCE_LEVELS, confidence_level, load_table, table_names

REF = Path(__file__).parent / "tables"


def _copy(stem: str) -> list[dict[str, str]]:
    lines = (REF / f"{stem}.csv").read_text(encoding="utf-8").splitlines()
    return list(csv.DictReader(ln for ln in lines if ln.strip() and not ln.startswith("#")))


def test_xlpe_short_circuit_limit_matches_two_makers():
    copy = _copy("insulation_types__xlpe_sc_makers")
    assert len({r["maker"] for r in copy}) == 2
    limits = {float(r["sc_final_c"]) for r in copy if r["insulation"] == "XLPE"}
    assert limits == {250.0}  # two makers' data sheets to IEC 60502-1: XLPE 250 °C
    t = load_table("insulation_types").data.set_index("type")
    for typ in ("XHHW", "XHHW-2", "XHH"):  # X: cross-linked polyethylene
        assert float(t.loc[typ, "sc_final_c"]) == 250.0, typ
        assert t.loc[typ, "row_confidence"].startswith("published"), typ
    # USE, USE-2: no copy names their thermoset, so the lowest thermoset limit of NFPA
    # 70-2017 Table 240.92(B) is held (200 °C rubber; XLPE/EPR would allow 250 °C): the
    # worst case for the withstand check, stated as such in the row
    for typ in ("USE", "USE-2"):
        assert float(t.loc[typ, "sc_final_c"]) == 200.0, typ
        assert t.loc[typ, "row_confidence"].startswith("published, conservative"), typ


def test_thermoplastic_and_rubber_limits_match_maker_data():
    """Cooper Bussmann SPD, 'Component Protection - Wire & Cable' (ICEA formulae): maximum
    allowable short-circuit temperatures thermoplastic 150 °C; paper, rubber and varnished
    cloth 200 °C (tests/reference/tables/insulation_types__bussmann_sc_limits.csv)."""
    copy = {
        r["insulation"]: float(r["sc_final_c"])
        for r in _copy("insulation_types__bussmann_sc_limits")
    }
    assert copy["thermoplastic"] == 150.0 and copy["rubber"] == 200.0
    t = load_table("insulation_types").data.set_index("type")
    thermoplastic = ("TW", "THW", "THW-2", "THWN", "THWN-2", "THHN", "THHW", "MTW")
    for typ in thermoplastic:  # T (and MTW): thermoplastic insulation
        assert t.loc[typ, "family"] == "thermoplastic", typ
        assert float(t.loc[typ, "sc_final_c"]) == copy["thermoplastic"], typ
    for typ in ("RHW", "RHW-2", "RHH"):  # R: rubber (thermoset)
        assert float(t.loc[typ, "sc_final_c"]) == copy["rubber"], typ
    for typ in (*thermoplastic, "RHW", "RHW-2", "RHH"):  # ratings confirmed too
        assert t.loc[typ, "row_confidence"].startswith("published"), typ


def test_insulation_ratings_match_nfpa70_2017_table_310_104a():
    """NFPA 70-2017 Table 310.104(A), cell by cell: each type's rating in dry and in wet
    locations (blank: dry and damp only) and its insulation family as the Insulation column
    (or, where it prints none, the trade name) names it
    (tests/reference/tables/insulation_types__nfpa70_2017_t310_104a.csv)."""
    copy = {r["type"]: r for r in _copy("insulation_types__nfpa70_2017_t310_104a")}
    t = load_table("insulation_types").data.set_index("type")
    assert set(copy) == set(t.index)  # every shipped type is in the copy
    wrong = []
    for typ, pub in copy.items():
        ours = t.loc[typ]
        if float(ours["dry_c"]) != float(pub["dry_c"]):
            wrong.append(f"{typ} dry: Table 310.104(A) {pub['dry_c']}, shipped {ours['dry_c']}")
        wet = "" if pd.isna(ours["opt_wet_c"]) else f"{float(ours['opt_wet_c']):g}"
        if wet != pub["wet_c"]:
            wrong.append(f"{typ} wet: Table 310.104(A) {pub['wet_c']!r} degC, shipped {wet!r}")
        words = (pub["insulation"] or pub["trade_name"]).lower()
        family = next((f for f in ("thermoplastic", "thermoset") if f in words), None)
        if family is None:
            assert typ in ("USE", "USE-2"), typ  # 'heat- and moisture-resistant' only
        elif ours["family"] != family:
            wrong.append(f"{typ} family: Table 310.104(A) {words!r}, shipped {ours['family']}")
    assert not wrong, "\n".join(wrong)
    for typ in ("MTW", "XHHN"):  # confirmed in this copy (2026-12-03)
        assert t.loc[typ, "row_confidence"].startswith("published"), typ


def test_use_insulation_family_matches_ul854_abstract():
    """UL 854 (abstract): 'Type USE cable has thermoset insulation' (HDPE-over-XL allowed for
    single conductors); no material is named, so the USE/USE-2 short-circuit limit is the
    lowest thermoset limit of NFPA 70-2017 Table 240.92(B), marked as the conservative
    choice (tests/reference/tables/insulation_types__ul854_abstract.csv)."""
    t = load_table("insulation_types").data.set_index("type")
    for row in _copy("insulation_types__ul854_abstract"):
        assert t.loc[row["type"], "family"] == row["family"], row["type"]
        assert t.loc[row["type"], "row_confidence"].startswith("published, conservative")


def test_schedule_insulation_ratings_match_nfpa70_2017_table_310_104a():
    """The ratings a schedule's conductor cell gives its insulation words: the lower of the
    dry and wet ratings of NFPA 70-2017 Table 310.104(A) (dual-rated words: the lowest of
    the types named); NM and UF at 60 °C (NFPA 70-2017 334.80, 340.80)."""
    from feedcheck.inputs.schedule_conductor import INSULATION_TYPES

    copy = {r["type"]: r for r in _copy("insulation_types__nfpa70_2017_t310_104a")}

    def lowest(typ: str) -> float:
        r = copy[typ]
        return min(float(r["dry_c"]), float(r["wet_c"] or r["dry_c"]))

    checked = 0
    for word, rating in INSULATION_TYPES.items():
        if word.startswith(("nm", "uf")):
            assert rating == 60.0, word  # 334.80, 340.80: 60 °C conductors
            continue
        assert rating == min(lowest(t.upper()) for t in word.split("/")), word
        checked += 1
    assert checked >= 12


def test_short_circuit_limits_match_nfpa70_2017_table_240_92b():
    """NFPA 70-2017 Table 240.92(B): T2 = 150 °C thermoplastic, 200 °C paper, rubber and
    varnished cloth, 250 °C cross-linked polyethylene, for copper and aluminum alike
    (tests/reference/tables/insulation_types__nfpa70_2017_t240_92b.csv)."""
    copy = _copy("insulation_types__nfpa70_2017_t240_92b")
    by_ins: dict[str, set[float]] = {}
    for r in copy:
        by_ins.setdefault(r["insulation"], set()).add(float(r["sc_final_c"]))
    assert all(len(v) == 1 for v in by_ins.values())  # same T2 for Cu and Al
    t = load_table("insulation_types").data.set_index("type")
    expect = {"T": "thermoplastic", "M": "thermoplastic", "X": "cross-linked polyethylene"}
    expect["R"] = "paper rubber varnished cloth"
    for typ, row in t.iterrows():
        if typ in ("USE", "USE-2"):  # thermoset not named: the lowest thermoset T2
            assert float(row["sc_final_c"]) == min(by_ins["paper rubber varnished cloth"])
            continue
        (limit,) = by_ins[expect[typ[0]]]
        assert float(row["sc_final_c"]) == limit, (typ, limit)


@pytest.mark.parametrize("name", table_names())
def test_every_row_confidence_starts_with_a_level(name):
    """A row's confidence is read by its first words: a cell that starts otherwise would
    be a level of its own, neither confirmed nor flagged as remembered."""
    t = load_table(name)
    assert all(level in CONFIDENCE_LEVELS for level in t.row_confidence), (
        name,
        sorted(set(t.row_confidence) - set(CONFIDENCE_LEVELS)),
    )
    assert confidence_level(t.confidence) in CONFIDENCE_LEVELS


def test_service_and_sds_grounding_rules_cite_the_clauses_of_the_code_text():
    """NFPA 70-2017 Article 250 text (250.24, 250.28, 250.30): the clause each grounding and
    bonding rule cites, the table it is sized by and the parallel minimum, as the code text
    puts them (tests/reference/tables/check_rules__nec2017_art250_text.csv)."""
    rules = load_table("check_rules").data.set_index("rule_id")
    for row in _copy("check_rules__nec2017_art250_text"):
        cited = rules.loc[row["rule_id"], "clause"]
        basis = rules.loc[row["rule_id"], "basis"]
        assert row["clause"] in cited, (row["rule_id"], cited)
        assert row["sized_by"] in cited, (row["rule_id"], cited)
        if row["min_parallel"]:
            assert f"{row['min_parallel']} or larger" in basis, (row["rule_id"], basis)
