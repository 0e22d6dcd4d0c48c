"""Cross-check of whole jobs of the new topologies (issue 14) with pandapower's IEC 60909
three-phase short circuit: a 480Y/277 V service stated by the utility's transformer
feeding a distribution panel, transformers and panels below it (sample job Willow Yard),
and a 13.8 kV primary stated by its short-circuit power feeding the service transformer
directly (sample job Alder Creek). Within 2 % at every three-phase node.

Conversion to pandapower's conventions as in test_fault_pandapower.py (pandapower
documentation, shortcircuit module; IEC 60909-0:2016, K_T off, c divided out): the
utility transformer is a pandapower transformer on an external grid of (near) infinite
short-circuit power; a stated short-circuit power is the external grid's
s_sc_max_mva = c·S_sc; conductors at 20 °C (the maximum case), transformer impedance
at its nameplate value (the job's impedance tolerance set to 0 %), no motors (pandapower
adds no motor contribution to a passive network). The single-phase transformer of the
service job and the panel below it are left out of the pandapower network: a passive
branch does not change the three-phase fault elsewhere.
"""

from __future__ import annotations

import math
import re

import pytest

pp = pytest.importorskip("pandapower")
sc = pytest.importorskip("pandapower.shortcircuit")

from feedcheck.inputs.job_file import read_job  # noqa: E402
from feedcheck.runner import run_job  # noqa: E402
from tests.kernels import ac_impedance_ohm_per_m  # noqa: E402

C = 1.10  # pandapower's c_max (IEC 60909-0:2016 Table 1); divided out below
MV_KV = 12.47  # the utility primary of a service stated by its transformer (any value)


def _job_without_motors_or_tolerance(samples, tmp_path, name):
    text = (samples / name).read_text(encoding="utf-8")
    text = re.sub(r"\[\[motor\]\].*?(?=\n\[\[)", "", text, flags=re.S)
    text += '\n[options]\nimpedance_tolerance = "0 %"\n'
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


def _trafo(net, hv, lv, rating_va, vp, vs, z_pct, x_r):
    pp.create_transformer_from_parameters(
        net, hv, lv, sn_mva=rating_va / 1e6, vn_hv_kv=vp / 1e3, vn_lv_kv=vs / 1e3,
        vkr_percent=z_pct / math.sqrt(1 + x_r**2), vk_percent=z_pct, pfe_kw=0.0,
        i0_percent=0.0, vector_group="Dyn",
    )  # fmt: skip


def _network(job):
    """pandapower network of the job's three-phase nodes; returns (net, node -> bus)."""
    net = pp.create_empty_network(f_hz=60.0)
    src = job.source
    bus = {}
    if src.service is not None:
        t = src.service
        hv = pp.create_bus(net, vn_kv=MV_KV)
        sc_mva = 1e6 if math.isinf(t.primary_sc_va) else t.primary_sc_va / 1e6
        pp.create_ext_grid(net, hv, s_sc_max_mva=C * sc_mva, rx_max=1.0 / t.primary_x_r)
        bus["source"] = pp.create_bus(net, vn_kv=src.voltage.voltage_ll_v / 1e3)
        v = src.voltage.voltage_ll_v
        _trafo(net, hv, bus["source"], t.rating_va, MV_KV * 1e3, v, t.z_pct, t.x_r)
    else:
        bus["source"] = pp.create_bus(net, vn_kv=src.voltage.voltage_ll_v / 1e3)
        s_mva = math.sqrt(3) * src.voltage.voltage_ll_v * src.fault_a / 1e6
        pp.create_ext_grid(net, bus["source"], s_sc_max_mva=C * s_mva, rx_max=1.0 / src.x_r)
    _add_branches(net, job, bus)
    net.trafo["power_station_unit"] = True  # K_T off
    sc.calc_sc(net, fault="3ph", case="max")
    return net, bus


