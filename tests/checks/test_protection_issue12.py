"""Issue 12, protection: unsafe designs that passed now fail, naming the rule and the fix.

Panelboard protection (NFPA 70-2023 408.36), feeders without a device and the tap rules
they may be built under (240.21, 240.21(B)(1), (B)(2), (C)(2), (C)(6)), supply-side bonding
jumper and grounded conductor of a separately derived system (250.30(A)(2), (A)(3), Table
250.102(C)(1)), and the verified "next size that passes".
"""

from __future__ import annotations

import json

import pytest
from click.testing import CliRunner

from feedcheck.cli import main
from tests.checks.jobs import finding

# An invented feed: 112.5 kVA 480 V delta → 208Y/120 V, a 400 A distribution panel MDP,
# and one run R from MDP to a panel LP whose details each test sets.
FEED = """
[project]
name = "issue 12 protection test (invented)"

[source]
voltage = "480 V delta"
available_fault = "infinite"

[[transformer]]
id = "T"
rating = "112.5 kVA"
primary = "480 V delta"
secondary = "208Y/120 V"
impedance = "5 %"
x_r = 4
primary_device = "175 A"
secondary_device = "400 A"

[[run]]
id = "S"
from = "T"
to = "MDP"
length = "10 ft"
conductors = "600 kcmil Cu"
insulation = "75 degC"
raceway = "pvc"
ground = "3 AWG Cu"
device = "400 A"

[[panel]]
id = "MDP"
rating = "400 A"
main_device = "400 A"
interrupting = "65 kA"
load = "10 kVA"

[[run]]
id = "R"
from = "MDP"
to = "LP"
length = "{length}"
conductors = "{conductors}"
insulation = "75 degC"
raceway = "pvc"
ground = "{ground}"
{run_extra}

[[panel]]
id = "LP"
rating = "{bus} A"
{main}
interrupting = "65 kA"
load = "{load} kVA"
"""


def feed(
    length="50 ft",
    conductors="3/0 AWG Cu",
    ground="6 AWG Cu",
    run_extra="",
    bus=200,
    main="",
    load=20,
) -> str:
    return FEED.format(
        length=length,
        conductors=conductors,
        ground=ground,
        run_extra=run_extra,
        bus=bus,
        main=main,
        load=load,
    )


def check(write_job, text: str) -> tuple[int, dict]:
    res = CliRunner().invoke(main, ["check", str(write_job(text)), "--format", "json"])
    assert res.exit_code in (0, 1), res.output
    return res.exit_code, json.loads(res.stdout)


def checks_of(doc: dict, subject: str) -> dict[str, dict]:
    return {f["check"]: f for f in doc["findings"] if f["subject"] == subject}


# ----------------------------------------------------------------- 408.36
def test_main_lugs_100a_panel_on_200a_feeder_fails(write_job):
    """Issue 12 item 2. NFPA 70-2023 408.36: a panelboard protected by an overcurrent
    device rated not greater than the panelboard; main lugs 100 A fed through a 200 A
    device → fail, naming the rule and the fix."""
    code, doc = check(write_job, feed(run_extra='device = "200 A"', bus=100))
    f = finding(doc, "LP", "bus protection")
    assert (f["status"], f["rule_id"], f["value"], f["limit"]) == (
        "fail",
        "panel-bus-protection",
        200.0,
        100.0,
    )
    assert "main device" in f["note"]
    assert code == 1


def test_main_lugs_panel_on_a_device_within_its_rating_passes(write_job):
    # NFPA 70-2023 408.36: 100 A device on a 100 A bus meets "not greater than"
    _, doc = check(
        write_job,
        feed(conductors="3 AWG Cu", ground="8 AWG Cu", run_extra='device = "100 A"', bus=100),
    )
    assert finding(doc, "LP", "bus protection")["status"] == "ok"


