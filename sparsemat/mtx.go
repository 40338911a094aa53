package sparsemat

import (
	"bufio"
	"fmt"
	"io"
	"strconv"

	"github.com/james-bowman/sparse"
)

// WriteMatrixMarket writes a in the Matrix Market exchange format
// (coordinate, real, general; NIST, "The Matrix Market Exchange Formats:
// Initial Design", 1996): a header line, optional comment lines (each given
// line is written after "%"), the size line "rows cols entries", then one
// "row col value" line per stored entry with 1-based indices, in row-major
// order. Values are written with the shortest representation that reads
// back to the same float64.
func WriteMatrixMarket(w io.Writer, a *sparse.CSR, comments ...string) error {
	bw := bufio.NewWriter(w)
	raw := a.RawMatrix()
	fmt.Fprintln(bw, "%%MatrixMarket matrix coordinate real general")
	for _, c := range comments {
		fmt.Fprintf(bw, "%%%s\n", c)
	}
	fmt.Fprintf(bw, "%d %d %d\n", raw.I, raw.J, raw.Indptr[raw.I])
	buf := make([]byte, 0, 64)
	for i := range raw.I {
		for k := raw.Indptr[i]; k < raw.Indptr[i+1]; k++ {
			buf = buf[:0]
			buf = strconv.AppendInt(buf, int64(i+1), 10)
			buf = append(buf, ' ')
			buf = strconv.AppendInt(buf, int64(raw.Ind[k]+1), 10)
			buf = append(buf, ' ')
			buf = strconv.AppendFloat(buf, raw.Data[k], 'g', -1, 64)
			buf = append(buf, '\n')
			bw.Write(buf)
		}
	}
	if err := bw.Flush(); err != nil {
		return fmt.Errorf("write matrix market: %w", err)
	}
	return nil
}
