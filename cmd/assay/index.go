package main

import (
	"cmp"
	"context"
	"fmt"
	"io/fs"
	"math"
	"os"
	"runtime"
	"slices"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"assay/corpus"
	"assay/corpus/store"
	"assay/sparsemat"
	"assay/textproc"
)

func newIndexCmd(app *App) *cobra.Command {
	var f pickFlags
	var storePath string
	var keepText, rebuild bool
	cmd := &cobra.Command{
		Use:   "index FOLDER --store FILE.assay",
		Short: "Build or update an index of a folder, to pick from it many times",
		Long: `index reads FOLDER as pick does and keeps, in one SQLite file, what pick needs
of every document: its ID, title, size, modified time, content hash, format,
language, mail headers, its term counts and surface forms, and the signature of
its word shingles. The next index of the same folder reads only the files added
or changed since (size and modified time, then the content hash) and drops the
files removed; each update is one transaction, so an interrupted index leaves
the store as it was. 'assay pick FILE.assay' and 'assay export FILE.assay' then
work from the store, without reading or analysing anything.

The texts themselves are not kept unless --keep-text: indexes are often made of
confidential material, and a store holds no more of it than its term counts.
Changing an option that shapes the terms (--lang, --min-length, --keep-numbers,
--no-stem, the reading options) needs --rebuild: the store says so rather than
mixing two analyses.`,
		Example: "  assay index ./inbox --store inbox.assay\n  assay pick inbox.assay --docs 20\n  assay index ./inbox --store inbox.assay --rebuild --lang english",
		Args: func(_ *cobra.Command, args []string) error {
			if len(args) != 1 {
				return usagef("index takes one folder (got %d arguments)", len(args))
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			if storePath == "" {
				return usagef("index needs --store FILE")
			}
			f.format, f.method, f.core, f.docs, f.terms, f.power = defaultFormat, defaultMethod, defaultCore, defaultDocs, defaultTerms, sparsemat.DefaultPowerIters
			f.groupBy, f.missed, f.nearDup = defaultGroupBy, defaultMissed, defaultNearDup
			opts, err := f.options(args[0])
			if err != nil {
				return err
			}
			fsys, err := openFolder(args[0])
			if err != nil {
				return err
			}
			return runIndex(cmd.Context(), app, fsys, opts, storePath, keepText, rebuild)
		},
	}
	cmd.Flags().StringVar(&storePath, "store", "", "the index file to build or update (required)")
	cmd.Flags().BoolVar(&keepText, "keep-text", false, "keep the documents' texts in the store too (off: only what picks need)")
	cmd.Flags().BoolVar(&rebuild, "rebuild", false, "empty the store first (needed after changing an analysis option)")
	f.registerAnalysis(cmd.Flags())
	return cmd
}

// analysisKey is the canonical string of every option that shapes what an
// index stores; a store built with another key is not mixed with. Bump
// schema-of-terms whenever the analysis, the readers, the shingles or the
// MinHash parameters change what is stored.
func analysisKey(o pickOptions) string {
	r := o.Read
	return strings.Join([]string{
		"schema-of-terms=3", // 3: MinHash by one-permutation hashing
		"lang=" + string(o.Lang),
		"min-length=" + strconv.Itoa(o.MinLen),
		"keep-numbers=" + strconv.FormatBool(o.Numbers),
		"stem=" + strconv.FormatBool(!o.NoStem),
		"max-bytes=" + strconv.FormatInt(o.MaxBytes, 10),
		"strip-quoted=" + strconv.FormatBool(!r.KeepQuoted),
		"attachments=" + strconv.FormatBool(!r.NoAttachments),
		"text-field=" + strconv.Quote(r.TextField), "id-field=" + strconv.Quote(r.IDField), "title-field=" + strconv.Quote(r.TitleField),
		"include=" + strconv.Quote(strings.Join(r.Include, "\x00")), "exclude=" + strconv.Quote(strings.Join(r.Exclude, "\x00")),
	}, " ")
}

// defaultJobs is the default of --jobs: the number of CPUs Go may use.
func defaultJobs() int { return runtime.GOMAXPROCS(0) }

// runIndex builds or updates the store at path from fsys.
func runIndex(ctx context.Context, app *App, fsys fs.FS, opts pickOptions, path string, keepText, rebuild bool) error {
	stop, err := startProfiles(opts.CPUProfile, opts.MemProfile)
	if err != nil {
		return err
	}
	defer stop()
	st, err := store.Open(path)
	if err != nil {
		return err
	}
	defer st.Close()
	readOpts := opts.Read
	readOpts.MaxBytes = opts.MaxBytes
	work := docWorker(opts)
	newWorker := func() func(corpus.Document) store.Analysis {
		w := work()
		return func(d corpus.Document) store.Analysis {
			r := w(d)
			return store.Analysis{Terms: r.counts, Forms: r.forms, Lang: string(r.lang), Sig: r.sig}
		}
	}
	ch, err := st.Update(ctx, fsys, store.UpdateOptions{
		Read: readOpts, Key: analysisKey(opts), Jobs: opts.Jobs, KeepText: keepText, Rebuild: rebuild,
	}, newWorker)
	if err != nil {
		return err
	}
	fmt.Fprintf(app.Out, "%s: %s\n", path, ch.String())
	for _, list := range []struct {
		what  string
		paths []string
	}{{"added", ch.Added}, {"changed", ch.Changed}, {"removed", ch.Removed}} {
		for _, p := range list.paths {
			fmt.Fprintf(app.Out, "  %s %s\n", list.what, p)
		}
	}
	for _, s := range ch.Skipped {
		fmt.Fprintf(app.Out, "  skipped %s: %s\n", s.Path, s.Reason)
	}
	return nil
}

// loadStore reads a store into the analysis a pick works on, exactly as
// reading the folder it indexes would give it (the same documents in the
// same order, skips, fingerprint, term counts and forms), after checking
// the store was built with the analysis options of this command.
func loadStore(ctx context.Context, path string, opts pickOptions) (*analysis, error) {
	st, err := store.OpenExisting(path)
	if err != nil {
		return nil, err
	}
	defer st.Close()
	col := &collector{an: &analysis{}, opts: opts}
	// Terms come as the store's word ids: each is given a builder ID the
	// first time it is seen, and the form counts are summed by id pair and
	// named once at the end, so no string map is built per document.
	vocab := col.b.Vocabulary()
	var (
		idOf       []int32 // store word id -> builder ID, or -1
		row        []idCount
		cols, cnts []int32
		forms      = map[[2]int32]int{}
		words      []string
	)
	snap, err := st.LoadCounted(ctx, func(d store.Doc, c *store.Counted) error {
		words = c.Words
		for len(idOf) < len(c.Words) {
			idOf = append(idOf, -1)
		}
		row = row[:0]
		for _, t := range c.Terms {
			id := idOf[t.Word]
			if id < 0 {
				id = vocab.ID(c.Words[t.Word])
				idOf[t.Word] = id
			}
			row = append(row, idCount{id, int32(min(t.N, math.MaxInt32))})
		}
		slices.SortFunc(row, func(x, y idCount) int { return cmp.Compare(x.id, y.id) })
		cols, cnts = cols[:0], cnts[:0]
		for _, e := range row {
			cols, cnts = append(cols, e.id), append(cnts, e.n)
		}
		col.b.AddRowIDs(cols, cnts)
		for _, f := range c.Forms {
			forms[[2]int32{f.Term, f.Form}] += f.N
		}
		col.record(d.Document, textproc.Language(d.Lang), d.Sig)
		return nil
	})
	if err != nil {
		return nil, err
	}
	for k, n := range forms { // sums: the order does not matter
		col.an.display.AddN(words[k[0]], words[k[1]], n)
	}
	if want := analysisKey(opts); snap.Options != want {
		return nil, fmt.Errorf("%s was built with other analysis options:\n  store:   %s\n  command: %s\n(pass the store's options, or run assay index with --rebuild)", path, snap.Options, want)
	}
	return col.finish(snap.Skips, snap.Fingerprint)
}

// idCount is a builder term ID and its count in one document.
type idCount struct{ id, n int32 }

// isStore reports whether a pick or export argument names a file (a
// store) rather than a folder.
func isStore(arg string) bool {
	info, err := os.Stat(arg)
	return err == nil && info.Mode().IsRegular()
}