def test_main_device_above_bus_fails_without_a_load(write_job):
    # NFPA 70-2023 408.36: checked whether or not the panel has a load
    _, doc = check(
        write_job,
        feed(run_extra='device = "200 A"', bus=100, main='main_device = "200 A"', load=0).replace(
            'load = "0 kVA"', ""
        ),
    )
    f = finding(doc, "LP", "main device vs bus")
    assert (f["status"], f["rule_id"]) == ("fail", "panel-main-bus")


# ----------------------------------------------------------------- 240.21
# terminals marked 75 °C (else 110.14(C)(1)(a) takes the 60 °C column at 100 A and less)
TAP75 = 'termination = "75 degC"\n'


def test_feeder_without_device_fails(write_job):
    """Issue 12 item 3. NFPA 70-2023 240.21: protection where the conductors receive
    their supply; a panel-to-main-lugs run with no device and no tap rule fails."""
    code, doc = check(write_job, feed())
    f = finding(doc, "R", "overcurrent protection")
    assert (f["status"], f["rule_id"]) == ("fail", "feeder-unprotected")
    assert "tap_rule" in f["note"]
    assert finding(doc, "LP", "bus protection")["status"] == "fail"  # 400 A MDP main
    assert code == 1


def test_ten_foot_tap_meeting_every_condition_passes(write_job):
    """NFPA 70-2023 240.21(B)(1): ≤ 10 ft; ampacity ≥ the device at its termination
    (100 A main) and ≥ 1/10 of the 400 A feeder device (40 A). 3 AWG Cu at 75 °C: 100 A
    (NFPA 70-2023 Table 310.16)."""
    _, doc = check(
        write_job,
        feed(
            length="8 ft",
            conductors="3 AWG Cu",
            ground="8 AWG Cu",
            run_extra=TAP75 + 'tap_rule = "10 ft"',
            bus=100,
            main='main_device = "100 A"',
        ),
    )
    r = checks_of(doc, "R")
    assert r["tap length (10 ft rule)"]["status"] == "ok"
    f = r["tap ampacity vs feeder device (10 ft rule)"]
    assert f["limit"] == pytest.approx(400 * 0.10)  # 240.21(B)(1)(4): one-tenth
    assert f["status"] == "ok"
    assert r["tap ends in one device"]["status"] == "ok"
    assert "overcurrent protection" not in r
    assert finding(doc, "LP", "main device vs bus")["status"] == "ok"


def test_ten_foot_tap_too_long_fails(write_job):
    # NFPA 70-2023 240.21(B)(1): not over 3 m (10 ft); 12 ft fails
    _, doc = check(
        write_job,
        feed(
            length="12 ft",
            conductors="3 AWG Cu",
            ground="8 AWG Cu",
            run_extra=TAP75 + 'tap_rule = "10 ft"',
            bus=100,
            main='main_device = "100 A"',
        ),
    )
    f = checks_of(doc, "R")["tap length (10 ft rule)"]
    assert (f["status"], f["rule_id"]) == ("fail", "tap-10ft")
    assert f["limit"] == pytest.approx(3.05)


def test_twenty_five_foot_tap_below_one_third_fails(write_job):
    """NFPA 70-2023 240.21(B)(2)(1): ampacity ≥ 1/3 of the feeder device: 400/3 =
    133.3 A; 3 AWG Cu carries 100 A at 75 °C (Table 310.16) → fail."""
    _, doc = check(
        write_job,
        feed(
            length="20 ft",
            conductors="3 AWG Cu",
            ground="8 AWG Cu",
            run_extra=TAP75 + 'tap_rule = "25 ft"',
            bus=100,
            main='main_device = "100 A"',
        ),
    )
    f = checks_of(doc, "R")["tap ampacity vs feeder device (25 ft rule)"]
    assert f["limit"] == pytest.approx(400 / 3)
    assert (f["status"], f["rule_id"]) == ("fail", "tap-25ft-ratio")


