"""Cross-check of the line-to-ground maximum and minimum on a delta–wye feed with
pandapower's IEC 60909 single-phase short circuit (general-purpose library from PyPI).

Built as tests/reference/test_fault_pandapower.py builds its three-phase cross-check:
external grid s_sc = c·√3·V·I_sc with rx = R/X (its zero sequence is blocked by the
delta, so x0x/r0x0 do not matter); transformer vk/vkr from %Z and X/R with the case's
tolerance applied, vector group Dyn, zero sequence vk0 = ratio·vk and vkr0 = ratio·vkr
(the Z0 = ratio·Z1 model), magnetising zero-sequence impedance made very large, K_T off
(power_station_unit); lines in Ω/km with c = c0 = 0, r0 = r + 3·r_return,
x0 = x + 3·x_return (one return conductor), the case's conductor temperature already in
r (endtemp_degree = 20 °C so pandapower adds no correction); f_hz = 60; calc_sc(fault="1ph",
case="max"/"min"); res_bus_sc.ikss_ka divided by pandapower's c (lv_tol_percent=10: c_max 1.10,
c_min 0.90, IEC 60909-0:2016 Table 1 for low-voltage systems with +10 % tolerance).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

pp = pytest.importorskip("pandapower")
sc = pytest.importorskip("pandapower.shortcircuit")

from feedcheck.calc import fault as F  # noqa: E402
from feedcheck.calc.fault_duty import fault_lg_delta_wye_a  # noqa: E402
from tests.kernels import ac_impedance_ohm_per_m  # noqa: E402

C = {"max": 1.10, "min": 0.90}  # IEC 60909-0:2016 Table 1, LV, +10 % tolerance systems


def _pandapower_lg(case, vp, vs, kva, z_pct, x_r, z0_ratio, src_a, src_xr, runs):
    net = pp.create_empty_network(f_hz=60.0)
    b_hv = pp.create_bus(net, vn_kv=vp / 1e3)
    b_lv = pp.create_bus(net, vn_kv=vs / 1e3)
    s_sc = C[case] * math.sqrt(3) * vp * src_a / 1e6
    pp.create_ext_grid(
        net,
        b_hv,
        s_sc_max_mva=s_sc,
        s_sc_min_mva=s_sc,
        rx_max=1 / src_xr,
        rx_min=1 / src_xr,
        x0x_max=1.0,
        r0x0_max=0.1,
        x0x_min=1.0,
        r0x0_min=0.1,
    )
    vkr = z_pct / math.sqrt(1 + x_r**2)
    pp.create_transformer_from_parameters(
        net,
        b_hv,
        b_lv,
        sn_mva=kva / 1e6,
        vn_hv_kv=vp / 1e3,
        vn_lv_kv=vs / 1e3,
        vkr_percent=vkr,
        vk_percent=z_pct,
        pfe_kw=0.0,
        i0_percent=0.0,
        vector_group="Dyn",
        vk0_percent=z0_ratio * z_pct,
        vkr0_percent=z0_ratio * vkr,
        mag0_percent=1e9,
        mag0_rx=0.0,
        si0_hv_partial=0.9,
    )
    net.trafo["power_station_unit"] = True
    prev = b_lv
    for length_m, r, x, rr, xr_, sets in runs:
        b = pp.create_bus(net, vn_kv=vs / 1e3)
        pp.create_line_from_parameters(
            net,
            prev,
            b,
            length_km=length_m / 1e3,
            r_ohm_per_km=r * 1e3,
            x_ohm_per_km=x * 1e3,
            c_nf_per_km=0.0,
            r0_ohm_per_km=(r + 3 * rr) * 1e3,
            x0_ohm_per_km=(x + 3 * xr_) * 1e3,
            c0_nf_per_km=0.0,
            max_i_ka=1.0,
            parallel=sets,
            endtemp_degree=20.0,
        )
        prev = b
    sc.calc_sc(net, fault="1ph", case=case, lv_tol_percent=10)
    return net.res_bus_sc.ikss_ka.to_numpy()[1:] * 1e3 / C[case]


@pytest.mark.parametrize("case", ["max", "min"])
@pytest.mark.parametrize(
    ("kva", "z_pct", "x_r", "src_a", "src_xr", "runs"),
    [
        # 75 kVA 480 V delta – 208Y/120 V; 95 ft 4/0 Cu (6 AWG Cu EGC) in steel, then 60 ft
        # 2 AWG Cu (8 AWG EGC) in PVC
        (
            75e3,
            5.1,
            3.5,
            30e3,
            6.0,
            [(28.956, "4/0 AWG", "6 AWG", "steel", 1), (18.288, "2 AWG", "8 AWG", "pvc", 1)],
        ),
        # 300 kVA, two parallel sets of 500 kcmil Cu with a 2 AWG EGC in each raceway, 20 ft
        (300e3, 4.5, 5.0, 65e3, 10.0, [(6.096, "500 kcmil", "2 AWG", "steel", 2)]),
        # 45 kVA with an aluminium feeder and aluminium EGC
        (45e3, 3.8, 1.5, 14e3, 4.0, [(45.0, "1/0 AWG", "4 AWG", "aluminum", 1)]),
    ],
)
def test_lg_matches_pandapower(case, kva, z_pct, x_r, src_a, src_xr, runs):
    """IEC 60909-0:2016 7.1.3 (I_k1 = √3·c·U_n/|Z1 + Z2 + Z0|) as implemented by
    pandapower against fault_lg_delta_wye_a at every bus, max and min, within 2 %."""
    vp, vs = 480.0, 208.0
    tol = 7.5  # IEEE C57.12.00-2021 clause 9
    z_ratio = {"max": 0.85, "min": 1.0}[case]  # Z0/Z1 rule rows (common practice)
    temp = {"max": 20.0, "min": 75.0}[case]
    z_case = z_pct * (1 - tol / 100 if case == "max" else 1 + tol / 100)
    data = []
    for length_m, size, ground, raceway, sets in runs:
        material = "al" if raceway == "aluminum" else "cu"
        r, x = ac_impedance_ohm_per_m(size, material, raceway, conductor_c=temp)
        rr, xr_ = ac_impedance_ohm_per_m(ground, material, raceway, conductor_c=temp)
        data.append((length_m, float(r), float(x), float(rr), float(xr_), sets))
    expected = _pandapower_lg(case, vp, vs, kva, z_case, x_r, z_ratio, src_a, src_xr, data)

    zs = F.refer_impedance_ohm(F.source_impedance_ohm(vp, src_a, src_xr), vp, vs)
    zmax, zmin = F.transformer_fault_impedances_ohm(kva, vs, z_pct, x_r, tolerance_pct=tol)
    zt = zmax if case == "max" else zmin
    zp = np.cumsum([0j] + [L * (r + 1j * x) / n for L, r, x, _, _, n in data])
    zr = np.cumsum([0j] + [L * (rr + 1j * xr_) / n for L, _, _, rr, xr_, n in data])
    got = fault_lg_delta_wye_a(vs / math.sqrt(3), zs, zt, z_ratio, zp, zr)
    np.testing.assert_allclose(got, expected, rtol=0.02)
    # the brief asks for 2 %; the two agree far closer (same model, c divided out)
    np.testing.assert_allclose(got, expected, rtol=1e-6)


JOB_LG = """
[project]
name = "issue 12: job-level line-to-ground cross-check (invented)"