def _add_branches(net, job, bus):
    """The job's runs and transformers below the source bus (three-phase nodes only)."""
    tx = {t.id: t for t in job.transformers}
    tree = job.tree
    for n in tree.order[1:]:
        v = tree.voltage_of[n]
        if v.phases != 3:
            continue
        parent = tree.parent_node[n]
        run = tree.parent_run[n]
        at = bus[parent]
        if run is not None:
            end = pp.create_bus(net, vn_kv=tree.voltage_of[parent].voltage_ll_v / 1e3)
            r, x = ac_impedance_ohm_per_m(run.size.name, run.material, run.raceway, 20.0)
            pp.create_line_from_parameters(
                net, at, end, length_km=run.length_m / 1e3, r_ohm_per_km=float(r) * 1e3,
                x_ohm_per_km=float(x) * 1e3, c_nf_per_km=0.0, max_i_ka=10.0,
                parallel=run.sets,
            )  # fmt: skip
            at = end
        if n in tx:
            t = tx[n]
            bus[n] = pp.create_bus(net, vn_kv=t.secondary.voltage_ll_v / 1e3)
            _trafo(net, at, bus[n], t.rating_va, t.primary.voltage_ll_v, t.secondary.voltage_ll_v,
                   t.z_pct, t.x_r)  # fmt: skip
        else:
            bus[n] = at


@pytest.mark.parametrize(
    ("name", "expect_nodes"),
    [
        ("willow_yard_service.toml", {"source", "MDP", "T1", "LP1"}),
        ("alder_pump_station_13kv.toml", {"source", "TS", "SWB", "PCP"}),
    ],
)
def test_whole_job_matches_pandapower(samples, tmp_path, name, expect_nodes):
    path = _job_without_motors_or_tolerance(samples, tmp_path, name)
    job = read_job(path)
    assert not job.motors
    net, bus = _network(job)
    ours = {n.id: n.values["fault_max_a"] for n in run_job(path).nodes}
    assert set(bus) == expect_nodes
    for node, b in bus.items():
        theirs = float(net.res_bus_sc.ikss_ka.at[b]) * 1e3 / C
        # issue 14: within 2 % (the brief's tolerance); the two agree much closer
        assert ours[node] == pytest.approx(theirs, rel=0.02), node


def _standby_network(sjob, gen):
    """pandapower network of the standby position: the generator as a pandapower
    ``gen`` (subtransient X"d, R = X"d / (X/R)) at the source bus, its run and the
    job below the transfer switch. IEC 60909-0:2016 eq. (18) multiplies a generator's
    impedance by K_G = c_max / (1 + x"d · sin φ_rG) (U_n = U_rG); with cos φ = 1 this
    is c_max, divided out by giving pandapower the impedance / c_max."""
    net = pp.create_empty_network(f_hz=60.0)
    v = gen.voltage.voltage_ll_v
    bus = {"source": pp.create_bus(net, vn_kv=v / 1e3)}
    x_ohm = gen.xdss_pct / 100 * v**2 / gen.rating_va
    pp.create_gen(
        net, bus["source"], p_mw=0.0, vm_pu=1.0, sn_mva=gen.rating_va / 1e6, vn_kv=v / 1e3,
        xdss_pu=gen.xdss_pct / 100 / C, rdss_ohm=x_ohm / gen.x_r / C, cos_phi=1.0,
        slack=True,
    )  # fmt: skip
    _add_branches(net, sjob, bus)
    net.trafo["power_station_unit"] = True  # K_T off
    sc.calc_sc(net, fault="3ph", case="max")
    return net, bus


def test_standby_position_matches_pandapower(samples, tmp_path):
    # issue 14 item 4: the standby position's three-phase faults (generator through its
    # run and the transfer switch) within 2 % of pandapower's IEC 60909 figures
    from feedcheck.checks.standby import standby_job

    path = _job_without_motors_or_tolerance(samples, tmp_path, "willow_yard_standby.toml")
    job = read_job(path)
    assert job.generator is not None and not job.motors
    net, bus = _standby_network(standby_job(job), job.generator)
    nodes = {n.id: n.values for n in run_job(path).nodes}
    assert set(bus) == {"source", "MDP", "T1", "LP1"}
    for node, b in bus.items():
        if node == "source":
            continue  # the utility's point, not on the standby feed
        theirs = float(net.res_bus_sc.ikss_ka.at[b]) * 1e3 / C
        assert nodes[node]["standby_fault_max_a"] == pytest.approx(theirs, rel=0.02), node
        # the generator is the weaker source here: the normal position governs the maximum
        assert nodes[node]["fault_max_governs"] == "normal", node
    # at the generator's terminals pandapower gives the published I_rated / |z"|
    gen = job.generator
    rated = gen.rating_va / (math.sqrt(3) * gen.voltage.voltage_ll_v)
    z_pu = gen.xdss_pct / 100 * math.sqrt(1 + 1 / gen.x_r**2)
    terminals = float(net.res_bus_sc.ikss_ka.at[bus["source"]]) * 1e3 / C
    assert terminals == pytest.approx(rated / z_pu, rel=1e-3)
