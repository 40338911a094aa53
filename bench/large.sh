#!/usr/bin/env bash
# bench/large.sh [DEST] — the ingest of one large generated corpus (1,000,000
# documents by default), assay and the scikit-learn pipeline side by side,
# one process at a time, with the corpus read into the page cache before
# every run and the disk reads of every run counted.
#
#   bench/large.sh                        # DEST = $ASSAY_CORPORA or ~/.cache/assay-corpora
#   N=100000 RUNS=5 bench/large.sh /tmp/corpora
#   STEM=0 bench/large.sh                 # both sides without stemming
#   ASSAY=/path/to/assay SKLEARN=0 bench/large.sh
#
# Environment: N (1000000) documents of DEST/gen/gen-Nk (made with bench/gen,
# seed 1, when missing or made by another version of it); RUNS (3) rounds, each one assay run and then one
# scikit-learn run; STEM (1) stemming on both sides (assay --lang english,
# ingest_sklearn.py --stem) or off (--no-stem, no --stem); SKLEARN (1) run
# the scikit-learn side; ASSAY a binary to use instead of building
# cmd/assay.
#
# Why the warming and the counting: at this size the corpus (2.6 GB of text,
# 4.8 GB on disk) only just fits the page cache of a 24 GiB machine, the
# disk reads about 40 MB/s cold, and the cache shrinks between runs (the
# scikit-learn side alone takes over 6 GiB), so a run that has to fetch part
# of the corpus again is tens of seconds slower for reasons that are not the
# code. Each run's line gives the megabytes read from disk during it
# (pgpgin in /proc/vmstat): a run that read more than a few hundred MB was
# not warm. Results go to DEST/large/ (the JSON reports, the stderr of each
# run, runs.tsv) and medians are printed at the end.
set -euo pipefail
cd "$(dirname "$0")/.."
. bench/lib.sh
DEST=${1:-${ASSAY_CORPORA:-$HOME/.cache/assay-corpora}}
N=${N:-1000000}
RUNS=${RUNS:-3}
STEM=${STEM:-1}
SKLEARN=${SKLEARN:-1}
PY=/usr/bin/python3
OUT=$DEST/large
CORPUS=$DEST/gen/gen-$((N / 1000))k
mkdir -p "$OUT"

if [ -z "${ASSAY:-}" ]; then
	ASSAY=$OUT/assay
	go build -o "$ASSAY" ./cmd/assay
fi
if [ ! -x /usr/bin/time ]; then
	echo "large.sh: installing Debian's time (for /usr/bin/time -f %M)" >&2
	apt-get install -y -qq time >/dev/null
fi
if [ "$SKLEARN" = 1 ] && ! $PY -c 'import sklearn, snowballstemmer' 2>/dev/null; then
	echo "large.sh: installing python3-sklearn and python3-snowballstemmer" >&2
	apt-get install -y -qq python3-sklearn python3-snowballstemmer >/dev/null
fi
gen_corpus "gen-$((N / 1000))k" "$N"

if [ "$STEM" = 1 ]; then
	lang=(--lang english)
	pystem=(--stem)
else
	lang=(--lang english --no-stem)
	pystem=()
fi

warm() {
	local t0
	t0=$(date +%s.%N)
	find "$CORPUS" -type f -print0 | xargs -0 cat >/dev/null
	echo "large.sh: warmed in $(echo "$(date +%s.%N) - $t0" | bc) s; $(grep '^Cached:' /proc/meminfo | tr -s ' ')" >&2
}
pgpgin() { awk '/^pgpgin/ {print $2}' /proc/vmstat; }

bytes=$(bytes_of "$CORPUS")
TSV=$OUT/runs.tsv
printf 'run\ttool\tseconds\tmb_per_s\tpeak_kib\tdisk_mb\n' >"$TSV"
for r in $(seq "$RUNS"); do
	warm
	before=$(pgpgin)
	/usr/bin/time -f '%e %M' -o "$OUT/assay-$r.time" "$ASSAY" pick "$CORPUS" --timings --format json -q "${lang[@]}" \
		--near-dup off --docs 2 --terms 2 --curve-max 2 >"$OUT/assay-$r.json" 2>"$OUT/assay-$r.err"
	disk=$((($(pgpgin) - before) / 1024))
	secs=$($PY -c 'import json,sys; print(json.load(open(sys.argv[1]))["timings"]["read"])' "$OUT/assay-$r.json")
	peak=$(awk '{print $2}' "$OUT/assay-$r.time")
	mbs=$(echo "scale=2; $bytes / 1000000 / $secs" | bc)
	printf '%s\tassay\t%s\t%s\t%s\t%s\n' "$r" "$secs" "$mbs" "$peak" "$disk" | tee -a "$TSV"
	if [ "$SKLEARN" = 1 ]; then
		warm
		before=$(pgpgin)
		/usr/bin/time -f '%e %M' -o "$OUT/sklearn-$r.time" $PY bench/ingest_sklearn.py "$CORPUS" "${pystem[@]}" --runs 1 --ext .txt \
			>"$OUT/sklearn-$r.json" 2>"$OUT/sklearn-$r.err"
		disk=$((($(pgpgin) - before) / 1024))
		read -r secs mbs < <($PY -c 'import json,sys; r=json.loads(open(sys.argv[1]).read().splitlines()[-1]); print(r["seconds"], round(r["mb_per_s"], 2))' "$OUT/sklearn-$r.json")
		peak=$(awk '{print $2}' "$OUT/sklearn-$r.time")
		printf '%s\tscikit-learn\t%s\t%s\t%s\t%s\n' "$r" "$secs" "$mbs" "$peak" "$disk" | tee -a "$TSV"
	fi
done

$PY - "$TSV" <<'EOF'
import csv, statistics, sys
rows = list(csv.DictReader(open(sys.argv[1]), delimiter="\t"))
med = {}
for tool in ("assay", "scikit-learn"):
    secs = [float(r["seconds"]) for r in rows if r["tool"] == tool]
    if not secs:
        continue
    peak = max(int(r["peak_kib"]) for r in rows if r["tool"] == tool) / 1024
    med[tool] = statistics.median(secs)
    print(f"{tool}: median {med[tool]:.2f} s of {len(secs)} runs ({min(secs):.2f}-{max(secs):.2f}), peak {peak:,.0f} MiB")
if len(med) == 2:
    print(f"ratio of the medians: {med['scikit-learn'] / med['assay']:.1f}x")
EOF
