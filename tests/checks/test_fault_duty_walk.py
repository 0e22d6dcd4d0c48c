"""checks/fault_duty.py through the whole feed walk (issue 12): each unsafe design of the
issue reproduced and now failing, with the rule named.

Expected figures are computed here from the published formulas, independently of the
kernels: the half-winding model of a centre-tapped secondary (fuse makers' point-to-point
application literature: 1.5 × %R and 1.2 × %X of the full winding; common practice, no
standard), symmetrical components for the line-to-ground fault (IEEE Std 141-1993 ch. 4),
the asymmetry multiplying factors of IEEE Std 1015-2006 ch. 5 with the UL 489 / IEEE
C37.13 test power factors.
"""

from __future__ import annotations

import math

import pytest

from tests.checks.jobs import finding, node

SPLIT_JOB = """
[project]
name = "issue 12: 167 kVA 120/240 V duty (invented)"

[source]
voltage = "480 V"
phases = 1
available_fault = "infinite"
x_r = 6

[[transformer]]
id = "T"
rating = "167 kVA"
primary = "480 V"
secondary = "120/240 V"
impedance = "2 %"
x_r = 3
primary_device = "450 A"
secondary_device = "800 A"

[[run]]
id = "R"
from = "T"
to = "P"
length = "5 ft"
conductors = "600 kcmil Cu"
sets = 2
insulation = "75 degC"
raceway = "steel"
ambient = "30 degC"
current_carrying = 2
ground = "1/0 AWG Cu"
device = "800 A"

[[panel]]
id = "P"
rating = "800 A"
interrupting = "{interrupting}"
voltage = "120/240 V"
load = "100 kVA"
"""

WYE_JOB = """
[project]
name = "issue 12: delta-wye duty (invented)"

[source]
voltage = "480 V delta"
available_fault = "infinite"
x_r = 6

[[transformer]]
id = "T"
rating = "{kva} kVA"
primary = "480 V delta"
secondary = "208Y/120 V"
impedance = "{z_pct} %"
x_r = {x_r}
primary_device = "{primary_device} A"
{z0}

[[run]]
id = "R"
from = "T"
to = "P"
length = "{length}"
conductors = "{conductors}"
sets = {sets}
insulation = "75 degC"
raceway = "pvc"
ambient = "30 degC"
current_carrying = 3
ground = "{ground}"
device = "{device} A"

{panels}

[options]
impedance_tolerance = "0 %"
"""

PANEL = """
[[panel]]
id = "{id}"
rating = "{bus} A"
interrupting = "{interrupting}"
load = "10 kVA"
{extra}
"""


def wye_job(**kw) -> str:
    values = dict(
        kva=75,
        z_pct=5.0,
        x_r=3,
        primary_device=150,
        z0="",
        length="1 ft",
        conductors="250 kcmil Cu",
        sets=1,
        ground="4 AWG Cu",
        device=250,
        panels=PANEL.format(id="P", bus=400, interrupting="65 kA", extra=""),
    )
    values.update(kw)
    return WYE_JOB.format(**values)


def _half_winding_ln_a(kva, v_ln, z_pct, x_r, tol_pct):
    """Terminal line-to-neutral current, half-winding model on the full kVA base:
    I = S / (V_LN · |1.5·%R + j·1.2·%X| / 100), %Z at its lower tolerance."""
    r = z_pct / math.sqrt(1 + x_r**2) * (1 - tol_pct / 100)
    x = r * x_r
    return kva * 1e3 / (v_ln * abs(1.5 * r + 1.2j * x) / 100)


