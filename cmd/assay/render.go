package main

import (
	"bufio"
	"encoding/json"
	"fmt"
	"io"
	"strings"
	"text/tabwriter"
	"unicode/utf8"
)

// writeJSON writes the report as one indented JSON object.
func writeJSON(w io.Writer, rep *Report) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	if err := enc.Encode(rep); err != nil {
		return fmt.Errorf("write json: %w", err)
	}
	return nil
}

// textStyle says how wide the text report may be and whether it may use
// colour (bold headings). Colour changes only the look, never the words.
type textStyle struct {
	width int
	color bool
}

// defaultTextWidth is the width used when the output is not a terminal.
const defaultTextWidth = 100

// nearCopiesShown is how many near-copies of an exemplar the text report
// names before it only counts the rest.
const nearCopiesShown = 3

// minTitle is the narrowest column of free text before it stops
// shrinking.
const minTitle = 20

// writeText writes the report as aligned plain-text tables that fit the
// style's width (titles are cut with an ellipsis).
func writeText(w io.Writer, rep *Report, st textStyle) error {
	if st.width <= 0 {
		st.width = defaultTextWidth
	}
	bw := bufio.NewWriter(w)
	head := func(s string) {
		if st.color {
			fmt.Fprintf(bw, "\n\x1b[1m%s\x1b[0m\n", s)
		} else {
			fmt.Fprintf(bw, "\n%s\n", s)
		}
	}
	in, f, o := rep.Input, rep.Figures, rep.Options
	fmt.Fprintf(bw, "assay %s · %s\n\n", rep.Tool.Version, in.Source)
	fmt.Fprintf(bw, "Corpus   %d documents read, %d used, %d skipped (files or parts of them); %d of %d terms kept; %d non-zeros\n",
		in.DocumentsRead, in.DocumentsUsed, in.FilesSkipped, in.TermsKept, in.Vocabulary, in.NonZeros)
	if in.Distinct < in.DocumentsUsed {
		fmt.Fprintf(bw, "         %d exact duplicates merged before picking (%d distinct documents)\n", in.DocumentsUsed-in.Distinct, in.Distinct)
	}
	if in.RepairedDocs > 0 {
		fmt.Fprintf(bw, "         %d documents had invalid UTF-8 repaired\n", in.RepairedDocs)
	}
	if len(in.Languages) > 1 {
		var parts []string
		for _, l := range in.Languages {
			parts = append(parts, fmt.Sprintf("%s %d", l.Language, l.Documents))
		}
		fmt.Fprintf(bw, "         languages: %s\n", strings.Join(parts, ", "))
	}
	fmt.Fprintf(bw, "Input    %s\n", in.Fingerprint)
	fmt.Fprintf(bw, "Method   %s; core %s; seed %d; %d documents, %d terms; rank k = %d; groups by %s\n",
		methodLabel(o.Method), o.Core, o.Seed, o.Docs, o.Terms, f.Rank, o.GroupBy)

	d := f.Documents
	fmt.Fprintf(bw, "\nThese %d documents span %s of the corpus; the best any %d-dimensional summary could span is %s",
		d.Count, percent(float64(d.Captured)), d.Count, percent(float64(d.BestCaptured)))
	if d.Eta != nil {
		fmt.Fprintf(bw, " (η_docs = %.3f)", float64(*d.Eta))
	}
	fmt.Fprintln(bw, ".")

	sampled := o.Method == "norm" || o.Method == "leverage"
	head(fmt.Sprintf("Exemplar documents and the documents they stand for (%d)", len(rep.Exemplars)))
	tw := tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
	if sampled {
		fmt.Fprintln(tw, "  #\tpicks\tweight\tgroup\tshare\tdocument")
	} else {
		fmt.Fprintln(tw, "  #\tscore\tgroup\tshare\tdocument")
	}
	for i, e := range rep.Exemplars {
		if sampled {
			fmt.Fprintf(tw, "  %d\t%d\t%.4f\t%d\t%s\t%s\n", i+1, e.Picks, float64(e.Weight), e.Group.Size, percent(float64(e.Group.Share)), ellipsis(e.ID, st.width-40))
		} else {
			fmt.Fprintf(tw, "  %d\t%.4f\t%d\t%s\t%s\n", i+1, float64(e.Score), e.Group.Size, percent(float64(e.Group.Share)), ellipsis(e.ID, st.width-32))
		}
	}
	tw.Flush()
	for i, e := range rep.Exemplars {
		if e.Language != "" && e.Language != "english" {
			fmt.Fprintf(bw, "\n  %d. %s [%s]\n", i+1, ellipsis(e.Title, st.width-18), e.Language)
		} else {
			fmt.Fprintf(bw, "\n  %d. %s\n", i+1, ellipsis(e.Title, st.width-6))
		}
		if m := e.Mail; m != nil {
			fmt.Fprintf(bw, "     %s\n", ellipsis(mailLine(m), st.width-5))
		}
		fmt.Fprintf(bw, "     key terms: %s\n", ellipsis(strings.Join(e.Group.KeyTerms, ", "), st.width-16))
		for _, m := range e.Group.Members {
			fmt.Fprintf(bw, "     also: %s\n", ellipsis(m, st.width-11))
		}
		for _, dup := range e.Duplicates {
			fmt.Fprintf(bw, "     same text: %s\n", ellipsis(dup, st.width-16))
		}
		for i, nc := range e.NearCopies {
			if i == nearCopiesShown {
				fmt.Fprintf(bw, "     and %d more near-copies\n", len(e.NearCopies)-nearCopiesShown)
				break
			}
			fmt.Fprintf(bw, "     near-copy: %s\n", ellipsis(nc, st.width-16))
		}
	}

	head(fmt.Sprintf("Key terms (%d)", len(rep.Terms)))
	tw = tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
	if sampled {
		fmt.Fprintln(tw, "  #\tpicks\tweight\tterm\tstem\tlanguage\tdocuments\tcoverage")
	} else {
		fmt.Fprintln(tw, "  #\tscore\tterm\tstem\tlanguage\tdocuments\tcoverage")
	}
	for i, t := range rep.Terms {
		if sampled {
			fmt.Fprintf(tw, "  %d\t%d\t%.4f\t%s\t%s\t%s\t%d\t%s\n", i+1, t.Picks, float64(t.Weight), t.Term, t.Stem, t.Language, t.DF, percent(float64(t.Coverage)))
		} else {
			fmt.Fprintf(tw, "  %d\t%.4f\t%s\t%s\t%s\t%d\t%s\n", i+1, float64(t.Score), t.Term, t.Stem, t.Language, t.DF, percent(float64(t.Coverage)))
		}
	}
	tw.Flush()

	if len(rep.Missed) > 0 {
		head(fmt.Sprintf("Read these too: the %d documents the exemplars cover least", len(rep.Missed)))
		idWidth := 0
		for _, m := range rep.Missed {
			idWidth = max(idWidth, utf8.RuneCountInString(m.ID))
		}
		rest := max(minTitle, st.width-(2+10+idWidth+2))
		tw = tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, "  coverage\tdocument\ttop terms")
		for _, m := range rep.Missed {
			fmt.Fprintf(tw, "  %s\t%s\t%s\n", percent(float64(m.Coverage)), m.ID, ellipsis(strings.Join(m.TopTerms, ", "), rest))
		}
		tw.Flush()
	}
	fmt.Fprintf(bw, "  coverage of all documents: mean %s, median %s\n", percent(float64(f.Coverage.Mean)), percent(float64(f.Coverage.Median)))

	if len(rep.Curve) > 0 {
		head("How many to read")
		tw = tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, "  documents\tspan\tbest possible")
		for _, c := range curvePoints(rep.Curve, o.Docs) {
			fmt.Fprintf(tw, "  %d\t%s\t%s\n", c.Docs, percent(float64(c.Captured)), percent(float64(c.BestCaptured)))
		}
		tw.Flush()
	}

	j := f.Joint
	head(fmt.Sprintf("Documents and terms together, C·U·R (‖A‖_F = %.4f)", float64(f.FrobeniusNorm)))
	tw = tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "  \trelative error\tshare captured")
	fmt.Fprintf(tw, "  %d documents and %d terms\t%.4f\t%s\n", len(rep.Exemplars), len(rep.Terms), float64(j.RelativeError), percent(float64(j.Captured)))
	fmt.Fprintf(tw, "  best rank-%d (SVD)\t%.4f\t%s\n", f.Rank, float64(j.BestRelativeError), percent(float64(j.BestCaptured)))
	tw.Flush()
	if j.Eta != nil {
		fmt.Fprintf(bw, "  η = %.3f of the best rank-%d share", float64(*j.Eta), f.Rank)
	}
	if j.Ratio != nil {
		fmt.Fprintf(bw, "; error ratio ‖A−CUR‖/‖A−A_k‖ = %.4f", float64(*j.Ratio))
	} else {
		fmt.Fprintf(bw, "; error ratio undefined: the rank-%d approximation is exact", f.Rank)
	}
	fmt.Fprintln(bw)
	fmt.Fprintf(bw, "  core U: %s, rank %d; reference SVD: %s\n", o.Core, f.CoreRank, f.SVD)

	if len(rep.Skipped) > 0 {
		head(fmt.Sprintf("Skipped files (%d)", len(rep.Skipped)))
		tw = tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
		for _, s := range rep.Skipped {
			fmt.Fprintf(tw, "  %s\t%s\n", s.Path, s.Reason)
		}
		tw.Flush()
	}
	if t := rep.Timings; t != nil {
		fmt.Fprintf(bw, "\nTimings: read %.3f s, reference SVD %.3f s, select %.3f s, measure %.3f s (one randomized rank-%d SVD: %.3f s)\n",
			float64(t.Read), float64(t.SVD), float64(t.Select), float64(t.Measure), f.Rank, float64(t.RandomizedSVD))
	}
	fmt.Fprintf(bw, "\nTo repeat: %s\n", rep.Repeat)
	fmt.Fprintf(bw, "%s\n", rep.Caution)
	if err := bw.Flush(); err != nil {
		return fmt.Errorf("write report: %w", err)
	}
	return nil
}

