#!/usr/bin/python3
"""Generate linalg.golden.json: pseudo-inverses, singular values, ranks and
rank-k leverage scores for a handful of small fixed matrices, using numpy.

Run from the project root:
    /usr/bin/python3 testdata/reference/gen_linalg.py

All matrices are stored row-major as flat lists. "pinv" has shape cols x rows.
Leverage scores for k (only when k <= rank):
    rows[i] = sum_{j<k} U[i, j]^2   (U from the thin SVD of a)
    cols[i] = sum_{j<k} Vt[j, i]^2
"""

import json
import os

import numpy

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "linalg.golden.json")


def fixed_matrices():
    out = []

    out.append(("full-rank-4x3", None, numpy.array([
        [2, -1, 0],
        [1, 3, 1],
        [0, 1, 4],
        [-2, 0, 1],
    ], dtype=float)))

    b1 = numpy.array([1, 2, 0, -1], dtype=float)
    b2 = numpy.array([0, 1, 3, 2], dtype=float)
    out.append(("rank-deficient-4x4", None, numpy.vstack([
        b1,
        b2,
        b1 + b2,
        2 * b1 - b2,
    ])))

    out.append(("wide-2x5", None, numpy.array([
        [1, 0, 2, -1, 3],
        [0, 4, 1, 2, -1],
    ], dtype=float)))

    u = numpy.array([1, -2, 3], dtype=float)
    v = numpy.array([2, 1, -1], dtype=float)
    out.append(("rank-one-3x3", None, numpy.outer(u, v)))

    out.append(("zero-2x3", None, numpy.zeros((2, 3))))

    rng = numpy.random.default_rng(7)
    out.append(("random-8x6", 7, rng.standard_normal((8, 6))))

    rng = numpy.random.default_rng(11)
    left = rng.standard_normal((10, 3))
    right = rng.standard_normal((3, 7))
    out.append(("random-rank3-10x7", 11, left @ right))

    rng = numpy.random.default_rng(3)
    mask = rng.random((30, 20)) < 0.2
    vals = rng.random((30, 20))
    s = numpy.where(mask, vals, 0.0)
    norms = numpy.sqrt((s * s).sum(axis=1))
    for i in range(s.shape[0]):
        if norms[i] > 0:
            s[i] /= norms[i]
    out.append(("sparse-nonneg-30x20", 3, s))

    return out


def flat(m):
    return [float(x) for x in numpy.asarray(m).ravel(order="C")]


def case(name, seed, a):
    rows, cols = a.shape
    sv = numpy.linalg.svd(a, compute_uv=False)
    rank = int(numpy.linalg.matrix_rank(a))
    entry = {"name": name}
    if seed is not None:
        entry["seed"] = seed
    entry.update({
        "rows": rows,
        "cols": cols,
        "a": flat(a),
        "pinv": flat(numpy.linalg.pinv(a)),
        "singular_values": [float(x) for x in sv],
        "rank": rank,
    })
    lev = []
    if rank > 0:
        u, _, vt = numpy.linalg.svd(a, full_matrices=False)
        for k in (1, 2):
            if k > rank:
                continue
            # Leverage for k is only well defined if sigma_k > sigma_{k+1}.
            if k < len(sv) and not sv[k - 1] - sv[k] > 1e-8 * sv[0]:
                raise SystemExit("%s: no spectral gap after sigma_%d" % (name, k))
            lev.append({
                "k": k,
                "rows": [float(x) for x in (u[:, :k] ** 2).sum(axis=1)],
                "cols": [float(x) for x in (vt[:k, :] ** 2).sum(axis=0)],
            })
    entry["leverage"] = lev
    return entry


def main():
    golden = {
        "generator": "testdata/reference/gen_linalg.py",
        "source": "numpy %s numpy.linalg.pinv, numpy.linalg.svd, "
                  "numpy.linalg.matrix_rank, numpy.random.default_rng"
                  % numpy.__version__,
        "layout": "row-major flat lists; pinv is cols x rows",
        "matrices": [case(n, s, a) for n, s, a in fixed_matrices()],
    }
    with open(OUT, "w", encoding="utf-8") as f:
        json.dump(golden, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
