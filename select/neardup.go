package selection

import (
	"math"
	"slices"

	"github.com/james-bowman/sparse"

	"assay/sparsemat"
)

// Near-duplicate detection.
//
// Documents are compared by their word shingles — runs of consecutive
// index terms, computed by the caller before pruning — with MinHash
// (Broder, "On the resemblance and containment of documents", 1997): a
// document's signature holds [MinHashes] minima of hashes of its shingles,
// made by one-permutation hashing with densification (see [MinHash]). Two
// documents agree in one place of their signatures with probability equal
// to the Jaccard similarity of their shingle sets, so the share of
// agreeing places estimates it with standard error about √(J(1−J)/128) ≤
// 1/(2√128) ≈ 0.044 (one-permutation hashing samples the places without
// replacement, which if anything lowers the variance).
//
// Candidate pairs come from locality-sensitive hashing: the signature is
// cut into [MinHashBands] bands of [MinHashRows] values, and documents
// whose band is identical in at least one band land in the same bucket. A
// pair with Jaccard J becomes a candidate with probability 1 − (1 − J⁴)³²:
// above 0.999 at J = 0.7, 0.87 at J = 0.5, 0.003 at J = 0.1 — near-copies
// are found (a copy with three words changed in a hundred keeps J ≈ 0.75
// of its three-word shingles) while unrelated documents are seldom
// compared; and a bucket costs comparisons in proportion to its size, so
// the rare unrelated pair costs one cosine. (With 16 bands of 8 rows a
// planted copy at J ≈ 0.76 was missed: its chance is only 0.85.) Each
// candidate is then confirmed by the cosine of the two weighted rows,
// which is what the threshold is about. Requiring both keeps apart
// documents that look alike only after pruning (two short letters whose
// few surviving terms are the same). In a bucket each document is compared
// with the bucket's first and with the one before it, so a bucket costs
// time in proportion to its size; clusters are the connected components of
// the confirmed pairs.

// minCandidateJaccard is the estimated Jaccard below which a candidate pair
// is not worth a cosine.
const minCandidateJaccard = 0.25

// MinHash parameters: 32 bands of 4 rows make 128 hashes.
const (
	MinHashBands = 32
	MinHashRows  = 4
	MinHashes    = MinHashBands * MinHashRows
)

// MinHash writes the MinHash signature of a set of items (hashes of
// shingles; repeats do not matter) into dst, which must hold MinHashes
// values. An empty set gives all-ones.
//
// The signature is made by one-permutation hashing (Li, Owen and Zhang,
// "One permutation hashing", NIPS 2012): each item is hashed once
// (SplitMix64 of the item and the seed), the top 7 bits of the hash choose
// one of the 128 places (bins) and the low 32 bits are its value; a place
// keeps the least value that fell into it. Places no item fell into are
// filled by optimal densification (Shrivastava, "Optimal densification
// for fast and accurate minwise hashing", ICML 2017): an empty place k
// takes the value of the first non-empty place in a pseudo-random sequence
// of places that depends only on k and the seed, the same for every
// document. Two signatures then agree in a place with probability equal
// to the Jaccard similarity of the two sets, as with 128 independent hash
// functions, at the cost of one hash an item instead of 128.
func MinHash(dst []uint32, items []uint64, seed uint64) {
	if len(dst) != MinHashes {
		panic("selection: MinHash needs a signature of MinHashes values")
	}
	if len(items) == 0 {
		for k := range dst {
			dst[k] = math.MaxUint32
		}
		return
	}
	var bins minBins
	bins.reset()
	for _, it := range items {
		bins.add(it, seed)
	}
	bins.write(dst, seed)
}

// minBins are the places of a signature while it is made: each holds the
// least 32-bit value that fell into it, or minEmpty.
type minBins [MinHashes]uint64

// minEmpty marks a place no item fell into; it is above every 32-bit value.
const minEmpty = uint64(1) << 32

func (b *minBins) reset() {
	for k := range b {
		b[k] = minEmpty
	}
}