// mailLine gives a message's sender and date in one line.
func mailLine(m *mailOut) string {
	var parts []string
	if m.From != "" {
		parts = append(parts, "from "+m.From)
	}
	if m.Date != "" {
		parts = append(parts, m.Date)
	}
	return strings.Join(parts, ", ")
}

// curvePoints picks the rows of the curve the text report shows: 1, 2, 3,
// 5, then every fifth, the number of documents picked, and the last.
func curvePoints(curve []curveOut, docs int) []curveOut {
	var out []curveOut
	for _, c := range curve {
		t := c.Docs
		if t <= 3 || t == 5 || t%5 == 0 || t == docs || t == len(curve) {
			out = append(out, c)
		}
	}
	return out
}

func methodLabel(m string) string {
	switch m {
	case "norm":
		return "norm (squared-norm sampling with replacement)"
	case "leverage":
		return "leverage (rank-k leverage-score sampling with replacement)"
	case "top":
		return "top (largest rank-k leverage scores)"
	case "pivot":
		return "pivot (sketch, then LU with partial pivoting)"
	case "greedy":
		return "greedy (each pick adds the most to the captured share)"
	}
	return m
}

// percent formats a share as a percentage with one decimal.
func percent(s float64) string {
	return fmt.Sprintf("%.1f%%", 100*s)
}

// ellipsis cuts s to at most n runes, ending with "…" when cut.
func ellipsis(s string, n int) string {
	if n < 1 {
		n = 1
	}
	if utf8.RuneCountInString(s) <= n {
		return s
	}
	r := []rune(s)
	return strings.TrimRight(string(r[:n-1]), " ,") + "…"
}
