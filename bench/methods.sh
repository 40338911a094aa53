#!/usr/bin/env bash
# Compares the selection methods on the demo corpus, the Brown corpus and
# the SpamAssassin corpus, at r = c = k and r = c = 2k, and prints a
# Markdown table of the quality figures and the median timings of 3 runs.
#
#   bench/methods.sh [K]        (K defaults to 20)
#
# The real corpora come from bench/fetch-corpora.sh (into
# ${ASSAY_CORPORA:-$HOME/.cache/assay-corpora}); they are never committed.
set -euo pipefail
cd "$(dirname "$0")/.."
K=${1:-20}
DEST=${ASSAY_CORPORA:-$HOME/.cache/assay-corpora}
[ -d "$DEST/brown" ] && [ -d "$DEST/spamassassin-eml" ] || bench/fetch-corpora.sh "$DEST" >&2
BIN=$(mktemp -d)/assay
go build -o "$BIN" ./cmd/assay
OUT=$(mktemp -d)
for corpus in demo brown spamassassin-eml; do
  for size in "$K" "$((2 * K))"; do
    for method in greedy pivot top leverage norm; do
      for run in 1 2 3; do
        if [ "$corpus" = demo ]; then
          "$BIN" demo --method "$method" --docs "$size" --terms "$size" --rank "$K" --format json --timings
        else
          "$BIN" pick "$DEST/$corpus" --method "$method" --docs "$size" --terms "$size" --rank "$K" --format json --timings
        fi > "$OUT/$corpus-$size-$method-$run.json" 2>/dev/null
      done
    done
  done
done
python3 - "$OUT" "$K" <<'PY'
import json, os, statistics, sys
out, k = sys.argv[1], int(sys.argv[2])
rows = {}
for f in sorted(os.listdir(out)):
    corpus, size, method, run = f[:-5].rsplit('-', 3)
    rows.setdefault((corpus, int(size), method), []).append(json.load(open(os.path.join(out, f))))
def med(runs, key):
    return statistics.median(r['timings'][key] for r in runs)
print('| corpus | r = c | method | η_docs | docs share | best r-doc share | joint η | ρ | select s | SVD s | one rand. SVD (rank k) s |')
print('| --- | --- | --- | --- | --- | --- | --- | --- | --- | --- | --- |')
order = {"demo": 0, "brown": 1, "spamassassin-eml": 2}
meth = {'greedy': 0, 'pivot': 1, 'top': 2, 'leverage': 3, 'norm': 4}
for key in sorted(rows, key=lambda t: (order[t[0]], t[1], meth[t[2]])):
    runs = rows[key]
    f = runs[0]['figures']
    d, j = f['documents'], f['joint']
    eta = lambda v: '–' if v is None else '%.3f' % v
    print('| %s | %d | %s | %s | %.4f | %.4f | %s | %s | %.3f | %.3f | %.3f |' % (
        key[0], key[1], key[2], eta(d['eta']), d['captured'], d['best_captured'], eta(j['eta']),
        eta(j['ratio']), med(runs, 'select'), med(runs, 'svd'), med(runs, 'randomized_svd_rank_k')))
print()
print('k = %d; SVD: %s' % (k, ', '.join(sorted({'%s: %s' % (c, rows[(c, s, m)][0]['figures']['svd']) for (c, s, m) in rows if s == k and m == 'greedy'}))))
PY
