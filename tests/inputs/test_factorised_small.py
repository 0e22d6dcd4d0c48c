"""The plain-Python numbering of short schedule columns equals the pandas one
(identity between two ways of the same computation; no published source needed)."""

import numpy as np
import pytest

from feedcheck.inputs import schedule_cells


@pytest.mark.parametrize("n", [0, 1, 7, 30, 400])
def test_short_column_numbered_as_pandas_does(n, monkeypatch):
    words = [" a", "a", "b ", "", " ", "12 AWG Cu", "12 AWG Cu ", "x"]
    rng = np.random.default_rng(n)
    raw = np.array([words[i] for i in rng.integers(0, len(words), n)] + [None], object)[:-1]
    codes, texts = schedule_cells.factorised(raw)
    monkeypatch.setattr(schedule_cells, "SMALL_COLUMN", -1)
    codes_pd, texts_pd = schedule_cells.factorised(raw)
    assert codes.dtype == codes_pd.dtype and texts.dtype == texts_pd.dtype
    assert codes.tolist() == codes_pd.tolist() and texts.tolist() == texts_pd.tolist()
    assert texts[codes].tolist() == [w.strip() for w in raw.tolist()]


def test_column_with_a_missing_cell_still_goes_through_pandas():
    raw = np.array(["1", None, " 1"], dtype=object)
    codes, texts = schedule_cells.factorised(raw)
    assert texts[codes].tolist() == ["1", "None", "1"]
