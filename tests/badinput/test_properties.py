"""Property tests: random valid jobs never crash; the figures move the way physics says.

Generated jobs (hypothesis, TOML text built from strategies) stay inside the input
ranges documented in ``test_job_catalogue`` (lengths 3-600 ft, loads up to the
transformer rating, standard sizes 8 AWG-500 kcmil), so every one must check with
exit code 0 or 1 — never 2, never a traceback. ``max_examples`` is kept small so the
module runs in well under 30 s on a shared two-core machine.

Monotonic laws checked (limiting-case identities, no invented oracle):

* three-phase fault current at a panel falls as its feeder gets longer (more series
  impedance, Ohm's law; point-to-point M = 1/(1 + f) with f ∝ length, Cooper Bussmann
  Electrical Plan Review 2005, Part II);
* voltage drop at a panel rises with feeder length and with load
  (VD = I(R cos θ + X sin θ), R and X ∝ length, I ∝ load; IEEE Std 141-1993 ch. 3);
* table ampacity rises with conductor size (NFPA 70 Table 310.16 columns increase
  down the table);
* random bytes as a job file give exit 2 and a message, never a traceback.
"""

from __future__ import annotations

import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from feedcheck.calc.sizes import AWG_KCMIL_ORDER
from feedcheck.runner import run_job
from tests.kernels import ampacity_a

from . import assert_no_traceback, cli

SETTINGS = settings(
    max_examples=20,
    deadline=None,
    suppress_health_check=[HealthCheck.function_scoped_fixture, HealthCheck.too_slow],
)
SIZES = [
    "8 AWG",
    "6 AWG",
    "4 AWG",
    "2 AWG",
    "1/0 AWG",
    "2/0 AWG",
    "4/0 AWG",
    "250 kcmil",
    "350 kcmil",
    "500 kcmil",
]
RATINGS_KVA = [30, 45, 75, 112.5, 150]

HEAD = """\
[project]
name = "Generated job (hypothesis)"

[source]
voltage = "480 V delta"
available_fault = "{fault} kA"
x_r = 6

[[transformer]]
id = "T1"
rating = "{kva} kVA"
primary = "480 V delta"
secondary = "208Y/120 V"
impedance = "{z} %"
primary_device = "{pdev} A"
"""

RUN = """
[[run]]
id = "R{i}"
from = "{frm}"
to = "P{i}"
length = "{length:.6g} {unit}"
conductors = "{size} {mat}"
raceway = "{raceway}"
insulation = "{ins} degC"
sets = {sets}

[[panel]]
id = "P{i}"
rating = "{rating} A"
load = "{load:.6g} kVA"
"""


@st.composite
def jobs(draw):
    kva = draw(st.sampled_from(RATINGS_KVA))
    text = HEAD.format(
        fault=draw(st.sampled_from([5, 14, 30, 65])),
        kva=kva,
        z=draw(st.floats(1.5, 8.0)).__round__(2),
        pdev=draw(st.sampled_from([60, 110, 175, 250])),
    )
    n = draw(st.integers(1, 4))
    for i in range(1, n + 1):
        feet = draw(st.floats(3, 600))
        metric = draw(st.booleans())
        text += RUN.format(
            i=i,
            frm="T1" if i == 1 or draw(st.booleans()) else f"P{draw(st.integers(1, i - 1))}",
            length=feet * 0.3048 if metric else feet,
            unit="m" if metric else "ft",
            size=draw(st.sampled_from(SIZES)),
            mat=draw(st.sampled_from(["Cu", "Al"])),
            raceway=draw(st.sampled_from(["steel", "aluminum", "pvc", "cable"])),
            ins=draw(st.sampled_from([60, 75, 90])),
            sets=draw(st.integers(1, 3)),
            rating=draw(st.sampled_from([60, 100, 225, 400])),
            load=draw(st.floats(0.5, kva)),
        )
    return text


@SETTINGS
@given(text=jobs())
def test_random_valid_jobs_check(tmp_path_factory, text):
    job = tmp_path_factory.mktemp("prop") / "job.toml"
    job.write_text(text, encoding="utf-8")
    r = cli("check", job, "--format", "json")
    assert_no_traceback(r)
    assert r.exit_code in (0, 1), r.stderr + "\n" + text


ONE_RUN = HEAD + RUN


