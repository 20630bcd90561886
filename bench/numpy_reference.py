#!/usr/bin/env python3
"""Times numpy's free energy on the files Emit.Bench wrote, and cross-checks the values.

F(v) = -v.b - sum_j logaddexp(0, c_j + (v W)_j), batched as V @ W (numpy from Debian's python3-numpy).
Usage: /usr/bin/python3 bench/numpy_reference.py OUTDIR

The comparison is only meaningful against an optimised BLAS: the script finds the library that serves numpy's
matrix product and refuses to time anything but OpenBLAS. Debian's numpy links libblas.so.3, which the
alternatives system points at the reference (netlib) BLAS or at OpenBLAS (libopenblas0-pthread, priority 100,
chosen in auto mode). threadpoolctl alone is not proof: it lists OpenBLAS whenever libopenblas is loaded, which
happens through liblapack.so.3 even when libblas.so.3 (and so the product) is the reference one.
See docs/benchmarks.md for how to select OpenBLAS for one process without changing the system.
"""
import ctypes
import json
import os
import sys
import time

import numpy as np


class _DlInfo(ctypes.Structure):
    _fields_ = [("dli_fname", ctypes.c_char_p), ("dli_fbase", ctypes.c_void_p),
                ("dli_sname", ctypes.c_char_p), ("dli_saddr", ctypes.c_void_p)]


def blas_serving_numpy():
    """Real path of the shared object whose cblas_dgemm numpy's libblas.so.3 dependency resolves to."""
    import numpy.core._multiarray_umath  # noqa: F401  (loads libblas.so.3 as numpy's dependency)
    # dlopen by soname with RTLD_NOLOAD returns the copy the loader already mapped for numpy.
    lib = ctypes.CDLL("libblas.so.3", mode=os.RTLD_NOLOAD | os.RTLD_LAZY)
    addr = ctypes.cast(lib.cblas_dgemm, ctypes.c_void_p).value
    libc = ctypes.CDLL(None)
    libc.dladdr.argtypes = [ctypes.c_void_p, ctypes.POINTER(_DlInfo)]
    info = _DlInfo()
    if not libc.dladdr(addr, ctypes.byref(info)):
        raise SystemExit("cannot tell which library provides cblas_dgemm")
    return os.path.realpath(info.dli_fname.decode())


def describe_blas():
    path = blas_serving_numpy()
    try:
        from threadpoolctl import threadpool_info  # Debian python3-threadpoolctl
        pools = [p for p in threadpool_info() if p.get("user_api") == "blas"]
    except ImportError:
        pools = []
    openblas = [p for p in pools if p.get("internal_api") == "openblas"]
    is_openblas = "openblas" in path and bool(openblas)
    detail = ""
    if openblas:
        p = openblas[0]
        detail = (f" openblas_version={p.get('version')} threading={p.get('threading_layer')} "
                  f"threads={p.get('num_threads')} architecture={p.get('architecture')}")
    return path, is_openblas, detail


path, is_openblas, detail = describe_blas()
print(f"blas cblas_dgemm_from={path}{detail}")
if not is_openblas:
    print("refusing to compare: numpy's matrix product is not served by OpenBLAS (the reference BLAS is "
          "unoptimised); see docs/benchmarks.md", file=sys.stderr)
    sys.exit(2)

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
rate = len(V) / best
line = (f"numpy {np.__version__} vectors={len(V)} best_seconds={best:.4f} vectors_per_second={rate:.0f} "
        f"max_rel_diff_vs_emit={rel:.3e}")
timing = f"{d}/reference-timing.txt"
if os.path.exists(timing):
    emit_rate = float(open(timing).read().split()[0])
    line += f" emit_vectors_per_second={emit_rate:.0f} emit_over_numpy={emit_rate / rate:.2f}"
print(line)
