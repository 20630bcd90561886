#!/usr/bin/python3
"""Writes the outside-reference fixtures for Emit's .npz import and reference scorer tests.

Run with Debian's python3 (python3-numpy, python3-sklearn 1.2.1):

    /usr/bin/python3 tests/reference/make_fixtures.py [OUTPUT_FOLDER]

OUTPUT_FOLDER defaults to tests/Emit.Tests/Model/Fixtures. Every value the tests compare against comes
from numpy or scikit-learn here, never from Emit:

* sklearn_digits_rbm.npz - scikit-learn BernoulliRBM trained on its bundled digits data (binarised,
  pixel > 7), saved with np.savez(f, components_=..., intercept_visible_=..., intercept_hidden_=...).
* sklearn_digits_vectors.csv - 200 binary vectors (all-off, all-on, then 198 digits), with a header row.
* sklearn_digits_free_energy.csv - scikit-learn's own BernoulliRBM._free_energy for those vectors.
* digits_native_f4_be_fortran.npz - the same model in the other naming (weights = components_.T,
  visible_bias, hidden_bias) as float32, big-endian, Fortran order; digits_native_f4_be_fortran_free_energy.csv
  holds numpy's free energy for that float32 model (computed in float64 from the float32 values).
* fmt_*.npz - one small random model in every NPY variant Emit reads (dtype, byte order, memory order,
  stored/deflated zip entries, NPY format versions 1.0/2.0/3.0, both namings).
* expected_arrays.json - for every valid .npz, the arrays exactly as numpy holds them, in Emit's layout
  (weights[i][j] couples visible i and hidden j; for components_ files that is numpy's transpose).
* err_*.npz - files numpy writes that Emit must refuse (wrong dtype, NaN/Inf, wrong shapes, ...).
* reference_versions.json - library versions, parameters and SHA-256 of every file written.
"""
import hashlib
import io
import json
import os
import platform
import sys
import zipfile

import numpy as np
import scipy
import sklearn
from sklearn.datasets import load_digits
from sklearn.neural_network import BernoulliRBM

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.abspath(sys.argv[1]) if len(sys.argv) > 1 else os.path.join(HERE, "..", "Emit.Tests", "Model", "Fixtures")
# A fixed timestamp in the zip entries written here with zipfile, so regenerating gives the same bytes
# (np.savez's entries carry zipfile's default 1980-01-01 stamp, which is fixed too).
FIXED_TIME = (2020, 1, 1, 0, 0, 0)

RBM_PARAMS = dict(n_components=16, learning_rate=0.05, batch_size=10, n_iter=10, random_state=7)
BINARISE_ABOVE = 7

written = {}
expected_arrays = {}


def path(name):
    return os.path.join(OUT, name)


def record(name):
    with open(path(name), "rb") as f:
        written[name] = hashlib.sha256(f.read()).hexdigest()


def npy_bytes(array, version=None):
    buf = io.BytesIO()
    np.lib.format.write_array(buf, array, version=version)
    return buf.getvalue()


def write_zip(name, entries, compression):
    """entries: list of (array name, array, NPY version or None)."""
    with zipfile.ZipFile(path(name), "w") as z:
        for key, array, version in entries:
            info = zipfile.ZipInfo(key + ".npy", date_time=FIXED_TIME)
            info.compress_type = compression
            z.writestr(info, npy_bytes(array, version))
    record(name)


def header_of(name, key):
    """Reads the NPY header numpy wrote for one entry, to assert the variant is the intended one."""
    with zipfile.ZipFile(path(name)) as z, z.open(key + ".npy") as f:
        version = np.lib.format.read_magic(f)
        if version == (1, 0):
            shape, fortran, dtype = np.lib.format.read_array_header_1_0(f)
        else:
            shape, fortran, dtype = np.lib.format.read_array_header_2_0(f)
        info = z.getinfo(key + ".npy")
        return version, shape, fortran, dtype.str, info.compress_type


def expect(name, weights_vxh, visible_bias, hidden_bias):
    expected_arrays[name] = {
        "weights": np.asarray(weights_vxh, dtype=np.float64).tolist(),
        "visible_bias": np.asarray(visible_bias, dtype=np.float64).tolist(),
        "hidden_bias": np.asarray(hidden_bias, dtype=np.float64).tolist(),
    }