def test_twenty_five_foot_tap_to_main_lugs_fails(write_job):
    """NFPA 70-2023 240.21(B)(2)(2): the tap ends in a single device limiting the load to
    its ampacity. 1/0 Cu: 150 A at 75 °C (Table 310.16) ≥ 133.3 A, but main lugs → fail;
    the 150 A bus is then protected only by the 400 A feeder device (408.36)."""
    _, doc = check(
        write_job,
        feed(
            length="20 ft",
            conductors="1/0 AWG Cu",
            ground="6 AWG Cu",
            run_extra=TAP75 + 'tap_rule = "25 ft"',
            bus=150,
        ),
    )
    r = checks_of(doc, "R")
    assert r["tap ampacity vs feeder device (25 ft rule)"]["status"] == "ok"
    f = r["tap ends in one device"]
    assert (f["status"], f["rule_id"]) == ("fail", "tap-25ft-end-device")
    assert finding(doc, "LP", "bus protection")["value"] == 400.0


def test_tap_rule_on_a_run_with_a_device_is_an_input_error(write_job):
    res = CliRunner().invoke(
        main,
        [
            "check",
            str(write_job(feed(run_extra='device = "200 A"\ntap_rule = "10 ft"'))),
            "--format",
            "json",
        ],
    )
    assert res.exit_code == 2
    assert "tap_rule" in res.output


def test_unknown_tap_rule_is_an_input_error(write_job):
    res = CliRunner().invoke(
        main, ["check", str(write_job(feed(run_extra='tap_rule = "50 ft"'))), "--format", "json"]
    )
    assert res.exit_code == 2
    assert "run[2].tap_rule" in res.output


# ------------------------------------------ transformer secondary: one consistent rule
SECONDARY = """
[project]
name = "secondary conductors (invented)"

[source]
voltage = "480 V delta"
available_fault = "infinite"

[[transformer]]
id = "T"
rating = "75 kVA"
primary = "480 V delta"
secondary = "208Y/120 V"
impedance = "5 %"
x_r = 3
primary_device = "{pdev} A"
{sdev}

[[run]]
id = "S"
from = "T"
to = "P"
length = "{length}"
conductors = "{conductors}"
sets = {sets}
insulation = "75 degC"
raceway = "pvc"
ground = "4 AWG Cu"
{extra}

[[panel]]
id = "P"
rating = "225 A"
main_device = "{main} A"
interrupting = "65 kA"
load = "{load} kVA"
"""


def secondary(
    pdev=100, sdev="", length="8 ft", conductors="4/0 AWG Cu", sets=1, extra="", main=200, load=40
) -> str:
    return SECONDARY.format(
        pdev=pdev,
        sdev=sdev,
        length=length,
        conductors=conductors,
        sets=sets,
        extra=extra,
        main=main,
        load=load,
    )


def test_secondary_without_any_device_or_declared_rule_fails(write_job):
    # NFPA 70-2023 240.21(C): only the arrangements (C)(1)-(C)(6); none declared → fail
    _, doc = check(write_job, secondary())
    f = finding(doc, "S", "secondary conductor protection")
    assert (f["status"], f["rule_id"]) == ("fail", "xfmr-secondary-unprotected")
    assert "transformer secondary 10 ft" in f["note"]


def test_secondary_declared_ten_foot_rule_is_checked(write_job):
    """NFPA 70-2023 240.21(C)(2): 4/0 Cu 230 A at 75 °C (Table 310.16) ≥ the 200 A main
    it ends in and ≥ 100 A × 480/208 / 10 = 23.1 A."""
    _, doc = check(
        write_job,
        secondary(
            extra='tap_rule = "transformer secondary 10 ft"\nbonding_jumper = "2 AWG Cu"\n'
            'neutral = "2 AWG Cu"'
        ),
    )
    s = checks_of(doc, "S")
    f = s["secondary conductors (10 ft arrangement)"]
    assert f["limit"] == pytest.approx(200.0)
    assert f["status"] == "ok"
    assert s["secondary conductors end in one device"]["status"] == "ok"
    assert "secondary conductor protection" not in s


