package sparsemat

import (
	"fmt"
	"math"

	"github.com/james-bowman/sparse"
	"github.com/james-bowman/sparse/blas"
)

// TF is the term-frequency part of a weighting.
type TF string

// IDF is the inverse-document-frequency part of a weighting.
type IDF string

// Norm is the row normalisation of a weighting.
type Norm string

// The weighting choices. Names follow the usual retrieval vocabulary.
const (
	TFLog    TF = "log"    // 1 + ln(count): sublinear tf (default)
	TFRaw    TF = "raw"    // count
	TFBinary TF = "binary" // 1 when the term occurs

	IDFSmooth IDF = "smooth" // ln((1+m)/(1+df)) + 1 (default)
	IDFPlain  IDF = "plain"  // ln(m/df) + 1
	IDFNone   IDF = "none"   // 1

	NormL2   Norm = "l2"   // rows scaled to unit Euclidean norm (default)
	NormL1   Norm = "l1"   // rows scaled to unit sum of absolute values
	NormNone Norm = "none" // rows left as weighted
)

// Weighting chooses how counts become weights.
type Weighting struct {
	TF   TF
	IDF  IDF
	Norm Norm
}

// DefaultWeighting is sublinear tf, smooth idf and L2 rows.
var DefaultWeighting = Weighting{TF: TFLog, IDF: IDFSmooth, Norm: NormL2}

// Validate reports an unknown choice.
func (w Weighting) Validate() error {
	switch w.TF {
	case TFLog, TFRaw, TFBinary:
	default:
		return fmt.Errorf("unknown tf %q (allowed: log, raw, binary)", w.TF)
	}
	switch w.IDF {
	case IDFSmooth, IDFPlain, IDFNone:
	default:
		return fmt.Errorf("unknown idf %q (allowed: smooth, plain, none)", w.IDF)
	}
	switch w.Norm {
	case NormL2, NormL1, NormNone:
	default:
		return fmt.Errorf("unknown norm %q (allowed: l2, l1, none)", w.Norm)
	}
	return nil
}

// String gives the weighting as "tf=log idf=smooth norm=l2".
func (w Weighting) String() string {
	return fmt.Sprintf("tf=%s idf=%s norm=%s", w.TF, w.IDF, w.Norm)
}

// IDFValues returns the idf of every column of c under w.
func IDFValues(c *Counts, w IDF) []float64 {
	m := float64(c.Documents)
	idf := make([]float64, len(c.DF))
	for j, df := range c.DF {
		d := float64(df)
		switch w {
		case IDFSmooth:
			idf[j] = math.Log((1+m)/(1+d)) + 1
		case IDFPlain:
			idf[j] = math.Log(m/d) + 1
		default:
			idf[j] = 1
		}
	}
	return idf
}

// Weight returns the weighted matrix of c under w: a CSR with the same
// pattern and new values. Its row pointers and column indices are those of
// c.Matrix, shared, not copied (at a million documents the copy was more
// than a gigabyte); nothing in this module changes a matrix's pattern in
// place, and neither must a caller. It panics if w is not valid; call
// [Weighting.Validate] first. Rows whose weights are all zero stay zero
// under any normalisation.
func Weight(c *Counts, w Weighting) *sparse.CSR {
	return weightInto(c, w, make([]float64, c.Matrix.NNZ()))
}

// WeightInPlace is [Weight] for a caller that needs the counts no more: it
// writes the weights over the counts' own values and returns c.Matrix so
// weighted, and sets c.Matrix to nil. The result is the same, bit for bit,
// without a second array of values (1.2 GB at a million documents, each
// page of it new memory for the kernel to zero). c's other fields stay.
func WeightInPlace(c *Counts, w Weighting) *sparse.CSR {
	a := weightInto(c, w, c.Matrix.RawMatrix().Data)
	c.Matrix = nil
	return a
}

// weightInto writes the weights of c under w into data, which is either a
// new array as long as c's values or those values themselves: each value
// is read before its weight is written, and a row's norm is taken from
// the weights.
func weightInto(c *Counts, w Weighting, data []float64) *sparse.CSR {
	if err := w.Validate(); err != nil {
		panic("sparsemat: " + err.Error())
	}
	raw := c.Matrix.RawMatrix()
	idf := IDFValues(c, w.IDF)
	// Each row is weighted on its own, so the rows are shared out in
	// blocks over the cores; the bits do not depend on the split.
	const blockRows = 4096
	parallelBlocks((raw.I+blockRows-1)/blockRows, func(b int) {
		for i := b * blockRows; i < min((b+1)*blockRows, raw.I); i++ {
			weightRow(raw, idf, w, data, i)
		}
	})
	return sparse.NewCSR(raw.I, raw.J, raw.Indptr, raw.Ind, data)
}

// weightRow writes the weights of row i of raw into data.
func weightRow(raw *blas.SparseMatrix, idf []float64, w Weighting, data []float64, i int) {
	lo, hi := raw.Indptr[i], raw.Indptr[i+1]
	for k := lo; k < hi; k++ {
		tf := raw.Data[k]
		switch w.TF {
		case TFLog:
			tf = 1 + math.Log(tf)
		case TFBinary:
			tf = 1
		}
		data[k] = tf * idf[raw.Ind[k]]
	}
	var s float64
	switch w.Norm {
	case NormL2:
		for _, v := range data[lo:hi] {
			s += v * v
		}
		s = math.Sqrt(s)
	case NormL1:
		for _, v := range data[lo:hi] {
			s += math.Abs(v)
		}
	}
	if s > 0 {
		for k := lo; k < hi; k++ {
			data[k] /= s
		}
	}
}
