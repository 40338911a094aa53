#!/usr/bin/python3
"""Times scikit-learn's randomized SVD on a Matrix Market file.

Needs Debian's Python packages:

    apt-get install python3-sklearn python3-scipy

and must run with /usr/bin/python3 (another python3 on PATH may lack them).
bench/svd-vs-sklearn.sh runs it; by hand:

    /usr/bin/python3 bench/sklearn_svd.py --mtx FILE.mtx --out sklearn.json \
        [--runs 3] [--rank 50] [--reference-out reference.json]

It reads the matrix with scipy.io.mmread and converts it to CSR (keeping a
.csr.npz copy beside the .mtx so that the next run loads faster), then times

    sklearn.utils.extmath.randomized_svd(A, n_components=50, n_oversamples=10,
        n_iter=2, power_iteration_normalizer='QR', random_state=0)

--runs times and writes the run times, their median and the singular
values as JSON (the same fields as bench/svdcompare writes). It prints
which BLAS numpy runs, with how many threads. With --reference-out it then
computes, untimed, the same leading singular values with ARPACK
(scipy.sparse.linalg.svds, converged to machine precision) as a reference
for both tools.
"""

import argparse
import contextlib
import io
import json
import os
import statistics
import sys
import time

import numpy as np
import scipy
import scipy.io
import scipy.sparse
import scipy.sparse.linalg
import sklearn
from sklearn.utils.extmath import randomized_svd


def blas_report():
    """Returns a short description of the BLAS numpy uses, and the list."""
    try:
        from threadpoolctl import threadpool_info
    except ImportError:
        buf = io.StringIO()
        with contextlib.redirect_stdout(buf):
            np.show_config()
        return buf.getvalue().strip(), []
    info = threadpool_info()
    lines = []
    for p in info:
        lines.append(
            "%s %s (%s), kernel %s, %s threads, %s"
            % (
                p.get("internal_api"),
                p.get("version"),
                p.get("user_api"),
                p.get("architecture"),
                p.get("num_threads"),
                p.get("filepath"),
            )
        )
    return "\n".join(lines), info


def load(path):
    cache = path[: -len(".mtx")] + ".csr.npz" if path.endswith(".mtx") else path + ".csr.npz"
    if os.path.exists(cache) and os.path.getmtime(cache) >= os.path.getmtime(path):
        return scipy.sparse.load_npz(cache).tocsr(), "cache " + cache
    a = scipy.io.mmread(path).tocsr()
    a.sort_indices()
    tmp = cache + ".partial.npz"
    scipy.sparse.save_npz(tmp, a, compressed=False)
    os.replace(tmp, cache)
    return a, "mmread"


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--mtx", required=True)
    ap.add_argument("--out", required=True)
    ap.add_argument("--runs", type=int, default=3)
    ap.add_argument("--rank", type=int, default=50)
    ap.add_argument("--oversample", type=int, default=10)
    ap.add_argument("--power-iters", type=int, default=2)
    ap.add_argument("--reference-out")
    ap.add_argument("--omega-out", help="write the Gaussian test matrix randomized_svd(random_state=0) draws, "
                    "as raw little-endian float64, row-major, shape (cols, rank + oversample)")
    args = ap.parse_args()

    blas, info = blas_report()
    print("sklearn: Python %s, numpy %s, scipy %s, scikit-learn %s"
          % (sys.version.split()[0], np.__version__, scipy.__version__, sklearn.__version__))
    print("sklearn: BLAS:\n  " + blas.replace("\n", "\n  "))
    for var in ("OPENBLAS_CORETYPE", "OPENBLAS_L2_SIZE", "OPENBLAS_NUM_THREADS", "OMP_NUM_THREADS"):
        if var in os.environ:
            print("sklearn: %s=%s is set" % (var, os.environ[var]))

    t0 = time.perf_counter()
    a, how = load(args.mtx)
    print("sklearn: read %d×%d, %d non-zeros (%s) in %.1f s"
          % (a.shape[0], a.shape[1], a.nnz, how, time.perf_counter() - t0))

    times, values, same = [], None, True
    for r in range(args.runs):
        t0 = time.perf_counter()
        _, s, _ = randomized_svd(
            a,
            n_components=args.rank,
            n_oversamples=args.oversample,
            n_iter=args.power_iters,
            power_iteration_normalizer="QR",
            random_state=0,
        )
        dt = time.perf_counter() - t0
        print("sklearn: run %d: %.3f s" % (r + 1, dt))
        times.append(dt)
        if values is None:
            values = s
        elif not np.array_equal(values, s):
            same = False
    if args.omega_out:
        # randomized_svd(random_state=0) makes RandomState(0) and, with no
        # transpose (rows >= cols), draws its first and only Gaussian block
        # as random_state.normal(size=(A.shape[1], n_components +
        # n_oversamples)) in randomized_range_finder (scikit-learn 1.2.1,
        # sklearn/utils/extmath.py). Drawing the same here gives the same Ω.
        if a.shape[0] < a.shape[1]:
            sys.exit("sklearn: --omega-out needs rows >= cols (randomized_svd transposes otherwise)")
        omega = np.random.RandomState(0).normal(size=(a.shape[1], args.rank + args.oversample))
        omega.astype("<f8").tofile(args.omega_out)
        print("sklearn: wrote the test matrix to %s" % args.omega_out)
    med = statistics.median(times)
    threads = max((p.get("num_threads") or 0 for p in info), default=0)
    print("sklearn: median %.3f s of %d runs" % (med, args.runs))
    result = {
        "tool": "scikit-learn randomized_svd (%s, numpy %s)" % (sklearn.__version__, np.__version__),
        "matrix": args.mtx,
        "rows": a.shape[0],
        "cols": a.shape[1],
        "nnz": int(a.nnz),
        "rank": args.rank,
        "oversample": args.oversample,
        "power_iters": args.power_iters,
        "threads": threads,
        "runs_seconds": times,
        "median_seconds": med,
        "same_every_run": same,
        "values": [float(v) for v in values],
        "extra": {"blas": blas},
    }
    with open(args.out, "w") as f:
        json.dump(result, f, indent=2)
        f.write("\n")

    if args.reference_out:
        t0 = time.perf_counter()
        v0 = np.random.default_rng(1).standard_normal(min(a.shape))
        s = scipy.sparse.linalg.svds(a, k=args.rank, solver="arpack", v0=v0, return_singular_vectors=False)
        s = np.sort(s)[::-1]
        dt = time.perf_counter() - t0
        print("sklearn: reference values (ARPACK svds, k=%d) in %.1f s" % (args.rank, dt))
        ref = {
            "tool": "scipy.sparse.linalg.svds ARPACK (scipy %s)" % scipy.__version__,
            "matrix": args.mtx,
            "rows": a.shape[0],
            "cols": a.shape[1],
            "nnz": int(a.nnz),
            "rank": args.rank,
            "runs_seconds": [dt],
            "median_seconds": dt,
            "same_every_run": True,
            "values": [float(v) for v in s],
        }
        with open(args.reference_out, "w") as f:
            json.dump(ref, f, indent=2)
            f.write("\n")


if __name__ == "__main__":
    main()