def test_secondary_device_is_one_device_for_every_check(write_job):
    """The stated rule: the transformer's secondary_device, with no run device and no tap
    rule, protects the run at the transformer; the run is checked as a feeder against it
    (240.4, 250.122) and the 240.21(C) arrangement is not applied; the instantaneous-trip
    check uses the same device."""
    _, doc = check(write_job, secondary(sdev='secondary_device = "250 A"'))
    s = checks_of(doc, "S")
    assert s["secondary conductor protection"]["status"] == "info"
    assert s["device protects conductors"]["value"] == 250.0
    assert not any(c.startswith("secondary conductors (") for c in s)
    trip = finding(doc, "P", "ground fault trips instantaneously")
    assert "250 A" in trip["note"]


# ----------------------------------------------------------- 250.30(A)(2), (A)(3)
@pytest.mark.parametrize(("jumper", "status"), [("4 AWG Cu", "fail"), ("2 AWG Cu", "ok")])
def test_supply_side_bonding_jumper_of_4_0_secondary(write_job, jumper, status):
    """Issue 12 item 9. NFPA 70-2023 250.30(A)(2), Table 250.102(C)(1): 4/0 AWG Cu
    (211.6 kcmil) is in the row "over 3/0 through 350" → 2 AWG Cu (66.36 kcmil, NFPA 70
    Ch. 9 Table 8); a 4 AWG jumper (41.74 kcmil) fails."""
    _, doc = check(
        write_job,
        secondary(extra=f'tap_rule = "transformer secondary 10 ft"\nbonding_jumper = "{jumper}"'),
    )
    f = finding(doc, "S", "supply-side bonding jumper")
    assert f["limit"] == pytest.approx(66.36, rel=1e-3)
    assert (f["status"], f["rule_id"]) == (status, "sds-bonding-jumper")
    if status == "fail":
        assert "2 AWG" in f["note"]


def test_absent_jumper_and_neutral_reported_with_the_required_size(write_job):
    _, doc = check(write_job, secondary(extra='tap_rule = "transformer secondary 10 ft"'))
    for what in ("supply-side bonding jumper", "grounded conductor"):
        f = finding(doc, "S", what)
        assert f["status"] == "info"
        assert "2 AWG" in f["note"]  # NFPA 70-2023 Table 250.102(C)(1), as above


def test_grounded_conductor_too_small_fails(write_job):
    # NFPA 70-2023 250.30(A)(3)(a): grounded conductor not smaller than Table 250.102(C)(1)
    _, doc = check(
        write_job, secondary(extra='tap_rule = "transformer secondary 10 ft"\nneutral = "4 AWG Cu"')
    )
    f = finding(doc, "S", "grounded conductor")
    assert (f["status"], f["rule_id"]) == ("fail", "sds-grounded-conductor")


def test_parallel_grounded_conductors_at_least_1_0(write_job):
    """NFPA 70-2023 250.30(A)(3)(b) and 310.10(G): 2 sets of 3/0 Cu in two raceways,
    each raceway's neutral by Table 250.102(C)(1) (3/0 → 4 AWG) but not below 1/0."""
    _, doc = check(
        write_job,
        secondary(
            pdev=175,
            conductors="3/0 AWG Cu",
            sets=2,
            main=225,
            extra='tap_rule = "transformer secondary 10 ft"\nneutral = "2 AWG Cu"',
        ),
    )
    f = finding(doc, "S", "grounded conductor")
    assert f["limit"] == pytest.approx(105.6, rel=1e-3)  # 1/0 AWG, NFPA 70 Ch. 9 Table 8
    assert f["status"] == "fail"


def test_run_with_a_device_gets_no_bonding_jumper_sizing(write_job):
    _, doc = check(write_job, secondary(extra='device = "225 A"'))
    assert "supply-side bonding jumper" not in checks_of(doc, "S")