def test_167kva_split_phase_panel_fails_on_line_to_neutral(check_json):
    """Issue 12 item 1: 167 kVA, 2 %Z, X/R 3, 480 V to 120/240 V, infinite source, 5 ft of
    2 × 600 kcmil Cu to an 800 A panel rated 42 kA. The line-to-line maximum is below 42 kA
    (S/(V·%Z) = 167 kVA/(240 V × 0.02 × 0.925) = 37.6 kA, IEEE Std 141 ch. 4); the
    line-to-neutral maximum of the half-winding model is about 61 kA at the terminals, so
    the panel must fail (NFPA 70-2023 110.9, 110.10)."""
    doc = check_json(SPLIT_JOB.format(interrupting="42 kA"))
    p = node(doc, "P")
    ll_terminals = 167e3 / (240 * 0.02 * 0.925)  # IEEE Std 141-1993 ch. 4, tol. C57.12.00
    assert node(doc, "T")["fault_max_a"] == pytest.approx(ll_terminals, rel=1e-6)
    ln_terminals = _half_winding_ln_a(167, 120, 2.0, 3.0, 7.5)
    assert ln_terminals == pytest.approx(60_996, rel=1e-4)  # the kernel note's figure
    assert node(doc, "T")["fault_ln_max_a"] == pytest.approx(ln_terminals, rel=1e-6)
    # at the panel: + line and neutral, 5 ft each, two sets of 600 kcmil Cu in steel:
    # R 0.025 and X_L 0.048 ohm/kft at 75 degC (NFPA 70-2023 Ch. 9 Table 9), R at 20 degC
    # by (234.5 + 20)/(234.5 + 75) (copper, NFPA 70 Ch. 9 Table 8 note 2)
    z_base = 240.0**2 / 167e3
    r_t = z_base * 0.02 / math.sqrt(10) * 0.925
    x_t = 3 * r_t
    z_cond = 2 * 5 * (0.025 * 254.5 / 309.5 + 0.048j) / 1000 / 2
    z_ln = (1.5 * r_t + 1.2j * x_t) / 4 + z_cond
    assert p["fault_ln_max_a"] == pytest.approx(120 / abs(z_ln), rel=2e-3)
    assert p["fault_ln_max_a"] == pytest.approx(54e3, rel=0.01)  # "near 54 kA" (issue 12)
    assert p["fault_max_a"] < 42e3 < p["fault_ln_max_a"]
    assert p["fault_duty_case"] == "line-to-neutral"
    f = finding(doc, "P", "interrupting rating")
    assert f["status"] == "fail" and f["rule_id"] == "panel-interrupting"
    assert "line-to-neutral" in f["note"] and "is needed" in f["note"]
    assert f["value"] == pytest.approx(p["fault_duty_a"], rel=1e-12)


def test_167kva_split_phase_panel_passes_when_rated_for_it(check_json):
    """The same panel rated 65 kA holds the line-to-neutral duty (X/R of the L-N loop is
    below the 4.9 of the molded-case test circuit over 20 kA, UL 489, so MF = 1)."""
    doc = check_json(SPLIT_JOB.format(interrupting="65 kA"))
    assert finding(doc, "P", "interrupting rating")["status"] == "ok"
    assert node(doc, "P")["fault_duty_mf"] == 1.0


def test_line_to_ground_max_above_three_phase_at_delta_wye(check_json):
    """Issue 12 item 4: infinite source, Z0 = 0.85·Z1 (rule fault-z0-ratio-max): at the
    terminals I_LG = 3·I_3ph/(2 + 0.85) = 1.0526·I_3ph (symmetrical components, IEEE Std
    141-1993 ch. 4), so a panel rated between the two fails on the line-to-ground case."""
    i3 = 75e3 / (math.sqrt(3) * 208) * 100 / 5.0  # IEEE Std 141-1993 ch. 4, tolerance 0
    between = 1.03 * i3
    panels = PANEL.format(id="P", bus=400, interrupting=f"{between / 1e3:.3f} kA", extra="")
    doc = check_json(wye_job(length="0.01 ft", panels=panels))
    t = node(doc, "T")
    assert t["fault_max_a"] == pytest.approx(i3, rel=1e-9)
    assert t["fault_lg_max_a"] == pytest.approx(3 * i3 / 2.85, rel=1e-9)
    assert t["fault_duty_case"] == "line-to-ground"
    f = finding(doc, "P", "interrupting rating")
    assert f["status"] == "fail" and "line-to-ground" in f["note"]


@pytest.mark.parametrize("ratio", [0.3, 1.0, 2.0])
def test_zero_sequence_ratio_is_honoured(check_json, ratio):
    """Issue 12 item 7: the job's zero_sequence_ratio k sets Z0 = k·Z1_T for both the
    maximum and the minimum; infinite source, terminals: I_LG = 3·I_3ph/(2 + k) (IEEE Std
    141-1993 ch. 4)."""
    doc = check_json(wye_job(z0=f"zero_sequence_ratio = {ratio}"))
    t = node(doc, "T")
    i3 = 75e3 / (math.sqrt(3) * 208) * 100 / 5.0
    assert t["fault_lg_max_a"] == pytest.approx(3 * i3 / (2 + ratio), rel=1e-9)
    assert t["fault_lg_min_a"] == pytest.approx(3 * i3 / (2 + ratio), rel=1e-9)


def _peak_mf(xr, xr_test):
    # IEEE Std 1015-2006 ch. 5: MF = (1 + e^(-pi/(X/R)))/(1 + e^(-pi/(X/R)test))
    return (1 + math.exp(-math.pi / xr)) / (1 + math.exp(-math.pi / xr_test))


