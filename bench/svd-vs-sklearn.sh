#!/usr/bin/env bash
# Times assay's randomized truncated SVD against scikit-learn's on the same
# synthetic TF-IDF-like matrix, one after the other in one run, and compares
# the singular values.
#
#   bench/svd-vs-sklearn.sh [DEST]          # 100000×50000, 100 non-zeros a row
#   SIZE=small bench/svd-vs-sklearn.sh      # 20000×10000, for a quick check
#
# Needs Go 1.26 and Debian's Python packages:
#   apt-get install python3-sklearn python3-scipy
# DEST (default $ASSAY_CORPORA, else $HOME/.cache/assay-corpora) receives the
# .mtx file (about 250 MB at full size, reused by later runs) and, under
# svd-compare/SIZE/, the JSON results. Other settings: RUNS (default 3),
# REFERENCE=0 to skip the ARPACK reference values.
set -euo pipefail

root=$(cd "$(dirname "$0")/.." && pwd)
dest=${1:-${ASSAY_CORPORA:-$HOME/.cache/assay-corpora}}
size=${SIZE:-full}
runs=${RUNS:-3}
case $size in
  full) m=100000 n=50000 ;;
  small) m=20000 n=10000 ;;
  *) echo "svd-vs-sklearn: SIZE is full or small, not $size" >&2; exit 2 ;;
esac
nnz=100
py=/usr/bin/python3
if ! "$py" -c 'import sklearn, scipy' 2>/dev/null; then
  echo "svd-vs-sklearn: $py lacks scikit-learn or scipy: apt-get install python3-sklearn python3-scipy" >&2
  exit 1
fi

mkdir -p "$dest"
dest=$(cd "$dest" && pwd)
out=$dest/svd-compare/$size
mkdir -p "$out"
mtx=$dest/synth-${m}x${n}-${nnz}-seed1.mtx

cd "$root"
go build -o "$out/svdcompare" ./bench/svdcompare
# The Go program writes the .mtx the first time; generate it before Python
# needs it, then time both tools one after the other.
if [ ! -f "$mtx" ]; then
  "$out/svdcompare" -m "$m" -n "$n" -nnz "$nnz" -seed 1 -mtx "$mtx" -runs 1 \
    -rank 50 -oversample 10 -power-iters 2 -out "$out/assay.json" >/dev/null
fi

echo "== scikit-learn"
ref=()
if [ "${REFERENCE:-1}" != 0 ]; then
  ref=(--reference-out "$out/reference.json")
fi
# OPENBLAS_CORETYPE and OPENBLAS_L2_SIZE, where set on this kind of machine,
# hold a current OpenBLAS to slower kernels; unset them for this timing only.
# --omega-out saves the Gaussian test matrix scikit-learn drew, so that one
# extra (untimed) run of assay can start from the identical Ω.
env -u OPENBLAS_CORETYPE -u OPENBLAS_L2_SIZE "$py" bench/sklearn_svd.py --mtx "$mtx" \
  --runs "$runs" --rank 50 --oversample 10 --power-iters 2 --out "$out/sklearn.json" \
  --omega-out "$out/omega.f64" "${ref[@]}"

echo "== assay (Go)"
"$out/svdcompare" -m "$m" -n "$n" -nnz "$nnz" -seed 1 -mtx "$mtx" -runs "$runs" \
  -rank 50 -oversample 10 -power-iters 2 -out "$out/assay.json" -omega "$out/omega.f64"
rm -f "$out/omega.f64"

cmp=("$out/assay.json" "$out/sklearn.json")
if [ "${REFERENCE:-1}" != 0 ]; then
  cmp+=("$out/reference.json")
fi
"$out/svdcompare" compare "${cmp[@]}" | tee "$out/table.txt"