# -------------------------------------------------------------- next size, verified
def test_suggested_size_passes_every_check_when_substituted(write_job):
    """Issue 12 minor item. 40 kVA at 208 V: 111 A; smallest by load: 2 AWG Cu (115 A at
    75 °C, NFPA 70-2023 Table 310.16). The declared 25 ft secondary arrangement needs
    225 A × 480/208 / 3 = 173.1 A (240.21(C)(6)(1)) → 2/0 Cu (175 A). The suggestion must
    be the size with which the run passes; substituting it, every run check passes."""
    extra = (
        'tap_rule = "transformer secondary 25 ft"\nbonding_jumper = "2 AWG Cu"\n'
        'neutral = "2 AWG Cu"'
    )
    _, doc = check(
        write_job, secondary(pdev=225, length="20 ft", conductors="4 AWG Cu", extra=extra, main=125)
    )
    f = finding(doc, "S", "allowable ampacity vs load")
    assert f["status"] == "fail"
    assert "2/0 AWG Cu" in f["note"]
    _, fixed = check(
        write_job,
        secondary(pdev=225, length="20 ft", conductors="2/0 AWG Cu", extra=extra, main=125),
    )
    bad = [
        (c, x["status"])
        for c, x in checks_of(fixed, "S").items()
        if x["status"] == "fail" and not c.startswith("voltage")
    ]
    assert bad == []


def test_feeder_tap_rule_on_secondary_conductors_fails(write_job):
    # NFPA 70-2023 240.21(B) covers taps from a feeder; transformer secondary conductors
    # are under 240.21(C) (the feeder-tap fractions do not apply to them)
    _, doc = check(write_job, secondary(extra='tap_rule = "10 ft"'))
    f = finding(doc, "S", "overcurrent protection")
    assert (f["status"], f["rule_id"]) == ("fail", "feeder-unprotected")
    assert "transformer secondary 10 ft" in f["note"]


# ------------------------------------------------- instantaneous trip behind a tap
def test_tap_panel_trip_check_held_against_the_feeder_device(write_job):
    """A ground fault at the end of a 10 ft tap is cleared by the device the tap is
    taken from (NFPA 70-2023 240.21(B): the tap has no device at its supply), so the
    instantaneous-trip check of LP uses MDP's 400 A main, not nothing. Pick-up = 400 A ×
    the typical multiple of tables/instantaneous_pickup.csv × (1 + its tolerance)
    (common practice, no source: the multiple and tolerance are read from the row cited)."""
    _, doc = check(
        write_job,
        feed(
            length="8 ft",
            conductors="3 AWG Cu",
            ground="8 AWG Cu",
            run_extra=TAP75 + 'tap_rule = "10 ft"',
            bus=100,
            main='main_device = "100 A"',
        ),
    )
    f = finding(doc, "LP", "ground fault trips instantaneously")
    assert f["status"] in ("ok", "warn")
    assert "R is a tap" in f["note"] and "400 A" in f["note"]
    from feedcheck.rulebook import current_rulebook

    row = next(
        r for r in current_rulebook().rows("instantaneous_pickup") if r["rule_id"] == f["rule_id"]
    )
    assert f["limit"] == pytest.approx(400 * row["multiple"] * (1 + row["tolerance_pct"] / 100))


def test_secondary_conductors_without_device_trip_check_not_evaluated(write_job):
    """Never "ok" for a check that cannot be evaluated: transformer secondary conductors
    with no device at the transformer (NFPA 70-2023 240.21(C)(2)) leave no device on the
    panel's feed whose instantaneous trip could be checked — an info finding says so."""
    text = feed(bus=400, main='main_device = "400 A"', load=20)
    text = text.replace('secondary_device = "400 A"\n', "").replace(
        'device = "400 A"\n\n[[panel]]\nid = "MDP"',
        'tap_rule = "transformer secondary 10 ft"\n\n[[panel]]\nid = "MDP"',
    )
    _, doc = check(write_job, text)
    f = finding(doc, "MDP", "ground fault trips instantaneously")
    assert (f["status"], f["rule_id"]) == ("info", "inst-trip-not-evaluated")
    assert f["value"] is None and f["note"].startswith("not evaluated")
