package sparsemat

import (
	"runtime"
	"slices"
	"sync"

	"github.com/james-bowman/sparse"
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
	colRange := func(lo, hi int) {
		if p == 1 && lo == 0 && hi == n { // a vector, one goroutine: scatter scalars
			for i := range m {
				yi := ys.Data[i*ys.Stride]
				for k := raw.Indptr[i]; k < raw.Indptr[i+1]; k++ {
					d.Data[raw.Ind[k]*d.Stride] += raw.Data[k] * yi
				}
			}
			return
		}
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
	if p == 1 {
		workers = 1 // a vector product is bound by memory, not arithmetic
	}
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