// add hashes one item into its place.
func (b *minBins) add(it, seed uint64) {
	h := splitmix(it ^ seed)
	k := h >> (64 - minHashBinBits)
	b[k] = min(b[k], h&0xffffffff)
}

// write fills the empty places (at least one item was added) and writes
// the signature into dst.
func (b *minBins) write(dst []uint32, seed uint64) {
	for k, v := range b {
		if v == minEmpty {
			v = densify(b, k, seed)
		}
		dst[k] = uint32(v)
	}
}

// minHashBinBits is log2(MinHashes).
const minHashBinBits = 7

// densify returns the value an empty place k borrows: the first non-empty
// place of the sequence h(k, 1), h(k, 2), … (a hash of k, the attempt and
// the seed). At least one place is non-empty, so the sequence ends; after
// 4096 attempts (a chance of (127/128)^4096 < 2e-14 with one non-empty
// place) the places after k are scanned in turn, which ends too.
func densify(bins *minBins, k int, seed uint64) uint64 {
	for t := uint64(1); t <= 4096; t++ {
		j := splitmix(seed^0x2545f4914f6cdd1d^uint64(k)<<16^t) >> (64 - minHashBinBits)
		if v := bins[j]; v != minEmpty {
			return v
		}
	}
	for d := 1; ; d++ {
		if v := bins[(k+d)%MinHashes]; v != minEmpty {
			return v
		}
	}
}

// EstimateJaccard is the share of places where the signatures of rows i
// and j agree (sig holds MinHashes values a row).
func EstimateJaccard(sig []uint32, i, j int) float64 {
	a, b := sig[i*MinHashes:(i+1)*MinHashes], sig[j*MinHashes:(j+1)*MinHashes]
	same := 0
	for k := range a {
		if a[k] == b[k] {
			same++
		}
	}
	return float64(same) / MinHashes
}

// NearDuplicates returns the clusters of rows of a joined by candidate
// pairs (from the MinHash signatures sig, MinHashes values a row, as
// [MinHash] writes them) whose cosine is at least threshold, as the
// comment above describes. Each cluster lists its rows in increasing
// order; clusters are ordered by their first row; rows in no cluster are
// left out. The result depends only on a, sig and threshold.
func NearDuplicates(a *sparse.CSR, sig []uint32, threshold float64) [][]int {
	m, _ := a.Dims()
	if len(sig) != m*MinHashes {
		panic("selection: NearDuplicates needs one signature a row")
	}
	norms := rowNorms(a)
	parent := make([]int, m)
	for i := range parent {
		parent[i] = i
	}
	var find func(int) int
	find = func(x int) int {
		for parent[x] != x {
			parent[x] = parent[parent[x]]
			x = parent[x]
		}
		return x
	}
	union := func(x, y int) {
		rx, ry := find(x), find(y)
		if rx == ry {
			return
		}
		if rx > ry {
			rx, ry = ry, rx
		}
		parent[ry] = rx
	}
	raw := a.RawMatrix()
	// A pair is checked once, however many bands it meets in, and only
	// when its signatures agree in at least a quarter of their places
	// (an estimated Jaccard of 0.25: far below any near-copy, and it saves
	// the cosine for the pairs a band threw together by chance).
	checked := make(map[uint64]struct{})
	try := func(x, y int) {
		if find(x) == find(y) || norms[x] == 0 || norms[y] == 0 {
			return
		}
		key := uint64(min(x, y))<<32 | uint64(max(x, y))
		if _, seen := checked[key]; seen {
			return
		}
		checked[key] = struct{}{}
		if EstimateJaccard(sig, x, y) < minCandidateJaccard {
			return
		}
		if rowDot(raw.Indptr, raw.Ind, raw.Data, x, y)/(norms[x]*norms[y]) >= threshold {
			union(x, y)
		}
	}
	// The rows of each band are sorted by their band key (stably, so a
	// bucket lists its rows in increasing order) and the buckets are the
	// runs of equal keys. Which pairs are tried depends only on the
	// buckets, and the clusters are the components of the pairs that pass,
	// so the order of the tries does not change the result.
	live := make([]int32, 0, m) // the rows that can join a cluster
	for i := range m {
		if norms[i] != 0 {
			live = append(live, int32(i))
		}
	}
	var group [bandGroup]bandRows
	for g := range group {
		group[g] = newBandRows(len(live))
	}
	for b0 := 0; b0 < MinHashBands; b0 += bandGroup {
		bandKeys(&group, sig, live, b0)
		forBlocks(bandGroup, func(g int) { group[g].sort(live) })
		for g := range group {
			keys, rows := group[g].keys, group[g].rows
			for s := 0; s < len(keys); {
				e := s + 1
				for e < len(keys) && keys[e] == keys[s] {
					e++
				}
				for t := s + 1; t < e; t++ {
					try(int(rows[s]), int(rows[t]))
					if t > s+1 {
						try(int(rows[t-1]), int(rows[t]))
					}
				}
				s = e
			}
		}
	}
	// A cluster's root is its least row (union keeps the smaller root), so
	// clusters come out in the order of their first rows.
	size := make([]int32, m)
	for i := range m {
		parent[i] = find(i)
		size[parent[i]]++
	}
	var out [][]int
	at := make([]int32, m) // a root's cluster in out
	for i, r := range parent {
		if size[r] < 2 {
			continue
		}
		if r == i {
			at[r] = int32(len(out))
			out = append(out, make([]int, 0, size[r]))
		}
		out[at[r]] = append(out[at[r]], i)
	}
	return out
}

