#!/usr/bin/python3
"""Seconds per epoch of PCD-1 training, emit train against scikit-learn's BernoulliRBM, same data and settings, one run.

small: binarised digits 0-7, split 0 of digits_quality.py (1082 rows x 64 units), 16 hidden, batch 10, 200 epochs.
large: 10 000 invented rows x 784 units (10 prototypes with about 19 % of units on, each unit flipped with
       probability 0.05; numpy.random.default_rng(784)), 500 hidden, batch 100, 3 epochs.
Both sides: learning rate 0.05, PCD with one Gibbs step, one chain per batch row. emit also applies momentum and
weight decay (its defaults; they cost one multiply-add per parameter per batch) and reports its own training time
(no start-up or file reading); scikit-learn's time is fit() around n_iter epochs after a one-epoch warm-up.
CPU seconds per epoch are printed too (all threads), since wall time on a shared machine says more about the other
load than about either program: scikit-learn's is time.process_time() around fit() (it includes OpenBLAS's threads);
emit's is the child process's user + system time minus that of the same command with --epochs 0 (start-up, reading
the data, JIT of the start-up code), divided by the epochs.

Usage: /usr/bin/python3 bench/train/speed.py [EMIT_COMMAND...]
"""
import os, re, resource, subprocess, sys, tempfile, time
import numpy as np
import sklearn
from sklearn.neural_network import BernoulliRBM

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import digits_quality as dq

EMIT = sys.argv[1:] or dq.EMIT


def sklearn_seconds(x, hidden, batch, epochs):
    """(wall, CPU) seconds per epoch."""
    BernoulliRBM(n_components=hidden, batch_size=batch, n_iter=1, learning_rate=0.05, random_state=1).fit(x)
    rbm = BernoulliRBM(n_components=hidden, batch_size=batch, n_iter=epochs, learning_rate=0.05, random_state=1)
    t, c = time.perf_counter(), time.process_time()
    rbm.fit(x)
    return (time.perf_counter() - t) / epochs, (time.process_time() - c) / epochs


def emit_run(path, hidden, batch, epochs, threads, tmp):
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    out = subprocess.run(EMIT + ["train", "--data", path, "--hidden", str(hidden), "--batch", str(batch), "--epochs", str(epochs),
                                 "--learning-rate", "0.05", "--threads", str(threads), "-o", os.path.join(tmp, "m.json"), "--force"],
                         check=True, capture_output=True, text=True).stdout
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    cpu = (after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)
    return float(re.search(r"epoch\(s\) in ([0-9.]+) s", out).group(1)), cpu


def emit_seconds(path, hidden, batch, epochs, threads, tmp):
    """(wall, CPU) seconds per epoch."""
    wall, cpu = emit_run(path, hidden, batch, epochs, threads, tmp)
    _, cpu0 = emit_run(path, hidden, batch, 0, threads, tmp)
    return wall / epochs, (cpu - cpu0) / epochs


def main():
    print(f"scikit-learn {sklearn.__version__}, numpy {np.__version__}, BLAS: {dq.blas()}, {os.cpu_count()} cores")
    x, y = dq.load()
    train, _, _, _ = dq.split(x, y, 0)
    rng = np.random.default_rng(784)
    protos = (rng.random((10, 784)) < 0.19).astype(np.int64)
    large = protos[rng.integers(0, 10, 10000)] ^ (rng.random((10000, 784)) < 0.05).astype(np.int64)
    print(f"load average before: {' '.join(f'{x:.1f}' for x in os.getloadavg())}")
    print("| case | sklearn s/epoch | emit s/epoch, 1 thread | emit s/epoch, 2 threads | sklearn / emit (2 threads) "
          "| sklearn CPU s/epoch | emit CPU s/epoch (2 threads) | CPU ratio |")
    print("|---|---|---|---|---|---|---|---|")
    with tempfile.TemporaryDirectory() as tmp:
        for name, data, hidden, batch, epochs in (("digits 1082 × 64, 16 hidden, batch 10", train, 16, 10, 200),
                                                  ("10 000 × 784, 500 hidden, batch 100", large, 500, 100, 3)):
            path = os.path.join(tmp, "data.csv")
            dq.write_csv(path, data)
            sk, sk_cpu = sklearn_seconds(data.astype(np.float64), hidden, batch, epochs)
            e1, _ = emit_seconds(path, hidden, batch, epochs, 1, tmp)
            e2, e2_cpu = emit_seconds(path, hidden, batch, epochs, 2, tmp)
            print(f"| {name} | {sk:.4f} | {e1:.4f} | {e2:.4f} | {sk / e2:.2f}× | {sk_cpu:.4f} | {e2_cpu:.4f} "
                  f"| {sk_cpu / e2_cpu:.2f}× |", flush=True)
    print(f"load average after: {' '.join(f'{x:.1f}' for x in os.getloadavg())}")


if __name__ == "__main__":
    main()