def _panel_values(tmp_path, length_ft: float, load_kva: float) -> dict:
    text = ONE_RUN.format(
        fault=30,
        kva=75,
        z=5.0,
        pdev=110,
        i=1,
        frm="T1",
        length=length_ft,
        unit="ft",
        size="1/0 AWG",
        mat="Cu",
        raceway="steel",
        ins=75,
        sets=1,
        rating=225,
        load=load_kva,
    )
    job = tmp_path / f"j-{length_ft:.6g}-{load_kva:.6g}.toml"
    job.write_text(text, encoding="utf-8")
    nodes = {n.id: n for n in run_job(job).nodes}
    return nodes["P1"].values


@settings(
    max_examples=15, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture]
)
@given(a=st.floats(5, 800), b=st.floats(5, 800), load=st.floats(5, 60))
def test_fault_falls_and_drop_rises_with_length(tmp_path, a, b, load):
    short, long_ = sorted((a, b))
    if long_ - short < 1.0:
        long_ = short + 1.0
    vs, vl = _panel_values(tmp_path, short, load), _panel_values(tmp_path, long_, load)
    assert vl["fault_max_a"] < vs["fault_max_a"]
    assert vl["fault_min_a"] < vs["fault_min_a"]
    assert vl["vdrop_pct"] > vs["vdrop_pct"]


@settings(
    max_examples=10, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture]
)
@given(length=st.floats(20, 500), a=st.floats(2, 70), b=st.floats(2, 70))
def test_drop_rises_with_load(tmp_path, length, a, b):
    light, heavy = sorted((a, b))
    if heavy - light < 0.5:
        heavy = light + 0.5
    assert (
        _panel_values(tmp_path, length, heavy)["vdrop_pct"]
        > _panel_values(tmp_path, length, light)["vdrop_pct"]
    )


def test_fault_at_zero_length_limit_equals_upstream(tmp_path):
    """Limiting case: a very short feeder leaves the fault current almost unchanged."""
    v = _panel_values(tmp_path, 0.01, 10)
    text = ONE_RUN.format(
        fault=30,
        kva=75,
        z=5.0,
        pdev=110,
        i=1,
        frm="T1",
        length=0.01,
        unit="ft",
        size="1/0 AWG",
        mat="Cu",
        raceway="steel",
        ins=75,
        sets=1,
        rating=225,
        load=10,
    )
    job = tmp_path / "z.toml"
    job.write_text(text, encoding="utf-8")
    t1 = {n.id: n for n in run_job(job).nodes}["T1"].values
    np.testing.assert_allclose(v["fault_max_a"], t1["fault_max_a"], rtol=1e-3)


@given(
    mat=st.sampled_from(["cu", "al"]),
    ins=st.sampled_from([60.0, 75.0, 90.0]),
    amb=st.floats(-10, 55),
)
@settings(max_examples=30, deadline=None)
def test_ampacity_rises_with_size(mat, ins, amb):
    if amb >= ins - 1:
        return
    # 12 AWG (the smallest Al row) to 600 kcmil (NFPA 70-2023 Table 310.16 rows held as read)
    order = list(AWG_KCMIL_ORDER)
    sizes = order[order.index("12 AWG") : order.index("600 kcmil") + 1]
    amps = np.array(
        [ampacity_a(s, mat, ins, ambient_c=amb, termination_c=ins) for s in sizes], dtype=float
    )
    assert np.all(np.diff(amps) > 0), dict(zip(sizes, amps, strict=True))


@settings(
    max_examples=25, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture]
)
@given(data=st.binary(max_size=2000))
def test_random_bytes_exit_2(tmp_path, data):
    job = tmp_path / "rand.toml"
    job.write_bytes(data)
    r = cli("check", job)
    assert_no_traceback(r)
    assert r.exit_code == 2
    assert r.stderr.startswith("error: ") and r.stdout == ""


def test_undeliverable_load_is_a_finding(tmp_path):
    """57 kVA through 573 ft of 8 AWG Al (found by the property test above): the drop
    reaches the whole voltage. That is a failing check (exit 1), not exit 3."""
    text = HEAD.format(fault=5, kva=75, z=3.0, pdev=60)
    for i, frm, feet, size, load in ((1, "T1", 573, "8 AWG Al", 52), (2, "P1", 3, "8 AWG Cu", 5)):
        mat = size.split()[-1]
        text += RUN.format(
            i=i, frm=frm, length=feet, unit="ft", size=size[: -len(mat) - 1], mat=mat,
            raceway="steel", ins=60, sets=1, rating=60, load=load,
        )  # fmt: skip
    job = tmp_path / "job.toml"
    job.write_text(text, encoding="utf-8")
    r = cli("check", job, "--format", "json")
    assert r.exit_code == 1, r.stderr
