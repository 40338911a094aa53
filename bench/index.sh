#!/usr/bin/env bash
# bench/index.sh [CORPUS...] — index and re-index times and store size.
#
#   bench/index.sh                         # gen-100k and spamassassin-eml
#   RUNS=5 bench/index.sh ~/some/folder
#
# For each corpus folder (default: the generated corpus of 100,000
# documents, made with bench/gen -n 100000 -seed 1 as bench/ingest.sh makes
# it, and the SpamAssassin messages from bench/fetch-corpora.sh) it copies
# the folder to a scratch place (so that the originals are never touched),
# then RUNS (3) times:
#
#   1. a full index into a new store        assay index COPY --store S
#   2. a re-index with nothing changed      assay index COPY --store S
#   3. a re-index after 1% of the files changed: every hundredth file, in
#      lexical order, gets one more line of text (new content, new time)
#   4. a pick from the store and the same pick from the folder
#      (--docs 20, JSON), whose reports must agree but for
#      the "source" and "repeat" lines
#
# and prints a Markdown table of the medians, the store size per document
# and the re-index times as shares of the full index. Each run starts from
# a fresh copy, so step 3 always changes files that step 2 saw unchanged.
set -euo pipefail
cd "$(dirname "$0")/.."
DEST=${ASSAY_CORPORA:-$HOME/.cache/assay-corpora}
RUNS=${RUNS:-3}
if [ $# -eq 0 ]; then
	if [ ! -d "$DEST/gen/gen-100k" ]; then
		go run ./bench/gen -n 100000 -seed 1 -out "$DEST/gen/gen-100k" >&2
	fi
	[ -d "$DEST/spamassassin-eml" ] || bench/fetch-corpora.sh "$DEST" >&2
	set -- "$DEST/gen/gen-100k" "$DEST/spamassassin-eml"
fi
TMP=$(mktemp -d)
trap 'rm -rf "$TMP"' EXIT
BIN=$TMP/assay
go build -o "$BIN" ./cmd/assay
[ -x /usr/bin/time ] || apt-get install -y time >/dev/null

# timed LABEL CMD...: runs CMD, appends "LABEL seconds peak-KiB" to $TMP/times.
timed() {
	local label=$1
	shift
	/usr/bin/time -f "$label %e %M" -a -o "$TMP/times" "$@" >"$TMP/out" 2>"$TMP/err" || {
		cat "$TMP/err" >&2
		exit 1
	}
}

for dir in "$@"; do
	name=$(basename "$dir")
	: >"$TMP/times"
	for run in $(seq "$RUNS"); do
		echo "index.sh: $name run $run/$RUNS" >&2
		rm -rf "$TMP/copy" "$TMP/s.assay"*
		cp -a "$dir" "$TMP/copy"
		timed full "$BIN" index "$TMP/copy" --store "$TMP/s.assay"
		timed unchanged "$BIN" index "$TMP/copy" --store "$TMP/s.assay"
		grep -q "^.*: 0 added, 0 changed, 0 removed" "$TMP/out" || { cat "$TMP/out" >&2; exit 1; }
		find "$TMP/copy" -type f ! -name '.*' | LC_ALL=C sort | awk 'NR % 100 == 1' >"$TMP/changed"
		while read -r f; do printf '\nOne more line of text, written by bench/index.sh.\n' >>"$f"; done <"$TMP/changed"
		timed changed1 "$BIN" index "$TMP/copy" --store "$TMP/s.assay"
		size=$(stat -c %s "$TMP/s.assay")
		docs=$("$BIN" pick "$TMP/s.assay" --format json -q --docs 1 --terms 1 --rank 1 | /usr/bin/python3 -c 'import json,sys; print(json.load(sys.stdin)["input"]["documents_read"])')
		timed pickstore "$BIN" pick "$TMP/s.assay" --format json -q --docs 20
		cp "$TMP/out" "$TMP/from-store.json"
		timed pickfolder "$BIN" pick "$TMP/copy" --format json -q --docs 20
		if ! diff <(grep -v '"source"\|"repeat"' "$TMP/from-store.json") <(grep -v '"source"\|"repeat"' "$TMP/out") >/dev/null; then
			echo "index.sh: the pick from the store differs from the pick from the folder" >&2
			exit 1
		fi
		echo "size $size $docs $(wc -l <"$TMP/changed")" >>"$TMP/times"
	done
	/usr/bin/python3 - "$TMP/times" "$name" <<'EOF'
import statistics, sys
rows = [l.split() for l in open(sys.argv[1])]
t = {}
for r in rows:
    if r[0] != "size":
        t.setdefault(r[0], []).append((float(r[1]), int(r[2])))
size, docs, changed = [int(x) for x in next(r for r in rows if r[0] == "size")[1:]]
med = lambda k, i=0: statistics.median(x[i] for x in t[k])
full = med("full")
print(f"\n### {sys.argv[2]}: {docs} documents, medians of {len(t['full'])} runs\n")
print("| step | seconds | share of the full index | peak RSS MiB |")
print("| --- | --- | --- | --- |")
for k, label in (("full", "full index"), ("unchanged", "re-index, nothing changed"), ("changed1", f"re-index, 1% changed ({changed} files)"),
                 ("pickstore", "pick from the store"), ("pickfolder", "pick from the folder")):
    print(f"| {label} | {med(k):.2f} | {100 * med(k) / full:.1f}% | {med(k, 1) / 1024:.0f} |")
print(f"\nstore: {size / 1e6:.1f} MB, {size / docs:.0f} bytes a document")
EOF
done
