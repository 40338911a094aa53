# bench/lib.sh — shell functions shared by the bench scripts (sourced, not run).

# gen_corpus NAME N [NEAR]: makes $DEST/gen/NAME with bench/gen (seed 1,
# N documents, NEAR the share of planted near-copies) unless its stamp file
# says it is there for this version of bench/gen. Every script that makes a
# generated corpus goes through here, so they share the corpora.
gen_corpus() {
	local name=$1 n=$2 near=${3:-} key
	key="$n 1 $(sha1sum bench/gen/main.go | cut -c1-12)${near:+ near $near}"
	if [ "$(cat "$DEST/gen/$name.stamp" 2>/dev/null)" != "$key" ]; then
		rm -rf "$DEST/gen/$name"
		go run ./bench/gen -n "$n" -seed 1 ${near:+-near "$near"} -out "$DEST/gen/$name" >&2
		echo "$key" >"$DEST/gen/$name.stamp"
	fi
}

# bytes_of DIR: the sum of the sizes of the files below DIR (hidden ones
# left out), the raw input that MB/s figures are of. printf, because awk's
# print writes a sum past 2^31 as 2.59851e+09, which bc refuses.
bytes_of() { find "$1" -type f ! -name '.*' -printf '%s\n' | awk '{s += $1} END {printf "%.0f\n", s}'; }
