"""Benchmark: vectorised radial fault walk against a per-node pure-Python loop.

Run on demand: ``python tests/bench/bench_fault_walk.py [nodes]`` (default 10,000).
Builds a random radial feed (parents before children), computes every node's total
impedance and three-phase fault current both ways, asserts they agree, and prints both
times and their ratio.
"""

from __future__ import annotations

import math
import sys
import time

import numpy as np

from feedcheck.calc.fault import cumulative_impedance_ohm, fault_current_3ph_a


def random_feed(n: int, seed: int = 1):
    rng = np.random.default_rng(seed)
    # each node hangs off one of the last few nodes: long branches, depth in the hundreds
    parent = np.empty(n, dtype=np.intp)
    parent[0] = -1
    back = rng.integers(1, 40, size=n)
    parent[1:] = np.maximum(np.arange(1, n) - back[1:], 0)
    branch = rng.uniform(1e-4, 5e-3, n) + 1j * rng.uniform(1e-4, 3e-3, n)
    branch[0] = 0.0086 + 0.0302j  # a transformer-like first branch
    return parent, branch


def python_loop(parent, branch, root, v_ll):
    total = [0j] * len(parent)
    current = [0.0] * len(parent)
    for i, p in enumerate(parent.tolist()):
        z = branch[i] + (root if p < 0 else total[p])
        total[i] = z
        current[i] = v_ll / (math.sqrt(3.0) * abs(z))
    return np.array(total), np.array(current)


def vectorised(parent, branch, root, v_ll):
    z = cumulative_impedance_ohm(parent, branch, root)
    return z, fault_current_3ph_a(v_ll, z)


def best_of(fn, *args, repeat=5):
    best, out = math.inf, None
    for _ in range(repeat):
        t0 = time.perf_counter()
        out = fn(*args)
        best = min(best, time.perf_counter() - t0)
    return best, out


def main(n: int = 10_000) -> None:
    parent, branch = random_feed(n)
    root = 0.0005 + 0.003j
    t_vec, (z_vec, i_vec) = best_of(vectorised, parent, branch, root, 208.0)
    branch_list = branch.tolist()
    t_loop, (z_loop, i_loop) = best_of(python_loop, parent, branch_list, root, 208.0)
    np.testing.assert_allclose(z_vec, z_loop, rtol=1e-12)
    np.testing.assert_allclose(i_vec, i_loop, rtol=1e-12)
    depth = int(cumulative_impedance_ohm(parent, np.ones(n, complex)).real.max())
    print(f"nodes {n:,}, deepest path {depth} nodes; results agree (rtol 1e-12)")
    print(f"vectorised walk  {t_vec * 1e3:9.2f} ms")
    print(f"pure-Python loop {t_loop * 1e3:9.2f} ms")
    print(f"ratio loop/vectorised {t_loop / t_vec:6.1f}")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 10_000)
