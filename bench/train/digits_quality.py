#!/usr/bin/python3
"""Held-out log-likelihood and anomaly ROC AUC on the binarised 8x8 digits: emit train (defaults, --hidden 16 --seed S)
against scikit-learn's BernoulliRBM over a grid, and an independent-units baseline. See docs/benchmarks.md.

Data: bench/train/digits-binary.csv and digits-labels.csv (made by export_digits.py from sklearn.datasets.load_digits).
Normal = digits 0-7, split 75/25 into train/test by numpy.random.default_rng(split).permutation; anomalies = digits 8
and 9, and the normal test rows with 4 units flipped (positions from numpy.random.default_rng(1000 + split)).
Every model is scored by the same exact evaluator here (numpy): log Z = logsumexp over the 2^16 hidden states of
c.h + sum_i softplus(b_i + W_i.h); log p(v) = -F(v) - log Z. ROC AUC from sklearn.metrics.roc_auc_score with the free
energy as the score (higher = more anomalous).

Usage: /usr/bin/python3 bench/train/digits_quality.py [EMIT_COMMAND...]
  (default EMIT_COMMAND: dotnet src/Emit.Cli/bin/Release/net10.0/emit.dll, after dotnet build -c Release)
"""
import json, os, subprocess, sys, tempfile, time
import numpy as np
import sklearn
from sklearn.neural_network import BernoulliRBM
from sklearn.metrics import roc_auc_score
from threadpoolctl import threadpool_info

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(os.path.dirname(HERE))
EMIT = sys.argv[1:] or ["dotnet", os.path.join(ROOT, "src/Emit.Cli/bin/Release/net10.0/emit.dll")]
SPLITS = [0, 1]
SEEDS = [1, 2, 3]
GRID = [(lr, it, bs) for lr in (0.01, 0.05, 0.1) for it in (50, 200) for bs in (10, 50)]


def blas():
    info = [i for i in threadpool_info() if i.get("user_api") == "blas"]
    if not info:
        sys.exit("numpy loaded no BLAS threadpoolctl can see; refusing to compare")
    if any(i.get("internal_api") == "blas" or "libblas" in os.path.basename(i.get("filepath", "")) for i in info):
        sys.exit(f"numpy uses the reference BLAS ({info}); install an optimised one (libopenblas0-pthread) before comparing")
    return ", ".join(f"{i['internal_api']} {i.get('version')} ({os.path.basename(i['filepath'])}, {i.get('num_threads')} threads)" for i in info)


def load():
    x = np.loadtxt(os.path.join(HERE, "digits-binary.csv"), delimiter=",", skiprows=1, dtype=np.int64)
    y = np.loadtxt(os.path.join(HERE, "digits-labels.csv"), skiprows=1, dtype=np.int64)
    return x, y


def split(x, y, s):
    normal = np.flatnonzero(y < 8)
    perm = np.random.default_rng(s).permutation(normal)
    n_train = int(round(0.75 * len(perm)))
    train, test = x[perm[:n_train]], x[perm[n_train:]]
    anomalies = x[y >= 8]
    flipped = test.copy()
    rng = np.random.default_rng(1000 + s)
    for r in range(len(flipped)):
        idx = rng.choice(x.shape[1], 4, replace=False)
        flipped[r, idx] ^= 1
    return train, test, anomalies, flipped


def softplus(z):
    return np.logaddexp(0.0, z)


def free_energy(v, b, c, w):
    return -(v @ b) - softplus(v @ w + c).sum(axis=1)


def log_z(b, c, w):
    nh = len(c)
    h = ((np.arange(2 ** nh)[:, None] >> np.arange(nh)[None, :]) & 1).astype(np.float64)
    s = h @ c + softplus(h @ w.T + b).sum(axis=1)
    m = s.max()
    return m + np.log(np.exp(s - m).sum())


def evaluate(b, c, w, test, anomalies, flipped):
    lz = log_z(b, c, w)
    ll = float(np.mean(-free_energy(test, b, c, w) - lz))
    f_test = free_energy(test, b, c, w)
    auc = []
    for other in (anomalies, flipped):
        f_other = free_energy(other, b, c, w)
        auc.append(roc_auc_score(np.r_[np.zeros(len(f_test)), np.ones(len(f_other))], np.r_[f_test, f_other]))
    return ll, auc[0], auc[1]


