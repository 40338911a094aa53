package sparsemat

import (
	"hash/maphash"
	"math"
	"slices"

	"github.com/james-bowman/sparse"
)

// CollapseRows merges rows of a that are exactly equal (same columns, same
// bits). It returns the matrix of distinct rows, in order of first
// appearance, each scaled by √t where t is the number of copies, and for
// each of its rows the indices in a of the copies, first copy first.
//
// The scaling keeps everything a CUR decomposition measures: if A = P·A'
// with P the m×m' matrix that holds 1/√t in the copies of each row, then
// PᵀP = I, so ‖A − P·X‖_F = ‖A' − X‖_F for any X, and A and A' have the
// same singular values and the same row-space projections.
//
// When no two rows are equal it returns a itself and nil groups.
func CollapseRows(a *sparse.CSR) (*sparse.CSR, [][]int) {
	raw := a.RawMatrix()
	m := raw.I
	seed := maphash.MakeSeed() // only buckets candidates; equality decides
	buckets := make(map[uint64][]int, m)
	group := make([]int, m) // row -> index of its group
	var groups [][]int
	for i := range m {
		h := rowHash(seed, raw.Ind[raw.Indptr[i]:raw.Indptr[i+1]], raw.Data[raw.Indptr[i]:raw.Indptr[i+1]])
		found := -1
		for _, g := range buckets[h] {
			if rowsEqual(raw.Indptr, raw.Ind, raw.Data, groups[g][0], i) {
				found = g
				break
			}
		}
		if found < 0 {
			found = len(groups)
			groups = append(groups, []int{i})
			buckets[h] = append(buckets[h], found)
		} else {
			groups[found] = append(groups[found], i)
		}
		group[i] = found
	}
	if len(groups) == m {
		return a, nil
	}
	ia := make([]int, 1, len(groups)+1)
	var ja []int
	var data []float64
	for _, g := range groups {
		i := g[0]
		scale := math.Sqrt(float64(len(g)))
		ja = append(ja, raw.Ind[raw.Indptr[i]:raw.Indptr[i+1]]...)
		for _, v := range raw.Data[raw.Indptr[i]:raw.Indptr[i+1]] {
			data = append(data, v*scale)
		}
		ia = append(ia, len(ja))
	}
	return sparse.NewCSR(len(groups), raw.J, ia, ja, data), groups
}

func rowHash(seed maphash.Seed, ind []int, data []float64) uint64 {
	var h maphash.Hash
	h.SetSeed(seed)
	var buf [8]byte
	for k, j := range ind {
		putUint64(buf[:], uint64(j))
		h.Write(buf[:])
		putUint64(buf[:], math.Float64bits(data[k]))
		h.Write(buf[:])
	}
	return h.Sum64()
}

func putUint64(b []byte, v uint64) {
	for i := range 8 {
		b[i] = byte(v >> (8 * i))
	}
}

func rowsEqual(indptr, ind []int, data []float64, i, j int) bool {
	a, b := indptr[i], indptr[j]
	n := indptr[i+1] - a
	if n != indptr[j+1]-b {
		return false
	}
	return slices.Equal(ind[a:a+n], ind[b:b+n]) && slices.EqualFunc(data[a:a+n], data[b:b+n], func(x, y float64) bool {
		return math.Float64bits(x) == math.Float64bits(y)
	})
}

// MergeRows replaces each group of rows of a (groups of row indices, each
// sorted, disjoint) by one row: the group's first row, scaled so that its
// squared norm is the sum of the squared norms of the group's rows (the
// group keeps its share of ‖a‖_F²). Rows in no group are kept. Rows keep
// their relative order; it returns the new matrix and, for each of its
// rows, the row of a it came from. Groups of one row change nothing.
func MergeRows(a *sparse.CSR, groups [][]int) (*sparse.CSR, []int) {
	raw := a.RawMatrix()
	m := raw.I
	sq := RowSqNorms(a)
	drop := make([]bool, m)
	scale := make([]float64, m)
	for i := range scale {
		scale[i] = 1
	}
	for _, g := range groups {
		if len(g) < 2 {
			continue
		}
		var mass float64
		for _, i := range g {
			mass += sq[i]
		}
		if sq[g[0]] > 0 {
			scale[g[0]] = math.Sqrt(mass / sq[g[0]])
		}
		for _, i := range g[1:] {
			drop[i] = true
		}
	}
	// Sized exactly first: growing arrays of the size of the matrix by
	// appends cost more than the merge itself (2 s at 100,000 documents).
	rows, nnz := 0, 0
	for i := range m {
		if !drop[i] {
			rows++
			nnz += raw.Indptr[i+1] - raw.Indptr[i]
		}
	}
	ia := make([]int, 1, rows+1)
	ja := make([]int, 0, nnz)
	data := make([]float64, 0, nnz)
	from := make([]int, 0, rows)
	for i := range m {
		if drop[i] {
			continue
		}
		ja = append(ja, raw.Ind[raw.Indptr[i]:raw.Indptr[i+1]]...)
		for _, v := range raw.Data[raw.Indptr[i]:raw.Indptr[i+1]] {
			data = append(data, v*scale[i])
		}
		ia = append(ia, len(ja))
		from = append(from, i)
	}
	return sparse.NewCSR(len(from), raw.J, ia, ja, data), from
}
