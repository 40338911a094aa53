#!/usr/bin/env bash
# bench/ingest.sh [DEST] — ingest throughput, peak memory and scaling of
# `assay pick`, side by side with a scikit-learn pipeline on the same files.
#
#   bench/ingest.sh                      # DEST = $ASSAY_CORPORA or ~/.cache/assay-corpora
#   RUNS=5 bench/ingest.sh /tmp/corpora
#   SIZES="10000" SKLEARN=0 bench/ingest.sh
#   ASSAY=/path/to/assay bench/ingest.sh # measure a prebuilt binary
#
# Environment: RUNS (3) runs of everything, interleaved (run 1 of every
# variant, then run 2, …) so that the machine's noise falls on all of them
# alike; SIZES ("10000 100000") sizes of the generated corpora; SKLEARN (1)
# also run bench/ingest_sklearn.py; PICK (1) also time a pick with 50 picks
# on the largest generated corpus; PIPE (1) also run bench/ingestpipe (the
# ingest alone, for its peak memory against the CSR); ASSAY a binary to use
# instead of building cmd/assay; BASE another assay binary to run the same
# picks with, side by side (a before/after comparison; its rows are
# labelled "base"), the two taking turns at running first; WARMUP (1) read
# each corpus's files and run one small untimed pick on it before its cell.
#
# What it does: builds assay; makes sure /usr/bin/time (Debian's `time`)
# and, with SKLEARN=1, python3-sklearn and python3-snowballstemmer are
# there (installing them with apt-get); generates DEST/gen/gen-N with bench/gen (seed 1; redone when
# bench/gen/main.go changes) and fetches SpamAssassin with
# bench/fetch-corpora.sh when missing; then for each corpus runs
#
#   assay pick DIR --timings --format json -q --lang english
#   assay pick DIR --timings --format json -q --lang english --no-stem
#   assay pick DIR --timings --format json -q --lang auto
#   assay pick DIR --timings --format json -q --lang english --near-dup off
#   assay pick DIR --timings --format json -q --lang english --no-stem --near-dup off
#
# under /usr/bin/time -f '%e %M' (wall seconds, peak resident KiB), and
# bench/ingest_sklearn.py without and with stemming on the corpora of .txt
# files. The ingest time is the report's timings.read (walk, read,
# analyse, count, prune: the matrix ready to weight); MB/s is of the raw
# input, the sum of the sizes of the files read. Results go to
# DEST/ingest/runs.tsv and the tables to DEST/ingest/results.md (also
# printed).
set -euo pipefail
cd "$(dirname "$0")/.."
. bench/lib.sh
DEST=${1:-${ASSAY_CORPORA:-$HOME/.cache/assay-corpora}}
RUNS=${RUNS:-3}
SIZES=${SIZES:-"10000 100000"}
SKLEARN=${SKLEARN:-1}
PICK=${PICK:-1}
PIPE=${PIPE:-1}
WARMUP=${WARMUP:-1}
PY=/usr/bin/python3
OUT=$DEST/ingest
mkdir -p "$OUT"
TMP=$(mktemp -d)
trap 'rm -rf "$TMP"' EXIT

if [ -z "${ASSAY:-}" ]; then
	ASSAY=$OUT/assay
	go build -o "$ASSAY" ./cmd/assay
fi
if [ ! -x /usr/bin/time ]; then
	echo "ingest.sh: installing Debian's time (for /usr/bin/time -f %M)" >&2
	apt-get install -y time >/dev/null
fi
if [ "$SKLEARN" = 1 ] && ! "$PY" -c 'import sklearn, snowballstemmer' 2>/dev/null; then
	echo "ingest.sh: installing Debian's python3-sklearn and python3-snowballstemmer" >&2
	apt-get install -y python3-sklearn python3-snowballstemmer >/dev/null
fi

# The corpora: name, folder, extension of the files scikit-learn reads ("" = skip it).
corpora=()
for n in $SIZES; do
	name=gen-$((n / 1000))k
	gen_corpus "$name" "$n"
	corpora+=("$name $DEST/gen/$name .txt")
done
if [ ! -d "$DEST/spamassassin-eml" ] || [ ! -d "$DEST/spamassassin" ]; then
	bench/fetch-corpora.sh "$DEST" >&2
fi
corpora+=("spamassassin-eml $DEST/spamassassin-eml -" "spamassassin $DEST/spamassassin .txt")

TSV=$OUT/runs.tsv
printf 'corpus\ttool\tmode\trun\tseconds\twall\trss_kib\tbytes\tdocs\textra\n' >"$TSV"