[source]
voltage = "480 V delta"
available_fault = "30 kA"
x_r = 6

[[transformer]]
id = "T"
rating = "75 kVA"
primary = "480 V delta"
secondary = "208Y/120 V"
impedance = "5.1 %"
x_r = 3.5
primary_device = "110 A"
secondary_device = "250 A"
{z0}

[[run]]
id = "R1"
from = "T"
to = "P1"
length = "95 ft"
conductors = "4/0 AWG Cu"
insulation = "{insulation} degC"
raceway = "steel"
ground = "6 AWG Cu"
device = "225 A"

[[run]]
id = "R2"
from = "P1"
to = "P2"
length = "60 ft"
conductors = "2 AWG Cu"
insulation = "75 degC"
raceway = "pvc"
ground = "8 AWG Cu"
device = "100 A"

[[panel]]
id = "P1"
rating = "225 A"
interrupting = "22 kA"
load = "20 kVA"

[[panel]]
id = "P2"
rating = "100 A"
interrupting = "10 kA"
load = "10 kVA"
"""


@pytest.mark.parametrize(("z0", "insulation"), [(None, 75), (0.5, 90), (1.4, 60)])
def test_job_lg_max_and_min_match_pandapower(write_job, z0, insulation):
    """The whole feed walk (`feedcheck check`) against pandapower's IEC 60909-0:2016 7.1.3
    single-phase short circuit, max and min, at the secondary and both panels, within 2 %.
    Z0 ratio: rows fault-z0-ratio-max 0.85 / -min 1.0 (common practice) or the job's
    zero_sequence_ratio; minimum conductors at the higher of 75 °C and the insulation's
    rated temperature; ±7.5 % tolerance (IEEE Std C57.12.00-2021 clause 9)."""
    from feedcheck.checks import check_job
    from feedcheck.inputs.job_file import read_job

    text = JOB_LG.format(
        z0="" if z0 is None else f"zero_sequence_ratio = {z0}", insulation=insulation
    )
    res = check_job(read_job(write_job(text)))
    got = {n.id: n.values for n in res.nodes}
    for case in ("max", "min"):
        ratio = z0 if z0 is not None else {"max": 0.85, "min": 1.0}[case]
        temps = [20.0, 20.0] if case == "max" else [max(75.0, insulation), 75.0]
        z_case = 5.1 * (1 - 0.075 if case == "max" else 1 + 0.075)
        data = []
        for (length_ft, size, ground, raceway), temp in zip(
            [(95, "4/0 AWG", "6 AWG", "steel"), (60, "2 AWG", "8 AWG", "pvc")],
            temps,
            strict=True,
        ):
            r, x = ac_impedance_ohm_per_m(size, "cu", raceway, conductor_c=temp)
            rr, xr_ = ac_impedance_ohm_per_m(ground, "cu", raceway, conductor_c=temp)
            data.append((length_ft * 0.3048, float(r), float(x), float(rr), float(xr_), 1))
        expected = _pandapower_lg(case, 480.0, 208.0, 75e3, z_case, 3.5, ratio, 30e3, 6.0, data)
        ours = [got[n][f"fault_lg_{case}_a"] for n in ("T", "P1", "P2")]
        np.testing.assert_allclose(ours, expected, rtol=0.02)
