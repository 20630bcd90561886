#!/usr/bin/python3
"""Trains the same set of models with two emit builds and compares the model files byte for byte, and the per-epoch
progress lines: for speed work on the trainer, which must not change a model's bits (docs/train.md, "Deterministic").

Data: split 0 of the binarised digits (digits_quality.py; 1082 rows x 64 units), its first 300 rows as validation
rows, and the first 2000 of speed.py's invented 784-unit rows. Cases: kinds rbm, lateral and general; PCD and CD-2;
hidden 5, 16, 30, 37, 130 and 500; batches 10, 17, 33, 64 and 100; with and without validation; 1 and 2 threads.

Usage: /usr/bin/python3 bench/train/same_bits.py "OLD_EMIT_COMMAND" "NEW_EMIT_COMMAND"
  e.g. same_bits.py "dotnet /tmp/old/emit.dll" "dotnet src/Emit.Cli/bin/Release/net10.0/emit.dll"
"""
import os, subprocess, sys, tempfile
import numpy as np

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import digits_quality as dq

CASES = [
    ("def", "small", ["--hidden", "16", "--epochs", "20"]),
    ("cd2", "small", ["--hidden", "16", "--epochs", "8", "--method", "cd", "--gibbs-steps", "2"]),
    ("odd", "small", ["--hidden", "37", "--batch", "17", "--epochs", "6"]),
    ("h5", "small", ["--hidden", "5", "--batch", "33", "--epochs", "6", "--method", "cd"]),
    ("lateral", "small", ["--hidden", "8", "--kind", "lateral", "--epochs", "3"]),
    ("general", "small", ["--hidden", "6", "--kind", "general", "--epochs", "2"]),
    ("val", "small", ["--validation", "VAL", "--hidden", "16", "--epochs", "12", "--patience", "3"]),
    ("val30", "small", ["--validation", "VAL", "--hidden", "30", "--epochs", "4"]),
    ("large", "large", ["--hidden", "500", "--batch", "100", "--epochs", "2"]),
    ("large-cd", "large", ["--hidden", "130", "--batch", "64", "--epochs", "2", "--method", "cd"]),
]


def main():
    old, new = sys.argv[1].split(), sys.argv[2].split()
    x, y = dq.load()
    train, _, _, _ = dq.split(x, y, 0)
    rng = np.random.default_rng(784)
    protos = (rng.random((10, 784)) < 0.19).astype(np.int64)
    large = protos[rng.integers(0, 10, 10000)] ^ (rng.random((10000, 784)) < 0.05).astype(np.int64)
    bad = 0
    with tempfile.TemporaryDirectory() as tmp:
        files = {"small": os.path.join(tmp, "small.csv"), "large": os.path.join(tmp, "large.csv"),
                 "VAL": os.path.join(tmp, "val.csv")}
        dq.write_csv(files["small"], train)
        dq.write_csv(files["large"], large[:2000])
        dq.write_csv(files["VAL"], train[:300])
        for name, data, options in CASES:
            for threads in ("1", "2"):
                outputs = []
                for label, emit in (("old", old), ("new", new)):
                    model = os.path.join(tmp, f"{name}-{threads}-{label}.json")
                    args = [files.get(a, a) for a in options]
                    r = subprocess.run(emit + ["train", "--data", files[data], *args, "--threads", threads, "-o", model,
                                               "--force"], check=True, capture_output=True, text=True)
                    lines = [l for l in r.stdout.splitlines() if "epoch(s) in" not in l]
                    with open(model, "rb") as f:
                        outputs.append((f.read(), lines))
                same = outputs[0] == outputs[1]
                bad += not same
                print(f"{name:9s} threads {threads}: {'same bytes' if same else 'DIFFERENT'}", flush=True)
    print("all models and progress lines the same" if bad == 0 else f"{bad} case(s) differ")
    sys.exit(1 if bad else 0)


if __name__ == "__main__":
    main()
