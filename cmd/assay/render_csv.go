package main

import (
	"encoding/csv"
	"fmt"
	"io"
	"strconv"
	"strings"
)

// writeCSV writes one table of the report as RFC 4180 CSV with a header
// row. Numbers carry 6 significant digits; lists are joined with "; ".
func writeCSV(w io.Writer, rep *Report, table string) error {
	cw := csv.NewWriter(w)
	f := func(n num) string { return strconv.FormatFloat(float64(n), 'g', 6, 64) }
	join := func(s []string) string { return strings.Join(s, "; ") }
	switch table {
	case "exemplars":
		cw.Write([]string{"rank", "id", "title", "language", "picks", "weight", "score", "group_size", "group_share", "key_terms", "members", "duplicates", "near_copies"})
		for i, e := range rep.Exemplars {
			cw.Write([]string{strconv.Itoa(i + 1), e.ID, e.Title, e.Language, strconv.Itoa(e.Picks), f(e.Weight), f(e.Score),
				strconv.Itoa(e.Group.Size), f(e.Group.Share), join(e.Group.KeyTerms), join(e.Group.Members), join(e.Duplicates), join(e.NearCopies)})
		}
	case "terms":
		cw.Write([]string{"rank", "term", "stem", "language", "df", "picks", "weight", "score", "coverage"})
		for i, t := range rep.Terms {
			cw.Write([]string{strconv.Itoa(i + 1), t.Term, t.Stem, t.Language, strconv.Itoa(t.DF), strconv.Itoa(t.Picks), f(t.Weight), f(t.Score), f(t.Coverage)})
		}
	case "groups":
		cw.Write([]string{"id", "language", "exemplar", "score", "coverage"})
		for _, a := range rep.Assignments {
			cw.Write([]string{a.ID, a.Language, a.Exemplar, f(a.Score), f(a.Coverage)})
		}
	case "missed":
		cw.Write([]string{"id", "title", "language", "coverage", "top_terms", "group"})
		for _, m := range rep.Missed {
			cw.Write([]string{m.ID, m.Title, m.Language, f(m.Coverage), join(m.TopTerms), m.Group})
		}
	case "curve":
		cw.Write([]string{"docs", "captured", "best_captured"})
		for _, c := range rep.Curve {
			cw.Write([]string{strconv.Itoa(c.Docs), f(c.Captured), f(c.BestCaptured)})
		}
	default:
		return fmt.Errorf("unknown csv table %q", table)
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return fmt.Errorf("write csv: %w", err)
	}
	return nil
}
