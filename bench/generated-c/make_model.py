"""Writes the benchmark model (invented data, fixed seed): a 784 x 500 rbm with weights ~ N(0, 0.05), biases ~ N(0, 0.5).

Outputs bench784x500.json (emit's model format) and dense.bin: the same numbers as float32, in the order the
hand-written dense loop reads them (b[784], c[500], then W transposed: for each hidden unit j, W[0..783][j]).
Usage: python3 make_model.py OUTDIR
"""
import json
import os
import random
import struct
import sys

V, H = 784, 500
out = sys.argv[1]
rng = random.Random(784500)
b = [rng.gauss(0.0, 0.5) for _ in range(V)]
c = [rng.gauss(0.0, 0.5) for _ in range(H)]
W = [[rng.gauss(0.0, 0.05) for _ in range(H)] for _ in range(V)]
model = {"format": "emit.model", "version": 1, "kind": "rbm", "visible": V, "hidden": H,
         "visible_bias": b, "hidden_bias": c, "weights": W}
with open(os.path.join(out, "bench784x500.json"), "w", encoding="utf-8") as f:
    json.dump(model, f)
with open(os.path.join(out, "dense.bin"), "wb") as f:
    f.write(struct.pack("<%df" % V, *b))
    f.write(struct.pack("<%df" % H, *c))
    for j in range(H):
        f.write(struct.pack("<%df" % V, *(W[i][j] for i in range(V))))
