package sparsemat

import (
	"runtime"
	"slices"
	"sync"

	"github.com/james-bowman/sparse"
	"github.com/james-bowman/sparse/blas"
	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"
)

// blockNNZ is the target number of stored values per block of rows handed
// to one goroutine. Every output row is summed by one goroutine in storage
// order, so the split changes only the speed, never the bits.
const blockNNZ = 1 << 14

// MulDense sets dst = a·x, where a is m×n sparse and x is n×p dense. A
// zero-value dst is sized to m×p; a dst of another shape panics, as do
// mismatched shapes. The rows of dst are computed in parallel.
func MulDense(dst *mat.Dense, a *sparse.CSR, x *mat.Dense) {
	raw := a.RawMatrix()
	m, n := raw.I, raw.J
	xr, p := x.Dims()
	if xr != n {
		panic(mat.ErrShape)
	}
	if dst.IsEmpty() {
		dst.ReuseAs(m, p)
	} else if r, c := dst.Dims(); r != m || c != p {
		panic(mat.ErrShape)
	} else {
		dst.Zero()
	}
	if m == 0 || p == 0 {
		return
	}
	d := dst.RawMatrix()
	xs := x.RawMatrix()
	rowRange := func(lo, hi int) {
		if p == 1 { // a vector: a plain dot product per row, no call per entry
			for i := lo; i < hi; i++ {
				var sum float64
				for k := raw.Indptr[i]; k < raw.Indptr[i+1]; k++ {
					sum += raw.Data[k] * xs.Data[raw.Ind[k]*xs.Stride]
				}
				d.Data[i*d.Stride] = sum
			}
			return
		}
		for i := lo; i < hi; i++ {
			out := d.Data[i*d.Stride : i*d.Stride+p]
			for k := raw.Indptr[i]; k < raw.Indptr[i+1]; k++ {
				j := raw.Ind[k]
				floats.AddScaled(out, raw.Data[k], xs.Data[j*xs.Stride:j*xs.Stride+p])
			}
		}
	}
	blocks := rowBlocks(raw.Indptr, blockNNZ)
	workers := min(runtime.GOMAXPROCS(0), len(blocks)-1)
	if workers <= 1 {
		rowRange(0, m)
		return
	}
	var wg sync.WaitGroup
	next := make(chan int, len(blocks)-1)
	for b := 0; b+1 < len(blocks); b++ {
		next <- b
	}
	close(next)
	for range workers {
		wg.Go(func() {
			for b := range next {
				rowRange(blocks[b], blocks[b+1])
			}
		})
	}
	wg.Wait()
}

// rowBlocks splits the rows of a CSR into consecutive blocks of about
// target stored values each; it returns the block boundaries, first 0 and
// last the row count.
func rowBlocks(indptr []int, target int) []int {
	m := len(indptr) - 1
	bounds := []int{0}
	start := 0
	for i := 1; i <= m; i++ {
		if indptr[i]-indptr[start] >= target {
			bounds = append(bounds, i)
			start = i
		}
	}
	if bounds[len(bounds)-1] != m {
		bounds = append(bounds, m)
	}
	return bounds
}

