#!/usr/bin/env python3
"""Times numpy's free energy on the files Emit.Bench wrote, and cross-checks the values.

F(v) = -v.b - sum_j logaddexp(0, c_j + (v W)_j), batched as V @ W (numpy from Debian's python3-numpy).
Usage: python3 bench/numpy_reference.py OUTDIR
"""
import json
import sys
import time

import numpy as np

d = sys.argv[1]
m = json.load(open(f"{d}/model-784x500.json"))
W = np.array(m["weights"], dtype=np.float64)
b = np.array(m["visible_bias"], dtype=np.float64)
c = np.array(m["hidden_bias"], dtype=np.float64)
V = np.loadtxt(f"{d}/vectors.csv", delimiter=",", dtype=np.float64)


def free_energy(V):
    return -(V @ b) - np.logaddexp(0.0, V @ W + c).sum(axis=1)


free_energy(V)  # warm-up
best = float("inf")
for _ in range(5):
    t0 = time.perf_counter()
    free_energy(V)
    best = min(best, time.perf_counter() - t0)
ours = np.loadtxt(f"{d}/reference-free-energy.txt")
ref = free_energy(V)
rel = np.max(np.abs(ours - ref) / np.maximum(1.0, np.abs(ref)))
print(f"numpy {np.__version__} vectors={len(V)} best_seconds={best:.4f} vectors_per_second={len(V) / best:.0f} "
      f"max_rel_diff_vs_emit={rel:.3e}")
