import shutil

import pytest

from feedcheck.errors import InputError
from feedcheck.tables import (
    confidence_level,
    load_table,
    set_user_tables_dir,
    shipped_tables_dir,
    verify_all,
)


def test_every_shipped_table_verifies():
    good, bad = verify_all()
    assert not bad, "\n".join(str(e) for e in bad)
    assert len(good) >= 4


def test_device_ratings_match_published_list():
    # NFPA 70-2023 240.6(A) Table 240.6(A) : standard ratings 15 A … 6000 A
    published = [
        15,
        20,
        25,
        30,
        35,
        40,
        45,
        50,
        60,
        70,
        80,
        90,
        100,
        110,
        125,
        150,
        175,
        200,
        225,
        250,
        300,
        350,
        400,
        450,
        500,
        600,
        700,
        800,
        1000,
        1200,
        1600,
        2000,
        2500,
        3000,
        4000,
        5000,
        6000,
    ]
    t = load_table("device_ratings").data
    assert [int(x) for x in t["rating_a"] if x >= 15] == published
    # fuses also 1, 3, 6, 10 A
    assert set(t[t["rating_a"] < 15]["rating_a"]) == {1, 3, 6, 10}


def test_transformer_protection_rows_match_450_3_b():
    # NFPA 70-2023 Table 450.3(B)
    t = load_table("transformer_protection").data.set_index("rule_id")
    assert t.loc["xfmr-prot-primary-only-9a", "max_pct"] == 125
    assert t.loc["xfmr-prot-primary-only-2a", "max_pct"] == 167
    assert t.loc["xfmr-prot-primary-only-0a", "max_pct"] == 300
    assert t.loc["xfmr-prot-both-primary", "max_pct"] == 250
    assert t.loc["xfmr-prot-both-secondary-9a", "max_pct"] == 125
    assert t.loc["xfmr-prot-both-secondary-0a", "max_pct"] == 167
    low = t[~t.index.str.startswith("xfmr-prot-mv-")]
    assert set(low[low["next_size_up"] == "yes"].index) == {
        "xfmr-prot-primary-only-9a",
        "xfmr-prot-both-secondary-9a",
    }


def test_transformer_protection_rows_over_1000_v():
    # NFPA 70-2017 Table 450.3(A), any location (the code text and a data page, see
    # tests/reference/tables/transformer_protection__*.csv): primary breaker 600 % / fuse
    # 300 % up to 6 % impedance, 400 % / 300 % over 6 % up to 10 %; secondary of 1000 V or
    # less 125 %; Note 1 (next higher standard rating) throughout
    t = load_table("transformer_protection").data.set_index("rule_id")
    assert t.loc["xfmr-prot-mv-z6-breaker-primary", "max_pct"] == 600
    assert t.loc["xfmr-prot-mv-z6-fuse-primary", "max_pct"] == 300
    assert t.loc["xfmr-prot-mv-z10-breaker-primary", "max_pct"] == 400
    assert t.loc["xfmr-prot-mv-z10-fuse-primary", "max_pct"] == 300
    mv = t[t.index.str.startswith("xfmr-prot-mv-")]
    assert len(mv) == 8
    assert (mv[mv["winding"] == "secondary"]["max_pct"] == 125).all()
    assert (mv["next_size_up"] == "yes").all()
    assert (mv["row_confidence"] == "published").all()


def _copy(tmp_path, name):
    d = tmp_path / "mine"
    d.mkdir(exist_ok=True)
    shutil.copy(shipped_tables_dir() / f"{name}.csv", d / f"{name}.csv")
    return d, d / f"{name}.csv"


def test_user_table_replaces_shipped(tmp_path):
    d, p = _copy(tmp_path, "transformer_xr")
    p.write_text(p.read_text().replace("75,2.0", "75,2.2"))
    set_user_tables_dir(d)
    t = load_table("transformer_xr")
    assert t.origin == "user"
    assert float(t.data.set_index("rating_kva").loc[75, "x_r"]) == 2.2


def test_broken_monotonic_table_is_reported_with_line(tmp_path):
    d, p = _copy(tmp_path, "device_ratings")
    p.write_text(p.read_text().replace("\n110,yes,yes", "\n90,yes,yes"))
    set_user_tables_dir(d)
    with pytest.raises(InputError, match=r"device_ratings.csv:\d+: column 'rating_a'.*increasing"):
        load_table("device_ratings")


