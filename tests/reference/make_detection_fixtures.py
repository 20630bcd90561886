#!/usr/bin/python3
"""Writes the outside-reference fixtures for Emit's threshold calibration tests (tests/Emit.Tests/Detection).

Run with Debian's python3 (python3-scipy, python3-sklearn):

    /usr/bin/python3 tests/reference/make_detection_fixtures.py [OUTPUT_FOLDER]

OUTPUT_FOLDER defaults to tests/Emit.Tests/Detection/Fixtures. Every expected value comes from scipy or
scikit-learn here, never from Emit:

* clopper_pearson.csv - x, n, confidence, low, high: the exact binomial interval from scipy.stats.beta.ppf,
  low = beta.ppf(alpha/2, x, n-x+1) (0 when x = 0), high = beta.ppf(1-alpha/2, x+1, n-x) (1 when x = n).
* roc_auc.json - cases of normal and anomalous scores (many with ties) and sklearn.metrics.roc_auc_score with the
  anomalies as the positive class.
* detection_versions.json - Python, numpy, scipy and scikit-learn versions, and the SHA-256 of each file.
"""
import hashlib
import json
import os
import platform
import sys

import numpy as np
import scipy
import sklearn
from scipy.stats import beta
from sklearn.metrics import roc_auc_score

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.abspath(sys.argv[1]) if len(sys.argv) > 1 else os.path.join(HERE, "..", "Emit.Tests", "Detection", "Fixtures")
os.makedirs(OUT, exist_ok=True)

CASES = [(0, 1), (1, 1), (0, 10), (1, 10), (5, 10), (9, 10), (10, 10), (0, 100), (3, 100), (50, 100),
         (1, 1000), (999, 1000), (10, 2000), (19, 2000), (0, 20000), (100, 20000), (5, 1000000), (0, 1000000),
         (1, 99), (7, 250), (123, 4567)]
CONFIDENCES = [0.95, 0.99, 0.9]


def clopper_pearson(x, n, conf):
    alpha = 1 - conf
    low = 0.0 if x == 0 else float(beta.ppf(alpha / 2, x, n - x + 1))
    high = 1.0 if x == n else float(beta.ppf(1 - alpha / 2, x + 1, n - x))
    return low, high


lines = ["x,n,confidence,low,high"]
for conf in CONFIDENCES:
    for x, n in CASES:
        low, high = clopper_pearson(x, n, conf)
        lines.append(f"{x},{n},{conf!r},{low!r},{high!r}")
with open(os.path.join(OUT, "clopper_pearson.csv"), "w", encoding="ascii", newline="\n") as f:
    f.write("\n".join(lines) + "\n")

rng = np.random.default_rng(20261202)
cases = []
for normal_n, anomaly_n, shift, decimals in [(5, 5, 1.0, 0), (20, 7, 0.5, 1), (50, 50, 0.0, 1), (200, 40, 1.5, 2),
                                              (1000, 300, 0.8, 1), (3, 1, 2.0, 0), (1, 3, -1.0, 0), (100, 100, 0.3, 0)]:
    normal = np.round(rng.normal(0.0, 1.0, normal_n), decimals)
    anomalies = np.round(rng.normal(shift, 1.0, anomaly_n), decimals)
    y = np.concatenate([np.zeros(normal_n), np.ones(anomaly_n)])
    s = np.concatenate([normal, anomalies])
    cases.append({"normal": normal.tolist(), "anomalies": anomalies.tolist(), "roc_auc": float(roc_auc_score(y, s))})
# every score equal: the curve is the diagonal, area one half
cases.append({"normal": [2.0] * 4, "anomalies": [2.0] * 3, "roc_auc": float(roc_auc_score([0] * 4 + [1] * 3, [2.0] * 7))})
with open(os.path.join(OUT, "roc_auc.json"), "w", encoding="ascii", newline="\n") as f:
    json.dump(cases, f)
    f.write("\n")


def sha(name):
    with open(os.path.join(OUT, name), "rb") as f:
        return hashlib.sha256(f.read()).hexdigest()


versions = {
    "python": platform.python_version(),
    "numpy": np.__version__,
    "scipy": scipy.__version__,
    "scikit-learn": sklearn.__version__,
    "files": {name: sha(name) for name in ["clopper_pearson.csv", "roc_auc.json"]},
}
with open(os.path.join(OUT, "detection_versions.json"), "w", encoding="ascii", newline="\n") as f:
    json.dump(versions, f, indent=2, sort_keys=True)
    f.write("\n")
