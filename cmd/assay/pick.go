package main

import (
	"bufio"
	"context"
	"fmt"
	"io"
	"io/fs"
	"os"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/schollz/progressbar/v3"
	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"assay/corpus"
	selection "assay/select"
	"assay/sparsemat"
	"assay/textproc"
)

// Defaults of the pick options.
const (
	defaultDocs     = 10
	defaultTerms    = 20
	defaultSeed     = 1
	defaultMaxDF    = 0.5
	minDFThreshold  = 20 // corpora of at least this many documents get min-df 2
	defaultFormat   = "text"
	defaultMethod   = "greedy"
	defaultCore     = "optimal"
	defaultGroupBy  = "share"
	defaultMissed   = 10
	defaultNearDup  = "0.9"
	cautionSampling = "Sampling supports review; it does not replace the review that law, policy or a licensed professional requires."
)

// pickOptions are the parsed and validated options of pick and demo.
type pickOptions struct {
	Source   string // folder as given, or the demo label
	Format   string
	Method   string
	Docs     int
	Terms    int
	Rank     int // 0: derived
	Seed     uint64
	MinDF    int // -1: derived from the corpus size
	MaxDF    float64
	Weight   sparsemat.Weighting
	MaxBytes int64
	MinLen   int
	Numbers  bool
	NoStem   bool
	Power    int
	Core     string
	// TruncateCore truncates the optimal core to rank k.
	TruncateCore bool
	Accuracy     float64 // 0: not given
	TargetShare  float64 // 0: not given
	// Timings adds wall-clock timings to the report (which then differs
	// from run to run).
	Timings bool
	// Out is the file the report goes to ("" for standard output); Table
	// the CSV table.
	Out, Table string
	// Quiet turns the progress bar off.
	Quiet bool
	// progress, when set, is called after each document is read.
	progress func()
	// Read holds the options of the corpus readers.
	Read corpus.Options
	// Lang is the language of analysis (textproc.Auto: detected per
	// document).
	Lang textproc.Language
	// Jobs is the number of goroutines that read and analyse documents.
	Jobs int
	// NearDup is the cosine at which two documents are near-copies, merged
	// for the picking; 0 turns it off.
	NearDup float64
	// GroupBy is the rule that attaches documents to exemplars.
	GroupBy string
	// Missed is how many least-covered documents to list.
	Missed int
	// CurveMax is the longest prefix of the how-many-to-read curve; 0
	// means 3 × Docs.
	CurveMax int
	// CPUProfile and MemProfile name files for pprof profiles (hidden
	// flags, for profiling on real corpora).
	CPUProfile, MemProfile string
}

// pickFlags holds the raw flag values before validation.
type pickFlags struct {
	format, method, tf, idf, norm  string
	core                           string
	truncate, timings              bool
	cpuProfile, memProfile         string
	groupBy, out, table            string
	include, exclude               []string
	stripQuoted, noAttach          bool
	textField, idField, titleField string
	lang                           string
	jobs                           int
	nearDup                        string
	quiet                          bool
	missed, curveMax               int
	accuracy, target               float64
	docs, terms, rank, minDF       int
	minLen, power                  int
	seed                           uint64
	maxDF                          float64
	maxBytes                       int64
	numbers, noStem                bool
}

func (f *pickFlags) register(fl *pflag.FlagSet) {
	fl.StringVar(&f.format, "format", defaultFormat, "output format: text, json, csv, markdown, html")
	fl.StringVar(&f.out, "out", "", "write the report to this file instead of standard output")
	fl.StringVar(&f.table, "table", "", "with --format csv: exemplars, terms, groups, missed or curve (default exemplars)")
	fl.BoolVarP(&f.quiet, "quiet", "q", false, "no progress bar on standard error")
	f.registerSelection(fl)
	f.registerAnalysis(fl)
}

