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
	fmt.Fprintf(bw, "Method: %s, seed %d, %d document draws, %d term draws, rank k = %d\n\n",
		methodLabel(rep.Options.Method), rep.Options.Seed, rep.Options.Docs, rep.Options.Terms, f.Rank)

	fmt.Fprintf(bw, "Exemplar documents (%d distinct of %d draws)\n", len(rep.Exemplars), rep.Options.Docs)
	tw := tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "  #\tpicks\tweight\tdocument\ttitle")
	for i, e := range rep.Exemplars {
		fmt.Fprintf(tw, "  %d\t%d\t%.4f\t%s\t%s\n", i+1, e.Picks, float64(e.Weight), e.ID, ellipsis(e.Title, maxTitleColumn))
	}
	tw.Flush()

	fmt.Fprintf(bw, "\nKey terms (%d distinct of %d draws)\n", len(rep.Terms), rep.Options.Terms)
	tw = tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "  #\tpicks\tweight\tterm\tstem\tdocuments")
	for i, t := range rep.Terms {
		fmt.Fprintf(tw, "  %d\t%d\t%.4f\t%s\t%s\t%d\n", i+1, t.Picks, float64(t.Weight), t.Term, t.Stem, t.DF)
	}
	tw.Flush()

	fmt.Fprintf(bw, "\nHow much of the corpus the picks reconstruct (‖A‖_F = %.4f)\n", float64(f.FrobeniusNorm))
	tw = tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "  \trelative error\tshare captured")
	fmt.Fprintf(tw, "  picks, C·U·R\t%.4f\t%s\n", float64(f.RelativeError), percent(float64(f.Captured)))
	fmt.Fprintf(tw, "  best rank-%d (SVD)\t%.4f\t%s\n", f.Rank, float64(f.BestRelativeError), percent(float64(f.BestCaptured)))
	tw.Flush()
	if f.Ratio != nil {
		fmt.Fprintf(bw, "  error ratio ‖A−CUR‖/‖A−A_k‖ = %.4f (1 would match the best rank-%d summary)\n", float64(*f.Ratio), f.Rank)
	} else {
		fmt.Fprintf(bw, "  error ratio undefined: the rank-%d approximation is exact\n", f.Rank)
	}
	fmt.Fprintf(bw, "  core U: rank %d; reference SVD: %s\n", f.CoreRank, f.SVD)

	if len(rep.Skipped) > 0 {
		fmt.Fprintf(bw, "\nSkipped files (%d)\n", len(rep.Skipped))
		tw = tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
		for _, s := range rep.Skipped {
			fmt.Fprintf(tw, "  %s\t%s\n", s.Path, s.Reason)
		}
		tw.Flush()
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
		return "norm (squared-norm sampling with replacement, U = W⁺)"
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