def _rms_mf(xr, xr_test):
    # IEEE Std C37.13-2008 / IEEE Std 1015-2006: half-cycle total RMS ratio
    return math.sqrt(1 + 2 * math.exp(-2 * math.pi / xr)) / math.sqrt(
        1 + 2 * math.exp(-2 * math.pi / xr_test)
    )


@pytest.mark.parametrize(
    ("extra", "xr_test", "mf"),
    [
        ("", 4.9, _peak_mf),  # molded-case, over 20 kA: test pf 0.20 (UL 489), X/R 4.9
        ('device_type = "fuse"', 4.9, _rms_mf),  # low-voltage fuses: pf 0.20 (from memory)
        ('device_type = "power-breaker"', 6.6, _rms_mf),  # unfused LVPCB: pf 0.15 (C37.13)
    ],
)
def test_x_r_above_test_x_r_multiplies_the_duty(check_json, extra, xr_test, mf):
    """Issue 12 item 5: a 500 kVA transformer with X/R 8 at its terminals (infinite
    source): the X/R at the panel is above the device's test X/R, so the duty is
    MF × I_sym with MF > 1, and the factor is shown in the finding."""
    panels = PANEL.format(id="P", bus=1600, interrupting="100 kA", extra=extra)
    doc = check_json(
        wye_job(
            kva=500,
            z_pct=5.0,
            x_r=8,
            primary_device=800,
            panels=panels,
            length="0.01 ft",
            conductors="600 kcmil Cu",
            sets=4,
            ground="1/0 AWG Cu",
            device=1600,
        )
    )
    p = node(doc, "P")
    assert p["fault_duty_x_r"] > xr_test
    assert p["fault_duty_mf"] == pytest.approx(mf(p["fault_duty_x_r"], xr_test), rel=1e-3)
    assert p["fault_duty_mf"] > 1.0
    assert p["fault_duty_a"] == pytest.approx(p["fault_duty_mf"] * p["fault_duty_sym_a"])
    f = finding(doc, "P", "interrupting rating")
    assert f"MF {p['fault_duty_mf']:.3f}" in f["note"]


def test_x_r_factor_can_turn_a_pass_into_a_fail(check_json):
    """A panel rated just above the symmetrical duty fails once MF > 1 is applied."""
    args = dict(
        kva=500,
        z_pct=5.0,
        x_r=8,
        primary_device=800,
        length="0.01 ft",
        conductors="600 kcmil Cu",
        sets=4,
        ground="1/0 AWG Cu",
        device=1600,
    )
    doc = check_json(wye_job(**args))
    sym = node(doc, "P")["fault_duty_sym_a"]
    panels = PANEL.format(id="P", bus=1600, interrupting=f"{sym * 1.01 / 1e3:.3f} kA", extra="")
    doc = check_json(wye_job(panels=panels, **args))
    assert finding(doc, "P", "interrupting rating")["status"] == "fail"


def test_sibling_feeder_motor_contributes(check_json, write_job):
    """Issue 12 item 6: a motor on panel M adds 4 × FLC (rule fault-motor-multiple,
    common practice) to the fault at its sibling panel P on the same secondary."""
    panels = PANEL.format(id="P", bus=400, interrupting="65 kA", extra="") + PANEL.format(
        id="M", bus=400, interrupting="65 kA", extra=""
    )
    second_run = """
[[run]]
id = "RM"
from = "T"
to = "M"
length = "50 ft"
conductors = "250 kcmil Cu"
insulation = "75 degC"
raceway = "pvc"
ground = "4 AWG Cu"
device = "250 A"
"""
    base = wye_job(length="50 ft", panels=panels + second_run)
    motor = '\n[[motor]]\nid = "AHU"\npanel = "M"\nfull_load = "40 A"\n'
    without = node(check_json(base), "P")
    with_motor = node(check_json(base + motor), "P")
    assert with_motor["fault_motor_a"] == pytest.approx(4 * 40.0, rel=1e-12)
    assert with_motor["fault_max_a"] - without["fault_max_a"] == pytest.approx(160.0)


def test_raceway_return_path_is_flagged(check_json):
    """Issue 12 minor: a run with no grounding conductor in steel conduit relies on the
    raceway as the return path (NFPA 70-2023 250.118): warned, rule named."""
    text = (
        wye_job()
        .replace('ground = "4 AWG Cu"\n', "")
        .replace('raceway = "pvc"', 'raceway = "steel"')
    )
    doc = check_json(text)
    f = finding(doc, "R", "ground-fault return path")
    assert f["status"] == "warn" and f["rule_id"] == "fault-return-raceway"
    assert "phase-size return" in f["note"] and "250.4(A)(5)" in f["note"]