// MaxPairCosine returns the largest cosine between two of the given rows
// of a (0 for fewer than two), and the pair.
func MaxPairCosine(a *sparse.CSR, rows []int) (float64, int, int) {
	raw := a.RawMatrix()
	norms := rowNorms(a)
	best, bi, bj := 0.0, -1, -1
	for x := range rows {
		for y := x + 1; y < len(rows); y++ {
			i, j := rows[x], rows[y]
			if norms[i] == 0 || norms[j] == 0 {
				continue
			}
			if c := rowDot(raw.Indptr, raw.Ind, raw.Data, i, j) / (norms[i] * norms[j]); c > best {
				best, bi, bj = c, i, j
			}
		}
	}
	return best, bi, bj
}

// rowNorms returns the Euclidean norm of every row of a.
func rowNorms(a *sparse.CSR) []float64 { return sqrtAll(sparsemat.RowSqNorms(a)) }

// sqrtAll replaces every value of x by its square root and returns x.
func sqrtAll(x []float64) []float64 {
	for i, v := range x {
		x[i] = math.Sqrt(v)
	}
	return x
}

// rowDot is the dot product of rows x and y of a CSR (sorted indices).
func rowDot(indptr, ind []int, data []float64, x, y int) float64 {
	p, pe := indptr[x], indptr[x+1]
	q, qe := indptr[y], indptr[y+1]
	var s float64
	for p < pe && q < qe {
		switch {
		case ind[p] < ind[q]:
			p++
		case ind[p] > ind[q]:
			q++
		default:
			s += data[p] * data[q]
			p++
			q++
		}
	}
	return s
}

// bandGroup is the number of bands whose keys are made in one pass over
// the signatures: 4 bands of 4 values are 64 bytes, one cache line of a
// signature.
const bandGroup = 4

// bandRows holds the rows of one band with their band keys, and the spare
// arrays of the sort.
type bandRows struct {
	keys, spareKeys []uint64
	rows, spareRows []int32
}

func newBandRows(n int) bandRows {
	return bandRows{keys: make([]uint64, n), spareKeys: make([]uint64, n), rows: make([]int32, n), spareRows: make([]int32, n)}
}

// bandKeys writes the keys of bands b0 … b0+bandGroup−1 of the rows live
// into group, rows split in fixed blocks over the cores.
func bandKeys(group *[bandGroup]bandRows, sig []uint32, live []int32, b0 int) {
	const block = 8192
	forBlocks((len(live)+block-1)/block, func(b int) {
		for t := b * block; t < min((b+1)*block, len(live)); t++ {
			s := sig[int(live[t])*MinHashes+b0*MinHashRows:]
			for g := range group {
				group[g].keys[t] = bandKey(s[g*MinHashRows : (g+1)*MinHashRows])
			}
		}
	})
}