def test_missing_provenance_is_reported(tmp_path):
    d, p = _copy(tmp_path, "transformer_xr")
    p.write_text("\n".join(x for x in p.read_text().splitlines() if not x.startswith("# source")))
    set_user_tables_dir(d)
    with pytest.raises(InputError, match="provenance line naming the source"):
        load_table("transformer_xr")


def test_gap_in_table_is_reported(tmp_path):
    d, p = _copy(tmp_path, "transformer_xr")
    p.write_text(p.read_text().replace("75,2.0", "75,"))
    set_user_tables_dir(d)
    with pytest.raises(InputError, match="no gaps"):
        load_table("transformer_xr")


TINY = """# title: A small table for the row-confidence convention
# basis: invented test rows
# source: none (test data)
# edition: none
# conditions: none
# confidence: common practice
# key: rating_kva
# units: rating_kva=kVA
rating_kva,x_r,row_confidence
15,1.1,published
30,1.2,
45,1.3,from memory
75,1.4,
"""


def test_row_confidence_blank_takes_the_header_level(tmp_path):
    d = tmp_path / "mine"
    d.mkdir()
    (d / "tiny.csv").write_text(TINY, encoding="utf-8")
    set_user_tables_dir(d)
    t = load_table("tiny")
    assert t.row_confidence == (
        "published",
        "common practice",
        "from memory — verify",
        "common practice",
    )
    assert t.confidence_counts() == {
        "published": 1,
        "common practice": 2,
        "from memory — verify": 1,
    }


def test_table_without_the_column_has_the_header_level_on_every_row():
    t = load_table("device_ratings")
    assert set(t.row_confidence) == {confidence_level(t.confidence)}
    assert sum(t.confidence_counts().values()) == len(t.data)


def test_tables_command_prints_counts_by_confidence(tmp_path):
    from click.testing import CliRunner

    from feedcheck.cli import main

    d = tmp_path / "mine"
    d.mkdir()
    (d / "tiny.csv").write_text(TINY, encoding="utf-8")
    res = CliRunner().invoke(main, ["--tables", str(d), "tables"])
    assert res.exit_code == 0, res.output
    lines = res.output.splitlines()
    i = lines.index("tiny  [common practice]  user")
    assert lines[i + 1] == "    rows:   1 published, 2 common practice, 1 from memory — verify"
    # the total line sums every table's rows, level by level
    total = lines[-1]
    assert total.startswith(f"{len(verify_all()[0])} tables, ")
    good, _ = verify_all()
    n_rows = sum(len(t.data) for t in good)
    assert f", {n_rows} rows by confidence: " in total
    published = sum(t.confidence_counts().get("published", 0) for t in good)
    assert f"{published} published" in total


def test_tables_read_without_pandas_as_pandas_reads_them():
    # the plain reader (quick commands) gives the columns, types and values of
    # pandas.read_csv for every shipped table and for cells where the two could differ
    import io

    import numpy as np
    import pandas as pd

    from feedcheck import tables as T

    def pandas_columns(body):
        df = pd.read_csv(
            io.StringIO(body), skipinitialspace=True, comment=None, float_precision="round_trip"
        )
        return {str(c).strip(): df[c].to_numpy() for c in df.columns}

    def same(a, b):
        assert list(a) == list(b)
        for k in a:
            assert a[k].dtype == b[k].dtype, k
            for x, y in zip(a[k].tolist(), b[k].tolist(), strict=True):
                assert (x != x and y != y) or (x == y and type(x) is type(y)), (k, x, y)

    for path in sorted(T.shipped_tables_dir().glob("*.csv")):
        body = T._split_header(path.read_text(encoding="utf-8"))[1]
        plain = T._plain_columns(body)
        assert plain is not None, path.name  # every shipped table takes the quick path
        same(plain, pandas_columns(body))
    for cells in (["inf", "1"], ["NA", "5"], ["5.", ".5"], ["1e3", "2"], ["a", "5"], ["", "x"]):
        body = "c,d\n" + "".join(f"{v},1\n" for v in cells)
        same(T._plain_columns(body), pandas_columns(body))
    for cells in (["+5", "3"], ["True", "False"], ["Inf", "1"], ["a ", "b"]):  # pandas decides
        assert T._plain_columns("c\n" + "\n".join(cells) + "\n") is None
    assert np.isnan(T._plain_columns("c,d\nNA,1\n")["c"][0])
