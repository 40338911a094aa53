package main

import (
	"bufio"
	"fmt"
	"io/fs"
	"os"
	"strings"

	"github.com/spf13/cobra"

	"assay/sparsemat"
	"assay/textproc"
)

func newExportCmd(app *App) *cobra.Command {
	var f pickFlags
	var format, out string
	cmd := &cobra.Command{
		Use:   "export FOLDER|FILE.assay --out PREFIX",
		Short: "Write the weighted document-term matrix of a folder to files",
		Long: `export reads FOLDER exactly as pick does (or an index made by assay index) and
writes the TF-IDF matrix it would pick from, for use in other tools:

  PREFIX.mtx        the matrix in Matrix Market coordinate format (real, general;
                    1-based row and column indices; rows are documents, columns terms)
  PREFIX.terms.tsv  one line per column: index (1-based), term, stem, language,
                    document frequency
  PREFIX.docs.tsv   one line per row: index (1-based), document ID, title

Tabs and line breaks inside titles are written as spaces. Exact duplicates
are kept as separate rows.`,
		Example: "  assay export ./reports --out reports\n  assay export ./reports --out /tmp/r --min-df 3",
		Args: func(_ *cobra.Command, args []string) error {
			if len(args) != 1 {
				return usagef("export takes one folder (got %d arguments)", len(args))
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			if format != "mtx" {
				return usagef("unknown --format %q (allowed: mtx)", format)
			}
			if out == "" {
				return usagef("export needs --out PREFIX")
			}
			f.format, f.method, f.core, f.docs, f.terms, f.power = defaultFormat, defaultMethod, defaultCore, defaultDocs, defaultTerms, sparsemat.DefaultPowerIters
			f.groupBy, f.missed = defaultGroupBy, defaultMissed
			f.nearDup = "off" // the export has no use for the signatures
			opts, err := f.options(args[0])
			if err != nil {
				return err
			}
			stop, err := startProfiles(opts.CPUProfile, opts.MemProfile)
			if err != nil {
				return err
			}
			defer stop()
			var an *analysis
			if isStore(args[0]) {
				an, err = loadStore(cmd.Context(), args[0], opts)
			} else {
				var fsys fs.FS
				if fsys, err = openFolder(args[0]); err == nil {
					an, err = analyze(cmd.Context(), fsys, opts)
				}
			}
			if err != nil {
				return err
			}
			return runExport(app, an, opts, out)
		},
	}
	cmd.Flags().StringVar(&format, "format", "mtx", "output format: mtx (Matrix Market)")
	cmd.Flags().StringVar(&out, "out", "", "prefix of the files written (required)")
	f.registerAnalysis(cmd.Flags())
	return cmd
}

// runExport writes the three files of an analysed corpus.
func runExport(app *App, an *analysis, opts pickOptions, prefix string) error {
	a := sparsemat.Weight(an.counts, opts.Weight)
	comment := fmt.Sprintf(" assay export: %s; %s; min-df %d, max-df %g; input %s", opts.Source, opts.Weight, an.minDF, opts.MaxDF, an.fingerprint)
	if err := writeFile(prefix+".mtx", func(w *bufio.Writer) error {
		return sparsemat.WriteMatrixMarket(w, a, comment)
	}); err != nil {
		return err
	}
	if err := writeFile(prefix+".terms.tsv", func(w *bufio.Writer) error {
		for j, term := range an.counts.Terms {
			lang, stem := textproc.SplitTerm(term)
			fmt.Fprintf(w, "%d\t%s\t%s\t%s\t%d\n", j+1, tsvField(an.display.Form(term)), tsvField(stem), lang, an.counts.DF[j])
		}
		return nil
	}); err != nil {
		return err
	}
	if err := writeFile(prefix+".docs.tsv", func(w *bufio.Writer) error {
		for i, row := range an.counts.Rows {
			d := an.docs[row]
			fmt.Fprintf(w, "%d\t%s\t%s\n", i+1, tsvField(d.ID), tsvField(d.Title))
		}
		return nil
	}); err != nil {
		return err
	}
	m, n := a.Dims()
	fmt.Fprintf(app.Out, "wrote %s.mtx (%d documents × %d terms, %d non-zeros), %s.terms.tsv, %s.docs.tsv\n", prefix, m, n, a.NNZ(), prefix, prefix)
	if len(an.skips) > 0 {
		fmt.Fprintf(app.Err, "assay: %d files skipped:\n", len(an.skips))
		for _, s := range an.skips {
			fmt.Fprintf(app.Err, "  %s: %s\n", s.Path, s.Reason)
		}
	}
	return nil
}

// writeFile writes a file through a buffered writer, under a temporary name
// renamed into place, so a failed run leaves no half-written file.
func writeFile(path string, fill func(*bufio.Writer) error) error {
	tmp := path + ".tmp"
	f, err := os.Create(tmp)
	if err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	w := bufio.NewWriter(f)
	err = fill(w)
	if err == nil {
		err = w.Flush()
	}
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err == nil {
		err = os.Rename(tmp, path)
	}
	if err != nil {
		os.Remove(tmp)
		return fmt.Errorf("write %s: %w", path, err)
	}
	return nil
}

// tsvField replaces tabs and line breaks, which would break the columns.
func tsvField(s string) string {
	return strings.Map(func(r rune) rune {
		if r == '\t' || r == '\n' || r == '\r' {
			return ' '
		}
		return r
	}, s)
}
