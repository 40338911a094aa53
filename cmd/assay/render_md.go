package main

import (
	"bufio"
	"fmt"
	"io"
	"strings"
)

// writeMarkdown writes the report as Markdown ready to paste into a wiki
// page: one section per exemplar and its group, then tables.
func writeMarkdown(w io.Writer, rep *Report) error {
	bw := bufio.NewWriter(w)
	in, f, o := rep.Input, rep.Figures, rep.Options
	d := f.Documents
	fmt.Fprintf(bw, "# Exemplar documents: %s\n\n", mdText(in.Source))
	fmt.Fprintf(bw, "> %s\n\n", rep.Caution)
	fmt.Fprintf(bw, "These %d documents span **%s** of the corpus; the best any %d-dimensional summary could span is %s",
		d.Count, percent(float64(d.Captured)), d.Count, percent(float64(d.BestCaptured)))
	if d.Eta != nil {
		fmt.Fprintf(bw, " (η_docs = %.3f)", float64(*d.Eta))
	}
	fmt.Fprintf(bw, ". Every document of the corpus is in the group of the exemplar that stands for it best (rule: %s).\n\n", o.GroupBy)
	fmt.Fprintf(bw, "- %d documents read, %d used (%d distinct), %d skipped (files or parts of them)\n", in.DocumentsRead, in.DocumentsUsed, in.Distinct, in.FilesSkipped)
	fmt.Fprintf(bw, "- %d of %d terms kept\n", in.TermsKept, in.Vocabulary)
	fmt.Fprintf(bw, "- coverage of all documents by the exemplars: mean %s, median %s\n\n", percent(float64(f.Coverage.Mean)), percent(float64(f.Coverage.Median)))

	fmt.Fprintf(bw, "## Exemplars and their groups\n\n")
	for i, e := range rep.Exemplars {
		fmt.Fprintf(bw, "### %d. %s\n\n", i+1, mdText(e.Title))
		fmt.Fprintf(bw, "- Document: `%s`\n", mdCode(e.ID))
		fmt.Fprintf(bw, "- Stands for %d documents (%s of the corpus)\n", e.Group.Size, percent(float64(e.Group.Share)))
		fmt.Fprintf(bw, "- Key terms: %s\n", mdText(strings.Join(e.Group.KeyTerms, ", ")))
		if len(e.Group.Members) > 0 {
			fmt.Fprintf(bw, "- Also in the group: %s\n", mdCodes(e.Group.Members))
		}
		if len(e.Duplicates) > 0 {
			fmt.Fprintf(bw, "- Same text: %s\n", mdCodes(e.Duplicates))
		}
		if len(e.NearCopies) > 0 {
			fmt.Fprintf(bw, "- Near-copies (%d): %s\n", len(e.NearCopies), mdCodes(e.NearCopies))
		}
		fmt.Fprintln(bw)
	}

	fmt.Fprintf(bw, "## Key terms\n\n| # | term | stem | documents | coverage |\n| --- | --- | --- | --- | --- |\n")
	for i, t := range rep.Terms {
		fmt.Fprintf(bw, "| %d | %s | %s | %d | %s |\n", i+1, mdCell(t.Term), mdCell(t.Stem), t.DF, percent(float64(t.Coverage)))
	}
	if len(rep.Missed) > 0 {
		fmt.Fprintf(bw, "\n## Read these too\n\nThe documents the exemplars cover least.\n\n| coverage | document | title | top terms |\n| --- | --- | --- | --- |\n")
		for _, m := range rep.Missed {
			fmt.Fprintf(bw, "| %s | `%s` | %s | %s |\n", percent(float64(m.Coverage)), mdCode(m.ID), mdCell(m.Title), mdCell(strings.Join(m.TopTerms, ", ")))
		}
	}
	if len(rep.Curve) > 0 {
		fmt.Fprintf(bw, "\n## How many to read\n\n| documents | span | best possible |\n| --- | --- | --- |\n")
		for _, c := range curvePoints(rep.Curve, o.Docs) {
			fmt.Fprintf(bw, "| %d | %s | %s |\n", c.Docs, percent(float64(c.Captured)), percent(float64(c.BestCaptured)))
		}
	}
	j := f.Joint
	fmt.Fprintf(bw, "\n## Documents and terms together\n\n| | relative error | share captured |\n| --- | --- | --- |\n")
	fmt.Fprintf(bw, "| C·U·R | %.4f | %s |\n| best rank-%d | %.4f | %s |\n\n", float64(j.RelativeError), percent(float64(j.Captured)), f.Rank, float64(j.BestRelativeError), percent(float64(j.BestCaptured)))
	if len(rep.Skipped) > 0 {
		fmt.Fprintf(bw, "## Skipped files\n\n| file | reason |\n| --- | --- |\n")
		for _, s := range rep.Skipped {
			fmt.Fprintf(bw, "| `%s` | %s |\n", mdCode(s.Path), mdCell(s.Reason))
		}
		fmt.Fprintln(bw)
	}
	fmt.Fprintf(bw, "## Run record\n\n- Method: %s; core %s; seed %d; rank k = %d\n- Input fingerprint: `%s`\n- Tool: assay %s\n- To repeat: `%s`\n",
		mdText(methodLabel(o.Method)), o.Core, o.Seed, f.Rank, in.Fingerprint, mdText(rep.Tool.Version), mdCode(rep.Repeat))
	if err := bw.Flush(); err != nil {
		return fmt.Errorf("write markdown: %w", err)
	}
	return nil
}

// mdText escapes the characters that Markdown would read as markup.
func mdText(s string) string {
	r := strings.NewReplacer(`\`, `\\`, "*", `\*`, "_", `\_`, "`", "\\`", "[", `\[`, "]", `\]`, "<", `\<`, ">", `\>`, "#", `\#`, "|", `\|`)
	return r.Replace(s)
}

// mdCell is mdText for a table cell (no line breaks).
func mdCell(s string) string { return strings.ReplaceAll(mdText(s), "\n", " ") }

// mdCode makes s safe inside a code span.
func mdCode(s string) string { return strings.ReplaceAll(s, "`", "'") }

func mdCodes(ids []string) string {
	out := make([]string, len(ids))
	for i, id := range ids {
		out[i] = "`" + mdCode(id) + "`"
	}
	return strings.Join(out, ", ")
}
