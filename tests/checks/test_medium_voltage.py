"""A 13.8 kV primary (sample job Alder Creek, an invented scenario: demo data, never an
oracle): the figures checked come from the published formulas and tables named."""

from __future__ import annotations

import math

import pytest

from feedcheck.runner import run_job


@pytest.fixture(scope="module")
def alder():
    from tests.conftest import SAMPLES

    return run_job(SAMPLES / "alder_pump_station_13kv.toml")


def _f(res, subject, check):
    return next(f for f in res.findings if f.subject == subject and f.check == check)


def test_source_fault_from_short_circuit_power(alder):
    # IEEE Std 141-1993 ch. 4: I = S_sc / (√3 · V) = 250 MVA / (√3 · 13.8 kV) = 10,459 A
    src = next(n for n in alder.nodes if n.id == "source").values
    assert src["fault_max_a"] == pytest.approx(250e6 / (math.sqrt(3) * 13800), rel=1e-9)


def test_primary_fuse_limit_of_table_450_3_a(alder):
    # NFPA 70-2023 Table 450.3(A), any location, Z up to 6 %, fuse: 300 % of the rated
    # primary current 1000 kVA / (√3 · 13.8 kV) = 41.84 A → 125.5 A; note 1: the next
    # standard rating, 150 A (Table 240.6(A))
    f = _f(alder, "TS", "primary device")
    assert f.rule_id == "xfmr-prot-mv-z6-fuse-primary"
    assert f.limit == 150 and f.value == 100 and f.status == "ok"
    sec = _f(alder, "TS", "secondary device")
    # secondary of 1000 V or less: 125 % of 1202.8 A = 1503.5 A → next standard 1600 A
    assert sec.limit == 1600 and sec.status == "ok"


def test_breaker_row_and_no_secondary_device(write_job, samples):
    text = (samples / "alder_pump_station_13kv.toml").read_text()
    text = text.replace('primary_device_type = "fuse"', 'primary_device_type = "breaker"')
    text = text.replace('secondary_device = "1600 A"\n', "")
    res = run_job(write_job(text))
    # Table 450.3(A), breaker, Z up to 6 %: 600 % × 41.84 A = 251 A → next standard 300 A
    f = _f(res, "TS", "primary device")
    assert f.rule_id == "xfmr-prot-mv-z6-breaker-primary" and f.limit == 300
    warn = _f(res, "TS", "secondary device")
    assert warn.status == "warn" and "requires secondary protection" in warn.note
    # Table 240.6(A) holds low-voltage ratings only: no standard-rating warning at 13.8 kV
    assert not [x for x in res.findings if x.check == "primary device standard rating"]