// registerSelection registers the flags that choose and size the picks.
func (f *pickFlags) registerSelection(fl *pflag.FlagSet) {
	fl.StringVar(&f.method, "method", defaultMethod, "selection method: greedy, pivot, top, leverage, norm (see the README)")
	fl.StringVar(&f.core, "core", defaultCore, "core U: optimal (C⁺AR⁺) or intersection (W⁺)")
	fl.BoolVar(&f.truncate, "truncate-core", false, "truncate the optimal core to rank k, so that C·U·R has rank at most k")
	fl.Float64Var(&f.accuracy, "accuracy", 0, "set the draws to c = r = ⌈k·ln k/ε²⌉ for this ε (overrides --docs and --terms)")
	fl.Float64Var(&f.target, "target-share", 0, "find the smallest number of documents whose picks span this share of the corpus, in (0, 1] (overrides --docs)")
	fl.IntVar(&f.docs, "docs", defaultDocs, "number r of document draws (exemplars)")
	fl.IntVar(&f.terms, "terms", defaultTerms, "number c of term draws (key terms)")
	fl.IntVar(&f.rank, "rank", 0, "target rank k of the reference SVD (default min(docs, terms), lowered to the matrix's rank)")
	fl.Uint64Var(&f.seed, "seed", defaultSeed, "random seed; the same seed gives the same picks")
	fl.IntVar(&f.power, "power-iters", sparsemat.DefaultPowerIters, "power iterations of the randomized SVD")
	fl.BoolVar(&f.timings, "timings", false, "add wall-clock timings of each stage to the report (the output then differs from run to run)")
	fl.StringVar(&f.groupBy, "group-by", defaultGroupBy, "how documents are attached to exemplars: share (the exemplar carrying most of the document's reconstruction) or cosine")
	fl.IntVar(&f.missed, "missed", defaultMissed, "how many least-covered documents to list")
	fl.StringVar(&f.nearDup, "near-dup", defaultNearDup, "cosine at which documents count as near-copies, merged before picking so that no two picks are that close; off to disable")
	fl.IntVar(&f.curveMax, "curve-max", 0, "longest prefix of the how-many-to-read curve (default 3 × --docs)")
}

// registerAnalysis registers the flags that decide how files become the
// matrix.
func (f *pickFlags) registerAnalysis(fl *pflag.FlagSet) {
	fl.StringSliceVar(&f.include, "include", nil, "read only files whose path or name matches one of these globs (comma-separated or repeated)")
	fl.StringSliceVar(&f.exclude, "exclude", nil, "leave out files and folders whose path or name matches one of these globs")
	fl.BoolVar(&f.stripQuoted, "strip-quoted", true, "drop quoted reply lines, reply and forward headers and signatures from e-mail (--strip-quoted=false keeps them)")
	fl.BoolVar(&f.noAttach, "no-attachments", false, "do not read e-mail attachments as documents of their own")
	fl.StringVar(&f.textField, "text-field", "", "CSV/TSV column or JSON Lines field holding a record's text (default: the first of text, body, content, message, description, abstract)")
	fl.StringVar(&f.idField, "id-field", "", "column or field holding a record's ID (default: id, identifier, key; else the line number)")
	fl.StringVar(&f.titleField, "title-field", "", "column or field holding a record's title (default: title, subject, name, headline; else the first line of the text)")
	fl.IntVar(&f.minDF, "min-df", -1, "keep terms found in at least this many documents (default 2 with 20 or more documents, else 1)")
	fl.Float64Var(&f.maxDF, "max-df", defaultMaxDF, "keep terms found in at most this share of the documents, in (0, 1]")
	fl.StringVar(&f.tf, "tf", string(sparsemat.TFLog), "term-frequency weight: log (1+ln tf), raw, binary")
	fl.StringVar(&f.idf, "idf", string(sparsemat.IDFSmooth), "inverse document frequency: smooth (ln((1+m)/(1+df))+1), plain (ln(m/df)+1), none")
	fl.StringVar(&f.norm, "norm", string(sparsemat.NormL2), "row normalisation: l2, l1, none")
	fl.Int64Var(&f.maxBytes, "max-bytes", corpus.DefaultMaxBytes, "skip files larger than this many bytes")
	fl.IntVar(&f.minLen, "min-length", 2, "shortest token kept, in characters")
	fl.BoolVar(&f.numbers, "keep-numbers", false, "keep tokens made only of digits")
	fl.BoolVar(&f.noStem, "no-stem", false, "do not stem: every word is its own term")
	fl.IntVar(&f.jobs, "jobs", defaultJobs(), "goroutines that read and analyse documents (the output does not depend on it)")
	fl.StringVar(&f.lang, "lang", "auto", "language of the documents: auto (detected per document), english, french, spanish, russian, swedish, norwegian, hungarian, or und (none: no stemming)")
	fl.StringVar(&f.cpuProfile, "cpuprofile", "", "write a CPU profile of the run to this file")
	fl.StringVar(&f.memProfile, "memprofile", "", "write a heap profile at the end of the run to this file")
	fl.MarkHidden("cpuprofile")
	fl.MarkHidden("memprofile")
}

