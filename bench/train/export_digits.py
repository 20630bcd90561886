#!/usr/bin/python3
"""Exports scikit-learn's bundled 8x8 handwritten digits (UCI "Optical Recognition of Handwritten Digits", the copy
shipped with Debian's python3-sklearn) as binary vectors: pixel > 7 is 1 (pixels range 0..16).

Writes digits-binary.csv (header px0..px63, then one 0/1 row per image, in load_digits order) and digits-labels.csv
(one digit per line, same order). Run: /usr/bin/python3 bench/train/export_digits.py
"""
import os
import sklearn
from sklearn.datasets import load_digits

here = os.path.dirname(os.path.abspath(__file__))
d = load_digits()
x = (d.data > 7).astype(int)
with open(os.path.join(here, "digits-binary.csv"), "w", newline="\n") as f:
    f.write(",".join(f"px{i}" for i in range(x.shape[1])) + "\n")
    for row in x:
        f.write(",".join(str(v) for v in row) + "\n")
with open(os.path.join(here, "digits-labels.csv"), "w", newline="\n") as f:
    f.write("label\n")
    for y in d.target:
        f.write(f"{y}\n")
print(f"wrote {x.shape[0]} rows x {x.shape[1]} units (scikit-learn {sklearn.__version__})")