// MulDenseT sets dst = aᵀ·y, where a is m×n sparse and y is m×p dense,
// without forming aᵀ. A zero-value dst is sized to n×p; a dst of another
// shape panics, as do mismatched shapes.
//
// The columns of a (the rows of dst) are split into contiguous ranges of
// about equal numbers of stored values, one range per goroutine. Each
// goroutine walks every row of a, finds the part of the row inside its
// range by binary search, and adds a_ij·y(i, :) into dst(j, :). Every row
// of dst is thus summed by one goroutine in row order, so the bits do not
// depend on the split, no partial copies of dst are needed, and each stored
// value is read once.
func MulDenseT(dst *mat.Dense, a *sparse.CSR, y *mat.Dense) {
	raw := a.RawMatrix()
	m, n := raw.I, raw.J
	yr, p := y.Dims()
	if yr != m {
		panic(mat.ErrShape)
	}
	if dst.IsEmpty() {
		dst.ReuseAs(n, p)
	} else if r, c := dst.Dims(); r != n || c != p {
		panic(mat.ErrShape)
	} else {
		dst.Zero()
	}
	if n == 0 || p == 0 {
		return
	}
	d := dst.RawMatrix()
	ys := y.RawMatrix()
	if p == 1 {
		mulVecT(d.Data, d.Stride, raw, ys.Data, ys.Stride)
		return
	}
	colRange := func(lo, hi int) {
		for i := range m {
			row := raw.Ind[raw.Indptr[i]:raw.Indptr[i+1]]
			k0, _ := slices.BinarySearch(row, lo)
			yrow := ys.Data[i*ys.Stride : i*ys.Stride+p]
			for k := k0; k < len(row) && row[k] < hi; k++ {
				j := row[k]
				floats.AddScaled(d.Data[j*d.Stride:j*d.Stride+p], raw.Data[raw.Indptr[i]+k], yrow)
			}
		}
	}
	nnz := raw.Indptr[m]
	workers := min(runtime.GOMAXPROCS(0), n, max(1, nnz/blockNNZ))
	if workers <= 1 {
		colRange(0, n)
		return
	}
	bounds := columnSplit(raw.Ind[:nnz], n, workers)
	var wg sync.WaitGroup
	for w := range workers {
		lo, hi := bounds[w], bounds[w+1]
		wg.Go(func() { colRange(lo, hi) })
	}
	wg.Wait()
}

// vecBlockNNZ is the least number of stored values per block of rows in
// aᵀ·y for one vector y, and vecBlocks the most parts: a matrix of fewer
// than 2·vecBlockNNZ values is one block (the plain scatter), a larger one
// is cut into at most vecBlocks parts of about equal numbers of values
// (whole rows, so one more, shorter block may be left at the end).
// (A variable, so that the tests can split small matrices.)
var vecBlockNNZ = 1 << 20

const vecBlocks = 8

// mulVecT sets out[j·stride] = (aᵀ·y)_j for the vector y (y[i·ystride]),
// out zeroed by the caller. The rows of a are cut into blocks that depend
// on a alone (vecBlockNNZ, vecBlocks); each block scatters a_ij·y_i into
// its own partial sum of length n in row order, on as many goroutines as
// there are blocks and processors, and the partial sums are added in
// block order. The bits therefore do not depend on GOMAXPROCS, and the
// extra memory is at most vecBlocks + 1 vectors of length n. A single
// goroutine scattering over all of A is bound by its reads (100,000×60,000,
// 146 values a row: 38.5 ms on one core).
func mulVecT(out []float64, stride int, raw *blas.SparseMatrix, y []float64, ystride int) {
	m, n := raw.I, raw.J
	nnz := raw.Indptr[m]
	scatter := func(dst []float64, dstStride, lo, hi int) {
		for i := lo; i < hi; i++ {
			yi := y[i*ystride]
			for k := raw.Indptr[i]; k < raw.Indptr[i+1]; k++ {
				dst[raw.Ind[k]*dstStride] += raw.Data[k] * yi
			}
		}
	}
	parts := min(vecBlocks, nnz/vecBlockNNZ)
	if parts <= 1 {
		scatter(out, stride, 0, m)
		return
	}
	bounds := rowBlocks(raw.Indptr, (nnz+parts-1)/parts)
	blocks := len(bounds) - 1
	partial := make([][]float64, blocks)
	parallelBlocks(blocks, func(b int) {
		partial[b] = make([]float64, n)
		scatter(partial[b], 1, bounds[b], bounds[b+1])
	})
	for j := range n {
		s := partial[0][j]
		for _, part := range partial[1:] {
			s += part[j]
		}
		out[j*stride] = s
	}
}

// columnSplit returns parts+1 column boundaries that split the stored
// values ind into parts ranges of about equal size.
func columnSplit(ind []int, n, parts int) []int {
	counts := make([]int, n)
	for _, j := range ind {
		counts[j]++
	}
	bounds := make([]int, 1, parts+1)
	acc, next := 0, 1
	for j, c := range counts {
		acc += c
		for next < parts && acc*parts >= next*len(ind) {
			bounds = append(bounds, j+1)
			next++
		}
	}
	for len(bounds) <= parts {
		bounds = append(bounds, n)
	}
	bounds[parts] = n
	return bounds
}