# assay_run CORPUS DIR MODE RUN ARGS…: one pick, one line of runs.tsv
# (with the BASE binary when TOOL=base).
assay_run() {
	local corpus=$1 dir=$2 mode=$3 run=$4 bin=$ASSAY tool=${TOOL:-assay}
	shift 4
	[ "$tool" = base ] && bin=$BASE
	/usr/bin/time -f '%e %M' -o "$TMP/time" "$bin" pick "$dir" --timings --format json -q "$@" >"$TMP/out.json" 2>"$TMP/err" || {
		cat "$TMP/err" >&2
		exit 1
	}
	read -r wall rss <"$TMP/time"
	$PY - "$TMP/out.json" "$corpus" "$mode" "$run" "$wall" "$rss" "${BYTES[$corpus]}" "$tool" >>"$TSV" <<'EOF'
import json, sys
r = json.load(open(sys.argv[1]))
t, i = r["timings"], r["input"]
extra = "select=%s svd=%s rsvd=%s terms=%s nnz=%s vocab=%s" % (t["select"], t["svd"], t["randomized_svd_rank_k"], i["terms_kept"], i["nonzeros"], i["vocabulary"])
print("\t".join([sys.argv[2], sys.argv[8], sys.argv[3], sys.argv[4], str(t["read"]), sys.argv[5], sys.argv[6], sys.argv[7], str(i["documents_read"]), extra]))
EOF
}

# sklearn_run CORPUS DIR EXT MODE RUN
sklearn_run() {
	local corpus=$1 dir=$2 ext=$3 mode=$4 run=$5 flag=""
	[ "$mode" = stem ] && flag=--stem
	/usr/bin/time -f '%e %M' -o "$TMP/time" $PY bench/ingest_sklearn.py "$dir" --runs 1 --ext "$ext" $flag >"$TMP/py.json"
	read -r wall rss <"$TMP/time"
	$PY - "$TMP/py.json" "$corpus" "$mode" "$run" "$wall" "$rss" >>"$TSV" <<'EOF'
import json, sys
r = json.loads(open(sys.argv[1]).read().splitlines()[0])
print("\t".join([sys.argv[2], "sklearn", sys.argv[3], sys.argv[4], str(r["seconds"]), sys.argv[5], sys.argv[6], str(r["bytes"]), str(r["documents"]), "terms=%d nnz=%d" % (r["terms"], r["nonzeros"])]))
EOF
}

declare -A BYTES
for c in "${corpora[@]}"; do
	read -r name dir ext <<<"$c"
	BYTES[$name]=$(bytes_of "$dir")
done
largest=""
for n in $SIZES; do largest=gen-$((n / 1000))k; done

for run in $(seq "$RUNS"); do
	for c in "${corpora[@]}"; do
		read -r name dir ext <<<"$c"
		echo "ingest.sh: run $run/$RUNS: $name" >&2
		# Before each cell: the corpus's files read once into the page cache
		# and one small pick whose figures are dropped. Without it the first
		# pick of a cell, by the binary that always ran first, was often much
		# slower than the rest (0.96 s against 0.63 s at 10k, 5.05 s against
		# 3.8 s at 100k).
		if [ "$WARMUP" = 1 ]; then
			find "$dir" -type f -print0 | xargs -0 cat >/dev/null
			"$ASSAY" pick "$dir" --format json -q --lang english --near-dup off --docs 2 --terms 2 --curve-max 2 >/dev/null
		fi
		# With a BASE, the two binaries take turns at running first.
		tools="assay ${BASE:+base}"
		if [ -n "${BASE:-}" ] && [ $((run % 2)) = 0 ]; then tools="base assay"; fi
		for tool in $tools; do
			TOOL=$tool assay_run "$name" "$dir" english "$run" --lang english
			TOOL=$tool assay_run "$name" "$dir" english-nostem "$run" --lang english --no-stem
			TOOL=$tool assay_run "$name" "$dir" auto "$run" --lang auto
			TOOL=$tool assay_run "$name" "$dir" english-nodup "$run" --lang english --near-dup off
			TOOL=$tool assay_run "$name" "$dir" nostem-nodup "$run" --lang english --no-stem --near-dup off
		done
		if [ "$SKLEARN" = 1 ] && [ "$ext" != - ]; then
			sklearn_run "$name" "$dir" "$ext" nostem "$run"
			sklearn_run "$name" "$dir" "$ext" stem "$run"
		fi
	done
	if [ "$PICK" = 1 ] && [ -n "$largest" ]; then
		assay_run "$largest" "$DEST/gen/$largest" pick50 "$run" --lang english --docs 50 --terms 50 --rank 50
	fi
done

if [ "$PIPE" = 1 ] && [ -n "$largest" ]; then
	go build -o "$OUT/ingestpipe" ./bench/ingestpipe
	"$OUT/ingestpipe" -dir "$DEST/gen/$largest" -runs "$RUNS" -collector ids >"$OUT/ingestpipe-ids.txt"
	"$OUT/ingestpipe" -dir "$DEST/gen/$largest" -runs 1 -collector maps >"$OUT/ingestpipe-maps.txt"
fi