// radixBits is the width of a digit of the band-key sort: 6 passes of 11
// bits cover 64, and 2,048 counters stay in the first-level cache.
const radixBits = 11

// The sort's passes swap its arrays; their number must be even (this does
// not compile otherwise).
var _ = [1]struct{}{}[(64+radixBits-1)/radixBits%2]

// sort sets b.rows to live and sorts the pairs (key, row) by key with a
// least-significant-digit radix sort, which is stable: rows of equal key
// stay in increasing order.
func (b *bandRows) sort(live []int32) {
	copy(b.rows, live)
	keys, rows, spareKeys, spareRows := b.keys, b.rows, b.spareKeys, b.spareRows
	var count [1 << radixBits]int
	for shift := 0; shift < 64; shift += radixBits {
		clear(count[:])
		for _, k := range keys {
			count[k>>shift&(1<<radixBits-1)]++
		}
		sum := 0
		for d, c := range count {
			count[d] = sum
			sum += c
		}
		for i, k := range keys {
			d := k >> shift & (1<<radixBits - 1)
			spareKeys[count[d]] = k
			spareRows[count[d]] = rows[i]
			count[d]++
		}
		keys, spareKeys = spareKeys, keys
		rows, spareRows = spareRows, rows
	}
	// An even number of passes leaves the result in b.keys and b.rows.
}

// bandKey is a 64-bit hash of a band's MinHashRows values, taken two at a
// time. Two bands that differ share a key with chance about 2⁻⁶⁴; if they
// did, their rows would only become candidates, which the estimated
// Jaccard and the cosine still have to confirm.
func bandKey(vals []uint32) uint64 {
	var _ = [1]struct{}{}[MinHashRows-4] // written for bands of 4 values
	_ = vals[3]
	lo := uint64(vals[0]) | uint64(vals[1])<<32
	hi := uint64(vals[2]) | uint64(vals[3])<<32
	return splitmix(splitmix(lo^0x84222325cbf29ce4) ^ hi)
}

// splitmix is the SplitMix64 finaliser (Steele, Lea and Flood, "Fast
// splittable pseudorandom number generators", OOPSLA 2014): a fast 64-bit
// mixing function.
func splitmix(x uint64) uint64 {
	x += 0x9e3779b97f4a7c15
	x = (x ^ (x >> 30)) * 0xbf58476d1ce4e5b9
	x = (x ^ (x >> 27)) * 0x94d049bb133111eb
	return x ^ (x >> 31)
}

// nearAny reports whether row cand has cosine at least threshold with the
// row of one of the picks.
func nearAny(indptr, ind []int, data []float64, norms []float64, cand int, picks []Pick, threshold float64) bool {
	nc := norms[cand]
	if nc == 0 {
		return false
	}
	for _, p := range picks {
		np := norms[p.Index]
		if np == 0 {
			continue
		}
		if rowDot(indptr, ind, data, cand, p.Index)/(np*nc) >= threshold {
			return true
		}
	}
	return false
}

// dropNear removes, in pick order, every pick whose row has cosine at
// least threshold with an earlier kept pick.
func dropNear(a *sparse.CSR, picks []Pick, threshold float64) []Pick {
	raw := a.RawMatrix()
	norms := rowNorms(a)
	var kept []Pick
	ordered := slices.Clone(picks)
	slices.SortStableFunc(ordered, func(x, y Pick) int { return x.Order - y.Order })
	for _, p := range ordered {
		ok := true
		for _, q := range kept {
			if norms[p.Index] > 0 && norms[q.Index] > 0 &&
				rowDot(raw.Indptr, raw.Ind, raw.Data, p.Index, q.Index)/(norms[p.Index]*norms[q.Index]) >= threshold {
				ok = false
				break
			}
		}
		if ok {
			kept = append(kept, p)
		}
	}
	return kept
}
