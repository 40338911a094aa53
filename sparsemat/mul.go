package sparsemat

import (
	"runtime"
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
// The p columns of y are split into contiguous ranges, one per goroutine;
// each goroutine streams the whole of a and adds a_ij·y(i, range) into
// dst(j, range). Every element of dst is thus summed by one goroutine in row
// order, so the bits do not depend on the split, and no partial copies of
// dst are needed (a per-goroutine copy of an n×p result would cost more
// memory than the transpose it avoids).
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
		for i := range m {
			yrow := ys.Data[i*ys.Stride+lo : i*ys.Stride+hi]
			for k := raw.Indptr[i]; k < raw.Indptr[i+1]; k++ {
				j := raw.Ind[k]
				floats.AddScaled(d.Data[j*d.Stride+lo:j*d.Stride+hi], raw.Data[k], yrow)
			}
		}
	}
	workers := min(runtime.GOMAXPROCS(0), p, max(1, raw.Indptr[m]/blockNNZ))
	if workers <= 1 {
		colRange(0, p)
		return
	}
	var wg sync.WaitGroup
	for w := range workers {
		lo, hi := w*p/workers, (w+1)*p/workers
		wg.Go(func() { colRange(lo, hi) })
	}
	wg.Wait()
}