// options validates the flags; any error is a usage error.
func (f *pickFlags) options(source string) (pickOptions, error) {
	if f.format == "csv" && f.table == "" {
		f.table = "exemplars"
	}
	o := pickOptions{
		Source: source, Format: f.format, Method: f.method,
		Docs: f.docs, Terms: f.terms, Rank: f.rank, Seed: f.seed,
		MinDF: f.minDF, MaxDF: f.maxDF, MaxBytes: f.maxBytes,
		MinLen: f.minLen, Numbers: f.numbers, NoStem: f.noStem, Power: f.power,
		Core: f.core, TruncateCore: f.truncate, Accuracy: f.accuracy, TargetShare: f.target, Timings: f.timings,
		CPUProfile: f.cpuProfile, MemProfile: f.memProfile,
		GroupBy: f.groupBy, Missed: f.missed, CurveMax: f.curveMax, Jobs: f.jobs,
		Out: f.out, Table: f.table, Quiet: f.quiet,
		Read: corpus.Options{
			MaxBytes: f.maxBytes, Include: f.include, Exclude: f.exclude,
			KeepQuoted: !f.stripQuoted, NoAttachments: f.noAttach,
			TextField: f.textField, IDField: f.idField, TitleField: f.titleField,
		},
		Weight: sparsemat.Weighting{TF: sparsemat.TF(f.tf), IDF: sparsemat.IDF(f.idf), Norm: sparsemat.Norm(f.norm)},
	}
	switch {
	case !slices.Contains(formats, o.Format):
		return o, usagef("unknown --format %q (allowed: %s)", o.Format, strings.Join(formats, ", "))
	case o.Table != "" && o.Format != "csv":
		return o, usagef("--table goes with --format csv")
	case o.Format == "csv" && !slices.Contains(csvTables, o.Table):
		return o, usagef("unknown --table %q (allowed: %s)", o.Table, strings.Join(csvTables, ", "))
	case !validMethod(o.Method):
		return o, usagef("unknown --method %q (allowed: %s)", o.Method, methodList())
	case o.Core != "optimal" && o.Core != "intersection":
		return o, usagef("unknown --core %q (allowed: optimal, intersection)", o.Core)
	case o.TruncateCore && o.Core != "optimal":
		return o, usagef("--truncate-core needs --core optimal")
	case o.Accuracy < 0 || o.Accuracy > 1:
		return o, usagef("--accuracy must lie in (0, 1] (got %g)", o.Accuracy)
	case o.TargetShare < 0 || o.TargetShare > 1:
		return o, usagef("--target-share must lie in (0, 1] (got %g)", o.TargetShare)
	case o.Jobs < 1:
		return o, usagef("--jobs must be at least 1 (got %d)", o.Jobs)
	case o.GroupBy != "share" && o.GroupBy != "cosine":
		return o, usagef("unknown --group-by %q (allowed: share, cosine)", o.GroupBy)
	case o.Missed < 0:
		return o, usagef("--missed must be at least 0 (got %d)", o.Missed)
	case o.CurveMax < 0:
		return o, usagef("--curve-max must be at least 1, or 0 for the default (got %d)", o.CurveMax)
	case o.Accuracy > 0 && o.TargetShare > 0:
		return o, usagef("--accuracy and --target-share cannot be combined")
	case o.Docs < 1:
		return o, usagef("--docs must be at least 1 (got %d)", o.Docs)
	case o.Terms < 1:
		return o, usagef("--terms must be at least 1 (got %d)", o.Terms)
	case o.Rank < 0:
		return o, usagef("--rank must be at least 1, or 0 for the default (got %d)", o.Rank)
	case o.MinDF < -1:
		return o, usagef("--min-df must be at least 0 (got %d)", o.MinDF)
	case !(o.MaxDF > 0 && o.MaxDF <= 1):
		return o, usagef("--max-df must lie in (0, 1] (got %g)", o.MaxDF)
	case o.MaxBytes < 1:
		return o, usagef("--max-bytes must be at least 1 (got %d)", o.MaxBytes)
	case o.MinLen < 1:
		return o, usagef("--min-length must be at least 1 (got %d)", o.MinLen)
	case o.Power < 0:
		return o, usagef("--power-iters must be at least 0 (got %d)", o.Power)
	}
	if err := o.Weight.Validate(); err != nil {
		return o, usageError{err}
	}
	switch f.nearDup {
	case "off", "0":
	default:
		t, err := strconv.ParseFloat(f.nearDup, 64)
		if err != nil || !(t > 0 && t <= 1) {
			return o, usagef("--near-dup must be a cosine in (0, 1] or off (got %q)", f.nearDup)
		}
		o.NearDup = t
	}
	lang, err := textproc.ParseLanguage(f.lang)
	if err != nil {
		return o, usagef("unknown --lang %q (allowed: auto, %s, und)", f.lang, langList())
	}
	o.Lang = lang
	return o, nil
}

