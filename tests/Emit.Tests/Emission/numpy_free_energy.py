"""Free energy of binary inputs computed with numpy (an implementation independent of emit), for cross-checks.

F(v) = -b.v - sum_{i<j} L_ij v_i v_j - log sum_h exp(h.(c + W^T v) + sum_{k<l} M_kl h_k h_l); for models without
hidden links the hidden sum factorises into sum_j logaddexp(0, a_j) (numpy.logaddexp computes log(e^x + e^y) stably).
Usage: python3 numpy_free_energy.py MODEL.json VECTORS.txt  (one input per line, '0'/'1' per unit)
"""
import json
import sys

import numpy as np

model = json.load(open(sys.argv[1], encoding="utf-8"))
V, H, kind = model["visible"], model["hidden"], model["kind"]
b = np.array(model["visible_bias"], dtype=np.float64)
c = np.array(model["hidden_bias"], dtype=np.float64)
W = np.array(model["weights"], dtype=np.float64).reshape(V, H)
L = np.zeros((V, V))
for i, j, w in model.get("visible_links", []):
    L[i, j] = w
M = np.zeros((H, H))
for i, j, w in model.get("hidden_links", []):
    M[i, j] = w
if kind == "general":
    states = ((np.arange(2 ** H)[:, None] >> np.arange(H)) & 1).astype(np.float64)

for line in open(sys.argv[2], encoding="ascii"):
    v = np.array([float(ch) for ch in line.strip()])
    linear = b @ v + v @ L @ v
    a = c + v @ W
    if kind == "general":
        scores = states @ a + np.einsum("si,ij,sj->s", states, M, states)
        f = -linear - np.logaddexp.reduce(scores)
    else:
        f = -linear - np.sum(np.logaddexp(0.0, a))
    print(repr(float(f)))
