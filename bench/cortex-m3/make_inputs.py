"""Writes inputs.h (the first 200 normal and 50 faulty demo rows, packed) and, given dense.bin, dense_model.h.
Usage: python3 make_inputs.py DEMO_DATA_DIR OUTDIR [DENSE_BIN]"""
import os
import struct
import sys

demo, out = sys.argv[1], sys.argv[2]
rows = []
for name, count in (("normal.csv", 200), ("faulty.csv", 50)):
    with open(os.path.join(demo, name), encoding="utf-8") as f:
        rows += [line.strip().split(",") for line in f.readlines()[1:count + 1]]
width = (len(rows[0]) + 7) // 8
lines = ["#define INPUTS %d" % len(rows), "static const uint8_t inputs[INPUTS][%d] = {" % width]
for r in rows:
    packed = [0] * width
    for i, x in enumerate(r):
        if x == "1":
            packed[i >> 3] |= 1 << (i & 7)
    lines.append("    { " + ", ".join("0x%02X" % p for p in packed) + " },")
lines.append("};")
with open(os.path.join(out, "inputs.h"), "w", encoding="ascii") as f:
    f.write("\n".join(lines) + "\n")
if len(sys.argv) > 3:
    V, H = 784, 500
    data = open(sys.argv[3], "rb").read()
    vals = struct.unpack("<%df" % (V + H + V * H), data)
    def block(name, dims, xs):
        return "static const float %s%s = {\n%s\n};\n" % (name, dims, ",\n".join(
            ", ".join("%.9gf" % x for x in xs[k:k + 8]) for k in range(0, len(xs), 8)))
    with open(os.path.join(out, "dense_model.h"), "w", encoding="ascii") as f:
        f.write(block("b", "[%d]" % V, vals[:V]))
        f.write(block("c", "[%d]" % H, vals[V:V + H]))
        w = vals[V + H:]
        rows = ["    { " + ",\n      ".join(", ".join("%.9gf" % x for x in w[j * V + k:j * V + k + 8]) for k in range(0, V, 8)) + " }"
                for j in range(H)]
        f.write("static const float wt[%d][%d] = {\n%s\n};\n" % (H, V, ",\n".join(rows)))