def free_energy(v, w, b, c):
    """numpy's free energy of an RBM, F(v) = -v.b - sum_j logaddexp(0, c_j + (v W)_j), in float64."""
    return -(v @ b) - np.logaddexp(0.0, v @ w + c).sum(axis=1)


def write_free_energy(name, values):
    with open(path(name), "w", newline="\n") as f:
        f.write("index,free_energy\n")
        for k, x in enumerate(values):
            f.write("%d,%s\n" % (k, repr(float(x))))
    record(name)


def main():
    os.makedirs(OUT, exist_ok=True)

    # ---- scikit-learn BernoulliRBM on the bundled digits data -------------------------------------
    digits = load_digits()
    x = (digits.data > BINARISE_ABOVE).astype(np.float64)   # 1797 x 64, 0/1
    rbm = BernoulliRBM(**RBM_PARAMS).fit(x)
    np.savez(path("sklearn_digits_rbm.npz"), components_=rbm.components_,
             intercept_visible_=rbm.intercept_visible_, intercept_hidden_=rbm.intercept_hidden_)
    record("sklearn_digits_rbm.npz")
    expect("sklearn_digits_rbm.npz", rbm.components_.T, rbm.intercept_visible_, rbm.intercept_hidden_)

    vectors = np.vstack([np.zeros((1, 64)), np.ones((1, 64)), x[:198]])
    names = ["r%dc%d" % (r, c) for r in range(8) for c in range(8)]
    with open(path("sklearn_digits_vectors.csv"), "w", newline="\n") as f:
        f.write(",".join(names) + "\n")
        for row in vectors.astype(np.int64):
            f.write(",".join(str(int(u)) for u in row) + "\n")
    record("sklearn_digits_vectors.csv")
    write_free_energy("sklearn_digits_free_energy.csv", rbm._free_energy(vectors))

    # The same model in the other naming, float32, big-endian, Fortran order (np.savez).
    w32 = np.asfortranarray(rbm.components_.T.astype(">f4"))
    b32 = rbm.intercept_visible_.astype(">f4")
    c32 = rbm.intercept_hidden_.astype(">f4")
    np.savez(path("digits_native_f4_be_fortran.npz"), weights=w32, visible_bias=b32, hidden_bias=c32)
    record("digits_native_f4_be_fortran.npz")
    assert header_of("digits_native_f4_be_fortran.npz", "weights")[:4] == ((1, 0), (64, 16), True, ">f4")
    expect("digits_native_f4_be_fortran.npz", w32, b32, c32)
    write_free_energy("digits_native_f4_be_fortran_free_energy.csv",
                      free_energy(vectors, w32.astype(np.float64), b32.astype(np.float64), c32.astype(np.float64)))

    # ---- one small model in every supported variant ---------------------------------------------
    rng = np.random.default_rng(20240611)
    w = rng.normal(0.0, 1.5, size=(5, 3))
    w[0, 0] = 1e-300          # tiny, still finite in float64
    w[4, 2] = -123456.789
    b = rng.normal(0.0, 1.0, size=5)
    c = rng.normal(0.0, 1.0, size=3)
    stored, deflated = zipfile.ZIP_STORED, zipfile.ZIP_DEFLATED

    def native(dtype, order):
        arr = np.array(w, dtype=dtype, order=order)
        return arr, np.array(b, dtype=dtype), np.array(c, dtype=dtype)

    variants = [
        ("fmt_f8_le_c_stored.npz", "<f8", "C", stored, None),
        ("fmt_f8_be_f_deflated.npz", ">f8", "F", deflated, None),
        ("fmt_f4_le_f_stored.npz", "<f4", "F", stored, None),
        ("fmt_f4_be_c_deflated.npz", ">f4", "C", deflated, None),
        ("fmt_v2_f8_le_f_stored.npz", "<f8", "F", stored, (2, 0)),
        ("fmt_v3_f4_be_c_deflated.npz", ">f4", "C", deflated, (3, 0)),
    ]
    for name, dtype, order, compression, version in variants:
        ww, bb, cc = native(dtype, order)
        write_zip(name, [("weights", ww, version), ("visible_bias", bb, version), ("hidden_bias", cc, version)], compression)
        got = header_of(name, "weights")
        assert got == (version or (1, 0), (5, 3), order == "F", dtype, compression), (name, got)
        expect(name, ww, bb, cc)

    # scikit-learn naming: components_ is hidden x visible.
    comp = np.asfortranarray(w.T.astype(">f4"))
    write_zip("fmt_sklearn_names_f4_be_f_stored.npz",
              [("components_", comp, None), ("intercept_visible_", b.astype(">f4"), None),
               ("intercept_hidden_", c.astype(">f4"), None)], stored)
    assert header_of("fmt_sklearn_names_f4_be_f_stored.npz", "components_")[:4] == ((1, 0), (3, 5), True, ">f4")
    expect("fmt_sklearn_names_f4_be_f_stored.npz", comp.T, b.astype(">f4"), c.astype(">f4"))

    # np.savez_compressed (deflated, zip64 local headers as numpy writes them), little-endian float64.
    np.savez_compressed(path("fmt_savez_compressed.npz"), weights=w, visible_bias=b, hidden_bias=c)
    record("fmt_savez_compressed.npz")
    expect("fmt_savez_compressed.npz", w, b, c)

    # ---- files Emit must refuse -------------------------------------------------------------------
    def bad(name, **arrays):
        np.savez(path(name), **arrays)
        record(name)

    bad("err_int64.npz", weights=np.ones((5, 3), dtype=np.int64), visible_bias=b, hidden_bias=c)
    bad("err_float16.npz", weights=np.ones((5, 3), dtype=np.float16), visible_bias=b, hidden_bias=c)
    bad("err_complex.npz", weights=w.astype(np.complex128), visible_bias=b, hidden_bias=c)
    bad("err_object.npz", weights=np.array([[1.0, "x", None]] * 5, dtype=object), visible_bias=b, hidden_bias=c)
    bad("err_structured.npz", weights=np.zeros(5, dtype=[("a", "<f8"), ("b", "<f8")]), visible_bias=b, hidden_bias=c)
    w_nan = w.copy(); w_nan[1, 2] = np.nan
    bad("err_nan.npz", weights=w_nan, visible_bias=b, hidden_bias=c)
    c_inf = c.copy(); c_inf[2] = np.inf
    bad("err_inf.npz", weights=w, visible_bias=b, hidden_bias=c_inf)
    bad("err_3d.npz", weights=w.reshape(5, 3, 1), visible_bias=b, hidden_bias=c)
    bad("err_bias_2d.npz", weights=w, visible_bias=b.reshape(1, 5), hidden_bias=c)
    bad("err_shape_mismatch.npz", weights=w, visible_bias=b[:4], hidden_bias=c)
    bad("err_sklearn_not_transposed.npz", components_=w, intercept_visible_=b, intercept_hidden_=c)
    bad("err_missing_hidden_bias.npz", weights=w, visible_bias=b)
    bad("err_mixed_names.npz", weights=w, visible_bias=b, intercept_hidden_=c)
    bad("err_no_visible.npz", weights=np.zeros((0, 3)), visible_bias=np.zeros(0), hidden_bias=c)
    np.save(path("err_plain_npy.npz"), w)   # a single .npy array under an .npz name
    os.replace(path("err_plain_npy.npz.npy"), path("err_plain_npy.npz"))
    record("err_plain_npy.npz")

    with open(path("expected_arrays.json"), "w", newline="\n") as f:
        json.dump(expected_arrays, f, sort_keys=True)
        f.write("\n")
    record("expected_arrays.json")

    info = {
        "generator": "tests/reference/make_fixtures.py",
        "python": platform.python_version(),
        "numpy": np.__version__,
        "scikit-learn": sklearn.__version__,
        "scipy": scipy.__version__,
        "dataset": "sklearn.datasets.load_digits() (bundled with scikit-learn), binarised as pixel > %d" % BINARISE_ABOVE,
        "bernoulli_rbm": RBM_PARAMS,
        "vectors": "all-off, all-on, then the first 198 digits",
        "files_sha256": dict(sorted(written.items())),
    }
    with open(path("reference_versions.json"), "w", newline="\n") as f:
        json.dump(info, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