def independent(train, test):
    p = (train.sum(axis=0) + 1.0) / (len(train) + 2.0)  # add-one (Laplace) smoothing
    return float(np.mean(test @ np.log(p) + (1 - test) @ np.log(1 - p)))


def write_csv(path, rows):
    with open(path, "w") as f:
        f.write(",".join(f"px{i}" for i in range(rows.shape[1])) + "\n")
        for r in rows:
            f.write(",".join(map(str, r)) + "\n")


def emit_model(train, seed, tmp):
    data = os.path.join(tmp, "train.csv")
    write_csv(data, train)
    out = os.path.join(tmp, f"emit-{seed}.json")
    t = time.perf_counter()
    subprocess.run(EMIT + ["train", "--data", data, "--hidden", "16", "--seed", str(seed), "-o", out, "--force"],
                   check=True, stdout=subprocess.DEVNULL)
    seconds = time.perf_counter() - t
    m = json.load(open(out))
    return np.array(m["visible_bias"]), np.array(m["hidden_bias"]), np.array(m["weights"]), seconds


def main():
    print(f"scikit-learn {sklearn.__version__}, numpy {np.__version__}, BLAS: {blas()}")
    x, y = load()
    results = []
    with tempfile.TemporaryDirectory() as tmp:
        for s in SPLITS:
            train, test, anomalies, flipped = split(x, y, s)
            base = independent(train, test)
            for seed in SEEDS:
                grid = []
                for lr, it, bs in GRID:
                    rbm = BernoulliRBM(n_components=16, learning_rate=lr, n_iter=it, batch_size=bs, random_state=seed)
                    rbm.fit(train.astype(np.float64))
                    ll, a89, aflip = evaluate(rbm.intercept_visible_, rbm.intercept_hidden_, rbm.components_.T, test, anomalies, flipped)
                    grid.append(dict(lr=lr, n_iter=it, batch=bs, ll=ll, auc89=a89, aucflip=aflip))
                best = max(grid, key=lambda g: g["ll"])
                worst = min(grid, key=lambda g: g["ll"])
                b, c, w, sec = emit_model(train, seed, tmp)
                ll, a89, aflip = evaluate(b, c, w, test, anomalies, flipped)
                r = dict(split=s, seed=seed, train=len(train), test=len(test), independent=base,
                         emit=dict(ll=ll, auc89=a89, aucflip=aflip, seconds=sec), sk_best=best, sk_worst=worst)
                results.append(r)
                print(f"split {s} seed {seed}: emit {ll:.3f} (AUC 8/9 {a89:.4f}, flipped {aflip:.4f}, {sec:.1f} s) | "
                      f"sklearn best {best['ll']:.3f} (lr {best['lr']} n_iter {best['n_iter']} batch {best['batch']}; AUC {best['auc89']:.4f}, {best['aucflip']:.4f}) "
                      f"worst {worst['ll']:.3f} | independent {base:.3f} | margin {ll - best['ll']:+.3f}", flush=True)
    print()
    print("| split | seed | emit log p(v) | sklearn best (lr, n_iter, batch) | sklearn worst | independent units | emit − best | AUC 8/9 emit / sklearn best | AUC flipped emit / sklearn best | emit s |")
    print("|---|---|---|---|---|---|---|---|---|---|")
    for r in results:
        e, b, w = r["emit"], r["sk_best"], r["sk_worst"]
        print(f"| {r['split']} | {r['seed']} | {e['ll']:.3f} | {b['ll']:.3f} ({b['lr']}, {b['n_iter']}, {b['batch']}) | {w['ll']:.3f} | {r['independent']:.3f} | "
              f"{e['ll'] - b['ll']:+.3f} | {e['auc89']:.4f} / {b['auc89']:.4f} | {e['aucflip']:.4f} / {b['aucflip']:.4f} | {e['seconds']:.1f} |")


if __name__ == "__main__":
    main()