const pickExamples = `  assay pick ./reports
  assay pick ./reports --docs 12 --terms 25
  assay pick ./reports --format json > picks.json
  assay pick ./inbox --seed 7 --min-df 3 --max-df 0.3`

func newPickCmd(app *App) *cobra.Command {
	var f pickFlags
	cmd := &cobra.Command{
		Use:   "pick FOLDER|FILE.assay",
		Short: "Pick exemplar documents and key terms of a folder",
		Long: `pick reads every .txt, .text, .md and .rst file below FOLDER (hidden files and
folders are skipped), builds a stemmed TF-IDF matrix, picks documents and
terms by squared-norm sampling, and prints the picks with the share of the
corpus they reconstruct, beside the best rank-k approximation.

Files that cannot be used (binary, empty, unreadable, too large, another
type) are skipped and listed with the reason. The output records the method,
seed, options and a fingerprint of the input, so the run can be repeated.

` + cautionSampling,
		Example: pickExamples,
		Args: func(_ *cobra.Command, args []string) error {
			if len(args) != 1 {
				return usagef("pick takes one folder (got %d arguments)", len(args))
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			opts, err := f.options(args[0])
			if err != nil {
				return err
			}
			if isStore(args[0]) {
				return runPickStore(cmd.Context(), app, args[0], opts)
			}
			fsys, err := openFolder(args[0])
			if err != nil {
				return err
			}
			return runPick(cmd.Context(), app, fsys, opts)
		},
	}
	f.register(cmd.Flags())
	return cmd
}

// openFolder opens dir as a file system that cannot be escaped through
// symbolic links or "..".
func openFolder(dir string) (fs.FS, error) {
	info, err := os.Stat(dir)
	if err != nil {
		return nil, fmt.Errorf("open folder: %w", err)
	}
	if !info.IsDir() {
		return nil, fmt.Errorf("open folder: %s is not a folder", dir)
	}
	root, err := os.OpenRoot(dir)
	if err != nil {
		return nil, fmt.Errorf("open folder: %w", err)
	}
	return corpus.RootFS(root), nil
}

// runPick reads the corpus, picks and writes the report.
func runPick(ctx context.Context, app *App, fsys fs.FS, opts pickOptions) error {
	stop, err := startProfiles(opts.CPUProfile, opts.MemProfile)
	if err != nil {
		return err
	}
	defer stop()
	if app.ErrTerminal && !opts.Quiet {
		bar := progressbar.NewOptions(-1,
			progressbar.OptionSetWriter(app.Err),
			progressbar.OptionSetDescription("reading"),
			progressbar.OptionShowCount(),
			progressbar.OptionSpinnerType(14),
			progressbar.OptionClearOnFinish(),
			progressbar.OptionThrottle(100*time.Millisecond),
		)
		opts.progress = func() { bar.Add(1) }
		defer bar.Finish()
	}
	start := time.Now()
	an, err := analyze(ctx, fsys, opts)
	if err != nil {
		return err
	}
	return report(app, an, opts, time.Since(start))
}

// runPickStore picks from an index made by assay index.
func runPickStore(ctx context.Context, app *App, path string, opts pickOptions) error {
	stop, err := startProfiles(opts.CPUProfile, opts.MemProfile)
	if err != nil {
		return err
	}
	defer stop()
	start := time.Now()
	an, err := loadStore(ctx, path, opts)
	if err != nil {
		return err
	}
	return report(app, an, opts, time.Since(start))
}

// report picks on an analysed corpus and writes the report.
func report(app *App, an *analysis, opts pickOptions, read time.Duration) error {
	rep, err := pick(an, opts, app.Version)
	if err != nil {
		return err
	}
	if rep.Timings != nil {
		rep.Timings.Read = seconds(read)
	}
	for _, w := range rep.Warnings {
		fmt.Fprintf(app.Err, "assay: warning: %s\n", w)
	}
	if n := len(rep.Skipped); n > 0 {
		fmt.Fprintf(app.Err, "assay: %d files or parts skipped (listed in the report with the reasons)\n", n)
	}
	return writeReport(app, rep, opts)
}

// formats are the values of --format; csvTables those of --table.
var (
	formats   = []string{"text", "json", "csv", "markdown", "html"}
	csvTables = []string{"exemplars", "terms", "groups", "missed", "curve"}
)

// writeReport renders the report in the chosen format to --out or stdout.
func writeReport(app *App, rep *Report, opts pickOptions) error {
	render := func(w io.Writer, terminal bool) error {
		switch opts.Format {
		case "json":
			return writeJSON(w, rep)
		case "csv":
			return writeCSV(w, rep, opts.Table)
		case "markdown":
			return writeMarkdown(w, rep)
		case "html":
			return writeHTML(w, rep)
		default:
			st := textStyle{width: defaultTextWidth}
			if terminal {
				st.color = !app.NoColor
				if app.Width > 0 {
					st.width = app.Width
				}
			}
			return writeText(w, rep, st)
		}
	}
	if opts.Out == "" {
		return render(app.Out, app.OutTerminal)
	}
	if err := writeFile(opts.Out, func(w *bufio.Writer) error { return render(w, false) }); err != nil {
		return err
	}
	fmt.Fprintf(app.Err, "assay: wrote %s\n", opts.Out)
	return nil
}

func langList() string {
	var names []string
	for _, l := range textproc.Languages() {
		names = append(names, string(l))
	}
	return strings.Join(names, ", ")
}

func validMethod(m string) bool {
	for _, x := range selection.Methods {
		if string(x) == m {
			return true
		}
	}
	return false
}

func methodList() string {
	var names []string
	for _, x := range selection.Methods {
		names = append(names, string(x))
	}
	return strings.Join(names, ", ")
}

// command gives the command line that repeats a run.
func (o pickOptions) command(demo bool) string {
	var b strings.Builder
	if demo {
		b.WriteString("assay demo")
	} else {
		b.WriteString("assay pick " + quoteArg(o.Source))
	}
	fmt.Fprintf(&b, " --method %s --core %s --docs %d --terms %d --rank %d --seed %d", o.Method, o.Core, o.Docs, o.Terms, o.Rank, o.Seed)
	if o.TruncateCore {
		b.WriteString(" --truncate-core")
	}
	if o.Accuracy > 0 {
		fmt.Fprintf(&b, " --accuracy %s", strconv.FormatFloat(o.Accuracy, 'g', -1, 64))
	}
	if o.TargetShare > 0 {
		fmt.Fprintf(&b, " --target-share %s", strconv.FormatFloat(o.TargetShare, 'g', -1, 64))
	}
	fmt.Fprintf(&b, " --min-df %d --max-df %s --tf %s --idf %s --norm %s", o.MinDF, strconv.FormatFloat(o.MaxDF, 'g', -1, 64), o.Weight.TF, o.Weight.IDF, o.Weight.Norm)
	fmt.Fprintf(&b, " --max-bytes %d --min-length %d --power-iters %d", o.MaxBytes, o.MinLen, o.Power)
	fmt.Fprintf(&b, " --group-by %s --missed %d --curve-max %d", o.GroupBy, o.Missed, o.CurveMax)
	if o.NearDup > 0 {
		fmt.Fprintf(&b, " --near-dup %s", strconv.FormatFloat(o.NearDup, 'g', -1, 64))
	} else {
		b.WriteString(" --near-dup off")
	}
	if o.Numbers {
		b.WriteString(" --keep-numbers")
	}
	if o.NoStem {
		b.WriteString(" --no-stem")
	}
	if o.Lang != textproc.Auto && o.Lang != "" {
		b.WriteString(" --lang " + string(o.Lang))
	}
	for _, g := range o.Read.Include {
		b.WriteString(" --include " + quoteArg(g))
	}
	for _, g := range o.Read.Exclude {
		b.WriteString(" --exclude " + quoteArg(g))
	}
	if o.Read.KeepQuoted {
		b.WriteString(" --strip-quoted=false")
	}
	if o.Read.NoAttachments {
		b.WriteString(" --no-attachments")
	}
	for _, fld := range [][2]string{{"--text-field", o.Read.TextField}, {"--id-field", o.Read.IDField}, {"--title-field", o.Read.TitleField}} {
		if fld[1] != "" {
			b.WriteString(" " + fld[0] + " " + quoteArg(fld[1]))
		}
	}
	return b.String()
}

func quoteArg(s string) string {
	if s != "" && !strings.ContainsAny(s, " \t\n'\"\\$`*?[]{}()<>|&;#~") {
		return s
	}
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}