$PY - "$TSV" "$OUT" "$largest" <<'EOF' | tee "$OUT/results.md"
import collections, statistics, sys, os
rows = [l.rstrip("\n").split("\t") for l in open(sys.argv[1])][1:]
out, largest = sys.argv[2], sys.argv[3]
by = collections.defaultdict(list)
info = {}
for corpus, tool, mode, run, sec, wall, rss, nbytes, docs, extra in rows:
    by[(corpus, tool, mode)].append((float(sec), float(wall), int(rss)))
    info[(corpus, tool, mode)] = (int(nbytes), int(docs), dict(kv.split("=") for kv in extra.split()))
med = lambda xs: statistics.median(xs)
def m(key, i):
    return med([r[i] for r in by[key]])
corpora = list(dict.fromkeys(k[0] for k in by))
print("### assay pick: ingest (timings.read), medians of %d runs\n" % len(next(iter(by.values()))))
print("| corpus | documents | input MB | binary | mode | ingest s | ingest MB/s | whole pick s | peak RSS MiB |")
print("| --- | --- | --- | --- | --- | --- | --- | --- | --- |")
for c in corpora:
    for mode in ("english", "english-nostem", "auto", "english-nodup", "nostem-nodup", "pick50"):
        for tool in ("assay", "base"):
            k = (c, tool, mode)
            if k not in by:
                continue
            nb, docs, _ = info[k]
            print("| %s | %d | %.1f | %s | %s | %.2f | %.1f | %.2f | %.0f |" % (c, docs, nb / 1e6, tool, mode, m(k, 0), nb / 1e6 / m(k, 0), m(k, 1), m(k, 2) / 1024))
if any(k[1] == "base" for k in by):
    print("\nbase / assay ingest time (medians): " + ", ".join("%s %s %.2f×" % (c, mode, m((c, "base", mode), 0) / m((c, "assay", mode), 0))
          for c in corpora for mode in ("english", "english-nostem", "auto", "english-nodup", "nostem-nodup") if (c, "base", mode) in by))
print("\n### side by side with scikit-learn (ratio = scikit-learn time / assay ingest time)\n")
print("The first assay time of each pair is the default pick, which also computes the MinHash signatures of the near-copy search in its workers; the second is with --near-dup off, the like-for-like comparison (scikit-learn computes no signatures).\n")
print("| corpus | scikit-learn, no stemming: s (MB/s) | assay --no-stem: s (ratio) | the same, --near-dup off: s (MB/s, ratio) | scikit-learn, memoised Snowball: s (MB/s) | assay --lang english: s (ratio) | the same, --near-dup off: s (MB/s, ratio) | assay auto: s |")
print("| --- | --- | --- | --- | --- | --- | --- | --- |")
for c in corpora:
    if (c, "sklearn", "nostem") not in by:
        continue
    nb = info[(c, "sklearn", "nostem")][0]
    pn, ps = m((c, "sklearn", "nostem"), 0), m((c, "sklearn", "stem"), 0)
    an, ae, aa = m((c, "assay", "english-nostem"), 0), m((c, "assay", "english"), 0), m((c, "assay", "auto"), 0)
    dn, de = m((c, "assay", "nostem-nodup"), 0), m((c, "assay", "english-nodup"), 0)
    print("| %s | %.2f (%.1f) | %.2f (%.1f×) | %.2f (%.1f, %.1f×) | %.2f (%.1f) | %.2f (%.1f×) | %.2f (%.1f, %.1f×) | %.2f |" % (
        c, pn, nb / 1e6 / pn, an, pn / an, dn, nb / 1e6 / dn, pn / dn, ps, nb / 1e6 / ps, ae, ps / ae, de, nb / 1e6 / de, ps / de, aa))
    ta, ts = info[(c, "assay", "english")][2], info[(c, "sklearn", "stem")][2]
    print("|  | matrix: scikit-learn %s terms, %s non-zeros; assay %s terms, %s non-zeros |  |  |  |  |  |  |" % (ts["terms"], ts["nnz"], ta["terms"], ta["nnz"]))
k = (largest, "assay", "pick50")
if k in by:
    rs = [r for r in rows if (r[0], r[1], r[2]) == k]
    selects = [float(dict(kv.split("=") for kv in r[9].split())["select"]) for r in rs]
    rsvds = [float(dict(kv.split("=") for kv in r[9].split())["rsvd"]) for r in rs]
    svds = [float(dict(kv.split("=") for kv in r[9].split())["svd"]) for r in rs]
    print("\n### pick on %s with --docs 50 --terms 50 --rank 50 (medians)\n" % largest)
    print("| select s | its reference SVD s | one randomized SVD of rank 50 s | select / randomized SVD |")
    print("| --- | --- | --- | --- |")
    print("| %.2f | %.2f | %.2f | %.2f |" % (med(selects), med(svds), med(rsvds), med([s / r for s, r in zip(selects, rsvds)])))
for name in ("ingestpipe-ids.txt", "ingestpipe-maps.txt"):
    p = os.path.join(out, name)
    if os.path.exists(p):
        print("\n### bench/ingestpipe %s (%s)\n" % (largest, name[11:-4]))
        print("```")
        print(open(p).read().rstrip())
        print("```")
EOF
