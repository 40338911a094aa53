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

// maxTitleColumn is the widest title printed in the text report.
const maxTitleColumn = 60

// writeText writes the report as aligned plain-text tables.
func writeText(w io.Writer, rep *Report) error {
	bw := bufio.NewWriter(w)
	in, f := rep.Input, rep.Figures
	fmt.Fprintf(bw, "assay %s · %s\n\n", rep.Tool.Version, rep.Input.Source)
	fmt.Fprintf(bw, "Corpus: %d documents read, %d used, %d files skipped; %d of %d terms kept; %d non-zeros\n",
		in.DocumentsRead, in.DocumentsUsed, in.FilesSkipped, in.TermsKept, in.Vocabulary, in.NonZeros)
	if in.RepairedDocs > 0 {
		fmt.Fprintf(bw, "        %d documents had invalid UTF-8 repaired\n", in.RepairedDocs)
	}
	fmt.Fprintf(bw, "Input fingerprint: %s\n", in.Fingerprint)
	if in.Distinct < in.DocumentsUsed {
		fmt.Fprintf(bw, "        %d exact duplicates merged before picking (%d distinct documents)\n", in.DocumentsUsed-in.Distinct, in.Distinct)
	}
	fmt.Fprintf(bw, "Method: %s, core %s, seed %d, %d documents and %d terms asked for, rank k = %d\n\n",
		methodLabel(rep.Options.Method), rep.Options.Core, rep.Options.Seed, rep.Options.Docs, rep.Options.Terms, f.Rank)

	sampled := rep.Options.Method == "norm" || rep.Options.Method == "leverage"
	fmt.Fprintf(bw, "Exemplar documents (%d)\n", len(rep.Exemplars))
	tw := tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
	if sampled {
		fmt.Fprintln(tw, "  #\tpicks\tweight\tdocument\ttitle")
	} else {
		fmt.Fprintln(tw, "  #\tscore\tdocument\ttitle")
	}
	for i, e := range rep.Exemplars {
		if sampled {
			fmt.Fprintf(tw, "  %d\t%d\t%.4f\t%s\t%s\n", i+1, e.Picks, float64(e.Weight), e.ID, ellipsis(e.Title, maxTitleColumn))
		} else {
			fmt.Fprintf(tw, "  %d\t%.4f\t%s\t%s\n", i+1, float64(e.Score), e.ID, ellipsis(e.Title, maxTitleColumn))
		}
		for _, dup := range e.Duplicates {
			fmt.Fprintf(tw, "  \t\t\t↳ same text: %s\n", dup)
		}
	}
	tw.Flush()

	fmt.Fprintf(bw, "\nKey terms (%d)\n", len(rep.Terms))
	tw = tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
	if sampled {
		fmt.Fprintln(tw, "  #\tpicks\tweight\tterm\tstem\tdocuments")
	} else {
		fmt.Fprintln(tw, "  #\tscore\tterm\tstem\tdocuments")
	}
	for i, t := range rep.Terms {
		if sampled {
			fmt.Fprintf(tw, "  %d\t%d\t%.4f\t%s\t%s\t%d\n", i+1, t.Picks, float64(t.Weight), t.Term, t.Stem, t.DF)
		} else {
			fmt.Fprintf(tw, "  %d\t%.4f\t%s\t%s\t%d\n", i+1, float64(t.Score), t.Term, t.Stem, t.DF)
		}
	}
	tw.Flush()

	d, j := f.Documents, f.Joint
	fmt.Fprintf(bw, "\nHow much of the corpus the picks account for (‖A‖_F = %.4f)\n", float64(f.FrobeniusNorm))
	fmt.Fprintf(bw, "  These %d documents span %s of the corpus; the best any %d-dimensional summary could span is %s", d.Count, percent(float64(d.Captured)), d.Count, percent(float64(d.BestCaptured)))
	if d.Eta != nil {
		fmt.Fprintf(bw, " (η_docs = %.3f)", float64(*d.Eta))
	}
	fmt.Fprintln(bw, ".")
	tw = tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "  \trelative error\tshare captured")
	fmt.Fprintf(tw, "  documents and terms, C·U·R\t%.4f\t%s\n", float64(j.RelativeError), percent(float64(j.Captured)))
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
	fmt.Fprintf(bw, "  core U: %s, rank %d; reference SVD: %s\n", rep.Options.Core, f.CoreRank, f.SVD)

	if len(rep.Skipped) > 0 {
		fmt.Fprintf(bw, "\nSkipped files (%d)\n", len(rep.Skipped))
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
	if utf8.RuneCountInString(s) <= n {
		return s
	}
	r := []rune(s)
	return strings.TrimRight(string(r[:n-1]), " ") + "…"
}
