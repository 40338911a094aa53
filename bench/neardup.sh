#!/usr/bin/env bash
# bench/neardup.sh [CORPUS...] — what the near-copy search costs.
#
#   bench/neardup.sh                 # gen-100k, gen-100k-near, spamassassin-eml
#   RUNS=5 bench/neardup.sh DIR
#
# For each corpus it runs, RUNS (3) times and interleaved,
#
#   assay pick DIR --timings --format json -q                   (default: --near-dup 0.9)
#   assay pick DIR --timings --format json -q --near-dup off
#
# under /usr/bin/time (wall seconds, peak resident KiB), and prints the
# medians: the reading (timings.read, which makes the shingle signatures
# when the search is on), the search itself (timings.near_copies:
# candidates, cosines, the merged matrix and its SVD), the picking with the
# threshold kept (select, curve), the whole run and its peak memory; then
# the extra time of the search as a share of the ingest without it.
#
# The default corpora: the generated corpus of 100,000 documents
# (bench/gen -n 100000 -seed 1, as bench/ingest.sh makes it), the same
# with 5% near-copies (bench/gen -near 0.05), and the SpamAssassin
# messages (bench/fetch-corpora.sh).
set -euo pipefail
cd "$(dirname "$0")/.."
. bench/lib.sh
DEST=${ASSAY_CORPORA:-$HOME/.cache/assay-corpora}
RUNS=${RUNS:-3}
if [ $# -eq 0 ]; then
	gen_corpus gen-100k 100000
	gen_corpus gen-100k-near 100000 0.05
	[ -d "$DEST/spamassassin-eml" ] || bench/fetch-corpora.sh "$DEST" >&2
	set -- "$DEST/gen/gen-100k" "$DEST/gen/gen-100k-near" "$DEST/spamassassin-eml"
fi
TMP=$(mktemp -d)
trap 'rm -rf "$TMP"' EXIT
BIN=$TMP/assay
go build -o "$BIN" ./cmd/assay
[ -x /usr/bin/time ] || apt-get install -y time >/dev/null

: >"$TMP/runs"
for run in $(seq "$RUNS"); do
	for dir in "$@"; do
		name=$(basename "$dir")
		echo "neardup.sh: run $run/$RUNS: $name" >&2
		for mode in on off; do
			flag=()
			[ "$mode" = off ] && flag=(--near-dup off)
			/usr/bin/time -f '%e %M' -o "$TMP/time" "$BIN" pick "$dir" --timings --format json -q "${flag[@]}" >"$TMP/out.json" 2>"$TMP/err" || {
				cat "$TMP/err" >&2
				exit 1
			}
			read -r wall rss <"$TMP/time"
			/usr/bin/python3 - "$TMP/out.json" "$name" "$mode" "$wall" "$rss" >>"$TMP/runs" <<'EOF'
import json, sys
r = json.load(open(sys.argv[1]))
t = r["timings"]
copies = sum(len(e.get("near_copies") or []) for e in r["exemplars"])
print(sys.argv[2], sys.argv[3], t["read"], t["near_copies"], t["select"], t["curve"], t["svd"], sys.argv[4], sys.argv[5],
      r["input"]["documents_read"], sum(1 for w in r["warnings"] if "near-copies merged" in w), copies)
EOF
			grep -h "near-copies merged" "$TMP/err" | head -1 >"$TMP/merged-$name-$mode" || true
		done
	done
done

/usr/bin/python3 - "$TMP/runs" "$TMP" <<'EOF'
import collections, os, statistics, sys
rows = collections.defaultdict(list)
docs = {}
for line in open(sys.argv[1]):
    f = line.split()
    rows[(f[0], f[1])].append([float(x) for x in f[2:9]])
    docs[f[0]] = int(f[9])
med = lambda k, i: statistics.median(r[i] for r in rows[k])
names = list(dict.fromkeys(k[0] for k in rows))
print("| corpus | near-dup | read s | near_copies s | select s | curve s | whole pick s | peak RSS MiB |")
print("| --- | --- | --- | --- | --- | --- | --- | --- |")
for n in names:
    for mode in ("on", "off"):
        k = (n, mode)
        print("| %s (%d docs) | %s | %.2f | %.2f | %.2f | %.2f | %.2f | %.0f |" % (n, docs[n], "0.9" if mode == "on" else "off",
              med(k, 0), med(k, 1), med(k, 2), med(k, 3), med(k, 5), med(k, 6) / 1024))
print()
print("| corpus | what was merged | extra time of the search (whole pick, on − off) | its share of the ingest without it | extra peak RSS MiB |")
print("| --- | --- | --- | --- | --- |")
for n in names:
    on, off = (n, "on"), (n, "off")
    extra = med(on, 5) - med(off, 5)
    merged = open(os.path.join(sys.argv[2], "merged-%s-on" % n)).read().strip().replace("assay: warning: ", "") or "nothing"
    print("| %s | %s | %.2f s | %.0f%% | %.0f |" % (n, merged, extra, 100 * extra / med(off, 0), (med(on, 6) - med(off, 6)) / 1024))
EOF
